//! Cross-crate checks of the leaf-shape engine (`leafwind_physics::shape`): against published
//! values, against the flat-plate module it feeds, through the energy balance, and through the
//! `leafwind shape` command's records.

use std::f64::consts::PI;
use std::path::PathBuf;

use leafwind_app::cli::shape::ShapeRecord;
use leafwind_physics::LeafCase;
use leafwind_physics::air::AirProperties;
use leafwind_physics::case::LEAF_DIMENSION_RANGE_M;
use leafwind_physics::convection::forced_nusselt;
use leafwind_physics::shape::{
    BladeProfile, CylinderCorrelation, LeafShape, Outline, ShapeMetrics, cylinder_convection,
    effective_dimension_m, hand_rule_dimension_m, outline_from_csv_mm, sphere_convection,
};
use leafwind_physics::solve_leaf;
use proptest::prelude::*;

fn asset_outline(name: &str) -> Outline {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("assets/outlines")
        .join(name);
    outline_from_csv_mm(&std::fs::read_to_string(path).unwrap()).unwrap()
}

/// d_eff/D of a circle, 9π³/(2Γ(¼)⁴), derived in `leafwind_physics::shape`'s unit tests
/// (Γ(¼) = 3.625 609 908 221 908, from memory, checked there by quadrature).
fn circle_ratio() -> f64 {
    9.0 * PI.powi(3) / (2.0 * 3.625_609_908_221_908_f64.powi(4))
}

fn rel(a: f64, b: f64) -> f64 {
    (a / b - 1.0).abs()
}

// Bergman et al., Fundamentals of Heat and Mass Transfer, 7th ed. (2011), Example 7.4 (from
// memory): 12.7 mm cylinder, air at 10 m/s, film 350 K, Churchill–Bernstein h ≈ 96 W/m²/K with
// Table A.4 properties. Here the engine's own air properties (Sutherland fits, ±2 %) stand in for
// Table A.4, so the tolerance is 3 %.
#[test]
fn cylinder_in_air_reproduces_incropera_example_7_4() {
    let props = AirProperties::at(350.0, 101.325, 0.0);
    let c = cylinder_convection(
        &props,
        10.0,
        0.0127,
        CylinderCorrelation::ChurchillBernstein,
    )
    .unwrap();
    assert!(rel(c.reynolds, 6071.0) < 0.03, "Re = {}", c.reynolds);
    assert!(rel(c.heat_w_m2_k, 96.0) < 0.03, "h = {}", c.heat_w_m2_k);
    assert!(c.in_range);
}

// Whitaker's sphere correlation at Re → 0 is the exact conduction limit Nu = 2 (Bergman et al.
// 2011, §7.6, from memory), so h = 2k/D with the engine's k.
#[test]
fn fruit_in_still_air_conducts() {
    let props = AirProperties::at(293.15, 101.325, 1.0);
    let s = sphere_convection(&props, 0.0, 0.07).unwrap();
    assert!(rel(s.heat_w_m2_k, 2.0 * props.thermal_conductivity_w_m_k / 0.07) < 1e-12);
    assert!(!s.in_range); // Re = 0 is below Whitaker's 3.5
}

// The derivation step of the effective dimension, checked independently: the area mean of the
// local laminar coefficient h(x) = 0.332 k Pr^{1/3} (U/ν)^{1/2} x^{−1/2} (eq. 7.23 of Bergman et
// al. 2011), integrated here cell by cell over a raster of the lobed example with x measured from
// each chord's upwind edge, equals k/d · Nu(d_eff) from `convection::forced_nusselt` (eq. 7.30,
// 0.664 = 2 × 0.332). The raster has 4000 rows (midpoint in y, exact in x), so 10⁻³.
#[test]
fn mean_local_coefficient_equals_the_flat_plate_value_at_the_effective_dimension() {
    let outline = asset_outline("deeply_lobed.csv");
    let props = AirProperties::at(298.15, 101.325, 1.5);
    let speed = 0.8;
    let d = effective_dimension_m(&outline.clone().into(), 0.0);
    let k = props.thermal_conductivity_w_m_k;
    let re = speed * d / props.kinematic_viscosity_m2_s;
    let h_plate = k * forced_nusselt(re, props.prandtl, 5.0e5) / d;

    let c = 0.332 * k * props.prandtl.cbrt() * (speed / props.kinematic_viscosity_m2_s).sqrt();
    let pts = outline.points();
    let (y_lo, y_hi) = pts
        .iter()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), p| {
            (a.min(p.y_m), b.max(p.y_m))
        });
    let rows = 4000;
    let dy = (y_hi - y_lo) / rows as f64;
    let (mut heat, mut area) = (0.0, 0.0);
    for r in 0..rows {
        let y = y_lo + (r as f64 + 0.5) * dy;
        let mut xs: Vec<f64> = (0..pts.len())
            .filter_map(|i| {
                let (a, b) = (pts[i], pts[(i + 1) % pts.len()]);
                ((a.y_m <= y) != (b.y_m <= y))
                    .then(|| a.x_m + (y - a.y_m) * (b.x_m - a.x_m) / (b.y_m - a.y_m))
            })
            .collect();
        xs.sort_by(f64::total_cmp);
        for pair in xs.chunks_exact(2) {
            let len = pair[1] - pair[0];
            // ∫₀^len C x^{−1/2} dx = 2 C √len, summed over 50 cells to keep the raster honest.
            let cells = 50;
            for j in 0..cells {
                let (x0, x1) = (
                    len * j as f64 / cells as f64,
                    len * (j + 1) as f64 / cells as f64,
                );
                heat += 2.0 * c * (x1.sqrt() - x0.sqrt()) * dy;
            }
            area += len * dy;
        }
    }
    let h_raster = heat / area;
    assert!(
        rel(h_raster, h_plate) < 1e-3,
        "{h_raster} vs {h_plate} W/m²/K"
    );
    assert!(rel(area, outline.area_m2()) < 1e-3);
}

// Through the energy balance: in sun, a leaf with the smaller effective dimension exchanges more
// heat with the air and runs closer to air temperature (common practice, no source; the trend of
// Campbell & Norman 1998, ch. 14). The lobed example's d_eff is below its hull's and far below the
// hand rule's value for its width.
#[test]
fn lobed_leaf_runs_closer_to_air_than_its_hull_and_the_hand_rule_suggest() {
    let lobed = asset_outline("deeply_lobed.csv");
    let shape: LeafShape = lobed.clone().into();
    let d_lobed = effective_dimension_m(&shape, 0.0);
    let d_hull = effective_dimension_m(&lobed.convex_hull().into(), 0.0);
    let d_hand = hand_rule_dimension_m(&shape, 0.0);
    assert!(d_lobed < d_hull && d_lobed < d_hand);
    for d in [d_lobed, d_hull, d_hand] {
        assert!(LEAF_DIMENSION_RANGE_M.contains(d));
    }
    let mut case = LeafCase::default();
    case.leaf.stomatal_conductance_mol_m2_s = 0.05;
    case.surroundings.shortwave_w_m2 = 800.0;
    let diff = |d: f64| {
        solve_leaf(&case.with_dimension(d))
            .unwrap()
            .leaf_air_diff_k
            .abs()
    };
    assert!(diff(d_lobed) < diff(d_hull));
    assert!(diff(d_lobed) < diff(d_hand));
}

// The command's record carries the engine's numbers unchanged (cross-crate).
#[test]
fn command_record_carries_the_engine_values() {
    let shape: LeafShape = BladeProfile::ovate(0.09, 0.06).outline(256).unwrap().into();
    let record = ShapeRecord::measure(&shape, 45.0).unwrap();
    let m = ShapeMetrics::of(&shape, 45f64.to_radians()).unwrap();
    assert_eq!(record.area_m2, Some(m.area_m2));
    assert_eq!(record.perimeter_m, Some(m.perimeter_m));
    assert_eq!(record.length_along_wind_m, Some(m.length_along_wind_m));
    assert_eq!(record.width_across_wind_m, Some(m.width_across_wind_m));
    assert_eq!(record.effective_dimension_m, Some(m.effective_dimension_m));
    assert_eq!(record.hand_rule_dimension_m, Some(m.hand_rule_dimension_m));
    let json = serde_json::to_value(&record).unwrap();
    assert!(json.as_object().unwrap().values().all(|v| !v.is_null()));
    assert!(record.warning.is_none());
}

// A file written in metres instead of millimetres gets a warning, not a silent tiny leaf.
#[test]
fn command_warns_about_leaves_outside_the_engine_range() {
    let outline = outline_from_csv_mm("0,0\n0.1,0\n0.1,0.05\n0,0.05\n").unwrap();
    let record = ShapeRecord::measure(&outline.into(), 0.0).unwrap();
    assert!(record.warning.unwrap().contains("millimetres"));
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(32))]

    // Property (common practice, no source): generated elliptic blades of any size, tilt and place
    // follow the closed form d_eff = 0.8075 c_max (c_max: diameter along the wind) and scale and
    // translate with the outline.
    #[test]
    fn elliptic_blades_anywhere(
        length in 0.002..0.5f64,
        aspect in 0.1..1.0f64,
        tilt in -PI..PI,
        dx in -2.0..2.0f64,
        dy in -2.0..2.0f64,
        scale in 0.1..10.0f64,
        wind in 0.0..PI,
    ) {
        let width = length * aspect;
        let blade = BladeProfile::elliptic(length, width).outline(400).unwrap();
        let placed = blade.rotated(tilt).translated(dx, dy);
        let d = effective_dimension_m(&placed.clone().into(), wind);
        let (a, b) = (0.5 * length, 0.5 * width);
        let (s, c) = (wind - tilt).sin_cos();
        let c_max = 2.0 * a * b / (b * b * c * c + a * a * s * s).sqrt();
        prop_assert!(rel(d, circle_ratio() * c_max) < 1e-4, "{} vs {}", d, circle_ratio() * c_max);
        let scaled = effective_dimension_m(&placed.scaled(scale).unwrap().into(), wind);
        prop_assert!(rel(scaled, scale * d) < 1e-9);
        let back = effective_dimension_m(&placed.translated(-dx, -dy).into(), wind);
        prop_assert!(rel(back, d) < 1e-8);
    }
}

// The outline feeds the single leaf: `ShapeMetrics::apply_to` sets the effective dimension and the
// free-convection length A/P. In still air only free convection acts, so a leaf with a longer A/P
// (the hull: larger area per edge) runs warmer in sun (Incropera 7th ed. eqs. 9.30–9.32: h ∝ L^{-1/4};
// the trend is common practice, no source).
#[test]
fn outline_metrics_feed_the_energy_balance() {
    let lobed = asset_outline("deeply_lobed.csv");
    let hull: LeafShape = lobed.convex_hull().into();
    let lobed: LeafShape = lobed.into();
    let m_lobed = ShapeMetrics::of(&lobed, 0.0).unwrap();
    let m_hull = ShapeMetrics::of(&hull, 0.0).unwrap();
    assert!(m_lobed.free_convection_length_m < m_hull.free_convection_length_m);
    let mut case = LeafCase::default().with_speed(0.0);
    case.leaf.stomatal_conductance_mol_m2_s = 0.0;
    case.surroundings.shortwave_w_m2 = 600.0;
    let solve = |m: &ShapeMetrics| {
        let mut c = case;
        c.leaf = m.apply_to(&c.leaf);
        solve_leaf(&c).unwrap()
    };
    let (s_lobed, s_hull) = (solve(&m_lobed), solve(&m_hull));
    assert!(s_lobed.leaf_air_diff_k < s_hull.leaf_air_diff_k);
    assert!(s_lobed.solver.residual.abs() < 1e-6);
    // And in moving air the effective dimension decides.
    let windy = |m: &ShapeMetrics| {
        let mut c = case.with_speed(0.3);
        c.leaf = m.apply_to(&c.leaf);
        solve_leaf(&c).unwrap().leaf_air_diff_k
    };
    assert!(windy(&m_lobed) < windy(&m_hull));
}

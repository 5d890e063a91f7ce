//! Leaf shape: outlines in the leaf plane, their chords along the wind, and the effective
//! characteristic dimension for laminar forced convection; parametric leaf families; CSV outline
//! import; and the non-flat bodies of a plant (needles and stems as cylinders, fruit as spheres)
//! with their own forced-convection correlations.
//!
//! | part | what it holds |
//! |---|---|
//! | [`Outline`], [`LeafShape`] | a validated simple polygon \[m\]; a set of non-overlapping ones (a compound leaf) |
//! | [`effective_dimension_m`], [`ShapeMetrics`], [`DirectionSweep`] | chords along the wind and the effective dimension |
//! | [`BladeProfile`], [`palmately_lobed`], [`pinnate_compound`], [`palmate_compound`] | parametric outlines |
//! | [`outline_from_csv_mm`] | x,y points in millimetres from CSV text |
//! | [`cylinder_convection`], [`sphere_convection`] | needles, stems and fruit in cross-flow |
//!
//! # The effective dimension (derivation)
//!
//! Wind blows along the unit vector (cos θ, sin θ) in the leaf plane. Take co-ordinates ξ along the
//! wind and η across it. A line η = const cuts the outline into chords (a non-convex outline, such as
//! a lobed leaf, may give several on one line); chord *i* runs from its own upwind edge ξ = ξ_i over
//! a length c_i(η). Each chord is treated as a flat plate of its own whose laminar boundary layer
//! starts at its upwind edge, so the local coefficient at distance x = ξ − ξ_i from that edge is
//!
//! h(x) = C x^{−1/2},  C = 0.332 k Pr^{1/3} (U/ν)^{1/2}  (local Nu_x = 0.332 Re_x^{1/2} Pr^{1/3},
//! \[Incropera\] eq. 7.23).
//!
//! The heat flow per kelvin from the strip of width dη is
//! Σ_i ∫₀^{c_i} C x^{−1/2} dx dη = 2 C Σ_i √c_i dη, so the area-averaged coefficient of the outline is
//!
//! h̄ = (2 C / A) ∫ Σ_i √c_i(η) dη,  with A = ∫ Σ_i c_i(η) dη.
//!
//! A flat plate of length d has h̄ = 2 C / √d (the same integral with one chord of length d, which is
//! \[Incropera\] eq. 7.30, Nu = 0.664 Re^{1/2} Pr^{1/3}). The effective dimension d_eff is the plate
//! length with the same h̄:
//!
//! 1/√d_eff = (1/A) ∫ Σ_i √c_i(η) dη,  i.e.  **d_eff = ( A / ∫ Σ_i √c_i(η) dη )²**.
//!
//! Checks: a rectangle L × W with the wind along L has c ≡ L, A = L W, ∫√c dη = W √L, so
//! d_eff = L exactly. For a circle of diameter D, d_eff = 9π³ D / (2 Γ(¼)⁴) ≈ 0.8075 D (derived in
//! the tests). d_eff scales linearly with the outline, does not depend on where the outline sits or
//! on the order of its points, and is the same for θ and θ + π (√c is symmetric in the chord).
//! At oblique winds the corners of an outline give ramps of short chords, so d_eff can fall below
//! both its along- and across-axis values: an L × W rectangle has
//! d_eff = L W² cos θ / (W cos θ + (L/3) sin θ)² while L tan θ ≤ W (derived in the tests), which
//! drops linearly away from θ = 0; the least value over all directions lies slightly below W, near
//! but not at 90°.
//!
//! **Integration.** For a polygon each chord length is a linear function of η between consecutive
//! vertex levels (no edge starts or ends inside such a slab, and edges of a simple polygon do not
//! cross), so the integral is evaluated exactly slab by slab:
//! ∫ √c dη over a slab of height Δη where c goes linearly from c₀ to c₁ is
//! (2/3) Δη (c₀ + √(c₀c₁) + c₁)/(√c₀ + √c₁). This is exact for the polygon (no strip-count
//! error, O(n log n) per direction); [`chord_profile`] samples equal strips (2000 by default) for
//! the chord-length distribution, and its midpoint-rule estimate of d_eff cross-checks the exact
//! one in the tests (they agree within 7 × 10⁻⁵ at 2000 strips for a lobed blade).
//!
//! **Limits of the model.** Laminar flow over every chord (Re on d_eff below the transition
//! Reynolds number, see [`crate::convection`]); the wake of an upwind lobe or leaflet is assumed not
//! to shelter the next one (each chord's boundary layer restarts from clean free-stream air), which
//! overstates exchange for closely overlapping lobes (\[Schuepp\] reviews measurements); leaf edges,
//! flutter and free-stream turbulence are outside the geometry and enter through
//! [`crate::convection::TURBULENCE_FACTOR_DEFAULT`]. The result is the `dimension_m` of
//! [`crate::case::Leaf`], which must lie in [`crate::case::LEAF_DIMENSION_RANGE_M`].
//!
//! # References
//! - \[Incropera\] Bergman, T. L., Lavine, A. S., Incropera, F. P., DeWitt, D. P. (2011).
//!   *Fundamentals of Heat and Mass Transfer*, 7th ed. Wiley. Eq. 7.23 (local laminar Nu_x),
//!   eq. 7.30 (average laminar Nu); eq. 7.52 with Table 7.2 (Hilpert, cylinder in cross-flow),
//!   eq. 7.54 (Churchill–Bernstein), eq. 7.56 (Whitaker, sphere); Example 7.4 (cylinder in air).
//!   Equation numbers as in the 6th and 7th eds., from memory.
//! - \[CN98\] Campbell, G. S., Norman, J. M. (1998). *An Introduction to Environmental Biophysics*,
//!   2nd ed. Springer. Ch. 7: the characteristic dimension of a leaf is about 0.72 times its width
//!   (factor from memory, not verified against the text).
//! - \[Schuepp\] Schuepp, P. H. (1993). Tansley Review No. 59: Leaf boundary layers.
//!   *New Phytologist* 125, 477–507.
//! - \[AS\] Abramowitz, M., Stegun, I. A. (1964). *Handbook of Mathematical Functions*. NBS Applied
//!   Mathematics Series 55. Eq. 6.2.1 (the Beta function B(a, b) = Γ(a)Γ(b)/Γ(a+b)), eq. 6.1.17
//!   (reflection Γ(z)Γ(1−z) = π / sin πz); used in the closed-form checks (numbers from memory).

use thiserror::Error;

use crate::error::PhysicsError;

mod bodies;
mod chords;
mod families;
mod import;
mod outline;

pub use bodies::{
    BODY_DIAMETER_RANGE_M, BodyConvection, CylinderCorrelation, HILPERT_TABLE,
    WHITAKER_RANGE_REYNOLDS, cylinder_convection, cylinder_nusselt_churchill_bernstein,
    cylinder_nusselt_hilpert, sphere_convection, sphere_nusselt_whitaker,
};
pub use chords::{
    Chord, ChordLine, ChordProfile, DirectionSweep, HAND_RULE_WIDTH_FACTOR, STRIPS_DEFAULT,
    SWEEP_STEPS_DEFAULT, ShapeMetrics, WIND_ANGLE_RANGE_RAD, chord_profile, effective_dimension_m,
    hand_rule_dimension_m, sweep_effective_dimension,
};
pub use families::{
    BladeProfile, DEPTH_RANGE, EXPONENT_RANGE, LOBES_RANGE, OUTLINE_SIZE_RANGE_M,
    POINTS_PER_SIDE_DEFAULT, palmate_compound, palmately_lobed, pinnate_compound,
};
pub use import::{METRES_PER_MILLIMETRE, outline_from_csv_mm};
pub use outline::{LeafShape, Outline, Point};

/// Why an outline or a leaf shape could not be built or read.
///
/// Row numbers are 1-based: the line number in a CSV file (blank, comment and header lines
/// counted, as a text editor shows them), or the position of the point in the list given to
/// [`Outline::new`].
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ShapeError {
    /// No data rows at all.
    #[error("the outline has no points (no data rows)")]
    Empty,
    /// Fewer than three distinct points.
    #[error(
        "the outline has only {found} distinct point(s) (data up to row {last_row}); at least 3 are needed"
    )]
    TooFewPoints {
        /// Distinct points found (consecutive repeats counted once).
        found: usize,
        /// Row of the last point read.
        last_row: usize,
    },
    /// A CSV row with other than two values.
    #[error("row {row}: expected 2 values (x, y in mm), found {found}")]
    FieldCount {
        /// Row of the offending line.
        row: usize,
        /// Number of comma-separated values found.
        found: usize,
    },
    /// A value that is not a number.
    #[error("row {row}: the {column} value {text:?} is not a number")]
    NotNumeric {
        /// Row of the offending line.
        row: usize,
        /// `x` or `y`.
        column: &'static str,
        /// The text found.
        text: String,
    },
    /// A value that is NaN or infinite.
    #[error("row {row}: the {column} value {value} is not a finite number")]
    NotFinite {
        /// Row of the offending point.
        row: usize,
        /// `x` or `y`.
        column: &'static str,
        /// The value found.
        value: f64,
    },
    /// All points on one line.
    #[error(
        "the outline encloses no area ({area_m2:e} m²): its points (rows {first_row} to {last_row}) lie on one line"
    )]
    ZeroArea {
        /// The enclosed area \[m²\] (zero or round-off).
        area_m2: f64,
        /// Row of the first point.
        first_row: usize,
        /// Row of the last point.
        last_row: usize,
    },
    /// Two edges of the outline meet (cross, touch or overlap) other than at their shared vertex.
    #[error(
        "the outline crosses itself: the edge from row {first_from_row} to row {first_to_row} meets the edge from row {second_from_row} to row {second_to_row}"
    )]
    SelfCrossing {
        /// Start row of the first edge.
        first_from_row: usize,
        /// End row of the first edge.
        first_to_row: usize,
        /// Start row of the second edge.
        second_from_row: usize,
        /// End row of the second edge.
        second_to_row: usize,
    },
    /// A leaf shape with no outline.
    #[error("a leaf shape needs at least one outline")]
    NoOutlines,
    /// Two outlines of one leaf shape overlap or touch.
    #[error("leaflets {first} and {second} overlap or touch (numbered from 1)")]
    LeafletsOverlap {
        /// Number of the first outline (from 1).
        first: usize,
        /// Number of the second outline (from 1).
        second: usize,
    },
    /// A parameter out of its valid range (generators and correlations).
    #[error(transparent)]
    Physics(#[from] PhysicsError),
}

#[cfg(test)]
mod tests {
    use std::f64::consts::PI;

    use proptest::prelude::*;

    use super::*;

    /// Γ(1/4) (value from memory, 16 digits; cross-checked by quadrature in
    /// `beta_closed_form_matches_quadrature`).
    const GAMMA_QUARTER: f64 = 3.625_609_908_221_908;

    /// d_eff / c_max for an elliptic (or circular) outline: 9π³ / (2 Γ(¼)⁴) ≈ 0.8075.
    ///
    /// Derivation (circle of radius R, diameter D = 2R, wind along x): the chord at height y is
    /// c(y) = 2√(R² − y²), the area A = πR², and
    /// ∫_{−R}^{R} √c dy = √2 ∫_{−R}^{R} (R² − y²)^{1/4} dy = √2 R^{3/2} ∫_{−1}^{1} (1 − t²)^{1/4} dt
    /// = √2 R^{3/2} B(½, 5/4)  (t² = u turns the integral into ∫₀¹ u^{−1/2}(1 − u)^{1/4} du).
    /// With \[AS\] 6.2.1, B(½, 5/4) = Γ(½)Γ(5/4)/Γ(7/4) = √π (Γ(¼)/4) / ((3/4) Γ(¾)), and the
    /// reflection formula \[AS\] 6.1.17, Γ(¼)Γ(¾) = π/sin(π/4) = π√2, gives
    /// B(½, 5/4) = Γ(¼)² / (3√(2π)) ≈ 1.748 038. Then
    /// d_eff = (A / ∫√c dy)² = π² R / (2 B²) = 9π³ R / Γ(¼)⁴ = 9π³ D / (2 Γ(¼)⁴) ≈ 0.807 491 D.
    ///
    /// An ellipse is the image of a circle under a linear map, which keeps lines parallel and
    /// scales all chords of one direction alike; so its chords along any wind direction follow
    /// c(η) = c_max √(1 − (η/η_max)²) with c_max its diameter along the wind,
    /// c_max = 2ab / √(b² cos²θ + a² sin²θ) for semi-axes a (along x) and b, and the same ratio holds.
    fn ellipse_ratio() -> f64 {
        9.0 * PI.powi(3) / (2.0 * GAMMA_QUARTER.powi(4))
    }

    fn ellipse(a: f64, b: f64, n: usize) -> Outline {
        Outline::new(
            (0..n)
                .map(|k| {
                    let t = 2.0 * PI * k as f64 / n as f64;
                    Point::new(a * t.cos(), b * t.sin())
                })
                .collect(),
        )
        .unwrap()
    }

    fn rectangle(l: f64, w: f64) -> LeafShape {
        Outline::new(vec![
            Point::new(0.0, 0.0),
            Point::new(l, 0.0),
            Point::new(l, w),
            Point::new(0.0, w),
        ])
        .unwrap()
        .into()
    }

    fn rel(a: f64, b: f64) -> f64 {
        (a / b - 1.0).abs()
    }

    // Closed form, [AS] 6.2.1 and 6.1.17: B(½, 5/4) = Γ(¼)²/(3√(2π)); cross-checked by composite
    // Simpson quadrature of B(½, 5/4) = 2 ∫₀^{π/2} cos^{3/2} φ dφ (u = sin²φ), 400 000 intervals
    // (error ~ h^{5/2} from the cos^{3/2} end, < 10⁻¹²).
    #[test]
    fn beta_closed_form_matches_quadrature() {
        let n = 400_000;
        let h = 0.5 * PI / n as f64;
        let f = |p: f64| 2.0 * p.cos().max(0.0).powf(1.5);
        let mut s = f(0.0) + f(0.5 * PI);
        for k in 1..n {
            s += if k % 2 == 1 { 4.0 } else { 2.0 } * f(k as f64 * h);
        }
        let quad = s * h / 3.0;
        let closed = GAMMA_QUARTER * GAMMA_QUARTER / (3.0 * (2.0 * PI).sqrt());
        assert!((quad - closed).abs() < 1e-11, "{quad} vs {closed}");
        assert!((ellipse_ratio() - 0.807_491).abs() < 5e-7);
    }

    // Derivation in the module documentation: a rectangle with the wind along its length L has
    // d_eff = L exactly (and W with the wind along W).
    #[test]
    fn rectangle_gives_its_length_exactly() {
        let r = rectangle(0.12, 0.03);
        assert!(rel(effective_dimension_m(&r, 0.0), 0.12) < 1e-14);
        assert!(rel(effective_dimension_m(&r, PI), 0.12) < 1e-14);
        assert!(rel(effective_dimension_m(&r, 0.5 * PI), 0.03) < 1e-12);
        let m = ShapeMetrics::of(&r, 0.0).unwrap();
        assert!(rel(m.area_m2, 0.0036) < 1e-14);
        assert!(rel(m.perimeter_m, 0.30) < 1e-14);
        assert!(rel(m.length_along_wind_m, 0.12) < 1e-14);
        assert!(rel(m.width_across_wind_m, 0.03) < 1e-14);
        assert!(rel(m.hand_rule_dimension_m, 0.72 * 0.03) < 1e-14);
        assert!(rel(m.free_convection_length_m, 0.0036 / 0.30) < 1e-14);
    }

    // Closed form above: circle d_eff = 9π³D/(2Γ(¼)⁴). The polygon (4096 vertices) is inscribed,
    // which shifts d_eff by O(1/n²); tolerance 10⁻⁶.
    #[test]
    fn circle_matches_the_closed_form() {
        let d = 0.08;
        let c: LeafShape = ellipse(0.5 * d, 0.5 * d, 4096).into();
        for angle in [0.0, 0.3, 1.0, 0.5 * PI, 2.5] {
            let got = effective_dimension_m(&c, angle);
            assert!(rel(got, ellipse_ratio() * d) < 1e-6, "θ = {angle}: {got}");
        }
    }

    // Closed form above with c_max = 2ab/√(b²cos²θ + a²sin²θ).
    #[test]
    fn ellipse_matches_the_closed_form_at_any_direction() {
        let (a, b) = (0.06, 0.025);
        let e: LeafShape = ellipse(a, b, 4096).into();
        for angle in [0.0, PI / 6.0, PI / 4.0, 0.5 * PI, 2.0] {
            let (s, c) = f64::sin_cos(angle);
            let c_max = 2.0 * a * b / (b * b * c * c + a * a * s * s).sqrt();
            let got = effective_dimension_m(&e, angle);
            assert!(
                rel(got, ellipse_ratio() * c_max) < 1e-6,
                "θ = {angle}: {got}"
            );
        }
    }

    // The exact slab integral against the midpoint strip sums of `chord_profile` (2000 strips):
    // the strip rule converges as h^{5/4} at the ends of a rounded outline (√c ~ (η − η₀)^{1/4});
    // 2 × 10⁻⁴ allows for that.
    #[test]
    fn strip_sums_converge_to_the_exact_integral() {
        let leaf: LeafShape = BladeProfile::ovate(0.1, 0.06)
            .lobed(4, 0.6, 1024)
            .unwrap()
            .into();
        for angle in [0.0, 0.7, 0.5 * PI] {
            let p = chord_profile(&leaf, angle, STRIPS_DEFAULT).unwrap();
            let exact = effective_dimension_m(&leaf, angle);
            assert!(rel(p.effective_dimension_m(), exact) < 2e-4, "θ = {angle}");
            assert!(rel(p.area_m2(), leaf.area_m2()) < 2e-4);
            let shares: f64 = p.length_histogram(20).iter().map(|b| b.1).sum();
            assert!((shares - 1.0).abs() < 1e-12);
        }
        // Wind along the midrib cuts the lobes into several chords per line.
        let along = chord_profile(&leaf, 0.0, STRIPS_DEFAULT).unwrap();
        assert!(along.max_chords_per_line() >= 3);
        let convex: LeafShape = ellipse(0.05, 0.02, 512).into();
        assert_eq!(
            chord_profile(&convex, 0.4, 500)
                .unwrap()
                .max_chords_per_line(),
            1
        );
    }

    // Invariants (common practice, no source): d_eff does not depend on where the outline sits,
    // on the order of its points, or on θ → θ + π; it scales with the outline; it rotates with it.
    #[test]
    fn invariances() {
        let o = BladeProfile::lanceolate(0.15, 0.03)
            .lobed(3, 0.5, 512)
            .unwrap();
        let base: LeafShape = o.clone().into();
        for angle in [0.0, 0.4, 1.3, 2.9] {
            let d = effective_dimension_m(&base, angle);
            let moved = effective_dimension_m(&o.translated(3.7, -12.5).into(), angle);
            let reversed = effective_dimension_m(&o.reversed().into(), angle);
            let scaled = effective_dimension_m(&o.scaled(2.5).unwrap().into(), angle);
            let turned = effective_dimension_m(&base, angle + PI);
            let rotated = effective_dimension_m(&o.rotated(0.9).into(), angle + 0.9);
            assert!(rel(moved, d) < 1e-9, "translation");
            assert!(rel(reversed, d) < 1e-12, "reversal");
            assert!(rel(scaled, 2.5 * d) < 1e-12, "scaling");
            assert!(rel(turned, d) < 1e-12, "180°");
            assert!(rel(rotated, d) < 1e-9, "rotation");
        }
    }

    // A lobed leaf's chords are its hull's chords cut short or split, each restarting the
    // boundary layer, so its d_eff lies below the convex hull's at every direction.
    #[test]
    fn lobed_leaf_is_below_its_convex_hull() {
        for o in [
            BladeProfile::ovate(0.12, 0.09).lobed(4, 0.7, 1024).unwrap(),
            palmately_lobed(0.07, 5, 0.6, 2000).unwrap(),
        ] {
            let leaf: LeafShape = o.clone().into();
            let hull: LeafShape = o.convex_hull().into();
            for k in 0..12 {
                let angle = PI * k as f64 / 12.0;
                let (dl, dh) = (
                    effective_dimension_m(&leaf, angle),
                    effective_dimension_m(&hull, angle),
                );
                assert!(dl < dh, "θ = {angle}: {dl} ≥ {dh}");
            }
        }
    }

    /// d_eff of an L × W rectangle (L along x) with the wind at θ from x (closed form, derived
    /// here; no source). For 0 ≤ θ ≤ π/2 with L tan θ ≤ W the chords along the wind form a
    /// trapezium across it: a plateau of width W cos θ − L sin θ with chords L/cos θ, and two ramps
    /// of width L sin θ whose chords grow linearly from 0 to L/cos θ. So A = L W and
    /// ∫√c dη = √(L/cos θ) (W cos θ − L sin θ + (4/3) L sin θ) = √(L/cos θ)(W cos θ + (L/3) sin θ),
    /// hence d_eff = L W² cos θ / (W cos θ + (L/3) sin θ)². Otherwise swap L ↔ W and θ ↔ π/2 − θ.
    fn rectangle_closed_form(l: f64, w: f64, angle: f64) -> f64 {
        let t = angle.rem_euclid(PI);
        let t = if t > 0.5 * PI { PI - t } else { t }; // mirror symmetry of the rectangle
        let (s, c) = t.sin_cos();
        if l * s <= w * c {
            l * w * w * c / (w * c + l * s / 3.0).powi(2)
        } else {
            w * l * l * s / (l * s + w * c / 3.0).powi(2)
        }
    }

    // Closed form above. At oblique winds the corner ramps have short chords, so d_eff falls off
    // steeply (linearly in the angle) from L along and from W across: both are cusps, and the
    // least value lies between them, below W.
    #[test]
    fn rectangle_matches_the_trapezium_closed_form_at_any_direction() {
        let (l, w) = (0.1, 0.02);
        let r = rectangle(l, w);
        for k in 0..=36 {
            let angle = PI * k as f64 / 36.0;
            let got = effective_dimension_m(&r, angle);
            let want = rectangle_closed_form(l, w, angle);
            assert!(rel(got, want) < 1e-10, "θ = {angle}: {got} vs {want}");
        }
        let s = sweep_effective_dimension(&r, SWEEP_STEPS_DEFAULT).unwrap();
        assert!(rel(s.max_m, l) < 1e-12 && s.max_angle_rad == 0.0);
        assert!(s.min_m < w);
        let want_min = (0..SWEEP_STEPS_DEFAULT)
            .map(|k| rectangle_closed_form(l, w, PI * k as f64 / 180.0))
            .fold(f64::INFINITY, f64::min);
        assert!(rel(s.min_m, want_min) < 1e-10);
        assert!(s.transfer_mean_m <= s.mean_m && s.transfer_mean_m >= s.min_m);
        assert!(sweep_effective_dimension(&r, 0).is_err());
    }

    // A circle gives the same value from every direction (closed form above).
    #[test]
    fn circle_sweep_is_flat() {
        let c: LeafShape = ellipse(0.03, 0.03, 2048).into();
        let s = sweep_effective_dimension(&c, SWEEP_STEPS_DEFAULT).unwrap();
        assert!(rel(s.min_m, s.max_m) < 1e-5);
        assert!(rel(s.mean_m, ellipse_ratio() * 0.06) < 1e-5);
        assert!(rel(s.transfer_mean_m, s.mean_m) < 1e-5);
    }

    #[test]
    fn compound_leaf_is_the_sum_of_its_leaflets() {
        let leaflet = BladeProfile::elliptic(0.04, 0.016);
        let compound = pinnate_compound(&leaflet, 2, 0.03, 1.3, 0.002, true).unwrap();
        // Every leaflet is the same ellipse, only rotated: the integrals add, so d_eff of the
        // set lies between the least and greatest single-leaflet value at that wind.
        let singles: Vec<f64> = compound
            .outlines()
            .iter()
            .map(|o| effective_dimension_m(&o.clone().into(), 0.0))
            .collect();
        let d = effective_dimension_m(&compound, 0.0);
        let lo = singles.iter().copied().fold(f64::INFINITY, f64::min);
        let hi = singles.iter().copied().fold(0.0, f64::max);
        assert!(d >= lo && d <= hi);
        // Wind along the terminal leaflet's midrib: it alone gives 0.8075 × 0.04 (closed form).
        assert!(rel(singles[4], ellipse_ratio() * 0.04) < 2e-4);
    }

    #[test]
    fn bad_angles_and_strip_counts_are_errors() {
        let r = rectangle(0.1, 0.02);
        assert!(ShapeMetrics::of(&r, f64::NAN).is_err());
        assert!(ShapeMetrics::of(&r, 10.0).is_err());
        assert!(chord_profile(&r, 0.0, 0).is_err());
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(48))]

        // Scale and translation invariance (common practice, no source) over random ellipses, and
        // the closed form above within the 256-gon's discretisation error (5 × 10⁻⁵ for a circle).
        #[test]
        fn random_ellipses(
            a in 0.005..0.2f64,
            aspect in 0.1..1.0f64,
            tilt in 0.0..PI,
            dx in -1.0..1.0f64,
            dy in -1.0..1.0f64,
            scale in 0.05..20.0f64,
            wind in 0.0..PI,
        ) {
            let b = a * aspect;
            let o = ellipse(a, b, 256).rotated(tilt);
            let d = effective_dimension_m(&o.clone().into(), wind);
            let moved = effective_dimension_m(&o.translated(dx, dy).into(), wind);
            let scaled = effective_dimension_m(&o.scaled(scale).unwrap().into(), wind);
            prop_assert!(rel(moved, d) < 1e-8);
            prop_assert!(rel(scaled, scale * d) < 1e-10);
            let (s, c) = (wind - tilt).sin_cos();
            let c_max = 2.0 * a * b / (b * b * c * c + a * a * s * s).sqrt();
            prop_assert!(rel(d, ellipse_ratio() * c_max) < 2e-4);
        }
    }
}

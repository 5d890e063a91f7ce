//! The greenhouse ventilation balance against the ventilation standard's design method, and the
//! least-ventilation answers.
//!
//! Source of the design method: ASABE EP406 (reaffirmed), *Heating, Ventilating and Cooling
//! Greenhouses*, summer fan ventilation: V = V₀ F_elev F_light F_temp with V₀ = 8 cfm per ft² of
//! floor below 1 000 ft (305 m), at 5 000 fc (53.8 klx) inside and a 7 °F (4 K) rise; the
//! elevation factors 1.04, 1.08, 1.12, 1.16, 1.20, 1.25, 1.30, 1.36 at 1 000 … 8 000 ft. All these
//! numbers are **from memory**; the 5 000 fc light constant and the 4 °C reference rise were seen in
//! secondary copies only. Whoever holds the standard: confirm them here.

use leafwind_physics::air::pressure_from_altitude_kpa;
use leafwind_physics::greenhouse::{GreenhouseCase, InsideAir, Outside, solve_greenhouse};
use leafwind_physics::sun::HorizontalShortwave;
use leafwind_physics::ventilation::{
    DAYLIGHT_EFFICACY_LM_W, FACTOR_BASE_RATE_M3_M2_S, FACTOR_REFERENCE_LIGHT_KLX,
    VentilationAnswer, VentilationTarget, design_check, factor_rate, least_ventilation,
};
use leafwind_physics::{Humidity, PhysicsError};

const FOOT_M: f64 = 0.3048;

/// EP406's elevation factors (from memory) at 1 000 … 8 000 ft.
const EP406_ELEVATION_FACTORS: [(f64, f64); 8] = [
    (1000.0, 1.04),
    (2000.0, 1.08),
    (3000.0, 1.12),
    (4000.0, 1.16),
    (5000.0, 1.20),
    (6000.0, 1.25),
    (7000.0, 1.30),
    (8000.0, 1.36),
];

/// The base rate and a worked example through the factors. 8 cfm/ft² = 0.040 64 m³ s⁻¹ m⁻² (exact
/// foot); the factor method's elevation factor here is P₀/P with P from FAO-56 eq. 7 (Allen et al.
/// 1998), which must match the standard's table within 2 %. Worked example (this test's own, through
/// the standard's factors): a house at 5 000 ft, 4 000 fc inside (43.04 klx), 3 K allowed rise →
/// 0.040 64 × 1.20 × 0.8 × 4/3 = 0.0520 m³ s⁻¹ m⁻² ≈ 10.2 cfm/ft².
#[test]
fn factor_method_base_rate_elevation_table_and_example() {
    assert!((FACTOR_BASE_RATE_M3_M2_S - 0.040_64).abs() < 1e-5);
    for (ft, table) in EP406_ELEVATION_FACTORS {
        let p = pressure_from_altitude_kpa(ft * FOOT_M).unwrap();
        let f = factor_rate(p, FACTOR_REFERENCE_LIGHT_KLX, 4.0)
            .unwrap()
            .elevation_factor;
        assert!((f / table - 1.0).abs() < 0.02, "{ft} ft: {f} vs {table}");
    }
    let p = pressure_from_altitude_kpa(5000.0 * FOOT_M).unwrap();
    let r = factor_rate(p, 4000.0 * 10.764e-3, 3.0).unwrap();
    assert!((r.light_factor - 0.8).abs() < 1e-3);
    assert!((r.temperature_factor - 4.0 / 3.0).abs() < 1e-12);
    assert!(
        (r.rate_m3_m2_s - 0.0520).abs() < 0.0006,
        "{}",
        r.rate_m3_m2_s
    );
}

/// An invented summer house at the standard's reference light: 53.8 klx inside (489 W m⁻² of
/// sunlight at 110 lm W⁻¹, from memory), under a 0.7 cover, sun at 60°, 30 °C and 40 % outside.
fn reference_house(lai: f64, pressure_kpa: f64, light_scale: f64) -> GreenhouseCase {
    let inside_w_m2 = FACTOR_REFERENCE_LIGHT_KLX * 1000.0 / DAYLIGHT_EFFICACY_LM_W * light_scale;
    let outside_w_m2 = inside_w_m2 / 0.7;
    let mut c = GreenhouseCase {
        outside: Outside {
            air_temp_c: 30.0,
            humidity: Humidity::RelativePct(40.0),
            pressure_kpa,
            sun_elevation_rad: 60f64.to_radians(),
            shortwave: HorizontalShortwave {
                beam_w_m2: 0.8 * outside_w_m2,
                diffuse_w_m2: 0.2 * outside_w_m2,
            },
        },
        ..GreenhouseCase::default()
    };
    c.cover.transmittance = 0.7;
    c.structure.lai = lai;
    c
}

fn rate_for_rise(c: &GreenhouseCase, rise_k: f64) -> f64 {
    least_ventilation(c, VentilationTarget::InsideRise { rise_k })
        .unwrap()
        .rate_m3_m2_s()
        .unwrap()
}

/// Reduction to the standard's assumption. The factors are proportional when the heat to carry off
/// as warm air is a fixed share of the light, as it is in a house with no crop (every absorbed watt
/// leaves the floor as sensible heat). There the balance must reproduce them: half the light → half
/// the rate, 2 K instead of 4 K → twice the rate (a little more: the cover's loss U ΔT halves too),
/// 5 000 ft → the standard's 1.20, each within 8 %.
#[test]
fn balance_without_a_crop_reproduces_the_standards_factors() {
    let sea = pressure_from_altitude_kpa(0.0).unwrap();
    let high = pressure_from_altitude_kpa(5000.0 * FOOT_M).unwrap();
    let empty = reference_house(0.0, sea, 1.0);
    let v4 = rate_for_rise(&empty, 4.0);
    let light = rate_for_rise(&reference_house(0.0, sea, 0.5), 4.0) / v4;
    let temp = rate_for_rise(&empty, 2.0) / v4;
    let elev = rate_for_rise(&reference_house(0.0, high, 1.0), 4.0) / v4;
    assert!((light / 0.5 - 1.0).abs() < 0.08, "light factor {light}");
    assert!((temp / 2.0 - 1.0).abs() < 0.08, "temperature factor {temp}");
    assert!((elev / 1.20 - 1.0).abs() < 0.08, "elevation factor {elev}");
}

/// The standard's base rate against the balance at the reference conditions. Design practice takes
/// the crop to turn about half of the light inside into transpiration (an "evapotranspiration
/// coefficient" near 0.5; from memory). The balance for a young crop (L = 1) does about that, and
/// must then need the base rate within 15 %. A house with no crop needs more than the base rate and
/// a full, well-watered crop (L = 3) less: the standard's single number is a design figure between
/// them.
#[test]
fn standard_base_rate_is_the_balance_for_a_half_transpiring_crop() {
    let sea = pressure_from_altitude_kpa(0.0).unwrap();
    let young = reference_house(1.0, sea, 1.0);
    let a = least_ventilation(&young, VentilationTarget::InsideRise { rise_k: 4.0 }).unwrap();
    let VentilationAnswer::Rate { at, .. } = a else {
        panic!("{a:?}")
    };
    assert!(
        (0.35..0.6).contains(&at.transpiration_share),
        "{}",
        at.transpiration_share
    );
    assert!(
        (at.rate_m3_m2_s / FACTOR_BASE_RATE_M3_M2_S - 1.0).abs() < 0.15,
        "{}",
        at.rate_m3_m2_s
    );
    let empty = rate_for_rise(&reference_house(0.0, sea, 1.0), 4.0);
    let full = rate_for_rise(&reference_house(3.0, sea, 1.0), 4.0);
    assert!(full < FACTOR_BASE_RATE_M3_M2_S && FACTOR_BASE_RATE_M3_M2_S < empty);
}

/// The least-rate answer re-checked by solving the balance at the rate (met) and 5 % below it
/// (missed), for both targets.
#[test]
fn least_ventilation_met_at_the_answer_and_missed_below() {
    let c = reference_house(3.0, 101.325, 1.0);
    let solve_at = |v: f64| {
        let mut h = c;
        h.inside = InsideAir::Ventilated { rate_m3_m2_s: v };
        solve_greenhouse(&h).unwrap()
    };
    let v = rate_for_rise(&c, 3.0);
    assert!(solve_at(v).inside_air_temp_c - 30.0 <= 3.0);
    assert!(solve_at(0.95 * v).inside_air_temp_c - 30.0 > 3.0);

    let leaf = least_ventilation(
        &c,
        VentilationTarget::HottestLeaf {
            limit_c: 36.0,
            margin_k: 1.0,
        },
    )
    .unwrap();
    let v = leaf.rate_m3_m2_s().unwrap();
    assert!(solve_at(v).canopy.hottest.leaf_temp_c <= 35.0);
    assert!(solve_at(0.95 * v).canopy.hottest.leaf_temp_c > 35.0);
    assert!(leaf.sentence().contains("hottest leaf"));
}

/// When the outside air itself is above the target, no ventilation can meet it, and the answer
/// says so with the house at the greatest rate; a target met at the least rate says that too; bad
/// targets are errors, not panics.
#[test]
fn least_ventilation_unreachable_already_met_and_bad_input() {
    let c = reference_house(3.0, 101.325, 1.0);
    let a = least_ventilation(
        &c,
        VentilationTarget::HottestLeaf {
            limit_c: 29.0,
            margin_k: 0.0,
        },
    )
    .unwrap();
    assert!(matches!(a, VentilationAnswer::Unreachable { .. }));
    assert!(a.rate_m3_m2_s().is_none());
    assert!(a.sentence().starts_with("No ventilation rate can"));

    let mut night = c;
    night.outside.shortwave = HorizontalShortwave {
        beam_w_m2: 0.0,
        diffuse_w_m2: 0.0,
    };
    let a = least_ventilation(&night, VentilationTarget::InsideRise { rise_k: 2.0 }).unwrap();
    assert!(matches!(a, VentilationAnswer::AtLeastRate { .. }), "{a:?}");

    for bad in [f64::NAN, -1.0, 0.0, 100.0] {
        let e = least_ventilation(&c, VentilationTarget::InsideRise { rise_k: bad });
        assert!(
            matches!(
                e,
                Err(PhysicsError::OutOfRange { .. }) | Err(PhysicsError::NotFinite { .. })
            ),
            "{bad}: {e:?}"
        );
    }
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig {
        cases: std::env::var("PROPTEST_CASES").ok().and_then(|v| v.parse().ok()).unwrap_or(24),
        ..proptest::prelude::ProptestConfig::default()
    })]
    /// Over random valid houses (a 3-layer canopy to keep it quick) the ventilation answers are
    /// values, never panics: finite rates inside the valid range, met at the answer; the factor
    /// method finite and not negative (invariants, no source).
    #[test]
    fn ventilation_answers_are_finite_values(
        outside_c in 5.0f64..45.0,
        rh in 10.0f64..90.0,
        sun_w_m2 in 0.0f64..1000.0,
        tau in 0.3f64..0.9,
        lai in 0.0f64..6.0,
        gs in 0.01f64..0.6,
        rise_k in 0.5f64..10.0,
        limit_c in 25.0f64..50.0,
        margin_k in 0.0f64..3.0,
    ) {
        let mut c = reference_house(lai, 101.325, 1.0);
        c.outside.air_temp_c = outside_c;
        c.outside.humidity = Humidity::RelativePct(rh);
        c.outside.shortwave = HorizontalShortwave { beam_w_m2: 0.8 * sun_w_m2, diffuse_w_m2: 0.2 * sun_w_m2 };
        c.cover.transmittance = tau;
        c.structure.layers = 3;
        c.leaf.stomatal_conductance_mol_m2_s = gs;
        if let Ok(check) = design_check(&c, limit_c, margin_k, rise_k) {
            proptest::prop_assert!(check.factor.rate_m3_m2_s.is_finite() && check.factor.rate_m3_m2_s >= 0.0);
            for a in [check.for_leaf, check.for_design_rise] {
                if let Some(v) = a.rate_m3_m2_s() {
                    proptest::prop_assert!((1e-4..=0.5).contains(&v), "{v}");
                }
                proptest::prop_assert!(!a.sentence().contains("NaN"), "{}", a.sentence());
            }
            if let VentilationAnswer::Rate { at, .. } = check.for_design_rise {
                proptest::prop_assert!(at.inside_air_temp_c - outside_c <= rise_k + 1e-9);
            }
        }
    }
}

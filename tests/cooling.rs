//! Checks of the cooling options: the psychrometric wet bulb against published values, the pad
//! model against the worked arithmetic of the saturation-efficiency equation, the adiabatic energy
//! closure of evaporative cooling, the fog's humidity limit, and the option comparisons.

use leafwind_physics::Humidity;
use leafwind_physics::air::{dew_point_c, latent_heat_j_kg, saturation_vapour_pressure_kpa};
use leafwind_physics::cooling::{
    CoolingOption, Evaporative, PSYCHROMETER_COEFFICIENT_VENTILATED_PER_K, compare_design_day,
    compare_moment, fog_outlet, pad_outlet, pad_to_fan_rise_k, standard_options, wet_bulb_c,
};
use leafwind_physics::design_day::{DesignDay, Environment, SeriesCase};
use leafwind_physics::greenhouse::GreenhouseCase;
use proptest::prelude::*;

const A: f64 = PSYCHROMETER_COEFFICIENT_VENTILATED_PER_K;

/// Allen et al. (1998), FAO Irrigation and Drainage Paper 56, ch. 3, Example 5 (values from
/// memory): an Assmann psychrometer at 1200 m (P = 87.9 kPa) reads 25.6 °C dry and 19.5 °C wet, so
/// e_a = e°(19.5) − 0.000662 · 87.9 · (25.6 − 19.5) = 1.91 kPa. Inverting from the printed e_a
/// (two decimals: ±0.005 kPa, about ±0.025 K in T_w) must give 19.5 °C within 0.05 K.
#[test]
fn fao56_example5_psychrometer() {
    let e = saturation_vapour_pressure_kpa(19.5) - A * 87.9 * (25.6 - 19.5);
    assert!((e - 1.91).abs() < 0.005, "{e}");
    let tw = wet_bulb_c(25.6, 1.91, 87.9, A).unwrap();
    assert!((tw - 19.5).abs() < 0.05, "{tw}");
}

/// Stull (2011), *J. Appl. Meteor. Climatol.* 50, 2267–2269, eq. 1: an empirical wet bulb at
/// 101.325 kPa whose error against the psychrometric truth is −1 to +0.65 °C (mean absolute < 0.3 °C)
/// for RH 5–99 % and −20 to 50 °C (abstract; the formula as printed there). The abstract read here
/// does not fix the sign convention of "error", so the check is symmetric: our solver within 1 K of
/// Stull's value (plus 0.1 K for the psychrometer-equation approximation), mean absolute
/// difference under 0.4 K.
#[test]
fn stull2011_wet_bulb_band() {
    let stull = |t: f64, rh: f64| {
        t * (0.151_977 * (rh + 8.313_659).sqrt()).atan() + (t + rh).atan() - (rh - 1.676_331).atan()
            + 0.003_918_38 * rh.powf(1.5) * (0.023_101 * rh).atan()
            - 4.686_035
    };
    // Stull's printed example (from memory): 20 °C, 50 % gives 13.7 °C.
    assert!((stull(20.0, 50.0) - 13.7).abs() < 0.05);
    let mut sum = 0.0;
    let mut n = 0.0;
    for t in [5.0, 10.0, 20.0, 30.0, 40.0, 50.0] {
        for rh in [20.0, 40.0, 60.0, 80.0, 95.0] {
            let e = Humidity::RelativePct(rh).vapour_pressure_kpa(t).unwrap();
            let ours = wet_bulb_c(t, e, 101.325, A).unwrap();
            let diff = ours - stull(t, rh);
            assert!(diff.abs() <= 1.1, "{t} °C {rh} %: {diff}");
            sum += diff.abs();
            n += 1.0;
        }
    }
    assert!(sum / n < 0.4, "mean |diff| {}", sum / n);
}

/// ASHRAE Handbook—Fundamentals (2009), ch. 1, eq. 35 (from memory): the thermodynamic wet bulb
/// from the humidity ratio, W = ((2501 − 2.326 t*) W_s* − 1.006 (t − t*)) / (2501 + 1.86 t − 4.186 t*)
/// (SI, kJ kg⁻¹). The FAO-56 psychrometer form with a_psy = 0.000662 K⁻¹ must agree within 0.25 K
/// from 10 to 50 °C (largest difference seen 0.20 K, hot and dry: the constant coefficient ignores
/// the change of λ and c_p).
#[test]
fn ashrae_thermodynamic_wet_bulb() {
    let p = 101.325;
    let w_of = |e: f64| 0.621_945 * e / (p - e);
    for t in [10.0, 20.0, 30.0, 40.0, 50.0] {
        for rh in [10.0, 30.0, 50.0, 70.0, 90.0] {
            let e = Humidity::RelativePct(rh).vapour_pressure_kpa(t).unwrap();
            let w = w_of(e);
            let (mut lo, mut hi) = (-40.0f64, t);
            for _ in 0..100 {
                let ts = 0.5 * (lo + hi);
                let ws = w_of(saturation_vapour_pressure_kpa(ts));
                let wc = ((2501.0 - 2.326 * ts) * ws - 1.006 * (t - ts))
                    / (2501.0 + 1.86 * t - 4.186 * ts);
                if wc > w {
                    hi = ts;
                } else {
                    lo = ts;
                }
            }
            let ours = wet_bulb_c(t, e, p, A).unwrap();
            assert!((ours - 0.5 * (lo + hi)).abs() < 0.25, "{t} °C {rh} %");
        }
    }
}

/// The vapour pressure whose wet bulb (psychrometer equation, FAO-56 eq. 15) is `tw` at `t`.
fn rh_for_wet_bulb(t: f64, tw: f64) -> f64 {
    let e = saturation_vapour_pressure_kpa(tw) - A * 101.325 * (t - tw);
    100.0 * e / saturation_vapour_pressure_kpa(t)
}

/// Pad worked example: outside 35 °C dry bulb, 24 °C wet bulb, pad efficiency 85 % gives
/// T_out = 35 − 0.85 (35 − 24) = 25.65 °C (the saturation-effectiveness arithmetic of ASHRAE
/// Handbook—HVAC Applications, evaporative cooling, and ASABE EP406 — example values from memory);
/// printed to 0.01 K. The same in °F (95 °F db, 75 °F wb, 85 %: 78.0 °F, a common extension example,
/// from memory).
#[test]
fn pad_worked_example() {
    let rh = rh_for_wet_bulb(35.0, 24.0);
    let c = pad_outlet(35.0, Humidity::RelativePct(rh), 101.325, 0.85).unwrap();
    assert!((c.wet_bulb_c - 24.0).abs() < 1e-6);
    assert!(
        (c.outlet_temp_c - 25.65).abs() < 0.005,
        "{}",
        c.outlet_temp_c
    );
    let (t, tw) = ((95.0 - 32.0) / 1.8, (75.0 - 32.0) / 1.8);
    let c = pad_outlet(
        t,
        Humidity::RelativePct(rh_for_wet_bulb(t, tw)),
        101.325,
        0.85,
    )
    .unwrap();
    let out_f = c.outlet_temp_c * 1.8 + 32.0;
    assert!((out_f - 78.0).abs() < 0.05, "{out_f}");
}

/// Energy closure of adiabatic evaporative cooling (first law, no source needed): the sensible heat
/// the air loses, ρ_d (c_pd + w c_pv) ΔT per m³ of inlet air, equals the latent heat λ(T_w) of the
/// water it takes up, within 4 % (the psychrometer equation is linear in e while the mixing ratio
/// carries a factor P/(P − e) ≈ 1.02–1.03, and its coefficient is a constant, not exactly
/// c_p/(ε λ)).
#[test]
fn evaporative_cooling_conserves_energy() {
    for (t, rh, eta) in [(35.0, 30.0, 0.8), (28.0, 60.0, 0.9), (42.0, 15.0, 0.7)] {
        let c = pad_outlet(t, Humidity::RelativePct(rh), 101.325, eta).unwrap();
        let e = Humidity::RelativePct(rh).vapour_pressure_kpa(t).unwrap();
        use leafwind_physics::constants as k;
        let rho_dry = (101.325 - e) * 1e3 * k::MOLAR_MASS_DRY_AIR_KG_MOL
            / (k::GAS_CONSTANT_J_MOL_K * (t + k::ZERO_CELSIUS_K));
        let w = k::MOLAR_MASS_RATIO_WATER_AIR * e / (101.325 - e);
        let cp = k::SPECIFIC_HEAT_DRY_AIR_J_KG_K + w * k::SPECIFIC_HEAT_WATER_VAPOUR_J_KG_K;
        let sensible = rho_dry * cp * (t - c.outlet_temp_c);
        let latent = latent_heat_j_kg(c.wet_bulb_c) * c.water_kg_m3;
        assert!(
            (latent / sensible - 1.0).abs() < 0.04,
            "{t} {rh}: {latent} vs {sensible}"
        );
        assert!(c.outlet_rh_pct <= 100.0 && c.outlet_rh_pct > rh);
    }
}

/// Fog (definitions of this engine): never past its humidity cap; the more humid the outside air,
/// the less it cools; air already at the cap is not cooled.
#[test]
fn fog_is_limited_by_outside_humidity() {
    let mut last_cooling = f64::INFINITY;
    for rh in [20.0, 40.0, 60.0, 75.0, 85.0] {
        let c = fog_outlet(32.0, Humidity::RelativePct(rh), 101.325, 0.9, 90.0).unwrap();
        assert!(c.outlet_rh_pct <= 90.0 + 1e-4);
        let cooling = 32.0 - c.outlet_temp_c;
        assert!(cooling < last_cooling);
        last_cooling = cooling;
    }
    let at_cap = fog_outlet(32.0, Humidity::RelativePct(92.0), 101.325, 0.9, 90.0).unwrap();
    assert_eq!(at_cap.outlet_temp_c, 32.0);
    assert_eq!(at_cap.efficiency, 0.0);
}

/// Pad-to-fan rise: ΔT = q (x/L) / (ρ c_p V) (steady energy balance of the air stream; ASABE EP406,
/// from memory): linear along the house, inverse in the airflow.
#[test]
fn pad_to_fan_rise_is_linear() {
    let full = pad_to_fan_rise_k(300.0, 0.04, 1.0, 1.15);
    assert!((pad_to_fan_rise_k(300.0, 0.04, 0.5, 1.15) - 0.5 * full).abs() < 1e-12);
    assert!((pad_to_fan_rise_k(300.0, 0.08, 1.0, 1.15) - 0.5 * full).abs() < 1e-12);
    assert!((full - 300.0 / (1.15 * 1006.0 * 0.04)).abs() < 1e-12);
}

/// The option table at one invented hot moment (no source; physical ordering): shade, whitewash,
/// pads and fog each leave the hottest leaf cooler than no measure; pads lower the inside air and
/// raise its humidity; the combination beats each of its parts; water only with evaporative options.
#[test]
fn options_side_by_side_moment() {
    let base = GreenhouseCase::default();
    let rows = compare_moment(&base, &standard_options(0.6, 2.0), Some(35.0)).unwrap();
    let get = |l: &str| rows.iter().find(|r| r.label == l).unwrap();
    let none = get("none");
    for l in ["fans only", "shade screen", "whitewash", "pads", "fog"] {
        assert!(get(l).hottest_leaf_temp_c < none.hottest_leaf_temp_c, "{l}");
    }
    let pads = get("pads");
    assert!(pads.inside_air_temp_c < none.inside_air_temp_c);
    assert!(pads.inside_rh_pct > none.inside_rh_pct);
    assert!(pads.pad_to_fan_rise_k > 0.0);
    let combo = get("pads + fans + shade");
    for l in ["fans only", "shade screen", "pads"] {
        assert!(
            combo.hottest_leaf_temp_c < get(l).hottest_leaf_temp_c,
            "{l}"
        );
    }
    for r in &rows {
        let evaporative = r.label.contains("pads") || r.label == "fog";
        assert_eq!(r.water_kg_m2_h > 1e-6, evaporative, "{}", r.label);
        assert!(r.hottest_leaf_temp_c.is_finite());
        assert!((r.margin_k.unwrap() - (35.0 - r.hottest_leaf_temp_c)).abs() < 1e-12);
    }
}

/// Over an invented design day in a greenhouse: hours add up, fan energy = power × operating hours,
/// and every editable field of an option is honoured (a user option with 30 % shade lands between
/// none and the 50 % screen).
#[test]
fn options_over_a_design_day() {
    let case = SeriesCase {
        environment: Environment::Greenhouse(Default::default()),
        ..SeriesCase::default()
    };
    let mut options = standard_options(0.6, 2.0);
    options.push(CoolingOption {
        label: "user 30 % shade".into(),
        shade_fraction: 0.3,
        ..options[0].clone()
    });
    let rows = compare_design_day(&DesignDay::default(), &case, &options, 25.0).unwrap();
    let get = |l: &str| rows.iter().find(|r| r.label == l).unwrap();
    for r in &rows {
        assert_eq!(r.series.hours.len(), 24);
        assert_eq!(r.failed_hours, 0);
        let p = options
            .iter()
            .find(|o| o.label == r.label)
            .unwrap()
            .circulation_power_w_m2;
        assert!((r.fan_energy_kwh_m2 - p * r.operating_hours_h / 1000.0).abs() < 1e-12);
        assert!(r.hours_over_limit <= 24.0);
    }
    let (none, user, screen) = (get("none"), get("user 30 % shade"), get("shade screen"));
    let hot = |r: &leafwind_physics::cooling::OptionDay| r.hottest_leaf_temp_c.unwrap();
    assert!(hot(screen) < hot(user) && hot(user) < hot(none));
    assert!(get("pads").water_kg_m2 > 0.0 && none.water_kg_m2 < 1e-6);
    // A case that is not a greenhouse is refused with a sentence.
    assert!(
        compare_design_day(
            &DesignDay::default(),
            &SeriesCase::default(),
            &options,
            25.0
        )
        .is_err()
    );
    // Off is off.
    assert!(matches!(options[0].evaporative, Evaporative::Off));
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(128))]

    /// Over the valid domain: dew point ≤ T_w ≤ T, the psychrometer equation holds at the answer,
    /// and pad outlets lie between T_w and T with RH ≤ 100 %.
    #[test]
    fn wet_bulb_invariants(t in -10.0f64..50.0, rh in 1.0f64..100.0, p in 70.0f64..105.0, eta in 0.0f64..1.0) {
        let e = Humidity::RelativePct(rh).vapour_pressure_kpa(t).unwrap();
        let tw = wet_bulb_c(t, e, p, A).unwrap();
        prop_assert!(tw <= t + 1e-9);
        if let Ok(dew) = dew_point_c(e) {
            prop_assert!(tw >= dew - 1e-9);
        }
        let resid = saturation_vapour_pressure_kpa(tw) - A * p * (t - tw) - e;
        prop_assert!(resid.abs() < 1e-8);
        let c = pad_outlet(t, Humidity::RelativePct(rh), p, eta).unwrap();
        prop_assert!(c.outlet_temp_c >= tw - 1e-9 && c.outlet_temp_c <= t + 1e-9);
        prop_assert!(c.outlet_rh_pct <= 100.0);
    }
}

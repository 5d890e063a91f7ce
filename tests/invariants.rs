//! Invariants of the single-leaf engine: energy closure, reductions to simpler cases, monotonic
//! trends of the trade, the inverse question re-checked, and typed errors for invalid input.

use leafwind_physics::case::{AIR_SPEED_RANGE_M_S, LEAF_DIMENSION_RANGE_M};
use leafwind_physics::required_wind::Unreachable;
use leafwind_physics::{
    Air, Humidity, Leaf, LeafCase, PhysicsError, Surroundings, UpperView, WindAnswer,
    required_wind, solve_leaf,
};
use proptest::prelude::*;

/// A sunlit glasshouse-like case (invented for the tests).
fn sunny(speed_m_s: f64, dimension_m: f64) -> LeafCase {
    LeafCase {
        air: Air {
            temp_c: 30.0,
            humidity: Humidity::RelativePct(50.0),
            speed_m_s,
            ..Air::default()
        },
        leaf: Leaf {
            dimension_m,
            ..Leaf::default()
        },
        surroundings: Surroundings {
            shortwave_w_m2: 700.0,
            ..Surroundings::default()
        },
        ..LeafCase::default()
    }
}

#[test]
fn no_stomata_and_no_radiation_surplus_sits_at_air_temperature() {
    // Reduction (energy balance identity): with no vapour path and surroundings radiating at the
    // air temperature in the dark, every term vanishes at T_L = T_a.
    for (t, u) in [(-10.0, 0.0), (5.0, 0.3), (25.0, 2.0), (45.0, 10.0)] {
        let mut c = sunny(u, 0.05);
        c.air.temp_c = t;
        c.surroundings.shortwave_w_m2 = 0.0;
        c.surroundings.upper_view = UpperView::SkyTempC(t);
        c.surroundings.ground_temp_c = Some(t);
        c.leaf.stomatal_conductance_mol_m2_s = 0.0;
        c.leaf.cuticular_conductance_mol_m2_s = 0.0;
        let s = solve_leaf(&c).unwrap();
        assert!(
            s.leaf_air_diff_k.abs() < 1e-9,
            "{t} °C, {u} m/s: {}",
            s.leaf_air_diff_k
        );
        assert!(s.terms.latent_w_m2.abs() < 1e-9);
    }
}

#[test]
fn exact_and_linearised_agree_for_small_differences() {
    // The linearisation error is second order in ΔT (Monteith & Unsworth 2013, ch. 13): for a
    // leaf within a few tenths of a kelvin of the air the two agree to within 0.01 K, and
    // halving the radiation load roughly quarters their difference.
    let mut c = sunny(2.0, 0.02);
    c.surroundings.upper_view = UpperView::SkyTempC(30.0);
    c.air.humidity = Humidity::RelativePct(90.0);
    c.surroundings.shortwave_w_m2 = 40.0;
    let small = solve_leaf(&c).unwrap();
    assert!(small.leaf_air_diff_k.abs() < 0.5);
    assert!(
        small.linearisation_error_k().abs() < 0.01,
        "{}",
        small.linearisation_error_k()
    );
    let big_case = LeafCase {
        surroundings: Surroundings {
            shortwave_w_m2: 800.0,
            ..c.surroundings
        },
        ..c
    };
    let big = solve_leaf(&big_case).unwrap();
    assert!(big.linearisation_error_k().abs() > small.linearisation_error_k().abs());
}

#[test]
fn boundary_layer_thins_with_air_speed_and_with_shorter_leaves() {
    // Common practice, no source (and Blasius: δ ∝ √(ν x / U)).
    let mut last = f64::INFINITY;
    for u in [0.05, 0.1, 0.3, 1.0, 3.0] {
        let s = solve_leaf(&sunny(u, 0.05)).unwrap();
        let d = s.bl_thickness_m.unwrap();
        assert!(d < last, "{u} m/s: {d}");
        last = d;
        let eff = s.effective_bl_thickness_m.unwrap();
        assert!(eff > 0.0 && eff < d);
    }
    let mut last = 0.0;
    for d in [0.005, 0.02, 0.05, 0.1, 0.3] {
        let t = solve_leaf(&sunny(0.5, d)).unwrap().bl_thickness_m.unwrap();
        assert!(t > last);
        last = t;
    }
}

#[test]
fn more_wind_brings_a_sunlit_dry_leaf_toward_air_temperature() {
    // Common practice, no source: a sunlit leaf with closed stomata runs warmer than the air, and
    // the more the air moves the closer it comes.
    let mut last = f64::INFINITY;
    for u in [0.0, 0.05, 0.2, 0.5, 1.0, 2.0, 5.0, 10.0] {
        let mut c = sunny(u, 0.08);
        c.leaf.stomatal_conductance_mol_m2_s = 0.0;
        let diff = solve_leaf(&c).unwrap().leaf_air_diff_k;
        assert!(diff > 0.0 && diff < last, "{u} m/s: {diff}");
        last = diff;
    }
}

#[test]
fn smaller_leaves_run_closer_to_air_temperature() {
    // Common practice, no source: at the same air speed a smaller leaf has a thinner boundary
    // layer and a sunlit one runs cooler.
    let mut last = 0.0;
    for d in [0.005, 0.02, 0.05, 0.15, 0.4] {
        let mut c = sunny(0.3, d);
        c.leaf.stomatal_conductance_mol_m2_s = 0.05;
        let diff = solve_leaf(&c).unwrap().leaf_air_diff_k;
        assert!(diff > last, "{d} m: {diff}");
        last = diff;
    }
}

#[test]
fn least_air_speed_meets_the_target_and_5_percent_less_does_not() {
    let c = sunny(0.1, 0.1);
    let answer = required_wind(&c, 34.0, 1.0, 10.0).unwrap();
    let WindAnswer::Speed { speed_m_s, .. } = answer else {
        panic!("expected a speed, got {answer:?}");
    };
    let at = solve_leaf(&c.with_speed(speed_m_s)).unwrap().leaf_temp_c;
    let below = solve_leaf(&c.with_speed(0.95 * speed_m_s))
        .unwrap()
        .leaf_temp_c;
    assert!(at <= 33.0 + 1e-9, "at the answer: {at}");
    assert!(below > 33.0, "5 % below: {below}");
}

#[test]
fn least_air_speed_honest_answers() {
    // Air hotter than the target: no speed can do it, and the reason says so.
    let hot = sunny(0.5, 0.05);
    match required_wind(&hot, 29.0, 0.0, 10.0).unwrap() {
        WindAnswer::Unreachable(Unreachable::AirTooHot { .. }) => {}
        other => panic!("{other:?}"),
    }
    assert!(
        required_wind(&hot, 29.0, 0.0, 10.0)
            .unwrap()
            .sentence()
            .contains("No air speed")
    );
    // A shaded, transpiring leaf well below a high limit needs no air at all.
    let mut shade = sunny(0.5, 0.05);
    shade.surroundings.shortwave_w_m2 = 50.0;
    assert!(matches!(
        required_wind(&shade, 40.0, 2.0, 10.0).unwrap(),
        WindAnswer::NotNeeded { .. }
    ));
    // A transpiring leaf below hot dry air: more air warms it; a target between the leaf and the
    // air is met in still air and lost again at some speed (the ceiling).
    let mut dry = sunny(0.5, 0.05);
    dry.air.temp_c = 40.0;
    dry.air.humidity = Humidity::RelativePct(15.0);
    dry.surroundings.shortwave_w_m2 = 0.0;
    dry.surroundings.upper_view = UpperView::CoverTempC(40.0);
    dry.leaf.stomatal_conductance_mol_m2_s = 0.8;
    let still = solve_leaf(&dry.with_speed(0.0)).unwrap().leaf_temp_c;
    let windy = solve_leaf(&dry.with_speed(10.0)).unwrap().leaf_temp_c;
    assert!(still < windy && windy < 40.0, "{still} {windy}");
    let target = 0.5 * (still + windy);
    match required_wind(&dry, target, 0.0, 10.0).unwrap() {
        WindAnswer::NotNeeded {
            ceiling_m_s: Some(c),
            ..
        } => assert!(c > 0.0 && c < 10.0),
        WindAnswer::Speed {
            ceiling_m_s: Some(_),
            ..
        } => {}
        other => panic!("{other:?}"),
    }
    // Strong sun on a closed leaf with a limit below reach: beyond the search.
    let mut closed = sunny(0.5, 0.3);
    closed.leaf.stomatal_conductance_mol_m2_s = 0.0;
    closed.surroundings.shortwave_w_m2 = 1100.0;
    closed.leaf.absorptivity = 0.9;
    assert!(matches!(
        required_wind(&closed, 30.2, 0.0, 1.0).unwrap(),
        WindAnswer::Unreachable(Unreachable::BeyondSearch { .. })
    ));
}

#[test]
fn every_range_end_solves() {
    let base = sunny(0.5, 0.05);
    for u in [AIR_SPEED_RANGE_M_S.min, AIR_SPEED_RANGE_M_S.max] {
        for d in [LEAF_DIMENSION_RANGE_M.min, LEAF_DIMENSION_RANGE_M.max] {
            for t in [-30.0, 60.0] {
                for rh in [0.0, 100.0] {
                    for sun in [0.0, 1400.0] {
                        let mut c = base.with_speed(u).with_dimension(d);
                        c.air.temp_c = t;
                        c.air.humidity = Humidity::RelativePct(rh);
                        c.surroundings.shortwave_w_m2 = sun;
                        let s = solve_leaf(&c).unwrap();
                        assert!(s.solver.residual.abs() < 1e-6, "{c:?}");
                        assert!(s.leaf_temp_c.is_finite());
                    }
                }
            }
        }
    }
}

#[test]
fn invalid_inputs_are_typed_errors() {
    let base = sunny(0.5, 0.05);
    let mut cases = Vec::new();
    for bad in [f64::NAN, f64::INFINITY, f64::NEG_INFINITY] {
        cases.push(LeafCase {
            air: Air {
                temp_c: bad,
                ..base.air
            },
            ..base
        });
        cases.push(base.with_speed(bad));
        cases.push(base.with_dimension(bad));
    }
    cases.push(base.with_speed(-0.1));
    cases.push(base.with_dimension(0.0));
    cases.push(base.with_dimension(-0.05));
    cases.push(LeafCase {
        air: Air {
            humidity: Humidity::RelativePct(100.1),
            ..base.air
        },
        ..base
    });
    cases.push(LeafCase {
        air: Air {
            temp_c: 500.0,
            ..base.air
        },
        ..base
    });
    cases.push(LeafCase {
        air: Air {
            temp_c: -273.0,
            ..base.air
        },
        ..base
    });
    for c in cases {
        match solve_leaf(&c) {
            Err(PhysicsError::OutOfRange { .. } | PhysicsError::NotFinite { .. }) => {}
            other => panic!("{c:?} gave {other:?}"),
        }
    }
}

fn any_case() -> impl Strategy<Value = LeafCase> {
    (
        (
            -30.0..=60.0f64,
            0.0..=100.0f64,
            50.0..=110.0f64,
            0.0..=30.0f64,
            1.0..=2.5f64,
        ),
        (
            0.001..=1.0f64,
            0.0..=1.0f64,
            0.5..=1.0f64,
            0.0..=1.5f64,
            0.0..=1.0f64,
            0.0..=0.05f64,
        ),
        (
            0.0..=1400.0f64,
            0.0..=1.0f64,
            prop::option::of(-80.0..=80.0f64),
            prop::option::of(-30.0..=80.0f64),
        ),
    )
        .prop_map(
            |((t, rh, p, u, tf), (d, a, e, gs, share, gc), (sw, alb, sky, ground))| LeafCase {
                air: Air {
                    temp_c: t,
                    humidity: Humidity::RelativePct(rh),
                    pressure_kpa: p,
                    speed_m_s: u,
                    turbulence_factor: tf,
                },
                leaf: Leaf {
                    dimension_m: d,
                    absorptivity: a,
                    emissivity: e,
                    stomatal_conductance_mol_m2_s: gs,
                    lower_share: share,
                    cuticular_conductance_mol_m2_s: gc,
                    free_convection_length_m: None,
                },
                surroundings: Surroundings {
                    shortwave_w_m2: sw,
                    ground_albedo: alb,
                    upper_view: sky.map_or(UpperView::ClearSky, UpperView::SkyTempC),
                    ground_temp_c: ground,
                },
                ..LeafCase::default()
            },
        )
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(2000))]

    /// Energy closure and finiteness over the whole valid domain.
    #[test]
    fn closes_and_stays_finite(c in any_case()) {
        let s = solve_leaf(&c).unwrap();
        prop_assert!(s.solver.residual.abs() < 1e-6, "residual {}", s.solver.residual);
        let t = &s.terms;
        let closure = s.absorbed_w_m2() - t.emitted_w_m2 - t.sensible_w_m2 - t.latent_w_m2;
        prop_assert!(closure.abs() < 1e-6);
        for v in [s.leaf_temp_c, s.linearised.leaf_temp_c, t.transpiration_mol_m2_s,
                  t.convection.reynolds, t.convection.grashof, s.radiative_conductance_w_m2_k] {
            prop_assert!(v.is_finite());
        }
    }

    /// Arbitrary numbers in any field never panic: a result or a typed error.
    #[test]
    fn never_panics(t in any::<f64>(), u in any::<f64>(), d in any::<f64>(), sw in any::<f64>()) {
        let mut c = LeafCase::default().with_speed(u).with_dimension(d);
        c.air.temp_c = t;
        c.surroundings.shortwave_w_m2 = sw;
        if let Ok(s) = solve_leaf(&c) {
            prop_assert!(s.leaf_temp_c.is_finite());
        }
    }
}

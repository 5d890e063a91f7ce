//! Every boundary of every valid range of the engine's public inputs: both ends are accepted (and
//! solve), and just outside — the next float below the minimum or above the maximum, NaN, ±∞ — is
//! a typed [`PhysicsError`] naming the quantity, whose message states the quantity and the range.
//!
//! The ranges are the engine's own `ValidRange` constants; the rule that a check, its message and
//! its documentation agree is the style guide's (common practice, no source). The base cases are
//! invented scenarios.

use std::f64::consts::FRAC_PI_2;

use leafwind_physics::air::{
    AIR_TEMP_RANGE_C, ALTITUDE_RANGE_M, PRESSURE_RANGE_KPA, RELATIVE_HUMIDITY_RANGE_PCT,
    pressure_from_altitude_kpa, saturation_vapour_pressure_kpa,
};
use leafwind_physics::canopy::{
    CANOPY_HEIGHT_RANGE_M, CanopyCase, CanopyStructure, ELEVATION_RANGE_RAD, LAI_RANGE,
    LAYER_COUNT_RANGE, LEAF_ANGLE_X_RANGE, LeafAngle, SEARCH_MAX_RANGE_M_S, WIND_ATTENUATION_RANGE,
    least_top_speed, solve_canopy,
};
use leafwind_physics::case::{
    AIR_SPEED_RANGE_M_S, FREE_CONVECTION_LENGTH_RANGE_M, LEAF_DIMENSION_RANGE_M,
};
use leafwind_physics::convection::{CRITICAL_REYNOLDS_RANGE, TURBULENCE_FACTOR_RANGE};
use leafwind_physics::crops::{HeatLimit, LimitKind};
use leafwind_physics::design_day::{
    DayHumidity, DesignDay, SeriesCase, WIND_FACTOR_RANGE, design_day_weather, run,
};
use leafwind_physics::error::ValidRange;
use leafwind_physics::greenhouse::{
    CoverTemperature, GreenhouseCase, HEAT_LOSS_RANGE_W_M2_K, InsideAir, SHADE_FRACTION_RANGE,
    TRANSMITTANCE_RANGE, VENTILATION_RANGE_M3_M2_S, least_canopy_speed, solve_greenhouse,
};
use leafwind_physics::grid::{Axis, GridAxes};
use leafwind_physics::radiation::{
    ABSORPTIVITY_RANGE, ALBEDO_RANGE, EMISSIVITY_RANGE, SHORTWAVE_RANGE_W_M2, SURFACE_TEMP_RANGE_C,
};
use leafwind_physics::required_wind::{LIMIT_RANGE_C, MARGIN_RANGE_K};
use leafwind_physics::shape::{
    BODY_DIAMETER_RANGE_M, BladeProfile, EXPONENT_RANGE, LeafShape, OUTLINE_SIZE_RANGE_M,
    ShapeError, ShapeMetrics, WIND_ANGLE_RANGE_RAD, cylinder_convection, sphere_convection,
};
use leafwind_physics::sun::{
    LATITUDE_RANGE_DEG, LONGITUDE_RANGE_DEG, Site, UTC_OFFSET_RANGE_H, YEAR_RANGE, split_global,
    sun_position_at,
};
use leafwind_physics::transpiration::{
    CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S, LOWER_SHARE_RANGE, STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S,
};
use leafwind_physics::weather::parse_csv;
use leafwind_physics::{
    Humidity, LeafCase, PhysicsError, UpperView, WindAnswer, required_wind, solve_leaf,
};

/// The same range under another name (the engine does this for, e.g., the sky temperature).
fn named(quantity: &'static str, range: ValidRange) -> ValidRange {
    ValidRange { quantity, ..range }
}

/// Both ends of `range` pass `call`; just outside gives the typed error naming the quantity.
fn check_ends<T>(
    what: &str,
    range: ValidRange,
    mut call: impl FnMut(f64) -> Result<T, PhysicsError>,
) {
    for v in [range.min, range.max] {
        if let Err(e) = call(v) {
            panic!(
                "{what}: the end {v} {} of {} is rejected: {e}",
                range.unit, range.quantity
            );
        }
    }
    for v in [range.min.next_down(), range.max.next_up()] {
        check_out_of_range(what, &range, v, call(v).map(|_| ()));
    }
    for v in [f64::NAN, f64::INFINITY, f64::NEG_INFINITY] {
        match call(v) {
            Err(e @ PhysicsError::NotFinite { quantity, .. }) => {
                assert_eq!(quantity, range.quantity, "{what} at {v}: {e}");
                assert!(e.to_string().contains(range.quantity), "{what}: {e}");
            }
            Err(e) => panic!("{what}: {v} gave the wrong error: {e:?}"),
            Ok(_) => panic!("{what}: {v} was accepted"),
        }
    }
}

/// `result` is the [`PhysicsError::OutOfRange`] of `range` for `value`, with a message that names
/// the quantity, the value and the range.
fn check_out_of_range(
    what: &str,
    range: &ValidRange,
    value: f64,
    result: Result<(), PhysicsError>,
) {
    match result {
        Err(
            ref e @ PhysicsError::OutOfRange {
                quantity,
                value: v,
                min,
                max,
                unit,
            },
        ) => {
            assert_eq!(quantity, range.quantity, "{what} at {value}: {e}");
            assert_eq!(v.to_bits(), value.to_bits(), "{what}: {e}");
            assert_eq!(
                (min, max, unit),
                (range.min, range.max, range.unit),
                "{what}: {e}"
            );
            let msg = e.to_string();
            let span = format!("{} to {}", range.min, range.max);
            assert!(
                msg.contains(range.quantity) && msg.contains(&span) && msg.contains(range.unit),
                "{what}: the message {msg:?} should name {:?} and {span:?}",
                range.quantity
            );
        }
        Err(e) => panic!("{what}: {value} gave the wrong error: {e:?}"),
        Ok(()) => panic!("{what}: {value} (just outside {:?}) was accepted", range),
    }
}

/// A sunlit leaf in a warm glasshouse (invented).
fn base_leaf() -> LeafCase {
    let mut c = LeafCase::default();
    c.air.temp_c = 25.0;
    c.surroundings.shortwave_w_m2 = 500.0;
    c
}

/// `solve_leaf` of `case` with one field set, checked for closure at the range ends.
fn solve_with(set: fn(&mut LeafCase, f64)) -> impl FnMut(f64) -> Result<f64, PhysicsError> {
    move |v| {
        let mut c = base_leaf();
        set(&mut c, v);
        solve_leaf(&c).map(|s| {
            assert!(s.solver.residual.abs() < 1e-6, "{c:?}: {:?}", s.solver);
            assert!(s.leaf_temp_c.is_finite(), "{c:?}");
            s.leaf_temp_c
        })
    }
}

#[test]
fn single_leaf_inputs() {
    type Set = fn(&mut LeafCase, f64);
    let t = base_leaf().air.temp_c;
    let table: [(ValidRange, Set); 21] = [
        (AIR_TEMP_RANGE_C, |c, v| c.air.temp_c = v),
        (RELATIVE_HUMIDITY_RANGE_PCT, |c, v| {
            c.air.humidity = Humidity::RelativePct(v);
        }),
        // Humidity::vapour_pressure_kpa: a dew point from the bottom of the range to the air.
        (
            ValidRange {
                quantity: "dew point",
                min: AIR_TEMP_RANGE_C.min,
                max: t,
                unit: "°C",
            },
            |c, v| c.air.humidity = Humidity::DewPointC(v),
        ),
        // … and a deficit from 0 to e°(T_a).
        (
            ValidRange {
                quantity: "vapour-pressure deficit",
                min: 0.0,
                max: saturation_vapour_pressure_kpa(t),
                unit: "kPa",
            },
            |c, v| c.air.humidity = Humidity::DeficitKpa(v),
        ),
        (PRESSURE_RANGE_KPA, |c, v| c.air.pressure_kpa = v),
        (AIR_SPEED_RANGE_M_S, |c, v| c.air.speed_m_s = v),
        (TURBULENCE_FACTOR_RANGE, |c, v| c.air.turbulence_factor = v),
        (LEAF_DIMENSION_RANGE_M, |c, v| c.leaf.dimension_m = v),
        (FREE_CONVECTION_LENGTH_RANGE_M, |c, v| {
            c.leaf.free_convection_length_m = Some(v);
        }),
        (ABSORPTIVITY_RANGE, |c, v| c.leaf.absorptivity = v),
        (EMISSIVITY_RANGE, |c, v| c.leaf.emissivity = v),
        (STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S, |c, v| {
            c.leaf.stomatal_conductance_mol_m2_s = v;
        }),
        (LOWER_SHARE_RANGE, |c, v| c.leaf.lower_share = v),
        (CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S, |c, v| {
            c.leaf.cuticular_conductance_mol_m2_s = v;
        }),
        (SHORTWAVE_RANGE_W_M2, |c, v| {
            c.surroundings.shortwave_w_m2 = v
        }),
        (ALBEDO_RANGE, |c, v| c.surroundings.ground_albedo = v),
        (named("sky temperature", SURFACE_TEMP_RANGE_C), |c, v| {
            c.surroundings.upper_view = UpperView::SkyTempC(v);
        }),
        (named("cover temperature", SURFACE_TEMP_RANGE_C), |c, v| {
            c.surroundings.upper_view = UpperView::CoverTempC(v);
        }),
        (named("ground temperature", SURFACE_TEMP_RANGE_C), |c, v| {
            c.surroundings.ground_temp_c = Some(v);
        }),
        (CRITICAL_REYNOLDS_RANGE, |c, v| c.critical_reynolds = v),
        // The air temperature again at the bottom, with the dew point at the bottom too.
        (AIR_TEMP_RANGE_C, |c, v| {
            c.air.temp_c = v;
            c.air.humidity = Humidity::DewPointC(AIR_TEMP_RANGE_C.min);
        }),
    ];
    for (range, set) in table {
        check_ends(
            &format!("solve_leaf, {}", range.quantity),
            range,
            solve_with(set),
        );
    }
}

/// The hottest corner of the single-leaf domain: air at −30 °C, dry and still, a 1 m leaf that
/// absorbs all of 1400 W/m² from above and as much again from a white ground, emissivity 0.5,
/// stomata and cuticle closed, a clear sky and a ground at −80 °C — every input at a range end.
/// The balance crosses zero about +167 K from the air (a leaf near 137 °C, far beyond the
/// −30 to 60 °C of the property fits), beyond the solver's ±120 K search
/// (`energy_balance::SEARCH_HALF_WIDTH_K`), so `solve_leaf` returns `NoBracket` for a valid case.
/// Engine bug reported to the lead; this test fails until the search covers the valid domain (or
/// the domain is narrowed and the limit documented).
#[test]
fn hottest_corner_of_the_single_leaf_domain_solves() {
    let mut c = LeafCase::default();
    c.air.temp_c = AIR_TEMP_RANGE_C.min;
    c.air.humidity = Humidity::RelativePct(0.0);
    c.air.pressure_kpa = PRESSURE_RANGE_KPA.min;
    c.air.speed_m_s = 0.0;
    c.air.turbulence_factor = TURBULENCE_FACTOR_RANGE.min;
    c.leaf.dimension_m = LEAF_DIMENSION_RANGE_M.max;
    c.leaf.absorptivity = ABSORPTIVITY_RANGE.max;
    c.leaf.emissivity = EMISSIVITY_RANGE.min;
    c.leaf.stomatal_conductance_mol_m2_s = 0.0;
    c.leaf.cuticular_conductance_mol_m2_s = 0.0;
    c.surroundings.shortwave_w_m2 = SHORTWAVE_RANGE_W_M2.max;
    c.surroundings.ground_albedo = ALBEDO_RANGE.max;
    c.surroundings.upper_view = UpperView::ClearSky;
    c.surroundings.ground_temp_c = Some(SURFACE_TEMP_RANGE_C.min);
    let s = solve_leaf(&c).unwrap_or_else(|e| panic!("a valid case fails: {e}\n{c:?}"));
    assert!(s.solver.residual.abs() < 1e-6, "{:?}", s.solver);
}

/// Every corner of the single-leaf domain (twelve inputs at either end) solves and closes.
/// Fails today for 84 of the 4096 corners (the bug above).
#[test]
fn every_corner_of_the_single_leaf_domain_solves() {
    let mut failed = Vec::new();
    for bits in 0u32..1 << 12 {
        let end = |k: u32, r: ValidRange| if bits >> k & 1 == 1 { r.max } else { r.min };
        let mut c = LeafCase::default();
        c.air.temp_c = end(0, AIR_TEMP_RANGE_C);
        c.air.humidity = Humidity::RelativePct(end(1, RELATIVE_HUMIDITY_RANGE_PCT));
        c.air.pressure_kpa = end(2, PRESSURE_RANGE_KPA);
        c.air.speed_m_s = end(3, AIR_SPEED_RANGE_M_S);
        c.leaf.dimension_m = end(4, LEAF_DIMENSION_RANGE_M);
        c.leaf.absorptivity = end(5, ABSORPTIVITY_RANGE);
        c.surroundings.shortwave_w_m2 = end(5, SHORTWAVE_RANGE_W_M2);
        c.leaf.emissivity = end(6, EMISSIVITY_RANGE);
        c.leaf.stomatal_conductance_mol_m2_s = end(7, STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S);
        c.leaf.cuticular_conductance_mol_m2_s = end(7, CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S);
        c.surroundings.ground_albedo = end(8, ALBEDO_RANGE);
        c.surroundings.upper_view = if bits >> 9 & 1 == 1 {
            UpperView::CoverTempC(end(10, SURFACE_TEMP_RANGE_C))
        } else {
            UpperView::ClearSky
        };
        c.surroundings.ground_temp_c = Some(end(11, SURFACE_TEMP_RANGE_C));
        match solve_leaf(&c) {
            Ok(s) if s.solver.residual.abs() < 1e-6 && s.leaf_temp_c.is_finite() => {}
            other => failed.push(format!("{bits:012b}: {:?}", other.map(|s| s.solver))),
        }
    }
    assert!(
        failed.is_empty(),
        "{} of 4096 corners fail, e.g.\n{}",
        failed.len(),
        failed[..failed.len().min(5)].join("\n")
    );
}

/// The bottom of the air-speed range is continuous: a transpiring leaf in dry air (the default leaf
/// at 25 °C, RH 10 %, 300 W/m²) runs at −4.29 K from the air in still air and at 1 mm/s, but
/// `solve_leaf` reports +0.0004 K at 1 µm/s to 0.1 mm/s. The balance has three roots there (about
/// −4.3, −0.0003 and +0.0004 K, found by scanning `PreparedLeaf::terms`): the free-convection
/// vapour conductance grows as |ΔT|^¼, so the residual is not monotonic in T_L, against the
/// uniqueness `PreparedLeaf::solve_exact` relies on; in moving air the solve starts at the air
/// temperature and stops at the near-air root, in still air it starts from the linearised estimate
/// and finds the cold one. Engine bug reported to the lead; fails until the engine picks one root
/// consistently (and says which).
#[test]
fn leaf_temperature_is_continuous_at_the_bottom_of_the_speed_range() {
    let mut c = LeafCase::default();
    c.air.temp_c = 25.0;
    c.air.humidity = Humidity::RelativePct(10.0);
    c.surroundings.shortwave_w_m2 = 300.0;
    let still = solve_leaf(&c.with_speed(0.0)).unwrap().leaf_air_diff_k;
    for u in [1e-6, 1e-5, 1e-4, 1e-3] {
        let d = solve_leaf(&c.with_speed(u)).unwrap().leaf_air_diff_k;
        assert!(
            (d - still).abs() < 0.01,
            "leaf − air is {still:.4} K in still air but {d:.4} K at {u} m/s"
        );
    }
}

#[test]
fn required_wind_limit_margin_and_search_maximum() {
    let c = base_leaf();
    check_ends("required_wind limit", LIMIT_RANGE_C, |v| {
        required_wind(&c, v, 0.0, 10.0)
    });
    check_ends("required_wind margin", MARGIN_RANGE_K, |v| {
        required_wind(&c, 45.0, v, 10.0)
    });
    // required_wind builds this range itself: 0.1 m/s up to the top of the air-speed range.
    let max = named(
        "air speed search maximum",
        ValidRange {
            min: 0.1,
            ..AIR_SPEED_RANGE_M_S
        },
    );
    check_ends("required_wind search maximum", max, |v| {
        let a = required_wind(&c, 30.0, 1.0, v)?;
        if let WindAnswer::Speed { speed_m_s, .. } = a {
            assert!(speed_m_s <= v);
        }
        Ok(a)
    });
    // The case itself is checked too.
    check_ends("required_wind case speed", AIR_SPEED_RANGE_M_S, |v| {
        required_wind(&c.with_speed(v), 30.0, 1.0, 10.0)
    });
}

#[test]
fn altitude_and_humidity_forms() {
    check_ends("pressure_from_altitude_kpa", ALTITUDE_RANGE_M, |z| {
        let p = pressure_from_altitude_kpa(z)?;
        assert!(p.is_finite() && p > 0.0);
        // Every altitude of the range gives a pressure the engine accepts.
        PRESSURE_RANGE_KPA.check(p)
    });
    for t in [AIR_TEMP_RANGE_C.min, 0.0, 25.0, AIR_TEMP_RANGE_C.max] {
        check_ends("Humidity::RelativePct", RELATIVE_HUMIDITY_RANGE_PCT, |v| {
            Humidity::RelativePct(v).vapour_pressure_kpa(t)
        });
        let dew = ValidRange {
            quantity: "dew point",
            min: AIR_TEMP_RANGE_C.min,
            max: t,
            unit: "°C",
        };
        if dew.max > dew.min {
            check_ends("Humidity::DewPointC", dew, |v| {
                Humidity::DewPointC(v).vapour_pressure_kpa(t)
            });
        }
        let deficit = ValidRange {
            quantity: "vapour-pressure deficit",
            min: 0.0,
            max: saturation_vapour_pressure_kpa(t),
            unit: "kPa",
        };
        check_ends("Humidity::DeficitKpa", deficit, |v| {
            let e = Humidity::DeficitKpa(v).vapour_pressure_kpa(t)?;
            assert!(e >= 0.0, "deficit {v} at {t} °C gives e_a = {e}");
            Ok(e)
        });
    }
    check_ends("Humidity air temperature", AIR_TEMP_RANGE_C, |t| {
        Humidity::RelativePct(50.0).vapour_pressure_kpa(t)
    });
}

/// A sunlit open canopy of a few layers (invented).
fn base_canopy() -> CanopyCase {
    let mut c = CanopyCase::default();
    c.structure.layers = 4;
    c
}

#[test]
fn canopy_inputs() {
    type Set = fn(&mut CanopyCase, f64);
    let table: [(ValidRange, Set); 9] = [
        (LAI_RANGE, |c, v| c.structure.lai = v),
        (CANOPY_HEIGHT_RANGE_M, |c, v| c.structure.height_m = v),
        (LEAF_ANGLE_X_RANGE, |c, v| {
            c.structure.leaf_angle = LeafAngle::Ellipsoidal(v);
        }),
        (WIND_ATTENUATION_RANGE, |c, v| {
            c.structure.wind_attenuation = v
        }),
        // With no beam, so that a sun below the horizon is consistent.
        (ELEVATION_RANGE_RAD, |c, v| {
            c.light.sun_elevation_rad = v;
            c.light.shortwave.beam_w_m2 = 0.0;
        }),
        // With the sun at the zenith, so that the whole beam range is consistent.
        (
            named("beam sunlight on the horizontal", SHORTWAVE_RANGE_W_M2),
            |c, v| {
                c.light.sun_elevation_rad = FRAC_PI_2;
                c.light.shortwave.beam_w_m2 = v;
            },
        ),
        (
            named("diffuse sunlight on the horizontal", SHORTWAVE_RANGE_W_M2),
            |c, v| {
                c.light.shortwave.diffuse_w_m2 = v;
            },
        ),
        (LIMIT_RANGE_C, |c, v| c.limit_c = Some(v)),
        // The leaf inputs reach the canopy through the single leaf's checks.
        (AIR_SPEED_RANGE_M_S, |c, v| c.air.speed_m_s = v),
    ];
    for (range, set) in table {
        check_ends(&format!("solve_canopy, {}", range.quantity), range, |v| {
            let mut c = base_canopy();
            set(&mut c, v);
            let s = solve_canopy(&c)?;
            assert!(s.max_residual_w_m2 < 1e-6, "{c:?}: {}", s.max_residual_w_m2);
            Ok(s)
        });
    }
    // The number of layers is whole: 1 and 200 solve, 0 and 201 are named errors.
    let mut c = base_canopy();
    for n in [1, 200] {
        c.structure.layers = n;
        solve_canopy(&c).unwrap();
    }
    for n in [0, 201] {
        c.structure.layers = n;
        check_out_of_range(
            "canopy layers",
            &LAYER_COUNT_RANGE,
            n as f64,
            solve_canopy(&c).map(|_| ()),
        );
    }
    let c = base_canopy();
    check_ends(
        "least_top_speed search maximum",
        SEARCH_MAX_RANGE_M_S,
        |v| least_top_speed(&c, 35.0, 1.0, v),
    );
    check_ends("least_top_speed limit", LIMIT_RANGE_C, |v| {
        least_top_speed(&c, v, 0.0, 5.0)
    });
    check_ends("least_top_speed margin", MARGIN_RANGE_K, |v| {
        least_top_speed(&c, 45.0, v, 5.0)
    });
}

/// A ventilated house of a few canopy layers (invented).
fn base_house() -> GreenhouseCase {
    let mut c = GreenhouseCase::default();
    c.structure.layers = 3;
    c
}

#[test]
fn greenhouse_inputs() {
    type Set = fn(&mut GreenhouseCase, f64);
    let table: [(ValidRange, Set); 12] = [
        (
            named("outside air temperature", AIR_TEMP_RANGE_C),
            |c, v| {
                c.outside.air_temp_c = v;
            },
        ),
        (RELATIVE_HUMIDITY_RANGE_PCT, |c, v| {
            c.outside.humidity = Humidity::RelativePct(v);
        }),
        (PRESSURE_RANGE_KPA, |c, v| c.outside.pressure_kpa = v),
        (ELEVATION_RANGE_RAD, |c, v| {
            c.outside.sun_elevation_rad = v;
            c.outside.shortwave.beam_w_m2 = 0.0;
        }),
        (TRANSMITTANCE_RANGE, |c, v| c.cover.transmittance = v),
        (HEAT_LOSS_RANGE_W_M2_K, |c, v| c.cover.heat_loss_w_m2_k = v),
        (named("cover temperature", SURFACE_TEMP_RANGE_C), |c, v| {
            c.cover.temperature = CoverTemperature::GivenC(v);
        }),
        (SHADE_FRACTION_RANGE, |c, v| c.shade_fraction = v),
        (named("inside air temperature", AIR_TEMP_RANGE_C), |c, v| {
            c.inside = InsideAir::Given {
                temp_c: v,
                humidity: Humidity::RelativePct(60.0),
            };
        }),
        (VENTILATION_RANGE_M3_M2_S, |c, v| {
            c.inside = InsideAir::Ventilated { rate_m3_m2_s: v };
        }),
        (AIR_SPEED_RANGE_M_S, |c, v| c.canopy_top_speed_m_s = v),
        (LAI_RANGE, |c, v| c.structure.lai = v),
    ];
    for (range, set) in table {
        check_ends(&format!("greenhouse, {}", range.quantity), range, |v| {
            let mut c = base_house();
            set(&mut c, v);
            c.validate()?;
            // At a valid end the house either balances or says why it cannot (a steady
            // ventilation balance has no root for every valid input).
            match solve_greenhouse(&c) {
                Ok(s) => assert!(s.inside_air_temp_c.is_finite()),
                Err(PhysicsError::Inconsistent(_)) => {}
                Err(e) => panic!("{}: {v} is accepted but fails: {e}", range.quantity),
            }
            Ok(())
        });
    }
    let c = base_house();
    check_ends(
        "least_canopy_speed search maximum",
        SEARCH_MAX_RANGE_M_S,
        |v| least_canopy_speed(&c, 40.0, 1.0, v),
    );
}

/// A short design day over a canopy of two layers (invented).
fn base_series() -> SeriesCase {
    let mut c = SeriesCase::default();
    c.structure.layers = 2;
    c
}

#[test]
fn design_day_site_and_series_inputs() {
    type DaySet = fn(&mut DesignDay, f64);
    let day = DesignDay::default();
    let max_c = day.max_temp_c;
    let table: [(ValidRange, DaySet); 5] = [
        (
            named("daily maximum temperature", AIR_TEMP_RANGE_C),
            |d, v| {
                d.max_temp_c = v;
                d.min_temp_c = d.min_temp_c.min(v);
                d.humidity = DayHumidity::MinRhPct(30.0);
            },
        ),
        (
            ValidRange {
                quantity: "daily minimum temperature",
                max: max_c,
                ..AIR_TEMP_RANGE_C
            },
            |d, v| d.min_temp_c = v,
        ),
        (AIR_SPEED_RANGE_M_S, |d, v| d.wind_m_s = v),
        (PRESSURE_RANGE_KPA, |d, v| d.pressure_kpa = Some(v)),
        (RELATIVE_HUMIDITY_RANGE_PCT, |d, v| {
            d.humidity = DayHumidity::MinRhPct(v);
        }),
    ];
    let site = Site::default();
    for (range, set) in table {
        check_ends(&format!("design day, {}", range.quantity), range, |v| {
            let mut d = DesignDay::default();
            set(&mut d, v);
            design_day_weather(&d, &site)
        });
    }
    check_ends(
        "design day dew point",
        ValidRange {
            quantity: "dew point",
            min: AIR_TEMP_RANGE_C.min,
            max: max_c,
            unit: "°C",
        },
        |v| {
            let d = DesignDay {
                humidity: DayHumidity::DewPointC(v),
                ..DesignDay::default()
            };
            design_day_weather(&d, &site)
        },
    );
    // Whole years, months, days, hours and minutes: the ends pass, one past them is named.
    type DateSet = fn(&mut DesignDay, u32);
    let fields: [(&'static str, u32, u32, DateSet); 5] = [
        ("year", 1900, 2100, |d, v| d.date.year = v as i32),
        ("month", 1, 12, |d, v| d.date.month = v),
        ("day", 1, 31, |d, v| {
            d.date.month = 7;
            d.date.day = v;
        }),
        ("hour", 0, 23, |d, v| d.date.hour = v),
        ("minute", 0, 59, |d, v| d.date.minute = v),
    ];
    for (quantity, min, max, set) in fields {
        let range = ValidRange {
            quantity,
            min: f64::from(min),
            max: f64::from(max),
            unit: "",
        };
        assert_eq!(quantity == "year", range == named("year", YEAR_RANGE));
        for v in [min, max] {
            let mut d = DesignDay::default();
            set(&mut d, v);
            design_day_weather(&d, &site).unwrap_or_else(|e| panic!("{quantity} {v}: {e}"));
        }
        for v in [min.checked_sub(1), Some(max + 1)].into_iter().flatten() {
            let mut d = DesignDay::default();
            set(&mut d, v);
            check_out_of_range(
                quantity,
                &range,
                f64::from(v),
                design_day_weather(&d, &site).map(|_| ()),
            );
        }
    }
    type SiteSet = fn(&mut Site, f64);
    let sites: [(ValidRange, SiteSet); 4] = [
        (LATITUDE_RANGE_DEG, |s, v| s.latitude_deg = v),
        (LONGITUDE_RANGE_DEG, |s, v| s.longitude_deg = v),
        (UTC_OFFSET_RANGE_H, |s, v| s.utc_offset_h = v),
        (ALTITUDE_RANGE_M, |s, v| s.altitude_m = v),
    ];
    for (range, set) in sites {
        check_ends(&format!("site, {}", range.quantity), range, |v| {
            let mut s = Site::default();
            set(&mut s, v);
            design_day_weather(&DesignDay::default(), &s)?;
            sun_position_at(&s, &DesignDay::default().date, 12.0)
        });
    }
    let clock = ValidRange {
        quantity: "local clock time",
        min: 0.0,
        max: 24.0,
        unit: "h",
    };
    check_ends("sun_position_at hour", clock, |h| {
        sun_position_at(&site, &DesignDay::default().date, h)
    });
    check_ends("split_global", SHORTWAVE_RANGE_W_M2, |g| {
        split_global(g, 180, 0.8)
    });
    // The series case: the wind factor and the heat limit (a full day over two layers).
    check_ends("series wind factor", WIND_FACTOR_RANGE, |v| {
        let mut c = base_series();
        c.wind_factor = v;
        run(&DesignDay::default(), &c)
    });
    check_ends("series heat limit", LIMIT_RANGE_C, |v| {
        let mut c = base_series();
        c.limit = HeatLimit::user("test crop", "any", v, LimitKind::Tissue);
        run(&DesignDay::default(), &c)
    });
}

#[test]
fn weather_csv_columns() {
    let columns: [(&str, ValidRange); 5] = [
        ("air_temp_c", AIR_TEMP_RANGE_C),
        ("rh_pct", RELATIVE_HUMIDITY_RANGE_PCT),
        ("wind_m_s", AIR_SPEED_RANGE_M_S),
        ("shortwave_w_m2", SHORTWAVE_RANGE_W_M2),
        ("pressure_kpa", PRESSURE_RANGE_KPA),
    ];
    let good = ["2026-07-01 12:00", "30", "40", "1.5", "800", "101.3"];
    for (k, (column, range)) in columns.iter().enumerate() {
        let row = |v: f64| {
            let mut f = good.map(str::to_owned);
            f[k + 1] = format!("{v}");
            format!(
                "time,air_temp_c,rh_pct,wind_m_s,shortwave_w_m2,pressure_kpa\n{}\n",
                f.join(",")
            )
        };
        for v in [range.min, range.max] {
            let w = parse_csv(&row(v)).unwrap();
            assert_eq!(
                (w.records.len(), w.errors.len()),
                (1, 0),
                "{column} = {v}: {w:?}"
            );
        }
        for v in [
            range.min.next_down(),
            range.max.next_up(),
            f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
        ] {
            let w = parse_csv(&row(v)).unwrap();
            assert!(w.records.is_empty(), "{column} = {v} was accepted");
            let e = &w.errors[0];
            assert_eq!((e.line, e.column.as_str()), (2, *column), "{e}");
            assert!(e.reason.contains(range.quantity), "{e}");
            if v.is_finite() {
                assert!(
                    e.reason
                        .contains(&format!("{} to {}", range.min, range.max)),
                    "{e}"
                );
            }
            assert!(e.to_string().contains("line 2"), "{e}");
        }
    }
}

#[test]
fn grid_axes() {
    for (range, speed) in [(AIR_SPEED_RANGE_M_S, true), (LEAF_DIMENSION_RANGE_M, false)] {
        for at_min in [true, false] {
            check_ends(&format!("grid axis, {}", range.quantity), range, |v| {
                let mut axes = GridAxes::default_map();
                let axis: &mut Axis = if speed {
                    &mut axes.speed_m_s
                } else {
                    &mut axes.dimension_m
                };
                if at_min {
                    axis.min = v;
                } else {
                    axis.max = v;
                }
                axes.validate()
            });
        }
    }
}

/// The shape module wraps the engine's range errors in [`ShapeError::Physics`].
fn physics<T>(r: Result<T, ShapeError>) -> Result<T, PhysicsError> {
    r.map_err(|e| match e {
        ShapeError::Physics(p) => p,
        other => panic!("not a range error: {other}"),
    })
}

#[test]
fn shape_inputs() {
    let blade = |l: f64, w: f64, a: f64, b: f64| {
        physics(BladeProfile::with_exponents(l, w, a, b).outline(64))
    };
    check_ends(
        "blade length",
        named("blade length", OUTLINE_SIZE_RANGE_M),
        |v| blade(v, 0.02, 0.5, 0.5),
    );
    check_ends(
        "blade width",
        named("blade width", OUTLINE_SIZE_RANGE_M),
        |v| blade(0.1, v, 0.5, 0.5),
    );
    check_ends("base exponent", EXPONENT_RANGE, |v| {
        blade(0.1, 0.04, v, 0.5)
    });
    check_ends("tip exponent", EXPONENT_RANGE, |v| blade(0.1, 0.04, 0.5, v));
    let shape: LeafShape = BladeProfile::elliptic(0.1, 0.04)
        .outline(64)
        .unwrap()
        .into();
    check_ends("ShapeMetrics::of", WIND_ANGLE_RANGE_RAD, |v| {
        let m = physics(ShapeMetrics::of(&shape, v))?;
        assert!(m.effective_dimension_m.is_finite() && m.effective_dimension_m > 0.0);
        Ok(m)
    });
    let outline = BladeProfile::elliptic(0.1, 0.04).outline(64).unwrap();
    let scale = ValidRange {
        quantity: "scale factor",
        min: 1e-6,
        max: 1e6,
        unit: "",
    };
    check_ends("Outline::scaled", scale, |v| physics(outline.scaled(v)));
    let props = leafwind_physics::air::AirProperties::at(298.15, 101.325, 1.5);
    check_ends("cylinder diameter", BODY_DIAMETER_RANGE_M, |d| {
        cylinder_convection(&props, 1.0, d, Default::default())
    });
    check_ends("cylinder speed", AIR_SPEED_RANGE_M_S, |u| {
        cylinder_convection(&props, u, 0.01, Default::default())
    });
    check_ends("sphere diameter", BODY_DIAMETER_RANGE_M, |d| {
        sphere_convection(&props, 1.0, d)
    });
    check_ends("sphere speed", AIR_SPEED_RANGE_M_S, |u| {
        sphere_convection(&props, u, 0.05)
    });
}

#[test]
fn canopy_structure_default_is_valid() {
    // The defaults every range test starts from are themselves valid.
    CanopyStructure::default().validate().unwrap();
    base_leaf().validate().unwrap();
    base_house().validate().unwrap();
}

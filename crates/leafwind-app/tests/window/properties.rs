//! Property tests of the window's plumbing (proptest): unit conversions invert, the scenario file
//! round-trips any valid case exactly, field range checks agree with the engine's ranges, and the
//! limit status is ordered. Invariants, common practice, no source.

use leafwind_app::document::ScenarioDocument;
use leafwind_app::gui::compute::LimitStatus;
use leafwind_app::gui::fields::range_error;
use leafwind_app::units::{Quantity, UnitSystem};
use leafwind_physics::Humidity;
use leafwind_physics::case::AIR_SPEED_RANGE_M_S;
use proptest::prelude::*;

const QUANTITIES: [Quantity; 8] = [
    Quantity::Temperature,
    Quantity::TempDiff,
    Quantity::Speed,
    Quantity::LeafSize,
    Quantity::Thickness,
    Quantity::Pressure,
    Quantity::Altitude,
    Quantity::Same("W/m²"),
];

proptest! {
    #[test]
    fn conversions_invert(x in -1.0e4f64..1.0e4, qi in 0usize..8, imperial in any::<bool>()) {
        let q = QUANTITIES[qi];
        let u = if imperial { UnitSystem::Imperial } else { UnitSystem::Si };
        let back = q.from_display(q.to_display(x, u), u);
        prop_assert!((back - x).abs() <= 1e-9 * (1.0 + x.abs()));
        prop_assert!(!q.format(x, u).contains("NaN"));
    }

    #[test]
    fn scenario_file_round_trips_exactly(
        t in -30.0f64..60.0,
        rh in 0.0f64..100.0,
        u in 0.0f64..30.0,
        d in 0.001f64..1.0,
        sun in 0.0f64..1400.0,
        g in 0.0f64..1.5,
        title in "[a-zA-Z0-9 ,.\"'\\\\-]{0,40}",
    ) {
        let mut doc = ScenarioDocument { title, ..Default::default() };
        doc.case.air.temp_c = t;
        doc.case.air.humidity = Humidity::RelativePct(rh);
        doc.case.air.speed_m_s = u;
        doc.case.leaf.dimension_m = d;
        doc.case.surroundings.shortwave_w_m2 = sun;
        doc.case.leaf.stomatal_conductance_mol_m2_s = g;
        let text = doc.to_ron().unwrap();
        prop_assert_eq!(ScenarioDocument::from_ron(&text).unwrap(), doc);
    }

    #[test]
    fn field_check_agrees_with_the_engine_range(x in -100.0f64..100.0, imperial in any::<bool>()) {
        let u = if imperial { UnitSystem::Imperial } else { UnitSystem::Si };
        let err = range_error(&AIR_SPEED_RANGE_M_S, Quantity::Speed, x, u);
        prop_assert_eq!(err.is_none(), AIR_SPEED_RANGE_M_S.contains(x));
        if let Some(e) = err {
            prop_assert!(e.contains("outside the valid range"));
            prop_assert!(e.contains(Quantity::Speed.unit(u)));
        }
    }

    #[test]
    fn status_is_ordered_by_leaf_temperature(
        limit in 20.0f64..50.0,
        margin in 0.0f64..10.0,
        a in 0.0f64..60.0,
        b in 0.0f64..60.0,
    ) {
        let rank = |s: LimitStatus| match s {
            LimitStatus::WithinMargin => 0,
            LimitStatus::InsideMargin => 1,
            LimitStatus::OverLimit => 2,
        };
        let (lo, hi) = if a <= b { (a, b) } else { (b, a) };
        prop_assert!(rank(LimitStatus::of(lo, limit, margin)) <= rank(LimitStatus::of(hi, limit, margin)));
    }
}

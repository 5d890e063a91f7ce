//! Checks of the design day, the crop heat limits and the hourly summaries.

use leafwind_physics::crops::{CROP_HEAT_LIMITS, HeatLimit, LimitKind, find};
use leafwind_physics::design_day::{
    ASHRAE2009_RANGE_FRACTIONS, DayHumidity, DesignDay, DiurnalShape, Environment, GreenhouseSetup,
    SeriesCase, design_day_weather, diurnal_temp_c, run,
};
use leafwind_physics::sun::DateTime;

/// ASHRAE Handbook—Fundamentals (2009), ch. 14, Table 6 (from memory): the fractions run from 0 to
/// 1, the day is at its minimum at 05:00 and at its maximum at 14:00 and 15:00, and the hourly
/// temperatures are T_max − f · DR.
#[test]
fn ashrae_shape() {
    assert!(
        ASHRAE2009_RANGE_FRACTIONS
            .iter()
            .all(|f| (0.0..=1.0).contains(f))
    );
    let (max, min) = (34.0, 21.0);
    for h in 0..24u32 {
        let t = diurnal_temp_c(DiurnalShape::Ashrae2009, max, min, f64::from(h));
        let k = if h == 0 { 24 } else { h as usize };
        let expect = max - ASHRAE2009_RANGE_FRACTIONS[k - 1] * (max - min);
        assert!((t - expect).abs() < 1e-12, "hour {h}");
        assert!((min..=max).contains(&t));
    }
    assert_eq!(diurnal_temp_c(DiurnalShape::Ashrae2009, max, min, 5.0), min);
    assert_eq!(
        diurnal_temp_c(DiurnalShape::Ashrae2009, max, min, 15.0),
        max
    );
    // Halfway between two table hours is the mean of their temperatures.
    let a = diurnal_temp_c(DiurnalShape::Ashrae2009, max, min, 9.0);
    let b = diurnal_temp_c(DiurnalShape::Ashrae2009, max, min, 10.0);
    let m = diurnal_temp_c(DiurnalShape::Ashrae2009, max, min, 9.5);
    assert!((m - 0.5 * (a + b)).abs() < 1e-12);
    // The cosine shape peaks at its peak hour and bottoms twelve hours later.
    let c = DiurnalShape::Cosine { peak_hour: 15.0 };
    assert!((diurnal_temp_c(c, max, min, 15.0) - max).abs() < 1e-12);
    assert!((diurnal_temp_c(c, max, min, 3.0) - min).abs() < 1e-12);
}

/// The design day's humidity is one vapour pressure all day: a minimum RH of 30 % at the maximum
/// temperature gives higher RH in the cool hours, never above 100 % (common practice, no source).
#[test]
fn design_day_humidity() {
    let day = DesignDay {
        humidity: DayHumidity::MinRhPct(30.0),
        ..DesignDay::default()
    };
    let w = design_day_weather(&day, &SeriesCase::default().site).unwrap();
    assert_eq!(w.len(), 24);
    let e: Vec<f64> = w
        .iter()
        .map(|h| h.humidity.vapour_pressure_kpa(h.air_temp_c).unwrap())
        .collect();
    for x in &e {
        assert!((x - e[0]).abs() < 1e-9);
    }
    let bad = DesignDay {
        min_temp_c: 40.0,
        max_temp_c: 30.0,
        ..DesignDay::default()
    };
    assert!(design_day_weather(&bad, &SeriesCase::default().site).is_err());
    let wet = DesignDay {
        humidity: DayHumidity::DewPointC(30.0),
        min_temp_c: 20.0,
        ..DesignDay::default()
    };
    for h in design_day_weather(&wet, &SeriesCase::default().site).unwrap() {
        let leafwind_physics::Humidity::RelativePct(rh) = h.humidity else {
            panic!()
        };
        assert!(rh <= 100.0);
    }
}

/// Hours and degree-hours over an air limit are counted from the hourly air temperatures:
/// recomputed here independently from the ASHRAE shape (arithmetic check).
#[test]
fn hours_and_degree_hours_over_an_air_limit() {
    let day = DesignDay {
        max_temp_c: 36.0,
        min_temp_c: 22.0,
        ..DesignDay::default()
    };
    let limit = HeatLimit::user("test crop", "any", 32.0, LimitKind::Air);
    let case = SeriesCase {
        limit: limit.clone(),
        ..SeriesCase::default()
    };
    let s = run(&day, &case).unwrap();
    let (mut hours, mut dh) = (0.0, 0.0);
    for h in 0..24u32 {
        let t = diurnal_temp_c(DiurnalShape::Ashrae2009, 36.0, 22.0, f64::from(h));
        if t > 32.0 {
            hours += 1.0;
            dh += t - 32.0;
        }
    }
    assert_eq!(s.failed_hours, 0);
    assert_eq!(s.hours_over_limit, hours);
    assert!((s.degree_hours_over_k_h - dh).abs() < 1e-9);
    assert!((s.min_margin_k.unwrap() - (32.0 - 36.0)).abs() < 1e-9);
}

/// A tissue limit compares the hottest leaf; at night leaves radiate to the clear sky and run below
/// the air, at noon the sunlit leaves of a dry crop run above it (common practice, no source).
#[test]
fn tissue_limit_follows_the_hottest_leaf() {
    let mut case = SeriesCase::default();
    case.leaf.stomatal_conductance_mol_m2_s = 0.02;
    case.limit = HeatLimit::user("test crop", "leaf", 36.0, LimitKind::Tissue);
    let s = run(&DesignDay::default(), &case).unwrap();
    let night = &s.hours[2];
    assert!(night.hottest_leaf_temp_c.unwrap() < night.air_temp_c);
    let noon = &s.hours[13];
    assert!(noon.hottest_leaf_temp_c.unwrap() > noon.air_temp_c);
    assert!(noon.hottest_sunlit.unwrap());
    for h in &s.hours {
        assert!((h.margin_k.unwrap() - (36.0 - h.hottest_leaf_temp_c.unwrap())).abs() < 1e-12);
    }
    assert!(s.hours_over_limit >= 1.0);
}

/// A greenhouse day: inside air above the outside in the sunny hours.
#[test]
fn greenhouse_design_day() {
    let case = SeriesCase {
        environment: Environment::Greenhouse(GreenhouseSetup::default()),
        ..SeriesCase::default()
    };
    let day = DesignDay {
        max_temp_c: 30.0,
        min_temp_c: 18.0,
        ..DesignDay::default()
    };
    let s = run(&day, &case).unwrap();
    assert_eq!(s.failed_hours, 0);
    let noon = &s.hours[13];
    assert!(noon.inside_air_temp_c.unwrap() > noon.air_temp_c);
}

/// An invalid date is an error, not a panic.
#[test]
fn invalid_date_is_an_error() {
    let day = DesignDay {
        date: DateTime::date(2026, 2, 30),
        ..DesignDay::default()
    };
    assert!(run(&day, &SeriesCase::default()).is_err());
}

/// The crop table: the crops the issue names are present, each limit valid and sourced, unknown
/// crops listed in the error.
#[test]
fn crop_table() {
    for (crop, stage) in [
        ("tomato", "flowering"),
        ("pepper", "flowering"),
        ("cucumber", ""),
        ("lettuce", ""),
        ("strawberry", "flowering"),
        ("wheat", "anthesis"),
        ("maize", ""),
        ("rice", "anthesis"),
        ("soybean", ""),
    ] {
        let l = find(crop, stage).unwrap();
        assert!(l.validate().is_ok());
        assert!(!l.source.is_empty());
    }
    assert!(
        CROP_HEAT_LIMITS
            .iter()
            .all(|l| l.source.contains("from memory")
                || l.source.contains("no source")
                || l.source.contains("user"))
    );
    let err = find("kiwi", "fruit").unwrap_err().to_string();
    assert!(err.contains("wheat (anthesis)"));
}

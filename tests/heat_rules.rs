//! Heat rules with durations over hourly series. These are counting checks on invented series (a
//! rule's thresholds and durations are the user's; rules of this form are common practice, no
//! source): a worked count, the in-a-row variants, the design-day case, unsolved hours, calendar
//! runs across month and year ends, and invariants as properties.

use leafwind_physics::crops::{HeatLimit, LimitKind};
use leafwind_physics::design_day::{HourResult, HourlySeries};
use leafwind_physics::heat_rules::{HeatRule, Verdict, check_rule};
use leafwind_physics::sun::DateTime;
use proptest::prelude::*;

fn hour(date: (i32, u32, u32), h: u32, air_c: f64, leaf_c: Option<f64>) -> HourResult {
    HourResult {
        time: DateTime {
            year: date.0,
            month: date.1,
            day: date.2,
            hour: h,
            minute: 0,
        },
        air_temp_c: air_c,
        inside_air_temp_c: None,
        sun_elevation_rad: Some(0.5),
        global_w_m2: Some(500.0),
        hottest_leaf_temp_c: leaf_c,
        hottest_layer: leaf_c.map(|_| 0),
        hottest_sunlit: leaf_c.map(|_| true),
        compared_temp_c: leaf_c,
        margin_k: leaf_c.map(|t| 45.0 - t),
        error: None,
    }
}

fn series(hours: Vec<HourResult>) -> HourlySeries {
    HourlySeries {
        hours,
        limit: HeatLimit::user("test crop", "any", 45.0, LimitKind::Tissue),
        hours_over_limit: 0.0,
        degree_hours_over_k_h: 0.0,
        min_margin_k: None,
        max_leaf_temp_c: None,
        failed_hours: 0,
    }
}

/// A day at 30 °C with the given hours at 41 °C.
fn day(date: (i32, u32, u32), hot_hours: &[u32]) -> Vec<HourResult> {
    (0..24)
        .map(|h| {
            let t = if hot_hours.contains(&h) { 41.0 } else { 30.0 };
            hour(date, h, t, Some(t + 2.0))
        })
        .collect()
}

fn three_days() -> HourlySeries {
    let mut h = day((2027, 7, 14), &[12, 13, 14, 15]);
    h.extend(day((2027, 7, 15), &[13, 14]));
    h.extend(day((2027, 7, 16), &[12, 13, 15]));
    series(h)
}

/// The worked count: "3 h above 40 °C on 2 days" is met on the 16th (the 14th had 4 h, the 15th 2 h,
/// the 16th 3 h in two runs).
#[test]
fn three_hours_above_forty_on_two_days() {
    let o = check_rule(&HeatRule::default(), &three_days()).unwrap();
    assert_eq!(o.verdict, Verdict::Met);
    assert_eq!(o.days_meeting, 2);
    assert_eq!(o.first_met, Some((2027, 7, 16)));
    assert_eq!(o.most_hours_in_a_day(), 4);
    let hours: Vec<u32> = o.days.iter().map(|d| d.hours_above).collect();
    assert_eq!(hours, [4, 2, 3]);
    let runs: Vec<u32> = o.days.iter().map(|d| d.longest_run_h).collect();
    assert_eq!(runs, [4, 2, 2]);
}

/// In a row: 3 h in one run happens only on the 14th, so not on two days; the 14th and the 16th
/// are not days in a row.
#[test]
fn in_a_row_variants() {
    let s = three_days();
    let hours_run = HeatRule {
        hours_in_a_row: true,
        ..HeatRule::default()
    };
    let o = check_rule(&hours_run, &s).unwrap();
    assert_eq!(o.verdict, Verdict::NotMet);
    assert_eq!(o.days_meeting, 1);
    let days_run = HeatRule {
        days_in_a_row: true,
        ..HeatRule::default()
    };
    let o = check_rule(&days_run, &s).unwrap();
    assert_eq!(o.verdict, Verdict::NotMet);
    assert_eq!(o.longest_day_run, 1);
    // With a 2 h threshold every day meets, three in a row.
    let two_h = HeatRule {
        hours: 2,
        days: 3,
        days_in_a_row: true,
        ..HeatRule::default()
    };
    let o = check_rule(&two_h, &s).unwrap();
    assert_eq!(o.verdict, Verdict::Met);
    assert_eq!(o.longest_day_run, 3);
    assert_eq!(o.first_met, Some((2027, 7, 16)));
}

/// A design day is one day: when it meets the daily condition of a two-day rule, the verdict says
/// so rather than "met" or "not met".
#[test]
fn one_design_day_meets_only_the_daily_condition() {
    let s = series(day((2027, 7, 14), &[12, 13, 14, 15]));
    let o = check_rule(&HeatRule::default(), &s).unwrap();
    assert_eq!(o.verdict, Verdict::DailyConditionOnly);
    let one_day = HeatRule {
        days: 1,
        ..HeatRule::default()
    };
    assert_eq!(check_rule(&one_day, &s).unwrap().verdict, Verdict::Met);
    let cool = series(day((2027, 7, 14), &[12]));
    assert_eq!(
        check_rule(&HeatRule::default(), &cool).unwrap().verdict,
        Verdict::NotMet
    );
}

/// The leaf rule reads the hottest leaf; an unsolved hour is not counted and breaks a run.
#[test]
fn leaf_rule_and_unsolved_hours() {
    let mut h = day((2027, 7, 14), &[12, 13, 14, 15]);
    h[13].hottest_leaf_temp_c = None;
    let s = series(h);
    let leaf = HeatRule {
        temperature: LimitKind::Tissue,
        above_c: 42.0,
        hours_in_a_row: true,
        days: 1,
        ..HeatRule::default()
    };
    let o = check_rule(&leaf, &s).unwrap();
    assert_eq!(o.days[0].hours_above, 3);
    assert_eq!(o.days[0].longest_run_h, 2);
    assert_eq!(o.unsolved_hours(), 1);
    assert_eq!(o.verdict, Verdict::NotMet);
}

/// Calendar days in a row across a month end and a year end; a missing day breaks the run.
#[test]
fn days_in_a_row_across_month_and_year_ends() {
    let rule = HeatRule {
        days: 3,
        days_in_a_row: true,
        ..HeatRule::default()
    };
    let mut h = day((2026, 12, 30), &[10, 11, 12]);
    h.extend(day((2026, 12, 31), &[10, 11, 12]));
    h.extend(day((2027, 1, 1), &[10, 11, 12]));
    assert_eq!(check_rule(&rule, &series(h)).unwrap().verdict, Verdict::Met);
    let mut gap = day((2027, 2, 27), &[10, 11, 12]);
    gap.extend(day((2027, 2, 28), &[10, 11, 12]));
    gap.extend(day((2027, 3, 2), &[10, 11, 12]));
    let o = check_rule(&rule, &series(gap)).unwrap();
    assert_eq!(o.verdict, Verdict::NotMet);
    assert_eq!(o.longest_day_run, 2);
}

/// Errors, not panics: an invalid rule, hours out of time order, and an empty series.
#[test]
fn bad_rules_and_disordered_hours_are_errors() {
    for bad in [
        HeatRule {
            above_c: f64::NAN,
            ..HeatRule::default()
        },
        HeatRule {
            hours: 0,
            ..HeatRule::default()
        },
        HeatRule {
            hours: 25,
            ..HeatRule::default()
        },
        HeatRule {
            days: 0,
            ..HeatRule::default()
        },
    ] {
        assert!(check_rule(&bad, &three_days()).is_err(), "{bad:?}");
    }
    let mut h = day((2027, 7, 14), &[]);
    h.swap(3, 4);
    assert!(check_rule(&HeatRule::default(), &series(h)).is_err());
    let empty = check_rule(&HeatRule::default(), &series(Vec::new())).unwrap();
    assert_eq!(empty.verdict, Verdict::NotMet);
    assert!(empty.days.is_empty());
}

proptest! {
    /// Invariants over random series: a higher threshold never adds hours or days; hours in a row
    /// never exceed hours in total; days in a row never exceed days in total; a rule met with days
    /// in a row is met without.
    #[test]
    fn counting_invariants(
        temps in prop::collection::vec(20.0f64..50.0, 24..(24 * 6)),
        above in 25.0f64..45.0,
        hours in 1u32..8,
        days in 1u32..4,
    ) {
        let hours_vec: Vec<HourResult> = temps
            .iter()
            .enumerate()
            .map(|(i, &t)| hour((2027, 7, 1 + (i / 24) as u32), (i % 24) as u32, t, Some(t)))
            .collect();
        let s = series(hours_vec);
        let base = HeatRule { above_c: above, hours, days, ..HeatRule::default() };
        let o = check_rule(&base, &s).unwrap();
        let higher = check_rule(&HeatRule { above_c: above + 1.0, ..base }, &s).unwrap();
        prop_assert!(higher.days_meeting <= o.days_meeting);
        for (a, b) in o.days.iter().zip(&higher.days) {
            prop_assert!(b.hours_above <= a.hours_above);
            prop_assert!(a.longest_run_h <= a.hours_above);
        }
        prop_assert!(o.longest_day_run <= o.days_meeting);
        let run = check_rule(&HeatRule { days_in_a_row: true, ..base }, &s).unwrap();
        if run.verdict == Verdict::Met {
            prop_assert_eq!(o.verdict, Verdict::Met);
        }
        let in_row = check_rule(&HeatRule { hours_in_a_row: true, ..base }, &s).unwrap();
        prop_assert!(in_row.days_meeting <= o.days_meeting);
    }
}

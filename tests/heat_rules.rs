//! Heat rules with durations over hourly and finer series. These are counting checks on invented
//! series (a rule's thresholds and durations are the user's; rules of this form are common
//! practice, no source): a worked count, the in-a-row variants, the design-day case, unsolved
//! hours, calendar runs across month and year ends, records logged every 15 min and with gaps, and
//! invariants as properties (among them: the same temperatures logged at a finer step give the
//! same hours).

use leafwind_physics::crops::{HeatLimit, LimitKind};
use leafwind_physics::design_day::{HourResult, HourlySeries, row_durations_h, summarise_hours};
use leafwind_physics::heat_rules::{HeatRule, Verdict, check_rule};
use leafwind_physics::sun::DateTime;
use proptest::prelude::*;

fn hour(date: (i32, u32, u32), h: u32, air_c: f64, leaf_c: Option<f64>) -> HourResult {
    at_minute(date, h, 0, air_c, leaf_c)
}

fn at_minute(
    date: (i32, u32, u32),
    h: u32,
    minute: u32,
    air_c: f64,
    leaf_c: Option<f64>,
) -> HourResult {
    HourResult {
        time: DateTime {
            year: date.0,
            month: date.1,
            day: date.2,
            hour: h,
            minute,
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
        duration_h: 1.0,
    }
}

/// The rows summed up as the engine does (which sets each row's duration from the times).
fn series(hours: Vec<HourResult>) -> HourlySeries {
    summarise_hours(
        hours,
        &HeatLimit::user("test crop", "any", 45.0, LimitKind::Tissue),
    )
}

/// Each row of `hourly` logged `per_hour` times in its hour (at equal steps, same values).
fn refine(hourly: &[HourResult], per_hour: u32) -> Vec<HourResult> {
    let step = 60 / per_hour;
    hourly
        .iter()
        .flat_map(|h| {
            (0..per_hour).map(move |k| {
                let mut r = h.clone();
                r.time.minute = k * step;
                r
            })
        })
        .collect()
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
    assert_eq!(o.most_hours_in_a_day(), 4.0);
    let hours: Vec<f64> = o.days.iter().map(|d| d.hours_above).collect();
    assert_eq!(hours, [4.0, 2.0, 3.0]);
    let runs: Vec<f64> = o.days.iter().map(|d| d.longest_run_h).collect();
    assert_eq!(runs, [4.0, 2.0, 2.0]);
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
    assert_eq!(o.days[0].hours_above, 3.0);
    assert_eq!(o.days[0].longest_run_h, 2.0);
    assert_eq!(o.unsolved_hours(), 1.0);
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

/// A climate computer's 15-min record of the same three days: the same hours, runs and verdicts
/// as the hourly one (each row stands for 15 min), and the series' hours over the limit too.
#[test]
fn a_fifteen_minute_record_counts_clock_hours() {
    let hourly = three_days();
    let fine = series(refine(&hourly.hours, 4));
    assert_eq!(fine.hours.len(), 4 * hourly.hours.len());
    assert!(
        fine.hours
            .iter()
            .all(|h| (h.duration_h - 0.25).abs() < 1e-12)
    );
    for rule in [
        HeatRule::default(),
        HeatRule {
            hours_in_a_row: true,
            days: 1,
            ..HeatRule::default()
        },
    ] {
        let a = check_rule(&rule, &hourly).unwrap();
        let b = check_rule(&rule, &fine).unwrap();
        assert_eq!(a.verdict, b.verdict);
        assert_eq!(a.first_met, b.first_met);
        for (x, y) in a.days.iter().zip(&b.days) {
            assert!((x.hours_above - y.hours_above).abs() < 1e-9);
            assert!((x.longest_run_h - y.longest_run_h).abs() < 1e-9);
            assert!((x.hours_in_series - y.hours_in_series).abs() < 1e-9);
        }
    }
    // The leaf is 43 °C in the 9 hot hours against a 45 °C limit: none over; at 42 °C, 9 h.
    assert_eq!(hourly.hours_over_limit, 0.0);
    let limit = HeatLimit::user("test crop", "any", 42.0, LimitKind::Tissue);
    let h = summarise_hours(hourly.hours.clone(), &limit);
    let f = summarise_hours(fine.hours.clone(), &limit);
    assert!((h.hours_over_limit - 9.0).abs() < 1e-9);
    assert!((f.hours_over_limit - h.hours_over_limit).abs() < 1e-9);
    assert!((f.degree_hours_over_k_h - h.degree_hours_over_k_h).abs() < 1e-9);
}

/// Durations: a regular step gives that step to every row; a gap in the record does not count
/// (the row before it keeps the record's step) and breaks a run; a lone row stands for an hour.
#[test]
fn row_durations_and_gaps() {
    let t = |h: u32, m: u32| DateTime::date(2027, 7, 14).at(h, m);
    let d = row_durations_h(&[t(10, 0), t(10, 10), t(10, 20), t(10, 30)]);
    assert!(d.iter().all(|x| (x - 1.0 / 6.0).abs() < 1e-12), "{d:?}");
    let d = row_durations_h(&[t(10, 0), t(10, 30), t(11, 0), t(14, 0), t(14, 30)]);
    assert_eq!(d, [0.5, 0.5, 0.5, 0.5, 0.5]);
    // An hourly record with a missing hour at its sparse end: still 1 h a row (the record's step).
    let d = row_durations_h(&[
        t(12, 0),
        t(13, 0),
        t(14, 0),
        DateTime::date(2027, 7, 15).at(12, 0),
        DateTime::date(2027, 7, 15).at(14, 0),
    ]);
    assert_eq!(d, [1.0; 5]);
    assert_eq!(row_durations_h(&[t(12, 0)]), [1.0]);
    assert!(row_durations_h(&[]).is_empty());
    // Over midnight and a month end.
    let d = row_durations_h(&[
        DateTime::date(2027, 7, 31).at(23, 0),
        DateTime::date(2027, 8, 1).at(0, 0),
    ]);
    assert_eq!(d, [1.0, 1.0]);

    // 10:00–12:00 above 40 °C, missing rows 12:00–14:00, 14:00–15:00 above: 3 h in all, runs of
    // at most 2 h.
    let mut rows: Vec<HourResult> = (0..10)
        .map(|i| at_minute((2027, 7, 14), 10 + i / 2, (i % 2) * 30, 41.0, Some(43.0)))
        .filter(|r| !(12..14).contains(&r.time.hour))
        .collect();
    rows.push(at_minute((2027, 7, 14), 15, 0, 30.0, Some(32.0)));
    let s = series(rows);
    let in_a_row = HeatRule {
        hours: 3,
        hours_in_a_row: true,
        days: 1,
        ..HeatRule::default()
    };
    let o = check_rule(&in_a_row, &s).unwrap();
    assert!(
        (o.days[0].hours_above - 3.0).abs() < 1e-9,
        "{:?}",
        o.days[0]
    );
    assert!((o.days[0].longest_run_h - 2.0).abs() < 1e-9);
    assert_eq!(o.verdict, Verdict::NotMet);
    let in_total = HeatRule {
        hours_in_a_row: false,
        ..in_a_row
    };
    assert_eq!(check_rule(&in_total, &s).unwrap().verdict, Verdict::Met);
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

    /// The same temperatures logged 2, 4, 6 or 12 times an hour give the same hours above, runs
    /// and verdicts as the hourly record (durations weight the rows; invariant, no source).
    #[test]
    fn a_finer_record_of_the_same_hours_counts_the_same(
        temps in prop::collection::vec(20.0f64..50.0, 24..(24 * 4)),
        above in 25.0f64..45.0,
        hours in 1u32..8,
        in_a_row in any::<bool>(),
        per_hour in prop::sample::select(vec![2u32, 4, 6, 12]),
    ) {
        let hourly: Vec<HourResult> = temps
            .iter()
            .enumerate()
            .map(|(i, &t)| hour((2027, 7, 1 + (i / 24) as u32), (i % 24) as u32, t, Some(t)))
            .collect();
        let rule = HeatRule { above_c: above, hours, hours_in_a_row: in_a_row, days: 1, ..HeatRule::default() };
        let a = check_rule(&rule, &series(hourly.clone())).unwrap();
        let b = check_rule(&rule, &series(refine(&hourly, per_hour))).unwrap();
        prop_assert_eq!(a.verdict, b.verdict);
        prop_assert_eq!(a.days_meeting, b.days_meeting);
        for (x, y) in a.days.iter().zip(&b.days) {
            prop_assert!((x.hours_above - y.hours_above).abs() < 1e-9);
            prop_assert!((x.longest_run_h - y.longest_run_h).abs() < 1e-9);
        }
    }
}

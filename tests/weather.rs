//! Checks of the weather CSV import and the hourly run over it (invented data).

use leafwind_physics::design_day::SeriesCase;
use leafwind_physics::weather::{ImportError, parse_csv, run_series};

const GOOD_AND_BAD: &str = "\
# invented hourly weather for a test
time,air_temp_c,rh_pct,wind_m_s,shortwave_w_m2,pressure_kpa
2026-07-01 10:00,28.5,45,1.5,720,100.9
2026-07-01 11:00,30.1,41,1.8,810,
2026-07-01 12:00,abc,40,1.6,860,100.8
2026-07-01 13:00,32.0,140,1.6,850,100.8
2026-07-01 14:00,32.4,38,-2,780,100.8
2026-07-01 14:30:00,32.4,38,1.2,780,100.8

2026-07-01 14:00,32.0,39,1.2,760,100.8
2026-07-01 16:00,31.0,39,1.2
2026-13-01 17:00,30.0,40,1.0,300,100.8
2026-07-01 18:00,29.0,42,1.0,150,300
2026-07-01 19:00,27.5,48,0.8,40,100.9
";

/// Each bad row is reported with its line, column, value and reason; the good rows all come
/// through (common practice, no source).
#[test]
fn bad_rows_are_reported_and_good_rows_kept() {
    let w = parse_csv(GOOD_AND_BAD).unwrap();
    let times: Vec<String> = w.records.iter().map(|r| r.time.to_string()).collect();
    assert_eq!(
        times,
        [
            "2026-07-01 10:00",
            "2026-07-01 11:00",
            "2026-07-01 14:30",
            "2026-07-01 19:00"
        ]
    );
    assert_eq!(w.records[1].pressure_kpa, None);
    assert_eq!(w.records[0].pressure_kpa, Some(100.9));
    let got: Vec<(usize, &str)> = w
        .errors
        .iter()
        .map(|e| (e.line, e.column.as_str()))
        .collect();
    assert_eq!(
        got,
        [
            (5, "air_temp_c"),
            (6, "rh_pct"),
            (7, "wind_m_s"),
            (10, "time"),
            (11, "(row)"),
            (12, "time"),
            (13, "pressure_kpa"),
        ]
    );
    let msg = w.errors[1].to_string();
    assert!(msg.contains("line 6") && msg.contains("\"140\"") && msg.contains("relative humidity"));
    assert!(w.errors[0].reason.contains("not a number"));
    assert!(w.errors[3].reason.contains("not after"));
}

/// File-level errors: empty text, a missing required column, a repeated column.
#[test]
fn header_errors() {
    assert_eq!(parse_csv("\n# nothing\n"), Err(ImportError::Empty));
    assert_eq!(
        parse_csv("time,air_temp_c,rh_pct,wind_m_s\n"),
        Err(ImportError::MissingColumn {
            column: "shortwave_w_m2"
        })
    );
    assert!(matches!(
        parse_csv("time,time,air_temp_c,rh_pct,wind_m_s,shortwave_w_m2\n"),
        Err(ImportError::DuplicateColumn { .. })
    ));
    // Columns in any order, extra columns ignored, CRLF line ends.
    let w = parse_csv(
        "shortwave_w_m2,station,time,rh_pct,wind_m_s,air_temp_c\r\n500,X,2026-06-01 12:00,50,1,25\r\n",
    )
    .unwrap();
    assert_eq!(w.records.len(), 1);
    assert_eq!(w.records[0].shortwave_w_m2, 500.0);
}

/// The hourly run over imported weather: every good row gives an hour, none fails, and every
/// number is finite.
#[test]
fn run_over_imported_rows() {
    let w = parse_csv(GOOD_AND_BAD).unwrap();
    let s = run_series(&w.records, &SeriesCase::default()).unwrap();
    assert_eq!(s.hours.len(), w.records.len());
    assert_eq!(s.failed_hours, 0);
    for h in &s.hours {
        assert!(h.hottest_leaf_temp_c.unwrap().is_finite());
        assert!(h.sun_elevation_rad.unwrap().is_finite() && h.global_w_m2.unwrap().is_finite());
    }
}

/// A climate computer's 15-min record: each row stands for 15 min, so a hot afternoon logged every
/// 15 min gives the same clock hours over an air limit as the same afternoon logged hourly, and a
/// heat rule reads it without complaint (invented data; the counting is this engine's convention,
/// `design_day::row_durations_h`).
#[test]
fn a_fifteen_minute_file_counts_clock_hours() {
    use leafwind_physics::crops::{HeatLimit, LimitKind};
    use leafwind_physics::heat_rules::{HeatRule, Verdict, check_rule};
    let row = |h: u32, m: u32| {
        let t = if (12..15).contains(&h) { 41.0 } else { 30.0 };
        format!("2026-07-01 {h:02}:{m:02},{t},35,1.5,600\n")
    };
    let header = "time,air_temp_c,rh_pct,wind_m_s,shortwave_w_m2\n";
    let hourly: String = std::iter::once(header.to_owned())
        .chain((9..18).map(|h| row(h, 0)))
        .collect();
    let fine: String = std::iter::once(header.to_owned())
        .chain((9..18).flat_map(|h| [0, 15, 30, 45].map(|m| row(h, m))))
        .collect();
    let case = SeriesCase {
        limit: HeatLimit::user("test crop", "any", 40.0, LimitKind::Air),
        ..SeriesCase::default()
    };
    let a = run_series(&parse_csv(&hourly).unwrap().records, &case).unwrap();
    let b = run_series(&parse_csv(&fine).unwrap().records, &case).unwrap();
    assert_eq!(b.hours.len(), 4 * a.hours.len());
    assert!(
        (a.hours_over_limit - 3.0).abs() < 1e-9,
        "{}",
        a.hours_over_limit
    );
    assert!(
        (b.hours_over_limit - 3.0).abs() < 1e-9,
        "{}",
        b.hours_over_limit
    );
    assert!((b.degree_hours_over_k_h - 3.0).abs() < 1e-9);
    let rule = HeatRule {
        hours_in_a_row: true,
        days: 1,
        ..HeatRule::default()
    };
    let o = check_rule(&rule, &b).unwrap();
    assert_eq!(o.verdict, Verdict::Met);
    assert!((o.days[0].longest_run_h - 3.0).abs() < 1e-9);
}

//! Fuzzing of the engine's text parsers — [`parse_csv`] (hourly weather),
//! [`outline_from_csv_mm`] (leaf outlines), [`DateTime::parse`] and the crop-limit lookup
//! [`crops::find`] — with arbitrary bytes and strings, and with valid documents carrying one
//! mutation (a field dropped, a number replaced by NaN, ±∞, a huge value, nothing or text, a
//! delimiter changed, a row truncated, a byte-order mark, CRLF or CR line ends, unicode, blank and
//! comment lines).
//!
//! What must hold (the house rules: no panic on any user input, errors name the row; common
//! practice, no source): no parser panics; every error names a line that exists; a mutation of
//! one row leaves every other row as it was (weather) or is reported at that row (outline); a
//! mutation that changes no data changes no result.
//!
//! Case counts are small by default so that `cargo test` stays quick; set `PROPTEST_CASES` for a
//! longer run (`.ci/robustness.sh` does). Failing inputs are saved by proptest beside this file
//! (`fuzz_parsers.proptest-regressions`), to be committed.

use leafwind_physics::air::{AIR_TEMP_RANGE_C, PRESSURE_RANGE_KPA, RELATIVE_HUMIDITY_RANGE_PCT};
use leafwind_physics::case::AIR_SPEED_RANGE_M_S;
use leafwind_physics::crops;
use leafwind_physics::radiation::SHORTWAVE_RANGE_W_M2;
use leafwind_physics::shape::{Outline, ShapeError, outline_from_csv_mm};
use leafwind_physics::sun::DateTime;
use leafwind_physics::weather::{ImportError, WeatherImport, parse_csv};
use proptest::prelude::*;
use proptest::sample::Index;

/// `default_cases` unless `PROPTEST_CASES` is set.
fn config(default_cases: u32) -> ProptestConfig {
    let mut c = ProptestConfig::default();
    if std::env::var_os("PROPTEST_CASES").is_none() {
        c.cases = default_cases;
    }
    c
}

/// The UTF-8 byte-order mark.
const BOM: char = '\u{feff}';

/// Texts that look like numbers to a person but are not valid ones here, or are non-finite,
/// huge, or empty.
const BAD_NUMBERS: [&str; 24] = [
    "NaN",
    "nan",
    "inf",
    "-inf",
    "+infinity",
    "1e999",
    "-1e999",
    "1e308",
    "-1e308",
    "",
    " ",
    "abc",
    "12,5",
    "12.5.1",
    "1_000",
    "0x1F",
    "३०",
    "３０",
    "30°C",
    "3 0",
    "--5",
    "1e",
    ".",
    "e5",
];

/// Characters that sneak into exported files: a BOM, zero-width and non-breaking spaces, an em
/// space, accents, an emoji, a right-to-left mark, a NUL.
const UNICODE: [&str; 9] = [
    "\u{feff}", "\u{200b}", "\u{a0}", "\u{2003}", "é", "🌿", "\u{200f}", "\0", "°",
];

/// Anything a user could open: arbitrary unicode, arbitrary bytes read lossily, and noise drawn
/// from the characters the parsers care about.
fn any_text() -> impl Strategy<Value = String> {
    prop_oneof![
        any::<String>(),
        prop::collection::vec(any::<u8>(), 0..400)
            .prop_map(|b| String::from_utf8_lossy(&b).into_owned()),
        "[0-9eE+\\-.,;:# \\t\\r\\nTxy_a-z\u{feff}\u{a0}]{0,300}",
    ]
}

// ---------------------------------------------------------------------------------------------
// Weather CSV
// ---------------------------------------------------------------------------------------------

/// One valid row's numbers: air °C, RH %, wind m/s, shortwave W/m², pressure kPa (or none).
type RowValues = (f64, f64, f64, f64, Option<f64>);

/// A valid weather document: its columns in file order and its rows of values.
#[derive(Debug, Clone)]
struct WeatherDoc {
    columns: Vec<&'static str>,
    rows: Vec<RowValues>,
    minutes: Vec<u32>,
}

impl WeatherDoc {
    fn time(&self, r: usize) -> DateTime {
        DateTime::date(2026, 7, 1).at(r as u32, self.minutes[r])
    }

    /// The text of row `r`'s fields in column order.
    fn fields(&self, r: usize) -> Vec<String> {
        let (t, rh, u, sw, p) = self.rows[r];
        self.columns
            .iter()
            .map(|c| match *c {
                "time" => self.time(r).to_string(),
                "air_temp_c" => format!("{t}"),
                "rh_pct" => format!("{rh}"),
                "wind_m_s" => format!("{u}"),
                "shortwave_w_m2" => format!("{sw}"),
                "pressure_kpa" => p.map_or(String::new(), |p| format!("{p}")),
                _ => "invented note".to_owned(),
            })
            .collect()
    }

    /// Lines of the file: the header, then one line per row.
    fn lines(&self) -> Vec<String> {
        let mut lines = vec![self.columns.join(",")];
        lines.extend((0..self.rows.len()).map(|r| self.fields(r).join(",")));
        lines
    }
}

fn value(range: leafwind_physics::error::ValidRange) -> impl Strategy<Value = f64> {
    prop_oneof![
        1 => Just(range.min),
        1 => Just(range.max),
        8 => range.min..=range.max,
    ]
}

fn weather_doc() -> impl Strategy<Value = WeatherDoc> {
    let columns = (any::<bool>(), any::<bool>()).prop_flat_map(|(pressure, note)| {
        let mut c = vec!["time", "air_temp_c", "rh_pct", "wind_m_s", "shortwave_w_m2"];
        if pressure {
            c.push("pressure_kpa");
        }
        if note {
            c.push("note");
        }
        Just(c).prop_shuffle()
    });
    let row = (
        value(AIR_TEMP_RANGE_C),
        value(RELATIVE_HUMIDITY_RANGE_PCT),
        value(AIR_SPEED_RANGE_M_S),
        value(SHORTWAVE_RANGE_W_M2),
        prop::option::of(value(PRESSURE_RANGE_KPA)),
    );
    (columns, prop::collection::vec((row, 0..60u32), 1..12)).prop_map(|(columns, rows)| {
        let has_pressure = columns.contains(&"pressure_kpa");
        WeatherDoc {
            columns,
            rows: rows
                .iter()
                .map(|&((t, rh, u, sw, p), _)| (t, rh, u, sw, p.filter(|_| has_pressure)))
                .collect(),
            minutes: rows.iter().map(|&(_, m)| m).collect(),
        }
    })
}

/// One change to a valid document.
#[derive(Debug, Clone)]
enum Mutation {
    /// No change.
    None,
    /// Row `row` loses field `col`.
    DropField { row: Index, col: Index },
    /// Field `col` of row `row` becomes `text`.
    Replace {
        row: Index,
        col: Index,
        text: &'static str,
    },
    /// Row `row` uses `to` instead of commas.
    Delimiter { row: Index, to: char },
    /// Row `row` is cut at `at` (a fraction of its length).
    Truncate { row: Index, at: f64 },
    /// Field `col` of row `row` gets `text` in front of it.
    Unicode {
        row: Index,
        col: Index,
        text: &'static str,
    },
    /// A byte-order mark at the start of the file.
    Bom,
    /// A byte-order mark, then a comment line, then the file.
    BomAndComment,
    /// Windows line ends.
    Crlf,
    /// Old Mac line ends (CR only): the file is one line.
    CrOnly,
    /// A blank or comment line after line `after`.
    Insert { after: Index, text: &'static str },
    /// Spaces around every field.
    Spaces,
    /// The header loses column `col`.
    HeaderDrop { col: Index },
    /// The header names column `col` twice.
    HeaderDuplicate { col: Index },
}

fn mutation() -> impl Strategy<Value = Mutation> {
    prop_oneof![
        Just(Mutation::None),
        (any::<Index>(), any::<Index>()).prop_map(|(row, col)| Mutation::DropField { row, col }),
        (
            any::<Index>(),
            any::<Index>(),
            prop::sample::select(&BAD_NUMBERS[..])
        )
            .prop_map(|(row, col, text)| Mutation::Replace { row, col, text }),
        (
            any::<Index>(),
            prop::sample::select(vec![';', '\t', ' ', '|'])
        )
            .prop_map(|(row, to)| Mutation::Delimiter { row, to }),
        (any::<Index>(), 0.0..1.0f64).prop_map(|(row, at)| Mutation::Truncate { row, at }),
        (
            any::<Index>(),
            any::<Index>(),
            prop::sample::select(&UNICODE[..])
        )
            .prop_map(|(row, col, text)| Mutation::Unicode { row, col, text }),
        Just(Mutation::Bom),
        Just(Mutation::BomAndComment),
        Just(Mutation::Crlf),
        Just(Mutation::CrOnly),
        (
            any::<Index>(),
            prop::sample::select(vec!["", "   ", "# a comment", "  # indented comment"])
        )
            .prop_map(|(after, text)| Mutation::Insert { after, text }),
        Just(Mutation::Spaces),
        any::<Index>().prop_map(|col| Mutation::HeaderDrop { col }),
        any::<Index>().prop_map(|col| Mutation::HeaderDuplicate { col }),
    ]
}

/// Cuts `line` at about `at` of its length, on a character boundary.
fn truncate(line: &str, at: f64) -> String {
    let mut cut = ((line.len() as f64) * at) as usize;
    while !line.is_char_boundary(cut) {
        cut -= 1;
    }
    line[..cut].to_owned()
}

/// Where the mutation lands: the data row it changed (index into the rows), if any.
struct Applied {
    text: String,
    /// Line number (1-based) of each data row in the final text.
    row_lines: Vec<usize>,
    /// The data row changed, if the mutation touched one row only.
    changed_row: Option<usize>,
}

/// Applies `m` to the lines of a document whose first line is a header (`has_header`) and whose
/// other lines are data rows; `split` and `join` handle one row's fields.
fn apply(lines: &[String], has_header: bool, m: &Mutation) -> Applied {
    let first_row = usize::from(has_header);
    let n_rows = lines.len() - first_row;
    let mut lines = lines.to_vec();
    let mut changed_row = None;
    // Changes field `col` of row `row` with `f`; returns the row.
    let edit_field =
        |lines: &mut Vec<String>, row: &Index, col: &Index, f: &dyn Fn(&mut Vec<String>, usize)| {
            let r = row.index(n_rows);
            let line = &mut lines[first_row + r];
            let mut fields: Vec<String> = line.split(',').map(str::to_owned).collect();
            let c = col.index(fields.len());
            f(&mut fields, c);
            *line = fields.join(",");
            r
        };
    let mut prefix = String::new();
    let mut line_end = "\n";
    let mut inserted: Option<(usize, &str)> = None;
    match m {
        Mutation::None => {}
        Mutation::DropField { row, col } => {
            changed_row = Some(edit_field(&mut lines, row, col, &|f, c| {
                f.remove(c);
            }));
        }
        Mutation::Replace { row, col, text } => {
            changed_row = Some(edit_field(&mut lines, row, col, &|f, c| {
                f[c] = (*text).to_owned();
            }));
        }
        Mutation::Unicode { row, col, text } => {
            changed_row = Some(edit_field(&mut lines, row, col, &|f, c| {
                f[c] = format!("{text}{}", f[c]);
            }));
        }
        Mutation::Delimiter { row, to } => {
            let r = row.index(n_rows);
            lines[first_row + r] = lines[first_row + r].replace(',', &to.to_string());
            changed_row = Some(r);
        }
        Mutation::Truncate { row, at } => {
            let r = row.index(n_rows);
            lines[first_row + r] = truncate(&lines[first_row + r], *at);
            changed_row = Some(r);
        }
        Mutation::Bom => prefix = "\u{feff}".to_owned(),
        Mutation::BomAndComment => prefix = "\u{feff}# exported by an invented logger\n".to_owned(),
        Mutation::Crlf => line_end = "\r\n",
        Mutation::CrOnly => line_end = "\r",
        Mutation::Insert { after, text } => inserted = Some((after.index(lines.len() + 1), text)),
        Mutation::Spaces => {
            for l in &mut lines {
                *l = l
                    .split(',')
                    .map(|f| format!("  {f} "))
                    .collect::<Vec<_>>()
                    .join(",");
            }
        }
        Mutation::HeaderDrop { col } | Mutation::HeaderDuplicate { col } if has_header => {
            let mut fields: Vec<String> = lines[0].split(',').map(str::to_owned).collect();
            let c = col.index(fields.len());
            if matches!(m, Mutation::HeaderDrop { .. }) {
                fields.remove(c);
            } else {
                let name = fields[c].clone();
                fields.push(name);
            }
            lines[0] = fields.join(",");
        }
        Mutation::HeaderDrop { .. } | Mutation::HeaderDuplicate { .. } => {}
    }
    if let Some((at, text)) = inserted {
        lines.insert(at, text.to_owned());
    }
    let skip_before = usize::from(prefix.contains('\n'));
    let inserted_at = inserted.map(|(at, _)| at);
    let row_lines = (0..n_rows)
        .map(|r| {
            let index = first_row + r;
            let shifted = inserted_at.is_some_and(|at| at <= index);
            index + usize::from(shifted) + skip_before + 1
        })
        .collect();
    let mut text = prefix;
    for l in &lines {
        text.push_str(l);
        text.push_str(line_end);
    }
    Applied {
        text,
        row_lines,
        changed_row,
    }
}

/// No row is lost: each data line gives a record or an error, and every error names a line that
/// holds data.
fn check_weather_bookkeeping(text: &str, w: &WeatherImport) {
    let data_lines: Vec<usize> = text
        .lines()
        .enumerate()
        .map(|(i, l)| (i + 1, l.trim_end_matches('\r')))
        .filter(|(_, l)| !l.trim().is_empty() && !l.trim_start().starts_with('#'))
        .skip(1)
        .map(|(n, _)| n)
        .collect();
    assert_eq!(
        w.records.len() + w.errors.len(),
        data_lines.len(),
        "rows lost or doubled: {w:?}"
    );
    for e in &w.errors {
        assert!(
            data_lines.contains(&e.line),
            "error on a line without data: {e}"
        );
        assert!(e.to_string().contains(&format!("line {}", e.line)), "{e}");
        assert!(!e.reason.is_empty() && !e.column.is_empty(), "{e:?}");
    }
    for pair in w.records.windows(2) {
        assert!(pair[0].time < pair[1].time, "times out of order: {pair:?}");
    }
    for r in &w.records {
        assert!(AIR_TEMP_RANGE_C.contains(r.air_temp_c), "{r:?}");
        assert!(RELATIVE_HUMIDITY_RANGE_PCT.contains(r.rh_pct), "{r:?}");
        assert!(AIR_SPEED_RANGE_M_S.contains(r.wind_m_s), "{r:?}");
        assert!(SHORTWAVE_RANGE_W_M2.contains(r.shortwave_w_m2), "{r:?}");
        assert!(
            r.pressure_kpa
                .is_none_or(|p| PRESSURE_RANGE_KPA.contains(p)),
            "{r:?}"
        );
        assert!(r.time.validate().is_ok(), "{r:?}");
    }
}

/// The record of row `r` of `doc`, as parsed.
fn expect_row(doc: &WeatherDoc, r: usize, w: &WeatherImport) {
    let (t, rh, u, sw, p) = doc.rows[r];
    let time = doc.time(r);
    let got = w.records.iter().find(|x| x.time == time);
    let got = got.unwrap_or_else(|| panic!("good row {r} ({time}) is missing: {w:?}"));
    assert_eq!(
        (
            got.air_temp_c,
            got.rh_pct,
            got.wind_m_s,
            got.shortwave_w_m2,
            got.pressure_kpa
        ),
        (t, rh, u, sw, p),
        "row {r} changed"
    );
}

proptest! {
    #![proptest_config(config(256))]

    /// Any text at all: an import or a whole-file error, never a panic, with the bookkeeping
    /// intact.
    #[test]
    fn weather_any_text(text in any_text()) {
        if let Ok(w) = parse_csv(&text) {
            check_weather_bookkeeping(&text, &w);
        }
    }

    /// Arbitrary rows under a valid header.
    #[test]
    fn weather_any_rows(rows in prop::collection::vec(any_text(), 0..8)) {
        let text = format!(
            "time,air_temp_c,rh_pct,wind_m_s,shortwave_w_m2,pressure_kpa\n{}",
            rows.join("\n")
        );
        let w = parse_csv(&text).expect("the header is valid");
        check_weather_bookkeeping(&text, &w);
    }
}

proptest! {
    #![proptest_config(config(192))]

    /// A valid document with one mutation.
    #[test]
    fn weather_near_valid(doc in weather_doc(), m in mutation()) {
        let applied = apply(&doc.lines(), true, &m);
        let text = &applied.text;
        let result = parse_csv(text);
        match &m {
            Mutation::CrOnly => return Ok(()), // one long line: anything but a panic
            // A known bug with its own test (weather_bom_before_a_comment_line).
            Mutation::BomAndComment => return Ok(()),
            Mutation::HeaderDrop { col } => {
                let dropped = doc.columns[col.index(doc.columns.len())];
                match result {
                    Err(ImportError::MissingColumn { column }) => prop_assert_eq!(column, dropped),
                    Ok(w) => {
                        prop_assert!(matches!(dropped, "pressure_kpa" | "note"), "{w:?}");
                        check_weather_bookkeeping(text, &w);
                    }
                    Err(e) => prop_assert!(false, "{e}"),
                }
                return Ok(());
            }
            Mutation::HeaderDuplicate { col } => {
                let twice = doc.columns[col.index(doc.columns.len())];
                prop_assert_eq!(
                    result,
                    Err(ImportError::DuplicateColumn { column: twice.to_owned() })
                );
                return Ok(());
            }
            _ => {}
        }
        let w = result.unwrap_or_else(|e| panic!("{m:?} made the whole file fail: {e}\n{text:?}"));
        check_weather_bookkeeping(text, &w);
        for r in 0..doc.rows.len() {
            if Some(r) != applied.changed_row {
                expect_row(&doc, r, &w);
            }
        }
        match applied.changed_row {
            None => prop_assert!(w.errors.is_empty(), "{m:?}: {:?}", w.errors),
            Some(r) => {
                for e in &w.errors {
                    prop_assert_eq!(e.line, applied.row_lines[r], "{:?}: {}", m, e);
                }
            }
        }
    }
}

/// A byte-order mark before a comment line hides the comment: the comment is read as the header
/// and the whole file fails. Parser bug reported to the lead (`weather::parse_csv` strips the BOM
/// from header names but tests for `#` before stripping it); fails until fixed.
#[test]
fn weather_bom_before_a_comment_line() {
    let text = "\u{feff}# exported by an invented logger\n\
                time,air_temp_c,rh_pct,wind_m_s,shortwave_w_m2\n\
                2026-07-01 12:00,31.5,40,1.2,850\n";
    let w = parse_csv(text).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(w.records.len(), 1);
}

// ---------------------------------------------------------------------------------------------
// Outline CSV
// ---------------------------------------------------------------------------------------------

/// A valid star-shaped outline (mm): `n` vertices at jittered, increasing angles around a
/// centre, so the polygon is simple.
fn outline_points() -> impl Strategy<Value = Vec<(f64, f64)>> {
    (3..40usize, -500.0..500.0f64, -500.0..500.0f64).prop_flat_map(|(n, cx, cy)| {
        prop::collection::vec((-0.4..0.4f64, 5.0..100.0f64), n).prop_map(move |v| {
            let step = std::f64::consts::TAU / v.len() as f64;
            v.iter()
                .enumerate()
                .map(|(i, &(jitter, r))| {
                    let a = (i as f64 + jitter) * step;
                    (cx + r * a.cos(), cy + r * a.sin())
                })
                .collect()
        })
    })
}

fn outline_lines(points: &[(f64, f64)], header: bool) -> Vec<String> {
    let mut lines = Vec::new();
    if header {
        lines.push("x_mm,y_mm".to_owned());
    }
    lines.extend(points.iter().map(|(x, y)| format!("{x},{y}")));
    lines
}

/// The rows an error names, if any.
fn error_rows(e: &ShapeError) -> Vec<usize> {
    match *e {
        ShapeError::FieldCount { row, .. }
        | ShapeError::NotNumeric { row, .. }
        | ShapeError::NotFinite { row, .. } => vec![row],
        ShapeError::TooFewPoints { last_row, .. } => vec![last_row],
        ShapeError::ZeroArea {
            first_row,
            last_row,
            ..
        } => vec![first_row, last_row],
        ShapeError::SelfCrossing {
            first_from_row,
            first_to_row,
            second_from_row,
            second_to_row,
        } => vec![first_from_row, first_to_row, second_from_row, second_to_row],
        _ => Vec::new(),
    }
}

/// Every row an error names exists in `text`, and row-level errors say "row N".
fn check_outline_error(text: &str, e: &ShapeError) {
    let lines = text.lines().count();
    for row in error_rows(e) {
        assert!(
            (1..=lines.max(1)).contains(&row),
            "{e} names row {row} of {lines}"
        );
    }
    if let ShapeError::FieldCount { row, .. }
    | ShapeError::NotNumeric { row, .. }
    | ShapeError::NotFinite { row, .. } = *e
    {
        assert!(e.to_string().contains(&format!("row {row}")), "{e}");
    }
}

/// A parsed outline is a real one: finite points, positive finite area and perimeter.
fn check_outline(o: &Outline) {
    assert!(o.points().len() >= 3);
    assert!(
        o.points()
            .iter()
            .all(|p| p.x_m.is_finite() && p.y_m.is_finite())
    );
    assert!(
        o.area_m2().is_finite() && o.area_m2() > 0.0,
        "{}",
        o.area_m2()
    );
    assert!(o.perimeter_m().is_finite() && o.perimeter_m() > 0.0);
}

proptest! {
    #![proptest_config(config(256))]

    /// Any text at all: an outline or an error naming real rows, never a panic.
    #[test]
    fn outline_any_text(text in any_text()) {
        match outline_from_csv_mm(&text) {
            Ok(o) => check_outline(&o),
            Err(e) => check_outline_error(&text, &e),
        }
    }

    /// Any numbers at all, including huge and subnormal ones.
    #[test]
    fn outline_any_numbers(points in prop::collection::vec((any::<f64>(), any::<f64>()), 0..12)) {
        let text: String = points.iter().map(|(x, y)| format!("{x},{y}\n")).collect();
        match outline_from_csv_mm(&text) {
            Ok(o) => check_outline(&o),
            Err(e) => check_outline_error(&text, &e),
        }
    }
}

proptest! {
    #![proptest_config(config(192))]

    /// A valid outline with one mutation: a data-free change gives the same outline; a change to
    /// one row is reported at that row (or, if it still reads as numbers, gives an outline or an
    /// outline error).
    #[test]
    fn outline_near_valid(
        points in outline_points(),
        header in any::<bool>(),
        m in mutation(),
    ) {
        let lines = outline_lines(&points, header);
        let original = outline_from_csv_mm(&(lines.join("\n") + "\n"));
        let original = original.unwrap_or_else(|e| panic!("a valid outline fails: {e}"));
        let applied = apply(&lines, header, &m);
        let text = &applied.text;
        let result = outline_from_csv_mm(text);
        if let Err(e) = &result {
            check_outline_error(text, e);
        }
        if let Ok(o) = &result {
            check_outline(o);
        }
        match &m {
            Mutation::CrOnly => return Ok(()),
            Mutation::HeaderDrop { .. } | Mutation::HeaderDuplicate { .. } if header => {
                // "x_mm" alone or three names: still no numbers, still a header.
                prop_assert_eq!(result, Ok(original));
                return Ok(());
            }
            _ => {}
        }
        let Some(r) = applied.changed_row else {
            prop_assert_eq!(result, Ok(original), "{:?}", m);
            return Ok(());
        };
        let row = applied.row_lines[r];
        let first_without_header = !header && r == 0;
        match (&m, result) {
            (Mutation::DropField { .. }, Err(e)) => {
                prop_assert_eq!(e, ShapeError::FieldCount { row, found: 1 });
            }
            (Mutation::Replace { text: t, .. }, r) => {
                let v = t.trim().parse::<f64>();
                match (v, r) {
                    (Ok(v), Err(ShapeError::NotFinite { row: at, .. })) if !v.is_finite() => {
                        prop_assert_eq!(at, row);
                    }
                    (Ok(v), _) if v.is_finite() => {} // a number: any outline or outline error
                    (Err(_), Err(ShapeError::NotNumeric { row: at, .. })) => prop_assert_eq!(at, row),
                    // "12,5" adds a field.
                    (Err(_), Err(ShapeError::FieldCount { row: at, found: 3 })) if t.contains(',') => {
                        prop_assert_eq!(at, row);
                    }
                    (v, r) => prop_assert!(false, "{m:?} ({v:?}) gave {r:?}"),
                }
            }
            (Mutation::Delimiter { .. }, Err(ShapeError::FieldCount { row: at, found: 1 })) => {
                prop_assert_eq!(at, row);
            }
            // Documented: with no header, a first line without a number is taken as a header, so a
            // first row with the wrong delimiter is skipped silently (reported to the lead).
            (Mutation::Delimiter { .. }, r) if first_without_header => {
                // The rest, on the same line numbers (a blank first line is skipped).
                let rest = outline_from_csv_mm(&format!("\n{}\n", lines[1..].join("\n")));
                prop_assert_eq!(r, rest);
            }
            (Mutation::Unicode { text: u, .. }, r) => {
                if u.trim().is_empty() {
                    prop_assert_eq!(r, Ok(original)); // a whitespace character is trimmed
                } else if *u == BOM.to_string() && r == Ok(original.clone()) {
                    // A BOM that landed at the very start of the text is stripped.
                    prop_assert!(text.starts_with(BOM), "{:?}", text);
                } else {
                    prop_assert!(
                        matches!(r, Err(ShapeError::NotNumeric { row: at, .. }) if at == row),
                        "{m:?} gave {r:?}"
                    );
                }
            }
            // A cut row: shorter numbers (any outline or outline error), a missing field or value
            // at that row, or a blank line (the point is simply gone).
            (Mutation::Truncate { .. }, Err(
                ShapeError::FieldCount { row: at, .. } | ShapeError::NotNumeric { row: at, .. },
            )) => prop_assert_eq!(at, row),
            (Mutation::Truncate { .. }, _) => {}
            (m, r) => prop_assert!(false, "{m:?} gave {r:?}"),
        }
    }
}

/// Coordinates that are finite but whose products overflow: the shoelace area is ∞ − ∞ = NaN, the
/// zero-area test `area <= 1e-12 · perimeter²` is false for NaN, and the outline is accepted with a
/// NaN area (NaN then reaches the effective dimension and the energy balance). Engine bug reported
/// to the lead (`shape/outline.rs`, `Outline::with_rows`; `shape/import.rs` accepts any finite
/// value); fails until such outlines are rejected (for example by a size range, or a finite-area
/// check).
#[test]
fn outline_with_overflowing_coordinates_is_an_error() {
    let text = "0,0\n1e200,1e190\n1e190,1e200\n";
    match outline_from_csv_mm(text) {
        Ok(o) => panic!(
            "accepted with area {} m² and perimeter {} m",
            o.area_m2(),
            o.perimeter_m()
        ),
        Err(e) => check_outline_error(text, &e),
    }
}

/// The documented header rule in one line: with no header, a first data row written with
/// semicolons reads as a header and is dropped without a word; the outline silently loses a
/// vertex. Reported to the lead as a usability hazard (the rule is documented, so this test
/// states today's behaviour rather than failing).
#[test]
fn outline_first_row_with_the_wrong_delimiter_is_taken_as_a_header() {
    let with = outline_from_csv_mm("0;0\n100,0\n100,40\n0,40\n").unwrap();
    let without = outline_from_csv_mm("100,0\n100,40\n0,40\n").unwrap();
    assert_eq!(with, without);
}

// ---------------------------------------------------------------------------------------------
// Clock times and crop names
// ---------------------------------------------------------------------------------------------

proptest! {
    #![proptest_config(config(256))]

    /// Any text: `None` or a valid date that prints and parses back to itself.
    #[test]
    fn date_time_any_text(text in any_text()) {
        if let Some(d) = DateTime::parse(&text) {
            prop_assert!(d.validate().is_ok(), "{text:?} gave {d:?}");
            prop_assert_eq!(DateTime::parse(&d.to_string()), Some(d));
        }
    }

    /// A valid time with one character replaced, inserted or removed.
    #[test]
    fn date_time_near_valid(
        hours in 0..200_000u32,
        at in any::<Index>(),
        c in prop::sample::select(vec!['0', '9', '-', ':', ' ', 'T', 'x', '\u{feff}', '٣']),
        how in 0..3u8,
    ) {
        let d = DateTime::date(2000, 1, 1).at(hours % 24, hours % 60);
        let mut chars: Vec<char> = d.to_string().chars().collect();
        let i = at.index(chars.len());
        match how {
            0 => chars[i] = c,
            1 => chars.insert(i, c),
            _ => {
                chars.remove(i);
            }
        }
        let text: String = chars.into_iter().collect();
        if let Some(p) = DateTime::parse(&text) {
            prop_assert!(p.validate().is_ok(), "{text:?} gave {p:?}");
        }
    }

    /// Any crop and stage name: a built-in limit or an error listing the known ones.
    #[test]
    fn crop_lookup_any_text(crop in any_text(), stage in any_text()) {
        match crops::find(&crop, &stage) {
            Ok(l) => prop_assert!(l.validate().is_ok()),
            Err(e) => prop_assert!(e.to_string().contains("known:"), "{e}"),
        }
    }
}

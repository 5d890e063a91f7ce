//! Outline import from CSV text: one `x,y` point per line, in millimetres.

use super::ShapeError;
use super::outline::{Outline, Point};

/// Metres per millimetre (SI prefix definition): CSV outlines are in mm, the engine works in m.
pub const METRES_PER_MILLIMETRE: f64 = 1.0e-3;

/// Reads an outline from CSV text with one point per line, `x,y` in millimetres.
///
/// Format: comma-separated, two values per line; spaces around values are ignored; blank lines and
/// lines starting with `#` are skipped. The first non-blank line is a header when none of its
/// values reads as a number (e.g. `x_mm,y_mm`); otherwise every line is data. The outline closes
/// itself (a last point repeating the first is allowed and merged). The points are the outline's
/// vertices in order around it, either way round.
///
/// - `text`: the file's contents.
/// - Returns the validated [`Outline`] in metres.
///
/// # Errors
/// Each names the line (row) as a text editor numbers it: [`ShapeError::FieldCount`] (not two
/// values), [`ShapeError::NotNumeric`], [`ShapeError::NotFinite`] (NaN, ±inf or an overflowing value
/// such as `1e999`), and the outline checks of [`Outline::new`] — [`ShapeError::Empty`],
/// [`ShapeError::TooFewPoints`] (< 3), [`ShapeError::ZeroArea`], [`ShapeError::SelfCrossing`] (every
/// non-adjacent edge pair is tested).
///
/// ```
/// use leafwind_physics::shape::outline_from_csv_mm;
/// let o = outline_from_csv_mm("x_mm,y_mm\n0,0\n100,0\n100,40\n0,40\n").unwrap();
/// assert!((o.area_m2() - 0.004).abs() < 1e-15); // 100 mm × 40 mm = 0.004 m²
/// ```
pub fn outline_from_csv_mm(text: &str) -> Result<Outline, ShapeError> {
    let mut points = Vec::new();
    let mut rows = Vec::new();
    let mut first_content = true;
    let text = text.strip_prefix('\u{feff}').unwrap_or(text); // a UTF-8 byte-order mark
    for (index, raw) in text.lines().enumerate() {
        let row = index + 1;
        let line = raw.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        let fields: Vec<&str> = line.split(',').map(str::trim).collect();
        let is_header = first_content && fields.iter().all(|f| f.parse::<f64>().is_err());
        first_content = false;
        if is_header {
            continue;
        }
        if fields.len() != 2 {
            return Err(ShapeError::FieldCount {
                row,
                found: fields.len(),
            });
        }
        let mut xy = [0.0; 2];
        for (k, (column, text)) in ["x", "y"].into_iter().zip(&fields).enumerate() {
            let value: f64 = text.parse().map_err(|_| ShapeError::NotNumeric {
                row,
                column,
                text: (*text).to_owned(),
            })?;
            if !value.is_finite() {
                return Err(ShapeError::NotFinite { row, column, value });
            }
            xy[k] = value * METRES_PER_MILLIMETRE;
        }
        points.push(Point::new(xy[0], xy[1]));
        rows.push(row);
    }
    if points.is_empty() {
        return Err(ShapeError::Empty);
    }
    Outline::with_rows(points, rows)
}

#[cfg(test)]
mod tests {
    use super::*;

    // Error rows are the file's line numbers (common practice, no source).
    #[test]
    fn too_few_points_names_the_last_row() {
        let e = outline_from_csv_mm("x,y\n0,0\n\n10,0\n").unwrap_err();
        assert_eq!(
            e,
            ShapeError::TooFewPoints {
                found: 2,
                last_row: 4
            }
        );
        assert!(e.to_string().contains("row 4"), "{e}");
    }

    #[test]
    fn non_numeric_value_names_row_and_column() {
        let e = outline_from_csv_mm("x,y\n0,0\n10,zero\n10,10\n").unwrap_err();
        assert_eq!(
            e,
            ShapeError::NotNumeric {
                row: 3,
                column: "y",
                text: "zero".into()
            }
        );
        assert_eq!(e.to_string(), "row 3: the y value \"zero\" is not a number");
    }

    #[test]
    fn non_finite_and_wrong_field_count_name_the_row() {
        let e = outline_from_csv_mm("0,0\n10,0\ninf,10\n").unwrap_err();
        assert!(matches!(
            e,
            ShapeError::NotFinite {
                row: 3,
                column: "x",
                ..
            }
        ));
        let e = outline_from_csv_mm("0,0\n10,0,5\n10,10\n").unwrap_err();
        assert_eq!(e, ShapeError::FieldCount { row: 2, found: 3 });
        let e = outline_from_csv_mm("0,0\n1e999,0\n10,10\n").unwrap_err();
        assert!(matches!(e, ShapeError::NotFinite { row: 2, .. }));
    }

    #[test]
    fn self_crossing_outline_names_both_edges() {
        // Bow tie: rows 2–3 and 4–5 cross (row 1 is the header).
        let e = outline_from_csv_mm("x,y\n0,0\n10,10\n10,0\n0,10\n").unwrap_err();
        assert_eq!(
            e,
            ShapeError::SelfCrossing {
                first_from_row: 2,
                first_to_row: 3,
                second_from_row: 4,
                second_to_row: 5
            }
        );
        assert!(e.to_string().contains("row 2 to row 3"), "{e}");
    }

    #[test]
    fn zero_area_and_empty_are_rejected() {
        assert!(matches!(
            outline_from_csv_mm("0,0\n5,5\n10,10\n"),
            Err(ShapeError::ZeroArea {
                first_row: 1,
                last_row: 3,
                ..
            })
        ));
        assert_eq!(
            outline_from_csv_mm("x,y\n\n# nothing\n"),
            Err(ShapeError::Empty)
        );
    }

    #[test]
    fn header_is_optional_and_closing_point_is_merged() {
        let a = outline_from_csv_mm("0,0\n10,0\n10,10\n0,0\n").unwrap();
        let b = outline_from_csv_mm("# comment\nx_mm, y_mm\n0, 0\n10, 0\n10, 10\n").unwrap();
        assert_eq!(a, b);
        assert!((a.area_m2() - 50.0e-6).abs() < 1e-18);
    }
}

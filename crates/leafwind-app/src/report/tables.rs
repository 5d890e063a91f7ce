//! The CSV tables behind the report's plots, and the number formatting both the HTML and the CSV
//! use. Numbers are in the report's units, with the unit in every numeric column's name
//! (`air_speed [m/s]`); a value that is not finite is an empty cell, never "NaN".

use std::path::Path;

use anyhow::Context as _;

use super::units::{Quantity, UnitSystem};

/// What a report page shows for a value that is missing or not finite.
pub const MISSING: &str = "—";

/// A CSV table: its file name, its header and its rows (text cells).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct CsvTable {
    /// File name inside the report folder, e.g. `sweep.csv`.
    pub file_name: &'static str,
    /// What the table holds, for the report's list of files.
    pub description: &'static str,
    /// Column names, units in brackets.
    pub header: Vec<String>,
    /// Rows of cells.
    pub rows: Vec<Vec<String>>,
}

impl CsvTable {
    /// An empty table with this header.
    #[must_use]
    pub fn new(file_name: &'static str, description: &'static str, header: Vec<String>) -> Self {
        Self {
            file_name,
            description,
            header,
            rows: Vec::new(),
        }
    }

    /// The table as CSV text.
    ///
    /// # Errors
    /// A row with the wrong number of cells (a bug), or a writer failure.
    pub fn to_csv(&self) -> anyhow::Result<String> {
        let mut w = csv::Writer::from_writer(Vec::new());
        w.write_record(&self.header)?;
        for r in &self.rows {
            w.write_record(r)?;
        }
        let bytes = w.into_inner().map_err(|e| anyhow::anyhow!("{e}"))?;
        Ok(String::from_utf8(bytes)?)
    }

    /// Writes the table into `dir`; returns the path written.
    ///
    /// # Errors
    /// As [`CsvTable::to_csv`], or the write failure with the path.
    pub fn write_into(&self, dir: &Path) -> anyhow::Result<std::path::PathBuf> {
        let path = dir.join(self.file_name);
        std::fs::write(&path, self.to_csv()?)
            .with_context(|| format!("could not write {}", path.display()))?;
        Ok(path)
    }
}

/// A column name with the unit of `q` in `units`: `air_speed [m/s]`; no brackets for a unitless
/// quantity.
#[must_use]
pub fn head(name: &str, q: Quantity, units: UnitSystem) -> String {
    let u = q.unit(units);
    if u.is_empty() {
        name.to_owned()
    } else {
        format!("{name} [{u}]")
    }
}

/// A CSV cell for a number already in display units: up to six decimals, trailing zeros dropped;
/// empty when not finite.
#[must_use]
pub fn csv_num(x: f64) -> String {
    if !x.is_finite() {
        return String::new();
    }
    let s = format!("{x:.6}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".to_owned()
    } else {
        s.to_owned()
    }
}

/// A CSV cell for an SI value shown as `q` in `units`.
#[must_use]
pub fn csv_q(q: Quantity, si: f64, units: UnitSystem) -> String {
    csv_num(q.to_display(si, units))
}

/// A CSV cell for an optional SI value.
#[must_use]
pub fn csv_opt(q: Quantity, si: Option<f64>, units: UnitSystem) -> String {
    si.map_or_else(String::new, |v| csv_q(q, v, units))
}

/// "12.3 °C": the SI value in `units` with the quantity's usual decimals; [`MISSING`] when not
/// finite.
#[must_use]
pub fn show(q: Quantity, si: f64, units: UnitSystem) -> String {
    show_with(q, si, units, q.decimals(units))
}

/// As [`show`] with a chosen number of decimals.
#[must_use]
pub fn show_with(q: Quantity, si: f64, units: UnitSystem, decimals: usize) -> String {
    if q.to_display(si, units).is_finite() {
        q.format_with(si, units, decimals)
    } else {
        MISSING.to_owned()
    }
}

/// As [`show`] for an optional value.
#[must_use]
pub fn show_opt(q: Quantity, si: Option<f64>, units: UnitSystem) -> String {
    si.map_or_else(|| MISSING.to_owned(), |v| show(q, v, units))
}

/// A plain number with `decimals`; [`MISSING`] when not finite.
#[must_use]
pub fn show_num(x: f64, decimals: usize) -> String {
    if x.is_finite() {
        format!("{x:.decimals$}")
    } else {
        MISSING.to_owned()
    }
}

/// A number with about three significant figures, in scientific notation when very large or
/// small (Reynolds and Grashof numbers, residuals); [`MISSING`] when not finite.
#[must_use]
pub fn show_sig(x: f64) -> String {
    if !x.is_finite() {
        return MISSING.to_owned();
    }
    let a = x.abs();
    if a == 0.0 {
        "0".to_owned()
    } else if !(1e-2..1e5).contains(&a) {
        let s = format!("{x:.2e}");
        // 1.23e-8 → 1.23 × 10⁻⁸ reads better on paper.
        match s.split_once('e') {
            Some((m, e)) => format!("{m} × 10{}", superscript(e)),
            None => s,
        }
    } else if a >= 100.0 {
        format!("{x:.0}")
    } else if a >= 1.0 {
        format!("{x:.2}")
    } else {
        format!("{x:.3}")
    }
}

fn superscript(exp: &str) -> String {
    exp.chars()
        .map(|c| match c {
            '-' => '⁻',
            '0' => '⁰',
            '1' => '¹',
            '2' => '²',
            '3' => '³',
            '4' => '⁴',
            '5' => '⁵',
            '6' => '⁶',
            '7' => '⁷',
            '8' => '⁸',
            '9' => '⁹',
            other => other,
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn cells_never_hold_nan() {
        assert_eq!(csv_num(f64::NAN), "");
        assert_eq!(csv_num(f64::INFINITY), "");
        assert_eq!(csv_num(1.5), "1.5");
        assert_eq!(csv_num(-0.000_000_1), "0");
        assert_eq!(
            show(Quantity::Temperature, f64::NAN, UnitSystem::Si),
            MISSING
        );
        assert_eq!(show_sig(f64::NEG_INFINITY), MISSING);
        assert_eq!(show_sig(-8.6e-9), "-8.60 × 10⁻⁹");
    }

    #[test]
    fn csv_has_the_header_first() {
        let mut t = CsvTable::new("t.csv", "test", vec!["a [K]".into(), "b".into()]);
        t.rows.push(vec!["1".into(), "x, y".into()]);
        assert_eq!(t.to_csv().unwrap(), "a [K],b\n1,\"x, y\"\n");
    }
}

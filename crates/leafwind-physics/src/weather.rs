//! Hourly weather from a CSV text, parsed by hand, with row-level errors that never stop the good
//! rows; and the hourly canopy run over it ([`run_series`]).
//!
//! # Format
//! - First non-comment line: a header naming the columns, in any order, separated by commas:
//!   `time, air_temp_c, rh_pct, wind_m_s, shortwave_w_m2` and optionally `pressure_kpa`. Other
//!   columns are ignored.
//! - `time`: local clock time `YYYY-MM-DD HH:MM` (a `T` may replace the space; `:SS` is ignored),
//!   in the site's time zone ([`crate::sun::Site::utc_offset_h`]).
//! - `air_temp_c` \[°C\], `rh_pct` \[%\], `wind_m_s` \[m s⁻¹\], `shortwave_w_m2` global horizontal
//!   \[W m⁻²\], `pressure_kpa` \[kPa\] (may be empty in a row: the site's altitude then gives it).
//! - Blank lines and lines starting with `#` are skipped. Times must increase from row to row.
//! - Rows may be hourly or finer (a climate computer's 5 or 15 min); each row stands for the
//!   record's logging step ([`crate::design_day::row_durations_h`]), so hours over a limit are
//!   hours of clock time whatever the logging step.
//!
//! Values are checked against the engine's ranges; a bad value rejects its row with an error
//! naming the line, the column, the value and why.

use thiserror::Error;

use crate::air::{
    AIR_TEMP_RANGE_C, Humidity, PRESSURE_RANGE_KPA, RELATIVE_HUMIDITY_RANGE_PCT,
    pressure_from_altitude_kpa,
};
use crate::case::AIR_SPEED_RANGE_M_S;
use crate::design_day::{HourLight, HourWeather, HourlySeries, SeriesCase, run_hours};
use crate::error::{Result, ValidRange};
use crate::radiation::SHORTWAVE_RANGE_W_M2;
use crate::sun::DateTime;

/// One hour of weather.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct WeatherRecord {
    /// Local clock time.
    pub time: DateTime,
    /// Air temperature \[°C\].
    pub air_temp_c: f64,
    /// Relative humidity \[%\].
    pub rh_pct: f64,
    /// Wind speed \[m s⁻¹\].
    pub wind_m_s: f64,
    /// Global shortwave on the horizontal \[W m⁻²\].
    pub shortwave_w_m2: f64,
    /// Pressure \[kPa\], if given.
    pub pressure_kpa: Option<f64>,
}

/// Why one row was rejected.
#[derive(Debug, Clone, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct RowError {
    /// Line number in the text (1 = first line).
    pub line: usize,
    /// Column name (`(row)` for a problem with the whole row).
    pub column: String,
    /// The offending text.
    pub value: String,
    /// Why it was rejected.
    pub reason: String,
}

impl std::fmt::Display for RowError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "line {}, column {}, value \"{}\": {}",
            self.line, self.column, self.value, self.reason
        )
    }
}

/// Why the text as a whole could not be read.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum ImportError {
    /// No header line.
    #[error("the weather file is empty (no header line)")]
    Empty,
    /// A required column is missing from the header.
    #[error(
        "the header has no \"{column}\" column; required: time, air_temp_c, rh_pct, wind_m_s, shortwave_w_m2 (optional: pressure_kpa)"
    )]
    MissingColumn {
        /// The missing column.
        column: &'static str,
    },
    /// A column is named twice.
    #[error("the header names the column \"{column}\" twice")]
    DuplicateColumn {
        /// The repeated column.
        column: String,
    },
}

/// The good rows and the errors of the bad ones.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct WeatherImport {
    /// Rows that passed, in order.
    pub records: Vec<WeatherRecord>,
    /// Rows that did not, with their reasons.
    pub errors: Vec<RowError>,
}

const REQUIRED: [&str; 5] = ["time", "air_temp_c", "rh_pct", "wind_m_s", "shortwave_w_m2"];

/// Parses weather CSV text (format in the module documentation).
///
/// # Errors
/// [`ImportError`] for an empty text or a header lacking a required column; bad rows are returned in
/// [`WeatherImport::errors`] instead.
///
/// ```
/// use leafwind_physics::weather::parse_csv;
/// let text = "time,air_temp_c,rh_pct,wind_m_s,shortwave_w_m2\n\
///             2026-07-01 12:00,31.5,40,1.2,850\n\
///             2026-07-01 13:00,hot,40,1.2,820\n";
/// let w = parse_csv(text).unwrap();
/// assert_eq!(w.records.len(), 1);
/// assert_eq!(w.errors[0].line, 3);
/// assert_eq!(w.errors[0].column, "air_temp_c");
/// ```
pub fn parse_csv(text: &str) -> std::result::Result<WeatherImport, ImportError> {
    // A byte-order mark belongs to the file, not to its first line's content.
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let mut lines = text
        .lines()
        .enumerate()
        .map(|(i, l)| (i + 1, l.trim_end_matches('\r')))
        .filter(|(_, l)| !l.trim().is_empty() && !l.trim_start().starts_with('#'));
    let (_, header) = lines.next().ok_or(ImportError::Empty)?;
    let names: Vec<String> = header
        .split(',')
        .map(|h| h.trim().trim_start_matches('\u{feff}').to_lowercase())
        .collect();
    for (i, n) in names.iter().enumerate() {
        if !n.is_empty() && names[..i].contains(n) {
            return Err(ImportError::DuplicateColumn { column: n.clone() });
        }
    }
    let col = |name: &'static str| names.iter().position(|n| n == name);
    let mut idx = [0usize; 5];
    for (k, name) in REQUIRED.iter().enumerate() {
        idx[k] = col(name).ok_or(ImportError::MissingColumn { column: name })?;
    }
    let pressure_idx = col("pressure_kpa");
    let mut records = Vec::new();
    let mut errors = Vec::new();
    let mut last_time: Option<DateTime> = None;
    for (line, row) in lines {
        let fields: Vec<&str> = row.split(',').map(str::trim).collect();
        let err = |column: &str, value: &str, reason: String| RowError {
            line,
            column: column.to_owned(),
            value: value.to_owned(),
            reason,
        };
        let need = idx
            .iter()
            .chain(pressure_idx.iter())
            .max()
            .copied()
            .unwrap_or(0)
            + 1;
        if fields.len() < need {
            errors.push(err(
                "(row)",
                row,
                format!("has {} fields, the header needs {need}", fields.len()),
            ));
            continue;
        }
        let time_text = fields[idx[0]];
        let Some(time) = DateTime::parse(time_text) else {
            errors.push(err(
                "time",
                time_text,
                "not a valid local time YYYY-MM-DD HH:MM".into(),
            ));
            continue;
        };
        if let Some(prev) = last_time
            && time <= prev
        {
            errors.push(err(
                "time",
                time_text,
                format!("not after the previous good row's time {prev}"),
            ));
            continue;
        }
        let number = |k: usize, range: ValidRange| -> std::result::Result<f64, RowError> {
            let text = fields[idx[k]];
            let v: f64 = text
                .parse()
                .map_err(|_| err(REQUIRED[k], text, "not a number".into()))?;
            range
                .check(v)
                .map_err(|e| err(REQUIRED[k], text, e.to_string()))
        };
        let parsed = (|| {
            let air_temp_c = number(1, AIR_TEMP_RANGE_C)?;
            let rh_pct = number(2, RELATIVE_HUMIDITY_RANGE_PCT)?;
            let wind_m_s = number(3, AIR_SPEED_RANGE_M_S)?;
            let shortwave_w_m2 = number(4, SHORTWAVE_RANGE_W_M2)?;
            let pressure_kpa = match pressure_idx.map(|i| fields[i]) {
                None | Some("") => None,
                Some(text) => Some(
                    text.parse::<f64>()
                        .map_err(|_| err("pressure_kpa", text, "not a number".into()))
                        .and_then(|v| {
                            PRESSURE_RANGE_KPA
                                .check(v)
                                .map_err(|e| err("pressure_kpa", text, e.to_string()))
                        })?,
                ),
            };
            Ok(WeatherRecord {
                time,
                air_temp_c,
                rh_pct,
                wind_m_s,
                shortwave_w_m2,
                pressure_kpa,
            })
        })();
        match parsed {
            Ok(r) => {
                last_time = Some(time);
                records.push(r);
            }
            Err(e) => errors.push(e),
        }
    }
    Ok(WeatherImport { records, errors })
}

/// The hourly rows of the engine for `records` at a site of altitude `altitude_m` \[m\] (used where
/// a row has no pressure).
///
/// # Errors
/// An altitude out of range.
pub fn to_hours(records: &[WeatherRecord], altitude_m: f64) -> Result<Vec<HourWeather>> {
    let p_site = pressure_from_altitude_kpa(altitude_m)?;
    Ok(records
        .iter()
        .map(|r| HourWeather {
            time: r.time,
            air_temp_c: r.air_temp_c,
            humidity: Humidity::RelativePct(r.rh_pct),
            wind_m_s: r.wind_m_s,
            light: HourLight::MeasuredGlobal(r.shortwave_w_m2),
            pressure_kpa: r.pressure_kpa.unwrap_or(p_site),
        })
        .collect())
}

/// Runs the canopy (or greenhouse) of `case` over the weather `records`, hour by hour.
///
/// # Errors
/// An invalid case; hours that fail keep their error in the series.
pub fn run_series(records: &[WeatherRecord], case: &SeriesCase) -> Result<HourlySeries> {
    run_hours(case, &to_hours(records, case.site.altitude_m)?)
}

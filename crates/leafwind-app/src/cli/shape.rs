//! `leafwind shape`: the geometry of leaf outlines as the wind sees it — area, perimeter, extent
//! along and across the wind, and the effective characteristic dimension for laminar exchange (at
//! one wind direction and over all directions), beside the 0.72 × width hand rule.

use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::ExitCode;

use anyhow::{Result, bail};
use clap::Args;
use leafwind_physics::case::LEAF_DIMENSION_RANGE_M;
use leafwind_physics::shape::{
    LeafShape, Outline, STRIPS_DEFAULT, SWEEP_STEPS_DEFAULT, ShapeMetrics, chord_profile,
    outline_from_csv_mm, sweep_effective_dimension,
};
use serde::Serialize;

use crate::output::finite;

/// Long description of the command (`leafwind shape --help`).
pub const LONG_ABOUT: &str = "\
Measures leaf outlines as the wind sees them.

Each OUTLINE.csv holds one closed outline: one point per line, `x,y` in millimetres, in order \
around the leaf (either way round); a header line such as `x_mm,y_mm` is optional; blank lines and \
lines starting with # are skipped; the last point joins the first.

Per file it prints, in SI units: area_m2, perimeter_m, length_along_wind_m, width_across_wind_m, \
effective_dimension_m (at --angle), hand_rule_dimension_m (0.72 × width, Campbell & Norman 1998, \
factor from memory), and effective_dimension_min_m / _max_m / _mean_m over wind directions 0–179° \
(1° steps), with the directions of the extremes; also the transfer-weighted mean over directions, \
the free-convection length A/P and the chords per line along the wind.

The effective dimension is the flat-plate length with the same mean laminar heat-transfer \
coefficient as the outline, each chord along the wind starting its own boundary layer: \
d_eff = (A / ∫ Σ √c dη)². Use it as the leaf size in `leafwind solve --leaf-size`.

Output: a text table per file; with --json, one JSON array holding one object per file in the \
order given; a file that could not be read has only `file`, `angle_deg` and `error`. Errors name \
the file and the row. Every file is tried; the exit status is 1 if any failed.";

/// Flags of `leafwind shape` (the long help, [`LONG_ABOUT`], is attached where the subcommand is
/// registered).
#[derive(Debug, Clone, Args)]
pub struct ShapeArgs {
    /// Outline files: CSV, `x,y` in mm, one point per line, header optional.
    #[arg(value_name = "OUTLINE.csv", required = true)]
    pub files: Vec<PathBuf>,
    /// Wind direction [°] from the file's +x axis (0 = wind blowing along +x), −360 to 360.
    #[arg(
        long,
        value_name = "DEG",
        default_value_t = 0.0,
        allow_negative_numbers = true
    )]
    pub angle: f64,
    /// Print one JSON array (one object per file) instead of text.
    #[arg(long)]
    pub json: bool,
}

/// The measured geometry of one outline, SI units in every name; non-finite values are `None`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ShapeRecord {
    /// Wind direction from the outline's +x axis \[°\].
    pub angle_deg: f64,
    /// One-sided area \[m²\].
    pub area_m2: Option<f64>,
    /// Perimeter \[m\].
    pub perimeter_m: Option<f64>,
    /// Extent along the wind \[m\].
    pub length_along_wind_m: Option<f64>,
    /// Extent across the wind \[m\].
    pub width_across_wind_m: Option<f64>,
    /// Effective dimension for laminar forced convection at `angle_deg` \[m\].
    pub effective_dimension_m: Option<f64>,
    /// Hand rule 0.72 × width across the wind \[m\].
    pub hand_rule_dimension_m: Option<f64>,
    /// Least effective dimension over wind directions 0–179° \[m\].
    pub effective_dimension_min_m: Option<f64>,
    /// Direction of the least \[°\].
    pub effective_dimension_min_angle_deg: Option<f64>,
    /// Greatest effective dimension over wind directions \[m\].
    pub effective_dimension_max_m: Option<f64>,
    /// Direction of the greatest \[°\].
    pub effective_dimension_max_angle_deg: Option<f64>,
    /// Mean effective dimension over wind directions \[m\].
    pub effective_dimension_mean_m: Option<f64>,
    /// Dimension with the direction-averaged laminar coefficient, (mean d^{−1/2})^{−2} \[m\].
    pub effective_dimension_transfer_mean_m: Option<f64>,
    /// Free-convection length A/P \[m\].
    pub free_convection_length_m: Option<f64>,
    /// Most chords on one line along the wind at `angle_deg` (1 for a convex outline).
    pub chords_per_line_max: usize,
    /// A caution about the result, if any (e.g. outside the engine's leaf-size range).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub warning: Option<String>,
}

impl ShapeRecord {
    /// Measures a shape for wind from `angle_deg` \[°\].
    ///
    /// # Errors
    /// An angle outside −360° to 360°.
    pub fn measure(shape: &LeafShape, angle_deg: f64) -> Result<Self> {
        if !(angle_deg.is_finite() && (-360.0..=360.0).contains(&angle_deg)) {
            bail!("the wind direction must be between -360° and 360°, got {angle_deg}°");
        }
        let angle = angle_deg.to_radians();
        let m = ShapeMetrics::of(shape, angle)?;
        let sweep = sweep_effective_dimension(shape, SWEEP_STEPS_DEFAULT)?;
        let chords = chord_profile(shape, angle, STRIPS_DEFAULT)?;
        let warning = (!LEAF_DIMENSION_RANGE_M.contains(m.effective_dimension_m)).then(|| {
            format!(
                "the effective dimension {:.4} m is outside the leaf sizes the energy balance accepts \
                 ({} to {} m); are the coordinates in millimetres?",
                m.effective_dimension_m, LEAF_DIMENSION_RANGE_M.min, LEAF_DIMENSION_RANGE_M.max
            )
        });
        Ok(Self {
            angle_deg,
            area_m2: finite(m.area_m2),
            perimeter_m: finite(m.perimeter_m),
            length_along_wind_m: finite(m.length_along_wind_m),
            width_across_wind_m: finite(m.width_across_wind_m),
            effective_dimension_m: finite(m.effective_dimension_m),
            hand_rule_dimension_m: finite(m.hand_rule_dimension_m),
            effective_dimension_min_m: finite(sweep.min_m),
            effective_dimension_min_angle_deg: finite(whole_degrees(sweep.min_angle_rad)),
            effective_dimension_max_m: finite(sweep.max_m),
            effective_dimension_max_angle_deg: finite(whole_degrees(sweep.max_angle_rad)),
            effective_dimension_mean_m: finite(sweep.mean_m),
            effective_dimension_transfer_mean_m: finite(sweep.transfer_mean_m),
            free_convection_length_m: finite(m.free_convection_length_m),
            chords_per_line_max: chords.max_chords_per_line(),
            warning,
        })
    }

    /// The (name, value) pairs printed by the text table, in order.
    fn rows(&self) -> Vec<(&'static str, Option<f64>)> {
        vec![
            ("area_m2", self.area_m2),
            ("perimeter_m", self.perimeter_m),
            ("length_along_wind_m", self.length_along_wind_m),
            ("width_across_wind_m", self.width_across_wind_m),
            ("effective_dimension_m", self.effective_dimension_m),
            ("hand_rule_dimension_m", self.hand_rule_dimension_m),
            ("effective_dimension_min_m", self.effective_dimension_min_m),
            ("effective_dimension_max_m", self.effective_dimension_max_m),
            (
                "effective_dimension_mean_m",
                self.effective_dimension_mean_m,
            ),
            (
                "effective_dimension_transfer_mean_m",
                self.effective_dimension_transfer_mean_m,
            ),
            ("free_convection_length_m", self.free_convection_length_m),
        ]
    }
}

/// One entry of the JSON array: the file, and its record or its error.
#[derive(Debug, Serialize)]
struct FileOutput<'a> {
    file: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    error: Option<&'a str>,
    #[serde(flatten)]
    record: Option<&'a ShapeRecord>,
    #[serde(skip_serializing_if = "Option::is_none")]
    angle_deg: Option<f64>,
}

/// Reads and measures one outline file.
///
/// # Errors
/// An unreadable file or an invalid outline; the message names the row and ends with the file.
pub fn measure_file(path: &Path, angle_deg: f64) -> Result<ShapeRecord> {
    let text = std::fs::read_to_string(path)
        .map_err(|e| anyhow::anyhow!("cannot read the outline: {e} (in {})", path.display()))?;
    let outline: Outline =
        outline_from_csv_mm(&text).map_err(|e| anyhow::anyhow!("{e} (in {})", path.display()))?;
    ShapeRecord::measure(&outline.into(), angle_deg)
        .map_err(|e| anyhow::anyhow!("{e:#} (in {})", path.display()))
}

/// Runs `leafwind shape`, writing results to `out` and each file's error to stderr.
///
/// # Errors
/// An invalid `--angle` or a failed write. Bad files are not errors here: they are reported and
/// turn the exit code to 1.
pub fn run(args: &ShapeArgs, out: &mut impl Write) -> Result<ExitCode> {
    run_to(args, out, &mut std::io::stderr().lock())
}

/// As [`run`], with the per-file error messages written to `err`.
///
/// # Errors
/// As [`run`].
pub fn run_to(args: &ShapeArgs, out: &mut impl Write, err: &mut impl Write) -> Result<ExitCode> {
    if !(args.angle.is_finite() && (-360.0..=360.0).contains(&args.angle)) {
        bail!(
            "--angle must be between -360 and 360 degrees, got {}",
            args.angle
        );
    }
    let results: Vec<(&PathBuf, Result<ShapeRecord>)> = args
        .files
        .iter()
        .map(|p| (p, measure_file(p, args.angle)))
        .collect();
    let mut failed = 0usize;
    let mut entries = Vec::with_capacity(results.len());
    let messages: Vec<Option<String>> = results
        .iter()
        .map(|(_, r)| r.as_ref().err().map(|e| format!("{e:#}")))
        .collect();
    for ((path, result), message) in results.iter().zip(&messages) {
        if let Some(m) = message {
            failed += 1;
            writeln!(err, "leafwind shape: {m}")?;
        }
        entries.push(FileOutput {
            file: path.display().to_string(),
            error: message.as_deref(),
            record: result.as_ref().ok(),
            angle_deg: result.is_err().then_some(args.angle),
        });
    }
    if args.json {
        crate::output::write_json(out, &entries)?;
    } else {
        for (k, entry) in entries.iter().enumerate() {
            if k > 0 {
                writeln!(out)?;
            }
            write_text(entry, out)?;
        }
    }
    Ok(if failed > 0 {
        ExitCode::FAILURE
    } else {
        ExitCode::SUCCESS
    })
}

/// A sampled sweep direction \[rad\] in degrees, without the round-off of the conversion (the
/// samples are 1° apart).
fn whole_degrees(angle_rad: f64) -> f64 {
    (angle_rad.to_degrees() * 1e9).round() / 1e9
}

/// `x` with six significant digits, or "—" for a missing value.
fn significant(x: Option<f64>) -> String {
    match x {
        None => "—".to_owned(),
        Some(0.0) => "0".to_owned(),
        Some(v) => {
            let decimals = (5 - v.abs().log10().floor() as i32).clamp(0, 12) as usize;
            format!("{v:.decimals$}")
        }
    }
}

fn write_text(entry: &FileOutput<'_>, out: &mut impl Write) -> Result<()> {
    let Some(r) = entry.record else {
        writeln!(
            out,
            "{}: error: {}",
            entry.file,
            entry.error.unwrap_or("unknown")
        )?;
        return Ok(());
    };
    writeln!(
        out,
        "{}  (wind at {}° from the file's x axis)",
        entry.file, r.angle_deg
    )?;
    let width = r.rows().iter().map(|(n, _)| n.len()).max().unwrap_or(0);
    for (name, value) in r.rows() {
        let at = match name {
            "effective_dimension_min_m" => r.effective_dimension_min_angle_deg,
            "effective_dimension_max_m" => r.effective_dimension_max_angle_deg,
            _ => None,
        };
        let note = at.map_or(String::new(), |a| format!("{a:.0}"));
        if note.is_empty() {
            writeln!(out, "  {name:<width$}  {}", significant(value))?;
        } else {
            writeln!(
                out,
                "  {name:<width$}  {}  (wind at {note}°)",
                significant(value)
            )?;
        }
    }
    writeln!(
        out,
        "  {:<width$}  {}",
        "chords_per_line_max", r.chords_per_line_max
    )?;
    if let Some(w) = &r.warning {
        writeln!(out, "  note: {w}")?;
    }
    Ok(())
}

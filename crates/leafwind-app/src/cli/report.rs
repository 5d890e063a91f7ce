//! `leafwind report`: the grower report of a scenario — one self-contained HTML file with its
//! plots, and the CSV tables behind them — written into a folder.

use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

use anyhow::{Result, anyhow};
use clap::Args;

// The document and units live under `gui/` for now (see `crate::report`).
use crate::report::{HTML_FILE, write_report};
use crate::{document::ScenarioDocument, units::UnitSystem};

/// Long help of `leafwind report`.
pub const LONG_ABOUT: &str = "Write the grower report of a scenario: report.html (plots embedded, \
opens without a network, prints on A4 or Letter) and the CSV tables behind each plot, into the \
folder given with --out. The report starts with the answer: the least fan air speed over the leaf \
that keeps it the margin below the crop's limit, or why air alone cannot.";

/// Arguments of `leafwind report`.
#[derive(Debug, Clone, Args)]
pub struct ReportArgs {
    /// Scenario file (RON), as saved by the window.
    #[arg(value_name = "SCENARIO.ron")]
    pub scenario: PathBuf,
    /// Folder to write the report into (created if missing; an earlier report there is replaced).
    #[arg(long, value_name = "DIR")]
    pub out: PathBuf,
    /// Show °F, ft/min and inches instead of °C, m/s and mm.
    #[arg(long)]
    pub imperial: bool,
}

/// Runs `leafwind report`, printing what was written to `out`.
///
/// # Errors
/// An unreadable or invalid scenario (with its path), or a file that could not be written.
pub fn run(args: &ReportArgs, out: &mut impl Write) -> Result<ExitCode> {
    let doc = ScenarioDocument::load(&args.scenario)
        .map_err(|e| anyhow!("{e} in {}", args.scenario.display()))?;
    let units = UnitSystem::from_imperial_flag(args.imperial);
    let files = write_report(&doc, &args.out, units)
        .map_err(|e| anyhow!("{e:#} (scenario {})", args.scenario.display()))?;
    writeln!(out, "{}", files.answer)?;
    writeln!(
        out,
        "Wrote {} ({:.0} kB) and {} CSV tables in {} ({:.2} s).",
        HTML_FILE,
        files.html_bytes as f64 / 1024.0,
        files.csv.len(),
        args.out.display(),
        files.elapsed.as_secs_f64()
    )?;
    Ok(ExitCode::SUCCESS)
}

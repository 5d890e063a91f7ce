//! Command-line entry: `leafwind` opens the window; `leafwind <subcommand>` runs headless.

use std::path::PathBuf;
use std::process::ExitCode;

use clap::{Parser, Subcommand};

pub mod canopy;
pub mod fans;
pub mod report;
pub mod shape;
pub mod solve;

/// Leaf temperature from the full energy balance, for greenhouse designers, crop breeders and
/// extension agents. With no subcommand, opens the desktop window.
#[derive(Debug, Parser)]
#[command(name = "leafwind", version, about, long_about = None)]
pub struct Cli {
    /// Headless subcommand; without one the window opens.
    #[command(subcommand)]
    pub command: Option<Command>,
    /// Scenario file (RON) to open in the window.
    #[arg(value_name = "SCENARIO")]
    pub scenario: Option<PathBuf>,
    /// Save a PNG screenshot of the window after the first complete frame, then exit.
    #[arg(long, value_name = "PATH")]
    pub screenshot: Option<PathBuf>,
}

/// The headless subcommands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Solve one leaf (or a CSV batch of leaves) and print the energy balance.
    Solve(solve::SolveArgs),
    /// Measure leaf outlines (CSV, mm): area, size along and across the wind, effective dimension.
    #[command(long_about = shape::LONG_ABOUT)]
    Shape(shape::ShapeArgs),
    /// Run a scenario's canopy: hottest leaf, least fan air speed and shade, design day, weather.
    Canopy(canopy::CanopyArgs),
    /// Estimate the air speed a circulation-fan layout gives at the crop, and size fans for a target.
    Fans(fans::FansArgs),
    /// Write the grower report (HTML with its plots, and CSV tables) of a scenario into a folder.
    #[command(long_about = report::LONG_ABOUT)]
    Report(report::ReportArgs),
}

/// Parses the arguments and runs; returns the process exit code.
#[must_use]
pub fn main() -> ExitCode {
    let cli = Cli::parse();
    match cli.command {
        Some(Command::Solve(args)) => report(solve::run(&args, &mut std::io::stdout().lock())),
        Some(Command::Shape(args)) => report(shape::run(&args, &mut std::io::stdout().lock())),
        Some(Command::Canopy(args)) => report(canopy::run(&args, &mut std::io::stdout().lock())),
        Some(Command::Fans(args)) => report(fans::run(&args, &mut std::io::stdout().lock())),
        Some(Command::Report(args)) => report(report::run(&args, &mut std::io::stdout().lock())),
        None => report(crate::gui::run_window(crate::gui::WindowOptions {
            scenario: cli.scenario,
            screenshot: cli.screenshot,
        })),
    }
}

/// Prints an error chain to stderr and maps it to an exit code.
fn report(result: anyhow::Result<ExitCode>) -> ExitCode {
    match result {
        Ok(code) => code,
        Err(e) => {
            eprintln!("leafwind: {e:#}");
            ExitCode::from(2)
        }
    }
}

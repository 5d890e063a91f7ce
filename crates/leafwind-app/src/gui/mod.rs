//! The desktop window.
//!
//! | module | what it owns |
//! |---|---|
//! | [`compute`] | derived results (never saved): leaf, sweep, map, boundary layer |
//! | [`worker`] | background jobs that keep the frame free |
//! | [`prefs`] | UI preferences persisted by eframe |
//! | [`commands`] | the command enum (menu text, tooltip) |
//! | [`fields`] | the numeric input widget with range check |
//! | [`panels`] | one panel per file |
//! | [`contour`] | marching squares for the map's limit lines |
//! | [`export`] | CSV of each plot's data |
//! | [`autosave`] | crash recovery: autosave of unsaved edits, restore offer |
//! | [`app`] | the app and its command handler |

use std::path::PathBuf;
use std::process::ExitCode;

use anyhow::anyhow;

pub mod app;
pub mod autosave;
pub mod commands;
pub mod compute;
pub mod contour;
pub mod export;
pub mod fields;
pub mod panels;
pub mod prefs;
pub mod worker;

pub use app::LeafwindApp;

/// How the window is started.
#[derive(Debug, Clone, Default)]
pub struct WindowOptions {
    /// Scenario to open.
    pub scenario: Option<PathBuf>,
    /// Save a screenshot after the first complete frame and exit.
    pub screenshot: Option<PathBuf>,
}

/// Opens the window and runs until it is closed.
///
/// # Errors
/// When the window cannot be created (no display), or the screenshot could not be saved.
pub fn run_window(options: WindowOptions) -> anyhow::Result<ExitCode> {
    // The hidden, headless self-test of crash recovery (tests/crash_recovery.rs).
    if let Some(code) = autosave::selftest_from_env() {
        return Ok(code);
    }
    let native = eframe::NativeOptions {
        viewport: egui::ViewportBuilder::default()
            .with_title("Leafwind")
            .with_inner_size([1400.0, 900.0])
            .with_min_inner_size([900.0, 600.0]),
        persist_window: options.screenshot.is_none(),
        ..Default::default()
    };
    // The app reports a failed screenshot here; read once the window has closed.
    let failure = std::sync::Arc::new(std::sync::Mutex::new(None::<String>));
    let slot = failure.clone();
    let WindowOptions {
        scenario,
        screenshot,
    } = options;
    eframe::run_native(
        "Leafwind",
        native,
        Box::new(move |cc| Ok(Box::new(LeafwindApp::new(cc, scenario, screenshot, slot)))),
    )
    .map_err(|e| anyhow!("could not open the window: {e}"))?;
    let failed = failure.lock().ok().and_then(|f| f.clone());
    match failed {
        Some(e) => Err(anyhow!(e)),
        None => Ok(ExitCode::SUCCESS),
    }
}

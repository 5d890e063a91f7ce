//! The desktop window.

use std::path::PathBuf;
use std::process::ExitCode;

use anyhow::anyhow;
use leafwind_physics::{LeafCase, LeafSolution, solve_leaf};

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
/// When the window cannot be created (no display).
pub fn run_window(options: WindowOptions) -> anyhow::Result<ExitCode> {
    let native = eframe::NativeOptions {
        viewport: egui::ViewportBuilder::default()
            .with_title("Leafwind")
            .with_inner_size([1280.0, 820.0]),
        ..Default::default()
    };
    let _ = options;
    eframe::run_native(
        "Leafwind",
        native,
        Box::new(|_cc| Ok(Box::new(MinimalApp::new()))),
    )
    .map_err(|e| anyhow!("could not open the window: {e}"))?;
    Ok(ExitCode::SUCCESS)
}

/// One solved leaf on screen.
struct MinimalApp {
    case: LeafCase,
    solution: Option<LeafSolution>,
}

impl MinimalApp {
    fn new() -> Self {
        let case = LeafCase::default();
        Self {
            solution: solve_leaf(&case).ok(),
            case,
        }
    }
}

impl eframe::App for MinimalApp {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        egui::CentralPanel::default().show(ui, |ui| {
            ui.heading("Leafwind");
            ui.label(format!("Air {:.1} °C", self.case.air.temp_c));
            if let Some(s) = &self.solution {
                ui.label(format!("Leaf {:.1} °C", s.leaf_temp_c));
            }
        });
    }
}

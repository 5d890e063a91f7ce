//! Everything the user can ask for from a menu, a button or a shortcut, as data.
//!
//! UI code returns [`Command`]s; the app applies them at the end of the frame
//! (`LeafwindApp::apply`). File dialogs are opened only there.

use std::path::PathBuf;

use crate::document::ScenarioDocument;

/// Which plot's data to export.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PlotKind {
    /// The energy budget of the leaf.
    Budget,
    /// The sweep over air speed.
    Sweep,
    /// The wind × size map.
    Map,
    /// The boundary-layer curves.
    Boundary,
}

impl PlotKind {
    /// A file name to suggest.
    #[must_use]
    pub fn default_file_name(self) -> &'static str {
        match self {
            Self::Budget => "leafwind-energy-budget.csv",
            Self::Sweep => "leafwind-sweep.csv",
            Self::Map => "leafwind-map.csv",
            Self::Boundary => "leafwind-boundary-layer.csv",
        }
    }
}

/// A user command.
#[derive(Debug, Clone, PartialEq)]
pub enum Command {
    /// Start a new scenario from the defaults.
    New,
    /// Open a scenario file (dialog, or the path field without a dialog service).
    Open,
    /// Open this file.
    OpenPath(PathBuf),
    /// Open one of the shipped examples (index into `document::EXAMPLES`).
    OpenExample(usize),
    /// Save to the current file (Save as… when there is none).
    Save,
    /// Save to a new file.
    SaveAs,
    /// Save to this file.
    SaveTo(PathBuf),
    /// Export a plot's data as CSV.
    ExportCsv(PlotKind),
    /// Export to this file.
    ExportCsvTo(PlotKind, PathBuf),
    /// Write the grower report (HTML with its plots, and CSV tables) into a folder.
    ExportReport,
    /// Write the grower report into this folder.
    ExportReportTo(PathBuf),
    /// Save the plots area as it is on screen to a PNG image.
    ExportViewPng,
    /// Save the plots area to this PNG file.
    ExportViewPngTo(PathBuf),
    /// Quit the app.
    Quit,
    /// Switch between SI and imperial units.
    ToggleUnits,
    /// Show the About and cautions window.
    About,
    /// Replace the document with an edited one (from the inputs panel).
    Edit(Box<ScenarioDocument>),
    /// Forget the recent-files list.
    ClearRecent,
}

impl Command {
    /// Menu text ("…" when a dialog follows).
    #[must_use]
    pub fn label(&self) -> String {
        match self {
            Self::New => "New".into(),
            Self::Open => "Open…".into(),
            Self::OpenPath(p) => p.display().to_string(),
            Self::OpenExample(i) => crate::document::EXAMPLES
                .get(*i)
                .map_or_else(|| "Example".into(), |e| e.0.to_owned()),
            Self::Save => "Save".into(),
            Self::SaveAs => "Save as…".into(),
            Self::SaveTo(p) => format!("Save to {}", p.display()),
            Self::ExportCsv(_) | Self::ExportCsvTo(..) => "Export CSV…".into(),
            Self::ExportReport | Self::ExportReportTo(_) => "Export report…".into(),
            Self::ExportViewPng | Self::ExportViewPngTo(_) => "Export view as PNG…".into(),
            Self::Quit => "Quit".into(),
            Self::ToggleUnits => "Imperial units (°F, ft/min, in)".into(),
            Self::About => "About and cautions…".into(),
            Self::Edit(_) => "Edit".into(),
            Self::ClearRecent => "Clear recent files".into(),
        }
    }

    /// Tooltip.
    #[must_use]
    pub fn tooltip(&self) -> &'static str {
        match self {
            Self::New => {
                "Start a new scenario from the default inputs (asks first if there are unsaved edits)."
            }
            Self::Open => "Open a scenario file (.ron).",
            Self::OpenPath(_) => "Open this recent scenario file.",
            Self::OpenExample(_) => "Open an invented example scenario shipped with Leafwind.",
            Self::Save => "Save the scenario to its file.",
            Self::SaveAs => "Save the scenario to a new file.",
            Self::SaveTo(_) => "Save the scenario to this file.",
            Self::ExportCsv(_) | Self::ExportCsvTo(..) => {
                "Write this plot's data to a CSV file, in the units shown."
            }
            Self::ExportReport | Self::ExportReportTo(_) => {
                "Write a printable report for a grower (one HTML file with its plots, and the CSV tables behind them) into a folder, in the units shown."
            }
            Self::ExportViewPng | Self::ExportViewPngTo(_) => {
                "Save the plots area as it is on screen (the current tab) to a PNG image."
            }
            Self::Quit => "Close Leafwind (asks first if there are unsaved edits).",
            Self::ToggleUnits => {
                "Show every field, axis and export in °F, ft/min and inches instead of °C, m/s and mm."
            }
            Self::About => "What Leafwind computes, its sources and its limits.",
            Self::Edit(_) => "Change an input.",
            Self::ClearRecent => "Empty the list of recently used files.",
        }
    }

    /// Its keyboard shortcut, if any.
    #[must_use]
    pub fn shortcut(&self) -> Option<egui::KeyboardShortcut> {
        use egui::{Key, KeyboardShortcut, Modifiers};
        match self {
            Self::New => Some(KeyboardShortcut::new(Modifiers::COMMAND, Key::N)),
            Self::Open => Some(KeyboardShortcut::new(Modifiers::COMMAND, Key::O)),
            Self::Save => Some(KeyboardShortcut::new(Modifiers::COMMAND, Key::S)),
            Self::SaveAs => Some(KeyboardShortcut::new(
                Modifiers::COMMAND | Modifiers::SHIFT,
                Key::S,
            )),
            Self::Quit => Some(KeyboardShortcut::new(Modifiers::COMMAND, Key::Q)),
            _ => None,
        }
    }

    /// The commands that have shortcuts, the most specific first.
    #[must_use]
    pub fn with_shortcuts() -> [Command; 5] {
        [Self::SaveAs, Self::Save, Self::Open, Self::New, Self::Quit]
    }

    /// Whether it would throw away unsaved edits (and so needs a confirmation).
    #[must_use]
    pub fn discards_document(&self) -> bool {
        matches!(
            self,
            Self::New | Self::Open | Self::OpenPath(_) | Self::OpenExample(_) | Self::Quit
        )
    }
}

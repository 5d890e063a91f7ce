//! A file chooser for panels that read or write their own files (an outline, a scenario to
//! compare, a table): the system dialog when one answers, else an inline path field, as the app's
//! own file handling does.

use std::path::PathBuf;
use std::time::{Duration, Instant};

use egui::{TextEdit, Ui};

use crate::gui::app::DialogMode;
use crate::gui::fields::name_widget;

/// Open an existing file or save a new one.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FileAction {
    /// Pick an existing file.
    Open,
    /// Choose where to write.
    Save,
}

/// One file chooser: its filter, the path field when no dialog answers.
#[derive(Debug, Clone)]
pub struct FilePrompt {
    /// Accessible name of the path field and the start of its button's text.
    pub name: &'static str,
    /// Open or save.
    pub action: FileAction,
    /// Filter name and extensions for the system dialog.
    pub filter: (&'static str, &'static [&'static str]),
    /// File name suggested when saving.
    pub suggested: &'static str,
    /// The path field is shown (no dialog service, or asked for).
    pub field_open: bool,
    /// The text of the path field.
    pub text: String,
    /// The system dialog did not answer once: use the path field from now on.
    no_dialog: bool,
}

impl FilePrompt {
    /// A chooser named `name` (e.g. "Outline file").
    #[must_use]
    pub fn new(
        name: &'static str,
        action: FileAction,
        filter: (&'static str, &'static [&'static str]),
        suggested: &'static str,
    ) -> Self {
        Self {
            name,
            action,
            filter,
            suggested,
            field_open: false,
            text: if action == FileAction::Save {
                suggested.to_owned()
            } else {
                String::new()
            },
            no_dialog: false,
        }
    }

    /// Asks for a file: the system dialog's answer, or `None` (then the path field is shown, or
    /// the person cancelled). Call from the end of the panel's frame, never mid-drawing.
    pub fn ask(&mut self, dialogs: DialogMode) -> Option<PathBuf> {
        if dialogs == DialogMode::Native && !self.no_dialog {
            let t0 = Instant::now();
            let d = rfd::FileDialog::new().add_filter(self.filter.0, self.filter.1);
            let picked = match self.action {
                FileAction::Open => d.pick_file(),
                FileAction::Save => d.set_file_name(self.suggested).save_file(),
            };
            if picked.is_some() {
                return picked;
            }
            // A person who cancels takes longer than this; an instant None means no dialog service.
            if t0.elapsed() > Duration::from_millis(300) {
                return None;
            }
            self.no_dialog = true;
        }
        self.field_open = true;
        None
    }

    /// Draws the path field when it is open; returns the path when its button is pressed.
    pub fn field_ui(&mut self, ui: &mut Ui, button: &str) -> Option<PathBuf> {
        if !self.field_open {
            return None;
        }
        let mut chosen = None;
        ui.horizontal_wrapped(|ui| {
            ui.label(format!("{}:", self.name))
                .on_hover_text("No file dialog is available here: type the file's path.");
            let r = ui.add(
                TextEdit::singleline(&mut self.text)
                    .desired_width(220.0)
                    .hint_text("/path/to/file"),
            );
            name_widget(ui, &r, self.name);
            let enter = r.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
            if ui.button(button).clicked() || enter {
                let t = self.text.trim();
                if !t.is_empty() {
                    chosen = Some(PathBuf::from(t));
                }
            }
            if ui.small_button("Cancel").clicked() {
                self.field_open = false;
            }
        });
        if chosen.is_some() {
            self.field_open = false;
        }
        chosen
    }
}

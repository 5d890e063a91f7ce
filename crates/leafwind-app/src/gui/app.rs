//! The app: the document, the derived results, the preferences, the panels, and the command
//! handler that applies what the panels ask for at the end of each frame.

use std::path::{Path, PathBuf};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

use egui::{Align, Color32, Layout, Modal, RichText, TextEdit, Ui, ViewportCommand};

use super::autosave::{Autosave, AutosaveFile};
use super::commands::{Command, PlotKind};
use super::compute::{
    BoundaryInput, BoundaryResult, LeafResult, MapInput, MapResult, SweepInput, SweepResult,
    compute_boundary, compute_map, compute_sweep,
};
use super::export;
use super::panels::about::{AboutPanel, CAUTIONS};
use super::panels::boundary::BoundaryPanel;
use super::panels::canopy::{CanopyInput, CanopyPanel, CanopyView, compute_canopy};
use super::panels::compare::ComparePanel;
use super::panels::fans::{FansInput, FansPanel, FansView, compute_fans};
use super::panels::inputs::InputsPanel;
use super::panels::map::MapPanel;
use super::panels::result::ResultPanel;
use super::panels::shape::ShapePanel;
use super::panels::sweep::SweepPanel;
use super::prefs::{PREFS_KEY, PlotTab, UiPrefs};
use super::worker::Job;
use crate::document::{EXAMPLES, ScenarioDocument, first_example};
use crate::file_safety::FileStamp;

/// How file names are asked for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum DialogMode {
    /// The system file dialog (rfd), falling back to the path field when none answers.
    Native,
    /// Always the path field (no dialog service, and in tests).
    PathField,
}

/// Where a screenshot callback leaves the outcome of saving its PNG.
type PngSlot = Arc<Mutex<Option<Result<(), String>>>>;

/// What a path typed in the path field is for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PathPurpose {
    /// Open a scenario.
    Open,
    /// Save the scenario.
    SaveAs,
    /// Export a plot's data.
    Export(PlotKind),
    /// Write the grower report into a folder.
    Report,
    /// Save the plots area as a PNG image.
    ViewPng,
}

impl PathPurpose {
    fn title(self) -> &'static str {
        match self {
            Self::Open => "Open scenario",
            Self::SaveAs => "Save scenario as",
            Self::Export(_) => "Export CSV",
            Self::Report => "Export report into a folder",
            Self::ViewPng => "Export view as PNG",
        }
    }

    fn action(self) -> &'static str {
        match self {
            Self::Open => "Open",
            Self::SaveAs => "Save",
            Self::Export(_) | Self::Report | Self::ViewPng => "Export",
        }
    }
}

/// The path field shown when no file dialog is available.
#[derive(Debug, Clone)]
pub struct PathPrompt {
    /// What it is for.
    pub purpose: PathPurpose,
    /// The path typed so far.
    pub text: String,
}

/// A message in the status line (errors stay until dismissed or replaced).
#[derive(Debug, Clone, PartialEq)]
pub struct Message {
    /// The text.
    pub text: String,
    /// Whether it reports a failure.
    pub error: bool,
}

/// The screenshot-and-exit mode.
struct ScreenshotState {
    path: PathBuf,
    /// Before the window's screenshot, the plots area through "Export view as PNG" to this file
    /// (`LEAFWIND_SCREENSHOT_VIEW_PNG`; CI checks the export path with it).
    view_png: Option<PathBuf>,
    started: Instant,
    ready_frames: u32,
    requested: bool,
    done: Arc<Mutex<Option<Result<(), String>>>>,
}

/// The Leafwind window.
pub struct LeafwindApp {
    doc: ScenarioDocument,
    saved: ScenarioDocument,
    path: Option<PathBuf>,
    prefs: UiPrefs,
    result: Option<LeafResult>,
    solved_for: Option<ScenarioDocument>,
    input_error: Option<String>,
    sweep: Job<SweepInput, SweepResult>,
    map: Job<MapInput, MapResult>,
    map_preview: Job<MapInput, MapResult>,
    boundary: Job<BoundaryInput, BoundaryResult>,
    canopy: Job<CanopyInput, crate::canopy_scenario::CanopyRun>,
    fans: Job<FansInput, crate::fans_scenario::FansRun>,
    inputs_panel: InputsPanel,
    result_panel: ResultPanel,
    sweep_panel: SweepPanel,
    map_panel: MapPanel,
    boundary_panel: BoundaryPanel,
    canopy_panel: CanopyPanel,
    fans_panel: FansPanel,
    shape_panel: ShapePanel,
    compare_panel: ComparePanel,
    about_panel: AboutPanel,
    commands: Vec<Command>,
    confirm: Option<Command>,
    path_prompt: Option<PathPrompt>,
    /// Where the plots area was drawn last frame (for "Export view as PNG…").
    view_rect: Option<egui::Rect>,
    /// A PNG export waiting for its screenshot: the file and the result slot.
    view_png: Option<(PathBuf, PngSlot)>,
    message: Option<Message>,
    dialogs: DialogMode,
    screenshot: Option<ScreenshotState>,
    allow_close: bool,
    quit_requested: bool,
    shown_title: String,
    frame_ms: f64,
    exit_code: Arc<Mutex<Option<String>>>,
    /// Crash recovery (off in tests unless asked for, and for screenshots).
    autosave: Option<Autosave>,
    /// An autosave from an earlier run, offered for restoring.
    restore_offer: Option<AutosaveFile>,
    /// What the document's file held when it was opened or last saved.
    stamp: Option<FileStamp>,
    /// A save waiting for "Overwrite" because the file changed on disk.
    overwrite_confirm: Option<PathBuf>,
    /// When the next autosave step is due, while one is pending.
    autosave_due: Option<Duration>,
}

impl LeafwindApp {
    fn with(doc: ScenarioDocument, prefs: UiPrefs, inline: bool, dialogs: DialogMode) -> Self {
        Self {
            saved: doc.clone(),
            doc,
            path: None,
            prefs,
            result: None,
            solved_for: None,
            input_error: None,
            sweep: Job::new(compute_sweep, inline),
            map: Job::new(compute_map, inline),
            map_preview: Job::new(compute_map, inline),
            boundary: Job::new(compute_boundary, inline),
            canopy: Job::new(compute_canopy, inline),
            fans: Job::new(compute_fans, inline),
            inputs_panel: InputsPanel::default(),
            result_panel: ResultPanel::default(),
            sweep_panel: SweepPanel::default(),
            map_panel: MapPanel::default(),
            boundary_panel: BoundaryPanel::default(),
            canopy_panel: CanopyPanel::default(),
            fans_panel: FansPanel::default(),
            shape_panel: ShapePanel::new(inline),
            compare_panel: ComparePanel::new(inline),
            about_panel: AboutPanel::default(),
            commands: Vec::new(),
            confirm: None,
            path_prompt: None,
            view_rect: None,
            view_png: None,
            message: None,
            dialogs,
            screenshot: None,
            allow_close: false,
            quit_requested: false,
            shown_title: String::new(),
            frame_ms: 0.0,
            exit_code: Arc::new(Mutex::new(None)),
            autosave: None,
            restore_offer: None,
            stamp: None,
            overwrite_confirm: None,
            autosave_due: None,
        }
    }

    /// The app for tests: no eframe, jobs run inline, the path field instead of file dialogs.
    #[must_use]
    pub fn new_for_test(doc: ScenarioDocument) -> Self {
        let mut app = Self::with(doc, UiPrefs::default(), true, DialogMode::PathField);
        app.refresh_leaf();
        app
    }

    /// The app without eframe but with background jobs on threads, as in the window (benches).
    #[must_use]
    pub fn new_headless(doc: ScenarioDocument) -> Self {
        let mut app = Self::with(doc, UiPrefs::default(), false, DialogMode::PathField);
        app.refresh_leaf();
        app
    }

    /// The app for the real window.
    #[must_use]
    pub fn new(
        cc: &eframe::CreationContext<'_>,
        scenario: Option<PathBuf>,
        screenshot: Option<PathBuf>,
        exit_error: Arc<Mutex<Option<String>>>,
    ) -> Self {
        let stored: Option<UiPrefs> = cc.storage.and_then(|s| eframe::get_value(s, PREFS_KEY));
        // A screenshot shows the default layout, whatever was stored; the environment variable
        // LEAFWIND_SCREENSHOT_TAB (sweep, map, boundary) and LEAFWIND_SCREENSHOT_UNITS=imperial
        // pick what it shows (for documentation and CI).
        let prefs = if screenshot.is_some() {
            let mut p = UiPrefs::default();
            p.layout.tab = match std::env::var("LEAFWIND_SCREENSHOT_TAB").as_deref() {
                Ok("map") => PlotTab::Map,
                Ok("boundary") => PlotTab::BoundaryLayer,
                Ok("canopy") => PlotTab::Canopy,
                Ok("fans") => PlotTab::Fans,
                Ok("shape") => PlotTab::Shape,
                Ok("compare") => PlotTab::Compare,
                _ => PlotTab::Sweep,
            };
            if std::env::var("LEAFWIND_SCREENSHOT_UNITS").as_deref() == Ok("imperial") {
                p.units = crate::units::UnitSystem::Imperial;
            }
            p
        } else {
            stored.unwrap_or_default()
        };
        let mut app = Self::with(first_example(), prefs, false, DialogMode::Native);
        let to_open = scenario.or_else(|| {
            if app.prefs.started_before {
                app.prefs.recent_files.first().cloned()
            } else {
                None
            }
        });
        if let Some(p) = to_open {
            app.open_path(&p);
        }
        app.prefs.started_before = true;
        app.exit_code = exit_error;
        app.screenshot = screenshot.map(|path| ScreenshotState {
            path,
            view_png: std::env::var_os("LEAFWIND_SCREENSHOT_VIEW_PNG").map(PathBuf::from),
            started: Instant::now(),
            ready_frames: 0,
            requested: false,
            done: Arc::new(Mutex::new(None)),
        });
        if app.screenshot.is_some() && app.prefs.layout.tab == PlotTab::Compare {
            // Something to compare on the screenshot: the scenario, a smaller and a larger leaf.
            let doc = app.doc.clone();
            app.compare_panel.add_copy(&doc, Some("As opened"));
            for (name, factor) in [("Leaf half the size", 0.5), ("Leaf twice the size", 2.0)] {
                let mut d = doc.clone();
                d.case.leaf.dimension_m = (d.case.leaf.dimension_m * factor).clamp(0.001, 1.0);
                d.case.leaf.free_convection_length_m = None;
                app.compare_panel.add_copy(&d, Some(name));
            }
        }
        if app.screenshot.is_none()
            && let Some(dir) = super::autosave::data_dir()
        {
            app = app.with_autosave(dir, super::autosave::AUTOSAVE_DELAY);
        }
        app.refresh_leaf();
        app
    }

    // ----- accessors (tests, status) -----

    /// The document being edited.
    #[must_use]
    pub fn document(&self) -> &ScenarioDocument {
        &self.doc
    }

    /// The last valid single-leaf result.
    #[must_use]
    pub fn result(&self) -> Option<&LeafResult> {
        self.result.as_ref()
    }

    /// The reason the inputs cannot be solved, if any.
    #[must_use]
    pub fn input_error(&self) -> Option<&str> {
        self.input_error.as_deref()
    }

    /// Whether there are unsaved edits.
    #[must_use]
    pub fn is_dirty(&self) -> bool {
        self.doc != self.saved
    }

    /// The window title, with "*" for unsaved edits.
    #[must_use]
    pub fn title(&self) -> String {
        let file = self
            .path
            .as_ref()
            .and_then(|p| p.file_name())
            .map(|f| format!(" ({})", f.to_string_lossy()))
            .unwrap_or_default();
        format!(
            "{}{}{file} — Leafwind",
            if self.is_dirty() { "*" } else { "" },
            self.doc.title
        )
    }

    /// The status message.
    #[must_use]
    pub fn message(&self) -> Option<&Message> {
        self.message.as_ref()
    }

    /// The preferences.
    #[must_use]
    pub fn prefs(&self) -> &UiPrefs {
        &self.prefs
    }

    /// The file of the document, if any.
    #[must_use]
    pub fn path(&self) -> Option<&Path> {
        self.path.as_deref()
    }

    /// Whether the app asked to quit.
    #[must_use]
    pub fn quit_requested(&self) -> bool {
        self.quit_requested
    }

    /// Whether a confirmation is waiting.
    #[must_use]
    pub fn confirmation_pending(&self) -> bool {
        self.confirm.is_some()
    }

    /// Whether every background result is for the current inputs.
    #[must_use]
    pub fn results_current(&self) -> bool {
        self.sweep.is_current() && self.map.is_current() && self.boundary.is_current()
    }

    /// The last valid canopy run (the "Canopy & day" tab).
    #[must_use]
    pub fn canopy_run(&self) -> Option<&crate::canopy_scenario::CanopyRun> {
        self.canopy.result()
    }

    /// The last valid fans run (the "Fans & night" tab).
    #[must_use]
    pub fn fans_run(&self) -> Option<&crate::fans_scenario::FansRun> {
        self.fans.result()
    }

    /// The leaf-shape view (tests).
    #[must_use]
    pub fn shape_panel(&self) -> &ShapePanel {
        &self.shape_panel
    }

    /// The leaf-shape view, to import an outline as its path field would (tests).
    pub fn shape_panel_mut(&mut self) -> &mut ShapePanel {
        &mut self.shape_panel
    }

    /// The compare view (tests).
    #[must_use]
    pub fn compare_panel(&self) -> &ComparePanel {
        &self.compare_panel
    }

    /// The compare view, to add entries as its buttons would (tests, screenshots).
    pub fn compare_panel_mut(&mut self) -> &mut ComparePanel {
        &mut self.compare_panel
    }

    /// Queues a command, as a menu would (for tests and shortcuts).
    pub fn push_command(&mut self, c: Command) {
        self.commands.push(c);
    }

    /// Shows a plot tab (as clicking it would).
    pub fn set_tab(&mut self, tab: PlotTab) {
        self.prefs.layout.tab = tab;
    }

    /// The mean frame time \[ms\] (UI work only).
    #[must_use]
    pub fn frame_ms(&self) -> f64 {
        self.frame_ms
    }

    // ----- crash recovery and file safety -----

    /// Turns on the autosave into `dir`, `delay` after the last change, and offers to restore an
    /// autosave an earlier run left there (one that cannot be read is moved aside and reported).
    #[must_use]
    pub fn with_autosave(mut self, dir: PathBuf, delay: Duration) -> Self {
        let a = Autosave::new(dir, delay);
        match a.find() {
            Some(Ok(file)) => self.restore_offer = Some(file),
            Some(Err(e)) => {
                let kept = a.keep_unreadable().unwrap_or_else(|_| a.path());
                self.fail(&format!(
                    "An autosave was found but could not be read ({e}); it is kept as {}",
                    kept.display()
                ));
            }
            None => {}
        }
        self.autosave = Some(a);
        self
    }

    /// Whether the restore offer (Restore / Discard) is shown.
    #[must_use]
    pub fn restore_offered(&self) -> bool {
        self.restore_offer.is_some()
    }

    /// Whether a save waits for "Overwrite" because the file changed on disk.
    #[must_use]
    pub fn overwrite_pending(&self) -> bool {
        self.overwrite_confirm.is_some()
    }

    /// Whether the autosave file holds the current unsaved edits.
    #[must_use]
    pub fn autosave_written(&self) -> bool {
        self.is_dirty()
            && self
                .autosave
                .as_ref()
                .is_some_and(|a| a.path().exists() && !self.autosave_pending())
    }

    /// The autosave file, when the autosave is on.
    #[must_use]
    pub fn autosave_path(&self) -> Option<PathBuf> {
        self.autosave.as_ref().map(Autosave::path)
    }

    fn autosave_pending(&self) -> bool {
        self.autosave_due.is_some()
    }

    /// The autosave step of a frame (not while the restore offer waits for an answer).
    fn autosave_step(&mut self, ctx: &egui::Context) {
        if self.restore_offer.is_some() {
            return;
        }
        let dirty = self.is_dirty();
        let Some(a) = &mut self.autosave else {
            return;
        };
        match a.tick(&self.doc, dirty, self.path.as_deref(), Instant::now()) {
            Ok(due) => {
                self.autosave_due = due;
                if let Some(wait) = due {
                    ctx.request_repaint_after(wait);
                }
            }
            Err(e) => {
                self.autosave_due = None;
                self.fail(&e);
            }
        }
    }

    /// Restores the offered autosave: its edits become the document, unsaved, for the file they
    /// belonged to.
    fn restore_autosave(&mut self, file: AutosaveFile) {
        let mut note = format!("Restored the unsaved edits autosaved {}.", file.age_text());
        let loaded = file.source.as_deref().map(ScenarioDocument::load_stamped);
        match loaded {
            Some(Ok(l)) => {
                self.saved = l.doc;
                self.stamp = Some(l.stamp);
            }
            Some(Err(e)) => {
                self.saved = ScenarioDocument::default();
                self.stamp = None;
                note.push_str(&format!(" Their file could not be read: {e}"));
            }
            None => {
                self.saved = ScenarioDocument::default();
                self.stamp = None;
            }
        }
        self.path = file.source;
        self.doc = file.document;
        self.note(&note);
    }

    // ----- results -----

    /// Re-solves the single leaf when the document changed since the last solve.
    fn refresh_leaf(&mut self) {
        if self.solved_for.as_ref() == Some(&self.doc) {
            return;
        }
        let extras = self.doc.validate_extras().map_err(|e| e.to_string());
        let case = self.doc.case.validate().map_err(|e| e.to_string());
        match case.and(extras) {
            Ok(()) => match LeafResult::solve(&self.doc) {
                Ok(r) => {
                    self.result = Some(r);
                    self.input_error = None;
                }
                Err(e) => self.input_error = Some(e),
            },
            Err(e) => self.input_error = Some(e),
        }
        self.solved_for = Some(self.doc.clone());
    }

    /// Submits the background jobs for the current inputs (only valid ones).
    fn refresh_jobs(&mut self, ctx: &egui::Context) {
        self.sweep.poll(ctx);
        self.map.poll(ctx);
        self.map_preview.poll(ctx);
        self.boundary.poll(ctx);
        self.canopy.poll(ctx);
        self.fans.poll(ctx);
        if self.input_error.is_none() {
            self.sweep.submit(SweepInput::of(&self.doc), ctx);
            let map = MapInput::of(&self.doc);
            // The coarse preview arrives in a few milliseconds while the full map computes.
            self.map_preview
                .submit(map.clone().with_cells(super::compute::PREVIEW_CELLS), ctx);
            self.map.submit(map, ctx);
            self.boundary.submit(self.doc.case, ctx);
            if let Some(c) = CanopyInput::of(&self.doc, self.path.as_deref()) {
                self.canopy.submit(c, ctx);
            }
            if let Some(f) = FansInput::of(&self.doc, self.path.as_deref()) {
                self.fans.submit(f, ctx);
            }
        }
    }

    fn job_status<I, O>(job: &Job<I, O>, stale_inputs: bool) -> Option<String>
    where
        I: Clone + PartialEq + Send + 'static,
        O: Send + 'static,
    {
        if let Some(e) = job.error() {
            Some(format!(
                "⚠ Could not update: {e}. Showing the last valid result."
            ))
        } else if stale_inputs {
            Some("⚠ Inputs invalid: showing the last valid result.".to_owned())
        } else if job.is_busy() {
            Some("Updating…".to_owned())
        } else {
            None
        }
    }

    // ----- the frame -----

    /// One frame of the whole window inside `ui` (used by eframe and by the tests).
    pub fn frame(&mut self, ui: &mut Ui) {
        let t0 = Instant::now();
        let ctx = ui.ctx().clone();
        self.refresh_leaf();
        self.refresh_jobs(&ctx);
        self.handle_close_request(&ctx);
        if self.confirm.is_none()
            && self.path_prompt.is_none()
            && self.restore_offer.is_none()
            && self.overwrite_confirm.is_none()
        {
            for c in Command::with_shortcuts() {
                if let Some(s) = c.shortcut()
                    && ctx.input_mut(|i| i.consume_shortcut(&s))
                {
                    self.commands.push(c);
                }
            }
        }
        self.draw(ui);
        self.draw_modals(&ctx);
        let commands = std::mem::take(&mut self.commands);
        if !commands.is_empty() {
            // Show the outcome (a dialog, a new document) in the next frame without waiting.
            ctx.request_repaint();
        }
        for c in commands {
            self.apply(c, &ctx);
        }
        // Edits of this frame are solved at once, so the result never lags a frame.
        self.refresh_leaf();
        self.refresh_jobs(&ctx);
        self.autosave_step(&ctx);
        let title = self.title();
        if title != self.shown_title {
            ctx.send_viewport_cmd(ViewportCommand::Title(title.clone()));
            self.shown_title = title;
        }
        self.screenshot_step(&ctx);
        let ms = t0.elapsed().as_secs_f64() * 1e3;
        self.frame_ms = if self.frame_ms == 0.0 {
            ms
        } else {
            0.9 * self.frame_ms + 0.1 * ms
        };
    }

    fn draw(&mut self, ui: &mut Ui) {
        let units = self.prefs.units;
        egui::Panel::top("menu-bar").show(ui, |ui| self.menu_bar(ui));
        egui::Panel::bottom("footer").show(ui, |ui| self.footer(ui));
        let inputs_w = self.prefs.layout.inputs_width;
        let result_w = self.prefs.layout.result_width;
        let r = egui::Panel::left("inputs")
            .resizable(true)
            .default_size(inputs_w)
            .size_range(300.0..=560.0)
            .show(ui, |ui| {
                ui.add_space(4.0);
                ui.heading("Inputs");
                if let Some(c) = self.inputs_panel.ui(ui, &self.doc, units) {
                    self.commands.push(c);
                }
            });
        self.prefs.layout.inputs_width = r.response.rect.width();
        let stale = self.input_error.clone();
        // The canopy and fans tabs show their own inputs, answers and plots and need the width:
        // the single-leaf result steps aside there.
        let own_results = match self.prefs.layout.tab {
            PlotTab::Canopy => self.doc.canopy.is_some(),
            PlotTab::Fans => self.doc.fans.is_some(),
            _ => false,
        };
        if !own_results {
            let r = egui::Panel::right("result")
                .resizable(true)
                .default_size(result_w)
                .size_range(320.0..=600.0)
                .show(ui, |ui| {
                    ui.add_space(4.0);
                    ui.heading("Leaf result");
                    if let Some(c) =
                        self.result_panel
                            .ui(ui, self.result.as_ref(), stale.as_deref(), units)
                    {
                        self.commands.push(c);
                    }
                });
            self.prefs.layout.result_width = r.response.rect.width();
        }
        let central = egui::CentralPanel::default().show(ui, |ui| self.central(ui));
        self.view_rect = Some(central.response.rect);
        self.view_png_step(ui.ctx());
    }

    fn menu_bar(&mut self, ui: &mut Ui) {
        let mut pushed = Vec::new();
        egui::MenuBar::new().ui(ui, |ui| {
            fn item(ui: &mut Ui, pushed: &mut Vec<Command>, c: Command) {
                let mut button = egui::Button::new(c.label());
                if let Some(s) = c.shortcut() {
                    button = button.shortcut_text(ui.ctx().format_shortcut(&s));
                }
                if ui.add(button).on_hover_text(c.tooltip()).clicked() {
                    pushed.push(c);
                }
            }
            ui.menu_button("File", |ui| {
                item(ui, &mut pushed, Command::New);
                item(ui, &mut pushed, Command::Open);
                ui.menu_button("Open recent", |ui| {
                    if self.prefs.recent_files.is_empty() {
                        ui.label(RichText::new("No recent files").weak());
                    }
                    for p in self.prefs.recent_files.clone() {
                        item(ui, &mut pushed, Command::OpenPath(p));
                    }
                    ui.separator();
                    item(ui, &mut pushed, Command::ClearRecent);
                });
                ui.menu_button("Examples", |ui| {
                    for (i, (_, text)) in EXAMPLES.iter().enumerate() {
                        let title = ScenarioDocument::from_ron(text)
                            .map_or_else(|_| EXAMPLES[i].0.to_owned(), |d| d.title);
                        let c = Command::OpenExample(i);
                        if ui.button(title).on_hover_text(c.tooltip()).clicked() {
                            pushed.push(c);
                        }
                    }
                });
                ui.separator();
                item(ui, &mut pushed, Command::Save);
                item(ui, &mut pushed, Command::SaveAs);
                ui.separator();
                item(ui, &mut pushed, Command::ExportReport);
                item(ui, &mut pushed, Command::ExportViewPng);
                ui.separator();
                item(ui, &mut pushed, Command::Quit);
            });
            ui.menu_button("View", |ui| {
                let mut imperial = self.prefs.units == crate::units::UnitSystem::Imperial;
                let c = Command::ToggleUnits;
                if ui
                    .checkbox(&mut imperial, c.label())
                    .on_hover_text(c.tooltip())
                    .changed()
                {
                    pushed.push(c);
                }
            });
            ui.menu_button("Help", |ui| item(ui, &mut pushed, Command::About));
            ui.with_layout(Layout::right_to_left(Align::Center), |ui| {
                let marker = if self.is_dirty() { "*" } else { "" };
                let state = if self.is_dirty() {
                    "The scenario has unsaved edits (*)."
                } else {
                    "The scenario is saved."
                };
                let notes = if self.doc.notes.is_empty() {
                    String::new()
                } else {
                    format!("\n\n{}", self.doc.notes)
                };
                ui.label(RichText::new(format!("{marker}{}", self.doc.title)).strong())
                    .on_hover_text(format!("{state}{notes}"));
            });
        });
        self.commands.extend(pushed);
    }

    fn footer(&mut self, ui: &mut Ui) {
        let map_ms = self.map.last_duration().map_or_else(String::new, |d| {
            format!(" · map {:.0} ms", d.as_secs_f64() * 1e3)
        });
        let status = format!(
            "{} · UI frame {:.1} ms{map_ms}",
            self.prefs.units.name(),
            self.frame_ms
        );
        ui.with_layout(Layout::right_to_left(Align::Center), |ui| {
            ui.label(RichText::new(status).small().weak());
            ui.separator();
            ui.with_layout(Layout::left_to_right(Align::Center), |ui| {
                let mut text = CAUTIONS.to_owned();
                if let Some(m) = &self.message
                    && !m.error
                {
                    text = format!("{} — {CAUTIONS}", m.text);
                }
                // Truncated only in a narrow window; the full text is then on hover.
                ui.add(egui::Label::new(RichText::new(text).small()).truncate());
            });
        });
    }

    fn central(&mut self, ui: &mut Ui) {
        let units = self.prefs.units;
        if let Some(m) = self.message.clone()
            && m.error
        {
            egui::Frame::new()
                .fill(Color32::from_rgb(250, 228, 225))
                .inner_margin(6.0)
                .corner_radius(4)
                .show(ui, |ui| {
                    ui.horizontal_wrapped(|ui| {
                        ui.label(
                            RichText::new(format!("⚠ {}", m.text))
                                .color(Color32::from_rgb(150, 30, 20)),
                        );
                        if ui.small_button("Dismiss").clicked() {
                            self.message = None;
                        }
                    });
                });
        }
        ui.horizontal_wrapped(|ui| {
            for tab in [
                PlotTab::Sweep,
                PlotTab::Map,
                PlotTab::BoundaryLayer,
                PlotTab::Canopy,
                PlotTab::Fans,
                PlotTab::Shape,
                PlotTab::Compare,
            ] {
                ui.selectable_value(
                    &mut self.prefs.layout.tab,
                    tab,
                    RichText::new(tab.label()).strong(),
                );
            }
        });
        ui.separator();
        let stale = self.input_error.is_some();
        let current = self.result.as_ref();
        let cmds = match self.prefs.layout.tab {
            PlotTab::Sweep => {
                let status = Self::job_status(&self.sweep, stale);
                self.sweep_panel
                    .ui(ui, self.sweep.result(), status, &self.doc, current, units)
            }
            PlotTab::Map => {
                let status = Self::job_status(&self.map, stale);
                // The full map when it is current; else the preview when that is; else the last.
                let shown = if !self.map.is_current() && self.map_preview.is_current() {
                    self.map_preview.result()
                } else {
                    self.map.result().or(self.map_preview.result())
                };
                self.map_panel
                    .ui(ui, shown, status, &self.doc, current, units)
            }
            PlotTab::BoundaryLayer => {
                let status = Self::job_status(&self.boundary, stale);
                self.boundary_panel
                    .ui(ui, self.boundary.result(), status, units)
            }
            PlotTab::Canopy => {
                let view = CanopyView {
                    run: self.canopy.result(),
                    busy: self.canopy.is_busy(),
                    error: self.canopy.error(),
                    stale,
                    dir: self.path.as_deref().and_then(Path::parent),
                };
                self.canopy_panel.ui(ui, &self.doc, &view, units)
            }
            PlotTab::Fans => {
                let view = FansView {
                    run: self.fans.result(),
                    busy: self.fans.is_busy(),
                    error: self.fans.error(),
                    stale,
                    dir: self.path.as_deref().and_then(Path::parent),
                };
                self.fans_panel.ui(ui, &self.doc, &view, units)
            }
            PlotTab::Shape => self.shape_panel.ui(ui, &self.doc, self.dialogs, units),
            PlotTab::Compare => {
                self.compare_panel.ui(ui, &self.doc, self.dialogs, units);
                Vec::new()
            }
        };
        self.commands.extend(cmds);
    }

    fn draw_modals(&mut self, ctx: &egui::Context) {
        if let Some(pending) = self.confirm.clone() {
            let mut choice = None;
            Modal::new(egui::Id::unique("confirm-discard")).show(ctx, |ui| {
                ui.set_max_width(360.0);
                ui.heading("Discard unsaved changes?");
                ui.label(format!(
                    "“{}” has edits that are not saved. {} will discard them.",
                    self.doc.title,
                    pending.label().trim_end_matches('…')
                ));
                ui.add_space(6.0);
                ui.horizontal(|ui| {
                    if ui.button("Discard changes").clicked() {
                        choice = Some(true);
                    }
                    if ui.button("Cancel").clicked() {
                        choice = Some(false);
                    }
                });
            });
            match choice {
                Some(true) => {
                    self.confirm = None;
                    self.execute(pending, ctx);
                }
                Some(false) => self.confirm = None,
                None => {}
            }
        }
        if let Some(prompt) = &mut self.path_prompt {
            let mut done = None;
            let purpose = prompt.purpose;
            Modal::new(egui::Id::unique("path-prompt")).show(ctx, |ui| {
                ui.set_max_width(460.0);
                ui.heading(purpose.title());
                ui.label("No file dialog is available here: type the file's path.");
                let r = ui.add(
                    TextEdit::singleline(&mut prompt.text)
                        .desired_width(420.0)
                        .hint_text("/path/to/file"),
                );
                ui.ctx()
                    .accesskit_node_builder(r.id, |n| n.set_label("File path"));
                let enter = r.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
                ui.horizontal(|ui| {
                    if ui.button(purpose.action()).clicked() || enter {
                        done = Some(true);
                    }
                    if ui.button("Cancel").clicked() {
                        done = Some(false);
                    }
                });
            });
            match done {
                Some(true) => {
                    let text = prompt.text.trim().to_owned();
                    self.path_prompt = None;
                    if !text.is_empty() {
                        let p = PathBuf::from(text);
                        let c = match purpose {
                            PathPurpose::Open => Command::OpenPath(p),
                            PathPurpose::SaveAs => Command::SaveTo(p),
                            PathPurpose::Export(k) => Command::ExportCsvTo(k, p),
                            PathPurpose::Report => Command::ExportReportTo(p),
                            PathPurpose::ViewPng => Command::ExportViewPngTo(p),
                        };
                        // Confirmation was already given for Open.
                        self.execute(c, ctx);
                    }
                }
                Some(false) => self.path_prompt = None,
                None => {}
            }
        }
        self.draw_file_safety_modals(ctx);
        if self.about_panel.open {
            self.about_panel.window(ctx);
        }
    }

    /// The restore offer (Restore / Discard) and the changed-on-disk question (Overwrite /
    /// Cancel).
    fn draw_file_safety_modals(&mut self, ctx: &egui::Context) {
        if let Some(file) = &self.restore_offer {
            let mut choice = None;
            Modal::new(egui::Id::unique("restore-autosave")).show(ctx, |ui| {
                ui.set_max_width(420.0);
                ui.heading("Restore unsaved work?");
                let of = file.source.as_ref().map_or_else(
                    || "a scenario not saved to a file".to_owned(),
                    |p| p.display().to_string(),
                );
                ui.label(format!(
                    "Leafwind was closed before the edits to “{}” ({of}) were saved. They were \
                     autosaved {}.",
                    file.document.title,
                    file.age_text()
                ));
                ui.add_space(6.0);
                ui.horizontal(|ui| {
                    if ui
                        .button("Restore")
                        .on_hover_text("Open the autosaved edits (still unsaved).")
                        .clicked()
                    {
                        choice = Some(true);
                    }
                    if ui
                        .button("Discard")
                        .on_hover_text("Delete the autosave and keep the scenario shown.")
                        .clicked()
                    {
                        choice = Some(false);
                    }
                });
            });
            match choice {
                Some(true) => {
                    if let Some(file) = self.restore_offer.take() {
                        self.restore_autosave(file);
                    }
                }
                Some(false) => {
                    self.restore_offer = None;
                    if let Some(a) = &mut self.autosave {
                        a.remove();
                    }
                    self.note("Discarded the autosaved edits.");
                }
                None => {}
            }
        }
        if let Some(p) = self.overwrite_confirm.clone() {
            let mut choice = None;
            Modal::new(egui::Id::unique("overwrite-changed")).show(ctx, |ui| {
                ui.set_max_width(420.0);
                ui.heading("The file changed on disk");
                ui.label(format!(
                    "{} was changed by another program since Leafwind opened or saved it. \
                     Saving will replace those changes with this scenario.",
                    p.display()
                ));
                ui.add_space(6.0);
                ui.horizontal(|ui| {
                    if ui.button("Overwrite").clicked() {
                        choice = Some(true);
                    }
                    if ui.button("Cancel").clicked() {
                        choice = Some(false);
                    }
                });
            });
            match choice {
                Some(true) => {
                    self.overwrite_confirm = None;
                    self.write_to(&p);
                }
                Some(false) => {
                    self.overwrite_confirm = None;
                    self.note("Not saved: the file on disk was kept.");
                }
                None => {}
            }
        }
    }

    fn handle_close_request(&mut self, ctx: &egui::Context) {
        if ctx.input(|i| i.viewport().close_requested()) && !self.allow_close {
            if self.is_dirty() && self.screenshot.is_none() {
                ctx.send_viewport_cmd(ViewportCommand::CancelClose);
                self.confirm = Some(Command::Quit);
            } else {
                self.allow_close = true;
            }
        }
    }

    // ----- commands -----

    /// Applies a command (asks first when it would discard unsaved edits).
    pub fn apply(&mut self, c: Command, ctx: &egui::Context) {
        if c.discards_document() && self.is_dirty() {
            self.confirm = Some(c);
            return;
        }
        self.execute(c, ctx);
    }

    fn execute(&mut self, c: Command, ctx: &egui::Context) {
        match c {
            Command::New => {
                self.doc = ScenarioDocument::default();
                self.saved = self.doc.clone();
                self.path = None;
                self.stamp = None;
                self.note("New scenario from the default inputs.");
            }
            Command::Open => {
                if let Some(p) = self.pick(PathPurpose::Open) {
                    self.open_path(&p);
                }
            }
            Command::OpenPath(p) => self.open_path(&p),
            Command::OpenExample(i) => {
                if let Some((name, text)) = EXAMPLES.get(i) {
                    match ScenarioDocument::from_ron(text) {
                        Ok(mut d) => {
                            d.apply_altitude();
                            self.doc = d;
                            self.saved = self.doc.clone();
                            self.path = None;
                            self.stamp = None;
                            self.note(&format!("Opened the example {name}."));
                        }
                        Err(e) => self.fail(&format!("The example {name} could not be read: {e}")),
                    }
                }
            }
            Command::Save => match self.path.clone() {
                Some(p) => self.save_to(&p),
                None => self.execute(Command::SaveAs, ctx),
            },
            Command::SaveAs => {
                if let Some(p) = self.pick(PathPurpose::SaveAs) {
                    self.save_to(&p);
                }
            }
            Command::SaveTo(p) => self.save_to(&p),
            Command::ExportCsv(k) => {
                if let Some(p) = self.pick(PathPurpose::Export(k)) {
                    self.export_to(k, &p);
                }
            }
            Command::ExportCsvTo(k, p) => self.export_to(k, &p),
            Command::ExportReport => {
                if let Some(p) = self.pick(PathPurpose::Report) {
                    self.export_report_to(&p);
                }
            }
            Command::ExportReportTo(p) => self.export_report_to(&p),
            Command::ExportViewPng => {
                if let Some(p) = self.pick(PathPurpose::ViewPng) {
                    self.export_view_png_to(p, ctx);
                }
            }
            Command::ExportViewPngTo(p) => self.export_view_png_to(p, ctx),
            Command::Quit => {
                self.allow_close = true;
                self.quit_requested = true;
                ctx.send_viewport_cmd(ViewportCommand::Close);
            }
            Command::ToggleUnits => self.prefs.units = self.prefs.units.toggled(),
            Command::About => self.about_panel.open = true,
            Command::Edit(d) => {
                self.doc = *d;
                self.doc.apply_altitude();
            }
            Command::ClearRecent => self.prefs.recent_files.clear(),
        }
    }

    fn note(&mut self, text: &str) {
        self.message = Some(Message {
            text: text.to_owned(),
            error: false,
        });
    }

    fn fail(&mut self, text: &str) {
        self.message = Some(Message {
            text: text.to_owned(),
            error: true,
        });
    }

    /// Asks for a path: the system dialog, or the path field (then returns None for now).
    fn pick(&mut self, purpose: PathPurpose) -> Option<PathBuf> {
        if self.dialogs == DialogMode::Native {
            let t0 = Instant::now();
            let dialog = rfd::FileDialog::new();
            let picked = match purpose {
                PathPurpose::Open => dialog.add_filter("Leafwind scenario", &["ron"]).pick_file(),
                PathPurpose::SaveAs => dialog
                    .add_filter("Leafwind scenario", &["ron"])
                    .set_file_name(format!("{}.ron", file_stem(&self.doc.title)))
                    .save_file(),
                PathPurpose::Export(k) => dialog
                    .add_filter("CSV", &["csv"])
                    .set_file_name(k.default_file_name())
                    .save_file(),
                PathPurpose::Report => dialog.pick_folder(),
                PathPurpose::ViewPng => dialog
                    .add_filter("PNG image", &["png"])
                    .set_file_name(format!("{}.png", file_stem(&self.doc.title)))
                    .save_file(),
            };
            if picked.is_some() {
                return picked;
            }
            // A dialog that a person cancelled takes longer than this; an instant None means
            // there is no dialog service: use the path field from now on.
            if t0.elapsed() > Duration::from_millis(300) {
                return None;
            }
            self.dialogs = DialogMode::PathField;
        }
        let suggestion = match purpose {
            PathPurpose::Open => self
                .prefs
                .recent_files
                .first()
                .map(|p| p.display().to_string())
                .unwrap_or_default(),
            PathPurpose::SaveAs => self.path.as_ref().map_or_else(
                || format!("{}.ron", file_stem(&self.doc.title)),
                |p| p.display().to_string(),
            ),
            PathPurpose::Export(k) => k.default_file_name().to_owned(),
            PathPurpose::Report => format!("{}-report", file_stem(&self.doc.title)),
            PathPurpose::ViewPng => format!("{}.png", file_stem(&self.doc.title)),
        };
        self.path_prompt = Some(PathPrompt {
            purpose,
            text: suggestion,
        });
        None
    }

    /// Opens a scenario file; on failure the document stays as it was and the error is shown.
    fn open_path(&mut self, p: &Path) {
        match ScenarioDocument::load_stamped(p) {
            Ok(loaded) => {
                let mut d = loaded.doc;
                d.apply_altitude();
                self.doc = d;
                self.saved = self.doc.clone();
                self.path = Some(p.to_path_buf());
                self.stamp = Some(loaded.stamp);
                self.prefs.add_recent(p.to_path_buf());
                match loaded.migrated_from {
                    Some(v) => self.note(&format!(
                        "Opened {} (format version {v}, updated to version {}; saving writes the \
                         new version).",
                        p.display(),
                        crate::document::DOCUMENT_VERSION
                    )),
                    None => self.note(&format!("Opened {}.", p.display())),
                }
            }
            Err(e) => self.fail(&format!(
                "Could not open the scenario: {e} ({})",
                p.display()
            )),
        }
    }

    /// Saves to `p`, asking first when `p` is the document's file and another program changed
    /// it since it was opened or saved.
    fn save_to(&mut self, p: &Path) {
        let ours = self.path.as_deref() == Some(p);
        if ours
            && let Some(before) = self.stamp
            && FileStamp::read(p).is_some_and(|now| now.differs_from(&before))
        {
            self.overwrite_confirm = Some(p.to_path_buf());
            return;
        }
        self.write_to(p);
    }

    /// Writes the document to `p` (atomically) and removes the autosave.
    fn write_to(&mut self, p: &Path) {
        match self.doc.save_stamped(p) {
            Ok(stamp) => {
                self.saved = self.doc.clone();
                self.path = Some(p.to_path_buf());
                self.stamp = Some(stamp);
                self.prefs.add_recent(p.to_path_buf());
                if let Some(a) = &mut self.autosave {
                    a.remove();
                }
                self.note(&format!("Saved {}.", p.display()));
            }
            // The file on disk is as it was (atomic write); the edits stay, unsaved.
            Err(e) => self.fail(&format!("{e:#}")),
        }
    }

    /// Writes the grower report for the open scenario into the folder `p`.
    fn export_report_to(&mut self, p: &Path) {
        match crate::report::write_report(&self.doc, p, self.prefs.units) {
            Ok(files) => self.note(&format!(
                "Report written to {} ({} CSV tables beside it).",
                files.html.display(),
                files.csv.len()
            )),
            Err(e) => self.fail(&format!(
                "The report could not be written: {e:#} ({})",
                p.display()
            )),
        }
    }

    /// Asks egui for a screenshot; the plots area is cut from it and saved when it arrives.
    fn export_view_png_to(&mut self, p: PathBuf, ctx: &egui::Context) {
        let Some(rect) = self.view_rect else {
            self.fail("The plots area is not on screen yet.");
            return;
        };
        let done = Arc::new(Mutex::new(None));
        let slot = done.clone();
        let (path, ppp) = (p.clone(), ctx.pixels_per_point());
        ctx.request_screenshot(move |image| {
            let r = save_png(&path, &image.region(&rect, Some(ppp)));
            if let Ok(mut d) = slot.lock() {
                *d = Some(r);
            }
        });
        ctx.request_repaint();
        self.view_png = Some((p, done));
    }

    /// Reports a finished PNG export.
    fn view_png_step(&mut self, ctx: &egui::Context) {
        let Some((p, done)) = &self.view_png else {
            return;
        };
        let finished = done.lock().ok().and_then(|mut d| d.take());
        match finished {
            Some(Ok(())) => {
                let msg = format!("Saved the view to {}.", p.display());
                if self.screenshot.is_some() {
                    eprintln!("leafwind: {msg}");
                }
                self.view_png = None;
                self.note(&msg);
            }
            Some(Err(e)) => {
                self.view_png = None;
                if self.screenshot.is_some() {
                    self.screenshot_failed(&e);
                }
                self.fail(&e);
            }
            None => ctx.request_repaint_after(Duration::from_millis(50)),
        }
    }

    fn export_to(&mut self, k: PlotKind, p: &Path) {
        let units = self.prefs.units;
        let result = export::create(p).and_then(|f| match k {
            PlotKind::Budget => match &self.result {
                Some(r) => export::budget_csv(f, r),
                None => Err(anyhow::anyhow!("there is no result to export yet")),
            },
            PlotKind::Sweep => match self.sweep.result() {
                Some(s) => export::sweep_csv(f, s, units),
                None => Err(anyhow::anyhow!("the sweep is not ready yet")),
            },
            PlotKind::Map => match self.map.result() {
                Some(m) => export::map_csv(f, m, units),
                None => Err(anyhow::anyhow!("the map is not ready yet")),
            },
            PlotKind::Boundary => match self.boundary.result() {
                Some(b) => export::boundary_csv(f, b, units),
                None => Err(anyhow::anyhow!("the boundary layer is not ready yet")),
            },
        });
        match result {
            Ok(()) => self.note(&format!("Exported {}.", p.display())),
            Err(e) => self.fail(&format!("Export failed: {e:#} ({})", p.display())),
        }
    }

    // ----- screenshot -----

    /// Records a failure of the screenshot mode as the process's exit error.
    fn screenshot_failed(&self, why: &str) {
        eprintln!("leafwind: {why}");
        if let Ok(mut c) = self.exit_code.lock() {
            c.get_or_insert_with(|| why.to_owned());
        }
    }

    fn screenshot_step(&mut self, ctx: &egui::Context) {
        let ready = self.result.is_some()
            && self.results_current()
            && (self.doc.canopy.is_none() || self.canopy.is_current())
            && (self.doc.fans.is_none() || self.fans.is_current());
        let Some(s) = &mut self.screenshot else {
            return;
        };
        ctx.request_repaint();
        if !s.requested {
            if ready || s.started.elapsed() > Duration::from_secs(30) {
                s.ready_frames += 1;
            }
            // A few frames after the results arrived, so the map texture is on screen.
            if s.ready_frames >= 4 {
                // First the view through "Export view as PNG", when asked for; then the window.
                if let Some(view) = s.view_png.take() {
                    self.export_view_png_to(view, ctx);
                    if self.view_png.is_none() {
                        self.screenshot_failed("the view could not be exported");
                    }
                    return;
                }
                if self.view_png.is_some() {
                    return;
                }
                s.requested = true;
                let done = s.done.clone();
                let path = s.path.clone();
                ctx.request_screenshot(move |image| {
                    let r = save_png(&path, &image);
                    if let Ok(mut d) = done.lock() {
                        *d = Some(r);
                    }
                });
            }
            return;
        }
        let finished = s.done.lock().ok().and_then(|mut d| d.take());
        if let Some(r) = finished {
            match r {
                Ok(()) => eprintln!(
                    "leafwind: screenshot saved to {} (mean UI frame {:.2} ms, map {} ms)",
                    s.path.display(),
                    self.frame_ms,
                    self.map.last_duration().map_or_else(
                        || "–".to_owned(),
                        |d| format!("{:.1}", d.as_secs_f64() * 1e3)
                    )
                ),
                Err(e) => {
                    eprintln!("leafwind: {e}");
                    if let Ok(mut c) = self.exit_code.lock() {
                        *c = Some(e);
                    }
                }
            }
            self.allow_close = true;
            ctx.send_viewport_cmd(ViewportCommand::Close);
        } else if s.started.elapsed() > Duration::from_secs(60) {
            eprintln!("leafwind: no screenshot arrived within 60 s");
            if let Ok(mut c) = self.exit_code.lock() {
                *c = Some("no screenshot arrived".to_owned());
            }
            self.allow_close = true;
            ctx.send_viewport_cmd(ViewportCommand::Close);
        }
    }
}

fn file_stem(title: &str) -> String {
    let s: String = title
        .chars()
        .map(|c| {
            if c.is_alphanumeric() {
                c.to_ascii_lowercase()
            } else {
                '-'
            }
        })
        .collect();
    let s = s.trim_matches('-').to_owned();
    if s.is_empty() {
        "scenario".to_owned()
    } else {
        s
    }
}

fn save_png(path: &Path, image: &egui::ColorImage) -> Result<(), String> {
    let [w, h] = image.size;
    let bytes: Vec<u8> = image.pixels.iter().flat_map(|c| c.to_array()).collect();
    let Some(img) = image::RgbaImage::from_raw(w as u32, h as u32, bytes) else {
        return Err("the screenshot had an unexpected size".to_owned());
    };
    img.save(path)
        .map_err(|e| format!("could not write the screenshot {}: {e}", path.display()))
}

impl eframe::App for LeafwindApp {
    fn ui(&mut self, ui: &mut Ui, _frame: &mut eframe::Frame) {
        self.frame(ui);
    }

    fn save(&mut self, storage: &mut dyn eframe::Storage) {
        if self.screenshot.is_none() {
            eframe::set_value(storage, PREFS_KEY, &self.prefs);
        }
    }

    fn persist_egui_memory(&self) -> bool {
        self.screenshot.is_none()
    }

    /// A clean exit: the edits were saved or their discarding confirmed, so the autosave goes.
    fn on_exit(&mut self) {
        let clean = !self.is_dirty() || self.allow_close;
        if let Some(a) = &mut self.autosave
            && clean
        {
            a.remove();
        }
    }
}

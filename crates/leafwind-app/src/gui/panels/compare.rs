//! The compare view: several leaves or scenarios side by side — copies of the current scenario
//! with a few key fields changed, or scenarios loaded from files. One plot of leaf temperature
//! against air speed (one curve per entry), and a table at each entry's own conditions with the
//! best of each column marked by a symbol and words.
//!
//! The list of entries is UI state: it is not saved in the scenario file.

use std::io::Write;
use std::path::Path;

use egui::{DragValue, Grid, RichText, ScrollArea, TextEdit, Ui};
use egui_plot::{HLine, Legend, Line, LineStyle, MarkerShape, Plot, PlotPoints, Points};
use leafwind_physics::WindAnswer;
use leafwind_physics::case::{AIR_SPEED_RANGE_M_S, LEAF_DIMENSION_RANGE_M};
use leafwind_physics::radiation::SHORTWAVE_RANGE_W_M2;
use leafwind_physics::solve_leaf;
use leafwind_physics::transpiration::{STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S, mol_to_mmol};

use crate::document::ScenarioDocument;
use crate::gui::app::DialogMode;
use crate::gui::compute::LeafResult;
use crate::gui::fields::{error_line, name_widget};
use crate::gui::panels::file_prompt::{FileAction, FilePrompt};
use crate::gui::panels::sweep::{LIMIT_COLOUR, PALETTE, hover_text};
use crate::gui::worker::Job;
use crate::units::{Quantity, UnitSystem, fmt_num};

/// Most entries compared at once.
pub const MAX_ENTRIES: usize = 6;

/// Points on each curve of the plot.
pub const CURVE_POINTS: usize = 121;

/// One entry: a name and its scenario.
#[derive(Debug, Clone, PartialEq)]
pub struct CompareEntry {
    /// Name shown in the legend and the table.
    pub name: String,
    /// The scenario (a copy; editing it never changes the open document).
    pub doc: ScenarioDocument,
}

/// Inputs of the compare job.
#[derive(Debug, Clone, PartialEq)]
pub struct CompareInput {
    /// The entries.
    pub entries: Vec<CompareEntry>,
    /// Highest air speed of the curves \[m s⁻¹\].
    pub max_speed_m_s: f64,
}

impl CompareInput {
    /// The input for `entries`: curves up to the largest sweep maximum of the entries, and at
    /// least 1.25 × the fastest entry's air speed (0.2 to 30 m/s).
    #[must_use]
    pub fn of(entries: &[CompareEntry]) -> Self {
        let max = entries
            .iter()
            .map(|e| {
                e.doc
                    .sweep
                    .max_speed_m_s
                    .max(1.25 * e.doc.case.air.speed_m_s)
            })
            .filter(|v| v.is_finite())
            .fold(0.2_f64, f64::max)
            .min(30.0);
        Self {
            entries: entries.to_vec(),
            max_speed_m_s: max,
        }
    }
}

/// The solved entry: its result at its own conditions and its curve.
#[derive(Debug, Clone, PartialEq)]
pub struct EntryOutcome {
    /// The result at the entry's air speed.
    pub result: LeafResult,
    /// (air speed \[m s⁻¹\], leaf temperature \[°C\]) where the solve succeeded.
    pub curve: Vec<[f64; 2]>,
}

/// The job's result: one outcome (or the reason there is none) per entry.
#[derive(Debug, Clone, PartialEq)]
pub struct CompareResult {
    /// The input solved.
    pub input: CompareInput,
    /// Per entry, in order.
    pub outcomes: Vec<Result<EntryOutcome, String>>,
}

/// Solves every entry and its curve (the background job of the compare view).
///
/// # Errors
/// Never for one bad entry (that entry carries its message); the signature fits [`Job`].
pub fn compute_compare(input: &CompareInput) -> Result<CompareResult, String> {
    let n = CURVE_POINTS;
    let outcomes = input
        .entries
        .iter()
        .map(|e| {
            let doc = &e.doc;
            doc.case.validate().map_err(|e| e.to_string())?;
            doc.validate_extras().map_err(|e| e.to_string())?;
            let result = LeafResult::solve(doc)?;
            let curve = (0..n)
                .filter_map(|i| {
                    let u = input.max_speed_m_s * i as f64 / (n - 1) as f64;
                    solve_leaf(&doc.case.with_speed(u))
                        .ok()
                        .map(|s| [u, s.leaf_temp_c])
                        .filter(|p| p[1].is_finite())
                })
                .collect();
            Ok(EntryOutcome { result, curve })
        })
        .collect();
    Ok(CompareResult {
        input: input.clone(),
        outcomes,
    })
}

// ---------------------------------------------------------------------------------------------
// The table (shared by the view and the CSV export)

/// Which way "best" goes in a column.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Better {
    /// The least value is best.
    Lower,
    /// The greatest value is best.
    Higher,
}

/// The result columns: name, which way is best, the words shown at the best cell.
pub const COLUMNS: [(&str, Better, &str); 4] = [
    ("Leaf temperature", Better::Lower, "coolest leaf"),
    ("Margin to its limit", Better::Higher, "largest margin"),
    ("Least air speed", Better::Lower, "least air needed"),
    ("Transpiration", Better::Lower, "least water use"),
];

/// Short column headers of the table on screen (the full names are in the tooltips and the CSV).
const SHORT_HEADERS: [&str; 4] = ["Leaf temp.", "Margin", "Least air", "Transpiration"];

/// A name cut to `n` characters with "…".
fn short_name(name: &str, n: usize) -> String {
    if name.chars().count() <= n {
        name.to_owned()
    } else {
        let mut s: String = name.chars().take(n.saturating_sub(1)).collect();
        s.push('…');
        s
    }
}

/// Tolerances within which two values count as equal, per column, in SI (half the last digit
/// shown: 0.05 K, 0.05 K, 0.005 m/s, 0.005 mmol m⁻² s⁻¹).
const TIE_TOLERANCE: [f64; 4] = [0.05, 0.05, 0.005, 0.005];

/// One row of the table, SI values.
#[derive(Debug, Clone, PartialEq)]
pub struct TableRow {
    /// Entry name.
    pub name: String,
    /// Leaf size along the wind \[m\].
    pub leaf_size_m: f64,
    /// Stomatal conductance \[mol m⁻² s⁻¹\].
    pub stomatal_conductance_mol_m2_s: f64,
    /// Sun on the leaf \[W m⁻²\].
    pub sun_w_m2: f64,
    /// Air speed over the leaf \[m s⁻¹\].
    pub air_speed_m_s: f64,
    /// Leaf temperature limit \[°C\].
    pub limit_c: f64,
    /// Leaf temperature \[°C\], margin to the limit \[K\], least air speed for the margin
    /// \[m s⁻¹\] (0 when none is needed), transpiration \[mmol m⁻² s⁻¹\]; `None` where there is no
    /// number.
    pub values: [Option<f64>; 4],
    /// Words for the least air speed ("not needed", "not reachable with air alone").
    pub speed_note: String,
    /// Why the entry could not be solved.
    pub error: Option<String>,
}

/// The table with the best cell of each column marked.
#[derive(Debug, Clone, PartialEq)]
pub struct CompareTable {
    /// Rows, in entry order.
    pub rows: Vec<TableRow>,
    /// Per column, which rows hold the best value (ties all marked).
    pub best: [Vec<bool>; 4],
    /// Per column, whether every row that has a value has the same one (then none is marked).
    pub all_equal: [bool; 4],
}

/// Which of `values` are best (within `tolerance`); all false when fewer than two values exist or
/// they are all equal (the second item says which).
#[must_use]
pub fn best_flags(values: &[Option<f64>], better: Better, tolerance: f64) -> (Vec<bool>, bool) {
    let present: Vec<f64> = values
        .iter()
        .flatten()
        .copied()
        .filter(|v| v.is_finite())
        .collect();
    let none = vec![false; values.len()];
    if present.len() < 2 {
        return (none, false);
    }
    let best = match better {
        Better::Lower => present.iter().copied().fold(f64::INFINITY, f64::min),
        Better::Higher => present.iter().copied().fold(f64::NEG_INFINITY, f64::max),
    };
    let flags: Vec<bool> = values
        .iter()
        .map(|v| v.is_some_and(|v| v.is_finite() && (v - best).abs() <= tolerance))
        .collect();
    if flags.iter().filter(|f| **f).count() == present.len() {
        (none, true)
    } else {
        (flags, false)
    }
}

impl CompareTable {
    /// The table of a compare result.
    #[must_use]
    pub fn of(result: &CompareResult) -> Self {
        let rows: Vec<TableRow> = result
            .input
            .entries
            .iter()
            .zip(&result.outcomes)
            .map(|(e, o)| {
                let leaf = &e.doc.case.leaf;
                let mut row = TableRow {
                    name: e.name.clone(),
                    leaf_size_m: leaf.dimension_m,
                    stomatal_conductance_mol_m2_s: leaf.stomatal_conductance_mol_m2_s,
                    sun_w_m2: e.doc.case.surroundings.shortwave_w_m2,
                    air_speed_m_s: e.doc.case.air.speed_m_s,
                    limit_c: e.doc.heat_limit_c,
                    values: [None; 4],
                    speed_note: String::new(),
                    error: None,
                };
                match o {
                    Ok(o) => {
                        let r = &o.result;
                        let (speed, note) = match &r.wind {
                            Ok(WindAnswer::Speed { speed_m_s, .. }) => {
                                (Some(*speed_m_s), String::new())
                            }
                            Ok(WindAnswer::NotNeeded { .. }) => {
                                (Some(0.0), "not needed".to_owned())
                            }
                            Ok(WindAnswer::Unreachable(_)) => {
                                (None, "not reachable with air alone".to_owned())
                            }
                            Err(e) => (None, format!("not known: {e}")),
                        };
                        let fin = |x: f64| x.is_finite().then_some(x);
                        row.values = [
                            fin(r.solution.leaf_temp_c),
                            fin(r.margin_to_limit_k()),
                            speed.and_then(fin),
                            fin(mol_to_mmol(r.solution.terms.transpiration_mol_m2_s)),
                        ];
                        row.speed_note = note;
                    }
                    Err(e) => row.error = Some(e.clone()),
                }
                row
            })
            .collect();
        let mut best: [Vec<bool>; 4] = Default::default();
        let mut all_equal = [false; 4];
        for (k, (_, better, _)) in COLUMNS.iter().enumerate() {
            let column: Vec<Option<f64>> = rows.iter().map(|r| r.values[k]).collect();
            let (flags, equal) = best_flags(&column, *better, TIE_TOLERANCE[k]);
            best[k] = flags;
            all_equal[k] = equal;
        }
        Self {
            rows,
            best,
            all_equal,
        }
    }

    /// The words of the columns in which row `i` is best ("coolest leaf; least water use").
    #[must_use]
    pub fn best_words(&self, i: usize) -> String {
        COLUMNS
            .iter()
            .enumerate()
            .filter(|(k, _)| self.best[*k].get(i).copied().unwrap_or(false))
            .map(|(_, c)| c.2)
            .collect::<Vec<_>>()
            .join("; ")
    }
}

/// The quantity and the unit label of result column `k`.
fn column_quantity(k: usize) -> Quantity {
    match k {
        0 => Quantity::Temperature,
        1 => Quantity::TempDiff,
        2 => Quantity::Speed,
        _ => Quantity::Same("mmol/m²/s"),
    }
}

fn cell(x: Option<f64>) -> String {
    x.filter(|v| v.is_finite())
        .map_or_else(String::new, |v| format!("{v}"))
}

fn head(name: &str, q: Quantity, units: UnitSystem) -> String {
    let u = q.unit(units);
    if u.is_empty() {
        name.to_owned()
    } else {
        format!("{name} [{u}]")
    }
}

/// The table as CSV in the units shown (units in the headers); empty cells, never "NaN".
///
/// # Errors
/// Writer failure.
pub fn table_csv<W: Write>(out: W, table: &CompareTable, units: UnitSystem) -> anyhow::Result<()> {
    let (sz, sp, t) = (Quantity::LeafSize, Quantity::Speed, Quantity::Temperature);
    let mut w = csv::Writer::from_writer(out);
    w.write_record([
        "entry".to_owned(),
        head("leaf_size", sz, units),
        "stomatal_conductance [mol/m²/s]".to_owned(),
        "sun [W/m²]".to_owned(),
        head("air_speed", sp, units),
        head("heat_limit", t, units),
        head("leaf_temperature", column_quantity(0), units),
        head("margin_to_limit", column_quantity(1), units),
        head("least_air_speed", column_quantity(2), units),
        "least_air_speed_note".to_owned(),
        head("transpiration", column_quantity(3), units),
        "best_in".to_owned(),
        "error".to_owned(),
    ])?;
    for (i, r) in table.rows.iter().enumerate() {
        let shown = |k: usize| r.values[k].map(|v| column_quantity(k).to_display(v, units));
        w.write_record([
            r.name.clone(),
            cell(Some(sz.to_display(r.leaf_size_m, units))),
            cell(Some(r.stomatal_conductance_mol_m2_s)),
            cell(Some(r.sun_w_m2)),
            cell(Some(sp.to_display(r.air_speed_m_s, units))),
            cell(Some(t.to_display(r.limit_c, units))),
            cell(shown(0)),
            cell(shown(1)),
            cell(shown(2)),
            r.speed_note.clone(),
            cell(shown(3)),
            table.best_words(i),
            r.error.clone().unwrap_or_default(),
        ])?;
    }
    w.flush()?;
    Ok(())
}

// ---------------------------------------------------------------------------------------------
// The view

enum CompareAction {
    Duplicate,
    Load,
    LoadPath(std::path::PathBuf),
    Export,
    ExportPath(std::path::PathBuf),
    Remove(usize),
}

/// State of the compare view: the entries (not saved), the job, the file choosers.
pub struct ComparePanel {
    entries: Vec<CompareEntry>,
    job: Job<CompareInput, CompareResult>,
    load: FilePrompt,
    export: FilePrompt,
    message: Option<(String, bool)>,
    copies: usize,
    /// Width of the view this frame \[points\] (the plot never grows past it).
    width: f32,
}

impl std::fmt::Debug for ComparePanel {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("ComparePanel")
            .field("entries", &self.entries.len())
            .finish_non_exhaustive()
    }
}

impl ComparePanel {
    /// The panel; `inline` computes on the calling thread (tests).
    #[must_use]
    pub fn new(inline: bool) -> Self {
        Self {
            entries: Vec::new(),
            job: Job::new(compute_compare, inline),
            load: FilePrompt::new(
                "Scenario file to compare",
                FileAction::Open,
                ("Leafwind scenario", &["ron"]),
                "scenario.ron",
            ),
            export: FilePrompt::new(
                "Table file",
                FileAction::Save,
                ("CSV", &["csv"]),
                "leafwind-compare.csv",
            ),
            message: None,
            copies: 0,
            width: 600.0,
        }
    }

    /// The entries.
    #[must_use]
    pub fn entries(&self) -> &[CompareEntry] {
        &self.entries
    }

    /// The table of the last result, when it is for the current entries.
    #[must_use]
    pub fn table(&self) -> Option<CompareTable> {
        self.job
            .result()
            .filter(|r| r.input.entries == self.entries)
            .map(CompareTable::of)
    }

    /// Adds a copy of `doc` named `name` (or "Copy n of …"); false when the list is full.
    pub fn add_copy(&mut self, doc: &ScenarioDocument, name: Option<&str>) -> bool {
        if self.entries.len() >= MAX_ENTRIES {
            return false;
        }
        self.copies += 1;
        let name = name.map_or_else(
            || format!("Copy {} of {}", self.copies, doc.title),
            str::to_owned,
        );
        self.entries.push(CompareEntry {
            name,
            doc: doc.clone(),
        });
        true
    }

    /// Adds a scenario from a file (the document loader); the error is shown otherwise.
    pub fn load_path(&mut self, path: &Path) {
        if self.entries.len() >= MAX_ENTRIES {
            self.message = Some((
                format!("At most {MAX_ENTRIES} entries: remove one first."),
                true,
            ));
            return;
        }
        match ScenarioDocument::load(path) {
            Ok(mut d) => {
                d.apply_altitude();
                let name = d.title.clone();
                self.entries.push(CompareEntry { name, doc: d });
                self.message = Some((format!("Loaded {}.", path.display()), false));
            }
            Err(e) => {
                self.message = Some((
                    format!("Could not load the scenario: {e} ({})", path.display()),
                    true,
                ));
            }
        }
    }

    /// Writes the table to `path`.
    pub fn export_path(&mut self, path: &Path, units: UnitSystem) {
        let r = match self.table() {
            Some(t) => crate::gui::export::create(path).and_then(|f| table_csv(f, &t, units)),
            None => Err(anyhow::anyhow!("the table is not ready yet")),
        };
        self.message = Some(match r {
            Ok(()) => (format!("Exported {}.", path.display()), false),
            Err(e) => (format!("Export failed: {e:#} ({})", path.display()), true),
        });
    }

    /// The last message (text, whether it is an error).
    #[must_use]
    pub fn message(&self) -> Option<(&str, bool)> {
        self.message.as_ref().map(|(t, e)| (t.as_str(), *e))
    }

    /// Draws the view.
    pub fn ui(
        &mut self,
        ui: &mut Ui,
        doc: &ScenarioDocument,
        dialogs: DialogMode,
        units: UnitSystem,
    ) {
        let ctx = ui.ctx().clone();
        self.width = ui.available_width();
        self.job.poll(&ctx);
        let mut actions = Vec::new();
        ui.horizontal_wrapped(|ui| {
            let full = self.entries.len() >= MAX_ENTRIES;
            if ui
                .add_enabled(!full, egui::Button::new("Duplicate current"))
                .on_hover_text("Add a copy of the open scenario; change its leaf, stomata, sun or air speed below. The open scenario is not changed.")
                .clicked()
            {
                actions.push(CompareAction::Duplicate);
            }
            if ui
                .add_enabled(!full, egui::Button::new("Load scenario…"))
                .on_hover_text("Add a saved scenario (.ron) to the comparison.")
                .clicked()
            {
                actions.push(CompareAction::Load);
            }
            if ui
                .add_enabled(!self.entries.is_empty(), egui::Button::new("Export table CSV…"))
                .on_hover_text("Write the table below to a CSV file, in the units shown.")
                .clicked()
            {
                actions.push(CompareAction::Export);
            }
        });
        if let Some(p) = self.load.field_ui(ui, "Load") {
            actions.push(CompareAction::LoadPath(p));
        }
        if let Some(p) = self.export.field_ui(ui, "Export") {
            actions.push(CompareAction::ExportPath(p));
        }
        if let Some((m, err)) = &self.message {
            if *err {
                error_line(ui, m);
            } else {
                ui.label(RichText::new(m).small());
            }
        }
        if self.entries.is_empty() {
            ui.add_space(12.0);
            ui.label("Nothing to compare yet. “Duplicate current” copies the open scenario; change a leaf size, the stomata, the sun or the air speed of each copy to see which leaf runs coolest. “Load scenario…” adds a saved one.");
        } else {
            ScrollArea::vertical()
                .id_salt("compare-scroll")
                .auto_shrink([false, false])
                .show(ui, |ui| {
                    self.entries_ui(ui, units, &mut actions);
                    self.job.submit(CompareInput::of(&self.entries), &ctx);
                    if self.job.is_busy() {
                        ui.label(RichText::new("Updating…").small().weak());
                    }
                    self.plot_ui(ui, units);
                    self.table_ui(ui, units);
                });
        }
        for a in actions {
            match a {
                CompareAction::Duplicate => {
                    self.add_copy(doc, None);
                }
                CompareAction::Load => {
                    if let Some(p) = self.load.ask(dialogs) {
                        self.load_path(&p);
                    }
                }
                CompareAction::LoadPath(p) => self.load_path(&p),
                CompareAction::Export => {
                    if let Some(p) = self.export.ask(dialogs) {
                        self.export_path(&p, units);
                    }
                }
                CompareAction::ExportPath(p) => self.export_path(&p, units),
                CompareAction::Remove(i) => {
                    if i < self.entries.len() {
                        self.entries.remove(i);
                    }
                }
            }
        }
        if !self.entries.is_empty() {
            self.job.submit(CompareInput::of(&self.entries), &ctx);
        }
    }

    fn entries_ui(&mut self, ui: &mut Ui, units: UnitSystem, actions: &mut Vec<CompareAction>) {
        let (sz, sp) = (Quantity::LeafSize, Quantity::Speed);
        ui.label(
            RichText::new(format!(
                "Entries ({} of {MAX_ENTRIES}): copies, so edits here never change the open scenario; the list is not saved",
                self.entries.len()
            ))
            .strong(),
        );
        Grid::new("compare-entries")
            .striped(true)
            .num_columns(7)
            .show(ui, |ui| {
                ui.label("#");
                ui.label("Name");
                ui.label(format!("Leaf size\n[{}]", sz.unit(units)))
                    .on_hover_text("Leaf size along the wind (characteristic dimension).");
                ui.label("Stomata\n[mol/m²/s]")
                    .on_hover_text("Stomatal conductance to water vapour, both faces.");
                ui.label("Sun\n[W/m²]")
                    .on_hover_text("Sunlight (shortwave) on the leaf.");
                ui.label(format!("Air speed\n[{}]", sp.unit(units)))
                    .on_hover_text("Air speed over the leaf.");
                ui.label("");
                ui.end_row();
                for (i, e) in self.entries.iter_mut().enumerate() {
                    let n = i + 1;
                    ui.label(
                        RichText::new(format!("{n}"))
                            .color(PALETTE[i % PALETTE.len()])
                            .strong(),
                    );
                    let r = ui.add_sized([104.0, 20.0], TextEdit::singleline(&mut e.name));
                    name_widget(ui, &r, &format!("Name, entry {n}"));
                    let leaf = &mut e.doc.case.leaf;
                    let mut v = sz.to_display(leaf.dimension_m, units);
                    let lo = sz.to_display(LEAF_DIMENSION_RANGE_M.min, units);
                    let hi = sz.to_display(LEAF_DIMENSION_RANGE_M.max, units);
                    let step = 0.01 * v.max(lo);
                    let r = ui.add(
                        DragValue::new(&mut v)
                            .range(lo..=hi)
                            .speed(step)
                            .max_decimals(sz.decimals(units) + 1),
                    );
                    name_widget(ui, &r, &format!("Leaf size, entry {n}"));
                    if r.changed() && v.is_finite() {
                        leaf.dimension_m = sz
                            .from_display(v, units)
                            .clamp(LEAF_DIMENSION_RANGE_M.min, LEAF_DIMENSION_RANGE_M.max);
                        // A typed leaf size no longer follows an outline's A/P.
                        leaf.free_convection_length_m = None;
                    }
                    let g = &mut leaf.stomatal_conductance_mol_m2_s;
                    let r = ui.add(
                        DragValue::new(g)
                            .range(
                                STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S.min
                                    ..=STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S.max,
                            )
                            .speed(0.005)
                            .max_decimals(3),
                    );
                    name_widget(ui, &r, &format!("Stomatal conductance, entry {n}"));
                    let sun = &mut e.doc.case.surroundings.shortwave_w_m2;
                    let r = ui.add(
                        DragValue::new(sun)
                            .range(SHORTWAVE_RANGE_W_M2.min..=SHORTWAVE_RANGE_W_M2.max)
                            .speed(5.0)
                            .max_decimals(0),
                    );
                    name_widget(ui, &r, &format!("Sun, entry {n}"));
                    let mut u = sp.to_display(e.doc.case.air.speed_m_s, units);
                    let r = ui.add(
                        DragValue::new(&mut u)
                            .range(
                                sp.to_display(AIR_SPEED_RANGE_M_S.min, units)
                                    ..=sp.to_display(AIR_SPEED_RANGE_M_S.max, units),
                            )
                            .speed(0.01 * sp.to_display(1.0, units))
                            .max_decimals(sp.decimals(units) + 1),
                    );
                    name_widget(ui, &r, &format!("Air speed, entry {n}"));
                    if r.changed() && u.is_finite() {
                        e.doc.case.air.speed_m_s = sp
                            .from_display(u, units)
                            .clamp(AIR_SPEED_RANGE_M_S.min, AIR_SPEED_RANGE_M_S.max);
                    }
                    if ui
                        .small_button("✖")
                        .on_hover_text("Remove this entry")
                        .clicked()
                    {
                        actions.push(CompareAction::Remove(i));
                    }
                    ui.end_row();
                }
            });
    }

    fn plot_ui(&self, ui: &mut Ui, units: UnitSystem) {
        let Some(result) = self.job.result() else {
            ui.label("Computing…");
            return;
        };
        let (sp, t) = (Quantity::Speed, Quantity::Temperature);
        let (x_unit, y_unit) = (sp.unit(units), t.unit(units));
        let x_dec = sp.decimals(units);
        ui.add_space(6.0);
        ui.label(
            RichText::new(
                "Leaf temperature by air speed, one curve per entry (♦ = its current air speed)",
            )
            .strong(),
        );
        let height = (ui.available_height() * 0.5).clamp(220.0, 420.0);
        Plot::new("compare-curves")
            .height(height)
            .width((ui.available_width() - 4.0).min(self.width))
            .legend(
                Legend::default()
                    .follow_insertion_order(true)
                    .position(egui_plot::Corner::RightTop),
            )
            .x_axis_label(format!("Air speed over the leaf [{x_unit}]"))
            .y_axis_label(format!("Leaf temperature [{y_unit}]"))
            .include_x(0.0)
            .label_formatter(move |p| hover_text(p, x_unit, y_unit, x_dec, 1))
            .show(ui, |p| {
                let mut limits: Vec<f64> = Vec::new();
                for (i, (e, o)) in result
                    .input
                    .entries
                    .iter()
                    .zip(&result.outcomes)
                    .enumerate()
                {
                    let Ok(o) = o else { continue };
                    let colour = PALETTE[i % PALETTE.len()];
                    let name = format!("{}. {}", i + 1, e.name);
                    let pts: Vec<[f64; 2]> = o
                        .curve
                        .iter()
                        .map(|q| [sp.to_display(q[0], units), t.to_display(q[1], units)])
                        .collect();
                    p.line(
                        Line::new(name.clone(), PlotPoints::from(pts))
                            .color(colour)
                            .width(2.0),
                    );
                    let now = [
                        sp.to_display(o.result.case.air.speed_m_s, units),
                        t.to_display(o.result.solution.leaf_temp_c, units),
                    ];
                    if now.iter().all(|v| v.is_finite()) {
                        p.points(
                            Points::new(name, vec![now])
                                .shape(MarkerShape::Diamond)
                                .radius(6.0)
                                .filled(true)
                                .color(colour),
                        );
                    }
                    if !limits.iter().any(|l| (l - o.result.limit_c).abs() < 1e-9) {
                        limits.push(o.result.limit_c);
                    }
                }
                for l in limits {
                    p.hline(
                        HLine::new(
                            format!("limit {}", t.format(l, units)),
                            t.to_display(l, units),
                        )
                        .color(LIMIT_COLOUR)
                        .style(LineStyle::dashed_loose())
                        .width(1.5),
                    );
                }
            });
    }

    fn table_ui(&self, ui: &mut Ui, units: UnitSystem) {
        let Some(result) = self.job.result() else {
            return;
        };
        let table = CompareTable::of(result);
        ui.add_space(6.0);
        ui.label(RichText::new("At each entry's own conditions").strong());
        Grid::new("compare-table")
            .striped(true)
            .num_columns(5)
            .show(ui, |ui| {
                ui.label(RichText::new("Entry").strong());
                for (k, (name, better, _)) in COLUMNS.iter().enumerate() {
                    let unit = column_quantity(k).unit(units);
                    let way = match better {
                        Better::Lower => "lower is better",
                        Better::Higher => "higher is better",
                    };
                    ui.label(RichText::new(format!("{}\n[{unit}]", SHORT_HEADERS[k])).strong())
                        .on_hover_text(format!("{name} at the entry's own air speed; {way}."));
                }
                ui.end_row();
                for (i, r) in table.rows.iter().enumerate() {
                    ui.label(
                        RichText::new(format!("{}. {}", i + 1, short_name(&r.name, 14)))
                            .color(PALETTE[i % PALETTE.len()]),
                    )
                    .on_hover_text(&r.name);
                    if let Some(e) = &r.error {
                        ui.label(
                            RichText::new(format!("⚠ Cannot solve: {e}"))
                                .color(crate::gui::fields::ERROR_COLOUR),
                        );
                        ui.end_row();
                        continue;
                    }
                    for k in 0..COLUMNS.len() {
                        let q = column_quantity(k);
                        let mut text = match r.values[k] {
                            Some(v) => fmt_num(q.to_display(v, units), q.decimals(units)),
                            None => "–".to_owned(),
                        };
                        if k == 1 && r.values[1].is_some_and(|m| m < 0.0) {
                            text.push_str(" ✖ over");
                        }
                        if k == 2 && !r.speed_note.is_empty() {
                            text = if r.values[k].is_some() {
                                "none needed".to_owned()
                            } else if r.speed_note.starts_with("not reachable") {
                                "not reachable".to_owned()
                            } else {
                                "–".to_owned()
                            };
                        }
                        if table.best[k][i] {
                            ui.label(RichText::new(format!("★ {text}")).strong());
                        } else {
                            ui.label(text);
                        }
                    }
                    ui.end_row();
                }
            });
        let mut notes = Vec::new();
        for (i, r) in table.rows.iter().enumerate() {
            let words = table.best_words(i);
            if !words.is_empty() {
                notes.push(format!("★ {}. {}: {words}.", i + 1, r.name));
            }
        }
        for (k, (name, _, _)) in COLUMNS.iter().enumerate() {
            if table.all_equal[k] {
                notes.push(format!("{name}: all entries are equal."));
            }
        }
        if !notes.is_empty() {
            ui.label(notes.join(" "));
        }
        ui.label(
            RichText::new("★ marks the best of each column: the coolest leaf, the largest margin below its limit, the least air speed needed to keep its margin, and the lowest transpiration (least water use, though more transpiration also cools the leaf). ✖ over: the leaf is above its limit.")
                .small(),
        );
    }
}

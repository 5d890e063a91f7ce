//! The leaf-shape view: pick a leaf family (or import an outline), set its sizes and the wind
//! direction, see the outline to scale with its chords along the wind, the effective dimension
//! beside the 0.72 × width hand rule, and how it changes with the wind direction; then use the
//! leaf in the scenario.

use std::path::Path;

use egui::{Color32, ComboBox, Grid, RichText, ScrollArea, Slider, SliderClamping, Ui};
use egui_plot::{
    Arrows, HLine, Legend, Line, LineStyle, MarkerShape, Plot, PlotPoints, Points, VLine,
};
use leafwind_physics::case::{FREE_CONVECTION_LENGTH_RANGE_M, LEAF_DIMENSION_RANGE_M};
use leafwind_physics::error::ValidRange;
use leafwind_physics::shape::{
    DEPTH_RANGE, LOBES_RANGE, OUTLINE_SIZE_RANGE_M, outline_from_csv_mm,
};

use crate::document::ScenarioDocument;
use crate::gui::app::DialogMode;
use crate::gui::commands::Command;
use crate::gui::fields::{Field, error_line, field_label, name_widget, number_field, range_error};
use crate::gui::panels::file_prompt::{FileAction, FilePrompt};
use crate::gui::panels::sweep::hover_text;
use crate::gui::worker::Job;
use crate::shape_scenario::{ShapeFamily, ShapeReport, ShapeSection, measure};
use crate::units::{Quantity, UnitSystem, fmt_num};

/// Colour of the outline.
const OUTLINE_COLOUR: Color32 = Color32::from_rgb(40, 130, 60);
/// Colour of the chords and of d_eff.
const CHORD_COLOUR: Color32 = Color32::from_rgb(50, 110, 200);
/// Colour of the wind arrows.
const WIND_COLOUR: Color32 = Color32::from_rgb(200, 90, 30);
/// Colour of the hand rule.
const HAND_RULE_COLOUR: Color32 = Color32::from_rgb(150, 90, 170);

/// Valid wind directions on screen \[°\] (d_eff(θ + 180°) = d_eff(θ), so 0–180° covers all).
const WIND_DEG_RANGE: ValidRange = ValidRange {
    quantity: "wind direction",
    min: 0.0,
    max: 180.0,
    unit: "°",
};

/// Valid leaflet counts (the engine's own range: 1 to 30).
const LEAFLETS_RANGE: ValidRange = ValidRange {
    quantity: "number of leaflets",
    min: 1.0,
    max: 30.0,
    unit: "",
};

/// Square inches per square metre (exact, from the inch of 25.4 mm).
const IN2_PER_M2: f64 = 1.0 / (0.0254 * 0.0254);

/// An area in cm² (SI) or in² (imperial); "–" when not finite.
#[must_use]
pub fn format_area(m2: f64, units: UnitSystem) -> String {
    match units {
        UnitSystem::Si => format!("{} cm²", fmt_num(m2 * 1e4, 1)),
        UnitSystem::Imperial => format!("{} in²", fmt_num(m2 * IN2_PER_M2, 2)),
    }
}

/// A length shown with one more decimal than leaf sizes (d_eff, A/P).
fn fine(m: f64, units: UnitSystem) -> String {
    let q = Quantity::LeafSize;
    q.format_with(m, units, q.decimals(units) + 1)
}

/// "12 % below" / "8 % above" / "the same as": how `a` compares with `b`.
#[must_use]
pub fn compare_words(a: f64, b: f64) -> String {
    if !(a.is_finite() && b.is_finite()) || b <= 0.0 {
        return "not comparable with".to_owned();
    }
    let pct = (a / b - 1.0) * 100.0;
    if pct.abs() < 0.5 {
        "the same as".to_owned()
    } else if pct < 0.0 {
        format!("{:.0} % below", -pct)
    } else {
        format!("{pct:.0} % above")
    }
}

/// A whole-number field (lobes, leaflets) with its range check; returns whether it is valid.
fn count_field(
    ui: &mut Ui,
    label: &str,
    tooltip: &str,
    range: ValidRange,
    slider_max: f64,
    value: &mut usize,
) -> bool {
    let mut v = *value as f64;
    let r = ui
        .horizontal(|ui| {
            field_label(ui, label, tooltip);
            let r = ui
                .add(
                    Slider::new(&mut v, 1.0..=slider_max)
                        .clamping(SliderClamping::Never)
                        .step_by(1.0)
                        .fixed_decimals(0),
                )
                .on_hover_text(tooltip);
            name_widget(ui, &r, label);
            r
        })
        .inner;
    if r.changed() && v.is_finite() {
        *value = v.round().clamp(0.0, 1000.0) as usize;
    }
    let error = range_error(&range, Quantity::Same(""), *value as f64, UnitSystem::Si);
    if let Some(e) = &error {
        error_line(ui, e);
    }
    error.is_none()
}

/// What the panel asks for at the end of its frame.
enum ShapeAction {
    Import,
    ImportPath(std::path::PathBuf),
}

/// State of the leaf-shape view: the shape being edited (saved in the scenario only through
/// "Use this leaf in the scenario"), its measurement job, and the import.
pub struct ShapePanel {
    draft: ShapeSection,
    seen_doc_shape: Option<ShapeSection>,
    job: Job<ShapeSection, ShapeReport>,
    import: FilePrompt,
    import_error: Option<String>,
    import_note: Option<String>,
}

impl std::fmt::Debug for ShapePanel {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("ShapePanel")
            .field("draft", &self.draft)
            .finish_non_exhaustive()
    }
}

impl ShapePanel {
    /// The panel; `inline` computes on the calling thread (tests).
    #[must_use]
    pub fn new(inline: bool) -> Self {
        Self {
            draft: ShapeSection::default(),
            seen_doc_shape: None,
            job: Job::new(measure, inline),
            import: FilePrompt::new(
                "Outline file",
                FileAction::Open,
                ("Outline CSV (x, y in mm)", &["csv", "txt"]),
                "outline.csv",
            ),
            import_error: None,
            import_note: None,
        }
    }

    /// The shape being edited.
    #[must_use]
    pub fn draft(&self) -> &ShapeSection {
        &self.draft
    }

    /// The last valid measurement.
    #[must_use]
    pub fn report(&self) -> Option<&ShapeReport> {
        self.job.result()
    }

    /// The last import error (with its row), if any.
    #[must_use]
    pub fn import_error(&self) -> Option<&str> {
        self.import_error.as_deref()
    }

    /// Reads an outline CSV (x, y in mm); on failure the current shape stays and the error (with
    /// its row) is shown.
    pub fn import_path(&mut self, path: &Path) {
        let read = std::fs::read_to_string(path)
            .map_err(|e| format!("could not read the file: {e}"))
            .and_then(|t| outline_from_csv_mm(&t).map_err(|e| e.to_string()));
        match read {
            Ok(o) => {
                let name = path.file_name().map_or_else(
                    || path.display().to_string(),
                    |f| f.to_string_lossy().into(),
                );
                self.draft = ShapeSection::imported(&o, &name, self.draft.wind_angle_rad);
                self.import_note =
                    Some(format!("Imported {} points from {name}.", o.points().len()));
                self.import_error = None;
            }
            Err(e) => {
                self.import_error = Some(format!(
                    "Could not import the outline: {e}. The shape shown is unchanged. ({})",
                    path.display()
                ));
                self.import_note = None;
            }
        }
    }

    /// Draws the view; returns the edit command of "Use this leaf in the scenario".
    pub fn ui(
        &mut self,
        ui: &mut Ui,
        doc: &ScenarioDocument,
        dialogs: DialogMode,
        units: UnitSystem,
    ) -> Vec<Command> {
        let ctx = ui.ctx().clone();
        // A scenario opened with a shape section shows that shape.
        if self.seen_doc_shape != doc.shape {
            if let Some(s) = &doc.shape {
                self.draft = s.clone();
            }
            self.seen_doc_shape = doc.shape.clone();
        }
        self.job.poll(&ctx);
        let mut commands = Vec::new();
        let mut actions = Vec::new();
        ScrollArea::vertical()
            .id_salt("shape-scroll")
            .auto_shrink([false, false])
            .show(ui, |ui| {
                ui.spacing_mut().slider_width = 110.0;
                let valid = self.controls_ui(ui, units, &mut actions);
                if valid {
                    self.job.submit(self.draft.clone(), &ctx);
                }
                // Side by side when there is room for both plots, else one under the other.
                if ui.available_width() >= 440.0 {
                    ui.columns(2, |cols| {
                        self.outline_plot_ui(&mut cols[0], units);
                        self.direction_plot_ui(&mut cols[1], units);
                    });
                } else {
                    self.outline_plot_ui(ui, units);
                    self.direction_plot_ui(ui, units);
                }
                ui.separator();
                if let Some(c) = self.results_ui(ui, doc, units, valid) {
                    commands.push(c);
                }
            });
        for a in actions {
            match a {
                ShapeAction::Import => {
                    if let Some(p) = self.import.ask(dialogs) {
                        self.import_path(&p);
                    }
                }
                ShapeAction::ImportPath(p) => self.import_path(&p),
            }
        }
        commands
    }

    /// The family, its sizes and the wind; returns whether every field is valid.
    fn controls_ui(
        &mut self,
        ui: &mut Ui,
        units: UnitSystem,
        actions: &mut Vec<ShapeAction>,
    ) -> bool {
        ui.horizontal(|ui| {
            let s = &mut self.draft;
            ui.label("Leaf family").on_hover_text(
                "The outline's kind. The curves are Leafwind's own (a width profile per family), not fitted to any species.",
            );
            let r = ComboBox::from_id_salt("shape-family")
                .selected_text(s.family.label())
                .show_ui(ui, |ui| {
                    for f in ShapeFamily::ALL {
                        if f == ShapeFamily::Imported && s.outline_mm.is_empty() {
                            continue;
                        }
                        ui.selectable_value(&mut s.family, f, f.label());
                    }
                });
            name_widget(ui, &r.response, "Leaf family");
        });
        ui.horizontal_wrapped(|ui| {
            if ui
                .button("Import outline CSV…")
                .on_hover_text("Read an outline: one point per line, x,y in millimetres, in order around the leaf; a header line and # comments are allowed; the last point joins the first.")
                .clicked()
            {
                actions.push(ShapeAction::Import);
            }
        });
        if let Some(p) = self.import.field_ui(ui, "Import") {
            actions.push(ShapeAction::ImportPath(p));
        }
        if let Some(e) = &self.import_error {
            error_line(ui, e);
        }
        if let Some(n) = &self.import_note {
            ui.label(RichText::new(n).small());
        }
        let s = &mut self.draft;
        let mut ok = true;
        let size = Quantity::LeafSize;
        let family = s.family;
        if family == ShapeFamily::Imported {
            ui.label(format!(
                "Outline from {} ({} points); x along the file's x axis.",
                if s.outline_source.is_empty() {
                    "a file"
                } else {
                    &s.outline_source
                },
                s.outline_mm.len()
            ));
        } else {
            let (len_label, len_tip) = if family.is_compound() {
                (
                    "Leaflet length",
                    "Length of each leaflet along its midrib, base to tip.",
                )
            } else if family == ShapeFamily::PalmatelyLobed {
                (
                    "Leaf length",
                    "From the petiole to the tip of the middle lobe (the radius of the lobe tips).",
                )
            } else {
                (
                    "Blade length",
                    "Length of the blade along the midrib, base (petiole end) to tip. Tomato leaflets 30–70 mm, cucumber leaves 150–250 mm.",
                )
            };
            let len_range = ValidRange {
                quantity: "length",
                ..OUTLINE_SIZE_RANGE_M
            };
            number_field(
                ui,
                &Field {
                    label: len_label,
                    quantity: size,
                    range: len_range,
                    slider: (0.005, 0.5),
                    log: true,
                    decimals: None,
                    tooltip: len_tip,
                },
                &mut s.length_m,
                units,
                |_| None,
            );
            ok &= range_error(&len_range, size, s.length_m, units).is_none();
            if family.has_width() {
                let (w_label, w_tip) = if family.is_compound() {
                    ("Leaflet width", "Greatest width of each leaflet.")
                } else {
                    (
                        "Blade width",
                        "Greatest width of the blade, across the midrib.",
                    )
                };
                let w_range = ValidRange {
                    quantity: "width",
                    ..OUTLINE_SIZE_RANGE_M
                };
                number_field(
                    ui,
                    &Field {
                        label: w_label,
                        quantity: size,
                        range: w_range,
                        slider: (0.002, 0.3),
                        log: true,
                        decimals: None,
                        tooltip: w_tip,
                    },
                    &mut s.width_m,
                    units,
                    |_| None,
                );
                ok &= range_error(&w_range, size, s.width_m, units).is_none();
            }
            let count = Quantity::Same("");
            if family.has_lobes() {
                let label = if family == ShapeFamily::Lobed {
                    "Lobes per side"
                } else {
                    "Lobes"
                };
                ok &= count_field(
                    ui,
                    label,
                    "How many rounded lobes (per margin for an oak-like leaf; in all for a maple-like one).",
                    LOBES_RANGE,
                    12.0,
                    &mut s.lobes,
                );
                number_field(
                    ui,
                    &Field {
                        label: "Lobe depth",
                        quantity: count,
                        range: DEPTH_RANGE,
                        slider: (0.0, 0.95),
                        log: false,
                        decimals: Some(2),
                        tooltip: "Share of the half-width (or radius) cut away at each sinus: 0 = entire margin, 0.9 = lobes cut nearly to the midrib.",
                    },
                    &mut s.depth,
                    units,
                    |_| None,
                );
                ok &= range_error(&DEPTH_RANGE, count, s.depth, units).is_none();
            }
            if family.is_compound() {
                let label = if family == ShapeFamily::PinnateCompound {
                    "Leaflet pairs"
                } else {
                    "Leaflets"
                };
                ok &= count_field(
                    ui,
                    label,
                    "Pinnate: pairs of leaflets along the rachis, plus one at the tip. Palmate: leaflets radiating from the petiole.",
                    LEAFLETS_RANGE,
                    10.0,
                    &mut s.leaflets,
                );
            }
        }
        let deg_q = Quantity::Same("°");
        let mut deg = s.wind_angle_rad.to_degrees();
        let before = deg;
        number_field(
            ui,
            &Field {
                label: "Wind direction",
                quantity: deg_q,
                range: WIND_DEG_RANGE,
                slider: (0.0, 180.0),
                log: false,
                decimals: Some(0),
                tooltip: "Direction the air flows, from the midrib (x axis, base to tip): 0° = along the midrib from the petiole to the tip, 90° = across the leaf. 180° gives the same as 0°.",
            },
            &mut deg,
            units,
            |_| None,
        );
        if deg != before {
            s.wind_angle_rad = deg.to_radians();
        }
        ok &= range_error(&WIND_DEG_RANGE, deg_q, deg, units).is_none();
        ok
    }

    /// The numbers, and "Use this leaf in the scenario".
    fn results_ui(
        &self,
        ui: &mut Ui,
        doc: &ScenarioDocument,
        units: UnitSystem,
        fields_valid: bool,
    ) -> Option<Command> {
        if !fields_valid {
            error_line(
                ui,
                "Fix the marked field: the numbers below are for the last valid shape.",
            );
        } else if let Some(e) = self.job.error() {
            error_line(
                ui,
                &format!(
                    "This shape cannot be built: {e}. The numbers below are for the last valid shape."
                ),
            );
        } else if self.job.is_busy() {
            ui.label(RichText::new("Measuring…").small().weak());
        }
        let r = self.job.result()?;
        let m = &r.metrics;
        let len = |v: f64| Quantity::LeafSize.format(v, units);
        ui.label(RichText::new("The leaf as the wind sees it").strong());
        Grid::new("shape-metrics").num_columns(2).striped(true).show(ui, |ui| {
            let mut row = |name: &str, value: String, tip: &str| {
                ui.label(name).on_hover_text(tip);
                ui.label(value).on_hover_text(tip);
                ui.end_row();
            };
            row("Area (one side)", format_area(m.area_m2, units), "One-sided area A of the outline(s).");
            row("Perimeter", len(m.perimeter_m), "Length P of the margin (all leaflets).");
            row("Length along the wind", len(m.length_along_wind_m), "Extent of the leaf in the direction the air flows.");
            row("Width across the wind", len(m.width_across_wind_m), "Extent of the leaf across the air flow.");
            row(
                "Effective dimension d_eff",
                fine(m.effective_dimension_m, units),
                "The flat-plate length with the same mean laminar heat exchange as this outline, each chord along the wind starting its own boundary layer: d_eff = (A / ∫ Σ √c dη)². This is the leaf size the energy balance uses.",
            );
            row(
                "Hand rule 0.72 × width",
                fine(m.hand_rule_dimension_m, units),
                "The usual shortcut d ≈ 0.72 × the width across the wind (Campbell & Norman 1998, ch. 7; factor from memory).",
            );
            if let Some(h) = r.hull_dimension_m {
                row(
                    "Convex hull d_eff",
                    fine(h, units),
                    "The effective dimension of the same outline with its sinuses filled in (a rubber band around it).",
                );
            }
            row(
                "Free-convection length A/P",
                fine(m.free_convection_length_m, units),
                "Area over perimeter, the length for exchange in still air (Incropera et al. 2011, eq. 9.29, L = A/P; from memory).",
            );
            row(
                "Chords on one line (most)",
                format!("{}", r.chords_per_line_max),
                "Most separate pieces one line along the wind cuts from the leaf: 1 for an entire leaf; more where lobes or leaflets restart the boundary layer.",
            );
        });
        let d = m.effective_dimension_m;
        let mut sentence = format!(
            "d_eff {} is {} the hand rule ({})",
            fine(d, units),
            compare_words(d, m.hand_rule_dimension_m),
            fine(m.hand_rule_dimension_m, units)
        );
        if let Some(h) = r.hull_dimension_m {
            sentence.push_str(&format!(
                " and {} the convex hull ({})",
                compare_words(d, h),
                fine(h, units)
            ));
        }
        sentence.push('.');
        ui.label(RichText::new(sentence).strong());
        ui.label(
            RichText::new("The energy balance uses d_eff as the leaf size: the smaller it is, the thinner the boundary layer and the closer the leaf stays to the air temperature.")
                .small(),
        );
        ui.label(format!(
            "Over all wind directions: least {} at {:.0}°, greatest {} at {:.0}°, mean {}.",
            fine(r.min_m.0, units),
            r.min_m.1,
            fine(r.max_m.0, units),
            r.max_m.1,
            fine(r.mean_m, units)
        ));
        ui.add_space(6.0);
        let current = doc.case.leaf;
        let uses = doc.shape.as_ref() == Some(&r.section)
            && (current.dimension_m - d).abs() <= 1e-9 * d.max(1e-9);
        let problem = LEAF_DIMENSION_RANGE_M
            .check(d)
            .err()
            .or_else(|| {
                FREE_CONVECTION_LENGTH_RANGE_M
                    .check(m.free_convection_length_m)
                    .err()
            })
            .map(|e| e.to_string());
        let can_use = fields_valid && self.job.is_current() && problem.is_none();
        let button = ui
            .add_enabled(can_use, egui::Button::new(RichText::new("Use this leaf in the scenario").strong()))
            .on_hover_text("Set the scenario's leaf size along the wind to d_eff and its free-convection length to A/P, and keep this shape in the scenario file.")
            .on_disabled_hover_text("Only a valid, measured shape whose sizes the energy balance accepts can be used.");
        if let Some(p) = &problem {
            error_line(
                ui,
                &format!("The energy balance cannot take this leaf: {p}."),
            );
        }
        if uses {
            ui.label(format!(
                "✔ The scenario uses this leaf: leaf size {} along the wind.",
                fine(current.dimension_m, units)
            ));
        } else {
            ui.label(format!(
                "The scenario's leaf size is now {}; using this leaf sets it to {} and A/P to {}.",
                fine(current.dimension_m, units),
                fine(d, units),
                fine(m.free_convection_length_m, units)
            ));
        }
        if button.clicked() && can_use {
            let mut edited = doc.clone();
            edited.case.leaf = m.apply_to(&doc.case.leaf);
            edited.shape = Some(r.section.clone());
            return Some(Command::Edit(Box::new(edited)));
        }
        None
    }

    fn outline_plot_ui(&self, ui: &mut Ui, units: UnitSystem) {
        let Some(r) = self.job.result() else {
            ui.label("Measuring the leaf…");
            return;
        };
        let q = Quantity::LeafSize;
        let unit = q.unit(units);
        let to = |v: f64| q.to_display(v, units);
        let dec = q.decimals(units) + 1;
        let h1 = (ui.available_width() * 0.9).clamp(200.0, 300.0);
        let angle = r.section.wind_angle_rad;
        ui.label(
            RichText::new(format!(
                "Outline to scale, wind at {:.0}°",
                angle.to_degrees(),
            ))
            .strong(),
        )
        .on_hover_text(format!(
            "{} lines along the wind, evenly spaced across the leaf. Each piece inside the leaf is a chord: its boundary layer starts fresh at the chord's upwind edge, so many short chords (lobes, leaflets) shed heat better than a few long ones.",
            crate::shape_scenario::CHORD_LINES_SHOWN
        ));
        Plot::new("shape-outline")
            .height(h1)
            .data_aspect(1.0)
            .legend(
                Legend::default()
                    .text_style(egui::TextStyle::Small)
                    .background_alpha(0.6)
                    .follow_insertion_order(true)
                    .position(egui_plot::Corner::RightTop),
            )
            .x_axis_label(format!("x along the midrib [{unit}]"))
            .y_axis_label(format!("y across the midrib [{unit}]"))
            .label_formatter(move |p| hover_text(p, unit, unit, dec, dec))
            .show(ui, |p| {
                for (i, o) in r.outlines_m.iter().enumerate() {
                    let pts: Vec<[f64; 2]> = o.iter().map(|xy| [to(xy[0]), to(xy[1])]).collect();
                    p.line(
                        Line::new("leaf outline", PlotPoints::from(pts))
                            .id(("outline", i))
                            .color(OUTLINE_COLOUR)
                            .width(2.0),
                    );
                }
                for (i, c) in r.chords.iter().enumerate() {
                    let pts = vec![[to(c[0][0]), to(c[0][1])], [to(c[1][0]), to(c[1][1])]];
                    p.line(
                        Line::new("chords along the wind", PlotPoints::from(pts))
                            .id(("chord", i))
                            .color(CHORD_COLOUR)
                            .width(1.0),
                    );
                }
                // Three arrows upwind of the leaf, pointing along the wind.
                let (s, c) = angle.sin_cos();
                let all = r.outlines_m.iter().flatten();
                let along = |xy: &[f64; 2]| xy[0] * c + xy[1] * s;
                let across = |xy: &[f64; 2]| -xy[0] * s + xy[1] * c;
                let (mut a0, mut a1, mut e0, mut e1) = (
                    f64::INFINITY,
                    f64::NEG_INFINITY,
                    f64::INFINITY,
                    f64::NEG_INFINITY,
                );
                for xy in all {
                    a0 = a0.min(along(xy));
                    a1 = a1.max(along(xy));
                    e0 = e0.min(across(xy));
                    e1 = e1.max(across(xy));
                }
                if a0.is_finite() && e0.is_finite() {
                    let span = (a1 - a0).max(e1 - e0);
                    let to_xy = |xi: f64, eta: f64| [to(xi * c - eta * s), to(xi * s + eta * c)];
                    let mut origins = Vec::new();
                    let mut tips = Vec::new();
                    for k in [0.2, 0.5, 0.8] {
                        let eta = e0 + k * (e1 - e0);
                        origins.push(to_xy(a0 - 0.35 * span, eta));
                        tips.push(to_xy(a0 - 0.08 * span, eta));
                    }
                    p.arrows(
                        Arrows::new(
                            format!("wind {:.0}°", angle.to_degrees()),
                            PlotPoints::from(origins),
                            PlotPoints::from(tips),
                        )
                        .color(WIND_COLOUR),
                    );
                }
            });
    }

    fn direction_plot_ui(&self, ui: &mut Ui, units: UnitSystem) {
        let Some(r) = self.job.result() else {
            return;
        };
        let q = Quantity::LeafSize;
        let unit = q.unit(units);
        let to = |v: f64| q.to_display(v, units);
        let dec = q.decimals(units) + 1;
        let h2 = (ui.available_width() * 0.9).clamp(200.0, 300.0);
        let angle = r.section.wind_angle_rad;
        ui.label(RichText::new("Leaf size by wind direction").strong())
            .on_hover_text("The effective dimension d_eff and the 0.72 × width hand rule for every wind direction from 0° (along the midrib, petiole to tip) to 180°. The down triangle marks the least, the up triangle the greatest, the dotted line the mean over all directions.");
        let (min, max, mean) = (r.min_m, r.max_m, r.mean_m);
        Plot::new("shape-directions")
            .height(h2)
            .legend(
                Legend::default()
                    .text_style(egui::TextStyle::Small)
                    .background_alpha(0.6)
                    .follow_insertion_order(true)
                    .position(egui_plot::Corner::RightBottom),
            )
            .x_axis_label("Wind direction from the midrib [°]")
            .y_axis_label(format!("Leaf size along the wind [{unit}]"))
            .include_x(0.0)
            .include_x(180.0)
            .include_y(0.0)
            .label_formatter(move |p| hover_text(p, "°", unit, 0, dec))
            .show(ui, |p| {
                let deff: Vec<[f64; 2]> =
                    r.by_direction.iter().map(|&(a, d, _)| [a, to(d)]).collect();
                let hand: Vec<[f64; 2]> =
                    r.by_direction.iter().map(|&(a, _, h)| [a, to(h)]).collect();
                p.line(
                    Line::new("d_eff", PlotPoints::from(deff))
                        .color(CHORD_COLOUR)
                        .width(2.0),
                );
                p.line(
                    Line::new("hand rule 0.72 × width", PlotPoints::from(hand))
                        .color(HAND_RULE_COLOUR)
                        .style(LineStyle::dashed_dense())
                        .width(1.5),
                );
                p.hline(
                    HLine::new(format!("mean {}", fine(mean, units)), to(mean))
                        .color(Color32::GRAY)
                        .style(LineStyle::dotted_loose()),
                );
                p.points(
                    Points::new(
                        format!("least {} ({:.0}°)", fine(min.0, units), min.1),
                        vec![[min.1, to(min.0)]],
                    )
                    .shape(MarkerShape::Down)
                    .radius(7.0)
                    .filled(true)
                    .color(CHORD_COLOUR),
                );
                p.points(
                    Points::new(
                        format!("greatest {} ({:.0}°)", fine(max.0, units), max.1),
                        vec![[max.1, to(max.0)]],
                    )
                    .shape(MarkerShape::Up)
                    .radius(7.0)
                    .filled(true)
                    .color(CHORD_COLOUR),
                );
                p.vline(
                    VLine::new(
                        format!("wind now {:.0}°", angle.to_degrees()),
                        angle.to_degrees(),
                    )
                    .color(WIND_COLOUR)
                    .width(1.5),
                );
            });
    }
}

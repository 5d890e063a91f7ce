//! The "Canopy & day" tab: the crop's structure, the site and moment, the light, an optional
//! greenhouse, the crop limit and a design day — and what the canopy run answers: the least
//! canopy-top air speed and shade, the hottest leaf, the canopy profile and the day hour by hour.
//!
//! The run ([`CanopySection::run`]) is done on a background [`crate::gui::worker::Job`]
//! ([`compute_canopy`]); this panel only draws the last valid result and returns edit commands.

use std::path::{Path, PathBuf};

use egui::{CollapsingHeader, ComboBox, DragValue, RichText, ScrollArea, TextEdit, Ui};
use egui_plot::{HLine, Legend, Line, LineStyle, MarkerShape, Plot, Points, VLine};
use leafwind_physics::air::{AIR_TEMP_RANGE_C, ALTITUDE_RANGE_M, RELATIVE_HUMIDITY_RANGE_PCT};
use leafwind_physics::canopy::{
    CANOPY_HEIGHT_RANGE_M, LAI_RANGE, LAYER_COUNT_RANGE, LEAF_ANGLE_X_RANGE, LeafAngle,
    SEARCH_MAX_RANGE_M_S, WIND_ATTENUATION_RANGE,
};
use leafwind_physics::case::AIR_SPEED_RANGE_M_S;
use leafwind_physics::crops::{CROP_HEAT_LIMITS, HeatLimit, LimitKind};
use leafwind_physics::design_day::{DayHumidity, DesignDay, HourlySeries};

use crate::canopy_scenario::CoolingTable;
use crate::words::{
    hours, no_negative_zero, num, rule_sentence, shade_sentence, show, show_speed, speed_sentence,
    ventilation_sentence,
};
use leafwind_physics::error::ValidRange;
use leafwind_physics::greenhouse::{
    CoverTemperature, HEAT_LOSS_RANGE_W_M2_K, SHADE_FRACTION_RANGE, TRANSMITTANCE_RANGE,
    VENTILATION_DEFAULT_M3_M2_S, VENTILATION_RANGE_M3_M2_S,
};
use leafwind_physics::heat_rules::HeatRule;
use leafwind_physics::radiation::{SHORTWAVE_RANGE_W_M2, SURFACE_TEMP_RANGE_C};
use leafwind_physics::sun::{
    DateTime, LATITUDE_RANGE_DEG, LONGITUDE_RANGE_DEG, UTC_OFFSET_RANGE_H, days_in_month,
};
use leafwind_physics::ventilation::{self};
use leafwind_physics::{Humidity, LeafCase};

use crate::canopy_scenario::{
    CanopyRun, CanopySection, CropChoice, GreenhouseSection, InsideMode, LightAbove,
};
use crate::document::ScenarioDocument;
use crate::gui::commands::Command;
use crate::gui::compute::LimitStatus;
use crate::gui::fields::{
    ERROR_COLOUR, Field, error_line, field_label, name_widget, number_field, range_error,
};
use crate::gui::panels::sweep::{LIMIT_COLOUR, PALETTE, hover_text};
use crate::units::{Quantity, UnitSystem};

// ---------------------------------------------------------------------------------------------
// The background job

/// Everything a canopy run depends on (compared to know when to run again).
#[derive(Debug, Clone, PartialEq)]
pub struct CanopyInput {
    /// The scenario's leaf case: the air at the canopy top, the canopy-top air speed, the leaf.
    pub case: LeafCase,
    /// The canopy section.
    pub section: CanopySection,
    /// The scenario's own leaf limit \[°C\] (used when no crop is chosen).
    pub limit_c: f64,
    /// Margin below the limit \[K\].
    pub margin_k: f64,
    /// Folder of the scenario file (resolves a relative weather file).
    pub dir: Option<PathBuf>,
    /// Circulation-fan power per floor area for the "fans" cooling options \[W m⁻²\].
    pub fan_power_w_m2: f64,
}

impl CanopyInput {
    /// From a document with a canopy section; None without one.
    #[must_use]
    pub fn of(doc: &ScenarioDocument, path: Option<&Path>) -> Option<Self> {
        Some(Self {
            case: doc.case,
            section: doc.canopy.clone()?,
            limit_c: doc.heat_limit_c,
            margin_k: doc.margin_k,
            dir: path.and_then(Path::parent).map(Path::to_path_buf),
            fan_power_w_m2: doc
                .fans
                .as_ref()
                .and_then(|f| leafwind_physics::fans::fan_energy(&f.layout, 24.0).ok())
                .map_or(crate::canopy_scenario::FAN_POWER_DEFAULT_W_M2, |e| {
                    e.power_per_floor_w_m2
                }),
        })
    }
}

/// Runs the canopy section (a design day or a weather year may take a while: run it on a job).
///
/// # Errors
/// The first invalid input, in the engine's words.
pub fn compute_canopy(input: &CanopyInput) -> Result<CanopyRun, String> {
    input
        .section
        .run_with_fans(
            &input.case,
            input.limit_c,
            input.margin_k,
            input.dir.as_deref(),
            input.fan_power_w_m2,
        )
        .map_err(|e| format!("{e:#}"))
}

// ---------------------------------------------------------------------------------------------
// Shared helpers (also used by the fans tab)

/// The page of a tab whose scenario section is missing: a heading, what the section gives, and its
/// "Add …" button. Returns whether the button was clicked.
pub fn missing_section_ui(
    ui: &mut Ui,
    heading: &str,
    explanation: &[&str],
    button: &str,
    tooltip: &str,
) -> bool {
    ui.add_space(8.0);
    ui.heading(heading);
    for text in explanation {
        ui.label(*text);
    }
    ui.add_space(6.0);
    ui.button(button).on_hover_text(tooltip).clicked()
}

/// The row above a section's tab: show or hide its inputs column, and remove the section.
/// Returns whether "Remove" was clicked.
pub fn section_toolbar(
    ui: &mut Ui,
    show_inputs: &mut bool,
    show_label: &str,
    remove: &str,
    remove_tooltip: &str,
) -> bool {
    let mut removed = false;
    ui.horizontal(|ui| {
        ui.checkbox(show_inputs, show_label)
            .on_hover_text("Hide the inputs column to give the plots the full width.");
        ui.separator();
        removed = ui.button(remove).on_hover_text(remove_tooltip).clicked();
    });
    removed
}

/// A section's inputs: a resizable column on the left with its own scroll area.
pub fn inputs_column(ui: &mut Ui, id: &str, add: impl FnOnce(&mut Ui)) {
    egui::Panel::left(format!("{id}-inputs"))
        .resizable(true)
        .default_size(340.0)
        .size_range(300.0..=480.0)
        .show(ui, |ui| {
            ScrollArea::vertical()
                .id_salt(format!("{id}-inputs-scroll"))
                .auto_shrink([false, false])
                .show(ui, |ui| {
                    ui.spacing_mut().slider_width = 100.0;
                    add(ui);
                });
        });
}

/// What a CSV export is asked for.
#[derive(Debug, Clone, PartialEq)]
pub struct ExportPrompt {
    /// Which data (an index the panel knows).
    pub what: usize,
    /// The file path typed.
    pub path: String,
}

/// An "Export … CSV…" button: opens the path field ([`export_prompt_ui`]) for `what`, with the
/// file suggested beside the scenario (else in the current folder).
pub fn export_ui(
    ui: &mut Ui,
    prompt: &mut Option<ExportPrompt>,
    what: usize,
    label: &str,
    default_file: &str,
    dir: Option<&Path>,
) {
    if ui
        .button(label)
        .on_hover_text(
            "Write this plot's data as CSV, in the units on screen (units in the column names).",
        )
        .clicked()
    {
        let folder = dir
            .map(Path::to_path_buf)
            .or_else(|| std::env::current_dir().ok())
            .unwrap_or_default();
        *prompt = Some(ExportPrompt {
            what,
            path: folder.join(default_file).display().to_string(),
        });
    }
}

/// The path field of an export being asked for; returns (what, path) when confirmed.
pub fn export_prompt_ui(
    ui: &mut Ui,
    prompt: &mut Option<ExportPrompt>,
) -> Option<(usize, PathBuf)> {
    let p = prompt.as_mut()?;
    let mut chosen = None;
    let mut close = false;
    ui.label("Export to this CSV file (the full path):");
    let r = ui.add(TextEdit::singleline(&mut p.path).desired_width(f32::INFINITY));
    name_widget(ui, &r, "Export file path");
    ui.horizontal(|ui| {
        if ui.button("Export").clicked() && !p.path.trim().is_empty() {
            chosen = Some((p.what, PathBuf::from(p.path.trim())));
            close = true;
        }
        if ui.button("Cancel").clicked() {
            close = true;
        }
    });
    if close {
        *prompt = None;
    }
    chosen
}

/// A CSV cell: empty when not finite (never "NaN").
#[must_use]
pub fn cell(x: f64) -> String {
    if x.is_finite() {
        format!("{x}")
    } else {
        String::new()
    }
}

/// A CSV column name with its unit.
#[must_use]
pub fn head(name: &str, q: Quantity, units: UnitSystem) -> String {
    let u = q.unit(units);
    if u.is_empty() {
        name.to_owned()
    } else {
        format!("{name} [{u}]")
    }
}

/// Writes a header and rows as CSV to `path`.
///
/// # Errors
/// The file cannot be written (the path named).
pub fn write_csv(path: &Path, header: &[String], rows: &[Vec<String>]) -> anyhow::Result<()> {
    use anyhow::Context as _;
    let f = std::fs::File::create(path)
        .with_context(|| format!("could not create {}", path.display()))?;
    let mut w = csv::Writer::from_writer(f);
    w.write_record(header)?;
    for r in rows {
        w.write_record(r)?;
    }
    w.flush()
        .with_context(|| format!("could not write {}", path.display()))?;
    Ok(())
}

/// A humidity input in the form it is given (relative humidity, dew point or deficit).
pub fn humidity_field(
    ui: &mut Ui,
    label: &str,
    h: &mut Humidity,
    air_temp_c: f64,
    units: UnitSystem,
    tooltip: &str,
) {
    let t = air_temp_c.clamp(AIR_TEMP_RANGE_C.min, AIR_TEMP_RANGE_C.max);
    let check = move |h: Humidity| h.vapour_pressure_kpa(t).err().map(|e| e.to_string());
    match h {
        Humidity::RelativePct(rh) => {
            number_field(
                ui,
                &Field {
                    label,
                    quantity: Quantity::Same("%"),
                    range: RELATIVE_HUMIDITY_RANGE_PCT,
                    slider: (0.0, 100.0),
                    log: false,
                    decimals: Some(0),
                    tooltip,
                },
                rh,
                units,
                |_| None,
            );
        }
        Humidity::DewPointC(d) => {
            let l = format!("{label} (dew point)");
            number_field(
                ui,
                &Field {
                    label: &l,
                    quantity: Quantity::Temperature,
                    range: ValidRange {
                        quantity: "dew point",
                        ..AIR_TEMP_RANGE_C
                    },
                    slider: (-10.0, 35.0),
                    log: false,
                    decimals: None,
                    tooltip,
                },
                d,
                units,
                |v| check(Humidity::DewPointC(v)),
            );
        }
        Humidity::DeficitKpa(v) => {
            let l = format!("{label} (VPD)");
            number_field(
                ui,
                &Field {
                    label: &l,
                    quantity: Quantity::Same("kPa"),
                    range: ValidRange {
                        quantity: "vapour-pressure deficit",
                        min: 0.0,
                        max: 20.0,
                        unit: "kPa",
                    },
                    slider: (0.0, 5.0),
                    log: false,
                    decimals: Some(2),
                    tooltip,
                },
                v,
                units,
                |x| check(Humidity::DeficitKpa(x)),
            );
        }
    }
}

/// A whole-number input (layers, fans, rows) checked against `range`.
pub fn count_field(
    ui: &mut Ui,
    label: &str,
    value: &mut usize,
    range: ValidRange,
    slider: (f64, f64),
    tooltip: &str,
    units: UnitSystem,
) {
    let mut v = *value as f64;
    let before = v;
    let r = ui
        .horizontal(|ui| {
            field_label(ui, label, tooltip);
            let r = ui
                .add(
                    egui::Slider::new(&mut v, slider.0..=slider.1)
                        .clamping(egui::SliderClamping::Never)
                        .integer(),
                )
                .on_hover_text(tooltip);
            name_widget(ui, &r, label);
            r
        })
        .inner;
    if r.changed() && v != before && v.is_finite() {
        *value = v.round().max(0.0) as usize;
    }
    if let Some(e) = range_error(&range, Quantity::Same(""), *value as f64, units) {
        error_line(ui, &e);
    }
}

fn group(ui: &mut Ui, title: &str, open: bool, add: impl FnOnce(&mut Ui)) {
    CollapsingHeader::new(RichText::new(title).strong())
        .default_open(open)
        .show(ui, add);
}

/// The status line of a job: computing, an error (the last valid result stays), or nothing.
pub fn status_line(ui: &mut Ui, busy: bool, error: Option<&str>, stale: bool) {
    if let Some(e) = error {
        ui.label(
            RichText::new(format!(
                "⚠ Could not update: {e}. Showing the last valid result."
            ))
            .color(ERROR_COLOUR),
        );
    } else if stale {
        ui.label(
            RichText::new("⚠ Inputs invalid: showing the last valid result.").color(ERROR_COLOUR),
        );
    } else if busy {
        ui.horizontal(|ui| {
            ui.spinner();
            ui.label(RichText::new("Computing…").weak());
        });
    }
}

// ---------------------------------------------------------------------------------------------
// Sentences in the units on screen

// ---------------------------------------------------------------------------------------------
// The panel

/// Which CSV of this tab.
const EXPORT_PROFILE: usize = 0;
const EXPORT_SERIES: usize = 1;

/// State of the "Canopy & day" tab.
#[derive(Debug, Clone)]
pub struct CanopyPanel {
    /// Show the inputs column.
    pub show_inputs: bool,
    /// An export being asked for.
    pub export: Option<ExportPrompt>,
    /// The outcome of the last export.
    pub export_message: Option<(String, bool)>,
}

impl Default for CanopyPanel {
    fn default() -> Self {
        Self {
            show_inputs: true,
            export: None,
            export_message: None,
        }
    }
}

/// What the app passes to the tab.
pub struct CanopyView<'a> {
    /// The last valid run.
    pub run: Option<&'a CanopyRun>,
    /// Whether a run is in progress.
    pub busy: bool,
    /// The error of the newest run.
    pub error: Option<&'a str>,
    /// Whether the leaf inputs are invalid (no run submitted).
    pub stale: bool,
    /// Folder of the scenario file (where exports are suggested).
    pub dir: Option<&'a Path>,
}

impl CanopyPanel {
    /// Draws the tab; returns edit commands.
    pub fn ui(
        &mut self,
        ui: &mut Ui,
        doc: &ScenarioDocument,
        view: &CanopyView<'_>,
        units: UnitSystem,
    ) -> Vec<Command> {
        let mut commands = Vec::new();
        let Some(section) = &doc.canopy else {
            if missing_section_ui(
                ui,
                "Canopy & day",
                &[
                    "This scenario has no canopy (crop) section. Add one to see the whole crop rather than one leaf: how hot the sunlit and shaded leaves run from the top of the crop to the bottom, the least canopy-top air speed and the least shade that keep the hottest leaf below the crop's limit, and — with a design day — how many hours of a hot day the crop spends over it.",
                    "The section starts from an invented tomato-like crop (leaf area index 3, 2 m tall) at an invented mid-latitude site on 21 July at 14:00, in the open field; switch the greenhouse on to put it under cover.",
                ],
                "Add a canopy (crop) section",
                "Adds a canopy section with default inputs to the scenario (an unsaved edit).",
            ) {
                let mut d = doc.clone();
                d.canopy = Some(CanopySection::default());
                commands.push(Command::Edit(Box::new(d)));
            }
            return commands;
        };
        let mut edited = doc.clone();
        if section_toolbar(
            ui,
            &mut self.show_inputs,
            "Show the canopy inputs",
            "Remove the canopy section",
            "Removes the canopy section from the scenario (an unsaved edit).",
        ) {
            edited.canopy = None;
        }
        if self.show_inputs {
            inputs_column(ui, "canopy", |ui| {
                if let Some(c) = edited.canopy.as_mut() {
                    section_inputs(ui, c, &doc.case, doc.heat_limit_c, units);
                }
            });
        }
        ScrollArea::vertical()
            .id_salt("canopy-results-scroll")
            .auto_shrink([false, false])
            .show(ui, |ui| {
                status_line(ui, view.busy, view.error, view.stale);
                match view.run {
                    Some(run) => self.results(ui, run, section, doc, view.dir, units),
                    None if view.error.is_none() => {
                        ui.horizontal(|ui| {
                            ui.spinner();
                            ui.label("Computing the canopy…");
                        });
                    }
                    None => {}
                }
            });
        if edited != *doc {
            commands.push(Command::Edit(Box::new(edited)));
        }
        commands
    }

    fn results(
        &mut self,
        ui: &mut Ui,
        run: &CanopyRun,
        section: &CanopySection,
        doc: &ScenarioDocument,
        dir: Option<&Path>,
        units: UnitSystem,
    ) {
        let tq = Quantity::Temperature;
        let h = &run.canopy.hottest;
        let n = run.canopy.layers.len();
        ui.label(RichText::new("Sizing answers").strong());
        ui.label(
            RichText::new(format!(
                "{} Now {} (leaf inputs, “Air speed over the leaf”).",
                speed_sentence(&run.speed, units),
                show_speed(doc.case.air.speed_m_s, units)
            ))
            .strong(),
        );
        ui.label(RichText::new(shade_sentence(run.shade.as_ref(), units)).strong());
        let house = doc
            .fans
            .as_ref()
            .map(|f| (f.layout.house_length_m, f.layout.house_width_m));
        ui.label(
            RichText::new(ventilation_sentence(run.ventilation.as_ref(), house, units)).strong(),
        );
        ui.add_space(4.0);
        let margin = h.margin_k.unwrap_or(run.limit.limit_c - h.leaf_temp_c);
        let status = LimitStatus::of(h.leaf_temp_c, run.limit.limit_c, run.margin_k);
        let below = if margin >= 0.0 { "below" } else { "above" };
        ui.label(
            RichText::new(format!(
                "Hottest leaf: {} — a {} leaf in layer {} of {n} from the top ({} above the ground); {} {below} the limit of {}. {}",
                show(tq, h.leaf_temp_c, units),
                if h.sunlit { "sunlit" } else { "shaded" },
                h.layer + 1,
                Quantity::Altitude.format_with(h.height_m, units, 1),
                show(Quantity::TempDiff, margin.abs(), units),
                show(tq, run.limit.limit_c, units),
                status.words(),
            ))
            .strong(),
        );
        let kind = match run.limit.kind {
            LimitKind::Air => "an air-temperature limit (compared with the air around the crop)",
            LimitKind::Tissue => "a leaf (tissue) temperature limit",
        };
        ui.label(
            RichText::new(format!(
                "Limit: {} — {} ({}), {kind}; margin kept {}. Source: {}.",
                show(tq, run.limit.limit_c, units),
                run.limit.crop,
                run.limit.stage,
                show(Quantity::TempDiff, run.margin_k, units),
                run.limit.source
            ))
            .small(),
        );
        let sun = run.sun_elevation_rad.to_degrees();
        let inside = run.inside_air_temp_c.map_or_else(String::new, |t| {
            format!("; inside air {}", show(tq, t, units))
        });
        ui.label(
            RichText::new(format!(
                "Sun {}° above the horizon at {:02}:{:02} on {}-{:02}-{:02}; {} W/m² on the horizontal above the {}{inside}.",
                num(sun, 1),
                section.when.hour,
                section.when.minute,
                section.when.year,
                section.when.month,
                section.when.day,
                num(run.shortwave_above.global_w_m2(), 0),
                if section.greenhouse.is_some() { "cover" } else { "crop" },
            ))
            .small(),
        );
        if sun <= 0.0 {
            ui.label("The sun is below the horizon at this moment: no leaf is sunlit.");
        }
        ui.separator();
        self.export_row(ui, run, dir, units);
        if let Some((m, err)) = &self.export_message {
            let t = RichText::new(if *err { format!("⚠ {m}") } else { m.clone() }).small();
            ui.label(if *err { t.color(ERROR_COLOUR) } else { t });
        }
        let w = ui.available_width();
        let side = w > 460.0;
        let profile_h = 270.0;
        if side {
            ui.horizontal_top(|ui| {
                ui.vertical(|ui| {
                    ui.set_width(w * 0.6);
                    profile_plot(ui, run, units, profile_h);
                });
                ui.vertical(|ui| {
                    ui.set_width(w * 0.38);
                    small_plots(ui, run, units, profile_h * 0.5 - 26.0);
                });
            });
        } else {
            profile_plot(ui, run, units, profile_h);
            small_plots(ui, run, units, 170.0);
        }
        let series = run
            .design_day
            .as_ref()
            .map(|s| ("Design day", s))
            .or_else(|| run.weather.as_ref().map(|(s, _)| ("Weather file", s)));
        if let Some((what, s)) = series {
            ui.add_space(6.0);
            series_block(ui, what, s, units);
            for (over, rules) in [
                ("the design day", &run.design_day_rules),
                ("the weather file", &run.weather_rules),
            ] {
                for o in rules {
                    ui.label(RichText::new(rule_sentence(o, over, units)).strong());
                }
            }
            if let Some((_, errs)) = &run.weather
                && !errs.is_empty()
            {
                ui.label(
                    RichText::new(format!(
                        "⚠ {} rows of the weather file could not be read and were skipped.",
                        errs.len()
                    ))
                    .color(ERROR_COLOUR),
                );
            }
        } else {
            ui.add_space(6.0);
            ui.label(RichText::new("Switch the design day on (inputs, “Design day”) to see the hottest leaf hour by hour over a hot day, and the hours and degree-hours over the limit.").weak());
        }
        if let Some(d) = &run.dew {
            ui.add_space(4.0);
            ui.label(format!(
                "Night dew over the design day: {:.0} h with leaves below the dew point, {:.0} h within {} of it (leaves at the scenario's air speed, seeing what the leaf inputs set above).",
                d.hours_below_dew_point,
                d.hours_below_margin,
                show(Quantity::TempDiff, d.margin_k, units)
            ));
        }
        if let Some(table) = &run.cooling {
            ui.add_space(6.0);
            cooling_table(ui, table, units);
        }
        ui.add_space(4.0);
        ui.label(RichText::new("Caution: the limits are indicative thresholds for planning, not guarantees — damage depends on duration, humidity, cultivar, hardening and water status. Check a heat risk on the crop itself.").small().weak());
    }

    fn export_row(&mut self, ui: &mut Ui, run: &CanopyRun, dir: Option<&Path>, units: UnitSystem) {
        let series = run
            .design_day
            .as_ref()
            .or(run.weather.as_ref().map(|(s, _)| s));
        ui.horizontal_wrapped(|ui| {
            export_ui(
                ui,
                &mut self.export,
                EXPORT_PROFILE,
                "Export profile CSV…",
                "leafwind-canopy-profile.csv",
                dir,
            );
            if series.is_some() {
                export_ui(
                    ui,
                    &mut self.export,
                    EXPORT_SERIES,
                    "Export day CSV…",
                    "leafwind-canopy-day.csv",
                    dir,
                );
            }
        });
        let chosen = export_prompt_ui(ui, &mut self.export);
        if let Some((what, path)) = chosen {
            let r = if what == EXPORT_PROFILE {
                profile_csv(&path, run, units)
            } else {
                match run
                    .design_day
                    .as_ref()
                    .or(run.weather.as_ref().map(|(s, _)| s))
                {
                    Some(s) => series_csv(&path, s, units),
                    None => Err(anyhow::anyhow!("there is no day to export")),
                }
            };
            self.export_message = Some(match r {
                Ok(()) => (format!("Exported {}.", path.display()), false),
                Err(e) => (format!("Export failed: {e:#}"), true),
            });
        }
    }
}

// ---------------------------------------------------------------------------------------------
// Inputs

#[allow(clippy::too_many_lines)]
fn section_inputs(
    ui: &mut Ui,
    c: &mut CanopySection,
    case: &LeafCase,
    own_limit_c: f64,
    units: UnitSystem,
) {
    let same = |u: &'static str| Quantity::Same(u);
    group(ui, "Crop structure", true, |ui| {
        number_field(
            ui,
            &Field {
                label: "Leaf area index",
                quantity: same("m²/m²"),
                range: LAI_RANGE,
                slider: (0.0, 8.0),
                log: false,
                decimals: Some(1),
                tooltip: "Leaf area (one side) per ground area. Young crops 0.5–1, full greenhouse tomato or cucumber 2–4, dense canopies up to 6. Default 3 (an invented tomato-like crop).",
            },
            &mut c.structure.lai,
            units,
            |_| None,
        );
        number_field(
            ui,
            &Field {
                label: "Crop height",
                quantity: Quantity::Altitude,
                range: CANOPY_HEIGHT_RANGE_M,
                slider: (0.05, 5.0),
                log: false,
                decimals: Some(2),
                tooltip: "Height of the canopy top above the ground (or the bench). High-wire greenhouse crops 2–4 m, pot plants 0.1–0.5 m.",
            },
            &mut c.structure.height_m,
            units,
            |_| None,
        );
        count_field(
            ui,
            "Layers",
            &mut c.structure.layers,
            LAYER_COUNT_RANGE,
            (1.0, 60.0),
            "How many horizontal layers the canopy is split into for the profile. 20 is plenty; more only refines the plot.",
            units,
        );
        ui.horizontal(|ui| {
            field_label(
                ui,
                "Leaf angles",
                "How the leaves are inclined: spherical (random, most crops), horizontal (flat leaves, e.g. some pot plants), or ellipsoidal with ratio x (x < 1 more upright, x > 1 flatter; Campbell & Norman 1998, eq. 15.4).",
            );
            let label = match c.structure.leaf_angle {
                LeafAngle::Spherical => "Spherical (random)",
                LeafAngle::Horizontal => "Horizontal",
                LeafAngle::Ellipsoidal(_) => "Ellipsoidal x",
            };
            let mut kind = match c.structure.leaf_angle {
                LeafAngle::Spherical => 0,
                LeafAngle::Horizontal => 1,
                LeafAngle::Ellipsoidal(_) => 2,
            };
            let r = ComboBox::from_id_salt("canopy-leaf-angle")
                .selected_text(label)
                .show_ui(ui, |ui| {
                    ui.selectable_value(&mut kind, 0, "Spherical (random)");
                    ui.selectable_value(&mut kind, 1, "Horizontal");
                    ui.selectable_value(&mut kind, 2, "Ellipsoidal x");
                });
            name_widget(ui, &r.response, "Leaf angles");
            c.structure.leaf_angle = match (kind, c.structure.leaf_angle) {
                (0, _) => LeafAngle::Spherical,
                (1, _) => LeafAngle::Horizontal,
                (_, LeafAngle::Ellipsoidal(x)) => LeafAngle::Ellipsoidal(x),
                _ => LeafAngle::Ellipsoidal(1.0),
            };
        });
        if let LeafAngle::Ellipsoidal(x) = &mut c.structure.leaf_angle {
            number_field(
                ui,
                &Field {
                    label: "Leaf angle ratio x",
                    quantity: same(""),
                    range: LEAF_ANGLE_X_RANGE,
                    slider: (0.1, 10.0),
                    log: true,
                    decimals: Some(2),
                    tooltip: "Ratio of horizontal to vertical semi-axes of the ellipsoidal leaf-angle distribution: 1 spherical, about 0.5–0.8 upright grasses, 2–3 flat-leaved crops (Campbell & Norman 1998, ch. 15; from memory).",
                },
                x,
                units,
                |_| None,
            );
        }
        number_field(
            ui,
            &Field {
                label: "Wind attenuation",
                quantity: same(""),
                range: WIND_ATTENUATION_RANGE,
                slider: (0.0, 6.0),
                log: false,
                decimals: Some(1),
                tooltip: "How fast the air slows into the crop: u(z) = u_top · exp(a (z/h − 1)) (Cionco). About 1 for open canopies to 4 for dense ones; default 2.5 (from memory).",
            },
            &mut c.structure.wind_attenuation,
            units,
            |_| None,
        );
        ui.checkbox(&mut c.structure.scattering, "Leaves scatter light to the shaded leaves")
            .on_hover_text("On: shaded leaves also get the beam scattered by other leaves (de Pury & Farquhar 1997). Off: a black-canopy approximation.");
    });
    group(ui, "Site and moment", true, |ui| {
        let deg = same("°");
        number_field(
            ui,
            &Field {
                label: "Latitude",
                quantity: deg,
                range: LATITUDE_RANGE_DEG,
                slider: (-70.0, 70.0),
                log: false,
                decimals: Some(2),
                tooltip: "Site latitude, north positive.",
            },
            &mut c.site.latitude_deg,
            units,
            |_| None,
        );
        number_field(
            ui,
            &Field {
                label: "Longitude",
                quantity: deg,
                range: LONGITUDE_RANGE_DEG,
                slider: (-180.0, 180.0),
                log: false,
                decimals: Some(2),
                tooltip: "Site longitude, east positive.",
            },
            &mut c.site.longitude_deg,
            units,
            |_| None,
        );
        number_field(
            ui,
            &Field {
                label: "UTC offset",
                quantity: same("h"),
                range: UTC_OFFSET_RANGE_H,
                slider: (-12.0, 14.0),
                log: false,
                decimals: Some(1),
                tooltip: "Offset of the local clock from UTC, including summer time (e.g. +2 for Central European Summer Time).",
            },
            &mut c.site.utc_offset_h,
            units,
            |_| None,
        );
        number_field(
            ui,
            &Field {
                label: "Site altitude (canopy)",
                quantity: Quantity::Altitude,
                range: ALTITUDE_RANGE_M,
                slider: (0.0, 3000.0),
                log: false,
                decimals: None,
                tooltip: "Height of the site above sea level (sets the clear-sky light and the design day's air pressure).",
            },
            &mut c.site.altitude_m,
            units,
            |_| None,
        );
        let before = c.when;
        date_time_row(ui, &mut c.when);
        if c.when != before
            && let Some(d) = &mut c.design_day
        {
            // The design day follows the date of the moment.
            d.date = DateTime::date(c.when.year, c.when.month, c.when.day);
        }
    });
    group(ui, "Light above", true, |ui| {
        let mut kind = match c.light {
            LightAbove::ClearSky => 0,
            LightAbove::Measured { .. } => 1,
            LightAbove::Global { .. } => 2,
        };
        ui.horizontal(|ui| {
            ui.radio_value(&mut kind, 0, "Clear sky")
                .on_hover_text("Clear-sky beam and diffuse light from the sun position (ASHRAE clear-sky model).");
            ui.radio_value(&mut kind, 1, "Measured beam + diffuse")
                .on_hover_text("Measured beam and diffuse on the horizontal, above the cover when there is one.");
            ui.radio_value(&mut kind, 2, "Measured global")
                .on_hover_text("A pyranometer's global horizontal reading, split into beam and diffuse (Erbs et al. 1982).");
        });
        c.light = match (kind, c.light) {
            (0, _) => LightAbove::ClearSky,
            (1, l @ LightAbove::Measured { .. }) | (2, l @ LightAbove::Global { .. }) => l,
            (1, _) => LightAbove::Measured {
                beam_w_m2: 600.0,
                diffuse_w_m2: 150.0,
            },
            _ => LightAbove::Global { global_w_m2: 750.0 },
        };
        let w = Quantity::Same("W/m²");
        let f = |label, tooltip| Field {
            label,
            quantity: w,
            range: SHORTWAVE_RANGE_W_M2,
            slider: (0.0, 1200.0),
            log: false,
            decimals: Some(0),
            tooltip,
        };
        match &mut c.light {
            LightAbove::ClearSky => {}
            LightAbove::Measured {
                beam_w_m2,
                diffuse_w_m2,
            } => {
                number_field(
                    ui,
                    &f(
                        "Beam on the horizontal",
                        "Direct sunlight on a horizontal surface, above the cover. Clear summer noon 600–900 W/m².",
                    ),
                    beam_w_m2,
                    units,
                    |_| None,
                );
                number_field(
                    ui,
                    &f(
                        "Diffuse on the horizontal",
                        "Sky light on a horizontal surface, above the cover. Clear sky 80–150 W/m², overcast up to 400 W/m².",
                    ),
                    diffuse_w_m2,
                    units,
                    |_| None,
                );
            }
            LightAbove::Global { global_w_m2 } => {
                number_field(
                    ui,
                    &f(
                        "Global on the horizontal",
                        "Total sunlight on a horizontal surface (a pyranometer reading), above the cover. Clear summer noon 800–1000 W/m².",
                    ),
                    global_w_m2,
                    units,
                    |_| None,
                );
            }
        }
    });
    group(ui, "Greenhouse", true, |ui| {
        let mut on = c.greenhouse.is_some();
        ui.checkbox(&mut on, "Under a greenhouse cover")
            .on_hover_text("On: the crop grows under a cover (glass, film, shade house); the light is reduced by the cover and the shade screen can be sized.");
        if on != c.greenhouse.is_some() {
            c.greenhouse = on.then(|| GreenhouseSection {
                cover: leafwind_physics::greenhouse::Cover::default(),
                shade_fraction: 0.0,
                outside_air_temp_c: case.air.temp_c,
                outside_humidity: Humidity::RelativePct(50.0),
                inside: InsideMode::ScenarioAir,
                design_rise_k: ventilation::FACTOR_REFERENCE_RISE_K,
            });
        }
        if let Some(g) = &mut c.greenhouse {
            greenhouse_inputs(ui, g, case, units);
        }
    });
    group(ui, "Crop heat limit", true, |ui| {
        crop_limit_row(ui, c, own_limit_c, units);
    });
    group(ui, "Heat rules", !c.heat_rules.is_empty(), |ui| {
        heat_rules_editor(ui, c, units);
    });
    group(ui, "Design day", true, |ui| {
        let mut on = c.design_day.is_some();
        ui.checkbox(&mut on, "Run a design day (24 hours)")
            .on_hover_text("On: the hottest leaf is computed hour by hour over a hot day on the date above, with the air following the ASHRAE 2009 daily shape between the minimum and the maximum.");
        if on != c.design_day.is_some() {
            c.design_day = on.then(|| DesignDay {
                date: DateTime::date(c.when.year, c.when.month, c.when.day),
                ..DesignDay::default()
            });
        }
        if let Some(d) = &mut c.design_day {
            design_day_inputs(ui, d, units);
        }
    });
    group(ui, "Weather file", false, |ui| {
        let mut text = c
            .weather_csv
            .as_ref()
            .map(|p| p.display().to_string())
            .unwrap_or_default();
        ui.horizontal(|ui| {
            field_label(
                ui,
                "Weather CSV",
                "A logger or weather-service file run row by row like the design day, hourly or finer (a climate computer's 5 or 15 min): each row stands for the file's logging step, so hours over the limit are clock hours and a gap in the record is not counted. Columns: time (YYYY-MM-DD HH:MM, local clock), air_temp_c, rh_pct, wind_m_s, shortwave_w_m2, optionally pressure_kpa. A path relative to the scenario file's folder, or absolute. Rows that cannot be read are listed and skipped; the others still run. Empty: no weather file.",
            );
            let r = ui.add(
                egui::TextEdit::singleline(&mut text)
                    .desired_width(200.0)
                    .hint_text("weather.csv"),
            );
            name_widget(ui, &r, "Weather CSV");
            if r.changed() {
                let t = text.trim();
                c.weather_csv = (!t.is_empty()).then(|| PathBuf::from(t));
            }
        });
    });
    group(ui, "Search", false, |ui| {
        number_field(
            ui,
            &Field {
                label: "Fastest canopy-top speed tried",
                quantity: Quantity::Speed,
                range: SEARCH_MAX_RANGE_M_S,
                slider: (0.5, 10.0),
                log: false,
                decimals: None,
                tooltip: "Upper end of the search for the least canopy-top air speed. 5 m/s is beyond any circulation fan's effect at the crop (common practice, no source).",
            },
            &mut c.max_search_speed_m_s,
            units,
            |_| None,
        );
    });
    if let Some(w) = &c.weather_csv {
        ui.label(
            RichText::new(format!(
                "Weather file: {} (set in the scenario file).",
                w.display()
            ))
            .small(),
        );
    }
}

fn date_time_row(ui: &mut Ui, when: &mut DateTime) {
    ui.horizontal(|ui| {
        field_label(
            ui,
            "Date",
            "Date of the moment shown in the canopy profile (local calendar).",
        );
        let r = ui.add(DragValue::new(&mut when.year).range(1900..=2100));
        name_widget(ui, &r, "Year");
        let r = ui.add(DragValue::new(&mut when.month).range(1..=12).prefix("m "));
        name_widget(ui, &r, "Month");
        let max_day = days_in_month(when.year, when.month.clamp(1, 12));
        let r = ui.add(
            DragValue::new(&mut when.day)
                .range(1..=max_day)
                .prefix("d "),
        );
        name_widget(ui, &r, "Day");
    });
    ui.horizontal(|ui| {
        field_label(
            ui,
            "Clock time",
            "Local clock time of the moment (with the UTC offset above).",
        );
        let r = ui.add(DragValue::new(&mut when.hour).range(0..=23).suffix(" h"));
        name_widget(ui, &r, "Hour");
        let r = ui.add(
            DragValue::new(&mut when.minute)
                .range(0..=59)
                .suffix(" min"),
        );
        name_widget(ui, &r, "Minute");
    });
    if let Err(e) = when.validate() {
        error_line(ui, &e.to_string());
    }
}

fn greenhouse_inputs(ui: &mut Ui, g: &mut GreenhouseSection, case: &LeafCase, units: UnitSystem) {
    let same = |u: &'static str| Quantity::Same(u);
    let mut pct = g.cover.transmittance * 100.0;
    let before = pct;
    number_field(
        ui,
        &Field {
            label: "Cover transmittance",
            quantity: same("%"),
            range: ValidRange {
                min: TRANSMITTANCE_RANGE.min * 100.0,
                max: TRANSMITTANCE_RANGE.max * 100.0,
                unit: "%",
                ..TRANSMITTANCE_RANGE
            },
            slider: (0.0, 100.0),
            log: false,
            decimals: Some(0),
            tooltip: "Share of the sunlight the cover and its structure let through. Clean glass about 90 %, a glass house with its structure about 70 %, aged film 60–75 % (common practice, no source).",
        },
        &mut pct,
        units,
        |_| None,
    );
    if pct != before {
        g.cover.transmittance = pct / 100.0;
    }
    ui.horizontal(|ui| {
        field_label(
            ui,
            "Cover temperature",
            "The temperature of the cover the leaves see for longwave: measured (an infrared thermometer on the glass), or halfway between the inside and the outside air (common practice, no source).",
        );
        let mut given = matches!(g.cover.temperature, CoverTemperature::GivenC(_));
        ui.radio_value(&mut given, true, "given");
        ui.radio_value(&mut given, false, "mean of inside and outside");
        if given != matches!(g.cover.temperature, CoverTemperature::GivenC(_)) {
            g.cover.temperature = if given {
                CoverTemperature::GivenC(case.air.temp_c)
            } else {
                CoverTemperature::MeanOfInsideAndOutside
            };
        }
    });
    if let CoverTemperature::GivenC(t) = &mut g.cover.temperature {
        number_field(
            ui,
            &Field {
                label: "Cover at",
                quantity: Quantity::Temperature,
                range: SURFACE_TEMP_RANGE_C,
                slider: (0.0, 50.0),
                log: false,
                decimals: None,
                tooltip: "Temperature of the cover's inner face. On a sunny day a few kelvin above the inside air; on a clear night several kelvin below.",
            },
            t,
            units,
            |_| None,
        );
    }
    number_field(
        ui,
        &Field {
            label: "Cover heat loss",
            quantity: same("W/m²/K"),
            range: HEAT_LOSS_RANGE_W_M2_K,
            slider: (0.0, 12.0),
            log: false,
            decimals: Some(1),
            tooltip: "Heat lost through the cover per floor area per kelvin inside − outside. Single glass or film about 7.5, double film about 4–5 (from memory).",
        },
        &mut g.cover.heat_loss_w_m2_k,
        units,
        |_| None,
    );
    let mut shade = g.shade_fraction * 100.0;
    let before = shade;
    number_field(
        ui,
        &Field {
            label: "Shade fraction",
            quantity: same("%"),
            range: ValidRange {
                min: 0.0,
                max: 100.0,
                unit: "%",
                ..SHADE_FRACTION_RANGE
            },
            slider: (0.0, 100.0),
            log: false,
            decimals: Some(0),
            tooltip: "Share of the light the shade screen or whitewash holds back. Screens are sold as 20–70 % shade.",
        },
        &mut shade,
        units,
        |_| None,
    );
    if shade != before {
        g.shade_fraction = shade / 100.0;
    }
    number_field(
        ui,
        &Field {
            label: "Outside air temperature",
            quantity: Quantity::Temperature,
            range: AIR_TEMP_RANGE_C,
            slider: (-10.0, 45.0),
            log: false,
            decimals: None,
            tooltip: "Air temperature outside the greenhouse (shaded, ventilated reading).",
        },
        &mut g.outside_air_temp_c,
        units,
        |_| None,
    );
    let t_out = g.outside_air_temp_c;
    humidity_field(
        ui,
        "Outside humidity",
        &mut g.outside_humidity,
        t_out,
        units,
        "Humidity of the outside air (relative humidity at the outside temperature).",
    );
    ui.horizontal(|ui| {
        field_label(
            ui,
            "Inside air",
            "The air around the crop: the scenario's own air (as measured, from the leaf inputs), or computed from a steady ventilation balance with the outside air.",
        );
        let mut vent = matches!(g.inside, InsideMode::Ventilated { .. });
        ui.radio_value(&mut vent, false, "scenario's air");
        ui.radio_value(&mut vent, true, "ventilated");
        if vent != matches!(g.inside, InsideMode::Ventilated { .. }) {
            g.inside = if vent {
                InsideMode::Ventilated {
                    rate_m3_m2_s: VENTILATION_DEFAULT_M3_M2_S,
                }
            } else {
                InsideMode::ScenarioAir
            };
        }
    });
    match &mut g.inside {
        InsideMode::ScenarioAir => {
            ui.horizontal(|ui| {
                ui.add_space(crate::gui::fields::LABEL_WIDTH + 8.0);
                ui.label(
                    RichText::new(format!(
                        "= {} (leaf inputs, “Air”)",
                        show(Quantity::Temperature, case.air.temp_c, units)
                    ))
                    .small()
                    .weak(),
                );
            });
        }
        InsideMode::Ventilated { rate_m3_m2_s } => {
            number_field(
                ui,
                &Field {
                    label: "Ventilation rate",
                    quantity: Quantity::VentilationRate,
                    range: VENTILATION_RANGE_M3_M2_S,
                    slider: (0.001, 0.1),
                    log: true,
                    decimals: None,
                    tooltip: "Outside air the exhaust fans or vents exchange, per floor area: the fans' total rated flow divided by the floor area. Summer cooling designs use about 0.04–0.05 m³/s per m² of floor (8–10 cfm per ft²; ASHRAE, ASABE EP406; from memory).",
                },
                rate_m3_m2_s,
                units,
                |_| None,
            );
        }
    }
    number_field(
        ui,
        &Field {
            label: "Allowed rise of the air",
            quantity: Quantity::TempDiff,
            range: ventilation::RISE_RANGE_K,
            slider: (1.0, 10.0),
            log: false,
            decimals: Some(1),
            tooltip: "How much warmer than the outside air the ventilation design lets the air leaving the house be (inlet to outlet). The ventilation standard's reference is 4 K (7 °F); a smaller rise needs more fan capacity. Used for the ventilation answers.",
        },
        &mut g.design_rise_k,
        units,
        |_| None,
    );
}

fn crop_limit_row(ui: &mut Ui, c: &mut CanopySection, own_limit_c: f64, units: UnitSystem) {
    let own = format!(
        "This scenario's own limit ({}, leaf)",
        show(Quantity::Temperature, own_limit_c, units)
    );
    // The user's own limits first, then the built-in table.
    let entries: Vec<HeatLimit> = c
        .own_limits
        .iter()
        .cloned()
        .chain(CROP_HEAT_LIMITS.iter().cloned())
        .collect();
    let current = c.crop.as_ref().and_then(|ch| {
        entries.iter().position(|l| {
            l.crop.eq_ignore_ascii_case(&ch.crop)
                && l.stage.to_lowercase().starts_with(&ch.stage.to_lowercase())
        })
    });
    let n_own = c.own_limits.len();
    let entry_text = |i: usize| {
        let l = &entries[i];
        format!(
            "{}{} — {} ({} {})",
            if i < n_own { "yours: " } else { "" },
            l.crop,
            l.stage,
            l.kind.word(),
            show(Quantity::Temperature, l.limit_c, units)
        )
    };
    let selected = match (&c.crop, current) {
        (None, _) => own.clone(),
        (Some(_), Some(i)) => entry_text(i),
        (Some(ch), None) => format!("{} — {} (not in the lists)", ch.crop, ch.stage),
    };
    let mut choice: Option<usize> = current;
    let was_own = c.crop.is_none();
    let mut own_chosen = was_own;
    ui.horizontal(|ui| {
        field_label(
            ui,
            "Crop limit",
            "Which temperature the hottest leaf is held below: the scenario's own leaf limit (leaf inputs, “Crop heat limit”), one of your own crop limits (below), or a built-in crop and stage (hover an entry for its source). Air limits are compared with the air around the crop as the engine states.",
        );
        let r = ComboBox::from_id_salt("canopy-crop-limit")
            .selected_text(RichText::new(selected).small())
            .width(180.0)
            .show_ui(ui, |ui| {
                if ui
                    .selectable_label(was_own, own.clone())
                    .on_hover_text("The limit and margin of the leaf inputs, taken as a leaf (tissue) temperature.")
                    .clicked()
                {
                    own_chosen = true;
                    choice = None;
                }
                for (i, l) in entries.iter().enumerate() {
                    if ui
                        .selectable_label(current == Some(i), entry_text(i))
                        .on_hover_text(format!(
                            "{} — {}: {} {} limit.\nSource: {}",
                            l.crop,
                            l.stage,
                            show(Quantity::Temperature, l.limit_c, units),
                            l.kind.word(),
                            l.source
                        ))
                        .clicked()
                    {
                        own_chosen = false;
                        choice = Some(i);
                    }
                }
            });
        name_widget(ui, &r.response, "Crop limit");
    });
    if own_chosen {
        c.crop = None;
    } else if let Some(i) = choice
        && current != Some(i)
    {
        let l = &entries[i];
        c.crop = Some(CropChoice {
            crop: l.crop.to_string(),
            stage: l.stage.to_string(),
        });
    }
    if let Some(i) = current {
        ui.label(
            RichText::new(format!("Source: {}", entries[i].source))
                .small()
                .weak(),
        );
    }
    own_limits_editor(ui, c, units);
}

/// Add, edit and remove the user's own crop limits (kept in the scenario file).
fn own_limits_editor(ui: &mut Ui, c: &mut CanopySection, units: UnitSystem) {
    ui.collapsing(format!("Your own crop limits ({})", c.own_limits.len()), |ui| {
        let mut remove = None;
        for (i, l) in c.own_limits.iter_mut().enumerate() {
            ui.push_id(("own-limit", i), |ui| {
                let mut crop = l.crop.to_string();
                let mut stage = l.stage.to_string();
                let mut source = l.source.to_string();
                ui.horizontal(|ui| {
                    let r = ui.add(egui::TextEdit::singleline(&mut crop).desired_width(90.0));
                    name_widget(ui, &r, "Own limit crop");
                    let r = ui.add(egui::TextEdit::singleline(&mut stage).desired_width(110.0));
                    name_widget(ui, &r, "Own limit stage");
                    if ui.small_button("Remove").clicked() {
                        remove = Some(i);
                    }
                });
                number_field(
                    ui,
                    &Field {
                        label: "Own limit",
                        quantity: Quantity::Temperature,
                        range: leafwind_physics::required_wind::LIMIT_RANGE_C,
                        slider: (20.0, 50.0),
                        log: false,
                        decimals: Some(1),
                        tooltip: "Your limit for this crop and stage.",
                    },
                    &mut l.limit_c,
                    units,
                    |_| None,
                );
                ui.horizontal(|ui| {
                    ui.radio_value(&mut l.kind, LimitKind::Tissue, "leaf (tissue)");
                    ui.radio_value(&mut l.kind, LimitKind::Air, "air");
                });
                ui.horizontal(|ui| {
                    ui.label(RichText::new("Source").small());
                    let r = ui.add(egui::TextEdit::singleline(&mut source).desired_width(220.0));
                    name_widget(ui, &r, "Own limit source");
                });
                if crop != l.crop || stage != l.stage || source != l.source {
                    l.crop = crop.into();
                    l.stage = stage.into();
                    l.source = source.into();
                }
                ui.separator();
            });
        }
        if let Some(i) = remove {
            c.own_limits.remove(i);
        }
        if ui
            .button("Add my own crop limit")
            .on_hover_text("A crop and stage with your own limit and where it comes from; saved with the scenario and offered in the list above.")
            .clicked()
        {
            c.own_limits.push(HeatLimit::user(
                "my crop",
                "my stage",
                35.0,
                LimitKind::Tissue,
            ));
        }
    });
}

/// The heat rules with durations: one row each, read as the grower says it ("3 h above 40 °C
/// (air) on 2 days"), with "in a row" for the hours and for the days.
fn heat_rules_editor(ui: &mut Ui, c: &mut CanopySection, units: UnitSystem) {
    ui.label(
        RichText::new("Rules with durations, as your crop adviser or your records state them, checked over the design day and the weather file. Thresholds and durations are yours (common practice, no source).")
            .small()
            .weak(),
    );
    let tq = Quantity::Temperature;
    let mut remove = None;
    for (i, r) in c.heat_rules.iter_mut().enumerate() {
        ui.push_id(("heat-rule", i), |ui| {
            ui.horizontal_wrapped(|ui| {
                let h = ui.add(egui::DragValue::new(&mut r.hours).range(1..=24).suffix(" h"));
                name_widget(ui, &h, "Rule hours");
                ui.checkbox(&mut r.hours_in_a_row, "in a row")
                    .on_hover_text("On: the hours must be one unbroken run within a day. Off: they are added up over the day.");
                ui.label("above");
                let mut shown = tq.to_display(r.above_c, units);
                let t = ui.add(
                    egui::DragValue::new(&mut shown)
                        .speed(0.1)
                        .fixed_decimals(1)
                        .suffix(format!(" {}", tq.unit(units))),
                );
                name_widget(ui, &t, "Rule threshold");
                if t.changed() && shown.is_finite() {
                    r.above_c = tq.from_display(shown, units);
                }
                let k = egui::ComboBox::from_id_salt("rule-kind")
                    .selected_text(match r.temperature {
                        LimitKind::Air => "air",
                        LimitKind::Tissue => "hottest leaf",
                    })
                    .show_ui(ui, |ui| {
                        ui.selectable_value(&mut r.temperature, LimitKind::Air, "air around the crop");
                        ui.selectable_value(&mut r.temperature, LimitKind::Tissue, "hottest leaf");
                    });
                name_widget(ui, &k.response, "Rule temperature");
                ui.label("on");
                let d = ui.add(egui::DragValue::new(&mut r.days).range(1..=366).suffix(" days"));
                name_widget(ui, &d, "Rule days");
                ui.checkbox(&mut r.days_in_a_row, "in a row")
                    .on_hover_text("On: the days must follow one another. Off: they are counted over the whole series.");
                if ui.small_button("Remove").clicked() {
                    remove = Some(i);
                }
            });
            if let Err(e) = r.validate() {
                error_line(ui, &e.to_string());
            }
        });
    }
    if let Some(i) = remove {
        c.heat_rules.remove(i);
    }
    if ui
        .button("Add a heat rule")
        .on_hover_text("A rule such as “3 h above 40 °C on 2 days”; saved with the scenario.")
        .clicked()
    {
        c.heat_rules.push(HeatRule::default());
    }
}

fn design_day_inputs(ui: &mut Ui, d: &mut DesignDay, units: UnitSystem) {
    let t = |label, tooltip| Field {
        label,
        quantity: Quantity::Temperature,
        range: AIR_TEMP_RANGE_C,
        slider: (0.0, 45.0),
        log: false,
        decimals: None,
        tooltip,
    };
    number_field(
        ui,
        &t(
            "Day maximum",
            "Highest outside air temperature of the day (a design value, e.g. the 1 % summer design dry-bulb of the site).",
        ),
        &mut d.max_temp_c,
        units,
        |_| None,
    );
    let max = d.max_temp_c;
    number_field(
        ui,
        &t(
            "Day minimum",
            "Lowest outside air temperature of the day (near dawn); not above the maximum.",
        ),
        &mut d.min_temp_c,
        units,
        move |v| (v > max).then(|| "The day minimum is above the day maximum".to_owned()),
    );
    ui.horizontal(|ui| {
        field_label(
            ui,
            "Day humidity as",
            "The day's moisture, held at one vapour pressure all day: the lowest relative humidity (at the maximum temperature) or the dew point.",
        );
        let mut rh = matches!(d.humidity, DayHumidity::MinRhPct(_));
        ui.radio_value(&mut rh, true, "lowest RH");
        ui.radio_value(&mut rh, false, "dew point");
        if rh != matches!(d.humidity, DayHumidity::MinRhPct(_)) {
            d.humidity = if rh {
                DayHumidity::MinRhPct(40.0)
            } else {
                DayHumidity::DewPointC(d.min_temp_c - 2.0)
            };
        }
    });
    match &mut d.humidity {
        DayHumidity::MinRhPct(rh) => {
            number_field(
                ui,
                &Field {
                    label: "Lowest relative humidity",
                    quantity: Quantity::Same("%"),
                    range: RELATIVE_HUMIDITY_RANGE_PCT,
                    slider: (5.0, 100.0),
                    log: false,
                    decimals: Some(0),
                    tooltip: "Relative humidity at the day's maximum temperature (the day's lowest).",
                },
                rh,
                units,
                |_| None,
            );
        }
        DayHumidity::DewPointC(dp) => {
            number_field(
                ui,
                &Field {
                    label: "Day dew point",
                    quantity: Quantity::Temperature,
                    range: ValidRange {
                        quantity: "dew point",
                        ..AIR_TEMP_RANGE_C
                    },
                    slider: (-10.0, 30.0),
                    log: false,
                    decimals: None,
                    tooltip: "Dew point of the day's air, held all day; not above the day minimum for a dry morning.",
                },
                dp,
                units,
                move |v| (v > max).then(|| "The dew point is above the day maximum".to_owned()),
            );
        }
    }
    number_field(
        ui,
        &Field {
            label: "Day wind",
            quantity: Quantity::Speed,
            range: AIR_SPEED_RANGE_M_S,
            slider: (0.0, 8.0),
            log: false,
            decimals: None,
            tooltip: "Wind speed of the day over an open-field crop (under cover the canopy-top speed of the leaf inputs is used).",
        },
        &mut d.wind_m_s,
        units,
        |_| None,
    );
}

// ---------------------------------------------------------------------------------------------
// Plots

/// Colour of the sunlit leaves.
const SUNLIT_COLOUR: egui::Color32 = egui::Color32::from_rgb(220, 90, 40);
/// Colour of the shaded leaves.
const SHADED_COLOUR: egui::Color32 = egui::Color32::from_rgb(50, 120, 200);
/// Colour of the air.
const AIR_COLOUR: egui::Color32 = egui::Color32::from_rgb(120, 120, 120);

fn profile_plot(ui: &mut Ui, run: &CanopyRun, units: UnitSystem, height: f32) {
    let tq = Quantity::Temperature;
    let zq = Quantity::Altitude;
    let (t_unit, z_unit) = (tq.unit(units), zq.unit(units));
    ui.label(RichText::new("Leaf temperature through the canopy").strong());
    let layers = &run.canopy.layers;
    let sunlit: Vec<[f64; 2]> = layers
        .iter()
        .filter_map(|l| {
            l.sunlit_leaf_temp_c
                .filter(|t| t.is_finite())
                .map(|t| [tq.to_display(t, units), zq.to_display(l.height_m, units)])
        })
        .collect();
    let shaded: Vec<[f64; 2]> = layers
        .iter()
        .filter(|l| l.shaded_leaf_temp_c.is_finite())
        .map(|l| {
            [
                tq.to_display(l.shaded_leaf_temp_c, units),
                zq.to_display(l.height_m, units),
            ]
        })
        .collect();
    let top = layers.first().map_or(1.0, |l| {
        l.height_m + 0.5 * l.height_m / layers.len().max(1) as f64
    });
    let h = run.canopy.hottest;
    let limit = run.limit.limit_c;
    Plot::new("canopy-profile")
        .height(height)
        .legend(
            Legend::default()
                .follow_insertion_order(true)
                .text_style(egui::TextStyle::Small)
                .position(egui_plot::Corner::LeftTop),
        )
        .x_axis_label(format!("Leaf temperature [{t_unit}]"))
        .y_axis_label(format!("Height [{z_unit}]"))
        .include_y(0.0)
        // Head room above the canopy top for the legend.
        .include_y(zq.to_display(1.55 * top, units))
        .include_x(tq.to_display(limit, units) + 0.5)
        .label_formatter(move |p| hover_text(p, t_unit, z_unit, 1, 2))
        .show(ui, |p| {
            p.line(
                Line::new("sunlit leaves", sunlit.clone())
                    .color(SUNLIT_COLOUR)
                    .width(2.5),
            );
            p.points(
                Points::new("sunlit leaves", sunlit)
                    .color(SUNLIT_COLOUR)
                    .radius(2.5),
            );
            p.line(
                Line::new("shaded leaves", shaded.clone())
                    .color(SHADED_COLOUR)
                    .width(2.0),
            );
            p.points(
                Points::new("shaded leaves", shaded)
                    .color(SHADED_COLOUR)
                    .radius(2.0),
            );
            p.vline(
                VLine::new(
                    format!("air {}", show(tq, run.canopy.air_temp_c, units)),
                    tq.to_display(run.canopy.air_temp_c, units),
                )
                .color(AIR_COLOUR)
                .style(LineStyle::dashed_dense())
                .width(1.5),
            );
            p.vline(
                VLine::new(
                    format!("limit {}", show(tq, limit, units)),
                    tq.to_display(limit, units),
                )
                .color(LIMIT_COLOUR)
                .width(1.5),
            );
            p.vline(
                VLine::new("limit − margin", tq.to_display(limit - run.margin_k, units))
                    .color(LIMIT_COLOUR)
                    .style(LineStyle::dashed_loose())
                    .width(1.0),
            );
            if h.leaf_temp_c.is_finite() {
                p.points(
                    Points::new(
                        format!("hottest leaf {}", show(tq, h.leaf_temp_c, units)),
                        vec![[
                            tq.to_display(h.leaf_temp_c, units),
                            zq.to_display(h.height_m, units),
                        ]],
                    )
                    .shape(MarkerShape::Diamond)
                    .radius(7.0)
                    .color(egui::Color32::from_rgb(170, 30, 30))
                    .filled(true),
                );
            }
        });
}

fn small_plots(ui: &mut Ui, run: &CanopyRun, units: UnitSystem, height: f32) {
    let sp = Quantity::Speed;
    let zq = Quantity::Altitude;
    let (s_unit, z_unit) = (sp.unit(units), zq.unit(units));
    let layers = &run.canopy.layers;
    let speed: Vec<[f64; 2]> = layers
        .iter()
        .filter(|l| l.air_speed_m_s.is_finite())
        .map(|l| {
            [
                sp.to_display(l.air_speed_m_s, units),
                zq.to_display(l.height_m, units),
            ]
        })
        .collect();
    let sun: Vec<[f64; 2]> = layers
        .iter()
        .filter(|l| l.sunlit_fraction.is_finite())
        .map(|l| [100.0 * l.sunlit_fraction, zq.to_display(l.height_m, units)])
        .collect();
    let link = egui::Id::unique("canopy-height-link");
    let s_dec = sp.decimals(units);
    ui.label(RichText::new("Air speed in the crop").strong());
    Plot::new("canopy-speed")
        .height(height)
        .legend(Legend::default())
        .x_axis_label(format!("Air speed [{s_unit}]"))
        .y_axis_label(format!("Height [{z_unit}]"))
        .include_x(0.0)
        .include_y(0.0)
        .link_axis(link, [false, true])
        .label_formatter(move |p| hover_text(p, s_unit, z_unit, s_dec, 2))
        .show(ui, |p| {
            p.line(Line::new("air speed", speed).color(PALETTE[2]).width(2.0));
        });
    ui.label(RichText::new("Share of leaves in the sun").strong());
    Plot::new("canopy-sunlit")
        .height(height)
        .legend(Legend::default())
        .x_axis_label("Sunlit leaves [%]")
        .y_axis_label(format!("Height [{z_unit}]"))
        .include_x(0.0)
        .include_x(100.0)
        .include_y(0.0)
        .link_axis(link, [false, true])
        .label_formatter(move |p| hover_text(p, "%", z_unit, 0, 2))
        .show(ui, |p| {
            p.line(
                Line::new("sunlit share", sun)
                    .color(SUNLIT_COLOUR)
                    .width(2.0),
            );
        });
}

/// The time of each row of a series in hours since midnight of its first day \[h\] (a design day:
/// the clock hour; a longer file: 24 h a day, across month and year ends).
fn series_hours(s: &HourlySeries) -> Vec<f64> {
    let Some(first) = s.hours.first() else {
        return Vec::new();
    };
    let midnight = DateTime::date(first.time.year, first.time.month, first.time.day);
    let m0 = midnight.minutes_since_epoch();
    s.hours
        .iter()
        .map(|h| (h.time.minutes_since_epoch() - m0) as f64 / 60.0)
        .collect()
}

/// One row of the options table: label, hottest leaf \[°C\], margin \[K\], hours over \[h\],
/// water \[L m⁻²\], and whether the water is per hour (a single moment).
type OptionRow = (String, Option<f64>, Option<f64>, Option<f64>, f64, bool);

/// The cooling and shading options side by side, with the coolest hottest leaf marked.
fn cooling_table(ui: &mut Ui, table: &CoolingTable, units: UnitSystem) {
    ui.strong("Cooling and shading options compared");
    let rows: Vec<OptionRow> = match table {
        CoolingTable::Day(v) => v
            .iter()
            .map(|o| {
                (
                    o.label.clone(),
                    o.hottest_leaf_temp_c,
                    o.min_margin_k,
                    Some(o.hours_over_limit),
                    o.water_kg_m2,
                    false,
                )
            })
            .collect(),
        CoolingTable::Moment(v) => v
            .iter()
            .map(|o| {
                (
                    o.label.clone(),
                    Some(o.hottest_leaf_temp_c),
                    o.margin_k,
                    None,
                    o.water_kg_m2_h,
                    true,
                )
            })
            .collect(),
    };
    let best = rows
        .iter()
        .filter_map(|r| r.1.filter(|t| t.is_finite()))
        .fold(f64::INFINITY, f64::min);
    egui::Grid::new("cooling-options")
        .striped(true)
        .show(ui, |ui| {
            for h in ["Option", "Hottest leaf", "Margin", "Hours over", "Water"] {
                ui.strong(h);
            }
            ui.end_row();
            for (label, hot, margin, hours, water, per_hour) in &rows {
                ui.label(label);
                let t = hot.map_or("—".to_owned(), |t| show(Quantity::Temperature, t, units));
                if hot.is_some_and(|t| t == best) {
                    ui.label(format!("★ {t} (coolest)"));
                } else {
                    ui.label(t);
                }
                ui.label(margin.map_or("—".to_owned(), |m| {
                    show(Quantity::TempDiff, no_negative_zero(m, 1), units)
                }));
                ui.label(hours.map_or("— (one moment)".to_owned(), |h| format!("{h:.0} h")));
                ui.label(format!(
                    "{water:.2} L/m²{}",
                    if *per_hour { " per h" } else { "" }
                ));
                ui.end_row();
            }
        });
    ui.label(RichText::new("Estimates with the engine's cited default efficiencies and transmittances; pads and fog add humidity — check the crop's disease risk and the water supply.").small().weak());
}

fn series_block(ui: &mut Ui, what: &str, s: &HourlySeries, units: UnitSystem) {
    let tq = Quantity::Temperature;
    let dq = Quantity::TempDiff;
    let t_unit = tq.unit(units);
    let over = s.hours_over_limit;
    let dh = dq.to_display(s.degree_hours_over_k_h, units);
    ui.label(RichText::new(format!("{what}: the hottest leaf hour by hour")).strong());
    ui.label(format!(
        "Hours over the limit: {} h. Degree-hours over the limit: {} {}·h.{}{}",
        hours(over),
        num(no_negative_zero(dh, 2), 2),
        dq.unit(units),
        s.max_leaf_temp_c.map_or_else(String::new, |t| format!(
            " Hottest leaf of the day {}.",
            show(tq, t, units)
        )),
        s.min_margin_k.map_or_else(String::new, |m| format!(
            " Smallest margin to the limit {}.",
            show(dq, no_negative_zero(m, 1), units)
        )),
    ));
    if s.failed_hours > 0 {
        ui.label(
            RichText::new(format!(
                "⚠ {} hours could not be solved and are left out.",
                s.failed_hours
            ))
            .color(ERROR_COLOUR),
        );
    }
    let xs = series_hours(s);
    let one_day = xs.last().is_none_or(|&x| x <= 24.0);
    let air: Vec<[f64; 2]> = s
        .hours
        .iter()
        .zip(&xs)
        .filter_map(|(h, &x)| {
            let t = h.inside_air_temp_c.unwrap_or(h.air_temp_c);
            t.is_finite().then(|| [x, tq.to_display(t, units)])
        })
        .collect();
    let outside: Vec<[f64; 2]> = s
        .hours
        .iter()
        .zip(&xs)
        .filter(|(h, _)| h.inside_air_temp_c.is_some() && h.air_temp_c.is_finite())
        .map(|(h, &x)| [x, tq.to_display(h.air_temp_c, units)])
        .collect();
    let leaf: Vec<[f64; 2]> = s
        .hours
        .iter()
        .zip(&xs)
        .filter_map(|(h, &x)| {
            h.hottest_leaf_temp_c
                .filter(|t| t.is_finite())
                .map(|t| [x, tq.to_display(t, units)])
        })
        .collect();
    let limit = s.limit.limit_c;
    Plot::new("canopy-series")
        .height(210.0)
        .legend(Legend::default().follow_insertion_order(true))
        .x_axis_label(if one_day {
            "Local clock time [h]"
        } else {
            "Hours since midnight of the first day [h]"
        })
        .y_axis_label(format!("Temperature [{t_unit}]"))
        .include_x(0.0)
        .include_x(if one_day { 24.0 } else { 0.0 })
        .label_formatter(move |p| hover_text(p, "h", t_unit, 1, 1))
        .show(ui, |p| {
            let inside = !outside.is_empty();
            p.line(
                Line::new(if inside { "inside air" } else { "air" }, air)
                    .color(AIR_COLOUR)
                    .width(2.0),
            );
            if inside {
                p.line(
                    Line::new("outside air", outside)
                        .color(AIR_COLOUR)
                        .style(LineStyle::dashed_dense())
                        .width(1.2),
                );
            }
            p.line(
                Line::new("hottest leaf", leaf.clone())
                    .color(SUNLIT_COLOUR)
                    .width(2.5),
            );
            p.points(
                Points::new("hottest leaf", leaf)
                    .color(SUNLIT_COLOUR)
                    .radius(2.5),
            );
            p.hline(
                HLine::new(
                    format!("limit {}", show(tq, limit, units)),
                    tq.to_display(limit, units),
                )
                .color(LIMIT_COLOUR)
                .width(1.5),
            );
        });
}

// ---------------------------------------------------------------------------------------------
// CSV

fn profile_csv(path: &Path, run: &CanopyRun, units: UnitSystem) -> anyhow::Result<()> {
    let tq = Quantity::Temperature;
    let zq = Quantity::Altitude;
    let header = vec![
        "layer from the top".to_owned(),
        head("height", zq, units),
        "leaf area index above [m²/m²]".to_owned(),
        "sunlit share [%]".to_owned(),
        head("air speed", Quantity::Speed, units),
        head("sunlit leaf", tq, units),
        head("shaded leaf", tq, units),
        head("air", tq, units),
        head("limit", tq, units),
    ];
    let rows: Vec<Vec<String>> = run
        .canopy
        .layers
        .iter()
        .enumerate()
        .map(|(i, l)| {
            vec![
                (i + 1).to_string(),
                cell(zq.to_display(l.height_m, units)),
                cell(l.lai_above),
                cell(100.0 * l.sunlit_fraction),
                cell(Quantity::Speed.to_display(l.air_speed_m_s, units)),
                l.sunlit_leaf_temp_c
                    .map_or_else(String::new, |t| cell(tq.to_display(t, units))),
                cell(tq.to_display(l.shaded_leaf_temp_c, units)),
                cell(tq.to_display(run.canopy.air_temp_c, units)),
                cell(tq.to_display(run.limit.limit_c, units)),
            ]
        })
        .collect();
    write_csv(path, &header, &rows)
}

fn series_csv(path: &Path, s: &HourlySeries, units: UnitSystem) -> anyhow::Result<()> {
    let tq = Quantity::Temperature;
    let header = vec![
        "date".to_owned(),
        "time".to_owned(),
        head("outside air", tq, units),
        head("inside air", tq, units),
        head("hottest leaf", tq, units),
        head("limit", tq, units),
        head("margin", Quantity::TempDiff, units),
    ];
    let opt =
        |x: Option<f64>, q: Quantity| x.map_or_else(String::new, |v| cell(q.to_display(v, units)));
    let rows: Vec<Vec<String>> = s
        .hours
        .iter()
        .map(|h| {
            vec![
                format!("{}-{:02}-{:02}", h.time.year, h.time.month, h.time.day),
                format!("{:02}:{:02}", h.time.hour, h.time.minute),
                cell(tq.to_display(h.air_temp_c, units)),
                opt(h.inside_air_temp_c, tq),
                opt(h.hottest_leaf_temp_c, tq),
                cell(tq.to_display(s.limit.limit_c, units)),
                opt(h.margin_k, Quantity::TempDiff),
            ]
        })
        .collect();
    write_csv(path, &header, &rows)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn glasshouse_example_runs_and_has_no_non_finite_sentences() {
        // The shipped glasshouse example has a canopy section with a greenhouse and a design day.
        let doc = crate::document::first_example();
        let input = CanopyInput::of(&doc, None).expect("the example has a canopy section");
        let run = compute_canopy(&input).unwrap();
        for u in [UnitSystem::Si, UnitSystem::Imperial] {
            let s = speed_sentence(&run.speed, u)
                + &shade_sentence(run.shade.as_ref(), u)
                + &ventilation_sentence(run.ventilation.as_ref(), Some((60.0, 10.0)), u);
            assert!(!s.contains("NaN") && !s.contains("inf"), "{s}");
        }
        assert!(run.design_day.is_some());
    }

    #[test]
    fn house_flow_is_the_rate_times_the_floor_in_three_figures() {
        use crate::words::three_figures;
        assert!((three_figures(61_072.4) - 61_100.0).abs() < 1e-6);
        assert!((three_figures(0.012_345) - 0.0123).abs() < 1e-12);
        assert_eq!(three_figures(0.0), 0.0);
        let doc = crate::document::first_example();
        let run = compute_canopy(&CanopyInput::of(&doc, None).unwrap()).unwrap();
        let v = run.ventilation.expect("under cover");
        let Some(rate) = v.check.for_leaf.rate_m3_m2_s() else {
            return;
        };
        let s = ventilation_sentence(Some(&v), Some((50.0, 8.0)), UnitSystem::Si);
        let m3_h = three_figures(rate * 400.0 * 3600.0);
        assert!(s.contains(&format!("{} m³/h", num(m3_h, 0))), "{s}");
        let s = ventilation_sentence(Some(&v), Some((50.0, 8.0)), UnitSystem::Imperial);
        assert!(s.contains(" cfm of exhaust fans"), "{s}");
    }

    #[test]
    fn show_never_prints_nan() {
        assert_eq!(show(Quantity::Temperature, f64::NAN, UnitSystem::Si), "—");
        assert_eq!(show_speed(f64::INFINITY, UnitSystem::Imperial), "—");
        assert_eq!(num(f64::NAN, 1), "—");
        assert_eq!(cell(f64::NAN), "");
    }

    #[test]
    fn a_bad_section_is_an_error_not_a_panic() {
        let mut doc = crate::document::first_example();
        if let Some(c) = doc.canopy.as_mut() {
            c.structure.lai = -1.0;
        }
        let input = CanopyInput::of(&doc, None).unwrap();
        assert!(compute_canopy(&input).is_err());
    }
}

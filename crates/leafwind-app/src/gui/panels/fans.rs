//! The "Fans & night" tab: the circulation-fan layout, an optional target canopy air speed and a
//! night dew check — and what the fans run answers: a plan of the house to scale with the jets'
//! reach, the canopy-level air speed along the house (low / typical / high), the rules of thumb,
//! the fans for the target, where more air stops helping, fan power and the night dew margin.
//!
//! Every air speed from a fan layout is a free-jet estimate: verify it with an anemometer at
//! canopy height. Fan and electrical installations follow local codes and licensed electricians.

use std::path::{Path, PathBuf};

use egui::{CollapsingHeader, ComboBox, RichText, ScrollArea, Ui};
use egui_plot::{Arrows, HLine, Legend, Line, LineStyle, MarkerShape, Plot, Points, Polygon};
use leafwind_physics::air::AIR_TEMP_RANGE_C;
use leafwind_physics::canopy::CanopyStructure;
use leafwind_physics::case::AIR_SPEED_RANGE_M_S;
use leafwind_physics::condensation::{DEW_MARGIN_DEFAULT_K, DEW_MARGIN_RANGE_K};
use leafwind_physics::error::ValidRange;
use leafwind_physics::fans::{
    EFFICACY_RANGE_M3_S_W, FAN_AIRFLOW_RANGE_M3_S, FAN_DIAMETER_RANGE_M, FANS_PER_ROW_RANGE,
    FanLayout, HOUSE_DIMENSION_RANGE_M, JET_HCG1994, MOUNTING_HEIGHT_RANGE_M, ROW_COUNT_RANGE,
    SQUARE_FOOT_IN_M2, SpeedRange, TILT_RANGE_RAD, m3_s_to_cfm, m3_s_to_m3_h,
};
use leafwind_physics::radiation::{SURFACE_TEMP_RANGE_C, UpperView};
use leafwind_physics::{Humidity, LeafCase};

use crate::document::ScenarioDocument;
use crate::fans_scenario::{FansRun, FansSection, NightCheck};
use crate::gui::commands::Command;
use crate::gui::fields::{ERROR_COLOUR, Field, field_label, name_widget, number_field};
use crate::gui::panels::canopy::{
    ExportPrompt, cell, count_field, export_prompt_ui, export_ui, head, humidity_field,
    inputs_column, missing_section_ui, section_toolbar, status_line, write_csv,
};
use crate::gui::panels::sweep::{LIMIT_COLOUR, PALETTE, hover_text};
use crate::units::{Quantity, UnitSystem};
use crate::words::{
    FlowUnit, night_sentence, num, range_text, returns_sentence, show, show_speed, sizing_sentence,
};

/// The one-line caution shown with every fan result.
pub const FAN_CAUTION: &str = "Caution: fan and electrical installations follow local codes and are done by licensed electricians; guard fans within reach.";

// ---------------------------------------------------------------------------------------------
// The background job

/// Everything a fans run depends on.
#[derive(Debug, Clone, PartialEq)]
pub struct FansInput {
    /// The scenario's leaf case (diminishing returns, night check).
    pub case: LeafCase,
    /// The fans section.
    pub section: FansSection,
    /// The canopy's structure (or the default crop's when the scenario has no canopy).
    pub structure: CanopyStructure,
    /// Folder of the scenario file (resolves a relative readings file).
    pub dir: Option<PathBuf>,
}

impl FansInput {
    /// From a document with a fans section; None without one.
    #[must_use]
    pub fn of(doc: &ScenarioDocument, path: Option<&Path>) -> Option<Self> {
        Some(Self {
            case: doc.case,
            section: doc.fans.clone()?,
            structure: doc.canopy.as_ref().map(|c| c.structure).unwrap_or_default(),
            dir: path.and_then(Path::parent).map(Path::to_path_buf),
        })
    }
}

/// Runs the fans section (the sizing search tries many layouts: run it on a job).
///
/// # Errors
/// The first invalid input, in the engine's words.
pub fn compute_fans(input: &FansInput) -> Result<FansRun, String> {
    input
        .section
        .run(&input.case, &input.structure, input.dir.as_deref())
        .map_err(|e| format!("{e:#}"))
}

/// A field whose SI value is shown through a linear factor (airflow, degrees).
fn scaled_field(
    ui: &mut Ui,
    field: &Field<'_>,
    value_si: &mut f64,
    to_display: impl Fn(f64) -> f64,
    from_display: impl Fn(f64) -> f64,
    units: UnitSystem,
) {
    let range = ValidRange {
        min: to_display(field.range.min),
        max: to_display(field.range.max),
        ..field.range
    };
    let f = Field {
        range,
        slider: (to_display(field.slider.0), to_display(field.slider.1)),
        ..*field
    };
    let mut shown = to_display(*value_si);
    let before = shown;
    number_field(ui, &f, &mut shown, units, |_| None);
    if shown != before && shown.is_finite() {
        *value_si = from_display(shown);
    }
}

// ---------------------------------------------------------------------------------------------
// The panel

const EXPORT_PROFILE: usize = 10;
const EXPORT_PLAN: usize = 11;

/// State of the "Fans & night" tab.
#[derive(Debug, Clone)]
pub struct FansPanel {
    /// Show the inputs column.
    pub show_inputs: bool,
    /// The SI airflow unit chosen (imperial is always cfm).
    pub si_flow: FlowUnit,
    /// Show the mid-canopy speed too.
    pub show_mid: bool,
    /// An export being asked for.
    pub export: Option<ExportPrompt>,
    /// The outcome of the last export.
    pub export_message: Option<(String, bool)>,
}

impl Default for FansPanel {
    fn default() -> Self {
        Self {
            show_inputs: true,
            si_flow: FlowUnit::M3PerHour,
            show_mid: false,
            export: None,
            export_message: None,
        }
    }
}

/// What the app passes to the tab.
pub struct FansView<'a> {
    /// The last valid run.
    pub run: Option<&'a FansRun>,
    /// Whether a run is in progress.
    pub busy: bool,
    /// The error of the newest run.
    pub error: Option<&'a str>,
    /// Whether the leaf inputs are invalid (no run submitted).
    pub stale: bool,
    /// Folder of the scenario file (where exports are suggested).
    pub dir: Option<&'a Path>,
}

impl FansPanel {
    /// Draws the tab; returns edit commands.
    pub fn ui(
        &mut self,
        ui: &mut Ui,
        doc: &ScenarioDocument,
        view: &FansView<'_>,
        units: UnitSystem,
    ) -> Vec<Command> {
        let mut commands = Vec::new();
        let Some(section) = &doc.fans else {
            if missing_section_ui(
                ui,
                "Fans & night",
                &[
                    "This scenario has no fans section. Add one to lay out horizontal-airflow (circulation) fans in the house: see the house to scale with each fan's jet, the air speed they give along the house at the canopy top (a low / typical / high estimate from free-jet theory, to verify with an anemometer), which fans reach a target speed, where more air stops cooling the leaf, the fans' power and energy, and — with a night check — whether the leaves stay above the dew point.",
                    "The section starts from an invented layout: two rows of four 0.5 m fans, 3 m up, 15 m apart, in a 60 m × 10 m house.",
                ],
                "Add a fans section",
                "Adds a fans section with default inputs to the scenario (an unsaved edit).",
            ) {
                let mut d = doc.clone();
                d.fans = Some(FansSection::default());
                commands.push(Command::Edit(Box::new(d)));
            }
            return commands;
        };
        let mut edited = doc.clone();
        if section_toolbar(
            ui,
            &mut self.show_inputs,
            "Show the fan inputs",
            "Remove the fans section",
            "Removes the fans section from the scenario (an unsaved edit).",
        ) {
            edited.fans = None;
        }
        if self.show_inputs {
            inputs_column(ui, "fans", |ui| {
                if let Some(f) = edited.fans.as_mut() {
                    self.section_inputs(ui, f, units);
                }
            });
        }
        ScrollArea::vertical()
            .id_salt("fans-results-scroll")
            .auto_shrink([false, false])
            .show(ui, |ui| {
                status_line(ui, view.busy, view.error, view.stale);
                match view.run {
                    Some(run) => self.results(ui, run, section, doc, view.dir, units),
                    None if view.error.is_none() => {
                        ui.horizontal(|ui| {
                            ui.spinner();
                            ui.label("Computing the fan layout…");
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

    #[allow(clippy::too_many_lines)]
    fn section_inputs(&mut self, ui: &mut Ui, f: &mut FansSection, units: UnitSystem) {
        let len = Quantity::Altitude;
        CollapsingHeader::new(RichText::new("Fans").strong())
            .default_open(true)
            .show(ui, |ui| {
                if units == UnitSystem::Si {
                    ui.horizontal(|ui| {
                        field_label(ui, "Airflow in", "Show the fan airflow rating in cubic metres per hour (catalogues) or per second.");
                        ui.radio_value(&mut self.si_flow, FlowUnit::M3PerHour, "m³/h");
                        ui.radio_value(&mut self.si_flow, FlowUnit::M3PerSecond, "m³/s");
                    });
                }
                let flow = FlowUnit::for_units(units, self.si_flow);
                let slider = match flow {
                    FlowUnit::M3PerSecond => (0.1, 5.0),
                    _ => (flow.to_display(0.1), flow.to_display(5.0)),
                };
                let m3s_to = |x: f64| flow.to_display(x);
                scaled_field(
                    ui,
                    &Field {
                        label: "Fan airflow rating",
                        quantity: Quantity::Same(flow.unit()),
                        range: FAN_AIRFLOW_RANGE_M3_S,
                        slider: (flow.from_display(slider.0), flow.from_display(slider.1)),
                        log: true,
                        decimals: Some(flow.decimals()),
                        tooltip: "The fan's rated airflow in free air (the catalogue figure). Horizontal-airflow fans 0.3–0.6 m: about 1500–6000 m³/h (900–3500 cfm).",
                    },
                    &mut f.layout.fan.airflow_m3_s,
                    m3s_to,
                    |x| flow.from_display(x),
                    units,
                );
                number_field(
                    ui,
                    &Field {
                        label: "Blade diameter",
                        quantity: Quantity::LeafSize,
                        range: FAN_DIAMETER_RANGE_M,
                        slider: (0.2, 1.5),
                        log: false,
                        decimals: None,
                        tooltip: "Diameter of the fan blades (the outlet). Circulation fans 300–900 mm (12–36 in).",
                    },
                    &mut f.layout.fan.diameter_m,
                    units,
                    |_| None,
                );
                // Efficacy in the same airflow unit per watt.
                scaled_field(
                    ui,
                    &Field {
                        label: "Fan efficacy",
                        quantity: Quantity::Same(match flow {
                            FlowUnit::M3PerHour => "m³/h per W",
                            FlowUnit::M3PerSecond => "m³/s per W",
                            FlowUnit::Cfm => "cfm per W",
                        }),
                        range: EFFICACY_RANGE_M3_S_W,
                        slider: (0.002, 0.02),
                        log: false,
                        decimals: Some(if flow == FlowUnit::M3PerSecond { 4 } else { 1 }),
                        tooltip: "Airflow per watt of electrical input (from the fan's test report). Circulation fans about 10–20 cfm/W (17–34 m³/h per W); sets the power and energy.",
                    },
                    &mut f.layout.fan.efficacy_m3_s_w,
                    m3s_to,
                    |x| flow.from_display(x),
                    units,
                );
                count_field(ui, "Fans per row", &mut f.layout.fans_per_row, FANS_PER_ROW_RANGE, (1.0, 12.0), "Fans in series along each row, all blowing the same way.", units);
                count_field(ui, "Rows", &mut f.layout.rows, ROW_COUNT_RANGE, (1.0, 6.0), "Rows across the house; neighbouring rows blow in opposite directions (a racetrack loop).", units);
                let l = |label, range, slider, tooltip| Field {
                    label,
                    quantity: len,
                    range,
                    slider,
                    log: false,
                    decimals: Some(1),
                    tooltip,
                };
                let house_len = f.layout.house_length_m;
                number_field(ui, &l("Fan spacing", ValidRange { quantity: "fan spacing", min: 0.5, max: house_len.max(0.5), unit: "m" }, (3.0, 40.0), "Distance between fans along a row. Commonly about 15 m, or 30 blade diameters (common practice, no source)."), &mut f.layout.spacing_m, units, |_| None);
                number_field(ui, &l("First fan from the end wall", ValidRange { quantity: "first fan from the end wall", min: 0.0, max: house_len.max(0.0), unit: "m" }, (0.0, 20.0), "Distance of the first fan of each row from the end wall it blows away from."), &mut f.layout.first_fan_m, units, |_| None);
                number_field(ui, &l("Mounting height", MOUNTING_HEIGHT_RANGE_M, (1.0, 8.0), "Height of the fan axis above the floor; must be above the canopy top."), &mut f.layout.mounting_height_m, units, |_| None);
                scaled_field(
                    ui,
                    &Field {
                        label: "Tilt down",
                        quantity: Quantity::Same("°"),
                        range: TILT_RANGE_RAD,
                        slider: (-30f64.to_radians(), 45f64.to_radians()),
                        log: false,
                        decimals: Some(1),
                        tooltip: "Tilt of the fan axis below the horizontal (negative tilts up). A few degrees down brings the jet to the crop sooner.",
                    },
                    &mut f.layout.tilt_down_rad,
                    f64::to_degrees,
                    f64::to_radians,
                    units,
                );
            });
        CollapsingHeader::new(RichText::new("House").strong())
            .default_open(true)
            .show(ui, |ui| {
                let l = |label, quantity: &'static str, tooltip| Field {
                    label,
                    quantity: len,
                    range: ValidRange { quantity, ..HOUSE_DIMENSION_RANGE_M },
                    slider: (5.0, 150.0),
                    log: false,
                    decimals: Some(1),
                    tooltip,
                };
                number_field(ui, &l("House length", "house length", "Inside length of the house (or bay) along the fan rows."), &mut f.layout.house_length_m, units, |_| None);
                number_field(ui, &l("House width", "house width", "Inside width of the house (or bay) across the rows."), &mut f.layout.house_width_m, units, |_| None);
                number_field(
                    ui,
                    &Field {
                        label: "Fan hours a day",
                        quantity: Quantity::Same("h"),
                        range: ValidRange { quantity: "fan hours a day", min: 0.0, max: 24.0, unit: "h" },
                        slider: (0.0, 24.0),
                        log: false,
                        decimals: Some(0),
                        tooltip: "Hours a day the fans run, for the daily energy (an invented working assumption: all day).",
                    },
                    &mut f.run_hours_per_day,
                    units,
                    |_| None,
                );
            });
        CollapsingHeader::new(RichText::new("Target canopy air speed").strong())
            .default_open(true)
            .show(ui, |ui| {
                let mut on = f.target_canopy_speed_m_s.is_some();
                ui.checkbox(&mut on, "Size fans for a target speed")
                    .on_hover_text("On: the generic fan models are tried in layouts of 1 to 200 fans to find the fewest that give at least this speed at the canopy top everywhere outside the near-fan zones.");
                if on != f.target_canopy_speed_m_s.is_some() {
                    f.target_canopy_speed_m_s = on.then_some(0.5);
                }
                if let Some(t) = &mut f.target_canopy_speed_m_s {
                    number_field(
                        ui,
                        &Field {
                            label: "Target at the canopy top",
                            quantity: Quantity::Speed,
                            range: ValidRange { min: 0.05, max: 5.0, ..AIR_SPEED_RANGE_M_S },
                            slider: (0.1, 2.0),
                            log: false,
                            decimals: None,
                            tooltip: "The least air speed wanted over the crop; 0.3–1 m/s (60–200 ft/min) is the common aim of horizontal-airflow fans (common practice, no source). The Canopy & day tab gives the least speed for the heat limit.",
                        },
                        t,
                        units,
                        |_| None,
                    );
                }
            });
        CollapsingHeader::new(RichText::new("Night check (dew)").strong())
            .default_open(true)
            .show(ui, |ui| {
                let mut on = f.night.is_some();
                ui.checkbox(&mut on, "Check a night for dew on the leaves")
                    .on_hover_text("On: the leaf at the slowest typical canopy air speed on a still night, and the least air speed that keeps it above the dew point plus a margin.");
                if on != f.night.is_some() {
                    f.night = on.then_some(NightCheck {
                        air_temp_c: 15.0,
                        humidity: Humidity::RelativePct(90.0),
                        upper_view: UpperView::CoverTempC(11.0),
                        margin_k: DEW_MARGIN_DEFAULT_K,
                    });
                }
                if let Some(n) = &mut f.night {
                    night_inputs(ui, n, units);
                }
            });
    }

    fn results(
        &mut self,
        ui: &mut Ui,
        run: &FansRun,
        section: &FansSection,
        doc: &ScenarioDocument,
        dir: Option<&Path>,
        units: UnitSystem,
    ) {
        let e = &run.estimate;
        let flow = FlowUnit::for_units(units, self.si_flow);
        ui.label(
            RichText::new(format!(
                "Slowest canopy-top air speed outside the near-fan zones: {}. Mean {}. Uniformity (slowest ÷ mean) {} %.",
                range_text(&e.min_canopy_top, units),
                range_text(&e.mean_canopy_top, units),
                num(100.0 * e.uniformity, 0)
            ))
            .strong(),
        );
        let h = doc.canopy.as_ref().map_or_else(
            || CanopyStructure::default().height_m,
            |c| c.structure.height_m,
        );
        ui.label(
            RichText::new(format!(
                "Canopy top at {} above the floor ({}); the fans are {} up.",
                Quantity::Altitude.format_with(h, units, 2),
                if doc.canopy.is_some() {
                    "the crop height of the canopy section"
                } else {
                    "a default crop: add a canopy section in the Canopy & day tab to set the crop height"
                },
                Quantity::Altitude.format_with(section.layout.mounting_height_m, units, 2),
            ))
            .small(),
        );
        ui.label(
            RichText::new(format!("Estimate: {}", e.note))
                .small()
                .italics(),
        );
        let r = &e.rules;
        let per_floor = |x: f64| match units {
            UnitSystem::Si => format!("{} m³/h per m²", num(m3_s_to_m3_h(x), 0)),
            UnitSystem::Imperial => {
                format!("{} cfm per ft²", num(m3_s_to_cfm(x) * SQUARE_FOOT_IN_M2, 1))
            }
        };
        ui.label(format!(
            "Rules of thumb (common practice, no source): installed airflow {} vs about {} suggested — {}; throw about {} by the 30-diameter rule, {} by the jet model; spacing {} — {}.",
            per_floor(r.installed_m3_s_m2),
            per_floor(r.haf_rule_m3_s_m2),
            if r.meets_haf_rule { "✔ met" } else { "✖ not met" },
            Quantity::Altitude.format_with(r.throw_rule_m, units, 0),
            r.throw_jet_m.map_or_else(|| "—".to_owned(), |t| Quantity::Altitude.format_with(t, units, 0)),
            Quantity::Altitude.format_with(section.layout.spacing_m, units, 1),
            if r.spacing_within_throw { "✔ within the throw" } else { "✖ beyond the throw" },
        ));
        match &run.sizing {
            Some((target, s)) => {
                ui.label(sizing_sentence(*target, s, units));
            }
            None => {
                ui.label(
                    RichText::new("Switch “Size fans for a target speed” on to find the fewest fans for a canopy-top speed.").weak(),
                );
            }
        }
        ui.label(format!(
            "{} Knee: {}.",
            returns_sentence(&run.returns, units),
            run.returns
                .knee_m_s
                .map_or_else(|| "none in the sweep".to_owned(), |k| show_speed(k, units))
        ));
        let en = &run.energy;
        let area = match units {
            UnitSystem::Si => format!("{} W/m² of floor", num(en.power_per_floor_w_m2, 2)),
            UnitSystem::Imperial => format!(
                "{} W/ft² of floor",
                num(en.power_per_floor_w_m2 * SQUARE_FOOT_IN_M2, 3)
            ),
        };
        ui.label(format!(
            "Fan power: {} W for {} fans ({area}); {} kWh a day at {} h a day. Each fan {} at {} W.",
            num(en.power_w, 0),
            section.layout.fan_count(),
            num(en.energy_kwh, 1),
            num(en.hours_h, 0),
            flow.format(section.layout.fan.airflow_m3_s),
            num(section.layout.fan.power_w(), 0),
        ));
        ui.label(RichText::new(FAN_CAUTION).small().strong());
        match &run.night {
            Some((m, a)) => {
                ui.label(
                    RichText::new(night_sentence(m, a, e.min_canopy_top.typical_m_s, units))
                        .strong(),
                );
            }
            None => {
                ui.label(
                    RichText::new("Switch the night check on to see whether the leaves stay above the dew point on a still night.").weak(),
                );
            }
        }
        if let Some((summary, errs)) = &run.readings {
            ui.label(format!(
                "Anemometer readings: {} points, slowest {}, mean {}, {} below {} (dead zones){}.",
                summary.count,
                show_speed(summary.min_m_s, units),
                show_speed(summary.mean_m_s, units),
                summary.dead_zones.len(),
                show_speed(summary.dead_zone_threshold_m_s, units),
                if errs.is_empty() {
                    String::new()
                } else {
                    format!("; {} rows skipped", errs.len())
                }
            ));
        }
        ui.separator();
        ui.horizontal_wrapped(|ui| {
            export_ui(
                ui,
                &mut self.export,
                EXPORT_PLAN,
                "Export plan CSV…",
                "leafwind-fans-plan.csv",
                dir,
            );
            export_ui(
                ui,
                &mut self.export,
                EXPORT_PROFILE,
                "Export air speed CSV…",
                "leafwind-fans-air-speed.csv",
                dir,
            );
            ui.checkbox(&mut self.show_mid, "mid-canopy speed").on_hover_text(
                "Also show the typical air speed at mid-height of the canopy (attenuated inside the crop).",
            );
        });
        let chosen = export_prompt_ui(ui, &mut self.export);
        if let Some((what, path)) = chosen {
            let r = if what == EXPORT_PLAN {
                plan_csv(&path, &section.layout, units)
            } else {
                profile_csv(&path, run, units)
            };
            self.export_message = Some(match r {
                Ok(()) => (format!("Exported {}.", path.display()), false),
                Err(e) => (format!("Export failed: {e:#}"), true),
            });
        }
        if let Some((m, err)) = &self.export_message {
            let t = RichText::new(if *err { format!("⚠ {m}") } else { m.clone() }).small();
            ui.label(if *err { t.color(ERROR_COLOUR) } else { t });
        }
        plan_plot(ui, &section.layout, run, units);
        ui.add_space(6.0);
        let crop_height_m = doc.canopy.as_ref().map_or_else(
            || CanopyStructure::default().height_m,
            |c| c.structure.height_m,
        );
        section_plot(ui, &section.layout, run, crop_height_m, units);
        ui.add_space(6.0);
        self.speed_plot(ui, run, section, doc, units);
    }

    fn speed_plot(
        &self,
        ui: &mut Ui,
        run: &FansRun,
        section: &FansSection,
        doc: &ScenarioDocument,
        units: UnitSystem,
    ) {
        let sp = Quantity::Speed;
        let xq = Quantity::Altitude;
        let (s_unit, x_unit) = (sp.unit(units), xq.unit(units));
        let s_dec = sp.decimals(units);
        ui.label(
            RichText::new(
                "Air speed at the canopy top along each row (estimate: band = low to high)",
            )
            .strong(),
        );
        let rows = rows_of(&run.estimate.points);
        let show_mid = self.show_mid;
        let target = section.target_canopy_speed_m_s;
        let least = doc.case.air.speed_m_s;
        let top = run
            .estimate
            .points
            .iter()
            .map(|q| q.canopy_top.high_m_s)
            .filter(|v| v.is_finite())
            .fold(0.0, f64::max);
        Plot::new("fans-speed-profile")
            .height(260.0)
            .legend(
                Legend::default()
                    .follow_insertion_order(true)
                    .text_style(egui::TextStyle::Small),
            )
            // Head room above the fastest estimate for the legend.
            .include_y(sp.to_display(1.6 * top, units))
            .x_axis_label(format!("Distance along the house [{x_unit}]"))
            .y_axis_label(format!("Air speed [{s_unit}]"))
            .include_y(0.0)
            .include_x(0.0)
            .include_x(xq.to_display(section.layout.house_length_m, units))
            .label_formatter(move |p| hover_text(p, x_unit, s_unit, 1, s_dec))
            .show(ui, |p| {
                for (j, pts) in rows.iter().enumerate() {
                    let col = PALETTE[j % PALETTE.len()];
                    let name = format!("row {}", j + 1);
                    let xs: Vec<f64> = pts.iter().map(|q| xq.to_display(q.0, units)).collect();
                    let lo: Vec<f64> = pts
                        .iter()
                        .map(|q| sp.to_display(q.1.low_m_s, units))
                        .collect();
                    let hi: Vec<f64> = pts
                        .iter()
                        .map(|q| sp.to_display(q.1.high_m_s, units))
                        .collect();
                    let ty: Vec<[f64; 2]> = pts
                        .iter()
                        .filter(|q| q.1.typical_m_s.is_finite())
                        .map(|q| {
                            [
                                xq.to_display(q.0, units),
                                sp.to_display(q.1.typical_m_s, units),
                            ]
                        })
                        .collect();
                    if xs.iter().chain(&lo).chain(&hi).all(|v| v.is_finite()) {
                        p.add(
                            egui_plot::FilledArea::new(format!("{name}: low–high"), &xs, &lo, &hi)
                                .fill_color(col.gamma_multiply(0.25)),
                        );
                    }
                    p.line(
                        Line::new(format!("{name}: typical"), ty)
                            .color(col)
                            .width(2.0),
                    );
                    if show_mid {
                        let mid: Vec<[f64; 2]> = pts
                            .iter()
                            .map(|q| [xq.to_display(q.0, units), sp.to_display(q.2, units)])
                            .filter(|v| v[1].is_finite())
                            .collect();
                        p.line(
                            Line::new(format!("{name}: mid-canopy"), mid)
                                .color(col)
                                .style(LineStyle::dashed_dense())
                                .width(1.2),
                        );
                    }
                }
                if let Some(t) = target {
                    p.hline(
                        HLine::new(
                            format!("target {}", show(sp, t, units)),
                            sp.to_display(t, units),
                        )
                        .color(LIMIT_COLOUR)
                        .style(LineStyle::dashed_loose())
                        .width(1.5),
                    );
                }
                p.hline(
                    HLine::new(
                        format!("leaf inputs' air speed {}", show(sp, least, units)),
                        sp.to_display(least, units),
                    )
                    .color(egui::Color32::from_gray(130))
                    .style(LineStyle::dotted_dense())
                    .width(1.0),
                );
            });
        ui.label(
            RichText::new("Near each fan the jet has not yet come down to the crop: the speeds there are low and are left out of the slowest and mean figures.")
                .small()
                .weak(),
        );
    }
}

fn night_inputs(ui: &mut Ui, n: &mut NightCheck, units: UnitSystem) {
    number_field(
        ui,
        &Field {
            label: "Night air temperature",
            quantity: Quantity::Temperature,
            range: AIR_TEMP_RANGE_C,
            slider: (-5.0, 30.0),
            log: false,
            decimals: None,
            tooltip: "Air temperature around the crop at night.",
        },
        &mut n.air_temp_c,
        units,
        |_| None,
    );
    let t = n.air_temp_c;
    humidity_field(
        ui,
        "Night humidity",
        &mut n.humidity,
        t,
        units,
        "Humidity of the night air; greenhouses at night often 85–95 %.",
    );
    ui.horizontal(|ui| {
        field_label(
            ui,
            "Above the leaves",
            "What the top leaves see at night: an open clear sky (its temperature from the air, Brutsaert), a sky at a measured temperature, or the greenhouse cover at its temperature (a cold cover chills the leaves below the air).",
        );
        let mut kind = match n.upper_view {
            UpperView::ClearSky => 0,
            UpperView::SkyTempC(_) => 1,
            UpperView::CoverTempC(_) => 2,
        };
        let label = ["Clear sky", "Sky at a temperature", "Cover at a temperature"];
        let r = ComboBox::from_id_salt("night-upper-view")
            .selected_text(label[kind])
            .show_ui(ui, |ui| {
                for (i, l) in label.iter().enumerate() {
                    ui.selectable_value(&mut kind, i, *l);
                }
            });
        name_widget(ui, &r.response, "Above the leaves");
        n.upper_view = match (kind, n.upper_view) {
            (0, _) => UpperView::ClearSky,
            (1, v @ UpperView::SkyTempC(_)) | (2, v @ UpperView::CoverTempC(_)) => v,
            (1, _) => UpperView::SkyTempC(n.air_temp_c - 15.0),
            _ => UpperView::CoverTempC(n.air_temp_c - 5.0),
        };
    });
    match &mut n.upper_view {
        UpperView::ClearSky => {}
        UpperView::SkyTempC(t) | UpperView::CoverTempC(t) => {
            number_field(
                ui,
                &Field {
                    label: "Sky or cover at",
                    quantity: Quantity::Temperature,
                    range: SURFACE_TEMP_RANGE_C,
                    slider: (-30.0, 30.0),
                    log: false,
                    decimals: None,
                    tooltip: "Temperature of the sky (infrared thermometer pointed up) or of the cover's inner face at night; a clear-night cover runs several kelvin below the air.",
                },
                t,
                units,
                |_| None,
            );
        }
    }
    number_field(
        ui,
        &Field {
            label: "Margin above dew point",
            quantity: Quantity::TempDiff,
            range: DEW_MARGIN_RANGE_K,
            slider: (0.0, 5.0),
            log: false,
            decimals: None,
            tooltip: "How far above the dew point the leaf should stay. Default 1 K (common practice, no source).",
        },
        &mut n.margin_k,
        units,
        |_| None,
    );
}

/// One point of a row's profile: x \[m\], canopy-top range, mid-canopy typical \[m s⁻¹\].
type RowPoint = (f64, SpeedRange, f64);

/// The profile points of each row.
fn rows_of(points: &[leafwind_physics::fans::ProfilePoint]) -> Vec<Vec<RowPoint>> {
    let mut rows: Vec<(f64, Vec<RowPoint>)> = Vec::new();
    for p in points {
        match rows.iter_mut().find(|(y, _)| (y - p.y_m).abs() < 1e-9) {
            Some((_, v)) => v.push((p.x_m, p.canopy_top, p.mid_canopy.typical_m_s)),
            None => rows.push((p.y_m, vec![(p.x_m, p.canopy_top, p.mid_canopy.typical_m_s)])),
        }
    }
    rows.into_iter().map(|(_, v)| v).collect()
}

fn plan_plot(ui: &mut Ui, layout: &FanLayout, run: &FansRun, units: UnitSystem) {
    let xq = Quantity::Altitude;
    let u = xq.unit(units);
    let d = |m: f64| xq.to_display(m, units);
    let (l, w) = (layout.house_length_m, layout.house_width_m);
    ui.label(
        RichText::new("Plan of the house, to scale: fans, their direction and the jets' reach")
            .strong(),
    );
    let positions = layout.positions();
    let reach = run.estimate.rules.throw_jet_m.unwrap_or(l).min(l);
    let spread = JET_HCG1994.spread_rate;
    let arrow = (0.08 * l).clamp(1.0, 6.0);
    // Drawn to scale (equal axes); a band above the house keeps the legend off the fans.
    let y_top = 1.05 * w + 0.15 * l;
    let aspect_h = (ui.available_width() * ((y_top + 0.05 * w) / (1.04 * l)) as f32)
        .clamp(140.0, 380.0)
        + 40.0;
    Plot::new("fans-plan")
        .height(aspect_h)
        .data_aspect(1.0)
        .legend(
            Legend::default()
                .follow_insertion_order(true)
                .text_style(egui::TextStyle::Small)
                .position(egui_plot::Corner::LeftTop),
        )
        .x_axis_label(format!("Along the house [{u}]"))
        .y_axis_label(format!("Across [{u}]"))
        .include_x(d(-0.02 * l))
        .include_x(d(1.02 * l))
        .include_y(d(-0.05 * w))
        .include_y(d(y_top))
        .label_formatter(move |p| hover_text(p, u, u, 1, 1))
        .show(ui, |p| {
            p.line(
                Line::new(
                    "house walls",
                    vec![
                        [0.0, 0.0],
                        [d(l), 0.0],
                        [d(l), d(w)],
                        [0.0, d(w)],
                        [0.0, 0.0],
                    ],
                )
                .color(egui::Color32::from_gray(140))
                .width(2.0),
            );
            for f in &positions {
                // The jet's half-velocity width grows as S·x (spread rate of [HCG94]); its reach
                // ends at the computed throw or the end wall.
                let to_wall = if f.direction > 0.0 { l - f.x_m } else { f.x_m };
                let s = reach.min(to_wall).max(0.0);
                let x1 = f.x_m + f.direction * s;
                let half = spread * s + 0.5 * layout.fan.diameter_m;
                let wedge = vec![
                    [d(f.x_m), d(f.y_m + 0.5 * layout.fan.diameter_m)],
                    [d(x1), d((f.y_m + half).min(w))],
                    [d(x1), d((f.y_m - half).max(0.0))],
                    [d(f.x_m), d(f.y_m - 0.5 * layout.fan.diameter_m)],
                ];
                p.polygon(
                    Polygon::new("jet reach (half-velocity width)", wedge)
                        .fill_color(PALETTE[1].gamma_multiply(0.12))
                        .stroke(egui::Stroke::new(0.8, PALETTE[1].gamma_multiply(0.6))),
                );
            }
            let origins: Vec<[f64; 2]> = positions.iter().map(|f| [d(f.x_m), d(f.y_m)]).collect();
            let tips: Vec<[f64; 2]> = positions
                .iter()
                .map(|f| [d(f.x_m + f.direction * arrow), d(f.y_m)])
                .collect();
            p.arrows(
                Arrows::new("blowing direction", origins.clone(), tips)
                    .color(PALETTE[0])
                    .tip_length(8.0),
            );
            p.points(
                Points::new(format!("fans ({})", positions.len()), origins)
                    .shape(MarkerShape::Square)
                    .radius(4.0)
                    .color(PALETTE[0])
                    .filled(true),
            );
        });
    ui.label(
        RichText::new(format!(
            "Wedges: each jet's half-velocity width (spread rate {} of Hussein, Capp & George 1994) out to its computed throw of {} (where the jet slows to 0.25 m/s) or the end wall.",
            num(spread, 3),
            run.estimate
                .rules
                .throw_jet_m
                .map_or_else(|| "—".to_owned(), |t| xq.format_with(t, units, 0))
        ))
        .small()
        .weak(),
    );
}

/// The house seen from the side, to scale: each row's jets from their mounting height (with the
/// tilt), their half-velocity width growing at the spread rate, and the top of the crop.
fn section_plot(
    ui: &mut Ui,
    layout: &FanLayout,
    run: &FansRun,
    crop_height_m: f64,
    units: UnitSystem,
) {
    let xq = Quantity::Altitude;
    let u = xq.unit(units);
    let d = |m: f64| xq.to_display(m, units);
    let l = layout.house_length_m;
    let h0 = layout.mounting_height_m;
    ui.label(
        RichText::new("Section along the house, to scale: the jets' reach over the crop").strong(),
    );
    let reach = run.estimate.rules.throw_jet_m.unwrap_or(l).min(l);
    let spread = JET_HCG1994.spread_rate;
    let slope = -layout.tilt_down_rad.tan();
    let top = (h0 + spread * reach + layout.fan.diameter_m).max(crop_height_m) * 1.3;
    Plot::new("fans-section")
        .height(150.0)
        .data_aspect(1.0)
        .legend(
            Legend::default()
                .follow_insertion_order(true)
                .text_style(egui::TextStyle::Small)
                .position(egui_plot::Corner::RightTop),
        )
        .x_axis_label(format!("Along the house [{u}]"))
        .y_axis_label(format!("Height [{u}]"))
        .include_x(d(-0.02 * l))
        .include_x(d(1.02 * l))
        .include_y(0.0)
        .include_y(d(top))
        .label_formatter(move |p| hover_text(p, u, u, 1, 1))
        .show(ui, |p| {
            p.line(
                Line::new(
                    "crop top",
                    vec![[0.0, d(crop_height_m)], [d(l), d(crop_height_m)]],
                )
                .color(egui::Color32::from_rgb(60, 160, 80))
                .width(2.0),
            );
            p.line(
                Line::new("floor", vec![[0.0, 0.0], [d(l), 0.0]])
                    .color(egui::Color32::from_gray(140))
                    .width(2.0),
            );
            let mut fans_xz = Vec::new();
            for f in &layout.positions() {
                let to_wall = if f.direction > 0.0 { l - f.x_m } else { f.x_m };
                let s = reach.min(to_wall).max(0.0);
                let x1 = f.x_m + f.direction * s;
                let half = spread * s + 0.5 * layout.fan.diameter_m;
                let z1 = h0 + slope * s;
                let r0 = 0.5 * layout.fan.diameter_m;
                let wedge = vec![
                    [d(f.x_m), d(h0 + r0)],
                    [d(x1), d(z1 + half)],
                    [d(x1), d((z1 - half).max(0.0))],
                    [d(f.x_m), d(h0 - r0)],
                ];
                p.polygon(
                    Polygon::new("jet reach (half-velocity width)", wedge)
                        .fill_color(PALETTE[1].gamma_multiply(0.10))
                        .stroke(egui::Stroke::new(0.8, PALETTE[1].gamma_multiply(0.6))),
                );
                fans_xz.push([d(f.x_m), d(h0)]);
            }
            p.points(
                Points::new("fans", fans_xz)
                    .shape(MarkerShape::Square)
                    .radius(4.0)
                    .color(PALETTE[0])
                    .filled(true),
            );
        });
    ui.label(
        RichText::new("Where a wedge stays above the green line the jet passes over the crop: mount the fans lower or tilt them down. Rows overlap in this side view.")
            .small()
            .weak(),
    );
}

// ---------------------------------------------------------------------------------------------
// CSV

fn plan_csv(path: &Path, layout: &FanLayout, units: UnitSystem) -> anyhow::Result<()> {
    let xq = Quantity::Altitude;
    let header = vec![
        "fan".to_owned(),
        head("along the house", xq, units),
        head("across", xq, units),
        "direction (+1 toward the far wall)".to_owned(),
        head("mounting height", xq, units),
    ];
    let rows: Vec<Vec<String>> = layout
        .positions()
        .iter()
        .enumerate()
        .map(|(i, f)| {
            vec![
                (i + 1).to_string(),
                cell(xq.to_display(f.x_m, units)),
                cell(xq.to_display(f.y_m, units)),
                cell(f.direction),
                cell(xq.to_display(layout.mounting_height_m, units)),
            ]
        })
        .collect();
    write_csv(path, &header, &rows)
}

fn profile_csv(path: &Path, run: &FansRun, units: UnitSystem) -> anyhow::Result<()> {
    let xq = Quantity::Altitude;
    let sp = Quantity::Speed;
    let header = vec![
        head("along the house", xq, units),
        head("row line across", xq, units),
        "near-fan zone".to_owned(),
        head("canopy top low", sp, units),
        head("canopy top typical", sp, units),
        head("canopy top high", sp, units),
        head("mid-canopy typical", sp, units),
    ];
    let rows: Vec<Vec<String>> = run
        .estimate
        .points
        .iter()
        .map(|p| {
            vec![
                cell(xq.to_display(p.x_m, units)),
                cell(xq.to_display(p.y_m, units)),
                p.near_fan_zone.to_string(),
                cell(sp.to_display(p.canopy_top.low_m_s, units)),
                cell(sp.to_display(p.canopy_top.typical_m_s, units)),
                cell(sp.to_display(p.canopy_top.high_m_s, units)),
                cell(sp.to_display(p.mid_canopy.typical_m_s, units)),
            ]
        })
        .collect();
    write_csv(path, &header, &rows)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn glasshouse_example_fans_run_has_all_answers() {
        let doc = crate::document::first_example();
        let input = FansInput::of(&doc, None).expect("the example has a fans section");
        let run = compute_fans(&input).unwrap();
        assert!(run.sizing.is_some() && run.night.is_some());
        for u in [UnitSystem::Si, UnitSystem::Imperial] {
            let (m, a) = run.night.as_ref().unwrap();
            let s = night_sentence(m, a, run.estimate.min_canopy_top.typical_m_s, u)
                + &returns_sentence(&run.returns, u);
            assert!(!s.contains("NaN") && !s.contains("inf"), "{s}");
        }
    }
}

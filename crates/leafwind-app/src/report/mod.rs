//! The grower report: one self-contained HTML file (plots as inline SVG, print layout for A4 and
//! Letter) and the CSV tables behind each plot, written into a folder.
//!
//! | module | what it owns |
//! |---|---|
//! | [`answer`] | the first sentence: the least fan air speed, or why there is none |
//! | [`plots`] | the SVG plots (plotters, no font libraries) |
//! | [`tables`] | the CSV tables and the number formatting (never NaN: "—" or an empty cell) |
//! | [`html`] | escaping and small HTML pieces |
//! | [`text`] | the assumptions, the published sources and the cautions |
//! | [`extras`] | the optional canopy profile, canopy sizing and design-day sections |
//!
//! Entry points: [`write_report`] (what `leafwind report` and the window's "Export report…" call),
//! [`write_report_with`] for the optional sections, and [`build_report`] to get the report in
//! memory without writing it.

use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

use anyhow::{Context as _, anyhow};
use leafwind_physics::canopy::CanopyCase;
use leafwind_physics::design_day::{DesignDay, SeriesCase};
use leafwind_physics::required_wind::SEARCH_MAX_SPEED_DEFAULT_M_S;
use leafwind_physics::{Humidity, UpperView, WindAnswer, required_wind};

use crate::canopy_scenario::CanopySizing;
use leafwind_physics::heat_rules::HeatRule;

// The derived results (leaf, sweep, map) are the window's; the document and the units are the
// crate's.
use crate::gui::compute;
use crate::{document, units};

pub mod answer;
pub mod extras;
pub mod html;
pub mod plots;
pub mod tables;
pub mod text;

use compute::{
    LeafResult, MapInput, MapResult, SweepInput, SweepResult, compute_map, compute_sweep,
};
use document::{MapQuantity, ScenarioDocument};
use html::{Row, attr, esc, figure, grid_table, num_span, quantity_table};
use plots::BudgetBar;
use tables::{
    CsvTable, MISSING, csv_num, csv_opt, csv_q, head, show, show_num, show_sig, show_with,
};
use text::Source;
use units::{Quantity, UnitSystem};

pub use extras::{canopy_section, design_day_section, sizing_section};

/// Name of the HTML file inside the report folder.
pub const HTML_FILE: &str = "report.html";

/// Cells per axis of the report's map (coarser than the window's 256 to keep the file small:
/// one SVG rectangle per cell).
pub const MAP_CELLS: usize = 64;

/// Optional sections that the scenario document cannot describe yet, as the engine's own inputs.
#[derive(Debug, Clone, Default)]
pub struct ReportExtras {
    /// A canopy to profile (sunlit and shaded leaves by layer).
    pub canopy: Option<CanopyCase>,
    /// A design day to run hour by hour, with its series case (site, canopy, crop limit, setting).
    pub design_day: Option<(DesignDay, SeriesCase)>,
    /// The canopy sizing answers at the section's moment, or why they could not be found.
    pub sizing: Option<Result<CanopySizing, String>>,
    /// Heat rules with durations to state over the design day.
    pub heat_rules: Vec<HeatRule>,
}

/// One section of the report.
#[derive(Debug, Clone)]
pub struct Section {
    /// Its element id (`<section id=…>`).
    pub id: &'static str,
    /// Its heading.
    pub heading: String,
    /// Its body, HTML.
    pub body_html: String,
    /// The CSV tables behind it.
    pub tables: Vec<CsvTable>,
    /// Published sources of the models it adds to the leaf's.
    pub sources: &'static [Source],
}

/// A report in memory.
#[derive(Debug, Clone)]
pub struct Report {
    /// The HTML document.
    pub html: String,
    /// The CSV tables, in the order the report lists them.
    pub tables: Vec<CsvTable>,
    /// The single-leaf result the report is about.
    pub leaf: LeafResult,
}

/// What [`write_report`] wrote.
#[derive(Debug, Clone)]
pub struct ReportFiles {
    /// The HTML file.
    pub html: PathBuf,
    /// The CSV files.
    pub csv: Vec<PathBuf>,
    /// Size of the HTML file \[bytes\].
    pub html_bytes: u64,
    /// Time to compute and write everything.
    pub elapsed: Duration,
    /// The report's first sentence as plain text (for a status line).
    pub answer: String,
}

/// Computes the report for `doc` (with the optional sections its canopy section asks for,
/// [`extras_for`]) and writes `report.html` and its CSV tables into `out_dir` (created if
/// missing; files of an earlier report there are replaced).
///
/// # Errors
/// An invalid scenario (the engine's message), or a file that could not be written (with its
/// path).
pub fn write_report(
    doc: &ScenarioDocument,
    out_dir: &Path,
    units: UnitSystem,
) -> anyhow::Result<ReportFiles> {
    write_report_with(doc, &extras_for(doc), out_dir, units)
}

/// The optional sections a scenario asks for: its canopy section's profile and design day.
/// A canopy section that cannot be set up (an unknown crop, say) is left out here; the scenario's
/// `leafwind canopy` run names the reason.
#[must_use]
pub fn extras_for(doc: &ScenarioDocument) -> ReportExtras {
    match &doc.canopy {
        None => ReportExtras::default(),
        Some(section) => ReportExtras {
            canopy: section.profile_case(&doc.case, doc.heat_limit_c).ok(),
            design_day: section
                .design_day_inputs(&doc.case, doc.heat_limit_c)
                .ok()
                .flatten(),
            sizing: Some(
                section
                    .sizing(&doc.case, doc.heat_limit_c, doc.margin_k)
                    .map_err(|e| format!("{e:#}")),
            ),
            heat_rules: section.heat_rules.clone(),
        },
    }
}

/// As [`write_report`], with optional sections.
///
/// # Errors
/// As [`write_report`].
pub fn write_report_with(
    doc: &ScenarioDocument,
    extras: &ReportExtras,
    out_dir: &Path,
    units: UnitSystem,
) -> anyhow::Result<ReportFiles> {
    let start = Instant::now();
    let report = build_report(doc, extras, units)?;
    std::fs::create_dir_all(out_dir)
        .with_context(|| format!("could not create the folder {}", out_dir.display()))?;
    let html_path = out_dir.join(HTML_FILE);
    std::fs::write(&html_path, &report.html)
        .with_context(|| format!("could not write {}", html_path.display()))?;
    let csv = report
        .tables
        .iter()
        .map(|t| t.write_into(out_dir))
        .collect::<anyhow::Result<Vec<_>>>()?;
    Ok(ReportFiles {
        html: html_path,
        csv,
        html_bytes: report.html.len() as u64,
        elapsed: start.elapsed(),
        answer: plain_text(&answer::answer_html(&report.leaf, units)),
    })
}

/// Builds the report in memory.
///
/// # Errors
/// An invalid scenario: the engine's message for the first invalid input.
pub fn build_report(
    doc: &ScenarioDocument,
    extras: &ReportExtras,
    units: UnitSystem,
) -> anyhow::Result<Report> {
    doc.validate_extras()
        .map_err(|e| anyhow!("the scenario cannot be reported: {e}"))?;
    let leaf = LeafResult::solve(doc).map_err(|e| anyhow!("the scenario cannot be solved: {e}"))?;
    let sweep = compute_sweep(&SweepInput::of(doc)).map_err(|e| anyhow!("sweep: {e}"))?;
    // A map on logarithmic axes needs each axis to run from above zero to a higher value.
    let map = match map_problem(doc, units) {
        Some(why) => Err(why),
        None => compute_map(&MapInput::of(doc).with_cells(MAP_CELLS)),
    };

    let mut sections = vec![
        inputs_section(doc, &leaf, units),
        leaf_section(&leaf, units)?,
        sweep_section(doc, &leaf, &sweep, units)?,
        map_section(&leaf, map.as_ref(), units)?,
    ];
    if let Some(c) = &extras.canopy {
        sections.push(canopy_section(c, units));
    }
    if let Some(s) = &extras.sizing {
        let house = doc
            .fans
            .as_ref()
            .map(|f| (f.layout.house_length_m, f.layout.house_width_m));
        sections.push(sizing_section(s, house, units));
    }
    if let Some((day, case)) = &extras.design_day {
        sections.push(design_day_section(day, case, &extras.heat_rules, units));
    }
    let tables: Vec<CsvTable> = sections.iter().flat_map(|s| s.tables.clone()).collect();
    let mut sources: Vec<Source> = text::LEAF_SOURCES.to_vec();
    for s in &sections {
        sources.extend_from_slice(s.sources);
    }
    let html = page(doc, &leaf, &sections, &sources, &tables, units);
    Ok(Report { html, tables, leaf })
}

// ---------------------------------------------------------------------------------------------
// Sections

fn humidity_row(h: Humidity, units: UnitSystem) -> (String, f64, String, &'static str) {
    match h {
        Humidity::RelativePct(rh) => ("Relative humidity".into(), rh, format!("{rh:.0} %"), "%"),
        Humidity::DewPointC(d) => (
            "Dew point".into(),
            d,
            show(Quantity::Temperature, d, units),
            Quantity::Temperature.unit(units),
        ),
        Humidity::DeficitKpa(v) => (
            "Vapour-pressure deficit".into(),
            v,
            format!("{v:.2} kPa"),
            "kPa",
        ),
    }
}

/// Collects the rows of a quantity table and the same rows as CSV (`quantity, value, unit`).
struct QuantityRows {
    rows: Vec<Row>,
    csv: CsvTable,
    units: UnitSystem,
}

impl QuantityRows {
    fn new(file: &'static str, description: &'static str, units: UnitSystem) -> Self {
        Self {
            rows: Vec::new(),
            csv: CsvTable::new(
                file,
                description,
                vec![
                    "quantity".to_owned(),
                    "value".to_owned(),
                    "unit".to_owned(),
                    "note".to_owned(),
                ],
            ),
            units,
        }
    }

    /// A value of quantity `q` (SI in) with the quantity's usual decimals.
    fn q(&mut self, name: &str, id: &str, q: Quantity, si: f64, note: &str) {
        let d = q.decimals(self.units);
        self.qd(name, id, q, si, d, note);
    }

    /// As [`QuantityRows::q`] with chosen decimals.
    fn qd(&mut self, name: &str, id: &str, q: Quantity, si: f64, decimals: usize, note: &str) {
        let shown = show_with(q, si, self.units, decimals);
        self.rows.push(Row::num(name, Some(id), si, &shown, note));
        self.csv.rows.push(vec![
            name.to_owned(),
            csv_q(q, si, self.units),
            q.unit(self.units).to_owned(),
            note.to_owned(),
        ]);
    }

    /// A value shown as given text, with a CSV value and unit.
    fn raw(&mut self, name: &str, shown: &str, csv_value: &str, unit: &str, note: &str) {
        self.rows.push(Row::text(name, shown, note));
        self.csv.rows.push(vec![
            name.to_owned(),
            csv_value.to_owned(),
            unit.to_owned(),
            note.to_owned(),
        ]);
    }
}

fn inputs_section(doc: &ScenarioDocument, leaf: &LeafResult, units: UnitSystem) -> Section {
    let c = &doc.case;
    let s = &leaf.solution;
    let (tq, dq, sp, sz) = (
        Quantity::Temperature,
        Quantity::TempDiff,
        Quantity::Speed,
        Quantity::LeafSize,
    );
    let mut r = QuantityRows::new("inputs.csv", "the scenario's inputs", units);
    r.q(
        "Air temperature",
        "in-air-temp",
        tq,
        c.air.temp_c,
        "around the leaf",
    );
    let (hname, hval, hshown, hunit) = humidity_row(c.air.humidity, units);
    // The note gives the other forms of the same humidity.
    let rh =
        leafwind_physics::air::rh_from_vapour_pressure_pct(c.air.temp_c, s.air_vapour_pressure_kpa);
    let dew = s.air_dew_point_c.map_or_else(
        || "no dew point (dry air)".to_owned(),
        |d| format!("dew point {}", show(tq, d, units)),
    );
    let hnote = match c.air.humidity {
        Humidity::RelativePct(_) => format!(
            "vapour pressure {:.2} kPa, {dew}",
            s.air_vapour_pressure_kpa
        ),
        Humidity::DewPointC(_) => format!(
            "relative humidity {rh:.0} %, vapour pressure {:.2} kPa",
            s.air_vapour_pressure_kpa
        ),
        Humidity::DeficitKpa(_) => format!("relative humidity {rh:.0} %, {dew}"),
    };
    let hcsv = match c.air.humidity {
        Humidity::DewPointC(d) => csv_q(tq, d, units),
        _ => csv_num(hval),
    };
    r.raw(&hname, &hshown, &hcsv, hunit, &hnote);
    let pnote = doc.altitude_m.map_or_else(
        || "as given".to_owned(),
        |z| {
            format!(
                "from the site altitude of {}",
                show(Quantity::Altitude, z, units)
            )
        },
    );
    r.q(
        "Air pressure",
        "in-pressure",
        Quantity::Pressure,
        c.air.pressure_kpa,
        &pnote,
    );
    r.q(
        "Air speed over the leaf",
        "in-speed",
        sp,
        c.air.speed_m_s,
        "free stream, along the leaf",
    );
    r.qd(
        "Turbulence factor",
        "in-turbulence",
        Quantity::Same(""),
        c.air.turbulence_factor,
        2,
        "multiplies forced convection; about 1.4 outdoors (Campbell & Norman 1998, ch. 7)",
    );
    r.qd(
        "Leaf size along the wind",
        "in-leaf-size",
        sz,
        c.leaf.dimension_m,
        if units == UnitSystem::Si { 0 } else { 2 },
        "characteristic dimension",
    );
    match c.leaf.free_convection_length_m {
        Some(l) => r.qd(
            "Free-convection length",
            "in-free-length",
            sz,
            l,
            if units == UnitSystem::Si { 1 } else { 3 },
            "leaf area over perimeter, from the outline",
        ),
        None => r.raw(
            "Free-convection length",
            &show_with(
                sz,
                c.leaf.free_convection_length_m(),
                units,
                if units == UnitSystem::Si { 1 } else { 3 },
            ),
            &csv_q(sz, c.leaf.free_convection_length_m(), units),
            sz.unit(units),
            "square leaf assumed: area over perimeter = size / 4",
        ),
    }
    let wm2 = Quantity::Same("W/m²");
    r.qd(
        "Sunlight on the upper face",
        "in-sun",
        wm2,
        c.surroundings.shortwave_w_m2,
        0,
        "direct plus diffuse, on the leaf's plane",
    );
    let none = Quantity::Same("");
    r.qd(
        "Leaf absorptivity for sunlight",
        "in-absorptivity",
        none,
        c.leaf.absorptivity,
        2,
        "",
    );
    r.qd(
        "Leaf emissivity",
        "in-emissivity",
        none,
        c.leaf.emissivity,
        2,
        "heat radiation",
    );
    let g = Quantity::Same("mol/m²/s");
    r.qd(
        "Stomatal conductance",
        "in-stomatal",
        g,
        c.leaf.stomatal_conductance_mol_m2_s,
        3,
        "both faces together; held fixed",
    );
    r.raw(
        "Share of stomata on the lower face",
        &format!("{:.0} %", 100.0 * c.leaf.lower_share),
        &csv_num(100.0 * c.leaf.lower_share),
        "%",
        "",
    );
    r.qd(
        "Cuticular conductance",
        "in-cuticular",
        g,
        c.leaf.cuticular_conductance_mol_m2_s,
        3,
        "both faces together",
    );
    let (view, view_csv, view_unit) = match c.surroundings.upper_view {
        UpperView::ClearSky => (
            format!(
                "clear sky (radiant temperature {})",
                show(tq, s.above_radiant_temp_c, units)
            ),
            csv_q(tq, s.above_radiant_temp_c, units),
            tq.unit(units),
        ),
        UpperView::SkyTempC(t) => (
            format!("sky at {}", show(tq, t, units)),
            csv_q(tq, t, units),
            tq.unit(units),
        ),
        UpperView::CoverTempC(t) => (
            format!("cover at {}", show(tq, t, units)),
            csv_q(tq, t, units),
            tq.unit(units),
        ),
    };
    r.raw(
        "Above the leaf",
        &view,
        &view_csv,
        view_unit,
        "what the upper face sees for heat radiation",
    );
    r.qd(
        "Ground albedo",
        "in-albedo",
        none,
        c.surroundings.ground_albedo,
        2,
        "share of sunlight the ground reflects onto the lower face",
    );
    match c.surroundings.ground_temp_c {
        Some(t) => r.q("Ground surface temperature", "in-ground-temp", tq, t, ""),
        None => r.raw(
            "Ground surface temperature",
            "at the air temperature",
            &csv_q(tq, c.air.temp_c, units),
            tq.unit(units),
            "",
        ),
    }
    r.raw(
        "Critical Reynolds number",
        &show_sig(c.critical_reynolds),
        &csv_num(c.critical_reynolds),
        "",
        "laminar to turbulent transition (Incropera §7.2: 5 × 10⁵)",
    );
    r.q(
        "Leaf temperature limit",
        "in-limit",
        tq,
        doc.heat_limit_c,
        "the crop's limit: set it for your crop and stage",
    );
    r.q(
        "Margin kept below the limit",
        "in-margin",
        dq,
        doc.margin_k,
        "",
    );
    let sizes: Vec<String> = doc
        .sweep_sizes_m()
        .iter()
        .map(|&d| show(sz, d, units))
        .collect();
    r.raw(
        "Leaf sizes compared",
        &sizes.join(", "),
        &doc.sweep_sizes_m()
            .iter()
            .map(|&d| csv_q(sz, d, units))
            .collect::<Vec<_>>()
            .join(" "),
        sz.unit(units),
        "the scenario's size first",
    );
    r.q(
        "Sweep up to",
        "in-sweep-max",
        sp,
        doc.sweep.max_speed_m_s,
        "highest air speed of the sweep",
    );
    r.raw(
        "Map air speeds",
        &format!(
            "{} to {}",
            show(sp, doc.map.speed_min_m_s, units),
            show(sp, doc.map.speed_max_m_s, units)
        ),
        &format!(
            "{} {}",
            csv_q(sp, doc.map.speed_min_m_s, units),
            csv_q(sp, doc.map.speed_max_m_s, units)
        ),
        sp.unit(units),
        "logarithmic axis",
    );
    r.raw(
        "Map leaf sizes",
        &format!(
            "{} to {}",
            show(sz, doc.map.size_min_m, units),
            show(sz, doc.map.size_max_m, units)
        ),
        &format!(
            "{} {}",
            csv_q(sz, doc.map.size_min_m, units),
            csv_q(sz, doc.map.size_max_m, units)
        ),
        sz.unit(units),
        "logarithmic axis",
    );
    let body = quantity_table("inputs-table", "The scenario's inputs", &r.rows);
    Section {
        id: "inputs",
        heading: "Inputs".to_owned(),
        body_html: body,
        tables: vec![r.csv],
        sources: &[],
    }
}

const SUNLIGHT: RgbTuple = (230, 159, 0);
const LONGWAVE_IN: RgbTuple = (204, 121, 167);
const EMITTED: RgbTuple = (86, 180, 233);
const SENSIBLE: RgbTuple = (213, 94, 0);
const LATENT: RgbTuple = (0, 114, 178);

type RgbTuple = (u8, u8, u8);

fn rgb(c: RgbTuple) -> plotters::style::RGBColor {
    plotters::style::RGBColor(c.0, c.1, c.2)
}

/// The budget's bars: into the leaf (sunlight and heat radiation absorbed, and sensible or latent
/// heat when they flow in) and out of it.
#[must_use]
pub fn budget_bars(r: &LeafResult) -> Vec<BudgetBar> {
    let s = &r.solution;
    let t = &s.terms;
    let sensible_name = if t.sensible_w_m2 >= 0.0 {
        "Sensible heat to the air"
    } else {
        "Sensible heat from the air"
    };
    let latent_name = if t.latent_w_m2 >= 0.0 {
        "Latent heat (transpiration)"
    } else {
        "Latent heat (dew)"
    };
    vec![
        BudgetBar {
            name: "Sunlight absorbed",
            w_m2: s.absorbed_shortwave_w_m2,
            gain: true,
            colour: rgb(SUNLIGHT),
        },
        BudgetBar {
            name: "Heat radiation absorbed",
            w_m2: s.absorbed_longwave_w_m2,
            gain: true,
            colour: rgb(LONGWAVE_IN),
        },
        BudgetBar {
            name: "Heat radiation emitted",
            w_m2: t.emitted_w_m2,
            gain: false,
            colour: rgb(EMITTED),
        },
        BudgetBar {
            name: sensible_name,
            w_m2: t.sensible_w_m2.abs(),
            gain: t.sensible_w_m2 < 0.0,
            colour: rgb(SENSIBLE),
        },
        BudgetBar {
            name: latent_name,
            w_m2: t.latent_w_m2.abs(),
            gain: t.latent_w_m2 < 0.0,
            colour: rgb(LATENT),
        },
    ]
}

#[allow(clippy::too_many_lines)]
fn leaf_section(leaf: &LeafResult, units: UnitSystem) -> anyhow::Result<Section> {
    use leafwind_physics::transpiration::{mol_to_g_per_m2_h, mol_to_mmol};
    let s = &leaf.solution;
    let t = &s.terms;
    let c = &t.convection;
    let (tq, dq, th) = (
        Quantity::Temperature,
        Quantity::TempDiff,
        Quantity::Thickness,
    );
    let mut r = QuantityRows::new("leaf_result.csv", "the leaf's result", units);
    r.q(
        "Leaf temperature",
        "res-leaf-temp",
        tq,
        s.leaf_temp_c,
        "exact energy balance",
    );
    r.q(
        "Leaf minus air",
        "res-leaf-air-diff",
        dq,
        s.leaf_air_diff_k,
        "positive: the leaf is warmer than the air",
    );
    r.q(
        "Limit minus leaf",
        "res-margin",
        dq,
        leaf.margin_to_limit_k(),
        "positive: below the limit",
    );
    r.q(
        "Linearised estimate",
        "res-linearised",
        tq,
        s.linearised.leaf_temp_c,
        &format!(
            "Penman–Monteith-type closed form; exact − linearised {}",
            show_with(dq, s.linearisation_error_k(), units, 2)
        ),
    );
    r.qd(
        "Transpiration",
        "res-transpiration",
        Quantity::Same("mmol/m²/s"),
        mol_to_mmol(t.transpiration_mol_m2_s),
        2,
        &format!(
            "{:.0} g of water per m² of leaf per hour",
            mol_to_g_per_m2_h(t.transpiration_mol_m2_s)
        ),
    );
    r.qd(
        "Heat-transfer coefficient",
        "res-h",
        Quantity::Same("W/m²/K"),
        c.heat_total_w_m2_k(),
        1,
        "convection, both faces",
    );
    r.raw(
        "Convection",
        c.regime.label(),
        c.regime.label(),
        "",
        &format!(
            "{}; Reynolds number {}, Grashof number {}",
            c.regime.description(),
            show_sig(c.reynolds),
            show_sig(c.grashof)
        ),
    );
    match s.bl_thickness_m {
        Some(d) => r.q(
            "Boundary layer, 99 % thickness",
            "res-bl99",
            th,
            d,
            "velocity boundary layer at the trailing edge",
        ),
        None => r.raw(
            "Boundary layer, 99 % thickness",
            &format!("{MISSING} (still air)"),
            "",
            th.unit(units),
            "no forced boundary layer in still air",
        ),
    }
    match s.effective_bl_thickness_m {
        Some(d) => r.q(
            "Boundary layer, heat-equivalent thickness",
            "res-bl-eff",
            th,
            d,
            "still-air layer with the same heat resistance (k/h)",
        ),
        None => r.raw(
            "Boundary layer, heat-equivalent thickness",
            MISSING,
            "",
            th.unit(units),
            "",
        ),
    }
    r.qd(
        "Leaf-to-air vapour-pressure deficit",
        "res-leaf-vpd",
        Quantity::Same("kPa"),
        s.leaf_vpd_kpa,
        2,
        "drives transpiration",
    );
    r.q(
        "Radiant temperature above the leaf",
        "res-above",
        tq,
        s.above_radiant_temp_c,
        "sky or cover",
    );
    r.raw(
        "Solver",
        &format!(
            "{} after {} iterations",
            format!("{:?}", s.solver.status).to_lowercase(),
            s.solver.iterations
        ),
        &s.solver.iterations.to_string(),
        "iterations",
        &format!("energy-balance residual {} W/m²", show_sig(t.residual_w_m2)),
    );
    let mut body = quantity_table(
        "result-table",
        "The leaf at the scenario's air speed",
        &r.rows,
    );

    let bars = budget_bars(leaf);
    let svg = plots::budget_svg(&bars)?;
    body.push_str(&figure(
        "fig-budget",
        &svg,
        "Energy flowing into the leaf (left bar) and out of it (right bar), per square metre of leaf; the two bars are equally tall because the balance closes.",
        "energy_budget.csv",
    ));
    let gains: Vec<&BudgetBar> = bars.iter().filter(|b| b.gain).collect();
    let losses: Vec<&BudgetBar> = bars.iter().filter(|b| !b.gain).collect();
    let total_in: f64 = gains.iter().map(|b| b.w_m2).sum();
    let total_out: f64 = losses.iter().map(|b| b.w_m2).sum();
    let n = gains.len().max(losses.len());
    let cell = |b: Option<&&BudgetBar>| {
        b.map_or((String::new(), String::new()), |b| {
            (b.name.to_owned(), show_num(b.w_m2, 1))
        })
    };
    let mut rows: Vec<Vec<String>> = (0..n)
        .map(|i| {
            let (a, av) = cell(gains.get(i));
            let (b, bv) = cell(losses.get(i));
            vec![a, av, b, bv]
        })
        .collect();
    rows.push(vec![
        "Total in".to_owned(),
        show_num(total_in, 1),
        "Total out".to_owned(),
        show_num(total_out, 1),
    ]);
    body.push_str("<div class=\"keep\">\n");
    body.push_str(&grid_table(
        "budget-table",
        "Energy budget per square metre of leaf (both faces) [W/m²]",
        &[
            "Into the leaf".to_owned(),
            "W/m²".to_owned(),
            "Out of the leaf".to_owned(),
            "W/m²".to_owned(),
        ],
        &rows,
        &[1, 3],
    ));
    body.push_str(&format!(
        "<p class=\"closure\" id=\"budget-closure\">In {} W/m² = out {} W/m²: the balance closes to {} W/m².</p>\n",
        num_span(Some("budget-in"), total_in, &show_num(total_in, 1)),
        num_span(Some("budget-out"), total_out, &show_num(total_out, 1)),
        num_span(Some("budget-residual"), t.residual_w_m2, &show_sig(t.residual_w_m2)),
    ));
    body.push_str("</div>\n");
    let mut budget = CsvTable::new(
        "energy_budget.csv",
        "energy budget: each flow into and out of the leaf",
        vec![
            "term".to_owned(),
            "direction".to_owned(),
            "flux [W/m²]".to_owned(),
        ],
    );
    for b in &bars {
        budget.rows.push(vec![
            b.name.to_owned(),
            if b.gain { "in" } else { "out" }.to_owned(),
            csv_num(b.w_m2),
        ]);
    }
    budget
        .rows
        .push(vec!["Total in".into(), "in".into(), csv_num(total_in)]);
    budget
        .rows
        .push(vec!["Total out".into(), "out".into(), csv_num(total_out)]);
    budget.rows.push(vec![
        "Residual (in − out)".into(),
        String::new(),
        csv_num(t.residual_w_m2),
    ]);
    Ok(Section {
        id: "leaf-result",
        heading: "The leaf and its energy budget".to_owned(),
        body_html: body,
        tables: vec![r.csv, budget],
        sources: &[],
    })
}

fn least_speed_of(answer: &Result<WindAnswer, String>) -> Option<f64> {
    answer.as_ref().ok().and_then(WindAnswer::speed_m_s)
}

fn sweep_section(
    doc: &ScenarioDocument,
    leaf: &LeafResult,
    sweep: &SweepResult,
    units: UnitSystem,
) -> anyhow::Result<Section> {
    let (sp, sz, dq, tq, th) = (
        Quantity::Speed,
        Quantity::LeafSize,
        Quantity::TempDiff,
        Quantity::Temperature,
        Quantity::Thickness,
    );
    let least = least_speed_of(&leaf.wind);
    let mut body = String::from(
        "<p>Each curve is one leaf size with everything else as in the inputs. Where a curve runs under the dashed line, that leaf at that air speed stays at least the margin below the limit. The boundary layer — the still film of air that insulates the leaf — thins as the air speeds up, which is why more air cools a sunlit leaf.</p>\n",
    );
    let svg = plots::sweep_diff_svg(sweep, leaf, least, units)?;
    body.push_str(&figure(
        "fig-sweep-diff",
        &svg,
        "Leaf temperature above (or below) the air against air speed. Solid black: the limit; dashed black: the limit less the margin; circle: the scenario now.",
        "sweep.csv",
    ));
    let svg = plots::sweep_thickness_svg(sweep, leaf, units)?;
    body.push_str(&figure(
        "fig-sweep-thickness",
        &svg,
        "Thickness of the boundary layer (99 % of the free-stream speed) at the leaf's trailing edge; it grows without bound toward still air, so the plot starts at a tenth of the highest speed.",
        "sweep.csv",
    ));
    // The least air speed for every size compared.
    let mut rows = Vec::new();
    for (i, c) in sweep.curves.iter().enumerate() {
        let answer = if i == 0 {
            leaf.wind.clone()
        } else {
            required_wind(
                &doc.case.with_dimension(c.size_m),
                doc.heat_limit_c,
                doc.margin_k,
                SEARCH_MAX_SPEED_DEFAULT_M_S,
            )
            .map_err(|e| e.to_string())
        };
        let text = match &answer {
            Ok(WindAnswer::NotNeeded { .. }) => "none needed".to_owned(),
            Ok(WindAnswer::Speed { speed_m_s, .. }) => show(sp, *speed_m_s, units),
            Ok(WindAnswer::Unreachable(_)) => "not reachable with air".to_owned(),
            Err(_) => MISSING.to_owned(),
        };
        let still = c.diff_k.first().copied().flatten();
        rows.push(vec![
            plots::size_name(c.size_m, i == 0, units),
            still.map_or_else(|| MISSING.to_owned(), |d| show_with(dq, d, units, 1)),
            text,
        ]);
    }
    body.push_str(&grid_table(
        "least-speed-table",
        "Least air speed for the limit less the margin, by leaf size",
        &[
            "Leaf".to_owned(),
            format!("Leaf − air in still air [{}]", dq.unit(units)),
            "Least air speed".to_owned(),
        ],
        &rows,
        &[1, 2],
    ));
    let mut csv = CsvTable::new(
        "sweep.csv",
        "sweep over air speed: leaf − air and boundary layer, per leaf size",
        vec![
            head("leaf_size", sz, units),
            head("air_speed", sp, units),
            head("leaf_minus_air", dq, units),
            head("leaf_temperature", tq, units),
            head("bl_thickness_99", th, units),
            head("bl_heat_equivalent_thickness", th, units),
        ],
    );
    for c in &sweep.curves {
        for i in 0..c.speeds_m_s.len() {
            let d = c.diff_k.get(i).copied().flatten();
            csv.rows.push(vec![
                csv_q(sz, c.size_m, units),
                csv_q(sp, c.speeds_m_s[i], units),
                csv_opt(dq, d, units),
                csv_opt(tq, d.map(|d| d + sweep.air_temp_c), units),
                csv_opt(th, c.delta99_m.get(i).copied().flatten(), units),
                csv_opt(th, c.effective_m.get(i).copied().flatten(), units),
            ]);
        }
    }
    Ok(Section {
        id: "sweep",
        heading: "Air speed and leaf size".to_owned(),
        body_html: body,
        tables: vec![csv],
        sources: &[],
    })
}

/// Why the map's axes cannot be drawn on logarithmic scales, if they cannot.
fn map_problem(doc: &ScenarioDocument, units: UnitSystem) -> Option<String> {
    let m = &doc.map;
    let (sp, sz) = (Quantity::Speed, Quantity::LeafSize);
    if !(m.speed_min_m_s > 0.0 && m.speed_min_m_s < m.speed_max_m_s) {
        return Some(format!(
            "its air speed axis must run from a speed above zero to a higher one (it is set from {} to {})",
            show(sp, m.speed_min_m_s, units),
            show(sp, m.speed_max_m_s, units)
        ));
    }
    if !(m.size_min_m > 0.0 && m.size_min_m < m.size_max_m) {
        return Some(format!(
            "its leaf size axis must run from a size above zero to a larger one (it is set from {} to {})",
            show(sz, m.size_min_m, units),
            show(sz, m.size_max_m, units)
        ));
    }
    None
}

fn map_section(
    leaf: &LeafResult,
    map: Result<&MapResult, &String>,
    units: UnitSystem,
) -> anyhow::Result<Section> {
    let map = match map {
        Ok(m) => m,
        Err(why) => {
            return Ok(Section {
                id: "map",
                heading: "Wind × leaf size map".to_owned(),
                body_html: format!(
                    "<p class=\"warning\">The map is left out: {}.</p>\n",
                    esc(why)
                ),
                tables: Vec::new(),
                sources: &[],
            });
        }
    };
    let (sp, sz, tq, dq) = (
        Quantity::Speed,
        Quantity::LeafSize,
        Quantity::Temperature,
        Quantity::TempDiff,
    );
    let finite: Vec<f64> = map
        .leaf_temp_c
        .iter()
        .copied()
        .filter(|t| t.is_finite())
        .collect();
    let coolest = finite.iter().copied().fold(f64::INFINITY, f64::min);
    let hottest = finite.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let what = match map.input.quantity {
        MapQuantity::LeafTemperature => "the leaf temperature",
        MapQuantity::MarginToLimit => {
            "the limit minus the leaf temperature (red: over the limit, blue-green: below it)"
        }
    };
    let reach = if hottest <= leaf.limit_c {
        format!(
            " No leaf on this map reaches the limit (the hottest cell is at {}).",
            show(tq, hottest, units)
        )
    } else if coolest > leaf.limit_c {
        format!(
            " Every leaf on this map is over the limit (the coolest cell is at {}).",
            show(tq, coolest, units)
        )
    } else if map.margin_lines.is_empty() {
        format!(
            " Nowhere on this map does the leaf come down to the limit less the margin ({}).",
            show(tq, leaf.limit_c - leaf.margin_k, units)
        )
    } else {
        String::new()
    };
    let mut body = format!(
        "<p>Each cell is one leaf size and air speed, with everything else as in the inputs; the colour shows {}. The solid black line is where the leaf is exactly at the limit, the dashed line where it is at the limit less the margin; the white circle is the scenario.{}</p>\n",
        esc(what),
        esc(&reach)
    );
    let svg = plots::map_svg(map, leaf, units)?;
    body.push_str(&figure(
        "fig-map",
        &svg,
        &format!(
            "{} × {} cells on logarithmic axes, leaf temperatures from {} to {}.",
            map.speeds_m_s.len(),
            map.sizes_m.len(),
            show(tq, coolest, units),
            show(tq, hottest, units)
        ),
        "map.csv",
    ));
    let mut csv = CsvTable::new(
        "map.csv",
        "wind × leaf size map: one row per cell",
        vec![
            head("air_speed", sp, units),
            head("leaf_size", sz, units),
            head("leaf_temperature", tq, units),
            head("limit_minus_leaf", dq, units),
        ],
    );
    let w = map.speeds_m_s.len();
    for (r, &d) in map.sizes_m.iter().enumerate() {
        for (c, &u) in map.speeds_m_s.iter().enumerate() {
            let t = map.leaf_temp_c[r * w + c];
            csv.rows.push(vec![
                csv_q(sp, u, units),
                csv_q(sz, d, units),
                csv_q(tq, t, units),
                csv_q(dq, map.input.limit_c - t, units),
            ]);
        }
    }
    Ok(Section {
        id: "map",
        heading: "Wind × leaf size map".to_owned(),
        body_html: body,
        tables: vec![csv],
        sources: &[],
    })
}

// ---------------------------------------------------------------------------------------------
// The page

/// The page's style: light background only, A4 and Letter both fit (content width at most
/// 186 mm, the narrower A4's with 12 mm margins), one section per printed page.
const STYLE: &str = r#"
:root { color-scheme: light; }
html { background: #ffffff; }
body { font-family: "DejaVu Sans", "Liberation Sans", Arial, Helvetica, sans-serif; color: #1b1b1b;
  background: #ffffff; max-width: 186mm; margin: 0 auto; padding: 10mm 8mm 16mm; font-size: 10.5pt;
  line-height: 1.42; }
header { border-bottom: 2pt solid #2f6b2f; padding-bottom: 3mm; margin-bottom: 4mm; }
h1 { font-size: 19pt; margin: 0 0 1.5mm; line-height: 1.2; }
h2 { font-size: 14pt; margin: 7mm 0 2.5mm; color: #1f4d1f; border-bottom: 0.75pt solid #9bb89b;
  padding-bottom: 1mm; }
p.meta { margin: 0; color: #4a4a4a; font-size: 9.5pt; }
.answer { font-size: 12.5pt; line-height: 1.45; border-left: 5pt solid #2f6b2f; background: #f2f7f0;
  padding: 3mm 4mm; margin: 0 0 2mm; }
.status { font-size: 11pt; margin: 2mm 0; padding: 1.5mm 4mm; border-left: 5pt solid #999; }
.status.ok { border-left-color: #2f6b2f; }
.status.close { border-left-color: #c98a00; }
.status.over { border-left-color: #b3261e; }
p.check { font-size: 9.5pt; color: #3d3d3d; }
.notes p { margin: 0 0 2mm; }
table { border-collapse: collapse; width: 100%; font-size: 9.5pt; margin: 2mm 0 4mm; }
caption { text-align: left; font-weight: bold; padding-bottom: 1mm; }
th, td { border-bottom: 0.5pt solid #c8c8c8; padding: 0.8mm 2mm; text-align: left;
  vertical-align: top; }
thead th { border-bottom: 1pt solid #555; }
tbody th { font-weight: normal; }
td.value, th.value { text-align: right; white-space: nowrap; font-variant-numeric: tabular-nums; }
td.note { color: #4a4a4a; font-size: 9pt; }
table.grid tbody tr:last-child td { font-weight: bold; }
table#least-speed-table tbody tr:last-child td, table#canopy-table tbody tr:last-child td,
table#design-day-table tbody tr:last-child td { font-weight: normal; }
p.closure { font-weight: bold; }
figure { margin: 3mm 0 5mm; }
figure svg { display: block; width: 100%; height: auto; }
figure#fig-map svg rect { shape-rendering: crispEdges; }
figcaption { font-size: 9pt; color: #3d3d3d; margin-top: 1mm; }
ol.sources li, ul.assumptions li, ul.cautions li { margin-bottom: 1.5mm; }
.warning { border-left: 5pt solid #b3261e; padding-left: 3mm; }
a { color: #1f4d8f; }
@page { margin: 12mm 12mm 14mm; }
@media print {
  body { max-width: none; margin: 0; padding: 0; font-size: 10pt; }
  section.page { break-before: page; }
  h2, h3, caption { break-after: avoid; }
  figure, table.grid, .answer, .status, tr { break-inside: avoid; }
  figure svg { max-width: 165mm; margin: 0 auto; }
  figure#fig-budget svg { max-width: 130mm; }
  div.keep { break-inside: avoid; }
  th, td { padding: 0.6mm 2mm; }
  a { color: inherit; text-decoration: none; }
  .answer, .status { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
}
"#;

/// Visible text of an HTML fragment (tags dropped, the few entities the report writes decoded).
#[must_use]
pub fn plain_text(html: &str) -> String {
    let mut out = String::with_capacity(html.len());
    let mut in_tag = false;
    for ch in html.chars() {
        match ch {
            '<' => in_tag = true,
            '>' => in_tag = false,
            c if !in_tag => out.push(c),
            _ => {}
        }
    }
    html_escape::decode_html_entities(&out).into_owned()
}

/// Today's date and time in UTC, "2026-12-02 02:50 UTC" (days to civil date after H. Hinnant,
/// "chrono-Compatible Low-Level Date Algorithms", `civil_from_days`; from memory).
fn utc_now() -> String {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_secs());
    let days = (secs / 86_400) as i64;
    let rem = secs % 86_400;
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!(
        "{y:04}-{m:02}-{d:02} {:02}:{:02} UTC",
        rem / 3600,
        (rem % 3600) / 60
    )
}

fn notes_html(notes: &str) -> String {
    let notes = notes.trim();
    if notes.is_empty() {
        return "<p>The scenario has no notes.</p>\n".to_owned();
    }
    notes
        .split("\n\n")
        .map(|p| {
            let lines: Vec<String> = p.lines().map(esc).collect();
            format!("<p>{}</p>\n", lines.join("<br>"))
        })
        .collect()
}

fn page(
    doc: &ScenarioDocument,
    leaf: &LeafResult,
    sections: &[Section],
    sources: &[Source],
    tables: &[CsvTable],
    units: UnitSystem,
) -> String {
    let title = if doc.title.trim().is_empty() {
        "Untitled scenario"
    } else {
        doc.title.trim()
    };
    let mut h = String::with_capacity(600_000);
    h.push_str("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
    h.push_str("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n");
    h.push_str(&format!(
        "<meta name=\"generator\" content=\"Leafwind {}\">\n",
        env!("CARGO_PKG_VERSION")
    ));
    h.push_str(&format!(
        "<title>{} — Leafwind report</title>\n<style>{STYLE}</style>\n</head>\n<body>\n",
        esc(title)
    ));
    h.push_str(&format!(
        "<header id=\"title\">\n<h1>{}</h1>\n<p class=\"meta\">Leafwind report · leaf temperature in moving air · units: {} · written {} by Leafwind {}</p>\n</header>\n",
        esc(title),
        esc(units.name()),
        esc(&utc_now()),
        env!("CARGO_PKG_VERSION")
    ));
    h.push_str(&format!(
        "<section id=\"answer\">\n<h2>The answer</h2>\n<p class=\"answer\">{}</p>\n<p class=\"status {}\">{}</p>\n<p class=\"check\">An estimate from physics and typical parameters: check it with an infrared thermometer on the leaves and an anemometer at the leaves before acting on it (see the cautions at the end).</p>\n</section>\n",
        answer::answer_html(leaf, units),
        answer::status_class(leaf),
        answer::status_html(leaf, units)
    ));
    h.push_str(&format!(
        "<section id=\"notes\" class=\"notes\">\n<h2>The scenario</h2>\n{}</section>\n",
        notes_html(&doc.notes)
    ));
    for (i, s) in sections.iter().enumerate() {
        // The inputs stay on the first page with the answer; every later section starts a page.
        let class = if i == 0 { "" } else { " class=\"page\"" };
        h.push_str(&format!(
            "<section id=\"{}\"{class}>\n<h2>{}</h2>\n{}</section>\n",
            attr(s.id),
            esc(&s.heading),
            s.body_html
        ));
    }
    h.push_str("<section id=\"assumptions\" class=\"page\">\n<h2>Assumptions</h2>\n<ul class=\"assumptions\">\n");
    for a in text::assumptions(&doc.case, units) {
        h.push_str(&format!("<li>{}</li>\n", esc(&a)));
    }
    h.push_str("</ul>\n</section>\n");
    h.push_str("<section id=\"sources\">\n<h2>Models and their published sources</h2>\n<ol class=\"sources\">\n");
    for s in sources {
        h.push_str(&format!(
            "<li><strong>{}.</strong> {}</li>\n",
            esc(s.model),
            esc(s.reference)
        ));
    }
    h.push_str("</ol>\n<p class=\"check\">Where a value or an equation number could not be checked against the printed source, the engine's documentation says “from memory”.</p>\n</section>\n");
    h.push_str("<section id=\"cautions\">\n<h2>Cautions</h2>\n<ul class=\"cautions\">\n");
    for c in text::CAUTIONS {
        h.push_str(&format!("<li>{}</li>\n", esc(c)));
    }
    h.push_str("</ul>\n</section>\n");
    h.push_str("<section id=\"files\">\n<h2>Files of this report</h2>\n<p>The numbers behind each plot and table, in the report's units (units in the column names), in this folder:</p>\n<ul>\n");
    for t in tables {
        h.push_str(&format!(
            "<li><a href=\"{}\">{}</a> — {}</li>\n",
            attr(t.file_name),
            esc(t.file_name),
            esc(t.description)
        ));
    }
    h.push_str("</ul>\n</section>\n</body>\n</html>\n");
    h
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn utc_date_looks_like_a_date() {
        let d = utc_now();
        assert_eq!(d.len(), "2026-12-02 02:50 UTC".len());
        assert!(d.ends_with(" UTC"));
    }

    #[test]
    fn plain_text_drops_tags() {
        assert_eq!(plain_text("<b>a</b> &amp; <i>b</i>"), "a & b");
    }
}

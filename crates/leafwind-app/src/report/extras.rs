//! Optional sections: the canopy profile, the canopy sizing answers and the hour-by-hour design day. The scenario document
//! has no canopy or design-day inputs yet, so these take the engine's own inputs
//! ([`CanopyCase`], [`DesignDay`] + [`SeriesCase`]) through [`super::ReportExtras`]; a report
//! without them simply has no such section.
//!
//! A section whose run fails still appears, with the engine's message instead of its results
//! (the rest of the report is unaffected).

use leafwind_physics::canopy::{CanopyCase, CanopySolution, solve_canopy};
use leafwind_physics::design_day::{DesignDay, HourResult, HourlySeries, SeriesCase, run};

use super::Section;
use super::html::{esc, figure, grid_table, num_span};
use super::plots::{LinePlot, Series, axis_title, line_plot_svg};
use super::tables::{CsvTable, csv_num, csv_opt, csv_q, head, show, show_opt, show_with};
use super::text::{CANOPY_SOURCES, DESIGN_DAY_SOURCES, SIZING_SOURCES};
use super::units::{Quantity, UnitSystem};
use crate::canopy_scenario::CanopySizing;
use crate::words::{rule_sentence, shade_sentence, speed_sentence, ventilation_sentence};
use leafwind_physics::heat_rules::{HeatRule, check_rule};

/// Heights in the canopy use the altitude unit (m or ft) with two decimals.
const HEIGHT: Quantity = Quantity::Altitude;

fn failed(id: &'static str, heading: &str, what: &str, e: &str) -> Section {
    Section {
        id,
        heading: heading.to_owned(),
        body_html: format!(
            "<p class=\"warning\">The {} could not be computed: {}.</p>\n",
            esc(what),
            esc(e.trim_end_matches('.'))
        ),
        tables: Vec::new(),
        sources: &[],
    }
}

/// The canopy sizing answers at the scenario's moment: the least canopy-top air speed, and under a
/// cover the least shade and the least ventilation rate beside the ventilation standard's factor
/// method, each in one sentence in the report's units, with the cautions that go with them.
#[must_use]
///
/// `house_m`: length and width of the house \[m\] (the fans section's), to state the least
/// ventilation rate also as the house's exhaust-fan flow.
pub fn sizing_section(
    sizing: &Result<CanopySizing, String>,
    house_m: Option<(f64, f64)>,
    units: UnitSystem,
) -> Section {
    const HEADING: &str = "Canopy sizing: air speed, shade and ventilation";
    let s = match sizing {
        Ok(s) => s,
        Err(e) => return failed("canopy-sizing", HEADING, "canopy sizing answers", e),
    };
    let mut body = String::new();
    for (id, sentence) in [
        ("canopy-least-speed", speed_sentence(&s.speed, units)),
        (
            "canopy-least-shade",
            shade_sentence(s.shade.as_ref(), units),
        ),
        (
            "canopy-least-ventilation",
            ventilation_sentence(s.ventilation.as_ref(), house_m, units),
        ),
    ] {
        body.push_str(&format!("<p id=\"{id}\">{}</p>\n", esc(&sentence)));
    }
    body.push_str(&format!(
        "<p class=\"note\">Limit: {} ({}, {}), kept {} below. Air speeds are at the top of the crop; ventilation rates are outside air exchanged per floor area (the fans' total rated flow divided by the floor area).</p>\n",
        esc(&show(Quantity::Temperature, s.limit.limit_c, units)),
        esc(&s.limit.crop),
        esc(s.limit.kind.word()),
        esc(&show(Quantity::TempDiff, s.margin_k, units)),
    ));
    body.push_str("<p class=\"warning\">Fans, vents, pads and their electrical installation must follow local codes and be designed and installed by licensed practitioners. A house that is hot for the crop is dangerous for the people working in it. Verify the air speed at the crop with an anemometer before relying on it.</p>\n");
    Section {
        id: "canopy-sizing",
        heading: HEADING.to_owned(),
        body_html: body,
        tables: Vec::new(),
        sources: SIZING_SOURCES,
    }
}

/// The canopy profile section: the sunlit and shaded leaf temperature of each layer against
/// height, the hottest leaf and its margin to the limit.
#[must_use]
pub fn canopy_section(case: &CanopyCase, units: UnitSystem) -> Section {
    match solve_canopy(case) {
        Ok(s) => canopy_from_solution(case, &s, units).unwrap_or_else(|e| {
            failed(
                "canopy",
                "Canopy profile",
                "canopy profile",
                &format!("{e:#}"),
            )
        }),
        Err(e) => failed("canopy", "Canopy profile", "canopy profile", &e.to_string()),
    }
}

fn canopy_from_solution(
    case: &CanopyCase,
    s: &CanopySolution,
    units: UnitSystem,
) -> anyhow::Result<Section> {
    let tq = Quantity::Temperature;
    let h = &s.hottest;
    let kind = if h.sunlit { "sunlit" } else { "shaded" };
    let margin = match (h.margin_k, case.limit_c) {
        (Some(m), Some(l)) => {
            let side = if m >= 0.0 { "below" } else { "above" };
            format!(
                ", {} {side} the {} limit",
                esc(&show(Quantity::TempDiff, m.abs(), units)),
                esc(&show(tq, l, units))
            )
        }
        _ => String::new(),
    };
    let mut body = format!(
        "<p>The hottest leaf of the canopy is a {kind} leaf in layer {} from the top, {} above the ground: {}{margin}. The air is at {} throughout (leaf area index {:.1}, {} layers).</p>\n",
        h.layer + 1,
        esc(&show_with(HEIGHT, h.height_m, units, 2)),
        num_span(
            Some("canopy-hottest"),
            h.leaf_temp_c,
            &show(tq, h.leaf_temp_c, units)
        ),
        esc(&show(tq, s.air_temp_c, units)),
        case.structure.lai,
        case.structure.layers
    );
    let top = case.structure.height_m;
    let hd = |m: f64| HEIGHT.to_display(m, units);
    let td = |c: f64| tq.to_display(c, units);
    let sunlit: Vec<(f64, f64)> = s
        .layers
        .iter()
        .filter_map(|l| l.sunlit_leaf_temp_c.map(|t| (td(t), hd(l.height_m))))
        .collect();
    let shaded: Vec<(f64, f64)> = s
        .layers
        .iter()
        .map(|l| (td(l.shaded_leaf_temp_c), hd(l.height_m)))
        .collect();
    let mut series = vec![
        Series::new("sunlit leaves", sunlit, false, Some(0)),
        Series::new("shaded leaves", shaded, false, Some(1)),
        Series::new(
            format!("air {}", show(tq, s.air_temp_c, units)),
            vec![(td(s.air_temp_c), 0.0), (td(s.air_temp_c), hd(top))],
            true,
            None,
        ),
    ];
    if let Some(l) = case.limit_c {
        series.push(Series::new(
            format!("limit {}", show(tq, l, units)),
            vec![(td(l), 0.0), (td(l), hd(top))],
            false,
            None,
        ));
    }
    let svg = line_plot_svg(&LinePlot {
        title: "Leaf temperature through the canopy".to_owned(),
        x_title: axis_title("leaf temperature", tq, units),
        y_title: axis_title("height above the ground", HEIGHT, units),
        series,
        label: "Sunlit and shaded leaf temperature against height in the canopy".to_owned(),
    })?;
    body.push_str(&figure(
        "fig-canopy",
        &svg,
        "Sunlit (vermillion) and shaded (blue) leaves of each layer; the dashed line is the air.",
        "canopy_profile.csv",
    ));
    let mut csv = CsvTable::new(
        "canopy_profile.csv",
        "canopy profile: each layer's sunlit and shaded leaf",
        vec![
            "layer_from_top".to_owned(),
            head("height", HEIGHT, units),
            "lai_above [m²/m²]".to_owned(),
            "sunlit_fraction [-]".to_owned(),
            head("air_speed", Quantity::Speed, units),
            head("sunlit_leaf_temperature", tq, units),
            head("shaded_leaf_temperature", tq, units),
            "absorbed_shortwave_sunlit [W/m² leaf]".to_owned(),
            "absorbed_shortwave_shaded [W/m² leaf]".to_owned(),
            "sensible [W/m² ground]".to_owned(),
            "latent [W/m² ground]".to_owned(),
        ],
    );
    let mut rows = Vec::new();
    for (i, l) in s.layers.iter().enumerate() {
        csv.rows.push(vec![
            (i + 1).to_string(),
            csv_q(HEIGHT, l.height_m, units),
            csv_num(l.lai_above),
            csv_num(l.sunlit_fraction),
            csv_q(Quantity::Speed, l.air_speed_m_s, units),
            csv_opt(tq, l.sunlit_leaf_temp_c, units),
            csv_q(tq, l.shaded_leaf_temp_c, units),
            csv_num(l.absorbed_shortwave_sunlit_w_m2),
            csv_num(l.absorbed_shortwave_shaded_w_m2),
            csv_num(l.sensible_w_m2),
            csv_num(l.latent_w_m2),
        ]);
        rows.push(vec![
            (i + 1).to_string(),
            show_with(HEIGHT, l.height_m, units, 2),
            format!("{:.0} %", 100.0 * l.sunlit_fraction),
            show(Quantity::Speed, l.air_speed_m_s, units),
            show_opt(tq, l.sunlit_leaf_temp_c, units),
            show(tq, l.shaded_leaf_temp_c, units),
        ]);
    }
    body.push_str(&grid_table(
        "canopy-table",
        "Layers from the top down",
        &[
            "Layer".to_owned(),
            "Height".to_owned(),
            "Leaves in sun".to_owned(),
            "Air speed".to_owned(),
            "Sunlit leaf".to_owned(),
            "Shaded leaf".to_owned(),
        ],
        &rows,
        &[0, 1, 2, 3, 4, 5],
    ));
    Ok(Section {
        id: "canopy",
        heading: "Canopy profile".to_owned(),
        body_html: body,
        tables: vec![csv],
        sources: CANOPY_SOURCES,
    })
}

/// The design-day section: 24 clear-sky hours of the hottest leaf against the crop's heat limit,
/// with the hours and degree-hours over it.
#[must_use]
///
/// `rules`: the scenario's heat rules with durations, each stated in one sentence over the day.
pub fn design_day_section(
    day: &DesignDay,
    case: &SeriesCase,
    rules: &[HeatRule],
    units: UnitSystem,
) -> Section {
    match run(day, case) {
        Ok(s) => design_day_from_series(day, &s, rules, units).unwrap_or_else(|e| {
            failed("design-day", "Design day", "design day", &format!("{e:#}"))
        }),
        Err(e) => failed("design-day", "Design day", "design day", &e.to_string()),
    }
}

fn design_day_from_series(
    day: &DesignDay,
    s: &HourlySeries,
    rules: &[HeatRule],
    units: UnitSystem,
) -> anyhow::Result<Section> {
    let tq = Quantity::Temperature;
    let dq = Quantity::TempDiff;
    let limit = &s.limit;
    let date = format!(
        "{:04}-{:02}-{:02}",
        day.date.year, day.date.month, day.date.day
    );
    let degree_unit = format!("{}·h", dq.unit(units));
    let degree_hours = dq.to_display(s.degree_hours_over_k_h, units);
    let mut body = format!(
        "<p>On the design day of {} (maximum {}, minimum {}, clear sky) the hottest leaf reaches {}. The {} limit is {} for {}, {} — source: {}. It is exceeded for {} h, by {} {} in all.</p>\n",
        esc(&date),
        esc(&show(tq, day.max_temp_c, units)),
        esc(&show(tq, day.min_temp_c, units)),
        num_span(
            Some("day-hottest"),
            s.max_leaf_temp_c.unwrap_or(f64::NAN),
            &show_opt(tq, s.max_leaf_temp_c, units)
        ),
        esc(limit.kind.word()),
        esc(&show(tq, limit.limit_c, units)),
        esc(&limit.crop),
        esc(&limit.stage),
        esc(&limit.source),
        num_span(
            Some("day-hours-over"),
            s.hours_over_limit,
            &crate::words::hours(s.hours_over_limit)
        ),
        esc(&super::tables::show_num(degree_hours, 1)),
        esc(&degree_unit),
    );
    if s.failed_hours > 0 {
        body.push_str(&format!(
            "<p class=\"warning\">{} hour(s) could not be solved and are left out.</p>\n",
            s.failed_hours
        ));
    }
    for (i, r) in rules.iter().enumerate() {
        let sentence = match check_rule(r, s) {
            Ok(o) => rule_sentence(&o, "the design day", units),
            Err(e) => format!("Rule {}: {e}.", i + 1),
        };
        body.push_str(&format!(
            "<p class=\"rule\" id=\"day-rule-{i}\">{}</p>\n",
            esc(&sentence)
        ));
    }
    let hour = |h: &HourResult| f64::from(h.time.hour) + f64::from(h.time.minute) / 60.0;
    let pts = |f: &dyn Fn(&HourResult) -> Option<f64>| {
        s.hours
            .iter()
            .filter_map(|h| f(h).map(|v| (hour(h), tq.to_display(v, units))))
            .collect::<Vec<_>>()
    };
    let mut series = vec![
        Series::new(
            "hottest leaf",
            pts(&|h| h.hottest_leaf_temp_c),
            false,
            Some(0),
        ),
        Series::new("outside air", pts(&|h| Some(h.air_temp_c)), true, Some(1)),
    ];
    if s.hours.iter().any(|h| h.inside_air_temp_c.is_some()) {
        series.push(Series::new(
            "inside air",
            pts(&|h| h.inside_air_temp_c),
            false,
            Some(2),
        ));
    }
    series.push(Series::new(
        format!(
            "{} limit {}",
            limit.kind.word(),
            show(tq, limit.limit_c, units)
        ),
        vec![
            (0.0, tq.to_display(limit.limit_c, units)),
            (23.0, tq.to_display(limit.limit_c, units)),
        ],
        false,
        None,
    ));
    let svg = line_plot_svg(&LinePlot {
        title: "The design day hour by hour".to_owned(),
        x_title: "local clock time [h]".to_owned(),
        y_title: axis_title("temperature", tq, units),
        series,
        label: "Hottest leaf and air temperature through the design day, with the limit".to_owned(),
    })?;
    body.push_str(&figure(
        "fig-design-day",
        &svg,
        "The hottest leaf of the canopy each hour, the air and the crop's limit.",
        "design_day.csv",
    ));
    let mut csv = CsvTable::new(
        "design_day.csv",
        "design day: each hour's air, sun and hottest leaf",
        vec![
            "time".to_owned(),
            head("air_temperature", tq, units),
            head("inside_air_temperature", tq, units),
            "global_shortwave [W/m²]".to_owned(),
            "sun_elevation [°]".to_owned(),
            head("hottest_leaf_temperature", tq, units),
            head("limit_minus_compared", dq, units),
            "error".to_owned(),
        ],
    );
    let mut rows = Vec::new();
    for h in &s.hours {
        csv.rows.push(vec![
            h.time.to_string(),
            csv_q(tq, h.air_temp_c, units),
            csv_opt(tq, h.inside_air_temp_c, units),
            h.global_w_m2.map_or_else(String::new, csv_num),
            h.sun_elevation_rad
                .map_or_else(String::new, |e| csv_num(e.to_degrees())),
            csv_opt(tq, h.hottest_leaf_temp_c, units),
            csv_opt(dq, h.margin_k, units),
            h.error.clone().unwrap_or_default(),
        ]);
        rows.push(vec![
            format!("{:02}:{:02}", h.time.hour, h.time.minute),
            show(tq, h.air_temp_c, units),
            h.global_w_m2.map_or_else(
                || super::tables::MISSING.to_owned(),
                |g| format!("{g:.0} W/m²"),
            ),
            show_opt(tq, h.hottest_leaf_temp_c, units),
            show_opt(dq, h.margin_k, units),
        ]);
    }
    body.push_str(&grid_table(
        "design-day-table",
        "Hour by hour (margin: limit minus the compared temperature; negative is over the limit)",
        &[
            "Time".to_owned(),
            "Air".to_owned(),
            "Sun on the horizontal".to_owned(),
            "Hottest leaf".to_owned(),
            "Margin".to_owned(),
        ],
        &rows,
        &[1, 2, 3, 4],
    ));
    Ok(Section {
        id: "design-day",
        heading: "Design day".to_owned(),
        body_html: body,
        tables: vec![csv],
        sources: DESIGN_DAY_SOURCES,
    })
}

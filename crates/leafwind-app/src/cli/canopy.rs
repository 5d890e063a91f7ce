//! `leafwind canopy SCENARIO.ron [--json]`: the canopy profile, the hottest leaf, the sizing
//! answers, and the design-day or weather series of a scenario's canopy section.

use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

use anyhow::{Result, anyhow};
use clap::Args;
use leafwind_physics::heat_rules::{RuleOutcome, Verdict};
use leafwind_physics::sun::{self, DateTime};
use serde::Serialize;

use crate::canopy_scenario::{CanopyRun, CoolingTable, FAN_POWER_DEFAULT_W_M2};
use crate::document::ScenarioDocument;
use crate::output::finite;
use crate::units::{Quantity, UnitSystem};
use crate::words::{
    hours, num, rule_sentence, shade_sentence, show, speed_sentence, ventilation_sentence,
};

/// Arguments of `leafwind canopy`.
#[derive(Debug, Clone, Args)]
pub struct CanopyArgs {
    /// The scenario file (RON) with a `canopy` section.
    #[arg(value_name = "SCENARIO.ron")]
    pub scenario: PathBuf,
    /// Print JSON instead of text.
    #[arg(long)]
    pub json: bool,
    /// Text in °F, ft/min, ft and cfm (the JSON stays SI, its keys name their units).
    #[arg(long)]
    pub imperial: bool,
}

/// One layer of the profile, from the top.
#[derive(Debug, Clone, Serialize)]
pub struct LayerRecord {
    /// Index from the top (0 = top layer).
    pub layer: usize,
    /// Height of the layer's middle \[m\].
    pub height_m: f64,
    /// Leaf area above the layer's middle \[m² m⁻²\].
    pub lai_above: f64,
    /// Sunlit share of the layer's leaves \[–\].
    pub sunlit_fraction: f64,
    /// Air speed in the layer \[m s⁻¹\].
    pub air_speed_m_s: f64,
    /// Sunlit leaf temperature \[°C\] (null with the sun down).
    pub sunlit_leaf_temp_c: Option<f64>,
    /// Shaded leaf temperature \[°C\].
    pub shaded_leaf_temp_c: f64,
}

/// One step of a time series.
#[derive(Debug, Clone, Serialize)]
pub struct StepRecord {
    /// Local clock time, `YYYY-MM-DD HH:MM`.
    pub time: String,
    /// The time this step stands for \[h\] (1 in an hourly record, the logging step in a finer
    /// one; hours over the limit add these up).
    pub duration_h: f64,
    /// Sun elevation \[°\].
    pub sun_elevation_deg: Option<f64>,
    /// Sun azimuth \[°\] clockwise from north.
    pub sun_azimuth_deg: Option<f64>,
    /// Outside air temperature \[°C\].
    pub air_temp_c: f64,
    /// Inside air temperature under cover \[°C\].
    pub inside_air_temp_c: Option<f64>,
    /// Hottest leaf temperature \[°C\] (null when the hour failed; see `error`).
    pub hottest_leaf_temp_c: Option<f64>,
    /// Margin to the limit \[K\] (negative over it).
    pub margin_k: Option<f64>,
    /// Why the hour could not be solved.
    pub error: Option<String>,
}

/// A time series and its totals.
#[derive(Debug, Clone, Serialize)]
pub struct SeriesRecord {
    /// Each step.
    pub steps: Vec<StepRecord>,
    /// Hours with the compared temperature over the limit \[h\].
    pub hours_over_limit: f64,
    /// Degree-hours over the limit \[K h\].
    pub degree_hours_over_limit: f64,
    /// Smallest margin \[K\].
    pub min_margin_k: Option<f64>,
    /// Hours that failed.
    pub failed_hours: usize,
    /// Rows of the weather file that were rejected, as "line N, column C: reason".
    pub rejected_rows: Vec<String>,
    /// The scenario's heat rules checked over this series.
    pub heat_rules: Vec<RuleRecord>,
}

/// A heat rule checked over a series.
#[derive(Debug, Clone, Serialize)]
pub struct RuleRecord {
    /// The rule in words (°C).
    pub rule: String,
    /// "met", "not met", or "daily condition only" (the series is shorter than the days asked for
    /// and every day of it meets the daily condition).
    pub verdict: String,
    /// Days meeting the daily condition.
    pub days_meeting: u32,
    /// Longest run of days in a row meeting it.
    pub longest_day_run: u32,
    /// The date that completes the rule (YYYY-MM-DD), or null.
    pub first_met: Option<String>,
    /// Most hours above the threshold on one day \[h\].
    pub most_hours_in_a_day: f64,
    /// Hours that could not be solved (not counted as above).
    pub unsolved_hours: f64,
}

impl RuleRecord {
    fn of(o: &RuleOutcome) -> Self {
        Self {
            rule: o.rule.words(),
            verdict: match o.verdict {
                Verdict::Met => "met",
                Verdict::NotMet => "not met",
                Verdict::DailyConditionOnly => "daily condition only",
            }
            .to_owned(),
            days_meeting: o.days_meeting,
            longest_day_run: o.longest_day_run,
            first_met: o.first_met.map(|(y, m, d)| format!("{y:04}-{m:02}-{d:02}")),
            most_hours_in_a_day: o.most_hours_in_a_day(),
            unsolved_hours: o.unsolved_hours(),
        }
    }
}

/// The whole answer of `leafwind canopy`.
#[derive(Debug, Clone, Serialize)]
pub struct CanopyRecord {
    /// Scenario title.
    pub title: String,
    /// Sun elevation at the profile's moment \[°\].
    pub sun_elevation_deg: f64,
    /// Sun azimuth \[°\].
    pub sun_azimuth_deg: f64,
    /// The limit \[°C\].
    pub limit_c: f64,
    /// "air" or "tissue".
    pub limit_kind: String,
    /// Where the limit comes from.
    pub limit_source: String,
    /// Margin kept below the limit \[K\].
    pub margin_required_k: f64,
    /// Inside air under cover \[°C\].
    pub inside_air_temp_c: Option<f64>,
    /// Hottest leaf temperature \[°C\].
    pub hottest_leaf_temp_c: f64,
    /// Layer of the hottest leaf, from the top.
    pub hottest_layer: usize,
    /// Whether the hottest leaf is sunlit.
    pub hottest_leaf_sunlit: bool,
    /// Limit minus hottest leaf \[K\].
    pub margin_k: f64,
    /// Least canopy-top air speed \[m s⁻¹\]; null when there is none.
    pub required_wind_m_s: Option<f64>,
    /// The air-speed answer in words.
    pub required_wind_reason: String,
    /// Least shade fraction \[–\]; null when there is none (or no cover).
    pub required_shade_fraction: Option<f64>,
    /// The shade answer in words.
    pub required_shade_fraction_reason: String,
    /// Least ventilation rate that keeps the hottest leaf under the limit less the margin
    /// \[m³ s⁻¹ per m² floor\]; null when there is none (or no cover).
    pub required_ventilation_m3_m2_s: Option<f64>,
    /// The ventilation answer in words.
    pub required_ventilation_reason: String,
    /// The allowed rise of the air from inlet to outlet the design-rise answers use \[K\]; null
    /// with no cover.
    pub design_rise_k: Option<f64>,
    /// Least ventilation rate that holds the inside air within the design rise of the outside
    /// air, from the balance \[m³ s⁻¹ m⁻²\]; null when there is none (or no cover).
    pub ventilation_for_design_rise_m3_m2_s: Option<f64>,
    /// The ventilation standard's factor method for the design rise at this site and light
    /// (ASABE EP406, from memory) \[m³ s⁻¹ m⁻²\]; null with no cover.
    pub standard_factor_rate_m3_m2_s: Option<f64>,
    /// The layers, top first.
    pub layers: Vec<LayerRecord>,
    /// Hour by hour over the design day.
    pub design_day: Option<SeriesRecord>,
    /// Hour by hour over the weather file.
    pub weather: Option<SeriesRecord>,
    /// Design day: hours with leaves below the dew point \[h\].
    pub dew_hours_below_dew_point: Option<f64>,
    /// Design day: hours with leaves below the dew point plus the margin \[h\].
    pub dew_hours_below_margin: Option<f64>,
    /// Margin above the dew point used for that count \[K\].
    pub dew_margin_k: Option<f64>,
    /// Cooling and shading options side by side (under cover only).
    pub cooling_options: Vec<CoolingRecord>,
}

/// One cooling or shading option.
#[derive(Debug, Clone, Serialize)]
pub struct CoolingRecord {
    /// The option, e.g. "pads + fans".
    pub option: String,
    /// Hottest leaf \[°C\].
    pub hottest_leaf_temp_c: Option<f64>,
    /// Smallest margin to the limit \[K\].
    pub margin_k: Option<f64>,
    /// Hours over the limit over the design day \[h\] (null at a single moment).
    pub hours_over_limit: Option<f64>,
    /// Water evaporated per floor area \[L m⁻²\] over the day, or per hour at a moment.
    pub water_l_m2: f64,
    /// Whether the water figure is per hour (a single moment) rather than per day.
    pub water_per_hour: bool,
    /// Circulation-fan energy per floor area over the day \[kWh m⁻²\] (null at a moment).
    pub fan_energy_kwh_m2: Option<f64>,
}

fn time_text(t: &DateTime) -> String {
    format!(
        "{:04}-{:02}-{:02} {:02}:{:02}",
        t.year, t.month, t.day, t.hour, t.minute
    )
}

fn series_record(
    series: &leafwind_physics::design_day::HourlySeries,
    site: &sun::Site,
    rejected: &[leafwind_physics::weather::RowError],
    rules: &[RuleOutcome],
) -> SeriesRecord {
    let steps = series
        .hours
        .iter()
        .map(|h| {
            let pos = sun::sun_position(site, &h.time).ok();
            StepRecord {
                time: time_text(&h.time),
                duration_h: finite(h.duration_h).unwrap_or(0.0),
                sun_elevation_deg: pos.and_then(|p| finite(p.elevation_rad.to_degrees())),
                sun_azimuth_deg: pos.and_then(|p| finite(p.azimuth_rad.to_degrees())),
                air_temp_c: h.air_temp_c,
                inside_air_temp_c: h.inside_air_temp_c.and_then(finite),
                hottest_leaf_temp_c: h.hottest_leaf_temp_c.and_then(finite),
                margin_k: h.margin_k.and_then(finite),
                error: h.error.clone(),
            }
        })
        .collect();
    SeriesRecord {
        steps,
        hours_over_limit: series.hours_over_limit,
        degree_hours_over_limit: series.degree_hours_over_k_h,
        min_margin_k: series.min_margin_k.and_then(finite),
        failed_hours: series.failed_hours,
        rejected_rows: rejected.iter().map(ToString::to_string).collect(),
        heat_rules: rules.iter().map(RuleRecord::of).collect(),
    }
}

impl CanopyRecord {
    /// Flattens a run.
    #[must_use]
    pub fn new(title: &str, run: &CanopyRun, site: &sun::Site) -> Self {
        let hot = &run.canopy.hottest;
        Self {
            title: title.to_owned(),
            sun_elevation_deg: run.sun_elevation_rad.to_degrees(),
            sun_azimuth_deg: run.sun_azimuth_rad.to_degrees(),
            limit_c: run.limit.limit_c,
            limit_kind: run.limit.kind.word().to_owned(),
            limit_source: run.limit.source.to_string(),
            margin_required_k: run.margin_k,
            inside_air_temp_c: run.inside_air_temp_c.and_then(finite),
            hottest_leaf_temp_c: hot.leaf_temp_c,
            hottest_layer: hot.layer,
            hottest_leaf_sunlit: hot.sunlit,
            margin_k: run.limit.limit_c - hot.leaf_temp_c,
            required_wind_m_s: run.speed.speed_m_s(),
            required_wind_reason: run.speed.sentence(),
            required_shade_fraction: run.shade.as_ref().and_then(|s| s.fraction()),
            required_shade_fraction_reason: run.shade_reason(),
            required_ventilation_m3_m2_s: run
                .ventilation
                .as_ref()
                .and_then(|v| v.check.for_leaf.rate_m3_m2_s()),
            required_ventilation_reason: run.ventilation_reason(),
            design_rise_k: run.ventilation.as_ref().map(|v| v.design_rise_k),
            ventilation_for_design_rise_m3_m2_s: run
                .ventilation
                .as_ref()
                .and_then(|v| v.check.for_design_rise.rate_m3_m2_s()),
            standard_factor_rate_m3_m2_s: run
                .ventilation
                .as_ref()
                .map(|v| v.check.factor.rate_m3_m2_s),
            layers: run
                .canopy
                .layers
                .iter()
                .enumerate()
                .map(|(i, l)| LayerRecord {
                    layer: i,
                    height_m: l.height_m,
                    lai_above: l.lai_above,
                    sunlit_fraction: l.sunlit_fraction,
                    air_speed_m_s: l.air_speed_m_s,
                    sunlit_leaf_temp_c: l.sunlit_leaf_temp_c.and_then(finite),
                    shaded_leaf_temp_c: l.shaded_leaf_temp_c,
                })
                .collect(),
            design_day: run
                .design_day
                .as_ref()
                .map(|s| series_record(s, site, &[], &run.design_day_rules)),
            weather: run
                .weather
                .as_ref()
                .map(|(s, bad)| series_record(s, site, bad, &run.weather_rules)),
            dew_hours_below_dew_point: run.dew.as_ref().map(|d| d.hours_below_dew_point),
            dew_hours_below_margin: run.dew.as_ref().map(|d| d.hours_below_margin),
            dew_margin_k: run.dew.as_ref().map(|d| d.margin_k),
            cooling_options: match &run.cooling {
                None => Vec::new(),
                Some(CoolingTable::Day(rows)) => rows
                    .iter()
                    .map(|o| CoolingRecord {
                        option: o.label.clone(),
                        hottest_leaf_temp_c: o.hottest_leaf_temp_c.and_then(finite),
                        margin_k: o.min_margin_k.and_then(finite),
                        hours_over_limit: Some(o.hours_over_limit),
                        water_l_m2: o.water_kg_m2,
                        water_per_hour: false,
                        fan_energy_kwh_m2: Some(o.fan_energy_kwh_m2),
                    })
                    .collect(),
                Some(CoolingTable::Moment(rows)) => rows
                    .iter()
                    .map(|o| CoolingRecord {
                        option: o.label.clone(),
                        hottest_leaf_temp_c: finite(o.hottest_leaf_temp_c),
                        margin_k: o.margin_k.and_then(finite),
                        hours_over_limit: None,
                        water_l_m2: o.water_kg_m2_h,
                        water_per_hour: true,
                        fan_energy_kwh_m2: None,
                    })
                    .collect(),
            },
        }
    }
}

/// Loads the scenario and runs its canopy section.
///
/// # Errors
/// An unreadable scenario, one without a canopy section, or invalid inputs.
pub fn record(args: &CanopyArgs) -> Result<CanopyRecord> {
    let (doc, run) = document_and_run(args)?;
    Ok(record_of(&doc, &run))
}

fn record_of(doc: &ScenarioDocument, run: &CanopyRun) -> CanopyRecord {
    let site = doc.canopy.as_ref().map(|c| c.site).unwrap_or_default();
    CanopyRecord::new(&doc.title, run, &site)
}

/// The scenario and its canopy run.
fn document_and_run(args: &CanopyArgs) -> Result<(ScenarioDocument, CanopyRun)> {
    let doc = ScenarioDocument::load(&args.scenario)
        .map_err(|e| anyhow!("{e} in {}", args.scenario.display()))?;
    let section = doc.canopy.as_ref().ok_or_else(|| {
        anyhow!(
            "the scenario has no canopy section (add `canopy: Some((…))`; see scenarios/glasshouse_still_afternoon.ron) in {}",
            args.scenario.display()
        )
    })?;
    // The fans' power per floor area for the "fans" cooling options, from the fans section if any.
    let fan_power = doc
        .fans
        .as_ref()
        .and_then(|f| leafwind_physics::fans::fan_energy(&f.layout, 24.0).ok())
        .map_or(FAN_POWER_DEFAULT_W_M2, |e| e.power_per_floor_w_m2);
    let run = section.run_with_fans(
        &doc.case,
        doc.heat_limit_c,
        doc.margin_k,
        args.scenario.parent(),
        fan_power,
    )?;
    Ok((doc, run))
}

/// Runs `leafwind canopy`, writing to `out`.
///
/// # Errors
/// As [`record`], or a failed write.
pub fn run(args: &CanopyArgs, out: &mut impl Write) -> Result<ExitCode> {
    let (doc, run) = document_and_run(args)?;
    let r = record_of(&doc, &run);
    if args.json {
        crate::output::write_json(out, &r)?;
        return Ok(ExitCode::SUCCESS);
    }
    let units = UnitSystem::from_imperial_flag(args.imperial);
    write_text(out, &r, &doc, &run, units)?;
    Ok(ExitCode::SUCCESS)
}

/// The text answer, in `units`: the same sentences as the window's canopy tab.
fn write_text(
    out: &mut impl Write,
    r: &CanopyRecord,
    doc: &ScenarioDocument,
    run: &CanopyRun,
    units: UnitSystem,
) -> Result<()> {
    let (tq, dq) = (Quantity::Temperature, Quantity::TempDiff);
    let t = |c: f64| show(tq, c, units);
    writeln!(out, "{}", r.title)?;
    writeln!(
        out,
        "Sun {:.1}° high, azimuth {:.0}°",
        r.sun_elevation_deg, r.sun_azimuth_deg
    )?;
    if let Some(c) = r.inside_air_temp_c {
        writeln!(out, "Inside air {}", t(c))?;
    }
    writeln!(
        out,
        "Hottest leaf {} ({} leaf in layer {} from the top); limit {} ({}), margin {}",
        t(r.hottest_leaf_temp_c),
        if r.hottest_leaf_sunlit {
            "sunlit"
        } else {
            "shaded"
        },
        r.hottest_layer,
        t(r.limit_c),
        r.limit_kind,
        show(dq, r.margin_k, units)
    )?;
    writeln!(out, "{}", speed_sentence(&run.speed, units))?;
    writeln!(out, "{}", shade_sentence(run.shade.as_ref(), units))?;
    let house = doc
        .fans
        .as_ref()
        .map(|f| (f.layout.house_length_m, f.layout.house_width_m));
    writeln!(
        out,
        "{}",
        ventilation_sentence(run.ventilation.as_ref(), house, units)
    )?;
    let (hq, sq) = (Quantity::Altitude, Quantity::Speed);
    writeln!(
        out,
        "{:>5} {:>10} {:>9} {:>9} {:>12} {:>12}",
        "layer",
        format!("height {}", hq.unit(units)),
        "LAI above",
        "sunlit %",
        format!("air {}", sq.unit(units)),
        format!("leaf {}", tq.unit(units))
    )?;
    for l in &r.layers {
        let shaded = tq.number(l.shaded_leaf_temp_c, units);
        let leaf = l.sunlit_leaf_temp_c.map_or(shaded.clone(), |s| {
            format!("{}/{shaded}", tq.number(s, units))
        });
        writeln!(
            out,
            "{:>5} {:>10} {:>9.2} {:>9.0} {:>12} {:>12}",
            l.layer,
            Quantity::Altitude
                .format_with(l.height_m, units, 2)
                .replace(&format!(" {}", hq.unit(units)), ""),
            l.lai_above,
            100.0 * l.sunlit_fraction,
            sq.number(l.air_speed_m_s, units),
            leaf
        )?;
    }
    let series = [
        (
            "Design day",
            "the design day",
            run.design_day.as_ref(),
            &run.design_day_rules,
            &[][..],
        ),
        (
            "Weather file",
            "the weather file",
            run.weather.as_ref().map(|(s, _)| s),
            &run.weather_rules,
            run.weather
                .as_ref()
                .map_or(&[][..], |(_, bad)| bad.as_slice()),
        ),
    ];
    for (name, over, s, rules, rejected) in series {
        let Some(s) = s else { continue };
        writeln!(
            out,
            "{name}: {} h over the limit, {} {}·h over it, smallest margin {}",
            hours(s.hours_over_limit),
            dq.number(s.degree_hours_over_k_h, units),
            dq.unit(units),
            s.min_margin_k
                .map_or("—".to_owned(), |m| show(dq, m, units))
        )?;
        for row in rejected {
            writeln!(out, "  rejected {row}")?;
        }
        for o in rules {
            writeln!(out, "  {}", rule_sentence(o, over, units))?;
        }
    }
    if let Some(d) = &run.dew {
        writeln!(
            out,
            "Night dew over the design day: {} h with leaves below the dew point, {} h within {} of it",
            num(d.hours_below_dew_point, 0),
            num(d.hours_below_margin, 0),
            show(dq, d.margin_k, units)
        )?;
    }
    if !r.cooling_options.is_empty() {
        writeln!(
            out,
            "Cooling and shading options (estimates; defaults cited in the engine):"
        )?;
        writeln!(
            out,
            "{:<22} {:>12} {:>10} {:>10} {:>12}",
            "option",
            format!("hottest {}", tq.unit(units)),
            format!("margin {}", dq.unit(units)),
            "h over",
            "water L/m²"
        )?;
        for o in &r.cooling_options {
            let opt =
                |v: Option<f64>, q: Quantity| v.map_or("—".to_owned(), |x| q.number(x, units));
            writeln!(
                out,
                "{:<22} {:>12} {:>10} {:>10} {:>12}",
                o.option,
                opt(o.hottest_leaf_temp_c, tq),
                opt(o.margin_k, dq),
                o.hours_over_limit.map_or("—".to_owned(), hours),
                format!(
                    "{}{}",
                    num(o.water_l_m2, 2),
                    if o.water_per_hour { "/h" } else { "" }
                )
            )?;
        }
    }
    writeln!(
        out,
        "Estimates from physics and typical parameters: check them with an infrared thermometer and an anemometer. Fans, vents and their electrical installation follow local codes and licensed practice."
    )?;
    Ok(())
}

//! `leafwind fans SCENARIO.ron [--json]`: the canopy air-speed range a fan layout gives, the
//! layout answers, spot readings, where more air stops helping, fan energy and the night dew check.

use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

use anyhow::{Result, anyhow};
use clap::Args;
use leafwind_physics::fans::{FanSizing, SpeedRange};
use serde::Serialize;

use crate::document::ScenarioDocument;
use crate::fans_scenario::FansRun;
use crate::units::{Quantity, UnitSystem};
use crate::words::{night_sentence, num, range_text, returns_sentence, show, sizing_sentence};

/// Arguments of `leafwind fans`.
#[derive(Debug, Clone, Args)]
pub struct FansArgs {
    /// The scenario file (RON) with a `fans` section.
    #[arg(value_name = "SCENARIO.ron")]
    pub scenario: PathBuf,
    /// Print JSON instead of text.
    #[arg(long)]
    pub json: bool,
    /// Text in ft/min, ft, cfm and °F (the JSON stays SI, its keys name their units).
    #[arg(long)]
    pub imperial: bool,
}

/// A low / typical / high air speed \[m s⁻¹\].
#[derive(Debug, Clone, Copy, Serialize)]
pub struct RangeRecord {
    /// From the low jet coefficients.
    pub low_m_s: f64,
    /// From the typical coefficients.
    pub typical_m_s: f64,
    /// From the high coefficients.
    pub high_m_s: f64,
}

impl From<SpeedRange> for RangeRecord {
    fn from(r: SpeedRange) -> Self {
        Self {
            low_m_s: r.low_m_s,
            typical_m_s: r.typical_m_s,
            high_m_s: r.high_m_s,
        }
    }
}

/// The whole answer of `leafwind fans`.
#[derive(Debug, Clone, Serialize)]
pub struct FansRecord {
    /// Scenario title.
    pub title: String,
    /// Always: this is an estimate from jet theory, to verify with an anemometer.
    pub estimate_note: String,
    /// Slowest canopy-top air speed outside the near-fan zones.
    pub canopy_speed_min: RangeRecord,
    /// Mean canopy-top air speed.
    pub canopy_speed_mean: RangeRecord,
    /// Uniformity, minimum ÷ mean (typical) \[–\].
    pub uniformity: f64,
    /// Outlet air speed of one fan \[m s⁻¹\].
    pub outlet_speed_m_s: f64,
    /// Installed airflow per floor area \[m³ s⁻¹ m⁻²\].
    pub installed_airflow_m3_s_m2: f64,
    /// The trade's rule of thumb for it \[m³ s⁻¹ m⁻²\] (common practice).
    pub rule_of_thumb_airflow_m3_s_m2: f64,
    /// Whether the layout meets that rule.
    pub meets_airflow_rule: bool,
    /// Throw by the trade's rule (a multiple of the blade diameter) \[m\] (common practice).
    pub rule_of_thumb_throw_m: f64,
    /// Throw from the jet model \[m\].
    pub jet_throw_m: Option<f64>,
    /// Target canopy-top air speed \[m s⁻¹\], if set.
    pub target_canopy_speed_m_s: Option<f64>,
    /// Fan count for the target (null when not reachable or no target).
    pub fans_for_target: Option<usize>,
    /// The sizing answer in words.
    pub sizing_reason: Option<String>,
    /// Spot readings: count, min, mean, uniformity, dead zones, leaf temperatures at the slowest.
    pub readings: Option<serde_json::Value>,
    /// Rejected rows of the readings file.
    pub rejected_readings: Vec<String>,
    /// Air speed beyond which each further 0.1 m/s cools the leaf less than the set amount \[m s⁻¹\].
    pub more_air_stops_helping_m_s: Option<f64>,
    /// Speed from which more air warms the leaf \[m s⁻¹\].
    pub more_air_warms_from_m_s: Option<f64>,
    /// Speed from which more air raises transpiration \[m s⁻¹\].
    pub more_air_raises_transpiration_from_m_s: Option<f64>,
    /// The diminishing-returns finding in words.
    pub returns_reason: String,
    /// Electrical power of all fans \[W\].
    pub fan_power_w: f64,
    /// Fan power per floor area \[W m⁻²\].
    pub fan_power_w_m2: f64,
    /// Energy per day at the set running hours \[kWh\].
    pub fan_energy_kwh_per_day: f64,
    /// Night: leaf minus dew point at the typical slowest speed \[K\].
    pub night_leaf_dew_margin_k: Option<f64>,
    /// Night: least air speed to keep the leaf above dew point + margin \[m s⁻¹\].
    pub night_required_wind_m_s: Option<f64>,
    /// The night answer in words.
    pub night_reason: Option<String>,
}

impl FansRecord {
    /// Flattens a run.
    #[must_use]
    pub fn new(title: &str, run: &FansRun) -> Self {
        let e = &run.estimate;
        let (target, fans_for_target, sizing_reason) = match &run.sizing {
            Some((t, s)) => (
                Some(*t),
                match s {
                    FanSizing::Found(v) => v.first().map(|(l, _)| l.fan_count()),
                    FanSizing::NotReachable { .. } => None,
                },
                Some(s.sentence()),
            ),
            None => (None, None, None),
        };
        Self {
            title: title.to_owned(),
            estimate_note: e.note.clone(),
            canopy_speed_min: e.min_canopy_top.into(),
            canopy_speed_mean: e.mean_canopy_top.into(),
            uniformity: e.uniformity,
            outlet_speed_m_s: e.outlet_speed_m_s,
            installed_airflow_m3_s_m2: e.rules.installed_m3_s_m2,
            rule_of_thumb_airflow_m3_s_m2: e.rules.haf_rule_m3_s_m2,
            meets_airflow_rule: e.rules.meets_haf_rule,
            rule_of_thumb_throw_m: e.rules.throw_rule_m,
            jet_throw_m: e.rules.throw_jet_m,
            target_canopy_speed_m_s: target,
            fans_for_target,
            sizing_reason,
            readings: run
                .readings
                .as_ref()
                .and_then(|(s, _)| serde_json::to_value(s).ok()),
            rejected_readings: run
                .readings
                .as_ref()
                .map(|(_, r)| r.clone())
                .unwrap_or_default(),
            more_air_stops_helping_m_s: run.returns.knee_m_s,
            more_air_warms_from_m_s: run.returns.warming_from_m_s,
            more_air_raises_transpiration_from_m_s: run.returns.more_transpiration_from_m_s,
            returns_reason: run.returns.sentence(),
            fan_power_w: run.energy.power_w,
            fan_power_w_m2: run.energy.power_per_floor_w_m2,
            fan_energy_kwh_per_day: run.energy.energy_kwh,
            night_leaf_dew_margin_k: run.night.as_ref().map(|(m, _)| m.leaf_dew_diff_k),
            night_required_wind_m_s: run.night.as_ref().and_then(|(_, a)| a.speed_m_s()),
            night_reason: run.night.as_ref().map(|(_, a)| a.sentence()),
        }
    }
}

/// Loads the scenario and runs its fans section.
///
/// # Errors
/// An unreadable scenario, one without a fans section, or invalid inputs.
pub fn record(args: &FansArgs) -> Result<FansRecord> {
    let (doc, run) = document_and_run(args)?;
    Ok(FansRecord::new(&doc.title, &run))
}

/// The scenario and its fans run.
fn document_and_run(args: &FansArgs) -> Result<(ScenarioDocument, FansRun)> {
    let doc = ScenarioDocument::load(&args.scenario)
        .map_err(|e| anyhow!("{e} in {}", args.scenario.display()))?;
    let section = doc.fans.as_ref().ok_or_else(|| {
        anyhow!(
            "the scenario has no fans section (add `fans: Some((layout: (…)))`) in {}",
            args.scenario.display()
        )
    })?;
    let structure = doc.canopy.as_ref().map(|c| c.structure).unwrap_or_default();
    let run = section.run(&doc.case, &structure, args.scenario.parent())?;
    Ok((doc, run))
}

/// Runs `leafwind fans`, writing to `out`.
///
/// # Errors
/// As [`record`], or a failed write.
pub fn run(args: &FansArgs, out: &mut impl Write) -> Result<ExitCode> {
    let (doc, run) = document_and_run(args)?;
    let r = FansRecord::new(&doc.title, &run);
    if args.json {
        crate::output::write_json(out, &r)?;
        return Ok(ExitCode::SUCCESS);
    }
    let units = UnitSystem::from_imperial_flag(args.imperial);
    write_text(out, &r, &run, units)?;
    Ok(ExitCode::SUCCESS)
}

/// The text answer in `units`, with the window's sentences.
fn write_text(
    out: &mut impl Write,
    r: &FansRecord,
    run: &FansRun,
    units: UnitSystem,
) -> Result<()> {
    let e = &run.estimate;
    let vq = Quantity::VentilationRate;
    let lq = Quantity::Altitude;
    writeln!(out, "{}", r.title)?;
    writeln!(
        out,
        "Canopy-top air speed, slowest {}, mean {}",
        range_text(&e.min_canopy_top, units),
        range_text(&e.mean_canopy_top, units)
    )?;
    writeln!(out, "  {}", r.estimate_note)?;
    writeln!(
        out,
        "Rules of thumb (common practice): circulation airflow {} installed vs {} suggested ({}); throw {} by rule, {} by the jet model",
        show(vq, r.installed_airflow_m3_s_m2, units),
        show(vq, r.rule_of_thumb_airflow_m3_s_m2, units),
        if r.meets_airflow_rule {
            "met"
        } else {
            "not met"
        },
        lq.format_with(r.rule_of_thumb_throw_m, units, 0),
        r.jet_throw_m
            .map_or("—".to_owned(), |t| lq.format_with(t, units, 0))
    )?;
    if let Some((target, s)) = &run.sizing {
        writeln!(out, "{}", sizing_sentence(*target, s, units))?;
    }
    for row in &r.rejected_readings {
        writeln!(out, "  rejected reading {row}")?;
    }
    writeln!(out, "{}", returns_sentence(&run.returns, units))?;
    writeln!(
        out,
        "Fan power {} W ({} W/m²), {} kWh a day",
        num(r.fan_power_w, 0),
        num(r.fan_power_w_m2, 2),
        num(r.fan_energy_kwh_per_day, 1)
    )?;
    if let Some((m, a)) = &run.night {
        writeln!(
            out,
            "{}",
            night_sentence(m, a, e.min_canopy_top.typical_m_s, units)
        )?;
    }
    writeln!(
        out,
        "Fan and electrical installations: follow local codes and use a licensed electrician."
    )?;
    Ok(())
}

//! The answers in words, in the user's units: the least canopy-top air speed, the least shade, the
//! least ventilation rate and the heat rules; the fans' layout, where more air stops helping and
//! the night dew check; airflow units; and the number formatting they share (never "NaN": "—" for
//! a missing value). Used by the window, the commands' text output and the grower report alike.

use leafwind_physics::canopy::{SpeedAnswer, SpeedObstacle};
use leafwind_physics::condensation::{DewAnswer, DewMargin, DewObstacle};
use leafwind_physics::fans::{
    DiminishingReturns, FanSizing, SpeedRange, cfm_to_m3_s, m3_h_to_m3_s, m3_s_to_cfm, m3_s_to_m3_h,
};
use leafwind_physics::greenhouse::ShadeAnswer;
use leafwind_physics::heat_rules::{RuleOutcome, Verdict};
use leafwind_physics::ventilation::{VentilationAnswer, VentilationTarget};

use crate::canopy_scenario::VentilationRun;
use crate::units::{Quantity, UnitSystem, fmt_num};

/// A number with its unit, or "—" when it is not finite.
#[must_use]
pub fn show(q: Quantity, si: f64, units: UnitSystem) -> String {
    let s = q.format(si, units);
    if s.starts_with('–') {
        "—".to_owned()
    } else {
        s
    }
}

/// An air speed in the units shown, with ft/min beside m/s when imperial units are on.
#[must_use]
pub fn show_speed(si: f64, units: UnitSystem) -> String {
    if !si.is_finite() {
        return "—".to_owned();
    }
    match units {
        UnitSystem::Si => format!("{si:.2} m/s"),
        UnitSystem::Imperial => format!(
            "{} ({si:.2} m/s)",
            Quantity::Speed.format(si, UnitSystem::Imperial)
        ),
    }
}

/// `x`, with a value that rounds to zero at `decimals` made exactly 0 (never "-0.0" on screen).
#[must_use]
pub fn no_negative_zero(x: f64, decimals: i32) -> f64 {
    if (x * 10f64.powi(decimals)).round() == 0.0 {
        0.0
    } else {
        x
    }
}

/// A plain number, "—" when not finite.
#[must_use]
pub fn num(x: f64, decimals: usize) -> String {
    let s = fmt_num(x, decimals);
    if s == "–" { "—".to_owned() } else { s }
}

/// A number of hours for a sentence, without the unit: whole hours as "3", a finer record's
/// fractions to two decimals ("2.25", "1.5"); "—" when not finite.
#[must_use]
pub fn hours(h: f64) -> String {
    if !h.is_finite() {
        return "—".to_owned();
    }
    if (h - h.round()).abs() < 0.005 {
        return num(h.round(), 0);
    }
    let s = num(h, 2);
    s.trim_end_matches('0').trim_end_matches('.').to_owned()
}

/// The least canopy-top air speed, in one sentence.
#[must_use]
pub fn speed_sentence(a: &SpeedAnswer, units: UnitSystem) -> String {
    let t = |c: f64| show(Quantity::Temperature, c, units);
    match *a {
        SpeedAnswer::NotNeeded {
            hottest_c,
            target_c,
        } => format!(
            "Least canopy-top air speed: none needed — even in still air the hottest leaf runs at {}, at or below the target of {} (limit − margin).",
            t(hottest_c),
            t(target_c)
        ),
        SpeedAnswer::Speed {
            speed_m_s,
            hottest_c,
            target_c,
        } => format!(
            "Least canopy-top air speed: {} keeps the hottest leaf at {}, the target (limit − margin).",
            show_speed(speed_m_s, units),
            t(hottest_c.min(target_c))
        ),
        SpeedAnswer::Unreachable(SpeedObstacle::AirTooHot {
            air_temp_c,
            target_c,
            ..
        }) => format!(
            "Least canopy-top air speed: no air speed can do it — the air around the crop is at {}, at or above the target of {}. Cool the air (ventilation, shade, evaporative cooling) instead.",
            t(air_temp_c),
            t(target_c)
        ),
        SpeedAnswer::Unreachable(SpeedObstacle::BeyondSearch {
            max_speed_m_s,
            hottest_at_max_c,
            target_c,
        }) => format!(
            "Least canopy-top air speed: not reachable with air alone — even at {} the hottest leaf runs at {}, above the target of {}. Reduce the radiation load (shade) or keep the crop well watered.",
            show_speed(max_speed_m_s, units),
            t(hottest_at_max_c),
            t(target_c)
        ),
    }
}

/// The least shade fraction, in one sentence (or why there is none).
#[must_use]
pub fn shade_sentence(a: Option<&ShadeAnswer>, units: UnitSystem) -> String {
    let t = |c: f64| show(Quantity::Temperature, c, units);
    match a {
        None => "Least shade: shade sizing needs a greenhouse or shade-house cover; this crop is in the open field (switch the greenhouse on to size a screen).".to_owned(),
        Some(ShadeAnswer::NotNeeded { hottest_c, target_c }) => format!(
            "Least shade: none needed — without a screen the hottest leaf runs at {}, at or below the target of {}.",
            t(*hottest_c),
            t(*target_c)
        ),
        Some(ShadeAnswer::Fraction {
            shade_fraction,
            hottest_c,
            target_c,
        }) => format!(
            "Least shade: a screen holding back at least {} % of the light keeps the hottest leaf at {} (target {}).",
            num(100.0 * shade_fraction, 0),
            t(*hottest_c),
            t(*target_c)
        ),
        Some(ShadeAnswer::Unreachable {
            hottest_at_full_shade_c,
            inside_air_at_full_shade_c,
            target_c,
        }) => format!(
            "Least shade: shade alone cannot do it — even in full shade the hottest leaf runs at {} with the inside air at {}, above the target of {}.",
            t(*hottest_at_full_shade_c),
            t(*inside_air_at_full_shade_c),
            t(*target_c)
        ),
    }
}

/// The least ventilation rate for the hottest leaf, and the rate for a 4 K (7 °F) rise beside the
/// standard's factor method, in two sentences (or why there are none).
#[must_use]
///
/// With `house_m` (length and width of the house \[m\], from the fans section) the least rate is
/// also given as the house's total exhaust-fan flow, in m³/h (SI) or cfm (imperial).
pub fn ventilation_sentence(
    run: Option<&VentilationRun>,
    house_m: Option<(f64, f64)>,
    units: UnitSystem,
) -> String {
    let Some(run) = run else {
        return "Least ventilation: ventilation sizing needs a greenhouse cover; this crop is in the open field.".to_owned();
    };
    let v = &run.check;
    let t = |c: f64| show(Quantity::Temperature, c, units);
    let r = |x: f64| show(Quantity::VentilationRate, x, units);
    let first = match v.for_leaf {
        VentilationAnswer::AtLeastRate { at, target } => format!(
            "even {} keeps the hottest leaf at {} (target {}).",
            r(at.rate_m3_m2_s),
            t(at.hottest_leaf_temp_c),
            t(target_c(target))
        ),
        VentilationAnswer::Rate { at, target } => format!(
            "at least {} keeps the hottest leaf at {} (target {}), with the inside air at {}.",
            r(at.rate_m3_m2_s),
            t(at.hottest_leaf_temp_c),
            t(target_c(target)),
            t(at.inside_air_temp_c)
        ),
        VentilationAnswer::Unreachable { at_most, target } => format!(
            "no rate can do it — even at {} the hottest leaf runs at {} with the inside air at {}, above the target of {}. Shade, evaporative cooling or more air over the crop must do the rest.",
            r(at_most.rate_m3_m2_s),
            t(at_most.hottest_leaf_temp_c),
            t(at_most.inside_air_temp_c),
            t(target_c(target))
        ),
    };
    let rise = show(Quantity::TempDiff, run.design_rise_k, units);
    let second = match v.for_design_rise.rate_m3_m2_s() {
        Some(b) => format!(
            "To hold the inside air within {rise} of outside: {} from the balance for this crop; the ventilation standard's factor method asks for {} (ASABE EP406 factors, from memory).",
            r(b),
            r(v.factor.rate_m3_m2_s)
        ),
        None => format!(
            "No rate holds the inside air within {rise} of outside; the ventilation standard's factor method asks for {} (ASABE EP406 factors, from memory).",
            r(v.factor.rate_m3_m2_s)
        ),
    };
    let house = match (house_m, v.for_leaf.rate_m3_m2_s()) {
        (Some((length_m, width_m)), Some(rate)) => {
            let flow_m3_s = rate * length_m * width_m;
            let l = |x: f64| show(Quantity::Altitude, x, units);
            let flow = match units {
                UnitSystem::Si => {
                    format!("{} m³/h", num(three_figures(m3_s_to_m3_h(flow_m3_s)), 0))
                }
                UnitSystem::Imperial => {
                    format!("{} cfm", num(three_figures(m3_s_to_cfm(flow_m3_s)), 0))
                }
            };
            format!(
                " For the {} × {} house of the fans section that is about {flow} of exhaust fans, rated at their working static pressure.",
                l(length_m),
                l(width_m)
            )
        }
        _ => String::new(),
    };
    format!(
        "Least ventilation ({}): {first}{house} {second}",
        run.basis(&t(run.outside_air_temp_c))
    )
}

/// `x` rounded to three significant figures (for a total fan flow, where more would be false
/// precision).
pub fn three_figures(x: f64) -> f64 {
    if x.is_finite() && x != 0.0 {
        let scale = 10f64.powi(x.abs().log10().floor() as i32 - 2);
        (x / scale).round() * scale
    } else {
        x
    }
}

/// The leaf temperature a ventilation target aims at \[°C\] (for a rise target: none, shown as –).
fn target_c(target: VentilationTarget) -> f64 {
    match target {
        VentilationTarget::HottestLeaf { limit_c, margin_k } => limit_c - margin_k,
        VentilationTarget::InsideRise { .. } => f64::NAN,
    }
}

/// A heat rule checked over a series (`over`: "the design day", "the weather file"), in one
/// sentence in `units`.
#[must_use]
pub fn rule_sentence(o: &RuleOutcome, over: &str, units: UnitSystem) -> String {
    let rule = o
        .rule
        .words_with(&show(Quantity::Temperature, o.rule.above_c, units));
    let most = hours(o.most_hours_in_a_day());
    let unsolved = match o.unsolved_hours() {
        n if n <= 0.0 => String::new(),
        n => format!(" ({} h could not be solved and are not counted)", hours(n)),
    };
    let date = |(y, m, d): (i32, u32, u32)| format!("{y:04}-{m:02}-{d:02}");
    match o.verdict {
        Verdict::Met => format!(
            "Rule “{rule}”: met over {over}{} — {} days meet the daily condition, at most {} in a row; the most in one day is {most} h.{unsolved}",
            o.first_met
                .map_or(String::new(), |d| format!(", completed on {}", date(d))),
            o.days_meeting,
            o.longest_day_run,
        ),
        Verdict::DailyConditionOnly => format!(
            "Rule “{rule}”: {over} meets the daily condition ({most} h above), but is shorter than the {} days the rule needs — it would be met if such days went on.{unsolved}",
            o.rule.days
        ),
        Verdict::NotMet if o.days_meeting == 0 => format!(
            "Rule “{rule}”: not met over {over} — no day meets the daily condition; the most in one day is {most} h.{unsolved}"
        ),
        Verdict::NotMet => format!(
            "Rule “{rule}”: not met over {over} — {} days meet the daily condition, at most {} in a row; the most in one day is {most} h.{unsolved}",
            o.days_meeting, o.longest_day_run,
        ),
    }
}

// ---------------------------------------------------------------------------------------------
// Airflow units

/// The unit of a fan's airflow rating on screen.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum FlowUnit {
    /// Cubic metres per hour (the usual catalogue unit in SI countries).
    #[default]
    M3PerHour,
    /// Cubic metres per second.
    M3PerSecond,
    /// Cubic feet per minute (imperial).
    Cfm,
}

impl FlowUnit {
    /// The unit shown for `units` and the SI choice.
    #[must_use]
    pub fn for_units(units: UnitSystem, si_choice: FlowUnit) -> Self {
        match units {
            UnitSystem::Imperial => Self::Cfm,
            UnitSystem::Si if si_choice == Self::Cfm => Self::M3PerHour,
            UnitSystem::Si => si_choice,
        }
    }

    /// Label.
    #[must_use]
    pub fn unit(self) -> &'static str {
        match self {
            Self::M3PerHour => "m³/h",
            Self::M3PerSecond => "m³/s",
            Self::Cfm => "cfm",
        }
    }

    /// m³/s → shown.
    #[must_use]
    pub fn to_display(self, m3_s: f64) -> f64 {
        match self {
            Self::M3PerHour => m3_s_to_m3_h(m3_s),
            Self::M3PerSecond => m3_s,
            Self::Cfm => m3_s_to_cfm(m3_s),
        }
    }

    /// Shown → m³/s.
    #[must_use]
    pub fn from_display(self, shown: f64) -> f64 {
        match self {
            Self::M3PerHour => m3_h_to_m3_s(shown),
            Self::M3PerSecond => shown,
            Self::Cfm => cfm_to_m3_s(shown),
        }
    }

    /// Decimals shown.
    #[must_use]
    pub fn decimals(self) -> usize {
        match self {
            Self::M3PerSecond => 2,
            _ => 0,
        }
    }

    /// "4320 m³/h" ("—" when not finite).
    #[must_use]
    pub fn format(self, m3_s: f64) -> String {
        let v = self.to_display(m3_s);
        if v.is_finite() {
            format!("{v:.*} {}", self.decimals(), self.unit())
        } else {
            "—".to_owned()
        }
    }
}

// ---------------------------------------------------------------------------------------------
// Sentences in the units on screen

/// A low / typical / high air speed in words.
#[must_use]
pub fn range_text(r: &SpeedRange, units: UnitSystem) -> String {
    let sp = Quantity::Speed;
    format!(
        "{} (range {}–{})",
        show_speed(r.typical_m_s, units),
        sp.number(r.low_m_s, units),
        show(sp, r.high_m_s, units)
    )
}

/// The fans for the target, in one sentence.
#[must_use]
pub fn sizing_sentence(target_m_s: f64, s: &FanSizing, units: UnitSystem) -> String {
    let flow = FlowUnit::for_units(units, FlowUnit::M3PerHour);
    match s {
        FanSizing::Found(v) => match v.first() {
            Some((l, e)) => {
                let spacing = if l.fans_per_row > 1 {
                    format!(
                        ", {} apart along each row",
                        Quantity::Altitude.format_with(l.spacing_m, units, 1)
                    )
                } else {
                    String::new()
                };
                format!(
                    "For a target of {} at the canopy top: {} fans of the {} kind ({}, {}) in {} {} of {}{spacing} give at least {} outside the near-fan zones — an estimate to verify with an anemometer.",
                    show_speed(target_m_s, units),
                    l.fan_count(),
                    l.fan.label,
                    flow.format(l.fan.airflow_m3_s),
                    Quantity::LeafSize.format(l.fan.diameter_m, units),
                    l.rows,
                    if l.rows == 1 { "row" } else { "rows" },
                    l.fans_per_row,
                    range_text(&e.min_canopy_top, units)
                )
            }
            None => "For the target: no layout was found.".to_owned(),
        },
        FanSizing::NotReachable {
            best_min_m_s,
            target_m_s,
        } => format!(
            "For a target of {}: not reachable with the generic fan models — the best layout tried gives {} at the slowest point of the canopy top. Use larger fans, mount them closer to the crop or tilt them down.",
            show_speed(*target_m_s, units),
            show_speed(*best_min_m_s, units)
        ),
    }
}

/// Where more air stops helping, in words.
#[must_use]
pub fn returns_sentence(r: &DiminishingReturns, units: UnitSystem) -> String {
    let dq = Quantity::TempDiff;
    let step = show_speed(0.1, units);
    let mut s = match r.knee_m_s {
        Some(u) => format!(
            "Where more air stops helping: beyond {} each further {step} cools the leaf by less than {}.",
            show_speed(u, units),
            dq.format_with(r.worth_it_k, units, 2)
        ),
        None => format!(
            "Where more air stops helping: nowhere up to the end of the sweep — each {step} still cools the leaf by at least {}.",
            dq.format_with(r.worth_it_k, units, 2)
        ),
    };
    if let Some(u) = r.warming_from_m_s {
        s.push_str(&format!(
            " From {} more air warms the leaf (it is cooler than the air).",
            show_speed(u, units)
        ));
    }
    if let Some(u) = r.more_transpiration_from_m_s {
        s.push_str(&format!(
            " From {} more air raises transpiration (more water use).",
            show_speed(u, units)
        ));
    }
    s
}

/// The night dew answer, in words.
#[must_use]
pub fn night_sentence(m: &DewMargin, a: &DewAnswer, at_m_s: f64, units: UnitSystem) -> String {
    let tq = Quantity::Temperature;
    let dq = Quantity::TempDiff;
    let t = |c: f64| show(tq, c, units);
    let margin = format!(
        "At night, at the slowest typical canopy air speed of {}, the leaf runs at {} with the dew point at {}: leaf − dew point = {}{}.",
        show_speed(at_m_s, units),
        t(m.leaf_temp_c),
        t(m.dew_point_c),
        show(dq, m.leaf_dew_diff_k, units),
        if m.leaf_dew_diff_k < 0.0 {
            " — water condenses on the leaves"
        } else {
            ""
        }
    );
    let answer = match *a {
        DewAnswer::NotNeeded {
            still_air_leaf_temp_c,
            target_c,
        } => format!(
            "Least air speed against dew: none needed — even in still air the leaf stays at {}, at or above the dew point plus margin ({}).",
            t(still_air_leaf_temp_c),
            t(target_c)
        ),
        DewAnswer::Speed {
            speed_m_s,
            leaf_temp_c,
            target_c,
        } => format!(
            "Least air speed against dew: {} over the leaf keeps it at {} (dew point plus margin {}).",
            show_speed(speed_m_s, units),
            t(leaf_temp_c.max(target_c)),
            t(target_c)
        ),
        DewAnswer::Unreachable(DewObstacle::AirTooHumid {
            air_temp_c,
            dew_point_c,
            target_c,
        }) => format!(
            "Least air speed against dew: no air speed can do it — the air at {} has its dew point at {}, so even a leaf at air temperature is below the target of {}. Dry the air (heat and ventilate) instead.",
            t(air_temp_c),
            t(dew_point_c),
            t(target_c)
        ),
        DewAnswer::Unreachable(DewObstacle::BeyondSearch {
            max_speed_m_s,
            leaf_temp_at_max_c,
            target_c,
        }) => format!(
            "Least air speed against dew: not reachable with air alone — even at {} the leaf runs at {}, below the target of {}; the radiative loss to the sky or cover is too strong. A thermal screen or a little heat reduces it.",
            show_speed(max_speed_m_s, units),
            t(leaf_temp_at_max_c),
            t(target_c)
        ),
    };
    format!("{margin} {answer}")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn airflow_units_round_trip() {
        // 1 cfm = 0.000 471 947 m³/s (exact from the international foot); 1 m³/s = 3600 m³/h.
        for u in [FlowUnit::M3PerHour, FlowUnit::M3PerSecond, FlowUnit::Cfm] {
            let x = 1.2;
            assert!((u.from_display(u.to_display(x)) - x).abs() < 1e-12);
        }
        assert!((FlowUnit::M3PerHour.to_display(1.0) - 3600.0).abs() < 1e-9);
        assert!((FlowUnit::Cfm.to_display(cfm_to_m3_s(1000.0)) - 1000.0).abs() < 1e-9);
        assert_eq!(FlowUnit::Cfm.format(f64::NAN), "—");
    }

    #[test]
    fn rule_and_fan_sentences_never_print_nan() {
        let r = DiminishingReturns {
            steps: Vec::new(),
            knee_m_s: None,
            worth_it_k: f64::NAN,
            warming_from_m_s: None,
            more_transpiration_from_m_s: None,
        };
        for u in [UnitSystem::Si, UnitSystem::Imperial] {
            assert!(!returns_sentence(&r, u).contains("NaN"));
        }
    }
}

//! The canopy answers in words, in the user's units: the least canopy-top air speed, the least
//! shade and the least ventilation rate, one sentence each, and the number formatting they share
//! (never "NaN": "—" for a missing value). Used by the window and the grower report alike.

use leafwind_physics::canopy::{SpeedAnswer, SpeedObstacle};
use leafwind_physics::fans::{m3_s_to_cfm, m3_s_to_m3_h};
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
    let most = o.most_hours_in_a_day();
    let unsolved = match o.unsolved_hours() {
        0 => String::new(),
        n => format!(" ({n} h could not be solved and are not counted)"),
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

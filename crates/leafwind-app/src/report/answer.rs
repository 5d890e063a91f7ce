//! The report's first sentence: the least fan air speed that keeps the leaf at the limit minus the
//! margin, or that no air speed can and why — from the engine's [`WindAnswer`], in the report's
//! units. The numbers are tagged with their SI values (see [`super::html::num_span`]).

use leafwind_physics::WindAnswer;
use leafwind_physics::required_wind::{SEARCH_MAX_SPEED_DEFAULT_M_S, Unreachable};

use super::compute::{LeafResult, LimitStatus};
use super::html::{esc, num_span};
use super::tables::show;
use super::units::{Quantity, UnitSystem};

/// The least-air-speed answer as one sentence of HTML.
#[must_use]
pub fn answer_html(r: &LeafResult, units: UnitSystem) -> String {
    let t = |id: Option<&str>, c: f64| num_span(id, c, &show(Quantity::Temperature, c, units));
    let u = |id: Option<&str>, s: f64| num_span(id, s, &show(Quantity::Speed, s, units));
    let target = |c: f64| {
        format!(
            "{} (the {} limit less the {} margin)",
            t(Some("target-temp"), c),
            esc(&show(Quantity::Temperature, r.limit_c, units)),
            esc(&show(Quantity::TempDiff, r.margin_k, units))
        )
    };
    let ceiling = |c: Option<f64>| {
        c.map_or_else(String::new, |c| {
            format!(
                "; but above {} more air warms the leaf past the target again",
                u(Some("ceiling-speed"), c)
            )
        })
    };
    match &r.wind {
        Ok(WindAnswer::NotNeeded {
            still_air_leaf_temp_c,
            target_c,
            ceiling_m_s,
        }) => format!(
            "No fan air is needed for temperature: even in still air (<span id=\"least-speed\" class=\"num\" data-si=\"0\">{}</span>) the leaf runs at {}, at or below the target of {}{}.",
            esc(&show(Quantity::Speed, 0.0, units)),
            t(Some("still-air-temp"), *still_air_leaf_temp_c),
            target(*target_c),
            ceiling(*ceiling_m_s)
        ),
        Ok(WindAnswer::Speed {
            speed_m_s,
            target_c,
            ceiling_m_s,
            ..
        }) => format!(
            "The fans must give the leaf an air speed of <strong>at least {}</strong> to keep it at or below {}{}.",
            u(Some("least-speed"), *speed_m_s),
            target(*target_c),
            ceiling(*ceiling_m_s)
        ),
        Ok(WindAnswer::Unreachable(Unreachable::AirTooHot {
            air_temp_c,
            target_c,
            leaf_temp_at_max_c,
            leaf_cooler_than_air,
        })) => {
            let why = if *leaf_cooler_than_air {
                "transpiration already holds the leaf below the air, so more air would only warm it toward the air"
            } else {
                "so more air only brings the leaf toward the air temperature"
            };
            format!(
                "<strong id=\"least-speed\" data-si=\"\">No air speed can keep the leaf at or below {}</strong>: the air itself is at {}, {why} (at {} the leaf is at {}) — cool the air instead, with ventilation, shade or evaporative cooling.",
                target(*target_c),
                t(Some("air-temp"), *air_temp_c),
                esc(&show(Quantity::Speed, SEARCH_MAX_SPEED_DEFAULT_M_S, units)),
                t(None, *leaf_temp_at_max_c),
            )
        }
        Ok(WindAnswer::Unreachable(Unreachable::BeyondSearch {
            max_speed_m_s,
            leaf_temp_at_max_c,
            target_c,
        })) => format!(
            "<strong id=\"least-speed\" data-si=\"\">Air alone cannot keep the leaf at or below {}</strong>: even at {} the leaf runs at {} — reduce the radiation load (shade) or keep the stomata open (water).",
            target(*target_c),
            u(None, *max_speed_m_s),
            t(None, *leaf_temp_at_max_c),
        ),
        Err(e) => format!(
            "<strong id=\"least-speed\" data-si=\"\">The least air speed could not be worked out</strong>: {}.",
            esc(e.trim_end_matches('.'))
        ),
    }
}

/// Where the leaf stands now, as one sentence of HTML: its temperature at the scenario's air
/// speed, the difference from the air and the status against the limit (in words, never colour
/// alone).
#[must_use]
pub fn status_html(r: &LeafResult, units: UnitSystem) -> String {
    let s = &r.solution;
    let diff = s.leaf_air_diff_k;
    let side = if diff >= 0.0 { "above" } else { "below" };
    let words = match r.status() {
        LimitStatus::WithinMargin => "within the margin below the limit",
        LimitStatus::InsideMargin => "below the limit but inside the margin",
        LimitStatus::OverLimit => "over the limit",
    };
    format!(
        "At the scenario's air speed of {} the leaf runs at {}, {} {side} the air: <strong class=\"status-words\">{words}</strong>.",
        num_span(
            Some("current-speed"),
            r.case.air.speed_m_s,
            &show(Quantity::Speed, r.case.air.speed_m_s, units)
        ),
        num_span(
            Some("leaf-temp"),
            s.leaf_temp_c,
            &show(Quantity::Temperature, s.leaf_temp_c, units)
        ),
        num_span(
            Some("leaf-air-diff"),
            diff.abs(),
            &show(Quantity::TempDiff, diff.abs(), units)
        ),
    )
}

/// A class name for the status box (the words carry the meaning; the colour only repeats it).
#[must_use]
pub fn status_class(r: &LeafResult) -> &'static str {
    match r.status() {
        LimitStatus::WithinMargin => "ok",
        LimitStatus::InsideMargin => "close",
        LimitStatus::OverLimit => "over",
    }
}

//! The inverse question: the least air speed that keeps a leaf at or below a temperature limit
//! minus a margin — with honest answers when no air is needed, when more air warms the leaf, and
//! when no air speed can do it.
//!
//! Method: the exact leaf temperature is evaluated on a grid of speeds from still air to the search
//! maximum (denser at low speed, where the leaf responds most), the first grid speed that meets the
//! target is found, and the crossing is refined by bisection to 10⁻⁶ m s⁻¹. The grid makes the answer
//! robust where T_L(u) is not monotonic (a transpiring leaf can dip below the air and be warmed back by
//! more air). Features narrower than the grid spacing (≥ 0.4 % of the maximum) could be missed.

use crate::case::{AIR_SPEED_RANGE_M_S, LeafCase};
use crate::energy_balance::leaf_temp_c;
use crate::error::{Result, ValidRange};

/// Default upper end of the air-speed search \[m s⁻¹\]: beyond the fans of any greenhouse and a
/// strong field wind (common practice, no source).
pub const SEARCH_MAX_SPEED_DEFAULT_M_S: f64 = 10.0;

/// Valid margins below the limit \[K\].
pub const MARGIN_RANGE_K: ValidRange = ValidRange {
    quantity: "margin below the limit",
    min: 0.0,
    max: 20.0,
    unit: "K",
};

/// Valid leaf temperature limits \[°C\].
pub const LIMIT_RANGE_C: ValidRange = ValidRange {
    quantity: "leaf temperature limit",
    min: -20.0,
    max: 70.0,
    unit: "°C",
};

/// Grid intervals of the search.
const GRID_INTERVALS: usize = 48;

/// Why no air speed meets the target.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum Unreachable {
    /// The air itself is at or above the target, and more air only brings the leaf toward it.
    AirTooHot {
        /// Air temperature \[°C\].
        air_temp_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
        /// Leaf temperature at the search maximum \[°C\].
        leaf_temp_at_max_c: f64,
        /// Whether the leaf is already cooler than the air at the current speed.
        leaf_cooler_than_air: bool,
    },
    /// Even the search maximum leaves the leaf above the target (strong sun, closed stomata).
    BeyondSearch {
        /// Search maximum \[m s⁻¹\].
        max_speed_m_s: f64,
        /// Leaf temperature there \[°C\].
        leaf_temp_at_max_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
    },
}

/// The answer to "what air speed keeps this leaf under the limit minus the margin?".
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum WindAnswer {
    /// Still air already meets the target.
    NotNeeded {
        /// Leaf temperature in still air \[°C\].
        still_air_leaf_temp_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
        /// Above this speed the leaf warms past the target again \[m s⁻¹\] (a transpiring leaf
        /// cooler than hot air), if that happens within the search.
        ceiling_m_s: Option<f64>,
    },
    /// The least speed that meets the target.
    Speed {
        /// Least air speed \[m s⁻¹\].
        speed_m_s: f64,
        /// Leaf temperature at that speed \[°C\].
        leaf_temp_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
        /// As for [`WindAnswer::NotNeeded`].
        ceiling_m_s: Option<f64>,
    },
    /// No speed within the search meets the target.
    Unreachable(Unreachable),
}

impl WindAnswer {
    /// The least speed \[m s⁻¹\]: 0 when none is needed, None when unreachable.
    #[must_use]
    pub fn speed_m_s(&self) -> Option<f64> {
        match *self {
            WindAnswer::NotNeeded { .. } => Some(0.0),
            WindAnswer::Speed { speed_m_s, .. } => Some(speed_m_s),
            WindAnswer::Unreachable(_) => None,
        }
    }

    /// The answer in one plain sentence (SI units).
    #[must_use]
    pub fn sentence(&self) -> String {
        let ceiling = |c: Option<f64>| {
            c.map_or(String::new(), |u| {
                format!(" Above {u:.2} m/s more air warms the leaf past the target again.")
            })
        };
        match *self {
            WindAnswer::NotNeeded {
                still_air_leaf_temp_c,
                target_c,
                ceiling_m_s,
            } => format!(
                "No air movement is needed: even in still air the leaf runs at {still_air_leaf_temp_c:.1} °C, at or below the target of {target_c:.1} °C.{}",
                ceiling(ceiling_m_s)
            ),
            WindAnswer::Speed {
                speed_m_s,
                leaf_temp_c,
                target_c,
                ceiling_m_s,
            } => format!(
                "An air speed of at least {speed_m_s:.2} m/s over the leaf keeps it at {leaf_temp_c:.1} °C, the target of {target_c:.1} °C.{}",
                ceiling(ceiling_m_s)
            ),
            WindAnswer::Unreachable(u) => u.sentence(),
        }
    }
}

impl Unreachable {
    /// Why, in one or two plain sentences (SI units).
    #[must_use]
    pub fn sentence(&self) -> String {
        match *self {
            Unreachable::AirTooHot {
                air_temp_c,
                target_c,
                leaf_temp_at_max_c,
                leaf_cooler_than_air,
            } => {
                let tail = if leaf_cooler_than_air {
                    " Transpiration already holds the leaf below the air; more air would warm it toward the air."
                } else {
                    " More air only brings the leaf toward the air temperature."
                };
                format!(
                    "No air speed can do it: the air is at {air_temp_c:.1} °C, at or above the target of {target_c:.1} °C (at the fastest speed tried the leaf is at {leaf_temp_at_max_c:.1} °C).{tail} Cool the air (ventilation, shade, evaporative cooling) instead."
                )
            }
            Unreachable::BeyondSearch {
                max_speed_m_s,
                leaf_temp_at_max_c,
                target_c,
            } => format!(
                "Not reachable with air alone: even at {max_speed_m_s:.1} m/s the leaf runs at {leaf_temp_at_max_c:.1} °C, above the target of {target_c:.1} °C. Reduce the radiation load (shade) or keep the stomata open (water)."
            ),
        }
    }
}

/// The least air speed that keeps the leaf of `case` at or below `limit_c − margin_k`.
///
/// - `case`: the leaf case (its own air speed is ignored except to report whether the leaf is
///   cooler than the air there); `limit_c` \[°C\]; `margin_k` \[K\]; `max_speed_m_s`: search maximum
///   \[m s⁻¹\].
///
/// # Errors
/// Invalid case, limit, margin or search maximum.
pub fn required_wind(
    case: &LeafCase,
    limit_c: f64,
    margin_k: f64,
    max_speed_m_s: f64,
) -> Result<WindAnswer> {
    let limit_c = LIMIT_RANGE_C.check(limit_c)?;
    let margin_k = MARGIN_RANGE_K.check(margin_k)?;
    let max_speed = ValidRange {
        quantity: "air speed search maximum",
        min: 0.1,
        ..AIR_SPEED_RANGE_M_S
    }
    .check(max_speed_m_s)?;
    case.validate()?;
    let target_c = limit_c - margin_k;
    let temp_at = |u: f64| leaf_temp_c(&case.with_speed(u));
    let speeds: Vec<f64> = (0..=GRID_INTERVALS)
        .map(|i| {
            let f = i as f64 / GRID_INTERVALS as f64;
            max_speed * f * f
        })
        .collect();
    let temps = speeds
        .iter()
        .map(|&u| temp_at(u))
        .collect::<Result<Vec<f64>>>()?;
    let meets = |t: f64| t <= target_c;
    let Some(first) = temps.iter().position(|&t| meets(t)) else {
        let leaf_temp_at_max_c = temps[GRID_INTERVALS];
        let current = leaf_temp_c(case)?;
        return Ok(WindAnswer::Unreachable(if case.air.temp_c >= target_c {
            Unreachable::AirTooHot {
                air_temp_c: case.air.temp_c,
                target_c,
                leaf_temp_at_max_c,
                leaf_cooler_than_air: current < case.air.temp_c,
            }
        } else {
            Unreachable::BeyondSearch {
                max_speed_m_s: max_speed,
                leaf_temp_at_max_c,
                target_c,
            }
        }));
    };
    // The first grid speed past `first` that fails again, if any: the ceiling.
    let ceiling = match temps[first..].iter().position(|&t| !meets(t)) {
        Some(offset) => {
            let i = first + offset;
            Some(bisect(speeds[i - 1], speeds[i], |u| temp_at(u).map(meets))?.0)
        }
        None => None,
    };
    if first == 0 {
        return Ok(WindAnswer::NotNeeded {
            still_air_leaf_temp_c: temps[0],
            target_c,
            ceiling_m_s: ceiling,
        });
    }
    // Bisect between a failing and a meeting speed; return the meeting side.
    let (_, speed) = bisect(speeds[first - 1], speeds[first], |u| temp_at(u).map(meets))?;
    Ok(WindAnswer::Speed {
        speed_m_s: speed,
        leaf_temp_c: temp_at(speed)?,
        target_c,
        ceiling_m_s: ceiling,
    })
}

/// Bisection on a predicate that is `p(a)` at `a` and `!p(a)` at `b`; returns the final (a, b) ends,
/// each still on its own side, within 10⁻⁶ m s⁻¹.
fn bisect(mut a: f64, mut b: f64, mut p: impl FnMut(f64) -> Result<bool>) -> Result<(f64, f64)> {
    let side_a = p(a)?;
    while (b - a).abs() > 1e-6 {
        let mid = 0.5 * (a + b);
        if p(mid)? == side_a {
            a = mid;
        } else {
            b = mid;
        }
    }
    Ok((a, b))
}

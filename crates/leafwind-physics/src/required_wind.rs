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

/// Bisection tolerance of the search \[m s⁻¹\].
const SPEED_TOLERANCE_M_S: f64 = 1e-6;

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

/// Outcome of [`least_speed_meeting`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum SpeedSearch<T> {
    /// The condition already holds at the start of the search; the value there.
    AtStart {
        /// The evaluated value at the start speed.
        value: T,
    },
    /// The least speed at which it holds \[m s⁻¹\] (within the tolerance), and the value there.
    Least {
        /// The speed \[m s⁻¹\].
        speed_m_s: f64,
        /// The evaluated value at that speed.
        value: T,
    },
    /// It holds nowhere in the search; the value at the search maximum.
    Never {
        /// The evaluated value at the maximum.
        value_at_max: T,
    },
}

/// The least air speed in `[start_m_s, max_m_s]` at which `meets(eval(u))` holds — the search that
/// every "what air speed does it take" question of the engine shares.
///
/// `eval(u)` is evaluated on `grid_intervals` + 1 speeds u_i = start + (max − start)(i/n)² (denser
/// at the start, where leaves respond most); the first grid speed that meets the condition is
/// refined by bisection with the speed before it to `tolerance_m_s`, and the meeting side is
/// returned. Robust where the response is not monotonic; features narrower than the grid spacing
/// can be missed.
///
/// # Errors
/// The first error of `eval`.
pub fn least_speed_meeting<T: Copy>(
    mut eval: impl FnMut(f64) -> Result<T>,
    meets: impl Fn(&T) -> bool,
    start_m_s: f64,
    max_m_s: f64,
    grid_intervals: usize,
    tolerance_m_s: f64,
) -> Result<SpeedSearch<T>> {
    let n = grid_intervals.max(1);
    let speed = |i: usize| {
        let f = i as f64 / n as f64;
        start_m_s + (max_m_s - start_m_s) * f * f
    };
    let first = eval(start_m_s)?;
    if meets(&first) {
        return Ok(SpeedSearch::AtStart { value: first });
    }
    let mut last = first;
    for i in 1..=n {
        let u = speed(i);
        let v = eval(u)?;
        if meets(&v) {
            let (mut lo, mut hi, mut v_hi) = (speed(i - 1), u, v);
            while hi - lo > tolerance_m_s {
                let mid = 0.5 * (lo + hi);
                let vm = eval(mid)?;
                if meets(&vm) {
                    hi = mid;
                    v_hi = vm;
                } else {
                    lo = mid;
                }
            }
            return Ok(SpeedSearch::Least {
                speed_m_s: hi,
                value: v_hi,
            });
        }
        last = v;
    }
    Ok(SpeedSearch::Never { value_at_max: last })
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
    let meets = |t: &f64| *t <= target_c;
    let search = |start: f64, cond: &dyn Fn(&f64) -> bool| {
        least_speed_meeting(
            temp_at,
            cond,
            start,
            max_speed,
            GRID_INTERVALS,
            SPEED_TOLERANCE_M_S,
        )
    };
    // Above the answer, the least speed at which the target is lost again (a transpiring leaf below
    // hot air is warmed by more air), if within the search.
    let ceiling = |from: f64| -> Result<Option<f64>> {
        Ok(match search(from, &|t: &f64| !meets(t))? {
            SpeedSearch::Least { speed_m_s, .. } => Some(speed_m_s),
            SpeedSearch::AtStart { .. } | SpeedSearch::Never { .. } => None,
        })
    };
    Ok(match search(0.0, &meets)? {
        SpeedSearch::AtStart { value } => WindAnswer::NotNeeded {
            still_air_leaf_temp_c: value,
            target_c,
            ceiling_m_s: ceiling(0.0)?,
        },
        SpeedSearch::Least { speed_m_s, value } => WindAnswer::Speed {
            speed_m_s,
            leaf_temp_c: value,
            target_c,
            ceiling_m_s: ceiling(speed_m_s)?,
        },
        SpeedSearch::Never { value_at_max } => {
            WindAnswer::Unreachable(if case.air.temp_c >= target_c {
                Unreachable::AirTooHot {
                    air_temp_c: case.air.temp_c,
                    target_c,
                    leaf_temp_at_max_c: value_at_max,
                    leaf_cooler_than_air: leaf_temp_c(case)? < case.air.temp_c,
                }
            } else {
                Unreachable::BeyondSearch {
                    max_speed_m_s: max_speed,
                    leaf_temp_at_max_c: value_at_max,
                    target_c,
                }
            })
        }
    })
}

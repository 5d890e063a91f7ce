//! Night condensation on leaves: a leaf radiating to a cold sky or cover runs below the air and
//! can fall below the air's dew point, where water condenses on it (a risk for leaf diseases).
//! Moving air brings the leaf back toward the air temperature; this module gives the leaf–dew-point
//! margin, the least air speed that keeps the leaf at or above the dew point plus a margin (the
//! inverse problem from below), and the hours of a night with leaves below the dew point.
//!
//! The leaf temperature is the engine's exact balance ([`crate::energy_balance`]), which already
//! lets the latent term change sign (dew releases latent heat onto the leaf). The dew point is
//! that of the air, T_d with e°(T_d) = e_a (\[FAO56\] eq. 14, via [`crate::air::dew_point_c`]).
//!
//! Method of the inverse: as [`mod@crate::required_wind`], a grid of speeds from still air to the
//! search maximum (denser at low speed), the first grid speed meeting the target, bisection to
//! 10⁻⁶ m s⁻¹.
//!
//! **Caution.** Whether dew forms also depends on the leaf's position in the canopy, on the cover
//! dripping, and on the hours it lasts; disease risk depends on the crop and the pathogen. Use these
//! numbers beside a grower's or adviser's judgement.
//!
//! # References
//! - \[FAO56\] Allen, R. G., Pereira, L. S., Raes, D., Smith, M. (1998). FAO Irrigation and Drainage
//!   Paper 56, eq. 14 (e_a = e°(T_dew)).
//! - \[Monteith\] Monteith, J. L., Unsworth, M. H. (2013). *Principles of Environmental Physics*,
//!   4th ed. Academic Press. Ch. 13 (dew on leaves: radiative cooling against the convective supply
//!   of heat; from memory).

use crate::air::dew_point_c;
use crate::case::{AIR_SPEED_RANGE_M_S, LeafCase};
use crate::energy_balance::leaf_temp_c;
use crate::error::{Result, ValidRange};
use crate::required_wind::{SpeedSearch, least_speed_meeting};

/// Valid margins above the dew point \[K\].
pub const DEW_MARGIN_RANGE_K: ValidRange = ValidRange {
    quantity: "margin above the dew point",
    min: 0.0,
    max: 20.0,
    unit: "K",
};

/// Default margin above the dew point \[K\]: 1 (common practice, no source).
pub const DEW_MARGIN_DEFAULT_K: f64 = 1.0;

/// Grid intervals of the search.
const GRID_INTERVALS: usize = 48;

/// Leaf, air and dew point at one moment.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct DewMargin {
    /// Leaf temperature \[°C\].
    pub leaf_temp_c: f64,
    /// Air temperature \[°C\].
    pub air_temp_c: f64,
    /// Dew point of the air \[°C\].
    pub dew_point_c: f64,
    /// Leaf minus dew point \[K\] (negative: water condenses on the leaf).
    pub leaf_dew_diff_k: f64,
}

/// The leaf–dew-point margin of a case.
///
/// # Errors
/// An invalid case, or air so dry its dew point is below the engine's range.
pub fn dew_margin(case: &LeafCase) -> Result<DewMargin> {
    case.validate()?;
    let e = case.air.humidity.vapour_pressure_kpa(case.air.temp_c)?;
    let dew = dew_point_c(e)?;
    let t = leaf_temp_c(case)?;
    Ok(DewMargin {
        leaf_temp_c: t,
        air_temp_c: case.air.temp_c,
        dew_point_c: dew,
        leaf_dew_diff_k: t - dew,
    })
}

/// Why no air speed keeps the leaf above the dew point plus the margin.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum DewObstacle {
    /// The air itself is at or below dew point + margin (saturated or nearly): even a leaf at air
    /// temperature would not meet the target.
    AirTooHumid {
        /// Air temperature \[°C\].
        air_temp_c: f64,
        /// Dew point \[°C\].
        dew_point_c: f64,
        /// Dew point plus margin \[°C\].
        target_c: f64,
    },
    /// Radiative cooling is too strong: even at the search maximum the leaf stays below the
    /// target.
    BeyondSearch {
        /// Search maximum \[m s⁻¹\].
        max_speed_m_s: f64,
        /// Leaf there \[°C\].
        leaf_temp_at_max_c: f64,
        /// Dew point plus margin \[°C\].
        target_c: f64,
    },
}

/// The answer to "what air speed keeps this leaf at or above dew point + margin?".
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum DewAnswer {
    /// Still air already keeps the leaf dry.
    NotNeeded {
        /// Leaf in still air \[°C\].
        still_air_leaf_temp_c: f64,
        /// Dew point plus margin \[°C\].
        target_c: f64,
    },
    /// The least speed that does.
    Speed {
        /// Least air speed \[m s⁻¹\].
        speed_m_s: f64,
        /// Leaf there \[°C\].
        leaf_temp_c: f64,
        /// Dew point plus margin \[°C\].
        target_c: f64,
    },
    /// None within the search.
    Unreachable(DewObstacle),
}

impl DewAnswer {
    /// The least speed \[m s⁻¹\]: 0 when none is needed, None when unreachable.
    #[must_use]
    pub fn speed_m_s(&self) -> Option<f64> {
        match *self {
            DewAnswer::NotNeeded { .. } => Some(0.0),
            DewAnswer::Speed { speed_m_s, .. } => Some(speed_m_s),
            DewAnswer::Unreachable(_) => None,
        }
    }

    /// The answer in plain words (SI units).
    #[must_use]
    pub fn sentence(&self) -> String {
        match *self {
            DewAnswer::NotNeeded {
                still_air_leaf_temp_c,
                target_c,
            } => format!(
                "No air movement is needed: even in still air the leaf stays at {still_air_leaf_temp_c:.1} °C, at or above the dew point plus margin of {target_c:.1} °C."
            ),
            DewAnswer::Speed {
                speed_m_s,
                leaf_temp_c,
                target_c,
            } => format!(
                "An air speed of at least {speed_m_s:.2} m/s over the leaf keeps it at {leaf_temp_c:.1} °C, the dew point plus margin of {target_c:.1} °C."
            ),
            DewAnswer::Unreachable(DewObstacle::AirTooHumid {
                air_temp_c,
                dew_point_c,
                target_c,
            }) => format!(
                "No air speed can do it: the air at {air_temp_c:.1} °C has its dew point at {dew_point_c:.1} °C, so even a leaf at air temperature is below the target of {target_c:.1} °C. Dry the air (heat and ventilate) instead."
            ),
            DewAnswer::Unreachable(DewObstacle::BeyondSearch {
                max_speed_m_s,
                leaf_temp_at_max_c,
                target_c,
            }) => format!(
                "Not reachable with air alone: even at {max_speed_m_s:.1} m/s the leaf runs at {leaf_temp_at_max_c:.1} °C, below the target of {target_c:.1} °C; the radiative loss to the sky or cover is too strong. A thermal screen or a little heat reduces it."
            ),
        }
    }
}

/// The least air speed that keeps the leaf of `case` at or above its air's dew point + `margin_k`.
///
/// - `case` (its own air speed is ignored); `margin_k` \[K\]; `max_speed_m_s` search maximum
///   \[m s⁻¹\].
///
/// # Errors
/// Invalid case, margin or maximum.
pub fn least_speed_against_dew(
    case: &LeafCase,
    margin_k: f64,
    max_speed_m_s: f64,
) -> Result<DewAnswer> {
    let margin = DEW_MARGIN_RANGE_K.check(margin_k)?;
    let max = ValidRange {
        quantity: "air speed search maximum",
        min: 0.1,
        ..AIR_SPEED_RANGE_M_S
    }
    .check(max_speed_m_s)?;
    case.validate()?;
    let e = case.air.humidity.vapour_pressure_kpa(case.air.temp_c)?;
    let dew = dew_point_c(e)?;
    let target = dew + margin;
    if case.air.temp_c <= target {
        return Ok(DewAnswer::Unreachable(DewObstacle::AirTooHumid {
            air_temp_c: case.air.temp_c,
            dew_point_c: dew,
            target_c: target,
        }));
    }
    let search = least_speed_meeting(
        |u| leaf_temp_c(&case.with_speed(u)),
        |t: &f64| *t >= target,
        0.0,
        max,
        GRID_INTERVALS,
        1e-6,
    )?;
    Ok(match search {
        SpeedSearch::AtStart { value } => DewAnswer::NotNeeded {
            still_air_leaf_temp_c: value,
            target_c: target,
        },
        SpeedSearch::Least { speed_m_s, value } => DewAnswer::Speed {
            speed_m_s,
            leaf_temp_c: value,
            target_c: target,
        },
        SpeedSearch::Never { value_at_max } => DewAnswer::Unreachable(DewObstacle::BeyondSearch {
            max_speed_m_s: max,
            leaf_temp_at_max_c: value_at_max,
            target_c: target,
        }),
    })
}

/// One hour of a night.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct DewHour {
    /// Index of the hour in the input.
    pub index: usize,
    /// The margin (None if the hour could not be solved).
    pub margin: Option<DewMargin>,
    /// Why the hour could not be solved.
    pub error: Option<String>,
}

/// A night (or any run of hours) and its summary.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct DewSeries {
    /// Hour by hour.
    pub hours: Vec<DewHour>,
    /// Hours with the leaf below the dew point \[h\].
    pub hours_below_dew_point: f64,
    /// Hours with the leaf below dew point + margin \[h\].
    pub hours_below_margin: f64,
    /// Margin used \[K\].
    pub margin_k: f64,
    /// Smallest leaf–dew-point difference \[K\].
    pub min_leaf_dew_diff_k: Option<f64>,
    /// Hours that could not be solved.
    pub failed_hours: usize,
}

/// Hours with leaves below the dew point over a series of per-hour leaf cases (each counts 1 h).
/// Unsolved hours keep their error and do not stop the rest.
///
/// # Errors
/// An invalid margin.
pub fn dew_hours(cases: &[LeafCase], margin_k: f64) -> Result<DewSeries> {
    let margin = DEW_MARGIN_RANGE_K.check(margin_k)?;
    let hours: Vec<DewHour> = cases
        .iter()
        .enumerate()
        .map(|(i, c)| match dew_margin(c) {
            Ok(m) => DewHour {
                index: i,
                margin: Some(m),
                error: None,
            },
            Err(e) => DewHour {
                index: i,
                margin: None,
                error: Some(format!("hour {i}: {e}")),
            },
        })
        .collect();
    let diffs: Vec<f64> = hours
        .iter()
        .filter_map(|h| h.margin.map(|m| m.leaf_dew_diff_k))
        .collect();
    Ok(DewSeries {
        hours_below_dew_point: diffs.iter().filter(|&&d| d < 0.0).count() as f64,
        hours_below_margin: diffs.iter().filter(|&&d| d < margin).count() as f64,
        margin_k: margin,
        min_leaf_dew_diff_k: diffs.iter().copied().reduce(f64::min),
        failed_hours: hours.iter().filter(|h| h.margin.is_none()).count(),
        hours,
    })
}

/// Per-hour leaf cases from hourly weather (design day or measured): each hour's air, humidity and
/// pressure, the given air speed over the leaf \[m s⁻¹\], the leaf, what its upper face sees, and
/// the global horizontal shortwave of the hour on the upper face (clear sky from
/// [`crate::sun::ashrae_clear_sky`] or the measured value; 0 at night).
///
/// # Errors
/// An invalid site or time.
pub fn hourly_leaf_cases(
    site: &crate::sun::Site,
    weather: &[crate::design_day::HourWeather],
    leaf: &crate::case::Leaf,
    upper_view: crate::radiation::UpperView,
    speed_m_s: f64,
) -> Result<Vec<LeafCase>> {
    weather
        .iter()
        .map(|w| {
            let global = match w.light {
                crate::design_day::HourLight::ClearSky => {
                    let sun = crate::sun::sun_position(site, &w.time)?;
                    crate::sun::ashrae_clear_sky(w.time.month, sun.elevation_rad).global_w_m2()
                }
                crate::design_day::HourLight::MeasuredGlobal(g) => g,
            };
            let mut c = LeafCase {
                leaf: *leaf,
                ..LeafCase::default()
            };
            c.air.temp_c = w.air_temp_c;
            c.air.humidity = w.humidity;
            c.air.pressure_kpa = w.pressure_kpa;
            c.air.speed_m_s = speed_m_s;
            c.surroundings.shortwave_w_m2 = global;
            c.surroundings.upper_view = upper_view;
            Ok(c)
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::air::Humidity;
    use crate::radiation::UpperView;

    fn night() -> LeafCase {
        let mut c = LeafCase::default();
        c.surroundings.shortwave_w_m2 = 0.0;
        c.surroundings.upper_view = UpperView::ClearSky;
        c.air.temp_c = 12.0;
        c.air.humidity = Humidity::RelativePct(92.0);
        c.leaf.stomatal_conductance_mol_m2_s = 0.01;
        c
    }

    #[test]
    fn night_leaf_is_below_the_air() {
        let m = dew_margin(&night().with_speed(0.1)).unwrap();
        assert!(m.leaf_temp_c < m.air_temp_c);
    }

    #[test]
    fn saturated_air_is_unreachable() {
        let mut c = night();
        c.air.humidity = Humidity::RelativePct(100.0);
        let a = least_speed_against_dew(&c, 0.5, 10.0).unwrap();
        assert!(matches!(
            a,
            DewAnswer::Unreachable(DewObstacle::AirTooHumid { .. })
        ));
        assert!(a.sentence().contains("No air speed"));
    }
}

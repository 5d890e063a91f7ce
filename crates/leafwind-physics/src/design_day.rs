//! Hour by hour: a design day from a daily maximum and minimum temperature with a published diurnal
//! shape, a humidity and the clear-sky sun of the date and place; and the same hourly evaluation
//! over a measured weather series ([`crate::weather`]). Each hour gives the hottest leaf of the
//! canopy (in the open or in a greenhouse), its margin to a crop heat limit, and the day's hours and
//! degree-hours over the limit.
//!
//! Each result stands for a duration Δt ([`row_durations_h`]): one hour on a design day and in an
//! hourly file, the logging interval in a finer one (a climate computer's 5 or 15 min). Hours over
//! the limit add Δt for each row above it; degree-hours add max(0, T − T_limit) × Δt. The
//! temperature compared with the limit is the hottest leaf for a
//! [`LimitKind::Tissue`] limit and the air around the crop (inside air in a greenhouse) for a
//! [`LimitKind::Air`] limit.
//!
//! # References
//! - \[ASHRAE2009\] ASHRAE (2009). *ASHRAE Handbook — Fundamentals*, ch. 14 "Climatic design
//!   information", Table 6 "Fraction of daily temperature range" (T = T_max − f · DR by local standard
//!   hour; values from memory).
//! - Solar position, clear-sky model and the split of measured global light: [`crate::sun`].

use crate::air::{Humidity, pressure_from_altitude_kpa, saturation_vapour_pressure_kpa};
use crate::canopy::{CanopyCase, CanopyLight, CanopyOptics, CanopyStructure, solve_with_optics};
use crate::case::{Air, Leaf};
use crate::convection::{CRITICAL_REYNOLDS_DEFAULT, TURBULENCE_FACTOR_DEFAULT};
use crate::crops::{HeatLimit, LimitKind};
use crate::error::{PhysicsError, Result, ValidRange};
use crate::greenhouse::{
    Cover, GreenhouseCase, INSIDE_SPEED_DEFAULT_M_S, InsideAir, Outside,
    VENTILATION_DEFAULT_M3_M2_S, solve_greenhouse_with_optics,
};
use crate::radiation::UpperView;
use crate::sun::{DateTime, Site, ashrae_clear_sky, split_global, sun_position};

/// \[ASHRAE2009\] ch. 14, Table 6: fraction of the daily range below the maximum at local standard
/// hours 1 to 24 (values from memory).
pub const ASHRAE2009_RANGE_FRACTIONS: [f64; 24] = [
    0.88, 0.92, 0.95, 0.98, 1.00, 0.98, 0.91, 0.74, 0.55, 0.38, 0.23, 0.13, 0.05, 0.00, 0.00, 0.06,
    0.14, 0.24, 0.39, 0.50, 0.59, 0.68, 0.75, 0.82,
];

/// The shape of the day's temperature between its minimum and maximum.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum DiurnalShape {
    /// \[ASHRAE2009\] Table 6 (minimum at 05:00, maximum 14:00–15:00), linear between table hours.
    Ashrae2009,
    /// T = T_mean + ½ DR cos(2π (t − t_peak)/24) (common practice, no source).
    Cosine {
        /// Hour of the maximum \[h\].
        peak_hour: f64,
    },
}

/// Air temperature \[°C\] at local clock hour `hour` (0–24) of a day with maximum `max_c` and minimum
/// `min_c` \[°C\].
///
/// ```
/// use leafwind_physics::design_day::{DiurnalShape, diurnal_temp_c};
/// // [ASHRAE2009] Table 6: at 05:00 the day is at its minimum, at 14:00 at its maximum.
/// assert_eq!(diurnal_temp_c(DiurnalShape::Ashrae2009, 32.0, 20.0, 5.0), 20.0);
/// assert_eq!(diurnal_temp_c(DiurnalShape::Ashrae2009, 32.0, 20.0, 14.0), 32.0);
/// ```
#[must_use]
pub fn diurnal_temp_c(shape: DiurnalShape, max_c: f64, min_c: f64, hour: f64) -> f64 {
    let range = max_c - min_c;
    match shape {
        DiurnalShape::Ashrae2009 => {
            // Table hour k (1–24) sits at clock hour k; hour 0 is hour 24 of the day before.
            let h = hour.rem_euclid(24.0);
            let k0 = h.floor() as usize; // 0..23
            let frac = h - h.floor();
            let at = |k: usize| ASHRAE2009_RANGE_FRACTIONS[(k + 23) % 24]; // clock hour k
            let f = at(k0) * (1.0 - frac) + at(k0 + 1) * frac;
            max_c - f * range // [ASHRAE2009] ch. 14, T = T_max − f DR
        }
        DiurnalShape::Cosine { peak_hour } => {
            0.5 * (max_c + min_c)
                + 0.5 * range * (2.0 * std::f64::consts::PI * (hour - peak_hour) / 24.0).cos()
        }
    }
}

/// The humidity of a design day, held at one vapour pressure all day (common practice, no source).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum DayHumidity {
    /// The day's dew point \[°C\].
    DewPointC(f64),
    /// The relative humidity at the day's maximum temperature (the day's lowest) \[%\].
    MinRhPct(f64),
}

/// A design day.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct DesignDay {
    /// The date (its clock time is ignored).
    pub date: DateTime,
    /// Daily maximum air temperature \[°C\].
    pub max_temp_c: f64,
    /// Daily minimum air temperature \[°C\].
    pub min_temp_c: f64,
    /// Humidity.
    pub humidity: DayHumidity,
    /// Diurnal shape.
    pub shape: DiurnalShape,
    /// Wind speed \[m s⁻¹\] (open field: times [`SeriesCase::wind_factor`] gives the canopy-top speed).
    pub wind_m_s: f64,
    /// Air pressure \[kPa\]; None takes it from the site altitude (\[FAO56\] eq. 7, see
    /// [`crate::air::pressure_from_altitude_kpa`]).
    pub pressure_kpa: Option<f64>,
}

impl Default for DesignDay {
    /// An invented hot mid-summer day.
    fn default() -> Self {
        Self {
            date: DateTime::date(2026, 7, 21),
            max_temp_c: 35.0,
            min_temp_c: 22.0,
            humidity: DayHumidity::MinRhPct(30.0),
            shape: DiurnalShape::Ashrae2009,
            wind_m_s: 1.5,
            pressure_kpa: None,
        }
    }
}

/// A greenhouse around the crop for an hourly run (the inside air from the ventilation balance).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct GreenhouseSetup {
    /// The cover.
    pub cover: Cover,
    /// Shade fraction \[–\].
    pub shade_fraction: f64,
    /// Ventilation rate per floor area \[m³ s⁻¹ m⁻²\].
    pub ventilation_m3_m2_s: f64,
    /// Canopy-top air speed inside \[m s⁻¹\].
    pub canopy_top_speed_m_s: f64,
}

impl Default for GreenhouseSetup {
    fn default() -> Self {
        Self {
            cover: Cover::default(),
            shade_fraction: 0.0,
            ventilation_m3_m2_s: VENTILATION_DEFAULT_M3_M2_S,
            canopy_top_speed_m_s: INSIDE_SPEED_DEFAULT_M_S,
        }
    }
}

/// Where the crop grows.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum Environment {
    /// In the open under the sky.
    OpenField,
    /// Under a greenhouse cover.
    Greenhouse(GreenhouseSetup),
}

/// Everything an hourly run needs besides the weather.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct SeriesCase {
    /// The place.
    pub site: Site,
    /// The leaves.
    pub leaf: Leaf,
    /// The canopy.
    pub structure: CanopyStructure,
    /// The crop heat limit.
    pub limit: HeatLimit,
    /// Open field or greenhouse.
    pub environment: Environment,
    /// Canopy-top air speed over the given wind speed, open field \[–\] (1 takes the wind as
    /// measured at the canopy top).
    pub wind_factor: f64,
    /// Turbulence factor \[–\].
    pub turbulence_factor: f64,
    /// Transition Reynolds number \[–\].
    pub critical_reynolds: f64,
}

impl Default for SeriesCase {
    fn default() -> Self {
        Self {
            site: Site::default(),
            leaf: Leaf::default(),
            structure: CanopyStructure::default(),
            limit: crate::crops::CROP_HEAT_LIMITS[1].clone(),
            environment: Environment::OpenField,
            wind_factor: 1.0,
            turbulence_factor: TURBULENCE_FACTOR_DEFAULT,
            critical_reynolds: CRITICAL_REYNOLDS_DEFAULT,
        }
    }
}

/// Valid wind factors \[–\].
pub const WIND_FACTOR_RANGE: ValidRange = ValidRange {
    quantity: "wind factor",
    min: 0.0,
    max: 5.0,
    unit: "",
};

/// The sunlight of one hour.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum HourLight {
    /// Clear sky by \[ASHRAE1985\] (see [`crate::sun::ashrae_clear_sky`]).
    ClearSky,
    /// Measured global horizontal \[W m⁻²\], split by \[Erbs\] (see [`crate::sun::split_global`]).
    MeasuredGlobal(f64),
}

/// One hour's weather.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct HourWeather {
    /// Local clock time.
    pub time: DateTime,
    /// Air temperature \[°C\].
    pub air_temp_c: f64,
    /// Humidity.
    pub humidity: Humidity,
    /// Wind speed \[m s⁻¹\].
    pub wind_m_s: f64,
    /// Sunlight.
    pub light: HourLight,
    /// Pressure \[kPa\].
    pub pressure_kpa: f64,
}

/// One hour's result.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct HourResult {
    /// Local clock time.
    pub time: DateTime,
    /// Outside air temperature \[°C\].
    pub air_temp_c: f64,
    /// Inside air temperature (greenhouse) \[°C\].
    pub inside_air_temp_c: Option<f64>,
    /// Sun elevation \[rad\]; None if the hour could not be solved.
    pub sun_elevation_rad: Option<f64>,
    /// Global shortwave on the horizontal outside \[W m⁻²\]; None if the hour could not be solved.
    pub global_w_m2: Option<f64>,
    /// Hottest leaf \[°C\]; None if the hour could not be solved.
    pub hottest_leaf_temp_c: Option<f64>,
    /// Its layer from the top.
    pub hottest_layer: Option<usize>,
    /// Whether it is sunlit.
    pub hottest_sunlit: Option<bool>,
    /// The temperature compared with the limit (leaf or air, per the limit's kind) \[°C\].
    pub compared_temp_c: Option<f64>,
    /// Limit minus the compared temperature \[K\].
    pub margin_k: Option<f64>,
    /// Why the hour could not be solved.
    pub error: Option<String>,
    /// The time this row stands for \[h\] ([`row_durations_h`]).
    pub duration_h: f64,
}

/// A run of hours and its summary.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct HourlySeries {
    /// The hours in order.
    pub hours: Vec<HourResult>,
    /// The limit used.
    pub limit: HeatLimit,
    /// Hours with the compared temperature above the limit \[h\].
    pub hours_over_limit: f64,
    /// Degree-hours above the limit \[K h\].
    pub degree_hours_over_k_h: f64,
    /// Smallest margin of the run \[K\] (negative: over the limit).
    pub min_margin_k: Option<f64>,
    /// Hottest leaf of the run \[°C\].
    pub max_leaf_temp_c: Option<f64>,
    /// Hours that could not be solved.
    pub failed_hours: usize,
}

/// Validates the parts of a series case that do not change by the hour.
fn validate_case(case: &SeriesCase) -> Result<()> {
    case.site.validate()?;
    case.structure.validate()?;
    case.limit.validate()?;
    WIND_FACTOR_RANGE.check(case.wind_factor)?;
    Ok(())
}

/// Solves one hour.
///
/// # Errors
/// Invalid inputs for that hour, or a balance that could not be solved.
pub fn evaluate_hour(
    case: &SeriesCase,
    optics: &CanopyOptics,
    weather: &HourWeather,
) -> Result<HourResult> {
    let sun = sun_position(&case.site, &weather.time)?;
    let doy = weather.time.day_of_year();
    let shortwave = match weather.light {
        HourLight::ClearSky => ashrae_clear_sky(weather.time.month, sun.elevation_rad),
        HourLight::MeasuredGlobal(g) => split_global(g, doy, sun.elevation_rad)?,
    };
    let light = CanopyLight {
        sun_elevation_rad: sun.elevation_rad,
        shortwave,
    };
    let (hottest, inside) = match case.environment {
        Environment::OpenField => {
            let c = CanopyCase {
                air: Air {
                    temp_c: weather.air_temp_c,
                    humidity: weather.humidity,
                    pressure_kpa: weather.pressure_kpa,
                    speed_m_s: weather.wind_m_s * case.wind_factor,
                    turbulence_factor: case.turbulence_factor,
                },
                leaf: case.leaf,
                upper_view: UpperView::ClearSky,
                light,
                structure: case.structure,
                critical_reynolds: case.critical_reynolds,
                limit_c: None,
            };
            (solve_with_optics(&c, optics)?.hottest, None)
        }
        Environment::Greenhouse(g) => {
            let c = GreenhouseCase {
                outside: Outside {
                    air_temp_c: weather.air_temp_c,
                    humidity: weather.humidity,
                    pressure_kpa: weather.pressure_kpa,
                    sun_elevation_rad: sun.elevation_rad,
                    shortwave,
                },
                cover: g.cover,
                shade_fraction: g.shade_fraction,
                inside: InsideAir::Ventilated {
                    rate_m3_m2_s: g.ventilation_m3_m2_s,
                },
                canopy_top_speed_m_s: g.canopy_top_speed_m_s,
                leaf: case.leaf,
                structure: case.structure,
                turbulence_factor: case.turbulence_factor,
                critical_reynolds: case.critical_reynolds,
                limit_c: None,
            };
            let s = solve_greenhouse_with_optics(&c, optics)?;
            (s.canopy.hottest, Some(s.inside_air_temp_c))
        }
    };
    let compared = match case.limit.kind {
        LimitKind::Tissue => hottest.leaf_temp_c,
        LimitKind::Air => inside.unwrap_or(weather.air_temp_c),
    };
    Ok(HourResult {
        time: weather.time,
        air_temp_c: weather.air_temp_c,
        inside_air_temp_c: inside,
        sun_elevation_rad: Some(sun.elevation_rad),
        global_w_m2: Some(shortwave.global_w_m2()),
        hottest_leaf_temp_c: Some(hottest.leaf_temp_c),
        hottest_layer: Some(hottest.layer),
        hottest_sunlit: Some(hottest.sunlit),
        compared_temp_c: Some(compared),
        margin_k: Some(case.limit.margin_k(compared)),
        error: None,
        duration_h: 1.0,
    })
}

/// Solves every hour (on up to the available cores, in order) and sums up. Hours that fail keep
/// their error and do not stop the rest.
///
/// # Errors
/// An invalid series case (site, structure, limit, wind factor).
pub fn run_hours(case: &SeriesCase, weather: &[HourWeather]) -> Result<HourlySeries> {
    validate_case(case)?;
    let optics = CanopyOptics::new(&case.structure, case.leaf.absorptivity);
    let one = |w: &HourWeather| {
        evaluate_hour(case, &optics, w).unwrap_or_else(|e| HourResult {
            time: w.time,
            air_temp_c: w.air_temp_c,
            inside_air_temp_c: None,
            sun_elevation_rad: None,
            global_w_m2: None,
            hottest_leaf_temp_c: None,
            hottest_layer: None,
            hottest_sunlit: None,
            compared_temp_c: None,
            margin_k: None,
            error: Some(format!("{}: {e}", w.time)),
            duration_h: 1.0,
        })
    };
    let threads = std::thread::available_parallelism()
        .map_or(1, std::num::NonZero::get)
        .min(weather.len().div_ceil(64).max(1));
    let hours: Vec<HourResult> = if threads <= 1 {
        weather.iter().map(one).collect()
    } else {
        let chunk = weather.len().div_ceil(threads);
        std::thread::scope(|s| {
            let handles: Vec<_> = weather
                .chunks(chunk)
                .map(|part| s.spawn(move || part.iter().map(one).collect::<Vec<_>>()))
                .collect();
            handles
                .into_iter()
                .flat_map(|h| h.join().unwrap_or_default())
                .collect()
        })
    };
    if hours.len() != weather.len() {
        return Err(PhysicsError::Inconsistent(
            "an hourly worker stopped unexpectedly".into(),
        ));
    }
    Ok(summarise_hours(hours, &case.limit))
}

/// The time each row of a series stands for \[h\]: the record's logging step — the lower median of
/// the intervals between rows — or the interval to the next row where that is shorter. A regular
/// record of any step (hourly, 15 min, 5 min) thus counts each row for that step; a gap in the
/// record (missing rows) is not counted as hours of the row before it; and the last row stands for
/// one step. A lone row stands for one hour. Times are expected in increasing order (the weather
/// import and the design day ensure it); a repeated time counts for nothing.
///
/// This is this engine's convention (no source): a record's rows are read as samples of a
/// piecewise-constant temperature held for one logging step, the usual reading of logged climate
/// data. A record that changes its step part-way counts the rows of the rarer step at the more
/// common one.
#[must_use]
pub fn row_durations_h(times: &[DateTime]) -> Vec<f64> {
    if times.len() < 2 {
        return vec![1.0; times.len()];
    }
    let minutes: Vec<i64> = times.iter().map(DateTime::minutes_since_epoch).collect();
    let gaps_h: Vec<f64> = minutes
        .windows(2)
        .map(|w| (w[1] - w[0]).max(0) as f64 / 60.0)
        .collect();
    let mut positive: Vec<f64> = gaps_h.iter().copied().filter(|g| *g > 0.0).collect();
    positive.sort_by(f64::total_cmp);
    let Some(&step_h) = positive.get(positive.len().saturating_sub(1) / 2) else {
        return vec![0.0; times.len()];
    };
    gaps_h
        .iter()
        .map(|g| g.min(step_h))
        .chain(std::iter::once(step_h))
        .collect()
}

/// Sums up a run of hours (in time order): sets each row's [`HourResult::duration_h`], and adds
/// the hours and degree-hours over `limit`, the least margin and the hottest leaf. Unsolved hours
/// carry None and their error (never a NaN) and are counted as failed.
#[must_use]
pub fn summarise_hours(mut hours: Vec<HourResult>, limit: &HeatLimit) -> HourlySeries {
    let times: Vec<DateTime> = hours.iter().map(|h| h.time).collect();
    for (h, d) in hours.iter_mut().zip(row_durations_h(&times)) {
        h.duration_h = d;
    }
    let mut over = 0.0;
    let mut degree_hours = 0.0;
    let mut min_margin: Option<f64> = None;
    let mut max_leaf: Option<f64> = None;
    let mut failed = 0;
    for h in &hours {
        match (h.compared_temp_c, h.margin_k) {
            (Some(t), Some(m)) => {
                if t > limit.limit_c {
                    over += h.duration_h;
                    degree_hours += (t - limit.limit_c) * h.duration_h;
                }
                min_margin = Some(min_margin.map_or(m, |x: f64| x.min(m)));
            }
            _ => failed += 1,
        }
        if let Some(t) = h.hottest_leaf_temp_c {
            max_leaf = Some(max_leaf.map_or(t, |x: f64| x.max(t)));
        }
    }
    HourlySeries {
        hours,
        limit: limit.clone(),
        hours_over_limit: over,
        degree_hours_over_k_h: degree_hours,
        min_margin_k: min_margin,
        max_leaf_temp_c: max_leaf,
        failed_hours: failed,
    }
}

/// Valid daily temperature ranges: the maximum must not be below the minimum.
fn check_day(day: &DesignDay) -> Result<()> {
    day.date.validate()?;
    let t = crate::air::AIR_TEMP_RANGE_C;
    ValidRange {
        quantity: "daily maximum temperature",
        ..t
    }
    .check(day.max_temp_c)?;
    ValidRange {
        quantity: "daily minimum temperature",
        max: day.max_temp_c,
        ..t
    }
    .check(day.min_temp_c)?;
    crate::case::AIR_SPEED_RANGE_M_S.check(day.wind_m_s)?;
    if let Some(p) = day.pressure_kpa {
        crate::air::PRESSURE_RANGE_KPA.check(p)?;
    }
    Ok(())
}

/// The 24 hourly weather rows (00:00 to 23:00) of a design day at `site`.
///
/// # Errors
/// An invalid day (minimum above maximum, date that does not exist, humidity out of range).
pub fn design_day_weather(day: &DesignDay, site: &Site) -> Result<Vec<HourWeather>> {
    check_day(day)?;
    site.validate()?;
    let pressure = match day.pressure_kpa {
        Some(p) => p,
        None => pressure_from_altitude_kpa(site.altitude_m)?,
    };
    let e_day = match day.humidity {
        DayHumidity::DewPointC(d) => Humidity::DewPointC(d).vapour_pressure_kpa(day.max_temp_c)?,
        DayHumidity::MinRhPct(rh) => {
            Humidity::RelativePct(rh).vapour_pressure_kpa(day.max_temp_c)?
        }
    };
    Ok((0..24)
        .map(|h| {
            let t = diurnal_temp_c(day.shape, day.max_temp_c, day.min_temp_c, f64::from(h));
            // Constant vapour pressure, capped at saturation in the cool of the night.
            let rh = (100.0 * e_day / saturation_vapour_pressure_kpa(t)).min(100.0);
            HourWeather {
                time: day.date.at(h, 0),
                air_temp_c: t,
                humidity: Humidity::RelativePct(rh),
                wind_m_s: day.wind_m_s,
                light: HourLight::ClearSky,
                pressure_kpa: pressure,
            }
        })
        .collect())
}

/// Runs a design day: 24 clear-sky hours.
///
/// # Errors
/// An invalid day or case.
///
/// ```
/// use leafwind_physics::design_day::{DesignDay, SeriesCase, run};
/// let s = run(&DesignDay::default(), &SeriesCase::default()).unwrap();
/// assert_eq!(s.hours.len(), 24);
/// assert_eq!(s.failed_hours, 0);
/// ```
pub fn run(day: &DesignDay, case: &SeriesCase) -> Result<HourlySeries> {
    run_hours(case, &design_day_weather(day, &case.site)?)
}

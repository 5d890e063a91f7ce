//! The sun: its position from place, date and clock time; extraterrestrial radiation; clear-sky
//! shortwave on a horizontal surface with its beam and diffuse parts; and the split of a measured
//! global irradiance into beam and diffuse.
//!
//! Angles are radians inside; the site's latitude and longitude are given in degrees (named `_deg`)
//! because that is how a user reads them off a map.
//!
//! # References
//! - \[Michalsky\] Michalsky, J. J. (1988). The Astronomical Almanac's algorithm for approximate solar
//!   position (1950–2050). *Solar Energy* 40(3), 227–235. (Stated accuracy 0.01° in elevation and
//!   azimuth within 1950–2050; the quadrant of the azimuth is taken here with `atan2`, which avoids
//!   the southern-hemisphere ambiguity of the paper's arcsine form.)
//! - \[FAO56\] Allen, R. G., Pereira, L. S., Raes, D., Smith, M. (1998). *Crop evapotranspiration —
//!   Guidelines for computing crop water requirements*. FAO Irrigation and Drainage Paper 56, ch. 3,
//!   eqs. 21–25 (extraterrestrial radiation) and eq. 37 (clear-sky radiation).
//! - \[ASHRAE1985\] ASHRAE (1985). *ASHRAE Handbook — Fundamentals*, ch. 27, Table 1: the clear-sky
//!   model E_DN = A exp(−B / sin β), diffuse on a horizontal surface C · E_DN, with A, B, C for the
//!   21st of each month (table values from memory; the model is the one the Handbook used until its
//!   2009 edition replaced it).
//! - \[Erbs\] Erbs, D. G., Klein, S. A., Duffie, J. A. (1982). Estimation of the diffuse radiation
//!   fraction for hourly, daily and monthly-average global radiation. *Solar Energy* 28(4), 293–302
//!   (the hourly correlation; coefficients from memory, as printed in Duffie & Beckman, *Solar
//!   Engineering of Thermal Processes*, 4th ed. (2013), eq. 2.10.1).
//! - \[Reda\] Reda, I., Andreas, A. (2004). Solar position algorithm for solar radiation applications.
//!   *Solar Energy* 76(5), 577–589 (the worked example used as a check in `tests/sun.rs`).

use std::f64::consts::PI;

use crate::error::{Result, ValidRange};

/// Solar constant as FAO-56 uses it, G_sc = 0.0820 MJ m⁻² min⁻¹ (\[FAO56\] eq. 21).
///
/// Kept here beside the FAO-56 equations it belongs to; it should move to [`crate::constants`]
/// when that module's owner adds it.
pub const SOLAR_CONSTANT_FAO56_MJ_M2_MIN: f64 = 0.0820;

/// The same solar constant in W m⁻² (0.0820 × 10⁶ / 60 = 1366.7 W m⁻²).
pub const SOLAR_CONSTANT_FAO56_W_M2: f64 = SOLAR_CONSTANT_FAO56_MJ_M2_MIN * 1.0e6 / 60.0;

/// Valid latitudes \[°\].
pub const LATITUDE_RANGE_DEG: ValidRange = ValidRange {
    quantity: "latitude",
    min: -90.0,
    max: 90.0,
    unit: "°",
};

/// Valid longitudes \[°\], east positive.
pub const LONGITUDE_RANGE_DEG: ValidRange = ValidRange {
    quantity: "longitude",
    min: -180.0,
    max: 180.0,
    unit: "°",
};

/// Valid offsets of local clock time from UTC \[h\].
pub const UTC_OFFSET_RANGE_H: ValidRange = ValidRange {
    quantity: "time-zone offset from UTC",
    min: -14.0,
    max: 14.0,
    unit: "h",
};

/// Years for which \[Michalsky\] states its accuracy (1950–2050); the engine accepts 1900–2100 and the
/// error grows slowly outside the stated span.
pub const YEAR_RANGE: ValidRange = ValidRange {
    quantity: "year",
    min: 1900.0,
    max: 2100.0,
    unit: "",
};

/// A place on the Earth.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct Site {
    /// Latitude \[°\], north positive.
    pub latitude_deg: f64,
    /// Longitude \[°\], east positive.
    pub longitude_deg: f64,
    /// Offset of the local clock time from UTC \[h\] (e.g. +1 for Central European Time).
    pub utc_offset_h: f64,
    /// Altitude above sea level \[m\].
    pub altitude_m: f64,
}

impl Default for Site {
    /// An invented mid-latitude site (45° N, 10° E, UTC+1, 100 m).
    fn default() -> Self {
        Self {
            latitude_deg: 45.0,
            longitude_deg: 10.0,
            utc_offset_h: 1.0,
            altitude_m: 100.0,
        }
    }
}

impl Site {
    /// Checks latitude, longitude, offset and altitude.
    ///
    /// # Errors
    /// The first value out of range.
    pub fn validate(&self) -> Result<()> {
        LATITUDE_RANGE_DEG.check(self.latitude_deg)?;
        LONGITUDE_RANGE_DEG.check(self.longitude_deg)?;
        UTC_OFFSET_RANGE_H.check(self.utc_offset_h)?;
        crate::air::ALTITUDE_RANGE_M.check(self.altitude_m)?;
        Ok(())
    }

    /// Latitude \[rad\].
    #[must_use]
    pub fn latitude_rad(&self) -> f64 {
        self.latitude_deg.to_radians()
    }
}

/// A civil date and clock time (Gregorian calendar), in the site's local time.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct DateTime {
    /// Year, e.g. 2026.
    pub year: i32,
    /// Month, 1–12.
    pub month: u32,
    /// Day of the month, 1–31.
    pub day: u32,
    /// Hour, 0–23.
    pub hour: u32,
    /// Minute, 0–59.
    pub minute: u32,
}

/// Whether `year` is a Gregorian leap year.
#[must_use]
pub fn is_leap_year(year: i32) -> bool {
    (year % 4 == 0 && year % 100 != 0) || year % 400 == 0
}

/// Days in `month` (1–12) of `year`; 0 for an invalid month.
#[must_use]
pub fn days_in_month(year: i32, month: u32) -> u32 {
    match month {
        1 | 3 | 5 | 7 | 8 | 10 | 12 => 31,
        4 | 6 | 9 | 11 => 30,
        2 if is_leap_year(year) => 29,
        2 => 28,
        _ => 0,
    }
}

impl DateTime {
    /// A date at midnight.
    #[must_use]
    pub fn date(year: i32, month: u32, day: u32) -> Self {
        Self {
            year,
            month,
            day,
            hour: 0,
            minute: 0,
        }
    }

    /// The same date at `hour`:`minute`.
    #[must_use]
    pub fn at(mut self, hour: u32, minute: u32) -> Self {
        self.hour = hour;
        self.minute = minute;
        self
    }

    /// Checks that the date exists and the clock time is 00:00–23:59.
    ///
    /// # Errors
    /// [`crate::PhysicsError::OutOfRange`] naming the offending field.
    pub fn validate(&self) -> Result<()> {
        YEAR_RANGE.check(f64::from(self.year))?;
        let field = |quantity, value: u32, min: u32, max: u32| {
            ValidRange {
                quantity,
                min: f64::from(min),
                max: f64::from(max),
                unit: "",
            }
            .check(f64::from(value))
            .map(|_| ())
        };
        field("month", self.month, 1, 12)?;
        field("day", self.day, 1, days_in_month(self.year, self.month))?;
        field("hour", self.hour, 0, 23)?;
        field("minute", self.minute, 0, 59)?;
        Ok(())
    }

    /// Day of the year J, 1 on 1 January (\[FAO56\] eq. 21 uses J; Annex 2, Table 2.5).
    #[must_use]
    pub fn day_of_year(&self) -> u32 {
        const CUMULATIVE: [u32; 12] = [0, 31, 59, 90, 120, 151, 181, 212, 243, 273, 304, 334];
        let m = self.month.clamp(1, 12) as usize;
        let leap = u32::from(self.month > 2 && is_leap_year(self.year));
        CUMULATIVE[m - 1] + self.day + leap
    }

    /// Clock time as a decimal hour \[h\].
    #[must_use]
    pub fn decimal_hour(&self) -> f64 {
        f64::from(self.hour) + f64::from(self.minute) / 60.0
    }

    /// Minutes since 1970-01-01 00:00 of the same clock (no time zone applied) \[min\]: for
    /// ordering rows and measuring the time between them.
    #[must_use]
    pub fn minutes_since_epoch(&self) -> i64 {
        days_from_civil(self.year, self.month, self.day) * 1440
            + i64::from(self.hour) * 60
            + i64::from(self.minute)
    }

    /// Parses `YYYY-MM-DD HH:MM` (a `T` may stand for the space; seconds `:SS` are accepted and
    /// ignored). Returns `None` for anything else or a date that does not exist.
    #[must_use]
    pub fn parse(text: &str) -> Option<Self> {
        let text = text.trim();
        let (date, time) = text.split_once([' ', 'T'])?;
        let mut d = date.split('-');
        let year = d.next()?.parse().ok()?;
        let month = d.next()?.parse().ok()?;
        let day = d.next()?.parse().ok()?;
        if d.next().is_some() {
            return None;
        }
        let mut t = time.trim().split(':');
        let hour = t.next()?.parse().ok()?;
        let minute = t.next()?.parse().ok()?;
        if let Some(sec) = t.next() {
            sec.parse::<u32>().ok().filter(|s| *s < 60)?;
        }
        let dt = Self {
            year,
            month,
            day,
            hour,
            minute,
        };
        dt.validate().ok().map(|()| dt)
    }
}

impl std::fmt::Display for DateTime {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "{:04}-{:02}-{:02} {:02}:{:02}",
            self.year, self.month, self.day, self.hour, self.minute
        )
    }
}

/// Where the sun stands.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct SunPosition {
    /// Elevation above the horizon β \[rad\], refraction included (negative at night).
    pub elevation_rad: f64,
    /// Azimuth \[rad\], clockwise from north (π/2 east, π south).
    pub azimuth_rad: f64,
    /// Declination δ \[rad\].
    pub declination_rad: f64,
    /// Hour angle \[rad\], negative before solar noon.
    pub hour_angle_rad: f64,
}

impl SunPosition {
    /// Zenith angle ψ = π/2 − β \[rad\].
    #[must_use]
    pub fn zenith_rad(&self) -> f64 {
        PI / 2.0 - self.elevation_rad
    }

    /// Whether the sun's centre is above the horizon.
    #[must_use]
    pub fn is_up(&self) -> bool {
        self.elevation_rad > 0.0
    }
}

/// Sun position at a site and local clock time by \[Michalsky\].
///
/// - `site`: latitude and longitude \[°\], time-zone offset \[h\]; `time`: local clock time.
/// - Returns elevation and azimuth \[rad\] (and declination and hour angle).
///
/// Steps of \[Michalsky\] (pp. 228–229, page numbers from memory): Julian date JD = 2 432 916.5 + 365 Δy + ⌊Δy/4⌋ + J + UT/24
/// with Δy = year − 1949; n = JD − 2 451 545; mean longitude L = 280.460° + 0.985 647 4° n; mean
/// anomaly g = 357.528° + 0.985 600 3° n; ecliptic longitude l = L + 1.915° sin g + 0.020° sin 2g;
/// obliquity ε = 23.439° − 4 × 10⁻⁷° n; right ascension α = atan2(cos ε sin l, cos l);
/// δ = asin(sin ε sin l); GMST = 6.697 375 + 0.065 709 824 2 n + UT \[h\]; hour angle
/// h = 15° (GMST + λ/15 − α/15); sin β = sin δ sin φ + cos δ cos φ cos h; and the refraction
/// correction R = 3.515 61 (0.1594 + 0.0196 β + 0.000 02 β²)/(1 + 0.505 β + 0.0845 β²) \[°, β in °\]
/// for β > −0.56°. Valid 1950–2050 to about 0.01°; the refraction is for a standard atmosphere.
///
/// # Errors
/// An invalid site or date.
///
/// ```
/// use leafwind_physics::sun::{DateTime, Site, sun_position};
/// // Solar noon near an equinox on the equator at Greenwich: the sun is close to the zenith.
/// let site = Site { latitude_deg: 0.0, longitude_deg: 0.0, utc_offset_h: 0.0, altitude_m: 0.0 };
/// let p = sun_position(&site, &DateTime::date(2026, 3, 20).at(12, 7)).unwrap();
/// assert!(p.elevation_rad.to_degrees() > 89.0);
/// ```
pub fn sun_position(site: &Site, time: &DateTime) -> Result<SunPosition> {
    sun_position_at(site, time, time.decimal_hour())
}

/// As [`sun_position`] with the local clock time given as a decimal hour `local_hour` \[h\], 0–24
/// (for times with seconds); the clock time of `date` is ignored.
///
/// # Errors
/// An invalid site, date or hour.
pub fn sun_position_at(site: &Site, date: &DateTime, local_hour: f64) -> Result<SunPosition> {
    site.validate()?;
    date.validate()?;
    let local_hour = ValidRange {
        quantity: "local clock time",
        min: 0.0,
        max: 24.0,
        unit: "h",
    }
    .check(local_hour)?;
    let time = date;
    let ut_h = local_hour - site.utc_offset_h;
    let delta = f64::from(time.year - 1949);
    let leap = (delta / 4.0).floor();
    // Julian date, [Michalsky] p. 228 (day of year carries the leap day of the current year).
    let jd = 2_432_916.5 + delta * 365.0 + leap + f64::from(time.day_of_year()) + ut_h / 24.0;
    let n = jd - 2_451_545.0;
    let mean_long_deg = (280.460 + 0.985_647_4 * n).rem_euclid(360.0);
    let mean_anom = (357.528 + 0.985_600_3 * n).rem_euclid(360.0).to_radians();
    let ecl_long = (mean_long_deg + 1.915 * mean_anom.sin() + 0.020 * (2.0 * mean_anom).sin())
        .rem_euclid(360.0)
        .to_radians();
    let obliquity = (23.439 - 4.0e-7 * n).to_radians();
    let ra = (obliquity.cos() * ecl_long.sin()).atan2(ecl_long.cos());
    let dec = (obliquity.sin() * ecl_long.sin()).asin();
    let gmst_h = (6.697_375 + 0.065_709_824_2 * n + ut_h).rem_euclid(24.0);
    let lmst_h = (gmst_h + site.longitude_deg / 15.0).rem_euclid(24.0);
    let mut ha = (lmst_h * 15.0).to_radians() - ra;
    ha = (ha + PI).rem_euclid(2.0 * PI) - PI;
    let lat = site.latitude_rad();
    let sin_el = (dec.sin() * lat.sin() + dec.cos() * lat.cos() * ha.cos()).clamp(-1.0, 1.0);
    let el = sin_el.asin();
    // Azimuth from north, clockwise; atan2 form of [Michalsky]'s arcsine expression.
    let az = (-dec.cos() * ha.sin())
        .atan2(dec.sin() * lat.cos() - dec.cos() * lat.sin() * ha.cos())
        .rem_euclid(2.0 * PI);
    let el_deg = el.to_degrees();
    let refraction_deg = if el_deg > -0.56 {
        3.515_61 * (0.1594 + 0.0196 * el_deg + 0.000_02 * el_deg * el_deg)
            / (1.0 + 0.505 * el_deg + 0.0845 * el_deg * el_deg)
    } else {
        0.56
    };
    Ok(SunPosition {
        elevation_rad: (el_deg + refraction_deg).min(90.0).to_radians(),
        azimuth_rad: az,
        declination_rad: dec,
        hour_angle_rad: ha,
    })
}

/// Inverse relative distance Earth–Sun d_r \[–\] (\[FAO56\] eq. 23): d_r = 1 + 0.033 cos(2π J / 365).
///
/// ```
/// // [FAO56] Example 8: 3 September, J = 246 → d_r = 0.985.
/// let dr = leafwind_physics::sun::inverse_relative_distance(246);
/// assert!((dr - 0.985).abs() < 0.0005);
/// ```
#[must_use]
pub fn inverse_relative_distance(day_of_year: u32) -> f64 {
    1.0 + 0.033 * (2.0 * PI * f64::from(day_of_year) / 365.0).cos() // eq. 23 of [FAO56]
}

/// Solar declination δ \[rad\] (\[FAO56\] eq. 24): δ = 0.409 sin(2π J / 365 − 1.39).
///
/// ```
/// // [FAO56] Example 8: J = 246 → δ = 0.120 rad.
/// let d = leafwind_physics::sun::declination_fao56_rad(246);
/// assert!((d - 0.120).abs() < 0.0005);
/// ```
#[must_use]
pub fn declination_fao56_rad(day_of_year: u32) -> f64 {
    0.409 * (2.0 * PI * f64::from(day_of_year) / 365.0 - 1.39).sin() // eq. 24 of [FAO56]
}

/// Sunset hour angle ω_s \[rad\] (\[FAO56\] eq. 25): ω_s = arccos(−tan φ tan δ).
///
/// - `latitude_rad` φ, `declination_rad` δ \[rad\].
///
/// Valid where the sun rises and sets; in polar day (argument < −1) it returns π, in polar night
/// (argument > 1) 0 — FAO-56 does not cover those latitudes, the clamp is this engine's.
#[must_use]
pub fn sunset_hour_angle_rad(latitude_rad: f64, declination_rad: f64) -> f64 {
    (-latitude_rad.tan() * declination_rad.tan())
        .clamp(-1.0, 1.0)
        .acos() // eq. 25 of [FAO56]
}

/// Daily extraterrestrial radiation on a horizontal surface R_a \[MJ m⁻² d⁻¹\] (\[FAO56\] eq. 21).
///
/// R_a = (24 · 60 / π) G_sc d_r \[ω_s sin φ sin δ + cos φ cos δ sin ω_s\], with d_r, δ and ω_s from
/// eqs. 23–25 and φ in radians (eq. 22).
///
/// - `latitude_rad` φ \[rad\]; `day_of_year` J.
///
/// ```
/// // [FAO56] Example 8: 20° S on 3 September → Ra = 32.2 MJ m⁻² d⁻¹.
/// let ra = leafwind_physics::sun::extraterrestrial_daily_mj_m2((-20.0f64).to_radians(), 246);
/// assert!((ra - 32.2).abs() < 0.05);
/// ```
#[must_use]
pub fn extraterrestrial_daily_mj_m2(latitude_rad: f64, day_of_year: u32) -> f64 {
    let dr = inverse_relative_distance(day_of_year);
    let dec = declination_fao56_rad(day_of_year);
    let ws = sunset_hour_angle_rad(latitude_rad, dec);
    24.0 * 60.0 / PI
        * SOLAR_CONSTANT_FAO56_MJ_M2_MIN
        * dr
        * (ws * latitude_rad.sin() * dec.sin() + latitude_rad.cos() * dec.cos() * ws.sin()) // eq. 21 of [FAO56]
}

/// Daily clear-sky solar radiation R_so \[MJ m⁻² d⁻¹\] (\[FAO56\] eq. 37):
/// R_so = (0.75 + 2 × 10⁻⁵ z) R_a, z the altitude \[m\].
///
/// ```
/// // Arithmetic of eq. 37: Ra = 32.2 MJ m⁻² d⁻¹ at z = 2 m → (0.75 + 0.00004) · 32.2 = 24.15.
/// let rso = leafwind_physics::sun::clear_sky_daily_mj_m2(32.2, 2.0);
/// assert!((rso - 24.2).abs() < 0.05);
/// ```
#[must_use]
pub fn clear_sky_daily_mj_m2(extraterrestrial_mj_m2: f64, altitude_m: f64) -> f64 {
    (0.75 + 2.0e-5 * altitude_m) * extraterrestrial_mj_m2 // eq. 37 of [FAO56]
}

/// Instantaneous extraterrestrial irradiance on a horizontal surface \[W m⁻²\]:
/// G_sc d_r sin β (the integrand of \[FAO56\] eq. 21), 0 with the sun down.
#[must_use]
pub fn extraterrestrial_horizontal_w_m2(day_of_year: u32, elevation_rad: f64) -> f64 {
    SOLAR_CONSTANT_FAO56_W_M2
        * inverse_relative_distance(day_of_year)
        * elevation_rad.sin().max(0.0)
}

/// Shortwave on a horizontal surface split into its beam and diffuse parts.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct HorizontalShortwave {
    /// Beam (direct) irradiance on the horizontal surface, E_DN sin β \[W m⁻²\].
    pub beam_w_m2: f64,
    /// Diffuse irradiance on the horizontal surface \[W m⁻²\].
    pub diffuse_w_m2: f64,
}

impl HorizontalShortwave {
    /// No light (night).
    pub const DARK: Self = Self {
        beam_w_m2: 0.0,
        diffuse_w_m2: 0.0,
    };

    /// Global (beam + diffuse) irradiance on the horizontal \[W m⁻²\].
    #[must_use]
    pub fn global_w_m2(&self) -> f64 {
        self.beam_w_m2 + self.diffuse_w_m2
    }

    /// Diffuse fraction \[–\] (1 in the dark by convention).
    #[must_use]
    pub fn diffuse_fraction(&self) -> f64 {
        let g = self.global_w_m2();
        if g > 0.0 { self.diffuse_w_m2 / g } else { 1.0 }
    }
}

/// \[ASHRAE1985\] Table 1 for the 21st of each month: apparent solar irradiation at air mass zero A
/// \[W m⁻²\], atmospheric extinction coefficient B \[–\] and diffuse factor C \[–\] (values from memory).
pub const ASHRAE1985_CLEAR_SKY_ABC: [(f64, f64, f64); 12] = [
    (1230.0, 0.142, 0.058),
    (1215.0, 0.144, 0.060),
    (1186.0, 0.156, 0.071),
    (1136.0, 0.180, 0.097),
    (1104.0, 0.196, 0.121),
    (1088.0, 0.205, 0.134),
    (1085.0, 0.207, 0.136),
    (1107.0, 0.201, 0.122),
    (1151.0, 0.177, 0.092),
    (1192.0, 0.160, 0.073),
    (1221.0, 0.149, 0.063),
    (1233.0, 0.142, 0.057),
];

/// Clear-sky beam and diffuse irradiance on a horizontal surface \[W m⁻²\] by the \[ASHRAE1985\]
/// model: E_DN = A exp(−B / sin β), beam = E_DN sin β, diffuse = C E_DN (a horizontal surface sees the
/// whole sky).
///
/// - `month` 1–12 (the table's row; values are for the 21st); `elevation_rad` β \[rad\].
/// - Returns [`HorizontalShortwave::DARK`] with the sun at or below the horizon.
///
/// A US-climate model of moderately clear skies at sea level; hazier or humid skies give less beam,
/// high sites more (common practice, no source). Months outside 1–12 are clamped.
///
/// ```
/// use leafwind_physics::sun::ashrae_clear_sky;
/// // 21 June, sun at the zenith: E_DN = 1088 exp(−0.205) = 886.3 W/m².
/// let s = ashrae_clear_sky(6, std::f64::consts::FRAC_PI_2);
/// assert!((s.beam_w_m2 - 886.3).abs() < 0.05);
/// ```
#[must_use]
pub fn ashrae_clear_sky(month: u32, elevation_rad: f64) -> HorizontalShortwave {
    let sin_b = elevation_rad.sin();
    if sin_b.is_nan() || sin_b <= 1e-6 {
        return HorizontalShortwave::DARK;
    }
    let (a, b, c) = ASHRAE1985_CLEAR_SKY_ABC[month.clamp(1, 12) as usize - 1];
    let normal = a * (-b / sin_b).exp(); // [ASHRAE1985] ch. 27, eq. for E_DN
    HorizontalShortwave {
        beam_w_m2: normal * sin_b,
        diffuse_w_m2: c * normal, // [ASHRAE1985] ch. 27, E_d = C E_DN F_ss with F_ss = 1
    }
}

/// Diffuse fraction of hourly global irradiance from the clearness index k_t \[–\] (\[Erbs\]):
///
/// - k_t ≤ 0.22: 1 − 0.09 k_t;
/// - 0.22 < k_t ≤ 0.80: 0.9511 − 0.1604 k_t + 4.388 k_t² − 16.638 k_t³ + 12.336 k_t⁴;
/// - k_t > 0.80: 0.165.
///
/// Fitted to hourly data of US stations; the scatter about it is large for single hours.
#[must_use]
pub fn erbs_diffuse_fraction(clearness_index: f64) -> f64 {
    let k = clearness_index.max(0.0);
    if k <= 0.22 {
        1.0 - 0.09 * k
    } else if k <= 0.80 {
        0.9511 - 0.1604 * k + 4.388 * k * k - 16.638 * k.powi(3) + 12.336 * k.powi(4)
    } else {
        0.165
    }
}

/// Splits a measured global horizontal irradiance \[W m⁻²\] into beam and diffuse by \[Erbs\], with
/// k_t = global / extraterrestrial horizontal. With the sun within 2° of the horizon (where k_t is
/// meaningless) all of it is taken as diffuse.
///
/// # Errors
/// A negative or non-finite global irradiance.
pub fn split_global(
    global_w_m2: f64,
    day_of_year: u32,
    elevation_rad: f64,
) -> Result<HorizontalShortwave> {
    let g = crate::radiation::SHORTWAVE_RANGE_W_M2.check(global_w_m2)?;
    if elevation_rad < 2.0f64.to_radians() {
        return Ok(HorizontalShortwave {
            beam_w_m2: 0.0,
            diffuse_w_m2: g,
        });
    }
    let g0 = extraterrestrial_horizontal_w_m2(day_of_year, elevation_rad);
    let kd = erbs_diffuse_fraction(g / g0);
    Ok(HorizontalShortwave {
        beam_w_m2: g * (1.0 - kd),
        diffuse_w_m2: g * kd,
    })
}

/// Days since 1970-01-01 of a proleptic Gregorian date (Hinnant, H., "chrono-compatible low-level
/// date algorithms", `days_from_civil`; public-domain algorithm).
#[must_use]
pub fn days_from_civil(y: i32, m: u32, d: u32) -> i64 {
    let y = i64::from(y) - i64::from(m <= 2);
    let era = y.div_euclid(400);
    let yoe = y - era * 400;
    let m = i64::from(m);
    let doy = (153 * (if m > 2 { m - 3 } else { m + 9 }) + 2) / 5 + i64::from(d) - 1;
    let doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    era * 146_097 + doe - 719_468
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn day_of_year_counts_leap_days() {
        assert_eq!(DateTime::date(2023, 3, 1).day_of_year(), 60);
        assert_eq!(DateTime::date(2024, 3, 1).day_of_year(), 61);
        assert_eq!(DateTime::date(2024, 12, 31).day_of_year(), 366);
    }

    #[test]
    fn parse_accepts_the_documented_forms_only() {
        let d = DateTime::parse("2026-07-14 13:05").unwrap();
        assert_eq!(d, DateTime::date(2026, 7, 14).at(13, 5));
        assert_eq!(DateTime::parse("2026-07-14T13:05:30"), Some(d));
        assert_eq!(DateTime::parse("2026-02-30 10:00"), None);
        assert_eq!(DateTime::parse("2026-07-14 24:00"), None);
        assert_eq!(DateTime::parse("14/07/2026 13:05"), None);
        assert_eq!(d.to_string(), "2026-07-14 13:05");
    }

    #[test]
    fn erbs_is_continuous_enough_at_its_joins() {
        // The published fit joins within about 0.01 at k_t = 0.22 and 0.80.
        let a = erbs_diffuse_fraction(0.22);
        let b = erbs_diffuse_fraction(0.220_001);
        assert!((a - b).abs() < 0.01);
        let c = erbs_diffuse_fraction(0.80);
        let d = erbs_diffuse_fraction(0.800_001);
        assert!((c - d).abs() < 0.01);
    }

    #[test]
    fn clear_sky_is_dark_at_night() {
        assert_eq!(ashrae_clear_sky(6, -0.1), HorizontalShortwave::DARK);
    }
}

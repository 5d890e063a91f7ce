//! Checks of the sun module against published values.

use leafwind_physics::sun::{
    ASHRAE1985_CLEAR_SKY_ABC, DateTime, Site, ashrae_clear_sky, clear_sky_daily_mj_m2,
    declination_fao56_rad, erbs_diffuse_fraction, extraterrestrial_daily_mj_m2,
    inverse_relative_distance, split_global, sun_position, sun_position_at, sunset_hour_angle_rad,
};

/// Reda, I., Andreas, A. (2004). Solar position algorithm for solar radiation applications.
/// Solar Energy 76, 577–589; NREL/TP-560-34302 (rev. 2008), Table A4.1 example: Golden, Colorado,
/// 39.742476° N, 105.1786° W, UTC−7, 17 October 2003 12:30:30 local → topocentric zenith
/// 50.11162°, azimuth 194.34024° (eastward from north). Michalsky (1988) states 0.01°; the
/// example's refraction is for 820 mbar and 11 °C, ours for a standard atmosphere (≈ 0.004° apart
/// at this elevation); Michalsky's 0.01° is the tolerance (measured: 0.0065° and 0.0033°).
#[test]
fn reda_andreas_worked_example() {
    let site = Site {
        latitude_deg: 39.742_476,
        longitude_deg: -105.1786,
        utc_offset_h: -7.0,
        altitude_m: 1830.14,
    };
    let hour = 12.0 + 30.0 / 60.0 + 30.0 / 3600.0;
    let p = sun_position_at(&site, &DateTime::date(2003, 10, 17), hour).unwrap();
    let zenith = p.zenith_rad().to_degrees();
    let azimuth = p.azimuth_rad.to_degrees();
    assert!((zenith - 50.111_62).abs() < 0.01, "zenith {zenith}");
    assert!((azimuth - 194.340_24).abs() < 0.01, "azimuth {azimuth}");
}

/// The declination at the June solstice equals the obliquity of the ecliptic, 23.44° (The
/// Astronomical Almanac; obliquity 23.439° − 4 × 10⁻⁷° per day from J2000, Michalsky 1988). The
/// largest declination over 19–23 June 2026 at noon UTC must lie within 0.01° of it.
#[test]
fn june_solstice_declination_is_the_obliquity() {
    let site = Site {
        latitude_deg: 0.0,
        longitude_deg: 0.0,
        utc_offset_h: 0.0,
        altitude_m: 0.0,
    };
    let max = (19..=23)
        .map(|d| {
            sun_position(&site, &DateTime::date(2026, 6, d).at(12, 0))
                .unwrap()
                .declination_rad
                .to_degrees()
        })
        .fold(f64::MIN, f64::max);
    let obliquity = 23.439 - 4e-7 * (2026.47 - 2000.0) * 365.25;
    assert!((max - obliquity).abs() < 0.01, "{max} vs {obliquity}");
}

/// Azimuth convention: in the morning the sun is in the east, at local solar noon south (northern
/// mid-latitudes) or north (southern), in the afternoon west (common practice, no source).
#[test]
fn azimuth_quadrants_both_hemispheres() {
    for (lat, noon_az) in [(45.0, 180.0), (-35.0, 0.0)] {
        let site = Site {
            latitude_deg: lat,
            longitude_deg: 0.0,
            utc_offset_h: 0.0,
            altitude_m: 0.0,
        };
        let d = DateTime::date(2026, 4, 15);
        let am = sun_position(&site, &d.at(9, 0))
            .unwrap()
            .azimuth_rad
            .to_degrees();
        let pm = sun_position(&site, &d.at(15, 0))
            .unwrap()
            .azimuth_rad
            .to_degrees();
        // Solar noon near 12:00 UTC at Greenwich in mid-April (equation of time ≈ 0).
        let noon = sun_position(&site, &d.at(12, 0))
            .unwrap()
            .azimuth_rad
            .to_degrees();
        assert!(am > 0.0 && am < 180.0, "am {am}");
        assert!(pm > 180.0 && pm < 360.0, "pm {pm}");
        let diff = ((noon - noon_az + 540.0) % 360.0 - 180.0).abs();
        assert!(diff < 3.0, "noon {noon} at lat {lat}");
    }
}

/// FAO-56 (Allen et al. 1998), ch. 3, Example 8: 3 September (J = 246) at 20° S:
/// d_r = 0.985, δ = 0.120 rad, ω_s = 1.527 rad, Ra = 32.2 MJ m⁻² d⁻¹. Tolerance half the last
/// printed digit.
#[test]
fn fao56_example_8() {
    let j = DateTime::date(2026, 9, 3).day_of_year();
    assert_eq!(j, 246);
    let lat = -20f64.to_radians();
    assert!((lat - (-0.35)).abs() < 0.005); // the example prints φ = −0.35 rad
    assert!((inverse_relative_distance(j) - 0.985).abs() < 0.0005);
    let dec = declination_fao56_rad(j);
    assert!((dec - 0.120).abs() < 0.0005);
    assert!((sunset_hour_angle_rad(lat, dec) - 1.527).abs() < 0.0005);
    assert!((extraterrestrial_daily_mj_m2(lat, j) - 32.2).abs() < 0.05);
}

/// FAO-56 eq. 37 arithmetic: Rso = (0.75 + 2·10⁻⁵ z) Ra.
#[test]
fn fao56_eq37() {
    assert!((clear_sky_daily_mj_m2(32.2, 0.0) - 24.15).abs() < 1e-9);
    assert!((clear_sky_daily_mj_m2(32.2, 1000.0) - 0.77 * 32.2).abs() < 1e-9);
}

/// ASHRAE Handbook—Fundamentals (1985), ch. 27: E_DN = A exp(−B / sin β) and horizontal diffuse
/// C·E_DN (table values from memory); beam on the horizontal E_DN sin β.
#[test]
fn ashrae_clear_sky_model_arithmetic() {
    let beta = 40f64.to_radians();
    let (a, b, c) = ASHRAE1985_CLEAR_SKY_ABC[6]; // July
    let s = ashrae_clear_sky(7, beta);
    let edn = a * (-b / beta.sin()).exp();
    assert!((s.beam_w_m2 - edn * beta.sin()).abs() < 1e-9);
    assert!((s.diffuse_w_m2 - c * edn).abs() < 1e-9);
    // A clear July noon at 60° elevation gives 800–950 W/m² global (common practice, no source).
    let g = ashrae_clear_sky(7, 60f64.to_radians()).global_w_m2();
    assert!(g > 800.0 && g < 950.0, "{g}");
}

/// Erbs et al. (1982): the diffuse fraction lies between about 0.16 and 1 (the quartic dips to
/// 0.1646 just below k_t = 0.8 before the constant 0.165 takes over) and falls with k_t.
#[test]
fn erbs_bounds_and_trend() {
    let mut prev = 1.0;
    for i in 0..=100 {
        let k = f64::from(i) / 100.0;
        let d = erbs_diffuse_fraction(k);
        assert!((0.16..=1.0).contains(&d), "{k} → {d}");
        assert!(d <= prev + 0.02, "roughly non-increasing at {k}");
        prev = d;
    }
    // A split conserves the global irradiance.
    let s = split_global(700.0, 180, 55f64.to_radians()).unwrap();
    assert!((s.global_w_m2() - 700.0).abs() < 1e-9);
    assert!(split_global(-1.0, 180, 0.5).is_err());
}

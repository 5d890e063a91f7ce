//! Radiation: shortwave absorbed by both faces, longwave exchange with the sky (or a greenhouse
//! cover) above and the ground below, emission, and the radiative conductance.
//!
//! All fluxes are per unit one-sided leaf area, both faces summed, for a horizontal leaf.
//!
//! # References
//! - \[Brutsaert\] Brutsaert, W. (1975). On a derivable formula for long-wave radiation from clear
//!   skies. *Water Resources Research* 11(5), 742–744 (ε = 1.24 (e_a/T_a)^{1/7}, e_a in hPa).
//! - \[CN98\] Campbell, G. S., Norman, J. M. (1998). *An Introduction to Environmental Biophysics*,
//!   2nd ed. Springer. Ch. 10–12 (radiation balance of a leaf, radiative conductance 4εσT³).
//! - \[FAO56\] Allen, R. G., et al. (1998). FAO Irrigation and Drainage Paper 56, eq. 38 (albedo 0.23
//!   of the green grass reference surface).

use crate::constants::STEFAN_BOLTZMANN_W_M2_K4;
use crate::error::ValidRange;

/// Default albedo of the ground seen by the lower face \[–\]: 0.23, the green grass reference
/// surface of \[FAO56\] eq. 38.
pub const GROUND_ALBEDO_DEFAULT: f64 = 0.23;

/// Valid shortwave irradiance on the upper face \[W m⁻²\] (the solar constant is 1361 W m⁻²).
pub const SHORTWAVE_RANGE_W_M2: ValidRange = ValidRange {
    quantity: "sunlight on the leaf",
    min: 0.0,
    max: 1400.0,
    unit: "W/m²",
};

/// Valid shortwave absorptivities \[–\].
pub const ABSORPTIVITY_RANGE: ValidRange = ValidRange {
    quantity: "shortwave absorptivity",
    min: 0.0,
    max: 1.0,
    unit: "",
};

/// Valid longwave emissivities of a leaf \[–\] (leaves are 0.94–0.99, \[CN98\] Table 11.3; the
/// range is kept wide for tests and unusual surfaces).
pub const EMISSIVITY_RANGE: ValidRange = ValidRange {
    quantity: "longwave emissivity",
    min: 0.5,
    max: 1.0,
    unit: "",
};

/// Valid ground albedos \[–\].
pub const ALBEDO_RANGE: ValidRange = ValidRange {
    quantity: "ground albedo",
    min: 0.0,
    max: 1.0,
    unit: "",
};

/// Valid temperatures of the sky, a cover, or the ground \[°C\].
pub const SURFACE_TEMP_RANGE_C: ValidRange = ValidRange {
    quantity: "surroundings temperature",
    min: -80.0,
    max: 80.0,
    unit: "°C",
};

/// Longwave emission of a grey surface, ε σ T⁴ \[W m⁻²\] (Stefan–Boltzmann law).
///
/// ```
/// // σ · 300⁴ = 459.3 W/m² (CODATA σ).
/// let m = leafwind_physics::radiation::emitted_longwave_w_m2(1.0, 300.0);
/// assert!((m - 459.3).abs() < 0.05);
/// ```
#[must_use]
pub fn emitted_longwave_w_m2(emissivity: f64, temp_k: f64) -> f64 {
    let t2 = temp_k * temp_k;
    emissivity * STEFAN_BOLTZMANN_W_M2_K4 * t2 * t2
}

/// Radiative conductance of one face, h_r = 4 ε σ T³ \[W m⁻² K⁻¹\]: the linearised change of emission
/// per kelvin (\[CN98\] ch. 12, there divided by c_p to give mol m⁻² s⁻¹).
#[must_use]
pub fn radiative_conductance_w_m2_k(emissivity: f64, temp_k: f64) -> f64 {
    4.0 * emissivity * STEFAN_BOLTZMANN_W_M2_K4 * temp_k.powi(3)
}

/// Clear-sky emissivity of the atmosphere \[–\] (\[Brutsaert\]): ε_a = 1.24 (e_a / T_a)^{1/7}, with
/// e_a in hPa and T_a in K. Capped at 1; below 1 hPa (drier than the data behind the formula) it
/// is held at its 1 hPa value — a deliberate deviation, so that perfectly dry air does not give a
/// sky at absolute zero.
///
/// - `vapour_pressure_kpa`: screen-height vapour pressure \[kPa\]; `air_temp_k` \[K\].
///
/// ```
/// // e_a = 1.0 kPa (10 hPa), T_a = 283.15 K: 1.24 · (10/283.15)^(1/7) = 0.769.
/// let e = leafwind_physics::radiation::clear_sky_emissivity(1.0, 283.15);
/// assert!((e - 0.769).abs() < 0.001);
/// ```
#[must_use]
pub fn clear_sky_emissivity(vapour_pressure_kpa: f64, air_temp_k: f64) -> f64 {
    let e_hpa = (vapour_pressure_kpa * 10.0).max(1.0);
    (1.24 * (e_hpa / air_temp_k).powf(1.0 / 7.0)).min(1.0)
}

/// Effective radiant temperature of a clear sky \[K\]: T_sky = ε_a^{1/4} T_a.
#[must_use]
pub fn clear_sky_temperature_k(vapour_pressure_kpa: f64, air_temp_k: f64) -> f64 {
    clear_sky_emissivity(vapour_pressure_kpa, air_temp_k)
        .sqrt()
        .sqrt()
        * air_temp_k
}

/// Shortwave absorbed by a horizontal leaf \[W m⁻²\], both faces:
/// a (S + ρ_g S) — the upper face receives S, the lower face the light the ground reflects
/// (\[CN98\] ch. 11).
///
/// - `absorptivity` \[–\]; `shortwave_w_m2`: irradiance on the upper face \[W m⁻²\]; `ground_albedo` \[–\].
#[must_use]
pub fn absorbed_shortwave_w_m2(absorptivity: f64, shortwave_w_m2: f64, ground_albedo: f64) -> f64 {
    absorptivity * shortwave_w_m2 * (1.0 + ground_albedo)
}

/// Longwave absorbed by both faces \[W m⁻²\]: ε σ (T_above⁴ + T_below⁴) — Kirchhoff's law (absorptivity
/// = emissivity), the upper face seeing a hemisphere at `above_k`, the lower face one at `below_k`.
#[must_use]
pub fn absorbed_longwave_w_m2(emissivity: f64, above_k: f64, below_k: f64) -> f64 {
    emitted_longwave_w_m2(emissivity, above_k) + emitted_longwave_w_m2(emissivity, below_k)
}

/// What the upper face sees.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum UpperView {
    /// Open clear sky at the \[Brutsaert\] temperature for the air's temperature and humidity.
    ClearSky,
    /// Sky at a measured or chosen effective temperature \[°C\].
    SkyTempC(f64),
    /// A greenhouse cover (glass or film) at a given temperature \[°C\], treated as black.
    CoverTempC(f64),
}

impl UpperView {
    /// The effective radiant temperature \[K\] of what the upper face sees.
    #[must_use]
    pub fn radiant_temp_k(&self, vapour_pressure_kpa: f64, air_temp_k: f64) -> f64 {
        match *self {
            UpperView::ClearSky => clear_sky_temperature_k(vapour_pressure_kpa, air_temp_k),
            UpperView::SkyTempC(t) | UpperView::CoverTempC(t) => {
                t + crate::constants::ZERO_CELSIUS_K
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn radiative_conductance_is_the_emission_slope() {
        let t = 293.15;
        let h = 1e-3;
        let fd =
            (emitted_longwave_w_m2(0.97, t + h) - emitted_longwave_w_m2(0.97, t - h)) / (2.0 * h);
        assert!((fd / radiative_conductance_w_m2_k(0.97, t) - 1.0).abs() < 1e-8);
    }

    #[test]
    fn clear_sky_is_colder_than_air() {
        for (e, t) in [(0.5, 273.15), (2.0, 298.15), (4.0, 308.15)] {
            assert!(clear_sky_temperature_k(e, t) < t);
        }
        // Perfectly dry air is held at the 1 hPa value.
        assert_eq!(
            clear_sky_emissivity(0.0, 300.0),
            clear_sky_emissivity(0.1, 300.0)
        );
    }
}

//! Moist air: thermophysical properties, humidity conversions and pressure.
//!
//! # References
//! - \[FAO56\] Allen, R. G., Pereira, L. S., Raes, D., Smith, M. (1998). *Crop evapotranspiration —
//!   Guidelines for computing crop water requirements*. FAO Irrigation and Drainage Paper 56. Rome: FAO.
//! - \[White\] White, F. M. (2006). *Viscous Fluid Flow*, 3rd ed. McGraw-Hill. Eq. 1-36 and
//!   Tables 1-2, 1-3 (Sutherland's laws for viscosity and thermal conductivity of air).
//! - \[Massman\] Massman, W. J. (1998). A review of the molecular diffusivities of H₂O, CO₂, CH₄, CO, O₃,
//!   SO₂, NH₃, N₂O, NO, and NO₂ in air, O₂ and N₂ near STP. *Atmospheric Environment* 32(6), 1111–1127.
//! - \[USSA1976\] NOAA, NASA, USAF (1976). *U.S. Standard Atmosphere, 1976*.

use crate::constants::{
    GAS_CONSTANT_J_MOL_K, MOLAR_MASS_DRY_AIR_KG_MOL, MOLAR_MASS_RATIO_WATER_AIR,
    MOLAR_MASS_WATER_KG_MOL, SPECIFIC_HEAT_DRY_AIR_J_KG_K, SPECIFIC_HEAT_WATER_VAPOUR_J_KG_K,
    ZERO_CELSIUS_K,
};
use crate::error::{PhysicsError, Result, ValidRange};

/// Valid range of air and surface temperatures for the property fits \[°C\].
pub const AIR_TEMP_RANGE_C: ValidRange = ValidRange {
    quantity: "air temperature",
    min: -30.0,
    max: 60.0,
    unit: "°C",
};

/// Valid range of relative humidity \[%\].
pub const RELATIVE_HUMIDITY_RANGE_PCT: ValidRange = ValidRange {
    quantity: "relative humidity",
    min: 0.0,
    max: 100.0,
    unit: "%",
};

/// Valid range of atmospheric pressure \[kPa\] (sea level to about 5 500 m, and storms).
pub const PRESSURE_RANGE_KPA: ValidRange = ValidRange {
    quantity: "air pressure",
    min: 50.0,
    max: 110.0,
    unit: "kPa",
};

/// Valid range of site altitude for [`pressure_from_altitude_kpa`] \[m\].
pub const ALTITUDE_RANGE_M: ValidRange = ValidRange {
    quantity: "altitude",
    min: -500.0,
    max: 5500.0,
    unit: "m",
};

/// Saturation vapour pressure over liquid water e°(T) \[kPa\].
///
/// - `temp_c`: temperature \[°C\].
/// - Returns e° \[kPa\].
///
/// Equation: e°(T) = 0.6108 exp(17.27 T / (T + 237.3)), eq. 11 of \[FAO56\] (the Tetens form).
/// Valid −30 to 60 °C (below 0 °C it is the pressure over supercooled water); the engine's
/// inputs are range-checked to that before this is called.
///
/// ```
/// // [FAO56] Annex 2, Table 2.3: e°(20 °C) = 2.338 kPa.
/// let es = leafwind_physics::air::saturation_vapour_pressure_kpa(20.0);
/// assert!((es - 2.338).abs() < 0.0005);
/// ```
#[must_use]
pub fn saturation_vapour_pressure_kpa(temp_c: f64) -> f64 {
    0.6108 * (17.27 * temp_c / (temp_c + 237.3)).exp() // eq. 11 of [FAO56]
}

/// Slope of the saturation vapour pressure curve Δ = de°/dT \[kPa K⁻¹\].
///
/// - `temp_c`: temperature \[°C\].
/// - Returns Δ \[kPa K⁻¹\].
///
/// Equation: Δ = 4098 e°(T) / (T + 237.3)², eq. 13 of \[FAO56\] (the exact derivative of eq. 11).
///
/// ```
/// // [FAO56] Annex 2, Table 2.4: Δ(20 °C) = 0.145 kPa/°C.
/// let s = leafwind_physics::air::saturation_slope_kpa_k(20.0);
/// assert!((s - 0.145).abs() < 0.0005);
/// ```
#[must_use]
pub fn saturation_slope_kpa_k(temp_c: f64) -> f64 {
    saturation_slope_from_es_kpa_k(temp_c, saturation_vapour_pressure_kpa(temp_c))
}

/// Δ \[kPa K⁻¹\] at `temp_c` \[°C\] when e°(T) \[kPa\] is already known (eq. 13 of \[FAO56\]).
#[must_use]
pub fn saturation_slope_from_es_kpa_k(temp_c: f64, saturation_vapour_pressure_kpa: f64) -> f64 {
    let t = temp_c + 237.3;
    4098.0 * saturation_vapour_pressure_kpa / (t * t) // eq. 13 of [FAO56]
}

/// Latent heat of vaporisation of water λ \[J kg⁻¹\].
///
/// - `temp_c`: temperature of the evaporating surface \[°C\].
/// - Returns λ \[J kg⁻¹\].
///
/// Equation: λ = 2.501 − 2.361 × 10⁻³ T \[MJ kg⁻¹\], eq. 3-1 of \[FAO56\] Annex 3.
///
/// ```
/// // [FAO56] ch. 3 uses λ = 2.45 MJ/kg "for an air temperature of about 20 °C".
/// let l = leafwind_physics::air::latent_heat_j_kg(20.0);
/// assert!((l / 1e6 - 2.45).abs() < 0.005);
/// ```
#[must_use]
pub fn latent_heat_j_kg(temp_c: f64) -> f64 {
    (2.501 - 2.361e-3 * temp_c) * 1.0e6 // eq. 3-1 of [FAO56] Annex 3
}

/// Molar latent heat of vaporisation \[J mol⁻¹\]: λ · M_w.
#[must_use]
pub fn molar_latent_heat_j_mol(temp_c: f64) -> f64 {
    latent_heat_j_kg(temp_c) * MOLAR_MASS_WATER_KG_MOL
}

/// Psychrometric constant γ \[kPa K⁻¹\] as FAO-56 computes it.
///
/// - `pressure_kpa`: atmospheric pressure \[kPa\].
/// - Returns γ = c_p P / (ε λ) \[kPa K⁻¹\] with c_p = 1.013 × 10⁻³ MJ kg⁻¹ K⁻¹, ε = 0.622 and
///   λ = 2.45 MJ kg⁻¹, i.e. γ = 0.665 × 10⁻³ P; eq. 8 of \[FAO56\].
///
/// ```
/// // [FAO56] Example 2: at 1800 m, P = 81.8 kPa and γ = 0.054 kPa/°C.
/// let g = leafwind_physics::air::psychrometric_constant_kpa_k(81.8);
/// assert!((g - 0.054).abs() < 0.0005);
/// ```
#[must_use]
pub fn psychrometric_constant_kpa_k(pressure_kpa: f64) -> f64 {
    0.665e-3 * pressure_kpa // eq. 8 of [FAO56]
}

/// Atmospheric pressure from altitude \[kPa\].
///
/// - `altitude_m`: site elevation above sea level \[m\].
/// - Returns P \[kPa\].
///
/// Equation: P = 101.3 ((293 − 0.0065 z)/293)^5.26, eq. 7 of \[FAO56\] (a standard atmosphere at
/// 20 °C).
///
/// # Errors
/// [`PhysicsError::OutOfRange`] outside [`ALTITUDE_RANGE_M`].
///
/// ```
/// // [FAO56] Example 2: z = 1800 m gives P = 81.8 kPa.
/// let p = leafwind_physics::air::pressure_from_altitude_kpa(1800.0).unwrap();
/// assert!((p - 81.8).abs() < 0.05);
/// ```
pub fn pressure_from_altitude_kpa(altitude_m: f64) -> Result<f64> {
    let z = ALTITUDE_RANGE_M.check(altitude_m)?;
    Ok(101.3 * ((293.0 - 0.0065 * z) / 293.0).powf(5.26)) // eq. 7 of [FAO56]
}

/// Actual vapour pressure from relative humidity \[kPa\]: e_a = (RH/100) e°(T_a) (eq. 10 of \[FAO56\]).
///
/// # Errors
/// Out of range temperature or humidity.
pub fn vapour_pressure_from_rh_kpa(air_temp_c: f64, rel_humidity_pct: f64) -> Result<f64> {
    let t = AIR_TEMP_RANGE_C.check(air_temp_c)?;
    let rh = RELATIVE_HUMIDITY_RANGE_PCT.check(rel_humidity_pct)?;
    Ok(rh / 100.0 * saturation_vapour_pressure_kpa(t))
}

/// Relative humidity \[%\] from vapour pressure: RH = 100 e_a / e°(T_a) (eq. 10 of \[FAO56\]).
#[must_use]
pub fn rh_from_vapour_pressure_pct(air_temp_c: f64, vapour_pressure_kpa: f64) -> f64 {
    100.0 * vapour_pressure_kpa / saturation_vapour_pressure_kpa(air_temp_c)
}

/// Dew point \[°C\] of air with vapour pressure `vapour_pressure_kpa` \[kPa\].
///
/// Inverts eq. 11 of \[FAO56\] (e_a = e°(T_dew), eq. 14):
/// T_dew = 237.3 L / (17.27 − L), L = ln(e_a / 0.6108).
///
/// # Errors
/// [`PhysicsError::OutOfRange`] for a vapour pressure that is not positive, or whose dew point lies
/// outside [`AIR_TEMP_RANGE_C`].
pub fn dew_point_c(vapour_pressure_kpa: f64) -> Result<f64> {
    let e = ValidRange {
        quantity: "vapour pressure",
        min: 1e-6,
        max: saturation_vapour_pressure_kpa(AIR_TEMP_RANGE_C.max),
        unit: "kPa",
    }
    .check(vapour_pressure_kpa)?;
    let l = (e / 0.6108).ln();
    let dew = 237.3 * l / (17.27 - l);
    AIR_TEMP_RANGE_C
        .check(dew)
        .map_err(|_| PhysicsError::OutOfRange {
            quantity: "dew point",
            value: dew,
            min: AIR_TEMP_RANGE_C.min,
            max: AIR_TEMP_RANGE_C.max,
            unit: "°C",
        })
}

/// Vapour-pressure deficit of the air \[kPa\]: D = e°(T_a) − e_a.
#[must_use]
pub fn vapour_pressure_deficit_kpa(air_temp_c: f64, vapour_pressure_kpa: f64) -> f64 {
    saturation_vapour_pressure_kpa(air_temp_c) - vapour_pressure_kpa
}

/// How the humidity of the air is given. All forms reduce to a vapour pressure.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum Humidity {
    /// Relative humidity \[%\].
    RelativePct(f64),
    /// Dew-point temperature \[°C\]; must not exceed the air temperature.
    DewPointC(f64),
    /// Vapour-pressure deficit \[kPa\]; must lie between 0 and e°(T_a).
    DeficitKpa(f64),
}

impl Humidity {
    /// The actual vapour pressure e_a \[kPa\] of air at `air_temp_c` with this humidity.
    ///
    /// # Errors
    /// Out-of-range or inconsistent values (a dew point above the air temperature, a deficit larger
    /// than the saturation vapour pressure).
    pub fn vapour_pressure_kpa(&self, air_temp_c: f64) -> Result<f64> {
        let t = AIR_TEMP_RANGE_C.check(air_temp_c)?;
        let es = saturation_vapour_pressure_kpa(t);
        match *self {
            Humidity::RelativePct(rh) => vapour_pressure_from_rh_kpa(t, rh),
            Humidity::DewPointC(dew) => {
                let dew = ValidRange {
                    quantity: "dew point",
                    min: AIR_TEMP_RANGE_C.min,
                    max: t,
                    unit: "°C",
                }
                .check(dew)?;
                Ok(saturation_vapour_pressure_kpa(dew)) // eq. 14 of [FAO56]
            }
            Humidity::DeficitKpa(vpd) => {
                let vpd = ValidRange {
                    quantity: "vapour-pressure deficit",
                    min: 0.0,
                    max: es,
                    unit: "kPa",
                }
                .check(vpd)?;
                Ok(es - vpd)
            }
        }
    }
}

/// Thermophysical properties of moist air at one temperature, pressure and vapour pressure.
///
/// Each field carries its unit in its name. Built by [`AirProperties::at`].
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct AirProperties {
    /// Temperature at which the properties were evaluated \[K\].
    pub temp_k: f64,
    /// Density of moist air ρ \[kg m⁻³\].
    pub density_kg_m3: f64,
    /// Molar density of air (all gases) P/(R T) \[mol m⁻³\].
    pub molar_density_mol_m3: f64,
    /// Specific heat at constant pressure of moist air c_p \[J kg⁻¹ K⁻¹\].
    pub specific_heat_j_kg_k: f64,
    /// Dynamic viscosity μ \[Pa s\].
    pub dynamic_viscosity_pa_s: f64,
    /// Kinematic viscosity ν = μ/ρ \[m² s⁻¹\].
    pub kinematic_viscosity_m2_s: f64,
    /// Thermal conductivity k \[W m⁻¹ K⁻¹\].
    pub thermal_conductivity_w_m_k: f64,
    /// Thermal diffusivity α = k/(ρ c_p) \[m² s⁻¹\].
    pub thermal_diffusivity_m2_s: f64,
    /// Prandtl number Pr = ν/α \[–\].
    pub prandtl: f64,
    /// Molecular diffusivity of water vapour in air D_v \[m² s⁻¹\].
    pub vapour_diffusivity_m2_s: f64,
    /// Schmidt number of water vapour Sc = ν/D_v \[–\].
    pub schmidt: f64,
}

impl AirProperties {
    /// Properties of moist air.
    ///
    /// - `temp_k`: air (or film) temperature \[K\], 243.15–333.15 K (−30 to 60 °C).
    /// - `pressure_kpa`: total pressure \[kPa\].
    /// - `vapour_pressure_kpa`: partial pressure of water vapour \[kPa\] (0 ≤ e < P).
    ///
    /// Fits used:
    /// - density: ideal gas with the virtual temperature, ρ = P M_a / (R T) · (1 − (1 − ε) e/P);
    /// - c_p: mass-weighted dry air and vapour, c_p = (1 − q) c_pd + q c_pv, q = ε e / (P − (1 − ε) e);
    /// - μ: Sutherland's law μ = μ₀ (T/T₀)^{3/2} (T₀ + S)/(T + S), μ₀ = 1.716 × 10⁻⁵ Pa s,
    ///   T₀ = 273 K, S = 111 K (\[White\] eq. 1-36, Table 1-2; ±2 % from 170 to 1900 K);
    /// - k: the same law with k₀ = 0.0241 W m⁻¹ K⁻¹, S = 194 K (\[White\] Table 1-3; ±2 % from
    ///   160 to 2000 K). The small effect of humidity on μ and k (< 1 % here) is neglected.
    /// - D_v = 2.178 × 10⁻⁵ (T/273.15)^1.81 (101.325/P) m² s⁻¹ (\[Massman\], Table 2, H₂O in air).
    ///
    /// The caller range-checks the inputs; outside 243–333 K the fits extrapolate smoothly.
    ///
    /// ```
    /// use leafwind_physics::air::AirProperties;
    /// // [USSA1976] sea level, 15 °C, dry: ρ = 1.2250 kg/m³, μ = 1.7894e-5 Pa s.
    /// let p = AirProperties::at(288.15, 101.325, 0.0);
    /// assert!((p.density_kg_m3 - 1.2250).abs() < 0.0005);
    /// assert!((p.dynamic_viscosity_pa_s / 1.7894e-5 - 1.0).abs() < 0.001);
    /// ```
    #[must_use]
    pub fn at(temp_k: f64, pressure_kpa: f64, vapour_pressure_kpa: f64) -> Self {
        let p_pa = pressure_kpa * 1e3;
        let e_ratio = vapour_pressure_kpa / pressure_kpa;
        let eps = MOLAR_MASS_RATIO_WATER_AIR;
        // Moist-air density from the virtual temperature (ideal-gas mixture).
        let density = p_pa * MOLAR_MASS_DRY_AIR_KG_MOL / (GAS_CONSTANT_J_MOL_K * temp_k)
            * (1.0 - (1.0 - eps) * e_ratio);
        let molar_density = p_pa / (GAS_CONSTANT_J_MOL_K * temp_k);
        // Specific humidity and the mixture's specific heat.
        let q = eps * e_ratio / (1.0 - (1.0 - eps) * e_ratio);
        let cp = (1.0 - q) * SPECIFIC_HEAT_DRY_AIR_J_KG_K + q * SPECIFIC_HEAT_WATER_VAPOUR_J_KG_K;
        // Sutherland's laws, [White] eq. 1-36 with Tables 1-2 and 1-3.
        let t_ratio = temp_k / 273.0;
        let t_ratio_15 = t_ratio * t_ratio.sqrt();
        let mu = 1.716e-5 * t_ratio_15 * (273.0 + 111.0) / (temp_k + 111.0);
        let k = 0.0241 * t_ratio_15 * (273.0 + 194.0) / (temp_k + 194.0);
        let nu = mu / density;
        let alpha = k / (density * cp);
        // [Massman] Table 2: D_H2O = 0.2178 cm² s⁻¹ at 273.15 K and 101.325 kPa, exponent 1.81.
        let dv = 2.178e-5 * (temp_k / ZERO_CELSIUS_K).powf(1.81) * (101.325 / pressure_kpa);
        Self {
            temp_k,
            density_kg_m3: density,
            molar_density_mol_m3: molar_density,
            specific_heat_j_kg_k: cp,
            dynamic_viscosity_pa_s: mu,
            kinematic_viscosity_m2_s: nu,
            thermal_conductivity_w_m_k: k,
            thermal_diffusivity_m2_s: alpha,
            prandtl: nu / alpha,
            vapour_diffusivity_m2_s: dv,
            schmidt: nu / dv,
        }
    }

    /// Molar specific heat of the air \[J mol⁻¹ K⁻¹\]: c_p ρ / (molar density).
    #[must_use]
    pub fn molar_specific_heat_j_mol_k(&self) -> f64 {
        self.specific_heat_j_kg_k * self.density_kg_m3 / self.molar_density_mol_m3
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dew_point_inverts_saturation_pressure() {
        for t in [-20.0, 0.0, 12.5, 25.0, 45.0] {
            let e = saturation_vapour_pressure_kpa(t);
            assert!((dew_point_c(e).unwrap() - t).abs() < 1e-9);
        }
    }

    #[test]
    fn humidity_forms_agree() {
        let t = 30.0;
        let e = Humidity::RelativePct(50.0).vapour_pressure_kpa(t).unwrap();
        let dew = dew_point_c(e).unwrap();
        let e2 = Humidity::DewPointC(dew).vapour_pressure_kpa(t).unwrap();
        let vpd = vapour_pressure_deficit_kpa(t, e);
        let e3 = Humidity::DeficitKpa(vpd).vapour_pressure_kpa(t).unwrap();
        assert!((e - e2).abs() < 1e-12 && (e - e3).abs() < 1e-12);
        assert!((rh_from_vapour_pressure_pct(t, e) - 50.0).abs() < 1e-9);
    }

    #[test]
    fn inconsistent_humidity_is_an_error() {
        assert!(Humidity::DewPointC(31.0).vapour_pressure_kpa(30.0).is_err());
        assert!(Humidity::DeficitKpa(5.0).vapour_pressure_kpa(30.0).is_err());
        assert!(
            Humidity::RelativePct(100.5)
                .vapour_pressure_kpa(30.0)
                .is_err()
        );
        assert!(dew_point_c(0.0).is_err());
    }

    #[test]
    fn slope_is_the_derivative_of_saturation_pressure() {
        for t in [-25.0, 5.0, 35.0, 55.0] {
            let h = 1e-4;
            let fd = (saturation_vapour_pressure_kpa(t + h)
                - saturation_vapour_pressure_kpa(t - h))
                / (2.0 * h);
            // FAO-56 rounds 17.27 × 237.3 = 4098.17 to 4098: 4e-5 relative.
            assert!((fd / saturation_slope_kpa_k(t) - 1.0).abs() < 1e-4);
        }
    }
}

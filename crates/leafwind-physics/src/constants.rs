//! Physical constants, each defined once with its source.
//!
//! A second copy of any of these anywhere in the workspace is a bug: import it from here.
//!
//! # References
//! - \[CODATA2018\] Tiesinga, E., Mohr, P. J., Newell, D. B., Taylor, B. N. (2021). CODATA recommended
//!   values of the fundamental physical constants: 2018. *Rev. Mod. Phys.* 93, 025010.
//! - \[CIPM2007\] Picard, A., Davis, R. S., Gläser, M., Fujii, K. (2008). Revised formula for the density
//!   of moist air (CIPM-2007). *Metrologia* 45, 149–155.
//! - \[USSA1976\] NOAA, NASA, USAF (1976). *U.S. Standard Atmosphere, 1976*. Washington, D.C.

/// Stefan–Boltzmann constant σ \[W m⁻² K⁻⁴\] (exact since the 2019 SI redefinition; \[CODATA2018\]).
pub const STEFAN_BOLTZMANN_W_M2_K4: f64 = 5.670_374_419e-8;

/// Molar gas constant R \[J mol⁻¹ K⁻¹\] (exact; \[CODATA2018\]).
pub const GAS_CONSTANT_J_MOL_K: f64 = 8.314_462_618;

/// Standard acceleration of gravity g \[m s⁻²\] (conventional value, 3rd CGPM 1901; \[USSA1976\]).
pub const GRAVITY_M_S2: f64 = 9.806_65;

/// The Celsius zero, 0 °C, as an absolute temperature \[K\] (SI definition).
pub const ZERO_CELSIUS_K: f64 = 273.15;

/// Molar mass of water M_w \[kg mol⁻¹\] (\[CIPM2007\], Table 1).
pub const MOLAR_MASS_WATER_KG_MOL: f64 = 18.015_28e-3;

/// Molar mass of dry air M_a \[kg mol⁻¹\] (\[CIPM2007\], for x_CO2 = 0.0004).
pub const MOLAR_MASS_DRY_AIR_KG_MOL: f64 = 28.965_46e-3;

/// Ratio of the molar masses of water and dry air ε = M_w / M_a \[–\] (≈ 0.622).
pub const MOLAR_MASS_RATIO_WATER_AIR: f64 = MOLAR_MASS_WATER_KG_MOL / MOLAR_MASS_DRY_AIR_KG_MOL;

/// Standard sea-level atmospheric pressure \[kPa\] (\[USSA1976\]).
pub const STANDARD_PRESSURE_KPA: f64 = 101.325;

/// Specific heat of dry air at constant pressure c_pd \[J kg⁻¹ K⁻¹\].
///
/// Incropera et al., *Fundamentals of Heat and Mass Transfer*, 6th ed. (2007), Table A.4 lists
/// 1.006–1.009 kJ kg⁻¹ K⁻¹ between 250 K and 350 K; the constant 1006 is within 0.3 % of the
/// table over the engine's range (−30 to 60 °C).
pub const SPECIFIC_HEAT_DRY_AIR_J_KG_K: f64 = 1006.0;

/// Specific heat of water vapour at constant pressure c_pv \[J kg⁻¹ K⁻¹\] (near 300 K).
///
/// Rogers, R. R., Yau, M. K., *A Short Course in Cloud Physics*, 3rd ed. (1989), Table 2.1
/// (value from memory: 1870 J kg⁻¹ K⁻¹ at 0 °C; 1860 is used widely in meteorology).
pub const SPECIFIC_HEAT_WATER_VAPOUR_J_KG_K: f64 = 1860.0;

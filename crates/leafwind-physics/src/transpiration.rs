//! Transpiration: stomatal conductance shared between the faces, each face's stomatal and cuticular
//! path in series with its boundary layer, the latent heat flux and the water loss.
//!
//! # References
//! - \[CN98\] Campbell, G. S., Norman, J. M. (1998). *An Introduction to Environmental Biophysics*,
//!   2nd ed. Springer. Ch. 7 and 14: conductances in mol m⁻² s⁻¹, series and parallel combination,
//!   E = g_v (e_s(T_L) − e_a) / P.
//! - \[Kerstiens\] Kerstiens, G. (1996). Cuticular water permeability and its physiological significance.
//!   *Journal of Experimental Botany* 47, 1813–1832 (minimum leaf conductances of the order of
//!   mmol m⁻² s⁻¹; value from memory).

use crate::constants::MOLAR_MASS_WATER_KG_MOL;
use crate::error::ValidRange;

/// Default total stomatal conductance \[mol m⁻² s⁻¹\]: 0.3, a well-watered crop leaf in light
/// (\[CN98\] ch. 14 gives typical maxima of 0.2–0.8 mol m⁻² s⁻¹; value from memory).
pub const STOMATAL_CONDUCTANCE_DEFAULT_MOL_M2_S: f64 = 0.3;

/// Valid total stomatal conductances \[mol m⁻² s⁻¹\] (0 = closed; ~1.5 exceeds any crop).
pub const STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S: ValidRange = ValidRange {
    quantity: "stomatal conductance",
    min: 0.0,
    max: 1.5,
    unit: "mol/m²/s",
};

/// Default share of stomatal conductance on the lower (abaxial) face \[–\]: 1.0, hypostomatous, as
/// most broadleaf trees and many dicots (\[CN98\] ch. 14).
pub const LOWER_SHARE_DEFAULT: f64 = 1.0;

/// Valid lower-face shares \[–\]: 0 (all on the upper face) to 1 (hypostomatous).
pub const LOWER_SHARE_RANGE: ValidRange = ValidRange {
    quantity: "lower-face stomatal share",
    min: 0.0,
    max: 1.0,
    unit: "",
};

/// Default cuticular conductance, both faces together \[mol m⁻² s⁻¹\]: 0.005 (\[Kerstiens\]; from
/// memory).
pub const CUTICULAR_CONDUCTANCE_DEFAULT_MOL_M2_S: f64 = 0.005;

/// Valid cuticular conductances \[mol m⁻² s⁻¹\].
pub const CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S: ValidRange = ValidRange {
    quantity: "cuticular conductance",
    min: 0.0,
    max: 0.05,
    unit: "mol/m²/s",
};

/// Splits the total stomatal conductance into (upper, lower) face parts \[mol m⁻² s⁻¹\].
#[must_use]
pub fn split_stomatal(total_mol_m2_s: f64, lower_share: f64) -> (f64, f64) {
    (
        total_mol_m2_s * (1.0 - lower_share),
        total_mol_m2_s * lower_share,
    )
}

/// Total vapour conductance of one face \[mol m⁻² s⁻¹\]: the stomatal and cuticular paths in parallel,
/// in series with the face's boundary layer (\[CN98\] ch. 7 and 14):
/// g_v = 1 / (1/(g_s + g_c) + 1/g_bv). Zero when either side is zero.
///
/// ```
/// use leafwind_physics::transpiration::face_vapour_conductance_mol_m2_s;
/// // 0.3 through a 1.0 boundary layer: 1/(1/0.3 + 1) = 0.2308.
/// let g = face_vapour_conductance_mol_m2_s(0.3, 0.0, 1.0);
/// assert!((g - 0.2308).abs() < 1e-4);
/// ```
#[must_use]
pub fn face_vapour_conductance_mol_m2_s(
    stomatal_mol_m2_s: f64,
    cuticular_mol_m2_s: f64,
    boundary_layer_mol_m2_s: f64,
) -> f64 {
    let surface = stomatal_mol_m2_s + cuticular_mol_m2_s;
    if surface <= 0.0 || boundary_layer_mol_m2_s <= 0.0 {
        return 0.0;
    }
    surface * boundary_layer_mol_m2_s / (surface + boundary_layer_mol_m2_s)
}

/// Transpiration rate E \[mol m⁻² s⁻¹\]: E = g_v (e_s(T_L) − e_a) / P (\[CN98\] ch. 14; vapour
/// pressures and P in the same unit). Negative values are dew deposited on the leaf.
#[must_use]
pub fn transpiration_mol_m2_s(
    vapour_conductance_mol_m2_s: f64,
    leaf_vapour_pressure_kpa: f64,
    air_vapour_pressure_kpa: f64,
    pressure_kpa: f64,
) -> f64 {
    vapour_conductance_mol_m2_s * (leaf_vapour_pressure_kpa - air_vapour_pressure_kpa)
        / pressure_kpa
}

/// Converts a water flux in mol m⁻² s⁻¹ to mmol m⁻² s⁻¹.
#[must_use]
pub fn mol_to_mmol(flux_mol_m2_s: f64) -> f64 {
    flux_mol_m2_s * 1e3
}

/// Converts a water flux in mol m⁻² s⁻¹ to g m⁻² h⁻¹ (M_w = 18.015 g mol⁻¹).
///
/// ```
/// // 1 mmol/m²/s of water = 18.015 mg/m²/s = 64.85 g/m²/h.
/// let g = leafwind_physics::transpiration::mol_to_g_per_m2_h(1e-3);
/// assert!((g - 64.85).abs() < 0.01);
/// ```
#[must_use]
pub fn mol_to_g_per_m2_h(flux_mol_m2_s: f64) -> f64 {
    flux_mol_m2_s * MOLAR_MASS_WATER_KG_MOL * 1e3 * 3600.0
}

//! Flat records of engine results for JSON and CSV, with units in every field name.
//!
//! Non-finite numbers never reach a file: every value is either finite or `None` (null / empty).

use leafwind_physics::transpiration::{mol_to_g_per_m2_h, mol_to_mmol};
use leafwind_physics::{LeafSolution, WindAnswer};
use serde::Serialize;
use std::io::Write;

/// One solved leaf, per unit one-sided leaf area, both faces summed.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LeafRecord {
    /// Leaf temperature \[°C\].
    pub leaf_temp_c: f64,
    /// Leaf minus air temperature \[K\].
    pub leaf_air_diff_k: f64,
    /// All absorbed radiation, short and long \[W m⁻²\].
    pub absorbed_w_m2: f64,
    /// Absorbed shortwave \[W m⁻²\].
    pub absorbed_shortwave_w_m2: f64,
    /// Absorbed longwave \[W m⁻²\].
    pub absorbed_longwave_w_m2: f64,
    /// Emitted longwave \[W m⁻²\].
    pub emitted_w_m2: f64,
    /// Sensible heat to the air \[W m⁻²\].
    pub sensible_w_m2: f64,
    /// Latent heat \[W m⁻²\].
    pub latent_w_m2: f64,
    /// Energy-balance residual \[W m⁻²\].
    pub residual_w_m2: f64,
    /// Transpiration \[mmol m⁻² s⁻¹\].
    pub transpiration_mmol_m2_s: f64,
    /// Transpiration \[g m⁻² h⁻¹\].
    pub transpiration_g_m2_h: f64,
    /// Convective heat-transfer coefficient, both faces \[W m⁻² K⁻¹\].
    pub heat_transfer_coeff_w_m2_k: f64,
    /// Radiative conductance, both faces \[W m⁻² K⁻¹\].
    pub radiative_conductance_w_m2_k: f64,
    /// Boundary-layer vapour conductance, both faces \[mol m⁻² s⁻¹\].
    pub bl_vapour_conductance_mol_m2_s: f64,
    /// Stomata + cuticle + boundary layer, both faces \[mol m⁻² s⁻¹\].
    pub total_vapour_conductance_mol_m2_s: f64,
    /// Reynolds number on the leaf dimension.
    pub reynolds: f64,
    /// Grashof number on the leaf dimension.
    pub grashof: f64,
    /// Convection regime label.
    pub regime: String,
    /// 99 % velocity thickness at the trailing edge \[mm\]; null in still air.
    pub bl_thickness_mm: Option<f64>,
    /// Conduction-equivalent boundary-layer thickness, both faces \[mm\].
    pub effective_bl_thickness_mm: Option<f64>,
    /// Radiant temperature of the sky or cover seen by the upper face \[°C\].
    pub sky_temp_c: f64,
    /// Leaf-to-air vapour-pressure deficit \[kPa\].
    pub leaf_vpd_kpa: f64,
    /// Linearised (Penman–Monteith-type) leaf temperature \[°C\].
    pub linearised_leaf_temp_c: f64,
    /// Exact minus linearised leaf temperature \[K\].
    pub linearisation_error_k: f64,
    /// Solver iterations.
    pub iterations: u32,
    /// Solver status.
    pub solver_status: String,
    /// Least air speed for the limit minus margin \[m s⁻¹\] (0 when none is needed); null when
    /// there is none or no limit was asked.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub required_wind_m_s: Option<Option<f64>>,
    /// The answer in words, when a limit was asked.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub required_wind_reason: Option<String>,
}

/// Maps a non-finite value to `None`.
#[must_use]
pub fn finite(x: f64) -> Option<f64> {
    x.is_finite().then_some(x)
}

impl LeafRecord {
    /// Flattens a solution (and the answer to the limit question, if asked).
    #[must_use]
    pub fn new(s: &LeafSolution, wind: Option<&WindAnswer>) -> Self {
        let t = &s.terms;
        let c = &t.convection;
        Self {
            leaf_temp_c: s.leaf_temp_c,
            leaf_air_diff_k: s.leaf_air_diff_k,
            absorbed_w_m2: s.absorbed_w_m2(),
            absorbed_shortwave_w_m2: s.absorbed_shortwave_w_m2,
            absorbed_longwave_w_m2: s.absorbed_longwave_w_m2,
            emitted_w_m2: t.emitted_w_m2,
            sensible_w_m2: t.sensible_w_m2,
            latent_w_m2: t.latent_w_m2,
            residual_w_m2: t.residual_w_m2,
            transpiration_mmol_m2_s: mol_to_mmol(t.transpiration_mol_m2_s),
            transpiration_g_m2_h: mol_to_g_per_m2_h(t.transpiration_mol_m2_s),
            heat_transfer_coeff_w_m2_k: c.heat_total_w_m2_k(),
            radiative_conductance_w_m2_k: s.radiative_conductance_w_m2_k,
            bl_vapour_conductance_mol_m2_s: c.vapour_total_mol_m2_s(),
            total_vapour_conductance_mol_m2_s: s.total_vapour_conductance_mol_m2_s(),
            reynolds: c.reynolds,
            grashof: c.grashof,
            regime: c.regime.label().to_owned(),
            bl_thickness_mm: s.bl_thickness_m.and_then(|m| finite(m * 1e3)),
            effective_bl_thickness_mm: s.effective_bl_thickness_m.and_then(|m| finite(m * 1e3)),
            sky_temp_c: s.above_radiant_temp_c,
            leaf_vpd_kpa: s.leaf_vpd_kpa,
            linearised_leaf_temp_c: s.linearised.leaf_temp_c,
            linearisation_error_k: s.linearisation_error_k(),
            iterations: s.solver.iterations,
            solver_status: format!("{:?}", s.solver.status).to_lowercase(),
            required_wind_m_s: wind.map(WindAnswer::speed_m_s),
            required_wind_reason: wind.map(WindAnswer::sentence),
        }
    }
}

/// Writes `value` as pretty JSON and a final newline (every command's `--json`).
///
/// # Errors
/// A failed write.
pub fn write_json(out: &mut impl Write, value: &impl Serialize) -> anyhow::Result<()> {
    serde_json::to_writer_pretty(&mut *out, value)?;
    writeln!(out)?;
    Ok(())
}

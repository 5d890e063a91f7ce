//! The steady energy balance of one flat leaf, solved exactly, and its linearised
//! (Penman–Monteith-type) closed form.
//!
//! Per unit one-sided leaf area, both faces summed (all \[W m⁻²\]):
//!
//! absorbed (shortwave + longwave) = emitted ε σ T_L⁴ · 2 + sensible h (T_L − T_a) + latent λ E,
//!
//! with h and the boundary-layer vapour conductances from [`crate::convection`] at the film
//! temperature (so free convection feeds back on T_L), E from [`crate::transpiration`] with
//! e_s(T_L) from [`crate::air`], and the radiation terms from [`crate::radiation`].
//!
//! # References
//! - \[CN98\] Campbell, G. S., Norman, J. M. (1998). *An Introduction to Environmental Biophysics*,
//!   2nd ed. Springer. Ch. 14 (the leaf energy balance; the linearised leaf temperature with the
//!   isothermal net radiation and the "apparent psychrometer constant").
//! - \[Monteith\] Monteith, J. L., Unsworth, M. H. (2013). *Principles of Environmental Physics*,
//!   4th ed. Academic Press. Ch. 13 (linearisation of e_s(T) by its slope Δ, the Penman argument).

use crate::air::{
    AirProperties, molar_latent_heat_j_mol, saturation_slope_from_es_kpa_k, saturation_slope_kpa_k,
    saturation_vapour_pressure_kpa,
};
use crate::boundary_layer::{effective_thickness_m, thickness_99_m};
use crate::case::LeafCase;
use crate::constants::ZERO_CELSIUS_K;
use crate::convection::{FlowConditions, LeafConvection, leaf_convection};
use crate::error::Result;
use crate::radiation::{
    absorbed_longwave_w_m2, absorbed_shortwave_w_m2, emitted_longwave_w_m2,
    radiative_conductance_w_m2_k,
};
use crate::solver::{SolverReport, SolverSettings, solve_decreasing};
use crate::transpiration::{
    face_vapour_conductance_mol_m2_s, split_stomatal, transpiration_mol_m2_s,
};

/// Residual tolerance of the exact solve \[W m⁻²\] (ten times below the 10⁻⁶ W m⁻² the
/// engine promises; the terms are of order 10³ W m⁻², so this is 10⁻¹⁰ relative).
pub const RESIDUAL_TOLERANCE_W_M2: f64 = 1e-7;

/// Residual tolerance of map and sweep cells \[W m⁻²\]: with a total conductance of at least
/// ~10 W m⁻² K⁻¹ this keeps each cell within 10⁻⁴ K of the fully converged leaf temperature,
/// a hundred times finer than the map shows.
pub const GRID_RESIDUAL_TOLERANCE_W_M2: f64 = 1e-3;

/// The leaf temperature is sought within this many kelvin of the air temperature \[K\].
///
/// Wide enough for the corner of the valid domain where a black, closed, dry leaf in still air
/// takes 1400 W m⁻² on both faces (about +170 K from the air); such leaves are far outside the
/// property fits' range and are reported, not refused (`LeafSolution::outside_property_range`).
pub const SEARCH_HALF_WIDTH_K: f64 = 250.0;

/// Air speed \[m s⁻¹\] below which the balance may hold at more than one leaf temperature.
///
/// In nearly still air free convection carries the exchange, and it strengthens as a transpiring
/// leaf cools below the air (the cold lower face sheds a plume): a positive feedback that can give
/// a second, cooler balance point beside one near air temperature. Moving air makes the residual
/// decrease monotonically and the root unique (checked over 10⁶ random cases by
/// `examples/closure_check.rs`). Below this speed the solver reports the balance point reached
/// from the linearised estimate.
pub const NEAR_STILL_AIR_M_S: f64 = 0.1;

/// The lowest leaf temperature sought \[K\]: −120 °C, well above the pole of the FAO-56
/// saturation formula at −237.3 °C.
const SEARCH_MIN_K: f64 = 153.15;

/// dλ/dT of the molar latent heat \[J mol⁻¹ K⁻¹\]: −2.361 × 10³ J kg⁻¹ K⁻¹ × M_w (FAO-56 Annex 3,
/// eq. 3-1, as [`crate::air::latent_heat_j_kg`]).
const LATENT_HEAT_SLOPE_J_MOL_K: f64 = -2.361e3 * crate::constants::MOLAR_MASS_WATER_KG_MOL;

/// A validated case with everything that does not depend on the leaf temperature computed once.
#[derive(Debug, Clone, Copy)]
pub struct PreparedLeaf {
    case: LeafCase,
    air_temp_k: f64,
    vapour_pressure_kpa: f64,
    pressure_kpa: f64,
    above_k: f64,
    below_k: f64,
    absorbed_shortwave_w_m2: f64,
    absorbed_longwave_w_m2: f64,
    stomatal_upper_mol_m2_s: f64,
    stomatal_lower_mol_m2_s: f64,
    cuticular_face_mol_m2_s: f64,
    flow: FlowConditions,
}

/// Every term of the balance at one leaf temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct BalanceTerms {
    /// Leaf temperature \[K\].
    pub leaf_temp_k: f64,
    /// Emitted longwave, both faces \[W m⁻²\].
    pub emitted_w_m2: f64,
    /// Sensible heat to the air, both faces \[W m⁻²\] (negative when the air heats the leaf).
    pub sensible_w_m2: f64,
    /// Latent heat of transpiration \[W m⁻²\] (negative for dew).
    pub latent_w_m2: f64,
    /// Absorbed − emitted − sensible − latent \[W m⁻²\].
    pub residual_w_m2: f64,
    /// Approximate d(residual)/dT_L \[W m⁻² K⁻¹\] (negative).
    pub residual_slope_w_m2_k: f64,
    /// Approximate d²(residual)/dT_L² \[W m⁻² K⁻²\]: the curvature of emission and of e_s only.
    pub residual_curvature_w_m2_k2: f64,
    /// Boundary-layer conductances at this temperature.
    pub convection: LeafConvection,
    /// Total vapour conductance of the upper face \[mol m⁻² s⁻¹\].
    pub vapour_upper_mol_m2_s: f64,
    /// Total vapour conductance of the lower face \[mol m⁻² s⁻¹\].
    pub vapour_lower_mol_m2_s: f64,
    /// Transpiration rate \[mol m⁻² s⁻¹\].
    pub transpiration_mol_m2_s: f64,
    /// Air properties at the film temperature.
    pub film_properties: AirProperties,
}

impl PreparedLeaf {
    /// Validates `case` and precomputes the temperature-independent parts.
    ///
    /// # Errors
    /// The first invalid input (see [`LeafCase::validate`]).
    pub fn new(case: &LeafCase) -> Result<Self> {
        case.validate()?;
        let air_temp_k = case.air_temp_k();
        let e_a = case.air.humidity.vapour_pressure_kpa(case.air.temp_c)?;
        let s = &case.surroundings;
        let above_k = s.upper_view.radiant_temp_k(e_a, air_temp_k);
        let below_k = s.ground_temp_c.map_or(air_temp_k, |t| t + ZERO_CELSIUS_K);
        let (g_up, g_lo) = split_stomatal(
            case.leaf.stomatal_conductance_mol_m2_s,
            case.leaf.lower_share,
        );
        Ok(Self {
            case: *case,
            air_temp_k,
            vapour_pressure_kpa: e_a,
            pressure_kpa: case.air.pressure_kpa,
            above_k,
            below_k,
            absorbed_shortwave_w_m2: absorbed_shortwave_w_m2(
                case.leaf.absorptivity,
                s.shortwave_w_m2,
                s.ground_albedo,
            ),
            absorbed_longwave_w_m2: absorbed_longwave_w_m2(case.leaf.emissivity, above_k, below_k),
            stomatal_upper_mol_m2_s: g_up,
            stomatal_lower_mol_m2_s: g_lo,
            cuticular_face_mol_m2_s: 0.5 * case.leaf.cuticular_conductance_mol_m2_s,
            flow: FlowConditions {
                speed_m_s: case.air.speed_m_s,
                dimension_m: case.leaf.dimension_m,
                turbulence_factor: case.air.turbulence_factor,
                critical_reynolds: case.critical_reynolds,
                free_length_m: case.leaf.free_convection_length_m(),
            },
        })
    }

    /// The same prepared leaf at another air speed \[m s⁻¹\] (only the speed is re-checked).
    ///
    /// # Errors
    /// The speed is out of range.
    pub fn at_speed(&self, speed_m_s: f64) -> Result<Self> {
        let speed = crate::case::AIR_SPEED_RANGE_M_S.check(speed_m_s)?;
        let mut next = *self;
        next.case.air.speed_m_s = speed;
        next.flow.speed_m_s = speed;
        Ok(next)
    }

    /// The case this was prepared from.
    #[must_use]
    pub fn case(&self) -> &LeafCase {
        &self.case
    }

    /// Air vapour pressure e_a \[kPa\].
    #[must_use]
    pub fn vapour_pressure_kpa(&self) -> f64 {
        self.vapour_pressure_kpa
    }

    /// Absorbed radiation, shortwave plus longwave, both faces \[W m⁻²\].
    #[must_use]
    pub fn absorbed_w_m2(&self) -> f64 {
        self.absorbed_shortwave_w_m2 + self.absorbed_longwave_w_m2
    }

    /// Every term of the balance with the leaf at `leaf_temp_k` \[K\].
    #[must_use]
    pub fn terms(&self, leaf_temp_k: f64) -> BalanceTerms {
        let diff_k = leaf_temp_k - self.air_temp_k;
        let film_k = 0.5 * (leaf_temp_k + self.air_temp_k);
        let props = AirProperties::at(film_k, self.pressure_kpa, self.vapour_pressure_kpa);
        let conv = leaf_convection(&props, &self.flow, diff_k);
        let g_up = face_vapour_conductance_mol_m2_s(
            self.stomatal_upper_mol_m2_s,
            self.cuticular_face_mol_m2_s,
            conv.upper.vapour_mol_m2_s,
        );
        let g_lo = face_vapour_conductance_mol_m2_s(
            self.stomatal_lower_mol_m2_s,
            self.cuticular_face_mol_m2_s,
            conv.lower.vapour_mol_m2_s,
        );
        let leaf_temp_c = leaf_temp_k - ZERO_CELSIUS_K;
        let e_leaf = saturation_vapour_pressure_kpa(leaf_temp_c);
        let e_slope = saturation_slope_from_es_kpa_k(leaf_temp_c, e_leaf);
        let g_v = g_up + g_lo;
        let e_flux =
            transpiration_mol_m2_s(g_v, e_leaf, self.vapour_pressure_kpa, self.pressure_kpa);
        let lambda = molar_latent_heat_j_mol(leaf_temp_c);
        let eps = self.case.leaf.emissivity;
        let emitted = 2.0 * emitted_longwave_w_m2(eps, leaf_temp_k);
        let h = conv.heat_total_w_m2_k();
        let sensible = h * diff_k;
        let latent = lambda * e_flux;
        let residual = self.absorbed_w_m2() - emitted - sensible - latent;
        // d(g_v)/dT through the free-convection part of each face's boundary layer, in series
        // with the surface: dg_v/dg_bv = (g_v/g_bv)².
        let series = |g_face: f64, g_b: f64| {
            if g_b > 0.0 {
                (g_face / g_b).powi(2)
            } else {
                0.0
            }
        };
        let dg_v = series(g_up, conv.upper.vapour_mol_m2_s)
            * conv.upper.vapour_slope_mol_m2_s_k(diff_k)
            + series(g_lo, conv.lower.vapour_mol_m2_s) * conv.lower.vapour_slope_mol_m2_s_k(diff_k);
        let slope = -(2.0 * radiative_conductance_w_m2_k(eps, leaf_temp_k)
            + lambda * dg_v * (e_leaf - self.vapour_pressure_kpa) / self.pressure_kpa
            + conv.upper.sensible_slope_w_m2_k()
            + conv.lower.sensible_slope_w_m2_k()
            + lambda * g_v * e_slope / self.pressure_kpa
            + LATENT_HEAT_SLOPE_J_MOL_K * e_flux);
        // Curvature: emission 2 · 12 ε σ T³/T and latent through Δ′ = Δ (4098/(T+237.3)² −
        // 2/(T+237.3)), the derivative of eq. 13 of FAO-56.
        let t_sat = leaf_temp_c + 237.3;
        let slope_of_slope = e_slope * (4098.0 / (t_sat * t_sat) - 2.0 / t_sat);
        let curvature = -(2.0 * 3.0 * radiative_conductance_w_m2_k(eps, leaf_temp_k) / leaf_temp_k
            + lambda * g_v * slope_of_slope / self.pressure_kpa);
        BalanceTerms {
            leaf_temp_k,
            residual_curvature_w_m2_k2: curvature,
            emitted_w_m2: emitted,
            sensible_w_m2: sensible,
            latent_w_m2: latent,
            residual_w_m2: residual,
            residual_slope_w_m2_k: slope.min(-1e-9),
            convection: conv,
            vapour_upper_mol_m2_s: g_up,
            vapour_lower_mol_m2_s: g_lo,
            transpiration_mol_m2_s: e_flux,
            film_properties: props,
        }
    }

    /// The linearised leaf–air temperature difference with conductances evaluated for a given
    /// leaf–air difference `conductance_diff_k` \[K\] (which sets the free convection).
    ///
    /// ΔT = (R_ni − λ g_v D/P) / (h + h_R + λ g_v Δ/P) — e_s(T_L) replaced by e_s(T_a) + Δ ΔT and
    /// T_L⁴ by T_a⁴ + 4 T_a³ ΔT (\[CN98\] ch. 14; \[Monteith\] ch. 13), with R_ni = absorbed − 2εσT_a⁴
    /// the isothermal net radiation, h_R = 2 · 4εσT_a³, D the air's vapour-pressure deficit, Δ the
    /// slope of e_s at T_a, and all properties at the air temperature.
    fn linearised_diff_k(&self, conductance_diff_k: f64) -> f64 {
        let t_a = self.air_temp_k;
        let t_c = self.case.air.temp_c;
        let props = AirProperties::at(t_a, self.pressure_kpa, self.vapour_pressure_kpa);
        let conv = leaf_convection(&props, &self.flow, conductance_diff_k);
        let g_v = face_vapour_conductance_mol_m2_s(
            self.stomatal_upper_mol_m2_s,
            self.cuticular_face_mol_m2_s,
            conv.upper.vapour_mol_m2_s,
        ) + face_vapour_conductance_mol_m2_s(
            self.stomatal_lower_mol_m2_s,
            self.cuticular_face_mol_m2_s,
            conv.lower.vapour_mol_m2_s,
        );
        let eps = self.case.leaf.emissivity;
        let lambda = molar_latent_heat_j_mol(t_c);
        let p = self.pressure_kpa;
        let deficit = saturation_vapour_pressure_kpa(t_c) - self.vapour_pressure_kpa;
        let r_ni = self.absorbed_w_m2() - 2.0 * emitted_longwave_w_m2(eps, t_a);
        let h_r = 2.0 * radiative_conductance_w_m2_k(eps, t_a);
        (r_ni - lambda * g_v * deficit / p)
            / (conv.heat_total_w_m2_k() + h_r + lambda * g_v * saturation_slope_kpa_k(t_c) / p)
    }

    /// The linearised (Penman–Monteith-type) leaf temperature.
    ///
    /// Two passes: the first with conductances for a leaf at air temperature (no free convection;
    /// in still air, free convection for a nominal 1 K difference of the sign the drive gives),
    /// the second with free convection set by the first pass's difference.
    #[must_use]
    pub fn linearised(&self) -> LinearisedLeaf {
        let diff =
            self.linearised_diff_k(self.linearised_diff_k(self.first_pass_conductance_diff_k()));
        LinearisedLeaf {
            leaf_temp_c: self.case.air.temp_c + diff,
            leaf_air_diff_k: diff,
        }
    }

    /// Solves the balance exactly for the leaf temperature \[K\].
    ///
    /// Safeguarded Newton ([`crate::solver::solve_decreasing`]) from the air temperature; in moving
    /// air the residual decreases monotonically with T_L (emission, sensible and latent
    /// losses all rise with it), so the bracketed root is unique; below [`NEAR_STILL_AIR_M_S`] see
    /// there.
    ///
    /// # Errors
    /// [`crate::PhysicsError::NoBracket`] should the root lie more than 120 K from the air.
    pub fn solve_exact(&self) -> Result<(BalanceTerms, SolverReport)> {
        self.solve_exact_from(self.default_guess_k())
    }

    /// Where the exact solve starts. In moving air, the air temperature: Newton's first step from
    /// there is exactly the first-pass linearised estimate, so it costs nothing extra. In still
    /// air the air temperature is a degenerate root (no free convection without a temperature
    /// difference, so no exchange at all) and the start is the linearised estimate instead, from
    /// which the solver reaches the physical root.
    fn default_guess_k(&self) -> f64 {
        if self.flow.speed_m_s > 0.0 {
            self.air_temp_k
        } else {
            self.air_temp_k + self.linearised().leaf_air_diff_k
        }
    }

    /// The leaf–air difference at which the first linearised pass evaluates the conductances
    /// \[K\]: 0 in moving air; in still air ±1 K with the sign of the drive.
    fn first_pass_conductance_diff_k(&self) -> f64 {
        if self.flow.speed_m_s > 0.0 {
            0.0
        } else if self.linearised_diff_k(1.0) >= 0.0 {
            1.0
        } else {
            -1.0
        }
    }

    /// As [`PreparedLeaf::solve_exact`], starting from a given leaf temperature \[K\] (for example
    /// the solution of a neighbouring case in a sweep). The answer does not depend on the guess.
    ///
    /// # Errors
    /// As [`PreparedLeaf::solve_exact`].
    pub fn solve_exact_from(&self, guess_k: f64) -> Result<(BalanceTerms, SolverReport)> {
        self.solve_with(guess_k, RESIDUAL_TOLERANCE_W_M2)
    }

    /// Only the leaf temperature \[K\] and the solver report, from `guess_k` to the residual
    /// tolerance `residual_tolerance_w_m2` \[W m⁻²\] (the lean path of sweeps and maps).
    ///
    /// # Errors
    /// As [`PreparedLeaf::solve_exact`].
    pub fn solve_temperature_k(
        &self,
        guess_k: f64,
        residual_tolerance_w_m2: f64,
    ) -> Result<(f64, SolverReport)> {
        let guess = if guess_k.is_finite() {
            guess_k
        } else {
            self.default_guess_k()
        };
        solve_decreasing(
            |t| {
                let terms = self.terms(t);
                (
                    terms.residual_w_m2,
                    terms.residual_slope_w_m2_k,
                    terms.residual_curvature_w_m2_k2,
                )
            },
            guess,
            &self.solver_settings(residual_tolerance_w_m2),
            "leaf temperature",
        )
    }

    /// The leaf temperatures \[K\] within which the exact solve seeks its root.
    #[must_use]
    pub fn search_domain_k(&self) -> (f64, f64) {
        (
            (self.air_temp_k - SEARCH_HALF_WIDTH_K).max(SEARCH_MIN_K),
            self.air_temp_k + SEARCH_HALF_WIDTH_K,
        )
    }

    /// As [`PreparedLeaf::solve_temperature_k`], then one Newton correction from the last
    /// evaluation, t − f/f′, which costs no further evaluation and takes the error from the
    /// tolerance's order to its square. For sweeps and maps, where neighbouring cells extrapolate
    /// from each other's answers.
    ///
    /// # Errors
    /// As [`PreparedLeaf::solve_exact`].
    pub fn solve_temperature_polished_k(
        &self,
        guess_k: f64,
        residual_tolerance_w_m2: f64,
    ) -> Result<f64> {
        let guess = if guess_k.is_finite() {
            guess_k
        } else {
            self.default_guess_k()
        };
        let mut last = (f64::NAN, 0.0, -1.0);
        let (t, _) = solve_decreasing(
            |t| {
                let terms = self.terms(t);
                last = (t, terms.residual_w_m2, terms.residual_slope_w_m2_k);
                (
                    terms.residual_w_m2,
                    terms.residual_slope_w_m2_k,
                    terms.residual_curvature_w_m2_k2,
                )
            },
            guess,
            &self.solver_settings(residual_tolerance_w_m2),
            "leaf temperature",
        )?;
        let (x, f, d) = last;
        Ok(if x == t && d < 0.0 { t - f / d } else { t })
    }

    fn solver_settings(&self, residual_tolerance_w_m2: f64) -> SolverSettings {
        SolverSettings {
            residual_tolerance: residual_tolerance_w_m2,
            max_iterations: 100,
            initial_step: 0.01,
            min_x: self.search_domain_k().0,
            max_x: self.search_domain_k().1,
        }
    }

    /// As [`PreparedLeaf::solve_exact_from`] with a chosen residual tolerance \[W m⁻²\].
    ///
    /// # Errors
    /// As [`PreparedLeaf::solve_exact`].
    pub fn solve_with(
        &self,
        guess_k: f64,
        residual_tolerance_w_m2: f64,
    ) -> Result<(BalanceTerms, SolverReport)> {
        let guess = if guess_k.is_finite() {
            guess_k
        } else {
            self.default_guess_k()
        };
        let settings = self.solver_settings(residual_tolerance_w_m2);
        let mut last: Option<BalanceTerms> = None;
        let (t, report) = solve_decreasing(
            |t| {
                let terms = self.terms(t);
                last = Some(terms);
                (
                    terms.residual_w_m2,
                    terms.residual_slope_w_m2_k,
                    terms.residual_curvature_w_m2_k2,
                )
            },
            guess,
            &settings,
            "leaf temperature",
        )?;
        // The solver's last evaluation is at the returned root unless it stopped by bisection.
        let terms = match last {
            Some(terms) if terms.leaf_temp_k == t => terms,
            _ => self.terms(t),
        };
        Ok((
            terms,
            SolverReport {
                residual: terms.residual_w_m2,
                ..report
            },
        ))
    }
}

/// The linearised estimate of the leaf temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct LinearisedLeaf {
    /// Leaf temperature \[°C\].
    pub leaf_temp_c: f64,
    /// Leaf minus air temperature \[K\].
    pub leaf_air_diff_k: f64,
}

/// The full result for one leaf: the exact balance and everything derived from it.
///
/// Fluxes are per unit one-sided leaf area, both faces summed.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct LeafSolution {
    /// Leaf temperature \[°C\].
    pub leaf_temp_c: f64,
    /// Leaf minus air temperature \[K\].
    pub leaf_air_diff_k: f64,
    /// Air temperature \[°C\] (as given).
    pub air_temp_c: f64,
    /// Air vapour pressure \[kPa\].
    pub air_vapour_pressure_kpa: f64,
    /// Air dew point \[°C\] (None for perfectly dry air).
    pub air_dew_point_c: Option<f64>,
    /// Leaf-to-air vapour-pressure deficit e_s(T_L) − e_a \[kPa\].
    pub leaf_vpd_kpa: f64,
    /// Absorbed shortwave, both faces \[W m⁻²\].
    pub absorbed_shortwave_w_m2: f64,
    /// Absorbed longwave, both faces \[W m⁻²\].
    pub absorbed_longwave_w_m2: f64,
    /// Radiant temperature of what the upper face sees (sky or cover) \[°C\].
    pub above_radiant_temp_c: f64,
    /// Radiant temperature of the ground \[°C\].
    pub below_radiant_temp_c: f64,
    /// The balance terms at the solution.
    pub terms: BalanceTerms,
    /// Radiative conductance of both faces, 2 · 4εσT_L³ \[W m⁻² K⁻¹\].
    pub radiative_conductance_w_m2_k: f64,
    /// 99 % velocity thickness at the trailing edge \[m\]; None in still air.
    pub bl_thickness_m: Option<f64>,
    /// Conduction-equivalent thickness of the upper face's boundary layer, k/h \[m\]; None when
    /// h = 0 (still air with the leaf exactly at air temperature).
    pub effective_bl_thickness_upper_m: Option<f64>,
    /// Conduction-equivalent thickness of the lower face's boundary layer, k/h \[m\].
    pub effective_bl_thickness_lower_m: Option<f64>,
    /// Conduction-equivalent thickness for both faces together, 2k/(h_u + h_l) \[m\].
    pub effective_bl_thickness_m: Option<f64>,
    /// The linearised estimate beside the exact one.
    pub linearised: LinearisedLeaf,
    /// How the exact solve went.
    pub solver: SolverReport,
    /// Whether the leaf temperature lies outside the range of the property fits
    /// ([`crate::air::AIR_TEMP_RANGE_C`]), so that they were extrapolated.
    pub outside_property_range: bool,
}

impl LeafSolution {
    /// Absorbed radiation, short and long, both faces \[W m⁻²\].
    #[must_use]
    pub fn absorbed_w_m2(&self) -> f64 {
        self.absorbed_shortwave_w_m2 + self.absorbed_longwave_w_m2
    }

    /// Total vapour conductance, stomata plus boundary layer, both faces \[mol m⁻² s⁻¹\].
    #[must_use]
    pub fn total_vapour_conductance_mol_m2_s(&self) -> f64 {
        self.terms.vapour_upper_mol_m2_s + self.terms.vapour_lower_mol_m2_s
    }

    /// Exact minus linearised leaf temperature \[K\].
    #[must_use]
    pub fn linearisation_error_k(&self) -> f64 {
        self.leaf_temp_c - self.linearised.leaf_temp_c
    }
}

/// Solves one leaf case: the exact balance, the linearised estimate and the derived quantities.
///
/// # Errors
/// Invalid input (named), or a failed bracket (not expected for valid input).
///
/// ```
/// use leafwind_physics::{LeafCase, solve_leaf};
/// let s = solve_leaf(&LeafCase::default()).unwrap();
/// assert!(s.solver.residual.abs() < 1e-6);
/// assert!(s.leaf_temp_c.is_finite());
/// ```
pub fn solve_leaf(case: &LeafCase) -> Result<LeafSolution> {
    let prepared = PreparedLeaf::new(case)?;
    solve_prepared(&prepared)
}

/// As [`solve_leaf`] for an already prepared case.
///
/// # Errors
/// A failed bracket (not expected for valid input).
pub fn solve_prepared(prepared: &PreparedLeaf) -> Result<LeafSolution> {
    let (terms, solver) = prepared.solve_exact()?;
    let case = prepared.case();
    let leaf_temp_c = terms.leaf_temp_k - ZERO_CELSIUS_K;
    let props = &terms.film_properties;
    let k = props.thermal_conductivity_w_m_k;
    let conv = &terms.convection;
    let bl = if case.air.speed_m_s > 0.0 {
        Some(thickness_99_m(
            case.leaf.dimension_m,
            case.air.speed_m_s,
            props.kinematic_viscosity_m2_s,
            case.critical_reynolds,
        ))
    } else {
        None
    };
    let e_a = prepared.vapour_pressure_kpa();
    Ok(LeafSolution {
        leaf_temp_c,
        leaf_air_diff_k: terms.leaf_temp_k - prepared.air_temp_k,
        air_temp_c: case.air.temp_c,
        air_vapour_pressure_kpa: e_a,
        air_dew_point_c: crate::air::dew_point_c(e_a).ok(),
        leaf_vpd_kpa: saturation_vapour_pressure_kpa(leaf_temp_c) - e_a,
        absorbed_shortwave_w_m2: prepared.absorbed_shortwave_w_m2,
        absorbed_longwave_w_m2: prepared.absorbed_longwave_w_m2,
        above_radiant_temp_c: prepared.above_k - ZERO_CELSIUS_K,
        below_radiant_temp_c: prepared.below_k - ZERO_CELSIUS_K,
        terms,
        radiative_conductance_w_m2_k: 2.0
            * radiative_conductance_w_m2_k(case.leaf.emissivity, terms.leaf_temp_k),
        bl_thickness_m: bl,
        effective_bl_thickness_upper_m: finite(effective_thickness_m(k, conv.upper.heat_w_m2_k)),
        effective_bl_thickness_lower_m: finite(effective_thickness_m(k, conv.lower.heat_w_m2_k)),
        effective_bl_thickness_m: finite(effective_thickness_m(k, 0.5 * conv.heat_total_w_m2_k())),
        linearised: prepared.linearised(),
        solver,
        outside_property_range: !crate::air::AIR_TEMP_RANGE_C.contains(leaf_temp_c),
    })
}

fn finite(x: f64) -> Option<f64> {
    x.is_finite().then_some(x)
}

/// Only the exact leaf temperature \[°C\] (the fast path for sweeps and maps).
///
/// # Errors
/// As [`solve_leaf`].
pub fn leaf_temp_c(case: &LeafCase) -> Result<f64> {
    let (terms, _) = PreparedLeaf::new(case)?.solve_exact()?;
    Ok(terms.leaf_temp_k - ZERO_CELSIUS_K)
}

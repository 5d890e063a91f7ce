//! Convective heat and vapour exchange between a flat leaf and the air: forced (laminar and
//! laminar–turbulent), free (upper and lower face) and mixed convection.
//!
//! The heat and mass transfer correlations are the flat-plate ones of \[Incropera\]; water vapour uses
//! the heat–mass transfer analogy (Nu → Sh, Pr → Sc; \[Incropera\] §6.7.1).
//!
//! # References
//! - \[Incropera\] Bergman, T. L., Lavine, A. S., Incropera, F. P., DeWitt, D. P. (2011).
//!   *Fundamentals of Heat and Mass Transfer*, 7th ed. Wiley. Eqs. 7.30, 7.38, 7.39 (forced flow over
//!   a flat plate; numbers as in the 6th ed., from memory), §7.2 (critical Reynolds number),
//!   eqs. 9.30–9.32 (horizontal plates in free convection, with L = A_s/P), §9.9 (mixed convection,
//!   Nu^n = Nu_F^n ± Nu_N^n with n = 3).
//! - \[Cengel\] Çengel, Y. A., Ghajar, A. J. (2015). *Heat and Mass Transfer: Fundamentals and
//!   Applications*, 5th ed. McGraw-Hill. Used for worked checks in the tests.
//! - \[CN98\] Campbell, G. S., Norman, J. M. (1998). *An Introduction to Environmental Biophysics*,
//!   2nd ed. Springer. Ch. 7: boundary-layer conductances of leaves; outdoor conductances are about
//!   1.4 times the laminar flat-plate values.
//! - \[Schuepp\] Schuepp, P. H. (1993). Tansley Review No. 59: Leaf boundary layers.
//!   *New Phytologist* 125, 477–507.

use crate::air::AirProperties;
use crate::constants::GRAVITY_M_S2;
use crate::error::ValidRange;

/// Default critical Reynolds number for laminar–turbulent transition on a flat plate \[–\]
/// (\[Incropera\] §7.2, "a representative value of 5 × 10⁵").
pub const CRITICAL_REYNOLDS_DEFAULT: f64 = 5.0e5;

/// Valid critical Reynolds numbers \[–\]: \[Incropera\] §7.2 gives 10⁵ to 3 × 10⁶ depending on surface
/// roughness and free-stream turbulence.
pub const CRITICAL_REYNOLDS_RANGE: ValidRange = ValidRange {
    quantity: "critical Reynolds number",
    min: 1.0e5,
    max: 3.0e6,
    unit: "",
};

/// Default free-stream turbulence enhancement of forced convection \[–\]: 1.4 (\[CN98\] ch. 7, for
/// leaves outdoors; value from memory of the text).
pub const TURBULENCE_FACTOR_DEFAULT: f64 = 1.4;

/// Valid turbulence enhancement factors \[–\]: 1 (still laboratory flow) to 2.5; \[Schuepp\] reviews
/// field-to-wind-tunnel ratios mostly within that span (range from memory of the review).
pub const TURBULENCE_FACTOR_RANGE: ValidRange = ValidRange {
    quantity: "turbulence factor",
    min: 1.0,
    max: 2.5,
    unit: "",
};

/// Free-convection length as a fraction of the leaf dimension \[–\].
///
/// \[Incropera\] eqs. 9.30–9.32 use L = A_s/P; for a square leaf of side d that is d/4. The engine
/// assumes a square planform until a leaf outline gives A_s/P.
pub const FREE_CONVECTION_LENGTH_PER_DIMENSION: f64 = 0.25;

/// Gr/Re² below which free convection is neglected in the regime label (common practice, no source;
/// \[Incropera\] §9.9 says free convection is negligible for Gr/Re² ≪ 1).
pub const FORCED_REGIME_MAX_RICHARDSON: f64 = 0.1;

/// Gr/Re² above which forced convection is neglected in the regime label (common practice, no source).
pub const FREE_REGIME_MIN_RICHARDSON: f64 = 10.0;

/// Cube root of a non-negative number as exp(ln x / 3): within a few ulp of `f64::cbrt` and,
/// measured on the project's machines, 40 % faster (DEVELOPERS.md). Zero and negatives give 0.
#[inline]
fn cube_root(x: f64) -> f64 {
    if x > 0.0 { (x.ln() / 3.0).exp() } else { 0.0 }
}

/// x^{1/5} of a non-negative number as exp(ln x / 5) (as [`cube_root`]).
#[inline]
fn fifth_root(x: f64) -> f64 {
    if x > 0.0 { (0.2 * x.ln()).exp() } else { 0.0 }
}

/// Reynolds number Re = U L / ν \[–\].
///
/// - `speed_m_s`: free-stream air speed \[m s⁻¹\]; `length_m`: length along the flow \[m\];
///   `kinematic_viscosity_m2_s` \[m² s⁻¹\].
#[must_use]
pub fn reynolds(speed_m_s: f64, length_m: f64, kinematic_viscosity_m2_s: f64) -> f64 {
    speed_m_s * length_m / kinematic_viscosity_m2_s
}

/// Grashof number Gr = g β |ΔT| L³ / ν² \[–\] with β = 1/T_film (ideal gas; \[Incropera\] eq. 9.12).
///
/// - `surface_air_diff_k`: surface minus air temperature \[K\] (its magnitude is used);
/// - `film_temp_k`: mean of surface and air temperature \[K\]; `length_m` \[m\];
///   `kinematic_viscosity_m2_s` \[m² s⁻¹\].
#[must_use]
pub fn grashof(
    surface_air_diff_k: f64,
    film_temp_k: f64,
    length_m: f64,
    kinematic_viscosity_m2_s: f64,
) -> f64 {
    GRAVITY_M_S2 * surface_air_diff_k.abs() * length_m.powi(3)
        / (film_temp_k * kinematic_viscosity_m2_s * kinematic_viscosity_m2_s)
}

/// Average Nusselt (or, with Sc for `prandtl`, Sherwood) number of forced flow along a flat plate \[–\].
///
/// - `reynolds_l`: Reynolds number on the plate length \[–\] (≥ 0);
/// - `prandtl`: Pr for heat, Sc for vapour \[–\]; `critical_reynolds`: transition Re \[–\].
///
/// Equations (\[Incropera\]): laminar, Re ≤ Re_c: Nu = 0.664 Re^{1/2} Pr^{1/3} (eq. 7.30); mixed
/// laminar–turbulent, Re > Re_c: Nu = (0.037 Re^{4/5} − A) Pr^{1/3} with
/// A = 0.037 Re_c^{4/5} − 0.664 Re_c^{1/2} (eqs. 7.38, 7.39; 0.6 < Pr < 60). Continuous at Re_c.
///
/// ```
/// use leafwind_physics::convection::forced_nusselt;
/// // [Incropera] eq. 7.39 with Re_c = 5e5 gives A = 871.
/// let re: f64 = 1.0e6;
/// let nu = forced_nusselt(re, 1.0, 5.0e5);
/// assert!((nu - (0.037 * re.powf(0.8) - 871.0)).abs() < 1.0);
/// ```
#[must_use]
pub fn forced_nusselt(reynolds_l: f64, prandtl: f64, critical_reynolds: f64) -> f64 {
    let pr_third = cube_root(prandtl);
    if reynolds_l <= critical_reynolds {
        0.664 * reynolds_l.sqrt() * pr_third // eq. 7.30 of [Incropera]
    } else {
        let a = 0.037 * critical_reynolds.powf(0.8) - 0.664 * critical_reynolds.sqrt(); // eq. 7.39
        (0.037 * reynolds_l.powf(0.8) - a) * pr_third // eq. 7.38 of [Incropera]
    }
}

/// Which side of a horizontal plate, relative to the sign of its temperature difference.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PlateSide {
    /// Upper face of a plate warmer than the air, or lower face of a plate cooler than the air:
    /// buoyant plumes rise freely from it (\[Incropera\] Fig. 9.7 b, c).
    Unstable,
    /// Lower face of a warm plate, or upper face of a cool plate: the flow must creep round the edges.
    Stable,
}

impl PlateSide {
    /// The side that `upper` (true) or lower face takes for a leaf–air difference of that sign.
    #[must_use]
    pub fn of_face(upper: bool, leaf_air_diff_k: f64) -> Self {
        if upper == (leaf_air_diff_k >= 0.0) {
            PlateSide::Unstable
        } else {
            PlateSide::Stable
        }
    }
}

/// Ra at which the two unstable-side branches meet: 0.54 Ra^{1/4} = 0.15 Ra^{1/3} ⇒
/// Ra = (0.54/0.15)^{12} ≈ 4.7 × 10⁶.
pub const UNSTABLE_BRANCH_CROSSING_RA: f64 = 4_738_381.338_321_6;

/// Nusselt number of pure conduction from one face of a flat leaf into still air, on L = A_s/P \[–\].
///
/// A disk of diameter D on the surface of a semi-infinite medium has the conduction shape factor
/// S = 2D (\[Incropera\] Table 4.1; from memory of the table's case), so q = 2 D k ΔT per face and
/// h = 8k/(πD); on the disk's L = A_s/P = D/4 that is Nu_L = 2/π. The engine applies it to any
/// outline through its A_s/P — an approximation that only matters in nearly still air.
pub const CONDUCTION_NUSSELT_PER_FACE: f64 = 2.0 / std::f64::consts::PI;

/// Average Nusselt (or Sherwood) number of free convection from one face of a horizontal plate \[–\].
///
/// - `rayleigh`: Ra = Gr Pr (or Gr Sc for vapour) on L = A_s/P \[–\] (≥ 0); `side`: see [`PlateSide`].
///
/// Equations (\[Incropera\] 7th ed.): unstable side Nu = 0.54 Ra^{1/4} (eq. 9.30, 10⁴–10⁷) and
/// Nu = 0.15 Ra^{1/3} (eq. 9.31, 10⁷–10¹¹); stable side Nu = 0.52 Ra^{1/5} (eq. 9.32, 10⁴–10⁹;
/// the 6th ed. gave 0.27 Ra^{1/4}, which agrees within 1 % near Ra = 4 × 10⁵).
///
/// Deviations, all deliberate:
/// - each law Nu = C Ra^n is joined to the conduction limit Nu_c ([`CONDUCTION_NUSSELT_PER_FACE`])
///   by the Churchill–Usagi blend with exponent 1/n, Nu = (Nu_c^{1/n} + C^{1/n} Ra)^n. Above
///   Ra ≈ 10³ this differs from the correlation by less than 0.1 %; as Ra → 0 it tends to the
///   conduction limit with a slope linear in Ra (the regular low-Ra behaviour) instead of the
///   power law's infinite slope at Ra = 0, which would otherwise give a still leaf at air
///   temperature spurious extra balance points;
/// - the unstable branches switch where they cross (Ra ≈ 4.7 × 10⁶), continuous within 10⁻⁵;
/// - below the correlations' lower limits — where small leaves at small temperature differences
///   usually are — the blended laws are extrapolated.
///
/// ```
/// use leafwind_physics::convection::{PlateSide, free_nusselt, CONDUCTION_NUSSELT_PER_FACE};
/// assert_eq!(free_nusselt(0.0, PlateSide::Unstable), CONDUCTION_NUSSELT_PER_FACE);
/// let ra: f64 = 1.0e6; // well inside eq. 9.30's range: within 10⁻⁶ of 0.54 Ra^¼
/// assert!((free_nusselt(ra, PlateSide::Unstable) / (0.54 * ra.powf(0.25)) - 1.0).abs() < 1e-6);
/// ```
#[must_use]
pub fn free_nusselt(rayleigh: f64, side: PlateSide) -> f64 {
    let ra = rayleigh.max(0.0);
    let c = CONDUCTION_NUSSELT_PER_FACE;
    match side {
        // eq. 9.31: (c³ + 0.15³ Ra)^{1/3}
        PlateSide::Unstable if ra > UNSTABLE_BRANCH_CROSSING_RA => {
            cube_root(c * c * c + 0.003_375 * ra)
        }
        // eq. 9.30: (c⁴ + 0.54⁴ Ra)^{1/4}
        PlateSide::Unstable => (c * c * c * c + 0.085_030_56 * ra).sqrt().sqrt(),
        // eq. 9.32 (7th ed.): (c⁵ + 0.52⁵ Ra)^{1/5}
        PlateSide::Stable => fifth_root(c * c * c * c * c + 0.038_020_403_2 * ra),
    }
}

/// Mixed convection: Churchill's blend of forced and free Nusselt numbers \[–\],
/// Nu = (Nu_F³ + Nu_N³)^{1/3} (\[Incropera\] §9.9, assisting/transverse flow, n = 3).
///
/// Reduces to the forced value when Nu_N → 0 and to the free value when Nu_F → 0.
#[must_use]
pub fn mixed_nusselt(forced: f64, free: f64) -> f64 {
    cube_root(forced.powi(3) + free.powi(3))
}

/// What drives the convection.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum ConvectionDrive {
    /// Gr/Re² < 0.1: the air movement dominates.
    Forced,
    /// 0.1 ≤ Gr/Re² ≤ 10: both matter.
    Mixed,
    /// Gr/Re² > 10 (or still air): buoyancy dominates.
    Free,
}

/// Whether the forced boundary layer stays laminar to the trailing edge.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum FlowState {
    /// Re ≤ Re_c along the whole leaf.
    Laminar,
    /// Re > Re_c: turbulent over the trailing part of the leaf.
    Turbulent,
}

/// The convection regime of a leaf: drive and flow state.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Regime {
    /// Forced, mixed or free.
    pub drive: ConvectionDrive,
    /// Laminar or (partly) turbulent.
    pub flow: FlowState,
}

impl Regime {
    /// Classifies from Re, Gr (on the leaf dimension) and the critical Re.
    ///
    /// The forced/mixed/free limits are [`FORCED_REGIME_MAX_RICHARDSON`] and
    /// [`FREE_REGIME_MIN_RICHARDSON`]. Free convection is called turbulent above Ra ≈ 10⁷
    /// (\[Incropera\] eq. 9.31's range).
    #[must_use]
    pub fn classify(reynolds: f64, grashof: f64, prandtl: f64, critical_reynolds: f64) -> Self {
        let drive = if reynolds <= 0.0 {
            ConvectionDrive::Free
        } else {
            let richardson = grashof / (reynolds * reynolds);
            if richardson < FORCED_REGIME_MAX_RICHARDSON {
                ConvectionDrive::Forced
            } else if richardson <= FREE_REGIME_MIN_RICHARDSON {
                ConvectionDrive::Mixed
            } else {
                ConvectionDrive::Free
            }
        };
        let turbulent = match drive {
            ConvectionDrive::Free => grashof * prandtl > 1.0e7,
            _ => reynolds > critical_reynolds,
        };
        Self {
            drive,
            flow: if turbulent {
                FlowState::Turbulent
            } else {
                FlowState::Laminar
            },
        }
    }

    /// A short label such as `forced-laminar` (used in files and command output).
    #[must_use]
    pub fn label(&self) -> &'static str {
        match (self.drive, self.flow) {
            (ConvectionDrive::Forced, FlowState::Laminar) => "forced-laminar",
            (ConvectionDrive::Forced, FlowState::Turbulent) => "forced-turbulent",
            (ConvectionDrive::Mixed, FlowState::Laminar) => "mixed-laminar",
            (ConvectionDrive::Mixed, FlowState::Turbulent) => "mixed-turbulent",
            (ConvectionDrive::Free, FlowState::Laminar) => "free-laminar",
            (ConvectionDrive::Free, FlowState::Turbulent) => "free-turbulent",
        }
    }

    /// A plain-words description, e.g. "forced convection, laminar boundary layer".
    #[must_use]
    pub fn description(&self) -> &'static str {
        match (self.drive, self.flow) {
            (ConvectionDrive::Forced, FlowState::Laminar) => {
                "forced convection, laminar boundary layer"
            }
            (ConvectionDrive::Forced, FlowState::Turbulent) => {
                "forced convection, turbulent over the trailing part"
            }
            (ConvectionDrive::Mixed, FlowState::Laminar) => {
                "mixed forced and free convection, laminar"
            }
            (ConvectionDrive::Mixed, FlowState::Turbulent) => {
                "mixed forced and free convection, turbulent"
            }
            (ConvectionDrive::Free, FlowState::Laminar) => "free convection, laminar",
            (ConvectionDrive::Free, FlowState::Turbulent) => "free convection, turbulent",
        }
    }
}

/// Boundary-layer conductances of one leaf face.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct FaceConductance {
    /// Convective heat-transfer coefficient h \[W m⁻² K⁻¹\].
    pub heat_w_m2_k: f64,
    /// Boundary-layer conductance for water vapour g_bv \[mol m⁻² s⁻¹\].
    pub vapour_mol_m2_s: f64,
    /// Forced-convection Nusselt number on the leaf dimension (turbulence factor included) \[–\].
    pub nusselt_forced: f64,
    /// Free-convection Nusselt number on the free-convection length \[–\].
    pub nusselt_free: f64,
    /// The free-convection part of the heat-transfer coefficient \[W m⁻² K⁻¹\].
    pub heat_free_w_m2_k: f64,
    /// The free-convection part of the vapour conductance \[mol m⁻² s⁻¹\].
    pub vapour_free_mol_m2_s: f64,
    /// Exponent n of the free-convection law in use (h_N ∝ |ΔT|^n) \[–\].
    pub free_exponent: f64,
}

/// Boundary-layer exchange of a whole flat leaf (two faces).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct LeafConvection {
    /// The upper (adaxial) face.
    pub upper: FaceConductance,
    /// The lower (abaxial) face.
    pub lower: FaceConductance,
    /// Reynolds number on the leaf dimension \[–\].
    pub reynolds: f64,
    /// Grashof number on the leaf dimension \[–\].
    pub grashof: f64,
    /// Regime from Re and Gr.
    pub regime: Regime,
}

impl LeafConvection {
    /// Sum of both faces' heat-transfer coefficients \[W m⁻² K⁻¹\] (per unit one-sided leaf area).
    #[must_use]
    pub fn heat_total_w_m2_k(&self) -> f64 {
        self.upper.heat_w_m2_k + self.lower.heat_w_m2_k
    }

    /// Sum of both faces' boundary-layer vapour conductances \[mol m⁻² s⁻¹\].
    #[must_use]
    pub fn vapour_total_mol_m2_s(&self) -> f64 {
        self.upper.vapour_mol_m2_s + self.lower.vapour_mol_m2_s
    }
}

/// Conditions of the flow round a leaf that do not change while its temperature is solved.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FlowConditions {
    /// Free-stream air speed \[m s⁻¹\].
    pub speed_m_s: f64,
    /// Leaf characteristic dimension along the wind \[m\].
    pub dimension_m: f64,
    /// Free-stream turbulence enhancement of forced convection \[–\].
    pub turbulence_factor: f64,
    /// Transition Reynolds number \[–\].
    pub critical_reynolds: f64,
    /// Free-convection length A_s/P \[m\].
    pub free_length_m: f64,
}

/// Heat and vapour boundary-layer conductances of both faces of a flat leaf.
///
/// - `props`: air properties at the film temperature; `flow`: see [`FlowConditions`];
/// - `leaf_air_diff_k`: leaf minus air temperature \[K\] (drives free convection).
///
/// Each face: h_F = f_t k Nu_F / d with [`forced_nusselt`] (f_t the turbulence factor, \[CN98\] ch. 7);
/// h_N = k Nu_N / L with [`free_nusselt`], L = A_s/P (d/4 for a square leaf); h = (h_F³ + h_N³)^{1/3} ([`mixed_nusselt`] applied to
/// conductances, which is the same blend when both use one length). Vapour: the same with Sc for Pr
/// and D_v for k, converted to molar units with the air's molar density: g_bv = Sh D_v c / L
/// (\[CN98\] ch. 6–7). Buoyancy from humidity differences is neglected.
#[must_use]
pub fn leaf_convection(
    props: &AirProperties,
    flow: &FlowConditions,
    leaf_air_diff_k: f64,
) -> LeafConvection {
    let nu = props.kinematic_viscosity_m2_s;
    let d = flow.dimension_m;
    let free_length = flow.free_length_m;
    let re = reynolds(flow.speed_m_s, d, nu);
    let nu_f = flow.turbulence_factor * forced_nusselt(re, props.prandtl, flow.critical_reynolds);
    // Same correlation with Sc: only the Pr^{1/3} factor differs.
    let sh_f = nu_f * cube_root(props.schmidt / props.prandtl);
    let gr_free = grashof(leaf_air_diff_k, props.temp_k, free_length, nu);
    let k = props.thermal_conductivity_w_m_k;
    let dv_c = props.vapour_diffusivity_m2_s * props.molar_density_mol_m3;
    let h_forced = k * nu_f / d;
    let g_forced = dv_c * sh_f / d;
    let face = |upper: bool| {
        let side = PlateSide::of_face(upper, leaf_air_diff_k);
        let (nu_n, n_eff) = free_nusselt_with_exponent(gr_free * props.prandtl, side);
        let sh_n = free_nusselt(gr_free * props.schmidt, side);
        let h_free = k * nu_n / free_length;
        let g_free = dv_c * sh_n / free_length;
        FaceConductance {
            heat_w_m2_k: mixed_nusselt(h_forced, h_free),
            vapour_mol_m2_s: mixed_nusselt(g_forced, g_free),
            vapour_free_mol_m2_s: g_free,
            nusselt_forced: nu_f,
            nusselt_free: nu_n,
            heat_free_w_m2_k: h_free,
            free_exponent: n_eff,
        }
    };
    let gr_d = gr_free * (d / free_length).powi(3);
    LeafConvection {
        upper: face(true),
        lower: face(false),
        reynolds: re,
        grashof: gr_d,
        regime: Regime::classify(re, gr_d, props.prandtl, flow.critical_reynolds),
    }
}

/// The local exponent d ln Nu / d ln Ra of [`free_nusselt`] \[–\] (so h_N ∝ |ΔT|^n locally):
/// n (1 − (Nu_c/Nu)^{1/n}) for the blended law of exponent n — 0 in the conduction limit, n at
/// large Ra.
#[must_use]
pub fn free_exponent(rayleigh: f64, side: PlateSide) -> f64 {
    free_nusselt_with_exponent(rayleigh, side).1
}

/// [`free_nusselt`] and [`free_exponent`] together (one evaluation).
#[must_use]
pub fn free_nusselt_with_exponent(rayleigh: f64, side: PlateSide) -> (f64, f64) {
    let (n, inverse) = match side {
        PlateSide::Unstable if rayleigh > UNSTABLE_BRANCH_CROSSING_RA => (1.0 / 3.0, 3),
        PlateSide::Unstable => (0.25, 4),
        PlateSide::Stable => (0.2, 5),
    };
    let nu = free_nusselt(rayleigh, side);
    let ratio = CONDUCTION_NUSSELT_PER_FACE / nu;
    (nu, n * (1.0 - ratio.powi(inverse)))
}

impl FaceConductance {
    /// d(h ΔT)/dΔT \[W m⁻² K⁻¹\] at fixed air properties: h + n h_N³/h² for the blend
    /// h = (h_F³ + h_N³)^{1/3} with h_N ∝ |ΔT|^n.
    #[must_use]
    pub fn sensible_slope_w_m2_k(&self) -> f64 {
        let h = self.heat_w_m2_k;
        if h <= 0.0 {
            return 0.0;
        }
        h + self.free_exponent * self.heat_free_w_m2_k.powi(3) / (h * h)
    }

    /// d(g_bv)/dΔT \[mol m⁻² s⁻¹ K⁻¹\] at fixed air properties: n g_N³/(g² ΔT) for the blend
    /// g = (g_F³ + g_N³)^{1/3} with g_N ∝ |ΔT|^n; 0 at ΔT = 0 (where it is unbounded).
    #[must_use]
    pub fn vapour_slope_mol_m2_s_k(&self, leaf_air_diff_k: f64) -> f64 {
        let g = self.vapour_mol_m2_s;
        if g <= 0.0 || leaf_air_diff_k.abs() < 1e-6 {
            return 0.0;
        }
        self.free_exponent * self.vapour_free_mol_m2_s.powi(3) / (g * g * leaf_air_diff_k)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn forced_nusselt_is_continuous_at_transition() {
        let rc = 5.0e5;
        let below = forced_nusselt(rc, 0.71, rc);
        let above = forced_nusselt(rc * (1.0 + 1e-12), 0.71, rc);
        assert!((below - above).abs() < 1e-6 * below);
    }

    #[test]
    fn blend_reduces_to_either_part() {
        assert!((mixed_nusselt(10.0, 0.0) - 10.0).abs() < 1e-12);
        assert!((mixed_nusselt(0.0, 7.0) - 7.0).abs() < 1e-12);
        assert!(mixed_nusselt(10.0, 7.0) > 10.0);
    }

    #[test]
    fn faces_swap_roles_with_the_sign_of_the_difference() {
        assert_eq!(PlateSide::of_face(true, 2.0), PlateSide::Unstable);
        assert_eq!(PlateSide::of_face(false, 2.0), PlateSide::Stable);
        assert_eq!(PlateSide::of_face(true, -2.0), PlateSide::Stable);
        assert_eq!(PlateSide::of_face(false, -2.0), PlateSide::Unstable);
    }

    #[test]
    fn free_nusselt_blend_keeps_the_correlations_above_ra_1e3() {
        for ra in [1.0e3, 1.0e4, 1.0e5, 1.0e6] {
            let u = free_nusselt(ra, PlateSide::Unstable) / (0.54 * ra.powf(0.25));
            let s = free_nusselt(ra, PlateSide::Stable) / (0.52 * ra.powf(0.2));
            assert!(
                (u - 1.0).abs() < 1e-3 && (s - 1.0).abs() < 1e-3,
                "{ra}: {u} {s}"
            );
        }
        let big = 1.0e9;
        assert!((free_nusselt(big, PlateSide::Unstable) / (0.15 * big.cbrt()) - 1.0).abs() < 1e-6);
    }

    #[test]
    fn free_nusselt_is_continuous_where_branches_cross() {
        let cross = (0.54f64 / 0.15).powi(12);
        let a = free_nusselt(cross * (1.0 - 1e-9), PlateSide::Unstable);
        let b = free_nusselt(cross * (1.0 + 1e-9), PlateSide::Unstable);
        assert!((a - b).abs() < 1e-5 * a);
    }

    #[test]
    fn regime_labels() {
        assert_eq!(
            Regime::classify(1000.0, 1.0, 0.71, 5e5).label(),
            "forced-laminar"
        );
        assert_eq!(
            Regime::classify(1000.0, 1.0e6, 0.71, 5e5).label(),
            "mixed-laminar"
        );
        assert_eq!(
            Regime::classify(0.0, 1.0e3, 0.71, 5e5).label(),
            "free-laminar"
        );
        assert_eq!(
            Regime::classify(1.0e6, 1.0, 0.71, 5e5).label(),
            "forced-turbulent"
        );
    }
}

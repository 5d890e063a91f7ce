//! A canopy in layers: beam and diffuse light through leaves of a given angle distribution, sunlit
//! and shaded leaves in each layer, the wind falling off into the canopy, and each layer's sunlit
//! and shaded leaf solved with the single-leaf engine ([`crate::energy_balance`]).
//!
//! Per layer i of n (equal leaf-area increments ΔL = L/n, uniform leaf area density with height):
//!
//! - cumulative leaf area above the layer's middle L_i = (i + ½) ΔL, height z_i = h (1 − (i + ½)/n);
//! - the layer's sunlit fraction is the layer mean of exp(−K_b L) (\[CN98\] eq. 15.21's integrand);
//! - sunlit leaves absorb the direct beam a K_b S_b plus what the shaded leaves absorb; shaded
//!   leaves absorb diffuse sky light and, if `scattering` is on, the scattered beam (\[dPF97\]);
//! - the air speed is u(z) = u_h exp(a (z/h − 1)) (\[Cionco\]);
//! - longwave (a simplification of this engine): the upper face sees the sky (or cover) through the
//!   gaps above, a fraction τ = exp(−K_d,black L_i) of its hemisphere, and leaves at air temperature
//!   over the rest; the lower face sees leaves and ground at air temperature. The top layer of a thin
//!   canopy thus sees the sky exactly as the single leaf does.
//! - each leaf is handed to the single-leaf engine as a [`LeafCase`] with ground albedo 0 and
//!   shortwave = (absorbed per leaf area) / a, so that the engine's a · S · (1 + 0) is exactly the
//!   canopy model's absorbed shortwave (above 1400 W m⁻², the top of the engine's range for one
//!   face, the excess is passed as the lower face's share through the ground albedo; the product
//!   is the same); the rest of the leaf balance is the engine's.
//!
//! Single broadband shortwave with the leaf's own absorptivity (the engine's [`Leaf::absorptivity`],
//! default 0.5); no separate PAR and near-infrared bands; no reflection from the soil back into the
//! canopy; leaves in each layer at one temperature per class (sunlit, shaded); no clumping.
//!
//! # References
//! - \[CN98\] Campbell, G. S., Norman, J. M. (1998). *An Introduction to Environmental Biophysics*,
//!   2nd ed. Springer. Ch. 15: eq. 15.4 (ellipsoidal extinction coefficient, after Campbell 1986,
//!   *Agric. For. Meteorol.* 36, 317–321), eq. 15.5 (diffuse transmittance as the hemispheric
//!   integral of beam transmittance), eq. 15.21 (sunlit leaf area index); equation numbers from
//!   memory.
//! - \[dPF97\] de Pury, D. G. G., Farquhar, G. D. (1997). Simple scaling of photosynthesis from leaves
//!   to canopies without the errors of big-leaf models. *Plant, Cell and Environment* 20, 537–557.
//!   Appendix eqs. A19–A20 and eqs. 18–20 (absorbed diffuse, total beam, direct beam and scattered
//!   beam per unit leaf area; canopy reflection coefficients; from memory).
//! - \[Cionco\] Cionco, R. M. (1965). A mathematical model for air flow in a vegetative canopy.
//!   *Journal of Applied Meteorology* 4, 517–522 (the exponential wind profile; the attenuation
//!   coefficient of crops is about 1 to 4, \[CN98\] ch. 5 — from memory).

use crate::case::{Air, Leaf, LeafCase, Surroundings};
use crate::constants::ZERO_CELSIUS_K;
use crate::convection::CRITICAL_REYNOLDS_DEFAULT;
use crate::energy_balance::{BalanceTerms, PreparedLeaf};
use crate::error::{PhysicsError, Result, ValidRange};
use crate::radiation::{SHORTWAVE_RANGE_W_M2, UpperView};
use crate::required_wind::SpeedSearch;
use crate::sun::HorizontalShortwave;

/// Valid leaf area indices \[m² leaf m⁻² ground\].
pub const LAI_RANGE: ValidRange = ValidRange {
    quantity: "leaf area index",
    min: 0.0,
    max: 15.0,
    unit: "m²/m²",
};

/// Valid canopy heights \[m\].
pub const CANOPY_HEIGHT_RANGE_M: ValidRange = ValidRange {
    quantity: "canopy height",
    min: 0.01,
    max: 50.0,
    unit: "m",
};

/// Valid numbers of layers.
pub const LAYER_COUNT_RANGE: ValidRange = ValidRange {
    quantity: "number of canopy layers",
    min: 1.0,
    max: 200.0,
    unit: "",
};

/// Valid ellipsoidal leaf-angle parameters x \[–\] (0 vertical, 1 spherical, large horizontal).
pub const LEAF_ANGLE_X_RANGE: ValidRange = ValidRange {
    quantity: "leaf angle parameter x",
    min: 0.0,
    max: 1000.0,
    unit: "",
};

/// Valid wind attenuation coefficients a \[–\].
pub const WIND_ATTENUATION_RANGE: ValidRange = ValidRange {
    quantity: "wind attenuation coefficient",
    min: 0.0,
    max: 8.0,
    unit: "",
};

/// Default wind attenuation coefficient a \[–\]: 2.5, mid-range of the values for crops (about 1 to
/// 4; \[Cionco\], \[CN98\] ch. 5 — from memory).
pub const WIND_ATTENUATION_DEFAULT: f64 = 2.5;

/// Valid sun elevations \[rad\].
pub const ELEVATION_RANGE_RAD: ValidRange = ValidRange {
    quantity: "sun elevation",
    min: -std::f64::consts::FRAC_PI_2,
    max: std::f64::consts::FRAC_PI_2,
    unit: "rad",
};

/// Sine of the sun elevation below which the beam is ignored (about 0.06°).
const MIN_SIN_ELEVATION: f64 = 1e-3;

/// How the leaves are inclined.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum LeafAngle {
    /// Spherical (random) distribution: K_b = 0.5 / sin β exactly (\[CN98\] ch. 15).
    Spherical,
    /// All leaves horizontal: K_b = 1 for every sun angle.
    Horizontal,
    /// Ellipsoidal distribution with ratio x of horizontal to vertical semi-axes (\[CN98\] eq. 15.4).
    Ellipsoidal(f64),
}

/// Beam extinction coefficient K_b \[–\] for the sun at zenith angle ψ.
///
/// - `leaf_angle`; `zenith_rad` ψ \[rad\], 0 ≤ ψ < π/2.
/// - Returns K_b = G(ψ)/cos ψ (the leaf area shadow on a horizontal plane per unit leaf area).
///
/// Ellipsoidal (\[CN98\] eq. 15.4, Campbell 1986):
/// K_b = √(x² + tan² ψ) / (x + 1.774 (x + 1.182)^−0.733), which at x = 1 is within 0.1 % of the
/// exact spherical 0.5/cos ψ and at x = 0 within 0.1 % of the vertical 2 tan ψ / π.
///
/// ```
/// use leafwind_physics::canopy::{LeafAngle, beam_extinction};
/// // [CN98] ch. 15: spherical leaves, sun 30° above the horizon (ψ = 60°) → K_b = 1.0.
/// let k = beam_extinction(LeafAngle::Spherical, 60f64.to_radians());
/// assert!((k - 1.0).abs() < 1e-12);
/// ```
#[must_use]
pub fn beam_extinction(leaf_angle: LeafAngle, zenith_rad: f64) -> f64 {
    let cos_z = zenith_rad.cos().max(MIN_SIN_ELEVATION);
    match leaf_angle {
        LeafAngle::Spherical => 0.5 / cos_z,
        LeafAngle::Horizontal => 1.0,
        LeafAngle::Ellipsoidal(x) => {
            let sin_z = (1.0 - cos_z * cos_z).max(0.0).sqrt();
            let tan_z = sin_z / cos_z;
            (x * x + tan_z * tan_z).sqrt() / (x + 1.774 * (x + 1.182).powf(-0.733)) // eq. 15.4 of [CN98]
        }
    }
}

/// Number of Simpson intervals over the hemisphere.
const HEMISPHERE_INTERVALS: usize = 200;

/// Hemispheric mean 2∫₀¹ f(μ) μ dμ with μ = cos ψ, by composite Simpson in t with μ = t² (points
/// crowd toward the horizon, where the transmittance of a thin canopy changes fastest).
fn hemisphere_mean(mut f: impl FnMut(f64) -> f64) -> f64 {
    let n = HEMISPHERE_INTERVALS;
    let h = 1.0 / n as f64;
    let mut sum = 0.0;
    for i in 1..=n {
        let t = i as f64 * h;
        let mu = t * t;
        let w = if i == n {
            1.0
        } else if i % 2 == 1 {
            4.0
        } else {
            2.0
        };
        sum += w * f(mu) * mu * 2.0 * t; // dμ = 2t dt; the integrand vanishes at t = 0
    }
    2.0 * sum * h / 3.0
}

/// Transmittance of the canopy to uniform-overcast diffuse light τ_d \[–\] (\[CN98\] eq. 15.5).
///
/// τ_d = 2 ∫₀^{π/2} exp(−√a K_b(ψ) L) sin ψ cos ψ dψ, integrated numerically (Simpson, 200 steps in
/// √cos ψ).
///
/// - `lai` L \[m² m⁻²\]; `absorptivity` a \[–\] (1 for black leaves; √a is the scattering
///   correction of \[CN98\] ch. 15 / \[dPF97\]).
#[must_use]
pub fn diffuse_transmittance(leaf_angle: LeafAngle, lai: f64, absorptivity: f64) -> f64 {
    let sa = absorptivity.max(0.0).sqrt();
    if let LeafAngle::Horizontal = leaf_angle {
        return (-sa * lai).exp();
    }
    hemisphere_mean(|mu| (-sa * beam_extinction(leaf_angle, mu.acos()) * lai).exp())
}

/// Diffuse extinction coefficient K_d = −ln τ_d / L \[–\] for a canopy of leaf area index `lai`
/// (\[CN98\] ch. 15). For L → 0 it tends to the hemispheric mean of √a K_b, which is used below
/// L = 10⁻³ (the two differ by O(L) there).
#[must_use]
pub fn diffuse_extinction(leaf_angle: LeafAngle, lai: f64, absorptivity: f64) -> f64 {
    if lai < 1e-3 {
        let sa = absorptivity.max(0.0).sqrt();
        return sa * hemisphere_mean(|mu| beam_extinction(leaf_angle, mu.acos()));
    }
    -diffuse_transmittance(leaf_angle, lai, absorptivity).ln() / lai
}

/// Beer's-law fraction of leaves in the sun at cumulative leaf area index L above them:
/// exp(−K_b L) (\[CN98\] ch. 15, the probability of a sunfleck).
#[must_use]
pub fn sunlit_fraction_at(beam_extinction: f64, lai_above: f64) -> f64 {
    (-beam_extinction * lai_above).exp()
}

/// Mean sunlit fraction of a layer between cumulative leaf area indices `lai_top` and `lai_bottom`:
/// (e^{−K L₁} − e^{−K L₂}) / (K (L₂ − L₁)), the layer mean of [`sunlit_fraction_at`]; e^{−K L₁} for a
/// layer of no thickness.
#[must_use]
pub fn layer_sunlit_fraction(beam_extinction: f64, lai_top: f64, lai_bottom: f64) -> f64 {
    let dl = lai_bottom - lai_top;
    let x = beam_extinction * dl;
    if x.abs() < 1e-9 {
        return sunlit_fraction_at(beam_extinction, lai_top);
    }
    (sunlit_fraction_at(beam_extinction, lai_top) - sunlit_fraction_at(beam_extinction, lai_bottom))
        / x
}

/// Sunlit leaf area index of a whole canopy L_sun = (1 − e^{−K_b L}) / K_b \[m² m⁻²\]
/// (\[CN98\] eq. 15.21).
#[must_use]
pub fn sunlit_lai(beam_extinction: f64, lai: f64) -> f64 {
    if beam_extinction * lai < 1e-12 {
        return lai;
    }
    (1.0 - (-beam_extinction * lai).exp()) / beam_extinction
}

/// Air speed in the canopy \[m s⁻¹\]: u(z) = u_h exp(a (z/h − 1)) (\[Cionco\]).
///
/// - `top_speed_m_s` u_h at the canopy top \[m s⁻¹\]; `height_ratio` z/h \[–\], 0–1;
///   `attenuation` a \[–\].
///
/// ```
/// // [Cionco]: at mid-height of a canopy with a = 2, u = u_h e^{−1}.
/// let u = leafwind_physics::canopy::wind_in_canopy_m_s(2.0, 0.5, 2.0);
/// assert!((u - 2.0 * (-1.0f64).exp()).abs() < 1e-12);
/// ```
#[must_use]
pub fn wind_in_canopy_m_s(top_speed_m_s: f64, height_ratio: f64, attenuation: f64) -> f64 {
    top_speed_m_s * (attenuation * (height_ratio.clamp(0.0, 1.0) - 1.0)).exp() // [Cionco]
}

/// Canopy reflection coefficient of a deep canopy of horizontal leaves ρ_h = (1 − √a)/(1 + √a) \[–\]
/// (\[dPF97\] eq. A20; \[CN98\] ch. 15).
#[must_use]
pub fn horizontal_leaf_reflection(absorptivity: f64) -> f64 {
    let sa = absorptivity.clamp(0.0, 1.0).sqrt();
    (1.0 - sa) / (1.0 + sa)
}

/// Canopy beam reflection coefficient ρ_cb = 1 − exp(−2 ρ_h K_b / (1 + K_b)) \[–\] (\[dPF97\] eq. A19).
#[must_use]
pub fn beam_reflection(absorptivity: f64, beam_extinction: f64) -> f64 {
    let rho_h = horizontal_leaf_reflection(absorptivity);
    1.0 - (-2.0 * rho_h * beam_extinction / (1.0 + beam_extinction)).exp()
}

/// The structure of a canopy.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct CanopyStructure {
    /// Leaf area index L \[m² leaf m⁻² ground\].
    pub lai: f64,
    /// Canopy height h \[m\].
    pub height_m: f64,
    /// Number of layers n.
    pub layers: usize,
    /// Leaf-angle distribution.
    pub leaf_angle: LeafAngle,
    /// Wind attenuation coefficient a \[–\].
    pub wind_attenuation: f64,
    /// Whether shaded leaves also get the beam scattered by other leaves (\[dPF97\]); off, leaves
    /// absorb only what they intercept directly (a black-canopy approximation).
    pub scattering: bool,
}

impl Default for CanopyStructure {
    /// An invented greenhouse tomato-like crop: L = 3, h = 2 m, 20 layers, spherical leaves.
    fn default() -> Self {
        Self {
            lai: 3.0,
            height_m: 2.0,
            layers: 20,
            leaf_angle: LeafAngle::Spherical,
            wind_attenuation: WIND_ATTENUATION_DEFAULT,
            scattering: true,
        }
    }
}

impl CanopyStructure {
    /// Checks every field.
    ///
    /// # Errors
    /// The first field out of range.
    pub fn validate(&self) -> Result<()> {
        LAI_RANGE.check(self.lai)?;
        CANOPY_HEIGHT_RANGE_M.check(self.height_m)?;
        LAYER_COUNT_RANGE.check(self.layers as f64)?;
        if let LeafAngle::Ellipsoidal(x) = self.leaf_angle {
            LEAF_ANGLE_X_RANGE.check(x)?;
        }
        WIND_ATTENUATION_RANGE.check(self.wind_attenuation)?;
        Ok(())
    }
}

/// Light above the canopy.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct CanopyLight {
    /// Sun elevation β \[rad\].
    pub sun_elevation_rad: f64,
    /// Beam and diffuse irradiance on a horizontal surface above the canopy \[W m⁻²\].
    pub shortwave: HorizontalShortwave,
}

impl CanopyLight {
    /// Checks the elevation and both irradiances.
    ///
    /// # Errors
    /// A value out of range.
    pub fn validate(&self) -> Result<()> {
        ELEVATION_RANGE_RAD.check(self.sun_elevation_rad)?;
        ValidRange {
            quantity: "beam sunlight on the horizontal",
            ..SHORTWAVE_RANGE_W_M2
        }
        .check(self.shortwave.beam_w_m2)?;
        ValidRange {
            quantity: "diffuse sunlight on the horizontal",
            ..SHORTWAVE_RANGE_W_M2
        }
        .check(self.shortwave.diffuse_w_m2)?;
        // The beam on the horizontal is the beam normal to the sun times sin β; the normal beam
        // cannot exceed the top of the range (the solar constant is 1361 W m⁻²).
        let most = SHORTWAVE_RANGE_W_M2.max * self.sun_elevation_rad.sin().max(0.0);
        if self.shortwave.beam_w_m2 > most + 1e-9 {
            return Err(PhysicsError::Inconsistent(format!(
                "a beam of {:.0} W/m² on the horizontal with the sun {:.1}° high would need more than {:.0} W/m² normal to the sun; lower the beam or raise the sun",
                self.shortwave.beam_w_m2,
                self.sun_elevation_rad.to_degrees(),
                SHORTWAVE_RANGE_W_M2.max
            )));
        }
        Ok(())
    }
}

/// One canopy case: the air at the canopy top, the leaves, what is above, the light and the structure.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct CanopyCase {
    /// Air at the canopy top; `speed_m_s` is the canopy-top air speed u_h. The air temperature and
    /// humidity are taken as uniform through the canopy.
    pub air: Air,
    /// The leaves (all alike).
    pub leaf: Leaf,
    /// What the top of the canopy sees for longwave: sky or cover.
    pub upper_view: UpperView,
    /// Sun and light above the canopy.
    pub light: CanopyLight,
    /// The canopy structure.
    pub structure: CanopyStructure,
    /// Transition Reynolds number of the leaf correlations \[–\].
    pub critical_reynolds: f64,
    /// Leaf (tissue) temperature limit for the hottest-leaf margin \[°C\], if any.
    pub limit_c: Option<f64>,
}

impl Default for CanopyCase {
    fn default() -> Self {
        Self {
            air: Air::default(),
            leaf: Leaf::default(),
            upper_view: UpperView::ClearSky,
            light: CanopyLight {
                sun_elevation_rad: 60f64.to_radians(),
                shortwave: HorizontalShortwave {
                    beam_w_m2: 700.0,
                    diffuse_w_m2: 100.0,
                },
            },
            structure: CanopyStructure::default(),
            critical_reynolds: CRITICAL_REYNOLDS_DEFAULT,
            limit_c: None,
        }
    }
}

impl CanopyCase {
    /// The same case at another canopy-top air speed \[m s⁻¹\].
    #[must_use]
    pub fn with_top_speed(mut self, speed_m_s: f64) -> Self {
        self.air.speed_m_s = speed_m_s;
        self
    }

    /// The single-leaf case at the canopy top: this air, leaf and upper view, the given shortwave on
    /// the upper face \[W m⁻²\], and a black ground at air temperature.
    #[must_use]
    pub fn top_leaf_case(&self, shortwave_w_m2: f64) -> LeafCase {
        LeafCase {
            air: self.air,
            leaf: self.leaf,
            surroundings: Surroundings {
                shortwave_w_m2,
                ground_albedo: 0.0,
                upper_view: self.upper_view,
                ground_temp_c: None,
            },
            critical_reynolds: self.critical_reynolds,
        }
    }

    /// Checks every input.
    ///
    /// # Errors
    /// The first input out of range, named.
    pub fn validate(&self) -> Result<()> {
        self.top_leaf_case(0.0).validate()?;
        self.structure.validate()?;
        self.light.validate()?;
        if let Some(l) = self.limit_c {
            crate::required_wind::LIMIT_RANGE_C.check(l)?;
        }
        Ok(())
    }
}

/// The optical constants of a canopy that do not depend on the sun: computed once per structure and
/// leaf absorptivity and reused over a day or a year.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct CanopyOptics {
    /// Leaf-angle distribution.
    pub leaf_angle: LeafAngle,
    /// Leaf absorptivity a \[–\].
    pub absorptivity: f64,
    /// Diffuse extinction coefficient for black leaves (used for the longwave sky view) \[–\].
    pub diffuse_extinction_black: f64,
    /// Diffuse extinction coefficient with scattering, √a included \[–\].
    pub diffuse_extinction_scattering: f64,
    /// Canopy reflection coefficient for diffuse light ρ_cd: hemispheric mean of ρ_cb \[–\].
    pub diffuse_reflection: f64,
}

impl CanopyOptics {
    /// Optics of `structure` with leaves of shortwave absorptivity `absorptivity`.
    #[must_use]
    pub fn new(structure: &CanopyStructure, absorptivity: f64) -> Self {
        let a = absorptivity.clamp(0.0, 1.0);
        let la = structure.leaf_angle;
        let rho_cd = hemisphere_mean(|mu| beam_reflection(a, beam_extinction(la, mu.acos())));
        Self {
            leaf_angle: la,
            absorptivity: a,
            diffuse_extinction_black: diffuse_extinction(la, structure.lai, 1.0),
            diffuse_extinction_scattering: diffuse_extinction(la, structure.lai, a),
            diffuse_reflection: rho_cd,
        }
    }
}

/// Shortwave absorbed per unit leaf area (both faces) by sunlit and shaded leaves at cumulative leaf
/// area index `lai` \[W m⁻²\].
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct AbsorbedShortwave {
    /// By a sunlit leaf \[W m⁻²\].
    pub sunlit_w_m2: f64,
    /// By a shaded leaf \[W m⁻²\].
    pub shaded_w_m2: f64,
}

/// Shortwave absorbed by sunlit and shaded leaves at depth `lai` \[m² m⁻²\].
///
/// With scattering (\[dPF97\] eqs. 18–20, from memory), K_b′ = √a K_b, K_d′ from
/// [`CanopyOptics`]:
/// - diffuse: (1 − ρ_cd) K_d′ S_d exp(−K_d′ L);
/// - scattered beam: S_b \[(1 − ρ_cb) K_b′ exp(−K_b′ L) − a K_b exp(−K_b L)\] (≥ 0);
/// - direct beam on a sunlit leaf: a K_b S_b;
/// - shaded = diffuse + scattered; sunlit = shaded + direct.
///
/// Without scattering: shaded = a K_d S_d exp(−K_d L) (black-leaf K_d), sunlit = shaded + a K_b S_b.
/// S_b, S_d are the beam and diffuse irradiances on a horizontal surface above the canopy.
#[must_use]
pub fn absorbed_shortwave(
    optics: &CanopyOptics,
    scattering: bool,
    beam_extinction: f64,
    light: &HorizontalShortwave,
    lai: f64,
) -> AbsorbedShortwave {
    let a = optics.absorptivity;
    let kb = beam_extinction;
    let (sb, sd) = (light.beam_w_m2, light.diffuse_w_m2);
    let direct = a * kb * sb; // [dPF97] eq. 20b: (1 − σ) k_b I_b
    let shaded = if scattering {
        let sa = a.sqrt();
        let kbp = kb * sa;
        let kdp = optics.diffuse_extinction_scattering;
        let rho_cb = beam_reflection(a, kb);
        let diffuse = (1.0 - optics.diffuse_reflection) * kdp * sd * (-kdp * lai).exp(); // [dPF97] eq. 20a
        let scattered = (sb
            * ((1.0 - rho_cb) * kbp * (-kbp * lai).exp() - a * kb * (-kb * lai).exp()))
        .max(0.0); // [dPF97] eq. 20c
        diffuse + scattered
    } else {
        let kd = optics.diffuse_extinction_black;
        a * kd * sd * (-kd * lai).exp()
    };
    AbsorbedShortwave {
        sunlit_w_m2: shaded + direct,
        shaded_w_m2: shaded,
    }
}

/// One layer's result.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct LayerResult {
    /// Height of the layer's middle above the ground \[m\].
    pub height_m: f64,
    /// Cumulative leaf area index above the layer's middle \[m² m⁻²\].
    pub lai_above: f64,
    /// Leaf area index of the layer \[m² m⁻²\].
    pub lai_layer: f64,
    /// Fraction of the layer's leaf area in the sun \[–\].
    pub sunlit_fraction: f64,
    /// Air speed at the layer's middle \[m s⁻¹\].
    pub air_speed_m_s: f64,
    /// Fraction of the upper hemisphere that is sky (or cover) for longwave \[–\].
    pub sky_view_fraction: f64,
    /// Shortwave absorbed by a sunlit leaf, both faces, per leaf area \[W m⁻²\].
    pub absorbed_shortwave_sunlit_w_m2: f64,
    /// Shortwave absorbed by a shaded leaf, both faces, per leaf area \[W m⁻²\].
    pub absorbed_shortwave_shaded_w_m2: f64,
    /// Sunlit leaf temperature \[°C\]; None when no leaf of the layer is in the sun.
    pub sunlit_leaf_temp_c: Option<f64>,
    /// Shaded leaf temperature \[°C\].
    pub shaded_leaf_temp_c: f64,
    /// Sensible heat from the layer's leaves to the air, per ground area \[W m⁻²\].
    pub sensible_w_m2: f64,
    /// Latent heat of the layer's transpiration, per ground area \[W m⁻²\].
    pub latent_w_m2: f64,
    /// Transpiration of the layer, per ground area \[mol m⁻² s⁻¹\].
    pub transpiration_mol_m2_s: f64,
}

/// The hottest leaf of the canopy.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct HottestLeaf {
    /// Layer index counted from the top (0 = top layer).
    pub layer: usize,
    /// Whether it is a sunlit (true) or a shaded (false) leaf.
    pub sunlit: bool,
    /// Its temperature \[°C\].
    pub leaf_temp_c: f64,
    /// Height of its layer \[m\].
    pub height_m: f64,
    /// Limit minus its temperature \[K\] (positive: below the limit); None without a limit.
    pub margin_k: Option<f64>,
}

/// The solved canopy. Fluxes "per ground area" are sums over layers of leaf fluxes × layer LAI.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct CanopySolution {
    /// Layers from the top down.
    pub layers: Vec<LayerResult>,
    /// The hottest leaf.
    pub hottest: HottestLeaf,
    /// Air temperature (uniform) \[°C\].
    pub air_temp_c: f64,
    /// Beam extinction coefficient K_b \[–\] (0 with the sun down).
    pub beam_extinction: f64,
    /// Sunlit leaf area index of the canopy \[m² m⁻²\].
    pub sunlit_lai: f64,
    /// Shortwave absorbed by the canopy per ground area \[W m⁻²\].
    pub absorbed_shortwave_w_m2: f64,
    /// Shortwave reaching the ground under the canopy \[W m⁻²\].
    pub ground_shortwave_w_m2: f64,
    /// Shortwave reflected by the canopy (scattering on; 0 without) \[W m⁻²\].
    pub reflected_shortwave_w_m2: f64,
    /// Sensible heat from the canopy to the air per ground area \[W m⁻²\].
    pub sensible_w_m2: f64,
    /// Latent heat of the canopy's transpiration per ground area \[W m⁻²\].
    pub latent_w_m2: f64,
    /// Transpiration per ground area \[mol m⁻² s⁻¹\].
    pub transpiration_mol_m2_s: f64,
    /// Largest |residual| of all leaf balances \[W m⁻²\].
    pub max_residual_w_m2: f64,
}

/// Solves a canopy case.
///
/// # Errors
/// An invalid input (named) or a leaf balance that could not be bracketed.
///
/// ```
/// use leafwind_physics::canopy::{CanopyCase, solve_canopy};
/// let s = solve_canopy(&CanopyCase::default()).unwrap();
/// assert_eq!(s.layers.len(), 20);
/// assert!(s.hottest.sunlit && s.hottest.leaf_temp_c.is_finite());
/// ```
pub fn solve_canopy(case: &CanopyCase) -> Result<CanopySolution> {
    case.validate()?;
    let optics = CanopyOptics::new(&case.structure, case.leaf.absorptivity);
    solve_with_optics(case, &optics)
}

/// As [`solve_canopy`] with precomputed optics (they must belong to `case.structure` and
/// `case.leaf.absorptivity`); validates the case.
///
/// # Errors
/// As [`solve_canopy`].
pub fn solve_with_optics(case: &CanopyCase, optics: &CanopyOptics) -> Result<CanopySolution> {
    case.validate()?;
    let st = &case.structure;
    let n = st.layers;
    let dl = st.lai / n as f64;
    let sin_b = case.light.sun_elevation_rad.sin();
    let sun_up = sin_b > MIN_SIN_ELEVATION;
    let mut light = case.light.shortwave;
    if !sun_up {
        // The beam cannot arrive with the sun down; its energy is counted as diffuse.
        light = HorizontalShortwave {
            beam_w_m2: 0.0,
            diffuse_w_m2: light.global_w_m2(),
        };
    }
    let kb = if sun_up {
        beam_extinction(
            st.leaf_angle,
            std::f64::consts::FRAC_PI_2 - case.light.sun_elevation_rad,
        )
    } else {
        0.0
    };
    let has_beam = sun_up && light.beam_w_m2 > 0.0;
    let a = optics.absorptivity;
    let e_a = case.air.humidity.vapour_pressure_kpa(case.air.temp_c)?;
    let t_air_k = case.air.temp_c + ZERO_CELSIUS_K;
    let t_above_k = case.upper_view.radiant_temp_k(e_a, t_air_k);
    let sky4 = t_above_k.powi(4);
    let air4 = t_air_k.powi(4);

    let mut layers = Vec::with_capacity(n);
    let mut hottest: Option<HottestLeaf> = None;
    let mut guess_sun = f64::NAN;
    let mut guess_shade = f64::NAN;
    let mut max_res: f64 = 0.0;
    let (mut abs_sw, mut sens, mut lat, mut transp) = (0.0, 0.0, 0.0, 0.0);
    for i in 0..n {
        let l_top = i as f64 * dl;
        let l_mid = l_top + 0.5 * dl;
        let ratio = 1.0 - (i as f64 + 0.5) / n as f64;
        let height = st.height_m * ratio;
        let speed = wind_in_canopy_m_s(case.air.speed_m_s, ratio, st.wind_attenuation);
        let f_sun = if has_beam {
            layer_sunlit_fraction(kb, l_top, l_top + dl)
        } else {
            0.0
        };
        let sky = (-optics.diffuse_extinction_black * l_mid).exp();
        let above_k = (sky * sky4 + (1.0 - sky) * air4).sqrt().sqrt();
        let view = match case.upper_view {
            _ if i == 0 && l_mid == 0.0 => case.upper_view,
            UpperView::CoverTempC(_) => UpperView::CoverTempC(above_k - ZERO_CELSIUS_K),
            _ => UpperView::SkyTempC(above_k - ZERO_CELSIUS_K),
        };
        let sw = absorbed_shortwave(optics, st.scattering, kb, &light, l_mid);
        let leaf_at = |absorbed: f64| -> LeafCase {
            let incident = if a > 0.0 { absorbed / a } else { 0.0 };
            // The engine absorbs a · S · (1 + ρ_g); light beyond the upper face's range is handed
            // over as the lower face's share (the product, the only use of S and ρ_g, is exact).
            let upper = incident.min(SHORTWAVE_RANGE_W_M2.max);
            let mut c = case.top_leaf_case(upper);
            if upper > 0.0 && incident > upper {
                c.surroundings.ground_albedo = incident / upper - 1.0;
            }
            c.surroundings.upper_view = view;
            c.air.speed_m_s = speed;
            c
        };
        let solve = |c: &LeafCase, guess: f64| -> Result<BalanceTerms> {
            let p = PreparedLeaf::new(c)?;
            let (t, _) = if guess.is_finite() {
                p.solve_exact_from(guess)?
            } else {
                p.solve_exact()?
            };
            Ok(t)
        };
        let shade = solve(&leaf_at(sw.shaded_w_m2), guess_shade)?;
        guess_shade = shade.leaf_temp_k;
        max_res = max_res.max(shade.residual_w_m2.abs());
        let sun = if f_sun > 0.0 {
            let t = solve(&leaf_at(sw.sunlit_w_m2), guess_sun)?;
            guess_sun = t.leaf_temp_k;
            max_res = max_res.max(t.residual_w_m2.abs());
            Some(t)
        } else {
            None
        };
        let mix = |f: fn(&BalanceTerms) -> f64| -> f64 {
            let s = sun.as_ref().map_or(0.0, f);
            dl * (f_sun * s + (1.0 - f_sun) * f(&shade))
        };
        let l_sens = mix(|t| t.sensible_w_m2);
        let l_lat = mix(|t| t.latent_w_m2);
        let l_tr = mix(|t| t.transpiration_mol_m2_s);
        abs_sw += dl * (f_sun * sw.sunlit_w_m2 + (1.0 - f_sun) * sw.shaded_w_m2);
        sens += l_sens;
        lat += l_lat;
        transp += l_tr;
        let shaded_c = shade.leaf_temp_k - ZERO_CELSIUS_K;
        let sunlit_c = sun.map(|t| t.leaf_temp_k - ZERO_CELSIUS_K);
        let mut consider = |t: f64, sunlit: bool| {
            if hottest.is_none_or(|h| t > h.leaf_temp_c) {
                hottest = Some(HottestLeaf {
                    layer: i,
                    sunlit,
                    leaf_temp_c: t,
                    height_m: height,
                    margin_k: case.limit_c.map(|l| l - t),
                });
            }
        };
        consider(shaded_c, false);
        if let Some(t) = sunlit_c {
            consider(t, true);
        }
        layers.push(LayerResult {
            height_m: height,
            lai_above: l_mid,
            lai_layer: dl,
            sunlit_fraction: f_sun,
            air_speed_m_s: speed,
            sky_view_fraction: sky,
            absorbed_shortwave_sunlit_w_m2: sw.sunlit_w_m2,
            absorbed_shortwave_shaded_w_m2: sw.shaded_w_m2,
            sunlit_leaf_temp_c: sunlit_c,
            shaded_leaf_temp_c: shaded_c,
            sensible_w_m2: l_sens,
            latent_w_m2: l_lat,
            transpiration_mol_m2_s: l_tr,
        });
    }
    let hottest = hottest
        .ok_or_else(|| PhysicsError::Inconsistent("a canopy needs at least one layer".into()))?;
    let l = st.lai;
    let (ground, reflected) = if st.scattering {
        let sa = a.sqrt();
        let kdp = optics.diffuse_extinction_scattering;
        let rho_cb = if has_beam {
            beam_reflection(a, kb)
        } else {
            0.0
        };
        (
            (1.0 - rho_cb) * light.beam_w_m2 * (-kb * sa * l).exp()
                + (1.0 - optics.diffuse_reflection) * light.diffuse_w_m2 * (-kdp * l).exp(),
            rho_cb * light.beam_w_m2 + optics.diffuse_reflection * light.diffuse_w_m2,
        )
    } else {
        (
            light.beam_w_m2 * (-kb * l).exp()
                + light.diffuse_w_m2 * (-optics.diffuse_extinction_black * l).exp(),
            0.0,
        )
    };
    Ok(CanopySolution {
        layers,
        hottest,
        air_temp_c: case.air.temp_c,
        beam_extinction: kb,
        sunlit_lai: if has_beam { sunlit_lai(kb, l) } else { 0.0 },
        absorbed_shortwave_w_m2: abs_sw,
        ground_shortwave_w_m2: ground,
        reflected_shortwave_w_m2: reflected,
        sensible_w_m2: sens,
        latent_w_m2: lat,
        transpiration_mol_m2_s: transp,
        max_residual_w_m2: max_res,
    })
}

/// Why no canopy-top air speed meets the target.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum SpeedObstacle {
    /// The air around the crop is at or above the target: more air only brings leaves toward it.
    AirTooHot {
        /// Air temperature at the search maximum \[°C\].
        air_temp_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
        /// Hottest leaf at the search maximum \[°C\].
        hottest_at_max_c: f64,
    },
    /// Even the search maximum leaves the hottest leaf above the target.
    BeyondSearch {
        /// Search maximum \[m s⁻¹\].
        max_speed_m_s: f64,
        /// Hottest leaf there \[°C\].
        hottest_at_max_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
    },
}

impl SpeedObstacle {
    /// Why, in plain words (SI units).
    #[must_use]
    pub fn sentence(&self) -> String {
        match *self {
            SpeedObstacle::AirTooHot {
                air_temp_c,
                target_c,
                hottest_at_max_c,
            } => format!(
                "No air speed can do it: the air around the crop is at {air_temp_c:.1} °C, at or above the target of {target_c:.1} °C (at the fastest speed tried the hottest leaf is at {hottest_at_max_c:.1} °C). Cool the air (ventilation, shade, evaporative cooling) instead."
            ),
            SpeedObstacle::BeyondSearch {
                max_speed_m_s,
                hottest_at_max_c,
                target_c,
            } => format!(
                "Not reachable with air alone: even at {max_speed_m_s:.1} m/s over the canopy the hottest leaf runs at {hottest_at_max_c:.1} °C, above the target of {target_c:.1} °C. Reduce the radiation load (shade) or keep the crop well watered."
            ),
        }
    }
}

/// The least canopy-top air speed that keeps the hottest leaf at or below the target.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum SpeedAnswer {
    /// Still air already meets the target.
    NotNeeded {
        /// Hottest leaf in still air \[°C\].
        hottest_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
    },
    /// The least speed that meets it.
    Speed {
        /// Least canopy-top air speed \[m s⁻¹\].
        speed_m_s: f64,
        /// Hottest leaf at that speed \[°C\].
        hottest_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
    },
    /// None within the search does.
    Unreachable(SpeedObstacle),
}

impl SpeedAnswer {
    /// The least speed \[m s⁻¹\]: 0 when none is needed, None when unreachable.
    #[must_use]
    pub fn speed_m_s(&self) -> Option<f64> {
        match *self {
            SpeedAnswer::NotNeeded { .. } => Some(0.0),
            SpeedAnswer::Speed { speed_m_s, .. } => Some(speed_m_s),
            SpeedAnswer::Unreachable(_) => None,
        }
    }

    /// The answer in plain words (SI units).
    #[must_use]
    pub fn sentence(&self) -> String {
        match *self {
            SpeedAnswer::NotNeeded {
                hottest_c,
                target_c,
            } => format!(
                "No air movement is needed: even in still air the hottest leaf runs at {hottest_c:.1} °C, at or below the target of {target_c:.1} °C."
            ),
            SpeedAnswer::Speed {
                speed_m_s,
                hottest_c,
                target_c,
            } => format!(
                "An air speed of at least {speed_m_s:.2} m/s at the canopy top keeps the hottest leaf at {hottest_c:.1} °C, the target of {target_c:.1} °C."
            ),
            SpeedAnswer::Unreachable(o) => o.sentence(),
        }
    }
}

/// Grid intervals of the speed search.
const SPEED_GRID_INTERVALS: usize = 24;

/// Bisection tolerance of the speed search \[m s⁻¹\].
const SPEED_TOLERANCE_M_S: f64 = 1e-4;

/// The least speed search shared by the canopy and the greenhouse: `eval(u)` returns (hottest leaf,
/// air temperature) \[°C\] at canopy-top speed u. A grid from 0 to `max_speed_m_s` (denser at low
/// speed) finds the first speed that meets the target; bisection refines it to 10⁻⁴ m s⁻¹
/// ([`crate::required_wind::least_speed_meeting`]).
pub(crate) fn least_speed(
    mut eval: impl FnMut(f64) -> Result<(f64, f64)>,
    target_c: f64,
    max_speed_m_s: f64,
) -> Result<SpeedAnswer> {
    let search = crate::required_wind::least_speed_meeting(
        &mut eval,
        |&(hot, _): &(f64, f64)| hot <= target_c,
        0.0,
        max_speed_m_s,
        SPEED_GRID_INTERVALS,
        SPEED_TOLERANCE_M_S,
    )?;
    Ok(match search {
        SpeedSearch::AtStart { value: (hot, _) } => SpeedAnswer::NotNeeded {
            hottest_c: hot,
            target_c,
        },
        SpeedSearch::Least {
            speed_m_s,
            value: (hot, _),
        } => SpeedAnswer::Speed {
            speed_m_s,
            hottest_c: hot,
            target_c,
        },
        SpeedSearch::Never {
            value_at_max: (hot, air),
        } => SpeedAnswer::Unreachable(if air >= target_c {
            SpeedObstacle::AirTooHot {
                air_temp_c: air,
                target_c,
                hottest_at_max_c: hot,
            }
        } else {
            SpeedObstacle::BeyondSearch {
                max_speed_m_s,
                hottest_at_max_c: hot,
                target_c,
            }
        }),
    })
}

/// Valid upper ends of a speed search \[m s⁻¹\].
pub const SEARCH_MAX_RANGE_M_S: ValidRange = ValidRange {
    quantity: "air speed search maximum",
    min: 0.1,
    max: 30.0,
    unit: "m/s",
};

/// The least canopy-top air speed that keeps the hottest leaf of an open canopy at or below
/// `limit_c − margin_k`.
///
/// - `case`; `limit_c` leaf limit \[°C\]; `margin_k` \[K\]; `max_speed_m_s` search maximum \[m s⁻¹\].
///
/// # Errors
/// Invalid inputs.
pub fn least_top_speed(
    case: &CanopyCase,
    limit_c: f64,
    margin_k: f64,
    max_speed_m_s: f64,
) -> Result<SpeedAnswer> {
    let limit = crate::required_wind::LIMIT_RANGE_C.check(limit_c)?;
    let margin = crate::required_wind::MARGIN_RANGE_K.check(margin_k)?;
    let max = SEARCH_MAX_RANGE_M_S.check(max_speed_m_s)?;
    case.validate()?;
    let optics = CanopyOptics::new(&case.structure, case.leaf.absorptivity);
    least_speed(
        |u| {
            let s = solve_with_optics(&case.with_top_speed(u), &optics)?;
            Ok((s.hottest.leaf_temp_c, case.air.temp_c))
        },
        limit - margin,
        max,
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn horizontal_diffuse_extinction_is_one() {
        assert!((diffuse_extinction(LeafAngle::Horizontal, 2.0, 1.0) - 1.0).abs() < 1e-12);
    }

    #[test]
    fn thin_canopy_spherical_diffuse_extinction_is_one() {
        // Hemispheric mean of 0.5/μ weighted 2μ dμ is exactly 1.
        let k = diffuse_extinction(LeafAngle::Spherical, 1e-6, 1.0);
        assert!((k - 1.0).abs() < 1e-3, "{k}");
    }

    #[test]
    fn night_has_no_sunlit_leaves() {
        let mut c = CanopyCase::default();
        c.light.sun_elevation_rad = -0.2;
        c.light.shortwave = HorizontalShortwave::DARK;
        let s = solve_canopy(&c).unwrap();
        assert!(s.layers.iter().all(|l| l.sunlit_leaf_temp_c.is_none()));
        assert!(!s.hottest.sunlit);
    }
}

//! Air movement from circulation fans: the round turbulent free jet of each fan, the fans of a
//! greenhouse laid out in rows along the house, the air speed they give at the canopy top and
//! inside the crop, the inverse question (which fans reach a target speed over the whole house),
//! measured anemometer readings, diminishing returns of more air, and fan energy.
//!
//! **Everything here is an estimate to verify with an anemometer.** A fan in a greenhouse is not a
//! free jet: the roof, the floor, the crop, the walls, the trusses and the other fans all change the
//! flow. The speeds are therefore given as a range (low / typical / high) from the published spread
//! of the jet coefficients, beside the rules of thumb of the trade. Fans and their electrical
//! installation must follow local codes and be installed by licensed practitioners; guards must stay
//! on; these figures are a first look, not a design.
//!
//! # The jet (far field, x − x₀ ≫ d)
//! - outlet velocity u₀ = Q₀ / (π d²/4) (continuity; hub area neglected — the blade diameter is
//!   taken as the outlet diameter);
//! - centreline decay u_c/u₀ = B d/(x − x₀) \[HCG94\] eq. (3.1) (equation number from memory);
//! - spread r½ = S (x − x₀) \[HCG94\], r½ the radius where u = u_c/2;
//! - radial profile u/u_c = exp(−ln 2 (r/r½)²) (the Gaussian fit of self-similar jet profiles,
//!   \[Pope\] §5.1; from memory);
//! - near the fan (x − x₀ < B d, the potential core) u_c = u₀ and r½ = max(S (x − x₀), d/2) — a
//!   simplification of this engine (no source) that makes u_c continuous at the end of the core.
//!
//! Coefficients: B = 5.8, S = 0.094 from the laser-Doppler and flying hot-wire measurements of
//! \[HCG94\]; the literature range B ≈ 5.7–6.1 and S ≈ 0.086–0.096 as collected in \[Pope\] Table
//! 5.1. **Both the HCG values and the table range were seen only through secondary sources** (the
//! papers and the book were not at hand); treat them as "from memory".
//!
//! # References
//! - \[HCG94\] Hussein, H. J., Capp, S. P., George, W. K. (1994). Velocity measurements in a
//!   high-Reynolds-number, momentum-conserving, axisymmetric, turbulent jet. *Journal of Fluid
//!   Mechanics* 258, 31–75.
//! - \[Pope\] Pope, S. B. (2000). *Turbulent Flows*. Cambridge University Press. Ch. 5, Table 5.1
//!   (spreading rates and decay constants of round jets).
//! - \[RS61\] Ricou, F. P., Spalding, D. B. (1961). Measurements of entrainment by axisymmetrical
//!   turbulent jets. *Journal of Fluid Mechanics* 11, 21–32 (Q/Q₀ ≈ 0.32 x/d; from memory).
//! - \[Cionco\] Cionco, R. M. (1965). *Journal of Applied Meteorology* 4, 517–522 (the exponential
//!   wind profile in a canopy, reused from [`crate::canopy::wind_in_canopy_m_s`]).
//! - \[Inoue63\] Inoue, E. (1963). On the turbulent structure of airflow within crop canopies.
//!   *Journal of the Meteorological Society of Japan* 41, 317–326 (the attenuation coefficient from
//!   the leaf drag and a constant mixing length; form from memory).

use std::borrow::Cow;

use crate::canopy::{CanopyStructure, wind_in_canopy_m_s};
use crate::case::LeafCase;
use crate::energy_balance::{leaf_temp_c, solve_leaf};
use crate::error::{PhysicsError, Result, ValidRange};

// ---------------------------------------------------------------------------------------------
// Units at the boundary
// ---------------------------------------------------------------------------------------------

/// One cubic foot per minute in m³ s⁻¹: 0.3048³ m³ / 60 s (exact from the international foot).
pub const CFM_IN_M3_S: f64 = 0.3048 * 0.3048 * 0.3048 / 60.0;

/// One square foot in m² (exact from the international foot).
pub const SQUARE_FOOT_IN_M2: f64 = 0.3048 * 0.3048;

/// Airflow from cubic feet per minute to m³ s⁻¹.
#[must_use]
pub fn cfm_to_m3_s(cfm: f64) -> f64 {
    cfm * CFM_IN_M3_S
}

/// Airflow from m³ s⁻¹ to cubic feet per minute.
#[must_use]
pub fn m3_s_to_cfm(m3_s: f64) -> f64 {
    m3_s / CFM_IN_M3_S
}

/// Airflow from m³ h⁻¹ to m³ s⁻¹.
#[must_use]
pub fn m3_h_to_m3_s(m3_h: f64) -> f64 {
    m3_h / 3600.0
}

/// Airflow from m³ s⁻¹ to m³ h⁻¹.
#[must_use]
pub fn m3_s_to_m3_h(m3_s: f64) -> f64 {
    m3_s * 3600.0
}

// ---------------------------------------------------------------------------------------------
// Ranges and defaults
// ---------------------------------------------------------------------------------------------

/// Valid fan airflow ratings \[m³ s⁻¹\] (a small circulation fan to a large exhaust fan).
pub const FAN_AIRFLOW_RANGE_M3_S: ValidRange = ValidRange {
    quantity: "fan airflow",
    min: 0.01,
    max: 20.0,
    unit: "m³/s",
};

/// Valid fan blade (outlet) diameters \[m\].
pub const FAN_DIAMETER_RANGE_M: ValidRange = ValidRange {
    quantity: "fan blade diameter",
    min: 0.1,
    max: 3.0,
    unit: "m",
};

/// Valid house dimensions \[m\].
pub const HOUSE_DIMENSION_RANGE_M: ValidRange = ValidRange {
    quantity: "house dimension",
    min: 1.0,
    max: 500.0,
    unit: "m",
};

/// Valid mounting heights of a fan's axis above the floor \[m\].
pub const MOUNTING_HEIGHT_RANGE_M: ValidRange = ValidRange {
    quantity: "fan mounting height",
    min: 0.1,
    max: 20.0,
    unit: "m",
};

/// Valid downward tilts of the fan axis \[rad\] (−30° up to +45° down).
pub const TILT_RANGE_RAD: ValidRange = ValidRange {
    quantity: "fan tilt below the horizontal",
    min: -std::f64::consts::FRAC_PI_6,
    max: std::f64::consts::FRAC_PI_4,
    unit: "rad",
};

/// Valid fan counts per row.
pub const FANS_PER_ROW_RANGE: ValidRange = ValidRange {
    quantity: "fans per row",
    min: 1.0,
    max: 100.0,
    unit: "",
};

/// Valid numbers of fan rows across the house.
pub const ROW_COUNT_RANGE: ValidRange = ValidRange {
    quantity: "fan rows",
    min: 1.0,
    max: 20.0,
    unit: "",
};

/// Valid fan efficacies \[m³ s⁻¹ W⁻¹\] (0.5 to 60 cfm W⁻¹).
pub const EFFICACY_RANGE_M3_S_W: ValidRange = ValidRange {
    quantity: "fan efficacy",
    min: 2.0e-4,
    max: 3.0e-2,
    unit: "m³/s per W",
};

/// Default dead-zone threshold \[m s⁻¹\]: 0.2 — below this the air over a crop is commonly called
/// "still" (common practice, no source).
pub const DEAD_ZONE_THRESHOLD_DEFAULT_M_S: f64 = 0.2;

/// Horizontal-airflow (HAF) fan capacity per floor area \[m³ s⁻¹ m⁻²\]: 2 cfm per ft² of floor
/// (common practice, from memory; = 0.0102 m³ s⁻¹ m⁻²).
pub const HAF_CAPACITY_RULE_M3_S_M2: f64 = 2.0 * CFM_IN_M3_S / SQUARE_FOOT_IN_M2;

/// Throw of a circulation fan in blade diameters, a rule of thumb for spacing fans in a row: about
/// 30 d (common practice, no source; HAF fans are often spaced about 15 m apart, also common
/// practice, from memory).
pub const THROW_RULE_DIAMETERS: f64 = 30.0;

/// Terminal velocity used to define the computed throw of a jet \[m s⁻¹\]: 0.25 (common practice,
/// no source).
pub const THROW_TERMINAL_SPEED_M_S: f64 = 0.25;

// ---------------------------------------------------------------------------------------------
// The free jet
// ---------------------------------------------------------------------------------------------

/// The coefficients of a round turbulent free jet.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct JetCoefficients {
    /// Centreline decay constant B in u_c/u₀ = B d/(x − x₀) \[–\].
    pub decay_constant: f64,
    /// Spreading rate S in r½ = S (x − x₀) \[–\].
    pub spread_rate: f64,
    /// Virtual origin x₀ in outlet diameters \[–\] (0 puts it at the outlet).
    pub virtual_origin_diameters: f64,
}

/// \[HCG94\]: B = 5.8, S = 0.094 (seen via secondary sources; the virtual origin is put at the
/// outlet here, a simplification — HCG fitted their own x₀).
pub const JET_HCG1994: JetCoefficients = JetCoefficients {
    decay_constant: 5.8,
    spread_rate: 0.094,
    virtual_origin_diameters: 0.0,
};

/// Low end of the literature range in \[Pope\] Table 5.1 (B = 5.7, S = 0.086; seen via secondary
/// sources): the slowest centreline and the narrowest jet.
pub const JET_LOW: JetCoefficients = JetCoefficients {
    decay_constant: 5.7,
    spread_rate: 0.086,
    virtual_origin_diameters: 0.0,
};

/// High end of the literature range in \[Pope\] Table 5.1 (B = 6.1, S = 0.096; seen via secondary
/// sources).
pub const JET_HIGH: JetCoefficients = JetCoefficients {
    decay_constant: 6.1,
    spread_rate: 0.096,
    virtual_origin_diameters: 0.0,
};

impl Default for JetCoefficients {
    fn default() -> Self {
        JET_HCG1994
    }
}

/// Mean outlet velocity of a fan u₀ = Q₀ / (π d²/4) \[m s⁻¹\] (continuity).
///
/// - `airflow_m3_s` Q₀ \[m³ s⁻¹\]; `diameter_m` blade (outlet) diameter d \[m\].
///
/// # Errors
/// Airflow or diameter out of range.
///
/// ```
/// // 1 m³/s through a 0.5 m outlet: 1 / (π · 0.0625) = 5.093 m/s.
/// let u = leafwind_physics::fans::outlet_velocity_m_s(1.0, 0.5).unwrap();
/// assert!((u - 5.093).abs() < 0.0005);
/// ```
pub fn outlet_velocity_m_s(airflow_m3_s: f64, diameter_m: f64) -> Result<f64> {
    let q = FAN_AIRFLOW_RANGE_M3_S.check(airflow_m3_s)?;
    let d = FAN_DIAMETER_RANGE_M.check(diameter_m)?;
    Ok(q / (std::f64::consts::PI * d * d / 4.0))
}

/// Length of the potential core from the outlet \[m\]: x₀ + B d, where the far-field decay law
/// gives u_c = u₀ (this engine's matching, no source; measured cores are about 4–6 d, from memory).
#[must_use]
pub fn potential_core_length_m(diameter_m: f64, c: &JetCoefficients) -> f64 {
    diameter_m * (c.virtual_origin_diameters + c.decay_constant)
}

/// Centreline speed of the jet at axial distance `x_m` from the outlet \[m s⁻¹\].
///
/// u_c = u₀ B d/(x − x₀) beyond the potential core (\[HCG94\]), u₀ within it; 0 behind the fan
/// (x < 0; the intake flow is neglected).
///
/// - `outlet_speed_m_s` u₀ \[m s⁻¹\]; `diameter_m` d \[m\]; `x_m` x \[m\].
///
/// ```
/// use leafwind_physics::fans::{centreline_speed_m_s, JET_HCG1994};
/// // [HCG94]: at x = 58 d the centreline is u₀ · 5.8/58 = 0.1 u₀.
/// let u = centreline_speed_m_s(10.0, 0.5, 29.0, &JET_HCG1994);
/// assert!((u - 1.0).abs() < 1e-12);
/// ```
#[must_use]
pub fn centreline_speed_m_s(
    outlet_speed_m_s: f64,
    diameter_m: f64,
    x_m: f64,
    c: &JetCoefficients,
) -> f64 {
    if x_m < 0.0 {
        return 0.0;
    }
    let core = potential_core_length_m(diameter_m, c);
    if x_m <= core {
        return outlet_speed_m_s;
    }
    let x_rel = x_m - c.virtual_origin_diameters * diameter_m;
    outlet_speed_m_s * c.decay_constant * diameter_m / x_rel // u_c/u₀ = B d/(x − x₀), [HCG94]
}

/// Half-width r½ of the jet at axial distance `x_m` \[m\]: max(S (x − x₀), d/2) (\[HCG94\] far field;
/// the floor of d/2 near the outlet is this engine's simplification).
#[must_use]
pub fn half_width_m(diameter_m: f64, x_m: f64, c: &JetCoefficients) -> f64 {
    let x_rel = x_m - c.virtual_origin_diameters * diameter_m;
    (c.spread_rate * x_rel).max(0.5 * diameter_m) // r½ = S (x − x₀), [HCG94]
}

/// Jet speed at axial distance `x_m` and radial distance `r_m` from the axis \[m s⁻¹\]:
/// u_c exp(−ln 2 (r/r½)²) (Gaussian self-similar profile, \[Pope\] §5.1; from memory).
#[must_use]
pub fn jet_speed_m_s(
    outlet_speed_m_s: f64,
    diameter_m: f64,
    x_m: f64,
    r_m: f64,
    c: &JetCoefficients,
) -> f64 {
    if x_m < 0.0 {
        return 0.0;
    }
    let uc = centreline_speed_m_s(outlet_speed_m_s, diameter_m, x_m, c);
    let rh = half_width_m(diameter_m, x_m, c);
    let eta = r_m / rh;
    uc * (-std::f64::consts::LN_2 * eta * eta).exp()
}

/// Volume flux of the far-field jet over the outlet flux, Q(x)/Q₀ \[–\].
///
/// Integrating the Gaussian profile, Q = ∫ 2π r u dr = π u_c r½² / ln 2; with the decay and spread
/// laws and Q₀ = u₀ π d²/4 this gives Q/Q₀ = (4 B S² / ln 2) (x − x₀)/d — the jet entrains the
/// surrounding air (≈ 0.30 x/d with the \[HCG94\] coefficients; \[RS61\] measured ≈ 0.32 x/d,
/// from memory). Derived here; valid in the far field only.
///
/// ```
/// use leafwind_physics::fans::{volume_flux_ratio, JET_HCG1994};
/// // 4 · 5.8 · 0.094² / ln 2 = 0.2958 per diameter: at x = 50 d, Q/Q₀ = 14.79.
/// assert!((volume_flux_ratio(0.5, 25.0, &JET_HCG1994) - 14.79).abs() < 0.005);
/// ```
#[must_use]
pub fn volume_flux_ratio(diameter_m: f64, x_m: f64, c: &JetCoefficients) -> f64 {
    let x_rel = x_m / diameter_m - c.virtual_origin_diameters;
    4.0 * c.decay_constant * c.spread_rate * c.spread_rate / std::f64::consts::LN_2 * x_rel
}

/// Momentum flux of the far-field Gaussian jet over the outlet momentum flux, M/M₀ \[–\].
///
/// M = ∫ 2π r u² dr = π u_c² r½² / (2 ln 2), M₀ = u₀² π d²/4, so M/M₀ = 2 B² S² / ln 2,
/// independent of x (derived here). A momentum-conserving jet has 1; the mean-velocity part alone
/// falls short because turbulent stresses and pressure carry part of the momentum (\[HCG94\];
/// ≈ 0.86 with their coefficients).
///
/// ```
/// use leafwind_physics::fans::{momentum_flux_ratio, JET_HCG1994};
/// // 2 · (5.8 · 0.094)² / ln 2 = 0.858.
/// assert!((momentum_flux_ratio(&JET_HCG1994) - 0.858).abs() < 0.0005);
/// ```
#[must_use]
pub fn momentum_flux_ratio(c: &JetCoefficients) -> f64 {
    let bs = c.decay_constant * c.spread_rate;
    2.0 * bs * bs / std::f64::consts::LN_2
}

/// Distance from the outlet at which the centreline falls to `terminal_speed_m_s` \[m\] (the
/// "throw"), from the decay law; `None` if the outlet speed is already below it.
#[must_use]
pub fn throw_m(
    outlet_speed_m_s: f64,
    diameter_m: f64,
    terminal_speed_m_s: f64,
    c: &JetCoefficients,
) -> Option<f64> {
    if terminal_speed_m_s.is_nan()
        || terminal_speed_m_s <= 0.0
        || outlet_speed_m_s <= terminal_speed_m_s
    {
        return None;
    }
    let x = c.virtual_origin_diameters * diameter_m
        + c.decay_constant * diameter_m * outlet_speed_m_s / terminal_speed_m_s;
    Some(x.max(potential_core_length_m(diameter_m, c)))
}

/// Wind attenuation coefficient of a canopy from its leaf area and drag (\[Inoue63\], from memory):
/// a = (C_d L h² / (2 l²))^{1/3} with a constant mixing length l = λ h, i.e.
/// a = (C_d L / (2 λ²))^{1/3} \[–\].
///
/// - `lai` L \[m² m⁻²\]; `drag_coefficient` C_d of a leaf \[–\] (about 0.2, from memory);
///   `mixing_length_ratio` λ = l/h \[–\] (about 0.1–0.2, from memory).
///
/// ```
/// // L = 3, C_d = 0.2, λ = 0.1: a = (0.2 · 3 / 0.02)^(1/3) = 30^(1/3) = 3.107.
/// let a = leafwind_physics::fans::attenuation_from_lai(3.0, 0.2, 0.1);
/// assert!((a - 3.107).abs() < 0.0005);
/// ```
#[must_use]
pub fn attenuation_from_lai(lai: f64, drag_coefficient: f64, mixing_length_ratio: f64) -> f64 {
    (drag_coefficient * lai / (2.0 * mixing_length_ratio * mixing_length_ratio)).cbrt()
}

// ---------------------------------------------------------------------------------------------
// The layout
// ---------------------------------------------------------------------------------------------

/// One fan model: its rated airflow and blade diameter.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct FanModel {
    /// A label for the user.
    pub label: Cow<'static, str>,
    /// Rated airflow Q₀ \[m³ s⁻¹\] (free air).
    pub airflow_m3_s: f64,
    /// Blade (outlet) diameter d \[m\].
    pub diameter_m: f64,
    /// Rated efficacy, airflow per electrical watt \[m³ s⁻¹ W⁻¹\].
    pub efficacy_m3_s_w: f64,
}

/// Invented, generic catalogue-like circulation fans (NOT any maker's data; round numbers chosen to
/// be plausible for horizontal-airflow fans: outlet speeds 5–7 m s⁻¹ and 12–20 cfm W⁻¹). Replace
/// them with the rating of the fan you would buy.
pub const GENERIC_FANS: [FanModel; 4] = [
    FanModel {
        label: Cow::Borrowed("generic 0.30 m"),
        airflow_m3_s: 0.40,
        diameter_m: 0.30,
        efficacy_m3_s_w: 0.0060,
    },
    FanModel {
        label: Cow::Borrowed("generic 0.45 m"),
        airflow_m3_s: 0.90,
        diameter_m: 0.45,
        efficacy_m3_s_w: 0.0070,
    },
    FanModel {
        label: Cow::Borrowed("generic 0.50 m"),
        airflow_m3_s: 1.20,
        diameter_m: 0.50,
        efficacy_m3_s_w: 0.0075,
    },
    FanModel {
        label: Cow::Borrowed("generic 0.90 m"),
        airflow_m3_s: 3.50,
        diameter_m: 0.90,
        efficacy_m3_s_w: 0.0090,
    },
];

impl FanModel {
    /// Checks airflow, diameter and efficacy.
    ///
    /// # Errors
    /// The first one out of range.
    pub fn validate(&self) -> Result<()> {
        FAN_AIRFLOW_RANGE_M3_S.check(self.airflow_m3_s)?;
        FAN_DIAMETER_RANGE_M.check(self.diameter_m)?;
        EFFICACY_RANGE_M3_S_W.check(self.efficacy_m3_s_w)?;
        Ok(())
    }

    /// Outlet velocity u₀ \[m s⁻¹\] (see [`outlet_velocity_m_s`]).
    ///
    /// # Errors
    /// As [`outlet_velocity_m_s`].
    pub fn outlet_velocity_m_s(&self) -> Result<f64> {
        outlet_velocity_m_s(self.airflow_m3_s, self.diameter_m)
    }

    /// Electrical power at the rated airflow \[W\]: Q₀ / efficacy.
    #[must_use]
    pub fn power_w(&self) -> f64 {
        self.airflow_m3_s / self.efficacy_m3_s_w
    }
}

/// How the jets of several fans are combined at one point.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum Superposition {
    /// The fastest single jet: a lower bound, since a fan downstream re-accelerates air that
    /// already moves and jets in series never cancel (no source; a conservative choice).
    Max,
    /// Root-sum-square of the jets, √Σu²: adds their kinetic energies as if independent — an upper
    /// estimate for coaxial jets in series (no source).
    RootSumSquare,
}

/// A layout of identical circulation fans in rows along a house.
///
/// Row j lies at y_j = W (j + ½)/n_rows across the house. Rows alternate in direction (row 0 blows
/// toward +x, row 1 toward −x …), the loop pattern of horizontal airflow (common practice, no
/// source). In a row blowing toward +x the fans stand at x = first + k · spacing; in a row blowing
/// toward −x at x = L − first − k · spacing.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct FanLayout {
    /// The fan model.
    pub fan: FanModel,
    /// Fans in each row.
    pub fans_per_row: usize,
    /// Rows across the house.
    pub rows: usize,
    /// Spacing of the fans along a row \[m\].
    pub spacing_m: f64,
    /// Distance of a row's first fan from the end wall it blows away from \[m\].
    pub first_fan_m: f64,
    /// Height of the fan axis above the floor \[m\].
    pub mounting_height_m: f64,
    /// Tilt of the axis below the horizontal \[rad\] (positive aims down at the crop).
    pub tilt_down_rad: f64,
    /// House length along the rows L \[m\].
    pub house_length_m: f64,
    /// House width W \[m\].
    pub house_width_m: f64,
}

impl Default for FanLayout {
    /// An invented 60 m × 10 m house with two rows of four generic 0.50 m fans.
    fn default() -> Self {
        Self {
            fan: GENERIC_FANS[2].clone(),
            fans_per_row: 4,
            rows: 2,
            spacing_m: 15.0,
            first_fan_m: 1.0,
            mounting_height_m: 3.0,
            tilt_down_rad: 0.0,
            house_length_m: 60.0,
            house_width_m: 10.0,
        }
    }
}

/// A fan's position and direction.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct FanPosition {
    /// Along the house \[m\].
    pub x_m: f64,
    /// Across the house \[m\].
    pub y_m: f64,
    /// +1 blowing toward +x, −1 toward −x.
    pub direction: f64,
}

impl FanLayout {
    /// Checks every field (and that every fan stands inside the house).
    ///
    /// # Errors
    /// The first field out of range, or fans beyond the far end wall.
    pub fn validate(&self) -> Result<()> {
        self.fan.validate()?;
        FANS_PER_ROW_RANGE.check(self.fans_per_row as f64)?;
        ROW_COUNT_RANGE.check(self.rows as f64)?;
        let length = ValidRange {
            quantity: "house length",
            ..HOUSE_DIMENSION_RANGE_M
        }
        .check(self.house_length_m)?;
        ValidRange {
            quantity: "house width",
            ..HOUSE_DIMENSION_RANGE_M
        }
        .check(self.house_width_m)?;
        ValidRange {
            quantity: "fan spacing",
            min: 0.5,
            max: length,
            unit: "m",
        }
        .check(self.spacing_m)?;
        ValidRange {
            quantity: "first fan from the end wall",
            min: 0.0,
            max: length,
            unit: "m",
        }
        .check(self.first_fan_m)?;
        MOUNTING_HEIGHT_RANGE_M.check(self.mounting_height_m)?;
        TILT_RANGE_RAD.check(self.tilt_down_rad)?;
        let last = self.first_fan_m + (self.fans_per_row - 1) as f64 * self.spacing_m;
        if last > self.house_length_m {
            return Err(PhysicsError::Inconsistent(format!(
                "the last fan of a row would stand {last:.1} m from the end wall, beyond the house length of {:.1} m: use fewer fans or a smaller spacing",
                self.house_length_m
            )));
        }
        Ok(())
    }

    /// Every fan's position and direction.
    #[must_use]
    pub fn positions(&self) -> Vec<FanPosition> {
        let mut v = Vec::with_capacity(self.rows * self.fans_per_row);
        for j in 0..self.rows {
            let y = self.house_width_m * (j as f64 + 0.5) / self.rows as f64;
            let dir = if j % 2 == 0 { 1.0 } else { -1.0 };
            for k in 0..self.fans_per_row {
                let along = self.first_fan_m + k as f64 * self.spacing_m;
                let x = if dir > 0.0 {
                    along
                } else {
                    self.house_length_m - along
                };
                v.push(FanPosition {
                    x_m: x,
                    y_m: y,
                    direction: dir,
                });
            }
        }
        v
    }

    /// Total fans.
    #[must_use]
    pub fn fan_count(&self) -> usize {
        self.rows * self.fans_per_row
    }

    /// Floor area \[m²\].
    #[must_use]
    pub fn floor_area_m2(&self) -> f64 {
        self.house_length_m * self.house_width_m
    }

    /// Installed airflow per floor area \[m³ s⁻¹ m⁻²\].
    #[must_use]
    pub fn airflow_per_floor_m3_s_m2(&self) -> f64 {
        self.fan_count() as f64 * self.fan.airflow_m3_s / self.floor_area_m2()
    }

    /// Electrical power per floor area \[W m⁻²\].
    #[must_use]
    pub fn power_per_floor_w_m2(&self) -> f64 {
        self.fan_count() as f64 * self.fan.power_w() / self.floor_area_m2()
    }
}

/// One jet's speed at the point (x, y, z) \[m\] (free jet, axis from the fan at the mounting height
/// with the layout's tilt).
///
/// Geometry (this engine's, no source): s = direction · (x − x_f) is the horizontal distance
/// downstream; the axis is at height z_a = H − s tan θ; the axial distance is s / cos θ; the radial
/// distance combines the vertical offset projected normal to the axis, (z_a − z) cos θ, and the
/// horizontal offset across the house, y − y_f. Upstream of the fan (s ≤ 0) the jet gives 0. A
/// tilted axis that dips below the point is treated as a free jet still (the crop's absorption of
/// the jet and the floor are not modelled; an overestimate past the touch-down).
fn one_jet_m_s(
    layout: &FanLayout,
    u0: f64,
    fan: &FanPosition,
    x_m: f64,
    y_m: f64,
    z_m: f64,
    c: &JetCoefficients,
) -> f64 {
    let s = fan.direction * (x_m - fan.x_m);
    if s <= 0.0 {
        return 0.0;
    }
    let (sin, cos) = layout.tilt_down_rad.sin_cos();
    let axis_z = layout.mounting_height_m - s * sin / cos;
    let axial = s / cos;
    let dz = (axis_z - z_m) * cos;
    let dy = y_m - fan.y_m;
    let r = (dz * dz + dy * dy).sqrt();
    jet_speed_m_s(u0, layout.fan.diameter_m, axial, r, c)
}

/// The air speed at a point from all fans of `layout` \[m s⁻¹\], combined by `superposition`.
///
/// # Errors
/// An invalid layout.
pub fn speed_at_m_s(
    layout: &FanLayout,
    x_m: f64,
    y_m: f64,
    z_m: f64,
    c: &JetCoefficients,
    superposition: Superposition,
) -> Result<f64> {
    layout.validate()?;
    let u0 = layout.fan.outlet_velocity_m_s()?;
    Ok(combine(
        layout
            .positions()
            .iter()
            .map(|f| one_jet_m_s(layout, u0, f, x_m, y_m, z_m, c)),
        superposition,
    ))
}

fn combine(speeds: impl Iterator<Item = f64>, s: Superposition) -> f64 {
    match s {
        Superposition::Max => speeds.fold(0.0, f64::max),
        Superposition::RootSumSquare => speeds.map(|u| u * u).sum::<f64>().sqrt(),
    }
}

/// A low / typical / high estimate \[m s⁻¹\].
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct SpeedRange {
    /// Low estimate: [`JET_LOW`], [`Superposition::Max`] \[m s⁻¹\].
    pub low_m_s: f64,
    /// Typical estimate: [`JET_HCG1994`], [`Superposition::Max`] \[m s⁻¹\].
    pub typical_m_s: f64,
    /// High estimate: [`JET_HIGH`], [`Superposition::RootSumSquare`] \[m s⁻¹\].
    pub high_m_s: f64,
}

/// Which estimate of a [`SpeedRange`] a design question uses.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum Estimate {
    /// The low estimate (the cautious choice for design).
    Low,
    /// The typical estimate.
    Typical,
    /// The high estimate.
    High,
}

impl SpeedRange {
    /// The chosen estimate \[m s⁻¹\].
    #[must_use]
    pub fn pick(&self, e: Estimate) -> f64 {
        match e {
            Estimate::Low => self.low_m_s,
            Estimate::Typical => self.typical_m_s,
            Estimate::High => self.high_m_s,
        }
    }
}

/// The canopy-top speed range at one point.
fn range_at(
    layout: &FanLayout,
    u0: f64,
    fans: &[FanPosition],
    x: f64,
    y: f64,
    z: f64,
) -> SpeedRange {
    let one = |c: &JetCoefficients, s: Superposition| {
        combine(
            fans.iter().map(|f| one_jet_m_s(layout, u0, f, x, y, z, c)),
            s,
        )
    };
    SpeedRange {
        low_m_s: one(&JET_LOW, Superposition::Max),
        typical_m_s: one(&JET_HCG1994, Superposition::Max),
        high_m_s: one(&JET_HIGH, Superposition::RootSumSquare),
    }
}

/// One sample along a row line.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct ProfilePoint {
    /// Along the house \[m\].
    pub x_m: f64,
    /// Across the house (the row line) \[m\].
    pub y_m: f64,
    /// Air speed at the canopy top \[m s⁻¹\].
    pub canopy_top: SpeedRange,
    /// Air speed at mid-canopy height, after the canopy's exponential attenuation \[m s⁻¹\].
    pub mid_canopy: SpeedRange,
    /// Whether the point lies in a fan's near zone (upstream of where the first jet of its row
    /// reaches the canopy top); such points are listed but left out of the minimum and mean.
    pub near_fan_zone: bool,
}

/// Rules of thumb beside the jet estimate (all common practice).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct RulesOfThumb {
    /// Installed airflow per floor area \[m³ s⁻¹ m⁻²\].
    pub installed_m3_s_m2: f64,
    /// The HAF rule, 2 cfm per ft² \[m³ s⁻¹ m⁻²\] (common practice, from memory).
    pub haf_rule_m3_s_m2: f64,
    /// Whether the installed airflow meets the HAF rule.
    pub meets_haf_rule: bool,
    /// Throw by the rule 30 d \[m\] (common practice, no source).
    pub throw_rule_m: f64,
    /// Throw of the free jet to 0.25 m s⁻¹ on its axis \[m\] (typical coefficients).
    pub throw_jet_m: Option<f64>,
    /// Whether the spacing is within the rule-of-thumb throw.
    pub spacing_within_throw: bool,
}

/// The air speed over the crop along the house from a fan layout.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct LayoutEstimate {
    /// Samples along each row line, row by row.
    pub points: Vec<ProfilePoint>,
    /// Slowest canopy-top speed outside the near-fan zones \[m s⁻¹\] (each estimate its own min).
    pub min_canopy_top: SpeedRange,
    /// Mean canopy-top speed outside the near-fan zones \[m s⁻¹\].
    pub mean_canopy_top: SpeedRange,
    /// Slowest canopy-top speed at the edges of the rows' strips (halfway to the next row or the
    /// side wall), outside the near-fan zones \[m s⁻¹\] — where the free-jet model is least reliable.
    pub min_strip_edge: SpeedRange,
    /// Uniformity of the typical estimate, min ÷ mean \[–\].
    pub uniformity: f64,
    /// Outlet velocity u₀ \[m s⁻¹\].
    pub outlet_speed_m_s: f64,
    /// Potential core length (typical coefficients) \[m\].
    pub core_length_m: f64,
    /// Rules of thumb.
    pub rules: RulesOfThumb,
    /// What the numbers are.
    pub note: String,
}

/// The note every layout estimate carries.
pub const ESTIMATE_NOTE: &str = "Free-jet estimate (Hussein, Capp & George 1994 coefficients, literature range as in Pope 2000 Table 5.1): a first look to verify with an anemometer at canopy height. Walls, roof, crop and other fans change the flow; fans and their wiring must follow local codes.";

/// Samples along each row line.
const PROFILE_SAMPLES: usize = 241;

/// Estimates the air speed at the canopy top and mid-canopy along the house.
///
/// - `layout`: the fans; `structure`: the crop (its height h and wind attenuation a; the mid-canopy
///   speed is u_h exp(−a/2) by \[Cionco\]).
///
/// The near-fan zone of a row runs from the end wall to where the row's first jet reaches the canopy
/// top, taken as the first sample where the canopy top is within 2 r½ of the jet axis (a 6 %
/// speed contour; this engine's choice, no source).
///
/// # Errors
/// An invalid layout or structure, or a canopy at or above the fans.
pub fn estimate_layout(layout: &FanLayout, structure: &CanopyStructure) -> Result<LayoutEstimate> {
    layout.validate()?;
    structure.validate()?;
    if structure.height_m >= layout.mounting_height_m {
        return Err(PhysicsError::Inconsistent(format!(
            "the canopy top ({:.2} m) is at or above the fan axis ({:.2} m): mount the fans above the crop",
            structure.height_m, layout.mounting_height_m
        )));
    }
    let u0 = layout.fan.outlet_velocity_m_s()?;
    let fans = layout.positions();
    let h = structure.height_m;
    let (sin, cos) = layout.tilt_down_rad.sin_cos();
    let d = layout.fan.diameter_m;
    let mut points = Vec::with_capacity(PROFILE_SAMPLES * layout.rows);
    let mut edge_min = SpeedRange {
        low_m_s: f64::INFINITY,
        typical_m_s: f64::INFINITY,
        high_m_s: f64::INFINITY,
    };
    let strip = layout.house_width_m / layout.rows as f64;
    for j in 0..layout.rows {
        let y = strip * (j as f64 + 0.5);
        let dir = if j % 2 == 0 { 1.0 } else { -1.0 };
        for i in 0..PROFILE_SAMPLES {
            let x = layout.house_length_m * i as f64 / (PROFILE_SAMPLES - 1) as f64;
            // Distance downstream of the row's first fan.
            let first_x = if dir > 0.0 {
                layout.first_fan_m
            } else {
                layout.house_length_m - layout.first_fan_m
            };
            let s = dir * (x - first_x);
            let near = if s <= 0.0 {
                true
            } else {
                let axial = s / cos;
                let axis_z = layout.mounting_height_m - s * sin / cos;
                ((axis_z - h) * cos).abs() > 2.0 * half_width_m(d, axial, &JET_HCG1994)
            };
            let top = range_at(layout, u0, &fans, x, y, h);
            let a = structure.wind_attenuation;
            let mid = SpeedRange {
                low_m_s: wind_in_canopy_m_s(top.low_m_s, 0.5, a), // [Cionco]
                typical_m_s: wind_in_canopy_m_s(top.typical_m_s, 0.5, a),
                high_m_s: wind_in_canopy_m_s(top.high_m_s, 0.5, a),
            };
            if !near {
                let e = range_at(layout, u0, &fans, x, y + 0.5 * strip, h);
                edge_min.low_m_s = edge_min.low_m_s.min(e.low_m_s);
                edge_min.typical_m_s = edge_min.typical_m_s.min(e.typical_m_s);
                edge_min.high_m_s = edge_min.high_m_s.min(e.high_m_s);
            }
            points.push(ProfilePoint {
                x_m: x,
                y_m: y,
                canopy_top: top,
                mid_canopy: mid,
                near_fan_zone: near,
            });
        }
    }
    let served: Vec<&ProfilePoint> = points.iter().filter(|p| !p.near_fan_zone).collect();
    if served.is_empty() {
        return Err(PhysicsError::Inconsistent(
            "no jet reaches the canopy top anywhere in the house: lower or tilt the fans".into(),
        ));
    }
    let n = served.len() as f64;
    let stat = |f: fn(&SpeedRange) -> f64| {
        let v = served.iter().map(|p| f(&p.canopy_top));
        let min = v.clone().fold(f64::INFINITY, f64::min);
        let mean = v.sum::<f64>() / n;
        (min, mean)
    };
    let (lo_min, lo_mean) = stat(|r| r.low_m_s);
    let (ty_min, ty_mean) = stat(|r| r.typical_m_s);
    let (hi_min, hi_mean) = stat(|r| r.high_m_s);
    let throw_jet = throw_m(u0, d, THROW_TERMINAL_SPEED_M_S, &JET_HCG1994);
    let throw_rule = THROW_RULE_DIAMETERS * d;
    let installed = layout.airflow_per_floor_m3_s_m2();
    Ok(LayoutEstimate {
        points,
        min_canopy_top: SpeedRange {
            low_m_s: lo_min,
            typical_m_s: ty_min,
            high_m_s: hi_min,
        },
        mean_canopy_top: SpeedRange {
            low_m_s: lo_mean,
            typical_m_s: ty_mean,
            high_m_s: hi_mean,
        },
        min_strip_edge: edge_min,
        uniformity: if ty_mean > 0.0 { ty_min / ty_mean } else { 0.0 },
        outlet_speed_m_s: u0,
        core_length_m: potential_core_length_m(d, &JET_HCG1994),
        rules: RulesOfThumb {
            installed_m3_s_m2: installed,
            haf_rule_m3_s_m2: HAF_CAPACITY_RULE_M3_S_M2,
            meets_haf_rule: installed >= HAF_CAPACITY_RULE_M3_S_M2,
            throw_rule_m: throw_rule,
            throw_jet_m: throw_jet,
            spacing_within_throw: layout.fans_per_row == 1 || layout.spacing_m <= throw_rule,
        },
        note: ESTIMATE_NOTE.to_string(),
    })
}

// ---------------------------------------------------------------------------------------------
// Inverse mode
// ---------------------------------------------------------------------------------------------

/// The house, crop and mounting for the inverse question.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct HouseForFans {
    /// House length \[m\].
    pub length_m: f64,
    /// House width \[m\].
    pub width_m: f64,
    /// Fan axis height \[m\].
    pub mounting_height_m: f64,
    /// Tilt below the horizontal \[rad\].
    pub tilt_down_rad: f64,
    /// First fan from the end wall \[m\].
    pub first_fan_m: f64,
}

impl Default for HouseForFans {
    fn default() -> Self {
        Self {
            length_m: 60.0,
            width_m: 10.0,
            mounting_height_m: 3.0,
            tilt_down_rad: 0.0,
            first_fan_m: 1.0,
        }
    }
}

/// Largest total fan count the inverse search tries.
pub const MAX_FANS_SEARCHED: usize = 200;

/// Closest spacing of fans in series the inverse search tries \[m\]: 3 (closer fans in one row
/// mostly blow into each other's intake; common practice, no source).
pub const MIN_SERIES_SPACING_M: f64 = 3.0;

/// The answer to "which fans give at least this canopy-top speed over the whole house?".
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum FanSizing {
    /// The layouts that reach the target, one per fan model that can (fewest fans first, then
    /// lowest power).
    Found(Vec<(FanLayout, LayoutEstimate)>),
    /// None of the models reaches it within [`MAX_FANS_SEARCHED`] fans (or the fans are not above
    /// the crop): the best minimum speed found \[m s⁻¹\] and why.
    NotReachable {
        /// Best minimum canopy-top speed of the chosen estimate \[m s⁻¹\].
        best_min_m_s: f64,
        /// Target \[m s⁻¹\].
        target_m_s: f64,
    },
}

impl FanSizing {
    /// The answer in plain words.
    #[must_use]
    pub fn sentence(&self) -> String {
        match self {
            FanSizing::Found(v) => match v.first() {
                Some((l, e)) => {
                    let spacing = if l.fans_per_row > 1 {
                        format!(", {:.1} m apart along each row", l.spacing_m)
                    } else {
                        String::new()
                    };
                    format!(
                        "{} fans of the {} kind ({} {} of {}{spacing}) give at least {:.2} m/s at the canopy top (range {:.2}–{:.2} m/s) outside the near-fan zones: an estimate to verify with an anemometer.",
                        l.fan_count(),
                        l.fan.label,
                        l.rows,
                        if l.rows == 1 { "row" } else { "rows" },
                        l.fans_per_row,
                        e.min_canopy_top.typical_m_s,
                        e.min_canopy_top.low_m_s,
                        e.min_canopy_top.high_m_s
                    )
                }
                None => "No layout was found.".into(),
            },
            FanSizing::NotReachable {
                best_min_m_s,
                target_m_s,
            } => format!(
                "Not reachable with these fan models: the best layout tried gives {best_min_m_s:.2} m/s at the slowest point of the canopy top, below the target of {target_m_s:.2} m/s. Use larger fans, mount them closer to the crop or tilt them down."
            ),
        }
    }
}

/// For each fan model, the layout with the fewest fans whose slowest canopy-top speed (outside the
/// near-fan zones, the chosen `estimate`) is at least `target_m_s`.
///
/// Searched: total counts from 1 to [`MAX_FANS_SEARCHED`], split into 1 to 6 alternating rows of n
/// fans spaced (L − first)/n apart (never closer than [`MIN_SERIES_SPACING_M`]); the first layout
/// (fewest fans, then fewest rows) that meets the target for a model is kept. The speed is the
/// free-jet estimate along the row lines (see [`estimate_layout`]); the strip edges between rows are
/// reported in each estimate but not required to meet the target.
///
/// # Errors
/// An invalid target, house, catalogue entry or structure.
pub fn size_fans(
    target_m_s: f64,
    house: &HouseForFans,
    structure: &CanopyStructure,
    catalogue: &[FanModel],
    estimate: Estimate,
) -> Result<FanSizing> {
    let target = ValidRange {
        quantity: "target canopy-top air speed",
        min: 0.01,
        max: 5.0,
        unit: "m/s",
    }
    .check(target_m_s)?;
    let mut found = Vec::new();
    let mut best = 0.0f64;
    for fan in catalogue {
        fan.validate()?;
        'model: for total in 1..=MAX_FANS_SEARCHED {
            for rows in 1..=6usize {
                if total % rows != 0 {
                    continue;
                }
                let per_row = total / rows;
                let span = house.length_m - house.first_fan_m;
                if per_row > 1 && span / (per_row as f64) < MIN_SERIES_SPACING_M {
                    continue;
                }
                let layout = FanLayout {
                    fan: fan.clone(),
                    fans_per_row: per_row,
                    rows,
                    spacing_m: (span / per_row as f64).max(0.5),
                    first_fan_m: house.first_fan_m,
                    mounting_height_m: house.mounting_height_m,
                    tilt_down_rad: house.tilt_down_rad,
                    house_length_m: house.length_m,
                    house_width_m: house.width_m,
                };
                if layout.validate().is_err() {
                    continue;
                }
                let Ok(est) = estimate_layout(&layout, structure) else {
                    continue;
                };
                let m = est.min_canopy_top.pick(estimate);
                best = best.max(m);
                if m >= target {
                    found.push((layout, est));
                    break 'model;
                }
            }
        }
    }
    if found.is_empty() {
        return Ok(FanSizing::NotReachable {
            best_min_m_s: best,
            target_m_s: target,
        });
    }
    found.sort_by(|a, b| {
        a.0.fan_count().cmp(&b.0.fan_count()).then(
            (a.0.fan_count() as f64 * a.0.fan.power_w())
                .total_cmp(&(b.0.fan_count() as f64 * b.0.fan.power_w())),
        )
    });
    Ok(FanSizing::Found(found))
}

// ---------------------------------------------------------------------------------------------
// Measured readings
// ---------------------------------------------------------------------------------------------

/// One anemometer reading.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct SpotReading {
    /// Position along the house \[m\].
    pub position_m: f64,
    /// Height above the floor \[m\].
    pub height_m: f64,
    /// Air speed \[m s⁻¹\].
    pub speed_m_s: f64,
}

/// Readings parsed from a CSV text, with the rows that were rejected.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct ReadingsImport {
    /// The good rows, in order.
    pub readings: Vec<SpotReading>,
    /// Why each bad row was rejected.
    pub errors: Vec<crate::weather::RowError>,
}

/// Parses anemometer readings from CSV text: a header naming `position_m`, `height_m` and
/// `speed_m_s` in any order (other columns ignored), then one reading per line; blank lines and
/// lines starting with `#` are skipped. A bad value rejects its row with the line, column, value and
/// reason; good rows are kept.
///
/// # Errors
/// [`PhysicsError::Inconsistent`] when no header with the three columns is found.
///
/// ```
/// let text = "# invented demo readings\nposition_m,height_m,speed_m_s\n0,1.8,0.35\n5,1.8,abc\n";
/// let r = leafwind_physics::fans::parse_readings_csv(text).unwrap();
/// assert_eq!(r.readings.len(), 1);
/// assert_eq!(r.errors[0].line, 4);
/// ```
pub fn parse_readings_csv(text: &str) -> Result<ReadingsImport> {
    let mut lines = text
        .lines()
        .enumerate()
        .map(|(i, l)| (i + 1, l.trim()))
        .filter(|(_, l)| !l.is_empty() && !l.starts_with('#'));
    let Some((_, header)) = lines.next() else {
        return Err(PhysicsError::Inconsistent(
            "the readings file has no header line (expected position_m, height_m, speed_m_s)"
                .into(),
        ));
    };
    let names: Vec<String> = header
        .split(',')
        .map(|h| h.trim().to_ascii_lowercase())
        .collect();
    let col = |name: &str| names.iter().position(|n| n == name);
    let (Some(ip), Some(ih), Some(iu)) = (col("position_m"), col("height_m"), col("speed_m_s"))
    else {
        return Err(PhysicsError::Inconsistent(format!(
            "the readings header \"{header}\" must name position_m, height_m and speed_m_s"
        )));
    };
    let mut readings = Vec::new();
    let mut errors = Vec::new();
    for (line, row) in lines {
        let cells: Vec<&str> = row.split(',').map(str::trim).collect();
        let get = |i: usize,
                   name: &str,
                   range: Option<ValidRange>|
         -> std::result::Result<f64, crate::weather::RowError> {
            let raw = cells.get(i).copied().unwrap_or("");
            let err = |reason: String| crate::weather::RowError {
                line,
                column: name.to_string(),
                value: raw.to_string(),
                reason,
            };
            let v: f64 = raw.parse().map_err(|_| err("not a number".into()))?;
            if !v.is_finite() {
                return Err(err("not a finite number".into()));
            }
            if let Some(r) = range {
                r.check(v).map_err(|e| err(e.to_string()))?;
            }
            Ok(v)
        };
        let parsed = (|| {
            Ok::<_, crate::weather::RowError>(SpotReading {
                position_m: get(ip, "position_m", None)?,
                height_m: get(ih, "height_m", None)?,
                speed_m_s: get(iu, "speed_m_s", Some(READING_RANGE_M_S))?,
            })
        })();
        match parsed {
            Ok(r) => readings.push(r),
            Err(e) => errors.push(e),
        }
    }
    Ok(ReadingsImport { readings, errors })
}

/// A slow spot and its predicted leaf.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct SlowSpot {
    /// The reading.
    pub reading: SpotReading,
    /// Predicted leaf temperature at that speed \[°C\] (None without a leaf case).
    pub leaf_temp_c: Option<f64>,
}

/// What a set of readings says.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct ReadingsSummary {
    /// Number of readings.
    pub count: usize,
    /// Slowest \[m s⁻¹\].
    pub min_m_s: f64,
    /// Mean \[m s⁻¹\].
    pub mean_m_s: f64,
    /// Fastest \[m s⁻¹\].
    pub max_m_s: f64,
    /// Uniformity min ÷ mean \[–\] (None when the mean is 0).
    pub uniformity: Option<f64>,
    /// Dead-zone threshold used \[m s⁻¹\].
    pub dead_zone_threshold_m_s: f64,
    /// Readings below the threshold, in the order given.
    pub dead_zones: Vec<SpotReading>,
    /// The slowest readings (up to the number asked), slowest first, with their predicted leaves.
    pub slowest: Vec<SlowSpot>,
}

/// Valid speed readings \[m s⁻¹\].
const READING_RANGE_M_S: ValidRange = ValidRange {
    quantity: "measured air speed",
    min: 0.0,
    max: 30.0,
    unit: "m/s",
};

/// Summarises anemometer readings: uniformity (min ÷ mean), dead zones below
/// `dead_zone_threshold_m_s` (default [`DEAD_ZONE_THRESHOLD_DEFAULT_M_S`], common practice), and the
/// predicted leaf temperature at the `slowest_count` slowest spots with `leaf` (its own air speed
/// replaced by each reading).
///
/// # Errors
/// No readings, a reading out of range (named with its position), an invalid threshold or leaf case.
pub fn analyse_readings(
    readings: &[SpotReading],
    dead_zone_threshold_m_s: f64,
    leaf: Option<&LeafCase>,
    slowest_count: usize,
) -> Result<ReadingsSummary> {
    if readings.is_empty() {
        return Err(PhysicsError::Inconsistent(
            "no anemometer readings were given".into(),
        ));
    }
    let thr = ValidRange {
        quantity: "dead-zone threshold",
        ..READING_RANGE_M_S
    }
    .check(dead_zone_threshold_m_s)?;
    for r in readings {
        READING_RANGE_M_S.check(r.speed_m_s).map_err(|e| {
            PhysicsError::Inconsistent(format!("reading at {:.2} m: {e}", r.position_m))
        })?;
        if !r.position_m.is_finite() || !r.height_m.is_finite() {
            return Err(PhysicsError::NotFinite {
                quantity: "reading position or height",
                value: if r.position_m.is_finite() {
                    r.height_m
                } else {
                    r.position_m
                },
            });
        }
    }
    if let Some(c) = leaf {
        c.validate()?;
    }
    let n = readings.len() as f64;
    let mean = readings.iter().map(|r| r.speed_m_s).sum::<f64>() / n;
    let min = readings
        .iter()
        .map(|r| r.speed_m_s)
        .fold(f64::INFINITY, f64::min);
    let max = readings.iter().map(|r| r.speed_m_s).fold(0.0, f64::max);
    let mut sorted = readings.to_vec();
    sorted.sort_by(|a, b| a.speed_m_s.total_cmp(&b.speed_m_s));
    let slowest = sorted
        .iter()
        .take(slowest_count)
        .map(|r| {
            Ok(SlowSpot {
                reading: *r,
                leaf_temp_c: match leaf {
                    Some(c) => Some(leaf_temp_c(&c.with_speed(r.speed_m_s))?),
                    None => None,
                },
            })
        })
        .collect::<Result<Vec<_>>>()?;
    Ok(ReadingsSummary {
        count: readings.len(),
        min_m_s: min,
        mean_m_s: mean,
        max_m_s: max,
        uniformity: (mean > 0.0).then_some(min / mean),
        dead_zone_threshold_m_s: thr,
        dead_zones: readings
            .iter()
            .filter(|r| r.speed_m_s < thr)
            .copied()
            .collect(),
        slowest,
    })
}

// ---------------------------------------------------------------------------------------------
// Diminishing returns
// ---------------------------------------------------------------------------------------------

/// Default cooling per further 0.1 m s⁻¹ below which more air is "not worth it" \[K\]: 0.1 (a
/// user choice; no source).
pub const WORTH_IT_DEFAULT_K: f64 = 0.1;

/// Step of the diminishing-returns sweep \[m s⁻¹\].
pub const RETURNS_STEP_M_S: f64 = 0.1;

/// One step of the sweep.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct ReturnsStep {
    /// Air speed \[m s⁻¹\].
    pub speed_m_s: f64,
    /// (Hottest) leaf temperature \[°C\].
    pub leaf_temp_c: f64,
    /// Transpiration \[mol m⁻² s⁻¹\] (per leaf or per ground area, as the evaluator gives it).
    pub transpiration_mol_m2_s: f64,
    /// Cooling bought by the next 0.1 m s⁻¹, T(u) − T(u + 0.1) \[K\] (None at the last step).
    pub cooling_next_step_k: Option<f64>,
}

/// Where more air stops paying, and where it hurts.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct DiminishingReturns {
    /// The sweep.
    pub steps: Vec<ReturnsStep>,
    /// Threshold used \[K per 0.1 m s⁻¹\].
    pub worth_it_k: f64,
    /// The least speed beyond which every further 0.1 m s⁻¹ cools by less than the threshold
    /// \[m s⁻¹\] (None if it still pays at the end of the sweep).
    pub knee_m_s: Option<f64>,
    /// The first speed at which the next step warms the leaf \[m s⁻¹\] (a transpiring leaf below
    /// the air).
    pub warming_from_m_s: Option<f64>,
    /// The first speed at which the next step raises transpiration \[m s⁻¹\].
    pub more_transpiration_from_m_s: Option<f64>,
}

impl DiminishingReturns {
    /// The finding in plain words.
    #[must_use]
    pub fn sentence(&self) -> String {
        let mut s = match self.knee_m_s {
            Some(u) => format!(
                "Beyond {u:.1} m/s each further 0.1 m/s cools the leaf by less than {:.2} K.",
                self.worth_it_k
            ),
            None => format!(
                "Up to the end of the sweep each 0.1 m/s still cools the leaf by at least {:.2} K.",
                self.worth_it_k
            ),
        };
        if let Some(u) = self.warming_from_m_s {
            s.push_str(&format!(
                " From {u:.1} m/s more air warms the leaf (it is cooler than the air)."
            ));
        }
        if let Some(u) = self.more_transpiration_from_m_s {
            s.push_str(&format!(
                " From {u:.1} m/s more air raises transpiration (more water use)."
            ));
        }
        s
    }
}

/// Sweeps the air speed from 0 to `max_speed_m_s` in steps of 0.1 m s⁻¹ with `eval(u)` returning
/// (leaf temperature \[°C\], transpiration \[mol m⁻² s⁻¹\]) and finds the knee and the flags.
///
/// # Errors
/// An invalid threshold or maximum, or a failing evaluation.
pub fn diminishing_returns(
    mut eval: impl FnMut(f64) -> Result<(f64, f64)>,
    max_speed_m_s: f64,
    worth_it_k: f64,
) -> Result<DiminishingReturns> {
    let max = crate::canopy::SEARCH_MAX_RANGE_M_S.check(max_speed_m_s)?;
    let thr = ValidRange {
        quantity: "cooling worth a further 0.1 m/s",
        min: 0.0,
        max: 10.0,
        unit: "K",
    }
    .check(worth_it_k)?;
    let n = (max / RETURNS_STEP_M_S).round() as usize;
    let mut raw = Vec::with_capacity(n + 1);
    for i in 0..=n {
        let u = i as f64 * RETURNS_STEP_M_S;
        let (t, e) = eval(u)?;
        raw.push((u, t, e));
    }
    let steps: Vec<ReturnsStep> = raw
        .iter()
        .enumerate()
        .map(|(i, &(u, t, e))| ReturnsStep {
            speed_m_s: u,
            leaf_temp_c: t,
            transpiration_mol_m2_s: e,
            cooling_next_step_k: raw.get(i + 1).map(|&(_, t2, _)| t - t2),
        })
        .collect();
    // The knee: the first step from which every later step cools by less than the threshold.
    let cool: Vec<f64> = steps.iter().filter_map(|s| s.cooling_next_step_k).collect();
    let mut knee = None;
    for i in (0..cool.len()).rev() {
        if cool[i] < thr {
            knee = Some(steps[i].speed_m_s);
        } else {
            break;
        }
    }
    let warming = steps
        .iter()
        .find(|s| s.cooling_next_step_k.is_some_and(|c| c < -1e-6))
        .map(|s| s.speed_m_s);
    let more_e = raw
        .windows(2)
        .find(|w| w[1].2 > w[0].2 * (1.0 + 1e-9) + 1e-12)
        .map(|w| w[0].0);
    Ok(DiminishingReturns {
        steps,
        worth_it_k: thr,
        knee_m_s: knee,
        warming_from_m_s: warming,
        more_transpiration_from_m_s: more_e,
    })
}

/// [`diminishing_returns`] for one leaf.
///
/// # Errors
/// As [`diminishing_returns`], or an invalid case.
pub fn leaf_diminishing_returns(
    case: &LeafCase,
    max_speed_m_s: f64,
    worth_it_k: f64,
) -> Result<DiminishingReturns> {
    case.validate()?;
    diminishing_returns(
        |u| {
            let s = solve_leaf(&case.with_speed(u))?;
            Ok((s.leaf_temp_c, s.terms.transpiration_mol_m2_s))
        },
        max_speed_m_s,
        worth_it_k,
    )
}

/// [`diminishing_returns`] for the hottest leaf of an open canopy (transpiration per ground area).
///
/// # Errors
/// As [`diminishing_returns`], or an invalid canopy.
pub fn canopy_diminishing_returns(
    case: &crate::canopy::CanopyCase,
    max_speed_m_s: f64,
    worth_it_k: f64,
) -> Result<DiminishingReturns> {
    case.validate()?;
    let optics = crate::canopy::CanopyOptics::new(&case.structure, case.leaf.absorptivity);
    diminishing_returns(
        |u| {
            let s = crate::canopy::solve_with_optics(&case.with_top_speed(u), &optics)?;
            Ok((s.hottest.leaf_temp_c, s.transpiration_mol_m2_s))
        },
        max_speed_m_s,
        worth_it_k,
    )
}

/// [`diminishing_returns`] for the hottest leaf of a greenhouse crop (the inside air re-solved at
/// every canopy-top speed; transpiration per ground area).
///
/// # Errors
/// As [`diminishing_returns`], or a greenhouse that cannot be solved.
pub fn greenhouse_diminishing_returns(
    case: &crate::greenhouse::GreenhouseCase,
    max_speed_m_s: f64,
    worth_it_k: f64,
) -> Result<DiminishingReturns> {
    case.validate()?;
    let optics = crate::canopy::CanopyOptics::new(&case.structure, case.leaf.absorptivity);
    diminishing_returns(
        |u| {
            let s =
                crate::greenhouse::solve_greenhouse_with_optics(&case.with_top_speed(u), &optics)?;
            Ok((
                s.canopy.hottest.leaf_temp_c,
                s.canopy.transpiration_mol_m2_s,
            ))
        },
        max_speed_m_s,
        worth_it_k,
    )
}

// ---------------------------------------------------------------------------------------------
// Energy
// ---------------------------------------------------------------------------------------------

/// Fan efficacy from cfm per watt to m³ s⁻¹ per W.
#[must_use]
pub fn cfm_per_w_to_m3_s_w(cfm_per_w: f64) -> f64 {
    cfm_to_m3_s(cfm_per_w)
}

/// Fan energy over a run.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct FanEnergy {
    /// Electrical power of all fans \[W\].
    pub power_w: f64,
    /// Power per floor area \[W m⁻²\].
    pub power_per_floor_w_m2: f64,
    /// Hours run \[h\].
    pub hours_h: f64,
    /// Energy \[kWh\].
    pub energy_kwh: f64,
    /// Energy per floor area \[kWh m⁻²\].
    pub energy_per_floor_kwh_m2: f64,
}

/// Fan energy for `layout` running `hours_h` hours: P = n Q₀ / efficacy, E = P t.
///
/// # Errors
/// An invalid layout or hours.
pub fn fan_energy(layout: &FanLayout, hours_h: f64) -> Result<FanEnergy> {
    layout.validate()?;
    let h = ValidRange {
        quantity: "hours of fan operation",
        min: 0.0,
        max: 1.0e6,
        unit: "h",
    }
    .check(hours_h)?;
    let p = layout.fan_count() as f64 * layout.fan.power_w();
    let a = layout.floor_area_m2();
    Ok(FanEnergy {
        power_w: p,
        power_per_floor_w_m2: p / a,
        hours_h: h,
        energy_kwh: p * h / 1000.0,
        energy_per_floor_kwh_m2: p * h / 1000.0 / a,
    })
}

/// Hours of an hourly run in which the fans would run: those whose air around the crop (inside air
/// in a greenhouse, else outside) is at or above `run_above_c` \[°C\]; unsolved hours are not
/// counted. Each hour counts 1 h.
#[must_use]
pub fn operating_hours(series: &crate::design_day::HourlySeries, run_above_c: f64) -> f64 {
    series
        .hours
        .iter()
        .filter(|h| h.error.is_none())
        .filter(|h| h.inside_air_temp_c.unwrap_or(h.air_temp_c) >= run_above_c)
        .count() as f64
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn units_round_trip() {
        // 1000 cfm = 0.4719 m³/s (exact foot).
        assert!((cfm_to_m3_s(1000.0) - 0.471_947).abs() < 1e-6);
        assert!((m3_s_to_cfm(cfm_to_m3_s(123.0)) - 123.0).abs() < 1e-9);
        assert!((m3_h_to_m3_s(3600.0) - 1.0).abs() < 1e-12);
        // 2 cfm/ft² ≈ 0.0102 m³/s per m² (common practice rule in SI).
        assert!((HAF_CAPACITY_RULE_M3_S_M2 - 0.010_16).abs() < 1e-5);
    }

    #[test]
    fn centreline_is_continuous_at_the_core() {
        let c = JET_HCG1994;
        let core = potential_core_length_m(0.5, &c);
        let a = centreline_speed_m_s(6.0, 0.5, core - 1e-9, &c);
        let b = centreline_speed_m_s(6.0, 0.5, core + 1e-9, &c);
        assert!((a - b).abs() < 1e-6);
    }

    #[test]
    fn default_layout_estimates() {
        let e = estimate_layout(&FanLayout::default(), &CanopyStructure::default()).unwrap();
        let m = e.min_canopy_top;
        assert!(m.low_m_s <= m.typical_m_s && m.typical_m_s <= m.high_m_s);
        assert!(e.uniformity > 0.0 && e.uniformity <= 1.0);
    }
}

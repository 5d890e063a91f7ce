//! The component types of one leaf case — the air, the leaf, its surroundings and the flow
//! settings — with their defaults and valid ranges. They only carry fields; the processes live in
//! their own modules and [`crate::energy_balance`] runs them.

use crate::air::{AIR_TEMP_RANGE_C, Humidity, PRESSURE_RANGE_KPA};
use crate::constants::{STANDARD_PRESSURE_KPA, ZERO_CELSIUS_K};
use crate::convection::{
    CRITICAL_REYNOLDS_DEFAULT, CRITICAL_REYNOLDS_RANGE, TURBULENCE_FACTOR_DEFAULT,
    TURBULENCE_FACTOR_RANGE,
};
use crate::error::{Result, ValidRange};
use crate::radiation::{
    ABSORPTIVITY_RANGE, ALBEDO_RANGE, EMISSIVITY_RANGE, GROUND_ALBEDO_DEFAULT,
    SHORTWAVE_RANGE_W_M2, SURFACE_TEMP_RANGE_C, UpperView,
};
use crate::transpiration::{
    CUTICULAR_CONDUCTANCE_DEFAULT_MOL_M2_S, CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S,
    LOWER_SHARE_DEFAULT, LOWER_SHARE_RANGE, STOMATAL_CONDUCTANCE_DEFAULT_MOL_M2_S,
    STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S,
};

/// Valid air speeds over the leaf \[m s⁻¹\] (still air to a strong gale).
pub const AIR_SPEED_RANGE_M_S: ValidRange = ValidRange {
    quantity: "air speed",
    min: 0.0,
    max: 30.0,
    unit: "m/s",
};

/// Valid leaf characteristic dimensions along the wind \[m\] (a 1 mm needle to a 1 m banana leaf).
pub const LEAF_DIMENSION_RANGE_M: ValidRange = ValidRange {
    quantity: "leaf size along the wind",
    min: 0.001,
    max: 1.0,
    unit: "m",
};

/// Valid free-convection lengths A_s/P \[m\] (a 1 mm needle's 0.25 mm to a 1 m leaf's 0.5 m).
pub const FREE_CONVECTION_LENGTH_RANGE_M: ValidRange = ValidRange {
    quantity: "free-convection length (area / perimeter)",
    min: 0.000_25,
    max: 0.5,
    unit: "m",
};

/// Default leaf characteristic dimension \[m\]: 0.05 (a mid-sized crop leaflet; common practice, no
/// source).
pub const LEAF_DIMENSION_DEFAULT_M: f64 = 0.05;

/// Default shortwave absorptivity of a green leaf \[–\]: 0.5 over the whole solar spectrum
/// (Campbell & Norman 1998, *An Introduction to Environmental Biophysics*, 2nd ed., ch. 11;
/// value from memory).
pub const ABSORPTIVITY_DEFAULT: f64 = 0.5;

/// Default longwave emissivity of a leaf \[–\]: 0.97 (Campbell & Norman 1998, Table 11.3 lists
/// 0.94–0.99 for leaves; value from memory).
pub const EMISSIVITY_DEFAULT: f64 = 0.97;

/// The air around the leaf.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct Air {
    /// Air temperature \[°C\].
    pub temp_c: f64,
    /// Humidity, as RH, dew point or deficit.
    pub humidity: Humidity,
    /// Atmospheric pressure \[kPa\].
    pub pressure_kpa: f64,
    /// Air speed over the leaf, free stream \[m s⁻¹\].
    pub speed_m_s: f64,
    /// Free-stream turbulence enhancement of forced convection \[–\].
    pub turbulence_factor: f64,
}

impl Default for Air {
    fn default() -> Self {
        Self {
            temp_c: 25.0,
            humidity: Humidity::RelativePct(60.0),
            pressure_kpa: STANDARD_PRESSURE_KPA,
            speed_m_s: 0.5,
            turbulence_factor: TURBULENCE_FACTOR_DEFAULT,
        }
    }
}

/// The leaf: size, optical properties and stomata.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct Leaf {
    /// Characteristic dimension along the wind \[m\].
    pub dimension_m: f64,
    /// Shortwave (solar) absorptivity \[–\].
    pub absorptivity: f64,
    /// Longwave emissivity (= longwave absorptivity) \[–\].
    pub emissivity: f64,
    /// Total stomatal conductance to water vapour, both faces \[mol m⁻² s⁻¹\].
    pub stomatal_conductance_mol_m2_s: f64,
    /// Share of the stomatal conductance on the lower face \[–\].
    pub lower_share: f64,
    /// Cuticular conductance, both faces together, shared equally \[mol m⁻² s⁻¹\].
    pub cuticular_conductance_mol_m2_s: f64,
    /// Free-convection length A_s/P of the leaf outline \[m\] (from [`crate::shape`]); `None`
    /// takes a square leaf, d/4 ([`crate::convection::FREE_CONVECTION_LENGTH_PER_DIMENSION`]).
    #[cfg_attr(feature = "serde", serde(default))]
    pub free_convection_length_m: Option<f64>,
}

impl Default for Leaf {
    fn default() -> Self {
        Self {
            dimension_m: LEAF_DIMENSION_DEFAULT_M,
            absorptivity: ABSORPTIVITY_DEFAULT,
            emissivity: EMISSIVITY_DEFAULT,
            stomatal_conductance_mol_m2_s: STOMATAL_CONDUCTANCE_DEFAULT_MOL_M2_S,
            lower_share: LOWER_SHARE_DEFAULT,
            cuticular_conductance_mol_m2_s: CUTICULAR_CONDUCTANCE_DEFAULT_MOL_M2_S,
            free_convection_length_m: None,
        }
    }
}

impl Leaf {
    /// The free-convection length A_s/P \[m\] in use: the outline's, or d/4 for a square leaf.
    #[must_use]
    pub fn free_convection_length_m(&self) -> f64 {
        self.free_convection_length_m
            .unwrap_or(crate::convection::FREE_CONVECTION_LENGTH_PER_DIMENSION * self.dimension_m)
    }
}

/// What the leaf sees: sun, sky or cover above, ground below.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct Surroundings {
    /// Shortwave irradiance on the upper face, direct plus diffuse \[W m⁻²\].
    pub shortwave_w_m2: f64,
    /// Albedo of the ground below, which lights the lower face \[–\].
    pub ground_albedo: f64,
    /// What the upper face sees for longwave.
    pub upper_view: UpperView,
    /// Ground surface temperature \[°C\]; `None` takes the air temperature.
    pub ground_temp_c: Option<f64>,
}

impl Default for Surroundings {
    fn default() -> Self {
        Self {
            shortwave_w_m2: 500.0,
            ground_albedo: GROUND_ALBEDO_DEFAULT,
            upper_view: UpperView::ClearSky,
            ground_temp_c: None,
        }
    }
}

/// One leaf case: everything the energy balance needs.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct LeafCase {
    /// The air.
    pub air: Air,
    /// The leaf.
    pub leaf: Leaf,
    /// The surroundings.
    pub surroundings: Surroundings,
    /// Transition Reynolds number for the flat-plate correlations \[–\].
    pub critical_reynolds: f64,
}

impl Default for LeafCase {
    fn default() -> Self {
        Self {
            air: Air::default(),
            leaf: Leaf::default(),
            surroundings: Surroundings::default(),
            critical_reynolds: CRITICAL_REYNOLDS_DEFAULT,
        }
    }
}

impl LeafCase {
    /// Checks every input against its documented range (and the humidity for consistency).
    ///
    /// # Errors
    /// The first input found out of range, NaN or infinite, naming it.
    pub fn validate(&self) -> Result<()> {
        AIR_TEMP_RANGE_C.check(self.air.temp_c)?;
        self.air.humidity.vapour_pressure_kpa(self.air.temp_c)?;
        PRESSURE_RANGE_KPA.check(self.air.pressure_kpa)?;
        AIR_SPEED_RANGE_M_S.check(self.air.speed_m_s)?;
        TURBULENCE_FACTOR_RANGE.check(self.air.turbulence_factor)?;
        LEAF_DIMENSION_RANGE_M.check(self.leaf.dimension_m)?;
        if let Some(l) = self.leaf.free_convection_length_m {
            FREE_CONVECTION_LENGTH_RANGE_M.check(l)?;
        }
        ABSORPTIVITY_RANGE.check(self.leaf.absorptivity)?;
        EMISSIVITY_RANGE.check(self.leaf.emissivity)?;
        STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S.check(self.leaf.stomatal_conductance_mol_m2_s)?;
        LOWER_SHARE_RANGE.check(self.leaf.lower_share)?;
        CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S.check(self.leaf.cuticular_conductance_mol_m2_s)?;
        SHORTWAVE_RANGE_W_M2.check(self.surroundings.shortwave_w_m2)?;
        ALBEDO_RANGE.check(self.surroundings.ground_albedo)?;
        match self.surroundings.upper_view {
            UpperView::ClearSky => {}
            UpperView::SkyTempC(t) => {
                ValidRange {
                    quantity: "sky temperature",
                    ..SURFACE_TEMP_RANGE_C
                }
                .check(t)?;
            }
            UpperView::CoverTempC(t) => {
                ValidRange {
                    quantity: "cover temperature",
                    ..SURFACE_TEMP_RANGE_C
                }
                .check(t)?;
            }
        }
        if let Some(t) = self.surroundings.ground_temp_c {
            ValidRange {
                quantity: "ground temperature",
                ..SURFACE_TEMP_RANGE_C
            }
            .check(t)?;
        }
        CRITICAL_REYNOLDS_RANGE.check(self.critical_reynolds)?;
        Ok(())
    }

    /// The same case at another air speed \[m s⁻¹\].
    #[must_use]
    pub fn with_speed(mut self, speed_m_s: f64) -> Self {
        self.air.speed_m_s = speed_m_s;
        self
    }

    /// The same case with another leaf dimension \[m\].
    #[must_use]
    pub fn with_dimension(mut self, dimension_m: f64) -> Self {
        self.leaf.dimension_m = dimension_m;
        self
    }

    /// Air temperature \[K\].
    #[must_use]
    pub fn air_temp_k(&self) -> f64 {
        self.air.temp_c + ZERO_CELSIUS_K
    }
}

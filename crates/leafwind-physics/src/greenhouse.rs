//! A crop under a greenhouse cover: light through the cover and a shade screen, longwave to the
//! cover, and the inside air either given or found from a steady ventilation balance; plus the
//! sizing answers — the least canopy-top air speed and the least shade that keep the hottest leaf
//! under a limit.
//!
//! Steady balance of the inside air, per unit floor area (\[ASHRAE-HA\], \[EP406\]; the form here is
//! this engine's, written from those sources' terms):
//!
//! - sensible: H_c + Q_f = (ρ c_p V + U) (T_i − T_o), with H_c the canopy's sensible heat to the air
//!   (from [`crate::canopy`]), Q_f the solar reaching the floor, taken as returned to the air as
//!   sensible heat (steady state, no soil storage, floor longwave neglected — a simplification, no
//!   source), V the ventilation rate \[m³ s⁻¹ per m² floor\] and U the heat-loss coefficient of the
//!   cover per floor area;
//! - vapour: E_c M_w = V (ρ_v,i − ρ_v,o), the crop's transpiration carried out by the ventilation air
//!   (condensation on the cover and evaporation from the floor neglected); ρ_v = e M_w / (R T).
//!
//! The crop's transpiration cooling thus enters twice, as it does in a real house: it lowers H_c
//! (the leaves run cooler) and it humidifies the air the fans must remove.
//!
//! The least ventilation rate for a rise or for the hottest leaf, and the standard's factor method
//! beside it, are in [`crate::ventilation`]; `tests/ventilation.rs` checks this balance against
//! that method.
//!
//! **Cautions.** A steady balance says nothing about the hours it takes to get there, nor about
//! people: a greenhouse that is hot for the crop is dangerous for workers. Fans, vents and their
//! electrical installation must follow local codes and be designed and installed by licensed
//! practitioners; use these figures for a first look, not for a design.
//!
//! # References
//! - \[ASHRAE-HA\] ASHRAE. *ASHRAE Handbook — HVAC Applications*, chapter "Environmental control for
//!   animals and plants" (greenhouse section: solar heat gain through the cover, heat loss
//!   coefficients of glazings, summer ventilation rates of about 0.04–0.05 m³ s⁻¹ per m² floor and
//!   evaporative cooling; edition and values from memory).
//! - \[EP406\] ASABE EP406 (reaffirmed). *Heating, Ventilating and Cooling Greenhouses*. American
//!   Society of Agricultural and Biological Engineers (ventilation rate from the solar gain, the
//!   evapotranspiration of the crop and the allowed inside–outside temperature rise; from memory).

use crate::air::{
    AIR_TEMP_RANGE_C, AirProperties, Humidity, PRESSURE_RANGE_KPA, molar_latent_heat_j_mol,
    saturation_vapour_pressure_kpa,
};
use crate::canopy::{
    CanopyCase, CanopyLight, CanopyOptics, CanopySolution, CanopyStructure, SEARCH_MAX_RANGE_M_S,
    SpeedAnswer, least_speed, solve_with_optics,
};
use crate::case::{AIR_SPEED_RANGE_M_S, Air, Leaf};
use crate::constants::{GAS_CONSTANT_J_MOL_K, MOLAR_MASS_WATER_KG_MOL, ZERO_CELSIUS_K};
use crate::convection::{CRITICAL_REYNOLDS_DEFAULT, TURBULENCE_FACTOR_DEFAULT};
use crate::error::{PhysicsError, Result, ValidRange};
use crate::radiation::{SURFACE_TEMP_RANGE_C, UpperView};
use crate::required_wind::{LIMIT_RANGE_C, MARGIN_RANGE_K};
use crate::sun::HorizontalShortwave;

/// Valid cover transmittances to solar radiation \[–\].
pub const TRANSMITTANCE_RANGE: ValidRange = ValidRange {
    quantity: "cover transmittance",
    min: 0.0,
    max: 1.0,
    unit: "",
};

/// Default cover transmittance \[–\]: 0.7, a glass or film house with its structure (clean glass
/// alone transmits about 0.9; common practice, no source).
pub const TRANSMITTANCE_DEFAULT: f64 = 0.7;

/// Valid shade-screen fractions \[–\] (fraction of the light the screen holds back).
pub const SHADE_FRACTION_RANGE: ValidRange = ValidRange {
    quantity: "shade fraction",
    min: 0.0,
    max: 1.0,
    unit: "",
};

/// Valid ventilation rates per floor area \[m³ s⁻¹ m⁻²\].
pub const VENTILATION_RANGE_M3_M2_S: ValidRange = ValidRange {
    quantity: "ventilation rate per floor area",
    min: 1e-4,
    max: 0.5,
    unit: "m³/s per m²",
};

/// Default summer ventilation rate \[m³ s⁻¹ m⁻²\]: 0.04 (\[ASHRAE-HA\], \[EP406\]: about 0.04–0.05
/// m³ s⁻¹ per m² of floor for summer cooling; from memory). Willits, D. H. (2003). Cooling
/// fan-ventilated greenhouses: a modelling study. *Biosystems Engineering* 84, 315–329, reports
/// little gain beyond about 0.05 m³ m⁻² s⁻¹ without evaporative pad cooling.
pub const VENTILATION_DEFAULT_M3_M2_S: f64 = 0.04;

/// Valid heat-loss coefficients of the cover per floor area \[W m⁻² K⁻¹\].
pub const HEAT_LOSS_RANGE_W_M2_K: ValidRange = ValidRange {
    quantity: "cover heat-loss coefficient",
    min: 0.0,
    max: 20.0,
    unit: "W/m²/K",
};

/// Default heat-loss coefficient of the cover per floor area \[W m⁻² K⁻¹\]: 7.5 — single glass or
/// film about 6.2–6.8 W m⁻² K⁻¹ of cover (\[ASHRAE-HA\], from memory) times a cover-to-floor area
/// ratio of about 1.2 (common practice, no source).
pub const HEAT_LOSS_DEFAULT_W_M2_K: f64 = 7.5;

/// Default canopy-top air speed inside a greenhouse \[m s⁻¹\]: 0.5, horizontal air-flow fans
/// (common practice, no source).
pub const INSIDE_SPEED_DEFAULT_M_S: f64 = 0.5;

/// The temperature of the cover for the crop's longwave exchange.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum CoverTemperature {
    /// Measured or chosen \[°C\].
    GivenC(f64),
    /// Halfway between the inside and the outside air (common practice, no source).
    MeanOfInsideAndOutside,
}

/// The cover.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct Cover {
    /// Solar transmittance, beam and diffuse alike \[–\].
    pub transmittance: f64,
    /// Temperature seen by the crop for longwave.
    pub temperature: CoverTemperature,
    /// Heat-loss coefficient per floor area U \[W m⁻² K⁻¹\].
    pub heat_loss_w_m2_k: f64,
}

impl Default for Cover {
    fn default() -> Self {
        Self {
            transmittance: TRANSMITTANCE_DEFAULT,
            temperature: CoverTemperature::MeanOfInsideAndOutside,
            heat_loss_w_m2_k: HEAT_LOSS_DEFAULT_W_M2_K,
        }
    }
}

/// How the inside air is known.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum InsideAir {
    /// Measured or set: temperature \[°C\] and humidity.
    Given {
        /// Inside air temperature \[°C\].
        temp_c: f64,
        /// Inside humidity.
        humidity: Humidity,
    },
    /// From the steady ventilation balance at this rate \[m³ s⁻¹ per m² floor\].
    Ventilated {
        /// Ventilation rate per floor area V \[m³ s⁻¹ m⁻²\].
        rate_m3_m2_s: f64,
    },
}

/// The weather outside.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct Outside {
    /// Outside air temperature \[°C\].
    pub air_temp_c: f64,
    /// Outside humidity.
    pub humidity: Humidity,
    /// Atmospheric pressure \[kPa\].
    pub pressure_kpa: f64,
    /// Sun elevation \[rad\].
    pub sun_elevation_rad: f64,
    /// Beam and diffuse on a horizontal surface outside \[W m⁻²\].
    pub shortwave: HorizontalShortwave,
}

impl Default for Outside {
    /// An invented hot, sunny afternoon.
    fn default() -> Self {
        Self {
            air_temp_c: 30.0,
            humidity: Humidity::RelativePct(40.0),
            pressure_kpa: crate::constants::STANDARD_PRESSURE_KPA,
            sun_elevation_rad: 60f64.to_radians(),
            shortwave: HorizontalShortwave {
                beam_w_m2: 700.0,
                diffuse_w_m2: 120.0,
            },
        }
    }
}

/// One greenhouse case.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct GreenhouseCase {
    /// The weather outside.
    pub outside: Outside,
    /// The cover.
    pub cover: Cover,
    /// Fraction of the transmitted light a shade screen holds back \[–\].
    pub shade_fraction: f64,
    /// The inside air: given or from the ventilation balance.
    pub inside: InsideAir,
    /// Air speed at the canopy top inside \[m s⁻¹\].
    pub canopy_top_speed_m_s: f64,
    /// The leaves.
    pub leaf: Leaf,
    /// The canopy structure.
    pub structure: CanopyStructure,
    /// Free-stream turbulence factor of the inside air \[–\].
    pub turbulence_factor: f64,
    /// Transition Reynolds number \[–\].
    pub critical_reynolds: f64,
    /// Leaf temperature limit for the hottest-leaf margin \[°C\], if any.
    pub limit_c: Option<f64>,
}

impl Default for GreenhouseCase {
    fn default() -> Self {
        Self {
            outside: Outside::default(),
            cover: Cover::default(),
            shade_fraction: 0.0,
            inside: InsideAir::Ventilated {
                rate_m3_m2_s: VENTILATION_DEFAULT_M3_M2_S,
            },
            canopy_top_speed_m_s: INSIDE_SPEED_DEFAULT_M_S,
            leaf: Leaf::default(),
            structure: CanopyStructure::default(),
            turbulence_factor: TURBULENCE_FACTOR_DEFAULT,
            critical_reynolds: CRITICAL_REYNOLDS_DEFAULT,
            limit_c: None,
        }
    }
}

impl GreenhouseCase {
    /// The same case at another canopy-top speed \[m s⁻¹\].
    #[must_use]
    pub fn with_top_speed(mut self, speed_m_s: f64) -> Self {
        self.canopy_top_speed_m_s = speed_m_s;
        self
    }

    /// The same case with another shade fraction \[–\].
    #[must_use]
    pub fn with_shade(mut self, shade_fraction: f64) -> Self {
        self.shade_fraction = shade_fraction;
        self
    }

    /// Checks the greenhouse's own inputs (the canopy's are checked when it is solved).
    ///
    /// # Errors
    /// The first input out of range.
    pub fn validate(&self) -> Result<()> {
        let o = &self.outside;
        ValidRange {
            quantity: "outside air temperature",
            ..AIR_TEMP_RANGE_C
        }
        .check(o.air_temp_c)?;
        o.humidity.vapour_pressure_kpa(o.air_temp_c)?;
        PRESSURE_RANGE_KPA.check(o.pressure_kpa)?;
        CanopyLight {
            sun_elevation_rad: o.sun_elevation_rad,
            shortwave: o.shortwave,
        }
        .validate()?;
        TRANSMITTANCE_RANGE.check(self.cover.transmittance)?;
        HEAT_LOSS_RANGE_W_M2_K.check(self.cover.heat_loss_w_m2_k)?;
        if let CoverTemperature::GivenC(t) = self.cover.temperature {
            ValidRange {
                quantity: "cover temperature",
                ..SURFACE_TEMP_RANGE_C
            }
            .check(t)?;
        }
        SHADE_FRACTION_RANGE.check(self.shade_fraction)?;
        match self.inside {
            InsideAir::Given { temp_c, humidity } => {
                ValidRange {
                    quantity: "inside air temperature",
                    ..AIR_TEMP_RANGE_C
                }
                .check(temp_c)?;
                humidity.vapour_pressure_kpa(temp_c)?;
            }
            InsideAir::Ventilated { rate_m3_m2_s } => {
                VENTILATION_RANGE_M3_M2_S.check(rate_m3_m2_s)?;
            }
        }
        AIR_SPEED_RANGE_M_S.check(self.canopy_top_speed_m_s)?;
        self.structure.validate()?;
        Ok(())
    }

    /// Light inside above the canopy: τ (1 − f_shade) times the outside beam and diffuse.
    #[must_use]
    pub fn inside_light(&self) -> HorizontalShortwave {
        let f = self.cover.transmittance * (1.0 - self.shade_fraction);
        HorizontalShortwave {
            beam_w_m2: f * self.outside.shortwave.beam_w_m2,
            diffuse_w_m2: f * self.outside.shortwave.diffuse_w_m2,
        }
    }

    fn cover_temp_c(&self, inside_c: f64) -> f64 {
        match self.cover.temperature {
            CoverTemperature::GivenC(t) => t,
            CoverTemperature::MeanOfInsideAndOutside => 0.5 * (inside_c + self.outside.air_temp_c),
        }
    }

    /// The canopy case inside for inside air at `temp_c` with vapour pressure `vapour_kpa`.
    fn canopy_case(&self, temp_c: f64, humidity: Humidity) -> CanopyCase {
        CanopyCase {
            air: Air {
                temp_c,
                humidity,
                pressure_kpa: self.outside.pressure_kpa,
                speed_m_s: self.canopy_top_speed_m_s,
                turbulence_factor: self.turbulence_factor,
            },
            leaf: self.leaf,
            upper_view: UpperView::CoverTempC(self.cover_temp_c(temp_c)),
            light: CanopyLight {
                sun_elevation_rad: self.outside.sun_elevation_rad,
                shortwave: self.inside_light(),
            },
            structure: self.structure,
            critical_reynolds: self.critical_reynolds,
            limit_c: self.limit_c,
        }
    }
}

/// The solved greenhouse. Fluxes per unit floor area.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct GreenhouseSolution {
    /// Inside air temperature \[°C\].
    pub inside_air_temp_c: f64,
    /// Inside vapour pressure \[kPa\].
    pub inside_vapour_pressure_kpa: f64,
    /// Inside relative humidity \[%\].
    pub inside_rh_pct: f64,
    /// Cover temperature used for longwave \[°C\].
    pub cover_temp_c: f64,
    /// Global shortwave above the canopy inside \[W m⁻²\].
    pub inside_shortwave_w_m2: f64,
    /// The canopy.
    pub canopy: CanopySolution,
    /// Solar reaching the floor, returned to the air as sensible heat \[W m⁻²\] (0 with given air).
    pub floor_sensible_w_m2: f64,
    /// Sensible heat carried out by the ventilation air ρ c_p V (T_i − T_o) \[W m⁻²\].
    pub ventilation_sensible_w_m2: f64,
    /// Heat lost through the cover U (T_i − T_o) \[W m⁻²\].
    pub cover_loss_w_m2: f64,
    /// Latent heat carried out as vapour, λ V (ρ_v,i − ρ_v,o) \[W m⁻²\].
    pub ventilation_latent_w_m2: f64,
    /// Sensible balance residual (in − out) \[W m⁻²\]; 0 with given air.
    pub sensible_residual_w_m2: f64,
    /// Vapour balance residual (transpired − removed), as latent heat \[W m⁻²\]; 0 with given air.
    pub vapour_residual_w_m2: f64,
    /// Whether the inside air is at saturation (the fans cannot carry the vapour away; it would
    /// condense on the cover).
    pub inside_saturated: bool,
}

/// Vapour density ρ_v = e M_w / (R T) \[kg m⁻³\] (ideal gas).
fn vapour_density_kg_m3(vapour_kpa: f64, temp_c: f64) -> f64 {
    vapour_kpa * 1e3 * MOLAR_MASS_WATER_KG_MOL / (GAS_CONSTANT_J_MOL_K * (temp_c + ZERO_CELSIUS_K))
}

/// Root of a decreasing function on \[a, b\] with f(a) > 0 > f(b) by the Illinois variant of regula
/// falsi (Dowell, M., Jarratt, P. (1971). *BIT* 11, 168–174), to |b − a| ≤ `tol`.
fn illinois(
    mut f: impl FnMut(f64) -> Result<f64>,
    mut a: f64,
    mut b: f64,
    mut fa: f64,
    mut fb: f64,
    tol: f64,
) -> Result<f64> {
    let mut side = 0i8;
    for _ in 0..100 {
        let c = (a * fb - b * fa) / (fb - fa);
        let c = if c.is_finite() && c > a.min(b) && c < a.max(b) {
            c
        } else {
            0.5 * (a + b)
        };
        let fc = f(c)?;
        if fc == 0.0 || (b - a).abs() <= tol {
            return Ok(c);
        }
        if fc > 0.0 {
            a = c;
            fa = fc;
            if side == 1 {
                fb *= 0.5;
            }
            side = 1;
        } else {
            b = c;
            fb = fc;
            if side == -1 {
                fa *= 0.5;
            }
            side = -1;
        }
        if (b - a).abs() <= tol {
            return Ok(0.5 * (a + b));
        }
    }
    Ok(0.5 * (a + b))
}

fn rh_humidity(vapour_kpa: f64, temp_c: f64) -> Humidity {
    Humidity::RelativePct(
        (100.0 * vapour_kpa / saturation_vapour_pressure_kpa(temp_c)).clamp(0.0, 100.0),
    )
}

/// Solves a greenhouse case.
///
/// With [`InsideAir::Given`] the canopy is solved in that air. With [`InsideAir::Ventilated`] the
/// inside temperature and vapour pressure are found from the two balances of the module
/// documentation by nested one-dimensional root finding (Illinois): for each trial inside
/// temperature the vapour balance fixes the vapour pressure, and the sensible balance picks the
/// temperature (to 10⁻⁴ K). The inside temperature is sought from 10 K below to 40 K above the
/// outside air, within −30 to 60 °C.
///
/// # Errors
/// Invalid inputs, or a balance with no root in the search range (e.g. too little ventilation for
/// the solar load: the inside air would pass 60 °C).
///
/// ```
/// use leafwind_physics::greenhouse::{GreenhouseCase, solve_greenhouse};
/// let s = solve_greenhouse(&GreenhouseCase::default()).unwrap();
/// assert!(s.inside_air_temp_c > s.canopy.air_temp_c - 1e-9);
/// assert!(s.sensible_residual_w_m2.abs() < 0.05);
/// ```
pub fn solve_greenhouse(case: &GreenhouseCase) -> Result<GreenhouseSolution> {
    case.validate()?;
    let optics = CanopyOptics::new(&case.structure, case.leaf.absorptivity);
    solve_greenhouse_with_optics(case, &optics)
}

/// As [`solve_greenhouse`] with precomputed canopy optics.
///
/// # Errors
/// As [`solve_greenhouse`].
pub fn solve_greenhouse_with_optics(
    case: &GreenhouseCase,
    optics: &CanopyOptics,
) -> Result<GreenhouseSolution> {
    case.validate()?;
    let inside_sw = case.inside_light().global_w_m2();
    let rate = match case.inside {
        InsideAir::Given { temp_c, humidity } => {
            let c = case.canopy_case(temp_c, humidity);
            let canopy = solve_with_optics(&c, optics)?;
            let e = humidity.vapour_pressure_kpa(temp_c)?;
            return Ok(GreenhouseSolution {
                inside_air_temp_c: temp_c,
                inside_vapour_pressure_kpa: e,
                inside_rh_pct: 100.0 * e / saturation_vapour_pressure_kpa(temp_c),
                cover_temp_c: case.cover_temp_c(temp_c),
                inside_shortwave_w_m2: inside_sw,
                canopy,
                floor_sensible_w_m2: 0.0,
                ventilation_sensible_w_m2: 0.0,
                cover_loss_w_m2: 0.0,
                ventilation_latent_w_m2: 0.0,
                sensible_residual_w_m2: 0.0,
                vapour_residual_w_m2: 0.0,
                inside_saturated: false,
            });
        }
        InsideAir::Ventilated { rate_m3_m2_s } => rate_m3_m2_s,
    };
    let t_o = case.outside.air_temp_c;
    let e_o = case.outside.humidity.vapour_pressure_kpa(t_o)?;
    let p = case.outside.pressure_kpa;
    let rho_v_o = vapour_density_kg_m3(e_o, t_o);
    let u_cover = case.cover.heat_loss_w_m2_k;

    // For a trial inside temperature: the vapour pressure closing the vapour balance, the canopy
    // there, and whether the air saturated.
    let at_temp = |t_i: f64| -> Result<(f64, CanopySolution, bool)> {
        let e_sat = saturation_vapour_pressure_kpa(t_i);
        let e_lo = e_o.min(e_sat);
        let solve_e =
            |e: f64| solve_with_optics(&case.canopy_case(t_i, rh_humidity(e, t_i)), optics);
        let vapour_f = |s: &CanopySolution, e: f64| {
            s.transpiration_mol_m2_s * MOLAR_MASS_WATER_KG_MOL
                - rate * (vapour_density_kg_m3(e, t_i) - rho_v_o)
        };
        let s_lo = solve_e(e_lo)?;
        let f_lo = vapour_f(&s_lo, e_lo);
        if f_lo <= 0.0 {
            return Ok((e_lo, s_lo, e_lo >= e_sat));
        }
        let s_hi = solve_e(e_sat)?;
        let f_hi = vapour_f(&s_hi, e_sat);
        if f_hi >= 0.0 {
            return Ok((e_sat, s_hi, true));
        }
        let e = illinois(
            |e| Ok(vapour_f(&solve_e(e)?, e)),
            e_lo,
            e_sat,
            f_lo,
            f_hi,
            1e-7,
        )?;
        Ok((e, solve_e(e)?, false))
    };
    let rho_cp = |t_i: f64, e: f64| {
        let props = AirProperties::at(t_i + ZERO_CELSIUS_K, p, e);
        props.density_kg_m3 * props.specific_heat_j_kg_k
    };
    let sensible_g = |t_i: f64| -> Result<(f64, f64, CanopySolution, bool)> {
        let (e, s, sat) = at_temp(t_i)?;
        let g = s.sensible_w_m2 + s.ground_shortwave_w_m2
            - (rho_cp(t_i, e) * rate + u_cover) * (t_i - t_o);
        Ok((g, e, s, sat))
    };
    let lo = (t_o - 10.0).max(AIR_TEMP_RANGE_C.min);
    let hi = (t_o + 40.0).min(AIR_TEMP_RANGE_C.max);
    let (g_lo, ..) = sensible_g(lo)?;
    let (g_hi, ..) = sensible_g(hi)?;
    if g_hi > 0.0 {
        return Err(PhysicsError::Inconsistent(format!(
            "the inside air would pass {hi:.0} °C: a ventilation rate of {rate} m³/s per m² cannot carry off this solar load (raise the ventilation rate or the shade)"
        )));
    }
    if g_lo < 0.0 {
        return Err(PhysicsError::Inconsistent(format!(
            "the inside air would fall below {lo:.0} °C: the balance has no root in the search range"
        )));
    }
    let t_i = illinois(|t| Ok(sensible_g(t)?.0), lo, hi, g_lo, g_hi, 1e-4)?;
    let (g, e_i, canopy, saturated) = sensible_g(t_i)?;
    let lambda_j_kg = molar_latent_heat_j_mol(t_i) / MOLAR_MASS_WATER_KG_MOL;
    let removed_kg = rate * (vapour_density_kg_m3(e_i, t_i) - rho_v_o);
    let transpired_kg = canopy.transpiration_mol_m2_s * MOLAR_MASS_WATER_KG_MOL;
    Ok(GreenhouseSolution {
        inside_air_temp_c: t_i,
        inside_vapour_pressure_kpa: e_i,
        inside_rh_pct: 100.0 * e_i / saturation_vapour_pressure_kpa(t_i),
        cover_temp_c: case.cover_temp_c(t_i),
        inside_shortwave_w_m2: inside_sw,
        floor_sensible_w_m2: canopy.ground_shortwave_w_m2,
        ventilation_sensible_w_m2: rho_cp(t_i, e_i) * rate * (t_i - t_o),
        cover_loss_w_m2: u_cover * (t_i - t_o),
        ventilation_latent_w_m2: lambda_j_kg * removed_kg,
        sensible_residual_w_m2: g,
        vapour_residual_w_m2: lambda_j_kg * (transpired_kg - removed_kg),
        inside_saturated: saturated,
        canopy,
    })
}

/// The least shade that keeps the hottest leaf at or below the target.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum ShadeAnswer {
    /// No shade is needed.
    NotNeeded {
        /// Hottest leaf without shade \[°C\].
        hottest_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
    },
    /// The least shade fraction that meets the target.
    Fraction {
        /// Least shade fraction \[–\].
        shade_fraction: f64,
        /// Hottest leaf at that shade \[°C\].
        hottest_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
    },
    /// Even full shade does not.
    Unreachable {
        /// Hottest leaf under full shade \[°C\].
        hottest_at_full_shade_c: f64,
        /// Inside air under full shade \[°C\].
        inside_air_at_full_shade_c: f64,
        /// Limit minus margin \[°C\].
        target_c: f64,
    },
}

impl ShadeAnswer {
    /// The answer in plain words.
    #[must_use]
    pub fn sentence(&self) -> String {
        match *self {
            ShadeAnswer::NotNeeded {
                hottest_c,
                target_c,
            } => format!(
                "No shade is needed: the hottest leaf runs at {hottest_c:.1} °C, at or below the target of {target_c:.1} °C."
            ),
            ShadeAnswer::Fraction {
                shade_fraction,
                hottest_c,
                target_c,
            } => format!(
                "A shade screen holding back at least {:.0} % of the light keeps the hottest leaf at {hottest_c:.1} °C, the target of {target_c:.1} °C.",
                100.0 * shade_fraction
            ),
            ShadeAnswer::Unreachable {
                hottest_at_full_shade_c,
                inside_air_at_full_shade_c,
                target_c,
            } => format!(
                "Shade alone cannot do it: even in full shade the hottest leaf runs at {hottest_at_full_shade_c:.1} °C with the inside air at {inside_air_at_full_shade_c:.1} °C, above the target of {target_c:.1} °C."
            ),
        }
    }

    /// The least shade fraction: 0 when none is needed, None when unreachable.
    #[must_use]
    pub fn fraction(&self) -> Option<f64> {
        match *self {
            ShadeAnswer::NotNeeded { .. } => Some(0.0),
            ShadeAnswer::Fraction { shade_fraction, .. } => Some(shade_fraction),
            ShadeAnswer::Unreachable { .. } => None,
        }
    }
}

/// Both sizing answers for one greenhouse case.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct Sizing {
    /// The least canopy-top air speed at the case's shade.
    pub speed: SpeedAnswer,
    /// The least shade at the case's canopy-top speed.
    pub shade: ShadeAnswer,
}

impl Sizing {
    /// Both answers in plain words, with what to do when neither can.
    #[must_use]
    pub fn sentence(&self) -> String {
        let mut s = format!("{} {}", self.speed.sentence(), self.shade.sentence());
        if self.speed.speed_m_s().is_none() && self.shade.fraction().is_none() {
            s.push_str(
                " Neither more air over the crop nor shade alone is enough: lower the inside air temperature with more ventilation or evaporative (pad-and-fan or fog) cooling, or combine shade with more air.",
            );
        }
        s
    }
}

fn check_target(limit_c: f64, margin_k: f64) -> Result<f64> {
    Ok(LIMIT_RANGE_C.check(limit_c)? - MARGIN_RANGE_K.check(margin_k)?)
}

/// The least canopy-top air speed inside that keeps the hottest leaf at or below
/// `limit_c − margin_k` \[°C\], searched up to `max_speed_m_s` (grid and bisection as in
/// [`mod@crate::required_wind`]; with ventilated air the inside air is re-solved at every speed).
///
/// # Errors
/// Invalid inputs or a greenhouse that cannot be solved.
pub fn least_canopy_speed(
    case: &GreenhouseCase,
    limit_c: f64,
    margin_k: f64,
    max_speed_m_s: f64,
) -> Result<SpeedAnswer> {
    let target = check_target(limit_c, margin_k)?;
    let max = SEARCH_MAX_RANGE_M_S.check(max_speed_m_s)?;
    case.validate()?;
    let optics = CanopyOptics::new(&case.structure, case.leaf.absorptivity);
    least_speed(
        |u| {
            let s = solve_greenhouse_with_optics(&case.with_top_speed(u), &optics)?;
            Ok((s.canopy.hottest.leaf_temp_c, s.inside_air_temp_c))
        },
        target,
        max,
    )
}

/// The least shade fraction at the case's canopy-top speed that keeps the hottest leaf at or below
/// `limit_c − margin_k` \[°C\] (bisection to 10⁻⁴; the hottest leaf falls as shade rises).
///
/// # Errors
/// Invalid inputs or a greenhouse that cannot be solved.
pub fn least_shade(case: &GreenhouseCase, limit_c: f64, margin_k: f64) -> Result<ShadeAnswer> {
    let target = check_target(limit_c, margin_k)?;
    case.validate()?;
    let optics = CanopyOptics::new(&case.structure, case.leaf.absorptivity);
    let eval = |f: f64| solve_greenhouse_with_optics(&case.with_shade(f), &optics);
    let none = eval(0.0)?;
    if none.canopy.hottest.leaf_temp_c <= target {
        return Ok(ShadeAnswer::NotNeeded {
            hottest_c: none.canopy.hottest.leaf_temp_c,
            target_c: target,
        });
    }
    let full = eval(1.0)?;
    if full.canopy.hottest.leaf_temp_c > target {
        return Ok(ShadeAnswer::Unreachable {
            hottest_at_full_shade_c: full.canopy.hottest.leaf_temp_c,
            inside_air_at_full_shade_c: full.inside_air_temp_c,
            target_c: target,
        });
    }
    let (mut lo, mut hi, mut hot_hi) = (0.0, 1.0, full.canopy.hottest.leaf_temp_c);
    while hi - lo > 1e-4 {
        let mid = 0.5 * (lo + hi);
        let t = eval(mid)?.canopy.hottest.leaf_temp_c;
        if t <= target {
            hi = mid;
            hot_hi = t;
        } else {
            lo = mid;
        }
    }
    Ok(ShadeAnswer::Fraction {
        shade_fraction: hi,
        hottest_c: hot_hi,
        target_c: target,
    })
}

/// Both sizing answers.
///
/// # Errors
/// As [`least_canopy_speed`] and [`least_shade`].
pub fn size(
    case: &GreenhouseCase,
    limit_c: f64,
    margin_k: f64,
    max_speed_m_s: f64,
) -> Result<Sizing> {
    Ok(Sizing {
        speed: least_canopy_speed(case, limit_c, margin_k, max_speed_m_s)?,
        shade: least_shade(case, limit_c, margin_k)?,
    })
}

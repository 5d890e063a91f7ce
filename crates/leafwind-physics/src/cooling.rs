//! Cooling options for a greenhouse crop: the psychrometric wet-bulb temperature, pad-and-fan
//! evaporative cooling, fogging, shade screens and whitewash — each alone or combined, compared side
//! by side by the hottest leaf they leave (through [`crate::greenhouse`], [`crate::canopy`] and
//! [`crate::design_day`]).
//!
//! # Psychrometry
//! Wet-bulb temperature T_w from the psychrometer equation e_a = e°(T_w) − γ_psy (T − T_w) with
//! γ_psy = a_psy P (\[FAO56\] eqs. 15–16; a_psy = 0.000662 °C⁻¹ for ventilated, Assmann-type
//! psychrometers, 0.000800 for naturally ventilated and 0.001200 for non-ventilated ones indoors —
//! values from memory). The ventilated coefficient is within 0.5 % of c_p/(ε λ) of \[FAO56\] eq. 8, so
//! T_w is close to the thermodynamic (adiabatic-saturation) wet bulb.
//!
//! # Evaporative cooling
//! Direct evaporative cooling follows the wet-bulb line: T_out = T − η (T − T_w) (\[ASHRAE-HA\],
//! evaporative cooling chapter, "saturation effectiveness"; \[EP406\]; from memory), and the outlet
//! vapour pressure lies on the same psychrometer line, e_out = e°(T_w) − γ_psy (T_out − T_w).
//! Water evaporated per m³ of inlet air = ρ_d,in (w_out − w_in), w the mixing ratio (ideal gas).
//!
//! The cooled air enters the greenhouse model as its "outside" air: in this engine's steady balance
//! the inside air is then the air at the fan end (its temperature rise over the pad air carries the
//! solar and crop load along the house). A simplification: the cover's heat loss and the cover
//! temperature then refer to the cooled air rather than to the true outside air (both small next to
//! the ventilation term at pad-and-fan rates).
//!
//! Fog: the same wet-bulb line, with an evaporation efficiency and a cap on the relative humidity
//! the fog may raise the air to (droplets stop evaporating near saturation) — the higher the
//! outside humidity, the less fog can cool.
//!
//! **Cautions.** Evaporative cooling raises humidity (disease, and for workers, heat stress: a humid
//! hot house is dangerous even when the thermometer reads lower). Pumps, fans and their wiring
//! follow local codes and licensed installation. These figures are a first look, not a design.
//!
//! # References
//! - \[FAO56\] Allen, R. G., Pereira, L. S., Raes, D., Smith, M. (1998). *Crop evapotranspiration*.
//!   FAO Irrigation and Drainage Paper 56. Eqs. 8, 11, 15, 16 (psychrometric constant, saturation
//!   vapour pressure, psychrometer equation and coefficients).
//! - \[Stull11\] Stull, R. (2011). Wet-bulb temperature from relative humidity and air temperature.
//!   *Journal of Applied Meteorology and Climatology* 50, 2267–2269 (an empirical fit used in the
//!   checks: errors −1 to +0.65 °C over its range).
//! - \[ASHRAE-HA\] ASHRAE. *ASHRAE Handbook — HVAC Applications*, chapters "Evaporative cooling" and
//!   "Environmental control for animals and plants" (pad saturation effectiveness of 70–90 % for
//!   100 mm cellulose pads at face velocities of about 1.25 m s⁻¹; from memory).
//! - \[EP406\] ASABE EP406. *Heating, Ventilating and Cooling Greenhouses* (pad-and-fan design: face
//!   velocity, pad to fan distance, temperature rise along the house; from memory).

use crate::air::{AIR_TEMP_RANGE_C, Humidity, PRESSURE_RANGE_KPA, saturation_vapour_pressure_kpa};
use crate::constants::{
    GAS_CONSTANT_J_MOL_K, MOLAR_MASS_DRY_AIR_KG_MOL, MOLAR_MASS_RATIO_WATER_AIR,
    SPECIFIC_HEAT_DRY_AIR_J_KG_K, ZERO_CELSIUS_K,
};
use crate::design_day::{
    DesignDay, Environment, GreenhouseSetup, HourWeather, HourlySeries, SeriesCase,
    design_day_weather, row_durations_h, run_hours, summarise_hours,
};
use crate::error::{PhysicsError, Result, ValidRange};
use crate::greenhouse::{GreenhouseCase, solve_greenhouse};

/// Psychrometer coefficient a_psy of a ventilated (Assmann-type, ~5 m s⁻¹) psychrometer \[K⁻¹\]
/// (\[FAO56\] eq. 16; from memory).
pub const PSYCHROMETER_COEFFICIENT_VENTILATED_PER_K: f64 = 0.000_662;

/// Psychrometer coefficient of a naturally ventilated (~1 m s⁻¹) psychrometer \[K⁻¹\] (\[FAO56\]
/// eq. 16; from memory).
pub const PSYCHROMETER_COEFFICIENT_NATURAL_PER_K: f64 = 0.000_800;

/// Default pad saturation efficiency \[–\]: 0.8 for a 100 mm cellulose pad at its rated face velocity
/// (\[ASHRAE-HA\] gives 70–90 %; from memory).
pub const PAD_EFFICIENCY_DEFAULT: f64 = 0.8;

/// Default fog evaporation efficiency \[–\]: 0.7 (common practice, no source).
pub const FOG_EFFICIENCY_DEFAULT: f64 = 0.7;

/// Default highest relative humidity fog may bring the air to \[%\]: 90 (common practice, no source).
pub const FOG_MAX_RH_DEFAULT_PCT: f64 = 90.0;

/// Default shade-screen fraction \[–\]: 0.5, a "50 %" screen (common practice, no source).
pub const SHADE_SCREEN_DEFAULT: f64 = 0.5;

/// Default whitewash transmittance \[–\]: 0.7, a moderate coat (common practice, no source; coats
/// range from about 0.5 to 0.85).
pub const WHITEWASH_TRANSMITTANCE_DEFAULT: f64 = 0.7;

/// Default canopy-top air speed without circulation fans \[m s⁻¹\]: 0.1, nearly still air (common
/// practice, no source).
pub const STILL_HOUSE_SPEED_M_S: f64 = 0.1;

/// Valid efficiencies \[–\].
pub const EFFICIENCY_RANGE: ValidRange = ValidRange {
    quantity: "evaporative cooling efficiency",
    min: 0.0,
    max: 1.0,
    unit: "",
};

/// Valid psychrometer coefficients \[K⁻¹\].
pub const PSYCHROMETER_COEFFICIENT_RANGE: ValidRange = ValidRange {
    quantity: "psychrometer coefficient",
    min: 1.0e-4,
    max: 2.0e-3,
    unit: "1/K",
};

/// Wet-bulb temperature \[°C\] from the psychrometer equation (\[FAO56\] eq. 15):
/// e_a = e°(T_w) − a_psy P (T − T_w), solved for T_w by bisection to 10⁻⁹ K between −70 °C and T
/// (the residual e°(T_w) − a_psy P (T − T_w) − e_a rises with T_w; the root lies between the dew
/// point and T).
///
/// - `air_temp_c` T \[°C\]; `vapour_pressure_kpa` e_a \[kPa\]; `pressure_kpa` P \[kPa\];
///   `psychrometer_coefficient_per_k` a_psy \[K⁻¹\] (use
///   [`PSYCHROMETER_COEFFICIENT_VENTILATED_PER_K`]).
///
/// # Errors
/// Out-of-range temperature, pressure, coefficient, or a vapour pressure above saturation.
///
/// ```
/// use leafwind_physics::cooling::*;
/// // Saturated air: the wet bulb is the air temperature.
/// let e = leafwind_physics::air::saturation_vapour_pressure_kpa(20.0);
/// let tw = wet_bulb_c(20.0, e, 101.325, PSYCHROMETER_COEFFICIENT_VENTILATED_PER_K).unwrap();
/// assert!((tw - 20.0).abs() < 1e-6);
/// ```
pub fn wet_bulb_c(
    air_temp_c: f64,
    vapour_pressure_kpa: f64,
    pressure_kpa: f64,
    psychrometer_coefficient_per_k: f64,
) -> Result<f64> {
    let t = AIR_TEMP_RANGE_C.check(air_temp_c)?;
    let p = PRESSURE_RANGE_KPA.check(pressure_kpa)?;
    let a = PSYCHROMETER_COEFFICIENT_RANGE.check(psychrometer_coefficient_per_k)?;
    let es = saturation_vapour_pressure_kpa(t);
    let e = ValidRange {
        quantity: "vapour pressure",
        min: 0.0,
        max: es * (1.0 + 1e-12),
        unit: "kPa",
    }
    .check(vapour_pressure_kpa)?;
    let gamma = a * p; // γ_psy = a_psy P, eq. 16 of [FAO56]
    let f = |tw: f64| saturation_vapour_pressure_kpa(tw) - gamma * (t - tw) - e; // eq. 15 of [FAO56]
    let (mut lo, mut hi) = (AIR_TEMP_RANGE_C.min - 40.0, t);
    if f(hi) <= 0.0 {
        return Ok(t);
    }
    if f(lo) > 0.0 {
        return Err(PhysicsError::NoBracket {
            quantity: "wet-bulb temperature",
            low: lo,
            high: hi,
            f_low: f(lo),
            f_high: f(hi),
        });
    }
    while hi - lo > 1e-9 {
        let mid = 0.5 * (lo + hi);
        if f(mid) > 0.0 {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    Ok(0.5 * (lo + hi))
}

/// Air after direct evaporative cooling.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct CooledAir {
    /// Inlet temperature \[°C\].
    pub inlet_temp_c: f64,
    /// Inlet wet bulb \[°C\].
    pub wet_bulb_c: f64,
    /// Outlet temperature \[°C\].
    pub outlet_temp_c: f64,
    /// Outlet vapour pressure \[kPa\].
    pub outlet_vapour_pressure_kpa: f64,
    /// Outlet relative humidity \[%\].
    pub outlet_rh_pct: f64,
    /// Water evaporated per m³ of inlet air \[kg m⁻³\].
    pub water_kg_m3: f64,
    /// Efficiency actually reached \[–\] (the fog's may be capped below its own by humidity).
    pub efficiency: f64,
}

/// Water taken up per m³ of inlet air \[kg m⁻³\] when its vapour pressure rises from `e_in` to
/// `e_out` \[kPa\] at total pressure `p` \[kPa\]: ρ_d,in (w_out − w_in), with the mixing ratio
/// w = ε e/(P − e) and the inlet dry-air density ρ_d = (P − e) M_a/(R T) (ideal gas).
fn water_per_inlet_m3(e_in: f64, e_out: f64, p: f64, inlet_temp_c: f64) -> f64 {
    let w = |e: f64| MOLAR_MASS_RATIO_WATER_AIR * e / (p - e);
    let rho_dry = (p - e_in) * 1e3 * MOLAR_MASS_DRY_AIR_KG_MOL
        / (GAS_CONSTANT_J_MOL_K * (inlet_temp_c + ZERO_CELSIUS_K));
    rho_dry * (w(e_out) - w(e_in))
}

/// Air of temperature T and vapour pressure e cooled along its wet-bulb line to T_out.
fn along_wet_bulb(t: f64, e: f64, p: f64, tw: f64, t_out: f64, eff: f64) -> CooledAir {
    let gamma = PSYCHROMETER_COEFFICIENT_VENTILATED_PER_K * p;
    let es_out = saturation_vapour_pressure_kpa(t_out);
    let e_out = (saturation_vapour_pressure_kpa(tw) - gamma * (t_out - tw)).clamp(e, es_out);
    CooledAir {
        inlet_temp_c: t,
        wet_bulb_c: tw,
        outlet_temp_c: t_out,
        outlet_vapour_pressure_kpa: e_out,
        outlet_rh_pct: (100.0 * e_out / es_out).min(100.0),
        water_kg_m3: water_per_inlet_m3(e, e_out, p, t).max(0.0),
        efficiency: eff,
    }
}

/// Pad outlet air: T_out = T − η (T − T_w) (\[ASHRAE-HA\], \[EP406\]; from memory).
///
/// - `air_temp_c` \[°C\]; `humidity`; `pressure_kpa` \[kPa\]; `efficiency` η \[–\].
///
/// # Errors
/// Out-of-range inputs.
///
/// ```
/// use leafwind_physics::air::Humidity;
/// use leafwind_physics::cooling::pad_outlet;
/// let c = pad_outlet(35.0, Humidity::RelativePct(30.0), 101.325, 0.8).unwrap();
/// assert!((c.outlet_temp_c - (35.0 - 0.8 * (35.0 - c.wet_bulb_c))).abs() < 1e-9);
/// ```
pub fn pad_outlet(
    air_temp_c: f64,
    humidity: Humidity,
    pressure_kpa: f64,
    efficiency: f64,
) -> Result<CooledAir> {
    let eta = EFFICIENCY_RANGE.check(efficiency)?;
    let e = humidity.vapour_pressure_kpa(air_temp_c)?;
    let tw = wet_bulb_c(
        air_temp_c,
        e,
        pressure_kpa,
        PSYCHROMETER_COEFFICIENT_VENTILATED_PER_K,
    )?;
    let t_out = air_temp_c - eta * (air_temp_c - tw); // saturation effectiveness, [ASHRAE-HA]
    Ok(along_wet_bulb(air_temp_c, e, pressure_kpa, tw, t_out, eta))
}

/// Fogged air: as [`pad_outlet`] with the fog's efficiency, but never past `max_rh_pct` on the
/// wet-bulb line (found by bisection to 10⁻⁶ K). Outside air already at or above `max_rh_pct` is not
/// cooled (efficiency 0).
///
/// # Errors
/// Out-of-range inputs.
pub fn fog_outlet(
    air_temp_c: f64,
    humidity: Humidity,
    pressure_kpa: f64,
    efficiency: f64,
    max_rh_pct: f64,
) -> Result<CooledAir> {
    let eta = EFFICIENCY_RANGE.check(efficiency)?;
    let rh_max = ValidRange {
        quantity: "highest relative humidity after fogging",
        min: 1.0,
        max: 100.0,
        unit: "%",
    }
    .check(max_rh_pct)?;
    let pad = pad_outlet(air_temp_c, humidity, pressure_kpa, eta)?;
    if pad.outlet_rh_pct <= rh_max {
        return Ok(pad);
    }
    let e = humidity.vapour_pressure_kpa(air_temp_c)?;
    let tw = pad.wet_bulb_c;
    let rh_at =
        |t_out: f64| along_wet_bulb(air_temp_c, e, pressure_kpa, tw, t_out, 0.0).outlet_rh_pct;
    if rh_at(air_temp_c) >= rh_max {
        return Ok(along_wet_bulb(
            air_temp_c,
            e,
            pressure_kpa,
            tw,
            air_temp_c,
            0.0,
        ));
    }
    // RH rises as T_out falls toward T_w: find T_out with RH = rh_max.
    let (mut warm, mut cool) = (air_temp_c, pad.outlet_temp_c);
    while warm - cool > 1e-6 {
        let mid = 0.5 * (warm + cool);
        if rh_at(mid) > rh_max {
            cool = mid;
        } else {
            warm = mid;
        }
    }
    let span = air_temp_c - tw;
    let eff = if span > 0.0 {
        (air_temp_c - warm) / span
    } else {
        0.0
    };
    Ok(along_wet_bulb(air_temp_c, e, pressure_kpa, tw, warm, eff))
}

/// Temperature rise of the air from the pad toward the fans \[K\]: ΔT(x) = q (x/L) / (ρ c_p V),
/// the steady energy balance of the air stream gaining a uniform load q per floor area
/// (\[EP406\]; from memory).
///
/// - `load_w_m2` heat gained by the air per floor area q \[W m⁻²\]; `ventilation_m3_s_m2` V
///   \[m³ s⁻¹ m⁻²\]; `fraction_along` x/L from the pad (0) to the fans (1) \[–\];
///   `air_density_kg_m3` ρ \[kg m⁻³\].
///
/// ```
/// // 300 W/m² into 0.04 m³/s/m² of air of 1.15 kg/m³: 300 / (1.15 · 1006 · 0.04) = 6.48 K at the fans.
/// let dt = leafwind_physics::cooling::pad_to_fan_rise_k(300.0, 0.04, 1.0, 1.15);
/// assert!((dt - 6.48).abs() < 0.005);
/// ```
#[must_use]
pub fn pad_to_fan_rise_k(
    load_w_m2: f64,
    ventilation_m3_s_m2: f64,
    fraction_along: f64,
    air_density_kg_m3: f64,
) -> f64 {
    load_w_m2 * fraction_along.clamp(0.0, 1.0)
        / (air_density_kg_m3 * SPECIFIC_HEAT_DRY_AIR_J_KG_K * ventilation_m3_s_m2)
}

/// Evaporative cooling of the incoming air.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum Evaporative {
    /// None.
    Off,
    /// Pad and fan.
    Pad {
        /// Saturation efficiency \[–\].
        efficiency: f64,
    },
    /// Fog in the inlet air.
    Fog {
        /// Evaporation efficiency \[–\].
        efficiency: f64,
        /// Highest relative humidity \[%\].
        max_rh_pct: f64,
    },
}

impl Evaporative {
    /// The air after this cooling.
    ///
    /// # Errors
    /// Out-of-range inputs.
    pub fn apply(
        &self,
        air_temp_c: f64,
        humidity: Humidity,
        pressure_kpa: f64,
    ) -> Result<CooledAir> {
        match *self {
            Evaporative::Off => pad_outlet(air_temp_c, humidity, pressure_kpa, 0.0),
            Evaporative::Pad { efficiency } => {
                pad_outlet(air_temp_c, humidity, pressure_kpa, efficiency)
            }
            Evaporative::Fog {
                efficiency,
                max_rh_pct,
            } => fog_outlet(air_temp_c, humidity, pressure_kpa, efficiency, max_rh_pct),
        }
    }
}

/// One cooling option; every field editable.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct CoolingOption {
    /// Name shown in the table.
    pub label: String,
    /// Canopy-top air speed while the option runs \[m s⁻¹\].
    pub canopy_top_speed_m_s: f64,
    /// Canopy-top air speed in the hours the option is off (below the set point) \[m s⁻¹\].
    pub idle_speed_m_s: f64,
    /// Power of the circulation fans per floor area \[W m⁻²\] (0 without them).
    pub circulation_power_w_m2: f64,
    /// Shade-screen fraction \[–\].
    pub shade_fraction: f64,
    /// Whitewash transmittance multiplying the cover's \[–\] (1 without).
    pub whitewash_transmittance: f64,
    /// Evaporative cooling.
    pub evaporative: Evaporative,
}

/// The standard set to compare: none, fans only, shade, whitewash, pads, fog, and pads + fans +
/// shade. `fan_speed_m_s` and `fan_power_w_m2` describe the circulation fans (e.g. from
/// [`crate::fans::estimate_layout`] and [`crate::fans::FanLayout::power_per_floor_w_m2`]).
#[must_use]
pub fn standard_options(fan_speed_m_s: f64, fan_power_w_m2: f64) -> Vec<CoolingOption> {
    let base = CoolingOption {
        label: "none".into(),
        canopy_top_speed_m_s: STILL_HOUSE_SPEED_M_S,
        idle_speed_m_s: STILL_HOUSE_SPEED_M_S,
        circulation_power_w_m2: 0.0,
        shade_fraction: 0.0,
        whitewash_transmittance: 1.0,
        evaporative: Evaporative::Off,
    };
    let fans = CoolingOption {
        label: "fans only".into(),
        canopy_top_speed_m_s: fan_speed_m_s,
        circulation_power_w_m2: fan_power_w_m2,
        ..base.clone()
    };
    let pad = Evaporative::Pad {
        efficiency: PAD_EFFICIENCY_DEFAULT,
    };
    vec![
        base.clone(),
        fans.clone(),
        CoolingOption {
            label: "shade screen".into(),
            shade_fraction: SHADE_SCREEN_DEFAULT,
            ..base.clone()
        },
        CoolingOption {
            label: "whitewash".into(),
            whitewash_transmittance: WHITEWASH_TRANSMITTANCE_DEFAULT,
            ..base.clone()
        },
        CoolingOption {
            label: "pads".into(),
            evaporative: pad,
            ..base.clone()
        },
        CoolingOption {
            label: "fog".into(),
            evaporative: Evaporative::Fog {
                efficiency: FOG_EFFICIENCY_DEFAULT,
                max_rh_pct: FOG_MAX_RH_DEFAULT_PCT,
            },
            ..base.clone()
        },
        CoolingOption {
            label: "pads + fans + shade".into(),
            shade_fraction: SHADE_SCREEN_DEFAULT,
            evaporative: pad,
            ..fans
        },
    ]
}

impl CoolingOption {
    fn validate(&self) -> Result<()> {
        crate::case::AIR_SPEED_RANGE_M_S.check(self.canopy_top_speed_m_s)?;
        ValidRange {
            quantity: "air speed when the cooling is off",
            ..crate::case::AIR_SPEED_RANGE_M_S
        }
        .check(self.idle_speed_m_s)?;
        ValidRange {
            quantity: "circulation fan power per floor area",
            min: 0.0,
            max: 1000.0,
            unit: "W/m²",
        }
        .check(self.circulation_power_w_m2)?;
        crate::greenhouse::SHADE_FRACTION_RANGE.check(self.shade_fraction)?;
        ValidRange {
            quantity: "whitewash transmittance",
            ..crate::greenhouse::TRANSMITTANCE_RANGE
        }
        .check(self.whitewash_transmittance)?;
        Ok(())
    }

    /// The greenhouse case with this option applied to `base`.
    ///
    /// # Errors
    /// Out-of-range option or outside air.
    pub fn apply_to(&self, base: &GreenhouseCase) -> Result<(GreenhouseCase, CooledAir)> {
        self.validate()?;
        let o = base.outside;
        let cooled = self
            .evaporative
            .apply(o.air_temp_c, o.humidity, o.pressure_kpa)?;
        let mut c = *base;
        c.outside.air_temp_c = cooled.outlet_temp_c;
        c.outside.humidity = Humidity::RelativePct(cooled.outlet_rh_pct.clamp(0.0, 100.0));
        c.canopy_top_speed_m_s = self.canopy_top_speed_m_s;
        c.shade_fraction = self.shade_fraction;
        c.cover.transmittance *= self.whitewash_transmittance;
        Ok((c, cooled))
    }
}

/// One row of the comparison at one moment.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct OptionMoment {
    /// The option.
    pub label: String,
    /// Air entering the house \[°C\] (after any evaporative cooling).
    pub inlet_air_temp_c: f64,
    /// Inside air at the fan end \[°C\].
    pub inside_air_temp_c: f64,
    /// Inside relative humidity \[%\].
    pub inside_rh_pct: f64,
    /// Rise from inlet to the fan end \[K\].
    pub pad_to_fan_rise_k: f64,
    /// Hottest leaf \[°C\].
    pub hottest_leaf_temp_c: f64,
    /// Limit minus hottest leaf \[K\] (None without a limit).
    pub margin_k: Option<f64>,
    /// Water evaporated per floor area \[kg m⁻² h⁻¹\] (= L m⁻² h⁻¹).
    pub water_kg_m2_h: f64,
    /// Circulation fan power per floor area \[W m⁻²\].
    pub fan_power_w_m2: f64,
}

/// Ventilation rate of a greenhouse case \[m³ s⁻¹ m⁻²\] (0 with given inside air).
fn ventilation_of(case: &GreenhouseCase) -> f64 {
    match case.inside {
        crate::greenhouse::InsideAir::Ventilated { rate_m3_m2_s } => rate_m3_m2_s,
        crate::greenhouse::InsideAir::Given { .. } => 0.0,
    }
}

/// Compares options for one greenhouse moment (use a ventilated [`GreenhouseCase`]; with given
/// inside air the evaporative options change nothing inside). `limit_c` \[°C\] gives the margin.
///
/// # Errors
/// An invalid option or case, or a greenhouse that cannot be solved.
pub fn compare_moment(
    base: &GreenhouseCase,
    options: &[CoolingOption],
    limit_c: Option<f64>,
) -> Result<Vec<OptionMoment>> {
    options
        .iter()
        .map(|opt| {
            let (c, cooled) = opt.apply_to(base)?;
            let s = solve_greenhouse(&c)?;
            let v = ventilation_of(&c);
            Ok(OptionMoment {
                label: opt.label.clone(),
                inlet_air_temp_c: cooled.outlet_temp_c,
                inside_air_temp_c: s.inside_air_temp_c,
                inside_rh_pct: s.inside_rh_pct,
                pad_to_fan_rise_k: s.inside_air_temp_c - cooled.outlet_temp_c,
                hottest_leaf_temp_c: s.canopy.hottest.leaf_temp_c,
                margin_k: limit_c.map(|l| l - s.canopy.hottest.leaf_temp_c),
                water_kg_m2_h: cooled.water_kg_m3 * v * 3600.0,
                fan_power_w_m2: opt.circulation_power_w_m2,
            })
        })
        .collect()
}

/// One row of the comparison over a day (or any series of hours).
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct OptionDay {
    /// The option.
    pub label: String,
    /// Hottest leaf of the run \[°C\] (None if no hour was solved).
    pub hottest_leaf_temp_c: Option<f64>,
    /// Smallest margin to the crop limit \[K\].
    pub min_margin_k: Option<f64>,
    /// Hours over the limit \[h\].
    pub hours_over_limit: f64,
    /// Degree-hours over the limit \[K h\].
    pub degree_hours_over_k_h: f64,
    /// Hours in which cooling and fans run (outside air at or above `run_above_c`) \[h\].
    pub operating_hours_h: f64,
    /// Water evaporated per floor area over the run \[kg m⁻²\] (= L m⁻²).
    pub water_kg_m2: f64,
    /// Circulation fan energy per floor area over the run \[kWh m⁻²\].
    pub fan_energy_kwh_m2: f64,
    /// Hours that could not be solved.
    pub failed_hours: usize,
    /// The hourly run.
    pub series: HourlySeries,
}

/// Compares options over hourly weather for a greenhouse crop. `case.environment` must be a
/// greenhouse (its setup is the base: cover, ventilation; its canopy-top speed is replaced by the
/// option's). Cooling and fans run in the hours with the outside air at or above `run_above_c`
/// \[°C\]; in other hours the house runs at the option's idle speed with its shade and whitewash
/// (screens and coats stay in place) and no evaporative cooling. In the hourly results of an
/// evaporative option, `air_temp_c` is the cooled air entering the house.
///
/// # Errors
/// A case that is not a greenhouse, or an invalid option or case.
pub fn compare_hours(
    case: &SeriesCase,
    weather: &[HourWeather],
    options: &[CoolingOption],
    run_above_c: f64,
) -> Result<Vec<OptionDay>> {
    let Environment::Greenhouse(setup) = case.environment else {
        return Err(PhysicsError::Inconsistent(
            "the cooling comparison needs a greenhouse environment".into(),
        ));
    };
    let run_above = ValidRange {
        quantity: "cooling set point",
        ..AIR_TEMP_RANGE_C
    }
    .check(run_above_c)?;
    let times: Vec<_> = weather.iter().map(|w| w.time).collect();
    let durations_h = row_durations_h(&times);
    let mut rows = Vec::with_capacity(options.len());
    for opt in options {
        opt.validate()?;
        let mut water = 0.0;
        let mut on_hours = 0.0;
        let mut hours = Vec::with_capacity(weather.len());
        for (w, duration_h) in weather.iter().zip(&durations_h) {
            let on = w.air_temp_c >= run_above;
            let mut w2 = *w;
            if on {
                on_hours += duration_h;
                let cooled = opt
                    .evaporative
                    .apply(w.air_temp_c, w.humidity, w.pressure_kpa)?;
                water += cooled.water_kg_m3 * setup.ventilation_m3_m2_s * 3600.0 * duration_h;
                w2.air_temp_c = cooled.outlet_temp_c;
                w2.humidity = Humidity::RelativePct(cooled.outlet_rh_pct.clamp(0.0, 100.0));
            }
            hours.push((w2, on));
        }
        // Two runs (fans on and off) keep the engine's hourly summary; hours are then merged.
        let mk = |speed: f64| {
            let mut c = case.clone();
            c.environment = Environment::Greenhouse(GreenhouseSetup {
                cover: crate::greenhouse::Cover {
                    transmittance: setup.cover.transmittance * opt.whitewash_transmittance,
                    ..setup.cover
                },
                shade_fraction: opt.shade_fraction,
                canopy_top_speed_m_s: speed,
                ..setup
            });
            c
        };
        let w_all: Vec<HourWeather> = hours.iter().map(|h| h.0).collect();
        let on_run = run_hours(&mk(opt.canopy_top_speed_m_s), &w_all)?;
        let off_run = run_hours(&mk(opt.idle_speed_m_s), &w_all)?;
        let merged: Vec<_> = hours
            .iter()
            .enumerate()
            .map(|(i, h)| {
                if h.1 {
                    on_run.hours[i].clone()
                } else {
                    off_run.hours[i].clone()
                }
            })
            .collect();
        let series = summarise_hours(merged, &case.limit);
        rows.push(OptionDay {
            label: opt.label.clone(),
            hottest_leaf_temp_c: series.max_leaf_temp_c,
            min_margin_k: series.min_margin_k,
            hours_over_limit: series.hours_over_limit,
            degree_hours_over_k_h: series.degree_hours_over_k_h,
            operating_hours_h: on_hours,
            water_kg_m2: water,
            fan_energy_kwh_m2: opt.circulation_power_w_m2 * on_hours / 1000.0,
            failed_hours: series.failed_hours,
            series,
        });
    }
    Ok(rows)
}

/// As [`compare_hours`] over a design day ([`crate::design_day::design_day_weather`]).
///
/// # Errors
/// As [`compare_hours`], or an invalid day.
pub fn compare_design_day(
    day: &DesignDay,
    case: &SeriesCase,
    options: &[CoolingOption],
    run_above_c: f64,
) -> Result<Vec<OptionDay>> {
    compare_hours(
        case,
        &design_day_weather(day, &case.site)?,
        options,
        run_above_c,
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn wet_bulb_lies_between_dew_point_and_air() {
        let e = Humidity::RelativePct(40.0)
            .vapour_pressure_kpa(30.0)
            .unwrap();
        let dew = crate::air::dew_point_c(e).unwrap();
        let tw = wet_bulb_c(30.0, e, 101.325, PSYCHROMETER_COEFFICIENT_VENTILATED_PER_K).unwrap();
        assert!(dew < tw && tw < 30.0);
    }

    #[test]
    fn fog_cannot_pass_its_humidity_cap() {
        let c = fog_outlet(30.0, Humidity::RelativePct(70.0), 101.325, 1.0, 90.0).unwrap();
        assert!(c.outlet_rh_pct <= 90.0 + 1e-6);
        assert!(c.outlet_temp_c < 30.0);
    }
}

//! Fan ventilation capacity of a greenhouse: the least ventilation rate that holds the inside air
//! within a chosen rise over the outside air, or that keeps the hottest leaf under its limit, found
//! from the steady balance of [`crate::greenhouse`]; and beside it the design rate of the
//! ventilation standard's factor method, so that a designer sees both.
//!
//! Factor method (\[EP406\], summer fan ventilation; the numbers below are from memory, and the
//! 5 000 fc light constant and the 4 °C reference rise were seen only in secondary copies):
//!
//! V = V₀ · F_elev · F_light · F_temp, with
//! - V₀ = 8 cfm per ft² of floor (0.0406 m³ s⁻¹ m⁻²) for a house below 305 m (1 000 ft), at most
//!   53.8 klx (5 000 fc) of light inside and a 4 K (7 °F) rise of the air from inlet to outlet;
//! - F_elev = ρ(0)/ρ(z), the thinner air of a high site (the standard tabulates it, about 1.04 at
//!   305 m, 1.20 at 1 524 m and 1.36 at 2 438 m; here it is the pressure ratio P₀/P, which is the
//!   density ratio at one temperature);
//! - F_light = E_v / 53.8 klx, the light inside;
//! - F_temp = 4 K / ΔT, the rise the designer allows.
//!
//! The factor method is a design rule calibrated on typical crops; the balance finds the rate for
//! this crop, cover and weather. Where they disagree, the balance says why (a small or stressed
//! crop transpires less, so more of the sun must leave as warm air).
//!
//! **Cautions.** Fan capacity is only part of a design: inlets, static pressure, the fans' tested
//! curves, controls, alarms and standby power decide whether the air actually moves. Fans and their
//! electrical installation must follow local codes and be designed and installed by licensed
//! practitioners; use these figures for a first look, not for a design.
//!
//! # References
//! - \[EP406\] ASABE EP406 (reaffirmed). *Heating, Ventilating and Cooling Greenhouses*. American
//!   Society of Agricultural and Biological Engineers (summer ventilation rate and its factors;
//!   from memory).
//! - \[LE\] Luminous efficacy of global daylight: about 100–120 lm W⁻¹ for clear skies (values
//!   from memory; no single source verified here).

use crate::air::PRESSURE_RANGE_KPA;
use crate::canopy::CanopyOptics;
use crate::constants::STANDARD_PRESSURE_KPA;
use crate::error::{Result, ValidRange};
use crate::fans::{CFM_IN_M3_S, SQUARE_FOOT_IN_M2};
use crate::greenhouse::{
    GreenhouseCase, GreenhouseSolution, InsideAir, VENTILATION_RANGE_M3_M2_S,
    solve_greenhouse_with_optics,
};
use crate::required_wind::{LIMIT_RANGE_C, MARGIN_RANGE_K, SpeedSearch, least_speed_meeting};

/// The factor method's base rate V₀ \[m³ s⁻¹ m⁻²\]: 8 cfm per ft² of floor (\[EP406\], from memory).
pub const FACTOR_BASE_RATE_M3_M2_S: f64 = 8.0 * CFM_IN_M3_S / SQUARE_FOOT_IN_M2;

/// The light inside at which the base rate holds \[klx\]: 53.8 klx = 5 000 fc (\[EP406\], from
/// memory; the 5 000 constant also in secondary copies).
pub const FACTOR_REFERENCE_LIGHT_KLX: f64 = 53.8;

/// The inlet-to-outlet rise at which the base rate holds \[K\]: 4 K (7 °F) (\[EP406\], from memory;
/// also in secondary copies).
pub const FACTOR_REFERENCE_RISE_K: f64 = 4.0;

/// Luminous efficacy of global daylight used to turn shortwave into illuminance \[lm W⁻¹\]: 110
/// (\[LE\], from memory).
pub const DAYLIGHT_EFFICACY_LM_W: f64 = 110.0;

/// Valid allowed rises of the inside air over the outside \[K\].
pub const RISE_RANGE_K: ValidRange = ValidRange {
    quantity: "allowed rise of the inside air",
    min: 0.5,
    max: 20.0,
    unit: "K",
};

/// Valid illuminances inside \[klx\] (full summer sun outside is about 100–120 klx).
pub const ILLUMINANCE_RANGE_KLX: ValidRange = ValidRange {
    quantity: "illuminance inside",
    min: 0.0,
    max: 200.0,
    unit: "klx",
};

/// Illuminance of daylight \[klx\] from its shortwave irradiance \[W m⁻²\]: E_v = K · S / 1000
/// with K = [`DAYLIGHT_EFFICACY_LM_W`] (\[LE\]).
#[must_use]
pub fn illuminance_klx(shortwave_w_m2: f64) -> f64 {
    DAYLIGHT_EFFICACY_LM_W * shortwave_w_m2.max(0.0) / 1000.0
}

/// The factor method's rate and its factors.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct FactorRate {
    /// F_elev = P₀/P \[–\].
    pub elevation_factor: f64,
    /// F_light = E_v / 53.8 klx \[–\].
    pub light_factor: f64,
    /// F_temp = 4 K / ΔT \[–\].
    pub temperature_factor: f64,
    /// V = V₀ F_elev F_light F_temp \[m³ s⁻¹ m⁻²\].
    pub rate_m3_m2_s: f64,
}

/// The factor method's design rate (module docs; \[EP406\], from memory).
///
/// - `pressure_kpa`: site air pressure \[kPa\]; `inside_illuminance_klx`: the most light inside
///   \[klx\]; `rise_k`: the allowed rise of the air from inlet to outlet \[K\].
///
/// # Errors
/// An input out of range.
pub fn factor_rate(
    pressure_kpa: f64,
    inside_illuminance_klx: f64,
    rise_k: f64,
) -> Result<FactorRate> {
    let p = PRESSURE_RANGE_KPA.check(pressure_kpa)?;
    let e = ILLUMINANCE_RANGE_KLX.check(inside_illuminance_klx)?;
    let dt = RISE_RANGE_K.check(rise_k)?;
    let elevation_factor = STANDARD_PRESSURE_KPA / p;
    let light_factor = e / FACTOR_REFERENCE_LIGHT_KLX;
    let temperature_factor = FACTOR_REFERENCE_RISE_K / dt;
    Ok(FactorRate {
        elevation_factor,
        light_factor,
        temperature_factor,
        rate_m3_m2_s: FACTOR_BASE_RATE_M3_M2_S
            * elevation_factor
            * light_factor
            * temperature_factor,
    })
}

/// What the least ventilation rate must achieve.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum VentilationTarget {
    /// The inside air at most this far above the outside air \[K\].
    InsideRise {
        /// Allowed rise \[K\].
        rise_k: f64,
    },
    /// The hottest leaf at or below `limit_c − margin_k`.
    HottestLeaf {
        /// Crop limit \[°C\].
        limit_c: f64,
        /// Margin kept below it \[K\].
        margin_k: f64,
    },
}

impl VentilationTarget {
    fn check(self) -> Result<Self> {
        match self {
            VentilationTarget::InsideRise { rise_k } => {
                RISE_RANGE_K.check(rise_k)?;
            }
            VentilationTarget::HottestLeaf { limit_c, margin_k } => {
                LIMIT_RANGE_C.check(limit_c)?;
                MARGIN_RANGE_K.check(margin_k)?;
            }
        }
        Ok(self)
    }

    fn met_by(self, s: &Outcome, outside_c: f64) -> bool {
        match self {
            VentilationTarget::InsideRise { rise_k } => s.inside_air_temp_c - outside_c <= rise_k,
            VentilationTarget::HottestLeaf { limit_c, margin_k } => {
                s.hottest_leaf_temp_c <= limit_c - margin_k
            }
        }
    }

    fn words(self) -> String {
        match self {
            VentilationTarget::InsideRise { rise_k } => {
                format!("hold the inside air within {rise_k:.1} K of the outside air")
            }
            VentilationTarget::HottestLeaf { limit_c, margin_k } => format!(
                "keep the hottest leaf at or below {:.1} °C (the limit of {limit_c:.1} °C less a {margin_k:.1} K margin)",
                limit_c - margin_k
            ),
        }
    }
}

/// The house at one ventilation rate, as the answer reports it.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct Outcome {
    /// Ventilation rate \[m³ s⁻¹ m⁻²\].
    pub rate_m3_m2_s: f64,
    /// Inside air \[°C\].
    pub inside_air_temp_c: f64,
    /// Hottest leaf \[°C\].
    pub hottest_leaf_temp_c: f64,
    /// Share of the shortwave above the canopy that the crop turns into transpiration, λE / S_in
    /// \[–\] (the "evapotranspiration coefficient" of greenhouse design practice).
    pub transpiration_share: f64,
}

impl Outcome {
    fn of(rate_m3_m2_s: f64, s: &GreenhouseSolution) -> Self {
        let share = if s.inside_shortwave_w_m2 > 0.0 {
            s.canopy.latent_w_m2 / s.inside_shortwave_w_m2
        } else {
            0.0
        };
        Self {
            rate_m3_m2_s,
            inside_air_temp_c: s.inside_air_temp_c,
            hottest_leaf_temp_c: s.canopy.hottest.leaf_temp_c,
            transpiration_share: share,
        }
    }
}

/// The least ventilation rate for a target.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum VentilationAnswer {
    /// Met already at the least rate of the valid range.
    AtLeastRate {
        /// The target.
        target: VentilationTarget,
        /// The house at that rate.
        at: Outcome,
    },
    /// The least rate that meets it.
    Rate {
        /// The target.
        target: VentilationTarget,
        /// The house at that rate.
        at: Outcome,
    },
    /// Not met even at the greatest rate of the valid range.
    Unreachable {
        /// The target.
        target: VentilationTarget,
        /// The house at the greatest rate.
        at_most: Outcome,
    },
}

impl VentilationAnswer {
    /// The least rate \[m³ s⁻¹ m⁻²\], None when unreachable.
    #[must_use]
    pub fn rate_m3_m2_s(&self) -> Option<f64> {
        match self {
            VentilationAnswer::AtLeastRate { at, .. } | VentilationAnswer::Rate { at, .. } => {
                Some(at.rate_m3_m2_s)
            }
            VentilationAnswer::Unreachable { .. } => None,
        }
    }

    /// The answer in plain words (SI; the app words its own in the user's units).
    #[must_use]
    pub fn sentence(&self) -> String {
        match self {
            VentilationAnswer::AtLeastRate { target, at } => format!(
                "Even {:.4} m³/s per m² of floor is enough to {}: the inside air runs at {:.1} °C and the hottest leaf at {:.1} °C.",
                at.rate_m3_m2_s,
                target.words(),
                at.inside_air_temp_c,
                at.hottest_leaf_temp_c
            ),
            VentilationAnswer::Rate { target, at } => format!(
                "Ventilating at least {:.3} m³/s per m² of floor is needed to {}; there the inside air runs at {:.1} °C and the hottest leaf at {:.1} °C.",
                at.rate_m3_m2_s,
                target.words(),
                at.inside_air_temp_c,
                at.hottest_leaf_temp_c
            ),
            VentilationAnswer::Unreachable { target, at_most } => format!(
                "No ventilation rate can {}: even at {:.2} m³/s per m² the inside air runs at {:.1} °C and the hottest leaf at {:.1} °C. Shade, evaporative cooling or more air over the crop must do the rest.",
                target.words(),
                at_most.rate_m3_m2_s,
                at_most.inside_air_temp_c,
                at_most.hottest_leaf_temp_c
            ),
        }
    }
}

/// Grid intervals of the rate search (on a logarithmic scale of the rate).
const SEARCH_INTERVALS: usize = 40;
/// Search tolerance on the logarithmic scale \[–\] (10⁻⁵ of ln(V_max/V_min) ≈ 10⁻⁴ relative).
const SEARCH_TOLERANCE: f64 = 1e-5;

/// The least ventilation rate in [`VENTILATION_RANGE_M3_M2_S`] that meets `target`, the inside air
/// re-solved from the steady balance at every rate (the case's own `inside` is ignored).
///
/// The rates are searched on a logarithmic scale, a grid then bisection (as the engine's air-speed
/// searches); where the response is not monotonic the first rate that meets the target is found.
///
/// # Errors
/// Invalid inputs or a greenhouse that cannot be solved.
pub fn least_ventilation(
    case: &GreenhouseCase,
    target: VentilationTarget,
) -> Result<VentilationAnswer> {
    let target = target.check()?;
    let mut probe = *case;
    probe.inside = InsideAir::Ventilated {
        rate_m3_m2_s: VENTILATION_RANGE_M3_M2_S.min,
    };
    probe.validate()?;
    let optics = CanopyOptics::new(&case.structure, case.leaf.absorptivity);
    let (v_min, v_max) = (VENTILATION_RANGE_M3_M2_S.min, VENTILATION_RANGE_M3_M2_S.max);
    let rate = |x: f64| v_min * (v_max / v_min).powf(x.clamp(0.0, 1.0));
    let outside_c = case.outside.air_temp_c;
    let solve_at = |v: f64| {
        let mut c = *case;
        c.inside = InsideAir::Ventilated { rate_m3_m2_s: v };
        solve_greenhouse_with_optics(&c, &optics).map(|s| Outcome::of(v, &s))
    };
    // At the greatest rate the balance must solve; its error (an invalid leaf or canopy, say) is
    // the answer. Below it, a rate at which the balance has no root (the inside air would pass the
    // valid range) simply does not meet the target.
    let at_max = solve_at(v_max)?;
    let search = least_speed_meeting(
        |x| Ok(solve_at(rate(x)).ok()),
        |o: &Option<Outcome>| o.is_some_and(|o| target.met_by(&o, outside_c)),
        0.0,
        1.0,
        SEARCH_INTERVALS,
        SEARCH_TOLERANCE,
    )?;
    Ok(match search {
        SpeedSearch::AtStart { value: Some(at) } => VentilationAnswer::AtLeastRate { target, at },
        SpeedSearch::Least {
            value: Some(at), ..
        } => VentilationAnswer::Rate { target, at },
        _ => VentilationAnswer::Unreachable {
            target,
            at_most: at_max,
        },
    })
}

/// The ventilation answers a designer reads together.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct VentilationCheck {
    /// The least rate that keeps the hottest leaf at or below the limit less the margin.
    pub for_leaf: VentilationAnswer,
    /// The least rate that holds the inside air within the design rise.
    pub for_design_rise: VentilationAnswer,
    /// The standard's factor method for this site and light at the design rise.
    pub factor: FactorRate,
}

/// Both least rates and the factor method for one greenhouse case and an allowed rise `rise_k`
/// \[K\] of the air from inlet to outlet; the light inside is the case's global shortwave above
/// the canopy, turned into illuminance by [`illuminance_klx`].
///
/// # Errors
/// As [`least_ventilation`] and [`factor_rate`].
pub fn design_check(
    case: &GreenhouseCase,
    limit_c: f64,
    margin_k: f64,
    rise_k: f64,
) -> Result<VentilationCheck> {
    let light = case.inside_light();
    let inside_w_m2 = light.beam_w_m2 + light.diffuse_w_m2;
    Ok(VentilationCheck {
        for_leaf: least_ventilation(case, VentilationTarget::HottestLeaf { limit_c, margin_k })?,
        for_design_rise: least_ventilation(case, VentilationTarget::InsideRise { rise_k })?,
        factor: factor_rate(
            case.outside.pressure_kpa,
            illuminance_klx(inside_w_m2).min(ILLUMINANCE_RANGE_KLX.max),
            rise_k,
        )?,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn base_rate_is_8_cfm_per_square_foot() {
        // 8 cfm/ft² = 8 × 0.000 471 947 m³/s / 0.092 903 m² = 0.040 64 m³ s⁻¹ m⁻² (exact foot).
        assert!((FACTOR_BASE_RATE_M3_M2_S - 0.040_64).abs() < 1e-5);
    }

    #[test]
    fn factors_are_one_at_the_reference() {
        let f = factor_rate(STANDARD_PRESSURE_KPA, FACTOR_REFERENCE_LIGHT_KLX, 4.0).unwrap();
        assert!((f.rate_m3_m2_s - FACTOR_BASE_RATE_M3_M2_S).abs() < 1e-12);
        assert!(factor_rate(101.3, 53.8, 0.1).is_err());
        assert!(factor_rate(f64::NAN, 53.8, 4.0).is_err());
    }
}

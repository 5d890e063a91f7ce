//! The fans section of a scenario — the circulation-fan layout, an optional target canopy air
//! speed, anemometer spot readings and a night check — and the run that turns it into the numbers
//! a greenhouse designer needs. Shared by `leafwind fans` and the window.
//!
//! Every air speed from a fan layout is an estimate from free-jet theory with a range of published
//! coefficients: verify it with an anemometer at canopy height. Fan and electrical installations
//! defer to local codes and licensed electricians.

use std::path::{Path, PathBuf};

use anyhow::{Context, Result};
use leafwind_physics::canopy::CanopyStructure;
use leafwind_physics::condensation::{self, DewAnswer, DewMargin};
use leafwind_physics::fans::{
    self, DiminishingReturns, Estimate, FanEnergy, FanLayout, FanSizing, GENERIC_FANS,
    HouseForFans, LayoutEstimate, ReadingsSummary,
};
use leafwind_physics::radiation::UpperView;
use leafwind_physics::{Humidity, LeafCase};
use serde::{Deserialize, Serialize};

/// Default cooling per 0.1 m s⁻¹ below which more air "stops helping" \[K\] (common practice, no
/// source; the 0.1 K).
pub const WORTH_IT_DEFAULT_K: f64 = 0.1;

/// Default dead-zone threshold for spot readings \[m s⁻¹\] (common practice, no source).
pub const DEAD_ZONE_DEFAULT_M_S: f64 = 0.2;

/// Default daily fan running time for the energy figure \[h\] (an invented working assumption:
/// fans running all day).
pub const RUN_HOURS_DEFAULT_H: f64 = 24.0;

fn default_worth_it() -> f64 {
    WORTH_IT_DEFAULT_K
}
fn default_dead_zone() -> f64 {
    DEAD_ZONE_DEFAULT_M_S
}
fn default_run_hours() -> f64 {
    RUN_HOURS_DEFAULT_H
}

/// A night to check for dew on the leaves.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct NightCheck {
    /// Night air temperature \[°C\].
    pub air_temp_c: f64,
    /// Night humidity.
    pub humidity: Humidity,
    /// What the leaves see above: a clear sky, or the cover at its temperature.
    pub upper_view: UpperView,
    /// Margin to keep above the dew point \[K\].
    pub margin_k: f64,
}

/// The fans section of a scenario.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FansSection {
    /// The fans and the house.
    pub layout: FanLayout,
    /// A canopy-top air speed to size the fans for \[m s⁻¹\].
    #[serde(default)]
    pub target_canopy_speed_m_s: Option<f64>,
    /// Anemometer readings CSV (position_m, height_m, speed_m_s), relative to the scenario file.
    #[serde(default)]
    pub readings_csv: Option<PathBuf>,
    /// Readings slower than this are dead zones \[m s⁻¹\].
    #[serde(default = "default_dead_zone")]
    pub dead_zone_m_s: f64,
    /// Cooling per 0.1 m s⁻¹ below which more air stops helping \[K\].
    #[serde(default = "default_worth_it")]
    pub worth_it_k: f64,
    /// Hours a day the fans run, for the energy figure \[h\].
    #[serde(default = "default_run_hours")]
    pub run_hours_per_day: f64,
    /// A night to check for dew.
    #[serde(default)]
    pub night: Option<NightCheck>,
}

impl Default for FansSection {
    fn default() -> Self {
        Self {
            layout: FanLayout::default(),
            target_canopy_speed_m_s: None,
            readings_csv: None,
            dead_zone_m_s: DEAD_ZONE_DEFAULT_M_S,
            worth_it_k: WORTH_IT_DEFAULT_K,
            run_hours_per_day: RUN_HOURS_DEFAULT_H,
            night: None,
        }
    }
}

/// What a fans run found.
#[derive(Debug, Clone)]
pub struct FansRun {
    /// Air speed along the house from the layout (low / typical / high).
    pub estimate: LayoutEstimate,
    /// Fans for the target speed, if one was set.
    pub sizing: Option<(f64, FanSizing)>,
    /// The spot readings, if a file was named, with the rows it rejected.
    pub readings: Option<(ReadingsSummary, Vec<String>)>,
    /// Where more air stops helping the scenario's leaf.
    pub returns: DiminishingReturns,
    /// Fan power and daily energy.
    pub energy: FanEnergy,
    /// The night check: the leaf–dew-point margin at the typical slowest speed, and the least
    /// speed that keeps the leaf above the dew point plus the margin.
    pub night: Option<(DewMargin, DewAnswer)>,
}

impl FansSection {
    /// Runs the section for a scenario's leaf case; `structure` is the canopy's (or the default
    /// crop's) and `scenario_dir` resolves a relative readings file.
    ///
    /// # Errors
    /// Invalid inputs (named), an unreadable readings file (named with its path).
    pub fn run(
        &self,
        case: &LeafCase,
        structure: &CanopyStructure,
        scenario_dir: Option<&Path>,
    ) -> Result<FansRun> {
        let estimate = fans::estimate_layout(&self.layout, structure)?;
        let sizing = match self.target_canopy_speed_m_s {
            Some(target) => {
                let house = HouseForFans {
                    length_m: self.layout.house_length_m,
                    width_m: self.layout.house_width_m,
                    mounting_height_m: self.layout.mounting_height_m,
                    tilt_down_rad: self.layout.tilt_down_rad,
                    first_fan_m: self.layout.first_fan_m,
                };
                Some((
                    target,
                    fans::size_fans(target, &house, structure, &GENERIC_FANS, Estimate::Typical)?,
                ))
            }
            None => None,
        };
        let readings = match &self.readings_csv {
            Some(file) => {
                let path = scenario_dir.map_or_else(|| file.clone(), |d| d.join(file));
                let text = std::fs::read_to_string(&path)
                    .with_context(|| format!("cannot read the readings file {}", path.display()))?;
                let import = fans::parse_readings_csv(&text)
                    .with_context(|| format!("in the readings file {}", path.display()))?;
                let summary =
                    fans::analyse_readings(&import.readings, self.dead_zone_m_s, Some(case), 3)?;
                Some((
                    summary,
                    import.errors.iter().map(ToString::to_string).collect(),
                ))
            }
            None => None,
        };
        let returns = fans::leaf_diminishing_returns(case, 3.0, self.worth_it_k)?;
        let energy = fans::fan_energy(&self.layout, self.run_hours_per_day)?;
        let night = match &self.night {
            Some(n) => {
                let mut night_case = case.with_speed(estimate.min_canopy_top.typical_m_s);
                night_case.air.temp_c = n.air_temp_c;
                night_case.air.humidity = n.humidity;
                night_case.surroundings.shortwave_w_m2 = 0.0;
                night_case.surroundings.upper_view = n.upper_view;
                night_case.surroundings.ground_temp_c = None;
                let margin = condensation::dew_margin(&night_case)?;
                let answer = condensation::least_speed_against_dew(&night_case, n.margin_k, 5.0)?;
                Some((margin, answer))
            }
            None => None,
        };
        Ok(FansRun {
            estimate,
            sizing,
            readings,
            returns,
            energy,
            night,
        })
    }
}

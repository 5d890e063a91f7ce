//! The canopy section of a scenario — the crop's structure, the site and moment, the light, an
//! optional greenhouse, crop limit, design day and weather file — and the run that turns it into
//! the sizing answers and time series. Shared by `leafwind canopy`, the window and the report.
//!
//! The section reuses the scenario's leaf case: its air is the air at the canopy top (inside the
//! greenhouse when there is one, unless the inside air is computed from ventilation), its air speed
//! is the canopy-top (fan) air speed, its leaf is the
//! crop's leaf, and its heat limit and margin are used unless a crop preset is named.

use std::path::{Path, PathBuf};

use anyhow::{Context, Result, anyhow};
use leafwind_physics::canopy::{
    self, CanopyCase, CanopyLight, CanopySolution, CanopyStructure, SpeedAnswer,
};
use leafwind_physics::condensation::{self, DewSeries};
use leafwind_physics::cooling::{self, OptionDay, OptionMoment};
use leafwind_physics::crops::{self, HeatLimit, LimitKind};
use leafwind_physics::design_day::{
    self, DesignDay, Environment, GreenhouseSetup, HourlySeries, SeriesCase,
};
use leafwind_physics::greenhouse::{
    self, Cover, GreenhouseCase, InsideAir, Outside, ShadeAnswer, VENTILATION_DEFAULT_M3_M2_S,
};
use leafwind_physics::heat_rules::{self, HeatRule, RuleOutcome};
use leafwind_physics::sun::{self, DateTime, HorizontalShortwave, Site};
use leafwind_physics::ventilation::{self, VentilationCheck};
use leafwind_physics::weather;
use leafwind_physics::{Humidity, LeafCase};
use serde::{Deserialize, Serialize};

/// Default upper end of the canopy-top air speed search \[m s⁻¹\] (common practice, no source:
/// beyond any circulation fan's effect at the crop).
pub const CANOPY_SEARCH_MAX_DEFAULT_M_S: f64 = 5.0;

fn default_search_max() -> f64 {
    CANOPY_SEARCH_MAX_DEFAULT_M_S
}

/// Light above the canopy (or above the greenhouse cover).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum LightAbove {
    /// Clear sky from the sun position (the ASHRAE clear-sky model in the engine's `sun` module).
    #[default]
    ClearSky,
    /// Measured beam and diffuse on the horizontal \[W m⁻²\].
    Measured {
        /// Beam on the horizontal \[W m⁻²\].
        beam_w_m2: f64,
        /// Diffuse on the horizontal \[W m⁻²\].
        diffuse_w_m2: f64,
    },
    /// Measured global on the horizontal \[W m⁻²\], split into beam and diffuse by Erbs et al.
    Global {
        /// Global horizontal irradiance \[W m⁻²\].
        global_w_m2: f64,
    },
}

/// Where the air inside the greenhouse comes from.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum InsideMode {
    /// The scenario's own air (temperature and humidity) is the inside air, as measured.
    #[default]
    ScenarioAir,
    /// The inside air follows from a steady ventilation balance with the outside air.
    Ventilated {
        /// Ventilation rate per floor area \[m³ s⁻¹ m⁻²\].
        rate_m3_m2_s: f64,
    },
}

/// The greenhouse around the crop.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct GreenhouseSection {
    /// The cover: transmittance, temperature, heat loss.
    pub cover: Cover,
    /// Shade screen (or whitewash) fraction of light held back \[–\].
    #[serde(default)]
    pub shade_fraction: f64,
    /// Outside air temperature \[°C\].
    pub outside_air_temp_c: f64,
    /// Outside humidity.
    pub outside_humidity: Humidity,
    /// The inside air: the scenario's, or from the ventilation balance.
    #[serde(default)]
    pub inside: InsideMode,
    /// The rise of the air from inlet to outlet the ventilation design allows \[K\] (the
    /// ventilation standard's reference is 4 K, 7 °F).
    #[serde(default = "default_design_rise")]
    pub design_rise_k: f64,
}

fn default_design_rise() -> f64 {
    ventilation::FACTOR_REFERENCE_RISE_K
}

impl GreenhouseSection {
    /// The engine's inside-air choice for a scenario whose air is `case`'s.
    #[must_use]
    pub fn inside_air(&self, case: &LeafCase) -> InsideAir {
        match self.inside {
            InsideMode::ScenarioAir => InsideAir::Given {
                temp_c: case.air.temp_c,
                humidity: case.air.humidity,
            },
            InsideMode::Ventilated { rate_m3_m2_s } => InsideAir::Ventilated { rate_m3_m2_s },
        }
    }
}

/// A crop limit from the built-in table (`assets/crops.ron` mirrors it).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CropChoice {
    /// Crop name, e.g. "tomato".
    pub crop: String,
    /// Growth stage, or the start of its name.
    pub stage: String,
}

/// The canopy section of a scenario.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CanopySection {
    /// Leaf area index, height, layers, leaf angles, wind attenuation.
    pub structure: CanopyStructure,
    /// Latitude, longitude, UTC offset, altitude.
    pub site: Site,
    /// The moment of the canopy profile (local clock time).
    pub when: DateTime,
    /// Light above the canopy or the cover.
    #[serde(default)]
    pub light: LightAbove,
    /// The greenhouse, if the crop is under cover.
    #[serde(default)]
    pub greenhouse: Option<GreenhouseSection>,
    /// A crop limit by crop and stage: the scenario's own list first, then the built-in table;
    /// without it the scenario's own limit is taken as a leaf (tissue) limit.
    #[serde(default)]
    pub crop: Option<CropChoice>,
    /// The user's own crop limits (crop, stage, limit, air or tissue, source), kept with the
    /// scenario and offered beside the built-in ones.
    #[serde(default)]
    pub own_limits: Vec<HeatLimit>,
    /// A design day to run hour by hour.
    #[serde(default)]
    pub design_day: Option<DesignDay>,
    /// An hourly weather CSV (path relative to the scenario file) to run hour by hour.
    #[serde(default)]
    pub weather_csv: Option<PathBuf>,
    /// Upper end of the canopy-top air speed search \[m s⁻¹\].
    #[serde(default = "default_search_max")]
    pub max_search_speed_m_s: f64,
    /// Heat rules with durations ("3 h above 40 °C on two days"), checked over the design day and
    /// the weather file.
    #[serde(default)]
    pub heat_rules: Vec<HeatRule>,
}

impl Default for CanopySection {
    fn default() -> Self {
        Self {
            structure: CanopyStructure::default(),
            site: Site::default(),
            when: DateTime::date(2026, 7, 21).at(14, 0),
            light: LightAbove::ClearSky,
            greenhouse: None,
            crop: None,
            own_limits: Vec::new(),
            design_day: None,
            weather_csv: None,
            max_search_speed_m_s: CANOPY_SEARCH_MAX_DEFAULT_M_S,
            heat_rules: Vec::new(),
        }
    }
}

/// What a canopy run found.
#[derive(Debug, Clone)]
pub struct CanopyRun {
    /// Sun elevation at the moment \[rad\] (negative below the horizon).
    pub sun_elevation_rad: f64,
    /// Sun azimuth at the moment \[rad\], clockwise from north.
    pub sun_azimuth_rad: f64,
    /// Light above the canopy or cover.
    pub shortwave_above: HorizontalShortwave,
    /// The limit used.
    pub limit: HeatLimit,
    /// Margin kept below it \[K\].
    pub margin_k: f64,
    /// Inside air temperature when under cover \[°C\].
    pub inside_air_temp_c: Option<f64>,
    /// The canopy profile.
    pub canopy: CanopySolution,
    /// Least canopy-top air speed for the hottest leaf.
    pub speed: SpeedAnswer,
    /// Least shade fraction (under cover only).
    pub shade: Option<ShadeAnswer>,
    /// Least ventilation rates and the standard's factor method (under cover only).
    pub ventilation: Option<VentilationRun>,
    /// Hour by hour over the design day, if the section has one.
    pub design_day: Option<HourlySeries>,
    /// Hour by hour over the weather file, if the section names one, with its bad rows.
    pub weather: Option<(HourlySeries, Vec<weather::RowError>)>,
    /// The section's heat rules checked over the design day (one per rule; empty without one).
    pub design_day_rules: Vec<RuleOutcome>,
    /// The section's heat rules checked over the weather file (one per rule; empty without one).
    pub weather_rules: Vec<RuleOutcome>,
    /// Over the design day: hours with the crop's leaves (at the scenario's air speed, with what
    /// the scenario's leaf sees above) below the dew point and below it plus the margin.
    pub dew: Option<DewSeries>,
    /// The cooling and shading options side by side (under cover only).
    pub cooling: Option<CoolingTable>,
}

/// The sizing answers at one moment: least canopy-top air speed, and under cover the least shade
/// and the ventilation answers.
#[derive(Debug, Clone)]
pub struct CanopySizing {
    /// The limit used.
    pub limit: HeatLimit,
    /// Margin kept below it \[K\].
    pub margin_k: f64,
    /// Least canopy-top air speed for the hottest leaf.
    pub speed: SpeedAnswer,
    /// Least shade fraction (under cover only).
    pub shade: Option<ShadeAnswer>,
    /// Least ventilation rates and the standard's factor method (under cover only).
    pub ventilation: Option<VentilationRun>,
}

/// The canopy profile and the sizing answers at the section's moment.
struct Moment {
    canopy: CanopySolution,
    inside_air_temp_c: Option<f64>,
    sizing: CanopySizing,
}

/// The ventilation answers and what they rest on.
#[derive(Debug, Clone, Copy)]
pub struct VentilationRun {
    /// The least rates and the factor method.
    pub check: VentilationCheck,
    /// Outside air the balance starts from \[°C\].
    pub outside_air_temp_c: f64,
    /// Whether the scenario's other answers take the inside air as measured (the ventilation
    /// answers always come from the balance with the outside air).
    pub inside_as_measured: bool,
    /// The allowed rise of the air the design-rise answers use \[K\].
    pub design_rise_k: f64,
}

impl VentilationRun {
    /// What the answers rest on, for a parenthesis; `outside` is the outside air as shown.
    #[must_use]
    pub fn basis(&self, outside: &str) -> String {
        if self.inside_as_measured {
            format!(
                "from the ventilation balance with the outside air at {outside}; the other answers take the inside air as measured"
            )
        } else {
            format!("from the ventilation balance with the outside air at {outside}")
        }
    }
}

/// Cooling and shading options compared (engine's `cooling` module).
#[derive(Debug, Clone)]
pub enum CoolingTable {
    /// Over the design day: hours over the limit, water and fan energy.
    Day(Vec<OptionDay>),
    /// At the profile's moment only (no design day in the section).
    Moment(Vec<OptionMoment>),
}

/// Margin kept above the dew point in the design-day dew count \[K\] (the engine's default).
pub const DEW_MARGIN_K: f64 = condensation::DEW_MARGIN_DEFAULT_K;

/// Fan power per floor area assumed for the "fans" options when the scenario has no fans section
/// \[W m⁻²\]: 2 W m⁻², typical of horizontal-airflow fans (common practice, no source).
pub const FAN_POWER_DEFAULT_W_M2: f64 = 2.0;

impl CanopyRun {
    /// Why there is no shade answer, when there is none.
    #[must_use]
    pub fn shade_reason(&self) -> String {
        match &self.shade {
            Some(s) => s.sentence(),
            None => "Shade sizing needs a greenhouse or shade-house cover in the scenario; this crop is in the open field.".to_owned(),
        }
    }

    /// The least ventilation rate for the hottest leaf in words, or why there is none.
    #[must_use]
    pub fn ventilation_reason(&self) -> String {
        match &self.ventilation {
            Some(v) => {
                let basis = v.basis(&format!("{:.1} °C", v.outside_air_temp_c));
                let mut chars = basis.chars();
                let first = chars.next().map(|c| c.to_uppercase().to_string());
                format!(
                    "{} {}{}.",
                    v.check.for_leaf.sentence(),
                    first.unwrap_or_default(),
                    chars.as_str()
                )
            }
            None => "Ventilation sizing needs a greenhouse cover in the scenario; this crop is in the open field.".to_owned(),
        }
    }
}

impl CanopySection {
    /// The limit in use: the named crop's, or the scenario's own as a leaf limit.
    ///
    /// # Errors
    /// An unknown crop or stage (the message lists the valid ones).
    pub fn limit(&self, own_limit_c: f64) -> Result<HeatLimit> {
        match &self.crop {
            Some(c) => match self.own_limit(c) {
                Some(l) => {
                    l.validate()?;
                    Ok(l.clone())
                }
                None => Ok(crops::find(&c.crop, &c.stage)?.clone()),
            },
            None => Ok(HeatLimit::user(
                "this scenario's crop",
                "as set",
                own_limit_c,
                LimitKind::Tissue,
            )),
        }
    }

    /// The user's own limit for `choice` (crop and stage matched case-insensitively, the stage by
    /// its start, as the built-in lookup does).
    #[must_use]
    pub fn own_limit(&self, choice: &CropChoice) -> Option<&HeatLimit> {
        self.own_limits.iter().find(|l| {
            l.crop.eq_ignore_ascii_case(&choice.crop)
                && l.stage
                    .to_lowercase()
                    .starts_with(&choice.stage.to_lowercase())
        })
    }

    /// The light above at the moment, and the sun.
    fn light(&self) -> Result<(sun::SunPosition, HorizontalShortwave)> {
        let pos = sun::sun_position(&self.site, &self.when)?;
        let light = match self.light {
            LightAbove::ClearSky => sun::ashrae_clear_sky(self.when.month, pos.elevation_rad),
            LightAbove::Measured {
                beam_w_m2,
                diffuse_w_m2,
            } => HorizontalShortwave {
                beam_w_m2,
                diffuse_w_m2,
            },
            LightAbove::Global { global_w_m2 } => {
                sun::split_global(global_w_m2, self.when.day_of_year(), pos.elevation_rad)?
            }
        };
        Ok((pos, light))
    }

    /// Runs the section for a scenario's leaf case, limit and margin. `scenario_dir` resolves a
    /// relative weather file.
    ///
    /// # Errors
    /// Invalid inputs (named), an unreadable weather file (named with its path).
    pub fn run(
        &self,
        case: &LeafCase,
        own_limit_c: f64,
        margin_k: f64,
        scenario_dir: Option<&Path>,
    ) -> Result<CanopyRun> {
        self.run_with_fans(
            case,
            own_limit_c,
            margin_k,
            scenario_dir,
            FAN_POWER_DEFAULT_W_M2,
        )
    }

    /// As [`CanopySection::run`], with the circulation-fan power per floor area \[W m⁻²\] the
    /// "fans" cooling options use (from the scenario's fans section when it has one).
    ///
    /// # Errors
    /// As [`CanopySection::run`].
    pub fn run_with_fans(
        &self,
        case: &LeafCase,
        own_limit_c: f64,
        margin_k: f64,
        scenario_dir: Option<&Path>,
        fan_power_w_m2: f64,
    ) -> Result<CanopyRun> {
        let limit = self.limit(own_limit_c)?;
        let (pos, shortwave) = self.light()?;
        let elevation = pos.elevation_rad.max(0.0);
        let moment = self.moment(case, &limit, margin_k, elevation, shortwave)?;
        let (canopy, inside) = (moment.canopy, moment.inside_air_temp_c);
        let CanopySizing {
            speed,
            shade,
            ventilation,
            ..
        } = moment.sizing;
        let series_case = self.series_case(case, &limit);
        let design_day = match &self.design_day {
            Some(day) => Some(design_day::run(day, &series_case)?),
            None => None,
        };
        let weather = match &self.weather_csv {
            Some(file) => {
                let path = scenario_dir.map_or_else(|| file.clone(), |d| d.join(file));
                let text = std::fs::read_to_string(&path)
                    .with_context(|| format!("cannot read the weather file {}", path.display()))?;
                let import = weather::parse_csv(&text)
                    .map_err(|e| anyhow!("{e} in the weather file {}", path.display()))?;
                let series = weather::run_series(&import.records, &series_case)?;
                Some((series, import.errors))
            }
            None => None,
        };
        let rules_over = |s: Option<&HourlySeries>| -> Result<Vec<RuleOutcome>> {
            let Some(s) = s else {
                return Ok(Vec::new());
            };
            self.heat_rules
                .iter()
                .map(|r| Ok(heat_rules::check_rule(r, s)?))
                .collect()
        };
        let design_day_rules = rules_over(design_day.as_ref())?;
        let weather_rules = rules_over(weather.as_ref().map(|(s, _)| s))?;
        let dew = match &self.design_day {
            Some(day) => {
                let hours = design_day::design_day_weather(day, &self.site)?;
                let cases = condensation::hourly_leaf_cases(
                    &self.site,
                    &hours,
                    &case.leaf,
                    case.surroundings.upper_view,
                    case.air.speed_m_s,
                )?;
                Some(condensation::dew_hours(&cases, DEW_MARGIN_K)?)
            }
            None => None,
        };
        let cooling =
            self.cooling_table(case, &limit, margin_k, elevation, shortwave, fan_power_w_m2)?;
        Ok(CanopyRun {
            sun_elevation_rad: pos.elevation_rad,
            sun_azimuth_rad: pos.azimuth_rad,
            shortwave_above: shortwave,
            limit,
            margin_k,
            inside_air_temp_c: inside,
            canopy,
            speed,
            shade,
            ventilation,
            design_day,
            weather,
            design_day_rules,
            weather_rules,
            dew,
            cooling,
        })
    }

    /// The sizing answers at the section's moment, without the design day, weather or options
    /// (what the grower report shows).
    ///
    /// # Errors
    /// As [`CanopySection::run`].
    pub fn sizing(&self, case: &LeafCase, own_limit_c: f64, margin_k: f64) -> Result<CanopySizing> {
        let limit = self.limit(own_limit_c)?;
        let (pos, shortwave) = self.light()?;
        Ok(self
            .moment(
                case,
                &limit,
                margin_k,
                pos.elevation_rad.max(0.0),
                shortwave,
            )?
            .sizing)
    }

    /// The profile and the sizing answers at the section's moment.
    fn moment(
        &self,
        case: &LeafCase,
        limit: &HeatLimit,
        margin_k: f64,
        elevation: f64,
        shortwave: HorizontalShortwave,
    ) -> Result<Moment> {
        let (canopy, inside_air_temp_c, speed, shade, ventilation) = match &self.greenhouse {
            None => {
                let cc = self.open_field_case(case, elevation, shortwave, limit.limit_c);
                let sol = canopy::solve_canopy(&cc)?;
                let speed = canopy::least_top_speed(
                    &cc,
                    limit.limit_c,
                    margin_k,
                    self.max_search_speed_m_s,
                )?;
                (sol, None, speed, None, None)
            }
            Some(g) => {
                let gc = self.greenhouse_case(g, case, elevation, shortwave, limit.limit_c);
                let sol = greenhouse::solve_greenhouse(&gc)?;
                let sizing =
                    greenhouse::size(&gc, limit.limit_c, margin_k, self.max_search_speed_m_s)?;
                let ventilation = VentilationRun {
                    check: ventilation::design_check(
                        &gc,
                        limit.limit_c,
                        margin_k,
                        g.design_rise_k,
                    )?,
                    outside_air_temp_c: g.outside_air_temp_c,
                    inside_as_measured: matches!(g.inside, InsideMode::ScenarioAir),
                    design_rise_k: g.design_rise_k,
                };
                (
                    sol.canopy,
                    Some(sol.inside_air_temp_c),
                    sizing.speed,
                    Some(sizing.shade),
                    Some(ventilation),
                )
            }
        };
        Ok(Moment {
            canopy,
            inside_air_temp_c,
            sizing: CanopySizing {
                limit: limit.clone(),
                margin_k,
                speed,
                shade,
                ventilation,
            },
        })
    }

    /// The cooling options table: over the design day when there is one, else at the moment;
    /// None in the open field.
    fn cooling_table(
        &self,
        case: &LeafCase,
        limit: &HeatLimit,
        margin_k: f64,
        elevation_rad: f64,
        shortwave: HorizontalShortwave,
        fan_power_w_m2: f64,
    ) -> Result<Option<CoolingTable>> {
        let Some(g) = &self.greenhouse else {
            return Ok(None);
        };
        let options = cooling::standard_options(case.air.speed_m_s, fan_power_w_m2);
        // Cooling and fans are taken to run whenever the outside air is within 5 K of the target
        // (a working assumption of this tool, no source; it only sets the water and energy hours).
        let run_above_c = limit.limit_c - margin_k - 5.0;
        Ok(Some(match &self.design_day {
            Some(day) => {
                let series = self.series_case(case, limit);
                CoolingTable::Day(cooling::compare_design_day(
                    day,
                    &series,
                    &options,
                    run_above_c,
                )?)
            }
            None => {
                let gc = self.greenhouse_case(g, case, elevation_rad, shortwave, limit.limit_c);
                CoolingTable::Moment(cooling::compare_moment(&gc, &options, Some(limit.limit_c))?)
            }
        }))
    }

    /// The canopy case in the open field: the scenario's air and sky, and the light above.
    fn open_field_case(
        &self,
        case: &LeafCase,
        elevation_rad: f64,
        shortwave: HorizontalShortwave,
        limit_c: f64,
    ) -> CanopyCase {
        CanopyCase {
            air: case.air,
            leaf: case.leaf,
            upper_view: case.surroundings.upper_view,
            light: CanopyLight {
                sun_elevation_rad: elevation_rad,
                shortwave,
            },
            structure: self.structure,
            critical_reynolds: case.critical_reynolds,
            limit_c: Some(limit_c),
        }
    }

    /// The canopy case at the profile's moment, as the crop sees it: in the open field the scenario's
    /// air, sky and the light above; under cover the inside air from the greenhouse balance, the
    /// cover as what the canopy sees, and the light the cover and shade let through.
    ///
    /// # Errors
    /// Invalid inputs (named).
    pub fn profile_case(&self, case: &LeafCase, own_limit_c: f64) -> Result<CanopyCase> {
        let limit = self.limit(own_limit_c)?;
        let (pos, shortwave) = self.light()?;
        let elevation = pos.elevation_rad.max(0.0);
        let mut cc = self.open_field_case(case, elevation, shortwave, limit.limit_c);
        if let Some(g) = &self.greenhouse {
            let gc = self.greenhouse_case(g, case, elevation, shortwave, limit.limit_c);
            let sol = greenhouse::solve_greenhouse(&gc)?;
            cc.air.temp_c = sol.inside_air_temp_c;
            cc.air.humidity = Humidity::RelativePct(sol.inside_rh_pct.clamp(0.0, 100.0));
            cc.upper_view = leafwind_physics::UpperView::CoverTempC(sol.cover_temp_c);
            cc.light.shortwave = gc.inside_light();
        }
        Ok(cc)
    }

    /// The design day and the engine's hour-by-hour case, when the section has a design day.
    ///
    /// # Errors
    /// An unknown crop limit.
    pub fn design_day_inputs(
        &self,
        case: &LeafCase,
        own_limit_c: f64,
    ) -> Result<Option<(DesignDay, SeriesCase)>> {
        let limit = self.limit(own_limit_c)?;
        Ok(self
            .design_day
            .map(|day| (day, self.series_case(case, &limit))))
    }

    /// The engine's greenhouse case for this section at one moment.
    fn greenhouse_case(
        &self,
        g: &GreenhouseSection,
        case: &LeafCase,
        elevation_rad: f64,
        shortwave: HorizontalShortwave,
        limit_c: f64,
    ) -> GreenhouseCase {
        GreenhouseCase {
            outside: Outside {
                air_temp_c: g.outside_air_temp_c,
                humidity: g.outside_humidity,
                pressure_kpa: case.air.pressure_kpa,
                sun_elevation_rad: elevation_rad,
                shortwave,
            },
            cover: g.cover,
            shade_fraction: g.shade_fraction,
            inside: g.inside_air(case),
            canopy_top_speed_m_s: case.air.speed_m_s,
            leaf: case.leaf,
            structure: self.structure,
            turbulence_factor: case.air.turbulence_factor,
            critical_reynolds: case.critical_reynolds,
            limit_c: Some(limit_c),
        }
    }

    /// The engine's hour-by-hour case for this section.
    fn series_case(&self, case: &LeafCase, limit: &HeatLimit) -> SeriesCase {
        SeriesCase {
            site: self.site,
            leaf: case.leaf,
            structure: self.structure,
            limit: limit.clone(),
            environment: match &self.greenhouse {
                None => Environment::OpenField,
                Some(g) => Environment::Greenhouse(GreenhouseSetup {
                    cover: g.cover,
                    shade_fraction: g.shade_fraction,
                    ventilation_m3_m2_s: match g.inside {
                        InsideMode::Ventilated { rate_m3_m2_s } => rate_m3_m2_s,
                        InsideMode::ScenarioAir => VENTILATION_DEFAULT_M3_M2_S,
                    },
                    canopy_top_speed_m_s: case.air.speed_m_s,
                }),
            },
            wind_factor: 1.0,
            turbulence_factor: case.air.turbulence_factor,
            critical_reynolds: case.critical_reynolds,
        }
    }
}

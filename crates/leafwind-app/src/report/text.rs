//! The report's fixed text: the assumptions behind the numbers (filled in from the scenario), the
//! published source of each model the engine uses (as its module documentation cites them), and
//! the cautions.

use leafwind_physics::required_wind::SEARCH_MAX_SPEED_DEFAULT_M_S;
use leafwind_physics::{LeafCase, UpperView};

use super::tables::show;
use super::units::{Quantity, UnitSystem};

/// A model and its published source.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Source {
    /// What the model gives.
    pub model: &'static str,
    /// The reference: authors, year, title, edition or journal, and the equations used.
    pub reference: &'static str,
}

/// The sources of the single-leaf models (every report uses these).
pub const LEAF_SOURCES: &[Source] = &[
    Source {
        model: "Saturation vapour pressure and its slope, vapour pressure from relative humidity or dew point, latent heat of vaporisation, pressure from altitude",
        reference: "Allen, R. G., Pereira, L. S., Raes, D., Smith, M. (1998). Crop evapotranspiration — Guidelines for computing crop water requirements. FAO Irrigation and Drainage Paper 56 (FAO-56), Rome: FAO. Eqs. 7, 10, 11, 13, 14 and Annex 3 eq. 3-1.",
    },
    Source {
        model: "Viscosity and thermal conductivity of air (Sutherland's laws)",
        reference: "White, F. M. (2006). Viscous Fluid Flow, 3rd ed. McGraw-Hill. Eq. 1-36 with Tables 1-2 and 1-3.",
    },
    Source {
        model: "Diffusivity of water vapour in air",
        reference: "Massman, W. J. (1998). A review of the molecular diffusivities of H₂O, CO₂, CH₄, CO, O₃, SO₂, NH₃, N₂O, NO, and NO₂ in air, O₂ and N₂ near STP. Atmospheric Environment 32(6), 1111–1127.",
    },
    Source {
        model: "Forced convection over the leaf as a flat plate (laminar and mixed laminar–turbulent), free convection of horizontal plates with L = area/perimeter, mixed convection, heat–mass transfer analogy for vapour",
        reference: "Bergman, T. L., Lavine, A. S., Incropera, F. P., DeWitt, D. P. (2011). Fundamentals of Heat and Mass Transfer, 7th ed. Wiley. Eqs. 7.30, 7.38, 7.39; §7.2; eqs. 9.30–9.32; §9.9; §6.7.1 (equation numbers as in the 6th ed., from memory).",
    },
    Source {
        model: "Boundary-layer thickness: numerical Blasius solution (laminar), 1/7-power law past transition",
        reference: "Schlichting, H., Gersten, K. (2017). Boundary-Layer Theory, 9th ed. Springer, §6.5; Incropera, F. P., et al. (2007). Fundamentals of Heat and Mass Transfer, 6th ed., eqs. 7.19 and 7.35.",
    },
    Source {
        model: "Clear-sky longwave radiation (sky emissivity)",
        reference: "Brutsaert, W. (1975). On a derivable formula for long-wave radiation from clear skies. Water Resources Research 11(5), 742–744.",
    },
    Source {
        model: "Leaf boundary-layer and stomatal conductances, the free-stream turbulence factor (about 1.4 outdoors), leaf radiation balance and radiative conductance, the leaf energy balance",
        reference: "Campbell, G. S., Norman, J. M. (1998). An Introduction to Environmental Biophysics, 2nd ed. Springer. Ch. 7, 10–12 and 14.",
    },
    Source {
        model: "Linearised (Penman–Monteith-type) leaf temperature shown beside the exact one",
        reference: "Monteith, J. L., Unsworth, M. H. (2013). Principles of Environmental Physics, 4th ed. Academic Press, ch. 13; Campbell & Norman (1998), ch. 14.",
    },
    Source {
        model: "Cuticular (minimum) leaf conductance",
        reference: "Kerstiens, G. (1996). Cuticular water permeability and its physiological significance. Journal of Experimental Botany 47, 1813–1832 (order of magnitude; value from memory).",
    },
    Source {
        model: "Root finder of the exact energy balance (bracketed, safeguarded Newton)",
        reference: "Press, W. H., Teukolsky, S. A., Vetterling, W. T., Flannery, B. P. (2007). Numerical Recipes: The Art of Scientific Computing, 3rd ed. Cambridge University Press, §9.4.",
    },
    Source {
        model: "Physical constants (Stefan–Boltzmann, gas constant, molar masses)",
        reference: "Tiesinga, E., Mohr, P. J., Newell, D. B., Taylor, B. N. (2021). CODATA recommended values of the fundamental physical constants: 2018. Rev. Mod. Phys. 93, 025010.",
    },
];

/// The sources of the canopy model (used when the report has a canopy section).
pub const CANOPY_SOURCES: &[Source] = &[
    Source {
        model: "Canopy light: beam extinction of ellipsoidal leaf-angle distributions, diffuse transmittance, sunlit leaf area",
        reference: "Campbell, G. S., Norman, J. M. (1998). An Introduction to Environmental Biophysics, 2nd ed. Springer, ch. 15, eqs. 15.4, 15.5, 15.21 (after Campbell 1986, Agric. For. Meteorol. 36, 317–321; equation numbers from memory).",
    },
    Source {
        model: "Sunlit and shaded leaves, scattered beam",
        reference: "de Pury, D. G. G., Farquhar, G. D. (1997). Simple scaling of photosynthesis from leaves to canopies without the errors of big-leaf models. Plant, Cell and Environment 20, 537–557 (from memory).",
    },
    Source {
        model: "Wind profile inside the canopy",
        reference: "Cionco, R. M. (1965). A mathematical model for air flow in a vegetative canopy. Journal of Applied Meteorology 4, 517–522.",
    },
];

/// The sources of the canopy sizing answers (used when the report has that section).
pub const SIZING_SOURCES: &[Source] = &[
    Source {
        model: "Greenhouse inside air from the steady ventilation balance",
        reference: "ASHRAE, ASHRAE Handbook — HVAC Applications, chapter \"Environmental control for animals and plants\" (from memory).",
    },
    Source {
        model: "Ventilation standard's factor method (8 cfm per ft² at 5 000 fc, 7 °F rise, below 1 000 ft; elevation, light and temperature factors)",
        reference: "ASABE EP406, Heating, Ventilating and Cooling Greenhouses (values from memory).",
    },
];

/// The sources of the hour-by-hour design day (used when the report has a design-day section).
pub const DESIGN_DAY_SOURCES: &[Source] = &[
    Source {
        model: "Diurnal shape of the air temperature",
        reference: "ASHRAE (2009). ASHRAE Handbook — Fundamentals, ch. 14, Table 6 \"Fraction of daily temperature range\" (values from memory).",
    },
    Source {
        model: "Solar position",
        reference: "Michalsky, J. J. (1988). The Astronomical Almanac's algorithm for approximate solar position (1950–2050). Solar Energy 40(3), 227–235.",
    },
    Source {
        model: "Clear-sky beam and diffuse sunlight",
        reference: "ASHRAE (1985). ASHRAE Handbook — Fundamentals, ch. 27, Table 1 (table values from memory).",
    },
    Source {
        model: "Greenhouse inside air from the ventilation balance (when under cover)",
        reference: "ASHRAE, ASHRAE Handbook — HVAC Applications, chapter \"Environmental control for animals and plants\"; ASABE EP406, Heating, Ventilating and Cooling Greenhouses (from memory).",
    },
];

/// The assumptions behind this scenario's numbers, as plain sentences.
#[must_use]
pub fn assumptions(case: &LeafCase, units: UnitSystem) -> Vec<String> {
    let t = |c: f64| show(Quantity::Temperature, c, units);
    let above = match case.surroundings.upper_view {
        UpperView::ClearSky => {
            "the upper face sees a clear sky, at the radiant temperature the Brutsaert formula gives for the air's temperature and humidity".to_owned()
        }
        UpperView::SkyTempC(c) => format!("the upper face sees a sky at {}", t(c)),
        UpperView::CoverTempC(c) => {
            format!("the upper face sees a cover (glass, film or net) at {}, treated as black for heat radiation", t(c))
        }
    };
    let ground = case
        .surroundings
        .ground_temp_c
        .map_or_else(|| "at the air temperature".to_owned(), t);
    vec![
        "Steady state: sun, air and wind are taken as constant long enough for the leaf to settle (minutes); the leaf stores no heat.".to_owned(),
        "One flat, horizontal leaf in free air. Fluxes are per square metre of one side of the leaf, both faces summed.".to_owned(),
        format!(
            "Air temperature, humidity and air speed are those just outside the leaf's boundary layer (the free stream), uniform over the leaf. Forced convection uses flat-plate correlations multiplied by a turbulence factor of {:.2}; the boundary layer turns turbulent at a Reynolds number of {}.",
            case.air.turbulence_factor,
            super::tables::show_sig(case.critical_reynolds)
        ),
        format!(
            "Heat radiation: {above}; the lower face sees the ground {ground}. Sunlight is absorbed with an absorptivity of {:.2}; the ground reflects {:.0} % of it onto the lower face.",
            case.leaf.absorptivity,
            100.0 * case.surroundings.ground_albedo
        ),
        format!(
            "Transpiration: the stomatal conductance is fixed at {:.3} mol/m²/s ({:.0} % of it on the lower face), in series with each face's boundary layer, plus a cuticular conductance of {:.3} mol/m²/s. Real stomata close in drought, heat or dry air; the leaf then runs hotter than shown.",
            case.leaf.stomatal_conductance_mol_m2_s,
            100.0 * case.leaf.lower_share,
            case.leaf.cuticular_conductance_mol_m2_s
        ),
        format!(
            "The least air speed is searched from still air up to {} on the exact balance; the sweep and the map change only the air speed and the leaf size, everything else stays as in the inputs.",
            show(Quantity::Speed, SEARCH_MAX_SPEED_DEFAULT_M_S, units)
        ),
        "The heat limit and the margin are the scenario's own values: set them for your crop and its growth stage with local agronomic advice.".to_owned(),
    ]
}

/// The cautions, as plain sentences.
pub const CAUTIONS: &[&str] = &[
    "These are estimates from physics and typical parameters; real leaves, fans and greenhouses differ (leaf angle, shading by other leaves, stomata that close, uneven air flow between rows).",
    "Check the numbers against measurements before acting on them: leaf temperatures with an infrared thermometer (set for an emissivity near 0.95–0.98) and the air speed at the leaves with an anemometer.",
    "Crop decisions belong with local agronomic advice. Fans, vents, heating and cooling, and their structures and electrical installation, must follow local codes and be designed and installed by licensed practitioners.",
    "A greenhouse that is hot for the crop is dangerous for the people working in it; worker heat safety is outside the scope of this report.",
];

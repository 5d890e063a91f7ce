//! The inputs panel: air, air movement, light and surroundings, leaf, stomata, crop heat limit —
//! grouped in the grower's terms, every field with its unit, tooltip and range check.

use egui::{CollapsingHeader, ComboBox, RichText, ScrollArea, TextEdit, Ui};
use leafwind_physics::air::{
    AIR_TEMP_RANGE_C, ALTITUDE_RANGE_M, PRESSURE_RANGE_KPA, RELATIVE_HUMIDITY_RANGE_PCT,
};
use leafwind_physics::case::{AIR_SPEED_RANGE_M_S, LEAF_DIMENSION_RANGE_M};
use leafwind_physics::convection::{CRITICAL_REYNOLDS_RANGE, TURBULENCE_FACTOR_RANGE};
use leafwind_physics::error::ValidRange;
use leafwind_physics::radiation::{
    ABSORPTIVITY_RANGE, ALBEDO_RANGE, EMISSIVITY_RANGE, SHORTWAVE_RANGE_W_M2, SURFACE_TEMP_RANGE_C,
};
use leafwind_physics::required_wind::{LIMIT_RANGE_C, MARGIN_RANGE_K};
use leafwind_physics::transpiration::{
    CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S, LOWER_SHARE_RANGE, STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S,
};
use leafwind_physics::{Humidity, UpperView};

use crate::document::{HumidityKind, ScenarioDocument};
use crate::gui::commands::Command;
use crate::gui::fields::{Field, field_label, name_widget, number_field};
use crate::units::{Quantity, UnitSystem};

/// A stomatal preset: label, conductance \[mol m⁻² s⁻¹\], source.
pub const STOMATAL_PRESETS: [(&str, f64, &str); 3] = [
    (
        "Well watered 0.4",
        0.4,
        "A well-watered crop leaf in good light. Order of magnitude from Campbell & Norman 1998, An Introduction to Environmental Biophysics, 2nd ed., ch. 14; from memory.",
    ),
    (
        "Closing 0.1",
        0.1,
        "Stomata partly closed by drought, dry air or heat. Order of magnitude from Campbell & Norman 1998, ch. 14; from memory.",
    ),
    (
        "Closed 0.01",
        0.01,
        "Stomata shut; little more than the cuticle lets through. Order of magnitude from Campbell & Norman 1998, ch. 14; from memory.",
    ),
];

/// State of the inputs panel (which groups are open is kept by egui itself).
#[derive(Debug, Clone, Default)]
pub struct InputsPanel {}

const SAME: &str = "";

impl InputsPanel {
    /// Draws the inputs; returns an edit command when anything changed.
    pub fn ui(
        &mut self,
        ui: &mut Ui,
        doc: &ScenarioDocument,
        units: UnitSystem,
    ) -> Option<Command> {
        let mut d = doc.clone();
        ScrollArea::vertical()
            .id_salt("inputs-scroll")
            .auto_shrink([false, false])
            .show(ui, |ui| {
                ui.spacing_mut().slider_width = 118.0;
                scenario_group(ui, &mut d);
                air_group(ui, &mut d, units);
                movement_group(ui, &mut d, units);
                light_group(ui, &mut d, units);
                leaf_group(ui, &mut d, units);
                stomata_group(ui, &mut d, units);
                limit_group(ui, &mut d, units);
            });
        (d != *doc).then(|| Command::Edit(Box::new(d)))
    }
}

fn group(ui: &mut Ui, title: &str, add: impl FnOnce(&mut Ui)) {
    CollapsingHeader::new(RichText::new(title).strong())
        .default_open(true)
        .show(ui, add);
}

fn scenario_group(ui: &mut Ui, d: &mut ScenarioDocument) {
    CollapsingHeader::new(RichText::new("Scenario").strong())
        .default_open(false)
        .show(ui, |ui| {
            ui.horizontal(|ui| {
                field_label(
                    ui,
                    "Title",
                    "A short name for this situation; shown in the title bar.",
                );
                let r = ui.add(TextEdit::singleline(&mut d.title).desired_width(180.0));
                name_widget(ui, &r, "Title");
            });
            ui.label("Notes")
                .on_hover_text("The situation and the assumptions behind the inputs.");
            let r = ui.add(
                TextEdit::multiline(&mut d.notes)
                    .desired_rows(3)
                    .desired_width(f32::INFINITY),
            );
            name_widget(ui, &r, "Notes");
        });
}

fn air_group(ui: &mut Ui, d: &mut ScenarioDocument, units: UnitSystem) {
    group(ui, "Air", |ui| {
        number_field(
            ui,
            &Field {
                label: "Air temperature",
                quantity: Quantity::Temperature,
                range: AIR_TEMP_RANGE_C,
                slider: (0.0, 50.0),
                log: false,
                decimals: None,
                tooltip: "Dry-bulb temperature of the air around the leaf, measured shaded and ventilated at crop height. Greenhouses typically 15–35 °C. Default 25 °C (common practice, no source).",
            },
            &mut d.case.air.temp_c,
            units,
            |_| None,
        );
        let kind = HumidityKind::of(d.case.air.humidity);
        ui.horizontal(|ui| {
            field_label(
                ui,
                "Humidity given as",
                "Give the humidity of the air as relative humidity, dew point or vapour-pressure deficit (VPD); switching keeps the same moisture content.",
            );
            let mut chosen = kind;
            let r = ComboBox::from_id_salt("humidity-kind")
                .selected_text(kind.label())
                .show_ui(ui, |ui| {
                    for k in [
                        HumidityKind::Relative,
                        HumidityKind::DewPoint,
                        HumidityKind::Deficit,
                    ] {
                        ui.selectable_value(&mut chosen, k, k.label());
                    }
                });
            name_widget(ui, &r.response, "Humidity given as");
            if chosen != kind {
                d.convert_humidity(chosen);
            }
        });
        let t_air = d.case.air.temp_c;
        let humidity_error = |h: Humidity| {
            h.vapour_pressure_kpa(t_air.clamp(AIR_TEMP_RANGE_C.min, AIR_TEMP_RANGE_C.max))
                .err()
                .map(|e| e.to_string())
        };
        match &mut d.case.air.humidity {
            Humidity::RelativePct(rh) => {
                number_field(
                    ui,
                    &Field {
                        label: "Relative humidity",
                        quantity: Quantity::Same("%"),
                        range: RELATIVE_HUMIDITY_RANGE_PCT,
                        slider: (0.0, 100.0),
                        log: false,
                        decimals: Some(0),
                        tooltip: "Water vapour in the air as a percentage of saturation at the air temperature. Greenhouses 50–90 %, hot dry field air 10–30 %. Default 60 % (common practice, no source).",
                    },
                    rh,
                    units,
                    |_| None,
                );
            }
            Humidity::DewPointC(dew) => {
                number_field(
                    ui,
                    &Field {
                        label: "Dew point",
                        quantity: Quantity::Temperature,
                        range: ValidRange {
                            quantity: "dew point",
                            ..AIR_TEMP_RANGE_C
                        },
                        slider: (-10.0, 35.0),
                        log: false,
                        decimals: None,
                        tooltip: "Temperature at which the air would start to condense; it cannot exceed the air temperature. Typically 5–25 °C.",
                    },
                    dew,
                    units,
                    |v| humidity_error(Humidity::DewPointC(v)),
                );
            }
            Humidity::DeficitKpa(vpd) => {
                number_field(
                    ui,
                    &Field {
                        label: "Vapour-pressure deficit",
                        quantity: Quantity::Same("kPa"),
                        // The upper end depends on the air temperature; the engine checks it
                        // (below) and names the limit for the current air.
                        range: ValidRange {
                            quantity: "vapour-pressure deficit",
                            min: 0.0,
                            max: 20.0,
                            unit: "kPa",
                        },
                        slider: (0.0, 5.0),
                        log: false,
                        decimals: Some(2),
                        tooltip: "How far the air is from saturation (VPD), the growers' humidity measure. Greenhouse targets 0.5–1.2 kPa; hot dry wind 3–6 kPa. Must lie between 0 and the saturation pressure at the air temperature.",
                    },
                    vpd,
                    units,
                    |v| humidity_error(Humidity::DeficitKpa(v)),
                );
            }
        }
        ui.horizontal(|ui| {
            field_label(
                ui,
                "Air pressure from",
                "Give the atmospheric pressure directly, or the site altitude (converted with the standard-atmosphere formula of FAO Irrigation and Drainage Paper 56, eq. 7).",
            );
            let mut by_altitude = d.altitude_m.is_some();
            ui.radio_value(&mut by_altitude, false, "pressure");
            ui.radio_value(&mut by_altitude, true, "altitude");
            if by_altitude != d.altitude_m.is_some() {
                d.altitude_m = by_altitude.then_some(0.0);
            }
        });
        if let Some(z) = &mut d.altitude_m {
            number_field(
                ui,
                &Field {
                    label: "Site altitude",
                    quantity: Quantity::Altitude,
                    range: ALTITUDE_RANGE_M,
                    slider: (0.0, 3000.0),
                    log: false,
                    decimals: None,
                    tooltip: "Height of the site above sea level; sets the air pressure (FAO-56 eq. 7). Default 0 m.",
                },
                z,
                units,
                |_| None,
            );
            d.apply_altitude();
            ui.horizontal(|ui| {
                ui.add_space(crate::gui::fields::LABEL_WIDTH + 8.0);
                ui.label(
                    RichText::new(format!(
                        "= {}",
                        Quantity::Pressure.format(d.case.air.pressure_kpa, units)
                    ))
                    .weak(),
                );
            });
        } else {
            number_field(
                ui,
                &Field {
                    label: "Air pressure",
                    quantity: Quantity::Pressure,
                    range: PRESSURE_RANGE_KPA,
                    slider: (70.0, 105.0),
                    log: false,
                    decimals: None,
                    tooltip: "Atmospheric pressure at the site. Sea level 101.3 kPa; 1500 m about 85 kPa. Default: the standard atmosphere at sea level, 101.325 kPa.",
                },
                &mut d.case.air.pressure_kpa,
                units,
                |_| None,
            );
        }
    });
}

fn movement_group(ui: &mut Ui, d: &mut ScenarioDocument, units: UnitSystem) {
    group(ui, "Air movement", |ui| {
        number_field(
            ui,
            &Field {
                label: "Air speed over the leaf",
                quantity: Quantity::Speed,
                range: AIR_SPEED_RANGE_M_S,
                slider: (0.0, 5.0),
                log: false,
                decimals: None,
                tooltip: "Mean air speed past the leaf, free stream. Still greenhouse air 0.05–0.2 m/s; horizontal airflow fans aim for 0.3–1 m/s in the crop; field wind 1–5 m/s. Default 0.5 m/s.",
            },
            &mut d.case.air.speed_m_s,
            units,
            |_| None,
        );
        number_field(
            ui,
            &Field {
                label: "Turbulence factor",
                quantity: Quantity::Same(SAME),
                range: TURBULENCE_FACTOR_RANGE,
                slider: (1.0, 2.5),
                log: false,
                decimals: Some(2),
                tooltip: "How much gusty, turbulent air raises heat transfer above the smooth wind-tunnel value. 1.0 for smooth laboratory flow; 1.4 outdoors (Campbell & Norman 1998, ch. 7; value from memory), the default; 1–2.5 in the literature reviewed by Schuepp.",
            },
            &mut d.case.air.turbulence_factor,
            units,
            |_| None,
        );
        number_field(
            ui,
            &Field {
                label: "Transition Reynolds no.",
                quantity: Quantity::Same(SAME),
                range: CRITICAL_REYNOLDS_RANGE,
                slider: (1.0e5, 3.0e6),
                log: true,
                decimals: Some(0),
                tooltip: "Reynolds number at which the boundary layer turns turbulent. 5 × 10⁵ is the textbook flat-plate value (Incropera et al. 2007, Fundamentals of Heat and Mass Transfer, 6th ed., §7.2), the default; 10⁵ to 3 × 10⁶ depending on roughness and turbulence. Leaves rarely reach it.",
            },
            &mut d.case.critical_reynolds,
            units,
            |_| None,
        );
    });
}

fn light_group(ui: &mut Ui, d: &mut ScenarioDocument, units: UnitSystem) {
    group(ui, "Light and surroundings", |ui| {
        let s = &mut d.case.surroundings;
        number_field(
            ui,
            &Field {
                label: "Sun on the leaf",
                quantity: Quantity::Same("W/m²"),
                range: SHORTWAVE_RANGE_W_M2,
                slider: (0.0, 1100.0),
                log: false,
                decimals: Some(0),
                tooltip: "Solar (shortwave) irradiance on the upper face, direct plus diffuse. Full summer sun about 900–1000 W/m²; under greenhouse glass 40–70 % of that; shade net less. Default 500 W/m².",
            },
            &mut s.shortwave_w_m2,
            units,
            |_| None,
        );
        #[derive(PartialEq, Clone, Copy)]
        enum View {
            Clear,
            Sky,
            Cover,
        }
        let current = match s.upper_view {
            UpperView::ClearSky => View::Clear,
            UpperView::SkyTempC(_) => View::Sky,
            UpperView::CoverTempC(_) => View::Cover,
        };
        let name = |k: View| match k {
            View::Clear => "Clear sky",
            View::Sky => "Sky temperature",
            View::Cover => "Greenhouse cover",
        };
        ui.horizontal(|ui| {
            field_label(
                ui,
                "Above the leaf",
                "What the upper face exchanges longwave (heat) radiation with: an open clear sky (its temperature estimated from the air by Brutsaert 1975), a sky of known temperature (cloud, measured with an infrared thermometer), or a greenhouse cover at its own temperature.",
            );
            let mut chosen = current;
            let r = ComboBox::from_id_salt("upper-view")
                .selected_text(name(current))
                .show_ui(ui, |ui| {
                    for k in [View::Clear, View::Sky, View::Cover] {
                        ui.selectable_value(&mut chosen, k, name(k));
                    }
                });
            name_widget(ui, &r.response, "Above the leaf");
            if chosen != current {
                let t = d.case.air.temp_c;
                s.upper_view = match chosen {
                    View::Clear => UpperView::ClearSky,
                    View::Sky => UpperView::SkyTempC(t - 20.0),
                    View::Cover => UpperView::CoverTempC(t + 3.0),
                };
            }
        });
        match &mut s.upper_view {
            UpperView::ClearSky => {}
            UpperView::SkyTempC(t) => {
                number_field(
                    ui,
                    &Field {
                        label: "Sky temperature",
                        quantity: Quantity::Temperature,
                        range: ValidRange {
                            quantity: "sky temperature",
                            ..SURFACE_TEMP_RANGE_C
                        },
                        slider: (-40.0, 40.0),
                        log: false,
                        decimals: None,
                        tooltip: "Effective radiant temperature of the sky. A clear sky is 10–30 K colder than the air; overcast close to the air temperature.",
                    },
                    t,
                    units,
                    |_| None,
                );
            }
            UpperView::CoverTempC(t) => {
                number_field(
                    ui,
                    &Field {
                        label: "Cover temperature",
                        quantity: Quantity::Temperature,
                        range: ValidRange {
                            quantity: "cover temperature",
                            ..SURFACE_TEMP_RANGE_C
                        },
                        slider: (-10.0, 60.0),
                        log: false,
                        decimals: None,
                        tooltip: "Temperature of the glass or film above, treated as a black longwave emitter. In sun it runs a few kelvin above the inside air; on cold nights below it.",
                    },
                    t,
                    units,
                    |_| None,
                );
            }
        }
        number_field(
            ui,
            &Field {
                label: "Ground albedo",
                quantity: Quantity::Same(SAME),
                range: ALBEDO_RANGE,
                slider: (0.0, 0.9),
                log: false,
                decimals: Some(2),
                tooltip: "Share of sunlight the floor or ground reflects onto the leaf's lower face. Dark soil 0.1, grass 0.23 (the FAO-56 reference surface, eq. 38, the default), white floor film 0.5–0.8.",
            },
            &mut s.ground_albedo,
            units,
            |_| None,
        );
        ui.horizontal(|ui| {
            field_label(
                ui,
                "Ground temperature",
                "Temperature of the floor or soil below the leaf, which the lower face sees for longwave radiation. Off: the same as the air.",
            );
            let mut own = s.ground_temp_c.is_some();
            if ui.checkbox(&mut own, "set its own").changed() {
                s.ground_temp_c = own.then_some(d.case.air.temp_c);
            }
        });
        if let Some(t) = &mut s.ground_temp_c {
            number_field(
                ui,
                &Field {
                    label: "Ground surface",
                    quantity: Quantity::Temperature,
                    range: ValidRange {
                        quantity: "ground temperature",
                        ..SURFACE_TEMP_RANGE_C
                    },
                    slider: (0.0, 70.0),
                    log: false,
                    decimals: None,
                    tooltip: "Surface temperature of the ground or floor. Sunlit bare soil can reach 50–65 °C; wet floors stay near the air.",
                },
                t,
                units,
                |_| None,
            );
        }
    });
}

fn leaf_group(ui: &mut Ui, d: &mut ScenarioDocument, units: UnitSystem) {
    group(ui, "Leaf", |ui| {
        let l = &mut d.case.leaf;
        let size_before = l.dimension_m;
        number_field(
            ui,
            &Field {
                label: "Leaf size along the wind",
                quantity: Quantity::LeafSize,
                range: LEAF_DIMENSION_RANGE_M,
                slider: (0.003, 0.5),
                log: true,
                decimals: None,
                tooltip: "Characteristic dimension: the leaf's width in the direction the air flows (for lobed or compound leaves, a leaflet). Seedlings 5–20 mm, tomato leaflets 30–70 mm, large foliage 100–300 mm. Default 50 mm (common practice, no source).",
            },
            &mut l.dimension_m,
            units,
            |_| None,
        );
        // A size typed here no longer belongs to the outline measured on the Leaf shape tab: drop
        // its free-convection length (A/P) so the leaf is again taken as square (d/4).
        if l.dimension_m != size_before {
            l.free_convection_length_m = None;
        }
        number_field(
            ui,
            &Field {
                label: "Sunlight absorbed",
                quantity: Quantity::Same(SAME),
                range: ABSORPTIVITY_RANGE,
                slider: (0.2, 0.9),
                log: false,
                decimals: Some(2),
                tooltip: "Shortwave absorptivity: share of the whole solar spectrum the leaf absorbs. Green leaves about 0.5 (Campbell & Norman 1998, ch. 11; from memory), the default; pale or hairy leaves less.",
            },
            &mut l.absorptivity,
            units,
            |_| None,
        );
        number_field(
            ui,
            &Field {
                label: "Longwave emissivity",
                quantity: Quantity::Same(SAME),
                range: EMISSIVITY_RANGE,
                slider: (0.9, 1.0),
                log: false,
                decimals: Some(2),
                tooltip: "How well the leaf emits (and absorbs) heat radiation. Leaves 0.94–0.99 (Campbell & Norman 1998, Table 11.3; from memory); default 0.97.",
            },
            &mut l.emissivity,
            units,
            |_| None,
        );
    });
}

fn stomata_group(ui: &mut Ui, d: &mut ScenarioDocument, units: UnitSystem) {
    group(ui, "Stomata", |ui| {
        let l = &mut d.case.leaf;
        number_field(
            ui,
            &Field {
                label: "Stomatal conductance",
                quantity: Quantity::Same("mol/m²/s"),
                range: STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S,
                slider: (0.005, 1.0),
                log: true,
                decimals: Some(3),
                tooltip: "How open the stomata are: total conductance to water vapour of both faces. Well-watered crops in light 0.2–0.8 mol/m²/s; closing 0.05–0.1; closed below 0.02. Default 0.3 (Campbell & Norman 1998, ch. 14; from memory).",
            },
            &mut l.stomatal_conductance_mol_m2_s,
            units,
            |_| None,
        );
        ui.horizontal_wrapped(|ui| {
            ui.label("Presets:")
                .on_hover_text("Typical stomatal conductances; hover each for its source.");
            for (label, g, source) in STOMATAL_PRESETS {
                if ui.small_button(label).on_hover_text(source).clicked() {
                    l.stomatal_conductance_mol_m2_s = g;
                }
            }
        });
        number_field(
            ui,
            &Field {
                label: "Lower-face share",
                quantity: Quantity::Same(SAME),
                range: LOWER_SHARE_RANGE,
                slider: (0.0, 1.0),
                log: false,
                decimals: Some(2),
                tooltip: "Share of the stomatal conductance on the underside. 1.0 when all stomata are underneath (many broadleaf trees; Campbell & Norman 1998, ch. 14), the default; 0.5–0.8 for leaves with stomata on both faces, as many herbaceous crops.",
            },
            &mut l.lower_share,
            units,
            |_| None,
        );
        number_field(
            ui,
            &Field {
                label: "Cuticular conductance",
                quantity: Quantity::Same("mol/m²/s"),
                range: CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S,
                slider: (0.0, 0.05),
                log: false,
                decimals: Some(3),
                tooltip: "Water loss through the leaf's waxy skin with the stomata shut, both faces. Of the order of mmol/m²/s; default 0.005 (Kerstiens 1996, J. Exp. Bot. 47; from memory).",
            },
            &mut l.cuticular_conductance_mol_m2_s,
            units,
            |_| None,
        );
    });
}

fn limit_group(ui: &mut Ui, d: &mut ScenarioDocument, units: UnitSystem) {
    group(ui, "Crop heat limit", |ui| {
        number_field(
            ui,
            &Field {
                label: "Leaf temperature limit",
                quantity: Quantity::Temperature,
                range: LIMIT_RANGE_C,
                slider: (20.0, 50.0),
                log: false,
                decimals: None,
                tooltip: "The leaf temperature your crop should not exceed (ask your agronomist; it depends on crop, stage and duration). Default 35 °C, a round figure for heat-sensitive warm-season crops (common practice, no source).",
            },
            &mut d.heat_limit_c,
            units,
            |_| None,
        );
        number_field(
            ui,
            &Field {
                label: "Safety margin",
                quantity: Quantity::TempDiff,
                range: MARGIN_RANGE_K,
                slider: (0.0, 10.0),
                log: false,
                decimals: None,
                tooltip: "How far below the limit you want the leaf to stay, for sensor error, gusts of sun and leaves that see more sun than average. Default 2 K (common practice, no source).",
            },
            &mut d.margin_k,
            units,
            |_| None,
        );
    });
}

//! Window tests of the inputs: a field changed by its accessible label changes the result; every
//! numeric input at its minimum, maximum and an invalid value gives no panic, no "NaN" or "inf"
//! on screen, and a visible error in words; the unsaved marker appears after an edit.

use crate::support::{assert_no_non_finite, harness, has_text, non_finite_texts, set_slider};
use egui::accesskit::Role;
use egui_kittest::kittest::Queryable;
use leafwind_app::document::ScenarioDocument;
use leafwind_app::gui::commands::Command;
use leafwind_physics::air::saturation_vapour_pressure_kpa;
use leafwind_physics::{Humidity, UpperView};

#[test]
fn air_temperature_by_its_label_changes_the_leaf_result() {
    let mut h = harness(ScenarioDocument::default());
    let before = h.state().result().unwrap().solution.leaf_temp_c;
    set_slider(&mut h, "Air temperature", 35.0);
    let r = h.state().result().unwrap();
    assert!((h.state().document().case.air.temp_c - 35.0).abs() < 1e-9);
    // A 10 K warmer air warms the leaf by several kelvin (common practice, no source: the leaf
    // follows the air to within its radiation and transpiration offset).
    assert!(
        r.solution.leaf_temp_c > before + 5.0,
        "{before} → {}",
        r.solution.leaf_temp_c
    );
    // The new temperature is on screen.
    assert!(has_text(&h, &format!("{:.1} °C", r.solution.leaf_temp_c)));
}

#[test]
fn air_speed_changes_the_sweep_point_and_the_answer() {
    let mut h = harness(ScenarioDocument::default());
    set_slider(&mut h, "Air speed over the leaf", 2.0);
    let r = h.state().result().unwrap();
    assert!((r.case.air.speed_m_s - 2.0).abs() < 1e-9);
    assert!(has_text(&h, "air speed") || has_text(&h, "air movement"));
    assert!(h.state().results_current());
}

/// (label, min, max, an invalid value) in the units shown (SI: °C, %, kPa, m/s, mm, W/m², …).
fn fields(doc: &ScenarioDocument) -> Vec<(&'static str, f64, f64, f64)> {
    let es = saturation_vapour_pressure_kpa(doc.case.air.temp_c);
    let mut v = vec![
        ("Air temperature", -30.0, 60.0, 75.0),
        ("Air speed over the leaf", 0.0, 30.0, -1.0),
        ("Turbulence factor", 1.0, 2.5, 3.0),
        ("Transition Reynolds no.", 1.0e5, 3.0e6, 5.0e7),
        ("Sun on the leaf", 0.0, 1400.0, 2000.0),
        ("Ground albedo", 0.0, 1.0, 1.5),
        ("Leaf size along the wind", 1.0, 1000.0, 0.1),
        ("Sunlight absorbed", 0.0, 1.0, -0.2),
        ("Longwave emissivity", 0.5, 1.0, 0.2),
        ("Stomatal conductance", 0.0, 1.5, 2.0),
        ("Lower-face share", 0.0, 1.0, 1.2),
        ("Cuticular conductance", 0.0, 0.05, 0.5),
        ("Leaf temperature limit", -20.0, 70.0, 90.0),
        ("Safety margin", 0.0, 20.0, 25.0),
    ];
    match doc.case.air.humidity {
        Humidity::RelativePct(_) => v.push(("Relative humidity", 0.0, 100.0, 120.0)),
        Humidity::DewPointC(_) => v.push((
            "Dew point",
            -30.0,
            doc.case.air.temp_c,
            doc.case.air.temp_c + 5.0,
        )),
        Humidity::DeficitKpa(_) => v.push(("Vapour-pressure deficit", 0.0, es, es + 1.0)),
    }
    if doc.altitude_m.is_some() {
        v.push(("Site altitude", -500.0, 5500.0, 7000.0));
    } else {
        v.push(("Air pressure", 50.0, 110.0, 30.0));
    }
    match doc.case.surroundings.upper_view {
        UpperView::ClearSky => {}
        UpperView::SkyTempC(_) => v.push(("Sky temperature", -80.0, 80.0, 100.0)),
        UpperView::CoverTempC(_) => v.push(("Cover temperature", -80.0, 80.0, 100.0)),
    }
    if doc.case.surroundings.ground_temp_c.is_some() {
        v.push(("Ground surface", -80.0, 80.0, 100.0));
    }
    v
}

fn drive_every_field(doc: ScenarioDocument) {
    let mut h = harness(doc.clone());
    for (label, min, max, invalid) in fields(&doc) {
        let original = h.state().document().clone();
        for value in [min, max] {
            set_slider(&mut h, label, value);
            assert!(
                non_finite_texts(&h).is_empty(),
                "{label} = {value}: {:?}",
                non_finite_texts(&h)
            );
            assert!(h.state().result().is_some(), "{label} = {value}");
        }
        set_slider(&mut h, label, invalid);
        assert!(
            non_finite_texts(&h).is_empty(),
            "{label} invalid: {:?}",
            non_finite_texts(&h)
        );
        assert!(
            has_text(&h, "outside the valid range"),
            "{label} = {invalid} shows no error"
        );
        assert!(h.state().input_error().is_some(), "{label} = {invalid}");
        // The last valid result stays on screen, marked.
        assert!(h.state().result().is_some());
        assert!(has_text(&h, "Showing the last valid result"));
        // Back to a valid document for the next field.
        h.state_mut()
            .push_command(Command::Edit(Box::new(original)));
        h.run();
        assert!(
            h.state().input_error().is_none(),
            "{label}: {:?}",
            h.state().input_error()
        );
    }
}

#[test]
fn every_numeric_input_at_min_max_and_invalid_default_document() {
    drive_every_field(ScenarioDocument::default());
}

#[test]
fn every_numeric_input_at_min_max_and_invalid_other_forms() {
    let mut doc = ScenarioDocument::default();
    doc.case.air.humidity = Humidity::DewPointC(15.0);
    doc.altitude_m = Some(500.0);
    doc.apply_altitude();
    doc.case.surroundings.upper_view = UpperView::CoverTempC(30.0);
    doc.case.surroundings.ground_temp_c = Some(28.0);
    drive_every_field(doc.clone());
    doc.case.air.humidity = Humidity::DeficitKpa(1.2);
    doc.case.surroundings.upper_view = UpperView::SkyTempC(5.0);
    drive_every_field(doc);
}

#[test]
fn not_a_number_is_refused_and_never_shown() {
    let mut h = harness(ScenarioDocument::default());
    let before = h.state().document().case.air.temp_c;
    set_slider(&mut h, "Air temperature", f64::NAN);
    set_slider(&mut h, "Sun on the leaf", f64::INFINITY);
    assert_no_non_finite(&h);
    assert!(h.state().document().case.air.temp_c.is_finite());
    assert!((h.state().document().case.air.temp_c - before).abs() < 1e-9);
    assert!(
        h.state()
            .document()
            .case
            .surroundings
            .shortwave_w_m2
            .is_finite()
    );
}

#[test]
fn unsaved_marker_appears_after_an_edit() {
    let mut h = harness(ScenarioDocument::default());
    assert!(!h.state().title().starts_with('*'));
    assert!(!h.state().is_dirty());
    set_slider(&mut h, "Sun on the leaf", 800.0);
    assert!(h.state().is_dirty());
    assert!(h.state().title().starts_with('*'), "{}", h.state().title());
    assert!(has_text(&h, "*Untitled scenario"));
}

#[test]
fn stomatal_preset_sets_the_conductance() {
    let mut h = harness(ScenarioDocument::default());
    h.get_by_label("Closed 0.01").click();
    h.run();
    let g = h.state().document().case.leaf.stomatal_conductance_mol_m2_s;
    assert!((g - 0.01).abs() < 1e-12);
}

#[test]
fn imperial_units_reach_fields_and_results() {
    let mut h = harness(ScenarioDocument::default());
    h.state_mut().push_command(Command::ToggleUnits);
    h.run();
    assert!(has_text(&h, "°F"));
    // 25 °C air shown as 77.0 °F.
    assert!(has_text(&h, "77.0 °F"));
    // A slider in ft/min: 1 m/s = 196.85 ft/min, set 197 ft/min.
    set_slider(&mut h, "Air speed over the leaf", 196.850_393_7);
    // The slider keeps one decimal of ft/min (0.1 ft/min = 0.0005 m/s).
    assert!((h.state().document().case.air.speed_m_s - 1.0).abs() < 1e-3);
    assert!(non_finite_texts(&h).is_empty());
    let _ = h.get_by_role_and_label(Role::Slider, "Leaf size along the wind");
}

#[test]
fn editing_the_title_shows_in_the_title_bar_with_the_marker() {
    let mut h = harness(ScenarioDocument::default());
    h.get_by_label("Scenario").click();
    h.run();
    h.get_by_role_and_label(Role::TextInput, "Title").focus();
    h.run();
    h.get_by_role_and_label(Role::TextInput, "Title")
        .type_text(" B");
    h.run();
    assert_eq!(h.state().document().title, "Untitled scenario B");
    assert!(h.state().title().starts_with("*Untitled scenario B"));
    assert!(non_finite_texts(&h).is_empty());
}

//! Window tests of the "Canopy & day" and "Fans & night" tabs: the glasshouse example shows the
//! hottest leaf and every answer without "NaN"; "Add … section" adds a section as an unsaved edit;
//! an input changed by its label changes the result; an invalid input shows a field error in words
//! and the last valid result stays; the plots' data export as CSV.

use egui::accesskit::Role;

use crate::support::{assert_no_non_finite, harness, has_text, non_finite_texts, set_slider};
use egui_kittest::kittest::{NodeT as _, Queryable};
use leafwind_app::document::{ScenarioDocument, first_example};
use leafwind_app::gui::commands::Command;
use leafwind_app::gui::prefs::PlotTab;

/// The glasshouse example (the first shipped example) has both sections.
fn glasshouse() -> ScenarioDocument {
    let d = first_example();
    assert!(d.canopy.is_some() && d.fans.is_some());
    d
}

fn hottest_c(h: &egui_kittest::Harness<'_, leafwind_app::gui::LeafwindApp>) -> f64 {
    h.state()
        .canopy_run()
        .expect("a canopy result")
        .canopy
        .hottest
        .leaf_temp_c
}

#[test]
fn canopy_tab_shows_the_hottest_leaf_and_the_answers_without_nan() {
    let mut h = harness(glasshouse());
    h.state_mut().set_tab(PlotTab::Canopy);
    h.run();
    assert!(h.state().canopy_run().is_some());
    assert!(has_text(&h, "Hottest leaf:"));
    assert!(has_text(&h, "Least canopy-top air speed"));
    assert!(has_text(&h, "Least shade"));
    assert!(has_text(&h, "Hours over the limit"));
    assert!(has_text(&h, "Degree-hours over the limit"));
    // Under cover with a design day: the dew hours and the options compared, the coolest marked.
    assert!(has_text(&h, "Night dew over the design day"));
    assert!(has_text(&h, "Cooling and shading options compared"));
    assert!(has_text(&h, "(coolest)"));
    assert_no_non_finite(&h);
    // Imperial: temperatures in °F and the air speed also in ft/min.
    h.state_mut().push_command(Command::ToggleUnits);
    h.run();
    assert!(has_text(&h, "ft/min"));
    assert!(has_text(&h, "°F"));
    assert_no_non_finite(&h);
}

#[test]
fn fans_tab_shows_the_estimate_the_answers_and_the_caution_without_nan() {
    let mut h = harness(glasshouse());
    h.state_mut().set_tab(PlotTab::Fans);
    h.run();
    assert!(has_text(&h, "Section along the house, to scale"));
    assert!(h.state().fans_run().is_some());
    assert!(has_text(&h, "Slowest canopy-top air speed"));
    assert!(has_text(&h, "verify with an anemometer"));
    assert!(has_text(&h, "Rules of thumb (common practice"));
    assert!(has_text(&h, "For a target of"));
    assert!(has_text(&h, "Where more air stops helping"));
    assert!(has_text(&h, "Fan power"));
    assert!(has_text(&h, "leaf − dew point"));
    assert!(has_text(&h, "Least air speed against dew"));
    assert!(has_text(&h, "licensed electricians"));
    assert_no_non_finite(&h);
    h.state_mut().push_command(Command::ToggleUnits);
    h.run();
    assert!(has_text(&h, "cfm"));
    assert!(has_text(&h, "ft/min"));
    assert_no_non_finite(&h);
}

#[test]
fn add_a_canopy_section_marks_the_document_unsaved_and_solves_it() {
    let mut h = harness(ScenarioDocument::default());
    h.state_mut().set_tab(PlotTab::Canopy);
    h.run();
    assert!(!h.state().is_dirty());
    h.get_by_label("Add a canopy (crop) section").click();
    h.run();
    assert!(h.state().document().canopy.is_some());
    assert!(h.state().is_dirty());
    assert!(h.state().title().starts_with('*'));
    assert!(h.state().canopy_run().is_some());
    assert!(has_text(&h, "Hottest leaf:"));
    assert_no_non_finite(&h);
}

#[test]
fn add_a_fans_section_marks_the_document_unsaved_and_solves_it() {
    let mut h = harness(ScenarioDocument::default());
    h.state_mut().set_tab(PlotTab::Fans);
    h.run();
    h.get_by_label("Add a fans section").click();
    h.run();
    assert!(h.state().document().fans.is_some());
    assert!(h.state().is_dirty());
    assert!(h.state().fans_run().is_some());
    assert!(has_text(&h, "Slowest canopy-top air speed"));
    assert_no_non_finite(&h);
}

#[test]
fn shade_fraction_by_its_label_cools_the_hottest_leaf() {
    let mut h = harness(glasshouse());
    h.state_mut().set_tab(PlotTab::Canopy);
    h.run();
    let before = hottest_c(&h);
    set_slider(&mut h, "Shade fraction", 60.0);
    let g = h
        .state()
        .document()
        .canopy
        .as_ref()
        .unwrap()
        .greenhouse
        .unwrap();
    assert!((g.shade_fraction - 0.6).abs() < 1e-9);
    let after = hottest_c(&h);
    // Holding back 60 % of the light cools the sunlit leaves (common practice, no source: less
    // absorbed radiation, same air).
    assert!(after < before - 0.3, "{before} → {after}");
    assert!(h.state().is_dirty());
}

#[test]
fn fewer_fans_by_their_label_slow_the_canopy_air() {
    let mut h = harness(glasshouse());
    h.state_mut().set_tab(PlotTab::Fans);
    h.run();
    let before = h.state().fans_run().unwrap().energy.power_w;
    set_slider(&mut h, "Fans per row", 2.0);
    assert_eq!(
        h.state()
            .document()
            .fans
            .as_ref()
            .unwrap()
            .layout
            .fans_per_row,
        2
    );
    let after = h.state().fans_run().unwrap().energy.power_w;
    // Half the fans, half the power (P = n Q₀ / efficacy).
    assert!(
        (after - 0.5 * before).abs() < 1e-6 * before,
        "{before} → {after}"
    );
}

#[test]
fn an_invalid_canopy_input_shows_its_error_and_keeps_the_last_result() {
    let mut h = harness(glasshouse());
    h.state_mut().set_tab(PlotTab::Canopy);
    h.run();
    let before = hottest_c(&h);
    set_slider(&mut h, "Leaf area index", 20.0);
    assert!(has_text(&h, "outside the valid range"), "no field error");
    assert!(has_text(&h, "Could not update"));
    assert_eq!(hottest_c(&h), before);
    assert!(has_text(&h, "Hottest leaf:"));
    assert_no_non_finite(&h);
}

#[test]
fn an_invalid_fan_input_shows_its_error_and_keeps_the_last_result() {
    let mut h = harness(glasshouse());
    h.state_mut().set_tab(PlotTab::Fans);
    h.run();
    let before = h.state().fans_run().unwrap().energy.power_w;
    set_slider(&mut h, "Mounting height", 50.0);
    assert!(has_text(&h, "outside the valid range"), "no field error");
    assert!(has_text(&h, "Could not update"));
    assert_eq!(h.state().fans_run().unwrap().energy.power_w, before);
    assert!(has_text(&h, "Slowest canopy-top air speed"));
    assert_no_non_finite(&h);
}

/// Exports a plot's data through its "Export … CSV…" button with the suggested path (beside the
/// scenario file) and returns the text written.
fn export_beside_the_scenario(tab: PlotTab, button: &str, file: &str) -> String {
    let dir = std::env::temp_dir().join(format!(
        "leafwind-canopy-fans-{}-{}",
        std::process::id(),
        file.replace('.', "-")
    ));
    std::fs::create_dir_all(&dir).unwrap();
    let scenario = dir.join("glasshouse.ron");
    glasshouse().save(&scenario).unwrap();
    let mut h = harness(ScenarioDocument::default());
    h.state_mut().push_command(Command::OpenPath(scenario));
    h.run();
    h.state_mut().set_tab(tab);
    h.run();
    h.get_by_label(button).click();
    h.run();
    h.get_by_label("Export").click();
    h.run();
    let written = dir.join(file);
    assert!(
        has_text(&h, "Exported"),
        "no export message: {:?}",
        h.query_all_by_label_contains("xport")
            .map(|n| format!("{:?}", n.accesskit_node().label()))
            .collect::<Vec<_>>()
    );
    let text = std::fs::read_to_string(&written).unwrap();
    std::fs::remove_dir_all(&dir).ok();
    assert!(!text.contains("NaN") && !text.contains("inf"), "{text}");
    text
}

#[test]
fn canopy_profile_and_day_export_as_csv_with_units() {
    let t = export_beside_the_scenario(
        PlotTab::Canopy,
        "Export profile CSV…",
        "leafwind-canopy-profile.csv",
    );
    assert!(
        t.lines().next().unwrap().contains("sunlit leaf [°C]"),
        "{t}"
    );
    // One row per layer (20 in the example) after the header.
    assert_eq!(t.lines().count(), 21);
    let t = export_beside_the_scenario(
        PlotTab::Canopy,
        "Export day CSV…",
        "leafwind-canopy-day.csv",
    );
    assert!(
        t.lines().next().unwrap().contains("hottest leaf [°C]"),
        "{t}"
    );
    assert_eq!(t.lines().count(), 25);
}

#[test]
fn fan_plan_and_air_speed_export_as_csv_with_units() {
    let t = export_beside_the_scenario(PlotTab::Fans, "Export plan CSV…", "leafwind-fans-plan.csv");
    // Eight fans in the example.
    assert_eq!(t.lines().count(), 9, "{t}");
    let t = export_beside_the_scenario(
        PlotTab::Fans,
        "Export air speed CSV…",
        "leafwind-fans-air-speed.csv",
    );
    assert!(
        t.lines()
            .next()
            .unwrap()
            .contains("canopy top typical [m/s]"),
        "{t}"
    );
}

#[test]
fn fan_airflow_is_typed_in_cfm_when_imperial() {
    let mut h = harness(glasshouse());
    h.state_mut().set_tab(PlotTab::Fans);
    h.state_mut().push_command(Command::ToggleUnits);
    h.run();
    assert!(has_text(&h, "cfm"));
    set_slider(&mut h, "Fan airflow rating", 2000.0);
    let q = h
        .state()
        .document()
        .fans
        .as_ref()
        .unwrap()
        .layout
        .fan
        .airflow_m3_s;
    // 1 cfm = 0.3048³/60 m³/s exactly (international foot).
    let expected = 2000.0 * 0.3048_f64.powi(3) / 60.0;
    assert!((q - expected).abs() < 1e-9, "{q} vs {expected}");
    assert_no_non_finite(&h);
}

/// The ventilated glasshouse: the least ventilation answer and the standard's factor method are
/// shown; in imperial units the rate is typed and read in cfm per ft² (8 cfm/ft² = 0.040 64 m³/s
/// per m², exact foot).
#[test]
fn ventilation_is_answered_and_typed_in_cfm_per_square_foot_when_imperial() {
    let mut doc = glasshouse();
    if let Some(g) = doc.canopy.as_mut().and_then(|c| c.greenhouse.as_mut()) {
        g.inside = leafwind_app::canopy_scenario::InsideMode::Ventilated { rate_m3_m2_s: 0.03 };
    }
    let mut h = harness(doc);
    h.state_mut().set_tab(PlotTab::Canopy);
    h.run();
    assert!(has_text(&h, "Least ventilation"));
    assert!(has_text(&h, "factor method"));
    assert!(has_text(&h, "m³/s per m²"));
    assert_no_non_finite(&h);
    h.state_mut().push_command(Command::ToggleUnits);
    h.run();
    assert!(has_text(&h, "cfm/ft²"));
    set_slider(&mut h, "Ventilation rate", 8.0);
    let rate = match h
        .state()
        .document()
        .canopy
        .as_ref()
        .and_then(|c| c.greenhouse.as_ref())
        .map(|g| g.inside)
    {
        Some(leafwind_app::canopy_scenario::InsideMode::Ventilated { rate_m3_m2_s }) => {
            rate_m3_m2_s
        }
        other => panic!("{other:?}"),
    };
    assert!((rate - 0.040_64).abs() < 1e-5, "{rate}");
    assert_no_non_finite(&h);
}

/// The glasshouse example's heat rules are stated over the design day; "Add a heat rule" adds one
/// as an unsaved edit, and its hours are set by their label.
#[test]
fn heat_rules_are_stated_added_and_edited_in_the_canopy_tab() {
    let mut h = harness(glasshouse());
    h.state_mut().set_tab(PlotTab::Canopy);
    h.run();
    let rules = |h: &egui_kittest::Harness<'_, leafwind_app::gui::LeafwindApp>| {
        h.state()
            .document()
            .canopy
            .as_ref()
            .map_or(0, |c| c.heat_rules.len())
    };
    let before = rules(&h);
    assert!(before >= 1, "the example has rules");
    assert!(has_text(&h, "Rule “"));
    assert!(has_text(&h, "over the design day") || has_text(&h, "the design day meets"));
    h.get_by_label("Add a heat rule").click();
    h.run();
    assert_eq!(rules(&h), before + 1);
    assert!(h.state().is_dirty());
    let last = h.query_all_by_label("Rule hours").count();
    assert_eq!(last, before + 1);
    h.query_all_by_label("Rule hours")
        .last()
        .unwrap()
        .set_value_accesskit(6.0);
    h.run();
    let hours = h.state().document().canopy.as_ref().unwrap().heat_rules[before].hours;
    assert_eq!(hours, 6);
    assert_no_non_finite(&h);
    // Imperial: the threshold is shown in °F.
    h.state_mut().push_command(Command::ToggleUnits);
    h.run();
    assert!(has_text(&h, "°F (air around the crop)") || has_text(&h, "°F (hottest leaf)"));
    assert_no_non_finite(&h);
}

#[test]
fn the_open_field_example_canopy_has_no_shade_answer_and_says_why() {
    let (_, text) = leafwind_app::document::EXAMPLES
        .iter()
        .find(|(name, _)| *name == "open_field_hot_wind.ron")
        .expect("the open-field example");
    let doc = ScenarioDocument::from_ron(text).unwrap();
    assert!(doc.canopy.as_ref().is_some_and(|c| c.greenhouse.is_none()));
    let mut h = harness(doc);
    h.state_mut().set_tab(PlotTab::Canopy);
    h.run();
    assert!(has_text(&h, "shade sizing needs a greenhouse"));
    assert!(has_text(&h, "Hottest leaf:"));
    assert_no_non_finite(&h);
}

#[test]
fn a_weather_file_typed_in_the_canopy_tab_is_run_hour_by_hour() {
    let dir = std::env::temp_dir().join(format!("leafwind-gui-weather-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("hours.csv");
    std::fs::write(
        &file,
        "time,air_temp_c,rh_pct,wind_m_s,shortwave_w_m2\n\
         2026-07-15 12:00,31,45,1.0,850\n\
         2026-07-15 13:00,32,bad,1.0,870\n\
         2026-07-15 14:00,33,40,1.2,820\n",
    )
    .unwrap();
    let mut h = harness(glasshouse());
    h.state_mut().set_tab(PlotTab::Canopy);
    h.run();
    h.get_by_label("Weather file").click();
    h.run();
    h.get_by_role_and_label(Role::TextInput, "Weather CSV")
        .focus();
    h.run();
    h.get_by_role_and_label(Role::TextInput, "Weather CSV")
        .type_text(&file.display().to_string());
    h.run();
    assert_eq!(
        h.state()
            .document()
            .canopy
            .as_ref()
            .unwrap()
            .weather_csv
            .as_deref(),
        Some(file.as_path())
    );
    let run = h.state().canopy_run().unwrap();
    let (series, rejected) = run.weather.as_ref().expect("the weather file was run");
    assert_eq!(series.hours.len(), 2);
    assert_eq!(rejected.len(), 1);
    assert!(non_finite_texts(&h).is_empty());
}

#[test]
fn own_crop_limits_are_added_in_the_canopy_tab_and_kept_in_the_scenario() {
    let mut h = harness(glasshouse());
    h.state_mut().set_tab(PlotTab::Canopy);
    h.run();
    h.get_by_label("Your own crop limits (0)").click();
    h.run();
    h.get_by_label("Add my own crop limit").click();
    h.run();
    let c = h.state().document().canopy.clone().unwrap();
    assert_eq!(c.own_limits.len(), 1);
    assert!(h.state().is_dirty());
    assert!(has_text(&h, "Your own crop limits (1)"));
    assert!(non_finite_texts(&h).is_empty());
}

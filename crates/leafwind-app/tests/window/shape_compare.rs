//! Window tests of the "Leaf shape" and "Compare" tabs: a lobed family's effective dimension lies
//! below its convex hull and the hand rule; "Use this leaf" sets the scenario's leaf and marks it
//! unsaved; an invalid parameter shows a field error; a malformed outline shows its row and keeps
//! the shape; compare copies of the scenario, see the best markers, export the table.

use std::path::PathBuf;

use crate::support::{assert_no_non_finite, harness, has_text, non_finite_texts, set_slider};
use egui::accesskit::Role;
use egui_kittest::kittest::Queryable;
use leafwind_app::document::ScenarioDocument;
use leafwind_app::gui::panels::compare::{
    Better, CompareEntry, CompareInput, CompareTable, best_flags, compute_compare, table_csv,
};
use leafwind_app::gui::prefs::PlotTab;
use leafwind_app::shape_scenario::ShapeFamily;
use leafwind_app::units::UnitSystem;

fn temp_path(name: &str) -> PathBuf {
    std::env::temp_dir().join(format!("leafwind-shape-test-{}-{name}", std::process::id()))
}

fn open_shape_tab() -> egui_kittest::Harness<'static, leafwind_app::gui::LeafwindApp> {
    let mut h = harness(ScenarioDocument::default());
    h.get_by_label(PlotTab::Shape.label()).click();
    h.run();
    h
}

fn pick_family(
    h: &mut egui_kittest::Harness<'static, leafwind_app::gui::LeafwindApp>,
    f: ShapeFamily,
) {
    h.get_by_role_and_label(Role::ComboBox, "Leaf family")
        .click();
    h.run();
    h.get_by_label(f.label()).click();
    h.run();
}

#[test]
fn lobed_leaf_is_below_its_hull_and_the_hand_rule_on_screen() {
    let mut h = open_shape_tab();
    assert!(h.state().shape_panel().report().is_some());
    pick_family(&mut h, ShapeFamily::Lobed);
    let r = h.state().shape_panel().report().unwrap();
    assert_eq!(r.section.family, ShapeFamily::Lobed);
    let d = r.metrics.effective_dimension_m;
    // Engine property (shape.rs `lobed_leaf_is_below_its_convex_hull`): each sinus restarts the
    // boundary layer, so the lobed leaf's d_eff is below its hull's; and here below 0.72 × width.
    assert!(d < r.hull_dimension_m.unwrap());
    assert!(d < r.metrics.hand_rule_dimension_m);
    assert!(has_text(&h, "below the hand rule"), "no comparison shown");
    assert!(has_text(&h, "below the convex hull"));
    assert!(has_text(&h, "Effective dimension d_eff"));
    assert_no_non_finite(&h);
}

#[test]
fn use_this_leaf_sets_the_scenario_leaf_and_marks_unsaved() {
    let mut h = open_shape_tab();
    pick_family(&mut h, ShapeFamily::Lobed);
    let before = h.state().document().case.leaf.dimension_m;
    let t_before = h.state().result().unwrap().solution.leaf_temp_c;
    assert!(!h.state().is_dirty());
    h.get_by_label("Use this leaf in the scenario").click();
    h.run();
    let r = h.state().shape_panel().report().unwrap().clone();
    let doc = h.state().document();
    assert!((doc.case.leaf.dimension_m - r.metrics.effective_dimension_m).abs() < 1e-15);
    assert!((doc.case.leaf.dimension_m - before).abs() > 1e-4);
    assert_eq!(
        doc.case.leaf.free_convection_length_m,
        Some(r.metrics.free_convection_length_m)
    );
    assert_eq!(doc.shape.as_ref(), Some(&r.section));
    assert!(h.state().is_dirty());
    assert!(h.state().title().starts_with('*'));
    // The leaf result follows the new size.
    let res = h.state().result().unwrap();
    assert!((res.case.leaf.dimension_m - r.metrics.effective_dimension_m).abs() < 1e-15);
    assert!((res.solution.leaf_temp_c - t_before).abs() > 1e-6);
    assert!(has_text(&h, "The scenario uses this leaf"));
    // The shape section survives a save and reopen.
    let text = doc.to_ron().unwrap();
    let back = ScenarioDocument::from_ron(&text).unwrap();
    assert_eq!(back.shape, doc.shape);
}

#[test]
fn an_invalid_parameter_shows_a_field_error_and_cannot_be_used() {
    let mut h = open_shape_tab();
    let doc_before = h.state().document().clone();
    let shown_before = h.state().shape_panel().report().unwrap().clone();
    // 5000 mm, beyond the engine's 2 m outline limit.
    set_slider(&mut h, "Blade length", 5000.0);
    assert!(has_text(&h, "outside the valid range"));
    assert!(has_text(&h, "Fix the marked field"));
    h.get_by_label("Use this leaf in the scenario").click();
    h.run();
    assert_eq!(h.state().document(), &doc_before);
    assert_eq!(h.state().shape_panel().report(), Some(&shown_before));
    assert_no_non_finite(&h);
}

#[test]
fn malformed_outline_shows_the_row_and_keeps_the_shape() {
    let mut h = open_shape_tab();
    let before = h.state().shape_panel().draft().clone();
    let p = temp_path("bad-outline.csv");
    std::fs::write(&p, "x_mm,y_mm\n0,0\n100,0\nabc,40\n0,40\n").unwrap();
    h.get_by_label("Import outline CSV…").click();
    h.run();
    // No dialog service in tests: the path field.
    h.get_by_role_and_label(Role::TextInput, "Outline file")
        .focus();
    h.run();
    h.get_by_role_and_label(Role::TextInput, "Outline file")
        .type_text(&p.display().to_string());
    h.run();
    h.get_by_label("Import").click();
    h.run();
    let e = h.state().shape_panel().import_error().unwrap().to_owned();
    assert!(e.contains("row 4"), "{e}");
    assert!(has_text(&h, "row 4"));
    assert_eq!(h.state().shape_panel().draft(), &before);
    std::fs::remove_file(p).ok();
}

#[test]
fn shipped_outline_imports_with_the_cli_numbers() {
    let mut h = open_shape_tab();
    let p =
        PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../../assets/outlines/deeply_lobed.csv");
    h.state_mut().shape_panel_mut().import_path(&p);
    h.run();
    let r = h.state().shape_panel().report().unwrap();
    assert_eq!(r.section.family, ShapeFamily::Imported);
    // `leafwind shape assets/outlines/deeply_lobed.csv` prints d_eff 0.0260611 m and A/P
    // 0.00874378 m at 0° (6 significant digits printed; cross-check of the same engine).
    assert!((r.metrics.effective_dimension_m - 0.026_061_1).abs() < 5e-8);
    assert!((r.metrics.free_convection_length_m - 0.008_743_78).abs() < 5e-9);
    assert!(r.chords_per_line_max >= 3);
    assert!(non_finite_texts(&h).is_empty());
}

#[test]
fn every_family_and_imperial_units_show_no_nan() {
    let mut h = open_shape_tab();
    for f in ShapeFamily::ALL {
        if f == ShapeFamily::Imported {
            continue;
        }
        pick_family(&mut h, f);
        assert_eq!(h.state().shape_panel().report().unwrap().section.family, f);
        assert!(
            non_finite_texts(&h).is_empty(),
            "{f:?}: {:?}",
            non_finite_texts(&h)
        );
    }
    h.state_mut()
        .push_command(leafwind_app::gui::commands::Command::ToggleUnits);
    h.run();
    assert!(has_text(&h, "in²"));
    assert!(non_finite_texts(&h).is_empty());
}

// ------------------------------------------------------------------------------------------
// Compare

#[test]
fn compare_two_copies_marks_the_best_with_symbol_and_words() {
    let mut h = harness(ScenarioDocument::default());
    h.get_by_label(PlotTab::Compare.label()).click();
    h.run();
    assert!(has_text(&h, "Nothing to compare yet"));
    h.get_by_label("Duplicate current").click();
    h.run();
    h.get_by_label("Duplicate current").click();
    h.run();
    assert_eq!(h.state().compare_panel().entries().len(), 2);
    // 10 mm instead of the default 50 mm for the second copy.
    h.get_by_label("Leaf size, entry 2")
        .set_value_accesskit(10.0);
    h.run();
    let e = h.state().compare_panel().entries();
    assert!((e[1].doc.case.leaf.dimension_m - 0.010).abs() < 1e-9);
    // The open scenario is not changed by the copy's edit.
    assert!((h.state().document().case.leaf.dimension_m - 0.05).abs() < 1e-12);
    assert!(!h.state().is_dirty());
    let t = h.state().compare_panel().table().unwrap();
    let temps: Vec<f64> = t.rows.iter().map(|r| r.values[0].unwrap()).collect();
    // In the sun a smaller leaf sheds heat better and runs nearer the air (common practice, no
    // source): the 10 mm copy is the coolest, and only it is marked.
    assert!(temps[1] < temps[0], "{temps:?}");
    assert_eq!(t.best[0], vec![false, true]);
    assert!(has_text(&h, "coolest leaf"));
    assert!(has_text(&h, "★"));
    assert!(has_text(&h, "least water use"));
    assert_no_non_finite(&h);
    // The same table in imperial units.
    h.state_mut()
        .push_command(leafwind_app::gui::commands::Command::ToggleUnits);
    h.run();
    assert!(has_text(&h, "[ft/min]") && has_text(&h, "[°F]"));
    assert_no_non_finite(&h);
}

#[test]
fn compare_load_of_a_broken_file_shows_the_error() {
    let mut h = harness(ScenarioDocument::default());
    h.get_by_label(PlotTab::Compare.label()).click();
    h.run();
    let p = temp_path("broken.ron");
    std::fs::write(&p, "ScenarioDocument(\n  version: 1,\n  oops: 3,\n)").unwrap();
    h.state_mut().compare_panel_mut().load_path(&p);
    h.run();
    let (m, err) = h.state().compare_panel().message().unwrap();
    assert!(err && m.contains("line"), "{m}");
    assert!(has_text(&h, "Could not load the scenario"));
    assert!(h.state().compare_panel().entries().is_empty());
    // A shipped scenario loads.
    let good = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../../scenarios/shade_house.ron");
    h.state_mut().compare_panel_mut().load_path(&good);
    h.run();
    assert_eq!(h.state().compare_panel().entries().len(), 1);
    std::fs::remove_file(p).ok();
}

#[test]
fn table_csv_has_units_in_headers_and_no_nan() {
    let base = ScenarioDocument::default();
    let mut hot = base.clone();
    // Air above the limit: no air speed can reach the target, an empty cell.
    hot.case.air.temp_c = 45.0;
    let entries = vec![
        CompareEntry {
            name: "base".into(),
            doc: base.clone(),
        },
        CompareEntry {
            name: "hot air".into(),
            doc: hot,
        },
    ];
    let result = compute_compare(&CompareInput::of(&entries)).unwrap();
    let table = CompareTable::of(&result);
    let mut out = Vec::new();
    table_csv(&mut out, &table, UnitSystem::Si).unwrap();
    let text = String::from_utf8(out).unwrap();
    let mut lines = text.lines();
    let header = lines.next().unwrap();
    for h in [
        "leaf_size [mm]",
        "air_speed [m/s]",
        "leaf_temperature [°C]",
        "margin_to_limit [K]",
        "least_air_speed [m/s]",
        "transpiration [mmol/m²/s]",
    ] {
        assert!(header.contains(h), "{header}");
    }
    assert_eq!(lines.clone().count(), 2);
    assert!(!text.contains("NaN") && !text.contains("inf"));
    let hot_row: Vec<&str> = lines.nth(1).unwrap().split(',').collect();
    // least_air_speed is column 9 (1-based): empty, with its note beside it.
    assert_eq!(hot_row[8], "", "{hot_row:?}");
    assert!(hot_row[9].contains("not reachable"), "{hot_row:?}");
    let mut out = Vec::new();
    table_csv(&mut out, &table, UnitSystem::Imperial).unwrap();
    let text = String::from_utf8(out).unwrap();
    assert!(text.contains("leaf_temperature [°F]") && text.contains("air_speed [ft/min]"));
}

#[test]
fn export_through_the_path_field_writes_the_table() {
    let mut h = harness(ScenarioDocument::default());
    h.get_by_label(PlotTab::Compare.label()).click();
    h.run();
    h.get_by_label("Duplicate current").click();
    h.run();
    h.get_by_label("Export table CSV…").click();
    h.run();
    let p = temp_path("table.csv");
    // Replace the suggested name with the temporary path.
    h.get_by_role_and_label(Role::TextInput, "Table file")
        .set_text_value_accesskit(&p.display().to_string());
    h.run();
    h.get_by_label("Export").click();
    h.run();
    let text = std::fs::read_to_string(&p).unwrap();
    assert_eq!(text.lines().count(), 2, "{text}");
    assert!(text.starts_with("entry,"));
    std::fs::remove_file(p).ok();
}

#[test]
fn best_flags_ties_and_gaps() {
    // Ties are all marked; all equal marks none; missing values never win.
    let (f, eq) = best_flags(&[Some(1.0), Some(1.0), Some(2.0)], Better::Lower, 1e-9);
    assert_eq!((f, eq), (vec![true, true, false], false));
    let (f, eq) = best_flags(&[Some(3.0), Some(3.0)], Better::Higher, 1e-9);
    assert_eq!((f, eq), (vec![false, false], true));
    let (f, _) = best_flags(&[None, Some(2.0), Some(5.0)], Better::Higher, 1e-9);
    assert_eq!(f, vec![false, false, true]);
    let (f, _) = best_flags(&[Some(f64::NAN), Some(2.0)], Better::Lower, 1e-9);
    assert_eq!(f, vec![false, false]);
}

/// One frame of the app in a plain egui context (threaded jobs, as in the window).
fn step(ctx: &egui::Context, app: &mut leafwind_app::gui::LeafwindApp) {
    let input = egui::RawInput {
        screen_rect: Some(egui::Rect::from_min_size(
            egui::Pos2::ZERO,
            egui::vec2(1400.0, 900.0),
        )),
        ..Default::default()
    };
    let mut out = ctx.run_ui(input, |ui| app.frame(ui));
    out.textures_delta.clear();
}

#[test]
fn shape_and_compare_results_arrive_from_background_jobs() {
    use std::time::{Duration, Instant};
    let ctx = egui::Context::default();
    let mut app = leafwind_app::gui::LeafwindApp::new_headless(ScenarioDocument::default());
    app.set_tab(PlotTab::Shape);
    step(&ctx, &mut app);
    let t0 = Instant::now();
    while app.shape_panel().report().is_none() && t0.elapsed() < Duration::from_secs(30) {
        step(&ctx, &mut app);
        std::thread::sleep(Duration::from_millis(2));
    }
    assert!(app.shape_panel().report().is_some());
    app.set_tab(PlotTab::Compare);
    let doc = app.document().clone();
    app.compare_panel_mut().add_copy(&doc, None);
    app.compare_panel_mut().add_copy(&doc, Some("second"));
    let t0 = Instant::now();
    while app.compare_panel().table().is_none() && t0.elapsed() < Duration::from_secs(30) {
        step(&ctx, &mut app);
        std::thread::sleep(Duration::from_millis(2));
    }
    let t = app.compare_panel().table().unwrap();
    assert_eq!(t.rows.len(), 2);
    assert_eq!(t.rows[1].name, "second");
    // Two identical copies: every column is a tie, so nothing is marked best.
    assert!(t.all_equal.iter().all(|e| *e));
    assert!(t.best.iter().flatten().all(|b| !b));
}

#[test]
fn shape_section_in_the_scenario_file() {
    let base = ScenarioDocument::default().to_ron().unwrap();
    // Older files without the section still load.
    assert_eq!(ScenarioDocument::from_ron(&base).unwrap().shape, None);
    assert!(base.contains("shape: None"));
    let with = |section: &str| base.replace("shape: None", &format!("shape: Some({section})"));
    let good = with(
        "(family: Lobed, length_m: 0.12, width_m: 0.08, lobes: 4, depth: 0.6, leaflets: 3, wind_angle_rad: 0.5)",
    );
    let d = ScenarioDocument::from_ron(&good).unwrap();
    assert_eq!(d.shape.unwrap().family, ShapeFamily::Lobed);
    // A misspelt field is an error, not silently dropped.
    let bad =
        with("(family: Lobed, length_m: 0.12, width_m: 0.08, lobe_count: 4, wind_angle_rad: 0.5)");
    assert!(ScenarioDocument::from_ron(&bad).is_err());
}

//! Window tests of files: the shipped scenarios load; a malformed file shows an error and leaves
//! the document as it was; open through the path field; confirmation before discarding edits;
//! save and CSV export.

use std::path::PathBuf;

use crate::support::{harness, has_text, non_finite_texts, set_slider};
use egui_kittest::kittest::Queryable;
use leafwind_app::document::{EXAMPLES, ScenarioDocument};
use leafwind_app::gui::commands::{Command, PlotKind};
use leafwind_app::gui::prefs::PlotTab;

fn scenario_files() -> Vec<PathBuf> {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../../scenarios");
    let mut v: Vec<PathBuf> = std::fs::read_dir(&dir)
        .unwrap()
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "ron"))
        .collect();
    v.sort();
    v
}

fn temp_path(name: &str) -> PathBuf {
    std::env::temp_dir().join(format!("leafwind-test-{}-{name}", std::process::id()))
}

#[test]
fn every_shipped_scenario_loads_with_the_document_loader() {
    let files = scenario_files();
    assert!(files.len() >= 3, "{files:?}");
    assert_eq!(files.len(), EXAMPLES.len());
    for f in &files {
        let d = ScenarioDocument::load(f).unwrap_or_else(|e| panic!("{}: {e}", f.display()));
        assert!(
            !d.title.is_empty() && !d.notes.is_empty(),
            "{}",
            f.display()
        );
        d.case.validate().unwrap();
        d.validate_extras().unwrap();
    }
    for (name, text) in EXAMPLES {
        ScenarioDocument::from_ron(text).unwrap_or_else(|e| panic!("{name}: {e}"));
    }
}

#[test]
fn every_shipped_scenario_opens_in_the_window_without_nan() {
    let mut h = harness(ScenarioDocument::default());
    for f in scenario_files() {
        h.state_mut().push_command(Command::OpenPath(f.clone()));
        h.run();
        let expected = ScenarioDocument::load(&f).unwrap();
        assert_eq!(h.state().document().title, expected.title);
        assert!(!h.state().is_dirty());
        assert!(h.state().result().is_some());
        assert!(h.state().input_error().is_none(), "{}", f.display());
        for tab in [
            PlotTab::Sweep,
            PlotTab::Map,
            PlotTab::BoundaryLayer,
            PlotTab::Canopy,
            PlotTab::Fans,
            PlotTab::Shape,
            PlotTab::Compare,
        ] {
            h.get_by_label(tab.label()).click();
            h.run();
            assert!(
                non_finite_texts(&h).is_empty(),
                "{} {tab:?}: {:?}",
                f.display(),
                non_finite_texts(&h)
            );
        }
    }
}

#[test]
fn malformed_file_shows_an_error_and_keeps_the_document() {
    let mut h = harness(ScenarioDocument::default());
    set_slider(&mut h, "Air temperature", 31.0);
    let before = h.state().document().clone();
    let p = temp_path("broken.ron");
    std::fs::write(
        &p,
        "ScenarioDocument(\n    version: 1,\n    title: \"x\",\n    oops: 3,\n)",
    )
    .unwrap();
    h.state_mut().push_command(Command::OpenPath(p.clone()));
    h.run();
    // An unsaved edit: first the confirmation.
    assert!(h.state().confirmation_pending());
    h.get_by_label("Discard changes").click();
    h.run();
    assert_eq!(h.state().document(), &before);
    let m = h.state().message().unwrap();
    assert!(m.error && m.text.contains("line 4"), "{}", m.text);
    assert!(has_text(&h, "Could not open the scenario"));
    std::fs::remove_file(p).ok();
}

#[test]
fn open_through_the_path_field() {
    let files = scenario_files();
    let mut h = harness(ScenarioDocument::default());
    h.state_mut().push_command(Command::Open);
    h.run();
    let field = h.get_by_label("File path");
    field.focus();
    h.run();
    h.get_by_label("File path")
        .type_text(&files[1].display().to_string());
    h.run();
    h.get_by_label("Open").click();
    h.run();
    let expected = ScenarioDocument::load(&files[1]).unwrap();
    assert_eq!(h.state().document().title, expected.title);
    assert_eq!(h.state().path(), Some(files[1].as_path()));
    assert_eq!(h.state().prefs().recent_files.first(), Some(&files[1]));
}

#[test]
fn new_with_unsaved_edits_asks_first() {
    let mut h = harness(ScenarioDocument {
        title: "Mine".into(),
        ..Default::default()
    });
    set_slider(&mut h, "Sun on the leaf", 900.0);
    h.state_mut().push_command(Command::New);
    h.run();
    assert!(has_text(&h, "Discard unsaved changes?"));
    h.get_by_label("Cancel").click();
    h.run();
    assert_eq!(h.state().document().title, "Mine");
    assert!(h.state().is_dirty());
    h.state_mut().push_command(Command::New);
    h.run();
    h.get_by_label("Discard changes").click();
    h.run();
    assert_eq!(h.state().document(), &ScenarioDocument::default());
    assert!(!h.state().is_dirty());
}

#[test]
fn save_clears_the_marker_and_round_trips() {
    let mut h = harness(ScenarioDocument::default());
    set_slider(&mut h, "Leaf size along the wind", 120.0);
    assert!(h.state().is_dirty());
    let p = temp_path("saved.ron");
    h.state_mut().push_command(Command::SaveTo(p.clone()));
    h.run();
    assert!(!h.state().is_dirty());
    assert!(!h.state().title().starts_with('*'));
    let back = ScenarioDocument::load(&p).unwrap();
    assert_eq!(&back, h.state().document());
    std::fs::remove_file(p).ok();
}

#[test]
fn csv_exports_have_units_and_no_nan() {
    let mut h = harness(ScenarioDocument::default());
    for (k, unit) in [
        (PlotKind::Budget, "W/m²"),
        (PlotKind::Sweep, "[m/s]"),
        (PlotKind::Map, "[°C]"),
        (PlotKind::Boundary, "[mm]"),
    ] {
        let p = temp_path(k.default_file_name());
        h.state_mut()
            .push_command(Command::ExportCsvTo(k, p.clone()));
        h.run();
        let text = std::fs::read_to_string(&p).unwrap_or_else(|e| panic!("{k:?}: {e}"));
        let header = text.lines().next().unwrap();
        assert!(header.contains(unit), "{k:?}: {header}");
        assert!(text.lines().count() > 3, "{k:?}");
        assert!(!text.contains("NaN") && !text.contains("inf"), "{k:?}");
        std::fs::remove_file(p).ok();
    }
}

#[test]
fn quit_with_unsaved_edits_asks_first() {
    let mut h = harness(ScenarioDocument::default());
    h.state_mut().push_command(Command::Quit);
    h.run();
    // Nothing to lose: quits at once.
    assert!(h.state().quit_requested());
    let mut h = harness(ScenarioDocument::default());
    set_slider(&mut h, "Safety margin", 4.0);
    h.state_mut().push_command(Command::Quit);
    h.run();
    assert!(!h.state().quit_requested());
    assert!(has_text(&h, "Discard unsaved changes?"));
    h.get_by_label("Discard changes").click();
    h.run();
    assert!(h.state().quit_requested());
}

#[test]
fn save_shortcut_without_a_file_asks_for_a_path() {
    let mut h = harness(ScenarioDocument::default());
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::S);
    h.run();
    assert!(has_text(&h, "Save scenario as"));
    let p = temp_path("shortcut.ron");
    h.get_by_label("File path").focus();
    h.run();
    // Replace the suggested name.
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::A);
    h.get_by_label("File path")
        .type_text(&p.display().to_string());
    h.run();
    h.get_by_label("Save").click();
    h.run();
    assert_eq!(h.state().path(), Some(p.as_path()));
    assert!(ScenarioDocument::load(&p).is_ok());
    std::fs::remove_file(p).ok();
}

#[test]
fn export_report_writes_the_grower_report_for_the_open_scenario() {
    let mut h = harness(ScenarioDocument::default());
    let dir = temp_path("report");
    h.state_mut()
        .push_command(Command::ExportReportTo(dir.clone()));
    h.run();
    let html = std::fs::read_to_string(dir.join("report.html")).unwrap();
    assert!(html.contains(&h.state().document().title));
    assert!(has_text(&h, "Report written to"));
    // The same command from the File menu asks for a folder (here: the path field).
    h.state_mut().push_command(Command::ExportReport);
    h.run();
    assert!(has_text(&h, "Export report into a folder"));
}

//! Scenario files are safe to open and to save: unknown fields are errors with their line and
//! column at every depth, every value is range-checked with its document path, older versions
//! migrate, a failed open leaves the document as it was, saves are atomic, and saving over a file
//! another program changed asks first. Invariants of the file format (common practice, no source).

use std::path::{Path, PathBuf};

use crate::support::{harness, has_text, set_slider};
use egui_kittest::kittest::Queryable as _;
use leafwind_app::document::{
    DOCUMENT_VERSION, EXAMPLES, LoadError, MIGRATIONS, ScenarioDocument, migrate,
};
use leafwind_app::file_safety::write_atomic;
use leafwind_app::gui::commands::Command;

fn temp_dir(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("leafwind-safety-{}-{name}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    d
}

/// The glasshouse example: it has every section (case, canopy with greenhouse and design day,
/// fans), so nested structs of the engine are exercised too.
fn full_example() -> &'static str {
    EXAMPLES
        .iter()
        .find(|(n, _)| n.starts_with("glasshouse"))
        .unwrap()
        .1
}

/// Each `name:` of a field that opens a line, with its 1-based line and column.
fn field_lines(text: &str) -> Vec<(usize, usize, String)> {
    text.lines()
        .enumerate()
        .filter_map(|(i, l)| {
            let t = l.trim_start();
            let col = l.len() - t.len() + 1;
            let name: String = t
                .chars()
                .take_while(|c| c.is_ascii_alphanumeric() || *c == '_')
                .collect();
            let rest = &t[name.len()..];
            (!name.is_empty() && rest.starts_with(':') && !t.starts_with("//"))
                .then(|| (i + 1, col, name))
        })
        .collect()
}

fn with_line(text: &str, line: usize, f: impl Fn(&str) -> String) -> String {
    text.lines()
        .enumerate()
        .map(|(i, l)| if i + 1 == line { f(l) } else { l.to_owned() })
        .collect::<Vec<_>>()
        .join("\n")
}

#[test]
fn a_misspelt_field_at_any_depth_is_named_with_its_line_and_column() {
    let mut checked = 0;
    for (file, text) in EXAMPLES {
        for (line, col, name) in field_lines(text) {
            let bad = format!("{name}_typo");
            let mutated = with_line(text, line, |l| l.replacen(&name, &bad, 1));
            match ScenarioDocument::from_ron(&mutated) {
                Err(LoadError::Parse {
                    line: l,
                    col: c,
                    message,
                }) => {
                    assert_eq!(l, line, "{file}: {name}: {message}");
                    assert!(c >= col, "{file}: {name}: column {c} before {col}");
                    assert!(message.contains(&bad), "{file}: {name}: {message}");
                }
                other => panic!("{file}: renaming {name} on line {line} gave {other:?}"),
            }
            checked += 1;
        }
    }
    // Every field line of the four examples (top level, case, canopy, greenhouse, design day,
    // fans): dozens of nested fields.
    assert!(checked > 100, "{checked}");
}

#[test]
fn an_out_of_range_value_names_the_path_the_value_and_the_range() {
    let text = EXAMPLES[0]
        .1
        .replacen("speed_m_s: 0.2,", "speed_m_s: 45.0,", 1);
    match ScenarioDocument::from_ron(&text) {
        Err(LoadError::Invalid { path, message }) => {
            assert_eq!(path, "case.air.speed_m_s");
            assert!(message.contains("45"), "{message}");
            assert!(message.contains("0 to 30 m/s"), "{message}");
        }
        other => panic!("{other:?}"),
    }
    for (bad, shown) in [("NaN", "NaN"), ("inf", "inf"), ("-inf", "-inf")] {
        let text =
            EXAMPLES[0]
                .1
                .replacen("absorptivity: 0.5,", &format!("absorptivity: {bad},"), 1);
        let e = ScenarioDocument::from_ron(&text).unwrap_err();
        let m = e.to_string();
        assert!(m.starts_with("case.leaf.absorptivity: "), "{m}");
        assert!(m.contains(shown) && m.contains("valid range"), "{m}");
    }
}

#[test]
fn values_of_every_section_are_checked() {
    let cases = [
        ("margin_k: 2.0,", "margin_k: -3.0,", "margin_k"),
        (
            "heat_limit_c: 35.0,",
            "heat_limit_c: 900.0,",
            "heat_limit_c",
        ),
        (
            "max_speed_m_s: 3.0,",
            "max_speed_m_s: 1e300,",
            "sweep.max_speed_m_s",
        ),
        ("size_max_m: 0.5,", "size_max_m: 7.0,", "map.size_max_m"),
        (
            "extra_sizes_m: [0.03, 0.15],",
            "extra_sizes_m: [0.03, NaN],",
            "extra_sizes_m[1]",
        ),
        (
            "humidity: RelativePct(60.0),",
            "humidity: RelativePct(160.0),",
            "case.air.humidity",
        ),
        ("lai: 3.0,", "lai: -1.0,", "canopy.structure"),
        (
            "shade_fraction: 0.0,",
            "shade_fraction: 1.5,",
            "canopy.greenhouse.shade_fraction",
        ),
        (
            "transmittance: 0.62,",
            "transmittance: -0.1,",
            "canopy.greenhouse.cover.transmittance",
        ),
        (
            "outside_air_temp_c: 29.0,",
            "outside_air_temp_c: 99.0,",
            "canopy.greenhouse.outside_air_temp_c",
        ),
        (
            "inside: ScenarioAir,",
            "inside: Ventilated(rate_m3_m2_s: 5.0),",
            "canopy.greenhouse.inside.rate_m3_m2_s",
        ),
        (
            "inside: ScenarioAir,",
            "inside: ScenarioAir, design_rise_k: 0.0,",
            "canopy.greenhouse.design_rise_k",
        ),
        (
            "above_c: 30.0, hours: 4,",
            "above_c: 30.0, hours: 40,",
            "canopy.heat_rules[1]",
        ),
    ];
    for (from, to, path) in cases {
        let text = full_example();
        assert!(text.contains(from), "{from}");
        let e = ScenarioDocument::from_ron(&text.replacen(from, to, 1)).unwrap_err();
        match &e {
            LoadError::Invalid { path: p, .. } => assert_eq!(p, path, "{to}: {e}"),
            other => panic!("{to}: {other:?}"),
        }
    }
}

#[test]
fn a_file_without_a_version_is_migrated_from_version_0() {
    assert_eq!(
        MIGRATIONS.last().map(|m| m.from + 1),
        Some(DOCUMENT_VERSION)
    );
    let text = EXAMPLES[1].1.replacen("version: 1,", "", 1);
    let (doc, from) = ScenarioDocument::from_ron_migrated(&text).unwrap();
    assert_eq!(from, Some(0));
    assert_eq!(doc.version, DOCUMENT_VERSION);
    let current = ScenarioDocument::from_ron(EXAMPLES[1].1).unwrap();
    assert_eq!(doc, current);
    // Saved again, it is the current version.
    assert!(doc.to_ron().unwrap().contains("version: 1"));
    let mut d = current.clone();
    assert_eq!(migrate(&mut d), None);
    let newer = EXAMPLES[1].1.replacen("version: 1,", "version: 99,", 1);
    assert_eq!(
        ScenarioDocument::from_ron(&newer),
        Err(LoadError::Version(99))
    );
}

#[test]
fn byte_order_mark_and_windows_line_ends_load() {
    for (name, text) in EXAMPLES {
        let plain = ScenarioDocument::from_ron(text).unwrap();
        let crlf = text.replace('\n', "\r\n");
        let bom = format!("\u{feff}{crlf}");
        assert_eq!(ScenarioDocument::from_ron(&crlf).unwrap(), plain, "{name}");
        assert_eq!(ScenarioDocument::from_ron(&bom).unwrap(), plain, "{name}");
    }
}

#[test]
fn not_utf8_is_an_error_not_a_panic() {
    let d = temp_dir("utf8");
    let p = d.join("latin1.ron");
    std::fs::write(&p, b"ScenarioDocument(title: \"caf\xe9\")").unwrap();
    let e = ScenarioDocument::load(&p).unwrap_err().to_string();
    assert!(e.contains("UTF-8") && e.contains("latin1.ron"), "{e}");
    std::fs::remove_dir_all(d).ok();
}

#[cfg(unix)]
#[test]
fn save_replaces_the_file_by_rename_never_in_place() {
    use std::io::Read as _;
    let d = temp_dir("rename");
    let p = d.join("s.ron");
    let mut doc = ScenarioDocument::default();
    doc.save(&p).unwrap();
    // A reader that opened the old file keeps reading the old, whole file: the new content
    // arrived as another file renamed over the name, not by truncating and rewriting.
    let mut old = std::fs::File::open(&p).unwrap();
    doc.title = "Second version".into();
    doc.save(&p).unwrap();
    let mut text = String::new();
    old.read_to_string(&mut text).unwrap();
    assert_eq!(
        ScenarioDocument::from_ron(&text).unwrap().title,
        "Untitled scenario"
    );
    assert_eq!(ScenarioDocument::load(&p).unwrap().title, "Second version");
    // No temporary file is left beside it.
    let names: Vec<_> = std::fs::read_dir(&d)
        .unwrap()
        .flatten()
        .map(|e| e.file_name())
        .collect();
    assert_eq!(names.len(), 1, "{names:?}");
    std::fs::remove_dir_all(d).ok();
}

#[test]
fn a_failed_save_leaves_the_target_and_no_temporary_file() {
    let d = temp_dir("failed");
    // The target is a folder with a file in it: the rename over it fails.
    let target = d.join("taken.ron");
    std::fs::create_dir_all(&target).unwrap();
    std::fs::write(target.join("keep"), "x").unwrap();
    let e = ScenarioDocument::default().save(&target).unwrap_err();
    assert!(format!("{e:#}").contains("taken.ron"), "{e:#}");
    assert_eq!(std::fs::read_to_string(target.join("keep")).unwrap(), "x");
    let names: Vec<_> = std::fs::read_dir(&d)
        .unwrap()
        .flatten()
        .map(|e| e.file_name())
        .collect();
    assert_eq!(names.len(), 1, "{names:?}");
    // Writing bytes to a folder that does not exist fails cleanly too.
    assert!(write_atomic(&d.join("no/such/folder.ron"), b"x").is_err());
    std::fs::remove_dir_all(d).ok();
}

/// The text cut at `n` bytes, or the char boundary before.
fn cut(text: &str, mut n: usize) -> String {
    while !text.is_char_boundary(n) {
        n -= 1;
    }
    text[..n].to_owned()
}

fn write(p: &Path, text: &str) {
    std::fs::write(p, text).unwrap();
}

#[test]
fn an_invalid_file_leaves_the_open_document_untouched_in_the_window() {
    let d = temp_dir("window-invalid");
    let mut h = harness(ScenarioDocument::default());
    set_slider(&mut h, "Air temperature", 33.0);
    let before = h.state().document().clone();
    let files = [
        (
            "range.ron",
            EXAMPLES[0]
                .1
                .replacen("speed_m_s: 0.2,", "speed_m_s: 45.0,", 1),
            "case.air.speed_m_s",
        ),
        (
            "nested.ron",
            EXAMPLES[0].1.replacen("emissivity:", "emisivity:", 1),
            "emisivity",
        ),
        ("cut.ron", cut(EXAMPLES[0].1, 900), "line"),
    ];
    for (name, text, needle) in files {
        let p = d.join(name);
        write(&p, &text);
        h.state_mut().push_command(Command::OpenPath(p.clone()));
        h.run();
        assert!(h.state().confirmation_pending());
        h.get_by_label("Discard changes").click();
        h.run();
        assert_eq!(h.state().document(), &before, "{name}");
        assert!(h.state().is_dirty(), "{name}");
        let m = h.state().message().unwrap();
        assert!(m.error && m.text.contains(needle), "{name}: {}", m.text);
        assert!(has_text(&h, "Could not open the scenario"), "{name}");
    }
    std::fs::remove_dir_all(d).ok();
}

#[test]
fn saving_over_a_file_changed_on_disk_asks_first() {
    let d = temp_dir("window-changed");
    let p = d.join("shared.ron");
    let mut h = harness(ScenarioDocument::default());
    h.state_mut().push_command(Command::SaveTo(p.clone()));
    h.run();
    assert!(!h.state().is_dirty());
    // Saving again without outside changes: no question.
    set_slider(&mut h, "Air temperature", 29.0);
    h.state_mut().push_command(Command::Save);
    h.run();
    assert!(!h.state().overwrite_pending());
    assert!(!h.state().is_dirty());
    // Another program changes the file.
    let theirs = ScenarioDocument {
        title: "Their version".into(),
        ..Default::default()
    };
    theirs.save(&p).unwrap();
    set_slider(&mut h, "Air temperature", 30.0);
    h.state_mut().push_command(Command::Save);
    h.run();
    assert!(h.state().overwrite_pending());
    assert!(has_text(&h, "The file changed on disk"));
    h.get_by_label("Cancel").click();
    h.run();
    assert!(!h.state().overwrite_pending());
    assert_eq!(ScenarioDocument::load(&p).unwrap().title, "Their version");
    assert!(h.state().is_dirty());
    // Again, and this time overwrite.
    h.state_mut().push_command(Command::Save);
    h.run();
    assert!(has_text(&h, "The file changed on disk"));
    h.get_by_label("Overwrite").click();
    h.run();
    assert!(!h.state().is_dirty());
    assert_eq!(&ScenarioDocument::load(&p).unwrap(), h.state().document());
    // Saved by us: the next save does not ask.
    set_slider(&mut h, "Air temperature", 31.0);
    h.state_mut().push_command(Command::Save);
    h.run();
    assert!(!h.state().overwrite_pending());
    assert!(!h.state().is_dirty());
    std::fs::remove_dir_all(d).ok();
}

#[test]
fn an_opened_file_changed_on_disk_also_asks_before_saving() {
    let d = temp_dir("window-opened");
    let p = d.join("opened.ron");
    write(&p, EXAMPLES[2].1);
    let mut h = harness(ScenarioDocument::default());
    h.state_mut().push_command(Command::OpenPath(p.clone()));
    h.run();
    assert_eq!(h.state().path(), Some(p.as_path()));
    // A touch with the same content is not a change.
    write(&p, EXAMPLES[2].1);
    h.state_mut().push_command(Command::Save);
    h.run();
    assert!(!h.state().overwrite_pending());
    write(&p, &EXAMPLES[2].1.replacen("margin_k:", "margin_k :", 1));
    h.state_mut().push_command(Command::Save);
    h.run();
    assert!(h.state().overwrite_pending());
    std::fs::remove_dir_all(d).ok();
}

#[test]
fn deep_nesting_and_huge_files_are_errors_not_crashes() {
    // Deep brackets: the parser's recursion limit answers before the stack runs out.
    for open in ["(", "[", "Some("] {
        let text = format!("ScenarioDocument(case: {})", open.repeat(100_000));
        let e = ScenarioDocument::from_ron(&text).unwrap_err();
        assert!(matches!(e, LoadError::Parse { .. }), "{e:?}");
    }
    let d = temp_dir("huge");
    let p = d.join("huge.ron");
    let f = std::fs::File::create(&p).unwrap();
    // A sparse file: no disk space used.
    f.set_len(leafwind_app::document::MAX_FILE_BYTES + 1)
        .unwrap();
    let e = ScenarioDocument::load(&p).unwrap_err().to_string();
    assert!(e.contains("larger than any scenario"), "{e}");
    std::fs::remove_dir_all(d).ok();
}

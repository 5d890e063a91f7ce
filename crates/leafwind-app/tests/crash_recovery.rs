//! Crash recovery for real: the `leafwind` binary runs its headless autosave self-test (the app's
//! own frame loop and autosave path, no window), is killed with SIGKILL once the autosave is on
//! disk, and a new app started on the same data folder offers the edits back. Also: discard, the
//! autosave in the window, its removal after a save, an unreadable autosave. Common practice, no
//! source.

#[path = "window/support.rs"]
mod gui_support;

use std::io::{BufRead as _, BufReader};
use std::path::PathBuf;
use std::process::{Command as Process, Stdio};
use std::sync::mpsc;
use std::time::Duration;

use egui_kittest::Harness;
use egui_kittest::kittest::Queryable as _;
use gui_support::{has_text, set_slider};
use leafwind_app::document::{ScenarioDocument, first_example};
use leafwind_app::gui::LeafwindApp;
use leafwind_app::gui::autosave::{AUTOSAVE_FILE, Autosave, DATA_DIR_ENV, SELFTEST_ENV};
use leafwind_app::gui::commands::Command;

fn data_dir(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("leafwind-crash-{}-{name}", std::process::id()));
    std::fs::remove_dir_all(&d).ok();
    std::fs::create_dir_all(&d).unwrap();
    d
}

/// The window (kittest) with the autosave on in `dir`, written `delay` after a change.
fn harness_with_autosave(
    doc: ScenarioDocument,
    dir: PathBuf,
    delay: Duration,
) -> Harness<'static, LeafwindApp> {
    let mut h = Harness::builder()
        .with_size(egui::vec2(1500.0, 3200.0))
        .with_max_steps(40)
        .build_ui_state(
            |ui, app: &mut LeafwindApp| app.frame(ui),
            LeafwindApp::new_for_test(doc).with_autosave(dir, delay),
        );
    h.run();
    h
}

#[test]
fn edits_survive_a_killed_process_and_are_offered_back() {
    let dir = data_dir("killed");
    let mut child = Process::new(env!("CARGO_BIN_EXE_leafwind"))
        .env(DATA_DIR_ENV, &dir)
        .env(SELFTEST_ENV, "31.5")
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let stdout = child.stdout.take().unwrap();
    let (tx, rx) = mpsc::channel();
    std::thread::spawn(move || {
        for line in BufReader::new(stdout).lines().map_while(Result::ok) {
            if tx.send(line).is_err() {
                break;
            }
        }
    });
    let line = rx.recv_timeout(Duration::from_secs(60));
    // Still running (it idles until killed): SIGKILL on Unix, TerminateProcess on Windows —
    // no clean exit, no chance to tidy up.
    assert!(
        child.try_wait().unwrap().is_none(),
        "the self-test exited early"
    );
    child.kill().unwrap();
    let status = child.wait().unwrap();
    assert!(!status.success());
    let line = line.expect("the self-test printed no 'autosaved' line within 60 s");
    assert!(line.starts_with("autosaved "), "{line}");
    assert!(dir.join(AUTOSAVE_FILE).exists());

    // The next start, on the same data folder, offers the edits back.
    let mut h = harness_with_autosave(first_example(), dir.clone(), Duration::from_millis(0));
    assert!(h.state().restore_offered());
    assert!(has_text(&h, "Restore unsaved work?"));
    h.get_by_label("Restore").click();
    h.run();
    assert!(!h.state().restore_offered());
    let doc = h.state().document();
    assert!(
        (doc.case.air.temp_c - 31.5).abs() < 1e-12,
        "{}",
        doc.case.air.temp_c
    );
    assert_eq!(doc.title, first_example().title);
    // Restored edits are unsaved work: marked, and still in the autosave.
    assert!(h.state().is_dirty());
    assert!(h.state().title().starts_with('*'));
    assert!(dir.join(AUTOSAVE_FILE).exists());
    // A save removes the autosave.
    let p = dir.join("restored.ron");
    h.state_mut().push_command(Command::SaveTo(p.clone()));
    h.run();
    assert!(!h.state().is_dirty());
    assert!(!dir.join(AUTOSAVE_FILE).exists());
    assert!((ScenarioDocument::load(&p).unwrap().case.air.temp_c - 31.5).abs() < 1e-12);
    std::fs::remove_dir_all(dir).ok();
}

#[test]
fn discard_deletes_the_autosave_and_keeps_the_document() {
    let dir = data_dir("discard");
    let mut edited = ScenarioDocument::default();
    edited.case.air.temp_c = 38.0;
    Autosave::new(dir.clone(), Duration::ZERO)
        .write(&edited, None)
        .unwrap();
    let shown = first_example();
    let mut h = harness_with_autosave(shown.clone(), dir.clone(), Duration::ZERO);
    assert!(has_text(&h, "Restore unsaved work?"));
    h.get_by_label("Discard").click();
    h.run();
    assert!(!h.state().restore_offered());
    assert_eq!(h.state().document(), &shown);
    assert!(!dir.join(AUTOSAVE_FILE).exists());
    // Nothing is offered at the next start.
    let h = harness_with_autosave(shown, dir.clone(), Duration::ZERO);
    assert!(!h.state().restore_offered());
    std::fs::remove_dir_all(dir).ok();
}

#[test]
fn the_window_autosaves_edits_and_a_save_or_undo_removes_them() {
    let dir = data_dir("window");
    let mut h = harness_with_autosave(ScenarioDocument::default(), dir.clone(), Duration::ZERO);
    let file = dir.join(AUTOSAVE_FILE);
    assert!(!file.exists());
    set_slider(&mut h, "Air temperature", 34.0);
    h.run();
    assert!(file.exists());
    assert!(h.state().autosave_written());
    let text = std::fs::read_to_string(&file).unwrap();
    let back = leafwind_app::gui::autosave::read_autosave(&text).unwrap();
    assert_eq!(&back.document, h.state().document());
    // Back to the saved value: nothing unsaved, nothing to recover.
    set_slider(
        &mut h,
        "Air temperature",
        ScenarioDocument::default().case.air.temp_c,
    );
    h.run();
    assert!(!h.state().is_dirty());
    assert!(!file.exists());
    // Edit again, then save: removed.
    set_slider(&mut h, "Air temperature", 35.0);
    h.run();
    assert!(file.exists());
    h.state_mut()
        .push_command(Command::SaveTo(dir.join("saved.ron")));
    h.run();
    assert!(!file.exists());
    std::fs::remove_dir_all(dir).ok();
}

#[test]
fn the_autosave_waits_for_its_delay() {
    let dir = data_dir("delay");
    let mut h = harness_with_autosave(
        ScenarioDocument::default(),
        dir.clone(),
        Duration::from_secs(3600),
    );
    set_slider(&mut h, "Air temperature", 34.0);
    h.run();
    assert!(h.state().is_dirty());
    assert!(!dir.join(AUTOSAVE_FILE).exists());
    std::fs::remove_dir_all(dir).ok();
}

#[test]
fn an_unreadable_autosave_is_kept_aside_and_reported() {
    let dir = data_dir("unreadable");
    std::fs::write(dir.join(AUTOSAVE_FILE), "AutosaveFile(written_unix_s: ").unwrap();
    let h = harness_with_autosave(ScenarioDocument::default(), dir.clone(), Duration::ZERO);
    assert!(!h.state().restore_offered());
    let m = h.state().message().unwrap();
    assert!(
        m.error && m.text.contains("could not be read"),
        "{}",
        m.text
    );
    assert!(!dir.join(AUTOSAVE_FILE).exists());
    let kept = std::fs::read_dir(&dir)
        .unwrap()
        .flatten()
        .filter(|e| {
            e.file_name()
                .to_string_lossy()
                .starts_with("autosave-unreadable")
        })
        .count();
    assert_eq!(kept, 1);
    std::fs::remove_dir_all(dir).ok();
}

//! Crash recovery: a copy of the unsaved edits is written to the app's data folder a few seconds
//! after the last change; a save, a discard or a clean exit removes it; the next start offers to
//! restore it when it is still there (after a crash, a kill or a power cut).
//!
//! The folder is `LEAFWIND_DATA_DIR` when set (tests), else eframe's storage folder for
//! "Leafwind" (`~/.local/share/leafwind` on Linux). One autosave file serves the app: two
//! windows open at once share it, and the later write wins.

use std::path::{Path, PathBuf};
use std::process::ExitCode;
use std::time::{Duration, Instant, SystemTime, UNIX_EPOCH};

use serde::{Deserialize, Serialize};

use crate::document::ScenarioDocument;

/// Environment variable naming the data folder (overrides the default; for tests).
pub const DATA_DIR_ENV: &str = "LEAFWIND_DATA_DIR";

/// Environment variable of the headless self-test: when set to an air temperature \[°C\], the
/// binary edits the first example to that temperature, lets the autosave write it, prints
/// `autosaved <path>` and keeps running until it is killed (for the crash-recovery test).
pub const SELFTEST_ENV: &str = "LEAFWIND_AUTOSAVE_SELFTEST";

/// Wait after the last change before the autosave is written (common practice, no source).
pub const AUTOSAVE_DELAY: Duration = Duration::from_secs(5);

/// Longest time unsaved edits go without an autosave while the user keeps changing things
/// (common practice, no source).
pub const AUTOSAVE_MAX_WAIT: Duration = Duration::from_secs(30);

/// File name of the autosave in the data folder.
pub const AUTOSAVE_FILE: &str = "autosave.ron";

/// The data folder: `LEAFWIND_DATA_DIR`, else eframe's storage folder of the app.
#[must_use]
pub fn data_dir() -> Option<PathBuf> {
    std::env::var_os(DATA_DIR_ENV)
        .filter(|v| !v.is_empty())
        .map(PathBuf::from)
        .or_else(|| eframe::storage_dir("Leafwind"))
}

/// What the autosave file holds.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AutosaveFile {
    /// When it was written \[s since 1970-01-01 UTC\].
    pub written_unix_s: u64,
    /// The scenario file the edits belong to, if it had one.
    #[serde(default)]
    pub source: Option<PathBuf>,
    /// The edited document.
    pub document: ScenarioDocument,
}

impl AutosaveFile {
    /// How long ago it was written, in words ("3 min ago").
    #[must_use]
    pub fn age_text(&self) -> String {
        let now = SystemTime::now()
            .duration_since(UNIX_EPOCH)
            .map_or(0, |d| d.as_secs());
        let s = now.saturating_sub(self.written_unix_s);
        match s {
            0..60 => format!("{s} s ago"),
            60..7200 => format!("{} min ago", s / 60),
            7200..172_800 => format!("{} h ago", s / 3600),
            _ => format!("{} days ago", s / 86_400),
        }
    }
}

/// The autosave state of the window.
#[derive(Debug, Clone)]
pub struct Autosave {
    dir: PathBuf,
    delay: Duration,
    /// The document as last seen, and when it last changed.
    seen: Option<(ScenarioDocument, Instant)>,
    /// When the edits first became unsaved without an autosave.
    pending_since: Option<Instant>,
    /// The document the autosave file holds now.
    written: Option<ScenarioDocument>,
}

impl Autosave {
    /// Autosave into `dir`, `delay` after the last change.
    #[must_use]
    pub fn new(dir: PathBuf, delay: Duration) -> Self {
        Self {
            dir,
            delay,
            seen: None,
            pending_since: None,
            written: None,
        }
    }

    /// The autosave file.
    #[must_use]
    pub fn path(&self) -> PathBuf {
        self.dir.join(AUTOSAVE_FILE)
    }

    /// The autosave left by an earlier run: `None` when there is none, else the file or why it
    /// could not be read.
    #[must_use]
    pub fn find(&self) -> Option<Result<AutosaveFile, String>> {
        let text = std::fs::read_to_string(self.path()).ok()?;
        Some(read_autosave(&text))
    }

    /// Moves an unreadable autosave aside (kept for the user, never overwritten).
    ///
    /// # Errors
    /// The rename failed.
    pub fn keep_unreadable(&self) -> std::io::Result<PathBuf> {
        let to = self.dir.join(format!(
            "autosave-unreadable-{}.ron",
            SystemTime::now()
                .duration_since(UNIX_EPOCH)
                .map_or(0, |d| d.as_secs())
        ));
        std::fs::rename(self.path(), &to)?;
        Ok(to)
    }

    /// Writes the autosave now (atomically).
    ///
    /// # Errors
    /// The folder could not be created or the file written.
    pub fn write(&mut self, doc: &ScenarioDocument, source: Option<&Path>) -> anyhow::Result<()> {
        use anyhow::Context as _;
        std::fs::create_dir_all(&self.dir)
            .with_context(|| format!("could not create {}", self.dir.display()))?;
        let file = AutosaveFile {
            written_unix_s: SystemTime::now()
                .duration_since(UNIX_EPOCH)
                .map_or(0, |d| d.as_secs()),
            source: source.map(Path::to_path_buf),
            document: doc.clone(),
        };
        let cfg = ron::ser::PrettyConfig::new().struct_names(true);
        let text = ron::ser::to_string_pretty(&file, cfg)?;
        crate::file_safety::write_atomic(&self.path(), text.as_bytes())?;
        self.written = Some(doc.clone());
        self.pending_since = None;
        Ok(())
    }

    /// Removes the autosave (after a save, a discard or a clean exit).
    pub fn remove(&mut self) {
        std::fs::remove_file(self.path()).ok();
        self.written = None;
        self.pending_since = None;
    }

    /// One frame's autosave step: writes the autosave when the unsaved edits have rested for the
    /// delay (or have waited [`AUTOSAVE_MAX_WAIT`]), removes it once nothing is unsaved.
    ///
    /// Returns how long until the next step is due (for `request_repaint_after`), `None` when
    /// nothing is pending.
    ///
    /// # Errors
    /// The autosave could not be written (reported once per change).
    pub fn tick(
        &mut self,
        doc: &ScenarioDocument,
        dirty: bool,
        source: Option<&Path>,
        now: Instant,
    ) -> Result<Option<Duration>, String> {
        if !dirty {
            if self.written.is_some() {
                self.remove();
            }
            self.seen = None;
            self.pending_since = None;
            return Ok(None);
        }
        let changed = self.seen.as_ref().is_none_or(|(d, _)| d != doc);
        if changed {
            self.seen = Some((doc.clone(), now));
        }
        if self.written.as_ref() == Some(doc) {
            return Ok(None);
        }
        let since = *self.pending_since.get_or_insert(now);
        let last_change = self.seen.as_ref().map_or(now, |(_, t)| *t);
        let rested = now.saturating_duration_since(last_change);
        let waited = now.saturating_duration_since(since);
        if rested >= self.delay || waited >= AUTOSAVE_MAX_WAIT {
            return match self.write(doc, source) {
                Ok(()) => Ok(None),
                Err(e) => {
                    // Not retried every frame: the next change tries again.
                    self.written = Some(doc.clone());
                    Err(format!("Autosave failed: {e:#}"))
                }
            };
        }
        Ok(Some(
            (self.delay - rested).min(AUTOSAVE_MAX_WAIT.saturating_sub(waited)),
        ))
    }
}

/// Reads an autosave file's text (the document without the range check: work in progress may
/// hold a value being typed, and it must not be lost).
///
/// # Errors
/// Why it could not be read.
pub fn read_autosave(text: &str) -> Result<AutosaveFile, String> {
    let text = crate::file_safety::strip_bom(text);
    let mut file: AutosaveFile = ron::from_str(text).map_err(|e| e.to_string())?;
    if file.document.version > crate::document::DOCUMENT_VERSION {
        return Err(crate::document::LoadError::Version(file.document.version).to_string());
    }
    crate::document::migrate(&mut file.document);
    Ok(file)
}

/// The headless self-test of the autosave path ([`SELFTEST_ENV`]); `None` when it is not asked
/// for. It drives the real app (frames through an egui context, no window): an edit, the autosave
/// after its delay, then it idles until it is killed — or gives up after two minutes so that a
/// test that died first leaves no process behind.
#[must_use]
pub fn selftest_from_env() -> Option<ExitCode> {
    let value = std::env::var(SELFTEST_ENV).ok()?;
    let run = || -> Result<(), String> {
        let temp_c: f64 = value
            .trim()
            .parse()
            .map_err(|_| format!("{SELFTEST_ENV}={value}: not an air temperature"))?;
        let dir = data_dir().ok_or("no data folder: set LEAFWIND_DATA_DIR")?;
        let ctx = egui::Context::default();
        let mut app = super::LeafwindApp::new_headless(crate::document::first_example())
            .with_autosave(dir, Duration::from_millis(200));
        let mut doc = app.document().clone();
        doc.case.air.temp_c = temp_c;
        app.push_command(super::commands::Command::Edit(Box::new(doc)));
        let input = || egui::RawInput {
            screen_rect: Some(egui::Rect::from_min_size(
                egui::Pos2::ZERO,
                egui::vec2(1400.0, 900.0),
            )),
            ..Default::default()
        };
        let started = Instant::now();
        let mut announced = false;
        while started.elapsed() < Duration::from_secs(120) {
            let mut out = ctx.run_ui(input(), |ui| app.frame(ui));
            out.textures_delta.clear();
            if !announced && app.autosave_written() {
                use std::io::Write as _;
                let path = app.autosave_path().unwrap_or_default();
                let mut stdout = std::io::stdout();
                writeln!(stdout, "autosaved {}", path.display()).ok();
                stdout.flush().ok();
                announced = true;
            }
            std::thread::sleep(Duration::from_millis(20));
        }
        Err("the self-test was not killed within 120 s".to_owned())
    };
    Some(match run() {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("leafwind: {e}");
            ExitCode::FAILURE
        }
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn dir(name: &str) -> PathBuf {
        std::env::temp_dir().join(format!("leafwind-autosave-{}-{name}", std::process::id()))
    }

    #[test]
    fn writes_after_the_delay_and_removes_when_clean() {
        let d = dir("tick");
        let mut a = Autosave::new(d.clone(), Duration::from_secs(5));
        let t0 = Instant::now();
        let mut doc = ScenarioDocument::default();
        doc.case.air.temp_c = 33.0;
        // Just changed: not yet, due in 5 s.
        let due = a.tick(&doc, true, None, t0).unwrap();
        assert_eq!(due, Some(Duration::from_secs(5)));
        assert!(!a.path().exists());
        let due = a
            .tick(&doc, true, None, t0 + Duration::from_secs(5))
            .unwrap();
        assert_eq!(due, None);
        let back = read_autosave(&std::fs::read_to_string(a.path()).unwrap()).unwrap();
        assert_eq!(back.document, doc);
        // Saved (not dirty any more): removed.
        a.tick(&doc, false, None, t0 + Duration::from_secs(6))
            .unwrap();
        assert!(!a.path().exists());
        std::fs::remove_dir_all(d).ok();
    }

    #[test]
    fn continuous_edits_are_autosaved_within_the_longest_wait() {
        let d = dir("max-wait");
        let mut a = Autosave::new(d.clone(), Duration::from_secs(5));
        let t0 = Instant::now();
        let mut doc = ScenarioDocument::default();
        for s in 0..=30u32 {
            doc.case.air.temp_c = 20.0 + f64::from(s) * 0.1;
            a.tick(&doc, true, None, t0 + Duration::from_secs(u64::from(s)))
                .unwrap();
        }
        assert!(a.path().exists());
        std::fs::remove_dir_all(d).ok();
    }

    #[test]
    fn garbage_autosave_is_an_error_not_a_panic() {
        for text in ["", "(", "AutosaveFile(written_unix_s: -1)", "\u{feff}[]"] {
            assert!(read_autosave(text).is_err(), "{text:?}");
        }
    }
}

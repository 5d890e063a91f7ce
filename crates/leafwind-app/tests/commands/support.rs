//! Helpers shared by the command-line tests: a scratch folder, a scenario written into it, and
//! a command's JSON output parsed.

use std::path::{Path, PathBuf};

use leafwind_app::document::ScenarioDocument;

/// A fresh scratch folder for one test (`kind`, `name` and the process id make it unique).
pub fn temp_dir(kind: &str, name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("leafwind-{kind}-{name}-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// Writes `doc` as `scenario.ron` into `dir` and returns its path.
pub fn write(doc: &ScenarioDocument, dir: &Path) -> PathBuf {
    let path = dir.join("scenario.ron");
    std::fs::write(&path, doc.to_ron().unwrap()).unwrap();
    path
}

/// A command's JSON output parsed, after checking that no "NaN" or "inf" was written.
pub fn parse_json(out: Vec<u8>) -> serde_json::Value {
    let text = String::from_utf8(out).unwrap();
    assert!(!text.contains("NaN") && !text.contains("inf"), "{text}");
    serde_json::from_str(&text).unwrap()
}

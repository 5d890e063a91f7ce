//! Fuzzing the scenario loader (proptest): arbitrary bytes, and the shipped scenarios with one
//! mutation each (a field dropped, renamed or duplicated; a number replaced by NaN, ±inf, a huge
//! value or text; a bracket removed; the text cut at a random point; a byte-order mark and
//! Windows line ends). The loader never panics, every parse error carries a line and column
//! inside the text, a document that loads holds only finite numbers, and the mutations that keep
//! a file valid load. Invariants, common practice, no source.
//!
//! The default is a few hundred cases per property (seconds); `PROPTEST_CASES=10000` runs more.
//! A failing input is written by proptest to `fuzz_scenarios.proptest-regressions` beside this
//! file, to be committed and kept as a regression case.

use leafwind_app::document::{EXAMPLES, LoadError, ScenarioDocument};
use leafwind_app::file_safety::validate_document;
use proptest::prelude::*;

fn cases() -> u32 {
    std::env::var("PROPTEST_CASES")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(256)
}

fn config() -> ProptestConfig {
    ProptestConfig {
        cases: cases(),
        ..ProptestConfig::default()
    }
}

/// The outcome is well formed: a parse error points inside the text (1-based line and column),
/// a range error names a path, and a loaded document has no non-finite number anywhere.
fn check_outcome(text: &str, r: &Result<ScenarioDocument, LoadError>) -> Result<(), TestCaseError> {
    match r {
        Err(LoadError::Parse { line, col, message }) => {
            let lines = text.split('\n').count();
            prop_assert!(*line >= 1 && *col >= 1, "{line}:{col} {message}");
            prop_assert!(*line <= lines + 1, "line {line} of {lines}: {message}");
            prop_assert!(!message.is_empty());
        }
        Err(LoadError::Invalid { path, message }) => {
            prop_assert!(!path.is_empty() && !message.is_empty());
        }
        Err(LoadError::Version(v)) => prop_assert!(*v > 1),
        Err(LoadError::Io(e)) => prop_assert!(false, "no I/O from text: {e}"),
        Ok(doc) => {
            // Every value in range and finite, wherever it is.
            prop_assert!(
                validate_document(doc).is_ok(),
                "{:?}",
                validate_document(doc)
            );
            let again = doc.to_ron().unwrap();
            // What loads, saves and loads again to the same document.
            prop_assert_eq!(&ScenarioDocument::from_ron(&again).unwrap(), doc);
        }
    }
    Ok(())
}

/// Lines that hold a whole `name: value,` field (value on the same line).
fn single_line_fields(text: &str) -> Vec<usize> {
    text.lines()
        .enumerate()
        .filter(|(_, l)| {
            let t = l.trim_start();
            let name_len = t
                .chars()
                .take_while(|c| c.is_ascii_alphanumeric() || *c == '_')
                .count();
            name_len > 0
                && t[name_len..].starts_with(": ")
                && t.ends_with(',')
                && !t.ends_with("(,")
                && t.matches('(').count() == t.matches(')').count()
                && t.matches('[').count() == t.matches(']').count()
        })
        .map(|(i, _)| i)
        .collect()
}

/// Byte ranges of the numbers in the text (not part of a name).
fn numbers(text: &str) -> Vec<(usize, usize)> {
    let b = text.as_bytes();
    let mut v = Vec::new();
    let mut i = 0;
    while i < b.len() {
        let starts = b[i].is_ascii_digit()
            && (i == 0
                || !(b[i - 1].is_ascii_alphanumeric() || b[i - 1] == b'_' || b[i - 1] == b'.'));
        if starts {
            let s = if i > 0 && b[i - 1] == b'-' { i - 1 } else { i };
            let mut e = i;
            while e < b.len() && (b[e].is_ascii_digit() || b[e] == b'.' || b[e] == b'e') {
                e += 1;
            }
            v.push((s, e));
            i = e;
        } else {
            i += 1;
        }
    }
    v
}

fn lines_without(text: &str, skip: usize) -> String {
    text.lines()
        .enumerate()
        .filter(|(i, _)| *i != skip)
        .map(|(_, l)| l)
        .collect::<Vec<_>>()
        .join("\n")
}

fn lines_with_duplicate(text: &str, dup: usize) -> String {
    let mut out = Vec::new();
    for (i, l) in text.lines().enumerate() {
        out.push(l);
        if i == dup {
            out.push(l);
        }
    }
    out.join("\n")
}

const REPLACEMENTS: [&str; 9] = [
    "NaN", "inf", "-inf", "1e308", "1e999", "-1e308", "\"text\"", "-0.0", "0x1F",
];

/// Top-level fields that may be left out (they take defaults, or the version migrates).
const OPTIONAL_TOP_LEVEL: [&str; 4] = ["version", "notes", "altitude_m", "extra_sizes_m"];

proptest! {
    #![proptest_config(config())]

    #[test]
    fn arbitrary_bytes_never_panic(bytes in proptest::collection::vec(any::<u8>(), 0..512)) {
        let text = String::from_utf8_lossy(&bytes);
        let r = ScenarioDocument::from_ron(&text);
        check_outcome(&text, &r)?;
        prop_assert!(r.is_err() || text.contains("ScenarioDocument") || text.contains('('));
    }

    #[test]
    fn ron_like_noise_never_panics(text in "[A-Za-z_:(),\\[\\]\" 0-9.\\-\n]{0,300}") {
        let r = ScenarioDocument::from_ron(&text);
        check_outcome(&text, &r)?;
    }

    #[test]
    fn a_dropped_field(ex in 0..EXAMPLES.len(), pick in any::<prop::sample::Index>()) {
        let text = EXAMPLES[ex].1;
        let lines = single_line_fields(text);
        let i = pick.index(lines.len());
        let line = text.lines().nth(lines[i]).unwrap();
        let mutated = lines_without(text, lines[i]);
        let r = ScenarioDocument::from_ron(&mutated);
        check_outcome(&mutated, &r)?;
        let top = line.starts_with("    ") && !line.starts_with("     ");
        if top && OPTIONAL_TOP_LEVEL.iter().any(|n| line.trim_start().starts_with(&format!("{n}:"))) {
            prop_assert!(r.is_ok(), "dropping {line:?}: {r:?}");
        }
    }

    #[test]
    fn a_renamed_field(ex in 0..EXAMPLES.len(), pick in any::<prop::sample::Index>()) {
        let text = EXAMPLES[ex].1;
        let lines = single_line_fields(text);
        let n = lines[pick.index(lines.len())];
        let mutated: String = text
            .lines()
            .enumerate()
            .map(|(i, l)| if i == n { l.replacen(':', "_x:", 1) } else { l.to_owned() })
            .collect::<Vec<_>>()
            .join("\n");
        let r = ScenarioDocument::from_ron(&mutated);
        check_outcome(&mutated, &r)?;
        match r {
            Err(LoadError::Parse { line, message, .. }) => {
                prop_assert_eq!(line, n + 1, "{}", message);
                prop_assert!(message.contains("_x"), "{}", message);
            }
            other => prop_assert!(false, "{other:?}"),
        }
    }

    #[test]
    fn a_duplicated_field(ex in 0..EXAMPLES.len(), pick in any::<prop::sample::Index>()) {
        let text = EXAMPLES[ex].1;
        let lines = single_line_fields(text);
        let n = lines[pick.index(lines.len())];
        let mutated = lines_with_duplicate(text, n);
        let r = ScenarioDocument::from_ron(&mutated);
        check_outcome(&mutated, &r)?;
        match r {
            Err(LoadError::Parse { line, message, .. }) => {
                prop_assert!(message.to_lowercase().contains("duplicate"), "{}", message);
                prop_assert!(line == n + 1 || line == n + 2, "line {} for {}", line, n + 1);
            }
            other => prop_assert!(false, "a duplicate loaded: {other:?}"),
        }
    }

    #[test]
    fn a_number_replaced(ex in 0..EXAMPLES.len(), pick in any::<prop::sample::Index>(), k in 0..REPLACEMENTS.len()) {
        let text = EXAMPLES[ex].1;
        let nums = numbers(text);
        let (s, e) = nums[pick.index(nums.len())];
        let mutated = format!("{}{}{}", &text[..s], REPLACEMENTS[k], &text[e..]);
        let r = ScenarioDocument::from_ron(&mutated);
        check_outcome(&mutated, &r)?;
    }

    #[test]
    fn a_bracket_removed(ex in 0..EXAMPLES.len(), pick in any::<prop::sample::Index>()) {
        let text = EXAMPLES[ex].1;
        let at: Vec<usize> = text
            .char_indices()
            .filter(|(_, c)| matches!(c, '(' | ')' | '[' | ']'))
            .map(|(i, _)| i)
            .collect();
        let i = at[pick.index(at.len())];
        let mutated = format!("{}{}", &text[..i], &text[i + 1..]);
        let r = ScenarioDocument::from_ron(&mutated);
        check_outcome(&mutated, &r)?;
    }

    #[test]
    fn a_truncated_file(ex in 0..EXAMPLES.len(), pick in any::<prop::sample::Index>()) {
        let text = EXAMPLES[ex].1;
        let mut n = pick.index(text.len());
        while !text.is_char_boundary(n) {
            n -= 1;
        }
        let mutated = &text[..n];
        let r = ScenarioDocument::from_ron(mutated);
        check_outcome(mutated, &r)?;
        // Only a cut after the document's closing bracket can still load.
        let end = text.trim_end().len();
        prop_assert!(r.is_err() || n >= end, "cut at {n} of {end} loaded");
    }

    #[test]
    fn bom_and_crlf_load_the_same(ex in 0..EXAMPLES.len(), bom in any::<bool>(), crlf in any::<bool>()) {
        let text = EXAMPLES[ex].1;
        let mut mutated = if crlf { text.replace('\n', "\r\n") } else { text.to_owned() };
        if bom {
            mutated.insert(0, '\u{feff}');
        }
        prop_assert_eq!(
            ScenarioDocument::from_ron(&mutated).unwrap(),
            ScenarioDocument::from_ron(text).unwrap()
        );
    }
}

//! Shared helpers of the window tests (a module of the `window` test binary;
//! `crash_recovery.rs` includes it by path).

#![allow(dead_code)]

use egui::accesskit::Role;
use egui_kittest::Harness;
use egui_kittest::kittest::{NodeT as _, Queryable};
use leafwind_app::document::ScenarioDocument;
use leafwind_app::gui::LeafwindApp;

/// A harness tall enough that every input is on screen (and so in the accessibility tree).
pub fn harness(doc: ScenarioDocument) -> Harness<'static, LeafwindApp> {
    let mut h = Harness::builder()
        .with_size(egui::vec2(1500.0, 3200.0))
        .with_max_steps(40)
        .build_ui_state(
            |ui, app: &mut LeafwindApp| app.frame(ui),
            LeafwindApp::new_for_test(doc),
        );
    h.run();
    h
}

/// Whether `s` shows a negative zero ("-0.0", "-0 K", "−0.0"…).
fn negative_zero(s: &str) -> bool {
    let chars: Vec<char> = s.chars().collect();
    chars.windows(2).enumerate().any(|(i, w)| {
        (w[0] == '-' || w[0] == '−')
            && w[1] == '0'
            && (i == 0 || !chars[i - 1].is_alphanumeric())
            && {
                // the number after the sign is all zeros
                let rest: String = chars[i + 1..]
                    .iter()
                    .take_while(|c| c.is_ascii_digit() || **c == '.')
                    .collect();
                rest.chars().all(|c| c == '0' || c == '.')
            }
    })
}

/// Every label and value in the tree that shows a non-finite number or a negative zero.
pub fn non_finite_texts(h: &Harness<'_, LeafwindApp>) -> Vec<String> {
    let bad = |s: &str| {
        s.contains("NaN")
            || s.contains("inf") && !s.contains("info")
            || s.contains("∞")
            || negative_zero(s)
    };
    h.query_all_by(move |n| {
        n.label().is_some_and(|l| bad(&l)) || n.value().is_some_and(|v| bad(&v))
    })
    .map(|n| {
        let a = n.accesskit_node();
        format!("{:?}: {:?} / {:?}", a.role(), a.label(), a.value())
    })
    .collect()
}

/// Sets a slider by its accessible label and runs the frames that follow.
pub fn set_slider(h: &mut Harness<'_, LeafwindApp>, label: &str, value: f64) {
    h.get_by_role_and_label(Role::Slider, label)
        .set_value_accesskit(value);
    h.run();
}

/// Whether some text in the tree contains `needle`.
pub fn has_text(h: &Harness<'_, LeafwindApp>, needle: &str) -> bool {
    h.query_all_by_label_contains(needle).next().is_some()
}

/// Fails with the offending texts if any NaN or infinity is on screen.
pub fn assert_no_non_finite(h: &Harness<'_, LeafwindApp>) {
    let bad = non_finite_texts(h);
    assert!(bad.is_empty(), "{bad:?}");
}

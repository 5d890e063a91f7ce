//! The window never waits for the heavy results: the first frame returns before the sweep, map
//! and boundary layer are ready, the last valid results stay while new ones compute, and they
//! all arrive without any further input.

use std::time::{Duration, Instant};

use leafwind_app::document::ScenarioDocument;
use leafwind_app::gui::LeafwindApp;
use leafwind_app::gui::commands::Command;
use leafwind_app::gui::prefs::PlotTab;

fn input() -> egui::RawInput {
    egui::RawInput {
        screen_rect: Some(egui::Rect::from_min_size(
            egui::Pos2::ZERO,
            egui::vec2(1400.0, 900.0),
        )),
        ..Default::default()
    }
}

/// One frame; the texture uploads (the map picture) are acknowledged, as a renderer would.
fn step(ctx: &egui::Context, app: &mut LeafwindApp) {
    let mut out = ctx.run_ui(input(), |ui| app.frame(ui));
    out.textures_delta.clear();
}

fn until_current(ctx: &egui::Context, app: &mut LeafwindApp) -> Duration {
    let t0 = Instant::now();
    while !app.results_current() && t0.elapsed() < Duration::from_secs(60) {
        step(ctx, app);
        std::thread::sleep(Duration::from_millis(2));
    }
    t0.elapsed()
}

#[test]
fn heavy_results_arrive_in_the_background() {
    let ctx = egui::Context::default();
    let mut app = LeafwindApp::new_headless(ScenarioDocument::default());
    app.set_tab(PlotTab::Map);
    step(&ctx, &mut app);
    // The single leaf is solved in the frame (that the heavy jobs do not block the frame is
    // checked with a deliberately slow job in the worker's own tests).
    assert!(app.result().is_some());
    until_current(&ctx, &mut app);
    assert!(app.results_current());

    // An edit: the leaf follows at once, the heavy results follow in the background.
    let mut doc = app.document().clone();
    doc.case.air.speed_m_s = 1.5;
    app.push_command(Command::Edit(Box::new(doc)));
    step(&ctx, &mut app);
    assert!((app.result().unwrap().case.air.speed_m_s - 1.5).abs() < 1e-12);
    until_current(&ctx, &mut app);
    assert!(app.results_current());
}

#[test]
fn invalid_input_keeps_the_last_results() {
    let ctx = egui::Context::default();
    let mut app = LeafwindApp::new_headless(ScenarioDocument::default());
    until_current(&ctx, &mut app);
    let before = app.result().unwrap().clone();
    let mut doc = app.document().clone();
    doc.case.leaf.dimension_m = 5.0; // beyond the engine's 1 m
    app.push_command(Command::Edit(Box::new(doc)));
    for _ in 0..5 {
        step(&ctx, &mut app);
    }
    assert!(app.input_error().is_some());
    assert_eq!(app.result(), Some(&before));
}

//! How long one frame of the whole window takes on the UI thread (layout and widgets, no GPU):
//! an idle frame, and a frame in which an input changes as when a slider is dragged (the single
//! leaf is re-solved in the frame; sweep, map and boundary layer go to background jobs).
//! Figures to record, never timed assertions.

use criterion::{Criterion, criterion_group, criterion_main};
use leafwind_app::document::first_example;
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

/// One frame; the texture uploads are acknowledged, as a renderer would.
fn step(ctx: &egui::Context, app: &mut LeafwindApp) {
    let mut out = ctx.run_ui(input(), |ui| app.frame(ui));
    out.textures_delta.clear();
}

fn bench_frame(c: &mut Criterion) {
    for (name, tab) in [
        ("sweep", PlotTab::Sweep),
        ("map", PlotTab::Map),
        ("boundary", PlotTab::BoundaryLayer),
    ] {
        let ctx = egui::Context::default();
        let mut app = LeafwindApp::new_headless(first_example());
        app.set_tab(tab);
        // Let the background results arrive.
        for _ in 0..200 {
            step(&ctx, &mut app);
            if app.results_current() {
                break;
            }
            std::thread::sleep(std::time::Duration::from_millis(5));
        }
        c.bench_function(&format!("idle frame, {name} tab"), |b| {
            b.iter(|| step(&ctx, &mut app));
        });
        let mut doc = app.document().clone();
        let mut n = 0u32;
        c.bench_function(&format!("dragging air temperature, {name} tab"), |b| {
            b.iter(|| {
                n += 1;
                doc.case.air.temp_c = 30.0 + f64::from(n % 100) * 0.02;
                app.push_command(Command::Edit(Box::new(doc.clone())));
                step(&ctx, &mut app);
            });
        });
    }
}

criterion_group!(benches, bench_frame);
criterion_main!(benches);

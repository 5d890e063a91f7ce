//! How long the wind × size map takes to recompute (goal: ≤ 8 ms for 256 × 256 on 2 cores).
//! Figures to record, never timed assertions.

use criterion::{Criterion, criterion_group, criterion_main};
use leafwind_app::document::{ScenarioDocument, first_example};
use leafwind_app::gui::compute::{MapInput, PREVIEW_CELLS, compute_map, solve_map_grid};

fn bench_map(c: &mut Criterion) {
    let doc = ScenarioDocument::default();
    let axes = doc.map.axes();
    c.bench_function("map 256x256 solve only (rayon rows)", |b| {
        b.iter(|| solve_map_grid(&doc.case, &axes).map(|g| g.2.len()));
    });
    for (name, d) in [
        ("default", ScenarioDocument::default()),
        ("glasshouse", first_example()),
    ] {
        // A new air temperature each time: no cached grid, as when a slider moves.
        let mut n = 0u32;
        let base = MapInput::of(&d);
        c.bench_function(&format!("map 256x256 full recompute, {name}"), |b| {
            b.iter(|| {
                n += 1;
                let mut input = base.clone();
                input.case.air.temp_c += f64::from(n % 1000) * 1e-4;
                compute_map(&input).map(|m| m.serial)
            });
        });
        let mut n = 0u32;
        c.bench_function(&format!("map 64x64 preview recompute, {name}"), |b| {
            b.iter(|| {
                n += 1;
                let mut input = base.clone().with_cells(PREVIEW_CELLS);
                input.case.air.temp_c += f64::from(n % 1000) * 1e-4;
                compute_map(&input).map(|m| m.serial)
            });
        });
        // Only the limit changes: the grid is reused, the picture and limit lines are redrawn.
        let mut n = 0u32;
        c.bench_function(
            &format!("map 256x256 redraw for a new limit, {name}"),
            |b| {
                b.iter(|| {
                    n += 1;
                    let mut input = base.clone();
                    input.limit_c += f64::from(n % 100) * 0.01;
                    compute_map(&input).map(|m| m.serial)
                });
            },
        );
    }
}

criterion_group!(benches, bench_map);
criterion_main!(benches);

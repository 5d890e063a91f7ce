//! Speed of the engine: one exact leaf solve, one linearised evaluation, and a 256 × 256
//! air speed × leaf size grid on one thread. Targets and measured figures: DEVELOPERS.md.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use leafwind_physics::energy_balance::PreparedLeaf;
use leafwind_physics::{LeafCase, grid};

fn bench_solve(c: &mut Criterion) {
    let case = LeafCase::default();
    let prepared = PreparedLeaf::new(&case).expect("valid default case");
    c.bench_function("exact leaf solve", |b| {
        b.iter(|| black_box(&prepared).solve_exact().expect("solves"))
    });
    c.bench_function("linearised leaf evaluation", |b| {
        b.iter(|| black_box(&prepared).linearised())
    });
    c.bench_function("exact solve incl. validation", |b| {
        b.iter(|| leafwind_physics::leaf_temp_c(black_box(&case)).expect("solves"))
    });
    let axes = grid::GridAxes::default_map();
    let mut group = c.benchmark_group("grid");
    group.sample_size(20);
    group.bench_function("256 x 256 wind x leaf size, one thread", |b| {
        b.iter(|| grid::leaf_temp_grid(black_box(&case), &axes).expect("solves"))
    });
    group.finish();
}

criterion_group!(benches, bench_solve);
criterion_main!(benches);

//! Speed of the canopy engine: one 20-layer canopy solve, one greenhouse balance and the least
//! ventilation search over it, and a year of hourly weather (8760 hours,
//! invented clear-sky design days) over a 20-layer open-field canopy — on all cores through
//! `design_day::run_hours` and on one thread. Target: the year in ≤ 0.5 s. Figures: DEVELOPERS.md.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use leafwind_physics::canopy::{CanopyCase, CanopyOptics, solve_canopy};
use leafwind_physics::design_day::{
    DayHumidity, DesignDay, DiurnalShape, HourWeather, SeriesCase, design_day_weather,
    evaluate_hour, run_hours,
};
use leafwind_physics::greenhouse::{GreenhouseCase, solve_greenhouse};
use leafwind_physics::sun::{DateTime, days_in_month};
use leafwind_physics::ventilation::{VentilationTarget, least_ventilation};

/// An invented year: one design day per date, warmest in July.
fn invented_year(case: &SeriesCase) -> Vec<HourWeather> {
    let mut hours = Vec::with_capacity(8760);
    let mut doy = 0.0;
    for month in 1..=12 {
        for day in 1..=days_in_month(2026, month) {
            let season = (2.0 * std::f64::consts::PI * (doy - 200.0) / 365.0).cos();
            doy += 1.0;
            let d = DesignDay {
                date: DateTime::date(2026, month, day),
                max_temp_c: 22.0 + 10.0 * season,
                min_temp_c: 10.0 + 8.0 * season,
                humidity: DayHumidity::MinRhPct(40.0),
                shape: DiurnalShape::Ashrae2009,
                wind_m_s: 1.5,
                pressure_kpa: None,
            };
            hours.extend(design_day_weather(&d, &case.site).expect("valid invented day"));
        }
    }
    hours
}

fn bench_canopy(c: &mut Criterion) {
    let case = CanopyCase::default();
    c.bench_function("canopy, 20 layers, one solve", |b| {
        b.iter(|| solve_canopy(black_box(&case)).expect("solves"))
    });
    let house = GreenhouseCase::default();
    c.bench_function("greenhouse balance, 20 layers, one solve", |b| {
        b.iter(|| solve_greenhouse(black_box(&house)).expect("solves"))
    });
    c.bench_function("least ventilation for a 4 K rise, 20 layers", |b| {
        b.iter(|| {
            least_ventilation(
                black_box(&house),
                VentilationTarget::InsideRise { rise_k: 4.0 },
            )
            .expect("solves")
        })
    });
    let series = SeriesCase::default();
    assert_eq!(series.structure.layers, 20);
    let year = invented_year(&series);
    assert_eq!(year.len(), 8760);
    let mut group = c.benchmark_group("year");
    group.sample_size(10);
    group.bench_function("8760 h x 20 layers, open field, all cores", |b| {
        b.iter(|| run_hours(black_box(&series), black_box(&year)).expect("runs"))
    });
    let optics = CanopyOptics::new(&series.structure, series.leaf.absorptivity);
    group.bench_function("8760 h x 20 layers, open field, one thread", |b| {
        b.iter(|| {
            year.iter()
                .map(|w| evaluate_hour(&series, &optics, w).expect("solves"))
                .collect::<Vec<_>>()
        })
    });
    group.finish();
}

criterion_group!(benches, bench_canopy);
criterion_main!(benches);

//! Energy closure over the whole valid domain: draws random valid single-leaf cases, solves each
//! with [`solve_leaf`], and counts every non-finite result, every residual of 10⁻⁶ W m⁻² or more
//! (as the solver reports it and as recomputed here from the balance terms), and every valid case
//! the engine rejects. Every 10th case the balance is also scanned over the whole search for a
//! second root (the engine relies on the root being unique); every 100th case also asks
//! [`required_wind`] and re-checks its answer against fresh solves.
//!
//! Failures are counted by kind: an error for a valid case (with where the balance really
//! changes sign, if beyond the search), a non-finite number, a residual that cannot reach
//! 10⁻⁶ W m⁻² at f64 resolution of T_L (the root is bracketed within a few ulp but the residual's
//! slope there is 10⁶–10¹⁰ W m⁻² K⁻¹), any other closure failure, a second root, and a
//! required-wind answer that does not hold.
//!
//! ```text
//! cargo run --release -p leafwind-physics --example closure_check -- [N] [SEED] [FIRST]
//! ```
//!
//! - `N`: number of cases (default 1 000 000); `SEED`: random seed (default 1); `FIRST`: index of
//!   the first case (default 0). Case `i` of a seed is always the same case whatever `N` and the
//!   number of threads, so a failure reported as `case i` is rerun alone with `-- 1 SEED i`.
//! - Prints one summary line; exits with status 1 on any failure (the first few solve and
//!   required-wind failures are printed in full to stderr), 2 on bad arguments.
//!
//! Every input is drawn from its own `ValidRange` constant of the engine, with each exact range end
//! taken with probability [`END_PROBABILITY`], a log-uniform draw toward the low end of ranges that
//! span decades, and a uniform draw otherwise. Humidity comes as relative humidity, dew point or
//! deficit; the upper face sees a clear sky, a given sky or a cover; the ground is at air
//! temperature or given; the free-convection length is the square leaf's d/4 or given.
//!
//! The 10⁻⁶ W m⁻² closure is the engine's promise ([`RESIDUAL_TOLERANCE_W_M2`] is ten times
//! tighter); the required-wind checks follow the method's own statement (common practice, no
//! source): at the answer the target is met, 5 % below it is not.

use std::process::ExitCode;
use std::time::Instant;

use leafwind_physics::air::{
    AIR_TEMP_RANGE_C, PRESSURE_RANGE_KPA, RELATIVE_HUMIDITY_RANGE_PCT, molar_latent_heat_j_mol,
    saturation_vapour_pressure_kpa,
};
use leafwind_physics::case::{
    AIR_SPEED_RANGE_M_S, FREE_CONVECTION_LENGTH_RANGE_M, LEAF_DIMENSION_RANGE_M,
};
use leafwind_physics::constants::ZERO_CELSIUS_K;
use leafwind_physics::convection::{CRITICAL_REYNOLDS_RANGE, TURBULENCE_FACTOR_RANGE};
use leafwind_physics::energy_balance::{
    NEAR_STILL_AIR_M_S, PreparedLeaf, RESIDUAL_TOLERANCE_W_M2, SEARCH_HALF_WIDTH_K,
};
use leafwind_physics::error::ValidRange;
use leafwind_physics::radiation::{
    ABSORPTIVITY_RANGE, ALBEDO_RANGE, EMISSIVITY_RANGE, SHORTWAVE_RANGE_W_M2, SURFACE_TEMP_RANGE_C,
    emitted_longwave_w_m2,
};
use leafwind_physics::required_wind::{LIMIT_RANGE_C, MARGIN_RANGE_K, Unreachable};
use leafwind_physics::transpiration::{
    CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S, LOWER_SHARE_RANGE, STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S,
    transpiration_mol_m2_s,
};
use leafwind_physics::{
    Air, Humidity, Leaf, LeafCase, LeafSolution, Surroundings, UpperView, WindAnswer, leaf_temp_c,
    required_wind, solve_leaf,
};
use rand::rngs::Xoshiro256PlusPlus;
use rand::{RngExt, SeedableRng};

/// Default number of cases.
const DEFAULT_CASES: u64 = 1_000_000;

/// The closure the engine promises \[W m⁻²\].
const CLOSURE_LIMIT_W_M2: f64 = 1e-6;

/// Probability of taking each exact end of a range.
const END_PROBABILITY: f64 = 0.03;

/// Probability of a log-uniform draw (toward the low end) for a range spanning decades.
const LOG_PROBABILITY: f64 = 0.2;

/// Every this many cases the balance is also scanned for a second root.
const UNIQUE_EVERY: u64 = 10;

/// In still air, sign changes within this leaf − air difference \[K\] are the documented degenerate
/// root at the air temperature.
const DEGENERATE_K: f64 = 1e-6;

/// Every this many cases also runs `required_wind`.
const WIND_EVERY: u64 = 100;

/// Below this answer \[m s⁻¹\] the "5 % less does not meet it" check is skipped: 5 % of it is
/// within a few bisection tolerances (10⁻⁶ m s⁻¹) of the answer.
const TINY_SPEED_M_S: f64 = 1e-4;

/// Failures printed in full.
const SHOWN_FAILURES: usize = 10;

/// The search maxima `required_wind` accepts \[m s⁻¹\] (as it builds its check: 0.1 up to the top
/// of [`AIR_SPEED_RANGE_M_S`]).
const SEARCH_MAX_RANGE_M_S: ValidRange = ValidRange {
    quantity: "air speed search maximum",
    min: 0.1,
    ..AIR_SPEED_RANGE_M_S
};

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let parse = |i: usize, default: u64| -> Result<u64, String> {
        args.get(i).map_or(Ok(default), |a| {
            a.replace(['_', ' '], "")
                .parse()
                .map_err(|_| format!("argument {} ({a:?}) is not a whole number", i + 1))
        })
    };
    let (cases, seed, first) = match (parse(0, DEFAULT_CASES), parse(1, 1), parse(2, 0)) {
        (Ok(n), Ok(s), Ok(f)) if args.len() <= 3 => (n, s, f),
        (Err(e), _, _) | (_, Err(e), _) | (_, _, Err(e)) => return usage(&e),
        _ => return usage("too many arguments"),
    };
    let started = Instant::now();
    let threads = std::thread::available_parallelism()
        .map_or(1, std::num::NonZero::get)
        .min(usize::try_from(cases.div_ceil(10_000)).unwrap_or(usize::MAX))
        .max(1) as u64;
    let per = cases.div_ceil(threads);
    let stats = std::thread::scope(|s| {
        let handles: Vec<_> = (0..threads)
            .map(|k| {
                let lo = first + k * per;
                let hi = first + ((k + 1) * per).min(cases);
                s.spawn(move || run(seed, lo..hi))
            })
            .collect();
        handles
            .into_iter()
            .map(|h| h.join().expect("a worker thread panicked"))
            .fold(Stats::default(), Stats::merge)
    });
    let secs = started.elapsed().as_secs_f64();
    for f in stats.shown.iter().chain(&stats.shown_wind) {
        eprintln!("{f}");
    }
    println!(
        "closure_check: {} cases ({} with required_wind), {} failures ({} solve: {} error, {} non-finite, \
         {} residual at f64 resolution, {} closure, {} of {} scanned with a second root; \
         {} required_wind), worst |residual| {:.1e} W/m², worst recomputed closure {:.1e} W/m², most iterations {}, \
         wind answers {}/{}/{} speed/not needed/unreachable, {:.2} s ({:.0} cases/s, {} threads), seed {seed}",
        stats.cases,
        stats.wind_cases,
        stats.failures(),
        stats.solve_failures,
        stats.errors,
        stats.non_finite,
        stats.resolution,
        stats.closure,
        stats.not_unique,
        stats.unique_scans,
        stats.wind_failures,
        stats.worst_residual_w_m2,
        stats.worst_closure_w_m2,
        stats.most_iterations,
        stats.wind_speed,
        stats.wind_not_needed,
        stats.wind_unreachable,
        secs,
        stats.cases as f64 / secs,
        threads,
    );
    if stats.failures() == 0 {
        ExitCode::SUCCESS
    } else {
        ExitCode::FAILURE
    }
}

fn usage(why: &str) -> ExitCode {
    eprintln!("closure_check: {why}\nusage: closure_check [N] [SEED] [FIRST]");
    ExitCode::from(2)
}

/// What went wrong with one solve.
enum Failure {
    /// `solve_leaf` returned an error for a valid case (rejection or no bracket).
    Error(String),
    /// A number of the solution is NaN or infinite.
    NonFinite(String),
    /// |residual| ≥ 10⁻⁶ W m⁻², though the root is bracketed within a few ulps of the answer: the
    /// residual's slope there exceeds what f64 resolution of T_L allows.
    Resolution(String),
    /// |residual| or the recomputed closure ≥ 10⁻⁶ W m⁻² otherwise.
    Closure(String),
    /// The balance has another root than the answer within the search (the engine promises a
    /// unique root, so that the answer does not depend on the starting guess).
    NotUnique(String),
}

/// Counts and worst values of one run.
#[derive(Default)]
struct Stats {
    cases: u64,
    solve_failures: u64,
    errors: u64,
    non_finite: u64,
    resolution: u64,
    closure: u64,
    not_unique: u64,
    unique_scans: u64,
    wind_cases: u64,
    wind_failures: u64,
    wind_speed: u64,
    wind_not_needed: u64,
    wind_unreachable: u64,
    worst_residual_w_m2: f64,
    worst_closure_w_m2: f64,
    most_iterations: u32,
    shown: Vec<String>,
    shown_wind: Vec<String>,
}

impl Stats {
    fn failures(&self) -> u64 {
        self.solve_failures + self.wind_failures
    }

    fn merge(mut self, other: Self) -> Self {
        self.cases += other.cases;
        self.solve_failures += other.solve_failures;
        self.errors += other.errors;
        self.non_finite += other.non_finite;
        self.resolution += other.resolution;
        self.closure += other.closure;
        self.not_unique += other.not_unique;
        self.unique_scans += other.unique_scans;
        self.wind_cases += other.wind_cases;
        self.wind_failures += other.wind_failures;
        self.wind_speed += other.wind_speed;
        self.wind_not_needed += other.wind_not_needed;
        self.wind_unreachable += other.wind_unreachable;
        self.worst_residual_w_m2 = self.worst_residual_w_m2.max(other.worst_residual_w_m2);
        self.worst_closure_w_m2 = self.worst_closure_w_m2.max(other.worst_closure_w_m2);
        self.most_iterations = self.most_iterations.max(other.most_iterations);
        self.shown.extend(other.shown);
        self.shown.truncate(SHOWN_FAILURES);
        self.shown_wind.extend(other.shown_wind);
        self.shown_wind.truncate(SHOWN_FAILURES);
        self
    }

    fn show(&mut self, text: String) {
        if self.shown.len() < SHOWN_FAILURES {
            self.shown.push(text);
        }
    }

    fn show_wind(&mut self, text: String) {
        if self.shown_wind.len() < SHOWN_FAILURES {
            self.shown_wind.push(text);
        }
    }
}

/// SplitMix64's output function: decorrelates the seed from the case index.
fn mix(mut z: u64) -> u64 {
    z = z.wrapping_add(0x9E37_79B9_7F4A_7C15);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

fn run(seed: u64, indices: std::ops::Range<u64>) -> Stats {
    let mut stats = Stats::default();
    let base = mix(seed);
    for i in indices {
        let mut rng = Xoshiro256PlusPlus::seed_from_u64(base ^ i);
        let case = random_case(&mut rng);
        stats.cases += 1;
        let scan = i % UNIQUE_EVERY == 0;
        if let Err(failure) = check_solve(&case, scan, &mut stats) {
            stats.solve_failures += 1;
            let why = match failure {
                Failure::Error(w) => {
                    stats.errors += 1;
                    w
                }
                Failure::NonFinite(w) => {
                    stats.non_finite += 1;
                    w
                }
                Failure::Resolution(w) => {
                    stats.resolution += 1;
                    w
                }
                Failure::Closure(w) => {
                    stats.closure += 1;
                    w
                }
                Failure::NotUnique(w) => {
                    stats.not_unique += 1;
                    w
                }
            };
            stats.show(format!("case {i} (seed {seed}): {why}\n  {case:?}"));
            continue;
        }
        if i % WIND_EVERY == 0 {
            stats.wind_cases += 1;
            let (limit_c, margin_k, max_speed_m_s) = random_wind_question(&mut rng, &case);
            if let Err(why) = check_wind(&case, limit_c, margin_k, max_speed_m_s, &mut stats) {
                stats.wind_failures += 1;
                stats.show_wind(format!(
                    "case {i} (seed {seed}): required_wind(limit {limit_c} °C, margin {margin_k} K, \
                     max {max_speed_m_s} m/s): {why}\n  {case:?}"
                ));
            }
        }
    }
    stats
}

/// A value of `range`: an exact end, a log-uniform draw toward the low end, or a uniform draw.
fn draw(rng: &mut Xoshiro256PlusPlus, range: &ValidRange) -> f64 {
    let u: f64 = rng.random();
    if u < END_PROBABILITY {
        return range.min;
    }
    if u < 2.0 * END_PROBABILITY {
        return range.max;
    }
    let low = if range.min > 0.0 {
        range.min
    } else {
        range.max * 1e-6
    };
    if u < 2.0 * END_PROBABILITY + LOG_PROBABILITY && range.max > 10.0 * low && low > 0.0 {
        let x = (low.ln() + rng.random::<f64>() * (range.max.ln() - low.ln())).exp();
        return x.clamp(range.min, range.max);
    }
    rng.random_range(range.min..=range.max)
}

fn random_case(rng: &mut Xoshiro256PlusPlus) -> LeafCase {
    let temp_c = draw(rng, &AIR_TEMP_RANGE_C);
    let humidity = match rng.random_range(0..3u8) {
        0 => Humidity::RelativePct(draw(rng, &RELATIVE_HUMIDITY_RANGE_PCT)),
        // The engine's own consistency ranges (air::Humidity::vapour_pressure_kpa).
        1 => Humidity::DewPointC(draw(
            rng,
            &ValidRange {
                quantity: "dew point",
                min: AIR_TEMP_RANGE_C.min,
                max: temp_c,
                unit: "°C",
            },
        )),
        _ => Humidity::DeficitKpa(draw(
            rng,
            &ValidRange {
                quantity: "vapour-pressure deficit",
                min: 0.0,
                max: saturation_vapour_pressure_kpa(temp_c),
                unit: "kPa",
            },
        )),
    };
    let upper_view = match rng.random_range(0..3u8) {
        0 => UpperView::ClearSky,
        1 => UpperView::SkyTempC(draw(rng, &SURFACE_TEMP_RANGE_C)),
        _ => UpperView::CoverTempC(draw(rng, &SURFACE_TEMP_RANGE_C)),
    };
    // An outline's A/P (any, not only one that fits the dimension: the engine accepts both
    // independently), or the square leaf's d/4.
    let free_convection_length_m = rng
        .random_bool(0.5)
        .then(|| draw(rng, &FREE_CONVECTION_LENGTH_RANGE_M));
    let ground_temp_c = rng
        .random_bool(0.5)
        .then(|| draw(rng, &SURFACE_TEMP_RANGE_C));
    LeafCase {
        air: Air {
            temp_c,
            humidity,
            pressure_kpa: draw(rng, &PRESSURE_RANGE_KPA),
            speed_m_s: draw(rng, &AIR_SPEED_RANGE_M_S),
            turbulence_factor: draw(rng, &TURBULENCE_FACTOR_RANGE),
        },
        leaf: Leaf {
            dimension_m: draw(rng, &LEAF_DIMENSION_RANGE_M),
            absorptivity: draw(rng, &ABSORPTIVITY_RANGE),
            emissivity: draw(rng, &EMISSIVITY_RANGE),
            stomatal_conductance_mol_m2_s: draw(rng, &STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S),
            lower_share: draw(rng, &LOWER_SHARE_RANGE),
            cuticular_conductance_mol_m2_s: draw(rng, &CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S),
            free_convection_length_m,
        },
        surroundings: Surroundings {
            shortwave_w_m2: draw(rng, &SHORTWAVE_RANGE_W_M2),
            ground_albedo: draw(rng, &ALBEDO_RANGE),
            upper_view,
            ground_temp_c,
        },
        critical_reynolds: draw(rng, &CRITICAL_REYNOLDS_RANGE),
    }
}

/// Solves `case` and checks finiteness and closure.
fn check_solve(case: &LeafCase, scan: bool, stats: &mut Stats) -> Result<(), Failure> {
    let s = solve_leaf(case).map_err(|e| {
        Failure::Error(format!(
            "valid case rejected or unsolved: {e}{}",
            root_beyond_search(case)
        ))
    })?;
    stats.most_iterations = stats.most_iterations.max(s.solver.iterations);
    if let Some(name) = non_finite(&s) {
        return Err(Failure::NonFinite(format!("{name} is not finite: {s:?}")));
    }
    let residual = s.solver.residual.abs();
    stats.worst_residual_w_m2 = stats.worst_residual_w_m2.max(residual);
    if residual >= CLOSURE_LIMIT_W_M2 || s.solver.residual != s.terms.residual_w_m2 {
        let why = format!(
            "solver residual {:e} W/m² (terms say {:e}), status {:?} after {} iterations, leaf {} °C \
             (leaf − air {:e} K)",
            s.solver.residual,
            s.terms.residual_w_m2,
            s.solver.status,
            s.solver.iterations,
            s.leaf_temp_c,
            s.leaf_air_diff_k
        );
        return Err(match resolution_limited(case, s.terms.leaf_temp_k) {
            Some(slope) => Failure::Resolution(format!(
                "{why}; the root is bracketed within ±4 ulp of T_L, local residual slope {slope:.2e} \
                 W/m²/K: 10⁻⁶ W/m² needs T_L to better than f64 resolution"
            )),
            None => Failure::Closure(why),
        });
    }
    // The balance rebuilt from its pieces with the engine's public process functions.
    let t = &s.terms;
    let leaf_temp_c = t.leaf_temp_k - ZERO_CELSIUS_K;
    let emitted = 2.0 * emitted_longwave_w_m2(case.leaf.emissivity, t.leaf_temp_k);
    let sensible =
        t.convection.heat_total_w_m2_k() * (t.leaf_temp_k - (case.air.temp_c + ZERO_CELSIUS_K));
    let e_flux = transpiration_mol_m2_s(
        t.vapour_upper_mol_m2_s + t.vapour_lower_mol_m2_s,
        saturation_vapour_pressure_kpa(leaf_temp_c),
        s.air_vapour_pressure_kpa,
        case.air.pressure_kpa,
    );
    let latent = molar_latent_heat_j_mol(leaf_temp_c) * e_flux;
    let closure = s.absorbed_w_m2() - emitted - sensible - latent;
    let from_terms = s.absorbed_w_m2() - t.emitted_w_m2 - t.sensible_w_m2 - t.latent_w_m2;
    let worst = closure.abs().max(from_terms.abs());
    stats.worst_closure_w_m2 = stats.worst_closure_w_m2.max(worst);
    if worst.is_nan() || worst >= CLOSURE_LIMIT_W_M2 {
        return Err(Failure::Closure(format!(
            "recomputed closure {closure:e} W/m² (from the terms {from_terms:e}; emitted {emitted} \
             vs {}, sensible {sensible} vs {}, latent {latent} vs {})",
            t.emitted_w_m2, t.sensible_w_m2, t.latent_w_m2
        )));
    }
    // Below NEAR_STILL_AIR_M_S the engine documents that the balance may hold at more than one
    // leaf temperature (free convection strengthens as a transpiring leaf cools); not scanned.
    if scan && case.air.speed_m_s >= NEAR_STILL_AIR_M_S {
        stats.unique_scans += 1;
        if let Some((a, b)) = other_root(case, s.leaf_air_diff_k) {
            return Err(Failure::NotUnique(format!(
                "the answer is leaf − air = {:e} K, but the balance also changes sign between \
                 {a:e} and {b:e} K",
                s.leaf_air_diff_k
            )));
        }
    }
    Ok(())
}

/// A leaf − air interval \[K\] other than the one holding `answer_diff_k` over which the balance of
/// `case` changes sign: a 1 K grid over the search, refined logarithmically within 1 K of the air
/// (where free convection varies as |ΔT|^¼ and the balance can turn). In still air the pair of
/// roots within [`DEGENERATE_K`] of the air is the degenerate state the engine documents (no
/// exchange without a temperature difference) and is not counted.
fn other_root(case: &LeafCase, answer_diff_k: f64) -> Option<(f64, f64)> {
    let p = PreparedLeaf::new(case).ok()?;
    let air_k = case.air_temp_k();
    let (lo_k, hi_k) = p.search_domain_k();
    let (lo, hi) = ((lo_k - air_k).ceil() as i32, (hi_k - air_k).floor() as i32);
    let mut diffs: Vec<f64> = (lo..=hi).map(f64::from).collect();
    for e in -24..0 {
        let d = 10f64.powf(f64::from(e) / 2.0);
        diffs.extend([d, -d]);
    }
    diffs.sort_by(f64::total_cmp);
    let r: Vec<f64> = diffs
        .iter()
        .map(|d| p.terms(air_k + d).residual_w_m2)
        .collect();
    (1..diffs.len())
        .find(|&k| {
            let (a, b) = (diffs[k - 1], diffs[k]);
            let degenerate = case.air.speed_m_s == 0.0 && a.abs().max(b.abs()) <= DEGENERATE_K;
            (r[k - 1] > 0.0) != (r[k] > 0.0) && !(a..=b).contains(&answer_diff_k) && !degenerate
        })
        .map(|k| (diffs[k - 1], diffs[k]))
}

/// Whether the balance of `case` changes sign within ±4 ulp of `leaf_temp_k` \[K\], and if so the
/// residual's slope over that span \[W m⁻² K⁻¹\].
fn resolution_limited(case: &LeafCase, leaf_temp_k: f64) -> Option<f64> {
    let p = PreparedLeaf::new(case).ok()?;
    let ulp = f64::EPSILON * leaf_temp_k;
    let (lo, hi) = (leaf_temp_k - 4.0 * ulp, leaf_temp_k + 4.0 * ulp);
    let (r_lo, r_hi) = (p.terms(lo).residual_w_m2, p.terms(hi).residual_w_m2);
    (r_lo > 0.0 && r_hi < 0.0).then(|| (r_hi - r_lo) / (hi - lo))
}

/// Where the balance of `case` changes sign beyond the engine's search half-width, as a clause for
/// a failure message (empty if no sign change is found within 400 K of the air).
fn root_beyond_search(case: &LeafCase) -> String {
    let Ok(p) = PreparedLeaf::new(case) else {
        return String::new();
    };
    let air_k = case.air_temp_k();
    let residual = |diff_k: f64| p.terms(air_k + diff_k).residual_w_m2;
    for step in 1..=400 {
        for sign in [1.0, -1.0] {
            let (near, far) = (sign * f64::from(step - 1), sign * f64::from(step));
            if (residual(near) > 0.0) != (residual(far) > 0.0) {
                return format!(
                    "; the balance changes sign between {near:+.0} and {far:+.0} K from the air \
                     (search half-width {SEARCH_HALF_WIDTH_K} K): leaf ≈ {:.0} °C",
                    air_k + far - ZERO_CELSIUS_K
                );
            }
        }
    }
    String::new()
}

/// The name of the first non-finite number of a solution, if any.
fn non_finite(s: &LeafSolution) -> Option<&'static str> {
    let t = &s.terms;
    let c = &t.convection;
    let p = &t.film_properties;
    let numbers = [
        ("leaf temperature", s.leaf_temp_c),
        ("leaf-air difference", s.leaf_air_diff_k),
        ("air vapour pressure", s.air_vapour_pressure_kpa),
        ("leaf VPD", s.leaf_vpd_kpa),
        ("absorbed shortwave", s.absorbed_shortwave_w_m2),
        ("absorbed longwave", s.absorbed_longwave_w_m2),
        ("above radiant temperature", s.above_radiant_temp_c),
        ("below radiant temperature", s.below_radiant_temp_c),
        ("radiative conductance", s.radiative_conductance_w_m2_k),
        ("emitted", t.emitted_w_m2),
        ("sensible", t.sensible_w_m2),
        ("latent", t.latent_w_m2),
        ("residual slope", t.residual_slope_w_m2_k),
        ("upper vapour conductance", t.vapour_upper_mol_m2_s),
        ("lower vapour conductance", t.vapour_lower_mol_m2_s),
        ("transpiration", t.transpiration_mol_m2_s),
        ("upper heat conductance", c.upper.heat_w_m2_k),
        ("lower heat conductance", c.lower.heat_w_m2_k),
        (
            "upper boundary-layer vapour conductance",
            c.upper.vapour_mol_m2_s,
        ),
        (
            "lower boundary-layer vapour conductance",
            c.lower.vapour_mol_m2_s,
        ),
        ("Reynolds number", c.reynolds),
        ("Grashof number", c.grashof),
        ("film density", p.density_kg_m3),
        ("film kinematic viscosity", p.kinematic_viscosity_m2_s),
        ("film Prandtl number", p.prandtl),
        ("film Schmidt number", p.schmidt),
        ("linearised leaf temperature", s.linearised.leaf_temp_c),
        ("linearised difference", s.linearised.leaf_air_diff_k),
    ];
    let optional = [
        ("dew point", s.air_dew_point_c),
        ("99 % boundary-layer thickness", s.bl_thickness_m),
        (
            "effective upper thickness",
            s.effective_bl_thickness_upper_m,
        ),
        (
            "effective lower thickness",
            s.effective_bl_thickness_lower_m,
        ),
        ("effective thickness", s.effective_bl_thickness_m),
    ];
    numbers
        .into_iter()
        .chain(optional.into_iter().filter_map(|(n, v)| v.map(|v| (n, v))))
        .find(|(_, v)| !v.is_finite())
        .map(|(n, _)| n)
}

/// A limit, margin and search maximum for `case`: half the time drawn over their whole ranges,
/// half the time aimed between the leaf's still-air and fastest temperatures, where the answer is
/// a speed.
fn random_wind_question(rng: &mut Xoshiro256PlusPlus, case: &LeafCase) -> (f64, f64, f64) {
    let margin_k = draw(rng, &MARGIN_RANGE_K);
    let max_speed_m_s = draw(rng, &SEARCH_MAX_RANGE_M_S);
    let mut limit_c = draw(rng, &LIMIT_RANGE_C);
    if rng.random_bool(0.5)
        && let (Ok(still), Ok(fast)) = (
            leaf_temp_c(&case.with_speed(0.0)),
            leaf_temp_c(&case.with_speed(max_speed_m_s)),
        )
    {
        let aimed = fast + rng.random::<f64>() * (still - fast) + margin_k;
        if LIMIT_RANGE_C.contains(aimed) {
            limit_c = aimed;
        }
    }
    (limit_c, margin_k, max_speed_m_s)
}

/// Asks `required_wind` and re-checks the answer against fresh solves.
fn check_wind(
    case: &LeafCase,
    limit_c: f64,
    margin_k: f64,
    max_speed_m_s: f64,
    stats: &mut Stats,
) -> Result<(), String> {
    let answer = required_wind(case, limit_c, margin_k, max_speed_m_s)
        .map_err(|e| format!("valid question rejected or unsolved: {e}"))?;
    let target_c = limit_c - margin_k;
    let at = |u: f64| -> Result<f64, String> {
        leaf_temp_c(&case.with_speed(u)).map_err(|e| format!("re-solve at {u} m/s failed: {e}"))
    };
    // The ceiling is where the target is lost again: met just below it, lost at it or just above
    // (within twice the search's 10⁻⁶ m/s, either convention), and still lost 5 % above it.
    let check_ceiling = |speed: f64, ceiling: Option<f64>| -> Result<(), String> {
        let Some(c) = ceiling else { return Ok(()) };
        if !(c.is_finite() && c >= speed && c <= max_speed_m_s) {
            return Err(format!(
                "ceiling {c} m/s outside [{speed}, {max_speed_m_s}]"
            ));
        }
        let below = (c - 2e-6).max(speed);
        let t_below = at(below)?;
        if t_below > target_c {
            return Err(format!(
                "just below the ceiling {c} m/s ({below} m/s) the leaf is at {t_below} °C > target {target_c} °C"
            ));
        }
        let (t_at, t_just_above) = (at(c)?, at((c + 2e-6).min(max_speed_m_s))?);
        if t_at <= target_c && t_just_above <= target_c {
            return Err(format!(
                "at and just above the ceiling {c} m/s the leaf is at {t_at} and {t_just_above} °C ≤ target {target_c} °C"
            ));
        }
        let above = (c * 1.05).min(max_speed_m_s);
        let t_above = at(above)?;
        if above > c + 2e-6 && t_above <= target_c {
            return Err(format!(
                "5 % above the ceiling {c} m/s ({above} m/s) the leaf is at {t_above} °C ≤ target {target_c} °C"
            ));
        }
        Ok(())
    };
    match answer {
        WindAnswer::Speed {
            speed_m_s,
            leaf_temp_c: t,
            target_c: tc,
            ceiling_m_s,
        } => {
            stats.wind_speed += 1;
            if tc != target_c || !(speed_m_s > 0.0 && speed_m_s <= max_speed_m_s) {
                return Err(format!("{answer:?}: speed or target out of place"));
            }
            let fresh = at(speed_m_s)?;
            if fresh != t || fresh > target_c {
                return Err(format!(
                    "{answer:?}: at the answer the leaf is at {fresh} °C (target {target_c} °C)"
                ));
            }
            if speed_m_s >= TINY_SPEED_M_S {
                let slower = 0.95 * speed_m_s;
                let t_slow = at(slower)?;
                if t_slow <= target_c {
                    return Err(format!(
                        "{answer:?}: 5 % below ({slower} m/s) the leaf is at {t_slow} °C, which already meets the target"
                    ));
                }
            }
            check_ceiling(speed_m_s, ceiling_m_s)
        }
        WindAnswer::NotNeeded {
            still_air_leaf_temp_c,
            target_c: tc,
            ceiling_m_s,
        } => {
            stats.wind_not_needed += 1;
            let fresh = at(0.0)?;
            if tc != target_c || fresh != still_air_leaf_temp_c || fresh > target_c {
                return Err(format!(
                    "{answer:?}: in still air the leaf is at {fresh} °C (target {target_c} °C)"
                ));
            }
            check_ceiling(0.0, ceiling_m_s)
        }
        WindAnswer::Unreachable(u) => {
            stats.wind_unreachable += 1;
            let (t_max, tc, air_too_hot) = match u {
                Unreachable::AirTooHot {
                    air_temp_c,
                    target_c: tc,
                    leaf_temp_at_max_c,
                    ..
                } => {
                    if air_temp_c != case.air.temp_c {
                        return Err(format!("{answer:?}: wrong air temperature"));
                    }
                    (leaf_temp_at_max_c, tc, true)
                }
                Unreachable::BeyondSearch {
                    max_speed_m_s: m,
                    leaf_temp_at_max_c,
                    target_c: tc,
                } => {
                    if m != max_speed_m_s {
                        return Err(format!("{answer:?}: wrong search maximum"));
                    }
                    (leaf_temp_at_max_c, tc, false)
                }
            };
            if tc != target_c || air_too_hot != (case.air.temp_c >= target_c) {
                return Err(format!("{answer:?}: wrong reason or target"));
            }
            for u in [0.0, 0.5 * max_speed_m_s, max_speed_m_s] {
                let t = at(u)?;
                if t <= target_c {
                    return Err(format!(
                        "{answer:?}: at {u} m/s the leaf is at {t} °C, which meets the target {target_c} °C"
                    ));
                }
            }
            let fresh = at(max_speed_m_s)?;
            if fresh != t_max {
                return Err(format!(
                    "{answer:?}: at the maximum the leaf is at {fresh} °C"
                ));
            }
            Ok(())
        }
    }
}

// Keep the engine's promise and this check's limit tied together.
const _: () = assert!(RESIDUAL_TOLERANCE_W_M2 < CLOSURE_LIMIT_W_M2);

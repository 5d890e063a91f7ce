//! Derived results (never saved): the single leaf, the sweep over air speed, the wind × size map
//! and the boundary-layer curves. Everything here calls the engine; nothing here draws.
//!
//! The single leaf is fast (microseconds) and is solved on the UI thread whenever the document
//! changes; the others run in [`super::worker`] jobs.

use std::sync::{Arc, Mutex};

use egui::{Color32, ColorImage};
use leafwind_physics::boundary_layer::{thickness_99_m, velocity_profile, wall_shear_rate_per_s};
use leafwind_physics::grid::{GridAxes, leaf_temp_row};
use leafwind_physics::required_wind::SEARCH_MAX_SPEED_DEFAULT_M_S;
use leafwind_physics::{LeafCase, LeafSolution, WindAnswer, required_wind, solve_leaf};
use rayon::prelude::*;

use super::contour::{Polyline, iso_lines};
use crate::document::{MapQuantity, ScenarioDocument};

/// The single-leaf result: the exact balance and the least-air-speed answer.
#[derive(Debug, Clone, PartialEq)]
pub struct LeafResult {
    /// The case solved.
    pub case: LeafCase,
    /// The exact solution.
    pub solution: LeafSolution,
    /// The least air speed for the limit minus the margin (or why it could not be answered).
    pub wind: Result<WindAnswer, String>,
    /// Limit \[°C\] used.
    pub limit_c: f64,
    /// Margin \[K\] used.
    pub margin_k: f64,
}

/// Where the leaf stands against the limit.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum LimitStatus {
    /// At least the margin below the limit.
    WithinMargin,
    /// Below the limit but closer than the margin.
    InsideMargin,
    /// Above the limit.
    OverLimit,
}

impl LimitStatus {
    /// Classifies a leaf temperature \[°C\] against a limit \[°C\] and margin \[K\].
    #[must_use]
    pub fn of(leaf_temp_c: f64, limit_c: f64, margin_k: f64) -> Self {
        if leaf_temp_c > limit_c {
            Self::OverLimit
        } else if leaf_temp_c > limit_c - margin_k {
            Self::InsideMargin
        } else {
            Self::WithinMargin
        }
    }

    /// Symbol and words (never colour alone).
    #[must_use]
    pub fn words(self) -> &'static str {
        match self {
            Self::WithinMargin => "✔ Within margin",
            Self::InsideMargin => "⚠ Inside margin",
            Self::OverLimit => "✖ Over the limit",
        }
    }
}

impl LeafResult {
    /// Solves the document's leaf and asks for the least air speed.
    ///
    /// # Errors
    /// The engine's message for the first invalid input.
    pub fn solve(doc: &ScenarioDocument) -> Result<Self, String> {
        let solution = solve_leaf(&doc.case).map_err(|e| e.to_string())?;
        let wind = required_wind(
            &doc.case,
            doc.heat_limit_c,
            doc.margin_k,
            SEARCH_MAX_SPEED_DEFAULT_M_S,
        )
        .map_err(|e| e.to_string());
        Ok(Self {
            case: doc.case,
            solution,
            wind,
            limit_c: doc.heat_limit_c,
            margin_k: doc.margin_k,
        })
    }

    /// Limit minus leaf temperature \[K\] (positive: below the limit).
    #[must_use]
    pub fn margin_to_limit_k(&self) -> f64 {
        self.limit_c - self.solution.leaf_temp_c
    }

    /// The status against the limit.
    #[must_use]
    pub fn status(&self) -> LimitStatus {
        LimitStatus::of(self.solution.leaf_temp_c, self.limit_c, self.margin_k)
    }
}

// ---------------------------------------------------------------------------------------------
// Sweep over air speed

/// Inputs of a sweep.
#[derive(Debug, Clone, PartialEq)]
pub struct SweepInput {
    /// The case (its speed and size are replaced).
    pub case: LeafCase,
    /// Leaf sizes \[m\], the current one first.
    pub sizes_m: Vec<f64>,
    /// Highest speed \[m s⁻¹\].
    pub max_speed_m_s: f64,
}

impl SweepInput {
    /// From a document.
    #[must_use]
    pub fn of(doc: &ScenarioDocument) -> Self {
        Self {
            case: doc.case,
            sizes_m: doc.sweep_sizes_m(),
            max_speed_m_s: doc.sweep.max_speed_m_s,
        }
    }
}

/// Points of a sweep.
pub const SWEEP_POINTS: usize = 151;

/// One curve of the sweep: one leaf size.
#[derive(Debug, Clone, PartialEq)]
pub struct SweepCurve {
    /// Leaf size \[m\].
    pub size_m: f64,
    /// Air speeds \[m s⁻¹\].
    pub speeds_m_s: Vec<f64>,
    /// Leaf minus air \[K\] (None where the solve failed).
    pub diff_k: Vec<Option<f64>>,
    /// 99 % velocity thickness at the trailing edge \[m\] (None in still air).
    pub delta99_m: Vec<Option<f64>>,
    /// Conduction-equivalent thickness k/h, both faces \[m\].
    pub effective_m: Vec<Option<f64>>,
}

/// The whole sweep.
#[derive(Debug, Clone, PartialEq)]
pub struct SweepResult {
    /// Air temperature \[°C\] of the case (for the limit line).
    pub air_temp_c: f64,
    /// One curve per size, the current size first.
    pub curves: Vec<SweepCurve>,
}

/// Runs the sweep: [`SWEEP_POINTS`] speeds from still air to the maximum, per leaf size.
///
/// # Errors
/// The engine's message when the case itself is invalid.
pub fn compute_sweep(input: &SweepInput) -> Result<SweepResult, String> {
    input.case.validate().map_err(|e| e.to_string())?;
    let n = SWEEP_POINTS;
    let speeds: Vec<f64> = (0..n)
        .map(|i| input.max_speed_m_s * i as f64 / (n - 1) as f64)
        .collect();
    let curves = input
        .sizes_m
        .par_iter()
        .map(|&d| {
            let mut diff = Vec::with_capacity(n);
            let mut d99 = Vec::with_capacity(n);
            let mut eff = Vec::with_capacity(n);
            for &u in &speeds {
                match solve_leaf(&input.case.with_dimension(d).with_speed(u)) {
                    Ok(s) => {
                        diff.push(finite(s.leaf_air_diff_k));
                        d99.push(s.bl_thickness_m.and_then(finite));
                        eff.push(s.effective_bl_thickness_m.and_then(finite));
                    }
                    Err(_) => {
                        diff.push(None);
                        d99.push(None);
                        eff.push(None);
                    }
                }
            }
            SweepCurve {
                size_m: d,
                speeds_m_s: speeds.clone(),
                diff_k: diff,
                delta99_m: d99,
                effective_m: eff,
            }
        })
        .collect();
    Ok(SweepResult {
        air_temp_c: input.case.air.temp_c,
        curves,
    })
}

// ---------------------------------------------------------------------------------------------
// Wind × size map

/// Inputs of the map.
#[derive(Debug, Clone, PartialEq)]
pub struct MapInput {
    /// The case (speed and size replaced cell by cell).
    pub case: LeafCase,
    /// The axes.
    pub axes: GridAxes,
    /// Limit \[°C\].
    pub limit_c: f64,
    /// Margin \[K\].
    pub margin_k: f64,
    /// What is coloured.
    pub quantity: MapQuantity,
}

/// Cells per axis of the quick preview map, shown while the full map is computed.
pub const PREVIEW_CELLS: usize = 64;

impl MapInput {
    /// From a document: the full 256 × 256 map.
    #[must_use]
    pub fn of(doc: &ScenarioDocument) -> Self {
        Self {
            case: doc.case,
            axes: doc.map.axes(),
            limit_c: doc.heat_limit_c,
            margin_k: doc.margin_k,
            quantity: doc.map.quantity,
        }
    }

    /// The same map with `cells` × `cells` cells (for the quick preview).
    #[must_use]
    pub fn with_cells(mut self, cells: usize) -> Self {
        self.axes.speed_m_s.count = cells;
        self.axes.dimension_m.count = cells;
        self
    }
}

/// The solved map with its picture and iso-lines.
#[derive(Debug, Clone)]
pub struct MapResult {
    /// The input it was computed for.
    pub input: MapInput,
    /// Air speeds of the columns \[m s⁻¹\].
    pub speeds_m_s: Vec<f64>,
    /// Leaf sizes of the rows \[m\].
    pub sizes_m: Vec<f64>,
    /// Leaf temperature \[°C\], row-major (`row * speeds + col`); NaN where a solve failed.
    pub leaf_temp_c: Vec<f64>,
    /// The colour scale's ends, in the coloured quantity (°C or K).
    pub scale: (f64, f64),
    /// The picture (row 0 at the top = largest leaf).
    pub image: ColorImage,
    /// Where the leaf is at the limit, in (log₁₀ speed, log₁₀ size) plot coordinates.
    pub limit_lines: Vec<Polyline>,
    /// Where the leaf is at the limit minus the margin.
    pub margin_lines: Vec<Polyline>,
    /// A number unique to this result (to know when to upload a new picture).
    pub serial: u64,
}

impl MapResult {
    /// The coloured value of a cell: leaf temperature \[°C\] or limit − leaf \[K\].
    #[must_use]
    pub fn shown_value(&self, leaf_temp_c: f64) -> f64 {
        match self.input.quantity {
            MapQuantity::LeafTemperature => leaf_temp_c,
            MapQuantity::MarginToLimit => self.input.limit_c - leaf_temp_c,
        }
    }

    /// The leaf temperature \[°C\] of the cell nearest to a speed and size, if any.
    #[must_use]
    pub fn lookup(&self, speed_m_s: f64, size_m: f64) -> Option<f64> {
        let nearest = |axis: &[f64], v: f64| {
            if axis.is_empty() || v <= 0.0 {
                return None;
            }
            let lv = v.ln();
            let (lo, hi) = (axis[0].ln(), axis[axis.len() - 1].ln());
            if lv < lo.min(hi) - 1e-9 || lv > lo.max(hi) + 1e-9 {
                return None;
            }
            let f = (lv - lo) / (hi - lo);
            Some(((f * (axis.len() - 1) as f64).round() as usize).min(axis.len() - 1))
        };
        let c = nearest(&self.speeds_m_s, speed_m_s)?;
        let r = nearest(&self.sizes_m, size_m)?;
        let t = self.leaf_temp_c[r * self.speeds_m_s.len() + c];
        t.is_finite().then_some(t)
    }
}

/// Speeds \[m s⁻¹\], sizes \[m\] and row-major leaf temperatures \[°C\] of a solved grid.
pub type SolvedGrid = (Vec<f64>, Vec<f64>, Vec<f64>);

static MAP_SERIAL: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(1);

/// Solves the map rows in parallel (rayon) with [`leaf_temp_row`].
///
/// # Errors
/// The engine's message for an invalid case or axis.
pub fn solve_map_grid(case: &LeafCase, axes: &GridAxes) -> Result<SolvedGrid, String> {
    axes.validate().map_err(|e| e.to_string())?;
    case.validate().map_err(|e| e.to_string())?;
    let speeds = axes.speed_m_s.values();
    let sizes = axes.dimension_m.values();
    let rows: Vec<Vec<f64>> = sizes
        .par_iter()
        .map(|&d| leaf_temp_row(case, d, &speeds).unwrap_or_else(|_| vec![f64::NAN; speeds.len()]))
        .collect();
    Ok((speeds, sizes, rows.concat()))
}

/// The last few solved grids, so that changing only the limit, the margin or what is coloured
/// redraws the map without solving it again.
type GridCache = Vec<(LeafCase, GridAxes, Arc<SolvedGrid>)>;
static GRID_CACHE: Mutex<GridCache> = Mutex::new(Vec::new());
/// Grids kept (the full map and its preview).
const GRID_CACHE_SIZE: usize = 2;

fn cached_grid(case: &LeafCase, axes: &GridAxes) -> Result<Arc<SolvedGrid>, String> {
    let hit = GRID_CACHE.lock().ok().and_then(|c| {
        c.iter()
            .find(|(k, a, _)| k == case && a == axes)
            .map(|(_, _, g)| Arc::clone(g))
    });
    if let Some(g) = hit {
        return Ok(g);
    }
    let grid = Arc::new(solve_map_grid(case, axes)?);
    if let Ok(mut c) = GRID_CACHE.lock() {
        c.retain(|(_, a, _)| a.speed_m_s.count != axes.speed_m_s.count);
        c.push((*case, *axes, Arc::clone(&grid)));
        while c.len() > GRID_CACHE_SIZE {
            c.remove(0);
        }
    }
    Ok(grid)
}

/// Computes the map, its picture and its limit lines.
///
/// # Errors
/// As [`solve_map_grid`].
pub fn compute_map(input: &MapInput) -> Result<MapResult, String> {
    let grid = cached_grid(&input.case, &input.axes)?;
    let (speeds, sizes, temps) = (grid.0.clone(), grid.1.clone(), grid.2.clone());
    let shown: Vec<f64> = temps
        .iter()
        .map(|&t| match input.quantity {
            MapQuantity::LeafTemperature => t,
            MapQuantity::MarginToLimit => input.limit_c - t,
        })
        .collect();
    let (mut lo, mut hi) = shown
        .iter()
        .filter(|v| v.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &v| {
            (a.min(v), b.max(v))
        });
    if !lo.is_finite() || !hi.is_finite() {
        lo = 0.0;
        hi = 1.0;
    }
    if input.quantity == MapQuantity::MarginToLimit {
        // Symmetric about zero so that "at the limit" is the middle colour.
        let m = lo.abs().max(hi.abs()).max(0.5);
        lo = -m;
        hi = m;
    } else if hi - lo < 0.5 {
        lo -= 0.25;
        hi += 0.25;
    }
    let w = speeds.len();
    let h = sizes.len();
    let mut pixels = Vec::with_capacity(w * h);
    for row in (0..h).rev() {
        for col in 0..w {
            let v = shown[row * w + col];
            pixels.push(colour(v, lo, hi, input.quantity));
        }
    }
    let image = ColorImage::new([w, h], pixels);
    let xs: Vec<f64> = speeds.iter().map(|v| v.log10()).collect();
    let ys: Vec<f64> = sizes.iter().map(|v| v.log10()).collect();
    let limit_lines = iso_lines(&xs, &ys, &temps, input.limit_c);
    let margin_lines = iso_lines(&xs, &ys, &temps, input.limit_c - input.margin_k);
    Ok(MapResult {
        input: input.clone(),
        speeds_m_s: speeds,
        sizes_m: sizes,
        leaf_temp_c: temps,
        scale: (lo, hi),
        image,
        limit_lines,
        margin_lines,
        serial: MAP_SERIAL.fetch_add(1, std::sync::atomic::Ordering::Relaxed),
    })
}

/// The colour of a value on the map's scale.
#[must_use]
pub fn colour(v: f64, lo: f64, hi: f64, quantity: MapQuantity) -> Color32 {
    if !v.is_finite() {
        return Color32::from_gray(60);
    }
    let t = ((v - lo) / (hi - lo)).clamp(0.0, 1.0) as f32;
    match quantity {
        MapQuantity::LeafTemperature => ramp(&SEQUENTIAL, t),
        // Margin: red (over the limit) → pale → blue-green (well below).
        MapQuantity::MarginToLimit => ramp(&DIVERGING, t),
    }
}

/// A cool-to-hot ramp (dark blue → teal → yellow → orange → dark red), readable in grey too.
const SEQUENTIAL: [[u8; 3]; 6] = [
    [38, 52, 120],
    [33, 120, 160],
    [80, 175, 130],
    [235, 215, 90],
    [235, 120, 50],
    [150, 25, 35],
];

/// A diverging ramp: red (negative) → near-white (zero) → blue-green (positive).
const DIVERGING: [[u8; 3]; 5] = [
    [165, 30, 40],
    [230, 130, 100],
    [240, 236, 225],
    [110, 185, 175],
    [20, 100, 120],
];

fn ramp<const N: usize>(stops: &[[u8; 3]; N], t: f32) -> Color32 {
    let x = t * (N - 1) as f32;
    let i = (x.floor() as usize).min(N - 2);
    let f = x - i as f32;
    let mix = |a: u8, b: u8| (f32::from(a) + (f32::from(b) - f32::from(a)) * f).round() as u8;
    let (a, b) = (stops[i], stops[i + 1]);
    Color32::from_rgb(mix(a[0], b[0]), mix(a[1], b[1]), mix(a[2], b[2]))
}

// ---------------------------------------------------------------------------------------------
// Boundary layer

/// Inputs of the boundary-layer view: the case.
pub type BoundaryInput = LeafCase;

/// Positions along the leaf, as fractions of its length, for the velocity profiles.
pub const PROFILE_FRACTIONS: [f64; 4] = [0.1, 0.25, 0.5, 1.0];

/// The boundary-layer curves.
#[derive(Debug, Clone, PartialEq)]
pub struct BoundaryResult {
    /// Leaf size \[m\].
    pub size_m: f64,
    /// Air speed \[m s⁻¹\].
    pub speed_m_s: f64,
    /// Kinematic viscosity at the film temperature \[m² s⁻¹\].
    pub kinematic_viscosity_m2_s: f64,
    /// Velocity profiles: (distance from the leading edge \[m\], points (height \[m\], u \[m s⁻¹\])).
    pub profiles: Vec<(f64, Vec<(f64, f64)>)>,
    /// 99 % thickness along the leaf: (x \[m\], δ \[m\]).
    pub thickness: Vec<(f64, f64)>,
    /// Laminar wall shear rate along the leaf: (x \[m\], ∂u/∂y \[s⁻¹\]).
    pub shear: Vec<(f64, f64)>,
    /// Where Re_x reaches the critical Reynolds number, if on the leaf \[m\].
    pub transition_x_m: Option<f64>,
}

/// Points along the leaf for thickness and shear.
pub const ALONG_POINTS: usize = 200;

/// Computes the boundary-layer curves for the case's leaf and air speed.
///
/// # Errors
/// The engine's message for an invalid case.
pub fn compute_boundary(case: &BoundaryInput) -> Result<BoundaryResult, String> {
    let s = solve_leaf(case).map_err(|e| e.to_string())?;
    let nu = s.terms.film_properties.kinematic_viscosity_m2_s;
    let d = case.leaf.dimension_m;
    let u = case.air.speed_m_s;
    let profiles = PROFILE_FRACTIONS
        .iter()
        .map(|&f| (f * d, velocity_profile(f * d, u, nu, 80)))
        .collect();
    let xs: Vec<f64> = (1..=ALONG_POINTS)
        .map(|i| d * i as f64 / ALONG_POINTS as f64)
        .collect();
    let thickness = if u > 0.0 {
        xs.iter()
            .map(|&x| (x, thickness_99_m(x, u, nu, case.critical_reynolds)))
            .filter(|p| p.1.is_finite())
            .collect()
    } else {
        Vec::new()
    };
    let shear = if u > 0.0 {
        xs.iter()
            .map(|&x| (x, wall_shear_rate_per_s(x, u, nu)))
            .filter(|p| p.1.is_finite())
            .collect()
    } else {
        Vec::new()
    };
    let x_c = case.critical_reynolds * nu / u;
    Ok(BoundaryResult {
        size_m: d,
        speed_m_s: u,
        kinematic_viscosity_m2_s: nu,
        profiles,
        thickness,
        shear,
        transition_x_m: (u > 0.0 && x_c.is_finite() && x_c < d).then_some(x_c),
    })
}

fn finite(x: f64) -> Option<f64> {
    x.is_finite().then_some(x)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn status_words_follow_the_limit() {
        assert_eq!(LimitStatus::of(30.0, 35.0, 2.0), LimitStatus::WithinMargin);
        assert_eq!(LimitStatus::of(34.0, 35.0, 2.0), LimitStatus::InsideMargin);
        assert_eq!(LimitStatus::of(35.5, 35.0, 2.0), LimitStatus::OverLimit);
    }

    #[test]
    fn sweep_has_one_curve_per_size_and_finite_values() {
        let doc = ScenarioDocument::default();
        let r = compute_sweep(&SweepInput::of(&doc)).unwrap();
        assert_eq!(r.curves.len(), doc.sweep_sizes_m().len());
        for c in &r.curves {
            assert_eq!(c.diff_k.len(), SWEEP_POINTS);
            assert!(c.diff_k.iter().all(|v| v.is_some_and(f64::is_finite)));
            // Still air has no forced boundary layer.
            assert!(c.delta99_m[0].is_none());
        }
    }

    #[test]
    fn map_cells_match_the_single_leaf() {
        let doc = ScenarioDocument::default();
        let r = compute_map(&MapInput::of(&doc)).unwrap();
        let (u, d) = (r.speeds_m_s[100], r.sizes_m[50]);
        let t = r.lookup(u, d).unwrap();
        let direct = solve_leaf(&doc.case.with_speed(u).with_dimension(d))
            .unwrap()
            .leaf_temp_c;
        // Same exact solve, different starting guess: agree to the solver tolerance.
        assert!((t - direct).abs() < 1e-6);
        assert_eq!(r.image.size, [256, 256]);
    }

    #[test]
    fn boundary_layer_in_still_air_is_empty() {
        let case = LeafCase::default().with_speed(0.0);
        let r = compute_boundary(&case).unwrap();
        assert!(r.thickness.is_empty() && r.shear.is_empty());
        assert!(r.profiles.iter().all(|p| p.1.is_empty()));
    }
}

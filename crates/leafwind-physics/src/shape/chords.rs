//! Chords along the wind and the effective characteristic dimension of an outline (derivation in
//! the [`crate::shape`] module documentation).

use std::f64::consts::PI;

use super::ShapeError;
use super::outline::{LeafShape, Outline};
use crate::error::ValidRange;

/// Width factor of the hand rule d ≈ 0.72 w for the characteristic dimension of a leaf \[–\]
/// (\[CN98\] ch. 7; factor from memory, not verified against the text).
pub const HAND_RULE_WIDTH_FACTOR: f64 = 0.72;

/// Strips across the wind sampled by default for the chord-length distribution \[–\].
pub const STRIPS_DEFAULT: usize = 2000;

/// Wind directions sampled by default over 0 ≤ θ < 180° (1° apart) \[–\].
pub const SWEEP_STEPS_DEFAULT: usize = 180;

/// Valid wind directions \[rad\]: −360° to 360° from the outline's +x axis.
pub const WIND_ANGLE_RANGE_RAD: ValidRange = ValidRange {
    quantity: "wind direction",
    min: -2.0 * PI,
    max: 2.0 * PI,
    unit: "rad",
};

/// Valid numbers of strips or of sampled directions \[–\].
const SAMPLE_COUNT_RANGE: ValidRange = ValidRange {
    quantity: "number of samples",
    min: 1.0,
    max: 1.0e6,
    unit: "",
};

/// The two chord integrals of an outline at one wind direction.
#[derive(Debug, Clone, Copy, Default)]
struct ChordIntegrals {
    /// A = ∫ Σ_i c_i dη \[m²\].
    area_m2: f64,
    /// ∫ Σ_i √c_i dη \[m^{3/2}\].
    sqrt_chord_m3_2: f64,
}

impl ChordIntegrals {
    fn add(self, o: Self) -> Self {
        Self {
            area_m2: self.area_m2 + o.area_m2,
            sqrt_chord_m3_2: self.sqrt_chord_m3_2 + o.sqrt_chord_m3_2,
        }
    }
}

/// An edge in wind co-ordinates, lower end first: (η_lo, ξ_lo, η_hi, ξ_hi) \[m\].
#[derive(Debug, Clone, Copy)]
struct WindEdge {
    eta_lo: f64,
    xi_lo: f64,
    eta_hi: f64,
    xi_hi: f64,
}

impl WindEdge {
    /// ξ where the edge meets the line η \[m\] (η within the edge's range).
    fn xi_at(&self, eta: f64) -> f64 {
        if eta <= self.eta_lo {
            self.xi_lo
        } else if eta >= self.eta_hi {
            self.xi_hi
        } else {
            self.xi_lo
                + (self.xi_hi - self.xi_lo) * (eta - self.eta_lo) / (self.eta_hi - self.eta_lo)
        }
    }
}

/// The edges not parallel to the wind, in wind co-ordinates, sorted by η_lo.
fn wind_edges(outline: &Outline, wind_angle_rad: f64) -> Vec<WindEdge> {
    let (sin, cos) = wind_angle_rad.sin_cos();
    let mut edges: Vec<WindEdge> = outline
        .edges()
        .filter_map(|(p, q)| {
            let (ep, eq) = (p.across(cos, sin), q.across(cos, sin));
            let (xp, xq) = (p.along(cos, sin), q.along(cos, sin));
            if ep < eq {
                Some(WindEdge {
                    eta_lo: ep,
                    xi_lo: xp,
                    eta_hi: eq,
                    xi_hi: xq,
                })
            } else if eq < ep {
                Some(WindEdge {
                    eta_lo: eq,
                    xi_lo: xq,
                    eta_hi: ep,
                    xi_hi: xp,
                })
            } else {
                None // parallel to the wind: bounds no chord of positive width
            }
        })
        .collect();
    edges.sort_by(|a, b| a.eta_lo.total_cmp(&b.eta_lo));
    edges
}

/// ∫₀¹ √(c₀ + (c₁ − c₀) t) dt for chord lengths c₀, c₁ ≥ 0 \[m^{1/2}\]:
/// (2/3)(c₀ + √(c₀c₁) + c₁)/(√c₀ + √c₁), the exact integral of the square root of a linear function,
/// written without the cancellation of (2/3)(c₁^{3/2} − c₀^{3/2})/(c₁ − c₀).
fn mean_sqrt_linear(c0: f64, c1: f64) -> f64 {
    let (s0, s1) = (c0.sqrt(), c1.sqrt());
    let sum = s0 + s1;
    if sum > 0.0 {
        2.0 / 3.0 * (c0 + s0 * s1 + c1) / sum
    } else {
        0.0
    }
}

/// The exact chord integrals of one outline, slab by slab between consecutive vertex levels.
fn outline_integrals(outline: &Outline, wind_angle_rad: f64) -> ChordIntegrals {
    let edges = wind_edges(outline, wind_angle_rad);
    let (sin, cos) = wind_angle_rad.sin_cos();
    let mut levels: Vec<f64> = outline
        .points()
        .iter()
        .map(|p| p.across(cos, sin))
        .collect();
    levels.sort_by(f64::total_cmp);
    levels.dedup();
    let mut total = ChordIntegrals::default();
    let mut active: Vec<WindEdge> = Vec::new();
    let mut next = 0usize;
    let mut xs: Vec<(f64, f64, f64)> = Vec::new();
    for w in levels.windows(2) {
        let (e0, e1) = (w[0], w[1]);
        while next < edges.len() && edges[next].eta_lo <= e0 {
            active.push(edges[next]);
            next += 1;
        }
        active.retain(|e| e.eta_hi > e0);
        // Within the slab the active edges neither end nor cross: their order is fixed.
        let mid = 0.5 * (e0 + e1);
        xs.clear();
        xs.extend(
            active
                .iter()
                .map(|e| (e.xi_at(mid), e.xi_at(e0), e.xi_at(e1))),
        );
        xs.sort_by(|a, b| a.0.total_cmp(&b.0));
        let height = e1 - e0;
        for pair in xs.chunks_exact(2) {
            let c0 = (pair[1].1 - pair[0].1).max(0.0);
            let c1 = (pair[1].2 - pair[0].2).max(0.0);
            total.area_m2 += 0.5 * height * (c0 + c1); // trapezium: c is linear in η
            total.sqrt_chord_m3_2 += height * mean_sqrt_linear(c0, c1);
        }
    }
    total
}

fn shape_integrals(shape: &LeafShape, wind_angle_rad: f64) -> ChordIntegrals {
    shape
        .outlines()
        .iter()
        .map(|o| outline_integrals(o, wind_angle_rad))
        .fold(ChordIntegrals::default(), ChordIntegrals::add)
}

/// Effective characteristic dimension for laminar forced convection d_eff \[m\].
///
/// - `shape`: the outline(s) \[m\]; `wind_angle_rad`: wind direction from the outline's +x axis
///   \[rad\] (0 = wind along +x).
/// - Returns d_eff = (A / ∫ Σ_i √c_i(η) dη)² \[m\]: the length of the flat plate whose average
///   laminar coefficient (\[Incropera\] eq. 7.30) equals the area average of the local laminar
///   coefficients h ∝ x^{−1/2} (\[Incropera\] eq. 7.23) over all chords, each from its own upwind
///   edge. Derivation and limits in the [`crate::shape`] module documentation; the integral is exact
///   for the polygon.
///
/// Valid for any validated shape and finite angle; for a compound shape the sums run over all
/// leaflets. The caller checks the result against [`crate::case::LEAF_DIMENSION_RANGE_M`].
///
/// ```
/// use leafwind_physics::shape::{Outline, Point, effective_dimension_m};
/// // A 0.10 m × 0.04 m rectangle with the wind along its length: d_eff = 0.10 m exactly.
/// let r = Outline::new(vec![
///     Point::new(0.0, 0.0), Point::new(0.10, 0.0), Point::new(0.10, 0.04), Point::new(0.0, 0.04),
/// ]).unwrap();
/// assert!((effective_dimension_m(&r.into(), 0.0) - 0.10).abs() < 1e-15);
/// ```
#[must_use]
pub fn effective_dimension_m(shape: &LeafShape, wind_angle_rad: f64) -> f64 {
    let i = shape_integrals(shape, wind_angle_rad);
    let ratio = i.area_m2 / i.sqrt_chord_m3_2;
    ratio * ratio
}

/// The hand rule d ≈ 0.72 w \[m\] (\[CN98\] ch. 7, factor from memory).
///
/// - `shape`: outline(s) \[m\]; `wind_angle_rad`: wind direction \[rad\].
/// - Returns 0.72 × the width across the wind \[m\]; for several outlines, the area-weighted mean of
///   each outline's own value (the rule is stated for a single leaf or leaflet).
#[must_use]
pub fn hand_rule_dimension_m(shape: &LeafShape, wind_angle_rad: f64) -> f64 {
    let across = wind_angle_rad + 0.5 * PI;
    let weighted: f64 = shape
        .outlines()
        .iter()
        .map(|o| {
            let (lo, hi) = o.extent_along(across);
            o.area_m2() * (hi - lo)
        })
        .sum();
    HAND_RULE_WIDTH_FACTOR * weighted / shape.area_m2()
}

/// One chord: the part of a line along the wind inside the outline.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct Chord {
    /// Position of its upwind edge along the wind, ξ \[m\] (where its boundary layer starts).
    pub upwind_m: f64,
    /// Its length c along the wind \[m\].
    pub length_m: f64,
}

/// The chords cut by one line along the wind, upwind first.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct ChordLine {
    /// Position of the line across the wind, η \[m\].
    pub across_m: f64,
    /// The chords on this line (several where the outline is not convex).
    pub chords: Vec<Chord>,
}

/// The chords on equally spaced lines along the wind: the distribution of chord lengths.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct ChordProfile {
    /// Wind direction \[rad\].
    pub wind_angle_rad: f64,
    /// Width of each strip across the wind \[m\]; each line runs along a strip's middle.
    pub strip_width_m: f64,
    /// One entry per strip, from the least η to the greatest.
    pub lines: Vec<ChordLine>,
}

impl ChordProfile {
    /// Every chord.
    pub fn chords(&self) -> impl Iterator<Item = &Chord> + '_ {
        self.lines.iter().flat_map(|l| l.chords.iter())
    }

    /// Midpoint-rule area Σ c Δη \[m²\].
    #[must_use]
    pub fn area_m2(&self) -> f64 {
        self.chords().map(|c| c.length_m).sum::<f64>() * self.strip_width_m
    }

    /// Midpoint-rule estimate of [`effective_dimension_m`]: (Σ c / Σ √c)² \[m\].
    #[must_use]
    pub fn effective_dimension_m(&self) -> f64 {
        let sum: f64 = self.chords().map(|c| c.length_m).sum();
        let sqrt: f64 = self.chords().map(|c| c.length_m.sqrt()).sum();
        let ratio = sum / sqrt;
        ratio * ratio
    }

    /// Area-weighted mean chord length Σ c² / Σ c \[m\]: twice the area-mean distance from a
    /// point of the leaf to the upwind edge of its chord.
    #[must_use]
    pub fn area_weighted_mean_chord_m(&self) -> f64 {
        let sum: f64 = self.chords().map(|c| c.length_m).sum();
        let sq: f64 = self.chords().map(|c| c.length_m * c.length_m).sum();
        sq / sum
    }

    /// The longest chord \[m\].
    #[must_use]
    pub fn max_chord_m(&self) -> f64 {
        self.chords().map(|c| c.length_m).fold(0.0, f64::max)
    }

    /// The most chords on any one line \[–\] (1 for a convex outline).
    #[must_use]
    pub fn max_chords_per_line(&self) -> usize {
        self.lines.iter().map(|l| l.chords.len()).max().unwrap_or(0)
    }

    /// Area shares of chord lengths in `bins` equal bins from 0 to the longest chord:
    /// (upper bin edge \[m\], share of the area on chords of that length \[–\]). Shares sum to 1.
    #[must_use]
    pub fn length_histogram(&self, bins: usize) -> Vec<(f64, f64)> {
        let bins = bins.max(1);
        let max = self.max_chord_m();
        let total: f64 = self.chords().map(|c| c.length_m).sum();
        let mut shares = vec![0.0; bins];
        if max > 0.0 && total > 0.0 {
            for c in self.chords() {
                let k = ((c.length_m / max * bins as f64) as usize).min(bins - 1);
                shares[k] += c.length_m / total;
            }
        }
        shares
            .into_iter()
            .enumerate()
            .map(|(k, s)| (max * (k + 1) as f64 / bins as f64, s))
            .collect()
    }
}

/// Samples the chords along the wind on `strips` equally spaced lines across the shape.
///
/// - `shape`: outline(s) \[m\]; `wind_angle_rad` \[rad\]; `strips`: number of lines (use
///   [`STRIPS_DEFAULT`] = 2000 or more for a distribution).
/// - Returns the [`ChordProfile`]. A line through a vertex takes the edges on the half-open rule
///   (η_lo ≤ η < η_hi), so a vertex is counted once.
///
/// # Errors
/// `strips` outside 1 to 10⁶, or an angle outside [`WIND_ANGLE_RANGE_RAD`].
pub fn chord_profile(
    shape: &LeafShape,
    wind_angle_rad: f64,
    strips: usize,
) -> Result<ChordProfile, ShapeError> {
    WIND_ANGLE_RANGE_RAD.check(wind_angle_rad)?;
    SAMPLE_COUNT_RANGE.check(strips as f64)?;
    let across = wind_angle_rad + 0.5 * PI;
    let (lo, hi) = shape.extent_along(across);
    let width = (hi - lo) / strips as f64;
    let edges: Vec<Vec<WindEdge>> = shape
        .outlines()
        .iter()
        .map(|o| wind_edges(o, wind_angle_rad))
        .collect();
    let mut lines = Vec::with_capacity(strips);
    let mut xs: Vec<f64> = Vec::new();
    for k in 0..strips {
        let eta = lo + (k as f64 + 0.5) * width;
        let mut chords = Vec::new();
        for outline_edges in &edges {
            xs.clear();
            xs.extend(
                outline_edges
                    .iter()
                    .take_while(|e| e.eta_lo <= eta)
                    .filter(|e| eta < e.eta_hi)
                    .map(|e| e.xi_at(eta)),
            );
            xs.sort_by(f64::total_cmp);
            chords.extend(xs.chunks_exact(2).map(|p| Chord {
                upwind_m: p[0],
                length_m: p[1] - p[0],
            }));
        }
        chords.sort_by(|a, b| a.upwind_m.total_cmp(&b.upwind_m));
        lines.push(ChordLine {
            across_m: eta,
            chords,
        });
    }
    Ok(ChordProfile {
        wind_angle_rad,
        strip_width_m: width,
        lines,
    })
}

/// The geometry of a leaf shape seen by the wind from one direction.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct ShapeMetrics {
    /// Wind direction from the outline's +x axis \[rad\].
    pub wind_angle_rad: f64,
    /// One-sided area A \[m²\].
    pub area_m2: f64,
    /// Perimeter P (all outlines) \[m\].
    pub perimeter_m: f64,
    /// Extent along the wind \[m\].
    pub length_along_wind_m: f64,
    /// Extent across the wind \[m\].
    pub width_across_wind_m: f64,
    /// Effective dimension for laminar forced convection, [`effective_dimension_m`] \[m\].
    pub effective_dimension_m: f64,
    /// The hand rule 0.72 × width, [`hand_rule_dimension_m`] \[m\].
    pub hand_rule_dimension_m: f64,
    /// Free-convection length A/P of horizontal plates \[m\] (\[Incropera\] eq. 9.29, L = A_s/P,
    /// from memory).
    pub free_convection_length_m: f64,
}

impl ShapeMetrics {
    /// Measures `shape` for wind from `wind_angle_rad` \[rad\].
    ///
    /// # Errors
    /// An angle outside [`WIND_ANGLE_RANGE_RAD`] (or not finite).
    pub fn of(shape: &LeafShape, wind_angle_rad: f64) -> Result<Self, ShapeError> {
        let angle = WIND_ANGLE_RANGE_RAD.check(wind_angle_rad)?;
        let (a_lo, a_hi) = shape.extent_along(angle);
        let (c_lo, c_hi) = shape.extent_along(angle + 0.5 * PI);
        let area = shape.area_m2();
        let perimeter = shape.perimeter_m();
        Ok(Self {
            wind_angle_rad: angle,
            area_m2: area,
            perimeter_m: perimeter,
            length_along_wind_m: a_hi - a_lo,
            width_across_wind_m: c_hi - c_lo,
            effective_dimension_m: effective_dimension_m(shape, angle),
            hand_rule_dimension_m: hand_rule_dimension_m(shape, angle),
            free_convection_length_m: area / perimeter,
        })
    }
}

impl ShapeMetrics {
    /// The leaf of the energy balance with this outline's size: the effective dimension along the
    /// wind as the characteristic dimension, and A/P as the free-convection length. Other fields
    /// are kept.
    #[must_use]
    pub fn apply_to(&self, leaf: &crate::case::Leaf) -> crate::case::Leaf {
        crate::case::Leaf {
            dimension_m: self.effective_dimension_m,
            free_convection_length_m: Some(self.free_convection_length_m),
            ..*leaf
        }
    }
}

/// The effective dimension over wind directions 0 ≤ θ < 180° (d_eff(θ + π) = d_eff(θ)).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct DirectionSweep {
    /// Directions sampled, θ_k = k · 180°/steps \[–\].
    pub steps: usize,
    /// Least sampled d_eff \[m\].
    pub min_m: f64,
    /// Direction of the least \[rad\].
    pub min_angle_rad: f64,
    /// Greatest sampled d_eff \[m\].
    pub max_m: f64,
    /// Direction of the greatest \[rad\].
    pub max_angle_rad: f64,
    /// Arithmetic mean of d_eff over the directions \[m\].
    pub mean_m: f64,
    /// Transfer-weighted mean (mean of d_eff^{−1/2})^{−2} \[m\]: the dimension whose laminar
    /// coefficient is the mean coefficient over all directions, equally likely (a leaf that
    /// swings with the wind). Never above [`DirectionSweep::mean_m`].
    pub transfer_mean_m: f64,
}

/// Sweeps the wind direction over 0 ≤ θ < π in `steps` equal steps.
///
/// - `shape`: outline(s) \[m\]; `steps`: directions sampled ([`SWEEP_STEPS_DEFAULT`] = 180, 1°).
/// - Returns min, max (with their directions), mean and transfer-weighted mean of
///   [`effective_dimension_m`] \[m\]. The extremes are those of the samples: between samples the
///   true extremes may differ slightly.
///
/// # Errors
/// `steps` outside 1 to 10⁶.
pub fn sweep_effective_dimension(
    shape: &LeafShape,
    steps: usize,
) -> Result<DirectionSweep, ShapeError> {
    SAMPLE_COUNT_RANGE.check(steps as f64)?;
    let mut sweep = DirectionSweep {
        steps,
        min_m: f64::INFINITY,
        min_angle_rad: 0.0,
        max_m: f64::NEG_INFINITY,
        max_angle_rad: 0.0,
        mean_m: 0.0,
        transfer_mean_m: 0.0,
    };
    let mut inv_sqrt = 0.0;
    for k in 0..steps {
        let angle = PI * k as f64 / steps as f64;
        let d = effective_dimension_m(shape, angle);
        if d < sweep.min_m {
            sweep.min_m = d;
            sweep.min_angle_rad = angle;
        }
        if d > sweep.max_m {
            sweep.max_m = d;
            sweep.max_angle_rad = angle;
        }
        sweep.mean_m += d;
        inv_sqrt += 1.0 / d.sqrt();
    }
    sweep.mean_m /= steps as f64;
    let m = inv_sqrt / steps as f64;
    sweep.transfer_mean_m = 1.0 / (m * m);
    Ok(sweep)
}

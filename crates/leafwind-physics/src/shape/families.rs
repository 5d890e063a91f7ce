//! Parametric leaf outlines: entire blades (elliptic, ovate, obovate, lanceolate, linear), pinnately
//! lobed blades, palmately lobed blades, and compound leaves (pinnate and palmate sets of leaflets).
//!
//! Shape names follow the botanical terms for simple symmetrical plane shapes (Systematics
//! Association Committee for Descriptive Biological Terminology (1962), Terminology of simple
//! symmetrical plane shapes, *Taxon* 11, 145–156; and Ellis, B., et al. (2009), *Manual of Leaf
//! Architecture*, Cornell University Press — both from memory): elliptic = widest at the middle,
//! ovate = widest below the middle, obovate = above it, lanceolate = much longer than wide and
//! widest below the middle, linear = long with nearly parallel sides. The curves themselves are
//! this module's own choice (a Beta-type width profile), documented on each constructor; they are
//! not fitted to any species.
//!
//! Frame of every generated blade: the midrib runs along +x from the base (petiole end) at the
//! origin to the tip at (length, 0).

use std::f64::consts::PI;

use super::ShapeError;
use super::outline::{LeafShape, Outline, Point};
use crate::error::ValidRange;

/// Valid lengths and widths of generated outlines \[m\] (a 0.1 mm scale to a 2 m blade).
pub const OUTLINE_SIZE_RANGE_M: ValidRange = ValidRange {
    quantity: "outline size",
    min: 1.0e-4,
    max: 2.0,
    unit: "m",
};

/// Valid exponents of the width profile \[–\].
pub const EXPONENT_RANGE: ValidRange = ValidRange {
    quantity: "width-profile exponent",
    min: 0.05,
    max: 3.0,
    unit: "",
};

/// Valid numbers of lobes (per side for pinnate lobing, in all for palmate) \[–\].
pub const LOBES_RANGE: ValidRange = ValidRange {
    quantity: "number of lobes",
    min: 1.0,
    max: 24.0,
    unit: "",
};

/// Valid lobe depths: the fraction of the (half-)width cut away at a sinus \[–\]. Below 1 so the
/// blade stays one piece.
pub const DEPTH_RANGE: ValidRange = ValidRange {
    quantity: "lobe depth",
    min: 0.0,
    max: 0.95,
    unit: "",
};

/// Points per side of a generated blade (or per full turn / 2 of a palmate outline) by default.
pub const POINTS_PER_SIDE_DEFAULT: usize = 256;

const POINTS_RANGE: ValidRange = ValidRange {
    quantity: "points per side",
    min: 8.0,
    max: 200_000.0,
    unit: "",
};

const LEAFLETS_RANGE: ValidRange = ValidRange {
    quantity: "number of leaflets or leaflet pairs",
    min: 1.0,
    max: 30.0,
    unit: "",
};

const GAP_RANGE_M: ValidRange = ValidRange {
    quantity: "leaflet gap",
    min: 0.0,
    max: 1.0,
    unit: "m",
};

/// An entire (unlobed) blade symmetrical about its midrib, by a Beta-type width profile.
///
/// Half-width at fraction s = x/L of the length from the base:
///
/// y(s) = (W/2) · s^a (1 − s)^b / (s*^a (1 − s*)^b),  s* = a/(a + b),
///
/// so the blade is widest (width W) at s*. a = b = ½ is an exact ellipse; a = ½ gives a rounded
/// base (vertical tangent), b = 1 a pointed tip with a finite angle, larger b a drawn-out tip, small
/// a and b nearly parallel sides. (This module's own curve family.)
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct BladeProfile {
    /// Length L along the midrib, base to tip \[m\].
    pub length_m: f64,
    /// Greatest width W \[m\].
    pub width_m: f64,
    /// Base exponent a \[–\].
    pub base_exponent: f64,
    /// Tip exponent b \[–\].
    pub tip_exponent: f64,
}

impl BladeProfile {
    /// Elliptic: an exact ellipse with axes L and W (a = b = ½), widest at the middle.
    #[must_use]
    pub const fn elliptic(length_m: f64, width_m: f64) -> Self {
        Self::with_exponents(length_m, width_m, 0.5, 0.5)
    }

    /// Ovate (egg-shaped, widest below the middle): a = ½, b = 1, widest at s* = 1/3, rounded base,
    /// acute tip. Typical L/W 1.2–2.
    #[must_use]
    pub const fn ovate(length_m: f64, width_m: f64) -> Self {
        Self::with_exponents(length_m, width_m, 0.5, 1.0)
    }

    /// Obovate (widest above the middle): a = 1, b = ½, widest at s* = 2/3, tapering base.
    #[must_use]
    pub const fn obovate(length_m: f64, width_m: f64) -> Self {
        Self::with_exponents(length_m, width_m, 1.0, 0.5)
    }

    /// Lanceolate (lance-shaped): a = ½, b = 3/2, widest at s* = 1/4 with a long tapering tip.
    /// Typical L/W 3–6.
    #[must_use]
    pub const fn lanceolate(length_m: f64, width_m: f64) -> Self {
        Self::with_exponents(length_m, width_m, 0.5, 1.5)
    }

    /// Linear (grass-like): a = b = 0.1, nearly parallel sides with blunt rounded ends, widest at
    /// the middle. Typical L/W above 10.
    #[must_use]
    pub const fn linear(length_m: f64, width_m: f64) -> Self {
        Self::with_exponents(length_m, width_m, 0.1, 0.1)
    }

    /// Any exponents (see the type's documentation).
    #[must_use]
    pub const fn with_exponents(
        length_m: f64,
        width_m: f64,
        base_exponent: f64,
        tip_exponent: f64,
    ) -> Self {
        Self {
            length_m,
            width_m,
            base_exponent,
            tip_exponent,
        }
    }

    fn validate(&self) -> Result<(), ShapeError> {
        ValidRange {
            quantity: "blade length",
            ..OUTLINE_SIZE_RANGE_M
        }
        .check(self.length_m)?;
        ValidRange {
            quantity: "blade width",
            ..OUTLINE_SIZE_RANGE_M
        }
        .check(self.width_m)?;
        EXPONENT_RANGE.check(self.base_exponent)?;
        EXPONENT_RANGE.check(self.tip_exponent)?;
        Ok(())
    }

    /// Half-width y(s) \[m\] at fraction `s` (0 to 1) of the length from the base.
    #[must_use]
    pub fn half_width_m(&self, s: f64) -> f64 {
        let (a, b) = (self.base_exponent, self.tip_exponent);
        let s_star = a / (a + b);
        let peak = s_star.powf(a) * (1.0 - s_star).powf(b);
        let s = s.clamp(0.0, 1.0);
        0.5 * self.width_m * s.powf(a) * (1.0 - s).powf(b) / peak
    }

    /// The entire blade as an outline, `points_per_side` points along each margin (cosine-spaced
    /// in s, dense at the base and tip where the margin turns fastest).
    ///
    /// # Errors
    /// A parameter outside [`OUTLINE_SIZE_RANGE_M`], [`EXPONENT_RANGE`] or 8–200 000 points.
    pub fn outline(&self, points_per_side: usize) -> Result<Outline, ShapeError> {
        self.lobed_outline(0, 0.0, points_per_side)
    }

    /// The blade pinnately lobed (oak-like): the half-width is multiplied by
    /// 1 − δ cos²(π m s), which leaves `lobes_per_side` = m rounded lobes on each margin with their
    /// tips at s = (k + ½)/m and sinuses at s = k/m cut to (1 − δ) of the entire blade's half-width.
    /// `depth` = δ (0 = entire blade). `width_m` is the envelope's width; the lobed blade may be a
    /// little narrower where no lobe tip falls on the widest point.
    ///
    /// At least 48 points per lobe are used whatever `points_per_side` says.
    ///
    /// # Errors
    /// As [`BladeProfile::outline`], and lobes outside [`LOBES_RANGE`] or depth outside
    /// [`DEPTH_RANGE`].
    pub fn lobed(
        &self,
        lobes_per_side: usize,
        depth: f64,
        points_per_side: usize,
    ) -> Result<Outline, ShapeError> {
        LOBES_RANGE.check(lobes_per_side as f64)?;
        DEPTH_RANGE.check(depth)?;
        self.lobed_outline(
            lobes_per_side,
            depth,
            points_per_side.max(48 * lobes_per_side),
        )
    }

    fn lobed_outline(
        &self,
        lobes: usize,
        depth: f64,
        points_per_side: usize,
    ) -> Result<Outline, ShapeError> {
        self.validate()?;
        let n = POINTS_RANGE.check(points_per_side as f64)? as usize;
        let m = lobes as f64;
        let half = |s: f64| {
            let lobing = if lobes == 0 {
                1.0
            } else {
                let c = (PI * m * s).cos();
                1.0 - depth * c * c
            };
            self.half_width_m(s) * lobing
        };
        // Lobed margins need even spacing in s, entire ones gain from cosine spacing at the ends.
        let s_at = |k: usize| {
            let t = k as f64 / n as f64;
            if lobes == 0 {
                0.5 * (1.0 - (PI * t).cos())
            } else {
                t
            }
        };
        let mut pts = Vec::with_capacity(2 * n);
        for k in 0..=n {
            let s = s_at(k);
            let y = if k == 0 || k == n { 0.0 } else { half(s) };
            pts.push(Point::new(s * self.length_m, y));
        }
        for k in (1..n).rev() {
            let s = s_at(k);
            pts.push(Point::new(s * self.length_m, -half(s)));
        }
        Outline::new(pts)
    }
}

/// A palmately lobed blade (maple-like), in polar form about the petiole at the origin:
///
/// r(φ) = R (1 − δ |sin(n φ / 2)|),
///
/// with n = `lobes` pointed lobe tips at φ = 2πk/n (the middle lobe along +x) reaching the radius R
/// and rounded sinuses between them at r = (1 − δ) R; for odd n a sinus faces −x (the petiole
/// side). `depth` = δ. (This module's own curve.)
///
/// - `radius_m`: R \[m\]; `lobes`: n; `depth`: δ \[–\]; `points`: points on the outline (rounded up to
///   a multiple of 2n so that every tip and sinus is a vertex).
///
/// # Errors
/// A parameter outside [`OUTLINE_SIZE_RANGE_M`], [`LOBES_RANGE`], [`DEPTH_RANGE`], or 8–200 000
/// points.
pub fn palmately_lobed(
    radius_m: f64,
    lobes: usize,
    depth: f64,
    points: usize,
) -> Result<Outline, ShapeError> {
    let r0 = ValidRange {
        quantity: "lobe radius",
        ..OUTLINE_SIZE_RANGE_M
    }
    .check(radius_m)?;
    let n = LOBES_RANGE.check(lobes as f64)?;
    let delta = DEPTH_RANGE.check(depth)?;
    let count = POINTS_RANGE.check(points as f64)? as usize;
    let step = 2 * lobes;
    let count = count.div_ceil(step) * step;
    let pts = (0..count)
        .map(|k| {
            let phi = 2.0 * PI * k as f64 / count as f64;
            let r = r0 * (1.0 - delta * (0.5 * n * phi).sin().abs());
            Point::new(r * phi.cos(), r * phi.sin())
        })
        .collect();
    Outline::new(pts)
}

/// A pinnately compound leaf: `pairs` pairs of leaflets on a rachis along +x, and optionally a
/// terminal leaflet.
///
/// - `leaflet`: the shape of every leaflet; `pairs`: leaflet pairs (1–30);
/// - `spacing_m`: distance between pairs along the rachis \[m\];
/// - `angle_rad`: angle of each lateral leaflet's midrib from the rachis, towards the tip
///   (0 < α ≤ π/2) \[rad\];
/// - `gap_m`: distance of each leaflet's base from the rachis line (half the rachis width plus
///   the petiolule) \[m\];
/// - `terminal`: whether a leaflet continues the rachis beyond the last pair (its base `spacing_m`
///   beyond the last pair).
///
/// Pair i sits at x = i × spacing; the upper leaflet of a pair is the blade rotated by +α, the lower
/// by −α.
///
/// # Errors
/// Out-of-range parameters; [`ShapeError::LeafletsOverlap`] when the leaflets would overlap.
pub fn pinnate_compound(
    leaflet: &BladeProfile,
    pairs: usize,
    spacing_m: f64,
    angle_rad: f64,
    gap_m: f64,
    terminal: bool,
) -> Result<LeafShape, ShapeError> {
    LEAFLETS_RANGE.check(pairs as f64)?;
    let spacing = ValidRange {
        quantity: "leaflet spacing",
        ..OUTLINE_SIZE_RANGE_M
    }
    .check(spacing_m)?;
    let angle = ValidRange {
        quantity: "leaflet angle",
        min: 1e-3,
        max: 0.5 * PI,
        unit: "rad",
    }
    .check(angle_rad)?;
    let gap = GAP_RANGE_M.check(gap_m)?;
    let blade = leaflet.outline(POINTS_PER_SIDE_DEFAULT)?;
    let mut outlines = Vec::with_capacity(2 * pairs + 1);
    for i in 0..pairs {
        let x = i as f64 * spacing;
        outlines.push(blade.rotated(angle).translated(x, gap));
        outlines.push(blade.rotated(-angle).translated(x, -gap));
    }
    if terminal {
        outlines.push(blade.translated(pairs as f64 * spacing + gap, 0.0));
    }
    LeafShape::new(outlines)
}

/// A palmately compound leaf: `count` leaflets radiating from the petiole tip at the origin,
/// spread evenly over `spread_rad` about +x.
///
/// - `leaflet`: the shape of every leaflet; `count`: leaflets (1–30);
/// - `spread_rad`: angle between the first and last leaflet's midribs \[rad\] (0 to 2π);
/// - `gap_m`: distance of each leaflet's base from the origin (petiolule) \[m\].
///
/// # Errors
/// Out-of-range parameters; [`ShapeError::LeafletsOverlap`] when the leaflets would overlap.
pub fn palmate_compound(
    leaflet: &BladeProfile,
    count: usize,
    spread_rad: f64,
    gap_m: f64,
) -> Result<LeafShape, ShapeError> {
    LEAFLETS_RANGE.check(count as f64)?;
    let spread = ValidRange {
        quantity: "leaflet spread",
        min: 0.0,
        max: 2.0 * PI,
        unit: "rad",
    }
    .check(spread_rad)?;
    let gap = GAP_RANGE_M.check(gap_m)?;
    let blade = leaflet.outline(POINTS_PER_SIDE_DEFAULT)?;
    let outlines = (0..count)
        .map(|j| {
            let phi = if count == 1 {
                0.0
            } else {
                -0.5 * spread + spread * j as f64 / (count - 1) as f64
            };
            blade
                .rotated(phi)
                .translated(gap * phi.cos(), gap * phi.sin())
        })
        .collect();
    LeafShape::new(outlines)
}

#[cfg(test)]
mod tests {
    use super::*;

    // Exact ellipse (a = b = ½): area π L W / 4 (common knowledge, no source); the polygon with n
    // points per side is inscribed, so its area is low by O(1/n²).
    #[test]
    fn elliptic_blade_has_the_ellipse_area() {
        let o = BladeProfile::elliptic(0.1, 0.05).outline(2000).unwrap();
        let exact = PI * 0.1 * 0.05 / 4.0;
        assert!((o.area_m2() / exact - 1.0).abs() < 1e-5);
        let (lo, hi) = o.extent_along(0.0);
        assert!((hi - lo - 0.1).abs() < 1e-15);
        let (lo, hi) = o.extent_along(0.5 * PI);
        assert!((hi - lo - 0.05).abs() < 1e-6);
    }

    #[test]
    fn profiles_are_widest_where_documented() {
        for (p, s_star) in [
            (BladeProfile::ovate(1.0, 0.5), 1.0 / 3.0),
            (BladeProfile::obovate(1.0, 0.5), 2.0 / 3.0),
            (BladeProfile::lanceolate(1.0, 0.2), 0.25),
            (BladeProfile::linear(1.0, 0.05), 0.5),
        ] {
            assert!((p.half_width_m(s_star) - 0.5 * p.width_m).abs() < 1e-12);
            assert!(p.half_width_m(s_star - 0.01) < 0.5 * p.width_m);
            assert!(p.half_width_m(s_star + 0.01) < 0.5 * p.width_m);
            assert!(p.outline(64).is_ok());
        }
    }

    #[test]
    fn lobing_removes_area_and_keeps_the_outline_simple() {
        let blade = BladeProfile::ovate(0.12, 0.08);
        let entire = blade.outline(512).unwrap().area_m2();
        let lobed = blade.lobed(5, 0.7, 512).unwrap().area_m2();
        assert!(lobed < 0.8 * entire && lobed > 0.3 * entire);
        let maple = palmately_lobed(0.06, 5, 0.6, 1000).unwrap();
        assert!(maple.area_m2() < PI * 0.06 * 0.06);
    }

    #[test]
    fn bad_parameters_are_errors_not_panics() {
        assert!(BladeProfile::ovate(-0.1, 0.05).outline(64).is_err());
        assert!(BladeProfile::ovate(0.1, f64::NAN).outline(64).is_err());
        assert!(BladeProfile::ovate(0.1, 0.05).lobed(3, 1.0, 64).is_err());
        assert!(palmately_lobed(0.05, 0, 0.5, 100).is_err());
        assert!(BladeProfile::ovate(0.1, 0.05).outline(2).is_err());
    }

    #[test]
    fn compound_leaves_build_and_detect_overlap() {
        let leaflet = BladeProfile::elliptic(0.04, 0.015);
        let pinnate = pinnate_compound(&leaflet, 3, 0.03, 1.2, 0.002, true).unwrap();
        assert_eq!(pinnate.outlines().len(), 7);
        let one = leaflet.outline(POINTS_PER_SIDE_DEFAULT).unwrap().area_m2();
        assert!((pinnate.area_m2() - 7.0 * one).abs() < 1e-12);
        // Pairs closer than a leaflet's width must collide.
        assert!(matches!(
            pinnate_compound(&leaflet, 3, 0.005, 1.2, 0.002, false),
            Err(ShapeError::LeafletsOverlap { .. })
        ));
        let palmate = palmate_compound(&leaflet, 5, 4.0 * PI / 3.0, 0.01).unwrap();
        assert_eq!(palmate.outlines().len(), 5);
        // Leaflets crowded at the petiole tip collide.
        assert!(palmate_compound(&leaflet, 5, 0.8 * PI, 0.004).is_err());
    }
}

//! The leaf-shape section of a scenario — a parametric leaf family with its sizes, or an imported
//! outline's points, and the wind direction — and the measurement that turns it into the numbers
//! the window shows: area, perimeter, extents, the effective dimension beside the 0.72 × width hand
//! rule and the convex hull, A/P, the effective dimension over every wind direction, and a few
//! chords along the wind. Nothing here draws.
//!
//! Generated compound leaves use fixed layouts chosen here (an invented working choice, no
//! source): pinnate leaflets at 75° to the rachis, pairs 1.6 leaflet widths (measured along the
//! rachis) apart, 2 mm from the rachis line, with a terminal leaflet; palmate leaflets spread over up to
//! 270°, at least 3 mm from the petiole tip and further out where broad leaflets would touch.

use std::f64::consts::PI;

use leafwind_physics::shape::{
    BladeProfile, LeafShape, METRES_PER_MILLIMETRE, Outline, POINTS_PER_SIDE_DEFAULT, Point,
    ShapeError, ShapeMetrics, chord_profile, effective_dimension_m, hand_rule_dimension_m,
    palmate_compound, palmately_lobed, pinnate_compound, sweep_effective_dimension,
};
use serde::{Deserialize, Serialize};

/// The leaf families offered.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum ShapeFamily {
    /// Widest at the middle (an exact ellipse).
    Elliptic,
    /// Egg-shaped, widest below the middle.
    #[default]
    Ovate,
    /// Widest above the middle.
    Obovate,
    /// Lance-shaped: long, widest below the middle, tapering tip.
    Lanceolate,
    /// Grass-like: long with nearly parallel sides.
    Linear,
    /// An ovate blade pinnately lobed (oak-like).
    Lobed,
    /// Palmately lobed (maple-like), lobes radiating from the petiole.
    PalmatelyLobed,
    /// Pairs of elliptic leaflets along a rachis, with a terminal leaflet.
    PinnateCompound,
    /// Elliptic leaflets radiating from the petiole tip.
    PalmateCompound,
    /// An outline read from a CSV file (x, y in mm).
    Imported,
}

impl ShapeFamily {
    /// Every family, in menu order.
    pub const ALL: [ShapeFamily; 10] = [
        Self::Elliptic,
        Self::Ovate,
        Self::Obovate,
        Self::Lanceolate,
        Self::Linear,
        Self::Lobed,
        Self::PalmatelyLobed,
        Self::PinnateCompound,
        Self::PalmateCompound,
        Self::Imported,
    ];

    /// Menu text.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::Elliptic => "Elliptic",
            Self::Ovate => "Ovate",
            Self::Obovate => "Obovate",
            Self::Lanceolate => "Lanceolate",
            Self::Linear => "Linear (grass-like)",
            Self::Lobed => "Lobed (oak-like)",
            Self::PalmatelyLobed => "Palmately lobed (maple-like)",
            Self::PinnateCompound => "Compound, pinnate",
            Self::PalmateCompound => "Compound, palmate",
            Self::Imported => "Imported outline",
        }
    }

    /// Whether the family uses a width (palmately lobed and imported outlines do not).
    #[must_use]
    pub fn has_width(self) -> bool {
        !matches!(self, Self::PalmatelyLobed | Self::Imported)
    }

    /// Whether the family has lobes and a lobe depth.
    #[must_use]
    pub fn has_lobes(self) -> bool {
        matches!(self, Self::Lobed | Self::PalmatelyLobed)
    }

    /// Whether the family is a compound leaf (has leaflets).
    #[must_use]
    pub fn is_compound(self) -> bool {
        matches!(self, Self::PinnateCompound | Self::PalmateCompound)
    }
}

/// The leaf-shape section of a scenario.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ShapeSection {
    /// The family.
    pub family: ShapeFamily,
    /// Blade length along the midrib, base to tip \[m\]; of a compound leaf, each leaflet's; of a
    /// palmately lobed leaf, the petiole to the tip of the middle lobe.
    pub length_m: f64,
    /// Greatest blade width \[m\]; of a compound leaf, each leaflet's (unused when palmately
    /// lobed or imported).
    pub width_m: f64,
    /// Lobes per side (lobed) or in all (palmately lobed) \[–\].
    #[serde(default)]
    pub lobes: usize,
    /// Fraction of the half-width (or radius) cut away at a sinus \[–\].
    #[serde(default)]
    pub depth: f64,
    /// Leaflet pairs (pinnate) or leaflets (palmate) \[–\].
    #[serde(default)]
    pub leaflets: usize,
    /// Wind direction from the outline's +x axis (the midrib, base to tip) \[rad\].
    pub wind_angle_rad: f64,
    /// An imported outline's points, x and y \[mm\] as in its file.
    #[serde(default)]
    pub outline_mm: Vec<[f64; 2]>,
    /// Where an imported outline came from (file name), for the record.
    #[serde(default)]
    pub outline_source: String,
}

impl Default for ShapeSection {
    /// An invented ovate blade, 100 mm × 60 mm, wind along the midrib; lobing and leaflet counts
    /// preset for when another family is chosen.
    fn default() -> Self {
        Self {
            family: ShapeFamily::Ovate,
            length_m: 0.10,
            width_m: 0.06,
            lobes: 4,
            depth: 0.6,
            leaflets: 3,
            wind_angle_rad: 0.0,
            outline_mm: Vec::new(),
            outline_source: String::new(),
        }
    }
}

/// Angle of pinnate leaflets from the rachis \[rad\] (75°, a working choice, no source).
const PINNATE_ANGLE_RAD: f64 = 75.0 * PI / 180.0;
/// Gap of leaflets from the rachis or petiole tip \[m\].
const LEAFLET_GAP_M: f64 = 0.003;
/// Largest spread of palmate leaflets \[rad\] (270°).
const PALMATE_SPREAD_MAX_RAD: f64 = 1.5 * PI;

/// The petiolule length \[m\] that keeps palmate leaflets `step_rad` apart from touching: each
/// (convex) leaflet is kept inside its own wedge, seen from the petiole tip, of half-angle
/// 0.45 × the step, starting from [`LEAFLET_GAP_M`] and lengthening by 25 % until it fits.
fn palmate_gap_m(leaflet: &BladeProfile, step_rad: f64) -> f64 {
    let half = 0.45 * step_rad.min(PI);
    let fits = |g: f64| {
        (1..200).all(|k| {
            let s = f64::from(k) / 200.0;
            leaflet.half_width_m(s).atan2(g + s * leaflet.length_m) < half
        })
    };
    let mut g = LEAFLET_GAP_M;
    while !fits(g) && g < 1.0 {
        g *= 1.25;
    }
    g.min(1.0)
}

impl ShapeSection {
    /// The section for an imported outline (points in mm as read).
    #[must_use]
    pub fn imported(outline: &Outline, source: &str, wind_angle_rad: f64) -> Self {
        let mm = 1.0 / METRES_PER_MILLIMETRE;
        Self {
            family: ShapeFamily::Imported,
            outline_mm: outline
                .points()
                .iter()
                .map(|p| [p.x_m * mm, p.y_m * mm])
                .collect(),
            outline_source: source.to_owned(),
            wind_angle_rad,
            ..Self::default()
        }
    }

    /// Builds the outline(s) \[m\].
    ///
    /// # Errors
    /// A parameter out of the engine's range, leaflets that overlap, or an invalid imported outline.
    pub fn build(&self) -> Result<LeafShape, ShapeError> {
        let (l, w) = (self.length_m, self.width_m);
        let n = POINTS_PER_SIDE_DEFAULT;
        let one = |o: Result<Outline, ShapeError>| o.map(LeafShape::from);
        match self.family {
            ShapeFamily::Elliptic => one(BladeProfile::elliptic(l, w).outline(n)),
            ShapeFamily::Ovate => one(BladeProfile::ovate(l, w).outline(n)),
            ShapeFamily::Obovate => one(BladeProfile::obovate(l, w).outline(n)),
            ShapeFamily::Lanceolate => one(BladeProfile::lanceolate(l, w).outline(n)),
            ShapeFamily::Linear => one(BladeProfile::linear(l, w).outline(n)),
            ShapeFamily::Lobed => one(BladeProfile::ovate(l, w).lobed(self.lobes, self.depth, n)),
            ShapeFamily::PalmatelyLobed => one(palmately_lobed(l, self.lobes, self.depth, 4 * n)),
            ShapeFamily::PinnateCompound => {
                let leaflet = BladeProfile::elliptic(l, w);
                // Along the rachis a tilted leaflet spans about w / sin α at its base.
                let spacing = 1.6 * w / PINNATE_ANGLE_RAD.sin();
                pinnate_compound(
                    &leaflet,
                    self.leaflets,
                    spacing,
                    PINNATE_ANGLE_RAD,
                    LEAFLET_GAP_M,
                    true,
                )
            }
            ShapeFamily::PalmateCompound => {
                let leaflet = BladeProfile::elliptic(l, w);
                let count = self.leaflets.max(1);
                let spread =
                    (2.0 * PI * (count as f64 - 1.0) / count as f64).min(PALMATE_SPREAD_MAX_RAD);
                let step = if count > 1 {
                    spread / (count as f64 - 1.0)
                } else {
                    2.0 * PI
                };
                palmate_compound(
                    &leaflet,
                    self.leaflets,
                    spread,
                    palmate_gap_m(&leaflet, step),
                )
            }
            ShapeFamily::Imported => {
                let pts = self
                    .outline_mm
                    .iter()
                    .map(|p| Point::new(p[0] * METRES_PER_MILLIMETRE, p[1] * METRES_PER_MILLIMETRE))
                    .collect();
                one(Outline::new(pts))
            }
        }
    }
}

/// Wind directions of the direction plot: 0° to 180° in 1° steps \[–\].
pub const DIRECTION_STEPS: usize = 180;

/// Lines along the wind drawn over the outline \[–\].
pub const CHORD_LINES_SHOWN: usize = 24;

/// One chord drawn over the outline: its ends in the outline's frame \[m\].
pub type ChordSegment = [[f64; 2]; 2];

/// Everything the leaf-shape view shows, in SI units.
#[derive(Debug, Clone, PartialEq)]
pub struct ShapeReport {
    /// The section measured.
    pub section: ShapeSection,
    /// Each outline's points \[m\], closed (the first point repeated at the end).
    pub outlines_m: Vec<Vec<[f64; 2]>>,
    /// The metrics at the section's wind direction.
    pub metrics: ShapeMetrics,
    /// The effective dimension of the convex hull (the lobes filled in) \[m\]; lobed and imported
    /// single outlines only.
    pub hull_dimension_m: Option<f64>,
    /// (direction \[°\], effective dimension \[m\], hand rule \[m\]) from 0° to 180°.
    pub by_direction: Vec<(f64, f64, f64)>,
    /// Least, greatest and mean effective dimension over directions \[m\], with the directions
    /// of the extremes \[°\].
    pub min_m: (f64, f64),
    /// Greatest (value \[m\], direction \[°\]).
    pub max_m: (f64, f64),
    /// Mean over directions \[m\].
    pub mean_m: f64,
    /// A subset of the chords along the wind.
    pub chords: Vec<ChordSegment>,
    /// Most chords on one line along the wind (1 for a convex outline).
    pub chords_per_line_max: usize,
}

/// Measures a shape section (the background job of the leaf-shape view).
///
/// # Errors
/// The engine's message for an invalid parameter or outline.
pub fn measure(section: &ShapeSection) -> Result<ShapeReport, String> {
    let shape = section.build().map_err(|e| e.to_string())?;
    let angle = section.wind_angle_rad;
    let metrics = ShapeMetrics::of(&shape, angle).map_err(|e| e.to_string())?;
    let non_convex = matches!(
        section.family,
        ShapeFamily::Lobed | ShapeFamily::PalmatelyLobed | ShapeFamily::Imported
    );
    let hull_dimension_m = match shape.outlines() {
        [one] if non_convex => Some(effective_dimension_m(&one.convex_hull().into(), angle)),
        _ => None,
    };
    let by_direction = (0..=DIRECTION_STEPS)
        .map(|k| {
            let deg = 180.0 * k as f64 / DIRECTION_STEPS as f64;
            let a = deg.to_radians();
            (
                deg,
                effective_dimension_m(&shape, a),
                hand_rule_dimension_m(&shape, a),
            )
        })
        .collect();
    let sweep = sweep_effective_dimension(&shape, DIRECTION_STEPS).map_err(|e| e.to_string())?;
    let profile = chord_profile(&shape, angle, CHORD_LINES_SHOWN).map_err(|e| e.to_string())?;
    let (s, c) = angle.sin_cos();
    let to_xy = |xi: f64, eta: f64| [xi * c - eta * s, xi * s + eta * c];
    let chords = profile
        .lines
        .iter()
        .flat_map(|line| {
            line.chords.iter().map(move |ch| {
                [
                    to_xy(ch.upwind_m, line.across_m),
                    to_xy(ch.upwind_m + ch.length_m, line.across_m),
                ]
            })
        })
        .collect();
    let outlines_m = shape
        .outlines()
        .iter()
        .map(|o| {
            let mut v: Vec<[f64; 2]> = o.points().iter().map(|p| [p.x_m, p.y_m]).collect();
            if let Some(&first) = v.first() {
                v.push(first);
            }
            v
        })
        .collect();
    let report = ShapeReport {
        section: section.clone(),
        outlines_m,
        metrics,
        hull_dimension_m,
        by_direction,
        min_m: (sweep.min_m, sweep.min_angle_rad.to_degrees()),
        max_m: (sweep.max_m, sweep.max_angle_rad.to_degrees()),
        mean_m: sweep.mean_m,
        chords,
        chords_per_line_max: profile.max_chords_per_line(),
    };
    let finite = [
        report.metrics.effective_dimension_m,
        report.metrics.hand_rule_dimension_m,
        report.metrics.free_convection_length_m,
        report.mean_m,
    ]
    .iter()
    .all(|v| v.is_finite());
    if finite {
        Ok(report)
    } else {
        Err("the outline gives no finite effective dimension".to_owned())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // Every family builds with the defaults and with its own family switched on (common
    // practice, no source: the defaults must give a valid leaf).
    #[test]
    fn every_generated_family_builds_and_measures() {
        for family in ShapeFamily::ALL {
            if family == ShapeFamily::Imported {
                continue;
            }
            let s = ShapeSection {
                family,
                ..ShapeSection::default()
            };
            let r = measure(&s).unwrap_or_else(|e| panic!("{family:?}: {e}"));
            assert!(r.metrics.effective_dimension_m > 0.0, "{family:?}");
            assert_eq!(r.by_direction.len(), DIRECTION_STEPS + 1);
            assert!(!r.chords.is_empty());
        }
    }

    // Compound layouts for 1 to 8 leaflets and several leaflet shapes do not overlap.
    #[test]
    fn compound_layouts_do_not_overlap() {
        for family in [ShapeFamily::PinnateCompound, ShapeFamily::PalmateCompound] {
            for leaflets in 1..=8 {
                for (l, w) in [(0.04, 0.016), (0.08, 0.04), (0.05, 0.05), (0.12, 0.02)] {
                    let s = ShapeSection {
                        family,
                        leaflets,
                        length_m: l,
                        width_m: w,
                        ..ShapeSection::default()
                    };
                    assert!(s.build().is_ok(), "{family:?} {leaflets} {l} {w}");
                }
            }
        }
    }

    // The engine's proven property (shape.rs test `lobed_leaf_is_below_its_convex_hull`), seen
    // through this section.
    #[test]
    fn lobed_leaf_is_below_its_hull_and_the_hand_rule() {
        let s = ShapeSection {
            family: ShapeFamily::Lobed,
            ..ShapeSection::default()
        };
        let r = measure(&s).unwrap();
        let d = r.metrics.effective_dimension_m;
        assert!(d < r.hull_dimension_m.unwrap());
        assert!(d < r.metrics.hand_rule_dimension_m, "{d}");
    }

    #[test]
    fn imported_outline_round_trips_through_the_section() {
        let o = leafwind_physics::shape::outline_from_csv_mm("0,0\n100,0\n100,40\n0,40\n").unwrap();
        let s = ShapeSection::imported(&o, "rect.csv", 0.0);
        let r = measure(&s).unwrap();
        // Rectangle with the wind along its length: d_eff = L exactly (shape.rs derivation).
        assert!((r.metrics.effective_dimension_m - 0.1).abs() < 1e-12);
        let text = ron::to_string(&s).unwrap();
        let back: ShapeSection = ron::from_str(&text).unwrap();
        assert_eq!(back, s);
    }

    #[test]
    fn bad_parameters_are_errors_not_panics() {
        for s in [
            ShapeSection {
                length_m: 0.0,
                ..ShapeSection::default()
            },
            ShapeSection {
                width_m: f64::NAN,
                ..ShapeSection::default()
            },
            ShapeSection {
                family: ShapeFamily::Lobed,
                lobes: 0,
                ..ShapeSection::default()
            },
            ShapeSection {
                family: ShapeFamily::PalmatelyLobed,
                depth: 1.5,
                ..ShapeSection::default()
            },
            ShapeSection {
                family: ShapeFamily::Imported,
                ..ShapeSection::default()
            },
            ShapeSection {
                wind_angle_rad: f64::INFINITY,
                ..ShapeSection::default()
            },
        ] {
            assert!(measure(&s).is_err(), "{s:?}");
        }
    }
}

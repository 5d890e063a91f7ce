//! Validated outlines (simple polygons in the leaf plane) and sets of them.

use super::ShapeError;

/// A point in the leaf plane \[m\].
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Point {
    /// Co-ordinate along the file's (or generator's) x axis \[m\].
    pub x_m: f64,
    /// Co-ordinate along the y axis \[m\].
    pub y_m: f64,
}

impl Point {
    /// A point at (`x_m`, `y_m`) \[m\].
    #[must_use]
    pub const fn new(x_m: f64, y_m: f64) -> Self {
        Self { x_m, y_m }
    }

    /// Component along the wind blowing at θ from +x, given `cos` = cos θ and `sin` = sin θ:
    /// ξ = x cos θ + y sin θ \[m\].
    #[must_use]
    pub fn along(&self, cos: f64, sin: f64) -> f64 {
        self.x_m * cos + self.y_m * sin
    }

    /// Component across the same wind (to its left): η = −x sin θ + y cos θ \[m\].
    #[must_use]
    pub fn across(&self, cos: f64, sin: f64) -> f64 {
        -self.x_m * sin + self.y_m * cos
    }
}

/// A leaf outline: a simple (non-self-crossing) polygon with non-zero area, closed implicitly
/// (the last point joins the first), in either winding order.
///
/// Built only by [`Outline::new`] (or the generators and the CSV importer), which validate it.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct Outline {
    points: Vec<Point>,
}

/// Relative area below which an outline counts as degenerate: |A| ≤ 10⁻¹² P² (a circle has
/// A/P² = 1/(4π); common practice, no source).
const ZERO_AREA_RELATIVE: f64 = 1e-12;

impl Outline {
    /// Validates a list of points \[m\] as an outline.
    ///
    /// Consecutive repeated points (and a last point equal to the first, as many digitisers write)
    /// are merged. Errors name the point's row (its 1-based position in `points`).
    ///
    /// # Errors
    /// [`ShapeError::NotFinite`], [`ShapeError::Empty`], [`ShapeError::TooFewPoints`] (< 3 distinct
    /// points), [`ShapeError::ZeroArea`], [`ShapeError::SelfCrossing`] (every pair of non-adjacent
    /// edges is tested; adjacent edges may only share their vertex).
    pub fn new(points: Vec<Point>) -> Result<Self, ShapeError> {
        let rows = (1..=points.len()).collect();
        Self::with_rows(points, rows)
    }

    /// As [`Outline::new`] with the row number of each point given (for file import).
    pub(super) fn with_rows(points: Vec<Point>, rows: Vec<usize>) -> Result<Self, ShapeError> {
        debug_assert_eq!(points.len(), rows.len());
        for (p, &row) in points.iter().zip(&rows) {
            for (column, value) in [("x", p.x_m), ("y", p.y_m)] {
                if !value.is_finite() {
                    return Err(ShapeError::NotFinite { row, column, value });
                }
            }
        }
        if points.is_empty() {
            return Err(ShapeError::Empty);
        }
        // Merge consecutive repeats, then a closing repeat of the first point.
        let mut pts: Vec<Point> = Vec::with_capacity(points.len());
        let mut pts_rows: Vec<usize> = Vec::with_capacity(points.len());
        for (p, &row) in points.iter().zip(&rows) {
            if pts.last() != Some(p) {
                pts.push(*p);
                pts_rows.push(row);
            }
        }
        while pts.len() > 1 && pts.first() == pts.last() {
            pts.pop();
            pts_rows.pop();
        }
        let last_row = *rows.last().unwrap_or(&0);
        if pts.len() < 3 {
            return Err(ShapeError::TooFewPoints {
                found: pts.len(),
                last_row,
            });
        }
        // All points on one line: no area whatever the order (checked on the hull, because a
        // self-crossing figure of eight also has zero signed area but is reported as crossing).
        let hull = hull_points(&pts);
        let perimeter = perimeter(&pts);
        // Not finite (coordinates so large that the area overflows) counts as no usable area.
        let zero_area =
            |area: f64| !area.is_finite() || area <= ZERO_AREA_RELATIVE * perimeter * perimeter;
        if hull.len() < 3 || zero_area(signed_area(&hull).abs()) {
            return Err(ShapeError::ZeroArea {
                area_m2: signed_area(&pts).abs(),
                first_row: pts_rows[0],
                last_row,
            });
        }
        if let Some((i, j)) = first_crossing(&pts) {
            let n = pts.len();
            return Err(ShapeError::SelfCrossing {
                first_from_row: pts_rows[i],
                first_to_row: pts_rows[(i + 1) % n],
                second_from_row: pts_rows[j],
                second_to_row: pts_rows[(j + 1) % n],
            });
        }
        let area = signed_area(&pts).abs();
        if zero_area(area) {
            // A simple polygon whose hull has area has area too; kept as a guard against round-off.
            return Err(ShapeError::ZeroArea {
                area_m2: area,
                first_row: pts_rows[0],
                last_row,
            });
        }
        Ok(Self { points: pts })
    }

    /// The points \[m\], in the order given (the closing edge is implicit).
    #[must_use]
    pub fn points(&self) -> &[Point] {
        &self.points
    }

    /// The edges as (start, end) pairs, closing edge included.
    pub fn edges(&self) -> impl Iterator<Item = (Point, Point)> + '_ {
        let n = self.points.len();
        (0..n).map(move |i| (self.points[i], self.points[(i + 1) % n]))
    }

    /// Enclosed area A \[m²\] (shoelace formula; positive for either winding).
    #[must_use]
    pub fn area_m2(&self) -> f64 {
        signed_area(&self.points).abs()
    }

    /// Signed area \[m²\]: positive when the points run counter-clockwise.
    #[must_use]
    pub fn signed_area_m2(&self) -> f64 {
        signed_area(&self.points)
    }

    /// Perimeter P \[m\].
    #[must_use]
    pub fn perimeter_m(&self) -> f64 {
        perimeter(&self.points)
    }

    /// Area centroid \[m\] (the polygon centroid from the shoelace terms; common practice, no
    /// source).
    #[must_use]
    pub fn centroid(&self) -> Point {
        let a = signed_area(&self.points);
        let (mut cx, mut cy) = (0.0, 0.0);
        for (p, q) in self.edges() {
            let cross = p.x_m * q.y_m - q.x_m * p.y_m;
            cx += (p.x_m + q.x_m) * cross;
            cy += (p.y_m + q.y_m) * cross;
        }
        Point::new(cx / (6.0 * a), cy / (6.0 * a))
    }

    /// (least, greatest) component along the direction at `angle_rad` \[rad\] from +x \[m\].
    #[must_use]
    pub fn extent_along(&self, angle_rad: f64) -> (f64, f64) {
        let (sin, cos) = angle_rad.sin_cos();
        self.points
            .iter()
            .map(|p| p.along(cos, sin))
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
                (lo.min(v), hi.max(v))
            })
    }

    /// The outline moved by (`dx_m`, `dy_m`) \[m\].
    #[must_use]
    pub fn translated(&self, dx_m: f64, dy_m: f64) -> Self {
        self.map(|p| Point::new(p.x_m + dx_m, p.y_m + dy_m))
    }

    /// The outline scaled about the origin by `factor` \[–\].
    ///
    /// # Errors
    /// A factor that is not finite and positive ([`crate::PhysicsError::OutOfRange`]).
    pub fn scaled(&self, factor: f64) -> Result<Self, ShapeError> {
        crate::error::ValidRange {
            quantity: "scale factor",
            min: 1e-6,
            max: 1e6,
            unit: "",
        }
        .check(factor)?;
        Ok(self.map(|p| Point::new(p.x_m * factor, p.y_m * factor)))
    }

    /// The outline rotated counter-clockwise about the origin by `angle_rad` \[rad\].
    #[must_use]
    pub fn rotated(&self, angle_rad: f64) -> Self {
        let (s, c) = angle_rad.sin_cos();
        self.map(|p| Point::new(c * p.x_m - s * p.y_m, s * p.x_m + c * p.y_m))
    }

    /// The same outline with its points in reverse order (opposite winding).
    #[must_use]
    pub fn reversed(&self) -> Self {
        let mut points = self.points.clone();
        points.reverse();
        Self { points }
    }

    /// The convex hull (Andrew's monotone chain), counter-clockwise.
    #[must_use]
    pub fn convex_hull(&self) -> Self {
        // A valid outline has non-zero area, so its hull has at least three corners.
        Self {
            points: hull_points(&self.points),
        }
    }

    /// Applies a similarity transform (translation, rotation, positive scaling, reflection);
    /// such maps keep a valid outline valid.
    fn map(&self, f: impl Fn(&Point) -> Point) -> Self {
        Self {
            points: self.points.iter().map(f).collect(),
        }
    }
}

/// A leaf shape: one outline (a simple leaf) or several non-overlapping ones (the leaflets of a
/// compound leaf, or separate lobes).
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize))]
pub struct LeafShape {
    outlines: Vec<Outline>,
}

impl From<Outline> for LeafShape {
    fn from(outline: Outline) -> Self {
        Self {
            outlines: vec![outline],
        }
    }
}

impl LeafShape {
    /// A set of outlines that must neither overlap nor touch.
    ///
    /// # Errors
    /// [`ShapeError::NoOutlines`] for an empty list; [`ShapeError::LeafletsOverlap`] when two edges
    /// of different outlines meet or one outline lies inside another.
    pub fn new(outlines: Vec<Outline>) -> Result<Self, ShapeError> {
        if outlines.is_empty() {
            return Err(ShapeError::NoOutlines);
        }
        let boxes: Vec<[f64; 4]> = outlines.iter().map(|o| bbox(o.points())).collect();
        for i in 0..outlines.len() {
            for j in i + 1..outlines.len() {
                let (a, b) = (&boxes[i], &boxes[j]);
                if a[0] > b[2] || b[0] > a[2] || a[1] > b[3] || b[1] > a[3] {
                    continue;
                }
                let overlap = outlines[i]
                    .edges()
                    .any(|(p, q)| outlines[j].edges().any(|(r, s)| segments_meet(p, q, r, s)))
                    || contains(&outlines[i], outlines[j].points()[0])
                    || contains(&outlines[j], outlines[i].points()[0]);
                if overlap {
                    return Err(ShapeError::LeafletsOverlap {
                        first: i + 1,
                        second: j + 1,
                    });
                }
            }
        }
        Ok(Self { outlines })
    }

    /// The outlines.
    #[must_use]
    pub fn outlines(&self) -> &[Outline] {
        &self.outlines
    }

    /// Total area \[m²\].
    #[must_use]
    pub fn area_m2(&self) -> f64 {
        self.outlines.iter().map(Outline::area_m2).sum()
    }

    /// Total perimeter \[m\].
    #[must_use]
    pub fn perimeter_m(&self) -> f64 {
        self.outlines.iter().map(Outline::perimeter_m).sum()
    }

    /// (least, greatest) component of all points along the direction `angle_rad` \[rad\] \[m\].
    #[must_use]
    pub fn extent_along(&self, angle_rad: f64) -> (f64, f64) {
        self.outlines
            .iter()
            .map(|o| o.extent_along(angle_rad))
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), (a, b)| {
                (lo.min(a), hi.max(b))
            })
    }

    /// The shape scaled about the origin by `factor` \[–\].
    ///
    /// # Errors
    /// A factor that is not finite and positive.
    pub fn scaled(&self, factor: f64) -> Result<Self, ShapeError> {
        Ok(Self {
            outlines: self
                .outlines
                .iter()
                .map(|o| o.scaled(factor))
                .collect::<Result<_, _>>()?,
        })
    }

    /// The shape moved by (`dx_m`, `dy_m`) \[m\].
    #[must_use]
    pub fn translated(&self, dx_m: f64, dy_m: f64) -> Self {
        Self {
            outlines: self
                .outlines
                .iter()
                .map(|o| o.translated(dx_m, dy_m))
                .collect(),
        }
    }

    /// The shape rotated counter-clockwise about the origin by `angle_rad` \[rad\].
    #[must_use]
    pub fn rotated(&self, angle_rad: f64) -> Self {
        Self {
            outlines: self.outlines.iter().map(|o| o.rotated(angle_rad)).collect(),
        }
    }
}

/// Convex hull of points, counter-clockwise, collinear points dropped (Andrew's monotone chain;
/// common practice, no source).
fn hull_points(points: &[Point]) -> Vec<Point> {
    let mut pts = points.to_vec();
    pts.sort_by(|a, b| a.x_m.total_cmp(&b.x_m).then(a.y_m.total_cmp(&b.y_m)));
    pts.dedup();
    if pts.len() < 3 {
        return pts;
    }
    let mut hull: Vec<Point> = Vec::with_capacity(2 * pts.len());
    for pass in 0..2 {
        let start = hull.len();
        for k in 0..pts.len() {
            let p = if pass == 0 {
                pts[k]
            } else {
                pts[pts.len() - 1 - k]
            };
            while hull.len() >= start + 2
                && orient(hull[hull.len() - 2], hull[hull.len() - 1], p) <= 0.0
            {
                hull.pop();
            }
            hull.push(p);
        }
        hull.pop();
    }
    hull
}

/// Shoelace signed area \[m²\].
fn signed_area(pts: &[Point]) -> f64 {
    let n = pts.len();
    // Terms taken about the first point to limit cancellation for outlines far from the origin.
    let o = pts[0];
    let mut twice = 0.0;
    for i in 1..n.saturating_sub(1) {
        let (a, b) = (pts[i], pts[i + 1]);
        twice += (a.x_m - o.x_m) * (b.y_m - o.y_m) - (b.x_m - o.x_m) * (a.y_m - o.y_m);
    }
    0.5 * twice
}

fn perimeter(pts: &[Point]) -> f64 {
    let n = pts.len();
    (0..n)
        .map(|i| {
            let (p, q) = (pts[i], pts[(i + 1) % n]);
            (q.x_m - p.x_m).hypot(q.y_m - p.y_m)
        })
        .sum()
}

/// [xmin, ymin, xmax, ymax] \[m\].
fn bbox(pts: &[Point]) -> [f64; 4] {
    pts.iter().fold(
        [
            f64::INFINITY,
            f64::INFINITY,
            f64::NEG_INFINITY,
            f64::NEG_INFINITY,
        ],
        |b, p| {
            [
                b[0].min(p.x_m),
                b[1].min(p.y_m),
                b[2].max(p.x_m),
                b[3].max(p.y_m),
            ]
        },
    )
}

/// Twice the signed area of the triangle (o, a, b): > 0 when b lies left of o→a.
pub(super) fn orient(o: Point, a: Point, b: Point) -> f64 {
    (a.x_m - o.x_m) * (b.y_m - o.y_m) - (a.y_m - o.y_m) * (b.x_m - o.x_m)
}

/// Whether `p`, known to be collinear with segment a–b, lies within its bounding box.
fn within(a: Point, b: Point, p: Point) -> bool {
    p.x_m >= a.x_m.min(b.x_m)
        && p.x_m <= a.x_m.max(b.x_m)
        && p.y_m >= a.y_m.min(b.y_m)
        && p.y_m <= a.y_m.max(b.y_m)
}

/// Whether closed segments p–q and r–s share any point (crossing, touching or overlapping).
pub(super) fn segments_meet(p: Point, q: Point, r: Point, s: Point) -> bool {
    let d1 = orient(r, s, p);
    let d2 = orient(r, s, q);
    let d3 = orient(p, q, r);
    let d4 = orient(p, q, s);
    if ((d1 > 0.0 && d2 < 0.0) || (d1 < 0.0 && d2 > 0.0))
        && ((d3 > 0.0 && d4 < 0.0) || (d3 < 0.0 && d4 > 0.0))
    {
        return true;
    }
    (d1 == 0.0 && within(r, s, p))
        || (d2 == 0.0 && within(r, s, q))
        || (d3 == 0.0 && within(p, q, r))
        || (d4 == 0.0 && within(p, q, s))
}

/// The first pair of edges (i < j, edge k from point k to k + 1) that meet other than at a shared
/// vertex, if any.
///
/// Every pair of non-adjacent edges is tested; pairs whose x-ranges do not overlap are dismissed by
/// a sweep over the edges sorted by their least x (they cannot meet). Adjacent edges meet at their
/// shared vertex; they are also rejected when they run back over each other (collinear and
/// opposite).
fn first_crossing(pts: &[Point]) -> Option<(usize, usize)> {
    let n = pts.len();
    let edge = |k: usize| (pts[k], pts[(k + 1) % n]);
    // Adjacent edges k and k + 1 folding back over their shared vertex.
    for k in 0..n {
        let (a, b) = edge(k);
        let c = pts[(k + 2) % n];
        let dot = (b.x_m - a.x_m) * (c.x_m - b.x_m) + (b.y_m - a.y_m) * (c.y_m - b.y_m);
        if orient(a, b, c) == 0.0 && dot < 0.0 {
            let (i, j) = (k, (k + 1) % n);
            return Some((i.min(j), i.max(j)));
        }
    }
    let mut order: Vec<(f64, f64, usize)> = (0..n)
        .map(|k| {
            let (a, b) = edge(k);
            (a.x_m.min(b.x_m), a.x_m.max(b.x_m), k)
        })
        .collect();
    order.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mut found: Option<(usize, usize)> = None;
    for (ai, &(_, xmax, i)) in order.iter().enumerate() {
        for &(xmin_j, _, j) in &order[ai + 1..] {
            if xmin_j > xmax {
                break;
            }
            let adjacent = (i + 1) % n == j || (j + 1) % n == i;
            if adjacent {
                continue;
            }
            let (p, q) = edge(i);
            let (r, s) = edge(j);
            if segments_meet(p, q, r, s) {
                let pair = (i.min(j), i.max(j));
                // Report the pair that comes first in the outline, whatever the sweep order.
                if found.is_none_or(|f| pair < f) {
                    found = Some(pair);
                }
            }
        }
    }
    found
}

/// Whether `p` lies inside (or on) the outline (even–odd rule; boundary counts as inside).
fn contains(outline: &Outline, p: Point) -> bool {
    let mut inside = false;
    for (a, b) in outline.edges() {
        if orient(a, b, p) == 0.0 && within(a, b, p) {
            return true;
        }
        if (a.y_m > p.y_m) != (b.y_m > p.y_m) {
            let x = a.x_m + (p.y_m - a.y_m) * (b.x_m - a.x_m) / (b.y_m - a.y_m);
            if x > p.x_m {
                inside = !inside;
            }
        }
    }
    inside
}

#[cfg(test)]
mod tests {
    use super::*;

    fn square() -> Vec<Point> {
        vec![
            Point::new(0.0, 0.0),
            Point::new(1.0, 0.0),
            Point::new(1.0, 1.0),
            Point::new(0.0, 1.0),
        ]
    }

    // Shoelace formula (common practice, no source): a unit square has area 1 and perimeter 4.
    #[test]
    fn square_area_perimeter_centroid() {
        let o = Outline::new(square()).unwrap();
        assert!((o.area_m2() - 1.0).abs() < 1e-15);
        assert!((o.perimeter_m() - 4.0).abs() < 1e-15);
        let c = o.centroid();
        assert!((c.x_m - 0.5).abs() < 1e-15 && (c.y_m - 0.5).abs() < 1e-15);
        assert!(o.signed_area_m2() > 0.0 && o.reversed().signed_area_m2() < 0.0);
    }

    #[test]
    fn closing_and_repeated_points_are_merged() {
        let mut pts = square();
        pts.insert(1, pts[0]);
        pts.push(pts[0]);
        let o = Outline::new(pts).unwrap();
        assert_eq!(o.points().len(), 4);
    }

    #[test]
    fn bow_tie_is_rejected_naming_the_rows() {
        // (0,0) → (1,1) → (1,0) → (0,1): edges 1–2 and 3–4 cross at (0.5, 0.5).
        let pts = vec![
            Point::new(0.0, 0.0),
            Point::new(1.0, 1.0),
            Point::new(1.0, 0.0),
            Point::new(0.0, 1.0),
        ];
        let e = Outline::new(pts).unwrap_err();
        assert_eq!(
            e,
            ShapeError::SelfCrossing {
                first_from_row: 1,
                first_to_row: 2,
                second_from_row: 3,
                second_to_row: 4
            }
        );
    }

    #[test]
    fn touching_vertex_and_fold_back_are_rejected() {
        // A vertex (row 4) touching the non-adjacent edge from row 1 to row 2.
        let touching = vec![
            Point::new(0.0, 0.0),
            Point::new(2.0, 0.0),
            Point::new(2.0, 2.0),
            Point::new(1.0, 0.0),
            Point::new(0.0, 2.0),
        ];
        assert!(matches!(
            Outline::new(touching),
            Err(ShapeError::SelfCrossing { .. })
        ));
        // A spike that runs back over its own edge.
        let fold = vec![
            Point::new(0.0, 0.0),
            Point::new(2.0, 0.0),
            Point::new(1.0, 0.0),
            Point::new(1.0, 1.0),
        ];
        assert!(matches!(
            Outline::new(fold),
            Err(ShapeError::SelfCrossing { .. })
        ));
    }

    #[test]
    fn degenerate_inputs_are_rejected() {
        assert_eq!(Outline::new(vec![]), Err(ShapeError::Empty));
        assert_eq!(
            Outline::new(square()[..2].to_vec()),
            Err(ShapeError::TooFewPoints {
                found: 2,
                last_row: 2
            })
        );
        let line = vec![
            Point::new(0.0, 0.0),
            Point::new(1.0, 1.0),
            Point::new(2.0, 2.0),
        ];
        assert!(matches!(
            Outline::new(line),
            Err(ShapeError::ZeroArea { .. })
        ));
        let mut nan = square();
        nan[2].y_m = f64::NAN;
        assert!(matches!(
            Outline::new(nan),
            Err(ShapeError::NotFinite {
                row: 3,
                column: "y",
                ..
            })
        ));
    }

    #[test]
    fn hull_of_a_notched_square_is_the_square() {
        let mut pts = square();
        pts.insert(2, Point::new(0.5, 0.5)); // notch between (1,0) and (1,1)
        let o = Outline::new(pts).unwrap();
        assert!((o.area_m2() - 0.75).abs() < 1e-15);
        assert!((o.convex_hull().area_m2() - 1.0).abs() < 1e-15);
    }

    #[test]
    fn overlapping_leaflets_are_rejected() {
        let a = Outline::new(square()).unwrap();
        let inner = a.scaled(0.5).unwrap().translated(0.25, 0.25);
        assert_eq!(
            LeafShape::new(vec![a.clone(), inner]),
            Err(ShapeError::LeafletsOverlap {
                first: 1,
                second: 2
            })
        );
        let far = a.translated(2.0, 0.0);
        assert!(LeafShape::new(vec![a.clone(), far]).is_ok());
        let crossing = a.translated(0.5, 0.5);
        assert!(LeafShape::new(vec![a, crossing]).is_err());
    }
}

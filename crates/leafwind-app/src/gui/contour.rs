//! Iso-lines of a gridded field by marching squares, joined into polylines (egui_plot has no
//! contour item). Geometry only, no physics.
//!
//! Each cell's crossings are found by linear interpolation along its edges; the ambiguous saddle
//! cells are resolved by the mean of the four corners (the usual "asymptotic decider" shortcut;
//! Lorensen & Cline 1987 describe the cube version; from memory).

use std::collections::{HashMap, VecDeque};

/// A polyline in plot coordinates.
pub type Polyline = Vec<[f64; 2]>;

/// An edge of the grid: horizontal (between columns `c` and `c + 1` on row `r`) or vertical
/// (between rows `r` and `r + 1` on column `c`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
enum Edge {
    H(usize, usize),
    V(usize, usize),
}

/// Iso-lines at `level` of `values` (row-major, `values[r * xs.len() + c]` at (`xs[c]`, `ys[r]`)).
/// Cells with a non-finite corner are skipped.
#[must_use]
pub fn iso_lines(xs: &[f64], ys: &[f64], values: &[f64], level: f64) -> Vec<Polyline> {
    let w = xs.len();
    let h = ys.len();
    if w < 2 || h < 2 || values.len() != w * h || !level.is_finite() {
        return Vec::new();
    }
    let v = |r: usize, c: usize| values[r * w + c];
    let inside = |x: f64| x >= level;
    let point = |e: Edge| -> [f64; 2] {
        let ((r0, c0), (r1, c1)) = match e {
            Edge::H(r, c) => ((r, c), (r, c + 1)),
            Edge::V(r, c) => ((r, c), (r + 1, c)),
        };
        let (a, b) = (v(r0, c0), v(r1, c1));
        let t = if (b - a).abs() > 0.0 {
            ((level - a) / (b - a)).clamp(0.0, 1.0)
        } else {
            0.5
        };
        [
            xs[c0] + t * (xs[c1] - xs[c0]),
            ys[r0] + t * (ys[r1] - ys[r0]),
        ]
    };
    let mut segments: Vec<(Edge, Edge)> = Vec::new();
    for r in 0..h - 1 {
        for c in 0..w - 1 {
            let (v00, v01, v10, v11) = (v(r, c), v(r, c + 1), v(r + 1, c), v(r + 1, c + 1));
            if !(v00.is_finite() && v01.is_finite() && v10.is_finite() && v11.is_finite()) {
                continue;
            }
            let (i00, i01, i10, i11) = (inside(v00), inside(v01), inside(v10), inside(v11));
            let bottom = Edge::H(r, c);
            let top = Edge::H(r + 1, c);
            let left = Edge::V(r, c);
            let right = Edge::V(r, c + 1);
            let mut crossed = Vec::with_capacity(4);
            if i00 != i01 {
                crossed.push(bottom);
            }
            if i01 != i11 {
                crossed.push(right);
            }
            if i11 != i10 {
                crossed.push(top);
            }
            if i10 != i00 {
                crossed.push(left);
            }
            match crossed.len() {
                2 => segments.push((crossed[0], crossed[1])),
                4 => {
                    let centre_inside = inside(0.25 * (v00 + v01 + v10 + v11));
                    if centre_inside == i00 {
                        // v00's side joins through the centre: cut off the other two corners.
                        segments.push((bottom, right));
                        segments.push((left, top));
                    } else {
                        segments.push((bottom, left));
                        segments.push((top, right));
                    }
                }
                _ => {}
            }
        }
    }
    join(&segments)
        .into_iter()
        .map(|chain| chain.into_iter().map(point).collect())
        .collect()
}

/// Joins segments that share an edge point into chains.
fn join(segments: &[(Edge, Edge)]) -> Vec<Vec<Edge>> {
    let mut at: HashMap<Edge, Vec<usize>> = HashMap::new();
    for (i, &(a, b)) in segments.iter().enumerate() {
        at.entry(a).or_default().push(i);
        at.entry(b).or_default().push(i);
    }
    let mut used = vec![false; segments.len()];
    let mut chains = Vec::new();
    for start in 0..segments.len() {
        if used[start] {
            continue;
        }
        used[start] = true;
        let (a, b) = segments[start];
        let mut chain = VecDeque::from([a, b]);
        for forward in [true, false] {
            loop {
                let end = if forward {
                    chain[chain.len() - 1]
                } else {
                    chain[0]
                };
                let next = at
                    .get(&end)
                    .and_then(|list| list.iter().copied().find(|&i| !used[i]));
                let Some(i) = next else { break };
                used[i] = true;
                let (p, q) = segments[i];
                let other = if p == end { q } else { p };
                if forward {
                    chain.push_back(other);
                } else {
                    chain.push_front(other);
                }
            }
        }
        chains.push(chain.into_iter().collect());
    }
    chains
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn circle_gives_one_closed_ring_at_the_radius() {
        let n = 41;
        let xs: Vec<f64> = (0..n)
            .map(|i| -2.0 + 4.0 * i as f64 / (n - 1) as f64)
            .collect();
        let ys = xs.clone();
        let mut v = Vec::new();
        for &y in &ys {
            for &x in &xs {
                v.push((x * x + y * y).sqrt());
            }
        }
        let lines = iso_lines(&xs, &ys, &v, 1.0);
        assert_eq!(lines.len(), 1);
        let ring = &lines[0];
        assert!(ring.len() > 20);
        // Closed: first and last points coincide.
        let (f, l) = (ring[0], ring[ring.len() - 1]);
        assert!((f[0] - l[0]).abs() < 1e-12 && (f[1] - l[1]).abs() < 1e-12);
        // Linear interpolation of a cone: within the grid spacing squared of the radius.
        for p in ring {
            let r = (p[0] * p[0] + p[1] * p[1]).sqrt();
            assert!((r - 1.0).abs() < 0.01, "{r}");
        }
    }

    #[test]
    fn no_crossing_no_line() {
        let xs = [0.0, 1.0, 2.0];
        let ys = [0.0, 1.0];
        let v = [1.0; 6];
        assert!(iso_lines(&xs, &ys, &v, 5.0).is_empty());
        assert!(iso_lines(&xs, &ys, &[f64::NAN; 6], 0.5).is_empty());
    }
}

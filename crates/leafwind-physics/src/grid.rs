//! Leaf temperature over an air speed × leaf size grid, solved exactly cell by cell.
//!
//! Each row (one leaf size) is swept in speed, each solve starting from its neighbour's answer, so a
//! cell needs one or two Newton steps; the answer does not depend on the start (the bracketed root
//! is unique in moving air). Cells are solved to [`GRID_RESIDUAL_TOLERANCE_W_M2`] and given one
//! free Newton correction ([`PreparedLeaf::solve_temperature_polished_k`]). Rows are independent, so callers may solve them in parallel with [`leaf_temp_row`].

use crate::case::{AIR_SPEED_RANGE_M_S, LEAF_DIMENSION_RANGE_M, LeafCase};
use crate::constants::ZERO_CELSIUS_K;
use crate::energy_balance::{GRID_RESIDUAL_TOLERANCE_W_M2, PreparedLeaf};
use crate::error::Result;

/// Axis of a grid: `count` values from `min` to `max`, linear or logarithmic.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Axis {
    /// First value.
    pub min: f64,
    /// Last value.
    pub max: f64,
    /// Number of values (≥ 2).
    pub count: usize,
    /// Logarithmic spacing (both ends must then be positive).
    pub log: bool,
}

impl Axis {
    /// The `i`-th value.
    #[must_use]
    pub fn value(&self, i: usize) -> f64 {
        let n = self.count.max(2) - 1;
        let f = i.min(n) as f64 / n as f64;
        if self.log && self.min > 0.0 && self.max > 0.0 {
            (self.min.ln() + f * (self.max.ln() - self.min.ln())).exp()
        } else {
            self.min + f * (self.max - self.min)
        }
    }

    /// All values.
    #[must_use]
    pub fn values(&self) -> Vec<f64> {
        (0..self.count.max(2)).map(|i| self.value(i)).collect()
    }
}

/// The two axes of a wind × size map.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct GridAxes {
    /// Air speed \[m s⁻¹\].
    pub speed_m_s: Axis,
    /// Leaf characteristic dimension \[m\].
    pub dimension_m: Axis,
}

impl GridAxes {
    /// 256 × 256 cells: 0.05–5 m s⁻¹ and 5 mm–0.5 m, both logarithmic.
    #[must_use]
    pub fn default_map() -> Self {
        Self {
            speed_m_s: Axis {
                min: 0.05,
                max: 5.0,
                count: 256,
                log: true,
            },
            dimension_m: Axis {
                min: 0.005,
                max: 0.5,
                count: 256,
                log: true,
            },
        }
    }

    /// Checks both axes' ends against the engine's valid ranges.
    ///
    /// # Errors
    /// An end out of range.
    pub fn validate(&self) -> Result<()> {
        AIR_SPEED_RANGE_M_S.check(self.speed_m_s.min)?;
        AIR_SPEED_RANGE_M_S.check(self.speed_m_s.max)?;
        LEAF_DIMENSION_RANGE_M.check(self.dimension_m.min)?;
        LEAF_DIMENSION_RANGE_M.check(self.dimension_m.max)?;
        Ok(())
    }
}

/// A solved grid: `values[row * speeds.len() + col]` is the leaf temperature \[°C\] at
/// `dimensions_m[row]`, `speeds_m_s[col]`.
#[derive(Debug, Clone, PartialEq)]
pub struct LeafTempGrid {
    /// Air speeds of the columns \[m s⁻¹\].
    pub speeds_m_s: Vec<f64>,
    /// Leaf dimensions of the rows \[m\].
    pub dimensions_m: Vec<f64>,
    /// Leaf temperatures \[°C\], row-major.
    pub leaf_temp_c: Vec<f64>,
}

/// Leaf temperatures \[°C\] of `case` with leaf dimension `dimension_m` at each of `speeds_m_s`.
///
/// # Errors
/// An invalid case or speed.
pub fn leaf_temp_row(case: &LeafCase, dimension_m: f64, speeds_m_s: &[f64]) -> Result<Vec<f64>> {
    let mut out: Vec<f64> = Vec::with_capacity(speeds_m_s.len());
    let base = PreparedLeaf::new(&case.with_dimension(dimension_m))?;
    for (i, &u) in speeds_m_s.iter().enumerate() {
        let prepared = base.at_speed(u)?;
        // Start from the previous cells, extrapolated (cubically once four are known).
        let guess_k = match i {
            0 => f64::NAN,
            1 => out[0],
            2 => 2.0 * out[1] - out[0],
            3 => 3.0 * out[2] - 3.0 * out[1] + out[0],
            _ => 4.0 * out[i - 1] - 6.0 * out[i - 2] + 4.0 * out[i - 3] - out[i - 4],
        } + ZERO_CELSIUS_K;
        let leaf_temp_k =
            prepared.solve_temperature_polished_k(guess_k, GRID_RESIDUAL_TOLERANCE_W_M2)?;
        out.push(leaf_temp_k - ZERO_CELSIUS_K);
    }
    Ok(out)
}

/// The whole grid on the calling thread.
///
/// # Errors
/// An invalid case or axis.
pub fn leaf_temp_grid(case: &LeafCase, axes: &GridAxes) -> Result<LeafTempGrid> {
    axes.validate()?;
    let speeds = axes.speed_m_s.values();
    let dims = axes.dimension_m.values();
    let mut values = Vec::with_capacity(speeds.len() * dims.len());
    for &d in &dims {
        values.extend(leaf_temp_row(case, d, &speeds)?);
    }
    Ok(LeafTempGrid {
        speeds_m_s: speeds,
        dimensions_m: dims,
        leaf_temp_c: values,
    })
}

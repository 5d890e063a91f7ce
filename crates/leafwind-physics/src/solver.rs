//! A bracketed, safeguarded Newton root finder for a decreasing scalar function, and the report of
//! how it stopped.
//!
//! This is `rtsafe` of \[Press\] §9.4: Newton steps while they stay inside the bracket and shrink it
//! fast enough, bisection otherwise, so it always terminates with the root bracketed. It is written
//! here rather than taken from a crate because the leaf balance supplies its own (approximate)
//! derivative at no extra cost, which halves the function evaluations of a derivative-free method.
//!
//! \[Press\] Press, W. H., Teukolsky, S. A., Vetterling, W. T., Flannery, B. P. (2007).
//! *Numerical Recipes: The Art of Scientific Computing*, 3rd ed. Cambridge University Press.

use crate::error::{PhysicsError, Result};

/// Why the solver stopped.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum SolverStatus {
    /// The residual fell below the requested tolerance.
    Converged,
    /// The bracket shrank to the floating-point resolution before the residual tolerance was met;
    /// the result is the best available (its residual is reported).
    BracketCollapsed,
    /// The iteration limit was reached; the bracket midpoint is returned.
    IterationLimit,
}

impl SolverStatus {
    /// One sentence for a status line.
    #[must_use]
    pub fn sentence(&self) -> &'static str {
        match self {
            SolverStatus::Converged => "converged: the energy balance closes within tolerance",
            SolverStatus::BracketCollapsed => {
                "stopped at floating-point resolution; the residual shown is the best reachable"
            }
            SolverStatus::IterationLimit => "stopped at the iteration limit; check the residual",
        }
    }
}

/// How a solve went: iterations, final residual and status. Travels with every result.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct SolverReport {
    /// Function evaluations after bracketing (Newton or bisection steps).
    pub iterations: u32,
    /// Residual at the returned root, in the function's unit.
    pub residual: f64,
    /// Why it stopped.
    pub status: SolverStatus,
}

/// Settings of [`solve_decreasing`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SolverSettings {
    /// Stop when |f(x)| ≤ this.
    pub residual_tolerance: f64,
    /// Largest number of iterations inside the bracket.
    pub max_iterations: u32,
    /// First step when searching for a bracket from the initial guess.
    pub initial_step: f64,
    /// The search never leaves `[min_x, max_x]`.
    pub min_x: f64,
    /// Upper end of the search domain.
    pub max_x: f64,
}

/// Finds x with f(x) = 0 for a function that decreases through its root.
///
/// `f` returns (f(x), f′(x)); the derivative may be approximate (it only steers Newton steps) but
/// must be negative. The bracket is sought from `guess` by steps that double, within
/// `[min_x, max_x]`.
///
/// # Errors
/// [`PhysicsError::NoBracket`] if no sign change is found in the domain.
pub fn solve_decreasing(
    mut f: impl FnMut(f64) -> (f64, f64),
    guess: f64,
    settings: &SolverSettings,
    quantity: &'static str,
) -> Result<(f64, SolverReport)> {
    let clamp = |x: f64| x.clamp(settings.min_x, settings.max_x);
    let x0 = clamp(guess);
    let (f0, d0) = f(x0);
    if f0.abs() <= settings.residual_tolerance {
        return Ok((
            x0,
            SolverReport {
                iterations: 0,
                residual: f0,
                status: SolverStatus::Converged,
            },
        ));
    }
    // Bracket: lo has f > 0, hi has f < 0.
    let (mut lo, mut f_lo, mut hi, mut f_hi);
    let mut step = settings.initial_step.max((f0 / d0).abs() * 1.5);
    if f0 > 0.0 {
        lo = x0;
        f_lo = f0;
        loop {
            hi = clamp(lo + step);
            f_hi = f(hi).0;
            if f_hi <= 0.0 {
                break;
            }
            if hi >= settings.max_x {
                return Err(PhysicsError::NoBracket {
                    quantity,
                    low: x0,
                    high: hi,
                    f_low: f0,
                    f_high: f_hi,
                });
            }
            lo = hi;
            f_lo = f_hi;
            step *= 2.0;
        }
    } else {
        hi = x0;
        f_hi = f0;
        loop {
            lo = clamp(hi - step);
            f_lo = f(lo).0;
            if f_lo >= 0.0 {
                break;
            }
            if lo <= settings.min_x {
                return Err(PhysicsError::NoBracket {
                    quantity,
                    low: lo,
                    high: x0,
                    f_low: f_lo,
                    f_high: f0,
                });
            }
            hi = lo;
            f_hi = f_lo;
            step *= 2.0;
        }
    }
    if f_lo == 0.0 {
        return Ok((lo, converged(0, 0.0)));
    }
    if f_hi == 0.0 {
        return Ok((hi, converged(0, 0.0)));
    }
    // Start from the secant point of the bracket ([Press] §9.4 starts from the midpoint).
    let mut x = lo - f_lo * (hi - lo) / (f_hi - f_lo);
    let mut dx_old = hi - lo;
    let mut iterations = 0;
    while iterations < settings.max_iterations {
        iterations += 1;
        let (fx, dfx) = f(x);
        if fx.abs() <= settings.residual_tolerance {
            return Ok((x, converged(iterations, fx)));
        }
        if fx > 0.0 {
            lo = x;
        } else {
            hi = x;
        }
        let newton = if dfx < 0.0 { x - fx / dfx } else { f64::NAN };
        let next = if newton > lo && newton < hi && (newton - x).abs() < 0.5 * dx_old.abs() {
            newton
        } else {
            0.5 * (lo + hi)
        };
        dx_old = next - x;
        if next == x || hi - lo <= f64::EPSILON * 4.0 * x.abs().max(1.0) {
            return Ok((
                x,
                SolverReport {
                    iterations,
                    residual: fx,
                    status: SolverStatus::BracketCollapsed,
                },
            ));
        }
        x = next;
    }
    let (fx, _) = f(x);
    Ok((
        x,
        SolverReport {
            iterations,
            residual: fx,
            status: SolverStatus::IterationLimit,
        },
    ))
}

fn converged(iterations: u32, residual: f64) -> SolverReport {
    SolverReport {
        iterations,
        residual,
        status: SolverStatus::Converged,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const S: SolverSettings = SolverSettings {
        residual_tolerance: 1e-12,
        max_iterations: 100,
        initial_step: 1.0,
        min_x: -100.0,
        max_x: 100.0,
    };

    #[test]
    fn finds_a_cubic_root_with_a_poor_derivative() {
        // f = 8 - x³ decreasing, root 2; derivative deliberately off by a factor of 3.
        let (x, r) = solve_decreasing(|x| (8.0 - x * x * x, -x * x), 10.0, &S, "x").unwrap();
        assert!((x - 2.0).abs() < 1e-12, "{x}");
        assert_eq!(r.status, SolverStatus::Converged);
    }

    #[test]
    fn reports_no_bracket() {
        let e = solve_decreasing(|x| (5.0 - 0.0 * x, -1.0), 0.0, &S, "x");
        assert!(matches!(e, Err(PhysicsError::NoBracket { .. })));
    }

    #[test]
    fn never_steps_outside_the_bracket_with_a_wrong_sign_derivative() {
        let (x, _) = solve_decreasing(|x| (-(x - 3.0), 1.0), -50.0, &S, "x").unwrap();
        assert!((x - 3.0).abs() < 1e-9);
    }
}

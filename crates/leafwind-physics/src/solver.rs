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
    /// Function evaluations after the first (Newton, secant or bisection steps).
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
    /// Smallest step of the unbracketed phase (used when Newton's step vanishes).
    pub initial_step: f64,
    /// The search never leaves `[min_x, max_x]`.
    pub min_x: f64,
    /// Upper end of the search domain.
    pub max_x: f64,
}

/// Finds x with f(x) = 0 for a function that decreases through its root.
///
/// `f` returns (f(x), f′(x), f″(x)); the derivatives may be approximate (they only steer the
/// steps; f″ may be 0) but f′ must be negative. Phase 1 steps are Chebyshev's third-order
/// correction of Newton's, δ = −f/f′ − f″ δ²/(2 f′) (\[Press\] §9.4, "Halley-type" methods),
/// limited to the Newton step's size. Phase 1 takes Newton steps (secant ones where the derivative is unusable) from `guess` until the residual
/// tolerance is met or the root is bracketed, doubling the step whenever the residual fails to halve
/// (so it reaches the ends of `[min_x, max_x]` in a few steps if it must). Phase 2 is `rtsafe`
/// (\[Press\] §9.4) on the bracket, with secant slopes and bisection as the safeguard.
///
/// # Errors
/// [`PhysicsError::NoBracket`] if no sign change is found in the domain.
pub fn solve_decreasing(
    mut f: impl FnMut(f64) -> (f64, f64, f64),
    guess: f64,
    settings: &SolverSettings,
    quantity: &'static str,
) -> Result<(f64, SolverReport)> {
    let tol = settings.residual_tolerance;
    let clamp = |x: f64| x.clamp(settings.min_x, settings.max_x);
    let mut x = clamp(guess);
    let (mut fx, dfx, mut d2fx) = f(x);
    let mut iterations = 0;
    if fx.abs() <= tol {
        return Ok((x, report(iterations, fx, SolverStatus::Converged)));
    }
    let mut slope = if dfx < 0.0 { dfx } else { -1.0 };
    // Phase 1: unbracketed Newton/secant steps.
    let (mut lo, mut f_lo, mut hi, mut f_hi);
    let mut boost = 1.0;
    // The newest point and its derivative, where phase 2 starts.
    let (last_x, last_f, last_d);
    loop {
        iterations += 1;
        let newton = -fx / slope;
        let corrected = newton - d2fx * newton * newton / (2.0 * slope);
        let mut step = if corrected.is_finite()
            && corrected.abs() <= 1.5 * newton.abs()
            && corrected * newton > 0.0
        {
            corrected
        } else {
            newton
        } * boost;
        if step.abs() < settings.initial_step * 1e-9 {
            step = settings.initial_step * fx.signum();
        }
        let x_new = clamp(x + step);
        let (f_new, df_new, d2f_new) = f(x_new);
        if f_new.abs() <= tol {
            return Ok((x_new, report(iterations, f_new, SolverStatus::Converged)));
        }
        if (f_new > 0.0) != (fx > 0.0) {
            (last_x, last_f, last_d) = (x_new, f_new, df_new);
            if fx > 0.0 {
                (lo, f_lo, hi, f_hi) = (x, fx, x_new, f_new);
            } else {
                (lo, f_lo, hi, f_hi) = (x_new, f_new, x, fx);
            }
            break;
        }
        if x_new == x || iterations >= settings.max_iterations {
            // No sign change between the start and the end of the domain reached.
            let (low, high) = if fx > 0.0 {
                (clamp(guess), settings.max_x)
            } else {
                (settings.min_x, clamp(guess))
            };
            return Err(PhysicsError::NoBracket {
                quantity,
                low,
                high,
                f_low: fx,
                f_high: f_new,
            });
        }
        // The supplied derivative if it is usable, else the secant slope.
        let secant = (f_new - fx) / (x_new - x);
        slope = if df_new < 0.0 && df_new.is_finite() {
            df_new
        } else if secant < 0.0 && secant.is_finite() {
            secant
        } else {
            slope
        };
        boost = if f_new.abs() > 0.5 * fx.abs() {
            boost * 2.0
        } else {
            1.0
        };
        x = x_new;
        fx = f_new;
        d2fx = d2f_new;
    }
    // Phase 2: rtsafe on [lo, hi] with secant slopes (a Newton step from the newest point first).
    let newton_start = last_x - last_f / last_d;
    let mut x = if last_d < 0.0 && newton_start > lo && newton_start < hi {
        newton_start
    } else {
        lo - f_lo * (hi - lo) / (f_hi - f_lo)
    };
    let mut prev: Option<(f64, f64)> = Some((last_x, last_f));
    let mut dx_old = hi - lo;
    while iterations < settings.max_iterations {
        iterations += 1;
        let (fx, dfx, _) = f(x);
        if fx.abs() <= tol {
            return Ok((x, report(iterations, fx, SolverStatus::Converged)));
        }
        let nearest = if fx > 0.0 {
            let n = (hi, f_hi);
            lo = x;
            f_lo = fx;
            n
        } else {
            let n = (lo, f_lo);
            hi = x;
            f_hi = fx;
            n
        };
        let (px, pf) = prev.unwrap_or(nearest);
        let secant = (fx - pf) / (x - px);
        let slope = if secant < 0.0 && secant.is_finite() {
            secant
        } else {
            dfx
        };
        prev = Some((x, fx));
        let newton = if slope < 0.0 {
            x - fx / slope
        } else {
            f64::NAN
        };
        let next = if newton > lo && newton < hi && (newton - x).abs() < 0.5 * dx_old.abs() {
            newton
        } else {
            0.5 * (lo + hi)
        };
        dx_old = next - x;
        if next == x || hi - lo <= f64::EPSILON * 4.0 * x.abs().max(1.0) {
            return Ok((x, report(iterations, fx, SolverStatus::BracketCollapsed)));
        }
        x = next;
    }
    let (fx, _, _) = f(x);
    Ok((x, report(iterations, fx, SolverStatus::IterationLimit)))
}

fn report(iterations: u32, residual: f64, status: SolverStatus) -> SolverReport {
    SolverReport {
        iterations,
        residual,
        status,
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
        let (x, r) = solve_decreasing(|x| (8.0 - x * x * x, -x * x, 0.0), 10.0, &S, "x").unwrap();
        assert!((x - 2.0).abs() < 1e-12, "{x}");
        assert_eq!(r.status, SolverStatus::Converged);
    }

    #[test]
    fn reports_no_bracket() {
        let e = solve_decreasing(|x| (5.0 - 0.0 * x, -1.0, 0.0), 0.0, &S, "x");
        assert!(matches!(e, Err(PhysicsError::NoBracket { .. })));
    }

    #[test]
    fn never_steps_outside_the_bracket_with_a_wrong_sign_derivative() {
        let (x, _) = solve_decreasing(|x| (-(x - 3.0), 1.0, 0.0), -50.0, &S, "x").unwrap();
        assert!((x - 3.0).abs() < 1e-9);
    }
}

//! The velocity boundary layer over a leaf: the numerical Blasius solution, thicknesses, wall shear,
//! the turbulent power-law thickness past transition, and the conduction-equivalent thickness.
//!
//! The Blasius similarity equation f‴ + ½ f f″ = 0, f(0) = f′(0) = 0, f′(∞) = 1 is solved here by
//! shooting on f″(0) with a fourth-order Runge–Kutta integration (step 0.005 to η = 10), once per
//! process, and kept as a table; values between nodes are cubic-Hermite interpolated. With
//! η = y √(U/(ν x)), u/U = f′(η).
//!
//! # References
//! - \[Schlichting\] Schlichting, H., Gersten, K. (2017). *Boundary-Layer Theory*, 9th ed. Springer.
//!   §6.5 (Blasius): f″(0) = 0.332 06, δ₉₉ ≈ 5.0 x/√Re_x (η₉₉ = 4.91), δ₁ = 1.7208 x/√Re_x,
//!   δ₂ = 0.664 x/√Re_x.
//! - \[Incropera\] Incropera, F. P., et al. (2007). *Fundamentals of Heat and Mass Transfer*, 6th ed.
//!   Eq. 7.19 (δ = 5.0 x/√Re_x, the textbook fit) and eq. 7.35 (turbulent δ = 0.37 x Re_x^{−1/5}, the
//!   1/7-power-law profile, turbulent from the leading edge).
//! - \[Press\] Press, W. H., et al. (2007). *Numerical Recipes*, 3rd ed. Cambridge. §17.1 (RK4).

use std::sync::OnceLock;

use nalgebra::Vector3;

/// Similarity-variable extent of the numerical solution \[–\]; f′ differs from 1 by < 10⁻⁹ beyond it.
pub const BLASIUS_ETA_MAX: f64 = 10.0;
/// Integration step in η \[–\].
const BLASIUS_STEP: f64 = 0.005;

/// The tabulated numerical Blasius solution.
#[derive(Debug, Clone)]
pub struct BlasiusSolution {
    /// η at each node (uniform, step 0.005).
    eta: Vec<f64>,
    /// (f, f′, f″) at each node.
    state: Vec<Vector3<f64>>,
    /// f″(0): the dimensionless wall shear.
    wall_shear: f64,
    /// η at which f′ = 0.99.
    eta_99: f64,
    /// ∫₀^∞ (1 − f′) dη (displacement).
    displacement: f64,
    /// ∫₀^∞ f′(1 − f′) dη (momentum).
    momentum: f64,
    /// Shooting iterations used.
    iterations: usize,
}

/// Right-hand side of the Blasius system y = (f, f′, f″): y′ = (f′, f″, −½ f f″).
fn blasius_rhs(y: &Vector3<f64>) -> Vector3<f64> {
    Vector3::new(y[1], y[2], -0.5 * y[0] * y[2])
}

/// Integrates from η = 0 with f″(0) = `wall_shear`; returns the nodes.
fn integrate(wall_shear: f64) -> Vec<Vector3<f64>> {
    let n = (BLASIUS_ETA_MAX / BLASIUS_STEP).round() as usize;
    let h = BLASIUS_STEP;
    let mut y = Vector3::new(0.0, 0.0, wall_shear);
    let mut out = Vec::with_capacity(n + 1);
    out.push(y);
    for _ in 0..n {
        // Classical RK4, [Press] eq. 17.1.3.
        let k1 = blasius_rhs(&y);
        let k2 = blasius_rhs(&(y + k1 * (h / 2.0)));
        let k3 = blasius_rhs(&(y + k2 * (h / 2.0)));
        let k4 = blasius_rhs(&(y + k3 * h));
        y += (k1 + k2 * 2.0 + k3 * 2.0 + k4) * (h / 6.0);
        out.push(y);
    }
    out
}

impl BlasiusSolution {
    /// The solution, computed on first use (a few milliseconds) and shared afterwards.
    pub fn get() -> &'static BlasiusSolution {
        static SOLUTION: OnceLock<BlasiusSolution> = OnceLock::new();
        SOLUTION.get_or_init(Self::solve)
    }

    /// Shoots on f″(0) by bisection-safeguarded secant iteration until f′(η_max) = 1.
    fn solve() -> Self {
        let miss = |s: f64| integrate(s).last().map_or(f64::NAN, |y| y[1] - 1.0);
        // f′(∞) grows with f″(0); 0.1 undershoots and 1.0 overshoots.
        let (mut lo, mut hi) = (0.1, 1.0);
        let (mut f_lo, mut f_hi) = (miss(lo), miss(hi));
        let mut iterations = 0;
        let mut s = 0.5 * (lo + hi);
        while iterations < 200 {
            iterations += 1;
            // Secant (regula falsi) step, bisection if it leaves the bracket.
            let mut trial = lo - f_lo * (hi - lo) / (f_hi - f_lo);
            if !(trial > lo && trial < hi) {
                trial = 0.5 * (lo + hi);
            }
            let f_trial = miss(trial);
            s = trial;
            if f_trial.abs() < 1e-13 || (hi - lo) < 1e-14 {
                break;
            }
            if f_trial < 0.0 {
                lo = trial;
                f_lo = f_trial;
            } else {
                hi = trial;
                f_hi = f_trial;
            }
            // Illinois modification keeps regula falsi superlinear.
            if f_trial < 0.0 {
                f_hi *= 0.5;
            } else {
                f_lo *= 0.5;
            }
        }
        let state = integrate(s);
        let eta: Vec<f64> = (0..state.len()).map(|i| i as f64 * BLASIUS_STEP).collect();
        let last = state[state.len() - 1];
        let displacement = BLASIUS_ETA_MAX - last[0];
        // Trapezoid rule for the momentum integral (error ~ h² f‴ ≈ 1e-6).
        let g: Vec<f64> = state.iter().map(|y| y[1] * (1.0 - y[1])).collect();
        let momentum = g
            .windows(2)
            .map(|w| 0.5 * (w[0] + w[1]) * BLASIUS_STEP)
            .sum();
        let mut sol = Self {
            eta,
            state,
            wall_shear: s,
            eta_99: 0.0,
            displacement,
            momentum,
            iterations,
        };
        sol.eta_99 = sol.eta_at_velocity_ratio(0.99);
        sol
    }

    /// f″(0), the dimensionless wall shear (0.332 06 in \[Schlichting\]).
    #[must_use]
    pub fn wall_shear(&self) -> f64 {
        self.wall_shear
    }

    /// η at which u/U = 0.99 (4.91 in \[Schlichting\]).
    #[must_use]
    pub fn eta_99(&self) -> f64 {
        self.eta_99
    }

    /// ∫(1 − f′) dη, the displacement-thickness constant (1.7208 in \[Schlichting\]).
    #[must_use]
    pub fn displacement_constant(&self) -> f64 {
        self.displacement
    }

    /// ∫ f′(1 − f′) dη, the momentum-thickness constant (0.664 in \[Schlichting\]).
    #[must_use]
    pub fn momentum_constant(&self) -> f64 {
        self.momentum
    }

    /// Shooting iterations the solution took.
    #[must_use]
    pub fn iterations(&self) -> usize {
        self.iterations
    }

    /// u/U = f′(η) at any η ≥ 0 (1 beyond the table; 0 for η ≤ 0).
    #[must_use]
    pub fn velocity_ratio(&self, eta: f64) -> f64 {
        if eta.is_nan() || eta <= 0.0 {
            return 0.0;
        }
        if eta >= BLASIUS_ETA_MAX {
            return 1.0;
        }
        let i = ((eta / BLASIUS_STEP) as usize).min(self.eta.len() - 2);
        let (a, b) = (&self.state[i], &self.state[i + 1]);
        let t = (eta - self.eta[i]) / BLASIUS_STEP;
        // Cubic Hermite on f′ with its derivative f″ at both nodes.
        let h00 = 2.0 * t * t * t - 3.0 * t * t + 1.0;
        let h10 = t * t * t - 2.0 * t * t + t;
        let h01 = -2.0 * t * t * t + 3.0 * t * t;
        let h11 = t * t * t - t * t;
        h00 * a[1] + h10 * BLASIUS_STEP * a[2] + h01 * b[1] + h11 * BLASIUS_STEP * b[2]
    }

    /// The η at which f′(η) = `ratio` (0 < ratio < 1), by bisection on the interpolant.
    #[must_use]
    pub fn eta_at_velocity_ratio(&self, ratio: f64) -> f64 {
        let ratio = ratio.clamp(0.0, 1.0 - 1e-9);
        let (mut lo, mut hi) = (0.0, BLASIUS_ETA_MAX);
        for _ in 0..80 {
            let mid = 0.5 * (lo + hi);
            if self.velocity_ratio(mid) < ratio {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        0.5 * (lo + hi)
    }
}

/// Local Reynolds number Re_x = U x / ν \[–\].
fn local_reynolds(x_m: f64, speed_m_s: f64, kinematic_viscosity_m2_s: f64) -> f64 {
    speed_m_s * x_m / kinematic_viscosity_m2_s
}

/// Laminar 99 % velocity thickness δ₉₉ \[m\] from the numerical Blasius solution.
///
/// - `x_m`: distance from the leading edge \[m\]; `speed_m_s`: free-stream speed \[m s⁻¹\];
///   `kinematic_viscosity_m2_s` \[m² s⁻¹\].
///
/// δ₉₉ = η₉₉ x / √Re_x with η₉₉ = 4.91 (\[Schlichting\] §6.5). Returns +∞ in still air (U = 0).
///
/// ```
/// use leafwind_physics::boundary_layer::laminar_thickness_99_m;
/// // x = 50 mm, U = 1 m/s, ν = 1.5e-5: Re_x = 3333, δ ≈ 4.91 · 0.05 / 57.7 = 4.25 mm.
/// let d = laminar_thickness_99_m(0.05, 1.0, 1.5e-5);
/// assert!((d * 1e3 - 4.25).abs() < 0.01);
/// ```
#[must_use]
pub fn laminar_thickness_99_m(x_m: f64, speed_m_s: f64, kinematic_viscosity_m2_s: f64) -> f64 {
    let re_x = local_reynolds(x_m, speed_m_s, kinematic_viscosity_m2_s);
    if re_x <= 0.0 {
        return f64::INFINITY;
    }
    BlasiusSolution::get().eta_99() * x_m / re_x.sqrt()
}

/// Laminar displacement thickness δ₁ = 1.7208 x/√Re_x \[m\] (\[Schlichting\] §6.5), numerical constant.
#[must_use]
pub fn displacement_thickness_m(x_m: f64, speed_m_s: f64, kinematic_viscosity_m2_s: f64) -> f64 {
    let re_x = local_reynolds(x_m, speed_m_s, kinematic_viscosity_m2_s);
    if re_x <= 0.0 {
        return f64::INFINITY;
    }
    BlasiusSolution::get().displacement_constant() * x_m / re_x.sqrt()
}

/// Laminar momentum thickness δ₂ = 0.664 x/√Re_x \[m\] (\[Schlichting\] §6.5), numerical constant.
#[must_use]
pub fn momentum_thickness_m(x_m: f64, speed_m_s: f64, kinematic_viscosity_m2_s: f64) -> f64 {
    let re_x = local_reynolds(x_m, speed_m_s, kinematic_viscosity_m2_s);
    if re_x <= 0.0 {
        return f64::INFINITY;
    }
    BlasiusSolution::get().momentum_constant() * x_m / re_x.sqrt()
}

/// Turbulent 99 % thickness δ = 0.37 x Re_x^{−1/5} \[m\] (\[Incropera\] eq. 7.35; 1/7-power law,
/// turbulent from the leading edge).
#[must_use]
pub fn turbulent_thickness_m(x_m: f64, speed_m_s: f64, kinematic_viscosity_m2_s: f64) -> f64 {
    let re_x = local_reynolds(x_m, speed_m_s, kinematic_viscosity_m2_s);
    if re_x <= 0.0 {
        return f64::INFINITY;
    }
    0.37 * x_m * re_x.powf(-0.2)
}

/// 99 % thickness at `x_m`, laminar (Blasius) up to Re_x = `critical_reynolds` and turbulent beyond.
///
/// Past transition the turbulent thickness is that of a layer turbulent from the leading edge (the
/// textbook simplification of \[Incropera\] eq. 7.35); it is larger than the laminar one there.
#[must_use]
pub fn thickness_99_m(
    x_m: f64,
    speed_m_s: f64,
    kinematic_viscosity_m2_s: f64,
    critical_reynolds: f64,
) -> f64 {
    if local_reynolds(x_m, speed_m_s, kinematic_viscosity_m2_s) <= critical_reynolds {
        laminar_thickness_99_m(x_m, speed_m_s, kinematic_viscosity_m2_s)
    } else {
        turbulent_thickness_m(x_m, speed_m_s, kinematic_viscosity_m2_s)
    }
}

/// Wall shear rate ∂u/∂y at the surface \[s⁻¹\] in the laminar layer:
/// γ̇ = f″(0) U √(U/(ν x)) (\[Schlichting\] §6.5). +∞ at the leading edge, 0 in still air.
#[must_use]
pub fn wall_shear_rate_per_s(x_m: f64, speed_m_s: f64, kinematic_viscosity_m2_s: f64) -> f64 {
    if speed_m_s <= 0.0 {
        return 0.0;
    }
    if x_m <= 0.0 {
        return f64::INFINITY;
    }
    BlasiusSolution::get().wall_shear()
        * speed_m_s
        * (speed_m_s / (kinematic_viscosity_m2_s * x_m)).sqrt()
}

/// Wall shear stress τ_w = μ ∂u/∂y \[Pa\] in the laminar layer (\[Schlichting\] §6.5).
#[must_use]
pub fn wall_shear_stress_pa(
    x_m: f64,
    speed_m_s: f64,
    kinematic_viscosity_m2_s: f64,
    dynamic_viscosity_pa_s: f64,
) -> f64 {
    dynamic_viscosity_pa_s * wall_shear_rate_per_s(x_m, speed_m_s, kinematic_viscosity_m2_s)
}

/// The laminar velocity profile at `x_m`: `points` pairs (height above the surface \[m\], u \[m s⁻¹\])
/// from the wall to 1.5 δ₉₉. Empty in still air.
#[must_use]
pub fn velocity_profile(
    x_m: f64,
    speed_m_s: f64,
    kinematic_viscosity_m2_s: f64,
    points: usize,
) -> Vec<(f64, f64)> {
    if speed_m_s <= 0.0 || x_m <= 0.0 || points < 2 {
        return Vec::new();
    }
    let sol = BlasiusSolution::get();
    let scale = (kinematic_viscosity_m2_s * x_m / speed_m_s).sqrt(); // y = η √(ν x / U)
    let eta_top = 1.5 * sol.eta_99();
    (0..points)
        .map(|i| {
            let eta = eta_top * i as f64 / (points - 1) as f64;
            (eta * scale, speed_m_s * sol.velocity_ratio(eta))
        })
        .collect()
}

/// Conduction-equivalent ("effective") boundary-layer thickness k/h \[m\]: the still-air layer that
/// would conduct heat as the real boundary layer convects it (\[CN98\]-style resistance view).
///
/// - `thermal_conductivity_w_m_k` \[W m⁻¹ K⁻¹\]; `heat_transfer_w_m2_k` \[W m⁻² K⁻¹\]. +∞ when h = 0.
///
/// \[CN98\]: Campbell, G. S., Norman, J. M. (1998), *An Introduction to Environmental Biophysics*,
/// 2nd ed., ch. 7.
#[must_use]
pub fn effective_thickness_m(thermal_conductivity_w_m_k: f64, heat_transfer_w_m2_k: f64) -> f64 {
    if heat_transfer_w_m2_k <= 0.0 {
        return f64::INFINITY;
    }
    thermal_conductivity_w_m_k / heat_transfer_w_m2_k
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn profile_starts_at_rest_and_reaches_free_stream() {
        let p = velocity_profile(0.05, 2.0, 1.5e-5, 50);
        assert_eq!(p.len(), 50);
        assert!(p[0].1.abs() < 1e-12);
        assert!((p[49].1 / 2.0 - 1.0).abs() < 1e-3);
        assert!(p.windows(2).all(|w| w[1].1 >= w[0].1 && w[1].0 > w[0].0));
    }

    #[test]
    fn still_air_has_no_forced_layer() {
        assert!(laminar_thickness_99_m(0.05, 0.0, 1.5e-5).is_infinite());
        assert_eq!(wall_shear_rate_per_s(0.05, 0.0, 1.5e-5), 0.0);
        assert!(velocity_profile(0.05, 0.0, 1.5e-5, 10).is_empty());
    }

    #[test]
    fn interpolant_matches_nodes_and_is_monotone() {
        let s = BlasiusSolution::get();
        for i in [1usize, 100, 500, 1500] {
            assert!((s.velocity_ratio(s.eta[i]) - s.state[i][1]).abs() < 1e-12);
        }
        let mut last = 0.0;
        for k in 0..1000 {
            let v = s.velocity_ratio(k as f64 * 0.01);
            assert!(v >= last - 1e-12);
            last = v;
        }
    }
}

//! Numerical methods the solver shares: a bracketed root finder and a common logarithm.
//!
//! Kept apart from the physics so each method can be read and tested on its own.

/// log10(x) as ln(x)·log10(e), to within a few units in the last place of `f64::log10`.
///
/// The C library's log10 is its natural logarithm and a correction step on top; a curve takes
/// two or three at every speed (the friction line, the screw's Reynolds correction), and the
/// correction step showed as a tenth of their cost in its profile.
pub(crate) fn log10(x: f64) -> f64 {
    x.ln() * std::f64::consts::LOG10_E
}

/// How a bracketed root search ended.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) enum RootOutcome {
    /// The stopping test accepted `x` (with function value `fx`) after `iterations` evaluations.
    Converged { x: f64, fx: f64, iterations: u32 },
    /// The iteration cap was reached; `x` is the best estimate.
    IterationCap { iterations: u32 },
}

/// Brent's method (Brent 1973, *Algorithms for Minimization without Derivatives*, ch. 4; the
/// form of Press et al., *Numerical Recipes*, §9.3): inverse quadratic interpolation and secant
/// steps, with bisection whenever they would leave the bracket or converge slowly, so it never
/// does worse than bisection. `f(a)` and `f(b)` must have opposite signs (or one be 0).
/// `accept(x, fx)` is the caller's stopping test, checked after every evaluation;
/// `x_tolerance` stops it when the bracket is that narrow. No allocation.
pub(crate) fn brent<E>(
    mut f: impl FnMut(f64) -> Result<f64, E>,
    (mut a, mut fa): (f64, f64),
    (mut b, mut fb): (f64, f64),
    accept: impl Fn(f64, f64) -> bool,
    x_tolerance: f64,
    max_iterations: u32,
) -> Result<RootOutcome, E> {
    if accept(a, fa) {
        return Ok(RootOutcome::Converged {
            x: a,
            fx: fa,
            iterations: 0,
        });
    }
    if accept(b, fb) {
        return Ok(RootOutcome::Converged {
            x: b,
            fx: fb,
            iterations: 0,
        });
    }
    let (mut c, mut fc) = (b, fb);
    let (mut d, mut e) = (b - a, b - a);
    for iteration in 1..=max_iterations {
        if (fb > 0.0) == (fc > 0.0) && fb != 0.0 && fc != 0.0 {
            (c, fc) = (a, fa);
            d = b - a;
            e = d;
        }
        if fc.abs() < fb.abs() {
            (a, fa) = (b, fb);
            (b, fb) = (c, fc);
            (c, fc) = (a, fa);
        }
        let tolerance = 2.0 * f64::EPSILON * b.abs() + 0.5 * x_tolerance;
        let half_width = 0.5 * (c - b);
        if half_width.abs() <= tolerance || fb == 0.0 {
            return Ok(RootOutcome::Converged {
                x: b,
                fx: fb,
                iterations: iteration - 1,
            });
        }
        if e.abs() >= tolerance && fa.abs() > fb.abs() {
            let s = fb / fa;
            let (mut p, mut q);
            if a == c {
                p = 2.0 * half_width * s;
                q = 1.0 - s;
            } else {
                let (qa, r) = (fa / fc, fb / fc);
                p = s * (2.0 * half_width * qa * (qa - r) - (b - a) * (r - 1.0));
                q = (qa - 1.0) * (r - 1.0) * (s - 1.0);
            }
            if p > 0.0 {
                q = -q;
            }
            p = p.abs();
            let limit = (3.0 * half_width * q - (tolerance * q).abs()).min((e * q).abs());
            if 2.0 * p < limit {
                e = d;
                d = p / q;
            } else {
                d = half_width;
                e = d;
            }
        } else {
            d = half_width;
            e = d;
        }
        (a, fa) = (b, fb);
        b += if d.abs() > tolerance {
            d
        } else {
            tolerance.copysign(half_width)
        };
        fb = f(b)?;
        if accept(b, fb) {
            return Ok(RootOutcome::Converged {
                x: b,
                fx: fb,
                iterations: iteration,
            });
        }
    }
    Ok(RootOutcome::IterationCap {
        iterations: max_iterations,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::convert::Infallible;

    fn root_of(f: impl Fn(f64) -> f64, a: f64, b: f64) -> (f64, u32) {
        let accept = |_: f64, fx: f64| fx.abs() < 1e-14;
        match brent(
            |x| Ok::<_, Infallible>(f(x)),
            (a, f(a)),
            (b, f(b)),
            accept,
            1e-15,
            100,
        )
        .unwrap()
        {
            RootOutcome::Converged { x, iterations, .. } => (x, iterations),
            RootOutcome::IterationCap { .. } => panic!("did not converge"),
        }
    }

    #[test]
    fn brent_finds_roots_quickly() {
        let (x, iterations) = root_of(|x| x * x - 2.0, 0.0, 2.0);
        assert!((x - std::f64::consts::SQRT_2).abs() < 1e-14);
        assert!(iterations < 12, "{iterations} iterations");
        // A nasty one for pure secant steps: flat then steep (bisection fallback).
        let (x, _) = root_of(|x| (x - 0.3).powi(9) + 1e-3 * (x - 0.3), 0.0, 4.0);
        assert!((x - 0.3).abs() < 1e-10);
    }

    #[test]
    fn brent_reports_the_iteration_cap() {
        let g = |x: f64| (x - 0.3f64).powi(9) + 1e-3 * (x - 0.3);
        let f = |x: f64| Ok::<_, Infallible>(g(x));
        let outcome = brent(f, (0.0, g(0.0)), (4.0, g(4.0)), |_, _| false, 0.0, 3);
        assert_eq!(
            outcome.unwrap(),
            RootOutcome::IterationCap { iterations: 3 }
        );
    }
}

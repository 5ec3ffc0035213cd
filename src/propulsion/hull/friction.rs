//! ITTC-1957 model–ship correlation line and Reynolds number.

/// The lowest Reynolds number the friction line is evaluated at (dimensionless).
///
/// The ITTC-1957 line has a pole at Rn = 100 and no meaning far below model scale; a boat
/// creeping at a few mm/s would otherwise reach it. Below this floor the line's value at the
/// floor is used, which only affects speeds where friction is negligible anyway.
pub const MIN_REYNOLDS_NUMBER: f64 = 1.0e4;

/// Reynolds number V·L/ν (dimensionless) for speed m/s, length m and viscosity m²/s.
pub fn reynolds_number(speed: f64, length: f64, kinematic_viscosity: f64) -> f64 {
    speed * length / kinematic_viscosity
}

/// ITTC-1957 friction coefficient CF = 0.075/(log10 Rn − 2)² (dimensionless).
///
/// Rn below [`MIN_REYNOLDS_NUMBER`] (including 0 and NaN) is raised to that floor.
pub fn ittc1957_friction_coefficient(reynolds: f64) -> f64 {
    let rn = if reynolds > MIN_REYNOLDS_NUMBER {
        reynolds
    } else {
        MIN_REYNOLDS_NUMBER
    };
    let x = crate::propulsion::numeric::log10(rn) - 2.0;
    0.075 / (x * x)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn line_at_decades_equals_its_definition() {
        // ITTC (1957) line definition: at Rn = 10^k, CF = 0.075/(k − 2)² exactly.
        for k in 5..=10 {
            let want = 0.075 / f64::from((k - 2) * (k - 2));
            let got = ittc1957_friction_coefficient(10f64.powi(k));
            assert!((got - want).abs() < 1e-15, "k = {k}: {got} vs {want}");
        }
    }

    #[test]
    fn tiny_and_zero_reynolds_numbers_stay_finite() {
        for rn in [0.0, 50.0, 100.0, f64::NAN] {
            let cf = ittc1957_friction_coefficient(rn);
            assert!(cf.is_finite() && cf > 0.0, "Rn {rn} gave {cf}");
        }
    }
}

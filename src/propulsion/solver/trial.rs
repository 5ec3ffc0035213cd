//! Sea-trial log and calibration of the model against it.

/// Direction of a trial run, used to pair runs in opposite directions against current.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum RunDirection {
    /// The first heading of a pair (e.g. upstream / outbound).
    Out,
    /// The reciprocal heading.
    Back,
}

/// One measured run: engine rpm held, speed over ground measured (SI, rpm named).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct TrialRun {
    /// Engine speed held during the run, rpm.
    pub engine_rpm: f64,
    /// Measured speed over ground, m/s.
    pub speed_over_ground: f64,
    /// Direction of the run, if logged; runs at the same rpm in opposite directions are averaged.
    pub direction: Option<RunDirection>,
    /// Measured fuel volume flow, m³/s, if logged.
    pub fuel_volume_flow: Option<f64>,
}

use super::System;
use super::matching::point_at_engine_rpm;
use crate::propulsion::hull::{Interaction, InteractionMethod, ResistanceModel};
use crate::propulsion::{Subject, Warning};
use thiserror::Error;

/// Why a trial log could not be used for calibration.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum TrialError {
    /// The log holds no runs.
    #[error("the sea-trial log holds no runs")]
    Empty,
    /// A run's rpm or speed is not a positive finite number.
    #[error("trial run {index}: {field} must be a positive finite number, got {value}")]
    BadRun {
        /// 0-based index of the run in the log.
        index: usize,
        /// Which field.
        field: &'static str,
        /// The value given.
        value: f64,
    },
    /// An option is outside its meaningful range.
    #[error("{field} = {value} is not valid: {expected}")]
    BadOption {
        /// The option's name.
        field: &'static str,
        /// The value given.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
    /// No trial rpm could be predicted by the model, so nothing can be compared.
    #[error("no trial rpm could be predicted by the model: {0}")]
    NothingPredicted(String),
}

/// The runs at one rpm, averaged, with the model's predictions.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct TrialPoint {
    /// Engine rpm of the group (mean of its runs), rpm.
    pub engine_rpm: f64,
    /// Measured speed through the water: mean of the Out and Back means when both were run,
    /// otherwise the plain mean, m/s.
    pub measured_speed: f64,
    /// Number of runs averaged.
    pub runs: usize,
    /// Whether runs in both directions were averaged (so a steady current cancels).
    pub two_way: bool,
    /// Current along the Out heading, (mean Out − mean Back)/2, m/s, when two-way.
    pub current: Option<f64>,
    /// Predicted calm, clean-hull speed before calibration, m/s (`None` where unsolved).
    pub predicted_before: Option<f64>,
    /// Predicted calm, clean-hull speed after calibration, m/s.
    pub predicted_after: Option<f64>,
    /// Mean measured fuel volume flow, m³/s, if logged.
    pub measured_fuel_volume_flow: Option<f64>,
    /// Predicted fuel volume flow after calibration, m³/s.
    pub predicted_fuel_volume_flow: Option<f64>,
}

/// What the calibration fits.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum CalibrationFit {
    /// A factor on total resistance only.
    #[default]
    ResistanceFactor,
    /// A factor on total resistance, then a constant wake fraction with the factor held.
    ResistanceFactorAndWake,
}

/// Settings of the calibration.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct CalibrationOptions {
    /// What to fit.
    pub fit: CalibrationFit,
    /// Runs whose rpm differ by no more than this are one group, rpm.
    pub rpm_group_tolerance: f64,
    /// Search interval of the resistance factor.
    pub factor_range: (f64, f64),
    /// Search interval of the wake fraction.
    pub wake_range: (f64, f64),
    /// Width within which the minimiser locates the best value.
    pub tolerance: f64,
}

impl Default for CalibrationOptions {
    fn default() -> Self {
        Self {
            fit: CalibrationFit::ResistanceFactor,
            rpm_group_tolerance: 5.0,
            factor_range: (0.5, 2.0),
            wake_range: (0.0, 0.5),
            tolerance: 1e-5,
        }
    }
}

/// The calibration of a model against a trial log.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Calibration {
    /// The averaged trial points with their predictions.
    pub points: Vec<TrialPoint>,
    /// RMS of predicted − measured speed before calibration, m/s.
    pub rms_before: f64,
    /// RMS after calibration, m/s.
    pub rms_after: f64,
    /// The resistance factor in the model before calibration.
    pub resistance_factor_before: f64,
    /// The fitted resistance factor (multiplies calm, clean-hull water resistance).
    pub resistance_factor: f64,
    /// The fitted constant wake fraction, if asked for.
    pub wake_fraction: Option<f64>,
    /// The boat's service margin, left out of the fit and applied on top afterwards, fraction.
    pub service_margin: f64,
    /// The boat's fouling allowance, left out of the fit and applied on top afterwards, fraction.
    pub fouling: f64,
    /// The interaction to use after calibration (the fitted wake with the model's t and ηR).
    pub interaction: InteractionMethod,
    /// Warnings: one-way groups, runs the model could not predict, a fit at its bound.
    pub warnings: Vec<Warning>,
}

/// One group of runs before prediction.
struct Group {
    rpm: f64,
    speed: f64,
    runs: usize,
    two_way: bool,
    current: Option<f64>,
    fuel: Option<f64>,
}

fn mean(values: impl Iterator<Item = f64>) -> Option<f64> {
    let (sum, n) = values.fold((0.0, 0usize), |(s, n), v| (s + v, n + 1));
    (n > 0).then(|| sum / n as f64)
}

/// Groups runs by rpm and averages them; runs in opposite directions cancel a steady current.
fn group_runs(runs: &[TrialRun], tolerance: f64, warnings: &mut Vec<Warning>) -> Vec<Group> {
    let mut sorted: Vec<&TrialRun> = runs.iter().collect();
    sorted.sort_by(|a, b| a.engine_rpm.total_cmp(&b.engine_rpm));
    let mut groups = Vec::new();
    let mut start = 0;
    while start < sorted.len() {
        let mut end = start + 1;
        while end < sorted.len() && sorted[end].engine_rpm - sorted[start].engine_rpm <= tolerance {
            end += 1;
        }
        let members = &sorted[start..end];
        let rpm = mean(members.iter().map(|r| r.engine_rpm)).unwrap_or(0.0);
        let of = |dir: RunDirection| {
            mean(
                members
                    .iter()
                    .filter(|r| r.direction == Some(dir))
                    .map(|r| r.speed_over_ground),
            )
        };
        let (out, back) = (of(RunDirection::Out), of(RunDirection::Back));
        let (speed, two_way, current) = match (out, back) {
            (Some(o), Some(b)) => {
                let undirected = members.iter().filter(|r| r.direction.is_none()).count();
                if undirected > 0 {
                    warnings.push(Warning::about(
                        Subject::Trial,
                        "sea trial",
                        format!("{undirected} run(s) at {rpm:.0} rpm without a direction were left out of the two-way mean"),
                    ));
                }
                (0.5 * (o + b), true, Some(0.5 * (o - b)))
            }
            _ => {
                warnings.push(Warning::about(
                    Subject::Trial,
                    "sea trial",
                    format!("no reciprocal runs at {rpm:.0} rpm: any current is still in the measured speed"),
                ));
                (
                    mean(members.iter().map(|r| r.speed_over_ground)).unwrap_or(0.0),
                    false,
                    None,
                )
            }
        };
        let fuel = mean(members.iter().filter_map(|r| r.fuel_volume_flow));
        groups.push(Group {
            rpm,
            speed,
            runs: members.len(),
            two_way,
            current,
            fuel,
        });
        start = end;
    }
    groups
}

/// Predicted speeds at each group's rpm for `system` (`None` where unsolved).
fn predict(system: &System<'_>, groups: &[Group]) -> Vec<Option<(f64, f64)>> {
    groups
        .iter()
        .map(|g| {
            point_at_engine_rpm(system, g.rpm)
                .ok()
                .map(|p| (p.speed, p.fuel_volume_flow))
        })
        .collect()
}

/// Sum of squared speed errors; an unsolved group counts its whole measured speed as error, so
/// the fit is pushed back into the range the model can solve.
fn squared_error(system: &System<'_>, groups: &[Group]) -> f64 {
    groups
        .iter()
        .map(|g| {
            let predicted = point_at_engine_rpm(system, g.rpm)
                .map(|p| p.speed)
                .unwrap_or(0.0);
            (predicted - g.speed).powi(2)
        })
        .sum()
}

/// RMS over the groups the model could solve (m/s); `None` when none was solved.
fn rms(groups: &[Group], predicted: &[Option<(f64, f64)>]) -> Option<f64> {
    mean(
        groups
            .iter()
            .zip(predicted)
            .filter_map(|(g, p)| p.map(|(v, _)| (v - g.speed).powi(2))),
    )
    .map(f64::sqrt)
}

/// Brent's (1973, ch. 5) minimiser of `f` on `[low, high]`: golden-section steps where
/// parabolic interpolation is not trusted; stops when the minimum is located within
/// `tolerance`. The two ends are compared too, so a minimum at a bound is found. Returns the
/// abscissa.
pub(crate) fn minimum_on_interval(
    mut f: impl FnMut(f64) -> f64,
    low: f64,
    high: f64,
    tolerance: f64,
) -> f64 {
    const GOLDEN: f64 = 0.381_966_011_250_105_1; // (3 − √5)/2
    let (mut a, mut b) = (low, high);
    let mut x = a + GOLDEN * (b - a);
    let (mut w, mut v) = (x, x);
    let mut fx = f(x);
    let (mut fw, mut fv) = (fx, fx);
    let (mut d, mut e) = (0.0_f64, 0.0_f64);
    for _ in 0..200 {
        let middle = 0.5 * (a + b);
        let tol1 = 1e-10 * x.abs() + tolerance / 3.0;
        let tol2 = 2.0 * tol1;
        if (x - middle).abs() <= tol2 - 0.5 * (b - a) {
            break;
        }
        let mut golden = true;
        if e.abs() > tol1 {
            let r = (x - w) * (fx - fv);
            let mut q = (x - v) * (fx - fw);
            let mut p = (x - v) * q - (x - w) * r;
            q = 2.0 * (q - r);
            if q > 0.0 {
                p = -p;
            }
            q = q.abs();
            let previous = e;
            if p.abs() < (0.5 * q * previous).abs() && p > q * (a - x) && p < q * (b - x) {
                e = d;
                d = p / q;
                let u = x + d;
                if u - a < tol2 || b - u < tol2 {
                    d = tol1.copysign(middle - x);
                }
                golden = false;
            }
        }
        if golden {
            e = if x >= middle { a - x } else { b - x };
            d = GOLDEN * e;
        }
        let u = if d.abs() >= tol1 {
            x + d
        } else {
            x + tol1.copysign(d)
        };
        let fu = f(u);
        if fu <= fx {
            if u >= x {
                a = x;
            } else {
                b = x;
            }
            (v, fv, w, fw, x, fx) = (w, fw, x, fx, u, fu);
        } else {
            if u < x {
                a = u;
            } else {
                b = u;
            }
            if fu <= fw || w == x {
                (v, fv, w, fw) = (w, fw, u, fu);
            } else if fu <= fv || v == x || v == w {
                (v, fv) = (u, fu);
            }
        }
    }
    [(x, fx), (low, f(low)), (high, f(high))]
        .into_iter()
        .min_by(|p, q| p.1.total_cmp(&q.1))
        .map(|(x, _)| x)
        .unwrap_or(x)
}

fn validate(runs: &[TrialRun], options: &CalibrationOptions) -> Result<(), TrialError> {
    if runs.is_empty() {
        return Err(TrialError::Empty);
    }
    for (index, run) in runs.iter().enumerate() {
        for (field, value) in [
            ("engine rpm", run.engine_rpm),
            ("speed over ground", run.speed_over_ground),
        ] {
            if !(value.is_finite() && value > 0.0) {
                return Err(TrialError::BadRun {
                    index,
                    field,
                    value,
                });
            }
        }
        if let Some(fuel) = run.fuel_volume_flow
            && !(fuel.is_finite() && fuel >= 0.0)
        {
            return Err(TrialError::BadRun {
                index,
                field: "fuel rate",
                value: fuel,
            });
        }
    }
    let bad = |field, value, expected| {
        Err(TrialError::BadOption {
            field,
            value,
            expected,
        })
    };
    if !(options.rpm_group_tolerance.is_finite() && options.rpm_group_tolerance >= 0.0) {
        return bad(
            "rpm group tolerance",
            options.rpm_group_tolerance,
            "0 rpm or more",
        );
    }
    let (f0, f1) = options.factor_range;
    if !(f0.is_finite() && f1.is_finite() && 0.0 < f0 && f0 < f1) {
        return bad("resistance factor range", f0, "0 < low < high");
    }
    let (w0, w1) = options.wake_range;
    if !(w0.is_finite() && w1.is_finite() && -0.5 < w0 && w0 < w1 && w1 < 0.9) {
        return bad("wake fraction range", w0, "−0.5 < low < high < 0.9");
    }
    if !(options.tolerance.is_finite() && options.tolerance > 0.0) {
        return bad(
            "calibration tolerance",
            options.tolerance,
            "a positive number",
        );
    }
    Ok(())
}

/// Calibrates `system` against the trial `runs`: groups and averages them, predicts each rpm,
/// and fits a resistance factor (and optionally a wake fraction) by least squares on speed.
///
/// Predictions before and after are of the calm, clean hull (the system's service margin and
/// fouling set to zero): the fitted factor multiplies calm-water resistance at the trial's
/// condition, and [`Calibration::apply`] leaves the boat's margins to go on top of it.
pub fn calibrate(
    system: &System<'_>,
    runs: &[TrialRun],
    options: &CalibrationOptions,
) -> Result<Calibration, TrialError> {
    validate(runs, options)?;
    let (service_margin, fouling) = (
        system.resistance.margins.service,
        system.resistance.margins.fouling,
    );
    // The fit works on calm-water resistance: the boat's service margin and fouling are
    // allowances for later predictions, applied on top of the calibrated resistance, never
    // inside the fit (or they would be counted twice, once in the factor and once on top).
    let calm_model = system.resistance.calm_water();
    let calm_system = System {
        resistance: &calm_model,
        ..system.clone()
    };
    let system = &calm_system;
    let mut warnings = Vec::new();
    let groups = group_runs(runs, options.rpm_group_tolerance, &mut warnings);
    let before = predict(system, &groups);
    let rms_before = rms(&groups, &before).ok_or_else(|| {
        let reason = point_at_engine_rpm(system, groups[0].rpm)
            .err()
            .map(|e| e.to_string())
            .unwrap_or_default();
        TrialError::NothingPredicted(reason)
    })?;

    let (f0, f1) = options.factor_range;
    let (w0, w1) = options.wake_range;
    let with_factor = |factor: f64| {
        let mut model: ResistanceModel = system.resistance.clone();
        model.margins.resistance_factor = factor;
        model
    };
    let fit_factor = |interaction: InteractionMethod| {
        minimum_on_interval(
            |k| {
                let model = with_factor(k);
                let trial = System {
                    resistance: &model,
                    interaction,
                    ..system.clone()
                };
                squared_error(&trial, &groups)
            },
            f0,
            f1,
            options.tolerance,
        )
    };
    let mut factor = fit_factor(system.interaction);
    let mut calibrated = with_factor(factor);
    let mut interaction = system.interaction;
    let mut wake_fraction = None;
    if options.fit == CalibrationFit::ResistanceFactorAndWake {
        // Freeze t and ηR at the trial's mean speed; the wake and the factor are then fitted in
        // turn (two rounds of coordinate descent).
        let mean_speed = mean(groups.iter().map(|g| g.speed)).unwrap_or(0.0);
        let frozen = system.interaction.at_speed(
            &calibrated.hull,
            &calibrated.water,
            &system.screw_at_stern(),
            mean_speed,
        );
        let with_wake = |w: f64| {
            InteractionMethod::User(Interaction {
                wake_fraction: w,
                ..frozen
            })
        };
        let (mut k, mut w) = (factor, frozen.wake_fraction.clamp(w0, w1));
        for _ in 0..2 {
            let model = with_factor(k);
            w = minimum_on_interval(
                |w| {
                    let trial = System {
                        resistance: &model,
                        interaction: with_wake(w),
                        ..system.clone()
                    };
                    squared_error(&trial, &groups)
                },
                w0,
                w1,
                options.tolerance,
            );
            k = fit_factor(with_wake(w));
        }
        let model = with_factor(k);
        let both = System {
            resistance: &model,
            interaction: with_wake(w),
            ..system.clone()
        };
        let alone = System {
            resistance: &calibrated,
            ..system.clone()
        };
        if squared_error(&both, &groups) < squared_error(&alone, &groups) {
            factor = k;
            calibrated = model;
            interaction = with_wake(w);
            wake_fraction = Some(w);
            if (w - w0).abs() < 1e-3 || (w1 - w).abs() < 1e-3 {
                warnings.push(Warning::about(
                    Subject::Interaction,
                    "sea trial",
                    format!(
                        "the fitted wake fraction {w:.3} is at the end of its search range {w0:.2}–{w1:.2}"
                    ),
                ));
            }
        } else {
            warnings.push(Warning::about(
                Subject::Trial,
                "sea trial",
                "fitting the wake did not improve on the resistance factor alone: the wake is left as estimated",
            ));
        }
    }
    if (factor - f0).abs() < 1e-3 || (f1 - factor).abs() < 1e-3 {
        warnings.push(Warning::about(
            Subject::Trial,
            "sea trial",
            format!("the fitted resistance factor {factor:.3} is at the end of its search range {f0:.2}–{f1:.2}: check the log and the hull data"),
        ));
    }
    let after_system = System {
        resistance: &calibrated,
        interaction,
        ..system.clone()
    };
    let after = predict(&after_system, &groups);
    let rms_after = rms(&groups, &after).unwrap_or(f64::INFINITY);
    let (rms_after, factor, wake_fraction, interaction, after) = if rms_after <= rms_before {
        (rms_after, factor, wake_fraction, interaction, after)
    } else {
        // The fit can only lose to the start if it left the solvable range: keep the model.
        warnings.push(Warning::about(
            Subject::Trial,
            "sea trial",
            "the fit did not improve on the model: no correction applied",
        ));
        (
            rms_before,
            system.resistance.margins.resistance_factor,
            None,
            system.interaction,
            before.clone(),
        )
    };
    for (g, p) in groups.iter().zip(&before) {
        if p.is_none() {
            warnings.push(Warning::about(
                Subject::Trial,
                "sea trial",
                format!(
                    "the model could not predict {:.0} rpm: that point is left out of the RMS",
                    g.rpm
                ),
            ));
        }
    }
    let points = groups
        .iter()
        .zip(before.iter().zip(&after))
        .map(|(g, (b, a))| TrialPoint {
            engine_rpm: g.rpm,
            measured_speed: g.speed,
            runs: g.runs,
            two_way: g.two_way,
            current: g.current,
            predicted_before: b.map(|(v, _)| v),
            predicted_after: a.map(|(v, _)| v),
            measured_fuel_volume_flow: g.fuel,
            predicted_fuel_volume_flow: a.map(|(_, q)| q),
        })
        .collect();
    Ok(Calibration {
        points,
        rms_before,
        rms_after,
        resistance_factor_before: system.resistance.margins.resistance_factor,
        resistance_factor: factor,
        wake_fraction,
        service_margin,
        fouling,
        interaction,
        warnings,
    })
}

impl Calibration {
    /// Applies the fitted correction to a vessel (resistance factor, and the wake if fitted);
    /// the vessel's service margin and fouling stay as they are, on top of the factor.
    pub fn apply(&self, vessel: &mut super::Vessel) {
        vessel.resistance.margins.resistance_factor = self.resistance_factor;
        if self.wake_fraction.is_some() {
            vessel.interaction = self.interaction;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn run(rpm: f64, speed: f64, direction: Option<RunDirection>) -> TrialRun {
        TrialRun {
            engine_rpm: rpm,
            speed_over_ground: speed,
            direction,
            fuel_volume_flow: None,
        }
    }

    #[test]
    fn reciprocal_runs_cancel_a_steady_current() {
        let mut warnings = Vec::new();
        let runs = [
            run(2000.0, 3.0 + 0.4, Some(RunDirection::Out)),
            run(2002.0, 3.0 - 0.4, Some(RunDirection::Back)),
            run(1500.0, 2.5, None),
        ];
        let groups = group_runs(&runs, 5.0, &mut warnings);
        assert_eq!(groups.len(), 2);
        assert!((groups[1].speed - 3.0).abs() < 1e-12);
        assert!((groups[1].current.unwrap() - 0.4).abs() < 1e-12);
        assert!(!groups[0].two_way);
        assert_eq!(warnings.len(), 1, "{warnings:?}");
    }

    #[test]
    fn minimiser_finds_a_parabola_minimum_and_a_bound_minimum() {
        let x = minimum_on_interval(|x| (x - 1.234).powi(2), 0.5, 2.0, 1e-9);
        assert!((x - 1.234).abs() < 1e-6);
        let mut calls = 0;
        let y = minimum_on_interval(
            |x| {
                calls += 1;
                (x - 0.7).powi(2) + 0.1 * x.powi(4)
            },
            0.0,
            2.0,
            1e-6,
        );
        // d/dx: 2(x − 0.7) + 0.4x³ = 0 → x ≈ 0.64607 (Newton's method by hand)
        assert!((y - 0.646_07).abs() < 1e-4, "{y}");
        assert!(calls < 40, "{calls} evaluations");
        let edge = minimum_on_interval(|x| x, 0.5, 2.0, 1e-6);
        assert_eq!(edge, 0.5);
    }

    #[test]
    fn bad_runs_name_the_field() {
        let err = validate(
            &[run(2000.0, f64::NAN, None)],
            &CalibrationOptions::default(),
        )
        .unwrap_err();
        assert!(err.to_string().contains("speed over ground"), "{err}");
        assert_eq!(
            validate(&[], &CalibrationOptions::default()),
            Err(TrialError::Empty)
        );
    }
}

/// Fewest rpm groups a factor varying with speed is fitted to: two parameters need a third
/// point to leave anything to check them against.
pub const MIN_GROUPS_FOR_FROUDE_FIT: usize = 3;
/// Narrowest span of trial Froude numbers a factor varying with speed is fitted over: below it
/// the two factors are not told apart from the scatter (common practice).
pub const MIN_FROUDE_SPAN: f64 = 0.05;

/// The two-parameter fit: a calm-water factor at the trial's slowest and at its fastest
/// speed, straight between in Froude number and held outside.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct FroudeFit {
    /// The fitted factor profile.
    pub factor: crate::propulsion::hull::FroudeFactor,
    /// RMS of predicted − measured speed with it, m/s.
    pub rms_after: f64,
}

/// Why no two-parameter fit was made.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FroudeFitError {
    /// Too few rpm groups.
    #[error(
        "{0} rpm groups: a factor varying with speed needs at least {MIN_GROUPS_FOR_FROUDE_FIT}"
    )]
    TooFewGroups(usize),
    /// The runs span too few speeds.
    #[error(
        "the runs span Froude numbers {0:.3}–{1:.3}: a factor varying with speed needs a span of at least {MIN_FROUDE_SPAN}"
    )]
    NarrowSpan(f64, f64),
    /// The runs themselves are not usable.
    #[error(transparent)]
    Trial(#[from] TrialError),
}

/// Fits a calm-water factor varying with Froude number to `runs` on `system` (its resistance
/// factor is the start), by coordinate descent over the two end factors.
pub fn calibrate_by_froude(
    system: &System<'_>,
    runs: &[TrialRun],
    options: &CalibrationOptions,
) -> Result<FroudeFit, FroudeFitError> {
    validate(runs, options)?;
    // On calm water, as `calibrate` fits: the margins go on top of the calibrated resistance.
    let calm_model = system.resistance.calm_water();
    let calm_system = System {
        resistance: &calm_model,
        ..system.clone()
    };
    let system = &calm_system;
    let mut warnings = Vec::new();
    let groups = group_runs(runs, options.rpm_group_tolerance, &mut warnings);
    if groups.len() < MIN_GROUPS_FOR_FROUDE_FIT {
        return Err(FroudeFitError::TooFewGroups(groups.len()));
    }
    let hull = &system.resistance.hull;
    let froudes: Vec<f64> = groups.iter().map(|g| hull.froude_number(g.speed)).collect();
    let (froude_low, froude_high) = froudes
        .iter()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), f| {
            (lo.min(*f), hi.max(*f))
        });
    if froude_high.is_nan() || froude_low.is_nan() || froude_high - froude_low < MIN_FROUDE_SPAN {
        return Err(FroudeFitError::NarrowSpan(froude_low, froude_high));
    }
    let (f0, f1) = options.factor_range;
    let with = |low: f64, high: f64| {
        let mut model: ResistanceModel = system.resistance.clone();
        model.margins.froude_factor = Some(crate::propulsion::hull::FroudeFactor {
            froude_low,
            low,
            froude_high,
            high,
        });
        model
    };
    let error = |low: f64, high: f64| {
        let model = with(low, high);
        squared_error(
            &System {
                resistance: &model,
                ..system.clone()
            },
            &groups,
        )
    };
    let start = system.resistance.margins.resistance_factor;
    let (mut low, mut high) = (start, start);
    // Four rounds settle the two factors to well inside a trial's resolution.
    for _ in 0..4 {
        low = minimum_on_interval(|k| error(k, high), f0, f1, options.tolerance);
        high = minimum_on_interval(|k| error(low, k), f0, f1, options.tolerance);
    }
    let model = with(low, high);
    let after = predict(
        &System {
            resistance: &model,
            ..system.clone()
        },
        &groups,
    );
    let rms_after = rms(&groups, &after).unwrap_or(f64::INFINITY);
    Ok(FroudeFit {
        factor: crate::propulsion::hull::FroudeFactor {
            froude_low,
            low,
            froude_high,
            high,
        },
        rms_after,
    })
}

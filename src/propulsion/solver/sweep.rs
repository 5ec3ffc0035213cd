//! Sweeps: diameter, gear, blades or area ratio varied over candidates, each matched to the
//! pitch target by the pitch search, then ranked.

use super::cruise::cruise_at_speed;
use super::matching::match_engine;
use super::pitch::{
    DesignError, PitchOptions, PitchTarget, SearchStop, TargetPoint, bseries_geometry,
    rebuilt_screw, search_pitch, system_with,
};
use super::{Installation, Vessel};
use crate::propulsion::screw::{BSeriesScrew, ScrewGeometry};

/// The limit the aperture around the screw sets on its diameter.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct ApertureLimit {
    /// Diameter of the largest disc that fits the aperture around the shaft centre, m.
    pub aperture_diameter: f64,
    /// Radial clearance kept between blade tip and hull, as a fraction of screw diameter
    /// (common practice: about 0.10–0.15 D).
    pub tip_clearance_fraction: f64,
}

impl ApertureLimit {
    /// The largest screw diameter that leaves the tip clearance: D = A/(1 + 2c), m.
    pub fn max_diameter(&self) -> f64 {
        self.aperture_diameter / (1.0 + 2.0 * self.tip_clearance_fraction)
    }
}

/// The usual gear sweep: the boat's ratio and ±0.25, ±0.5 around it (never below 1:1).
pub fn gear_ratios_around(gear_ratio: f64) -> Vec<f64> {
    let mut ratios: Vec<f64> = [-0.5, -0.25, 0.0, 0.25, 0.5]
        .iter()
        .map(|step| (gear_ratio + step).max(1.0))
        .collect();
    ratios.dedup_by(|a, b| (*a - *b).abs() < 1e-9);
    ratios
}

/// The usual blade-count sweep (inside the B-series range Z 2–7).
pub const USUAL_BLADE_COUNTS: [u32; 4] = [2, 3, 4, 5];

/// The usual expanded-area-ratio sweep (inside the B-series range 0.30–1.05).
pub const USUAL_AREA_RATIOS: [f64; 4] = [0.40, 0.55, 0.70, 0.85];

/// How many diameters the usual diameter sweep tries.
pub const DIAMETER_SWEEP_STEPS: usize = 6;

/// What a sweep varies, with its candidate values.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
#[serde(tag = "parameter", rename_all = "snake_case")]
pub enum SweepParameter {
    /// Screw diameter from `min_diameter` up to the aperture's limit in `count` even steps (m);
    /// the pitch ratio of the current screw is kept as the search's starting point.
    Diameter {
        /// Smallest diameter, m.
        min_diameter: f64,
        /// The aperture that sets the largest diameter.
        aperture: ApertureLimit,
        /// Number of diameters (≥ 2).
        count: usize,
    },
    /// Each available reduction ratio (engine rpm / screw rpm).
    GearRatio(Vec<f64>),
    /// Each blade count.
    Blades(Vec<u32>),
    /// Each expanded area ratio AE/A0.
    AreaRatio(Vec<f64>),
}

impl SweepParameter {
    /// The usual diameter sweep: `DIAMETER_SWEEP_STEPS` diameters from 80 % of the current
    /// screw (or of the largest, if smaller) up to `largest`, the largest screw the aperture
    /// takes with `tip_clearance` (m) kept between blade tip and hull, all in m.
    pub fn diameters_up_to(
        current: f64,
        largest: f64,
        tip_clearance: f64,
    ) -> Result<Self, DesignError> {
        if !(largest.is_finite() && largest > 0.0) {
            return Err(DesignError::BadInput {
                field: "largest screw diameter",
                value: largest,
                expected: "a positive length",
            });
        }
        if !(tip_clearance.is_finite() && tip_clearance >= 0.0 && tip_clearance < 0.5 * largest) {
            return Err(DesignError::BadInput {
                field: "tip clearance",
                value: tip_clearance,
                expected: "at least 0 and less than half of the largest screw diameter",
            });
        }
        // The aperture disc and the clearance as a fraction of the largest screw give back
        // exactly `largest` as the aperture's limit.
        Ok(SweepParameter::Diameter {
            min_diameter: (0.8 * current).min(0.8 * largest),
            aperture: ApertureLimit {
                aperture_diameter: largest + 2.0 * tip_clearance,
                tip_clearance_fraction: tip_clearance / largest,
            },
            count: DIAMETER_SWEEP_STEPS,
        })
    }

    /// The parameter's name for the user.
    pub fn name(&self) -> &'static str {
        match self {
            SweepParameter::Diameter { .. } => "diameter",
            SweepParameter::GearRatio(_) => "gear ratio",
            SweepParameter::Blades(_) => "blade count",
            SweepParameter::AreaRatio(_) => "area ratio AE/A0",
        }
    }
}

/// How sweep candidates are ranked.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum RankCriterion {
    /// Least fuel per distance at the target speed; within 0.1 % of each other, higher top
    /// speed first.
    #[default]
    LeastFuelPerDistance,
    /// Highest top speed; within 0.1 %, least fuel per distance first.
    HighestTopSpeed,
    /// Highest propulsive efficiency ηD = PE/PD at the target speed; within 0.1 %, higher top
    /// speed first.
    HighestPropulsiveEfficiency,
}

impl RankCriterion {
    /// The criterion as a sentence for the user.
    pub fn describe(&self) -> &'static str {
        match self {
            RankCriterion::LeastFuelPerDistance => {
                "least fuel per distance at the target speed; equal figures by higher top speed"
            }
            RankCriterion::HighestTopSpeed => {
                "highest top speed; equal figures by least fuel per distance at the target speed"
            }
            RankCriterion::HighestPropulsiveEfficiency => {
                "highest propulsive efficiency at the target speed; equal figures by higher top speed"
            }
        }
    }
}

/// One candidate of a sweep with its matching pitch and performance.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SweepCandidate {
    /// 1-based rank (unsolved candidates come last).
    pub rank: usize,
    /// The swept value (diameter m, gear ratio, blade count or area ratio).
    pub value: f64,
    /// The screw geometry at the matching pitch (pitch is the current one if unsolved).
    pub geometry: ScrewGeometry,
    /// Gear ratio used.
    pub gear_ratio: f64,
    /// How the pitch search stopped.
    pub stop: SearchStop,
    /// Matching pitch, m.
    pub pitch: Option<f64>,
    /// Top speed at full throttle, m/s.
    pub top_speed: Option<f64>,
    /// Whether the top speed is inside the resistance method's range (false: unreliable).
    pub top_speed_in_method_range: Option<bool>,
    /// Full-throttle engine rpm, rpm.
    pub meeting_rpm: Option<f64>,
    /// Open-water efficiency η0 at the target speed.
    pub open_water_efficiency_at_target: Option<f64>,
    /// Open-water efficiency η0 at top speed.
    pub open_water_efficiency_at_top: Option<f64>,
    /// Propulsive efficiency ηD = PE/PD at the target speed.
    pub propulsive_efficiency_at_target: Option<f64>,
    /// Propulsive efficiency ηD = PE/PD at top speed.
    pub propulsive_efficiency_at_top: Option<f64>,
    /// Fuel volume per distance at the target speed, m³/m.
    pub fuel_per_distance_at_target: Option<f64>,
    /// Why a figure is missing, if one is.
    pub problem: Option<String>,
    /// 1-based rank of its group's leader when the two are not told apart (the study's tie
    /// rule; `None` here in the core).
    pub tie_with: Option<usize>,
}

/// The ranked result of a sweep.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SweepResult {
    /// What was varied.
    pub parameter: &'static str,
    /// The ranking criterion, as a sentence.
    pub criterion: &'static str,
    /// The pitch target each candidate was matched to.
    pub target: PitchTarget,
    /// Target speed the efficiencies and fuel are given at, m/s.
    pub target_speed: f64,
    /// Candidates in rank order.
    pub candidates: Vec<SweepCandidate>,
    /// The tie band the study marked ties with (fraction of the leader's figure), if any.
    pub tie_band: Option<f64>,
}

/// Settings of a sweep.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
pub struct SweepOptions {
    /// Pitch search settings (target, range, tolerances).
    pub pitch: PitchOptions,
    /// Ranking criterion.
    pub criterion: RankCriterion,
}

/// Sweeps `parameter` for variant `index` of `vessel`: each candidate gets its matching pitch,
/// top speed, efficiencies and fuel per distance, ranked by `options.criterion`.
pub fn sweep(
    vessel: &Vessel,
    index: usize,
    parameter: &SweepParameter,
    options: &SweepOptions,
) -> Result<SweepResult, DesignError> {
    options.pitch.validate()?;
    let base = bseries_geometry(vessel, index)?;
    let target_point = options.pitch.target.point(vessel)?;
    let bad = |field, value, expected| DesignError::BadInput {
        field,
        value,
        expected,
    };
    let positive = |field: &'static str, v: f64| {
        if v.is_finite() && v > 0.0 {
            Ok(v)
        } else {
            Err(bad(field, v, "a positive finite number"))
        }
    };

    let mut setups: Vec<(f64, ScrewGeometry, f64)> = Vec::new();
    let gear = vessel.installation.gear_ratio;
    match parameter {
        SweepParameter::Diameter {
            min_diameter,
            aperture,
            count,
        } => {
            positive("smallest diameter", *min_diameter)?;
            positive("aperture diameter", aperture.aperture_diameter)?;
            let c = aperture.tip_clearance_fraction;
            if !(c.is_finite() && (0.0..0.5).contains(&c)) {
                return Err(bad(
                    "tip clearance fraction",
                    c,
                    "a fraction of diameter from 0 to 0.5",
                ));
            }
            let max = aperture.max_diameter();
            if max < *min_diameter {
                return Err(bad(
                    "smallest diameter",
                    *min_diameter,
                    "a diameter no larger than the aperture allows with the tip clearance",
                ));
            }
            if *count < 2 {
                return Err(bad("number of diameters", *count as f64, "at least 2"));
            }
            let ratio = base.pitch_ratio();
            for i in 0..*count {
                let d = min_diameter + (max - min_diameter) * i as f64 / (*count - 1) as f64;
                setups.push((
                    d,
                    ScrewGeometry {
                        diameter: d,
                        pitch: ratio * d,
                        ..base
                    },
                    gear,
                ));
            }
        }
        SweepParameter::GearRatio(ratios) => {
            for &g in ratios {
                positive("gear ratio", g)?;
                setups.push((g, base, g));
            }
        }
        SweepParameter::Blades(counts) => {
            for &z in counts {
                if !(2..=7).contains(&z) {
                    return Err(bad(
                        "blade count",
                        z as f64,
                        "2 to 7 blades (B-series range)",
                    ));
                }
                setups.push((z as f64, ScrewGeometry { blades: z, ..base }, gear));
            }
        }
        SweepParameter::AreaRatio(ratios) => {
            for &a in ratios {
                positive("area ratio", a)?;
                setups.push((
                    a,
                    ScrewGeometry {
                        area_ratio: a,
                        ..base
                    },
                    gear,
                ));
            }
        }
    }
    if setups.is_empty() {
        return Err(bad(
            "number of candidates",
            0.0,
            "at least one candidate value",
        ));
    }

    let target_speed = vessel.trip.target_speed;
    let mut candidates: Vec<SweepCandidate> = setups
        .into_iter()
        .map(|(value, geometry, gear_ratio)| {
            evaluate_candidate(
                vessel,
                value,
                geometry,
                gear_ratio,
                target_point,
                &options.pitch,
            )
        })
        .collect();
    rank_candidates(&mut candidates, options.criterion);
    Ok(SweepResult {
        parameter: parameter.name(),
        criterion: options.criterion.describe(),
        target: options.pitch.target,
        target_speed,
        candidates,
        tie_band: None,
    })
}

fn evaluate_candidate(
    vessel: &Vessel,
    value: f64,
    geometry: ScrewGeometry,
    gear_ratio: f64,
    target: TargetPoint,
    options: &PitchOptions,
) -> SweepCandidate {
    let installation = Installation {
        gear_ratio,
        ..vessel.installation
    };
    let mut candidate = SweepCandidate {
        rank: 0,
        value,
        geometry,
        gear_ratio,
        stop: SearchStop::IterationsExhausted,
        pitch: None,
        top_speed: None,
        top_speed_in_method_range: None,
        meeting_rpm: None,
        open_water_efficiency_at_target: None,
        open_water_efficiency_at_top: None,
        propulsive_efficiency_at_target: None,
        propulsive_efficiency_at_top: None,
        fuel_per_distance_at_target: None,
        problem: None,
        tie_with: None,
    };
    if let Err(e) = BSeriesScrew::new(geometry) {
        candidate.stop = SearchStop::BracketLost(format!("screw could not be built: {e}"));
        candidate.problem = Some(e.to_string());
        return candidate;
    }
    let search = search_pitch(vessel, geometry, installation, target, options);
    candidate.stop = search.stop.clone();
    let Some(pitch) = search.pitch else {
        candidate.problem = Some(match &search.stop {
            SearchStop::BracketLost(reason) => reason.clone(),
            _ => "the pitch search reached its iteration limit".to_string(),
        });
        return candidate;
    };
    candidate.pitch = Some(pitch);
    candidate.geometry.pitch = pitch;
    let screw = match rebuilt_screw(candidate.geometry) {
        Ok(s) => s,
        Err(e) => {
            candidate.problem = Some(e.to_string());
            return candidate;
        }
    };
    let system = system_with(vessel, &screw, installation);
    let propulsive = |pe: f64, pd: f64| (pd > 0.0).then(|| pe / pd);
    let mut problems = Vec::new();
    match match_engine(&system, &vessel.match_criteria) {
        Ok(m) => {
            candidate.top_speed = Some(m.top_speed);
            candidate.top_speed_in_method_range = Some(m.top_speed_in_method_range);
            candidate.meeting_rpm = Some(m.meeting_rpm);
            candidate.open_water_efficiency_at_top = Some(m.top_point.open_water_efficiency);
            candidate.propulsive_efficiency_at_top = propulsive(
                m.top_point.effective_power,
                m.top_point.delivered_power_total(),
            );
        }
        Err(e) => problems.push(format!("top speed: {e}")),
    }
    match cruise_at_speed(&system, &vessel.trip, vessel.trip.target_speed) {
        Ok(c) => {
            candidate.open_water_efficiency_at_target = Some(c.point.open_water_efficiency);
            candidate.propulsive_efficiency_at_target =
                propulsive(c.point.effective_power, c.point.delivered_power_total());
            candidate.fuel_per_distance_at_target = Some(c.fuel_per_distance);
            if c.beyond_full_load {
                problems
                    .push("the target speed is beyond the engine's full-load curve".to_string());
            }
        }
        Err(e) => problems.push(format!("target speed: {e}")),
    }
    if !problems.is_empty() {
        candidate.problem = Some(problems.join("; "));
    }
    candidate
}

/// Sorts candidates by the criterion; values equal to a part in 10⁹ of the best fall to the
/// second key. Which candidates are not told apart is the study's tie rule, not the order's.
fn rank_candidates(candidates: &mut [SweepCandidate], criterion: RankCriterion) {
    let primary = |c: &SweepCandidate| -> Option<f64> {
        match criterion {
            RankCriterion::LeastFuelPerDistance => c.fuel_per_distance_at_target,
            RankCriterion::HighestTopSpeed => c.top_speed.map(|v| -v),
            RankCriterion::HighestPropulsiveEfficiency => {
                c.propulsive_efficiency_at_target.map(|v| -v)
            }
        }
    };
    let secondary = |c: &SweepCandidate| -> f64 {
        match criterion {
            RankCriterion::HighestTopSpeed => {
                c.fuel_per_distance_at_target.unwrap_or(f64::INFINITY)
            }
            _ => c.top_speed.map(|v| -v).unwrap_or(f64::INFINITY),
        }
    };
    let scale = candidates
        .iter()
        .filter_map(&primary)
        .map(f64::abs)
        .fold(f64::INFINITY, f64::min);
    let bucket = if scale.is_finite() && scale > 0.0 {
        1e-9 * scale
    } else {
        1.0
    };
    let key = |c: &SweepCandidate| -> (f64, f64) {
        match primary(c) {
            Some(v) if v.is_finite() => ((v / bucket).round(), secondary(c)),
            _ => (f64::INFINITY, f64::INFINITY),
        }
    };
    candidates.sort_by(|a, b| {
        let (ka, kb) = (key(a), key(b));
        ka.0.total_cmp(&kb.0).then(ka.1.total_cmp(&kb.1))
    });
    for (i, c) in candidates.iter_mut().enumerate() {
        c.rank = i + 1;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn usual_diameter_sweep_ends_at_the_largest_screw() {
        let SweepParameter::Diameter {
            min_diameter,
            aperture,
            count,
        } = SweepParameter::diameters_up_to(0.66, 0.71, 0.09).unwrap()
        else {
            panic!("a diameter sweep");
        };
        assert!((aperture.max_diameter() - 0.71).abs() < 1e-12);
        assert!((min_diameter - 0.8 * 0.66).abs() < 1e-12);
        assert_eq!(count, DIAMETER_SWEEP_STEPS);
        assert!(SweepParameter::diameters_up_to(0.66, 0.71, 0.4).is_err());
        assert!(SweepParameter::diameters_up_to(0.66, -0.71, 0.0).is_err());
        assert_eq!(gear_ratios_around(1.2), vec![1.0, 1.2, 1.45, 1.7]);
    }

    #[test]
    fn aperture_limit_leaves_the_clearance_on_both_sides() {
        let limit = ApertureLimit {
            aperture_diameter: 0.72,
            tip_clearance_fraction: 0.1,
        };
        let d = limit.max_diameter();
        // the disc of the screw plus a clearance of 0.1·D each side fills the aperture
        assert!((d + 2.0 * 0.1 * d - 0.72).abs() < 1e-12);
    }

    #[test]
    fn ranking_puts_least_fuel_first_and_breaks_ties_by_top_speed() {
        let make = |fuel: Option<f64>, top: f64| SweepCandidate {
            rank: 0,
            value: top,
            geometry: ScrewGeometry {
                blades: 3,
                diameter: 0.5,
                pitch: 0.4,
                area_ratio: 0.5,
            },
            gear_ratio: 2.0,
            stop: SearchStop::Converged,
            pitch: Some(0.4),
            top_speed: Some(top),
            top_speed_in_method_range: Some(true),
            meeting_rpm: None,
            open_water_efficiency_at_target: None,
            open_water_efficiency_at_top: None,
            propulsive_efficiency_at_target: None,
            propulsive_efficiency_at_top: None,
            fuel_per_distance_at_target: fuel,
            problem: None,
            tie_with: None,
        };
        let mut list = vec![
            make(Some(2.0e-6), 4.0),
            make(None, 9.0),
            make(Some(1.0e-6), 4.1),
            make(Some(1.0e-6 * (1.0 + 1e-12)), 4.3),
        ];
        rank_candidates(&mut list, RankCriterion::LeastFuelPerDistance);
        let order: Vec<f64> = list.iter().map(|c| c.value).collect();
        assert_eq!(order, vec![4.3, 4.1, 4.0, 9.0]);
        assert_eq!(list[3].rank, 4);
    }
}

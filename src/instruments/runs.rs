//! The steady-run finder: segments a time series into runs at steady rpm, course and speed,
//! averages each run, rejects the unsteady ones with a reason, and pairs reciprocal runs.
//!
//! # Rules
//!
//! A segment is a stretch of samples, each with an rpm, where
//! - the rpm stays within the tolerance of the segment's mean rpm: the larger of
//!   [`RunOptions::rpm_tolerance_fraction`] (1.5 %) and [`RunOptions::rpm_tolerance_rpm`]
//!   (25 rpm) — common practice;
//! - the course over ground (when under way) stays within [`RunOptions::course_tolerance_deg`]
//!   (20°) of the segment's circular mean — so a turn at constant throttle splits a run;
//! - no gap between samples exceeds [`RunOptions::max_gap_s`] (5 s).
//!
//! A sample breaking a rule ends the segment and starts the next. From each segment the first
//! [`RunOptions::settle_s`] (20 s, common practice for a displacement hull) are dropped, while
//! the boat gathers speed after a throttle step or a turn. What is left must last
//! [`RunOptions::min_duration_s`] (60 s, common practice), have a GPS speed in at least
//! [`RunOptions::min_fix_fraction`] of its samples, be under way, hold its speed (standard
//! deviation and end-to-end drift of a straight-line fit within limits) and its rpm (drift
//! within the rpm tolerance). Segments shorter than [`RunOptions::min_reported_s`] before
//! trimming are throttle or helm transients: counted, not listed.
//!
//! Each run is averaged: mean rpm, SOG, STW and fuel flow; COG and heading as circular means.
//! A run is paired with the latest earlier unpaired run at the same rpm (within the rpm
//! tolerance) whose course is within [`RunOptions::reciprocal_tolerance_deg`] (30°) of
//! reciprocal; the earlier is [`RunDirection::Out`], the later [`RunDirection::Back`], so the
//! core's two-way mean removes a steady current.

use super::{
    BadLine, LineSummary, METRES_PER_SECOND_PER_KNOT, Sample, angle_between_deg, circular_mean_deg,
};
use crate::propulsion::solver::trial::{RunDirection, TrialRun};
use std::fmt;

/// Settings of the run finder; [`Default`] gives the documented common-practice values.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct RunOptions {
    /// Relative rpm tolerance, fraction of the mean rpm (default 0.015).
    pub rpm_tolerance_fraction: f64,
    /// Absolute rpm tolerance, rpm (default 25); the larger of the two applies.
    pub rpm_tolerance_rpm: f64,
    /// Course band around the segment's mean course, degrees (default 20).
    pub course_tolerance_deg: f64,
    /// Largest gap between samples inside a run, s (default 5).
    pub max_gap_s: f64,
    /// Time dropped at the start of each segment while speed settles, s (default 20).
    pub settle_s: f64,
    /// Shortest steady run kept, after settling, s (default 60).
    pub min_duration_s: f64,
    /// Segments shorter than this before settling are transients, not listed, s (default 15).
    pub min_reported_s: f64,
    /// Largest standard deviation of SOG in a run, m/s (default 0.25 kn).
    pub max_speed_std: f64,
    /// Largest change of SOG over a run (straight-line fit), m/s (default 0.3 kn).
    pub max_speed_drift: f64,
    /// Least fraction of a run's samples with a GPS speed (default 0.8).
    pub min_fix_fraction: f64,
    /// Least mean SOG to count as under way, m/s (default 1 kn).
    pub min_speed: f64,
    /// Largest departure from exactly reciprocal courses for a pair, degrees (default 30).
    pub reciprocal_tolerance_deg: f64,
}

impl Default for RunOptions {
    fn default() -> Self {
        Self {
            rpm_tolerance_fraction: 0.015,
            rpm_tolerance_rpm: 25.0,
            course_tolerance_deg: 20.0,
            max_gap_s: 5.0,
            settle_s: 20.0,
            min_duration_s: 60.0,
            min_reported_s: 15.0,
            max_speed_std: 0.25 * METRES_PER_SECOND_PER_KNOT,
            max_speed_drift: 0.3 * METRES_PER_SECOND_PER_KNOT,
            min_fix_fraction: 0.8,
            min_speed: METRES_PER_SECOND_PER_KNOT,
            reciprocal_tolerance_deg: 30.0,
        }
    }
}

impl RunOptions {
    /// The rpm tolerance at `rpm`, rpm.
    pub fn rpm_tolerance(&self, rpm: f64) -> f64 {
        self.rpm_tolerance_rpm
            .max(self.rpm_tolerance_fraction * rpm.abs())
    }
}

/// One steady run, averaged (SI; angles degrees true).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct SteadyRun {
    /// Start of the averaged part, s (log time).
    pub start_s: f64,
    /// End of the averaged part, s.
    pub end_s: f64,
    /// Samples averaged.
    pub samples: usize,
    /// Mean engine speed, rpm.
    pub engine_rpm: f64,
    /// Mean speed over ground, m/s.
    pub speed_over_ground: f64,
    /// Standard deviation of SOG over the run, m/s.
    pub speed_over_ground_std: f64,
    /// Circular mean course over ground, degrees true.
    pub course_over_ground_deg: Option<f64>,
    /// Circular mean heading, degrees.
    pub heading_deg: Option<f64>,
    /// Mean speed through water, m/s, if logged.
    pub speed_through_water: Option<f64>,
    /// Mean fuel volume flow, m³/s, if logged.
    pub fuel_volume_flow: Option<f64>,
    /// Index (in the list of runs) of its reciprocal partner.
    pub pair: Option<usize>,
    /// Out for the first of a pair, Back for the second, `None` unpaired.
    pub direction: Option<RunDirection>,
}

impl SteadyRun {
    /// Duration of the averaged part, s.
    pub fn duration_s(&self) -> f64 {
        self.end_s - self.start_s
    }
}

/// Why a segment was not kept as a run.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
#[serde(rename_all = "snake_case", tag = "reason")]
pub enum RejectReason {
    /// Steady for less than the minimum time after settling, s.
    TooShort {
        /// Steady time after settling, s.
        duration_s: f64,
        /// Minimum, s.
        needed_s: f64,
    },
    /// Too few samples had a GPS speed.
    NoGpsFix {
        /// Fraction with a fix.
        fix_fraction: f64,
    },
    /// Mean SOG below the under-way limit, m/s.
    NotUnderWay {
        /// Mean SOG, m/s.
        speed: f64,
    },
    /// SOG scattered more than the limit, m/s.
    SpeedNotSteady {
        /// Standard deviation, m/s.
        std: f64,
        /// Limit, m/s.
        limit: f64,
    },
    /// SOG drifted (still gaining or losing speed), m/s over the run.
    SpeedDrifting {
        /// Change over the run, m/s.
        change: f64,
        /// Limit, m/s.
        limit: f64,
    },
    /// rpm drifted more than the tolerance over the run, rpm.
    RpmDrifting {
        /// Change over the run, rpm.
        change_rpm: f64,
        /// Limit, rpm.
        limit_rpm: f64,
    },
}

impl fmt::Display for RejectReason {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let kn = |v: f64| v / METRES_PER_SECOND_PER_KNOT;
        match *self {
            RejectReason::TooShort {
                duration_s,
                needed_s,
            } => {
                write!(
                    f,
                    "too short: steady {duration_s:.0} s of {needed_s:.0} s needed"
                )
            }
            RejectReason::NoGpsFix { fix_fraction } => {
                write!(
                    f,
                    "no GPS fix: speed in {:.0} % of samples",
                    100.0 * fix_fraction
                )
            }
            RejectReason::NotUnderWay { speed } => write!(f, "not under way: {:.2} kn", kn(speed)),
            RejectReason::SpeedNotSteady { std, limit } => {
                write!(
                    f,
                    "speed not steady: ±{:.2} kn scatter, limit {:.2} kn",
                    kn(std),
                    kn(limit)
                )
            }
            RejectReason::SpeedDrifting { change, limit } => {
                write!(
                    f,
                    "speed drifting: {:+.2} kn over the run, limit {:.2} kn",
                    kn(change),
                    kn(limit)
                )
            }
            RejectReason::RpmDrifting {
                change_rpm,
                limit_rpm,
            } => {
                write!(
                    f,
                    "rpm drifting: {change_rpm:+.0} rpm over the run, limit {limit_rpm:.0} rpm"
                )
            }
        }
    }
}

/// A segment not kept, with its reason.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct RejectedRun {
    /// Start of the segment, s.
    pub start_s: f64,
    /// End of the segment, s.
    pub end_s: f64,
    /// Mean rpm of the segment, rpm.
    pub engine_rpm: f64,
    /// Mean SOG of the segment, m/s, if any.
    pub speed_over_ground: Option<f64>,
    /// Why it was not kept.
    pub reason: RejectReason,
}

/// What one pushed sample completed.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum RunEvent {
    /// A run was kept: its index in [`RunFinder::runs`] (pairing may have changed another).
    Accepted(usize),
    /// A segment was rejected.
    Rejected(RejectedRun),
}

/// The run finder, fed one sample at a time (live or batch).
#[derive(Debug, Clone)]
pub struct RunFinder {
    options: RunOptions,
    segment: Vec<Sample>,
    rpm_sum: f64,
    course_sin: f64,
    course_cos: f64,
    runs: Vec<SteadyRun>,
    rejected: Vec<RejectedRun>,
    transients: usize,
}

impl RunFinder {
    /// A finder with `options`.
    pub fn new(options: RunOptions) -> Self {
        Self {
            options,
            segment: Vec::new(),
            rpm_sum: 0.0,
            course_sin: 0.0,
            course_cos: 0.0,
            runs: Vec::new(),
            rejected: Vec::new(),
            transients: 0,
        }
    }

    /// The options in use.
    pub fn options(&self) -> &RunOptions {
        &self.options
    }

    /// The runs kept so far, in time order, with their pairing.
    pub fn runs(&self) -> &[SteadyRun] {
        &self.runs
    }

    /// The segments rejected so far.
    pub fn rejected(&self) -> &[RejectedRun] {
        &self.rejected
    }

    /// Transients (segments too short to list) so far.
    pub fn transients(&self) -> usize {
        self.transients
    }

    /// The samples of the segment under way (for a live "steady for N s" readout).
    pub fn current_segment(&self) -> &[Sample] {
        &self.segment
    }

    /// Feeds one sample; returns the run or rejection it completed, if any.
    pub fn push(&mut self, sample: &Sample) -> Option<RunEvent> {
        let breaks = match (self.segment.last(), sample.engine_rpm) {
            (_, None) => true,
            (None, Some(_)) => false,
            (Some(last), Some(rpm)) => {
                let mean_rpm = self.rpm_sum / self.segment.len() as f64;
                let gap = sample.time_s - last.time_s;
                let off_course = self.off_course(sample);
                !(0.0..=self.options.max_gap_s).contains(&gap)
                    || (rpm - mean_rpm).abs() > self.options.rpm_tolerance(mean_rpm)
                    || off_course
            }
        };
        let event = if breaks { self.close() } else { None };
        if sample.engine_rpm.is_some() {
            self.add(sample);
        }
        event
    }

    /// Ends the stream: closes the segment under way.
    pub fn finish(&mut self) -> Option<RunEvent> {
        self.close()
    }

    /// Everything found, with the log's line summary.
    pub fn into_found(mut self, summary: LineSummary) -> FoundRuns {
        self.close();
        FoundRuns {
            runs: self.runs,
            rejected: self.rejected,
            transients: self.transients,
            summary,
        }
    }

    fn under_way(&self, sample: &Sample) -> Option<f64> {
        sample.course_over_ground_deg.filter(|_| {
            sample
                .speed_over_ground
                .is_some_and(|v| v >= self.options.min_speed)
        })
    }

    fn off_course(&self, sample: &Sample) -> bool {
        let (Some(course), true) = (
            self.under_way(sample),
            self.course_sin.hypot(self.course_cos) > 0.0,
        ) else {
            return false;
        };
        let mean = self.course_sin.atan2(self.course_cos).to_degrees();
        angle_between_deg(course, mean) > self.options.course_tolerance_deg
    }

    fn add(&mut self, sample: &Sample) {
        self.rpm_sum += sample.engine_rpm.unwrap_or(0.0);
        if let Some(course) = self.under_way(sample) {
            self.course_sin += course.to_radians().sin();
            self.course_cos += course.to_radians().cos();
        }
        self.segment.push(*sample);
    }

    fn close(&mut self) -> Option<RunEvent> {
        let segment = std::mem::take(&mut self.segment);
        self.rpm_sum = 0.0;
        self.course_sin = 0.0;
        self.course_cos = 0.0;
        let (first, last) = (segment.first()?, segment.last()?);
        if last.time_s - first.time_s < self.options.min_reported_s {
            self.transients += 1;
            return None;
        }
        let settled_from = first.time_s + self.options.settle_s;
        let kept: Vec<Sample> = segment
            .iter()
            .copied()
            .filter(|s| s.time_s >= settled_from)
            .collect();
        match self.evaluate(&kept) {
            Ok(run) => {
                self.runs.push(run);
                let index = self.runs.len() - 1;
                self.pair(index);
                Some(RunEvent::Accepted(index))
            }
            Err(reason) => {
                let rejected = RejectedRun {
                    start_s: first.time_s,
                    end_s: last.time_s,
                    engine_rpm: mean(segment.iter().filter_map(|s| s.engine_rpm)).unwrap_or(0.0),
                    speed_over_ground: mean(segment.iter().filter_map(|s| s.speed_over_ground)),
                    reason,
                };
                self.rejected.push(rejected);
                Some(RunEvent::Rejected(rejected))
            }
        }
    }

    fn evaluate(&self, kept: &[Sample]) -> Result<SteadyRun, RejectReason> {
        let o = &self.options;
        let duration_s = match (kept.first(), kept.last()) {
            (Some(a), Some(b)) => b.time_s - a.time_s,
            _ => 0.0,
        };
        if duration_s < o.min_duration_s {
            return Err(RejectReason::TooShort {
                duration_s,
                needed_s: o.min_duration_s,
            });
        }
        let with_fix: Vec<(f64, f64)> = kept
            .iter()
            .filter_map(|s| s.speed_over_ground.map(|v| (s.time_s, v)))
            .collect();
        let fix_fraction = with_fix.len() as f64 / kept.len() as f64;
        if fix_fraction < o.min_fix_fraction {
            return Err(RejectReason::NoGpsFix { fix_fraction });
        }
        let speed = mean(with_fix.iter().map(|p| p.1)).unwrap_or(0.0);
        if speed < o.min_speed {
            return Err(RejectReason::NotUnderWay { speed });
        }
        let std = mean(with_fix.iter().map(|p| (p.1 - speed).powi(2)))
            .unwrap_or(0.0)
            .sqrt();
        if std > o.max_speed_std {
            return Err(RejectReason::SpeedNotSteady {
                std,
                limit: o.max_speed_std,
            });
        }
        let change = slope(&with_fix) * duration_s;
        if change.abs() > o.max_speed_drift {
            return Err(RejectReason::SpeedDrifting {
                change,
                limit: o.max_speed_drift,
            });
        }
        let rpms: Vec<(f64, f64)> = kept
            .iter()
            .filter_map(|s| s.engine_rpm.map(|r| (s.time_s, r)))
            .collect();
        let engine_rpm = mean(rpms.iter().map(|p| p.1)).unwrap_or(0.0);
        let change_rpm = slope(&rpms) * duration_s;
        let limit_rpm = o.rpm_tolerance(engine_rpm);
        if change_rpm.abs() > limit_rpm {
            return Err(RejectReason::RpmDrifting {
                change_rpm,
                limit_rpm,
            });
        }
        Ok(SteadyRun {
            start_s: kept[0].time_s,
            end_s: kept[kept.len() - 1].time_s,
            samples: kept.len(),
            engine_rpm,
            speed_over_ground: speed,
            speed_over_ground_std: std,
            course_over_ground_deg: circular_mean_deg(
                kept.iter().filter_map(|s| s.course_over_ground_deg),
            ),
            heading_deg: circular_mean_deg(kept.iter().filter_map(|s| s.heading_deg)),
            speed_through_water: mean(kept.iter().filter_map(|s| s.speed_through_water)),
            fuel_volume_flow: mean(kept.iter().filter_map(|s| s.fuel_volume_flow)),
            pair: None,
            direction: None,
        })
    }

    /// Pairs run `index` with the latest earlier unpaired reciprocal run at the same rpm.
    fn pair(&mut self, index: usize) {
        let run = self.runs[index];
        let Some(course) = run.course_over_ground_deg else {
            return;
        };
        let tolerance = self.options.rpm_tolerance(run.engine_rpm);
        let partner = (0..index).rev().find(|&i| {
            let other = &self.runs[i];
            other.pair.is_none()
                && (other.engine_rpm - run.engine_rpm).abs() <= tolerance
                && other.course_over_ground_deg.is_some_and(|c| {
                    angle_between_deg(c, course) >= 180.0 - self.options.reciprocal_tolerance_deg
                })
        });
        if let Some(i) = partner {
            self.runs[i].pair = Some(index);
            self.runs[i].direction = Some(RunDirection::Out);
            self.runs[index].pair = Some(i);
            self.runs[index].direction = Some(RunDirection::Back);
        }
    }
}

fn mean(values: impl Iterator<Item = f64>) -> Option<f64> {
    let (sum, n) = values.fold((0.0, 0usize), |(s, n), v| (s + v, n + 1));
    (n > 0).then(|| sum / n as f64)
}

/// Least-squares slope of y on x (per unit x); 0 with fewer than two distinct x.
fn slope(points: &[(f64, f64)]) -> f64 {
    let (Some(mx), Some(my)) = (
        mean(points.iter().map(|p| p.0)),
        mean(points.iter().map(|p| p.1)),
    ) else {
        return 0.0;
    };
    let sxx: f64 = points.iter().map(|p| (p.0 - mx).powi(2)).sum();
    let sxy: f64 = points.iter().map(|p| (p.0 - mx) * (p.1 - my)).sum();
    if sxx > 0.0 { sxy / sxx } else { 0.0 }
}

/// The runs found in a log.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct FoundRuns {
    /// Kept runs in time order, with pairing.
    pub runs: Vec<SteadyRun>,
    /// Rejected segments with reasons.
    pub rejected: Vec<RejectedRun>,
    /// Transients (too short to list).
    pub transients: usize,
    /// The log's line summary.
    pub summary: LineSummary,
}

impl FoundRuns {
    /// Number of reciprocal pairs.
    pub fn pair_count(&self) -> usize {
        self.runs
            .iter()
            .filter(|r| r.direction == Some(RunDirection::Back))
            .count()
    }

    /// The runs as the core's trial runs. The two runs of a pair both carry the pair's mean
    /// rpm, so the core groups them together (its rpm grouping is tighter than this finder's
    /// tolerance) and averages Out and Back; unpaired runs carry no direction.
    pub fn trial_runs(&self) -> Vec<TrialRun> {
        self.runs
            .iter()
            .map(|run| {
                let engine_rpm = match run.pair {
                    Some(p) => 0.5 * (run.engine_rpm + self.runs[p].engine_rpm),
                    None => run.engine_rpm,
                };
                TrialRun {
                    engine_rpm,
                    speed_over_ground: run.speed_over_ground,
                    direction: run.direction,
                    fuel_volume_flow: run.fuel_volume_flow,
                }
            })
            .collect()
    }
}

/// Why no run could be found in a log.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum NoRunError {
    /// No line gave a sample.
    #[error("the log holds no usable samples: {summary}")]
    NoSamples {
        /// The log's line summary.
        summary: Box<LineSummary>,
    },
    /// Samples, but none with engine rpm.
    #[error(
        "the log has no engine rpm (no RPM sentence or XDR tachometer for the chosen engine, or no rpm column): {summary}"
    )]
    NoRpm {
        /// The log's line summary.
        summary: Box<LineSummary>,
    },
    /// Samples, but no engine rpm in range: every rpm the log gave was below 0 or too high.
    #[error(
        "the log has no usable engine rpm: {count} line(s) gave an rpm out of range (below 0, e.g. astern, or above {max} rpm){}: {summary}",
        first_line.map(|n| format!(", line {n} first")).unwrap_or_default(),
        max = super::bounds::MAX_RPM
    )]
    RpmOutOfRange {
        /// Lines whose rpm was out of range.
        count: usize,
        /// 1-based number of the first such line, when it is among the bad lines kept.
        first_line: Option<usize>,
        /// The log's line summary.
        summary: Box<LineSummary>,
    },
    /// Samples, but none with a GPS speed.
    #[error("the log has no speed over ground (no valid GPS fix): {summary}")]
    NoSpeed {
        /// The log's line summary.
        summary: Box<LineSummary>,
    },
    /// Samples with rpm and speed, but no stretch steady long enough.
    #[error("no steady run found: {} segment(s) rejected{}, {transients} transient(s); {summary}", rejected.len(), reasons(rejected))]
    NoSteadyRun {
        /// The segments rejected, with reasons.
        rejected: Vec<RejectedRun>,
        /// Transients.
        transients: usize,
        /// The log's line summary.
        summary: Box<LineSummary>,
    },
}

fn reasons(rejected: &[RejectedRun]) -> String {
    if rejected.is_empty() {
        return String::new();
    }
    let list: Vec<String> = rejected
        .iter()
        .take(3)
        .map(|r| r.reason.to_string())
        .collect();
    format!(
        " ({}{})",
        list.join("; "),
        if rejected.len() > 3 { "; …" } else { "" }
    )
}

/// Finds the steady runs in `samples` (time order) with a [`RunFinder`].
pub fn find_runs(
    samples: &[Sample],
    options: &RunOptions,
    summary: &LineSummary,
) -> Result<FoundRuns, NoRunError> {
    let summary = Box::new(summary.clone());
    // Checked before "no samples": a CSV row with its rpm out of range gives no sample at all.
    if !samples.iter().any(|s| s.engine_rpm.is_some()) {
        let count = summary.bad_count(BadLine::RpmOutOfRange);
        if count > 0 {
            let first_line = summary
                .first_bad
                .iter()
                .find(|(_, reason)| *reason == BadLine::RpmOutOfRange)
                .map(|(line, _)| *line);
            return Err(NoRunError::RpmOutOfRange {
                count,
                first_line,
                summary,
            });
        }
        if samples.is_empty() {
            return Err(NoRunError::NoSamples { summary });
        }
        return Err(NoRunError::NoRpm { summary });
    }
    if !samples.iter().any(|s| s.speed_over_ground.is_some()) {
        return Err(NoRunError::NoSpeed { summary });
    }
    let mut finder = RunFinder::new(*options);
    for sample in samples {
        finder.push(sample);
    }
    let found = finder.into_found(*summary);
    if found.runs.is_empty() {
        return Err(NoRunError::NoSteadyRun {
            rejected: found.rejected,
            transients: found.transients,
            summary: Box::new(found.summary),
        });
    }
    Ok(found)
}

#[cfg(test)]
mod tests;

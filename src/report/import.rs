//! An imported instrument log laid out: the steady runs found (time, rpm, speeds, course,
//! pairing), the segments rejected and why, and the line summary — as text and JSON.

use serde::Serialize;

use super::KNOT_MPS;
use super::table::{Column, Table};
use crate::instruments::runs::{FoundRuns, NoRunError, RejectReason, RejectedRun};
use crate::instruments::time::clock_of;
use crate::instruments::{LineSummary, LogFormat};
use crate::propulsion::solver::trial::RunDirection;
use crate::study::import::TrialImport;

fn kn(v: f64) -> String {
    if v.is_finite() {
        format!("{:.2}", v / KNOT_MPS)
    } else {
        "—".into()
    }
}

fn deg(v: Option<f64>) -> String {
    v.filter(|d| d.is_finite())
        .map_or("—".into(), |d| format!("{d:03.0}"))
}

fn direction_word(d: Option<RunDirection>) -> &'static str {
    match d {
        Some(RunDirection::Out) => "out",
        Some(RunDirection::Back) => "back",
        None => "single",
    }
}

/// The runs, rejections and summary of `imported` as text.
pub fn import_text(imported: &TrialImport) -> String {
    let log = &imported.log;
    let mut out = format!(
        "Log {} ({}{}): {}\n",
        imported.source,
        log.format,
        log.date
            .as_deref()
            .map(|d| format!(", {d}"))
            .unwrap_or_default(),
        log.summary
    );
    for (line, reason) in &log.summary.first_bad {
        out.push_str(&format!("  line {line}: {}\n", reason.describe()));
    }
    if log.summary.first_bad.len() < log.summary.bad_total() {
        out.push_str(&format!(
            "  … {} more bad line(s)\n",
            log.summary.bad_total() - log.summary.first_bad.len()
        ));
    }
    let (found_runs, rejected, transients): (&[_], &[RejectedRun], usize) = match &imported.runs {
        Ok(found) => (&found.runs, &found.rejected, found.transients),
        Err(NoRunError::NoSteadyRun {
            rejected,
            transients,
            ..
        }) => (&[], rejected, *transients),
        Err(_) => (&[], &[], 0),
    };
    if !found_runs.is_empty() {
        let found = imported.runs.as_ref().ok();
        let has_stw = found_runs.iter().any(|r| r.speed_through_water.is_some());
        let mut columns = vec![
            Column::text("run"),
            Column::text("start–end"),
            Column::number("time", "s"),
            Column::number("engine", "rpm"),
            Column::number("SOG", "kn"),
        ];
        if has_stw {
            columns.push(Column::number("STW", "kn"));
        }
        columns.extend([
            Column::number("COG", "°"),
            Column::text("direction"),
            Column::text("paired with"),
        ]);
        let mut table = Table::new(columns);
        for (i, run) in found_runs.iter().enumerate() {
            let mut row = vec![
                format!("{}", i + 1),
                format!("{}–{}", clock_of(run.start_s), clock_of(run.end_s)),
                format!("{:.0}", run.duration_s()),
                format!("{:.0}", run.engine_rpm),
                kn(run.speed_over_ground),
            ];
            if has_stw {
                row.push(run.speed_through_water.map_or("—".into(), kn));
            }
            row.extend([
                deg(run.course_over_ground_deg),
                direction_word(run.direction).into(),
                run.pair.map_or("—".into(), |p| format!("run {}", p + 1)),
            ]);
            table.push(row);
        }
        out.push_str(&format!(
            "Steady runs: {} found, {} reciprocal pair(s)\n",
            found_runs.len(),
            found.map_or(0, FoundRuns::pair_count)
        ));
        out.push_str(&table.to_text("  "));
    }
    if !rejected.is_empty() {
        out.push_str(&format!("Rejected: {} segment(s)\n", rejected.len()));
        for r in rejected {
            let hint = rejection_hint(&r.reason).map_or(String::new(), |h| format!(" ({h})"));
            out.push_str(&format!(
                "  {}–{}  {:.0} rpm  {}{hint}\n",
                clock_of(r.start_s),
                clock_of(r.end_s),
                r.engine_rpm,
                r.reason
            ));
        }
    }
    if transients > 0 {
        out.push_str(&format!(
            "  {transients} transient(s) (throttle steps and turns) left out\n"
        ));
    }
    if let Err(e) = &imported.runs {
        out.push_str(&format!("No steady run to fit: {e}\n"));
    }
    out
}

/// One run in JSON (speeds in kn, times in s of the log's clock).
#[derive(Debug, Serialize)]
struct RunJson {
    start_s: f64,
    end_s: f64,
    start: String,
    end: String,
    duration_s: f64,
    engine_rpm: f64,
    sog_kn: f64,
    sog_std_kn: f64,
    stw_kn: Option<f64>,
    cog_deg: Option<f64>,
    heading_deg: Option<f64>,
    direction: &'static str,
    paired_with: Option<usize>,
}

/// Which setting of `trial --import` lets a segment rejected for `reason` through, or what to
/// do when no setting does, in words for the line after the reason.
pub fn rejection_hint(reason: &RejectReason) -> Option<&'static str> {
    match reason {
        RejectReason::TooShort { .. } => Some("--min-run sets the shortest run kept"),
        RejectReason::SpeedNotSteady { .. } => Some("--max-scatter sets the limit"),
        RejectReason::RpmDrifting { .. } => Some("--rpm-tolerance sets the limit"),
        RejectReason::SpeedDrifting { .. } => {
            Some("still gaining or losing speed: hold the throttle longer before the run")
        }
        RejectReason::NoGpsFix { .. } => {
            Some("the log needs a speed over ground (RMC or VTG sentences, or a sog column)")
        }
        RejectReason::NotUnderWay { .. } => None,
    }
}

/// One rejected segment in JSON.
#[derive(Debug, Serialize)]
struct RejectedJson {
    start: String,
    end: String,
    engine_rpm: f64,
    sog_kn: Option<f64>,
    reason: String,
}

/// The import part of `trial --import --format json`.
#[derive(Debug, Serialize)]
pub struct ImportJson {
    file: String,
    format: LogFormat,
    date: Option<String>,
    lines: LineSummary,
    bad_lines: Vec<String>,
    runs: Vec<RunJson>,
    pairs: usize,
    rejected: Vec<RejectedJson>,
    transients: usize,
    problem: Option<String>,
}

impl ImportJson {
    /// The JSON form of `imported`.
    pub fn of(imported: &TrialImport) -> Self {
        let log = &imported.log;
        let (runs, rejected, transients, pairs) = match &imported.runs {
            Ok(f) => (
                f.runs.clone(),
                f.rejected.clone(),
                f.transients,
                f.pair_count(),
            ),
            Err(NoRunError::NoSteadyRun {
                rejected,
                transients,
                ..
            }) => (Vec::new(), rejected.clone(), *transients, 0),
            Err(_) => (Vec::new(), Vec::new(), 0, 0),
        };
        let finite = super::finite_or_none;
        Self {
            file: imported.source.clone(),
            format: log.format,
            date: log.date.clone(),
            lines: log.summary.clone(),
            bad_lines: log
                .summary
                .bad
                .iter()
                .map(|(reason, n)| format!("{n} {}", reason.describe()))
                .collect(),
            runs: runs
                .iter()
                .map(|r| RunJson {
                    start_s: r.start_s,
                    end_s: r.end_s,
                    start: clock_of(r.start_s),
                    end: clock_of(r.end_s),
                    duration_s: r.duration_s(),
                    engine_rpm: r.engine_rpm,
                    sog_kn: r.speed_over_ground / KNOT_MPS,
                    sog_std_kn: r.speed_over_ground_std / KNOT_MPS,
                    stw_kn: finite(r.speed_through_water.map(|v| v / KNOT_MPS)),
                    cog_deg: finite(r.course_over_ground_deg),
                    heading_deg: finite(r.heading_deg),
                    direction: direction_word(r.direction),
                    paired_with: r.pair.map(|p| p + 1),
                })
                .collect(),
            pairs,
            rejected: rejected
                .iter()
                .map(|r| RejectedJson {
                    start: clock_of(r.start_s),
                    end: clock_of(r.end_s),
                    engine_rpm: r.engine_rpm,
                    sog_kn: finite(r.speed_over_ground.map(|v| v / KNOT_MPS)),
                    reason: r.reason.to_string(),
                })
                .collect(),
            transients,
            problem: imported.runs.as_ref().err().map(ToString::to_string),
        }
    }
}

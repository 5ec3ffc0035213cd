//! Sea trials from the boat's instruments: a log imported, its steady runs found, and the runs
//! put into the study's trial log so the one calibration path fits them.

use super::Study;
use crate::instruments::runs::{FoundRuns, NoRunError, RunOptions};
use crate::instruments::{ImportError, ImportOptions, ImportedLog, LogFormat, import};
use crate::profile::Side;
use crate::profile::{Quantity, TrialDoc, TrialRunDoc};
use crate::propulsion::solver::trial::TrialRun;

/// What an instrument log gave: the import (its line summary and date) and its runs.
#[derive(Debug, Clone, PartialEq)]
pub struct TrialImport {
    /// Where the log came from (a path, for messages and the saved note).
    pub source: String,
    /// The imported log (samples, line summary, date).
    pub log: ImportedLog,
    /// The steady runs found, or why none was.
    pub runs: Result<FoundRuns, NoRunError>,
}

/// Why a log gave nothing to fit.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum TrialImportError {
    /// The log could not be read at all (empty, a CSV header without a needed column).
    #[error("log {source_name}: {error}")]
    Unreadable {
        /// The log's path.
        source_name: String,
        /// Why.
        error: ImportError,
    },
    /// The log was read but holds no steady run.
    #[error("log {source_name}: {error}")]
    NoRun {
        /// The log's path.
        source_name: String,
        /// Why.
        error: NoRunError,
    },
}

impl TrialImport {
    /// Imports `content` (the bytes of the log at `source`) and finds its steady runs; an
    /// unreadable log is an error, a log without runs is returned with `runs` saying why.
    pub fn read(
        source: &str,
        content: &[u8],
        format: Option<LogFormat>,
        options: &RunOptions,
    ) -> Result<Self, TrialImportError> {
        let log = import(content, format, &ImportOptions::default()).map_err(|error| {
            TrialImportError::Unreadable {
                source_name: source.to_owned(),
                error,
            }
        })?;
        let runs = log.find_runs(options);
        Ok(Self {
            source: source.to_owned(),
            log,
            runs,
        })
    }

    /// The runs found, or the error that says why there are none.
    pub fn usable(&self) -> Result<&FoundRuns, TrialImportError> {
        self.runs.as_ref().map_err(|error| TrialImportError::NoRun {
            source_name: self.source.clone(),
            error: error.clone(),
        })
    }
}

/// The `[trial]` log of `runs` (rpm, speed over ground, direction, fuel rate), dated `date`.
pub fn trial_doc(runs: &[TrialRun], date: Option<String>, note: String) -> TrialDoc {
    TrialDoc {
        installation: None,
        date,
        note: Some(note),
        runs: runs
            .iter()
            .map(|run| TrialRunDoc {
                rpm: Quantity::new(run.engine_rpm),
                speed: Quantity::new(run.speed_over_ground),
                direction: run.direction,
                fuel_rate: run.fuel_volume_flow.map(Quantity::new),
            })
            .collect(),
    }
}

impl Study {
    /// Replaces the study's trial log (document and vessel) with `runs` found in a log, so
    /// [`Study::calibration`] fits them and a save writes them into the boat's `[trial]`.
    pub fn use_trial_runs(&mut self, runs: &[TrialRun], date: Option<String>, note: String) {
        let mut trial = trial_doc(runs, date, note);
        // Runs logged on board today are runs of the installation in the boat: recorded so.
        trial.installation = self.doc.as_found.as_ref().map(|_| Side::AsFound);
        if let Some(found) = self.baseline.as_deref_mut() {
            // The as-found study's one installation is the one the runs were made with.
            found.doc.trial = Some(TrialDoc {
                installation: None,
                ..trial.clone()
            });
            found.vessel.trial = runs.to_vec();
        }
        self.doc.trial = Some(trial);
        self.vessel.trial = runs.to_vec();
    }

    /// Puts the runs of `imported` into the trial log (see [`Study::use_trial_runs`]), with the
    /// log's date and a note naming the log; an error when it holds no run.
    pub fn use_imported_trial(&mut self, imported: &TrialImport) -> Result<(), TrialImportError> {
        let found = imported.usable()?;
        let runs = found.trial_runs();
        let note = format!(
            "Imported from {} by `tidewright trial --import`: {} steady run(s), {} reciprocal pair(s); GPS speed over ground.",
            imported.source,
            found.runs.len(),
            found.pair_count()
        );
        self.use_trial_runs(&runs, imported.log.date.clone(), note);
        Ok(())
    }
}

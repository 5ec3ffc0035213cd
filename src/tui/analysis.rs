//! The design views' results — sweep, sea-trial calibration and what-if conditions — computed
//! by the solver when a view opens (and again after an edit while it is open) and cached in the
//! app state; drawing only reads them. All values are SI (rpm as rpm).

use crate::profile::{BoatDoc, CalibrationDoc, EngineDoc, LoadCondition};
use crate::propulsion::solver::Vessel;
use crate::propulsion::solver::conditions::{
    Condition, ConditionOutcome, UncertaintyBand, UncertaintyRanges, compare_conditions,
    uncertainty_band,
};
use crate::propulsion::solver::pitch::PitchOptions;
use crate::propulsion::solver::sweep::{
    SweepOptions, SweepParameter, SweepResult, USUAL_AREA_RATIOS, USUAL_BLADE_COUNTS,
    gear_ratios_around, sweep,
};
use crate::propulsion::solver::trial::{Calibration, CalibrationOptions, calibrate};

/// Fouling added for the "fouled" what-if, as a fraction of friction (from memory: a season's
/// growth on an unpainted bottom adds tens of percent to friction).
pub const FOULED_EXTRA: f64 = 0.30;
/// Sea-state margin added for the "sea state" what-if, fraction of resistance (common practice:
/// a 15 % sea margin).
pub const SEA_STATE_EXTRA: f64 = 0.15;

/// Which design view is open.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ViewKind {
    /// Candidates of one swept parameter, each with its matching pitch, ranked.
    Sweep,
    /// The sea-trial log against the model, and the fitted correction.
    Calibration,
    /// The boat under other loads, fouling and sea state; the uncertainty band; the checks.
    WhatIf,
}

impl ViewKind {
    /// Every view, in the order Tab cycles them.
    pub const ALL: [ViewKind; 3] = [ViewKind::Sweep, ViewKind::Calibration, ViewKind::WhatIf];

    /// The view's title.
    pub fn title(self) -> &'static str {
        match self {
            ViewKind::Sweep => "Sweep",
            ViewKind::Calibration => "Sea-trial calibration",
            ViewKind::WhatIf => "What-if conditions",
        }
    }

    /// The next view (wrapping).
    pub fn next(self) -> Self {
        let i = Self::ALL.iter().position(|k| *k == self).unwrap_or(0);
        Self::ALL[(i + 1) % Self::ALL.len()]
    }

    /// The previous view (wrapping).
    pub fn prev(self) -> Self {
        let i = Self::ALL.iter().position(|k| *k == self).unwrap_or(0);
        Self::ALL[(i + Self::ALL.len() - 1) % Self::ALL.len()]
    }
}

/// What a sweep varies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum SweepOver {
    /// Screw diameter up to the aperture's limit.
    #[default]
    Diameter,
    /// Reduction gear ratio.
    GearRatio,
    /// Number of blades.
    Blades,
    /// Expanded area ratio AE/A0.
    AreaRatio,
}

impl SweepOver {
    /// Every parameter, in the order the key cycles them.
    pub const ALL: [SweepOver; 4] = [
        SweepOver::Diameter,
        SweepOver::GearRatio,
        SweepOver::Blades,
        SweepOver::AreaRatio,
    ];

    /// The next parameter (wrapping).
    pub fn next(self) -> Self {
        let i = Self::ALL.iter().position(|k| *k == self).unwrap_or(0);
        Self::ALL[(i + 1) % Self::ALL.len()]
    }
}

/// A sweep of the active variant.
#[derive(Debug, Clone, PartialEq)]
pub struct SweepView {
    /// What was swept.
    pub over: SweepOver,
    /// The active variant's label.
    pub label: String,
    /// The largest diameter the aperture takes with the tip clearance kept, m (diameter sweeps).
    pub max_diameter: Option<f64>,
    /// The ranked candidates, or why the sweep could not be made.
    pub result: Result<SweepResult, String>,
}

/// The sea-trial calibration of the active variant against the uncalibrated model.
#[derive(Debug, Clone, PartialEq)]
pub struct CalibrationView {
    /// The trial's date, if logged.
    pub trial_date: Option<String>,
    /// Number of runs in the log.
    pub runs: usize,
    /// The calibration, or why there is none (no log, nothing predicted).
    pub result: Result<Calibration, String>,
    /// The resistance factor the boat currently applies, if it has a calibration.
    pub applied: Option<f64>,
}

impl CalibrationView {
    /// The correction to write into the boat document, when the fit improved on the model.
    pub fn correction(&self) -> Option<CalibrationDoc> {
        let cal = self.result.as_ref().ok()?;
        (cal.rms_after < cal.rms_before).then(|| CalibrationDoc {
            resistance_factor: cal.resistance_factor,
            wake_fraction: cal.wake_fraction,
            trial_date: self.trial_date.clone(),
            note: Some(format!(
                "resistance factor fitted to {} trial runs by least squares on speed; RMS {:.3} → {:.3} m/s",
                self.runs, cal.rms_before, cal.rms_after
            )),
        })
    }
}

/// The active variant under each what-if condition, and the uncertainty band.
#[derive(Debug, Clone, PartialEq)]
pub struct WhatIfView {
    /// The active variant's label.
    pub label: String,
    /// "as given", then light / half / full load (those the file gives), fouled and sea state.
    pub outcomes: Result<Vec<ConditionOutcome>, String>,
}

/// The results of the open view.
#[derive(Debug, Clone, PartialEq)]
pub enum ViewData {
    /// A sweep.
    Sweep(SweepView),
    /// A calibration.
    Calibration(CalibrationView),
    /// The what-if comparison.
    WhatIf(WhatIfView),
}

impl ViewData {
    /// Solves `kind` for the active variant of `boat` (sweeping `over` for a sweep).
    pub fn compute(kind: ViewKind, over: SweepOver, boat: &BoatDoc, engine: &EngineDoc) -> Self {
        match kind {
            ViewKind::Sweep => ViewData::Sweep(sweep_view(over, boat, engine)),
            ViewKind::Calibration => ViewData::Calibration(calibration_view(boat, engine)),
            ViewKind::WhatIf => ViewData::WhatIf(what_if_view(boat, engine)),
        }
    }

    /// Which view these results are for.
    pub fn kind(&self) -> ViewKind {
        match self {
            ViewData::Sweep(_) => ViewKind::Sweep,
            ViewData::Calibration(_) => ViewKind::Calibration,
            ViewData::WhatIf(_) => ViewKind::WhatIf,
        }
    }
}

fn active_label(boat: &BoatDoc) -> String {
    boat.variants
        .get(boat.active_variant)
        .map(|v| v.label.clone())
        .unwrap_or_default()
}

/// The sweep parameter for `over`: diameters up to the aperture's limit, the gear ratios
/// either side of the boat's, 2–5 blades, or four area ratios.
pub fn sweep_parameter(
    over: SweepOver,
    boat: &BoatDoc,
    vessel: &Vessel,
) -> Result<SweepParameter, String> {
    let index = vessel.active_variant;
    Ok(match over {
        SweepOver::Diameter => {
            let inst = &boat.installation;
            let largest = inst.max_screw_diameter.as_ref().map(|q| q.value).ok_or(
                "the boat file gives no installation.max_screw_diameter, so the aperture limit of a diameter sweep is unknown",
            )?;
            let clearance = inst.tip_clearance.as_ref().map_or(0.0, |q| q.value);
            let current = vessel.variants[index].screw.geometry().diameter;
            SweepParameter::diameters_up_to(current, largest, clearance)
                .map_err(|e| format!("installation.max_screw_diameter / tip_clearance: {e}"))?
        }
        SweepOver::GearRatio => {
            SweepParameter::GearRatio(gear_ratios_around(vessel.installation.gear_ratio))
        }
        SweepOver::Blades => SweepParameter::Blades(USUAL_BLADE_COUNTS.to_vec()),
        SweepOver::AreaRatio => SweepParameter::AreaRatio(USUAL_AREA_RATIOS.to_vec()),
    })
}

fn sweep_view(over: SweepOver, boat: &BoatDoc, engine: &EngineDoc) -> SweepView {
    let label = active_label(boat);
    let vessel = match super::fields::build_vessel(boat, engine) {
        Ok(v) => v,
        Err(why) => {
            return SweepView {
                over,
                label,
                max_diameter: None,
                result: Err(why),
            };
        }
    };
    let parameter = sweep_parameter(over, boat, &vessel);
    let max_diameter = match &parameter {
        Ok(SweepParameter::Diameter { aperture, .. }) => Some(aperture.max_diameter()),
        _ => None,
    };
    let result = parameter.and_then(|p| {
        sweep(&vessel, vessel.active_variant, &p, &SweepOptions::default())
            .map_err(|e| e.to_string())
    });
    SweepView {
        over,
        label,
        max_diameter,
        result,
    }
}

fn calibration_view(boat: &BoatDoc, engine: &EngineDoc) -> CalibrationView {
    let runs = boat.trial.as_ref().map_or(0, |t| t.runs.len());
    let trial_date = boat.trial.as_ref().and_then(|t| t.date.clone());
    let applied = boat.calibration.as_ref().map(|c| c.resistance_factor);
    // Fitted against the model without any saved correction, so the view reads the same
    // before and after the correction is applied.
    let mut raw = boat.clone();
    raw.calibration = None;
    let result = if runs == 0 {
        Err("this boat has no sea-trial log: add [[trial.run]] entries (rpm, speed, direction) to its file to compare the model with measured speeds".into())
    } else {
        super::fields::build_vessel(&raw, engine).and_then(|vessel| {
            calibrate(
                &vessel.system(vessel.active_variant),
                &vessel.trial,
                &CalibrationOptions::default(),
            )
            .map_err(|e| e.to_string())
        })
    };
    CalibrationView {
        trial_date,
        runs,
        result,
        applied,
    }
}

/// The what-if conditions for `boat`: the load cases its file gives (displacement volume from
/// the mass and the water's density), fouled, and a rougher sea state.
pub fn conditions(boat: &BoatDoc, vessel: &Vessel) -> Vec<Condition> {
    let density = vessel.resistance.water.density;
    let mut list: Vec<Condition> = LoadCondition::ALL
        .into_iter()
        .filter_map(|c| {
            let case = boat.load.case(c)?;
            let name = match c {
                LoadCondition::Light => "light",
                LoadCondition::Half => "half load",
                LoadCondition::Full => "full load",
            };
            Some(Condition::displacement(
                name,
                case.displacement.value / density,
            ))
        })
        .collect();
    let margins = vessel.resistance.margins;
    list.push(Condition::fouled("fouled", margins.fouling + FOULED_EXTRA));
    list.push(Condition::sea_state(
        "sea state",
        margins.service + SEA_STATE_EXTRA,
    ));
    list
}

fn what_if_view(boat: &BoatDoc, engine: &EngineDoc) -> WhatIfView {
    let label = active_label(boat);
    let outcomes = super::fields::build_vessel(boat, engine).and_then(|vessel| {
        compare_conditions(&vessel, vessel.active_variant, &conditions(boat, &vessel))
            .map_err(|e| e.to_string())
    });
    WhatIfView { label, outcomes }
}

/// The active variant's propeller curve as a band over displacement ±10 % and wake ±0.05, with
/// the recommended pitch's range over the same cases.
pub fn band(boat: &BoatDoc, engine: &EngineDoc) -> Result<UncertaintyBand, String> {
    let vessel = super::fields::build_vessel(boat, engine)?;
    uncertainty_band(
        &vessel,
        vessel.active_variant,
        &UncertaintyRanges::default(),
        &PitchOptions::default(),
    )
    .map_err(|e| e.to_string())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::profile::Store;

    fn demo(name: &str) -> crate::tui::app::App {
        let store = Store::at(std::env::temp_dir().join("tidewright-analysis-tests-no-store"));
        crate::tui::open_app(&store, Some(name)).expect("demo boat opens")
    }

    #[test]
    fn diameter_sweep_reaches_the_profiles_largest_screw() {
        let app = demo("pintle");
        let vessel = crate::tui::fields::build_vessel(&app.doc.boat, &app.doc.engine).unwrap();
        let Ok(SweepParameter::Diameter { aperture, .. }) =
            sweep_parameter(SweepOver::Diameter, &app.doc.boat, &vessel)
        else {
            panic!("a diameter sweep")
        };
        // pintle: max_screw_diameter = 500 mm with 60 mm tip clearance.
        assert!((aperture.max_diameter() - 0.5).abs() < 1e-12);
        let mut boat = app.doc.boat.clone();
        boat.installation.max_screw_diameter = None;
        let err = sweep_parameter(SweepOver::Diameter, &boat, &vessel).unwrap_err();
        assert!(err.contains("max_screw_diameter"), "{err}");
    }

    #[test]
    fn what_if_conditions_are_the_files_loads_then_fouled_and_sea_state() {
        let app = demo("pintle");
        let vessel = crate::tui::fields::build_vessel(&app.doc.boat, &app.doc.engine).unwrap();
        let list = conditions(&app.doc.boat, &vessel);
        let labels: Vec<&str> = list.iter().map(|c| c.label.as_str()).collect();
        assert_eq!(
            labels,
            ["light", "half load", "full load", "fouled", "sea state"]
        );
        // pintle's light load is 4.2 t in sea water.
        let light = list[0].displacement_volume.unwrap();
        assert!((light * vessel.resistance.water.density - 4200.0).abs() < 1e-6);
        assert!((list[3].fouling.unwrap() - (0.1 + FOULED_EXTRA)).abs() < 1e-12);
        assert!((list[4].service_margin.unwrap() - (0.15 + SEA_STATE_EXTRA)).abs() < 1e-12);
    }

    #[test]
    fn a_correction_is_offered_only_when_the_fit_improves() {
        let app = demo("pintle");
        let ViewData::Calibration(view) = ViewData::compute(
            ViewKind::Calibration,
            SweepOver::Diameter,
            &app.doc.boat,
            &app.doc.engine,
        ) else {
            panic!("calibration view")
        };
        let correction = view.correction().expect("pintle's fit improves");
        assert_eq!(correction.trial_date.as_deref(), Some("2024-05-18"));
        let mut worse = view.clone();
        if let Ok(cal) = &mut worse.result {
            cal.rms_after = cal.rms_before;
        }
        assert!(worse.correction().is_none());
    }

    #[test]
    fn views_cycle_both_ways() {
        for kind in ViewKind::ALL {
            assert_eq!(kind.next().prev(), kind);
        }
        assert_eq!(SweepOver::AreaRatio.next(), SweepOver::Diameter);
    }
}

//! The report of one boat: operating table per screw variant, match, top speed, cruise line.

use serde::Serialize;

use super::checks::{AppliedCalibration, CavitationJson, CheckInputs, DesignChecks, ShaftJson};
use super::table::{Column, Table};
use super::{CAUTION, Display, KNOT_MPS, LITRE_M3, NAUTICAL_MILE_M, percent};
use crate::propulsion::engine::Duty;
use crate::propulsion::screw::ScrewGeometry;
use crate::propulsion::solver::{CruisePoint, MatchResult, MethodSpread, Trip, Verdict, Vessel};
use crate::study::solve::{BadStep, SolveOptions, VariantSolution, solve_variant};
use crate::units::{Kind, UnitSystem};

pub use crate::study::solve::{RpmRow, default_step, rpm_steps};

/// Why a report could not be built.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ReportError {
    /// No screw variant has the label asked for.
    #[error("boat {boat:?} has no screw variant {label:?}; its variants are: {known}")]
    UnknownVariant {
        /// The boat.
        boat: String,
        /// The label asked for.
        label: String,
        /// The labels it has, comma-separated.
        known: String,
    },
    /// The rpm step is not a positive number or gives too many rows.
    #[error("rpm step {0} is not usable: expected a positive number giving at most 400 rows")]
    BadStep(f64),
}

/// The engine sheet as the report shows it.
#[derive(Debug, Clone, PartialEq)]
pub struct EngineSummary {
    /// The sheet's name.
    pub name: String,
    /// Rated speed, rpm.
    pub rated_rpm: f64,
    /// Power at rated rpm, W.
    pub rated_power: f64,
    /// Idle speed, rpm.
    pub idle_rpm: f64,
    /// Duty rating, if given.
    pub duty: Option<Duty>,
    /// Full-throttle time limit, s, if given.
    pub full_throttle_limit: Option<f64>,
}

/// Everything the report shows for one screw variant: the study's solution of it.
pub type VariantReport = VariantSolution;

/// Which resistance and interaction methods were used, and why.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MethodSummary {
    /// The resistance method used.
    pub resistance: &'static str,
    /// The interaction method used.
    pub interaction: &'static str,
    /// Why the core picked it when the boat names none; null when the boat names it.
    pub reason: Option<String>,
    /// The alternative method computed beside it, if any.
    pub alternative: Option<&'static str>,
}

impl MethodSummary {
    /// The methods of `vessel`.
    pub fn of(vessel: &Vessel) -> Self {
        let choice = vessel.method_choice.as_ref();
        Self {
            resistance: vessel.resistance.method.name(),
            interaction: vessel.interaction.name(),
            reason: choice.map(|c| c.reason.clone()),
            alternative: choice.and_then(|c| c.alternative.as_ref().map(|m| m.name())),
        }
    }

    /// "Resistance: … · interaction: … (chosen: reason)" for the text report and the TUI.
    pub fn line(&self) -> String {
        let why = match &self.reason {
            Some(reason) => format!("chosen because {reason}"),
            None => "named in the boat file".into(),
        };
        format!(
            "Resistance: {} · interaction: {} ({why})",
            self.resistance, self.interaction
        )
    }
}

/// "Method spread: …" comparing the two methods' top speed and target-speed resistance.
pub fn method_spread_line(spread: &MethodSpread, d: &Display) -> String {
    let speed = |v: Option<f64>| v.map_or("—".to_string(), |v| d.quantity(v, Kind::Speed));
    let difference = spread
        .resistance_difference()
        .map_or("—".to_string(), |x| format!("{:+.0} %", x * 100.0));
    format!(
        "Method spread: {} top speed {} against {} by {}; resistance at the target speed {difference} (in the uncertainty band)",
        spread.alternative,
        speed(spread.alternative_top_speed),
        speed(spread.top_speed),
        spread.method,
    )
}

/// The report of one boat, in SI.
#[derive(Debug, Clone, PartialEq)]
pub struct BoatReport {
    /// The boat's name.
    pub boat: String,
    /// Its engine sheet.
    pub engine: EngineSummary,
    /// Its trip (target speed, tank).
    pub trip: Trip,
    /// One entry per variant reported.
    pub variants: Vec<VariantReport>,
    /// Warnings from every model involved, without duplicates.
    pub warnings: Vec<String>,
    /// The sea-trial correction applied to every prediction, if the boat has one.
    pub calibration: Option<AppliedCalibration>,
    /// Cavitation, blade loading and shaft checks, when asked for.
    pub checks: Option<DesignChecks>,
    /// The methods used and why.
    pub methods: MethodSummary,
}

/// The loud warning when a variant's full-throttle point lies outside the resistance method.
pub fn full_throttle_warning(label: &str, m: &MatchResult, method: &str, reason: &str) -> String {
    format!(
        "FULL THROTTLE OUTSIDE THE METHOD'S RANGE (screw {label}): at {:.0} rpm the boat would run at {:.1} kn, where {reason}. {method} is not valid there: the top speed, the verdict and any pitch chosen at full throttle are extrapolations — a sea trial (`tidewright trial`) or a resistance table decides",
        m.meeting_rpm,
        m.top_speed / KNOT_MPS
    )
}

impl BoatReport {
    /// Solves `vessel` for the report: every variant, or only the one labelled `variant`.
    pub fn build(
        vessel: &Vessel,
        variant: Option<&str>,
        step_rpm: Option<f64>,
        extra_warnings: &[String],
    ) -> Result<Self, ReportError> {
        let indices = variant_indices(vessel, variant)?;
        let engine = &vessel.engine;
        let step = step_rpm.unwrap_or_else(|| default_step(engine.idle_rpm, engine.rated_rpm));
        let rpms = rpm_steps(engine.idle_rpm, engine.rated_rpm, step)
            .map_err(|BadStep(step)| ReportError::BadStep(step))?;
        let options = SolveOptions::table(rpms);
        let variants = indices
            .iter()
            .map(|&i| solve_variant(vessel, i, &options))
            .collect();
        Ok(Self::of_solutions(vessel, variants, extra_warnings))
    }

    /// The report of `variants` of `vessel`, already solved by the study; `extra_warnings` lead
    /// the core's.
    pub fn of_solutions(
        vessel: &Vessel,
        variants: Vec<VariantSolution>,
        extra_warnings: &[String],
    ) -> Self {
        let engine = &vessel.engine;
        let mut warnings: Vec<String> = extra_warnings.to_vec();
        let mut add = |w: String| {
            if !warnings.contains(&w) {
                warnings.push(w);
            }
        };
        vessel
            .resistance
            .warnings()
            .iter()
            .for_each(|w| add(w.to_string()));
        vessel
            .resistance
            .warnings_at(vessel.trip.target_speed)
            .iter()
            .for_each(|w| add(w.to_string()));
        match engine.validate() {
            Ok(ws) => ws.iter().for_each(|w| add(w.to_string())),
            Err(e) => add(format!("engine sheet {}: {e}", engine.name)),
        }
        let mut full_throttle_warnings = Vec::new();
        for v in &variants {
            v.warnings
                .iter()
                .for_each(|w| add(format!("{}: {w}", v.label)));
            if let Some(w) = &v.interaction_warning {
                add(format!("{}: {w}", v.label));
            }
            if let Ok(m) = &v.matched
                && let Some(reason) = m.top_validity.reason()
            {
                full_throttle_warnings.push(full_throttle_warning(
                    &v.label,
                    m,
                    vessel.resistance.method.name(),
                    &reason,
                ));
            }
        }
        // The full-throttle warnings lead: the pitch is decided there.
        for w in full_throttle_warnings.into_iter().rev() {
            if !warnings.contains(&w) {
                warnings.insert(0, w);
            }
        }
        Self {
            boat: vessel.name.clone(),
            engine: EngineSummary {
                name: engine.name.clone(),
                rated_rpm: engine.rated_rpm,
                rated_power: engine.rated_power(),
                idle_rpm: engine.idle_rpm,
                duty: engine.duty,
                full_throttle_limit: engine.full_throttle_limit,
            },
            trip: vessel.trip,
            variants,
            warnings,
            calibration: None,
            checks: None,
            methods: MethodSummary::of(vessel),
        }
    }

    /// The report with the sea-trial correction it was solved with, shown wherever it is.
    pub fn with_calibration(mut self, calibration: Option<AppliedCalibration>) -> Self {
        self.calibration = calibration;
        self
    }

    /// The report with the cavitation, blade-loading and shaft checks; a check past its
    /// limit is added to the warnings.
    pub fn with_checks(mut self, vessel: &Vessel, inputs: &CheckInputs) -> Self {
        let checks = DesignChecks::build(vessel, &self.variants, inputs);
        for w in checks.warnings() {
            if !self.warnings.contains(&w) {
                self.warnings.push(w);
            }
        }
        self.checks = Some(checks);
        self
    }

    /// The text lines of one variant's checks: duty, cavitation table and its legend.
    fn variant_check_text(&self, v: &VariantReport, d: &Display) -> String {
        let mut out = String::new();
        if let Some(duty) = &v.duty {
            out.push_str(&format!("  Engine duty at the target speed: {duty}\n"));
        }
        if let Some(checks) = &self.checks {
            match &checks.cavitation {
                Err(reason) => out.push_str(&format!("  Cavitation check {reason}\n")),
                Ok(_) => {
                    if let Some(table) = checks.cavitation_table(&v.label, d) {
                        out.push_str("  Cavitation and blade loading:\n");
                        out.push_str(&table.to_text("    "));
                        out.push_str(&format!("    {}\n", checks.cavitation_legend(&v.geometry)));
                    }
                }
            }
        }
        out
    }

    /// The Markdown of one variant's checks.
    fn variant_check_markdown(&self, v: &VariantReport, d: &Display) -> String {
        let mut out = String::new();
        if let Some(duty) = &v.duty {
            out.push_str(&format!("\n- Engine duty at the target speed: {duty}\n"));
        }
        if let Some(checks) = &self.checks {
            match &checks.cavitation {
                Err(reason) => out.push_str(&format!("\nCavitation check {reason}.\n")),
                Ok(_) => {
                    if let Some(table) = checks.cavitation_table(&v.label, d) {
                        out.push_str("\n**Cavitation and blade loading**\n\n");
                        out.push_str(&table.to_markdown());
                        out.push_str(&format!("\n{}.\n", checks.cavitation_legend(&v.geometry)));
                    }
                }
            }
        }
        out
    }

    /// The cavitation and duty of one variant for the printable report.
    pub fn variant_checks_markdown(&self, label: &str, d: &Display) -> String {
        self.variants
            .iter()
            .find(|v| v.label == label)
            .map(|v| self.variant_check_markdown(v, d))
            .unwrap_or_default()
    }

    /// The shaft lines, if the checks were made.
    pub fn shaft_lines(&self, d: &Display) -> Vec<String> {
        self.checks
            .as_ref()
            .map(|c| c.shaft_lines(d))
            .unwrap_or_default()
    }

    /// The aligned text report.
    pub fn to_text(&self, system: UnitSystem) -> String {
        let d = Display::new(system);
        let mut out = String::new();
        out.push_str(&format!("{}\n", self.boat));
        out.push_str(&format!("{}\n", self.engine_line(&d)));
        out.push_str(&format!("{}\n", self.trip_line(&d)));
        out.push_str(&format!("{}\n", self.calibration_line()));
        out.push_str(&format!("{}\n", self.methods.line()));
        for v in &self.variants {
            out.push('\n');
            out.push_str(&format!(
                "Screw {}: {}\n",
                v.label,
                screw_spec(&v.geometry, &d)
            ));
            out.push_str(&operating_table(v, &d, false).to_text("  "));
            out.push_str(&format!("  {}\n", match_line(v, &d, self.engine.rated_rpm)));
            if let Some(spread) = &v.method_spread {
                out.push_str(&format!("  {}\n", method_spread_line(spread, &d)));
            }
            out.push_str(&format!(
                "  {}\n",
                target_line(v, &d, self.trip.target_speed, &self.engine)
            ));
            out.push_str(&self.variant_check_text(v, &d));
        }
        let shaft = self.shaft_lines(&d);
        if !shaft.is_empty() {
            out.push('\n');
            for line in shaft {
                out.push_str(&format!("{line}\n"));
            }
        }
        out.push('\n');
        if !self.warnings.is_empty() {
            out.push_str("Warnings:\n");
            for w in &self.warnings {
                out.push_str(&format!("  - {w}\n"));
            }
        }
        out.push_str(&format!("Caution: {CAUTION}\n"));
        out
    }

    /// A Markdown document of the same report.
    pub fn to_markdown(&self, system: UnitSystem) -> String {
        let d = Display::new(system);
        let mut out = format!("# {}\n\n", super::table::md_cell(&self.boat));
        out.push_str(&format!(
            "- {}\n- {}\n- {}\n",
            self.engine_line(&d),
            self.trip_line(&d),
            self.calibration_line()
        ));
        for v in &self.variants {
            out.push_str(&format!(
                "\n## Screw {}\n\n{}\n\n",
                v.label,
                screw_spec(&v.geometry, &d)
            ));
            out.push_str(&operating_table(v, &d, false).to_markdown());
            out.push_str(&format!(
                "\n- {}\n",
                match_line(v, &d, self.engine.rated_rpm)
            ));
            out.push_str(&format!(
                "- {}\n",
                target_line(v, &d, self.trip.target_speed, &self.engine)
            ));
            out.push_str(&self.variant_check_markdown(v, &d));
        }
        let shaft = self.shaft_lines(&d);
        if !shaft.is_empty() {
            out.push_str("\n## Shaft\n\n");
            for line in shaft {
                out.push_str(&format!("- {}\n", line.trim_start()));
            }
        }
        if !self.warnings.is_empty() {
            out.push_str("\n## Warnings\n\n");
            for w in &self.warnings {
                out.push_str(&format!("- {w}\n"));
            }
        }
        out.push_str(&format!("\n> **Caution.** {CAUTION}\n"));
        out
    }

    /// One CSV table of every variant's operating points (a `variant` column first).
    pub fn to_csv(&self, system: UnitSystem) -> String {
        let d = Display::new(system);
        let mut all = Table::default();
        for v in &self.variants {
            let table = operating_table(v, &d, true);
            if all.columns.is_empty() {
                all.columns = table.columns.clone();
            }
            all.rows.extend(table.rows);
        }
        if all.columns.is_empty() {
            all = Table::new(operating_columns(&d, true));
        }
        all.to_csv()
    }

    /// The JSON document (SI or named units, whatever the display system).
    pub fn to_json(&self) -> BoatJson {
        BoatJson {
            boat: self.boat.clone(),
            units: "SI, or the unit named at the end of the field",
            engine: EngineJson {
                name: self.engine.name.clone(),
                rated_rpm: self.engine.rated_rpm,
                rated_kw: self.engine.rated_power / 1e3,
                idle_rpm: self.engine.idle_rpm,
            },
            target_speed_kn: self.trip.target_speed / KNOT_MPS,
            variants: self
                .variants
                .iter()
                .map(|v| {
                    let mut points = Vec::new();
                    let mut unsolved = Vec::new();
                    for row in &v.rows {
                        match &row.outcome {
                            Ok(c) => points.push(PointJson::from(c)),
                            Err(reason) => unsolved.push(UnsolvedJson {
                                engine_rpm: row.engine_rpm,
                                reason: reason.clone(),
                            }),
                        }
                    }
                    VariantJson {
                        label: v.label.clone(),
                        blades: v.geometry.blades,
                        diameter_m: v.geometry.diameter,
                        pitch_m: v.geometry.pitch,
                        area_ratio: v.geometry.area_ratio,
                        points,
                        unsolved,
                        matching: v.matched.as_ref().ok().map(|m| MatchJson {
                            meeting_rpm: m.meeting_rpm,
                            top_speed_kn: m.top_speed / KNOT_MPS,
                            absorbed_pct_at_rated: m.absorbed_fraction_at_rated * 100.0,
                            verdict: m.verdict,
                            rpm_margin: m.rpm_margin,
                            rpm_margin_is_lower_bound: m.margin_is_lower_bound,
                            top_speed_froude: m.top_validity.froude,
                            top_speed_in_method_range: m.top_speed_in_method_range,
                            top_speed_unreliable_because: m.top_validity.reason(),
                        }),
                        match_error: v.matched.as_ref().err().cloned(),
                        cruise: v.cruise.as_ref().ok().map(PointJson::from),
                        cruise_error: v.cruise.as_ref().err().cloned(),
                        duty_note: v.duty.clone(),
                        method_spread: v.method_spread.clone(),
                        cavitation: self
                            .checks
                            .as_ref()
                            .map(|c| c.cavitation_json(&v.label))
                            .unwrap_or_default(),
                    }
                })
                .collect(),
            calibration: self.calibration.clone(),
            methods: self.methods.clone(),
            cavitation_skipped: self
                .checks
                .as_ref()
                .and_then(|c| c.cavitation.as_ref().err().cloned()),
            shaft: self.checks.as_ref().and_then(DesignChecks::shaft_json),
            shaft_error: self
                .checks
                .as_ref()
                .and_then(|c| c.shaft.as_ref().err().cloned()),
            warnings: self.warnings.clone(),
            caution: CAUTION,
        }
    }

    /// "calibration applied: …", or that none is applied.
    pub fn calibration_line(&self) -> String {
        match &self.calibration {
            Some(c) => c.line(),
            None => "calibration: none (uncalibrated model; `tidewright trial BOAT --save` fits one from a sea-trial log)".into(),
        }
    }

    fn engine_line(&self, d: &Display) -> String {
        let e = &self.engine;
        let mut line = format!(
            "Engine {}: {} at {:.0} rpm rated, idle {:.0} rpm",
            e.name,
            d.quantity(e.rated_power, Kind::Power),
            e.rated_rpm,
            e.idle_rpm
        );
        if let Some(duty) = e.duty {
            line.push_str(match duty {
                Duty::Continuous => ", continuous duty",
                Duty::Intermittent => ", intermittent duty",
            });
        }
        if let Some(limit) = e.full_throttle_limit {
            line.push_str(&format!(
                " (full throttle at most {})",
                d.quantity(limit, Kind::Time)
            ));
        }
        line
    }

    fn trip_line(&self, d: &Display) -> String {
        let t = &self.trip;
        format!(
            "Target speed {} · tank {} ({} usable, {} reserve)",
            d.quantity(t.target_speed, Kind::Speed),
            d.quantity(t.tank_volume, Kind::Volume),
            percent(t.usable_fraction, 0),
            percent(t.reserve_fraction, 0)
        )
    }
}

fn variant_indices(vessel: &Vessel, label: Option<&str>) -> Result<Vec<usize>, ReportError> {
    match label {
        None => Ok((0..vessel.variants.len()).collect()),
        Some(label) => vessel
            .variant_by_label(label)
            .map(|i| vec![i])
            .ok_or_else(|| ReportError::UnknownVariant {
                boat: vessel.name.clone(),
                label: label.to_string(),
                known: vessel.variant_labels(),
            }),
    }
}

/// "3 blades × 508 mm × 356 mm pitch, AE/A0 0.50".
pub fn screw_spec(g: &ScrewGeometry, d: &Display) -> String {
    format!(
        "{} blades × {} diameter × {} pitch, AE/A0 {:.2} (P/D {:.3})",
        g.blades,
        d.quantity(g.diameter, Kind::ScrewLength),
        d.quantity(g.pitch, Kind::ScrewLength),
        g.area_ratio,
        if g.diameter > 0.0 {
            g.pitch / g.diameter
        } else {
            0.0
        }
    )
}

/// The operating table of one variant; with `with_label` a first column names the variant.
pub fn operating_table(v: &VariantReport, d: &Display, with_label: bool) -> Table {
    let mut table = Table::new(operating_columns(d, with_label));
    let imperial = d.system == UnitSystem::Imperial;
    // A run of unsolvable rows says why once, on its first row.
    let mut previous_failed = false;
    for row in &v.rows {
        let mut cells = Vec::new();
        if with_label {
            cells.push(v.label.clone());
        }
        match &row.outcome {
            Ok(c) => {
                let p = &c.point;
                cells.extend([
                    format!("{:.0}", p.engine_rpm),
                    format!("{:.0}", p.screw_rps * 60.0),
                    d.number(p.speed, Kind::Speed, 2),
                    d.number(p.brake_power, Kind::Power, 1),
                    format!("{:.0}", p.load_fraction * 100.0),
                    d.number(
                        p.fuel_volume_flow,
                        Kind::FuelRate,
                        if imperial { 2 } else { 1 },
                    ),
                    d.number(
                        c.fuel_per_distance,
                        Kind::FuelPerDistance,
                        if imperial { 3 } else { 2 },
                    ),
                    d.number(c.range, Kind::Distance, 0),
                    point_note(c),
                ]);
            }
            Err(reason) => {
                cells.push(format!("{:.0}", row.engine_rpm));
                cells.extend(std::iter::repeat_n("—".to_string(), 7));
                cells.push(if previous_failed {
                    "not solved (as above)".to_string()
                } else {
                    reason.clone()
                });
            }
        }
        previous_failed = row.outcome.is_err();
        table.push(cells);
    }
    table
}

/// The columns of an operating table; with `with_label` a first column names the variant.
fn operating_columns(d: &Display, with_label: bool) -> Vec<Column> {
    let mut columns = Vec::new();
    if with_label {
        columns.push(Column::text("variant"));
    }
    columns.extend([
        Column::number("engine", "rpm"),
        Column::number("screw", "rpm"),
        Column::number("speed", &d.unit(Kind::Speed)),
        Column::number("power", &d.unit(Kind::Power)),
        Column::number("load", "%"),
        Column::number("fuel/h", &d.unit(Kind::FuelRate)),
        Column::number("fuel/nm", &d.unit(Kind::FuelPerDistance)),
        Column::number("range", &d.unit(Kind::Distance)),
        Column::text("note"),
    ]);
    columns
}

/// The note of one operating row: past full load, outside the method's range, or empty.
fn point_note(c: &CruisePoint) -> String {
    let mut notes = Vec::new();
    if c.beyond_full_load {
        notes.push("past full load: not reachable".to_string());
    }
    if !c.point.in_method_range {
        notes.push(format!(
            "unreliable: outside the method's range (Fn {:.2})",
            c.point.froude
        ));
    }
    notes.join("; ")
}

/// The verdict in words.
pub fn verdict_words(verdict: Verdict) -> &'static str {
    match verdict {
        Verdict::Over => "over-propped",
        Verdict::Matched => "matched",
        Verdict::Under => "under-propped",
    }
}

/// The margin at full throttle in words, the same in every front end: "reaches rated 2600 rpm",
/// "267 rpm short of rated 2600 rpm" or "runs free 52 rpm past rated 2600 rpm" (`rpm_margin`
/// as in [`MatchResult::rpm_margin`]: negative a shortfall, positive headroom).
pub fn margin_words(rpm_margin: f64, lower_bound: bool, rated_rpm: f64) -> String {
    if lower_bound {
        format!("runs free at least {rpm_margin:.0} rpm past rated {rated_rpm:.0} rpm")
    } else if rpm_margin.abs() < 0.5 {
        format!("reaches rated {rated_rpm:.0} rpm")
    } else if rpm_margin < 0.0 {
        format!("{:.0} rpm short of rated {rated_rpm:.0} rpm", -rpm_margin)
    } else {
        format!("runs free {rpm_margin:.0} rpm past rated {rated_rpm:.0} rpm")
    }
}

/// The verdict and margin of a match, the same in every front end: "matched, margin +52 rpm
/// (runs free 52 rpm past rated 2600 rpm)".
pub fn verdict_and_margin(m: &MatchResult, rated_rpm: f64) -> String {
    format!(
        "{}, margin {} ({})",
        verdict_words(m.verdict),
        signed_rpm(m.rpm_margin),
        margin_words(m.rpm_margin, m.margin_is_lower_bound, rated_rpm)
    )
}

/// A signed rpm figure with a true minus sign and no "−0": "+52 rpm", "−267 rpm", "0 rpm".
pub fn signed_rpm(rpm: f64) -> String {
    let rounded = rpm.round();
    if rounded == 0.0 {
        "0 rpm".to_string()
    } else if rounded > 0.0 {
        format!("+{rounded:.0} rpm")
    } else {
        format!("−{:.0} rpm", -rounded)
    }
}

/// "Match: over-propped — …" for one variant.
pub fn match_line(v: &VariantReport, d: &Display, rated_rpm: f64) -> String {
    let line = match &v.matched {
        Ok(m) => {
            let top_speed = if m.top_speed_in_method_range {
                d.quantity(m.top_speed, Kind::Speed)
            } else {
                format!(
                    "about {} (UNRELIABLE: {}; a sea trial decides)",
                    d.quantity(m.top_speed, Kind::Speed),
                    m.top_validity.reason().unwrap_or_default()
                )
            };
            format!(
                "Match: {} — full throttle at {:.0} rpm, top speed {top_speed}, the screw absorbs {} of rated power at rated rpm",
                verdict_and_margin(m, rated_rpm),
                m.meeting_rpm,
                percent(m.absorbed_fraction_at_rated, 0)
            )
        }
        Err(reason) => format!("Match: not found — {reason}"),
    };
    if v.extrapolated {
        format!("{line} [extrapolated: screw outside its model's range, see warnings]")
    } else {
        line
    }
}

/// "At 7.0 kn: …" for one variant.
pub fn target_line(
    v: &VariantReport,
    d: &Display,
    target_speed: f64,
    engine: &EngineSummary,
) -> String {
    let at = d.quantity(target_speed, Kind::Speed);
    match &v.cruise {
        Ok(c) => {
            let mut line = format!("At {at}: {}", cruise_summary(c, d));
            if !c.point.in_method_range {
                line.push_str(&format!(
                    " — UNRELIABLE: Fn {:.2}, outside the resistance method's range",
                    c.point.froude
                ));
            }
            if c.beyond_full_load {
                line.push_str(" — past the engine's full-load curve: not reachable");
            } else if v.duty.is_none() && engine.duty == Some(Duty::Intermittent) {
                line.push_str(" (engine rated for intermittent duty)");
            }
            line
        }
        Err(reason) => format!("At {at}: not solved — {reason}"),
    }
}

/// rpm · speed · power · load · fuel/h · fuel/nm · range.
pub fn cruise_summary(c: &CruisePoint, d: &Display) -> String {
    let p = &c.point;
    format!(
        "{:.0} rpm · {} · {} · {} load · {} · {} · range {}",
        p.engine_rpm,
        d.quantity(p.speed, Kind::Speed),
        d.quantity(p.brake_power, Kind::Power),
        percent(p.load_fraction, 0),
        d.quantity(p.fuel_volume_flow, Kind::FuelRate),
        d.quantity(c.fuel_per_distance, Kind::FuelPerDistance),
        d.quantity(c.range, Kind::Distance)
    )
}

/// The report as JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BoatJson {
    /// The boat's name.
    pub boat: String,
    /// How the values are expressed.
    pub units: &'static str,
    /// The engine sheet.
    pub engine: EngineJson,
    /// The trip's target speed, kn.
    pub target_speed_kn: f64,
    /// The variants.
    pub variants: Vec<VariantJson>,
    /// The sea-trial correction applied, or null.
    pub calibration: Option<AppliedCalibration>,
    /// The resistance and interaction methods used and why.
    pub methods: MethodSummary,
    /// Why the cavitation check was skipped, or null.
    pub cavitation_skipped: Option<String>,
    /// The shaft check, or null.
    pub shaft: Option<ShaftJson>,
    /// Why the shaft was not checked, or null.
    pub shaft_error: Option<String>,
    /// Warnings.
    pub warnings: Vec<String>,
    /// The caution.
    pub caution: &'static str,
}

/// The engine sheet in JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EngineJson {
    /// Name.
    pub name: String,
    /// Rated speed, rpm.
    pub rated_rpm: f64,
    /// Rated power, kW.
    pub rated_kw: f64,
    /// Idle speed, rpm.
    pub idle_rpm: f64,
}

/// One variant in JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct VariantJson {
    /// Label.
    pub label: String,
    /// Blade count.
    pub blades: u32,
    /// Diameter, m.
    pub diameter_m: f64,
    /// Pitch, m.
    pub pitch_m: f64,
    /// Expanded area ratio.
    pub area_ratio: f64,
    /// Solved operating points at the rpm steps.
    pub points: Vec<PointJson>,
    /// Rpm steps that could not be solved, with the reason.
    pub unsolved: Vec<UnsolvedJson>,
    /// The match, if found.
    #[serde(rename = "match")]
    pub matching: Option<MatchJson>,
    /// Why the match was not found, if not.
    pub match_error: Option<String>,
    /// The cruise point at the target speed, if solved.
    pub cruise: Option<PointJson>,
    /// Why the cruise point was not solved, if not.
    pub cruise_error: Option<String>,
    /// The engine's duty rating beside the load at the target speed.
    pub duty_note: Option<String>,
    /// Both resistance methods' top speed (m/s) and target-speed resistance (N), when both run.
    pub method_spread: Option<MethodSpread>,
    /// Cavitation and blade loading at the target speed and at top speed.
    pub cavitation: Vec<CavitationJson>,
}

/// One operating point in JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PointJson {
    /// Engine speed, rpm.
    pub engine_rpm: f64,
    /// Screw speed, rpm.
    pub prop_rpm: f64,
    /// Boat speed, kn.
    pub speed_kn: f64,
    /// Resistance, N.
    pub resistance_n: f64,
    /// Required thrust, N.
    pub thrust_n: f64,
    /// Advance ratio J.
    pub j: f64,
    /// KT.
    pub kt: f64,
    /// KQ.
    pub kq: f64,
    /// Open-water efficiency.
    pub eta0: f64,
    /// Delivered power, kW.
    pub delivered_kw: f64,
    /// Brake power, kW.
    pub brake_kw: f64,
    /// Engine load, % of full-load power at this rpm.
    pub load_pct: f64,
    /// Fuel rate, L/h.
    pub fuel_lph: f64,
    /// Fuel per nautical mile, L/nm.
    pub fuel_l_per_nm: f64,
    /// Range with usable fuel less reserve, nm.
    pub range_nm: f64,
    /// Whether the point lies past the full-load curve.
    pub beyond_full_load: bool,
    /// Length Froude number V/√(g·LWL).
    pub froude: f64,
    /// Whether the resistance method is valid at this speed (false: unreliable).
    pub in_method_range: bool,
}

impl From<&CruisePoint> for PointJson {
    fn from(c: &CruisePoint) -> Self {
        let p = &c.point;
        Self {
            engine_rpm: p.engine_rpm,
            prop_rpm: p.screw_rps * 60.0,
            speed_kn: p.speed / KNOT_MPS,
            resistance_n: p.resistance,
            thrust_n: p.thrust,
            j: p.advance_ratio,
            kt: p.thrust_coefficient,
            kq: p.torque_coefficient,
            eta0: p.open_water_efficiency,
            delivered_kw: p.delivered_power / 1e3,
            brake_kw: p.brake_power / 1e3,
            load_pct: p.load_fraction * 100.0,
            fuel_lph: p.fuel_volume_flow / LITRE_M3 * 3600.0,
            fuel_l_per_nm: c.fuel_per_distance / LITRE_M3 * NAUTICAL_MILE_M,
            range_nm: c.range / NAUTICAL_MILE_M,
            beyond_full_load: c.beyond_full_load,
            froude: p.froude,
            in_method_range: p.in_method_range,
        }
    }
}

/// An rpm step that could not be solved.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct UnsolvedJson {
    /// Engine speed asked for, rpm.
    pub engine_rpm: f64,
    /// Why.
    pub reason: String,
}

/// The match in JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MatchJson {
    /// Engine rpm at wide-open throttle.
    pub meeting_rpm: f64,
    /// Top speed, kn.
    pub top_speed_kn: f64,
    /// Power absorbed at rated rpm, % of rated power.
    pub absorbed_pct_at_rated: f64,
    /// over / matched / under.
    pub verdict: Verdict,
    /// The margin at full throttle, rpm: the rpm at which the screw absorbs full-load power
    /// minus rated rpm (negative: shortfall, over-propped; positive: free-running headroom).
    pub rpm_margin: f64,
    /// Whether `rpm_margin` is only a lower bound.
    pub rpm_margin_is_lower_bound: bool,
    /// Length Froude number at the top speed.
    pub top_speed_froude: f64,
    /// Whether the top speed is inside the resistance method's range (false: unreliable).
    pub top_speed_in_method_range: bool,
    /// Why the top speed is unreliable, or null.
    pub top_speed_unreliable_because: Option<String>,
}

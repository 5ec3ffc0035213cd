//! The text writers of the boat report: the aligned text report, Markdown and CSV, and the
//! lines the other writers and the TUI share (match, target, verdict, margin, screw spec).

use super::model::{BoatReport, EngineSummary, VariantReport, unreliable_label};
use super::table::{Column, Table};
use super::{CAUTION, Display, percent};
use crate::propulsion::engine::Duty;
use crate::propulsion::hull::{ResistanceModel, UNRELIABLE_WORDS};
use crate::propulsion::screw::ScrewGeometry;
use crate::propulsion::solver::pitch::ConditionSummary;
use crate::propulsion::solver::{CruisePoint, MatchResult, MethodSpread, Verdict};
use crate::units::{Kind, UnitSystem};

impl BoatReport {
    /// The text lines of one variant's checks: duty, cavitation table and its legend.
    fn variant_check_text(&self, v: &VariantReport, d: &Display) -> String {
        let mut out = String::new();
        if let Some(duty) = &v.duty {
            out.push_str(&format!(
                "  Engine duty at the target speed{}: {duty}\n",
                self.each_engine()
            ));
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
            out.push_str(&format!(
                "\n- Engine duty at the target speed{}: {duty}\n",
                self.each_engine()
            ));
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

    /// " (each engine)" on a twin, else nothing: what a per-engine figure is labelled with.
    pub fn each_engine(&self) -> &'static str {
        if self.is_twin() { " (each engine)" } else { "" }
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
            out.push_str(
                &operating_table(v, &d, false, self.shafts, &self.resistance).to_text("  "),
            );
            out.push_str(&format!("  {}\n", match_line(v, &d, self.engine.rated_rpm)));
            if let Some(spread) = &v.method_spread {
                out.push_str(&format!("  {}\n", method_spread_line(spread, &d)));
            }
            out.push_str(&format!(
                "  {}\n",
                target_line(
                    v,
                    &d,
                    self.trip.target_speed,
                    &self.engine,
                    &self.resistance
                )
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
        if let Some(section) = self.before_after_text(&d) {
            out.push_str("\nBefore and after (the boat as found against each planned screw)\n");
            out.push_str(&section);
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
            out.push_str(
                &operating_table(v, &d, false, self.shafts, &self.resistance).to_markdown(),
            );
            out.push_str(&format!(
                "\n- {}\n",
                match_line(v, &d, self.engine.rated_rpm)
            ));
            out.push_str(&format!(
                "- {}\n",
                target_line(
                    v,
                    &d,
                    self.trip.target_speed,
                    &self.engine,
                    &self.resistance
                )
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
        if let Some(section) = self.before_after_markdown(&d) {
            out.push_str("\n## Before and after\n\n");
            out.push_str(&section);
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
            let table = operating_table(v, &d, true, self.shafts, &self.resistance);
            if all.columns.is_empty() {
                all.columns = table.columns.clone();
            }
            all.rows.extend(table.rows);
        }
        if all.columns.is_empty() {
            all = Table::new(operating_columns(&d, true, self.shafts));
        }
        all.to_csv()
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
        if self.is_twin() {
            line = format!(
                "Engines 2 × {}: {} each at {:.0} rpm rated, idle {:.0} rpm; 2 shafts, handed (one engine, gear and screw each)",
                e.name,
                d.quantity(e.rated_power, Kind::Power),
                e.rated_rpm,
                e.idle_rpm
            );
        }
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

/// The operating table of one variant; with `with_label` a first column names the variant. On
/// a twin (`shafts` 2) power and fuel are the boat's, with each engine's power and load beside.
pub fn operating_table(
    v: &VariantReport,
    d: &Display,
    with_label: bool,
    shafts: u32,
    resistance: &ResistanceModel,
) -> Table {
    let twin = shafts >= 2;
    let mut table = Table::new(operating_columns(d, with_label, shafts));
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
                ]);
                if twin {
                    cells.push(d.number(p.brake_power_per_engine, Kind::Power, 1));
                }
                cells.extend([
                    format!("{:.0}", p.load_fraction * 100.0),
                    d.number(
                        p.fuel_volume_flow,
                        Kind::FuelRate,
                        if imperial { 2 } else { 1 },
                    ),
                    d.figure(c.fuel_per_distance, Kind::FuelPerDistance),
                    d.number(c.range, Kind::Distance, 0),
                    point_note(c, resistance),
                ]);
            }
            Err(reason) => {
                cells.push(format!("{:.0}", row.engine_rpm));
                cells.extend(std::iter::repeat_n(
                    "—".to_string(),
                    if twin { 8 } else { 7 },
                ));
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
fn operating_columns(d: &Display, with_label: bool, shafts: u32) -> Vec<Column> {
    let mut columns = Vec::new();
    if with_label {
        columns.push(Column::text("variant"));
    }
    columns.extend([
        Column::number("engine", "rpm"),
        Column::number("screw", "rpm"),
        Column::number("speed", &d.unit(Kind::Speed)),
    ]);
    if shafts >= 2 {
        columns.extend([
            Column::number("boat power", &d.unit(Kind::Power)),
            Column::number("each engine", &d.unit(Kind::Power)),
            Column::number("load each", "%"),
            Column::number("boat fuel/h", &d.unit(Kind::FuelRate)),
        ]);
    } else {
        columns.extend([
            Column::number("power", &d.unit(Kind::Power)),
            Column::number("load", "%"),
            Column::number("fuel/h", &d.unit(Kind::FuelRate)),
        ]);
    }
    columns.extend([
        Column::number("fuel/nm", &d.unit(Kind::FuelPerDistance)),
        Column::number("range", &d.unit(Kind::Distance)),
        Column::text("note"),
    ]);
    columns
}

/// The note of one operating row: past full load, outside the method's range, or empty.
fn point_note(c: &CruisePoint, resistance: &ResistanceModel) -> String {
    let mut notes = Vec::new();
    if c.beyond_full_load {
        notes.push("past full load: not reachable".to_string());
    }
    if let Some(why) = unreliable_label(resistance, &c.point) {
        notes.push(format!("unreliable: {why}"));
    }
    notes.join("; ")
}

/// A pitch recommendation's condition in the display units: "full load: displacement 17.0 t,
/// service margin 15 %, fouling 5 %" (`water_density` turns the core's volume into a mass).
pub fn condition_words(c: &ConditionSummary, water_density: f64, d: &Display) -> String {
    let mut text = format!(
        "{}: displacement {}, service margin {:.0} %, fouling {:.0} %",
        c.label,
        d.quantity(c.displacement_volume * water_density, Kind::Mass),
        c.service_margin * 100.0,
        c.fouling * 100.0
    );
    if (c.resistance_factor - 1.0).abs() > 1e-9 {
        text.push_str(&format!(
            ", sea-trial resistance factor {:.3} applied",
            c.resistance_factor
        ));
    }
    text
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
                    m.top_validity
                        .label()
                        .unwrap_or_else(|| UNRELIABLE_WORDS.to_owned())
                )
            };
            let absorbs = if m.top_point.shafts >= 2 {
                "each screw absorbs {} of its engine's rated power at rated rpm"
            } else {
                "the screw absorbs {} of rated power at rated rpm"
            }
            .replace("{}", &percent(m.absorbed_fraction_at_rated, 0));
            format!(
                "Match{}: {} — full throttle at {:.0} rpm, top speed {top_speed}, {absorbs}",
                if m.top_point.shafts >= 2 {
                    " (each shaft; identical engines and screws)"
                } else {
                    ""
                },
                verdict_and_margin(m, rated_rpm),
                m.meeting_rpm,
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
    resistance: &ResistanceModel,
) -> String {
    let at = d.quantity(target_speed, Kind::Speed);
    match &v.cruise {
        Ok(c) => {
            let mut line = format!("At {at}: {}", cruise_summary(c, d));
            if let Some(why) = unreliable_label(resistance, &c.point) {
                line.push_str(&format!(" — UNRELIABLE: {why}"));
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

/// rpm · speed · power · load · fuel/h · fuel/nm · range; with two engines running, the boat's
/// power and fuel with each engine's beside them.
pub fn cruise_summary(c: &CruisePoint, d: &Display) -> String {
    let p = &c.point;
    let (power, load, fuel) = if p.driven_shafts >= 2 {
        (
            format!(
                "{} ({} each engine)",
                d.quantity(p.brake_power, Kind::Power),
                d.quantity(p.brake_power_per_engine, Kind::Power)
            ),
            format!("{} load each engine", percent(p.load_fraction, 0)),
            format!(
                "{} ({} each engine)",
                d.quantity(p.fuel_volume_flow, Kind::FuelRate),
                d.quantity(p.fuel_volume_flow_per_engine, Kind::FuelRate)
            ),
        )
    } else {
        (
            d.quantity(p.brake_power, Kind::Power),
            format!("{} load", percent(p.load_fraction, 0)),
            d.quantity(p.fuel_volume_flow, Kind::FuelRate),
        )
    };
    format!(
        "{:.0} rpm · {} · {power} · {load} · {fuel} · {} · range {}",
        p.engine_rpm,
        d.quantity(p.speed, Kind::Speed),
        d.quantity(c.fuel_per_distance, Kind::FuelPerDistance),
        d.quantity(c.range, Kind::Distance)
    )
}

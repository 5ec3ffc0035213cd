//! The what-if comparison laid out: the conditions side by side, the pitch for each and the
//! uncertainty band, as text, Markdown and JSON over the study's [`WhatIf`].

use serde::Serialize;

use super::checks::AppliedCalibration;
use super::table::{Column, Table};
use super::text::{condition_words, verdict_words};
use super::{CAUTION, Display, KNOT_MPS, LITRE_M3, percent};
use crate::profile::{LoadCondition, LoadDoc};
use crate::propulsion::solver::Verdict;
use crate::propulsion::solver::conditions::ConditionOutcome;
use crate::propulsion::solver::pitch::PitchRecommendation;
use crate::study::Study;
pub use crate::study::what_if::{WhatIf, WhatIfSettings};
use crate::units::Kind;

/// The mark of a case that leaves something out (one engine out: the trailing screw's drag),
/// explained under the table.
pub const OMITTED_MARK: &str = "†";

/// The note of a row whose top speed (marked ≈) lies outside the resistance method's range.
pub const UNRELIABLE_TOP_NOTE: &str = "≈ top speed unreliable: past the resistance method's range or the displacement-hull speed/length limit";

use super::finite_or_none as finite;

fn recommended(p: &Result<PitchRecommendation, String>) -> Option<f64> {
    p.as_ref().ok().and_then(|r| finite(r.recommended_pitch))
}

impl WhatIf {
    /// The side-by-side table of the conditions.
    pub fn conditions_table(&self, d: &Display) -> Table {
        let twin = self.shafts >= 2;
        let mut table = Table::new(vec![
            Column::text("condition"),
            Column::number("displacement", &d.unit(Kind::Mass)),
            Column::text("verdict"),
            Column::number("full throttle", "rpm"),
            Column::number("margin", "rpm"),
            Column::number("absorbs at rated", "%"),
            Column::number("top speed", &d.unit(Kind::Speed)),
            Column::number("cruise", "rpm"),
            Column::number(
                if twin { "boat power" } else { "power" },
                &d.unit(Kind::Power),
            ),
            Column::number(
                if twin { "boat fuel/h" } else { "fuel/h" },
                &d.unit(Kind::FuelRate),
            ),
            Column::number("pitch for it", &d.unit(Kind::ScrewLength)),
            Column::text("note"),
        ]);
        let dash = || "—".to_string();
        let mass_decimals = if d.system == crate::units::UnitSystem::Imperial {
            0
        } else {
            2
        };
        let shown = shown_outcomes(&self.outcomes);
        let rows = self
            .outcomes
            .iter()
            .zip(&self.pitches)
            .enumerate()
            .filter(|(i, _)| shown.contains(i));
        for (i, (o, p)) in rows {
            let mut note = Vec::new();
            if o.cruise_beyond_full_load == Some(true) {
                note.push("target speed past full load".to_string());
            }
            let unreliable = o.top_speed_in_method_range == Some(false);
            if let Some(problem) = &o.problem {
                note.push(problem.clone());
            }
            if !o.warnings.is_empty() {
                note.push(format!(
                    "{} engine running{OMITTED_MARK}",
                    o.engines_running
                ));
            }
            if let Err(e) = p {
                note.push(format!("pitch: {e}"));
            }
            let label = if i == 0 {
                format!(
                    "{} (the file's {})",
                    o.condition.label,
                    default_load_words(&self.default_load)
                )
            } else {
                o.condition.label.clone()
            };
            table.push(vec![
                label,
                d.number(
                    o.condition.displacement_volume * self.water_density,
                    Kind::Mass,
                    mass_decimals,
                ),
                o.verdict
                    .map_or_else(dash, |v| verdict_words(v).to_string()),
                finite(o.full_throttle_rpm).map_or_else(dash, |r| format!("{r:.0}")),
                finite(o.rpm_margin).map_or_else(dash, |m| format!("{m:+.0}")),
                finite(o.absorbed_fraction_at_rated)
                    .map_or_else(dash, |f| format!("{:.0}", f * 100.0)),
                finite(o.top_speed).map_or_else(dash, |v| {
                    let prefix = if unreliable { "≈" } else { "" };
                    format!("{prefix}{}", d.number(v, Kind::Speed, 2))
                }),
                finite(o.cruise_rpm).map_or_else(dash, |r| format!("{r:.0}")),
                finite(o.cruise_power).map_or_else(dash, |w| d.number(w, Kind::Power, 1)),
                finite(o.cruise_fuel_volume_flow)
                    .map_or_else(dash, |q| d.number(q, Kind::FuelRate, 2)),
                recommended(p).map_or_else(dash, |m| d.number(m, Kind::ScrewLength, 1)),
                note.join("; "),
            ]);
        }
        table
    }

    /// "pitch for it" column: which condition each recommendation was made for, the
    /// displacement as a mass in the display units (the rows shown only).
    pub fn pitch_conditions(&self, d: &Display) -> Vec<String> {
        let shown = shown_outcomes(&self.outcomes);
        self.pitches
            .iter()
            .enumerate()
            .filter(|(i, _)| shown.contains(i))
            .filter_map(|(_, p)| p.as_ref().ok())
            .map(|r| condition_words(&r.condition, self.water_density, d))
            .collect()
    }

    /// The lines under the table: the ≈ legend when a top speed is unreliable, and what the
    /// marked cases leave out.
    pub fn legend_lines(&self) -> Vec<String> {
        let mut lines = Vec::new();
        if self
            .outcomes
            .iter()
            .any(|o| o.top_speed_in_method_range == Some(false))
        {
            lines.push(UNRELIABLE_TOP_NOTE.to_string());
        }
        lines.extend(self.omitted_lines());
        lines
    }

    /// "Each pitch is made to <its target> for its own condition" (each screw's on a twin).
    pub fn pitch_target_line(&self) -> String {
        let target = self
            .pitches
            .iter()
            .find_map(|p| p.as_ref().ok())
            .map(|r| r.target.describe())
            .unwrap_or_else(|| "meet the full-load curve at rated rpm".into());
        format!(
            "Each pitch{} is made to {target} for its own condition",
            if self.shafts >= 2 {
                " (each screw)"
            } else {
                ""
            }
        )
    }

    /// What the marked cases leave out, one line each, without repeats ("† …").
    pub fn omitted_lines(&self) -> Vec<String> {
        let mut lines: Vec<String> = Vec::new();
        for w in self.outcomes.iter().flat_map(|o| &o.warnings) {
            let line = format!("{OMITTED_MARK} {}", w.message);
            if !lines.contains(&line) {
                lines.push(line);
            }
        }
        lines
    }

    /// The band as a table: power as given and its least and greatest over the cases.
    pub fn band_table(&self, d: &Display) -> Option<Table> {
        let band = self.band.as_ref().ok()?;
        let twin = self.shafts >= 2;
        let (power, least, greatest) = if twin {
            ("power each engine", "least each", "greatest each")
        } else {
            ("power", "least", "greatest")
        };
        let mut table = Table::new(vec![
            Column::number("engine", "rpm"),
            Column::number("speed", &d.unit(Kind::Speed)),
            Column::number(power, &d.unit(Kind::Power)),
            Column::number(least, &d.unit(Kind::Power)),
            Column::number(greatest, &d.unit(Kind::Power)),
        ]);
        let opt = |v: Option<f64>, kind, decimals| {
            finite(v).map_or("—".to_string(), |x| d.number(x, kind, decimals))
        };
        for p in &band.points {
            table.push(vec![
                format!("{:.0}", p.engine_rpm),
                opt(p.nominal_speed, Kind::Speed, 2),
                opt(p.nominal_power, Kind::Power, 1),
                opt(p.low_power, Kind::Power, 1),
                opt(p.high_power, Kind::Power, 1),
            ]);
        }
        Some(table)
    }

    /// The band's heading line and its pitch range line.
    pub fn band_lines(&self, d: &Display) -> Vec<String> {
        match &self.band {
            Err(e) => vec![format!("Uncertainty band not available: {e}")],
            Ok(band) => {
                let mut lines = vec![format!(
                    "Uncertainty band: displacement ±{}, wake fraction ±{:.2} (shifted about the estimate at each rpm's own speed; for the pitch, about its value at full throttle, {})",
                    percent(band.ranges.displacement_fraction, 0),
                    band.ranges.wake_shift,
                    d.quantity(band.wake_reference_speed, Kind::Speed)
                )];
                let as_given = self
                    .pitches
                    .first()
                    .and_then(|p| p.as_ref().ok())
                    .map(|r| condition_words(&r.condition, self.water_density, d))
                    .unwrap_or_else(|| "the boat as given".into());
                lines.push(match (finite(band.pitch_nominal), finite(band.pitch_low), finite(band.pitch_high)) {
                    (Some(p), Some(lo), Some(hi)) => format!(
                        "Recommended pitch {} (range {} to {} over the band), made for {as_given}",
                        d.quantity(p, Kind::ScrewLength),
                        d.quantity(lo, Kind::ScrewLength),
                        d.quantity(hi, Kind::ScrewLength)
                    ),
                    _ => "No pitch range: the pitch search found no pitch for the boat as given".into(),
                });
                lines.extend(band.warnings.iter().map(|w| format!("warning: {w}")));
                lines
            }
        }
    }

    /// Each condition against the boat as found under it: top speed, full-throttle rpm,
    /// cruise rpm and fuel, as found → planned and the change (`None` without a baseline).
    pub fn as_found_table(&self, d: &Display) -> Option<Table> {
        let found = self.as_found.as_ref()?;
        let speed = d.unit(Kind::Speed);
        let fuel = d.unit(Kind::FuelRate);
        let mut table = Table::new(vec![
            Column::text("condition"),
            Column::number("top as found", &speed),
            Column::number("top planned", &speed),
            Column::number("full throttle as found", "rpm"),
            Column::number("full throttle planned", "rpm"),
            Column::number("cruise change", "rpm"),
            Column::number("fuel change", &fuel),
        ]);
        let dash = || "—".to_string();
        let num = |v: Option<f64>, kind: Kind, decimals: usize| {
            finite(v).map_or_else(dash, |x| d.number(x, kind, decimals))
        };
        let rpm = |v: Option<f64>| finite(v).map_or_else(dash, |x| format!("{x:.0}"));
        let change = |a: Option<f64>, b: Option<f64>, f: &dyn Fn(f64) -> String| match (
            finite(a),
            finite(b),
        ) {
            (Some(a), Some(b)) => f(a - b),
            _ => dash(),
        };
        for (o, f) in self.outcomes.iter().zip(found) {
            table.push(vec![
                o.condition.label.clone(),
                num(f.top_speed, Kind::Speed, 1),
                num(o.top_speed, Kind::Speed, 1),
                rpm(f.full_throttle_rpm),
                rpm(o.full_throttle_rpm),
                change(o.cruise_rpm, f.cruise_rpm, &|x| format!("{x:+.0}")),
                change(o.cruise_fuel_volume_flow, f.cruise_fuel_volume_flow, &|x| {
                    format!(
                        "{}{}",
                        if x < 0.0 { "−" } else { "+" },
                        d.number(x.abs(), Kind::FuelRate, 2)
                    )
                }),
            ]);
        }
        Some(table)
    }

    /// The whole comparison as text (also the body of the export's section, in a code block).
    pub fn to_text(&self, d: &Display, load: &LoadDoc) -> String {
        let mut out = format!("Screw {}: what-if conditions side by side\n", self.label);
        out.push_str(&self.conditions_table(d).to_text("  "));
        for line in self
            .legend_lines()
            .into_iter()
            .chain(missing_loads_line(load))
        {
            out.push_str(&format!("  {line}\n"));
        }
        if let Some(table) = self.as_found_table(d) {
            out.push_str("  Against the boat as found under each condition:\n");
            out.push_str(&table.to_text("  "));
        }
        out.push_str(&format!("  {}:\n", self.pitch_target_line()));
        for c in self.pitch_conditions(d) {
            out.push_str(&format!("    {c}\n"));
        }
        out.push('\n');
        let lines = self.band_lines(d);
        if let Some(first) = lines.first() {
            out.push_str(&format!("{first}\n"));
        }
        if let Some(table) = self.band_table(d) {
            out.push_str(&table.to_text("  "));
        }
        for line in lines.iter().skip(1) {
            out.push_str(&format!("{line}\n"));
        }
        out
    }

    /// The comparison as Markdown for the export.
    pub fn to_markdown(&self, d: &Display, load: &LoadDoc) -> String {
        let mut out = format!(
            "Screw {}: the same boat and screw under each condition.\n\n",
            self.label
        );
        out.push_str(&self.conditions_table(d).to_markdown());
        for line in self
            .legend_lines()
            .into_iter()
            .chain(missing_loads_line(load))
        {
            out.push_str(&format!("\n{line}\n"));
        }
        out.push_str(&format!("\n{}:\n\n", self.pitch_target_line()));
        for c in self.pitch_conditions(d) {
            out.push_str(&format!("- {c}\n"));
        }
        let lines = self.band_lines(d);
        if let Some(first) = lines.first() {
            out.push_str(&format!("\n{first}.\n\n"));
        }
        if let Some(table) = self.band_table(d) {
            out.push_str(&table.to_markdown());
            out.push('\n');
        }
        for line in lines.iter().skip(1) {
            out.push_str(&format!("- {line}\n"));
        }
        out
    }
}

/// Which of `outcomes` (the boat as given first) a table shows: every one but a load case
/// that only repeats the boat as given (the file's default load: the same displacement,
/// margins and sea-trial factor), so no two rows say the same.
pub fn shown_outcomes(outcomes: &[ConditionOutcome]) -> Vec<usize> {
    let same = |a: &ConditionOutcome, b: &ConditionOutcome| {
        let (a, b) = (&a.condition, &b.condition);
        a.displacement_volume == b.displacement_volume
            && a.service_margin == b.service_margin
            && a.fouling == b.fouling
            && a.resistance_factor == b.resistance_factor
    };
    (0..outcomes.len())
        .filter(|&i| {
            i == 0 || !same(&outcomes[i], &outcomes[0]) || !outcomes[i].warnings.is_empty()
        })
        .collect()
}

/// The boat file's default load in words for the "as given" row ("half" → "half load").
fn default_load_words(default: &str) -> String {
    match default {
        "light" => "light load".into(),
        "half" => "half load".into(),
        "full" => "full load".into(),
        other => other.to_string(),
    }
}

/// Which load cases the boat file lacks, so the table's missing rows are explained, or
/// `None` when it has light and full load.
pub fn missing_loads_line(load: &LoadDoc) -> Option<String> {
    let missing: Vec<&str> = [
        (LoadCondition::Light, "light ([load.light])"),
        (LoadCondition::Full, "full ([load.full])"),
    ]
    .into_iter()
    .filter(|(c, _)| load.case(*c).is_none())
    .map(|(_, words)| words)
    .collect();
    (!missing.is_empty()).then(|| {
        format!(
            "no {} load in the boat file: add {} with its displacement to compare {}",
            missing.join(" or "),
            if missing.len() == 1 { "it" } else { "each" },
            if missing.len() == 1 {
                "that loading"
            } else {
                "the boat lighter and heavier"
            }
        )
    })
}

/// One condition in JSON.
#[derive(Debug, Serialize)]
pub struct OutcomeJson {
    /// The condition's label.
    pub label: String,
    /// Whether the case only repeats the boat as given (the file's default load): the text
    /// and the screen leave its row out.
    pub repeats_as_given: bool,
    /// Displacement, t.
    pub displacement_t: f64,
    /// Displacement volume, m³.
    pub displacement_m3: f64,
    /// Service (sea-state) margin, fraction of resistance.
    pub service_margin: f64,
    /// Fouling, fraction of friction.
    pub fouling: f64,
    /// Calibration factor on resistance.
    pub resistance_factor: f64,
    /// The match verdict.
    pub verdict: Option<Verdict>,
    /// Engine rpm at full throttle.
    pub full_throttle_rpm: Option<f64>,
    /// Free-running rpm margin where the full-load curve meets this case's propeller curve.
    pub rpm_margin: Option<f64>,
    /// Brake power of each engine at full throttle, kW.
    pub full_throttle_kw_per_engine: Option<f64>,
    /// Top speed, kn.
    pub top_speed_kn: Option<f64>,
    /// Whether the top speed lies in the resistance method's range.
    pub top_speed_in_method_range: Option<bool>,
    /// Power absorbed at rated rpm, % of rated power.
    pub absorbed_pct_at_rated: Option<f64>,
    /// Engine rpm at the target speed.
    pub cruise_rpm: Option<f64>,
    /// Brake power of the boat (every running engine) at the target speed, kW.
    pub cruise_kw: Option<f64>,
    /// Fuel of the boat (every running engine) at the target speed, L/h.
    pub cruise_lph: Option<f64>,
    /// Whether the target speed lies past the full-load curve.
    pub cruise_beyond_full_load: Option<bool>,
    /// The pitch recommended for this condition, m.
    pub recommended_pitch_m: Option<f64>,
    /// The condition the pitch was made for, in words.
    pub pitch_condition: Option<String>,
    /// Why something could not be solved.
    pub problem: Option<String>,
    /// Engines running in this condition (1 with one engine out on a twin).
    pub engines_running: u32,
    /// What the case leaves out (e.g. the trailing screw's drag with one engine out).
    pub warnings: Vec<String>,
    /// The boat as found under this condition, or null without `[as_found]`.
    pub as_found: Option<AsFoundOutcomeJson>,
    /// This condition's change from the boat as found (planned − as found), or null.
    pub delta: Option<AsFoundOutcomeJson>,
}

/// The headline of one condition for the before/after comparison.
#[derive(Debug, Serialize)]
pub struct AsFoundOutcomeJson {
    /// Engine rpm at full throttle.
    pub full_throttle_rpm: Option<f64>,
    /// Top speed, kn.
    pub top_speed_kn: Option<f64>,
    /// Engine rpm at the target speed.
    pub cruise_rpm: Option<f64>,
    /// Fuel of the boat at the target speed, L/h.
    pub cruise_lph: Option<f64>,
}

impl AsFoundOutcomeJson {
    fn of(o: &ConditionOutcome) -> Self {
        Self {
            full_throttle_rpm: finite(o.full_throttle_rpm),
            top_speed_kn: finite(o.top_speed).map(|v| v / KNOT_MPS),
            cruise_rpm: finite(o.cruise_rpm),
            cruise_lph: finite(o.cruise_fuel_volume_flow).map(|q| q / LITRE_M3 * 3600.0),
        }
    }

    fn change(planned: &ConditionOutcome, found: &ConditionOutcome) -> Self {
        let (p, f) = (Self::of(planned), Self::of(found));
        let minus = |a: Option<f64>, b: Option<f64>| Some(a? - b?);
        Self {
            full_throttle_rpm: minus(p.full_throttle_rpm, f.full_throttle_rpm),
            top_speed_kn: minus(p.top_speed_kn, f.top_speed_kn),
            cruise_rpm: minus(p.cruise_rpm, f.cruise_rpm),
            cruise_lph: minus(p.cruise_lph, f.cruise_lph),
        }
    }
}

/// One rpm of the band in JSON.
#[derive(Debug, Serialize)]
pub struct BandPointJson {
    engine_rpm: f64,
    speed_kn: Option<f64>,
    power_kw_per_engine: Option<f64>,
    low_kw_per_engine: Option<f64>,
    high_kw_per_engine: Option<f64>,
}

/// The band in JSON.
#[derive(Debug, Serialize)]
pub struct BandJson {
    displacement_spread: f64,
    wake_shift: f64,
    wake_reference_speed_kn: f64,
    points: Vec<BandPointJson>,
    pitch_nominal_m: Option<f64>,
    pitch_low_m: Option<f64>,
    pitch_high_m: Option<f64>,
    pitch_condition: Option<String>,
    unsolved_cases: usize,
    warnings: Vec<String>,
}

/// The JSON document of `conditions`.
#[derive(Debug, Serialize)]
pub struct WhatIfJson {
    boat: String,
    variant: String,
    calibration: Option<AppliedCalibration>,
    /// One per condition, the boat as given first.
    pub conditions: Vec<OutcomeJson>,
    band: Option<BandJson>,
    band_error: Option<String>,
    caution: &'static str,
}

/// The JSON document of `result`, a what-if comparison of `study`.
pub fn what_if_json(study: &Study, result: &WhatIf) -> WhatIfJson {
    let kw = |v: Option<f64>| finite(v).map(|w| w / 1e3);
    let shown = shown_outcomes(&result.outcomes);
    let conditions = result
        .outcomes
        .iter()
        .zip(&result.pitches)
        .enumerate()
        .map(|(i, (o, p))| OutcomeJson {
            as_found: result
                .as_found
                .as_ref()
                .and_then(|f| f.get(i))
                .map(AsFoundOutcomeJson::of),
            delta: result
                .as_found
                .as_ref()
                .and_then(|f| f.get(i))
                .map(|f| AsFoundOutcomeJson::change(o, f)),
            label: o.condition.label.clone(),
            repeats_as_given: !shown.contains(&i),
            displacement_t: o.condition.displacement_volume * result.water_density / 1e3,
            displacement_m3: o.condition.displacement_volume,
            service_margin: o.condition.service_margin,
            fouling: o.condition.fouling,
            resistance_factor: o.condition.resistance_factor,
            verdict: o.verdict,
            full_throttle_rpm: finite(o.full_throttle_rpm),
            rpm_margin: finite(o.rpm_margin),
            full_throttle_kw_per_engine: kw(o.full_throttle_power),
            top_speed_kn: finite(o.top_speed).map(|v| v / KNOT_MPS),
            top_speed_in_method_range: o.top_speed_in_method_range,
            absorbed_pct_at_rated: finite(o.absorbed_fraction_at_rated).map(|f| f * 100.0),
            cruise_rpm: finite(o.cruise_rpm),
            cruise_kw: kw(o.cruise_power),
            cruise_lph: finite(o.cruise_fuel_volume_flow).map(|q| q / LITRE_M3 * 3600.0),
            cruise_beyond_full_load: o.cruise_beyond_full_load,
            recommended_pitch_m: recommended(p),
            pitch_condition: p.as_ref().ok().map(|r| r.condition.describe()),
            problem: o.problem.clone().or_else(|| p.as_ref().err().cloned()),
            engines_running: o.engines_running,
            warnings: o.warnings.iter().map(ToString::to_string).collect(),
        })
        .collect();
    let band = result.band.as_ref().ok().map(|b| BandJson {
        displacement_spread: b.ranges.displacement_fraction,
        wake_shift: b.ranges.wake_shift,
        wake_reference_speed_kn: b.wake_reference_speed / KNOT_MPS,
        points: b
            .points
            .iter()
            .map(|p| BandPointJson {
                engine_rpm: p.engine_rpm,
                speed_kn: finite(p.nominal_speed).map(|v| v / KNOT_MPS),
                power_kw_per_engine: kw(p.nominal_power),
                low_kw_per_engine: kw(p.low_power),
                high_kw_per_engine: kw(p.high_power),
            })
            .collect(),
        pitch_nominal_m: finite(b.pitch_nominal),
        pitch_low_m: finite(b.pitch_low),
        pitch_high_m: finite(b.pitch_high),
        pitch_condition: result
            .pitches
            .first()
            .and_then(|p| p.as_ref().ok())
            .map(|r| r.condition.describe()),
        unsolved_cases: b.unsolved_cases,
        warnings: b.warnings.iter().map(ToString::to_string).collect(),
    });
    WhatIfJson {
        boat: study.vessel.name.clone(),
        variant: result.label.clone(),
        calibration: study.calibration.clone(),
        conditions,
        band,
        band_error: result.band.as_ref().err().cloned(),
        caution: CAUTION,
    }
}

/// The text of `conditions`: the boat, its calibration, the comparison and the caution.
pub fn what_if_text(study: &Study, result: &WhatIf, d: &Display) -> String {
    format!(
        "{}\n{}\n{}\nCaution: {CAUTION}\n",
        study.vessel.name,
        study.calibration_line(),
        result.to_text(d, &study.doc.load)
    )
}

#[cfg(test)]
mod tests {
    use crate::propulsion::hull::UNRELIABLE_WORDS;

    #[test]
    fn every_legend_of_an_unreliable_figure_uses_the_cores_words() {
        for legend in [
            super::UNRELIABLE_TOP_NOTE,
            crate::report::power_speed::SHARE_NOTE,
        ] {
            assert!(legend.contains(UNRELIABLE_WORDS), "{legend}");
        }
    }
}

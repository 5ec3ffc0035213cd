//! `conditions BOAT`: the same boat and screw light, half and fully loaded, fouled and in a
//! seaway, side by side, and the uncertainty band over displacement and wake.

use std::io::Write;

use anyhow::Context as _;
use serde::Serialize;

use super::store::{LoadedBoat, load_boat};
use super::{ConditionsArgs, Context, PlainFormat, UsageError};
use crate::profile::LoadCondition;
use crate::propulsion::solver::Verdict;
use crate::propulsion::solver::conditions::{
    Condition, ConditionOutcome, UncertaintyBand, UncertaintyRanges, compare_conditions,
    recommend_pitch_under, uncertainty_band,
};
use crate::propulsion::solver::pitch::{PitchOptions, PitchRecommendation, recommend_pitch};
use crate::report::boat::verdict_words;
use crate::report::checks::AppliedCalibration;
use crate::report::table::{Column, Table};
use crate::report::{CAUTION, Display, KNOT_MPS, LITRE_M3, json, percent};
use crate::units::Kind;

/// The note of a row whose top speed (marked ≈) lies outside the resistance method's range.
pub const UNRELIABLE_TOP_NOTE: &str = "≈ top speed unreliable: outside the method's range";

/// What-if settings, as fractions.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WhatIfSettings {
    /// Fouling of the "fouled hull" case, fraction of friction.
    pub fouled: f64,
    /// Service margin of the "seaway" case, fraction of resistance.
    pub sea_margin: f64,
    /// Band: displacement spread either side, fraction.
    pub displacement_spread: f64,
    /// Band: wake-fraction shift either side.
    pub wake_shift: f64,
}

impl Default for WhatIfSettings {
    fn default() -> Self {
        Self {
            fouled: 0.30,
            sea_margin: 0.30,
            displacement_spread: 0.10,
            wake_shift: 0.05,
        }
    }
}

impl WhatIfSettings {
    /// The settings of the command line, checked.
    pub fn from_args(args: &ConditionsArgs) -> anyhow::Result<Self> {
        let check = |value: f64, option: &str, low: f64, high: f64, what: &str| {
            if value.is_finite() && value >= low && value <= high {
                Ok(value)
            } else {
                Err(UsageError(format!(
                    "{option}: expected {what} from {low} to {high}, got {value}"
                )))
            }
        };
        Ok(Self {
            fouled: check(args.fouled, "--fouled", 0.0, 300.0, "added friction in %")? / 100.0,
            sea_margin: check(
                args.sea_margin,
                "--sea-margin",
                0.0,
                200.0,
                "a margin on resistance in %",
            )? / 100.0,
            displacement_spread: check(
                args.spread,
                "--spread",
                0.0,
                89.0,
                "a displacement spread in %",
            )? / 100.0,
            wake_shift: check(
                args.wake_shift,
                "--wake-shift",
                0.0,
                0.49,
                "a wake-fraction shift",
            )?,
        })
    }
}

/// Everything `conditions` shows for one screw.
#[derive(Debug, Clone)]
pub struct WhatIf {
    /// The variant's label.
    pub label: String,
    /// One per condition, the boat as given first.
    pub outcomes: Vec<ConditionOutcome>,
    /// The pitch recommendation made for each condition, same order.
    pub pitches: Vec<Result<PitchRecommendation, String>>,
    /// The uncertainty band, or why it failed.
    pub band: Result<UncertaintyBand, String>,
    /// Water density used to show displacement as mass, kg/m³.
    pub water_density: f64,
    /// The calibration applied to every case.
    pub calibration: Option<AppliedCalibration>,
    /// The boat file's default load condition ("half"), which "as given" is.
    pub default_load: String,
}

/// The conditions compared: the boat file's load cases, a fouled hull and a seaway.
fn conditions(loaded: &LoadedBoat, settings: &WhatIfSettings) -> Vec<Condition> {
    let density = loaded.vessel.resistance.water.density;
    let mut list: Vec<Condition> = LoadCondition::ALL
        .iter()
        .filter_map(|&c| {
            let case = loaded.doc.load.case(c)?;
            let label = match c {
                LoadCondition::Light => "light",
                LoadCondition::Half => "half load",
                LoadCondition::Full => "full load",
            };
            Some(Condition::displacement(
                label,
                case.displacement.value / density,
            ))
        })
        .collect();
    list.push(Condition::fouled(
        format!("fouled hull (+{:.0} % friction)", settings.fouled * 100.0),
        settings.fouled,
    ));
    list.push(Condition::sea_state(
        format!(
            "seaway ({:.0} % sea-state margin)",
            settings.sea_margin * 100.0
        ),
        settings.sea_margin,
    ));
    list
}

/// Solves the what-if comparison and the band for variant `index`.
pub fn what_if(
    loaded: &LoadedBoat,
    index: usize,
    settings: &WhatIfSettings,
) -> anyhow::Result<WhatIf> {
    let vessel = &loaded.vessel;
    let list = conditions(loaded, settings);
    let outcomes = compare_conditions(vessel, index, &list)
        .with_context(|| format!("what-if conditions of {}", vessel.name))?;
    let options = PitchOptions::default();
    let mut pitches = vec![recommend_pitch(vessel, index, &options).map_err(|e| e.to_string())];
    pitches.extend(
        list.iter()
            .map(|c| recommend_pitch_under(vessel, index, c, &options).map_err(|e| e.to_string())),
    );
    let ranges = UncertaintyRanges {
        displacement_fraction: settings.displacement_spread,
        wake_shift: settings.wake_shift,
        ..UncertaintyRanges::default()
    };
    let band = uncertainty_band(vessel, index, &ranges, &options).map_err(|e| e.to_string());
    Ok(WhatIf {
        label: vessel.variants[index].label.clone(),
        outcomes,
        pitches,
        band,
        water_density: vessel.resistance.water.density,
        calibration: loaded.applied_calibration(),
        default_load: loaded.doc.load.default.name().to_string(),
    })
}

fn finite(v: Option<f64>) -> Option<f64> {
    v.filter(|x| x.is_finite())
}

fn recommended(p: &Result<PitchRecommendation, String>) -> Option<f64> {
    p.as_ref().ok().and_then(|r| finite(r.recommended_pitch))
}

impl WhatIf {
    /// The side-by-side table of the conditions.
    pub fn conditions_table(&self, d: &Display) -> Table {
        let mut table = Table::new(vec![
            Column::text("condition"),
            Column::number("displacement", &d.unit(Kind::Mass)),
            Column::text("verdict"),
            Column::number("full throttle", "rpm"),
            Column::number("top speed", &d.unit(Kind::Speed)),
            Column::number("cruise", "rpm"),
            Column::number("power", &d.unit(Kind::Power)),
            Column::number("fuel/h", &d.unit(Kind::FuelRate)),
            Column::number("pitch for it", &d.unit(Kind::ScrewLength)),
            Column::text("note"),
        ]);
        let dash = || "—".to_string();
        let mass_decimals = if d.system == crate::units::UnitSystem::Imperial {
            0
        } else {
            2
        };
        for (i, (o, p)) in self.outcomes.iter().zip(&self.pitches).enumerate() {
            let mut note = Vec::new();
            if o.cruise_beyond_full_load == Some(true) {
                note.push("target speed past full load".to_string());
            }
            let unreliable = o.top_speed_in_method_range == Some(false);
            if unreliable {
                note.push(UNRELIABLE_TOP_NOTE.to_string());
            }
            if let Some(problem) = &o.problem {
                note.push(problem.clone());
            }
            if let Err(e) = p {
                note.push(format!("pitch: {e}"));
            }
            let label = if i == 0 {
                format!(
                    "{} (file default: {})",
                    o.condition.label, self.default_load
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

    /// "pitch for it" column: which condition each recommendation was made for.
    pub fn pitch_conditions(&self) -> Vec<String> {
        self.pitches
            .iter()
            .filter_map(|p| p.as_ref().ok())
            .map(|r| r.condition.describe())
            .collect()
    }

    /// The band as a table: power as given and its least and greatest over the cases.
    pub fn band_table(&self, d: &Display) -> Option<Table> {
        let band = self.band.as_ref().ok()?;
        let mut table = Table::new(vec![
            Column::number("engine", "rpm"),
            Column::number("speed", &d.unit(Kind::Speed)),
            Column::number("power", &d.unit(Kind::Power)),
            Column::number("least", &d.unit(Kind::Power)),
            Column::number("greatest", &d.unit(Kind::Power)),
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
                    "Uncertainty band: displacement ±{}, wake fraction ±{:.2} (an estimated wake held at its value at {})",
                    percent(band.ranges.displacement_fraction, 0),
                    band.ranges.wake_shift,
                    d.quantity(band.wake_reference_speed, Kind::Speed)
                )];
                let as_given = self
                    .pitches
                    .first()
                    .and_then(|p| p.as_ref().ok())
                    .map(|r| r.condition.describe())
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

    /// The whole comparison as text (also the body of the export's section, in a code block).
    pub fn to_text(&self, d: &Display) -> String {
        let mut out = format!("Screw {}: what-if conditions side by side\n", self.label);
        out.push_str(&self.conditions_table(d).to_text("  "));
        out.push_str("  Each pitch is made to absorb 100 % of rated power at rated rpm for its own condition:\n");
        for c in self.pitch_conditions() {
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
    pub fn to_markdown(&self, d: &Display) -> String {
        let mut out = format!(
            "Screw {}: the same boat and screw under each condition.\n\n",
            self.label
        );
        out.push_str(&self.conditions_table(d).to_markdown());
        out.push_str("\nEach pitch is made to absorb 100 % of rated power at rated rpm for its own condition:\n\n");
        for c in self.pitch_conditions() {
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

/// One condition in JSON.
#[derive(Debug, Serialize)]
struct OutcomeJson {
    label: String,
    displacement_kg: f64,
    displacement_m3: f64,
    service_margin: f64,
    fouling: f64,
    resistance_factor: f64,
    verdict: Option<Verdict>,
    full_throttle_rpm: Option<f64>,
    top_speed_kn: Option<f64>,
    top_speed_in_method_range: Option<bool>,
    absorbed_pct_at_rated: Option<f64>,
    cruise_rpm: Option<f64>,
    cruise_kw: Option<f64>,
    cruise_lph: Option<f64>,
    cruise_beyond_full_load: Option<bool>,
    recommended_pitch_m: Option<f64>,
    pitch_condition: Option<String>,
    problem: Option<String>,
}

/// One rpm of the band in JSON.
#[derive(Debug, Serialize)]
struct BandPointJson {
    engine_rpm: f64,
    speed_kn: Option<f64>,
    power_kw: Option<f64>,
    low_kw: Option<f64>,
    high_kw: Option<f64>,
}

/// The band in JSON.
#[derive(Debug, Serialize)]
struct BandJson {
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

/// `conditions BOAT`.
pub fn run(ctx: &Context, args: &ConditionsArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let loaded = load_boat(ctx, &args.boat)?;
    let index = match &args.variant {
        Some(label) => super::design::variant_indices(&loaded, Some(label))?[0],
        None => loaded
            .vessel
            .active_variant
            .min(loaded.vessel.variants.len() - 1),
    };
    let settings = WhatIfSettings::from_args(args)?;
    let result = what_if(&loaded, index, &settings)?;
    match args.format {
        PlainFormat::Text => {
            let d = Display::new(loaded.units);
            writeln!(out, "{}", loaded.vessel.name)?;
            writeln!(out, "{}", loaded.calibration_line())?;
            out.write_all(result.to_text(&d).as_bytes())?;
            writeln!(out, "\nCaution: {CAUTION}")?;
        }
        PlainFormat::Json => {
            #[derive(Serialize)]
            struct Doc<'a> {
                boat: &'a str,
                variant: &'a str,
                calibration: Option<AppliedCalibration>,
                conditions: Vec<OutcomeJson>,
                band: Option<BandJson>,
                band_error: Option<String>,
                caution: &'static str,
            }
            let kw = |v: Option<f64>| finite(v).map(|w| w / 1e3);
            let conditions = result
                .outcomes
                .iter()
                .zip(&result.pitches)
                .map(|(o, p)| OutcomeJson {
                    label: o.condition.label.clone(),
                    displacement_kg: o.condition.displacement_volume * result.water_density,
                    displacement_m3: o.condition.displacement_volume,
                    service_margin: o.condition.service_margin,
                    fouling: o.condition.fouling,
                    resistance_factor: o.condition.resistance_factor,
                    verdict: o.verdict,
                    full_throttle_rpm: finite(o.full_throttle_rpm),
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
                        power_kw: kw(p.nominal_power),
                        low_kw: kw(p.low_power),
                        high_kw: kw(p.high_power),
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
            let doc = Doc {
                boat: &loaded.vessel.name,
                variant: &result.label,
                calibration: result.calibration.clone(),
                conditions,
                band,
                band_error: result.band.as_ref().err().cloned(),
                caution: CAUTION,
            };
            out.write_all(json::to_string(&doc)?.as_bytes())?;
        }
    }
    Ok(())
}

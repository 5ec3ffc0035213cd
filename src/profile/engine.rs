//! The engine sheet file (`engines/NAME.toml`): schema, typed document, validation, conversion.

use super::error::{Issue, ProfileError};
use super::fields::{UNIT_SYSTEMS, check_schema, name_of};
use super::quantity::{Quantity, Reader, guess_system, out, out_num, out_text};
use crate::propulsion::engine::{Duty, EngineSheet, FuelModel, RpmCurve};
use crate::units::{Kind, UnitSystem};
use serde::{Deserialize, Serialize};
use toml::Spanned;

/// A curve of (engine rpm, value) rows as read from a file.
pub type CurveDoc = Vec<(Quantity, Quantity)>;

/// How the sheet gives fuel consumption (the core's three forms, with volumes as written).
#[derive(Debug, Clone, PartialEq)]
pub enum FuelDoc {
    /// Specific fuel consumption on a grid of engine rpm × load fraction.
    SfcMap {
        /// Grid rpms, rpm, increasing.
        rpm: Vec<Quantity>,
        /// Load fractions of full-load power at that rpm, increasing, in (0, 1].
        load: Vec<f64>,
        /// One row per rpm, one value per load, kg/J.
        sfc: Vec<Vec<Quantity>>,
    },
    /// Fuel volume flow (m³/s) along the maker's propeller curve, by engine rpm.
    RateAlongPropellerCurve(CurveDoc),
    /// Full-load SFC (kg/J) with a Willans-line part-load model.
    Willans {
        /// SFC at full load, kg/J.
        full_load_sfc: Quantity,
        /// Fuel flow at zero load as a fraction of full-load flow at the same rpm.
        zero_load_fraction: f64,
    },
}

/// The maker's duty rating.
#[derive(Debug, Clone, PartialEq)]
pub struct DutyDoc {
    /// Continuous or intermittent.
    pub rating: Duty,
    /// Full-throttle time limit, s (intermittent ratings).
    pub full_throttle_limit: Option<Quantity>,
}

/// An engine sheet in memory: values in SI (rpm as rpm), editable, writable back to TOML.
#[derive(Debug, Clone, PartialEq)]
pub struct EngineDoc {
    /// Engine name as shown to the user.
    pub name: String,
    /// The unit system the file is written in.
    pub units: UnitSystem,
    /// Rated crankshaft speed, rpm.
    pub rated_rpm: Quantity,
    /// Idle speed, rpm.
    pub idle_rpm: Quantity,
    /// Full-load brake power by rpm: (rpm, W), increasing in rpm.
    pub full_load_power: CurveDoc,
    /// The maker's propeller-law power curve: (rpm, W), if published.
    pub propeller_law: Option<CurveDoc>,
    /// Fuel consumption data.
    pub fuel: FuelDoc,
    /// Fuel density, kg/m³.
    pub fuel_density: Quantity,
    /// Duty rating, if the maker states it.
    pub duty: Option<DutyDoc>,
    /// Maximum continuous power, W, if the maker gives one.
    pub max_continuous_power: Option<Quantity>,
    /// Dry weight of the engine (with its gearbox when the maker quotes it so), kg.
    pub dry_weight: Option<Quantity>,
    /// Free notes (source of the sheet, conditions).
    pub notes: Option<String>,
    /// Reduction gear ratios the maker offers with the engine (engine rpm / shaft rpm, each
    /// above 1 and at most 6); empty when the sheet lists none.
    pub gears: Vec<f64>,
}

/// Heaviest engine dry weight the loader accepts, kg: past any small-craft marine engine.
const MAX_DRY_WEIGHT: f64 = 20_000.0;

type RawCurve = Vec<(Spanned<String>, Spanned<String>)>;

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawEngine {
    schema: Spanned<i64>,
    name: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    units: Option<Spanned<String>>,
    rated_rpm: Spanned<String>,
    idle_rpm: Spanned<String>,
    fuel_density: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    max_continuous_power: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    dry_weight: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    notes: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    gears: Option<Vec<Spanned<f64>>>,
    full_load_power: RawCurve,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    propeller_law: Option<RawCurve>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    duty: Option<RawDuty>,
    fuel: RawFuel,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawDuty {
    rating: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    full_throttle_limit: Option<Spanned<String>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawFuel {
    form: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    full_load_sfc: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    zero_load_fraction: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    rpm: Option<Vec<Spanned<String>>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    load: Option<Vec<Spanned<f64>>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    sfc: Option<Vec<Vec<Spanned<String>>>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    rate: Option<RawCurve>,
}

impl RawFuel {
    fn with_form(form: &str) -> Self {
        Self {
            form: out_text(form),
            full_load_sfc: None,
            zero_load_fraction: None,
            rpm: None,
            load: None,
            sfc: None,
            rate: None,
        }
    }
}

const FUEL_FORMS: [(&str, u8); 3] = [
    ("sfc-map", 0),
    ("rate-along-propeller-curve", 1),
    ("willans", 2),
];
const DUTIES: [(&str, Duty); 2] = [
    ("continuous", Duty::Continuous),
    ("intermittent", Duty::Intermittent),
];

fn read_curve(
    r: &mut Reader<'_>,
    key: &str,
    raw: &RawCurve,
    value_kind: Kind,
) -> Result<CurveDoc, ProfileError> {
    r.spans
        .insert(key.to_owned(), raw.first().map_or(0..0, |(a, _)| a.span()));
    raw.iter()
        .enumerate()
        .map(|(i, (rpm, value))| {
            let row = format!("{key}[{}]", i + 1);
            Ok((
                r.qty(&format!("{row}.rpm"), rpm, Kind::Rotation)?,
                r.qty(&format!("{row}.value"), value, value_kind)?,
            ))
        })
        .collect()
}

fn write_curve(curve: &CurveDoc, value_kind: Kind, system: UnitSystem) -> RawCurve {
    curve
        .iter()
        .map(|(rpm, v)| (out(rpm, Kind::Rotation, system), out(v, value_kind, system)))
        .collect()
}

/// Checks that a curve has two or more rows, strictly increasing rpm and positive values.
pub(crate) fn check_curve(
    issues: &mut Vec<Issue>,
    key: &str,
    curve: &[(Quantity, Quantity)],
    what: &str,
) {
    if curve.len() < 2 {
        issues.push(Issue::new(
            key,
            format!("{} row(s)", curve.len()),
            format!("expected at least two [rpm, {what}] rows"),
        ));
        return;
    }
    for (i, pair) in curve.windows(2).enumerate() {
        if pair[1].0.value <= pair[0].0.value {
            issues.push(Issue::new(
                format!("{key}[{}].rpm", i + 2),
                pair[1].0.shown(),
                format!(
                    "expected rows sorted by rpm: more than {} of the row before",
                    pair[0].0.shown()
                ),
            ));
        }
    }
    for (i, (rpm, value)) in curve.iter().enumerate() {
        if rpm.value <= 0.0 {
            issues.push(Issue::new(
                format!("{key}[{}].rpm", i + 1),
                rpm.shown(),
                "expected a positive rpm",
            ));
        }
        if value.value <= 0.0 {
            issues.push(Issue::new(
                format!("{key}[{}].value", i + 1),
                value.shown(),
                format!("expected a positive {what}"),
            ));
        }
    }
}

impl EngineDoc {
    /// Reads an engine sheet from TOML `source`; `file` names it in error messages.
    pub fn from_toml(source: &str, file: &str) -> Result<Self, ProfileError> {
        // A blank from `tidewright new` is named as such, not as a malformed value.
        super::template::refuse_blanks(file, source)?;
        let raw: RawEngine =
            toml::from_str(source).map_err(|e| ProfileError::from_toml(file, source, &e))?;
        let mut r = Reader::new(file, source);
        check_schema(&r, &raw.schema)?;
        let units = match &raw.units {
            Some(u) => r.choice("units", u, &UNIT_SYSTEMS)?,
            None => guess_system(
                [&raw.rated_rpm, &raw.fuel_density]
                    .into_iter()
                    .chain(raw.full_load_power.iter().map(|(_, p)| p))
                    .map(|s| s.get_ref().as_str()),
            ),
        };
        let fuel = {
            let f = &raw.fuel;
            r.spans.insert("fuel".into(), f.form.span());
            let missing = |r: &Reader<'_>, key: &str| {
                r.error(
                    key,
                    f.form.span(),
                    Issue::new(
                        format!("fuel.{key}"),
                        "",
                        format!(
                            "missing; expected `{key}` for form = {:?}",
                            f.form.get_ref()
                        ),
                    ),
                )
            };
            match r.choice("fuel.form", &f.form, &FUEL_FORMS)? {
                0 => {
                    let rpm_raw = f.rpm.as_ref().ok_or_else(|| missing(&r, "rpm"))?;
                    let load_raw = f.load.as_ref().ok_or_else(|| missing(&r, "load"))?;
                    let sfc_raw = f.sfc.as_ref().ok_or_else(|| missing(&r, "sfc"))?;
                    let rpm = rpm_raw
                        .iter()
                        .enumerate()
                        .map(|(i, s)| r.qty(&format!("fuel.rpm[{}]", i + 1), s, Kind::Rotation))
                        .collect::<Result<_, _>>()?;
                    let load = load_raw
                        .iter()
                        .enumerate()
                        .map(|(i, s)| r.num(&format!("fuel.load[{}]", i + 1), s))
                        .collect();
                    if let Some(first) = sfc_raw.first().and_then(|row| row.first()) {
                        r.spans.insert("fuel.sfc".into(), first.span());
                    }
                    let mut sfc = Vec::with_capacity(sfc_raw.len());
                    for (i, row) in sfc_raw.iter().enumerate() {
                        let key = format!("fuel.sfc[{}]", i + 1);
                        if let Some(first) = row.first() {
                            r.spans.insert(key.clone(), first.span());
                        }
                        sfc.push(
                            row.iter()
                                .enumerate()
                                .map(|(k, s)| {
                                    r.qty(&format!("{key}[{}]", k + 1), s, Kind::SpecificFuel)
                                })
                                .collect::<Result<Vec<_>, _>>()?,
                        );
                    }
                    FuelDoc::SfcMap { rpm, load, sfc }
                }
                1 => {
                    let rate = f.rate.as_ref().ok_or_else(|| missing(&r, "rate"))?;
                    FuelDoc::RateAlongPropellerCurve(read_curve(
                        &mut r,
                        "fuel.rate",
                        rate,
                        Kind::FuelRate,
                    )?)
                }
                _ => {
                    let sfc = f
                        .full_load_sfc
                        .as_ref()
                        .ok_or_else(|| missing(&r, "full_load_sfc"))?;
                    let zero = f
                        .zero_load_fraction
                        .as_ref()
                        .ok_or_else(|| missing(&r, "zero_load_fraction"))?;
                    FuelDoc::Willans {
                        full_load_sfc: r.qty("fuel.full_load_sfc", sfc, Kind::SpecificFuel)?,
                        zero_load_fraction: r.num("fuel.zero_load_fraction", zero),
                    }
                }
            }
        };
        let duty = match &raw.duty {
            Some(d) => Some(DutyDoc {
                rating: r.choice("duty.rating", &d.rating, &DUTIES)?,
                full_throttle_limit: r.opt_qty(
                    "duty.full_throttle_limit",
                    &d.full_throttle_limit,
                    Kind::Time,
                )?,
            }),
            None => None,
        };
        let doc = EngineDoc {
            name: r.text("name", &raw.name),
            units,
            rated_rpm: r.qty("rated_rpm", &raw.rated_rpm, Kind::Rotation)?,
            idle_rpm: r.qty("idle_rpm", &raw.idle_rpm, Kind::Rotation)?,
            full_load_power: read_curve(
                &mut r,
                "full_load_power",
                &raw.full_load_power,
                Kind::Power,
            )?,
            propeller_law: raw
                .propeller_law
                .as_ref()
                .map(|c| read_curve(&mut r, "propeller_law", c, Kind::Power))
                .transpose()?,
            fuel,
            fuel_density: r.qty("fuel_density", &raw.fuel_density, Kind::Density)?,
            duty,
            max_continuous_power: r.opt_qty(
                "max_continuous_power",
                &raw.max_continuous_power,
                Kind::Power,
            )?,
            dry_weight: r.opt_qty("dry_weight", &raw.dry_weight, Kind::Mass)?,
            notes: raw.notes.clone(),
            gears: raw
                .gears
                .iter()
                .flatten()
                .enumerate()
                .map(|(i, g)| r.num(&format!("gears[{}]", i + 1), g))
                .collect(),
        };
        if let Some(first) = raw.gears.as_ref().and_then(|g| g.first()) {
            r.spans.insert("gears".into(), first.span());
        }
        match doc.validate().into_iter().next() {
            Some(issue) => Err(r.locate(issue)),
            None => Ok(doc),
        }
    }

    /// Writes the sheet as TOML in its unit system (unedited values keep their original text).
    pub fn to_toml(&self) -> String {
        let s = self.units;
        let units_name = name_of(&UNIT_SYSTEMS, s);
        let fuel = match &self.fuel {
            FuelDoc::SfcMap { rpm, load, sfc } => RawFuel {
                rpm: Some(rpm.iter().map(|q| out(q, Kind::Rotation, s)).collect()),
                load: Some(load.iter().map(|&l| out_num(l)).collect()),
                sfc: Some(
                    sfc.iter()
                        .map(|row| row.iter().map(|q| out(q, Kind::SpecificFuel, s)).collect())
                        .collect(),
                ),
                ..RawFuel::with_form(FUEL_FORMS[0].0)
            },
            FuelDoc::RateAlongPropellerCurve(curve) => RawFuel {
                rate: Some(write_curve(curve, Kind::FuelRate, s)),
                ..RawFuel::with_form(FUEL_FORMS[1].0)
            },
            FuelDoc::Willans {
                full_load_sfc,
                zero_load_fraction,
            } => RawFuel {
                full_load_sfc: Some(out(full_load_sfc, Kind::SpecificFuel, s)),
                zero_load_fraction: Some(out_num(*zero_load_fraction)),
                ..RawFuel::with_form(FUEL_FORMS[2].0)
            },
        };
        let raw = RawEngine {
            schema: Spanned::new(0..0, super::SCHEMA_VERSION),
            name: out_text(&self.name),
            units: Some(out_text(units_name)),
            rated_rpm: out(&self.rated_rpm, Kind::Rotation, s),
            idle_rpm: out(&self.idle_rpm, Kind::Rotation, s),
            fuel_density: out(&self.fuel_density, Kind::Density, s),
            max_continuous_power: self
                .max_continuous_power
                .as_ref()
                .map(|q| out(q, Kind::Power, s)),
            dry_weight: self.dry_weight.as_ref().map(|q| out(q, Kind::Mass, s)),
            notes: self.notes.clone(),
            gears: (!self.gears.is_empty())
                .then(|| self.gears.iter().map(|&g| out_num(g)).collect()),
            full_load_power: write_curve(&self.full_load_power, Kind::Power, s),
            propeller_law: self
                .propeller_law
                .as_ref()
                .map(|c| write_curve(c, Kind::Power, s)),
            duty: self.duty.as_ref().map(|d| RawDuty {
                rating: out_text(
                    DUTIES
                        .iter()
                        .find(|(_, v)| *v == d.rating)
                        .map_or("continuous", |(n, _)| n),
                ),
                full_throttle_limit: d
                    .full_throttle_limit
                    .as_ref()
                    .map(|q| out(q, Kind::Time, s)),
            }),
            fuel,
        };
        toml::to_string_pretty(&raw).unwrap_or_else(|e| format!("# could not be written: {e}\n"))
    }

    /// Every problem of the sheet, in file order (empty when it is valid).
    pub fn validate(&self) -> Vec<Issue> {
        let mut issues = Vec::new();
        if self.name.trim().is_empty() {
            issues.push(Issue::new("name", "\"\"", "expected the engine's name"));
        }
        let (rated, idle) = (self.rated_rpm.value, self.idle_rpm.value);
        if rated <= 0.0 {
            issues.push(Issue::new(
                "rated_rpm",
                self.rated_rpm.shown(),
                "expected a positive rpm",
            ));
        }
        if idle <= 0.0 || idle >= rated {
            issues.push(Issue::new(
                "idle_rpm",
                self.idle_rpm.shown(),
                "expected a positive rpm below rated_rpm",
            ));
        }
        check_curve(
            &mut issues,
            "full_load_power",
            &self.full_load_power,
            "power",
        );
        if let (Some(first), Some(last)) =
            (self.full_load_power.first(), self.full_load_power.last())
            && (rated < first.0.value || rated > last.0.value)
        {
            issues.push(Issue::new(
                "rated_rpm",
                self.rated_rpm.shown(),
                "expected rated rpm inside the full_load_power curve's rpm range",
            ));
        }
        if let Some(curve) = &self.propeller_law {
            check_curve(&mut issues, "propeller_law", curve, "power");
        }
        match &self.fuel {
            FuelDoc::SfcMap { rpm, load, sfc } => {
                if rpm.len() < 2 || rpm.windows(2).any(|w| w[1].value <= w[0].value) {
                    issues.push(Issue::new(
                        "fuel.rpm",
                        format!("{} value(s)", rpm.len()),
                        "expected two or more rpms in increasing order",
                    ));
                }
                if load.is_empty()
                    || load.windows(2).any(|w| w[1] <= w[0])
                    || load.iter().any(|&l| !(l > 0.0 && l <= 1.0))
                {
                    issues.push(Issue::new(
                        "fuel.load",
                        format!("{load:?}"),
                        "expected load fractions in (0, 1] in increasing order",
                    ));
                }
                if sfc.len() != rpm.len() {
                    issues.push(Issue::new(
                        "fuel.sfc",
                        format!("{} row(s)", sfc.len()),
                        format!("expected one row per rpm ({})", rpm.len()),
                    ));
                }
                for (i, row) in sfc.iter().enumerate() {
                    if row.len() != load.len() {
                        issues.push(Issue::new(
                            format!("fuel.sfc[{}]", i + 1),
                            format!("{} value(s)", row.len()),
                            format!("expected one value per load ({})", load.len()),
                        ));
                    }
                    for (k, q) in row.iter().enumerate() {
                        if q.value <= 0.0 {
                            issues.push(Issue::new(
                                format!("fuel.sfc[{}][{}]", i + 1, k + 1),
                                q.shown(),
                                "expected a positive specific fuel consumption",
                            ));
                        }
                    }
                }
            }
            FuelDoc::RateAlongPropellerCurve(curve) => {
                check_curve(&mut issues, "fuel.rate", curve, "fuel rate")
            }
            FuelDoc::Willans {
                full_load_sfc,
                zero_load_fraction,
            } => {
                if full_load_sfc.value <= 0.0 {
                    issues.push(Issue::new(
                        "fuel.full_load_sfc",
                        full_load_sfc.shown(),
                        "expected a positive specific fuel consumption",
                    ));
                }
                if !(0.0..1.0).contains(zero_load_fraction) {
                    issues.push(Issue::new(
                        "fuel.zero_load_fraction",
                        zero_load_fraction.to_string(),
                        "expected a fraction from 0 up to (not including) 1",
                    ));
                }
            }
        }
        if self.fuel_density.value <= 0.0 {
            issues.push(Issue::new(
                "fuel_density",
                self.fuel_density.shown(),
                "expected a positive density",
            ));
        }
        if let Some(limit) = self
            .duty
            .as_ref()
            .and_then(|d| d.full_throttle_limit.as_ref())
            && limit.value <= 0.0
        {
            issues.push(Issue::new(
                "duty.full_throttle_limit",
                limit.shown(),
                "expected a positive time",
            ));
        }
        if let Some(p) = &self.max_continuous_power
            && p.value <= 0.0
        {
            issues.push(Issue::new(
                "max_continuous_power",
                p.shown(),
                "expected a positive power",
            ));
        }
        if let Some(w) = &self.dry_weight
            && !(w.value > 0.0 && w.value <= MAX_DRY_WEIGHT)
        {
            issues.push(Issue::new(
                "dry_weight",
                w.shown(),
                "expected a positive mass of at most 20 t (the engine with its gearbox)",
            ));
        }
        for (i, &gear) in self.gears.iter().enumerate() {
            // A ratio of 1 or less is no reduction; above 6 no marine gearbox of the
            // displacement trade is offered (`common practice`).
            if !(gear > 1.0 && gear <= 6.0) {
                issues.push(Issue::new(
                    format!("gears[{}]", i + 1),
                    gear.to_string(),
                    "expected a reduction ratio above 1 and at most 6",
                ));
            }
        }
        issues
    }

    /// The core's engine sheet (validated here, then by the core).
    pub fn to_engine_sheet(&self) -> Result<EngineSheet, ProfileError> {
        if let Some(issue) = self.validate().into_iter().next() {
            return Err(ProfileError::Invalid {
                file: self.name.clone(),
                location: None,
                issue,
            });
        }
        let curve = |c: &CurveDoc| RpmCurve {
            points: c.iter().map(|(r, v)| (r.value, v.value)).collect(),
        };
        let density = self.fuel_density.value;
        let fuel = match &self.fuel {
            FuelDoc::SfcMap { rpm, load, sfc } => FuelModel::SfcMap {
                rpm: rpm.iter().map(|q| q.value).collect(),
                load: load.clone(),
                sfc: sfc
                    .iter()
                    .map(|row| row.iter().map(|q| q.value).collect())
                    .collect(),
            },
            // The file gives volume flow; the core wants mass flow.
            FuelDoc::RateAlongPropellerCurve(c) => FuelModel::RateAlongPropellerCurve(RpmCurve {
                points: c
                    .iter()
                    .map(|(r, v)| (r.value, v.value * density))
                    .collect(),
            }),
            FuelDoc::Willans {
                full_load_sfc,
                zero_load_fraction,
            } => FuelModel::Willans {
                full_load_sfc: full_load_sfc.value,
                zero_load_fraction: *zero_load_fraction,
            },
        };
        let sheet = EngineSheet {
            name: self.name.clone(),
            rated_rpm: self.rated_rpm.value,
            idle_rpm: self.idle_rpm.value,
            full_load_power: curve(&self.full_load_power),
            propeller_law: self.propeller_law.as_ref().map(curve),
            fuel,
            fuel_density: density,
            duty: self.duty.as_ref().map(|d| d.rating),
            full_throttle_limit: self
                .duty
                .as_ref()
                .and_then(|d| d.full_throttle_limit.as_ref())
                .map(|q| q.value),
            max_continuous_power: self.max_continuous_power.as_ref().map(|q| q.value),
        };
        sheet.validate().map_err(|e| ProfileError::Invalid {
            file: self.name.clone(),
            location: None,
            issue: Issue::new("engine sheet", "", e.to_string()),
        })?;
        Ok(sheet)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(v: f64) -> Quantity {
        Quantity::new(v)
    }

    #[test]
    fn unsorted_and_short_curves_are_named() {
        let mut issues = Vec::new();
        check_curve(
            &mut issues,
            "full_load_power",
            &[(q(2000.0), q(5.0)), (q(1500.0), q(6.0))],
            "power",
        );
        assert_eq!(issues.len(), 1);
        assert_eq!(issues[0].key, "full_load_power[2].rpm");
        assert!(
            issues[0].problem.contains("sorted by rpm"),
            "{}",
            issues[0].problem
        );
        issues.clear();
        check_curve(
            &mut issues,
            "fuel.rate",
            &[(q(2000.0), q(5.0))],
            "fuel rate",
        );
        assert!(issues[0].problem.contains("at least two"));
    }
}

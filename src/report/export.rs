//! The printable report for the owner and the propeller shop: Markdown with SVG charts.

use super::design::{comparison_text, pitch_text, trial_text};
use super::model::{BoatReport, VariantReport};
use super::svg::{Chart, Series, SeriesStyle};
use super::text::{match_line, operating_table, screw_spec, target_line};
use super::{CAUTION, Display};
use crate::profile::Rotation;
use crate::propulsion::hull::UNRELIABLE_WORDS;
use crate::propulsion::solver::Vessel;
use crate::propulsion::solver::pitch::PitchOptions;
use crate::study::what_if::WhatIfSettings;
use crate::study::{Study, active_variant};
use crate::units::{Kind, UnitSystem};

/// One file of the export: its name inside the output directory and its text.
#[derive(Debug, Clone, PartialEq)]
pub struct ExportFile {
    /// File name, e.g. "power.svg".
    pub name: String,
    /// The file's contents.
    pub contents: String,
}

/// One section of the export: a heading and its body.
///
/// The body is Markdown of the subset both writers lay out (`report::html` turns it into HTML):
/// paragraphs, `### ` subheadings, `- ` lists, pipe tables with their rule row, fenced code
/// blocks, `> ` quotes, `![title](CHART.svg)` lines naming one of the export's charts, and inline
/// `**bold**`, `` `code` `` and the escapes `\|`, `\*`.
#[derive(Debug, Clone, PartialEq)]
pub struct Section {
    /// The heading.
    pub title: String,
    /// Markdown body.
    pub body: String,
}

/// Name of the Markdown file in the export.
pub const REPORT_FILE: &str = "report.md";

/// The look (colour, dash) of the engine envelope in every chart.
const ENGINE_LOOK: usize = 0;
/// The look of the first screw variant; the next ones follow, the same in every chart.
const VARIANT_LOOK: usize = 1;
/// The look of measured or special points (full-throttle points, sea-trial runs).
const MARKER_LOOK: usize = 5;
/// The look of the markers over points outside the resistance method's range.
const UNRELIABLE_LOOK: usize = 4;
/// The look of a curve before the sea-trial fit (beside the fitted one).
const BEFORE_FIT_LOOK: usize = 6;
/// The legend of those markers, in the core's words for an unreliable point.
fn unreliable_name() -> String {
    format!("unreliable: {UNRELIABLE_WORDS}")
}

/// The charts of the export, in display units: power, speed, fuel rate and range.
///
/// `before_fit`, when the boat carries a sea-trial calibration, is the same run solved without
/// it: the speed chart then shows the predicted curves before and after the fit under the
/// measured runs.
pub fn charts(
    vessel: &Vessel,
    curves: &BoatReport,
    before_fit: Option<&BoatReport>,
    system: UnitSystem,
) -> Vec<(String, Chart)> {
    let d = Display::new(system);
    let power_unit = d.unit(Kind::Power);
    let speed_unit = d.unit(Kind::Speed);
    let fuel_unit = d.unit(Kind::FuelRate);
    let distance_unit = d.unit(Kind::Distance);
    let solved = |v: &VariantReport| -> Vec<crate::propulsion::solver::CruisePoint> {
        v.rows
            .iter()
            .filter_map(|r| r.outcome.as_ref().ok().copied())
            .collect()
    };
    let per_variant =
        |f: &dyn Fn(&crate::propulsion::solver::CruisePoint) -> (f64, f64)| -> Vec<Series> {
            curves
                .variants
                .iter()
                .enumerate()
                .map(|(index, v)| Series {
                    name: format!("screw {}", v.label),
                    points: solved(v).iter().map(f).collect(),
                    style: SeriesStyle::Line,
                    look: VARIANT_LOOK + index,
                    labels: Vec::new(),
                })
                .collect()
        };

    let mut power = vec![Series {
        name: format!("{} full load", vessel.engine.name),
        points: vessel
            .engine
            .full_load_power
            .points
            .iter()
            .map(|&(rpm, w)| (rpm, d.scaled(w, Kind::Power)))
            .collect(),
        style: SeriesStyle::Line,
        look: ENGINE_LOOK,
        labels: Vec::new(),
    }];
    power.extend(per_variant(&|c| {
        (
            c.point.engine_rpm,
            d.scaled(c.point.brake_power_per_engine, Kind::Power),
        )
    }));
    let meeting: Vec<(f64, f64)> = curves
        .variants
        .iter()
        .filter_map(|v| v.matched.as_ref().ok())
        .map(|m| {
            (
                m.meeting_rpm,
                d.scaled(m.top_point.brake_power_per_engine, Kind::Power),
            )
        })
        .collect();
    // Points outside the resistance method's range (the core's in_method_range) are ringed.
    let unreliable = |f: &dyn Fn(&crate::propulsion::solver::CruisePoint) -> (f64, f64)| {
        let points: Vec<(f64, f64)> = curves
            .variants
            .iter()
            .flat_map(|v| solved(v).into_iter())
            .filter(|c| !c.point.in_method_range)
            .map(|c| f(&c))
            .collect();
        (!points.is_empty()).then(|| Series {
            name: unreliable_name(),
            points,
            style: SeriesStyle::Markers,
            look: UNRELIABLE_LOOK,
            labels: Vec::new(),
        })
    };
    power.extend(unreliable(&|c| {
        (
            c.point.engine_rpm,
            d.scaled(c.point.brake_power_per_engine, Kind::Power),
        )
    }));
    // The full-throttle points last of all, so that neither a curve nor a ring covers them.
    if !meeting.is_empty() {
        power.push(Series {
            name: "full-throttle point".into(),
            points: meeting,
            style: SeriesStyle::Markers,
            look: MARKER_LOOK,
            labels: Vec::new(),
        });
    }
    let mut speed = per_variant(&|c| (c.point.engine_rpm, d.scaled(c.point.speed, Kind::Speed)));
    speed.extend(unreliable(&|c| {
        (c.point.engine_rpm, d.scaled(c.point.speed, Kind::Speed))
    }));
    if let Some(before) = before_fit {
        speed.extend(before.variants.iter().map(|v| {
            Series {
                name: format!("screw {} before the sea-trial fit", v.label),
                points: solved(v)
                    .iter()
                    .map(|c| (c.point.engine_rpm, d.scaled(c.point.speed, Kind::Speed)))
                    .collect(),
                style: SeriesStyle::Line,
                look: BEFORE_FIT_LOOK,
                labels: Vec::new(),
            }
        }));
    }
    if !vessel.trial.is_empty() {
        speed.push(Series {
            name: "sea trial (speed over ground)".into(),
            points: vessel
                .trial
                .iter()
                .map(|r| (r.engine_rpm, d.scaled(r.speed_over_ground, Kind::Speed)))
                .collect(),
            style: SeriesStyle::Markers,
            look: MARKER_LOOK,
            labels: Vec::new(),
        });
    }
    let fuel = per_variant(&|c| {
        (
            c.point.engine_rpm,
            d.scaled(c.point.fuel_volume_flow, Kind::FuelRate),
        )
    });
    let range = per_variant(&|c| {
        (
            d.scaled(c.point.speed, Kind::Speed),
            d.scaled(c.range, Kind::Distance),
        )
    });

    vec![
        (
            "power.svg".into(),
            Chart {
                // Against the engine's own full-load curve, so each engine's power on a twin.
                title: format!(
                    "{}: brake power{} vs engine speed",
                    curves.boat,
                    if curves.is_twin() {
                        " of each engine"
                    } else {
                        ""
                    }
                ),
                x_label: "engine speed (rpm)".into(),
                y_label: format!("brake power ({power_unit})"),
                series: power,
            },
        ),
        (
            "speed.svg".into(),
            Chart {
                title: format!("{}: boat speed vs engine speed", curves.boat),
                x_label: "engine speed (rpm)".into(),
                y_label: format!("speed ({speed_unit})"),
                series: speed,
            },
        ),
        (
            "fuel.svg".into(),
            Chart {
                title: format!(
                    "{}: fuel rate{} vs engine speed",
                    curves.boat,
                    if curves.is_twin() {
                        " of the boat (both engines)"
                    } else {
                        ""
                    }
                ),
                x_label: "engine speed (rpm)".into(),
                y_label: format!("fuel rate ({fuel_unit})"),
                series: fuel,
            },
        ),
        (
            "range.svg".into(),
            Chart {
                title: format!("{}: range vs boat speed", curves.boat),
                x_label: format!("speed ({speed_unit})"),
                y_label: format!("range ({distance_unit})"),
                series: range,
            },
        ),
    ]
}

/// The export as one document: its title, its sections in order and its charts. The Markdown
/// and the HTML writers both lay out this one list, so a section added here appears in both.
#[derive(Debug, Clone, PartialEq)]
pub struct ExportDocument {
    /// The report's title ("Repower report: BOAT").
    pub title: String,
    /// The caution shown under the title (and again as the last section).
    pub caution: String,
    /// The sections, in reading order; bodies are Markdown (the subset [`Section`] allows).
    pub sections: Vec<Section>,
    /// The chart files a section's `![title](NAME)` line points at, by name.
    pub charts: Vec<ExportFile>,
}

impl ExportDocument {
    /// The Markdown report (report.md); its charts stay separate files.
    pub fn to_markdown(&self) -> String {
        let mut md = format!("# {}\n\n", super::table::md_cell(&self.title));
        md.push_str(&format!("> **Caution.** {}\n\n", self.caution));
        for section in &self.sections {
            md.push_str(&format!(
                "## {}\n\n{}\n\n",
                section.title,
                section.body.trim_end()
            ));
        }
        let mut md = md.trim_end().to_string();
        md.push('\n');
        md
    }

    /// The files of the Markdown export: report.md first, then the charts.
    pub fn into_files(self) -> Vec<ExportFile> {
        let mut files = vec![ExportFile {
            name: REPORT_FILE.into(),
            contents: self.to_markdown(),
        }];
        files.extend(self.charts);
        files
    }
}

/// The Markdown report and its charts.
pub fn export(
    vessel: &Vessel,
    report: &BoatReport,
    curves: &BoatReport,
    before_fit: Option<&BoatReport>,
    sections: &[Section],
    system: UnitSystem,
) -> Vec<ExportFile> {
    document(vessel, report, curves, before_fit, sections, system).into_files()
}

/// The export's document: engine sheet, installation and trip, screws and match, shaft, then
/// `sections` (the design stage's and the shortlist), charts, warnings and the caution.
pub fn document(
    vessel: &Vessel,
    report: &BoatReport,
    curves: &BoatReport,
    before_fit: Option<&BoatReport>,
    sections: &[Section],
    system: UnitSystem,
) -> ExportDocument {
    let d = Display::new(system);
    let charts = charts(vessel, curves, before_fit, system);
    let mut out = Vec::new();
    let mut section = |title: &str, body: String| {
        out.push(Section {
            title: title.into(),
            body,
        })
    };

    let e = &vessel.engine;
    let mut md = format!(
        "{}: rated {} at {:.0} rpm, idle {:.0} rpm.\n\n",
        e.name,
        d.quantity(e.rated_power(), Kind::Power),
        e.rated_rpm,
        e.idle_rpm
    );
    let mut envelope = super::table::Table::new(vec![
        super::table::Column::number("engine", "rpm"),
        super::table::Column::number("full-load power", &d.unit(Kind::Power)),
    ]);
    for &(rpm, w) in &e.full_load_power.points {
        envelope.push(vec![format!("{rpm:.0}"), d.number(w, Kind::Power, 1)]);
    }
    md.push_str(&envelope.to_markdown());
    section("Engine sheet", md);

    let mut md = String::new();
    let inst = &vessel.installation;
    if inst.is_twin_screw() {
        md.push_str(
            "- 2 shafts, handed: each with its own engine of this sheet, gear and screw; power and fuel tables are the boat's with each engine's beside them\n",
        );
    }
    md.push_str(&format!(
        "- Reduction gear {:.2}:1, shaft efficiency {}, gear efficiency {}\n",
        inst.gear_ratio,
        super::percent(inst.shaft_efficiency, 1),
        super::percent(inst.gear_efficiency, 1)
    ));
    md.push_str(&format!(
        "- Target speed {}, tank {} ({} usable, {} reserve)\n",
        d.quantity(vessel.trip.target_speed, Kind::Speed),
        d.quantity(vessel.trip.tank_volume, Kind::Volume),
        super::percent(vessel.trip.usable_fraction, 0),
        super::percent(vessel.trip.reserve_fraction, 0)
    ));
    md.push_str(&format!("- {}\n", report.calibration_line()));
    section("Installation and trip", md);

    let mut md = String::new();
    for v in &report.variants {
        md.push_str(&format!("### Screw {}\n\n", v.label));
        md.push_str(&format!("- Spec: {}\n", screw_spec(&v.geometry, &d)));
        md.push_str(&format!(
            "- {}\n",
            match_line(v, &d, report.engine.rated_rpm)
        ));
        md.push_str(&format!(
            "- {}\n\n",
            target_line(
                v,
                &d,
                report.trip.target_speed,
                &report.engine,
                &report.resistance
            )
        ));
        md.push_str(
            &operating_table(v, &d, false, report.shafts, &report.resistance).to_markdown(),
        );
        md.push_str(&report.variant_checks_markdown(&v.label, &d));
        md.push('\n');
    }
    section("Screws and match", md);
    let shaft = report.shaft_lines(&d);
    if !shaft.is_empty() {
        let md: String = shaft
            .iter()
            .map(|line| format!("- {}\n", line.trim_start()))
            .collect();
        section("Shaft", md);
    }
    if let Some(body) = report.before_after_markdown(&d) {
        out.push(Section {
            title: "Before and after".into(),
            body,
        });
    }
    out.extend(sections.iter().cloned());

    let md: String = charts
        .iter()
        .map(|(name, chart)| format!("![{}]({name})\n\n", super::table::md_cell(&chart.title)))
        .collect();
    out.push(Section {
        title: "Charts".into(),
        body: md,
    });
    if !report.warnings.is_empty() {
        let md: String = report.warnings.iter().map(|w| format!("- {w}\n")).collect();
        out.push(Section {
            title: "Warnings".into(),
            body: md,
        });
    }
    out.push(Section {
        title: "Caution".into(),
        body: CAUTION.to_string(),
    });

    ExportDocument {
        title: format!("Repower report: {}", report.boat),
        caution: CAUTION.to_string(),
        sections: out,
        charts: charts
            .into_iter()
            .map(|(name, chart)| ExportFile {
                name,
                contents: chart.to_svg(),
            })
            .collect(),
    }
}
/// The sections of the export that come from the design stage: the recommended screw, the
/// pitch of every variant and the sea-trial calibration.
pub fn design_sections(study: &Study, d: &Display) -> Vec<Section> {
    let vessel = &study.vessel;
    let mut sections = Vec::new();
    let active = active_variant(vessel);
    let indices: Vec<usize> = (0..vessel.variants.len()).collect();
    match study.recommendations(&indices, &PitchOptions::default()) {
        Ok(recs) => {
            let mut body = String::new();
            if let Some(rec) = recs.get(active) {
                let g = vessel.variants[active].screw.geometry();
                let hand = match study.doc.variants.get(active).and_then(|v| v.rotation) {
                    Some(Rotation::Right) => ", right hand",
                    Some(Rotation::Left) => ", left hand",
                    None => ", hand of rotation not given",
                };
                match rec.recommended_pitch.filter(|p| p.is_finite()) {
                    Some(p) => body.push_str(&format!(
                        "**Recommended screw** (from variant {}): {} blades × {} diameter × {} pitch, AE/A0 {:.2}{hand}.\n\n",
                        rec.label,
                        g.blades,
                        d.quantity(g.diameter, Kind::ScrewLength),
                        d.quantity(p, Kind::ScrewLength),
                        g.area_ratio
                    )),
                    None => body.push_str(&format!("No pitch could be recommended for the active variant {}.\n\n", rec.label)),
                }
            }
            for rec in &recs {
                body.push_str("```text\n");
                body.push_str(&pitch_text(rec, d, study));
                body.push_str("```\n\n");
            }
            sections.push(Section {
                title: "Pitch recommendation".into(),
                body,
            });
        }
        Err(e) => sections.push(Section {
            title: "Pitch recommendation".into(),
            body: format!("Not available: {e:#}"),
        }),
    }
    sections.push(Section {
        title: super::order::ORDER_TITLE.into(),
        body: match study.order(active) {
            Ok(sheet) => super::order::order_markdown(&sheet, d),
            Err(e) => format!("Not available: {e:#}"),
        },
    });
    let what_if = study.what_if(active, &WhatIfSettings::default());
    sections.push(Section {
        title: "What-if conditions".into(),
        body: match what_if {
            Ok(w) => w.to_markdown(d, &study.doc.load),
            Err(e) => format!("Not available: {e:#}"),
        },
    });
    if !vessel.trial.is_empty() {
        let body = match study.calibration(active, false) {
            Ok(cal) => format!(
                "{}.\n\n{}.\n\n```text\n{}```\n",
                study.calibration_line(),
                comparison_text(study, study.rms_with_saved(active, &cal), d),
                trial_text(&cal, d)
            ),
            Err(e) => format!("Not available: {e:#}"),
        };
        sections.push(Section {
            title: "Sea-trial calibration".into(),
            body,
        });
    }
    sections
}

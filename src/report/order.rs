//! The order for the screw shop laid out: text, Markdown (also the export's section) and JSON
//! of the sheet `study::order` builds. The checks reuse the report's own tables and lines.

use serde::Serialize;

use super::Display;
use super::checks::{CavitationJson, CavitationRow, DesignChecks, ShaftJson, VariantChecks};
use super::table::{Column, Table, md_cell};
use super::text::{margin_words, signed_rpm, verdict_words};
use crate::profile::Rotation;
use crate::propulsion::solver::Verdict;
use crate::study::order::{Hands, OrderSheet, PitchMatch, opposite};
use crate::units::Kind;

/// The title of the sheet and of the export's section.
pub const ORDER_TITLE: &str = "Order for the screw shop";

/// What a missing value of the boat file is shown as.
const NOT_GIVEN: &str = "not given";

/// The hand in words: "right hand".
fn hand_words(hand: Rotation) -> &'static str {
    match hand {
        Rotation::Right => "right hand",
        Rotation::Left => "left hand",
    }
}

/// The hand as the boat file spells it: "right" or "left".
fn hand_name(hand: Rotation) -> &'static str {
    match hand {
        Rotation::Right => "right",
        Rotation::Left => "left",
    }
}

/// The rotation line: the hand of each screw to order, or what to tell the shop.
fn rotation_words(hands: Hands) -> String {
    match hands {
        Hands::Single(Some(h)) => format!("{} (seen from astern, going ahead)", hand_words(h)),
        Hands::Single(None) => "not given — state it to the shop".into(),
        Hands::Twin(Some(h)) => format!(
            "starboard screw {}, port screw {} (a handed pair, seen from astern, going ahead)",
            hand_words(h),
            hand_words(opposite(h))
        ),
        Hands::Twin(None) => {
            "not given — state both hands to the shop (a twin takes a handed pair, one of each)"
                .into()
        }
    }
}

/// A pitch to a finer step than the shop cuts (0.01 in or 0.1 mm), to show what was rounded.
fn fine(pitch: f64, d: &Display) -> String {
    let decimals = match d.system {
        crate::units::UnitSystem::Imperial => 2,
        crate::units::UnitSystem::Metric => 1,
    };
    format!(
        "{} {}",
        d.number(pitch, Kind::ScrewLength, decimals),
        d.unit(Kind::ScrewLength)
    )
}

/// "2650 rpm at full throttle, margin +52 rpm (runs free …), matched".
fn match_words(m: &Result<PitchMatch, String>, rated_rpm: f64) -> String {
    match m {
        Ok(m) => format!(
            "{:.0} rpm at full throttle, margin {} ({}), {}",
            m.full_throttle_rpm,
            signed_rpm(m.rpm_margin),
            margin_words(m.rpm_margin, m.margin_is_lower_bound, rated_rpm),
            verdict_words(m.verdict)
        ),
        Err(e) => format!("not solved: {e}"),
    }
}

/// The sheet's checks in the report's form, for its tables and lines.
fn checks(sheet: &OrderSheet) -> DesignChecks {
    DesignChecks {
        cavitation: sheet.cavitation.as_ref().map_err(Clone::clone).map(|rows| {
            vec![VariantChecks {
                label: sheet.variant.clone(),
                geometry: sheet.geometry,
                rows: rows
                    .iter()
                    .map(|r| CavitationRow {
                        at: r.at,
                        speed: r.speed,
                        engine_rpm: r.engine_rpm,
                        outcome: r.outcome.clone(),
                    })
                    .collect(),
            }]
        }),
        shaft: sheet.shaft.clone(),
        shaft_note: sheet.shaft_note.clone(),
        shafts: sheet.shafts,
    }
}

/// The items of the sheet, (what, value), in the order the shop reads them.
fn items(sheet: &OrderSheet, d: &Display) -> Vec<(String, String)> {
    let length = |v: f64| d.quantity(v, Kind::ScrewLength);
    let given = |v: Option<String>| v.unwrap_or_else(|| NOT_GIVEN.into());
    let r = &sheet.rounding;
    let step = format!(
        "{}{}",
        length(r.step),
        if sheet.step_given {
            " ([screw_shop] pitch_step)"
        } else {
            " (the default step of the boat file's units, common practice; [screw_shop] pitch_step sets it)"
        }
    );
    let direction = match r.other {
        None => "on the shop's step",
        Some(_) if r.rounded > r.exact => "rounded up",
        Some(_) => "rounded down",
    };
    let change = sheet.change();
    let work = if change.abs() < 1e-6 {
        format!(
            "the screw has this pitch now ({})",
            length(sheet.current_pitch)
        )
    } else {
        let sign = if change > 0.0 { "+" } else { "−" };
        // Written as `pitch` writes it, so the two never disagree on the limit.
        let limit = super::design::repitch_limit_words(sheet.repitch_limit, d);
        format!(
            "now {}: a change of {sign}{}, {}",
            length(sheet.current_pitch),
            fine(change.abs(), d),
            if sheet.within_repitch_limit() {
                format!("within the re-pitch limit of ±{limit}")
            } else {
                format!("BEYOND the re-pitch limit of ±{limit}: a new screw")
            }
        )
    };
    let count = if sheet.shafts >= 2 {
        " (one per shaft)"
    } else {
        ""
    };
    vec![
        ("Boat".into(), sheet.boat.clone()),
        ("Screw variant".into(), sheet.variant.clone()),
        ("Screws".into(), format!("{}{count}", sheet.shafts.max(1))),
        ("Blades".into(), sheet.blades.to_string()),
        ("Diameter".into(), length(sheet.diameter)),
        (
            "Pitch".into(),
            format!(
                "{} — recommended {}, {direction}; {work}",
                length(r.rounded),
                fine(r.exact, d),
            ),
        ),
        ("Pitch step".into(), step),
        (
            "Area ratio AE/A0".into(),
            format!("{:.2}", sheet.area_ratio),
        ),
        ("Rotation".into(), rotation_words(sheet.hands)),
        (
            "Shaft diameter".into(),
            given(sheet.shaft_diameter.map(length)),
        ),
        ("Taper".into(), given(sheet.taper.clone())),
        (
            "Bore (large end of the taper)".into(),
            given(sheet.bore.map(length)),
        ),
        ("Keyway".into(), given(sheet.keyway.clone())),
    ]
}

/// What the rounding does, one line each: the match at the exact, the rounded and the other
/// pitch, and whether the choice matters.
fn rounding_lines(sheet: &OrderSheet, d: &Display) -> Vec<String> {
    let length = |v: f64| d.quantity(v, Kind::ScrewLength);
    let r = &sheet.rounding;
    let rated = sheet.rated_rpm;
    let mut lines = vec![
        format!(
            "at the exact {}: {}",
            fine(r.exact, d),
            match_words(&sheet.exact, rated)
        ),
        format!(
            "at the rounded {} (to cut): {}",
            length(r.rounded),
            match_words(&sheet.rounded, rated)
        ),
    ];
    if let (Ok(exact), Ok(rounded)) = (&sheet.exact, &sheet.rounded) {
        lines.push(format!(
            "the rounding changes the margin by {} and the full-throttle rpm by {} (more pitch gives fewer rpm)",
            signed_rpm(rounded.rpm_margin - exact.rpm_margin),
            signed_rpm(rounded.full_throttle_rpm - exact.full_throttle_rpm)
        ));
    }
    if let (Some(p), Some(m)) = (r.other, &sheet.other) {
        lines.push(format!(
            "the other neighbour, {}: {}",
            length(p),
            match_words(m, rated)
        ));
    }
    if sheet.rounding_matters() {
        let verdict = |m: &Result<PitchMatch, String>| m.as_ref().ok().map(|m| m.verdict);
        let words = |v: Option<Verdict>| v.map_or("not solved", verdict_words);
        let rounded = verdict(&sheet.rounded);
        let other = sheet.other.as_ref().and_then(verdict);
        let line = match (r.other, rounded, other) {
            (Some(p), Some(Verdict::Matched), Some(o)) => format!(
                "ROUNDING MATTERS: cut {}, which is matched; {} would be {}",
                length(r.rounded),
                length(p),
                verdict_words(o)
            ),
            (Some(p), _, Some(Verdict::Matched)) => format!(
                "ROUNDING MATTERS: {} is {} but {} is matched: consider ordering {} instead",
                length(r.rounded),
                words(rounded),
                length(p),
                length(p)
            ),
            _ => format!(
                "ROUNDING MATTERS: {} is {} (the exact {} is {}); no step of {} gives a matched screw, so ask the shop",
                length(r.rounded),
                words(rounded),
                fine(r.exact, d),
                words(verdict(&sheet.exact)),
                length(r.step)
            ),
        };
        lines.push(line);
    }
    lines
}

/// The sheet as text.
pub fn order_text(sheet: &OrderSheet, d: &Display) -> String {
    let items = items(sheet, d);
    let width = items
        .iter()
        .map(|(k, _)| k.chars().count())
        .max()
        .unwrap_or(0);
    let mut out = format!("{}: {}\n\n", sheet.boat, ORDER_TITLE);
    for (what, value) in &items {
        out.push_str(&format!("  {what:<width$}  {value}\n"));
    }
    out.push_str("\nEffect of the rounding on rpm:\n");
    for line in rounding_lines(sheet, d) {
        out.push_str(&format!("  {line}\n"));
    }
    let checks = checks(sheet);
    out.push_str(&format!(
        "\nCavitation and blade loading at {}:\n",
        d.quantity(sheet.rounding.rounded, Kind::ScrewLength)
    ));
    match checks.cavitation_table(&sheet.variant, d) {
        Some(table) => {
            out.push_str(&table.to_text("  "));
            out.push_str(&format!(
                "  {}\n",
                checks.cavitation_legend(&sheet.geometry)
            ));
        }
        None => out.push_str(&format!(
            "  {}\n",
            sheet.cavitation.as_ref().err().map_or("not checked", |e| e)
        )),
    }
    out.push('\n');
    for line in checks.shaft_lines(d) {
        out.push_str(&format!("{line}\n"));
    }
    if !sheet.notes.is_empty() {
        out.push_str("\nNotes:\n");
        for note in &sheet.notes {
            out.push_str(&format!("  {note}\n"));
        }
    }
    out.push('\n');
    for caution in &sheet.cautions {
        out.push_str(&format!("Caution: {caution}\n"));
    }
    out
}

/// The sheet as the body of a Markdown section (no heading): a table of the items, the
/// rounding, the checks and the cautions.
pub fn order_markdown(sheet: &OrderSheet, d: &Display) -> String {
    let mut table = Table::new(vec![Column::text("item"), Column::text("for the shop")]);
    for (what, value) in items(sheet, d) {
        table.push(vec![what, value]);
    }
    let mut md = table.to_markdown();
    md.push_str("\n### Effect of the rounding on rpm\n\n");
    for line in rounding_lines(sheet, d) {
        md.push_str(&format!("- {}\n", md_cell(&line)));
    }
    let checks = checks(sheet);
    md.push_str(&format!(
        "\n### Checks at {}\n\n",
        d.quantity(sheet.rounding.rounded, Kind::ScrewLength)
    ));
    match checks.cavitation_table(&sheet.variant, d) {
        Some(table) => {
            md.push_str(&table.to_markdown());
            md.push_str(&format!(
                "\n{}\n\n",
                md_cell(&checks.cavitation_legend(&sheet.geometry))
            ));
        }
        None => md.push_str(&format!(
            "Cavitation: {}\n\n",
            md_cell(sheet.cavitation.as_ref().err().map_or("not checked", |e| e))
        )),
    }
    for line in checks.shaft_lines(d) {
        md.push_str(&format!("- {}\n", md_cell(line.trim_start())));
    }
    if !sheet.notes.is_empty() {
        md.push('\n');
        for note in &sheet.notes {
            md.push_str(&format!("- Note: {}\n", md_cell(note)));
        }
    }
    md.push('\n');
    for caution in &sheet.cautions {
        md.push_str(&format!("> **Caution.** {}\n\n", md_cell(caution)));
    }
    let mut md = md.trim_end().to_string();
    md.push('\n');
    md
}

/// The sheet as a Markdown document of its own (`order --format md`).
pub fn order_document(sheet: &OrderSheet, d: &Display) -> String {
    format!(
        "# {}: {}\n\n{}",
        md_cell(&sheet.boat),
        ORDER_TITLE,
        order_markdown(sheet, d)
    )
}

/// The cavitation checks of the sheet in JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct OrderCavitationJson {
    /// The pitch the screw is checked at (the rounded one), m.
    pub pitch_m: f64,
    /// At the target speed and at top speed (empty when skipped).
    pub points: Vec<CavitationJson>,
    /// Why the checks were skipped, if they were.
    pub skipped: Option<String>,
}

/// The shaft check of the sheet in JSON: the check's figures, or why it was not made.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct OrderShaftJson {
    /// Why the shaft was not checked, if it was not.
    pub error: Option<String>,
    /// The check's figures, when it was made.
    #[serde(flatten)]
    pub check: Option<ShaftJson>,
}

/// The sheet in JSON: lengths in m, speeds in rpm, the rest as named.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct OrderJson {
    /// The boat's name.
    pub boat: String,
    /// The variant's label.
    pub variant: String,
    /// Screws to cut (2 on a twin: a handed pair).
    pub screws: u32,
    /// Blade count.
    pub blades: u32,
    /// Diameter, m.
    pub diameter_m: f64,
    /// The screw's pitch now, m.
    pub current_pitch_m: f64,
    /// The recommended pitch, m.
    pub pitch_exact_m: f64,
    /// The pitch to cut: the recommended one rounded to the step, m.
    pub pitch_m: f64,
    /// The shop's pitch step, m.
    pub pitch_step_m: f64,
    /// Whether the step is the boat file's (else the unit system's default).
    pub pitch_step_given: bool,
    /// The multiple of the step on the other side of the exact pitch, m (null when the exact
    /// pitch is on the step).
    pub pitch_other_m: Option<f64>,
    /// Full-throttle engine rpm at the exact pitch, rpm.
    pub full_throttle_rpm_exact: Option<f64>,
    /// Full-throttle engine rpm at the rounded pitch, rpm.
    pub full_throttle_rpm: Option<f64>,
    /// Full-throttle engine rpm at the other neighbour, rpm.
    pub full_throttle_rpm_other: Option<f64>,
    /// The margin at full throttle at the exact pitch, rpm.
    pub rpm_margin_exact: Option<f64>,
    /// The margin at full throttle at the rounded pitch, rpm.
    pub rpm_margin: Option<f64>,
    /// The margin at full throttle at the other neighbour, rpm.
    pub rpm_margin_other: Option<f64>,
    /// The verdict at the rounded pitch.
    pub verdict: Option<Verdict>,
    /// Whether the choice of neighbour changes the verdict.
    pub rounding_matters: bool,
    /// AE/A0.
    pub area_ratio: f64,
    /// The screw's hand, "right" or "left" (the starboard screw's on a twin); null when the boat
    /// file does not give it.
    pub rotation: Option<&'static str>,
    /// The port screw's hand on a twin (the other hand); null on a single screw or when not given.
    pub port_rotation: Option<&'static str>,
    /// Shaft diameter, m.
    pub shaft_diameter_m: Option<f64>,
    /// Shaft taper as written.
    pub taper: Option<String>,
    /// Hub bore at the large end of the taper, m.
    pub bore_m: Option<f64>,
    /// Keyway as written.
    pub keyway: Option<String>,
    /// Cavitation and blade loading at the rounded pitch.
    pub cavitation: OrderCavitationJson,
    /// The shaft against the engine's torque.
    pub shaft: OrderShaftJson,
    /// Warnings of the pitch recommendation.
    pub notes: Vec<String>,
    /// The cautions.
    pub cautions: Vec<String>,
}

/// The sheet in JSON.
pub fn order_json(sheet: &OrderSheet) -> OrderJson {
    let ok = |m: &Result<PitchMatch, String>| m.as_ref().ok().copied();
    let exact = ok(&sheet.exact);
    let rounded = ok(&sheet.rounded);
    let other = sheet.other.as_ref().and_then(ok);
    let (rotation, port_rotation) = match sheet.hands {
        Hands::Single(h) => (h.map(hand_name), None),
        Hands::Twin(h) => (h.map(hand_name), h.map(|h| hand_name(opposite(h)))),
    };
    let checks = checks(sheet);
    OrderJson {
        boat: sheet.boat.clone(),
        variant: sheet.variant.clone(),
        screws: sheet.shafts.max(1),
        blades: sheet.blades,
        diameter_m: sheet.diameter,
        current_pitch_m: sheet.current_pitch,
        pitch_exact_m: sheet.rounding.exact,
        pitch_m: sheet.rounding.rounded,
        pitch_step_m: sheet.rounding.step,
        pitch_step_given: sheet.step_given,
        pitch_other_m: sheet.rounding.other,
        full_throttle_rpm_exact: exact.map(|m| m.full_throttle_rpm),
        full_throttle_rpm: rounded.map(|m| m.full_throttle_rpm),
        full_throttle_rpm_other: other.map(|m| m.full_throttle_rpm),
        rpm_margin_exact: exact.map(|m| m.rpm_margin),
        rpm_margin: rounded.map(|m| m.rpm_margin),
        rpm_margin_other: other.map(|m| m.rpm_margin),
        verdict: rounded.map(|m| m.verdict),
        rounding_matters: sheet.rounding_matters(),
        area_ratio: sheet.area_ratio,
        rotation,
        port_rotation,
        shaft_diameter_m: sheet.shaft_diameter,
        taper: sheet.taper.clone(),
        bore_m: sheet.bore,
        keyway: sheet.keyway.clone(),
        cavitation: OrderCavitationJson {
            pitch_m: sheet.rounding.rounded,
            points: checks.cavitation_json(&sheet.variant),
            skipped: sheet.cavitation.as_ref().err().cloned(),
        },
        shaft: OrderShaftJson {
            error: sheet.shaft.as_ref().err().cloned(),
            check: checks.shaft_json(),
        },
        notes: sheet.notes.clone(),
        cautions: sheet.cautions.clone(),
    }
}

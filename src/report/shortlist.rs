//! What `shortlist` prints: the candidates' table as text, CSV, Markdown and JSON, and the
//! fuel-against-top-speed chart of the Markdown export. Lays out `study::shortlist` only.

use serde::Serialize;

use super::baseline::{BaselineJson, HeadlineJson, baseline_json, headline_json};
use super::power_speed::{
    PowerForSpeedJson, SHARE_NOTE, power_chart, power_json, power_summary, power_table,
    power_text_chart,
};
use super::svg::{Chart, Series, SeriesStyle};
use super::table::{Column, Table};
use super::{CAUTION, Display, KNOT_MPS, LITRE_M3, NAUTICAL_MILE_M};
use crate::propulsion::hull::UNRELIABLE_WORDS;
use crate::study::shortlist::{Candidate, Shortlist, ShortlistRank};
use crate::units::Kind;

/// The JSON document of `shortlist --format json` (values at the boat's target speed).
#[derive(Debug, Clone, Serialize)]
pub struct ShortlistJson {
    /// The boat's name.
    pub boat: String,
    /// The ranking ("fuel", "range", "top", "margin").
    pub rank: &'static str,
    /// The tie band: the fraction of the leader's value (of rated rpm for the margin) within
    /// which a candidate ties with its group's leader, or null without a band.
    pub tie_band: Option<f64>,
    /// The candidates, best first.
    pub candidates: Vec<CandidateJson>,
    /// What more power buys: installed power at top speed beside the hull's effective power.
    pub power_for_speed: Option<PowerForSpeedJson>,
    /// The boat as found with its figures (`[as_found]`), or null.
    pub baseline: Option<BaselineJson>,
}

/// One candidate in JSON.
#[derive(Debug, Clone, Serialize)]
pub struct CandidateJson {
    /// The engine sheet's store name.
    pub engine: String,
    /// Reduction ratio.
    pub gear_ratio: f64,
    /// Blade count.
    pub blades: u32,
    /// Diameter, m.
    pub diameter_m: f64,
    /// Recommended pitch, m.
    pub pitch_m: Option<f64>,
    /// AE/A0.
    pub area_ratio: f64,
    /// Top speed, kn.
    pub top_speed_kn: Option<f64>,
    /// Whether the top speed is inside the resistance method's range.
    pub top_speed_in_method_range: Option<bool>,
    /// Engine rpm at the target speed.
    pub cruise_rpm: Option<f64>,
    /// Load at the target speed, % of full-load power at that rpm.
    pub cruise_load_pct: Option<f64>,
    /// Fuel at the target speed, L/h.
    pub fuel_lph: Option<f64>,
    /// Fuel per distance at the target speed, L/nm.
    pub fuel_l_per_nm: Option<f64>,
    /// Range with the reserve at the target speed, nm.
    pub range_nm: Option<f64>,
    /// Why the candidate falls short.
    pub problems: Vec<String>,
    /// 1-based position of the leader of its group, which it is not told apart from, if any.
    pub tie_with: Option<usize>,
    /// The change from the boat as found (candidate − as found), or null without a baseline.
    pub delta: Option<HeadlineJson>,
}

use super::finite_or_none as finite;

/// The JSON document of `shortlist`.
pub fn shortlist_json(list: &Shortlist) -> ShortlistJson {
    ShortlistJson {
        boat: list.boat.clone(),
        rank: list.rank.name(),
        tie_band: list.tie_rule.map(|r| r.band),
        candidates: list
            .candidates
            .iter()
            .map(|c| CandidateJson {
                engine: c.engine.clone(),
                gear_ratio: c.gear_ratio,
                blades: c.blades,
                diameter_m: c.diameter,
                pitch_m: finite(c.pitch),
                area_ratio: c.area_ratio,
                top_speed_kn: finite(c.top_speed.map(|v| v / KNOT_MPS)),
                top_speed_in_method_range: c.top_speed_in_method_range,
                cruise_rpm: finite(c.cruise_rpm),
                cruise_load_pct: finite(c.cruise_load.map(|l| l * 100.0)),
                fuel_lph: finite(c.fuel_rate.map(|q| q / LITRE_M3 * 3600.0)),
                fuel_l_per_nm: finite(c.fuel_per_distance.map(|f| f / LITRE_M3 * NAUTICAL_MILE_M)),
                range_nm: finite(c.range.map(|r| r / NAUTICAL_MILE_M)),
                problems: c.problems.clone(),
                tie_with: c.tie_with,
                delta: list
                    .baseline
                    .as_ref()
                    .map(|b| headline_json(&c.headline().change_from(&b.figures))),
            })
            .collect(),
        power_for_speed: list
            .power_for_speed
            .as_ref()
            .map(|data| power_json(list, data)),
        baseline: list.baseline.as_ref().map(baseline_json),
    }
}

/// The candidates against the boat as found: one line of changes per candidate.
pub fn baseline_block(list: &Shortlist, d: &Display) -> Option<Vec<String>> {
    let b = list.baseline.as_ref()?;
    let mut lines = vec![format!(
        "As found: {}.",
        super::baseline::installation_words(b)
    )];
    if b.weight_change.is_some() {
        lines.push(
            "Each candidate is solved at the boat's displacement changed by its engine's dry weight against the as-found engine's (installation.weight_change overrides it)."
                .into(),
        );
    }
    lines.push(format!(
        "its figures: {}; each candidate's change from them:",
        super::baseline::figures_line(&b.figures, d, false)
    ));
    for (i, c) in list.candidates.iter().enumerate() {
        lines.push(format!(
            "#{} {} {:.2}:1: {}",
            i + 1,
            c.engine,
            c.gear_ratio,
            super::baseline::change_line(&b.figures, &c.headline(), d)
        ));
    }
    Some(lines)
}

fn cell(v: Option<f64>, kind: Kind, decimals: usize, d: &Display) -> String {
    match v {
        Some(x) if x.is_finite() => d.number(x, kind, decimals),
        _ => "—".into(),
    }
}

/// The candidates' table in the display units.
pub fn shortlist_table(list: &Shortlist, d: &Display) -> Table {
    let trip = !list.trip_profile.is_empty();
    let mut columns = vec![
        Column::number("#", ""),
        Column::text("engine"),
        Column::number("gear", ""),
        Column::text("screw"),
        Column::number("top", &d.unit(Kind::Speed)),
        Column::number("margin", "rpm"),
        Column::number("cruise", "rpm"),
        Column::number("load", "%"),
        Column::number("fuel", &d.unit(Kind::FuelRate)),
        Column::number("fuel", &d.unit(Kind::FuelPerDistance)),
    ];
    if trip {
        columns.push(Column::number("trip fuel", &d.unit(Kind::FuelPerDistance)));
    }
    columns.push(Column::number("range", &d.unit(Kind::Distance)));
    columns.push(Column::text("checks"));
    columns.push(Column::text("tie"));
    let mut table = Table::new(columns);
    for (i, c) in list.candidates.iter().enumerate() {
        let screw = match c.pitch {
            Some(p) => format!(
                "{}×{} {}-blade {:.2}",
                d.number(c.diameter, Kind::ScrewLength, screw_decimals(d)),
                d.number(p, Kind::ScrewLength, screw_decimals(d)),
                c.blades,
                c.area_ratio
            ),
            None => "no pitch".into(),
        };
        let top = match (c.top_speed, c.top_speed_in_method_range) {
            (Some(v), Some(false)) => format!("{}*", d.number(v, Kind::Speed, 1)),
            (v, _) => cell(v, Kind::Speed, 1, d),
        };
        let mut row = vec![
            (i + 1).to_string(),
            c.engine.clone(),
            format!("{:.2}", c.gear_ratio),
            screw,
            top,
            c.rpm_margin
                .filter(|m| m.is_finite())
                .map_or("—".into(), |m| format!("{m:+.0}")),
            c.cruise_rpm.map_or("—".into(), |r| format!("{r:.0}")),
            c.cruise_load
                .map_or("—".into(), |l| format!("{:.0}", l * 100.0)),
            cell(c.fuel_rate, Kind::FuelRate, 2, d),
            c.fuel_per_distance
                .map_or("—".into(), |v| d.figure(v, Kind::FuelPerDistance)),
        ];
        if trip {
            row.push(
                c.trip_fuel_per_distance
                    .map_or("—".into(), |v| d.figure(v, Kind::FuelPerDistance)),
            );
        }
        row.push(cell(c.range, Kind::Distance, 0, d));
        row.push(check_marks(c));
        row.push(c.tie_with.map_or(String::new(), |t| format!("= #{t}")));
        table.push(row);
    }
    table
}

/// The row's marks for a failed check, explained once under the table ([`CHECK_LEGEND`]).
pub fn check_marks(c: &Candidate) -> String {
    let mut marks = Vec::new();
    if c.top_cavitation.as_ref().is_ok_and(|r| !r.all_passed()) {
        marks.push("cav!");
    }
    if c.shaft.as_ref().is_ok_and(|s| {
        s.existing_diameter
            .is_some_and(|have| have < s.min_diameter)
    }) {
        marks.push("shaft!");
    }
    marks.join(" ")
}

/// What the row marks mean.
pub const CHECK_LEGEND: &str = "checks: cav! fails a cavitation or blade-loading check at top speed, shaft! the shaft is thinner than the torque needs (the notes below say which and by how much)";

fn screw_decimals(d: &Display) -> usize {
    match d.system {
        crate::units::UnitSystem::Metric => 0,
        crate::units::UnitSystem::Imperial => 1,
    }
}

/// What the ranking means, in words.
pub fn rank_line(list: &Shortlist, d: &Display) -> String {
    let by = match list.rank {
        ShortlistRank::Fuel if !list.trip_profile.is_empty() => {
            let mix: Vec<String> = list
                .trip_profile
                .iter()
                .map(|(v, f)| format!("{:.0} % at {}", f * 100.0, d.quantity(*v, Kind::Speed)))
                .collect();
            format!(
                "least fuel per distance over the trip profile ({}; total fuel over total distance)",
                mix.join(", ")
            )
        }
        ShortlistRank::Fuel => format!(
            "least fuel per distance at the target speed {}",
            d.quantity(list.target_speed, Kind::Speed)
        ),
        ShortlistRank::Range => "longest range with the reserve at the target speed".into(),
        ShortlistRank::Top => "highest top speed".into(),
        ShortlistRank::Margin => "largest free-running rpm margin".into(),
    };
    let tie = match &list.tie_rule {
        Some(rule) => format!(
            "; \"= #n\": not told apart from candidate n, the leader of its group: {}",
            rule.words()
        ),
        None => "; no uncertainty band, so only equal figures tie".into(),
    };
    format!("ranked by {by}{tie}")
}

/// Each candidate's checks and problems, one block per candidate.
pub fn candidate_notes(c: &Candidate, d: &Display) -> Vec<String> {
    let mut lines = Vec::new();
    if c.pitch.is_none() {
        lines.extend(
            c.problems
                .iter()
                .map(|p| format!("problem: {}", d.words(p))),
        );
        return lines;
    }
    if c.area_raised {
        lines.push(format!(
            "AE/A0 raised to {:.2}, Keller's minimum at top speed",
            c.area_ratio
        ));
    }
    if let Some(duty) = &c.duty {
        lines.push(format!("duty at cruise: {duty}"));
    }
    match &c.shaft {
        Ok(s) => {
            let verdict = match s.existing_diameter {
                Some(have) if have < s.min_diameter => format!(
                    "the shaft ({}) is smaller than that",
                    d.quantity(have, Kind::ScrewLength)
                ),
                Some(have) => format!(
                    "the shaft ({}) is enough",
                    d.quantity(have, Kind::ScrewLength)
                ),
                None => "no shaft diameter given".into(),
            };
            lines.push(format!(
                "shaft: minimum {} {} for {} at the shaft; {verdict}",
                d.quantity(s.min_diameter, Kind::ScrewLength),
                s.material.name,
                d.quantity(s.shaft_torque, Kind::Torque)
            ));
        }
        Err(e) => lines.push(format!("shaft: not checked ({e})")),
    }
    match &c.top_cavitation {
        Ok(r) if r.all_passed() => lines.push("cavitation at top speed: all checks pass".into()),
        Ok(r) => {
            let mut failed = Vec::new();
            if !r.keller_area_ratio.passed {
                failed.push(format!(
                    "AE/A0 below Keller's minimum {:.2}",
                    r.keller_area_ratio.limit
                ));
            }
            if !r.thrust_loading.passed {
                failed.push("thrust loading over Burrill's limit".to_string());
            }
            if !r.blade_loading.passed {
                failed.push(format!(
                    "blade loading {} over {}",
                    d.quantity(r.blade_loading.value, Kind::Pressure),
                    d.quantity(r.blade_loading.limit, Kind::Pressure)
                ));
            }
            if r.tip_speed_check.as_ref().is_some_and(|t| !t.passed) {
                failed.push("tip speed over its limit".to_string());
            }
            if failed.is_empty() {
                failed.push("see the cavitation check".to_string());
            }
            lines.push(format!(
                "cavitation at top speed: fails ({})",
                failed.join("; ")
            ));
        }
        Err(e) => lines.push(format!("cavitation at top speed: not checked ({e})")),
    }
    for p in &c.problems {
        lines.push(format!("problem: {}", d.words(p)));
    }
    lines
}

/// The text of `shortlist`.
pub fn shortlist_text(list: &Shortlist, d: &Display) -> String {
    let mut out = format!(
        "Repower shortlist for {} ({})\n{}\n\n",
        list.boat,
        super::count(list.candidates.len(), "candidate", "candidates"),
        rank_line(list, d)
    );
    out.push_str(&shortlist_table(list, d).to_text("  "));
    out.push_str(&format!("  * top speed {UNRELIABLE_WORDS}\n"));
    if list.candidates.iter().any(|c| !check_marks(c).is_empty()) {
        out.push_str(&format!("  {CHECK_LEGEND}\n"));
    }
    out.push('\n');
    for (i, c) in list.candidates.iter().enumerate() {
        out.push_str(&format!(
            "#{} {} ({}) with {:.2}:1\n",
            i + 1,
            c.engine,
            c.engine_name,
            c.gear_ratio
        ));
        for line in candidate_notes(c, d) {
            out.push_str(&format!("  {line}\n"));
        }
    }
    if let Some(lines) = baseline_block(list, d) {
        out.push_str("\nAgainst the boat as found\n");
        for line in lines {
            out.push_str(&format!("  {line}\n"));
        }
    }
    if let Some(data) = &list.power_for_speed {
        out.push_str("\nWhat more power buys\n");
        out.push_str(&format!("  {}\n\n", power_summary(list, data, d)));
        out.push_str(&power_text_chart(list, data, d));
        out.push('\n');
        out.push_str(&power_table(list, data, d).to_text("  "));
        out.push_str(&format!("  {SHARE_NOTE}\n"));
    }
    out.push_str(&format!("\nCaution: {CAUTION}\n"));
    out
}

/// The CSV of `shortlist`: the table, one row per candidate.
pub fn shortlist_csv(list: &Shortlist, d: &Display) -> String {
    shortlist_table(list, d).to_csv()
}

/// The Markdown section of the shortlist (heading level `##`), without a chart.
pub fn shortlist_markdown(list: &Shortlist, d: &Display) -> String {
    let mut out = format!("## Repower shortlist\n\n{}.\n\n", rank_line(list, d));
    out.push_str(&shortlist_table(list, d).to_markdown());
    out.push_str(&format!("\n\\* top speed {UNRELIABLE_WORDS}.\n"));
    if list.candidates.iter().any(|c| !check_marks(c).is_empty()) {
        out.push_str(&format!("\n{CHECK_LEGEND}.\n"));
    }
    out.push('\n');
    for (i, c) in list.candidates.iter().enumerate() {
        out.push_str(&format!(
            "- **#{} {}** ({:.2}:1): {}\n",
            i + 1,
            c.engine,
            c.gear_ratio,
            candidate_notes(c, d).join("; ")
        ));
    }
    if let Some(lines) = baseline_block(list, d) {
        out.push_str("\n### Against the boat as found\n\n");
        for line in lines {
            out.push_str(&format!("- {line}\n"));
        }
    }
    if let Some(data) = &list.power_for_speed {
        out.push_str(&format!(
            "\n### What more power buys\n\n{}\n\n",
            power_summary(list, data, d)
        ));
        out.push_str(&power_table(list, data, d).to_markdown());
        out.push_str(&format!("\n{}.\n", SHARE_NOTE.replace('*', "\\*")));
    }
    out.push_str(&format!("\n> Caution: {CAUTION}\n"));
    out
}

/// The chart of fuel per distance at the target speed against top speed, one point per
/// candidate that has both.
pub fn shortlist_chart(list: &Shortlist, d: &Display) -> Option<Chart> {
    // Each point is labelled "#n" by its place in the table, so the chart reads against it.
    let (points, labels): (Vec<(f64, f64)>, Vec<String>) = list
        .candidates
        .iter()
        .enumerate()
        .filter_map(|(i, c)| Some((i, c.top_speed?, c.fuel_per_distance?)))
        .filter(|(_, x, y)| x.is_finite() && y.is_finite())
        .map(|(i, x, y)| {
            (
                (d.scaled(x, Kind::Speed), d.scaled(y, Kind::FuelPerDistance)),
                format!("#{}", i + 1),
            )
        })
        .unzip();
    if points.is_empty() {
        return None;
    }
    Some(Chart {
        title: format!("{}: fuel at the target speed against top speed", list.boat),
        x_label: format!("top speed ({})", d.unit(Kind::Speed)),
        y_label: format!("fuel ({})", d.unit(Kind::FuelPerDistance)),
        series: vec![Series {
            name: "candidates (#n: place in the table)".into(),
            points,
            style: SeriesStyle::Markers,
            look: 0,
            labels,
        }],
    })
}

/// The chart's file name in the Markdown export.
pub const CHART_FILE: &str = "shortlist.svg";

/// The shortlist as a section of the Markdown export, with its charts' files (fuel against top
/// speed, and what more power buys).
pub fn shortlist_export(
    list: &Shortlist,
    d: &Display,
) -> (super::export::Section, Vec<super::export::ExportFile>) {
    let mut body = shortlist_markdown(list, d)
        .trim_start_matches("## Repower shortlist\n\n")
        .to_string();
    let charts = [
        shortlist_chart(list, d).map(|c| (CHART_FILE, c)),
        list.power_for_speed
            .as_ref()
            .map(|data| (super::power_speed::CHART_FILE, power_chart(list, data, d))),
    ];
    let mut files = Vec::new();
    for (name, chart) in charts.into_iter().flatten() {
        body.push_str(&format!(
            "\n![{}]({name})\n",
            super::table::md_cell(&chart.title)
        ));
        files.push(super::export::ExportFile {
            name: name.into(),
            contents: chart.to_svg(),
        });
    }
    (
        super::export::Section {
            title: "Repower shortlist".into(),
            body,
        },
        files,
    )
}

/// The shortlist section of the export for every engine sheet in `store` (default gears and
/// ranking), with its chart; the section says why when there is no shortlist.
pub fn export_of_store(
    study: &crate::study::Study,
    store: &crate::profile::Store,
) -> (super::export::Section, Vec<super::export::ExportFile>) {
    let d = Display::new(study.units);
    let list = crate::study::shortlist::offers_from_store(store, None).and_then(|offers| {
        Ok(study.shortlist(
            &offers,
            &crate::study::shortlist::ShortlistOptions::default(),
        )?)
    });
    match list {
        Ok(list) => shortlist_export(&list, &d),
        Err(e) => (
            super::export::Section {
                title: "Repower shortlist".into(),
                body: format!("Not available: {e:#}"),
            },
            Vec::new(),
        ),
    }
}

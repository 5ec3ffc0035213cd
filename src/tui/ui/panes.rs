//! The three field panes: their rows and notes (the view-model) and how a pane is drawn.

use super::field_list::{FieldList, FieldRow, TypedValue};
use crate::propulsion::Resolved;
use crate::tui::app::{App, EditTarget, Overlay};
use crate::tui::chart::variant_glyph;
use crate::tui::edit;
use crate::tui::fields::{
    FieldId, FieldValue, Pane, about, fields_of, format_number, label, value,
};
use crate::units::{self, Kind, UnitSystem};
use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::widgets::Widget;

pub(crate) fn draw_pane(app: &App, pane: Pane, area: Rect, buf: &mut Buffer) {
    let rows = rows(pane, app);
    let focused = app.focus == pane && app.overlay == Overlay::None;
    let typing = match &app.edit {
        Some(edit) if focused && matches!(edit.target, EditTarget::Field(_)) => Some(TypedValue {
            text: &edit.text,
            problem: edit.problem.as_deref(),
        }),
        _ => None,
    };
    let extra = pane_notes(pane, app);
    let selected = app.selected[pane.index()].min(rows.len().saturating_sub(1));
    FieldList {
        title: &pane_title(app, pane),
        rows: &rows,
        selected,
        focused,
        typing,
        footer_lines: &extra,
        theme: &app.theme,
    }
    .render(area, buf);
}

fn pane_title(app: &App, pane: Pane) -> String {
    match pane {
        Pane::Screw => {
            let count = edit::variant_count(&app.doc.boat);
            let active = edit::active_variant(&app.doc.boat);
            format!("Screw · variant {} of {count}", active + 1)
        }
        _ => pane.title().to_string(),
    }
}

fn resolved_text(r: Option<&Resolved>, kind: Kind, system: UnitSystem) -> Option<String> {
    r.map(|r| units::format(r.value, kind, system))
}

/// The estimate the core used for an optional hull value left out of the document.
fn estimate(field: FieldId, app: &App) -> Option<(Resolved, Kind)> {
    let hull = &app.solution.solved()?.vessel.resistance.hull;
    match field {
        FieldId::WettedSurface => Some((hull.wetted_surface, Kind::Area)),
        FieldId::HalfEntranceAngle => Some((hull.half_entrance_angle_deg, Kind::Angle)),
        FieldId::TransomArea => Some((hull.transom_area, Kind::Area)),
        _ => None,
    }
}

/// The text of a read-only field that comes from the engine sheet or the solved vessel.
fn derived_text(field: FieldId, app: &App) -> String {
    let system = app.units;
    let solved = app.solution.solved();
    match field {
        FieldId::RatedRpm => format!("{:.0} rpm", app.doc.engine.rated_rpm.value),
        FieldId::RatedPower => solved
            .map(|s| units::format(s.vessel.engine.rated_power(), Kind::Power, system))
            .unwrap_or_else(|| "—".into()),
        FieldId::FuelDensity => {
            units::format(app.doc.engine.fuel_density.value, Kind::Density, system)
        }
        FieldId::ResistanceMethod => solved
            .map(|s| {
                let name = s.vessel.resistance.method.name();
                format!("auto: {}", name.split(" (").next().unwrap_or(name))
            })
            .unwrap_or_else(|| "auto (fits the hull)".into()),
        FieldId::PitchRatio => solved
            .and_then(|s| s.vessel.variants.get(s.vessel.active_variant))
            .map(|v| format!("{:.3}", v.screw.geometry().pitch_ratio()))
            .unwrap_or_else(|| "—".into()),
        _ => "—".into(),
    }
}

/// The rows of `pane` for the app's document, formatted in its display units.
pub fn rows(pane: Pane, app: &App) -> Vec<FieldRow> {
    let boat = &app.doc.boat;
    fields_of(pane, boat)
        .into_iter()
        .map(|field| {
            let mut row = FieldRow {
                label: label(field).to_string(),
                about: about(field).to_string(),
                warning: app.issues.first_for(field).map(str::to_string),
                ..FieldRow::default()
            };
            row.value = match value(field, boat) {
                FieldValue::Number { value, kind } => format_number(value, kind, app.units),
                FieldValue::Choice(text) | FieldValue::Engine(text) | FieldValue::Text(text) => {
                    text
                }
                FieldValue::ReadOnly(text) => match estimate(field, app) {
                    Some((resolved, kind)) => {
                        row.estimated_by = resolved.estimated_by.map(str::to_string);
                        resolved_text(Some(&resolved), kind, app.units).unwrap_or(text)
                    }
                    None if text.is_empty() => derived_text(field, app),
                    None => text,
                },
            };
            row
        })
        .collect()
}

/// Lines under a pane's fields: the variants and the pitch recommendation for the Screw pane.
pub fn pane_notes(pane: Pane, app: &App) -> Vec<String> {
    if pane != Pane::Screw {
        return Vec::new();
    }
    let boat = &app.doc.boat;
    let variants: Vec<String> = boat
        .variants
        .iter()
        .enumerate()
        .map(|(i, v)| {
            let active = if i == boat.active_variant { "◀" } else { "" };
            // Non-breaking spaces keep each entry whole when the line wraps.
            format!("{} {}{active}", variant_glyph(i).symbol(), v.label).replace(' ', "\u{a0}")
        })
        .collect();
    // Most important first: the notes are dropped from the bottom, whole, when the pane is
    // short. The checks (cavitation, "shaft too small") come before the recommendation so that
    // a safety line is the last to go at 80x24.
    let mut notes = Vec::new();
    if let Some(solved) = app.solution.solved() {
        notes.push(super::views::screw_pane_check_line(&solved.checks));
    }
    if let Some(line) = app.solution.recommendation_line(app.units) {
        notes.push(line);
    }
    notes.push(format!("Variants: {}", variants.join("  ")));
    notes
}

//! The strips around the panes: header, chart tabs, status line and footer hints.

use crate::tui::analysis::ViewKind;
use crate::tui::app::{App, Level};
use crate::tui::fields::Pane;
use crate::tui::keys::{self, Mode};
use crate::units::UnitSystem;
use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};
use ratatui::widgets::Widget;

pub(crate) fn draw_header(app: &App, area: Rect, buf: &mut Buffer) {
    let mut spans = vec![
        Span::styled(
            " tidewright ",
            app.theme.focus.add_modifier(Modifier::REVERSED),
        ),
        Span::raw(" "),
        Span::styled(
            app.name.clone(),
            Style::default().add_modifier(Modifier::BOLD),
        ),
    ];
    if app.dirty() {
        spans.push(Span::styled(" ● unsaved", app.theme.warning));
    }
    if !app.savable {
        spans.push(Span::styled(" (demo, read-only)", app.theme.dim));
    }
    if app.changed_on_disk {
        spans.push(Span::styled(" ⚠ file changed on disk", app.theme.error));
    }
    if let Some(cal) = &app.doc.boat.calibration {
        spans.push(Span::styled(
            format!(" · calibrated ×{:.3}", cal.resistance_factor),
            app.theme.accent,
        ));
    }
    let units = match app.units {
        UnitSystem::Metric => "metric",
        UnitSystem::Imperial => "imperial",
    };
    spans.push(Span::styled(format!("  · units {units}"), app.theme.dim));
    Line::from(spans).render(area, buf);
}

pub(crate) fn draw_tabs(app: &App, area: Rect, buf: &mut Buffer) {
    let mut spans = Vec::new();
    for pane in Pane::ALL {
        let style = if pane == app.focus {
            app.theme
                .focus
                .add_modifier(Modifier::REVERSED | Modifier::BOLD)
        } else {
            app.theme.dim
        };
        spans.push(Span::styled(format!(" {} ", pane.title()), style));
        spans.push(Span::raw(" "));
    }
    Line::from(spans).render(area, buf);
}

pub(crate) fn draw_status(app: &App, area: Rect, buf: &mut Buffer) {
    if let Some(status) = &app.status {
        let style = match status.level {
            Level::Info => app.theme.accent,
            Level::Error => app.theme.error,
        };
        Line::styled(status_fitted(&status.text, area.width as usize), style).render(area, buf);
    } else if let Some(warnings) = app.solution.solved().map(|s| &s.warnings)
        && let Some(line) = warning_line(warnings, area.width as usize)
    {
        Line::styled(line, app.theme.warning).render(area, buf);
    }
}

/// A status message fitted to `width`: too long, it is cut at a word with "…" before its
/// closing parenthesis ("(unsaved: s saves, u undoes)"), which always stays: the keys that
/// act on what was just done.
pub fn status_fitted(text: &str, width: usize) -> String {
    if text.chars().count() <= width {
        return text.to_string();
    }
    let (head, tail) = match text.rfind(" (") {
        Some(at) if text.ends_with(')') => (&text[..at], &text[at..]),
        _ => (text, ""),
    };
    let room = width.saturating_sub(tail.chars().count() + 1);
    let mut cut = String::new();
    for word in head.split(' ') {
        let next = if cut.is_empty() {
            word.to_string()
        } else {
            format!("{cut} {word}")
        };
        if next.chars().count() > room {
            break;
        }
        cut = next;
    }
    if cut.is_empty() {
        cut = head.chars().take(room).collect();
    }
    let fitted = format!("{cut}…{tail}");
    fitted.chars().take(width).collect()
}

/// The first of `warnings` fitted to `width`, cut at a word with "…", and a count of the
/// others ("+3 more") that is always kept in view.
pub fn warning_line(warnings: &[impl std::fmt::Display], width: usize) -> Option<String> {
    let first = warnings.first()?.to_string();
    let more = match warnings.len() - 1 {
        0 => String::new(),
        n => format!(" (+{n} more)"),
    };
    let room = width.saturating_sub(2 + more.chars().count());
    let text = if first.chars().count() <= room {
        first
    } else {
        let cut: String = first.chars().take(room.saturating_sub(1)).collect();
        let at_word = cut
            .rfind(' ')
            .filter(|&i| i > 0)
            .map_or(cut.as_str(), |i| &cut[..i]);
        format!("{}…", at_word.trim_end_matches([',', ':', ';', ' ']))
    };
    Some(format!("! {text}{more}"))
}

/// The footer's hints that fit in `width`: the table's order, but help and quit always stay;
/// in a design view, only that view's keys and those of every view.
pub fn footer_hints_fitting(
    mode: Mode,
    view: Option<ViewKind>,
    width: u16,
) -> Vec<(&'static str, &'static str)> {
    let hints = keys::footer_hints(mode, view);
    let cost = |(k, h): &(&str, &str)| k.chars().count() + h.chars().count() + 3;
    let kept_last: Vec<_> = hints
        .iter()
        .filter(|(_, h)| *h == "help" || *h == "quit")
        .copied()
        .collect();
    let mut budget = (width as usize).saturating_sub(kept_last.iter().map(cost).sum());
    let mut out = Vec::new();
    for hint in hints.iter().filter(|(_, h)| *h != "help" && *h != "quit") {
        if cost(hint) > budget {
            break;
        }
        budget -= cost(hint);
        out.push(*hint);
    }
    out.extend(kept_last);
    out
}

pub(crate) fn draw_footer(app: &App, area: Rect, buf: &mut Buffer) {
    let mut spans = Vec::new();
    for (key, hint) in footer_hints_fitting(app.mode(), app.view_kind(), area.width) {
        spans.push(Span::styled(
            key,
            app.theme.focus.add_modifier(Modifier::BOLD),
        ));
        spans.push(Span::styled(format!(" {hint}  "), app.theme.dim));
    }
    Line::from(spans).render(area, buf);
}

pub(crate) fn centred(area: Rect, width: u16, height: u16) -> Rect {
    let width = width.min(area.width);
    let height = height.min(area.height);
    Rect {
        x: area.x + (area.width - width) / 2,
        y: area.y + (area.height - height) / 2,
        width,
        height,
    }
}

#[cfg(test)]
mod warning_tests {
    use super::{status_fitted, warning_line};

    #[test]
    fn a_long_status_keeps_its_keys_in_view() {
        let text = "engine brindmoor-4b62 (Brindmoor 4B62), gear 2.50:1 and screw variant shortlist brindmoor-4b62 2.50:1 in use (unsaved: s saves, u undoes)";
        let line = status_fitted(text, 80);
        assert!(line.chars().count() <= 80, "{line}");
        assert!(line.ends_with("… (unsaved: s saves, u undoes)"), "{line}");
        assert!(line.starts_with("engine brindmoor-4b62"), "{line}");
        assert_eq!(status_fitted("saved", 80), "saved");
        // Narrower than the keys themselves: cut, never wider than the line.
        assert!(status_fitted(text, 10).chars().count() <= 10);
    }

    #[test]
    fn a_long_warning_is_cut_at_a_word_and_the_others_are_counted() {
        let warnings = vec![
            "waterplane coefficient not given: estimated 0.572, the weakest input".to_string(),
            "b".into(),
            "c".into(),
            "d".into(),
        ];
        let line = warning_line(&warnings, 50).unwrap();
        assert!(line.chars().count() <= 50, "{line}");
        assert!(line.ends_with("… (+3 more)"), "{line}");
        assert!(
            line.contains("estimated…") || line.contains("given…"),
            "{line}"
        );
        assert_eq!(
            warning_line(&warnings[..1], 200).unwrap(),
            format!("! {}", warnings[0])
        );
        let none: &[String] = &[];
        assert_eq!(warning_line(none, 80), None);
    }
}

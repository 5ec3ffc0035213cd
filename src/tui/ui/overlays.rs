//! Overlays over the main screen: the help, the pickers and the y/n questions.

use super::layout::centred;
use crate::tui::app::App;
use crate::tui::app::PickKind;
use crate::tui::keys::{self, Mode};
use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Borders, Clear, Paragraph, Widget, Wrap};

/// Width of the key column in the help overlay.
const HELP_KEY_WIDTH: usize = 18;

/// The help overlay's lines for the modes given: every binding, its help wrapped to `width`.
fn help_lines(app: &App, modes: &[Mode], width: usize) -> Vec<Line<'static>> {
    let help_width = width.saturating_sub(HELP_KEY_WIDTH + 1).max(1);
    let mut lines = Vec::new();
    for mode in modes {
        lines.push(Line::styled(
            mode.heading().to_string(),
            app.theme.focus.add_modifier(Modifier::BOLD),
        ));
        for b in keys::bindings_for(*mode) {
            let keys = keys::key_labels(b);
            for (index, part) in wrap_words(b.help, help_width).into_iter().enumerate() {
                let key_column = if index == 0 { keys.as_str() } else { "" };
                lines.push(Line::from(vec![
                    Span::styled(
                        format!("{key_column:<HELP_KEY_WIDTH$} "),
                        Style::default().add_modifier(Modifier::BOLD),
                    ),
                    Span::raw(part),
                ]));
            }
        }
    }
    lines
}

/// `text` broken at spaces into lines of at most `width` characters (a longer word is split).
fn wrap_words(text: &str, width: usize) -> Vec<String> {
    let mut lines = Vec::new();
    let mut current = String::new();
    for word in text.split_whitespace() {
        let mut word: Vec<char> = word.chars().collect();
        while word.len() > width {
            if !current.is_empty() {
                lines.push(std::mem::take(&mut current));
            }
            lines.push(word.drain(..width).collect());
        }
        let word: String = word.into_iter().collect();
        let needed =
            current.chars().count() + usize::from(!current.is_empty()) + word.chars().count();
        if needed > width && !current.is_empty() {
            lines.push(std::mem::take(&mut current));
        }
        if !current.is_empty() {
            current.push(' ');
        }
        current.push_str(&word);
    }
    if !current.is_empty() || lines.is_empty() {
        lines.push(current);
    }
    lines
}

fn marker_lines(app: &App) -> Vec<Line<'static>> {
    vec![
        Line::default(),
        Line::styled("Markers", app.theme.focus.add_modifier(Modifier::BOLD)),
        Line::raw(format!(
            "{}  value estimated (the reason shows when selected)",
            super::field_list::ESTIMATED_MARK
        )),
        Line::raw(format!(
            "{}  value with a warning",
            super::field_list::WARNING_MARK
        )),
    ]
}

pub(crate) fn draw_help(app: &App, scroll: u16, area: Rect, buf: &mut Buffer) {
    let rect = centred(
        area,
        area.width.saturating_sub(2),
        area.height.saturating_sub(2),
    );
    // Every row it spans, the side margins included: a pane's border or a letter left beside
    // the overlay would read as part of it. The header and footer rows stay.
    Clear.render(
        Rect {
            x: area.x,
            width: area.width,
            ..rect
        },
        buf,
    );
    let block = Block::default()
        .borders(Borders::ALL)
        .border_style(app.theme.focus)
        .title(" Keys — ? or Esc closes, j/k scroll ");
    let inner = block.inner(rect);
    block.render(rect, buf);
    let others = [
        Mode::Edit,
        Mode::Pick,
        Mode::Confirm,
        Mode::Help,
        Mode::View,
    ];
    if inner.width >= 110 {
        let [left, right] =
            Layout::horizontal([Constraint::Percentage(55), Constraint::Percentage(45)])
                .areas(inner);
        // A cell short of the column, so its text never runs into the right column.
        let left_lines = help_lines(
            app,
            &[Mode::Browse],
            (left.width as usize).saturating_sub(1),
        );
        let mut right_lines = help_lines(app, &others, right.width as usize);
        right_lines.extend(marker_lines(app));
        Paragraph::new(left_lines)
            .scroll((scroll, 0))
            .render(left, buf);
        Paragraph::new(right_lines)
            .scroll((scroll, 0))
            .render(right, buf);
    } else {
        // One column, scrolled with j/k, so no help text is cut short at 80 columns.
        let mut lines = help_lines(app, &Mode::ALL, inner.width as usize);
        lines.extend(marker_lines(app));
        let last_top = (lines.len() as u16).saturating_sub(inner.height);
        Paragraph::new(lines)
            .scroll((scroll.min(last_top), 0))
            .render(inner, buf);
    }
}

pub(crate) fn draw_picker(
    app: &App,
    kind: PickKind,
    entries: &[String],
    highlighted: usize,
    area: Rect,
    buf: &mut Buffer,
) {
    let title = match kind {
        PickKind::Boat => " Open a boat ",
        PickKind::Engine => " Engine sheet for this boat ",
    };
    let height = (entries.len() as u16 + 2)
        .min(area.height.saturating_sub(4))
        .max(3);
    let rect = centred(area, 44, height);
    Clear.render(rect, buf);
    let block = Block::default()
        .borders(Borders::ALL)
        .border_style(app.theme.focus)
        .title(title);
    let inner = block.inner(rect);
    block.render(rect, buf);
    let visible = inner.height as usize;
    let first = highlighted.saturating_sub(visible.saturating_sub(1));
    let lines: Vec<Line> = entries
        .iter()
        .enumerate()
        .skip(first)
        .take(visible)
        .map(|(i, e)| {
            if i == highlighted {
                Line::styled(
                    format!("› {e}"),
                    app.theme.focus.add_modifier(Modifier::REVERSED),
                )
            } else {
                Line::raw(format!("  {e}"))
            }
        })
        .collect();
    Paragraph::new(lines).render(inner, buf);
}

pub(crate) fn draw_question(app: &App, question: &str, area: Rect, buf: &mut Buffer) {
    let rect = centred(area, 52, 6);
    Clear.render(rect, buf);
    let block = Block::default()
        .borders(Borders::ALL)
        .border_style(app.theme.warning)
        .title(" Question ");
    let inner = block.inner(rect);
    block.render(rect, buf);
    Paragraph::new(vec![
        Line::raw(question.to_string()),
        Line::styled("y yes · n no", app.theme.focus.add_modifier(Modifier::BOLD)),
    ])
    .wrap(Wrap { trim: true })
    .render(inner, buf);
}

#[cfg(test)]
mod tests {
    use super::wrap_words;

    #[test]
    fn help_text_wraps_at_spaces_and_keeps_every_word() {
        let text = "type a value with its unit for the selected field";
        let lines = wrap_words(text, 20);
        assert!(lines.iter().all(|l| l.chars().count() <= 20), "{lines:?}");
        assert_eq!(lines.join(" "), text);
        assert_eq!(wrap_words("abcdefghij", 4), ["abcd", "efgh", "ij"]);
        assert_eq!(wrap_words("", 10), [""]);
    }
}

//! The one field-list widget behind the Vessel, Powerplant and Screw panes: label, value with
//! unit, an *estimated* and a *warning* marker, and the reason for the selected field.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Borders, Paragraph, Widget, Wrap};

use crate::tui::theme::Theme;

/// Marker shown after a value the program estimated rather than the user gave.
pub const ESTIMATED_MARK: &str = "~";
/// Marker shown after a value with a warning.
pub const WARNING_MARK: &str = "!";

/// One row of a pane, ready to draw (values already formatted in the display units).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct FieldRow {
    /// The field's label, e.g. "Pitch".
    pub label: String,
    /// The value with its unit, e.g. "14.0 in".
    pub value: String,
    /// Set when the value is estimated; says by what.
    pub estimated_by: Option<String>,
    /// Set when a warning applies to the value; the warning's text.
    pub warning: Option<String>,
    /// What the field is, shown when it is selected and has nothing more urgent to say.
    pub about: String,
}

/// A value being typed into the selected row.
#[derive(Debug, Clone, PartialEq)]
pub struct TypedValue<'a> {
    /// The text typed so far.
    pub text: &'a str,
    /// Why it is not valid yet, or `None` when it would be accepted.
    pub problem: Option<&'a str>,
}

/// The field-list widget.
#[derive(Debug, Clone)]
pub struct FieldList<'a> {
    /// The pane's title.
    pub title: &'a str,
    /// The rows.
    pub rows: &'a [FieldRow],
    /// The selected row, shown only when the pane has focus.
    pub selected: usize,
    /// Whether the pane has the keyboard.
    pub focused: bool,
    /// The value being typed into the selected row, if any.
    pub typing: Option<TypedValue<'a>>,
    /// Extra lines under the list (e.g. the pitch recommendation), always shown.
    pub footer_lines: &'a [String],
    /// Colours and emphasis.
    pub theme: &'a Theme,
}

impl FieldList<'_> {
    /// The reason line for the selected row: typing problem, warning, estimate, or what it is.
    fn reason(&self) -> Option<(String, Style)> {
        if !self.focused {
            return None;
        }
        if let Some(typing) = &self.typing {
            return Some(match typing.problem {
                Some(problem) => (format!("✗ {problem}"), self.theme.error),
                None => ("✓ Enter applies, Esc cancels".to_string(), self.theme.dim),
            });
        }
        let row = self.rows.get(self.selected)?;
        if let Some(w) = &row.warning {
            return Some((format!("{WARNING_MARK} {w}"), self.theme.warning));
        }
        if let Some(e) = &row.estimated_by {
            return Some((format!("{ESTIMATED_MARK} estimated: {e}"), self.theme.dim));
        }
        // Named, so that it never reads as the end of the note above it.
        (!row.about.is_empty()).then(|| (format!("{}: {}", row.label, row.about), self.theme.dim))
    }
}

impl Widget for FieldList<'_> {
    fn render(self, area: Rect, buf: &mut Buffer) {
        let border_style = if self.focused {
            self.theme.focus
        } else {
            self.theme.dim
        };
        let title = if self.focused {
            format!(" ▶ {} ", self.title)
        } else {
            format!(" {} ", self.title)
        };
        let block = Block::default()
            .borders(Borders::ALL)
            .border_style(border_style)
            .title(title);
        let inner = block.inner(area);
        block.render(area, buf);
        if inner.height == 0 || inner.width < 4 {
            return;
        }
        let mut reason = self.reason();
        let notes_height: u16 = self
            .footer_lines
            .iter()
            .map(|l| wrapped_height(l, inner.width))
            .sum();
        let min_rows = (self.rows.len() as u16).clamp(1, 6);
        // What a field is gives way to the notes (checks, recommendation) when both do not
        // fit: a problem, warning or estimate always stays.
        if let (Some((text, _)), Some(row)) = (&reason, self.rows.get(self.selected))
            && self.typing.is_none()
            && row.warning.is_none()
            && row.estimated_by.is_none()
            && notes_height + wrapped_height(text, inner.width).min(3) + min_rows > inner.height
        {
            reason = None;
        }
        let reason_height = match &reason {
            Some((text, _)) => wrapped_height(text, inner.width)
                .min(3)
                .min(inner.height.saturating_sub(1)),
            None => 0,
        };
        // The notes give way to the list when space is short, keeping at least six rows.
        let extra = notes_height.min(inner.height.saturating_sub(reason_height + min_rows));
        let list_height = inner.height.saturating_sub(reason_height + extra) as usize;

        let first = if self.selected >= list_height {
            self.selected + 1 - list_height
        } else {
            0
        };
        let width = inner.width as usize;
        let label_width = self
            .rows
            .iter()
            .map(|r| r.label.chars().count())
            .max()
            .unwrap_or(0)
            .min(width / 2);
        let mut lines: Vec<Line> = Vec::with_capacity(inner.height as usize);
        for (index, row) in self.rows.iter().enumerate().skip(first).take(list_height) {
            let selected = self.focused && index == self.selected;
            let value = match (&self.typing, selected) {
                (Some(t), true) => format!("{}▏", t.text),
                _ => row.value.clone(),
            };
            let marks = format!(
                "{}{}",
                if row.estimated_by.is_some() {
                    ESTIMATED_MARK
                } else {
                    " "
                },
                if row.warning.is_some() {
                    WARNING_MARK
                } else {
                    " "
                }
            );
            let pointer = if selected { "›" } else { " " };
            let label: String = row.label.chars().take(label_width).collect();
            let used = 1 + label_width + 1 + 2;
            let value_width = width.saturating_sub(used);
            let typing_here = self.typing.is_some() && selected;
            let value: String = if value.chars().count() <= value_width {
                value
            } else if typing_here {
                // While typing the end (with the cursor) is what matters: cut from the left.
                value
                    .chars()
                    .rev()
                    .take(value_width)
                    .collect::<Vec<_>>()
                    .into_iter()
                    .rev()
                    .collect()
            } else {
                // A long value (a variant's label) reads from its start: cut at the right.
                let kept: String = value.chars().take(value_width.saturating_sub(1)).collect();
                format!("{kept}…")
            };
            let mut value_style = if row.warning.is_some() {
                self.theme.warning
            } else {
                Style::default()
            };
            if selected {
                value_style = value_style.add_modifier(Modifier::REVERSED);
                if let Some(TypedValue {
                    problem: Some(_), ..
                }) = &self.typing
                {
                    value_style = self.theme.error.add_modifier(Modifier::REVERSED);
                }
            }
            let label_style = if selected {
                self.theme.focus.add_modifier(Modifier::BOLD)
            } else {
                Style::default()
            };
            lines.push(Line::from(vec![
                Span::styled(pointer, self.theme.focus),
                Span::styled(format!("{label:<label_width$} "), label_style),
                Span::styled(format!("{value:>value_width$}"), value_style),
                Span::styled(marks, self.theme.warning),
            ]));
        }
        let list_area = Rect {
            height: list_height as u16,
            ..inner
        };
        Paragraph::new(lines).render(list_area, buf);
        if extra > 0 {
            // Whole notes while they fit; the first that does not is cut at a word and
            // marked "…" in the rows left, never cut silently mid-sentence.
            let mut left = extra;
            let mut shown: Vec<String> = Vec::new();
            for note in self.footer_lines {
                let height = wrapped_height(note, inner.width);
                if height <= left {
                    shown.push(note.clone());
                    left -= height;
                    continue;
                }
                if left > 0 {
                    shown.push(cut_at_word(note, inner.width, left));
                }
                break;
            }
            let notes: Vec<Line> = shown
                .into_iter()
                .map(|l| Line::styled(l, self.theme.accent))
                .collect();
            let notes_area = Rect {
                y: inner.y + list_height as u16,
                height: extra,
                ..inner
            };
            Paragraph::new(notes)
                .wrap(Wrap { trim: true })
                .render(notes_area, buf);
        }
        if let Some((text, style)) = reason {
            let reason_area = Rect {
                y: inner.y + inner.height - reason_height,
                height: reason_height,
                ..inner
            };
            Paragraph::new(Line::styled(text, style))
                .wrap(Wrap { trim: true })
                .render(reason_area, buf);
        }
    }
}

/// The longest start of `text`, cut at a word and ended with "…", that wraps into `rows`
/// rows of `width`.
fn cut_at_word(text: &str, width: u16, rows: u16) -> String {
    let mut kept = String::new();
    for word in text.split_whitespace() {
        let next = if kept.is_empty() {
            word.to_string()
        } else {
            format!("{kept} {word}")
        };
        if wrapped_height(&format!("{next}…"), width) > rows {
            break;
        }
        kept = next;
    }
    format!("{}…", kept.trim_end_matches([',', ';', ':']))
}

/// How many lines `text` takes when wrapped to `width` columns (a close upper estimate).
pub fn wrapped_height(text: &str, width: u16) -> u16 {
    let width = width.max(1) as usize;
    let mut lines = 1usize;
    let mut used = 0usize;
    for word in text.split_whitespace() {
        let len = word.chars().count();
        if used == 0 {
            used = len;
        } else if used + 1 + len <= width {
            used += 1 + len;
        } else {
            lines += 1;
            used = len;
        }
        while used > width {
            lines += 1;
            used -= width;
        }
    }
    lines as u16
}

#[cfg(test)]
mod tests {
    use super::*;

    fn rows() -> Vec<FieldRow> {
        vec![
            FieldRow {
                label: "Diameter".into(),
                value: "22.0 in".into(),
                about: "screw diameter".into(),
                ..Default::default()
            },
            FieldRow {
                label: "Pitch".into(),
                value: "17.0 in".into(),
                warning: Some("P/D 1.45 is past the B-series range 0.5–1.4".into()),
                ..Default::default()
            },
            FieldRow {
                label: "Wetted surface".into(),
                value: "31.2 m²".into(),
                estimated_by: Some("Holtrop (1984)".into()),
                ..Default::default()
            },
        ]
    }

    fn draw(list: FieldList<'_>, width: u16, height: u16) -> String {
        let area = Rect::new(0, 0, width, height);
        let mut buf = Buffer::empty(area);
        list.render(area, &mut buf);
        (0..height)
            .map(|y| {
                (0..width)
                    .map(|x| buf[(x, y)].symbol().to_string())
                    .collect::<String>()
            })
            .collect::<Vec<_>>()
            .join("\n")
    }

    #[test]
    fn shows_markers_and_the_reason_of_the_selected_row() {
        let theme = Theme::plain();
        let rows = rows();
        let text = draw(
            FieldList {
                title: "Screw",
                rows: &rows,
                selected: 1,
                focused: true,
                typing: None,
                footer_lines: &[],
                theme: &theme,
            },
            40,
            8,
        );
        assert!(text.contains("▶ Screw"));
        assert!(text.contains("›Pitch"), "{text}");
        assert!(text.contains("17.0 in !"), "{text}");
        assert!(text.contains("31.2 m²~"), "{text}");
        assert!(text.contains("! P/D 1.45"), "{text}");
    }

    #[test]
    fn typing_shows_the_problem_and_keeps_the_selection_visible() {
        let theme = Theme::plain();
        let rows = rows();
        let text = draw(
            FieldList {
                title: "Screw",
                rows: &rows,
                selected: 2,
                focused: true,
                typing: Some(TypedValue {
                    text: "31 furlongs",
                    problem: Some("unknown unit \"furlongs\""),
                }),
                footer_lines: &[],
                theme: &theme,
            },
            40,
            5,
        );
        assert!(text.contains("31 furlongs▏"), "{text}");
        assert!(text.contains("✗ unknown unit"), "{text}");
    }

    #[test]
    fn tiny_areas_do_not_panic() {
        let theme = Theme::plain();
        let rows = rows();
        for (w, h) in [(0, 0), (1, 1), (3, 2), (5, 3), (10, 2)] {
            draw(
                FieldList {
                    title: "X",
                    rows: &rows,
                    selected: 2,
                    focused: true,
                    typing: None,
                    footer_lines: &[],
                    theme: &theme,
                },
                w,
                h,
            );
        }
    }

    #[test]
    fn wrapped_height_counts_lines() {
        assert_eq!(wrapped_height("abc def", 7), 1);
        assert_eq!(wrapped_height("abc def", 6), 2);
        assert_eq!(wrapped_height("", 6), 1);
    }
}

//! ASCII mode's last pass over the drawn frame: every cell made plain ASCII, so that a
//! terminal without UTF-8 shows `+-|` borders, `*` and `.` marks and "deg", never garbage.
//!
//! Drawing stays as it is and pure; this pass runs once over the buffer when
//! [`units::text_style`] is ASCII. A character spelled with one ASCII character ("─" → "-")
//! takes its own cell; a longer spelling ("°" → "deg", "½" → "1/2") pushes the text after it
//! to the right into the blank cells that follow, up to the next border, so words stay whole.
//! Where there is no room the spelling is cut to its first character.

use crate::units::{self, TextStyle};
use ratatui::buffer::{Buffer, Cell};
use ratatui::layout::Rect;

/// Whether the screen is drawn in plain ASCII.
pub fn active() -> bool {
    units::text_style() == TextStyle::Ascii
}

/// The ASCII spelling of a chart's plot cell: braille line dots become `.`, the point
/// glyphs their ASCII marks (see [`crate::tui::chart::Glyph::symbol`]).
pub fn plot_mark(symbol: &str) -> Option<&'static str> {
    let c = symbol.chars().next()?;
    match c {
        '\u{2800}' => Some(" "),
        '\u{2801}'..='\u{28ff}' => Some("."),
        '•' => Some("o"),
        '▄' => Some("x"),
        '█' => Some("#"),
        '\u{2596}'..='\u{259f}' | '▀' | '▌' | '▐' => Some("+"),
        _ => None,
    }
}

/// Makes every cell of `area` in `buf` plain ASCII.
pub fn to_ascii(area: Rect, buf: &mut Buffer) {
    let area = area.intersection(buf.area);
    for y in area.top()..area.bottom() {
        let mut row: Vec<Cell> = (area.left()..area.right())
            .map(|x| buf[(x, y)].clone())
            .collect();
        asciify_row(&mut row);
        for (x, cell) in (area.left()..area.right()).zip(row) {
            buf[(x, y)] = cell;
        }
    }
}

fn is_border(symbol: &str) -> bool {
    matches!(symbol, "|" | "+")
        || symbol
            .chars()
            .next()
            .is_some_and(|c| ('\u{2500}'..='\u{257f}').contains(&c))
}

fn asciify_row(row: &mut [Cell]) {
    let mut i = 0;
    while i < row.len() {
        let symbol = row[i].symbol().to_string();
        if symbol.is_ascii() {
            i += 1;
            continue;
        }
        let plain = units::ascii_fallback(&symbol);
        let extra = plain.len().saturating_sub(1);
        if extra > 0 && make_room(row, i, extra) {
            for (k, c) in plain.chars().enumerate() {
                row[i + k].set_symbol(c.encode_utf8(&mut [0; 4]));
                if k > 0 {
                    row[i + k].set_style(row[i].style());
                }
            }
            i += plain.len();
        } else {
            let first = plain.chars().next().unwrap_or(' ');
            row[i].set_symbol(first.encode_utf8(&mut [0; 4]));
            i += 1;
        }
    }
}

/// Shifts the cells after `at` right by `extra`, into the first run of `extra + 1` blank
/// cells before a border (one blank is kept as a gap); false when there is no such run.
fn make_room(row: &mut [Cell], at: usize, extra: usize) -> bool {
    let mut blanks = 0;
    let mut end = None;
    for (j, cell) in row.iter().enumerate().skip(at + 1) {
        let s = cell.symbol();
        if is_border(s) {
            break;
        }
        if s == " " || s == "\u{a0}" {
            blanks += 1;
            if blanks > extra {
                end = Some(j);
                break;
            }
        } else {
            blanks = 0;
        }
    }
    let Some(end) = end else { return false };
    // Cells at+1 ..= end-extra-1 move to at+1+extra ..= end-1; cell `end` stays blank.
    let first_blank = end - extra;
    for j in (at + 1..first_blank).rev() {
        row[j + extra] = row[j].clone();
    }
    true
}

#[cfg(test)]
mod tests {
    use super::*;

    fn row_of(text: &str) -> Vec<Cell> {
        text.chars()
            .map(|c| {
                let mut cell = Cell::default();
                cell.set_symbol(c.encode_utf8(&mut [0; 4]));
                cell
            })
            .collect()
    }

    fn text_of(row: &[Cell]) -> String {
        row.iter().map(Cell::symbol).collect()
    }

    #[test]
    fn long_spellings_push_the_text_into_the_blanks_after_it() {
        let mut row = row_of("│12.0° wind·x   │ next");
        asciify_row(&mut row);
        assert_eq!(text_of(&row), "|12.0deg wind-x |+next".replace('+', " "));
    }

    #[test]
    fn without_room_the_spelling_is_cut_and_the_row_stays_ascii() {
        let mut row = row_of("a½b│");
        asciify_row(&mut row);
        assert_eq!(text_of(&row), "a1b|");
        let mut row = row_of("╭─ ⣿⠤ ηD █▖ ╮");
        asciify_row(&mut row);
        assert!(text_of(&row).is_ascii(), "{}", text_of(&row));
    }
}

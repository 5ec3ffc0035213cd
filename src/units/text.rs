//! Plain-ASCII text for terminals without UTF-8: the program's text style, the locale test,
//! and the fallback spelling of the few non-ASCII characters the program prints.

use std::sync::atomic::{AtomicBool, Ordering};

/// Whether quantities and labels are written in UTF-8 or in plain ASCII.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum TextStyle {
    /// UTF-8: "m²", "15 °C", "12.0°", "N·m", "—".
    #[default]
    Unicode,
    /// Plain ASCII: "m2", "15 degC", "12.0 deg", "N.m", "-".
    Ascii,
}

/// The program's text style: set once at start-up, read by [`super::format`] and
/// [`super::unit_label`]. Files are always written in UTF-8 whatever it is.
static ASCII: AtomicBool = AtomicBool::new(false);

/// Sets the program's text style to plain ASCII (`true`) or UTF-8 (`false`).
///
/// Meant to be called once at start-up, e.g. `set_ascii(args.ascii || !locale_is_utf8())`.
pub fn set_ascii(ascii: bool) {
    ASCII.store(ascii, Ordering::Relaxed);
}

/// The program's text style, as last set by [`set_ascii`] (UTF-8 until then).
pub fn text_style() -> TextStyle {
    if ASCII.load(Ordering::Relaxed) {
        TextStyle::Ascii
    } else {
        TextStyle::Unicode
    }
}

/// Whether the locale of this process asks for UTF-8, from LC_ALL, LC_CTYPE and LANG.
///
/// See [`locale_is_utf8_from`]; an unset or empty variable is skipped.
pub fn locale_is_utf8() -> bool {
    let var = |name: &str| std::env::var(name).ok();
    locale_is_utf8_from(
        var("LC_ALL").as_deref(),
        var("LC_CTYPE").as_deref(),
        var("LANG").as_deref(),
    )
}

/// Whether a locale given by the values of LC_ALL, LC_CTYPE and LANG is UTF-8.
///
/// The first of them that is set and not empty decides (POSIX precedence): it is UTF-8 when
/// it names the codeset "UTF-8" or "utf8" in any letter case ("en_GB.UTF-8", "C.utf8").
/// "C", "POSIX", a Latin-1 locale, or none set at all (the POSIX default "C") is not.
pub fn locale_is_utf8_from(
    lc_all: Option<&str>,
    lc_ctype: Option<&str>,
    lang: Option<&str>,
) -> bool {
    [lc_all, lc_ctype, lang]
        .into_iter()
        .flatten()
        .find(|value| !value.is_empty())
        .is_some_and(|value| {
            let lower = value.to_ascii_lowercase();
            lower.contains("utf-8") || lower.contains("utf8")
        })
}

/// `text` with every non-ASCII character spelled in ASCII: "1½" → "1 1/2", "°" → "deg",
/// "²" → "2", "−" → "-", "×" → "x", "→" → "->", box-drawing lines → "-", "|" and "+".
///
/// Characters without a known spelling become "?", so the result is always pure ASCII.
pub fn ascii_fallback(text: &str) -> String {
    if text.is_ascii() {
        return text.to_owned();
    }
    let mut out = String::with_capacity(text.len() + 8);
    let mut previous = ' ';
    for c in text.chars() {
        if c.is_ascii() {
            out.push(c);
        } else {
            // "1½" is one and a half: keep the whole number apart from "1/2".
            if matches!(c, '½' | '¼' | '¾') && previous.is_ascii_digit() {
                out.push(' ');
            }
            out.push_str(ascii_of(c));
        }
        previous = c;
    }
    out
}

/// The ASCII spelling of one non-ASCII character.
fn ascii_of(c: char) -> &'static str {
    match c {
        // Separators, signs and marks.
        '·' | '⋅' | '•' => "-",
        '−' | '–' | '—' | '‐' | '‑' => "-",
        '×' => "x",
        '÷' => "/",
        '±' => "+/-",
        '≈' | '∼' => "~",
        '≥' => ">=",
        '≤' => "<=",
        '≠' => "!=",
        '…' => "...",
        '‘' | '’' | '′' => "'",
        '“' | '”' | '″' => "\"",
        '\u{a0}' | '\u{2009}' | '\u{202f}' => " ",
        // Fractions, powers, degrees.
        '½' => "1/2",
        '¼' => "1/4",
        '¾' => "3/4",
        '²' => "2",
        '³' => "3",
        '°' | 'º' | '˚' => "deg",
        // Arrows and markers.
        '→' => "->",
        '←' => "<-",
        '↑' => "^",
        '↓' => "v",
        '↔' => "<->",
        '▶' | '▸' | '►' | '›' => ">",
        '‹' => "<",
        // A thin vertical bar: the typing cursor.
        '▏' | '▕' => "|",
        '◀' | '◂' | '◄' => "<",
        '▲' => "^",
        '▼' => "v",
        '✓' | '✔' => "ok",
        '✗' | '✘' => "x",
        '⚠' => "!",
        '●' | '◆' | '■' => "*",
        '○' | '◇' | '□' => "o",
        // Greek letters of the trade (ηD, η0, ρ, ν, Δ).
        'η' => "eta",
        'ρ' => "rho",
        'ν' => "nu",
        'Δ' => "d",
        'λ' => "lambda",
        'σ' => "sigma",
        'τ' => "tau",
        'μ' | 'µ' => "u",
        'π' => "pi",
        // Box drawing (U+2500–U+257F): lines and corners.
        '─' | '━' | '┄' | '┅' | '┈' | '┉' | '╌' | '╍' | '╴' | '╶' | '╸' | '╺' => {
            "-"
        }
        '│' | '┃' | '┆' | '┇' | '┊' | '┋' | '╎' | '╏' | '╵' | '╷' | '╹' | '╻' => {
            "|"
        }
        '═' => "=",
        '║' => "|",
        '\u{2500}'..='\u{257f}' => "+",
        // Block elements and shades.
        '\u{2580}'..='\u{259f}' => "#",
        // Braille patterns: blank stays blank, any dot is a mark.
        '\u{2800}' => " ",
        '\u{2801}'..='\u{28ff}' => "*",
        _ => "?",
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_character_the_program_prints_has_an_ascii_spelling() {
        let printed = "· ½ ² ³ ° − × → ← ↑ ↓ ▶ ◀ › ▏ ✓ ✗ ⚠ ≈ ≥ ≤ — – ηD η0 ─│┌┐└┘├┤┬┴┼╭╮╰╯═║ ⣿⠀█▄";
        let plain = ascii_fallback(printed);
        assert!(plain.is_ascii(), "{plain}");
        assert!(
            !plain.contains('?'),
            "a character without a spelling: {plain}"
        );
        assert_eq!(ascii_fallback("1½ in · 15 °C"), "1 1/2 in - 15 degC");
        assert_eq!(ascii_fallback("plain"), "plain");
        // The TUI's selection pointer and typing cursor.
        assert_eq!(ascii_fallback("›Pitch 17▏"), ">Pitch 17|");
    }

    #[test]
    fn unknown_characters_still_give_ascii() {
        let plain = ascii_fallback("Ærø 日本 🚤");
        assert!(plain.is_ascii(), "{plain}");
    }

    #[test]
    fn the_first_locale_variable_set_decides() {
        assert!(locale_is_utf8_from(None, None, Some("en_GB.UTF-8")));
        assert!(locale_is_utf8_from(Some("C.utf8"), None, None));
        assert!(!locale_is_utf8_from(Some("C"), Some("en_US.UTF-8"), None));
        assert!(!locale_is_utf8_from(
            None,
            Some("POSIX"),
            Some("en_US.UTF-8")
        ));
        assert!(locale_is_utf8_from(Some(""), Some("de_DE.utf8"), Some("C")));
        assert!(!locale_is_utf8_from(None, None, Some("de_DE.ISO-8859-1")));
        assert!(!locale_is_utf8_from(None, None, None));
    }
}

//! Reading a quantity written with its unit ("11.2 m", "36 ft 9 in", "2.5:1"): numbers,
//! unit names and the messages for what cannot be read.

use super::*;

/// Parses `text` as a quantity of `kind`, returning its value in the kind's internal unit.
///
/// The number may carry a sign, decimals and an exponent; the unit follows, with or without a
/// space. Lengths also accept feet and inches together ("36 ft 9 in", "36' 9\""). A bare
/// number is accepted only for [`Kind::Fraction`], where it is the fraction itself.
pub fn parse(text: &str, kind: Kind) -> Result<f64, UnitError> {
    let kind_info = info(kind);
    if is_blank(text) {
        return Err(UnitError::Blank {
            text: text.to_owned(),
            kind_name: kind_info.name,
            examples: kind_info.examples,
        });
    }
    let (number, after_number) = scan_number(text, skip_space(text, 0))?;
    refuse_comma(text, after_number)?;
    let unit_start = skip_space(text, after_number);
    let unit_end = scan_unit(text, unit_start);
    if unit_start == unit_end {
        if unit_start < text.len() {
            return Err(unknown_unit(text, unit_start, text.len(), kind_info));
        }
        return match kind {
            Kind::Fraction => finite(number, text),
            _ => Err(UnitError::MissingUnit {
                text: text.to_owned(),
                kind_name: kind_info.name,
                examples: kind_info.examples,
            }),
        };
    }
    let unit = find_unit(kind_info, &text[unit_start..unit_end])
        .ok_or_else(|| unknown_unit(text, unit_start, unit_end, kind_info))?;
    let mut value = (number - unit.zero) * unit.scale;
    let mut rest = skip_space(text, unit_end);
    let is_length = matches!(kind, Kind::Length | Kind::ScrewLength);
    let is_feet = unit.aliases.first() == table::FOOT_UNIT.aliases.first();
    if is_length && is_feet && starts_unsigned_number(text, rest) {
        let (inches, after_inches) = scan_number(text, rest)?;
        let inch_start = skip_space(text, after_inches);
        let inch_end = scan_unit(text, inch_start);
        if inch_start == inch_end {
            if inch_start < text.len() {
                return Err(unknown_inches(text, inch_start, text.len()));
            }
            return Err(UnitError::MissingUnit {
                text: text.to_owned(),
                kind_name: "feet and inches",
                examples: "36 ft 9 in, 36' 9\"",
            });
        }
        let inch_unit = find_unit_in(
            &text[inch_start..inch_end],
            std::slice::from_ref(table::INCH_UNIT),
        )
        .ok_or_else(|| unknown_inches(text, inch_start, inch_end))?;
        // The sign written before the feet applies to the whole length.
        value += (inches * inch_unit.scale).copysign(number);
        rest = skip_space(text, inch_end);
    }
    if rest < text.len() {
        return Err(UnitError::Trailing {
            text: text.to_owned(),
            rest: text[rest..].trim_end().to_owned(),
            position: char_position(text, rest),
        });
    }
    finite(value, text)
}

/// Parses a gear ratio (engine turns per screw turn): "2.5", "2.5:1", "2.5 : 1" or "5:2".
///
/// Refuses zero, negative and inverted ratios ("1:2.5", or a plain number below 1): a marine
/// reduction gear turns the screw slower than the engine (common practice). A decimal comma
/// ("2,5:1") gets "use a decimal point". The ratio's upper limit is the profile's to check.
pub fn parse_ratio(text: &str) -> Result<f64, UnitError> {
    let bad = |reason: String| UnitError::BadRatio {
        text: text.to_owned(),
        reason,
    };
    let trimmed = text.trim();
    if trimmed.is_empty() || is_blank(trimmed) {
        return Err(bad(
            "expected engine turns per screw turn, such as 2.5 or 2.5:1".to_owned(),
        ));
    }
    let mut sides = Vec::new();
    for side in text.split(':') {
        let start = skip_space(text, side.as_ptr() as usize - text.as_ptr() as usize);
        let end = start + side.trim().len();
        let (number, after) = scan_number(text, start).map_err(|_| {
            bad("expected a plain number, or two joined by a colon, such as 2.5 or 2.5:1".into())
        })?;
        refuse_comma(text, after)?;
        if after != end {
            return Err(bad(format!(
                "unexpected {:?}; expected a plain number, or two joined by a colon, such as 2.5:1",
                text[after..end].trim()
            )));
        }
        sides.push(number);
    }
    let ratio = match sides.as_slice() {
        [ratio] => *ratio,
        [_, screw] if *screw <= 0.0 => {
            return Err(bad(
                "the screw side of the ratio must be above 0, as in 2.5:1".into(),
            ));
        }
        [engine, screw] => engine / screw,
        _ => return Err(bad("expected at most one colon, as in 2.5:1".into())),
    };
    if !ratio.is_finite() || ratio <= 0.0 {
        return Err(bad("expected a ratio above 0, such as 2.5 or 2.5:1".into()));
    }
    if ratio < 1.0 {
        let inverted = 1.0 / ratio;
        return Err(bad(format!(
            "written the wrong way round (the screw would turn faster than the engine); write \
             engine turns per screw turn: {}:1",
            trim_number(&format!("{inverted:.3}"))
        )));
    }
    Ok(ratio)
}

/// Whether `text` is a template's blank: "FILL IN", in any letter case, perhaps with more after.
pub(super) fn is_blank(text: &str) -> bool {
    let trimmed = text.trim_start();
    trimmed
        .get(..7)
        .is_some_and(|start| start.eq_ignore_ascii_case("fill in"))
}

/// Refuses a comma right after a number ending at byte `after` when a digit follows it.
pub(super) fn refuse_comma(text: &str, after: usize) -> Result<(), UnitError> {
    let bytes = text.as_bytes();
    if bytes.get(after) != Some(&b',') || !bytes.get(after + 1).is_some_and(u8::is_ascii_digit) {
        return Ok(());
    }
    let digits = bytes[after + 1..]
        .iter()
        .take_while(|b| b.is_ascii_digit())
        .count();
    let before_digits = bytes[..after]
        .iter()
        .rev()
        .take_while(|b| b.is_ascii_digit())
        .count();
    let integer_part = before_digits > 0 && bytes[..after - before_digits].last() != Some(&b'.');
    let with = |mark: &str| format!("{}{mark}{}", &text[..after], &text[after + 1..]);
    Err(UnitError::Comma {
        text: text.to_owned(),
        position: char_position(text, after),
        suggestion: with(".").trim().to_owned(),
        thousands: (digits == 3 && before_digits <= 3 && integer_part)
            .then(|| with("").trim().to_owned()),
    })
}

/// The message for a number written with a comma.
pub(super) fn comma_message(text: &str, suggestion: &str, thousands: Option<&str>) -> String {
    if let Some(whole) = thousands {
        format!(
            "{text:?} has a comma in its number; write {whole} without a thousands separator, \
             or use a decimal point: {suggestion}"
        )
    } else {
        format!("{text:?} has a decimal comma; use a decimal point: {suggestion}")
    }
}

/// Returns `value` if finite, else the out-of-range error for `text`.
pub(super) fn finite(value: f64, text: &str) -> Result<f64, UnitError> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(UnitError::NotFinite {
            text: text.to_owned(),
        })
    }
}

/// The 0-based character offset of byte offset `byte` in `text`.
pub(super) fn char_position(text: &str, byte: usize) -> usize {
    text[..byte].chars().count()
}

/// The byte offset of the first non-whitespace character at or after `from`.
pub(super) fn skip_space(text: &str, from: usize) -> usize {
    text[from..]
        .char_indices()
        .find(|(_, c)| !c.is_whitespace())
        .map_or(text.len(), |(offset, _)| from + offset)
}

/// Whether an unsigned number starts at `at` (a digit, or a point followed by a digit).
pub(super) fn starts_unsigned_number(text: &str, at: usize) -> bool {
    let bytes = &text.as_bytes()[at..];
    match bytes {
        [first, ..] if first.is_ascii_digit() => true,
        [b'.', second, ..] => second.is_ascii_digit(),
        _ => false,
    }
}

/// Reads a number starting at byte `start`: sign, digits, decimals, exponent.
/// Returns its value and the byte offset just past it.
pub(super) fn scan_number(text: &str, start: usize) -> Result<(f64, usize), UnitError> {
    let bytes = text.as_bytes();
    let mut at = start;
    let mut literal = String::new();
    if let Some(rest) = text[at..].strip_prefix('−') {
        // U+2212 MINUS SIGN, as typeset documents write it.
        literal.push('-');
        at = text.len() - rest.len();
    } else if matches!(bytes.get(at), Some(b'+' | b'-')) {
        literal.push(char::from(bytes[at]));
        at += 1;
    }
    let digits_start = at;
    let mut digit_count = 0;
    while let Some(byte) = bytes.get(at) {
        if byte.is_ascii_digit() {
            digit_count += 1;
        } else if *byte != b'.' || text[digits_start..at].contains('.') {
            break;
        }
        at += 1;
    }
    if digit_count == 0 {
        return Err(UnitError::NoNumber {
            text: text.to_owned(),
            position: char_position(text, start),
        });
    }
    if matches!(bytes.get(at), Some(b'e' | b'E')) {
        let mut exponent_end = at + 1;
        if matches!(bytes.get(exponent_end), Some(b'+' | b'-')) {
            exponent_end += 1;
        }
        let exponent_digits = bytes[exponent_end..]
            .iter()
            .take_while(|b| b.is_ascii_digit())
            .count();
        if exponent_digits > 0 {
            at = exponent_end + exponent_digits;
        }
    }
    literal.push_str(&text[digits_start..at]);
    let value: f64 = literal.parse().map_err(|_| UnitError::NoNumber {
        text: text.to_owned(),
        position: char_position(text, start),
    })?;
    if !value.is_finite() {
        return Err(UnitError::NotFinite {
            text: text.to_owned(),
        });
    }
    Ok((value, at))
}

/// Characters that may appear in a unit, besides letters.
pub(super) fn is_unit_symbol(c: char) -> bool {
    matches!(
        c,
        '/' | '·'
            | '⋅'
            | '•'
            | '*'
            | '('
            | ')'
            | '^'
            | '²'
            | '³'
            | '°'
            | 'º'
            | '˚'
            | '%'
            | '\''
            | '"'
            | '′'
            | '″'
            | '’'
            | '‘'
            | '”'
            | '“'
    )
}

/// Finds the end (byte offset) of the unit starting at `start`; equal to `start` if none.
///
/// A unit is letters and unit symbols; it may contain spaces ("US gal", "lb/(hp · h)"), a
/// joining `.` or `-` ("lbf-ft"), and a power digit 2 or 3 after a letter ("m3", "ft²"). It
/// stops before a number, so that "36 ft 9 in" yields "ft" first.
pub(super) fn scan_unit(text: &str, start: usize) -> usize {
    let chars: Vec<(usize, char)> = text[start..].char_indices().collect();
    let mut end = start;
    let mut previous: Option<char> = None;
    for (index, &(offset, c)) in chars.iter().enumerate() {
        let next = chars.get(index + 1).map(|&(_, n)| n);
        let after_letter = previous.is_some_and(|p| p.is_alphabetic() || p == '^');
        let accepted = if c.is_alphabetic() || is_unit_symbol(c) {
            true
        } else if c == '.' || c == '-' {
            previous.is_some_and(|p| p.is_alphabetic() || p == ')')
                && next.is_some_and(|n| n.is_alphabetic() || n == '(')
        } else if c == '2' || c == '3' {
            after_letter && !next.is_some_and(|n| n.is_alphanumeric() || n == '.')
        } else if c.is_whitespace() {
            previous.is_some()
                && chars[index..]
                    .iter()
                    .map(|&(_, n)| n)
                    .find(|n| !n.is_whitespace())
                    .is_some_and(|n| {
                        n.is_alphabetic() || (is_unit_symbol(n) && n != '\'' && n != '"')
                    })
        } else {
            false
        };
        if !accepted {
            break;
        }
        if !c.is_whitespace() {
            end = start + offset + c.len_utf8();
        }
        previous = Some(c);
    }
    end
}

/// The unit as written, reduced to the form the tables list: no spaces or joining marks,
/// superscript powers as digits, typographic quotes as ASCII.
pub(super) fn normalise(unit: &str) -> String {
    unit.chars()
        .filter_map(|c| match c {
            c if c.is_whitespace() => None,
            '·' | '⋅' | '•' | '*' | '-' | '(' | ')' | '^' | '.' => None,
            '²' => Some('2'),
            '³' => Some('3'),
            '′' | '’' | '‘' => Some('\''),
            '″' | '”' | '“' => Some('"'),
            'º' | '˚' => Some('°'),
            c => Some(c),
        })
        .collect()
}

/// The unit of `kind_info` written as `written`, if any.
pub(super) fn find_unit(kind_info: &'static KindInfo, written: &str) -> Option<&'static UnitDef> {
    find_unit_in(written, kind_info.units)
}

/// The unit among `units` written as `written`: an exact spelling first; otherwise a spelling
/// in another letter case, for units where case carries no meaning, if exactly one matches.
pub(super) fn find_unit_in(written: &str, units: &'static [UnitDef]) -> Option<&'static UnitDef> {
    let normal = normalise(written);
    if let Some(exact) = units.iter().find(|u| u.aliases.contains(&normal.as_str())) {
        return Some(exact);
    }
    let lower = normal.to_lowercase();
    let mut folded = units
        .iter()
        .filter(|u| u.fold && u.aliases.iter().any(|a| a.to_lowercase() == lower));
    match (folded.next(), folded.next()) {
        (Some(only), None) => Some(only),
        _ => None,
    }
}

/// The error for an unknown unit spanning bytes `start..end` of `text`.
pub(super) fn unknown_unit(
    text: &str,
    start: usize,
    end: usize,
    kind_info: &KindInfo,
) -> UnitError {
    UnitError::UnknownUnit {
        text: text.to_owned(),
        unit: text[start..end].trim_end().to_owned(),
        position: char_position(text, start),
        kind_name: kind_info.name,
        examples: kind_info.accepted,
    }
}

/// The error for something other than inches after a number of feet.
pub(super) fn unknown_inches(text: &str, start: usize, end: usize) -> UnitError {
    UnitError::UnknownUnit {
        text: text.to_owned(),
        unit: text[start..end].trim_end().to_owned(),
        position: char_position(text, start),
        kind_name: "the inches after the feet",
        examples: "in or \", as in 36 ft 9 in",
    }
}

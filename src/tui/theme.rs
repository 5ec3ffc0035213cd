//! Colours and emphasis; with NO_COLOR set only bold, reverse and underline are used, so the
//! screen reads the same without colour (markers and labels carry the meaning, not colour).

use ratatui::style::{Color, Modifier, Style};

/// The styles the screen draws with.
#[derive(Debug, Clone, PartialEq)]
pub struct Theme {
    /// Whether colours are used at all.
    pub colour: bool,
    /// The focused pane's border and the selection pointer.
    pub focus: Style,
    /// Secondary text: hints, unfocused borders, explanations.
    pub dim: Style,
    /// Warnings and their markers.
    pub warning: Style,
    /// Invalid input and errors.
    pub error: Style,
    /// Recommendations and the readout's key figures.
    pub accent: Style,
    /// Styles for chart series, cycled per variant.
    pub series: [Style; 4],
}

impl Theme {
    /// The coloured theme.
    pub fn coloured() -> Self {
        Self {
            colour: true,
            focus: Style::default().fg(Color::Cyan),
            dim: Style::default().fg(Color::Gray),
            warning: Style::default().fg(Color::Yellow),
            error: Style::default().fg(Color::Red).add_modifier(Modifier::BOLD),
            accent: Style::default().fg(Color::Green),
            series: [
                Style::default().fg(Color::Cyan),
                Style::default().fg(Color::Magenta),
                Style::default().fg(Color::Yellow),
                Style::default().fg(Color::Blue),
            ],
        }
    }

    /// The theme without colour (NO_COLOR).
    pub fn plain() -> Self {
        Self {
            colour: false,
            focus: Style::default().add_modifier(Modifier::BOLD),
            dim: Style::default(),
            warning: Style::default().add_modifier(Modifier::BOLD),
            error: Style::default().add_modifier(Modifier::BOLD | Modifier::UNDERLINED),
            accent: Style::default(),
            series: [Style::default(); 4],
        }
    }

    /// The theme the environment asks for: plain when NO_COLOR is set to anything non-empty
    /// (the NO_COLOR convention, no-color.org).
    pub fn from_env() -> Self {
        match std::env::var_os("NO_COLOR") {
            Some(v) if !v.is_empty() => Self::plain(),
            _ => Self::coloured(),
        }
    }

    /// The colour of full-load envelope and other reference lines.
    pub fn reference(&self) -> Style {
        if self.colour {
            Style::default().fg(Color::White)
        } else {
            Style::default()
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn plain_theme_has_no_colours() {
        let t = Theme::plain();
        for s in [t.focus, t.dim, t.warning, t.error, t.accent, t.reference()]
            .iter()
            .chain(t.series.iter())
        {
            assert_eq!(s.fg, None);
            assert_eq!(s.bg, None);
        }
        assert!(Theme::coloured().focus.fg.is_some());
    }
}

//! The sea-trial view: the logged points beside the model and the fitted correction.

use super::{heading, number};
use crate::tui::app::App;
use crate::units::{self, Kind};
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};

pub(crate) fn calibration_lines(
    app: &App,
    view: &crate::tui::analysis::CalibrationView,
) -> Vec<Line<'static>> {
    let system = app.units;
    let mut lines = crate::tui::ui::live::captured_lines(app);
    let applied = match view.applied {
        Some(k) => format!("calibrated ×{k:.3} is applied to every prediction"),
        None => "no calibration applied".to_string(),
    };
    let cal = match &view.result {
        Ok(c) => c,
        Err(why) => {
            lines.push(Line::styled(why.clone(), app.theme.warning));
            lines.push(Line::styled(applied, app.theme.dim));
            return lines;
        }
    };
    lines.push(heading(
        app,
        format!(
            "Sea trial{}: {}, model without correction vs measured",
            view.trial_date
                .as_ref()
                .map(|d| format!(" of {d}"))
                .unwrap_or_default(),
            crate::report::count(view.runs, "run", "runs")
        ),
    ));
    lines.push(Line::styled(
        "Runs at one rpm in opposite directions are averaged (Out mean + Back mean)/2, which cancels a steady current.",
        app.theme.dim,
    ));
    let unit = units::unit_label(Kind::Speed, system);
    lines.push(Line::styled(
        format!(
            "{:>6} {:>13} {:>8} {:>9} {:>9} {:>10}",
            "rpm", "runs", "current", "measured", "predicted", "calibrated"
        ),
        Style::default().add_modifier(Modifier::BOLD),
    ));
    lines.push(Line::styled(
        format!(
            "{:>6} {:>13} {:>8} {:>9} {:>9} {:>10}",
            "", "", unit, unit, unit, unit
        ),
        app.theme.dim,
    ));
    for p in &cal.points {
        let runs = if p.two_way {
            format!("{} two-way", p.runs)
        } else {
            format!("{} one-way", p.runs)
        };
        lines.push(Line::raw(format!(
            "{:>6.0} {:>13} {:>8} {:>9} {:>9} {:>10}",
            p.engine_rpm,
            runs,
            number(p.current, Kind::Speed, system, 2),
            number(Some(p.measured_speed), Kind::Speed, system, 2),
            number(p.predicted_before, Kind::Speed, system, 2),
            number(p.predicted_after, Kind::Speed, system, 2),
        )));
    }
    lines.push(Line::from(vec![
        Span::raw("RMS error: before "),
        Span::styled(
            units::format(cal.rms_before, Kind::Speed, system),
            app.theme.warning,
        ),
        Span::raw(" → after "),
        Span::styled(
            units::format(cal.rms_after, Kind::Speed, system),
            app.theme.accent,
        ),
    ]));
    lines.push(Line::from(vec![
        Span::raw("Fitted resistance factor "),
        Span::styled(
            format!("×{:.3}", cal.resistance_factor),
            app.theme.accent.add_modifier(Modifier::BOLD),
        ),
        Span::raw(format!(
            " (least squares on speed, over {:.1}–{:.1}); a applies it to the boat",
            0.5, 2.0
        )),
    ]));
    lines.push(Line::styled(
        format!(
            "on calm, clean-hull resistance: predicted without the service margin {:.0} % and fouling {:.0} %, which go on top",
            cal.service_margin * 100.0,
            cal.fouling * 100.0
        ),
        app.theme.dim,
    ));
    if let Some(w) = cal.wake_fraction {
        lines.push(Line::raw(format!("Fitted wake fraction {w:.3}")));
    }
    let d = crate::report::Display::new(system);
    lines.push(Line::raw(format!(
        "{}; F applies it",
        crate::report::design::froude_fit_line(cal, &view.froude, &d)
            .trim_end_matches("; `--save --by-froude` saves it")
    )));
    if !view.installation.is_empty() {
        lines.push(Line::styled(
            format!(
                "fitted through {}; the factor belongs to the hull and applies to every installation",
                view.installation
            ),
            app.theme.dim,
        ));
    }
    lines.push(Line::styled(applied, app.theme.dim));
    for w in &cal.warnings {
        lines.push(Line::styled(format!("! {w}"), app.theme.warning));
    }
    lines
}

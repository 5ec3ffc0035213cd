//! The sweep view: one parameter swept, the candidates ranked.

use super::{UNRELIABLE_TOP_LEGEND, dash, heading, number, top_speed};
use crate::propulsion::solver::sweep::SweepCandidate;
use crate::tui::analysis::SweepOver;
use crate::tui::app::App;
use crate::units::{self, Kind, UnitSystem};
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};

fn sweep_value(over: SweepOver, value: f64, system: UnitSystem) -> String {
    match over {
        SweepOver::Diameter => units::format(value, Kind::ScrewLength, system),
        SweepOver::GearRatio => format!("{value:.2}:1"),
        SweepOver::Blades => format!("{value:.0}"),
        SweepOver::AreaRatio => format!("{value:.2}"),
    }
}

pub(crate) fn sweep_lines(app: &App, view: &crate::tui::analysis::SweepView) -> Vec<Line<'static>> {
    let system = app.units;
    let choices: Vec<String> = SweepOver::ALL
        .iter()
        .map(|o| {
            let name = match o {
                SweepOver::Diameter => "diameter",
                SweepOver::GearRatio => "gear ratio",
                SweepOver::Blades => "blades",
                SweepOver::AreaRatio => "area ratio",
            };
            if *o == view.over {
                format!("[{name}]")
            } else {
                name.to_string()
            }
        })
        .collect();
    let mut lines = vec![Line::from(vec![
        Span::styled("n sweeps: ", app.theme.dim),
        Span::raw(choices.join(" · ")),
    ])];
    let result = match &view.result {
        Ok(r) => r,
        Err(why) => {
            lines.push(Line::styled(
                format!("No sweep of {}: {why}", view.label),
                app.theme.error,
            ));
            return lines;
        }
    };
    lines.push(heading(
        app,
        format!("Sweep of {} for {}", result.parameter, view.label),
    ));
    lines.push(Line::from(vec![
        Span::raw("Ranked by "),
        Span::styled(result.criterion, app.theme.accent),
    ]));
    let mut setting = format!(
        "Each pitched to {}; target {}",
        result.target.describe(),
        units::format(result.target_speed, Kind::Speed, system)
    );
    if let Some(d) = view.max_diameter {
        setting.push_str(&format!(
            "; largest screw the aperture takes (tip clearance kept) {}",
            units::format(d, Kind::ScrewLength, system)
        ));
    }
    lines.push(Line::styled(setting, app.theme.dim));
    let fuel_unit = units::unit_label(Kind::FuelPerDistance, system);
    let len_unit = units::unit_label(Kind::ScrewLength, system);
    let speed_unit = units::unit_label(Kind::Speed, system);
    lines.push(Line::styled(
        format!(
            "{:>4} {:>10} {:>8} {:>5} {:>6} {:>6} {:>6} {:>6} {:>9}",
            "rank",
            match view.over {
                SweepOver::Diameter => "diameter",
                SweepOver::GearRatio => "gear",
                SweepOver::Blades => "blades",
                SweepOver::AreaRatio => "AE/A0",
            },
            format!("pitch {len_unit}"),
            "P/D",
            format!("top {speed_unit}"),
            // The ranking is by ηD (propulsive efficiency), so it is shown first.
            "ηD tgt",
            "η0 tgt",
            "η0 top",
            fuel_unit,
        ),
        Style::default().add_modifier(Modifier::BOLD),
    ));
    let mut unsolved = Vec::new();
    for c in &result.candidates {
        if c.pitch.is_none() || c.problem.is_some() && c.top_speed.is_none() {
            unsolved.push(c);
        }
        lines.push(candidate_line(app, view.over, c));
    }
    if result
        .candidates
        .iter()
        .any(|c| c.top_speed_in_method_range == Some(false))
    {
        lines.push(Line::styled(UNRELIABLE_TOP_LEGEND, app.theme.warning));
    }
    for c in unsolved {
        lines.push(Line::styled(
            format!(
                "  {} not solved: {}",
                sweep_value(view.over, c.value, system),
                c.problem.as_deref().map_or_else(
                    || format!("{:?}", c.stop),
                    |p| crate::units::in_system(p, system)
                )
            ),
            app.theme.warning,
        ));
    }
    lines
}

fn candidate_line(app: &App, over: SweepOver, c: &SweepCandidate) -> Line<'static> {
    let system = app.units;
    let pitch_ratio = c.pitch.map(|p| p / c.geometry.diameter);
    let eta = |v: Option<f64>| v.map_or_else(dash, |v| format!("{v:.3}"));
    let text = format!(
        "{:>4} {:>10} {:>8} {:>5} {:>6} {:>6} {:>6} {:>6} {:>9}",
        c.rank,
        sweep_value(over, c.value, system),
        number(c.pitch, Kind::ScrewLength, system, 1),
        pitch_ratio.map_or_else(dash, |r| format!("{r:.2}")),
        top_speed(c.top_speed, c.top_speed_in_method_range, system, 1),
        eta(c.propulsive_efficiency_at_target),
        eta(c.open_water_efficiency_at_target),
        eta(c.open_water_efficiency_at_top),
        number(
            c.fuel_per_distance_at_target,
            Kind::FuelPerDistance,
            system,
            3
        ),
    );
    if c.rank == 1 && c.pitch.is_some() {
        Line::styled(format!("{text}  ◀ best"), app.theme.accent)
    } else if let Some(leader) = c.tie_with {
        // The one tie rule of the study, as the CLI's sweep and the shortlist mark it.
        Line::raw(format!("{text}  = #{leader}"))
    } else {
        Line::raw(text)
    }
}

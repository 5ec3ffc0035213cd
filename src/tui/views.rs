//! Drawing the design views — sweep, sea-trial calibration, what-if — from the results cached
//! in the app state ([`super::analysis`]); pure like the rest of the drawing.

use super::analysis::{SweepOver, ViewData, ViewKind};
use super::app::App;
use super::render::CAUTION;
use super::solve::{CheckPoint, Checks};
use crate::propulsion::screw::cavitation::{CavitationReport, PASCALS_PER_PSI};
use crate::propulsion::solver::Verdict;
use crate::propulsion::solver::conditions::ConditionOutcome;
use crate::propulsion::solver::sweep::SweepCandidate;
use crate::units::{self, Kind, UnitSystem};
use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Borders, Clear, Paragraph, Widget, Wrap};

/// The mark beside a check past its limit (readable without colour).
pub const PAST_LIMIT: &str = "⚠ PAST LIMIT";

fn dash() -> String {
    "—".to_string()
}

/// A number in display units without its unit, or a dash.
fn number(value: Option<f64>, kind: Kind, system: UnitSystem, decimals: usize) -> String {
    match value.map(|v| units::to_display(v, kind, system)) {
        Some(v) if v.is_finite() => format!("{v:.decimals$}"),
        _ => dash(),
    }
}

/// The legend of a ≈-marked top speed.
const UNRELIABLE_TOP_LEGEND: &str =
    "≈ top speed outside the resistance method's range: unreliable, a sea trial decides";

/// A top speed, marked ≈ when it lies outside the resistance method's range (unreliable).
fn top_speed(
    value: Option<f64>,
    in_range: Option<bool>,
    system: UnitSystem,
    decimals: usize,
) -> String {
    let text = number(value, Kind::Speed, system, decimals);
    if in_range == Some(false) && value.is_some() {
        format!("≈{text}")
    } else {
        text
    }
}

fn short_verdict(verdict: Option<Verdict>) -> &'static str {
    match verdict {
        Some(Verdict::Over) => "OVER",
        Some(Verdict::Matched) => "matched",
        Some(Verdict::Under) => "UNDER",
        None => "—",
    }
}

fn heading(app: &App, text: impl Into<String>) -> Line<'static> {
    Line::styled(text.into(), app.theme.focus.add_modifier(Modifier::BOLD))
}

/// Draws the open view over `area` (the panes, chart and readout).
pub fn draw_view(app: &App, kind: ViewKind, scroll: u16, area: Rect, buf: &mut Buffer) {
    Clear.render(area, buf);
    let tabs: Vec<String> = ViewKind::ALL
        .iter()
        .map(|k| {
            if *k == kind {
                format!("[{}]", k.title())
            } else {
                k.title().to_string()
            }
        })
        .collect();
    let block = Block::default()
        .borders(Borders::ALL)
        .border_style(app.theme.focus)
        .title(format!(" {} ", tabs.join(" · ")));
    let inner = block.inner(area);
    block.render(area, buf);
    let lines = view_lines(app, inner.width as usize);
    let wrapped: u16 = lines
        .iter()
        .map(|l| super::field_list::wrapped_height(&l.to_string(), inner.width))
        .sum();
    let last_top = wrapped.saturating_sub(inner.height);
    Paragraph::new(lines)
        .wrap(Wrap { trim: false })
        .scroll((scroll.min(last_top), 0))
        .render(inner, buf);
}

/// The open view's lines for a width of `width` columns.
pub fn view_lines(app: &App, width: usize) -> Vec<Line<'static>> {
    let mut lines = match &app.view {
        Some(ViewData::Sweep(v)) => sweep_lines(app, v),
        Some(ViewData::Calibration(v)) => calibration_lines(app, v),
        Some(ViewData::WhatIf(v)) => what_if_lines(app, v, width),
        None => vec![Line::raw("nothing solved for this view")],
    };
    lines.push(Line::default());
    lines.push(Line::styled(CAUTION, app.theme.dim));
    lines
}

fn sweep_value(over: SweepOver, value: f64, system: UnitSystem) -> String {
    match over {
        SweepOver::Diameter => units::format(value, Kind::ScrewLength, system),
        SweepOver::GearRatio => format!("{value:.2}:1"),
        SweepOver::Blades => format!("{value:.0}"),
        SweepOver::AreaRatio => format!("{value:.2}"),
    }
}

fn sweep_lines(app: &App, view: &super::analysis::SweepView) -> Vec<Line<'static>> {
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
            "{:>4} {:>10} {:>8} {:>5} {:>6} {:>6} {:>6} {:>9}",
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
                c.problem.clone().unwrap_or_else(|| format!("{:?}", c.stop))
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
        "{:>4} {:>10} {:>8} {:>5} {:>6} {:>6} {:>6} {:>9}",
        c.rank,
        sweep_value(over, c.value, system),
        number(c.pitch, Kind::ScrewLength, system, 1),
        pitch_ratio.map_or_else(dash, |r| format!("{r:.2}")),
        top_speed(c.top_speed, c.top_speed_in_method_range, system, 1),
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
    } else {
        Line::raw(text)
    }
}

fn calibration_lines(app: &App, view: &super::analysis::CalibrationView) -> Vec<Line<'static>> {
    let system = app.units;
    let mut lines = Vec::new();
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
            "Sea trial{}: {} runs, model without correction vs measured",
            view.trial_date
                .as_ref()
                .map(|d| format!(" of {d}"))
                .unwrap_or_default(),
            view.runs
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
    lines.push(Line::styled(applied, app.theme.dim));
    for w in &cal.warnings {
        lines.push(Line::styled(format!("! {w}"), app.theme.warning));
    }
    lines
}

fn what_if_lines(
    app: &App,
    view: &super::analysis::WhatIfView,
    width: usize,
) -> Vec<Line<'static>> {
    let system = app.units;
    let mut lines = vec![heading(
        app,
        format!("{} under each condition (same screw)", view.label),
    )];
    match &view.outcomes {
        Ok(outcomes) => lines.extend(outcome_table(app, outcomes, width)),
        Err(why) => lines.push(Line::styled(
            format!("no comparison: {why}"),
            app.theme.error,
        )),
    }
    lines.push(Line::default());
    lines.push(heading(app, "Uncertainty (displacement ±10 %, wake ±0.05)"));
    match &app.band {
        Some(Ok(band)) => {
            let f = |p: Option<f64>| {
                p.map_or_else(dash, |p| units::format(p, Kind::ScrewLength, system))
            };
            let mut text = format!(
                "Recommended pitch {} with range {} to {}",
                f(band.pitch_nominal),
                f(band.pitch_low),
                f(band.pitch_high)
            );
            if band.unsolved_cases > 0 {
                text.push_str(&format!(" ({} cases unsolved)", band.unsolved_cases));
            }
            lines.push(Line::styled(text, app.theme.accent));
            if let Some(condition) = app.solution.recommendation_condition(system) {
                lines.push(Line::styled(format!("made for {condition}"), app.theme.dim));
            }
            lines.push(Line::styled(
                "b draws the band on the power chart",
                app.theme.dim,
            ));
        }
        Some(Err(why)) => lines.push(Line::styled(format!("no band: {why}"), app.theme.error)),
        None => {}
    }
    if let Some(solved) = app.solution.solved() {
        lines.push(Line::default());
        lines.push(heading(app, "Cavitation, shaft and engine duty"));
        lines.extend(check_lines(app, &solved.checks));
    }
    lines
}

fn outcome_table(app: &App, outcomes: &[ConditionOutcome], width: usize) -> Vec<Line<'static>> {
    let system = app.units;
    let label_width = 14;
    let cell = ((width.saturating_sub(label_width)) / outcomes.len().max(1)).clamp(7, 12);
    let density = app
        .solution
        .solved()
        .map_or(1025.0, |s| s.vessel.resistance.water.density);
    let row = |label: String, cells: Vec<String>, style: Style| {
        let mut text = format!("{label:<label_width$}");
        for c in cells {
            let c: String = c.chars().take(cell - 1).collect();
            text.push_str(&format!("{c:>cell$}"));
        }
        Line::styled(text, style)
    };
    let u = |k: Kind| units::unit_label(k, system);
    let bold = Style::default().add_modifier(Modifier::BOLD);
    let mut lines = vec![row(
        String::new(),
        outcomes.iter().map(|o| o.condition.label.clone()).collect(),
        bold,
    )];
    let each = |f: &dyn Fn(&ConditionOutcome) -> String| outcomes.iter().map(f).collect();
    lines.push(row(
        format!("displ. {}", u(Kind::Mass)),
        each(&|o| {
            number(
                Some(o.condition.displacement_volume * density),
                Kind::Mass,
                system,
                if system == UnitSystem::Metric { 2 } else { 0 },
            )
        }),
        Style::default(),
    ));
    lines.push(row(
        "verdict".into(),
        each(&|o| short_verdict(o.verdict).to_string()),
        bold,
    ));
    lines.push(row(
        "full-thr. rpm".into(),
        each(&|o| o.full_throttle_rpm.map_or_else(dash, |r| format!("{r:.0}"))),
        Style::default(),
    ));
    lines.push(row(
        format!("top {}", u(Kind::Speed)),
        each(&|o| top_speed(o.top_speed, o.top_speed_in_method_range, system, 2)),
        Style::default(),
    ));
    lines.push(row(
        "absorbed %".into(),
        each(&|o| {
            o.absorbed_fraction_at_rated
                .map_or_else(dash, |a| format!("{:.0}", a * 100.0))
        }),
        Style::default(),
    ));
    lines.push(row(
        "cruise rpm".into(),
        each(&|o| o.cruise_rpm.map_or_else(dash, |r| format!("{r:.0}"))),
        Style::default(),
    ));
    lines.push(row(
        format!("power {}", u(Kind::Power)),
        each(&|o| number(o.cruise_power, Kind::Power, system, 1)),
        Style::default(),
    ));
    lines.push(row(
        format!("fuel {}", u(Kind::FuelRate)),
        each(&|o| number(o.cruise_fuel_volume_flow, Kind::FuelRate, system, 2)),
        Style::default(),
    ));
    lines.push(Line::styled(
        format!(
            "cruise = at the target speed {}; fouled adds {:.0} % friction, sea state {:.0} % margin",
            units::format(
                app.solution
                    .solved()
                    .map_or(0.0, |s| s.vessel.trip.target_speed),
                Kind::Speed,
                system
            ),
            super::analysis::FOULED_EXTRA * 100.0,
            super::analysis::SEA_STATE_EXTRA * 100.0
        ),
        app.theme.dim,
    ));
    if outcomes
        .iter()
        .any(|o| o.top_speed_in_method_range == Some(false))
    {
        lines.push(Line::styled(UNRELIABLE_TOP_LEGEND, app.theme.warning));
    }
    for o in outcomes {
        if let Some(p) = &o.problem {
            lines.push(Line::styled(
                format!("{}: {p}", o.condition.label),
                app.theme.warning,
            ));
        }
    }
    lines
}

fn mark(passed: bool) -> &'static str {
    if passed { "ok" } else { PAST_LIMIT }
}

/// One point's cavitation figures: Keller, Burrill, blade loading and tip speed.
pub fn cavitation_text(report: &CavitationReport, system: UnitSystem) -> String {
    let k = &report.keller_area_ratio;
    let b = &report.thrust_loading;
    let l = &report.blade_loading;
    let tip = match system {
        UnitSystem::Metric => format!("{:.1} m/s", report.tip_speed),
        UnitSystem::Imperial => format!("{:.0} ft/s", report.tip_speed / 0.3048),
    };
    format!(
        "Keller AE/A0 {:.2} vs min {:.2} {} · Burrill τc {:.3} vs {:.3} {} · loading {:.1} psi / {:.0} kPa vs {:.0} psi {} · tip {tip}",
        k.value,
        k.limit,
        mark(k.passed),
        b.value,
        b.limit,
        mark(b.passed),
        l.value / PASCALS_PER_PSI,
        l.value / 1000.0,
        l.limit / PASCALS_PER_PSI,
        mark(l.passed),
    )
}

/// The lines of the active variant's checks, for the what-if view.
pub fn check_lines(app: &App, checks: &Checks) -> Vec<Line<'static>> {
    let system = app.units;
    let mut lines = Vec::new();
    for (point, report) in &checks.cavitation {
        let at = match point {
            CheckPoint::Target => "at target speed",
            CheckPoint::Top => "at top speed",
        };
        match report {
            Ok(r) => {
                let style = if r.all_passed() {
                    Style::default()
                } else {
                    app.theme.error.add_modifier(Modifier::BOLD)
                };
                lines.push(Line::styled(
                    format!("{at}: {}", cavitation_text(r, system)),
                    style,
                ));
            }
            Err(why) => lines.push(Line::styled(
                format!("{at}: not checked: {why}"),
                app.theme.warning,
            )),
        }
    }
    if let Some(depth) = checks.shaft_immersion {
        lines.push(Line::styled(
            format!(
                "shaft immersion {}",
                units::format(depth, Kind::Length, system)
            ),
            app.theme.dim,
        ));
    }
    lines.push(match &checks.shaft {
        Ok(s) => {
            let existing = s.existing_diameter.map_or_else(
                || "the boat file gives no shaft diameter".to_string(),
                |d| {
                    format!(
                        "boat's shaft {} {}",
                        units::format(d, Kind::ScrewLength, system),
                        if d >= s.min_diameter {
                            "ok"
                        } else {
                            "⚠ SMALLER THAN THE MINIMUM"
                        }
                    )
                },
            );
            let text = format!(
                "Shaft: {:.0} N·m on the shaft needs at least {} of {} (safety factor {:.0}); {existing}",
                s.shaft_torque,
                units::format(s.min_diameter, Kind::ScrewLength, system),
                s.material.name,
                s.safety_factor
            );
            if checks.shaft_too_small() {
                Line::styled(text, app.theme.error.add_modifier(Modifier::BOLD))
            } else {
                Line::raw(text)
            }
        }
        Err(why) => Line::styled(format!("Shaft not checked: {why}"), app.theme.warning),
    });
    if let Some(note) = &checks.shaft_note {
        lines.push(Line::styled(format!("Shaft: {note}"), app.theme.dim));
    }
    if let Some(duty) = &checks.duty {
        lines.push(Line::raw(format!(
            "Engine duty at the target speed: {duty}"
        )));
    }
    lines
}

/// The one-line cavitation and shaft summary for the Screw pane.
pub fn screw_pane_check_line(checks: &Checks) -> String {
    let mut failed: Vec<String> = Vec::new();
    for (point, report) in &checks.cavitation {
        if let Ok(r) = report {
            let mut what = Vec::new();
            if !r.keller_area_ratio.passed {
                what.push("Keller");
            }
            if !r.thrust_loading.passed {
                what.push("Burrill");
            }
            if !r.blade_loading.passed {
                what.push("loading");
            }
            if !what.is_empty() {
                let at = match point {
                    CheckPoint::Target => "target",
                    CheckPoint::Top => "top",
                };
                failed.push(format!("{} at {at}", what.join("+")));
            }
        }
    }
    let mut text = if failed.is_empty() {
        let checked = checks.cavitation.iter().filter(|(_, r)| r.is_ok()).count();
        if checked == 0 {
            "Cavitation not checked (w)".to_string()
        } else {
            "Cavitation ok at target and top (w)".to_string()
        }
    } else {
        format!("⚠ Cavitation: {} (w)", failed.join(", "))
    };
    if checks.shaft_too_small() {
        text.push_str(" ⚠ shaft too small");
    }
    text
}

//! Drawing: a pure function of the [`App`] state onto a ratatui buffer.
//!
//! The tree: [`layout`] (header, tabs, status and footer strips), [`panes`] (the three field
//! panes and their view-model), [`field_list`] (the field-list widget), [`chart`] (the chart
//! series and the braille widget), [`readout`] (the strip under the chart), [`overlays`] (help,
//! pickers, questions) and [`views`] (one file per design view). Drawing reads `app`, `edit`,
//! `fields` and the solved results; nothing outside `ui` imports it but the event loop.

pub mod ascii;
pub mod chart;
pub mod field_list;
pub mod layout;
pub mod live;
pub mod overlays;
pub mod panes;
pub mod readout;
pub mod views;

use crate::tui::app::{App, Overlay};
use crate::tui::chart::ChartKind;
use crate::tui::fields::Pane;
use chart::{ChartWidget, chart_view_of};
use layout::{draw_footer, draw_header, draw_status, draw_tabs};
use overlays::{draw_help, draw_picker, draw_question};
use panes::draw_pane;
use ratatui::Frame;
use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::Line;
use ratatui::widgets::{Paragraph, Widget, Wrap};
use readout::readout_lines;

/// The smallest terminal the screen is laid out for.
pub const MIN_WIDTH: u16 = 80;
/// The smallest terminal height the screen is laid out for.
pub const MIN_HEIGHT: u16 = 24;

/// The caution shown beside the verdict and the engine load.
pub const CAUTION: &str = "Estimates only: the engine maker's installation limits, local codes and a licensed \
                           marine surveyor or naval architect decide.";

/// Width from which two charts are shown, one above the other.
pub const TWO_CHARTS_WIDTH: u16 = 120;
/// Height from which two charts are shown, one above the other.
pub const TWO_CHARTS_HEIGHT: u16 = 40;

/// Width from which all three panes are shown at once.
const WIDE: u16 = 110;
/// Height from which all three panes are shown at once.
const TALL: u16 = 34;

/// Draws the whole screen for `app`.
pub fn render(app: &App, frame: &mut Frame) {
    draw(app, frame.area(), frame.buffer_mut());
}

/// Draws the whole screen for `app` into `buf` over `area`; in ASCII mode every cell ends
/// up plain ASCII (see [`ascii`]).
pub fn draw(app: &App, area: Rect, buf: &mut Buffer) {
    draw_screen(app, area, buf);
    if ascii::active() {
        ascii::to_ascii(area, buf);
    }
}

/// Most rows the readout strip takes: the cruise line, the match, the before/after and live
/// lines and the caution, wrapped on a narrow screen.
const MAX_READOUT_ROWS: u16 = 8;

fn draw_screen(app: &App, area: Rect, buf: &mut Buffer) {
    if area.width < MIN_WIDTH || area.height < MIN_HEIGHT {
        too_small(area, buf);
        return;
    }
    let readout_text = readout_lines(app);
    let readout_height: u16 = readout_text
        .iter()
        .map(|l| field_list::wrapped_height(&l.to_string(), area.width))
        .sum::<u16>()
        .min(MAX_READOUT_ROWS)
        // The main area keeps its ten rows; the header, status and footer one each.
        .min(area.height.saturating_sub(13));
    let [header, main, readout, status, footer] = Layout::vertical([
        Constraint::Length(1),
        Constraint::Min(10),
        Constraint::Length(readout_height),
        Constraint::Length(1),
        Constraint::Length(1),
    ])
    .areas(area);
    draw_header(app, header, buf);
    let pane_width = if area.width >= WIDE { 50 } else { 38 };
    let [left, right] =
        Layout::horizontal([Constraint::Length(pane_width), Constraint::Min(20)]).areas(main);
    if area.width >= WIDE && area.height >= TALL {
        // Screw and Powerplant fit whole; the Vessel pane, the longest, scrolls with the selection.
        let rects = Layout::vertical([
            Constraint::Min(7),
            Constraint::Length(12),
            Constraint::Length(13),
        ])
        .split(left);
        for (pane, rect) in Pane::ALL.iter().zip(rects.iter()) {
            draw_pane(app, *pane, *rect, buf);
        }
    } else {
        let [tabs, body] =
            Layout::vertical([Constraint::Length(1), Constraint::Min(3)]).areas(left);
        draw_tabs(app, tabs, buf);
        draw_pane(app, app.focus, body, buf);
    }
    // With room for two, the speed chart sits under the chosen one (the power chart unless
    // cycled), so power and speed are seen together; the others are still a key away.
    let charts: Vec<(ChartKind, Rect)> = if area.width >= TWO_CHARTS_WIDTH
        && area.height >= TWO_CHARTS_HEIGHT
    {
        let second = if app.chart == ChartKind::SpeedVsRpm {
            ChartKind::PowerVsRpm
        } else {
            ChartKind::SpeedVsRpm
        };
        let [top, bottom] =
            Layout::vertical([Constraint::Percentage(50), Constraint::Percentage(50)]).areas(right);
        vec![(app.chart, top), (second, bottom)]
    } else {
        vec![(app.chart, right)]
    };
    for (kind, rect) in charts {
        let view = chart_view_of(app, kind);
        ChartWidget {
            view: &view,
            frame_style: app.theme.dim,
        }
        .render(rect, buf);
    }
    Paragraph::new(readout_text)
        .wrap(Wrap { trim: true })
        .render(readout, buf);
    draw_status(app, status, buf);
    draw_footer(app, footer, buf);
    match &app.overlay {
        Overlay::None => {}
        Overlay::Help { scroll } => draw_help(app, *scroll, area, buf),
        Overlay::Pick {
            kind,
            entries,
            highlighted,
        } => draw_picker(app, *kind, entries, *highlighted, area, buf),
        Overlay::Confirm(question) => draw_question(app, question.text(), area, buf),
        Overlay::View { kind, scroll } => {
            // Over the panes, chart and readout; the header, status and footer stay in view.
            let cover = Rect {
                height: main.height + readout.height,
                ..main
            };
            views::draw_view(app, *kind, *scroll, cover, buf);
        }
    }
}

fn too_small(area: Rect, buf: &mut Buffer) {
    let text = vec![
        Line::from(format!(
            "tidewright needs {MIN_WIDTH}×{MIN_HEIGHT} or more."
        )),
        Line::from(format!("This terminal is {}×{}.", area.width, area.height)),
        Line::from("Make it larger, or press q to quit."),
    ];
    Paragraph::new(text)
        .wrap(Wrap { trim: true })
        .render(area, buf);
}

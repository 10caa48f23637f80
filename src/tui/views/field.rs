//! View 4, Field: readings taken at a running sprinkler (inlet pressure,
//! rotation, optionally flow and wetted radius) against what the design
//! expects, the findings in trade words (the speed against the design first),
//! the candidate causes ranked by how much of the deviation each explains and
//! the resisting torque's split.

use ratatui::layout::Rect;
use ratatui::style::Modifier;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Paragraph, Wrap};
use ratatui::Frame;

use crate::inverse::field::{FieldCheck, FlowReading, RotationReading};
use crate::report::field as words;
use crate::report::fit as fit_words;
use crate::tui::app::App;
use crate::units::{format_quantity, Dimension as D};

fn rotation_text(r: &RotationReading) -> String {
    match *r {
        RotationReading::Rpm { rpm, .. } => format!("{rpm:.1} rpm"),
        RotationReading::SecondsPerTurn { seconds, .. } => {
            format!("{seconds:.2} s per turn = {:.1} rpm", 60.0 / seconds)
        }
        RotationReading::TurnsOver { turns, seconds, .. } => format!(
            "{turns} turns in {seconds} s = {:.1} rpm",
            60.0 * turns / seconds
        ),
    }
}

fn flow_text(app: &App, f: &FlowReading) -> String {
    let q = |v| format_quantity(D::Flow, v, app.units);
    match *f {
        FlowReading::Rate { flow_m3_s, .. } => q(flow_m3_s),
        FlowReading::Caught {
            volume_m3, seconds, ..
        } => format!(
            "{} in {seconds} s = {}",
            format_quantity(D::Volume, volume_m3, app.units),
            q(volume_m3 / seconds)
        ),
    }
}

/// The readings block.
fn readings(app: &App) -> Vec<Line<'static>> {
    let t = &app.theme;
    let m = &app.measured;
    let dash = || "—".to_string();
    let row = |k: &str, label: &str, value: String| {
        Line::from(vec![
            Span::styled(format!(" {k} "), t.selected()),
            Span::raw(format!(" {label:<15}{value}")),
        ])
    };
    vec![
        Line::styled(
            "readings at the unit (key, then type; Enter on empty clears)",
            t.heading(),
        ),
        row(
            "p",
            "inlet pressure",
            m.pressure_pa
                .map_or_else(dash, |p| format_quantity(D::Pressure, p, app.units)),
        ),
        row(
            "r",
            "rotation",
            m.rotation.as_ref().map_or_else(dash, rotation_text),
        ),
        row(
            "f",
            "flow",
            m.flow
                .as_ref()
                .map_or_else(|| "— (optional)".to_string(), |f| flow_text(app, f)),
        ),
        row(
            "t",
            "wetted radius",
            m.throw_m.map_or_else(
                || "— (optional)".to_string(),
                |r| format_quantity(D::Length, r, app.units),
            ),
        ),
        Line::raw(""),
    ]
}

/// The table of readings at several pressures, its fit, and the coast-down.
fn unit_lines(app: &App) -> Vec<Line<'static>> {
    let t = &app.theme;
    let u = &app.unit;
    let mut lines = Vec::new();
    let keep = if u.keep {
        " · kept when another file opens (k)"
    } else {
        ""
    };
    if u.rows.is_empty() {
        lines.push(Line::styled(
            format!("n adds the reading above to a table for a fit · d coast-down{keep}"),
            t.dim(),
        ));
    } else {
        lines.push(Line::styled(
            format!("readings table (n adds, x drops the last){keep}"),
            t.heading(),
        ));
        for (k, r) in u.rows.iter().enumerate() {
            lines.push(Line::raw(format!(
                " {:>2}  {:<12}{:>7.1} rpm  {}",
                k + 1,
                format_quantity(D::Pressure, r.inlet_pressure_pa, app.units),
                r.rpm,
                r.flow_m3_s.map_or_else(
                    || "—".to_string(),
                    |f| format_quantity(D::Flow, f, app.units)
                )
            )));
        }
        if u.fit.waiting {
            lines.push(Line::styled("fitting…", t.dim()));
        }
        match u.fit.result.as_deref() {
            Some(Ok(f)) => {
                for l in fit_words::fit_text("the table", f, &[], app.units).lines() {
                    lines.push(Line::raw(l.to_string()));
                }
            }
            Some(Err(e)) => lines.push(Line::styled(format!("fit: {e}"), t.error())),
            None => {}
        }
    }
    if !u.coast_times_s.is_empty() {
        lines.push(Line::styled(
            format!(
                "coast-down (d), s at each turn: {}",
                u.coast_times_s
                    .iter()
                    .map(|s| format!("{s}"))
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
            t.heading(),
        ));
        if u.coast.waiting {
            lines.push(Line::styled("fitting…", t.dim()));
        }
        match u.coast.result.as_deref() {
            Some(Ok(c)) => {
                for l in fit_words::coast_text("fit", c, app.units).lines().skip(1) {
                    lines.push(Line::raw(l.to_string()));
                }
            }
            Some(Err(e)) => lines.push(Line::styled(format!("coast-down: {e}"), t.error())),
            None => {}
        }
    }
    lines.push(Line::raw(""));
    lines
}

fn check_lines(app: &App, c: &FieldCheck) -> Vec<Line<'static>> {
    let t = &app.theme;
    let q = |dim, v| format_quantity(dim, v, app.units);
    let mut lines = vec![Line::from(vec![
        Span::styled(format!("measured {:.1} rpm", c.measured_rpm), t.heading()),
        Span::raw(format!(
            " (reading allows {:.1}–{:.1})",
            c.measured_rpm_band[0], c.measured_rpm_band[1]
        )),
    ])];
    lines.push(Line::raw(match (c.expected_rpm, c.deviation_percent) {
        (Some(e), Some(d)) => format!(
            "expected {e:.1} rpm at {} ({:.1} % {}); the design's own inlet is {}",
            q(D::Pressure, c.inlet_pressure_pa),
            d.abs(),
            if d < 0.0 { "below" } else { "above" },
            q(D::Pressure, c.design_inlet_pressure_pa)
        ),
        _ => format!(
            "the design does not run at {}",
            q(D::Pressure, c.inlet_pressure_pa)
        ),
    }));
    if let Some(f) = &c.flow {
        let mut s = format!(
            "flow {} against {} for new nozzles ({} %)",
            q(D::Flow, f.measured_m3_s),
            q(D::Flow, f.nominal_m3_s),
            crate::words::signed(f.deviation_percent, 1)
        );
        if let Some(d) = f.implied_effective_diameter_m {
            s.push_str(&format!(
                "; effective nozzle {} against {}",
                q(D::SmallLength, d),
                q(D::SmallLength, f.nominal_effective_diameter_m)
            ));
        }
        lines.push(Line::raw(s));
    }
    if let Some(th) = &c.throw {
        lines.push(Line::raw(format!(
            "wetted radius {} measured, {} expected",
            q(D::Length, th.measured_m),
            th.expected_m.map_or("—".to_string(), |e| q(D::Length, e))
        )));
    }
    lines.push(Line::raw(""));
    lines.push(Line::styled(
        "findings: the speed first, then the rest, most serious first",
        t.heading(),
    ));
    for (k, f) in c.findings.iter().enumerate() {
        let (mark, style) = if f.fault {
            ("✗", t.bad().add_modifier(Modifier::BOLD))
        } else {
            ("✓", t.good())
        };
        lines.push(Line::from(vec![
            Span::styled(format!(" {mark} "), style),
            Span::raw(format!("{}. {}", k + 1, words::finding_text(f, app.units))),
        ]));
        lines.push(Line::styled(
            format!("     {}", words::finding_evidence(f, app.units)),
            t.dim(),
        ));
        if k == 0 && words::show_causes(c) {
            lines.push(Line::styled(
                "   causes, by how much of the deviation each explains",
                t.heading(),
            ));
            let dev = words::deviation_rpm(c);
            for cause in &c.causes {
                let style = if cause.impossible() {
                    t.dim()
                } else {
                    ratatui::style::Style::default()
                };
                lines.push(Line::styled(
                    format!("   · {}", words::cause_text(cause, dev, app.units)),
                    style,
                ));
            }
            lines.push(Line::styled(
                format!(
                    "   {}",
                    words::split_text(&c.split, c.measured_rpm, app.units)
                ),
                t.dim(),
            ));
        }
    }
    lines
}

/// Draws the Field view.
pub fn draw(app: &App, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let mut lines = readings(app);
    lines.extend(unit_lines(app));
    match (&app.field.result, app.measured.reading()) {
        (_, None) => lines.push(Line::styled(
            "type the inlet pressure (p) and the rotation (r) to check the unit against the design",
            t.dim(),
        )),
        (None, Some(_)) => lines.push(Line::styled("computing…", t.dim())),
        (Some(r), Some(_)) => {
            if app.field.waiting {
                lines.push(Line::styled("computing…", t.dim()));
            }
            match r.as_ref() {
                Ok(c) => lines.extend(check_lines(app, c)),
                Err(e) => lines.push(Line::styled(e.clone(), t.error())),
            }
        }
    }
    // Word wrapping can take a little more than the character count says.
    let rows = super::wrapped_rows(&lines, area.width) * 5 / 4;
    let max = rows.saturating_sub(area.height) as usize;
    let scroll = app.pane_scroll.min(max) as u16;
    frame.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .scroll((scroll, 0)),
        area,
    );
}

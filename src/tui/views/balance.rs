//! View 1, Balance: drive and resisting torque against speed, the operating
//! point and any other equilibria, stall and breakaway torque at rest, and
//! the torque–speed table beneath (scrolled with PgUp/PgDn or the wheel).

use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::style::Modifier;
use ratatui::symbols::Marker;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Axis, Chart, Dataset, GraphType, Paragraph, Row, Table, Wrap};
use ratatui::Frame;

use super::{num, unit};
use crate::physics::balance::{rpm, table_top_speed, torque_table_to, SpinReport, TableRow};
use crate::physics::design::Design;
use crate::tui::app::App;
use crate::tui::theme::Theme;
use crate::units::{format_quantity, to_display, Dimension as D};

/// Rows of the torque–speed table behind the Balance chart.
pub const TABLE_POINTS: usize = 41;

/// Top speed of the Balance chart and table, rad/s: twice the highest
/// equilibrium (so the operating point sits mid-chart and a far-off runaway
/// does not squash it); without one, the speed at which the tips reach 10 m/s.
pub fn top_speed(report: &SpinReport, design: &Design) -> f64 {
    let full = table_top_speed(report);
    match report.equilibria.last() {
        Some(e) if e.omega_rad_s > 0.0 => (2.0 * e.omega_rad_s).min(full.max(e.omega_rad_s * 1.2)),
        _ => {
            // No equilibrium to centre on: stop where the tips reach 10 m/s,
            // well past any working speed (common practice: tips run a few m/s).
            let r_max = design.rotor.tip_radius_m();
            if r_max > 0.0 {
                full.min(10.0 / r_max)
            } else {
                full
            }
        }
    }
}

/// The Balance view's torque–speed table: the model's table
/// ([`torque_table_to`]) from rest to `top_speed`, `TABLE_POINTS` rows.
pub fn table(design: &Design, report: &SpinReport) -> Vec<TableRow> {
    torque_table_to(design, report, top_speed(report, design), TABLE_POINTS)
}

/// The lines above the chart: operating point, start, runaway, warnings.
fn summary(app: &App) -> Vec<Line<'static>> {
    let t = &app.theme;
    let r = &app.report;
    let q = |dim, v| format_quantity(dim, v, app.units);
    let mut first = Vec::new();
    match &r.operating {
        Some(op) => {
            let w = op.omega_rad_s();
            first.push(Span::styled(
                format!("runs at {:.1} rpm", rpm(w)),
                t.good().add_modifier(Modifier::BOLD),
            ));
            first.push(Span::raw(format!(
                " ({:.2} s/turn) · drive {}",
                2.0 * std::f64::consts::PI / w,
                q(D::Torque, op.point.drive_n_m)
            )));
        }
        None => first.push(Span::styled(
            super::speed_word(app),
            t.bad().add_modifier(Modifier::BOLD),
        )),
    }
    let runaway = r
        .runaway_rad_s
        .map_or("none".to_string(), |w| format!("{:.0} rpm", rpm(w)));
    let second = format!(
        "at rest: stall {} · breakaway {} · runaway {runaway}",
        q(D::Torque, r.stall_torque_n_m),
        q(D::Torque, r.breakaway_torque_n_m),
    );
    let mut lines = vec![Line::from(first), Line::raw(second)];
    let others: Vec<String> = r
        .equilibria
        .iter()
        .filter(|e| {
            r.operating
                .as_ref()
                .is_none_or(|op| (e.omega_rad_s - op.omega_rad_s()).abs() > 1e-9)
        })
        .map(|e| {
            format!(
                "{:.1} rpm {}",
                rpm(e.omega_rad_s),
                if e.stable { "stable" } else { "unstable" }
            )
        })
        .collect();
    if !others.is_empty() {
        lines.push(Line::styled(
            format!("other equilibria: {}", others.join(", ")),
            t.warning(),
        ));
    }
    for w in &r.warnings {
        lines.push(Line::styled(format!("⚠ {w}"), t.warning()));
    }
    for c in app.cautions() {
        lines.push(Line::styled(
            format!("⚠ {}", crate::words::caution(&c, app.units)),
            t.warning(),
        ));
    }
    lines
}

/// Draws the Balance view.
pub fn draw(app: &App, frame: &mut Frame, area: Rect) {
    let lines = summary(app);
    let head_h = super::wrapped_rows(&lines, area.width)
        .min(area.height / 4)
        .max(2);
    let table_h = ((area.height.saturating_sub(head_h)) * 2 / 5).max(4);
    let [head, chart, table] = Layout::vertical([
        Constraint::Length(head_h),
        Constraint::Min(5),
        Constraint::Length(table_h),
    ])
    .areas(area);
    frame.render_widget(Paragraph::new(lines).wrap(Wrap { trim: true }), head);
    draw_chart(app, frame, chart);
    draw_table(app, frame, table);
}

fn draw_chart(app: &App, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let tq = |v: f64| to_display(D::Torque, v, app.units);
    let drive: Vec<(f64, f64)> = app
        .table
        .iter()
        .map(|p| (rpm(p.omega_rad_s), tq(p.drive_n_m)))
        .collect();
    let resist: Vec<(f64, f64)> = app
        .table
        .iter()
        .map(|p| (rpm(p.omega_rad_s), tq(p.resist.total_n_m())))
        .collect();
    let r = &app.report;
    let op: Vec<(f64, f64)> = r
        .operating
        .iter()
        .map(|op| (rpm(op.omega_rad_s()), tq(op.point.drive_n_m)))
        .collect();
    let model = crate::physics::balance::SpinModel::new(&app.design);
    let others: Vec<(f64, f64)> = r
        .equilibria
        .iter()
        .filter(|e| {
            r.operating
                .as_ref()
                .is_none_or(|op| (e.omega_rad_s - op.omega_rad_s()).abs() > 1e-9)
        })
        .map(|e| (rpm(e.omega_rad_s), tq(model.drive(e.omega_rad_s))))
        .collect();
    let at_rest = [
        (0.0, tq(r.stall_torque_n_m)),
        (0.0, tq(r.breakaway_torque_n_m)),
    ];
    let x_max = drive.last().map_or(1.0, |p| p.0).max(1.0);
    let finite = |v: f64| if v.is_finite() { v } else { 0.0 };
    let top = drive
        .iter()
        .map(|p| p.1)
        .chain(at_rest.iter().map(|p| p.1))
        .map(finite)
        .fold(0.0, f64::max);
    let bottom = drive.iter().map(|p| finite(p.1)).fold(0.0, f64::min);
    let y_max = if top > 0.0 { top * 1.15 } else { 1.0 };
    // Far past runaway the drive falls steeply; show enough below zero for a
    // stalled rotor's negative stall torque without squashing a running one.
    let y_min = bottom.max(-y_max.max(2.0 * tq(r.stall_torque_n_m).abs()));
    let tu = unit(D::Torque, app);
    let datasets = vec![
        Dataset::default()
            .name("drive")
            .marker(Marker::Braille)
            .graph_type(GraphType::Line)
            .style(t.fg(Theme::DRIVE))
            .data(&drive),
        Dataset::default()
            .name("resisting")
            .marker(Marker::Dot)
            .graph_type(GraphType::Line)
            .style(t.fg(Theme::RESIST))
            .data(&resist),
        Dataset::default()
            .name("at rest")
            .marker(Marker::Bar)
            .graph_type(GraphType::Scatter)
            .style(t.fg(Theme::SMALL))
            .data(&at_rest),
        Dataset::default()
            .marker(Marker::HalfBlock)
            .graph_type(GraphType::Scatter)
            .style(t.warning())
            .data(&others),
        Dataset::default()
            .name("operating")
            .marker(Marker::Block)
            .graph_type(GraphType::Scatter)
            .style(t.fg(Theme::MARK))
            .data(&op),
    ];
    let x_labels = vec![
        Line::raw("0"),
        Line::raw(format!("{:.0}", x_max / 2.0)),
        Line::raw(format!("{:.0} rpm", x_max)),
    ];
    let y_labels = vec![
        Line::raw(num(y_min)),
        Line::raw(num((y_min + y_max) / 2.0)),
        Line::raw(num(y_max)),
    ];
    let chart = Chart::new(datasets)
        .x_axis(
            Axis::default()
                .bounds([0.0, x_max])
                .labels(x_labels)
                .style(t.dim()),
        )
        .y_axis(
            Axis::default()
                .title(Line::raw(format!("torque {tu}")))
                .bounds([y_min, y_max])
                .labels(y_labels)
                .style(t.dim()),
        )
        .hidden_legend_constraints((Constraint::Ratio(1, 2), Constraint::Ratio(3, 4)));
    frame.render_widget(chart, area);
}

fn draw_table(app: &App, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let tu = unit(D::Torque, app);
    let header = Row::new(vec![
        "speed\nrpm".to_string(),
        format!("drive\n{tu}"),
        format!("resist\n{tu}"),
        format!("net\n{tu}"),
        format!("flow\n{}", unit(D::Flow, app)),
        format!("hub\n{}", unit(D::Pressure, app)),
    ])
    .height(2)
    .style(t.heading());
    let body_h = area.height.saturating_sub(2) as usize;
    let max = app.table.len().saturating_sub(body_h);
    let start = app.pane_scroll.min(max);
    let op_row = app.report.operating.as_ref().and_then(|op| {
        let w = op.omega_rad_s();
        app.table
            .iter()
            .enumerate()
            .min_by(|a, b| {
                (a.1.omega_rad_s - w)
                    .abs()
                    .total_cmp(&(b.1.omega_rad_s - w).abs())
            })
            .map(|(i, _)| i)
    });
    let tq = |v: f64| num(to_display(D::Torque, v, app.units));
    let rows: Vec<Row> = app
        .table
        .iter()
        .enumerate()
        .skip(start)
        .take(body_h)
        .map(|(i, p)| {
            let row = Row::new(vec![
                format!("{:.1}", rpm(p.omega_rad_s)),
                tq(p.drive_n_m),
                tq(p.resist.total_n_m()),
                tq(p.net_n_m()),
                num(to_display(D::Flow, p.state.total_flow_m3_s, app.units)),
                num(to_display(D::Pressure, p.state.hub_pressure_pa, app.units)),
            ]);
            if Some(i) == op_row {
                row.style(t.selected())
            } else {
                row
            }
        })
        .collect();
    let widths = [Constraint::Ratio(1, 6); 6];
    frame.render_widget(Table::new(rows, widths).header(header), area);
}

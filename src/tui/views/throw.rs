//! View 2, Throw: a side view of each nozzle's largest, median and small
//! drop over a ground line with a length scale, the wetted radius, and the
//! throw with the rotor held at rest against the throw at speed.

use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::style::Color;
use ratatui::text::Line;
use ratatui::widgets::canvas::{Canvas, Line as CLine};
use ratatui::widgets::{Paragraph, Row, Table, Wrap};
use ratatui::Frame;

use super::{num, unit, waiting_line};
use crate::physics::pattern::NozzlePaths;
use crate::physics::trajectory::FlightPath;
use crate::tui::app::App;
use crate::tui::fields::nice_step;
use crate::tui::theme::Theme;
use crate::units::{format_quantity, to_display, Dimension as D};

/// Draws the Throw view.
pub fn draw(app: &App, frame: &mut Frame, area: Rect) {
    let Some(spray) = &app.spray else {
        frame.render_widget(Paragraph::new(waiting_line(app)), area);
        return;
    };
    let t = &app.theme;
    let q = |v| format_quantity(D::Length, v, app.units);
    let throw = match &spray.throw {
        Ok(th) => th,
        Err(e) => {
            frame.render_widget(
                Paragraph::new(vec![
                    Line::styled("no throw could be computed:", t.error()),
                    Line::raw(e.clone()),
                ])
                .wrap(Wrap { trim: true }),
                area,
            );
            return;
        }
    };
    let mut head = vec![Line::raw(format!(
        "wetted radius {} · farthest drop {} · paths peak {} high{}",
        q(throw.wetted_radius_m),
        q(throw.farthest_drop_m),
        q(throw.peak_height_m),
        if app.report.operating.is_none() {
            " (rotor not turning)"
        } else {
            ""
        }
    ))];
    if let Some(c) = &spray.comparison {
        head.push(Line::raw(format!(
            "held at rest {} → turning {} ({} %)",
            q(c.at_rest_m),
            q(c.running_m),
            crate::words::signed(c.change_percent, 1)
        )));
    }
    if app.computing {
        head.push(Line::styled("computing…", t.dim()));
    }
    let n = spray.arms.len() as u16;
    let table_h = (n + 2).min(area.height / 3);
    let [top, canvas, table] = Layout::vertical([
        Constraint::Length(head.len() as u16),
        Constraint::Min(5),
        Constraint::Length(table_h),
    ])
    .areas(area);
    frame.render_widget(Paragraph::new(head), top);
    draw_canvas(app, &spray.paths, throw.wetted_radius_m, frame, canvas);

    let lu = unit(D::Length, app);
    let su = unit(D::SmallLength, app);
    let header = Row::new(vec![
        "arm".to_string(),
        format!("largest\n{lu}"),
        format!("median\n{lu}"),
        format!("small\n{lu}"),
        format!("d50\n{su}"),
        format!("top drop\n{su}"),
    ])
    .height(2)
    .style(t.heading());
    let l = |v| num(to_display(D::Length, v, app.units));
    let s = |v| num(to_display(D::SmallLength, v, app.units));
    let rows: Vec<Row> = spray
        .arms
        .iter()
        .zip(&throw.nozzles)
        .map(|(k, nt)| match nt {
            Some(nt) => Row::new(vec![
                format!("{}", k + 1),
                l(nt.throw_largest_m),
                l(nt.throw_median_m),
                l(nt.throw_small_m),
                s(nt.spectrum.d50_m),
                s(nt.spectrum.largest_m),
            ]),
            None => Row::new(vec![format!("{}", k + 1), "not flowing".to_string()]),
        })
        .collect();
    frame.render_widget(
        Table::new(rows, [Constraint::Ratio(1, 6); 6]).header(header),
        table,
    );
}

/// A drawn path: side-view points (display units), its colour, its letter.
type Curve = (Vec<(f64, f64)>, Color, &'static str);

fn side(path: &FlightPath, to: &impl Fn(f64) -> f64) -> Vec<(f64, f64)> {
    path.points
        .iter()
        .map(|p| (to(p.position_m.x.hypot(p.position_m.y)), to(p.position_m.z)))
        .collect()
}

fn draw_canvas(
    app: &App,
    paths: &[Option<NozzlePaths>],
    wetted_m: f64,
    frame: &mut Frame,
    area: Rect,
) {
    let t = &app.theme;
    let to = |v: f64| to_display(D::Length, v, app.units);
    let drawn: Vec<[Curve; 3]> = paths
        .iter()
        .flatten()
        .map(|p| {
            [
                (side(&p.small, &to), Theme::SMALL, "s"),
                (side(&p.median, &to), Theme::MEDIAN, "M"),
                (side(&p.largest, &to), Theme::DRIVE, "L"),
            ]
        })
        .collect();
    let x_max = drawn
        .iter()
        .flatten()
        .flat_map(|(pts, _, _)| pts.iter().map(|p| p.0))
        .fold(to(wetted_m), f64::max)
        .max(0.1)
        * 1.08;
    let apex = drawn
        .iter()
        .flatten()
        .flat_map(|(pts, _, _)| pts.iter().map(|p| p.1))
        .fold(0.0, f64::max)
        .max(0.1);
    // Head room for the scale labels under the ground line.
    let y_min = -apex * 0.25;
    let y_max = apex * 1.15;
    let tick = nice_step(x_max / 5.0);
    let lu = unit(D::Length, app);
    let ground = t.ink(Theme::GROUND);
    let wet = t.ink(Theme::MARK);
    let ink: Vec<_> = drawn
        .iter()
        .map(|three| three.clone().map(|(p, c, l)| (p, t.ink(c), l)))
        .collect();
    let canvas = Canvas::default()
        .x_bounds([0.0, x_max])
        .y_bounds([y_min, y_max])
        .paint(move |ctx| {
            ctx.draw(&CLine::new(0.0, 0.0, x_max, 0.0, ground));
            let mut x = 0.0;
            let mut k = 0;
            while x <= x_max && k < 50 {
                ctx.draw(&CLine::new(x, 0.0, x, y_min * 0.3, ground));
                let label = if k == 0 { format!("0 {lu}") } else { num(x) };
                ctx.print(x, y_min * 0.55, Line::raw(label));
                x += tick;
                k += 1;
            }
            let wx = to(wetted_m);
            ctx.draw(&CLine::new(wx, 0.0, wx, y_max * 0.9, wet));
            ctx.print(wx, y_max * 0.97, Line::raw("▼"));
            ctx.layer();
            for three in &ink {
                for (pts, c, _) in three {
                    for (a, b) in pts.iter().zip(pts.iter().skip(1)) {
                        ctx.draw(&CLine::new(a.0, a.1, b.0, b.1, *c));
                    }
                }
            }
            ctx.layer();
            for three in &ink {
                for (pts, _, label) in three {
                    if let Some(last) = pts.last() {
                        ctx.print(last.0, apex * 0.08, Line::raw(*label));
                    }
                }
            }
        });
    let [legend, body] = Layout::vertical([Constraint::Length(1), Constraint::Min(3)]).areas(area);
    frame.render_widget(
        Paragraph::new(Line::styled(
            "L largest · M median · s small drop · ▼ wetted radius",
            t.dim(),
        )),
        legend,
    );
    frame.render_widget(canvas, body);
}

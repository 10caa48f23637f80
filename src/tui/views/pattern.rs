//! View 3, Pattern: one head's radial application profile, and the layout's
//! depth map over one repeating cell as shaded cells (colour and shading
//! characters, so it reads without colour too), with CU, DU_lq, mean rate and
//! the spacing as a share of the wetted diameter.

use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::style::Style;
use ratatui::symbols::Marker;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Axis, Chart, Dataset, GraphType, Paragraph, Wrap};
use ratatui::Frame;

use super::{num, unit, waiting_line};
use crate::physics::layout::{pattern_name, LayoutResult};
use crate::physics::pattern::RadialProfile;
use crate::tui::app::App;
use crate::tui::theme::{Theme, SHADES};
use crate::units::{format_quantity, to_display, Dimension as D};

/// Depth levels as fractions of the mean: below 0.75, 0.75–0.9, 0.9–1.1, 1.1–1.25, above.
pub const LEVELS: [f64; 4] = [0.75, 0.9, 1.1, 1.25];

/// The legend's names of the levels.
const LEVEL_NAMES: [&str; 5] = ["<75 %", "75–90 %", "90–110 %", "110–125 %", ">125 %"];

/// The level 0..=4 of a rate relative to the mean.
pub fn level(rate: f64, mean: f64) -> usize {
    if mean <= 0.0 {
        return 0;
    }
    let r = rate / mean;
    LEVELS.iter().filter(|l| r >= **l).count()
}

/// Draws the Pattern view.
pub fn draw(app: &App, frame: &mut Frame, area: Rect) {
    let Some(spray) = &app.spray else {
        frame.render_widget(Paragraph::new(waiting_line(app)), area);
        return;
    };
    let t = &app.theme;
    let throw = match &spray.throw {
        Ok(th) => th,
        Err(e) => {
            frame.render_widget(
                Paragraph::new(vec![
                    Line::styled("no pattern could be computed:", t.error()),
                    Line::raw(e.clone()),
                ])
                .wrap(Wrap { trim: true }),
                area,
            );
            return;
        }
    };
    let rate = |v: f64| format_quantity(D::ApplicationRate, v / 3.6e6, app.units);
    let mut head: Vec<Line> = Vec::new();
    match &spray.layout {
        Some(Ok(l)) => {
            head.push(Line::from(vec![
                Span::styled(format!("CU {:.1} %", l.uniformity.cu_percent), t.heading()),
                Span::raw(format!(
                    " · DU_lq {:.1} % · mean {}",
                    l.uniformity.du_lq_percent,
                    rate(l.mean_rate_mm_h),
                )),
            ]));
            let lu = unit(D::Length, app);
            let mut second = format!(
                "{} {} × {} {lu} · spacing {:.0} % of diameter",
                pattern_name(&l.layout),
                num(to_display(D::Length, l.spacing_m, app.units)),
                num(to_display(D::Length, l.rows_m, app.units)),
                l.spacing_percent_of_diameter,
            );
            if area.width >= 80 {
                second.push_str(&format!(" · Q/area {}", rate(l.expected_rate_mm_h)));
            }
            head.push(Line::raw(second));
        }
        Some(Err(e)) => head.push(Line::styled(format!("layout: {e}"), t.error())),
        None => head.push(Line::styled(
            "no layout: choose one under Layout ▸ pattern for CU and DU",
            t.dim(),
        )),
    }
    if app.design.wind.speed_m_s > 0.0 {
        head.push(Line::raw(format!(
            "wind {} from {}: the layout uses the 2-D pattern",
            format_quantity(D::Speed, app.design.wind.speed_m_s, app.units),
            format_quantity(D::Angle, app.design.wind.from_rad, app.units)
        )));
    }
    if app.computing {
        head.push(Line::styled("computing…", t.dim()));
    }
    let [top, body] =
        Layout::vertical([Constraint::Length(head.len() as u16), Constraint::Min(4)]).areas(area);
    frame.render_widget(Paragraph::new(head).wrap(Wrap { trim: true }), top);

    let layout = match &spray.layout {
        Some(Ok(l)) => Some(l),
        _ => None,
    };
    let Some(l) = layout else {
        draw_profile(app, &throw.profile, frame, body);
        return;
    };
    // The map keeps the cell's shape (terminal cells are about twice as tall
    // as wide) with its legend to the right; the profile takes the rest.
    let [profile, map] = if body.width >= 70 {
        let map_w = map_width(l, body.height.saturating_sub(1), body.width / 2);
        Layout::horizontal([Constraint::Min(1), Constraint::Length(map_w)]).areas(body)
    } else {
        Layout::vertical([Constraint::Percentage(40), Constraint::Min(3)]).areas(body)
    };
    draw_profile(app, &throw.profile, frame, profile);
    draw_map(app, l, frame, map);
}

fn draw_profile(app: &App, profile: &RadialProfile, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let to_l = |v: f64| to_display(D::Length, v, app.units);
    let to_r = |mm_h: f64| to_display(D::ApplicationRate, mm_h / 3.6e6, app.units);
    // Steps drawn as pairs of points at each ring's edges.
    let pts: Vec<(f64, f64)> = profile
        .rings
        .iter()
        .flat_map(|r| {
            [
                (to_l(r.inner_m), to_r(r.rate_mm_h)),
                (to_l(r.outer_m), to_r(r.rate_mm_h)),
            ]
        })
        .collect();
    let x_max = to_l(profile.outer_radius_m()).max(0.1) * 1.05;
    let y_max = pts.iter().map(|p| p.1).fold(0.0, f64::max).max(1e-9) * 1.1;
    let ds = vec![Dataset::default()
        .name("rate")
        .marker(Marker::Braille)
        .graph_type(GraphType::Line)
        .style(t.fg(Theme::DRIVE))
        .data(&pts)];
    let lu = unit(D::Length, app);
    let ru = unit(D::ApplicationRate, app);
    let chart = Chart::new(ds)
        .x_axis(
            Axis::default()
                .bounds([0.0, x_max])
                .labels(vec![
                    Line::raw("0"),
                    Line::raw(num(x_max / 2.0)),
                    Line::raw(format!("{} {lu}", num(x_max))),
                ])
                .style(t.dim()),
        )
        .y_axis(
            Axis::default()
                .title(Line::raw(format!("one head, {ru}")))
                .bounds([0.0, y_max])
                .labels(vec![
                    Line::raw("0"),
                    Line::raw(num(y_max / 2.0)),
                    Line::raw(num(y_max)),
                ])
                .style(t.dim()),
        )
        .legend_position(None);
    frame.render_widget(chart, area);
}

/// Width of the map with its legend for `rows` rows of cells, at most `max`.
fn map_width(l: &LayoutResult, rows: u16, max: u16) -> u16 {
    let aspect = (l.rows_m / l.spacing_m).max(0.05);
    let cells = (rows.max(1) as f64 * 2.0 / aspect).round() as u16;
    (cells + LEGEND_W + 1).min(max)
}

/// Width of the legend column.
const LEGEND_W: u16 = 13;

fn draw_map(app: &App, l: &LayoutResult, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let mean = l.mean_rate_mm_h;
    let [title, below] = Layout::vertical([Constraint::Length(1), Constraint::Min(2)]).areas(area);
    let [cells, _, legend] = Layout::horizontal([
        Constraint::Min(2),
        Constraint::Length(1),
        Constraint::Length(LEGEND_W),
    ])
    .areas(below);
    frame.render_widget(
        Paragraph::new(Line::styled("depth between heads", t.dim())),
        title,
    );
    let grid = &l.grid.rate_mm_h;
    let ny = grid.len();
    let nx = grid.first().map_or(0, Vec::len);
    if nx == 0 || ny == 0 || cells.width == 0 || cells.height == 0 {
        return;
    }
    // Terminal cells are about twice as tall as wide: keep the cell's aspect.
    let aspect = (l.rows_m / l.spacing_m).max(0.05);
    let mut w = cells.width as usize;
    let mut h = ((w as f64) * aspect / 2.0).round().max(1.0) as usize;
    if h > cells.height as usize {
        h = cells.height as usize;
        w = ((h as f64) * 2.0 / aspect).round().max(1.0) as usize;
        w = w.min(cells.width as usize);
    }
    let mut lines = Vec::with_capacity(h);
    for row in 0..h {
        // Top of the screen is the highest y.
        let y0 = (h - 1 - row) * ny / h;
        let y1 = ((h - row) * ny / h).max(y0 + 1);
        let mut spans = Vec::with_capacity(w);
        for col in 0..w {
            let x0 = col * nx / w;
            let x1 = ((col + 1) * nx / w).max(x0 + 1);
            let mut sum = 0.0;
            let mut n = 0usize;
            for r in grid.iter().take(y1.min(ny)).skip(y0) {
                for v in r.iter().take(x1.min(nx)).skip(x0) {
                    sum += v;
                    n += 1;
                }
            }
            let avg = if n > 0 { sum / n as f64 } else { 0.0 };
            let lv = level(avg, mean);
            let ch = SHADES.get(lv).copied().unwrap_or('█');
            spans.push(Span::styled(
                ch.to_string(),
                if t.no_color {
                    Style::default()
                } else {
                    Style::default().fg(Theme::depth_color(lv))
                },
            ));
        }
        lines.push(Line::from(spans));
    }
    frame.render_widget(Paragraph::new(lines), cells);
    let mut lines = vec![Line::styled("of the mean", t.dim())];
    for (i, n) in LEVEL_NAMES.iter().enumerate().rev() {
        let ch = SHADES.get(i).copied().unwrap_or('█');
        lines.push(Line::from(vec![
            Span::styled(
                format!("{ch}{ch}"),
                if t.no_color {
                    Style::default()
                } else {
                    Style::default().fg(Theme::depth_color(i))
                },
            ),
            Span::raw(format!(" {n}")),
        ]));
    }
    frame.render_widget(Paragraph::new(lines), legend);
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn levels_split_at_the_legend_bounds() {
        assert_eq!(level(0.0, 10.0), 0);
        assert_eq!(level(7.4, 10.0), 0);
        assert_eq!(level(7.5, 10.0), 1);
        assert_eq!(level(10.0, 10.0), 2);
        assert_eq!(level(11.0, 10.0), 3);
        assert_eq!(level(12.5, 10.0), 4);
        assert_eq!(level(3.0, 0.0), 0);
    }
}

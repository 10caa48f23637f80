//! View 3, Pattern: one head's radial application profile, and the layout's
//! rate map over one repeating cell (see [`crate::rate_map`]: the rate on a
//! continuous colour scale and as a water level in each cell, so it reads
//! without colour too; the driest quarter marked; heads where they stand; dry
//! ground as dry), with CU, DU_lq, mean rate and the spacing as a share of the
//! wetted diameter.

use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::style::{Color, Modifier, Style};
use ratatui::symbols::Marker;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Axis, Chart, Dataset, GraphType, Paragraph, Wrap};
use ratatui::Frame;

use super::{num, unit, waiting_line};
use crate::physics::layout::{pattern_name, LayoutResult};
use crate::physics::pattern::RadialProfile;
use crate::rate_map::{self, MapCell, RateMap};
use crate::tui::app::App;
use crate::tui::theme::Theme;
use crate::units::{format_quantity, to_display, Dimension as D};

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
            let mut first = vec![
                Span::styled(format!("CU {:.1} %", l.uniformity.cu_percent), t.heading()),
                Span::raw(format!(
                    " · DU_lq {:.1} % · mean {}",
                    l.uniformity.du_lq_percent,
                    rate(l.mean_rate_mm_h),
                )),
            ];
            if area.width >= 100 {
                first.push(Span::raw(format!(
                    " · run time for the driest quarter to get the mean depth {}",
                    rate_map::runtime_factor_words(l.uniformity.driest_quarter_runtime_factor)
                )));
            }
            head.push(Line::from(first));
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
            if !l.heads_meet {
                head.push(Line::styled(
                    format!(
                        "heads do not meet: {:.0} % of the ground stays dry{}",
                        l.dry_percent,
                        if l.uniformity.cu_clamped {
                            " (CU formula below zero, shown as 0)"
                        } else {
                            ""
                        }
                    ),
                    t.error(),
                ));
            }
            if let Some(r) = &spray.recommended {
                head.push(Line::styled(
                    format!(
                        "widest spacing for CU {:.0} %: {} × {} {lu}",
                        crate::tui::worker::RECOMMEND_CU_PERCENT,
                        num(to_display(D::Length, r.spacing_m, app.units)),
                        num(to_display(D::Length, r.rows_m, app.units)),
                    ),
                    t.dim(),
                ));
            }
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

/// Width of the map with its legend for `rows` lines of cells, at most `max`.
fn map_width(l: &LayoutResult, rows: u16, max: u16) -> u16 {
    let nx = l.grid.rate_mm_h.first().map_or(0, Vec::len);
    let cols =
        (f64::from(rows.saturating_sub(1)) * l.spacing_m / l.rows_m.max(1e-9)).floor() as usize + 1;
    let cols = cols.min(nx + 1) as u16;
    (2 * cols + LEGEND_W + 1).min(max)
}

/// Width of the legend column.
const LEGEND_W: u16 = 19;

fn rgb(c: (u8, u8, u8)) -> Color {
    Color::Rgb(c.0, c.1, c.2)
}

fn draw_map(app: &App, l: &LayoutResult, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let paint = |c: (u8, u8, u8)| {
        if t.no_color {
            Style::default()
        } else {
            Style::default().fg(rgb(c))
        }
    };
    let [title, below] = Layout::vertical([Constraint::Length(1), Constraint::Min(2)]).areas(area);
    let [cells, _, legend] = Layout::horizontal([
        Constraint::Min(2),
        Constraint::Length(1),
        Constraint::Length(LEGEND_W),
    ])
    .areas(below);
    frame.render_widget(
        Paragraph::new(Line::styled("rate over one repeating cell", t.dim())),
        title,
    );
    let map = RateMap::new(
        l,
        usize::from(cells.width / 2),
        usize::from(cells.height),
        app.units,
    );
    let ink = |i: rate_map::Ink| match i {
        rate_map::Ink::Head => paint(i.rgb()).add_modifier(Modifier::BOLD),
        _ => paint(i.rgb()),
    };
    let lines: Vec<Line> = map
        .rows
        .iter()
        .map(|row| {
            Line::from(
                row.iter()
                    .flat_map(MapCell::inked)
                    .map(|(c, i)| Span::styled(c.to_string(), ink(i)))
                    .collect::<Vec<_>>(),
            )
        })
        .collect();
    frame.render_widget(Paragraph::new(lines), cells);
    let mut lines = vec![Line::styled(format!("rate {}", map.scale.unit), t.dim())];
    for (g, x, label) in map.scale_entries() {
        lines.push(Line::from(vec![
            Span::styled(format!("{}{}", g[0], g[1]), paint(rate_map::scale_rgb(x))),
            Span::raw(format!(" {label}")),
        ]));
    }
    let dx = map.scale.position(map.driest_quarter_max_mm_h);
    lines.push(Line::from(vec![
        Span::styled(
            rate_map::level_glyph(dx).to_string(),
            paint(rate_map::scale_rgb(dx)),
        ),
        Span::styled(
            rate_map::DRIEST_MARK.to_string(),
            paint(rate_map::DRIEST_RGB),
        ),
        Span::raw(format!(" driest ¼ ≤{}", map.driest_label(app.units))),
    ]));
    let glyphs = |g: [char; 2]| format!("{}{}", g[0], g[1]);
    lines.push(Line::from(vec![
        Span::styled(glyphs(rate_map::DRY_GLYPHS), paint(rate_map::DRY_RGB)),
        Span::raw(" dry"),
    ]));
    lines.push(Line::from(vec![
        Span::styled(
            glyphs(rate_map::HEAD_GLYPHS),
            paint(rate_map::HEAD_RGB).add_modifier(Modifier::BOLD),
        ),
        Span::raw(" head"),
    ]));
    frame.render_widget(Paragraph::new(lines), legend);
}

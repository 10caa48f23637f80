//! The four charts of the report page, drawn with plotters' SVG backend:
//! torque against speed, drop paths, radial profile, layout map.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use crate::physics::balance::{rpm, torque_table};
use crate::physics::pattern::M_S_TO_MM_H;
use crate::physics::trajectory::FlightPath;
use crate::rate_map::{self, scale_rgb, MapCell, RateMap};
use crate::units::{format_quantity, to_display, unit_label, Dimension as D};

use super::{escape, PageError, Solved, CHART_IDS};

/// Points of the torque–speed curves.
const TABLE_POINTS: usize = 121;
/// Points of the drawn radial profile, about.
const PROFILE_POINTS: f64 = 240.0;
/// Most cells across the layout map.
const MAP_COLS: usize = 41;
/// Most rows of the layout map.
const MAP_ROWS: usize = 61;
/// Chart size, pixels.
const CHART_SIZE: (u32, u32) = (720, 420);
/// Size of a chart that holds only a note (no data to draw), pixels.
const NOTE_SIZE: (u32, u32) = (720, 80);

/// Colours of the charts (the rate map keeps its own scale).
const DRIVE: RGBColor = RGBColor(200, 80, 30);
const RESIST: RGBColor = RGBColor(40, 90, 170);
const POINT: RGBColor = RGBColor(20, 20, 20);
const LARGEST: RGBColor = RGBColor(40, 90, 170);
const MEDIAN: RGBColor = RGBColor(30, 150, 120);
const SMALL: RGBColor = RGBColor(170, 140, 40);
const MARK: RGBColor = RGBColor(200, 60, 60);
const GRID: RGBColor = RGBColor(225, 225, 225);

/// Draw one chart into an SVG string and give the `<svg>` element its id.
fn chart(
    id: &'static str,
    size: (u32, u32),
    draw: impl FnOnce(&DrawingArea<SVGBackend, Shift>) -> Result<(), Box<dyn std::error::Error>>,
) -> Result<String, PageError> {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, size).into_drawing_area();
        let fail = |e: &dyn std::fmt::Display| PageError {
            chart: id,
            message: e.to_string(),
        };
        root.fill(&WHITE).map_err(|e| fail(&e))?;
        draw(&root).map_err(|e| fail(&e))?;
        root.present().map_err(|e| fail(&e))?;
    }
    let start = svg.find("<svg").ok_or_else(|| PageError {
        chart: id,
        message: "the backend wrote no <svg> element".into(),
    })?;
    let body = svg.get(start + 4..).unwrap_or_default();
    Ok(format!("<svg id=\"{id}\" role=\"img\"{body}"))
}

/// A note in the middle of an empty chart.
fn empty_note(
    root: &DrawingArea<SVGBackend, Shift>,
    text: &str,
) -> Result<(), Box<dyn std::error::Error>> {
    let (_, h) = root.dim_in_pixel();
    root.draw(&Text::new(
        text.to_string(),
        (20, (h / 2) as i32),
        ("sans-serif", 18).into_font(),
    ))?;
    Ok(())
}

fn axis_font() -> TextStyle<'static> {
    ("sans-serif", 14).into_font().into()
}

pub(super) fn torque_caption(s: &Solved) -> String {
    let mut c = String::from(
        "Torque against speed: the jets' drive torque and the resisting torque (bearing, seal, brake, air) from rest to past runaway",
    );
    match &s.report.operating {
        Some(op) => c.push_str(&format!(
            "; the operating point (dot) at {:.1} rpm, {}.",
            rpm(op.omega_rad_s()),
            s.q(D::Torque, op.point.drive_n_m)
        )),
        None => c.push_str("; no operating point."),
    }
    c
}

pub(super) fn torque_chart(s: &Solved) -> Result<String, PageError> {
    let table = torque_table(s.design, &s.report, TABLE_POINTS);
    let t = |v: f64| to_display(D::Torque, v, s.units);
    let drive: Vec<(f64, f64)> = table
        .iter()
        .map(|p| (rpm(p.omega_rad_s), t(p.drive_n_m)))
        .collect();
    let resist: Vec<(f64, f64)> = table
        .iter()
        .map(|p| (rpm(p.omega_rad_s), t(p.resist.total_n_m())))
        .collect();
    let finite = |v: &f64| v.is_finite();
    let x_max = drive
        .iter()
        .map(|p| p.0)
        .filter(finite)
        .fold(0.0, f64::max)
        .max(1.0);
    // The drive torque and the start check set the scale; a brake's
    // resisting torque far above them is cut at the top of the chart.
    let y_top = drive
        .iter()
        .map(|p| p.1)
        .chain([t(s.report.breakaway_torque_n_m)])
        .chain(resist.first().map(|p| p.1))
        .filter(finite)
        .fold(0.0, f64::max)
        * 1.6;
    let y_min = drive
        .iter()
        .chain(&resist)
        .map(|p| p.1)
        .filter(finite)
        .fold(0.0, f64::min);
    let y_max = resist
        .iter()
        .map(|p| p.1)
        .filter(finite)
        .fold(0.0, f64::max)
        .min(y_top)
        .max(y_top / 1.6)
        .max(y_min + 1e-9);
    let pad = 0.05 * (y_max - y_min);
    let resist = clip_at(&resist, y_max + pad);
    let unit = unit_label(D::Torque, s.units);
    let op = s
        .report
        .operating
        .as_ref()
        .map(|op| (rpm(op.omega_rad_s()), t(op.point.drive_n_m)));
    chart(CHART_IDS[0], CHART_SIZE, |root| {
        let mut c = ChartBuilder::on(root)
            .caption("Torque against speed", ("sans-serif", 20))
            .margin(12)
            .x_label_area_size(44)
            .y_label_area_size(70)
            .build_cartesian_2d(0.0..x_max, (y_min - pad)..(y_max + pad))?;
        c.configure_mesh()
            .light_line_style(GRID)
            .x_desc("speed, rpm")
            .y_desc(format!("torque, {unit}"))
            .axis_desc_style(axis_font())
            .draw()?;
        c.draw_series(LineSeries::new(drive.clone(), DRIVE.stroke_width(2)))?
            .label("drive torque of the jets")
            .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], DRIVE.stroke_width(2)));
        c.draw_series(LineSeries::new(resist.clone(), RESIST.stroke_width(2)))?
            .label("resisting torque")
            .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], RESIST.stroke_width(2)));
        if let Some(p) = op {
            c.draw_series(std::iter::once(Circle::new(p, 5, POINT.filled())))?
                .label(format!("operating point, {:.1} rpm", p.0))
                .legend(|(x, y)| Circle::new((x + 10, y), 4, POINT.filled()));
        }
        c.configure_series_labels()
            .background_style(WHITE.mix(0.85))
            .border_style(BLACK)
            .label_font(axis_font())
            .draw()?;
        Ok(())
    })
}

/// The points of a rising curve up to where it crosses `top`, ending on it.
fn clip_at(points: &[(f64, f64)], top: f64) -> Vec<(f64, f64)> {
    let mut out = Vec::with_capacity(points.len());
    for (k, &(x, y)) in points.iter().enumerate() {
        if y <= top {
            out.push((x, y));
            continue;
        }
        if let Some(&(x0, y0)) = k.checked_sub(1).and_then(|j| points.get(j)) {
            if y0 < top && y > y0 {
                out.push((x0 + (x - x0) * (top - y0) / (y - y0), top));
            }
        }
        break;
    }
    out
}

/// A drawn drop path: its points, colour and legend label.
type Curve = (Vec<(f64, f64)>, RGBColor, &'static str);

fn side(path: &FlightPath, to: &impl Fn(f64) -> f64) -> Vec<(f64, f64)> {
    path.points
        .iter()
        .map(|p| (to(p.position_m.x.hypot(p.position_m.y)), to(p.position_m.z)))
        .collect()
}

pub(super) fn paths_caption(s: &Solved) -> String {
    match &s.head {
        Some(h) => format!(
            "Drop paths from each nozzle (the intact jet, then the largest, median and small drops), in still air, seen from the side: the highest rises to {} (dashed line); the wetted radius {} (red line){}.",
            s.q(D::Length, h.throw.peak_height_m),
            s.q(D::Length, h.throw.wetted_radius_m),
            s.design
                .site
                .clearance_m
                .map_or(String::new(), |c| format!(
                    "; the stated overhead clearance {} (dotted line)",
                    s.q(D::Length, c)
                ))
        ),
        None => "Drop paths: none, the head throws no water.".to_string(),
    }
}

pub(super) fn paths_chart(s: &Solved) -> Result<String, PageError> {
    let to = |v: f64| to_display(D::Length, v, s.units);
    let Some(head) = &s.head else {
        return chart(CHART_IDS[1], NOTE_SIZE, |root| {
            empty_note(root, "No drop paths: the head throws no water.")
        });
    };
    let curves: Vec<Curve> = s
        .paths
        .iter()
        .flatten()
        .flat_map(|p| {
            [
                (side(&p.small, &to), SMALL, "small drop"),
                (side(&p.median, &to), MEDIAN, "median drop"),
                (side(&p.largest, &to), LARGEST, "largest drop"),
            ]
        })
        .collect();
    let wetted = to(head.throw.wetted_radius_m);
    let peak = to(head.throw.peak_height_m);
    let clearance = s.design.site.clearance_m.map(to);
    let x_max = curves
        .iter()
        .flat_map(|(pts, _, _)| pts.iter().map(|p| p.0))
        .filter(|v| v.is_finite())
        .fold(wetted, f64::max)
        .max(0.1)
        * 1.05;
    let y_max = curves
        .iter()
        .flat_map(|(pts, _, _)| pts.iter().map(|p| p.1))
        .filter(|v| v.is_finite())
        .fold(peak.max(clearance.unwrap_or(0.0)), f64::max)
        .max(0.1)
        * 1.5;
    let unit = unit_label(D::Length, s.units);
    chart(CHART_IDS[1], CHART_SIZE, |root| {
        let mut c = ChartBuilder::on(root)
            .caption("Drop paths", ("sans-serif", 20))
            .margin(12)
            .x_label_area_size(44)
            .y_label_area_size(60)
            .build_cartesian_2d(0.0..x_max, 0.0..y_max)?;
        c.configure_mesh()
            .light_line_style(GRID)
            .x_desc(format!("distance from the head, {unit}"))
            .y_desc(format!("height above ground, {unit}"))
            .axis_desc_style(axis_font())
            .draw()?;
        let mut labelled = [false; 3];
        for (pts, colour, label) in &curves {
            let k = match *label {
                "small drop" => 0,
                "median drop" => 1,
                _ => 2,
            };
            let series = c.draw_series(LineSeries::new(pts.clone(), colour.stroke_width(2)))?;
            if let Some(done) = labelled.get_mut(k) {
                if !*done {
                    *done = true;
                    let colour = *colour;
                    series.label(*label).legend(move |(x, y)| {
                        PathElement::new(vec![(x, y), (x + 20, y)], colour.stroke_width(2))
                    });
                }
            }
        }
        c.draw_series(DashedLineSeries::new(
            vec![(0.0, peak), (x_max, peak)],
            8,
            5,
            POINT.stroke_width(1),
        ))?
        .label(format!(
            "peak height {}",
            format_quantity(D::Length, head.throw.peak_height_m, s.units)
        ))
        .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], POINT.stroke_width(1)));
        c.draw_series(LineSeries::new(
            vec![(wetted, 0.0), (wetted, y_max * 0.95)],
            MARK.stroke_width(2),
        ))?
        .label(format!(
            "wetted radius {}",
            format_quantity(D::Length, head.throw.wetted_radius_m, s.units)
        ))
        .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], MARK.stroke_width(2)));
        if let (Some(cl), Some(cl_m)) = (clearance, s.design.site.clearance_m) {
            c.draw_series(DashedLineSeries::new(
                vec![(0.0, cl), (x_max, cl)],
                2,
                4,
                MARK.stroke_width(2),
            ))?
            .label(format!(
                "overhead clearance {}",
                format_quantity(D::Length, cl_m, s.units)
            ))
            .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 20, y)], MARK.stroke_width(1)));
        }
        c.configure_series_labels()
            .position(SeriesLabelPosition::UpperLeft)
            .background_style(WHITE.mix(0.85))
            .border_style(BLACK)
            .label_font(axis_font())
            .draw()?;
        Ok(())
    })
}

pub(super) fn profile_caption(s: &Solved) -> String {
    match &s.head {
        Some(h) => {
            let peak = h.throw.profile.peak();
            format!(
                "Radial profile: the application rate of one head against the distance from it, still air{}; the wetted radius {} (red line).",
                peak.map_or(String::new(), |p| format!(
                    ", highest {} at {}",
                    s.q(D::ApplicationRate, p.rate_mm_h / M_S_TO_MM_H),
                    s.q(D::Length, 0.5 * (p.inner_m + p.outer_m))
                )),
                s.q(D::Length, h.throw.wetted_radius_m)
            )
        }
        None => "Radial profile: none, the head throws no water.".to_string(),
    }
}

pub(super) fn profile_chart(s: &Solved) -> Result<String, PageError> {
    let Some(head) = &s.head else {
        return chart(CHART_IDS[2], NOTE_SIZE, |root| {
            empty_note(root, "No radial profile: the head throws no water.")
        });
    };
    let to_len = |v: f64| to_display(D::Length, v, s.units);
    let to_rate = |mm_h: f64| to_display(D::ApplicationRate, mm_h / M_S_TO_MM_H, s.units);
    let profile = &head.throw.profile;
    let outer = profile.outer_radius_m();
    let pts: Vec<(f64, f64)> = profile
        .sampled(outer / PROFILE_POINTS)
        .iter()
        .map(|p| (to_len(p.r_m), to_rate(p.rate_mm_h)))
        .filter(|p| p.0.is_finite() && p.1.is_finite())
        .collect();
    let wetted = to_len(head.throw.wetted_radius_m);
    let x_max = pts.iter().map(|p| p.0).fold(wetted, f64::max).max(0.1) * 1.05;
    let y_max = pts.iter().map(|p| p.1).fold(0.0, f64::max).max(1e-6) * 1.1;
    let len = unit_label(D::Length, s.units);
    let rate = unit_label(D::ApplicationRate, s.units);
    chart(CHART_IDS[2], CHART_SIZE, |root| {
        let mut c = ChartBuilder::on(root)
            .caption("Radial profile", ("sans-serif", 20))
            .margin(12)
            .x_label_area_size(44)
            .y_label_area_size(70)
            .build_cartesian_2d(0.0..x_max, 0.0..y_max)?;
        c.configure_mesh()
            .light_line_style(GRID)
            .x_desc(format!("distance from the head, {len}"))
            .y_desc(format!("application rate, {rate}"))
            .axis_desc_style(axis_font())
            .draw()?;
        c.draw_series(
            AreaSeries::new(pts.clone(), 0.0, RESIST.mix(0.25))
                .border_style(RESIST.stroke_width(2)),
        )?;
        c.draw_series(LineSeries::new(
            vec![(wetted, 0.0), (wetted, y_max * 0.95)],
            MARK.stroke_width(2),
        ))?;
        Ok(())
    })
}

pub(super) fn layout_caption(s: &Solved) -> String {
    match &s.layout {
        None => "Layout map: the design names no layout.".to_string(),
        Some(Err(e)) => format!("Layout map: none ({}).", escape(e)),
        Some(Ok(l)) => {
            let map = RateMap::new(l, MAP_COLS, MAP_ROWS, s.units);
            format!(
                "{}: the rate on a continuous scale (legend at the right, {}); the driest quarter (at most {} {}) marked with a dot; dry ground brown; heads as red rings.",
                escape(&rate_map::title(&l.layout)),
                escape(map.scale.unit),
                escape(&map.driest_label(s.units)),
                escape(map.scale.unit)
            )
        }
    }
}

fn rgb((r, g, b): (u8, u8, u8)) -> RGBColor {
    RGBColor(r, g, b)
}

pub(super) fn layout_chart(s: &Solved) -> Result<String, PageError> {
    let l = match &s.layout {
        Some(Ok(l)) => l,
        None => {
            return chart(CHART_IDS[3], NOTE_SIZE, |root| {
                empty_note(root, "No layout map: the design names no layout.")
            })
        }
        Some(Err(_)) => {
            return chart(CHART_IDS[3], NOTE_SIZE, |root| {
                empty_note(root, "No layout map: the overlap could not be worked out.")
            })
        }
    };
    let map = RateMap::new(l, MAP_COLS, MAP_ROWS, s.units);
    let to = |v: f64| to_display(D::Length, v, s.units);
    let (w, h) = (to(l.spacing_m), to(l.rows_m));
    let rows = map.rows.len();
    let cols = map.rows.first().map_or(0, Vec::len);
    let unit = unit_label(D::Length, s.units);
    // The map keeps the cell's shape: the plot is sized to the cell's aspect.
    let plot_w = 480.0_f64;
    let plot_h = (plot_w * h / w.max(1e-9)).clamp(160.0, 640.0);
    let size = (720_u32, plot_h as u32 + 120);
    chart(CHART_IDS[3], size, |root| {
        let (left, right) = root.split_horizontally(580);
        let mut c = ChartBuilder::on(&left)
            .caption("Layout map", ("sans-serif", 20))
            .margin(16)
            .x_label_area_size(44)
            .y_label_area_size(60)
            .build_cartesian_2d(0.0..w, 0.0..h)?;
        c.configure_mesh()
            .disable_mesh()
            .x_desc(format!("along a row, {unit}"))
            .y_desc(format!("across the rows, {unit}"))
            .axis_desc_style(axis_font())
            .draw()?;
        if cols >= 2 && rows >= 2 {
            let dx = w / (cols - 1) as f64;
            let dy = h / (rows - 1) as f64;
            let centre = |i: usize, c: usize| (c as f64 * dx, (rows - 1 - i) as f64 * dy);
            let clip = |x: f64, y: f64| (x.clamp(0.0, w), y.clamp(0.0, h));
            let mut cells = Vec::new();
            let mut marks = Vec::new();
            let mut heads = Vec::new();
            for (i, line) in map.rows.iter().enumerate() {
                for (j, cell) in line.iter().enumerate() {
                    let (x, y) = centre(i, j);
                    let a = clip(x - dx / 2.0, y - dy / 2.0);
                    let b = clip(x + dx / 2.0, y + dy / 2.0);
                    match *cell {
                        MapCell::Head => {
                            cells.push(Rectangle::new([a, b], WHITE.filled()));
                            heads.push((x, y));
                        }
                        MapCell::Dry => {
                            cells.push(Rectangle::new([a, b], rgb(rate_map::DRY_RGB).filled()))
                        }
                        MapCell::Wet { t, driest, .. } => {
                            cells.push(Rectangle::new([a, b], rgb(scale_rgb(t)).filled()));
                            if driest {
                                marks.push((x, y));
                            }
                        }
                    }
                }
            }
            c.draw_series(cells)?;
            c.draw_series(
                marks
                    .into_iter()
                    .map(|p| Circle::new(p, 2, rgb(rate_map::DRIEST_RGB).filled())),
            )?;
            c.draw_series(
                heads
                    .into_iter()
                    .map(|p| Circle::new(p, 7, rgb(rate_map::HEAD_RGB).stroke_width(3))),
            )?;
        }
        // The legend: the continuous scale with its round values.
        let (lo, hi) = (map.scale.lo_mm_h, map.scale.hi_mm_h);
        let to_rate = |mm_h: f64| to_display(D::ApplicationRate, mm_h / M_S_TO_MM_H, s.units);
        let (rlo, rhi) = (to_rate(lo), to_rate(hi).max(to_rate(lo) + 1e-9));
        let mut k = ChartBuilder::on(&right)
            .caption(map.scale.unit, ("sans-serif", 14))
            .margin_top(30)
            .margin_bottom(56)
            .margin_right(8)
            .build_cartesian_2d(0.0..3.0, rlo..rhi)?;
        let steps = 64;
        k.draw_series((0..steps).map(|i| {
            let t0 = i as f64 / steps as f64;
            let t1 = (i + 1) as f64 / steps as f64;
            Rectangle::new(
                [(0.0, rlo + t0 * (rhi - rlo)), (1.0, rlo + t1 * (rhi - rlo))],
                rgb(scale_rgb((t0 + t1) / 2.0)).filled(),
            )
        }))?;
        k.draw_series(map.scale.ticks.iter().map(|(v, label)| {
            Text::new(
                label.clone(),
                (1.2, to_rate(*v)),
                TextStyle::from(("sans-serif", 13).into_font())
                    .pos(Pos::new(HPos::Left, VPos::Center)),
            )
        }))?;
        k.draw_series(
            map.scale.ticks.iter().map(|(v, _)| {
                PathElement::new(vec![(0.8, to_rate(*v)), (1.1, to_rate(*v))], BLACK)
            }),
        )?;
        Ok(())
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_curve_is_cut_where_it_crosses_the_top() {
        let c = clip_at(&[(0.0, 0.0), (1.0, 1.0), (2.0, 3.0), (3.0, 9.0)], 2.0);
        assert_eq!(c, vec![(0.0, 0.0), (1.0, 1.0), (1.5, 2.0)]);
        assert_eq!(clip_at(&[(0.0, 5.0)], 2.0), vec![]);
    }
}

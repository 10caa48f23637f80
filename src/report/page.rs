//! The report to hand over: one self-contained HTML page of a design.
//!
//! The page holds the job (scenario name, file, notes), the operating point
//! and start check, the warnings (the model's and the practice cautions of
//! [`crate::physics::checks`], worded by [`crate::words`]), four charts as
//! inline SVG drawn with the plotters crate's SVG backend (torque against
//! speed, drop paths, radial profile, layout map), the design's inputs from
//! the catalogue, and the safety cautions. Every number a person reads is in
//! the chosen unit system. Nothing here touches a terminal or a file: the
//! caller writes the text returned by [`page`].
//!
//! The page is written so that it also parses as XML (every element closed,
//! attributes quoted, no named entities but the five XML ones), so tests can
//! read it with an XML parser. User text (the scenario name, the file name,
//! the notes) is escaped with [`escape`].
//!
//! The four charts carry the ids [`CHART_IDS`]; the speed and the wetted
//! radius carry the ids `speed` and `wetted-radius`.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use crate::catalogue::{self, Group};
use crate::physics::balance::{rpm, solve, torque_table, SpinReport, SpinStatus};
use crate::physics::checks::{cautions, peak_heights_m, Caution, Rules};
use crate::physics::coverage::{flight_env, head_throw, layout_overlap, HeadThrow};
use crate::physics::design::Design;
use crate::physics::layout::{pattern_name, LayoutResult, OverlapOptions};
use crate::physics::pattern::{nozzle_paths, NozzlePaths, PatternOptions, M_S_TO_MM_H};
use crate::physics::trajectory::FlightPath;
use crate::rate_map::{self, scale_rgb, MapCell, RateMap};
use crate::units::{format_quantity, to_display, unit_label, Dimension as D, UnitSystem};

/// Ids of the four charts, in page order: torque against speed, drop paths,
/// radial profile, layout map.
pub const CHART_IDS: [&str; 4] = [
    "chart-torque",
    "chart-paths",
    "chart-profile",
    "chart-layout",
];

/// The safety cautions on every page (the README's, in short).
pub const SAFETY: [&str; 6] = [
    "Eyes: a spinning arm and its jets can injure eyes. Keep faces clear of a running head; \
     wear eye protection when testing on the bench.",
    "Depressurise before service: shut off and bleed the supply before opening a head, \
     changing a nozzle or measuring friction by hand.",
    "Backflow: on a potable (drinking-water) supply fit the backflow prevention your local \
     code requires.",
    "Electricity: keep controllers, pumps and their wiring dry; work on them only with the \
     power isolated.",
    "Overhead power lines: never let a jet reach overhead lines; site heads so the throw \
     stays well clear of them.",
    "The numbers on this page are engineering estimates. Local codes and licensed practice \
     take precedence over anything this report says.",
];

/// Points of the torque–speed curves.
const TABLE_POINTS: usize = 121;
/// Points of each drawn drop path.
const PATH_SAMPLES: usize = 64;
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

/// The job the page is for: where the design came from and what its author wrote.
#[derive(Debug, Clone, Copy)]
pub struct Job<'a> {
    /// The scenario file as the user named it.
    pub file: &'a str,
    /// The scenario's notes (may be empty).
    pub notes: &'a str,
}

/// Why a page could not be made.
#[derive(Debug, thiserror::Error)]
#[error("cannot draw the {chart} chart: {message}")]
pub struct PageError {
    /// Which chart.
    pub chart: &'static str,
    /// What the plotting library said.
    pub message: String,
}

/// Text with the five XML/HTML special characters escaped, for element text
/// and attribute values.
pub fn escape(text: &str) -> String {
    let mut s = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => s.push_str("&amp;"),
            '<' => s.push_str("&lt;"),
            '>' => s.push_str("&gt;"),
            '"' => s.push_str("&quot;"),
            '\'' => s.push_str("&#39;"),
            c => s.push(c),
        }
    }
    s
}

/// Everything the page shows, worked out once.
struct Solved<'a> {
    design: &'a Design,
    report: SpinReport,
    head: Option<HeadThrow>,
    paths: Vec<Option<NozzlePaths>>,
    layout: Option<Result<LayoutResult, String>>,
    cautions: Vec<Caution>,
    units: UnitSystem,
}

impl<'a> Solved<'a> {
    fn new(design: &'a Design, units: UnitSystem) -> Self {
        let report = solve(design);
        let opts = PatternOptions::default();
        let head = head_throw(design, &report, &opts, None).ok();
        let env = flight_env(design);
        let paths = head.as_ref().map_or_else(Vec::new, |h| {
            h.spraying
                .jets
                .iter()
                .zip(&h.throw.nozzles)
                .map(|(jet, nt)| {
                    nt.as_ref().and_then(|nt| {
                        nozzle_paths(jet, nt, &h.spray, &env, &opts.flight, PATH_SAMPLES).ok()
                    })
                })
                .collect()
        });
        let layout = design.layout.map(|l| match &head {
            Some(h) => layout_overlap(design, h, &l, &opts, &OverlapOptions::default())
                .map_err(|e| e.to_string()),
            None => Err("the head throws no water".to_string()),
        });
        let rules = Rules::for_design(design);
        let peaks = match (rules.clearance_m, &head) {
            (Some(_), Some(h)) => Some(peak_heights_m(design, h, &opts.flight)),
            _ => None,
        };
        let cautions = cautions(design, &report, peaks.as_deref(), &rules);
        Solved {
            design,
            report,
            head,
            paths,
            layout,
            cautions,
            units,
        }
    }

    fn q(&self, dim: D, si: f64) -> String {
        escape(&format_quantity(dim, si, self.units))
    }
}

/// The whole page of `design`, numbers in `units`.
pub fn page(design: &Design, job: &Job, units: UnitSystem) -> Result<String, PageError> {
    let s = Solved::new(design, units);
    let mut h = String::new();
    let name = escape(&design.name);
    h.push_str("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n");
    h.push_str(&format!("<title>{name}: design report</title>\n"));
    h.push_str(STYLE);
    h.push_str("</head>\n<body>\n");
    h.push_str(&format!("<h1>{name}</h1>\n"));
    h.push_str(&job_section(job, units));
    h.push_str(&operating_section(&s));
    h.push_str(&warnings_section(&s));
    h.push_str("<section id=\"charts\">\n<h2>Charts</h2>\n");
    let charts = [
        (torque_chart(&s)?, torque_caption(&s)),
        (paths_chart(&s)?, paths_caption(&s)),
        (profile_chart(&s)?, profile_caption(&s)),
        (layout_chart(&s)?, layout_caption(&s)),
    ];
    for (svg, caption) in charts {
        h.push_str(&format!(
            "<figure>\n{svg}\n<figcaption>{caption}</figcaption>\n</figure>\n"
        ));
    }
    h.push_str("</section>\n");
    h.push_str(&inputs_section(&s));
    h.push_str("<section id=\"safety\">\n<h2>Safety</h2>\n<ul>\n");
    for c in SAFETY {
        h.push_str(&format!("<li>{}</li>\n", escape(c)));
    }
    h.push_str("</ul>\n</section>\n");
    h.push_str(&format!(
        "<footer>Written by spinwright {}. Throw, drop paths and profile are for still air.</footer>\n",
        env!("CARGO_PKG_VERSION")
    ));
    h.push_str("</body>\n</html>\n");
    Ok(h)
}

const STYLE: &str = "<style>
body { font-family: sans-serif; max-width: 60em; margin: 2em auto; padding: 0 1em; color: #222; }
h1 { margin-bottom: 0.2em; }
table { border-collapse: collapse; margin: 0.5em 0 1em 0; }
td, th { padding: 0.15em 0.8em 0.15em 0; text-align: left; vertical-align: top; }
th { font-weight: normal; color: #555; }
table.arms td, table.arms th + th { text-align: right; }
.notes { white-space: pre-wrap; background: #f6f6f2; padding: 0.5em; }
.warn { color: #8a2b00; }
figure { margin: 1em 0; }
figure svg { max-width: 100%; height: auto; }
figcaption { color: #444; font-size: 0.9em; }
footer { margin-top: 2em; color: #666; font-size: 0.85em; }
</style>
";

fn system_words(units: UnitSystem) -> &'static str {
    match units {
        UnitSystem::Metric => "metric",
        UnitSystem::Us => "US",
    }
}

fn job_section(job: &Job, units: UnitSystem) -> String {
    let mut h = String::from("<section id=\"job\">\n<table>\n");
    h.push_str(&format!(
        "<tr><th>scenario file</th><td>{}</td></tr>\n",
        escape(job.file)
    ));
    h.push_str(&format!(
        "<tr><th>units</th><td>{}</td></tr>\n</table>\n",
        system_words(units)
    ));
    if !job.notes.trim().is_empty() {
        h.push_str(&format!(
            "<p class=\"notes\">{}</p>\n",
            escape(job.notes.trim())
        ));
    }
    h.push_str("</section>\n");
    h
}

fn row(h: &mut String, label: &str, value: &str) {
    h.push_str(&format!("<tr><th>{label}</th><td>{value}</td></tr>\n"));
}

fn operating_section(s: &Solved) -> String {
    let r = &s.report;
    let mut h = String::from("<section id=\"operating\">\n<h2>Operating point</h2>\n<table>\n");
    let status = match r.status {
        SpinStatus::Running => "runs",
        SpinStatus::StallsAtRest => "stalls at rest: the stall torque does not overcome breakaway",
        SpinStatus::NoEquilibrium => "no equilibrium: it keeps accelerating",
    };
    row(&mut h, "status", status);
    let r_max = s
        .design
        .rotor
        .arms
        .iter()
        .map(|a| a.radius_m)
        .fold(0.0, f64::max);
    if let Some(op) = &r.operating {
        let w = op.omega_rad_s();
        row(
            &mut h,
            "speed",
            &format!("<span id=\"speed\">{:.1} rpm</span>", rpm(w)),
        );
        row(
            &mut h,
            "time per turn",
            &format!("{:.2} s", 2.0 * std::f64::consts::PI / w),
        );
        row(&mut h, "tip speed", &s.q(D::Speed, w * r_max));
        row(&mut h, "drive torque", &s.q(D::Torque, op.point.drive_n_m));
        let rs = op.point.resist;
        row(
            &mut h,
            "resisting torque",
            &format!(
                "{} = bearing {} + seal {} + brake {} + air {}",
                s.q(D::Torque, rs.total_n_m()),
                s.q(D::Torque, rs.bearing_n_m),
                s.q(D::Torque, rs.seal_n_m),
                s.q(D::Torque, rs.brake_n_m),
                s.q(D::Torque, rs.air_n_m)
            ),
        );
        if let Some(sp) = r.spin_up {
            row(
                &mut h,
                "spin-up from rest",
                &format!(
                    "90 % in {:.2} s, 99 % in {:.2} s (inertia {})",
                    sp.t90_s,
                    sp.t99_s,
                    s.q(D::Inertia, r.inertia_kg_m2)
                ),
            );
        }
    }
    h.push_str("</table>\n<h3>Start check</h3>\n<table>\n");
    row(&mut h, "stall torque", &s.q(D::Torque, r.stall_torque_n_m));
    row(
        &mut h,
        "breakaway torque",
        &s.q(D::Torque, r.breakaway_torque_n_m),
    );
    row(
        &mut h,
        "start margin",
        &r.start_margin
            .map_or("none (no breakaway torque)".into(), |m| {
                format!("{m:.2} (stall over breakaway torque)")
            }),
    );
    row(
        &mut h,
        "frictionless runaway",
        &r.runaway_rad_s
            .map_or("none (jets stay ahead of the arm)".into(), |w| {
                format!("{:.0} rpm", rpm(w))
            }),
    );
    h.push_str("</table>\n<h3>Water</h3>\n<table>\n");
    let state = r
        .operating
        .as_ref()
        .map_or(&r.at_rest, |op| &op.point.state);
    row(
        &mut h,
        if r.operating.is_some() {
            "inlet pressure at speed"
        } else {
            "inlet pressure at rest"
        },
        &s.q(D::Pressure, state.inlet_pressure_pa),
    );
    row(
        &mut h,
        "hub pressure",
        &s.q(D::Pressure, state.hub_pressure_pa),
    );
    row(&mut h, "total flow", &s.q(D::Flow, state.total_flow_m3_s));
    if let Some(head) = &s.head {
        row(
            &mut h,
            "wetted radius",
            &format!(
                "<span id=\"wetted-radius\">{}</span> (still air, to the testing standards' wetted edge)",
                s.q(D::Length, head.throw.wetted_radius_m)
            ),
        );
        row(
            &mut h,
            "peak height of the drop paths",
            &s.q(D::Length, head.throw.peak_height_m),
        );
    } else {
        row(&mut h, "wetted radius", "none: the head throws no water");
    }
    if let Some(Ok(l)) = &s.layout {
        row(
            &mut h,
            "layout",
            &format!(
                "{}, heads {} apart along rows {} apart: CU {:.1} %, DU (low quarter) {:.1} %, mean rate {}",
                pattern_name(&l.layout),
                s.q(D::Length, l.spacing_m),
                s.q(D::Length, l.rows_m),
                l.uniformity.cu_percent,
                l.uniformity.du_lq_percent,
                s.q(D::ApplicationRate, l.mean_rate_mm_h / M_S_TO_MM_H)
            ),
        );
    }
    h.push_str("</table>\n</section>\n");
    h
}

fn warnings_section(s: &Solved) -> String {
    let mut h = String::from("<section id=\"warnings\">\n<h2>Warnings</h2>\n");
    let words: Vec<String> = s
        .report
        .warnings
        .iter()
        .map(ToString::to_string)
        .chain(s.cautions.iter().map(|c| crate::words::caution(c, s.units)))
        .collect();
    if words.is_empty() {
        h.push_str("<p>None: the model warns of nothing, and no practice check fires (start margin, speed, \
             tip speed, spin-raised nozzle pressure, spin-up time, and the overhead clearance \
             when the scenario states one).</p>\n");
    } else {
        h.push_str("<ul>\n");
        for w in words {
            h.push_str(&format!("<li class=\"warn\">{}</li>\n", escape(&w)));
        }
        h.push_str("</ul>\n");
    }
    h.push_str("</section>\n");
    h
}

fn inputs_section(s: &Solved) -> String {
    let mut h = String::from("<section id=\"inputs\">\n<h2>Design inputs</h2>\n");
    let present = catalogue::present(s.design);
    let arms = s.design.rotor.arms.len();
    for group in Group::ALL {
        let items: Vec<_> = present.iter().filter(|(i, _)| i.group == group).collect();
        if items.is_empty() {
            continue;
        }
        h.push_str(&format!("<h3>{}</h3>\n<table>\n", escape(group.title())));
        for (input, _) in items.iter().filter(|(_, arm)| arm.is_none()) {
            row(
                &mut h,
                &escape(input.label),
                &escape(&input.show(s.design, None, s.units)),
            );
        }
        h.push_str("</table>\n");
        // Per-arm inputs: one row per input, one column per arm.
        let per_arm: Vec<_> = items.iter().filter(|(_, arm)| *arm == Some(0)).collect();
        if !per_arm.is_empty() {
            h.push_str("<table class=\"arms\">\n<tr><th></th>");
            for k in 0..arms {
                h.push_str(&format!("<th>arm {}</th>", k + 1));
            }
            h.push_str("</tr>\n");
            for (input, _) in per_arm {
                h.push_str(&format!("<tr><th>{}</th>", escape(input.label)));
                for k in 0..arms {
                    h.push_str(&format!(
                        "<td>{}</td>",
                        escape(&input.show(s.design, Some(k), s.units))
                    ));
                }
                h.push_str("</tr>\n");
            }
            h.push_str("</table>\n");
        }
    }
    h.push_str("</section>\n");
    h
}

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

fn torque_caption(s: &Solved) -> String {
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

fn torque_chart(s: &Solved) -> Result<String, PageError> {
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

fn paths_caption(s: &Solved) -> String {
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

fn paths_chart(s: &Solved) -> Result<String, PageError> {
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

fn profile_caption(s: &Solved) -> String {
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

fn profile_chart(s: &Solved) -> Result<String, PageError> {
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

fn layout_caption(s: &Solved) -> String {
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

fn layout_chart(s: &Solved) -> Result<String, PageError> {
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
    use crate::physics::fixtures::three_arm_rotor;

    #[test]
    fn escape_covers_the_special_characters() {
        assert_eq!(
            escape("a<b & \"c\" 'd'>"),
            "a&lt;b &amp; &quot;c&quot; &#39;d&#39;&gt;"
        );
    }

    #[test]
    fn a_curve_is_cut_where_it_crosses_the_top() {
        let c = clip_at(&[(0.0, 0.0), (1.0, 1.0), (2.0, 3.0), (3.0, 9.0)], 2.0);
        assert_eq!(c, vec![(0.0, 0.0), (1.0, 1.0), (1.5, 2.0)]);
        assert_eq!(clip_at(&[(0.0, 5.0)], 2.0), vec![]);
    }

    #[test]
    fn a_page_has_four_charts_and_escapes_the_name() {
        let mut d = three_arm_rotor();
        d.name = "<script>x</script> & co".into();
        let job = Job {
            file: "a<b>.ron",
            notes: "line & <one>",
        };
        let html = page(&d, &job, UnitSystem::Us).unwrap();
        assert!(!html.contains("<script>"));
        assert!(html.contains("&lt;script&gt;x&lt;/script&gt; &amp; co"));
        assert!(html.contains("line &amp; &lt;one&gt;"));
        for id in CHART_IDS {
            assert_eq!(
                html.matches(&format!("<svg id=\"{id}\"")).count(),
                1,
                "{id}"
            );
        }
        assert!(!html.contains("NaN"));
    }
}

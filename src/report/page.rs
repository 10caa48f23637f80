//! The report to hand over: one self-contained HTML page of a design.
//!
//! The page holds the job (scenario name, file, notes), the operating point
//! and start check, the warnings (the model's and the practice cautions of
//! [`crate::physics::checks`], worded by [`crate::words`]), four charts as
//! inline SVG drawn with the plotters crate's SVG backend (torque against
//! speed, drop paths, radial profile, layout map; in `page/charts.rs`), the
//! design's inputs from the catalogue, and the safety cautions. Every number a person reads is in
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

use crate::catalogue::{self, Group};
use crate::physics::balance::{rpm, solve, SpinReport, SpinStatus};
use crate::physics::checks::{practice_cautions, Caution};
use crate::physics::coverage::{flight_env, head_throw, layout_overlap, HeadThrow};
use crate::physics::design::Design;
use crate::physics::layout::{pattern_name, LayoutResult, OverlapOptions};
use crate::physics::pattern::{nozzle_paths, NozzlePaths, PatternOptions, M_S_TO_MM_H};
use crate::units::{format_quantity, Dimension as D, UnitSystem};

mod charts;

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

/// Points of each drawn drop path.
const PATH_SAMPLES: usize = 64;

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
        let cautions = practice_cautions(design, &report, head.as_ref(), &opts.flight);
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
        (charts::torque_chart(&s)?, charts::torque_caption(&s)),
        (charts::paths_chart(&s)?, charts::paths_caption(&s)),
        (charts::profile_chart(&s)?, charts::profile_caption(&s)),
        (charts::layout_chart(&s)?, charts::layout_caption(&s)),
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
    let r_max = s.design.rotor.tip_radius_m();
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
    let state = r.described_state();
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

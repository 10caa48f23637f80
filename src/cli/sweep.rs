//! `sweep`: one or two design inputs over ranges, a row (or a grid cell) per point.

use std::io::Write;
use std::path::Path;

use super::text::{csv_number, sig, TextTable};
use super::values::{named_range, parameter_dimension, parameter_value, NamedRange};
use super::{load_design, progress_bar, CliError, Format, Outcome, Output, ShowArg};
use crate::catalogue::{self};
use crate::inverse::sweep::{sweep_with, SweepAxis};
use crate::physics::balance::SpinReport;
use crate::physics::coverage::{head_throw, layout_overlap, wetted_radius_m};
use crate::physics::design::Design;
use crate::physics::layout::OverlapOptions;
use crate::physics::pattern::PatternOptions;
use crate::units::{csv_key, to_display, unit_label, Dimension as D, UnitSystem};

/// Largest number of points along one sweep axis.
pub const MAX_POINTS: usize = 100_000;

/// Parse `--points N` or `--points N,M`: the points along each of `axes`
/// axes (one number serves every axis).
pub fn parse_points(text: &str, axes: usize) -> Result<Vec<usize>, CliError> {
    let bad = |why: String| CliError::Usage(format!("--points {text}: {why}"));
    let counts = text
        .split(',')
        .map(|t| {
            t.trim()
                .parse::<usize>()
                .ok()
                .filter(|n| (1..=MAX_POINTS).contains(n))
                .ok_or_else(|| {
                    bad(format!(
                        "`{}` is not a whole number from 1 to {MAX_POINTS}",
                        t.trim()
                    ))
                })
        })
        .collect::<Result<Vec<_>, _>>()?;
    match (counts.as_slice(), axes) {
        ([n], k) => Ok(vec![*n; k]),
        (c, k) if c.len() == k => Ok(c.to_vec()),
        (c, k) => Err(bad(format!(
            "{} counts for {k} --vary axis{}; give one, or one per axis",
            c.len(),
            if k == 1 { "" } else { "es" }
        ))),
    }
}

/// Parse `NAME=FROM..TO` into an axis of `points` values. The old form
/// `NAME=FROM:TO:STEPS` is refused with the new spelling in the message.
pub fn parse_axis(text: &str, points: usize) -> Result<SweepAxis, CliError> {
    let example = "e.g. --vary deflection=0..60 --points 13";
    let bad = |why: &str| {
        CliError::Usage(format!(
            "--vary {text}: {why} (write NAME=FROM..TO, {example})"
        ))
    };
    let NamedRange {
        input: parameter,
        range,
        ends,
    } = named_range("--vary", text, example)?;
    let Some((from, to)) = ends else {
        let parts: Vec<&str> = range.split(':').collect();
        if let [from, to, steps] = parts.as_slice() {
            return Err(CliError::Usage(format!(
                "--vary {text}: a range is now written FROM..TO with the number of points apart: \
                 --vary {}={}..{} --points {}",
                text.split_once('=').map_or("", |(name, _)| name.trim()),
                from.trim(),
                to.trim(),
                steps.trim()
            )));
        }
        return Err(bad("expected FROM..TO"));
    };
    if points == 0 || points > MAX_POINTS {
        return Err(bad("the number of points must be 1 to 100000"));
    }
    Ok(SweepAxis {
        input: parameter,
        from: parameter_value("--vary", parameter, from)?,
        to: parameter_value("--vary", parameter, to)?,
        steps: points,
    })
}

/// Labels for the values of one axis, all at one precision: the fewest
/// decimals (up to 6) that tell neighbours apart and put every label within
/// 1 % of a step of its value.
pub fn axis_labels(values: &[f64]) -> Vec<String> {
    let step = values
        .windows(2)
        .filter_map(|w| match w {
            [a, b] => Some((b - a).abs()),
            _ => None,
        })
        .filter(|d| *d > 0.0)
        .fold(f64::INFINITY, f64::min);
    let scale = values.iter().fold(0.0f64, |m, v| m.max(v.abs()));
    let tolerance = if step.is_finite() {
        0.01 * step
    } else {
        5e-4 * scale.max(1e-12)
    };
    let label = |v: f64, d: usize| {
        let t = format!("{v:.d$}");
        if t.trim_start_matches('-')
            .chars()
            .all(|c| c == '0' || c == '.')
        {
            t.trim_start_matches('-').to_string()
        } else {
            t
        }
    };
    for d in 0..=6 {
        let labels: Vec<String> = values.iter().map(|&v| label(v, d)).collect();
        let close = values
            .iter()
            .zip(&labels)
            .all(|(v, l)| l.parse::<f64>().is_ok_and(|x| (x - v).abs() <= tolerance));
        if close {
            return labels;
        }
    }
    values.iter().map(|&v| label(v, 6)).collect()
}

/// Per-point extras of a sweep: wetted radius, and CU when a layout is rated.
#[derive(Debug, Clone, Copy, Default)]
struct Extra {
    wetted_radius_m: Option<f64>,
    cu_percent: Option<f64>,
}

/// Options of `sweep`.
#[derive(Debug, Clone)]
pub struct SweepArgs {
    /// `--vary NAME=FROM..TO`, one or two.
    pub vary: Vec<String>,
    /// `--points N` or `N,M`.
    pub points: String,
    /// Rate the scenario's layout at each point.
    pub layout: bool,
    /// The figure of a two-axis grid.
    pub show: Option<ShowArg>,
}

/// Run `sweep`.
pub fn run_sweep(
    path: &Path,
    args: &SweepArgs,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let with_layout = args.layout;
    let counts = parse_points(&args.points, args.vary.len())?;
    let axes = args
        .vary
        .iter()
        .zip(&counts)
        .map(|(v, &n)| parse_axis(v, n))
        .collect::<Result<Vec<_>, _>>()?;
    let show = args.show.unwrap_or(ShowArg::Rpm);
    if args.show.is_some() && (axes.len() != 2 || o.format != Format::Text) {
        return Err(CliError::Usage(
            "--show picks the figure of a two-axis text grid; one axis, CSV and JSON show every figure"
                .into(),
        ));
    }
    if show == ShowArg::Cu && !with_layout {
        return Err(CliError::Usage("--show cu needs --layout".into()));
    }
    let design = load_design(path)?;
    if with_layout && design.layout.is_none() {
        return Err(CliError::Usage(format!(
            "{}: --layout needs a layout in the scenario",
            path.display()
        )));
    }
    let total: usize = axes.iter().map(|a| a.steps).product();
    let bar = progress_bar(total, "points");
    let progress = |done: usize, _total: usize| {
        if let Some(b) = &bar {
            b.set_position(done as u64);
        }
    };
    let extra = |d: &Design, report: &SpinReport| {
        let wetted = wetted_radius_m(d, report).ok();
        let cu = if with_layout {
            d.layout.and_then(|layout| {
                let opts = PatternOptions::default();
                let head = head_throw(d, report, &opts, None).ok()?;
                layout_overlap(d, &head, &layout, &opts, &OverlapOptions::default())
                    .ok()
                    .map(|r| r.uniformity.cu_percent)
            })
        } else {
            None
        };
        Extra {
            wetted_radius_m: wetted,
            cu_percent: cu,
        }
    };
    let result = sweep_with(&design, &axes, &extra, &progress)
        .map_err(|e| CliError::Usage(e.to_string()))?;
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    let opt = |v: Option<f64>| v.map_or(String::new(), csv_number);
    match o.format {
        Format::Csv => {
            // Values in the chosen units, the unit in each column name; a
            // bare-number parameter keeps its SI key and value.
            let units: UnitSystem = o.units.into();
            let mut w = csv::Writer::from_writer(out);
            let mut header: Vec<String> = axes
                .iter()
                .map(|a| match a.input.unit {
                    catalogue::Unit::Dim(dim) => csv_key(a.input.vary_name(), dim, units),
                    _ => a.input.vary_key().to_string(),
                })
                .collect();
            header.extend([
                "status".to_string(),
                "rpm".to_string(),
                "start_margin".to_string(),
                csv_key("total_flow", D::Flow, units),
                csv_key("wetted_radius", D::Length, units),
            ]);
            if with_layout {
                header.push("cu_percent".into());
            }
            w.write_record(&header)?;
            let shown = |dim: D, v: Option<f64>| opt(v.map(|x| to_display(dim, x, units)));
            for row in &result.rows {
                let e = row.extra.unwrap_or_default();
                let mut rec: Vec<String> = axes
                    .iter()
                    .zip(&row.values)
                    .map(|(a, v)| csv_number(a.input.unit.to_display(*v, units)))
                    .collect();
                rec.extend([
                    row.status.key().to_string(),
                    opt(row.rpm),
                    opt(row.start_margin),
                    shown(D::Flow, row.total_flow_m3_s),
                    shown(D::Length, e.wetted_radius_m),
                ]);
                if with_layout {
                    rec.push(opt(e.cu_percent));
                }
                w.write_record(&rec)?;
            }
            w.flush()?;
        }
        Format::Json => {
            let rows: Vec<serde_json::Value> = result
                .rows
                .iter()
                .map(|row| {
                    let e = row.extra.unwrap_or_default();
                    let mut m = serde_json::Map::new();
                    for (a, v) in axes.iter().zip(&row.values) {
                        m.insert(a.input.vary_key().into(), serde_json::json!(v));
                    }
                    m.insert("status".into(), serde_json::json!(row.status.key()));
                    m.insert("rpm".into(), serde_json::json!(row.rpm));
                    m.insert("start_margin".into(), serde_json::json!(row.start_margin));
                    m.insert(
                        "total_flow_m3_s".into(),
                        serde_json::json!(row.total_flow_m3_s),
                    );
                    m.insert(
                        "wetted_radius_m".into(),
                        serde_json::json!(e.wetted_radius_m),
                    );
                    if with_layout {
                        m.insert("cu_percent".into(), serde_json::json!(e.cu_percent));
                    }
                    serde_json::Value::Object(m)
                })
                .collect();
            serde_json::to_writer_pretty(&mut *out, &rows).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Text => {
            let units: UnitSystem = o.units.into();
            let head = |a: &SweepAxis| match parameter_dimension(a.input) {
                Some(dim) => format!("{} {}", a.input.vary_name(), unit_label(dim, units)),
                None => a.input.vary_name().to_string(),
            };
            let labels = |a: &SweepAxis| {
                let shown: Vec<f64> = a
                    .values()
                    .iter()
                    .map(|&v| match parameter_dimension(a.input) {
                        Some(dim) => to_display(dim, v, units),
                        None => v,
                    })
                    .collect();
                axis_labels(&shown)
            };
            writeln!(out, "{}: {} points", design.name, result.rows.len())?;
            if let [a, b] = axes.as_slice() {
                // A grid of the chosen figure: first axis down, second across.
                let title = match show {
                    ShowArg::Rpm => "rpm".to_string(),
                    ShowArg::Throw => format!("wetted radius {}", unit_label(D::Length, units)),
                    ShowArg::Cu => "CU %".to_string(),
                    ShowArg::Flow => format!("flow {}", unit_label(D::Flow, units)),
                    ShowArg::Margin => "start margin".to_string(),
                };
                let mut t = TextTable::new(
                    std::iter::once(format!("{title}: {} \\ {}", head(a), head(b)))
                        .chain(labels(b)),
                );
                let status_word = |r: &crate::inverse::sweep::SweepRow<Extra>| match r.status.key()
                {
                    "stalls_at_rest" => "stall".to_string(),
                    "no_equilibrium" => "none".to_string(),
                    "invalid" => "bad".to_string(),
                    _ => "–".to_string(),
                };
                for (i, la) in labels(a).into_iter().enumerate() {
                    let cells = result.rows.iter().skip(i * b.steps).take(b.steps).map(|r| {
                        let e = r.extra.unwrap_or_default();
                        let figure = match show {
                            ShowArg::Rpm => r.rpm.map(|x| format!("{x:.0}")),
                            ShowArg::Throw => e
                                .wetted_radius_m
                                .map(|x| sig(Some(to_display(D::Length, x, units)), 3)),
                            ShowArg::Cu => e.cu_percent.map(|x| format!("{x:.1}")),
                            ShowArg::Flow => r
                                .total_flow_m3_s
                                .map(|x| sig(Some(to_display(D::Flow, x, units)), 3)),
                            ShowArg::Margin => r.start_margin.map(|x| format!("{x:.2}")),
                        };
                        match (figure, r.status.key()) {
                            (Some(f), "running") => f,
                            (Some(f), _) if show != ShowArg::Rpm => f,
                            _ => status_word(r),
                        }
                    });
                    t.row(std::iter::once(la).chain(cells));
                }
                write!(out, "{}", t.render(0))?;
                writeln!(
                    out,
                    "(stall: stalls at rest; none: no equilibrium; bad: value refused)"
                )?;
            } else {
                let mut headers: Vec<String> = axes.iter().map(head).collect();
                headers.extend([
                    "status".to_string(),
                    "rpm".to_string(),
                    "start margin".to_string(),
                    format!("flow {}", unit_label(D::Flow, units)),
                    format!("wetted radius {}", unit_label(D::Length, units)),
                ]);
                if with_layout {
                    headers.push("CU %".into());
                }
                let mut t = TextTable::new(headers);
                let axis_labels: Vec<Vec<String>> = axes.iter().map(labels).collect();
                for (k, row) in result.rows.iter().enumerate() {
                    let e = row.extra.unwrap_or_default();
                    let mut cells: Vec<String> = axis_labels
                        .iter()
                        .map(|l| l.get(k).cloned().unwrap_or_default())
                        .collect();
                    cells.extend([
                        row.status.key().replace('_', " "),
                        sig(row.rpm, 3),
                        sig(row.start_margin, 3),
                        sig(
                            row.total_flow_m3_s.map(|q| to_display(D::Flow, q, units)),
                            3,
                        ),
                        sig(
                            e.wetted_radius_m.map(|r| to_display(D::Length, r, units)),
                            3,
                        ),
                    ]);
                    if with_layout {
                        cells.push(sig(e.cu_percent, 3));
                    }
                    t.row(cells);
                }
                write!(out, "{}", t.render(0))?;
            }
        }
    }
    Ok(Outcome::Done)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn axis_labels_share_one_precision() {
        assert_eq!(axis_labels(&[0.0, 10.0, 20.0]), vec!["0", "10", "20"]);
        assert_eq!(
            axis_labels(&[150.0, 150.0 + 250.0 / 3.0, 150.0 + 500.0 / 3.0, 400.0]),
            vec!["150", "233", "317", "400"]
        );
        assert_eq!(axis_labels(&[0.0, 0.25, 0.5]), vec!["0.00", "0.25", "0.50"]);
        assert_eq!(axis_labels(&[-0.1, 0.0, 0.1]), vec!["-0.1", "0.0", "0.1"]);
        assert_eq!(parse_points("13,6", 2).unwrap(), vec![13, 6]);
        assert_eq!(parse_points("7", 2).unwrap(), vec![7, 7]);
        assert!(parse_points("0", 1).is_err());
        assert!(parse_points("3,4", 1).is_err());
        assert!(parse_points("x", 1).is_err());
    }
}

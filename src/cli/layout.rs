//! `spinwright layout`: overlap of heads in a layout, CU and DU, depth map;
//! and the same figures for a measured catch-can test.

use std::io::Write;
use std::path::Path;

use serde::Serialize;

use super::text::csv_number;
use super::{load_design, CliError, Format, Outcome, Output};
use crate::audit::{audit, read_catch_cans, AuditReport};
use crate::physics::balance::solve;
use crate::physics::coverage::{head_throw, layout_overlap};
use crate::physics::design::{Design, Layout};
use crate::physics::layout::{
    intake_check, pattern_name, IntakeVerdict, LayoutResult, OverlapOptions,
    DEFAULT_SURFACE_STORAGE_MM,
};
use crate::physics::pattern::{PatternOptions, M_S_TO_MM_H};
use crate::units::{
    csv_key, format_number, format_quantity, to_display, unit_label, Dimension as D, UnitSystem,
};

/// Shading from dry to the wettest cell, for the text depth map.
pub const SHADES: [char; 6] = [' ', '·', '░', '▒', '▓', '█'];

/// Options of the `layout` command beyond format and units.
#[derive(Debug, Clone)]
pub struct LayoutArgs {
    /// Override of the scenario's layout.
    pub layout: Option<Layout>,
    /// Soil intake rate, mm/h.
    pub intake_mm_h: Option<f64>,
    /// Measured catch-can CSV to rate beside the model.
    pub catch_cans: Option<std::path::PathBuf>,
    /// Width of the text depth map, characters.
    pub width: usize,
}

#[derive(Debug, Serialize)]
struct LayoutJson {
    pattern: &'static str,
    spacing_m: f64,
    rows_m: f64,
    mean_rate_mm_h: f64,
    expected_rate_mm_h: f64,
    cu_percent: f64,
    du_lq_percent: f64,
    du_lh_percent: f64,
    scheduling_multiplier: Option<f64>,
    spacing_percent_of_diameter: f64,
    wetted_radius_m: f64,
    grid: GridJson,
    intake_warning: Option<String>,
    measured: Option<MeasuredJson>,
}

#[derive(Debug, Serialize)]
struct GridJson {
    dx_m: f64,
    dy_m: f64,
    rate_mm_h: Vec<Vec<f64>>,
}

#[derive(Debug, Serialize)]
struct MeasuredJson {
    source: String,
    cans: usize,
    mean_rate_mm_h: f64,
    cu_percent: f64,
    du_lq_percent: f64,
    du_lh_percent: f64,
    overlap_cu_percent: Option<f64>,
    overlap_du_lq_percent: Option<f64>,
}

/// The depth map as lines of shading characters, at most `width` wide
/// (two characters per cell across, so cells look square), wettest row on top.
pub fn depth_map(result: &LayoutResult, width: usize) -> Vec<String> {
    let rows = &result.grid.rate_mm_h;
    let nx = rows.first().map_or(0, Vec::len);
    if nx == 0 {
        return Vec::new();
    }
    let (min, max) = grid_range(result);
    let cols = (width.min(MAP_MAX_WIDTH) / 2).clamp(1, nx);
    let ny = rows.len();
    // Each output row covers as many metres as each two-character column.
    let across_m = nx as f64 * result.grid.dx_m;
    let down_m = ny as f64 * result.grid.dy_m;
    let out_rows = ((cols as f64 * down_m / across_m).round() as usize).clamp(1, 4 * ny);
    (0..out_rows)
        .rev()
        .map(|r| {
            let iy = (r * ny / out_rows).min(ny - 1);
            (0..cols)
                .map(|c| {
                    let ix = (c * nx / cols).min(nx - 1);
                    let v = rows
                        .get(iy)
                        .and_then(|row| row.get(ix))
                        .copied()
                        .unwrap_or(0.0);
                    let level = if max > min {
                        (((v - min) / (max - min)) * (SHADES.len() - 1) as f64).round() as usize
                    } else {
                        SHADES.len() - 1
                    };
                    let ch = SHADES.get(level).or(SHADES.last()).copied().unwrap_or(' ');
                    format!("{ch}{ch}")
                })
                .collect()
        })
        .collect()
}

/// Widest text depth map, characters (wider maps get hard to read).
pub const MAP_MAX_WIDTH: usize = 64;

/// Lowest and highest rate on the catch grid, mm/h.
fn grid_range(result: &LayoutResult) -> (f64, f64) {
    let rates = result.grid.rate_mm_h.iter().flatten().copied();
    let min = rates.clone().fold(f64::INFINITY, f64::min);
    let max = rates.fold(0.0, f64::max);
    (if min.is_finite() { min } else { 0.0 }, max)
}

/// The legend of the depth map: each shade and its range in the display
/// unit. Shades run from the driest cell to the wettest, for contrast.
pub fn legend(result: &LayoutResult, units: UnitSystem) -> String {
    let (min, max) = grid_range(result);
    let step = (max - min) / (SHADES.len() - 1) as f64;
    let label = unit_label(D::ApplicationRate, units);
    let show = |mm_h: f64| format_number(to_display(D::ApplicationRate, mm_h / M_S_TO_MM_H, units));
    SHADES
        .iter()
        .enumerate()
        .map(|(k, ch)| {
            let lo = min + (k as f64 - 0.5).max(0.0) * step;
            let hi = (min + (k as f64 + 0.5) * step).min(max);
            format!("[{ch}{ch}] {}–{}", show(lo), show(hi))
        })
        .collect::<Vec<_>>()
        .join("  ")
        + &format!(" {label}")
}

fn measured_json(report: &AuditReport, source: &str) -> MeasuredJson {
    MeasuredJson {
        source: source.to_string(),
        cans: report.cans.count,
        mean_rate_mm_h: report.cans.mean,
        cu_percent: report.cans.cu_percent,
        du_lq_percent: report.cans.du_lq_percent,
        du_lh_percent: report.cans.du_lh_percent,
        overlap_cu_percent: report.layout.as_ref().map(|l| l.uniformity.cu_percent),
        overlap_du_lq_percent: report.layout.as_ref().map(|l| l.uniformity.du_lq_percent),
    }
}

fn intake_warning(result: &LayoutResult, intake: Option<f64>) -> Result<Option<String>, CliError> {
    match intake {
        None => Ok(None),
        Some(i) => match intake_check(result.mean_rate_mm_h, i, DEFAULT_SURFACE_STORAGE_MM) {
            Ok(IntakeVerdict::WithinIntake) => Ok(None),
            Ok(IntakeVerdict::Exceeds { warning, .. }) => Ok(Some(warning)),
            Err(e) => Err(CliError::Usage(format!("--intake: {e}"))),
        },
    }
}

/// The text report of a layout.
pub fn layout_text(
    design: &Design,
    result: &LayoutResult,
    wetted_m: f64,
    units: UnitSystem,
    width: usize,
) -> String {
    let q = |dim, v| format_quantity(dim, v, units);
    let rate = |mm_h: f64| q(D::ApplicationRate, mm_h / M_S_TO_MM_H);
    let u = &result.uniformity;
    let mut s = String::new();
    s.push_str(&format!(
        "{}: {} layout {} × {}, spacing {:.0} % of the wetted diameter ({} wetted radius)\n",
        design.name,
        pattern_name(&result.layout),
        q(D::Length, result.spacing_m),
        q(D::Length, result.rows_m),
        result.spacing_percent_of_diameter,
        q(D::Length, wetted_m)
    ));
    s.push_str(&format!(
        "  CU {:.1} %   DU low quarter {:.1} %   DU low half {:.1} %   scheduling multiplier {}\n",
        u.cu_percent,
        u.du_lq_percent,
        u.du_lh_percent,
        u.scheduling_multiplier
            .map_or("—".into(), |m| format!("{m:.2}"))
    ));
    s.push_str(&format!(
        "  mean application rate {} (Q/(S·L) = {}); range {} to {}\n",
        rate(result.mean_rate_mm_h),
        rate(result.expected_rate_mm_h),
        rate(u.min),
        rate(u.max)
    ));
    if u.cu_percent < 80.0 {
        s.push_str("  warning: CU below 80 %, the usual lower limit (extension practice): close the spacing\n");
    }
    if design.wind.speed_m_s > 0.0 {
        s.push_str(&format!(
            "  in a wind of {}\n",
            q(D::Speed, design.wind.speed_m_s)
        ));
    }
    s.push('\n');
    s.push_str("Depth map of one repeating cell (heads at the corners)\n");
    for line in depth_map(result, width.saturating_sub(2)) {
        s.push_str(&format!("  {line}\n"));
    }
    s.push_str(&format!("  {}\n", legend(result, units)));
    s
}

/// Run `layout`.
pub fn run(
    path: &Path,
    args: &LayoutArgs,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    if o.format == Format::Csv {
        // The CSV is the depth grid alone: an option it cannot show is refused,
        // not dropped.
        let dropped: Vec<&str> = [
            args.intake_mm_h.map(|_| "--intake"),
            args.catch_cans.as_ref().map(|_| "--catch-cans"),
        ]
        .into_iter()
        .flatten()
        .collect();
        if !dropped.is_empty() {
            return Err(CliError::Usage(format!(
                "{} is reported in the text and JSON reports; the CSV holds the depth grid only (use --format text or json)",
                dropped.join(" and ")
            )));
        }
    }
    let design = load_design(path)?;
    let layout = args.layout.or(design.layout).ok_or_else(|| {
        CliError::Usage(format!(
            "{}: the scenario has no layout; add one (layout: Square(spacing: m(9))) or give --spacing",
            path.display()
        ))
    })?;
    let report = solve(&design);
    let opts = PatternOptions::default();
    let bad = |e: crate::physics::trajectory::ThrowError| {
        CliError::Usage(format!("{}: {e}", path.display()))
    };
    let head = head_throw(&design, &report, &opts, None).map_err(bad)?;
    let result =
        layout_overlap(&design, &head, &layout, &opts, &OverlapOptions::default()).map_err(bad)?;
    let warning = intake_warning(&result, args.intake_mm_h)?;
    let measured = match &args.catch_cans {
        Some(csv_path) => {
            let data = read_catch_cans(csv_path).map_err(|e| CliError::Usage(e.to_string()))?;
            let rated = audit(&data, Some(&layout), &OverlapOptions::default())
                .map_err(|e| CliError::Usage(e.to_string()))?;
            Some((rated, csv_path.display().to_string()))
        }
        None => None,
    };
    let units: UnitSystem = o.units.into();
    match o.format {
        Format::Json => {
            let u = &result.uniformity;
            let json = LayoutJson {
                pattern: pattern_name(&layout),
                spacing_m: result.spacing_m,
                rows_m: result.rows_m,
                mean_rate_mm_h: result.mean_rate_mm_h,
                expected_rate_mm_h: result.expected_rate_mm_h,
                cu_percent: u.cu_percent,
                du_lq_percent: u.du_lq_percent,
                du_lh_percent: u.du_lh_percent,
                scheduling_multiplier: u.scheduling_multiplier,
                spacing_percent_of_diameter: result.spacing_percent_of_diameter,
                wetted_radius_m: head.throw.wetted_radius_m,
                grid: GridJson {
                    dx_m: result.grid.dx_m,
                    dy_m: result.grid.dy_m,
                    rate_mm_h: result.grid.rate_mm_h.clone(),
                },
                intake_warning: warning,
                measured: measured.as_ref().map(|(r, src)| measured_json(r, src)),
            };
            serde_json::to_writer_pretty(&mut *out, &json).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Csv => {
            let mut w = csv::Writer::from_writer(out);
            let dim = |v: f64| to_display(D::Length, v, units);
            let header: Vec<String> = std::iter::once(format!(
                "{}\\{}",
                csv_key("y", D::Length, units),
                csv_key("x", D::Length, units)
            ))
            .chain(
                (0..result.grid.rate_mm_h.first().map_or(0, Vec::len))
                    .map(|ix| csv_number(dim((ix as f64 + 0.5) * result.grid.dx_m))),
            )
            .collect();
            w.write_record(&header)?;
            for (iy, row) in result.grid.rate_mm_h.iter().enumerate() {
                let cells = std::iter::once(csv_number(dim((iy as f64 + 0.5) * result.grid.dy_m)))
                    .chain(row.iter().map(|r| {
                        csv_number(to_display(D::ApplicationRate, r / M_S_TO_MM_H, units))
                    }));
                w.write_record(cells)?;
            }
            w.flush()?;
        }
        Format::Text => {
            write!(
                out,
                "{}",
                layout_text(
                    &design,
                    &result,
                    head.throw.wetted_radius_m,
                    units,
                    args.width
                )
            )?;
            if let Some(w) = &warning {
                writeln!(out, "  warning: {w}")?;
            }
            if let Some((r, src)) = &measured {
                writeln!(out, "\nMeasured catch cans ({src}, {} cans)", r.cans.count)?;
                writeln!(
                    out,
                    "  as caught: CU {:.1} %   DU low quarter {:.1} %   mean {}",
                    r.cans.cu_percent,
                    r.cans.du_lq_percent,
                    format_quantity(D::ApplicationRate, r.cans.mean / M_S_TO_MM_H, units)
                )?;
                if let Some(l) = &r.layout {
                    writeln!(
                        out,
                        "  the measured leg overlapped in this layout: CU {:.1} %   DU low quarter {:.1} % (model: CU {:.1} %, DU {:.1} %)",
                        l.uniformity.cu_percent, l.uniformity.du_lq_percent, result.uniformity.cu_percent, result.uniformity.du_lq_percent
                    )?;
                }
            }
        }
    }
    Ok(Outcome::Done)
}

/// Width for the depth map: the terminal's, else $COLUMNS, else 80.
pub fn terminal_width() -> usize {
    use std::io::IsTerminal;
    if std::io::stdout().is_terminal() {
        if let Ok((w, _)) = ratatui::crossterm::terminal::size() {
            return usize::from(w).max(20);
        }
    }
    std::env::var("COLUMNS")
        .ok()
        .and_then(|c| c.parse().ok())
        .filter(|&w| w >= 20)
        .unwrap_or(80)
}

//! `spinwright layout`: overlap of heads in a layout, CU and DU, the run time
//! the driest quarter needs, the rate map; and the same figures for a
//! measured catch-can test.

use std::io::Write;
use std::path::Path;

use serde::Serialize;

use super::text::csv_number;
use super::PatternArg;
use super::{load_design, CliError, Format, Outcome, Output};
use crate::physics::balance::solve;
use crate::physics::coverage::{
    head_throw, layout_overlap, recommend_spacings, SpacingRecommendation,
};
use crate::physics::design::{Design, Layout};
use crate::physics::layout::{
    intake_check, pattern_name, IntakeVerdict, LayoutResult, OverlapOptions, PatternFamily,
    RowRule, SpacingGoal, DEFAULT_ROWS_RATIO, DEFAULT_SURFACE_STORAGE_MM,
};
use crate::physics::pattern::{PatternOptions, M_S_TO_MM_H};
use crate::rate_map::{self, runtime_factor_words, Ink, RateMap};
use crate::report::cans;
use crate::units::{csv_key, format_quantity, to_display, Dimension as D, UnitSystem};

mod measured;
use measured::{measured_json, rate_catch_cans, MeasuredJson};

/// Options of the `layout` command beyond format and units.
#[derive(Debug, Clone)]
pub struct LayoutArgs {
    /// Override of the scenario's layout.
    pub layout: Option<Layout>,
    /// Soil intake rate, mm/h.
    pub intake_mm_h: Option<f64>,
    /// Measured catch-can CSV to rate beside the model.
    pub catch_cans: Option<std::path::PathBuf>,
    /// Fit the spray (jet breakup) to the catch-can leg and report the
    /// layout from the fitted model.
    pub fit: bool,
    /// With `fit`: fit the median drop size d50 as well.
    pub fit_d50: bool,
    /// Depth to give the driest quarter each watering, mm (for the run time).
    pub target_depth_mm: Option<f64>,
    /// Width of the text rate map, characters.
    pub width: usize,
    /// Colour the text rate map (24-bit terminal colours).
    pub colour: bool,
    /// Recommend spacings (`--recommend`).
    pub recommend: Option<RecommendArgs>,
}

/// Options of `layout --recommend`.
#[derive(Debug, Clone, Copy)]
pub struct RecommendArgs {
    /// The uniformity goal.
    pub goal: SpacingGoal,
    /// Only this pattern (all three when `None`).
    pub pattern: Option<PatternArg>,
    /// The rectangle's row spacing, m (`None`: 1.15 × the head spacing).
    pub rows_m: Option<f64>,
}

impl RecommendArgs {
    /// The pattern families to recommend a spacing for.
    pub fn families(&self) -> Vec<PatternFamily> {
        let rect = PatternFamily::Rectangle(match self.rows_m {
            Some(l) => RowRule::Fixed(l),
            None => RowRule::Ratio(DEFAULT_ROWS_RATIO),
        });
        match self.pattern {
            Some(PatternArg::Square) => vec![PatternFamily::Square],
            Some(PatternArg::Rectangle) => vec![rect],
            Some(PatternArg::Triangle) => vec![PatternFamily::Triangle],
            None => vec![PatternFamily::Square, rect, PatternFamily::Triangle],
        }
    }
}

#[derive(Debug, Serialize)]
struct RecommendedJson {
    pattern: &'static str,
    spacing_m: Option<f64>,
    rows_m: Option<f64>,
    cu_percent: Option<f64>,
    du_lq_percent: Option<f64>,
    wind_m_s: f64,
    goal_met: bool,
}

#[derive(Debug, Serialize)]
struct GoalJson {
    metric: &'static str,
    percent: f64,
}

#[derive(Debug, Serialize)]
struct RecommendOnlyJson {
    wetted_radius_m: f64,
    recommend_goal: GoalJson,
    recommended: Vec<RecommendedJson>,
}

fn family_name(f: &PatternFamily) -> &'static str {
    match f {
        PatternFamily::Square => "square",
        PatternFamily::Rectangle(_) => "rectangle",
        PatternFamily::Triangle => "triangle",
    }
}

fn goal_json(goal: SpacingGoal) -> GoalJson {
    GoalJson {
        metric: match goal {
            SpacingGoal::Cu(_) => "cu",
            SpacingGoal::DuLq(_) => "du_lq",
        },
        percent: goal.percent(),
    }
}

fn recommended_json(r: &SpacingRecommendation) -> RecommendedJson {
    let res = r.result.as_ref();
    RecommendedJson {
        pattern: family_name(&r.family),
        spacing_m: res.map(|x| x.spacing_m),
        rows_m: res.map(|x| x.rows_m),
        cu_percent: res.map(|x| x.uniformity.cu_percent),
        du_lq_percent: res.map(|x| x.uniformity.du_lq_percent),
        wind_m_s: r.wind_m_s,
        goal_met: res.is_some(),
    }
}

/// The recommended spacings in words, in the reader's units.
pub fn recommend_text(
    recs: &[SpacingRecommendation],
    goal: SpacingGoal,
    units: UnitSystem,
) -> String {
    let q = |dim, v| format_quantity(dim, v, units);
    let what = match goal {
        SpacingGoal::Cu(p) => format!("CU at least {p:.0} %"),
        SpacingGoal::DuLq(p) => format!("DU low quarter at least {p:.0} %"),
    };
    let mut s = format!(
        "Recommended spacing ({what}, the largest with every closer spacing meeting it too)
"
    );
    let mut last_wind = None;
    for r in recs {
        if last_wind != Some(r.wind_m_s) {
            if r.wind_m_s > 0.0 {
                s.push_str(&format!(
                    "  in a wind of {}:
",
                    q(D::Speed, r.wind_m_s)
                ));
            } else {
                s.push_str(
                    "  in calm air:
",
                );
            }
            last_wind = Some(r.wind_m_s);
        }
        match &r.result {
            Some(x) => s.push_str(&format!(
                "    {:<9} {} × {}   CU {:.1} %   DU low quarter {:.1} %\n",
                family_name(&r.family),
                q(D::Length, x.spacing_m),
                q(D::Length, x.rows_m),
                x.uniformity.cu_percent,
                x.uniformity.du_lq_percent
            )),
            None => s.push_str(&format!(
                "    {:<9} no spacing meets the goal, even heads close together\n",
                family_name(&r.family)
            )),
        }
    }
    s
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
    driest_quarter_runtime_factor: Option<f64>,
    spacing_percent_of_diameter: f64,
    wetted_radius_m: f64,
    dry_percent: f64,
    heads_meet: bool,
    cu_clamped: bool,
    grid: GridJson,
    intake_warning: Option<String>,
    target: Option<TargetJson>,
    measured: Option<MeasuredJson>,
    recommend_goal: Option<GoalJson>,
    recommended: Option<Vec<RecommendedJson>>,
}

#[derive(Debug, Serialize)]
struct TargetJson {
    depth_mm: f64,
    run_time_s: f64,
    cycles: u32,
    cycle_run_time_s: f64,
    soak_s: Option<f64>,
}

#[derive(Debug, Serialize)]
struct GridJson {
    dx_m: f64,
    dy_m: f64,
    rate_mm_h: Vec<Vec<f64>>,
}

/// Widest text rate map, characters (wider maps get hard to read).
pub const MAP_MAX_WIDTH: usize = 64;

/// Most lines of the text rate map.
const MAP_MAX_ROWS: usize = 48;

/// How long to water so that the driest quarter gets a target depth.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DepthSchedule {
    /// The target depth for the driest quarter, mm.
    pub depth_mm: f64,
    /// Run time in all, min.
    pub total_min: f64,
    /// Number of cycles (1 unless the soil intake asks for cycle and soak).
    pub cycles: u32,
    /// Run time of each cycle, min.
    pub cycle_min: f64,
    /// Soak between cycles, min (`None` with one cycle).
    pub soak_min: Option<f64>,
}

/// The run time that puts `depth_mm` on the driest quarter at `mean_rate_mm_h`
/// with run-time factor `factor` (1/DU_lq), split into cycles of at most
/// `max_cycle_min` when the soil intake asks for it. `None` when no run time
/// is enough (no factor, or no water).
pub fn depth_schedule(
    depth_mm: f64,
    mean_rate_mm_h: f64,
    factor: Option<f64>,
    cycle_soak: Option<(f64, f64)>,
) -> Option<DepthSchedule> {
    let factor = factor.filter(|f| f.is_finite() && *f > 0.0)?;
    if !(mean_rate_mm_h.is_finite() && mean_rate_mm_h > 0.0 && depth_mm.is_finite()) {
        return None;
    }
    let total_min = 60.0 * depth_mm * factor / mean_rate_mm_h;
    if !total_min.is_finite() {
        return None;
    }
    let (cycles, soak_min) = match cycle_soak {
        Some((run, soak)) if run > 0.0 && total_min > run => (
            ((total_min / run).ceil()).min(f64::from(u32::MAX)) as u32,
            Some(soak),
        ),
        _ => (1, None),
    };
    Some(DepthSchedule {
        depth_mm,
        total_min,
        cycles,
        cycle_min: total_min / f64::from(cycles.max(1)),
        soak_min,
    })
}

/// Minutes for a person: whole minutes from 10 up, one decimal below.
fn minutes(m: f64) -> String {
    if m >= 10.0 {
        format!("{m:.0} min")
    } else {
        format!("{m:.1} min")
    }
}

/// The intake warning and the cycle-and-soak (run, soak minutes) it suggests.
type IntakeAdvice = (Option<String>, Option<(f64, f64)>);

fn intake_warning(result: &LayoutResult, intake: Option<f64>) -> Result<IntakeAdvice, CliError> {
    match intake {
        None => Ok((None, None)),
        Some(i) => match intake_check(result.mean_rate_mm_h, i, DEFAULT_SURFACE_STORAGE_MM) {
            Ok(IntakeVerdict::WithinIntake) => Ok((None, None)),
            Ok(IntakeVerdict::Exceeds { warning, cycle }) => {
                Ok((Some(warning), Some((cycle.run_min, cycle.soak_min))))
            }
            Err(e) => Err(CliError::Usage(format!("--intake: {e}"))),
        },
    }
}

/// The text report of a layout; `schedule` is the run time for a target
/// depth when one was asked for.
pub fn layout_text(
    design: &Design,
    result: &LayoutResult,
    wetted_m: f64,
    units: UnitSystem,
    width: usize,
    schedule: Option<&DepthSchedule>,
    colour: bool,
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
        "  CU {:.1} %   DU low quarter {:.1} %   DU low half {:.1} %\n",
        u.cu_percent, u.du_lq_percent, u.du_lh_percent,
    ));
    s.push_str(&format!(
        "  run time to give the driest quarter the mean depth: {}\n",
        runtime_factor_words(u.driest_quarter_runtime_factor)
    ));
    if let Some(d) = schedule {
        let depth = q(D::SmallLength, d.depth_mm / 1000.0);
        if d.cycles > 1 {
            s.push_str(&format!(
                "  to give the driest quarter {depth}: {} in all, {} cycles of {} with {} soaks\n",
                minutes(d.total_min),
                d.cycles,
                minutes(d.cycle_min),
                minutes(d.soak_min.unwrap_or(0.0)),
            ));
        } else {
            s.push_str(&format!(
                "  to give the driest quarter {depth}: one cycle of {}\n",
                minutes(d.cycle_min)
            ));
        }
    }
    s.push_str(&format!(
        "  mean application rate {} (Q/(S·L) = {}); range {} to {}\n",
        rate(result.mean_rate_mm_h),
        rate(result.expected_rate_mm_h),
        rate(u.min),
        rate(u.max)
    ));
    if !result.heads_meet {
        s.push_str(&format!(
            "  heads do not meet: {:.1} % of the ground stays dry (below {}); \
             the spacing is {:.0} % of the wetted diameter\n",
            result.dry_percent,
            rate(result.wetting_threshold_mm_h),
            result.spacing_percent_of_diameter
        ));
    }
    if u.cu_clamped {
        s.push_str(
            "  CU shown as 0 %: Christiansen's formula gives less than zero for catches this uneven\n",
        );
    }
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
    s.push_str(&format!("{}\n", rate_map::title(&result.layout)));
    let map = RateMap::new(
        result,
        width.saturating_sub(2).min(MAP_MAX_WIDTH) / 2,
        MAP_MAX_ROWS,
        units,
    );
    let paint: &dyn Fn(char, Ink) -> String = if colour { &ansi } else { &|c, _| c.to_string() };
    for line in map.painted_lines(paint) {
        s.push_str(&format!("  {line}\n"));
    }
    for line in map.painted_legend(units, paint) {
        s.push_str(&format!("  {line}\n"));
    }
    s
}

/// A character in its ink's 24-bit terminal colour (heads bold).
fn ansi(c: char, ink: Ink) -> String {
    let (r, g, b) = ink.rgb();
    let bold = if ink == Ink::Head { "1;" } else { "" };
    format!("\x1b[{bold}38;2;{r};{g};{b}m{c}\x1b[0m")
}

/// Colour for the text report: on a terminal, unless `NO_COLOR` is set and
/// not empty (no-color.org).
pub fn colour_wanted() -> bool {
    use std::io::IsTerminal;
    std::io::stdout().is_terminal() && std::env::var_os("NO_COLOR").is_none_or(|v| v.is_empty())
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
            args.recommend.map(|_| "--recommend"),
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
    let layout = args.layout.or(design.layout);
    if layout.is_none() && args.recommend.is_none() {
        return Err(CliError::Usage(format!(
            "{}: the scenario has no layout; add one (layout: Square(spacing: m(9))), give --spacing, or ask for --recommend",
            path.display()
        )));
    }
    let report = solve(&design);
    let opts = PatternOptions::default();
    let bad = |e: crate::physics::trajectory::ThrowError| {
        CliError::Usage(format!("{}: {e}", path.display()))
    };
    let head = head_throw(&design, &report, &opts, None).map_err(bad)?;
    let units: UnitSystem = o.units.into();
    let recommended = match &args.recommend {
        Some(r) => Some(
            recommend_spacings(
                &design,
                &head,
                &r.families(),
                r.goal,
                &opts,
                &OverlapOptions::default(),
            )
            .map_err(bad)?,
        ),
        None => None,
    };
    let Some(layout) = layout else {
        // --recommend on a scenario without a layout: the recommendation alone.
        let (Some(r), Some(recs)) = (&args.recommend, &recommended) else {
            return Ok(Outcome::Done);
        };
        match o.format {
            Format::Json => {
                let json = RecommendOnlyJson {
                    wetted_radius_m: head.throw.wetted_radius_m,
                    recommend_goal: goal_json(r.goal),
                    recommended: recs.iter().map(recommended_json).collect(),
                };
                serde_json::to_writer_pretty(&mut *out, &json).map_err(std::io::Error::from)?;
                writeln!(out)?;
            }
            _ => {
                writeln!(
                    out,
                    "{}: {} wetted radius",
                    design.name,
                    format_quantity(D::Length, head.throw.wetted_radius_m, units)
                )?;
                write!(out, "{}", recommend_text(recs, r.goal, units))?;
            }
        }
        return Ok(Outcome::Done);
    };
    let result =
        layout_overlap(&design, &head, &layout, &opts, &OverlapOptions::default()).map_err(bad)?;
    let (warning, cycle_soak) = intake_warning(&result, args.intake_mm_h)?;
    let schedule = args.target_depth_mm.and_then(|d| {
        depth_schedule(
            d,
            result.mean_rate_mm_h,
            result.uniformity.driest_quarter_runtime_factor,
            cycle_soak,
        )
    });
    let measured = match &args.catch_cans {
        Some(csv_path) => Some(rate_catch_cans(
            csv_path,
            args.fit.then_some(args.fit_d50),
            &design,
            &head,
            &layout,
            &result,
        )?),
        None => None,
    };
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
                driest_quarter_runtime_factor: u.driest_quarter_runtime_factor,
                spacing_percent_of_diameter: result.spacing_percent_of_diameter,
                wetted_radius_m: head.throw.wetted_radius_m,
                dry_percent: result.dry_percent,
                heads_meet: result.heads_meet,
                cu_clamped: u.cu_clamped,
                grid: GridJson {
                    dx_m: result.grid.dx_m,
                    dy_m: result.grid.dy_m,
                    rate_mm_h: result.grid.rate_mm_h.clone(),
                },
                intake_warning: warning,
                target: schedule.map(|d| TargetJson {
                    depth_mm: d.depth_mm,
                    run_time_s: 60.0 * d.total_min,
                    cycles: d.cycles,
                    cycle_run_time_s: 60.0 * d.cycle_min,
                    soak_s: d.soak_min.map(|m| 60.0 * m),
                }),
                measured: measured.as_ref().map(measured_json),
                recommend_goal: args.recommend.map(|r| goal_json(r.goal)),
                recommended: recommended
                    .as_ref()
                    .map(|recs| recs.iter().map(recommended_json).collect()),
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
                    args.width,
                    schedule.as_ref(),
                    args.colour,
                )
            )?;
            if let Some(w) = &warning {
                writeln!(out, "  warning: {w}")?;
            }
            if let Some(m) = &measured {
                let (r, src) = (&m.report, &m.source);
                write!(
                    out,
                    "{}",
                    cans::measured_text(r, src, m.grid, &result, &m.notes, units)
                )?;
                if let Some((f, l)) = &m.fit {
                    write!(out, "{}", cans::fit_text(f, l, units))?;
                }
            }
            if let (Some(r), Some(recs)) = (&args.recommend, &recommended) {
                writeln!(out)?;
                write!(out, "{}", recommend_text(recs, r.goal, units))?;
            }
        }
    }
    Ok(Outcome::Done)
}

/// Width for the rate map: the terminal's, else $COLUMNS, else 80.
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn run_time_for_a_target_depth() {
        // 10 mm on the driest quarter at 20 mm/h with DU_lq 80 % (factor 1.25):
        // 10 · 1.25 / 20 h = 37.5 min (the factor's definition, model.md M9).
        let one = depth_schedule(10.0, 20.0, Some(1.25), None).unwrap();
        assert!((one.total_min - 37.5).abs() < 1e-12);
        assert_eq!(one.cycles, 1);
        assert_eq!(one.soak_min, None);
        // Cycles of at most 10 min: four of 9.375 min, 15 min soaks.
        let split = depth_schedule(10.0, 20.0, Some(1.25), Some((10.0, 15.0))).unwrap();
        assert_eq!(split.cycles, 4);
        assert!((split.cycle_min - 9.375).abs() < 1e-12);
        assert_eq!(split.soak_min, Some(15.0));
        // No water for the driest quarter, or none at all: no run time is enough.
        assert_eq!(depth_schedule(10.0, 20.0, None, None), None);
        assert_eq!(depth_schedule(10.0, 0.0, Some(1.2), None), None);
        assert_eq!(minutes(37.5), "38 min");
        assert_eq!(minutes(9.375), "9.4 min");
    }

    #[test]
    fn colour_is_24_bit_and_heads_are_bold() {
        assert_eq!(ansi('(', Ink::Head), "\x1b[1;38;2;235;70;70m(\x1b[0m");
        let (r, g, b) = rate_map::scale_rgb(0.0);
        assert_eq!(
            ansi('▁', Ink::Scale(0.0)),
            format!("\x1b[38;2;{r};{g};{b}m▁\x1b[0m")
        );
    }
}

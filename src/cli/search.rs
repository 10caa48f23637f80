//! `search`: the values of a few free inputs that meet the goals and make an
//! objective as large as it will go (the library's
//! [`crate::inverse::search`]). Text for a person, JSON (SI) or CSV (one row
//! per design) for a script; a progress bar on a terminal only.

use std::collections::BTreeMap;
use std::io::Write;
use std::path::{Path, PathBuf};

use clap::{Args, ValueEnum};
use serde::Serialize;

use super::text::{csv_number, sig, TextTable};
use super::values::parameter_value;
use super::{
    open_for_edit, positive_quantity, positive_rpm, progress_bar, save_design_over, CliError,
    Format, Outcome, Output,
};
use crate::catalogue::{self, Input};
use crate::inverse::search::{
    search, Evaluation, Free, GoalKind, Goals, Objective, SearchOptions, SearchResult,
};
use crate::physics::design::Layout;
use crate::physics::layout::pattern_name;
use crate::units::{csv_key, format_quantity, to_display, unit_label, Dimension as D, UnitSystem};

/// What `search` makes as large as it can.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum MaximizeArg {
    /// CU at the layout's spacing (needs a layout).
    Cu,
    /// Standard wetted radius.
    Throw,
    /// The largest square spacing whose CU meets --cu (default 85 %).
    Spacing,
    /// Start margin (stall over breakaway torque).
    Margin,
}

impl From<MaximizeArg> for Objective {
    fn from(m: MaximizeArg) -> Self {
        match m {
            MaximizeArg::Cu => Objective::Cu,
            MaximizeArg::Throw => Objective::Throw,
            MaximizeArg::Spacing => Objective::Spacing,
            MaximizeArg::Margin => Objective::Margin,
        }
    }
}

/// The options of `search`.
#[derive(Debug, Clone, Args)]
pub struct SearchArgs {
    /// The scenario file.
    pub file: PathBuf,
    /// A free input and its range, e.g. deflection=30..85 or nozzle=1.8mm..3mm (repeat for more).
    #[arg(long, required = true, value_name = "NAME=FROM..TO")]
    pub free: Vec<String>,
    /// Operating speed band, e.g. 25..35 (rpm).
    #[arg(long, value_name = "LO..HI")]
    pub rpm: Option<String>,
    /// Least wetted radius, e.g. 10m or 33ft.
    #[arg(long, value_name = "LENGTH")]
    pub min_throw: Option<String>,
    /// Most total flow, e.g. 20L/min or 5gpm.
    #[arg(long, value_name = "FLOW")]
    pub max_flow: Option<String>,
    /// Least start margin (stall over breakaway torque), a bare number, e.g. 1.5.
    #[arg(long, value_name = "RATIO")]
    pub min_margin: Option<String>,
    /// CU goal, %: with --maximize spacing the CU the spacing keeps (default
    /// 85); otherwise least CU at the layout's spacing.
    #[arg(long, value_name = "PERCENT")]
    pub cu: Option<String>,
    /// What to make as large as it will go.
    #[arg(long, value_enum)]
    pub maximize: MaximizeArg,
    /// Number of optimiser starts (1 to 200).
    #[arg(long, default_value_t = 12, value_parser = clap::value_parser!(u32).range(1..=200))]
    pub starts: u32,
    /// Write the best design here (the file's comments kept; an existing file is kept as .bak).
    #[arg(long, value_name = "BEST.ron")]
    pub out: Option<PathBuf>,
    /// Exit with status 1 when no design meets every goal.
    #[arg(long)]
    pub strict: bool,
    /// Format and units of the report.
    #[command(flatten)]
    pub output: Output,
}

/// Parse `NAME=FROM..TO` into a free input, SI.
pub fn parse_free(text: &str) -> Result<Free, CliError> {
    let example = "e.g. deflection=30..85";
    let bad = |why: &str| {
        CliError::Usage(format!(
            "--free {text}: {why} (write NAME=FROM..TO, {example})"
        ))
    };
    let range = super::values::named_range("--free", text, example)?;
    let input = range.input;
    let (from, to) = range.ends.ok_or_else(|| bad("no `..` between the ends"))?;
    let from = parameter_value("--free", input, from)?;
    let to = parameter_value("--free", input, to)?;
    if to <= from {
        return Err(bad("the range must run from a lower to a higher value"));
    }
    Ok(Free { input, from, to })
}

fn parse_band(text: &str) -> Result<(f64, f64), CliError> {
    let (lo, hi) = text.split_once("..").ok_or_else(|| {
        CliError::Usage(format!(
            "--rpm {text}: give a band LO..HI, e.g. --rpm 25..35"
        ))
    })?;
    let lo = positive_rpm("--rpm", lo, "the low end of the speed band")?;
    let hi = positive_rpm("--rpm", hi, "the high end of the speed band")?;
    if hi < lo {
        return Err(CliError::Usage(format!(
            "--rpm {text}: the low end comes first (e.g. --rpm 25..35)"
        )));
    }
    Ok((lo, hi))
}

fn parse_number(argument: &str, text: &str, what: &str) -> Result<f64, CliError> {
    text.trim()
        .trim_end_matches('%')
        .trim()
        .parse::<f64>()
        .ok()
        .filter(|v| v.is_finite() && *v > 0.0)
        .ok_or_else(|| {
            CliError::Usage(format!(
                "{argument} {text}: {what} is a bare number above zero"
            ))
        })
}

fn goals(args: &SearchArgs) -> Result<Goals, CliError> {
    let cu_percent = args
        .cu
        .as_deref()
        .map(|c| {
            let v = parse_number("--cu", c, "the CU goal")?;
            if v < 100.0 {
                Ok(v)
            } else {
                Err(CliError::Usage(format!(
                    "--cu {c}: a CU goal lies below 100 %"
                )))
            }
        })
        .transpose()?;
    Ok(Goals {
        rpm: args.rpm.as_deref().map(parse_band).transpose()?,
        min_throw_m: args
            .min_throw
            .as_deref()
            .map(|t| positive_quantity("--min-throw", D::Length, t, "the least wetted radius"))
            .transpose()?,
        max_flow_m3_s: args
            .max_flow
            .as_deref()
            .map(|q| positive_quantity("--max-flow", D::Flow, q, "the most flow"))
            .transpose()?,
        min_margin: args
            .min_margin
            .as_deref()
            .map(|m| parse_number("--min-margin", m, "the least start margin"))
            .transpose()?,
        cu_percent,
    })
}

/// An input's value for a person, in the chosen units.
fn show_value(p: &Input, v: f64, units: UnitSystem) -> String {
    p.unit.format(v, units)
}

fn show_objective(o: Objective, v: Option<f64>, units: UnitSystem) -> String {
    match (o, v) {
        (_, None) => "—".into(),
        (Objective::Cu, Some(v)) => format!("{} %", sig(Some(v), 3)),
        (Objective::Throw | Objective::Spacing, Some(v)) => format_quantity(D::Length, v, units),
        (Objective::Margin, Some(v)) => sig(Some(v), 3),
    }
}

fn objective_display(o: Objective, v: f64, units: UnitSystem) -> f64 {
    match o {
        Objective::Cu | Objective::Margin => v,
        Objective::Throw | Objective::Spacing => to_display(D::Length, v, units),
    }
}

fn objective_words(o: Objective) -> &'static str {
    match o {
        Objective::Cu => "CU at the layout's spacing",
        Objective::Throw => "wetted radius",
        Objective::Spacing => "largest square spacing at the CU goal",
        Objective::Margin => "start margin",
    }
}

fn goal_words(g: GoalKind) -> &'static str {
    match g {
        GoalKind::Runs => "the rotor runs",
        GoalKind::RpmLow => "speed at least the band's low end",
        GoalKind::RpmHigh => "speed at most the band's high end",
        GoalKind::MinThrow => "least wetted radius",
        GoalKind::MaxFlow => "most flow",
        GoalKind::MinMargin => "least start margin",
        GoalKind::Cu => "CU goal",
    }
}

fn show_goal_value(g: GoalKind, v: Option<f64>, units: UnitSystem) -> String {
    match (g, v) {
        (_, None) => "nothing".into(),
        (GoalKind::Runs, _) => "—".into(),
        (GoalKind::RpmLow | GoalKind::RpmHigh, Some(v)) => format!("{} rpm", sig(Some(v), 3)),
        (GoalKind::MinThrow, Some(v)) => format_quantity(D::Length, v, units),
        (GoalKind::MaxFlow, Some(v)) => format_quantity(D::Flow, v, units),
        (GoalKind::MinMargin, Some(v)) => sig(Some(v), 3),
        (GoalKind::Cu, Some(v)) => format!("{} %", sig(Some(v), 3)),
    }
}

fn summary_line(e: &Evaluation, units: UnitSystem) -> String {
    let mut parts = vec![
        match e.rpm {
            Some(r) => format!("{} rpm", sig(Some(r), 3)),
            None => match (&e.invalid, e.status) {
                (Some(_), _) => "cannot take these values".into(),
                (None, Some(s)) => s.key().replace('_', " "),
                (None, None) => "not solved".into(),
            },
        },
        format!(
            "wetted radius {}",
            e.wetted_radius_m
                .map_or("—".into(), |r| format_quantity(D::Length, r, units))
        ),
    ];
    if let Some(cu) = e.cu_percent {
        parts.push(format!("CU {} %", sig(Some(cu), 3)));
    }
    if let Some(s) = e.spacing_m {
        parts.push(format!(
            "square spacing {}",
            format_quantity(D::Length, s, units)
        ));
    }
    parts.push(format!(
        "start margin {}",
        e.start_margin.map_or("—".into(), |m| sig(Some(m), 3))
    ));
    parts.push(format!(
        "flow {}",
        e.flow_m3_s
            .map_or("—".into(), |q| format_quantity(D::Flow, q, units))
    ));
    parts.join(", ")
}

#[derive(Debug, Serialize)]
struct DesignJson {
    feasible: bool,
    objective_value: Option<f64>,
    rpm: Option<f64>,
    wetted_radius_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    cu_percent: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    spacing_m: Option<f64>,
    start_margin: Option<f64>,
    flow_m3_s: Option<f64>,
    values: BTreeMap<&'static str, f64>,
}

#[derive(Debug, Serialize)]
struct UnmetJson {
    goal: &'static str,
    limit: f64,
    achieved: Option<f64>,
    closest: Option<f64>,
}

#[derive(Debug, Serialize)]
struct SensitivityJson {
    input: &'static str,
    value: f64,
    step: f64,
    objective_minus: Option<f64>,
    objective_plus: Option<f64>,
    objective_per_unit: Option<f64>,
    rpm_minus: Option<f64>,
    rpm_plus: Option<f64>,
    feasible_minus: bool,
    feasible_plus: bool,
}

#[derive(Debug, Serialize)]
struct SearchJson {
    objective: &'static str,
    /// The best design's figures, at the top level of the report.
    #[serde(flatten)]
    best: DesignJson,
    evaluations: usize,
    runners_up: Vec<DesignJson>,
    binding: Vec<&'static str>,
    at_range_end: Vec<&'static str>,
    unmet: Vec<UnmetJson>,
    sensitivity: Vec<SensitivityJson>,
    written_to: Option<String>,
}

fn design_json(r: &SearchResult, e: &Evaluation) -> DesignJson {
    DesignJson {
        feasible: e.feasible(),
        objective_value: e.objective,
        rpm: e.rpm,
        wetted_radius_m: e.wetted_radius_m,
        cu_percent: e.cu_percent,
        spacing_m: e.spacing_m,
        start_margin: e.start_margin,
        flow_m3_s: e.flow_m3_s,
        values: r
            .free
            .iter()
            .zip(&e.values)
            .map(|(f, &v)| (f.input.path, v))
            .collect(),
    }
}

fn unmet(r: &SearchResult) -> Vec<UnmetJson> {
    r.best
        .unmet()
        .map(|g| UnmetJson {
            goal: g.goal.key(),
            limit: g.limit,
            achieved: g.achieved,
            closest: r
                .closest
                .iter()
                .find(|c| c.goal == g.goal)
                .and_then(|c| c.best),
        })
        .collect()
}

/// Run `search`.
pub fn run(args: &SearchArgs, out: &mut dyn Write) -> Result<Outcome, CliError> {
    let path: &Path = &args.file;
    // The file's text is kept: `--out` edits it in place (comments kept).
    let (original, source) = open_for_edit(path)?;
    let design = source.to_design()?;
    let free = args
        .free
        .iter()
        .map(|f| parse_free(f))
        .collect::<Result<Vec<_>, _>>()?;
    let goals = goals(args)?;
    let objective: Objective = args.maximize.into();
    let options = SearchOptions {
        starts: args.starts as usize,
        ..SearchOptions::default()
    };
    let bar = progress_bar(options.starts + 1, "starts");
    let progress = |done: usize, _total: usize| {
        if let Some(b) = &bar {
            b.set_position(done as u64);
        }
    };
    let result = search(&design, &free, &goals, objective, &options, &progress)
        .map_err(|e| CliError::Usage(format!("{}: {e}", path.display())))?;
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    let units: UnitSystem = args.output.units.into();
    let written = save_design_over(
        args.out.as_deref(),
        path,
        &original,
        &source.notes,
        &result.design,
        units,
    )?;
    let best = &result.best;
    match args.output.format {
        Format::Json => {
            let j = SearchJson {
                objective: objective.key(),
                best: design_json(&result, best),
                evaluations: result.evaluations,
                runners_up: result
                    .runners_up
                    .iter()
                    .map(|e| design_json(&result, e))
                    .collect(),
                binding: result.binding.iter().map(|g| g.key()).collect(),
                at_range_end: result.at_range_end.iter().map(|p| p.path).collect(),
                unmet: unmet(&result),
                sensitivity: result
                    .sensitivity
                    .iter()
                    .map(|s| SensitivityJson {
                        input: s.input.path,
                        value: s.value,
                        step: s.step,
                        objective_minus: s.minus.objective,
                        objective_plus: s.plus.objective,
                        objective_per_unit: s.per_unit,
                        rpm_minus: s.minus.rpm,
                        rpm_plus: s.plus.rpm,
                        feasible_minus: s.minus.feasible(),
                        feasible_plus: s.plus.feasible(),
                    })
                    .collect(),
                written_to: written,
            };
            serde_json::to_writer_pretty(&mut *out, &j).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Csv => write_csv(&result, units, out)?,
        Format::Text => write_text(&result, &design.layout, units, written.as_deref(), out)?,
    }
    Ok(if args.strict && !result.feasible() {
        Outcome::DesignProblem
    } else {
        Outcome::Done
    })
}

fn write_csv(r: &SearchResult, units: UnitSystem, out: &mut dyn Write) -> Result<(), CliError> {
    let mut w = csv::Writer::from_writer(out);
    let mut header = vec!["rank".to_string(), "feasible".to_string()];
    header.extend(r.free.iter().map(|f| match f.input.unit {
        catalogue::Unit::Dim(dim) => csv_key(f.input.vary_name(), dim, units),
        _ => f.input.vary_key().to_string(),
    }));
    header.extend([
        "rpm".to_string(),
        csv_key("wetted_radius", D::Length, units),
        "cu_percent".to_string(),
        csv_key("spacing", D::Length, units),
        "start_margin".to_string(),
        csv_key("total_flow", D::Flow, units),
    ]);
    w.write_record(&header)?;
    let opt = |v: Option<f64>| v.map_or(String::new(), csv_number);
    let shown = |dim: D, v: Option<f64>| opt(v.map(|x| to_display(dim, x, units)));
    for (rank, e) in std::iter::once(&r.best).chain(&r.runners_up).enumerate() {
        let mut rec = vec![(rank + 1).to_string(), e.feasible().to_string()];
        rec.extend(
            r.free
                .iter()
                .zip(&e.values)
                .map(|(f, v)| csv_number(f.input.unit.to_display(*v, units))),
        );
        rec.extend([
            opt(e.rpm),
            shown(D::Length, e.wetted_radius_m),
            opt(e.cu_percent),
            shown(D::Length, e.spacing_m),
            opt(e.start_margin),
            shown(D::Flow, e.flow_m3_s),
        ]);
        w.write_record(&rec)?;
    }
    w.flush()?;
    Ok(())
}

fn write_text(
    r: &SearchResult,
    layout: &Option<Layout>,
    units: UnitSystem,
    written: Option<&str>,
    out: &mut dyn Write,
) -> Result<(), CliError> {
    let best = &r.best;
    let mut heading = format!(
        "Design search: make the {} as large as it will go",
        objective_words(r.objective)
    );
    if let (Objective::Cu, Some(l)) = (r.objective, layout) {
        heading.push_str(&format!(
            " ({} {})",
            pattern_name(l),
            format_quantity(D::Length, l.spacing_m(), units)
        ));
    }
    writeln!(out, "{heading}")?;
    let ranges: Vec<String> = r
        .free
        .iter()
        .map(|f| {
            format!(
                "{} {} to {}",
                f.input.vary_name(),
                show_value(f.input, f.from, units),
                show_value(f.input, f.to, units)
            )
        })
        .collect();
    writeln!(out, "Free: {}", ranges.join("; "))?;
    if best.feasible() {
        writeln!(out, "Every goal is met.")?;
    } else {
        writeln!(out, "No design in the ranges meets every goal. Missed:")?;
        for g in best.unmet() {
            let closest = r
                .closest
                .iter()
                .find(|c| c.goal == g.goal)
                .and_then(|c| c.best);
            if g.goal == GoalKind::Runs {
                writeln!(out, "  the rotor runs: the best design does not")?;
            } else {
                writeln!(
                    out,
                    "  {}: wanted {}, best design {}, closest any design came {}",
                    goal_words(g.goal),
                    show_goal_value(g.goal, Some(g.limit), units),
                    show_goal_value(g.goal, g.achieved, units),
                    show_goal_value(g.goal, closest, units)
                )?;
            }
        }
    }
    writeln!(out)?;
    writeln!(
        out,
        "Best design ({} {}):",
        objective_words(r.objective),
        show_objective(r.objective, best.objective, units)
    )?;
    for (f, v) in r.free.iter().zip(&best.values) {
        writeln!(
            out,
            "  {:<12} {}",
            f.input.vary_name(),
            show_value(f.input, *v, units)
        )?;
    }
    writeln!(out, "  {}", summary_line(best, units))?;
    if !r.binding.is_empty() {
        let b: Vec<&str> = r.binding.iter().map(|g| goal_words(*g)).collect();
        writeln!(
            out,
            "Binding goals (met with under 2 % to spare): {}",
            b.join("; ")
        )?;
    }
    if !r.at_range_end.is_empty() {
        let b: Vec<&str> = r.at_range_end.iter().map(|p| p.vary_name()).collect();
        writeln!(
            out,
            "At an end of its range: {} (a wider range may do better)",
            b.join(", ")
        )?;
    }
    if !r.runners_up.is_empty() {
        writeln!(out)?;
        writeln!(
            out,
            "Runners-up (differing by more than a tenth of a range):"
        )?;
        for (k, e) in r.runners_up.iter().enumerate() {
            let vals: Vec<String> = r
                .free
                .iter()
                .zip(&e.values)
                .map(|(f, v)| format!("{} {}", f.input.vary_name(), show_value(f.input, *v, units)))
                .collect();
            writeln!(
                out,
                "  {}. {}: {} {}",
                k + 2,
                vals.join(", "),
                objective_words(r.objective),
                show_objective(r.objective, e.objective, units)
            )?;
            writeln!(out, "     {}", summary_line(e, units))?;
        }
    }
    if !r.sensitivity.is_empty() {
        writeln!(out)?;
        writeln!(out, "Sensitivity: each free value moved 5 % either way")?;
        let obj_unit = match r.objective {
            Objective::Cu => "%".to_string(),
            Objective::Throw | Objective::Spacing => unit_label(D::Length, units).to_string(),
            Objective::Margin => String::new(),
        };
        let mut t = TextTable::new([
            "input".to_string(),
            "value".to_string(),
            "objective −5 %".to_string(),
            "objective +5 %".to_string(),
            "rpm −5 %".to_string(),
            "rpm +5 %".to_string(),
            "change per unit".to_string(),
        ]);
        for s in &r.sensitivity {
            let per_unit = match (s.minus.objective, s.plus.objective) {
                (Some(a), Some(b)) => {
                    let dv = s.input.unit.to_display(s.value + s.step, units)
                        - s.input.unit.to_display(s.value - s.step, units);
                    let dobj = objective_display(r.objective, b, units)
                        - objective_display(r.objective, a, units);
                    if dv != 0.0 {
                        let per = dobj / dv;
                        format!(
                            "{} {}/{}",
                            sig(Some(per), 3),
                            if obj_unit.is_empty() { "1" } else { &obj_unit },
                            s.input.unit.label(units)
                        )
                    } else {
                        "—".into()
                    }
                }
                _ => "—".into(),
            };
            let mark = |e: &Evaluation| if e.feasible() { "" } else { " (misses a goal)" };
            t.row([
                s.input.vary_name().to_string(),
                show_value(s.input, s.value, units),
                format!(
                    "{}{}",
                    show_objective(r.objective, s.minus.objective, units),
                    mark(&s.minus)
                ),
                format!(
                    "{}{}",
                    show_objective(r.objective, s.plus.objective, units),
                    mark(&s.plus)
                ),
                sig(s.minus.rpm, 3),
                sig(s.plus.rpm, 3),
                per_unit,
            ]);
        }
        write!(out, "{}", t.render(2))?;
    }
    writeln!(out)?;
    writeln!(out, "{} designs solved.", r.evaluations)?;
    if let Some(p) = written {
        writeln!(out, "Best design written to {p}.")?;
    }
    Ok(())
}

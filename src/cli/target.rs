//! `target`: the design value that gives a wanted speed or throw (one input,
//! or two for a speed and a throw together).

use std::io::Write;
use std::path::{Path, PathBuf};

use serde::Serialize;

use super::check::throw_of;
use super::text::{csv_number, sig};
use super::values::parameter_dimension;
use super::{
    open_for_edit, positive_quantity, positive_rpm, save_design_over, CliError, Format, Outcome,
    Output,
};
use crate::catalogue::{self, Input};
use crate::inverse::target::{target, Goal, TargetResult};
use crate::physics::design::Design;
use crate::units::{csv_key, format_quantity, to_display, unit_label, Dimension as D, UnitSystem};

/// What `target` aims at.
#[derive(Debug, Clone)]
pub struct TargetArgs {
    /// Wanted speed as typed: rpm bare (`30`) or with a unit (`30rpm`).
    pub rpm: Option<String>,
    /// Wanted wetted radius as typed.
    pub throw: Option<String>,
    /// The parameter to adjust.
    pub adjust: String,
    /// Where to write the adjusted scenario.
    pub out: Option<PathBuf>,
    /// Exit 1 when the target is out of reach.
    pub strict: bool,
}

/// Start margin below which a target's result is warned of (common practice:
/// a rotor that barely starts when new stops starting as it wears).
pub const TARGET_MARGIN_WARNING: f64 = 1.5;

/// What the adjusted design gives, and how touchy it is.
#[derive(Debug, Clone, Default, Serialize)]
struct Resulting {
    rpm: Option<f64>,
    wetted_radius_m: Option<f64>,
    start_margin: Option<f64>,
    total_flow_m3_s: Option<f64>,
    /// rpm per SI unit of the adjusted value (central difference over a
    /// tenth of the input's step).
    rpm_per_unit: Option<f64>,
    warnings: Vec<String>,
}

impl Resulting {
    /// The `  then: …` line of the text report: speed, wetted radius, start
    /// margin and flow of the adjusted design, "—" where there is none.
    fn then_line(&self, units: UnitSystem) -> String {
        let opt = |v: Option<String>| v.unwrap_or_else(|| "—".into());
        format!(
            "  then: {} · wetted radius {} · start margin {} · flow {}",
            opt(self.rpm.map(|r| format!("{r:.1} rpm"))),
            opt(self
                .wetted_radius_m
                .map(|r| format_quantity(D::Length, r, units))),
            opt(self.start_margin.map(|m| format!("{m:.2}"))),
            opt(self
                .total_flow_m3_s
                .map(|q| format_quantity(D::Flow, q, units))),
        )
    }
}

fn resulting(result: &TargetResult, units: UnitSystem) -> Resulting {
    let report = &result.report;
    let (rpm_op, margin, flow) = crate::inverse::sweep::summarize(report);
    let adjust = result.adjust;
    let h = 0.1 * adjust.step.fine;
    let speed_at = |v: f64| {
        let mut d = result.design.clone();
        adjust.vary_to(&mut d, v).ok()?;
        crate::physics::balance::solve_speed(&d)
            .operating
            .map(|op| crate::physics::balance::rpm(op.omega_rad_s()))
    };
    let (lo, hi) = (speed_at(result.value - h), speed_at(result.value + h));
    let slope = match (lo, hi) {
        (Some(a), Some(b)) if h > 0.0 => Some((b - a) / (2.0 * h)),
        _ => None,
    };
    let mut warnings = Vec::new();
    if let Some(m) = margin.filter(|m| *m < TARGET_MARGIN_WARNING) {
        warnings.push(format!(
            "start margin {m:.2} is below {TARGET_MARGIN_WARNING}: it may not start once worn"
        ));
    }
    if let Some(base) = rpm_op.filter(|r| *r > 0.0) {
        let worst = [lo, hi]
            .into_iter()
            .flatten()
            .map(|r| (r - base).abs() / base)
            .fold(0.0f64, f64::max);
        let unreliable = lo.is_none() || hi.is_none();
        if worst > 0.05 || unreliable {
            warnings.push(format!(
                "touchy: a tenth of a step ({}) moves the speed by {}",
                show_adjust(adjust, h, units),
                if unreliable {
                    "so much the rotor stops or runs away".to_string()
                } else {
                    format!("{:.0} %", 100.0 * worst)
                }
            ));
        }
    }
    Resulting {
        rpm: rpm_op,
        wetted_radius_m: throw_of(&result.design),
        start_margin: margin,
        total_flow_m3_s: flow,
        rpm_per_unit: slope,
        warnings,
    }
}

#[derive(Debug, Serialize)]
struct TargetJson {
    parameter: &'static str,
    value: f64,
    unit: &'static str,
    start_value: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    achieved_rpm: Option<Option<f64>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    achieved_throw_m: Option<Option<f64>>,
    reachable: bool,
    /// rpm, wetted_radius_m, start_margin, total_flow_m3_s, rpm_per_unit,
    /// warnings: the adjusted design, keys in that order.
    #[serde(flatten)]
    then: Resulting,
    written_to: Option<String>,
}

fn show_adjust(a: &Input, v: f64, units: UnitSystem) -> String {
    match parameter_dimension(a) {
        Some(dim) => format_quantity(dim, v, units),
        None => format!("{} {}", sig(Some(v), 4), a.unit.si_label())
            .trim()
            .to_string(),
    }
}

/// Run `target`.
pub fn run_target(
    path: &Path,
    args: &TargetArgs,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    // The file's text is kept: `--out` edits it in place (comments and notes kept).
    let (original, source) = open_for_edit(path)?;
    let design = source.to_design()?;
    if let Some((first, second)) = args.adjust.split_once(',') {
        return run_two_targets(&design, args, first.trim(), second.trim(), o, out);
    }
    let adjust = catalogue::by_adjust_name(&args.adjust).ok_or_else(|| {
        CliError::Usage(format!(
            "--adjust {}: choose one of {}",
            args.adjust,
            catalogue::adjustable()
                .map(|a| a.vary_name())
                .collect::<Vec<_>>()
                .join(", ")
        ))
    })?;
    let throw_fn = throw_of;
    let goal = match (&args.rpm, &args.throw) {
        (Some(r), None) => Goal::Rpm(positive_rpm("--rpm", r, "the wanted speed")?),
        (None, Some(t)) => Goal::Throw {
            radius_m: positive_quantity("--throw", D::Length, t, "the wanted wetted radius")?,
            throw: &throw_fn,
        },
        _ => {
            return Err(CliError::Usage(
                "give one target: --rpm 30 or --throw 8m".into(),
            ))
        }
    };
    let rpm_goal = matches!(goal, Goal::Rpm(_));
    let result: TargetResult =
        target(&design, adjust, goal).map_err(|e| CliError::Usage(e.to_string()))?;
    let units: UnitSystem = o.units.into();
    let res = resulting(&result, units);
    let written = save_design_over(
        args.out.as_deref(),
        path,
        &original,
        &source.notes,
        &result.design,
        units,
    )?;
    match o.format {
        Format::Json => {
            let j = TargetJson {
                parameter: adjust.vary_name(),
                value: result.value,
                unit: result.unit,
                start_value: result.start_value,
                achieved_rpm: rpm_goal.then_some(result.achieved),
                achieved_throw_m: (!rpm_goal).then_some(result.achieved),
                reachable: result.reachable,
                then: res.clone(),
                written_to: written,
            };
            serde_json::to_writer_pretty(&mut *out, &j).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Csv => {
            let dim = adjust.unit.dimension();
            let key = |name: &str| match dim {
                Some(dim) => csv_key(name, dim, units),
                // A bare coefficient: SI, its unit spelt in the key.
                None => format!(
                    "{name}{}",
                    adjust
                        .vary_key()
                        .strip_prefix(adjust.vary_name())
                        .unwrap_or("")
                ),
            };
            let value = |v: f64| match dim {
                Some(dim) => csv_number(to_display(dim, v, units)),
                None => csv_number(v),
            };
            let achieved_key = if rpm_goal {
                "achieved_rpm".to_string()
            } else {
                csv_key("achieved_throw", D::Length, units)
            };
            let achieved = result.achieved.map_or(String::new(), |a| {
                if rpm_goal {
                    csv_number(a)
                } else {
                    csv_number(to_display(D::Length, a, units))
                }
            });
            let mut w = csv::Writer::from_writer(out);
            w.write_record([
                "parameter".to_string(),
                key("value"),
                key("start_value"),
                achieved_key,
                "reachable".to_string(),
                "written_to".to_string(),
            ])?;
            w.write_record([
                adjust.vary_name().to_string(),
                value(result.value),
                value(result.start_value),
                achieved,
                result.reachable.to_string(),
                written.unwrap_or_default(),
            ])?;
            w.flush()?;
        }
        Format::Text => {
            let what = |v: f64| {
                if rpm_goal {
                    format!("{v:.1} rpm")
                } else {
                    format_quantity(D::Length, v, units)
                }
            };
            if result.reachable {
                writeln!(
                    out,
                    "{}: {} {} (was {}) gives {}",
                    design.name,
                    adjust.vary_name(),
                    show_adjust(adjust, result.value, units),
                    show_adjust(adjust, result.start_value, units),
                    result.achieved.map_or("—".into(), what)
                )?;
            } else {
                writeln!(
                    out,
                    "{}: {} is out of reach by {} over {} to {}; the nearest is {} = {}, giving {}",
                    design.name,
                    what(result.target),
                    adjust.vary_name(),
                    show_adjust(adjust, result.range.0, units),
                    show_adjust(adjust, result.range.1, units),
                    adjust.vary_name(),
                    show_adjust(adjust, result.value, units),
                    result.achieved.map_or("no running speed".into(), what)
                )?;
            }
            writeln!(out, "{}", res.then_line(units))?;
            if let Some(k) = res.rpm_per_unit {
                // rpm per display unit of the adjusted input.
                let (per, unit) = match parameter_dimension(adjust) {
                    Some(dim) => (
                        k / to_display(dim, 1.0, units),
                        unit_label(dim, units).to_string(),
                    ),
                    None => (k, adjust.unit.si_label().to_string()),
                };
                writeln!(out, "  sensitivity: {} rpm per {unit}", sig(Some(per), 3))?;
            }
            for w in &res.warnings {
                writeln!(out, "  warning: {w}")?;
            }
            if let Some(w) = written {
                writeln!(out, "wrote the adjusted scenario to {w}")?;
            }
        }
    }
    Ok(if args.strict && !result.reachable {
        Outcome::DesignProblem
    } else {
        Outcome::Done
    })
}

fn adjustable(name: &str) -> Result<&'static Input, CliError> {
    let name = if name == "brake" { "viscous" } else { name };
    catalogue::by_adjust_name(name).ok_or_else(|| {
        CliError::Usage(format!(
            "--adjust {name}: choose from {}",
            catalogue::adjustable()
                .map(|a| a.vary_name())
                .collect::<Vec<_>>()
                .join(", ")
        ))
    })
}

/// `target --rpm R --throw L --adjust A,B`: A meets the throw, B the speed
/// (a nested solve, model.md M10).
fn run_two_targets(
    design: &Design,
    args: &TargetArgs,
    first: &str,
    second: &str,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let (Some(r), Some(t)) = (&args.rpm, &args.throw) else {
        return Err(CliError::Usage(
            "two inputs to adjust need two targets: --rpm 30 --throw 11m --adjust deflection,nozzle"
                .into(),
        ));
    };
    if args.out.is_some() || o.format == Format::Csv {
        return Err(CliError::Usage(
            "two targets report in text or JSON and write no scenario (adjust one at a time for --out or CSV)"
                .into(),
        ));
    }
    let rpm = positive_rpm("--rpm", r, "the wanted speed")?;
    let throw_m = positive_quantity("--throw", D::Length, t, "the wanted wetted radius")?;
    let (a, b) = (adjustable(first)?, adjustable(second)?);
    if std::ptr::eq(a, b) {
        return Err(CliError::Usage(format!(
            "--adjust {first},{second}: two different inputs, one per target"
        )));
    }
    let (outer, inner) = crate::inverse::target::target_two(design, a, b, rpm, throw_m, throw_of)
        .map_err(|e| CliError::Usage(e.to_string()))?;
    let units: UnitSystem = o.units.into();
    let res = resulting(&inner, units);
    let met = outer.reachable && inner.reachable;
    match o.format {
        Format::Json => {
            let j = serde_json::json!({
                "parameters": [a.vary_name(), b.vary_name()],
                "values": [outer.value, inner.value],
                "units": [outer.unit, inner.unit],
                "start_values": [outer.start_value, inner.start_value],
                "reachable": met,
                "rpm": res.rpm,
                "wetted_radius_m": res.wetted_radius_m,
                "start_margin": res.start_margin,
                "total_flow_m3_s": res.total_flow_m3_s,
                "warnings": res.warnings,
            });
            serde_json::to_writer_pretty(&mut *out, &j).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        _ => {
            writeln!(
                out,
                "{}: {} {} (was {}) and {} {} (was {}) {} {:.1} rpm and {}",
                design.name,
                a.vary_name(),
                show_adjust(a, outer.value, units),
                show_adjust(a, outer.start_value, units),
                b.vary_name(),
                show_adjust(b, inner.value, units),
                show_adjust(b, inner.start_value, units),
                if met { "give" } else { "come nearest to" },
                rpm,
                format_quantity(D::Length, throw_m, units),
            )?;
            writeln!(out, "{}", res.then_line(units))?;
            for w in &res.warnings {
                writeln!(out, "  warning: {w}")?;
            }
        }
    }
    Ok(if args.strict && !met {
        Outcome::DesignProblem
    } else {
        Outcome::Done
    })
}

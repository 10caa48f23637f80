//! Designs side by side: the inputs that differ, by catalogue path and label,
//! and the key results with deltas and percentages against the first design.

use std::collections::HashMap;

use rayon::prelude::*;

use super::sweep::summarize;
use crate::catalogue::{self, Input, Value};
use crate::physics::balance::{rpm, solve, SpinReport, SpinStatus};
use crate::physics::coverage::{uniformity_on_layout, wetted_radius_m};
use crate::physics::design::Design;

/// One input of a design, flattened.
#[derive(Debug, Clone, PartialEq)]
pub enum InputValue {
    /// A number in SI.
    Number(f64),
    /// A choice or a default ("washer", "auto").
    Text(String),
}

impl InputValue {
    fn same_as(&self, other: &InputValue) -> bool {
        match (self, other) {
            (InputValue::Number(a), InputValue::Number(b)) => {
                a == b || (a - b).abs() <= 1e-9 * a.abs().max(b.abs())
            }
            (InputValue::Text(a), InputValue::Text(b)) => a == b,
            _ => false,
        }
    }
}

impl std::fmt::Display for InputValue {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            InputValue::Number(x) => write!(f, "{x}"),
            InputValue::Text(t) => f.write_str(t),
        }
    }
}

/// One flattened input: the catalogue entry, its arm, its path and value.
#[derive(Debug, Clone, PartialEq)]
pub struct InputField {
    /// The catalogue entry.
    pub input: &'static Input,
    /// The arm, for a per-arm input.
    pub arm: Option<usize>,
    /// The path with the arm index, e.g. `rotor.arms[0].nozzle.diameter`.
    pub path: String,
    /// The value.
    pub value: InputValue,
}

/// Every input of a design, in catalogue order (per-arm inputs arm by arm).
/// The name is left out (it labels the design, it is not an input).
pub fn design_inputs(design: &Design) -> Vec<InputField> {
    catalogue::present(design)
        .into_iter()
        .filter_map(|(input, arm)| {
            let value = match input.get(design, arm)? {
                Value::Number(v) => InputValue::Number(v),
                Value::Auto => InputValue::Text("auto".to_string()),
                Value::Choice(c) => InputValue::Text(c.to_string()),
                Value::Text(_) => return None,
            };
            Some(InputField {
                input,
                arm,
                path: input.path_at(arm),
                value,
            })
        })
        .collect()
}

/// An input that is not the same in every design compared.
#[derive(Debug, Clone, PartialEq)]
pub struct InputDifference {
    /// The catalogue entry (label, unit, help).
    pub input: &'static Input,
    /// The arm, for a per-arm input.
    pub arm: Option<usize>,
    /// The path with the arm index, e.g. `rotor.arms[0].nozzle.diameter`.
    pub path: String,
    /// SI unit ("" for dimensionless or text).
    pub unit: &'static str,
    /// The value in each design, in the order given (None: the design has no such field).
    pub values: Vec<Option<InputValue>>,
}

/// One key result across the designs, with differences against the first.
#[derive(Debug, Clone, PartialEq)]
pub struct ResultComparison {
    /// Key with the unit in it (`rpm`, `start_margin`, `total_flow_m3_s`, …).
    pub key: String,
    /// Unit of the values ("" for dimensionless).
    pub unit: String,
    /// The value for each design (None where it does not exist, e.g. rpm of a stalled rotor).
    pub values: Vec<Option<f64>>,
    /// value − first value (Some(0) for the first design itself).
    pub deltas: Vec<Option<f64>>,
    /// 100 · delta / |first value|, when the first value is not zero.
    pub percents: Vec<Option<f64>>,
}

impl ResultComparison {
    /// Whether a larger value of this result is better: `Some(true)` for the
    /// start margin, CU, DU and wetted radius; `None` where neither is (speed,
    /// flow and torque are matters of design, not of merit).
    pub fn larger_is_better(&self) -> Option<bool> {
        match self.key.as_str() {
            "start_margin" | "cu_percent" | "du_lq_percent" | "wetted_radius_m" => Some(true),
            _ => None,
        }
    }

    /// Whether design `k` is better (`Some(true)`) or worse (`Some(false)`)
    /// than the first on this result; `None` when neither is better, when
    /// there is no value to compare, or when the change is under 0.05 % of
    /// the first value (it would read 0.0 %).
    pub fn better(&self, k: usize) -> Option<bool> {
        let up = self.larger_is_better()?;
        let d = self.deltas.get(k).copied().flatten()?;
        let small = self
            .percents
            .get(k)
            .copied()
            .flatten()
            .is_some_and(|p| p.abs() < 0.05);
        (d != 0.0 && !small).then_some((d > 0.0) == up)
    }
}

/// A key result supplied by the caller (throw, CU…), computed per design.
pub struct ExtraMetric<'a> {
    /// Key with the unit in it, e.g. `wetted_radius_m`.
    pub key: &'a str,
    /// Unit, e.g. "m".
    pub unit: &'a str,
    /// The metric of a solved design.
    pub eval: &'a (dyn Fn(&Design, &SpinReport) -> Option<f64> + Sync),
}

/// Designs side by side.
#[derive(Debug, Clone, PartialEq)]
pub struct Comparison {
    /// The names given, in order.
    pub names: Vec<String>,
    /// Each design's spin status.
    pub statuses: Vec<SpinStatus>,
    /// Every input that differs, in the first design's field order, then any
    /// fields only later designs have.
    pub inputs: Vec<InputDifference>,
    /// Key results: rpm, start margin, total flow, stall torque, runaway, then
    /// the caller's extras.
    pub results: Vec<ResultComparison>,
}

/// A comparison that cannot be made.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum CompareError {
    /// Fewer than two designs.
    #[error("compare needs at least two designs, got {0}")]
    TooFew(usize),
}

/// Compare two or more named designs: the inputs that differ and the key
/// results with deltas and percentages against the first.
pub fn compare(
    designs: &[(&str, &Design)],
    extras: &[ExtraMetric<'_>],
) -> Result<Comparison, CompareError> {
    if designs.len() < 2 {
        return Err(CompareError::TooFew(designs.len()));
    }
    let inputs = differing_inputs(designs.iter().map(|(_, d)| *d));
    let solved: Vec<(SpinReport, Vec<Option<f64>>)> = designs
        .par_iter()
        .map(|(_, d)| {
            let report = solve(d);
            let extra = extras.iter().map(|m| (m.eval)(d, &report)).collect();
            (report, extra)
        })
        .collect();
    let mut results = Vec::new();
    let mut row = |key: &str, unit: &str, values: Vec<Option<f64>>| {
        results.push(result_row(key, unit, values));
    };
    let reports = || solved.iter().map(|(r, _)| r);
    row(
        "rpm",
        "rpm",
        reports()
            .map(|r| r.operating.as_ref().map(|op| rpm(op.omega_rad_s())))
            .collect(),
    );
    row(
        "start_margin",
        "",
        reports().map(|r| r.start_margin).collect(),
    );
    row(
        "total_flow_m3_s",
        "m3/s",
        reports().map(|r| summarize(r).2).collect(),
    );
    row(
        "stall_torque_n_m",
        "N·m",
        reports().map(|r| Some(r.stall_torque_n_m)).collect(),
    );
    row(
        "runaway_rpm",
        "rpm",
        reports().map(|r| r.runaway_rad_s.map(rpm)).collect(),
    );
    for (k, m) in extras.iter().enumerate() {
        row(
            m.key,
            m.unit,
            solved
                .iter()
                .map(|(_, e)| e.get(k).copied().flatten())
                .collect(),
        );
    }
    Ok(Comparison {
        names: designs.iter().map(|(n, _)| n.to_string()).collect(),
        statuses: reports().map(|r| r.status).collect(),
        inputs,
        results,
    })
}

fn result_row(key: &str, unit: &str, values: Vec<Option<f64>>) -> ResultComparison {
    let first = values.first().copied().flatten();
    let deltas: Vec<Option<f64>> = values
        .iter()
        .map(|v| match (v, first) {
            (Some(v), Some(f)) => Some(v - f),
            _ => None,
        })
        .collect();
    let percents = deltas
        .iter()
        .map(|d| match (d, first) {
            (Some(d), Some(f)) if f != 0.0 => Some(100.0 * d / f.abs()),
            _ => None,
        })
        .collect();
    ResultComparison {
        key: key.to_string(),
        unit: unit.to_string(),
        values,
        deltas,
        percents,
    }
}

/// Inputs that are not the same in every design.
pub fn differing_inputs<'a>(designs: impl Iterator<Item = &'a Design>) -> Vec<InputDifference> {
    let flats: Vec<Vec<InputField>> = designs.map(design_inputs).collect();
    let mut order: Vec<&InputField> = Vec::new();
    let mut seen = std::collections::HashSet::new();
    for field in flats.iter().flatten() {
        if seen.insert(field.path.as_str()) {
            order.push(field);
        }
    }
    let lookups: Vec<HashMap<&str, &InputValue>> = flats
        .iter()
        .map(|flat| {
            flat.iter()
                .map(|f| (f.path.as_str(), &f.value))
                .collect::<HashMap<_, _>>()
        })
        .collect();
    order
        .into_iter()
        .filter_map(|field| {
            let values: Vec<Option<InputValue>> = lookups
                .iter()
                .map(|l| l.get(field.path.as_str()).map(|v| (*v).clone()))
                .collect();
            let first = values.first().cloned().flatten();
            let all_same = values.iter().all(|v| match (v, &first) {
                (Some(v), Some(f)) => v.same_as(f),
                _ => false,
            });
            (!all_same).then(|| InputDifference {
                input: field.input,
                arm: field.arm,
                path: field.path.clone(),
                unit: field.input.unit.si_label(),
                values,
            })
        })
        .collect()
}

/// Named designs side by side (see [`compare`]) with the wetted radius, CU
/// and DU_lq as extra results; CU and DU come from one overlap per design.
pub fn compare_with_coverage(designs: &[(&str, &Design)]) -> Result<Comparison, CompareError> {
    let rated: Vec<(&Design, Option<(f64, f64)>)> = designs
        .iter()
        .map(|(_, d)| (*d, uniformity_on_layout(d, &solve(d))))
        .collect();
    let lookup = |d: &Design| rated.iter().find(|(x, _)| *x == d).and_then(|(_, u)| *u);
    let wetted = |d: &Design, r: &SpinReport| wetted_radius_m(d, r).ok();
    let cu = |d: &Design, _: &SpinReport| lookup(d).map(|u| u.0);
    let du = |d: &Design, _: &SpinReport| lookup(d).map(|u| u.1);
    let extras = [
        ExtraMetric {
            key: "wetted_radius_m",
            unit: "m",
            eval: &wetted,
        },
        ExtraMetric {
            key: "cu_percent",
            unit: "%",
            eval: &cu,
        },
        ExtraMetric {
            key: "du_lq_percent",
            unit: "%",
            eval: &du,
        },
    ];
    compare(designs, &extras)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalogue::NOZZLE_DIAMETER;
    use crate::physics::fixtures::three_arm_rotor;

    #[test]
    fn better_and_worse_only_for_merits_and_changes_that_show() {
        let row = |key: &str, values: Vec<Option<f64>>| result_row(key, "", values);
        let cu = row(
            "cu_percent",
            vec![Some(80.0), Some(84.0), Some(79.0), Some(80.02)],
        );
        assert_eq!(cu.better(0), None, "the first against itself");
        assert_eq!(cu.better(1), Some(true));
        assert_eq!(cu.better(2), Some(false));
        // 0.025 % of the first value reads +0.0 %: no verdict.
        assert_eq!(cu.better(3), None);
        // Speed is a matter of design, not of merit.
        let rpm = row("rpm", vec![Some(30.0), Some(40.0)]);
        assert_eq!(rpm.better(1), None);
        // A design without the result has no verdict.
        let margin = row("start_margin", vec![Some(2.0), None]);
        assert_eq!(margin.better(1), None);
    }

    #[test]
    fn compare_lists_only_what_differs() {
        let a = three_arm_rotor();
        let mut b = a.clone();
        b.name = "other name".into();
        NOZZLE_DIAMETER.vary_to(&mut b, 2.6e-3).unwrap();
        let c = compare(&[("a", &a), ("b", &b)], &[]).unwrap();
        let paths: Vec<&str> = c.inputs.iter().map(|i| i.path.as_str()).collect();
        assert_eq!(
            paths,
            vec![
                "rotor.arms[0].nozzle.diameter",
                "rotor.arms[1].nozzle.diameter",
                "rotor.arms[2].nozzle.diameter"
            ]
        );
        assert!(c
            .inputs
            .iter()
            .all(|i| i.input == &NOZZLE_DIAMETER && i.unit == "m"));
        let rpm_row = &c.results[0];
        assert_eq!(rpm_row.key, "rpm");
        let (r0, r1) = (rpm_row.values[0].unwrap(), rpm_row.values[1].unwrap());
        assert_eq!(rpm_row.deltas[0], Some(0.0));
        assert!((rpm_row.deltas[1].unwrap() - (r1 - r0)).abs() < 1e-12);
        assert!((rpm_row.percents[1].unwrap() - 100.0 * (r1 - r0) / r0).abs() < 1e-9);
        assert!(compare(&[("a", &a)], &[]).is_err());
    }

    #[test]
    fn compare_shows_fields_one_design_lacks() {
        let a = three_arm_rotor();
        let mut b = a.clone();
        b.rotor.arms.pop();
        let c = compare(&[("three", &a), ("two", &b)], &[]).unwrap();
        let arms = c.inputs.iter().find(|i| i.path == "rotor.arms").unwrap();
        assert_eq!(
            arms.values,
            vec![Some(InputValue::Number(3.0)), Some(InputValue::Number(2.0))]
        );
        let third = c
            .inputs
            .iter()
            .find(|i| i.path == "rotor.arms[2].radius")
            .unwrap();
        assert_eq!(third.values[1], None);
    }
}

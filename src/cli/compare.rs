//! `compare`: designs side by side, the inputs that differ and the results.

use std::io::Write;
use std::path::PathBuf;

use super::text::{csv_number, sig, TextTable};
use super::{load_design, CliError, Format, Outcome, Output};
use crate::inverse::compare::{compare_with_coverage, Comparison, InputValue};
use crate::physics::design::Design;
use crate::units::{to_display, unit_label, Dimension as D, UnitSystem};

/// Run `compare`.
pub fn run_compare(paths: &[PathBuf], o: Output, out: &mut dyn Write) -> Result<Outcome, CliError> {
    let designs = paths
        .iter()
        .map(|p| load_design(p))
        .collect::<Result<Vec<_>, _>>()?;
    let names: Vec<String> = paths
        .iter()
        .map(|p| {
            p.file_stem().map_or_else(
                || p.display().to_string(),
                |s| s.to_string_lossy().into_owned(),
            )
        })
        .collect();
    let pairs: Vec<(&str, &Design)> = names
        .iter()
        .map(String::as_str)
        .zip(designs.iter())
        .collect();
    let c: Comparison =
        compare_with_coverage(&pairs).map_err(|e| CliError::Usage(e.to_string()))?;
    match o.format {
        Format::Json => {
            let j = serde_json::json!({
                "designs": c.names,
                "status": c.statuses.iter().map(|s| s.key()).collect::<Vec<_>>(),
                "inputs": c.inputs.iter().map(|i| serde_json::json!({
                    "path": i.path,
                    "unit": i.unit,
                    "values": i.values.iter().map(|v| match v {
                        Some(InputValue::Number(x)) => serde_json::json!(x),
                        Some(InputValue::Text(t)) => serde_json::json!(t),
                        None => serde_json::Value::Null,
                    }).collect::<Vec<_>>(),
                })).collect::<Vec<_>>(),
                "results": c.results.iter().map(|r| serde_json::json!({
                    "key": r.key, "unit": r.unit, "values": r.values, "deltas": r.deltas, "percents": r.percents,
                })).collect::<Vec<_>>(),
            });
            serde_json::to_writer_pretty(&mut *out, &j).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Csv => {
            let units: UnitSystem = o.units.into();
            let mut w = csv::Writer::from_writer(out);
            let mut header = vec!["kind".to_string(), "name".to_string(), "unit".to_string()];
            header.extend(c.names.iter().cloned());
            header.extend(c.names.iter().skip(1).map(|n| format!("delta {n}")));
            header.extend(c.names.iter().skip(1).map(|n| format!("percent {n}")));
            w.write_record(&header)?;
            for i in &c.inputs {
                let shown = ShownInput::new(i, units);
                let mut rec = vec!["input".to_string(), shown.name, shown.unit.clone()];
                rec.extend(i.values.iter().map(|v| match v {
                    Some(InputValue::Number(x)) => csv_number((shown.value)(*x)),
                    Some(InputValue::Text(t)) => t.clone(),
                    None => String::new(),
                }));
                w.write_record(
                    rec.iter()
                        .chain(std::iter::repeat_n(&String::new(), 2 * (c.names.len() - 1))),
                )?;
            }
            let opt = |v: &Option<f64>| v.map_or(String::new(), csv_number);
            for r in &c.results {
                let shown = ShownResult::new(r, units);
                let mut rec = vec!["result".to_string(), shown.name, shown.unit];
                rec.extend(shown.values.iter().map(opt));
                rec.extend(shown.deltas.iter().skip(1).map(opt));
                rec.extend(r.percents.iter().skip(1).map(opt));
                w.write_record(&rec)?;
            }
            w.flush()?;
        }
        Format::Text => {
            let units: UnitSystem = o.units.into();
            let mut t =
                TextTable::new(std::iter::once("input".to_string()).chain(c.names.iter().cloned()));
            for i in &c.inputs {
                let shown = ShownInput::new(i, units);
                t.row(
                    std::iter::once(
                        format!("{} {}", shown.name, shown.unit)
                            .trim_end()
                            .to_string(),
                    )
                    .chain(i.values.iter().map(|v| {
                        v.as_ref().map_or("—".to_string(), |v| match v {
                            InputValue::Number(x) => sig(Some((shown.value)(*x)), 4),
                            InputValue::Text(s) => s.clone(),
                        })
                    })),
                );
            }
            if c.inputs.is_empty() {
                writeln!(out, "The inputs are the same.")?;
            } else {
                writeln!(out, "Inputs that differ")?;
                write!(out, "{}", t.render(2))?;
            }
            writeln!(
                out,
                "\nResults (deltas against {})",
                c.names.first().map_or("", String::as_str)
            )?;
            let mut r = TextTable::new(
                std::iter::once("result".to_string())
                    .chain(c.names.iter().cloned())
                    .chain(c.names.iter().skip(1).map(|n| format!("Δ {n}"))),
            );
            for res in &c.results {
                let shown = ShownResult::new(res, units);
                let cells = shown.values.iter().map(|v| sig(*v, 4));
                let deltas = shown
                    .deltas
                    .iter()
                    .zip(&res.percents)
                    .enumerate()
                    .skip(1)
                    .map(|(k, (d, p))| match (d, p) {
                        (Some(d), Some(p)) => {
                            let mark = match res.better(k) {
                                Some(true) => " better",
                                Some(false) => " worse",
                                None => "",
                            };
                            format!(
                                "{} ({} %){mark}",
                                sig(Some(*d), 3),
                                crate::words::signed(*p, 1)
                            )
                        }
                        (Some(d), None) => sig(Some(*d), 3),
                        _ => "—".to_string(),
                    });
                r.row(
                    std::iter::once(format!("{} {}", shown.name, shown.unit).trim().to_string())
                        .chain(cells)
                        .chain(deltas),
                );
            }
            write!(out, "{}", r.render(2))?;
        }
    }
    Ok(Outcome::Done)
}

/// SI unit suffixes of the comparison's field paths and result keys, longest first.
const SI_SUFFIXES: [&str; 11] = [
    "_kg_m3", "_kg_m2", "_m3_s", "_n_m", "_m_s", "_pa", "_rad", "_m2", "_kg", "_c", "_m",
];

/// A name without its SI unit suffix (`total_flow_m3_s` → `total_flow`);
/// a name that is all unit (`rotor.inertia.kg_m2`) is kept.
fn without_si_suffix(name: &str) -> &str {
    SI_SUFFIXES
        .iter()
        .find_map(|sfx| {
            name.strip_suffix(sfx)
                .filter(|rest| !rest.is_empty() && !rest.ends_with('.'))
                .filter(|rest| !rest.ends_with(".kg"))
        })
        .unwrap_or(name)
}

/// A compared input as shown: its name without the SI suffix, its unit and
/// values in the chosen unit system (SI kept for a bare number).
struct ShownInput {
    name: String,
    unit: String,
    value: Box<dyn Fn(f64) -> f64>,
}

impl ShownInput {
    /// The catalogue says each input's unit: no guessing from the path.
    fn new(difference: &crate::inverse::compare::InputDifference, units: UnitSystem) -> Self {
        let unit = difference.input.unit;
        ShownInput {
            name: without_si_suffix(&difference.path).to_string(),
            unit: unit.label(units),
            value: Box::new(move |x| unit.to_display(x, units)),
        }
    }
}

/// A compared result in the chosen unit system: values and deltas converted
/// (deltas as differences of the shown values), percentages unchanged.
struct ShownResult {
    name: String,
    unit: String,
    values: Vec<Option<f64>>,
    deltas: Vec<Option<f64>>,
}

impl ShownResult {
    fn new(r: &crate::inverse::compare::ResultComparison, units: UnitSystem) -> Self {
        let dim = match r.unit.as_str() {
            "m3/s" => Some(D::Flow),
            "N·m" => Some(D::Torque),
            "m" => Some(D::Length),
            "Pa" => Some(D::Pressure),
            _ => None,
        };
        match dim {
            Some(dim) => {
                let values: Vec<Option<f64>> = r
                    .values
                    .iter()
                    .map(|v| v.map(|x| to_display(dim, x, units)))
                    .collect();
                let first = values.first().copied().flatten();
                let deltas = values
                    .iter()
                    .map(|v| match (v, first) {
                        (Some(v), Some(f)) => Some(v - f),
                        _ => None,
                    })
                    .collect();
                ShownResult {
                    name: without_si_suffix(&r.key).to_string(),
                    unit: unit_label(dim, units).to_string(),
                    values,
                    deltas,
                }
            }
            None => ShownResult {
                name: r.key.clone(),
                unit: r.unit.clone(),
                values: r.values.clone(),
                deltas: r.deltas.clone(),
            },
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn compared_names_lose_their_si_suffix_only() {
        assert_eq!(without_si_suffix("total_flow_m3_s"), "total_flow");
        assert_eq!(without_si_suffix("stall_torque_n_m"), "stall_torque");
        assert_eq!(
            without_si_suffix("rotor.arms[0].nozzle.diameter_m"),
            "rotor.arms[0].nozzle.diameter"
        );
        assert_eq!(without_si_suffix("wind.speed_m_s"), "wind.speed");
        assert_eq!(
            without_si_suffix("rotor.inertia.kg_m2"),
            "rotor.inertia.kg_m2"
        );
        assert_eq!(without_si_suffix("rpm"), "rpm");
        assert_eq!(without_si_suffix("start_margin"), "start_margin");
    }
}

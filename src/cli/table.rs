//! `spinwright table`: the torque–speed curve from rest to past runaway.

use std::io::Write;
use std::path::Path;

use serde::Serialize;

use super::solve::headline;
use super::text::{csv_number, TextTable};
use super::{load_design, CliError, Format, Outcome, Output};
use crate::physics::balance::{rpm, solve, torque_table, TableRow};
use crate::units::{csv_key, format_number, to_display, unit_label, Dimension as D, UnitSystem};

#[derive(Debug, Serialize)]
struct RowJson {
    rpm: f64,
    omega_rad_s: f64,
    drive_torque_n_m: f64,
    bearing_n_m: f64,
    seal_n_m: f64,
    brake_n_m: f64,
    air_n_m: f64,
    resisting_torque_n_m: f64,
    net_torque_n_m: f64,
    total_flow_m3_s: f64,
    hub_pressure_pa: f64,
}

fn row_json(r: &TableRow) -> RowJson {
    RowJson {
        rpm: rpm(r.omega_rad_s),
        omega_rad_s: r.omega_rad_s,
        drive_torque_n_m: r.drive_n_m,
        bearing_n_m: r.resist.bearing_n_m,
        seal_n_m: r.resist.seal_n_m,
        brake_n_m: r.resist.brake_n_m,
        air_n_m: r.resist.air_n_m,
        resisting_torque_n_m: r.resist.total_n_m(),
        net_torque_n_m: r.net_n_m(),
        total_flow_m3_s: r.state.total_flow_m3_s,
        hub_pressure_pa: r.state.hub_pressure_pa,
    }
}

/// Column headers with units, in the chosen unit system.
pub fn headers(units: UnitSystem) -> Vec<String> {
    let t = unit_label(D::Torque, units);
    vec![
        "speed rpm".into(),
        format!("drive {t}"),
        format!("bearing {t}"),
        format!("seal {t}"),
        format!("brake {t}"),
        format!("air {t}"),
        format!("resisting {t}"),
        format!("net {t}"),
        format!("flow {}", unit_label(D::Flow, units)),
        format!("hub {}", unit_label(D::Pressure, units)),
    ]
}

/// CSV column names, in [`headers`] order: the JSON names with the unit of
/// the values in the chosen system (`drive_torque_N_m`, `hub_pressure_psi`).
pub fn csv_headers(units: UnitSystem) -> Vec<String> {
    let t = |name: &str| csv_key(name, D::Torque, units);
    vec![
        "rpm".into(),
        t("drive_torque"),
        t("bearing"),
        t("seal"),
        t("brake"),
        t("air"),
        t("resisting_torque"),
        t("net_torque"),
        csv_key("total_flow", D::Flow, units),
        csv_key("hub_pressure", D::Pressure, units),
    ]
}

/// One row's numbers in display units, in header order.
pub fn row_values(r: &TableRow, units: UnitSystem) -> Vec<f64> {
    let t = |v| to_display(D::Torque, v, units);
    vec![
        rpm(r.omega_rad_s),
        t(r.drive_n_m),
        t(r.resist.bearing_n_m),
        t(r.resist.seal_n_m),
        t(r.resist.brake_n_m),
        t(r.resist.air_n_m),
        t(r.resist.total_n_m()),
        t(r.net_n_m()),
        to_display(D::Flow, r.state.total_flow_m3_s, units),
        to_display(D::Pressure, r.state.hub_pressure_pa, units),
    ]
}

/// Run `table`.
pub fn run(
    path: &Path,
    points: usize,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let design = load_design(path)?;
    let report = solve(&design);
    let rows = torque_table(&design, &report, points);
    let units: UnitSystem = o.units.into();
    match o.format {
        Format::Json => {
            let rows: Vec<RowJson> = rows.iter().map(row_json).collect();
            serde_json::to_writer_pretty(&mut *out, &rows).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Csv => {
            let mut w = csv::Writer::from_writer(out);
            w.write_record(csv_headers(units))?;
            for r in &rows {
                w.write_record(row_values(r, units).into_iter().map(csv_number))?;
            }
            w.flush()?;
        }
        Format::Text => {
            writeln!(out, "{}: {}", design.name, headline(&report, units))?;
            for warning in &report.warnings {
                writeln!(out, "  warning: {warning}")?;
            }
            if let Some(op) = &report.operating {
                writeln!(
                    out,
                    "  operating point {:.1} rpm (net torque crosses zero there)",
                    rpm(op.omega_rad_s())
                )?;
            }
            writeln!(out)?;
            let mut t = TextTable::new(headers(units));
            for r in &rows {
                t.row(row_values(r, units).into_iter().map(format_number));
            }
            write!(out, "{}", t.render(0))?;
        }
    }
    Ok(Outcome::Done)
}

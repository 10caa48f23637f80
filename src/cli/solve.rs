//! `spinwright solve`: the operating point and everything around it.

use std::io::Write;
use std::path::Path;

use serde::Serialize;

use super::text::TextTable;
use super::{load_design, CliError, Format, Outcome, Output};
use crate::physics::balance::{rpm, solve, SpinReport, SpinStatus};
use crate::physics::checks::practice_cautions;
use crate::physics::coverage::{head_throw, HeadThrow};
use crate::physics::design::Design;
use crate::physics::hydraulics::SupplyState;
use crate::physics::pattern::PatternOptions;
use crate::physics::torque::{arm_frame, jets};
use crate::units::{format_quantity, Dimension as D, UnitSystem};

/// The JSON report of `solve`; its keys are listed in docs/format.md.
#[derive(Debug, Serialize)]
pub struct SolveJson {
    scenario: String,
    status: &'static str,
    operating_point: Option<OperatingJson>,
    equilibria: Vec<EquilibriumJson>,
    stall_torque_n_m: f64,
    breakaway_torque_n_m: f64,
    start_margin: Option<f64>,
    runaway_rpm: Option<f64>,
    inlet_pressure_pa: f64,
    hub_pressure_pa: f64,
    total_flow_m3_s: f64,
    nozzles: Vec<NozzleJson>,
    resisting_torque_n_m: Option<ResistJson>,
    power_w: Option<PowerJson>,
    spin_up_s: Option<SpinUpJson>,
    wetted_radius_m: Option<f64>,
    warnings: Vec<String>,
}

#[derive(Debug, Serialize)]
struct OperatingJson {
    omega_rad_s: f64,
    rpm: f64,
    seconds_per_turn: f64,
    tip_speed_m_s: f64,
    drive_torque_n_m: f64,
    stable: bool,
}

#[derive(Debug, Serialize)]
struct EquilibriumJson {
    rpm: f64,
    stable: bool,
}

#[derive(Debug, Serialize)]
struct NozzleJson {
    flow_m3_s: f64,
    nozzle_pressure_pa: f64,
    jet_speed_relative_m_s: f64,
    jet_velocity_absolute_m_s: [f64; 3],
    throw_m: Option<f64>,
}

#[derive(Debug, Serialize)]
struct ResistJson {
    bearing: f64,
    seal: f64,
    brake: f64,
    air: f64,
    total: f64,
}

#[derive(Debug, Serialize)]
struct PowerJson {
    shaft: f64,
    hydraulic: f64,
    jet_kinetic: f64,
}

#[derive(Debug, Serialize)]
struct SpinUpJson {
    t90: f64,
    t99: f64,
}

/// Absolute jet velocity of each arm's jet as [radial, tangential, vertical], m/s.
pub fn jet_components(design: &Design, state: &SupplyState) -> Vec<[f64; 3]> {
    jets(design, state)
        .iter()
        .zip(&design.rotor.arms)
        .map(|(jet, arm)| {
            let v = jet.velocity_m_s;
            let (radial, tangential, vertical) = arm_frame(arm.azimuth_rad);
            [v.dot(&radial), v.dot(&tangential), v.dot(&vertical)]
        })
        .collect()
}

/// Per-arm throw (largest drop) and wetted radius, m, when the throw could be computed.
pub fn throws(head: Option<&HeadThrow>, arms: usize) -> (Vec<Option<f64>>, Option<f64>) {
    match head {
        Some(h) => (
            (0..arms)
                .map(|k| {
                    h.throw
                        .nozzles
                        .get(k)
                        .and_then(|n| n.as_ref().map(|t| t.throw_largest_m))
                })
                .collect(),
            Some(h.throw.wetted_radius_m),
        ),
        None => (vec![None; arms], None),
    }
}

/// Build the JSON report.
pub fn solve_json(design: &Design, report: &SpinReport, head: Option<&HeadThrow>) -> SolveJson {
    let (nozzle_throws, wetted) = throws(head, design.rotor.arms.len());
    let state = report.described_state();
    let r_max = design.rotor.tip_radius_m();
    SolveJson {
        scenario: design.name.clone(),
        status: report.status.key(),
        operating_point: report.operating.as_ref().map(|op| {
            let w = op.omega_rad_s();
            OperatingJson {
                omega_rad_s: w,
                rpm: rpm(w),
                seconds_per_turn: 2.0 * std::f64::consts::PI / w,
                tip_speed_m_s: w * r_max,
                drive_torque_n_m: op.point.drive_n_m,
                stable: op.stable,
            }
        }),
        equilibria: report
            .equilibria
            .iter()
            .map(|e| EquilibriumJson {
                rpm: rpm(e.omega_rad_s),
                stable: e.stable,
            })
            .collect(),
        stall_torque_n_m: report.stall_torque_n_m,
        breakaway_torque_n_m: report.breakaway_torque_n_m,
        start_margin: report.start_margin,
        runaway_rpm: report.runaway_rad_s.map(rpm),
        inlet_pressure_pa: state.inlet_pressure_pa,
        hub_pressure_pa: state.hub_pressure_pa,
        total_flow_m3_s: state.total_flow_m3_s,
        nozzles: state
            .nozzles
            .iter()
            .zip(jet_components(design, state))
            .zip(nozzle_throws)
            .map(|((n, v), throw_m)| NozzleJson {
                flow_m3_s: n.flow_m3_s,
                nozzle_pressure_pa: n.nozzle_pressure_pa,
                jet_speed_relative_m_s: n.jet_speed_relative_m_s,
                jet_velocity_absolute_m_s: v,
                throw_m,
            })
            .collect(),
        resisting_torque_n_m: report.operating.as_ref().map(|op| {
            let r = op.point.resist;
            ResistJson {
                bearing: r.bearing_n_m,
                seal: r.seal_n_m,
                brake: r.brake_n_m,
                air: r.air_n_m,
                total: r.total_n_m(),
            }
        }),
        power_w: report.power.map(|p| PowerJson {
            shaft: p.shaft_w,
            hydraulic: p.hydraulic_w,
            jet_kinetic: p.jet_kinetic_w,
        }),
        spin_up_s: report.spin_up.map(|s| SpinUpJson {
            t90: s.t90_s,
            t99: s.t99_s,
        }),
        wetted_radius_m: wetted,
        warnings: report
            .warnings
            .iter()
            .map(ToString::to_string)
            .chain(
                practice_cautions(design, report, head, &PatternOptions::default().flight)
                    .iter()
                    .map(|c| crate::words::caution(c, UnitSystem::Metric)),
            )
            .collect(),
    }
}

/// One-line headline: status and speed, for text reports and the interface.
pub fn headline(report: &SpinReport, units: UnitSystem) -> String {
    let margin = report
        .start_margin
        .map_or("no breakaway torque".to_string(), |m| {
            format!("start margin {m:.2}")
        });
    match (&report.status, &report.operating) {
        (SpinStatus::Running, Some(op)) => {
            let w = op.omega_rad_s();
            format!(
                "runs at {:.1} rpm ({:.2} s per turn), {margin}",
                rpm(w),
                2.0 * std::f64::consts::PI / w
            )
        }
        (SpinStatus::StallsAtRest, _) => format!(
            "stalls at rest: stall torque {} against breakaway {} ({margin})",
            format_quantity(D::Torque, report.stall_torque_n_m, units),
            format_quantity(D::Torque, report.breakaway_torque_n_m, units)
        ),
        _ => format!(
            "no equilibrium below {:.0} rpm: it keeps accelerating ({margin})",
            rpm(report.omega_cap_rad_s)
        ),
    }
}

/// The text report.
pub fn solve_text(
    design: &Design,
    report: &SpinReport,
    head: Option<&HeadThrow>,
    units: UnitSystem,
) -> String {
    let (nozzle_throws, wetted) = throws(head, design.rotor.arms.len());
    let q = |dim, v| format_quantity(dim, v, units);
    let mut s = String::new();
    s.push_str(&format!("{}: {}\n", design.name, headline(report, units)));
    for w in &report.warnings {
        s.push_str(&format!("  warning: {w}\n"));
    }
    for c in practice_cautions(design, report, head, &PatternOptions::default().flight) {
        s.push_str(&format!(
            "  warning: {}\n",
            crate::words::caution(&c, units)
        ));
    }
    s.push('\n');
    if let Some(op) = &report.operating {
        let r = op.point.resist;
        let r_max = design.rotor.tip_radius_m();
        s.push_str("Operating point\n");
        s.push_str(&format!(
            "  speed              {:.1} rpm   tip speed {}\n",
            rpm(op.omega_rad_s()),
            q(D::Speed, op.omega_rad_s() * r_max)
        ));
        s.push_str(&format!(
            "  drive torque       {}\n",
            q(D::Torque, op.point.drive_n_m)
        ));
        s.push_str(&format!(
            "  resisting torque   {} = bearing {} + seal {} + brake {} + air {}\n",
            q(D::Torque, r.total_n_m()),
            q(D::Torque, r.bearing_n_m),
            q(D::Torque, r.seal_n_m),
            q(D::Torque, r.brake_n_m),
            q(D::Torque, r.air_n_m)
        ));
        if let Some(sp) = report.spin_up {
            s.push_str(&format!(
                "  spin-up from rest  90 % in {:.2} s, 99 % in {:.2} s (inertia {})\n",
                sp.t90_s,
                sp.t99_s,
                q(D::Inertia, report.inertia_kg_m2)
            ));
        }
    }
    s.push_str("Start\n");
    s.push_str(&format!(
        "  stall torque       {}   breakaway torque {}   margin {}\n",
        q(D::Torque, report.stall_torque_n_m),
        q(D::Torque, report.breakaway_torque_n_m),
        report
            .start_margin
            .map_or("—".into(), |m| format!("{m:.2}"))
    ));
    s.push_str(&format!(
        "  frictionless runaway {}\n",
        report
            .runaway_rad_s
            .map_or("none (jets stay ahead of the arm)".into(), |w| format!(
                "{:.0} rpm",
                rpm(w)
            ))
    ));
    if !report.equilibria.is_empty() {
        let list: Vec<String> = report
            .equilibria
            .iter()
            .map(|e| {
                format!(
                    "{:.1} rpm ({})",
                    rpm(e.omega_rad_s),
                    if e.stable { "stable" } else { "unstable" }
                )
            })
            .collect();
        s.push_str(&format!("  equilibria         {}\n", list.join(", ")));
    }
    let state = report.described_state();
    s.push_str(if report.operating.is_some() {
        "Water at speed\n"
    } else {
        "Water at rest\n"
    });
    s.push_str(&format!(
        "  inlet {}   hub {}   total flow {}",
        q(D::Pressure, state.inlet_pressure_pa),
        q(D::Pressure, state.hub_pressure_pa),
        q(D::Flow, state.total_flow_m3_s)
    ));
    if state.line_loss_pa > 0.0 {
        s.push_str(&format!(
            "   hose loss {}",
            q(D::Pressure, state.line_loss_pa)
        ));
    }
    s.push('\n');
    let speed = crate::units::unit_label(D::Speed, units);
    let mut t = TextTable::new(vec![
        "arm".to_string(),
        format!("flow {}", crate::units::unit_label(D::Flow, units)),
        format!("Δp nozzle {}", crate::units::unit_label(D::Pressure, units)),
        format!("jet rel {speed}"),
        format!("V radial {speed}"),
        format!("V tangential {speed}"),
        format!("V vertical {speed}"),
        format!("throw {}", crate::units::unit_label(D::Length, units)),
    ]);
    let show = |dim, v| crate::units::format_number(crate::units::to_display(dim, v, units));
    for (k, ((n, v), throw)) in state
        .nozzles
        .iter()
        .zip(jet_components(design, state))
        .zip(&nozzle_throws)
        .enumerate()
    {
        if n.flowing {
            t.row([
                format!("{}", k + 1),
                show(D::Flow, n.flow_m3_s),
                show(D::Pressure, n.nozzle_pressure_pa),
                show(D::Speed, n.jet_speed_relative_m_s),
                show(D::Speed, v[0]),
                show(D::Speed, v[1]),
                show(D::Speed, v[2]),
                throw.map_or("—".into(), |t| show(D::Length, t)),
            ]);
        } else {
            t.row([format!("{}", k + 1), "not flowing".to_string()]);
        }
    }
    s.push_str(&t.render(2));
    if let Some(w) = wetted {
        s.push_str(&format!(
            "  wetted radius {} (still air, to the testing standards' wetted edge)\n",
            q(D::Length, w)
        ));
    }
    if let Some(p) = report.power {
        let pct = |x: f64| {
            if p.hydraulic_w > 0.0 {
                100.0 * x / p.hydraulic_w
            } else {
                0.0
            }
        };
        s.push_str("Power\n");
        s.push_str(&format!(
            "  hydraulic in {:.3} W   shaft {:.3} W ({:.1} %, all of it friction heat)   jet kinetic {:.3} W ({:.1} %)\n",
            p.hydraulic_w,
            p.shaft_w,
            pct(p.shaft_w),
            p.jet_kinetic_w,
            pct(p.jet_kinetic_w)
        ));
    }
    s
}

/// Solve a design and work out its throw (None when the head throws no water).
pub fn solve_with_throw(design: &Design) -> (SpinReport, Option<HeadThrow>) {
    let report = solve(design);
    let head = head_throw(design, &report, &PatternOptions::default(), None).ok();
    (report, head)
}

/// Run `solve`.
pub fn run(
    path: &Path,
    o: Output,
    strict: bool,
    clearance_m: Option<f64>,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let mut design = load_design(path)?;
    if clearance_m.is_some() {
        design.site.clearance_m = clearance_m;
    }
    let (report, head) = solve_with_throw(&design);
    let head = head.as_ref();
    match o.format {
        Format::Json => {
            serde_json::to_writer_pretty(&mut *out, &solve_json(&design, &report, head))
                .map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Text => write!(
            out,
            "{}",
            solve_text(&design, &report, head, o.units.into())
        )?,
        Format::Csv => {
            let json = solve_json(&design, &report, head);
            let mut w = csv::Writer::from_writer(out);
            w.write_record(["quantity", "value", "unit"])?;
            let units: UnitSystem = o.units.into();
            let mut put = |name: &str, dim: D, v: Option<f64>| -> Result<(), csv::Error> {
                let shown = v.map(|x| crate::units::to_display(dim, x, units));
                w.write_record([
                    name.to_string(),
                    shown.map_or(String::new(), super::text::csv_number),
                    crate::units::unit_label(dim, units).to_string(),
                ])
            };
            put(
                "speed",
                D::AngularSpeed,
                report.operating.as_ref().map(|op| op.omega_rad_s()),
            )?;
            put("stall torque", D::Torque, Some(json.stall_torque_n_m))?;
            put(
                "breakaway torque",
                D::Torque,
                Some(json.breakaway_torque_n_m),
            )?;
            put("inlet pressure", D::Pressure, Some(json.inlet_pressure_pa))?;
            put("hub pressure", D::Pressure, Some(json.hub_pressure_pa))?;
            put("total flow", D::Flow, Some(json.total_flow_m3_s))?;
            put("runaway", D::AngularSpeed, report.runaway_rad_s)?;
            put("wetted radius", D::Length, json.wetted_radius_m)?;
            w.write_record([
                "start margin".to_string(),
                json.start_margin
                    .map_or(String::new(), super::text::csv_number),
                String::new(),
            ])?;
            w.write_record(["status", json.status, ""])?;
            w.flush()?;
        }
    }
    Ok(if strict && report.status != SpinStatus::Running {
        Outcome::DesignProblem
    } else {
        Outcome::Done
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numeric::root::RootError;
    use crate::physics::balance::Warning;
    use crate::physics::fixtures::three_arm_rotor;

    #[test]
    fn a_failed_root_search_reaches_the_report_with_its_bracket() {
        let design = three_arm_rotor();
        let mut report = solve(&design);
        report.warnings.push(Warning::RootSearch(RootError {
            lo: 2.0 * std::f64::consts::PI, // 60 rpm
            hi: 4.0 * std::f64::consts::PI, // 120 rpm
            reason: "no convergence within the iteration limit",
        }));
        let text = solve_text(&design, &report, None, UnitSystem::Metric);
        assert!(
            text.contains("between 60.0000 and 120.0000 rpm (6.283185e0 to 1.256637e1 rad/s) failed: no convergence"),
            "{text}"
        );
        let json = serde_json::to_string(&solve_json(&design, &report, None)).unwrap();
        assert!(json.contains("between 60.0000 and 120.0000 rpm"), "{json}");
    }
}

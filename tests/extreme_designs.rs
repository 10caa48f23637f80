//! Designs at the edges of what the tool accepts: each must come out in a
//! defined state (a status, numbers without NaN or infinity, physical states
//! said in words), through `balance::solve`, `coverage::head_throw` and the
//! `solve` command's text report.

use std::f64::consts::PI;

use clap::Parser;
use spinwright::cli::{self, Cli};
use spinwright::physics::balance::{rpm, solve, SpinReport, SpinStatus, Warning};
use spinwright::physics::coverage::head_throw;
use spinwright::physics::design::{Bearing, Brake, Design, Seal, Supply, Tube};
use spinwright::physics::fixtures::{symmetric_rotor, three_arm_rotor};
use spinwright::physics::pattern::PatternOptions;
use spinwright::scenario::Scenario;
use spinwright::units::UnitSystem;

use crate::fuzz::non_finite_word;

const DEG: f64 = PI / 180.0;

fn with_nozzle(mut d: Design, diameter_m: f64) -> Design {
    for a in &mut d.rotor.arms {
        a.nozzle.diameter_m = diameter_m;
        if a.tube.bore_m < diameter_m {
            a.tube = Tube {
                bore_m: 1.2 * diameter_m,
                outer_m: 1.5 * diameter_m,
                ..a.tube
            };
        }
    }
    d
}

fn with_deflections(mut d: Design, deg: &[f64]) -> Design {
    for (a, &delta) in d.rotor.arms.iter_mut().zip(deg.iter().cycle()) {
        a.nozzle.deflection_rad = delta * DEG;
    }
    d
}

fn with_arms(count: usize) -> Design {
    let mut d = three_arm_rotor();
    let template = d.rotor.arms[0];
    d.rotor.arms = (0..count)
        .map(|k| {
            let mut a = template;
            a.azimuth_rad = 2.0 * PI * k as f64 / count as f64;
            a
        })
        .collect();
    d
}

fn frictionless(mut d: Design) -> Design {
    d.friction.bearing = Bearing::Measured {
        running_n_m: 0.0,
        breakaway_n_m: 0.0,
    };
    d.friction.seal = Seal::default();
    d.friction.brake = Brake::default();
    d.friction.arm_drag_cd = 0.0;
    d
}

struct Row {
    name: &'static str,
    design: Design,
    status: SpinStatus,
}

fn table() -> Vec<Row> {
    let base = three_arm_rotor;
    let row = |name, design, status| Row {
        name,
        design,
        status,
    };
    let mut d2m = base();
    for a in &mut d2m.rotor.arms {
        a.radius_m = 2.0;
    }
    let mut huge_viscous = base();
    huge_viscous.friction.brake.viscous = 1e3;
    let mut huge_quadratic = base();
    huge_quadratic.friction.brake.quadratic = 1e4;
    let with_supply = |s: Supply| {
        let mut d = base();
        d.supply = s;
        d
    };
    vec![
        row(
            "0.5 mm nozzles",
            with_nozzle(base(), 0.5e-3),
            SpinStatus::Running,
        ),
        row(
            "10 mm nozzles",
            with_nozzle(base(), 10e-3),
            SpinStatus::Running,
        ),
        row("2 m arms", d2m, SpinStatus::Running),
        row(
            "10 kPa supply",
            with_supply(Supply::Pressure { inlet_pa: 10e3 }),
            SpinStatus::Running,
        ),
        row(
            "1 MPa supply",
            with_supply(Supply::Pressure { inlet_pa: 1e6 }),
            SpinStatus::Running,
        ),
        row("one arm", with_arms(1), SpinStatus::Running),
        row("twelve arms", with_arms(12), SpinStatus::Running),
        row(
            "every nozzle radial (δ = 90°)",
            with_deflections(base(), &[90.0]),
            SpinStatus::StallsAtRest,
        ),
        row(
            "every nozzle radial, zero friction",
            frictionless(with_deflections(base(), &[90.0])),
            SpinStatus::StallsAtRest,
        ),
        row(
            "braking nozzles only (δ = 135°)",
            with_deflections(base(), &[135.0]),
            SpinStatus::StallsAtRest,
        ),
        row(
            "braking nozzles only, δ = 180°",
            with_deflections(base(), &[180.0]),
            SpinStatus::StallsAtRest,
        ),
        row(
            "mixed: two forward, one braking",
            with_deflections(base(), &[15.0, 15.0, 150.0]),
            SpinStatus::Running,
        ),
        row(
            "mixed: one forward, two braking",
            with_deflections(base(), &[15.0, 150.0, 150.0]),
            SpinStatus::StallsAtRest,
        ),
        row(
            "zero friction, fixed pressure",
            frictionless(base()),
            SpinStatus::Running,
        ),
        row(
            "zero friction, fixed flow",
            frictionless(with_supply(Supply::Flow { total_m3_s: 3e-4 })),
            SpinStatus::Running,
        ),
        row(
            "huge viscous brake (1000 N·m·s/rad)",
            huge_viscous,
            SpinStatus::Running,
        ),
        row(
            "huge quadratic brake (1e4 N·m·s²/rad²)",
            huge_quadratic,
            SpinStatus::Running,
        ),
    ]
}

fn solve_text(design: &Design) -> String {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("extreme.ron");
    let text = Scenario::from_design(design, UnitSystem::Metric, "").to_ron_string();
    std::fs::write(&path, text).expect("write scenario");
    let file = path.to_string_lossy().into_owned();
    let parsed = Cli::try_parse_from(["spinwright", "solve", file.as_str()]).expect("arguments");
    let mut out = Vec::new();
    cli::run(parsed.command.expect("a command"), &mut out).expect("solve runs");
    String::from_utf8(out).expect("UTF-8 report")
}

fn no_drive_at_rest(report: &SpinReport) -> bool {
    report.warnings.contains(&Warning::NoDriveAtRest)
}

#[test]
fn extreme_designs_give_defined_states() {
    let mut failures = Vec::new();
    for row in table() {
        let report = solve(&row.design);
        let debug = format!("{report:?}");
        if let Some(bad) = non_finite_word(&debug) {
            failures.push(format!("{}: solve: {bad}", row.name));
        }
        if report.status != row.status {
            failures.push(format!(
                "{}: status {:?}, expected {:?}; warnings: {:?}",
                row.name, report.status, row.status, report.warnings
            ));
        }
        let text = solve_text(&row.design);
        if let Some(bad) = non_finite_word(&text.replace(&row.design.name, "")) {
            failures.push(format!("{}: solve text: {bad}", row.name));
        }
        match report.status {
            SpinStatus::StallsAtRest if !text.contains("stalls") => failures.push(format!(
                "{}: stalls, but the text does not say so:\n{text}",
                row.name
            )),
            SpinStatus::NoEquilibrium if !text.contains("no equilibrium") => {
                failures.push(format!(
                    "{}: no equilibrium, but the text does not say so:\n{text}",
                    row.name
                ))
            }
            _ => {}
        }
        // Every row's throw is computed: a stalled head still sprays (its jets
        // at rest), and none of these jets fails to land.
        match head_throw(&row.design, &report, &PatternOptions::default(), None) {
            Ok(head) => {
                if let Some(bad) = non_finite_word(&format!("{head:?}")) {
                    failures.push(format!("{}: throw: {bad}", row.name));
                }
                if head.throw.wetted_radius_m.is_nan() || head.throw.wetted_radius_m <= 0.0 {
                    failures.push(format!(
                        "{}: wetted radius {} m",
                        row.name, head.throw.wetted_radius_m
                    ));
                }
            }
            Err(e) => failures.push(format!("{}: throw failed: {e}", row.name)),
        }
        eprintln!(
            "{:<40} {:<15} {:>9} rpm  start margin {:>8}  wetted radius {}",
            row.name,
            report.status.key(),
            report
                .operating
                .as_ref()
                .map_or("-".to_string(), |op| format!(
                    "{:.3}",
                    rpm(op.omega_rad_s())
                )),
            report
                .start_margin
                .map_or("-".to_string(), |m| format!("{m:.3}")),
            head_throw(&row.design, &report, &PatternOptions::default(), None).map_or_else(
                |e| format!("error: {e}"),
                |h| format!("{:.2} m", h.throw.wetted_radius_m)
            ),
        );
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn radial_and_braking_nozzles_give_no_drive_at_rest() {
    // δ = 90° puts the jet's horizontal part along the arm: moment of
    // momentum r × V has no z part at rest (model.md M1, M2). δ > 90° faces
    // forward: the torque at rest is negative.
    for deg in [90.0, 120.0, 180.0] {
        let report = solve(&with_deflections(three_arm_rotor(), &[deg]));
        assert_eq!(report.status, SpinStatus::StallsAtRest, "δ = {deg}°");
        assert!(
            no_drive_at_rest(&report),
            "δ = {deg}°: {:?}",
            report.warnings
        );
        assert!(
            report.stall_torque_n_m <= 1e-12,
            "δ = {deg}°: {}",
            report.stall_torque_n_m
        );
        assert!(report.operating.is_none());
    }
}

#[test]
fn frictionless_fixed_flow_runs_at_the_closed_form_runaway() {
    // model.md M4: at fixed flow each jet's speed is W = (C_v/C_d)·Q_i/A_i
    // whatever the speed, and the frictionless runaway is exactly
    // ω = W cos α cos δ / R (textbook reaction-turbine result, e.g. the
    // Barker's mill relations in references.md).
    let q = 3e-4;
    let mut d = symmetric_rotor(
        2,
        0.2,
        3e-3,
        20.0 * DEG,
        10.0 * DEG,
        Supply::Flow { total_m3_s: q },
    );
    d = frictionless(d);
    let report = solve(&d);
    assert_eq!(report.status, SpinStatus::Running, "{:?}", report.warnings);
    let a = PI / 4.0 * 3e-3_f64.powi(2);
    let w = (q / 2.0) / a; // cd = cv = 1 in the fixture
    let expect = w * (20.0 * DEG).cos() * (10.0 * DEG).cos() / 0.2;
    let got = report
        .operating
        .as_ref()
        .expect("operating point")
        .omega_rad_s();
    assert!((got / expect - 1.0).abs() < 1e-6, "{got} vs {expect} rad/s");
}

#[test]
fn a_huge_brake_turns_slowly_at_drive_over_brake() {
    // With a viscous brake c far above the drive's own slope, ω ≈ (T_stall −
    // T_running friction)/c: linear friction closed form (references.md).
    let mut d = three_arm_rotor();
    d.friction.brake.viscous = 1e3;
    let report = solve(&d);
    let op = report.operating.as_ref().expect("runs");
    let r = op.point.resist;
    // The drive at this crawl is the stall torque at rest to well within 0.1 %.
    let expect = (report.stall_torque_n_m - r.bearing_n_m - r.seal_n_m) / 1e3;
    assert!(
        (op.omega_rad_s() / expect - 1.0).abs() < 1e-3,
        "{} vs {expect} rad/s",
        op.omega_rad_s()
    );
    assert!(op.omega_rad_s() < 1e-3, "{} rad/s", op.omega_rad_s());
    let spin_up = report.spin_up.expect("spin-up times");
    assert!(spin_up.t90_s.is_finite() && spin_up.t99_s > spin_up.t90_s);
}

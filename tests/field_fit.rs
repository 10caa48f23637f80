//! The technician's check (model.md M10) and the fits to readings (M12):
//! findings that agree with their numbers over random designs, several
//! readings fitted back, a coast-down against its closed-form solution.

use proptest::prelude::*;
use spinwright::inverse::field::{
    check, Alone, CauseEvidence, Detail, Direction, FieldReading, FieldTolerances, FlowReading,
    RotationReading,
};
use spinwright::physics::balance::{rpm, solve};
use spinwright::report::field::{check_text, finding_text};
use spinwright::units::UnitSystem;

use crate::engine_properties::design;

/// A minus sign written before a digit (a negative number printed).
fn negative_number(text: &str) -> Option<String> {
    let chars: Vec<char> = text.chars().collect();
    chars.windows(2).enumerate().find_map(|(i, w)| {
        let exponent = i > 0 && chars[i - 1] == 'e';
        ((w[0] == '-' || w[0] == '−') && w[1].is_ascii_digit() && !exponent).then(|| {
            let from = i.saturating_sub(40);
            chars[from..(i + 20).min(chars.len())].iter().collect()
        })
    })
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 40, ..ProptestConfig::default() })]

    #[test]
    fn the_first_finding_goes_the_way_the_numbers_do(
        d in design(),
        p_factor in 0.6f64..1.5,
        speed_factor in 0.2f64..3.0,
        how in 0usize..3,
        flow_factor in prop::option::of(0.4f64..1.6),
    ) {
        let report = solve(&d);
        let base_rpm = report.operating.as_ref().map_or(20.0, |op| rpm(op.omega_rad_s()));
        let p_design = report.operating.as_ref().map_or(report.at_rest.inlet_pressure_pa, |op| op.point.state.inlet_pressure_pa);
        let p = (p_design * p_factor).max(20e3);
        let r = (base_rpm * speed_factor).clamp(0.5, 3000.0);
        let rotation = match how {
            0 => RotationReading::rpm(r),
            1 => RotationReading::SecondsPerTurn { seconds: 60.0 / r, stopwatch_resolution_s: 0.0 },
            _ => RotationReading::TurnsOver { turns: 10.0, seconds: 600.0 / r, stopwatch_resolution_s: 0.0, count_resolution_turns: 0.0 },
        };
        let mut reading = FieldReading::new(p, rotation);
        if let (Some(f), Some(op)) = (flow_factor, report.operating.as_ref()) {
            reading.flow = Some(FlowReading::rate(f * op.point.state.total_flow_m3_s));
        }
        let c = check(&d, &reading, &FieldTolerances::default(), None).unwrap();
        let first = &c.findings[0];
        // The first finding's direction is the sign of measured − design.
        let want = match c.design_rpm {
            Some(e) => Direction::of(c.measured_rpm, e),
            None => Direction::Faster,
        };
        prop_assert_eq!(first.direction(), Some(want), "{:?}", first);
        for u in [UnitSystem::Metric, UnitSystem::Us] {
            let words = finding_text(first, u);
            match (want, &first.detail) {
                (Direction::Slower, Detail::Speed { .. }) => prop_assert!(words.starts_with("spins") && words.contains("slower"), "{}", words),
                (Direction::Faster, Detail::Speed { .. }) => prop_assert!(words.starts_with("spins") && words.contains("faster"), "{}", words),
                _ => {}
            }
            // No negative friction, factor or any other negative number is printed.
            let text = check_text(&d.name, &c, u);
            prop_assert!(negative_number(&text).is_none(), "{:?} in\n{}", negative_number(&text), text);
            prop_assert!(!text.contains("NaN") && !text.contains("inf"), "{}", text);
        }
        for cause in &c.causes {
            if let CauseEvidence::Part { design_n_m, share, alone, .. } = cause.evidence {
                prop_assert!(design_n_m >= 0.0 && (0.0..=1.0).contains(&share));
                match alone {
                    Alone::Factor { factor, needed_n_m } => prop_assert!(factor >= 0.0 && needed_n_m >= 0.0),
                    Alone::Added { needed_n_m } => prop_assert!(needed_n_m > 0.0),
                    Alone::NegativeFriction | Alone::Absent => {}
                }
            }
        }
    }
}

// ---------------------------------------------------------------------------
// Several readings, one fit (M12).

use spinwright::inverse::fit::{fit, predict, FitParam, SpeedReading};
use spinwright::physics::design::{Bearing, Design, Supply};
use spinwright::physics::fixtures::three_arm_rotor;

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

/// The truth: the three-arm rotor with a measured bearing (0.25 N·m
/// running) and a viscous-and-quadratic brake, each a good share of the
/// resisting torque.
fn truth() -> Design {
    let mut d = three_arm_rotor();
    d.friction.bearing = Bearing::Measured {
        running_n_m: 0.25,
        breakaway_n_m: 0.35,
    };
    d.friction.brake.viscous = 0.02;
    d.friction.brake.quadratic = 0.0014;
    d
}

fn speed_at(d: &Design, p: f64) -> f64 {
    let mut at = d.clone();
    at.supply = Supply::Pressure { inlet_pa: p };
    rpm(solve(&at).operating.expect("runs").omega_rad_s())
}

/// The design as it was believed to be: every friction value off.
fn believed() -> Design {
    let mut d = truth();
    d.friction.bearing = Bearing::Measured {
        running_n_m: 0.12,
        breakaway_n_m: 0.35,
    };
    d.friction.brake.viscous = 0.035;
    d.friction.brake.quadratic = 0.0007;
    d
}

#[test]
fn readings_made_by_the_model_are_fitted_back() {
    // Four pressures, the model's own speeds: the fit recovers the running
    // friction and both brake coefficients within 3 %, from a design whose
    // friction values were all wrong.
    let t = truth();
    let readings: Vec<SpeedReading> = [150e3, 220e3, 300e3, 400e3]
        .iter()
        .map(|&p| SpeedReading {
            inlet_pressure_pa: p,
            rpm: speed_at(&t, p),
            flow_m3_s: None,
            time: None,
        })
        .collect();
    let r = fit(&believed(), &readings, None).unwrap();
    assert_eq!(r.params, FitParam::ALL.to_vec());
    assert!(rel(r.running_friction_n_m, 0.25) < 0.03, "{r:#?}");
    assert!(rel(r.viscous.value, 0.02) < 0.03, "{r:#?}");
    assert!(rel(r.quadratic.value, 0.0014) < 0.03, "{r:#?}");
    assert!(r.rms_residual_rpm < 1e-3, "{}", r.rms_residual_rpm);
    // The fitted model predicts the speed at a fifth pressure.
    let p = predict(&r, 260e3);
    assert!(rel(p.rpm.unwrap(), speed_at(&t, 260e3)) < 1e-3);
}

/// A small seeded generator (64-bit LCG, Knuth's MMIX constants).
struct Lcg(u64);
impl Lcg {
    fn uniform(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

#[test]
fn stopwatch_noise_is_covered_by_the_reported_uncertainty() {
    // Readings as the turns counted over about 30 s, each time off by up to
    // ±0.2 s (uniform; a hand stopwatch, common practice), at eight pressures. Over ten seeded trials the 95 % interval
    // of each parameter holds the truth in at least eight (binomial, p = 0.95:
    // fewer than eight happens about 1 time in 100).
    let t = truth();
    let pressures = [120e3, 160e3, 200e3, 240e3, 280e3, 330e3, 380e3, 440e3];
    let true_rpm: Vec<f64> = pressures.iter().map(|&p| speed_at(&t, p)).collect();
    let mut rng = Lcg(20_261_202);
    let mut covered = [0usize; 3];
    let trials = 10;
    for _ in 0..trials {
        let readings: Vec<SpeedReading> = pressures
            .iter()
            .zip(&true_rpm)
            .map(|(&p, &n)| {
                let turns = (n / 2.0).round().max(1.0);
                let seconds = 60.0 * turns / n + 0.4 * (rng.uniform() - 0.5);
                SpeedReading {
                    inlet_pressure_pa: p,
                    rpm: 60.0 * turns / seconds,
                    flow_m3_s: None,
                    time: None,
                }
            })
            .collect();
        let r = fit(&believed(), &readings, None).unwrap();
        for (k, (fitted, truth)) in [(r.running, 0.25), (r.viscous, 0.02), (r.quadratic, 0.0014)]
            .iter()
            .enumerate()
        {
            if fitted
                .ci95
                .is_some_and(|half| (fitted.value - truth).abs() <= half)
            {
                covered[k] += 1;
            }
        }
    }
    assert!(covered.iter().all(|&c| c >= 8), "{covered:?} of {trials}");
}

// ---------------------------------------------------------------------------
// Coast-down (M12) against the closed-form solution of
// I dω/dt = −(T_c + c₁ω): ω(t) = (ω₀ + a)e^{−t/τ} − a, θ(t) = (ω₀ + a)τ(1 − e^{−t/τ}) − a t,
// a = T_c/c₁, τ = I/c₁, t_stop = τ ln(1 + ω₀/a) (first-order linear ODE, any
// dynamics text).

use spinwright::inverse::coast::{fit_coast, CoastData, InertiaSource};
use spinwright::physics::design::Inertia;

const I: f64 = 0.02;
const TC: f64 = 0.02;
const C1: f64 = 0.002;
const W0: f64 = 30.0;

fn coast_design() -> Design {
    let mut d = three_arm_rotor();
    d.rotor.inertia = Inertia::Given { kg_m2: I };
    d.friction.arm_drag_cd = 0.0;
    d.friction.brake.quadratic = 0.0;
    d
}

fn theta(t: f64) -> f64 {
    let (a, tau) = (TC / C1, I / C1);
    (W0 + a) * tau * (1.0 - (-t / tau).exp()) - a * t
}

fn omega(t: f64) -> f64 {
    let (a, tau) = (TC / C1, I / C1);
    ((W0 + a) * (-t / tau).exp() - a).max(0.0)
}

fn t_stop() -> f64 {
    (I / C1) * (1.0 + W0 * C1 / TC).ln()
}

fn turn_times() -> Vec<f64> {
    let stop = t_stop();
    let mut out = Vec::new();
    for k in 1.. {
        let target = std::f64::consts::TAU * k as f64;
        if theta(stop) < target {
            break;
        }
        let (mut lo, mut hi) = (0.0, stop);
        for _ in 0..100 {
            let mid = 0.5 * (lo + hi);
            if theta(mid) < target {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        out.push(0.5 * (lo + hi));
    }
    out
}

#[test]
fn a_coast_down_is_fitted_back() {
    // I = 0.02 kg·m², T_c = 0.02 N·m, c₁ = 0.002 N·m·s/rad, ω₀ = 30 rad/s:
    // τ = 10 s, a = 10 rad/s, t_stop = 10 ln 4 = 13.86 s, 25 whole turns.
    let times = turn_times();
    assert_eq!(times.len(), 25);
    let r = fit_coast(&coast_design(), &CoastData::TurnTimes(times), None).unwrap();
    assert_eq!(r.inertia_source, InertiaSource::Given);
    assert!(rel(r.running_friction_n_m.value, TC) < 0.05, "{r:#?}");
    assert!(rel(r.viscous_n_m_s.value, C1) < 0.05, "{r:#?}");
    assert!(rel(r.stop_time_s.unwrap(), t_stop()) < 0.05, "{r:#?}");
    assert!(rel(r.omega0_rad_s.value, W0) < 0.01);
    // The same from timed speed readings (time_s, rpm), every second.
    let speeds: Vec<(f64, f64)> = (1..13).map(|t| (t as f64, rpm(omega(t as f64)))).collect();
    let r = fit_coast(&coast_design(), &CoastData::Speeds(speeds), None).unwrap();
    assert!(rel(r.running_friction_n_m.value, TC) < 0.05, "{r:#?}");
    assert!(rel(r.viscous_n_m_s.value, C1) < 0.05, "{r:#?}");
}

#[test]
fn a_coast_down_with_an_estimated_inertia_says_so() {
    // The three-arm rotor's inertia is estimated from its arms (drained).
    let d = three_arm_rotor();
    let r = fit_coast(&d, &CoastData::TurnTimes(turn_times()), None).unwrap();
    assert_eq!(r.inertia_source, InertiaSource::Estimated);
    let e = fit_coast(&d, &CoastData::TurnTimes(vec![1.0, 0.5, 2.0, 3.0]), None).unwrap_err();
    assert!(e.to_string().contains("point 2"), "{e}");
}

// ---------------------------------------------------------------------------
// The commands.

use assert_cmd::Command;
use predicates::prelude::*;

fn spinwright() -> Command {
    Command::cargo_bin("spinwright").unwrap()
}

fn shipped(name: &str) -> String {
    crate::support::root()
        .join("scenarios")
        .join(name)
        .display()
        .to_string()
}

#[test]
fn fit_reports_in_metric_and_us_units_and_writes_the_fitted_scenario() {
    let lawn = shipped("lawn-rotor.ron");
    let readings = shipped("lawn-rotor-readings.csv");
    spinwright()
        .args([
            "fit",
            &lawn,
            "--readings",
            &readings,
            "--at-pressure",
            "2.8bar",
        ])
        .assert()
        .success()
        .stdout(predicate::str::contains("kPa"))
        .stdout(predicate::str::contains("N·m·s/rad"))
        .stdout(predicate::str::contains("L/min"))
        .stdout(predicate::str::contains("at 280 kPa:"));
    spinwright()
        .args([
            "fit",
            &lawn,
            "--readings",
            &readings,
            "--units",
            "us",
            "--at-pressure",
            "40psi",
        ])
        .assert()
        .success()
        .stdout(predicate::str::contains("psi"))
        .stdout(predicate::str::contains("lbf·in"))
        .stdout(predicate::str::contains("gpm"))
        .stdout(predicate::str::contains("kPa").not())
        .stdout(predicate::str::contains("N·m").not());
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("fitted.ron");
    let o = spinwright()
        .args([
            "fit",
            &lawn,
            "--readings",
            &readings,
            "--format",
            "json",
            "--out",
        ])
        .arg(&out)
        .output()
        .unwrap();
    assert!(o.status.success());
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    for k in [
        "running_friction_n_m",
        "viscous_n_m_s",
        "quadratic_n_m_s2",
        "rms_residual_rpm",
    ] {
        assert!(j[k].as_f64().is_some_and(|v| v >= 0.0), "{k}: {j}");
    }
    assert_eq!(j["residuals"].as_array().unwrap().len(), 4);
    // The fitted scenario loads and runs at the fitted brake.
    let solved: serde_json::Value = serde_json::from_slice(
        &spinwright()
            .args(["solve", out.to_str().unwrap(), "--format", "json"])
            .output()
            .unwrap()
            .stdout,
    )
    .unwrap();
    assert!(solved["operating_point"]["rpm"].as_f64().unwrap() > 0.0);
}

#[test]
fn fit_refuses_a_bad_readings_file_with_its_line_and_column() {
    let dir = tempfile::tempdir().unwrap();
    let bad = dir.path().join("bad.csv");
    std::fs::write(&bad, "pressure_psi,rpm\n40,30\n45,fast\n").unwrap();
    spinwright()
        .args(["fit", &shipped("lawn-rotor.ron"), "--readings"])
        .arg(&bad)
        .assert()
        .code(2)
        .stderr(predicate::str::contains("bad.csv:3:2"));
    spinwright()
        .args([
            "fit",
            &shipped("lawn-rotor.ron"),
            "--readings",
            &shipped("lawn-rotor-readings.csv"),
            "--fit",
            "brake",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("running, viscous, quadratic"));
}

#[test]
fn coast_reports_friction_brake_stop_time_and_its_assumptions() {
    let times = turn_times()
        .iter()
        .map(|t| format!("{t:.2}"))
        .collect::<Vec<_>>()
        .join(",");
    let o = spinwright()
        .args([
            "coast",
            &shipped("lawn-rotor.ron"),
            "--turn-times",
            &times,
            "--format",
            "json",
        ])
        .output()
        .unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    for k in [
        "running_friction_n_m",
        "viscous_n_m_s",
        "stop_time_s",
        "inertia_kg_m2",
    ] {
        assert!(j[k].as_f64().is_some_and(|v| v >= 0.0), "{k}: {j}");
    }
    assert!(j["inertia"].as_str().is_some());
    spinwright()
        .args([
            "coast",
            &shipped("lawn-rotor.ron"),
            "--turn-times",
            &times,
            "--units",
            "us",
        ])
        .assert()
        .success()
        .stdout(predicate::str::contains("Assumptions"))
        .stdout(predicate::str::contains("lbf·in"))
        .stdout(predicate::str::contains("no water torque"));
    spinwright()
        .args([
            "coast",
            &shipped("lawn-rotor.ron"),
            "--turn-times",
            "1,2,x,4",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("item 3"));
}

#[test]
fn log_rows_append_with_a_date_and_units_and_read_back_by_fit() {
    let lawn = shipped("lawn-rotor.ron");
    let dir = tempfile::tempdir().unwrap();
    let log = dir.path().join("unit.csv");
    let log_s = log.to_str().unwrap();
    // The first visit finds the unit as designed; by the second it runs 5 % slower.
    let design = spinwright::scenario::load_file(std::path::Path::new(&lawn))
        .unwrap()
        .to_design()
        .unwrap();
    let psi = 6_894.757;
    let n40 = speed_at(&design, 40.0 * psi);
    let n30 = speed_at(&design, 30.0 * psi);
    let visits = [
        ("2026-05-10T09:30", "40psi", n40),
        ("2026-05-10T09:40", "30psi", n30),
        ("2026-08-02T10:00", "40psi", 0.95 * n40),
        ("2026-08-02T10:10", "30psi", 0.95 * n30),
    ];
    for (at, p, rpm) in visits {
        let rpm = format!("{rpm:.3}");
        spinwright()
            .args([
                "check",
                &lawn,
                "--pressure",
                p,
                "--rpm",
                &rpm,
                "--units",
                "us",
                "--log",
                log_s,
                "--at",
                at,
            ])
            .assert()
            .success();
    }
    let text = std::fs::read_to_string(&log).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(lines.len(), 5, "{text}");
    assert!(
        lines[0].starts_with("time,pressure_psi,rpm,flow_gpm,"),
        "{text}"
    );
    assert!(lines[0].contains("running_friction_lbf_in"));
    assert!(
        lines[1].starts_with(&format!("2026-05-10T09:30,40.0,{n40:.2},")),
        "{text}"
    );
    // A metric run appends in the log's own units.
    spinwright()
        .args([
            "check",
            &lawn,
            "--pressure",
            "2bar",
            "--rpm",
            "16",
            "--log",
            log_s,
        ])
        .assert()
        .success();
    let text = std::fs::read_to_string(&log).unwrap();
    let last = text.lines().last().unwrap();
    assert!(last.contains(",29.0,16.00,"), "{last}");
    assert!(
        last.get(..4).unwrap().parse::<u32>().unwrap() >= 2026,
        "dated now: {last}"
    );
    // fit reads the log back and reports the trend over the visits.
    let o = spinwright()
        .args(["fit", &lawn, "--readings", log_s, "--format", "json"])
        .output()
        .unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(j["readings"], 5);
    let v = j["visits"].as_array().unwrap();
    assert_eq!(v.len(), 3);
    assert_eq!(v[0]["date"], "2026-05-10");
    // More drag on the second visit than on the first.
    assert!(
        j["running_friction_change_percent"].as_f64().unwrap() > 0.0,
        "{j}"
    );
    spinwright()
        .args(["fit", &lawn, "--readings", log_s])
        .assert()
        .success()
        .stdout(predicate::str::contains("since 2026-05-10"));
    // A bad --at and a file that is not a log are refused, the file kept.
    spinwright()
        .args([
            "check",
            &lawn,
            "--pressure",
            "2bar",
            "--rpm",
            "16",
            "--log",
            log_s,
            "--at",
            "May 10",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("ISO 8601"));
    let other = dir.path().join("notes.csv");
    std::fs::write(&other, "# my notes\nname,value\na,1\n").unwrap();
    spinwright()
        .args(["check", &lawn, "--pressure", "2bar", "--rpm", "16", "--log"])
        .arg(&other)
        .assert()
        .code(2)
        .stderr(predicate::str::contains("not a log"));
    assert_eq!(
        std::fs::read_to_string(&other).unwrap(),
        "# my notes\nname,value\na,1\n"
    );
}

#[test]
fn check_words_its_findings_in_us_units() {
    let lawn = shipped("lawn-rotor.ron");
    let o = spinwright()
        .args([
            "check",
            &lawn,
            "--pressure",
            "40psi",
            "--rpm",
            "22",
            "--flow",
            "4gpm",
            "--units",
            "us",
        ])
        .output()
        .unwrap();
    let text = String::from_utf8(o.stdout).unwrap();
    assert!(o.status.success());
    for want in ["psi", "lbf·in", "gpm", " in "] {
        assert!(text.contains(want), "{want} in\n{text}");
    }
    for not in ["kPa", "N·m", "L/min", " mm"] {
        assert!(!text.contains(not), "{not} in\n{text}");
    }
    assert!(text.contains("Causes"), "{text}");
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, ..ProptestConfig::default() })]

    /// Readings files made of odd cells never panic: either a clear error
    /// naming the file, or a fit whose numbers are all finite.
    #[test]
    fn odd_readings_files_give_an_error_or_a_finite_fit(
        cells in prop::collection::vec(
            prop::sample::select(vec![
                "200", "300", "0", "-5", "1e9", "nan", "", "25.5", "fast", "2026-05-10", "40",
            ]),
            2..12,
        ),
        header in prop::sample::select(vec![
            "pressure_kPa,rpm", "pressure_psi,rpm,flow_gpm", "rpm,pressure_bar", "pressure,rpm", "time,pressure_kPa,rpm",
        ]),
    ) {
        let width = header.split(',').count();
        let mut text = format!("{header}\n");
        for row in cells.chunks(width) {
            text.push_str(&row.join(","));
            text.push('\n');
        }
        match spinwright::inverse::readings::speed_readings("odd.csv", &text) {
            Err(e) => prop_assert!(e.to_string().starts_with("odd.csv:"), "{}", e),
            Ok(readings) => match fit(&three_arm_rotor(), &readings, None) {
                Err(e) => prop_assert!(!e.to_string().is_empty()),
                Ok(r) => {
                    prop_assert!(r.running_friction_n_m.is_finite() && r.running_friction_n_m >= 0.0);
                    prop_assert!(r.viscous.value.is_finite() && r.viscous.value >= 0.0);
                    prop_assert!(r.quadratic.value.is_finite() && r.quadratic.value >= 0.0);
                    prop_assert!(r.rms_residual_rpm.is_finite());
                }
            },
        }
    }
}

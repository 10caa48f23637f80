//! The inverse uses of the model: field check (model.md M10), target search,
//! sweeps and comparison — round trips through the full solver, the reading
//! band by hand, and the field rules of practice (references.md, "Field practice").

use spinwright::catalogue::{self, BRAKE_VISCOUS, DEFLECTION, INLET_PRESSURE};
use spinwright::inverse::compare::{compare, InputValue};
use spinwright::inverse::field::{
    check, Alone, CauseEvidence, CauseKind, Detail, FieldReading, FieldTolerances, FindingKind,
    FlowReading, RotationReading, ThrowReading, REGULATOR_LIMIT_PA,
};
use spinwright::inverse::sweep::{sweep, RowStatus, SweepAxis};
use spinwright::inverse::target::{target, Goal};
use spinwright::physics::balance::{rpm, solve, SpinStatus};
use spinwright::physics::design::{Bearing, Design, Line, Supply};
use spinwright::physics::fixtures::three_arm_rotor;
use spinwright::report::field::finding_text;
use spinwright::units::UnitSystem;

fn words(f: &spinwright::inverse::field::Finding) -> String {
    finding_text(f, UnitSystem::Metric)
}

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

fn op_rpm(d: &Design) -> f64 {
    rpm(solve(d).operating.expect("running").omega_rad_s())
}

fn measured_bearing(mut d: Design) -> Design {
    d.friction.bearing = Bearing::Measured {
        running_n_m: 0.012,
        breakaway_n_m: 0.02,
    };
    d
}

/// The three-arm rotor slowed by its brake to about 42.5 rpm, so that a
/// stopwatch reading can land on it.
fn slow_rotor() -> Design {
    let d = three_arm_rotor();
    let r = target(&d, &BRAKE_VISCOUS, Goal::Rpm(42.5)).unwrap();
    assert!(r.reachable);
    r.design
}

#[test]
fn field_check_of_the_models_own_speed_is_a_round_trip() {
    // Given the model's own rpm at the design pressure: deviation 0 and the
    // implied running friction equals the scenario's to 1e-6 relative.
    for d in [three_arm_rotor(), measured_bearing(three_arm_rotor())] {
        let report = solve(&d);
        let op = report.operating.as_ref().unwrap();
        let p = op.point.state.inlet_pressure_pa;
        let reading = FieldReading::new(p, RotationReading::rpm(rpm(op.omega_rad_s())));
        let c = check(&d, &reading, &FieldTolerances::default(), None).unwrap();
        assert!(c.deviation_percent.unwrap().abs() < 1e-9);
        let f = c.friction.unwrap();
        assert!(
            rel(f.implied_running_torque_n_m, op.point.resist.bearing_n_m) < 1e-6,
            "{} vs {}",
            f.implied_running_torque_n_m,
            op.point.resist.bearing_n_m
        );
        assert!(rel(f.implied_running_torque_n_m, f.design_running_torque_n_m) < 1e-6);
        match d.friction.bearing {
            Bearing::Washer(w) => {
                assert!(rel(f.implied_mu_kinetic.unwrap(), w.mu_kinetic) < 1e-6)
            }
            Bearing::Measured { running_n_m, .. } => {
                assert!(rel(f.implied_running_torque_n_m, running_n_m) < 1e-6)
            }
        }
        // The as-found design settles at the measured speed.
        assert!(rel(f.model_rpm.unwrap(), rpm(op.omega_rad_s())) < 1e-6);
        assert!(c.findings.iter().all(|f| !f.fault), "{:#?}", c.findings);
    }
}

#[test]
fn field_check_of_a_hose_fed_design_uses_its_inlet_pressure() {
    // A design fed through 15 m of 16 mm hose: the inlet pressure at its
    // operating point, held fixed, gives the same operating point back.
    let mut d = three_arm_rotor();
    d.supply = Supply::Line(Line {
        source_pa: 350e3,
        length_m: 15.0,
        bore_m: 0.016,
        roughness_m: 1.5e-6,
        minor_k: 2.0,
        lift_m: 0.5,
    });
    let report = solve(&d);
    let op = report.operating.as_ref().unwrap();
    let p = op.point.state.inlet_pressure_pa;
    assert!(p < 350e3);
    let c = check(
        &d,
        &FieldReading::new(p, RotationReading::rpm(rpm(op.omega_rad_s()))),
        &FieldTolerances::default(),
        None,
    )
    .unwrap();
    assert!(c.deviation_percent.unwrap().abs() < 1e-6);
    assert!(rel(c.design_inlet_pressure_pa, p) < 1e-12);
    let f = c.friction.unwrap();
    assert!(rel(f.implied_mu_kinetic.unwrap(), 0.10) < 1e-6);
}

#[test]
fn measured_flow_equal_to_the_model_gives_the_nominal_nozzle() {
    let d = three_arm_rotor();
    let op = solve(&d).operating.unwrap();
    let mut reading = FieldReading::new(280e3, RotationReading::rpm(rpm(op.omega_rad_s())));
    reading.flow = Some(FlowReading::rate(op.point.state.total_flow_m3_s));
    let c = check(&d, &reading, &FieldTolerances::default(), None).unwrap();
    let flow = c.flow.unwrap();
    assert!((flow.diameter_scale.unwrap() - 1.0).abs() < 1e-6);
    assert!(rel(flow.implied_effective_diameter_m.unwrap(), 2.4e-3) < 1e-6);
    assert!(flow.deviation_percent.abs() < 1e-9);
}

#[test]
fn ten_turns_timed_by_hand_give_the_stopwatch_band() {
    // 10 turns over 14.2 s, stopwatch ±0.2 s (hand timing, common practice):
    //   rpm = 60·10/14.2 = 42.2535
    //   lo  = 60·10/(14.2 + 0.2) = 600/14.4 = 41.6667
    //   hi  = 60·10/(14.2 − 0.2) = 600/14.0 = 42.8571
    let reading = RotationReading::turns_over(10.0, 14.2);
    assert!((reading.measured_rpm() - 42.2535).abs() < 5e-5);
    let [lo, hi] = reading.band_rpm().unwrap();
    assert!((lo - 41.6667).abs() < 5e-5, "{lo}");
    assert!((hi - 42.8571).abs() < 5e-5, "{hi}");

    // A counting resolution widens it: ±0.5 turn → 60·9.5/14.4 … 60·10.5/14.0
    // = 39.5833 … 45.0000 rpm.
    let counted = RotationReading::TurnsOver {
        turns: 10.0,
        seconds: 14.2,
        stopwatch_resolution_s: 0.2,
        count_resolution_turns: 0.5,
    };
    let [lo, hi] = counted.band_rpm().unwrap();
    assert!((lo - 39.5833).abs() < 5e-5 && (hi - 45.0).abs() < 1e-9);

    // A rotor designed for 42.5 rpm read as 10 turns in 14.2 s: 42.5 lies in
    // the band, so the 0.6 % difference is within reading accuracy.
    let d = slow_rotor();
    let expected = op_rpm(&d);
    assert!((expected - 42.5).abs() < 0.05);
    let c = check(
        &d,
        &FieldReading::new(280e3, reading),
        &FieldTolerances::default(),
        None,
    )
    .unwrap();
    let speed = c
        .findings
        .iter()
        .find(|f| f.kind == FindingKind::SpeedOk)
        .unwrap();
    assert!(
        words(speed).contains("within reading accuracy"),
        "{speed:?}"
    );
    assert_eq!(speed.score, 0.0);
}

#[test]
fn a_reading_outside_the_band_but_inside_the_allowance_is_not_a_fault() {
    // 10 turns in 15.0 s: 40 rpm, band 600/15.2 … 600/14.8 = 39.47 … 40.54 rpm.
    // Against 42.5 rpm the band's near end is −4.6 %: inside the 5 % allowance.
    let d = slow_rotor();
    let c = check(
        &d,
        &FieldReading::new(280e3, RotationReading::turns_over(10.0, 15.0)),
        &FieldTolerances::default(),
        None,
    )
    .unwrap();
    let speed = c
        .findings
        .iter()
        .find(|f| f.kind == FindingKind::SpeedOk)
        .unwrap();
    assert!(!speed.fault);
    assert_eq!(
        words(speed),
        "spins 5.9 % slower than design, within the 5 % allowed"
    );
    assert!((speed.score - 4.6 / 5.0).abs() < 0.01, "{}", speed.score);

    // 10 turns in 20 s: 30 rpm, far below. The rotor is slowed by its brake
    // (98 % of the resisting torque), so the brake explains most of the
    // slowdown and is named, with the factor it would need alone; the
    // bearing would need far more.
    let c = check(
        &d,
        &FieldReading::new(280e3, RotationReading::turns_over(10.0, 20.0)),
        &FieldTolerances::default(),
        None,
    )
    .unwrap();
    let top = &c.findings[0];
    assert_eq!(top.kind, FindingKind::Slow);
    assert!(top.fault && top.score > 1.0);
    assert!(
        words(top).starts_with("spins 29.4 % slower than design: brake drag about 1.4× design"),
        "{}",
        words(top)
    );
    let factor = |kind: CauseKind| match c.causes.iter().find(|k| k.kind == kind).unwrap().evidence
    {
        CauseEvidence::Part {
            alone: Alone::Factor { factor, .. },
            ..
        } => factor,
        other => panic!("{other:?}"),
    };
    assert!(factor(CauseKind::Bearing) > 10.0 * factor(CauseKind::Brake));
    assert_eq!(c.causes[0].kind, CauseKind::Brake);
    let f = c.friction.unwrap();
    assert!(f.implied_running_torque_n_m > f.design_running_torque_n_m);
    assert!(f.band_n_m[0] <= f.implied_running_torque_n_m);
    assert!(f.implied_running_torque_n_m <= f.band_n_m[1]);
}

#[test]
fn the_ten_percent_nozzle_rule() {
    // Common practice (references.md, Field practice): nozzle flow more than
    // 10 % off a new nozzle's → replace.
    let d = three_arm_rotor();
    let op = solve(&d).operating.unwrap();
    let r = rpm(op.omega_rad_s());
    let q = op.point.state.total_flow_m3_s;
    let run = |factor: f64| {
        let mut reading = FieldReading::new(280e3, RotationReading::rpm(r));
        reading.flow = Some(FlowReading::rate(factor * q));
        check(&d, &reading, &FieldTolerances::default(), None).unwrap()
    };
    let worn = run(1.14);
    let f = worn
        .findings
        .iter()
        .find(|f| f.kind == FindingKind::FlowHigh)
        .unwrap();
    assert_eq!(words(f), "flow 14 % over nominal: nozzle worn — replace it");
    assert!((f.score - 1.4).abs() < 1e-6);
    assert!(worn.flow.unwrap().diameter_scale.unwrap() > 1.0);
    let clogged = run(0.80);
    assert!(clogged
        .findings
        .iter()
        .any(|f| f.kind == FindingKind::FlowLow && words(f).contains("partly clogged")));
    // A partly clogged nozzle drives less, so the same speed needs less
    // bearing drag than designed: the model does not blame the bearing.
    let fr = clogged.friction.unwrap();
    assert!(fr.implied_running_torque_n_m < fr.design_running_torque_n_m);
    let fine = run(1.09);
    assert!(fine
        .findings
        .iter()
        .any(|f| f.kind == FindingKind::FlowOk && !f.fault));
}

#[test]
fn pressure_rules() {
    // 80 psi = 80 × 6894.757 Pa = 551.58 kPa (NIST SP 811 psi factor);
    // above it a regulator (common practice, plumbing codes).
    assert!((REGULATOR_LIMIT_PA - 80.0 * 6894.757).abs() < 1.0);
    let d = three_arm_rotor();
    let kinds = |p: f64| -> Vec<FindingKind> {
        let r = op_rpm(&{
            let mut at = d.clone();
            at.supply = Supply::Pressure { inlet_pa: p };
            at
        });
        check(
            &d,
            &FieldReading::new(p, RotationReading::rpm(r)),
            &FieldTolerances::default(),
            None,
        )
        .unwrap()
        .findings
        .iter()
        .filter(|f| f.fault)
        .map(|f| f.kind)
        .collect()
    };
    assert!(kinds(560e3).contains(&FindingKind::RegulatorNeeded));
    assert!(!kinds(540e3).contains(&FindingKind::RegulatorNeeded));
    // 200 kPa against a 280 kPa design: −29 %, a loss upstream. The rotor
    // spins slower than designed (the first finding), and the whole of it is
    // the pressure's: the low pressure is the cause named, and no part of
    // the resisting torque is blamed.
    let low = kinds(200e3);
    assert_eq!(low, vec![FindingKind::Slow, FindingKind::PressureLow]);
    let r = op_rpm(&{
        let mut at = d.clone();
        at.supply = Supply::Pressure { inlet_pa: 200e3 };
        at
    });
    let c = check(
        &d,
        &FieldReading::new(200e3, RotationReading::rpm(r)),
        &FieldTolerances::default(),
        None,
    )
    .unwrap();
    match &c.findings[0].detail {
        Detail::Speed { top: Some(top), .. } => assert_eq!(top.kind, CauseKind::Pressure),
        other => panic!("{other:?}"),
    }
    let dev = c.measured_rpm - c.design_rpm.unwrap();
    let pressure = c
        .causes
        .iter()
        .find(|k| k.kind == CauseKind::Pressure)
        .unwrap();
    assert!(rel(pressure.explains_rpm.unwrap(), dev) < 1e-6);
    assert!(
        words(&c.findings[0]).contains("the pressure below design"),
        "{}",
        words(&c.findings[0])
    );
}

#[test]
fn throw_is_compared_through_the_callers_function() {
    // A stand-in throw model (the real one lives elsewhere): 12 m × (p/280 kPa)^0.5,
    // less 1 % per 10 rpm: 7.8 m at 348 rpm. The measured 6.0 m is short against it.
    let throw = |d: &Design| -> Option<f64> {
        let p = match d.supply {
            Supply::Pressure { inlet_pa } => inlet_pa,
            _ => 280e3,
        };
        let r = solve(d).operating.map(|op| rpm(op.omega_rad_s()))?;
        Some(12.0 * (p / 280e3).sqrt() * (1.0 - 0.001 * r))
    };
    let d = three_arm_rotor();
    let r = op_rpm(&d);
    let mut reading = FieldReading::new(280e3, RotationReading::rpm(r));
    reading.throw = Some(ThrowReading::new(6.0));
    let c = check(&d, &reading, &FieldTolerances::default(), Some(&throw)).unwrap();
    let t = c.throw.unwrap();
    let expected = 12.0 * (1.0 - 0.001 * r);
    assert!(rel(t.expected_m.unwrap(), expected) < 1e-9);
    let short = c
        .findings
        .iter()
        .find(|f| f.kind == FindingKind::ThrowShort)
        .unwrap();
    assert!(
        words(short).contains("short of expected"),
        "{}",
        words(short)
    );
}

#[test]
fn target_round_trips_for_every_adjustable_input() {
    // Solving the adjusted design gives the target within 0.1 %.
    let d = three_arm_rotor();
    let base = op_rpm(&d);
    let adjustable: Vec<_> = catalogue::adjustable().collect();
    assert_eq!(adjustable.len(), 6);
    for adjust in adjustable {
        let want = 0.8 * base;
        let r = target(&d, adjust, Goal::Rpm(want)).unwrap();
        assert!(r.reachable, "{adjust:?}: {r:?}");
        let got = op_rpm(&r.design);
        assert!(rel(got, want) < 1e-3, "{adjust:?}: {got} vs {want}");
        assert!(rel(r.achieved.unwrap(), got) < 1e-9);
        assert_eq!(r.report.status, SpinStatus::Running);
        assert!(r.value >= r.range.0 && r.value <= r.range.1);
    }
}

#[test]
fn sweep_rows_equal_individual_solves() {
    let d = three_arm_rotor();
    let axes = [
        SweepAxis {
            input: &DEFLECTION,
            from: 0.0,
            to: 60f64.to_radians(),
            steps: 4,
        },
        SweepAxis {
            input: &INLET_PRESSURE,
            from: 150e3,
            to: 450e3,
            steps: 3,
        },
    ];
    let s = sweep(&d, &axes, &|_, _| {}).unwrap();
    assert_eq!(s.rows.len(), 12);
    for (k, row) in s.rows.iter().enumerate() {
        // First axis outer, second inner.
        let (i, j) = (k / 3, k % 3);
        let (defl, p) = (axes[0].values()[i], axes[1].values()[j]);
        assert_eq!(row.values, vec![defl, p]);
        let mut one = d.clone();
        DEFLECTION.vary_to(&mut one, defl).unwrap();
        one.supply = Supply::Pressure { inlet_pa: p };
        let report = solve(&one);
        assert_eq!(row.status, RowStatus::Spin(report.status));
        assert_eq!(
            row.rpm,
            report.operating.as_ref().map(|op| rpm(op.omega_rad_s()))
        );
        assert_eq!(row.start_margin, report.start_margin);
        assert_eq!(
            row.total_flow_m3_s,
            report
                .operating
                .as_ref()
                .map(|op| op.point.state.total_flow_m3_s)
        );
    }
}

#[test]
fn compare_a_washer_with_a_measured_bearing() {
    let a = three_arm_rotor();
    let b = measured_bearing(a.clone());
    let c = compare(&[("washer", &a), ("measured", &b)], &[]).unwrap();
    let kind = c
        .inputs
        .iter()
        .find(|i| i.path == "friction.bearing")
        .unwrap();
    assert_eq!(
        kind.values,
        vec![
            Some(InputValue::Text("washer".into())),
            Some(InputValue::Text("measured".into()))
        ]
    );
    let mu = c
        .inputs
        .iter()
        .find(|i| i.path == "friction.bearing.Washer.mu_kinetic")
        .unwrap();
    assert_eq!(mu.values, vec![Some(InputValue::Number(0.10)), None]);
    // Nothing else differs.
    assert!(c
        .inputs
        .iter()
        .all(|i| i.path.starts_with("friction.bearing")));
    let names: Vec<&str> = c.results.iter().map(|r| r.key.as_str()).collect();
    assert_eq!(
        names,
        vec![
            "rpm",
            "start_margin",
            "total_flow_m3_s",
            "stall_torque_n_m",
            "runaway_rpm"
        ]
    );
}

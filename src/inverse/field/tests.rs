//! Unit tests of the field check.

use super::*;
use crate::physics::design::Bearing;
use crate::physics::fixtures::three_arm_rotor;

fn op_rpm(d: &Design) -> f64 {
    rpm(solve(d).operating.expect("running").omega_rad_s())
}

#[test]
fn seconds_per_turn_band() {
    // 1.5 s per turn to ±0.2 s: 40 rpm, band 60/1.7 … 60/1.3 = 35.29 … 46.15 rpm.
    let r = RotationReading::seconds_per_turn(1.5);
    assert!((r.measured_rpm() - 40.0).abs() < 1e-12);
    let [lo, hi] = r.band_rpm().unwrap();
    assert!((lo - 60.0 / 1.7).abs() < 1e-12 && (hi - 60.0 / 1.3).abs() < 1e-12);
}

#[test]
fn caught_volume_band() {
    // 5 L in 30 s, jug ±0.05 L, stopwatch ±0.2 s: 10 L/min,
    // band 4.95/30.2 … 5.05/29.8 L/s = 9.834 … 10.168 L/min.
    let f = FlowReading::caught(5e-3, 30.0);
    assert!((f.measured_m3_s() * 60e3 - 10.0).abs() < 1e-12);
    let [lo, hi] = f.band_m3_s().unwrap();
    assert!((lo * 60e3 - 4.95 / 30.2 * 60.0).abs() < 1e-9);
    assert!((hi * 60e3 - 5.05 / 29.8 * 60.0).abs() < 1e-9);
}

#[test]
fn bad_readings_name_the_field() {
    let d = three_arm_rotor();
    let tol = FieldTolerances::default();
    let e = check(
        &d,
        &FieldReading::new(-1.0, RotationReading::rpm(30.0)),
        &tol,
        None,
    )
    .unwrap_err();
    assert!(e.to_string().contains("pressure"), "{e}");
    let e = RotationReading::seconds_per_turn(0.1)
        .band_rpm()
        .unwrap_err();
    assert!(e.to_string().contains("stopwatch resolution"), "{e}");
    let e = check(
        &d,
        &FieldReading::new(280e3, RotationReading::rpm(f64::NAN)),
        &tol,
        None,
    )
    .unwrap_err();
    assert!(e.to_string().contains("rpm"), "{e}");
}

#[test]
fn the_models_own_speed_is_no_fault() {
    let d = three_arm_rotor();
    let r = op_rpm(&d);
    let c = check(
        &d,
        &FieldReading::new(280e3, RotationReading::rpm(r)),
        &FieldTolerances::default(),
        None,
    )
    .unwrap();
    assert!(c.deviation_percent.unwrap().abs() < 1e-9);
    assert!(c.findings.iter().all(|f| !f.fault), "{:#?}", c.findings);
    let f = c.friction.unwrap();
    assert!((f.implied_mu_kinetic.unwrap() / 0.10 - 1.0).abs() < 1e-6);
    assert!((f.ratio.unwrap() - 1.0).abs() < 1e-6);
}

#[test]
fn a_slow_rotor_with_a_washer_gets_bearing_drag() {
    // The same rotor with μ_k three times the design's spins slower; its
    // speed read back gives μ_k ≈ 0.30 and "about 3.0× design".
    let d = three_arm_rotor();
    let mut gritty = d.clone();
    if let Bearing::Washer(w) = &mut gritty.friction.bearing {
        w.mu_kinetic = 0.30;
    }
    let slow = op_rpm(&gritty);
    let c = check(
        &d,
        &FieldReading::new(280e3, RotationReading::rpm(slow)),
        &FieldTolerances {
            speed_percent: 0.1,
            ..FieldTolerances::default()
        },
        None,
    )
    .unwrap();
    let f = c.friction.unwrap();
    assert!((f.implied_mu_kinetic.unwrap() - 0.30).abs() < 1e-6);
    let top = &c.findings[0];
    assert_eq!(top.kind, FindingKind::Slow);
    assert_eq!(top.direction(), Some(Direction::Slower));
    // The bearing alone would need its μ_k three times the design's.
    let bearing = c
        .causes
        .iter()
        .find(|k| k.kind == CauseKind::Bearing)
        .unwrap();
    match bearing.evidence {
        CauseEvidence::Part {
            alone: Alone::Factor { factor, .. },
            ..
        } => assert!((factor - 3.0).abs() < 1e-6, "{factor}"),
        other => panic!("{other:?}"),
    }
    // Each part's share of the slowdown adds up to the whole of it.
    let dev = c.measured_rpm - c.design_rpm.unwrap();
    let parts: f64 = c
        .causes
        .iter()
        .filter(|k| matches!(k.evidence, CauseEvidence::Part { .. }))
        .filter_map(|k| k.explains_rpm)
        .sum();
    assert!(
        (parts - dev).abs() < 1e-9 * dev.abs().max(1.0),
        "{parts} vs {dev}"
    );
}

#[test]
fn worn_nozzle_flow_and_regulator() {
    let d = three_arm_rotor();
    let mut worn = with_pressure(&d, 600e3);
    for arm in &mut worn.rotor.arms {
        arm.nozzle.diameter_m *= 1.07;
    }
    let report = solve(&worn);
    let op = report.operating.unwrap();
    let mut reading = FieldReading::new(600e3, RotationReading::rpm(rpm(op.omega_rad_s())));
    reading.flow = Some(FlowReading::rate(op.point.state.total_flow_m3_s));
    let c = check(&d, &reading, &FieldTolerances::default(), None).unwrap();
    let flow = c.flow.as_ref().unwrap();
    assert!((flow.diameter_scale.unwrap() - 1.07).abs() < 1e-6);
    let kinds: Vec<FindingKind> = c
        .findings
        .iter()
        .filter(|f| f.fault)
        .map(|f| f.kind)
        .collect();
    assert!(kinds.contains(&FindingKind::FlowHigh), "{:#?}", c.findings);
    assert!(kinds.contains(&FindingKind::RegulatorNeeded));
    // The nozzle, not the bearing, explains the speed: the friction is the design's.
    let f = c.friction.unwrap();
    assert!((f.implied_mu_kinetic.unwrap() / 0.10 - 1.0).abs() < 1e-6);
    assert!(!kinds.contains(&FindingKind::Slow));
    // The speed first, the rest ranked by score, most serious first.
    assert!(matches!(c.findings[0].detail, Detail::Speed { .. }));
    assert!(c.findings[1..].windows(2).all(|w| w[0].score >= w[1].score));
}

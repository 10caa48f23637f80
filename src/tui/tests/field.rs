//! The Field view: readings typed, checked, tabled and fitted, the coast-down.

use super::*;

#[test]
fn rotation_and_flow_are_read_in_the_forms_taken() {
    use crate::inverse::field::{FlowReading, RotationReading};
    use crate::tui::app::{parse_flow, parse_rotation};
    let rpm = |r: RotationReading| r.measured_rpm();
    assert!((rpm(parse_rotation("40rpm").unwrap()) - 40.0).abs() < 1e-12);
    let r = parse_rotation("1.5s").unwrap();
    assert!(matches!(r, RotationReading::SecondsPerTurn { .. }));
    assert!((rpm(r) - 40.0).abs() < 1e-12);
    // 10 turns in 14.2 s = 42.25 rpm (model.md M10 example).
    let r = parse_rotation("10/14.2s").unwrap();
    assert!((rpm(r) - 42.253_521_126_760_56).abs() < 1e-9);
    let r = parse_rotation("10 turns in 15 s").unwrap();
    assert!((rpm(r) - 40.0).abs() < 1e-12);
    assert!(parse_rotation("fast").is_err());
    assert!(parse_rotation("0rpm").is_err());
    assert!(parse_rotation("-2s").is_err());

    let m = UnitSystem::Metric;
    let f = parse_flow("12L/min", m).unwrap();
    assert!(matches!(f, FlowReading::Rate { .. }));
    assert!((f.measured_m3_s() - 12e-3 / 60.0).abs() < 1e-15);
    let f = parse_flow("5L in 30s", m).unwrap();
    assert!(matches!(f, FlowReading::Caught { .. }));
    assert!((f.measured_m3_s() - 5e-3 / 30.0).abs() < 1e-15);
    let f = parse_flow("5L/30s", m).unwrap();
    assert!((f.measured_m3_s() - 5e-3 / 30.0).abs() < 1e-15);
    assert!(parse_flow("3.2gpm", m).is_ok());
    assert!(parse_flow("5m", m).is_err());
}

#[test]
fn field_view_checks_readings_against_the_design() {
    let mut a = app();
    a.event(&key(KeyCode::Char('4')));
    assert_eq!(a.view, View::Field);
    a.event(&key(KeyCode::Char('p')));
    clear_input(&mut a);
    typed(&mut a, "2.5bar");
    a.event(&key(KeyCode::Enter));
    assert!(
        a.field.result.is_none(),
        "no check before the rotation is in"
    );
    a.event(&key(KeyCode::Char('r')));
    typed(&mut a, "10/30s");
    a.event(&key(KeyCode::Enter));
    assert!(a.field.waiting, "the check runs on the worker");
    assert!(a.settle(SETTLE));
    let c = match a.field.result.as_deref() {
        Some(Ok(c)) => c.clone(),
        other => panic!("{other:?}"),
    };
    assert!((c.measured_rpm - 20.0).abs() < 1e-9);
    assert!((c.inlet_pressure_pa - 2.5e5).abs() < 1e-6);
    // Slower than the design at that pressure: more friction than designed.
    let f = c.friction.expect("an implied friction");
    assert!(f.implied_running_torque_n_m > f.design_running_torque_n_m);
    assert!(!c.findings.is_empty());
    // The readings, the verdict and the findings, in the shown units.
    let s = screen(&mut a, 80, 24);
    for shown in [
        "250 kPa",
        "10 turns in 30 s = 20.0 rpm",
        "measured 20.0 rpm",
        "findings",
    ] {
        assert!(s.contains(shown), "{shown} in {s}");
    }
    a.set_units(UnitSystem::Us);
    let s = screen(&mut a, 80, 24);
    assert!(s.contains("36.3 psi") && !s.contains("250 kPa"), "{s}");
    a.set_units(UnitSystem::Metric);
    // A bad reading is refused and the old one kept.
    a.event(&key(KeyCode::Char('r')));
    typed(&mut a, "fast");
    a.event(&key(KeyCode::Enter));
    assert!(a.message.as_ref().unwrap().text.contains("not a rotation"));
    assert!(a.measured.rotation.is_some());
}

#[test]
fn several_readings_are_fitted_on_the_worker() {
    // Readings made by the design itself at three pressures: the fit must
    // give back the design's running friction with no residual.
    let mut a = app();
    three_readings(&mut a);
    assert_eq!(a.unit.rows.len(), 3);
    assert!(a.unit.fit.waiting, "the fit runs on the worker");
    assert!(a.settle(SETTLE));
    let f = match a.unit.fit.result.as_deref() {
        Some(Ok(f)) => f.clone(),
        other => panic!("{other:?}"),
    };
    assert_eq!(f.residuals.len(), 3);
    assert!(f.rms_residual_rpm < 0.05, "{}", f.rms_residual_rpm);
    let s = screen(&mut a, 80, 24);
    for shown in [
        "readings table",
        "200 kPa",
        "250 kPa",
        "300 kPa",
        "fitted to 3 readings",
    ] {
        assert!(s.contains(shown), "{shown} in {s}");
    }
    // x drops the last row and the fit is made again over two.
    a.event(&key(KeyCode::Char('x')));
    assert_eq!(a.unit.rows.len(), 2);
    assert!(a.settle(SETTLE));
    assert!(matches!(a.unit.fit.result.as_deref(), Some(Ok(f)) if f.residuals.len() == 2));
    // n with no rotation typed is refused with what to do.
    a.event(&key(KeyCode::Char('r')));
    a.event(&key(KeyCode::Enter));
    a.event(&key(KeyCode::Char('n')));
    assert!(a
        .message
        .as_ref()
        .unwrap()
        .text
        .contains("type the pressure"));
    assert_eq!(a.unit.rows.len(), 2);
}

#[test]
fn a_coast_down_is_entered_and_fitted() {
    use crate::inverse::coast::{fit_coast, CoastData};
    let mut a = app();
    a.event(&key(KeyCode::Char('4')));
    a.event(&key(KeyCode::Char('d')));
    typed(&mut a, "0.9, 1.9, 3.0, 4.2, 5.6, 7.3");
    a.event(&key(KeyCode::Enter));
    assert_eq!(a.unit.coast_times_s, vec![0.9, 1.9, 3.0, 4.2, 5.6, 7.3]);
    assert!(a.settle(SETTLE));
    let direct = fit_coast(
        &a.design,
        &CoastData::TurnTimes(a.unit.coast_times_s.clone()),
        None,
    )
    .map_err(|e| e.to_string());
    assert_eq!(a.unit.coast.result.as_deref(), Some(&direct));
    let c = direct.expect("these times fit");
    assert!(c.running_friction_n_m.value >= 0.0);
    let s = screen(&mut a, 80, 24);
    assert!(s.contains("coast-down (d)"), "{s}");
    for shown in ["0.9, 1.9, 3, 4.2", "dry running friction", "stops after"] {
        assert!(s.contains(shown), "{shown} in {s}");
    }
    // Times that do not rise are refused; the old ones are kept.
    a.event(&key(KeyCode::Char('d')));
    clear_input(&mut a);
    typed(&mut a, "1, 2, 1.5");
    a.event(&key(KeyCode::Enter));
    assert!(a.message.as_ref().unwrap().text.contains("not later"));
    assert_eq!(a.unit.coast_times_s.len(), 6);
    // Typing it empty clears it.
    a.event(&key(KeyCode::Char('d')));
    clear_input(&mut a);
    a.event(&key(KeyCode::Enter));
    assert!(a.unit.coast_times_s.is_empty());
    assert!(a.unit.coast.result.is_none());
}

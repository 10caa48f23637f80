use super::*;
use crate::scenario::{builtin_example, load_str, Scenario};

fn seed(d: &Design) -> Seed {
    Seed {
        inlet_pa: 300e3,
        flow_m3_s: 3e-4,
        inertia_kg_m2: 1e-3,
        running_n_m: 0.02,
        breakaway_n_m: 0.03,
        washer: match d.friction.bearing {
            Bearing::Washer(w) => w,
            Bearing::Measured { .. } => panic!("the example has a washer"),
        },
        spacing_m: 8.0,
    }
}

/// The built-in example and designs with every other option of every choice,
/// so that every input is present in at least one of them.
fn designs() -> Vec<Design> {
    let base = builtin_example().to_design().unwrap();
    let s = seed(&base);
    let mut out = vec![base.clone()];
    for input in all() {
        if let Access::Choice { options, .. } = input.access {
            for k in 0..options.len() {
                let mut d = base.clone();
                if input.set_choice(&mut d, k, &s) {
                    out.push(d);
                }
            }
        }
    }
    out
}

/// The input's value, or one to start from when it is auto.
fn start(input: &Input, d: &Design, arm: Option<usize>) -> f64 {
    match input.number(d, arm) {
        Some(v) => v,
        // A tube at least as long as the arm.
        None if input == &TUBE_LENGTH => 0.5,
        None => input.step.fine * 10.0,
    }
}

/// A value the input accepts, different from `v`.
fn another(input: &Input, v: f64) -> f64 {
    let up = v + input.step.fine;
    if input.range.refuses(up).is_none() {
        up
    } else {
        v - input.step.fine
    }
}

fn close(a: f64, b: f64) -> bool {
    a == b || (a - b).abs() <= 1e-9 * a.abs().max(b.abs())
}

#[test]
fn paths_are_unique_and_findable() {
    let mut seen = std::collections::HashSet::new();
    for input in all() {
        assert!(seen.insert(input.path), "{} twice", input.path);
        assert_eq!(input.per_arm(), input.path.contains("[]"), "{}", input.path);
        assert_eq!(find(input.path).map(|f| f.0), Some(*input));
        if input.per_arm() {
            assert_eq!(find(&input.path_at(Some(2))), Some((*input, Some(2))));
        }
        assert!(!input.label.is_empty() && !input.help.is_empty());
    }
    assert_eq!(find("rotor.arms[x].radius"), None);
}

#[test]
fn every_input_is_in_some_design_and_round_trips_through_it() {
    let designs = designs();
    let s = seed(&designs[0]);
    for input in all() {
        let arm = input.per_arm().then_some(1);
        let d = designs
            .iter()
            .find(|d| input.get(d, arm).is_some())
            .unwrap_or_else(|| panic!("{} is in no design", input.path));
        let mut e = d.clone();
        match input.access {
            Access::Choice { options, .. } => {
                for (k, word) in options.iter().enumerate() {
                    assert!(input.set_choice(&mut e, k, &s), "{}", input.path);
                    assert_eq!(input.get(&e, None), Some(Value::Choice(word)));
                }
            }
            Access::Text { .. } => {
                assert!(input.set_text(&mut e, "renamed"));
                assert_eq!(input.get(&e, None), Some(Value::Text("renamed".into())));
            }
            _ => {
                let v = start(input, d, arm);
                let w = another(input, v);
                assert!(input.set_number(&mut e, arm, Some(w)), "{}", input.path);
                let back = input.number(&e, arm).unwrap();
                assert!(close(back, w), "{}: {back} vs {w}", input.path);
                if input.kind() == Kind::OptionalNumber {
                    assert!(input.set_number(&mut e, arm, None));
                    assert_eq!(input.get(&e, arm), Some(Value::Auto), "{}", input.path);
                }
                if input.per_arm() {
                    // Only the arm addressed moved.
                    assert_eq!(input.get(&e, Some(0)), input.get(d, Some(0)));
                }
            }
        }
    }
}

#[test]
fn every_input_survives_a_save_and_reload_in_both_unit_systems() {
    let designs = designs();
    let s = seed(&designs[0]);
    for input in all() {
        if matches!(input.access, Access::Text { .. }) || input.path == "rotor.arms" {
            continue;
        }
        let arm = input.per_arm().then_some(1);
        let d = designs
            .iter()
            .find(|d| input.get(d, arm).is_some())
            .unwrap();
        let mut variants = Vec::new();
        match input.access {
            Access::Choice { options, .. } => {
                for k in 0..options.len() {
                    let mut e = d.clone();
                    assert!(input.set_choice(&mut e, k, &s));
                    variants.push(e);
                }
            }
            _ => {
                let v = start(input, d, arm);
                let mut e = d.clone();
                assert!(input.set_number(&mut e, arm, Some(another(input, v))));
                variants.push(e);
            }
        }
        for e in variants {
            for system in [UnitSystem::Metric, UnitSystem::Us] {
                let text = Scenario::from_design(&e, system, "").to_ron_string();
                let back = load_str(&text, "round trip")
                    .and_then(|sc| sc.to_design())
                    .unwrap_or_else(|err| panic!("{}: {err}", input.path));
                match (input.get(&e, arm), input.get(&back, arm)) {
                    (Some(Value::Number(a)), Some(Value::Number(b))) => {
                        let (a, b) = match input.unit {
                            Unit::Dim(Dimension::Temperature) => (a + 273.15, b + 273.15),
                            _ => (a, b),
                        };
                        assert!(
                            (a - b).abs() <= 1e-9 * a.abs().max(b.abs()),
                            "{}",
                            input.path
                        );
                    }
                    (a, b) => assert_eq!(a, b, "{} in {system}", input.path),
                }
            }
        }
    }
}

#[test]
fn present_lists_arm_inputs_arm_by_arm() {
    let d = builtin_example().to_design().unwrap();
    let p = present(&d);
    let arm_rows: Vec<Option<usize>> = p.iter().filter(|(i, _)| i.per_arm()).map(|x| x.1).collect();
    let per_arm = all().iter().filter(|i| i.per_arm()).count();
    assert_eq!(arm_rows.len(), per_arm * d.rotor.arms.len());
    assert!(arm_rows.windows(2).all(|w| w[0] <= w[1]));
    // Only the present variant's inputs.
    assert!(
        p.iter().any(|(i, _)| *i == &INLET_PRESSURE) == matches!(d.supply, Supply::Pressure { .. })
    );
    assert!(!p.iter().any(|(i, _)| *i == &RUNNING));
}

#[test]
fn units_show_and_read_back() {
    let m = UnitSystem::Metric;
    let us = UnitSystem::Us;
    // 1e-6 N·m/Pa = 1e-3 N·m per kPa.
    assert_eq!(SEAL_PER_PRESSURE.unit.label(m), "N·m/kPa");
    assert_eq!(SEAL_PER_PRESSURE.unit.label(us), "lbf·in/psi");
    assert!((SEAL_PER_PRESSURE.unit.to_display(1e-6, m) - 1e-3).abs() < 1e-15);
    let per = SEAL_PER_PRESSURE.unit.parse("0.002N·m/kPa", us).unwrap();
    assert!((per - 2e-6).abs() < 1e-18, "{per}");
    let shown = SEAL_PER_PRESSURE.unit.to_display(2e-6, us);
    let back = SEAL_PER_PRESSURE
        .unit
        .parse(&format!("{shown}"), us)
        .unwrap();
    assert!((back - 2e-6).abs() < 1e-15);
    assert_eq!(BRAKE_VISCOUS.unit.format(0.4, us), "0.400 N·m·s");
    assert_eq!(BRAKE_VISCOUS.unit.parse("0.4 N·m·s", m), Ok(0.4));
    assert!(BRAKE_QUADRATIC.unit.parse("0.4 kPa", m).is_err());
}

#[test]
fn sweeps_keep_arm_offsets_and_refuse_without_changing_the_design() {
    let mut d = builtin_example().to_design().unwrap();
    let defl: Vec<f64> = (0..3)
        .map(|k| (10.0 + 5.0 * k as f64).to_radians())
        .collect();
    for (a, v) in d.rotor.arms.iter_mut().zip(&defl) {
        a.nozzle.deflection_rad = *v;
    }
    DEFLECTION.vary_to(&mut d, 25f64.to_radians()).unwrap();
    let got = DEFLECTION.arm_values(&d);
    for (g, w) in got.iter().zip([20.0f64, 25.0, 30.0]) {
        assert!((g - w.to_radians()).abs() < 1e-12, "{got:?}");
    }
    let before = d.clone();
    let e = ELEVATION.vary_to(&mut d, 100f64.to_radians()).unwrap_err();
    assert!(e.to_string().contains("elevation"), "{e}");
    assert!(MU_KINETIC.vary_to(&mut d, -0.1).is_err());
    let e = RUNNING.vary_to(&mut d, 0.01).unwrap_err();
    assert!(
        e.to_string().contains("friction.bearing` is not `Measured"),
        "{e}"
    );
    assert_eq!(d, before);
    assert_eq!(by_vary_name("Deflection"), Some(&DEFLECTION));
    assert_eq!(by_adjust_name("brake"), Some(&BRAKE_VISCOUS));
    assert_eq!(by_adjust_name("cd"), None);
}

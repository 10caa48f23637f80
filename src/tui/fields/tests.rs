use super::*;
use crate::catalogue::{
    BRAKE_QUADRATIC, BRAKE_VISCOUS, D50, INLET_PRESSURE, LAYOUT, NOZZLE_CD, NOZZLE_DIAMETER,
    RADIUS, SEAL_PER_PRESSURE, SUPPLY, WATER_TEMPERATURE, WIND_FROM,
};
use crate::physics::design::Bearing;
use crate::scenario::builtin_example;

fn design() -> Design {
    builtin_example().to_design().unwrap()
}

#[test]
fn the_list_follows_the_catalogue_with_headings() {
    let d = design();
    let rows = rows(&d, Arms::Apart);
    assert_eq!(rows.first(), Some(&Row::Group(Group::Supply)));
    assert_eq!(rows.get(1), Some(&Row::Field(Field::of(&SUPPLY))));
    let groups: Vec<Group> = rows
        .iter()
        .filter_map(|r| match r {
            Row::Group(g) => Some(*g),
            _ => None,
        })
        .collect();
    assert_eq!(groups, Group::ALL);
    let headings = rows
        .iter()
        .filter(|r| matches!(r, Row::ArmHeading(_)))
        .count();
    assert_eq!(headings, d.rotor.arms.len());
    // The nozzle leads each arm (it is what gets tuned).
    let k = rows.iter().position(|r| *r == Row::ArmHeading(1)).unwrap();
    assert_eq!(
        rows.get(k + 1),
        Some(&Row::Field(Field::on_arm(&NOZZLE_DIAMETER, 1)))
    );
}

#[test]
fn every_listed_number_reads_back_what_it_wrote() {
    let d = design();
    for row in rows(&d, Arms::Apart) {
        let Row::Field(f) = row else { continue };
        if f.kind() != Kind::Number {
            continue;
        }
        let v = f.number(&d).unwrap_or_else(|| panic!("{f:?} has no value"));
        let mut e = d.clone();
        assert!(f.set_number(&mut e, Some(v * 1.5 + 0.25)), "{f:?}");
        let back = f.number(&e).unwrap();
        assert!((back - (v * 1.5 + 0.25)).abs() < 1e-12, "{f:?}");
    }
}

#[test]
fn steps_are_round_in_both_systems() {
    let nozzle = Field::on_arm(&NOZZLE_DIAMETER, 0);
    assert_eq!(display_step(nozzle, UnitSystem::Metric, Stride::Fine), 0.1);
    // 0.1 mm = 0.0039 in → 0.005 in.
    assert!((display_step(nozzle, UnitSystem::Us, Stride::Fine) - 0.005).abs() < 1e-15);
    let p = Field::of(&INLET_PRESSURE);
    assert_eq!(display_step(p, UnitSystem::Metric, Stride::Coarse), 50.0);
    // 5 kPa = 0.725 psi → 1 psi.
    assert_eq!(display_step(p, UnitSystem::Us, Stride::Fine), 1.0);
    // 1 °C = 1.8 °F → 2 °F (a difference, no offset).
    let w = Field::of(&WATER_TEMPERATURE);
    assert_eq!(display_step(w, UnitSystem::Us, Stride::Fine), 2.0);
}

#[test]
fn wind_direction_states_its_reference_and_steps_by_an_eighth_turn() {
    // Issue 14: the direction had no stated reference and a ±200° coarse step.
    let f = Field::of(&WIND_FROM);
    assert!(
        f.label().contains("from") && f.label().contains("+x"),
        "{}",
        f.label()
    );
    assert!(
        f.describe().contains("counter-clockwise from +x"),
        "{}",
        f.describe()
    );
    for system in [UnitSystem::Metric, UnitSystem::Us] {
        assert_eq!(display_step(f, system, Stride::Fine), 5.0);
        assert_eq!(display_step(f, system, Stride::Coarse), 45.0);
    }
    let next = nudged(f, 0.0, UnitSystem::Metric, true, Stride::Coarse);
    assert!((next - 45f64.to_radians()).abs() < 1e-12);
}

#[test]
fn brakes_show_their_units() {
    // Issue 14: "brake c1/c2" had no unit.
    let d = design();
    let c1 = Field::of(&BRAKE_VISCOUS);
    let c2 = Field::of(&BRAKE_QUADRATIC);
    assert!(c1.label().contains("c₁") && c2.label().contains("c₂"));
    for system in [UnitSystem::Metric, UnitSystem::Us] {
        assert!(
            c1.show(&d, system).ends_with(" N·m·s"),
            "{}",
            c1.show(&d, system)
        );
        assert!(
            c2.show(&d, system).ends_with(" N·m·s²"),
            "{}",
            c2.show(&d, system)
        );
    }
    let seed = c1.typing_seed(&d, UnitSystem::Metric);
    let back = parse_typed(c1, &seed, UnitSystem::Metric).unwrap().unwrap();
    assert!((back - c1.number(&d).unwrap()).abs() < 1e-9, "{seed}");
}

#[test]
fn seal_slope_is_shown_per_pressure() {
    // Issue 14: "seal per kPa" was shown in N·m.
    let mut d = design();
    d.friction.seal.per_pa_n_m = 2.0e-6; // 0.002 N·m per kPa
    let f = Field::of(&SEAL_PER_PRESSURE);
    assert_eq!(f.show(&d, UnitSystem::Metric), "0.00200 N·m/kPa");
    // 2e-6 N·m/Pa × 6894.76 Pa/psi = 0.01379 N·m/psi = 0.122 lbf·in/psi.
    assert_eq!(f.show(&d, UnitSystem::Us), "0.122 lbf·in/psi");
    let typed = parse_typed(f, "0.003N·m/kPa", UnitSystem::Us)
        .unwrap()
        .unwrap();
    assert!((typed - 3.0e-6).abs() < 1e-15);
    let up = nudged(f, 2.0e-6, UnitSystem::Metric, true, Stride::Fine);
    assert!((up - 2.01e-6).abs() < 1e-15, "{up}");
}

#[test]
fn nudges_land_on_round_values() {
    let f = Field::on_arm(&NOZZLE_DIAMETER, 0);
    let up = nudged(f, 2.43e-3, UnitSystem::Metric, true, Stride::Fine);
    assert!((up - 2.5e-3).abs() < 1e-12, "{up}");
    let down = nudged(f, 2.43e-3, UnitSystem::Metric, false, Stride::Fine);
    assert!((down - 2.4e-3).abs() < 1e-12, "{down}");
    let from_grid = nudged(f, 2.4e-3, UnitSystem::Metric, false, Stride::Fine);
    assert!((from_grid - 2.3e-3).abs() < 1e-12, "{from_grid}");
    let p = nudged(
        Field::of(&INLET_PRESSURE),
        300e3,
        UnitSystem::Metric,
        true,
        Stride::Coarse,
    );
    assert!((p - 350e3).abs() < 1e-6);
    let t = nudged(
        Field::of(&WATER_TEMPERATURE),
        15.0,
        UnitSystem::Us,
        true,
        Stride::Fine,
    );
    // 15 °C = 59 °F → 60 °F = 15.56 °C.
    assert!((t - (60.0 - 32.0) / 1.8).abs() < 1e-9, "{t}");
}

#[test]
fn typed_values_need_a_unit_of_the_right_kind_or_the_shown_one() {
    let f = Field::of(&INLET_PRESSURE);
    let m = UnitSystem::Metric;
    assert_eq!(parse_typed(f, "2.8bar", m), Ok(Some(2.8e5)));
    let psi = parse_typed(f, "45psi", m).unwrap().unwrap();
    assert!((psi - 45.0 * crate::units::factor::PSI_PA).abs() < 1e-6);
    assert_eq!(parse_typed(f, "300", m), Ok(Some(300e3)));
    let e = parse_typed(f, "3m", m).unwrap_err();
    assert!(e.0.contains("pressure"), "{}", e.0);
    let arm = Field::on_arm(&RADIUS, 0);
    let r = parse_typed(arm, "6.5in", m).unwrap().unwrap();
    assert!((r - 0.1651).abs() < 1e-12);
    assert_eq!(parse_typed(Field::of(&D50), "auto", m), Ok(None));
    let cd = Field::on_arm(&NOZZLE_CD, 0);
    assert!(parse_typed(cd, "high", m).is_err());
    assert!(parse_typed(cd, "inf", m).is_err());
}

#[test]
fn typing_seed_reads_back_to_the_same_value() {
    let d = design();
    for system in [UnitSystem::Metric, UnitSystem::Us] {
        for row in rows(&d, Arms::Apart) {
            let Row::Field(f) = row else { continue };
            if f.kind() != Kind::Number {
                continue;
            }
            let v = f.number(&d).unwrap();
            let seed = f.typing_seed(&d, system);
            let back = parse_typed(f, &seed, system)
                .unwrap_or_else(|e| panic!("{f:?} `{seed}`: {}", e.0))
                .unwrap();
            assert!(
                (back - v).abs() <= 1e-5 * v.abs().max(1e-9),
                "{f:?} {system}: `{seed}` → {back}, want {v}"
            );
        }
    }
}

#[test]
fn choices_cycle_through_every_option_and_back() {
    let d = design();
    let Bearing::Washer(washer) = d.friction.bearing else {
        panic!("the example has a washer")
    };
    let hint = ChoiceHint {
        inlet_pa: 300e3,
        flow_m3_s: 3e-4,
        inertia_kg_m2: 1e-3,
        running_n_m: 0.02,
        breakaway_n_m: 0.03,
        washer,
        spacing_m: 8.0,
    };
    for (input, n) in [
        (&SUPPLY, 3),
        (&LAYOUT, 4),
        (&crate::catalogue::BEARING, 2),
        (&crate::catalogue::INERTIA, 2),
        (&crate::catalogue::RADIUS_RULE, 2),
    ] {
        let f = Field::of(input);
        let mut e = d.clone();
        let mut seen = vec![f.get(&e)];
        for _ in 0..n {
            assert!(f.cycle(&mut e, true, &hint));
            seen.push(f.get(&e));
        }
        assert_eq!(seen.first(), seen.last(), "{f:?}");
        seen.pop();
        seen.dedup();
        assert_eq!(seen.len(), n, "{f:?}");
    }
}

#[test]
fn the_whole_rotor_block_edits_every_arm_and_keeps_them_spread() {
    let d = design();
    assert_eq!(arms_alike(&d), Ok(()));
    let together = rows(&d, Arms::Together);
    assert_eq!(
        together
            .iter()
            .filter(|r| **r == Row::AllArmsHeading)
            .count(),
        1
    );
    assert!(!together.iter().any(|r| matches!(r, Row::ArmHeading(_))));
    let radius = Field::of(&RADIUS);
    assert!(radius.all_arms());
    assert!(together.contains(&Row::Field(radius)));
    let mut e = d.clone();
    assert!(radius.set_number(&mut e, Some(0.31)));
    assert!(e.rotor.arms.iter().all(|a| a.radius_m == 0.31));
    assert_eq!(arms_alike(&e), Ok(()));
    // Turning the rotor keeps the arms evenly spread.
    let az = Field::of(&crate::catalogue::AZIMUTH);
    assert!(az.set_number(&mut e, Some(10f64.to_radians())));
    assert_eq!(arms_alike(&e), Ok(()));
    // One arm changed: they are no longer alike, and it says how.
    assert!(Field::on_arm(&NOZZLE_CD, 1).set_number(&mut e, Some(0.9)));
    assert_eq!(arms_alike(&e), Err("the arms differ in Cd".to_string()));
    // Seven arms written to six figures are still evenly spread.
    let mut g = d.clone();
    g.rotor.arms = vec![g.rotor.arms[0]; 7];
    respace(&mut g);
    for a in &mut g.rotor.arms {
        let deg: f64 = format!("{:.5e}", a.azimuth_rad.to_degrees())
            .parse()
            .unwrap();
        a.azimuth_rad = deg.to_radians();
    }
    assert_eq!(arms_alike(&g), Ok(()));
    let mut f = d.clone();
    f.rotor.arms[2].azimuth_rad += 0.1;
    assert!(arms_alike(&f).unwrap_err().contains("evenly spread"));
}

#[test]
fn the_finer_step_is_a_tenth_of_the_fine_one() {
    let f = Field::of(&crate::catalogue::DEFLECTION);
    let m = UnitSystem::Metric;
    assert_eq!(display_step(f, m, Stride::Fine), 1.0);
    assert!((display_step(f, m, Stride::Finer) - 0.1).abs() < 1e-15);
    let from = 87f64.to_radians();
    let up = nudged(f, from, m, true, Stride::Finer);
    assert!(((up - from).to_degrees() - 0.1).abs() < 1e-9, "{up}");
}

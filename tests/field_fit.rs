//! The technician's check (model.md M10) and the fits to readings (M12):
//! findings that agree with their numbers over random designs, several
//! readings fitted back, a coast-down against its closed-form solution.

use proptest::prelude::*;
use spinwright::physics::balance::{rpm, solve};
use spinwright::physics::field::{
    check, Alone, CauseEvidence, Detail, Direction, FieldReading, FieldTolerances, FlowReading,
    RotationReading,
};
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

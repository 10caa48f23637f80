//! Unit tests of the design search (the driver, the starts, bad requests).

use super::*;
use crate::catalogue::{DEFLECTION, INLET_PRESSURE, NOZZLE_DIAMETER};
use crate::physics::balance::{rpm, solve};
use crate::physics::fixtures::three_arm_rotor;

fn quick() -> SearchOptions {
    SearchOptions {
        starts: 4,
        max_iters: 25,
        ..SearchOptions::default()
    }
}

#[test]
fn latin_hypercube_uses_each_stratum_once_per_axis() {
    let pts = latin_hypercube(8, 3, 7);
    assert_eq!(pts.len(), 8);
    for axis in 0..3 {
        let mut strata: Vec<usize> = pts.iter().map(|p| (p[axis] * 8.0) as usize).collect();
        strata.sort_unstable();
        assert_eq!(strata, (0..8).collect::<Vec<_>>());
    }
    assert_eq!(pts, latin_hypercube(8, 3, 7), "same seed, same starts");
}

#[test]
fn bad_requests_are_errors() {
    let d = three_arm_rotor();
    let none = |_: usize, _: usize| {};
    let g = Goals::default();
    let o = quick();
    assert_eq!(
        search(&d, &[], &g, Objective::Throw, &o, &none).unwrap_err(),
        SearchError::NoFree
    );
    let f = Free {
        input: &DEFLECTION,
        from: 0.5,
        to: 0.1,
    };
    assert!(matches!(
        search(&d, &[f], &g, Objective::Throw, &o, &none),
        Err(SearchError::BadRange(_))
    ));
    let f = Free {
        input: &DEFLECTION,
        from: 0.1,
        to: 0.5,
    };
    assert!(matches!(
        search(&d, &[f, f], &g, Objective::Throw, &o, &none),
        Err(SearchError::Clash(..))
    ));
    let mut no_layout = d.clone();
    no_layout.layout = None;
    assert!(matches!(
        search(&no_layout, &[f], &g, Objective::Cu, &o, &none),
        Err(SearchError::NeedsLayout(_))
    ));
}

#[test]
fn a_speed_band_and_throw_are_met_and_checked_with_the_full_solve() {
    let d = three_arm_rotor();
    let free = [
        Free {
            input: &DEFLECTION,
            from: 20f64.to_radians(),
            to: 80f64.to_radians(),
        },
        Free {
            input: &INLET_PRESSURE,
            from: 150e3,
            to: 400e3,
        },
    ];
    let goals = Goals {
        rpm: Some((25.0, 35.0)),
        ..Goals::default()
    };
    let r = search(&d, &free, &goals, Objective::Throw, &quick(), &|_, _| {}).unwrap();
    assert!(r.feasible(), "{:?}", r.best);
    let report = solve(&r.design);
    let got = rpm(report.operating.as_ref().unwrap().omega_rad_s());
    assert!((25.0..=35.0).contains(&got), "{got}");
    assert!(r.evaluations > 20);
    for ru in &r.runners_up {
        assert!(ru.feasible());
        assert!(ru.objective.unwrap() <= r.best.objective.unwrap() + 1e-9);
    }
    assert_eq!(r.sensitivity.len(), 2);
}

#[test]
fn an_impossible_goal_is_reported_with_how_close_it_came() {
    let d = three_arm_rotor();
    let free = [Free {
        input: &NOZZLE_DIAMETER,
        from: 1.5e-3,
        to: 3e-3,
    }];
    let goals = Goals {
        min_throw_m: Some(500.0),
        ..Goals::default()
    };
    let r = search(&d, &free, &goals, Objective::Margin, &quick(), &|_, _| {}).unwrap();
    assert!(!r.feasible());
    let c = r
        .closest
        .iter()
        .find(|c| c.goal == GoalKind::MinThrow)
        .unwrap();
    assert!(c.best.unwrap() > 1.0 && c.best.unwrap() < 500.0, "{c:?}");
}

//! Unit tests of `balance.rs`.

use super::*;
use crate::physics::fixtures::three_arm_rotor;

#[test]
fn table_rows_gather_where_the_action_is() {
    // Operating point 3 rad/s, top 100 rad/s: at least half the rows lie
    // between rest and 1.5 ω_op, ω_op is a row, the count is exact, the
    // speeds rise from 0 to the top (the rule in model.md M6).
    for n in [8, 11, 41, 200] {
        let s = table_speeds(100.0, Some(3.0), n);
        assert_eq!(s.len(), n);
        assert_eq!(s.first().copied(), Some(0.0));
        assert_eq!(s.last().copied(), Some(100.0));
        assert!(s.windows(2).all(|w| w[1] > w[0]), "{s:?}");
        let near = s.iter().filter(|&&w| w <= 1.5 * 3.0 + 1e-12).count();
        assert!(2 * near >= n, "{near} of {n} below 1.5 ω_op");
        assert!(s.iter().any(|&w| (w - 3.0).abs() < 1e-12));
        // Steps past 1.5 ω_op grow.
        let far: Vec<f64> = s.iter().copied().filter(|&w| w >= 4.5 - 1e-12).collect();
        assert!(far.windows(3).all(|w| w[2] - w[1] >= w[1] - w[0] - 1e-9));
    }
    // No operating point, or too few rows: even steps, as before.
    assert_eq!(table_speeds(10.0, None, 3), vec![0.0, 5.0, 10.0]);
    assert_eq!(table_speeds(10.0, Some(2.0), 5).len(), 5);
    assert_eq!(table_speeds(10.0, Some(2.0), 2), vec![0.0, 10.0]);
}

#[test]
fn three_arm_rotor_runs_and_balances() {
    let d = three_arm_rotor();
    let r = solve(&d);
    assert_eq!(r.status, SpinStatus::Running);
    let op = r.operating.as_ref().expect("running");
    let p = &op.point;
    assert!(p.net_n_m().abs() <= 1e-9 * p.drive_n_m);
}

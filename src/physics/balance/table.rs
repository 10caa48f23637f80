//! The torque–speed table (model.md M6): drive, resisting and net torque from
//! rest to past runaway, its rows dense where the rotor starts and runs.

use super::{OperatingPoint, SpinModel, SpinReport, TorquePoint};
use crate::physics::design::Design;

/// One row of the torque–speed table.
pub type TableRow = TorquePoint;

/// Torque–speed table from rest to past runaway, `points` rows (at least 2).
///
/// The top speed is 1.15 × the frictionless runaway when there is one, else
/// 1.5 × the highest equilibrium, else ω_cap. The speeds are
/// [`table_speeds`]: dense from rest to the operating point and around it,
/// coarser out to the top.
pub fn torque_table(design: &Design, report: &SpinReport, points: usize) -> Vec<TableRow> {
    torque_table_to(design, report, table_top_speed(report), points)
}

/// As [`torque_table`], from rest to `top_rad_s` (a chart's own top speed).
pub fn torque_table_to(
    design: &Design,
    report: &SpinReport,
    top_rad_s: f64,
    points: usize,
) -> Vec<TableRow> {
    let model = SpinModel::new(design);
    let top = top_rad_s;
    let op = report.operating.as_ref().map(OperatingPoint::omega_rad_s);
    table_speeds(top, op, points)
        .into_iter()
        .map(|w| model.point(w))
        .collect()
}

/// Speeds of the torque–speed table, rad/s, rising from 0 to `top`, exactly
/// `points` of them (at least 2).
///
/// Without an operating point ω_op inside (0, top/1.5), or with fewer than
/// 8 points, they are evenly spaced. Otherwise (model.md M6, "the table"):
/// 45 % of the rows (at least 3) run evenly from rest to ω_op, which is a row
/// of its own; 20 % (at least 2) run evenly on to 1.5 ω_op; the rest step out
/// to `top` in a geometric progression, so the steps grow away from the
/// operating point. At least half the rows lie between rest and 1.5 ω_op.
pub fn table_speeds(top: f64, operating_rad_s: Option<f64>, points: usize) -> Vec<f64> {
    let n = points.max(2);
    let even = |n: usize| -> Vec<f64> { (0..n).map(|k| top * k as f64 / (n - 1) as f64).collect() };
    let op = match operating_rad_s {
        Some(w) if w.is_finite() && w > 0.0 && 1.5 * w < top && n >= 8 => w,
        _ => return even(n),
    };
    let n_rise = ((0.45 * n as f64).round() as usize).max(3);
    let n_near = ((0.20 * n as f64).round() as usize).max(2);
    let n_far = n.saturating_sub(n_rise + n_near).max(1);
    let n_rise = n - n_near - n_far;
    let mut speeds = Vec::with_capacity(n);
    // Rest to ω_op inclusive: n_rise rows.
    speeds.extend((0..n_rise).map(|k| op * k as f64 / (n_rise - 1) as f64));
    // Past ω_op to 1.5 ω_op inclusive: n_near rows.
    speeds.extend((1..=n_near).map(|k| op * (1.0 + 0.5 * k as f64 / n_near as f64)));
    // Past 1.5 ω_op to the top inclusive: n_far rows, a geometric progression.
    let from = 1.5 * op;
    let ratio = (top / from).powf(1.0 / n_far as f64);
    speeds.extend((1..=n_far).map(|k| {
        if k == n_far {
            top
        } else {
            from * ratio.powi(k as i32)
        }
    }));
    speeds
}

/// The top speed of the torque–speed table, rad/s.
pub fn table_top_speed(report: &SpinReport) -> f64 {
    if let Some(r) = report.runaway_rad_s {
        1.15 * r
    } else if let Some(e) = report.equilibria.last() {
        1.5 * e.omega_rad_s
    } else {
        report.omega_cap_rad_s
    }
}

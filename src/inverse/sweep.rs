//! Sweeps: one or two design inputs over a grid, the full spin model solved
//! at every point.
//!
//! An axis varies one catalogue input that may be varied (see
//! [`crate::catalogue::Vary`]): per-arm inputs move all arms together and keep
//! their offsets. The points are solved in parallel (rayon) and the rows come
//! back in grid order (first axis outer). A point that stalls or finds no
//! equilibrium is a row with that status; a sweep never aborts on a physical
//! state.

use std::sync::atomic::{AtomicUsize, Ordering};

use rayon::prelude::*;

use crate::catalogue::{How, Input, VaryError};
use crate::physics::balance::{rpm, solve_speed, SpinReport, SpinStatus};
use crate::physics::design::Design;
/// One axis of a sweep: `steps` evenly spaced values from `from` to `to`
/// inclusive, SI.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SweepAxis {
    /// What is varied (a catalogue input with a [`crate::catalogue::Vary`]).
    pub input: &'static Input,
    /// First value, SI.
    pub from: f64,
    /// Last value, SI.
    pub to: f64,
    /// Number of values along the axis, both ends included (1 means `from` alone).
    pub steps: usize,
}

impl SweepAxis {
    /// The values along the axis, SI.
    pub fn values(&self) -> Vec<f64> {
        match self.steps {
            0 => Vec::new(),
            1 => vec![self.from],
            n => (0..n)
                .map(|k| {
                    let t = k as f64 / (n - 1) as f64;
                    self.from + (self.to - self.from) * t
                })
                .collect(),
        }
    }
}

/// A sweep that cannot be run as asked.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SweepError {
    /// Zero axes or more than two.
    #[error("a sweep varies one or two inputs, not {0}")]
    AxisCount(usize),
    /// An axis with no points.
    #[error("`{0}`: a sweep axis needs at least one step")]
    NoSteps(&'static str),
    /// The same input on both axes, or two that both set the supply.
    #[error("`{0}` and `{1}` cannot be varied together: {2}")]
    Clash(&'static str, &'static str, &'static str),
    /// An end of an axis the design cannot take.
    #[error("sweep axis: {0}")]
    Value(#[from] VaryError),
}

/// The state of one sweep point.
#[derive(Debug, Clone, PartialEq)]
pub enum RowStatus {
    /// Solved: running, stalled at rest, or no equilibrium.
    Spin(SpinStatus),
    /// The design could not take the point's values.
    Invalid(VaryError),
}

impl RowStatus {
    /// The key used in CSV and JSON: the spin status key, or "invalid".
    pub fn key(&self) -> &'static str {
        match self {
            RowStatus::Spin(s) => s.key(),
            RowStatus::Invalid(_) => "invalid",
        }
    }
}

/// One point of a sweep.
#[derive(Debug, Clone, PartialEq)]
pub struct SweepRow<E> {
    /// The values of the varied inputs, one per axis, SI.
    pub values: Vec<f64>,
    /// How the point came out.
    pub status: RowStatus,
    /// Operating speed, rpm (when running).
    pub rpm: Option<f64>,
    /// Stall over breakaway torque (when breakaway is above zero).
    pub start_margin: Option<f64>,
    /// Total flow, m³/s: at the operating point when running, at rest when the
    /// rotor stalls (it sits and sprays), none without an equilibrium.
    pub total_flow_m3_s: Option<f64>,
    /// What the per-point closure returned (None for an invalid point).
    pub extra: Option<E>,
}

/// A finished sweep: its axes and one row per grid point, first axis outer.
#[derive(Debug, Clone, PartialEq)]
pub struct Sweep<E> {
    /// The axes, as given.
    pub axes: Vec<SweepAxis>,
    /// The rows, in grid order.
    pub rows: Vec<SweepRow<E>>,
}

/// Key results of one solved design, as a sweep row reports them.
pub(crate) fn summarize(report: &SpinReport) -> (Option<f64>, Option<f64>, Option<f64>) {
    let rpm_op = report.operating.as_ref().map(|op| rpm(op.omega_rad_s()));
    let flow = match report.status {
        SpinStatus::Running => report
            .operating
            .as_ref()
            .map(|op| op.point.state.total_flow_m3_s),
        SpinStatus::StallsAtRest => Some(report.at_rest.total_flow_m3_s),
        SpinStatus::NoEquilibrium => None,
    };
    (rpm_op, report.start_margin, flow)
}

fn check_axes(design: &Design, axes: &[SweepAxis]) -> Result<(), SweepError> {
    if axes.is_empty() || axes.len() > 2 {
        return Err(SweepError::AxisCount(axes.len()));
    }
    for axis in axes {
        if axis.steps == 0 {
            return Err(SweepError::NoSteps(axis.input.vary_name()));
        }
        for v in [axis.from, axis.to] {
            axis.input.vary_to(&mut design.clone(), v)?;
        }
    }
    if let [a, b] = axes {
        let (pa, pb) = (a.input, b.input);
        if pa == pb {
            return Err(SweepError::Clash(
                pa.vary_name(),
                pb.vary_name(),
                "the same input twice",
            ));
        }
        if sets_supply(pa) && sets_supply(pb) {
            return Err(SweepError::Clash(
                pa.vary_name(),
                pb.vary_name(),
                "both set the supply; vary one",
            ));
        }
    }
    Ok(())
}

/// Sweep one or two parameters over a grid, solving the full model at every
/// point in parallel. `progress(done, total)` is called after each point, from
/// whichever worker finished it.
pub fn sweep(
    design: &Design,
    axes: &[SweepAxis],
    progress: &(dyn Fn(usize, usize) + Sync),
) -> Result<Sweep<()>, SweepError> {
    sweep_with(design, axes, &|_, _| (), progress)
}

/// [`sweep`] with a per-point closure (throw, CU…) run on each solved point;
/// its result lands in [`SweepRow::extra`].
pub fn sweep_with<E: Send>(
    design: &Design,
    axes: &[SweepAxis],
    extra: &(dyn Fn(&Design, &SpinReport) -> E + Sync),
    progress: &(dyn Fn(usize, usize) + Sync),
) -> Result<Sweep<E>, SweepError> {
    check_axes(design, axes)?;
    let per_axis: Vec<Vec<f64>> = axes.iter().map(SweepAxis::values).collect();
    let points: Vec<Vec<f64>> = match per_axis.as_slice() {
        [a] => a.iter().map(|&x| vec![x]).collect(),
        [a, b] => a
            .iter()
            .flat_map(|&x| b.iter().map(move |&y| vec![x, y]))
            .collect(),
        _ => Vec::new(),
    };
    let total = points.len();
    let done = AtomicUsize::new(0);
    let rows = points
        .into_par_iter()
        .map(|values| {
            let row = sweep_point(design, axes, values, extra);
            let n = done.fetch_add(1, Ordering::Relaxed) + 1;
            progress(n, total);
            row
        })
        .collect();
    Ok(Sweep {
        axes: axes.to_vec(),
        rows,
    })
}

fn sweep_point<E>(
    design: &Design,
    axes: &[SweepAxis],
    values: Vec<f64>,
    extra: &(dyn Fn(&Design, &SpinReport) -> E + Sync),
) -> SweepRow<E> {
    let mut point = design.clone();
    for (axis, &v) in axes.iter().zip(&values) {
        if let Err(e) = axis.input.vary_to(&mut point, v) {
            return SweepRow {
                values,
                status: RowStatus::Invalid(e),
                rpm: None,
                start_margin: None,
                total_flow_m3_s: None,
                extra: None,
            };
        }
    }
    let report = solve_speed(&point);
    let (rpm_op, start_margin, flow) = summarize(&report);
    SweepRow {
        values,
        status: RowStatus::Spin(report.status),
        rpm: rpm_op,
        start_margin,
        total_flow_m3_s: flow,
        extra: Some(extra(&point, &report)),
    }
}

/// True for the inputs that replace the supply (pressure, flow).
fn sets_supply(input: &Input) -> bool {
    matches!(
        input.vary.map(|v| v.how),
        Some(How::SupplyPressure | How::SupplyFlow)
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalogue::{self, DEFLECTION, ELEVATION, INLET_PRESSURE, NOZZLE_DIAMETER, RADIUS};
    use crate::catalogue::{BRAKE_VISCOUS, RUNNING, TOTAL_FLOW};
    use crate::physics::design::Supply;
    use crate::physics::fixtures::three_arm_rotor;
    use std::f64::consts::PI;

    const DEG: f64 = PI / 180.0;

    #[test]
    fn names_round_trip_and_keys_carry_units() {
        for p in catalogue::varied() {
            assert_eq!(catalogue::by_vary_name(p.vary_name()), Some(p));
            assert!(p.vary_key().starts_with(p.vary_name()));
        }
        assert_eq!(catalogue::by_vary_name("Deflection"), Some(&DEFLECTION));
        assert_eq!(catalogue::by_vary_name("warp"), None);
    }

    #[test]
    fn arm_inputs_keep_offsets_between_arms() {
        let mut d = three_arm_rotor();
        d.rotor.arms[0].nozzle.deflection_rad = 10.0 * DEG;
        d.rotor.arms[1].nozzle.deflection_rad = 15.0 * DEG;
        d.rotor.arms[2].nozzle.deflection_rad = 20.0 * DEG;
        d.rotor.arms[1].radius_m = 0.2;
        DEFLECTION.vary_to(&mut d, 25.0 * DEG).unwrap();
        let defl: Vec<f64> = d
            .rotor
            .arms
            .iter()
            .map(|a| a.nozzle.deflection_rad / DEG)
            .collect();
        for (got, want) in defl.iter().zip([20.0, 25.0, 30.0]) {
            assert!((got - want).abs() < 1e-12, "{defl:?}");
        }
        // Radii 0.16, 0.20, 0.16: mean 0.17333; scaled to mean 0.26 → ×1.5.
        RADIUS.vary_to(&mut d, 0.26).unwrap();
        let radii: Vec<f64> = d.rotor.arms.iter().map(|a| a.radius_m).collect();
        for (got, want) in radii.iter().zip([0.24, 0.30, 0.24]) {
            assert!((got - want).abs() < 1e-12, "{radii:?}");
        }
        assert!((RADIUS.varied_value(&d).unwrap() - 0.26).abs() < 1e-12);
    }

    #[test]
    fn out_of_range_values_are_refused_and_leave_the_design_alone() {
        let d0 = three_arm_rotor();
        let mut d = d0.clone();
        let e = ELEVATION.vary_to(&mut d, 100.0 * DEG).unwrap_err();
        assert!(e.to_string().contains("elevation"), "{e}");
        assert!(NOZZLE_DIAMETER.vary_to(&mut d, -1e-3).is_err());
        assert!(RADIUS.vary_to(&mut d, 0.005).is_err());
        assert!(RUNNING.vary_to(&mut d, 0.01).is_err());
        assert!(BRAKE_VISCOUS.vary_to(&mut d, f64::NAN).is_err());
        assert_eq!(d, d0);
    }

    #[test]
    fn supply_inputs_replace_the_supply() {
        let mut d = three_arm_rotor();
        TOTAL_FLOW.vary_to(&mut d, 3e-4).unwrap();
        assert_eq!(d.supply, Supply::Flow { total_m3_s: 3e-4 });
        assert_eq!(INLET_PRESSURE.varied_value(&d), None);
        INLET_PRESSURE.vary_to(&mut d, 2e5).unwrap();
        assert_eq!(d.supply, Supply::Pressure { inlet_pa: 2e5 });
    }

    #[test]
    fn axis_values_include_both_ends() {
        let axis = SweepAxis {
            input: &INLET_PRESSURE,
            from: 100e3,
            to: 300e3,
            steps: 5,
        };
        assert_eq!(axis.values(), vec![100e3, 150e3, 200e3, 250e3, 300e3]);
    }

    #[test]
    fn bad_axes_are_errors_not_rows() {
        let d = three_arm_rotor();
        let axis = |p: &'static Input, from, to| SweepAxis {
            input: p,
            from,
            to,
            steps: 3,
        };
        let none = |_: usize, _: usize| {};
        assert!(matches!(
            sweep(&d, &[], &none),
            Err(SweepError::AxisCount(0))
        ));
        assert!(matches!(
            sweep(
                &d,
                &[
                    axis(&INLET_PRESSURE, 1e5, 2e5),
                    axis(&TOTAL_FLOW, 1e-4, 2e-4)
                ],
                &none
            ),
            Err(SweepError::Clash(..))
        ));
        assert!(matches!(
            sweep(&d, &[axis(&ELEVATION, 0.0, 2.0)], &none),
            Err(SweepError::Value(_))
        ));
    }

    #[test]
    fn a_stalling_point_is_a_row_and_progress_counts_every_point() {
        let d = three_arm_rotor();
        // 0 Pa: no flow, no drive: stalls at rest. 280 kPa: runs.
        let axis = SweepAxis {
            input: &INLET_PRESSURE,
            from: 0.0,
            to: 280e3,
            steps: 3,
        };
        let calls = AtomicUsize::new(0);
        let last = AtomicUsize::new(0);
        let s = sweep(&d, &[axis], &|done, total| {
            calls.fetch_add(1, Ordering::Relaxed);
            last.fetch_max(done, Ordering::Relaxed);
            assert_eq!(total, 3);
        })
        .unwrap();
        assert_eq!(calls.load(Ordering::Relaxed), 3);
        assert_eq!(last.load(Ordering::Relaxed), 3);
        assert_eq!(s.rows[0].status, RowStatus::Spin(SpinStatus::StallsAtRest));
        assert_eq!(s.rows[0].rpm, None);
        assert_eq!(s.rows[2].status, RowStatus::Spin(SpinStatus::Running));
        assert!(s.rows[2].rpm.unwrap() > 0.0);
    }
}

//! Design studies: named parameters, sweeps over one or two of them, and
//! side-by-side comparison of designs.
//!
//! A [`Parameter`] is one number of a [`Design`] that a study may vary, always
//! in SI. Parameters that live on every arm (deflection, elevation, radius,
//! nozzle, tube bore, height, C_d, C_v) are changed on all arms together and
//! keep the differences between arms: angles and heights are *shifted* so that
//! their mean takes the new value, lengths and coefficients are *scaled* so that
//! their mean takes it. A design with identical arms simply gets the value on
//! every arm.
//!
//! A sweep solves the full spin model ([`solve`]) at every point of a one- or
//! two-axis grid, in parallel (rayon), and returns the rows in grid order
//! (first axis outer). A point that stalls or finds no equilibrium is a row with
//! that status; a sweep never aborts on a physical state.
//!
//! [`compare`] flattens two or more designs into (field path, SI value, unit)
//! triples, lists the inputs that differ, and puts the key results side by side
//! with deltas and percentages against the first design.

use std::collections::HashMap;
use std::sync::atomic::{AtomicUsize, Ordering};

use rayon::prelude::*;

use super::balance::{rpm, solve, solve_speed, SpinReport, SpinStatus};
use super::design::{Bearing, Design, Inertia, Layout, Supply, WasherRule};

/// A design number that a sweep, a comparison or a target search can vary (SI).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Parameter {
    /// Nozzle deflection from the backward tangent, rad (mean over arms; shifted).
    Deflection,
    /// Nozzle elevation above horizontal, rad (mean over arms; shifted).
    Elevation,
    /// Arm radius, m (mean over arms; scaled, a given tube length scales with it).
    Radius,
    /// Nozzle exit diameter, m (mean over arms; scaled).
    Nozzle,
    /// Supply pressure, Pa: the inlet pressure, or a hose's source pressure; a
    /// fixed-flow supply becomes a fixed inlet pressure.
    Pressure,
    /// Total flow, m³/s: the supply becomes a fixed total flow.
    Flow,
    /// Viscous brake coefficient c₁, N·m·s/rad.
    Viscous,
    /// Quadratic (fluid) brake coefficient c₂, N·m·s²/rad².
    Quadratic,
    /// Kinetic friction coefficient of a washer bearing.
    Mu,
    /// Static friction coefficient of a washer bearing.
    MuStatic,
    /// Running torque of a measured bearing, N·m.
    Running,
    /// Breakaway torque of a measured bearing, N·m.
    Breakaway,
    /// Nozzle discharge coefficient C_d (mean over arms; scaled).
    Cd,
    /// Nozzle velocity coefficient C_v (mean over arms; scaled).
    Cv,
    /// Arm tube bore, m (mean over arms; scaled).
    Bore,
    /// Nozzle height above ground, m (mean over arms; shifted).
    Height,
    /// Water temperature, °C.
    WaterTemperature,
    /// Wind speed, m/s.
    Wind,
}

/// A value a parameter cannot take, or a parameter the design does not have.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("`{name}` = {value} {unit}: {reason}")]
pub struct ParameterError {
    /// The parameter's name.
    pub name: &'static str,
    /// The value tried, SI.
    pub value: f64,
    /// Its SI unit.
    pub unit: &'static str,
    /// What is wrong, in words.
    pub reason: String,
}

/// How a per-arm parameter takes a new mean value.
enum ArmRule {
    /// Add the same amount to every arm.
    Shift,
    /// Multiply every arm by the same factor.
    Scale,
}

impl Parameter {
    /// Every parameter, in a fixed order.
    pub const ALL: [Parameter; 18] = [
        Parameter::Deflection,
        Parameter::Elevation,
        Parameter::Radius,
        Parameter::Nozzle,
        Parameter::Pressure,
        Parameter::Flow,
        Parameter::Viscous,
        Parameter::Quadratic,
        Parameter::Mu,
        Parameter::MuStatic,
        Parameter::Running,
        Parameter::Breakaway,
        Parameter::Cd,
        Parameter::Cv,
        Parameter::Bore,
        Parameter::Height,
        Parameter::WaterTemperature,
        Parameter::Wind,
    ];

    /// The name used on the command line (`--vary NAME=…`).
    pub fn name(self) -> &'static str {
        match self {
            Parameter::Deflection => "deflection",
            Parameter::Elevation => "elevation",
            Parameter::Radius => "radius",
            Parameter::Nozzle => "nozzle",
            Parameter::Pressure => "pressure",
            Parameter::Flow => "flow",
            Parameter::Viscous => "viscous",
            Parameter::Quadratic => "quadratic",
            Parameter::Mu => "mu",
            Parameter::MuStatic => "mu_static",
            Parameter::Running => "running",
            Parameter::Breakaway => "breakaway",
            Parameter::Cd => "cd",
            Parameter::Cv => "cv",
            Parameter::Bore => "bore",
            Parameter::Height => "height",
            Parameter::WaterTemperature => "water_temperature",
            Parameter::Wind => "wind",
        }
    }

    /// The parameter with this name, if any (case-insensitive).
    pub fn from_name(name: &str) -> Option<Parameter> {
        Parameter::ALL
            .into_iter()
            .find(|p| p.name().eq_ignore_ascii_case(name))
    }

    /// The SI unit of the value ("" for dimensionless).
    pub fn unit(self) -> &'static str {
        match self {
            Parameter::Deflection | Parameter::Elevation => "rad",
            Parameter::Radius | Parameter::Nozzle | Parameter::Bore | Parameter::Height => "m",
            Parameter::Pressure => "Pa",
            Parameter::Flow => "m3/s",
            Parameter::Viscous => "N·m·s/rad",
            Parameter::Quadratic => "N·m·s²/rad²",
            Parameter::Running | Parameter::Breakaway => "N·m",
            Parameter::Mu | Parameter::MuStatic | Parameter::Cd | Parameter::Cv => "",
            Parameter::WaterTemperature => "°C",
            Parameter::Wind => "m/s",
        }
    }

    /// Column key with the unit in it, for CSV and JSON (e.g. `pressure_pa`).
    pub fn key(self) -> &'static str {
        match self {
            Parameter::Deflection => "deflection_rad",
            Parameter::Elevation => "elevation_rad",
            Parameter::Radius => "radius_m",
            Parameter::Nozzle => "nozzle_m",
            Parameter::Pressure => "pressure_pa",
            Parameter::Flow => "flow_m3_s",
            Parameter::Viscous => "viscous_n_m_s_rad",
            Parameter::Quadratic => "quadratic_n_m_s2_rad2",
            Parameter::Mu => "mu",
            Parameter::MuStatic => "mu_static",
            Parameter::Running => "running_n_m",
            Parameter::Breakaway => "breakaway_n_m",
            Parameter::Cd => "cd",
            Parameter::Cv => "cv",
            Parameter::Bore => "bore_m",
            Parameter::Height => "height_m",
            Parameter::WaterTemperature => "water_temperature_c",
            Parameter::Wind => "wind_m_s",
        }
    }

    /// True for the two parameters that replace the supply.
    fn sets_supply(self) -> bool {
        matches!(self, Parameter::Pressure | Parameter::Flow)
    }

    fn error(self, value: f64, reason: impl Into<String>) -> ParameterError {
        ParameterError {
            name: self.name(),
            value,
            unit: self.unit(),
            reason: reason.into(),
        }
    }

    /// The per-arm numbers this parameter acts on, with how they change.
    fn arm_values(self, design: &Design) -> Option<(Vec<f64>, ArmRule)> {
        let arms = &design.rotor.arms;
        let pick = |f: fn(&super::design::Arm) -> f64| arms.iter().map(f).collect::<Vec<f64>>();
        let (values, rule) = match self {
            Parameter::Deflection => (pick(|a| a.nozzle.deflection_rad), ArmRule::Shift),
            Parameter::Elevation => (pick(|a| a.nozzle.elevation_rad), ArmRule::Shift),
            Parameter::Height => (pick(|a| a.height_m), ArmRule::Shift),
            Parameter::Radius => (pick(|a| a.radius_m), ArmRule::Scale),
            Parameter::Nozzle => (pick(|a| a.nozzle.diameter_m), ArmRule::Scale),
            Parameter::Cd => (pick(|a| a.nozzle.cd), ArmRule::Scale),
            Parameter::Cv => (pick(|a| a.nozzle.cv), ArmRule::Scale),
            Parameter::Bore => (pick(|a| a.tube.bore_m), ArmRule::Scale),
            _ => return None,
        };
        Some((values, rule))
    }

    /// The design's current value, SI (the mean over arms for per-arm
    /// parameters); `None` when the design does not have this parameter (a
    /// washer coefficient on a measured bearing, a pressure on a fixed-flow
    /// supply, an arm parameter with no arms).
    pub fn value(self, design: &Design) -> Option<f64> {
        if let Some((values, _)) = self.arm_values(design) {
            return mean(&values);
        }
        let f = &design.friction;
        match self {
            Parameter::Pressure => match design.supply {
                Supply::Pressure { inlet_pa } => Some(inlet_pa),
                Supply::Line(line) => Some(line.source_pa),
                Supply::Flow { .. } => None,
            },
            Parameter::Flow => match design.supply {
                Supply::Flow { total_m3_s } => Some(total_m3_s),
                _ => None,
            },
            Parameter::Viscous => Some(f.brake.viscous),
            Parameter::Quadratic => Some(f.brake.quadratic),
            Parameter::Mu | Parameter::MuStatic => match f.bearing {
                Bearing::Washer(w) if self == Parameter::Mu => Some(w.mu_kinetic),
                Bearing::Washer(w) => Some(w.mu_static),
                Bearing::Measured { .. } => None,
            },
            Parameter::Running | Parameter::Breakaway => match f.bearing {
                Bearing::Measured { running_n_m, .. } if self == Parameter::Running => {
                    Some(running_n_m)
                }
                Bearing::Measured { breakaway_n_m, .. } => Some(breakaway_n_m),
                Bearing::Washer(_) => None,
            },
            Parameter::WaterTemperature => Some(design.water_temperature_c),
            Parameter::Wind => Some(design.wind.speed_m_s),
            _ => None,
        }
    }

    /// Set the parameter to `value` (SI) on `design`.
    ///
    /// Per-arm parameters move every arm by the same shift or scale so that
    /// their mean becomes `value`. The design is left unchanged on error.
    pub fn apply(self, design: &mut Design, value: f64) -> Result<(), ParameterError> {
        if !value.is_finite() {
            return Err(self.error(value, "not a finite number"));
        }
        if let Some((values, rule)) = self.arm_values(design) {
            return self.apply_to_arms(design, value, &values, rule);
        }
        let non_negative = |p: Parameter| {
            if value < 0.0 {
                Err(p.error(value, "must be zero or more"))
            } else {
                Ok(())
            }
        };
        match self {
            Parameter::Pressure => {
                non_negative(self)?;
                match &mut design.supply {
                    Supply::Line(line) => line.source_pa = value,
                    other => *other = Supply::Pressure { inlet_pa: value },
                }
            }
            Parameter::Flow => {
                if value <= 0.0 {
                    return Err(self.error(value, "must be above zero"));
                }
                design.supply = Supply::Flow { total_m3_s: value };
            }
            Parameter::Viscous => {
                non_negative(self)?;
                design.friction.brake.viscous = value;
            }
            Parameter::Quadratic => {
                non_negative(self)?;
                design.friction.brake.quadratic = value;
            }
            Parameter::Mu | Parameter::MuStatic => {
                non_negative(self)?;
                match &mut design.friction.bearing {
                    Bearing::Washer(w) if self == Parameter::Mu => w.mu_kinetic = value,
                    Bearing::Washer(w) => w.mu_static = value,
                    Bearing::Measured { .. } => {
                        return Err(self.error(
                            value,
                            "the design's bearing is a measured torque, not a washer: vary `running` or `breakaway`",
                        ))
                    }
                }
            }
            Parameter::Running | Parameter::Breakaway => {
                non_negative(self)?;
                match &mut design.friction.bearing {
                    Bearing::Measured { running_n_m, .. } if self == Parameter::Running => {
                        *running_n_m = value
                    }
                    Bearing::Measured { breakaway_n_m, .. } => *breakaway_n_m = value,
                    Bearing::Washer(_) => {
                        return Err(self.error(
                            value,
                            "the design's bearing is a washer, not a measured torque: vary `mu` or `mu_static`",
                        ))
                    }
                }
            }
            Parameter::WaterTemperature => {
                if !(0.0..=50.0).contains(&value) {
                    return Err(self.error(value, "water temperature must be 0 to 50 °C"));
                }
                design.water_temperature_c = value;
            }
            Parameter::Wind => {
                non_negative(self)?;
                design.wind.speed_m_s = value;
            }
            // Per-arm parameters on a design without arms.
            _ => return Err(self.error(value, "the design has no arms")),
        }
        Ok(())
    }

    fn apply_to_arms(
        self,
        design: &mut Design,
        value: f64,
        values: &[f64],
        rule: ArmRule,
    ) -> Result<(), ParameterError> {
        let Some(current) = mean(values) else {
            return Err(self.error(value, "the design has no arms"));
        };
        let new: Vec<f64> = match rule {
            ArmRule::Shift => values.iter().map(|v| v + (value - current)).collect(),
            ArmRule::Scale => {
                if current <= 0.0 {
                    return Err(self.error(value, "the design's value is zero: cannot scale it"));
                }
                if value <= 0.0 {
                    return Err(self.error(value, "must be above zero"));
                }
                values.iter().map(|v| v * value / current).collect()
            }
        };
        let hub = design.rotor.hub_radius_m;
        for (arm, &v) in design.rotor.arms.iter().zip(&new) {
            let bad = match self {
                Parameter::Deflection => (v.abs() > std::f64::consts::PI)
                    .then_some("puts a nozzle past ±180° deflection"),
                Parameter::Elevation => (!(0.0..=std::f64::consts::FRAC_PI_2).contains(&v))
                    .then_some("puts a nozzle outside 0–90° elevation"),
                Parameter::Height => (v < 0.0).then_some("puts a nozzle below the ground"),
                Parameter::Radius => (v <= hub).then_some("puts a nozzle inside the hub radius"),
                Parameter::Cd | Parameter::Cv => {
                    (v > 1.0).then_some("puts a nozzle coefficient above 1")
                }
                Parameter::Bore => (v >= arm.tube.outer_m)
                    .then_some("makes a tube bore as wide as its outside diameter"),
                _ => None,
            };
            if let Some(reason) = bad {
                return Err(self.error(value, reason));
            }
        }
        for (arm, v) in design.rotor.arms.iter_mut().zip(new) {
            match self {
                Parameter::Deflection => arm.nozzle.deflection_rad = v,
                Parameter::Elevation => arm.nozzle.elevation_rad = v,
                Parameter::Height => arm.height_m = v,
                Parameter::Radius => {
                    if let Some(length) = &mut arm.tube.length_m {
                        *length *= v / arm.radius_m;
                    }
                    arm.radius_m = v;
                }
                Parameter::Nozzle => arm.nozzle.diameter_m = v,
                Parameter::Cd => arm.nozzle.cd = v,
                Parameter::Cv => arm.nozzle.cv = v,
                Parameter::Bore => arm.tube.bore_m = v,
                _ => {}
            }
        }
        Ok(())
    }
}

impl std::fmt::Display for Parameter {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.name())
    }
}

fn mean(values: &[f64]) -> Option<f64> {
    (!values.is_empty()).then(|| values.iter().sum::<f64>() / values.len() as f64)
}

/// One axis of a sweep: `steps` evenly spaced values from `from` to `to`
/// inclusive, SI.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SweepAxis {
    /// What is varied.
    pub parameter: Parameter,
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
    #[error("a sweep varies one or two parameters, not {0}")]
    AxisCount(usize),
    /// An axis with no points.
    #[error("`{0}`: a sweep axis needs at least one step")]
    NoSteps(&'static str),
    /// The same parameter on both axes, or two that both set the supply.
    #[error("`{0}` and `{1}` cannot be varied together: {2}")]
    Clash(&'static str, &'static str, &'static str),
    /// An end of an axis the design cannot take.
    #[error("sweep axis: {0}")]
    Value(#[from] ParameterError),
}

/// The state of one sweep point.
#[derive(Debug, Clone, PartialEq)]
pub enum RowStatus {
    /// Solved: running, stalled at rest, or no equilibrium.
    Spin(SpinStatus),
    /// The design could not take the point's values.
    Invalid(ParameterError),
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
    /// The values of the varied parameters, one per axis, SI.
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
fn summarize(report: &SpinReport) -> (Option<f64>, Option<f64>, Option<f64>) {
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
            return Err(SweepError::NoSteps(axis.parameter.name()));
        }
        for v in [axis.from, axis.to] {
            axis.parameter.apply(&mut design.clone(), v)?;
        }
    }
    if let [a, b] = axes {
        let (pa, pb) = (a.parameter, b.parameter);
        if pa == pb {
            return Err(SweepError::Clash(
                pa.name(),
                pb.name(),
                "the same parameter twice",
            ));
        }
        if pa.sets_supply() && pb.sets_supply() {
            return Err(SweepError::Clash(
                pa.name(),
                pb.name(),
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
        if let Err(e) = axis.parameter.apply(&mut point, v) {
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

/// One input of a design, flattened.
#[derive(Debug, Clone, PartialEq)]
pub enum InputValue {
    /// A number in SI.
    Number(f64),
    /// A choice or a default ("washer", "auto").
    Text(String),
}

impl InputValue {
    fn same_as(&self, other: &InputValue) -> bool {
        match (self, other) {
            (InputValue::Number(a), InputValue::Number(b)) => {
                a == b || (a - b).abs() <= 1e-9 * a.abs().max(b.abs())
            }
            (InputValue::Text(a), InputValue::Text(b)) => a == b,
            _ => false,
        }
    }
}

impl std::fmt::Display for InputValue {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            InputValue::Number(x) => write!(f, "{x}"),
            InputValue::Text(t) => f.write_str(t),
        }
    }
}

/// One flattened input: its field path, value and SI unit.
#[derive(Debug, Clone, PartialEq)]
pub struct InputField {
    /// Dotted path, e.g. `rotor.arms[0].nozzle.diameter_m`.
    pub path: String,
    /// The value.
    pub value: InputValue,
    /// SI unit of a number ("" for dimensionless or text).
    pub unit: &'static str,
}

struct Flat(Vec<InputField>);

impl Flat {
    fn num(&mut self, path: impl Into<String>, value: f64, unit: &'static str) {
        self.0.push(InputField {
            path: path.into(),
            value: InputValue::Number(value),
            unit,
        });
    }
    fn text(&mut self, path: impl Into<String>, value: &str) {
        self.0.push(InputField {
            path: path.into(),
            value: InputValue::Text(value.to_string()),
            unit: "",
        });
    }
    fn opt(&mut self, path: impl Into<String>, value: Option<f64>, unit: &'static str) {
        match value {
            Some(v) => self.num(path, v, unit),
            None => self.text(path, "auto"),
        }
    }
}

/// Every input of a design as (path, SI value, unit), in a fixed order. The
/// name is left out (it labels the design, it is not an input).
pub fn design_inputs(design: &Design) -> Vec<InputField> {
    // Destructure in full so that a new field is a compile error here.
    let Design {
        name: _,
        water_temperature_c,
        site,
        supply,
        rotor,
        friction,
        spray,
        layout,
        wind,
    } = design;
    let mut f = Flat(Vec::new());
    f.num("water.temperature_c", *water_temperature_c, "°C");
    f.num("air.temperature_c", site.air_temperature_c, "°C");
    f.num("air.altitude_m", site.altitude_m, "m");
    match supply {
        Supply::Pressure { inlet_pa } => {
            f.text("supply", "pressure");
            f.num("supply.inlet_pa", *inlet_pa, "Pa");
        }
        Supply::Flow { total_m3_s } => {
            f.text("supply", "flow");
            f.num("supply.total_m3_s", *total_m3_s, "m3/s");
        }
        Supply::Line(l) => {
            f.text("supply", "line");
            f.num("supply.source_pa", l.source_pa, "Pa");
            f.num("supply.length_m", l.length_m, "m");
            f.num("supply.bore_m", l.bore_m, "m");
            f.num("supply.roughness_m", l.roughness_m, "m");
            f.num("supply.minor_k", l.minor_k, "");
            f.num("supply.lift_m", l.lift_m, "m");
        }
    }
    f.num("rotor.hub_radius_m", rotor.hub_radius_m, "m");
    f.num("rotor.swivel.inlet_bore_m", rotor.swivel.inlet_bore_m, "m");
    f.num("rotor.swivel.k", rotor.swivel.k, "");
    f.num("rotor.arms", rotor.arms.len() as f64, "");
    for (i, a) in rotor.arms.iter().enumerate() {
        let p = format!("rotor.arms[{i}]");
        f.num(format!("{p}.radius_m"), a.radius_m, "m");
        f.num(format!("{p}.azimuth_rad"), a.azimuth_rad, "rad");
        f.num(format!("{p}.height_m"), a.height_m, "m");
        f.num(format!("{p}.rise_m"), a.rise_m, "m");
        f.num(format!("{p}.tube.bore_m"), a.tube.bore_m, "m");
        f.num(format!("{p}.tube.outer_m"), a.tube.outer_m, "m");
        f.num(format!("{p}.tube.roughness_m"), a.tube.roughness_m, "m");
        f.num(format!("{p}.tube.minor_k"), a.tube.minor_k, "");
        match a.tube.length_m {
            Some(l) => f.num(format!("{p}.tube.length_m"), l, "m"),
            None => f.text(format!("{p}.tube.length_m"), "arm radius"),
        }
        f.num(format!("{p}.nozzle.diameter_m"), a.nozzle.diameter_m, "m");
        f.num(
            format!("{p}.nozzle.elevation_rad"),
            a.nozzle.elevation_rad,
            "rad",
        );
        f.num(
            format!("{p}.nozzle.deflection_rad"),
            a.nozzle.deflection_rad,
            "rad",
        );
        f.num(format!("{p}.nozzle.cd"), a.nozzle.cd, "");
        f.num(format!("{p}.nozzle.cv"), a.nozzle.cv, "");
    }
    match rotor.inertia {
        Inertia::Given { kg_m2 } => {
            f.text("rotor.inertia", "given");
            f.num("rotor.inertia.kg_m2", kg_m2, "kg·m²");
        }
        Inertia::Estimate {
            tube_density_kg_m3,
            tube_wall_m,
            tip_mass_kg,
        } => {
            f.text("rotor.inertia", "estimate");
            f.num(
                "rotor.inertia.tube_density_kg_m3",
                tube_density_kg_m3,
                "kg/m3",
            );
            f.num("rotor.inertia.tube_wall_m", tube_wall_m, "m");
            f.num("rotor.inertia.tip_mass_kg", tip_mass_kg, "kg");
        }
    }
    match friction.bearing {
        Bearing::Washer(w) => {
            f.text("friction.bearing", "washer");
            f.num("friction.bearing.mu_kinetic", w.mu_kinetic, "");
            f.num("friction.bearing.mu_static", w.mu_static, "");
            f.num("friction.bearing.inner_m", w.inner_m, "m");
            f.num("friction.bearing.outer_m", w.outer_m, "m");
            f.num("friction.bearing.thrust_area_m2", w.thrust_area_m2, "m2");
            f.num("friction.bearing.rotor_mass_kg", w.rotor_mass_kg, "kg");
            f.text(
                "friction.bearing.radius_rule",
                match w.radius_rule {
                    WasherRule::UniformWear => "uniform wear",
                    WasherRule::UniformPressure => "uniform pressure",
                },
            );
        }
        Bearing::Measured {
            running_n_m,
            breakaway_n_m,
        } => {
            f.text("friction.bearing", "measured");
            f.num("friction.bearing.running_n_m", running_n_m, "N·m");
            f.num("friction.bearing.breakaway_n_m", breakaway_n_m, "N·m");
        }
    }
    f.num("friction.seal.base_n_m", friction.seal.base_n_m, "N·m");
    f.num(
        "friction.seal.per_pa_n_m",
        friction.seal.per_pa_n_m,
        "N·m/Pa",
    );
    f.num(
        "friction.brake.viscous",
        friction.brake.viscous,
        "N·m·s/rad",
    );
    f.num(
        "friction.brake.quadratic",
        friction.brake.quadratic,
        "N·m·s²/rad²",
    );
    f.num("friction.arm_drag_cd", friction.arm_drag_cd, "");
    f.opt("spray.d50_m", spray.d50_m, "m");
    f.opt("spray.spread", spray.spread, "");
    f.opt("spray.largest_m", spray.largest_m, "m");
    match layout {
        None => f.text("layout", "none"),
        Some(l) => {
            f.text(
                "layout",
                match l {
                    Layout::Square { .. } => "square",
                    Layout::Rectangle { .. } => "rectangle",
                    Layout::Triangle { .. } => "triangle",
                },
            );
            f.num("layout.spacing_m", l.spacing_m(), "m");
            f.num("layout.rows_m", l.rows_m(), "m");
        }
    }
    f.num("wind.speed_m_s", wind.speed_m_s, "m/s");
    f.num("wind.from_rad", wind.from_rad, "rad");
    f.0
}

/// An input that is not the same in every design compared.
#[derive(Debug, Clone, PartialEq)]
pub struct InputDifference {
    /// Dotted field path.
    pub path: String,
    /// SI unit ("" for dimensionless or text).
    pub unit: &'static str,
    /// The value in each design, in the order given (None: the design has no such field).
    pub values: Vec<Option<InputValue>>,
}

/// One key result across the designs, with differences against the first.
#[derive(Debug, Clone, PartialEq)]
pub struct ResultComparison {
    /// Key with the unit in it (`rpm`, `start_margin`, `total_flow_m3_s`, …).
    pub key: String,
    /// Unit of the values ("" for dimensionless).
    pub unit: String,
    /// The value for each design (None where it does not exist, e.g. rpm of a stalled rotor).
    pub values: Vec<Option<f64>>,
    /// value − first value (Some(0) for the first design itself).
    pub deltas: Vec<Option<f64>>,
    /// 100 · delta / |first value|, when the first value is not zero.
    pub percents: Vec<Option<f64>>,
}

/// A key result supplied by the caller (throw, CU…), computed per design.
pub struct ExtraMetric<'a> {
    /// Key with the unit in it, e.g. `wetted_radius_m`.
    pub key: &'a str,
    /// Unit, e.g. "m".
    pub unit: &'a str,
    /// The metric of a solved design.
    pub eval: &'a (dyn Fn(&Design, &SpinReport) -> Option<f64> + Sync),
}

/// Designs side by side.
#[derive(Debug, Clone, PartialEq)]
pub struct Comparison {
    /// The names given, in order.
    pub names: Vec<String>,
    /// Each design's spin status.
    pub statuses: Vec<SpinStatus>,
    /// Every input that differs, in the first design's field order, then any
    /// fields only later designs have.
    pub inputs: Vec<InputDifference>,
    /// Key results: rpm, start margin, total flow, stall torque, runaway, then
    /// the caller's extras.
    pub results: Vec<ResultComparison>,
}

/// A comparison that cannot be made.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum CompareError {
    /// Fewer than two designs.
    #[error("compare needs at least two designs, got {0}")]
    TooFew(usize),
}

/// Compare two or more named designs: the inputs that differ and the key
/// results with deltas and percentages against the first.
pub fn compare(
    designs: &[(&str, &Design)],
    extras: &[ExtraMetric<'_>],
) -> Result<Comparison, CompareError> {
    if designs.len() < 2 {
        return Err(CompareError::TooFew(designs.len()));
    }
    let inputs = differing_inputs(designs.iter().map(|(_, d)| *d));
    let solved: Vec<(SpinReport, Vec<Option<f64>>)> = designs
        .par_iter()
        .map(|(_, d)| {
            let report = solve(d);
            let extra = extras.iter().map(|m| (m.eval)(d, &report)).collect();
            (report, extra)
        })
        .collect();
    let mut results = Vec::new();
    let mut row = |key: &str, unit: &str, values: Vec<Option<f64>>| {
        results.push(result_row(key, unit, values));
    };
    let reports = || solved.iter().map(|(r, _)| r);
    row(
        "rpm",
        "rpm",
        reports()
            .map(|r| r.operating.as_ref().map(|op| rpm(op.omega_rad_s())))
            .collect(),
    );
    row(
        "start_margin",
        "",
        reports().map(|r| r.start_margin).collect(),
    );
    row(
        "total_flow_m3_s",
        "m3/s",
        reports().map(|r| summarize(r).2).collect(),
    );
    row(
        "stall_torque_n_m",
        "N·m",
        reports().map(|r| Some(r.stall_torque_n_m)).collect(),
    );
    row(
        "runaway_rpm",
        "rpm",
        reports().map(|r| r.runaway_rad_s.map(rpm)).collect(),
    );
    for (k, m) in extras.iter().enumerate() {
        row(
            m.key,
            m.unit,
            solved
                .iter()
                .map(|(_, e)| e.get(k).copied().flatten())
                .collect(),
        );
    }
    Ok(Comparison {
        names: designs.iter().map(|(n, _)| n.to_string()).collect(),
        statuses: reports().map(|r| r.status).collect(),
        inputs,
        results,
    })
}

fn result_row(key: &str, unit: &str, values: Vec<Option<f64>>) -> ResultComparison {
    let first = values.first().copied().flatten();
    let deltas: Vec<Option<f64>> = values
        .iter()
        .map(|v| match (v, first) {
            (Some(v), Some(f)) => Some(v - f),
            _ => None,
        })
        .collect();
    let percents = deltas
        .iter()
        .map(|d| match (d, first) {
            (Some(d), Some(f)) if f != 0.0 => Some(100.0 * d / f.abs()),
            _ => None,
        })
        .collect();
    ResultComparison {
        key: key.to_string(),
        unit: unit.to_string(),
        values,
        deltas,
        percents,
    }
}

/// Inputs that are not the same in every design.
pub fn differing_inputs<'a>(designs: impl Iterator<Item = &'a Design>) -> Vec<InputDifference> {
    let flats: Vec<Vec<InputField>> = designs.map(design_inputs).collect();
    let mut order: Vec<(String, &'static str)> = Vec::new();
    let mut seen = HashMap::new();
    for flat in &flats {
        for field in flat {
            if !seen.contains_key(&field.path) {
                seen.insert(field.path.clone(), order.len());
                order.push((field.path.clone(), field.unit));
            }
        }
    }
    let lookups: Vec<HashMap<&str, &InputValue>> = flats
        .iter()
        .map(|flat| {
            flat.iter()
                .map(|f| (f.path.as_str(), &f.value))
                .collect::<HashMap<_, _>>()
        })
        .collect();
    order
        .into_iter()
        .filter_map(|(path, unit)| {
            let values: Vec<Option<InputValue>> = lookups
                .iter()
                .map(|l| l.get(path.as_str()).map(|v| (*v).clone()))
                .collect();
            let first = values.first().cloned().flatten();
            let all_same = values.iter().all(|v| match (v, &first) {
                (Some(v), Some(f)) => v.same_as(f),
                _ => false,
            });
            (!all_same).then_some(InputDifference { path, unit, values })
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::fixtures::three_arm_rotor;
    use std::f64::consts::PI;

    const DEG: f64 = PI / 180.0;

    #[test]
    fn names_round_trip_and_keys_carry_units() {
        for p in Parameter::ALL {
            assert_eq!(Parameter::from_name(p.name()), Some(p));
            assert!(p.key().starts_with(p.name()));
        }
        assert_eq!(
            Parameter::from_name("Deflection"),
            Some(Parameter::Deflection)
        );
        assert_eq!(Parameter::from_name("warp"), None);
    }

    #[test]
    fn arm_parameters_keep_offsets_between_arms() {
        let mut d = three_arm_rotor();
        d.rotor.arms[0].nozzle.deflection_rad = 10.0 * DEG;
        d.rotor.arms[1].nozzle.deflection_rad = 15.0 * DEG;
        d.rotor.arms[2].nozzle.deflection_rad = 20.0 * DEG;
        d.rotor.arms[1].radius_m = 0.2;
        Parameter::Deflection.apply(&mut d, 25.0 * DEG).unwrap();
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
        Parameter::Radius.apply(&mut d, 0.26).unwrap();
        let radii: Vec<f64> = d.rotor.arms.iter().map(|a| a.radius_m).collect();
        for (got, want) in radii.iter().zip([0.24, 0.30, 0.24]) {
            assert!((got - want).abs() < 1e-12, "{radii:?}");
        }
        assert!((Parameter::Radius.value(&d).unwrap() - 0.26).abs() < 1e-12);
    }

    #[test]
    fn out_of_range_values_are_refused_and_leave_the_design_alone() {
        let d0 = three_arm_rotor();
        let mut d = d0.clone();
        let e = Parameter::Elevation.apply(&mut d, 100.0 * DEG).unwrap_err();
        assert!(e.to_string().contains("elevation"), "{e}");
        assert!(Parameter::Nozzle.apply(&mut d, -1e-3).is_err());
        assert!(Parameter::Radius.apply(&mut d, 0.005).is_err());
        assert!(Parameter::Running.apply(&mut d, 0.01).is_err());
        assert!(Parameter::Viscous.apply(&mut d, f64::NAN).is_err());
        assert_eq!(d, d0);
    }

    #[test]
    fn supply_parameters_replace_the_supply() {
        let mut d = three_arm_rotor();
        Parameter::Flow.apply(&mut d, 3e-4).unwrap();
        assert_eq!(d.supply, Supply::Flow { total_m3_s: 3e-4 });
        assert_eq!(Parameter::Pressure.value(&d), None);
        Parameter::Pressure.apply(&mut d, 2e5).unwrap();
        assert_eq!(d.supply, Supply::Pressure { inlet_pa: 2e5 });
    }

    #[test]
    fn axis_values_include_both_ends() {
        let axis = SweepAxis {
            parameter: Parameter::Pressure,
            from: 100e3,
            to: 300e3,
            steps: 5,
        };
        assert_eq!(axis.values(), vec![100e3, 150e3, 200e3, 250e3, 300e3]);
    }

    #[test]
    fn bad_axes_are_errors_not_rows() {
        let d = three_arm_rotor();
        let axis = |p, from, to| SweepAxis {
            parameter: p,
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
                    axis(Parameter::Pressure, 1e5, 2e5),
                    axis(Parameter::Flow, 1e-4, 2e-4)
                ],
                &none
            ),
            Err(SweepError::Clash(..))
        ));
        assert!(matches!(
            sweep(&d, &[axis(Parameter::Elevation, 0.0, 2.0)], &none),
            Err(SweepError::Value(_))
        ));
    }

    #[test]
    fn a_stalling_point_is_a_row_and_progress_counts_every_point() {
        let d = three_arm_rotor();
        // 0 Pa: no flow, no drive: stalls at rest. 280 kPa: runs.
        let axis = SweepAxis {
            parameter: Parameter::Pressure,
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

    #[test]
    fn compare_lists_only_what_differs() {
        let a = three_arm_rotor();
        let mut b = a.clone();
        b.name = "other name".into();
        Parameter::Nozzle.apply(&mut b, 2.6e-3).unwrap();
        let c = compare(&[("a", &a), ("b", &b)], &[]).unwrap();
        let paths: Vec<&str> = c.inputs.iter().map(|i| i.path.as_str()).collect();
        assert_eq!(
            paths,
            vec![
                "rotor.arms[0].nozzle.diameter_m",
                "rotor.arms[1].nozzle.diameter_m",
                "rotor.arms[2].nozzle.diameter_m"
            ]
        );
        let rpm_row = &c.results[0];
        assert_eq!(rpm_row.key, "rpm");
        let (r0, r1) = (rpm_row.values[0].unwrap(), rpm_row.values[1].unwrap());
        assert_eq!(rpm_row.deltas[0], Some(0.0));
        assert!((rpm_row.deltas[1].unwrap() - (r1 - r0)).abs() < 1e-12);
        assert!((rpm_row.percents[1].unwrap() - 100.0 * (r1 - r0) / r0).abs() < 1e-9);
        assert!(compare(&[("a", &a)], &[]).is_err());
    }

    #[test]
    fn compare_shows_fields_one_design_lacks() {
        let a = three_arm_rotor();
        let mut b = a.clone();
        b.rotor.arms.pop();
        let c = compare(&[("three", &a), ("two", &b)], &[]).unwrap();
        let arms = c.inputs.iter().find(|i| i.path == "rotor.arms").unwrap();
        assert_eq!(
            arms.values,
            vec![Some(InputValue::Number(3.0)), Some(InputValue::Number(2.0))]
        );
        let third = c
            .inputs
            .iter()
            .find(|i| i.path == "rotor.arms[2].radius_m")
            .unwrap();
        assert_eq!(third.values[1], None);
    }
}

//! Field check (model.md M10): what a technician's readings at a running
//! sprinkler say about it, against its design.
//!
//! Readings: the inlet pressure, the rotation (rpm, seconds per turn, or N
//! turns timed over T seconds), and optionally the flow (a rate, or a volume
//! caught over a time) and the wetted radius.
//!
//! What is worked out:
//!
//! - **Expected speed**: the design solved with its supply replaced by the
//!   measured inlet pressure, and the measured speed's deviation from it.
//! - **Reading band**: the measured speed is 60·N/T rpm (N turns, T seconds;
//!   one turn for seconds per turn). With the stopwatch off by up to ±ΔT and the
//!   count by up to ±ΔN, the worst cases bound it:
//!
//!   ```text
//!   rpm_lo = 60 (N − ΔN) / (T + ΔT),   rpm_hi = 60 (N + ΔN) / (T − ΔT)
//!   ```
//!
//!   e.g. 10 turns timed at 14.2 s to ±0.2 s: 42.25 rpm, band 41.67–42.86 rpm.
//!   An rpm read directly has the band rpm ± its resolution; a caught volume V
//!   over T has (V − ΔV)/(T + ΔT) … (V + ΔV)/(T − ΔT).
//! - **Implied running friction**: the bearing friction at which the measured
//!   speed is the model's balance speed — a root of net torque at the measured
//!   speed in the bearing's running parameter (the running torque of a
//!   `Measured` bearing, the kinetic μ of a `Washer`), found by Brent's method
//!   on the full model. Net torque at a fixed speed does not depend on the
//!   water path's response to friction, so this is the same friction at which
//!   the operating speed equals the measured one; the adjusted design is solved
//!   to confirm it. It is reported as an equivalent running torque at the
//!   measured speed beside the design's running torque at that speed.
//! - **Effective nozzle diameter**: the common scale of all nozzle diameters at
//!   which the model's total flow, at the measured pressure *and* speed, equals
//!   the measured flow (Brent). When a flow is measured, the friction is
//!   inferred with these as-found nozzles, so a clogged nozzle is not blamed on
//!   the bearing.
//! - **Throw**: the caller's wetted-radius closure on the design at the
//!   measured pressure (expected) and on the as-found design (friction and
//!   nozzles as inferred), against the measured throw.
//!
//! - **Causes** ([`causes`]): the deviation from the design's own speed
//!   taken apart — the measured pressure's share, the as-found nozzle's, and
//!   the rest shared among bearing, seal, brake and air in proportion to their
//!   torque at the measured speed, each with the factor it would need alone
//!   (or named impossible: negative friction, a nozzle larger than new).
//!
//! **Findings** ([`findings`]) are typed values; the report layer words them
//! in the reader's units. The first states the speed against the design (its
//! direction the sign of measured − design) and names the cause that
//! explains most of it. The rest are judged on the reading band: a quantity
//! whose expected value lies inside the band is "within reading accuracy";
//! otherwise the deviation of the band's nearer end is divided by the
//! tolerance (10 % on flow, the rule of practice that a nozzle passing more
//! than 10 % off a new one's is replaced; 5 % on speed for the model's own
//! accuracy, 10 % on pressure and on throw — our choices), and ranked by that
//! ratio; above 1 is a fault. Readings above 552 kPa (80 psi) call for a
//! regulator (common practice: plumbing codes).

pub mod causes;
pub mod findings;

pub use causes::{
    effective_diameter, Alone, Cause, CauseEvidence, CauseInputs, CauseKind, Chain, NozzleAlone,
    ResistSplit,
};
pub use findings::{Detail, Direction, Finding, FindingKind, Within};

use super::balance::{rad_s, rpm, solve, solve_speed, SpinModel, SpinReport, SpinStatus};
use super::design::{Bearing, Design, Supply};
use super::torque::{washer_axial_force_n, washer_effective_radius_m};
use super::ThrowFn;
use crate::numeric::root::{brent, doubling, grow_bracket, Tolerance};

/// Default stopwatch resolution for hand timing, s (common practice: a hand
/// stopwatch is good to about 0.2 s, reaction time included).
pub const DEFAULT_STOPWATCH_RESOLUTION_S: f64 = 0.2;
/// Default counting resolution, turns: whole turns counted past a fixed mark
/// (the timing at the mark is what the stopwatch resolution covers).
pub const DEFAULT_COUNT_RESOLUTION_TURNS: f64 = 0.0;
/// Default resolution of a caught volume, m³ (a marked jug read to 50 mL:
/// common practice).
pub const DEFAULT_VOLUME_RESOLUTION_M3: f64 = 0.05e-3;
/// Default resolution of a measured throw, m (a tape read at the edge of the
/// wetted area: our choice).
pub const DEFAULT_THROW_RESOLUTION_M: f64 = 0.1;
/// Above this inlet pressure a regulator is called for, Pa (80 psi; common practice).
pub const REGULATOR_LIMIT_PA: f64 = 551_580.0;
/// Score given to a finding that voids the speed comparison (ranks it first).
pub const VOIDS_COMPARISON: f64 = 1.0e6;

/// How the rotation was measured.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum RotationReading {
    /// Read directly, rpm, with the reading's resolution (± rpm).
    Rpm {
        /// Speed, rpm.
        rpm: f64,
        /// ± resolution of the reading, rpm.
        resolution_rpm: f64,
    },
    /// One turn timed, s.
    SecondsPerTurn {
        /// Time for one turn, s.
        seconds: f64,
        /// ± stopwatch resolution, s.
        stopwatch_resolution_s: f64,
    },
    /// N turns counted over T seconds.
    TurnsOver {
        /// Turns counted.
        turns: f64,
        /// Time taken, s.
        seconds: f64,
        /// ± stopwatch resolution, s.
        stopwatch_resolution_s: f64,
        /// ± counting resolution, turns.
        count_resolution_turns: f64,
    },
}

impl RotationReading {
    /// An rpm read exactly (no resolution given).
    pub fn rpm(rpm: f64) -> Self {
        RotationReading::Rpm {
            rpm,
            resolution_rpm: 0.0,
        }
    }

    /// One turn timed with a hand stopwatch (default resolution).
    pub fn seconds_per_turn(seconds: f64) -> Self {
        RotationReading::SecondsPerTurn {
            seconds,
            stopwatch_resolution_s: DEFAULT_STOPWATCH_RESOLUTION_S,
        }
    }

    /// N whole turns timed with a hand stopwatch (default resolutions).
    pub fn turns_over(turns: f64, seconds: f64) -> Self {
        RotationReading::TurnsOver {
            turns,
            seconds,
            stopwatch_resolution_s: DEFAULT_STOPWATCH_RESOLUTION_S,
            count_resolution_turns: DEFAULT_COUNT_RESOLUTION_TURNS,
        }
    }

    /// (turns, ± turns, seconds, ± seconds) of a timed reading.
    fn timed(&self) -> Option<(f64, f64, f64, f64)> {
        match *self {
            RotationReading::Rpm { .. } => None,
            RotationReading::SecondsPerTurn {
                seconds,
                stopwatch_resolution_s,
            } => Some((1.0, 0.0, seconds, stopwatch_resolution_s)),
            RotationReading::TurnsOver {
                turns,
                seconds,
                stopwatch_resolution_s,
                count_resolution_turns,
            } => Some((
                turns,
                count_resolution_turns,
                seconds,
                stopwatch_resolution_s,
            )),
        }
    }

    /// The measured speed, rpm.
    pub fn measured_rpm(&self) -> f64 {
        match *self {
            RotationReading::Rpm { rpm, .. } => rpm,
            _ => self.timed().map_or(0.0, |(n, _, t, _)| 60.0 * n / t),
        }
    }

    /// The band [lo, hi] of speeds the reading allows, rpm (see the module docs).
    pub fn band_rpm(&self) -> Result<[f64; 2], FieldError> {
        self.validate()?;
        Ok(match *self {
            RotationReading::Rpm {
                rpm,
                resolution_rpm,
            } => [rpm - resolution_rpm, rpm + resolution_rpm],
            _ => {
                let (n, dn, t, dt) = self.timed().unwrap_or((1.0, 0.0, 1.0, 0.0));
                [60.0 * (n - dn) / (t + dt), 60.0 * (n + dn) / (t - dt)]
            }
        })
    }

    fn validate(&self) -> Result<(), FieldError> {
        match *self {
            RotationReading::Rpm {
                rpm,
                resolution_rpm,
            } => {
                positive("rpm", rpm)?;
                resolution("rpm resolution", resolution_rpm, rpm, "rpm")
            }
            RotationReading::SecondsPerTurn {
                seconds,
                stopwatch_resolution_s,
            } => {
                positive("seconds per turn", seconds)?;
                resolution(
                    "stopwatch resolution",
                    stopwatch_resolution_s,
                    seconds,
                    "seconds per turn",
                )
            }
            RotationReading::TurnsOver {
                turns,
                seconds,
                stopwatch_resolution_s,
                count_resolution_turns,
            } => {
                positive("turns", turns)?;
                positive("over (seconds)", seconds)?;
                resolution(
                    "stopwatch resolution",
                    stopwatch_resolution_s,
                    seconds,
                    "over (seconds)",
                )?;
                resolution("count resolution", count_resolution_turns, turns, "turns")
            }
        }
    }
}

/// How the flow was measured.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum FlowReading {
    /// A flow rate read from a meter, m³/s, with its resolution.
    Rate {
        /// Flow, m³/s.
        flow_m3_s: f64,
        /// ± resolution, m³/s.
        resolution_m3_s: f64,
    },
    /// A volume caught over a time.
    Caught {
        /// Volume caught, m³.
        volume_m3: f64,
        /// Time, s.
        seconds: f64,
        /// ± resolution of the volume, m³.
        volume_resolution_m3: f64,
        /// ± stopwatch resolution, s.
        stopwatch_resolution_s: f64,
    },
}

impl FlowReading {
    /// A volume caught over a hand-timed interval (default resolutions).
    pub fn caught(volume_m3: f64, seconds: f64) -> Self {
        FlowReading::Caught {
            volume_m3,
            seconds,
            volume_resolution_m3: DEFAULT_VOLUME_RESOLUTION_M3,
            stopwatch_resolution_s: DEFAULT_STOPWATCH_RESOLUTION_S,
        }
    }

    /// A flow rate read exactly (no resolution given).
    pub fn rate(flow_m3_s: f64) -> Self {
        FlowReading::Rate {
            flow_m3_s,
            resolution_m3_s: 0.0,
        }
    }

    /// The measured flow, m³/s.
    pub fn measured_m3_s(&self) -> f64 {
        match *self {
            FlowReading::Rate { flow_m3_s, .. } => flow_m3_s,
            FlowReading::Caught {
                volume_m3, seconds, ..
            } => volume_m3 / seconds,
        }
    }

    /// The band [lo, hi] the reading allows, m³/s.
    pub fn band_m3_s(&self) -> Result<[f64; 2], FieldError> {
        match *self {
            FlowReading::Rate {
                flow_m3_s,
                resolution_m3_s,
            } => {
                positive("flow", flow_m3_s)?;
                resolution("flow resolution", resolution_m3_s, flow_m3_s, "flow")?;
                Ok([flow_m3_s - resolution_m3_s, flow_m3_s + resolution_m3_s])
            }
            FlowReading::Caught {
                volume_m3,
                seconds,
                volume_resolution_m3,
                stopwatch_resolution_s,
            } => {
                positive("caught volume", volume_m3)?;
                positive("over (seconds)", seconds)?;
                resolution(
                    "volume resolution",
                    volume_resolution_m3,
                    volume_m3,
                    "caught volume",
                )?;
                resolution(
                    "stopwatch resolution",
                    stopwatch_resolution_s,
                    seconds,
                    "over (seconds)",
                )?;
                Ok([
                    (volume_m3 - volume_resolution_m3) / (seconds + stopwatch_resolution_s),
                    (volume_m3 + volume_resolution_m3) / (seconds - stopwatch_resolution_s),
                ])
            }
        }
    }
}

/// A measured wetted radius.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ThrowReading {
    /// Wetted radius, m.
    pub throw_m: f64,
    /// ± resolution, m.
    pub resolution_m: f64,
}

impl ThrowReading {
    /// A throw measured with the default resolution.
    pub fn new(throw_m: f64) -> Self {
        ThrowReading {
            throw_m,
            resolution_m: DEFAULT_THROW_RESOLUTION_M,
        }
    }
}

/// Everything measured at the sprinkler.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldReading {
    /// Gauge pressure at the sprinkler inlet, Pa.
    pub inlet_pressure_pa: f64,
    /// ± resolution of the pressure reading, Pa.
    pub pressure_resolution_pa: f64,
    /// The rotation.
    pub rotation: RotationReading,
    /// The flow, if measured.
    pub flow: Option<FlowReading>,
    /// The wetted radius, if measured.
    pub throw: Option<ThrowReading>,
}

impl FieldReading {
    /// Pressure and rotation only (pressure read exactly).
    pub fn new(inlet_pressure_pa: f64, rotation: RotationReading) -> Self {
        FieldReading {
            inlet_pressure_pa,
            pressure_resolution_pa: 0.0,
            rotation,
            flow: None,
            throw: None,
        }
    }
}

/// How far a reading may sit from the model before it is a finding, percent.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldTolerances {
    /// Speed, beyond the reading band (default 5 %: the model's own accuracy; our choice).
    pub speed_percent: f64,
    /// Pressure against the design's inlet pressure (default 10 %; our choice).
    pub pressure_percent: f64,
    /// Flow against a new nozzle's (default 10 %: common practice, replace beyond).
    pub flow_percent: f64,
    /// Throw against the model's (default 10 %; our choice).
    pub throw_percent: f64,
}

impl Default for FieldTolerances {
    fn default() -> Self {
        FieldTolerances {
            speed_percent: 5.0,
            pressure_percent: 10.0,
            flow_percent: 10.0,
            throw_percent: 10.0,
        }
    }
}

/// A reading or setting that cannot be used.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FieldError {
    /// A reading that is not a positive finite number.
    #[error("field check: {field} = {value} must be a positive number")]
    NotPositive {
        /// Which reading.
        field: &'static str,
        /// The value given.
        value: f64,
    },
    /// A resolution that is negative or as large as the reading itself.
    #[error("field check: {field} = {value} must be zero or more and smaller than the {of} reading ({reading})")]
    BadResolution {
        /// Which resolution.
        field: &'static str,
        /// The value given.
        value: f64,
        /// The reading it belongs to.
        of: &'static str,
        /// That reading's value.
        reading: f64,
    },
}

fn positive(field: &'static str, value: f64) -> Result<(), FieldError> {
    if value.is_finite() && value > 0.0 {
        Ok(())
    } else {
        Err(FieldError::NotPositive { field, value })
    }
}

fn resolution(
    field: &'static str,
    value: f64,
    reading: f64,
    of: &'static str,
) -> Result<(), FieldError> {
    if value.is_finite() && value >= 0.0 && value < reading {
        Ok(())
    } else {
        Err(FieldError::BadResolution {
            field,
            value,
            of,
            reading,
        })
    }
}

/// The bearing friction that explains the measured speed.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ImpliedFriction {
    /// The measured speed, rad/s.
    pub measured_omega_rad_s: f64,
    /// Bearing running torque at the measured speed that balances the drive, N·m.
    pub implied_running_torque_n_m: f64,
    /// The design's bearing running torque at the measured speed, N·m.
    pub design_running_torque_n_m: f64,
    /// Implied over design running torque (None when the design's is zero).
    pub ratio: Option<f64>,
    /// The implied kinetic μ of a washer bearing.
    pub implied_mu_kinetic: Option<f64>,
    /// The design's kinetic μ of a washer bearing.
    pub design_mu_kinetic: Option<f64>,
    /// Implied running torque over the reading band, [low, high] N·m (the
    /// band's high speed gives the low torque).
    pub band_n_m: [f64; 2],
    /// Drive torque at the measured speed, N·m.
    pub drive_torque_n_m: f64,
    /// Seal, brake and air drag at the measured speed, N·m.
    pub other_resisting_n_m: f64,
    /// Where the as-found design (implied friction) settles, rpm (None if it does not run).
    pub model_rpm: Option<f64>,
}

/// The measured flow against a new nozzle's.
#[derive(Debug, Clone, PartialEq)]
pub struct FlowCheck {
    /// Measured total flow, m³/s.
    pub measured_m3_s: f64,
    /// Band the reading allows, m³/s.
    pub band_m3_s: [f64; 2],
    /// Model flow with the nominal nozzles at the measured pressure and speed, m³/s.
    pub nominal_m3_s: f64,
    /// 100 · (measured − nominal) / nominal.
    pub deviation_percent: f64,
    /// Common scale on all nozzle diameters that passes the measured flow
    /// (None when no nozzle size passes that much).
    pub diameter_scale: Option<f64>,
    /// Nominal nozzle diameters, m, by arm.
    pub nominal_diameters_m: Vec<f64>,
    /// Implied nozzle diameters, m, by arm.
    pub implied_diameters_m: Option<Vec<f64>>,
    /// Area-equivalent nominal diameter √(mean d²), m.
    pub nominal_effective_diameter_m: f64,
    /// Area-equivalent implied diameter, m.
    pub implied_effective_diameter_m: Option<f64>,
}

impl FlowCheck {
    /// 100 · (implied − nominal) / nominal diameter.
    pub fn diameter_deviation_percent(&self) -> Option<f64> {
        self.diameter_scale.map(|s| 100.0 * (s - 1.0))
    }
}

/// The measured throw against the model's.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ThrowCheck {
    /// Measured wetted radius, m.
    pub measured_m: f64,
    /// Band the reading allows, m.
    pub band_m: [f64; 2],
    /// The design's wetted radius at the measured pressure, m.
    pub expected_m: Option<f64>,
    /// The as-found design's wetted radius (inferred friction and nozzles), m.
    pub as_found_m: Option<f64>,
    /// 100 · (measured − expected) / expected.
    pub deviation_percent: Option<f64>,
}

/// The result of a field check.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldCheck {
    /// Measured inlet pressure, Pa.
    pub inlet_pressure_pa: f64,
    /// The design's own inlet pressure at its operating point (at rest if it does not run), Pa.
    pub design_inlet_pressure_pa: f64,
    /// Measured speed, rpm.
    pub measured_rpm: f64,
    /// Band the rotation reading allows, rpm.
    pub measured_rpm_band: [f64; 2],
    /// The design at the measured pressure, solved.
    pub expected: SpinReport,
    /// The design's speed at the measured pressure, rpm (None when it does not run).
    pub expected_rpm: Option<f64>,
    /// 100 · (measured − expected) / expected.
    pub deviation_percent: Option<f64>,
    /// The bearing friction that explains the measured speed.
    pub friction: Option<ImpliedFriction>,
    /// Flow against a new nozzle's, when measured.
    pub flow: Option<FlowCheck>,
    /// The design's speed at the measured pressure with the as-found nozzles
    /// and design friction, rpm (when a flow was measured and implied a size).
    pub as_found_nozzle_rpm: Option<f64>,
    /// Throw against the model's, when measured and a throw function was given.
    pub throw: Option<ThrowCheck>,
    /// The design's own operating speed, rpm (None when it does not run).
    pub design_rpm: Option<f64>,
    /// How the design itself runs.
    pub design_status: SpinStatus,
    /// Candidate causes of the deviation from the design, ranked by how much
    /// of it each explains (see [`causes`]).
    pub causes: Vec<Cause>,
    /// The resisting torque by part at the measured speed, against the drive.
    pub split: ResistSplit,
    /// The tolerances the check was judged on.
    pub tolerances: FieldTolerances,
    /// Findings: the speed against the design first, then the rest, most serious first.
    pub findings: Vec<Finding>,
    /// The design as found: measured pressure, implied nozzles and friction
    /// (the design's friction when the implied one would be negative).
    pub as_found: Design,
}

/// Which number of the bearing is the running friction.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Knob {
    /// A measured bearing's running torque, N·m.
    Running,
    /// A washer's kinetic μ.
    MuKinetic,
}

fn knob_of(design: &Design) -> (Knob, f64) {
    match design.friction.bearing {
        Bearing::Measured { running_n_m, .. } => (Knob::Running, running_n_m),
        Bearing::Washer(w) => (Knob::MuKinetic, w.mu_kinetic),
    }
}

fn with_knob(design: &Design, knob: Knob, x: f64) -> Design {
    let mut d = design.clone();
    match (&mut d.friction.bearing, knob) {
        (Bearing::Measured { running_n_m, .. }, Knob::Running) => *running_n_m = x,
        (Bearing::Washer(w), Knob::MuKinetic) => w.mu_kinetic = x,
        (bearing, Knob::Running) => {
            // A washer that carries no load at this speed: its friction is
            // stood in for by a measured running torque.
            let breakaway = match *bearing {
                Bearing::Washer(w) if w.mu_kinetic > 0.0 => x.max(0.0) * w.mu_static / w.mu_kinetic,
                _ => x.max(0.0),
            };
            *bearing = Bearing::Measured {
                running_n_m: x,
                breakaway_n_m: breakaway,
            };
        }
        (_, Knob::MuKinetic) => {}
    }
    d
}

/// Root of a decreasing function `f` near `x0`, bracketed by expanding steps.
fn decreasing_root(f: impl Fn(f64) -> f64, x0: f64, step0: f64, f_scale: f64) -> Option<f64> {
    let f0 = f(x0);
    if f0 == 0.0 {
        return Some(x0);
    }
    // f decreasing: root above x0 when f0 > 0.
    let dir = if f0 > 0.0 { 1.0 } else { -1.0 };
    let (_, far) = grow_bracket(&f, x0, f0, doubling(x0, dir, step0, 200))?;
    let (lo, hi) = if dir > 0.0 { (x0, far) } else { (far, x0) };
    let tol = Tolerance {
        x: 1e-15 * lo.abs().max(hi.abs()).max(step0),
        f: 1e-14 * f_scale,
        max_iter: 200,
    };
    brent(&f, lo, hi, tol).ok()
}

/// Bearing torque of `design` turning at ω, N·m.
fn bearing_torque(design: &Design, omega: f64) -> f64 {
    SpinModel::new(design).point(omega).resist.bearing_n_m
}

/// The running-friction value that balances the model at ω, and the design with it.
fn balance_friction(design: &Design, omega: f64) -> Option<(Knob, f64, Design)> {
    let model = SpinModel::new(design);
    let point = model.point(omega);
    let scale = point
        .drive_n_m
        .abs()
        .max(point.resist.total_n_m())
        .max(1e-12);
    let (mut knob, mut x0) = knob_of(design);
    if let Bearing::Washer(w) = design.friction.bearing {
        let rho = model.fluids.water.density_kg_m3;
        let lever =
            washer_axial_force_n(&w, design, &point.state, rho) * washer_effective_radius_m(&w);
        if lever <= 1e-9 * scale {
            knob = Knob::Running;
            x0 = point.resist.bearing_n_m;
        }
    }
    let step0 = match knob {
        Knob::Running => x0.abs().max(1e-3 * scale),
        Knob::MuKinetic => x0.abs().max(0.01),
    };
    let net = |x: f64| SpinModel::new(&with_knob(design, knob, x)).net(omega);
    let x = decreasing_root(net, x0, step0, scale)?;
    Some((knob, x, with_knob(design, knob, x)))
}

fn implied_friction(
    nominal: &Design,
    omega: f64,
    band_rpm: [f64; 2],
) -> Option<(ImpliedFriction, Design)> {
    let (knob, x, adjusted) = balance_friction(nominal, omega)?;
    let implied = bearing_torque(&adjusted, omega);
    let design_torque = bearing_torque(nominal, omega);
    let point = SpinModel::new(nominal).point(omega);
    let other = point.resist.total_n_m() - point.resist.bearing_n_m;
    let band_torque =
        |r: f64| balance_friction(nominal, rad_s(r)).map(|(_, _, d)| bearing_torque(&d, rad_s(r)));
    let a = band_torque(band_rpm[0]).unwrap_or(implied);
    let b = band_torque(band_rpm[1]).unwrap_or(implied);
    let model_rpm = solve_speed(&adjusted)
        .operating
        .map(|op| rpm(op.omega_rad_s()));
    let (implied_mu, design_mu) = match (knob, nominal.friction.bearing) {
        (Knob::MuKinetic, Bearing::Washer(w)) => (Some(x), Some(w.mu_kinetic)),
        (_, Bearing::Washer(w)) => (None, Some(w.mu_kinetic)),
        _ => (None, None),
    };
    Some((
        ImpliedFriction {
            measured_omega_rad_s: omega,
            implied_running_torque_n_m: implied,
            design_running_torque_n_m: design_torque,
            ratio: (design_torque > 0.0).then(|| implied / design_torque),
            implied_mu_kinetic: implied_mu,
            design_mu_kinetic: design_mu,
            band_n_m: [a.min(b), a.max(b)],
            drive_torque_n_m: point.drive_n_m,
            other_resisting_n_m: other,
            model_rpm,
        },
        adjusted,
    ))
}

fn with_pressure(design: &Design, inlet_pa: f64) -> Design {
    let mut d = design.clone();
    d.supply = Supply::Pressure { inlet_pa };
    d
}

fn with_nozzle_scale(design: &Design, scale: f64) -> Design {
    let mut d = design.clone();
    for arm in &mut d.rotor.arms {
        arm.nozzle.diameter_m *= scale;
    }
    d
}

fn flow_at(design: &Design, omega: f64) -> f64 {
    SpinModel::new(design).state(omega).total_flow_m3_s
}

/// Largest common nozzle scale tried (the arm tubes cap the flow long before).
const MAX_NOZZLE_SCALE: f64 = 20.0;

fn nozzle_scale_for(design: &Design, omega: f64, flow: f64) -> Option<f64> {
    let f = |s: f64| flow_at(&with_nozzle_scale(design, s), omega) - flow;
    let f1 = f(1.0);
    if f1 == 0.0 {
        return Some(1.0);
    }
    // Grow by 1.5 up to MAX_NOZZLE_SCALE, or shrink by 1.5 down to 1e-4.
    let (lo, hi) = if f1 < 0.0 {
        let up = std::iter::successors(Some(1.5), |&h: &f64| {
            (h < MAX_NOZZLE_SCALE).then(|| (h * 1.5).min(MAX_NOZZLE_SCALE))
        });
        grow_bracket(f, 1.0, f1, up)?
    } else {
        let down = std::iter::successors(Some(1.0 / 1.5), |&l: &f64| (l >= 1e-4).then(|| l / 1.5));
        let (hi, lo) = grow_bracket(f, 1.0, f1, down)?;
        (lo, hi)
    };
    let tol = Tolerance {
        x: 1e-15 * hi,
        f: 1e-13 * flow,
        max_iter: 200,
    };
    brent(f, lo, hi, tol).ok()
}

fn area_equivalent(diameters: &[f64]) -> f64 {
    if diameters.is_empty() {
        return 0.0;
    }
    (diameters.iter().map(|d| d * d).sum::<f64>() / diameters.len() as f64).sqrt()
}

fn validate(reading: &FieldReading, tol: &FieldTolerances) -> Result<(), FieldError> {
    positive("pressure", reading.inlet_pressure_pa)?;
    resolution(
        "pressure resolution",
        reading.pressure_resolution_pa,
        reading.inlet_pressure_pa,
        "pressure",
    )?;
    reading.rotation.validate()?;
    if let Some(flow) = &reading.flow {
        flow.band_m3_s()?;
    }
    if let Some(t) = &reading.throw {
        positive("throw", t.throw_m)?;
        resolution("throw resolution", t.resolution_m, t.throw_m, "throw")?;
    }
    positive("speed tolerance (%)", tol.speed_percent)?;
    positive("pressure tolerance (%)", tol.pressure_percent)?;
    positive("flow tolerance (%)", tol.flow_percent)?;
    positive("throw tolerance (%)", tol.throw_percent)?;
    Ok(())
}

/// Check a sprinkler in the field against its design.
///
/// `throw`, when given, is the wetted radius of a design, m (the caller's
/// throw model); it is used only when a throw was measured.
pub fn check(
    design: &Design,
    reading: &FieldReading,
    tolerances: &FieldTolerances,
    throw: Option<&ThrowFn>,
) -> Result<FieldCheck, FieldError> {
    validate(reading, tolerances)?;
    let p = reading.inlet_pressure_pa;
    let own = solve(design);
    let design_inlet = own
        .operating
        .as_ref()
        .map_or(own.at_rest.inlet_pressure_pa, |op| {
            op.point.state.inlet_pressure_pa
        });

    let at_p = with_pressure(design, p);
    let expected = solve(&at_p);
    let expected_rpm = expected.operating.as_ref().map(|op| rpm(op.omega_rad_s()));
    let measured_rpm = reading.rotation.measured_rpm();
    let band = reading.rotation.band_rpm()?;
    let omega = rad_s(measured_rpm);
    let deviation_percent = expected_rpm.map(|e| 100.0 * (measured_rpm - e) / e);

    // Flow and the as-found nozzles.
    let flow = match &reading.flow {
        Some(f) => Some(flow_check(&at_p, omega, f)?),
        None => None,
    };
    let scale = flow.as_ref().and_then(|f| f.diameter_scale).unwrap_or(1.0);
    let nozzles_found = if scale == 1.0 {
        at_p.clone()
    } else {
        with_nozzle_scale(&at_p, scale)
    };
    let as_found_nozzle_rpm = (scale != 1.0)
        .then(|| {
            solve_speed(&nozzles_found)
                .operating
                .map(|op| rpm(op.omega_rad_s()))
        })
        .flatten();

    let (friction, as_found) = match implied_friction(&nozzles_found, omega, band) {
        Some((f, d)) if f.implied_running_torque_n_m >= 0.0 => (Some(f), d),
        Some((f, _)) => (Some(f), nozzles_found.clone()),
        None => (None, nozzles_found.clone()),
    };
    let design_rpm = own.operating.as_ref().map(|op| rpm(op.omega_rad_s()));
    let flow_scale = flow.as_ref().and_then(|f| f.diameter_scale);
    let (causes, split) = causes::causes(&CauseInputs {
        at_pressure: &at_p,
        nozzles_found: &nozzles_found,
        measured_pa: p,
        design_pa: design_inlet,
        flow_scale,
        chain: Chain {
            design_rpm,
            at_pressure_rpm: expected_rpm,
            nozzles_found_rpm: if scale == 1.0 {
                expected_rpm
            } else {
                as_found_nozzle_rpm
            },
            measured_rpm,
        },
    });

    let throw_check = match (reading.throw, throw) {
        (Some(t), Some(model)) => {
            let expected_m = model(&at_p).filter(|x| x.is_finite() && *x > 0.0);
            let as_found_m = model(&as_found).filter(|x| x.is_finite() && *x > 0.0);
            Some(ThrowCheck {
                measured_m: t.throw_m,
                band_m: [t.throw_m - t.resolution_m, t.throw_m + t.resolution_m],
                expected_m,
                as_found_m,
                deviation_percent: expected_m.map(|e| 100.0 * (t.throw_m - e) / e),
            })
        }
        _ => None,
    };

    let mut check = FieldCheck {
        inlet_pressure_pa: p,
        design_inlet_pressure_pa: design_inlet,
        measured_rpm,
        measured_rpm_band: band,
        expected,
        expected_rpm,
        deviation_percent,
        friction,
        flow,
        as_found_nozzle_rpm,
        throw: throw_check,
        design_rpm,
        design_status: own.status,
        causes,
        split,
        tolerances: *tolerances,
        findings: Vec::new(),
        as_found,
    };
    check.findings = findings::findings(&check, reading, tolerances);
    Ok(check)
}

fn flow_check(at_p: &Design, omega: f64, reading: &FlowReading) -> Result<FlowCheck, FieldError> {
    let band = reading.band_m3_s()?;
    let measured = reading.measured_m3_s();
    let nominal = flow_at(at_p, omega);
    let scale = nozzle_scale_for(at_p, omega, measured);
    let nominal_d: Vec<f64> = at_p
        .rotor
        .arms
        .iter()
        .map(|a| a.nozzle.diameter_m)
        .collect();
    let implied_d = scale.map(|s| nominal_d.iter().map(|d| d * s).collect::<Vec<f64>>());
    Ok(FlowCheck {
        measured_m3_s: measured,
        band_m3_s: band,
        nominal_m3_s: nominal,
        deviation_percent: if nominal > 0.0 {
            100.0 * (measured - nominal) / nominal
        } else {
            0.0
        },
        diameter_scale: scale,
        nominal_effective_diameter_m: area_equivalent(&nominal_d),
        implied_effective_diameter_m: implied_d.as_deref().map(area_equivalent),
        nominal_diameters_m: nominal_d,
        implied_diameters_m: implied_d,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
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
}

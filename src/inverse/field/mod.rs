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
//!
//! The readings and their bands are in [`reading`] (private, re-exported);
//! the inferred friction and nozzle scale in `infer`.

pub mod causes;
pub mod findings;
mod infer;
mod reading;

pub use causes::{
    effective_diameter, Alone, Cause, CauseEvidence, CauseInputs, CauseKind, Chain, NozzleAlone,
    ResistSplit,
};
pub use findings::{Detail, Direction, Finding, FindingKind, Within};
pub use reading::{
    FieldError, FieldReading, FieldTolerances, FlowReading, RotationReading, ThrowReading,
    DEFAULT_COUNT_RESOLUTION_TURNS, DEFAULT_STOPWATCH_RESOLUTION_S, DEFAULT_THROW_RESOLUTION_M,
    DEFAULT_VOLUME_RESOLUTION_M3,
};

use infer::{flow_at, implied_friction, nozzle_scale_for, with_nozzle_scale, with_pressure};
use reading::{positive, resolution};

pub use crate::physics::balance::REGULATOR_LIMIT_PA;

use crate::physics::balance::{rad_s, rpm, solve, solve_speed, SpinReport, SpinStatus};
use crate::physics::design::Design;
use crate::physics::ThrowFn;

/// Score given to a finding that voids the speed comparison (ranks it first).
pub const VOIDS_COMPARISON: f64 = 1.0e6;

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
        nominal_effective_diameter_m: effective_diameter(at_p, 1.0),
        implied_effective_diameter_m: scale.map(|s| effective_diameter(at_p, s)),
        nominal_diameters_m: nominal_d,
        implied_diameters_m: implied_d,
    })
}

#[cfg(test)]
mod tests;

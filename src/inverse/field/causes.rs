//! Candidate causes of a speed deviation, each with how much of it it
//! explains (model.md M10, "Causes").
//!
//! The deviation is measured against the design as built: Δ = n_m − n_d
//! (rpm), n_d the design's own operating speed. It is taken apart in steps:
//!
//! 1. **Pressure** (measured): the design solved at the measured inlet
//!    pressure, n_p; the pressure explains n_p − n_d.
//! 2. **Nozzle** (when a flow was measured): the design at the measured
//!    pressure with the as-found nozzles (the common diameter scale that passes
//!    the measured flow), n_s; the nozzle explains n_s − n_p.
//! 3. **The rest**, R = n_m − n_s (or n_m − n_p without a flow), lies in the
//!    resisting torque. At the measured speed ω_m the drive T_D(ω_m) must equal
//!    the resisting torque; the design's parts there are T_bearing, T_seal,
//!    T_brake, T_air, summing to T_R. The excess E = T_D − T_R (N·m; > 0 when
//!    more drag is needed, the rotor being slower than the model) is shared
//!    among the parts in proportion to their torque — the attribution a common
//!    drift of all parts would give — so part i explains (T_i/T_R)·R rpm. The
//!    factor on part i alone that balances the rotor at ω_m is
//!
//!    ```text
//!    kᵢ = 1 + E / Tᵢ
//!    ```
//!
//!    (net torque at a fixed speed is linear in each part's size: the
//!    washer's torque in μ_k, the brake's in c₁ and c₂, the seal's as a whole,
//!    the air's in C_D). A kᵢ below zero would need negative friction: that
//!    part alone is **impossible** as an explanation. The part with the
//!    largest torque needs the smallest change, so the ranking by share is also
//!    the ranking by plausibility.
//! 4. Without a flow reading, a **partly clogged nozzle** is tried as an
//!    alternative for R: the common nozzle scale s* with net torque zero at
//!    ω_m (Brent). A faster rotor would need a nozzle larger than new, which a
//!    clogged nozzle cannot be: impossible without a flow reading to show wear.
//!
//! Causes are ranked by |rpm explained|; a cause that works against the
//! deviation has the opposite sign. Sign convention: rpm explained is
//! positive when the cause makes the rotor faster than designed.

use super::infer::with_nozzle_scale;
use crate::numeric::root::{brent, Tolerance};
use crate::physics::balance::{rad_s, SpinModel};
use crate::physics::design::{Bearing, Design};
use crate::physics::torque::ResistingTorque;

/// A candidate cause of a speed deviation.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum CauseKind {
    /// The inlet pressure (measured).
    Pressure,
    /// A worn or clogged nozzle (from the measured flow, or tried without one).
    Nozzle,
    /// The thrust bearing's running friction.
    Bearing,
    /// Seal drag.
    Seal,
    /// The speed brake.
    Brake,
    /// Air drag on the arms.
    Air,
}

impl CauseKind {
    /// The fixed key used in JSON ("pressure", "nozzle", "bearing", …).
    pub fn key(self) -> &'static str {
        match self {
            CauseKind::Pressure => "pressure",
            CauseKind::Nozzle => "nozzle",
            CauseKind::Bearing => "bearing",
            CauseKind::Seal => "seal",
            CauseKind::Brake => "brake",
            CauseKind::Air => "air",
        }
    }
}

/// What one resisting part would need to explain the rest alone.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Alone {
    /// The part at `factor` × its design torque (factor ≥ 0) balances the rotor.
    Factor {
        /// Times the design's torque (or μ_k, c₁ and c₂, C_D), ≥ 0.
        factor: f64,
        /// The torque it would then have at the measured speed, N·m (≥ 0).
        needed_n_m: f64,
    },
    /// The design has none of it; this much torque would balance the rotor, N·m (> 0).
    Added {
        /// Torque needed at the measured speed, N·m.
        needed_n_m: f64,
    },
    /// Impossible: it would need less than no friction.
    NegativeFriction,
    /// The design has none of it (no brake fitted, say), and less drag is needed.
    Absent,
}

/// What the nozzle alone would need, when no flow was measured.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum NozzleAlone {
    /// A common diameter scale below one (a partly clogged nozzle).
    Clogged {
        /// Diameter scale, 0 < s < 1.
        scale: f64,
        /// Area-equivalent diameter it implies, m.
        effective_diameter_m: f64,
        /// Area-equivalent diameter of the new nozzles, m.
        nominal_diameter_m: f64,
    },
    /// Impossible: a nozzle larger than new (wear would show as more flow).
    LargerThanNew,
    /// No nozzle size explains it.
    NotFound,
}

/// The evidence behind a cause.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum CauseEvidence {
    /// The measured inlet pressure against the design's.
    Pressure {
        /// Measured, Pa.
        measured_pa: f64,
        /// The design's own inlet pressure, Pa.
        design_pa: f64,
    },
    /// The nozzle size found from the measured flow.
    NozzleFromFlow {
        /// Common diameter scale (1 = new).
        scale: f64,
        /// Area-equivalent diameter found, m.
        effective_diameter_m: f64,
        /// Area-equivalent diameter of the new nozzles, m.
        nominal_diameter_m: f64,
    },
    /// The nozzle tried as an explanation without a flow reading.
    NozzleUnmeasured(NozzleAlone),
    /// A resisting part at the measured speed.
    Part {
        /// Its torque by design at the measured speed, N·m (≥ 0).
        design_n_m: f64,
        /// Its share of the design's resisting torque there, 0…1.
        share: f64,
        /// What it would need alone.
        alone: Alone,
        /// The design's kinetic μ when the part is a washer bearing.
        design_mu_kinetic: Option<f64>,
    },
}

/// One candidate cause.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Cause {
    /// Which.
    pub kind: CauseKind,
    /// rpm of the deviation it accounts for (positive: faster than designed);
    /// None when it cannot be said (a hypothesis, or a model that does not run).
    pub explains_rpm: Option<f64>,
    /// The numbers behind it.
    pub evidence: CauseEvidence,
}

impl Cause {
    /// True when the cause would need an impossible value.
    pub fn impossible(&self) -> bool {
        matches!(
            self.evidence,
            CauseEvidence::Part {
                alone: Alone::NegativeFriction,
                ..
            } | CauseEvidence::NozzleUnmeasured(NozzleAlone::LargerThanNew)
        )
    }

    /// True when it accounts for part of a deviation of `deviation_rpm`
    /// (same sign, possible).
    pub fn explains(&self, deviation_rpm: f64) -> bool {
        !self.impossible()
            && self
                .explains_rpm
                .is_some_and(|e| e != 0.0 && e.signum() == deviation_rpm.signum())
    }
}

/// The resisting torque at the measured speed, by part, against the drive.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ResistSplit {
    /// The measured speed, rad/s.
    pub omega_rad_s: f64,
    /// Drive torque there (as-found nozzles, measured pressure), N·m.
    pub drive_n_m: f64,
    /// The design's resisting parts there, N·m.
    pub parts: ResistingTorque,
    /// Drive minus the design's resisting torque, N·m: the drag missing (> 0)
    /// or in excess (< 0) for the rotor to hold the measured speed.
    pub excess_n_m: f64,
}

/// Speeds of the chain, rpm (None where the model does not run).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Chain {
    /// The design's own operating speed.
    pub design_rpm: Option<f64>,
    /// At the measured pressure.
    pub at_pressure_rpm: Option<f64>,
    /// At the measured pressure with the as-found nozzles (when a flow was measured).
    pub nozzles_found_rpm: Option<f64>,
    /// The measured speed.
    pub measured_rpm: f64,
}

/// The inputs of the cause analysis.
#[derive(Debug, Clone, Copy)]
pub struct CauseInputs<'a> {
    /// The design at the measured pressure (nominal nozzles).
    pub at_pressure: &'a Design,
    /// The design at the measured pressure with the as-found nozzles.
    pub nozzles_found: &'a Design,
    /// Measured pressure, Pa.
    pub measured_pa: f64,
    /// The design's own inlet pressure, Pa.
    pub design_pa: f64,
    /// Nozzle scale from a measured flow (None without a flow reading or
    /// when no nozzle size passes it).
    pub flow_scale: Option<f64>,
    /// The chain of speeds.
    pub chain: Chain,
}

/// The causes, ranked, and the resisting torque's split at the measured speed.
pub fn causes(inputs: &CauseInputs) -> (Vec<Cause>, ResistSplit) {
    let c = inputs.chain;
    let omega = rad_s(c.measured_rpm);
    let mut out = Vec::new();
    out.push(Cause {
        kind: CauseKind::Pressure,
        explains_rpm: diff(c.at_pressure_rpm, c.design_rpm),
        evidence: CauseEvidence::Pressure {
            measured_pa: inputs.measured_pa,
            design_pa: inputs.design_pa,
        },
    });
    let nominal_d = effective_diameter(inputs.at_pressure, 1.0);
    let reference = match inputs.flow_scale {
        Some(scale) => {
            out.push(Cause {
                kind: CauseKind::Nozzle,
                explains_rpm: diff(c.nozzles_found_rpm, c.at_pressure_rpm),
                evidence: CauseEvidence::NozzleFromFlow {
                    scale,
                    effective_diameter_m: nominal_d * scale,
                    nominal_diameter_m: nominal_d,
                },
            });
            c.nozzles_found_rpm
        }
        None => c.at_pressure_rpm,
    };
    let rest_rpm = reference.map(|r| c.measured_rpm - r);

    let model = SpinModel::new(inputs.nozzles_found);
    let point = model.point(omega);
    let parts = point.resist;
    let total = parts.total_n_m();
    let excess = point.drive_n_m - total;
    let split = ResistSplit {
        omega_rad_s: omega,
        drive_n_m: point.drive_n_m,
        parts,
        excess_n_m: excess,
    };
    // Drag alone can explain the rest only if the parts together can take it.
    let drag_can = total + excess >= 0.0;
    let design_mu = match inputs.nozzles_found.friction.bearing {
        Bearing::Washer(w) => Some(w.mu_kinetic),
        Bearing::Measured { .. } => None,
    };
    for (kind, t, may_add) in [
        (CauseKind::Bearing, parts.bearing_n_m, true),
        (CauseKind::Seal, parts.seal_n_m, false),
        (CauseKind::Brake, parts.brake_n_m, false),
        (CauseKind::Air, parts.air_n_m, false),
    ] {
        let alone = alone(t, excess, total, may_add);
        let share = if total > 0.0 { t / total } else { 0.0 };
        out.push(Cause {
            kind,
            explains_rpm: rest_rpm.filter(|_| drag_can).map(|r| share * r),
            evidence: CauseEvidence::Part {
                design_n_m: t,
                share,
                alone,
                design_mu_kinetic: (kind == CauseKind::Bearing).then_some(design_mu).flatten(),
            },
        });
    }
    if inputs.flow_scale.is_none() {
        out.push(Cause {
            kind: CauseKind::Nozzle,
            explains_rpm: None,
            evidence: CauseEvidence::NozzleUnmeasured(nozzle_alone(
                inputs.at_pressure,
                omega,
                excess,
                nominal_d,
            )),
        });
    }
    rank(&mut out);
    (out, split)
}

/// Most of the deviation first; impossible and unquantified causes last.
fn rank(causes: &mut [Cause]) {
    let key = |c: &Cause| -> (u8, f64) {
        match (c.impossible(), c.explains_rpm) {
            (false, Some(e)) => (0, -e.abs()),
            (false, None) => (1, 0.0),
            (true, _) => (2, 0.0),
        }
    };
    causes.sort_by(|a, b| {
        let (ka, kb) = (key(a), key(b));
        ka.0.cmp(&kb.0).then(ka.1.total_cmp(&kb.1))
    });
}

fn diff(a: Option<f64>, b: Option<f64>) -> Option<f64> {
    Some(a? - b?)
}

fn alone(t: f64, excess: f64, total: f64, may_add: bool) -> Alone {
    // A part this small against the whole counts as absent.
    let tiny = 1e-12 * total.abs().max(excess.abs()).max(1e-30);
    if t > tiny {
        let factor = 1.0 + excess / t;
        if factor < 0.0 {
            Alone::NegativeFriction
        } else {
            Alone::Factor {
                factor,
                needed_n_m: factor * t,
            }
        }
    } else if excess > 0.0 && may_add {
        Alone::Added { needed_n_m: excess }
    } else if excess > 0.0 {
        Alone::Absent
    } else if excess < 0.0 && may_add {
        Alone::NegativeFriction
    } else {
        Alone::Absent
    }
}

/// Area-equivalent diameter √(mean d²) of the nozzles, scaled, m.
pub fn effective_diameter(design: &Design, scale: f64) -> f64 {
    let arms = &design.rotor.arms;
    if arms.is_empty() {
        return 0.0;
    }
    let mean_sq = arms
        .iter()
        .map(|a| (a.nozzle.diameter_m * scale).powi(2))
        .sum::<f64>()
        / arms.len() as f64;
    mean_sq.sqrt()
}

fn nozzle_alone(at_pressure: &Design, omega: f64, excess: f64, nominal_d: f64) -> NozzleAlone {
    if excess <= 0.0 {
        // Faster than the model: more drive, a larger nozzle than new.
        return if excess < 0.0 {
            NozzleAlone::LargerThanNew
        } else {
            NozzleAlone::Clogged {
                scale: 1.0,
                effective_diameter_m: nominal_d,
                nominal_diameter_m: nominal_d,
            }
        };
    }
    let net = |s: f64| SpinModel::new(&with_nozzle_scale(at_pressure, s)).net(omega);
    // net(1) = excess > 0 (the model outruns the reading); a smaller nozzle
    // drives less, down to net < 0.
    let lo = 0.02;
    if net(lo) >= 0.0 {
        return NozzleAlone::NotFound;
    }
    let tol = Tolerance {
        x: 1e-12,
        f: 1e-13 * excess.abs().max(1e-15),
        max_iter: 200,
    };
    match brent(net, lo, 1.0, tol) {
        Ok(scale) => NozzleAlone::Clogged {
            scale,
            effective_diameter_m: nominal_d * scale,
            nominal_diameter_m: nominal_d,
        },
        Err(_) => NozzleAlone::NotFound,
    }
}

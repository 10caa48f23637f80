//! Drive torque from the moment-of-momentum balance (model.md M2) and the
//! resisting torque of bearing, seal, brake and air (M5).
//!
//! Drive torque, positive in the drive sense (+ẑ), on a steady control volume
//! around the rotor:
//!
//! ```text
//! T_drive(ω) = − Σᵢ ṁᵢ (rᵢ × Vᵢ)·ẑ + ṁ_in (r_in × V_in)·ẑ,   Vᵢ = Wᵢ êᵢ + ω ẑ × rᵢ
//! ```
//!
//! with êᵢ the nozzle's unit direction in the rotor frame (radial cos α sin δ,
//! tangential −cos α cos δ, vertical sin α). Inflow along the axis has r⊥ = 0 and
//! carries no moment of momentum; the term is kept so that a design with an
//! off-axis inlet is handled without special cases.
//!
//! Resisting torque, positive against the drive sense:
//! T_resist = T_bearing + T_seal + c₁ω + c₂ω² + T_air(ω).

use std::f64::consts::PI;

use nalgebra::Vector3;

use super::design::{Arm, Bearing, Design, Friction, Washer, WasherRule, GRAVITY_M_S2};
use super::fluid::AirProps;
use super::hydraulics::{NozzleFlow, SupplyState};
use super::jet::JetExit;

/// Unit vectors of an arm at azimuth φ: (radial, forward tangential, vertical).
pub fn arm_frame(azimuth_rad: f64) -> (Vector3<f64>, Vector3<f64>, Vector3<f64>) {
    let (s, c) = azimuth_rad.sin_cos();
    (
        Vector3::new(c, s, 0.0),
        Vector3::new(-s, c, 0.0),
        Vector3::z(),
    )
}

/// Unit direction of a nozzle's jet relative to the arm, ground-frame components.
pub fn jet_direction(arm: &Arm) -> Vector3<f64> {
    let (radial, tangential, vertical) = arm_frame(arm.azimuth_rad);
    let (alpha, delta) = (arm.nozzle.elevation_rad, arm.nozzle.deflection_rad);
    radial * (alpha.cos() * delta.sin()) - tangential * (alpha.cos() * delta.cos())
        + vertical * alpha.sin()
}

/// Nozzle exit position, m, ground frame.
pub fn exit_position(arm: &Arm) -> Vector3<f64> {
    let (radial, _, _) = arm_frame(arm.azimuth_rad);
    radial * arm.radius_m + Vector3::z() * arm.height_m
}

/// Absolute jet velocity at the exit, m/s: V = W ê + ω ẑ × r.
pub fn absolute_velocity(arm: &Arm, jet_speed_relative_m_s: f64, omega_rad_s: f64) -> Vector3<f64> {
    let r = exit_position(arm);
    jet_direction(arm) * jet_speed_relative_m_s + (Vector3::z() * omega_rad_s).cross(&r)
}

/// The jet of every arm at one state, in arm order (an idle nozzle's jet has
/// zero flow and leaves at the arm's own speed).
pub fn jets(design: &Design, state: &SupplyState) -> Vec<JetExit> {
    design
        .rotor
        .arms
        .iter()
        .zip(&state.nozzles)
        .map(|(arm, n)| JetExit {
            position_m: exit_position(arm),
            velocity_m_s: absolute_velocity(arm, n.jet_speed_relative_m_s, state.omega_rad_s),
            flow_m3_s: n.flow_m3_s,
            nozzle_diameter_m: arm.nozzle.diameter_m,
            nozzle_pressure_pa: n.nozzle_pressure_pa,
            omega_rad_s: state.omega_rad_s,
        })
        .collect()
}

/// Moment of momentum flux about +ẑ of a stream of mass flow `mass_flow_kg_s`
/// at position `r` with absolute velocity `v`: ṁ (r × V)·ẑ, N·m.
pub fn moment_of_momentum(mass_flow_kg_s: f64, r: &Vector3<f64>, v: &Vector3<f64>) -> f64 {
    mass_flow_kg_s * r.cross(v).z
}

/// Drive torque on the rotor in the drive sense, N·m.
///
/// Water enters on the axis (r = 0, V along ẑ), which contributes nothing;
/// the term is evaluated all the same.
pub fn drive_torque(design: &Design, state: &SupplyState, water_density: f64) -> f64 {
    let out: f64 = design
        .rotor
        .arms
        .iter()
        .zip(&state.nozzles)
        .map(|(arm, n)| {
            let v = absolute_velocity(arm, n.jet_speed_relative_m_s, state.omega_rad_s);
            moment_of_momentum(water_density * n.flow_m3_s, &exit_position(arm), &v)
        })
        .sum();
    let inlet_area = PI * design.rotor.swivel.inlet_bore_m.powi(2) / 4.0;
    let v_in = Vector3::new(0.0, 0.0, state.total_flow_m3_s / inlet_area);
    let inflow = moment_of_momentum(
        water_density * state.total_flow_m3_s,
        &Vector3::zeros(),
        &v_in,
    );
    inflow - out
}

/// The parts of the resisting torque at one state, N·m (all ≥ 0, against the drive).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct ResistingTorque {
    /// Thrust bearing (kinetic friction when turning, static at rest).
    pub bearing_n_m: f64,
    /// Seal drag.
    pub seal_n_m: f64,
    /// Speed brake, c₁ω + c₂ω².
    pub brake_n_m: f64,
    /// Air drag on the arms.
    pub air_n_m: f64,
}

impl ResistingTorque {
    /// Sum of the parts, N·m.
    pub fn total_n_m(&self) -> f64 {
        self.bearing_n_m + self.seal_n_m + self.brake_n_m + self.air_n_m
    }
}

/// Effective friction radius of a flat washer, m.
pub fn washer_effective_radius_m(washer: &Washer) -> f64 {
    let (ri, ro) = (washer.inner_m, washer.outer_m);
    match washer.radius_rule {
        WasherRule::UniformWear => 0.5 * (ro + ri),
        WasherRule::UniformPressure => 2.0 / 3.0 * (ro.powi(3) - ri.powi(3)) / (ro * ro - ri * ri),
    }
}

/// Axial force pressing the rotor on its washer, N:
/// |p_hub·A_thrust − m g − Σ ṁ V_z| (pressure lifts; weight and the jets'
/// downward reaction unload).
pub fn washer_axial_force_n(
    washer: &Washer,
    design: &Design,
    state: &SupplyState,
    water_density: f64,
) -> f64 {
    let jet_reaction: f64 = design
        .rotor
        .arms
        .iter()
        .zip(&state.nozzles)
        .map(|(arm, n)| {
            let v = absolute_velocity(arm, n.jet_speed_relative_m_s, state.omega_rad_s);
            water_density * n.flow_m3_s * v.z
        })
        .sum();
    (state.hub_pressure_pa * washer.thrust_area_m2
        - washer.rotor_mass_kg * GRAVITY_M_S2
        - jet_reaction)
        .abs()
}

/// Air drag torque on the arms, N·m: Σ ½ρ C_D D_o ω² (R⁴ − r_hub⁴)/4.
pub fn air_drag_torque(design: &Design, air: &AirProps, omega_rad_s: f64) -> f64 {
    let hub = design.rotor.hub_radius_m;
    design
        .rotor
        .arms
        .iter()
        .map(|arm| {
            let reach = (arm.radius_m.powi(4) - hub.powi(4)).max(0.0) / 4.0;
            0.5 * air.density_kg_m3
                * design.friction.arm_drag_cd
                * arm.tube.outer_m
                * omega_rad_s
                * omega_rad_s
                * reach
        })
        .sum()
}

/// Whether friction is taken as kinetic (turning) or static (breakaway, at rest).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Motion {
    /// Turning: kinetic bearing friction.
    Turning,
    /// At rest, the torque needed to start: static bearing friction.
    Breakaway,
}

/// Resisting torque of `design` at the given state, N·m per part.
pub fn resisting_torque(
    design: &Design,
    state: &SupplyState,
    water_density: f64,
    air: &AirProps,
    motion: Motion,
) -> ResistingTorque {
    let Friction {
        bearing,
        seal,
        brake,
        ..
    } = design.friction;
    let omega = state.omega_rad_s;
    let bearing_n_m = match bearing {
        Bearing::Measured {
            running_n_m,
            breakaway_n_m,
        } => match motion {
            Motion::Turning => running_n_m,
            Motion::Breakaway => breakaway_n_m,
        },
        Bearing::Washer(w) => {
            let mu = match motion {
                Motion::Turning => w.mu_kinetic,
                Motion::Breakaway => w.mu_static,
            };
            mu * washer_axial_force_n(&w, design, state, water_density)
                * washer_effective_radius_m(&w)
        }
    };
    ResistingTorque {
        bearing_n_m,
        seal_n_m: (seal.base_n_m + seal.per_pa_n_m * state.hub_pressure_pa).max(0.0),
        brake_n_m: brake.viscous * omega + brake.quadratic * omega * omega,
        air_n_m: air_drag_torque(design, air, omega),
    }
}

/// Jet kinetic power leaving the nozzles, W: Σ ½ ṁ |V|².
pub fn jet_kinetic_power_w(design: &Design, state: &SupplyState, water_density: f64) -> f64 {
    design
        .rotor
        .arms
        .iter()
        .zip(&state.nozzles)
        .map(|(arm, n): (&Arm, &NozzleFlow)| {
            let v = absolute_velocity(arm, n.jet_speed_relative_m_s, state.omega_rad_s);
            0.5 * water_density * n.flow_m3_s * v.norm_squared()
        })
        .sum()
}

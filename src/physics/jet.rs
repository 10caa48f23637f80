//! A jet as it leaves a nozzle: the hand-over from the spin solver to the throw.
//!
//! The spin solver (model.md M1–M6) produces one [`JetExit`] per flowing nozzle
//! at the operating point; trajectories, drop spectra and the water pattern
//! (M7–M9) start from it. Vectors are in the ground frame at the instant the
//! arm points along its design azimuth; sweeping the jet through a turn is a
//! rotation of both vectors about +z.

use nalgebra::{Rotation3, Vector3};

/// One nozzle's jet at its exit, in the ground frame.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct JetExit {
    /// Nozzle exit position, m (z is height above ground).
    pub position_m: Vector3<f64>,
    /// Absolute jet velocity at the exit, m/s (relative jet plus ω ẑ × r).
    pub velocity_m_s: Vector3<f64>,
    /// Volumetric flow through the nozzle, m³/s.
    pub flow_m3_s: f64,
    /// Nozzle exit diameter, m.
    pub nozzle_diameter_m: f64,
    /// Pressure drop across the nozzle (the head that makes the jet), Pa.
    pub nozzle_pressure_pa: f64,
    /// Rotor speed when the jet left, rad/s (positive in the drive sense, about +z;
    /// 0 for a head held still). It sets how much the turning arm stretches the stream.
    pub omega_rad_s: f64,
}

impl JetExit {
    /// Jet velocity relative to the turning arm, m/s: W = V − ω ẑ × r.
    pub fn relative_velocity_m_s(&self) -> Vector3<f64> {
        self.velocity_m_s - (Vector3::z() * self.omega_rad_s).cross(&self.position_m)
    }

    /// The same jet after the rotor has turned by `angle_rad` about +z.
    pub fn turned(&self, angle_rad: f64) -> JetExit {
        let rot = Rotation3::from_axis_angle(&Vector3::z_axis(), angle_rad);
        JetExit {
            position_m: rot * self.position_m,
            velocity_m_s: rot * self.velocity_m_s,
            ..*self
        }
    }
}

//! Ready-made designs for tests, benchmarks and closed-form checks.
//!
//! These are invented designs, built directly in SI without a scenario file,
//! so that the physics can be exercised on its own.

use super::design::{
    Arm, Bearing, Brake, Design, Friction, Inertia, Nozzle, Rotor, Seal, Site, SpraySpec, Supply,
    Swivel, Tube, Washer, WasherRule, Wind,
};
use super::fluid::{AirProps, WaterProps};
use super::trajectory::FlightEnv;

/// Air and water both at 20 °C, air at sea level, with a wind of
/// `speed_m_s` blowing from `from_rad` (counter-clockwise from +x, as
/// [`Wind`]); the
/// flight conditions of most throw tests and benchmarks.
pub fn flight_env_20c(speed_m_s: f64, from_rad: f64) -> FlightEnv {
    FlightEnv::new(
        &AirProps::at(20.0, 0.0),
        &WaterProps::at(20.0),
        &Wind {
            speed_m_s,
            from_rad,
        },
    )
}

/// `count` identical arms spaced evenly in azimuth, each with the same nozzle.
///
/// Radius and nozzle diameter in m, angles in rad. Tubes are wide and smooth
/// relative to the nozzle; the bearing is a measured torque of zero (no
/// friction) so that tests can add exactly the friction they need.
pub fn symmetric_rotor(
    count: usize,
    radius_m: f64,
    nozzle_diameter_m: f64,
    elevation_rad: f64,
    deflection_rad: f64,
    supply: Supply,
) -> Design {
    let arm = |k: usize| Arm {
        radius_m,
        azimuth_rad: 2.0 * std::f64::consts::PI * k as f64 / count as f64,
        height_m: 0.3,
        rise_m: 0.0,
        tube: Tube {
            bore_m: 4.0 * nozzle_diameter_m,
            outer_m: 5.0 * nozzle_diameter_m,
            roughness_m: 1.5e-6,
            minor_k: 0.0,
            length_m: None,
        },
        nozzle: Nozzle {
            diameter_m: nozzle_diameter_m,
            elevation_rad,
            deflection_rad,
            cd: 1.0,
            cv: 1.0,
        },
    };
    Design {
        name: format!("{count}-arm test rotor"),
        water_temperature_c: 20.0,
        site: Site {
            air_temperature_c: 20.0,
            altitude_m: 0.0,
            clearance_m: None,
        },
        supply,
        rotor: Rotor {
            hub_radius_m: 0.1 * radius_m,
            swivel: Swivel {
                inlet_bore_m: 0.5,
                k: 0.0,
            },
            arms: (0..count).map(arm).collect(),
            inertia: Inertia::Given { kg_m2: 0.01 },
        },
        friction: Friction {
            bearing: Bearing::Measured {
                running_n_m: 0.0,
                breakaway_n_m: 0.0,
            },
            seal: Seal::default(),
            brake: Brake::default(),
            arm_drag_cd: 0.0,
        },
        spray: SpraySpec::default(),
        layout: None,
        wind: Wind::default(),
    }
}

/// A three-arm lawn rotor on 280 kPa with a washer bearing and a viscous brake.
pub fn three_arm_rotor() -> Design {
    let deg = std::f64::consts::PI / 180.0;
    let mut d = symmetric_rotor(
        3,
        0.16,
        2.4e-3,
        22.0 * deg,
        15.0 * deg,
        Supply::Pressure { inlet_pa: 280e3 },
    );
    d.name = "three-arm rotor".into();
    for arm in &mut d.rotor.arms {
        arm.tube = Tube {
            bore_m: 6e-3,
            outer_m: 9e-3,
            roughness_m: 1.5e-6,
            minor_k: 0.5,
            length_m: None,
        };
        arm.nozzle.cd = 0.96;
        arm.nozzle.cv = 0.98;
        arm.height_m = 0.35;
    }
    d.rotor.hub_radius_m = 0.012;
    d.rotor.swivel = Swivel {
        inlet_bore_m: 0.012,
        k: 1.5,
    };
    d.rotor.inertia = Inertia::Estimate {
        tube_density_kg_m3: 8500.0,
        tube_wall_m: 0.8e-3,
        tip_mass_kg: 0.006,
    };
    d.friction = Friction {
        bearing: Bearing::Washer(Washer {
            mu_kinetic: 0.10,
            mu_static: 0.15,
            inner_m: 4e-3,
            outer_m: 8e-3,
            thrust_area_m2: 110e-6,
            rotor_mass_kg: 0.18,
            radius_rule: WasherRule::UniformWear,
        }),
        seal: Seal::default(),
        brake: Brake {
            viscous: 0.02,
            quadratic: 0.0,
        },
        arm_drag_cd: 1.1,
    };
    d
}

/// The single-nozzle throw check against published relations (the test
/// `tests/throw_published.rs` and the fit `examples/fit_throw_constants.rs`
/// share it, so both judge the same nozzles against the same target).
pub mod published_throw {
    use std::f64::consts::PI;

    use nalgebra::Vector3;

    use crate::physics::jet::JetExit;
    use crate::physics::trajectory::FlightEnv;

    /// Velocity coefficient of a smooth tapered nozzle (common practice, as
    /// in the shipped scenarios).
    pub const CV: f64 = 0.98;
    /// Discharge coefficient of a smooth tapered nozzle (common practice).
    pub const CD: f64 = 0.96;
    /// Nozzle diameters of the check, mm.
    pub const SIZES_MM: [f64; 7] = [2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0];
    /// Pressures across the nozzle, Pa.
    pub const PRESSURES_PA: [f64; 4] = [150e3, 250e3, 350e3, 450e3];
    /// (angle above horizontal, °; height above ground, m).
    pub const GEOMETRIES: [(f64, f64); 2] = [(25.0, 0.5), (28.0, 1.0)];

    /// Still air and water, both at 20 °C, at sea level.
    pub fn env() -> FlightEnv {
        super::flight_env_20c(0.0, 0.0)
    }

    /// A radial nozzle of diameter `d_m` (m) at `p_pa` (Pa) across it,
    /// `angle_deg` (°) above horizontal, `height_m` (m) above ground, on a
    /// rotor held still: exit speed C_v·√(2p/ρ), flow C_d·(πd²/4)·√(2p/ρ).
    pub fn nozzle(d_m: f64, p_pa: f64, angle_deg: f64, height_m: f64) -> JetExit {
        let ideal = (2.0 * p_pa / env().water_density_kg_m3).sqrt();
        let a = angle_deg.to_radians();
        JetExit {
            position_m: Vector3::new(0.0, 0.0, height_m),
            velocity_m_s: Vector3::new(a.cos(), 0.0, a.sin()) * (CV * ideal),
            flow_m3_s: CD * PI * d_m * d_m / 4.0 * ideal,
            nozzle_diameter_m: d_m,
            nozzle_pressure_pa: p_pa,
            omega_rad_s: 0.0,
        }
    }

    /// Wetted radius by the mean of two published relations, m, for a nozzle
    /// of `d_mm` (mm) at `p_pa` (Pa), h the pressure head in m:
    ///
    /// - R = 1.35·√(d·h) — Keller & Bliesner (1990), *Sprinkle and Trickle
    ///   Irrigation* (from memory);
    /// - R = 1.70·d^0.487·h^0.45 — a 1989 sprinkler-irrigation design
    ///   manual (from memory).
    pub fn published_m(d_mm: f64, p_pa: f64) -> f64 {
        let h = p_pa / (env().water_density_kg_m3 * 9.80665);
        let keller_bliesner = 1.35 * (d_mm * h).sqrt();
        let manual = 1.70 * d_mm.powf(0.487) * h.powf(0.45);
        0.5 * (keller_bliesner + manual)
    }
}

//! Ready-made designs for tests, benchmarks and closed-form checks.
//!
//! These are invented designs, built directly in SI without a scenario file,
//! so that the physics can be exercised on its own.

use super::design::{
    Arm, Bearing, Brake, Design, Friction, Inertia, Nozzle, Rotor, Seal, Site, SpraySpec, Supply,
    Swivel, Tube, Washer, WasherRule, Wind,
};

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

//! Property tests of the spin solver over random valid designs.

use std::f64::consts::PI;

use proptest::prelude::*;
use spinwright::physics::balance::{solve, SpinReport, SpinStatus};
use spinwright::physics::design::{Bearing, Design, Inertia, Supply, Washer, WasherRule};
use spinwright::physics::fixtures::symmetric_rotor;

const DEG: f64 = PI / 180.0;

/// A random but physically valid design: 1–6 arms, garden-to-field sizes,
/// all three supply modes, washer or measured bearing, brakes and air drag.
pub fn design() -> impl Strategy<Value = Design> {
    (
        1usize..=6,
        0.08f64..1.2,
        1.0e-3f64..6.0e-3,
        0.0f64..60.0,
        -30.0f64..80.0,
        0usize..3,
        50e3f64..600e3,
        (0.0f64..0.5, 0.0f64..0.02, 0.0f64..0.05),
        any::<bool>(),
        prop::collection::vec((-0.1f64..0.1, -8.0f64..8.0), 6),
    )
        .prop_map(
            |(n, r, d, elev, defl, mode, p, (visc, quad, running), washer, jitter)| {
                let flow = 0.96 * PI * d * d / 4.0 * (2.0 * p / 998.0).sqrt() * n as f64;
                let supply = match mode {
                    0 => Supply::Pressure { inlet_pa: p },
                    1 => Supply::Flow { total_m3_s: flow },
                    _ => Supply::Line(spinwright::physics::design::Line {
                        source_pa: p,
                        length_m: 20.0,
                        bore_m: 0.016,
                        roughness_m: 1.5e-6,
                        minor_k: 2.0,
                        lift_m: 0.5,
                    }),
                };
                let mut design = symmetric_rotor(n, r, d, elev * DEG, defl * DEG, supply);
                for (arm, (dr, dd)) in design.rotor.arms.iter_mut().zip(jitter) {
                    arm.radius_m *= 1.0 + dr;
                    arm.nozzle.deflection_rad += dd * DEG;
                    arm.nozzle.cd = 0.96;
                    arm.nozzle.cv = 0.98;
                    arm.tube.minor_k = 0.5;
                }
                design.rotor.inertia = Inertia::Estimate {
                    tube_density_kg_m3: 2700.0,
                    tube_wall_m: 0.2 * d,
                    tip_mass_kg: 0.01,
                };
                design.friction.brake.viscous = visc * r * r;
                design.friction.brake.quadratic = quad * r * r;
                design.friction.arm_drag_cd = 1.1;
                design.friction.bearing = if washer {
                    Bearing::Washer(Washer {
                        mu_kinetic: 0.1,
                        mu_static: 0.15,
                        inner_m: 0.004,
                        outer_m: 0.008,
                        thrust_area_m2: 1.1e-4,
                        rotor_mass_kg: 0.2 * n as f64,
                        radius_rule: WasherRule::UniformWear,
                    })
                } else {
                    Bearing::Measured {
                        running_n_m: running,
                        breakaway_n_m: 1.5 * running,
                    }
                };
                design
            },
        )
}

fn all_finite(report: &SpinReport) -> bool {
    let mut numbers = vec![
        report.stall_torque_n_m,
        report.breakaway_torque_n_m,
        report.omega_cap_rad_s,
        report.inertia_kg_m2,
        report.at_rest.hub_pressure_pa,
        report.at_rest.total_flow_m3_s,
    ];
    numbers.extend(report.start_margin);
    numbers.extend(report.runaway_rad_s);
    numbers.extend(report.equilibria.iter().map(|e| e.omega_rad_s));
    if let Some(op) = &report.operating {
        numbers.extend([
            op.omega_rad_s(),
            op.point.drive_n_m,
            op.point.resist.total_n_m(),
            op.point.state.total_flow_m3_s,
            op.point.state.hub_pressure_pa,
        ]);
        numbers.extend(
            op.point
                .state
                .nozzles
                .iter()
                .map(|n| n.jet_speed_relative_m_s),
        );
    }
    if let Some(s) = report.spin_up {
        numbers.extend([s.t90_s, s.t99_s]);
    }
    if let Some(p) = report.power {
        numbers.extend([p.shaft_w, p.hydraulic_w, p.jet_kinetic_w]);
    }
    numbers.iter().all(|x| x.is_finite())
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 96, ..ProptestConfig::default() })]

    #[test]
    fn every_valid_design_gets_a_defined_state(design in design()) {
        let report = solve(&design);
        prop_assert!(all_finite(&report), "non-finite number in {report:#?}");
        match report.status {
            SpinStatus::Running => prop_assert!(report.operating.is_some()),
            _ => prop_assert!(report.operating.is_none()),
        }
    }

    #[test]
    fn operating_point_balances_torque(design in design()) {
        if let Some(op) = solve(&design).operating {
            let p = &op.point;
            prop_assert!(p.net_n_m().abs() <= 1e-9 * p.drive_n_m.abs().max(p.resist.total_n_m()),
                "net {} at drive {}", p.net_n_m(), p.drive_n_m);
        }
    }

    #[test]
    fn more_running_friction_never_raises_the_speed(design in design(), extra in 0.001f64..0.5) {
        let base = solve(&design);
        let mut braked = design.clone();
        braked.friction.seal.base_n_m += extra * base.stall_torque_n_m.abs();
        let more = solve(&braked);
        if let (Some(a), Some(b)) = (&base.operating, &more.operating) {
            prop_assert!(b.omega_rad_s() <= a.omega_rad_s() * (1.0 + 1e-9));
        }
        // A rotor that stalls does not start with more friction.
        if base.status == SpinStatus::StallsAtRest {
            prop_assert_eq!(more.status, SpinStatus::StallsAtRest);
        }
    }
}

//! Property tests: any valid design survives being written as a scenario
//! file (in either unit system) and read back, to 1e-9 relative; and a file
//! saved over with any other design (edited in place) reads back as that one.

use proptest::prelude::*;
use spinwright::physics::design::*;
use spinwright::scenario::{edit_in_place, load_str, Scenario};
use spinwright::units::UnitSystem;

use crate::support::assert_designs_close;

use std::f64::consts::{FRAC_PI_2, PI};

/// A fixed flow the nozzles can pass (a larger one is refused on reading,
/// model.md M4): scaled down to at most 1.9 MPa across the nozzles.
fn feasible(supply: Supply, arms: &[Arm], water_c: f64) -> Supply {
    use spinwright::physics::hydraulics::least_nozzle_pressure_for_flow_pa;
    let rho = spinwright::physics::fluid::WaterProps::at(water_c).density_kg_m3;
    match supply {
        Supply::Flow { total_m3_s } => {
            match least_nozzle_pressure_for_flow_pa(arms, total_m3_s, rho) {
                Some(need) if need > 1.9e6 => Supply::Flow {
                    total_m3_s: total_m3_s * (1.9e6 / need).sqrt(),
                },
                _ => supply,
            }
        }
        other => other,
    }
}

fn supply() -> impl Strategy<Value = Supply> {
    prop_oneof![
        (1e3..2e6f64).prop_map(|inlet_pa| Supply::Pressure { inlet_pa }),
        (1e-6..1e-2f64).prop_map(|total_m3_s| Supply::Flow { total_m3_s }),
        (
            1e4..2e6f64,
            0.1..300.0f64,
            0.005..0.1f64,
            0.0..0.4f64,
            0.0..20.0f64,
            -30.0..30.0f64
        )
            .prop_map(|(source_pa, length_m, bore_m, rough, minor_k, lift_m)| {
                Supply::Line(Line {
                    source_pa,
                    length_m,
                    bore_m,
                    roughness_m: rough * bore_m * 0.01,
                    minor_k,
                    lift_m,
                })
            }),
    ]
}

fn arm(hub_m: f64) -> impl Strategy<Value = Arm> {
    (
        (
            0.01..1.5f64,
            -2.0 * PI..2.0 * PI,
            0.0..3.0f64,
            prop_oneof![Just(0.0), -0.5..0.5f64],
        ),
        (
            0.002..0.03f64,
            1.01..2.5f64,
            0.0..0.4f64,
            0.0..5.0f64,
            proptest::option::of(0.0..0.5f64),
        ),
        (
            0.05..=1.0f64,
            0.0..=FRAC_PI_2,
            -PI..=PI,
            0.01..=1.0f64,
            0.01..=1.0f64,
        ),
    )
        .prop_map(
            move |(
                (reach, azimuth_rad, height_m, rise_m),
                (bore_m, outer_ratio, rough, minor_k, extra_length),
                (d_ratio, elevation_rad, deflection_rad, cd, cv),
            )| {
                let radius_m = hub_m + reach;
                Arm {
                    radius_m,
                    azimuth_rad,
                    height_m,
                    rise_m,
                    tube: Tube {
                        bore_m,
                        outer_m: bore_m * outer_ratio,
                        roughness_m: rough * bore_m,
                        minor_k,
                        length_m: extra_length.map(|x| reach + x),
                    },
                    nozzle: Nozzle {
                        diameter_m: bore_m * d_ratio,
                        elevation_rad,
                        deflection_rad,
                        cd,
                        cv,
                    },
                }
            },
        )
}

fn design() -> impl Strategy<Value = Design> {
    let rotor = (0.0..0.05f64).prop_flat_map(|hub_radius_m| {
        (
            proptest::collection::vec(arm(hub_radius_m), 1..6),
            (0.002..0.05f64, 0.0..10.0f64),
            prop_oneof![
                (1e-6..10.0f64).prop_map(|kg_m2| Inertia::Given { kg_m2 }),
                (500.0..20000.0f64, 0.01..0.9f64, 0.0..1.0f64).prop_map(|(rho, wall, tip)| {
                    // The wall is set as a fraction of the thinnest tube below.
                    Inertia::Estimate {
                        tube_density_kg_m3: rho,
                        tube_wall_m: wall,
                        tip_mass_kg: tip,
                    }
                }),
            ],
        )
            .prop_map(move |(arms, (inlet_bore_m, k), inertia)| {
                let thinnest = arms
                    .iter()
                    .map(|a| a.tube.outer_m)
                    .fold(f64::INFINITY, f64::min);
                let inertia = match inertia {
                    Inertia::Estimate {
                        tube_density_kg_m3,
                        tube_wall_m,
                        tip_mass_kg,
                    } => Inertia::Estimate {
                        tube_density_kg_m3,
                        tube_wall_m: tube_wall_m * thinnest / 2.0,
                        tip_mass_kg,
                    },
                    given => given,
                };
                Rotor {
                    hub_radius_m,
                    swivel: Swivel { inlet_bore_m, k },
                    arms,
                    inertia,
                }
            })
    });
    let bearing = prop_oneof![
        (
            (0.0..1.0f64, 0.0..1.0f64, 0.0..0.99f64, 0.001..0.05f64),
            (0.0..1e-3f64, 0.01..10.0f64, any::<bool>())
        )
            .prop_map(|((mk, ms, inner, outer_m), (area, mass, new))| {
                Bearing::Washer(Washer {
                    mu_kinetic: mk,
                    mu_static: ms,
                    inner_m: inner * outer_m,
                    outer_m,
                    thrust_area_m2: area,
                    rotor_mass_kg: mass,
                    radius_rule: if new {
                        WasherRule::UniformPressure
                    } else {
                        WasherRule::UniformWear
                    },
                })
            }),
        (0.0..5.0f64, 0.0..5.0f64).prop_map(|(running_n_m, breakaway_n_m)| Bearing::Measured {
            running_n_m,
            breakaway_n_m
        }),
    ];
    let friction = (
        bearing,
        0.0..1.0f64,
        0.0..1e-6f64,
        0.0..5.0f64,
        0.0..5.0f64,
        0.0..3.0f64,
    )
        .prop_map(|(bearing, base, per_pa, c1, c2, cd)| Friction {
            bearing,
            seal: Seal {
                base_n_m: base,
                per_pa_n_m: per_pa,
            },
            brake: Brake {
                viscous: c1,
                quadratic: c2,
            },
            arm_drag_cd: cd,
        });
    let spray = (
        proptest::option::of(0.0002..0.003f64),
        proptest::option::of(1.0..5.0f64),
        proptest::option::of(1.1..4.0f64),
        proptest::option::of(2.0..22.0f64),
    )
        .prop_map(|(d50_m, spread, largest_ratio, breakup)| SpraySpec {
            d50_m,
            spread,
            largest_m: largest_ratio.map(|r| d50_m.unwrap_or(0.001) * r),
            breakup,
        });
    let layout = proptest::option::of(prop_oneof![
        (1.0..50.0f64).prop_map(|spacing_m| Layout::Square { spacing_m }),
        (1.0..50.0f64, 1.0..50.0f64)
            .prop_map(|(spacing_m, rows_m)| Layout::Rectangle { spacing_m, rows_m }),
        (1.0..50.0f64).prop_map(|spacing_m| Layout::Triangle { spacing_m }),
    ]);
    (
        "[A-Za-z0-9 \"\\\\é°/-]{0,24}",
        (0.0..=50.0f64, -40.0..=60.0f64, -500.0..=11000.0f64),
        supply(),
        rotor,
        friction,
        spray,
        layout,
        (0.0..15.0f64, -PI..PI),
    )
        .prop_map(
            |(name, (water, air, altitude), supply, rotor, friction, spray, layout, (ws, wf))| {
                let supply = feasible(supply, &rotor.arms, water);
                Design {
                    name,
                    water_temperature_c: water,
                    site: Site {
                        air_temperature_c: air,
                        altitude_m: altitude,
                        clearance_m: None,
                    },
                    supply,
                    rotor,
                    friction,
                    spray,
                    layout,
                    wind: Wind {
                        speed_m_s: ws,
                        from_rad: wf,
                    },
                }
            },
        )
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    #[test]
    fn a_valid_design_survives_a_file_round_trip(d in design(), us in any::<bool>()) {
        let system = if us { UnitSystem::Us } else { UnitSystem::Metric };
        // The generated design is valid to begin with.
        Scenario::from_design(&d, UnitSystem::Metric, "").to_design()
            .map_err(|e| TestCaseError::fail(format!("generator made an invalid design: {e}")))?;
        let text = Scenario::from_design(&d, system, "notes with \"quotes\"\nand a new line")
            .to_ron_string();
        let back = load_str(&text, "generated")
            .map_err(|e| TestCaseError::fail(format!("{e}\n{text}")))?;
        prop_assert_eq!(&back.notes, "notes with \"quotes\"\nand a new line");
        let again = back.to_design().map_err(|e| TestCaseError::fail(e.to_string()))?;
        assert_designs_close(&d, &again, 1e-9);
    }

    #[test]
    fn any_design_saved_over_another_file_reads_back_as_itself(
        a in design(),
        b in design(),
        a_us in any::<bool>(),
        b_us in any::<bool>(),
    ) {
        let unit = |us: bool| if us { UnitSystem::Us } else { UnitSystem::Metric };
        // A file written for design a, with a comment; saved over with design b.
        let text = format!(
            "// kept\n{}",
            Scenario::from_design(&a, unit(a_us), "a's notes").to_ron_string()
        );
        let new = Scenario::from_design(&b, unit(b_us), "a's notes");
        let out = edit_in_place(&text, &new)
            .map_err(|e| TestCaseError::fail(format!("{e}\n{text}")))?;
        prop_assert!(out.starts_with("// kept\n"));
        let back = load_str(&out, "edited")
            .map_err(|e| TestCaseError::fail(format!("{e}\n{out}")))?;
        let again = back.to_design().map_err(|e| TestCaseError::fail(e.to_string()))?;
        assert_designs_close(&b, &again, 1e-9);
    }
}

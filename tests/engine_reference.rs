//! The spin solver against closed forms and textbook values (model.md M2–M6).
//!
//! Sources are named beside each value; see /shared/design/references.md.

use std::f64::consts::PI;

use nalgebra::Vector3;
use spinwright::physics::balance::{rad_s, rpm, solve, SpinModel, SpinStatus};
use spinwright::physics::design::{Bearing, Design, Supply, Washer, WasherRule};
use spinwright::physics::fixtures::symmetric_rotor;
use spinwright::physics::fluid::WaterProps;
use spinwright::physics::pipe::Duct;
use spinwright::physics::torque::{moment_of_momentum, washer_effective_radius_m};

const DEG: f64 = PI / 180.0;

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

/// A frictionless symmetric rotor with lossless arms (tube length zero).
fn lossless(count: usize, r: f64, d: f64, elev: f64, defl: f64, supply: Supply) -> Design {
    let mut design = symmetric_rotor(count, r, d, elev, defl, supply);
    for arm in &mut design.rotor.arms {
        arm.tube.length_m = Some(0.0);
        arm.tube.minor_k = 0.0;
    }
    design
}

/// Jet speed relative to the arm for fixed total flow: W = Q/(N·A) (C_d = C_v = 1).
fn fixed_flow_jet_speed(q: f64, n: usize, d: f64) -> f64 {
    q / (n as f64 * PI * d * d / 4.0)
}

#[test]
fn fixed_flow_frictionless_runaway_is_w_cos_alpha_cos_delta_over_r() {
    // Closed form (references.md, Rotor balance): ω = W cos α cos δ / R, 1e-9 relative.
    let (q, n, r, d) = (0.6e-3, 3, 0.25, 4e-3);
    for &(elev, defl) in &[(0.0, 0.0), (20.0, 15.0), (35.0, -25.0), (10.0, 60.0)] {
        let design = lossless(
            n,
            r,
            d,
            elev * DEG,
            defl * DEG,
            Supply::Flow { total_m3_s: q },
        );
        let report = solve(&design);
        let w = fixed_flow_jet_speed(q, n, d);
        let expected = w * (elev * DEG).cos() * (defl * DEG).cos() / r;
        let got = report.runaway_rad_s.expect("finite runaway");
        assert!(
            rel(got, expected) < 1e-9,
            "α {elev} δ {defl}: {got} vs {expected}"
        );
        // No friction at all: the operating point is the runaway.
        let op = report.operating.expect("running");
        assert!(rel(op.omega_rad_s(), expected) < 1e-9);
    }
}

#[test]
fn fixed_flow_with_linear_friction_matches_closed_form() {
    // Closed form (references.md): ω = ρQR·W cos θ / (ρQR² + k), cos θ = cos α cos δ.
    let (q, n, r, d) = (0.5e-3, 2, 0.2, 3.5e-3);
    let (elev, defl) = (15.0 * DEG, 20.0 * DEG);
    for &k in &[1e-4, 1e-3, 1e-2, 0.1] {
        let mut design = lossless(n, r, d, elev, defl, Supply::Flow { total_m3_s: q });
        design.friction.brake.viscous = k;
        let rho = WaterProps::at(design.water_temperature_c).density_kg_m3;
        let w = fixed_flow_jet_speed(q, n, d);
        let cos_t = elev.cos() * defl.cos();
        let expected = rho * q * r * w * cos_t / (rho * q * r * r + k);
        let op = solve(&design).operating.expect("running");
        assert!(rel(op.omega_rad_s(), expected) < 1e-9, "k {k}");
    }
}

#[test]
fn fixed_flow_with_constant_friction_matches_closed_form() {
    // Closed form (references.md): ω = (W cos θ − T₀/(ρQR)) / R.
    let (q, n, r, d) = (0.5e-3, 2, 0.2, 3.5e-3);
    let (elev, defl) = (10.0 * DEG, 5.0 * DEG);
    for &t0 in &[0.01, 0.1, 0.5] {
        let mut design = lossless(n, r, d, elev, defl, Supply::Flow { total_m3_s: q });
        design.friction.bearing = Bearing::Measured {
            running_n_m: t0,
            breakaway_n_m: t0,
        };
        let rho = WaterProps::at(design.water_temperature_c).density_kg_m3;
        let w = fixed_flow_jet_speed(q, n, d);
        let expected = (w * elev.cos() * defl.cos() - t0 / (rho * q * r)) / r;
        let op = solve(&design).operating.expect("running");
        assert!(rel(op.omega_rad_s(), expected) < 1e-9, "T0 {t0}");
    }
}

#[test]
fn centrifugal_rise_gives_barkers_mill_jet_speed_and_efficiency() {
    // Encyclopaedia Britannica, 11th ed., "Hydraulics" §183: W = √(2gH + ω²R²),
    // η = (W − ωR)·ωR/(gH); at ωR = √(2gH), η = 0.828.
    let (p, r) = (200e3, 0.15);
    let design = lossless(2, r, 3e-3, 0.0, 0.0, Supply::Pressure { inlet_pa: p });
    let model = SpinModel::new(&design);
    let rho = model.fluids.water.density_kg_m3;
    let u = (2.0 * p / rho).sqrt();
    for &omega in &[0.0, 0.5 * u / r, u / r, 3.0 * u / r] {
        let point = model.point(omega);
        let w = point.state.nozzles[0].jet_speed_relative_m_s;
        let expected = (2.0 * p / rho + (omega * r).powi(2)).sqrt();
        assert!(rel(w, expected) < 1e-9, "ω {omega}");
    }
    let point = model.point(u / r);
    let eta = point.drive_n_m * (u / r) / (p * point.state.total_flow_m3_s);
    // Britannica's 0.828 is 2(√2 − 1) = 0.828427…
    assert!((eta - 0.828).abs() < 5e-4, "η = {eta}");
    assert!((eta - 2.0 * (2f64.sqrt() - 1.0)).abs() < 1e-9);
    // η → 1 as ω grows.
    let fast = model.point(20.0 * u / r);
    let eta_fast = fast.drive_n_m * (20.0 * u / r) / (p * fast.state.total_flow_m3_s);
    assert!(eta_fast > 0.99 && eta_fast < 1.0, "η at 20u/R = {eta_fast}");
}

#[test]
fn fixed_pressure_runaway_with_angled_jet() {
    // Britannica §183 relation with the jet at θ from the tangent: ωR = √(2p/ρ)·cot θ;
    // references.md: 200 kPa, 30°, R = 0.15 m → 2207 rpm (water at 20 °C).
    let (p, r, theta) = (200e3, 0.15, 30.0 * DEG);
    let design = lossless(2, r, 3e-3, 0.0, theta, Supply::Pressure { inlet_pa: p });
    let rho = WaterProps::at(20.0).density_kg_m3;
    let expected = (2.0 * p / rho).sqrt() / theta.tan() / r;
    let got = solve(&design).runaway_rad_s.expect("finite runaway");
    assert!(rel(got, expected) < 1e-9);
    assert!((rpm(got) - 2207.0).abs() < 1.0, "{} rpm", rpm(got));
}

#[test]
fn fixed_pressure_tangential_jets_have_no_finite_runaway() {
    // Britannica §183: purely tangential frictionless jet at fixed pressure: W > ωR always.
    let design = lossless(
        2,
        0.15,
        3e-3,
        0.0,
        0.0,
        Supply::Pressure { inlet_pa: 200e3 },
    );
    let report = solve(&design);
    assert!(report.runaway_rad_s.is_none());
    assert_eq!(report.status, SpinStatus::NoEquilibrium);
}

#[test]
fn four_arm_textbook_example() {
    // Çengel & Cimbala, Fluid Mechanics, worked Example 6-9: four arms, 20 L/s in all,
    // 1 cm jets, r = 0.6 m, 300 rpm → W = 63.66 m/s, torque 537.7 N·m, power 16.9 kW;
    // derived: frictionless runaway 1013 rpm, stall torque 763.9 N·m. The book takes
    // ρ = 1000 kg/m³; water at 4 °C (999.97 kg/m³) differs by 3e-5.
    let mut design = lossless(4, 0.6, 0.01, 0.0, 0.0, Supply::Flow { total_m3_s: 0.020 });
    design.water_temperature_c = 4.0;
    let model = SpinModel::new(&design);
    let at_300 = model.point(rad_s(300.0));
    let w = at_300.state.nozzles[0].jet_speed_relative_m_s;
    assert!((w - 63.66).abs() < 0.01, "W = {w}");
    assert!(
        rel(at_300.drive_n_m, 537.7) < 2e-4,
        "torque {}",
        at_300.drive_n_m
    );
    let power = at_300.drive_n_m * rad_s(300.0);
    assert!(rel(power, 16.9e3) < 3e-3, "power {power}");
    let report = solve(&design);
    assert!(
        rel(report.stall_torque_n_m, 763.9) < 2e-4,
        "stall {}",
        report.stall_torque_n_m
    );
    let runaway = rpm(report.runaway_rad_s.expect("finite"));
    assert!((runaway - 1013.0).abs() < 0.5, "runaway {runaway}");
}

#[test]
fn thrust_washer_effective_radius() {
    // references.md: R_i = 3 mm, R_o = 6 mm → 4.500 mm (uniform wear), 4.667 mm (uniform pressure).
    let mut washer = Washer {
        mu_kinetic: 0.1,
        mu_static: 0.15,
        inner_m: 3e-3,
        outer_m: 6e-3,
        thrust_area_m2: 1e-4,
        rotor_mass_kg: 0.1,
        radius_rule: WasherRule::UniformWear,
    };
    assert!((washer_effective_radius_m(&washer) - 4.500e-3).abs() < 1e-12);
    washer.radius_rule = WasherRule::UniformPressure;
    assert!((washer_effective_radius_m(&washer) - 4.667e-3).abs() < 5e-7);
}

#[test]
fn axial_inflow_carries_no_moment_of_momentum() {
    // r⊥ = 0 for water entering along the spin axis (model.md M2).
    let on_axis = Vector3::new(0.0, 0.0, -0.05);
    let axial = Vector3::new(0.0, 0.0, 3.7);
    assert_eq!(moment_of_momentum(0.4, &on_axis, &axial), 0.0);
    // And the drive torque does not depend on the inlet bore (the inflow velocity).
    let mut a = lossless(3, 0.2, 3e-3, 0.2, 0.1, Supply::Flow { total_m3_s: 4e-4 });
    let mut b = a.clone();
    a.rotor.swivel.inlet_bore_m = 0.005;
    b.rotor.swivel.inlet_bore_m = 0.05;
    let (ta, tb) = (
        SpinModel::new(&a).drive(30.0),
        SpinModel::new(&b).drive(30.0),
    );
    assert_eq!(ta, tb);
}

#[test]
fn garden_hose_table_through_the_line_loss_model() {
    // Iowa State University Extension, "Hose care" (1996): 100 ft hose, open end,
    // gpm at 20/30/40/50/60 psi. references.md: smooth-bore Colebrook on the nominal
    // bore with ~1.5 velocity heads of minor loss lands within about +8 %: ±10 %.
    // The open end adds the exit velocity head (one more velocity head).
    let table: [(f64, [f64; 5]); 4] = [
        (0.5, [4.0, 5.0, 6.0, 7.0, 8.0]),
        (0.625, [8.0, 9.0, 11.0, 12.0, 14.0]),
        (0.75, [12.0, 15.0, 18.0, 20.0, 22.0]),
        (1.0, [26.0, 32.0, 38.0, 43.0, 47.0]),
    ];
    let water = WaterProps::at(20.0);
    let psi = 6_894.757_293_168;
    let gpm = 3.785_411_784e-3 / 60.0;
    for (bore_in, flows) in table {
        let hose = Duct {
            bore_m: bore_in * 0.0254,
            length_m: 100.0 * 0.3048,
            roughness_m: 0.0,
            minor_k: 1.5,
        };
        for (k, expected_gpm) in flows.iter().enumerate() {
            let p = (20.0 + 10.0 * k as f64) * psi;
            let exit_head = |q: f64| 0.5 * water.density_kg_m3 * (q / hose.area_m2()).powi(2);
            let residual = |q: f64| {
                hose.loss_pa(q, water.density_kg_m3, water.viscosity_pa_s) + exit_head(q) - p
            };
            let tol = spinwright::numeric::root::Tolerance {
                x: 1e-12,
                f: 1e-6,
                max_iter: 200,
            };
            let q = spinwright::numeric::root::brent(residual, 1e-7, 0.05, tol).expect("bracketed");
            let ratio = q / gpm / expected_gpm;
            assert!(
                (0.9..=1.1).contains(&ratio),
                "{bore_in} in at {} psi: {:.2} gpm vs {expected_gpm}",
                20 + 10 * k,
                q / gpm
            );
        }
    }
}

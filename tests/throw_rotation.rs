//! Rotation costs throw: a reaction rotor cancels part of its jets' tangential
//! speed, so the wetted radius falls as the rotor turns faster (model.md M7).

use nalgebra::Vector3;
use proptest::prelude::*;
use spinwright::physics::design::SpraySpec;
use spinwright::physics::jet::JetExit;
use spinwright::physics::pattern::{throw_at_rest_and_running, PatternOptions};
use spinwright::physics::trajectory::{fly_jet, FlightEnv, FlightOptions};

/// A jet built from the M1 vector formula: V = W ê + ω ẑ × r with
/// ê = cosα sinδ r̂ − cosα cosδ t̂ + sinα ẑ, t̂ = ẑ × r̂ (the drive sense).
fn jet(w: f64, alpha: f64, delta: f64, radius: f64, height: f64, omega: f64) -> JetExit {
    let r = Vector3::new(radius, 0.0, height);
    let z = Vector3::z();
    let radial = Vector3::new(1.0, 0.0, 0.0);
    let tangential = z.cross(&radial);
    let e = radial * (alpha.cos() * delta.sin()) - tangential * (alpha.cos() * delta.cos())
        + z * alpha.sin();
    JetExit {
        position_m: r,
        velocity_m_s: e * w + (z * omega).cross(&r),
        flow_m3_s: 1e-4,
        nozzle_diameter_m: 2.4e-3,
        nozzle_pressure_pa: 2.8e5,
        omega_rad_s: omega,
    }
}

fn env() -> FlightEnv {
    spinwright::physics::fixtures::flight_env_20c(0.0, 0.0)
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    #[test]
    fn faster_rotor_throws_shorter(
        w in 12.0f64..30.0,
        alpha_deg in 10.0f64..35.0,
        delta_deg in 0.0f64..60.0,
        radius in 0.1f64..0.35,
        height in 0.2f64..0.8,
        d_mm in 2.5f64..5.0,
        f1 in 0.0f64..0.85,
        step in 0.05f64..0.5,
    ) {
        let (a, d) = (alpha_deg.to_radians(), delta_deg.to_radians());
        // Frictionless runaway ω = W cosα cosδ / R (model.md M4): below it more
        // speed means more cancellation of the backward tangential jet speed.
        let runaway = w * a.cos() * d.cos() / radius;
        let f2 = (f1 + step).min(0.95);
        let slow = jet(w, a, d, radius, height, f1 * runaway);
        let fast = jet(w, a, d, radius, height, f2 * runaway);
        let opts = FlightOptions::pattern();
        let t_slow = fly_jet(&slow, d_mm * 1e-3, &env(), &opts).unwrap().distance_m;
        let t_fast = fly_jet(&fast, d_mm * 1e-3, &env(), &opts).unwrap().distance_m;
        prop_assert!(t_fast < t_slow, "ω {:.1} → {:.3} m, ω {:.1} → {:.3} m",
            f1 * runaway, t_slow, f2 * runaway, t_fast);
    }
}

#[test]
fn running_rotor_throws_less_than_at_rest() {
    let (w, a, d, r, h) = (22.0, 22f64.to_radians(), 15f64.to_radians(), 0.16, 0.35);
    let rest = [jet(w, a, d, r, h, 0.0)];
    let running = [jet(w, a, d, r, h, 0.7 * w * a.cos() * d.cos() / r)];
    let c = throw_at_rest_and_running(
        &rest,
        &running,
        &SpraySpec::default(),
        &env(),
        &PatternOptions::default(),
    )
    .unwrap();
    assert!(c.running_m < c.at_rest_m);
    assert!(c.change_percent < -5.0, "{c:?}");
    assert!((c.change_percent - 100.0 * (c.running_m / c.at_rest_m - 1.0)).abs() < 1e-9);
}

//! Speed of the throw, pattern and layout calculations (targets in the comments).

use criterion::{criterion_group, criterion_main, Criterion};
use nalgebra::Vector3;
use spinwright::physics::design::{Layout, SpraySpec};
use spinwright::physics::jet::JetExit;
use spinwright::physics::layout::{overlap, OverlapOptions};
use spinwright::physics::pattern::{radial_pattern, windy_pattern, PatternOptions};
use spinwright::physics::trajectory::FlightEnv;
use std::f64::consts::PI;
use std::hint::black_box;

/// Three arms 120° apart at an invented operating point.
fn jets() -> Vec<JetExit> {
    let base = JetExit {
        position_m: Vector3::new(0.16, 0.0, 0.35),
        velocity_m_s: Vector3::new(5.5, -9.0, 8.0),
        flow_m3_s: 1.0e-4,
        nozzle_diameter_m: 2.4e-3,
        nozzle_pressure_pa: 2.8e5,
        omega_rad_s: 0.0,
    };
    (0..3)
        .map(|i| base.turned(2.0 * PI * i as f64 / 3.0))
        .collect()
}

fn env(wind_m_s: f64) -> FlightEnv {
    spinwright::physics::fixtures::flight_env_20c(wind_m_s, 0.5)
}

fn benches(c: &mut Criterion) {
    let jets = jets();
    let spec = SpraySpec::default();
    let opts = PatternOptions::default();
    // Target: < 5 ms.
    c.bench_function(
        "no-wind profile + square layout CU/DU (3 nozzles x 40 bins)",
        |b| {
            let still = env(0.0);
            b.iter(|| {
                let report = radial_pattern(black_box(&jets), &spec, &still, 3.0, &opts).unwrap();
                let layout = Layout::Square { spacing_m: 9.0 };
                let r = overlap(&layout, &report.profile, &OverlapOptions::default()).unwrap();
                black_box((r.uniformity.cu_percent, r.uniformity.du_lq_percent))
            })
        },
    );
    // Target: < 50 ms. Identical arms evenly spaced share their flights.
    c.bench_function(
        "windy 2-D pattern, 3 identical arms (72 azimuths x 40 bins)",
        |b| {
            let windy = env(3.0);
            b.iter(|| black_box(windy_pattern(black_box(&jets), &spec, &windy, &opts).unwrap()))
        },
    );
    // Three different nozzles: every flight is flown (72 x 41 x 3 = 8856 drops).
    let mixed: Vec<JetExit> = jets
        .iter()
        .enumerate()
        .map(|(i, j)| JetExit {
            velocity_m_s: j.velocity_m_s + Vector3::new(0.0, 0.0, 0.5 * i as f64),
            ..*j
        })
        .collect();
    c.bench_function(
        "windy 2-D pattern, 3 different nozzles (72 azimuths x 40 bins)",
        |b| {
            let windy = env(3.0);
            b.iter(|| black_box(windy_pattern(black_box(&mixed), &spec, &windy, &opts).unwrap()))
        },
    );
}

criterion_group! {
    name = throw;
    config = Criterion::default().sample_size(20);
    targets = benches
}
criterion_main!(throw);

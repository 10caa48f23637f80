//! Benchmark of a design sweep: 100 deflections × 100 pressures = 10,000 full
//! solves of the three-arm rotor, in parallel.
//!
//! Target on a 2-core machine in release: under 2 s for the whole sweep,
//! with the wetted radius (throw) at every point included.

use criterion::{criterion_group, criterion_main, Criterion};
use spinwright::catalogue::{DEFLECTION, INLET_PRESSURE};
use spinwright::inverse::sweep::{sweep, sweep_with, SweepAxis};
use spinwright::physics::coverage::wetted_radius_m;
use spinwright::physics::fixtures::three_arm_rotor;
use std::hint::black_box;
use std::time::Duration;

fn sweep_bench(c: &mut Criterion) {
    let design = three_arm_rotor();
    let axes = [
        SweepAxis {
            input: &DEFLECTION,
            from: 0.0,
            to: 70f64.to_radians(),
            steps: 100,
        },
        SweepAxis {
            input: &INLET_PRESSURE,
            from: 100e3,
            to: 500e3,
            steps: 100,
        },
    ];
    let mut group = c.benchmark_group("sweep");
    group.sample_size(10);
    group.measurement_time(Duration::from_secs(20));
    group.bench_function("deflection x pressure, 10000 points", |b| {
        b.iter(|| sweep(black_box(&design), &axes, &|_, _| {}))
    });
    group.bench_function("deflection x pressure, 10000 points, with throw", |b| {
        b.iter(|| {
            sweep_with(
                black_box(&design),
                &axes,
                &|d, report| wetted_radius_m(d, report).ok(),
                &|_, _| {},
            )
        })
    });
    group.finish();
}

criterion_group!(benches, sweep_bench);
criterion_main!(benches);

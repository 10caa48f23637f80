//! Benchmarks of the spin solver: one full solve and a 200-row torque table.
//!
//! Targets on a 2-core machine in release: solve < 500 µs, table < 10 ms.

use criterion::{criterion_group, criterion_main, Criterion};
use spinwright::physics::balance::{solve, torque_table};
use spinwright::physics::fixtures::three_arm_rotor;
use std::hint::black_box;

fn engine(c: &mut Criterion) {
    let design = three_arm_rotor();
    c.bench_function("solve three-arm rotor", |b| {
        b.iter(|| solve(black_box(&design)))
    });
    let report = solve(&design);
    c.bench_function("table 200 rows", |b| {
        b.iter(|| torque_table(black_box(&design), &report, 200))
    });
}

criterion_group!(benches, engine);
criterion_main!(benches);

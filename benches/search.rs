//! Benchmark of a design search: three free inputs (deflection, nozzle
//! diameter, inlet pressure) of the three-arm rotor on a square layout, CU
//! at the layout's spacing as the objective, a speed band as a goal; the
//! default 12 multi-start Nelder–Mead runs in parallel. Once in calm air
//! (radial profile) and once in 2 m/s of wind, where each candidate's CU
//! needs the 2-D pattern: screened with the coarse pattern, the finalists
//! re-checked with the full one (model.md M10).
//!
//! Target (issue 12): under 10 s on a 2-core machine, release profile, both.

use criterion::{criterion_group, criterion_main, Criterion};
use spinwright::catalogue::{DEFLECTION, INLET_PRESSURE, NOZZLE_DIAMETER};
use spinwright::inverse::search::{search, Free, Goals, Objective, SearchOptions};
use spinwright::physics::design::Layout;
use spinwright::physics::fixtures::three_arm_rotor;
use std::hint::black_box;
use std::time::Duration;

fn search_bench(c: &mut Criterion) {
    let mut design = three_arm_rotor();
    design.layout = Some(Layout::Square { spacing_m: 9.0 });
    let free = [
        Free {
            input: &DEFLECTION,
            from: 30f64.to_radians(),
            to: 85f64.to_radians(),
        },
        Free {
            input: &NOZZLE_DIAMETER,
            from: 1.8e-3,
            to: 3.0e-3,
        },
        Free {
            input: &INLET_PRESSURE,
            from: 200e3,
            to: 400e3,
        },
    ];
    let goals = Goals {
        rpm: Some((20.0, 40.0)),
        ..Goals::default()
    };
    let mut group = c.benchmark_group("search");
    group.sample_size(10);
    group.measurement_time(Duration::from_secs(60));
    let mut windy = design.clone();
    windy.wind.speed_m_s = 2.0;
    windy.wind.from_rad = 30f64.to_radians();
    for (name, d) in [
        ("three inputs, CU objective", &design),
        ("three inputs, CU objective, 2 m/s wind", &windy),
    ] {
        group.bench_function(name, |b| {
            b.iter(|| {
                search(
                    black_box(d),
                    &free,
                    &goals,
                    Objective::Cu,
                    &SearchOptions::default(),
                    &|_, _| {},
                )
            })
        });
    }
    group.finish();
}

criterion_group!(benches, search_bench);
criterion_main!(benches);

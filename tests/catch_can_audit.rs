//! The shipped catch-can example reads and rates like the model's own pattern.

use spinwright::inverse::audit::audit;
use spinwright::physics::design::Layout;
use spinwright::physics::layout::{overlap, uniformity, HeadPattern, OverlapOptions};
use spinwright::scenario::cans::{read_catch_cans, CatchSet};
use std::path::Path;

fn example() -> spinwright::scenario::cans::CatchCanData {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/scenarios/catch-cans-example.csv"
    );
    read_catch_cans(Path::new(path)).unwrap()
}

#[test]
fn example_leg_reads_and_converts() {
    let data = example();
    assert_eq!(data.duration_s, 1800.0);
    let CatchSet::Radial(cans) = &data.cans else {
        panic!("the example is a radial leg")
    };
    assert_eq!(cans.len(), 17);
    // 33.5 mL in a 100 mm can over 30 min: 33.5e-6 m³ / (π·0.05² m²) = 4.265 mm
    // in 0.5 h = 8.531 mm/h (arithmetic).
    let peak = cans.iter().find(|c| c.distance_m == 5.0).unwrap();
    let expect = 33.5e-6 / (std::f64::consts::PI * 0.05 * 0.05) * 1e3 / 0.5;
    assert!((peak.rate_mm_h - expect).abs() < 1e-9);
}

#[test]
fn example_leg_overlap_keeps_its_water_and_matches_direct_rating() {
    let data = example();
    let layout = Layout::Square { spacing_m: 9.0 };
    let report = audit(&data, Some(&layout), &OverlapOptions::default()).unwrap();
    let direct = uniformity(&data.rates_mm_h()).unwrap();
    assert_eq!(report.cans, direct);
    let over = report.layout.unwrap();
    // The leg's own volume (∫ rate 2πr dr) spread over S² is the exact mean.
    assert!((over.mean_rate_mm_h / over.expected_rate_mm_h - 1.0).abs() < 0.01);
    // Same as overlapping the leg by hand.
    let leg = spinwright::inverse::audit::leg_pattern(&data).unwrap();
    let again = overlap(&layout, &leg, &OverlapOptions::default()).unwrap();
    assert_eq!(again.uniformity, over.uniformity);
    assert!(leg.reach_m() == 8.5);
    // Wider spacing, worse uniformity.
    let wide = audit(
        &data,
        Some(&Layout::Square { spacing_m: 13.0 }),
        &OverlapOptions::default(),
    )
    .unwrap()
    .layout
    .unwrap();
    assert!(wide.uniformity.cu_percent < over.uniformity.cu_percent);
}

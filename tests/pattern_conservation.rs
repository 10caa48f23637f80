//! Water is conserved: the pattern holds all the sprayed water, and a layout's
//! mean rate equals Q/(S·L).

use nalgebra::Vector3;
use spinwright::physics::design::{Layout, SpraySpec};
use spinwright::physics::jet::JetExit;
use spinwright::physics::layout::{overlap, HeadPattern, OverlapOptions};
use spinwright::physics::pattern::{radial_pattern, windy_pattern, PatternOptions, M_S_TO_MM_H};
use spinwright::physics::trajectory::FlightEnv;
use std::f64::consts::PI;

fn env(wind_m_s: f64) -> FlightEnv {
    spinwright::physics::fixtures::flight_env_20c(wind_m_s, 1.0)
}

/// Three arms 120° apart, an invented rotor near its operating point.
fn jets() -> Vec<JetExit> {
    let base = JetExit {
        position_m: Vector3::new(0.18, 0.0, 0.4),
        velocity_m_s: Vector3::new(6.0, -11.0, 8.5),
        flow_m3_s: 1.0e-4,
        nozzle_diameter_m: 2.6e-3,
        nozzle_pressure_pa: 2.6e5,
        omega_rad_s: 0.0,
    };
    (0..3)
        .map(|i| base.turned(2.0 * PI * i as f64 / 3.0))
        .collect()
}

#[test]
fn radial_profile_holds_all_the_sprayed_water() {
    let r = radial_pattern(
        &jets(),
        &SpraySpec::default(),
        &env(0.0),
        4.0,
        &PatternOptions::default(),
    )
    .unwrap();
    let sprayed = 3.0e-4;
    assert!((r.profile.applied_flow_m3_s() / sprayed - 1.0).abs() < 1e-3);
    assert!((r.profile.flow_m3_s() - sprayed).abs() < 1e-3 * sprayed);
}

#[test]
fn windy_pattern_holds_all_the_sprayed_water() {
    let opts = PatternOptions {
        azimuths: 36,
        bins: 20,
        ..PatternOptions::default()
    };
    let grid = windy_pattern(&jets(), &SpraySpec::default(), &env(3.5), &opts).unwrap();
    let sprayed = 3.0e-4;
    assert!((grid.applied_flow_m3_s() / sprayed - 1.0).abs() < 1e-3);
}

#[test]
fn layout_mean_rate_is_q_over_area() {
    let sprayed = 3.0e-4;
    let profile = radial_pattern(
        &jets(),
        &SpraySpec::default(),
        &env(0.0),
        4.0,
        &PatternOptions::default(),
    )
    .unwrap()
    .profile;
    let opts = PatternOptions {
        azimuths: 36,
        bins: 20,
        ..PatternOptions::default()
    };
    let grid = windy_pattern(&jets(), &SpraySpec::default(), &env(2.0), &opts).unwrap();
    let heads: [&dyn HeadPattern; 2] = [&profile, &grid];
    for head in heads {
        for layout in [
            Layout::Square { spacing_m: 9.0 },
            Layout::Rectangle {
                spacing_m: 8.0,
                rows_m: 11.0,
            },
            Layout::Triangle { spacing_m: 10.0 },
        ] {
            let r = overlap(&layout, head, &OverlapOptions::default()).unwrap();
            // Q/(S·L) from the sprayed flow, not from the pattern.
            let expected = sprayed / layout.area_per_head_m2() * M_S_TO_MM_H;
            assert!((r.expected_rate_mm_h / expected - 1.0).abs() < 1e-3);
            assert!(
                (r.mean_rate_mm_h / expected - 1.0).abs() < 0.01,
                "{layout:?}: {} vs {expected}",
                r.mean_rate_mm_h
            );
        }
    }
}

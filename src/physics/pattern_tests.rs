//! Unit tests of `pattern.rs`.

use super::wind::same_jet_turned;
use super::*;
use nalgebra::{Vector2, Vector3};

fn env(wind_m_s: f64) -> FlightEnv {
    crate::physics::fixtures::flight_env_20c(wind_m_s, 0.3)
}

fn jets() -> Vec<JetExit> {
    let a = JetExit {
        position_m: Vector3::new(0.16, 0.0, 0.35),
        velocity_m_s: Vector3::new(5.0, -13.0, 7.0),
        flow_m3_s: 1.2e-4,
        nozzle_diameter_m: 2.4e-3,
        nozzle_pressure_pa: 2.8e5,
        omega_rad_s: 0.0,
    };
    vec![a, a.turned(PI)]
}

#[test]
fn profile_holds_all_the_water() {
    let r = radial_pattern(
        &jets(),
        &SpraySpec::default(),
        &env(0.0),
        3.0,
        &PatternOptions::default(),
    )
    .unwrap();
    let applied = r.profile.applied_flow_m3_s();
    assert!((applied / r.total_flow_m3_s - 1.0).abs() < 1e-9);
    assert!((r.total_flow_m3_s - 2.4e-4).abs() < 1e-15);
    assert!(r.wetted_radius_m > 5.0);
    assert!((r.profile.outer_radius_m() - r.wetted_radius_m).abs() < MIN_RING_WIDTH_M);
    let peak = r.profile.peak().unwrap();
    let expect = peak.rate_mm_h / 3600.0 * 2.0 * PI / 3.0;
    assert!((r.peak_depth_per_turn_mm.unwrap() - expect).abs() < 1e-12);
    // Larger drops go farther.
    let t = r.nozzles[0].as_ref().unwrap();
    assert!(t.throw_small_m < t.throw_median_m && t.throw_median_m < t.throw_largest_m);
}

#[test]
fn non_flowing_jets_are_skipped() {
    let mut js = jets();
    js[1].flow_m3_s = 0.0;
    let r = radial_pattern(
        &js,
        &SpraySpec::default(),
        &env(0.0),
        0.0,
        &PatternOptions::default(),
    )
    .unwrap();
    assert!(r.nozzles[1].is_none());
    assert!(r.peak_depth_per_turn_mm.is_none());
    js[0].flow_m3_s = 0.0;
    assert!(radial_pattern(
        &js,
        &SpraySpec::default(),
        &env(0.0),
        0.0,
        &PatternOptions::default()
    )
    .is_err());
}

#[test]
fn calm_grid_matches_the_radial_profile() {
    let opts = PatternOptions {
        bins: 20,
        azimuths: 72,
        ..PatternOptions::default()
    };
    let e = env(0.0);
    let grid = windy_pattern(&jets(), &SpraySpec::default(), &e, &opts).unwrap();
    let prof = radial_pattern(&jets(), &SpraySpec::default(), &e, 1.0, &opts)
        .unwrap()
        .profile;
    assert!((grid.applied_flow_m3_s() / grid.flow_m3_s - 1.0).abs() < 1e-9);
    // Ring-averaged grid rate against the profile between 30 % and 80 % of the radius.
    let outer = prof.outer_radius_m();
    let (mut g_sum, mut p_sum) = (0.0, 0.0);
    for iy in 0..grid.ny {
        for ix in 0..grid.nx {
            let (x, y) = grid.cell_centre_m(ix, iy);
            let r = x.hypot(y);
            if r > 0.3 * outer && r < 0.8 * outer {
                g_sum += grid.cell(ix, iy);
                p_sum += prof.rate_mm_h_at(r);
            }
        }
    }
    assert!((g_sum / p_sum - 1.0).abs() < 0.03, "{}", g_sum / p_sum);
}

#[test]
fn turned_copies_share_flights_without_changing_the_pattern() {
    // Two identical arms half a turn apart (36 of 72 steps) in wind: the
    // shared sweep must give exactly twice one arm's pattern.
    let opts = PatternOptions {
        bins: 8,
        azimuths: 72,
        ..PatternOptions::default()
    };
    let e = env(2.0);
    let pair = windy_pattern(&jets(), &SpraySpec::default(), &e, &opts).unwrap();
    let one = windy_pattern(&jets()[..1], &SpraySpec::default(), &e, &opts).unwrap();
    assert_eq!((pair.nx, pair.ny), (one.nx, one.ny));
    for (p, o) in pair.rate_mm_h.iter().zip(&one.rate_mm_h) {
        assert!((p - 2.0 * o).abs() <= 1e-9 * (1.0 + o.abs()));
    }
    // Not a whole number of steps apart: no sharing, still conserved.
    let mut odd = jets();
    odd[1] = odd[0].turned(1.0);
    let g = windy_pattern(&odd, &SpraySpec::default(), &e, &opts).unwrap();
    assert!((g.applied_flow_m3_s() / g.flow_m3_s - 1.0).abs() < 1e-9);
    assert_eq!(same_jet_turned(&odd[0], &odd[1], 2.0 * PI / 72.0, 72), None);
    assert_eq!(
        same_jet_turned(&jets()[0], &jets()[1], 2.0 * PI / 72.0, 72),
        Some(36)
    );
}

#[test]
fn wind_shifts_the_pattern_downwind_and_keeps_the_water() {
    let opts = PatternOptions {
        bins: 12,
        azimuths: 36,
        ..PatternOptions::default()
    };
    let e = env(3.0);
    let grid = windy_pattern(&jets(), &SpraySpec::default(), &e, &opts).unwrap();
    assert!((grid.applied_flow_m3_s() / grid.flow_m3_s - 1.0).abs() < 1e-9);
    // Centroid of the water moves with the wind.
    let (mut cx, mut cy, mut m) = (0.0, 0.0, 0.0);
    for iy in 0..grid.ny {
        for ix in 0..grid.nx {
            let (x, y) = grid.cell_centre_m(ix, iy);
            let w = grid.cell(ix, iy);
            cx += w * x;
            cy += w * y;
            m += w;
        }
    }
    let c = Vector2::new(cx / m, cy / m);
    let wind = e.wind_m_s.xy().normalize();
    assert!(c.dot(&wind) > 0.3, "{c:?}");
}

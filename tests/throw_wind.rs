//! Throw and uniformity in wind (model.md M8, M9).
//!
//! Check values:
//! - Zhu, Lewballah, Fordjour et al. (2021), *Water* 13(21):3006, abstract:
//!   for impact sprinkler nozzles of 4–7 mm at 300 kPa, "at wind speeds of
//!   3.5 m/s and 4.5 m/s, 20 % and 32 % of the total volume exceeded the wet
//!   radius" (the no-wind wetted radius, downwind). The model's share beyond
//!   the calm radius for a 5 mm nozzle must rise with wind and lie within a
//!   factor of two of those figures: the nozzle, angle and rotor of the paper
//!   differ from ours, so only the size of the effect is checked.
//! - Spacing against wind for square layouts (extension practice; common
//!   practice): 55 % of the wetted diameter in calm air, 45 % in 8–12 mph
//!   (3.6–5.4 m/s) of wind give like uniformity. Checked on the shipped lawn
//!   rotor: closing the spacing to 45 % in 4.5 m/s keeps CU within 3 points
//!   of (or above) CU at 55 % in calm air, and CU at 55 % falls as the wind rises.

use nalgebra::Vector3;
use spinwright::physics::balance::solve;
use spinwright::physics::coverage::{head_throw, layout_overlap};
use spinwright::physics::design::{Layout, SpraySpec, Wind};
use spinwright::physics::jet::JetExit;
use spinwright::physics::layout::OverlapOptions;
use spinwright::physics::pattern::{
    radial_pattern, wetted_radii_in_wind, windy_pattern, PatternGrid, PatternOptions,
};
use spinwright::physics::trajectory::FlightEnv;
use std::f64::consts::PI;

fn env(wind_m_s: f64) -> FlightEnv {
    spinwright::physics::fixtures::flight_env_20c(wind_m_s, 0.0)
}

/// A single radial 5 mm nozzle at 300 kPa, 25° from 0.6 m, turning slowly
/// (an impact-sprinkler-like head, 1 rpm).
fn head() -> Vec<JetExit> {
    let ideal = (2.0 * 3.0e5 / env(0.0).water_density_kg_m3).sqrt();
    let a = 25f64.to_radians();
    vec![JetExit {
        position_m: Vector3::new(0.1, 0.0, 0.6),
        velocity_m_s: Vector3::new(a.cos(), 0.0, a.sin()) * (0.98 * ideal),
        flow_m3_s: 0.96 * PI * 25e-6 / 4.0 * ideal,
        nozzle_diameter_m: 5e-3,
        nozzle_pressure_pa: 3.0e5,
        omega_rad_s: 0.1,
    }]
}

fn windy(wind_m_s: f64) -> PatternGrid {
    windy_pattern(
        &head(),
        &SpraySpec::default(),
        &env(wind_m_s),
        &PatternOptions {
            azimuths: 48,
            ..PatternOptions::default()
        },
    )
    .unwrap()
}

fn calm_radius() -> (f64, f64) {
    let r = radial_pattern(
        &head(),
        &SpraySpec::default(),
        &env(0.0),
        0.1,
        &PatternOptions::default(),
    )
    .unwrap();
    (r.wetted_radius_m, r.wetting_threshold_mm_h)
}

#[test]
fn wind_carries_the_pattern_downwind() {
    let (calm, threshold) = calm_radius();
    let mut last_down = calm;
    for w in [2.0, 4.0, 6.0] {
        let e = env(w);
        let radii = wetted_radii_in_wind(&windy(w), &e.wind_m_s, threshold).unwrap();
        assert!(
            radii.downwind_m > calm && calm > radii.upwind_m,
            "{w} m/s: upwind {} calm {calm} downwind {}",
            radii.upwind_m,
            radii.downwind_m
        );
        assert!(
            radii.downwind_m > last_down,
            "{w} m/s reaches farther downwind"
        );
        last_down = radii.downwind_m;
    }
}

/// Share of the water landing farther than `radius_m` from the head, %.
fn share_beyond(grid: &PatternGrid, radius_m: f64) -> f64 {
    let mut beyond = 0.0;
    let mut total = 0.0;
    for iy in 0..grid.ny {
        for ix in 0..grid.nx {
            let (x, y) = grid.cell_centre_m(ix, iy);
            let c = grid.cell(ix, iy);
            total += c;
            if x.hypot(y) > radius_m {
                beyond += c;
            }
        }
    }
    100.0 * beyond / total
}

#[test]
fn share_beyond_the_calm_radius_is_of_the_published_size() {
    let (calm, _) = calm_radius();
    let at_35 = share_beyond(&windy(3.5), calm);
    let at_45 = share_beyond(&windy(4.5), calm);
    // Zhu et al. (2021): 20 % at 3.5 m/s, 32 % at 4.5 m/s.
    assert!(at_45 > at_35, "{at_35} % then {at_45} %");
    assert!((10.0..=40.0).contains(&at_35), "3.5 m/s: {at_35} %");
    assert!((16.0..=64.0).contains(&at_45), "4.5 m/s: {at_45} %");
}

/// CU of the shipped lawn rotor on a square layout at `fraction` of its
/// calm wetted diameter, in a wind of `wind_m_s`.
fn lawn_rotor_cu(fraction: f64, wind_m_s: f64) -> f64 {
    let path = crate::support::root().join("scenarios/lawn-rotor.ron");
    let mut design = spinwright::scenario::load_file(&path)
        .unwrap()
        .to_design()
        .unwrap();
    let report = solve(&design);
    let opts = PatternOptions::default();
    let calm = head_throw(&design, &report, &opts, None).unwrap();
    let layout = Layout::Square {
        spacing_m: fraction * 2.0 * calm.throw.wetted_radius_m,
    };
    design.wind = Wind {
        speed_m_s: wind_m_s,
        from_rad: 0.3,
    };
    let head = head_throw(&design, &report, &opts, None).unwrap();
    layout_overlap(&design, &head, &layout, &opts, &OverlapOptions::default())
        .unwrap()
        .uniformity
        .cu_percent
}

#[test]
fn uniformity_falls_with_wind_and_the_spacing_rule_holds() {
    let calm_cu = lawn_rotor_cu(0.55, 0.0);
    let mut last = calm_cu;
    for w in [2.0, 4.0, 6.0] {
        let now = lawn_rotor_cu(0.55, w);
        assert!(
            now < last,
            "CU falls with wind: {last} then {now} at {w} m/s"
        );
        last = now;
    }
    // The rule's closer spacing makes up for the wind.
    let windy_close = lawn_rotor_cu(0.45, 4.5);
    assert!(
        windy_close >= calm_cu - 3.0,
        "55 % calm {calm_cu} vs 45 % at 4.5 m/s {windy_close}"
    );
}

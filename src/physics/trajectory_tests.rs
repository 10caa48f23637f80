//! Unit tests of `trajectory.rs`.

use super::*;

fn env() -> FlightEnv {
    FlightEnv::new(
        &AirProps::at_pressure(20.0, 101_300.0),
        &WaterProps::at(20.0),
        &Wind::default(),
    )
}

#[test]
fn schiller_naumann_at_re_100() {
    // fluids.drag.Schiller_Naumann(100) = 1.0917 (references.md, [lib: fluids.drag]).
    assert!((schiller_naumann(100.0) - 1.0917).abs() < 1e-3);
}

#[test]
fn vacuum_flight_from_a_height_matches_closed_form() {
    // Closed form: t = (V sinα + √(V² sin²α + 2 g h)) / g, range = V cosα · t.
    let opts = FlightOptions {
        drag: DragLaw::None,
        ..FlightOptions::default()
    };
    let (v, alpha, h, r0) = (20.0f64, 0.5f64, 0.4, 0.15);
    let start = Vector3::new(r0, 0.0, h);
    let vel = Vector3::new(v * alpha.cos(), 0.0, v * alpha.sin());
    let land = fly(&start, &vel, 1e-3, &env(), &opts).unwrap();
    let g = GRAVITY_M_S2;
    let t = (v * alpha.sin() + (v * v * alpha.sin().powi(2) + 2.0 * g * h).sqrt()) / g;
    assert!((land.time_s - t).abs() < 1e-9 * t);
    assert!((land.distance_m - (r0 + v * alpha.cos() * t)).abs() < 1e-9 * land.distance_m);
}

#[test]
fn dense_output_locates_ground_between_steps() {
    // With loose tolerances the steps are long; the landing must not move
    // by more than the integration error when tolerances tighten.
    let start = Vector3::new(0.2, 0.0, 0.5);
    let vel = Vector3::new(15.0, 2.0, 8.0);
    let loose = FlightOptions {
        rtol: 1e-5,
        atol: 1e-5,
        ..FlightOptions::default()
    };
    let a = fly(&start, &vel, 2e-3, &env(), &loose).unwrap();
    let b = fly(&start, &vel, 2e-3, &env(), &FlightOptions::default()).unwrap();
    assert!(a.steps < b.steps);
    assert!((a.distance_m - b.distance_m).abs() < 1e-3);
    assert!(a.point_m.z == 0.0);
}

#[test]
fn drop_at_ground_going_down_lands_where_it_is() {
    let land = fly(
        &Vector3::new(1.0, 0.0, 0.0),
        &Vector3::new(3.0, 0.0, -1.0),
        1e-3,
        &env(),
        &FlightOptions::default(),
    )
    .unwrap();
    assert_eq!(land.distance_m, 1.0);
    assert_eq!(land.time_s, 0.0);
}

#[test]
fn drop_from_ground_going_up_flies() {
    let land = fly(
        &Vector3::new(0.0, 0.0, 0.0),
        &Vector3::new(5.0, 0.0, 5.0),
        3e-3,
        &env(),
        &FlightOptions::default(),
    )
    .unwrap();
    assert!(land.time_s > 0.5 && land.distance_m > 2.0);
}

#[test]
fn bad_inputs_are_errors_not_panics() {
    let o = FlightOptions::default();
    let s = Vector3::new(0.0, 0.0, 1.0);
    let v = Vector3::new(1.0, 0.0, 0.0);
    assert!(fly(&s, &v, 0.0, &env(), &o).is_err());
    assert!(fly(&s, &v, f64::NAN, &env(), &o).is_err());
    assert!(fly(&Vector3::new(0.0, 0.0, -1.0), &v, 1e-3, &env(), &o).is_err());
    let msg = fly(&s, &Vector3::new(f64::NAN, 0.0, 0.0), 1e-3, &env(), &o)
        .unwrap_err()
        .to_string();
    assert!(
        msg.contains("jet velocity") && !msg.contains("NaN"),
        "{msg}"
    );
    let msg = fly(&s, &v, f64::NAN, &env(), &o).unwrap_err().to_string();
    assert!(!msg.contains("NaN"), "{msg}");
}

#[test]
fn wind_carries_drops_downwind() {
    let calm = env();
    let windy = FlightEnv {
        wind_m_s: Vector3::new(0.0, 3.0, 0.0),
        ..calm
    };
    let s = Vector3::new(0.0, 0.0, 0.5);
    let v = Vector3::new(10.0, 0.0, 5.0);
    let o = FlightOptions::default();
    let a = fly(&s, &v, 1e-3, &calm, &o).unwrap();
    let b = fly(&s, &v, 1e-3, &windy, &o).unwrap();
    assert!(a.point_m.y.abs() < 1e-9);
    assert!(b.point_m.y > 0.5);
}

#[test]
fn path_starts_at_nozzle_and_ends_on_landing() {
    let jet = JetExit {
        position_m: Vector3::new(0.16, 0.0, 0.35),
        velocity_m_s: Vector3::new(5.0, -12.0, 6.0),
        flow_m3_s: 1e-4,
        nozzle_diameter_m: 2.4e-3,
        nozzle_pressure_pa: 2.8e5,
        omega_rad_s: 0.0,
    };
    let path = flight_path(&jet, 2e-3, 1.0, &env(), &FlightOptions::default(), 25).unwrap();
    assert_eq!(path.points.len(), 25);
    assert_eq!(path.points[0].position_m, jet.position_m);
    assert_eq!(path.points[24].position_m, path.landing.point_m);
    assert!(path.points.iter().all(|p| p.position_m.z >= 0.0));
    let apex = path
        .points
        .iter()
        .map(|p| p.position_m.z)
        .fold(0.0, f64::max);
    assert!(apex > 0.35 && apex <= path.landing.apex_m + 0.05);
}

#[test]
fn terminal_velocity_balances_weight() {
    let e = env();
    let v = terminal_velocity_m_s(2e-3, &e, DragLaw::WaterDrop).unwrap();
    let drop = Drop::new(2e-3, &e, DragLaw::WaterDrop);
    assert!((drop.drag_rate(v) * v - e.gravity_m_s2).abs() < 1e-9);
}

//! Helpers shared by the integration tests.

use std::path::PathBuf;

use spinwright::physics::design::{Bearing, Design, Inertia, Layout, Supply};

/// The crate's root folder.
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// Every shipped scenario file, sorted by name.
pub fn shipped_scenarios() -> Vec<PathBuf> {
    let mut files: Vec<PathBuf> = std::fs::read_dir(root().join("scenarios"))
        .expect("scenarios/ exists")
        .map(|e| e.expect("readable entry").path())
        .filter(|p| p.extension().is_some_and(|e| e == "ron"))
        .collect();
    files.sort();
    files
}

/// Asserts `a` and `b` agree to `rel` relative in every number. Temperatures
/// are compared in kelvin (0 °C is not a special value for them).
pub fn assert_designs_close(a: &Design, b: &Design, rel: f64) {
    let mut bad = Vec::new();
    let mut close = |what: &str, x: f64, y: f64| {
        let ok = x == y || (x - y).abs() <= rel * x.abs().max(y.abs());
        if !ok {
            bad.push(format!("{what}: {x} vs {y}"));
        }
    };
    let kelvin = |c: f64| c + 273.15;
    close(
        "water temperature K",
        kelvin(a.water_temperature_c),
        kelvin(b.water_temperature_c),
    );
    close(
        "air temperature K",
        kelvin(a.site.air_temperature_c),
        kelvin(b.site.air_temperature_c),
    );
    close("altitude", a.site.altitude_m, b.site.altitude_m);
    match (a.supply, b.supply) {
        (Supply::Pressure { inlet_pa: x }, Supply::Pressure { inlet_pa: y }) => {
            close("inlet", x, y)
        }
        (Supply::Flow { total_m3_s: x }, Supply::Flow { total_m3_s: y }) => close("flow", x, y),
        (Supply::Line(x), Supply::Line(y)) => {
            close("line source", x.source_pa, y.source_pa);
            close("line length", x.length_m, y.length_m);
            close("line bore", x.bore_m, y.bore_m);
            close("line roughness", x.roughness_m, y.roughness_m);
            close("line minor_k", x.minor_k, y.minor_k);
            close("line lift", x.lift_m, y.lift_m);
        }
        (x, y) => panic!("supplies differ in kind: {x:?} vs {y:?}"),
    }
    close("hub radius", a.rotor.hub_radius_m, b.rotor.hub_radius_m);
    close(
        "swivel bore",
        a.rotor.swivel.inlet_bore_m,
        b.rotor.swivel.inlet_bore_m,
    );
    close("swivel k", a.rotor.swivel.k, b.rotor.swivel.k);
    assert_eq!(a.rotor.arms.len(), b.rotor.arms.len(), "arm count");
    for (i, (x, y)) in a.rotor.arms.iter().zip(&b.rotor.arms).enumerate() {
        let mut c = |w: &str, p: f64, q: f64| close(&format!("arms[{i}].{w}"), p, q);
        c("radius", x.radius_m, y.radius_m);
        c("azimuth", x.azimuth_rad, y.azimuth_rad);
        c("height", x.height_m, y.height_m);
        c("rise", x.rise_m, y.rise_m);
        c("tube.bore", x.tube.bore_m, y.tube.bore_m);
        c("tube.outer", x.tube.outer_m, y.tube.outer_m);
        c("tube.roughness", x.tube.roughness_m, y.tube.roughness_m);
        c("tube.minor_k", x.tube.minor_k, y.tube.minor_k);
        match (x.tube.length_m, y.tube.length_m) {
            (Some(p), Some(q)) => c("tube.length", p, q),
            (None, None) => {}
            (p, q) => panic!("arms[{i}].tube.length: {p:?} vs {q:?}"),
        }
        c("nozzle.diameter", x.nozzle.diameter_m, y.nozzle.diameter_m);
        c(
            "nozzle.elevation",
            x.nozzle.elevation_rad,
            y.nozzle.elevation_rad,
        );
        c(
            "nozzle.deflection",
            x.nozzle.deflection_rad,
            y.nozzle.deflection_rad,
        );
        c("nozzle.cd", x.nozzle.cd, y.nozzle.cd);
        c("nozzle.cv", x.nozzle.cv, y.nozzle.cv);
    }
    match (a.rotor.inertia, b.rotor.inertia) {
        (Inertia::Given { kg_m2: x }, Inertia::Given { kg_m2: y }) => close("inertia", x, y),
        (
            Inertia::Estimate {
                tube_density_kg_m3: p,
                tube_wall_m: q,
                tip_mass_kg: r,
            },
            Inertia::Estimate {
                tube_density_kg_m3: x,
                tube_wall_m: y,
                tip_mass_kg: z,
            },
        ) => {
            close("tube density", p, x);
            close("tube wall", q, y);
            close("tip mass", r, z);
        }
        (x, y) => panic!("inertia differs in kind: {x:?} vs {y:?}"),
    }
    let (f, g) = (&a.friction, &b.friction);
    match (f.bearing, g.bearing) {
        (Bearing::Washer(x), Bearing::Washer(y)) => {
            close("mu_kinetic", x.mu_kinetic, y.mu_kinetic);
            close("mu_static", x.mu_static, y.mu_static);
            close("washer inner", x.inner_m, y.inner_m);
            close("washer outer", x.outer_m, y.outer_m);
            close("thrust area", x.thrust_area_m2, y.thrust_area_m2);
            close("rotor mass", x.rotor_mass_kg, y.rotor_mass_kg);
            assert_eq!(x.radius_rule, y.radius_rule, "radius rule");
        }
        (
            Bearing::Measured {
                running_n_m: p,
                breakaway_n_m: q,
            },
            Bearing::Measured {
                running_n_m: x,
                breakaway_n_m: y,
            },
        ) => {
            close("running", p, x);
            close("breakaway", q, y);
        }
        (x, y) => panic!("bearing differs in kind: {x:?} vs {y:?}"),
    }
    close("seal base", f.seal.base_n_m, g.seal.base_n_m);
    close("seal per Pa", f.seal.per_pa_n_m, g.seal.per_pa_n_m);
    close("brake viscous", f.brake.viscous, g.brake.viscous);
    close("brake quadratic", f.brake.quadratic, g.brake.quadratic);
    close("arm drag cd", f.arm_drag_cd, g.arm_drag_cd);
    let opt = |what: &str,
               x: Option<f64>,
               y: Option<f64>,
               close: &mut dyn FnMut(&str, f64, f64)| match (x, y) {
        (Some(p), Some(q)) => close(what, p, q),
        (None, None) => {}
        (p, q) => panic!("{what}: {p:?} vs {q:?}"),
    };
    opt("d50", a.spray.d50_m, b.spray.d50_m, &mut close);
    opt("spread", a.spray.spread, b.spray.spread, &mut close);
    opt("largest", a.spray.largest_m, b.spray.largest_m, &mut close);
    match (a.layout, b.layout) {
        (Some(Layout::Square { spacing_m: x }), Some(Layout::Square { spacing_m: y }))
        | (Some(Layout::Triangle { spacing_m: x }), Some(Layout::Triangle { spacing_m: y })) => {
            close("spacing", x, y)
        }
        (
            Some(Layout::Rectangle {
                spacing_m: p,
                rows_m: q,
            }),
            Some(Layout::Rectangle {
                spacing_m: x,
                rows_m: y,
            }),
        ) => {
            close("spacing", p, x);
            close("rows", q, y);
        }
        (None, None) => {}
        (x, y) => panic!("layout differs: {x:?} vs {y:?}"),
    }
    close("wind speed", a.wind.speed_m_s, b.wind.speed_m_s);
    close("wind from", a.wind.from_rad, b.wind.from_rad);
    assert_eq!(a.name, b.name, "name");
    assert!(bad.is_empty(), "designs differ:\n{}", bad.join("\n"));
}

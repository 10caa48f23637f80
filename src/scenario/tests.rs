//! Unit tests of loading, validation and messages. Whole-file checks of the
//! shipped scenarios and malformed fixtures are in tests/scenario_files.rs.

use super::*;
use crate::physics::design as d;

/// A small valid scenario that leaves every optional field out.
const MINIMAL: &str = r#"
Scenario(
    name: "Minimal",
    supply: Pressure(kPa(250)),
    rotor: (
        hub_radius: mm(10),
        swivel: (inlet_bore: mm(10), k: 1.5),
        arms: [
            (radius: mm(150), azimuth: deg(0), height: mm(300),
             tube: (bore: mm(6), outer: mm(8), roughness: mm(0.0015), minor_k: 0.5),
             nozzle: (diameter: mm(2.0), elevation: deg(25), deflection: deg(15), cd: 0.96, cv: 0.98)),
        ],
        inertia: Given(kg_m2(0.001)),
    ),
    friction: (bearing: Measured(running: N_m(0.01), breakaway: N_m(0.015))),
)
"#;

fn load(text: &str) -> Result<Scenario, ScenarioError> {
    load_str(text, "test.ron")
}

fn err_of(text: &str) -> ScenarioError {
    match load(text) {
        Ok(s) => panic!("loaded, but should not have: {s:?}"),
        Err(e) => e,
    }
}

#[test]
fn optional_fields_take_their_documented_defaults() {
    let design = load(MINIMAL).unwrap().to_design().unwrap();
    assert_eq!(design.water_temperature_c, 20.0);
    assert_eq!(design.site.air_temperature_c, 20.0);
    assert_eq!(design.site.altitude_m, 0.0);
    assert_eq!(design.friction.seal, d::Seal::default());
    assert_eq!(design.friction.brake, d::Brake::default());
    assert_eq!(design.friction.arm_drag_cd, 1.1);
    assert_eq!(design.spray, d::SpraySpec::default());
    assert_eq!(design.layout, None);
    assert_eq!(design.wind, d::Wind::default());
    let arm = design.rotor.arms[0];
    assert_eq!(arm.rise_m, 0.0);
    assert_eq!(arm.tube.length_m, None);
    assert_eq!(arm.tube_length_m(), 0.15);
    // SI values: 250 kPa, 2.0 mm, 25°.
    assert_eq!(design.supply, d::Supply::Pressure { inlet_pa: 250e3 });
    assert!((arm.nozzle.diameter_m - 0.002).abs() < 1e-15);
    assert!((arm.nozzle.elevation_rad - 25f64.to_radians()).abs() < 1e-15);
}

#[test]
fn optional_sections_can_be_partial_and_values_read_in_their_units() {
    let text = MINIMAL
        .replace(
            "name: \"Minimal\",",
            "name: \"Minimal\", air: (altitude: ft(1000)), water: (temperature: F(50)),",
        )
        .replace(
            "Measured(running: N_m(0.01), breakaway: N_m(0.015))",
            "Washer(mu_kinetic: 0.1, mu_static: 0.15, inner: mm(4), outer: mm(8), \
             thrust_area: mm2(110), rotor_mass: g(180), radius_rule: UniformPressure), \
             seal: (per_kpa: N_m(0.00002)), brake: (quadratic: 0.5)",
        )
        .replace("height: mm(300),", "height: mm(300), rise: cm(5),")
        .replace("minor_k: 0.5)", "minor_k: 0.5, length: mm(170))")
        .replace(
            "    friction:",
            "    spray: (d50: mm(1.1), spread: 2.5), layout: Rectangle(spacing: m(9), rows: m(10)),\n    wind: (speed: mph(4)),\n    friction:",
        );
    let design = load(&text).unwrap().to_design().unwrap();
    assert!((design.site.altitude_m - 304.8).abs() < 1e-9); // 1000 ft = 304.8 m exactly
    assert!((design.water_temperature_c - 10.0).abs() < 1e-12); // 50 °F = 10 °C
    assert!(design.site.air_temperature_c == 20.0);
    let d::Bearing::Washer(w) = design.friction.bearing else {
        panic!("washer expected")
    };
    assert_eq!(w.radius_rule, d::WasherRule::UniformPressure);
    assert!((w.thrust_area_m2 - 110e-6).abs() < 1e-18);
    assert!((design.friction.seal.per_pa_n_m - 2e-8).abs() < 1e-20); // per kPa → per Pa
    assert_eq!(design.friction.brake.quadratic, 0.5);
    assert_eq!(design.friction.brake.viscous, 0.0);
    assert!((design.rotor.arms[0].rise_m - 0.05).abs() < 1e-15);
    assert_eq!(design.rotor.arms[0].tube.length_m, Some(0.17));
    assert_eq!(design.spray.d50_m, Some(0.0011));
    assert_eq!(design.spray.spread, Some(2.5));
    assert_eq!(design.spray.largest_m, None);
    assert_eq!(
        design.layout,
        Some(d::Layout::Rectangle {
            spacing_m: 9.0,
            rows_m: 10.0
        })
    );
    assert!((design.wind.speed_m_s - 4.0 * 0.447_04).abs() < 1e-12);
}

#[test]
fn version_is_checked_before_anything_else() {
    // A newer file may have fields this build does not know: the message must
    // still be about the version, not about the field.
    let newer = MINIMAL.replace("name:", "version: 7, colour: \"red\", name:");
    let e = err_of(&newer);
    assert!(
        matches!(
            e,
            ScenarioError::NewerVersion {
                found: 7,
                supported: 1,
                ..
            }
        ),
        "{e}"
    );
    let msg = e.to_string();
    assert!(
        msg.contains("newer spinwright") && msg.contains("version 7"),
        "{msg}"
    );
    assert!(msg.contains("reads format version 1"), "{msg}");

    let zero = MINIMAL.replace("name:", "version: 0, name:");
    assert!(matches!(
        err_of(&zero),
        ScenarioError::UnknownVersion { found: 0, .. }
    ));

    let one = MINIMAL.replace("name:", "version: 1, name:");
    assert_eq!(load(&one).unwrap().version, 1);
    assert_eq!(load(MINIMAL).unwrap().version, 1);

    // A version that is not a whole number is a syntax error with a place.
    let bad = MINIMAL.replace("name:", "version: \"two\", name:");
    let e = err_of(&bad);
    assert!(matches!(e, ScenarioError::Syntax { line: 3, .. }), "{e}");
}

/// (edit to MINIMAL, field path expected in the message, words expected)
const RANGE_CASES: &[(&str, &str, &str, &str)] = &[
    ("radius: mm(150)", "radius: mm(0)", "rotor.arms[0].radius", "greater than zero"),
    ("radius: mm(150)", "radius: mm(-150)", "rotor.arms[0].radius", "greater than zero"),
    ("radius: mm(150)", "radius: mm(8)", "rotor.arms[0].radius", "hub_radius"),
    ("elevation: deg(25)", "elevation: deg(95)", "rotor.arms[0].nozzle.elevation", "between 0° (level) and 90°"),
    ("elevation: deg(25)", "elevation: deg(-1)", "rotor.arms[0].nozzle.elevation", "between 0°"),
    ("deflection: deg(15)", "deflection: deg(190)", "rotor.arms[0].nozzle.deflection", "between -180° and 180°"),
    ("diameter: mm(2.0)", "diameter: mm(7)", "rotor.arms[0].nozzle.diameter", "wider than the tube bore mm(6)"),
    ("diameter: mm(2.0)", "diameter: mm(0)", "rotor.arms[0].nozzle.diameter", "greater than zero"),
    ("outer: mm(8)", "outer: mm(6)", "rotor.arms[0].tube.outer", "larger than the bore"),
    ("bore: mm(6)", "bore: mm(-6)", "rotor.arms[0].tube.bore", "greater than zero"),
    ("roughness: mm(0.0015)", "roughness: mm(-0.1)", "rotor.arms[0].tube.roughness", "not be negative"),
    ("roughness: mm(0.0015)", "roughness: mm(3)", "rotor.arms[0].tube.roughness", "half the bore"),
    ("minor_k: 0.5", "minor_k: -0.5", "rotor.arms[0].tube.minor_k", "not be negative"),
    ("minor_k: 0.5)", "minor_k: 0.5, length: mm(100))", "rotor.arms[0].tube.length", "at least the radius minus the hub radius"),
    ("height: mm(300)", "height: mm(-1)", "rotor.arms[0].height", "not be negative"),
    ("cd: 0.96", "cd: 1.2", "rotor.arms[0].nozzle.cd", "above 0 and at most 1"),
    ("cd: 0.96", "cd: 0", "rotor.arms[0].nozzle.cd", "above 0 and at most 1"),
    ("cv: 0.98", "cv: -0.98", "rotor.arms[0].nozzle.cv", "above 0 and at most 1"),
    ("cv: 0.98", "cv: NaN", "rotor.arms[0].nozzle.cv", "finite"),
    ("deg(0)", "deg(inf)", "rotor.arms[0].azimuth", "finite"),
    ("hub_radius: mm(10)", "hub_radius: mm(-1)", "rotor.hub_radius", "not be negative"),
    ("inlet_bore: mm(10)", "inlet_bore: mm(0)", "rotor.swivel.inlet_bore", "greater than zero"),
    ("k: 1.5", "k: -1", "rotor.swivel.k", "not be negative"),
    ("Pressure(kPa(250))", "Pressure(kPa(0))", "supply.Pressure", "greater than zero"),
    ("Pressure(kPa(250))", "Pressure(psi(-40))", "supply.Pressure", "greater than zero"),
    ("Pressure(kPa(250))", "Flow(L_min(0))", "supply.Flow", "greater than zero"),
    ("Pressure(kPa(250))", "Flow(gpm(-3))", "supply.Flow", "greater than zero"),
    (
        "Pressure(kPa(250))",
        "Line(source: kPa(400), length: m(0), bore: mm(16), roughness: mm(0.0015), minor_k: 2.0, lift: m(0.5))",
        "supply.Line.length",
        "greater than zero",
    ),
    (
        "Pressure(kPa(250))",
        "Line(source: kPa(400), length: m(15), bore: mm(-16), roughness: mm(0.0015), minor_k: 2.0, lift: m(0.5))",
        "supply.Line.bore",
        "greater than zero",
    ),
    (
        "Pressure(kPa(250))",
        "Line(source: kPa(0), length: m(15), bore: mm(16), roughness: mm(0.0015), minor_k: -2.0, lift: m(0.5))",
        "supply.Line.minor_k",
        "not be negative",
    ),
    ("name: \"Minimal\",", "name: \"Minimal\", water: (temperature: C(60)),", "water.temperature", "between 0 and 50 °C"),
    ("name: \"Minimal\",", "name: \"Minimal\", water: (temperature: F(20)),", "water.temperature", "between 0 and 50 °C"),
    ("name: \"Minimal\",", "name: \"Minimal\", air: (altitude: m(20000)),", "air.altitude", "11000 m"),
    ("name: \"Minimal\",", "name: \"Minimal\", wind: (speed: m_s(-2)),", "wind.speed", "not be negative"),
    ("name: \"Minimal\",", "name: \"Minimal\", layout: Square(spacing: m(0)),", "layout.Square.spacing", "greater than zero"),
    ("name: \"Minimal\",", "name: \"Minimal\", layout: Rectangle(spacing: m(9), rows: m(-1)),", "layout.Rectangle.rows", "greater than zero"),
    ("name: \"Minimal\",", "name: \"Minimal\", spray: (d50: mm(0)),", "spray.d50", "greater than zero"),
    ("name: \"Minimal\",", "name: \"Minimal\", spray: (spread: -1),", "spray.spread", "greater than zero"),
    ("name: \"Minimal\",", "name: \"Minimal\", spray: (d50: mm(2), largest: mm(1.5)),", "spray.largest", "larger than spray.d50"),
    ("Given(kg_m2(0.001))", "Given(kg_m2(0))", "rotor.inertia.Given", "greater than zero"),
    (
        "Given(kg_m2(0.001))",
        "Estimate(tube_density: kg_m3(8500), tube_wall: mm(5), tip_mass: g(6))",
        "rotor.inertia.Estimate.tube_wall",
        "half the outer diameter",
    ),
    (
        "Given(kg_m2(0.001))",
        "Estimate(tube_density: kg_m3(-1), tube_wall: mm(1), tip_mass: g(6))",
        "rotor.inertia.Estimate.tube_density",
        "greater than zero",
    ),
    ("running: N_m(0.01)", "running: N_m(-0.01)", "friction.bearing.Measured.running", "not be negative"),
    (
        "bearing: Measured(running: N_m(0.01), breakaway: N_m(0.015))",
        "bearing: Washer(mu_kinetic: 0.1, mu_static: 0.15, inner: mm(8), outer: mm(8), thrust_area: mm2(110), rotor_mass: g(180))",
        "friction.bearing.Washer.inner",
        "smaller than the outer radius mm(8)",
    ),
    (
        "bearing: Measured(running: N_m(0.01), breakaway: N_m(0.015))",
        "bearing: Washer(mu_kinetic: -0.1, mu_static: 0.15, inner: mm(4), outer: mm(8), thrust_area: mm2(110), rotor_mass: g(180))",
        "friction.bearing.Washer.mu_kinetic",
        "not be negative",
    ),
    (
        "bearing: Measured(running: N_m(0.01), breakaway: N_m(0.015))",
        "bearing: Washer(mu_kinetic: 0.1, mu_static: 0.15, inner: mm(4), outer: mm(8), thrust_area: mm2(110), rotor_mass: g(0))",
        "friction.bearing.Washer.rotor_mass",
        "greater than zero",
    ),
    ("breakaway: N_m(0.015))", "breakaway: N_m(0.015)), brake: (viscous: -0.1)", "friction.brake.viscous", "not be negative"),
    ("breakaway: N_m(0.015))", "breakaway: N_m(0.015)), brake: (quadratic: -1)", "friction.brake.quadratic", "not be negative"),
    ("breakaway: N_m(0.015))", "breakaway: N_m(0.015)), seal: (base: N_m(-1))", "friction.seal.base", "not be negative"),
    ("breakaway: N_m(0.015))", "breakaway: N_m(0.015)), arm_drag_cd: -1", "friction.arm_drag_cd", "not be negative"),
];

#[test]
fn every_range_rule_names_the_field_and_the_allowed_range() {
    for &(from, to, path, words) in RANGE_CASES {
        assert!(MINIMAL.contains(from), "fixture lacks `{from}`");
        let text = MINIMAL.replacen(from, to, 1);
        let e = err_of(&text);
        let problems = e.problems();
        assert!(
            problems
                .iter()
                .any(|p| p.path == path && p.rule.contains(words)),
            "`{to}`: expected {path} with “{words}”, got: {e}"
        );
        let msg = e.to_string();
        assert!(msg.starts_with("test.ron: "), "{msg}");
        assert!(msg.contains(path), "{msg}");
    }
}

#[test]
fn a_rotor_needs_an_arm() {
    let start = MINIMAL.find("arms: [").unwrap();
    let end = MINIMAL.find("],").unwrap();
    let text = format!("{}arms: [{}", &MINIMAL[..start], &MINIMAL[end..]);
    let e = err_of(&text);
    assert!(e.problems().iter().any(|p| p.path == "rotor.arms"), "{e}");
    assert!(e.to_string().contains("at least one arm"), "{e}");
}

#[test]
fn all_problems_are_reported_at_once() {
    let text = MINIMAL
        .replace("cd: 0.96", "cd: 2")
        .replace("elevation: deg(25)", "elevation: deg(100)");
    let e = err_of(&text);
    assert_eq!(e.problems().len(), 2, "{e}");
    assert!(e.to_string().contains("2 problems"), "{e}");
}

#[test]
fn a_value_is_never_clamped() {
    // 90° is allowed (straight up); 90.5° is refused, not moved to 90°.
    let ok = MINIMAL.replace("elevation: deg(25)", "elevation: deg(90)");
    let design = load(&ok).unwrap().to_design().unwrap();
    assert_eq!(
        design.rotor.arms[0].nozzle.elevation_rad,
        90f64.to_radians()
    );
    // The water range 0–50 °C is 32–122 °F, ends included.
    for t in ["F(32)", "F(122)", "C(0)", "C(50)"] {
        let text = MINIMAL.replace(
            "name: \"Minimal\",",
            &format!("name: \"M\", water: (temperature: {t}),"),
        );
        load(&text).unwrap_or_else(|e| panic!("{t}: {e}"));
    }
    let bad = MINIMAL.replace("elevation: deg(25)", "elevation: deg(90.5)");
    assert!(load(&bad).is_err());
    // The edge cases are inclusive where the physics allows: cd = 1, hub 0.
    let edge = MINIMAL
        .replace("cd: 0.96", "cd: 1")
        .replace("hub_radius: mm(10)", "hub_radius: mm(0)")
        .replace("deflection: deg(15)", "deflection: deg(-180)");
    load(&edge).unwrap();
}

fn syntax(e: &ScenarioError) -> (usize, usize, Option<&str>, &str) {
    match e {
        ScenarioError::Syntax {
            line,
            column,
            field,
            message,
            ..
        } => (*line, *column, field.as_deref(), message),
        other => panic!("not a syntax error: {other}"),
    }
}

#[test]
fn unknown_field_names_line_column_place_and_choices() {
    let text = MINIMAL.replace("cd: 0.96", "cdd: 0.96");
    let e = err_of(&text);
    let (line, column, field, message) = syntax(&e);
    assert_eq!((line, column), (11, 83), "{e}"); // where `cdd` starts
    assert_eq!(field, Some("rotor.arms[0].nozzle"));
    assert!(message.contains("unknown field `cdd`"), "{message}");
    assert!(message.contains("`cd`, `cv`"), "{message}");
    let shown = e.to_string();
    assert!(
        shown.starts_with("test.ron: line 11, column 83 (in rotor.arms[0].nozzle): unknown field"),
        "{shown}"
    );
}

#[test]
fn unknown_unit_tag_lists_the_tags_for_that_dimension() {
    let text = MINIMAL.replace("Pressure(kPa(250))", "Pressure(kpa(250))");
    let e = err_of(&text);
    let (line, _, field, message) = syntax(&e);
    assert_eq!(line, 4);
    assert_eq!(field, Some("supply.Pressure"));
    assert!(
        message.contains("unknown unit tag `kpa` for a pressure"),
        "{message}"
    );
    assert!(message.contains("`kPa`, `bar`, `MPa`, `psi`"), "{message}");

    let text = MINIMAL.replace("radius: mm(150)", "radius: inch(6)");
    let e = err_of(&text);
    let (_, _, field, message) = syntax(&e);
    assert_eq!(field, Some("rotor.arms[0].radius"));
    assert!(message.contains("`mm`, `cm`, `m`, `in`, `ft`"), "{message}");

    // A unit of the wrong dimension is an unknown tag too.
    let text = MINIMAL.replace("radius: mm(150)", "radius: kPa(6)");
    let e = err_of(&text);
    let (_, _, _, message) = syntax(&e);
    assert!(
        message.contains("unknown unit tag `kPa` for a length"),
        "{message}"
    );
}

#[test]
fn a_bare_number_where_a_unit_is_needed_is_refused() {
    let text = MINIMAL.replace("radius: mm(150)", "radius: 150");
    let e = err_of(&text);
    let (line, _, field, message) = syntax(&e);
    assert_eq!(line, 9);
    assert_eq!(field, Some("rotor.arms[0].radius"), "{e}");
    assert!(
        message.contains("needs its unit: write it as `mm(150)`"),
        "{message}"
    );
    assert!(message.contains("`in`, `ft`"), "{message}");
    for (from, to, want) in [
        ("Pressure(kPa(250))", "Pressure(250)", "`kPa(250)`"),
        ("elevation: deg(25)", "elevation: 25.5", "`deg(25.5)`"),
        ("running: N_m(0.01)", "running: -0.01", "`N_m(-0.01)`"),
    ] {
        let e = err_of(&MINIMAL.replace(from, to));
        let (_, _, _, message) = syntax(&e);
        assert!(message.contains(want), "{to}: {e}");
    }
}

#[test]
fn wrong_kinds_and_broken_syntax_say_what_was_expected() {
    let e = err_of(&MINIMAL.replace("cd: 0.96", "cd: \"high\""));
    let (_, _, field, message) = syntax(&e);
    assert_eq!(field, Some("rotor.arms[0].nozzle.cd"));
    assert!(message.contains("expected a number"), "{message}");

    let e = err_of(&MINIMAL.replace("Pressure(kPa(250))", "Presure(kPa(250))"));
    let (line, _, _, message) = syntax(&e);
    assert_eq!(line, 4);
    assert!(message.contains("unknown choice `Presure`"), "{message}");
    assert!(message.contains("`Pressure`, `Flow`, `Line`"), "{message}");

    let e = err_of(&MINIMAL.replace(", cv: 0.98", ""));
    let (_, _, field, message) = syntax(&e);
    assert_eq!(field, Some("rotor.arms[0].nozzle"));
    assert!(message.contains("missing field `cv`"), "{message}");

    let e = err_of(&MINIMAL.replace("spread", "x").replace(
        "    friction:",
        "    spray: (spread: Often),\n    friction:",
    ));
    let (_, _, field, message) = syntax(&e);
    assert_eq!(field, Some("spray.spread"));
    assert!(message.contains("`Auto` or a bare number"), "{message}");

    let e = err_of(&MINIMAL.replace("k: 1.5),", "k: 1.5)"));
    let (line, _, _, message) = syntax(&e);
    assert_eq!(line, 8, "{e}");
    assert!(message.contains("comma"), "{message}");

    let e = err_of(&format!("{MINIMAL} trailing"));
    let (_, _, _, message) = syntax(&e);
    assert!(message.contains("after the end"), "{message}");

    let e = err_of(&MINIMAL[..MINIMAL.len() - 4]);
    let (_, _, _, message) = syntax(&e);
    assert!(
        message.contains("ends too early") || message.contains("expected"),
        "{message}"
    );

    let e = err_of(&MINIMAL.replace("Scenario(", "Design("));
    let (line, column, _, message) = syntax(&e);
    assert_eq!((line, column), (2, 1));
    assert!(message.contains("`Scenario(…)`"), "{message}");

    let e = err_of(&MINIMAL.replace(
        "name: \"Minimal\",",
        "name: \"Minimal\",\n    name: \"Again\",",
    ));
    let (_, _, _, message) = syntax(&e);
    assert!(message.contains("given twice"), "{message}");

    // Writing `Some(…)` for an optional field is not the file's style.
    let e = err_of(&MINIMAL.replace("minor_k: 0.5)", "minor_k: 0.5, length: Some(mm(170)))"));
    let (_, _, field, message) = syntax(&e);
    assert_eq!(field, Some("rotor.arms[0].tube.length"));
    assert!(message.contains("`Some`"), "{message}");
}

#[test]
fn reads_back_what_it_writes() {
    for system in [
        crate::units::UnitSystem::Metric,
        crate::units::UnitSystem::Us,
    ] {
        let original = load(MINIMAL).unwrap();
        let design = original.to_design().unwrap();
        let written = Scenario::from_design(&design, system, "written back");
        let text = written.to_ron_string();
        assert!(text.starts_with("// spinwright scenario"), "{text}");
        let again = load(&text).unwrap_or_else(|e| panic!("{e}\n{text}"));
        assert_eq!(again, written, "{text}");
        assert_eq!(again.notes, "written back");
        let d2 = again.to_design().unwrap();
        assert_eq!(d2.rotor.arms.len(), 1);
        let (a, b) = (design.rotor.arms[0], d2.rotor.arms[0]);
        assert!((a.nozzle.diameter_m - b.nozzle.diameter_m).abs() <= 1e-11 * a.nozzle.diameter_m);
        // Optional fields that were left out stay out.
        assert!(!text.contains("rise:") && !text.contains("length:") && !text.contains("layout:"));
    }
    // A scenario as loaded is written back with its own tags unchanged.
    let original = load(BUILTIN_EXAMPLE).unwrap();
    assert_eq!(load(&original.to_ron_string()).unwrap(), original);
}

#[test]
fn the_builtin_example_is_the_lawn_rotor() {
    let example = builtin_example();
    assert_eq!(example.name, "Lawn rotor");
    let design = example.to_design().unwrap();
    assert_eq!(design.rotor.arms.len(), 3);
    assert!(design.friction.brake.viscous > 0.0);
    assert!(matches!(design.layout, Some(d::Layout::Square { .. })));
}

#[test]
fn load_file_names_the_file() {
    let dir = tempfile::tempdir().unwrap();
    let missing = dir.path().join("nope.ron");
    let e = load_file(&missing).unwrap_err();
    assert!(matches!(e, ScenarioError::Read { .. }));
    assert!(e.to_string().contains("nope.ron"), "{e}");

    let bad = dir.path().join("bad.ron");
    std::fs::write(&bad, MINIMAL.replace("cd: 0.96", "cd: 3")).unwrap();
    let e = load_file(&bad).unwrap_err();
    assert!(e.to_string().starts_with(&bad.display().to_string()), "{e}");

    let good = dir.path().join("good.ron");
    save_atomic(&good, MINIMAL).unwrap();
    assert_eq!(load_file(&good).unwrap().name, "Minimal");
}

#[test]
fn positions_point_at_the_value_not_the_space_before_it() {
    let text = "a:  x\n  \n  y";
    assert_eq!(next_token(text, 1, 3), (1, 5));
    assert_eq!(next_token(text, 1, 6), (3, 3));
    assert_eq!(next_token(text, 1, 1), (1, 1));
    // Past the end: unchanged.
    assert_eq!(next_token("a  ", 1, 2), (1, 2));
    assert_eq!(next_token("a", 7, 2), (7, 2));
    // Columns count characters, not bytes.
    assert_eq!(next_token("é  x", 1, 2), (1, 4));
}

#[test]
fn windows_line_ends_and_a_byte_order_mark_are_fine() {
    let text = format!("\u{feff}{}", MINIMAL.replace('\n', "\r\n"));
    assert_eq!(load(&text).unwrap(), load(MINIMAL).unwrap());
    // Positions still count lines and characters as an editor shows them.
    let bad = text.replace("cd: 0.96", "cdd: 0.96");
    let e = err_of(&bad);
    let (line, column, _, _) = syntax(&e);
    assert_eq!((line, column), (11, 83), "{e}");
}

//! `target`, `check`, `sweep` and `compare`.

use super::*;

#[test]
fn target_writes_a_design_that_solves_to_the_target() {
    let dir = tempfile::tempdir().unwrap();
    let out_path = dir.path().join("tuned.ron");
    let file = scenario("lawn-rotor.ron");
    let out = bin()
        .args([
            "target",
            file.to_str().unwrap(),
            "--rpm",
            "40",
            "--adjust",
            "brake",
            "--format",
            "json",
            "--out",
        ])
        .arg(&out_path)
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["parameter"], "viscous");
    assert_eq!(v["reachable"], true);
    // The written scenario solves to the target within 0.1 % (issue acceptance).
    let out = bin()
        .args(["solve", out_path.to_str().unwrap(), "--format", "json"])
        .output()
        .unwrap();
    let s: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let rpm = s["operating_point"]["rpm"].as_f64().unwrap();
    assert!((rpm / 40.0 - 1.0).abs() < 1e-3, "{rpm}");
    // Out of reach: flagged, with the nearest value.
    let out = bin()
        .args([
            "target",
            file.to_str().unwrap(),
            "--rpm",
            "400",
            "--adjust",
            "deflection",
            "--format",
            "json",
        ])
        .output()
        .unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["reachable"], false);
    assert!(v["achieved_rpm"].as_f64().unwrap() < 400.0);
    bin()
        .args([
            "target",
            file.to_str().unwrap(),
            "--rpm",
            "40",
            "--adjust",
            "colour",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("--adjust"));
}

#[test]
fn check_round_trip_and_findings() {
    let file = scenario("lawn-rotor.ron");
    let out = bin()
        .args(["solve", file.to_str().unwrap(), "--format", "json"])
        .output()
        .unwrap();
    let s: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let rpm = s["operating_point"]["rpm"].as_f64().unwrap();
    // The model's own speed at the design pressure: no deviation, friction as designed.
    let c = json(&[
        "check",
        file.to_str().unwrap(),
        "--pressure",
        "300kPa",
        "--rpm",
        &format!("{rpm}"),
        "--format",
        "json",
    ]);
    for k in [
        "expected_rpm",
        "measured_rpm",
        "measured_rpm_band",
        "deviation_percent",
        "implied_running_torque_n_m",
        "design_running_torque_n_m",
        "implied_nozzle_diameter_m",
        "findings",
    ] {
        assert!(c.get(k).is_some(), "check.{k}");
    }
    assert!(c["deviation_percent"].as_f64().unwrap().abs() < 1e-6);
    let implied = c["implied_running_torque_n_m"].as_f64().unwrap();
    let design = c["design_running_torque_n_m"].as_f64().unwrap();
    assert!((implied / design - 1.0).abs() < 1e-6);
    // A slow, thirsty unit: worn nozzle and a dragging bearing, in trade words.
    bin()
        .args([
            "check",
            file.to_str().unwrap(),
            "--pressure",
            "2.5bar",
            "--turns",
            "5",
            "--over",
            "20s",
            "--caught",
            "5L",
            "--over",
            "14s",
        ])
        .assert()
        .success()
        .stdout(predicate::str::contains("nozzle worn"))
        .stdout(predicate::str::contains("bearing drag"));
    // CSV for a field log: header unless --no-header.
    let out = bin()
        .args([
            "check",
            file.to_str().unwrap(),
            "--pressure",
            "300kPa",
            "--rpm",
            "28",
            "--format",
            "csv",
            "--no-header",
        ])
        .output()
        .unwrap();
    assert_eq!(String::from_utf8(out.stdout).unwrap().lines().count(), 1);
    bin()
        .args([
            "check",
            file.to_str().unwrap(),
            "--pressure",
            "300kPa",
            "--turns",
            "10",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("--over"));
}

#[test]
fn sweep_rows_and_statuses() {
    let file = scenario("lawn-rotor.ron");
    let out = bin()
        .args([
            "sweep",
            file.to_str().unwrap(),
            "--vary",
            "deflection=0..120",
            "--vary",
            "pressure=150kPa..400kPa",
            "--points",
            "5,3",
            "--format",
            "csv",
        ])
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8(out.stdout).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    // Values in the chosen units (metric by default), the unit in each column name.
    assert_eq!(
        lines[0],
        "deflection_deg,pressure_kPa,status,rpm,start_margin,total_flow_L_min,wetted_radius_m"
    );
    assert!(lines[1].starts_with("0,150,"), "{}", lines[1]);
    assert_eq!(lines.len(), 1 + 15);
    // Forward-facing nozzles (120°) do not drive: a row that says so, not an abort.
    assert!(text.contains("stalls_at_rest"));
    bin()
        .args(["sweep", file.to_str().unwrap(), "--vary", "colour=1..2"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("unknown input"));
    // The old colon form is refused with the new spelling.
    bin()
        .args([
            "sweep",
            file.to_str().unwrap(),
            "--vary",
            "deflection=0:60:13",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains(
            "--vary deflection=0..60 --points 13",
        ));
}

#[test]
fn sweeps_vary_spacing_and_brake_and_show_any_figure() {
    // Issue 12: spacing and brake sweep like any other input; --points sets
    // the count (default 11); a two-axis grid shows the figure asked for,
    // its labels at one precision.
    let file = scenario("lawn-rotor.ron");
    let f = file.to_str().unwrap();
    let v = json(&[
        "sweep",
        f,
        "--vary",
        "spacing=8m..14m",
        "--points",
        "7",
        "--layout",
        "--format",
        "json",
    ]);
    let rows = v.as_array().unwrap();
    assert_eq!(rows.len(), 7);
    let spacing: Vec<f64> = rows
        .iter()
        .map(|r| r["spacing_m"].as_f64().unwrap())
        .collect();
    assert_eq!(spacing, vec![8.0, 9.0, 10.0, 11.0, 12.0, 13.0, 14.0]);
    // Heads further apart: CU at 14 m below CU at 8 m (same head, less overlap).
    let cu = |r: &serde_json::Value| r["cu_percent"].as_f64().unwrap();
    assert!(cu(&rows[6]) < cu(&rows[0]), "{rows:?}");
    let v = json(&["sweep", f, "--vary", "brake=0..0.002", "--format", "json"]);
    let rows = v.as_array().unwrap();
    assert_eq!(rows.len(), 11);
    let rpm = |r: &serde_json::Value| r["rpm"].as_f64().unwrap();
    assert!(rpm(&rows[10]) < rpm(&rows[0]), "a brake slows the rotor");
    assert!(rows[0]["viscous_n_m_s_rad"].is_number());
    let (code, text, err) = run(&[
        "sweep",
        f,
        "--vary",
        "pressure=150kPa..400kPa",
        "--vary",
        "deflection=0..20",
        "--points",
        "4,3",
        "--show",
        "throw",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(
        text.contains("wetted radius m: pressure kPa \\ deflection °"),
        "{text}"
    );
    // Row labels at one precision: 150, 233, 317, 400 (not 150 / 233.3 / …).
    for label in ["\n150 ", "\n233 ", "\n317 ", "\n400 "] {
        assert!(text.contains(label), "{label:?} in {text}");
    }
    let (code, _, err) = run(&[
        "sweep",
        f,
        "--vary",
        "pressure=150kPa..400kPa",
        "--vary",
        "deflection=0..20",
        "--show",
        "cu",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("--show cu needs --layout"), "{err}");
}

#[test]
fn an_unreachable_target_exits_1_under_strict_and_reports_the_result() {
    // Field arm: the fastest deflection (straight back) gives about 26 rpm,
    // so 30 rpm is out of reach by deflection; --strict makes that exit 1.
    let file = scenario("field-arm.ron");
    let f = file.to_str().unwrap();
    let args = ["target", f, "--rpm", "30", "--adjust", "deflection"];
    bin().args(args).assert().code(0);
    bin()
        .args(args)
        .arg("--strict")
        .assert()
        .code(1)
        .stdout(predicate::str::contains("out of reach"));
    // A reachable one: exit 0 under --strict, with what the design then gives.
    let lawn = scenario("lawn-rotor.ron");
    let out = bin()
        .args([
            "target",
            lawn.to_str().unwrap(),
            "--rpm",
            "30",
            "--adjust",
            "deflection",
            "--strict",
            "--format",
            "json",
        ])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(0));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["reachable"], true);
    assert!((v["rpm"].as_f64().unwrap() - 30.0).abs() < 0.01);
    for key in [
        "wetted_radius_m",
        "start_margin",
        "total_flow_m3_s",
        "rpm_per_unit",
    ] {
        assert!(v[key].is_number(), "{key}: {v}");
    }
    // More deflection, less speed: a negative slope.
    assert!(v["rpm_per_unit"].as_f64().unwrap() < 0.0);
}

#[test]
fn two_targets_with_two_adjustments() {
    // Issue 12: --rpm 30 --throw 11m --adjust deflection,nozzle; the design
    // found gives both (its own solve and throw, to the search tolerance).
    let file = scenario("lawn-rotor.ron");
    let v = json(&[
        "target",
        file.to_str().unwrap(),
        "--rpm",
        "30",
        "--throw",
        "11m",
        "--adjust",
        "deflection,nozzle",
        "--format",
        "json",
    ]);
    assert_eq!(v["reachable"], true, "{v}");
    assert!(
        (v["rpm"].as_f64().unwrap() / 30.0 - 1.0).abs() < 1e-3,
        "{v}"
    );
    assert!(
        (v["wetted_radius_m"].as_f64().unwrap() / 11.0 - 1.0).abs() < 1e-3,
        "{v}"
    );
    assert_eq!(v["parameters"][1], "nozzle");
    // One target for two inputs is refused.
    bin()
        .args([
            "target",
            file.to_str().unwrap(),
            "--rpm",
            "30",
            "--adjust",
            "deflection,nozzle",
        ])
        .assert()
        .code(2);
}

#[test]
fn compare_lists_differences_and_deltas() {
    let a = scenario("lawn-rotor.ron");
    let b = scenario("patio-rotor-us.ron");
    let v = json(&[
        "compare",
        a.to_str().unwrap(),
        b.to_str().unwrap(),
        "--format",
        "json",
    ]);
    assert!(v["inputs"]
        .as_array()
        .unwrap()
        .iter()
        .any(|i| i["path"] == "supply.Pressure" && i["unit"] == "Pa"));
    let keys: Vec<&str> = v["results"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| r["key"].as_str().unwrap())
        .collect();
    for k in [
        "rpm",
        "start_margin",
        "total_flow_m3_s",
        "wetted_radius_m",
        "cu_percent",
        "du_lq_percent",
    ] {
        assert!(keys.contains(&k), "compare result {k}");
    }
    bin()
        .args(["compare", a.to_str().unwrap()])
        .assert()
        .code(2);
}

#[test]
fn target_help_names_every_adjustable_input() {
    // The help line is written by hand; the catalogue says what may be adjusted.
    let out = bin().args(["target", "--help"]).output().unwrap();
    let help = String::from_utf8_lossy(&out.stdout);
    for input in spinwright::catalogue::adjustable() {
        assert!(
            help.contains(input.vary_name()),
            "`target --help` does not name `{}`",
            input.vary_name()
        );
    }
}

#[test]
fn target_out_keeps_the_files_comments_and_notes() {
    let dir = tempfile::tempdir().unwrap();
    let out_path = dir.path().join("tuned.ron");
    let file = scenario("field-arm.ron");
    let original = std::fs::read_to_string(&file).unwrap();
    let out = bin()
        .args([
            "target",
            file.to_str().unwrap(),
            "--rpm",
            "20",
            "--adjust",
            "brake",
            "--units",
            "us",
            "--out",
        ])
        .arg(&out_path)
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let written = std::fs::read_to_string(&out_path).unwrap();
    let (a, b): (Vec<&str>, Vec<&str>) = (original.lines().collect(), written.lines().collect());
    assert_eq!(a.len(), b.len(), "{written}");
    let changed: Vec<_> = a.iter().zip(&b).filter(|(x, y)| x != y).collect();
    // Only the brake line: comments, notes and the file's metric units stay.
    assert_eq!(changed.len(), 1, "{changed:#?}");
    assert!(
        changed[0]
            .0
            .contains("brake: (viscous: 0.0, quadratic: 1.6)"),
        "{changed:?}"
    );
    assert!(changed[0].1.contains("quadratic: 1.6)"), "{changed:?}");
    assert!(written
        .contains("notes: \"Agricultural rotating arm on 35 m of 19 mm hose, fluid brake.\""));
}

//! The binary on shipped scenarios and malformed files.

use std::path::PathBuf;

use assert_cmd::Command;
use predicates::prelude::*;

fn bin() -> Command {
    Command::cargo_bin("spinwright").expect("the binary is built")
}

fn scenario(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("scenarios")
        .join(name)
}

fn shipped() -> Vec<PathBuf> {
    let mut files: Vec<PathBuf> =
        std::fs::read_dir(PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("scenarios"))
            .expect("scenarios folder")
            .filter_map(|e| e.ok().map(|e| e.path()))
            .filter(|p| p.extension().is_some_and(|x| x == "ron"))
            .collect();
    files.sort();
    files
}

/// Run the binary with `args`, require success and parse its JSON output.
fn json(args: &[&str]) -> serde_json::Value {
    let out = bin().args(args).output().unwrap();
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).unwrap()
}

fn write_temp(dir: &tempfile::TempDir, name: &str, text: &str) -> PathBuf {
    let path = dir.path().join(name);
    std::fs::write(&path, text).expect("temp file");
    path
}

#[test]
fn solve_runs_on_every_shipped_scenario_in_every_format() {
    assert!(shipped().len() >= 4);
    for file in shipped() {
        for format in ["text", "json", "csv"] {
            for units in ["metric", "us"] {
                let out = bin()
                    .args([
                        "solve",
                        file.to_str().unwrap(),
                        "--format",
                        format,
                        "--units",
                        units,
                    ])
                    .output()
                    .unwrap();
                assert!(
                    out.status.success(),
                    "{} {format}: {}",
                    file.display(),
                    String::from_utf8_lossy(&out.stderr)
                );
                let text = String::from_utf8(out.stdout).unwrap();
                assert!(
                    !text.contains("NaN") && !text.contains("inf"),
                    "{}: {text}",
                    file.display()
                );
            }
        }
    }
}

#[test]
fn solve_json_has_exactly_the_documented_keys() {
    let out = bin()
        .args([
            "solve",
            scenario("lawn-rotor.ron").to_str().unwrap(),
            "--format",
            "json",
        ])
        .output()
        .unwrap();
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let mut keys: Vec<&str> = v.as_object().unwrap().keys().map(String::as_str).collect();
    keys.sort_unstable();
    // interface.md, "JSON report of solve".
    let mut expected = vec![
        "scenario",
        "status",
        "operating_point",
        "equilibria",
        "stall_torque_n_m",
        "breakaway_torque_n_m",
        "start_margin",
        "runaway_rpm",
        "inlet_pressure_pa",
        "hub_pressure_pa",
        "total_flow_m3_s",
        "nozzles",
        "resisting_torque_n_m",
        "power_w",
        "spin_up_s",
        "wetted_radius_m",
        "warnings",
    ];
    expected.sort_unstable();
    assert_eq!(keys, expected);
    let op = v["operating_point"].as_object().unwrap();
    for k in [
        "omega_rad_s",
        "rpm",
        "seconds_per_turn",
        "tip_speed_m_s",
        "drive_torque_n_m",
        "stable",
    ] {
        assert!(op.contains_key(k), "operating_point.{k}");
    }
    let nozzle = v["nozzles"][0].as_object().unwrap();
    for k in [
        "flow_m3_s",
        "nozzle_pressure_pa",
        "jet_speed_relative_m_s",
        "jet_velocity_absolute_m_s",
        "throw_m",
    ] {
        assert!(nozzle.contains_key(k), "nozzles[0].{k}");
    }
    assert_eq!(
        v["nozzles"][0]["jet_velocity_absolute_m_s"]
            .as_array()
            .unwrap()
            .len(),
        3
    );
    for k in ["bearing", "seal", "brake", "air", "total"] {
        assert!(
            v["resisting_torque_n_m"][k].is_number(),
            "resisting_torque_n_m.{k}"
        );
    }
    for k in ["shaft", "hydraulic", "jet_kinetic"] {
        assert!(v["power_w"][k].is_number(), "power_w.{k}");
    }
    assert!(v["spin_up_s"]["t90"].is_number() && v["spin_up_s"]["t99"].is_number());
    assert_eq!(v["status"], "running");
}

#[test]
fn a_stalling_design_reports_nulls_and_strict_exits_one() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(scenario("lawn-rotor.ron"))
        .unwrap()
        .replace("mu_static: 0.15", "mu_static: 40.0");
    let path = write_temp(&dir, "stuck.ron", &text);
    let out = bin()
        .args(["solve", path.to_str().unwrap(), "--format", "json"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(0));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["status"], "stalls_at_rest");
    assert!(v["operating_point"].is_null());
    assert!(v["spin_up_s"].is_null());
    assert!(v["start_margin"].as_f64().unwrap() < 1.0);
    bin()
        .args(["solve", path.to_str().unwrap(), "--strict"])
        .assert()
        .code(1)
        .stdout(predicate::str::contains("stalls at rest"));
}

#[test]
fn table_has_forty_rows_by_default_and_honours_points() {
    let file = scenario("field-arm.ron");
    let out = bin()
        .args(["table", file.to_str().unwrap(), "--format", "csv"])
        .output()
        .unwrap();
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    assert!(lines.len() > 40, "{} lines", lines.len());
    assert!(lines[0].contains("drive N·m") && lines[0].contains("hub kPa"));
    let out = bin()
        .args([
            "table",
            file.to_str().unwrap(),
            "--format",
            "json",
            "--points",
            "7",
        ])
        .output()
        .unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let rows = v.as_array().unwrap();
    assert_eq!(rows.len(), 7);
    assert_eq!(rows[0]["rpm"], 0.0);
    // The last row is past runaway: drive torque has turned negative.
    assert!(rows[6]["drive_torque_n_m"].as_f64().unwrap() < 0.0);
    bin()
        .args(["table", file.to_str().unwrap(), "--points", "1"])
        .assert()
        .code(2);
}

#[test]
fn a_syntax_error_names_the_file_line_and_column() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(scenario("lawn-rotor.ron"))
        .unwrap()
        .replace("hub_radius: mm(15),", "hub_radius: mm(15)");
    let path = write_temp(&dir, "broken.ron", &text);
    let line = text.lines().position(|l| l.contains("hub_radius")).unwrap() + 2;
    bin()
        .args(["solve", path.to_str().unwrap()])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("broken.ron"))
        .stderr(predicate::str::contains(format!("line {line}")));
}

#[test]
fn an_unknown_unit_tag_and_a_bad_value_name_what_is_wrong() {
    let dir = tempfile::tempdir().unwrap();
    let base = std::fs::read_to_string(scenario("lawn-rotor.ron")).unwrap();
    let path = write_temp(
        &dir,
        "cubits.ron",
        &base.replacen("radius: mm(200)", "radius: cubit(1)", 1),
    );
    bin()
        .args(["solve", path.to_str().unwrap()])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("cubit"))
        .stderr(predicate::str::contains("line"));
    let path = write_temp(
        &dir,
        "wide.ron",
        &base.replacen("diameter: mm(2.4)", "diameter: mm(9)", 1),
    );
    bin()
        .args(["solve", path.to_str().unwrap()])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("rotor.arms[0].nozzle.diameter"));
    bin()
        .args(["solve", "no-such-file.ron"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("no-such-file.ron"));
}

#[test]
fn new_writes_a_loadable_starter_and_refuses_to_overwrite() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("mine.ron");
    bin()
        .args(["new", path.to_str().unwrap(), "--units", "us"])
        .assert()
        .success();
    bin()
        .args(["solve", path.to_str().unwrap()])
        .assert()
        .success();
    let before = std::fs::read_to_string(&path).unwrap();
    bin()
        .args(["new", path.to_str().unwrap()])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("already exists"));
    assert_eq!(std::fs::read_to_string(&path).unwrap(), before);
}

#[test]
fn no_command_without_a_terminal_prints_the_example_report() {
    bin()
        .assert()
        .success()
        .stdout(predicate::str::contains("rpm"));
}

#[test]
fn throw_reports_keys_profile_and_calibration() {
    let file = scenario("lawn-rotor.ron");
    let v = json(&["throw", file.to_str().unwrap(), "--format", "json"]);
    // interface.md, "Other commands' JSON", throw.
    for k in [
        "wetted_radius_m",
        "throw_at_rest_m",
        "nozzles",
        "profile",
        "peak_depth_per_turn_mm",
        "calibration_scale",
    ] {
        assert!(v.get(k).is_some(), "throw.{k}");
    }
    let n = &v["nozzles"][0];
    for k in ["largest", "median", "small"] {
        assert!(n["throw_m"][k].as_f64().unwrap() > 0.0, "throw_m.{k}");
    }
    assert!(n["d50_m"].as_f64().unwrap() < n["largest_drop_m"].as_f64().unwrap());
    assert_eq!(v["calibration_scale"], 1.0);
    let wetted = v["wetted_radius_m"].as_f64().unwrap();
    // Rotation costs throw (model.md M7).
    assert!(wetted < v["throw_at_rest_m"].as_f64().unwrap());
    // Calibrate to a tape-measure reading 10 % shorter: the model then matches it.
    let measured = format!("{:.3}m", 0.9 * wetted);
    let c = json(&[
        "throw",
        file.to_str().unwrap(),
        "--format",
        "json",
        "--measured",
        &measured,
    ]);
    assert!((c["wetted_radius_m"].as_f64().unwrap() / (0.9 * wetted) - 1.0).abs() < 2e-3);
    assert!(c["calibration_scale"].as_f64().unwrap() < 1.0);
    bin()
        .args(["throw", file.to_str().unwrap(), "--measured", "7.5 parsecs"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("--measured"));
}

#[test]
fn layout_reports_uniformity_and_the_grid() {
    let file = scenario("lawn-rotor.ron");
    let v = json(&["layout", file.to_str().unwrap(), "--format", "json"]);
    for k in [
        "pattern",
        "spacing_m",
        "rows_m",
        "mean_rate_mm_h",
        "expected_rate_mm_h",
        "cu_percent",
        "du_lq_percent",
        "du_lh_percent",
        "scheduling_multiplier",
        "spacing_percent_of_diameter",
        "grid",
    ] {
        assert!(v.get(k).is_some(), "layout.{k}");
    }
    assert_eq!(v["pattern"], "square");
    // The layout mean equals Q/(S·L) within 1 % (model.md M9).
    let (mean, expected) = (
        v["mean_rate_mm_h"].as_f64().unwrap(),
        v["expected_rate_mm_h"].as_f64().unwrap(),
    );
    assert!((mean / expected - 1.0).abs() < 0.01, "{mean} vs {expected}");
    assert!(v["grid"]["rate_mm_h"].as_array().unwrap().len() > 10);
    // Text: a depth map with a legend in mm/h; an intake rate below the mean warns.
    bin()
        .args(["layout", file.to_str().unwrap(), "--intake", "5mm/h"])
        .assert()
        .success()
        .stdout(predicate::str::contains("mm/h"))
        .stdout(predicate::str::contains("█"))
        .stdout(predicate::str::contains("soak"));
    // Overrides and the measured catch cans.
    let cans = scenario("catch-cans-example.csv");
    bin()
        .args([
            "layout",
            file.to_str().unwrap(),
            "--pattern",
            "triangle",
            "--spacing",
            "30ft",
            "--catch-cans",
            cans.to_str().unwrap(),
        ])
        .assert()
        .success()
        .stdout(predicate::str::contains("triangle"))
        .stdout(predicate::str::contains("Measured catch cans"));
    bin()
        .args(["layout", file.to_str().unwrap(), "--spacing", "-3m"])
        .assert()
        .code(2);
}

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
            "deflection=0:120:5",
            "--vary",
            "pressure=150kPa:400kPa:3",
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
    assert_eq!(
        lines[0],
        "deflection_rad,pressure_pa,status,rpm,start_margin,total_flow_m3_s,wetted_radius_m"
    );
    assert_eq!(lines.len(), 1 + 15);
    // Forward-facing nozzles (120°) do not drive: a row that says so, not an abort.
    assert!(text.contains("stalls_at_rest"));
    bin()
        .args(["sweep", file.to_str().unwrap(), "--vary", "colour=1:2:3"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("unknown parameter"));
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
        .any(|i| i["path"] == "supply.inlet_pa"));
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
fn a_crash_writes_a_report_and_says_where() {
    let dir = tempfile::tempdir().unwrap();
    let out = bin()
        .env("SPINWRIGHT_DELIBERATE_PANIC", "1")
        .env("TMPDIR", dir.path())
        .args(["solve", scenario("lawn-rotor.ron").to_str().unwrap()])
        .output()
        .unwrap();
    assert!(!out.status.success());
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains("crash report was written to"), "{stderr}");
    let reports: Vec<_> = std::fs::read_dir(dir.path())
        .unwrap()
        .filter_map(Result::ok)
        .collect();
    assert_eq!(reports.len(), 1);
    let text = std::fs::read_to_string(reports[0].path()).unwrap();
    assert!(text.contains("deliberate panic"));
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

#[test]
fn solve_warns_of_a_jet_above_the_stated_clearance() {
    let file = scenario("field-arm.ron");
    let run = |args: &[&str]| {
        let out = bin().arg("solve").arg(&file).args(args).output().unwrap();
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        String::from_utf8(out.stdout).unwrap()
    };
    let quiet = run(&["--format", "json"]);
    let v: serde_json::Value = serde_json::from_str(&quiet).unwrap();
    assert_eq!(v["warnings"], serde_json::json!([]), "{quiet}");
    // A clearance of 1.5 m: the field arm's nozzles alone stand at 1.2 m.
    let low = run(&["--clearance", "1.5m", "--format", "json"]);
    let v: serde_json::Value = serde_json::from_str(&low).unwrap();
    let w = v["warnings"].as_array().unwrap();
    assert_eq!(w.len(), 1, "{low}");
    assert!(
        w[0].as_str()
            .unwrap()
            .contains("above the stated clearance of 1.50 m"),
        "{low}"
    );
    let text = run(&["--clearance", "5ft", "--units", "us"]);
    assert!(
        text.contains("above the stated clearance of 5.00 ft"),
        "{text}"
    );
    // A clearance that is no height is refused.
    let out = bin()
        .arg("solve")
        .arg(&file)
        .args(["--clearance", "0m"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("--clearance"));
}

//! `solve`, `table` and `new`, and how scenario files are read.

use super::*;

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
    // docs/format.md, section 4, `solve`.
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
    assert!(
        lines[0].starts_with("rpm,drive_torque_N_m,") && lines[0].ends_with(",hub_pressure_kPa"),
        "{}",
        lines[0]
    );
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
fn the_default_table_is_dense_from_rest_to_the_operating_point() {
    // Issue 12: at least half the rows between rest and 1.5 × the operating
    // speed; the operating point itself is a row (net torque ≈ 0 there);
    // --points still sets the total (common practice for a table meant to be read).
    let file = scenario("lawn-rotor.ron");
    let solved = bin()
        .args(["solve", file.to_str().unwrap(), "--format", "json"])
        .output()
        .unwrap();
    let s: serde_json::Value = serde_json::from_slice(&solved.stdout).unwrap();
    let op_rpm = s["operating_point"]["rpm"].as_f64().expect("operating rpm");
    for points in [None, Some("15")] {
        let mut args = vec!["table", file.to_str().unwrap(), "--format", "json"];
        if let Some(p) = points {
            args.extend(["--points", p]);
        }
        let out = bin().args(&args).output().unwrap();
        assert!(out.status.success());
        let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        let rpms: Vec<f64> = v
            .as_array()
            .unwrap()
            .iter()
            .map(|r| r["rpm"].as_f64().unwrap())
            .collect();
        assert_eq!(rpms.len(), points.map_or(41, |p| p.parse().unwrap()));
        let near = rpms
            .iter()
            .filter(|&&w| w <= 1.5 * op_rpm * (1.0 + 1e-9))
            .count();
        assert!(
            2 * near >= rpms.len(),
            "{near} of {} rows: {rpms:?}",
            rpms.len()
        );
        assert!(
            rpms.iter().any(|&w| (w / op_rpm - 1.0).abs() < 1e-6),
            "{op_rpm} rpm not a row: {rpms:?}"
        );
    }
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
fn a_flow_the_nozzles_cannot_pass_is_refused_in_plain_words() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(scenario("garden-spinner.ron")).unwrap();
    let start = text.find("supply:").unwrap();
    let end = start + text[start..].find('\n').unwrap();
    let odd = format!(
        "{}supply: Flow(L_min(150)),{}",
        &text[..start],
        &text[end..]
    );
    let path = write_temp(&dir, "too-much.ron", &odd);
    bin()
        .args(["throw", path.to_str().unwrap()])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("supply.Flow"))
        .stderr(predicate::str::contains(
            "cannot pass through these nozzles",
        ))
        .stderr(predicate::str::contains("2000 kPa"));
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

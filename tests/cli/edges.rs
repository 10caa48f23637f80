//! The edges: closed pipes, quantity forms, ignored arguments, odd files, units in CSV and text, crash reports.

use super::*;

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
fn a_closed_pipe_ends_the_report_quietly() {
    use std::io::{BufRead, BufReader};
    use std::process::{Command as Std, Stdio};
    // Far more rows than a pipe buffers: the writer meets the closed pipe.
    let mut child = Std::new(assert_cmd::cargo::cargo_bin("spinwright"))
        .args([
            "table",
            scenario("lawn-rotor.ron").to_str().unwrap(),
            "--points",
            "20000",
            "--format",
            "csv",
        ])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let mut first = String::new();
    BufReader::new(child.stdout.take().unwrap())
        .read_line(&mut first)
        .unwrap();
    // The reader (like `head -1`) has closed its end here.
    let out = child.wait_with_output().unwrap();
    assert!(first.starts_with("rpm,"), "{first}");
    assert_eq!(out.status.code(), Some(0));
    assert_eq!(String::from_utf8_lossy(&out.stderr), "");
}

#[test]
fn quantities_take_the_forms_the_interface_takes() {
    let file = scenario("lawn-rotor.ron");
    let f = file.to_str().unwrap();
    let measured = |args: &[&str]| {
        let mut all = vec!["check", f, "--format", "json"];
        all.extend_from_slice(args);
        json(&all)["measured_rpm"].as_f64().unwrap()
    };
    // rpm bare (the argument names its unit) or with a unit; a turn's time likewise.
    let bare = measured(&["--pressure", "45psi", "--rpm", "30"]);
    assert_eq!(bare, 30.0);
    assert!((measured(&["--pressure", "45psi", "--rpm", "30rpm"]) - 30.0).abs() < 1e-9);
    assert!((measured(&["--pressure", "2.8bar", "--rpm", "3.14159265rad/s"]) - 30.0).abs() < 1e-6);
    assert!((measured(&["--pressure", "2.8bar", "--seconds-per-turn", "2"]) - 30.0).abs() < 1e-9);
    assert!((measured(&["--pressure", "2.8bar", "--seconds-per-turn", "2s"]) - 30.0).abs() < 1e-9);
    assert!(
        (measured(&["--pressure", "280 kPa", "--turns", "10", "--over", "0.5min"]) - 20.0).abs()
            < 1e-9
    );
    let t = json(&[
        "target",
        f,
        "--rpm",
        "25rpm",
        "--adjust",
        "deflection",
        "--format",
        "json",
    ]);
    assert!(
        (t["achieved_rpm"].as_f64().unwrap() - 25.0).abs() < 0.1,
        "{t}"
    );
    // A pressure without its unit is refused with the units it takes.
    let (code, _, err) = run(&["check", f, "--pressure", "2.8", "--rpm", "30"]);
    assert_eq!(code, 2);
    assert!(err.contains("--pressure") && err.contains("psi"), "{err}");
}

#[test]
fn a_negative_quantity_gets_the_tools_own_message() {
    let file = scenario("lawn-rotor.ron");
    let f = file.to_str().unwrap();
    for (args, argument) in [
        (
            vec!["check", f, "--pressure", "-2bar", "--rpm", "30"],
            "--pressure -2bar",
        ),
        (
            vec!["check", f, "--pressure", "2bar", "--rpm", "-30"],
            "--rpm -30",
        ),
        (
            vec![
                "check",
                f,
                "--pressure",
                "2bar",
                "--turns",
                "-3",
                "--over",
                "9s",
            ],
            "--turns -3",
        ),
        (
            vec![
                "check",
                f,
                "--pressure",
                "2bar",
                "--rpm",
                "30",
                "--flow",
                "-1L/min",
            ],
            "--flow -1L/min",
        ),
        (vec!["throw", f, "--measured", "-7m"], "--measured -7m"),
        (vec!["layout", f, "--spacing", "-9m"], "--spacing -9m"),
        (
            vec!["target", f, "--rpm", "-30", "--adjust", "deflection"],
            "--rpm -30",
        ),
    ] {
        let (code, _, err) = run(&args);
        assert_eq!(code, 2, "{args:?}");
        assert!(err.contains(argument), "{args:?}: {err}");
        assert!(err.contains("more than zero"), "{args:?}: {err}");
        assert!(!err.contains("-- -"), "the parser's hint leaked: {err}");
    }
}

#[test]
fn no_argument_is_silently_ignored() {
    let file = scenario("lawn-rotor.ron");
    let f = file.to_str().unwrap();
    let refused = |args: &[&str], words: &[&str]| {
        let (code, out, err) = run(args);
        assert_eq!(code, 2, "{args:?}: {out}");
        for w in words {
            assert!(err.contains(w), "{args:?}: `{w}` not in {err}");
        }
    };
    // A second --over without --caught; an --over with nothing to time.
    refused(
        &[
            "check",
            f,
            "--pressure",
            "2.5bar",
            "--turns",
            "5",
            "--over",
            "20s",
            "--over",
            "14s",
        ],
        &["--over 14s", "--caught"],
    );
    refused(
        &[
            "check",
            f,
            "--pressure",
            "2.5bar",
            "--rpm",
            "30",
            "--over",
            "20s",
        ],
        &["--over 20s"],
    );
    // A stopwatch for a reading that was not timed.
    refused(
        &[
            "check",
            f,
            "--pressure",
            "2.5bar",
            "--rpm",
            "30",
            "--stopwatch",
            "0.1s",
        ],
        &["--stopwatch"],
    );
    // --no-header outside CSV.
    refused(
        &[
            "check",
            f,
            "--pressure",
            "2.5bar",
            "--rpm",
            "30",
            "--no-header",
        ],
        &["--no-header", "csv"],
    );
    // Layout options the CSV grid cannot show.
    refused(
        &["layout", f, "--format", "csv", "--intake", "10mm/h"],
        &["--intake", "CSV"],
    );
    // A file before the command.
    refused(&[f, "solve", f], &["before the command"]);
}

#[test]
fn empty_and_foreign_files_get_plain_messages() {
    let dir = tempfile::tempdir().unwrap();
    let cases = [
        ("empty.ron", "".to_string(), "the file is empty"),
        (
            "comments.ron",
            "// a note\n/* nothing else */\n".to_string(),
            "only comments",
        ),
        (
            "cans.ron",
            std::fs::read_to_string(scenario("catch-cans-example.csv")).unwrap(),
            "not a scenario file",
        ),
    ];
    for (name, text, says) in cases {
        let path = write_temp(&dir, name, &text);
        let (code, _, err) = run(&["solve", path.to_str().unwrap()]);
        assert_eq!(code, 2);
        assert!(err.contains(name) && err.contains(says), "{err}");
        assert!(err.contains("Scenario("), "{err}");
        assert!(
            !err.contains("enable") && !err.contains("expected `(`"),
            "{err}"
        );
    }
    let path = dir.path().join("binary.ron");
    std::fs::write(&path, [0xff_u8, 0xfe, 0x00, 0x81]).unwrap();
    let (code, _, err) = run(&["solve", path.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(err.contains("not text"), "{err}");
}

#[test]
fn a_value_out_of_range_names_file_line_and_field() {
    let dir = tempfile::tempdir().unwrap();
    let base = std::fs::read_to_string(scenario("lawn-rotor.ron")).unwrap();
    let text = base.replacen("diameter: mm(2.4)", "diameter: mm(9)", 1);
    let line = text.lines().position(|l| l.contains("mm(9)")).unwrap() + 1;
    let path = write_temp(&dir, "wide.ron", &text);
    let (code, _, err) = run(&["solve", path.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(
        err.contains(&format!(
            "wide.ron: line {line}: rotor.arms[0].nozzle.diameter = mm(9)"
        )),
        "{err}"
    );
}

#[test]
fn csv_and_text_honour_the_unit_system() {
    let lawn = scenario("lawn-rotor.ron");
    let f = lawn.to_str().unwrap();
    // check: 300 kPa is 43.51 psi (NIST SP 811 psi factor 6.894757 kPa).
    let (code, out, err) = run(&[
        "check",
        f,
        "--pressure",
        "300kPa",
        "--rpm",
        "28",
        "--flow",
        "3gpm",
        "--format",
        "csv",
        "--units",
        "us",
    ]);
    assert_eq!(code, 0, "{err}");
    let mut rows = csv::Reader::from_reader(out.as_bytes());
    let header: Vec<String> = rows.headers().unwrap().iter().map(String::from).collect();
    for k in [
        "inlet_pressure_psi",
        "implied_running_torque_lbf_in",
        "measured_flow_gpm",
    ] {
        assert!(header.contains(&k.to_string()), "{k} not in {header:?}");
    }
    let record = rows.records().next().unwrap().unwrap();
    let col = |k: &str| {
        let i = header.iter().position(|h| h == k).unwrap();
        record[i].parse::<f64>().unwrap()
    };
    assert!((col("inlet_pressure_psi") - 43.511).abs() < 1e-3);
    assert!((col("measured_flow_gpm") - 3.0).abs() < 1e-9);
    let (_, metric, _) = run(&[
        "check",
        f,
        "--pressure",
        "300kPa",
        "--rpm",
        "28",
        "--format",
        "csv",
    ]);
    assert!(
        metric.starts_with("scenario,inlet_pressure_kPa,"),
        "{metric}"
    );

    // sweep in US units: psi and gpm, the unit in the column name.
    let (code, out, err) = run(&[
        "sweep",
        f,
        "--vary",
        "pressure=40psi..50psi",
        "--points",
        "2",
        "--format",
        "csv",
        "--units",
        "us",
    ]);
    assert_eq!(code, 0, "{err}");
    let lines: Vec<&str> = out.lines().collect();
    assert_eq!(
        lines[0],
        "pressure_psi,status,rpm,start_margin,total_flow_gpm,wetted_radius_ft"
    );
    assert!(lines[1].starts_with("40"), "{}", lines[1]);

    // compare: inputs and results in psi, gpm and ft; JSON stays SI.
    let patio = scenario("patio-rotor-us.ron");
    let p = patio.to_str().unwrap();
    let (code, text, err) = run(&["compare", f, p, "--units", "us"]);
    assert_eq!(code, 0, "{err}");
    assert!(text.contains("total_flow gpm"), "{text}");
    assert!(text.contains("wetted_radius ft"), "{text}");
    assert!(!text.contains("m3/s") && !text.contains(" Pa"), "{text}");
    let (code, out, err) = run(&["compare", f, p, "--units", "us", "--format", "csv"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("result,total_flow,gpm,"), "{out}");
    assert!(!out.contains(",Pa,") && !out.contains(",rad,"), "{out}");
    let v = json(&["compare", f, p, "--units", "us", "--format", "json"]);
    assert!(v["results"]
        .as_array()
        .unwrap()
        .iter()
        .any(|r| r["key"] == "total_flow_m3_s"));

    // target CSV (it used to print text): degrees in the column name.
    let (code, out, err) = run(&[
        "target",
        f,
        "--rpm",
        "25",
        "--adjust",
        "deflection",
        "--format",
        "csv",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.starts_with(
            "parameter,value_deg,start_value_deg,achieved_rpm,reachable,written_to\ndeflection,"
        ),
        "{out}"
    );
}

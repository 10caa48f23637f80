//! `throw` and `layout`: the throw, the pattern, spacing and catch cans.

use super::*;

#[test]
fn recommended_spacing_meets_the_goal_and_ten_percent_more_does_not() {
    // Issue 12: for each pattern the recommended spacing meets the CU goal
    // and 10 % more (rows scaled with it) does not; checked through the
    // plain `layout` report, in the scenario's own wind (garden spinner:
    // 2 m/s) and in calm air (lawn rotor).
    for (name, goal) in [("lawn-rotor.ron", 85.0), ("garden-spinner.ron", 80.0)] {
        let file = scenario(name);
        let goal_arg = format!("{goal}");
        let out = bin()
            .args([
                "layout",
                file.to_str().unwrap(),
                "--recommend",
                "--cu",
                &goal_arg,
                "--format",
                "json",
            ])
            .output()
            .unwrap();
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        assert_eq!(v["recommend_goal"]["metric"], "cu");
        let recs = v["recommended"].as_array().unwrap();
        let windy = v["cu_percent"].is_number() && name == "garden-spinner.ron";
        assert_eq!(recs.len(), if windy { 6 } else { 3 });
        for r in recs {
            // The plain report computes in the scenario's wind: compare like with like.
            if windy && r["wind_m_s"].as_f64().unwrap() == 0.0 {
                continue;
            }
            let pattern = r["pattern"].as_str().unwrap();
            let s = r["spacing_m"].as_f64().unwrap();
            let l = r["rows_m"].as_f64().unwrap();
            assert!(r["cu_percent"].as_f64().unwrap() >= goal, "{name} {r}");
            let at = layout_cu(&file, pattern, s, l);
            assert!(at >= goal - 1e-6, "{name} {pattern} at {s} m: CU {at}");
            let wider = layout_cu(&file, pattern, 1.1 * s, 1.1 * l);
            assert!(wider < goal, "{name} {pattern} at 1.1 × {s} m: CU {wider}");
        }
    }
    // Both goals at once, or a goal past 100 %, are refused.
    let file = scenario("lawn-rotor.ron");
    let f = file.to_str().unwrap();
    bin()
        .args(["layout", f, "--recommend", "--cu", "85", "--du", "75"])
        .assert()
        .code(2);
    bin()
        .args(["layout", f, "--recommend", "--cu", "120"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("--cu 120"));
}

#[test]
fn throw_reports_keys_profile_and_calibration() {
    let file = scenario("lawn-rotor.ron");
    let v = json(&["throw", file.to_str().unwrap(), "--format", "json"]);
    // docs/format.md, section 4, `throw`.
    for k in [
        "wetted_radius_m",
        "throw_at_rest_m",
        "nozzles",
        "profile",
        "peak_depth_per_turn_mm",
        "breakup_coefficient",
        "farthest_drop_m",
        "wetting_threshold_mm_h",
        "peak_height_m",
    ] {
        assert!(v.get(k).is_some(), "throw.{k}");
    }
    // No wind in this scenario: no wind radii.
    assert!(v.get("wetted_radius_downwind_m").is_none());
    assert!(v["wetted_radius_m"].as_f64().unwrap() <= v["farthest_drop_m"].as_f64().unwrap());
    let n = &v["nozzles"][0];
    for k in ["largest", "median", "small"] {
        assert!(n["throw_m"][k].as_f64().unwrap() > 0.0, "throw_m.{k}");
    }
    assert!(n["d50_m"].as_f64().unwrap() < n["largest_drop_m"].as_f64().unwrap());
    // Valencia, Zheng & Marshall (2022): the published default.
    assert_eq!(v["breakup_coefficient"], 11.0);
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
    let cal = &c["calibration"];
    assert!(cal["breakup_coefficient"].as_f64().unwrap() < 11.0);
    assert_eq!(cal["uncalibrated_breakup_coefficient"], 11.0);
    // A reading no plausible jet explains is refused, naming the range.
    bin()
        .args(["throw", file.to_str().unwrap(), "--measured", "25m"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("plausible jet"))
        .stderr(predicate::str::contains(
            "breakup coefficients from 2 to 22",
        ));
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
        "driest_quarter_runtime_factor",
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
    // Text: a rate map with a legend in mm/h; an intake rate below the mean warns.
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
fn layout_map_has_a_rate_legend_and_plain_words_for_the_run_time() {
    for (units, unit) in [("metric", "mm/h"), ("us", "in/h")] {
        let text = layout_stdout(&["--units", units]);
        // The legend is in the rate unit, not in bands of the mean.
        assert!(text.contains(&format!("rate, {unit}:")), "{text}");
        assert!(!text.contains("of the mean"), "{text}");
        assert!(!text.contains("90–110"), "{text}");
        assert!(!text.to_lowercase().contains("scheduling"), "{text}");
        assert!(
            text.contains("run time to give the driest quarter the mean depth: ×1."),
            "{text}"
        );
        assert!(text.contains("driest quarter (≤"), "{text}");
        assert!(text.contains("()"), "the heads are drawn: {text}");
        // Piped, the report has no colour codes.
        assert!(!text.contains('\x1b'), "{text}");
    }
    // The factor is 1/DU_lq (the key renamed from the old multiplier name).
    let file = scenario("lawn-rotor.ron");
    let v = json(&["layout", file.to_str().unwrap(), "--format", "json"]);
    let du = v["du_lq_percent"].as_f64().unwrap();
    let f = v["driest_quarter_runtime_factor"].as_f64().unwrap();
    assert!((f - 100.0 / du).abs() < 1e-9, "{f} vs 100/{du}");
    assert!(v.get("scheduling_multiplier").is_none());
    assert!(v["target"].is_null());
}

#[test]
fn layout_target_depth_gives_minutes_per_cycle() {
    let file = scenario("lawn-rotor.ron");
    let v = json(&[
        "layout",
        file.to_str().unwrap(),
        "--format",
        "json",
        "--target-depth",
        "10mm",
    ]);
    // Run time t = depth · (1/DU_lq) / mean rate (the definition of the factor).
    let mean = v["mean_rate_mm_h"].as_f64().unwrap();
    let f = v["driest_quarter_runtime_factor"].as_f64().unwrap();
    let t = &v["target"];
    assert_eq!(t["depth_mm"].as_f64().unwrap(), 10.0);
    let expected_s = 3600.0 * 10.0 * f / mean;
    assert!((t["run_time_s"].as_f64().unwrap() - expected_s).abs() < 1e-6);
    assert_eq!(t["cycles"].as_u64(), Some(1));
    assert!(t["soak_s"].is_null());
    // With a slow soil the run splits into cycles no longer than the intake allows.
    let v = json(&[
        "layout",
        file.to_str().unwrap(),
        "--format",
        "json",
        "--target-depth",
        "10mm",
        "--intake",
        "5mm/h",
    ]);
    let t = &v["target"];
    let cycles = t["cycles"].as_u64().unwrap();
    assert!(cycles > 1, "{t}");
    let per = t["cycle_run_time_s"].as_f64().unwrap();
    assert!((per * cycles as f64 - t["run_time_s"].as_f64().unwrap()).abs() < 1e-6);
    assert!(t["soak_s"].as_f64().unwrap() > 0.0);
    let text = layout_stdout(&[
        "--target-depth",
        "0.4in",
        "--units",
        "us",
        "--intake",
        "5mm/h",
    ]);
    assert!(
        text.contains("to give the driest quarter 0.400 in:"),
        "{text}"
    );
    assert!(text.contains("cycles of"), "{text}");
    // A depth that is not a depth, or not above zero, is refused by name.
    for bad in ["-3mm", "0mm", "10kPa", "deep"] {
        bin()
            .args(["layout", file.to_str().unwrap()])
            .arg(format!("--target-depth={bad}"))
            .assert()
            .code(2)
            .stderr(predicate::str::contains("--target-depth"));
    }
}

#[test]
fn layout_triangle_map_says_where_the_heads_stand() {
    let text = layout_stdout(&["--pattern", "triangle", "--spacing", "9m"]);
    assert!(!text.contains("heads at the corners"), "{text}");
    assert!(
        text.contains("heads at the two lower corners and the middle of the upper edge"),
        "{text}"
    );
    // The top line of the map has its head in the middle; the bottom line at both ends.
    let map: Vec<&str> = text
        .lines()
        .skip_while(|l| !l.starts_with("Application rate over"))
        .skip(1)
        .take_while(|l| !l.trim_start().starts_with("rate,"))
        .map(str::trim)
        .collect();
    let (top, bottom) = (map[0], map[map.len() - 1]);
    assert!(
        bottom.starts_with("()") && bottom.ends_with("()"),
        "{bottom}"
    );
    assert!(!top.starts_with("()") && !top.ends_with("()"), "{top}");
    let mid = top.chars().count() / 2;
    let head_at: Vec<char> = top.chars().skip(mid - 1).take(2).collect();
    assert_eq!(head_at, ['(', ')'], "{top}");
}

#[test]
fn layout_csv_has_no_float_noise() {
    // 12 m spacing, 40 cells: dx = 0.3 m, where plain printing shows
    // 0.30000000000000004-like noise. Numbers are written to 12 significant
    // figures at most (docs/format.md), so 0.15, 0.45, … print as such.
    for units in ["metric", "us"] {
        let csv = layout_stdout(&["--spacing", "12m", "--format", "csv", "--units", units]);
        let mut lines = csv.lines();
        let header: Vec<&str> = lines.next().unwrap().split(',').collect();
        assert!(header[0].contains('\\'), "{}", header[0]);
        // Significant digits: leading zeros do not count.
        let digits = |f: &str| {
            f.chars()
                .filter(char::is_ascii_digit)
                .skip_while(|c| *c == '0')
                .count()
        };
        for h in header.iter().skip(1) {
            h.parse::<f64>().unwrap();
            assert!(digits(h) <= 12, "header {h}");
        }
        if units == "metric" {
            assert_eq!(header[1], "0.15");
            assert_eq!(header[2], "0.45");
        }
        for line in lines {
            for f in line.split(',') {
                assert!(f.parse::<f64>().unwrap() >= 0.0, "{f}");
                assert!(digits(f) <= 12, "{f}");
            }
        }
        assert!(
            !csv.contains("0000000") && !csv.contains("9999999"),
            "{csv}"
        );
    }
}

#[test]
fn throw_in_wind_gives_the_radius_upwind_downwind_and_across() {
    // field-arm.ron has 2 m/s of wind.
    let file = scenario("field-arm.ron");
    let v = json(&["throw", file.to_str().unwrap(), "--format", "json"]);
    let calm = v["wetted_radius_m"].as_f64().unwrap();
    let up = v["wetted_radius_upwind_m"].as_f64().unwrap();
    let down = v["wetted_radius_downwind_m"].as_f64().unwrap();
    let across = v["wetted_radius_crosswind_m"].as_f64().unwrap();
    assert!(down > calm && calm > up, "{up} {calm} {down}");
    assert!(across > 0.0);
    let text = bin()
        .args(["throw", file.to_str().unwrap(), "--units", "us"])
        .output()
        .unwrap();
    let text = String::from_utf8(text.stdout).unwrap();
    assert!(
        text.contains("upwind") && text.contains("downwind") && text.contains(" ft"),
        "{text}"
    );
    let csv = bin()
        .args(["throw", file.to_str().unwrap(), "--format", "csv"])
        .output()
        .unwrap();
    let csv = String::from_utf8(csv.stdout).unwrap();
    let header = csv.lines().next().unwrap();
    assert!(header.contains("wetted_radius_downwind_m"), "{header}");
}

#[test]
fn layouts_whose_heads_do_not_meet_are_results() {
    let file = scenario("lawn-rotor.ron");
    for spacing in ["30m", "500m"] {
        let v = json(&[
            "layout",
            file.to_str().unwrap(),
            "--spacing",
            spacing,
            "--format",
            "json",
        ]);
        assert_eq!(v["heads_meet"], false, "{spacing}");
        assert!(v["dry_percent"].as_f64().unwrap() > 0.0);
        assert!(
            v["cu_percent"].as_f64().unwrap() >= 0.0,
            "no negative CU at {spacing}"
        );
        let (mean, expected) = (
            v["mean_rate_mm_h"].as_f64().unwrap(),
            v["expected_rate_mm_h"].as_f64().unwrap(),
        );
        assert!(
            (mean / expected - 1.0).abs() < 0.03,
            "{spacing}: {mean} vs {expected}"
        );
        bin()
            .args(["layout", file.to_str().unwrap(), "--spacing", spacing])
            .assert()
            .success()
            .stdout(predicate::str::contains("heads do not meet"));
    }
    // Head to head: the heads meet.
    let v = json(&["layout", file.to_str().unwrap(), "--format", "json"]);
    assert_eq!(v["heads_meet"], true);
}

#[test]
fn layout_rates_a_grid_of_catch_cans() {
    let file = scenario("lawn-rotor.ron");
    let grid = scenario("catch-cans-grid-example.csv");
    let (code, out, err) = run(&[
        "layout",
        file.to_str().unwrap(),
        "--catch-cans",
        grid.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("16 cans, a grid between working heads"),
        "{out}"
    );
    assert!(out.contains("as caught: CU 91.1 %"), "{out}");
    assert!(out.contains("DU low half"), "{out}");
    // JSON: the grid's own figures, no overlap, a note on the mean rate.
    let v = json(&[
        "layout",
        file.to_str().unwrap(),
        "--catch-cans",
        grid.to_str().unwrap(),
        "--format",
        "json",
    ]);
    let m = &v["measured"];
    assert_eq!(m["shape"], "grid");
    assert_eq!(m["cans"], 16);
    assert!(m["overlap_cu_percent"].is_null());
    assert!(m["measured_throw_m"].is_null());
    // Christiansen's CU over the catches (mL are in proportion to rates):
    // mean 61.8125 mL, Σ|x − mean| = 87.75 → CU = 100 (1 − 87.75 / (16 · 61.8125))
    // = 91.127 % (Christiansen 1942, by hand).
    let cu = m["cu_percent"].as_f64().unwrap();
    assert!((cu - 91.127).abs() < 0.01, "{cu}");
    // US units: the mean rate in in/h.
    let (code, out, _) = run(&[
        "layout",
        file.to_str().unwrap(),
        "--catch-cans",
        grid.to_str().unwrap(),
        "--units",
        "us",
    ]);
    assert_eq!(code, 0);
    assert!(
        out.contains("in/h") && out.contains("rate as modelled"),
        "{out}"
    );
    // --fit needs a radial leg.
    let (code, _, err) = run(&[
        "layout",
        file.to_str().unwrap(),
        "--catch-cans",
        grid.to_str().unwrap(),
        "--fit",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("--fit") && err.contains("radial leg"), "{err}");
}

#[test]
fn layout_interprets_a_leg_with_a_shorter_throw() {
    let file = scenario("lawn-rotor.ron");
    let leg = scenario("catch-cans-example.csv");
    for units in ["metric", "us"] {
        let (code, out, err) = run(&[
            "layout",
            file.to_str().unwrap(),
            "--catch-cans",
            leg.to_str().unwrap(),
            "--units",
            units,
        ]);
        assert_eq!(code, 0, "{err}");
        assert!(out.contains("measured against modelled"), "{out}");
        // The example's last can at the wetting threshold (0.26 mm/h) is at
        // 8 m (8.5 m caught 1 mL: 0.25 mm/h); the model throws 12.2 m.
        let short = out
            .lines()
            .find(|l| l.contains("shorter throw"))
            .unwrap_or_else(|| panic!("{out}"));
        if units == "metric" {
            assert!(short.contains("8.00 m against 12.2 m"), "{short}");
        } else {
            assert!(
                short.contains("ft against") && !short.contains(" m "),
                "{short}"
            );
        }
        assert!(
            short.contains("pressure") && short.contains("nozzle"),
            "{short}"
        );
    }
    let v = json(&[
        "layout",
        file.to_str().unwrap(),
        "--catch-cans",
        leg.to_str().unwrap(),
        "--format",
        "json",
    ]);
    assert_eq!(v["measured"]["measured_throw_m"], 8.0);
    assert!(v["measured"]["notes"]
        .as_array()
        .unwrap()
        .iter()
        .any(|n| n == "shorter_throw"));
    assert!(v["measured"]["fit"].is_null());
}

#[test]
fn layout_fit_recovers_the_breakup_of_a_model_made_leg() {
    let file = scenario("lawn-rotor.ron");
    let leg = fixture("catch-cans-leg-cb7.csv");
    let v = json(&[
        "layout",
        file.to_str().unwrap(),
        "--catch-cans",
        leg.to_str().unwrap(),
        "--fit",
        "--format",
        "json",
    ]);
    let f = &v["measured"]["fit"];
    assert_eq!(f["breakup_before"], 11.0);
    let c = f["breakup"].as_f64().unwrap();
    // The leg was made with C_b = 7 (the fixture's header): found within 3 %.
    assert!((c / 7.0 - 1.0).abs() < 0.03, "{c}");
    let before = f["rms_misfit_before_mm_h"].as_f64().unwrap();
    let after = f["rms_misfit_mm_h"].as_f64().unwrap();
    assert!(after < 0.1 * before, "{before} → {after}");
    assert_eq!(f["at_limit"], false);
    // The layout from the fitted model is reported beside the design's.
    assert!(f["cu_percent"].as_f64().unwrap() > 0.0);
    // On the shipped example leg the fit still reduces the misfit.
    let v = json(&[
        "layout",
        file.to_str().unwrap(),
        "--catch-cans",
        scenario("catch-cans-example.csv").to_str().unwrap(),
        "--fit",
        "--format",
        "json",
    ]);
    let f = &v["measured"]["fit"];
    let breakup_only = f["rms_misfit_mm_h"].as_f64().unwrap();
    assert!(breakup_only < f["rms_misfit_before_mm_h"].as_f64().unwrap());
    assert!(f["d50_m"].is_null());
    // With d50 free as well the misfit falls further, and d50 is reported.
    let v = json(&[
        "layout",
        file.to_str().unwrap(),
        "--catch-cans",
        scenario("catch-cans-example.csv").to_str().unwrap(),
        "--fit",
        "--fit-d50",
        "--format",
        "json",
    ]);
    let f = &v["measured"]["fit"];
    assert!(f["rms_misfit_mm_h"].as_f64().unwrap() < breakup_only, "{f}");
    assert!(f["d50_m"].as_f64().unwrap() > 0.0 && f["d50_before_m"].as_f64().unwrap() > 0.0);
    // Text, in US units: fitted values and misfit before and after.
    let (code, out, err) = run(&[
        "layout",
        file.to_str().unwrap(),
        "--catch-cans",
        leg.to_str().unwrap(),
        "--fit",
        "--units",
        "us",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("breakup coefficient 11.00 → 7.0"), "{out}");
    assert!(
        out.contains("misfit (rms over the cans)") && out.contains("in/h →"),
        "{out}"
    );
    assert!(out.contains("layout from the fitted model"), "{out}");
    // --fit without catch cans is refused by the argument parser.
    let (code, _, _) = run(&["layout", file.to_str().unwrap(), "--fit"]);
    assert_eq!(code, 2);
}

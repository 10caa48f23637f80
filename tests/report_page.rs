//! `spinwright report`: the page parses, holds the four charts, and its
//! numbers agree with `solve --format json` (the same model run another way).

use std::path::{Path, PathBuf};

use assert_cmd::Command;
use spinwright::report::page::CHART_IDS;

use crate::support::{root, shipped_scenarios};

fn bin() -> Command {
    Command::cargo_bin("spinwright").expect("the binary is built")
}

fn solve_json(file: &Path) -> serde_json::Value {
    let out = bin()
        .args(["solve", "--format", "json"])
        .arg(file)
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).unwrap()
}

/// Write the page of `file` in `units` and return its text.
fn page(file: &Path, units: &str, dir: &tempfile::TempDir) -> String {
    let out = dir.path().join("design.html");
    bin()
        .arg("report")
        .arg(file)
        .arg("--out")
        .arg(&out)
        .args(["--units", units])
        .assert()
        .success();
    std::fs::read_to_string(&out).unwrap()
}

/// The page parsed as XML (its `<!DOCTYPE html>` allowed).
fn parse(html: &str) -> Result<roxmltree::Document<'_>, roxmltree::Error> {
    let opts = roxmltree::ParsingOptions {
        allow_dtd: true,
        ..Default::default()
    };
    roxmltree::Document::parse_with_options(html, opts)
}

fn text_of(doc: &roxmltree::Document, id: &str) -> String {
    let node = doc
        .descendants()
        .find(|n| n.attribute("id") == Some(id))
        .unwrap_or_else(|| panic!("no element with id {id}"));
    node.descendants()
        .filter(|n| n.is_text())
        .filter_map(|n| n.text())
        .collect()
}

/// The number and unit of a shown quantity (`17.6 m`, `1,234 ft`).
fn number_and_unit(text: &str) -> (f64, String) {
    let (n, u) = text.trim().split_once(' ').expect("number and unit");
    (n.replace(',', "").parse().expect("a number"), u.to_string())
}

#[test]
fn every_shipped_scenario_gives_a_well_formed_page_with_four_charts() {
    let dir = tempfile::tempdir().unwrap();
    for file in shipped_scenarios() {
        for units in ["metric", "us"] {
            let html = page(&file, units, &dir);
            assert!(
                !html.contains("NaN") && !html.contains(" inf") && !html.contains(">inf"),
                "{file:?}"
            );
            // The page is written to parse as XML too (docs/format.md).
            let doc = parse(&html).unwrap_or_else(|e| panic!("{file:?} {units}: {e}"));
            let svgs: Vec<_> = doc
                .descendants()
                .filter(|n| n.tag_name().name() == "svg")
                .collect();
            let ids: Vec<&str> = svgs.iter().filter_map(|n| n.attribute("id")).collect();
            assert_eq!(ids, CHART_IDS, "{file:?} {units}");
            assert_eq!(svgs.len(), 4, "{file:?}: exactly four charts");
            for svg in &svgs {
                assert!(
                    svg.descendants().any(|n| matches!(
                        n.tag_name().name(),
                        "polyline" | "path" | "rect" | "text"
                    )),
                    "{file:?}: chart {:?} draws nothing",
                    svg.attribute("id")
                );
            }
            let sections: Vec<&str> = doc
                .descendants()
                .filter(|n| n.tag_name().name() == "section")
                .filter_map(|n| n.attribute("id"))
                .collect();
            for s in ["job", "operating", "warnings", "charts", "inputs", "safety"] {
                assert!(sections.contains(&s), "{file:?}: no section {s}");
            }
            let safety = text_of(&doc, "safety");
            for words in [
                "eye",
                "Depressurise",
                "backflow",
                "power isolated",
                "overhead",
                "Local codes",
            ] {
                assert!(safety.contains(words), "{file:?}: safety lacks {words}");
            }
        }
    }
}

#[test]
fn speed_and_wetted_radius_agree_with_solve_json_in_both_unit_systems() {
    let dir = tempfile::tempdir().unwrap();
    for name in ["lawn-rotor.ron", "field-arm.ron", "patio-rotor-us.ron"] {
        let file = root().join("scenarios").join(name);
        let json = solve_json(&file);
        let rpm = json["operating_point"]["rpm"].as_f64().expect("it runs");
        let wetted_m = json["wetted_radius_m"].as_f64().expect("it throws");
        for (units, unit, per_m) in [("metric", "m", 1.0), ("us", "ft", 1.0 / 0.3048)] {
            let html = page(&file, units, &dir);
            let doc = parse(&html).unwrap();
            assert_eq!(text_of(&doc, "speed"), format!("{rpm:.1} rpm"), "{name}");
            let (r, u) = number_and_unit(&text_of(&doc, "wetted-radius"));
            assert_eq!(u, unit, "{name} {units}");
            // Shown to three significant figures or better.
            let want = wetted_m * per_m;
            assert!(
                (r - want).abs() <= 0.005 * want,
                "{name} {units}: page {r} against solve {want}"
            );
        }
    }
}

#[test]
fn user_text_is_escaped_and_an_old_page_is_kept() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(root().join("scenarios/lawn-rotor.ron"))
        .unwrap()
        .replace(
            "name: \"Lawn rotor\"",
            "name: \"<b>Rotor</b> & 'co' \\\"x\\\"\"",
        )
        .replace(
            "notes: \"Three-arm",
            "notes: \"</p><script>alert(1)</script> Three-arm",
        );
    let file: PathBuf = dir.path().join("odd.ron");
    std::fs::write(&file, text).unwrap();
    let out = dir.path().join("odd.html");
    std::fs::write(&out, "an older page").unwrap();
    bin()
        .arg("report")
        .arg(&file)
        .arg("--out")
        .arg(&out)
        .assert()
        .success();
    assert_eq!(
        std::fs::read_to_string(dir.path().join("odd.html.bak")).unwrap(),
        "an older page"
    );
    let html = std::fs::read_to_string(&out).unwrap();
    assert!(
        !html.contains("<script>") && !html.contains("<b>"),
        "unescaped user text"
    );
    let doc = parse(&html).unwrap();
    let h1 = doc
        .descendants()
        .find(|n| n.tag_name().name() == "h1")
        .and_then(|n| n.text())
        .unwrap();
    assert_eq!(h1, "<b>Rotor</b> & 'co' \"x\"");
    assert!(text_of(&doc, "job").contains("</p><script>alert(1)</script> Three-arm"));
}

#[test]
fn bad_input_names_the_file_and_writes_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("x.html");
    let missing = dir.path().join("missing.ron");
    let assert = bin()
        .arg("report")
        .arg(&missing)
        .arg("--out")
        .arg(&out)
        .assert()
        .code(2);
    let stderr = String::from_utf8_lossy(&assert.get_output().stderr).to_string();
    assert!(stderr.contains("missing.ron"), "{stderr}");
    assert!(!out.exists());
    // --out is required.
    bin()
        .arg("report")
        .arg(root().join("scenarios/lawn-rotor.ron"))
        .assert()
        .code(2);
}

#[test]
fn a_stalled_design_without_a_layout_still_gets_four_charts_and_its_warnings() {
    let dir = tempfile::tempdir().unwrap();
    // Stuck (as in the CLI's stalling test), no layout, a low stated clearance.
    let text = std::fs::read_to_string(root().join("scenarios/lawn-rotor.ron"))
        .unwrap()
        .replace("mu_static: 0.15", "mu_static: 40.0")
        .replace(
            "    layout: Square(spacing: m(8)),\n",
            "    clearance: m(0.5),\n",
        );
    let file = dir.path().join("stuck.ron");
    std::fs::write(&file, text).unwrap();
    let json = solve_json(&file);
    assert_eq!(json["status"], "stalls_at_rest");
    let html = page(&file, "metric", &dir);
    let doc = parse(&html).unwrap();
    let ids: Vec<&str> = doc
        .descendants()
        .filter(|n| n.tag_name().name() == "svg")
        .filter_map(|n| n.attribute("id"))
        .collect();
    assert_eq!(ids, CHART_IDS);
    assert!(doc
        .descendants()
        .all(|n| n.attribute("id") != Some("speed")));
    assert!(text_of(&doc, "operating").contains("stalls at rest"));
    assert!(text_of(&doc, "chart-layout").contains("no layout"));
    let warnings = text_of(&doc, "warnings");
    // The model's warning and the practice caution, as `solve` words them.
    for w in json["warnings"].as_array().unwrap() {
        assert!(
            warnings.contains(w.as_str().unwrap()),
            "{w} not in {warnings}"
        );
    }
    assert!(
        warnings.contains("above the stated clearance of 0.500 m"),
        "{warnings}"
    );
    // The wetted radius at rest agrees with solve's.
    let (r, _) = number_and_unit(&text_of(&doc, "wetted-radius"));
    let want = json["wetted_radius_m"].as_f64().unwrap();
    assert!((r - want).abs() <= 0.005 * want, "{r} against {want}");
}

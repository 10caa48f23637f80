//! The binary on shipped scenarios and malformed files, one file per
//! group of commands; the helpers every file uses are here.

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

/// CU of `layout FILE --spacing … [--pattern …] [--rows …]`, from its JSON.
fn layout_cu(file: &std::path::Path, pattern: &str, spacing_m: f64, rows_m: f64) -> f64 {
    let spacing = format!("{spacing_m:.6}m");
    let rows = format!("{rows_m:.6}m");
    let mut args = vec![
        "layout",
        file.to_str().unwrap(),
        "--format",
        "json",
        "--spacing",
        &spacing,
    ];
    if pattern == "rectangle" {
        args.extend(["--rows", &rows]);
    } else {
        args.extend(["--pattern", pattern]);
    }
    let out = bin().args(&args).output().unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    v["cu_percent"].as_f64().unwrap()
}

/// Run `layout` with `args` after the file and return its standard output.
fn layout_stdout(args: &[&str]) -> String {
    let file = scenario("lawn-rotor.ron");
    let out = bin().arg("layout").arg(&file).args(args).output().unwrap();
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout).unwrap()
}

/// Run the binary and return (exit code, stdout, stderr).
fn run(args: &[&str]) -> (i32, String, String) {
    let out = bin().args(args).output().unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8(out.stdout).unwrap(),
        String::from_utf8(out.stderr).unwrap(),
    )
}

fn fixture(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("tests/fixtures")
        .join(name)
}

mod edges;
mod inverse;
mod solve;
mod throw_layout;

//! A fuzzer on stable Rust, built on proptest's runner (cargo-fuzz would need
//! a nightly toolchain in CI).
//!
//! Three targets, each fed through the whole chain a user's file takes:
//! `scenario::load_str` → `to_design` → `balance::solve` → `coverage::head_throw`
//! → `coverage::layout_overlap` (when the design has a layout), plus the CLI's
//! report builders and a save/reload of the design:
//!
//! - `scenario_text`: mutations of the shipped scenarios (tokens deleted,
//!   duplicated, replaced; numbers replaced by huge, tiny, negative and
//!   NaN-like text; unit tags swapped; stray characters) and raw bytes;
//! - `catch_cans`: the same for the shipped catch-can CSV through
//!   `scenario::cans::parse_catch_cans` and `inverse::audit::audit`;
//! - `designs`: random designs inside the validation ranges (1–12 arms,
//!   0.5–10 mm nozzles, radii up to 2 m, 10 kPa–1 MPa, every supply mode,
//!   both bearings, brakes, wind) straight into the physics.
//!
//! Every run asserts: no panic, no NaN or infinity in any reported number
//! (the `Debug` text of every report and the RON text of the JSON report are
//! scanned), and every error is an `Err` with a message.
//!
//! `cargo test fuzz` runs a few deterministic cases per target. The long run
//! is time-driven, with fresh random seeds:
//!
//!     SPINWRIGHT_FUZZ_SECONDS=600 cargo test --release fuzz_long -- --ignored --nocapture
//!
//! Inputs that once failed are kept in `tests/fuzz-regressions/` and replayed
//! by `regressions_stay_fixed`.

use std::fmt::Debug;
use std::time::{Duration, Instant};

use proptest::prelude::*;
use proptest::test_runner::{Config, RngAlgorithm, TestError, TestRng, TestRunner};

use clap::Parser;
use spinwright::cli::{self, Cli};
use spinwright::inverse::audit::audit;
use spinwright::physics::balance::{solve, torque_table};
use spinwright::physics::coverage::{head_throw, layout_overlap};
use spinwright::physics::design::{
    Arm, Bearing, Brake, Design, Friction, Inertia, Layout, Line, Nozzle, Rotor, Seal, Site,
    SpraySpec, Supply, Swivel, Tube, Washer, WasherRule, Wind,
};
use spinwright::physics::layout::OverlapOptions;
use spinwright::physics::pattern::PatternOptions;
use spinwright::scenario::cans::parse_catch_cans;
use spinwright::scenario::{self, Scenario};
use spinwright::units::UnitSystem;

use crate::support::root;

mod checks;
mod designs;
mod mutate;

pub use checks::non_finite_word;
use checks::*;
use designs::*;
use mutate::*;

fn runner(cases: u32, random: bool) -> TestRunner {
    let config = Config {
        cases,
        failure_persistence: None,
        max_shrink_iters: 2000,
        ..Config::default()
    };
    if random {
        TestRunner::new(config)
    } else {
        TestRunner::new_with_rng(config, TestRng::deterministic_rng(RngAlgorithm::ChaCha))
    }
}

fn run_target<S>(
    name: &str,
    strategy: S,
    cases: u32,
    random: bool,
    check: impl Fn(&S::Value) -> Result<(), String>,
) -> u32
where
    S: Strategy,
    S::Value: Debug,
{
    let result = runner(cases, random).run(&strategy, |v| check(&v).map_err(TestCaseError::fail));
    match result {
        Ok(()) => cases,
        Err(TestError::Fail(why, input)) => {
            panic!("fuzz target {name} failed: {why}\nminimal input: {input:?}")
        }
        Err(e) => panic!("fuzz target {name}: {e}"),
    }
}

/// Runs a target with fresh seeds for `SPINWRIGHT_FUZZ_SECONDS` (default 60).
fn run_long<S>(name: &str, strategy: fn() -> S, check: fn(&S::Value) -> Result<(), String>)
where
    S: Strategy,
    S::Value: Debug,
{
    let seconds: u64 = std::env::var("SPINWRIGHT_FUZZ_SECONDS")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(60);
    // Each input is written here before it runs, so that one that aborts the
    // process (an allocation failure, a stack overflow) is not lost.
    let last = std::env::temp_dir().join(format!("spinwright-fuzz-last-{name}.txt"));
    let start = Instant::now();
    let mut cases = 0u64;
    while start.elapsed() < Duration::from_secs(seconds) {
        let keep = |v: &S::Value| {
            let _ = std::fs::write(&last, format!("{v:?}"));
            check(v)
        };
        cases += u64::from(run_target(name, strategy(), 32, true, keep));
    }
    eprintln!(
        "fuzz target {name}: {cases} cases in {:.0} s, no failure",
        start.elapsed().as_secs_f64()
    );
}

#[test]
fn fuzz_scenario_text() {
    run_target("scenario_text", scenario_texts(), 48, false, |t| {
        check_scenario_text(t)
    });
}

#[test]
fn fuzz_catch_cans() {
    run_target("catch_cans", catch_can_texts(), 256, false, |t| {
        check_catch_cans(t)
    });
}

#[test]
fn fuzz_designs() {
    run_target("designs", designs(), 12, false, |u| check_random_design(u));
}

#[test]
#[ignore = "long run: SPINWRIGHT_FUZZ_SECONDS=600 cargo test --release fuzz_long -- --ignored"]
fn fuzz_long_scenario_text() {
    run_long("scenario_text", scenario_texts, |t| check_scenario_text(t));
}

#[test]
#[ignore = "long run: SPINWRIGHT_FUZZ_SECONDS=600 cargo test --release fuzz_long -- --ignored"]
fn fuzz_long_catch_cans() {
    run_long("catch_cans", catch_can_texts, |t| check_catch_cans(t));
}

#[test]
#[ignore = "long run: SPINWRIGHT_FUZZ_SECONDS=600 cargo test --release fuzz_long -- --ignored"]
fn fuzz_long_designs() {
    run_long("designs", designs, |u| check_random_design(u));
}

#[test]
fn the_scanner_finds_non_finite_numbers() {
    assert!(non_finite_word("Report { a: 1.0, b: NaN }").is_some());
    assert!(non_finite_word("[1.0, -inf]").is_some());
    assert!(non_finite_word("x: inf").is_some());
    assert!(non_finite_word("name: \"NaN inf\", a: 1.5e-3, info: 2").is_none());
    assert!(non_finite_word("name: \"say \\\"NaN\\\"\", a: 1").is_none());
}

#[test]
fn values_beyond_the_model_are_refused_with_their_field() {
    let text = std::fs::read_to_string(root().join("tests/fuzz-regressions/swivel-bore-tiny.ron"))
        .expect("regression input");
    let err = scenario::load_str(&text, "tiny.ron").expect_err("refused");
    let msg = format!("{err:#}");
    assert!(
        msg.contains("rotor.swivel.inlet_bore") && msg.contains("too small"),
        "{msg}"
    );
    let huge = std::fs::read_to_string(root().join("scenarios/lawn-rotor.ron"))
        .expect("shipped scenario")
        .replace("Pressure(kPa(300))", "Pressure(kPa(1e300))");
    let msg = format!(
        "{:#}",
        scenario::load_str(&huge, "huge.ron").expect_err("refused")
    );
    assert!(
        msg.contains("supply.Pressure") && msg.contains("too large"),
        "{msg}"
    );
    let csv = std::fs::read_to_string(root().join("tests/fuzz-regressions/catch-1e308.csv"))
        .expect("regression input");
    let msg = parse_catch_cans(&csv, "big.csv")
        .expect_err("refused")
        .to_string();
    assert!(msg.contains("too large"), "{msg}");
}

#[test]
fn regressions_stay_fixed() {
    let dir = root().join("tests/fuzz-regressions");
    let mut files: Vec<_> = std::fs::read_dir(&dir)
        .expect("tests/fuzz-regressions exists")
        .map(|e| e.expect("readable entry").path())
        .collect();
    files.sort();
    let mut checked = 0;
    for path in files {
        let text = std::fs::read_to_string(&path).expect("readable regression input");
        let name = path.file_name().and_then(|n| n.to_str()).unwrap_or("");
        let result = match path.extension().and_then(|e| e.to_str()) {
            Some("ron") => check_scenario_text(&text),
            Some("csv") => check_catch_cans(&text),
            _ => continue,
        };
        if let Err(e) = result {
            panic!("{name}: {e}");
        }
        checked += 1;
    }
    assert!(checked > 0, "no regression inputs in {}", dir.display());
}

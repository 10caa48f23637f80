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

// ---------------------------------------------------------------------------
// Checks

/// The first `NaN` or `inf` word outside string literals in `text`, with the
/// text before it for context.
pub fn non_finite_word(text: &str) -> Option<String> {
    let mut in_str = false;
    let mut escaped = false;
    let mut word_start: Option<usize> = None;
    let flag = |start: usize, end: usize| -> Option<String> {
        let w = text.get(start..end)?;
        if w == "NaN" || w == "inf" {
            let from = text
                .char_indices()
                .map(|(i, _)| i)
                .filter(|&i| i + 160 >= start)
                .find(|&i| i <= start)
                .unwrap_or(0);
            Some(format!("{w} in …{}", &text[from..end]))
        } else {
            None
        }
    };
    for (i, ch) in text.char_indices() {
        if in_str {
            if escaped {
                escaped = false;
            } else if ch == '\\' {
                escaped = true;
            } else if ch == '"' {
                in_str = false;
            }
            continue;
        }
        let word_char = ch.is_alphanumeric() || ch == '_';
        match (word_start, word_char) {
            (None, true) => word_start = Some(i),
            (Some(s), false) => {
                if let Some(found) = flag(s, i) {
                    return Some(found);
                }
                word_start = None;
            }
            _ => {}
        }
        if ch == '"' {
            in_str = true;
        }
    }
    word_start.and_then(|s| flag(s, text.len()))
}

fn finite_debug(what: &str, value: &impl Debug) -> Result<(), String> {
    match non_finite_word(&format!("{value:?}")) {
        Some(found) => Err(format!("{what}: {found}")),
        None => Ok(()),
    }
}

/// A report text must not show NaN or inf (the design's name, which is input,
/// is taken out first).
fn finite_text(what: &str, text: &str, name: &str) -> Result<(), String> {
    let text = if name.is_empty() {
        text.to_string()
    } else {
        text.replace(name, "")
    };
    match non_finite_word(&text.replace('"', "'")) {
        Some(found) => Err(format!("{what}: {found}")),
        None => Ok(()),
    }
}

fn has_message(what: &str, e: &impl std::fmt::Display) -> Result<(), String> {
    if e.to_string().trim().is_empty() {
        Err(format!("{what}: an error without a message"))
    } else {
        Ok(())
    }
}

/// Runs a valid design through the physics chain.
fn check_design(design: &Design) -> Result<(), String> {
    let report = solve(design);
    finite_debug("solve", &report)?;
    let table = torque_table(design, &report, 24);
    finite_debug("torque table", &table)?;

    let opts = PatternOptions::default();
    let head = match head_throw(design, &report, &opts, None) {
        Ok(h) => h,
        Err(e) => return has_message("head_throw", &e),
    };
    finite_debug("head_throw", &head)?;
    if let Some(layout) = design.layout {
        match layout_overlap(design, &head, &layout, &opts, &OverlapOptions::default()) {
            Ok(result) => finite_debug("layout_overlap", &result)?,
            Err(e) => has_message("layout_overlap", &e)?,
        }
    }
    Ok(())
}

/// JSON keys whose value may be `null` (a number that does not exist in
/// the state, docs/format.md section 4); any other `null` is a NaN that serde_json hid.
const MAY_BE_NULL: &[&str] = &[
    "operating_point",
    "start_margin",
    "runaway_rpm",
    "resisting_torque_n_m",
    "power_w",
    "spin_up_s",
    "wetted_radius_m",
    "throw_m",
    "peak_depth_per_turn_mm",
    "driest_quarter_runtime_factor",
    "target",
    "soak_s",
    "intake_warning",
    "measured",
    "overlap_cu_percent",
    "overlap_du_lq_percent",
    "recommend_goal",
    "recommended",
];

fn no_hidden_nan(path: &str, key: &str, v: &serde_json::Value) -> Result<(), String> {
    match v {
        serde_json::Value::Null if !MAY_BE_NULL.contains(&key) && key != "nozzles[]" => Err(
            format!("null at {path} (a NaN or infinity turned into null)"),
        ),
        serde_json::Value::Array(items) => items
            .iter()
            .enumerate()
            .try_for_each(|(i, x)| no_hidden_nan(&format!("{path}[{i}]"), &format!("{key}[]"), x)),
        serde_json::Value::Object(map) => map
            .iter()
            .try_for_each(|(k, x)| no_hidden_nan(&format!("{path}.{k}"), k, x)),
        _ => Ok(()),
    }
}

/// Runs the command line on a scenario file: text reports must show no NaN
/// or inf, JSON reports must parse and hold no stray `null`, errors must
/// carry a message.
fn check_cli(text: &str, name: &str, has_layout: bool) -> Result<(), String> {
    let dir = tempfile::tempdir().map_err(|e| e.to_string())?;
    let path = dir.path().join("fuzz.ron");
    std::fs::write(&path, text).map_err(|e| e.to_string())?;
    let file = path.to_string_lossy().into_owned();
    let mut runs: Vec<Vec<&str>> = vec![
        vec!["solve", &file],
        vec!["solve", &file, "--format", "json"],
        vec!["solve", &file, "--units", "us"],
        vec!["table", &file, "--points", "12"],
        vec!["throw", &file],
        vec!["throw", &file, "--format", "json"],
    ];
    if has_layout {
        runs.push(vec!["layout", &file]);
        runs.push(vec!["layout", &file, "--format", "json"]);
    }
    for args in runs {
        let what = args.join(" ").replace(&file, "FILE");
        let parsed = Cli::try_parse_from(std::iter::once("spinwright").chain(args.iter().copied()))
            .map_err(|e| format!("{what}: {e}"))?;
        let Some(command) = parsed.command else {
            return Err(format!("{what}: no command parsed"));
        };
        let mut out = Vec::new();
        match cli::run(command, &mut out) {
            Ok(_) => {
                let shown = String::from_utf8(out).map_err(|e| format!("{what}: {e}"))?;
                if args.contains(&"json") {
                    let v: serde_json::Value = serde_json::from_str(&shown)
                        .map_err(|e| format!("{what}: not JSON: {e}"))?;
                    no_hidden_nan(&what, "", &v)?;
                } else {
                    finite_text(&what, &shown, name)?;
                }
            }
            Err(e) => has_message(&what, &e)?,
        }
    }
    Ok(())
}

/// Saving a design and loading it again gives a valid design.
fn check_saves(design: &Design) -> Result<(), String> {
    for units in [UnitSystem::Metric, UnitSystem::Us] {
        let text = Scenario::from_design(design, units, "").to_ron_string();
        scenario::load_str(&text, "saved")
            .and_then(|s| s.to_design())
            .map_err(|e| format!("a saved design does not load again: {e:#}\n{text}"))?;
    }
    Ok(())
}

/// A loadable text saved over with an edited design: edited in place (never
/// written anew), and it reads back as the edited design.
fn check_edits(text: &str, design: &Design, notes: &str) -> Result<(), String> {
    let mut d = design.clone();
    if let Some(a) = d.rotor.arms.first_mut() {
        a.radius_m *= 1.01;
    }
    d.wind.speed_m_s += 0.5;
    for units in [UnitSystem::Metric, UnitSystem::Us] {
        let new = Scenario::from_design(&d, units, notes);
        let out = scenario::edit_in_place(text, &new)
            .map_err(|e| format!("a loadable file was not edited in place: {e}"))?;
        if new.to_design().is_ok() {
            scenario::load_str(&out, "edited")
                .map_err(|e| format!("an edited file does not load: {e:#}\n{out}"))?;
        }
    }
    Ok(())
}

/// One scenario text through the whole chain.
pub fn check_scenario_text(text: &str) -> Result<(), String> {
    let scenario = match scenario::load_str(text, "fuzz.ron") {
        Ok(s) => s,
        Err(e) => return has_message("load_str", &e),
    };
    let design = scenario
        .to_design()
        .map_err(|e| format!("load_str accepted a scenario to_design refuses: {e}"))?;
    check_saves(&design)?;
    check_edits(text, &design, &scenario.notes)?;
    check_design(&design)?;
    check_cli(text, &design.name, design.layout.is_some())
}

/// One catch-can text through parsing and rating.
pub fn check_catch_cans(text: &str) -> Result<(), String> {
    let data = match parse_catch_cans(text, "fuzz.csv") {
        Ok(d) => d,
        Err(e) => return has_message("parse_catch_cans", &e),
    };
    finite_debug("catch-can rates", &data.rates_mm_h())?;
    for layout in [
        None,
        Some(Layout::Square { spacing_m: 8.0 }),
        Some(Layout::Rectangle {
            spacing_m: 6.0,
            rows_m: 11.0,
        }),
        Some(Layout::Triangle { spacing_m: 0.7 }),
    ] {
        match audit(&data, layout.as_ref(), &OverlapOptions::default()) {
            Ok(r) => finite_debug("audit", &r)?,
            Err(e) => has_message("audit", &e)?,
        }
    }
    Ok(())
}

// ---------------------------------------------------------------------------
// Text mutations

const UNIT_TAGS: &[&str] = &[
    "mm", "m", "in", "ft", "kPa", "bar", "psi", "L_min", "m3_h", "gpm", "deg", "C", "F", "N_m",
    "lbf_in", "g", "kg", "lb", "oz", "mm2", "in2", "m_s", "mph", "kg_m2", "kg_m3", "Auto",
];

const CSV_WORDS: &[&str] = &[
    "duration",
    "can_diameter",
    "can_area",
    "distance_m",
    "distance_ft",
    "catch_ml",
    "catch_mm",
    "catch_in",
    "x_m",
    "x_ft",
    "y_m",
    "y_ft",
    "s",
    "min",
    "h",
    "mm",
    "cm",
    "in",
    "mm2",
    "cm2",
    "in2",
];

const NUMBERS: &[&str] = &[
    "0",
    "-0",
    "0.0",
    "-1",
    "-0.5",
    "1e308",
    "1e309",
    "-1e308",
    "1e-308",
    "5e-324",
    "1e-12",
    "1e12",
    "NaN",
    "nan",
    "inf",
    "-inf",
    "+inf",
    "1e999",
    "99999999999999999999999999",
    "0.000000000000000000000000001",
    "1e",
    ".",
    "-",
    "+",
    "1.2.3",
    "0x10",
    "1_000",
    "90",
    "90.0000001",
    "180",
    "-180",
    "360",
    "50",
    "-40",
    "11000",
    "1",
];

const STRAY: &[&str] = &[
    "(", ")", "[", "]", ",", ":", "\"", "//", "/*", "\n", " ", "#", "\u{0}", "é", "\u{feff}",
    "Some(", "None", "true",
];

/// A piece of the text: words (identifiers and numbers) can be mutated.
#[derive(Debug, Clone)]
struct Token {
    text: String,
    word: bool,
}

fn word_char(c: char) -> bool {
    c.is_ascii_alphanumeric() || matches!(c, '_' | '.' | '+' | '-')
}

/// Splits RON-ish or CSV text into words, strings, comments, spaces and
/// single punctuation characters.
fn tokenize(text: &str) -> Vec<Token> {
    let chars: Vec<char> = text.chars().collect();
    let mut out = Vec::new();
    let mut i = 0;
    while let Some(&c) = chars.get(i) {
        let start = i;
        let word = word_char(c);
        if word {
            while chars.get(i).is_some_and(|&c| word_char(c)) {
                i += 1;
            }
        } else if c == '"' {
            i += 1;
            while let Some(&c) = chars.get(i) {
                i += 1;
                if c == '"' {
                    break;
                }
            }
        } else if c == '/' && chars.get(i + 1) == Some(&'/') {
            while chars.get(i).is_some_and(|&c| c != '\n') {
                i += 1;
            }
        } else if c.is_whitespace() {
            while chars.get(i).is_some_and(|c| c.is_whitespace()) {
                i += 1;
            }
        } else {
            i += 1;
        }
        out.push(Token {
            text: chars[start..i].iter().collect(),
            word,
        });
    }
    out
}

/// One mutation: what to do, where (an index taken modulo the candidates),
/// which replacement, and a random number.
type Mutation = (u8, usize, usize, f64);

fn random_number(choice: usize, x: f64) -> String {
    match choice % 4 {
        0 => NUMBERS[choice / 4 % NUMBERS.len()].to_string(),
        1 => format!("{x}"),
        2 => format!("{x:e}"),
        _ => format!("{}", (x.abs().fract() * 1e3).round() - 100.0),
    }
}

fn mutate(base: &str, mutations: &[Mutation], words: &[&str]) -> String {
    let mut tokens = tokenize(base);
    for &(op, at, choice, x) in mutations {
        let word_ix: Vec<usize> = (0..tokens.len()).filter(|&i| tokens[i].word).collect();
        let number_ix: Vec<usize> = word_ix
            .iter()
            .copied()
            .filter(|&i| {
                tokens[i]
                    .text
                    .starts_with(|c: char| c.is_ascii_digit() || c == '-')
            })
            .collect();
        let tag_ix: Vec<usize> = word_ix
            .iter()
            .copied()
            .filter(|&i| words.contains(&tokens[i].text.as_str()))
            .collect();
        let pick = |ix: &[usize]| (!ix.is_empty()).then(|| ix[at % ix.len()]);
        let non_space: Vec<usize> = (0..tokens.len())
            .filter(|&i| !tokens[i].text.trim().is_empty())
            .collect();
        match op % 9 {
            0 => {
                if let Some(i) = pick(&non_space) {
                    tokens.remove(i);
                }
            }
            1 => {
                if let Some(i) = pick(&non_space) {
                    let t = tokens[i].clone();
                    tokens.insert(i, t);
                }
            }
            2 => {
                if let (Some(i), false) = (pick(&word_ix), word_ix.is_empty()) {
                    let from = word_ix[choice % word_ix.len()];
                    tokens[i].text = tokens[from].text.clone();
                }
            }
            3..=5 => {
                if let Some(i) = pick(&number_ix) {
                    tokens[i].text = random_number(choice, x);
                }
            }
            6 | 7 => {
                if let Some(i) = pick(&tag_ix) {
                    tokens[i].text = words[choice % words.len()].to_string();
                }
            }
            _ => {
                let i = at % (tokens.len() + 1);
                tokens.insert(
                    i,
                    Token {
                        text: STRAY[choice % STRAY.len()].to_string(),
                        word: false,
                    },
                );
            }
        }
    }
    tokens.into_iter().map(|t| t.text).collect()
}

fn shipped(ext: &str) -> Vec<String> {
    let mut files: Vec<_> = std::fs::read_dir(root().join("scenarios"))
        .expect("scenarios/ exists")
        .map(|e| e.expect("readable entry").path())
        .filter(|p| p.extension().is_some_and(|e| e == ext))
        .collect();
    files.sort();
    files
        .iter()
        .map(|p| std::fs::read_to_string(p).expect("readable scenario"))
        .collect()
}

fn mutations() -> impl Strategy<Value = Vec<Mutation>> {
    prop::collection::vec(
        (any::<u8>(), any::<usize>(), any::<usize>(), any::<f64>()),
        1..6,
    )
}

/// Mutated shipped scenarios (nine in ten) or raw bytes.
fn scenario_texts() -> impl Strategy<Value = String> {
    let bases = shipped("ron");
    let n = bases.len();
    prop_oneof![
        9 => (0..n, mutations()).prop_map(move |(k, m)| mutate(&bases[k], &m, UNIT_TAGS)),
        1 => prop::collection::vec(any::<u8>(), 0..300)
            .prop_map(|b| String::from_utf8_lossy(&b).into_owned()),
    ]
}

fn catch_can_texts() -> impl Strategy<Value = String> {
    let bases = shipped("csv");
    let n = bases.len();
    prop_oneof![
        9 => (0..n, mutations()).prop_map(move |(k, m)| mutate(&bases[k], &m, CSV_WORDS)),
        1 => prop::collection::vec(any::<u8>(), 0..300)
            .prop_map(|b| String::from_utf8_lossy(&b).into_owned()),
    ]
}

// ---------------------------------------------------------------------------
// Random valid designs

/// Draws values from a list of uniform numbers in [0, 1): a tenth of draws
/// land exactly on a range's ends.
struct Draw<'a> {
    u: &'a [f64],
    next: usize,
}

impl Draw<'_> {
    fn unit(&mut self) -> f64 {
        let v = self.u.get(self.next % self.u.len().max(1)).copied();
        self.next += 1;
        v.unwrap_or(0.5)
    }
    fn t(&mut self) -> f64 {
        let u = self.unit();
        if u < 0.05 {
            0.0
        } else if u >= 0.95 {
            1.0
        } else {
            (u - 0.05) / 0.9
        }
    }
    fn lin(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.t()
    }
    /// Log-uniform on [lo, hi], lo > 0.
    fn log(&mut self, lo: f64, hi: f64) -> f64 {
        lo * (hi / lo).powf(self.t())
    }
    fn pick(&mut self, n: usize) -> usize {
        ((self.unit() * n as f64) as usize).min(n - 1)
    }
    fn chance(&mut self, p: f64) -> bool {
        self.unit() < p
    }
}

const DEG: f64 = std::f64::consts::PI / 180.0;

fn build_design(u: &[f64]) -> Design {
    let mut d = Draw { u, next: 0 };
    let count = 1 + d.pick(12);
    let same = d.chance(0.5);
    let mut arms = Vec::new();
    let mut template: Option<Arm> = None;
    for k in 0..count {
        if let (true, Some(t)) = (same, &template) {
            let mut a = *t;
            a.azimuth_rad = 2.0 * std::f64::consts::PI * k as f64 / count as f64;
            arms.push(a);
            continue;
        }
        let nozzle_m = d.log(0.5e-3, 10e-3);
        let bore_m = nozzle_m * d.lin(1.0, 4.0);
        let outer_m = bore_m * d.lin(1.05, 2.0);
        let arm = Arm {
            radius_m: d.log(0.02, 2.0),
            azimuth_rad: d.lin(0.0, 2.0 * std::f64::consts::PI),
            height_m: d.lin(0.0, 2.0),
            rise_m: d.lin(-0.3, 0.3),
            tube: Tube {
                bore_m,
                outer_m,
                roughness_m: bore_m * d.lin(0.0, 0.05),
                minor_k: d.lin(0.0, 5.0),
                length_m: None,
            },
            nozzle: Nozzle {
                diameter_m: nozzle_m,
                elevation_rad: d.lin(0.0, 90.0) * DEG,
                deflection_rad: if d.chance(0.5) {
                    d.lin(-30.0, 60.0) * DEG
                } else {
                    d.lin(-180.0, 180.0) * DEG
                },
                cd: d.lin(0.3, 1.0),
                cv: d.lin(0.3, 1.0),
            },
        };
        template = Some(arm);
        arms.push(arm);
    }
    let r_min = arms
        .iter()
        .map(|a| a.radius_m)
        .fold(f64::INFINITY, f64::min);
    let hub_radius_m = r_min * d.lin(0.0, 0.9);
    for a in &mut arms {
        if d.chance(0.3) {
            a.tube.length_m = Some((a.radius_m - hub_radius_m) * d.lin(1.0, 3.0));
        }
    }
    let thinnest_outer = arms
        .iter()
        .map(|a| a.tube.outer_m)
        .fold(f64::INFINITY, f64::min);
    let supply = match d.pick(3) {
        0 => Supply::Pressure {
            inlet_pa: d.log(10e3, 1e6),
        },
        1 => {
            // A flow the nozzles can pass (model.md M4 refuses more).
            let total_m3_s = d.log(1e-6, 5e-3);
            let open: f64 = arms
                .iter()
                .map(|a| a.nozzle.cd * std::f64::consts::PI * a.nozzle.diameter_m.powi(2) / 4.0)
                .sum();
            let most = open * (2.0 * 1.9e6 / 1000.0f64).sqrt();
            Supply::Flow {
                total_m3_s: total_m3_s.min(most),
            }
        }
        _ => Supply::Line(Line {
            source_pa: d.log(10e3, 1e6),
            length_m: d.log(0.1, 100.0),
            bore_m: d.log(5e-3, 50e-3),
            roughness_m: d.lin(0.0, 1e-4),
            minor_k: d.lin(0.0, 20.0),
            lift_m: d.lin(-10.0, 10.0),
        }),
    };
    let inertia = if d.chance(0.5) {
        Inertia::Given {
            kg_m2: d.log(1e-6, 10.0),
        }
    } else {
        Inertia::Estimate {
            tube_density_kg_m3: d.log(900.0, 9000.0),
            tube_wall_m: thinnest_outer / 2.0 * d.lin(0.01, 1.0),
            tip_mass_kg: d.lin(0.0, 0.1),
        }
    };
    let bearing = if d.chance(0.5) {
        let outer_m = d.log(1e-3, 30e-3);
        Bearing::Washer(Washer {
            mu_kinetic: d.lin(0.0, 0.6),
            mu_static: d.lin(0.0, 0.8),
            inner_m: outer_m * d.lin(0.0, 0.95),
            outer_m,
            thrust_area_m2: d.lin(0.0, 1e-3),
            rotor_mass_kg: d.log(0.01, 10.0),
            radius_rule: if d.chance(0.5) {
                WasherRule::UniformWear
            } else {
                WasherRule::UniformPressure
            },
        })
    } else {
        Bearing::Measured {
            running_n_m: d.lin(0.0, 0.5),
            breakaway_n_m: d.lin(0.0, 1.0),
        }
    };
    let friction = Friction {
        bearing,
        seal: Seal {
            base_n_m: d.lin(0.0, 0.05),
            per_pa_n_m: d.lin(0.0, 1e-7),
        },
        brake: Brake {
            viscous: if d.chance(0.5) { d.lin(0.0, 5.0) } else { 0.0 },
            quadratic: if d.chance(0.3) { d.lin(0.0, 1.0) } else { 0.0 },
        },
        arm_drag_cd: d.lin(0.0, 2.0),
    };
    let spray = if d.chance(0.6) {
        SpraySpec::default()
    } else {
        let d50 = d.log(0.2e-3, 3e-3);
        SpraySpec {
            d50_m: d.chance(0.7).then_some(d50),
            spread: d.chance(0.5).then(|| d.lin(1.0, 6.0)),
            largest_m: d.chance(0.5).then(|| d50 * d.lin(1.1, 4.0)),
            breakup: d.chance(0.5).then(|| d.lin(2.0, 22.0)),
        }
    };
    let layout = match d.pick(4) {
        0 => None,
        1 => Some(Layout::Square {
            spacing_m: d.log(0.5, 40.0),
        }),
        2 => Some(Layout::Rectangle {
            spacing_m: d.log(0.5, 40.0),
            rows_m: d.log(0.5, 40.0),
        }),
        _ => Some(Layout::Triangle {
            spacing_m: d.log(0.5, 40.0),
        }),
    };
    let wind = if d.chance(0.6) {
        Wind::default()
    } else {
        Wind {
            speed_m_s: d.lin(0.0, 10.0),
            from_rad: d.lin(-360.0, 360.0) * DEG,
        }
    };
    Design {
        name: "fuzz design".to_string(),
        water_temperature_c: d.lin(0.0, 50.0),
        site: Site {
            air_temperature_c: d.lin(-40.0, 60.0),
            altitude_m: d.lin(-500.0, 11_000.0),
            clearance_m: None,
        },
        supply,
        rotor: Rotor {
            hub_radius_m,
            swivel: Swivel {
                inlet_bore_m: d.log(3e-3, 50e-3),
                k: d.lin(0.0, 10.0),
            },
            arms,
            inertia,
        },
        friction,
        spray,
        layout,
        wind,
    }
}

fn designs() -> impl Strategy<Value = Vec<f64>> {
    prop::collection::vec(0.0f64..1.0, 64..160)
}

/// A random design through the physics, and through a save and reload.
pub fn check_random_design(u: &[f64]) -> Result<(), String> {
    let design = build_design(u);
    check_saves(&design)?;
    let text = Scenario::from_design(&design, UnitSystem::Metric, "").to_ron_string();
    check_design(&design)
        .and_then(|()| check_cli(&text, &design.name, design.layout.is_some()))
        .map_err(|e| format!("{e}\n{text}"))
}

// ---------------------------------------------------------------------------
// Runners

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

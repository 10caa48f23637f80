//! What every fuzz case must hold: no panic, no non-finite number in any report, every error with a message.

use super::*;

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

pub(super) fn finite_debug(what: &str, value: &impl Debug) -> Result<(), String> {
    match non_finite_word(&format!("{value:?}")) {
        Some(found) => Err(format!("{what}: {found}")),
        None => Ok(()),
    }
}

/// A report text must not show NaN or inf (the design's name, which is input,
/// is taken out first).
pub(super) fn finite_text(what: &str, text: &str, name: &str) -> Result<(), String> {
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

pub(super) fn has_message(what: &str, e: &impl std::fmt::Display) -> Result<(), String> {
    if e.to_string().trim().is_empty() {
        Err(format!("{what}: an error without a message"))
    } else {
        Ok(())
    }
}

/// Runs a valid design through the physics chain.
pub(super) fn check_design(design: &Design) -> Result<(), String> {
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
pub(super) const MAY_BE_NULL: &[&str] = &[
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

pub(super) fn no_hidden_nan(path: &str, key: &str, v: &serde_json::Value) -> Result<(), String> {
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
pub(super) fn check_cli(text: &str, name: &str, has_layout: bool) -> Result<(), String> {
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
pub(super) fn check_saves(design: &Design) -> Result<(), String> {
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
pub(super) fn check_edits(text: &str, design: &Design, notes: &str) -> Result<(), String> {
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
pub(super) fn check_scenario_text(text: &str) -> Result<(), String> {
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
pub(super) fn check_catch_cans(text: &str) -> Result<(), String> {
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

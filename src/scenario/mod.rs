//! The scenario file: RON with a unit tag on every dimensional value.
//!
//! A scenario is what a person writes and keeps; a
//! [`Design`](crate::physics::design::Design) is what the physics core takes.
//! This module sits between them and owns everything about files:
//!
//! - [`schema`]: the file's shape, field for field as `docs/format.md` describes it.
//! - [`tags`]: the unit tags (`mm(160)`, `kPa(280)`, `deg(22)`), one enum per
//!   dimension, converted to SI once, at load.
//! - [`load_str`] / [`load_file`]: parse, check the format version, validate
//!   (through [`Scenario::to_design`]) — every load path validates.
//! - [`Scenario::from_design`] and [`Scenario::to_ron_string`]: write a design
//!   back in metric or US units; it re-loads to the same design.
//! - [`starter_text`]: a commented starter file for `spinwright new`.
//! - [`save_scenario`] / [`scenario_text`]: save a design over the text it was
//!   read from, changing only the values that changed (comments, order,
//!   blank lines and notes kept; see [`edit_in_place`]).
//! - [`cans`]: a measured catch-can test from CSV (rated in
//!   [`crate::inverse::audit`]).
//! - [`save_atomic`]: write a file so a crash or a full disk never leaves a
//!   half-written scenario, keeping the previous version as `FILE.bak`.
//!
//! Errors are written for a technician: a syntax error names the file, line
//! and column and what was expected; an unknown field or unit tag lists what
//! is accepted there; a value out of range names its field path and the range.

pub mod cans;
mod convert;
mod edit;
mod locate;
mod save;
pub mod schema;
mod starter;
pub mod tags;

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use serde::Deserialize;

pub use convert::{Problem, Problems};
pub use edit::{edit_in_place, save_scenario, scenario_text, EditError, ScenarioText, Written};
pub use save::save_atomic;
pub use schema::{Scenario, FORMAT_VERSION};
pub use starter::starter_text;

/// Why a scenario could not be read, checked or saved.
#[derive(Debug, thiserror::Error)]
pub enum ScenarioError {
    /// The file could not be read.
    #[error("cannot read {}: {io}", path.display())]
    Read {
        /// The file.
        path: PathBuf,
        /// What the operating system said.
        io: std::io::Error,
    },
    /// The file could not be written.
    #[error("cannot save {}: {io}", path.display())]
    Write {
        /// The file.
        path: PathBuf,
        /// What the operating system said.
        io: std::io::Error,
    },
    /// The text is not a well-formed scenario: bad syntax, an unknown field or
    /// unit tag, a missing field, a value of the wrong kind.
    #[error(
        "{origin}: line {line}, column {column}{}: {message}",
        .field.as_ref().map(|f| format!(" (in {f})")).unwrap_or_default()
    )]
    Syntax {
        /// The file name (or whatever the text came from).
        origin: String,
        /// Line, 1-based.
        line: usize,
        /// Column, 1-based, in characters.
        column: usize,
        /// The field path where it happened, when known (`rotor.arms[0].nozzle`).
        field: Option<String>,
        /// What is wrong and what was expected.
        message: String,
    },
    /// The text is not a scenario at all: empty, only comments, or another
    /// kind of file (a catch-can CSV, a note).
    #[error("{origin}: {reason}; a scenario is RON text that starts with `Scenario(` (`spinwright new FILE` writes a commented starter)")]
    NotAScenario {
        /// The file name.
        origin: String,
        /// What the text is instead.
        reason: String,
    },
    /// The file was written by a newer spinwright.
    #[error(
        "{origin}: this file was written by a newer spinwright (scenario format version {found}); \
         this build reads format version {supported} — update spinwright to open it"
    )]
    NewerVersion {
        /// The file name.
        origin: String,
        /// The version the file declares.
        found: u64,
        /// The version this build reads.
        supported: u32,
    },
    /// The file declares a version spinwright never wrote.
    #[error(
        "{origin}: `version: {found}` is not a scenario format version; \
         this build reads format version {supported} (or leave `version` out)"
    )]
    UnknownVersion {
        /// The file name.
        origin: String,
        /// The version the file declares.
        found: u64,
        /// The version this build reads.
        supported: u32,
    },
    /// The file is well formed but some values are out of range.
    #[error("{origin}: {problems}")]
    Invalid {
        /// The file name, or `scenario "NAME"` for a scenario built in memory.
        origin: String,
        /// Every problem found.
        problems: Problems,
    },
}

impl ScenarioError {
    /// The problems of an [`ScenarioError::Invalid`], empty for other errors.
    pub fn problems(&self) -> &[Problem] {
        match self {
            ScenarioError::Invalid { problems, .. } => &problems.0,
            _ => &[],
        }
    }

    /// Names the file and, from its text, the line of each problem's field.
    fn located(self, name: &str, text: &str) -> Self {
        match self {
            ScenarioError::Invalid { problems, .. } => {
                let lines = locate::Lines::scan(text);
                ScenarioError::Invalid {
                    origin: name.to_string(),
                    problems: Problems(
                        problems
                            .0
                            .into_iter()
                            .map(|p| Problem {
                                line: lines.line_of(&p.path),
                                ..p
                            })
                            .collect(),
                    ),
                }
            }
            other => other,
        }
    }
}

/// Only the version, read before anything else so a newer file is refused
/// with a clear message rather than with its first unknown field.
#[derive(Deserialize)]
#[serde(rename = "Scenario")]
struct VersionProbe {
    #[serde(default, with = "schema::implicit_some")]
    version: Option<u64>,
}

/// Reads a scenario from text. `origin` names the text in messages (the file
/// name). The format version is checked first, then the syntax and shape,
/// then every value (see [`Scenario::to_design`]).
pub fn load_str(text: &str, origin: &str) -> Result<Scenario, ScenarioError> {
    // Some editors start a file with a byte-order mark; it is not content.
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    not_a_scenario(text, origin)?;
    let options = ron::Options::default();
    if let Ok(VersionProbe {
        version: Some(found),
    }) = options.from_str::<VersionProbe>(text)
    {
        let supported = FORMAT_VERSION;
        if found > u64::from(supported) {
            return Err(ScenarioError::NewerVersion {
                origin: origin.to_string(),
                found,
                supported,
            });
        }
        if found == 0 {
            return Err(ScenarioError::UnknownVersion {
                origin: origin.to_string(),
                found,
                supported,
            });
        }
    }

    let scenario = parse(text, origin, &options)?;
    scenario.to_design().map_err(|e| e.located(origin, text))?;
    Ok(scenario)
}

/// Refuses, in plain words, a text that cannot be a scenario, before the RON
/// parser would describe it in its own terms (`expected (`, an `#![enable]`
/// attribute).
fn not_a_scenario(text: &str, origin: &str) -> Result<(), ScenarioError> {
    let refuse = |reason: String| {
        Err(ScenarioError::NotAScenario {
            origin: origin.to_string(),
            reason,
        })
    };
    match locate::first_token(text) {
        None if text.trim().is_empty() => refuse("the file is empty".to_string()),
        None => refuse("the file holds only comments".to_string()),
        // `Scenario(`, `(`, an attribute, or another `Name(` (which the
        // parser then names: "expected `Scenario(…)`").
        Some((_, first))
            if first.starts_with('(')
                || first.starts_with("#![")
                || first
                    .trim_start_matches(|c: char| c.is_alphanumeric() || c == '_')
                    .trim_start()
                    .starts_with('(') =>
        {
            Ok(())
        }
        Some((line, first)) => {
            let shown: String = first.chars().take(40).collect();
            let more = if first.chars().count() > 40 {
                "…"
            } else {
                ""
            };
            refuse(format!(
                "line {line}: this is not a scenario file (it starts with `{shown}{more}`)"
            ))
        }
    }
}

fn parse(text: &str, origin: &str, options: &ron::Options) -> Result<Scenario, ScenarioError> {
    let syntax = |err: ron::error::SpannedError, field: Option<String>| {
        // An unknown field's own name ends the path; the path names where it is.
        let field = match (&err.code, field) {
            (ron::Error::NoSuchStructField { found, .. }, Some(path)) => {
                if path == *found {
                    None
                } else {
                    Some(
                        path.strip_suffix(&format!(".{found}"))
                            .map_or(path.clone(), str::to_string),
                    )
                }
            }
            (_, field) => field,
        };
        let (line, column) = next_token(text, err.span.start.line, err.span.start.col);
        ScenarioError::Syntax {
            origin: origin.to_string(),
            line,
            column,
            message: describe(&err.code, field.as_deref()),
            field,
        }
    };
    let mut de =
        ron::Deserializer::from_str_with_options(text, options).map_err(|e| syntax(e, None))?;
    let scenario: Scenario = match serde_path_to_error::deserialize(&mut de) {
        Ok(s) => s,
        Err(e) => {
            let field = field_path(e.path());
            let spanned = de.span_error(e.into_inner());
            return Err(syntax(spanned, field));
        }
    };
    de.end().map_err(|e| syntax(de.span_error(e), None))?;
    Ok(scenario)
}

/// RON reports some errors at the whitespace before the offending value;
/// a technician wants the value itself. Moves a 1-based (line, column) over
/// spaces and line breaks to the next character, if there is one.
fn next_token(text: &str, line: usize, column: usize) -> (usize, usize) {
    let Some(line_text) = text.split('\n').nth(line.saturating_sub(1)) else {
        return (line, column);
    };
    let rest_of_line = line_text.chars().skip(column.saturating_sub(1));
    let (mut l, mut c) = (line, column);
    let later_lines = text.split('\n').skip(line);
    let mut chars = rest_of_line
        .map(Some)
        .chain(std::iter::once(None))
        .chain(later_lines.flat_map(|t| t.chars().map(Some).chain(std::iter::once(None))));
    loop {
        match chars.next() {
            Some(Some(ch)) if ch.is_whitespace() => c += 1,
            Some(Some(_)) => return (l, c),
            Some(None) => {
                l += 1;
                c = 1;
            }
            None => return (line, column),
        }
    }
}

/// Reads and checks a scenario file.
pub fn load_file(path: impl AsRef<Path>) -> Result<Scenario, ScenarioError> {
    let path = path.as_ref();
    let text = std::fs::read_to_string(path).map_err(|io| {
        if io.kind() == std::io::ErrorKind::InvalidData {
            ScenarioError::NotAScenario {
                origin: path.display().to_string(),
                reason: "the file is not text (it is not UTF-8)".to_string(),
            }
        } else {
            ScenarioError::Read {
                path: path.to_path_buf(),
                io,
            }
        }
    })?;
    load_str(&text, &path.display().to_string())
}

/// A serde path as the scenario's field path: `rotor.arms[1].nozzle.diameter`,
/// with enum kinds kept (`supply.Line.bore`) and unit tags left out.
fn field_path(path: &serde_path_to_error::Path) -> Option<String> {
    use serde_path_to_error::Segment;
    let mut out = String::new();
    for segment in path.iter() {
        match segment {
            Segment::Seq { index } => {
                let _ = write!(out, "[{index}]");
            }
            Segment::Map { key } => {
                if !out.is_empty() {
                    out.push('.');
                }
                out.push_str(key);
            }
            Segment::Enum { variant } if !tags::is_unit_tag(variant) => {
                if !out.is_empty() {
                    out.push('.');
                }
                out.push_str(variant);
            }
            Segment::Enum { .. } | Segment::Unknown => {}
        }
    }
    (!out.is_empty()).then_some(out)
}

fn list(items: &[&str]) -> String {
    items
        .iter()
        .map(|s| format!("`{s}`"))
        .collect::<Vec<_>>()
        .join(", ")
}

/// What the file's words mean, for messages: serde type names to plain words.
fn describe_outer(outer: &str) -> String {
    let word = match outer {
        "Scenario" => "the scenario",
        "Supply" => "the supply",
        "Inertia" => "the rotor inertia",
        "Bearing" => "the bearing",
        "Layout" => "the layout",
        "WasherRule" => "the washer radius rule",
        "DropSize" => "a drop size",
        "Line" => "the supply line",
        "Washer" => "the washer",
        "Measured" => "the measured bearing",
        "Estimate" => "the inertia estimate",
        "Square" | "Rectangle" | "Triangle" => "the layout",
        other => return format!("`{other}`"),
    };
    word.to_string()
}

/// The unit tags a field takes, by the field's name (the names are unique
/// across the format): (what it measures, tags).
fn tags_for_field(field: &str) -> Option<(&'static str, &'static [&'static str])> {
    use tags::*;
    let last = field.rsplit('.').next().unwrap_or(field);
    Some(match last {
        "hub_radius" | "inlet_bore" | "radius" | "height" | "rise" | "bore" | "outer"
        | "roughness" | "length" | "diameter" | "tube_wall" | "inner" | "altitude" | "lift"
        | "spacing" | "rows" | "clearance" => ("a length", Length::TAGS),
        "source" | "Pressure" => ("a pressure", Pressure::TAGS),
        "Flow" => ("a flow", FlowRate::TAGS),
        "azimuth" | "elevation" | "deflection" | "from" => ("an angle", Angle::TAGS),
        "temperature" => ("a temperature", Temperature::TAGS),
        "running" | "breakaway" | "base" | "per_kpa" => ("a torque", Torque::TAGS),
        "tip_mass" | "rotor_mass" => ("a mass", Mass::TAGS),
        "thrust_area" => ("an area", Area::TAGS),
        "speed" => ("a speed", Speed::TAGS),
        "Given" => ("a moment of inertia", MomentOfInertia::TAGS),
        "tube_density" => ("a density", Density::TAGS),
        "d50" | "largest" => ("a drop size (or `Auto`)", &["mm", "um", "in"]),
        _ => return None,
    })
}

/// A RON error code in a technician's words. `field` is the field path shown
/// beside the message (when known), so serde type names are left out then.
fn describe(code: &ron::Error, field: Option<&str>) -> String {
    use ron::Error as E;
    let located = field.is_some();
    // A bare number where the field needs a unit tag.
    let unit_needed = match code {
        E::SuggestRawIdentifier(s) | E::InvalidIdentifier(s) if s.parse::<f64>().is_ok() => {
            Some(s.as_str())
        }
        E::ExpectedIdentifier => Some("…"),
        _ => None,
    };
    if let (Some(number), Some((what, tags))) = (unit_needed, field.and_then(tags_for_field)) {
        let first = tags.first().copied().unwrap_or("mm");
        return format!(
            "this value needs its unit: write it as `{first}({number})`; {what} takes one of {}",
            list(tags)
        );
    }
    let place = |outer: &Option<String>, word: &str| match outer.as_deref() {
        Some(o) if !located => format!(" {word} {}", describe_outer(o)),
        _ => String::new(),
    };
    match code {
        E::NoSuchStructField {
            expected,
            found,
            outer,
        } => {
            let place = place(outer, "in");
            format!(
                "unknown field `{found}`{place}; the fields accepted here are {}",
                list(expected)
            )
        }
        E::NoSuchEnumVariant {
            expected,
            found,
            outer,
        } => {
            let tag = outer
                .as_deref()
                .and_then(|o| tags::TAG_ENUMS.iter().find(|(name, _, _)| *name == o));
            match tag {
                Some((_, what, _)) => format!(
                    "unknown unit tag `{found}` for {what}; write it with one of {} around the number, e.g. `{}(…)`",
                    list(expected),
                    expected.first().copied().unwrap_or("mm")
                ),
                None => {
                    let place = place(outer, "for");
                    format!("unknown choice `{found}`{place}; accepted: {}", list(expected))
                }
            }
        }
        E::MissingStructField { field, outer } => {
            let place = place(outer, "in");
            format!("missing field `{field}`{place}: it has no default, please give it")
        }
        E::DuplicateStructField { field, .. } => {
            format!("field `{field}` is given twice; keep one")
        }
        E::ExpectedDifferentStructName { expected, found } => {
            format!("expected `{expected}(…)` here, found `{found}(…)`")
        }
        E::ExpectedNamedStructLike(_) => "expected `(` to open a group of fields".to_string(),
        E::ExpectedStructName(name) => format!("expected `{name}(…)` here"),
        E::ExpectedFloat | E::ExpectedInteger => "expected a number here".to_string(),
        E::ExpectedString => "expected text in double quotes here".to_string(),
        E::ExpectedStringEnd => "a text in double quotes is not closed".to_string(),
        E::ExpectedComma => "expected a comma between two fields or values".to_string(),
        E::ExpectedStructLike => "expected `(` here".to_string(),
        E::ExpectedStructLikeEnd | E::ExpectedOptionEnd => {
            "expected `)` to close this group (is a comma missing, or a field misspelt?)"
                .to_string()
        }
        E::ExpectedArray => "expected `[` to open a list".to_string(),
        E::ExpectedArrayEnd => "expected `]` to close the list".to_string(),
        E::ExpectedMapColon => "expected `:` between a field name and its value".to_string(),
        E::ExpectedIdentifier => "expected a field name or a word such as `Auto` here".to_string(),
        E::Eof => "the file ends too early: a closing `)` or `]` is missing".to_string(),
        E::TrailingCharacters => {
            "unexpected text after the end of the scenario's closing `)`".to_string()
        }
        E::UnclosedBlockComment => "a `/*` comment is never closed with `*/`".to_string(),
        E::InvalidValueForType { expected, found } => {
            format!("expected {}, found {found}", plain_expected(expected))
        }
        E::Message(m) => m.clone(),
        other => other.to_string(),
    }
}

fn plain_expected(expected: &str) -> String {
    match expected {
        "f64" | "f32" => "a number".to_string(),
        "u32" | "u64" => "a whole number".to_string(),
        "a string" | "a borrowed string" => "text in double quotes".to_string(),
        other => other.to_string(),
    }
}

impl Scenario {
    /// The scenario as RON text, with a header comment. Loading the text gives
    /// back the same design (every value is written with its unit tag).
    pub fn to_ron_string(&self) -> String {
        let config = ron::ser::PrettyConfig::new()
            .indentor("    ".to_string())
            .new_line("\n".to_string());
        // Serializing plain structs of numbers, strings and enums with valid
        // identifiers into a String has no failure path in ron.
        #[allow(clippy::expect_used)] // no input reaches a ron serializer error (see above)
        let body =
            ron::ser::to_string_pretty(self, config).expect("a scenario always serializes to RON");
        format!(
            "// spinwright scenario, format version {FORMAT_VERSION}.\n\
             // Every dimensional value carries its unit: mm(…), kPa(…), deg(…), L_min(…).\n\
             Scenario{body}\n"
        )
    }
}

/// The built-in example (the shipped lawn rotor), opened when the tool starts
/// without a file.
pub fn builtin_example() -> Scenario {
    // The shipped file is checked by the tests to load; a failure here is a
    // build defect, not bad input.
    #[allow(clippy::expect_used)] // compiled-in text, loaded by the tests
    load_str(BUILTIN_EXAMPLE, "built-in example (lawn-rotor.ron)")
        .expect("the built-in example loads")
}

/// The text of the built-in example.
pub const BUILTIN_EXAMPLE: &str = include_str!("../../scenarios/lawn-rotor.ron");

#[cfg(test)]
mod tests;

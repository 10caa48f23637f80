//! Values typed on the command line, read into SI: quantities with units
//! (the interface's parser), positive readings, design inputs by catalogue
//! name (`--vary`, `--free`) with their `NAME=FROM..TO` ranges, and the
//! layout options.

use super::{CliError, PatternArg};
use crate::catalogue::{self, Input};
use crate::units::Dimension as D;

/// Parse a quantity typed with units, naming the argument on error.
///
/// This is the parser the terminal interface uses for typed values
/// ([`crate::units::parse_quantity`]), so `2.8bar`, `45psi`, `30rpm` and
/// `1.5s` read the same in both.
pub fn quantity(argument: &str, dim: crate::units::Dimension, text: &str) -> Result<f64, CliError> {
    crate::units::parse_quantity(dim, text).map_err(|error| CliError::Quantity {
        argument: argument.to_string(),
        error,
    })
}

/// A quantity that must be more than zero (a reading, a spacing, a target),
/// in SI. `what` names it in the message (`the measured pressure`).
pub fn positive_quantity(
    argument: &str,
    dim: crate::units::Dimension,
    text: &str,
    what: &str,
) -> Result<f64, CliError> {
    let v = quantity(argument, dim, text)?;
    must_be_positive(argument, text, what, v)
}

/// A quantity whose argument names its unit (`--rpm`, `--seconds-per-turn`):
/// a bare number is in that unit (`bare_si` SI per unit), a number with a
/// unit is read as any other quantity. Must be more than zero. SI.
pub fn positive_quantity_or_bare(
    argument: &str,
    dim: crate::units::Dimension,
    text: &str,
    bare_si: f64,
    what: &str,
) -> Result<f64, CliError> {
    let v = match text.trim().parse::<f64>() {
        Ok(bare) => bare * bare_si,
        Err(_) => quantity(argument, dim, text)?,
    };
    must_be_positive(argument, text, what, v)
}

/// A speed argument (`--rpm 40`, `--rpm 40rpm`, `--rpm 4.2rad/s`) in rpm,
/// more than zero. `40rpm` gives exactly 40, not 40 through rad/s and back.
pub fn positive_rpm(argument: &str, text: &str, what: &str) -> Result<f64, CliError> {
    use crate::units::factor::RPM_RAD_S;
    let rad_s = positive_quantity_or_bare(
        argument,
        crate::units::Dimension::AngularSpeed,
        text,
        RPM_RAD_S,
        what,
    )?;
    Ok(crate::scenario::tags::tidy(rad_s / RPM_RAD_S))
}

/// A bare positive number (a count of turns).
pub fn positive_number(argument: &str, text: &str, what: &str) -> Result<f64, CliError> {
    let v = text.trim().parse::<f64>().map_err(|_| {
        CliError::Usage(format!(
            "{argument} {text}: {what} is a bare number (e.g. {argument} 10)"
        ))
    })?;
    must_be_positive(argument, text, what, v)
}

fn must_be_positive(argument: &str, text: &str, what: &str, v: f64) -> Result<f64, CliError> {
    if !v.is_finite() {
        Err(CliError::Usage(format!(
            "{argument} {text}: {what} must be a finite number"
        )))
    } else if v <= 0.0 {
        Err(CliError::Usage(format!(
            "{argument} {text}: {what} must be more than zero"
        )))
    } else {
        Ok(v)
    }
}

/// The uniformity goal of `layout --recommend`: `--cu` or `--du` in %,
/// CU 85 % when neither is given.
pub(super) fn spacing_goal(
    cu: Option<&str>,
    du: Option<&str>,
) -> Result<crate::physics::layout::SpacingGoal, CliError> {
    use crate::physics::layout::SpacingGoal;
    let percent = |arg: &str, text: &str| -> Result<f64, CliError> {
        let t = text.trim().trim_end_matches('%').trim();
        match t.parse::<f64>() {
            Ok(v) if v.is_finite() && v > 0.0 && v <= 100.0 => Ok(v),
            _ => Err(CliError::Usage(format!(
                "{arg} {text}: a goal in percent above 0 and at most 100 (e.g. {arg} 85)"
            ))),
        }
    };
    Ok(match (cu, du) {
        (_, Some(d)) => SpacingGoal::DuLq(percent("--du", d)?),
        (Some(c), None) => SpacingGoal::Cu(percent("--cu", c)?),
        (None, None) => SpacingGoal::Cu(85.0),
    })
}

pub(super) fn layout_override(
    pattern: Option<PatternArg>,
    spacing: Option<&str>,
    rows: Option<&str>,
) -> Result<Option<crate::physics::design::Layout>, CliError> {
    use crate::physics::design::Layout;
    use crate::units::Dimension;
    let positive = |arg: &str, text: &str| -> Result<f64, CliError> {
        positive_quantity(arg, Dimension::Length, text, "a spacing")
    };
    let Some(spacing) = spacing else {
        return match (pattern, rows) {
            (None, None) => Ok(None),
            _ => Err(CliError::Usage(
                "--pattern and --rows need --spacing".into(),
            )),
        };
    };
    let spacing_m = positive("--spacing", spacing)?;
    Ok(Some(match (pattern, rows) {
        (Some(PatternArg::Rectangle), Some(r)) | (None, Some(r)) => Layout::Rectangle {
            spacing_m,
            rows_m: positive("--rows", r)?,
        },
        (Some(PatternArg::Rectangle), None) => {
            return Err(CliError::Usage("--pattern rectangle needs --rows".into()))
        }
        (Some(PatternArg::Triangle), None) => Layout::Triangle { spacing_m },
        (Some(PatternArg::Square), None) => Layout::Square { spacing_m },
        (None, None) => Layout::Square { spacing_m },
        (Some(_), Some(_)) => {
            return Err(CliError::Usage(
                "--rows goes with --pattern rectangle".into(),
            ))
        }
    }))
}

/// The dimension an input's values are typed in, `None` for a bare number
/// (coefficients, and brakes, which are SI in both unit systems).
pub fn parameter_dimension(p: &Input) -> Option<D> {
    p.unit.dimension()
}

/// A value of parameter `p` typed on the command line, in SI. Angles may be
/// bare numbers (degrees); brake and friction coefficients are bare SI numbers.
pub fn parameter_value(argument: &str, p: &Input, text: &str) -> Result<f64, CliError> {
    let text = text.trim();
    match parameter_dimension(p) {
        None => text
            .parse::<f64>()
            .ok()
            .filter(|v| v.is_finite())
            .ok_or_else(|| {
                CliError::Usage(format!(
                    "{argument}: `{text}` is not a number ({} takes a bare number)",
                    p.vary_name()
                ))
            }),
        Some(dim) => match text.parse::<f64>() {
            Ok(deg) if dim == D::Angle && deg.is_finite() => Ok(deg.to_radians()),
            _ => quantity(argument, dim, text),
        },
    }
}

/// A `NAME=FROM..TO` argument as written.
pub struct NamedRange<'t> {
    /// The catalogue input it names.
    pub input: &'static Input,
    /// The text after `=`.
    pub range: &'t str,
    /// The two ends, when the range has a `..`.
    pub ends: Option<(&'t str, &'t str)>,
}

/// Reads a `NAME=FROM..TO` argument of `option`; a range without `..` is left
/// for the caller to refuse in its own words. `example` closes the messages
/// (`e.g. --vary deflection=0..60 --points 13`).
pub fn named_range<'t>(
    option: &str,
    text: &'t str,
    example: &str,
) -> Result<NamedRange<'t>, CliError> {
    let (name, range) = text.split_once('=').ok_or_else(|| {
        CliError::Usage(format!(
            "{option} {text}: no `=` (write NAME=FROM..TO, {example})"
        ))
    })?;
    let input = catalogue::by_vary_name(name.trim()).ok_or_else(|| {
        CliError::Usage(format!(
            "{option} {text}: unknown input `{}`; known: {}",
            name.trim(),
            catalogue::varied()
                .map(|p| p.vary_name())
                .collect::<Vec<_>>()
                .join(", ")
        ))
    })?;
    Ok(NamedRange {
        input,
        range,
        ends: range.split_once(".."),
    })
}

//! Values typed on the command line: design inputs by catalogue name
//! (`--vary`, `--free`) and their `NAME=FROM..TO` ranges.

use super::{quantity, CliError};
use crate::catalogue::{self, Input};
use crate::units::Dimension as D;

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

//! Plain-text layout helpers for reports meant for a person: aligned columns
//! with units in the headers.

use std::fmt::Write as _;

/// A table of text cells: the first column left-aligned, the rest right-aligned.
#[derive(Debug, Clone, Default)]
pub struct TextTable {
    headers: Vec<String>,
    rows: Vec<Vec<String>>,
}

impl TextTable {
    /// A table with these column headers.
    pub fn new<S: Into<String>>(headers: impl IntoIterator<Item = S>) -> Self {
        TextTable {
            headers: headers.into_iter().map(Into::into).collect(),
            rows: Vec::new(),
        }
    }

    /// Append one row (missing cells are blank, extra cells are dropped).
    pub fn row<S: Into<String>>(&mut self, cells: impl IntoIterator<Item = S>) {
        let mut cells: Vec<String> = cells.into_iter().map(Into::into).collect();
        cells.resize(self.headers.len(), String::new());
        self.rows.push(cells);
    }

    /// The table as text, each line indented by `indent` spaces.
    pub fn render(&self, indent: usize) -> String {
        let widths: Vec<usize> = (self.headers.iter().enumerate())
            .map(|(c, header)| {
                std::iter::once(header)
                    .chain(self.rows.iter().filter_map(|r| r.get(c)))
                    .map(|s| s.chars().count())
                    .max()
                    .unwrap_or(0)
            })
            .collect();
        let mut out = String::new();
        let pad = " ".repeat(indent);
        let line = |cells: &[String], out: &mut String| {
            out.push_str(&pad);
            for (c, (cell, width)) in cells.iter().zip(&widths).enumerate() {
                if c > 0 {
                    out.push_str("  ");
                }
                if c == 0 {
                    let _ = write!(out, "{cell:<width$}");
                } else {
                    let _ = write!(out, "{cell:>width$}");
                }
            }
            let trimmed = out.trim_end().len();
            out.truncate(trimmed);
            out.push('\n');
        };
        line(&self.headers, &mut out);
        for row in &self.rows {
            line(row, &mut out);
        }
        out
    }
}

/// A number with a fixed count of significant figures for table cells
/// (`—` for a missing or non-finite value).
pub fn sig(value: Option<f64>, figures: usize) -> String {
    match value {
        Some(v) if v.is_finite() => {
            if v == 0.0 {
                return "0".into();
            }
            let magnitude = v.abs().log10().floor() as i32;
            let decimals = (figures as i32 - 1 - magnitude).clamp(0, 12) as usize;
            format!("{v:.decimals$}")
        }
        _ => "—".into(),
    }
}

/// A number for a CSV cell: full precision, rounded to 12 significant
/// figures so that a unit conversion leaves no last-bit noise
/// (`0.30000000000000004` is written `0.3`). Relative change at most 5·10⁻¹².
pub fn csv_number(value: f64) -> String {
    if !value.is_finite() || value == 0.0 {
        return format!("{value}");
    }
    let rounded: f64 = format!("{value:.11e}").parse().unwrap_or(value);
    format!("{rounded}")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn columns_line_up() {
        let mut t = TextTable::new(["arm", "flow L/min"]);
        t.row(["1", "6.20"]);
        t.row(["12", "16.4"]);
        let text = t.render(2);
        let lines: Vec<&str> = text.lines().collect();
        assert_eq!(lines[0], "  arm  flow L/min");
        assert_eq!(lines[1], "  1          6.20");
        assert_eq!(lines[2], "  12         16.4");
    }

    #[test]
    fn significant_figures() {
        assert_eq!(sig(Some(0.012345), 3), "0.0123");
        assert_eq!(sig(Some(1234.5), 3), "1234");
        assert_eq!(sig(Some(f64::NAN), 3), "—");
        assert_eq!(sig(None, 3), "—");
    }

    #[test]
    fn csv_numbers_lose_conversion_noise_only() {
        assert_eq!(csv_number(0.1 + 0.2), "0.3");
        assert_eq!(csv_number(29.999999999999996), "30");
        assert_eq!(csv_number(0.123456789012345), "0.123456789012");
        assert_eq!(csv_number(-1.5e-7), "-0.00000015");
        assert_eq!(csv_number(0.0), "0");
    }
}

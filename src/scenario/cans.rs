//! Measured catch-can data read from CSV: the file a catch-can test is
//! written in, turned into application rates (rated and set beside the
//! model in [`crate::inverse::audit`]).
//!
//! A catch-can test sets out cans, runs the sprinkler for a timed period and
//! measures what each can caught. This module reads such a test from a CSV
//! file and turns every catch into an application rate (mm/h).
//!
//! # File format
//!
//! ```text
//! # Lines starting with '#' are comments; blank lines are skipped.
//! # Settings first, one per line: name,value,unit
//! duration,30,min              # test run time: s, min or h (required)
//! can_diameter,100,mm          # can opening: mm, cm or in (needed for catches in mL)
//! # can_area,78.5,cm2          # or the opening area: mm2, cm2 or in2
//! # Then the table. A radial leg:
//! distance_m,catch_ml          # distance_m | distance_ft, catch_ml | catch_mm | catch_in
//! 0.5,21.0
//! # or a grid of cans:
//! # x_m,y_m,catch_mm           # x_m | x_ft, y_m | y_ft, catch_ml | catch_mm | catch_in
//! ```
//!
//! Catches in mL are divided by the can opening area to give a depth; depths
//! (mm or in) are used as they are; each depth over the test duration is a rate.
//! Grid cans count with equal weight, so they should stand on a uniform grid.

use crate::physics::pattern::M_S_TO_MM_H;
use crate::physics::InvalidInput;
use std::f64::consts::PI;
use std::path::Path;

/// Errors reading or rating catch-can data.
#[derive(Debug, thiserror::Error)]
pub enum CatchCanError {
    /// The file could not be read.
    #[error("{file}: cannot read the file: {source}")]
    Read {
        /// The file.
        file: String,
        /// What the system said.
        #[source]
        source: std::io::Error,
    },
    /// A value in the file is wrong.
    #[error("{file}:{line}:{column}: {message}")]
    Field {
        /// The file.
        file: String,
        /// Line number, 1-based.
        line: u64,
        /// Column (field) number, 1-based.
        column: usize,
        /// What is wrong and what is expected.
        message: String,
    },
    /// A line of the file is wrong as a whole.
    #[error("{file}:{line}: {message}")]
    Line {
        /// The file.
        file: String,
        /// Line number, 1-based.
        line: u64,
        /// What is wrong and what is expected.
        message: String,
    },
    /// Something is missing from the file, or it does not fit the request.
    #[error("{file}: {message}")]
    File {
        /// The file.
        file: String,
        /// What is wrong and what is expected.
        message: String,
    },
    /// The data could not be rated.
    #[error("{file}: {source}")]
    Rating {
        /// The file.
        file: String,
        /// The cause.
        #[source]
        source: InvalidInput,
    },
}

/// How the catches in a file are measured.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CatchUnit {
    /// Volume in millilitres (needs the can opening).
    Millilitres,
    /// Depth in millimetres.
    Millimetres,
    /// Depth in inches.
    Inches,
}

/// One can of a radial leg.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RadialCan {
    /// Distance from the head, m.
    pub distance_m: f64,
    /// Application rate, mm/h.
    pub rate_mm_h: f64,
    /// Line in the file.
    pub line: u64,
}

/// One can of a grid.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GridCan {
    /// x position, m.
    pub x_m: f64,
    /// y position, m.
    pub y_m: f64,
    /// Application rate, mm/h.
    pub rate_mm_h: f64,
    /// Line in the file.
    pub line: u64,
}

/// The cans of a test.
#[derive(Debug, Clone, PartialEq)]
pub enum CatchSet {
    /// Cans along a line from one head.
    Radial(Vec<RadialCan>),
    /// Cans on a grid.
    Grid(Vec<GridCan>),
}

/// A catch-can test read from a file.
#[derive(Debug, Clone, PartialEq)]
pub struct CatchCanData {
    /// Where it came from (for messages).
    pub source: String,
    /// Test duration, s.
    pub duration_s: f64,
    /// Can opening area, m², when given.
    pub can_area_m2: Option<f64>,
    /// How the catches were measured.
    pub unit: CatchUnit,
    /// The cans, with catches converted to rates.
    pub cans: CatchSet,
}

impl CatchCanData {
    /// All rates, mm/h, in file order.
    pub fn rates_mm_h(&self) -> Vec<f64> {
        match &self.cans {
            CatchSet::Radial(c) => c.iter().map(|c| c.rate_mm_h).collect(),
            CatchSet::Grid(c) => c.iter().map(|c| c.rate_mm_h).collect(),
        }
    }
}

/// Reads a catch-can test from the CSV file at `path`.
pub fn read_catch_cans(path: &Path) -> Result<CatchCanData, CatchCanError> {
    let file = path.display().to_string();
    let text = std::fs::read_to_string(path).map_err(|source| CatchCanError::Read {
        file: file.clone(),
        source,
    })?;
    parse_catch_cans(&text, &file)
}

enum Column {
    Distance(f64),
    X(f64),
    Y(f64),
    Catch(CatchUnit),
}

fn parse_header_field(name: &str) -> Option<Column> {
    let name = name.to_ascii_lowercase();
    Some(match name.as_str() {
        "distance_m" => Column::Distance(1.0),
        "distance_ft" => Column::Distance(0.3048),
        "x_m" => Column::X(1.0),
        "x_ft" => Column::X(0.3048),
        "y_m" => Column::Y(1.0),
        "y_ft" => Column::Y(0.3048),
        "catch_ml" => Column::Catch(CatchUnit::Millilitres),
        "catch_mm" => Column::Catch(CatchUnit::Millimetres),
        "catch_in" => Column::Catch(CatchUnit::Inches),
        _ => return None,
    })
}

struct Header {
    /// Metres per file unit for distance (radial) or x and y (grid).
    distance: Option<f64>,
    x: Option<f64>,
    y: Option<f64>,
    unit: CatchUnit,
}

/// Parses catch-can CSV `text`; `file` names it in messages.
pub fn parse_catch_cans(text: &str, file: &str) -> Result<CatchCanData, CatchCanError> {
    let field_err = |line: u64, column: usize, message: String| CatchCanError::Field {
        file: file.to_string(),
        line,
        column,
        message,
    };
    let mut duration_s: Option<f64> = None;
    let mut area_m2: Option<(f64, u64)> = None;
    let mut header: Option<(Header, u64)> = None;
    let mut rows: Vec<(u64, Vec<f64>)> = Vec::new();
    // Each line is read as one CSV record, so line numbers are the file's own
    // (the CSV reader counts from where it started, before skipped lines).
    for (index, raw_line) in text.lines().enumerate() {
        let line = index as u64 + 1;
        if raw_line.trim_start().starts_with('#') || raw_line.trim().is_empty() {
            continue;
        }
        let mut reader = csv::ReaderBuilder::new()
            .has_headers(false)
            .flexible(true)
            .trim(csv::Trim::All)
            .from_reader(raw_line.as_bytes());
        let mut record = csv::StringRecord::new();
        match reader.read_record(&mut record) {
            Ok(true) => {}
            Ok(false) => continue,
            Err(e) => {
                return Err(CatchCanError::Line {
                    file: file.to_string(),
                    line,
                    message: format!("not readable as CSV: {e}"),
                })
            }
        }
        // Strip trailing comments inside a field ("30 # min") and empty cells.
        let fields: Vec<&str> = record
            .iter()
            .map(|f| f.split('#').next().unwrap_or("").trim())
            .collect();
        if fields.iter().all(|f| f.is_empty()) {
            continue;
        }
        let first = fields.first().copied().unwrap_or("");
        let number = |col: usize, what: &str| -> Result<f64, CatchCanError> {
            let raw = fields.get(col).copied().unwrap_or("");
            if raw.is_empty() {
                return Err(field_err(line, col + 1, format!("{what} is missing")));
            }
            match raw.parse::<f64>() {
                Ok(v) if v.is_finite() && v.abs() > 1e9 => Err(field_err(
                    line,
                    col + 1,
                    format!("{what} '{raw}' is too large to rate (more than 1e9)"),
                )),
                Ok(v) if v != 0.0 && v.abs() < 1e-9 => Err(field_err(
                    line,
                    col + 1,
                    format!(
                        "{what} '{raw}' is too small to rate (less than 1e-9; write 0 for none)"
                    ),
                )),
                Ok(v) if v.is_finite() => Ok(v),
                _ => Err(field_err(
                    line,
                    col + 1,
                    format!("{what} '{raw}' is not a number"),
                )),
            }
        };
        if header.is_none() {
            match first.to_ascii_lowercase().as_str() {
                "duration" | "can_diameter" | "can_area" => {
                    let value = number(1, &format!("the {first} value"))?;
                    if value <= 0.0 {
                        return Err(field_err(
                            line,
                            2,
                            format!("the {first} must be positive, not {value}"),
                        ));
                    }
                    let unit = fields.get(2).copied().unwrap_or("");
                    let factor = match (first.to_ascii_lowercase().as_str(), unit) {
                        ("duration", "s") => 1.0,
                        ("duration", "min") => 60.0,
                        ("duration", "h") => 3600.0,
                        ("can_diameter", "mm") => 1e-3,
                        ("can_diameter", "cm") => 1e-2,
                        ("can_diameter", "in") => 0.0254,
                        ("can_area", "mm2") => 1e-6,
                        ("can_area", "cm2") => 1e-4,
                        ("can_area", "in2") => 0.0254 * 0.0254,
                        (name, _) => {
                            let allowed = match name {
                                "duration" => "s, min or h",
                                "can_diameter" => "mm, cm or in",
                                _ => "mm2, cm2 or in2",
                            };
                            return Err(field_err(
                                line,
                                3,
                                format!("unit '{unit}' for {name}: expected {allowed}"),
                            ));
                        }
                    };
                    match first.to_ascii_lowercase().as_str() {
                        "duration" => duration_s = Some(value * factor),
                        "can_diameter" => {
                            let d = value * factor;
                            area_m2 = Some((PI * d * d / 4.0, line));
                        }
                        _ => area_m2 = Some((value * factor, line)),
                    }
                }
                _ => {
                    let mut h = Header {
                        distance: None,
                        x: None,
                        y: None,
                        unit: CatchUnit::Millimetres,
                    };
                    let mut catch = false;
                    for (i, name) in fields.iter().enumerate() {
                        match parse_header_field(name) {
                            Some(Column::Distance(f)) if i == 0 => h.distance = Some(f),
                            Some(Column::X(f)) if i == 0 => h.x = Some(f),
                            Some(Column::Y(f)) if i == 1 && h.x.is_some() => h.y = Some(f),
                            Some(Column::Catch(u))
                                if (i == 1 && h.distance.is_some())
                                    || (i == 2 && h.y.is_some()) =>
                            {
                                h.unit = u;
                                catch = true;
                            }
                            _ => {
                                return Err(field_err(
                                    line,
                                    i + 1,
                                    format!(
                                        "'{name}' is not a setting or an expected column; \
                                         settings are duration, can_diameter, can_area; \
                                         the table header is distance_m,catch_ml (or _ft, \
                                         _mm, _in) or x_m,y_m,catch_ml"
                                    ),
                                ))
                            }
                        }
                    }
                    if !catch {
                        return Err(CatchCanError::Line {
                            file: file.to_string(),
                            line,
                            message: "the table header has no catch column \
                                      (catch_ml, catch_mm or catch_in)"
                                .to_string(),
                        });
                    }
                    header = Some((h, line));
                }
            }
            continue;
        }
        let width = if header.as_ref().is_some_and(|(h, _)| h.distance.is_some()) {
            2
        } else {
            3
        };
        if fields.len() > width && fields.iter().skip(width).any(|f| !f.is_empty()) {
            return Err(field_err(
                line,
                width + 1,
                format!("unexpected value: this table has {width} columns"),
            ));
        }
        let mut values = Vec::with_capacity(width);
        for col in 0..width {
            let what = match (width, col) {
                (2, 0) => "the distance",
                (3, 0) => "x",
                (3, 1) => "y",
                _ => "the catch",
            };
            let v = number(col, what)?;
            if col + 1 == width && v < 0.0 {
                return Err(field_err(
                    line,
                    col + 1,
                    format!("the catch {v} is negative"),
                ));
            }
            if width == 2 && col == 0 && v < 0.0 {
                return Err(field_err(
                    line,
                    1,
                    format!("the distance {v} is negative: measure it from the head"),
                ));
            }
            values.push(v);
        }
        rows.push((line, values));
    }

    let missing = |message: &str| CatchCanError::File {
        file: file.to_string(),
        message: message.to_string(),
    };
    let (header, header_line) =
        header.ok_or_else(|| missing("no table header (e.g. distance_m,catch_ml) was found"))?;
    let duration =
        duration_s.ok_or_else(|| missing("the test duration is missing (e.g. duration,30,min)"))?;
    let depth_per_unit_m = match header.unit {
        CatchUnit::Millimetres => 1e-3,
        CatchUnit::Inches => 0.0254,
        CatchUnit::Millilitres => match area_m2 {
            Some((a, _)) => 1e-6 / a,
            None => {
                return Err(CatchCanError::Line {
                    file: file.to_string(),
                    line: header_line,
                    message: "catches in mL need the can opening: add can_diameter \
                              (e.g. can_diameter,100,mm) or can_area before the table"
                        .to_string(),
                })
            }
        },
    };
    if rows.len() < 2 {
        return Err(missing("at least two cans are needed"));
    }
    let rate = |catch: f64| catch * depth_per_unit_m / duration * M_S_TO_MM_H;
    let cans = if let Some(f) = header.distance {
        CatchSet::Radial(
            rows.iter()
                .map(|(line, v)| RadialCan {
                    distance_m: v.first().copied().unwrap_or(0.0) * f,
                    rate_mm_h: rate(v.get(1).copied().unwrap_or(0.0)),
                    line: *line,
                })
                .collect(),
        )
    } else {
        let (fx, fy) = (header.x.unwrap_or(1.0), header.y.unwrap_or(1.0));
        CatchSet::Grid(
            rows.iter()
                .map(|(line, v)| GridCan {
                    x_m: v.first().copied().unwrap_or(0.0) * fx,
                    y_m: v.get(1).copied().unwrap_or(0.0) * fy,
                    rate_mm_h: rate(v.get(2).copied().unwrap_or(0.0)),
                    line: *line,
                })
                .collect(),
        )
    };
    Ok(CatchCanData {
        source: file.to_string(),
        duration_s: duration,
        can_area_m2: area_m2.map(|(a, _)| a),
        unit: header.unit,
        cans,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    const LEG: &str = "\
# test
duration,30,min
can_diameter,100,mm
distance_m,catch_ml
0.5,10
1.0,20 # a note
1.5,30
";

    #[test]
    fn reads_a_leg_in_millilitres() {
        let d = parse_catch_cans(LEG, "leg.csv").unwrap();
        assert_eq!(d.unit, CatchUnit::Millilitres);
        let CatchSet::Radial(cans) = &d.cans else {
            panic!("not radial")
        };
        assert_eq!(cans.len(), 3);
        assert_eq!(cans[1].line, 6);
        // 20 mL over a 100 mm can: 20e-6 / (π 0.05²) m = 2.546 mm in 0.5 h → 5.093 mm/h.
        let expect = 20e-6 / (PI * 0.05 * 0.05) * 1e3 / 0.5;
        assert!((cans[1].rate_mm_h - expect).abs() < 1e-9);
    }

    #[test]
    fn errors_name_file_line_and_column() {
        let bad = LEG.replace("1.5,30", "1.5,thirty");
        let e = parse_catch_cans(&bad, "leg.csv").unwrap_err().to_string();
        assert_eq!(e, "leg.csv:7:2: the catch 'thirty' is not a number");
        let bad = LEG.replace("30,min", "30,fortnights");
        let e = parse_catch_cans(&bad, "leg.csv").unwrap_err().to_string();
        assert!(e.starts_with("leg.csv:2:3: unit 'fortnights'"), "{e}");
        let bad = LEG.replace("can_diameter,100,mm\n", "");
        let e = parse_catch_cans(&bad, "leg.csv").unwrap_err().to_string();
        assert!(
            e.starts_with("leg.csv:3: catches in mL need the can opening"),
            "{e}"
        );
        let bad = LEG.replace("duration,30,min\n", "");
        let e = parse_catch_cans(&bad, "leg.csv").unwrap_err().to_string();
        assert!(e.contains("duration is missing"), "{e}");
        let bad = LEG.replace("distance_m,catch_ml", "distance_m,catch_litres");
        let e = parse_catch_cans(&bad, "leg.csv").unwrap_err().to_string();
        assert!(e.starts_with("leg.csv:4:2: 'catch_litres'"), "{e}");
        let bad = LEG.replace("0.5,10", "-0.5,10");
        let e = parse_catch_cans(&bad, "leg.csv").unwrap_err().to_string();
        assert!(e.starts_with("leg.csv:5:1:"), "{e}");
        let bad = LEG.replace("0.5,10", "0.5,10,3");
        let e = parse_catch_cans(&bad, "leg.csv").unwrap_err().to_string();
        assert!(e.starts_with("leg.csv:5:3:"), "{e}");
    }

    #[test]
    fn missing_file_is_named() {
        let e = read_catch_cans(Path::new("/nonexistent/cans.csv"))
            .unwrap_err()
            .to_string();
        assert!(e.starts_with("/nonexistent/cans.csv: cannot read"), "{e}");
    }
}

//! Readings files: CSV with the unit in each column's header.
//!
//! ```text
//! # Lines starting with '#' are comments; blank lines are skipped.
//! time,pressure_kPa,rpm,flow_L_min
//! 2026-05-10T09:30,150,21.4,9.8
//! 2026-05-10T09:40,250,27.9,12.6
//! ```
//!
//! Columns (the header's case does not matter; other columns are ignored,
//! so a unit's log written by `check --log` reads back):
//!
//! - pressure: `pressure_kPa`, `pressure_psi`, `pressure_bar` or `pressure_Pa` (required for `fit`);
//! - speed: `rpm`;
//! - flow (optional, an empty cell for none): `flow_L_min`, `flow_gpm` or `flow_m3_s`;
//! - `time` (optional): ISO 8601 date or date-time, kept as written;
//! - `time_s`: seconds after the water was shut off (coast-down readings).
//!
//! Errors name the file, line and column.

use super::fit::SpeedReading;
use crate::units::factor::{PSI_PA, US_GALLON_M3};

/// One US gallon per minute in m³/s.
const GPM_M3_S: f64 = US_GALLON_M3 / 60.0;

/// A readings file that cannot be used.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("{file}:{line}:{column}: {message}")]
pub struct ReadingsError {
    /// The file.
    pub file: String,
    /// Line, 1-based.
    pub line: usize,
    /// Column, 1-based (0 for the whole line).
    pub column: usize,
    /// What is wrong and what is expected.
    pub message: String,
}

#[derive(Debug, Clone, Copy, PartialEq)]
enum Col {
    Pressure(f64),
    Rpm,
    Flow(f64),
    Time,
    TimeS,
    Other,
}

fn column(name: &str) -> Col {
    match name.trim().to_ascii_lowercase().as_str() {
        "pressure_kpa" => Col::Pressure(1e3),
        "pressure_psi" => Col::Pressure(PSI_PA),
        "pressure_bar" => Col::Pressure(1e5),
        "pressure_pa" => Col::Pressure(1.0),
        "rpm" => Col::Rpm,
        "flow_l_min" => Col::Flow(1e-3 / 60.0),
        "flow_gpm" => Col::Flow(GPM_M3_S),
        "flow_m3_s" => Col::Flow(1.0),
        "time" => Col::Time,
        "time_s" => Col::TimeS,
        _ => Col::Other,
    }
}

/// One row of a readings file, in SI.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Row {
    /// Line number in the file.
    pub line: usize,
    /// Inlet pressure, Pa.
    pub pressure_pa: Option<f64>,
    /// Speed, rpm.
    pub rpm: Option<f64>,
    /// Flow, m³/s.
    pub flow_m3_s: Option<f64>,
    /// ISO 8601 time as written.
    pub time: Option<String>,
    /// Seconds after shut-off.
    pub time_s: Option<f64>,
}

/// The cells of one CSV line (quoted cells may hold commas).
fn split(line: &str) -> Vec<String> {
    let mut reader = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .trim(csv::Trim::All)
        .from_reader(line.as_bytes());
    let mut record = csv::StringRecord::new();
    match reader.read_record(&mut record) {
        Ok(true) => record.iter().map(|c| c.trim().to_string()).collect(),
        _ => line.split(',').map(|c| c.trim().to_string()).collect(),
    }
}

/// Parse a readings file's text into rows (every recognised column).
pub fn parse_rows(file: &str, text: &str) -> Result<Vec<Row>, ReadingsError> {
    let err = |line: usize, column: usize, message: String| ReadingsError {
        file: file.to_string(),
        line,
        column,
        message,
    };
    let mut header: Option<Vec<Col>> = None;
    let mut rows = Vec::new();
    for (i, raw) in text.lines().enumerate() {
        let line = i + 1;
        let t = raw.trim();
        if t.is_empty() || t.starts_with('#') {
            continue;
        }
        let cells = split(t);
        let Some(cols) = &header else {
            let cols: Vec<Col> = cells.iter().map(|c| column(c)).collect();
            if !cols.iter().any(|c| matches!(c, Col::Rpm)) {
                return Err(err(
                    line,
                    0,
                    format!(
                        "the header `{t}` has no `rpm` column; write e.g. `time,pressure_kPa,rpm,flow_L_min` (pressure_kPa | pressure_psi | pressure_bar, flow_L_min | flow_gpm)"
                    ),
                ));
            }
            header = Some(cols);
            continue;
        };
        let mut row = Row {
            line,
            ..Row::default()
        };
        for (k, (cell, col)) in cells.iter().zip(cols).enumerate() {
            if cell.is_empty() || matches!(col, Col::Other) {
                continue;
            }
            let number = || -> Result<f64, ReadingsError> {
                cell.parse::<f64>()
                    .ok()
                    .filter(|v| v.is_finite())
                    .ok_or_else(|| err(line, k + 1, format!("`{cell}` is not a number")))
            };
            match *col {
                Col::Pressure(f) => row.pressure_pa = Some(number()? * f),
                Col::Rpm => row.rpm = Some(number()?),
                Col::Flow(f) => row.flow_m3_s = Some(number()? * f),
                Col::TimeS => row.time_s = Some(number()?),
                Col::Time => {
                    if !iso_like(cell) {
                        return Err(err(
                            line,
                            k + 1,
                            format!("`{cell}` is not an ISO 8601 date or date-time (e.g. 2026-05-10 or 2026-05-10T09:30)"),
                        ));
                    }
                    row.time = Some(cell.clone());
                }
                Col::Other => {}
            }
        }
        rows.push(row);
    }
    if header.is_none() {
        return Err(err(1, 0, "no header line and no readings".into()));
    }
    Ok(rows)
}

/// True for `YYYY-MM-DD` optionally followed by `T` or a space and a time.
pub fn iso_like(s: &str) -> bool {
    let b = s.as_bytes();
    let date_ok = b.len() >= 10
        && b.iter().take(10).enumerate().all(|(i, c)| match i {
            4 | 7 => *c == b'-',
            _ => c.is_ascii_digit(),
        });
    if !date_ok {
        return false;
    }
    let month: u32 = s.get(5..7).and_then(|m| m.parse().ok()).unwrap_or(0);
    let day: u32 = s.get(8..10).and_then(|m| m.parse().ok()).unwrap_or(0);
    if !(1..=12).contains(&month) || !(1..=31).contains(&day) {
        return false;
    }
    match b.get(10) {
        None => true,
        Some(b'T') | Some(b' ') => s
            .get(11..)
            .is_some_and(|t| t.len() >= 5 && t.as_bytes().get(2) == Some(&b':')),
        _ => false,
    }
}

/// Speed readings for `fit`: every row needs a pressure and an rpm.
pub fn speed_readings(file: &str, text: &str) -> Result<Vec<SpeedReading>, ReadingsError> {
    let rows = parse_rows(file, text)?;
    let missing = |line: usize, what: &str| ReadingsError {
        file: file.to_string(),
        line,
        column: 0,
        message: format!("{what} is missing (a pressure column and rpm are needed on every row)"),
    };
    let out = rows
        .into_iter()
        .map(|r| {
            Ok(SpeedReading {
                inlet_pressure_pa: r
                    .pressure_pa
                    .ok_or_else(|| missing(r.line, "the pressure"))?,
                rpm: r.rpm.ok_or_else(|| missing(r.line, "the rpm"))?,
                flow_m3_s: r.flow_m3_s,
                time: r.time,
            })
        })
        .collect::<Result<Vec<_>, ReadingsError>>()?;
    if out.is_empty() {
        return Err(ReadingsError {
            file: file.to_string(),
            line: 1,
            column: 0,
            message: "no readings below the header".into(),
        });
    }
    Ok(out)
}

/// Coast-down readings: (seconds after shut-off, rpm) from `time_s` and `rpm`.
pub fn coast_readings(file: &str, text: &str) -> Result<Vec<(f64, f64)>, ReadingsError> {
    parse_rows(file, text)?
        .into_iter()
        .map(|r| match (r.time_s, r.rpm) {
            (Some(t), Some(n)) => Ok((t, n)),
            _ => Err(ReadingsError {
                file: file.to_string(),
                line: r.line,
                column: 0,
                message: "a coast-down row needs `time_s` (seconds after shut-off) and `rpm`"
                    .into(),
            }),
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn units_in_the_header() {
        let text = "# a log\nTime,Pressure_psi,rpm,flow_gpm,note\n2026-05-10T09:30,40,30.5,3.0,ok\n2026-05-11,50,33,,\n";
        let r = speed_readings("log.csv", text).unwrap();
        assert_eq!(r.len(), 2);
        // 40 psi = 275.79 kPa (NIST SP 811 psi factor); 3 gpm = 0.18927 L/s.
        assert!((r[0].inlet_pressure_pa - 275_790.3).abs() < 0.1);
        assert!((r[0].flow_m3_s.unwrap() - 3.0 * 3.785_411_784e-3 / 60.0).abs() < 1e-12);
        assert_eq!(r[1].flow_m3_s, None);
        assert_eq!(r[0].time.as_deref(), Some("2026-05-10T09:30"));
    }

    #[test]
    fn errors_name_line_and_column() {
        let e = speed_readings("r.csv", "pressure_kPa,rpm\n200,fast\n").unwrap_err();
        assert_eq!((e.line, e.column), (2, 2));
        assert!(e.to_string().starts_with("r.csv:2:2:"), "{e}");
        let e = speed_readings("r.csv", "pressure,rpm\n200,30\n").unwrap_err();
        assert!(e.message.contains("pressure"), "{e}");
        let e = speed_readings("r.csv", "time,pressure_kPa,rpm\n10/05/2026,200,30\n").unwrap_err();
        assert!(e.message.contains("ISO 8601"), "{e}");
        assert!(speed_readings("r.csv", "kPa\n").is_err());
    }
}

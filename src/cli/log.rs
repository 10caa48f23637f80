//! A unit's log: `check … --log unit.csv` appends one dated row per visit,
//! with the unit in each column's header, in the unit system of the file (a
//! new file takes the one chosen with `--units`). `fit` reads the log back
//! (see `inverse::readings`). Rows are only ever appended: the file's earlier
//! lines, comments included, are never rewritten.

use std::io::Write;
use std::path::Path;

use super::CliError;
use crate::inverse::field::FieldCheck;
use crate::inverse::readings::iso_like;
use crate::report::field::finding_text;
use crate::units::{format_number, to_display, Dimension as D, UnitSystem};

/// The header of a log in a unit system.
pub fn header(u: UnitSystem) -> String {
    match u {
        UnitSystem::Metric => "time,pressure_kPa,rpm,flow_L_min,design_rpm,deviation_percent,running_friction_N_m,finding",
        UnitSystem::Us => "time,pressure_psi,rpm,flow_gpm,design_rpm,deviation_percent,running_friction_lbf_in,finding",
    }
    .to_string()
}

/// The unit system of an existing log, from its header (None: not a log we wrote).
fn system_of(text: &str) -> Option<UnitSystem> {
    let head = text
        .lines()
        .map(str::trim)
        .find(|l| !l.is_empty() && !l.starts_with('#'))?
        .to_ascii_lowercase();
    if head.contains("pressure_psi") {
        Some(UnitSystem::Us)
    } else if head.contains("pressure_kpa") {
        Some(UnitSystem::Metric)
    } else {
        None
    }
}

/// Days since 1970-01-01 to a civil date (proleptic Gregorian; H. Hinnant's
/// `civil_from_days` algorithm).
fn civil_from_days(z: i64) -> (i64, u32, u32) {
    let z = z + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let y = yoe + era * 400;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let m = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    (if m <= 2 { y + 1 } else { y }, m, d)
}

/// Now, as an ISO 8601 UTC date-time (`2026-05-10T09:30:00Z`).
pub fn now_iso() -> String {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_secs() as i64);
    iso_from_unix(secs)
}

/// Seconds since 1970 UTC as an ISO 8601 date-time.
pub fn iso_from_unix(secs: i64) -> String {
    let (days, rem) = (secs.div_euclid(86_400), secs.rem_euclid(86_400));
    let (y, m, d) = civil_from_days(days);
    format!(
        "{y:04}-{m:02}-{d:02}T{:02}:{:02}:{:02}Z",
        rem / 3600,
        rem % 3600 / 60,
        rem % 60
    )
}

fn quote(text: &str) -> String {
    format!("\"{}\"", text.replace('"', "\"\""))
}

/// Append one row for a check to the log at `path` (created with a header
/// when missing). `at`: the ISO date-time to write (now when None).
pub fn append(
    path: &Path,
    check: &FieldCheck,
    at: Option<&str>,
    chosen: UnitSystem,
) -> Result<(), CliError> {
    let time = match at {
        Some(t) if iso_like(t.trim()) => t.trim().to_string(),
        Some(t) => {
            return Err(CliError::Usage(format!(
                "--at {t}: not an ISO 8601 date or date-time (e.g. 2026-05-10 or 2026-05-10T09:30)"
            )))
        }
        None => now_iso(),
    };
    let existing = match std::fs::read_to_string(path) {
        Ok(text) => Some(text),
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => None,
        Err(e) => {
            return Err(CliError::Usage(format!(
                "{}: cannot read the log: {e}",
                path.display()
            )))
        }
    };
    let u = match &existing {
        Some(text) if !text.trim().is_empty() => system_of(text).ok_or_else(|| {
            CliError::Usage(format!(
                "{}: not a log written by `check --log` (its header has no pressure_kPa or pressure_psi column); choose another file",
                path.display()
            ))
        })?,
        _ => chosen,
    };
    let n = |dim: D, v: f64| format_number(to_display(dim, v, u));
    let finding = check
        .findings
        .first()
        .map_or(String::new(), |f| finding_text(f, u));
    let row = [
        time,
        n(D::Pressure, check.inlet_pressure_pa),
        format!("{:.2}", check.measured_rpm),
        check
            .flow
            .as_ref()
            .map_or(String::new(), |f| n(D::Flow, f.measured_m3_s)),
        check
            .design_rpm
            .map_or(String::new(), |r| format!("{r:.2}")),
        check.design_rpm.map_or(String::new(), |r| {
            format!("{:.2}", 100.0 * (check.measured_rpm - r) / r)
        }),
        check
            .friction
            .map(|f| f.implied_running_torque_n_m)
            .filter(|t| *t >= 0.0)
            .map_or(String::new(), |t| n(D::Torque, t)),
        quote(&finding),
    ]
    .join(",");
    let mut text = String::new();
    match &existing {
        None => {
            text.push_str(&header(u));
            text.push('\n');
        }
        Some(old) if old.trim().is_empty() => {
            text.push_str(&header(u));
            text.push('\n');
        }
        Some(old) if !old.ends_with('\n') => text.push('\n'),
        Some(_) => {}
    }
    text.push_str(&row);
    text.push('\n');
    let mut file = std::fs::OpenOptions::new()
        .create(true)
        .append(true)
        .open(path)
        .map_err(|e| CliError::Usage(format!("{}: cannot open the log: {e}", path.display())))?;
    file.write_all(text.as_bytes()).map_err(|e| {
        CliError::Usage(format!("{}: cannot append to the log: {e}", path.display()))
    })?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn unix_times_as_iso() {
        // 0 s is 1970-01-01T00:00:00Z; 1 700 000 000 s is 2023-11-14T22:13:20Z
        // (POSIX time, as `date -u -d @1700000000` prints it).
        assert_eq!(iso_from_unix(0), "1970-01-01T00:00:00Z");
        assert_eq!(iso_from_unix(1_700_000_000), "2023-11-14T22:13:20Z");
        // A leap day: 2024-02-29 is day 19 782.
        assert_eq!(iso_from_unix(19_782 * 86_400), "2024-02-29T00:00:00Z");
    }
}

//! `spinwright report`: the design as one self-contained HTML page to hand over.

use std::io::Write;
use std::path::Path;

use super::{CliError, Outcome};
use crate::report::page::{page, Job};
use crate::scenario;
use crate::units::UnitSystem;

/// Run `report`: write the page of the scenario at `path` to `out_path`
/// (atomically; an existing file is kept as `.bak`).
pub fn run(
    path: &Path,
    out_path: &Path,
    units: UnitSystem,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let sc = scenario::load_file(path)?;
    let design = sc.to_design()?;
    let file = path.display().to_string();
    let job = Job {
        file: &file,
        notes: &sc.notes,
    };
    let html = page(&design, &job, units).map_err(|e| CliError::Usage(e.to_string()))?;
    scenario::save_atomic(out_path, &html)?;
    writeln!(
        out,
        "wrote the report on {} to {}",
        design.name,
        out_path.display()
    )?;
    Ok(Outcome::Done)
}

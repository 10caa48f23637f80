//! What happens on a crash: the terminal is put back first (by the caller's
//! `restore`), then a crash report is written to the system's temporary
//! folder and its path is told to the user.
//!
//! A panic is a defect in spinwright, never the user's fault: the message
//! says so and asks for the report. The user's scenario files are never
//! touched by this path (saves are atomic, see `scenario::save_atomic`).

use std::io::Write;
use std::panic::PanicHookInfo;
use std::path::PathBuf;

/// Write a crash report for `info` into `folder`; returns its path.
pub fn write_report(
    info: &PanicHookInfo<'_>,
    folder: &std::path::Path,
) -> std::io::Result<PathBuf> {
    let stamp = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_secs());
    let path = folder.join(format!(
        "spinwright-crash-{stamp}-{}.txt",
        std::process::id()
    ));
    let mut file = std::fs::File::create(&path)?;
    let message = info
        .payload()
        .downcast_ref::<&str>()
        .map(|s| (*s).to_string())
        .or_else(|| info.payload().downcast_ref::<String>().cloned())
        .unwrap_or_else(|| "(no message)".to_string());
    let location = info.location().map_or_else(
        || "unknown".to_string(),
        |l| format!("{}:{}:{}", l.file(), l.line(), l.column()),
    );
    writeln!(
        file,
        "spinwright {} crash report",
        env!("CARGO_PKG_VERSION")
    )?;
    writeln!(file, "message: {message}")?;
    writeln!(file, "location: {location}")?;
    writeln!(
        file,
        "arguments: {:?}",
        std::env::args().collect::<Vec<_>>()
    )?;
    writeln!(
        file,
        "backtrace:\n{}",
        std::backtrace::Backtrace::force_capture()
    )?;
    file.sync_all()?;
    Ok(path)
}

/// Install the panic hook: `restore` runs first (put the terminal back), then
/// the report is written and its path printed on standard error.
pub fn install(restore: impl Fn() + Send + Sync + 'static) {
    std::panic::set_hook(Box::new(move |info| {
        restore();
        match write_report(info, &std::env::temp_dir()) {
            Ok(path) => eprintln!(
                "spinwright stopped on an internal error (a defect, not your input). \
                 A crash report was written to {}; please send it with the scenario file.",
                path.display()
            ),
            Err(e) => eprintln!(
                "spinwright stopped on an internal error (a defect, not your input): {info}; \
                 the crash report could not be written ({e})."
            ),
        }
    }));
}

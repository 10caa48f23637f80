//! Saving a file so that it is either the old version or the new one, never
//! half of each.
//!
//! The text goes to a temporary file in the same folder (so the final rename
//! stays on one file system), is flushed and synced to disk, the previous file
//! is copied to `FILE.bak`, and the temporary file is renamed over `FILE`. A
//! failure at any step before the rename leaves `FILE` untouched and removes
//! the temporary file.

use std::fs;
use std::io::{self, Write};
use std::path::{Path, PathBuf};

use super::ScenarioError;

/// Writes `text` to `path` atomically, keeping the previous file as `path.bak`
/// (e.g. `lawn.ron` → `lawn.ron.bak`). The new file keeps the old one's
/// permissions.
pub fn save_atomic(path: impl AsRef<Path>, text: &str) -> Result<(), ScenarioError> {
    save_with(path.as_ref(), |w| w.write_all(text.as_bytes()))
}

/// The backup name for `path`: the same name with `.bak` appended.
pub(crate) fn backup_path(path: &Path) -> PathBuf {
    let mut name = path.as_os_str().to_os_string();
    name.push(".bak");
    PathBuf::from(name)
}

/// [`save_atomic`] with the writing step given as a function, so tests can
/// make it fail halfway.
pub(crate) fn save_with(
    path: &Path,
    write: impl FnOnce(&mut dyn Write) -> io::Result<()>,
) -> Result<(), ScenarioError> {
    let fail = |io: io::Error| ScenarioError::Write {
        path: path.to_path_buf(),
        io,
    };
    let dir = match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p,
        _ => Path::new("."),
    };
    let previous = match fs::metadata(path) {
        Ok(meta) if meta.is_dir() => {
            return Err(fail(io::Error::other("it is a folder, not a file")));
        }
        Ok(meta) => Some(meta),
        Err(e) if e.kind() == io::ErrorKind::NotFound => None,
        Err(e) => return Err(fail(e)),
    };

    let mut tmp = tempfile::Builder::new()
        .prefix(".spinwright-")
        .suffix(".tmp")
        .tempfile_in(dir)
        .map_err(fail)?;
    write(tmp.as_file_mut()).map_err(fail)?;
    tmp.as_file_mut().flush().map_err(fail)?;
    tmp.as_file().sync_all().map_err(fail)?;

    if let Some(meta) = previous {
        fs::set_permissions(tmp.path(), meta.permissions()).map_err(fail)?;
        let bak = backup_path(path);
        let bak_fail = |io: io::Error| ScenarioError::Write {
            path: bak.clone(),
            io,
        };
        fs::copy(path, &bak).map_err(bak_fail)?;
        fs::File::open(&bak)
            .and_then(|f| f.sync_all())
            .map_err(bak_fail)?;
    } else {
        set_new_file_permissions(tmp.path()).map_err(fail)?;
    }

    tmp.persist(path).map_err(|e| fail(e.error))?;
    sync_dir(dir);
    Ok(())
}

/// A new file gets the usual rw-r--r-- instead of the temporary file's rw-------.
#[cfg(unix)]
fn set_new_file_permissions(path: &Path) -> io::Result<()> {
    use std::os::unix::fs::PermissionsExt;
    fs::set_permissions(path, fs::Permissions::from_mode(0o644))
}

#[cfg(not(unix))]
fn set_new_file_permissions(_path: &Path) -> io::Result<()> {
    Ok(())
}

/// Makes the rename itself durable where the platform allows it. A failure
/// here is not reported: the data is already safely in the file.
fn sync_dir(dir: &Path) {
    #[cfg(unix)]
    if let Ok(d) = fs::File::open(dir) {
        let _ = d.sync_all();
    }
    #[cfg(not(unix))]
    let _ = dir;
}

#[cfg(test)]
mod tests {
    use super::*;

    fn names_in(dir: &Path) -> Vec<String> {
        let mut v: Vec<String> = fs::read_dir(dir)
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect();
        v.sort();
        v
    }

    #[test]
    fn saves_and_keeps_the_previous_version() {
        let dir = tempfile::tempdir().unwrap();
        let file = dir.path().join("lawn.ron");
        save_atomic(&file, "first").unwrap();
        assert_eq!(fs::read_to_string(&file).unwrap(), "first");
        assert_eq!(names_in(dir.path()), ["lawn.ron"]);

        save_atomic(&file, "second").unwrap();
        assert_eq!(fs::read_to_string(&file).unwrap(), "second");
        assert_eq!(
            fs::read_to_string(dir.path().join("lawn.ron.bak")).unwrap(),
            "first"
        );
        assert_eq!(names_in(dir.path()), ["lawn.ron", "lawn.ron.bak"]);
    }

    #[test]
    fn a_writer_failing_midway_leaves_the_old_file_intact() {
        let dir = tempfile::tempdir().unwrap();
        let file = dir.path().join("field.ron");
        fs::write(&file, "the old scenario").unwrap();

        let err = save_with(&file, |w| {
            w.write_all(b"half of the new sce")?;
            Err(io::Error::other("disk full (simulated)"))
        })
        .unwrap_err();

        let msg = err.to_string();
        assert!(
            msg.contains("field.ron") && msg.contains("disk full"),
            "{msg}"
        );
        assert_eq!(fs::read_to_string(&file).unwrap(), "the old scenario");
        // No temporary file and no backup left behind.
        assert_eq!(names_in(dir.path()), ["field.ron"]);
    }

    #[test]
    fn refuses_a_folder_and_a_missing_folder() {
        let dir = tempfile::tempdir().unwrap();
        let err = save_atomic(dir.path(), "x").unwrap_err();
        assert!(err.to_string().contains("folder"), "{err}");
        let err = save_atomic(dir.path().join("no/such/dir/a.ron"), "x").unwrap_err();
        assert!(matches!(err, ScenarioError::Write { .. }), "{err}");
    }

    #[cfg(unix)]
    #[test]
    fn keeps_the_old_file_permissions() {
        use std::os::unix::fs::PermissionsExt;
        let dir = tempfile::tempdir().unwrap();
        let file = dir.path().join("p.ron");
        fs::write(&file, "old").unwrap();
        fs::set_permissions(&file, fs::Permissions::from_mode(0o640)).unwrap();
        save_atomic(&file, "new").unwrap();
        let mode = fs::metadata(&file).unwrap().permissions().mode() & 0o777;
        assert_eq!(mode, 0o640);
    }
}

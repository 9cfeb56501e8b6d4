//! Atomic file writing: write a temporary file in the same folder, flush and fsync it, keep the
//! previous file as `NAME.bak`, then rename the new file over the old one. A crash or a failed
//! write at any point leaves the previous file intact.

use super::problem::{self, Problem};
use std::fs::{self, File, OpenOptions};
use std::io::{self, Write};
use std::path::{Path, PathBuf};

/// Why a file could not be saved. Each message is whole: it names the file, the step and the
/// underlying error, which is kept as data (`error`) but not chained as a `source()`, so that a
/// report walking the chain does not print it twice.
#[derive(Debug, thiserror::Error)]
pub enum SaveError {
    /// The file system refused a step; `step` says which.
    #[error("{path}: could not {step}: {error}")]
    Io { path: PathBuf, step: &'static str, error: io::Error },
    /// The project breaks a rule (or would be too large) and would not load again; nothing was
    /// written.
    #[error("{path}: not saved, the project has problems:\n{}", problem::list(.problems))]
    Invalid { path: PathBuf, problems: Vec<Problem> },
    /// The project could not be turned into JSON.
    #[error("{path}: could not encode the project: {error}")]
    Encode { path: PathBuf, error: serde_json::Error },
}

/// The backup kept beside a saved file: `NAME.EXT.bak`.
pub fn backup_path(path: &Path) -> PathBuf {
    let mut name = path.file_name().map(|n| n.to_os_string()).unwrap_or_default();
    name.push(".bak");
    path.with_file_name(name)
}

/// The temporary file used while saving: `.NAME.EXT.tmp` in the same folder (so the final rename
/// stays on one file system).
pub(super) fn temp_path(path: &Path) -> PathBuf {
    let mut name = std::ffi::OsString::from(".");
    name.push(path.file_name().unwrap_or_default());
    name.push(".tmp");
    path.with_file_name(name)
}

/// Write a file atomically with `write` filling the temporary file; the previous file (if any) is
/// kept as [`backup_path`]. If `write` or any later step fails, the temporary file is removed
/// and the file at `path` is as it was.
pub fn write_atomic(path: &Path, write: impl FnOnce(&mut File) -> io::Result<()>) -> Result<(), SaveError> {
    let err =
        |step: &'static str| move |error: io::Error| SaveError::Io { path: path.to_path_buf(), step, error };
    let tmp = temp_path(path);
    // A stale temporary file from a crash is ours to replace; anything else (a folder) is not.
    if tmp.is_file() {
        fs::remove_file(&tmp).map_err(err("remove a stale temporary file"))?;
    }
    let result = (|| {
        let mut file = OpenOptions::new()
            .write(true)
            .create_new(true)
            .open(&tmp)
            .map_err(err("create the temporary file"))?;
        write(&mut file).map_err(err("write the temporary file"))?;
        file.flush().map_err(err("flush the temporary file"))?;
        file.sync_all().map_err(err("sync the temporary file to disk"))?;
        drop(file);
        if path.is_file() {
            keep_backup(path).map_err(err("keep the previous file as a backup"))?;
        }
        fs::rename(&tmp, path).map_err(err("replace the file with the new version"))?;
        sync_parent(path);
        Ok(())
    })();
    if result.is_err() && tmp.is_file() {
        let _ = fs::remove_file(&tmp);
    }
    result
}

/// Copy the file to [`backup_path`] atomically too: a plain copy killed halfway would leave a
/// truncated backup in place of a good one. The copy goes to a temporary name first, is synced,
/// then renamed over the old backup.
fn keep_backup(path: &Path) -> io::Result<()> {
    let backup = backup_path(path);
    let tmp = temp_path(&backup);
    let result = (|| {
        fs::copy(path, &tmp)?;
        File::open(&tmp)?.sync_all()?;
        fs::rename(&tmp, &backup)
    })();
    if result.is_err() && tmp.is_file() {
        let _ = fs::remove_file(&tmp);
    }
    result
}

/// Make the rename durable: sync the folder's entry list (best effort; not possible everywhere).
fn sync_parent(path: &Path) {
    if let Some(dir) = path.parent() {
        let dir = if dir.as_os_str().is_empty() { Path::new(".") } else { dir };
        if let Ok(d) = File::open(dir) {
            let _ = d.sync_all();
        }
    }
}

/// Write bytes atomically (see [`write_atomic`]).
pub fn write_bytes_atomic(path: &Path, bytes: &[u8]) -> Result<(), SaveError> {
    write_atomic(path, |f| f.write_all(bytes))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn replaces_and_keeps_a_backup() {
        let dir = tempfile::tempdir().expect("temp dir");
        let path = dir.path().join("a.aggrade");
        write_bytes_atomic(&path, b"one").expect("first save");
        assert!(!backup_path(&path).exists());
        write_bytes_atomic(&path, b"two").expect("second save");
        assert_eq!(fs::read(&path).expect("read"), b"two");
        assert_eq!(fs::read(backup_path(&path)).expect("read backup"), b"one");
        assert!(!temp_path(&path).exists());
    }

    #[test]
    fn a_failing_write_leaves_the_old_file() {
        let dir = tempfile::tempdir().expect("temp dir");
        let path = dir.path().join("a.aggrade");
        fs::write(&path, b"old").expect("seed");
        let result = write_atomic(&path, |f| {
            f.write_all(b"half")?;
            Err(io::Error::other("disk full (simulated)"))
        });
        let err = result.expect_err("must fail");
        assert!(err.to_string().contains("disk full"), "{err}");
        // The cause is in the message once and not chained again.
        assert!(std::error::Error::source(&err).is_none());
        assert_eq!(fs::read(&path).expect("read"), b"old");
        assert!(!temp_path(&path).exists(), "temporary file removed");
    }
}

//! Autosave of unsaved changes to a recovery file, and restoring it on the next start.

use super::document::Document;
use aggrade_core::model::Project;
use serde::{Deserialize, Serialize};
use std::path::{Path, PathBuf};
use std::time::Duration;

/// How often unsaved changes are written to the recovery file.
pub const AUTOSAVE_INTERVAL: Duration = Duration::from_secs(3);

/// Environment variable that moves the data folder (recovery file, settings); tests set it.
pub const DATA_DIR_ENV: &str = "AGGRADE_DATA_DIR";

/// The folder for the recovery file: `$AGGRADE_DATA_DIR`, else `$XDG_DATA_HOME/aggrade`, else
/// `~/.local/share/aggrade`, else a folder in the system temp dir.
pub fn data_dir() -> PathBuf {
    if let Some(d) = std::env::var_os(DATA_DIR_ENV).filter(|d| !d.is_empty()) {
        return PathBuf::from(d);
    }
    if let Some(d) = std::env::var_os("XDG_DATA_HOME").filter(|d| !d.is_empty()) {
        return PathBuf::from(d).join("aggrade");
    }
    if let Some(h) = std::env::var_os("HOME").filter(|d| !d.is_empty()) {
        return PathBuf::from(h).join(".local/share/aggrade");
    }
    std::env::temp_dir().join("aggrade")
}

/// What the recovery file holds.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct Recovery {
    /// The file the unsaved project belongs to, if it had one.
    pub original_path: Option<PathBuf>,
    /// The document's revision when written (lets a watcher see the newest edits are in).
    pub revision: u64,
    pub project: Project,
}

/// Writes the recovery file when the document has changed and the interval has passed.
#[derive(Debug)]
pub struct Autosaver {
    path: PathBuf,
    last_written_revision: Option<u64>,
    last_write_secs: f64,
}

impl Autosaver {
    /// An autosaver writing into `dir`.
    pub fn new(dir: &Path) -> Self {
        Autosaver {
            path: dir.join("recovery.aggrade.json"),
            last_written_revision: None,
            last_write_secs: f64::MIN,
        }
    }

    /// Where the recovery file lives.
    pub fn path(&self) -> &Path {
        &self.path
    }

    /// Call every frame with the current time in seconds: writes when due. Returns an error
    /// message when the write failed (the work stays in memory).
    pub fn tick(&mut self, doc: &Document, now_secs: f64) -> Result<bool, String> {
        if !doc.dirty {
            return Ok(false);
        }
        if self.last_written_revision == Some(doc.revision) {
            return Ok(false);
        }
        if now_secs - self.last_write_secs < AUTOSAVE_INTERVAL.as_secs_f64() {
            return Ok(false);
        }
        self.write_now(doc)?;
        self.last_write_secs = now_secs;
        Ok(true)
    }

    /// Write the recovery file at once (atomically: temp file, then rename).
    pub fn write_now(&mut self, doc: &Document) -> Result<(), String> {
        // Written from the document itself (no copy of the project): the same fields as
        // [`Recovery`], which reads it back.
        #[derive(Serialize)]
        struct RecoveryOut<'a> {
            original_path: &'a Option<PathBuf>,
            revision: u64,
            project: &'a Project,
        }
        let rec = RecoveryOut { original_path: &doc.path, revision: doc.revision, project: &doc.project };
        let json = serde_json::to_vec(&rec).map_err(|e| format!("cannot encode the recovery file: {e}"))?;
        if let Some(dir) = self.path.parent() {
            std::fs::create_dir_all(dir).map_err(|e| format!("cannot create {}: {e}", dir.display()))?;
        }
        let tmp = self.path.with_extension("tmp");
        std::fs::write(&tmp, json).map_err(|e| format!("cannot write {}: {e}", tmp.display()))?;
        std::fs::rename(&tmp, &self.path)
            .map_err(|e| format!("cannot write {}: {e}", self.path.display()))?;
        self.last_written_revision = Some(doc.revision);
        Ok(())
    }

    /// The work is safe (saved or deliberately discarded): remove the recovery file.
    pub fn clear(&mut self) {
        let _ = std::fs::remove_file(&self.path);
        self.last_written_revision = None;
    }
}

/// Read a recovery file left by a session that did not end cleanly.
pub fn find_recovery(dir: &Path) -> Option<Result<Recovery, String>> {
    let path = dir.join("recovery.aggrade.json");
    let bytes = std::fs::read(&path).ok()?;
    Some(
        serde_json::from_slice::<Recovery>(&bytes)
            .map_err(|e| format!("{}: the recovery file is damaged ({e})", path.display())),
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::gui::document::Edit;
    use aggrade_core::model::{Bed, BedId, Lithology, Section};

    #[test]
    fn writes_only_when_dirty_changed_and_due() {
        let dir = tempfile::tempdir().expect("temp dir");
        let mut s = Section::new("A");
        s.beds.push(Bed::new(BedId(1), 1.0, Lithology::Coal, None));
        let mut doc = Document::new(Project::new(vec![s]), None);
        let mut a = Autosaver::new(dir.path());
        assert_eq!(a.tick(&doc, 0.0), Ok(false), "clean document written");
        doc.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 2.5 }).expect("valid");
        assert_eq!(a.tick(&doc, 10.0), Ok(true));
        assert_eq!(a.tick(&doc, 20.0), Ok(false), "same revision written twice");
        doc.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 3.5 }).expect("valid");
        assert_eq!(a.tick(&doc, 11.0), Ok(false), "written before the interval");
        assert_eq!(a.tick(&doc, 13.5), Ok(true));
        let rec = find_recovery(dir.path()).expect("file").expect("readable");
        assert_eq!(rec.project.sections[0].beds[0].thickness_m, 3.5);
        assert_eq!(rec.revision, doc.revision);
        a.clear();
        assert!(find_recovery(dir.path()).is_none());
    }

    #[test]
    fn damaged_recovery_file_is_reported_not_panicked() {
        let dir = tempfile::tempdir().expect("temp dir");
        std::fs::write(dir.path().join("recovery.aggrade.json"), b"{\"project\": 12").expect("write");
        let err = find_recovery(dir.path()).expect("present").expect_err("damaged");
        assert!(err.contains("damaged"), "{err}");
    }
}

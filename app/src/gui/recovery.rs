//! Autosave of unsaved work, one backup per window, and finding the backups of windows that did
//! not close normally.
//!
//! Each window writes its unsaved work to a backup of its own in `DATA_DIR/recovery/`, named by
//! the project's file (`file-HASH.json`) or, for a project not yet saved or a file open in two
//! windows, by the window (`window-PID-NANOS.json`). Beside each backup a lock file is held with an
//! operating-system lock for as long as the window lives; the system releases it when the
//! process ends in any way, `kill -9` included. So a backup whose lock can be taken belongs to a
//! window that is gone, and is offered back; one whose lock is held belongs to a window still
//! open, and is left alone. Discarding one backup never touches another's.

use super::document::Document;
use aggrade_core::model::Project;
use serde::{Deserialize, Serialize};
use std::fs::{File, OpenOptions};
use std::path::{Path, PathBuf};
use std::time::Duration;

/// How often unsaved changes are written to the backup.
pub const AUTOSAVE_INTERVAL: Duration = Duration::from_secs(3);

/// Environment variable that moves the data folder (backups, settings); tests set it.
pub const DATA_DIR_ENV: &str = "AGGRADE_DATA_DIR";

/// The backup file the previous version of Aggrade wrote (one for all windows); still offered.
const LEGACY_FILE: &str = "recovery.aggrade.json";

/// The folder for Aggrade's data: `$AGGRADE_DATA_DIR`, else `$XDG_DATA_HOME/aggrade`, else
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

/// The folder holding the backups.
pub fn backup_dir(data_dir: &Path) -> PathBuf {
    data_dir.join("recovery")
}

/// What a backup holds.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct Recovery {
    /// The file the unsaved project belongs to, if it had one.
    pub original_path: Option<PathBuf>,
    /// The document's revision when written (lets a watcher see the newest edits are in).
    pub revision: u64,
    /// When it was written, seconds since 1970 (absent in backups of older versions).
    #[serde(default)]
    pub saved_at_secs: i64,
    /// The project file as the window last read or wrote it (length and content hash): after a
    /// restore, saving still asks when the file was changed meanwhile.
    #[serde(default)]
    pub disk: Option<(u64, u64)>,
    /// Values typed in the window that did not read and were not stored, one line each.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub unstored: Vec<String>,
    pub project: Project,
}

/// A stable key for a project file: FNV-1a of its absolute path (the same in every process).
pub fn file_key(path: &Path) -> String {
    let abs = std::fs::canonicalize(path).unwrap_or_else(|_| {
        if path.is_absolute() {
            path.to_path_buf()
        } else {
            std::env::current_dir().map(|d| d.join(path)).unwrap_or_else(|_| path.to_path_buf())
        }
    });
    let mut h: u64 = 0xcbf2_9ce4_8422_2325;
    for b in abs.as_os_str().as_encoded_bytes() {
        h ^= u64::from(*b);
        h = h.wrapping_mul(0x0000_0100_0000_01b3);
    }
    format!("file-{h:016x}")
}

/// A key no other window has: the process id and the time the window started.
fn window_key() -> String {
    let nanos =
        std::time::SystemTime::now().duration_since(std::time::UNIX_EPOCH).map(|d| d.as_nanos()).unwrap_or(0);
    static COUNTER: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(0);
    let n = COUNTER.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
    format!("window-{}-{nanos}-{n}", std::process::id())
}

fn now_secs() -> i64 {
    std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs() as i64)
        .unwrap_or(0)
}

/// A held lock on one backup key; released when dropped or when the process ends.
#[derive(Debug)]
struct KeyLock {
    key: String,
    /// Holds the operating-system lock while open.
    _file: File,
}

/// Take the lock of `key` in `dir` if no living window holds it.
fn try_lock(dir: &Path, key: &str) -> std::io::Result<Option<KeyLock>> {
    std::fs::create_dir_all(dir)?;
    let file =
        OpenOptions::new().create(true).truncate(false).write(true).open(dir.join(format!("{key}.lock")))?;
    match file.try_lock() {
        // Another window may have tidied the lock file away between our open and our lock: a
        // lock on a file no longer at the path guards nothing, so it counts as not taken.
        Ok(()) if !same_file_at(&file, &dir.join(format!("{key}.lock"))) => Ok(None),
        Ok(()) => Ok(Some(KeyLock { key: key.to_string(), _file: file })),
        Err(std::fs::TryLockError::WouldBlock) => Ok(None),
        Err(std::fs::TryLockError::Error(e)) => Err(e),
    }
}

/// Is `file` still the file at `path`?
#[cfg(unix)]
fn same_file_at(file: &File, path: &Path) -> bool {
    use std::os::unix::fs::MetadataExt;
    match (file.metadata(), std::fs::metadata(path)) {
        (Ok(a), Ok(b)) => a.dev() == b.dev() && a.ino() == b.ino(),
        _ => false,
    }
}

#[cfg(not(unix))]
fn same_file_at(_file: &File, path: &Path) -> bool {
    path.exists()
}

fn json_path(dir: &Path, key: &str) -> PathBuf {
    dir.join(format!("{key}.json"))
}

/// Writes one window's unsaved work to its own backup when the document changed and the
/// interval has passed.
#[derive(Debug)]
pub struct Autosaver {
    dir: PathBuf,
    lock: Option<KeyLock>,
    /// The file the backup is keyed by (`None`: keyed by the window).
    keyed_file: Option<PathBuf>,
    /// The document's file is open in another window: this window's backup is keyed by the
    /// window instead, and saving checks the file on disk first (it always does).
    pub file_open_elsewhere: bool,
    last_written_revision: Option<u64>,
    last_write_secs: f64,
    /// Autosave is off: the work was deliberately discarded and the window is closing.
    stopped: bool,
    /// Typed values that were not stored, kept in the backup too.
    unstored: Vec<String>,
    /// A backup of a long project being written on a thread of its own.
    writing: Option<Writing>,
}

/// A backup being written off the window's thread: the revision it holds and the thread.
#[derive(Debug)]
struct Writing {
    revision: u64,
    thread: std::thread::JoinHandle<Result<(), BackupError>>,
}

/// From this many beds in the project a backup is encoded and written on a thread of its own,
/// so that the window does not wait for it (a 50,000-bed project is some 17 MB of JSON).
pub const BACKGROUND_BACKUP_MIN_BEDS: usize = 2_000;

/// What a backup file holds: the same fields as [`Recovery`], which reads it back.
#[derive(Serialize)]
struct RecoveryOut<'a> {
    original_path: &'a Option<PathBuf>,
    revision: u64,
    saved_at_secs: i64,
    disk: Option<(u64, u64)>,
    #[serde(skip_serializing_if = "<[String]>::is_empty")]
    unstored: &'a [String],
    project: &'a Project,
}

/// Encode a backup and write it atomically (temp file, then rename) to `path` in `dir`.
fn write_backup(dir: &Path, path: &Path, rec: &RecoveryOut<'_>) -> Result<(), BackupError> {
    let json = serde_json::to_vec(rec).map_err(BackupError::Encode)?;
    std::fs::create_dir_all(dir).map_err(|error| BackupError::Folder { dir: dir.to_path_buf(), error })?;
    aggrade_core::io::write_bytes_atomic(path, &json)?;
    // The atomic writer keeps the previous version as NAME.bak; a backup needs no backup.
    let _ = std::fs::remove_file(aggrade_core::io::backup_path(path));
    Ok(())
}

impl Autosaver {
    /// An autosaver writing into `DATA_DIR/recovery`, keyed by this window until the document
    /// has a file.
    pub fn new(data_dir: &Path) -> Self {
        let dir = backup_dir(data_dir);
        let lock = Self::lock_window_key(&dir);
        Autosaver {
            dir,
            lock,
            keyed_file: None,
            file_open_elsewhere: false,
            last_written_revision: None,
            last_write_secs: f64::MIN,
            stopped: false,
            unstored: Vec::new(),
            writing: None,
        }
    }

    /// Wait for a backup being written on its thread; its outcome.
    fn finish_writing(&mut self) -> Result<(), BackupError> {
        let Some(w) = self.writing.take() else { return Ok(()) };
        let done = w.thread.join().unwrap_or_else(|_| {
            Err(BackupError::Folder {
                dir: self.dir.clone(),
                error: std::io::Error::other("the backup writer stopped"),
            })
        });
        if done.is_ok() && self.last_written_revision.is_none_or(|r| r < w.revision) {
            self.last_written_revision = Some(w.revision);
        }
        done
    }

    /// The typed values that were not stored (see [`Recovery::unstored`]); a change is written
    /// at the next tick, even when the project itself is unchanged.
    pub fn set_unstored(&mut self, lines: Vec<String>) {
        if lines != self.unstored {
            self.unstored = lines;
            self.last_written_revision = None;
        }
    }

    fn lock_window_key(dir: &Path) -> Option<KeyLock> {
        // A fresh key is free unless something is badly wrong with the folder; then the next
        // write reports the error.
        (0..4).find_map(|_| try_lock(dir, &window_key()).ok().flatten())
    }

    /// Where this window's backup lives.
    pub fn path(&self) -> PathBuf {
        let key = self.lock.as_ref().map(|l| l.key.as_str()).unwrap_or("unlocked");
        json_path(&self.dir, key)
    }

    /// Key the backup by the document's file (call when the document's path may have changed:
    /// open, save as, restore). If another window holds that file's key, the file is open
    /// there too: the backup stays keyed by this window and [`Autosaver::file_open_elsewhere`]
    /// says so. Any backup already written moves to the new key.
    pub fn follow(&mut self, doc: &Document) {
        if self.keyed_file == doc.path && self.lock.is_some() {
            return;
        }
        // The backup may move: nothing may still be writing to it.
        let _ = self.finish_writing();
        let old_json = self.lock.as_ref().map(|_| self.path());
        let new_lock = match &doc.path {
            Some(p) => match try_lock(&self.dir, &file_key(p)) {
                Ok(Some(l)) => {
                    self.file_open_elsewhere = false;
                    Some(l)
                }
                _ => {
                    self.file_open_elsewhere = true;
                    None
                }
            },
            None => {
                self.file_open_elsewhere = false;
                None
            }
        };
        self.keyed_file = doc.path.clone();
        match new_lock {
            Some(l) => self.switch_to(l, old_json),
            // Keyed by the window: keep the window's own key if it has one.
            None if self.lock.as_ref().is_some_and(|l| l.key.starts_with("window-")) => {}
            None => {
                if let Some(l) = Self::lock_window_key(&self.dir) {
                    self.switch_to(l, old_json);
                }
            }
        }
        // Write under the new key at the next tick.
        self.last_written_revision = None;
        self.last_write_secs = f64::MIN;
    }

    fn switch_to(&mut self, lock: KeyLock, old_json: Option<PathBuf>) {
        let old = self.lock.replace(lock);
        if let Some(old_json) = old_json {
            let new_json = self.path();
            if old_json != new_json && old_json.exists() {
                let _ = std::fs::rename(&old_json, &new_json);
            }
        }
        if let Some(old) = old {
            let _ = std::fs::remove_file(self.dir.join(format!("{}.lock", old.key)));
        }
    }

    /// Take over a backup left by a window that is gone (its lock is already held): this
    /// window's own backup, if any, goes, and the adopted one is written over from now on.
    pub fn adopt(&mut self, found: FoundBackup, doc: &Document) {
        let _ = self.finish_writing();
        let mine = self.lock.take();
        if let Some(mine) = mine {
            let _ = std::fs::remove_file(json_path(&self.dir, &mine.key));
            let _ = std::fs::remove_file(self.dir.join(format!("{}.lock", mine.key)));
        }
        if let Some(legacy) = found.legacy_path {
            // The older single backup file: rewritten under this window's key at the next tick.
            let _ = std::fs::remove_file(legacy);
            self.lock = Self::lock_window_key(&self.dir);
        } else {
            self.lock = Some(found.lock);
        }
        self.keyed_file = None;
        self.follow(doc);
    }

    /// Call every frame with the current time in seconds: writes when due. Returns an error
    /// message when the write failed (the work stays in memory).
    ///
    /// The backup of a project of [`BACKGROUND_BACKUP_MIN_BEDS`] beds or more is written on a
    /// thread of its own; a later tick collects it (and reports its failure), and the next backup
    /// is not started before it is done.
    pub fn tick(&mut self, doc: &Document, now_secs: f64) -> Result<bool, BackupError> {
        if self.writing.as_ref().is_some_and(|w| w.thread.is_finished()) {
            self.finish_writing()?;
        }
        if self.writing.is_some() {
            return Ok(false);
        }
        if self.stopped || (!doc.dirty && self.unstored.is_empty()) {
            return Ok(false);
        }
        if self.last_written_revision == Some(doc.revision) {
            return Ok(false);
        }
        if now_secs - self.last_write_secs < AUTOSAVE_INTERVAL.as_secs_f64() {
            return Ok(false);
        }
        let beds: usize = doc.project.sections.iter().map(|s| s.beds.len()).sum();
        if beds >= BACKGROUND_BACKUP_MIN_BEDS {
            self.start_writing(doc)?;
        } else {
            self.write_now(doc)?;
        }
        self.last_write_secs = now_secs;
        Ok(true)
    }

    /// Take this window's lock if it has none yet (a backup is only written under a lock).
    fn ensure_lock(&mut self) -> Result<(), BackupError> {
        if self.lock.is_none() {
            self.lock = Self::lock_window_key(&self.dir);
        }
        if self.lock.is_none() {
            return Err(BackupError::NoLock(self.dir.clone()));
        }
        Ok(())
    }

    /// Start writing the backup on a thread of its own (the project is shared, not copied).
    fn start_writing(&mut self, doc: &Document) -> Result<(), BackupError> {
        self.finish_writing()?;
        self.ensure_lock()?;
        let (dir, path) = (self.dir.clone(), self.path());
        let original_path = doc.path.clone();
        let revision = doc.revision;
        let disk = doc.disk.as_ref().map(|d| (d.len, d.hash));
        let unstored = self.unstored.clone();
        let project = std::sync::Arc::clone(&doc.project);
        let thread = super::background::spawn("aggrade-backup", move || {
            let rec = RecoveryOut {
                original_path: &original_path,
                revision,
                saved_at_secs: now_secs(),
                disk,
                unstored: &unstored,
                project: &project,
            };
            write_backup(&dir, &path, &rec)
        })
        .map_err(|error| BackupError::Folder { dir: self.dir.clone(), error })?;
        self.writing = Some(Writing { revision, thread });
        Ok(())
    }

    /// Write the backup at once (atomically: temp file, then rename).
    pub fn write_now(&mut self, doc: &Document) -> Result<(), BackupError> {
        // A backup still being written on its thread lands first, so this one is the last.
        let _ = self.finish_writing();
        self.ensure_lock()?;
        let rec = RecoveryOut {
            original_path: &doc.path,
            revision: doc.revision,
            saved_at_secs: now_secs(),
            disk: doc.disk.as_ref().map(|d| (d.len, d.hash)),
            unstored: &self.unstored,
            project: &doc.project,
        };
        write_backup(&self.dir, &self.path(), &rec)?;
        self.last_written_revision = Some(doc.revision);
        Ok(())
    }

    /// The work is safe (saved or deliberately discarded): remove this window's backup.
    pub fn clear(&mut self) {
        // A backup still being written would otherwise land after the removal.
        let _ = self.finish_writing();
        let _ = std::fs::remove_file(self.path());
        self.last_written_revision = None;
    }

    /// The work was deliberately discarded and the window closes: remove the backup and write
    /// no more.
    pub fn discard_and_stop(&mut self) {
        self.clear();
        self.stopped = true;
    }
}

impl Drop for Autosaver {
    /// A window closing normally leaves no lock file behind (its backup, if any, stays); a
    /// backup still being written is finished first.
    fn drop(&mut self) {
        let _ = self.finish_writing();
        if let Some(l) = &self.lock {
            if !json_path(&self.dir, &l.key).exists() {
                let _ = std::fs::remove_file(self.dir.join(format!("{}.lock", l.key)));
            }
        }
    }
}

/// Why a backup could not be written or read back.
#[derive(Debug, thiserror::Error)]
pub enum BackupError {
    /// No lock could be taken on a backup file in the folder.
    #[error("cannot take a lock in {}", .0.display())]
    NoLock(PathBuf),
    /// The document would not go into JSON.
    #[error("cannot encode the backup: {0}")]
    Encode(serde_json::Error),
    /// The backup folder could not be made.
    #[error("cannot create {}: {error}", dir.display())]
    Folder { dir: PathBuf, error: std::io::Error },
    /// The core's atomic writer failed (its message names the file).
    #[error(transparent)]
    Write(#[from] aggrade_core::io::SaveError),
    /// The backup file could not be read.
    #[error("cannot read it: {0}")]
    Read(std::io::Error),
    /// The backup file does not hold a backup.
    #[error("the backup is damaged ({0})")]
    Damaged(serde_json::Error),
}

/// A backup left by a window that is gone. Its lock is held while it is offered, so no other
/// window offers it at the same time.
#[derive(Debug)]
pub struct FoundBackup {
    lock: KeyLock,
    /// The older single backup file, when this is it.
    legacy_path: Option<PathBuf>,
    /// The backup's file.
    pub path: PathBuf,
    /// What it holds, or why it cannot be read.
    pub content: Result<Recovery, BackupError>,
    /// When it was written, seconds since 1970 (from the backup, else the file's time).
    pub saved_at_secs: i64,
}

impl FoundBackup {
    /// Delete this backup (and its lock file); no other backup is touched.
    pub fn discard(self) {
        let _ = std::fs::remove_file(&self.path);
        let _ = std::fs::remove_file(aggrade_core::io::backup_path(&self.path));
        if self.legacy_path.is_none() {
            let _ = std::fs::remove_file(self.path.with_extension("lock"));
        }
    }

    /// A line describing it: the file it belongs to, when it was written, what it holds.
    pub fn describe(&self) -> String {
        let when = describe_time(self.saved_at_secs);
        match &self.content {
            Ok(r) => {
                let beds: usize = r.project.sections.iter().map(|s| s.beds.len()).sum();
                let n = r.project.sections.len();
                let of = match &r.original_path {
                    Some(p) => format!("{}", p.display()),
                    None => "a project never saved".to_string(),
                };
                format!(
                    "{of} — kept {when} — {n} section{}, {beds} bed{}",
                    if n == 1 { "" } else { "s" },
                    if beds == 1 { "" } else { "s" }
                )
            }
            Err(e) => format!("{} — kept {when} — damaged: {e}", self.path.display()),
        }
    }
}

/// "2026-12-02 14:05 UTC".
pub fn describe_time(secs: i64) -> String {
    if secs <= 0 {
        return "at an unknown time".into();
    }
    let date = aggrade_core::export::civil_date(secs);
    let day_secs = secs.rem_euclid(86_400);
    format!("{date} {:02}:{:02} UTC", day_secs / 3600, (day_secs % 3600) / 60)
}

/// The backup files in `dir` (`*.json`), sorted by name.
fn backup_files(dir: &Path) -> Vec<PathBuf> {
    let mut paths: Vec<PathBuf> = std::fs::read_dir(dir)
        .into_iter()
        .flatten()
        .flatten()
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|e| e == "json"))
        .collect();
    paths.sort();
    paths
}

/// The backups of windows that are gone, oldest first, each locked for this window while it
/// is offered. Backups of windows still open are not listed; unreadable ones are, with why.
pub fn find_backups(data_dir: &Path) -> Vec<FoundBackup> {
    let dir = backup_dir(data_dir);
    let mut found = Vec::new();
    for path in backup_files(&dir) {
        let Some(key) = path.file_stem().and_then(|s| s.to_str()).map(str::to_string) else { continue };
        let Ok(Some(lock)) = try_lock(&dir, &key) else { continue };
        found.push(read_found(path, lock, None));
    }
    // Lock files of windows that are gone and left no backup: tidied away.
    for lock in std::fs::read_dir(&dir).into_iter().flatten().flatten().map(|e| e.path()) {
        let is_lock = lock.extension().is_some_and(|e| e == "lock");
        let Some(key) = lock.file_stem().and_then(|s| s.to_str()) else { continue };
        if is_lock && key != "legacy" && !json_path(&dir, key).exists() {
            if let Ok(Some(_held)) = try_lock(&dir, key) {
                let _ = std::fs::remove_file(&lock);
            }
        }
    }
    // The single backup of the previous version, guarded by a lock of its own.
    let legacy = data_dir.join(LEGACY_FILE);
    if legacy.is_file() {
        if let Ok(Some(lock)) = try_lock(&dir, "legacy") {
            found.push(read_found(legacy.clone(), lock, Some(legacy)));
        }
    }
    found.sort_by_key(|f| f.saved_at_secs);
    found
}

fn read_found(path: PathBuf, lock: KeyLock, legacy_path: Option<PathBuf>) -> FoundBackup {
    let content = std::fs::read(&path)
        .map_err(BackupError::Read)
        .and_then(|b| serde_json::from_slice::<Recovery>(&b).map_err(BackupError::Damaged));
    let file_secs = std::fs::metadata(&path)
        .and_then(|m| m.modified())
        .ok()
        .and_then(|t| t.duration_since(std::time::UNIX_EPOCH).ok())
        .map(|d| d.as_secs() as i64)
        .unwrap_or(0);
    let saved_at_secs =
        content.as_ref().ok().map(|r| r.saved_at_secs).filter(|s| *s > 0).unwrap_or(file_secs);
    FoundBackup { lock, legacy_path, path, content, saved_at_secs }
}

/// Every backup in the data folder, whether its window is open or gone, without locking any
/// (for tests and diagnostics: what is on disk right now).
#[cfg(any(test, feature = "test-hooks"))]
pub fn read_all_backups(data_dir: &Path) -> Vec<(PathBuf, Result<Recovery, BackupError>)> {
    backup_files(&backup_dir(data_dir))
        .into_iter()
        .map(|p| {
            let r = std::fs::read(&p)
                .map_err(BackupError::Read)
                .and_then(|b| serde_json::from_slice::<Recovery>(&b).map_err(BackupError::Damaged));
            (p, r)
        })
        .collect()
}

/// The first backup left by a window that is gone (for tests and scripts); its lock is
/// released again at once.
#[cfg(any(test, feature = "test-hooks"))]
pub fn find_recovery(data_dir: &Path) -> Option<Result<Recovery, BackupError>> {
    find_backups(data_dir).into_iter().next().map(|f| f.content)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::gui::document::Edit;
    use aggrade_core::model::{Bed, BedId, Lithology, Section};

    fn doc() -> Document {
        let mut s = Section::new("A");
        s.beds.push(Bed::new(BedId(1), 1.0, Lithology::Coal, None));
        Document::new(Project::new(vec![s]), None)
    }

    #[test]
    fn writes_only_when_dirty_changed_and_due() {
        let dir = tempfile::tempdir().expect("temp dir");
        let mut doc = doc();
        let mut a = Autosaver::new(dir.path());
        assert_eq!(a.tick(&doc, 0.0).ok(), Some(false), "clean document written");
        doc.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 2.5 }).expect("valid");
        assert_eq!(a.tick(&doc, 10.0).ok(), Some(true));
        assert_eq!(a.tick(&doc, 20.0).ok(), Some(false), "same revision written twice");
        doc.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 3.5 }).expect("valid");
        assert_eq!(a.tick(&doc, 11.0).ok(), Some(false), "written before the interval");
        assert_eq!(a.tick(&doc, 13.5).ok(), Some(true));
        // Our own window holds the lock: another window finds nothing to offer.
        assert!(find_backups(dir.path()).is_empty(), "a living window's backup was offered");
        let written: Recovery =
            serde_json::from_slice(&std::fs::read(a.path()).expect("backup")).expect("readable");
        assert_eq!(written.project.sections[0].beds[0].thickness_m, 3.5);
        assert_eq!(written.revision, doc.revision);
        a.clear();
        assert!(!a.path().exists());
    }

    /// A long project's backup is encoded and written on a thread of its own: the tick that
    /// starts it returns at once, a later tick collects it, no second write starts meanwhile,
    /// and saving (clear) waits for it so that no stale backup lands after.
    #[test]
    fn a_long_project_is_backed_up_off_the_frame_and_nothing_lands_after_a_clear() {
        let dir = tempfile::tempdir().expect("temp dir");
        let mut s = Section::new("Long");
        for i in 0..BACKGROUND_BACKUP_MIN_BEDS as u64 {
            s.beds.push(Bed::new(BedId(i + 1), 0.5, Lithology::Mudstone, None));
        }
        let mut doc = Document::new(Project::new(vec![s]), None);
        let mut a = Autosaver::new(dir.path());
        doc.apply(Edit::SetThickness { bed: BedId(7), thickness_m: 2.5 }).expect("valid");
        assert_eq!(a.tick(&doc, 10.0).ok(), Some(true), "started");
        assert!(a.writing.is_some(), "written on a thread of its own");
        doc.apply(Edit::SetThickness { bed: BedId(8), thickness_m: 1.5 }).expect("valid");
        // Ticks within the interval only collect the write (none is due).
        while a.writing.is_some() {
            assert_eq!(a.tick(&doc, 11.0).ok(), Some(false), "a second write before the interval");
            std::thread::sleep(std::time::Duration::from_millis(5));
        }
        let written: Recovery =
            serde_json::from_slice(&std::fs::read(a.path()).expect("backup")).expect("readable");
        assert_eq!(written.project.sections[0].beds.len(), BACKGROUND_BACKUP_MIN_BEDS);
        assert_eq!(written.project.sections[0].beds[6].thickness_m, 2.5);
        assert_eq!(written.revision, doc.revision - 1, "the revision it was started from");
        // The next tick writes the newer edit; a clear straight after waits for that write.
        assert_eq!(a.tick(&doc, 20.0).ok(), Some(true));
        assert!(a.writing.is_some());
        assert_eq!(a.tick(&doc, 30.0).ok(), Some(false), "no second write while one runs");
        a.clear();
        assert!(a.writing.is_none());
        assert!(!a.path().exists(), "a backup landed after the clear");
    }

    #[test]
    fn a_backup_is_offered_once_its_window_is_gone_and_discarding_it_spares_the_others() {
        let dir = tempfile::tempdir().expect("temp dir");
        let mut d1 = doc();
        d1.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 2.0 }).expect("valid");
        let mut d2 = doc();
        d2.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 7.0 }).expect("valid");
        let mut a1 = Autosaver::new(dir.path());
        let mut a2 = Autosaver::new(dir.path());
        a1.write_now(&d1).expect("written");
        a2.write_now(&d2).expect("written");
        assert_ne!(a1.path(), a2.path(), "two windows share a backup");
        // Window 1 goes away without cleaning up (its lock is released, its backup stays).
        drop(a1.lock.take());
        drop(a1);
        let found = find_backups(dir.path());
        assert_eq!(found.len(), 1, "only the gone window's backup is offered");
        let t = found[0].content.as_ref().expect("readable").project.sections[0].beds[0].thickness_m;
        assert_eq!(t, 2.0);
        for f in found {
            f.discard();
        }
        // Window 2's backup is untouched.
        assert!(a2.path().exists());
        let back: Recovery = serde_json::from_slice(&std::fs::read(a2.path()).expect("kept")).expect("json");
        assert_eq!(back.project.sections[0].beds[0].thickness_m, 7.0);
    }

    #[test]
    fn a_file_open_in_two_windows_gets_two_backups() {
        let dir = tempfile::tempdir().expect("temp dir");
        let file = dir.path().join("log.aggrade");
        let mut d = doc();
        d.path = Some(file.clone());
        let mut a1 = Autosaver::new(dir.path());
        let mut a2 = Autosaver::new(dir.path());
        a1.follow(&d);
        a2.follow(&d);
        assert!(!a1.file_open_elsewhere);
        assert!(a2.file_open_elsewhere, "the second window is told the file is open elsewhere");
        assert_ne!(a1.path(), a2.path());
        assert!(a1.path().to_string_lossy().contains("file-"));
    }

    #[test]
    fn discard_and_stop_writes_no_more() {
        let dir = tempfile::tempdir().expect("temp dir");
        let mut d = doc();
        d.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 2.0 }).expect("valid");
        let mut a = Autosaver::new(dir.path());
        a.write_now(&d).expect("written");
        a.discard_and_stop();
        assert!(!a.path().exists());
        assert_eq!(a.tick(&d, 1e9).ok(), Some(false), "a discarded document was written again");
        assert!(!a.path().exists());
    }

    #[test]
    fn damaged_backup_is_reported_not_panicked() {
        let dir = tempfile::tempdir().expect("temp dir");
        std::fs::create_dir_all(backup_dir(dir.path())).expect("dir");
        std::fs::write(backup_dir(dir.path()).join("window-1-2-3.json"), b"{\"project\": 12").expect("write");
        let err = find_recovery(dir.path()).expect("present").expect_err("damaged");
        assert!(err.to_string().contains("damaged"), "{err}");
    }

    #[test]
    fn the_older_single_backup_is_still_offered() {
        let dir = tempfile::tempdir().expect("temp dir");
        let d = doc();
        let old = serde_json::json!({"original_path": null, "revision": 4, "project": &*d.project});
        std::fs::write(dir.path().join(LEGACY_FILE), old.to_string()).expect("write");
        let found = find_backups(dir.path());
        assert_eq!(found.len(), 1);
        assert!(found[0].describe().contains("never saved"), "{}", found[0].describe());
    }

    #[test]
    fn times_read_as_a_person_writes_them() {
        assert_eq!(describe_time(0), "at an unknown time");
        // 2026-12-02 14:05:00 UTC = 1796220300 (days from 1970 × 86400 + 14 h 5 min).
        assert_eq!(describe_time(1_796_220_300), "2026-12-02 14:05 UTC");
    }
}

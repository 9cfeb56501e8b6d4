//! Reading and saving project files, noticing a file changed on disk since, and recent files.

use aggrade_core::io::{LoadError, SaveError};
use aggrade_core::model::Project;
use std::path::{Path, PathBuf};

pub use super::chooser::{FileDialogs, NoSystemDialogs, SaveKind, ScriptedDialogs, SystemDialogs};

/// What a project file on disk looked like when the window last read or wrote it: saving
/// compares it with the file as it is now, so that a change made meanwhile by another program
/// (or another window, or a sync tool) is never overwritten without asking.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct DiskStamp {
    pub len: u64,
    /// FNV-1a of the whole content (a sync tool may keep the modification time).
    pub hash: u64,
}

impl DiskStamp {
    /// The stamp of the file as it is now; `Ok(None)` when there is no file at `path`.
    pub fn read(path: &Path) -> std::io::Result<Option<DiskStamp>> {
        match std::fs::read(path) {
            Ok(bytes) => Ok(Some(DiskStamp::of_bytes(&bytes))),
            Err(e) if e.kind() == std::io::ErrorKind::NotFound => Ok(None),
            Err(e) => Err(e),
        }
    }

    /// The stamp of some content.
    pub fn of_bytes(bytes: &[u8]) -> DiskStamp {
        let mut h: u64 = 0xcbf2_9ce4_8422_2325;
        for b in bytes {
            h ^= u64::from(*b);
            h = h.wrapping_mul(0x0000_0100_0000_01b3);
        }
        DiskStamp { len: bytes.len() as u64, hash: h }
    }
}

/// How the file on disk stands against what the window last read or wrote.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum DiskState {
    /// As the window left it (or never known): saving may go ahead.
    Unchanged,
    /// Changed since by something else.
    Changed,
    /// Gone: deleted, moved or renamed since.
    Missing,
}

/// Compare the file at `path` with the stamp taken when it was last read or written.
pub fn disk_state(path: &Path, known: Option<&DiskStamp>) -> DiskState {
    let Some(known) = known else { return DiskState::Unchanged };
    match DiskStamp::read(path) {
        Ok(None) => DiskState::Missing,
        Ok(Some(now)) if &now != known => DiskState::Changed,
        // Unreadable now: the save itself will say why if it fails.
        _ => DiskState::Unchanged,
    }
}

/// A path beside `path` that does not exist yet: `NAME (2).EXT`, `NAME (3).EXT` …
pub fn sibling_free_path(path: &Path) -> PathBuf {
    let stem = path.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default();
    let ext = path.extension().map(|e| e.to_string_lossy().into_owned());
    (2..)
        .map(|n| {
            let name = match &ext {
                Some(e) => format!("{stem} ({n}).{e}"),
                None => format!("{stem} ({n})"),
            };
            path.with_file_name(name)
        })
        .find(|p| !p.exists())
        .unwrap_or_else(|| path.to_path_buf())
}

/// Read a project or bed table; the error is the reader's own (its message is what a dialog shows).
pub fn open(path: &Path) -> Result<(Project, Vec<String>), LoadError> {
    aggrade_core::io::load(path).map(|l| (l.project, l.warnings.iter().map(ToString::to_string).collect()))
}

/// A project was not saved.
#[derive(Debug, thiserror::Error)]
pub enum SaveFileError {
    /// The core's atomic save refused or failed (its message names the file).
    #[error(transparent)]
    Save(#[from] SaveError),
    /// Written, but reading it back for its stamp failed.
    #[error("{}: saved, but could not be read back: {error}", path.display())]
    ReadBack { path: PathBuf, error: std::io::Error },
    /// Written, but gone at once.
    #[error("{}: saved, but the file is gone at once", path.display())]
    Gone { path: PathBuf },
}

/// Write a project with the core's atomic save (temporary file, fsync, rename; the previous file
/// kept as `NAME.bak`; a project that would not open again is refused). Returns the stamp of
/// what is now on disk.
pub fn save(path: &Path, project: &Project) -> Result<DiskStamp, SaveFileError> {
    aggrade_core::io::save_project(path, project)?;
    DiskStamp::read(path)
        .map_err(|error| SaveFileError::ReadBack { path: path.to_path_buf(), error })?
        .ok_or_else(|| SaveFileError::Gone { path: path.to_path_buf() })
}

/// How many files the Open recent list keeps.
pub const RECENT_MAX: usize = 8;

/// Open a file or folder with the system's own program for it (viewer, file manager); the
/// program runs on its own, with no console.
pub fn open_with_system(path: &Path) -> std::io::Result<()> {
    let program = if cfg!(target_os = "macos") {
        "open"
    } else if cfg!(target_os = "windows") {
        "explorer"
    } else {
        "xdg-open"
    };
    std::process::Command::new(program)
        .arg(path)
        .stdin(std::process::Stdio::null())
        .stdout(std::process::Stdio::null())
        .stderr(std::process::Stdio::null())
        .spawn()
        .map(|_| ())
}

/// Most recent first, no duplicates, at most [`RECENT_MAX`].
pub fn push_recent(recent: &mut Vec<PathBuf>, path: &Path) {
    recent.retain(|p| p != path);
    recent.insert(0, path.to_path_buf());
    recent.truncate(RECENT_MAX);
}

/// The files behind File ▸ Open recent, kept in Aggrade's data folder (`recent.json`) and shared
/// by every window. An addition takes the folder's lock, reads the list on disk, puts the file in
/// front of it and writes it back (a temporary file, then a rename), so two windows open at once
/// never drop each other's files, and a list that cannot be written is still kept in memory.
#[derive(Debug)]
pub struct RecentFiles {
    dir: PathBuf,
    list: Vec<PathBuf>,
}

impl RecentFiles {
    /// The file holding the list.
    pub const FILE: &'static str = "recent.json";
    const LOCK: &'static str = "recent.lock";

    /// The list kept in `data_dir`. `older` is a list from before it was kept there (the window
    /// state of an older version): it is taken only while the folder holds no list yet.
    pub fn load(data_dir: &Path, older: Vec<PathBuf>) -> Self {
        let mut r = RecentFiles { dir: data_dir.to_path_buf(), list: Vec::new() };
        match r.read_disk() {
            Some(list) => r.list = list,
            None => {
                for p in older.iter().rev() {
                    push_recent(&mut r.list, p);
                }
            }
        }
        r
    }

    /// The files, most recent first.
    pub fn list(&self) -> &[PathBuf] {
        &self.list
    }

    /// Read the list again (another window may have added to it); files only this window knows
    /// of stay after the ones on disk.
    pub fn refresh(&mut self) {
        if let Some(disk) = self.read_disk() {
            self.list = merged(&disk, &self.list);
        }
    }

    /// Put a file in front of the list, here and on disk (read, merge, write under the lock).
    /// An error says why the list could not be stored; the file is in the menu all the same.
    pub fn add(&mut self, path: &Path) -> Result<(), String> {
        push_recent(&mut self.list, path);
        self.store(path)
            .map_err(|e| format!("the Open recent list could not be stored in {}: {e}", self.dir.display()))
    }

    fn store(&mut self, path: &Path) -> std::io::Result<()> {
        std::fs::create_dir_all(&self.dir)?;
        let lock = std::fs::OpenOptions::new()
            .create(true)
            .truncate(false)
            .write(true)
            .open(self.dir.join(Self::LOCK))?;
        lock.lock()?;
        let mut list = merged(&self.read_disk().unwrap_or_default(), &self.list);
        push_recent(&mut list, path);
        let json = serde_json::to_string_pretty(&list).map_err(std::io::Error::other)?;
        let tmp = self.dir.join(format!("{}.{}.tmp", Self::FILE, std::process::id()));
        std::fs::write(&tmp, json)?;
        std::fs::rename(&tmp, self.dir.join(Self::FILE)).inspect_err(|_| {
            let _ = std::fs::remove_file(&tmp);
        })?;
        self.list = list;
        Ok(())
    }

    /// The list on disk; `None` when there is none (or it does not read: it is written anew).
    fn read_disk(&self) -> Option<Vec<PathBuf>> {
        let text = std::fs::read_to_string(self.dir.join(Self::FILE)).ok()?;
        serde_json::from_str::<Vec<PathBuf>>(&text).ok()
    }
}

/// `first`, then what of `then` is not in it, at most [`RECENT_MAX`].
fn merged(first: &[PathBuf], then: &[PathBuf]) -> Vec<PathBuf> {
    let mut out: Vec<PathBuf> = Vec::new();
    for p in first.iter().chain(then) {
        if !out.contains(p) {
            out.push(p.clone());
        }
    }
    out.truncate(RECENT_MAX);
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn recent_list_moves_reopened_files_to_front() {
        let mut r = Vec::new();
        for p in ["a", "b", "c", "a"] {
            push_recent(&mut r, Path::new(p));
        }
        assert_eq!(r, vec![PathBuf::from("a"), PathBuf::from("c"), PathBuf::from("b")]);
        for i in 0..20 {
            push_recent(&mut r, Path::new(&format!("f{i}")));
        }
        assert_eq!(r.len(), 8);
    }

    #[test]
    fn two_windows_adding_files_keep_each_others() {
        let dir = tempfile::tempdir().expect("temp dir");
        let mut a = RecentFiles::load(dir.path(), Vec::new());
        let mut b = RecentFiles::load(dir.path(), Vec::new());
        a.add(Path::new("/x/a.aggrade")).expect("stored");
        b.add(Path::new("/x/b.aggrade")).expect("stored");
        a.add(Path::new("/x/c.aggrade")).expect("stored");
        let want =
            [PathBuf::from("/x/c.aggrade"), PathBuf::from("/x/b.aggrade"), PathBuf::from("/x/a.aggrade")];
        assert_eq!(a.list(), want);
        let third = RecentFiles::load(dir.path(), vec![PathBuf::from("/old/one.aggrade")]);
        assert_eq!(third.list(), want, "an older list is taken only when the folder holds none");
        // The other window sees the addition once it reads the list again.
        b.refresh();
        assert_eq!(b.list(), want);
    }

    #[test]
    fn an_older_list_seeds_the_first_one_and_a_list_that_cannot_be_stored_is_kept() {
        let dir = tempfile::tempdir().expect("temp dir");
        let older = vec![PathBuf::from("/o/1.aggrade"), PathBuf::from("/o/2.aggrade")];
        let r = RecentFiles::load(dir.path(), older.clone());
        assert_eq!(r.list(), older);
        // A data folder that is a file: nothing can be written under it.
        let blocked = dir.path().join("not-a-folder");
        std::fs::write(&blocked, "x").expect("write");
        let mut r = RecentFiles::load(&blocked, Vec::new());
        let e = r.add(Path::new("/x/a.aggrade")).expect_err("cannot be stored");
        assert!(e.contains("not-a-folder"), "{e}");
        assert_eq!(r.list(), [PathBuf::from("/x/a.aggrade")]);
    }

    #[test]
    fn save_then_open_round_trips() {
        let dir = tempfile::tempdir().expect("temp dir");
        let path = dir.path().join("x.aggrade");
        let p = crate::gui::demo::demo_project();
        let stamp = save(&path, &p).expect("saved");
        assert_eq!(disk_state(&path, Some(&stamp)), DiskState::Unchanged);
        let (back, warnings) = open(&path).expect("read back");
        assert_eq!(back, p);
        assert!(warnings.is_empty());
    }

    #[test]
    fn a_file_changed_or_removed_since_is_noticed() {
        let dir = tempfile::tempdir().expect("temp dir");
        let path = dir.path().join("x.aggrade");
        let stamp = save(&path, &crate::gui::demo::demo_project()).expect("saved");
        let text = std::fs::read_to_string(&path).expect("read");
        // Another program changes one character and keeps the length.
        std::fs::write(&path, text.replacen("Brackenford", "Brackenforb", 1)).expect("write");
        assert_eq!(disk_state(&path, Some(&stamp)), DiskState::Changed);
        std::fs::remove_file(&path).expect("remove");
        assert_eq!(disk_state(&path, Some(&stamp)), DiskState::Missing);
        assert_eq!(disk_state(&path, None), DiskState::Unchanged, "a file never read is not compared");
    }

    #[test]
    fn keep_both_finds_a_free_name_beside_the_file() {
        let dir = tempfile::tempdir().expect("temp dir");
        let path = dir.path().join("Río log.aggrade");
        std::fs::write(&path, "x").expect("write");
        let free = sibling_free_path(&path);
        assert_eq!(free, dir.path().join("Río log (2).aggrade"));
        std::fs::write(&free, "y").expect("write");
        assert_eq!(sibling_free_path(&path), dir.path().join("Río log (3).aggrade"));
    }
}

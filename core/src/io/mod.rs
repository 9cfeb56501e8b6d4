//! Reading and writing files: the project JSON format and the bed-table CSV.
//!
//! PLACEHOLDER (to be replaced by the full readers): only plain project JSON is read, with no
//! validation beyond serde's.

use crate::model::Project;
use std::path::{Path, PathBuf};

/// A file read successfully, with any warnings (e.g. unknown CSV columns).
#[derive(Debug, Clone)]
pub struct Loaded {
    pub project: Project,
    pub warnings: Vec<String>,
}

/// Why a file could not be read.
#[derive(Debug, thiserror::Error)]
pub enum LoadError {
    #[error("{path}: {source}")]
    Io { path: PathBuf, source: std::io::Error },
    #[error("{path}: {message}")]
    Invalid { path: PathBuf, message: String },
}

/// Read a project file or bed-table CSV, chosen by extension.
pub fn load(path: &Path) -> Result<Loaded, LoadError> {
    let text =
        std::fs::read_to_string(path).map_err(|source| LoadError::Io { path: path.to_path_buf(), source })?;
    let project: Project = serde_json::from_str(&text)
        .map_err(|e| LoadError::Invalid { path: path.to_path_buf(), message: e.to_string() })?;
    Ok(Loaded { project, warnings: Vec::new() })
}

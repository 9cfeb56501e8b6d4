//! What the command-line tests share: running the built binary and reading what it printed.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// The built `aggrade` binary, ready for arguments.
pub fn aggrade_command() -> Command {
    Command::new(env!("CARGO_BIN_EXE_aggrade"))
}

/// Run the binary with these arguments.
pub fn aggrade(args: &[&str]) -> Output {
    aggrade_command().args(args).output().expect("the aggrade binary runs")
}

/// Run the binary with these arguments and backtraces on (a panic would show where).
pub fn run(args: &[&str]) -> Output {
    aggrade_command().args(args).env("RUST_BACKTRACE", "1").output().expect("the aggrade binary runs")
}

/// Bytes printed, as text.
pub fn text(bytes: &[u8]) -> String {
    String::from_utf8_lossy(bytes).into_owned()
}

/// What a run printed on standard output.
pub fn stdout(o: &Output) -> String {
    text(&o.stdout)
}

/// What a run printed on standard error.
pub fn stderr(o: &Output) -> String {
    text(&o.stderr)
}

/// A file under the shared test data (`tests/data/`).
pub fn fixture(rel: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../tests/data").join(rel)
}

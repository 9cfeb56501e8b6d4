//! One problem found in a file or a section: where it is (line, JSON path or CSV column) and what
//! would be valid.

use std::fmt;

/// A problem found while reading or validating, with enough context to find and fix it.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Problem {
    /// 1-based line in the file, when known.
    pub line: Option<usize>,
    /// Where in the data: a JSON path (`sections[0].beds[12].thickness_m`) or a CSV column
    /// (`column thickness_m`).
    pub location: String,
    /// What is wrong and what would be valid (`must be > 0, got -1.2`).
    pub message: String,
}

impl Problem {
    /// A problem at a location with no line number (yet).
    pub fn new(location: impl Into<String>, message: impl Into<String>) -> Self {
        Problem { line: None, location: location.into(), message: message.into() }
    }

    /// The same problem with a line number.
    pub fn at_line(mut self, line: usize) -> Self {
        self.line = Some(line);
        self
    }

    /// The same problem with its location prefixed (e.g. `sections[2].` before `beds[0].…`).
    pub fn prefixed(mut self, prefix: &str) -> Self {
        self.location = if self.location.is_empty() {
            prefix.trim_end_matches('.').to_string()
        } else {
            format!("{prefix}{}", self.location)
        };
        self
    }
}

impl fmt::Display for Problem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if let Some(line) = self.line {
            write!(f, "line {line}: ")?;
        }
        if self.location.is_empty() {
            f.write_str(&self.message)
        } else {
            write!(f, "{}: {}", self.location, self.message)
        }
    }
}

/// Join problems one per line, indented, for error messages.
pub(crate) fn list(problems: &[Problem]) -> String {
    problems.iter().map(|p| format!("  {p}")).collect::<Vec<_>>().join("\n")
}

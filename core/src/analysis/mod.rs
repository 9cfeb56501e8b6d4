//! Statistics beyond the rules: paleocurrents, facies transitions, body statistics, curves.
//!
//! Everything here is a pure function of its inputs plus one documented parameter struct; the
//! outputs are plain data that the CLI, the layout and the app present.

pub mod attitude;
pub mod bodies;
pub mod curve_table;
pub mod decompaction;
pub mod gamma;
pub mod las;
pub mod markov;
pub mod paleocurrents;

/// Why an analysis could not be carried out on the data given.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum AnalysisError {
    /// Too few values for the statistic to mean anything.
    #[error("{what}: needs at least {needed} values, got {got}")]
    TooFewValues { what: String, needed: usize, got: usize },
    /// A value outside its valid range.
    #[error("{field}: {value} is not valid; {valid}")]
    OutOfRange { field: String, value: f64, valid: String },
    /// The expected transition counts have no finite quasi-independence fit: the table is too
    /// sparse (its zero pattern drives some fitted counts to zero).
    #[error("{what} has too few transitions for expected counts under quasi-independence (the fit does not converge because some expected counts tend to zero); log more beds or merge states")]
    SparseTable { what: String },
    /// An iterative solution did not settle.
    #[error("{what}: did not converge after {iterations} iterations")]
    NoConvergence { what: String, iterations: usize },
}

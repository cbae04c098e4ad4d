//! Regression cases for knowledge-base edits: a TOML case format of our own, a parallel
//! runner that states what passed and what changed, JUnit XML, a comparison against an older
//! version of the KB, format-preserving acceptance of new outcomes, and a starter suite.
//!
//! Results are data; `cli::check` prints them and maps errors to exit codes.

pub mod accept;
mod axioms;
pub mod baseline;
pub mod diff;
pub mod init;
pub mod junit;
pub mod run;
pub mod suite;

pub use run::{CaseResult, Check, Outcome, RunOptions, Status, run_suite};
pub use suite::{CaseSpec, Expectation, Input, Suite, load_paths};

/// A malformed case or input: the message names the file, the line and what to do.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("{0}")]
pub struct CheckError(pub String);

impl From<String> for CheckError {
    fn from(s: String) -> Self {
        CheckError(s)
    }
}

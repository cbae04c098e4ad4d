//! Errors of the knowledge-base layer.

use thiserror::Error;

/// What went wrong while reading or converting an ontology.
#[derive(Debug, Error)]
pub enum KbError {
    /// The file could not be read.
    #[error("{file}: cannot read the file: {reason}. Check the path and its permissions.")]
    Unreadable {
        /// The file.
        file: String,
        /// The system's reason.
        reason: String,
    },
    /// The file is not an ontology in a syntax we read.
    #[error("{file}: {reason}")]
    Syntax {
        /// The file.
        file: String,
        /// What the parser said, with position where known, and what to do.
        reason: String,
    },
    /// The ontology uses a construct outside what the reasoner supports.
    #[error(
        "{file}: unsupported construct in axiom {axiom}: {reason}. Remove or rewrite the axiom, or pass --lenient to drop refused axioms with a warning."
    )]
    Unsupported {
        /// The file.
        file: String,
        /// The axiom, in functional syntax.
        axiom: String,
        /// Why it is refused.
        reason: String,
    },
    /// Imports form a cycle.
    #[error("{file}: import cycle: {chain}. Remove one of the owl:imports in the cycle.")]
    ImportCycle {
        /// The file that closes the cycle.
        file: String,
        /// The chain of ontologies.
        chain: String,
    },
}

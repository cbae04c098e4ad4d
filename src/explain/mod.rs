//! Abduction (explanations of observations) and justifications (why an entailment holds).
//!
//! Results are data; `cli` and `render` turn them into text.

pub mod abduce;
pub mod assertion;
pub mod case;
pub mod justify;
pub mod laconic;
pub mod why;

pub use abduce::{ExplainOptions, ExplainResult, Explanation, Problem, explain};
pub use assertion::Assertion;
pub use justify::{all_justifications, mergexplain, minimal_hitting_sets, quickxplain};

/// Our annotation vocabulary's namespace.
pub const WF: &str = "https://wherefore.example.org/ns/core#";

//! `wherefore classify`.

use clap::Args;
use std::path::PathBuf;

/// Arguments of `wherefore classify`.
#[derive(Args, Debug)]
pub struct ClassifyArgs {
    /// Ontology files (functional syntax, OWL/XML or RDF/XML).
    #[arg(required = true)]
    pub ontologies: Vec<PathBuf>,
    /// Output format.
    #[arg(long, value_enum, default_value = "text")]
    pub format: super::Format,
}

/// Runs `classify` and returns the exit code.
pub fn run(_args: ClassifyArgs) -> i32 {
    eprintln!("wherefore classify: not built yet");
    super::EXIT_BAD_INPUT
}

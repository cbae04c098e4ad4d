//! Helpers shared by the commands: loading a knowledge base with messages and exit codes,
//! limits from options, atomic writes.

use crate::kb::{KnowledgeBase, load};
use crate::reasoner::{Limits, Reasoner};
use crate::render::text::refusal_message;
use clap::Args;
use std::path::PathBuf;
use std::time::{Duration, Instant};

/// Options for loading ontologies, shared by the commands that read a KB.
#[derive(Args, Debug, Clone, Default)]
pub struct KbOptions {
    /// Folder searched for imported ontologies (besides the importing file's folder).
    #[arg(long = "import-dir", value_name = "DIR")]
    pub import_dirs: Vec<PathBuf>,
    /// Drop axioms outside the supported logic with a warning instead of failing.
    #[arg(long)]
    pub lenient: bool,
    /// XML catalog (OASIS) that maps imported ontology IRIs to files; a
    /// `catalog-v001.xml` beside an ontology is used as well.
    #[arg(long, value_name = "FILE")]
    pub catalog: Option<PathBuf>,
}

/// Resource limits shared by the commands that reason.
#[derive(Args, Debug, Clone)]
pub struct LimitOptions {
    /// Time limit in seconds for the whole command (exit code 3 when reached).
    #[arg(long, value_name = "SECONDS")]
    pub timeout: Option<f64>,
    /// Largest number of completion-graph nodes in one test (exit code 3 when reached).
    #[arg(
        long = "max-graph-nodes",
        value_name = "N",
        default_value_t = 1_000_000
    )]
    pub max_graph_nodes: usize,
}

impl LimitOptions {
    /// The limits, with the deadline counted from now.
    pub fn limits(&self) -> Limits {
        Limits {
            deadline: self
                .timeout
                .filter(|t| t.is_finite() && *t >= 0.0)
                .map(|t| Instant::now() + Duration::from_secs_f64(t.min(1e9))),
            max_nodes: self.max_graph_nodes,
            cancel: None,
        }
    }
}

/// Loads ontologies, printing warnings; on error prints the message and returns exit code 2.
pub fn load_kb(paths: &[PathBuf], opts: &KbOptions) -> Result<KnowledgeBase, i32> {
    let lo = load::LoadOptions {
        import_dirs: opts.import_dirs.clone(),
        lenient: opts.lenient,
        catalog: opts.catalog.clone(),
    };
    match load::load(paths, &lo) {
        Ok(kb) => {
            for w in &kb.warnings {
                eprintln!("warning: {w}");
            }
            Ok(kb)
        }
        Err(e) => {
            eprintln!("error: {e}");
            Err(super::EXIT_BAD_INPUT)
        }
    }
}

/// Builds a reasoner, printing a refusal with the axiom named; exit code 2.
pub fn reasoner<'kb>(kb: &'kb KnowledgeBase, files: &[PathBuf]) -> Result<Reasoner<'kb>, i32> {
    Reasoner::new(kb).map_err(|r| {
        eprintln!("error: {}", refusal_message(kb, &r, files));
        super::EXIT_BAD_INPUT
    })
}

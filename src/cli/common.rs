//! Helpers shared by the commands: loading a knowledge base with messages and exit codes,
//! limits from options, atomic writes.

use crate::kb::{KnowledgeBase, owl};
use crate::reasoner::{Limits, Reasoner, Refusal};
use clap::Args;
use std::path::{Path, PathBuf};
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
    let lo = owl::LoadOptions {
        import_dirs: opts.import_dirs.clone(),
        lenient: opts.lenient,
    };
    match owl::load(paths, &lo) {
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

/// The message for a refused knowledge base.
pub fn refusal_message(kb: &KnowledgeBase, r: &Refusal, files: &[PathBuf]) -> String {
    let file = match &r.axiom {
        Some(t) => kb
            .sources
            .iter()
            .find(|s| &s.text == t)
            .map(|s| s.file.clone()),
        None => None,
    }
    .unwrap_or_else(|| {
        files
            .iter()
            .map(|f| f.display().to_string())
            .collect::<Vec<_>>()
            .join(", ")
    });
    match &r.axiom {
        Some(a) => format!(
            "{file}: unsupported construct in axiom {a}: {}. Remove or rewrite the axiom.",
            r.reason
        ),
        None => format!(
            "{file}: {}. Remove the construct or use a reasoner for the full language.",
            r.reason
        ),
    }
}

/// Writes a file atomically: a temporary file in the same folder, then a rename. Refuses to
/// write over any of `inputs`.
pub fn write_atomic(path: &Path, bytes: &[u8], inputs: &[PathBuf]) -> Result<(), String> {
    let target = std::fs::canonicalize(path).ok();
    for i in inputs {
        if let (Some(t), Ok(ic)) = (&target, std::fs::canonicalize(i))
            && *t == ic
        {
            return Err(format!(
                "{}: refusing to overwrite an input file; choose another output path",
                path.display()
            ));
        }
    }
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().to_string())
        .unwrap_or_else(|| "out".into());
    let tmp = dir.join(format!(".{name}.{}.tmp", std::process::id()));
    std::fs::write(&tmp, bytes).map_err(|e| format!("{}: cannot write: {e}", tmp.display()))?;
    std::fs::rename(&tmp, path).map_err(|e| {
        let _ = std::fs::remove_file(&tmp);
        format!("{}: cannot write: {e}", path.display())
    })
}

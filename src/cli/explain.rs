//! `wherefore explain`: abduction from observations in an ontology file.

use super::common::{KbOptions, LimitOptions, load_kb, refusal_message};
use crate::explain::case::{self, ObservationSource};
use crate::explain::{ExplainOptions, ExplainResult, Problem, explain};
use crate::kb::{KnowledgeBase, owl};
use clap::Args;
use std::path::PathBuf;

/// Arguments of `wherefore explain`.
#[derive(Args, Debug)]
pub struct ExplainArgs {
    /// Knowledge-base ontology files.
    #[arg(required = true)]
    pub kb: Vec<PathBuf>,
    /// Ontology file whose class and property assertions are the observations.
    #[arg(long, required_unless_present = "facts", conflicts_with = "facts")]
    pub observations: Option<PathBuf>,
    /// A facts file (from `measure`): its findings are the observations, the rest background.
    #[arg(long)]
    pub facts: Option<PathBuf>,
    /// α-cut for the facts' graded relations.
    #[arg(long, default_value_t = 0.5)]
    pub alpha: f64,
    /// Abducibles: lines `class IRI`, `not-class IRI` or `property IRI`.
    #[arg(long)]
    pub abducibles: Option<PathBuf>,
    /// Largest explanation size searched.
    #[arg(long = "max-size", default_value_t = 3)]
    pub max_size: usize,
    /// Largest number of hitting-set tree nodes (exit code 3 when reached).
    #[arg(long = "max-nodes", default_value_t = 100_000)]
    pub max_nodes: usize,
    /// Output format.
    #[arg(long, value_enum, default_value = "text")]
    pub format: super::Format,
    /// Print search statistics on standard error.
    #[arg(long)]
    pub stats: bool,
    #[command(flatten)]
    kb_opts: KbOptions,
    #[command(flatten)]
    limits: LimitOptions,
}

/// Runs `explain` and returns the exit code.
pub fn run(args: ExplainArgs) -> i32 {
    let problem = match build_problem(&args) {
        Ok(p) => p,
        Err(code) => return code,
    };
    let opts = ExplainOptions {
        max_size: args.max_size,
        limits: args.limits.limits(),
        max_tree_nodes: args.max_nodes,
        alpha: args.alpha,
        ..Default::default()
    };
    let result = match explain(&problem, &opts) {
        Ok(r) => r,
        Err(r) => {
            eprintln!("error: {}", refusal_message(&problem.kb, &r, &args.kb));
            return super::EXIT_BAD_INPUT;
        }
    };
    if args.stats {
        eprintln!(
            "stats: {}",
            serde_json::to_string(&result.stats).unwrap_or_default()
        );
    }
    match args.format {
        super::Format::Json => println!("{}", result_json(&problem, &result)),
        super::Format::Text => print!("{}", result_text(&problem, &result)),
    }
    if let Some(l) = result.limit {
        eprintln!(
            "warning: the search stopped early ({l}); the list may be incomplete. Raise --timeout or --max-nodes."
        );
        return super::EXIT_LIMIT;
    }
    super::EXIT_OK
}

fn bad(msg: String) -> i32 {
    eprintln!("error: {msg}");
    super::EXIT_BAD_INPUT
}

/// Loads the KB and the observations (an ontology file or a facts file), and reads or
/// derives the abducibles.
pub fn build_problem(args: &ExplainArgs) -> Result<Problem, i32> {
    let kb = load_kb(&args.kb, &args.kb_opts)?;
    let facts;
    let file;
    let source = if let Some(fp) = &args.facts {
        if !(args.alpha > 0.0 && args.alpha <= 1.0) {
            return Err(bad(format!("--alpha {} must lie in (0, 1]", args.alpha)));
        }
        facts = crate::facts::read_facts(fp).map_err(bad)?;
        file = fp.display().to_string();
        ObservationSource::Facts(&facts, &file)
    } else if let Some(obs) = &args.observations {
        ObservationSource::File(obs)
    } else {
        return Err(bad(
            "give the observations: --observations OBS.ofn or --facts FACTS.json".into(),
        ));
    };
    let lo = owl::LoadOptions {
        import_dirs: args.kb_opts.import_dirs.clone(),
        lenient: false,
    };
    let (problem, warnings) =
        case::build_problem(&kb, source, args.abducibles.as_deref(), &lo).map_err(bad)?;
    for w in &warnings {
        eprintln!("warning: {w}");
    }
    Ok(problem)
}

/// The source texts of internal axioms, sorted and without repeats.
pub fn source_texts(kb: &KnowledgeBase, axioms: &[usize]) -> Vec<String> {
    let mut v: Vec<String> = axioms
        .iter()
        .map(|&i| kb.sources[kb.axioms[i].source].text.clone())
        .collect();
    v.sort();
    v.dedup();
    v
}

/// The contract's JSON, with our extra fields.
pub fn result_json(p: &Problem, r: &ExplainResult) -> String {
    let kb = &p.kb;
    let cs = &kb.concepts;
    let expl: Vec<serde_json::Value> = r
        .explanations
        .iter()
        .map(|e| {
            serde_json::json!({
                "assertions": e.texts,
                "size": e.size,
                "score": e.score,
                "degree": e.degree,
                "justification": source_texts(kb, &e.justification),
            })
        })
        .collect();
    let mut unexplained: Vec<String> = r.unexplained.iter().map(|a| a.text(kb, cs)).collect();
    unexplained.sort();
    let abn: Vec<serde_json::Value> = r
        .suspended
        .iter()
        .map(|&i| serde_json::json!({"suspended_default": source_texts(kb, &[i])[0]}))
        .collect();
    let v = serde_json::json!({
        "kb_consistent": r.kb_consistent,
        "already_entailed": r.already_entailed,
        "complete": r.complete,
        "explanations": expl,
        "unexplained": unexplained,
        "abnormalities": abn,
        "conflict": source_texts(kb, &r.conflict),
        "stats": r.stats,
    });
    serde_json::to_string_pretty(&v).unwrap_or_default()
}

/// The text form.
pub fn result_text(p: &Problem, r: &ExplainResult) -> String {
    use std::fmt::Write;
    let kb = &p.kb;
    let mut s = String::new();
    if !r.kb_consistent {
        let _ = writeln!(
            s,
            "The knowledge base with the case is INCONSISTENT; nothing can be explained."
        );
        let _ = writeln!(s, "A minimal conflicting set of axioms:");
        for (i, t) in source_texts(kb, &r.conflict).iter().enumerate() {
            let _ = writeln!(s, "  {}. {t}", i + 1);
        }
        return s;
    }
    for &i in &r.suspended {
        let _ = writeln!(
            s,
            "Abnormality: the case contradicts the normal-anatomy default {}; it was suspended.",
            source_texts(kb, &[i])[0]
        );
    }
    if r.already_entailed {
        let _ = writeln!(
            s,
            "The knowledge base already entails the observations; nothing to explain."
        );
        return s;
    }
    if r.explanations.is_empty() {
        let _ = writeln!(s, "No explanation up to the size bound.");
    }
    for (n, e) in r.explanations.iter().enumerate() {
        let _ = writeln!(
            s,
            "{}. score {:.3}, degree {:.3}, size {}",
            n + 1,
            e.score,
            e.degree,
            e.size
        );
        for t in &e.texts {
            let _ = writeln!(s, "     {t}");
        }
        if !e.justification.is_empty() {
            let _ = writeln!(s, "   because:");
            for t in source_texts(kb, &e.justification) {
                let _ = writeln!(s, "     - {t}");
            }
        }
    }
    if !r.unexplained.is_empty() {
        let _ = writeln!(s, "Unexplained:");
        for a in &r.unexplained {
            let _ = writeln!(s, "  {}", a.text(kb, &kb.concepts));
        }
    }
    if !r.complete {
        let _ = writeln!(
            s,
            "INCOMPLETE: a limit stopped the search; more explanations may exist."
        );
    }
    s
}

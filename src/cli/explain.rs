//! `wherefore explain`: abduction from observations in an ontology file.

use super::common::{KbOptions, LimitOptions, load_kb};
use crate::explain::case::{self, ObservationSource};
use crate::explain::{ExplainOptions, ExplainResult, Problem, explain};
use crate::kb::load;
use crate::render::text::{refusal_message, result_text, source_texts};
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
    /// How many of the best-ranked explanations get a justification.
    #[arg(long = "max-justified", value_name = "N", default_value_t = 256)]
    pub max_justified: usize,
    /// Memory budget of the search's own sets, in MiB (exit code 3 when reached).
    #[arg(long = "max-memory", value_name = "MIB", default_value_t = 512)]
    pub max_memory: usize,
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
        max_memory: args.max_memory.saturating_mul(1 << 20),
        max_justified: args.max_justified,
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
        let raise = l
            .option()
            .map(|o| format!(" Raise {o} to search further."))
            .unwrap_or_default();
        if result.complete {
            eprintln!(
                "warning: {l} while ranking; every explanation up to the size bound is listed, but some degrees are lower bounds and some justifications are missing.{raise}"
            );
        } else {
            eprintln!(
                "warning: the search stopped early ({l}); the {} explanation(s) listed are those found so far, searched smallest first, and larger ones may be missing.{raise}",
                result.explanations.len()
            );
        }
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
    let lo = load::LoadOptions {
        import_dirs: args.kb_opts.import_dirs.clone(),
        lenient: false,
        catalog: args.kb_opts.catalog.clone(),
    };
    let (problem, warnings) =
        case::build_problem(&kb, source, args.abducibles.as_deref(), &lo).map_err(bad)?;
    for w in &warnings {
        eprintln!("warning: {w}");
    }
    Ok(problem)
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
        "limit": r.limit,
        "explanations": expl,
        "unexplained": unexplained,
        "abnormalities": abn,
        "conflict": source_texts(kb, &r.conflict),
        "stats": r.stats,
    });
    serde_json::to_string_pretty(&v).unwrap_or_default()
}

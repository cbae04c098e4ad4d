//! `wherefore classify`.

use super::common::{KbOptions, LimitOptions, load_kb, reasoner};
use crate::kb::{ClassId, KnowledgeBase};
use crate::reasoner::classify;
use crate::render::text::{classification_text, short_name};
use clap::Args;
use std::path::PathBuf;
use std::time::Instant;

/// Arguments of `wherefore classify`.
#[derive(Args, Debug)]
pub struct ClassifyArgs {
    /// Ontology files in any OWL 2 syntax (functional, OWL/XML, RDF/XML, Turtle, N-Triples, Manchester), detected by content.
    #[arg(required = true)]
    pub ontologies: Vec<PathBuf>,
    /// Output format.
    #[arg(long, value_enum, default_value = "text")]
    pub format: super::Format,
    #[command(flatten)]
    kb: KbOptions,
    #[command(flatten)]
    limits: LimitOptions,
    /// Print reasoner statistics on standard error.
    #[arg(long)]
    pub stats: bool,
    /// Also give the most specific named classes of each named individual (realisation).
    #[arg(long)]
    pub realise: bool,
}

/// Runs `classify` and returns the exit code.
pub fn run(args: ClassifyArgs) -> i32 {
    let start = Instant::now();
    let kb = match load_kb(&args.ontologies, &args.kb) {
        Ok(kb) => kb,
        Err(code) => return code,
    };
    let loaded = start.elapsed();
    let mut r = match reasoner(&kb, &args.ontologies) {
        Ok(r) => r,
        Err(code) => return code,
    };
    r.limits = args.limits.limits();
    let classes = kb.signature_classes.clone();
    let result = match classify(&mut r, &classes) {
        Ok(c) => c,
        Err(limit) => {
            eprintln!(
                "error: classification stopped: {limit} after {:.2} s; no result. Raise --timeout or --max-graph-nodes.",
                start.elapsed().as_secs_f64()
            );
            return super::EXIT_LIMIT;
        }
    };
    let realisation = if args.realise {
        match crate::reasoner::realise(&mut r, &result) {
            Ok(x) => Some(x),
            Err(limit) => {
                eprintln!(
                    "error: realisation stopped: {limit}. Raise --timeout or --max-graph-nodes."
                );
                return super::EXIT_LIMIT;
            }
        }
    } else {
        None
    };
    let total = start.elapsed();
    if args.stats {
        eprintln!(
            "stats: {}",
            serde_json::to_string(&r.stats).unwrap_or_default()
        );
    }
    match args.format {
        super::Format::Json => {
            let mut v: serde_json::Value =
                serde_json::from_str(&classification_json(&kb, &result)).unwrap_or_default();
            if let Some(rz) = &realisation {
                let mut m = serde_json::Map::new();
                for (a, cs) in rz {
                    let mut names: Vec<String> = cs
                        .iter()
                        .map(|&c| kb.vocab.class_iri(c).to_string())
                        .collect();
                    names.sort();
                    m.insert(
                        kb.vocab.individual_iri(*a).to_string(),
                        serde_json::json!(names),
                    );
                }
                v["realisation"] = serde_json::Value::Object(m);
            }
            println!("{}", serde_json::to_string_pretty(&v).unwrap_or_default());
        }
        super::Format::Text => {
            print!("{}", classification_text(&kb, &result, &classes));
            if let Some(rz) = &realisation {
                println!("Most specific classes of each individual:");
                for (a, cs) in rz {
                    let names: Vec<String> = cs
                        .iter()
                        .map(|&c| short_name(kb.vocab.class_iri(c)))
                        .collect();
                    println!(
                        "  {}: {}",
                        short_name(kb.vocab.individual_iri(*a)),
                        names.join(", ")
                    );
                }
            }
            eprintln!(
                "classified {} classes in {:.1} ms (loading {:.1} ms, reasoning {:.1} ms, {} tableau tests)",
                classes.len(),
                total.as_secs_f64() * 1e3,
                loaded.as_secs_f64() * 1e3,
                (total - loaded).as_secs_f64() * 1e3,
                r.stats.tests
            );
        }
    }
    super::EXIT_OK
}

/// The contract's JSON form of a classification.
pub fn classification_json(kb: &KnowledgeBase, c: &classify::Classification) -> String {
    let iri = |x: ClassId| kb.vocab.class_iri(x).to_string();
    let mut unsat: Vec<String> = c.unsatisfiable.iter().map(|&x| iri(x)).collect();
    unsat.sort();
    let mut subs: Vec<(String, String)> = c
        .subsumptions
        .iter()
        .map(|&(a, b)| (iri(a), iri(b)))
        .collect();
    subs.sort();
    let mut v = serde_json::json!({
        "consistent": c.consistent,
        "unsatisfiable": unsat,
        "subsumptions": subs.iter().map(|(a, b)| vec![a.clone(), b.clone()]).collect::<Vec<_>>(),
    });
    if kb.incomplete {
        v["incomplete"] = serde_json::json!(true);
        v["warnings"] = serde_json::json!(kb.warnings);
    }
    serde_json::to_string_pretty(&v).unwrap_or_default()
}

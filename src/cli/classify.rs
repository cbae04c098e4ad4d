//! `wherefore classify`.

use super::common::{KbOptions, LimitOptions, load_kb, reasoner};
use crate::kb::{ClassId, KnowledgeBase};
use crate::reasoner::classify;
use clap::Args;
use std::path::PathBuf;
use std::time::Instant;

/// Arguments of `wherefore classify`.
#[derive(Args, Debug)]
pub struct ClassifyArgs {
    /// Ontology files (functional syntax, OWL/XML or RDF/XML).
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

/// The indented taxonomy.
pub fn classification_text(
    kb: &KnowledgeBase,
    c: &classify::Classification,
    classes: &[ClassId],
) -> String {
    use std::fmt::Write;
    let mut s = String::new();
    if kb.incomplete {
        let _ = writeln!(
            s,
            "NOTE: something was left out while loading (see warnings); results may be incomplete."
        );
    }
    if !c.consistent {
        let _ = writeln!(
            s,
            "The knowledge base is INCONSISTENT: it has no model, so every class is unsatisfiable."
        );
        return s;
    }
    let short = |x: ClassId| short_name(kb.vocab.class_iri(x));
    let tax = c.taxonomy(classes);
    let g = &tax.graph;
    let name = |n: petgraph::graph::NodeIndex| {
        g[n].iter()
            .map(|&x| short(x))
            .collect::<Vec<_>>()
            .join(" ≡ ")
    };
    let _ = writeln!(s, "owl:Thing");
    let mut tops: Vec<_> = g
        .node_indices()
        .filter(|&n| {
            g.neighbors_directed(n, petgraph::Direction::Incoming)
                .next()
                .is_none()
        })
        .collect();
    tops.sort_by_key(|&n| name(n));
    fn walk(
        g: &petgraph::graph::DiGraph<Vec<ClassId>, ()>,
        n: petgraph::graph::NodeIndex,
        depth: usize,
        name: &dyn Fn(petgraph::graph::NodeIndex) -> String,
        s: &mut String,
    ) {
        let _ = writeln!(s, "{}{}", "  ".repeat(depth), name(n));
        let mut kids: Vec<_> = g
            .neighbors_directed(n, petgraph::Direction::Outgoing)
            .collect();
        kids.sort_by_key(|&k| name(k));
        kids.dedup();
        for k in kids {
            walk(g, k, depth + 1, name, s);
        }
    }
    for t in tops {
        walk(g, t, 1, &name, &mut s);
    }
    if !c.unsatisfiable.is_empty() {
        let _ = writeln!(s, "UNSATISFIABLE (equivalent to owl:Nothing):");
        let mut u: Vec<String> = c.unsatisfiable.iter().map(|&x| short(x)).collect();
        u.sort();
        for x in u {
            let _ = writeln!(s, "  ! {x}");
        }
    }
    s
}

/// The fragment or last path segment of an IRI.
pub fn short_name(iri: &str) -> String {
    iri.rsplit(['#', '/'])
        .next()
        .filter(|s| !s.is_empty())
        .unwrap_or(iri)
        .to_string()
}

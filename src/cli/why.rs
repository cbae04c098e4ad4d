//! `wherefore why`: all justifications of an entailment, an unsatisfiable class or the
//! inconsistency of the KB (Kalyanpur et al. 2007: black-box QuickXplain plus a hitting-set
//! tree), with the minimal repairs (the minimal hitting sets of the justifications).

use super::common::{KbOptions, LimitOptions, load_kb};
use crate::explain::justify::minimal_hitting_sets;
use crate::explain::why::{Items, Target, targets_of, why_report};
use crate::kb::{ClassId, load};
use crate::reasoner::Reasoner;
use crate::render::text::{refusal_message, why_text};
use clap::Args;
use std::path::PathBuf;

/// Arguments of `wherefore why`.
#[derive(Args, Debug)]
pub struct WhyArgs {
    /// Knowledge-base ontology files.
    #[arg(required = true)]
    pub kb: Vec<PathBuf>,
    /// An entailed axiom: SubClassOf, EquivalentClasses, ClassAssertion or
    /// ObjectPropertyAssertion, in Manchester or functional syntax with short names.
    #[arg(long, conflicts_with_all = ["unsat", "inconsistent"])]
    pub entailment: Option<String>,
    /// An unsatisfiable class (IRI). Without any target, every unsatisfiable class is
    /// explained and split into root and derived ones.
    #[arg(long)]
    pub unsat: Option<String>,
    /// Explain the inconsistency of the KB.
    #[arg(long)]
    pub inconsistent: bool,
    /// Also give a laconic form of each justification: its axioms cut down to the parts the
    /// entailment needs (Horridge, Parsia & Sattler 2008).
    #[arg(long)]
    pub laconic: bool,
    /// Largest number of hitting-set tree nodes per target (exit code 3 when reached).
    #[arg(long = "max-nodes", default_value_t = 2_000)]
    pub max_nodes: usize,
    /// Output format.
    #[arg(long, value_enum, default_value = "text")]
    pub format: super::Format,
    #[command(flatten)]
    kb_opts: KbOptions,
    #[command(flatten)]
    limits: LimitOptions,
}

/// Runs `why` and returns the exit code.
pub fn run(args: WhyArgs) -> i32 {
    let mut kb = match load_kb(&args.kb, &args.kb_opts) {
        Ok(kb) => kb,
        Err(c) => return c,
    };
    let n_ax = kb.axioms.len();
    let mut targets: Vec<(String, Vec<Target>)> = Vec::new();
    // The shell's look-up: prefixed names, fragments and labels, as in `wherefore shell`.
    let index = crate::kb::names::index_of_loaded(&kb);
    if let Some(given) = &args.entailment {
        let text = match entailment_text(&index, given) {
            Ok(t) => t,
            Err(e) => {
                eprintln!("error: --entailment: {e}");
                return super::EXIT_BAD_INPUT;
            }
        };
        let text = &text;
        let range = match load::load_axioms_text(&mut kb, "--entailment", text) {
            Ok(r) => r,
            Err(e) => {
                eprintln!("error: {e}");
                return super::EXIT_BAD_INPUT;
            }
        };
        match targets_of(&kb, range) {
            Ok(ts) => targets.push((given.clone(), ts)),
            Err(e) => {
                eprintln!("error: --entailment: {e}");
                return super::EXIT_BAD_INPUT;
            }
        }
    } else if let Some(name) = &args.unsat {
        let iri = match resolve_class(&index, name) {
            Ok(iri) => iri,
            Err(e) => {
                eprintln!("error: --unsat: {e}");
                return super::EXIT_BAD_INPUT;
            }
        };
        let iri = iri.as_str();
        let Some(c) = kb.vocab.find_class(iri) else {
            eprintln!("error: --unsat: unknown class <{iri}>; it does not occur in the KB");
            return super::EXIT_BAD_INPUT;
        };
        let a = kb.concepts.atom(c);
        targets.push((format!("unsatisfiable <{iri}>"), vec![Target::Unsat(a)]));
    } else if args.inconsistent {
        targets.push((
            "the knowledge base is inconsistent".into(),
            vec![Target::Inconsistent],
        ));
    }
    let limits = args.limits.limits();
    // The whole KB must be supported by the reasoner.
    if let Err(r) = Reasoner::new(&kb) {
        eprintln!("error: {}", refusal_message(&kb, &r, &args.kb));
        return super::EXIT_BAD_INPUT;
    }
    let items = Items::new(&kb, n_ax);
    let listing = targets.is_empty();
    let report = why_report(&kb, &items, targets, &limits, args.max_nodes);
    let text_of = |s: usize| kb.sources[s].text.clone();
    let mut laconic: Vec<Vec<Vec<String>>> = Vec::new();
    let mut laconic_limit = false;
    if args.laconic {
        for r in &report.results {
            match crate::explain::why::laconic_forms(&kb, &items, r, &limits) {
                Ok(v) => laconic.push(v),
                Err(_) => {
                    laconic_limit = true;
                    laconic.push(Vec::new());
                }
            }
        }
    }
    match args.format {
        super::Format::Json => {
            let v: Vec<serde_json::Value> = report
                .results
                .iter()
                .enumerate()
                .map(|(n, r)| {
                    let repairs = minimal_hitting_sets(&r.justifications);
                    let mut v = serde_json::json!({
                        "target": r.target,
                        "entailed": !r.justifications.is_empty(),
                        "complete": r.complete,
                        "justifications": r.justifications.iter().map(|j| j.iter().map(|&s| text_of(s)).collect::<Vec<_>>()).collect::<Vec<_>>(),
                        "repairs": repairs.iter().map(|j| j.iter().map(|&s| text_of(s)).collect::<Vec<_>>()).collect::<Vec<_>>(),
                    });
                    if let Some(l) = laconic.get(n) {
                        v["laconic"] = serde_json::json!(l);
                    }
                    v
                })
                .collect();
            let mut out = serde_json::json!({ "results": v });
            if listing {
                let iri = |c: &ClassId| kb.vocab.class_iri(*c).to_string();
                let roots: Vec<String> = report.split.roots.iter().map(|(c, _)| iri(c)).collect();
                let derived: Vec<String> = report.split.derived.iter().map(iri).collect();
                out["root_unsatisfiable"] = serde_json::json!(roots);
                out["derived_unsatisfiable"] = serde_json::json!(derived);
            }
            println!("{}", serde_json::to_string_pretty(&out).unwrap_or_default());
        }
        super::Format::Text => {
            print!(
                "{}",
                why_text(&kb, &report, listing, true, true, &|i| i.to_string())
            );
            for (r, l) in report.results.iter().zip(&laconic) {
                println!(
                    "Laconic justifications of {} (only the parts needed):",
                    r.target
                );
                for (n, j) in l.iter().enumerate() {
                    println!("  Justification {}:", n + 1);
                    for (k, a) in j.iter().enumerate() {
                        println!("    {}. {a}", k + 1);
                    }
                }
            }
        }
    }
    if report.incomplete() || laconic_limit {
        eprintln!(
            "warning: a limit stopped the search; more justifications may exist. Raise --max-nodes or --timeout."
        );
        return super::EXIT_LIMIT;
    }
    super::EXIT_OK
}

/// A class named as in the shell: a full IRI (bare or in angle brackets), a prefixed name,
/// an IRI fragment or a label.
fn resolve_class(index: &crate::kb::names::EntityIndex, name: &str) -> Result<String, String> {
    let name = name.trim();
    if (name.contains("://") || name.starts_with("urn:")) && !name.starts_with('<') {
        return Ok(name.to_string());
    }
    index
        .resolve(name, &[crate::kb::names::Kind::Class])
        .map(|(_, iri)| iri)
}

/// The entailment in functional syntax with full IRIs, read as the shell reads it
/// (Manchester or functional syntax, short names), with the files' prefixes declared
/// before it.
fn entailment_text(index: &crate::kb::names::EntityIndex, given: &str) -> Result<String, String> {
    let prefixes: String = index
        .prefixes
        .iter()
        .map(|(p, iri)| format!("Prefix({p}:=<{iri}>)\n"))
        .collect();
    match crate::kb::syntax::read_statement(given, index, false) {
        Ok(crate::kb::syntax::Statement::Axiom(a)) => Ok(format!("{prefixes}{a}")),
        Ok(crate::kb::syntax::Statement::Class(_)) => Err(
            "expected an axiom (A SubClassOf B, a Type C, a p b, or functional syntax), not a class expression".into(),
        ),
        Err(e) => Err(format!("{} (at character {})", e.message, e.offset + 1)),
    }
}

//! `wherefore why`: all justifications of an entailment, an unsatisfiable class or the
//! inconsistency of the KB (Kalyanpur et al. 2007: black-box QuickXplain plus a hitting-set
//! tree), with the minimal repairs (the minimal hitting sets of the justifications).

use super::common::{KbOptions, LimitOptions, load_kb, refusal_message};
use crate::explain::justify::{all_justifications, minimal_hitting_sets, quickxplain};
use crate::kb::{Axiom, ClassId, ConceptId, KnowledgeBase, owl};
use crate::reasoner::{Answer, Limit, Reasoner};
use clap::Args;
use std::path::PathBuf;

/// Arguments of `wherefore why`.
#[derive(Args, Debug)]
pub struct WhyArgs {
    /// Knowledge-base ontology files.
    #[arg(required = true)]
    pub kb: Vec<PathBuf>,
    /// An entailed axiom in functional syntax: SubClassOf, EquivalentClasses, ClassAssertion
    /// or ObjectPropertyAssertion (full IRIs, or prefixes declared before it).
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

/// What is to be justified.
#[derive(Clone, Debug)]
enum Target {
    Subsumption(ConceptId, ConceptId),
    Instance(ConceptId, crate::kb::IndividualId),
    Role(
        crate::kb::RoleId,
        crate::kb::IndividualId,
        crate::kb::IndividualId,
    ),
    Unsat(ConceptId),
    Inconsistent,
}

struct Justified {
    target: String,
    justifications: Vec<Vec<usize>>,
    /// With `--laconic`: per justification, its laconic axioms (functional syntax).
    laconic: Vec<Vec<String>>,
    complete: bool,
}

/// Whether the reasoner's axioms entail every target.
fn target_holds(r: &mut Reasoner, ts: &[Target]) -> Result<bool, Limit> {
    for t in ts {
        let a = match *t {
            Target::Subsumption(c, d) => r.is_subsumed(c, d),
            Target::Instance(c, a) => r.entails_class_assertion(c, a),
            Target::Role(p, a, b) => r.entails_role_assertion(p, a, b),
            Target::Unsat(c) => match r.is_satisfiable(c) {
                Answer::Yes => Answer::No,
                Answer::No => Answer::Yes,
                u => u,
            },
            Target::Inconsistent => match r.is_consistent() {
                Answer::Yes => Answer::No,
                Answer::No => Answer::Yes,
                u => u,
            },
        };
        match a {
            Answer::Yes => {}
            Answer::No => return Ok(false),
            Answer::Unknown(l) => return Err(l),
        }
    }
    Ok(true)
}

/// Runs `why` and returns the exit code.
pub fn run(args: WhyArgs) -> i32 {
    let mut kb = match load_kb(&args.kb, &args.kb_opts) {
        Ok(kb) => kb,
        Err(c) => return c,
    };
    let n_ax = kb.axioms.len();
    let mut targets: Vec<(String, Vec<Target>)> = Vec::new();
    if let Some(text) = &args.entailment {
        let range = match owl::load_axioms_text(&mut kb, "--entailment", text) {
            Ok(r) => r,
            Err(e) => {
                eprintln!("error: {e}");
                return super::EXIT_BAD_INPUT;
            }
        };
        let mut ts = Vec::new();
        for i in range {
            match kb.axioms[i].axiom.clone() {
                Axiom::SubClass(c, d) => ts.push(Target::Subsumption(c, d)),
                Axiom::Equivalent(cs) => {
                    for w in cs.windows(2) {
                        ts.push(Target::Subsumption(w[0], w[1]));
                        ts.push(Target::Subsumption(w[1], w[0]));
                    }
                }
                Axiom::ClassAssertion(c, a) => ts.push(Target::Instance(c, a)),
                Axiom::RoleAssertion(r, a, b) => ts.push(Target::Role(r, a, b)),
                other => {
                    eprintln!(
                        "error: --entailment: {other:?} is not supported as a target; give SubClassOf, EquivalentClasses, ClassAssertion or ObjectPropertyAssertion"
                    );
                    return super::EXIT_BAD_INPUT;
                }
            }
        }
        if ts.is_empty() {
            eprintln!(
                "error: --entailment: no axiom found in `{text}`; write one axiom in functional syntax"
            );
            return super::EXIT_BAD_INPUT;
        }
        targets.push((text.clone(), ts));
    } else if let Some(iri) = &args.unsat {
        let iri = iri.trim_start_matches('<').trim_end_matches('>');
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
    // Source axioms of the KB are the items; a query's own axioms are not.
    let mut by_source: std::collections::BTreeMap<usize, Vec<usize>> =
        std::collections::BTreeMap::new();
    for (i, a) in kb.axioms.iter().enumerate().take(n_ax) {
        by_source.entry(a.source).or_default().push(i);
    }
    let items: Vec<usize> = by_source.keys().copied().collect();
    let holds = |kb: &KnowledgeBase, srcs: &[usize], ts: &[Target]| -> Result<bool, Limit> {
        let mut mask = vec![false; kb.axioms.len()];
        for s in srcs {
            for &i in &by_source[s] {
                mask[i] = true;
            }
        }
        let mut r = match Reasoner::with_axioms(kb, Some(&mask), &[]) {
            Ok(r) => r,
            Err(_) => return Ok(false),
        };
        r.limits = limits.clone();
        target_holds(&mut r, ts)
    };
    // The same test over explicit axioms (laconic pieces), none of the KB's own.
    let holds_axioms =
        |kb: &KnowledgeBase, axioms: &[Axiom], ts: &[Target]| -> Result<bool, Limit> {
            let none = vec![false; kb.axioms.len()];
            let mut r = match Reasoner::with_axioms(kb, Some(&none), axioms) {
                Ok(r) => r,
                Err(_) => return Ok(false),
            };
            r.limits = limits.clone();
            target_holds(&mut r, ts)
        };
    // The whole KB must be supported by the reasoner.
    if let Err(r) = Reasoner::new(&kb) {
        eprintln!("error: {}", refusal_message(&kb, &r, &args.kb));
        return super::EXIT_BAD_INPUT;
    }
    let mut results: Vec<Justified> = Vec::new();
    let mut roots: Vec<String> = Vec::new();
    let mut derived: Vec<String> = Vec::new();
    let mut limit_hit: Option<Limit> = None;
    if targets.is_empty() {
        // Every unsatisfiable class: one justification each decides root or derived.
        let mut r = Reasoner::new(&kb).expect("checked above");
        r.limits = limits.clone();
        let classes: Vec<ClassId> = kb.signature_classes.clone();
        let mut unsat = Vec::new();
        if r.is_consistent() == Answer::No {
            targets.push((
                "the knowledge base is inconsistent".into(),
                vec![Target::Inconsistent],
            ));
        } else {
            for c in classes {
                let a = r.concepts_mut().atom(c);
                if r.is_satisfiable(a) == Answer::No {
                    unsat.push((c, a));
                }
            }
        }
        let mut first: Vec<(ClassId, Vec<usize>)> = Vec::new();
        for &(c, a) in &unsat {
            let ts = vec![Target::Unsat(a)];
            let mut test = |s: &[usize]| holds(&kb, s, &ts);
            match quickxplain(&items, &mut test) {
                Ok(Some(j)) => first.push((c, j)),
                Ok(None) => {}
                Err(l) => limit_hit = Some(l),
            }
        }
        for (c, j) in &first {
            // Derived: its justification strictly contains another class's justification
            // (Kalyanpur et al. 2005, root and derived unsatisfiable classes).
            let is_derived = first
                .iter()
                .any(|(d, k)| d != c && k.len() < j.len() && k.iter().all(|x| j.contains(x)));
            let name = kb.vocab.class_iri(*c).to_string();
            if is_derived {
                derived.push(name.clone());
            } else {
                roots.push(name.clone());
                let a = kb
                    .concepts
                    .find(&crate::kb::Concept::Atom(*c))
                    .unwrap_or(ConceptId::BOTTOM);
                targets.push((format!("unsatisfiable <{name}>"), vec![Target::Unsat(a)]));
            }
        }
    }
    for (name, ts) in &targets {
        let mut test = |s: &[usize]| holds(&kb, s, ts);
        match all_justifications(&items, &mut test, args.max_nodes) {
            Ok((js, complete)) => {
                let mut laconic = Vec::new();
                if args.laconic {
                    for j in &js {
                        let axioms: Vec<usize> = j
                            .iter()
                            .flat_map(|s| by_source[s].iter().copied())
                            .collect();
                        let mut t = |k: &KnowledgeBase, a: &[Axiom]| holds_axioms(k, a, ts);
                        match crate::explain::laconic::laconic(&kb, &axioms, &mut t) {
                            Ok(l) => {
                                let mut v: Vec<String> = l
                                    .axioms
                                    .iter()
                                    .map(|a| crate::explain::laconic::axiom_ofn(&l.kb, a))
                                    .collect();
                                v.sort();
                                laconic.push(v);
                            }
                            Err(l) => {
                                limit_hit = Some(l);
                                laconic.push(Vec::new());
                            }
                        }
                    }
                }
                results.push(Justified {
                    target: name.clone(),
                    justifications: js,
                    laconic,
                    complete,
                })
            }
            Err(l) => {
                limit_hit = Some(l);
                results.push(Justified {
                    target: name.clone(),
                    justifications: vec![],
                    laconic: vec![],
                    complete: false,
                });
            }
        }
    }
    let text_of = |s: usize| kb.sources[s].text.clone();
    let incomplete = results.iter().any(|r| !r.complete) || limit_hit.is_some();
    match args.format {
        super::Format::Json => {
            let v: Vec<serde_json::Value> = results
                .iter()
                .map(|r| {
                    let repairs = minimal_hitting_sets(&r.justifications);
                    let mut v = serde_json::json!({
                        "target": r.target,
                        "entailed": !r.justifications.is_empty(),
                        "complete": r.complete,
                        "justifications": r.justifications.iter().map(|j| j.iter().map(|&s| text_of(s)).collect::<Vec<_>>()).collect::<Vec<_>>(),
                        "repairs": repairs.iter().map(|j| j.iter().map(|&s| text_of(s)).collect::<Vec<_>>()).collect::<Vec<_>>(),
                    });
                    if args.laconic {
                        v["laconic"] = serde_json::json!(r.laconic);
                    }
                    v
                })
                .collect();
            let mut out = serde_json::json!({ "results": v });
            if args.entailment.is_none() && args.unsat.is_none() && !args.inconsistent {
                roots.sort();
                derived.sort();
                out["root_unsatisfiable"] = serde_json::json!(roots);
                out["derived_unsatisfiable"] = serde_json::json!(derived);
            }
            println!("{}", serde_json::to_string_pretty(&out).unwrap_or_default());
        }
        super::Format::Text => {
            if args.entailment.is_none() && args.unsat.is_none() && !args.inconsistent {
                if roots.is_empty() && derived.is_empty() && results.is_empty() {
                    println!("Every class is satisfiable and the knowledge base is consistent.");
                }
                if !roots.is_empty() {
                    println!("Root unsatisfiable classes: {}", roots.join(", "));
                }
                if !derived.is_empty() {
                    println!(
                        "Derived unsatisfiable classes (they follow from a root one): {}",
                        derived.join(", ")
                    );
                }
            }
            for r in &results {
                println!("Why {}:", r.target);
                if r.justifications.is_empty() {
                    println!("  not entailed, so nothing to justify.");
                }
                for (n, j) in r.justifications.iter().enumerate() {
                    println!("  Justification {}:", n + 1);
                    for (k, &s) in j.iter().enumerate() {
                        println!("    {}. {}", k + 1, text_of(s));
                    }
                    if let Some(l) = r.laconic.get(n) {
                        println!("    Laconic (only the parts needed):");
                        for (k, a) in l.iter().enumerate() {
                            println!("      {}. {a}", k + 1);
                        }
                    }
                }
                let repairs = minimal_hitting_sets(&r.justifications);
                if !repairs.is_empty() {
                    println!("  Minimal repairs (remove all axioms of one line):");
                    for rep in repairs {
                        println!(
                            "    - {}",
                            rep.iter()
                                .map(|&s| text_of(s))
                                .collect::<Vec<_>>()
                                .join("  AND  ")
                        );
                    }
                }
            }
        }
    }
    if incomplete {
        eprintln!(
            "warning: a limit stopped the search; more justifications may exist. Raise --max-nodes or --timeout."
        );
        return super::EXIT_LIMIT;
    }
    super::EXIT_OK
}

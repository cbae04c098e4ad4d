//! `wherefore explain`: abduction from observations in an ontology file.

use super::common::{KbOptions, LimitOptions, load_kb, refusal_message};
use crate::explain::{Assertion, ExplainOptions, ExplainResult, Problem, explain};
use crate::kb::{Axiom, Concept, KnowledgeBase, RoleId, owl};
use clap::Args;
use std::path::{Path, PathBuf};

/// Arguments of `wherefore explain`.
#[derive(Args, Debug)]
pub struct ExplainArgs {
    /// Knowledge-base ontology files.
    #[arg(required = true)]
    pub kb: Vec<PathBuf>,
    /// Ontology file whose class and property assertions are the observations.
    #[arg(long)]
    pub observations: PathBuf,
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

/// Loads the KB and the observations, and reads or derives the abducibles.
pub fn build_problem(args: &ExplainArgs) -> Result<Problem, i32> {
    let mut kb = load_kb(&args.kb, &args.kb_opts)?;
    let n_ax = kb.axioms.len();
    let n_classes = kb.vocab.classes.len();
    let n_inds = kb.vocab.individuals.len();
    let n_props = kb.vocab.props.len();
    let lo = owl::LoadOptions {
        import_dirs: args.kb_opts.import_dirs.clone(),
        lenient: false,
    };
    if let Err(e) = owl::load_into(&mut kb, std::slice::from_ref(&args.observations), &lo) {
        return Err(bad(e.to_string()));
    }
    kb.signature_classes.retain(|c| c.index() < n_classes);
    let obs_file = args.observations.display().to_string();
    let mut observations = Vec::new();
    for i in n_ax..kb.axioms.len() {
        let text = kb.sources[kb.axioms[i].source].text.clone();
        let a = match &kb.axioms[i].axiom {
            Axiom::ClassAssertion(c, a) => Assertion::Class(*c, *a),
            Axiom::RoleAssertion(r, a, b) => Assertion::Role(*r, *a, *b),
            _ => {
                return Err(bad(format!(
                    "{obs_file}: axiom {text} is not a class or property assertion; the observations file may hold only ClassAssertion and ObjectPropertyAssertion axioms"
                )));
            }
        };
        for ind in a.individuals() {
            if ind.index() >= n_inds {
                return Err(bad(format!(
                    "{obs_file}: axiom {text} names the individual <{}>, which the knowledge base does not know; add it to the KB or fix the IRI",
                    kb.vocab.individual_iri(ind)
                )));
            }
        }
        if let Some(c) = unknown_class(&kb, &a, n_classes) {
            return Err(bad(format!(
                "{obs_file}: axiom {text} names the class <{c}>, which the knowledge base does not know; fix the IRI"
            )));
        }
        if let Assertion::Role(r, _, _) = a
            && r.prop().index() >= n_props
        {
            return Err(bad(format!(
                "{obs_file}: axiom {text} names the property <{}>, which the knowledge base does not know; fix the IRI",
                kb.vocab.prop_iri(r.prop())
            )));
        }
        observations.push(a);
    }
    if observations.is_empty() {
        return Err(bad(format!(
            "{obs_file}: no class or property assertion to explain; add the observations"
        )));
    }
    let individuals: Vec<crate::kb::IndividualId> = (0..kb.vocab.individuals.len() as u32)
        .map(crate::kb::IndividualId)
        .filter(|i| !kb.vocab.individual_iri(*i).starts_with("_:"))
        .collect();
    let abducibles = match &args.abducibles {
        Some(p) => read_abducibles(&mut kb, p, &individuals)?,
        None => {
            let findings: Vec<_> = observations
                .iter()
                .flat_map(|o| o.individuals().into_iter().take(1))
                .collect();
            let a = crate::explain::abduce::annotated_abducibles(&mut kb, &findings, &individuals);
            if a.is_empty() {
                return Err(bad(format!(
                    "no abducibles: give --abducibles FILE, or mark hypothesis classes in the KB with {}hypothesis \"true\"",
                    crate::explain::WF
                )));
            }
            a
        }
    };
    let n = kb.axioms.len();
    let background = (0..n).map(|i| i < n_ax).collect();
    Ok(Problem {
        kb,
        background,
        degrees: vec![1.0; n],
        observations,
        abducibles,
    })
}

fn unknown_class(kb: &KnowledgeBase, a: &Assertion, n_classes: usize) -> Option<String> {
    let Assertion::Class(c, _) = a else {
        return None;
    };
    let mut stack = vec![*c];
    while let Some(x) = stack.pop() {
        match kb.concepts.get(x) {
            Concept::Atom(k) | Concept::NotAtom(k) if k.index() >= n_classes => {
                return Some(kb.vocab.class_iri(*k).to_string());
            }
            _ => stack.extend_from_slice(kb.concepts.children(x)),
        }
    }
    None
}

/// Reads an abducibles file: `class IRI`, `not-class IRI`, `property IRI`; `#` comments.
pub fn read_abducibles(
    kb: &mut KnowledgeBase,
    path: &Path,
    individuals: &[crate::kb::IndividualId],
) -> Result<Vec<Assertion>, i32> {
    let file = path.display().to_string();
    let text =
        std::fs::read_to_string(path).map_err(|e| bad(format!("{file}: cannot read: {e}")))?;
    let mut out = Vec::new();
    for (n, line) in text.lines().enumerate() {
        let line = line.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        let (kind, iri) = line.split_once(char::is_whitespace).unwrap_or((line, ""));
        let iri = iri.trim().trim_start_matches('<').trim_end_matches('>');
        if iri.is_empty() {
            return Err(bad(format!(
                "{file}:{}: expected `class IRI`, `not-class IRI` or `property IRI`",
                n + 1
            )));
        }
        match kind {
            "class" | "not-class" => {
                let Some(c) = kb.vocab.find_class(iri) else {
                    return Err(bad(format!(
                        "{file}:{}: unknown class <{iri}>; it does not occur in the KB",
                        n + 1
                    )));
                };
                let mut k = kb.concepts.atom(c);
                if kind == "not-class" {
                    k = kb.concepts.not(k);
                }
                out.extend(individuals.iter().map(|&a| Assertion::Class(k, a)));
            }
            "property" => {
                let Some(p) = kb.vocab.find_prop(iri) else {
                    return Err(bad(format!(
                        "{file}:{}: unknown object property <{iri}>",
                        n + 1
                    )));
                };
                let r = RoleId::named(p);
                for &a in individuals {
                    for &b in individuals {
                        out.push(Assertion::Role(r, a, b));
                    }
                }
            }
            other => {
                return Err(bad(format!(
                    "{file}:{}: unknown kind `{other}`; use `class`, `not-class` or `property`",
                    n + 1
                )));
            }
        }
    }
    if out.is_empty() {
        return Err(bad(format!(
            "{file}: the abducible set is empty; list at least one class or property"
        )));
    }
    out.sort();
    out.dedup();
    Ok(out)
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

//! Plain-text forms of reasoning results, shared by the command line and the shell:
//! the indented taxonomy, justifications and repairs, ranked explanations, and the message
//! for a refused knowledge base.

use crate::explain::justify::minimal_hitting_sets;
use crate::explain::why::WhyReport;
use crate::explain::{ExplainResult, Problem};
use crate::kb::{ClassId, KnowledgeBase};
use crate::reasoner::{Refusal, classify};
use std::path::PathBuf;

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

/// The text form: justifications and/or repairs (the minimal hitting sets of the
/// justifications). `name` turns a full IRI into what is shown.
pub fn why_text(
    kb: &KnowledgeBase,
    report: &WhyReport,
    listing: bool,
    justifications: bool,
    repairs: bool,
    name: &dyn Fn(&str) -> String,
) -> String {
    use std::fmt::Write;
    let mut s = String::new();
    let text_of = |i: usize| kb.sources[i].text.clone();
    if listing {
        let names = |v: Vec<&str>| v.into_iter().map(name).collect::<Vec<_>>().join(", ");
        let roots: Vec<&str> = report
            .split
            .roots
            .iter()
            .map(|(c, _)| kb.vocab.class_iri(*c))
            .collect();
        let derived: Vec<&str> = report
            .split
            .derived
            .iter()
            .map(|c| kb.vocab.class_iri(*c))
            .collect();
        if roots.is_empty() && derived.is_empty() && report.results.is_empty() {
            let _ = writeln!(
                s,
                "Every class is satisfiable and the knowledge base is consistent."
            );
        }
        if !roots.is_empty() {
            let _ = writeln!(s, "Root unsatisfiable classes: {}", names(roots));
        }
        if !derived.is_empty() {
            let _ = writeln!(
                s,
                "Derived unsatisfiable classes (they follow from a root one): {}",
                names(derived)
            );
        }
    }
    for r in &report.results {
        let _ = writeln!(s, "Why {}:", r.target);
        if r.justifications.is_empty() {
            let _ = writeln!(s, "  not entailed, so nothing to justify.");
        }
        if justifications {
            for (n, j) in r.justifications.iter().enumerate() {
                let _ = writeln!(s, "  Justification {}:", n + 1);
                for (k, &i) in j.iter().enumerate() {
                    let _ = writeln!(s, "    {}. {}", k + 1, text_of(i));
                }
            }
        }
        // Without a justification there is nothing to repair (the empty family's one hitting
        // set is empty, which is no repair).
        let reps = minimal_hitting_sets(&r.justifications);
        if repairs && !r.justifications.is_empty() && !reps.is_empty() {
            let _ = writeln!(s, "  Minimal repairs (remove all axioms of one line):");
            for rep in reps {
                let _ = writeln!(
                    s,
                    "    - {}",
                    rep.iter()
                        .map(|&i| text_of(i))
                        .collect::<Vec<_>>()
                        .join("  AND  ")
                );
            }
        }
    }
    s
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
        let why = r.limit.map(|l| format!(" ({l})")).unwrap_or_default();
        let _ = writeln!(
            s,
            "INCOMPLETE: a limit stopped the search{why}; the explanations above are those found so far, searched smallest first; more may exist."
        );
    }
    s
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

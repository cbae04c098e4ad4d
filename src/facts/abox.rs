//! Translation of a facts file into ABox assertions with degrees, through the knowledge
//! base's own mapping: our `wf:factsRelation` annotation on an object property names the
//! facts relation it stands for, `wf:factsQuantity` on a data property names a quantity.

use super::Facts;
use crate::kb::datatype;
use crate::kb::{Axiom, Concept, IndividualId, KnowledgeBase, RoleId};
use std::collections::BTreeMap;

/// The namespace of case individuals: a facts id `lesion1` becomes `<CASE_NS>lesion1`.
pub const CASE_NS: &str = "https://wherefore.example.org/case#";

const WF: &str = "https://wherefore.example.org/ns/core#";

/// What the translation added.
#[derive(Clone, Debug, Default)]
pub struct CaseAbox {
    /// Index of the first axiom added to the KB.
    pub first_axiom: usize,
    /// Degree of each added axiom, in order (1 for crisp ones).
    pub degrees: Vec<f64>,
    /// Facts id → individual.
    pub individuals: BTreeMap<String, IndividualId>,
    /// Individuals whose class is marked as a finding (or whose role is `finding`).
    pub findings: Vec<IndividualId>,
    /// Relation names with no property mapped to them (reported, not fatal).
    pub unmapped: Vec<String>,
    /// Warnings for the user.
    pub warnings: Vec<String>,
}

fn annotated(kb: &KnowledgeBase, key: &str) -> BTreeMap<String, Vec<String>> {
    let mut out: BTreeMap<String, Vec<String>> = BTreeMap::new();
    for (subject, props) in &kb.annotations {
        if let Some(vs) = props.get(key) {
            for v in vs {
                out.entry(v.value.clone())
                    .or_default()
                    .push(subject.clone());
            }
        }
    }
    out
}

/// Whether an entity carries one of our boolean marks.
pub fn marked(kb: &KnowledgeBase, iri: &str, mark: &str) -> bool {
    kb.annotation(iri, &format!("{WF}{mark}"))
        .iter()
        .any(|v| v.value == "true" || v.value == "1")
}

/// Adds the case's assertions to the KB. Individuals become `CASE_NS` + id; classes are
/// asserted crisply; relations become property assertions carrying their degree; per-region
/// quantities and single pairwise quantities become data property assertions.
pub fn add_facts(kb: &mut KnowledgeBase, facts: &Facts, file: &str) -> CaseAbox {
    let mut out = CaseAbox {
        first_axiom: kb.axioms.len(),
        ..Default::default()
    };
    let relations = annotated(kb, &format!("{WF}factsRelation"));
    let quantities = annotated(kb, &format!("{WF}factsQuantity"));
    let mut push =
        |kb: &mut KnowledgeBase, out: &mut CaseAbox, axiom: Axiom, text: String, degree: f64| {
            let src = kb.add_source(
                text,
                file.to_string(),
                vec![(format!("{WF}degree"), format!("{degree}"))],
            );
            kb.push(axiom, src);
            out.degrees.push(degree);
        };
    for ind in &facts.individuals {
        let iri = format!("{CASE_NS}{}", ind.id);
        let a = kb.vocab.individual(&iri);
        out.individuals.insert(ind.id.clone(), a);
        let c = kb.vocab.class(&ind.class);
        let k = kb.concepts.atom(c);
        push(
            kb,
            &mut out,
            Axiom::ClassAssertion(k, a),
            format!("ClassAssertion(<{}> <{iri}>)", ind.class),
            1.0,
        );
        if marked(kb, &ind.class, "finding") || ind.role == "finding" {
            out.findings.push(a);
        }
        let mut per_region: Vec<(&str, f64)> = vec![("volume_ml", ind.volume_ml)];
        if ind.largest_diameter_mm > 0.0 {
            per_region.push(("largest_diameter_mm", ind.largest_diameter_mm));
        }
        for (q, v) in per_region {
            for dp in quantities.get(q).into_iter().flatten() {
                data_assertion(kb, &mut out, &mut push, dp, a, &iri, v);
            }
        }
    }
    for rel in &facts.relations {
        let (Some(&a), Some(&b)) = (
            out.individuals.get(&rel.subject),
            out.individuals.get(&rel.object),
        ) else {
            out.warnings.push(format!(
                "{file}: relation {} names an unknown individual; skipped",
                rel.relation
            ));
            continue;
        };
        let Some(props) = relations.get(&rel.relation) else {
            if !out.unmapped.contains(&rel.relation) {
                out.unmapped.push(rel.relation.clone());
            }
            continue;
        };
        if rel.degree <= 0.0 {
            continue;
        }
        for piri in props {
            let Some(p) = kb.vocab.find_prop(piri) else {
                continue;
            };
            let r = RoleId::named(p);
            let text = format!(
                "ObjectPropertyAssertion(<{piri}> <{CASE_NS}{}> <{CASE_NS}{}>)",
                rel.subject, rel.object
            );
            push(
                kb,
                &mut out,
                Axiom::RoleAssertion(r, a, b),
                text,
                rel.degree.min(1.0),
            );
        }
    }
    // Pairwise quantities: asserted on the subject when it has exactly one value.
    let mut by_subject: BTreeMap<(&str, &str), Vec<f64>> = BTreeMap::new();
    for m in &facts.measurements {
        by_subject
            .entry((m.subject.as_str(), m.quantity.as_str()))
            .or_default()
            .push(m.value);
    }
    for ((subject, q), values) in by_subject {
        let Some(dps) = quantities.get(q) else {
            continue;
        };
        let Some(&a) = out.individuals.get(subject) else {
            continue;
        };
        let iri = format!("{CASE_NS}{subject}");
        for dp in dps {
            let functional = kb.axioms.iter().any(|x| {
                matches!(x.axiom, Axiom::FunctionalData(d) if kb.vocab.data_props[d.index()] == *dp)
            });
            if functional && values.len() > 1 {
                continue;
            }
            for &v in &values {
                data_assertion(kb, &mut out, &mut push, dp, a, &iri, v);
            }
        }
    }
    out
}

fn data_assertion(
    kb: &mut KnowledgeBase,
    out: &mut CaseAbox,
    push: &mut impl FnMut(&mut KnowledgeBase, &mut CaseAbox, Axiom, String, f64),
    dp: &str,
    a: IndividualId,
    iri: &str,
    v: f64,
) {
    if !v.is_finite() {
        return;
    }
    // Measured values are decimals (the ontology's ranges are over xsd:decimal); rounded to
    // a micrometre so that the text stays readable.
    let v = (v * 1000.0).round() / 1000.0;
    let p = kb.vocab.data_prop(dp);
    // Display of an f64 never uses an exponent, so the text is an xsd:decimal lexical form.
    let r = datatype::literal(
        &format!("{v}"),
        Some("http://www.w3.org/2001/XMLSchema#decimal"),
        None,
    )
    .expect("xsd:decimal is in the datatype map");
    let nr = r.complement();
    let ri = kb.ranges.intern(r);
    let nri = kb.ranges.intern(nr);
    let c = kb.concepts.data_some(p, ri, nri);
    debug_assert!(matches!(kb.concepts.get(c), Concept::DataSome(..)));
    let text = format!(
        "DataPropertyAssertion(<{dp}> <{iri}> \"{v}\"^^<http://www.w3.org/2001/XMLSchema#decimal>)"
    );
    push(kb, out, Axiom::ClassAssertion(c, a), text, 1.0);
}

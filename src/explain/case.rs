//! An abduction problem built from a knowledge base and a measured case (facts file).

use super::abduce::{Problem, annotated_abducibles};
use super::assertion::Assertion;
use crate::facts::Facts;
use crate::facts::abox::{CaseAbox, add_facts, marked};
use crate::kb::{Axiom, IndividualId, KnowledgeBase};

/// A case ready to explain, with what the translation found.
pub struct Case {
    /// The problem.
    pub problem: Problem,
    /// The translation's record (individuals, findings, warnings).
    pub abox: CaseAbox,
}

/// Builds the problem: the facts become background assertions with degrees; each finding
/// individual's finding classes are the observations; abducibles come from our annotations.
#[allow(clippy::needless_range_loop)]
pub fn case_problem(kb: &KnowledgeBase, facts: &Facts, file: &str) -> Case {
    let mut kb = kb.clone();
    let n0 = kb.axioms.len();
    let abox = add_facts(&mut kb, facts, file);
    let mut degrees = vec![1.0; n0];
    degrees.extend(abox.degrees.iter().copied());
    let mut observations = Vec::new();
    let mut background = vec![true; kb.axioms.len()];
    for i in n0..kb.axioms.len() {
        if let Axiom::ClassAssertion(c, a) = kb.axioms[i].axiom {
            if !abox.findings.contains(&a) {
                continue;
            }
            if let crate::kb::Concept::Atom(k) = kb.concepts.get(c)
                && marked(&kb, kb.vocab.class_iri(*k), "finding")
            {
                // The finding class is what must be explained: it is an observation,
                // not background.
                observations.push(Assertion::Class(c, a));
                background[i] = false;
            }
        }
    }
    let individuals: Vec<IndividualId> = abox.individuals.values().copied().collect();
    let abducibles = annotated_abducibles(&mut kb, &abox.findings, &individuals);
    Case {
        problem: Problem {
            kb,
            background,
            degrees,
            observations,
            abducibles,
        },
        abox,
    }
}

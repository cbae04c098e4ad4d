//! Generated abduction problems of three shapes, shared by `benches/abduction.rs` and the
//! tests (included with `#[path]`).
//!
//! - `Wide`: one lesion `l` (a `Lesion`) with two observed classes `O1(l)`, `O2(l)` and N
//!   hypothesis classes `H_i ⊑ Lesion`. Every 20th hypothesis is subsumed by both observed
//!   classes (it explains both alone); 2 in 20 are subsumed by `O1` only, 1 in 20 by `O2`
//!   only (an `O1`-only and an `O2`-only hypothesis explain in a pair); the rest are
//!   distractors under six unrelated classes.
//!   Hand-derived answer: N/20 explanations of size 1 and (N/10)·(N/20) of size 2.
//! - `Disjoint`: `Wide` with four in twenty hypotheses (distractors) disjoint from the next
//!   one. Same answers; the hard case for hitting-set search (see the README's Limits).
//! - `Deep`: the same N hypotheses arranged in chains of depth 10 (`H_i ⊑ H_{i+1}` inside
//!   a chain); a chain's top carries the kind, so every class in the chain inherits it.
//!   Chains of kind "both", "O1", "O2" in the same proportions as `Wide`, so the answer
//!   is the same count formula over classes.
//! - `Roles`: as `Wide`, but an `O1` or "both" hypothesis entails its observations only
//!   for a lesion located in an organ of the right kind (`H_i ⊓ ∃locatedIn.Organ_k ⊑ O`,
//!   k = i mod 3); three organ individuals `o_k`; `locatedIn` is abducible, so the class
//!   abducibles also range over the organs (irrelevant candidates) and the answers grow
//!   by one role assertion.

#![allow(dead_code)]

use std::fmt::Write as _;

/// The namespace of the generated vocabulary.
pub const NS: &str = "urn:shape#";

/// Which problem shape to generate.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Shape {
    /// Flat hypotheses under one lesion class.
    Wide,
    /// `Wide` with disjoint pairs of distractors.
    Disjoint,
    /// Hypotheses in chains of depth 10.
    Deep,
    /// Hypotheses that need a `locatedIn` role assertion.
    Roles,
}

impl Shape {
    /// The shape's short name.
    pub fn name(self) -> &'static str {
        match self {
            Shape::Wide => "wide",
            Shape::Disjoint => "disjoint",
            Shape::Deep => "deep",
            Shape::Roles => "roles",
        }
    }
}

/// What a hypothesis explains.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Kind {
    /// Both observed classes.
    Both,
    /// `O1` only.
    First,
    /// `O2` only.
    Second,
    /// Neither.
    Distractor,
}

/// The kind of the i-th hypothesis (`Wide`, `Roles`) or chain (`Deep`).
pub fn kind(i: usize) -> Kind {
    match i % 20 {
        0 => Kind::Both,
        1 | 2 => Kind::First,
        3 => Kind::Second,
        _ => Kind::Distractor,
    }
}

/// Chain length of the `Deep` shape.
pub const DEPTH: usize = 10;

/// Number of organ individuals of the `Roles` shape.
pub const ORGANS: usize = 3;

/// The generated problem as the command line reads it.
pub struct Generated {
    /// The knowledge base, OWL 2 functional syntax.
    pub kb: String,
    /// The observations, functional-syntax assertions.
    pub observations: String,
    /// The abducibles list (`class IRI` / `property IRI` lines).
    pub abducibles: String,
    /// Hand-derived number of explanations of size 1, 2 and 3 (`--max-size 3`).
    pub expected: [usize; 3],
}

/// Generates a problem with `n` hypothesis classes.
pub fn generate(shape: Shape, n: usize) -> Generated {
    let mut kb = String::new();
    let _ = writeln!(kb, "Prefix(:=<{NS}>)");
    let _ = writeln!(kb, "Ontology(<urn:shape:{}:{n}>", shape.name());
    for c in ["Lesion", "O1", "O2", "Organ"] {
        let _ = writeln!(kb, "Declaration(Class(:{c}))");
    }
    for k in 0..6 {
        let _ = writeln!(kb, "Declaration(Class(:X{k}))");
    }
    let _ = writeln!(kb, "Declaration(NamedIndividual(:l))");
    let _ = writeln!(kb, "ClassAssertion(:Lesion :l)");
    if shape == Shape::Roles {
        let _ = writeln!(kb, "Declaration(ObjectProperty(:locatedIn))");
        for k in 0..ORGANS {
            let _ = writeln!(kb, "Declaration(Class(:Organ{k}))");
            let _ = writeln!(kb, "SubClassOf(:Organ{k} :Organ)");
            let _ = writeln!(kb, "Declaration(NamedIndividual(:o{k}))");
            let _ = writeln!(kb, "ClassAssertion(:Organ{k} :o{k})");
        }
        let _ = writeln!(kb, "DisjointClasses(:Lesion :Organ)");
    }
    let mut abducibles = String::new();
    let mut counts = [0usize; 4];
    let mut organ_of: Vec<(Kind, usize)> = Vec::new();
    for i in 0..n {
        let _ = writeln!(kb, "Declaration(Class(:H{i}))");
        let _ = writeln!(abducibles, "class {NS}H{i}");
        // The kind is decided per hypothesis, or per chain for `Deep`.
        let (k, top) = match shape {
            Shape::Deep => (kind(i / DEPTH), i % DEPTH == DEPTH - 1 || i + 1 == n),
            _ => (kind(i), true),
        };
        counts[k as usize] += 1;
        organ_of.push((k, i % ORGANS));
        if !top {
            let _ = writeln!(kb, "SubClassOf(:H{i} :H{})", i + 1);
            continue;
        }
        let _ = writeln!(kb, "SubClassOf(:H{i} :Lesion)");
        let targets: &[&str] = match k {
            Kind::Both => &["O1", "O2"],
            Kind::First => &["O1"],
            Kind::Second => &["O2"],
            Kind::Distractor => &[],
        };
        for t in targets {
            if shape == Shape::Roles && *t == "O1" {
                let _ = writeln!(
                    kb,
                    "SubClassOf(ObjectIntersectionOf(:H{i} ObjectSomeValuesFrom(:locatedIn :Organ{})) :{t})",
                    i % ORGANS
                );
            } else {
                let _ = writeln!(kb, "SubClassOf(:H{i} :{t})");
            }
        }
        if k == Kind::Distractor {
            let _ = writeln!(kb, "SubClassOf(:H{i} :X{})", i % 6);
            if shape == Shape::Disjoint
                && i % 4 == 0
                && i + 1 < n
                && kind(i + 1) == Kind::Distractor
            {
                let _ = writeln!(kb, "DisjointClasses(:H{i} :H{})", i + 1);
            }
        }
    }
    if shape == Shape::Roles {
        let _ = writeln!(abducibles, "property {NS}locatedIn");
    }
    kb.push_str(")\n");
    let observations =
        format!("Prefix(:=<{NS}>)\nClassAssertion(:O1 :l)\nClassAssertion(:O2 :l)\n");
    let [both, first, second, _] = counts;
    let expected = match shape {
        Shape::Wide | Shape::Disjoint | Shape::Deep => [both, first * second, 0],
        // A "both" hypothesis needs its locatedIn assertion; an O1 one needs it too, and an
        // O2 partner: an O2-only hypothesis, or a "both" one of another organ (with the same
        // organ the "both" pair alone would already explain).
        Shape::Roles => {
            let mixed = organ_of
                .iter()
                .filter(|(k, _)| *k == Kind::First)
                .map(|(_, o)| {
                    organ_of
                        .iter()
                        .filter(|(k2, o2)| *k2 == Kind::Both && o2 != o)
                        .count()
                })
                .sum::<usize>();
            [0, both, first * second + mixed]
        }
    };
    Generated {
        kb,
        observations,
        abducibles,
        expected,
    }
}

//! Laconic justifications (Horridge, Parsia & Sattler, ISWC 2008): justifications whose
//! axioms hold no superfluous parts.
//!
//! The axioms of a justification are first cut into small pieces that together say the
//! same (conjunctions on the right and disjunctions on the left split; equivalences,
//! disjointness, disjoint unions and domains become subclass axioms). Each piece is then
//! weakened one step at a time (a conjunct dropped or a filler replaced by ⊤ where the
//! position is positive, a disjunct dropped or a concept replaced by ⊥ where it is
//! negative, a number relaxed) for as long as the entailment still holds, and the weakest
//! pieces are shrunk to a minimal set with QuickXplain. The result is one laconic
//! justification; the entailment test is a black box supplied by the caller.

use super::justify::quickxplain;
use crate::kb::{Axiom, Concept, ConceptId, KnowledgeBase};
use crate::reasoner::Limit;

/// The entailment test on a set of axioms (over the given KB's concept store).
pub type Entails<'a> = dyn FnMut(&KnowledgeBase, &[Axiom]) -> Result<bool, Limit> + 'a;

/// A laconic justification: its axioms, over `kb`'s concept store (a copy of the input KB
/// that holds the weakened concepts).
pub struct Laconic {
    /// The KB whose concept store holds the axioms' concepts.
    pub kb: KnowledgeBase,
    /// The axioms, as weak as the entailment allows.
    pub axioms: Vec<Axiom>,
}

/// Most entailment tests spent on weakening one justification.
const MAX_TESTS: usize = 400;

/// One laconic justification derived from `justification` (indices of `kb.axioms`, which
/// together entail the target). If the test budget runs out, the weakenings found so far are
/// kept and the pieces are still shrunk to a minimal entailing set, which may then not be
/// fully laconic.
pub fn laconic(
    kb: &KnowledgeBase,
    justification: &[usize],
    entails: &mut Entails,
) -> Result<Laconic, Limit> {
    let mut kb = kb.clone();
    let mut pieces: Vec<Axiom> = Vec::new();
    for &i in justification {
        let ax = kb.axioms[i].axiom.clone();
        split(&mut kb, &ax, &mut pieces);
    }
    dedup(&mut pieces);
    let mut tests = 0usize;
    let mut i = 0;
    'pieces: while i < pieces.len() {
        for w in weakenings(&mut kb, &pieces[i]) {
            if tests >= MAX_TESTS {
                break 'pieces;
            }
            let mut cand: Vec<Axiom> = pieces[..i].to_vec();
            cand.extend(w.iter().cloned());
            cand.extend(pieces[i + 1..].iter().cloned());
            tests += 1;
            if entails(&kb, &cand)? {
                // Keep the weaker form; its own weakenings are tried next.
                pieces = cand;
                dedup(&mut pieces);
                if w.is_empty() {
                    // The piece went away: the same index now holds the next one.
                    continue 'pieces;
                }
                i = pieces
                    .iter()
                    .position(|p| *p == w[0])
                    .unwrap_or(pieces.len());
                continue 'pieces;
            }
        }
        i += 1;
    }
    let idx: Vec<usize> = (0..pieces.len()).collect();
    let kb_ref = &kb;
    let mut test = |s: &[usize]| -> Result<bool, Limit> {
        let sub: Vec<Axiom> = s.iter().map(|&k| pieces[k].clone()).collect();
        entails(kb_ref, &sub)
    };
    let keep = quickxplain(&idx, &mut test)?.unwrap_or(idx.clone());
    let axioms = keep.iter().map(|&k| pieces[k].clone()).collect();
    Ok(Laconic { kb, axioms })
}

fn dedup(v: &mut Vec<Axiom>) {
    let mut seen: Vec<Axiom> = Vec::new();
    v.retain(|a| {
        if seen.contains(a) {
            false
        } else {
            seen.push(a.clone());
            true
        }
    });
}

/// Cuts an axiom into pieces whose conjunction is equivalent to it.
fn split(kb: &mut KnowledgeBase, ax: &Axiom, out: &mut Vec<Axiom>) {
    let c = &mut kb.concepts;
    match ax {
        Axiom::SubClass(l, r) => gci(kb, *l, *r, out),
        Axiom::Equivalent(cs) => {
            for &a in cs {
                for &b in cs {
                    if a != b {
                        gci(kb, a, b, out);
                    }
                }
            }
        }
        Axiom::Disjoint(cs) => {
            for (k, &a) in cs.iter().enumerate() {
                for &b in &cs[k + 1..] {
                    let both = c.and([a, b]);
                    out.push(Axiom::SubClass(both, ConceptId::BOTTOM));
                }
            }
        }
        Axiom::DisjointUnion(a, cs) => {
            let union = c.or(cs.iter().copied());
            out.push(Axiom::SubClass(*a, union));
            for &d in cs {
                out.push(Axiom::SubClass(d, *a));
            }
            split(kb, &Axiom::Disjoint(cs.clone()), out);
        }
        Axiom::Domain(r, d) => {
            let some = c.some(*r, ConceptId::TOP);
            out.push(Axiom::SubClass(some, *d));
        }
        Axiom::ClassAssertion(k, a) => match kb.concepts.get(*k).clone() {
            Concept::And(ps) => out.extend(ps.into_iter().map(|p| Axiom::ClassAssertion(p, *a))),
            _ => out.push(ax.clone()),
        },
        other => out.push(other.clone()),
    }
}

/// C ⊑ D with conjunctions on the right and disjunctions on the left split.
fn gci(kb: &mut KnowledgeBase, l: ConceptId, r: ConceptId, out: &mut Vec<Axiom>) {
    if let Concept::And(ps) = kb.concepts.get(r).clone() {
        for p in ps {
            gci(kb, l, p, out);
        }
    } else if let Concept::Or(ps) = kb.concepts.get(l).clone() {
        for p in ps {
            gci(kb, p, r, out);
        }
    } else if r != ConceptId::TOP && l != ConceptId::BOTTOM {
        out.push(Axiom::SubClass(l, r));
    }
}

/// One-step weakenings of a piece, each as the pieces that replace it (empty: it goes).
fn weakenings(kb: &mut KnowledgeBase, ax: &Axiom) -> Vec<Vec<Axiom>> {
    let mut out: Vec<Vec<Axiom>> = vec![Vec::new()];
    match *ax {
        Axiom::SubClass(l, r) => {
            for w in weaker(kb, r) {
                let mut v = Vec::new();
                gci(kb, l, w, &mut v);
                out.push(v);
            }
            for s in stronger(kb, l) {
                let mut v = Vec::new();
                gci(kb, s, r, &mut v);
                out.push(v);
            }
        }
        Axiom::ClassAssertion(c, a) => {
            for w in weaker(kb, c) {
                if w != ConceptId::TOP {
                    out.push(vec![Axiom::ClassAssertion(w, a)]);
                }
            }
        }
        _ => {}
    }
    out.retain(|v| v.first() != Some(ax));
    out
}

/// Concepts one step weaker than `x` (it implies each of them).
fn weaker(kb: &mut KnowledgeBase, x: ConceptId) -> Vec<ConceptId> {
    let c = kb.concepts.get(x).clone();
    let mut out = Vec::new();
    match c {
        Concept::Top => return out,
        Concept::And(ps) => {
            for k in 0..ps.len() {
                let rest: Vec<ConceptId> =
                    (0..ps.len()).filter(|&j| j != k).map(|j| ps[j]).collect();
                out.push(kb.concepts.and(rest));
            }
            for k in 0..ps.len() {
                for w in weaker(kb, ps[k]) {
                    let mut v = ps.clone();
                    v[k] = w;
                    out.push(kb.concepts.and(v));
                }
            }
        }
        Concept::Or(ps) => {
            out.push(ConceptId::TOP);
            for k in 0..ps.len() {
                for w in weaker(kb, ps[k]) {
                    let mut v = ps.clone();
                    v[k] = w;
                    out.push(kb.concepts.or(v));
                }
            }
        }
        Concept::Some(r, f) => {
            out.push(ConceptId::TOP);
            for w in weaker(kb, f) {
                out.push(kb.concepts.some(r, w));
            }
        }
        Concept::All(r, f) => {
            out.push(ConceptId::TOP);
            for w in weaker(kb, f) {
                out.push(kb.concepts.all(r, w));
            }
        }
        Concept::AtLeast(n, r, f) => {
            out.push(ConceptId::TOP);
            if n > 1 {
                out.push(kb.concepts.at_least(n - 1, r, f));
            }
            for w in weaker(kb, f) {
                out.push(kb.concepts.at_least(n, r, w));
            }
        }
        Concept::AtMost(n, r, f) => {
            out.push(ConceptId::TOP);
            out.push(kb.concepts.at_most(n + 1, r, f));
            for s in stronger(kb, f) {
                out.push(kb.concepts.at_most(n, r, s));
            }
        }
        _ => out.push(ConceptId::TOP),
    }
    out.retain(|&w| w != x);
    out.dedup();
    out
}

/// Concepts one step stronger than `x` (each implies it).
fn stronger(kb: &mut KnowledgeBase, x: ConceptId) -> Vec<ConceptId> {
    let c = kb.concepts.get(x).clone();
    let mut out = Vec::new();
    match c {
        Concept::Bottom | Concept::Top => {
            if x != ConceptId::BOTTOM {
                out.push(ConceptId::BOTTOM);
            }
        }
        Concept::Or(ps) => {
            for k in 0..ps.len() {
                let rest: Vec<ConceptId> =
                    (0..ps.len()).filter(|&j| j != k).map(|j| ps[j]).collect();
                out.push(kb.concepts.or(rest));
            }
            for k in 0..ps.len() {
                for s in stronger(kb, ps[k]) {
                    let mut v = ps.clone();
                    v[k] = s;
                    out.push(kb.concepts.or(v));
                }
            }
        }
        Concept::And(ps) => {
            out.push(ConceptId::BOTTOM);
            for k in 0..ps.len() {
                for s in stronger(kb, ps[k]) {
                    let mut v = ps.clone();
                    v[k] = s;
                    out.push(kb.concepts.and(v));
                }
            }
        }
        Concept::Some(r, f) => {
            out.push(ConceptId::BOTTOM);
            for s in stronger(kb, f) {
                out.push(kb.concepts.some(r, s));
            }
        }
        Concept::All(r, f) => {
            out.push(ConceptId::BOTTOM);
            for s in stronger(kb, f) {
                out.push(kb.concepts.all(r, s));
            }
        }
        Concept::AtLeast(n, r, f) => {
            out.push(ConceptId::BOTTOM);
            for s in stronger(kb, f) {
                out.push(kb.concepts.at_least(n, r, s));
            }
        }
        Concept::AtMost(n, r, f) => {
            out.push(ConceptId::BOTTOM);
            if n > 0 {
                out.push(kb.concepts.at_most(n - 1, r, f));
            }
            for w in weaker(kb, f) {
                out.push(kb.concepts.at_most(n, r, w));
            }
        }
        _ => out.push(ConceptId::BOTTOM),
    }
    out.retain(|&s| s != x);
    out.dedup();
    out
}

/// A laconic piece in OWL 2 functional syntax (full IRIs); other axioms in DL notation.
pub fn axiom_ofn(kb: &KnowledgeBase, ax: &Axiom) -> String {
    let c = |x: ConceptId| super::assertion::concept_ofn(kb, &kb.concepts, &kb.ranges, x);
    match *ax {
        Axiom::SubClass(l, r) => format!("SubClassOf({} {})", c(l), c(r)),
        Axiom::ClassAssertion(k, a) => {
            format!("ClassAssertion({} <{}>)", c(k), kb.vocab.individual_iri(a))
        }
        _ => crate::kb::dl::dl_axiom(kb, ax),
    }
}

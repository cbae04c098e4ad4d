//! The top and bottom properties inside class expressions.
//!
//! **The universal role** (owl:topObjectProperty, U, relating every pair of elements) is
//! reduced to nominals and inverses, which the tableau already decides (SHOIQ): a fresh
//! individual o (the hub) and a fresh property h (the link) with the background axiom
//! ⊤ ⊑ ∃h.{o} ⊓ ∀h.{o}, so that every element is linked to o and to o alone, and o is
//! linked back to every element. Then
//!
//! | class expression | becomes        |
//! |------------------|----------------|
//! | ∃U.C             | ∃h.∃h⁻.C       |
//! | ∀U.C             | ∀h.∀h⁻.C       |
//!
//! Why this is exact (hand-derived): a model I of the ontology becomes a model of the
//! encoding by choosing o as any element d and h as Δ×{d}; then (h⁻)(d) = Δ and each right
//! column holds exactly where its left column does. Conversely, in a model J of the encoding
//! every element's only h-successor is o^J, whose h⁻-successors are all of Δ, so each right
//! column again means its left column, and forgetting h and o gives a model of the ontology.
//! The two agree on every entailment over the ontology's own names. Only knowledge bases that
//! use U pay for the hub (it is a nominal, so their concept tests carry the ABox).
//!
//! U is not simple (OWL 2 Structural Specification §11.1), so OWL 2 DL keeps it out of
//! number restrictions, self restrictions and the axioms that need simple properties
//! ([`NOT_SIMPLE`]); ∃U.{a} holds everywhere.
//!
//! The hub and the link get names of the `_:` (anonymous) form, which the outputs leave out
//! like anonymous individuals, and which keys do not apply to.
//!
//! **The data properties.** OWL 2 DL allows owl:topDataProperty only as a super-property
//! ([`TOP_DATA`]); owl:bottomDataProperty relates nothing, so its restrictions are ⊤ or ⊥
//! whatever the range ([`bottom`]).

use super::{Axiom, ConceptId, ConceptStore, IndividualId, KnowledgeBase, PropId, RoleId};

/// The name of the hub individual of the universal role's encoding.
pub const HUB: &str = "_:wherefore-universal-hub";
/// The name of the link property of the universal role's encoding.
pub const LINK: &str = "_:wherefore-universal-link";

/// A restriction's kind, for restrictions on the top and bottom properties.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Restriction {
    /// ∃p.F (and ObjectHasValue / DataHasValue).
    Some,
    /// ∀p.F.
    All,
    /// ≥n p.F.
    AtLeast(u32),
    /// ≤n p.F.
    AtMost(u32),
}

/// Why a number restriction or a simple-only axiom on the top object property is refused.
pub const NOT_SIMPLE: &str = "owl:topObjectProperty is not a simple property (OWL 2 Structural Specification §11.1), so OWL 2 DL (§11.2) forbids it in number and self restrictions and in functional, inverse-functional, irreflexive, asymmetric and disjoint-property axioms; rewrite the axiom with an ordinary property";

/// Why owl:topDataProperty is refused outside the super-property of SubDataPropertyOf.
pub const TOP_DATA: &str = "OWL 2 DL allows owl:topDataProperty only as the super-property of SubDataPropertyOf (OWL 2 Structural Specification §11.2); remove it from this axiom";

impl KnowledgeBase {
    /// The link role and the hub's nominal, set up on first use.
    fn universal_hub(&mut self) -> (RoleId, ConceptId) {
        let (h, o) = match self.universal {
            Some(pair) => pair,
            None => {
                let pair = (self.vocab.prop(LINK), self.vocab.individual(HUB));
                self.universal = Some(pair);
                self.tbox_nominals = true;
                pair
            }
        };
        (RoleId::named(h), self.concepts.nominal(o))
    }

    /// ∃U.`filler` (`all` false) or ∀U.`filler` (`all` true) on the universal role, in the
    /// encoding of the module comment.
    pub fn universal_restriction(&mut self, all: bool, filler: ConceptId) -> ConceptId {
        let (h, _) = self.universal_hub();
        let cs = &mut self.concepts;
        if all {
            let inner = cs.all(h.inverse(), filler);
            cs.all(h, inner)
        } else {
            let inner = cs.some(h.inverse(), filler);
            cs.some(h, inner)
        }
    }
}

/// The universal restriction a concept of the encoding stands for, for writing it back:
/// `Some((all, filler))` for ∃h.∃h⁻.F (`all` false) and ∀h.∀h⁻.F (`all` true).
pub fn as_universal(
    kb: &KnowledgeBase,
    cs: &ConceptStore,
    c: ConceptId,
) -> Option<(bool, ConceptId)> {
    use super::Concept;
    let (h, _) = kb.universal?;
    let h = RoleId::named(h);
    match *cs.get(c) {
        Concept::Some(r, inner) if r == h => match *cs.get(inner) {
            Concept::Some(b, f) if b == h.inverse() => Some((false, f)),
            _ => None,
        },
        Concept::All(r, inner) if r == h => match *cs.get(inner) {
            Concept::All(b, f) if b == h.inverse() => Some((true, f)),
            _ => None,
        },
        _ => None,
    }
}

/// The background axiom ⊤ ⊑ ∃h.{o} ⊓ ∀h.{o} when the knowledge base uses the universal role.
/// It is part of every reasoner built over the knowledge base, whichever axioms are enabled:
/// it constrains only the fresh names, so it never changes an answer by itself.
pub fn hub_axiom(
    universal: Option<(PropId, IndividualId)>,
    concepts: &mut ConceptStore,
) -> Option<Axiom> {
    let (h, o) = universal?;
    let h = RoleId::named(h);
    let n = concepts.nominal(o);
    let some = concepts.some(h, n);
    let all = concepts.all(h, n);
    let both = concepts.and([some, all]);
    Some(Axiom::SubClass(ConceptId::TOP, both))
}

/// `kind` on owl:bottomDataProperty or owl:bottomObjectProperty, whatever the filler: ⊤ or ⊥.
pub fn bottom(kind: Restriction) -> ConceptId {
    match kind {
        Restriction::All | Restriction::AtMost(_) | Restriction::AtLeast(0) => ConceptId::TOP,
        Restriction::Some | Restriction::AtLeast(_) => ConceptId::BOTTOM,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn bottom_restrictions() {
        assert_eq!(bottom(Restriction::Some), ConceptId::BOTTOM);
        assert_eq!(bottom(Restriction::AtLeast(0)), ConceptId::TOP);
        assert_eq!(bottom(Restriction::AtLeast(1)), ConceptId::BOTTOM);
        assert_eq!(bottom(Restriction::AtMost(0)), ConceptId::TOP);
        assert_eq!(bottom(Restriction::All), ConceptId::TOP);
    }

    #[test]
    fn the_hub_is_made_once() {
        let mut kb = KnowledgeBase::new();
        let a = kb.universal_restriction(false, ConceptId::TOP);
        let b = kb.universal_restriction(false, ConceptId::TOP);
        assert_eq!(a, b);
        assert_eq!(kb.vocab.props.len(), 1);
        assert_eq!(kb.vocab.individuals.len(), 1);
        assert!(kb.tbox_nominals);
        assert_eq!(
            as_universal(&kb, &kb.concepts, a),
            Some((false, ConceptId::TOP))
        );
        let c = kb.universal_restriction(true, ConceptId::BOTTOM);
        assert_eq!(
            as_universal(&kb, &kb.concepts, c),
            Some((true, ConceptId::BOTTOM))
        );
        let mut cs = kb.concepts.clone();
        assert!(hub_axiom(kb.universal, &mut cs).is_some());
        assert!(hub_axiom(None, &mut cs).is_none());
    }
}

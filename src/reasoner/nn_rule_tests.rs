//! Hand-derived checks of SHOIQ's NN-rule and ≤o-rule (Horrocks & Sattler 2007) in
//! [`super::Tableau`]: at-most restrictions on a nominal that blocking alone would let
//! unravelling break.

use crate::kb::load::load_axioms_text;
use crate::kb::{Concept, ConceptId, KnowledgeBase};
use crate::reasoner::{Answer, Reasoner};

fn kb(text: &str) -> KnowledgeBase {
    let mut kb = KnowledgeBase::default();
    load_axioms_text(&mut kb, "test", text).expect("test axioms parse");
    kb
}

fn class(kb: &KnowledgeBase, n: &str) -> ConceptId {
    let c = kb
        .vocab
        .find_class(&format!("urn:t#{n}"))
        .expect("declared class");
    kb.concepts.find(&Concept::Atom(c)).expect("class concept")
}

/// The nominal o has at most `k` r-predecessors in A; every A has an A s-successor and
/// o as r-filler; s is inverse functional. Start is an A without s-predecessor.
fn chain(k: u32, inverse_functional: bool) -> String {
    let inv = if inverse_functional {
        "InverseFunctionalObjectProperty(:s)"
    } else {
        ""
    };
    format!(
        "Prefix(:=<urn:t#>)
Declaration(Class(:A)) Declaration(Class(:Start))
Declaration(ObjectProperty(:r)) Declaration(ObjectProperty(:s))
Declaration(NamedIndividual(:o))
SubClassOf(ObjectOneOf(:o) ObjectMaxCardinality({k} ObjectInverseOf(:r) :A))
SubClassOf(:A ObjectSomeValuesFrom(:s :A))
SubClassOf(:A ObjectHasValue(:r :o))
{inv}
SubClassOf(:Start ObjectIntersectionOf(:A ObjectAllValuesFrom(ObjectInverseOf(:s) owl:Nothing)))
"
    )
}

#[test]
fn inverse_functional_chain_overflows_the_nominal() {
    // Hand-derived. Let e0 ∈ Start and e(i+1) an s-successor in A of e(i). All e(i) are
    // distinct: take e(i) = e(j), i < j, with j least. i = 0 gives e0 the s-predecessor
    // e(j-1), against ∀s⁻.⊥; i > 0 gives e(i) the s-predecessors e(i-1) and e(j-1), equal
    // by inverse functionality, against j least. So infinitely many A's are
    // r-predecessors of o, and ≤k r⁻.A fails for every k: Start is unsatisfiable. A alone
    // is satisfiable: one element e ∈ A with s(e, e) and r(e, o) (one s-predecessor, one
    // A r-predecessor of o). Blocking stops the chain after three nodes, so without the
    // NN-rule k ≥ 3 used to be answered "satisfiable".
    for k in [1, 2, 3, 4, 6] {
        let kb = kb(&chain(k, true));
        let mut r = Reasoner::new(&kb).expect("SHOIQ is accepted");
        assert_eq!(r.is_consistent(), Answer::Yes, "k = {k}");
        let (start, a) = (class(&kb, "Start"), class(&kb, "A"));
        assert_eq!(r.is_satisfiable(start), Answer::No, "Start, k = {k}");
        assert_eq!(r.is_satisfiable(a), Answer::Yes, "A, k = {k}");
    }
}

#[test]
fn plain_chain_fits_in_two_elements() {
    // Hand-derived. Without inverse functionality, e0 ∈ Start with s(e0, e1), s(e1, e1),
    // e0, e1 ∈ A and r(e0, o), r(e1, o) is a model: o has two A r-predecessors, within ≤k
    // for k ≥ 2; so Start is satisfiable for k ≥ 2. For k = 1, e0 and its s-successor
    // would both be the single A r-predecessor of o, so e0 would be its own s-successor,
    // against ∀s⁻.⊥: unsatisfiable. The graph's blocked chain meets o's restriction in a
    // copied node for k ≥ 3, which the NN-rule decides instead of "limit reached".
    for (k, want) in [
        (1, Answer::No),
        (2, Answer::Yes),
        (3, Answer::Yes),
        (5, Answer::Yes),
    ] {
        let kb = kb(&chain(k, false));
        let mut r = Reasoner::new(&kb).expect("SHOIQ is accepted");
        let start = class(&kb, "Start");
        assert_eq!(r.is_satisfiable(start), want, "k = {k}");
    }
}

#[test]
fn guessed_nominals_count_against_each_other() {
    // Hand-derived. o has at most two r-predecessors in A (≤2 r⁻.A); every A has o as
    // r-filler and an s-successor in A that is in exactly one of the pairwise disjoint
    // B1, B2, B3, with Bi's s-successors in B(i+1) (B3's in B1). An A in B1 thus needs
    // A's in B1, B2 and B3: three distinct A r-predecessors of o, so A ⊓ B1 is
    // unsatisfiable; with ≤3 r⁻.A the cycle B1 → B2 → B3 → B1 of three elements is a
    // model and A ⊓ B1 (here C) is satisfiable.
    let text = |k: u32| {
        format!(
            "Prefix(:=<urn:t#>)
Declaration(Class(:A)) Declaration(Class(:C))
Declaration(Class(:B1)) Declaration(Class(:B2)) Declaration(Class(:B3))
Declaration(ObjectProperty(:r)) Declaration(ObjectProperty(:s))
Declaration(NamedIndividual(:o))
SubClassOf(ObjectOneOf(:o) ObjectMaxCardinality({k} ObjectInverseOf(:r) :A))
SubClassOf(:A ObjectHasValue(:r :o))
SubClassOf(:A ObjectSomeValuesFrom(:s :A))
DisjointClasses(:B1 :B2 :B3)
SubClassOf(:A ObjectUnionOf(:B1 :B2 :B3))
SubClassOf(:B1 ObjectAllValuesFrom(:s :B2))
SubClassOf(:B2 ObjectAllValuesFrom(:s :B3))
SubClassOf(:B3 ObjectAllValuesFrom(:s :B1))
EquivalentClasses(:C ObjectIntersectionOf(:A :B1))
"
        )
    };
    for (k, want) in [(2, Answer::No), (3, Answer::Yes)] {
        let kb = kb(&text(k));
        let mut r = Reasoner::new(&kb).expect("SHOIQ is accepted");
        let c = class(&kb, "C");
        assert_eq!(r.is_satisfiable(c), want, "k = {k}");
    }
}

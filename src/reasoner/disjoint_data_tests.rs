//! Hand-derived checks of disjoint data properties in [`super::Tableau`]: nodes whose values
//! may collide take the full search of [`super::datavalues`], its clashes backjump only over
//! the choices they depend on, and values met through merges into nominals count too.
//! Semantics: OWL 2 Direct Semantics, Table 8 (DisjointDataProperties(P1 … Pn): the Pi^DP
//! are pairwise disjoint sets of (individual, literal) pairs).

use crate::kb::load::load_axioms_text;
use crate::kb::{Concept, ConceptId, KnowledgeBase};
use crate::reasoner::{Answer, Reasoner};

fn kb(text: &str) -> KnowledgeBase {
    let mut kb = KnowledgeBase::default();
    let head = "Prefix(:=<urn:t#>)
Prefix(xsd:=<http://www.w3.org/2001/XMLSchema#>)
Declaration(DataProperty(:P)) Declaration(DataProperty(:Q)) Declaration(DataProperty(:R))
Declaration(ObjectProperty(:r)) Declaration(NamedIndividual(:a))
";
    load_axioms_text(&mut kb, "test", &format!("{head}{text}")).expect("test axioms parse");
    kb
}

fn class(kb: &KnowledgeBase, n: &str) -> ConceptId {
    let c = kb
        .vocab
        .find_class(&format!("urn:t#{n}"))
        .expect("declared class");
    kb.concepts.find(&Concept::Atom(c)).expect("class concept")
}

fn satisfiable(text: &str, name: &str) -> Answer {
    let kb = kb(text);
    let mut r = Reasoner::new(&kb).expect("accepted");
    r.is_satisfiable(class(&kb, name))
}

#[test]
fn plain_existentials_take_the_full_search() {
    // Hand-derived: ∃P.{1} ⊓ ∃Q.{1} gives one individual the value 1 for both P and Q, which
    // DisjointDataProperties(P Q) forbids; the node has no number restriction, so the check
    // must not stop at the per-value range test. ∃P.{1} ⊓ ∃R.{1}: R is in no disjoint pair.
    let text = "Declaration(Class(:C)) Declaration(Class(:D))
DisjointDataProperties(:P :Q)
EquivalentClasses(:C ObjectIntersectionOf(DataHasValue(:P \"1\"^^xsd:integer) DataHasValue(:Q \"1\"^^xsd:integer)))
EquivalentClasses(:D ObjectIntersectionOf(DataHasValue(:P \"1\"^^xsd:integer) DataHasValue(:R \"1\"^^xsd:integer)))
";
    assert_eq!(satisfiable(text, "C"), Answer::No);
    assert_eq!(satisfiable(text, "D"), Answer::Yes);
}

#[test]
fn clash_backjumps_to_the_disjunction_it_depends_on() {
    // Hand-derived: (∃P.{1} ⊔ ∃P.{2}) ⊓ ∃Q.{1}: the first disjunct clashes with Q's value,
    // the second does not (P = 2, Q = 1): satisfiable. A clash without the disjunction's
    // dependency would backjump past it and answer "unsatisfiable".
    let text = "Declaration(Class(:C))
DisjointDataProperties(:P :Q)
EquivalentClasses(:C ObjectIntersectionOf(
  ObjectUnionOf(DataHasValue(:P \"1\"^^xsd:integer) DataHasValue(:P \"2\"^^xsd:integer))
  DataHasValue(:Q \"1\"^^xsd:integer)))
";
    assert_eq!(satisfiable(text, "C"), Answer::Yes);
    // With the second disjunct ∃P.{1} too, both clash: unsatisfiable.
    let both = text.replace("\"2\"", "\"01\"");
    assert_eq!(satisfiable(&both, "C"), Answer::No);
}

#[test]
fn values_meet_through_a_merge_into_a_nominal() {
    // Hand-derived: P(a, 1) is asserted; C ≡ ∃r.({a} ⊓ ∃Q.{1}) sends an r-successor that is
    // a, with Q-value 1: a would have 1 for P and Q. C is unsatisfiable; with ∃Q.{2} it is
    // satisfiable.
    let text = "Declaration(Class(:C)) Declaration(Class(:E))
DisjointDataProperties(:P :Q)
DataPropertyAssertion(:P :a \"1\"^^xsd:integer)
EquivalentClasses(:C ObjectSomeValuesFrom(:r ObjectIntersectionOf(ObjectOneOf(:a) DataHasValue(:Q \"1\"^^xsd:integer))))
EquivalentClasses(:E ObjectSomeValuesFrom(:r ObjectIntersectionOf(ObjectOneOf(:a) DataHasValue(:Q \"2\"^^xsd:integer))))
";
    assert_eq!(satisfiable(text, "C"), Answer::No);
    assert_eq!(satisfiable(text, "E"), Answer::Yes);
}

#[test]
fn a_property_disjoint_from_itself_is_empty() {
    // From the Direct Semantics' condition (DPi)^DP ∩ (DPj)^DP = ∅ for i ≠ j: with P listed
    // twice, P^DP ∩ P^DP = P^DP is empty, so ∃P.⊤ is unsatisfiable; ∃Q.⊤ is not.
    let text = "Declaration(Class(:C)) Declaration(Class(:D))
DisjointDataProperties(:P :P)
EquivalentClasses(:C DataSomeValuesFrom(:P rdfs:Literal))
EquivalentClasses(:D DataSomeValuesFrom(:Q rdfs:Literal))
";
    assert_eq!(satisfiable(text, "C"), Answer::No);
    assert_eq!(satisfiable(text, "D"), Answer::Yes);
}

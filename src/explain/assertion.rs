//! Assertions as hypotheses and observations, with their functional-syntax text.

use crate::kb::{
    Concept, ConceptId, ConceptStore, DataRangeStore, IndividualId, KnowledgeBase, RoleId,
};
use crate::reasoner::Extra;

/// A class or property assertion.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Assertion {
    /// C(a), C any concept (an atom, a negated atom or a complex concept).
    Class(ConceptId, IndividualId),
    /// r(a, b).
    Role(RoleId, IndividualId, IndividualId),
}

impl Assertion {
    /// Adds the assertion to a test's extra assertions.
    pub fn add_to(&self, extra: &mut Extra) {
        match *self {
            Assertion::Class(c, a) => extra.classes.push((c, a)),
            Assertion::Role(r, a, b) => extra.roles.push((r, a, b)),
        }
    }

    /// Adds the negation of the assertion: ¬C(a), or (∀r.¬{b})(a) for r(a, b).
    pub fn add_negation_to(&self, concepts: &mut ConceptStore, extra: &mut Extra) {
        match *self {
            Assertion::Class(c, a) => extra.classes.push((concepts.not(c), a)),
            Assertion::Role(r, a, b) => {
                let nb = concepts.nominal(b);
                let nnb = concepts.not(nb);
                let all = concepts.all(r, nnb);
                extra.classes.push((all, a));
            }
        }
    }

    /// The assertion in OWL 2 functional syntax with full IRIs.
    pub fn text(&self, kb: &KnowledgeBase, concepts: &ConceptStore) -> String {
        match *self {
            Assertion::Class(c, a) => format!(
                "ClassAssertion({} <{}>)",
                concept_ofn(kb, concepts, &kb.ranges, c),
                kb.vocab.individual_iri(a)
            ),
            Assertion::Role(r, a, b) => {
                let (a, b) = if r.is_inverse() { (b, a) } else { (a, b) };
                format!(
                    "ObjectPropertyAssertion(<{}> <{}> <{}>)",
                    kb.vocab.prop_iri(r.prop()),
                    kb.vocab.individual_iri(a),
                    kb.vocab.individual_iri(b)
                )
            }
        }
    }

    /// The individuals the assertion is about.
    pub fn individuals(&self) -> Vec<IndividualId> {
        match *self {
            Assertion::Class(_, a) => vec![a],
            Assertion::Role(_, a, b) => vec![a, b],
        }
    }
}

fn role_ofn(kb: &KnowledgeBase, r: RoleId) -> String {
    let p = format!("<{}>", kb.vocab.prop_iri(r.prop()));
    if r.is_inverse() {
        format!("ObjectInverseOf({p})")
    } else {
        p
    }
}

/// A concept in OWL 2 functional syntax (as stored, in negation normal form).
pub fn concept_ofn(
    kb: &KnowledgeBase,
    cs: &ConceptStore,
    ranges: &DataRangeStore,
    c: ConceptId,
) -> String {
    let f = |x: ConceptId| concept_ofn(kb, cs, ranges, x);
    if let Some((all, filler)) = crate::kb::universal::as_universal(kb, cs, c) {
        let kind = if all { "All" } else { "Some" };
        return format!(
            "Object{kind}ValuesFrom(<http://www.w3.org/2002/07/owl#topObjectProperty> {})",
            f(filler)
        );
    }
    match cs.get(c) {
        Concept::Top => "owl:Thing".replace("owl:", "<http://www.w3.org/2002/07/owl#") + ">",
        Concept::Bottom => "<http://www.w3.org/2002/07/owl#Nothing>".into(),
        Concept::Atom(a) => format!("<{}>", kb.vocab.class_iri(*a)),
        Concept::NotAtom(a) => format!("ObjectComplementOf(<{}>)", kb.vocab.class_iri(*a)),
        Concept::Nominal(i) => format!("ObjectOneOf(<{}>)", kb.vocab.individual_iri(*i)),
        Concept::NotNominal(i) => format!(
            "ObjectComplementOf(ObjectOneOf(<{}>))",
            kb.vocab.individual_iri(*i)
        ),
        Concept::And(xs) => format!(
            "ObjectIntersectionOf({})",
            xs.iter().map(|&x| f(x)).collect::<Vec<_>>().join(" ")
        ),
        Concept::Or(xs) => format!(
            "ObjectUnionOf({})",
            xs.iter().map(|&x| f(x)).collect::<Vec<_>>().join(" ")
        ),
        Concept::Some(r, x) => format!("ObjectSomeValuesFrom({} {})", role_ofn(kb, *r), f(*x)),
        Concept::All(r, x) => format!("ObjectAllValuesFrom({} {})", role_ofn(kb, *r), f(*x)),
        Concept::AtLeast(n, r, x) => {
            format!("ObjectMinCardinality({n} {} {})", role_ofn(kb, *r), f(*x))
        }
        Concept::AtMost(n, r, x) => {
            format!("ObjectMaxCardinality({n} {} {})", role_ofn(kb, *r), f(*x))
        }
        Concept::DataSome(p, d) => {
            format!(
                "DataSomeValuesFrom(<{}> {})",
                kb.vocab.data_props[p.index()],
                ranges.get(*d).describe()
            )
        }
        Concept::DataAll(p, d) => {
            format!(
                "DataAllValuesFrom(<{}> {})",
                kb.vocab.data_props[p.index()],
                ranges.get(*d).describe()
            )
        }
        Concept::HasSelf(r) => format!("ObjectHasSelf({})", role_ofn(kb, *r)),
        Concept::NotSelf(r) => format!("ObjectComplementOf(ObjectHasSelf({}))", role_ofn(kb, *r)),
        // Automaton states exist only inside the tableau; the restriction they came from.
        Concept::AllPath(r, _, x) => format!("ObjectAllValuesFrom({} {})", role_ofn(kb, *r), f(*x)),
        Concept::SomePath(r, _, x) => {
            format!("ObjectSomeValuesFrom({} {})", role_ofn(kb, *r), f(*x))
        }
        Concept::DataAtLeast(n, p, d) => format!(
            "DataMinCardinality({n} <{}> {})",
            kb.vocab.data_props[p.index()],
            ranges.get(*d).describe()
        ),
        Concept::DataAtMost(n, p, d) => format!(
            "DataMaxCardinality({n} <{}> {})",
            kb.vocab.data_props[p.index()],
            ranges.get(*d).describe()
        ),
    }
}

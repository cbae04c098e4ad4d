//! Description-logic notation with short names (IRI fragments): `A ⊑ ∃r.B`, `C(a)`,
//! `disjoint(A, B)`. The one writer of that notation, used by the report's formal register,
//! the command line's and the shell's texts, and laconic justifications.

use super::names::fragment;
use super::{Axiom, Concept, ConceptId, IndividualId, KnowledgeBase, RoleId};

fn short(iri: &str) -> String {
    fragment(iri).to_string()
}

/// A concept in description-logic notation with short names.
pub fn dl_concept(kb: &KnowledgeBase, c: ConceptId) -> String {
    let cs = &kb.concepts;
    let role = |r: RoleId| {
        let n = short(kb.vocab.prop_iri(r.prop()));
        if r.is_inverse() { format!("{n}⁻") } else { n }
    };
    let paren = |x: ConceptId| {
        let t = dl_concept(kb, x);
        if matches!(cs.get(x), Concept::And(_) | Concept::Or(_)) {
            format!("({t})")
        } else {
            t
        }
    };
    if let Some((all, filler)) = super::universal::as_universal(kb, cs, c) {
        return format!("{}U.{}", if all { "∀" } else { "∃" }, paren(filler));
    }
    match cs.get(c) {
        Concept::Top => "⊤".into(),
        Concept::Bottom => "⊥".into(),
        Concept::Atom(a) => short(kb.vocab.class_iri(*a)),
        Concept::NotAtom(a) => format!("¬{}", short(kb.vocab.class_iri(*a))),
        Concept::Nominal(i) => format!("{{{}}}", short(kb.vocab.individual_iri(*i))),
        Concept::NotNominal(i) => format!("¬{{{}}}", short(kb.vocab.individual_iri(*i))),
        Concept::And(xs) => xs.iter().map(|&x| paren(x)).collect::<Vec<_>>().join(" ⊓ "),
        Concept::Or(xs) => xs.iter().map(|&x| paren(x)).collect::<Vec<_>>().join(" ⊔ "),
        Concept::Some(r, x) => format!("∃{}.{}", role(*r), paren(*x)),
        Concept::All(r, x) => format!("∀{}.{}", role(*r), paren(*x)),
        Concept::AtLeast(n, r, x) => format!("≥{n} {}.{}", role(*r), paren(*x)),
        Concept::AtMost(n, r, x) => format!("≤{n} {}.{}", role(*r), paren(*x)),
        Concept::DataSome(p, d) => format!(
            "∃{}.{}",
            short(&kb.vocab.data_props[p.index()]),
            kb.ranges.get(*d).describe()
        ),
        Concept::DataAll(p, d) => format!(
            "∀{}.{}",
            short(&kb.vocab.data_props[p.index()]),
            kb.ranges.get(*d).describe()
        ),
        Concept::HasSelf(r) => format!("∃{}.Self", role(*r)),
        Concept::NotSelf(r) => format!("¬∃{}.Self", role(*r)),
        Concept::AllPath(r, q, x) => format!("∀{}[{q}].{}", role(*r), paren(*x)),
        Concept::SomePath(r, q, x) => format!("∃{}[{q}].{}", role(*r), paren(*x)),
        Concept::DataAtLeast(n, p, d) => format!(
            "≥{n} {}.{}",
            short(&kb.vocab.data_props[p.index()]),
            kb.ranges.get(*d).describe()
        ),
        Concept::DataAtMost(n, p, d) => format!(
            "≤{n} {}.{}",
            short(&kb.vocab.data_props[p.index()]),
            kb.ranges.get(*d).describe()
        ),
    }
}

/// An axiom in description-logic notation.
pub fn dl_axiom(kb: &KnowledgeBase, a: &Axiom) -> String {
    let c = |x| dl_concept(kb, x);
    let role = |r: RoleId| {
        let n = short(kb.vocab.prop_iri(r.prop()));
        if r.is_inverse() { format!("{n}⁻") } else { n }
    };
    let ind = |i: IndividualId| short(kb.vocab.individual_iri(i));
    match a {
        Axiom::SubClass(x, y) => format!("{} ⊑ {}", c(*x), c(*y)),
        Axiom::Equivalent(xs) => xs.iter().map(|&x| c(x)).collect::<Vec<_>>().join(" ≡ "),
        Axiom::Disjoint(xs) => format!(
            "disjoint({})",
            xs.iter().map(|&x| c(x)).collect::<Vec<_>>().join(", ")
        ),
        Axiom::DisjointUnion(x, xs) => format!(
            "{} ≡ {} (disjoint)",
            c(*x),
            xs.iter().map(|&x| c(x)).collect::<Vec<_>>().join(" ⊔ ")
        ),
        Axiom::SubRole(r, s) => format!("{} ⊑ {}", role(*r), role(*s)),
        Axiom::Transitive(r) => format!("Trans({})", role(*r)),
        Axiom::SubRoleChain(rs, s) => format!(
            "{} ⊑ {}",
            rs.iter().map(|&r| role(r)).collect::<Vec<_>>().join(" ∘ "),
            role(*s)
        ),
        Axiom::Reflexive(r) => format!("Ref({})", role(*r)),
        Axiom::Irreflexive(r) => format!("Irr({})", role(*r)),
        Axiom::Asymmetric(r) => format!("Asy({})", role(*r)),
        Axiom::DisjointRoles(rs) => format!(
            "Dis({})",
            rs.iter().map(|&r| role(r)).collect::<Vec<_>>().join(", ")
        ),
        Axiom::HasKey(x, rs, ps) => format!(
            "key({}: {})",
            c(*x),
            rs.iter()
                .map(|&r| role(r))
                .chain(ps.iter().map(|p| short(&kb.vocab.data_props[p.index()])))
                .collect::<Vec<_>>()
                .join(", ")
        ),
        Axiom::Functional(r) => format!("⊤ ⊑ ≤1 {}.⊤", role(*r)),
        Axiom::Domain(r, x) => format!("∃{}.⊤ ⊑ {}", role(*r), c(*x)),
        Axiom::SubDataProp(p, q) => format!(
            "{} ⊑ {}",
            short(&kb.vocab.data_props[p.index()]),
            short(&kb.vocab.data_props[q.index()])
        ),
        Axiom::FunctionalData(p) => format!("Func({})", short(&kb.vocab.data_props[p.index()])),
        Axiom::DisjointDataProps(ps) => format!(
            "Dis({})",
            ps.iter()
                .map(|p| short(&kb.vocab.data_props[p.index()]))
                .collect::<Vec<_>>()
                .join(", ")
        ),
        Axiom::DataDomain(p, x) => {
            format!("∃{}.⊤ ⊑ {}", short(&kb.vocab.data_props[p.index()]), c(*x))
        }
        Axiom::DataRangeAxiom(p, d) => format!(
            "⊤ ⊑ ∀{}.{}",
            short(&kb.vocab.data_props[p.index()]),
            kb.ranges.get(*d).describe()
        ),
        Axiom::ClassAssertion(x, i) => format!("{}({})", c(*x), ind(*i)),
        Axiom::RoleAssertion(r, i, j) => format!("{}({}, {})", role(*r), ind(*i), ind(*j)),
        Axiom::NegativeRoleAssertion(r, i, j) => format!("¬{}({}, {})", role(*r), ind(*i), ind(*j)),
        Axiom::Same(xs) => xs.iter().map(|&i| ind(i)).collect::<Vec<_>>().join(" = "),
        Axiom::Different(xs) => xs.iter().map(|&i| ind(i)).collect::<Vec<_>>().join(" ≠ "),
    }
}

//! Which abducibles can matter, decided before any search: individuals connected to an
//! observation's, and symbols in a syntactic locality module of the observations'
//! signature (Cuenca Grau, Horrocks, Kazakov & Sattler 2008).

use super::super::assertion::Assertion;
use crate::kb::{Axiom, Concept, ConceptId, ConceptStore, IndividualId, KnowledgeBase, RoleId};
use crate::reasoner::Reasoner;
use std::collections::HashMap;

/// Connected components of the individuals through role assertions, equalities and role
/// abducibles; empty (no pruning) when the TBox has nominals, which connect everything.
pub fn components(r: &Reasoner, abd: &[Assertion]) -> HashMap<IndividualId, usize> {
    let p = r.prepared();
    let mut out = HashMap::new();
    if p.tbox_nominals {
        return out;
    }
    let n = p.n_individuals;
    let mut parent: Vec<usize> = (0..n).collect();
    fn root(p: &mut [usize], mut i: usize) -> usize {
        while p[i] != i {
            p[i] = p[p[i]];
            i = p[i];
        }
        i
    }
    let join = |a: usize, b: usize, parent: &mut Vec<usize>| {
        if a < n && b < n {
            let (x, y) = (root(parent, a), root(parent, b));
            parent[x] = y;
        }
    };
    for &(_, a, b) in &p.role_assertions {
        join(a.index(), b.index(), &mut parent);
    }
    for &(a, b) in &p.same {
        join(a.index(), b.index(), &mut parent);
    }
    // A negative property assertion or an enumeration also ties individuals together.
    for &(c, a) in &p.class_assertions {
        let mut stack = vec![c];
        while let Some(x) = stack.pop() {
            match r.concepts().get(x) {
                Concept::Nominal(b) | Concept::NotNominal(b) => {
                    join(a.index(), b.index(), &mut parent)
                }
                _ => stack.extend_from_slice(r.concepts().children(x)),
            }
        }
    }
    for a in abd {
        if let Assertion::Role(_, x, y) = *a {
            join(x.index(), y.index(), &mut parent);
        }
    }
    for i in 0..n {
        let c = root(&mut parent, i);
        out.insert(IndividualId(i as u32), c);
    }
    out
}

/// The ABox's independent parts, for two prunings. When unconnected parts of the ABox are
/// independent (no TBox nominals), an observation about one part is entailed or not
/// whatever is assumed about another; so a candidate needs an abducible of its own in each
/// part that holds an observation the KB alone does not entail (a lower bound on its final
/// size), and an abducible unconnected to the failing observation cannot help entail it.
pub struct Parts {
    component: HashMap<IndividualId, usize>,
    needy: Vec<usize>,
    abd_parts: Vec<Vec<usize>>,
}

impl Parts {
    /// The parts of the ABox with the abducibles' role assertions.
    pub fn new(r: &Reasoner, abd: &[Assertion]) -> Self {
        let component = components(r, abd);
        let abd_parts = abd
            .iter()
            .map(|a| {
                a.individuals()
                    .iter()
                    .filter_map(|x| component.get(x).copied())
                    .collect()
            })
            .collect();
        Parts {
            component,
            needy: Vec::new(),
            abd_parts,
        }
    }

    /// Records the observations that the KB alone does not entail: each of their parts
    /// needs an abducible of its own.
    pub fn set_needy(&mut self, needy_obs: &[Assertion]) {
        self.needy = needy_obs.iter().filter_map(|o| self.of(o)).collect();
        self.needy.sort_unstable();
        self.needy.dedup();
    }

    /// Whether the parts are known (they are not when the TBox has nominals).
    pub fn known(&self) -> bool {
        !self.component.is_empty()
    }

    /// The part of an observation.
    pub fn of(&self, o: &Assertion) -> Option<usize> {
        self.component.get(&o.individuals()[0]).copied()
    }

    /// Whether abducible `i` touches part `c` (always, when `c` is unknown).
    pub fn touches(&self, i: usize, c: Option<usize>) -> bool {
        c.is_none_or(|c| self.abd_parts[i].contains(&c))
    }

    /// How many more abducibles a set of abducibles needs at least.
    pub fn lower_bound(&self, set: &[usize]) -> usize {
        self.needy
            .iter()
            .filter(|c| !set.iter().any(|&i| self.abd_parts[i].contains(c)))
            .count()
    }
}

/// Which substitution a locality test assumes for the symbols outside the signature.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Locality {
    /// Classes become ⊤ and properties the universal role (⊤-locality).
    Top,
    /// Classes and properties become empty (⊥-locality).
    Bottom,
}

/// A signature: the classes and object properties it holds (data properties always count
/// as inside, which only makes modules larger).
#[derive(Clone, Debug)]
pub struct Signature {
    classes: Vec<bool>,
    props: Vec<bool>,
}

impl Signature {
    /// The empty signature of a knowledge base.
    pub fn empty(kb: &KnowledgeBase) -> Self {
        Signature {
            classes: vec![false; kb.vocab.classes.len()],
            props: vec![false; kb.vocab.props.len()],
        }
    }

    fn has_role(&self, r: RoleId) -> bool {
        self.props.get(r.prop().index()).copied().unwrap_or(true)
    }

    fn has_class(&self, a: crate::kb::ClassId) -> bool {
        self.classes.get(a.index()).copied().unwrap_or(true)
    }

    /// Adds the symbols of a concept; returns whether any was new.
    pub fn add_concept(&mut self, cs: &ConceptStore, c: ConceptId) -> bool {
        let mut new = false;
        let mut stack = vec![c];
        while let Some(x) = stack.pop() {
            match cs.get(x) {
                Concept::Atom(a) | Concept::NotAtom(a) => {
                    if let Some(s) = self.classes.get_mut(a.index()) {
                        new |= !*s;
                        *s = true;
                    }
                }
                Concept::Some(r, _)
                | Concept::All(r, _)
                | Concept::AtLeast(_, r, _)
                | Concept::AtMost(_, r, _)
                | Concept::HasSelf(r)
                | Concept::NotSelf(r)
                | Concept::AllPath(r, _, _)
                | Concept::SomePath(r, _, _) => new |= self.add_role(*r),
                _ => {}
            }
            stack.extend_from_slice(cs.children(x));
        }
        new
    }

    /// Adds a property; returns whether it was new.
    pub fn add_role(&mut self, r: RoleId) -> bool {
        match self.props.get_mut(r.prop().index()) {
            Some(s) if !*s => {
                *s = true;
                true
            }
            _ => false,
        }
    }

    /// Adds the symbols of an assertion.
    pub fn add_assertion(&mut self, cs: &ConceptStore, a: &Assertion) {
        match *a {
            Assertion::Class(c, _) => {
                self.add_concept(cs, c);
            }
            Assertion::Role(r, _, _) => {
                self.add_role(r);
            }
        }
    }

    /// Whether the concept becomes ⊤ (`want_top`) or ⊥ under the substitution, by the
    /// syntactic rules of Cuenca Grau et al. 2008 (Def. 25 and its ⊥ dual).
    fn equiv(&self, cs: &ConceptStore, c: ConceptId, l: Locality, want_top: bool) -> bool {
        let top = |x| self.equiv(cs, x, l, true);
        let bot = |x| self.equiv(cs, x, l, false);
        let out_role = |r: &RoleId| !self.has_role(*r);
        match (cs.get(c), want_top) {
            (Concept::Top, t) => t,
            (Concept::Bottom, t) => !t,
            (Concept::Atom(a), t) => !self.has_class(*a) && (t == (l == Locality::Top)),
            (Concept::NotAtom(a), t) => !self.has_class(*a) && (t == (l == Locality::Bottom)),
            (Concept::And(xs), true) => xs.iter().all(|&x| top(x)),
            (Concept::And(xs), false) => xs.iter().any(|&x| bot(x)),
            (Concept::Or(xs), true) => xs.iter().any(|&x| top(x)),
            (Concept::Or(xs), false) => xs.iter().all(|&x| bot(x)),
            (Concept::Some(r, x), true) => l == Locality::Top && out_role(r) && top(*x),
            (Concept::Some(r, x), false) => bot(*x) || (l == Locality::Bottom && out_role(r)),
            (Concept::All(r, x), true) => top(*x) || (l == Locality::Bottom && out_role(r)),
            (Concept::All(r, x), false) => l == Locality::Top && out_role(r) && bot(*x),
            (Concept::AtLeast(n, r, x), true) => {
                *n <= 1 && l == Locality::Top && out_role(r) && top(*x)
            }
            (Concept::AtLeast(_, r, x), false) => bot(*x) || (l == Locality::Bottom && out_role(r)),
            (Concept::AtMost(_, r, x), true) => bot(*x) || (l == Locality::Bottom && out_role(r)),
            (Concept::AtMost(..), false) => false,
            _ => false,
        }
    }

    /// Whether an axiom is local: it holds in every model whatever the symbols outside the
    /// signature were, once they are replaced as `l` says.
    fn local(&self, cs: &ConceptStore, ax: &Axiom, l: Locality) -> bool {
        let top = |c| self.equiv(cs, c, l, true);
        let bot = |c| self.equiv(cs, c, l, false);
        let out_role = |r: RoleId| !self.has_role(r);
        match ax {
            Axiom::SubClass(c, d) => bot(*c) || top(*d),
            Axiom::Equivalent(cs) => cs.iter().all(|&c| top(c)) || cs.iter().all(|&c| bot(c)),
            Axiom::Disjoint(cs) => cs.iter().filter(|&&c| !bot(c)).count() <= 1,
            Axiom::DisjointUnion(a, cs) => bot(*a) && cs.iter().all(|&c| bot(c)),
            Axiom::SubRole(r, s) => match l {
                Locality::Top => out_role(*s),
                Locality::Bottom => out_role(*r),
            },
            Axiom::Transitive(r) => out_role(*r),
            Axiom::Functional(r) => l == Locality::Bottom && out_role(*r),
            Axiom::Domain(r, c) => top(*c) || (l == Locality::Bottom && out_role(*r)),
            Axiom::DataDomain(_, c) => top(*c),
            Axiom::ClassAssertion(c, _) => top(*c),
            Axiom::RoleAssertion(r, _, _) => l == Locality::Top && out_role(*r),
            Axiom::NegativeRoleAssertion(r, _, _) => l == Locality::Bottom && out_role(*r),
            // A chain with an empty link is empty; a universal super-property holds anyway.
            Axiom::SubRoleChain(rs, s) => match l {
                Locality::Top => out_role(*s),
                Locality::Bottom => rs.iter().any(|&r| out_role(r)),
            },
            Axiom::Reflexive(r) => l == Locality::Top && out_role(*r),
            Axiom::Irreflexive(r) | Axiom::Asymmetric(r) => l == Locality::Bottom && out_role(*r),
            Axiom::DisjointRoles(rs) => {
                l == Locality::Bottom && rs.iter().filter(|&&r| !out_role(r)).count() <= 1
            }
            // A key on an empty class constrains nothing.
            Axiom::HasKey(c, _, _) => bot(*c),
            // Never local: under ⊤-locality a data property outside the signature becomes the
            // universal one, which is disjoint from no property that has a value.
            Axiom::SubDataProp(..)
            | Axiom::FunctionalData(_)
            | Axiom::DisjointDataProps(_)
            | Axiom::DataRangeAxiom(..)
            | Axiom::Same(_)
            | Axiom::Different(_) => false,
        }
    }

    fn add_axiom(&mut self, cs: &ConceptStore, ax: &Axiom) {
        match ax {
            Axiom::SubClass(c, d) => {
                self.add_concept(cs, *c);
                self.add_concept(cs, *d);
            }
            Axiom::Equivalent(xs) | Axiom::Disjoint(xs) => {
                for &c in xs {
                    self.add_concept(cs, c);
                }
            }
            Axiom::DisjointUnion(a, xs) => {
                self.add_concept(cs, *a);
                for &c in xs {
                    self.add_concept(cs, c);
                }
            }
            Axiom::SubRole(r, s) => {
                self.add_role(*r);
                self.add_role(*s);
            }
            Axiom::Transitive(r)
            | Axiom::Functional(r)
            | Axiom::Reflexive(r)
            | Axiom::Irreflexive(r)
            | Axiom::Asymmetric(r) => {
                self.add_role(*r);
            }
            Axiom::SubRoleChain(rs, s) => {
                for &r in rs {
                    self.add_role(r);
                }
                self.add_role(*s);
            }
            Axiom::DisjointRoles(rs) => {
                for &r in rs {
                    self.add_role(r);
                }
            }
            Axiom::HasKey(c, rs, _) => {
                self.add_concept(cs, *c);
                for &r in rs {
                    self.add_role(r);
                }
            }
            Axiom::Domain(r, c) => {
                self.add_role(*r);
                self.add_concept(cs, *c);
            }
            Axiom::DataDomain(_, c) | Axiom::ClassAssertion(c, _) => {
                self.add_concept(cs, *c);
            }
            Axiom::RoleAssertion(r, _, _) | Axiom::NegativeRoleAssertion(r, _, _) => {
                self.add_role(*r);
            }
            _ => {}
        }
    }

    /// Grows the signature to that of its locality module among the enabled axioms and
    /// returns the module (axiom indices, ascending): the fixpoint of adding every axiom
    /// that is not local for the current signature, with its symbols (Cuenca Grau et al.
    /// 2008, Def. 27 and Prop. 30).
    pub fn close(&mut self, kb: &KnowledgeBase, enabled: &[bool], l: Locality) -> Vec<usize> {
        let cs = &kb.concepts;
        let mut inside = vec![false; kb.axioms.len()];
        loop {
            let mut changed = false;
            for (i, ax) in kb.axioms.iter().enumerate() {
                if inside[i] || !enabled.get(i).copied().unwrap_or(false) {
                    continue;
                }
                if !self.local(cs, &ax.axiom, l) {
                    inside[i] = true;
                    self.add_axiom(cs, &ax.axiom);
                    changed = true;
                }
            }
            if !changed {
                break;
            }
        }
        (0..inside.len()).filter(|&i| inside[i]).collect()
    }

    /// Whether the assertion becomes true whatever the model, once the symbols outside the
    /// signature are ⊤ and the universal role.
    pub fn trivial_under_top(&self, cs: &ConceptStore, a: &Assertion) -> bool {
        match *a {
            Assertion::Class(c, _) => self.equiv(cs, c, Locality::Top, true),
            Assertion::Role(r, _, _) => !self.has_role(r),
        }
    }
}

/// The abducibles (indices) that may occur in a minimal explanation of `obs`, by the
/// ⊤-locality module M of the observations' signature and of every abducible that is not a
/// plain class or property assertion (Cuenca Grau et al. 2008). Every enabled axiom outside M
/// holds once the symbols outside sig(M) are ⊤ and the universal role. So if E explains O
/// and E″ keeps E's abducibles over sig(M), any model of KB ∪ E″ ∪ {¬o} becomes, with those
/// symbols re-read that way, a model of KB ∪ E ∪ {¬o}; hence E″ entails O as well, and a
/// minimal E has no abducible outside sig(M).
pub fn relevant_abducibles(
    kb: &KnowledgeBase,
    enabled: &[bool],
    obs: &[Assertion],
    abd: &[Assertion],
) -> Vec<usize> {
    let cs = &kb.concepts;
    let mut sig = Signature::empty(kb);
    for o in obs {
        sig.add_assertion(cs, o);
    }
    for a in abd {
        let plain = match *a {
            Assertion::Class(c, _) => matches!(cs.get(c), Concept::Atom(_)),
            Assertion::Role(..) => true,
        };
        if !plain {
            sig.add_assertion(cs, a);
        }
    }
    sig.close(kb, enabled, Locality::Top);
    (0..abd.len())
        .filter(|&i| !sig.trivial_under_top(cs, &abd[i]))
        .collect()
}

/// The ⊥-locality module of a signature among the enabled axioms (axiom indices): it holds
/// every justification of an entailment over that signature (Suntisrivaraporn, Qi, Ji &
/// Haase 2008), so QuickXplain may search it instead of the whole KB.
pub fn bottom_module(kb: &KnowledgeBase, enabled: &[bool], seed: &[Assertion]) -> Vec<usize> {
    let mut sig = Signature::empty(kb);
    for a in seed {
        sig.add_assertion(&kb.concepts, a);
    }
    sig.close(kb, enabled, Locality::Bottom)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::kb::load::load_axioms_text;

    fn kb(text: &str) -> KnowledgeBase {
        let mut kb = KnowledgeBase::default();
        load_axioms_text(&mut kb, "test", text).unwrap();
        kb
    }

    fn class(kb: &KnowledgeBase, n: &str) -> ConceptId {
        let c = kb.vocab.find_class(&format!("urn:t#{n}")).unwrap();
        kb.concepts.find(&Concept::Atom(c)).unwrap()
    }

    const TEXT: &str = "Prefix(:=<urn:t#>)
SubClassOf(:H1 :O)
SubClassOf(:H1 :Lesion)
SubClassOf(:H2 :Lesion)
SubClassOf(:H3 :X)
SubClassOf(:X :O)
SubClassOf(ObjectIntersectionOf(:H4 ObjectSomeValuesFrom(:r :Y)) :O)
SubClassOf(:H5 :Z)
ClassAssertion(:Lesion :l)
";

    #[test]
    fn top_module_keeps_the_classes_from_which_the_observation_follows() {
        // Hand-derived: O's ⊤-module holds H1 ⊑ O, H3 ⊑ X, X ⊑ O and the H4 rule; H2 and H5
        // only reach Lesion and Z, which then count as ⊤.
        let k = kb(TEXT);
        let l = k.vocab.find_individual("urn:t#l").unwrap();
        let obs = [Assertion::Class(class(&k, "O"), l)];
        let abd: Vec<Assertion> = ["H1", "H2", "H3", "H4", "H5"]
            .iter()
            .map(|n| Assertion::Class(class(&k, n), l))
            .collect();
        let on = vec![true; k.axioms.len()];
        assert_eq!(relevant_abducibles(&k, &on, &obs, &abd), vec![0, 2, 3]);
    }

    #[test]
    fn disjointness_makes_classes_relevant_under_top_locality() {
        // Hand-derived: ⊤ ⊓ ⊤ ⊑ ⊥ is not local, so a disjointness axiom joins the module and
        // H2, with it, stays a candidate.
        let k = kb(&format!("{TEXT}DisjointClasses(:H2 :H1)\n"));
        let l = k.vocab.find_individual("urn:t#l").unwrap();
        let obs = [Assertion::Class(class(&k, "O"), l)];
        let abd: Vec<Assertion> = ["H1", "H2", "H5"]
            .iter()
            .map(|n| Assertion::Class(class(&k, n), l))
            .collect();
        let on = vec![true; k.axioms.len()];
        assert_eq!(relevant_abducibles(&k, &on, &obs, &abd), vec![0, 1]);
    }

    #[test]
    fn bottom_module_of_a_hypothesis_holds_its_consequences() {
        // Hand-derived: from {H3, O}: H3 ⊑ X and X ⊑ O, and Lesion(l) (an assertion of a class
        // outside the signature becomes ⊥(l), never local); nothing about H1, H2, H4, H5.
        let k = kb(TEXT);
        let l = k.vocab.find_individual("urn:t#l").unwrap();
        let seed = [
            Assertion::Class(class(&k, "H3"), l),
            Assertion::Class(class(&k, "O"), l),
        ];
        let on = vec![true; k.axioms.len()];
        let m = bottom_module(&k, &on, &seed);
        let texts: Vec<&str> = m
            .iter()
            .map(|&i| k.sources[k.axioms[i].source].text.as_str())
            .collect();
        assert_eq!(texts.len(), 3, "{texts:?}");
        assert!(
            texts.iter().any(|t| t.contains("H3") && t.contains("#X")),
            "{texts:?}"
        );
        assert!(
            texts.iter().any(|t| t.contains("#X") && t.contains("#O")),
            "{texts:?}"
        );
        assert!(texts.iter().any(|t| t.contains("Lesion")), "{texts:?}");
    }
}

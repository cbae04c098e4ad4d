//! Why an entailment holds: all justifications of a subsumption, an instance, a property
//! assertion, an unsatisfiable class or the inconsistency of the KB (Kalyanpur et al. 2007:
//! black-box QuickXplain inside a hitting-set tree), and the root/derived split of the
//! unsatisfiable classes (Kalyanpur et al. 2005). Shared by `wherefore why` and the shell.

use super::justify::{all_justifications, quickxplain};
use crate::kb::{Axiom, ClassId, Concept, ConceptId, IndividualId, KnowledgeBase, RoleId};
use crate::reasoner::{Answer, Limit, Limits, Reasoner};
use std::collections::BTreeMap;

/// What is to be justified.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Target {
    /// C ⊑ D.
    Subsumption(ConceptId, ConceptId),
    /// C(a).
    Instance(ConceptId, IndividualId),
    /// r(a, b).
    Role(RoleId, IndividualId, IndividualId),
    /// C ⊑ ⊥.
    Unsat(ConceptId),
    /// The KB has no model.
    Inconsistent,
}

/// The targets that state the axioms `range` of `kb` (a query loaded after the KB itself).
pub fn targets_of(
    kb: &KnowledgeBase,
    range: std::ops::Range<usize>,
) -> Result<Vec<Target>, String> {
    let mut ts = Vec::new();
    for i in range {
        let text = &kb.sources[kb.axioms[i].source].text;
        match kb.axioms[i].axiom.clone() {
            Axiom::SubClass(c, d) => ts.push(Target::Subsumption(c, d)),
            Axiom::Equivalent(cs) => {
                for w in cs.windows(2) {
                    ts.push(Target::Subsumption(w[0], w[1]));
                    ts.push(Target::Subsumption(w[1], w[0]));
                }
            }
            Axiom::Disjoint(cs) => {
                // Cᵢ ⊓ Cⱼ ⊑ ⊥ is Cᵢ ⊑ ¬Cⱼ.
                for (k, &a) in cs.iter().enumerate() {
                    for &b in &cs[k + 1..] {
                        ts.push(Target::Subsumption(a, kb.concepts.not(b)));
                    }
                }
            }
            Axiom::ClassAssertion(c, a) => ts.push(Target::Instance(c, a)),
            Axiom::RoleAssertion(r, a, b) => ts.push(Target::Role(r, a, b)),
            _ => {
                return Err(format!(
                    "{text} is not supported as a question; give SubClassOf, EquivalentClasses, DisjointClasses, ClassAssertion or ObjectPropertyAssertion"
                ));
            }
        }
    }
    if ts.is_empty() {
        return Err("no axiom found; write one axiom".into());
    }
    Ok(ts)
}

/// Whether the reasoner's KB entails the target.
pub fn entailed(r: &mut Reasoner, t: &Target) -> Answer {
    let flip = |a: Answer| match a {
        Answer::Yes => Answer::No,
        Answer::No => Answer::Yes,
        u => u,
    };
    match *t {
        Target::Subsumption(c, d) => r.is_subsumed(c, d),
        Target::Instance(c, a) => r.entails_class_assertion(c, a),
        Target::Role(p, a, b) => r.entails_role_assertion(p, a, b),
        Target::Unsat(c) => flip(r.is_satisfiable(c)),
        Target::Inconsistent => flip(r.is_consistent()),
    }
}

/// Whether every target is entailed (Yes only when all are).
pub fn all_entailed(r: &mut Reasoner, ts: &[Target]) -> Answer {
    let mut out = Answer::Yes;
    for t in ts {
        match entailed(r, t) {
            Answer::Yes => {}
            Answer::No => return Answer::No,
            u => out = u,
        }
    }
    out
}

/// The items a justification is made of: the source axioms behind the first `n` internal
/// axioms of a KB (a query's own axioms come after them and are never items).
#[derive(Clone, Debug)]
pub struct Items {
    by_source: BTreeMap<usize, Vec<usize>>,
    n_axioms: usize,
}

impl Items {
    /// The source axioms of the first `n_axioms` internal axioms of `kb`.
    pub fn new(kb: &KnowledgeBase, n_axioms: usize) -> Self {
        let mut by_source: BTreeMap<usize, Vec<usize>> = BTreeMap::new();
        for (i, a) in kb.axioms.iter().enumerate().take(n_axioms) {
            by_source.entry(a.source).or_default().push(i);
        }
        Items {
            by_source,
            n_axioms,
        }
    }

    /// The source axiom indices, sorted.
    pub fn sources(&self) -> Vec<usize> {
        self.by_source.keys().copied().collect()
    }

    /// The internal axioms of the source axioms `srcs`.
    pub fn axioms_of(&self, srcs: &[usize]) -> Vec<usize> {
        srcs.iter()
            .flat_map(|s| self.by_source.get(s).into_iter().flatten().copied())
            .collect()
    }

    /// Whether the source axioms `srcs` alone entail every target.
    pub fn holds(
        &self,
        kb: &KnowledgeBase,
        srcs: &[usize],
        ts: &[Target],
        limits: &Limits,
    ) -> Result<bool, Limit> {
        let mut mask = vec![false; kb.axioms.len().max(self.n_axioms)];
        for s in srcs {
            for &i in self.by_source.get(s).into_iter().flatten() {
                mask[i] = true;
            }
        }
        let mut r = match Reasoner::with_axioms(kb, Some(&mask), &[]) {
            Ok(r) => r,
            Err(_) => return Ok(false),
        };
        r.limits = limits.clone();
        match all_entailed(&mut r, ts) {
            Answer::Yes => Ok(true),
            Answer::No => Ok(false),
            Answer::Unknown(l) => Err(l),
        }
    }
}

/// The justifications of one target.
#[derive(Clone, Debug)]
pub struct Justified {
    /// What was justified, in words.
    pub target: String,
    /// The target itself.
    pub targets: Vec<Target>,
    /// Each justification: source axiom indices, sorted; the list sorted by size then text.
    pub justifications: Vec<Vec<usize>>,
    /// Whether the search finished.
    pub complete: bool,
    /// The limit that stopped the search, if one did.
    pub limit: Option<Limit>,
}

/// Every justification of `ts` (up to `max_nodes` hitting-set tree nodes).
pub fn justify(
    kb: &KnowledgeBase,
    items: &Items,
    name: &str,
    ts: &[Target],
    limits: &Limits,
    max_nodes: usize,
) -> Justified {
    let srcs = items.sources();
    let mut test = |s: &[usize]| items.holds(kb, s, ts, limits);
    match all_justifications(&srcs, &mut test, max_nodes) {
        Ok((justifications, complete)) => Justified {
            target: name.to_string(),
            targets: ts.to_vec(),
            justifications,
            complete,
            limit: None,
        },
        Err(l) => Justified {
            target: name.to_string(),
            targets: ts.to_vec(),
            justifications: vec![],
            complete: false,
            limit: Some(l),
        },
    }
}

/// The unsatisfiable named classes of a KB, split into root and derived ones.
#[derive(Clone, Debug, Default)]
pub struct UnsatSplit {
    /// Whether the KB itself is inconsistent (then the lists are empty).
    pub inconsistent: bool,
    /// Root unsatisfiable classes with their concept.
    pub roots: Vec<(ClassId, ConceptId)>,
    /// Derived unsatisfiable classes: one of their justifications strictly contains another
    /// class's (Kalyanpur et al. 2005).
    pub derived: Vec<ClassId>,
    /// The limit that stopped a test, if one did.
    pub limit: Option<Limit>,
}

/// Finds every unsatisfiable class of the signature and tells root from derived ones using
/// one justification each.
pub fn unsat_split(kb: &KnowledgeBase, items: &Items, limits: &Limits) -> UnsatSplit {
    let mut out = UnsatSplit::default();
    let Ok(mut r) = Reasoner::new(kb) else {
        return out;
    };
    r.limits = limits.clone();
    match r.is_consistent() {
        Answer::No => {
            out.inconsistent = true;
            return out;
        }
        Answer::Unknown(l) => {
            out.limit = Some(l);
            return out;
        }
        Answer::Yes => {}
    }
    let mut unsat = Vec::new();
    for &c in &kb.signature_classes {
        let a = r.concepts_mut().atom(c);
        match r.is_satisfiable(a) {
            Answer::No => unsat.push(c),
            Answer::Unknown(l) => out.limit = Some(l),
            Answer::Yes => {}
        }
    }
    let srcs = items.sources();
    let mut first: Vec<(ClassId, Vec<usize>)> = Vec::new();
    for &c in &unsat {
        let Some(a) = kb.concepts.find(&Concept::Atom(c)) else {
            continue;
        };
        let ts = [Target::Unsat(a)];
        let mut test = |s: &[usize]| items.holds(kb, s, &ts, limits);
        match quickxplain(&srcs, &mut test) {
            Ok(Some(j)) => first.push((c, j)),
            Ok(None) => {}
            Err(l) => out.limit = Some(l),
        }
    }
    for (c, j) in &first {
        let is_derived = first
            .iter()
            .any(|(d, k)| d != c && k.len() < j.len() && k.iter().all(|x| j.contains(x)));
        if is_derived {
            out.derived.push(*c);
        } else if let Some(a) = kb.concepts.find(&Concept::Atom(*c)) {
            out.roots.push((*c, a));
        }
    }
    let iri = |c: &ClassId| kb.vocab.class_iri(*c).to_string();
    out.roots.sort_by_key(|(c, _)| iri(c));
    out.derived.sort_by_key(iri);
    out
}

/// A laconic form of each justification of `j` (Horridge, Parsia & Sattler 2008), in
/// functional syntax, sorted; one list per justification, in the same order.
pub fn laconic_forms(
    kb: &KnowledgeBase,
    items: &Items,
    j: &Justified,
    limits: &Limits,
) -> Result<Vec<Vec<String>>, Limit> {
    let mut out = Vec::new();
    for just in &j.justifications {
        let axioms = items.axioms_of(just);
        let mut test = |k: &KnowledgeBase, extra: &[crate::kb::Axiom]| -> Result<bool, Limit> {
            let none = vec![false; k.axioms.len()];
            let mut r = match Reasoner::with_axioms(k, Some(&none), extra) {
                Ok(r) => r,
                Err(_) => return Ok(false),
            };
            r.limits = limits.clone();
            match all_entailed(&mut r, &j.targets) {
                Answer::Yes => Ok(true),
                Answer::No => Ok(false),
                Answer::Unknown(l) => Err(l),
            }
        };
        let l = super::laconic::laconic(kb, &axioms, &mut test)?;
        let mut v: Vec<String> = l
            .axioms
            .iter()
            .map(|a| super::laconic::axiom_ofn(&l.kb, a))
            .collect();
        v.sort();
        out.push(v);
    }
    Ok(out)
}

/// Justifications for the given targets; without targets, for every root unsatisfiable
/// class (or the inconsistency).
pub fn why_report(
    kb: &KnowledgeBase,
    items: &Items,
    mut targets: Vec<(String, Vec<Target>)>,
    limits: &Limits,
    max_nodes: usize,
) -> WhyReport {
    let mut split = UnsatSplit::default();
    if targets.is_empty() {
        split = unsat_split(kb, items, limits);
        if split.inconsistent {
            targets.push((
                "the knowledge base is inconsistent".into(),
                vec![Target::Inconsistent],
            ));
        }
        for (c, a) in &split.roots {
            targets.push((
                format!("unsatisfiable <{}>", kb.vocab.class_iri(*c)),
                vec![Target::Unsat(*a)],
            ));
        }
    }
    let results = targets
        .iter()
        .map(|(name, ts)| justify(kb, items, name, ts, limits, max_nodes))
        .collect();
    WhyReport { results, split }
}

/// Justifications of one or more targets and, when every unsatisfiable class was asked
/// for, the root/derived split.
#[derive(Clone, Debug, Default)]
pub struct WhyReport {
    /// One entry per target.
    pub results: Vec<Justified>,
    /// Root and derived unsatisfiable classes.
    pub split: UnsatSplit,
}

impl WhyReport {
    /// Whether a limit stopped any part of the search.
    pub fn incomplete(&self) -> bool {
        self.split.limit.is_some() || self.results.iter().any(|r| !r.complete)
    }
}

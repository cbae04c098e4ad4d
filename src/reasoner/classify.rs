//! Classification: the subsumption hierarchy of the named classes.
//!
//! Each class gets one satisfiability test whose model bounds its subsumers from above: a
//! class B absent from the root label of a model of A does not subsume A (the model-based
//! pruning of the DL Handbook ch. 9, §9.5.4). When the test never branched, every atom of the
//! root label was derived deterministically and is a subsumer, so no further test is needed.
//! Told subsumers are accepted without a test. The remaining candidates are tested one by
//! one.

use super::{Answer, Limit, Reasoner};
use crate::kb::{ClassId, Concept, ConceptId};
use petgraph::graph::{DiGraph, NodeIndex};
use serde::Serialize;
use std::collections::{BTreeMap, BTreeSet};

/// The result of classification.
#[derive(Clone, Debug, Default, Serialize)]
pub struct Classification {
    /// Whether the KB is consistent.
    pub consistent: bool,
    /// Unsatisfiable named classes.
    pub unsatisfiable: Vec<ClassId>,
    /// Every entailed (sub, super) pair of distinct named classes, sub satisfiable.
    pub subsumptions: Vec<(ClassId, ClassId)>,
}

impl Classification {
    /// The taxonomy as a graph of direct subsumptions between groups of equivalent classes
    /// (the transitive reduction), for display.
    pub fn taxonomy(&self, classes: &[ClassId]) -> Taxonomy {
        let unsat: BTreeSet<ClassId> = self.unsatisfiable.iter().copied().collect();
        let mut supers: BTreeMap<ClassId, BTreeSet<ClassId>> = BTreeMap::new();
        for &c in classes {
            if !unsat.contains(&c) {
                supers.insert(c, BTreeSet::new());
            }
        }
        for &(a, b) in &self.subsumptions {
            supers.entry(a).or_default().insert(b);
        }
        // Group equivalent classes.
        let mut group_of: BTreeMap<ClassId, usize> = BTreeMap::new();
        let mut groups: Vec<Vec<ClassId>> = Vec::new();
        for (&c, sup) in &supers {
            if group_of.contains_key(&c) {
                continue;
            }
            let mut g = vec![c];
            for &d in sup {
                if supers.get(&d).is_some_and(|s| s.contains(&c)) {
                    g.push(d);
                }
            }
            g.sort();
            let gi = groups.len();
            for &m in &g {
                group_of.insert(m, gi);
            }
            groups.push(g);
        }
        let mut graph: DiGraph<Vec<ClassId>, ()> = DiGraph::new();
        let idx: Vec<NodeIndex> = groups.iter().map(|g| graph.add_node(g.clone())).collect();
        for (gi, g) in groups.iter().enumerate() {
            let rep = g[0];
            let strict: BTreeSet<usize> = supers[&rep]
                .iter()
                .map(|s| group_of[s])
                .filter(|&sg| sg != gi)
                .collect();
            // Direct supers: strict supers with no strict super in between.
            for &s in &strict {
                let srep = groups[s][0];
                let between = strict.iter().any(|&t| {
                    t != s
                        && supers[&groups[t][0]].contains(&srep)
                        && !supers[&srep].contains(&groups[t][0])
                });
                if !between {
                    graph.add_edge(idx[s], idx[gi], ());
                }
            }
        }
        Taxonomy { graph, roots: idx }
    }
}

/// Direct subsumptions between groups of equivalent classes; edges go from super to sub.
pub struct Taxonomy {
    /// The graph.
    pub graph: DiGraph<Vec<ClassId>, ()>,
    /// Every node, in group order.
    pub roots: Vec<NodeIndex>,
}

/// Classifies the given classes. Stops with the limit that was reached.
pub fn classify(r: &mut Reasoner, classes: &[ClassId]) -> Result<Classification, Limit> {
    match r.is_consistent() {
        Answer::No => {
            return Ok(Classification {
                consistent: false,
                ..Default::default()
            });
        }
        Answer::Unknown(l) => return Err(l),
        Answer::Yes => {}
    }
    let mut out = Classification {
        consistent: true,
        ..Default::default()
    };
    let atoms: Vec<ConceptId> = classes.iter().map(|&c| r.concepts_mut().atom(c)).collect();
    let class_of = |r: &Reasoner, c: ConceptId| match r.concepts().get(c) {
        Concept::Atom(a) => Some(*a),
        _ => None,
    };
    let wanted: BTreeSet<ClassId> = classes.iter().copied().collect();
    let mut sat: BTreeMap<ClassId, (Vec<ClassId>, bool)> = BTreeMap::new();
    for (&c, &a) in classes.iter().zip(&atoms) {
        let (ans, model, branched) = r.satisfiable_model(a);
        match ans {
            Answer::Unknown(l) => return Err(l),
            Answer::No => out.unsatisfiable.push(c),
            Answer::Yes => {
                let label = model.map(|m| m.root_label).unwrap_or_default();
                let cands: Vec<ClassId> = label
                    .iter()
                    .filter_map(|&x| class_of(r, x))
                    .filter(|&b| b != c && wanted.contains(&b))
                    .collect();
                sat.insert(c, (cands, branched));
            }
        }
    }
    let told = told_closure(r, classes);
    for (&c, (cands, branched)) in &sat {
        let a = r.concepts_mut().atom(c);
        let mut sups: BTreeSet<ClassId> = BTreeSet::new();
        for &b in cands {
            if !sat.contains_key(&b) {
                continue;
            }
            let yes = if !branched || told.get(&c).is_some_and(|t| t.contains(&b)) {
                true
            } else {
                let bb = r.concepts_mut().atom(b);
                match r.is_subsumed(a, bb) {
                    Answer::Yes => true,
                    Answer::No => false,
                    Answer::Unknown(l) => return Err(l),
                }
            };
            if yes {
                sups.insert(b);
            }
        }
        for b in sups {
            out.subsumptions.push((c, b));
        }
    }
    out.unsatisfiable.sort();
    Ok(out)
}

/// The transitive closure of told subsumers (atoms among the conjuncts of absorbed axioms).
fn told_closure(r: &Reasoner, classes: &[ClassId]) -> BTreeMap<ClassId, BTreeSet<ClassId>> {
    let p = r.prepared();
    let mut direct: BTreeMap<ClassId, Vec<ClassId>> = BTreeMap::new();
    for &c in classes {
        let Some(a) = find_atom(r, c) else { continue };
        let ts = p.told.get(a.index()).cloned().unwrap_or_default();
        direct.insert(
            c,
            ts.iter()
                .filter_map(|&t| match r.concepts().get(t) {
                    Concept::Atom(x) => Some(*x),
                    _ => None,
                })
                .collect(),
        );
    }
    let mut out = BTreeMap::new();
    for &c in classes {
        let mut seen = BTreeSet::new();
        let mut stack = direct.get(&c).cloned().unwrap_or_default();
        while let Some(x) = stack.pop() {
            if seen.insert(x) {
                stack.extend(direct.get(&x).cloned().unwrap_or_default());
            }
        }
        out.insert(c, seen);
    }
    out
}

fn find_atom(r: &Reasoner, c: ClassId) -> Option<ConceptId> {
    r.concepts().find(&Concept::Atom(c))
}

/// Realisation: the most specific named classes of each named individual. Candidates are
/// the atoms in the individual's label in a model of the KB (a class absent there is not
/// entailed); each candidate is confirmed by an instance check; then the types subsumed by
/// another type are dropped, using the classification.
pub fn realise(
    r: &mut Reasoner,
    classification: &Classification,
) -> Result<Vec<(crate::kb::IndividualId, Vec<ClassId>)>, Limit> {
    let mut out = Vec::new();
    if !classification.consistent {
        return Ok(out);
    }
    let (ans, model) = r.consistent_with(&super::Extra::default());
    match ans {
        Answer::Yes => {}
        Answer::No => return Ok(out),
        Answer::Unknown(l) => return Err(l),
    }
    let model = model.unwrap_or_default();
    let supers: BTreeSet<(ClassId, ClassId)> =
        classification.subsumptions.iter().copied().collect();
    let n = r.kb().vocab.individuals.len();
    for i in 0..n {
        let a = crate::kb::IndividualId(i as u32);
        if r.kb().vocab.individual_iri(a).starts_with("_:") {
            continue;
        }
        let label = model.labels.get(i).cloned().unwrap_or_default();
        let mut types = Vec::new();
        for c in label {
            let Concept::Atom(k) = *r.concepts().get(c) else {
                continue;
            };
            if !r.kb().signature_classes.contains(&k) {
                continue;
            }
            match r.entails_class_assertion(c, a) {
                Answer::Yes => types.push(k),
                Answer::No => {}
                Answer::Unknown(l) => return Err(l),
            }
        }
        types.sort();
        types.dedup();
        let specific: Vec<ClassId> = types
            .iter()
            .copied()
            .filter(|&t| {
                !types
                    .iter()
                    .any(|&u| u != t && supers.contains(&(u, t)) && !supers.contains(&(t, u)))
            })
            .collect();
        out.push((a, specific));
    }
    Ok(out)
}

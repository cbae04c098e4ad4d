//! Preprocessing of the axioms for the tableau: the role hierarchy, absorption of GCIs into
//! lazily unfolded atoms and roles (DL Handbook ch. 9, Horrocks 2003, §9.4), and the
//! internalised remainder.

use super::automata::{Builder, RoleAutomaton, RoleBox};
use crate::kb::{
    Axiom, Concept, ConceptId, ConceptStore, DataPropId, DataRangeId, IndividualId, KnowledgeBase,
    RoleId,
};

/// Why the reasoner refuses a knowledge base.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Refusal {
    /// The source axiom's text, when one is to blame.
    pub axiom: Option<String>,
    /// What is outside the supported logic.
    pub reason: String,
}

/// The axioms in the form the tableau consumes.
#[derive(Clone, Debug, Default)]
pub struct Prepared {
    /// Number of roles (twice the number of named properties).
    pub n_roles: usize,
    /// `sub[s * n_roles + r]`: s ⊑* r (reflexive-transitive closure, closed under inverse).
    pub sub: Vec<bool>,
    /// For each role s, the roles r with s ⊑* r.
    pub supers: Vec<Vec<RoleId>>,
    /// Transitive roles.
    pub transitive: Vec<bool>,
    /// For each role r: concepts added to x when x has an r-neighbour (domains, functional).
    pub triggers: Vec<Vec<ConceptId>>,
    /// For each role r: concepts added to x when x has an r-loop (absorbed ∃r.Self ⊑ D).
    pub self_triggers: Vec<Vec<ConceptId>>,
    /// For each concept id of an atom: concepts added with it (absorbed GCIs).
    pub unfold: Vec<Vec<ConceptId>>,
    /// Concept added to every node (internalised GCIs), ⊤ when none.
    pub universal: ConceptId,
    /// Data property closure: `data_supers[p]` holds q with p ⊑* q.
    pub data_supers: Vec<Vec<DataPropId>>,
    /// Functional data properties.
    pub data_functional: Vec<bool>,
    /// Pairs of data properties declared disjoint (each pair once, as written).
    pub data_disjoint: Vec<(DataPropId, DataPropId)>,
    /// For each data property p: whether some q with p ⊑* q is in a disjoint pair, so that a
    /// node with a value of p needs the full search for its values.
    pub data_in_disjoint: Vec<bool>,
    /// Data ranges per property (from range axioms).
    pub data_ranges: Vec<Vec<DataRangeId>>,
    /// Concepts added when a node has a value for the data property (domains).
    pub data_triggers: Vec<Vec<ConceptId>>,
    /// ABox: class assertions.
    pub class_assertions: Vec<(ConceptId, IndividualId)>,
    /// ABox: role assertions.
    pub role_assertions: Vec<(RoleId, IndividualId, IndividualId)>,
    /// ABox: equalities.
    pub same: Vec<(IndividualId, IndividualId)>,
    /// ABox: inequalities.
    pub different: Vec<(IndividualId, IndividualId)>,
    /// Number of individuals.
    pub n_individuals: usize,
    /// Whether nominals appear in the TBox (then ABox individuals take part in concept tests).
    pub tbox_nominals: bool,
    /// Told subsumers of each atom (by concept id), for classification.
    pub told: Vec<Vec<ConceptId>>,
    /// Roles that are simple (no transitive sub-role).
    pub simple: Vec<bool>,
    /// Conjunctive rules from binary absorption: when every atom of the set is in a label,
    /// the concept is added.
    pub conj_rules: Vec<(Vec<ConceptId>, ConceptId)>,
    /// For each concept id of an atom: the conjunctive rules it takes part in.
    pub conj_index: Vec<Vec<usize>>,
    /// Number of fresh atoms introduced by absorption.
    pub fresh_atoms: u32,
    /// Roles with a property chain below them: ∀r.C goes through r's automaton.
    pub complex: Vec<bool>,
    /// The automaton of each complex role (Horrocks, Kutz & Sattler 2006).
    pub automata: Vec<Option<std::sync::Arc<RoleAutomaton>>>,
    /// Pairs of disjoint roles, in every orientation ((r, s), (s, r), (r⁻, s⁻), (s⁻, r⁻));
    /// an asymmetric r gives (r, r⁻).
    pub disjoint_roles: Vec<(RoleId, RoleId)>,
    /// Keys (class, object properties, data properties), applied to named individuals.
    pub keys: Vec<(ConceptId, Vec<RoleId>, Vec<DataPropId>)>,
    /// Which individuals keys apply to: the named ones, not anonymous individuals (`_:`
    /// names, the universal role's hub among them; OWL 2 Structural Specification §9.5).
    /// Empty when there is no key.
    pub keyed: Vec<bool>,
    /// Whether a TBox axiom has an at-most restriction or a functional property.
    pub tbox_at_most: bool,
    /// Emptiness of intersections of data ranges, remembered across the tests of this
    /// preparation.
    pub empty_ranges: EmptyRanges,
}

/// Whether the intersection of a set of interned data ranges is empty, by the sorted set of
/// their ids. The exact value spaces (string automata, rationals) make one intersection cost
/// far more than a look-up, and the same sets recur in every test of a classification. Sound
/// because an id names one range for the life of the store the preparation was built from.
#[derive(Debug, Default)]
pub struct EmptyRanges(std::sync::Mutex<std::collections::HashMap<Vec<DataRangeId>, bool>>);

impl EmptyRanges {
    /// The remembered answer for a sorted, deduplicated set of ids.
    pub fn get(&self, ids: &[DataRangeId]) -> Option<bool> {
        self.0
            .lock()
            .unwrap_or_else(|e| e.into_inner())
            .get(ids)
            .copied()
    }

    /// Remembers an answer.
    pub fn put(&self, ids: Vec<DataRangeId>, empty: bool) {
        self.0
            .lock()
            .unwrap_or_else(|e| e.into_inner())
            .insert(ids, empty);
    }
}

impl Clone for EmptyRanges {
    fn clone(&self) -> Self {
        let map = self.0.lock().unwrap_or_else(|e| e.into_inner()).clone();
        EmptyRanges(std::sync::Mutex::new(map))
    }
}

impl Prepared {
    /// Whether s ⊑* r.
    pub fn is_sub(&self, s: RoleId, r: RoleId) -> bool {
        self.sub[s.index() * self.n_roles + r.index()]
    }
}

/// Builds the prepared form from the axioms of `kb` that `enabled` selects (all when `None`).
/// New concepts are interned into `concepts`.
pub fn prepare(
    kb: &KnowledgeBase,
    concepts: &mut ConceptStore,
    enabled: Option<&[bool]>,
    extra: &[Axiom],
) -> Result<Prepared, Refusal> {
    let n_props = kb.vocab.props.len();
    let n_roles = 2 * n_props;
    let n_dp = kb.vocab.data_props.len();
    let mut p = Prepared {
        n_roles,
        sub: vec![false; n_roles * n_roles],
        transitive: vec![false; n_roles],
        triggers: vec![Vec::new(); n_roles],
        self_triggers: vec![Vec::new(); n_roles],
        data_supers: vec![Vec::new(); n_dp],
        data_functional: vec![false; n_dp],
        data_ranges: vec![Vec::new(); n_dp],
        data_triggers: vec![Vec::new(); n_dp],
        n_individuals: kb.vocab.individuals.len(),
        universal: ConceptId::TOP,
        ..Default::default()
    };
    // The universal role's background axiom (see `kb::universal`) belongs to no source.
    let hub = crate::kb::universal::hub_axiom(kb.universal, concepts);
    let axioms: Vec<(&Axiom, Option<usize>)> = kb
        .axioms
        .iter()
        .enumerate()
        .filter(|(i, _)| enabled.is_none_or(|m| m.get(*i).copied().unwrap_or(true)))
        .map(|(_, a)| (&a.axiom, Some(a.source)))
        .chain(extra.iter().chain(hub.iter()).map(|a| (a, None)))
        .collect();

    // Role hierarchy.
    for r in 0..n_roles {
        p.sub[r * n_roles + r] = true;
    }
    let mut data_sub = vec![false; n_dp * n_dp];
    for d in 0..n_dp {
        data_sub[d * n_dp + d] = true;
    }
    for (a, _) in &axioms {
        match a {
            Axiom::SubRole(s, r) => {
                p.sub[s.index() * n_roles + r.index()] = true;
                p.sub[s.inverse().index() * n_roles + r.inverse().index()] = true;
            }
            Axiom::Transitive(r) => {
                p.transitive[r.index()] = true;
                p.transitive[r.inverse().index()] = true;
            }
            Axiom::SubDataProp(a, b) => data_sub[a.index() * n_dp + b.index()] = true,
            Axiom::FunctionalData(d) => p.data_functional[d.index()] = true,
            Axiom::DisjointDataProps(ds) => {
                for i in 0..ds.len() {
                    for j in i + 1..ds.len() {
                        p.data_disjoint.push((ds[i], ds[j]));
                    }
                }
            }
            _ => {}
        }
    }
    warshall(&mut p.sub, n_roles);
    warshall(&mut data_sub, n_dp);
    // Property chains: the automata of the roles that have one below them.
    let chains: Vec<(Vec<RoleId>, RoleId)> = axioms
        .iter()
        .filter_map(|(a, _)| match a {
            Axiom::SubRoleChain(w, s) => Some((w.clone(), *s)),
            _ => None,
        })
        .collect();
    p.complex = vec![false; n_roles];
    p.automata = vec![None; n_roles];
    if !chains.is_empty() {
        let name = |r: RoleId| {
            let iri = format!("<{}>", kb.vocab.prop_iri(r.prop()));
            if r.is_inverse() {
                format!("ObjectInverseOf({iri})")
            } else {
                iri
            }
        };
        let rbox = RoleBox {
            n_roles,
            sub: &p.sub,
            transitive: &p.transitive,
            chains: &chains,
            name: &name,
        };
        let mut builder = Builder::new(&rbox);
        let complex = builder.complex().to_vec();
        for (r, _) in complex.iter().enumerate().filter(|(_, c)| **c) {
            let a = builder
                .automaton(RoleId(r as u32))
                .map_err(|reason| Refusal {
                    axiom: None,
                    reason,
                })?;
            p.automata[r] = Some(std::sync::Arc::new(a));
        }
        p.complex = complex;
    }
    p.supers = (0..n_roles)
        .map(|s| {
            (0..n_roles)
                .filter(|&r| p.sub[s * n_roles + r])
                .map(|r| RoleId(r as u32))
                .collect()
        })
        .collect();
    p.data_supers = (0..n_dp)
        .map(|a| {
            (0..n_dp)
                .filter(|&b| data_sub[a * n_dp + b])
                .map(|b| DataPropId(b as u32))
                .collect()
        })
        .collect();
    p.data_disjoint.sort_unstable();
    p.data_disjoint.dedup();
    p.data_in_disjoint = p
        .data_supers
        .iter()
        .map(|qs| {
            p.data_disjoint
                .iter()
                .any(|&(a, b)| qs.contains(&a) || qs.contains(&b))
        })
        .collect();
    p.simple = (0..n_roles)
        .map(|r| !p.complex[r] && !(0..n_roles).any(|s| p.transitive[s] && p.sub[s * n_roles + r]))
        .collect();

    // Check the logic: number restrictions only on simple roles; nominals only where handled.
    let mut has_at_most = false;
    let mut tbox_nominals = false;
    for (a, src) in &axioms {
        let text = || src.map(|s| kb.sources[s].text.clone());
        let roots: Vec<ConceptId> = match a {
            Axiom::SubClass(c, d) => vec![*c, *d],
            Axiom::Equivalent(cs) | Axiom::Disjoint(cs) => cs.clone(),
            Axiom::DisjointUnion(c, cs) => std::iter::once(*c).chain(cs.iter().copied()).collect(),
            Axiom::Domain(_, c) | Axiom::DataDomain(_, c) => vec![*c],
            Axiom::ClassAssertion(c, _) => vec![*c],
            Axiom::Functional(r) => {
                has_at_most = true;
                if !p.simple[r.index()] {
                    return Err(Refusal {
                        axiom: text(),
                        reason: NOT_SIMPLE.replace("{what}", "a functional property"),
                    });
                }
                vec![]
            }
            Axiom::Irreflexive(r) | Axiom::Asymmetric(r) => {
                if !p.simple[r.index()] {
                    return Err(Refusal {
                        axiom: text(),
                        reason: NOT_SIMPLE
                            .replace("{what}", "an irreflexive or asymmetric property"),
                    });
                }
                vec![]
            }
            Axiom::DisjointRoles(rs) => {
                if rs.iter().any(|r| !p.simple[r.index()]) {
                    return Err(Refusal {
                        axiom: text(),
                        reason: NOT_SIMPLE
                            .replace("{what}", "each of a set of disjoint properties"),
                    });
                }
                vec![]
            }
            Axiom::HasKey(c, _, _) => vec![*c],
            _ => vec![],
        };
        let is_tbox = !matches!(a, Axiom::ClassAssertion(..));
        for c in roots {
            // (concept, reached from the axiom's top through ⊓/⊔ only)
            let mut stack = vec![(c, true)];
            let mut seen = std::collections::HashSet::new();
            while let Some((x, top)) = stack.pop() {
                if !seen.insert((x, top)) {
                    continue;
                }
                match concepts.get(x).clone() {
                    Concept::And(xs) | Concept::Or(xs) => {
                        stack.extend(xs.into_iter().map(|y| (y, top)))
                    }
                    Concept::Some(_, f) => {
                        if let Concept::Nominal(_) = concepts.get(f) {
                            if is_tbox {
                                tbox_nominals = true;
                            }
                        } else {
                            stack.push((f, false));
                        }
                    }
                    Concept::All(_, f) => {
                        if let Concept::NotNominal(_) = concepts.get(f) {
                            // ∀r.¬{a} (from ¬ObjectHasValue) turns into ∃r.{a} when its axiom
                            // is internalised with the side negated: a nominal in the TBox.
                            if is_tbox {
                                tbox_nominals = true;
                            }
                        } else {
                            stack.push((f, false));
                        }
                    }
                    Concept::AtLeast(_, r, f) | Concept::AtMost(_, r, f) => {
                        has_at_most = true;
                        if !p.simple[r.index()] {
                            return Err(Refusal {
                                axiom: text(),
                                reason: NOT_SIMPLE
                                    .replace("{what}", "the property of a number restriction"),
                            });
                        }
                        stack.push((f, false));
                    }
                    Concept::HasSelf(r) | Concept::NotSelf(r) if !p.simple[r.index()] => {
                        return Err(Refusal {
                            axiom: text(),
                            reason: NOT_SIMPLE
                                .replace("{what}", "the property of a self restriction"),
                        });
                    }
                    // A nominal anywhere: a node that gets {a} is merged into a's root node
                    // (the o-rule). In the TBox, concept tests then carry the ABox.
                    Concept::Nominal(_) | Concept::NotNominal(_) if is_tbox => {
                        tbox_nominals = true;
                    }
                    _ => {}
                }
            }
        }
    }
    p.tbox_nominals = tbox_nominals;
    p.tbox_at_most = has_at_most;
    for (a, src) in &axioms {
        let Axiom::HasKey(_, roles, _) = a else {
            continue;
        };
        let text = src.map(|s| kb.sources[s].text.clone());
        if roles.iter().any(|r| !p.simple[r.index()]) {
            return Err(Refusal {
                axiom: text,
                reason: NOT_SIMPLE
                    .replace("{what}", "each object property of a key (in this reasoner)"),
            });
        }
    }

    // Absorption.
    let mut gcis: Vec<(ConceptId, ConceptId)> = Vec::new();
    for (a, _) in &axioms {
        match a {
            Axiom::SubClass(c, d) => gcis.push((*c, *d)),
            Axiom::Equivalent(cs) => {
                for w in cs.windows(2) {
                    gcis.push((w[0], w[1]));
                    gcis.push((w[1], w[0]));
                }
            }
            Axiom::Disjoint(cs) => {
                for i in 0..cs.len() {
                    for j in i + 1..cs.len() {
                        let nj = concepts.not(cs[j]);
                        gcis.push((cs[i], nj));
                    }
                }
            }
            Axiom::DisjointUnion(c, cs) => {
                let u = concepts.or(cs.iter().copied());
                gcis.push((*c, u));
                gcis.push((u, *c));
                for i in 0..cs.len() {
                    for j in i + 1..cs.len() {
                        let nj = concepts.not(cs[j]);
                        gcis.push((cs[i], nj));
                    }
                }
            }
            // A trigger fires on an edge; a role with a chain below it also holds along paths
            // of edges, so its domain goes through the automaton as ⊤ ⊑ ∀r⁻.C instead.
            Axiom::Domain(r, c) if p.complex[r.index()] => {
                let all = concepts.all(r.inverse(), *c);
                gcis.push((ConceptId::TOP, all));
            }
            Axiom::Domain(r, c) => p.triggers[r.index()].push(*c),
            // Ref(r): ⊤ ⊑ ∃r.Self; Irr(r): ⊤ ⊑ ¬∃r.Self (∃r⁻.Self is ∃r.Self).
            Axiom::Reflexive(r) => gcis.push((ConceptId::TOP, self_of(concepts, *r))),
            Axiom::Irreflexive(r) => {
                let s = self_of(concepts, *r);
                gcis.push((ConceptId::TOP, concepts.not(s)));
            }
            Axiom::Asymmetric(r) => push_disjoint(&mut p.disjoint_roles, *r, r.inverse()),
            Axiom::DisjointRoles(rs) => {
                for i in 0..rs.len() {
                    for j in i + 1..rs.len() {
                        push_disjoint(&mut p.disjoint_roles, rs[i], rs[j]);
                    }
                }
            }
            Axiom::HasKey(c, rs, ds) => {
                if p.keyed.is_empty() {
                    p.keyed = kb
                        .vocab
                        .individuals
                        .iter()
                        .map(|iri| !iri.starts_with("_:"))
                        .collect();
                }
                p.keys.push((*c, rs.clone(), ds.clone()))
            }
            Axiom::Functional(r) => {
                let f = concepts.at_most(1, *r, ConceptId::TOP);
                p.triggers[r.index()].push(f);
            }
            Axiom::DataDomain(d, c) => p.data_triggers[d.index()].push(*c),
            Axiom::DataRangeAxiom(d, r) => p.data_ranges[d.index()].push(*r),
            Axiom::ClassAssertion(c, a) => p.class_assertions.push((*c, *a)),
            Axiom::RoleAssertion(r, a, b) => p.role_assertions.push((*r, *a, *b)),
            Axiom::NegativeRoleAssertion(r, a, b) => {
                let nb = concepts.nominal(*b);
                let nnb = concepts.not(nb);
                let c = concepts.all(*r, nnb);
                p.class_assertions.push((c, *a));
            }
            Axiom::Same(xs) => {
                for w in xs.windows(2) {
                    p.same.push((w[0], w[1]));
                }
            }
            Axiom::Different(xs) => {
                for i in 0..xs.len() {
                    for j in i + 1..xs.len() {
                        p.different.push((xs[i], xs[j]));
                    }
                }
            }
            _ => {}
        }
    }
    let mut universal: Vec<ConceptId> = Vec::new();
    let mut i = 0;
    while i < gcis.len() {
        let (c, d) = gcis[i];
        i += 1;
        absorb(c, d, concepts, &mut p, &mut universal, &mut gcis);
    }
    p.universal = concepts.and(universal);
    let n = concepts.len();
    p.unfold.resize(n, Vec::new());
    p.conj_index.resize(n, Vec::new());
    for u in p.unfold.iter_mut() {
        u.sort_unstable();
        u.dedup();
    }
    for t in p.triggers.iter_mut() {
        t.sort_unstable();
        t.dedup();
    }
    // Told subsumers: atoms among the conjuncts of what each atom unfolds to.
    p.told = vec![Vec::new(); n];
    for a in 0..n {
        if !matches!(concepts.get(ConceptId(a as u32)), Concept::Atom(_)) {
            continue;
        }
        let mut told = Vec::new();
        for &d in &p.unfold[a] {
            match concepts.get(d) {
                Concept::Atom(_) => told.push(d),
                Concept::And(xs) => told.extend(
                    xs.iter()
                        .copied()
                        .filter(|x| matches!(concepts.get(*x), Concept::Atom(_))),
                ),
                _ => {}
            }
        }
        p.told[a] = told;
    }
    Ok(p)
}

/// Absorbs C ⊑ D: into an atom of C when C has one, into a role when C is ∃r.X (as
/// X ⊑ ∀r⁻.D), into an individual when C is {a} (as D(a)), split over unions; otherwise
/// internalised as ⊤ ⊑ ¬C ⊔ D.
fn absorb(
    c: ConceptId,
    d: ConceptId,
    concepts: &mut ConceptStore,
    p: &mut Prepared,
    universal: &mut Vec<ConceptId>,
    gcis: &mut Vec<(ConceptId, ConceptId)>,
) {
    if d == ConceptId::TOP || c == ConceptId::BOTTOM {
        return;
    }
    let push_unfold = |p: &mut Prepared, a: ConceptId, x: ConceptId| {
        if p.unfold.len() <= a.index() {
            p.unfold.resize(a.index() + 1, Vec::new());
        }
        p.unfold[a.index()].push(x);
    };
    match concepts.get(c).clone() {
        Concept::Top => universal.push(d),
        Concept::Atom(_) => push_unfold(p, c, d),
        Concept::Or(xs) => {
            for x in xs {
                gcis.push((x, d));
            }
        }
        Concept::And(xs) => {
            let horn = xs
                .iter()
                .all(|&x| matches!(concepts.get(x), Concept::Atom(_) | Concept::Some(..)))
                && xs
                    .iter()
                    .any(|&x| matches!(concepts.get(x), Concept::Atom(_)))
                && xs.len() >= 2;
            if horn {
                // Binary absorption (Hudek & Weddell 2006): each ∃r.F conjunct gets a fresh
                // atom N with ∃r.F ⊑ N, and the conjunction of atoms becomes a rule that
                // fires deterministically when all of them are in a label. The result is a
                // conservative extension (interpret N as ∃r.F).
                let mut atoms = Vec::new();
                for &x in xs.iter() {
                    if matches!(concepts.get(x), Concept::Atom(_)) {
                        atoms.push(x);
                    } else {
                        // Fresh atoms take class ids from the top of the range, far from the
                        // vocabulary's.
                        p.fresh_atoms += 1;
                        let n = concepts.atom(crate::kb::ClassId(u32::MAX - p.fresh_atoms));
                        gcis.push((x, n));
                        atoms.push(n);
                    }
                }
                atoms.sort_unstable();
                atoms.dedup();
                let id = p.conj_rules.len();
                for &a in &atoms {
                    if p.conj_index.len() <= a.index() {
                        p.conj_index.resize(a.index() + 1, Vec::new());
                    }
                    p.conj_index[a.index()].push(id);
                }
                p.conj_rules.push((atoms, d));
            } else if let Some(&a) = xs
                .iter()
                .find(|&&x| matches!(concepts.get(x), Concept::Atom(_)))
            {
                let rest: Vec<ConceptId> = xs.iter().copied().filter(|&x| x != a).collect();
                let r = concepts.and(rest);
                let nr = concepts.not(r);
                let e = concepts.or([nr, d]);
                push_unfold(p, a, e);
            } else if let Some(&s) = xs
                .iter()
                .find(|&&x| matches!(concepts.get(x), Concept::Some(..)))
            {
                // (∃r.X ⊓ Rest) ⊑ D  ⇔  ∃r.X ⊑ ¬Rest ⊔ D.
                let rest: Vec<ConceptId> = xs.iter().copied().filter(|&x| x != s).collect();
                let r = concepts.and(rest);
                let nr = concepts.not(r);
                let e = concepts.or([nr, d]);
                gcis.push((s, e));
            } else {
                let nc = concepts.not(c);
                universal.push(concepts.or([nc, d]));
            }
        }
        // {a} ⊑ D is the class assertion D(a) (OWL 2 Direct Semantics: {a}ᴵ = {aᴵ}). It
        // arises from ∃r.{a} ⊑ D (ObjectHasValue on the left, via the role absorption
        // below) and, internalised, would put the disjunction ¬{a} ⊔ D on every node.
        Concept::Nominal(a) => p.class_assertions.push((d, a)),
        // ∃r.Self ⊑ D (r simple, as OWL 2 DL demands) fires when an r-loop is added, like a
        // domain trigger, instead of the disjunction ¬∃r.Self ⊔ D on every node: RiC-O's 48
        // `C ≡ ∃r.Self` definitions made 48 branch points per node. A loop in either direction
        // is the same loop, so D is recorded under r and r⁻.
        Concept::HasSelf(r) if !p.complex[r.index()] => {
            p.self_triggers[r.index()].push(d);
            p.self_triggers[r.inverse().index()].push(d);
        }
        Concept::Some(r, x) => {
            if x == ConceptId::TOP && !p.complex[r.index()] {
                p.triggers[r.index()].push(d);
            } else {
                // ∃r.X ⊑ D  ⇔  X ⊑ ∀r⁻.D.
                let all = concepts.all(r.inverse(), d);
                gcis.push((x, all));
            }
        }
        _ => {
            let nc = concepts.not(c);
            universal.push(concepts.or([nc, d]));
        }
    }
}

/// The refusal of a non-simple property where OWL 2 DL needs a simple one.
const NOT_SIMPLE: &str = "{what} must be simple: OWL 2 DL (Structural Specification §11.2) forbids a property that is transitive or has a transitive sub-property or a property chain below it here; remove the transitivity or chain, or use another property";

/// ∃r.Self for a role in either direction.
fn self_of(concepts: &mut ConceptStore, r: RoleId) -> ConceptId {
    concepts.has_self(if r.is_inverse() { r.inverse() } else { r })
}

/// Records r and s as disjoint in every orientation the tableau may meet them.
fn push_disjoint(pairs: &mut Vec<(RoleId, RoleId)>, r: RoleId, s: RoleId) {
    for pair in [
        (r, s),
        (s, r),
        (r.inverse(), s.inverse()),
        (s.inverse(), r.inverse()),
    ] {
        if !pairs.contains(&pair) {
            pairs.push(pair);
        }
    }
}

fn warshall(m: &mut [bool], n: usize) {
    for k in 0..n {
        for i in 0..n {
            if m[i * n + k] {
                for j in 0..n {
                    if m[k * n + j] {
                        m[i * n + j] = true;
                    }
                }
            }
        }
    }
}

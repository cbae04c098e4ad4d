//! The completion-graph tableau for SHIQ (Horrocks, Sattler & Tobies 1999/2000) with
//! data ranges and data number restrictions, ABox root nodes and ObjectHasValue fillers,
//! extended to nominals as in SHOIQ (Horrocks & Sattler, "A Tableau Decision Procedure for
//! SHOIQ", JAR 2007): root nodes are the nominal nodes (individuals, the query's root and
//! the nodes the NN-rule makes) and are never blocked; the o-rule merges a node holding
//! {a} into a's root; on a nominal node, the NN-rule and the ≤o-rule merge blockable
//! neighbours counted by an at-most restriction into nominal nodes, pruning their
//! successors, before any generating rule runs.
//!
//! One solver state, declared parts: the completion [`Graph`] (copied at branching points,
//! which is the trail), the branching stack, the dependency table and statistics.
//! Optimisations: lazy unfolding of absorbed axioms, semantic branching with boolean
//! constraint propagation, dependency-directed backjumping, pairwise blocking, and
//! satisfiability caching kept sound with inverse roles (see [`super::cache`]).

use super::cache::SatCache;
use super::datavalues;
use super::depset::{Dep, DepTable};
use super::prepare::Prepared;
use super::{Extra, Limit, Limits, Stats};
use crate::kb::datarange::DataRange;
use crate::kb::{
    Concept, ConceptId, ConceptStore, DataPropId, DataRangeId, DataRangeStore, IndividualId, RoleId,
};
use std::collections::{HashMap, VecDeque};
use std::rc::Rc;

mod keys;

type NodeId = usize;

/// Work budget of one node's search for data values with number restrictions (steps of
/// [`datavalues::check`]); past it the test stops with "limit reached".
const DATA_BUDGET: u64 = 200_000;
type EdgeId = usize;

/// A node label's membership and dependencies: a vector sorted by concept id, cheap to copy
/// at branching points and quick to search for the small labels a tableau builds.
#[derive(Clone, Debug, Default)]
struct LabelSet(Vec<(ConceptId, Dep)>);

impl LabelSet {
    fn get(&self, c: &ConceptId) -> Option<&Dep> {
        self.0
            .binary_search_by_key(c, |e| e.0)
            .ok()
            .map(|i| &self.0[i].1)
    }
    fn contains_key(&self, c: &ConceptId) -> bool {
        self.0.binary_search_by_key(c, |e| e.0).is_ok()
    }
    fn insert(&mut self, c: ConceptId, d: Dep) {
        match self.0.binary_search_by_key(&c, |e| e.0) {
            Ok(i) => self.0[i].1 = d,
            Err(i) => self.0.insert(i, (c, d)),
        }
    }
}

impl std::ops::Index<&ConceptId> for LabelSet {
    type Output = Dep;
    fn index(&self, c: &ConceptId) -> &Dep {
        self.get(c).expect("concept in label")
    }
}

#[derive(Clone, Debug, Default)]
struct Node {
    label: Vec<ConceptId>,
    deps: LabelSet,
    hash: u64,
    parent: Option<NodeId>,
    names: Vec<IndividualId>,
    active: bool,
    merged_into: Option<NodeId>,
    edges: Vec<EdgeId>,
    cursor: usize,
    in_queue: bool,
    ors: Vec<ConceptId>,
    gens: Vec<ConceptId>,
    at_mosts: Vec<ConceptId>,
    alls: Vec<ConceptId>,
    data_dirty: bool,
}

impl Node {
    fn is_root(&self) -> bool {
        self.parent.is_none()
    }
}

#[derive(Clone, Debug)]
struct Edge {
    a: NodeId,
    b: NodeId,
    roles: Vec<(RoleId, Dep)>,
    active: bool,
}

/// Elements per chunk of a [`Chunked`] vector.
const CHUNK: usize = 64;

/// A vector shared between the graph and its snapshots in chunks of copy-on-write elements:
/// a snapshot copies one pointer per chunk (not per node), and dropping it releases as few,
/// so branching and giving up on a large graph stay cheap.
#[derive(Clone, Debug)]
struct Chunked<T> {
    chunks: Vec<Rc<Vec<Rc<T>>>>,
    len: usize,
}

impl<T> Default for Chunked<T> {
    fn default() -> Self {
        Chunked {
            chunks: Vec::new(),
            len: 0,
        }
    }
}

impl<T: Clone> Chunked<T> {
    fn len(&self) -> usize {
        self.len
    }
    fn push(&mut self, v: T) {
        if self.len.is_multiple_of(CHUNK) {
            self.chunks.push(Rc::new(Vec::with_capacity(CHUNK)));
        }
        let last = self.chunks.last_mut().expect("a chunk");
        Rc::make_mut(last).push(Rc::new(v));
        self.len += 1;
    }
    /// The element for writing, copied first if a snapshot shares it.
    fn get_mut(&mut self, i: usize) -> &mut T {
        Rc::make_mut(&mut Rc::make_mut(&mut self.chunks[i / CHUNK])[i % CHUNK])
    }
    fn iter(&self) -> impl Iterator<Item = &T> {
        self.chunks.iter().flat_map(|c| c.iter().map(|e| &**e))
    }
}

impl<T> std::ops::Index<usize> for Chunked<T> {
    type Output = T;
    fn index(&self, i: usize) -> &T {
        &self.chunks[i / CHUNK][i % CHUNK]
    }
}

/// The completion graph.
/// A completion graph: every node, edge and the bookkeeping of the expansion.
#[derive(Clone, Debug, Default)]
pub struct Graph {
    nodes: Chunked<Node>,
    edges: Chunked<Edge>,
    ineq: Vec<(NodeId, NodeId, Dep)>,
    queue: VecDeque<NodeId>,
    ind_node: Vec<NodeId>,
    /// A counter of changes, and for each node the time of its last change (a concept or an
    /// edge added) and of its last ≤/choose scan that found nothing to do: a node needs
    /// another scan only when it or a neighbour changed since. Kept in the graph so that a
    /// snapshot restores them with the labels they describe.
    clock: u64,
    changed: Vec<u64>,
    checked: Vec<u64>,
    /// No node before this one has a disjunction left to decide: the ⊔ scan starts here
    /// instead of at node 0 on every step.
    or_from: NodeId,
    /// No node before this one has an ∃/≥ demand left unmet: the generating scan starts
    /// here. Reset to 0 when a merge or prune may have removed a node that met a demand.
    gen_from: NodeId,
    /// Whether a tree node may have met a root other than its parent (an edge to a nominal,
    /// a merge into a root): only then can the NN-rule apply, so SHIQ runs skip its test.
    nominal_edges: bool,
    /// Data keys: pairs of named nodes kept apart on a key's data property (their values of
    /// it differ), with the dependency of that choice; see `keys.rs`.
    key_apart: Vec<(NodeId, NodeId, DataPropId, Dep)>,
    /// When the values of the `key_apart` nodes were last found to exist together: the
    /// latest change time of those nodes then, and the pairs (after merges) then.
    key_checked: Option<(u64, keys::ApartPairs)>,
}

#[derive(Clone, Debug)]
enum Choice {
    Add {
        node: NodeId,
        options: Vec<ConceptId>,
    },
    Merge {
        options: Vec<(NodeId, NodeId)>,
    },
    /// SHOIQ's NN-rule at the nominal node `node` for ≤`max` `role`.`filler`: alternative i
    /// guesses that the node has exactly i + 1 such neighbours.
    Nominals {
        node: NodeId,
        role: RoleId,
        filler: ConceptId,
        max: u32,
    },
    /// A data key's pair: apart on one of `props`, else (the last option) merged.
    KeyApart {
        x: NodeId,
        y: NodeId,
        props: Vec<DataPropId>,
    },
}

#[derive(Debug)]
struct Branch {
    snapshot: Graph,
    level: u32,
    choice: Choice,
    next: usize,
    base: Dep,
    failed: Vec<Dep>,
    acc: Dep,
}

/// What a tableau run found.
#[derive(Debug)]
pub enum Outcome {
    /// A complete, clash-free graph: a model exists.
    Sat(Model),
    /// Every branch clashed.
    Unsat,
    /// A limit stopped the search.
    Unknown(Limit),
}

/// A model read off a complete completion graph, restricted to named individuals.
#[derive(Clone, Debug, Default)]
pub struct Model {
    /// For each individual: the concepts in its node's label.
    pub labels: Vec<Vec<ConceptId>>,
    /// Role edges between named individuals (as stored, one direction each).
    pub edges: Vec<(RoleId, IndividualId, IndividualId)>,
    /// For a concept test: the label of the root node.
    pub root_label: Vec<ConceptId>,
}

/// How the generating rules treat a node (recomputed before each generating step).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Status {
    /// Expanded by every rule.
    Open,
    /// Pairwise blocked by an earlier node.
    Blocked,
    /// Below a blocked or cached node.
    Below,
    /// Its label is a recorded satisfiable label that may be reused here.
    Cached,
}

/// The tableau state.
pub struct Tableau<'a> {
    prep: &'a Prepared,
    cache: &'a mut SatCache,
    use_labels: bool,
    record: bool,
    concepts: &'a mut ConceptStore,
    ranges: &'a DataRangeStore,
    deps: DepTable,
    g: Graph,
    stack: Vec<Branch>,
    clash: Option<Dep>,
    next_level: u32,
    limits: Limits,
    /// Counters for `--stats` and benchmarks.
    pub stats: Stats,
    query_root: Option<NodeId>,
    /// A limit met inside a step; the search loop returns it.
    stopped: Option<Limit>,
    /// The nodes that blocked others in the last blocking pass.
    blockers: Vec<NodeId>,
}

impl<'a> Tableau<'a> {
    /// A fresh tableau over prepared axioms.
    pub fn new(
        prep: &'a Prepared,
        concepts: &'a mut ConceptStore,
        ranges: &'a DataRangeStore,
        limits: Limits,
        cache: &'a mut SatCache,
    ) -> Self {
        Tableau {
            prep,
            cache,
            use_labels: !prep.tbox_nominals,
            record: false,
            concepts,
            ranges,
            deps: DepTable::default(),
            g: Graph::default(),
            stack: Vec::new(),
            clash: None,
            next_level: 1,
            limits,
            stats: Stats::default(),
            query_root: None,
            stopped: None,
            blockers: Vec::new(),
        }
    }

    /// Decides satisfiability of the ABox (when `with_abox`) together with a fresh individual
    /// in `query` (when given).
    pub fn run(&mut self, with_abox: bool, query: Option<ConceptId>, extra: &Extra) -> Outcome {
        // Only a pure concept test records labels: its graph is a tree below the query root.
        self.record = self.use_labels
            && !with_abox
            && query.is_some()
            && extra.classes.is_empty()
            && extra.roles.is_empty();
        self.init(with_abox, query);
        for &(c, a) in &extra.classes {
            let n = self.ind(a);
            self.add(n, c, Dep::EMPTY);
        }
        for &(r, a, b) in &extra.roles {
            let (x, y) = (self.ind(a), self.ind(b));
            self.add_edge(x, y, r, Dep::EMPTY);
        }
        self.search()
    }

    fn new_node(&mut self, parent: Option<NodeId>) -> NodeId {
        let id = self.g.nodes.len();
        self.g.nodes.push(Node {
            parent,
            active: true,
            ..Default::default()
        });
        self.g.clock += 1;
        self.g.changed.push(self.g.clock);
        self.g.checked.push(0);
        self.stats.nodes += 1;
        id
    }

    fn init(&mut self, with_abox: bool, query: Option<ConceptId>) {
        let p = self.prep;
        let u = p.universal;
        if with_abox {
            for i in 0..p.n_individuals {
                let n = self.new_node(None);
                self.g.nodes.get_mut(n).names.push(IndividualId(i as u32));
                self.g.ind_node.push(n);
            }
            for i in 0..p.n_individuals {
                let nom = self.concepts.nominal(IndividualId(i as u32));
                self.add(i, nom, Dep::EMPTY);
                self.add(i, u, Dep::EMPTY);
            }
            for &(c, a) in &p.class_assertions {
                let n = self.ind(a);
                self.add(n, c, Dep::EMPTY);
            }
            for &(r, a, b) in &p.role_assertions {
                let (x, y) = (self.ind(a), self.ind(b));
                self.add_edge(x, y, r, Dep::EMPTY);
            }
            for &(a, b) in &p.same {
                let (x, y) = (self.ind(a), self.ind(b));
                if x != y {
                    self.merge(y, x, Dep::EMPTY);
                }
            }
            for &(a, b) in &p.different {
                let (x, y) = (self.ind(a), self.ind(b));
                if x == y {
                    self.clash = Some(Dep::EMPTY);
                } else {
                    self.g.ineq.push((x, y, Dep::EMPTY));
                }
            }
        }
        if let Some(q) = query {
            let n = self.new_node(None);
            self.query_root = Some(n);
            self.add(n, q, Dep::EMPTY);
            self.add(n, u, Dep::EMPTY);
        }
    }

    /// Decides satisfiability of `query` for a fresh individual, starting from `base`: the
    /// complete, clash-free graph that a deterministic run on the ABox alone ended with.
    /// Every entry of `base` was derived without a choice, so it holds in every model, and
    /// continuing from it is the same search as a run that expanded the ABox first.
    pub fn run_from(&mut self, base: &Graph, query: ConceptId) -> Outcome {
        self.record = false;
        self.g = base.clone();
        let u = self.prep.universal;
        let n = self.new_node(None);
        self.query_root = Some(n);
        self.add(n, query, Dep::EMPTY);
        self.add(n, u, Dep::EMPTY);
        self.search()
    }

    /// The graph after a run whose every entry was derived without a choice (no
    /// branching point opened, every dependency empty), for [`Tableau::run_from`].
    pub fn deterministic_graph(&self) -> Option<Graph> {
        if self.stats.branches > 0 || self.clash.is_some() || !self.stack.is_empty() {
            return None;
        }
        let g = &self.g;
        let nodes_ok = g
            .nodes
            .iter()
            .all(|n| n.deps.0.iter().all(|&(_, d)| d == Dep::EMPTY));
        let edges_ok = g
            .edges
            .iter()
            .all(|e| e.roles.iter().all(|&(_, d)| d == Dep::EMPTY));
        let ineq_ok = g.ineq.iter().all(|&(_, _, d)| d == Dep::EMPTY);
        (nodes_ok && edges_ok && ineq_ok && g.queue.is_empty()).then(|| g.clone())
    }

    fn ind(&self, a: IndividualId) -> NodeId {
        self.find(self.g.ind_node[a.index()])
    }

    fn find(&self, mut x: NodeId) -> NodeId {
        while let Some(y) = self.g.nodes[x].merged_into {
            x = y;
        }
        x
    }

    fn has(&self, x: NodeId, c: ConceptId) -> Option<Dep> {
        if c == ConceptId::TOP {
            return Some(Dep::EMPTY);
        }
        self.g.nodes[x].deps.get(&c).copied()
    }

    /// Adds a concept to a node's label, detecting clashes on the way in.
    fn add(&mut self, x: NodeId, c: ConceptId, dep: Dep) {
        if c == ConceptId::TOP || self.g.nodes[x].deps.contains_key(&c) {
            return;
        }
        if c == ConceptId::BOTTOM {
            self.set_clash(dep);
            return;
        }
        if self.cache.is_unsat(c) {
            // No element of any model is in c (a finished concept test said so).
            self.stats.cache_hits += 1;
            self.set_clash(dep);
            return;
        }
        let nc = self.concepts.not(c);
        if let Some(d2) = self.has(x, nc) {
            let d = self.deps.union(dep, d2);
            self.set_clash(d);
            return;
        }
        let concept = self.concepts.get(c).clone();
        if let Concept::NotNominal(a) = concept
            && self.g.nodes[x].names.contains(&a)
        {
            self.set_clash(dep);
            return;
        }
        if let Concept::NotSelf(r) = concept
            && let Some(d) = self.loop_dep(x, r)
        {
            let d = self.deps.union(dep, d);
            self.set_clash(d);
            return;
        }
        let node = self.g.nodes.get_mut(x);
        node.label.push(c);
        node.deps.insert(c, dep);
        node.hash = node.hash.wrapping_add(mix(c.0 as u64));
        match concept {
            Concept::Or(_) => {
                node.ors.push(c);
                self.g.or_from = self.g.or_from.min(x);
            }
            Concept::Some(..) | Concept::AtLeast(..) => {
                node.gens.push(c);
                self.g.gen_from = self.g.gen_from.min(x);
            }
            Concept::AtMost(..) => node.at_mosts.push(c),
            Concept::All(..) | Concept::AllPath(..) => node.alls.push(c),
            Concept::DataSome(..)
            | Concept::DataAll(..)
            | Concept::DataAtLeast(..)
            | Concept::DataAtMost(..) => node.data_dirty = true,
            _ => {}
        }
        if !node.in_queue {
            node.in_queue = true;
            self.g.queue.push_back(x);
        }
        self.g.clock += 1;
        self.g.changed[x] = self.g.clock;
    }

    /// The time of the last change at x or at one of its neighbours.
    fn last_change_around(&self, x: NodeId) -> u64 {
        let mut m = self.g.changed[x];
        for &e in &self.g.nodes[x].edges {
            let ed = &self.g.edges[e];
            if ed.active {
                m = m.max(self.g.changed[ed.a]).max(self.g.changed[ed.b]);
            }
        }
        m
    }

    fn set_clash(&mut self, d: Dep) {
        if self.clash.is_none() {
            self.clash = Some(d);
        }
    }

    /// The neighbours of x: (node, role as seen from x, dependency of the edge role).
    fn neighbours(&self, x: NodeId) -> Vec<(NodeId, RoleId, Dep)> {
        let mut out = Vec::new();
        for &e in &self.g.nodes[x].edges {
            let edge = &self.g.edges[e];
            if !edge.active {
                continue;
            }
            for &(r, d) in &edge.roles {
                if edge.a == x {
                    out.push((edge.b, r, d));
                }
                if edge.b == x {
                    out.push((edge.a, r.inverse(), d));
                }
            }
        }
        out
    }

    /// The dependency of a self-loop at x whose role is below r in either direction (a loop
    /// r(x, x) is also r⁻(x, x)), if x has one.
    fn loop_dep(&self, x: NodeId, r: RoleId) -> Option<Dep> {
        let p = self.prep;
        for &e in &self.g.nodes[x].edges {
            let ed = &self.g.edges[e];
            if ed.active && ed.a == x && ed.b == x {
                for &(s, d) in &ed.roles {
                    if p.is_sub(s, r) || p.is_sub(s.inverse(), r) {
                        return Some(d);
                    }
                }
            }
        }
        None
    }

    /// Checks role r, just added to edge e in the edge's orientation, against the disjoint
    /// and asymmetric roles: a clash when the edge also carries a role disjoint with it.
    fn check_disjoint_roles(&mut self, e: EdgeId, r: RoleId, dep: Dep) {
        let p = self.prep;
        let ed = &self.g.edges[e];
        let is_loop = ed.a == ed.b;
        // On a loop a role holds in both directions.
        let views = |s: RoleId| {
            if is_loop {
                vec![s, s.inverse()]
            } else {
                vec![s]
            }
        };
        let mut found = None;
        'pairs: for &(pr, qr) in &p.disjoint_roles {
            if !views(r).iter().any(|&v| p.is_sub(v, pr)) {
                continue;
            }
            for &(s, ds) in &ed.roles {
                if views(s).iter().any(|&v| p.is_sub(v, qr)) {
                    found = Some(ds);
                    break 'pairs;
                }
            }
        }
        if let Some(ds) = found {
            let d = self.deps.union(dep, ds);
            self.set_clash(d);
        }
    }

    /// Adds role r on the edge x → y and fires the rules that a new edge enables.
    fn add_edge(&mut self, x: NodeId, y: NodeId, r: RoleId, dep: Dep) {
        let existing = self.g.nodes[x].edges.iter().copied().find(|&e| {
            let ed = &self.g.edges[e];
            ed.active && ((ed.a == x && ed.b == y) || (ed.a == y && ed.b == x))
        });
        let (e, oriented) = match existing {
            Some(e) => {
                let r2 = if self.g.edges[e].a == x {
                    r
                } else {
                    r.inverse()
                };
                if self.g.edges[e].roles.iter().any(|&(s, _)| s == r2) {
                    return;
                }
                (e, r2)
            }
            None => {
                let e = self.g.edges.len();
                self.g.edges.push(Edge {
                    a: x,
                    b: y,
                    roles: Vec::new(),
                    active: true,
                });
                self.g.nodes.get_mut(x).edges.push(e);
                if x != y {
                    self.g.nodes.get_mut(y).edges.push(e);
                }
                (e, r)
            }
        };
        self.g.edges.get_mut(e).roles.push((oriented, dep));
        if !self.prep.disjoint_roles.is_empty() {
            self.check_disjoint_roles(e, oriented, dep);
        }
        if x == y {
            // A new loop meets the node's ¬∃s.Self.
            let nots: Vec<(RoleId, Dep)> = self.g.nodes[x]
                .label
                .iter()
                .filter_map(|&c| match *self.concepts.get(c) {
                    Concept::NotSelf(s) => Some((s, self.g.nodes[x].deps[&c])),
                    _ => None,
                })
                .collect();
            for (s, ds) in nots {
                if self.prep.is_sub(r, s) || self.prep.is_sub(r.inverse(), s) {
                    let d = self.deps.union(dep, ds);
                    self.set_clash(d);
                }
            }
        }
        self.fire_edge(x, y, r, dep);
        if x == y {
            self.fire_edge(x, x, r.inverse(), dep);
        } else {
            self.fire_edge(y, x, r.inverse(), dep);
        }
        self.g.clock += 1;
        self.g.changed[x] = self.g.clock;
        self.g.changed[y] = self.g.clock;
        for n in [x, y] {
            if !self.g.nodes[n].in_queue {
                self.g.nodes.get_mut(n).in_queue = true;
                self.g.queue.push_back(n);
            }
        }
    }

    /// x has a new r-neighbour y: apply x's universal restrictions and r's triggers.
    fn fire_edge(&mut self, x: NodeId, y: NodeId, r: RoleId, dep: Dep) {
        let p = self.prep;
        for q in &p.supers[r.index()] {
            for &t in &p.triggers[q.index()] {
                self.add(x, t, dep);
            }
            if x == y {
                for &t in &p.self_triggers[q.index()] {
                    self.add(x, t, dep);
                }
            }
        }
        let alls = self.g.nodes[x].alls.clone();
        for c in alls {
            match *self.concepts.get(c) {
                Concept::All(s, f) if !p.complex[s.index()] && p.is_sub(r, s) => {
                    let dc = self.has(x, c).unwrap_or(Dep::EMPTY);
                    let d = self.deps.union(dep, dc);
                    self.add(y, f, d);
                    self.all_plus(y, r, s, f, d);
                }
                Concept::AllPath(s, q, f) => {
                    let dc = self.has(x, c).unwrap_or(Dep::EMPTY);
                    let d = self.deps.union(dep, dc);
                    self.path_step(y, r, s, q, f, d);
                }
                _ => {}
            }
        }
    }

    /// The ∀₂ rule of Horrocks, Kutz & Sattler 2006: ∀B_s(q).C at x and y an r-neighbour of
    /// x: ∀B_s(q').C at y for every move q →S q' with r ⊑* S.
    fn path_step(&mut self, y: NodeId, r: RoleId, s: RoleId, q: u32, f: ConceptId, d: Dep) {
        let p = self.prep;
        let aut = p.automata[s.index()]
            .as_ref()
            .expect("an automaton for a complex role");
        for &(label, next) in &aut.moves[q as usize] {
            if p.is_sub(r, label) {
                let c = self.concepts.all_path(s, next, f);
                self.add(y, c, d);
            }
        }
    }

    /// The ∀⁺ rule: ∀s.C at x, Trans(t), t ⊑* s, y a t-neighbour: ∀t.C at y.
    fn all_plus(&mut self, y: NodeId, via: RoleId, s: RoleId, f: ConceptId, d: Dep) {
        let p = self.prep;
        for &t in &p.supers[via.index()] {
            if p.transitive[t.index()] && p.is_sub(t, s) {
                let c = self.concepts.all(t, f);
                self.add(y, c, d);
            }
        }
    }

    /// Applies deterministic rules to queued nodes until none is left or a clash occurs.
    fn expand_deterministic(&mut self) {
        let mut popped: u32 = 0;
        while self.clash.is_none() {
            popped = popped.wrapping_add(1);
            if popped.is_multiple_of(256)
                && let Some(l) = self.limit_reached()
            {
                self.stopped = Some(l);
                return;
            }
            let Some(x) = self.g.queue.pop_front() else {
                return;
            };
            self.g.nodes.get_mut(x).in_queue = false;
            if !self.g.nodes[x].active {
                continue;
            }
            while self.clash.is_none() && self.g.nodes[x].cursor < self.g.nodes[x].label.len() {
                let i = self.g.nodes[x].cursor;
                self.g.nodes.get_mut(x).cursor += 1;
                let c = self.g.nodes[x].label[i];
                let dep = self.g.nodes[x].deps[&c];
                self.stats.expansions += 1;
                self.expand_one(x, c, dep);
                if !self.g.nodes[x].active {
                    break;
                }
            }
        }
    }

    fn expand_one(&mut self, x: NodeId, c: ConceptId, dep: Dep) {
        let p = self.prep;
        match self.concepts.get(c).clone() {
            Concept::And(xs) => {
                for y in xs {
                    self.add(x, y, dep);
                }
            }
            Concept::Atom(_) => {
                if let Some(us) = p.unfold.get(c.index()) {
                    for &u in us {
                        self.add(x, u, dep);
                    }
                }
                if let Some(rules) = p.conj_index.get(c.index()) {
                    for &ri in rules {
                        let (atoms, d) = &p.conj_rules[ri];
                        let mut all = dep;
                        let mut ok = true;
                        for &a in atoms {
                            match self.has(x, a) {
                                Some(da) => all = self.deps.union(all, da),
                                None => {
                                    ok = false;
                                    break;
                                }
                            }
                        }
                        if ok {
                            self.add(x, *d, all);
                        }
                    }
                }
            }
            Concept::All(r, f) if p.complex[r.index()] => {
                // ∀r.C is ∀B_r(q₀).C (the ∀₁ rule).
                let c = self.concepts.all_path(r, 0, f);
                self.add(x, c, dep);
            }
            Concept::AllPath(r, q, f) => {
                // ∀₃: a final state puts C here; ∀₂: the state moves along every edge.
                let aut = p.automata[r.index()].as_ref().expect("automaton");
                if aut.accepting[q as usize] {
                    self.add(x, f, dep);
                }
                for (y, s, ed) in self.neighbours(x) {
                    let d = self.deps.union(dep, ed);
                    self.path_step(y, s, r, q, f, d);
                }
            }
            Concept::HasSelf(r) => self.add_edge(x, x, r, dep),
            Concept::All(r, f) => {
                for (y, s, ed) in self.neighbours(x) {
                    if p.is_sub(s, r) {
                        let d = self.deps.union(dep, ed);
                        self.add(y, f, d);
                        self.all_plus(y, s, r, f, d);
                    }
                }
            }
            Concept::Nominal(b) => {
                // {b} asserted of a named individual: it is b (merge the root nodes).
                let t = self.ind(b);
                if t != x && !self.g.nodes[x].names.contains(&b) {
                    if let Some(d) = self.distinct(x, t) {
                        let dd = self.deps.union(d, dep);
                        self.set_clash(dd);
                    } else {
                        self.stats.merges += 1;
                        self.merge(x, t, dep);
                    }
                }
            }
            Concept::DataSome(dp, _) | Concept::DataAtLeast(_, dp, _) => {
                for q in &p.data_supers[dp.index()] {
                    for &t in &p.data_triggers[q.index()] {
                        self.add(x, t, dep);
                    }
                }
            }
            _ => {}
        }
    }

    /// Checks the data constraints of every node whose data concepts changed.
    fn check_data(&mut self) {
        for x in 0..self.g.nodes.len() {
            if self.clash.is_some() {
                return;
            }
            if !self.g.nodes[x].active || !self.g.nodes[x].data_dirty {
                continue;
            }
            self.g.nodes.get_mut(x).data_dirty = false;
            self.check_data_node(x);
        }
    }

    fn check_data_node(&mut self, x: NodeId) {
        let p = self.prep;
        let mut somes = Vec::new();
        let mut alls = Vec::new();
        let mut counted = false;
        for &c in &self.g.nodes[x].label {
            match *self.concepts.get(c) {
                Concept::DataSome(dp, r) => somes.push((dp, r, self.g.nodes[x].deps[&c])),
                Concept::DataAll(dp, r) => alls.push((dp, r, self.g.nodes[x].deps[&c])),
                Concept::DataAtLeast(..) | Concept::DataAtMost(..) => counted = true,
                _ => {}
            }
        }
        // Values of properties under a disjoint pair may not coincide: only the full search
        // sees which values are one literal (only KBs with the axiom get here).
        if counted
            || (!p.data_disjoint.is_empty()
                && somes
                    .iter()
                    .any(|&(dp, _, _)| p.data_in_disjoint[dp.index()]))
        {
            self.check_data_counts(x, &alls);
            return;
        }
        if somes.is_empty() {
            return;
        }
        let mut all_dep = Dep::EMPTY;
        for &(_, _, d) in &alls {
            all_dep = self.deps.union(all_dep, d);
        }
        // The ranges each value must lie in, as the ids whose intersection is its range.
        let eff: Vec<Vec<DataRangeId>> = somes
            .iter()
            .map(|&(dp, r, _)| self.effective_range_ids(dp, r, &alls))
            .collect();
        // Values of properties under a common functional property coincide.
        let n = somes.len();
        let mut group: Vec<usize> = (0..n).collect();
        fn root(g: &mut [usize], mut i: usize) -> usize {
            while g[i] != i {
                g[i] = g[g[i]];
                i = g[i];
            }
            i
        }
        for i in 0..n {
            for j in i + 1..n {
                let shared = p.data_supers[somes[i].0.index()].iter().any(|q| {
                    p.data_functional[q.index()] && p.data_supers[somes[j].0.index()].contains(q)
                });
                if shared {
                    let (a, b) = (root(&mut group, i), root(&mut group, j));
                    group[a] = b;
                }
            }
        }
        for g in 0..n {
            let mut ids: Vec<DataRangeId> = Vec::new();
            let mut d = all_dep;
            for i in 0..n {
                if root(&mut group, i) == g {
                    ids.extend_from_slice(&eff[i]);
                    d = self.deps.union(d, somes[i].2);
                }
            }
            if !ids.is_empty() && self.empty_intersection(ids) {
                self.set_clash(d);
                return;
            }
        }
    }

    /// The ranges whose intersection a value of `dp` must lie in at a node: `r`, the node's
    /// ∀ restrictions on `dp`'s super-properties and their range axioms.
    fn effective_range_ids(
        &self,
        dp: DataPropId,
        r: DataRangeId,
        alls: &[(DataPropId, DataRangeId, Dep)],
    ) -> Vec<DataRangeId> {
        let p = self.prep;
        let mut ids = vec![r];
        for &(q, e, _) in alls {
            if p.data_supers[dp.index()].contains(&q) {
                ids.push(e);
            }
        }
        for q in &p.data_supers[dp.index()] {
            ids.extend_from_slice(&p.data_ranges[q.index()]);
        }
        ids
    }

    /// Whether the ranges have no value in common, remembered in the preparation.
    fn empty_intersection(&self, mut ids: Vec<DataRangeId>) -> bool {
        ids.sort_unstable();
        ids.dedup();
        if let Some(e) = self.prep.empty_ranges.get(&ids) {
            return e;
        }
        let mut acc = self.ranges.get(ids[0]).clone();
        for &id in &ids[1..] {
            if acc.is_empty() {
                break;
            }
            acc = acc.intersect(self.ranges.get(id));
        }
        let e = acc.is_empty();
        self.prep.empty_ranges.put(ids, e);
        e
    }

    /// The range a value of `dp` must lie in at a node: `r` cut by the node's ∀ restrictions
    /// and the range axioms of `dp`'s super-properties.
    fn effective_range(
        &self,
        dp: DataPropId,
        r: DataRangeId,
        alls: &[(DataPropId, DataRangeId, Dep)],
    ) -> DataRange {
        let p = self.prep;
        let mut acc = self.ranges.get(r).clone();
        for &(q, e, _) in alls {
            if p.data_supers[dp.index()].contains(&q) {
                acc = acc.intersect(self.ranges.get(e));
            }
        }
        for q in &p.data_supers[dp.index()] {
            for &rr in &p.data_ranges[q.index()] {
                acc = acc.intersect(self.ranges.get(rr));
            }
        }
        acc
    }

    /// The data check of a node with data number restrictions: the search of
    /// [`datavalues`] over the values the node needs. The clash depends on every data
    /// concept of the node (coarse, but sound for backjumping).
    fn check_data_counts(&mut self, x: NodeId, alls: &[(DataPropId, DataRangeId, Dep)]) {
        let p = self.prep;
        let (needs, caps, dep) = self.data_problem(x, alls, 0);
        let applies = |a: DataPropId, b: DataPropId| p.data_supers[a.index()].contains(&b);
        let props = datavalues::Props {
            sub: &applies,
            disjoint: &p.data_disjoint,
        };
        match datavalues::check(&needs, &caps, props, DATA_BUDGET) {
            datavalues::Verdict::Sat => {}
            datavalues::Verdict::Unsat => self.set_clash(dep),
            datavalues::Verdict::Budget => self.stopped = Some(Limit::DataValues),
        }
    }

    /// The values node x needs and the caps on them (functional properties as ≤1 q.⊤), as
    /// [`datavalues`] takes them, with the dependency of every data concept of the node;
    /// `group` numbers the node's ≥n groups from there.
    fn data_problem(
        &mut self,
        x: NodeId,
        alls: &[(DataPropId, DataRangeId, Dep)],
        mut group: u32,
    ) -> (Vec<datavalues::Need>, Vec<datavalues::Cap>, Dep) {
        let p = self.prep;
        let mut needs = Vec::new();
        let mut caps = Vec::new();
        let mut dep = Dep::EMPTY;
        let label: Vec<ConceptId> = self.g.nodes[x].label.to_vec();
        for c in label {
            let (need_n, dp, r, grouped) = match *self.concepts.get(c) {
                Concept::DataSome(dp, r) => (1, dp, r, false),
                Concept::DataAtLeast(n, dp, r) => (n, dp, r, true),
                Concept::DataAtMost(m, q, e) => {
                    caps.push(datavalues::Cap {
                        prop: q,
                        range: self.ranges.get(e).clone(),
                        max: m,
                    });
                    dep = self.deps.union(dep, self.g.nodes[x].deps[&c]);
                    continue;
                }
                Concept::DataAll(..) => {
                    dep = self.deps.union(dep, self.g.nodes[x].deps[&c]);
                    continue;
                }
                _ => continue,
            };
            dep = self.deps.union(dep, self.g.nodes[x].deps[&c]);
            let range = self.effective_range(dp, r, alls);
            for _ in 0..need_n {
                needs.push(datavalues::Need {
                    prop: dp,
                    range: range.clone(),
                    group: grouped.then_some(group),
                });
            }
            group += 1;
        }
        // A functional property is ≤1 q.⊤.
        let mut functional: Vec<DataPropId> = needs
            .iter()
            .flat_map(|n| p.data_supers[n.prop.index()].iter().copied())
            .filter(|q| p.data_functional[q.index()])
            .collect();
        functional.sort_unstable();
        functional.dedup();
        for q in functional {
            caps.push(datavalues::Cap {
                prop: q,
                range: DataRange::everything(),
                max: 1,
            });
        }
        (needs, caps, dep)
    }

    /// Which nodes are blocked, directly or through a blocked ancestor. Pairwise anywhere
    /// blocking (Horrocks, Sattler & Tobies 1999 for the pairwise condition; Motik, Shearer &
    /// Horrocks 2009, §5, for taking the blocker anywhere earlier in the graph): a tree node x
    /// with parent x' is blocked by an earlier unblocked tree node y with parent y' when
    /// L(x)=L(y), L(x')=L(y') and the edges x'→x and y'→y carry the same roles.
    ///
    /// Before the blocking test, a node whose label may reuse a recorded satisfiable label
    /// is marked [`Status::Cached`] (the rule of reuse in [`super::cache`]).
    fn blocked_all(&mut self) -> Vec<Status> {
        let n = self.g.nodes.len();
        let mut blocked = vec![Status::Open; n];
        self.blockers.clear();
        // Earlier unblocked nodes by a hash of their label and their parent's label: the head
        // of a list threaded through `next`, so a pass allocates nothing per node.
        let mut heads: HashMap<u64, NodeId, std::hash::BuildHasherDefault<MixedKey>> =
            HashMap::default();
        let mut next = vec![usize::MAX; n];
        for x in 0..n {
            let node = &self.g.nodes[x];
            if !node.active || node.is_root() {
                continue;
            }
            let xp = node.parent.expect("tree node has a parent");
            if blocked[xp] != Status::Open {
                blocked[x] = Status::Below;
                continue;
            }
            if self.use_labels && self.cache.knows_hash(node.hash) {
                let roles = self.edge_roles(xp, x);
                if self.reusable(x, &roles) {
                    self.stats.cache_hits += 1;
                    blocked[x] = Status::Cached;
                    continue;
                }
            }
            let node = &self.g.nodes[x];
            let key = mix(node.hash ^ mix(self.g.nodes[xp].hash).rotate_left(17));
            let mut cand = heads.get(&key).copied().unwrap_or(usize::MAX);
            let mut blocker = None;
            while cand != usize::MAX {
                let y = cand;
                let yp = self.g.nodes[y].parent.expect("tree node");
                // The node's self-loop roles count too: a loop made by merging a successor
                // into its predecessor is in no label, yet may meet the node's ∃ demands.
                if self.same_label(x, y)
                    && self.same_label(xp, yp)
                    && self.edge_roles(xp, x) == self.edge_roles(yp, y)
                    && self.loop_roles(x) == self.loop_roles(y)
                {
                    blocker = Some(y);
                    break;
                }
                cand = next[y];
            }
            if let Some(y) = blocker {
                blocked[x] = Status::Blocked;
                self.blockers.push(y);
            } else {
                next[x] = heads.insert(key, x).unwrap_or(usize::MAX);
            }
        }
        blocked
    }

    /// The rule of reuse (see [`super::cache`]): x's label is a recorded satisfiable label
    /// and none of its at-most restrictions counts the predecessor, reached from x by the
    /// inverses of `roles` (the roles on the edge predecessor → x).
    fn reusable(&self, x: NodeId, roles: &[RoleId]) -> bool {
        let node = &self.g.nodes[x];
        if !self
            .cache
            .is_sat_label(node.hash, node.deps.0.iter().map(|e| e.0))
        {
            return false;
        }
        !node.at_mosts.iter().any(|&c| match *self.concepts.get(c) {
            Concept::AtMost(_, s, _) => roles.iter().any(|&r| self.prep.is_sub(r.inverse(), s)),
            _ => false,
        })
    }

    /// Records the final labels of a complete graph whose ∃/≥ demands their own subtrees
    /// meet (the recording condition in [`super::cache`]).
    fn record_labels(&mut self, status: &[Status]) {
        for (x, &st) in status.iter().enumerate() {
            let node = &self.g.nodes[x];
            if !node.active || st != Status::Open || !node.names.is_empty() {
                continue;
            }
            if let Some(p) = node.parent {
                let roles = self.edge_roles(p, x);
                let leans_on_parent = node.gens.iter().any(|&c| match *self.concepts.get(c) {
                    Concept::Some(s, _) | Concept::AtLeast(_, s, _) => {
                        roles.iter().any(|&r| self.prep.is_sub(r.inverse(), s))
                    }
                    _ => false,
                });
                if leans_on_parent {
                    continue;
                }
            }
            let node = &self.g.nodes[x];
            let label: Vec<ConceptId> = node.deps.0.iter().map(|e| e.0).collect();
            self.cache.record_sat(node.hash, label);
        }
    }

    /// The roles of x's self-loop, each in its named direction, sorted.
    fn loop_roles(&self, x: NodeId) -> Vec<RoleId> {
        let mut v = Vec::new();
        for &e in &self.g.nodes[x].edges {
            let ed = &self.g.edges[e];
            if ed.active && ed.a == x && ed.b == x {
                v.extend(ed.roles.iter().map(|&(r, _)| r.min(r.inverse())));
            }
        }
        v.sort_unstable();
        v.dedup();
        v
    }

    fn same_label(&self, a: NodeId, b: NodeId) -> bool {
        let (x, y) = (&self.g.nodes[a], &self.g.nodes[b]);
        x.hash == y.hash
            && x.label.len() == y.label.len()
            && x.label.iter().all(|c| y.deps.contains_key(c))
    }

    fn edge_roles(&self, from: NodeId, to: NodeId) -> Vec<RoleId> {
        let mut v: Vec<RoleId> = self
            .neighbours(from)
            .into_iter()
            .filter(|&(y, _, _)| y == to)
            .map(|(_, r, _)| r)
            .collect();
        v.sort_unstable();
        v.dedup();
        v
    }

    fn distinct(&self, a: NodeId, b: NodeId) -> Option<Dep> {
        self.g
            .ineq
            .iter()
            .find(|&&(x, y, _)| (x == a && y == b) || (x == b && y == a))
            .map(|&(_, _, d)| d)
    }

    /// The r-neighbours of x carrying C (or all when `c` is `None`), with the dependency of
    /// the edge, one entry per node.
    fn r_neighbours(&self, x: NodeId, r: RoleId) -> Vec<(NodeId, Dep)> {
        let p = self.prep;
        let mut out: Vec<(NodeId, Dep)> = Vec::new();
        for (y, s, d) in self.neighbours(x) {
            if p.is_sub(s, r) && !out.iter().any(|&(z, _)| z == y) {
                out.push((y, d));
            }
        }
        out
    }

    /// Looks for a non-deterministic rule to apply: choose, ≤ and ⊔. Returns whether one
    /// applied (or a clash was found).
    fn nondeterministic(&mut self, indirectly_blocked: &[bool]) -> bool {
        // ≤ and choose rules.
        for x in 0..self.g.nodes.len() {
            if !self.g.nodes[x].active
                || self.g.nodes[x].at_mosts.is_empty()
                || self.is_indirectly_blocked(x, indirectly_blocked)
                || self.g.checked[x] >= self.last_change_around(x)
            {
                continue;
            }
            for c in self.g.nodes[x].at_mosts.clone() {
                let Concept::AtMost(n, r, f) = *self.concepts.get(c) else {
                    continue;
                };
                let dc = self.g.nodes[x].deps[&c];
                let nbrs = self.r_neighbours(x, r);
                if f != ConceptId::TOP {
                    let nf = self.concepts.not(f);
                    for &(y, _) in &nbrs {
                        if self.has(y, f).is_none() && self.has(y, nf).is_none() {
                            self.stats.branches += 1;
                            self.branch(
                                Choice::Add {
                                    node: y,
                                    options: vec![f, nf],
                                },
                                dc,
                            );
                            return true;
                        }
                    }
                }
                if self.g.nominal_edges
                    && n > 0
                    && self.g.nodes[x].is_root()
                    && let Some((w, wd)) = self.blockable_predecessor(x, &nbrs, f)
                {
                    self.nominal_at_most(x, n, r, f, (w, wd), dc);
                    return true;
                }
                let with: Vec<(NodeId, Dep)> = nbrs
                    .iter()
                    .filter_map(|&(y, ed)| self.has(y, f).map(|fd| (y, self.deps_union(ed, fd))))
                    .collect();
                if with.len() as u64 <= n as u64 {
                    continue;
                }
                let mut base = dc;
                for &(_, d) in &with {
                    base = self.deps.union(base, d);
                }
                let mut pairs = Vec::new();
                for i in 0..with.len() {
                    for j in i + 1..with.len() {
                        let (y, z) = (with[i].0, with[j].0);
                        match self.distinct(y, z) {
                            Some(d) => base = self.deps.union(base, d),
                            None => pairs.push(self.merge_order(x, y, z)),
                        }
                    }
                }
                if pairs.is_empty() {
                    self.set_clash(base);
                    return true;
                }
                self.stats.branches += 1;
                self.branch(Choice::Merge { options: pairs }, base);
                return true;
            }
            self.g.checked[x] = self.g.clock;
        }
        // ⊔ rule with boolean constraint propagation. Satisfied disjunctions are dropped
        // from the node's pending list (labels only grow until a backtrack restores the
        // snapshot, so a satisfied disjunction stays satisfied).
        let mut clean_so_far = true;
        for x in self.g.or_from..self.g.nodes.len() {
            if !self.g.nodes[x].active || self.g.nodes[x].ors.is_empty() {
                if clean_so_far {
                    self.g.or_from = x + 1;
                }
                continue;
            }
            if self.is_indirectly_blocked(x, indirectly_blocked) {
                clean_so_far = false;
                continue;
            }
            let mut satisfied: Vec<ConceptId> = Vec::new();
            let mut pick: Option<ConceptId> = None;
            for &c in &self.g.nodes[x].ors {
                let Concept::Or(xs) = self.concepts.get(c) else {
                    continue;
                };
                if xs.iter().any(|&d| self.has(x, d).is_some()) {
                    satisfied.push(c);
                } else {
                    pick = Some(c);
                    break;
                }
            }
            if !satisfied.is_empty() {
                self.g
                    .nodes
                    .get_mut(x)
                    .ors
                    .retain(|c| !satisfied.contains(c));
            }
            let Some(c) = pick else {
                if clean_so_far {
                    self.g.or_from = x + 1;
                }
                continue;
            };
            let Concept::Or(xs) = self.concepts.get(c).clone() else {
                continue;
            };
            let mut base = self.g.nodes[x].deps[&c];
            let mut open = Vec::new();
            for &d in &xs {
                let nd = self.concepts.not(d);
                match self.has(x, nd) {
                    Some(dd) => base = self.deps.union(base, dd),
                    None => open.push(d),
                }
            }
            // Cheap disjuncts first: negated atoms, atoms, then the rest; generating ones last.
            let rank = |t: &Tableau, d: ConceptId| match t.concepts.get(d) {
                Concept::NotAtom(_) => 0,
                Concept::Atom(_) => 1,
                Concept::Some(..) | Concept::AtLeast(..) => 3,
                _ => 2,
            };
            open.sort_by_key(|&d| (rank(self, d), d));
            match open.len() {
                0 => self.set_clash(base),
                1 => self.add(x, open[0], base),
                _ => {
                    self.stats.branches += 1;
                    self.branch(
                        Choice::Add {
                            node: x,
                            options: open,
                        },
                        base,
                    );
                }
            }
            return true;
        }
        false
    }

    /// A blockable r-neighbour w of the nominal node x carrying `f`, with x a successor of
    /// w (w is not x's child), and the dependency of the edge and of `f` at w: the
    /// neighbour that SHOIQ's NN-rule and ≤o-rule (Horrocks & Sattler 2007, Fig. 3) are
    /// about, since unravelling may copy w while x stays one element.
    fn blockable_predecessor(
        &mut self,
        x: NodeId,
        nbrs: &[(NodeId, Dep)],
        f: ConceptId,
    ) -> Option<(NodeId, Dep)> {
        for &(w, ed) in nbrs {
            let node = &self.g.nodes[w];
            if node.is_root() || node.parent == Some(x) {
                continue;
            }
            if let Some(fd) = self.has(w, f) {
                return Some((w, self.deps.union(ed, fd)));
            }
        }
        None
    }

    /// The NN-rule and the ≤o-rule of Horrocks & Sattler, "A Tableau Decision Procedure
    /// for SHOIQ" (JAR 2007, Fig. 3), for ≤n r.f at the nominal node x (dependency `dc`) and
    /// its blockable predecessor w with f (dependency `wd`).
    ///
    /// When x already holds some ≤m r.f (m ≤ n) together with m pairwise distinct nominal
    /// r-neighbours carrying f, every other such neighbour is one of them in any model, so
    /// w is merged into one of those nominal nodes (branching over which; merging into a
    /// nominal node prunes w's blockable successors). Otherwise the NN-rule guesses the
    /// exact number m of r-neighbours with f (1 ≤ m ≤ n, at least w's element exists) and
    /// makes them m new nominal nodes: they are never blocked, so unravelling cannot copy
    /// them past x's restriction.
    fn nominal_at_most(
        &mut self,
        x: NodeId,
        n: u32,
        r: RoleId,
        f: ConceptId,
        (w, wd): (NodeId, Dep),
        dc: Dep,
    ) {
        let mut noms: Vec<(NodeId, Dep)> = Vec::new();
        for (z, ed) in self.r_neighbours(x, r) {
            if self.g.nodes[z].is_root()
                && let Some(fd) = self.has(z, f)
            {
                noms.push((z, self.deps.union(ed, fd)));
            }
        }
        for c in self.g.nodes[x].at_mosts.clone() {
            let Concept::AtMost(m, r2, f2) = *self.concepts.get(c) else {
                continue;
            };
            if r2 != r || f2 != f || m == 0 || m > n {
                continue;
            }
            let ids: Vec<NodeId> = noms.iter().map(|&(z, _)| z).collect();
            let Some(clique) = self.find_clique(&ids, m as usize) else {
                continue;
            };
            // The ≤o-rule: merge w into one of the m distinct nominal neighbours.
            let mut base = self.g.nodes[x].deps[&c];
            base = self.deps.union(base, wd);
            for (i, &z) in clique.iter().enumerate() {
                let zd = noms.iter().find(|e| e.0 == z).map_or(Dep::EMPTY, |e| e.1);
                base = self.deps.union(base, zd);
                for &z2 in &clique[..i] {
                    let d = self.distinct(z, z2).expect("a clique is pairwise distinct");
                    base = self.deps.union(base, d);
                }
            }
            let mut options = Vec::new();
            for &z in &clique {
                match self.distinct(w, z) {
                    Some(d) => base = self.deps.union(base, d),
                    None => options.push((w, z)),
                }
            }
            if options.is_empty() {
                self.set_clash(base);
            } else {
                self.stats.branches += 1;
                self.branch(Choice::Merge { options }, base);
            }
            return;
        }
        // The NN-rule.
        let base = self.deps.union(dc, wd);
        self.stats.branches += 1;
        self.branch(
            Choice::Nominals {
                node: x,
                role: r,
                filler: f,
                max: n,
            },
            base,
        );
    }

    fn deps_union(&mut self, a: Dep, b: Dep) -> Dep {
        self.deps.union(a, b)
    }

    fn is_indirectly_blocked(&self, x: NodeId, blocked: &[bool]) -> bool {
        match self.g.nodes[x].parent {
            Some(p) => p < blocked.len() && blocked[p],
            None => false,
        }
    }

    /// Orders a merge pair (from, into): into a nominal (root) node, so that a blockable
    /// node never absorbs a nominal one (Horrocks & Sattler 2007, the ≤-rule); between two
    /// roots into a named one; else into x's predecessor, else into the older node.
    fn merge_order(&self, x: NodeId, y: NodeId, z: NodeId) -> (NodeId, NodeId) {
        let (ny, nz) = (&self.g.nodes[y], &self.g.nodes[z]);
        if ny.is_root() != nz.is_root() {
            return if ny.is_root() { (z, y) } else { (y, z) };
        }
        if !ny.names.is_empty() && nz.names.is_empty() {
            return (z, y);
        }
        if !nz.names.is_empty() && ny.names.is_empty() {
            return (y, z);
        }
        if self.g.nodes[x].parent == Some(y) {
            return (z, y);
        }
        if self.g.nodes[x].parent == Some(z) {
            return (y, z);
        }
        if y < z { (z, y) } else { (y, z) }
    }

    fn branch(&mut self, choice: Choice, base: Dep) {
        let level = self.next_level;
        self.next_level += 1;
        self.stack.push(Branch {
            snapshot: self.g.clone(),
            level,
            choice,
            next: 0,
            base,
            failed: Vec::new(),
            acc: Dep::EMPTY,
        });
        self.apply_alternative();
    }

    /// Applies the current alternative of the top branching point; the last one is applied
    /// deterministically with the dependencies of the failures before it.
    fn apply_alternative(&mut self) {
        let top = self.stack.last().expect("a branching point");
        let level = top.level;
        let i = top.next;
        let choice = top.choice.clone();
        let failed = top.failed.clone();
        let n = match &choice {
            Choice::Add { options, .. } => options.len(),
            Choice::Merge { options } => options.len(),
            Choice::Nominals { max, .. } => *max as usize,
            Choice::KeyApart { props, .. } => props.len() + 1,
        };
        let last = i + 1 == n;
        let dep = if last {
            let top = self.stack.pop().expect("a branching point");
            self.deps.union(top.base, top.acc)
        } else {
            let s = self.deps.single(level);
            let b = self.stack.last().expect("a branching point").base;
            self.deps.union(s, b)
        };
        match choice {
            Choice::Add { node, options } => {
                // Semantic branching: the options tried before are false here.
                for (j, &o) in options.iter().enumerate().take(i) {
                    let no = self.concepts.not(o);
                    self.add(node, no, failed[j]);
                }
                self.add(node, options[i], dep);
            }
            Choice::Merge { options } => {
                let (y, z) = options[i];
                let (y, z) = (self.find(y), self.find(z));
                if y != z {
                    if let Some(d) = self.distinct(y, z) {
                        let dd = self.deps.union(d, dep);
                        self.set_clash(dd);
                    } else {
                        self.stats.merges += 1;
                        self.merge(y, z, dep);
                    }
                }
            }
            Choice::Nominals {
                node, role, filler, ..
            } => self.new_nominals(node, role, filler, i as u32 + 1, dep),
            Choice::KeyApart { x, y, props } => self.apply_key_alternative(x, y, &props, i, dep),
        }
    }

    /// The NN-rule's action (Horrocks & Sattler 2007, Fig. 3): ≤m r.f at the nominal node
    /// x and m new nominal nodes (roots without a name: never blocked, never pruned) as
    /// pairwise distinct r-neighbours of x with f.
    fn new_nominals(&mut self, x: NodeId, r: RoleId, f: ConceptId, m: u32, dep: Dep) {
        let am = self.concepts.at_most(m, r, f);
        self.add(x, am, dep);
        let u = self.prep.universal;
        let mut news = Vec::with_capacity(m as usize);
        for _ in 0..m {
            let y = self.new_node(None);
            self.add_edge(x, y, r, dep);
            self.add(y, f, dep);
            self.add(y, u, Dep::EMPTY);
            news.push(y);
        }
        for i in 0..news.len() {
            for j in i + 1..news.len() {
                self.g.ineq.push((news[i], news[j], dep));
            }
        }
    }

    /// Backtracks after a clash: jumps over branching points the clash does not depend on.
    /// Returns false when no alternative is left (unsatisfiable).
    fn backtrack(&mut self, clash: Dep) -> bool {
        loop {
            let Some(top) = self.stack.last_mut() else {
                return false;
            };
            if !self.deps.contains(clash, top.level) {
                self.stats.backjumps += 1;
                self.stack.pop();
                continue;
            }
            let level = top.level;
            let rest = self.deps.remove(clash, level);
            let top = self.stack.last_mut().expect("top");
            top.failed.push(rest);
            let acc = top.acc;
            let acc2 = self.deps.union(acc, rest);
            let top = self.stack.last_mut().expect("top");
            top.acc = acc2;
            top.next += 1;
            self.g = top.snapshot.clone();
            self.clash = None;
            self.apply_alternative();
            return true;
        }
    }

    /// Merges node y into z (the ≤-rule's Merge, Horrocks, Sattler & Tobies 2000).
    fn merge(&mut self, y: NodeId, z: NodeId, dep: Dep) {
        self.g.gen_from = 0;
        if self.g.nodes[z].is_root() {
            self.g.nominal_edges = true;
        }
        let label: Vec<(ConceptId, Dep)> = self.g.nodes[y]
            .label
            .iter()
            .map(|c| (*c, self.g.nodes[y].deps[c]))
            .collect();
        let names = std::mem::take(&mut self.g.nodes.get_mut(y).names);
        self.g.nodes.get_mut(z).names.extend(names);
        let edges = self.g.nodes[y].edges.clone();
        let mut moved: Vec<(NodeId, RoleId, Dep)> = Vec::new();
        for e in edges {
            if !self.g.edges[e].active {
                continue;
            }
            let (a, b) = (self.g.edges[e].a, self.g.edges[e].b);
            let roles = self.g.edges[e].roles.clone();
            self.g.edges.get_mut(e).active = false;
            let other = if a == y { b } else { a };
            if other != y
                && self.g.nodes[other].parent == Some(y)
                && self.g.nodes[other].names.is_empty()
            {
                self.prune(other);
                continue;
            }
            for (r, d) in roles {
                let d = self.deps.union(d, dep);
                if a == y && b == y {
                    moved.push((z, r, d));
                } else if a == y {
                    moved.push((b, r, d));
                } else {
                    moved.push((a, r.inverse(), d));
                }
            }
        }
        self.g.nodes.get_mut(y).active = false;
        self.g.nodes.get_mut(y).merged_into = Some(z);
        for (c, d) in label {
            let d = self.deps.union(d, dep);
            self.add(z, c, d);
        }
        for (other, r, d) in moved {
            let other = if other == y { z } else { self.find(other) };
            if self.g.nodes[other].active {
                self.add_edge(z, other, r, d);
            }
        }
        let mut ineq = std::mem::take(&mut self.g.ineq);
        for (a, b, d) in ineq.iter_mut() {
            if *a == y {
                *a = z;
            }
            if *b == y {
                *b = z;
            }
            if *a == *b {
                let dd = self.deps.union(*d, dep);
                self.set_clash(dd);
            }
        }
        self.g.ineq = ineq;
        // The survivor's at-most restrictions need another look.
        if !self.g.nodes[z].in_queue {
            self.g.nodes.get_mut(z).in_queue = true;
            self.g.queue.push_back(z);
        }
    }

    fn prune(&mut self, x: NodeId) {
        self.g.gen_from = 0;
        let mut stack = vec![x];
        while let Some(n) = stack.pop() {
            if !self.g.nodes[n].active {
                continue;
            }
            self.g.nodes.get_mut(n).active = false;
            for e in self.g.nodes[n].edges.clone() {
                if !self.g.edges[e].active {
                    continue;
                }
                let other = if self.g.edges[e].a == n {
                    self.g.edges[e].b
                } else {
                    self.g.edges[e].a
                };
                self.g.edges.get_mut(e).active = false;
                if self.g.nodes[other].parent == Some(n) && self.g.nodes[other].names.is_empty() {
                    stack.push(other);
                }
            }
        }
    }

    /// Whether every ∃/≥ demand of x is met by its current neighbours.
    fn demands_met(&mut self, x: NodeId) -> bool {
        for i in 0..self.g.nodes[x].gens.len() {
            let c = self.g.nodes[x].gens[i];
            let met = match *self.concepts.get(c) {
                Concept::Some(r, f) => self
                    .r_neighbours(x, r)
                    .iter()
                    .any(|&(y, _)| self.has(y, f).is_some()),
                Concept::AtLeast(n, r, f) => {
                    let cands: Vec<NodeId> = self
                        .r_neighbours(x, r)
                        .into_iter()
                        .filter(|&(y, _)| self.has(y, f).is_some())
                        .map(|(y, _)| y)
                        .collect();
                    self.has_clique(&cands, n as usize)
                }
                _ => true,
            };
            if !met {
                return false;
            }
        }
        true
    }

    /// Applies the generating rules (∃, ≥) to the first node that needs them.
    #[allow(clippy::needless_range_loop)]
    fn generate(&mut self, blocked: &[Status]) -> bool {
        let mut clean_so_far = true;
        for x in self.g.gen_from..self.g.nodes.len() {
            let open = self.g.nodes[x].active && blocked[x] == Status::Open;
            if !open {
                if self.g.nodes[x].active && !self.g.nodes[x].gens.is_empty() {
                    // A blocked node's demands wait: it may be unblocked later.
                    clean_so_far = false;
                } else if clean_so_far {
                    self.g.gen_from = x + 1;
                }
                continue;
            }
            if self.demands_met(x) {
                if clean_so_far {
                    self.g.gen_from = x + 1;
                }
                continue;
            }
            let mut did = false;
            for c in self.g.nodes[x].gens.clone() {
                if self.clash.is_some() || !self.g.nodes[x].active {
                    return true;
                }
                let dc = self.g.nodes[x].deps[&c];
                match *self.concepts.get(c) {
                    Concept::Some(r, f) => {
                        let ok = self
                            .r_neighbours(x, r)
                            .iter()
                            .any(|&(y, _)| self.has(y, f).is_some());
                        if ok {
                            continue;
                        }
                        did = true;
                        if let Concept::Nominal(a) = *self.concepts.get(f) {
                            let t = self.ind(a);
                            self.g.nominal_edges = true;
                            self.add_edge(x, t, r, dc);
                        } else {
                            self.successor(x, r, f, dc);
                        }
                    }
                    Concept::AtLeast(n, r, f) => {
                        let cands: Vec<NodeId> = self
                            .r_neighbours(x, r)
                            .into_iter()
                            .filter(|&(y, _)| self.has(y, f).is_some())
                            .map(|(y, _)| y)
                            .collect();
                        if self.has_clique(&cands, n as usize) {
                            continue;
                        }
                        did = true;
                        let news: Vec<NodeId> =
                            (0..n).map(|_| self.successor(x, r, f, dc)).collect();
                        for i in 0..news.len() {
                            for j in i + 1..news.len() {
                                self.g.ineq.push((news[i], news[j], dc));
                            }
                        }
                    }
                    _ => {}
                }
            }
            if did {
                return true;
            }
        }
        false
    }

    /// Whether `n` of the candidates are pairwise distinct (the ≥-rule's condition), by a
    /// backtracking clique search.
    fn has_clique(&self, cands: &[NodeId], n: usize) -> bool {
        if n <= 1 {
            return cands.len() >= n;
        }
        self.find_clique(cands, n).is_some()
    }

    /// `n` pairwise distinct candidates, if there are (backtracking clique search).
    fn find_clique(&self, cands: &[NodeId], n: usize) -> Option<Vec<NodeId>> {
        if cands.len() < n {
            return None;
        }
        fn grow(
            t: &Tableau,
            cands: &[NodeId],
            start: usize,
            chosen: &mut Vec<NodeId>,
            n: usize,
        ) -> bool {
            if chosen.len() == n {
                return true;
            }
            for i in start..cands.len() {
                if cands.len() - i < n - chosen.len() {
                    return false;
                }
                let y = cands[i];
                if chosen.iter().all(|&z| t.distinct(y, z).is_some()) {
                    chosen.push(y);
                    if grow(t, cands, i + 1, chosen, n) {
                        return true;
                    }
                    chosen.pop();
                }
            }
            false
        }
        let mut chosen = Vec::new();
        grow(self, cands, 0, &mut chosen, n).then_some(chosen)
    }

    fn successor(&mut self, x: NodeId, r: RoleId, f: ConceptId, dep: Dep) -> NodeId {
        let y = self.new_node(Some(x));
        self.add_edge(x, y, r, dep);
        self.add(y, f, dep);
        let u = self.prep.universal;
        self.add(y, u, Dep::EMPTY);
        y
    }

    /// The time or cancellation limit, when reached.
    fn limit_reached(&self) -> Option<Limit> {
        if let Some(dl) = self.limits.deadline
            && std::time::Instant::now() >= dl
        {
            return Some(Limit::Time);
        }
        if let Some(flag) = &self.limits.cancel
            && flag.load(std::sync::atomic::Ordering::Relaxed)
        {
            return Some(Limit::Cancelled);
        }
        None
    }

    fn search(&mut self) -> Outcome {
        loop {
            // Every step, and inside the long deterministic phase too: a step on a large
            // graph can take a second, so checking only every few steps let `--timeout`
            // overshoot.
            if let Some(l) = self.stopped.or_else(|| self.limit_reached()) {
                return Outcome::Unknown(l);
            }
            if self.stats.nodes > self.limits.max_nodes {
                return Outcome::Unknown(Limit::Nodes);
            }
            if let Some(d) = self.clash.take() {
                self.stats.clashes += 1;
                if !self.backtrack(d) {
                    return Outcome::Unsat;
                }
                continue;
            }
            self.expand_deterministic();
            if self.clash.is_some() || self.stopped.is_some() {
                continue;
            }
            self.check_data();
            if self.clash.is_some() {
                continue;
            }
            if !self.prep.keys.is_empty() && self.apply_keys() {
                continue;
            }
            if self.nondeterministic(&[]) {
                continue;
            }
            let blocked = self.blocked_all();
            if self.generate(&blocked) {
                continue;
            }
            if self.record {
                self.record_labels(&blocked);
            }
            if self.nominal_counting_at_risk() {
                return Outcome::Unknown(Limit::NominalCounting);
            }
            return Outcome::Sat(self.model());
        }
    }

    /// Whether the model read off the finished graph could break a root node's at-most
    /// restriction. Blocking unravels the graph: each blocked node stands for a copy of its
    /// blocker and of the blocker's successors, and a copied node with an edge to a root
    /// node (an individual or a nominal) that is not its parent adds a neighbour there that
    /// the ≤-rule never counted. With nominals in the TBox the NN-rule and the ≤o-rule
    /// ([`Tableau::nominal_at_most`]) leave no such neighbour in a finished graph, so this
    /// is a safety net: it answers "limit reached" rather than claim a model it cannot back.
    fn nominal_counting_at_risk(&self) -> bool {
        if self.blockers.is_empty() {
            return false;
        }
        let n = self.g.nodes.len();
        // Strict descendants of a blocker are the nodes that unravelling copies.
        let mut copied = vec![false; n];
        let mut is_blocker = vec![false; n];
        for &b in &self.blockers {
            is_blocker[b] = true;
        }
        for x in 0..n {
            if let Some(p) = self.g.nodes[x].parent {
                copied[x] = p < x && (copied[p] || is_blocker[p]);
            }
        }
        for o in 0..n {
            let node = &self.g.nodes[o];
            if !node.active || !node.is_root() || node.at_mosts.is_empty() {
                continue;
            }
            for &c in &node.at_mosts {
                let Concept::AtMost(_, s, f) = *self.concepts.get(c) else {
                    continue;
                };
                for (w, r, _) in self.neighbours(o) {
                    let copy = copied[w] || (is_blocker[w] && self.g.nodes[w].parent != Some(o));
                    if copy && self.prep.is_sub(r, s) && self.has(w, f).is_some() {
                        return true;
                    }
                }
            }
        }
        false
    }

    fn model(&self) -> Model {
        let mut m = Model::default();
        for i in 0..self.g.ind_node.len() {
            let n = self.ind(IndividualId(i as u32));
            m.labels.push(self.g.nodes[n].label.clone());
        }
        let mut owner: HashMap<NodeId, IndividualId> = HashMap::new();
        for i in 0..self.g.ind_node.len() {
            owner
                .entry(self.ind(IndividualId(i as u32)))
                .or_insert(IndividualId(i as u32));
        }
        for e in self.g.edges.iter() {
            if !e.active {
                continue;
            }
            if let (Some(&a), Some(&b)) = (owner.get(&e.a), owner.get(&e.b)) {
                for &(r, _) in &e.roles {
                    m.edges.push((r, a, b));
                }
            }
        }
        if let Some(q) = self.query_root {
            let q = self.find(q);
            m.root_label = self.g.nodes[q].label.clone();
        }
        m
    }
}

/// A hasher for keys that are already well mixed (see [`mix`]): it passes them through.
#[derive(Default)]
struct MixedKey(u64);

impl std::hash::Hasher for MixedKey {
    fn finish(&self) -> u64 {
        self.0
    }
    fn write(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.0 = self.0.rotate_left(8) ^ b as u64;
        }
    }
    fn write_u64(&mut self, v: u64) {
        self.0 = v;
    }
    fn write_usize(&mut self, v: usize) {
        self.0 = v as u64;
    }
}

fn mix(x: u64) -> u64 {
    // splitmix64 finaliser: an order-independent label hash is the sum of mixed ids.
    let mut z = x.wrapping_add(0x9E37_79B9_7F4A_7C15);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

#[cfg(test)]
#[path = "nn_rule_tests.rs"]
mod nn_rule_tests;

#[cfg(test)]
#[path = "disjoint_data_tests.rs"]
mod disjoint_data_tests;

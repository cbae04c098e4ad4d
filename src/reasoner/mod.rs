//! The tableau reasoner for SROIQ (with SHOIQ's nominal nodes and NN-rule) and data ranges
//! over the OWL 2 datatype map: consistency, satisfiability, subsumption, instance
//! checking, classification and models.
//!
//! Every answer is [`Answer::Yes`], [`Answer::No`] or [`Answer::Unknown`] with the limit that
//! stopped the search; the reasoner never guesses.

pub mod automata;
pub mod cache;
pub mod classify;
pub mod datavalues;
pub mod depset;
pub mod prepare;
pub mod tableau;

pub use classify::{Classification, classify, realise};
pub use prepare::{Prepared, Refusal};
pub use tableau::{Model, Outcome};

use crate::kb::{Axiom, ConceptId, ConceptStore, IndividualId, KnowledgeBase, RoleId};
use serde::Serialize;
use std::sync::Arc;
use std::sync::atomic::AtomicBool;
use std::time::Instant;

/// A limit that stopped a search.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Limit {
    /// The work budget of a search for data values (a node's data number restrictions, or
    /// the values of data keys across named individuals).
    DataValues,
    /// The time limit (`--timeout`).
    Time,
    /// The node limit of the completion graph.
    Nodes,
    /// The user cancelled.
    Cancelled,
    /// A model was found, but a nominal's at-most restriction counts nodes that blocking
    /// would copy and neither SHOIQ's NN-rule nor the ≤o-rule (Horrocks & Sattler 2007)
    /// settled them; the tableau does not claim satisfiability then. A safety net: with
    /// those rules in place no run is known to end here.
    NominalCounting,
}

impl std::fmt::Display for Limit {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(match self {
            Limit::DataValues => "work budget of the search for data values reached (data number restrictions or data keys over many values)",
            Limit::Time => "time limit reached",
            Limit::Nodes => "node limit of the completion graph reached",
            Limit::Cancelled => "cancelled",
            Limit::NominalCounting => "a number restriction on an individual counts blocked parts of the model that the NN-rule did not settle",
        })
    }
}

/// A three-valued answer.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Answer {
    /// Proven.
    Yes,
    /// Refuted.
    No,
    /// Not decided within the limit.
    Unknown(Limit),
}

/// Resource limits for every test.
#[derive(Clone, Debug)]
pub struct Limits {
    /// Absolute deadline.
    pub deadline: Option<Instant>,
    /// Largest number of nodes created in one test.
    pub max_nodes: usize,
    /// Set to true to cancel (the shell's Ctrl-C).
    pub cancel: Option<Arc<AtomicBool>>,
}

impl Default for Limits {
    fn default() -> Self {
        Limits {
            deadline: None,
            max_nodes: 1_000_000,
            cancel: None,
        }
    }
}

/// Counters of the work done.
#[derive(Clone, Copy, Debug, Default, Serialize)]
pub struct Stats {
    /// Tableau runs.
    pub tests: u64,
    /// Nodes created.
    pub nodes: usize,
    /// Label entries expanded.
    pub expansions: u64,
    /// Branching points opened.
    pub branches: u64,
    /// Branching points skipped by backjumping.
    pub backjumps: u64,
    /// Clashes met.
    pub clashes: u64,
    /// Nodes merged.
    pub merges: u64,
    /// Clashes and blocks answered by the satisfiability cache.
    pub cache_hits: u64,
}

impl Stats {
    fn add(&mut self, o: &Stats) {
        self.tests += o.tests;
        self.nodes += o.nodes;
        self.expansions += o.expansions;
        self.branches += o.branches;
        self.backjumps += o.backjumps;
        self.clashes += o.clashes;
        self.merges += o.merges;
        self.cache_hits += o.cache_hits;
    }
}

/// Assertions added for one test only (hypotheses, negated observations).
#[derive(Clone, Debug, Default)]
pub struct Extra {
    /// C(a).
    pub classes: Vec<(ConceptId, IndividualId)>,
    /// r(a, b).
    pub roles: Vec<(RoleId, IndividualId, IndividualId)>,
}

/// A reasoner over one knowledge base (or a selection of its axioms).
pub struct Reasoner<'kb> {
    kb: &'kb KnowledgeBase,
    concepts: ConceptStore,
    prep: Prepared,
    /// Limits applied to every test.
    pub limits: Limits,
    /// Work done so far.
    pub stats: Stats,
    consistent: Option<Answer>,
    cache: cache::SatCache,
    /// The ABox's completion graph when the consistency test never branched: concept tests
    /// that need the ABox start from it instead of expanding the ABox again.
    abox_base: Option<tableau::Graph>,
}

impl<'kb> Reasoner<'kb> {
    /// A reasoner over every axiom of the knowledge base.
    pub fn new(kb: &'kb KnowledgeBase) -> Result<Self, Refusal> {
        Self::with_axioms(kb, None, &[])
    }

    /// A reasoner over the axioms that `enabled` selects, plus `extra` axioms.
    pub fn with_axioms(
        kb: &'kb KnowledgeBase,
        enabled: Option<&[bool]>,
        extra: &[Axiom],
    ) -> Result<Self, Refusal> {
        let mut concepts = kb.concepts.clone();
        let prep = prepare::prepare(kb, &mut concepts, enabled, extra)?;
        Ok(Reasoner {
            kb,
            concepts,
            prep,
            limits: Limits::default(),
            stats: Stats::default(),
            consistent: None,
            cache: cache::SatCache::default(),
            abox_base: None,
        })
    }

    /// The knowledge base.
    pub fn kb(&self) -> &'kb KnowledgeBase {
        self.kb
    }

    /// The concept store, for building query concepts.
    pub fn concepts_mut(&mut self) -> &mut ConceptStore {
        &mut self.concepts
    }

    /// The concept store.
    pub fn concepts(&self) -> &ConceptStore {
        &self.concepts
    }

    /// The prepared axioms.
    pub fn prepared(&self) -> &Prepared {
        &self.prep
    }

    /// Runs one tableau test.
    pub fn run(&mut self, with_abox: bool, query: Option<ConceptId>, extra: &Extra) -> Outcome {
        self.run_keeping(with_abox, query, extra, false).0
    }

    /// Runs one tableau test; with `keep`, also returns the final graph when the run was
    /// deterministic. A concept test on the ABox starts from the stored ABox graph.
    fn run_keeping(
        &mut self,
        with_abox: bool,
        query: Option<ConceptId>,
        extra: &Extra,
        keep: bool,
    ) -> (Outcome, Option<tableau::Graph>) {
        let mut t = tableau::Tableau::new(
            &self.prep,
            &mut self.concepts,
            &self.kb.ranges,
            self.limits.clone(),
            &mut self.cache,
        );
        let plain = extra.classes.is_empty() && extra.roles.is_empty();
        let out = match (&self.abox_base, query) {
            (Some(base), Some(q)) if with_abox && plain => t.run_from(base, q),
            _ => t.run(with_abox, query, extra),
        };
        let graph = if keep && matches!(out, Outcome::Sat(_)) {
            t.deterministic_graph()
        } else {
            None
        };
        let mut s = t.stats;
        drop(t);
        // A concept test without extra assertions that fails proves the concept empty in
        // every model of the KB; later tests reuse that (see `cache`).
        if let (Outcome::Unsat, Some(q)) = (&out, query)
            && extra.classes.is_empty()
            && extra.roles.is_empty()
        {
            self.cache.record_unsat(q);
        }
        s.tests = 1;
        self.stats.add(&s);
        (out, graph)
    }

    /// Runs one test and reports whether it had to branch.
    pub fn run_counting(
        &mut self,
        with_abox: bool,
        query: Option<ConceptId>,
        extra: &Extra,
    ) -> (Outcome, bool) {
        let before = self.stats.branches;
        let out = self.run(with_abox, query, extra);
        (out, self.stats.branches > before)
    }

    /// Whether the knowledge base is consistent.
    pub fn is_consistent(&mut self) -> Answer {
        if let Some(a) = self.consistent {
            return a;
        }
        // The domain is never empty: with no individual, ⊤ itself must be satisfiable.
        let probe = if self.prep.n_individuals == 0 {
            Some(ConceptId::TOP)
        } else {
            None
        };
        let (out, graph) = self.run_keeping(true, probe, &Extra::default(), probe.is_none());
        self.abox_base = graph;
        let a = match out {
            Outcome::Sat(_) => Answer::Yes,
            Outcome::Unsat => Answer::No,
            Outcome::Unknown(l) => Answer::Unknown(l),
        };
        if !matches!(a, Answer::Unknown(_)) {
            self.consistent = Some(a);
        }
        a
    }

    /// Whether the KB with extra assertions is consistent; returns the model when it is.
    pub fn consistent_with(&mut self, extra: &Extra) -> (Answer, Option<Model>) {
        match self.run(true, None, extra) {
            Outcome::Sat(m) => (Answer::Yes, Some(m)),
            Outcome::Unsat => (Answer::No, None),
            Outcome::Unknown(l) => (Answer::Unknown(l), None),
        }
    }

    /// Whether concept C is satisfiable with respect to the KB (No when the KB is inconsistent).
    pub fn is_satisfiable(&mut self, c: ConceptId) -> Answer {
        self.satisfiable_model(c).0
    }

    /// Satisfiability of C with the model found and whether the test branched.
    pub fn satisfiable_model(&mut self, c: ConceptId) -> (Answer, Option<Model>, bool) {
        match self.is_consistent() {
            Answer::No => return (Answer::No, None, false),
            Answer::Unknown(l) => return (Answer::Unknown(l), None, true),
            Answer::Yes => {}
        }
        // Without nominals in the TBox, the ABox of a consistent KB does not affect concept
        // satisfiability (SHIQ has the disjoint-union model property), so tests skip it.
        if self.cache.is_unsat(c) {
            self.stats.cache_hits += 1;
            return (Answer::No, None, false);
        }
        // A question that names an individual ({a}, ∃r.{a}) needs the individuals' nodes too;
        // with them the test is no longer a pure concept test, so it records no labels.
        let with_abox = self.prep.tbox_nominals || mentions_nominal(&self.concepts, c);
        let (out, branched) = self.run_counting(with_abox, Some(c), &Extra::default());
        match out {
            Outcome::Sat(m) => (Answer::Yes, Some(m), branched),
            Outcome::Unsat => (Answer::No, None, branched),
            Outcome::Unknown(l) => (Answer::Unknown(l), None, branched),
        }
    }

    /// Whether the KB entails C ⊑ D.
    pub fn is_subsumed(&mut self, c: ConceptId, d: ConceptId) -> Answer {
        let nd = self.concepts.not(d);
        let q = self.concepts.and([c, nd]);
        negate(self.is_satisfiable(q))
    }

    /// Whether the KB entails C(a).
    pub fn entails_class_assertion(&mut self, c: ConceptId, a: IndividualId) -> Answer {
        let nc = self.concepts.not(c);
        let extra = Extra {
            classes: vec![(nc, a)],
            roles: vec![],
        };
        negate(self.consistent_with(&extra).0)
    }

    /// Whether the KB entails r(a, b).
    pub fn entails_role_assertion(
        &mut self,
        r: RoleId,
        a: IndividualId,
        b: IndividualId,
    ) -> Answer {
        // r(a, b) is entailed iff KB ∪ {(∀r.¬{b})(a)} is inconsistent.
        let nb = self.concepts.nominal(b);
        let nnb = self.concepts.not(nb);
        let all = self.concepts.all(r, nnb);
        let extra = Extra {
            classes: vec![(all, a)],
            roles: vec![],
        };
        negate(self.consistent_with(&extra).0)
    }
}

fn negate(a: Answer) -> Answer {
    match a {
        Answer::Yes => Answer::No,
        Answer::No => Answer::Yes,
        u => u,
    }
}

/// Whether a concept mentions a nominal anywhere inside it.
fn mentions_nominal(cs: &ConceptStore, c: ConceptId) -> bool {
    let mut stack = vec![c];
    while let Some(x) = stack.pop() {
        match cs.get(x) {
            crate::kb::Concept::Nominal(_) | crate::kb::Concept::NotNominal(_) => return true,
            _ => stack.extend_from_slice(cs.children(x)),
        }
    }
    false
}

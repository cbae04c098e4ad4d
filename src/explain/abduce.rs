//! ABox abduction: every minimal set of abducible assertions that, with the knowledge base,
//! entails the observations.
//!
//! Breadth-first hitting-set tree over abducibles with model reuse (Reiter 1987;
//! Pukancová & Homola 2017): each node E that does not yet entail the observations is
//! labelled by a model of KB ∪ E ∪ {¬o}; an explanation extending E must contain an abducible
//! false in that model, so only those become children. Nodes are pruned when KB ∪ E is
//! inconsistent, when E alone entails the observations (irrelevant), and when they contain a
//! smaller explanation (non-minimal).

use super::assertion::Assertion;
use super::justify::{all_justifications, quickxplain};
use crate::kb::{Concept, KnowledgeBase, RoleId};
use crate::reasoner::{Answer, Extra, Limit, Limits, Model, Reasoner, Refusal};
use serde::Serialize;
use std::collections::{BTreeSet, VecDeque};

/// An abduction problem over one knowledge base.
#[derive(Clone, Debug)]
pub struct Problem {
    /// The knowledge base: ontology axioms, the case's background assertions and (disabled)
    /// observation axioms.
    pub kb: KnowledgeBase,
    /// Per axiom of `kb`: whether it belongs to KB ∪ background.
    pub background: Vec<bool>,
    /// Per axiom of `kb`: its degree in [0, 1] (1 for crisp axioms).
    pub degrees: Vec<f64>,
    /// The observations O.
    pub observations: Vec<Assertion>,
    /// The abducible assertions.
    pub abducibles: Vec<Assertion>,
}

/// Search options.
#[derive(Clone, Debug)]
pub struct ExplainOptions {
    /// Largest explanation size searched.
    pub max_size: usize,
    /// The α-cut applied to graded background assertions.
    pub alpha: f64,
    /// Reasoner limits (the deadline covers the whole search).
    pub limits: Limits,
    /// Largest number of hitting-set tree nodes.
    pub max_tree_nodes: usize,
    /// Compute a justification for each explanation.
    pub justify: bool,
}

impl Default for ExplainOptions {
    fn default() -> Self {
        ExplainOptions {
            max_size: 3,
            alpha: 0.5,
            limits: Limits::default(),
            max_tree_nodes: 100_000,
            justify: true,
        }
    }
}

/// One explanation with its ranking numbers.
#[derive(Clone, Debug, Serialize)]
pub struct Explanation {
    /// The hypotheses, sorted by their text.
    #[serde(skip)]
    pub assertions: Vec<Assertion>,
    /// Their functional-syntax text, sorted.
    pub texts: Vec<String>,
    /// Number of assertions.
    pub size: usize,
    /// Σ ln(prior) + ln(degree): higher is better.
    pub score: f64,
    /// The largest α whose cut of the case, with the explanation, entails the observations.
    pub degree: f64,
    /// Axioms (indices into the KB) that, with the hypotheses, entail the observations.
    pub justification: Vec<usize>,
}

/// Counters of the search.
#[derive(Clone, Copy, Debug, Default, Serialize)]
pub struct SearchStats {
    /// Tableau tests run.
    pub reasoner_calls: u64,
    /// Hitting-set tree nodes opened.
    pub tree_nodes: u64,
}

/// What the search found.
#[derive(Clone, Debug, Default, Serialize)]
pub struct ExplainResult {
    /// Whether KB ∪ background (after suspending `suspended`) is consistent.
    pub kb_consistent: bool,
    /// Whether the KB alone entails every observation.
    pub already_entailed: bool,
    /// Whether every candidate up to the size bound was decided.
    pub complete: bool,
    /// The limit that stopped the search, if any.
    pub limit: Option<Limit>,
    /// Ranked explanations.
    pub explanations: Vec<Explanation>,
    /// The observations the explanations account for.
    #[serde(skip)]
    pub explained: Vec<Assertion>,
    /// Observations that no explanation up to the bound accounts for.
    #[serde(skip)]
    pub unexplained: Vec<Assertion>,
    /// A minimal conflicting set of axioms when the KB is inconsistent (indices).
    pub conflict: Vec<usize>,
    /// Normal-anatomy defaults suspended to restore consistency (indices), with the conflict
    /// each took part in.
    pub suspended: Vec<usize>,
    /// The conflicts that made the suspension necessary.
    pub suspended_conflicts: Vec<Vec<usize>>,
    /// Work done.
    pub stats: SearchStats,
}

/// The annotation that marks a normal-anatomy default.
pub fn is_default(kb: &KnowledgeBase, axiom: usize) -> bool {
    let src = &kb.sources[kb.axioms[axiom].source];
    src.annotations.iter().any(|(p, v)| {
        p == &format!("{}normalAnatomyDefault", super::WF) && (v == "true" || v == "1")
    })
}

/// The prior of an abducible from our `wf:prior` annotation (1 when absent).
pub fn prior(kb: &KnowledgeBase, a: &Assertion) -> f64 {
    let iri = match *a {
        Assertion::Class(c, _) => match kb.concepts.get(c) {
            Concept::Atom(x) => kb.vocab.class_iri(*x).to_string(),
            _ => return 1.0,
        },
        Assertion::Role(r, _, _) => kb.vocab.prop_iri(r.prop()).to_string(),
    };
    kb.annotation(&iri, &format!("{}prior", super::WF))
        .first()
        .and_then(|v| v.value.trim().parse::<f64>().ok())
        .filter(|p| *p > 0.0 && *p <= 1.0)
        .unwrap_or(1.0)
}

struct Ctx<'a> {
    problem: &'a Problem,
    opts: &'a ExplainOptions,
    stats: SearchStats,
}

impl Ctx<'_> {
    fn mask(&self, alpha: f64, suspended: &[usize]) -> Vec<bool> {
        (0..self.problem.kb.axioms.len())
            .map(|i| {
                self.problem.background[i]
                    && self.problem.degrees[i] >= alpha
                    && !suspended.contains(&i)
            })
            .collect()
    }

    fn reasoner<'k>(&self, kb: &'k KnowledgeBase, mask: &[bool]) -> Result<Reasoner<'k>, Refusal> {
        let mut r = Reasoner::with_axioms(kb, Some(mask), &[])?;
        r.limits = self.opts.limits.clone();
        Ok(r)
    }

    fn consistent(
        &mut self,
        r: &mut Reasoner,
        e: &[Assertion],
    ) -> Result<(bool, Option<Model>), Limit> {
        let mut extra = Extra::default();
        for a in e {
            a.add_to(&mut extra);
        }
        self.stats.reasoner_calls += 1;
        match r.consistent_with(&extra) {
            (Answer::Yes, m) => Ok((true, m)),
            (Answer::No, _) => Ok((false, None)),
            (Answer::Unknown(l), _) => Err(l),
        }
    }

    /// A model of KB ∪ E ∪ {¬o} for the first observation o not entailed, or None when
    /// KB ∪ E entails every observation.
    fn countermodel(
        &mut self,
        r: &mut Reasoner,
        e: &[Assertion],
        obs: &[Assertion],
    ) -> Result<Option<(Model, usize)>, Limit> {
        for (k, o) in obs.iter().enumerate() {
            let mut extra = Extra::default();
            for a in e {
                a.add_to(&mut extra);
            }
            o.add_negation_to(r.concepts_mut(), &mut extra);
            self.stats.reasoner_calls += 1;
            match r.consistent_with(&extra) {
                (Answer::Yes, m) => return Ok(Some((m.unwrap_or_default(), k))),
                (Answer::No, _) => {}
                (Answer::Unknown(l), _) => return Err(l),
            }
        }
        Ok(None)
    }

    fn entails(
        &mut self,
        r: &mut Reasoner,
        e: &[Assertion],
        obs: &[Assertion],
    ) -> Result<bool, Limit> {
        Ok(self.countermodel(r, e, obs)?.is_none())
    }
}

/// Whether an abducible holds in a model read off a completion graph (atoms hold exactly
/// when in the label; other assertions are treated as not holding, which only costs work).
fn holds(m: &Model, r: &Reasoner, a: &Assertion) -> bool {
    match *a {
        Assertion::Class(c, i) => {
            let Some(label) = m.labels.get(i.index()) else {
                return false;
            };
            match r.concepts().get(c) {
                Concept::NotAtom(x) => {
                    let atom = r.concepts().find(&Concept::Atom(*x));
                    atom.is_none_or(|at| !label.contains(&at))
                }
                _ => label.contains(&c),
            }
        }
        Assertion::Role(role, x, y) => m.edges.iter().any(|&(s, a, b)| {
            (a == x && b == y && r.prepared().is_sub(s, role))
                || (a == y && b == x && r.prepared().is_sub(s.inverse(), role))
        }),
    }
}

/// Solves an abduction problem.
pub fn explain(problem: &Problem, opts: &ExplainOptions) -> Result<ExplainResult, Refusal> {
    let mut ctx = Ctx {
        problem,
        opts,
        stats: SearchStats::default(),
    };
    let mut out = ExplainResult {
        complete: true,
        ..Default::default()
    };
    match run(&mut ctx, &mut out) {
        Ok(()) => {}
        Err(Stop::Refused(r)) => return Err(r),
        Err(Stop::Limit(l)) => {
            out.complete = false;
            out.limit = Some(l);
        }
    }
    out.stats = ctx.stats;
    Ok(out)
}

enum Stop {
    Refused(Refusal),
    Limit(Limit),
}

impl From<Limit> for Stop {
    fn from(l: Limit) -> Self {
        Stop::Limit(l)
    }
}

impl From<Refusal> for Stop {
    fn from(r: Refusal) -> Self {
        Stop::Refused(r)
    }
}

fn run(ctx: &mut Ctx, out: &mut ExplainResult) -> Result<(), Stop> {
    let kb = &ctx.problem.kb;
    let alpha = ctx.opts.alpha;
    let mut suspended: Vec<usize> = Vec::new();
    let mut mask = ctx.mask(alpha, &suspended);
    let mut r = ctx.reasoner(kb, &mask)?;
    let (consistent, _) = ctx.consistent(&mut r, &[])?;
    if !consistent {
        // Suspend a minimal set of normal-anatomy defaults (consistency-based diagnosis).
        let enabled: Vec<usize> = (0..mask.len()).filter(|&i| mask[i]).collect();
        let defaults: Vec<usize> = enabled
            .iter()
            .copied()
            .filter(|&i| is_default(kb, i))
            .collect();
        match diagnose(ctx, &mask, &defaults)? {
            Some((d, conflicts)) if !d.is_empty() => {
                suspended = d;
                out.suspended = suspended.clone();
                // Each conflict in full: the defaults with the case's other axioms.
                let mut full = Vec::new();
                for c in conflicts {
                    let mut m = ctx.mask(alpha, &suspended);
                    for &i in &c {
                        m[i] = true;
                    }
                    let conflict = conflict_of(ctx, &m)?;
                    if !full.contains(&conflict) {
                        full.push(conflict);
                    }
                }
                out.suspended_conflicts = full;
                mask = ctx.mask(alpha, &suspended);
                r = ctx.reasoner(kb, &mask)?;
            }
            _ => {
                out.kb_consistent = false;
                out.conflict = conflict_of(ctx, &mask)?;
                out.unexplained = ctx.problem.observations.clone();
                return Ok(());
            }
        }
    }
    out.kb_consistent = true;
    let obs = ctx.problem.observations.clone();
    if ctx.entails(&mut r, &[], &obs)? {
        out.already_entailed = true;
        out.explained = obs;
        return Ok(());
    }
    let mut found = search(ctx, &mut r, &obs)?;
    let mut explained = obs.clone();
    if found.0.is_empty() && obs.len() > 1 {
        // No explanation of all: keep the observations that can be explained one by one.
        let mut ok = Vec::new();
        for o in &obs {
            let single = vec![*o];
            if ctx.entails(&mut r, &[], &single)? || !search(ctx, &mut r, &single)?.0.is_empty() {
                ok.push(*o);
            }
        }
        if !ok.is_empty() && ok.len() < obs.len() {
            found = search(ctx, &mut r, &ok)?;
            explained = ok;
        }
    }
    let (sets, complete) = found;
    out.complete &= complete;
    if sets.is_empty() {
        out.unexplained = obs.clone();
        explained.clear();
    } else {
        out.unexplained = obs
            .iter()
            .copied()
            .filter(|o| !explained.contains(o))
            .collect();
    }
    out.explained = explained.clone();
    // Rank.
    let mut levels: Vec<f64> = (0..kb.axioms.len())
        .filter(|&i| {
            ctx.problem.background[i]
                && ctx.problem.degrees[i] > alpha
                && ctx.problem.degrees[i] < 1.0
        })
        .map(|i| ctx.problem.degrees[i])
        .collect();
    levels.push(1.0);
    levels.sort_by(|a, b| a.partial_cmp(b).unwrap_or(std::cmp::Ordering::Equal));
    levels.dedup();
    for set in sets {
        let e: Vec<Assertion> = set.iter().map(|&i| ctx.problem.abducibles[i]).collect();
        // The largest level whose cut still entails (entailment shrinks as α grows).
        let (mut lo, mut hi) = (0usize, levels.len());
        let mut degree = alpha;
        while lo < hi {
            let mid = (lo + hi) / 2;
            let m = ctx.mask(levels[mid], &suspended);
            let mut rm = ctx.reasoner(kb, &m)?;
            if ctx.entails(&mut rm, &e, &explained)? {
                degree = levels[mid];
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        let score =
            e.iter().map(|a| prior(kb, a).ln()).sum::<f64>() + degree.max(f64::MIN_POSITIVE).ln();
        let justification = if ctx.opts.justify {
            justify_explanation(ctx, &mask, &e, &explained)?
        } else {
            Vec::new()
        };
        let mut texts: Vec<String> = e.iter().map(|a| a.text(kb, r.concepts())).collect();
        let mut pairs: Vec<(String, Assertion)> =
            texts.iter().cloned().zip(e.iter().copied()).collect();
        pairs.sort_by(|a, b| a.0.cmp(&b.0));
        texts.sort();
        out.explanations.push(Explanation {
            assertions: pairs.into_iter().map(|p| p.1).collect(),
            texts,
            size: e.len(),
            score: round6(score),
            degree: round6(degree),
            justification,
        });
    }
    out.explanations.sort_by(|a, b| {
        b.score
            .partial_cmp(&a.score)
            .unwrap_or(std::cmp::Ordering::Equal)
            .then(a.size.cmp(&b.size))
            .then(a.texts.cmp(&b.texts))
    });
    Ok(())
}

fn round6(x: f64) -> f64 {
    let y = (x * 1e6).round() / 1e6;
    if y == 0.0 { 0.0 } else { y }
}

/// The hitting-set search; returns the explanations (abducible indices) and completeness.
fn search(
    ctx: &mut Ctx,
    r: &mut Reasoner,
    obs: &[Assertion],
) -> Result<(Vec<Vec<usize>>, bool), Stop> {
    let abd = ctx.problem.abducibles.clone();
    let kb = &ctx.problem.kb;
    // An empty KB, for the relevance test (E alone must not entail O).
    let none = vec![false; kb.axioms.len()];
    let mut empty = ctx.reasoner(kb, &none)?;
    let mut found: Vec<Vec<usize>> = Vec::new();
    let mut visited: BTreeSet<Vec<usize>> = BTreeSet::new();
    let mut queue: VecDeque<Vec<usize>> = VecDeque::new();
    queue.push_back(Vec::new());
    let component = components(r, &abd);
    // Lower-bound pruning. When unconnected parts of the ABox are independent (no TBox
    // nominals), an observation that the KB alone does not entail stays unexplained until
    // the set holds an abducible about its part; so a set needs at least one more abducible
    // for each such part, and children that cannot fit within `max_size` are dropped.
    let mut needy: Vec<usize> = Vec::new();
    if !component.is_empty() {
        for o in obs {
            if !ctx.entails(r, &[], std::slice::from_ref(o))?
                && let Some(&c) = component.get(&o.individuals()[0])
            {
                needy.push(c);
            }
        }
        needy.sort_unstable();
        needy.dedup();
    }
    let parts_of = |i: usize| -> Vec<usize> {
        abd[i]
            .individuals()
            .iter()
            .filter_map(|x| component.get(x).copied())
            .collect()
    };
    let abd_parts: Vec<Vec<usize>> = (0..abd.len()).map(parts_of).collect();
    let lower_bound = |set: &[usize]| -> usize {
        needy
            .iter()
            .filter(|c| !set.iter().any(|&i| abd_parts[i].contains(c)))
            .count()
    };
    while let Some(set) = queue.pop_front() {
        if !visited.insert(set.clone()) {
            continue;
        }
        if found
            .iter()
            .any(|f| f.iter().all(|x| set.binary_search(x).is_ok()))
        {
            continue;
        }
        ctx.stats.tree_nodes += 1;
        if ctx.stats.tree_nodes as usize > ctx.opts.max_tree_nodes {
            return Err(Stop::Limit(Limit::Nodes));
        }
        let e: Vec<Assertion> = set.iter().map(|&i| abd[i]).collect();
        if !set.is_empty() {
            let (ok, _) = ctx.consistent(r, &e)?;
            if !ok {
                continue;
            }
            if ctx.entails(&mut empty, &e, obs)? {
                continue;
            }
        }
        match ctx.countermodel(r, &e, obs)? {
            None => {
                if !set.is_empty() {
                    found.push(set);
                }
            }
            Some((m, k)) => {
                if set.len() >= ctx.opts.max_size {
                    continue;
                }
                let comp = component.get(&obs[k].individuals()[0]).copied();
                for (i, a) in abd.iter().enumerate() {
                    if set.contains(&i) || holds(&m, r, a) {
                        continue;
                    }
                    // An assertion about individuals unconnected to the failing observation's
                    // cannot help entail it (SHIQ without TBox nominals keeps unconnected
                    // parts of the ABox independent); it could only make KB ∪ E
                    // inconsistent, and such sets are pruned anyway.
                    if let Some(c) = comp
                        && a.individuals().iter().all(|x| component.get(x) != Some(&c))
                    {
                        continue;
                    }
                    let mut child = set.clone();
                    child.push(i);
                    child.sort_unstable();
                    if child.len() + lower_bound(&child) > ctx.opts.max_size {
                        continue;
                    }
                    if !visited.contains(&child) {
                        queue.push_back(child);
                    }
                }
            }
        }
    }
    Ok((found, true))
}

/// Connected components of the individuals through role assertions, equalities and role
/// abducibles; empty (no pruning) when the TBox has nominals, which connect everything.
fn components(
    r: &Reasoner,
    abd: &[Assertion],
) -> std::collections::HashMap<crate::kb::IndividualId, usize> {
    let p = r.prepared();
    let mut out = std::collections::HashMap::new();
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
        out.insert(crate::kb::IndividualId(i as u32), c);
    }
    out
}

/// One minimal set of enabled axioms that, with E, entails the observations (QuickXplain).
fn justify_explanation(
    ctx: &mut Ctx,
    mask: &[bool],
    e: &[Assertion],
    obs: &[Assertion],
) -> Result<Vec<usize>, Stop> {
    let kb = &ctx.problem.kb;
    let items: Vec<usize> = (0..mask.len()).filter(|&i| mask[i]).collect();
    let mut refused = None;
    let mut test = |s: &[usize]| -> Result<bool, Limit> {
        let mut m = vec![false; mask.len()];
        for &i in s {
            m[i] = true;
        }
        let mut rr = match ctx.reasoner(kb, &m) {
            Ok(r) => r,
            Err(x) => {
                refused = Some(x);
                return Ok(true);
            }
        };
        ctx.entails(&mut rr, e, obs)
    };
    let j = quickxplain(&items, &mut test)?;
    if let Some(x) = refused {
        return Err(Stop::Refused(x));
    }
    Ok(j.unwrap_or_default())
}

/// One minimal set of enabled axioms that is inconsistent.
fn conflict_of(ctx: &mut Ctx, mask: &[bool]) -> Result<Vec<usize>, Stop> {
    let kb = &ctx.problem.kb;
    let items: Vec<usize> = (0..mask.len()).filter(|&i| mask[i]).collect();
    let mut test = |s: &[usize]| -> Result<bool, Limit> {
        let mut m = vec![false; mask.len()];
        for &i in s {
            m[i] = true;
        }
        let Ok(mut rr) = ctx.reasoner(kb, &m) else {
            return Ok(true);
        };
        Ok(!ctx.consistent(&mut rr, &[])?.0)
    };
    Ok(quickxplain(&items, &mut test)?.unwrap_or_default())
}

/// Defaults to suspend, and the minimal conflicts among the defaults that they resolve.
type Diagnosis = (Vec<usize>, Vec<Vec<usize>>);

/// Consistency-based diagnosis (Reiter 1987) over the normal-anatomy defaults: the minimal
/// conflicts (sets of defaults inconsistent with the rest of the case), then their minimal
/// hitting sets; the smallest diagnosis is chosen, the first in axiom order among equals.
/// `None` when the rest is inconsistent without any default. Returns the diagnosis and the
/// conflicts it resolves.
fn diagnose(ctx: &mut Ctx, mask: &[bool], defaults: &[usize]) -> Result<Option<Diagnosis>, Stop> {
    let kb = &ctx.problem.kb;
    let mut base = mask.to_vec();
    for &d in defaults {
        base[d] = false;
    }
    let positions: Vec<usize> = (0..defaults.len()).collect();
    let mut test = |s: &[usize]| -> Result<bool, Limit> {
        let mut m = base.clone();
        for &i in s {
            m[defaults[i]] = true;
        }
        let Ok(mut rr) = ctx.reasoner(kb, &m) else {
            return Ok(true);
        };
        Ok(!ctx.consistent(&mut rr, &[])?.0)
    };
    if test(&[])? {
        return Ok(None);
    }
    let (conflicts, complete) = all_justifications(&positions, &mut test, 2_000)?;
    if !complete {
        return Err(Stop::Limit(Limit::Nodes));
    }
    let diagnoses = super::justify::minimal_hitting_sets(&conflicts);
    let Some(best) = diagnoses
        .iter()
        .min_by(|a, b| a.len().cmp(&b.len()).then(a.cmp(b)))
    else {
        return Ok(None);
    };
    let map = |v: &[usize]| -> Vec<usize> { v.iter().map(|&i| defaults[i]).collect() };
    Ok(Some((
        map(best),
        conflicts.iter().map(|c| map(c)).collect(),
    )))
}

/// Abducibles from our annotations: hypothesis classes for the finding individuals, and
/// hypothesis properties from a finding individual to any individual.
pub fn annotated_abducibles(
    kb: &mut KnowledgeBase,
    findings: &[crate::kb::IndividualId],
    individuals: &[crate::kb::IndividualId],
) -> Vec<Assertion> {
    let key = format!("{}hypothesis", super::WF);
    let yes = |kb: &KnowledgeBase, iri: &str| {
        kb.annotation(iri, &key)
            .iter()
            .any(|v| v.value == "true" || v.value == "1")
    };
    let mut out = Vec::new();
    let mut findings = findings.to_vec();
    findings.sort();
    findings.dedup();
    for c in 0..kb.vocab.classes.len() {
        let cid = crate::kb::ClassId(c as u32);
        if yes(kb, &kb.vocab.classes[c].clone()) {
            let k = kb.concepts.atom(cid);
            out.extend(findings.iter().map(|&a| Assertion::Class(k, a)));
        }
    }
    for p in 0..kb.vocab.props.len() {
        if yes(kb, &kb.vocab.props[p].clone()) {
            let r = RoleId::named(crate::kb::PropId(p as u32));
            for &a in &findings {
                for &b in individuals {
                    out.push(Assertion::Role(r, a, b));
                }
            }
        }
    }
    out.sort();
    out.dedup();
    out
}

//! ABox abduction: every minimal set of abducible assertions that, with the knowledge base,
//! entails the observations.
//!
//! The problem, the options, the result and its ranking live here; the searches in their
//! own files: `search` (the grown hitting-set tree, the default), `reference` (the plain
//! hitting-set tree, the yardstick in tests), `relevance` (which abducibles can matter),
//! `bound` (limits and the memory budget). Both searches are anytime: a limit stops them
//! cleanly and the explanations found so far, smallest first, are ranked and reported as
//! incomplete.

mod bound;
mod reference;
mod relevance;
mod search;

pub use bound::SearchLimit;

use super::assertion::Assertion;
use super::justify::{all_justifications, quickxplain};
use crate::kb::{Concept, KnowledgeBase, RoleId};
use crate::reasoner::{Answer, Extra, Limit, Limits, Model, Reasoner, Refusal};
use serde::Serialize;

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
    /// Memory budget of the search's own sets, in bytes (the reasoner's graphs are bounded
    /// by `limits.max_nodes`).
    pub max_memory: usize,
    /// Compute a justification for each explanation (up to `max_justified` of them).
    pub justify: bool,
    /// How many of the best-ranked explanations get a justification.
    pub max_justified: usize,
    /// Which search to run.
    pub strategy: Strategy,
}

/// The search algorithm; both return the same explanations.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum Strategy {
    /// Hitting-set tree labelled by grown countermodels over the relevant abducibles.
    #[default]
    Grown,
    /// Hitting-set tree labelled by the tableau's first countermodel over every abducible
    /// (the earlier search, kept as the reference in tests).
    Reference,
}

impl Default for ExplainOptions {
    fn default() -> Self {
        ExplainOptions {
            max_size: 3,
            alpha: 0.5,
            limits: Limits::default(),
            max_tree_nodes: 100_000,
            max_memory: 512 << 20,
            justify: true,
            max_justified: 256,
            strategy: Strategy::Grown,
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
    pub limit: Option<SearchLimit>,
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
    Limit(SearchLimit),
}

impl From<Limit> for Stop {
    fn from(l: Limit) -> Self {
        Stop::Limit(l.into())
    }
}

impl From<SearchLimit> for Stop {
    fn from(l: SearchLimit) -> Self {
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
    let (mut sets, mut stop) = find(ctx, &mut r, &mask, &obs)?;
    let mut explained = obs.clone();
    if sets.is_empty() && stop.is_none() && obs.len() > 1 {
        // No explanation of all: keep the observations that can be explained one by one.
        let mut ok = Vec::new();
        for o in &obs {
            let single = vec![*o];
            if ctx.entails(&mut r, &[], &single)? {
                ok.push(*o);
                continue;
            }
            let (one, st) = find(ctx, &mut r, &mask, &single)?;
            if !one.is_empty() {
                ok.push(*o);
            }
            if st.is_some() {
                stop = st;
                break;
            }
        }
        if stop.is_none() && !ok.is_empty() && ok.len() < obs.len() {
            (sets, stop) = find(ctx, &mut r, &mask, &ok)?;
            explained = ok;
        }
    }
    if let Some(l) = stop {
        out.complete = false;
        out.limit = Some(l);
    }
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
        // A cut that keeps the same axioms as the search's needs no test. After a limit,
        // a test that cannot finish leaves the degree at the last level proven (a lower
        // bound) and the justification empty.
        let (mut lo, mut hi) = (0usize, levels.len());
        let mut degree = alpha;
        while lo < hi {
            let mid = (lo + hi) / 2;
            let m = ctx.mask(levels[mid], &suspended);
            let entailed = if m == mask {
                true
            } else {
                let mut rm = ctx.reasoner(kb, &m)?;
                match ctx.entails(&mut rm, &e, &explained) {
                    Ok(b) => b,
                    Err(l) => {
                        out.limit.get_or_insert(l.into());
                        break;
                    }
                }
            };
            if entailed {
                degree = levels[mid];
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        let score =
            e.iter().map(|a| prior(kb, a).ln()).sum::<f64>() + degree.max(f64::MIN_POSITIVE).ln();
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
            justification: Vec::new(),
        });
    }
    out.explanations.sort_by(|a, b| {
        b.score
            .partial_cmp(&a.score)
            .unwrap_or(std::cmp::Ordering::Equal)
            .then(a.size.cmp(&b.size))
            .then(a.texts.cmp(&b.texts))
    });
    // Justifications for the best-ranked explanations: QuickXplain costs a reasoner per
    // test, and past a few hundred explanations nobody reads them all.
    if ctx.opts.justify {
        for x in out.explanations.iter_mut().take(ctx.opts.max_justified) {
            if out.limit.is_some() {
                break;
            }
            match justify_explanation(ctx, &mask, &x.assertions, &explained) {
                Ok(j) => x.justification = j,
                Err(Stop::Limit(l)) => out.limit = Some(l),
                Err(e) => return Err(e),
            }
        }
    }
    Ok(())
}

/// Runs the chosen search; a limit ends it with the explanations found so far.
fn find(
    ctx: &mut Ctx,
    r: &mut Reasoner,
    mask: &[bool],
    obs: &[Assertion],
) -> Result<(Vec<Vec<usize>>, Option<SearchLimit>), Stop> {
    let mut found = Vec::new();
    let done = match ctx.opts.strategy {
        Strategy::Grown => search::search(ctx, r, mask, obs, &mut found),
        Strategy::Reference => reference::search(ctx, r, obs, &mut found),
    };
    match done {
        Ok(()) => Ok((found, None)),
        Err(Stop::Limit(l)) => Ok((found, Some(l))),
        Err(x) => Err(x),
    }
}

fn round6(x: f64) -> f64 {
    let y = (x * 1e6).round() / 1e6;
    if y == 0.0 { 0.0 } else { y }
}

/// One minimal set of enabled axioms that, with E, entails the observations (QuickXplain).
fn justify_explanation(
    ctx: &mut Ctx,
    mask: &[bool],
    e: &[Assertion],
    obs: &[Assertion],
) -> Result<Vec<usize>, Stop> {
    let kb = &ctx.problem.kb;
    // QuickXplain returns the preferred minimal subset for the item order (Junker 2004);
    // the ⊥-module of sig(E ∪ O) holds every justification, so searching it finds the same
    // one with far fewer tests. Should the module not entail (it always should), the whole
    // KB is searched.
    let mut seed = e.to_vec();
    seed.extend_from_slice(obs);
    let module = relevance::bottom_module(kb, mask, &seed);
    let all: Vec<usize> = (0..mask.len()).filter(|&i| mask[i]).collect();
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
    let mut j = quickxplain(&module, &mut test)?;
    if j.is_none() && module.len() < all.len() {
        j = quickxplain(&all, &mut test)?;
    }
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
        return Err(Stop::Limit(SearchLimit::TreeNodes));
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

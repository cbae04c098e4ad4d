//! The grown hitting-set search: Reiter's tree (1987) over the relevant abducibles, whose
//! node labels are the complements of *maximal* countermodels.
//!
//! A node E that does not entail the observations has a model of KB ∪ E ∪ {¬o}; every
//! explanation extending E holds an abducible false in it, so those abducibles are E's
//! children (Pukancová & Homola 2017). The first model the tableau returns makes few
//! abducibles true, so almost every abducible becomes a child and the tree opens most
//! candidate sets. Here the model is grown first: abducibles are added to E ∪ {¬o} in
//! halves, as long as the KB stays consistent with them (the dual of QuickXplain, Junker
//! 2004, which yields a maximal satisfiable subset; its complement is a minimal correction
//! set, Liffiton & Sakallah 2008). The label is then close to a minimal conflict: in the
//! benchmark shapes it holds just the abducibles that entail the failing observation.
//! Grown models are cached, and a node whose set holds in a cached countermodel takes that
//! label with no reasoner call (Reiter's label reuse; model reuse as in MHS-MXP, Homola et
//! al. 2023). Supersets of explanations and of inconsistent sets are pruned before any
//! call, and only abducibles of the observations' ⊤-locality module are searched
//! (`relevance`). Breadth-first order returns the explanations smallest first.

use super::super::assertion::Assertion;
use super::bound::{Budget, set_bytes};
use super::relevance::{Parts, relevant_abducibles};
use super::{Ctx, Stop};
use crate::kb::{Concept, ConceptId};
use crate::reasoner::{Answer, Extra, Model, Reasoner};
use std::collections::{HashSet, VecDeque};

/// Whether an abducible holds in a model read off a completion graph (atoms hold exactly
/// when in the label; other assertions are treated as not holding, which only costs work).
pub fn holds(m: &Model, r: &Reasoner, a: &Assertion) -> bool {
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

/// A set of positions (of relevant abducibles) as a bitset.
#[derive(Clone, Debug)]
struct Bits(Vec<u64>);

impl Bits {
    fn new(n: usize) -> Self {
        Bits(vec![0; n.div_ceil(64)])
    }
    fn insert(&mut self, i: usize) {
        self.0[i / 64] |= 1 << (i % 64);
    }
    fn has(&self, i: usize) -> bool {
        (self.0[i / 64] >> (i % 64)) & 1 == 1
    }
    fn holds_all(&self, set: &[usize]) -> bool {
        set.iter().all(|&i| self.has(i))
    }
    fn count(&self) -> usize {
        self.0.iter().map(|w| w.count_ones() as usize).sum()
    }
    fn items(&self) -> impl Iterator<Item = usize> + '_ {
        (0..self.0.len() * 64).filter(|&i| self.has(i))
    }
}

/// A countermodel met by the search: the relevant abducibles true in it (a set T with
/// KB ∪ T ∪ {¬o} consistent, so every subset of T is consistent with the KB and fails to
/// entail o), and the observation o it falsifies.
struct Seen {
    holds: Bits,
    falsifies: usize,
    size: usize,
}

/// Sets (sorted positions) whose supersets are pruned, indexed by their smallest element.
struct Family {
    by_min: Vec<Vec<Vec<usize>>>,
}

impl Family {
    fn new(n: usize) -> Self {
        Family {
            by_min: vec![Vec::new(); n],
        }
    }
    fn add(&mut self, set: Vec<usize>) {
        if let Some(&m) = set.first() {
            self.by_min[m].push(set);
        }
    }
    /// Whether some member is a subset of `set`.
    fn below(&self, set: &[usize]) -> bool {
        set.iter().any(|&x| {
            self.by_min[x]
                .iter()
                .any(|f| f.iter().all(|y| set.binary_search(y).is_ok()))
        })
    }
}

/// The relevant abducibles and how to read them off models.
struct Pool {
    abd: Vec<Assertion>,
    index: Vec<usize>,
    /// Per position: for a negated atom ¬A, the concept A (read as absent from the label).
    negated: Vec<Option<ConceptId>>,
}

impl Pool {
    /// The positions true in a model (labels sorted once, then binary search).
    fn true_in(&self, m: &Model, r: &Reasoner, into: &mut Bits) {
        let mut sorted: Vec<Option<Vec<ConceptId>>> = vec![None; m.labels.len()];
        for (p, a) in self.abd.iter().enumerate() {
            let yes = match *a {
                Assertion::Class(c, i) => {
                    let Some(label) = m.labels.get(i.index()) else {
                        continue;
                    };
                    let s = sorted[i.index()].get_or_insert_with(|| {
                        let mut v = label.clone();
                        v.sort_unstable();
                        v
                    });
                    match self.negated[p] {
                        Some(atom) => s.binary_search(&atom).is_err(),
                        None if matches!(r.concepts().get(c), Concept::NotAtom(_)) => true,
                        None => s.binary_search(&c).is_ok(),
                    }
                }
                Assertion::Role(..) => holds(m, r, a),
            };
            if yes {
                into.insert(p);
            }
        }
    }

    fn assertions(&self, set: impl IntoIterator<Item = usize>) -> Vec<Assertion> {
        set.into_iter().map(|p| self.abd[p]).collect()
    }
}

/// Whether E alone (no KB axiom) entails every observation. For atomic assertions this is
/// plain membership (E is consistent with the KB, hence free of A(a), ¬A(a) pairs);
/// otherwise the empty-KB reasoner decides.
fn alone_entails<'a>(
    ctx: &mut Ctx<'a>,
    empty: &mut Option<Reasoner<'a>>,
    e: &[Assertion],
    obs: &[Assertion],
) -> Result<bool, Stop> {
    let cs = &ctx.problem.kb.concepts;
    let atomic = |a: &Assertion| match *a {
        Assertion::Class(c, _) => matches!(cs.get(c), Concept::Atom(_) | Concept::NotAtom(_)),
        Assertion::Role(..) => false,
    };
    if e.iter().all(atomic) && obs.iter().all(atomic) {
        return Ok(obs.iter().all(|o| e.contains(o)));
    }
    if empty.is_none() {
        let problem: &'a super::Problem = ctx.problem;
        let none = vec![false; problem.kb.axioms.len()];
        *empty = Some(ctx.reasoner(&problem.kb, &none)?);
    }
    let r = empty.as_mut().expect("built above");
    Ok(ctx.entails(r, e, obs)?)
}

/// Adds abducibles (`cands`, positions) to the countermodel `t` of observation `k` in
/// halves, keeping those with which KB ∪ T ∪ {¬o_k} stays consistent: afterwards no
/// remaining candidate can be added on its own.
#[allow(clippy::too_many_arguments)]
fn grow(
    ctx: &mut Ctx,
    r: &mut Reasoner,
    pool: &Pool,
    obs: &[Assertion],
    t: &mut Bits,
    k: usize,
    cands: Vec<usize>,
) -> Result<(), Stop> {
    let mut stack = vec![cands];
    while let Some(chunk) = stack.pop() {
        let chunk: Vec<usize> = chunk.into_iter().filter(|&p| !t.has(p)).collect();
        if chunk.is_empty() {
            continue;
        }
        let mut extra = Extra::default();
        for a in pool.assertions(t.items().chain(chunk.iter().copied())) {
            a.add_to(&mut extra);
        }
        obs[k].add_negation_to(r.concepts_mut(), &mut extra);
        ctx.stats.reasoner_calls += 1;
        match r.consistent_with(&extra) {
            (Answer::Yes, m) => {
                for &p in &chunk {
                    t.insert(p);
                }
                if let Some(m) = m {
                    pool.true_in(&m, r, t);
                }
            }
            (Answer::No, _) => {
                if chunk.len() > 1 {
                    let (a, b) = chunk.split_at(chunk.len() / 2);
                    stack.push(b.to_vec());
                    stack.push(a.to_vec());
                }
            }
            (Answer::Unknown(l), _) => return Err(l.into()),
        }
    }
    Ok(())
}

/// Adds to `found` every explanation of `obs` up to the size bound, smallest first (an
/// `Err` leaves those found so far). Same answers as `reference::search`.
pub fn search(
    ctx: &mut Ctx,
    r: &mut Reasoner,
    mask: &[bool],
    obs: &[Assertion],
    found: &mut Vec<Vec<usize>>,
) -> Result<(), Stop> {
    let all = ctx.problem.abducibles.clone();
    let max_size = ctx.opts.max_size;
    let mut budget = Budget::new(
        ctx.opts.max_tree_nodes,
        ctx.opts.max_memory,
        &ctx.opts.limits,
    );
    let mut parts = Parts::new(r, &all);
    let mut rel = relevant_abducibles(&ctx.problem.kb, mask, obs, &all);
    if parts.known() {
        let mut needy = Vec::new();
        for o in obs {
            if !ctx.entails(r, &[], std::slice::from_ref(o))? {
                needy.push(*o);
            }
        }
        parts.set_needy(&needy);
        // An abducible about no observation's part of the ABox can be left out of any
        // explanation (the parts are independent), so no minimal one holds it.
        let obs_parts: Vec<Option<usize>> = obs.iter().map(|o| parts.of(o)).collect();
        rel.retain(|&i| obs_parts.iter().any(|&c| parts.touches(i, c)));
    }
    // No explanation holds an abducible inconsistent with the KB: one test of all of them,
    // and only when that fails, one test each.
    let together: Vec<Assertion> = rel.iter().map(|&i| all[i]).collect();
    if !rel.is_empty() && !ctx.consistent(r, &together)?.0 {
        let mut keep = Vec::new();
        for &i in &rel {
            budget.node(ctx.stats.tree_nodes)?;
            if ctx.consistent(r, &[all[i]])?.0 {
                keep.push(i);
            }
        }
        rel = keep;
    }
    let negated = rel
        .iter()
        .map(|&i| match all[i] {
            Assertion::Class(c, _) => match ctx.problem.kb.concepts.get(c) {
                Concept::NotAtom(x) => r.concepts().find(&Concept::Atom(*x)),
                _ => None,
            },
            Assertion::Role(..) => None,
        })
        .collect();
    let pool = Pool {
        abd: rel.iter().map(|&i| all[i]).collect(),
        index: rel,
        negated,
    };
    let n = pool.abd.len();
    let mut empty: Option<Reasoner> = None;
    let mut seen: Vec<Seen> = Vec::new();
    let mut explanations = Family::new(n);
    let mut nogoods = Family::new(n);
    let mut visited: HashSet<Vec<usize>> = HashSet::new();
    let mut queue: VecDeque<Vec<usize>> = VecDeque::new();
    queue.push_back(Vec::new());
    visited.insert(Vec::new());
    budget.charge(2 * set_bytes(0))?;
    while let Some(set) = queue.pop_front() {
        if explanations.below(&set) || nogoods.below(&set) {
            continue;
        }
        ctx.stats.tree_nodes += 1;
        budget.node(ctx.stats.tree_nodes)?;
        // A cached countermodel in which the whole set holds: the set is consistent, does
        // not entail its observation, and the model's complement is a valid label.
        let cached = seen
            .iter()
            .filter(|s| s.holds.holds_all(&set))
            .max_by_key(|s| s.size);
        let (t, k) = match cached {
            Some(s) => (s.holds.clone(), s.falsifies),
            None => {
                let e = pool.assertions(set.iter().copied());
                match ctx.countermodel(r, &e, obs)? {
                    None => {
                        // KB ∪ E entails O: an explanation unless inconsistent or E alone
                        // entails O (single abducibles are consistent, tested above).
                        let consistent = set.len() <= 1
                            || seen.iter().any(|s| s.holds.holds_all(&set))
                            || ctx.consistent(r, &e)?.0;
                        if !consistent {
                            budget.charge(set_bytes(set.len()))?;
                            nogoods.add(set);
                        } else if !set.is_empty() && !alone_entails(ctx, &mut empty, &e, obs)? {
                            budget.charge(set_bytes(set.len()))?;
                            found.push(set.iter().map(|&p| pool.index[p]).collect());
                            explanations.add(set);
                        }
                        continue;
                    }
                    Some((m, k)) => {
                        let mut t = Bits::new(n);
                        for &p in &set {
                            t.insert(p);
                        }
                        pool.true_in(&m, r, &mut t);
                        if set.len() < max_size {
                            let comp = parts.known().then(|| parts.of(&obs[k])).flatten();
                            let cands: Vec<usize> = (0..n)
                                .filter(|&p| !t.has(p) && parts.touches(pool.index[p], comp))
                                .collect();
                            grow(ctx, r, &pool, obs, &mut t, k, cands)?;
                        }
                        budget.charge(n / 8 + 64)?;
                        let size = t.count();
                        seen.push(Seen {
                            holds: t.clone(),
                            falsifies: k,
                            size,
                        });
                        (t, k)
                    }
                }
            }
        };
        if set.len() >= max_size {
            continue;
        }
        let comp = parts.known().then(|| parts.of(&obs[k])).flatten();
        for p in 0..n {
            if t.has(p) || !parts.touches(pool.index[p], comp) {
                continue;
            }
            let mut child = set.clone();
            let at = child.partition_point(|&x| x < p);
            child.insert(at, p);
            let ids: Vec<usize> = child.iter().map(|&q| pool.index[q]).collect();
            if child.len() + parts.lower_bound(&ids) > max_size
                || explanations.below(&child)
                || nogoods.below(&child)
                || visited.contains(&child)
            {
                continue;
            }
            budget.charge(2 * set_bytes(child.len()))?;
            visited.insert(child.clone());
            queue.push_back(child);
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn family_finds_subsets_by_their_smallest_element() {
        // Hand-derived: {1, 4} lies inside {0, 1, 4} and {1, 3, 4}, not inside {1, 3}.
        let mut f = Family::new(6);
        f.add(vec![1, 4]);
        f.add(vec![2]);
        assert!(f.below(&[0, 1, 4]));
        assert!(f.below(&[1, 3, 4]));
        assert!(!f.below(&[1, 3]));
        assert!(f.below(&[2, 5]));
        assert!(!f.below(&[0, 3, 5]));
    }

    #[test]
    fn bits_hold_sets_across_words() {
        let mut b = Bits::new(130);
        for i in [0, 63, 64, 129] {
            b.insert(i);
        }
        assert_eq!(b.count(), 4);
        assert!(b.holds_all(&[0, 64, 129]));
        assert!(!b.holds_all(&[0, 65]));
        assert_eq!(b.items().collect::<Vec<_>>(), vec![0, 63, 64, 129]);
    }
}

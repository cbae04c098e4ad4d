//! The reference search: breadth-first hitting-set tree over every abducible, each node
//! labelled by the first model of KB ∪ E ∪ {¬o} that the tableau returns (Reiter 1987;
//! Pukancová & Homola 2017). Complete and simple, but its labels are large, so it opens a
//! large share of the candidate sets; kept as the yardstick the grown search is tested
//! against (`Strategy::Reference`).

use super::super::assertion::Assertion;
use super::bound::{Budget, set_bytes};
use super::relevance::Parts;
use super::search::holds;
use super::{Ctx, Stop};
use crate::reasoner::Reasoner;
use std::collections::{BTreeSet, VecDeque};

/// Adds to `found` every explanation of `obs` up to the size bound, smallest first (an
/// `Err` leaves those found so far).
pub fn search(
    ctx: &mut Ctx,
    r: &mut Reasoner,
    obs: &[Assertion],
    found: &mut Vec<Vec<usize>>,
) -> Result<(), Stop> {
    let abd = ctx.problem.abducibles.clone();
    let kb = &ctx.problem.kb;
    // An empty KB, for the relevance test (E alone must not entail O).
    let none = vec![false; kb.axioms.len()];
    let mut empty = ctx.reasoner(kb, &none)?;
    let mut budget = Budget::new(
        ctx.opts.max_tree_nodes,
        ctx.opts.max_memory,
        &ctx.opts.limits,
    );
    let mut visited: BTreeSet<Vec<usize>> = BTreeSet::new();
    let mut queue: VecDeque<Vec<usize>> = VecDeque::new();
    queue.push_back(Vec::new());
    let mut parts = Parts::new(r, &abd);
    if parts.known() {
        let mut needy = Vec::new();
        for o in obs {
            if !ctx.entails(r, &[], std::slice::from_ref(o))? {
                needy.push(*o);
            }
        }
        parts.set_needy(&needy);
    }
    while let Some(set) = queue.pop_front() {
        if !visited.insert(set.clone()) {
            budget.release(set_bytes(set.len()));
            continue;
        }
        if found
            .iter()
            .any(|f| f.iter().all(|x| set.binary_search(x).is_ok()))
        {
            continue;
        }
        ctx.stats.tree_nodes += 1;
        budget.node(ctx.stats.tree_nodes)?;
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
                let comp = if parts.known() {
                    parts.of(&obs[k])
                } else {
                    None
                };
                for (i, a) in abd.iter().enumerate() {
                    if set.contains(&i) || holds(&m, r, a) {
                        continue;
                    }
                    // An assertion about individuals unconnected to the failing observation's
                    // cannot help entail it (SHIQ without TBox nominals keeps unconnected
                    // parts of the ABox independent); it could only make KB ∪ E
                    // inconsistent, and such sets are pruned anyway.
                    if !parts.touches(i, comp) {
                        continue;
                    }
                    let mut child = set.clone();
                    child.push(i);
                    child.sort_unstable();
                    if child.len() + parts.lower_bound(&child) > ctx.opts.max_size {
                        continue;
                    }
                    if !visited.contains(&child) {
                        budget.charge(2 * set_bytes(child.len()))?;
                        queue.push_back(child);
                    }
                }
            }
        }
    }
    Ok(())
}

//! Minimal subsets by black-box search: QuickXplain (Junker 2004) finds one, MergeXplain
//! (Shchekotykhin, Jannach & Schmitz 2015) finds several in one pass, Reiter's
//! hitting-set tree (Reiter 1987, with the Greiner, Smith & Wilkerson 1989 correction handled
//! by closing only on supersets of closed paths) finds all (Kalyanpur et al. 2007).

use crate::reasoner::Limit;
use std::collections::BTreeSet;

/// A test on a subset of items: does the subset (with the fixed background) have the property?
pub type Test<'a> = dyn FnMut(&[usize]) -> Result<bool, Limit> + 'a;

/// One minimal subset of `items` that has the property, or `None` when `items` lacks it.
/// The property must be monotone: supersets of a set with the property have it.
pub fn quickxplain(items: &[usize], test: &mut Test) -> Result<Option<Vec<usize>>, Limit> {
    if !test(items)? {
        return Ok(None);
    }
    if test(&[])? {
        return Ok(Some(Vec::new()));
    }
    let mut out = qx(&[], false, items, test)?;
    out.sort_unstable();
    Ok(Some(out))
}

fn qx(
    background: &[usize],
    delta: bool,
    cands: &[usize],
    test: &mut Test,
) -> Result<Vec<usize>, Limit> {
    if delta && test(background)? {
        return Ok(Vec::new());
    }
    if cands.len() <= 1 {
        return Ok(cands.to_vec());
    }
    let (c1, c2) = cands.split_at(cands.len() / 2);
    let b1: Vec<usize> = background.iter().chain(c1).copied().collect();
    let d2 = qx(&b1, !c1.is_empty(), c2, test)?;
    let b2: Vec<usize> = background.iter().chain(&d2).copied().collect();
    let d1 = qx(&b2, !d2.is_empty(), c1, test)?;
    Ok(d1.into_iter().chain(d2).collect())
}

/// Several minimal subsets of `items` with the (monotone) property, found in one divide-and-
/// conquer pass (MergeXplain, Shchekotykhin, Jannach & Schmitz, IJCAI 2015): each half is
/// searched on its own, and conflicts that need both halves are extracted with QuickXplain
/// until the halves' remainders no longer have the property. Empty when `items` lacks it;
/// `[[]]` when the empty set has it. Not necessarily all of them: see `all_justifications`.
pub fn mergexplain(items: &[usize], test: &mut Test) -> Result<Vec<Vec<usize>>, Limit> {
    if !test(items)? {
        return Ok(Vec::new());
    }
    if test(&[])? {
        return Ok(vec![Vec::new()]);
    }
    let (_, found) = find_conflicts(&[], items, test)?;
    Ok(sorted(found))
}

/// MergeXplain's FindConflicts: returns the part of `cands` left without the property
/// (together with `background`) and the minimal subsets found on the way.
fn find_conflicts(
    background: &[usize],
    cands: &[usize],
    test: &mut Test,
) -> Result<(Vec<usize>, Vec<Vec<usize>>), Limit> {
    let with: Vec<usize> = background.iter().chain(cands).copied().collect();
    if !test(&with)? {
        return Ok((cands.to_vec(), Vec::new()));
    }
    if cands.len() == 1 {
        return Ok((Vec::new(), vec![cands.to_vec()]));
    }
    let (c1, c2) = cands.split_at(cands.len() / 2);
    let (mut left, mut found) = find_conflicts(background, c1, test)?;
    let (right, more) = find_conflicts(background, c2, test)?;
    found.extend(more);
    loop {
        let all: Vec<usize> = background
            .iter()
            .chain(&left)
            .chain(&right)
            .copied()
            .collect();
        if left.is_empty() || !test(&all)? {
            break;
        }
        // A subset that needs items from both halves: its left part first, then its right.
        let b_right: Vec<usize> = background.iter().chain(&right).copied().collect();
        let x = qx(&b_right, !right.is_empty(), &left, test)?;
        let b_x: Vec<usize> = background.iter().chain(&x).copied().collect();
        let y = qx(&b_x, !x.is_empty(), &right, test)?;
        let Some(&first) = x.first() else {
            break;
        };
        left.retain(|&i| i != first);
        let mut gamma: Vec<usize> = x.into_iter().chain(y).collect();
        gamma.sort_unstable();
        if !found.contains(&gamma) {
            found.push(gamma);
        }
    }
    left.extend(right);
    Ok((left, found))
}

/// Every minimal subset of `items` with the (monotone) property, by a hitting-set tree over
/// removed items. Stops after `max_nodes` tree nodes; the flag says whether it finished.
pub fn all_justifications(
    items: &[usize],
    test: &mut Test,
    max_nodes: usize,
) -> Result<(Vec<Vec<usize>>, bool), Limit> {
    let mut found: Vec<Vec<usize>> = Vec::new();
    let mut visited: BTreeSet<Vec<usize>> = BTreeSet::new();
    let mut closed: Vec<Vec<usize>> = Vec::new();
    let mut queue: std::collections::VecDeque<Vec<usize>> = std::collections::VecDeque::new();
    queue.push_back(Vec::new());
    let mut nodes = 0usize;
    while let Some(removed) = queue.pop_front() {
        if !visited.insert(removed.clone()) {
            continue;
        }
        if closed
            .iter()
            .any(|c| c.iter().all(|x| removed.binary_search(x).is_ok()))
        {
            continue;
        }
        nodes += 1;
        if nodes > max_nodes {
            return Ok((sorted(found), false));
        }
        // Reuse a justification disjoint from the path when there is one.
        let label = match found
            .iter()
            .find(|j| j.iter().all(|x| removed.binary_search(x).is_err()))
        {
            Some(j) => Some(j.clone()),
            None => {
                let rest: Vec<usize> = items
                    .iter()
                    .copied()
                    .filter(|x| removed.binary_search(x).is_err())
                    .collect();
                // MergeXplain yields several subsets per call; the tree's later nodes reuse them.
                let js = mergexplain(&rest, test)?;
                for j in &js {
                    if !found.contains(j) {
                        found.push(j.clone());
                    }
                }
                js.into_iter().next()
            }
        };
        match label {
            None => closed.push(removed),
            Some(j) => {
                for x in j {
                    let mut child = removed.clone();
                    child.push(x);
                    child.sort_unstable();
                    queue.push_back(child);
                }
            }
        }
    }
    Ok((sorted(found), true))
}

fn sorted(mut v: Vec<Vec<usize>>) -> Vec<Vec<usize>> {
    for j in v.iter_mut() {
        j.sort_unstable();
    }
    v.sort_by(|a, b| a.len().cmp(&b.len()).then(a.cmp(b)));
    v
}

/// All minimal hitting sets of a family of sets, by Reiter's tree (for diagnosis and tests).
pub fn minimal_hitting_sets(family: &[Vec<usize>]) -> Vec<Vec<usize>> {
    let universe: Vec<usize> = family
        .iter()
        .flatten()
        .copied()
        .collect::<BTreeSet<_>>()
        .into_iter()
        .collect();
    // A set of items "has the property" when it hits every member of the family; the
    // minimal such sets are the minimal hitting sets, found by the same tree.
    let mut test = |s: &[usize]| -> Result<bool, Limit> {
        Ok(family.iter().all(|f| f.iter().any(|x| s.contains(x))))
    };
    all_justifications(&universe, &mut test, usize::MAX)
        .map(|(v, _)| v)
        .unwrap_or_default()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reiters_family() {
        // Reiter (1987), §4: the family {2,4,5},{1,2,3},{1,3,5},{2,4,6},{2,4},{2,3,5},{1,6} has
        // the minimal hitting sets {1,2},{1,3,4},{1,4,5},{2,3,6},{2,5,6},{3,4,6}.
        let fam = vec![
            vec![2, 4, 5],
            vec![1, 2, 3],
            vec![1, 3, 5],
            vec![2, 4, 6],
            vec![2, 4],
            vec![2, 3, 5],
            vec![1, 6],
        ];
        let mut hs = minimal_hitting_sets(&fam);
        hs.sort();
        assert_eq!(
            hs,
            vec![
                vec![1, 2],
                vec![1, 3, 4],
                vec![1, 4, 5],
                vec![2, 3, 6],
                vec![2, 5, 6],
                vec![3, 4, 6]
            ]
        );
    }

    #[test]
    fn greiner_family() {
        // Greiner, Smith & Wilkerson (1989): {a,b},{b,c},{a,c},{b,d},{b} has exactly the
        // minimal hitting sets {a,b} and {b,c} (a=0, b=1, c=2, d=3).
        let fam = vec![vec![0, 1], vec![1, 2], vec![0, 2], vec![1, 3], vec![1]];
        let mut hs = minimal_hitting_sets(&fam);
        hs.sort();
        assert_eq!(hs, vec![vec![0, 1], vec![1, 2]]);
    }

    #[test]
    fn quickxplain_finds_a_minimal_subset() {
        // Property: the set contains 3 and 7 (its unique minimal subset is {3, 7}).
        let mut t = |s: &[usize]| -> Result<bool, Limit> { Ok(s.contains(&3) && s.contains(&7)) };
        let items: Vec<usize> = (0..10).collect();
        assert_eq!(quickxplain(&items, &mut t).unwrap(), Some(vec![3, 7]));
    }

    /// The test "S contains one of these sets" over items 1..=7, counting its calls.
    fn family_test(
        family: &[Vec<usize>],
        calls: &mut usize,
    ) -> impl FnMut(&[usize]) -> Result<bool, Limit> {
        move |s: &[usize]| {
            *calls += 1;
            Ok(family.iter().any(|f| f.iter().all(|x| s.contains(x))))
        }
    }

    #[test]
    fn mergexplain_finds_minimal_conflicts_in_one_pass() {
        // Schlobach & Cornet (IJCAI 2003), the MIPS of their example TBox: {1,2},{3,4,5},{4,7}.
        let mips = vec![vec![1, 2], vec![3, 4, 5], vec![4, 7]];
        let items: Vec<usize> = (1..=7).collect();
        let mut calls = 0;
        let found = mergexplain(&items, &mut family_test(&mips, &mut calls)).unwrap();
        assert!(!found.is_empty());
        for f in &found {
            assert!(mips.contains(f), "{f:?} is not a minimal conflict");
        }
        // The halves {1,2,3} and {4,5,6,7} hold {1,2} and {4,7}; MergeXplain returns both
        // in one pass (Shchekotykhin et al. 2015, the point of the method), and {3,4,5}
        // across the halves as well.
        assert!(found.contains(&vec![1, 2]) && found.contains(&vec![4, 7]));
        let mut calls = 0;
        assert!(
            mergexplain(&[3, 5, 6], &mut family_test(&mips, &mut calls))
                .unwrap()
                .is_empty()
        );
    }

    #[test]
    fn all_justifications_with_mergexplain_finds_every_mips() {
        // Schlobach & Cornet (IJCAI 2003): MIPS = {{1,2},{3,4,5},{4,7}}.
        let mips = vec![vec![1, 2], vec![3, 4, 5], vec![4, 7]];
        let items: Vec<usize> = (1..=7).collect();
        let mut calls = 0;
        let (all, complete) =
            all_justifications(&items, &mut family_test(&mips, &mut calls), 1_000).unwrap();
        assert!(complete);
        assert_eq!(all, vec![vec![1, 2], vec![4, 7], vec![3, 4, 5]]);
    }
}

//! Deterministic finite automata over Unicode code points, with transitions labelled by
//! code-point ranges: the exact representation of string-valued data ranges.
//!
//! Regular languages are closed under union, intersection and complement, and pattern and
//! length facets are regular, so every combination of string facets is one automaton. Each
//! automaton is total (every state covers all code points, a dead state absorbs the rest)
//! so that complement is a flip of the accepting states; products are the classical
//! construction (Rabin & Scott 1959), and Moore's partition refinement (1956) minimises and
//! numbers the states canonically, which gives equal languages equal representations.

use std::collections::{BTreeMap, HashMap, VecDeque};

/// The largest code point.
pub const MAX_CHAR: u32 = 0x10FFFF;
/// Largest automaton built before giving up (a pattern or length bound too large).
pub const MAX_STATES: usize = 20_000;

/// A set of code points: sorted, disjoint, non-adjacent inclusive ranges.
pub type Class = Vec<(u32, u32)>;

/// Sorts and merges ranges.
pub fn class_norm(mut c: Class) -> Class {
    c.sort_unstable();
    let mut out: Class = Vec::with_capacity(c.len());
    for (a, b) in c {
        match out.last_mut() {
            Some(l) if a <= l.1.saturating_add(1) => l.1 = l.1.max(b),
            _ => out.push((a, b)),
        }
    }
    out
}

/// The code points not in `c`.
pub fn class_not(c: &Class) -> Class {
    let mut out = Vec::new();
    let mut next = 0u32;
    for &(a, b) in c {
        if a > next {
            out.push((next, a - 1));
        }
        next = b.saturating_add(1);
        if b == MAX_CHAR {
            return out;
        }
    }
    out.push((next, MAX_CHAR));
    out
}

/// Code points in both.
pub fn class_and(a: &Class, b: &Class) -> Class {
    class_not(&class_norm(
        class_not(a).into_iter().chain(class_not(b)).collect(),
    ))
}

/// A transition: code points `lo..=hi` lead to a state.
pub type Edge = (u32, u32, u32);

/// A total DFA; state 0 is the start.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct Dfa {
    /// Per state: ranges covering 0..=MAX_CHAR in order, each with its target.
    pub trans: Vec<Vec<(u32, u32, u32)>>,
    /// Per state: whether it accepts.
    pub accept: Vec<bool>,
}

impl Dfa {
    /// The empty language.
    pub fn nothing() -> Dfa {
        Dfa {
            trans: vec![vec![(0, MAX_CHAR, 0)]],
            accept: vec![false],
        }
    }

    /// Whether this is the one-state automaton of the empty language (a cheap test).
    pub fn is_nothing(&self) -> bool {
        self.accept.len() == 1 && !self.accept[0]
    }

    /// All words over the characters of `c` whose length lies in `min..=max`
    /// (`max = None`: unbounded). Errors when the bound needs too many states.
    pub fn lengths(c: &Class, min: u64, max: Option<u64>) -> Result<Dfa, String> {
        let top = max.unwrap_or(min);
        if top as usize >= MAX_STATES || max.is_some_and(|m| m < min) {
            if max.is_some_and(|m| m < min) {
                return Ok(Dfa::nothing());
            }
            return Err(format!(
                "a length bound of {top} is too large for the string automata (limit {MAX_STATES})"
            ));
        }
        let top = top as u32;
        let dead = top + 1;
        let mut d = Dfa {
            trans: Vec::new(),
            accept: Vec::new(),
        };
        for i in 0..=top {
            let next = if i < top {
                i + 1
            } else if max.is_none() {
                i
            } else {
                dead
            };
            d.trans.push(labelled(c, next, dead));
            d.accept.push(u64::from(i) >= min);
        }
        d.trans.push(vec![(0, MAX_CHAR, dead)]);
        d.accept.push(false);
        Ok(d.minimise())
    }

    /// One word.
    pub fn word(w: &[u32]) -> Dfa {
        let n = w.len() as u32;
        let dead = n + 1;
        let mut d = Dfa {
            trans: Vec::new(),
            accept: Vec::new(),
        };
        for (i, &ch) in w.iter().enumerate() {
            d.trans.push(labelled(&vec![(ch, ch)], i as u32 + 1, dead));
            d.accept.push(false);
        }
        d.trans.push(vec![(0, MAX_CHAR, dead)]);
        d.accept.push(true);
        d.trans.push(vec![(0, MAX_CHAR, dead)]);
        d.accept.push(false);
        d.minimise()
    }

    /// The language `self` followed by nothing or by `sep` and a word of `tail`, for a
    /// `self` that never reads `sep` (used for a string and its language tag).
    pub fn then_tagged(&self, sep: u32, tail: &Dfa, untagged: bool) -> Dfa {
        let n = self.trans.len() as u32;
        let mut d = Dfa {
            trans: Vec::new(),
            accept: Vec::new(),
        };
        // The dead state of the tail part serves as a sink for both parts.
        let sink = n + tail.trans.len() as u32;
        for (s, tr) in self.trans.iter().enumerate() {
            let to = if self.accept[s] { n } else { sink };
            let mut t: Vec<(u32, u32, u32)> = Vec::new();
            for &(a, b, x) in tr {
                for (lo, hi) in split_out(a, b, sep) {
                    t.push((lo, hi, x));
                }
                if a <= sep && sep <= b {
                    t.push((sep, sep, to));
                }
            }
            t.sort_unstable();
            d.trans.push(t);
            d.accept.push(untagged && self.accept[s]);
        }
        for (s, tr) in tail.trans.iter().enumerate() {
            d.trans
                .push(tr.iter().map(|&(a, b, x)| (a, b, x + n)).collect());
            d.accept.push(tail.accept[s]);
        }
        d.trans.push(vec![(0, MAX_CHAR, sink)]);
        d.accept.push(false);
        d.minimise()
    }

    /// The complement (every word not accepted).
    pub fn complement(&self) -> Dfa {
        let mut d = self.clone();
        for a in d.accept.iter_mut() {
            *a = !*a;
        }
        d
    }

    /// Intersection.
    pub fn and(&self, o: &Dfa) -> Dfa {
        self.product(o, |a, b| a && b)
    }

    /// Union.
    pub fn or(&self, o: &Dfa) -> Dfa {
        self.product(o, |a, b| a || b)
    }

    fn product(&self, o: &Dfa, f: fn(bool, bool) -> bool) -> Dfa {
        let mut ids: HashMap<(u32, u32), u32> = HashMap::new();
        let mut queue = VecDeque::new();
        let mut d = Dfa {
            trans: Vec::new(),
            accept: Vec::new(),
        };
        ids.insert((0, 0), 0);
        queue.push_back((0u32, 0u32));
        d.trans.push(Vec::new());
        d.accept.push(f(self.accept[0], o.accept[0]));
        while let Some((p, q)) = queue.pop_front() {
            let me = ids[&(p, q)];
            let (ta, tb) = (&self.trans[p as usize], &o.trans[q as usize]);
            let (mut i, mut j) = (0, 0);
            let mut out = Vec::new();
            while i < ta.len() && j < tb.len() {
                let (a0, a1, x) = ta[i];
                let (b0, b1, y) = tb[j];
                let (lo, hi) = (a0.max(b0), a1.min(b1));
                let key = (x, y);
                let t = match ids.get(&key) {
                    Some(&t) => t,
                    None => {
                        let t = d.trans.len() as u32;
                        ids.insert(key, t);
                        d.trans.push(Vec::new());
                        d.accept
                            .push(f(self.accept[x as usize], o.accept[y as usize]));
                        queue.push_back(key);
                        t
                    }
                };
                out.push((lo, hi, t));
                if a1 < b1 {
                    i += 1
                } else if b1 < a1 {
                    j += 1
                } else {
                    i += 1;
                    j += 1
                }
            }
            d.trans[me as usize] = merge_adjacent(out);
        }
        d.minimise()
    }

    /// Moore's minimisation followed by a breadth-first renumbering, so that equal
    /// languages give equal automata. Unreachable states are dropped.
    pub fn minimise(&self) -> Dfa {
        let reach = self.reachable();
        let mut class: Vec<u32> = self.accept.iter().map(|&a| a as u32).collect();
        let mut count = 0usize;
        loop {
            let mut sigs: HashMap<(u32, Vec<Edge>), u32> = HashMap::new();
            let mut next = vec![0u32; self.trans.len()];
            for s in 0..self.trans.len() {
                if !reach[s] {
                    continue;
                }
                let tr = merge_adjacent(
                    self.trans[s]
                        .iter()
                        .map(|&(a, b, t)| (a, b, class[t as usize]))
                        .collect(),
                );
                let n = sigs.len() as u32;
                next[s] = *sigs.entry((class[s], tr)).or_insert(n);
            }
            let stable = sigs.len() == count;
            count = sigs.len();
            class = next;
            if stable {
                break;
            }
        }
        // Canonical numbering: breadth first from the start, transitions in range order.
        let mut order: HashMap<u32, u32> = HashMap::new();
        let mut reps: Vec<usize> = Vec::new();
        let mut rep_of: HashMap<u32, usize> = HashMap::new();
        for s in 0..self.trans.len() {
            if reach[s] {
                rep_of.entry(class[s]).or_insert(s);
            }
        }
        let mut queue = VecDeque::new();
        order.insert(class[0], 0);
        reps.push(0);
        queue.push_back(class[0]);
        while let Some(c) = queue.pop_front() {
            let s = rep_of[&c];
            for &(_, _, t) in &self.trans[s] {
                let tc = class[t as usize];
                if let std::collections::hash_map::Entry::Vacant(e) = order.entry(tc) {
                    e.insert(reps.len() as u32);
                    reps.push(rep_of[&tc]);
                    queue.push_back(tc);
                }
            }
        }
        let mut d = Dfa {
            trans: Vec::with_capacity(reps.len()),
            accept: Vec::with_capacity(reps.len()),
        };
        for &s in &reps {
            d.trans.push(merge_adjacent(
                self.trans[s]
                    .iter()
                    .map(|&(a, b, t)| (a, b, order[&class[t as usize]]))
                    .collect(),
            ));
            d.accept.push(self.accept[s]);
        }
        d
    }

    fn reachable(&self) -> Vec<bool> {
        let mut seen = vec![false; self.trans.len()];
        let mut stack = vec![0usize];
        seen[0] = true;
        while let Some(s) = stack.pop() {
            for &(_, _, t) in &self.trans[s] {
                if !seen[t as usize] {
                    seen[t as usize] = true;
                    stack.push(t as usize);
                }
            }
        }
        seen
    }

    /// States from which an accepting state is reachable.
    fn useful(&self) -> Vec<bool> {
        let n = self.trans.len();
        let mut useful = self.accept.clone();
        let mut changed = true;
        while changed {
            changed = false;
            for s in 0..n {
                if !useful[s] && self.trans[s].iter().any(|&(_, _, t)| useful[t as usize]) {
                    useful[s] = true;
                    changed = true;
                }
            }
        }
        useful
    }

    /// Whether no word is accepted.
    pub fn is_empty(&self) -> bool {
        let r = self.reachable();
        !self.accept.iter().zip(r).any(|(&a, r)| a && r)
    }

    /// Whether the word is accepted.
    pub fn contains(&self, w: &[u32]) -> bool {
        let mut s = 0usize;
        for &c in w {
            let tr = &self.trans[s];
            let i = tr.partition_point(|&(_, b, _)| b < c);
            s = tr[i].2 as usize;
        }
        self.accept[s]
    }

    /// Number of accepted words, `None` when infinite or above `cap`.
    pub fn count(&self, cap: u64) -> Option<u64> {
        let useful = self.useful();
        if !useful[0] {
            return Some(0);
        }
        // Depth-first with colours: a cycle through useful states means infinitely many.
        let n = self.trans.len();
        let mut memo: Vec<Option<u128>> = vec![None; n];
        let mut colour = vec![0u8; n];
        let mut stack: Vec<(usize, usize)> = vec![(0, 0)];
        colour[0] = 1;
        while let Some(&mut (s, ref mut i)) = stack.last_mut() {
            let tr = &self.trans[s];
            if *i < tr.len() {
                let t = tr[*i].2 as usize;
                *i += 1;
                if !useful[t] {
                    continue;
                }
                match colour[t] {
                    0 => {
                        colour[t] = 1;
                        stack.push((t, 0));
                    }
                    1 => return None,
                    _ => {}
                }
            } else {
                let mut total = u128::from(self.accept[s]);
                for &(a, b, t) in tr {
                    if useful[t as usize] {
                        let sub = memo[t as usize].unwrap_or(0);
                        total = total.saturating_add(u128::from(b - a + 1).saturating_mul(sub));
                    }
                }
                memo[s] = Some(total.min(u128::from(u64::MAX)));
                colour[s] = 2;
                stack.pop();
            }
        }
        let total = memo[0].unwrap_or(0);
        u64::try_from(total).ok().filter(|&t| t <= cap)
    }

    /// The shortest accepted word in canonical order, if any (for messages and tests).
    pub fn example(&self) -> Option<Vec<u32>> {
        let mut prev: Vec<Option<(usize, u32)>> = vec![None; self.trans.len()];
        let mut seen = vec![false; self.trans.len()];
        let mut queue = VecDeque::from([0usize]);
        seen[0] = true;
        while let Some(s) = queue.pop_front() {
            if self.accept[s] {
                let mut w = Vec::new();
                let mut x = s;
                while let Some((p, c)) = prev[x] {
                    w.push(c);
                    x = p;
                }
                w.reverse();
                return Some(w);
            }
            for &(a, _, t) in &self.trans[s] {
                if !seen[t as usize] {
                    seen[t as usize] = true;
                    prev[t as usize] = Some((s, a));
                    queue.push_back(t as usize);
                }
            }
        }
        None
    }
}

/// Transitions on `c` to `to`, everything else to `dead`.
fn labelled(c: &Class, to: u32, dead: u32) -> Vec<(u32, u32, u32)> {
    let mut t: Vec<(u32, u32, u32)> = c.iter().map(|&(a, b)| (a, b, to)).collect();
    t.extend(class_not(c).into_iter().map(|(a, b)| (a, b, dead)));
    t.sort_unstable();
    merge_adjacent(t)
}

fn split_out(a: u32, b: u32, x: u32) -> Vec<(u32, u32)> {
    if x < a || x > b {
        return vec![(a, b)];
    }
    let mut v = Vec::new();
    if a < x {
        v.push((a, x - 1));
    }
    if x < b {
        v.push((x + 1, b));
    }
    v
}

fn merge_adjacent(t: Vec<(u32, u32, u32)>) -> Vec<(u32, u32, u32)> {
    let mut out: Vec<(u32, u32, u32)> = Vec::with_capacity(t.len());
    for (a, b, x) in t {
        match out.last_mut() {
            Some(l) if l.2 == x && l.1 + 1 == a => l.1 = b,
            _ => out.push((a, b, x)),
        }
    }
    out
}

/// A nondeterministic automaton with ε-moves (Thompson 1968), built from a pattern.
#[derive(Default)]
pub struct Nfa {
    eps: Vec<Vec<usize>>,
    moves: Vec<Vec<(Class, usize)>>,
}

impl Nfa {
    /// A fresh state.
    pub fn state(&mut self) -> Result<usize, String> {
        if self.eps.len() >= 4 * MAX_STATES {
            return Err(format!(
                "the pattern needs more than {} automaton states",
                4 * MAX_STATES
            ));
        }
        self.eps.push(Vec::new());
        self.moves.push(Vec::new());
        Ok(self.eps.len() - 1)
    }

    /// An ε-move.
    pub fn eps(&mut self, a: usize, b: usize) {
        self.eps[a].push(b);
    }

    /// A move on a class of characters.
    pub fn on(&mut self, a: usize, c: Class, b: usize) {
        self.moves[a].push((c, b));
    }

    fn closure(&self, set: &mut Vec<usize>) {
        let mut stack = set.clone();
        let mut seen: std::collections::HashSet<usize> = set.iter().copied().collect();
        while let Some(s) = stack.pop() {
            for &t in &self.eps[s] {
                if seen.insert(t) {
                    set.push(t);
                    stack.push(t);
                }
            }
        }
        set.sort_unstable();
        set.dedup();
    }

    /// The subset construction (Rabin & Scott 1959) from `start` to `end`, minimised.
    pub fn to_dfa(&self, start: usize, end: usize) -> Result<Dfa, String> {
        let mut first = vec![start];
        self.closure(&mut first);
        let mut ids: HashMap<Vec<usize>, u32> = HashMap::new();
        let mut sets = vec![first.clone()];
        ids.insert(first, 0);
        let mut d = Dfa {
            trans: Vec::new(),
            accept: Vec::new(),
        };
        let mut k = 0;
        while k < sets.len() {
            let set = sets[k].clone();
            k += 1;
            let mut cuts: BTreeMap<u32, ()> = BTreeMap::new();
            cuts.insert(0, ());
            for &s in &set {
                for (c, _) in &self.moves[s] {
                    for &(a, b) in c {
                        cuts.insert(a, ());
                        if b < MAX_CHAR {
                            cuts.insert(b + 1, ());
                        }
                    }
                }
            }
            let cuts: Vec<u32> = cuts.into_keys().collect();
            let mut tr = Vec::with_capacity(cuts.len());
            for (i, &lo) in cuts.iter().enumerate() {
                let hi = cuts.get(i + 1).map_or(MAX_CHAR, |&n| n - 1);
                let mut tgt = Vec::new();
                for &s in &set {
                    for (c, t) in &self.moves[s] {
                        let j = c.partition_point(|&(_, b)| b < lo);
                        if j < c.len() && c[j].0 <= lo {
                            tgt.push(*t);
                        }
                    }
                }
                self.closure(&mut tgt);
                let id = match ids.get(&tgt) {
                    Some(&id) => id,
                    None => {
                        let id = sets.len() as u32;
                        if sets.len() >= MAX_STATES {
                            return Err(format!(
                                "the pattern needs more than {MAX_STATES} automaton states"
                            ));
                        }
                        ids.insert(tgt.clone(), id);
                        sets.push(tgt);
                        id
                    }
                };
                tr.push((lo, hi, id));
            }
            d.trans.push(merge_adjacent(tr));
            d.accept.push(set.binary_search(&end).is_ok());
        }
        Ok(d.minimise())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn w(s: &str) -> Vec<u32> {
        s.chars().map(|c| c as u32).collect()
    }

    #[test]
    fn boolean_algebra_and_counts() {
        let ab: Class = vec![('a' as u32, 'b' as u32)];
        // Words over {a, b} of length 2 or 3: 4 + 8 = 12 (hand count).
        let l = Dfa::lengths(&ab, 2, Some(3)).unwrap();
        assert_eq!(l.count(100), Some(12));
        assert!(l.contains(&w("aba")) && !l.contains(&w("a")) && !l.contains(&w("abc")));
        let not_aa = l.and(&Dfa::word(&w("aa")).complement());
        assert_eq!(not_aa.count(100), Some(11));
        // Unbounded length: infinitely many.
        assert_eq!(Dfa::lengths(&ab, 2, None).unwrap().count(100), None);
        // L ∩ ¬L is empty and minimises to one state; L ∪ ¬L is everything.
        let e = l.and(&l.complement());
        assert!(e.is_empty());
        assert_eq!(e, Dfa::nothing());
        assert_eq!(l.or(&l.complement()), Dfa::nothing().complement());
        // maxLength < minLength is empty.
        assert!(Dfa::lengths(&ab, 3, Some(2)).unwrap().is_empty());
    }

    #[test]
    fn tagged_words() {
        let any: Class = vec![(1, MAX_CHAR)];
        let s = Dfa::word(&w("hi"));
        let en = Dfa::word(&w("en"));
        let d = s.then_tagged(0, &en, true);
        let mut tagged = w("hi");
        tagged.push(0);
        tagged.extend(w("en"));
        assert!(d.contains(&w("hi")) && d.contains(&tagged));
        assert_eq!(d.count(10), Some(2));
        let only = s.then_tagged(0, &Dfa::lengths(&any, 0, None).unwrap(), false);
        assert!(!only.contains(&w("hi")) && only.contains(&tagged));
    }
}

//! Role automata for regular role inclusion axioms: property chains r₁ ∘ … ∘ rₙ ⊑ s,
//! transitivity and sub-properties, after Horrocks, Kutz & Sattler, "The Even More
//! Irresistible SROIQ" (KR 2006), §3.
//!
//! For a role r with a property chain below it, the automaton B_r accepts exactly the words of
//! roles whose composition the role box puts below r. The tableau then replaces ∀r.C by
//! ∀B_r(q).C ([`Concept::AllPath`](crate::kb::Concept::AllPath)) and moves the state along
//! each edge, so that a chain of edges carries the restriction to its end.
//!
//! Two departures from the paper's construction, both language-preserving:
//! - a transition labelled S is taken by an edge whose role is below S in the told hierarchy
//!   (the simple closure ⊑*), so sub-property axioms need no states of their own;
//! - the automaton of a role strictly below r (by ⊑*) that has chains or is transitive is
//!   embedded between r's initial and final states through ε-moves, instead of reading its
//!   axioms as r's own.
//!
//! A role box that is not regular (OWL 2 Structural Specification §11.2) is refused with the
//! cycle of properties that makes it so.

use crate::kb::RoleId;
use std::collections::HashMap;

/// Most states one automaton may have after embedding; a role box past this is refused (the
/// construction can be exponential in the depth of the chain hierarchy).
pub const MAX_STATES: usize = 100_000;

/// A role automaton with ε-moves folded in: for each state, whether it accepts and which
/// labelled moves leave its ε-closure. State 0 is the initial state.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct RoleAutomaton {
    /// Per state: a final state lies in its ε-closure.
    pub accepting: Vec<bool>,
    /// Per state: (edge role, next state) for the moves of its ε-closure, sorted, distinct.
    pub moves: Vec<Vec<(RoleId, u32)>>,
}

/// The role box as the construction reads it.
pub struct RoleBox<'a> {
    /// Number of roles (both directions of every property).
    pub n_roles: usize,
    /// `sub[s * n_roles + r]`: s ⊑* r by sub-property axioms alone, closed under inverse.
    pub sub: &'a [bool],
    /// Transitive roles (closed under inverse).
    pub transitive: &'a [bool],
    /// Property chains (r₁ … rₙ, s) with n ≥ 2, as written.
    pub chains: &'a [(Vec<RoleId>, RoleId)],
    /// A role's name for messages.
    pub name: &'a dyn Fn(RoleId) -> String,
}

/// An automaton with ε-moves under construction; state 0 is initial, state 1 final.
#[derive(Clone, Debug)]
struct Nfa {
    eps: Vec<Vec<u32>>,
    moves: Vec<Vec<(RoleId, u32)>>,
}

impl Nfa {
    fn new() -> Self {
        Nfa {
            eps: vec![Vec::new(), Vec::new()],
            moves: vec![Vec::new(), Vec::new()],
        }
    }
    fn state(&mut self) -> u32 {
        self.eps.push(Vec::new());
        self.moves.push(Vec::new());
        (self.eps.len() - 1) as u32
    }
    fn len(&self) -> usize {
        self.eps.len()
    }
}

/// Builds the automata of every role that has a property chain below it.
pub struct Builder<'a> {
    rbox: &'a RoleBox<'a>,
    /// Every chain in both directions: w ⊑ s and inv(w) ⊑ s⁻ (inverted, reversed).
    chains: Vec<(Vec<RoleId>, RoleId)>,
    /// Roles with a chain below them.
    complex: Vec<bool>,
    memo: HashMap<RoleId, Nfa>,
    stack: Vec<RoleId>,
}

impl<'a> Builder<'a> {
    /// Prepares the construction over a role box.
    pub fn new(rbox: &'a RoleBox<'a>) -> Self {
        let mut chains = Vec::new();
        for (w, s) in rbox.chains {
            chains.push((w.clone(), *s));
            let inv: Vec<RoleId> = w.iter().rev().map(|r| r.inverse()).collect();
            chains.push((inv, s.inverse()));
        }
        let n = rbox.n_roles;
        let complex = (0..n)
            .map(|r| chains.iter().any(|(_, s)| rbox.sub[s.index() * n + r]))
            .collect();
        Builder {
            rbox,
            chains,
            complex,
            memo: HashMap::new(),
            stack: Vec::new(),
        }
    }

    /// Whether r has a property chain below it (then ∀r.C goes through B_r).
    pub fn complex(&self) -> &[bool] {
        &self.complex
    }

    fn sub(&self, s: RoleId, r: RoleId) -> bool {
        self.rbox.sub[s.index() * self.rbox.n_roles + r.index()]
    }

    fn equiv(&self, a: RoleId, b: RoleId) -> bool {
        self.sub(a, b) && self.sub(b, a)
    }

    /// A role read as a single transition: no chain and no transitive role below it.
    fn plain(&self, r: RoleId) -> bool {
        !self.complex[r.index()]
            && !(0..self.rbox.n_roles)
                .any(|t| self.rbox.transitive[t] && self.sub(RoleId(t as u32), r))
    }

    /// The automaton B_r with ε-moves folded in, or why the role box is not regular.
    pub fn automaton(&mut self, r: RoleId) -> Result<RoleAutomaton, String> {
        let nfa = self.build(r)?;
        Ok(fold_epsilon(&nfa))
    }

    fn build(&mut self, r: RoleId) -> Result<Nfa, String> {
        if let Some(n) = self.memo.get(&r) {
            return Ok(n.clone());
        }
        if let Some(pos) = self.stack.iter().position(|&s| self.equiv(s, r)) {
            let mut cycle: Vec<RoleId> = self.stack[pos..].to_vec();
            cycle.push(r);
            let names: Vec<String> = cycle.iter().map(|&r| (self.rbox.name)(r)).collect();
            return Err(format!(
                "the property hierarchy is not regular (OWL 2 Structural Specification §11.2): in the cycle {}, each property depends on the next through a property chain or a sub-property, so no order of the properties meets the regularity condition; remove one of the chains in that cycle",
                names.join(" → ")
            ));
        }
        self.stack.push(r);
        let result = self.build_fresh(r);
        self.stack.pop();
        let nfa = result?;
        self.memo.insert(r, nfa.clone());
        Ok(nfa)
    }

    fn build_fresh(&mut self, r: RoleId) -> Result<Nfa, String> {
        let n = self.rbox.n_roles;
        let mut a = Nfa::new();
        a.moves[0].push((r, 1));
        // Transitive roles at or below r: r ∘ r ⊑ r is a loop from final to initial; a
        // transitive role strictly below is embedded whole.
        let mut embedded: Vec<RoleId> = Vec::new();
        for t in (0..n).map(|t| RoleId(t as u32)) {
            if self.rbox.transitive[t.index()] && self.sub(t, r) {
                if self.equiv(t, r) {
                    a.eps[1].push(0);
                } else if !embedded.iter().any(|&e| self.equiv(e, t)) {
                    embedded.push(t);
                }
            }
        }
        for (w, s) in self.chains.clone() {
            if !self.sub(s, r) {
                continue;
            }
            if !self.equiv(s, r) {
                if !embedded.iter().any(|&e| self.equiv(e, s)) {
                    embedded.push(s);
                }
                continue;
            }
            let k = w.len();
            let first = self.equiv(w[0], r);
            let last = self.equiv(w[k - 1], r);
            match (first, last) {
                (true, true) if k == 2 => a.eps[1].push(0),
                (true, true) => {
                    return Err(format!(
                        "the property chain of length {k} below {} starts and ends with it, which OWL 2's regularity condition (Structural Specification §11.2) does not allow",
                        (self.rbox.name)(r)
                    ));
                }
                (true, false) => self.path(&mut a, 1, &w[1..], 1)?,
                (false, true) => self.path(&mut a, 0, &w[..k - 1], 0)?,
                (false, false) => self.path(&mut a, 0, &w, 1)?,
            }
            if a.len() > MAX_STATES {
                return Err(self.too_large(r));
            }
        }
        for t in embedded {
            self.embed(&mut a, 0, t, 1)?;
            if a.len() > MAX_STATES {
                return Err(self.too_large(r));
            }
        }
        Ok(a)
    }

    fn too_large(&self, r: RoleId) -> String {
        format!(
            "the automaton for {} would need more than {MAX_STATES} states (the property chains below it nest too deeply)",
            (self.rbox.name)(r)
        )
    }

    /// Adds a path from `from` to `to` reading `word`, each role as a transition when plain,
    /// else as an embedded copy of its automaton.
    fn path(&mut self, a: &mut Nfa, from: u32, word: &[RoleId], to: u32) -> Result<(), String> {
        let mut p = from;
        for (i, &x) in word.iter().enumerate() {
            let q = if i + 1 == word.len() { to } else { a.state() };
            if self.plain(x) {
                a.moves[p as usize].push((x, q));
            } else {
                self.embed(a, p, x, q)?;
            }
            p = q;
        }
        Ok(())
    }

    /// Embeds a copy of B_t between states p and q through ε-moves.
    fn embed(&mut self, a: &mut Nfa, p: u32, t: RoleId, q: u32) -> Result<(), String> {
        let b = self.build(t)?;
        if a.len() + b.len() > MAX_STATES {
            return Err(self.too_large(t));
        }
        let off = a.len() as u32;
        for (eps, moves) in b.eps.iter().zip(&b.moves) {
            let s = a.state() as usize;
            a.eps[s] = eps.iter().map(|&x| x + off).collect();
            a.moves[s] = moves.iter().map(|&(r, x)| (r, x + off)).collect();
        }
        a.eps[p as usize].push(off);
        a.eps[(off + 1) as usize].push(q);
        Ok(())
    }
}

/// Folds ε-moves: each state gets the moves and the acceptance of its ε-closure.
fn fold_epsilon(a: &Nfa) -> RoleAutomaton {
    let n = a.len();
    let mut out = RoleAutomaton {
        accepting: vec![false; n],
        moves: vec![Vec::new(); n],
    };
    let mut seen = vec![usize::MAX; n];
    for s in 0..n {
        let mut stack = vec![s];
        seen[s] = s;
        let mut moves = Vec::new();
        while let Some(x) = stack.pop() {
            if x == 1 {
                out.accepting[s] = true;
            }
            moves.extend_from_slice(&a.moves[x]);
            for &y in &a.eps[x] {
                if seen[y as usize] != s {
                    seen[y as usize] = s;
                    stack.push(y as usize);
                }
            }
        }
        moves.sort_unstable();
        moves.dedup();
        out.moves[s] = moves;
    }
    out
}

impl RoleAutomaton {
    /// Whether the automaton accepts a word of edge roles, each read through `sub`
    /// (s ⊑* S), from state 0. For tests and for checking the construction.
    pub fn accepts(&self, word: &[RoleId], sub: impl Fn(RoleId, RoleId) -> bool) -> bool {
        let mut states = vec![0u32];
        for &s in word {
            let mut next: Vec<u32> = states
                .iter()
                .flat_map(|&q| self.moves[q as usize].iter())
                .filter(|&&(l, _)| sub(s, l))
                .map(|&(_, q)| q)
                .collect();
            next.sort_unstable();
            next.dedup();
            states = next;
        }
        states.iter().any(|&q| self.accepting[q as usize])
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A role box over `n` properties with told sub-properties, transitivity and chains.
    fn rbox_parts(n: usize, subs: &[(RoleId, RoleId)], trans: &[RoleId]) -> (Vec<bool>, Vec<bool>) {
        let nr = 2 * n;
        let mut sub = vec![false; nr * nr];
        for r in 0..nr {
            sub[r * nr + r] = true;
        }
        for &(s, r) in subs {
            sub[s.index() * nr + r.index()] = true;
            sub[s.inverse().index() * nr + r.inverse().index()] = true;
        }
        for k in 0..nr {
            for i in 0..nr {
                if sub[i * nr + k] {
                    for j in 0..nr {
                        if sub[k * nr + j] {
                            sub[i * nr + j] = true;
                        }
                    }
                }
            }
        }
        let mut t = vec![false; nr];
        for &r in trans {
            t[r.index()] = true;
            t[r.inverse().index()] = true;
        }
        (sub, t)
    }

    fn r(i: u32) -> RoleId {
        RoleId(2 * i)
    }

    #[test]
    fn chain_language_of_part_and_position() {
        // partOf ∘ leftOf ⊑ leftOf (a part lies where its whole lies), partOf transitive.
        // Hand-derived language of leftOf: partOf* leftOf.
        let (part, left) = (r(0), r(1));
        let (sub, trans) = rbox_parts(2, &[], &[part]);
        let chains = vec![(vec![part, left], left)];
        let rbox = RoleBox {
            n_roles: 4,
            sub: &sub,
            transitive: &trans,
            chains: &chains,
            name: &|r| format!("r{}", r.0),
        };
        let mut b = Builder::new(&rbox);
        assert!(b.complex()[left.index()] && !b.complex()[part.index()]);
        let a = b.automaton(left).unwrap();
        let s = |x: RoleId, y: RoleId| sub[x.index() * 4 + y.index()];
        assert!(a.accepts(&[left], s));
        assert!(a.accepts(&[part, left], s));
        assert!(a.accepts(&[part, part, part, left], s));
        assert!(!a.accepts(&[left, part], s));
        assert!(!a.accepts(&[part], s));
        assert!(!a.accepts(&[], s));
        // The inverse direction reads the inverted word backwards: leftOf⁻ partOf⁻*.
        let ai = b.automaton(left.inverse()).unwrap();
        assert!(ai.accepts(&[left.inverse(), part.inverse(), part.inverse()], s));
        assert!(!ai.accepts(&[part.inverse(), left.inverse()], s));
    }

    #[test]
    fn general_chain_with_sub_properties_and_transitive_part() {
        // hasParent ∘ hasBrother ⊑ hasUncle; hasUncle ⊑ hasRelative; hasRelative transitive;
        // hasFather ⊑ hasParent. Language of hasRelative (hand-derived): one or more of
        // (hasRelative-below | hasParent-below hasBrother-below).
        let (rel, uncle, parent, brother, father) = (r(0), r(1), r(2), r(3), r(4));
        let (sub, trans) = rbox_parts(5, &[(uncle, rel), (father, parent)], &[rel]);
        let chains = vec![(vec![parent, brother], uncle)];
        let rbox = RoleBox {
            n_roles: 10,
            sub: &sub,
            transitive: &trans,
            chains: &chains,
            name: &|r| format!("r{}", r.0),
        };
        let mut b = Builder::new(&rbox);
        let a = b.automaton(rel).unwrap();
        let s = |x: RoleId, y: RoleId| sub[x.index() * 10 + y.index()];
        assert!(a.accepts(&[father, brother], s));
        assert!(a.accepts(&[father, brother, rel, uncle], s));
        assert!(!a.accepts(&[brother, father], s));
        assert!(!a.accepts(&[father], s));
        let u = b.automaton(uncle).unwrap();
        assert!(u.accepts(&[parent, brother], s));
        assert!(
            !u.accepts(&[parent, brother, uncle], s),
            "hasUncle is not transitive"
        );
    }

    #[test]
    fn cycle_through_chains_is_refused() {
        // r ∘ s ⊑ t and t ∘ u ⊑ s: s < t and t < s cannot both hold (OWL 2 §11.2).
        let (rr, s, t, u) = (r(0), r(1), r(2), r(3));
        let (sub, trans) = rbox_parts(4, &[], &[]);
        let chains = vec![(vec![rr, s], t), (vec![t, u], s)];
        let rbox = RoleBox {
            n_roles: 8,
            sub: &sub,
            transitive: &trans,
            chains: &chains,
            name: &|r| format!("r{}", r.0),
        };
        let mut b = Builder::new(&rbox);
        let e = b.automaton(t).unwrap_err();
        assert!(e.contains("not regular") && e.contains("→"), "{e}");
    }

    #[test]
    fn left_recursive_and_right_recursive_forms() {
        // r ∘ s ⊑ r: language r s*. s ∘ r ⊑ r: s* r. Both at once: s* r s*.
        let (rr, s) = (r(0), r(1));
        let (sub, trans) = rbox_parts(2, &[], &[]);
        let chains = vec![(vec![rr, s], rr), (vec![s, rr], rr)];
        let rbox = RoleBox {
            n_roles: 4,
            sub: &sub,
            transitive: &trans,
            chains: &chains,
            name: &|r| format!("r{}", r.0),
        };
        let mut b = Builder::new(&rbox);
        let a = b.automaton(rr).unwrap();
        let f = |x: RoleId, y: RoleId| sub[x.index() * 4 + y.index()];
        assert!(a.accepts(&[s, s, rr, s], f));
        assert!(a.accepts(&[rr], f));
        assert!(!a.accepts(&[s, s], f));
        assert!(!a.accepts(&[rr, rr], f), "r is not transitive");
    }
}

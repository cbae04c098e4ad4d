//! Hash-consed concepts in negation normal form.
//!
//! Every concept is stored once; syntactically equal concepts share one [`ConceptId`], and
//! each concept knows its negation, so the tableau can test for clashes by id.

use super::datarange::DataRangeId;
use super::{ClassId, DataPropId, IndividualId, RoleId};
use std::collections::HashMap;

/// Index of a concept in the [`ConceptStore`].
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord, Default)]
pub struct ConceptId(pub u32);

impl ConceptId {
    /// The top concept, owl:Thing.
    pub const TOP: ConceptId = ConceptId(0);
    /// The bottom concept, owl:Nothing.
    pub const BOTTOM: ConceptId = ConceptId(1);
    /// Index for array look-ups.
    pub fn index(self) -> usize {
        self.0 as usize
    }
}

/// A concept in negation normal form. Negation appears only in front of atoms and nominals.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub enum Concept {
    /// ⊤.
    Top,
    /// ⊥.
    Bottom,
    /// A named class.
    Atom(ClassId),
    /// The complement of a named class.
    NotAtom(ClassId),
    /// A nominal {a}.
    Nominal(IndividualId),
    /// The complement of a nominal ¬{a}.
    NotNominal(IndividualId),
    /// Conjunction of two or more concepts, operands sorted and distinct.
    And(Vec<ConceptId>),
    /// Disjunction of two or more concepts, operands sorted and distinct.
    Or(Vec<ConceptId>),
    /// ∃r.C.
    Some(RoleId, ConceptId),
    /// ∀r.C.
    All(RoleId, ConceptId),
    /// ≥n r.C with n ≥ 1.
    AtLeast(u32, RoleId, ConceptId),
    /// ≤n r.C.
    AtMost(u32, RoleId, ConceptId),
    /// ∃p.D for a data property p and a data range D.
    DataSome(DataPropId, DataRangeId),
    /// ∀p.D for a data property p and a data range D.
    DataAll(DataPropId, DataRangeId),
    /// ∃r.Self: the element is r-related to itself.
    HasSelf(RoleId),
    /// ¬∃r.Self.
    NotSelf(RoleId),
    /// ∀B_r(q).C: C holds at the end of every path that leads the role automaton of r from
    /// state q to a final state (Horrocks, Kutz & Sattler 2006, §3). Made by the tableau from
    /// ∀r.C when r has property chains; never written by a loader.
    AllPath(RoleId, u32, ConceptId),
    /// The negation partner of [`Concept::AllPath`], which every concept needs; the tableau
    /// never puts it in a label.
    SomePath(RoleId, u32, ConceptId),
    /// ≥n p.D over a data property, n ≥ 2 (n = 1 is [`Concept::DataSome`]).
    DataAtLeast(u32, DataPropId, DataRangeId),
    /// ≤n p.D over a data property, n ≥ 1 (n = 0 is [`Concept::DataAll`] of the complement).
    DataAtMost(u32, DataPropId, DataRangeId),
}

/// The store of all concepts of a knowledge base, with negations precomputed.
#[derive(Clone, Debug)]
pub struct ConceptStore {
    concepts: Vec<Concept>,
    negations: Vec<ConceptId>,
    ids: HashMap<Concept, ConceptId>,
}

impl Default for ConceptStore {
    fn default() -> Self {
        Self::new()
    }
}

impl ConceptStore {
    /// An empty store holding ⊤ and ⊥.
    pub fn new() -> Self {
        let mut s = ConceptStore {
            concepts: Vec::new(),
            negations: Vec::new(),
            ids: HashMap::new(),
        };
        s.raw(Concept::Top, None);
        s.raw(Concept::Bottom, None);
        s.negations[0] = ConceptId::BOTTOM;
        s.negations[1] = ConceptId::TOP;
        s
    }

    /// Number of concepts stored.
    pub fn len(&self) -> usize {
        self.concepts.len()
    }

    /// Whether only ⊤ and ⊥ are stored.
    pub fn is_empty(&self) -> bool {
        self.concepts.len() <= 2
    }

    /// The concept behind an id.
    pub fn get(&self, id: ConceptId) -> &Concept {
        &self.concepts[id.index()]
    }

    /// The id of a concept if it is stored.
    pub fn find(&self, c: &Concept) -> Option<ConceptId> {
        self.ids.get(c).copied()
    }

    /// The direct sub-concepts of a concept (operands of ⊓/⊔, fillers of restrictions).
    pub fn children(&self, id: ConceptId) -> &[ConceptId] {
        match &self.concepts[id.index()] {
            Concept::And(xs) | Concept::Or(xs) => xs,
            Concept::Some(_, f)
            | Concept::All(_, f)
            | Concept::AtLeast(_, _, f)
            | Concept::AtMost(_, _, f)
            | Concept::AllPath(_, _, f)
            | Concept::SomePath(_, _, f) => std::slice::from_ref(f),
            _ => &[],
        }
    }

    /// The negation (in NNF) of a concept.
    pub fn not(&self, id: ConceptId) -> ConceptId {
        self.negations[id.index()]
    }

    fn raw(&mut self, c: Concept, neg: Option<ConceptId>) -> ConceptId {
        if let Some(&id) = self.ids.get(&c) {
            return id;
        }
        let id = ConceptId(self.concepts.len() as u32);
        self.concepts.push(c.clone());
        self.negations.push(neg.unwrap_or(ConceptId::TOP));
        self.ids.insert(c, id);
        id
    }

    /// Interns a concept together with its negation so that both ids exist.
    fn pair(&mut self, c: Concept, n: Concept) -> ConceptId {
        if let Some(&id) = self.ids.get(&c) {
            return id;
        }
        let a = self.raw(c, None);
        let b = self.raw(n, Some(a));
        self.negations[a.index()] = b;
        a
    }

    /// A named class.
    pub fn atom(&mut self, c: ClassId) -> ConceptId {
        self.pair(Concept::Atom(c), Concept::NotAtom(c))
    }

    /// A nominal {a}.
    pub fn nominal(&mut self, a: IndividualId) -> ConceptId {
        self.pair(Concept::Nominal(a), Concept::NotNominal(a))
    }

    /// ∃r.C.
    pub fn some(&mut self, r: RoleId, c: ConceptId) -> ConceptId {
        if c == ConceptId::BOTTOM {
            return ConceptId::BOTTOM;
        }
        let nc = self.not(c);
        self.pair(Concept::Some(r, c), Concept::All(r, nc))
    }

    /// ∀r.C.
    pub fn all(&mut self, r: RoleId, c: ConceptId) -> ConceptId {
        if c == ConceptId::TOP {
            return ConceptId::TOP;
        }
        let nc = self.not(c);
        let s = self.some(r, nc);
        self.not(s)
    }

    /// ∃r.Self.
    pub fn has_self(&mut self, r: RoleId) -> ConceptId {
        self.pair(Concept::HasSelf(r), Concept::NotSelf(r))
    }

    /// ∀B_r(q).C, the automaton form of a universal restriction (see [`Concept::AllPath`]).
    pub fn all_path(&mut self, r: RoleId, state: u32, c: ConceptId) -> ConceptId {
        let nc = self.not(c);
        self.pair(
            Concept::AllPath(r, state, c),
            Concept::SomePath(r, state, nc),
        )
    }

    /// ≥n r.C.
    pub fn at_least(&mut self, n: u32, r: RoleId, c: ConceptId) -> ConceptId {
        if n == 0 {
            return ConceptId::TOP;
        }
        if c == ConceptId::BOTTOM {
            return ConceptId::BOTTOM;
        }
        if n == 1 {
            return self.some(r, c);
        }
        self.pair(Concept::AtLeast(n, r, c), Concept::AtMost(n - 1, r, c))
    }

    /// ≤n r.C.
    pub fn at_most(&mut self, n: u32, r: RoleId, c: ConceptId) -> ConceptId {
        if c == ConceptId::BOTTOM {
            return ConceptId::TOP;
        }
        if n == u32::MAX {
            return ConceptId::TOP;
        }
        let l = self.at_least(n + 1, r, c);
        self.not(l)
    }

    /// ∃p.D over a data property.
    pub fn data_some(&mut self, p: DataPropId, d: DataRangeId, not_d: DataRangeId) -> ConceptId {
        self.pair(Concept::DataSome(p, d), Concept::DataAll(p, not_d))
    }

    /// ∀p.D over a data property.
    pub fn data_all(&mut self, p: DataPropId, d: DataRangeId, not_d: DataRangeId) -> ConceptId {
        let s = self.data_some(p, not_d, d);
        self.not(s)
    }

    /// ≥n p.D over a data property (`not_d` is the complement of `d`).
    pub fn data_at_least(
        &mut self,
        n: u32,
        p: DataPropId,
        d: DataRangeId,
        not_d: DataRangeId,
    ) -> ConceptId {
        match n {
            0 => ConceptId::TOP,
            1 => self.data_some(p, d, not_d),
            _ => self.pair(
                Concept::DataAtLeast(n, p, d),
                Concept::DataAtMost(n - 1, p, d),
            ),
        }
    }

    /// ≤n p.D over a data property (`not_d` is the complement of `d`).
    pub fn data_at_most(
        &mut self,
        n: u32,
        p: DataPropId,
        d: DataRangeId,
        not_d: DataRangeId,
    ) -> ConceptId {
        if n == u32::MAX {
            return ConceptId::TOP;
        }
        let l = self.data_at_least(n + 1, p, d, not_d);
        self.not(l)
    }

    /// Conjunction, flattened, sorted and simplified.
    pub fn and(&mut self, parts: impl IntoIterator<Item = ConceptId>) -> ConceptId {
        self.junction(parts.into_iter().collect(), true)
    }

    /// Disjunction, flattened, sorted and simplified.
    pub fn or(&mut self, parts: impl IntoIterator<Item = ConceptId>) -> ConceptId {
        self.junction(parts.into_iter().collect(), false)
    }

    fn junction(&mut self, parts: Vec<ConceptId>, conj: bool) -> ConceptId {
        let (unit, zero) = if conj {
            (ConceptId::TOP, ConceptId::BOTTOM)
        } else {
            (ConceptId::BOTTOM, ConceptId::TOP)
        };
        let mut flat = Vec::with_capacity(parts.len());
        let mut stack = parts;
        while let Some(p) = stack.pop() {
            match self.get(p) {
                Concept::And(xs) if conj => stack.extend(xs.iter().copied()),
                Concept::Or(xs) if !conj => stack.extend(xs.iter().copied()),
                _ if p == unit => {}
                _ => flat.push(p),
            }
        }
        flat.sort_unstable();
        flat.dedup();
        if flat.contains(&zero) {
            return zero;
        }
        // C ⊓ ¬C = ⊥ and C ⊔ ¬C = ⊤.
        for &c in &flat {
            if flat.binary_search(&self.not(c)).is_ok() {
                return zero;
            }
        }
        match flat.len() {
            0 => unit,
            1 => flat[0],
            _ => {
                let negs: Vec<ConceptId> = flat.iter().map(|&c| self.not(c)).collect();
                let mut negs_sorted = negs;
                negs_sorted.sort_unstable();
                if conj {
                    self.pair(Concept::And(flat), Concept::Or(negs_sorted))
                } else {
                    self.pair(Concept::Or(flat), Concept::And(negs_sorted))
                }
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn negation_is_involutive_and_nnf() {
        let mut s = ConceptStore::new();
        let a = s.atom(ClassId(0));
        let b = s.atom(ClassId(1));
        let r = RoleId(0);
        let ex = s.some(r, a);
        let c = s.and([ex, b]);
        let nc = s.not(c);
        assert_eq!(s.not(nc), c);
        // ¬(∃r.A ⊓ B) = ∀r.¬A ⊔ ¬B (De Morgan and quantifier duality, from the NNF definition).
        let na = s.not(a);
        let nb = s.not(b);
        let all = s.all(r, na);
        let expect = s.or([all, nb]);
        assert_eq!(nc, expect);
        let ge = s.at_least(3, r, a);
        assert_eq!(s.get(s.not(ge)), &Concept::AtMost(2, r, a));
    }

    #[test]
    fn hash_consing_shares_ids() {
        let mut s = ConceptStore::new();
        let a = s.atom(ClassId(0));
        let b = s.atom(ClassId(1));
        assert_eq!(s.and([a, b]), s.and([b, a, a]));
        let na = s.not(a);
        assert_eq!(s.and([a, na]), ConceptId::BOTTOM);
        assert_eq!(s.or([a, na]), ConceptId::TOP);
    }
}

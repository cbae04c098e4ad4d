//! Satisfiability caching across the tests of one reasoner, kept sound with inverse roles.
//!
//! Two caches, after Horrocks & Sattler, "A description logic with transitive and inverse
//! roles and role hierarchies" (J. Logic Comput. 9(3), 1999, §5 on caching) and Ding &
//! Haarslev, "Tableau caching for description logics with inverse and transitive roles"
//! (DL 2006), which show that in logics with inverse roles a node's satisfiability cannot be
//! reused blindly, because its subtree may push concepts back to its predecessor.
//!
//! - **Unsatisfiable concepts.** When a concept test of C (no extra assertions) ends Unsat,
//!   no element of any model of the KB is in C. That holds whatever the neighbours, so a
//!   node that gets C clashes at once, with C's own dependency set. Sound with inverse roles
//!   without condition.
//! - **Satisfiable labels.** When a concept test (no ABox, no extra assertions, no nominals
//!   in the TBox) ends with a complete, clash-free graph, the final label L of each node n
//!   that is neither blocked nor below a blocked or cached node is recorded, provided that no
//!   `∃s.C` or `≥ m s.C` in L could have been met by n's predecessor (for an edge role r
//!   from the predecessor, r⁻ ⊑* s). Then n's subtree in the unravelled model is a model of
//!   ⊓L in which every ∃/≥ demand of n is met by n's own successors.
//!
//!   **Rule of reuse.** A tree node y whose label equals a recorded L is not expanded by the
//!   generating rules (it is treated as blocked by the cache) provided no `≤ m s.C` in L
//!   counts its predecessor x (for an edge role r from x to y, r⁻ ⊑* s). The rest of y's
//!   interaction with x stays live in the graph: the ∀-rule at y already adds to x what y's
//!   universals demand, and x's universals and at-most restrictions already act on y. So the
//!   recorded subtree can be hung under y: its nodes see only each other and y, their
//!   effects on y are inside L, and y's at-most restrictions cannot be broken by x. This is
//!   Ding & Haarslev's condition that a reused result must not depend on, or propagate to,
//!   the predecessor, checked on the final label instead of a syntactic closure.
//!
//! Nominals in the TBox switch the label cache off (a subtree could then reach an
//! individual outside it); the unsatisfiable cache stays on.

use crate::kb::ConceptId;
use std::collections::{HashMap, HashSet};

/// Largest number of labels kept; recording stops beyond it (memory stays bounded).
const MAX_LABELS: usize = 200_000;

/// The caches shared by all tests of one reasoner.
#[derive(Debug, Default)]
pub struct SatCache {
    unsat: HashSet<ConceptId>,
    sat: HashMap<u64, Vec<Box<[ConceptId]>>>,
    n_labels: usize,
}

impl SatCache {
    /// Whether concept C is known to be unsatisfiable with respect to the KB.
    pub fn is_unsat(&self, c: ConceptId) -> bool {
        !self.unsat.is_empty() && self.unsat.contains(&c)
    }

    /// Records that C is unsatisfiable with respect to the KB.
    pub fn record_unsat(&mut self, c: ConceptId) {
        if c != ConceptId::TOP {
            self.unsat.insert(c);
        }
    }

    /// Whether some label with this hash was recorded (a cheap test before the full one).
    pub fn knows_hash(&self, hash: u64) -> bool {
        self.sat.contains_key(&hash)
    }

    /// Whether the label (sorted by concept id, with its order-independent hash) is known to
    /// be satisfiable by a node whose demands its own subtree meets.
    pub fn is_sat_label(&self, hash: u64, label: impl ExactSizeIterator<Item = ConceptId>) -> bool {
        let Some(cands) = self.sat.get(&hash) else {
            return false;
        };
        let label: Vec<ConceptId> = label.collect();
        cands.iter().any(|c| **c == *label)
    }

    /// Records a satisfiable label (sorted by concept id).
    pub fn record_sat(&mut self, hash: u64, label: Vec<ConceptId>) {
        if self.n_labels >= MAX_LABELS {
            return;
        }
        let e = self.sat.entry(hash).or_default();
        if !e.iter().any(|c| **c == *label) {
            e.push(label.into_boxed_slice());
            self.n_labels += 1;
        }
    }

    /// Number of labels recorded.
    pub fn sat_labels(&self) -> usize {
        self.n_labels
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn labels_match_exactly_not_by_hash() {
        // Two labels with the same hash key but different members must not be confused
        // (the key is only a filter; equality decides). From the definition above.
        let mut c = SatCache::default();
        c.record_sat(7, vec![ConceptId(3), ConceptId(5)]);
        assert!(c.is_sat_label(7, [ConceptId(3), ConceptId(5)].into_iter()));
        assert!(!c.is_sat_label(7, [ConceptId(3)].into_iter()));
        assert!(!c.is_sat_label(8, [ConceptId(3), ConceptId(5)].into_iter()));
        c.record_sat(7, vec![ConceptId(3), ConceptId(5)]);
        assert_eq!(c.sat_labels(), 1);
    }

    #[test]
    fn top_is_never_recorded_unsat() {
        // ⊤ unsatisfiable only means an inconsistent KB, which concept tests never reach.
        let mut c = SatCache::default();
        c.record_unsat(ConceptId::TOP);
        assert!(!c.is_unsat(ConceptId::TOP));
        c.record_unsat(ConceptId(9));
        assert!(c.is_unsat(ConceptId(9)));
    }
}

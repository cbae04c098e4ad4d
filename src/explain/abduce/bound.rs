//! The limits of one abduction: the reasoner's own (time, completion-graph nodes,
//! cancellation), the hitting-set tree's node count, and a memory budget for the search's
//! sets (the queue, the visited sets, the cached models). Whichever trips first stops the
//! search cleanly; what was found so far is kept (anytime search).

use crate::reasoner::{Limit, Limits};
use serde::Serialize;
use std::sync::atomic::Ordering;
use std::time::Instant;

/// What stopped a search before every candidate up to the size bound was decided.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum SearchLimit {
    /// The work budget of a search for data values.
    DataValues,
    /// The time limit (`--timeout`).
    Time,
    /// The completion-graph node limit of one reasoner test (`--max-graph-nodes`).
    GraphNodes,
    /// The user cancelled.
    Cancelled,
    /// The hitting-set tree's node limit (`--max-nodes`).
    TreeNodes,
    /// The search's memory budget (`--max-memory`).
    Memory,
    /// A reasoner test met a model it cannot claim: a nominal's at-most restriction counts
    /// nodes in copied (blocked) parts of the completion graph.
    NominalCounting,
}

impl From<Limit> for SearchLimit {
    fn from(l: Limit) -> Self {
        match l {
            Limit::DataValues => SearchLimit::DataValues,
            Limit::Time => SearchLimit::Time,
            Limit::Nodes => SearchLimit::GraphNodes,
            Limit::Cancelled => SearchLimit::Cancelled,
            Limit::NominalCounting => SearchLimit::NominalCounting,
        }
    }
}

impl SearchLimit {
    /// The command-line option that raises this limit, if there is one.
    pub fn option(self) -> Option<&'static str> {
        match self {
            SearchLimit::DataValues => None,
            SearchLimit::Time => Some("--timeout"),
            SearchLimit::GraphNodes => Some("--max-graph-nodes"),
            SearchLimit::Cancelled => None,
            SearchLimit::TreeNodes => Some("--max-nodes"),
            SearchLimit::Memory => Some("--max-memory"),
            SearchLimit::NominalCounting => None,
        }
    }
}

impl std::fmt::Display for SearchLimit {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(match self {
            SearchLimit::DataValues => return Limit::DataValues.fmt(f),
            SearchLimit::Time => "time limit reached",
            SearchLimit::GraphNodes => "node limit of the completion graph reached in one test",
            SearchLimit::Cancelled => "cancelled",
            SearchLimit::TreeNodes => "node limit of the hitting-set tree reached",
            SearchLimit::Memory => "memory budget of the search reached",
            SearchLimit::NominalCounting => return Limit::NominalCounting.fmt(f),
        })
    }
}

/// Bytes one set of `len` abducible positions costs in the queue or in the visited table
/// (the vector's heap block and header, and a hash-table slot): an estimate that errs high.
pub fn set_bytes(len: usize) -> usize {
    64 + 8 * len
}

/// The search's account against its limits.
pub struct Budget {
    max_tree_nodes: u64,
    max_bytes: usize,
    bytes: usize,
    limits: Limits,
}

impl Budget {
    /// A fresh account: `max_tree_nodes` counts every node opened so far (also by earlier
    /// searches of the same problem); `max_bytes` is this search's memory budget.
    pub fn new(max_tree_nodes: usize, max_bytes: usize, limits: &Limits) -> Self {
        Budget {
            max_tree_nodes: max_tree_nodes as u64,
            max_bytes,
            bytes: 0,
            limits: limits.clone(),
        }
    }

    /// Checks the node count (`opened` nodes so far), the deadline and cancellation; called
    /// once per node, so a search with no reasoner call left to make still stops in time.
    pub fn node(&self, opened: u64) -> Result<(), SearchLimit> {
        if opened > self.max_tree_nodes {
            return Err(SearchLimit::TreeNodes);
        }
        if self.limits.deadline.is_some_and(|d| Instant::now() >= d) {
            return Err(SearchLimit::Time);
        }
        if self
            .limits
            .cancel
            .as_ref()
            .is_some_and(|c| c.load(Ordering::Relaxed))
        {
            return Err(SearchLimit::Cancelled);
        }
        Ok(())
    }

    /// Charges `bytes` of search memory; fails when the budget would be exceeded.
    pub fn charge(&mut self, bytes: usize) -> Result<(), SearchLimit> {
        self.bytes += bytes;
        if self.bytes > self.max_bytes {
            return Err(SearchLimit::Memory);
        }
        Ok(())
    }

    /// Returns memory that the search freed.
    pub fn release(&mut self, bytes: usize) {
        self.bytes = self.bytes.saturating_sub(bytes);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn memory_budget_trips_exactly_past_the_bound() {
        // Hand-derived: two sets of 3 cost 2 × (64 + 24) = 176 bytes.
        let mut b = Budget::new(10, 176, &Limits::default());
        assert_eq!(b.charge(set_bytes(3)), Ok(()));
        assert_eq!(b.charge(set_bytes(3)), Ok(()));
        assert_eq!(b.charge(1), Err(SearchLimit::Memory));
        b.release(set_bytes(3) + 1);
        assert_eq!(b.charge(set_bytes(3)), Ok(()));
    }

    #[test]
    fn node_limit_and_past_deadline_are_named() {
        let b = Budget::new(2, 1 << 20, &Limits::default());
        assert_eq!(b.node(2), Ok(()));
        assert_eq!(b.node(3), Err(SearchLimit::TreeNodes));
        let past = Limits {
            deadline: Some(Instant::now()),
            ..Limits::default()
        };
        assert_eq!(
            Budget::new(10, 1 << 20, &past).node(1),
            Err(SearchLimit::Time)
        );
    }
}

//! Keys (`HasKey`) with the DL-safe semantics of the OWL 2 Direct Semantics, §2.3.5 (after
//! Motik, Sattler & Studer 2005): two named individuals in a key's class that share a named
//! filler for each of its object properties and a data value for each of its data
//! properties are the same individual.
//!
//! Object properties: the shared filler is a named node, read off the graph. Data properties:
//! values are not nodes. A node has a value of p in the model read off the graph exactly when
//! its label demands one (∃q.D or ≥n q.D with q ⊑* p), since a model never needs more values
//! than those (more values only make keys fire more). For a pair of key members with every
//! such demand, the rule branches: the two are kept apart on one data property of the key
//! (no value of it is shared), or else merged. "Apart" constrains two nodes at once, which
//! the per-node data check cannot see, so the nodes kept apart are checked together by
//! [`datavalues::check_joint`]: exact, within a work budget, past which the test stops with
//! [`Limit::DataValues`] rather than guess.

use super::{Choice, Concept, DATA_BUDGET, Dep, Limit, NodeId, Tableau, datavalues};
use crate::kb::{DataPropId, DataRange, DataRangeId, RoleId};
use std::collections::HashSet;

/// Pairs of nodes kept apart on a data property, after merges.
pub(super) type ApartPairs = Vec<(NodeId, NodeId, DataPropId)>;

impl Tableau<'_> {
    /// The key rule (see the module comment). A key's class that is not a named class is
    /// decided on each named individual first (a choose rule), since the model read off the
    /// graph may put an individual in it without the label saying so. Returns whether a rule
    /// applied or a clash or limit was found.
    ///
    /// Pairs still undecided are first checked optimistically: when the values exist with
    /// every such pair apart on its key's first data property, the keys hold in the model
    /// read off the graph and no branching is needed (so a thousand individuals with open
    /// identifiers cost one check, not half a million branching points). Only when that
    /// fails does the first undecided pair become a branching point.
    pub(super) fn apply_keys(&mut self) -> bool {
        let prep = self.prep;
        let named: Vec<NodeId> = (0..self.g.nodes.len())
            .filter(|&x| {
                let n = &self.g.nodes[x];
                n.active
                    && n.names
                        .iter()
                        .any(|a| prep.keyed.get(a.index()).copied().unwrap_or(false))
            })
            .collect();
        let mut apart: HashSet<(NodeId, NodeId, DataPropId)> = HashSet::new();
        for &(a, b, d, _) in &self.g.key_apart {
            let (a, b) = (self.find(a), self.find(b));
            apart.insert((a.min(b), a.max(b), d));
        }
        let mut pending: Vec<(NodeId, NodeId, Vec<DataPropId>, Dep)> = Vec::new();
        for (c, roles, data) in &prep.keys {
            let c = *c;
            if !matches!(self.concepts.get(c), Concept::Atom(_)) {
                let nc = self.concepts.not(c);
                for &x in &named {
                    if self.has(x, c).is_none() && self.has(x, nc).is_none() {
                        self.stats.branches += 1;
                        self.branch(
                            Choice::Add {
                                node: x,
                                options: vec![c, nc],
                            },
                            Dep::EMPTY,
                        );
                        return true;
                    }
                }
            }
            let members: Vec<(NodeId, Dep)> = named
                .iter()
                .filter_map(|&x| self.has(x, c).map(|d| (x, d)))
                .collect();
            // The ranges of each member's values of each data property of the key.
            let ranges: Vec<Vec<Vec<DataRange>>> = members
                .iter()
                .map(|&(x, _)| data.iter().map(|&d| self.value_ranges(x, d)).collect())
                .collect();
            for i in 0..members.len() {
                'pair: for j in i + 1..members.len() {
                    let ((x, dx), (y, dy)) = (members[i], members[j]);
                    // Values in disjoint ranges are never shared (asserted distinct
                    // identifiers, the common case), nor are values a node does not have:
                    // the pair is apart in every model read off this graph.
                    for (rx, ry) in ranges[i].iter().zip(&ranges[j]) {
                        if rx
                            .iter()
                            .all(|a| ry.iter().all(|b| a.intersect(b).is_empty()))
                        {
                            continue 'pair;
                        }
                    }
                    if data
                        .iter()
                        .any(|&d| apart.contains(&(x.min(y), x.max(y), d)))
                    {
                        continue;
                    }
                    let mut dep = self.deps.union(dx, dy);
                    for &r in roles {
                        match self.shared_named_filler(x, y, r) {
                            Some(d) => dep = self.deps.union(dep, d),
                            None => continue 'pair,
                        }
                    }
                    if data.is_empty() {
                        self.merge_key_pair(x, y, dep);
                        return true;
                    }
                    for &d in data {
                        let (a, b) = (self.value_demand(x, d), self.value_demand(y, d));
                        let ab = self
                            .deps
                            .union(a.unwrap_or(Dep::EMPTY), b.unwrap_or(Dep::EMPTY));
                        dep = self.deps.union(dep, ab);
                    }
                    pending.push((x, y, data.clone(), dep));
                }
            }
        }
        let optimistic: ApartPairs = pending
            .iter()
            .map(|(x, y, ds, _)| (*x, *y, ds[0]))
            .collect();
        match self.check_key_values(&optimistic) {
            Some(true) => return true,
            Some(false) => {}
            None => return false,
        }
        // Some pair must share its values or be kept apart otherwise: branch on the first.
        let Some((x, y, props, dep)) = pending.into_iter().next() else {
            return true;
        };
        self.stats.branches += 1;
        self.branch(Choice::KeyApart { x, y, props }, dep);
        true
    }

    /// Applies alternative `i` of a data key's pair: apart on `props[i]`, or (the last)
    /// merged.
    pub(super) fn apply_key_alternative(
        &mut self,
        x: NodeId,
        y: NodeId,
        props: &[DataPropId],
        i: usize,
        dep: Dep,
    ) {
        if let Some(&d) = props.get(i) {
            self.g.key_apart.push((x, y, d, dep));
        } else {
            let (x, y) = (self.find(x), self.find(y));
            if x != y {
                self.merge_key_pair(x, y, dep);
            }
        }
    }

    /// Makes two key members one node, or clashes when they are known to differ.
    fn merge_key_pair(&mut self, x: NodeId, y: NodeId, dep: Dep) {
        if let Some(d) = self.distinct(x, y) {
            let dd = self.deps.union(d, dep);
            self.set_clash(dd);
        } else {
            self.stats.merges += 1;
            let (from, into) = if x < y { (y, x) } else { (x, y) };
            self.merge(from, into, dep);
        }
    }

    /// A named node that is an r-neighbour of both x and y, with the edges' dependencies.
    fn shared_named_filler(&mut self, x: NodeId, y: NodeId, r: RoleId) -> Option<Dep> {
        let xs = self.r_neighbours(x, r);
        let ys = self.r_neighbours(y, r);
        for (z, dz) in xs {
            if self.g.nodes[z].names.is_empty() {
                continue;
            }
            if let Some(&(_, dz2)) = ys.iter().find(|&&(w, _)| w == z) {
                return Some(self.deps.union(dz, dz2));
            }
        }
        None
    }

    /// The dependency of a demand for a value of `d` at x (∃q.D or ≥n q.D with q ⊑* d), if
    /// the label has one.
    fn value_demand(&self, x: NodeId, d: DataPropId) -> Option<Dep> {
        let p = self.prep;
        let node = &self.g.nodes[x];
        node.label
            .iter()
            .find_map(|&c| match *self.concepts.get(c) {
                Concept::DataSome(q, _) | Concept::DataAtLeast(_, q, _)
                    if p.data_supers[q.index()].contains(&d) =>
                {
                    Some(node.deps[&c])
                }
                _ => None,
            })
    }

    /// The ranges of the values x needs for `d` (∃q.D or ≥n q.D with q ⊑* d), each cut by
    /// the node's ∀ restrictions and the range axioms.
    fn value_ranges(&self, x: NodeId, d: DataPropId) -> Vec<DataRange> {
        let p = self.prep;
        let alls = self.data_alls(x);
        self.g.nodes[x]
            .label
            .iter()
            .filter_map(|&c| match *self.concepts.get(c) {
                Concept::DataSome(q, r) | Concept::DataAtLeast(_, q, r)
                    if p.data_supers[q.index()].contains(&d) =>
                {
                    Some(self.effective_range(q, r, &alls))
                }
                _ => None,
            })
            .collect()
    }

    /// The ∀ restrictions on data properties at x, with their dependencies.
    fn data_alls(&self, x: NodeId) -> Vec<(DataPropId, DataRangeId, Dep)> {
        let node = &self.g.nodes[x];
        node.label
            .iter()
            .filter_map(|&c| match *self.concepts.get(c) {
                Concept::DataAll(dp, r) => Some((dp, r, node.deps[&c])),
                _ => None,
            })
            .collect()
    }

    /// Checks that the nodes kept apart (by the recorded pairs, and by `extra` pairs
    /// assumed apart) have values together: each node's own needs and caps, no value shared
    /// where a pair is apart. Skipped when nothing it reads changed since the last success.
    /// `None`: the values exist; `Some(true)`: a clash (found with no pair assumed) or a
    /// limit was set; `Some(false)`: none exist with the `extra` pairs assumed apart (no
    /// clash set, since the assumption is no choice of the search).
    fn check_key_values(&mut self, extra: &[(NodeId, NodeId, DataPropId)]) -> Option<bool> {
        if self.g.key_apart.is_empty() && extra.is_empty() {
            return None;
        }
        let mut apart: Vec<(NodeId, NodeId, DataPropId, Dep)> = self
            .g
            .key_apart
            .iter()
            .map(|&(a, b, d, dep)| (self.find(a), self.find(b), d, dep))
            .collect();
        apart.extend(extra.iter().map(|&(a, b, d)| (a, b, d, Dep::EMPTY)));
        let mut nodes: Vec<NodeId> = apart.iter().flat_map(|&(a, b, _, _)| [a, b]).collect();
        nodes.sort_unstable();
        nodes.dedup();
        let latest = nodes.iter().map(|&x| self.g.changed[x]).max().unwrap_or(0);
        let seen: ApartPairs = apart.iter().map(|&(a, b, d, _)| (a, b, d)).collect();
        if let Some((t, s)) = &self.g.key_checked
            && *t >= latest
            && *s == seen
        {
            return None;
        }
        let (mut needs, mut need_owner, mut caps, mut cap_owner) =
            (Vec::new(), Vec::new(), Vec::new(), Vec::new());
        let mut dep = Dep::EMPTY;
        for (k, &x) in nodes.iter().enumerate() {
            let alls = self.data_alls(x);
            // Groups of ≥n restrictions are numbered apart per node.
            let (n, c, d) = self.data_problem(x, &alls, (k as u32) << 12);
            need_owner.extend(std::iter::repeat_n(k as u32, n.len()));
            cap_owner.extend(std::iter::repeat_n(k as u32, c.len()));
            needs.extend(n);
            caps.extend(c);
            dep = self.deps.union(dep, d);
        }
        let owner = |x: NodeId| nodes.binary_search(&x).expect("an apart node") as u32;
        let mut pairs = Vec::new();
        for &(a, b, prop, d) in &apart {
            pairs.push(datavalues::Apart {
                a: owner(a),
                b: owner(b),
                prop,
            });
            dep = self.deps.union(dep, d);
        }
        let p = self.prep;
        let applies = |a: DataPropId, b: DataPropId| p.data_supers[a.index()].contains(&b);
        let props = datavalues::Props {
            sub: &applies,
            disjoint: &p.data_disjoint,
        };
        match datavalues::check_joint(
            &needs,
            &need_owner,
            &caps,
            &cap_owner,
            &pairs,
            props,
            DATA_BUDGET,
        ) {
            datavalues::Verdict::Sat => {
                self.g.key_checked = Some((latest, seen));
                None
            }
            datavalues::Verdict::Unsat if extra.is_empty() => {
                self.set_clash(dep);
                Some(true)
            }
            datavalues::Verdict::Unsat => Some(false),
            datavalues::Verdict::Budget => {
                self.stopped = Some(Limit::DataValues);
                Some(true)
            }
        }
    }
}

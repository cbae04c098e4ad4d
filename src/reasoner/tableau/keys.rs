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
use crate::kb::{DataPropId, DataRangeId, RoleId};

/// Pairs of nodes kept apart on a data property, after merges.
pub(super) type ApartPairs = Vec<(NodeId, NodeId, DataPropId)>;

impl Tableau<'_> {
    /// The key rule (see the module comment). A key's class that is not a named class is
    /// decided on each named individual first (a choose rule), since the model read off the
    /// graph may put an individual in it without the label saying so. Returns whether a rule
    /// applied or a clash or limit was found.
    pub(super) fn apply_keys(&mut self) -> bool {
        let prep = self.prep;
        let named: Vec<NodeId> = (0..self.g.nodes.len())
            .filter(|&x| self.g.nodes[x].active && !self.g.nodes[x].names.is_empty())
            .collect();
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
            for i in 0..members.len() {
                'pair: for j in i + 1..members.len() {
                    let ((x, dx), (y, dy)) = (members[i], members[j]);
                    let mut dep = self.deps.union(dx, dy);
                    for &r in roles {
                        match self.shared_named_filler(x, y, r) {
                            Some(d) => dep = self.deps.union(dep, d),
                            None => continue 'pair,
                        }
                    }
                    for &d in data {
                        match (self.value_demand(x, d), self.value_demand(y, d)) {
                            (Some(a), Some(b)) => {
                                let ab = self.deps.union(a, b);
                                dep = self.deps.union(dep, ab);
                            }
                            _ => continue 'pair,
                        }
                    }
                    if !data.is_empty() {
                        if self.kept_apart(x, y, data) {
                            continue;
                        }
                        self.stats.branches += 1;
                        self.branch(
                            Choice::KeyApart {
                                x,
                                y,
                                props: data.clone(),
                            },
                            dep,
                        );
                        return true;
                    }
                    self.merge_key_pair(x, y, dep);
                    return true;
                }
            }
        }
        self.check_key_values()
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

    /// Whether x and y are already kept apart on one of `props`.
    fn kept_apart(&self, x: NodeId, y: NodeId, props: &[DataPropId]) -> bool {
        self.g.key_apart.iter().any(|&(a, b, d, _)| {
            let (a, b) = (self.find(a), self.find(b));
            props.contains(&d) && ((a, b) == (x, y) || (a, b) == (y, x))
        })
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

    /// Checks that the nodes kept apart have values together (each node's own needs and
    /// caps, no value shared where a pair is apart). Skipped when nothing it reads changed
    /// since the last check. Returns whether a clash or limit was found.
    fn check_key_values(&mut self) -> bool {
        if self.g.key_apart.is_empty() {
            return false;
        }
        let apart: Vec<(NodeId, NodeId, DataPropId, Dep)> = self
            .g
            .key_apart
            .iter()
            .map(|&(a, b, d, dep)| (self.find(a), self.find(b), d, dep))
            .collect();
        let mut nodes: Vec<NodeId> = apart.iter().flat_map(|&(a, b, _, _)| [a, b]).collect();
        nodes.sort_unstable();
        nodes.dedup();
        let latest = nodes.iter().map(|&x| self.g.changed[x]).max().unwrap_or(0);
        let seen: ApartPairs = apart.iter().map(|&(a, b, d, _)| (a, b, d)).collect();
        if let Some((t, s)) = &self.g.key_checked
            && *t >= latest
            && *s == seen
        {
            return false;
        }
        let (mut needs, mut need_owner, mut caps, mut cap_owner) =
            (Vec::new(), Vec::new(), Vec::new(), Vec::new());
        let mut dep = Dep::EMPTY;
        for (k, &x) in nodes.iter().enumerate() {
            let alls = self.data_alls(x);
            // Groups of ≥n restrictions are numbered apart per node.
            let (n, c, d) = self.data_problem(x, &alls, (k as u32) << 20);
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
        match datavalues::check_joint(
            &needs,
            &need_owner,
            &caps,
            &cap_owner,
            &pairs,
            &applies,
            DATA_BUDGET,
        ) {
            datavalues::Verdict::Sat => {
                self.g.key_checked = Some((latest, seen));
                false
            }
            datavalues::Verdict::Unsat => {
                self.set_clash(dep);
                true
            }
            datavalues::Verdict::Budget => {
                self.stopped = Some(Limit::DataValues);
                true
            }
        }
    }
}

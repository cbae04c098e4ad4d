//! Whether a node's data constraints with number restrictions have a model: the data values
//! a node needs, with ≥n and ≤n restrictions over data properties.
//!
//! Each ∃p.D needs one value in D, each ≥n p.D needs n pairwise distinct values in D; values
//! may coincide otherwise, and a model never needs more values than these. So the question is
//! whether the required values can be partitioned into classes (each class one literal) so
//! that every ≤m q.E counts at most m classes with a q-value in E, and the classes can get
//! pairwise distinct literals. The search enumerates partitions (the ≤-rule's merges), then
//! for each class decides membership in each E that it straddles (the choose-rule), and
//! checks distinctness by Hall's marriage condition on the classes with few candidate
//! literals (Hall 1935). This is the datatype checking of Motik & Horrocks, "OWL Datatypes:
//! Design and Implementation" (ISWC 2008), §4, specialised to our exact value spaces.
//!
//! [`check_joint`] asks the same question of several nodes at once, for keys over data
//! properties: each need and cap has an owner (a node), a cap counts only its owner's values,
//! and an [`Apart`] pair forbids one value from being a key property's value of both nodes.
//!
//! Disjoint data properties (OWL 2 Direct Semantics, §2.3.3, Table 8, `DisjointDataProperties`: no
//! individual has one literal as a value of two of them) forbid a class from holding values
//! of one owner for two properties under a disjoint pair, and a need whose property lies
//! under both properties of a pair from having any value.

use crate::kb::DataPropId;
use crate::kb::datarange::DataRange;
use std::collections::HashMap;

/// A value the node must have.
#[derive(Clone, Debug)]
pub struct Need {
    /// The data property it is a value of.
    pub prop: DataPropId,
    /// Where the value must lie (already cut by ranges and ∀ restrictions).
    pub range: DataRange,
    /// Values of one ≥n restriction are pairwise distinct; they share a group number.
    pub group: Option<u32>,
}

/// A ≤m q.E restriction at the node.
#[derive(Clone, Debug)]
pub struct Cap {
    /// The property q.
    pub prop: DataPropId,
    /// The range E.
    pub range: DataRange,
    /// The bound m.
    pub max: u32,
}

/// The outcome of the search.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Verdict {
    /// Some assignment of values satisfies everything.
    Sat,
    /// None does.
    Unsat,
    /// The work budget ran out first.
    Budget,
}

/// Two owners (nodes) whose values of `prop` (and of its sub-properties) must differ: the
/// alternative of a data key that keeps two named individuals apart. An owner apart from
/// itself may have no such value at all.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Apart {
    /// One owner.
    pub a: u32,
    /// The other owner.
    pub b: u32,
    /// The key's data property.
    pub prop: DataPropId,
}

/// What the search knows of the data properties.
#[derive(Clone, Copy)]
pub struct Props<'a> {
    /// `sub(p, q)`: p ⊑* q.
    pub sub: &'a dyn Fn(DataPropId, DataPropId) -> bool,
    /// Pairs of properties declared disjoint (in either order).
    pub disjoint: &'a [(DataPropId, DataPropId)],
}

struct Class {
    range: DataRange,
    groups: Vec<u32>,
    /// (owner, property) of the needs placed in the class, for the [`Apart`] pairs.
    members: Vec<(u32, DataPropId)>,
    /// Which caps apply (the class holds a value of a sub-property of the cap's property).
    caps: Vec<bool>,
}

struct Search<'a> {
    needs: &'a [Need],
    caps: &'a [Cap],
    /// The owner of each need and of each cap (all 0 for one node).
    need_owner: &'a [u32],
    cap_owner: &'a [u32],
    /// The [`Apart`] pairs by owners, in both orientations: the key properties.
    apart: HashMap<(u32, u32), Vec<DataPropId>>,
    applies: &'a dyn Fn(DataPropId, DataPropId) -> bool,
    disjoint: &'a [(DataPropId, DataPropId)],
    budget: u64,
}

/// Decides whether the needs and caps have a model under the property hierarchy and
/// disjointness of `props`. Works at most `budget` steps.
pub fn check(needs: &[Need], caps: &[Cap], props: Props, budget: u64) -> Verdict {
    check_joint(
        needs,
        &vec![0; needs.len()],
        caps,
        &vec![0; caps.len()],
        &[],
        props,
        budget,
    )
}

/// [`check`] over the needs and caps of several owners, `need_owner[i]` owning `needs[i]`
/// and `cap_owner[j]` owning `caps[j]`, with the [`Apart`] pairs; groups must be numbered
/// apart across owners. One value class is one literal shared by whichever owners have it.
pub fn check_joint(
    needs: &[Need],
    need_owner: &[u32],
    caps: &[Cap],
    cap_owner: &[u32],
    apart: &[Apart],
    props: Props,
    budget: u64,
) -> Verdict {
    if needs.iter().any(|n| n.range.is_empty()) {
        return Verdict::Unsat;
    }
    let mut by_owners: HashMap<(u32, u32), Vec<DataPropId>> = HashMap::new();
    for ap in apart {
        by_owners.entry((ap.a, ap.b)).or_default().push(ap.prop);
        if ap.a != ap.b {
            by_owners.entry((ap.b, ap.a)).or_default().push(ap.prop);
        }
    }
    let mut s = Search {
        needs,
        caps,
        need_owner,
        cap_owner,
        apart: by_owners,
        applies: props.sub,
        disjoint: props.disjoint,
        budget,
    };
    let mut classes = Vec::new();
    s.place(0, &mut classes)
}

impl Search<'_> {
    fn tick(&mut self) -> bool {
        if self.budget == 0 {
            return false;
        }
        self.budget -= 1;
        true
    }

    /// Whether a class holding `members` and the need (owner `o`, property `p`) would give one
    /// literal to two owners kept apart on a key property (or to an owner apart from itself).
    fn breaks_apart(&self, members: &[(u32, DataPropId)], o: u32, p: DataPropId) -> bool {
        if self.apart.is_empty() {
            return false;
        }
        let both = |ds: &Vec<DataPropId>, q: DataPropId| {
            ds.iter()
                .any(|&d| (self.applies)(p, d) && (self.applies)(q, d))
        };
        if self.apart.get(&(o, o)).is_some_and(|ds| both(ds, p)) {
            return true;
        }
        members
            .iter()
            .any(|&(w, q)| self.apart.get(&(o, w)).is_some_and(|ds| both(ds, q)))
    }

    /// Whether a class holding `members` and the need (owner `o`, property `p`) would give
    /// owner `o` one literal as a value of two disjoint properties (or `p` lies under both
    /// properties of a disjoint pair, so that it can have no value at all).
    fn breaks_disjoint(&self, members: &[(u32, DataPropId)], o: u32, p: DataPropId) -> bool {
        let sub = self.applies;
        self.disjoint.iter().any(|&(a, b)| {
            let (pa, pb) = (sub(p, a), sub(p, b));
            (pa && pb)
                || ((pa || pb)
                    && members
                        .iter()
                        .any(|&(w, q)| w == o && ((pa && sub(q, b)) || (pb && sub(q, a)))))
        })
    }

    /// Places need `i` into an existing class or a new one.
    fn place(&mut self, i: usize, classes: &mut Vec<Class>) -> Verdict {
        if !self.tick() {
            return Verdict::Budget;
        }
        if i == self.needs.len() {
            return self.choose(0, 0, classes);
        }
        let need = &self.needs[i];
        let owner = self.need_owner[i];
        let caps: Vec<bool> = self
            .caps
            .iter()
            .zip(self.cap_owner)
            .map(|(c, &o)| o == owner && (self.applies)(need.prop, c.prop))
            .collect();
        if self.breaks_apart(&[], owner, need.prop) || self.breaks_disjoint(&[], owner, need.prop) {
            return Verdict::Unsat;
        }
        let mut budget_hit = false;
        for k in 0..=classes.len() {
            let (range, saved) = if k < classes.len() {
                let c = &classes[k];
                if need.group.is_some_and(|g| c.groups.contains(&g))
                    || self.breaks_apart(&c.members, owner, need.prop)
                    || self.breaks_disjoint(&c.members, owner, need.prop)
                {
                    continue;
                }
                let r = c.range.intersect(&need.range);
                if r.is_empty() {
                    continue;
                }
                (r, Some((c.range.clone(), c.caps.clone())))
            } else {
                (need.range.clone(), None)
            };
            if k < classes.len() {
                let c = &mut classes[k];
                c.range = range;
                for (a, &b) in c.caps.iter_mut().zip(&caps) {
                    *a |= b;
                }
                c.groups.extend(need.group);
                c.members.push((owner, need.prop));
            } else {
                classes.push(Class {
                    range,
                    groups: need.group.into_iter().collect(),
                    members: vec![(owner, need.prop)],
                    caps: caps.clone(),
                });
            }
            let v = if self.forced_over(classes) {
                Verdict::Unsat
            } else {
                self.place(i + 1, classes)
            };
            match saved {
                Some((r, c)) => {
                    let cl = &mut classes[k];
                    cl.range = r;
                    cl.caps = c;
                    cl.members.pop();
                    if need.group.is_some() {
                        cl.groups.pop();
                    }
                }
                None => {
                    classes.pop();
                }
            }
            match v {
                Verdict::Sat => return Verdict::Sat,
                Verdict::Budget => budget_hit = true,
                Verdict::Unsat => {}
            }
        }
        if budget_hit {
            Verdict::Budget
        } else {
            Verdict::Unsat
        }
    }

    /// Whether some cap already counts more classes that lie wholly inside its range than it
    /// allows (merging more needs never lowers that number, so the branch is dead).
    fn forced_over(&self, classes: &[Class]) -> bool {
        self.caps.iter().enumerate().any(|(j, cap)| {
            let forced = classes
                .iter()
                .filter(|c| c.caps[j] && c.range.intersect(&cap.range.complement()).is_empty())
                .count();
            forced > cap.max as usize
        })
    }

    /// Decides, for class `k` and cap `j` onwards, whether the class's value lies in the
    /// cap's range, then checks the counts and distinctness.
    fn choose(&mut self, k: usize, j: usize, classes: &mut Vec<Class>) -> Verdict {
        if !self.tick() {
            return Verdict::Budget;
        }
        if k == classes.len() {
            return self.final_check(classes);
        }
        if j == self.caps.len() {
            return self.choose(k + 1, 0, classes);
        }
        if !classes[k].caps[j] {
            return self.choose(k, j + 1, classes);
        }
        let cap = &self.caps[j].range;
        let inside = classes[k].range.intersect(cap);
        let outside = classes[k].range.intersect(&cap.complement());
        let mut budget_hit = false;
        // Outside first: it counts against no cap.
        for part in [outside, inside] {
            if part.is_empty() {
                continue;
            }
            let saved = std::mem::replace(&mut classes[k].range, part);
            let v = self.choose(k, j + 1, classes);
            classes[k].range = saved;
            match v {
                Verdict::Sat => return Verdict::Sat,
                Verdict::Budget => budget_hit = true,
                Verdict::Unsat => {}
            }
        }
        if budget_hit {
            Verdict::Budget
        } else {
            Verdict::Unsat
        }
    }

    fn final_check(&mut self, classes: &[Class]) -> Verdict {
        // Every class now lies wholly inside or outside each cap it is subject to.
        for (j, cap) in self.caps.iter().enumerate() {
            let n = classes
                .iter()
                .filter(|c| c.caps[j] && !c.range.intersect(&cap.range).is_empty())
                .count();
            if n > cap.max as usize {
                return Verdict::Unsat;
            }
        }
        // Distinct literals: a class with more candidates than there are classes can always
        // avoid the others; the rest must satisfy Hall's condition.
        let n = classes.len() as u64;
        let small: Vec<&DataRange> = classes
            .iter()
            .filter(|c| c.range.count(n).is_some())
            .map(|c| &c.range)
            .collect();
        if small.len() > 16 {
            return Verdict::Budget;
        }
        for mask in 1u32..(1 << small.len()) {
            if !self.tick() {
                return Verdict::Budget;
            }
            let mut union = DataRange::empty();
            for (i, r) in small.iter().enumerate() {
                if mask & (1 << i) != 0 {
                    union = union.union(r);
                }
            }
            let need = u64::from(mask.count_ones());
            if union.count(need).is_some_and(|c| c < need) {
                return Verdict::Unsat;
            }
        }
        Verdict::Sat
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::kb::datatype::{literal, named, restrict};

    const XSD: &str = "http://www.w3.org/2001/XMLSchema#";

    fn p(i: u32) -> DataPropId {
        DataPropId(i)
    }

    fn need(prop: u32, r: &DataRange, group: Option<u32>) -> Need {
        Need {
            prop: p(prop),
            range: r.clone(),
            group,
        }
    }

    fn same(a: DataPropId, b: DataPropId) -> bool {
        a == b
    }

    /// No sub-properties, no disjointness.
    const PLAIN: Props<'static> = Props {
        sub: &same,
        disjoint: &[],
    };

    fn int_range(lo: &str, hi: &str) -> DataRange {
        let f = |n: &str, v: &str| {
            (
                format!("{XSD}{n}"),
                v.to_string(),
                Some(format!("{XSD}integer")),
                None,
            )
        };
        restrict(
            &format!("{XSD}integer"),
            &[f("minInclusive", lo), f("maxInclusive", hi)],
        )
        .unwrap()
    }

    #[test]
    fn at_least_needs_enough_values() {
        // ≥3 p.integer[1..2] has no model (two integers only); ≥2 p.integer[1..2] has one.
        let r = int_range("1", "2");
        let three: Vec<Need> = (0..3).map(|_| need(0, &r, Some(0))).collect();
        assert_eq!(check(&three, &[], PLAIN, 10_000), Verdict::Unsat);
        assert_eq!(check(&three[..2], &[], PLAIN, 10_000), Verdict::Sat);
        // ≥2 p.boolean holds; ≥3 p.boolean does not.
        let b = named(&format!("{XSD}boolean")).unwrap();
        let bs: Vec<Need> = (0..3).map(|_| need(0, &b, Some(0))).collect();
        assert_eq!(check(&bs, &[], PLAIN, 10_000), Verdict::Unsat);
        assert_eq!(check(&bs[..2], &[], PLAIN, 10_000), Verdict::Sat);
    }

    #[test]
    fn at_most_forces_merges() {
        // ∃p.{1} ⊓ ∃p.integer[1..5] ⊓ ≤1 p: both values must be 1 (merge): satisfiable.
        let one = literal("1", Some(&format!("{XSD}integer")), None).unwrap();
        let needs = [need(0, &one, None), need(0, &int_range("1", "5"), None)];
        let cap = |m, r: &DataRange| Cap {
            prop: p(0),
            range: r.clone(),
            max: m,
        };
        let all = DataRange::everything();
        assert_eq!(check(&needs, &[cap(1, &all)], PLAIN, 10_000), Verdict::Sat);
        // With ∃p.integer[2..5] instead, ≤1 p cannot hold.
        let needs2 = [need(0, &one, None), need(0, &int_range("2", "5"), None)];
        assert_eq!(
            check(&needs2, &[cap(1, &all)], PLAIN, 10_000),
            Verdict::Unsat
        );
        // ≤0 p.integer[3..9] with ∃p.integer[2..5]: the value can be 2.
        let c = cap(0, &int_range("3", "9"));
        assert_eq!(
            check(&needs2[1..], std::slice::from_ref(&c), PLAIN, 10_000),
            Verdict::Sat
        );
        // ≥2 p.integer[2..5] with ≤1 p.integer[3..9]: 2 and one of 3..5: fine; with
        // ≥2 p.integer[3..5]: both in [3..9]: no.
        let two: Vec<Need> = (0..2)
            .map(|_| need(0, &int_range("3", "5"), Some(0)))
            .collect();
        let c1 = cap(1, &int_range("3", "9"));
        assert_eq!(check(&two, &[c1], PLAIN, 10_000), Verdict::Unsat);
    }

    #[test]
    fn apart_owners_take_different_values() {
        // Hand-derived. Owner 0 needs a p-value in {1}, owner 1 one in [1..2]: kept apart on
        // p, owner 1 takes 2. With [1..1] for both there is no model; with owner 1's value a
        // q-value (q not under p) the two may share 1.
        let one = literal("1", Some(&format!("{XSD}integer")), None).unwrap();
        let needs = [need(0, &one, None), need(0, &int_range("1", "2"), None)];
        let apart = [Apart {
            a: 0,
            b: 1,
            prop: p(0),
        }];
        let joint = |needs: &[Need], apart: &[Apart]| {
            check_joint(needs, &[0, 1], &[], &[], apart, PLAIN, 10_000)
        };
        assert_eq!(joint(&needs, &apart), Verdict::Sat);
        let tight = [need(0, &one, None), need(0, &one, None)];
        assert_eq!(joint(&tight, &apart), Verdict::Unsat);
        assert_eq!(joint(&tight, &[]), Verdict::Sat);
        let other = [need(0, &one, None), need(1, &one, None)];
        assert_eq!(joint(&other, &apart), Verdict::Sat);
        // A cap counts only its owner's values: owner 0 with ≤1 p and two needs 1 and [1..2]
        // merges them into 1; owner 1's value 2 is not counted against it.
        let caps = [Cap {
            prop: p(0),
            range: DataRange::everything(),
            max: 1,
        }];
        let three = [
            need(0, &one, None),
            need(0, &int_range("1", "2"), None),
            need(0, &int_range("2", "2"), None),
        ];
        let v = check_joint(&three, &[0, 0, 1], &caps, &[0], &apart, PLAIN, 10_000);
        assert_eq!(v, Verdict::Sat);
        // An owner apart from itself has no p-value.
        let selfish = [Apart {
            a: 0,
            b: 0,
            prop: p(0),
        }];
        assert_eq!(
            check_joint(&needs[..1], &[0], &[], &[], &selfish, PLAIN, 10_000),
            Verdict::Unsat
        );
    }

    /// p0 and p1 disjoint; p2 ⊑ p0; p3 ⊑ p0 and p3 ⊑ p1; p0, p1 ⊑ p4.
    fn hierarchy(a: DataPropId, b: DataPropId) -> bool {
        a == b
            || matches!(
                (a.0, b.0),
                (2, 0) | (3, 0) | (3, 1) | (0, 4) | (1, 4) | (2, 4) | (3, 4)
            )
    }

    const DISJOINT: Props<'static> = Props {
        sub: &hierarchy,
        disjoint: &[(DataPropId(0), DataPropId(1))],
    };

    #[test]
    fn disjoint_properties_take_different_values() {
        // Hand-derived from the OWL 2 Direct Semantics, Table 8 (DisjointDataProperties:
        // (DP1)^DP ∩ (DP2)^DP = ∅). p0 = 1 and p1 = 1 at one node share the pair (x, 1): no
        // model; p1 in [1..2] can take 2. Without the disjointness both hold.
        let one = literal("1", Some(&format!("{XSD}integer")), None).unwrap();
        let same_one = [need(0, &one, None), need(1, &one, None)];
        assert_eq!(check(&same_one, &[], DISJOINT, 10_000), Verdict::Unsat);
        assert_eq!(check(&same_one, &[], PLAIN, 10_000), Verdict::Sat);
        let wider = [need(0, &one, None), need(1, &int_range("1", "2"), None)];
        assert_eq!(check(&wider, &[], DISJOINT, 10_000), Verdict::Sat);
        // Sub-properties inherit it: a p2-value is a p0-value.
        let sub = [need(2, &one, None), need(1, &one, None)];
        assert_eq!(check(&sub, &[], DISJOINT, 10_000), Verdict::Unsat);
        // p3 lies under both: any p3-value would be shared, so p3 has none.
        let all = DataRange::everything();
        assert_eq!(
            check(&[need(3, &all, None)], &[], DISJOINT, 10_000),
            Verdict::Unsat
        );
        // Two values of p0 alone are no conflict.
        let own = [need(0, &one, None), need(0, &one, None)];
        assert_eq!(check(&own, &[], DISJOINT, 10_000), Verdict::Sat);
        // A cap that forces a merge: ≤1 p4 over a p0- and a p1-value, both would be the
        // one p4-value, which the disjointness forbids.
        let cap = [Cap {
            prop: p(4),
            range: all.clone(),
            max: 1,
        }];
        let two = [need(0, &all, None), need(1, &all, None)];
        assert_eq!(check(&two, &cap, DISJOINT, 10_000), Verdict::Unsat);
        assert_eq!(check(&two, &[], DISJOINT, 10_000), Verdict::Sat);
    }

    #[test]
    fn disjoint_properties_count_values() {
        // Hand-derived: ≥2 p0.D ⊓ ≥2 p1.D needs four distinct values in D, since no value can
        // serve both; D = integer[1..3] has three, integer[1..4] four.
        for (hi, want) in [("3", Verdict::Unsat), ("4", Verdict::Sat)] {
            let d = int_range("1", hi);
            let needs = [
                need(0, &d, Some(0)),
                need(0, &d, Some(0)),
                need(1, &d, Some(1)),
                need(1, &d, Some(1)),
            ];
            assert_eq!(check(&needs, &[], DISJOINT, 10_000), want, "D = [1..{hi}]");
        }
    }

    #[test]
    fn disjointness_binds_one_owner_only() {
        // Hand-derived: owner 0's p0-value and owner 1's p1-value may be one literal; the
        // disjointness speaks of one individual's values.
        let one = literal("1", Some(&format!("{XSD}integer")), None).unwrap();
        let needs = [need(0, &one, None), need(1, &one, None)];
        let v = check_joint(&needs, &[0, 1], &[], &[], &[], DISJOINT, 10_000);
        assert_eq!(v, Verdict::Sat);
        let v = check_joint(&needs, &[0, 0], &[], &[], &[], DISJOINT, 10_000);
        assert_eq!(v, Verdict::Unsat);
    }

    #[test]
    fn distinct_strings_by_hall() {
        // Two distinct values in {"a"} ∪ {"b"} exist; three do not.
        let ab = literal("a", None, None)
            .unwrap()
            .union(&literal("b", None, None).unwrap());
        let needs: Vec<Need> = (0..3).map(|_| need(0, &ab, Some(0))).collect();
        assert_eq!(check(&needs, &[], PLAIN, 10_000), Verdict::Unsat);
        assert_eq!(check(&needs[..2], &[], PLAIN, 10_000), Verdict::Sat);
    }
}

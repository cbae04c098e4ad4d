//! Dependency sets for dependency-directed backjumping (DL Handbook ch. 9, §9.5.2.3):
//! each label entry records the branching points it depends on. Sets are interned so that a
//! label entry carries a `Dep` of four bytes and unions are memoised.

use std::collections::HashMap;

/// An interned set of branching levels.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct Dep(pub u32);

impl Dep {
    /// The empty set: depends on no choice.
    pub const EMPTY: Dep = Dep(0);
}

/// The table of interned sets.
#[derive(Debug)]
pub struct DepTable {
    sets: Vec<Vec<u32>>,
    ids: HashMap<Vec<u32>, Dep>,
    unions: HashMap<(Dep, Dep), Dep>,
}

impl Default for DepTable {
    fn default() -> Self {
        let mut t = DepTable {
            sets: Vec::new(),
            ids: HashMap::new(),
            unions: HashMap::new(),
        };
        t.intern(Vec::new());
        t
    }
}

impl DepTable {
    fn intern(&mut self, v: Vec<u32>) -> Dep {
        if let Some(&d) = self.ids.get(&v) {
            return d;
        }
        let d = Dep(self.sets.len() as u32);
        self.sets.push(v.clone());
        self.ids.insert(v, d);
        d
    }

    /// The set holding one level.
    pub fn single(&mut self, level: u32) -> Dep {
        self.intern(vec![level])
    }

    /// The levels of a set, ascending.
    pub fn levels(&self, d: Dep) -> &[u32] {
        &self.sets[d.0 as usize]
    }

    /// Union of two sets.
    pub fn union(&mut self, a: Dep, b: Dep) -> Dep {
        if a == b || b == Dep::EMPTY {
            return a;
        }
        if a == Dep::EMPTY {
            return b;
        }
        let key = if a < b { (a, b) } else { (b, a) };
        if let Some(&d) = self.unions.get(&key) {
            return d;
        }
        let (x, y) = (&self.sets[a.0 as usize], &self.sets[b.0 as usize]);
        let mut v = Vec::with_capacity(x.len() + y.len());
        let (mut i, mut j) = (0, 0);
        while i < x.len() || j < y.len() {
            if j == y.len() || (i < x.len() && x[i] < y[j]) {
                v.push(x[i]);
                i += 1;
            } else if i == x.len() || y[j] < x[i] {
                v.push(y[j]);
                j += 1;
            } else {
                v.push(x[i]);
                i += 1;
                j += 1;
            }
        }
        let d = self.intern(v);
        self.unions.insert(key, d);
        d
    }

    /// Whether a set holds a level.
    pub fn contains(&self, d: Dep, level: u32) -> bool {
        self.levels(d).binary_search(&level).is_ok()
    }

    /// The set without a level.
    pub fn remove(&mut self, d: Dep, level: u32) -> Dep {
        let v: Vec<u32> = self
            .levels(d)
            .iter()
            .copied()
            .filter(|&l| l != level)
            .collect();
        self.intern(v)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn unions_are_sets() {
        let mut t = DepTable::default();
        let a = t.single(3);
        let b = t.single(1);
        let ab = t.union(a, b);
        assert_eq!(t.levels(ab), &[1, 3]);
        assert_eq!(t.union(ab, a), ab);
        assert!(t.contains(ab, 3));
        let r = t.remove(ab, 3);
        assert_eq!(r, b);
    }
}

//! Numeric data ranges: unions of intervals over the value spaces of OWL 2's numeric types.
//!
//! OWL 2 (Structural Specification §4) gives xsd:decimal (with xsd:integer inside it),
//! xsd:double and xsd:float disjoint value spaces. A range is a finite union of interval
//! pieces in each space, closed under intersection and complement, so emptiness is decidable.
//! Every other literal (strings, dates…) falls into one infinite "other" space, which only
//! rdfs:Literal and complements reach. Numbers are held as `f64`; decimals beyond its precision
//! are rounded (documented limit).

use std::collections::HashMap;

/// Index of an interned data range.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct DataRangeId(pub u32);

/// One of the numeric value spaces.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Space {
    /// xsd:decimal, xsd:integer and its subtypes, owl:real, owl:rational.
    Decimal = 0,
    /// xsd:double.
    Double = 1,
    /// xsd:float.
    Float = 2,
}

/// Which numbers of an interval a piece keeps (integers only matter in the decimal space).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Kind {
    /// Every number in the interval.
    Any,
    /// Only the integers in the interval.
    Int,
    /// Only the non-integers in the interval.
    NonInt,
}

/// A bound of an interval: the value and whether it is included.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Bound {
    /// The bounding value, possibly infinite.
    pub value: f64,
    /// Whether the value itself belongs to the interval.
    pub inclusive: bool,
}

/// An interval of one value space, restricted by [`Kind`].
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Piece {
    /// Lower bound.
    pub lo: Bound,
    /// Upper bound.
    pub hi: Bound,
    /// Integers, non-integers or both.
    pub kind: Kind,
}

const NEG_INF: Bound = Bound {
    value: f64::NEG_INFINITY,
    inclusive: false,
};
const POS_INF: Bound = Bound {
    value: f64::INFINITY,
    inclusive: false,
};

impl Piece {
    /// The whole space.
    pub fn full(kind: Kind) -> Piece {
        Piece {
            lo: NEG_INF,
            hi: POS_INF,
            kind,
        }
    }

    /// A single value.
    pub fn point(v: f64) -> Piece {
        let b = Bound {
            value: v,
            inclusive: true,
        };
        Piece {
            lo: b,
            hi: b,
            kind: Kind::Any,
        }
    }

    fn intersect(&self, o: &Piece) -> Option<Piece> {
        let kind = match (self.kind, o.kind) {
            (Kind::Any, k) | (k, Kind::Any) => k,
            (a, b) if a == b => a,
            _ => return None,
        };
        let lo =
            if self.lo.value > o.lo.value || (self.lo.value == o.lo.value && !self.lo.inclusive) {
                self.lo
            } else {
                o.lo
            };
        let hi =
            if self.hi.value < o.hi.value || (self.hi.value == o.hi.value && !self.hi.inclusive) {
                self.hi
            } else {
                o.hi
            };
        let p = Piece { lo, hi, kind };
        if p.is_empty() { None } else { Some(p) }
    }

    /// Whether no number of the space lies in the piece.
    pub fn is_empty(&self) -> bool {
        let (lo, hi) = (self.lo, self.hi);
        if lo.value > hi.value {
            return true;
        }
        if lo.value == hi.value && !(lo.inclusive && hi.inclusive) {
            return true;
        }
        match self.kind {
            Kind::Any => false,
            Kind::Int => {
                // Smallest integer inside the lower bound, compared to the upper bound.
                let first = if lo.value.is_infinite() {
                    return hi.value.is_infinite() && hi.value < 0.0;
                } else if lo.value.fract() == 0.0 && lo.inclusive {
                    lo.value
                } else {
                    lo.value.floor() + 1.0
                };
                if hi.value.is_infinite() {
                    return false;
                }
                first > hi.value || (first == hi.value && !hi.inclusive)
            }
            Kind::NonInt => lo.value == hi.value && lo.value.fract() == 0.0,
        }
    }

    /// The complement of the piece within its space, as up to three pieces.
    fn complement(&self) -> Vec<Piece> {
        let mut out = Vec::new();
        if self.lo.value != f64::NEG_INFINITY {
            out.push(Piece {
                lo: NEG_INF,
                hi: Bound {
                    value: self.lo.value,
                    inclusive: !self.lo.inclusive,
                },
                kind: Kind::Any,
            });
        }
        if self.hi.value != f64::INFINITY {
            out.push(Piece {
                lo: Bound {
                    value: self.hi.value,
                    inclusive: !self.hi.inclusive,
                },
                hi: POS_INF,
                kind: Kind::Any,
            });
        }
        match self.kind {
            Kind::Any => {}
            Kind::Int => out.push(Piece {
                kind: Kind::NonInt,
                ..*self
            }),
            Kind::NonInt => out.push(Piece {
                kind: Kind::Int,
                ..*self
            }),
        }
        out.retain(|p| !p.is_empty());
        out
    }
}

/// A data range: a union of pieces in each numeric space, plus possibly every other literal.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct DataRange {
    /// Pieces per [`Space`], indexed by `Space as usize`.
    pub spaces: [Vec<Piece>; 3],
    /// Whether the range holds every non-numeric literal.
    pub other: bool,
}

impl DataRange {
    /// The empty range.
    pub fn empty() -> DataRange {
        DataRange::default()
    }

    /// rdfs:Literal: every literal.
    pub fn everything() -> DataRange {
        DataRange {
            spaces: [
                vec![Piece::full(Kind::Any)],
                vec![Piece::full(Kind::Any)],
                vec![Piece::full(Kind::Any)],
            ],
            other: true,
        }
    }

    /// A whole space, restricted by kind.
    pub fn space(space: Space, kind: Kind) -> DataRange {
        let mut r = DataRange::empty();
        r.spaces[space as usize].push(Piece::full(kind));
        r
    }

    /// One piece in one space.
    pub fn piece(space: Space, p: Piece) -> DataRange {
        let mut r = DataRange::empty();
        if !p.is_empty() {
            r.spaces[space as usize].push(p);
        }
        r
    }

    /// Whether the range holds no literal at all.
    pub fn is_empty(&self) -> bool {
        !self.other && self.spaces.iter().all(|s| s.iter().all(Piece::is_empty))
    }

    /// Intersection.
    pub fn intersect(&self, o: &DataRange) -> DataRange {
        let mut r = DataRange {
            other: self.other && o.other,
            ..Default::default()
        };
        for s in 0..3 {
            for a in &self.spaces[s] {
                for b in &o.spaces[s] {
                    if let Some(p) = a.intersect(b) {
                        r.spaces[s].push(p);
                    }
                }
            }
        }
        r.simplify();
        r
    }

    /// Union.
    pub fn union(&self, o: &DataRange) -> DataRange {
        let mut r = self.clone();
        r.other |= o.other;
        for s in 0..3 {
            r.spaces[s].extend(o.spaces[s].iter().copied());
        }
        r.simplify();
        r
    }

    /// Complement with respect to all literals.
    pub fn complement(&self) -> DataRange {
        let mut r = DataRange {
            other: !self.other,
            ..Default::default()
        };
        for s in 0..3 {
            // Complement of a union is the intersection of the pieces' complements.
            let mut acc = vec![Piece::full(Kind::Any)];
            for p in &self.spaces[s] {
                let comp = p.complement();
                let mut next = Vec::new();
                for a in &acc {
                    for b in &comp {
                        if let Some(x) = a.intersect(b) {
                            next.push(x);
                        }
                    }
                }
                acc = next;
            }
            r.spaces[s] = acc;
        }
        r.simplify();
        r
    }

    fn simplify(&mut self) {
        for s in self.spaces.iter_mut() {
            s.retain(|p| !p.is_empty());
            s.sort_by(|a, b| {
                (
                    a.lo.value,
                    !a.lo.inclusive,
                    a.hi.value,
                    a.hi.inclusive,
                    a.kind as u8,
                )
                    .partial_cmp(&(
                        b.lo.value,
                        !b.lo.inclusive,
                        b.hi.value,
                        b.hi.inclusive,
                        b.kind as u8,
                    ))
                    .unwrap_or(std::cmp::Ordering::Equal)
            });
            s.dedup();
        }
    }

    fn key(&self) -> String {
        format!("{:?}", self)
    }
}

/// Interned data ranges with their complements.
#[derive(Clone, Debug, Default)]
pub struct DataRangeStore {
    ranges: Vec<DataRange>,
    ids: HashMap<String, DataRangeId>,
}

impl DataRangeStore {
    /// Interns a range.
    pub fn intern(&mut self, r: DataRange) -> DataRangeId {
        let k = r.key();
        if let Some(&id) = self.ids.get(&k) {
            return id;
        }
        let id = DataRangeId(self.ranges.len() as u32);
        self.ranges.push(r);
        self.ids.insert(k, id);
        id
    }

    /// The range behind an id.
    pub fn get(&self, id: DataRangeId) -> &DataRange {
        &self.ranges[id.0 as usize]
    }

    /// Interns the complement of a range.
    pub fn complement(&mut self, id: DataRangeId) -> DataRangeId {
        let c = self.get(id).complement();
        self.intern(c)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn int_range(lo: f64, lo_inc: bool, hi: f64, hi_inc: bool) -> DataRange {
        DataRange::piece(
            Space::Decimal,
            Piece {
                lo: Bound {
                    value: lo,
                    inclusive: lo_inc,
                },
                hi: Bound {
                    value: hi,
                    inclusive: hi_inc,
                },
                kind: Kind::Int,
            },
        )
    }

    #[test]
    fn integer_gaps() {
        // xsd:integer restricted to (3, 4) is empty; [3, 4) holds 3 (XML Schema 2 facet semantics).
        assert!(int_range(3.0, false, 4.0, false).is_empty());
        assert!(!int_range(3.0, true, 4.0, false).is_empty());
        assert!(!int_range(2.5, false, 3.5, false).is_empty());
        assert!(int_range(2.1, true, 2.9, true).is_empty());
    }

    #[test]
    fn decimal_is_dense() {
        let d = DataRange::piece(
            Space::Decimal,
            Piece {
                lo: Bound {
                    value: 3.0,
                    inclusive: false,
                },
                hi: Bound {
                    value: 4.0,
                    inclusive: false,
                },
                kind: Kind::Any,
            },
        );
        assert!(!d.is_empty());
        // The non-integers of (3, 4) are all of it, so integer ∩ (3,4) is empty.
        assert!(
            d.intersect(&DataRange::space(Space::Decimal, Kind::Int))
                .is_empty()
        );
    }

    #[test]
    fn complement_laws() {
        let a = int_range(0.0, true, 10.0, true);
        let c = a.complement();
        assert!(a.intersect(&c).is_empty());
        assert!(
            c.complement()
                .intersect(&a.complement())
                .intersect(&a)
                .is_empty()
        );
        // 5.5 is in the complement (non-integer), 5 is not.
        assert!(
            !c.intersect(&DataRange::piece(Space::Decimal, Piece::point(5.5)))
                .is_empty()
        );
        assert!(
            c.intersect(&DataRange::piece(Space::Decimal, Piece::point(5.0)))
                .is_empty()
        );
        // Doubles and decimals are disjoint value spaces (OWL 2 Structural Specification §4.2).
        let dbl = DataRange::space(Space::Double, Kind::Any);
        assert!(
            dbl.intersect(&DataRange::space(Space::Decimal, Kind::Any))
                .is_empty()
        );
        assert!(!dbl.intersect(&c).is_empty());
    }
}

//! Sets of IEEE 754 values (xsd:double, xsd:float) as unions of ranges of ordinals.
//!
//! The value spaces of xsd:double and xsd:float are finite (OWL 2 Structural Specification
//! §4.2, XSD 1.1 §3.3.5–6): each non-NaN value has an ordinal, the position in the total
//! order of values with −0 just below +0, so a set is a sorted list of disjoint ordinal
//! ranges plus a flag for NaN. Emptiness and counting are then exact, including open
//! intervals between adjacent values. Facets compare numerically, so −0 and +0 both satisfy
//! `minInclusive 0`, yet they are distinct values; NaN satisfies no bound.

/// Which of the two IEEE types.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Width {
    /// xsd:double (binary64).
    Double,
    /// xsd:float (binary32).
    Float,
}

/// A set of values of one IEEE type.
#[derive(Clone, Debug, Default, PartialEq, Eq, Hash)]
pub struct FloatSet {
    /// Disjoint, sorted, non-adjacent inclusive ordinal ranges.
    pub ranges: Vec<(i64, i64)>,
    /// Whether NaN is in the set.
    pub nan: bool,
}

/// The ordinal of a non-NaN value of the given width.
pub fn ordinal(w: Width, v: f64) -> i64 {
    match w {
        Width::Double => {
            let b = v.to_bits() as i64;
            if b < 0 { -(b & i64::MAX) - 1 } else { b }
        }
        Width::Float => {
            let b = (v as f32).to_bits() as i32 as i64;
            if b < 0 { -(b & i32::MAX as i64) - 1 } else { b }
        }
    }
}

/// The value at an ordinal.
pub fn value(w: Width, o: i64) -> f64 {
    match w {
        Width::Double => {
            let b = if o < 0 { (-(o + 1)) | i64::MIN } else { o };
            f64::from_bits(b as u64)
        }
        Width::Float => {
            let b = if o < 0 {
                ((-(o + 1)) as i32) | i32::MIN
            } else {
                o as i32
            };
            f32::from_bits(b as u32) as f64
        }
    }
}

fn limits(w: Width) -> (i64, i64) {
    (ordinal(w, f64::NEG_INFINITY), ordinal(w, f64::INFINITY))
}

impl FloatSet {
    /// Every value of the type, NaN included.
    pub fn full(w: Width) -> FloatSet {
        let (lo, hi) = limits(w);
        FloatSet {
            ranges: vec![(lo, hi)],
            nan: true,
        }
    }

    /// One value.
    pub fn point(w: Width, v: f64) -> FloatSet {
        if v.is_nan() {
            return FloatSet {
                ranges: vec![],
                nan: true,
            };
        }
        let o = ordinal(w, v);
        FloatSet {
            ranges: vec![(o, o)],
            nan: false,
        }
    }

    /// The values x with x ≥ v (or x > v when not inclusive), compared numerically.
    pub fn at_least(w: Width, v: f64, inclusive: bool) -> FloatSet {
        let (_, top) = limits(w);
        if v.is_nan() {
            return FloatSet::default();
        }
        let lo = if v == 0.0 {
            if inclusive {
                ordinal(w, -0.0)
            } else {
                ordinal(w, 0.0) + 1
            }
        } else {
            ordinal(w, v) + i64::from(!inclusive)
        };
        FloatSet::from_ranges(vec![(lo, top)])
    }

    /// The values x with x ≤ v (or x < v when not inclusive), compared numerically.
    pub fn at_most(w: Width, v: f64, inclusive: bool) -> FloatSet {
        let (bottom, _) = limits(w);
        if v.is_nan() {
            return FloatSet::default();
        }
        let hi = if v == 0.0 {
            if inclusive {
                ordinal(w, 0.0)
            } else {
                ordinal(w, -0.0) - 1
            }
        } else {
            ordinal(w, v) - i64::from(!inclusive)
        };
        FloatSet::from_ranges(vec![(bottom, hi)])
    }

    fn from_ranges(mut r: Vec<(i64, i64)>) -> FloatSet {
        r.retain(|&(a, b)| a <= b);
        r.sort_unstable();
        let mut out: Vec<(i64, i64)> = Vec::with_capacity(r.len());
        for (a, b) in r {
            match out.last_mut() {
                Some(l) if a <= l.1.saturating_add(1) => l.1 = l.1.max(b),
                _ => out.push((a, b)),
            }
        }
        FloatSet {
            ranges: out,
            nan: false,
        }
    }

    /// Whether the set is empty.
    pub fn is_empty(&self) -> bool {
        self.ranges.is_empty() && !self.nan
    }

    /// Union.
    pub fn union(&self, o: &FloatSet) -> FloatSet {
        let mut s = FloatSet::from_ranges(self.ranges.iter().chain(&o.ranges).copied().collect());
        s.nan = self.nan || o.nan;
        s
    }

    /// Intersection.
    pub fn intersect(&self, o: &FloatSet) -> FloatSet {
        let mut r = Vec::new();
        let (mut i, mut j) = (0, 0);
        while i < self.ranges.len() && j < o.ranges.len() {
            let (a, b) = self.ranges[i];
            let (c, d) = o.ranges[j];
            let (lo, hi) = (a.max(c), b.min(d));
            if lo <= hi {
                r.push((lo, hi));
            }
            if b < d { i += 1 } else { j += 1 }
        }
        let mut s = FloatSet::from_ranges(r);
        s.nan = self.nan && o.nan;
        s
    }

    /// Complement within the type.
    pub fn complement(&self, w: Width) -> FloatSet {
        let (bottom, top) = limits(w);
        let mut r = Vec::new();
        let mut next = bottom;
        for &(a, b) in &self.ranges {
            if a > next {
                r.push((next, a - 1));
            }
            next = b + 1;
        }
        if next <= top {
            r.push((next, top));
        }
        let mut s = FloatSet::from_ranges(r);
        s.nan = !self.nan;
        s
    }

    /// Number of values, `None` above `cap`.
    pub fn count(&self, cap: u64) -> Option<u64> {
        let mut n = u64::from(self.nan);
        for &(a, b) in &self.ranges {
            n = n.checked_add((b - a + 1) as u64)?;
        }
        (n <= cap).then_some(n)
    }
}

/// Parses an xsd:double or xsd:float lexical form (XSD 1.1 §3.3.5:
/// (\+|-)?([0-9]+(\.[0-9]*)?|\.[0-9]+)([Ee](\+|-)?[0-9]+)?|(\+|-)?INF|NaN), rounded to the
/// nearest value of the width.
pub fn parse(w: Width, s: &str) -> Option<f64> {
    match s {
        "INF" | "+INF" => return Some(f64::INFINITY),
        "-INF" => return Some(f64::NEG_INFINITY),
        "NaN" => return Some(f64::NAN),
        _ => {}
    }
    let body = s.strip_prefix(['+', '-']).unwrap_or(s);
    let (mant, exp) = match body.find(['e', 'E']) {
        Some(i) => (&body[..i], Some(&body[i + 1..])),
        None => (body, None),
    };
    let (i, f) = mant.split_once('.').unwrap_or((mant, ""));
    let digits_ok = |t: &str| t.bytes().all(|b| b.is_ascii_digit());
    if (i.is_empty() && f.is_empty()) || !digits_ok(i) || !digits_ok(f) {
        return None;
    }
    if let Some(e) = exp {
        let e = e.strip_prefix(['+', '-']).unwrap_or(e);
        if e.is_empty() || !digits_ok(e) {
            return None;
        }
    }
    match w {
        Width::Double => s.parse::<f64>().ok(),
        Width::Float => s.parse::<f32>().ok().map(f64::from),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ordinals_round_trip_and_order() {
        for w in [Width::Double, Width::Float] {
            for v in [-1.5, -0.0, 0.0, 1e-30, 3.25, f64::INFINITY] {
                let v = if w == Width::Float {
                    v as f32 as f64
                } else {
                    v
                };
                assert_eq!(value(w, ordinal(w, v)).to_bits(), v.to_bits());
            }
            assert_eq!(ordinal(w, -0.0) + 1, ordinal(w, 0.0));
            assert!(ordinal(w, -1.0) < ordinal(w, 1e-30));
        }
    }

    #[test]
    fn open_interval_between_neighbours_is_empty() {
        // Hand-derived: no float lies strictly between 1 and the next float up.
        let w = Width::Float;
        let next = value(w, ordinal(w, 1.0) + 1);
        let s = FloatSet::at_least(w, 1.0, false).intersect(&FloatSet::at_most(w, next, false));
        assert!(s.is_empty());
        // As doubles the same interval holds 2^29 − 1 values (52 − 23 more mantissa bits).
        let d = Width::Double;
        let s = FloatSet::at_least(d, 1.0, false).intersect(&FloatSet::at_most(d, next, false));
        assert_eq!(s.count(u64::MAX), Some((1 << 29) - 1));
    }

    #[test]
    fn zeros_and_nan() {
        let w = Width::Double;
        // minInclusive 0 ∩ maxInclusive 0 holds −0 and +0 (equal by order, distinct values).
        let z = FloatSet::at_least(w, 0.0, true).intersect(&FloatSet::at_most(w, 0.0, true));
        assert_eq!(z.count(10), Some(2));
        let full = FloatSet::full(w);
        let c = z.complement(w);
        assert!(c.nan && c.intersect(&z).is_empty() && c.union(&z) == full);
        assert!(parse(w, "1e").is_none() && parse(w, "inf").is_none());
        assert_eq!(parse(Width::Float, "0.1"), Some(0.1f32 as f64));
    }
}

//! Exact sets over owl:real: unions of intervals with rational bounds, each restricted to
//! some of the four strata integer, decimal non-integer, rational non-decimal, irrational.
//!
//! OWL 2 (Structural Specification §4.1) nests the value spaces xsd:integer ⊂ xsd:decimal ⊂
//! owl:rational ⊂ owl:real. Splitting the reals into the four disjoint strata makes every
//! boolean combination of these types and of interval facets a finite union of
//! (interval, strata) pieces; all strata but the integers are dense, so emptiness and
//! counting are exact with rational arithmetic (no floating-point rounding).

use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Signed, Zero};
use std::cmp::Ordering;

/// Stratum bit: the integers.
pub const INT: u8 = 1;
/// Stratum bit: decimals that are not integers.
pub const DEC: u8 = 2;
/// Stratum bit: rationals that are not decimals (1/3).
pub const RAT: u8 = 4;
/// Stratum bit: irrational reals (owl:real only; no literal names one).
pub const IRR: u8 = 8;
/// All of owl:real.
pub const REAL: u8 = INT | DEC | RAT | IRR;

/// A bound: `None` is infinite; otherwise the value and whether it is included.
pub type RBound = Option<(BigRational, bool)>;

/// An interval restricted to a set of strata.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct RPiece {
    /// Lower bound (`None`: −∞).
    pub lo: RBound,
    /// Upper bound (`None`: +∞).
    pub hi: RBound,
    /// Strata kept (bits [`INT`], [`DEC`], [`RAT`], [`IRR`]).
    pub mask: u8,
}

/// The stratum of a rational number.
pub fn stratum(v: &BigRational) -> u8 {
    if v.is_integer() {
        return INT;
    }
    // A fraction in lowest terms is a finite decimal iff its denominator is 2^a·5^b.
    let mut d = v.denom().clone();
    for p in [2u32, 5] {
        let p = BigInt::from(p);
        while (&d % &p).is_zero() {
            d /= &p;
        }
    }
    if d.is_one() { DEC } else { RAT }
}

fn cmp_lo(a: &RBound, b: &RBound) -> Ordering {
    match (a, b) {
        (None, None) => Ordering::Equal,
        (None, _) => Ordering::Less,
        (_, None) => Ordering::Greater,
        // At the same value an inclusive lower bound starts earlier.
        (Some((x, xi)), Some((y, yi))) => x.cmp(y).then(yi.cmp(xi)),
    }
}

fn cmp_hi(a: &RBound, b: &RBound) -> Ordering {
    match (a, b) {
        (None, None) => Ordering::Equal,
        (None, _) => Ordering::Greater,
        (_, None) => Ordering::Less,
        (Some((x, xi)), Some((y, yi))) => x.cmp(y).then(xi.cmp(yi)),
    }
}

impl RPiece {
    /// The strata `mask` over the whole line.
    pub fn full(mask: u8) -> RPiece {
        RPiece {
            lo: None,
            hi: None,
            mask,
        }
    }

    /// A single value.
    pub fn point(v: BigRational) -> RPiece {
        RPiece {
            lo: Some((v.clone(), true)),
            hi: Some((v, true)),
            mask: REAL,
        }
    }

    /// Whether the piece holds no real number.
    pub fn is_empty(&self) -> bool {
        self.count(1) == Some(0)
    }

    /// How many numbers the piece holds: `Some(n)` when finite and at most `cap`, `None`
    /// when infinite or more than `cap` (callers only compare with small numbers).
    pub fn count(&self, cap: u64) -> Option<u64> {
        if self.mask == 0 {
            return Some(0);
        }
        if let (Some((l, li)), Some((h, hi))) = (&self.lo, &self.hi) {
            match l.cmp(h) {
                Ordering::Greater => return Some(0),
                Ordering::Equal => {
                    let keep = *li && *hi && self.mask & stratum(l) != 0;
                    return Some(keep as u64);
                }
                Ordering::Less => {}
            }
        }
        if self.mask & (DEC | RAT | IRR) != 0 {
            // A proper interval holds infinitely many numbers of each dense stratum.
            return None;
        }
        // Integers only.
        let (Some((l, li)), Some((h, hi))) = (&self.lo, &self.hi) else {
            return None;
        };
        let mut first = l.ceil().to_integer();
        if !li && BigRational::from(first.clone()) == *l {
            first += 1;
        }
        let mut last = h.floor().to_integer();
        if !hi && BigRational::from(last.clone()) == *h {
            last -= 1;
        }
        if last < first {
            return Some(0);
        }
        let n = last - first + 1u32;
        u64::try_from(n).ok().filter(|&n| n <= cap)
    }

    /// Whether the rational `v` lies in the piece.
    pub fn contains(&self, v: &BigRational) -> bool {
        let lo_ok = match &self.lo {
            None => true,
            Some((l, inc)) => v > l || (*inc && v == l),
        };
        let hi_ok = match &self.hi {
            None => true,
            Some((h, inc)) => v < h || (*inc && v == h),
        };
        lo_ok && hi_ok && self.mask & stratum(v) != 0
    }

    fn intersect(&self, o: &RPiece) -> Option<RPiece> {
        let lo = if cmp_lo(&self.lo, &o.lo) == Ordering::Greater {
            self.lo.clone()
        } else {
            o.lo.clone()
        };
        let hi = if cmp_hi(&self.hi, &o.hi) == Ordering::Less {
            self.hi.clone()
        } else {
            o.hi.clone()
        };
        let p = RPiece {
            lo,
            hi,
            mask: self.mask & o.mask,
        };
        (!p.is_empty()).then_some(p)
    }

    /// The complement of the piece within the strata `universe`, as up to three pieces.
    fn complement(&self, universe: u8) -> Vec<RPiece> {
        let mut out = Vec::new();
        if let Some((l, inc)) = &self.lo {
            out.push(RPiece {
                lo: None,
                hi: Some((l.clone(), !inc)),
                mask: universe,
            });
        }
        if let Some((h, inc)) = &self.hi {
            out.push(RPiece {
                lo: Some((h.clone(), !inc)),
                hi: None,
                mask: universe,
            });
        }
        out.push(RPiece {
            mask: universe & !self.mask,
            ..self.clone()
        });
        out.retain(|p| !p.is_empty());
        out
    }
}

/// A finite union of pieces, kept sorted and without empty pieces.
#[derive(Clone, Debug, Default, PartialEq, Eq, Hash)]
pub struct RealSet {
    /// The pieces, sorted by bounds.
    pub pieces: Vec<RPiece>,
}

impl RealSet {
    /// One piece (dropped when empty).
    pub fn piece(p: RPiece) -> RealSet {
        let mut s = RealSet { pieces: vec![p] };
        s.normalise();
        s
    }

    /// Whether no number is in the set.
    pub fn is_empty(&self) -> bool {
        self.pieces.is_empty()
    }

    /// Intersection.
    pub fn intersect(&self, o: &RealSet) -> RealSet {
        let mut pieces = Vec::new();
        for a in &self.pieces {
            for b in &o.pieces {
                if let Some(p) = a.intersect(b) {
                    pieces.push(p);
                }
            }
        }
        let mut s = RealSet { pieces };
        s.normalise();
        s
    }

    /// Union.
    pub fn union(&self, o: &RealSet) -> RealSet {
        let mut s = self.clone();
        s.pieces.extend(o.pieces.iter().cloned());
        s.normalise();
        s
    }

    /// Complement within the strata `universe` (all of owl:real is [`REAL`]).
    pub fn complement(&self, universe: u8) -> RealSet {
        // The complement of a union is the intersection of the pieces' complements.
        let mut acc = RealSet {
            pieces: vec![RPiece::full(universe)],
        };
        for p in &self.pieces {
            acc = acc.intersect(&RealSet {
                pieces: p.complement(universe),
            });
        }
        acc
    }

    /// Number of values, `None` when infinite or above `cap`. Pieces may overlap, so
    /// finite pieces are counted by listing their values.
    pub fn count(&self, cap: u64) -> Option<u64> {
        let mut values: Vec<BigRational> = Vec::new();
        for p in &self.pieces {
            p.count(cap)?;
            values.extend(piece_values(p));
            values.sort();
            values.dedup();
            if values.len() as u64 > cap {
                return None;
            }
        }
        Some(values.len() as u64)
    }

    /// Whether `v` is in the set.
    pub fn contains(&self, v: &BigRational) -> bool {
        self.pieces.iter().any(|p| p.contains(v))
    }

    fn normalise(&mut self) {
        self.pieces.retain(|p| !p.is_empty());
        self.pieces.sort_by(|a, b| {
            cmp_lo(&a.lo, &b.lo)
                .then_with(|| cmp_hi(&a.hi, &b.hi))
                .then(a.mask.cmp(&b.mask))
        });
        self.pieces.dedup();
        // Pieces with the same bounds merge their strata.
        let mut out: Vec<RPiece> = Vec::with_capacity(self.pieces.len());
        for p in self.pieces.drain(..) {
            match out.last_mut() {
                Some(q) if q.lo == p.lo && q.hi == p.hi => q.mask |= p.mask,
                _ => out.push(p),
            }
        }
        self.pieces = out;
    }
}

/// The values of a finite piece (caller checked finiteness).
fn piece_values(p: &RPiece) -> Vec<BigRational> {
    let (Some((l, _)), Some((h, _))) = (&p.lo, &p.hi) else {
        return Vec::new();
    };
    if l == h {
        return if p.is_empty() {
            vec![]
        } else {
            vec![l.clone()]
        };
    }
    let mut out = Vec::new();
    let mut i = l.ceil();
    while &i <= h {
        if p.contains(&i) {
            out.push(i.clone());
        }
        i += BigRational::one();
    }
    out
}

/// Parses an xsd:decimal lexical form ((\+|-)?([0-9]+(\.[0-9]*)?|\.[0-9]+), XSD 1.1 §3.3.3).
pub fn parse_decimal(s: &str) -> Option<BigRational> {
    let (neg, body) = sign(s);
    let (int, frac) = match body.split_once('.') {
        Some((i, f)) => (i, f),
        None => (body, ""),
    };
    if int.is_empty() && frac.is_empty() {
        return None;
    }
    if !int.bytes().chain(frac.bytes()).all(|b| b.is_ascii_digit()) {
        return None;
    }
    if !body.contains('.') && int.is_empty() {
        return None;
    }
    let digits = format!("{int}{frac}");
    let n: BigInt = if digits.is_empty() {
        BigInt::zero()
    } else {
        digits.parse().ok()?
    };
    let d = num_traits::pow(BigInt::from(10u32), frac.len());
    let v = BigRational::new(n, d);
    Some(if neg { -v } else { v })
}

/// Parses an xsd:integer lexical form ((\+|-)?[0-9]+).
pub fn parse_integer(s: &str) -> Option<BigRational> {
    let (neg, body) = sign(s);
    if body.is_empty() || !body.bytes().all(|b| b.is_ascii_digit()) {
        return None;
    }
    let n: BigInt = body.parse().ok()?;
    Some(BigRational::from(if neg { -n } else { n }))
}

/// Parses an owl:rational lexical form: an integer, `/`, and a positive integer
/// (OWL 2 Structural Specification §4.1).
pub fn parse_rational(s: &str) -> Option<BigRational> {
    let (num, den) = s.split_once('/')?;
    let n = parse_integer(num)?;
    if den.starts_with(['+', '-']) {
        return None;
    }
    let d = parse_integer(den)?;
    if d.is_zero() {
        return None;
    }
    Some(n / d)
}

fn sign(s: &str) -> (bool, &str) {
    match s.as_bytes().first() {
        Some(b'-') => (true, &s[1..]),
        Some(b'+') => (false, &s[1..]),
        _ => (false, s),
    }
}

/// Text of a rational: decimal notation when finite, `n/d` otherwise.
pub fn text(v: &BigRational) -> String {
    if v.is_integer() {
        return v.numer().to_string();
    }
    if stratum(v) == DEC {
        // Scale by 10^k until integral; k is at most max(a, b) for 2^a·5^b.
        let mut k = 0usize;
        let mut x = v.clone();
        while !x.is_integer() {
            x *= BigRational::from(BigInt::from(10u32));
            k += 1;
        }
        let n = x.to_integer();
        let neg = n.is_negative();
        let digits = n.abs().to_string();
        let digits = format!("{digits:0>width$}", width = k + 1);
        let (i, f) = digits.split_at(digits.len() - k);
        return format!("{}{i}.{f}", if neg { "-" } else { "" });
    }
    format!("{}/{}", v.numer(), v.denom())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(s: &str) -> BigRational {
        parse_decimal(s).or_else(|| parse_rational(s)).unwrap()
    }

    fn piece(lo: &str, li: bool, hi: &str, hi_: bool, mask: u8) -> RealSet {
        RealSet::piece(RPiece {
            lo: Some((q(lo), li)),
            hi: Some((q(hi), hi_)),
            mask,
        })
    }

    #[test]
    fn lexical_forms() {
        // XSD 1.1 §3.3.3: "1.", ".5", "+0" are decimals; "." and "1e3" are not.
        assert_eq!(
            parse_decimal("1."),
            Some(BigRational::from(BigInt::from(1)))
        );
        assert_eq!(parse_decimal(".5"), Some(q("1/2")));
        assert!(parse_decimal(".").is_none());
        assert!(parse_decimal("1e3").is_none());
        assert!(parse_integer("1.0").is_none());
        assert!(parse_rational("1/0").is_none());
        assert_eq!(parse_rational("-2/4"), Some(q("-0.5")));
        assert_eq!(text(&q("-0.05")), "-0.05");
        assert_eq!(text(&q("1/3")), "1/3");
    }

    #[test]
    fn no_float_rounding() {
        // 0.1 + 0.2 = 0.3 exactly in xsd:decimal (in binary floating point it does not).
        let s = q("0.1") + q("0.2");
        assert_eq!(s, q("0.3"));
        // Two decimals beyond f64 precision stay distinct.
        let a = q("1.00000000000000000001");
        let b = q("1.00000000000000000002");
        let only_a = piece("1", true, "1.00000000000000000001", true, INT | DEC);
        assert!(only_a.contains(&a) && !only_a.contains(&b));
    }

    #[test]
    fn strata() {
        // Hand-derived: 1/3 is rational, not decimal; 0.25 = 1/4 is decimal.
        assert_eq!(stratum(&q("1/3")), RAT);
        assert_eq!(stratum(&q("1/4")), DEC);
        assert_eq!(stratum(&q("4/2")), INT);
        // xsd:decimal ∩ {1/3} is empty; owl:rational ∩ {1/3} is not.
        let third = RealSet::piece(RPiece::point(q("1/3")));
        assert!(
            third
                .intersect(&RealSet::piece(RPiece::full(INT | DEC)))
                .is_empty()
        );
        assert!(
            !third
                .intersect(&RealSet::piece(RPiece::full(INT | DEC | RAT)))
                .is_empty()
        );
    }

    #[test]
    fn integer_gaps_and_counts() {
        // xsd:integer in (3, 4) is empty, in [3, 4) holds only 3 (XSD facet semantics).
        assert!(piece("3", false, "4", false, INT).is_empty());
        assert_eq!(piece("3", true, "4", false, INT).count(10), Some(1));
        assert_eq!(piece("2.5", false, "7.5", false, INT).count(10), Some(5));
        assert_eq!(piece("2.5", false, "7.5", false, INT | DEC).count(10), None);
        // The decimals strictly between 3 and 4 exist; the integers there do not.
        assert!(!piece("3", false, "4", false, DEC).is_empty());
    }

    #[test]
    fn complement_laws() {
        let a = piece("0", true, "10", true, INT);
        let c = a.complement(REAL);
        assert!(a.intersect(&c).is_empty());
        assert!(c.contains(&q("5.5")) && !c.contains(&q("5")) && c.contains(&q("11")));
        // Complement within the decimals leaves no rational non-decimal.
        let cd = a.complement(INT | DEC);
        assert!(!cd.contains(&q("1/3")));
        assert_eq!(cd.complement(INT | DEC), a);
    }
}

//! xsd:dateTime and xsd:dateTimeStamp values on the time line, with the timezone rules of
//! XSD 1.1 Part 2 (§3.3.7 and Appendix D).
//!
//! A value with a timezone is an instant: equal instants written in different zones are the
//! same value. A value without a timezone is a different kind of value, never equal to an
//! instant. Order between the two kinds is partial: XSD 1.1 compares a value without a
//! timezone by imputing both +14:00 and −14:00 to it, so a local time t lies below an instant
//! V only when t + 14 h < V and above it only when t − 14 h > V. Seconds keep every decimal
//! digit (exact rationals).

use super::real::{self, DEC, INT, RPiece, RealSet};
use num_bigint::BigInt;
use num_rational::BigRational;

/// Seconds in 14 hours, the widest timezone offset.
const FOURTEEN_HOURS: i64 = 14 * 3600;

/// A parsed dateTime: seconds on the time line (local values counted as if at UTC) and
/// whether it carries a timezone.
#[derive(Clone, Debug, PartialEq)]
pub struct Stamp {
    /// Seconds since 1970-01-01T00:00:00 (UTC for zoned values).
    pub seconds: BigRational,
    /// Whether the lexical form had a timezone.
    pub zoned: bool,
}

/// Days since 1970-01-01 of a proleptic Gregorian date (Hinnant's days_from_civil).
fn days_from_civil(y: i64, m: i64, d: i64) -> i64 {
    let y = if m <= 2 { y - 1 } else { y };
    let era = y.div_euclid(400);
    let yoe = y - era * 400;
    let mp = (m + 9) % 12;
    let doy = (153 * mp + 2) / 5 + d - 1;
    let doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    era * 146_097 + doe - 719_468
}

fn days_in_month(y: i64, m: i64) -> i64 {
    match m {
        4 | 6 | 9 | 11 => 30,
        2 if (y % 4 == 0 && y % 100 != 0) || y % 400 == 0 => 29,
        2 => 28,
        _ => 31,
    }
}

fn digits(s: &str, n: usize) -> Option<i64> {
    (s.len() == n && s.bytes().all(|b| b.is_ascii_digit()))
        .then(|| s.parse().ok())
        .flatten()
}

/// Parses the dateTime lexical form
/// `-?YYYY-MM-DDThh:mm:ss(.s+)?(Z|(+|-)hh:mm)?` (XSD 1.1 §3.3.7.2). `None` when ill-formed.
pub fn parse(s: &str) -> Option<Stamp> {
    let (neg, body) = match s.strip_prefix('-') {
        Some(b) => (true, b),
        None => (false, s),
    };
    let (date, rest) = body.split_once('T')?;
    let mut dp = date.rsplitn(3, '-');
    let (d, m, y) = (dp.next()?, dp.next()?, dp.next()?);
    if y.len() < 4 || (y.len() > 4 && y.starts_with('0')) || y.len() > 12 {
        return None;
    }
    if !y.bytes().all(|b| b.is_ascii_digit()) {
        return None;
    }
    let year: i64 = y.parse().ok()?;
    let year = if neg { -year } else { year };
    let (month, day) = (digits(m, 2)?, digits(d, 2)?);
    if !(1..=12).contains(&month) || day < 1 || day > days_in_month(year, month) {
        return None;
    }
    // Split off the timezone.
    let (time, tz) = if let Some(t) = rest.strip_suffix('Z') {
        (t, Some(0i64))
    } else if rest.len() > 6 && matches!(rest.as_bytes()[rest.len() - 6], b'+' | b'-') {
        let (t, z) = rest.split_at(rest.len() - 6);
        let sign = if z.starts_with('-') { -1 } else { 1 };
        let (zh, zm) = z[1..].split_once(':')?;
        let (zh, zm) = (digits(zh, 2)?, digits(zm, 2)?);
        if zm > 59 || zh > 14 || (zh == 14 && zm != 0) {
            return None;
        }
        (t, Some(sign * (zh * 60 + zm)))
    } else {
        (rest, None)
    };
    let mut tp = time.splitn(3, ':');
    let (h, mi, sec) = (tp.next()?, tp.next()?, tp.next()?);
    let (h, mi) = (digits(h, 2)?, digits(mi, 2)?);
    let (si, sf) = sec.split_once('.').unwrap_or((sec, ""));
    let si = digits(si, 2)?;
    if sec.contains('.') && (sf.is_empty() || !sf.bytes().all(|b| b.is_ascii_digit())) {
        return None;
    }
    let frac_zero = sf.bytes().all(|b| b == b'0');
    if mi > 59 || si > 59 || h > 24 || (h == 24 && (mi != 0 || si != 0 || !frac_zero)) {
        return None;
    }
    let whole =
        days_from_civil(year, month, day) * 86_400 + h * 3600 + mi * 60 + si - tz.unwrap_or(0) * 60;
    let frac = if sf.is_empty() {
        BigRational::from(BigInt::from(0))
    } else {
        real::parse_decimal(&format!("0.{sf}"))?
    };
    Some(Stamp {
        seconds: BigRational::from(BigInt::from(whole)) + frac,
        zoned: tz.is_some(),
    })
}

/// Sets of dateTime values: instants (zoned) and local times, each a set of decimal seconds.
#[derive(Clone, Debug, Default, PartialEq, Eq, Hash)]
pub struct TimeSet {
    /// Values with a timezone, by instant.
    pub zoned: RealSet,
    /// Values without a timezone, by their time read as UTC.
    pub local: RealSet,
}

/// The strata of seconds: decimals.
pub const SECONDS: u8 = INT | DEC;

impl TimeSet {
    /// All dateTime values (`zoned_only`: xsd:dateTimeStamp).
    pub fn full(zoned_only: bool) -> TimeSet {
        TimeSet {
            zoned: RealSet::piece(RPiece::full(SECONDS)),
            local: if zoned_only {
                RealSet::default()
            } else {
                RealSet::piece(RPiece::full(SECONDS))
            },
        }
    }

    /// One value.
    pub fn point(s: &Stamp) -> TimeSet {
        let p = RealSet::piece(RPiece::point(s.seconds.clone()));
        if s.zoned {
            TimeSet {
                zoned: p,
                local: RealSet::default(),
            }
        } else {
            TimeSet {
                zoned: RealSet::default(),
                local: p,
            }
        }
    }

    /// The values x with x ≥ v (`upper` false) or x ≤ v (`upper` true), strict when not
    /// `inclusive`, under the partial order of XSD 1.1 (see the module comment).
    pub fn bound(v: &Stamp, upper: bool, inclusive: bool) -> TimeSet {
        let shift = BigRational::from(BigInt::from(FOURTEEN_HOURS));
        let ray = |at: BigRational, inc: bool| {
            let b = Some((at, inc));
            RealSet::piece(if upper {
                RPiece {
                    lo: None,
                    hi: b,
                    mask: SECONDS,
                }
            } else {
                RPiece {
                    lo: b,
                    hi: None,
                    mask: SECONDS,
                }
            })
        };
        // Across kinds the comparison is strict and 14 hours away.
        let across = if upper {
            &v.seconds - &shift
        } else {
            &v.seconds + &shift
        };
        let same = ray(v.seconds.clone(), inclusive);
        let other = ray(across, false);
        if v.zoned {
            TimeSet {
                zoned: same,
                local: other,
            }
        } else {
            TimeSet {
                zoned: other,
                local: same,
            }
        }
    }

    /// Whether empty.
    pub fn is_empty(&self) -> bool {
        self.zoned.is_empty() && self.local.is_empty()
    }

    /// Intersection.
    pub fn intersect(&self, o: &TimeSet) -> TimeSet {
        TimeSet {
            zoned: self.zoned.intersect(&o.zoned),
            local: self.local.intersect(&o.local),
        }
    }

    /// Union.
    pub fn union(&self, o: &TimeSet) -> TimeSet {
        TimeSet {
            zoned: self.zoned.union(&o.zoned),
            local: self.local.union(&o.local),
        }
    }

    /// Complement within all dateTime values.
    pub fn complement(&self) -> TimeSet {
        TimeSet {
            zoned: self.zoned.complement(SECONDS),
            local: self.local.complement(SECONDS),
        }
    }

    /// Number of values, `None` when infinite or above `cap`.
    pub fn count(&self, cap: u64) -> Option<u64> {
        let a = self.zoned.count(cap)?;
        let b = self.local.count(cap)?;
        Some(a + b).filter(|&n| n <= cap)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn st(s: &str) -> Stamp {
        parse(s).unwrap_or_else(|| panic!("{s}"))
    }

    #[test]
    fn lexical_forms() {
        assert!(parse("2020-02-29T00:00:00").is_some());
        assert!(parse("2021-02-29T00:00:00").is_none()); // not a leap year
        assert!(parse("2020-01-01T24:00:00Z").is_some());
        assert!(parse("2020-01-01T24:00:01Z").is_none());
        assert!(parse("2020-01-01T10:00:00+15:00").is_none());
        assert!(parse("2020-01-01").is_none());
        assert!(parse("a string").is_none());
        // 24:00:00 is the first instant of the next day (XSD 1.1 §3.3.7).
        assert_eq!(
            st("2020-01-01T24:00:00Z").seconds,
            st("2020-01-02T00:00:00Z").seconds
        );
        // The Unix epoch.
        assert_eq!(
            st("1970-01-01T00:00:00Z").seconds,
            BigRational::from(BigInt::from(0))
        );
        assert_eq!(
            st("1970-01-01T01:00:00.5+01:00").seconds,
            real::parse_decimal("0.5").unwrap()
        );
    }

    #[test]
    fn same_instant_in_two_zones_is_one_value() {
        // XSD 1.1: 12:00Z and 13:00+01:00 are equal; without a zone 12:00 is another value.
        let a = TimeSet::point(&st("2020-05-01T12:00:00Z"));
        let b = TimeSet::point(&st("2020-05-01T13:00:00+01:00"));
        let c = TimeSet::point(&st("2020-05-01T12:00:00"));
        assert_eq!(a, b);
        assert!(a.intersect(&c).is_empty());
        assert!(!a.intersect(&TimeSet::full(true)).is_empty());
        assert!(c.intersect(&TimeSet::full(true)).is_empty());
    }

    #[test]
    fn partial_order_across_kinds() {
        // ≥ 2020-01-01T00:00:00Z holds a local time only when it is more than 14 h later.
        let ge = TimeSet::bound(&st("2020-01-01T00:00:00Z"), false, true);
        let late = TimeSet::point(&st("2020-01-01T14:00:01"));
        let edge = TimeSet::point(&st("2020-01-01T14:00:00"));
        assert!(!ge.intersect(&late).is_empty());
        assert!(ge.intersect(&edge).is_empty());
        // A local bound: an instant must be more than 14 h before it to lie below it.
        let le = TimeSet::bound(&st("2020-01-02T00:00:00"), true, true);
        assert!(
            !le.intersect(&TimeSet::point(&st("2020-01-01T09:59:59Z")))
                .is_empty()
        );
        assert!(
            le.intersect(&TimeSet::point(&st("2020-01-01T10:00:00Z")))
                .is_empty()
        );
        assert!(
            !le.intersect(&TimeSet::point(&st("2020-01-02T00:00:00")))
                .is_empty()
        );
    }
}

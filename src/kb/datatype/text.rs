//! Short human-readable text of data ranges, for explanations and the shell.

use super::float::{Width, value};
use super::real::{self, DEC, INT, RAT, RBound, REAL};
use super::universe;
use crate::kb::datarange::DataRange;

fn bounds(lo: Option<String>, lo_inc: bool, hi: Option<String>, hi_inc: bool) -> Vec<String> {
    let mut b = Vec::new();
    if let Some(l) = lo {
        b.push(format!("{} {l}", if lo_inc { "≥" } else { ">" }));
    }
    if let Some(h) = hi {
        b.push(format!("{} {h}", if hi_inc { "≤" } else { "<" }));
    }
    b
}

fn named(kind: &str, b: Vec<String>) -> String {
    if b.is_empty() {
        kind.to_string()
    } else {
        format!("{kind}[{}]", b.join(", "))
    }
}

fn rb(b: &RBound) -> (Option<String>, bool) {
    match b {
        None => (None, false),
        Some((v, inc)) => (Some(real::text(v)), *inc),
    }
}

/// The text of a range, e.g. `decimal[≥ 30] ∪ {"a"}`.
pub fn describe(r: &DataRange) -> String {
    if *r == DataRange::everything() {
        return "literal".into();
    }
    let mut parts = Vec::new();
    for p in &r.real.pieces {
        let kind = match p.mask {
            INT => "integer".to_string(),
            m if m == INT | DEC => "decimal".to_string(),
            m if m == INT | DEC | RAT => "rational".to_string(),
            REAL => "real".to_string(),
            DEC => "non-integer".to_string(),
            m => format!("real(strata {m:#06b})"),
        };
        match (&p.lo, &p.hi) {
            (Some((l, true)), Some((h, true))) if l == h => {
                parts.push(format!("{{{}}}", real::text(l)));
            }
            _ => {
                let (lo, li) = rb(&p.lo);
                let (hi, hi_) = rb(&p.hi);
                parts.push(named(&kind, bounds(lo, li, hi, hi_)));
            }
        }
    }
    for (w, set, name) in [
        (Width::Double, &r.double, "double"),
        (Width::Float, &r.float, "float"),
    ] {
        let full = super::float::FloatSet::full(w);
        if *set == full {
            parts.push(name.to_string());
            continue;
        }
        let (bottom, top) = (full.ranges[0].0, full.ranges[0].1);
        for &(a, b) in &set.ranges {
            if a == b {
                parts.push(format!("{{{}}}", value(w, a)));
                continue;
            }
            let lo = (a != bottom).then(|| value(w, a).to_string());
            let hi = (b != top).then(|| value(w, b).to_string());
            parts.push(named(name, bounds(lo, true, hi, true)));
        }
        if set.nan {
            parts.push(format!("{{NaN ({name})}}"));
        }
    }
    match r.boolean {
        1 => parts.push("{false}".into()),
        2 => parts.push("{true}".into()),
        3 => parts.push("boolean".into()),
        _ => {}
    }
    let u = universe();
    for (d, full, name) in [
        (&r.plain, &u.plain, "plain literal"),
        (&r.uri, &u.uri, "anyURI"),
        (&r.hex, &u.hex, "hexBinary"),
        (&r.base64, &u.base64, "base64Binary"),
    ] {
        if d.is_empty() {
            continue;
        }
        if d == full {
            parts.push(name.to_string());
        } else if d.count(1) == Some(1) {
            let w = d.example().unwrap_or_default();
            let text: String = w
                .iter()
                .map(|&c| {
                    if c == 0 {
                        '@'
                    } else {
                        char::from_u32(c).unwrap_or('?')
                    }
                })
                .collect();
            parts.push(format!("{{\"{text}\" ({name})}}"));
        } else if *d == d.and(&u.strings) && name == "plain literal" {
            parts.push(format!("string[{} states]", d.trans.len()));
        } else {
            parts.push(format!("{name}[{} states]", d.trans.len()));
        }
    }
    if r.xml.co && r.xml.values.is_empty() {
        parts.push("XMLLiteral".into());
    } else if r.xml.co {
        parts.push("XMLLiteral except {…}".into());
    }
    if !r.xml.co {
        for v in &r.xml.values {
            parts.push(format!("{{\"{v}\" (XMLLiteral)}}"));
        }
    }
    for (set, name) in [
        (&r.time.zoned, "dateTimeStamp"),
        (&r.time.local, "local dateTime"),
    ] {
        for p in &set.pieces {
            let (lo, li) = rb(&p.lo);
            let (hi, hi_) = rb(&p.hi);
            parts.push(named(&format!("{name} (s)"), bounds(lo, li, hi, hi_)));
        }
    }
    if r.other {
        parts.push("other literals".into());
    }
    if parts.is_empty() {
        "∅".into()
    } else {
        parts.join(" ∪ ")
    }
}

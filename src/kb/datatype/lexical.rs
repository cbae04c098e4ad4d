//! Lexical-to-value mappings of the OWL 2 datatype map (XSD 1.1 Part 2 §3, rdf:PlainLiteral).

use super::automaton::Dfa;
use super::datetime::{self, Stamp, TimeSet};
use super::float::{self, FloatSet, Width};
use super::real::{self, RPiece};
use super::{Family, RDF, TAG_SEP, lookup, universe, xml};
use crate::kb::datarange::{DataRange, TextSpace};
use num_rational::BigRational;

/// A data value.
#[derive(Clone, Debug, PartialEq)]
pub enum Value {
    /// A real number (exact).
    Real(BigRational),
    /// An IEEE value of the given width (NaN included).
    Ieee(Width, f64),
    /// A boolean.
    Bool(bool),
    /// A string, with its language tag in lower case if it has one.
    Plain(String, Option<String>),
    /// An anyURI value.
    Uri(String),
    /// Octets of xsd:hexBinary (`TextSpace::Hex`) or xsd:base64Binary.
    Binary(TextSpace, Vec<u8>),
    /// A dateTime.
    Time(Stamp),
    /// An rdf:XMLLiteral value, as its canonical text.
    Xml(String),
}

impl Value {
    /// The range holding just this value.
    pub fn range(&self) -> DataRange {
        let word = |s: &str| s.chars().map(|c| c as u32).collect::<Vec<u32>>();
        match self {
            Value::Real(v) => DataRange::real(RPiece::point(v.clone())),
            Value::Ieee(w, v) => {
                let s = FloatSet::point(*w, *v);
                match w {
                    Width::Double => DataRange {
                        double: s,
                        ..DataRange::empty()
                    },
                    Width::Float => DataRange {
                        float: s,
                        ..DataRange::empty()
                    },
                }
            }
            Value::Bool(b) => DataRange {
                boolean: if *b { 2 } else { 1 },
                ..DataRange::empty()
            },
            Value::Plain(s, tag) => {
                let mut w = word(s);
                if let Some(t) = tag {
                    w.push(TAG_SEP);
                    w.extend(word(t));
                }
                DataRange::text(TextSpace::Plain, Dfa::word(&w))
            }
            Value::Uri(s) => DataRange::text(TextSpace::Uri, Dfa::word(&word(s))),
            Value::Binary(space, bytes) => {
                let w: Vec<u32> = bytes.iter().map(|&b| u32::from(b)).collect();
                DataRange::text(*space, Dfa::word(&w))
            }
            Value::Time(st) => DataRange {
                time: TimeSet::point(st),
                ..DataRange::empty()
            },
            Value::Xml(s) => DataRange {
                xml: xml::XmlSet::single(s),
                ..DataRange::empty()
            },
        }
    }
}

/// The value of a literal: `Ok(None)` when ill-typed, `Err` when its datatype is not
/// supported. `datatype` is `None` for plain literals (with or without `lang`).
pub fn parse_literal(
    lex: &str,
    datatype: Option<&str>,
    lang: Option<&str>,
) -> Result<Option<Value>, String> {
    let plain = |s: &str, tag: Option<&str>| -> Option<Value> {
        let tag = tag.map(str::to_ascii_lowercase);
        let w: Vec<u32> = s.chars().map(|c| c as u32).collect();
        if !universe().strings.contains(&w) {
            return None;
        }
        if let Some(t) = &tag {
            let tw: Vec<u32> = t.chars().map(|c| c as u32).collect();
            if !universe().tags.contains(&tw) {
                return None;
            }
        }
        Some(Value::Plain(s.to_string(), tag))
    };
    let Some(dt) = datatype else {
        return Ok(plain(lex, lang));
    };
    if let Some(l) = lang {
        // A language tag with a datatype only makes sense for rdf:langString.
        if dt == format!("{RDF}langString") {
            return Ok(plain(lex, Some(l)));
        }
    }
    let (family, range) = lookup(dt)?;
    let trimmed = lex.trim_matches([' ', '\t', '\n', '\r']);
    let v = match family {
        Family::Real => {
            let v = if dt.ends_with("#rational") {
                real::parse_rational(trimmed).or_else(|| real::parse_integer(trimmed))
            } else if dt.ends_with("#real") {
                // owl:real has an empty lexical space (OWL 2 Structural Specification §4.1).
                None
            } else if dt.ends_with("#decimal") {
                real::parse_decimal(trimmed)
            } else {
                real::parse_integer(trimmed)
            };
            v.map(Value::Real)
        }
        Family::Ieee(w) => float::parse(w, trimmed).map(|x| Value::Ieee(w, x)),
        Family::Boolean => match trimmed {
            "true" | "1" => Some(Value::Bool(true)),
            "false" | "0" => Some(Value::Bool(false)),
            _ => None,
        },
        Family::Plain { tagged, untagged } => {
            if tagged && untagged {
                // rdf:PlainLiteral: "text@tag", the tag after the last '@' (may be empty).
                match lex.rsplit_once('@') {
                    Some((s, "")) => plain(s, None),
                    Some((s, t)) => plain(s, Some(t)),
                    None => None,
                }
            } else if tagged {
                None
            } else {
                plain(lex, None)
            }
        }
        Family::Uri => {
            let collapsed = lex.split_whitespace().collect::<Vec<_>>().join(" ");
            Some(Value::Uri(collapsed))
        }
        Family::Binary(space) => {
            let bytes = if space == TextSpace::Hex {
                hex(trimmed)
            } else {
                base64(lex)
            };
            bytes.map(|b| Value::Binary(space, b))
        }
        Family::Time(_) => datetime::parse(trimmed).map(Value::Time),
        // No white space is trimmed: it is part of the fragment's text.
        Family::Xml => xml::canonical(lex).map(Value::Xml),
        Family::Literal => {
            return Err("a literal typed rdfs:Literal has no defined value".into());
        }
    };
    // The value must also lie in the datatype's own range (bounded integers, string subtypes,
    // dateTimeStamp's timezone).
    Ok(v.filter(|v| !v.range().intersect(&range).is_empty()))
}

fn hex(s: &str) -> Option<Vec<u8>> {
    if !s.len().is_multiple_of(2) || !s.bytes().all(|b| b.is_ascii_hexdigit()) {
        return None;
    }
    (0..s.len())
        .step_by(2)
        .map(|i| u8::from_str_radix(&s[i..i + 2], 16).ok())
        .collect()
}

/// XSD 1.1 §3.3.17 base64Binary: groups of four characters of the base64 alphabet, spaces
/// allowed between characters, '=' padding only at the end with the unused bits zero.
fn base64(s: &str) -> Option<Vec<u8>> {
    // Whitespace may separate the characters (the lexical space allows single spaces and
    // the whiteSpace facet collapses the rest).
    let chars: Vec<u8> = s
        .bytes()
        .filter(|b| !matches!(b, b' ' | b'\t' | b'\n' | b'\r'))
        .collect();
    if !chars.len().is_multiple_of(4) {
        return None;
    }
    let val = |c: u8| -> Option<u32> {
        Some(match c {
            b'A'..=b'Z' => u32::from(c - b'A'),
            b'a'..=b'z' => u32::from(c - b'a') + 26,
            b'0'..=b'9' => u32::from(c - b'0') + 52,
            b'+' => 62,
            b'/' => 63,
            _ => return None,
        })
    };
    let mut out = Vec::new();
    let groups = chars.len() / 4;
    for (g, q) in chars.chunks(4).enumerate() {
        let pad = q.iter().rev().take_while(|&&c| c == b'=').count();
        if pad > 2 || (pad > 0 && g + 1 != groups) {
            return None;
        }
        let mut n = 0u32;
        for &c in &q[..4 - pad] {
            n = (n << 6) | val(c)?;
        }
        match pad {
            0 => out.extend([(n >> 16) as u8, (n >> 8) as u8, n as u8]),
            1 => {
                // 18 bits: two octets and two unused bits that must be zero.
                if n & 0b11 != 0 {
                    return None;
                }
                let n = n >> 2;
                out.extend([(n >> 8) as u8, n as u8]);
            }
            _ => {
                // 12 bits: one octet and four unused bits that must be zero.
                if n & 0b1111 != 0 {
                    return None;
                }
                out.push((n >> 4) as u8);
            }
        }
    }
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn base64_decoding() {
        // RFC 4648 §10 test vectors.
        assert_eq!(base64("Zm9vYmFy"), Some(b"foobar".to_vec()));
        assert_eq!(base64("Zm9vYg=="), Some(b"foob".to_vec()));
        assert_eq!(base64("Zm9vYmE="), Some(b"fooba".to_vec()));
        assert_eq!(base64(""), Some(vec![]));
        assert_eq!(base64("Zm9=vYmE"), None);
        assert_eq!(hex("0fB7"), Some(vec![0x0F, 0xB7]));
        assert_eq!(hex("0fB"), None);
    }

    #[test]
    fn booleans() {
        let dt = "http://www.w3.org/2001/XMLSchema#boolean";
        assert_eq!(
            parse_literal("1", Some(dt), None),
            Ok(Some(Value::Bool(true)))
        );
        assert_eq!(parse_literal("TRUE", Some(dt), None), Ok(None));
    }
}

//! The OWL 2 datatype map: datatypes, literals and facet restrictions as exact data ranges.
//!
//! Covers the datatypes of OWL 2 Structural Specification §4: the reals (owl:real, owl:rational, xsd:decimal, xsd:integer and its bounded subtypes),
//! xsd:double, xsd:float, xsd:boolean, xsd:string and its subtypes, rdf:PlainLiteral,
//! rdf:langString, xsd:anyURI, xsd:hexBinary, xsd:base64Binary, xsd:dateTime and
//! xsd:dateTimeStamp, and rdf:XMLLiteral (no facets, §4.6), with the facets the map allows for each. A literal whose lexical form
//! is not in the lexical space of its datatype is ill-typed and denotes no value (an empty
//! range), so asserting it makes the ontology inconsistent, as OWL 2 specifies.

pub mod automaton;
pub mod blocks;
pub mod datetime;
pub mod float;
pub mod lexical;
pub mod pattern;
pub mod real;
pub mod text;
pub mod xml;

use super::datarange::{DataRange, TextSpace};
use automaton::{Class, Dfa, class_norm};
use datetime::TimeSet;
use float::{FloatSet, Width};
use num_bigint::BigInt;
use num_rational::BigRational;
use real::{DEC, INT, RAT, REAL, RPiece};
use std::sync::OnceLock;

pub use lexical::{Value, parse_literal};

const XSD: &str = "http://www.w3.org/2001/XMLSchema#";
const RDF: &str = "http://www.w3.org/1999/02/22-rdf-syntax-ns#";
const OWL: &str = "http://www.w3.org/2002/07/owl#";
const RDFS_LITERAL: &str = "http://www.w3.org/2000/01/rdf-schema#Literal";

/// The separator between a string and its language tag in the plain-literal automata
/// (U+0000 is not an XML character, so no string contains it).
pub const TAG_SEP: u32 = 0;

/// The XML characters (XML 1.0 production Char): what strings are made of.
pub fn xml_chars() -> Class {
    class_norm(vec![
        (0x9, 0xA),
        (0xD, 0xD),
        (0x20, 0xD7FF),
        (0xE000, 0xFFFD),
        (0x10000, 0x10FFFF),
    ])
}

/// The full automata of the string-like spaces.
pub struct Universe {
    /// Every string, with or without a language tag.
    pub plain: Dfa,
    /// Every string (the strings without a tag, for the string part of plain literals).
    pub strings: Dfa,
    /// Every language tag.
    pub tags: Dfa,
    /// Every anyURI value.
    pub uri: Dfa,
    /// Every octet sequence (hexBinary).
    pub hex: Dfa,
    /// Every octet sequence (base64Binary).
    pub base64: Dfa,
}

/// The universes, built once.
pub fn universe() -> &'static Universe {
    static U: OnceLock<Universe> = OnceLock::new();
    U.get_or_init(|| {
        let strings = Dfa::lengths(&xml_chars(), 0, None).expect("unbounded length");
        // Language tags in lower case (OWL 2 compares them case-insensitively):
        // BCP 47's shape, letters first, subtags of 1 to 8 letters or digits.
        let tags = pattern::compile("[a-z]{1,8}(-[a-z0-9]{1,8})*").expect("tag pattern");
        let octets = Dfa::lengths(&vec![(0, 255)], 0, None).expect("unbounded length");
        Universe {
            plain: strings.then_tagged(TAG_SEP, &tags, true),
            uri: strings.clone(),
            strings,
            tags,
            hex: octets.clone(),
            base64: octets,
        }
    })
}

/// What a datatype's value space is, for facets and literals.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Family {
    /// The reals.
    Real,
    /// xsd:double or xsd:float.
    Ieee(Width),
    /// xsd:boolean.
    Boolean,
    /// Plain literals; `tagged`/`untagged` say which kinds the datatype holds.
    Plain {
        /// Holds strings with a language tag.
        tagged: bool,
        /// Holds strings without one.
        untagged: bool,
    },
    /// xsd:anyURI.
    Uri,
    /// xsd:hexBinary or xsd:base64Binary.
    Binary(TextSpace),
    /// xsd:dateTime (`true`: xsd:dateTimeStamp).
    Time(bool),
    /// rdf:XMLLiteral.
    Xml,
    /// rdfs:Literal.
    Literal,
}

/// A datatype of the map: its family and its range.
pub fn lookup(iri: &str) -> Result<(Family, DataRange), String> {
    if iri == RDFS_LITERAL {
        return Ok((Family::Literal, DataRange::everything()));
    }
    let int = |lo: Option<i128>, hi: Option<i128>| {
        let b = |v: Option<i128>| v.map(|v| (BigRational::from(BigInt::from(v)), true));
        (
            Family::Real,
            DataRange::real(RPiece {
                lo: b(lo),
                hi: b(hi),
                mask: INT,
            }),
        )
    };
    let string = |pat: Option<&str>| -> Result<(Family, DataRange), String> {
        let s = match pat {
            Some(p) => universe().strings.and(&pattern::compile(p)?),
            None => universe().strings.clone(),
        };
        Ok((
            Family::Plain {
                tagged: false,
                untagged: true,
            },
            DataRange::text(TextSpace::Plain, s),
        ))
    };
    if let Some(local) = iri.strip_prefix(XSD) {
        return Ok(match local {
            "integer" => int(None, None),
            "nonNegativeInteger" => int(Some(0), None),
            "positiveInteger" => int(Some(1), None),
            "nonPositiveInteger" => int(None, Some(0)),
            "negativeInteger" => int(None, Some(-1)),
            "long" => int(Some(i64::MIN as i128), Some(i64::MAX as i128)),
            "int" => int(Some(i32::MIN as i128), Some(i32::MAX as i128)),
            "short" => int(Some(-32768), Some(32767)),
            "byte" => int(Some(-128), Some(127)),
            "unsignedLong" => int(Some(0), Some(u64::MAX as i128)),
            "unsignedInt" => int(Some(0), Some(u32::MAX as i128)),
            "unsignedShort" => int(Some(0), Some(65535)),
            "unsignedByte" => int(Some(0), Some(255)),
            "decimal" => (Family::Real, DataRange::real(RPiece::full(INT | DEC))),
            "double" => (
                Family::Ieee(Width::Double),
                DataRange {
                    double: FloatSet::full(Width::Double),
                    ..DataRange::empty()
                },
            ),
            "float" => (
                Family::Ieee(Width::Float),
                DataRange {
                    float: FloatSet::full(Width::Float),
                    ..DataRange::empty()
                },
            ),
            "boolean" => (
                Family::Boolean,
                DataRange {
                    boolean: 3,
                    ..DataRange::empty()
                },
            ),
            "string" => string(None)?,
            // The derived string types by their XSD 1.1 definitions (whiteSpace and
            // pattern facets of §3.4.1–3.4.7).
            "normalizedString" => string(Some("[^\\n\\r\\t]*"))?,
            "token" => string(Some("([^\\s]+( [^\\s]+)*)?"))?,
            "language" => string(Some("[a-zA-Z]{1,8}(-[a-zA-Z0-9]{1,8})*"))?,
            "NMTOKEN" => string(Some("\\c+"))?,
            "Name" => string(Some("\\i\\c*"))?,
            "NCName" => string(Some("[\\i-[:]][\\c-[:]]*"))?,
            "anyURI" => (
                Family::Uri,
                DataRange::text(TextSpace::Uri, universe().uri.clone()),
            ),
            "hexBinary" => (
                Family::Binary(TextSpace::Hex),
                DataRange::text(TextSpace::Hex, universe().hex.clone()),
            ),
            "base64Binary" => (
                Family::Binary(TextSpace::Base64),
                DataRange::text(TextSpace::Base64, universe().base64.clone()),
            ),
            "dateTime" => (
                Family::Time(false),
                DataRange {
                    time: TimeSet::full(false),
                    ..DataRange::empty()
                },
            ),
            "dateTimeStamp" => (
                Family::Time(true),
                DataRange {
                    time: TimeSet::full(true),
                    ..DataRange::empty()
                },
            ),
            _ => {
                return Err(format!(
                    "datatype xsd:{local} is not in the OWL 2 datatype map"
                ));
            }
        });
    }
    if let Some(local) = iri.strip_prefix(OWL) {
        match local {
            "real" => return Ok((Family::Real, DataRange::real(RPiece::full(REAL)))),
            "rational" => {
                return Ok((Family::Real, DataRange::real(RPiece::full(INT | DEC | RAT))));
            }
            _ => {}
        }
    }
    if let Some(local) = iri.strip_prefix(RDF) {
        let (tagged, untagged) = match local {
            "PlainLiteral" => (true, true),
            "langString" => (true, false),
            "XMLLiteral" => {
                return Ok((
                    Family::Xml,
                    DataRange {
                        xml: xml::XmlSet::full(),
                        ..DataRange::empty()
                    },
                ));
            }
            _ => {
                return Err(format!(
                    "datatype rdf:{local} is not in the OWL 2 datatype map"
                ));
            }
        };
        let u = universe();
        let d = u.strings.then_tagged(TAG_SEP, &u.tags, untagged);
        return Ok((
            Family::Plain { tagged, untagged },
            DataRange::text(TextSpace::Plain, d),
        ));
    }
    Err(format!(
        "datatype <{iri}> is not in the OWL 2 datatype map (datatype definitions are not supported)"
    ))
}

/// The range of a named datatype.
pub fn named(iri: &str) -> Result<DataRange, String> {
    lookup(iri).map(|(_, r)| r)
}

/// The range holding exactly the value of a literal: empty when the literal is ill-typed.
/// `datatype` is `None` for plain literals (with or without `lang`).
pub fn literal(lex: &str, datatype: Option<&str>, lang: Option<&str>) -> Result<DataRange, String> {
    Ok(match parse_literal(lex, datatype, lang)? {
        Some(v) => v.range(),
        None => DataRange::empty(),
    })
}

/// A facet restriction `DatatypeRestriction(dt f₁ v₁ …)`: the datatype's range cut by each
/// facet. `facets` holds (facet IRI, value literal as lexical form, datatype, language).
pub fn restrict(
    dt: &str,
    facets: &[(String, String, Option<String>, Option<String>)],
) -> Result<DataRange, String> {
    let (family, mut acc) = lookup(dt)?;
    for (f, lex, fdt, lang) in facets {
        let name = f
            .strip_prefix(XSD)
            .or_else(|| f.strip_prefix(RDF))
            .unwrap_or(f);
        let v = parse_literal(lex, fdt.as_deref(), lang.as_deref())?.ok_or_else(|| {
            format!("the value \"{lex}\" of facet {name} is not in its datatype's lexical space")
        })?;
        let cut = facet(family, name, &v)?;
        acc = acc.intersect(&cut);
    }
    Ok(acc)
}

/// The set of literals of a family satisfying one facet.
fn facet(family: Family, name: &str, v: &Value) -> Result<DataRange, String> {
    let bad = || format!("facet {name} does not apply to this datatype or value {v:?}");
    let (upper, inclusive) = match name {
        "minInclusive" => (false, true),
        "minExclusive" => (false, false),
        "maxInclusive" => (true, true),
        "maxExclusive" => (true, false),
        "length" | "minLength" | "maxLength" => return length(family, name, v).ok_or_else(bad)?,
        "pattern" => {
            let Value::Plain(p, None) = v else {
                return Err(bad());
            };
            let d = universe().strings.and(&pattern::compile(p)?);
            return match family {
                Family::Plain { .. } => Ok(DataRange::text(
                    TextSpace::Plain,
                    d.then_tagged(TAG_SEP, &universe().tags, true),
                )),
                Family::Uri => Ok(DataRange::text(TextSpace::Uri, d)),
                _ => Err(bad()),
            };
        }
        "langRange" => {
            let (Value::Plain(r, None), Family::Plain { .. }) = (v, family) else {
                return Err(bad());
            };
            return Ok(DataRange::text(TextSpace::Plain, lang_range(r)?));
        }
        _ => {
            return Err(format!(
                "facet {name} is not supported (not in the OWL 2 datatype map)"
            ));
        }
    };
    Ok(match (family, v) {
        (Family::Real, Value::Real(x)) => {
            let b = Some((x.clone(), inclusive));
            DataRange::real(if upper {
                RPiece {
                    lo: None,
                    hi: b,
                    mask: REAL,
                }
            } else {
                RPiece {
                    lo: b,
                    hi: None,
                    mask: REAL,
                }
            })
        }
        (Family::Ieee(w), Value::Ieee(vw, x)) if w == *vw => {
            let s = if upper {
                FloatSet::at_most(w, *x, inclusive)
            } else {
                FloatSet::at_least(w, *x, inclusive)
            };
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
        (Family::Time(_), Value::Time(st)) => DataRange {
            time: TimeSet::bound(st, upper, inclusive),
            ..DataRange::empty()
        },
        _ => return Err(bad()),
    })
}

/// length / minLength / maxLength: characters for strings and URIs, octets for binaries.
fn length(family: Family, name: &str, v: &Value) -> Option<Result<DataRange, String>> {
    let Value::Real(n) = v else { return None };
    if !n.is_integer() || n < &BigRational::from(BigInt::from(0)) {
        return None;
    }
    let n: u64 = n.to_integer().try_into().ok()?;
    let (min, max) = match name {
        "length" => (n, Some(n)),
        "minLength" => (n, None),
        _ => (0, Some(n)),
    };
    let (space, class) = match family {
        Family::Plain { .. } => (TextSpace::Plain, xml_chars()),
        Family::Uri => (TextSpace::Uri, xml_chars()),
        Family::Binary(s) => (s, vec![(0, 255)]),
        _ => return None,
    };
    Some(Dfa::lengths(&class, min, max).map(|d| {
        let d = if space == TextSpace::Plain {
            d.then_tagged(TAG_SEP, &universe().tags, true)
        } else {
            d
        };
        DataRange::text(space, d)
    }))
}

/// Plain literals whose tag matches a language range by basic filtering (RFC 4647 §3.3.1,
/// as rdf:PlainLiteral's langRange facet specifies): `*` matches every tag, otherwise the
/// tag equals the range or starts with it followed by `-`, ignoring case.
fn lang_range(r: &str) -> Result<Dfa, String> {
    let u = universe();
    let tags = if r == "*" {
        u.tags.clone()
    } else {
        let r = r.to_ascii_lowercase();
        if r.is_empty() || !r.bytes().all(|b| b.is_ascii_alphanumeric() || b == b'-') {
            return Err(format!("language range \"{r}\" is not well formed"));
        }
        u.tags.and(&pattern::compile(&format!("{r}(-.*)?"))?)
    };
    Ok(u.strings.then_tagged(TAG_SEP, &tags, false))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn f(name: &str, lex: &str, dt: &str) -> (String, String, Option<String>, Option<String>) {
        (
            format!("{XSD}{name}"),
            lex.into(),
            Some(format!("{XSD}{dt}")),
            None,
        )
    }

    fn s(lex: &str) -> DataRange {
        literal(lex, None, None).unwrap()
    }

    #[test]
    fn string_facets() {
        // xsd:string[length 3, pattern "[a-c]+"] has 27 values (hand count 3^3).
        let r = restrict(
            &format!("{XSD}string"),
            &[
                f("length", "3", "integer"),
                f("pattern", "[a-c]+", "string"),
            ],
        )
        .unwrap();
        assert_eq!(r.count(100), Some(27));
        assert!(!r.intersect(&s("abc")).is_empty());
        assert!(r.intersect(&s("abcd")).is_empty());
        // minLength 4 ∩ maxLength 3 is empty.
        let e = restrict(
            &format!("{XSD}string"),
            &[
                f("minLength", "4", "integer"),
                f("maxLength", "3", "integer"),
            ],
        )
        .unwrap();
        assert!(e.is_empty());
        // A pattern no word of length ≤ 2 matches, with maxLength 2: empty.
        let e = restrict(
            &format!("{XSD}string"),
            &[
                f("maxLength", "2", "integer"),
                f("pattern", "a{3}b*", "string"),
            ],
        )
        .unwrap();
        assert!(e.is_empty());
    }

    #[test]
    fn plain_literals_and_tags() {
        // "a"@en is an rdf:PlainLiteral and an rdf:langString, not an xsd:string.
        let en = literal("a", None, Some("EN")).unwrap();
        let pl = named(&format!("{RDF}PlainLiteral")).unwrap();
        let ls = named(&format!("{RDF}langString")).unwrap();
        let st = named(&format!("{XSD}string")).unwrap();
        assert!(!en.intersect(&pl).is_empty() && !en.intersect(&ls).is_empty());
        assert!(en.intersect(&st).is_empty());
        // Case of the tag does not matter; "a"@en-GB matches langRange "en", "a"@fr does not.
        assert_eq!(en, literal("a", None, Some("en")).unwrap());
        let r = restrict(
            &format!("{RDF}PlainLiteral"),
            &[(format!("{RDF}langRange"), "en".into(), None, None)],
        )
        .unwrap();
        assert!(
            !r.intersect(&literal("a", None, Some("en-GB")).unwrap())
                .is_empty()
        );
        assert!(
            r.intersect(&literal("a", None, Some("fr")).unwrap())
                .is_empty()
        );
        assert!(r.intersect(&s("a")).is_empty());
        // "x@en"^^rdf:PlainLiteral is "x"@en (rdf:PlainLiteral spec §3).
        let p = literal("x@en", Some(&format!("{RDF}PlainLiteral")), None).unwrap();
        assert_eq!(p, literal("x", None, Some("en")).unwrap());
        assert_eq!(
            literal("x@", Some(&format!("{RDF}PlainLiteral")), None).unwrap(),
            s("x")
        );
        // xsd:token excludes a leading space; xsd:string allows it.
        let tok = named(&format!("{XSD}token")).unwrap();
        assert!(tok.intersect(&s(" a")).is_empty() && !tok.intersect(&s("a b")).is_empty());
    }

    #[test]
    fn numeric_facets_are_exact() {
        // integer[> 2.5, < 3.5] = {3}; decimal[> 0.1, < 0.1000000000000000000001] is
        // non-empty and misses both bounds (f64 would collapse the bounds).
        let r = restrict(
            &format!("{XSD}integer"),
            &[
                f("minExclusive", "2.5", "decimal"),
                f("maxExclusive", "3.5", "decimal"),
            ],
        )
        .unwrap();
        assert_eq!(r.count(10), Some(1));
        let d = restrict(
            &format!("{XSD}decimal"),
            &[
                f("minExclusive", "0.1", "decimal"),
                f("maxExclusive", "0.1000000000000000000001", "decimal"),
            ],
        )
        .unwrap();
        assert!(!d.is_empty() && d.count(10).is_none());
        assert!(
            d.intersect(&literal("0.1", Some(&format!("{XSD}decimal")), None).unwrap())
                .is_empty()
        );
        // owl:rational literal 1/3 is outside xsd:decimal, inside owl:rational.
        let third = literal("1/3", Some(&format!("{OWL}rational")), None).unwrap();
        assert!(
            third
                .intersect(&named(&format!("{XSD}decimal")).unwrap())
                .is_empty()
        );
        assert!(
            !third
                .intersect(&named(&format!("{OWL}rational")).unwrap())
                .is_empty()
        );
        // Facet of the wrong family is refused.
        assert!(
            restrict(
                &format!("{XSD}double"),
                &[f("minInclusive", "1", "integer")]
            )
            .is_err()
        );
    }

    #[test]
    fn ill_typed_literals_are_empty() {
        // OWL 2 Structural Specification §5.7: "abc"^^xsd:integer has no value.
        for (lex, dt) in [
            ("abc", "integer"),
            ("300", "byte"),
            ("1.5", "integer"),
            ("maybe", "boolean"),
            ("2020-13-01T00:00:00", "dateTime"),
            ("2020-01-01T00:00:00", "dateTimeStamp"),
            ("ABC", "hexBinary"),
            ("QR==", "base64Binary"),
        ] {
            assert!(
                literal(lex, Some(&format!("{XSD}{dt}")), None)
                    .unwrap()
                    .is_empty(),
                "{lex}^^{dt}"
            );
        }
        assert!(literal("x", Some(&format!("{XSD}date")), None).is_err());
    }

    #[test]
    fn binaries_count_octets() {
        // "0FB7"^^hexBinary has two octets; hexBinary[length 2] holds it, [length 3] not.
        let v = literal("0FB7", Some(&format!("{XSD}hexBinary")), None).unwrap();
        let two = restrict(&format!("{XSD}hexBinary"), &[f("length", "2", "integer")]).unwrap();
        assert!(!v.intersect(&two).is_empty());
        assert_eq!(
            v,
            literal("0fb7", Some(&format!("{XSD}hexBinary")), None).unwrap()
        );
        // "D7s=" is base64 for 0F B7 but base64 and hex values are different spaces.
        let b = literal("D7c=", Some(&format!("{XSD}base64Binary")), None).unwrap();
        assert!(!b.is_empty() && b.intersect(&v).is_empty());
    }
}

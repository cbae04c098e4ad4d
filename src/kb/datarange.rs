//! Data ranges: sets of literals over the value spaces of the OWL 2 datatype map.
//!
//! OWL 2 (Structural Specification §4) gives each family of datatypes its own value space,
//! pairwise disjoint: the reals (owl:real ⊇ owl:rational ⊇ xsd:decimal ⊇ xsd:integer),
//! xsd:double, xsd:float, xsd:boolean, the plain literals (xsd:string and its subtypes,
//! language-tagged strings), xsd:anyURI, xsd:hexBinary, xsd:base64Binary, xsd:dateTime and
//! rdf:XMLLiteral (§4.6). A range holds one exact set per space (interval unions for ordered spaces, automata for
//! string-like spaces, finite or co-finite sets of rdf:XMLLiteral values, see
//! [`crate::kb::datatype`]) plus a flag for literals of datatypes
//! outside the map, which only rdfs:Literal and complements reach. Every space is closed
//! under intersection, union and complement with decidable emptiness and counting.

use super::datatype::automaton::Dfa;
use super::datatype::datetime::TimeSet;
use super::datatype::float::{FloatSet, Width};
use super::datatype::real::{REAL, RPiece, RealSet};
use super::datatype::xml::XmlSet;
use super::datatype::{text, universe};
use std::collections::HashMap;

/// Index of an interned data range.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct DataRangeId(pub u32);

/// Which string-like space an automaton belongs to.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum TextSpace {
    /// Strings, and strings with a language tag after a U+0000 separator.
    Plain,
    /// xsd:anyURI.
    Uri,
    /// xsd:hexBinary octets.
    Hex,
    /// xsd:base64Binary octets.
    Base64,
}

/// A data range: one set per value space.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct DataRange {
    /// owl:real and its subtypes.
    pub real: RealSet,
    /// xsd:double.
    pub double: FloatSet,
    /// xsd:float.
    pub float: FloatSet,
    /// xsd:boolean: bit 0 false, bit 1 true.
    pub boolean: u8,
    /// Strings and language-tagged strings.
    pub plain: Dfa,
    /// xsd:anyURI.
    pub uri: Dfa,
    /// xsd:hexBinary.
    pub hex: Dfa,
    /// xsd:base64Binary.
    pub base64: Dfa,
    /// xsd:dateTime.
    pub time: TimeSet,
    /// rdf:XMLLiteral: finitely many values or all but finitely many.
    pub xml: XmlSet,
    /// Literals of datatypes outside the OWL 2 datatype map.
    pub other: bool,
}

impl Default for DataRange {
    fn default() -> Self {
        DataRange {
            real: RealSet::default(),
            double: FloatSet::default(),
            float: FloatSet::default(),
            boolean: 0,
            plain: Dfa::nothing(),
            uri: Dfa::nothing(),
            hex: Dfa::nothing(),
            base64: Dfa::nothing(),
            time: TimeSet::default(),
            xml: XmlSet::default(),
            other: false,
        }
    }
}

fn dfa_and(a: &Dfa, b: &Dfa, u: &Dfa) -> Dfa {
    if a.is_nothing() || b.is_nothing() {
        Dfa::nothing()
    } else if a == u || a == b {
        b.clone()
    } else if b == u {
        a.clone()
    } else {
        a.and(b)
    }
}

fn dfa_or(a: &Dfa, b: &Dfa) -> Dfa {
    if a.is_nothing() || a == b {
        b.clone()
    } else if b.is_nothing() {
        a.clone()
    } else {
        a.or(b)
    }
}

fn dfa_not(a: &Dfa, u: &Dfa) -> Dfa {
    if a.is_nothing() {
        u.clone()
    } else if a == u {
        Dfa::nothing()
    } else {
        u.and(&a.complement())
    }
}

impl DataRange {
    /// The empty range.
    pub fn empty() -> DataRange {
        DataRange::default()
    }

    /// rdfs:Literal: every literal.
    pub fn everything() -> DataRange {
        DataRange::empty().complement()
    }

    /// Reals in one piece.
    pub fn real(p: RPiece) -> DataRange {
        DataRange {
            real: RealSet::piece(p),
            ..DataRange::empty()
        }
    }

    /// The automaton of one string-like space.
    pub fn text(space: TextSpace, d: Dfa) -> DataRange {
        let mut r = DataRange::empty();
        *r.text_mut(space) = d;
        r
    }

    fn text_mut(&mut self, s: TextSpace) -> &mut Dfa {
        match s {
            TextSpace::Plain => &mut self.plain,
            TextSpace::Uri => &mut self.uri,
            TextSpace::Hex => &mut self.hex,
            TextSpace::Base64 => &mut self.base64,
        }
    }

    /// Whether the range holds no literal at all.
    pub fn is_empty(&self) -> bool {
        !self.other
            && self.boolean == 0
            && self.real.is_empty()
            && self.double.is_empty()
            && self.float.is_empty()
            && self.time.is_empty()
            && self.plain.is_empty()
            && self.uri.is_empty()
            && self.hex.is_empty()
            && self.base64.is_empty()
            && self.xml.is_empty()
    }

    /// How many literals the range holds: `None` when infinite or more than `cap`.
    pub fn count(&self, cap: u64) -> Option<u64> {
        if self.other {
            return None;
        }
        let mut n = u64::from(self.boolean.count_ones());
        for c in [
            self.real.count(cap)?,
            self.double.count(cap)?,
            self.float.count(cap)?,
            self.time.count(cap)?,
            self.plain.count(cap)?,
            self.uri.count(cap)?,
            self.hex.count(cap)?,
            self.base64.count(cap)?,
            self.xml.count()?,
        ] {
            n = n.checked_add(c)?;
        }
        (n <= cap).then_some(n)
    }

    /// Intersection.
    pub fn intersect(&self, o: &DataRange) -> DataRange {
        let u = universe();
        DataRange {
            real: self.real.intersect(&o.real),
            double: self.double.intersect(&o.double),
            float: self.float.intersect(&o.float),
            boolean: self.boolean & o.boolean,
            plain: dfa_and(&self.plain, &o.plain, &u.plain),
            uri: dfa_and(&self.uri, &o.uri, &u.uri),
            hex: dfa_and(&self.hex, &o.hex, &u.hex),
            base64: dfa_and(&self.base64, &o.base64, &u.base64),
            time: self.time.intersect(&o.time),
            xml: self.xml.intersect(&o.xml),
            other: self.other && o.other,
        }
    }

    /// Union.
    pub fn union(&self, o: &DataRange) -> DataRange {
        DataRange {
            real: self.real.union(&o.real),
            double: self.double.union(&o.double),
            float: self.float.union(&o.float),
            boolean: self.boolean | o.boolean,
            plain: dfa_or(&self.plain, &o.plain),
            uri: dfa_or(&self.uri, &o.uri),
            hex: dfa_or(&self.hex, &o.hex),
            base64: dfa_or(&self.base64, &o.base64),
            time: self.time.union(&o.time),
            xml: self.xml.union(&o.xml),
            other: self.other || o.other,
        }
    }

    /// Complement with respect to all literals.
    pub fn complement(&self) -> DataRange {
        let u = universe();
        DataRange {
            real: self.real.complement(REAL),
            double: self.double.complement(Width::Double),
            float: self.float.complement(Width::Float),
            boolean: !self.boolean & 3,
            plain: dfa_not(&self.plain, &u.plain),
            uri: dfa_not(&self.uri, &u.uri),
            hex: dfa_not(&self.hex, &u.hex),
            base64: dfa_not(&self.base64, &u.base64),
            time: self.time.complement(),
            xml: self.xml.complement(),
            other: !self.other,
        }
    }

    /// Short text of the range, e.g. `decimal[≥ 30]`.
    pub fn describe(&self) -> String {
        text::describe(self)
    }
}

/// Interned data ranges with their complements.
#[derive(Clone, Debug, Default)]
pub struct DataRangeStore {
    ranges: Vec<DataRange>,
    /// Ranges interned by structural equality.
    ids: HashMap<DataRange, DataRangeId>,
}

impl DataRangeStore {
    /// Interns a range.
    pub fn intern(&mut self, r: DataRange) -> DataRangeId {
        if let Some(&id) = self.ids.get(&r) {
            return id;
        }
        let id = DataRangeId(self.ranges.len() as u32);
        self.ids.insert(r.clone(), id);
        self.ranges.push(r);
        id
    }

    /// The range behind an id.
    pub fn get(&self, id: DataRangeId) -> &DataRange {
        &self.ranges[id.index()]
    }

    /// Interns the complement of a range.
    pub fn complement(&mut self, id: DataRangeId) -> DataRangeId {
        let c = self.get(id).complement();
        self.intern(c)
    }
}

impl DataRangeId {
    /// Index for array look-ups.
    pub fn index(self) -> usize {
        self.0 as usize
    }
}

#[cfg(test)]
mod tests {
    use super::super::datatype::{literal, named};
    use super::*;

    const XSD: &str = "http://www.w3.org/2001/XMLSchema#";

    fn dt(local: &str) -> DataRange {
        named(&format!("{XSD}{local}")).unwrap()
    }

    fn lit(lex: &str, local: &str) -> DataRange {
        literal(lex, Some(&format!("{XSD}{local}")), None).unwrap()
    }

    #[test]
    fn value_spaces_are_disjoint() {
        // OWL 2 Structural Specification §4: decimal, double, float, string, anyURI,
        // boolean, dateTime and the binary types have pairwise disjoint value spaces.
        let all = [
            "decimal",
            "double",
            "float",
            "string",
            "anyURI",
            "boolean",
            "dateTime",
            "hexBinary",
            "base64Binary",
        ];
        for (i, a) in all.iter().enumerate() {
            for b in &all[i + 1..] {
                assert!(dt(a).intersect(&dt(b)).is_empty(), "{a} ∩ {b}");
            }
            assert!(!dt(a).is_empty());
        }
        // xsd:integer ⊂ xsd:decimal; the literal "1"^^integer equals "1.0"^^decimal.
        assert_eq!(lit("1", "integer"), lit("1.0", "decimal"));
        assert!(
            lit("1", "integer")
                .intersect(&lit("1.0E0", "double"))
                .is_empty()
        );
    }

    #[test]
    fn xml_literals_are_their_own_space() {
        // OWL 2 Structural Specification §4.6: rdf:XMLLiteral is disjoint from the others.
        let rdf = "http://www.w3.org/1999/02/22-rdf-syntax-ns#";
        let xml = named(&format!("{rdf}XMLLiteral")).unwrap();
        let xlit = |s: &str| literal(s, Some(&format!("{rdf}XMLLiteral")), None).unwrap();
        for d in ["string", "anyURI", "hexBinary", "decimal", "dateTime"] {
            assert!(xml.intersect(&dt(d)).is_empty(), "XMLLiteral ∩ {d}");
        }
        assert!(xml.intersect(&lit("<a></a>", "string")).is_empty());
        assert!(!xml.is_empty() && xml.count(1000).is_none());
        // Two lexical forms of one value are one range, and intern to one id.
        let (a, b) = (xlit("<a/>"), xlit("<a></a>"));
        assert_eq!(a, b);
        let mut store = DataRangeStore::default();
        assert_eq!(store.intern(a.clone()), store.intern(b));
        // Union, complement, counting over the space.
        let two = a.union(&xlit("<b/>"));
        assert_eq!(two.count(10), Some(2));
        assert!(two.intersect(&two.complement()).is_empty());
        assert_eq!(two.complement().complement(), two);
        assert!(xml.intersect(&a.complement()).count(10).is_none());
        assert_eq!(
            two.union(&two.complement()),
            DataRange::everything(),
            "complement is taken inside each space"
        );
        // Ill-typed: no value.
        assert!(xlit("<a>").is_empty());
        assert_eq!(a.describe(), "{\"<a></a>\" (XMLLiteral)}");
        assert_eq!(xml.describe(), "XMLLiteral");
    }

    #[test]
    fn complement_and_everything() {
        let s = dt("string");
        let c = s.complement();
        assert!(s.intersect(&c).is_empty());
        assert_eq!(s.union(&c), DataRange::everything());
        assert_eq!(c.complement(), s);
        assert_eq!(dt("boolean").count(10), Some(2));
    }
}

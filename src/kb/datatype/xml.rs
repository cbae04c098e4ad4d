//! rdf:XMLLiteral: well-formedness of a lexical form and the canonical text of its value.
//!
//! RDF 1.1 Concepts §5.1 ("The rdf:XMLLiteral Datatype") makes the lexical space the strings
//! that are well-balanced, self-contained XML content (XML 1.0 production `content`) and
//! that give a namespace-well-formed document when put between an arbitrary start and end
//! tag; the value is the DOM DocumentFragment the string parses to, and two values are equal
//! when `isEqualNode` says so. A lexical form outside that space is ill-typed and denotes no
//! value, like any other ill-typed literal (OWL 2 Structural Specification §5.7).
//!
//! Equal values must be one value here, so each value is held as a canonical text, written
//! back from the parse with the choices that make equal fragments equal strings:
//! - line ends as XML 1.0 §2.11 reads them (CR LF and CR become LF), attribute values
//!   normalised as §3.3.3 does without a DTD (a literal tab or line end becomes a space);
//! - entity and character references resolved, then re-escaped one way (`&amp;`, `&lt;`,
//!   `&gt;` and `&#xD;` in text; `&amp;`, `&lt;`, `&quot;`, `&#x9;`, `&#xA;`, `&#xD;` in
//!   attributes, always in double quotes);
//! - empty elements written as a start and an end tag (`<a/>` is `<a></a>`);
//! - attributes (namespace declarations included, which DOM counts as attributes) sorted by
//!   namespace name and local name, an attribute's prefix replaced by the least prefix in
//!   scope bound to its namespace (DOM compares attributes by namespace and local name,
//!   elements also by their prefix, which is kept);
//! - adjacent text merged, as `normalize()` does; comments and processing instructions kept
//!   (DOM compares them by their data).
//!
//! CDATA sections become text, as Canonical XML (and the RDF 2004 definition of
//! rdf:XMLLiteral, which was exclusive canonical XML) does; DOM would keep a CDATA section
//! as a node of its own kind, so `<![CDATA[a]]>` and `a` are one value here and two under a
//! strict reading of RDF 1.1. This is not a full Exclusive XML Canonicalization either: no
//! namespace declaration is added or dropped (RDF 1.1 compares the fragment as written).

use super::automaton::Class;
use super::pattern::{name_char, name_start};
use quick_xml::Reader;
use quick_xml::escape::unescape;
use quick_xml::events::Event;
use std::collections::{BTreeMap, BTreeSet};
use std::sync::OnceLock;

const XML_NS: &str = "http://www.w3.org/XML/1998/namespace";
const XMLNS_NS: &str = "http://www.w3.org/2000/xmlns/";

/// A set of rdf:XMLLiteral values, each held as its canonical text: finitely many values,
/// or all values but finitely many. No facet applies to rdf:XMLLiteral (OWL 2 Structural
/// Specification §4.6), so literals, the datatype itself and the boolean operations only
/// ever build such sets, and this form keeps every operation exact and cheap.
#[derive(Clone, Debug, Default, PartialEq, Eq, Hash)]
pub struct XmlSet {
    /// `true`: every value except `values`; `false`: exactly `values`.
    pub co: bool,
    /// Canonical texts.
    pub values: BTreeSet<String>,
}

impl XmlSet {
    /// Every rdf:XMLLiteral value.
    pub fn full() -> XmlSet {
        XmlSet {
            co: true,
            values: BTreeSet::new(),
        }
    }

    /// One value, given by its canonical text.
    pub fn single(text: &str) -> XmlSet {
        XmlSet {
            co: false,
            values: BTreeSet::from([text.to_string()]),
        }
    }

    /// Whether the set holds no value (the value space is infinite, so a co-set never is).
    pub fn is_empty(&self) -> bool {
        !self.co && self.values.is_empty()
    }

    /// How many values: `None` when infinite.
    pub fn count(&self) -> Option<u64> {
        (!self.co).then_some(self.values.len() as u64)
    }

    /// Intersection.
    pub fn intersect(&self, o: &XmlSet) -> XmlSet {
        let (co, values) = match (self.co, o.co) {
            (false, false) => (false, &self.values & &o.values),
            (false, true) => (false, &self.values - &o.values),
            (true, false) => (false, &o.values - &self.values),
            (true, true) => (true, &self.values | &o.values),
        };
        XmlSet { co, values }
    }

    /// Union.
    pub fn union(&self, o: &XmlSet) -> XmlSet {
        self.complement().intersect(&o.complement()).complement()
    }

    /// Complement within the rdf:XMLLiteral values.
    pub fn complement(&self) -> XmlSet {
        XmlSet {
            co: !self.co,
            values: self.values.clone(),
        }
    }
}

/// The canonical text of the value of an rdf:XMLLiteral lexical form, or `None` when the
/// form is not well-balanced, namespace-well-formed XML content (the literal is ill-typed).
pub fn canonical(lex: &str) -> Option<String> {
    // XML 1.0 §2.11: the parser sees LF for CR LF and for a lone CR.
    let text = lex.replace("\r\n", "\n").replace('\r', "\n");
    if !text.chars().all(is_xml_char) {
        return None;
    }
    let mut reader = Reader::from_str(&text);
    let config = reader.config_mut();
    config.check_end_names = true;
    config.check_comments = true;
    config.expand_empty_elements = false;
    config.allow_unmatched_ends = false;
    let mut out = String::new();
    let mut pending = String::new();
    // Open elements: the name as written and the namespace bindings in scope after it.
    let mut open: Vec<(String, Scope)> = Vec::new();
    let root = Scope::root();
    loop {
        let event = reader.read_event().ok()?;
        match &event {
            Event::Text(_) | Event::CData(_) => {}
            _ => flush(&mut pending, &mut out),
        }
        let empty = matches!(event, Event::Empty(_));
        match event {
            Event::Start(e) | Event::Empty(e) => {
                let name = std::str::from_utf8(e.name().0).ok()?.to_string();
                if !attributes_separated(std::str::from_utf8(e.attributes_raw()).ok()?) {
                    return None;
                }
                let attrs: Vec<(String, String)> = e
                    .attributes()
                    .map(|a| {
                        let a = a.ok()?;
                        let key = std::str::from_utf8(a.key.0).ok()?.to_string();
                        let raw = std::str::from_utf8(&a.value).ok()?;
                        Some((key, attribute_value(raw)?))
                    })
                    .collect::<Option<_>>()?;
                let parent = open.last().map_or(&root, |(_, s)| s);
                let (scope, tag) = start_tag(&name, &attrs, parent)?;
                out.push_str(&tag);
                if empty {
                    out.push_str(&format!("</{name}>"));
                } else {
                    open.push((name, scope));
                }
            }
            Event::End(e) => {
                let (name, _) = open.pop()?;
                if e.name().0 != name.as_bytes() {
                    return None;
                }
                out.push_str(&format!("</{name}>"));
            }
            Event::Text(t) => {
                let raw = std::str::from_utf8(&t).ok()?;
                // XML 1.0 §2.4: "]]>" may not appear in character data.
                if raw.contains("]]>") {
                    return None;
                }
                let v = unescape(raw).ok()?;
                if !v.chars().all(is_xml_char) {
                    return None;
                }
                pending.push_str(&v);
            }
            Event::CData(c) => pending.push_str(std::str::from_utf8(&c).ok()?),
            Event::Comment(c) => {
                let body = std::str::from_utf8(&c).ok()?;
                // XML 1.0 production [15]: no "--" inside and no "-" at the end.
                if body.contains("--") || body.ends_with('-') {
                    return None;
                }
                out.push_str(&format!("<!--{body}-->"));
            }
            Event::PI(p) => {
                let target = std::str::from_utf8(p.target()).ok()?;
                // XML 1.0 production [17]: a Name, not "xml" in any case; Namespaces: no ':'.
                if !is_ncname(target) || target.eq_ignore_ascii_case("xml") {
                    return None;
                }
                let data = std::str::from_utf8(p.content()).ok()?;
                let data = data.trim_start_matches([' ', '\t', '\n']);
                if data.is_empty() {
                    out.push_str(&format!("<?{target}?>"));
                } else {
                    out.push_str(&format!("<?{target} {data}?>"));
                }
            }
            // An XML declaration or a document type declaration is no part of `content`.
            Event::Decl(_) | Event::DocType(_) => return None,
            Event::Eof => break,
        }
    }
    flush(&mut pending, &mut out);
    open.is_empty().then_some(out)
}

/// Namespace bindings in scope: prefix (empty for the default namespace) to namespace name.
#[derive(Clone, Debug)]
struct Scope(BTreeMap<String, String>);

impl Scope {
    fn root() -> Scope {
        Scope(BTreeMap::from([("xml".to_string(), XML_NS.to_string())]))
    }

    /// The least prefix bound to a namespace, for writing attribute names one way.
    fn least_prefix(&self, ns: &str) -> Option<&str> {
        self.0
            .iter()
            .find(|(p, n)| !p.is_empty() && n.as_str() == ns)
            .map(|(p, _)| p.as_str())
    }
}

/// Checks a start tag against Namespaces in XML 1.0 and writes it canonically; returns the
/// namespace bindings in scope inside the element too.
fn start_tag(name: &str, attrs: &[(String, String)], parent: &Scope) -> Option<(Scope, String)> {
    let mut scope = parent.clone();
    for (k, v) in attrs {
        let prefix = if k == "xmlns" {
            Some("")
        } else {
            k.strip_prefix("xmlns:")
        };
        let Some(prefix) = prefix else { continue };
        // Namespaces in XML 1.0 §3: xml only to its own name, xmlns never, no undeclaring.
        if (prefix == "xml") != (v == XML_NS) || prefix == "xmlns" || v == XMLNS_NS {
            return None;
        }
        if !prefix.is_empty() && (v.is_empty() || !is_ncname(prefix)) {
            return None;
        }
        scope.0.insert(prefix.to_string(), v.clone());
    }
    let (eprefix, _) = split_qname(name)?;
    if eprefix == Some("xmlns") {
        return None;
    }
    if let Some(p) = eprefix {
        scope.0.get(p)?;
    }
    // Attributes keyed by (namespace name, local name), as DOM compares them.
    let mut keyed: BTreeMap<(String, String), String> = BTreeMap::new();
    for (k, v) in attrs {
        let (p, local) = split_qname(k)?;
        let key = match p {
            None if local == "xmlns" => (XMLNS_NS.to_string(), local.to_string()),
            None => (String::new(), local.to_string()),
            Some("xmlns") => (XMLNS_NS.to_string(), local.to_string()),
            Some(p) => (scope.0.get(p)?.clone(), local.to_string()),
        };
        if keyed.insert(key, v.clone()).is_some() {
            return None; // the same attribute twice (Namespaces in XML 1.0 §6.3)
        }
    }
    let mut tag = format!("<{name}");
    for ((ns, local), v) in &keyed {
        let written = if ns.is_empty() {
            local.clone()
        } else if ns == XMLNS_NS {
            if local == "xmlns" {
                "xmlns".to_string()
            } else {
                format!("xmlns:{local}")
            }
        } else {
            format!("{}:{local}", scope.least_prefix(ns)?)
        };
        tag.push_str(&format!(" {written}=\"{}\"", escape_attribute(v)));
    }
    tag.push('>');
    Some((scope, tag))
}

/// Whether every attribute value is followed by white space or the end of the tag, as XML
/// 1.0 production [40] requires (`<a b='1'c='2'>` is not well-formed; quick-xml accepts it).
/// A quote can only open or close a value in a well-formed tag, so quotes pair up.
fn attributes_separated(raw: &str) -> bool {
    let b = raw.as_bytes();
    let mut i = 0;
    while i < b.len() {
        if b[i] == b'\'' || b[i] == b'"' {
            let Some(len) = raw[i + 1..].find(b[i] as char) else {
                return false;
            };
            i += len + 2;
            if i < b.len() && !matches!(b[i], b' ' | b'\t' | b'\n' | b'\r' | b'/') {
                return false;
            }
        } else {
            i += 1;
        }
    }
    true
}

/// A qualified name (Namespaces in XML 1.0 production [7]): optional prefix and local part.
fn split_qname(q: &str) -> Option<(Option<&str>, &str)> {
    match q.split_once(':') {
        Some((p, l)) if is_ncname(p) && is_ncname(l) => Some((Some(p), l)),
        None if is_ncname(q) => Some((None, q)),
        _ => None,
    }
}

/// An attribute value as XML 1.0 §3.3.3 normalises it without a DTD: a literal white space
/// character becomes a space, then references are resolved; `<` may not appear.
fn attribute_value(raw: &str) -> Option<String> {
    if raw.contains('<') {
        return None;
    }
    let spaced: String = raw
        .chars()
        .map(|c| if matches!(c, '\t' | '\n') { ' ' } else { c })
        .collect();
    let v = unescape(&spaced).ok()?.into_owned();
    v.chars().all(is_xml_char).then_some(v)
}

fn flush(pending: &mut String, out: &mut String) {
    for c in pending.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '\r' => out.push_str("&#xD;"),
            c => out.push(c),
        }
    }
    pending.clear();
}

fn escape_attribute(v: &str) -> String {
    let mut s = String::new();
    for c in v.chars() {
        match c {
            '&' => s.push_str("&amp;"),
            '<' => s.push_str("&lt;"),
            '"' => s.push_str("&quot;"),
            '\t' => s.push_str("&#x9;"),
            '\n' => s.push_str("&#xA;"),
            '\r' => s.push_str("&#xD;"),
            c => s.push(c),
        }
    }
    s
}

fn is_xml_char(c: char) -> bool {
    matches!(c as u32, 0x9 | 0xA | 0xD | 0x20..=0xD7FF | 0xE000..=0xFFFD | 0x10000..=0x10FFFF)
}

fn in_class(c: &Class, ch: char) -> bool {
    let x = ch as u32;
    c.binary_search_by(|&(lo, hi)| {
        if hi < x {
            std::cmp::Ordering::Less
        } else if lo > x {
            std::cmp::Ordering::Greater
        } else {
            std::cmp::Ordering::Equal
        }
    })
    .is_ok()
}

/// An XML name without a colon (Namespaces in XML 1.0 production [4], NCName).
fn is_ncname(s: &str) -> bool {
    static CLASSES: OnceLock<(Class, Class)> = OnceLock::new();
    let (start, rest) = CLASSES.get_or_init(|| (name_start(), name_char()));
    let mut chars = s.chars();
    chars.next().is_some_and(|c| c != ':' && in_class(start, c))
        && chars.all(|c| c != ':' && in_class(rest, c))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn c(s: &str) -> Option<String> {
        canonical(s)
    }

    #[test]
    fn equal_values_written_differently() {
        // Hand-derived from XML 1.0 and DOM equality: these pairs parse to equal fragments.
        assert_eq!(c("<a/>").as_deref(), Some("<a></a>"));
        assert_eq!(c("<a/>"), c("<a></a>"));
        assert_eq!(
            c("<a y='2' x=\"1\"/>").as_deref(),
            Some("<a x=\"1\" y=\"2\"></a>")
        );
        assert_eq!(c("<b>&#65;</b>"), c("<b>A</b>"));
        assert_eq!(
            c("<b>&#x41;&amp;&gt;</b>").as_deref(),
            Some("<b>A&amp;&gt;</b>")
        );
        assert_eq!(
            c("<b><![CDATA[<x>]]></b>").as_deref(),
            Some("<b>&lt;x&gt;</b>")
        );
        assert_eq!(c("x\r\ny"), c("x\ny"));
        // A literal tab in an attribute value is a space; a character reference stays a tab.
        assert_eq!(c("<a x='p\tq'/>"), c("<a x='p q'/>"));
        assert_eq!(c("<a x='&#9;'/>").as_deref(), Some("<a x=\"&#x9;\"></a>"));
        // Attributes compare by namespace and local name, not by the prefix written.
        assert_eq!(
            c("<a xmlns:p='u' xmlns:q='u' q:x='1'/>"),
            c("<a xmlns:q='u' xmlns:p='u' p:x='1'/>")
        );
        assert_eq!(c("<?t   d?>").as_deref(), Some("<?t d?>"));
        assert_eq!(c("").as_deref(), Some(""));
        assert_eq!(c("a<b>c</b>d<e/>").as_deref(), Some("a<b>c</b>d<e></e>"));
    }

    #[test]
    fn different_values_stay_apart() {
        assert_ne!(c("<a x='1'/>"), c("<a x='2'/>"));
        // White space is text, and element prefixes count (DOM compares them).
        assert_ne!(c("<a> </a>"), c("<a></a>"));
        assert_ne!(c("<p:a xmlns:p='u'/>"), c("<q:a xmlns:q='u'/>"));
        assert_ne!(c("<a><!--x--></a>"), c("<a></a>"));
        assert_ne!(c("<a/><b/>"), c("<b/><a/>"));
    }

    #[test]
    fn finite_and_cofinite_sets() {
        // Hand-derived set algebra: A = {a, b}, B = all but {b, c}.
        let a = XmlSet::single("a").union(&XmlSet::single("b"));
        let b = XmlSet::single("b").union(&XmlSet::single("c")).complement();
        assert_eq!(a.intersect(&b), XmlSet::single("a"));
        assert_eq!(a.union(&b), XmlSet::single("c").complement());
        assert_eq!(a.count(), Some(2));
        assert_eq!(b.count(), None);
        assert!(a.intersect(&a.complement()).is_empty());
        assert_eq!(a.union(&a.complement()), XmlSet::full());
        assert!(!b.intersect(&XmlSet::single("d").complement()).is_empty());
    }

    #[test]
    fn ill_formed_fragments() {
        // Each breaks a named rule of XML 1.0 or Namespaces in XML 1.0.
        for bad in [
            "<a>",                       // unclosed element
            "<a></b>",                   // mismatched end tag
            "</a>",                      // end tag without start
            "a & b",                     // bare ampersand
            "&nbsp;",                    // entity not predefined (no DTD)
            "<a>&#0;</a>",               // reference to a non-character
            "<a x='1' x='2'/>",          // repeated attribute
            "<p:a/>",                    // undeclared prefix
            "<a p:x='1'/>",              // undeclared attribute prefix
            "<a xmlns:p=''/>",           // undeclaring a prefix (Namespaces 1.0)
            "<?xml version='1.0'?><a/>", // XML declaration is not content
            "<!DOCTYPE a><a/>",          // nor is a DOCTYPE
            "<!-- a -- b -->",           // "--" inside a comment
            "<a x='<'/>",                // '<' in an attribute value
            "]]>",                       // "]]>" in character data
            "<1a/>",                     // not a name
            "<a b='1'c='2'/>",           // no white space between attributes
            "<a b=1/>",                  // unquoted attribute value
            "\u{1}",                     // not an XML character
        ] {
            assert_eq!(c(bad), None, "{bad:?}");
        }
    }
}

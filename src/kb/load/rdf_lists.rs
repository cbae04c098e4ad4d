//! The parts of an RDF graph that horned-owl's RDF reader leaves unread: RDF lists of
//! owl:AllDisjointClasses/AllDisjointProperties (read here from the graph by oxrdfio),
//! annotation triples whose property is declared nowhere, and the text of every leftover
//! part for messages.

use crate::kb::owl::OWL;
use horned_owl::io::ofn::writer::AsFunctional;
use horned_owl::model::{
    AnnotatedComponent, ArcStr, Build, ClassExpression as CE, Component,
    ObjectPropertyExpression as OPE,
};
use horned_owl::ontology::set::SetOntology;
use std::collections::BTreeSet;

/// A term of horned-owl's RDF reader as N-Triples-like text.
fn term_text(t: &horned_owl::io::rdf::reader::Term<ArcStr>) -> String {
    use horned_owl::io::rdf::reader::Term;
    match t {
        Term::OWL(v) => format!("<{}>", v.as_ref()),
        Term::RDF(v) => format!("<{}>", v.as_ref()),
        Term::RDFS(v) => format!("<{}>", v.as_ref()),
        Term::SWRL(v) => format!("<{}>", v.as_ref()),
        Term::FacetTerm(f) => format!("<{}>", f.as_ref()),
        Term::Iri(i) => format!("<{i}>"),
        // The node id is private; its Debug form is `BNode("id")`. The id is random per
        // parse: it is marked here and renumbered by `leftover_parts`.
        Term::BNode(b) => {
            let d = format!("{b:?}");
            format!(
                "_:\u{1}{}\u{2}",
                d.trim_start_matches("BNode(\"").trim_end_matches("\")")
            )
        }
        Term::Literal(l) => l.as_functional().to_string(),
    }
}

/// Every part of the graph that the RDF reader left unread, as text, so that none is
/// dropped silently.
pub(super) fn leftover_parts(
    inc: &horned_owl::io::rdf::reader::IncompleteParse<ArcStr>,
) -> Vec<String> {
    let triple = |t: &[horned_owl::io::rdf::reader::Term<ArcStr>; 3]| {
        format!(
            "{} {} {}",
            term_text(&t[0]),
            term_text(&t[1]),
            term_text(&t[2])
        )
    };
    let mut left: Vec<String> = Vec::new();
    left.extend(inc.simple.iter().map(|t| triple(t.triple())));
    left.extend(
        inc.bnode
            .iter()
            .map(|v| v.iter().map(&triple).collect::<Vec<_>>().join(" . ")),
    );
    left.extend(inc.bnode_seq.iter().map(|seq| {
        format!(
            "list ({})",
            seq.iter().map(term_text).collect::<Vec<_>>().join(" ")
        )
    }));
    left.extend(
        inc.class_expression
            .iter()
            .map(|c| format!("unused class expression {}", c.as_functional())),
    );
    // Reified annotations (owl:Axiom) whose axiom was not read would be lost silently.
    left.extend(inc.ann_map.iter().map(|(t, anns)| {
        format!(
            "annotations {} on an axiom that was not read: {}",
            anns.iter()
                .map(|a| a.as_functional().to_string())
                .collect::<Vec<_>>()
                .join(" "),
            triple(t)
        )
    }));
    left.extend(
        inc.object_property_expression
            .iter()
            .map(|p| format!("unused property expression {}", p.as_functional())),
    );
    left.extend(
        inc.data_range
            .iter()
            .map(|d| format!("unused data range {}", d.as_functional())),
    );
    renumber_blank_nodes(left)
}

/// Sorts the parts and names their blank nodes `_:b1`, `_:b2`, … in order of first
/// appearance, so that messages are the same on every run (the parser's ids are random).
fn renumber_blank_nodes(parts: Vec<String>) -> Vec<String> {
    let masked = |s: &str| {
        let mut out = String::new();
        let mut inside = false;
        for c in s.chars() {
            match c {
                '\u{1}' => inside = true,
                '\u{2}' => inside = false,
                _ if !inside => out.push(c),
                _ => {}
            }
        }
        out
    };
    let mut keyed: Vec<(String, String)> = parts.into_iter().map(|p| (masked(&p), p)).collect();
    keyed.sort();
    let mut names: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
    keyed
        .into_iter()
        .map(|(_, p)| {
            let mut out = String::new();
            let mut rest = p.as_str();
            while let Some(start) = rest.find('\u{1}') {
                out.push_str(&rest[..start]);
                let after = &rest[start + 1..];
                let end = after.find('\u{2}').unwrap_or(after.len());
                let next = names.len() + 1;
                let n = *names.entry(after[..end].to_owned()).or_insert(next);
                out.push_str(&format!("b{n}"));
                rest = after.get(end + 1..).unwrap_or("");
            }
            out.push_str(rest);
            out
        })
        .collect()
}

/// An owl:AllDisjointClasses or owl:AllDisjointProperties node whose members are IRIs.
pub(super) struct AllDisjoint {
    classes: bool,
    members: Vec<String>,
}

/// Finds `_:x rdf:type owl:AllDisjointClasses|owl:AllDisjointProperties . _:x owl:members
/// (m1 … mn)` with n ≥ 2 members and nothing else said about `_:x` or the list nodes (OWL 2
/// Mapping to RDF Graphs, Table 16), and returns the rest of the graph as N-Triples
/// without those nodes, plus the groups with named members. Classes with anonymous
/// members are written back as pairwise owl:disjointWith triples instead. None when there
/// is no such node (or the document does not parse: then horned-owl reports the error).
pub(super) fn take_all_disjoint(
    text: &str,
    format: oxrdfio::RdfFormat,
) -> Option<(String, Vec<AllDisjoint>)> {
    use oxrdf::{NamedOrBlankNode, Term, Triple};
    use std::collections::HashMap;
    if !text.contains("AllDisjointClasses") && !text.contains("AllDisjointProperties") {
        return None;
    }
    let rdf = "http://www.w3.org/1999/02/22-rdf-syntax-ns#";
    let triples: Vec<Triple> = oxrdfio::RdfParser::from_format(format)
        .for_reader(text.as_bytes())
        .map(|q| q.map(Triple::from))
        .collect::<Result<_, _>>()
        .ok()?;
    let mut by_subject: HashMap<&NamedOrBlankNode, Vec<usize>> = HashMap::new();
    let mut as_object: HashMap<&Term, usize> = HashMap::new();
    for (i, t) in triples.iter().enumerate() {
        by_subject.entry(&t.subject).or_default().push(i);
        *as_object.entry(&t.object).or_default() += 1;
    }
    let pred = |i: usize| triples[i].predicate.as_str();
    let mut taken = vec![false; triples.len()];
    let mut groups = Vec::new();
    let mut extra: Vec<Triple> = Vec::new();
    for t in &triples {
        let Term::NamedNode(ty) = &t.object else {
            continue;
        };
        let classes = match ty.as_str() {
            s if s == format!("{OWL}AllDisjointClasses") => true,
            s if s == format!("{OWL}AllDisjointProperties") => false,
            _ => continue,
        };
        if t.predicate.as_str() != format!("{rdf}type")
            || !matches!(t.subject, NamedOrBlankNode::BlankNode(_))
        {
            continue;
        }
        let own = &by_subject[&t.subject];
        let [a, b] = own.as_slice() else {
            continue;
        };
        let members_at = if pred(*a) == format!("{OWL}members") {
            *a
        } else {
            *b
        };
        if pred(members_at) != format!("{OWL}members") || own.iter().any(|&i| taken[i]) {
            continue;
        }
        // Walk the list: each node says exactly rdf:first (an IRI) and rdf:rest (optionally
        // rdf:type rdf:List) and is referred to once.
        let mut node = triples[members_at].object.clone();
        let mut used: Vec<usize> = own.clone();
        let mut members = Vec::new();
        let complete = loop {
            let Term::BlankNode(bn) = &node else {
                break node
                    == Term::NamedNode(oxrdf::NamedNode::new_unchecked(format!("{rdf}nil")));
            };
            let key = NamedOrBlankNode::BlankNode(bn.clone());
            let Some(list) = by_subject.get(&key) else {
                break false;
            };
            if as_object.get(&node).copied() != Some(1) {
                break false;
            }
            let (mut first, mut rest) = (None, None);
            for &i in list {
                match pred(i) {
                    p if p == format!("{rdf}first") => first = Some(i),
                    p if p == format!("{rdf}rest") => rest = Some(i),
                    p if p == format!("{rdf}type")
                        && triples[i].object.to_string() == format!("<{rdf}List>") => {}
                    _ => {
                        first = None;
                        break;
                    }
                }
            }
            let (Some(f), Some(r)) = (first, rest) else {
                break false;
            };
            match &triples[f].object {
                Term::NamedNode(_) => {}
                // A class expression; property expressions as blank nodes stay unread.
                Term::BlankNode(_) if classes => {}
                _ => break false,
            }
            members.push(triples[f].object.clone());
            used.extend(list.iter().copied());
            node = triples[r].object.clone();
        };
        if !complete || members.len() < 2 || used.iter().any(|&i| taken[i]) {
            continue;
        }
        for i in used {
            taken[i] = true;
        }
        if members.iter().all(|m| matches!(m, Term::NamedNode(_))) {
            let members = members
                .iter()
                .map(|m| match m {
                    Term::NamedNode(n) => n.as_str().to_owned(),
                    _ => String::new(),
                })
                .collect();
            groups.push(AllDisjoint { classes, members });
        } else {
            // Anonymous class expressions among the members: DisjointClasses(C1 … Cn) is
            // pairwise disjointness (OWL 2 Direct Semantics, Table 5), written as
            // owl:disjointWith triples that the reader maps back (Table 16).
            for (i, a) in members.iter().enumerate() {
                for b in &members[i + 1..] {
                    let subject = match a {
                        Term::NamedNode(n) => NamedOrBlankNode::NamedNode(n.clone()),
                        Term::BlankNode(n) => NamedOrBlankNode::BlankNode(n.clone()),
                        _ => continue,
                    };
                    extra.push(Triple::new(
                        subject,
                        oxrdf::NamedNode::new_unchecked(format!("{OWL}disjointWith")),
                        b.clone(),
                    ));
                }
            }
        }
    }
    if groups.is_empty() && extra.is_empty() {
        return None;
    }
    let mut out =
        oxrdfio::RdfSerializer::from_format(oxrdfio::RdfFormat::NTriples).for_writer(Vec::new());
    for (t, gone) in triples.iter().zip(&taken) {
        if !gone {
            out.serialize_triple(t).ok()?;
        }
    }
    for t in &extra {
        out.serialize_triple(t).ok()?;
    }
    let nt = String::from_utf8(out.finish().ok()?).ok()?;
    Some((nt, groups))
}

/// Adds the axioms of the owl:AllDisjoint… nodes taken out of the graph: classes as
/// DisjointClasses; properties as DisjointObjectProperties or DisjointDataProperties
/// after their declarations, or reported unreadable when the members are not all
/// declared object or all declared data properties.
pub(super) fn add_all_disjoint(
    ont: &mut SetOntology<ArcStr>,
    groups: Vec<AllDisjoint>,
    left: &mut Vec<String>,
) {
    use horned_owl::model::{
        Class, DataProperty, DisjointClasses, DisjointDataProperties, DisjointObjectProperties,
        MutableOntology, ObjectProperty,
    };
    let build: Build<ArcStr> = Build::new_arc();
    let mut object = BTreeSet::new();
    let mut data = BTreeSet::new();
    for ac in ont.iter() {
        match &ac.component {
            Component::DeclareObjectProperty(p) => {
                object.insert(p.0.to_string());
            }
            Component::DeclareDataProperty(p) => {
                data.insert(p.0.to_string());
            }
            _ => {}
        }
    }
    for g in groups {
        let component: Component<ArcStr> = if g.classes {
            DisjointClasses(
                g.members
                    .iter()
                    .map(|m| CE::Class(Class(build.iri(m.as_str()))))
                    .collect(),
            )
            .into()
        } else if g.members.iter().all(|m| object.contains(m)) {
            DisjointObjectProperties(
                g.members
                    .iter()
                    .map(|m| OPE::ObjectProperty(ObjectProperty(build.iri(m.as_str()))))
                    .collect(),
            )
            .into()
        } else if g.members.iter().all(|m| data.contains(m)) {
            DisjointDataProperties(
                g.members
                    .iter()
                    .map(|m| DataProperty(build.iri(m.as_str())))
                    .collect(),
            )
            .into()
        } else {
            left.push(format!(
                "owl:AllDisjointProperties with members {} (not all declared object properties or all declared data properties)",
                g.members
                    .iter()
                    .map(|m| format!("<{m}>"))
                    .collect::<Vec<_>>()
                    .join(" ")
            ));
            continue;
        };
        ont.insert(AnnotatedComponent {
            component,
            ann: BTreeSet::new(),
        });
    }
}

/// Takes out of the leftovers every triple `s p o` with an IRI subject whose predicate is
/// declared nowhere as an object or data property (nor is OWL, RDF or XML Schema
/// vocabulary) and whose object is a literal or an IRI, and returns them as annotation
/// assertions with their reified annotations. The OWL 2 Mapping to RDF Graphs (§3.2.5,
/// Table 17) reads such triples as annotations once the property is an annotation
/// property; editors save annotation properties without declaring them, and a predicate
/// that is no object or data property can only be one.
pub(super) fn annotations_from_leftovers(
    inc: &mut horned_owl::io::rdf::reader::IncompleteParse<ArcStr>,
    properties: &BTreeSet<String>,
) -> Vec<AnnotatedComponent<ArcStr>> {
    use horned_owl::io::rdf::reader::Term;
    use horned_owl::model::{
        Annotation, AnnotationAssertion, AnnotationProperty, AnnotationSubject,
        AnnotationValue as AV,
    };
    const RESERVED: [&str; 4] = [
        "http://www.w3.org/2002/07/owl#",
        "http://www.w3.org/1999/02/22-rdf-syntax-ns#",
        "http://www.w3.org/2000/01/rdf-schema#",
        "http://www.w3.org/2001/XMLSchema#",
    ];
    let mut out = Vec::new();
    let ann_map = &mut inc.ann_map;
    inc.simple.retain(|t| {
        let [Term::Iri(s), Term::Iri(p), o] = t.triple() else {
            return true;
        };
        let name = p.to_string();
        if properties.contains(&name) || RESERVED.iter().any(|r| name.starts_with(r)) {
            return true;
        }
        let av = match o {
            Term::Literal(l) => AV::Literal(l.clone()),
            Term::Iri(i) => AV::IRI(i.clone()),
            _ => return true,
        };
        out.push(AnnotatedComponent {
            component: AnnotationAssertion {
                subject: AnnotationSubject::IRI(s.clone()),
                ann: Annotation {
                    ap: AnnotationProperty(p.clone()),
                    av,
                    ann: BTreeSet::new(),
                },
            }
            .into(),
            ann: ann_map.remove(t.triple()).unwrap_or_default(),
        });
        false
    });
    out
}

/// The graph as N-Triples without the triples that type an ontology with a class besides
/// owl:Ontology (`<o> rdf:type voaf:Vocabulary`), which horned-owl 4.0.0 refuses, and
/// those triples as text for the unread parts. None when the graph does not parse or
/// has no such triple.
pub(super) fn drop_ontology_types(
    text: &str,
    format: oxrdfio::RdfFormat,
) -> Option<(String, Vec<String>)> {
    use oxrdf::{Term, Triple};
    let rdf_type = "http://www.w3.org/1999/02/22-rdf-syntax-ns#type";
    let ontology = format!("{OWL}Ontology");
    let triples: Vec<Triple> = oxrdfio::RdfParser::from_format(format)
        .for_reader(text.as_bytes())
        .map(|q| q.map(Triple::from))
        .collect::<Result<_, _>>()
        .ok()?;
    let ontologies: BTreeSet<String> = triples
        .iter()
        .filter(|t| {
            t.predicate.as_str() == rdf_type
                && matches!(&t.object, Term::NamedNode(n) if n.as_str() == ontology)
        })
        .map(|t| t.subject.to_string())
        .collect();
    let mut dropped = Vec::new();
    let mut out =
        oxrdfio::RdfSerializer::from_format(oxrdfio::RdfFormat::NTriples).for_writer(Vec::new());
    for t in &triples {
        let extra_type = t.predicate.as_str() == rdf_type
            && ontologies.contains(&t.subject.to_string())
            && !matches!(&t.object, Term::NamedNode(n) if n.as_str() == ontology);
        if extra_type {
            dropped.push(format!(
                "{t} (the ontology is typed with a class besides owl:Ontology, which OWL 2 does not read)"
            ));
        } else {
            out.serialize_triple(t).ok()?;
        }
    }
    if dropped.is_empty() {
        return None;
    }
    Some((String::from_utf8(out.finish().ok()?).ok()?, dropped))
}

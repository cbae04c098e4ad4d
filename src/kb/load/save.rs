//! Writing edits back into the documents they belong to. A new axiom goes into the document
//! that declares its subject (or into one the caller names); a retracted axiom leaves every
//! document that holds it. A functional-syntax document is patched as text, so that its
//! comments, layout, prefixes and every axiom not edited stay byte for byte; a document in
//! another syntax is written again, in its own syntax, from its components (imports,
//! ontology annotations and axiom annotations are components, so they stay too).

use super::document::{DocumentEdit, write_components};
use super::parse::with_standard_prefixes;
use super::parse::{Parsed, on_parser_thread, open_bytes, read_functional, unreadable_error};
use super::split_prefixes;
use super::syntax::Syntax;
use crate::kb::KbError;
use horned_owl::io::ofn::writer::AsFunctional;
use horned_owl::model::{
    AnnotatedComponent, ArcStr, Class, Component, DataProperty, DeclareClass, DeclareDataProperty,
    DeclareNamedIndividual, DeclareObjectProperty, NamedIndividual, ObjectProperty,
};
use horned_owl::visitor::immutable::{Visit, Walk};
use std::collections::BTreeSet;

/// The documents that the edits change, with their new text, and where each edit went.
#[derive(Clone, Debug, Default)]
pub struct WriteBack {
    /// (document index, new text) for each document that changes, in document order.
    pub changed: Vec<(usize, String)>,
    /// For each edit, in order, the documents it changed (none when it changed nothing,
    /// for instance an axiom added that a document already holds).
    pub placed: Vec<Vec<usize>>,
}

/// An entity named in an axiom, with its kind, in the order the axiom names them.
#[derive(Clone, Debug, PartialEq, Eq)]
enum Named {
    Class(String),
    ObjectProperty(String),
    DataProperty(String),
    Individual(String),
}

impl Named {
    fn iri(&self) -> &str {
        match self {
            Named::Class(i) | Named::ObjectProperty(i) | Named::DataProperty(i) => i,
            Named::Individual(i) => i,
        }
    }

    fn declaration(&self) -> Component<ArcStr> {
        let b = horned_owl::model::Build::<ArcStr>::new();
        match self {
            Named::Class(i) => DeclareClass(Class(b.iri(i.as_str()))).into(),
            Named::ObjectProperty(i) => {
                DeclareObjectProperty(ObjectProperty(b.iri(i.as_str()))).into()
            }
            Named::DataProperty(i) => DeclareDataProperty(DataProperty(b.iri(i.as_str()))).into(),
            Named::Individual(i) => {
                DeclareNamedIndividual(NamedIndividual(b.iri(i.as_str()))).into()
            }
        }
    }
}

/// Collects the entities an axiom names (not those of its annotations).
#[derive(Default)]
struct Names(Vec<Named>);

impl Visit<ArcStr> for Names {
    fn visit_class(&mut self, c: &Class<ArcStr>) {
        self.0.push(Named::Class(c.0.to_string()));
    }
    fn visit_object_property(&mut self, p: &ObjectProperty<ArcStr>) {
        self.0.push(Named::ObjectProperty(p.0.to_string()));
    }
    fn visit_data_property(&mut self, p: &DataProperty<ArcStr>) {
        self.0.push(Named::DataProperty(p.0.to_string()));
    }
    fn visit_named_individual(&mut self, i: &NamedIndividual<ArcStr>) {
        self.0.push(Named::Individual(i.0.to_string()));
    }
}

/// The entities of a component, in the order it names them.
fn names_of(c: &Component<ArcStr>) -> Vec<Named> {
    let mut w = Walk::new(Names::default());
    w.component(c);
    w.into_visit().0
}

/// The entity an axiom is about: the individual of an assertion, else the first entity
/// it names (the subclass of `SubClassOf`, the first class of `DisjointClasses`, ...).
fn subject(c: &Component<ArcStr>) -> Option<String> {
    let names = names_of(c);
    let assertion = matches!(
        c,
        Component::ClassAssertion(_)
            | Component::ObjectPropertyAssertion(_)
            | Component::NegativeObjectPropertyAssertion(_)
            | Component::DataPropertyAssertion(_)
            | Component::NegativeDataPropertyAssertion(_)
    );
    if let Component::AnnotationAssertion(a) = c
        && let horned_owl::model::AnnotationSubject::IRI(i) = &a.subject
    {
        return Some(i.to_string());
    }
    names
        .iter()
        .find(|n| !assertion || matches!(n, Named::Individual(_)))
        .or(names.first())
        .map(|n| n.iri().to_string())
}

/// Whether an IRI is in a namespace that no document declares (OWL, RDF, RDFS, XSD).
fn built_in(iri: &str) -> bool {
    [
        "http://www.w3.org/2002/07/owl#",
        "http://www.w3.org/1999/02/22-rdf-syntax-ns#",
        "http://www.w3.org/2000/01/rdf-schema#",
        "http://www.w3.org/2001/XMLSchema#",
    ]
    .iter()
    .any(|ns| iri.starts_with(ns))
}

/// The text by which the knowledge base knows an axiom (no annotations, full IRIs).
fn key(c: &Component<ArcStr>) -> String {
    c.as_functional().to_string()
}

/// Parses axioms in functional syntax (`Prefix` lines may precede them) into components.
fn parse_axioms(name: &str, text: &str) -> Result<Vec<AnnotatedComponent<ArcStr>>, KbError> {
    let (head, body) = split_prefixes(text);
    let doc = format!("{head}Ontology(<urn:wherefore:edit>\n{body})\n");
    let (doc, _) = with_standard_prefixes(&doc);
    let comps = on_parser_thread(name, || {
        read_functional(&doc).map_err(|reason| KbError::Syntax {
            file: name.to_string(),
            reason,
        })
    })?;
    Ok(comps
        .into_iter()
        .filter(|ac| !matches!(ac.component, Component::OntologyID(_)))
        .collect())
}

/// One document's pending changes.
#[derive(Default)]
struct Pending {
    added: Vec<AnnotatedComponent<ArcStr>>,
    removed: BTreeSet<String>,
}

/// Works out where each edit goes and writes the documents it changes. `documents` are
/// (name, text) in load order, read together (each with the others' declarations);
/// `into` names the document that takes every new axiom, else each goes to the document
/// that declares its subject, else to one that declares another entity it names, else to
/// the first. Entities that no document declares get a declaration beside the axiom.
pub fn write_back(
    documents: &[(String, String)],
    edits: &[DocumentEdit],
    into: Option<usize>,
) -> Result<WriteBack, KbError> {
    let first = documents.first().map(|d| d.0.clone()).unwrap_or_default();
    let docs: Vec<(String, String)> = documents.to_vec();
    let (parsed, declared) = on_parser_thread(&first, move || {
        let mut opened = Vec::new();
        for (name, text) in &docs {
            opened.push(open_bytes(name.clone(), text.clone().into_bytes())?);
        }
        let declared: Vec<BTreeSet<String>> = opened
            .iter()
            .map(|o| o.declarations.iter().filter_map(declared_iri).collect())
            .collect();
        let mut all: Vec<Component<ArcStr>> = opened
            .iter()
            .flat_map(|o| o.declarations.iter().cloned())
            .collect();
        all.sort();
        all.dedup();
        let parsed = opened
            .into_iter()
            .map(|o| o.finish(&all))
            .collect::<Result<Vec<Parsed>, KbError>>()?;
        Ok((parsed, declared))
    })?;
    for ((name, _), p) in documents.iter().zip(&parsed) {
        if !p.unreadable.is_empty() {
            return Err(unreadable_error(name, &p.unreadable));
        }
    }
    let held: Vec<BTreeSet<String>> = parsed
        .iter()
        .map(|p| p.components.iter().map(|ac| key(&ac.component)).collect())
        .collect();
    let mut known: BTreeSet<String> = declared.iter().flatten().cloned().collect();
    let mut pending: Vec<Pending> = documents.iter().map(|_| Pending::default()).collect();
    let mut placed = Vec::new();
    for (n, e) in edits.iter().enumerate() {
        let mut went = BTreeSet::new();
        match e {
            DocumentEdit::Add(text) => {
                let comps = parse_axioms(&format!("edit {}", n + 1), text)?;
                let target = into.unwrap_or_else(|| home(&comps, &declared));
                for ac in comps {
                    let k = key(&ac.component);
                    let present = held
                        .iter()
                        .zip(&pending)
                        .any(|(h, p)| h.contains(&k) && !p.removed.contains(&k))
                        || pending
                            .iter()
                            .any(|p| p.added.iter().any(|a| key(&a.component) == k));
                    if present {
                        continue;
                    }
                    for name in names_of(&ac.component) {
                        if !built_in(name.iri()) && known.insert(name.iri().to_string()) {
                            pending[target].added.push(AnnotatedComponent {
                                component: name.declaration(),
                                ann: BTreeSet::new(),
                            });
                        }
                    }
                    pending[target].added.push(ac);
                    went.insert(target);
                }
            }
            DocumentEdit::Retract(text) => {
                for (i, p) in pending.iter_mut().enumerate() {
                    let before = p.added.len();
                    p.added.retain(|a| key(&a.component) != *text);
                    if p.added.len() != before {
                        went.insert(i);
                    }
                    if held[i].contains(*text) && p.removed.insert(text.to_string()) {
                        went.insert(i);
                    }
                }
            }
        }
        placed.push(went.into_iter().collect());
    }
    let mut changed = Vec::new();
    for (i, p) in pending.iter().enumerate() {
        if p.added.is_empty() && p.removed.is_empty() {
            continue;
        }
        let (name, text) = &documents[i];
        let prefixes = document_prefixes(text, parsed[i].syntax);
        let out = if parsed[i].syntax == Syntax::Functional {
            patch_functional(name, text, &prefixes, p)?
        } else {
            let comps: Vec<AnnotatedComponent<ArcStr>> = parsed[i]
                .components
                .iter()
                .filter(|ac| !p.removed.contains(&key(&ac.component)))
                .cloned()
                .chain(p.added.iter().cloned())
                .collect();
            write_components(name, comps, parsed[i].syntax, &prefixes)?
        };
        changed.push((i, out));
    }
    Ok(WriteBack { changed, placed })
}

/// The IRI a declaration declares.
fn declared_iri(c: &Component<ArcStr>) -> Option<String> {
    Some(match c {
        Component::DeclareClass(d) => d.0.0.to_string(),
        Component::DeclareObjectProperty(d) => d.0.0.to_string(),
        Component::DeclareDataProperty(d) => d.0.0.to_string(),
        Component::DeclareAnnotationProperty(d) => d.0.0.to_string(),
        Component::DeclareNamedIndividual(d) => d.0.0.to_string(),
        Component::DeclareDatatype(d) => d.0.0.to_string(),
        _ => return None,
    })
}

/// The document an edit belongs to: the one declaring the subject of its first axiom,
/// else one declaring another entity it names, else the first document.
fn home(comps: &[AnnotatedComponent<ArcStr>], declared: &[BTreeSet<String>]) -> usize {
    let find = |iri: &str| declared.iter().position(|d| d.contains(iri));
    let logical = comps
        .iter()
        .find(|ac| declared_iri(&ac.component).is_none())
        .or(comps.first());
    if let Some(ac) = logical {
        if let Some(i) = subject(&ac.component).as_deref().and_then(find) {
            return i;
        }
        for n in names_of(&ac.component) {
            if let Some(i) = find(n.iri()) {
                return i;
            }
        }
    }
    0
}

/// The prefixes a document declares, as (name, IRI); the empty name is the default.
pub fn document_prefixes(text: &str, syntax: Syntax) -> Vec<(String, String)> {
    let mut out: Vec<(String, String)> = Vec::new();
    let mut push = |name: &str, iri: &str| {
        let name = name.trim().trim_end_matches(':').to_string();
        if name
            .chars()
            .all(|c| c.is_alphanumeric() || c == '_' || c == '-' || c == '.')
            && !out.iter().any(|(n, _)| *n == name)
        {
            out.push((name, iri.to_string()));
        }
    };
    let between = |s: &str, open: char, close: char| -> Option<String> {
        let a = s.find(open)?;
        let b = s[a + 1..].find(close)?;
        Some(s[a + 1..a + 1 + b].to_string())
    };
    match syntax {
        Syntax::Functional => {
            let mut rest = text;
            while let Some(i) = rest.find("Prefix(") {
                rest = &rest[i + 7..];
                let Some(eq) = rest.find(":=") else { break };
                if let Some(iri) = between(&rest[eq..], '<', '>') {
                    push(&rest[..eq], &iri);
                }
            }
        }
        Syntax::Turtle => {
            for line in text.lines() {
                let l = line.trim();
                let rest = l
                    .strip_prefix("@prefix")
                    .or_else(|| l.strip_prefix("PREFIX"))
                    .or_else(|| l.strip_prefix("prefix"));
                if let Some(rest) = rest
                    && let Some(colon) = rest.find(':')
                    && let Some(iri) = between(&rest[colon..], '<', '>')
                {
                    push(&rest[..colon], &iri);
                }
            }
        }
        Syntax::Manchester => {
            for line in text.lines() {
                if let Some(rest) = line.trim().strip_prefix("Prefix:")
                    && let Some(colon) = rest.find(':')
                    && let Some(iri) = between(&rest[colon..], '<', '>')
                {
                    push(&rest[..colon], &iri);
                }
            }
        }
        Syntax::RdfXml => {
            let mut rest = text;
            while let Some(i) = rest.find("xmlns") {
                rest = &rest[i + 5..];
                let name = rest.strip_prefix(':').map(|r| {
                    r.split(|c: char| c == '=' || c.is_whitespace())
                        .next()
                        .unwrap_or("")
                });
                if let Some(iri) = between(rest, '"', '"') {
                    push(name.unwrap_or(""), &iri);
                }
            }
        }
        Syntax::OwlXml => {
            let mut rest = text;
            while let Some(i) = rest.find("<Prefix ") {
                rest = &rest[i + 8..];
                let end = rest.find('>').unwrap_or(rest.len());
                let el = &rest[..end];
                let attr = |a: &str| {
                    el.find(&format!("{a}=\""))
                        .and_then(|p| between(&el[p..], '"', '"'))
                };
                if let (Some(n), Some(iri)) = (attr("name"), attr("IRI")) {
                    push(&n, &iri);
                }
            }
        }
        Syntax::NTriples => {}
    }
    out
}

/// Where things are in a functional-syntax document (byte offsets).
struct Layout {
    /// The `Ontology` keyword.
    ontology: usize,
    /// Each top-level `Keyword(...)` item inside `Ontology(...)`.
    spans: Vec<(usize, usize)>,
    /// The closing parenthesis of `Ontology(...)`.
    close: usize,
}

/// The top-level items of a functional-syntax document: the byte spans of the
/// `Keyword(...)` items inside `Ontology(...)`, and the offset of its closing parenthesis.
/// Comments (`#` to the end of a line), strings and `<IRI>`s are skipped over.
fn items(text: &str) -> Option<Layout> {
    let b = text.as_bytes();
    let mut depth = 0usize;
    let mut spans = Vec::new();
    let mut item_start: Option<usize> = None;
    let mut word_start: Option<usize> = None;
    let mut ontology: Option<usize> = None;
    let mut i = 0;
    while i < b.len() {
        let c = b[i];
        match c {
            b'#' if word_start.is_none() => {
                while i < b.len() && b[i] != b'\n' {
                    i += 1;
                }
                continue;
            }
            b'"' => {
                i += 1;
                while i < b.len() && b[i] != b'"' {
                    if b[i] == b'\\' {
                        i += 1;
                    }
                    i += 1;
                }
            }
            b'<' => {
                while i < b.len() && b[i] != b'>' {
                    i += 1;
                }
            }
            b'(' => {
                if depth == 0 && text[word_start.unwrap_or(i)..i].trim() == "Ontology" {
                    ontology = word_start;
                }
                if depth == 1 && item_start.is_none() {
                    item_start = word_start.or(Some(i));
                }
                depth += 1;
            }
            b')' => {
                depth = depth.checked_sub(1)?;
                if depth == 1
                    && let Some(s) = item_start.take()
                {
                    spans.push((s, i + 1));
                }
                if depth == 0 && ontology.is_some() {
                    return Some(Layout {
                        ontology: ontology?,
                        spans,
                        close: i,
                    });
                }
            }
            _ => {}
        }
        if c.is_ascii_alphanumeric() || c == b'_' || c == b':' || c == b'-' {
            if word_start.is_none() {
                word_start = Some(i);
            }
        } else {
            word_start = None;
        }
        i += 1;
    }
    None
}

/// Patches a functional-syntax document: the removed axioms' items are cut out (with
/// their line when they stand alone on it) and the added ones go, one a line, just before
/// the ontology's closing parenthesis, written with the document's own prefixes.
fn patch_functional(
    name: &str,
    text: &str,
    prefixes: &[(String, String)],
    p: &Pending,
) -> Result<String, KbError> {
    let Some(Layout {
        ontology,
        spans,
        close,
    }) = items(text)
    else {
        return Err(KbError::Syntax {
            file: name.to_string(),
            reason: "cannot find the end of `Ontology(...)` to write the edits into; check its parentheses".into(),
        });
    };
    let head = &text[..ontology];
    let mut cut: Vec<(usize, usize)> = Vec::new();
    if !p.removed.is_empty() {
        for &(s, e) in &spans {
            let doc = format!("{head}Ontology(<urn:wherefore:item>\n{}\n)\n", &text[s..e]);
            let (doc, _) = with_standard_prefixes(&doc);
            let comps = on_parser_thread(name, || Ok(read_functional(&doc).unwrap_or_default()))?;
            if comps
                .iter()
                .any(|ac| p.removed.contains(&key(&ac.component)))
            {
                cut.push(whole_line(text, s, e));
            }
        }
    }
    let mut mapping = horned_owl::curie::PrefixMapping::default();
    for (n, iri) in prefixes {
        // The empty name as an ordinary mapping: horned-owl's writer shortens IRIs
        // only through named mappings, and `:local` is how the default prefix reads.
        if mapping.add_prefix(n, iri).is_err() && n.is_empty() {
            mapping.set_default(iri);
        }
    }
    let mut added = String::new();
    for ac in &p.added {
        added.push_str(&ac.as_functional_with_prefixes(&mapping).to_string());
        added.push('\n');
    }
    // Insert at the start of the closing parenthesis's line when it stands alone there.
    let line_start = text[..close].rfind('\n').map(|n| n + 1).unwrap_or(0);
    let at = if text[line_start..close].trim().is_empty() {
        line_start
    } else {
        added.insert(0, '\n');
        close
    };
    let mut out = String::with_capacity(text.len() + added.len());
    let mut pos = 0;
    for (s, e) in cut {
        out.push_str(&text[pos..s]);
        pos = e;
    }
    out.push_str(&text[pos..at]);
    out.push_str(&added);
    out.push_str(&text[at..]);
    Ok(out)
}

/// The span to cut for an item: its whole line (with the line break) when nothing else
/// stands on it, else the item alone.
fn whole_line(text: &str, s: usize, e: usize) -> (usize, usize) {
    let ls = text[..s].rfind('\n').map(|n| n + 1).unwrap_or(0);
    let le = text[e..]
        .find('\n')
        .map(|n| e + n + 1)
        .unwrap_or(text.len());
    if text[ls..s].trim().is_empty() && text[e..le].trim().is_empty() {
        (ls, le)
    } else {
        (s, e)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const A: &str = "# comment kept\nPrefix(:=<http://x.org/a#>)\nOntology(<http://x.org/a>\nImport(<http://x.org/b>)\n# about A\nDeclaration(Class(:A))\nSubClassOf(:A :B) # trailing\n)\n";
    const B: &str = "Prefix(:=<http://x.org/b#>)\nOntology(<http://x.org/b>\nDeclaration(Class(:B))\nDeclaration(Class(:C))\n)\n";

    fn docs() -> Vec<(String, String)> {
        vec![("a.ofn".into(), A.into()), ("b.ofn".into(), B.into())]
    }

    // Hand-derived: the subject of `C ⊑ B` is C, declared in b.ofn, so only b.ofn changes,
    // and it gains exactly one line before its closing parenthesis.
    #[test]
    fn an_axiom_goes_to_the_document_declaring_its_subject() {
        let add = "SubClassOf(<http://x.org/b#C> <http://x.org/b#B>)";
        let wb = write_back(&docs(), &[DocumentEdit::Add(add)], None).unwrap();
        assert_eq!(wb.placed, vec![vec![1]]);
        assert_eq!(wb.changed.len(), 1);
        assert_eq!(
            wb.changed[0].1,
            "Prefix(:=<http://x.org/b#>)\nOntology(<http://x.org/b>\nDeclaration(Class(:B))\nDeclaration(Class(:C))\nSubClassOf(:C :B)\n)\n"
        );
    }

    // Hand-derived: retracting A ⊑ B cuts the item but keeps the comment after it and
    // every other line; `into` sends a new class's axiom (with its declaration) to a.ofn.
    #[test]
    fn retract_cuts_the_item_and_into_names_the_document() {
        let probe = parse_axioms("t", "SubClassOf(<http://x.org/a#A> <http://x.org/a#B>)").unwrap();
        let text = key(&probe[0].component);
        let add = "SubClassOf(<http://x.org/a#N> <http://x.org/b#C>)";
        let wb = write_back(
            &docs(),
            &[DocumentEdit::Retract(&text), DocumentEdit::Add(add)],
            Some(0),
        )
        .unwrap();
        assert_eq!(wb.placed, vec![vec![0], vec![0]]);
        assert_eq!(
            wb.changed[0].1,
            "# comment kept\nPrefix(:=<http://x.org/a#>)\nOntology(<http://x.org/a>\nImport(<http://x.org/b>)\n# about A\nDeclaration(Class(:A))\n # trailing\nDeclaration(Class(:N))\nSubClassOf(:N <http://x.org/b#C>)\n)\n"
        );
    }

    // Hand-derived: adding an axiom the documents hold, then retracting a new one added
    // in the same session, changes no file.
    #[test]
    fn edits_that_cancel_out_change_nothing() {
        let held = "Declaration(Class(<http://x.org/b#B>))";
        let add = "SubClassOf(<http://x.org/b#C> <http://x.org/b#B>)";
        let probe = parse_axioms("t", add).unwrap();
        let k = key(&probe[0].component);
        let wb = write_back(
            &docs(),
            &[
                DocumentEdit::Add(held),
                DocumentEdit::Add(add),
                DocumentEdit::Retract(&k),
            ],
            None,
        )
        .unwrap();
        assert!(wb.changed.is_empty());
        assert_eq!(wb.placed, vec![vec![], vec![1], vec![1]]);
    }

    // Common practice: each syntax's prefix declaration form.
    #[test]
    fn prefixes_are_read_in_each_syntax() {
        let ttl = "@prefix ex: <http://e/> .\nPREFIX : <http://d/>\n";
        assert_eq!(
            document_prefixes(ttl, Syntax::Turtle),
            vec![
                ("ex".into(), "http://e/".into()),
                ("".into(), "http://d/".into())
            ]
        );
        let rdf = "<rdf:RDF xmlns=\"http://d#\" xmlns:owl=\"http://www.w3.org/2002/07/owl#\">";
        assert_eq!(
            document_prefixes(rdf, Syntax::RdfXml),
            vec![
                ("".into(), "http://d#".into()),
                ("owl".into(), "http://www.w3.org/2002/07/owl#".into())
            ]
        );
    }
}

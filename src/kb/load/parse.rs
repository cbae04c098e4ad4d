//! Reading one document: telling its syntax from its content and parsing it with
//! horned-owl on a thread with a large stack. RDF documents are read in two steps (OWL 2
//! Mapping to RDF Graphs, §3): up to their declarations first, then the rest once the
//! declarations of every other document loaded with them are known.

use super::PARSER_THREAD;
use super::entities::check_entities;
use super::rdf_lists::{
    AllDisjoint, add_all_disjoint, annotations_from_leftovers, drop_ontology_types, leftover_parts,
    take_all_disjoint,
};
use super::syntax::{Detected, READABLE, Syntax, detect};
use crate::kb::{KbError, KnowledgeBase};
use horned_owl::io::ParserConfiguration;
use horned_owl::io::rdf::reader::{ConcreteRDFOntology, OntologyParser};
use horned_owl::model::{
    AnnotatedComponent, ArcAnnotatedComponent, ArcStr, Build, Component, MutableOntology,
};
use horned_owl::ontology::set::SetOntology;
use std::collections::BTreeSet;
use std::path::Path;

type RdfOntology = ConcreteRDFOntology<ArcStr, ArcAnnotatedComponent>;
type RdfParser = OntologyParser<ArcStr, ArcAnnotatedComponent, RdfOntology, Build<ArcStr>>;

/// One parsed file: its components and ontology IRI.
pub(super) struct Parsed {
    pub(super) components: Vec<AnnotatedComponent<ArcStr>>,
    pub(super) iri: Option<String>,
    pub(super) syntax: Syntax,
    /// RDF triples (rendered as text) that the RDF reader could not turn into OWL 2.
    pub(super) unreadable: Vec<String>,
}

/// A document read as far as it can be alone: its header (ontology IRI, version IRI,
/// imports) and declarations are known; an RDF document's axioms wait for `finish`.
pub(super) struct Opened {
    pub(super) syntax: Syntax,
    pub(super) iri: Option<String>,
    pub(super) version_iri: Option<String>,
    pub(super) imports: Vec<String>,
    /// The entity declarations the document makes (without annotations).
    pub(super) declarations: Vec<Component<ArcStr>>,
    file: String,
    state: State,
}

enum State {
    Read(Vec<AnnotatedComponent<ArcStr>>),
    /// The parser, the AllDisjoint groups taken out, and the graph it read (for a retry).
    Rdf(Box<(RdfParser, Vec<AllDisjoint>, String, oxrdfio::RdfFormat)>),
}

thread_local! {
    /// The file the parser thread is reading, for the message when the parser panics.
    static READING: std::cell::RefCell<String> = const { std::cell::RefCell::new(String::new()) };
}

/// Notes the file being read on this thread.
fn reading(file: &str) {
    READING.with(|r| file.clone_into(&mut r.borrow_mut()));
}

/// Runs `f` on the parser thread (horned-owl's parsers recurse, so it gets a large
/// stack) and turns a panic into an error naming the file being read rather than a
/// crash. horned-owl's RDF parser state cannot move between threads, so a whole load
/// runs inside one call.
pub(super) fn on_parser_thread<T: Send>(
    file: &str,
    f: impl FnOnce() -> Result<T, KbError> + Send,
) -> Result<T, KbError> {
    let failed = |file: String| {
        KbError::Syntax {
        file,
        reason: "the parser failed on this file (it is malformed). Check it with an OWL editor or validator.".into(),
    }
    };
    std::thread::scope(|s| {
        let handle = std::thread::Builder::new()
            .name(PARSER_THREAD.into())
            .stack_size(256 << 20)
            .spawn_scoped(s, || {
                reading(file);
                std::panic::catch_unwind(std::panic::AssertUnwindSafe(f))
                    .unwrap_or_else(|_| Err(failed(READING.with(|r| r.borrow().clone()))))
            })
            .map_err(|e| KbError::Syntax {
                file: file.to_string(),
                reason: format!("cannot start the parser: {e}"),
            })?;
        handle
            .join()
            .unwrap_or_else(|_| Err(failed(file.to_string())))
    })
}

/// Reads one file as far as it can be read alone (on the parser thread).
pub(super) fn open_file(path: &Path) -> Result<Opened, KbError> {
    let file = path.display().to_string();
    let bytes = std::fs::read(path).map_err(|e| KbError::Unreadable {
        file: file.clone(),
        reason: e.to_string(),
    })?;
    open_bytes(file, bytes)
}

/// Parses one document's bytes completely; `file` names it in messages.
pub(super) fn parse_bytes(file: String, bytes: Vec<u8>) -> Result<Parsed, KbError> {
    let name = file.clone();
    on_parser_thread(&name, move || open_bytes(file, bytes)?.finish(&[]))
}

/// The syntax of a document's text, or the error that says what we read instead.
fn syntax_of(file: &str, text: &str) -> Result<Syntax, KbError> {
    match detect(text) {
        Detected::Known(s) => Ok(s),
        Detected::Obo => Err(KbError::Syntax {
            file: file.to_string(),
            reason: format!(
                "this is an OBO flat file, which is not read here. Convert it to {READABLE} (an ontology editor or ROBOT-like converter can save it so)."
            ),
        }),
        Detected::Unknown => Err(KbError::Syntax {
            file: file.to_string(),
            reason: format!(
                "cannot tell the syntax from the content: expected {READABLE} (Prefix(...)/Ontology(...), <Ontology>, <rdf:RDF>, @prefix or PREFIX, <s> <p> <o> ., Prefix:/Ontology:/Class: frames)."
            ),
        }),
    }
}

/// Reads one document's bytes as far as they can be read alone (on the parser thread).
pub(super) fn open_bytes(file: String, bytes: Vec<u8>) -> Result<Opened, KbError> {
    reading(&file);
    if bytes.iter().all(|b| b.is_ascii_whitespace()) {
        return Err(KbError::Syntax {
            file,
            reason: format!("the file is empty. Give an ontology in {READABLE}."),
        });
    }
    let text = match String::from_utf8(bytes) {
        Ok(t) => t,
        Err(e) => {
            return Err(KbError::Syntax {
                file,
                reason: format!(
                    "not UTF-8 text (invalid byte at offset {}); this does not look like an ontology. Give {READABLE}.",
                    e.utf8_error().valid_up_to()
                ),
            });
        }
    };
    let syntax = syntax_of(&file, &text)?;
    if matches!(syntax, Syntax::RdfXml | Syntax::OwlXml) {
        check_entities(&text).map_err(|reason| KbError::Syntax {
            file: file.clone(),
            reason,
        })?;
    }
    let (text, shift) = if syntax == Syntax::Functional {
        with_standard_prefixes(&text)
    } else {
        (text, 0)
    };
    let original = text[shift..].to_string();
    let outcome = match syntax.rdf_format() {
        Some(format) => open_rdf(&text, format)
            .map(|(p, groups)| State::Rdf(Box::new((p, groups, text.clone(), format)))),
        None => read_whole(&text, syntax).map(State::Read),
    };
    let state = outcome.map_err(|reason| KbError::Syntax {
        file: file.clone(),
        reason: locate(&reason, &original, shift),
    })?;
    let mut opened = Opened {
        syntax,
        iri: None,
        version_iri: None,
        imports: Vec::new(),
        declarations: Vec::new(),
        file,
        state,
    };
    opened.read_header();
    Ok(opened)
}

/// The components of a complete parse of a non-RDF document, sorted.
fn read_whole(text: &str, syntax: Syntax) -> Result<Vec<AnnotatedComponent<ArcStr>>, String> {
    let mut cursor = std::io::Cursor::new(text.as_bytes());
    let config = ParserConfiguration::new(Build::new_arc());
    let ont: SetOntology<ArcStr> = match syntax {
        Syntax::Functional => {
            horned_owl::io::ofn::reader::read::<ArcStr, _, SetOntology<ArcStr>, _>(
                &mut cursor,
                config,
            )
            .map(|(o, _)| o)
            .map_err(|e| {
                format!("OWL functional syntax error: {e}. Fix the text at that position.")
            })?
        }
        Syntax::OwlXml => horned_owl::io::owx::reader::read::<ArcStr, _, SetOntology<ArcStr>, _>(
            &mut cursor,
            config,
        )
        .map(|(o, _)| o)
        .map_err(|e| format!("OWL/XML error: {e}. Fix the XML at that position."))?,
        Syntax::Manchester => {
            horned_owl::io::omn::reader::read::<ArcStr, _, SetOntology<ArcStr>, _>(
                &mut cursor,
                config,
            )
            .map(|(o, _)| o)
            .map_err(|e| format!("Manchester syntax error: {e}. Fix the text at that position."))?
        }
        other => return Err(format!("{} is read as RDF", other.name())),
    };
    let mut components: Vec<AnnotatedComponent<ArcStr>> = ont.into_iter().collect();
    components.sort();
    Ok(components)
}

/// Reads an RDF document up to its declarations (OWL 2 Mapping to RDF Graphs, §3.1:
/// imports and declarations come first, since the rest needs the declarations of the
/// whole imports closure to be parsed).
fn open_rdf(
    text: &str,
    format: oxrdfio::RdfFormat,
) -> Result<(RdfParser, Vec<AllDisjoint>), String> {
    // horned-owl 4.0.0 does not map owl:AllDisjointClasses/AllDisjointProperties
    // (Table 16) back to axioms: take those out of the graph here and add them later.
    let (rewritten, groups) = match take_all_disjoint(text, format) {
        Some((nt, groups)) => (Some(nt), groups),
        None => (None, Vec::new()),
    };
    let (input, format) = match &rewritten {
        Some(nt) => (nt.as_str(), oxrdfio::RdfFormat::NTriples),
        None => (text, format),
    };
    let rdf_error = |e: horned_owl::error::HornedError| {
        format!("RDF error: {e}. Fix the document at that position.")
    };
    let mut cursor = std::io::Cursor::new(input.as_bytes());
    let config = ParserConfiguration::new(Build::new_arc());
    let mut parser =
        RdfParser::from_bufread_with_format(&mut cursor, config, format).map_err(rdf_error)?;
    parser.parse_imports().map_err(rdf_error)?;
    parser.parse_declarations().map_err(rdf_error)?;
    Ok((parser, groups))
}

/// Whether a component declares an entity.
fn is_declaration(c: &Component<ArcStr>) -> bool {
    matches!(
        c,
        Component::DeclareClass(_)
            | Component::DeclareObjectProperty(_)
            | Component::DeclareDataProperty(_)
            | Component::DeclareAnnotationProperty(_)
            | Component::DeclareNamedIndividual(_)
            | Component::DeclareDatatype(_)
    )
}

impl Opened {
    /// Fills in the ontology IRI, version IRI, imports and declarations.
    fn read_header(&mut self) {
        let mut visit = |c: &Component<ArcStr>| match c {
            Component::OntologyID(id) => {
                self.iri = id.iri.as_ref().map(|i| i.to_string());
                self.version_iri = id.viri.as_ref().map(|i| i.to_string());
            }
            Component::Import(i) => self.imports.push(i.0.to_string()),
            c if is_declaration(c) => self.declarations.push(c.clone()),
            _ => {}
        };
        match &self.state {
            State::Read(comps) => comps.iter().for_each(|ac| visit(&ac.component)),
            State::Rdf(b) => {
                b.0.ontology_ref()
                    .i()
                    .iter()
                    .for_each(|ac| visit(&ac.component))
            }
        }
        self.imports.sort();
        self.imports.dedup();
        self.declarations.sort();
        self.declarations.dedup();
    }

    /// Finishes the parse with `others`, the declarations of every other document loaded
    /// with this one (its imports closure and the files given beside it): an RDF
    /// document is read with them as if they were its own, and they are left out of the
    /// result. Runs on the parser thread.
    pub(super) fn finish(self, others: &[Component<ArcStr>]) -> Result<Parsed, KbError> {
        let Opened {
            syntax,
            iri,
            declarations,
            file,
            state,
            ..
        } = self;
        let (components, unreadable) = match state {
            State::Read(components) => (components, Vec::new()),
            State::Rdf(pending) => {
                let own: BTreeSet<Component<ArcStr>> = declarations.into_iter().collect();
                let foreign: Vec<Component<ArcStr>> = others
                    .iter()
                    .filter(|c| !own.contains(*c))
                    .cloned()
                    .collect();
                reading(&file);
                let (parser, groups, text, format) = *pending;
                match finish_rdf((parser, groups), foreign.clone()) {
                    // horned-owl 4.0.0 fails on `<ontology> rdf:type X` for any X besides
                    // owl:Ontology: read the graph again without those triples, and
                    // report them as unread.
                    Err(reason)
                        if reason.contains("Invalid annotation found")
                            && reason.contains("RDF(Type)") =>
                    {
                        match drop_ontology_types(&text, format) {
                            Some((graph, dropped)) => {
                                open_rdf(&graph, oxrdfio::RdfFormat::NTriples)
                                    .and_then(|pending| finish_rdf(pending, foreign))
                                    .map(|(components, mut left)| {
                                        left.extend(dropped);
                                        (components, left)
                                    })
                            }
                            None => Err(reason),
                        }
                    }
                    other => other,
                }
                .map_err(|reason| KbError::Syntax {
                    file: file.clone(),
                    reason,
                })?
            }
        };
        Ok(Parsed {
            components,
            iri,
            syntax,
            unreadable,
        })
    }
}

/// The second step of reading an RDF document: `foreign` declarations are added before
/// the axioms are read and taken out after.
fn finish_rdf(
    (mut parser, groups): (RdfParser, Vec<AllDisjoint>),
    foreign: Vec<Component<ArcStr>>,
) -> Result<(Vec<AnnotatedComponent<ArcStr>>, Vec<String>), String> {
    let bare = |c: &Component<ArcStr>| AnnotatedComponent {
        component: c.clone(),
        ann: BTreeSet::new(),
    };
    for c in &foreign {
        parser.mut_ontology_ref().insert(bare(c));
    }
    parser
        .finish_parse(&[])
        .map_err(|e| format!("RDF error: {e}. Fix the document at that position."))?;
    let (o, mut incomplete) = parser.as_ontology_and_incomplete();
    let mut ont: SetOntology<ArcStr> = o.into();
    let mut left = Vec::new();
    add_all_disjoint(&mut ont, groups, &mut left);
    let properties: BTreeSet<String> = ont
        .iter()
        .map(|ac| &ac.component)
        .chain(foreign.iter())
        .filter_map(|c| match c {
            Component::DeclareObjectProperty(p) => Some(p.0.to_string()),
            Component::DeclareDataProperty(p) => Some(p.0.to_string()),
            _ => None,
        })
        .collect();
    for c in &foreign {
        ont.remove(&bare(c));
    }
    for ac in annotations_from_leftovers(&mut incomplete, &properties) {
        ont.insert(ac);
    }
    left.extend(leftover_parts(&incomplete));
    let mut components: Vec<AnnotatedComponent<ArcStr>> = ont.into_iter().collect();
    components.sort();
    Ok((components, left))
}

/// Parses axioms in OWL 2 functional syntax (a whole `Ontology(...)` document).
pub(super) fn read_functional(text: &str) -> Result<Vec<AnnotatedComponent<ArcStr>>, String> {
    read_whole(text, Syntax::Functional)
}

/// The error for RDF parts that could not be read as OWL 2 (strict mode).
pub(super) fn unreadable_error(file: &str, parts: &[String]) -> KbError {
    KbError::Syntax {
        file: file.to_owned(),
        reason: format!(
            "the RDF parser could not read {} part(s) as OWL 2 (undeclared entities or malformed constructs), first: {}. Declare the entities (owl:Class, owl:ObjectProperty, …) or fix the triples, or pass --lenient to drop these parts with a warning.",
            parts.len(),
            parts.iter().take(3).cloned().collect::<Vec<_>>().join("; ")
        ),
    }
}

/// Strict mode fails on unreadable RDF parts; `--lenient` drops them, warns with each
/// one, and marks the result incomplete (they may hold axioms that change it).
pub(super) fn accept_unreadable(
    kb: &mut KnowledgeBase,
    file: &Path,
    parsed: &Parsed,
    lenient: bool,
) -> Result<(), KbError> {
    if parsed.unreadable.is_empty() {
        return Ok(());
    }
    let file = file.display().to_string();
    if !lenient {
        return Err(unreadable_error(&file, &parsed.unreadable));
    }
    for part in &parsed.unreadable {
        kb.warnings.push(format!(
            "{file}: dropped RDF part that is not OWL 2 (--lenient): {part}"
        ));
    }
    kb.incomplete = true;
    Ok(())
}

/// Parses a document that must be read completely (no `--lenient` here).
pub(super) fn parse_bytes_strict(file: String, bytes: Vec<u8>) -> Result<Parsed, KbError> {
    let parsed = parse_bytes(file.clone(), bytes)?;
    if parsed.unreadable.is_empty() {
        Ok(parsed)
    } else {
        Err(unreadable_error(&file, &parsed.unreadable))
    }
}

/// OWL 2 functional syntax predeclares the owl:, rdf:, rdfs: and xsd: prefixes (Structural
/// Specification §3.7); horned-owl does not, so the missing ones are put in front.
pub(super) fn with_standard_prefixes(text: &str) -> (String, usize) {
    let standard = [
        ("owl", "http://www.w3.org/2002/07/owl#"),
        ("rdf", "http://www.w3.org/1999/02/22-rdf-syntax-ns#"),
        ("rdfs", "http://www.w3.org/2000/01/rdf-schema#"),
        ("xsd", "http://www.w3.org/2001/XMLSchema#"),
    ];
    let compact: String = text.chars().filter(|c| !c.is_whitespace()).collect();
    let mut head = String::new();
    for (p, iri) in standard {
        if !compact.contains(&format!("Prefix({p}:=")) {
            head.push_str(&format!("Prefix({p}:=<{iri}>)\n"));
        }
    }
    let n = head.len();
    (head + text, n)
}

/// Turns a parser's "Byte Span: a to b" into a line and column of the original text.
pub(super) fn locate(reason: &str, original: &str, shift: usize) -> String {
    let Some(i) = reason.find("Byte Span: ") else {
        return reason.to_string();
    };
    let rest = &reason[i + 11..];
    let num: String = rest.chars().take_while(|c| c.is_ascii_digit()).collect();
    let Ok(pos) = num.parse::<usize>() else {
        return reason.to_string();
    };
    let pos = pos.saturating_sub(shift).min(original.len());
    let before = &original.as_bytes()[..pos];
    let line = before.iter().filter(|&&b| b == b'\n').count() + 1;
    let col = pos
        - before
            .iter()
            .rposition(|&b| b == b'\n')
            .map(|p| p + 1)
            .unwrap_or(0)
        + 1;
    format!("line {line}, column {col}: {reason}")
}

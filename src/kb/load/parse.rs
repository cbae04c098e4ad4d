//! Reading one document: telling its syntax from its content and parsing it with
//! horned-owl on a thread with a large stack.

use super::PARSER_THREAD;
use super::rdf_lists::{add_all_disjoint, leftover_parts, take_all_disjoint};
use crate::kb::{KbError, KnowledgeBase};
use horned_owl::io::RDFParserConfiguration;
use horned_owl::io::{ParserConfiguration, ResourceType};
use horned_owl::model::{AnnotatedComponent, ArcStr, Build, Component};
use horned_owl::ontology::set::SetOntology;
use std::path::Path;

/// One parsed file: its components and ontology IRI.
pub(super) struct Parsed {
    pub(super) components: Vec<AnnotatedComponent<ArcStr>>,
    pub(super) iri: Option<String>,
    pub(super) imports: Vec<String>,
    pub(super) rdf: bool,
    /// RDF triples (rendered as text) that the RDF reader could not turn into OWL 2.
    pub(super) unreadable: Vec<String>,
}

/// Reads and parses one file, telling the syntax from its content.
pub(super) fn parse_file(path: &Path) -> Result<Parsed, KbError> {
    let file = path.display().to_string();
    let bytes = std::fs::read(path).map_err(|e| KbError::Unreadable {
        file: file.clone(),
        reason: e.to_string(),
    })?;
    parse_bytes(file, bytes)
}

/// Parses one document's bytes; `file` names it in messages.
pub(super) fn parse_bytes(file: String, bytes: Vec<u8>) -> Result<Parsed, KbError> {
    if bytes.iter().all(|b| b.is_ascii_whitespace()) {
        return Err(KbError::Syntax {
            file,
            reason: "the file is empty. Give an ontology in OWL 2 functional syntax, OWL/XML or RDF/XML.".into(),
        });
    }
    let text = match String::from_utf8(bytes) {
        Ok(t) => t,
        Err(e) => {
            return Err(KbError::Syntax {
                file,
                reason: format!(
                    "not UTF-8 text (invalid byte at offset {}); this does not look like an ontology. Give OWL 2 functional syntax, OWL/XML or RDF/XML.",
                    e.utf8_error().valid_up_to()
                ),
            });
        }
    };
    let Some((kind, rdf_format)) = horned_owl::io::detect_format(text.as_bytes()) else {
        return Err(KbError::Syntax {
            file,
            reason: "cannot tell the syntax from the content: expected OWL 2 functional syntax (Prefix(...)/Ontology(...)), OWL/XML (<Ontology>) or RDF/XML (<rdf:RDF>).".into(),
        });
    };
    let file2 = file.clone();
    let is_rdf = matches!(kind, ResourceType::RDF);
    let (text, shift) = if matches!(kind, ResourceType::OFN) {
        with_standard_prefixes(&text)
    } else {
        (text, 0)
    };
    let original = text[shift..].to_string();
    // horned-owl's parsers recurse; parse on a thread with a large stack and turn any panic
    // into an error value rather than a crash.
    let handle = std::thread::Builder::new()
        .name(PARSER_THREAD.into())
        .stack_size(256 << 20)
        .spawn(
            move || -> Result<(SetOntology<ArcStr>, Vec<String>), String> {
                parse_text(&text, kind, rdf_format)
            },
        )
        .map_err(|e| KbError::Syntax {
            file: file2.clone(),
            reason: format!("cannot start the parser: {e}"),
        })?;
    let (ont, incomplete) = match handle.join() {
        Ok(Ok(x)) => x,
        Ok(Err(reason)) => {
            return Err(KbError::Syntax {
                file,
                reason: locate(&reason, &original, shift),
            });
        }
        Err(_) => {
            return Err(KbError::Syntax {
                file,
                reason: "the parser failed on this file (it is malformed). Check it with an OWL editor or validator.".into(),
            });
        }
    };
    let mut components: Vec<AnnotatedComponent<ArcStr>> = ont.iter().cloned().collect();
    components.sort();
    let mut iri = None;
    let mut imports = Vec::new();
    for ac in &components {
        match &ac.component {
            Component::OntologyID(id) => {
                iri = id.iri.as_ref().map(|i| i.to_string());
            }
            Component::Import(i) => imports.push(i.0.to_string()),
            _ => {}
        }
    }
    Ok(Parsed {
        rdf: is_rdf,
        components,
        iri,
        imports,
        unreadable: incomplete,
    })
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

pub(super) fn parse_text(
    text: &str,
    kind: ResourceType,
    rdf_format: Option<oxrdfio::RdfFormat>,
) -> Result<(SetOntology<ArcStr>, Vec<String>), String> {
    let mut cursor = std::io::Cursor::new(text.as_bytes());
    let config = ParserConfiguration::new(Build::new_arc());
    match kind {
        ResourceType::OFN => horned_owl::io::ofn::reader::read::<ArcStr, _, SetOntology<ArcStr>, _>(&mut cursor, config)
            .map(|(o, _)| (o, Vec::new()))
            .map_err(|e| format!("OWL functional syntax error: {e}. Fix the text at that position.")),
        ResourceType::OWX => horned_owl::io::owx::reader::read::<ArcStr, _, SetOntology<ArcStr>, _>(&mut cursor, config)
            .map(|(o, _)| (o, Vec::new()))
            .map_err(|e| format!("OWL/XML error: {e}. Fix the XML at that position.")),
        ResourceType::RDF => {
            let format = rdf_format.unwrap_or(oxrdfio::RdfFormat::RdfXml);
            // horned-owl 4.0.0 does not map owl:AllDisjointClasses/AllDisjointProperties
            // (OWL 2 Mapping to RDF Graphs, Table 16) back to axioms: take those out of the
            // graph here and add the axioms ourselves.
            let (rewritten, groups) = match take_all_disjoint(text, format) {
                Some((nt, groups)) => (Some(nt), groups),
                None => (None, Vec::new()),
            };
            let (input, format) = match &rewritten {
                Some(nt) => (nt.as_str(), oxrdfio::RdfFormat::NTriples),
                None => (text, format),
            };
            let mut cursor = std::io::Cursor::new(input.as_bytes());
            let mut rc: RDFParserConfiguration<ArcStr> = config.into();
            rc.format = Some(format);
            horned_owl::io::rdf::reader::read::<ArcStr, horned_owl::model::ArcAnnotatedComponent, _, _>(&mut cursor, rc)
                .map(|(o, inc)| {
                    let mut ont: SetOntology<ArcStr> = o.into();
                    let mut left = leftover_parts(&inc);
                    add_all_disjoint(&mut ont, groups, &mut left);
                    (ont, left)
                })
                .map_err(|e| format!("RDF error: {e}. Fix the document at that position."))
        }
        _ => Err("this syntax (Manchester, OBO or Turtle) is not supported; convert it to OWL 2 functional syntax, OWL/XML or RDF/XML".into()),
    }
}

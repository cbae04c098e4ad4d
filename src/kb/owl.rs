//! Loading OWL 2 ontologies (functional syntax, OWL/XML, RDF/XML) through horned-owl and
//! converting them into the internal knowledge base. This is the only file that imports
//! horned-owl's model.

use super::datarange::DataRange;
use super::datatype;
use super::{AnnotationValue, Axiom, ConceptId, IndividualId, KbError, KnowledgeBase, RoleId};
use horned_owl::io::RDFParserConfiguration;
use horned_owl::io::ofn::writer::AsFunctional;
use horned_owl::io::{ParserConfiguration, ResourceType};
use horned_owl::model::{
    AnnotatedComponent, AnnotationSubject, ArcStr, Build, ClassExpression as CE, Component,
    DataRange as HDataRange, Individual, Literal, ObjectPropertyExpression as OPE,
    SubObjectPropertyExpression,
};
use horned_owl::ontology::set::SetOntology;
use std::collections::BTreeSet;
use std::path::{Path, PathBuf};

const XSD: &str = "http://www.w3.org/2001/XMLSchema#";
const OWL: &str = "http://www.w3.org/2002/07/owl#";

/// How to load ontologies.
#[derive(Clone, Debug, Default)]
pub struct LoadOptions {
    /// Extra folders searched for imported ontologies.
    pub import_dirs: Vec<PathBuf>,
    /// Drop refused axioms with a warning instead of failing.
    pub lenient: bool,
}

/// One parsed file: its components and ontology IRI.
struct Parsed {
    components: Vec<AnnotatedComponent<ArcStr>>,
    iri: Option<String>,
    imports: Vec<String>,
    rdf: bool,
    /// RDF triples (rendered as text) that the RDF reader could not turn into OWL 2.
    unreadable: Vec<String>,
}

/// Loads ontology files (and their imports) into a fresh knowledge base.
pub fn load(paths: &[PathBuf], opts: &LoadOptions) -> Result<KnowledgeBase, KbError> {
    let mut kb = KnowledgeBase::new();
    load_into(&mut kb, paths, opts)?;
    Ok(kb)
}

/// Loads ontology files (and their imports) into an existing knowledge base.
pub fn load_into(
    kb: &mut KnowledgeBase,
    paths: &[PathBuf],
    opts: &LoadOptions,
) -> Result<(), KbError> {
    // Parse every given file first, so that imports naming one of them resolve to it.
    let mut given: Vec<(PathBuf, Parsed)> = Vec::new();
    for p in paths {
        let parsed = parse_file(p)?;
        accept_unreadable(kb, p, &parsed, opts.lenient)?;
        given.push((p.clone(), parsed));
    }
    let mut loaded_iris: BTreeSet<String> = BTreeSet::new();
    let mut loaded_paths: BTreeSet<PathBuf> = BTreeSet::new();
    for (p, _) in &given {
        loaded_paths.insert(canonical(p));
    }
    for (_, parsed) in &given {
        if let Some(iri) = &parsed.iri {
            loaded_iris.insert(iri.clone());
        }
    }
    let given_iris: Vec<Option<String>> = given.iter().map(|(_, p)| p.iri.clone()).collect();
    let mut queue: Vec<(PathBuf, Parsed, Vec<String>)> = Vec::new();
    for (p, parsed) in given {
        let chain = vec![
            parsed
                .iri
                .clone()
                .unwrap_or_else(|| p.display().to_string()),
        ];
        queue.push((p, parsed, chain));
    }
    let mut idx = 0;
    while idx < queue.len() {
        let (path, imports, chain) = {
            let (p, parsed, chain) = &queue[idx];
            (p.clone(), parsed.imports.clone(), chain.clone())
        };
        for imp in imports {
            if chain.contains(&imp) {
                return Err(KbError::ImportCycle {
                    file: path.display().to_string(),
                    chain: format!("{} -> {}", chain.join(" -> "), imp),
                });
            }
            if loaded_iris.contains(&imp)
                || given_iris
                    .iter()
                    .any(|g| g.as_deref() == Some(imp.as_str()))
            {
                continue;
            }
            match resolve_import(&imp, &path, &opts.import_dirs) {
                Some(found) => {
                    let key = canonical(&found);
                    if loaded_paths.contains(&key) {
                        // The same file under another IRI: a cycle when it is on the chain.
                        if queue.iter().any(|(qp, qparsed, _)| {
                            canonical(qp) == key
                                && qparsed.iri.as_ref().is_some_and(|i| chain.contains(i))
                        }) {
                            return Err(KbError::ImportCycle {
                                file: path.display().to_string(),
                                chain: format!("{} -> {}", chain.join(" -> "), imp),
                            });
                        }
                        continue;
                    }
                    let parsed = parse_file(&found)?;
                    accept_unreadable(kb, &found, &parsed, opts.lenient)?;
                    if let Some(i) = &parsed.iri {
                        if chain.contains(i) {
                            return Err(KbError::ImportCycle {
                                file: found.display().to_string(),
                                chain: format!("{} -> {}", chain.join(" -> "), i),
                            });
                        }
                        loaded_iris.insert(i.clone());
                    }
                    loaded_iris.insert(imp.clone());
                    loaded_paths.insert(key);
                    let mut c2 = chain.clone();
                    c2.push(imp.clone());
                    queue.push((found, parsed, c2));
                }
                None => {
                    kb.warnings.push(format!(
                        "{}: import <{}> not found beside the file or in --import-dir; going on without it, so results may be incomplete",
                        path.display(),
                        imp
                    ));
                    kb.incomplete = true;
                    loaded_iris.insert(imp);
                }
            }
        }
        idx += 1;
    }
    // Strict RDF/XML: every class and property used must be declared somewhere in the
    // loaded files (OWL 2 Mapping to RDF Graphs, §3.1.1, needs declarations to parse).
    let mut declared: BTreeSet<String> = BTreeSet::new();
    for (_, parsed, _) in &queue {
        for ac in &parsed.components {
            match &ac.component {
                Component::DeclareClass(c) => {
                    declared.insert(c.0.to_string());
                }
                Component::DeclareObjectProperty(p) => {
                    declared.insert(p.0.to_string());
                }
                Component::DeclareDataProperty(p) => {
                    declared.insert(p.0.to_string());
                }
                _ => {}
            }
        }
    }
    let mut first_seen: Vec<(String, bool, usize, usize, usize)> = Vec::new();
    for (path, parsed, _) in queue {
        let file = path.display().to_string();
        first_seen.push((
            file.clone(),
            parsed.rdf,
            kb.vocab.classes.len(),
            kb.vocab.props.len(),
            kb.vocab.data_props.len(),
        ));
        kb.files.push(file.clone());
        let mut conv = Converter {
            kb,
            file,
            lenient: opts.lenient,
        };
        conv.convert_all(&parsed.components)?;
    }
    first_seen.push((
        String::new(),
        false,
        kb.vocab.classes.len(),
        kb.vocab.props.len(),
        kb.vocab.data_props.len(),
    ));
    for w in first_seen.windows(2) {
        let (file, rdf, c0, p0, d0) = &w[0];
        let (_, _, c1, p1, d1) = &w[1];
        if !rdf {
            continue;
        }
        let names = kb
            .vocab
            .classes
            .iter()
            .skip(*c0)
            .take(c1 - c0)
            .chain(kb.vocab.props.iter().skip(*p0).take(p1 - p0))
            .chain(kb.vocab.data_props.iter().skip(*d0).take(d1 - d0));
        let missing: Vec<String> = names
            .filter(|n| !declared.contains(*n) && !n.starts_with(OWL) && !n.starts_with(XSD))
            .cloned()
            .collect();
        if !missing.is_empty() {
            let msg = format!(
                "undeclared entit{} in strict RDF/XML: {}. Declare {} (rdf:type owl:Class, owl:ObjectProperty or owl:DatatypeProperty)",
                if missing.len() == 1 { "y" } else { "ies" },
                missing
                    .iter()
                    .take(5)
                    .map(|m| format!("<{m}>"))
                    .collect::<Vec<_>>()
                    .join(", "),
                if missing.len() == 1 { "it" } else { "them" }
            );
            if opts.lenient {
                kb.warnings
                    .push(format!("{file}: {msg}; going on (--lenient)"));
            } else {
                return Err(KbError::Syntax {
                    file: file.clone(),
                    reason: format!("{msg}, or pass --lenient."),
                });
            }
        }
    }
    kb.signature_classes = (0..kb.vocab.classes.len() as u32)
        .map(super::ClassId)
        .collect();
    Ok(())
}

/// Splits axioms written in functional syntax into their `Prefix(...)` lines and the rest,
/// so that the rest can be wrapped in an `Ontology(...)` after the prefixes.
fn split_prefixes(text: &str) -> (String, String) {
    let mut prefixes = String::new();
    let mut body = String::new();
    for line in text.lines() {
        let part = if line.trim_start().starts_with("Prefix(") {
            &mut prefixes
        } else {
            &mut body
        };
        part.push_str(line);
        part.push('\n');
    }
    (prefixes, body)
}

/// Parses axioms written in OWL 2 functional syntax (without the `Ontology(...)` wrapper;
/// `Prefix` declarations may precede them) and adds them to the knowledge base. `name`
/// stands for the file in messages. Returns the range of new axiom indices.
pub fn load_axioms_text(
    kb: &mut KnowledgeBase,
    name: &str,
    text: &str,
) -> Result<std::ops::Range<usize>, KbError> {
    let (prefixes, body) = split_prefixes(text);
    let header = format!("{prefixes}Ontology(<urn:wherefore:query>\n");
    let doc = format!("{header}{body})\n");
    let (doc, shift) = with_standard_prefixes(&doc);
    // Positions in messages count from the start of the axioms, not of the wrapper.
    let shift = shift + header.len();
    let parsed = std::thread::Builder::new()
        .name(PARSER_THREAD.into())
        .stack_size(256 << 20)
        .spawn(move || parse_text(&doc, ResourceType::OFN, None).map(|(o, _)| o))
        .map_err(|e| KbError::Syntax {
            file: name.into(),
            reason: e.to_string(),
        })?
        .join();
    let ont = match parsed {
        Ok(Ok(o)) => o,
        Ok(Err(reason)) => {
            return Err(KbError::Syntax {
                file: name.into(),
                reason: locate(&reason, &body, shift),
            });
        }
        Err(_) => {
            return Err(KbError::Syntax {
                file: name.into(),
                reason: "malformed functional syntax".into(),
            });
        }
    };
    let mut comps: Vec<AnnotatedComponent<ArcStr>> = ont.iter().cloned().collect();
    comps.sort();
    let start = kb.axioms.len();
    let mut conv = Converter {
        kb,
        file: name.to_string(),
        lenient: false,
    };
    conv.convert_all(&comps)?;
    Ok(start..kb.axioms.len())
}

fn canonical(p: &Path) -> PathBuf {
    std::fs::canonicalize(p).unwrap_or_else(|_| p.to_path_buf())
}

/// Finds a local file for an imported ontology IRI.
fn resolve_import(iri: &str, importer: &Path, dirs: &[PathBuf]) -> Option<PathBuf> {
    if let Some(rest) = iri.strip_prefix("file://") {
        let p = PathBuf::from(rest);
        if p.is_file() {
            return Some(p);
        }
    }
    let last = iri
        .trim_end_matches(['/', '#'])
        .rsplit(['/', '#', ':'])
        .next()
        .unwrap_or("");
    if last.is_empty() {
        return None;
    }
    let mut names = vec![last.to_string()];
    if !last.contains('.') {
        for ext in ["ofn", "owl", "owx", "rdf", "xml"] {
            names.push(format!("{last}.{ext}"));
        }
    }
    let mut folders: Vec<PathBuf> = Vec::new();
    if let Some(parent) = importer.parent() {
        folders.push(if parent.as_os_str().is_empty() {
            PathBuf::from(".")
        } else {
            parent.to_path_buf()
        });
    }
    folders.extend(dirs.iter().cloned());
    for f in folders {
        for n in &names {
            let c = f.join(n);
            if c.is_file() {
                return Some(c);
            }
        }
    }
    None
}

/// Reads and parses one file, telling the syntax from its content.
fn parse_file(path: &Path) -> Result<Parsed, KbError> {
    let file = path.display().to_string();
    let bytes = std::fs::read(path).map_err(|e| KbError::Unreadable {
        file: file.clone(),
        reason: e.to_string(),
    })?;
    parse_bytes(file, bytes)
}

/// Parses one document's bytes; `file` names it in messages.
fn parse_bytes(file: String, bytes: Vec<u8>) -> Result<Parsed, KbError> {
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
fn unreadable_error(file: &str, parts: &[String]) -> KbError {
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
fn accept_unreadable(
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
fn parse_bytes_strict(file: String, bytes: Vec<u8>) -> Result<Parsed, KbError> {
    let parsed = parse_bytes(file.clone(), bytes)?;
    if parsed.unreadable.is_empty() {
        Ok(parsed)
    } else {
        Err(unreadable_error(&file, &parsed.unreadable))
    }
}

/// An edit of the session, applied to the documents when they are written back.
#[derive(Clone, Copy, Debug)]
pub enum DocumentEdit<'a> {
    /// Axioms in functional syntax (`Prefix` lines may precede them).
    Add(&'a str),
    /// An axiom, as the knowledge base's source text has it (full IRIs, no annotations):
    /// every component with that text is removed, whatever its annotations.
    Retract(&'a str),
}

/// Writes one OWL 2 functional-syntax document holding every component of `documents`
/// (name, text; any syntax we read) with `edits` applied in order. Imports of the merged
/// documents are dropped (their content is inside); the first document's ontology IRI is
/// kept. `prefixes` (name, IRI) are declared in the output; the empty name is the default.
pub fn write_merged(
    documents: &[(String, String)],
    edits: &[DocumentEdit],
    prefixes: &[(String, String)],
) -> Result<String, KbError> {
    use horned_owl::ontology::component_mapped::ComponentMappedOntology;
    let mut comps: BTreeSet<AnnotatedComponent<ArcStr>> = BTreeSet::new();
    let mut iris: BTreeSet<String> = BTreeSet::new();
    let mut first_id = true;
    for (name, text) in documents {
        let parsed = parse_bytes_strict(name.clone(), text.clone().into_bytes())?;
        if let Some(i) = &parsed.iri {
            iris.insert(i.clone());
        }
        for ac in parsed.components {
            if matches!(ac.component, Component::OntologyID(_)) {
                if !first_id {
                    continue;
                }
                first_id = false;
            }
            comps.insert(ac);
        }
    }
    comps.retain(
        |ac| !matches!(&ac.component, Component::Import(i) if iris.contains(&i.0.to_string())),
    );
    for e in edits {
        match e {
            DocumentEdit::Add(text) => {
                let (head, body) = split_prefixes(text);
                let doc = format!("{head}Ontology(<urn:wherefore:edit>\n{body})\n");
                let parsed = parse_bytes_strict("session edit".into(), doc.into_bytes())?;
                for ac in parsed.components {
                    if !matches!(ac.component, Component::OntologyID(_)) {
                        comps.insert(ac);
                    }
                }
            }
            DocumentEdit::Retract(text) => {
                comps.retain(|ac| ac.component.as_functional().to_string() != *text);
            }
        }
    }
    let mut mapping = horned_owl::curie::PrefixMapping::default();
    for (p, iri) in prefixes {
        if p.is_empty() {
            mapping.set_default(iri);
        } else {
            let _ = mapping.add_prefix(p, iri);
        }
    }
    let ont: ComponentMappedOntology<ArcStr, horned_owl::model::ArcAnnotatedComponent> =
        comps.into_iter().collect();
    let out =
        horned_owl::io::ofn::writer::write(Vec::new(), &ont, Some(&mapping)).map_err(|e| {
            KbError::Syntax {
                file: "(save)".into(),
                reason: format!("cannot write functional syntax: {e}"),
            }
        })?;
    String::from_utf8(out).map_err(|e| KbError::Syntax {
        file: "(save)".into(),
        reason: e.to_string(),
    })
}

/// The name of the thread that parses; the binary's panic hook keeps quiet for it.
pub const PARSER_THREAD: &str = "wherefore-owl-parser";

/// OWL 2 functional syntax predeclares the owl:, rdf:, rdfs: and xsd: prefixes (Structural
/// Specification §3.7); horned-owl does not, so the missing ones are put in front.
fn with_standard_prefixes(text: &str) -> (String, usize) {
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
fn locate(reason: &str, original: &str, shift: usize) -> String {
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

fn parse_text(
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
fn leftover_parts(inc: &horned_owl::io::rdf::reader::IncompleteParse<ArcStr>) -> Vec<String> {
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
struct AllDisjoint {
    classes: bool,
    members: Vec<String>,
}

/// Finds `_:x rdf:type owl:AllDisjointClasses|owl:AllDisjointProperties . _:x owl:members
/// (m1 … mn)` with n ≥ 2 members and nothing else said about `_:x` or the list nodes (OWL 2
/// Mapping to RDF Graphs, Table 16), and returns the rest of the graph as N-Triples
/// without those nodes, plus the groups with named members. Classes with anonymous
/// members are written back as pairwise owl:disjointWith triples instead. None when there
/// is no such node (or the document does not parse: then horned-owl reports the error).
fn take_all_disjoint(text: &str, format: oxrdfio::RdfFormat) -> Option<(String, Vec<AllDisjoint>)> {
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
fn add_all_disjoint(
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

struct Converter<'a> {
    kb: &'a mut KnowledgeBase,
    file: String,
    lenient: bool,
}

type Conv<T> = Result<T, String>;

impl Converter<'_> {
    fn convert_all(&mut self, comps: &[AnnotatedComponent<ArcStr>]) -> Result<(), KbError> {
        for ac in comps {
            let text = ac.component.as_functional().to_string();
            let anns: Vec<(String, String)> = ac
                .ann
                .iter()
                .map(|a| (a.ap.0.to_string(), annotation_text(&a.av).0))
                .collect();
            let start = self.kb.axioms.len();
            let src = self.kb.sources.len();
            match self.component(&ac.component, src) {
                Ok(true) => {
                    self.kb.add_source(text, self.file.clone(), anns);
                }
                Ok(false) => {}
                Err(reason) => {
                    self.kb.axioms.truncate(start);
                    if self.lenient {
                        self.kb
                            .warnings
                            .push(format!("{}: dropped {} ({})", self.file, text, reason));
                        self.kb.incomplete = true;
                    } else {
                        return Err(KbError::Unsupported {
                            file: self.file.clone(),
                            axiom: text,
                            reason,
                        });
                    }
                }
            }
        }
        Ok(())
    }

    /// Converts one component; returns whether it was a logical axiom.
    fn component(&mut self, c: &Component<ArcStr>, src: usize) -> Conv<bool> {
        use Component as C;
        match c {
            C::OntologyID(_) | C::DocIRI(_) | C::Import(_) | C::OntologyAnnotation(_) => Ok(false),
            C::DeclareClass(cl) => {
                self.class_concept(&cl.0);
                Ok(false)
            }
            C::DeclareObjectProperty(p) => {
                self.kb.vocab.prop(&p.0);
                Ok(false)
            }
            C::DeclareDataProperty(p) => {
                self.kb.vocab.data_prop(&p.0);
                Ok(false)
            }
            C::DeclareNamedIndividual(i) => {
                self.kb.vocab.individual(&i.0);
                Ok(false)
            }
            C::DeclareAnnotationProperty(_) | C::DeclareDatatype(_) => Ok(false),
            C::AnnotationAssertion(a) => {
                let subject = match &a.subject {
                    AnnotationSubject::IRI(i) => i.to_string(),
                    AnnotationSubject::AnonymousIndividual(i) => format!("_:{}", i.0),
                };
                let (value, lang) = annotation_text(&a.ann.av);
                self.kb
                    .annotations
                    .entry(subject)
                    .or_default()
                    .entry(a.ann.ap.0.to_string())
                    .or_default()
                    .push(AnnotationValue { value, lang });
                Ok(false)
            }
            C::SubAnnotationPropertyOf(_)
            | C::AnnotationPropertyDomain(_)
            | C::AnnotationPropertyRange(_) => Ok(false),
            C::SubClassOf(ax) => {
                if let CE::ObjectOneOf(inds) = &ax.sub {
                    // {a₁,…,aₙ} ⊑ C holds exactly when each C(aᵢ) does.
                    for i in inds {
                        let a = self.individual(i);
                        self.assert_class(&ax.sup, a, src)?;
                    }
                    return Ok(true);
                }
                let sub = self.ce(&ax.sub)?;
                let sup = self.ce(&ax.sup)?;
                self.kb.push(Axiom::SubClass(sub, sup), src);
                Ok(true)
            }
            C::EquivalentClasses(ax) => {
                let cs = ax.0.iter().map(|e| self.ce(e)).collect::<Conv<Vec<_>>>()?;
                self.kb.push(Axiom::Equivalent(cs), src);
                Ok(true)
            }
            C::DisjointClasses(ax) => {
                let cs = ax.0.iter().map(|e| self.ce(e)).collect::<Conv<Vec<_>>>()?;
                self.kb.push(Axiom::Disjoint(cs), src);
                Ok(true)
            }
            C::DisjointUnion(ax) => {
                let a = self.class_concept(&ax.0.0);
                let cs = ax.1.iter().map(|e| self.ce(e)).collect::<Conv<Vec<_>>>()?;
                self.kb.push(Axiom::DisjointUnion(a, cs), src);
                Ok(true)
            }
            C::SubObjectPropertyOf(ax) => {
                let sup = self.role(&ax.sup);
                match &ax.sub {
                    SubObjectPropertyExpression::ObjectPropertyExpression(e) => {
                        let sub = self.role(e);
                        self.kb.push(Axiom::SubRole(sub, sup), src);
                        Ok(true)
                    }
                    SubObjectPropertyExpression::ObjectPropertyChain(_) => {
                        Err("property chains are outside SHIQ".into())
                    }
                }
            }
            C::EquivalentObjectProperties(ax) => {
                let rs: Vec<RoleId> = ax.0.iter().map(|e| self.role(e)).collect();
                for w in rs.windows(2) {
                    self.kb.push(Axiom::SubRole(w[0], w[1]), src);
                    self.kb.push(Axiom::SubRole(w[1], w[0]), src);
                }
                Ok(true)
            }
            C::InverseObjectProperties(ax) => {
                let p = RoleId::named(self.kb.vocab.prop(&ax.0.0));
                let q = RoleId::named(self.kb.vocab.prop(&ax.1.0));
                self.kb.push(Axiom::SubRole(p, q.inverse()), src);
                self.kb.push(Axiom::SubRole(q.inverse(), p), src);
                Ok(true)
            }
            C::ObjectPropertyDomain(ax) => {
                let r = self.role(&ax.ope);
                let c = self.ce(&ax.ce)?;
                self.kb.push(Axiom::Domain(r, c), src);
                Ok(true)
            }
            C::ObjectPropertyRange(ax) => {
                let r = self.role(&ax.ope);
                let c = self.ce(&ax.ce)?;
                self.kb.push(Axiom::Domain(r.inverse(), c), src);
                Ok(true)
            }
            C::FunctionalObjectProperty(ax) => {
                let r = self.role(&ax.0);
                self.kb.push(Axiom::Functional(r), src);
                Ok(true)
            }
            C::InverseFunctionalObjectProperty(ax) => {
                let r = self.role(&ax.0);
                self.kb.push(Axiom::Functional(r.inverse()), src);
                Ok(true)
            }
            C::SymmetricObjectProperty(ax) => {
                let r = self.role(&ax.0);
                self.kb.push(Axiom::SubRole(r, r.inverse()), src);
                Ok(true)
            }
            C::TransitiveObjectProperty(ax) => {
                let r = self.role(&ax.0);
                self.kb.push(Axiom::Transitive(r), src);
                Ok(true)
            }
            C::ReflexiveObjectProperty(_) => Err("reflexive properties are outside SHIQ".into()),
            C::IrreflexiveObjectProperty(_) => {
                Err("irreflexive properties are outside SHIQ".into())
            }
            C::AsymmetricObjectProperty(_) => Err("asymmetric properties are outside SHIQ".into()),
            C::DisjointObjectProperties(_) => {
                Err("disjoint object properties are outside SHIQ".into())
            }
            C::SubDataPropertyOf(ax) => {
                let a = self.kb.vocab.data_prop(&ax.sub.0);
                let b = self.kb.vocab.data_prop(&ax.sup.0);
                self.kb.push(Axiom::SubDataProp(a, b), src);
                Ok(true)
            }
            C::EquivalentDataProperties(ax) => {
                let ps: Vec<_> = ax.0.iter().map(|p| self.kb.vocab.data_prop(&p.0)).collect();
                for w in ps.windows(2) {
                    self.kb.push(Axiom::SubDataProp(w[0], w[1]), src);
                    self.kb.push(Axiom::SubDataProp(w[1], w[0]), src);
                }
                Ok(true)
            }
            C::DisjointDataProperties(_) => {
                Err("disjoint data properties are not supported".into())
            }
            C::DataPropertyDomain(ax) => {
                let p = self.kb.vocab.data_prop(&ax.dp.0);
                let c = self.ce(&ax.ce)?;
                self.kb.push(Axiom::DataDomain(p, c), src);
                Ok(true)
            }
            C::DataPropertyRange(ax) => {
                let p = self.kb.vocab.data_prop(&ax.dp.0);
                let r = self.data_range(&ax.dr)?;
                let id = self.kb.ranges.intern(r);
                self.kb.push(Axiom::DataRangeAxiom(p, id), src);
                Ok(true)
            }
            C::FunctionalDataProperty(ax) => {
                let p = self.kb.vocab.data_prop(&ax.0.0);
                self.kb.push(Axiom::FunctionalData(p), src);
                Ok(true)
            }
            C::DatatypeDefinition(_) => Err("datatype definitions are not supported".into()),
            C::HasKey(_) => Err("keys are outside SHIQ".into()),
            C::SameIndividual(ax) => {
                let is: Vec<_> = ax.0.iter().map(|i| self.individual(i)).collect();
                self.kb.push(Axiom::Same(is), src);
                Ok(true)
            }
            C::DifferentIndividuals(ax) => {
                let is: Vec<_> = ax.0.iter().map(|i| self.individual(i)).collect();
                self.kb.push(Axiom::Different(is), src);
                Ok(true)
            }
            C::ClassAssertion(ax) => {
                let a = self.individual(&ax.i);
                self.assert_class(&ax.ce, a, src)?;
                Ok(true)
            }
            C::ObjectPropertyAssertion(ax) => {
                let r = self.role(&ax.ope);
                let a = self.individual(&ax.from);
                let b = self.individual(&ax.to);
                self.kb.push(Axiom::RoleAssertion(r, a, b), src);
                Ok(true)
            }
            C::NegativeObjectPropertyAssertion(ax) => {
                let r = self.role(&ax.ope);
                let a = self.individual(&ax.from);
                let b = self.individual(&ax.to);
                self.kb.push(Axiom::NegativeRoleAssertion(r, a, b), src);
                Ok(true)
            }
            C::DataPropertyAssertion(ax) => {
                let p = self.kb.vocab.data_prop(&ax.dp.0);
                let a = self.individual(&ax.from);
                let v = self.literal_range(&ax.to)?;
                let c = self.data_some(p, v);
                self.kb.push(Axiom::ClassAssertion(c, a), src);
                Ok(true)
            }
            C::NegativeDataPropertyAssertion(ax) => {
                let p = self.kb.vocab.data_prop(&ax.dp.0);
                let a = self.individual(&ax.from);
                let v = self.literal_range(&ax.to)?;
                let c = self.data_some(p, v);
                let nc = self.kb.concepts.not(c);
                self.kb.push(Axiom::ClassAssertion(nc, a), src);
                Ok(true)
            }
            C::Rule(_) => Err("SWRL rules are not supported".into()),
        }
    }

    /// C(a), with nominal forms rewritten into plain assertions where that is exact.
    fn assert_class(&mut self, ce: &CE<ArcStr>, a: IndividualId, src: usize) -> Conv<()> {
        match ce {
            CE::ObjectIntersectionOf(xs) => {
                for x in xs {
                    self.assert_class(x, a, src)?;
                }
                Ok(())
            }
            CE::ObjectHasValue { ope, i } => {
                let r = self.role(ope);
                let b = self.individual(i);
                self.kb.push(Axiom::RoleAssertion(r, a, b), src);
                Ok(())
            }
            CE::ObjectOneOf(is) if is.len() == 1 => {
                let b = self.individual(&is[0]);
                self.kb.push(Axiom::Same(vec![a, b]), src);
                Ok(())
            }
            CE::ObjectComplementOf(inner) => match inner.as_ref() {
                CE::ObjectHasValue { ope, i } => {
                    let r = self.role(ope);
                    let b = self.individual(i);
                    self.kb.push(Axiom::NegativeRoleAssertion(r, a, b), src);
                    Ok(())
                }
                CE::ObjectOneOf(is) => {
                    for i in is {
                        let b = self.individual(i);
                        self.kb.push(Axiom::Different(vec![a, b]), src);
                    }
                    Ok(())
                }
                _ => {
                    let c = self.ce(ce)?;
                    self.kb.push(Axiom::ClassAssertion(c, a), src);
                    Ok(())
                }
            },
            _ => {
                let c = self.ce(ce)?;
                self.kb.push(Axiom::ClassAssertion(c, a), src);
                Ok(())
            }
        }
    }

    fn class_concept(&mut self, iri: &str) -> ConceptId {
        if iri == format!("{OWL}Thing") {
            return ConceptId::TOP;
        }
        if iri == format!("{OWL}Nothing") {
            return ConceptId::BOTTOM;
        }
        let c = self.kb.vocab.class(iri);
        self.kb.concepts.atom(c)
    }

    fn role(&mut self, e: &OPE<ArcStr>) -> RoleId {
        match e {
            OPE::ObjectProperty(p) => RoleId::named(self.kb.vocab.prop(&p.0)),
            OPE::InverseObjectProperty(p) => RoleId::named(self.kb.vocab.prop(&p.0)).inverse(),
        }
    }

    fn individual(&mut self, i: &Individual<ArcStr>) -> IndividualId {
        match i {
            Individual::Named(n) => self.kb.vocab.individual(&n.0),
            Individual::Anonymous(a) => self
                .kb
                .vocab
                .individual(&format!("_:{}#{}", self.file, a.0)),
        }
    }

    fn data_some(&mut self, p: super::DataPropId, r: DataRange) -> ConceptId {
        let not_r = r.complement();
        let a = self.kb.ranges.intern(r);
        let b = self.kb.ranges.intern(not_r);
        self.kb.concepts.data_some(p, a, b)
    }

    fn data_all(&mut self, p: super::DataPropId, r: DataRange) -> ConceptId {
        let not_r = r.complement();
        let a = self.kb.ranges.intern(r);
        let b = self.kb.ranges.intern(not_r);
        self.kb.concepts.data_all(p, a, b)
    }

    /// Translates a class expression into a concept in NNF.
    fn ce(&mut self, e: &CE<ArcStr>) -> Conv<ConceptId> {
        Ok(match e {
            CE::Class(c) => self.class_concept(&c.0),
            CE::ObjectIntersectionOf(xs) => {
                let v = xs.iter().map(|x| self.ce(x)).collect::<Conv<Vec<_>>>()?;
                self.kb.concepts.and(v)
            }
            CE::ObjectUnionOf(xs) => {
                let v = xs.iter().map(|x| self.ce(x)).collect::<Conv<Vec<_>>>()?;
                self.kb.concepts.or(v)
            }
            CE::ObjectComplementOf(x) => {
                let c = self.ce(x)?;
                self.kb.concepts.not(c)
            }
            CE::ObjectOneOf(is) => {
                if is.is_empty() {
                    return Ok(ConceptId::BOTTOM);
                }
                self.kb.tbox_nominals = true;
                let v: Vec<ConceptId> = is
                    .iter()
                    .map(|i| {
                        let a = self.individual(i);
                        self.kb.concepts.nominal(a)
                    })
                    .collect();
                self.kb.concepts.or(v)
            }
            CE::ObjectSomeValuesFrom { ope, bce } => {
                let r = self.role(ope);
                let c = self.ce(bce)?;
                self.kb.concepts.some(r, c)
            }
            CE::ObjectAllValuesFrom { ope, bce } => {
                let r = self.role(ope);
                let c = self.ce(bce)?;
                self.kb.concepts.all(r, c)
            }
            CE::ObjectHasValue { ope, i } => {
                self.kb.tbox_nominals = true;
                let r = self.role(ope);
                let a = self.individual(i);
                let n = self.kb.concepts.nominal(a);
                self.kb.concepts.some(r, n)
            }
            CE::ObjectHasSelf(_) => return Err("self restrictions are outside SHIQ".into()),
            CE::ObjectMinCardinality { n, ope, bce } => {
                let r = self.role(ope);
                let c = self.ce(bce)?;
                self.kb.concepts.at_least(*n, r, c)
            }
            CE::ObjectMaxCardinality { n, ope, bce } => {
                let r = self.role(ope);
                let c = self.ce(bce)?;
                self.kb.concepts.at_most(*n, r, c)
            }
            CE::ObjectExactCardinality { n, ope, bce } => {
                let r = self.role(ope);
                let c = self.ce(bce)?;
                let a = self.kb.concepts.at_least(*n, r, c);
                let b = self.kb.concepts.at_most(*n, r, c);
                self.kb.concepts.and([a, b])
            }
            CE::DataSomeValuesFrom { dp, dr } => {
                let p = self.kb.vocab.data_prop(&dp.0);
                let r = self.data_range(dr)?;
                self.data_some(p, r)
            }
            CE::DataAllValuesFrom { dp, dr } => {
                let p = self.kb.vocab.data_prop(&dp.0);
                let r = self.data_range(dr)?;
                self.data_all(p, r)
            }
            CE::DataHasValue { dp, l } => {
                let p = self.kb.vocab.data_prop(&dp.0);
                let r = self.literal_range(l)?;
                self.data_some(p, r)
            }
            CE::DataMinCardinality { n, dp, dr }
            | CE::DataMaxCardinality { n, dp, dr }
            | CE::DataExactCardinality { n, dp, dr } => {
                let p = self.kb.vocab.data_prop(&dp.0);
                let r = self.data_range(dr)?;
                let not_r = r.complement();
                let (a, b) = (self.kb.ranges.intern(r), self.kb.ranges.intern(not_r));
                let cs = &mut self.kb.concepts;
                let min = cs.data_at_least(*n, p, a, b);
                let max = cs.data_at_most(*n, p, a, b);
                match e {
                    CE::DataMinCardinality { .. } => min,
                    CE::DataMaxCardinality { .. } => max,
                    _ => cs.and([min, max]),
                }
            }
        })
    }

    fn data_range(&mut self, d: &HDataRange<ArcStr>) -> Conv<DataRange> {
        Ok(match d {
            HDataRange::Datatype(dt) => datatype::named(&dt.0)?,
            HDataRange::DataIntersectionOf(xs) => {
                let mut acc = DataRange::everything();
                for x in xs {
                    acc = acc.intersect(&self.data_range(x)?);
                }
                acc
            }
            HDataRange::DataUnionOf(xs) => {
                let mut acc = DataRange::empty();
                for x in xs {
                    acc = acc.union(&self.data_range(x)?);
                }
                acc
            }
            HDataRange::DataComplementOf(x) => self.data_range(x)?.complement(),
            HDataRange::DataOneOf(ls) => {
                let mut acc = DataRange::empty();
                for l in ls {
                    acc = acc.union(&self.literal_range(l)?);
                }
                acc
            }
            HDataRange::DatatypeRestriction(dt, facets) => {
                let fs: Vec<_> = facets
                    .iter()
                    .map(|f| {
                        let (lex, dt, lang) = literal_parts(&f.l);
                        (f.f.as_ref().to_string(), lex, dt, lang)
                    })
                    .collect();
                datatype::restrict(&dt.0, &fs)?
            }
        })
    }

    fn literal_range(&mut self, l: &Literal<ArcStr>) -> Conv<DataRange> {
        let (lex, dt, lang) = literal_parts(l);
        datatype::literal(&lex, dt.as_deref(), lang.as_deref())
    }
}

/// A literal as (lexical form, datatype IRI, language tag); plain literals have no datatype.
fn literal_parts(l: &Literal<ArcStr>) -> (String, Option<String>, Option<String>) {
    match l {
        Literal::Simple { literal } => (literal.clone(), None, None),
        Literal::Language { literal, lang } => (literal.clone(), None, Some(lang.clone())),
        Literal::Datatype {
            literal,
            datatype_iri,
        } => (literal.clone(), Some(datatype_iri.to_string()), None),
    }
}

fn annotation_text(v: &horned_owl::model::AnnotationValue<ArcStr>) -> (String, String) {
    use horned_owl::model::AnnotationValue as AV;
    match v {
        AV::Literal(Literal::Simple { literal }) => (literal.clone(), String::new()),
        AV::Literal(Literal::Language { literal, lang }) => (literal.clone(), lang.clone()),
        AV::Literal(Literal::Datatype { literal, .. }) => (literal.clone(), String::new()),
        AV::IRI(i) => (i.to_string(), String::new()),
        AV::AnonymousIndividual(a) => (format!("_:{}", a.0), String::new()),
    }
}

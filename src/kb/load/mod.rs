//! Loading OWL 2 ontologies (functional syntax, OWL/XML, RDF/XML) through horned-owl:
//! the files given, their imports, and axioms typed as text. Converting what was read is
//! `kb/owl.rs`'s job.

pub mod document;
mod imports;
mod parse;
mod rdf_lists;

use super::owl::{Converter, OWL, XSD};
use super::{KbError, KnowledgeBase};
use horned_owl::io::ResourceType;
use horned_owl::model::{AnnotatedComponent, ArcStr, Component};
use imports::{canonical, resolve_import};
use parse::{Parsed, accept_unreadable, locate, parse_file, parse_text, with_standard_prefixes};
use std::collections::BTreeSet;
use std::path::PathBuf;

/// How to load ontologies.
#[derive(Clone, Debug, Default)]
pub struct LoadOptions {
    /// Extra folders searched for imported ontologies.
    pub import_dirs: Vec<PathBuf>,
    /// Drop refused axioms with a warning instead of failing.
    pub lenient: bool,
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
pub(super) fn split_prefixes(text: &str) -> (String, String) {
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

/// The name of the thread that parses; the binary's panic hook keeps quiet for it.
pub const PARSER_THREAD: &str = "wherefore-owl-parser";

//! Loading OWL 2 ontologies through horned-owl: the files given, their imports closure,
//! and axioms typed as text. The syntax of each document is told by its content
//! (`syntax.rs`); every document is read with the declarations of all the others
//! (`parse.rs`). Converting what was read is `kb/owl.rs`'s job.

pub mod document;
mod entities;
mod imports;
mod parse;
mod rdf_lists;
pub mod save;
pub mod syntax;

use super::owl::{Converter, OWL, XSD, define_datatypes};
use super::{KbError, KnowledgeBase};
use horned_owl::model::Component;
use imports::{Naming, Resolver, canonical, find_cycle, naming};
use parse::{
    Opened, accept_unreadable, locate, on_parser_thread, open_file, read_functional,
    with_standard_prefixes,
};
use std::collections::BTreeSet;
use std::path::PathBuf;

/// How to load ontologies.
#[derive(Clone, Debug, Default)]
pub struct LoadOptions {
    /// Extra folders searched for imported ontologies.
    pub import_dirs: Vec<PathBuf>,
    /// Drop refused axioms with a warning instead of failing.
    pub lenient: bool,
    /// An XML catalog asked first for every import (`--catalog FILE`).
    pub catalog: Option<PathBuf>,
}

/// Loads ontology files (and their imports) into a fresh knowledge base.
pub fn load(paths: &[PathBuf], opts: &LoadOptions) -> Result<KnowledgeBase, KbError> {
    let mut kb = KnowledgeBase::new();
    load_into(&mut kb, paths, opts)?;
    Ok(kb)
}

/// One document of the imports closure.
struct Document {
    path: PathBuf,
    opened: Opened,
}

impl Document {
    /// How the document is called in messages: its ontology IRI, else its file.
    fn name(&self) -> String {
        self.opened
            .iri
            .clone()
            .unwrap_or_else(|| self.path.display().to_string())
    }

    /// How well `import` names this document (by ontology IRI or version IRI).
    fn named_by(&self, import: &str) -> Option<Naming> {
        [&self.opened.iri, &self.opened.version_iri]
            .into_iter()
            .flatten()
            .filter_map(|n| naming(import, n))
            .min()
    }
}

/// Loads ontology files (and their imports) into an existing knowledge base.
pub fn load_into(
    kb: &mut KnowledgeBase,
    paths: &[PathBuf],
    opts: &LoadOptions,
) -> Result<(), KbError> {
    let first = paths
        .first()
        .map(|p| p.display().to_string())
        .unwrap_or_default();
    let mut warnings = Vec::new();
    let mut missing = false;
    let (docs, all) = on_parser_thread(&first, || {
        let docs = read_closure(&mut warnings, &mut missing, paths, opts)?;
        // Every document is read with the declarations of all the others: its imports
        // closure and the files given beside it.
        let mut all: Vec<Component<horned_owl::model::ArcStr>> = docs
            .iter()
            .flat_map(|d| d.opened.declarations.iter().cloned())
            .collect();
        all.sort();
        all.dedup();
        let docs = docs
            .into_iter()
            .map(|d| Ok((d.path, d.opened.finish(&all)?)))
            .collect::<Result<Vec<_>, KbError>>()?;
        Ok((docs, all))
    })?;
    kb.warnings.extend(warnings);
    kb.incomplete |= missing;
    let mut declared: BTreeSet<String> = BTreeSet::new();
    for c in &all {
        match c {
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
    let texts: Vec<(String, &[_])> = docs
        .iter()
        .map(|(path, parsed)| (path.display().to_string(), parsed.components.as_slice()))
        .collect();
    define_datatypes(kb, &texts, opts.lenient)?;
    let mut first_seen: Vec<(String, bool, usize, usize, usize)> = Vec::new();
    for (path, parsed) in docs {
        let file = path.display().to_string();
        accept_unreadable(kb, &path, &parsed, opts.lenient)?;
        first_seen.push((
            file.clone(),
            parsed.syntax.is_rdf(),
            kb.vocab.classes.len(),
            kb.vocab.props.len(),
            kb.vocab.data_props.len(),
        ));
        kb.files.push(file.clone());
        let mut conv = Converter {
            kb,
            file,
            lenient: opts.lenient,
            depth: 0,
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
                "undeclared entit{} in an RDF document: {}. Declare {} (rdf:type owl:Class, owl:ObjectProperty or owl:DatatypeProperty)",
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

/// Opens the files given and, breadth first, every document they import; refuses an
/// import cycle, naming it, and warns about imports that cannot be found.
fn read_closure(
    warnings: &mut Vec<String>,
    missing: &mut bool,
    paths: &[PathBuf],
    opts: &LoadOptions,
) -> Result<Vec<Document>, KbError> {
    let mut resolver = Resolver::new(opts.catalog.as_deref(), &opts.import_dirs)?;
    let mut docs: Vec<Document> = Vec::new();
    for p in paths {
        resolver.look_beside(p)?;
        docs.push(Document {
            path: p.clone(),
            opened: open_file(p)?,
        });
    }
    // edges[i]: the documents that document i imports.
    let mut edges: Vec<Vec<usize>> = vec![Vec::new(); docs.len()];
    let mut i = 0;
    while i < docs.len() {
        let importer = docs[i].path.clone();
        for imp in docs[i].opened.imports.clone() {
            let known = docs
                .iter()
                .enumerate()
                .filter_map(|(j, d)| d.named_by(&imp).map(|how| (how, j)))
                .min();
            let j = match known {
                Some((how, j)) => {
                    if how == Naming::Trailing {
                        warnings.push(trailing_warning(&importer, &imp, &docs[j]));
                    }
                    j
                }
                None => match resolver.find(&imp, &importer) {
                    Some((found, how)) => {
                        let key = canonical(&found);
                        match docs.iter().position(|d| canonical(&d.path) == key) {
                            Some(j) => j,
                            None => {
                                resolver.look_beside(&found)?;
                                let doc = Document {
                                    opened: open_file(&found)?,
                                    path: found,
                                };
                                match doc.named_by(&imp).or(doc.opened.iri.as_ref().map(|_| how)) {
                                    Some(Naming::Exact) => {}
                                    Some(Naming::Trailing) => {
                                        warnings.push(trailing_warning(&importer, &imp, &doc))
                                    }
                                    None => {}
                                }
                                if doc.opened.iri.is_some() && doc.named_by(&imp).is_none() {
                                    warnings.push(format!(
                                        "{}: import <{imp}> was resolved to {}, which names itself <{}>; check the catalog or the file",
                                        importer.display(),
                                        doc.path.display(),
                                        doc.name()
                                    ));
                                }
                                docs.push(doc);
                                edges.push(Vec::new());
                                docs.len() - 1
                            }
                        }
                    }
                    None => {
                        warnings.push(format!(
                            "{}: import <{imp}> not found (no catalog entry, no file beside the importing file or in --import-dir); going on without it, so results may be incomplete. Give the file on the command line, name it in a catalog (--catalog) or pass --import-dir",
                            importer.display()
                        ));
                        *missing = true;
                        continue;
                    }
                },
            };
            edges[i].push(j);
        }
        i += 1;
    }
    if let Some(cycle) = find_cycle(&edges) {
        let last = cycle[cycle.len() - 2];
        return Err(KbError::ImportCycle {
            file: docs[last].path.display().to_string(),
            chain: cycle
                .iter()
                .map(|&k| docs[k].name())
                .collect::<Vec<_>>()
                .join(" -> "),
        });
    }
    Ok(docs)
}

/// The warning for an import that names a document only up to a trailing `/` or `#`.
fn trailing_warning(importer: &std::path::Path, import: &str, doc: &Document) -> String {
    format!(
        "{}: import <{import}> taken to mean <{}> ({}), which differs only by a trailing '/' or '#'; write the import as the ontology names itself",
        importer.display(),
        doc.name(),
        doc.path.display()
    )
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
    let comps = on_parser_thread(name, || {
        read_functional(&doc).map_err(|reason| KbError::Syntax {
            file: name.into(),
            reason: locate(&reason, &body, shift),
        })
    })?;
    define_datatypes(kb, &[(name.to_string(), comps.as_slice())], false)?;
    let start = kb.axioms.len();
    let mut conv = Converter {
        kb,
        file: name.to_string(),
        lenient: false,
        depth: 0,
    };
    conv.convert_all(&comps)?;
    Ok(start..kb.axioms.len())
}

/// The name of the thread that parses; the binary's panic hook keeps quiet for it.
pub const PARSER_THREAD: &str = "wherefore-owl-parser";

//! Writing the loaded documents back as one functional-syntax document with the
//! session's edits applied.

use super::parse::parse_bytes_strict;
use super::split_prefixes;
use super::syntax::Syntax;
use crate::kb::KbError;
use horned_owl::io::ofn::writer::AsFunctional;
use horned_owl::model::{AnnotatedComponent, ArcStr, Component};
use std::collections::BTreeSet;

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

/// Rewrites one document (`name` for messages, `text` in any syntax we read) in `to`,
/// keeping every component and its annotations. The round-trip tests and the syntax
/// conversions use it; prefixes given as (name, IRI) are declared where `to` has them.
pub fn write_document(
    name: &str,
    text: &str,
    to: Syntax,
    prefixes: &[(String, String)],
) -> Result<String, KbError> {
    let parsed = parse_bytes_strict(name.to_string(), text.as_bytes().to_vec())?;
    write_components(name, parsed.components, to, prefixes)
}

/// Writes components as one document in `to` (`name` for messages), declaring `prefixes`
/// (name, IRI) where `to` has them.
pub(super) fn write_components(
    name: &str,
    components: Vec<AnnotatedComponent<ArcStr>>,
    to: Syntax,
    prefixes: &[(String, String)],
) -> Result<String, KbError> {
    use horned_owl::ontology::component_mapped::ComponentMappedOntology;
    let components = if to.is_rdf() {
        pairwise_disjoint(components)
    } else {
        components
    };
    let ont: ComponentMappedOntology<ArcStr, horned_owl::model::ArcAnnotatedComponent> =
        components.into_iter().collect();
    let mut mapping = horned_owl::curie::PrefixMapping::default();
    for (p, iri) in prefixes {
        if p.is_empty() {
            mapping.set_default(iri);
        } else {
            let _ = mapping.add_prefix(p, iri);
        }
    }
    let out = match to {
        Syntax::Functional => horned_owl::io::ofn::writer::write(Vec::new(), &ont, Some(&mapping)),
        Syntax::OwlXml => horned_owl::io::owx::writer::write(Vec::new(), &ont, Some(&mapping)),
        Syntax::RdfXml => horned_owl::io::rdf::writer::write(Vec::new(), &ont, Some(&mapping)),
        Syntax::Turtle => horned_owl::io::rdf::writer::write_to_rdf_format(Vec::new(), &ont, "ttl"),
        Syntax::NTriples => {
            horned_owl::io::rdf::writer::write_to_rdf_format(Vec::new(), &ont, "nt")
        }
        Syntax::Manchester => horned_owl::io::omn::writer::write(Vec::new(), &ont, Some(&mapping)),
    }
    .map_err(|e| KbError::Syntax {
        file: name.to_string(),
        reason: format!("cannot write {}: {e}", to.name()),
    })?;
    String::from_utf8(out).map_err(|e| KbError::Syntax {
        file: name.to_string(),
        reason: e.to_string(),
    })
}

/// horned-owl 4.0.0 writes DisjointClasses(C1 … Cn) to RDF as C1 owl:disjointWith Ci
/// only, which loses Ci ⊓ Cj for 1 < i < j; the axiom is pairwise disjointness (OWL 2
/// Direct Semantics, Table 5), so it is written here as one binary axiom per pair, each
/// with the axiom's annotations.
fn pairwise_disjoint(
    components: Vec<AnnotatedComponent<ArcStr>>,
) -> Vec<AnnotatedComponent<ArcStr>> {
    use horned_owl::model::DisjointClasses;
    let mut out = Vec::with_capacity(components.len());
    for ac in components {
        match &ac.component {
            Component::DisjointClasses(DisjointClasses(members)) if members.len() > 2 => {
                for (i, a) in members.iter().enumerate() {
                    for b in &members[i + 1..] {
                        out.push(AnnotatedComponent {
                            component: DisjointClasses(vec![a.clone(), b.clone()]).into(),
                            ann: ac.ann.clone(),
                        });
                    }
                }
            }
            _ => out.push(ac),
        }
    }
    out
}

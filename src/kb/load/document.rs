//! Writing the loaded documents back as one functional-syntax document with the
//! session's edits applied.

use super::parse::parse_bytes_strict;
use super::split_prefixes;
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

//! A case's axiom texts (its `assertions` and `background`, the axioms and assertions of its
//! expectations) read as the shell reads typed axioms: Manchester or functional syntax with
//! short names, through `kb::syntax` and `kb::names`. The file's `[prefixes]` come first,
//! then those the KB's documents declare.

use super::CheckError;
use super::suite::{CaseSpec, Item1};
use crate::explain::Assertion;
use crate::explain::case::Mark;
use crate::kb::names::{EntityIndex, prefixes_of};
use crate::kb::syntax::{Statement, read_statement};
use crate::kb::{Axiom, KnowledgeBase, load};

/// `file:line` of a case file.
pub(super) fn at(c: &CaseSpec, line: usize) -> String {
    format!("{}:{line}", c.file.display())
}

/// The names a case's texts may use: the entities of a KB, with the prefixes of the case
/// file and of the KB's documents.
pub(super) struct CaseNames {
    index: EntityIndex,
    header: String,
}

impl CaseNames {
    /// Indexes `kb` with `prefixes` (see `case_prefixes`).
    pub(super) fn new(kb: &KnowledgeBase, prefixes: &[(String, String)]) -> Self {
        let header = prefixes
            .iter()
            .map(|(p, iri)| format!("Prefix({p}:=<{iri}>)\n"))
            .collect();
        CaseNames {
            index: EntityIndex::new(kb, prefixes.to_vec()),
            header,
        }
    }

    /// The index, for names that stand alone (class lists).
    pub(super) fn index(&self) -> &EntityIndex {
        &self.index
    }

    /// The text in functional syntax, ready for the loader: short names written as full
    /// IRIs, prefixes declared before it. `allow_new` lets prefixed names and `<IRIs>` name
    /// new entities (the individuals a case introduces). An error names the file, the line
    /// of the name, the case, `what` the text is, the name and near names.
    pub(super) fn read(
        &self,
        c: &CaseSpec,
        item: &Item1,
        what: &str,
        allow_new: bool,
    ) -> Result<String, CheckError> {
        if item.text.trim().is_empty() {
            return Ok(self.header.clone());
        }
        match read_statement(&item.text, &self.index, allow_new) {
            Ok(Statement::Axiom(a)) => Ok(format!("{}{a}", self.header)),
            Ok(Statement::Class(_)) => Err(CheckError(format!(
                "{}: case {:?}: {what}: {:?} is a class expression; write an axiom (A SubClassOf B, a Type C, a p b, or functional syntax)",
                at(c, item.line),
                c.name,
                item.text
            ))),
            Err(e) => {
                let line = item.line
                    + item.text[..e.offset.min(item.text.len())]
                        .matches('\n')
                        .count();
                Err(CheckError(format!(
                    "{}: case {:?}: {what}: {} (in {:?})",
                    at(c, line),
                    c.name,
                    e.message,
                    item.text.trim()
                )))
            }
        }
    }
}

/// The prefixes a case's names may use: the case file's own first, then those the KB's
/// documents declare and the standard ones, the first declaration of a name winning.
pub(super) fn case_prefixes(c: &CaseSpec, kb: &KnowledgeBase) -> Vec<(String, String)> {
    let texts: Vec<String> = kb
        .files
        .iter()
        .filter_map(|f| std::fs::read_to_string(f).ok())
        .collect();
    let mut out = c.prefixes.clone();
    for (p, iri) in prefixes_of(texts.iter().map(|t| t.as_str())) {
        if !out.iter().any(|(q, _)| *q == p) {
            out.push((p, iri));
        }
    }
    out
}

/// Interns the individuals a case's text introduces, so that they count as known; classes
/// and properties must come from the KB.
pub(super) fn intern_individuals(
    kb: &mut KnowledgeBase,
    origin: &str,
    doc: &str,
) -> Result<(), CheckError> {
    let mut scratch = kb.clone();
    let m0 = Mark::of(&scratch);
    load::load_axioms_text(&mut scratch, origin, doc).map_err(|e| CheckError(e.to_string()))?;
    for i in m0.individuals..scratch.vocab.individuals.len() {
        let iri = scratch
            .vocab
            .individual_iri(crate::kb::IndividualId(i as u32))
            .to_string();
        kb.vocab.individual(&iri);
    }
    Ok(())
}

/// An error when text added after `mark` named a class, property or individual the KB does
/// not know.
pub(super) fn unknown_vocab(
    kb: &KnowledgeBase,
    mark: Mark,
    origin: &str,
    what: &str,
) -> Result<(), CheckError> {
    let unknown = if kb.vocab.classes.len() > mark.classes {
        Some((
            "class",
            kb.vocab
                .class_iri(crate::kb::ClassId(mark.classes as u32))
                .to_string(),
        ))
    } else if kb.vocab.props.len() > mark.props {
        Some((
            "object property",
            kb.vocab
                .prop_iri(crate::kb::PropId(mark.props as u32))
                .to_string(),
        ))
    } else if kb.vocab.individuals.len() > mark.individuals {
        Some((
            "individual",
            kb.vocab
                .individual_iri(crate::kb::IndividualId(mark.individuals as u32))
                .to_string(),
        ))
    } else {
        None
    };
    match unknown {
        Some((kind, iri)) => Err(CheckError(format!(
            "{origin}: {what}names the {kind} <{iri}>, which the knowledge base does not know; fix the name (check the prefixes) or add it to the KB"
        ))),
        None => Ok(()),
    }
}

/// Parses one item of an expectation into `kb` with the names of `names`, refusing unknown
/// ones. Returns the new axioms' range.
pub(super) fn parse_item(
    kb: &mut KnowledgeBase,
    names: &CaseNames,
    c: &CaseSpec,
    key: &str,
    item: &Item1,
) -> Result<std::ops::Range<usize>, CheckError> {
    let origin = at(c, item.line);
    let mark = Mark::of(kb);
    let doc = names.read(c, item, &format!("expect.{key}"), false)?;
    let r = load::load_axioms_text(kb, &origin, &doc)
        .map_err(|e| CheckError(format!("{e} (in expect.{key})")))?;
    unknown_vocab(kb, mark, &origin, &format!("expect.{key}: {} ", item.text))?;
    if r.is_empty() {
        return Err(CheckError(format!(
            "{origin}: expect.{key}: {:?} is not an axiom",
            item.text
        )));
    }
    Ok(r)
}

/// Parses an assertion of an expected explanation and returns its canonical text.
pub(super) fn assertion_text(
    kb: &mut KnowledgeBase,
    names: &CaseNames,
    c: &CaseSpec,
    key: &str,
    item: &Item1,
) -> Result<String, CheckError> {
    let r = parse_item(kb, names, c, key, item)?;
    let a = match (r.len(), &kb.axioms[r.start].axiom) {
        (1, Axiom::ClassAssertion(k, a)) => Assertion::Class(*k, *a),
        (1, Axiom::RoleAssertion(p, a, b)) => Assertion::Role(*p, *a, *b),
        _ => {
            return Err(CheckError(format!(
                "{}: expect.{key}: {:?} must be one ClassAssertion or ObjectPropertyAssertion",
                at(c, item.line),
                item.text
            )));
        }
    };
    Ok(a.text(kb, &kb.concepts))
}

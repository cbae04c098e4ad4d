//! Reading a typed axiom or class expression with the shell's short names: the one front
//! door that the shell, `why --entailment` and `check` share. Manchester syntax is parsed
//! (`manchester.rs`); functional syntax keeps its text, with each short name replaced by
//! its full IRI by its position in the axiom (`functional.rs`). Both resolve names through
//! `kb::names`, so they give the same unknown-prefix messages and suggestions.

mod functional;
mod manchester;
mod tokens;

use crate::kb::names::{EntityIndex, Kind, fragment};
pub use functional::expand_functional;
pub use manchester::parse_manchester;

/// A syntax error at a byte offset of the input.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ParseError {
    /// Byte offset into the parsed text.
    pub offset: usize,
    /// What is wrong and what to do.
    pub message: String,
}

fn err<T>(at: usize, message: impl Into<String>) -> Result<T, ParseError> {
    Err(ParseError {
        offset: at,
        message: message.into(),
    })
}

/// What a typed text says, written in functional syntax with its names as full IRIs.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Statement {
    /// Axioms (one, from Manchester syntax; one or more in functional syntax).
    Axiom(String),
    /// A class expression.
    Class(String),
}

/// Reads an axiom or class expression written in Manchester or functional syntax with the
/// shell's short names (prefixed names, IRI fragments, labels, `<IRIs>`). `allow_new` lets
/// `<IRI>`s and prefixed names name entities the knowledge base does not know yet.
pub fn read_statement(
    text: &str,
    names: &EntityIndex,
    allow_new: bool,
) -> Result<Statement, ParseError> {
    match functional_keyword(text) {
        Some(kw) => {
            let out = expand_functional(text, names, allow_new)?;
            Ok(if is_class_constructor(kw) {
                Statement::Class(out)
            } else {
                Statement::Axiom(out)
            })
        }
        None => parse_manchester(text, names, allow_new),
    }
}

/// Resolves a written name (word, prefixed name, label or `<IRI>`) to an entity of one of
/// `kinds` through `kb::names`; without `allow_new` the entity must occur in the knowledge
/// base. Errors point at `at`.
fn entity(
    names: &EntityIndex,
    text: &str,
    kinds: &[Kind],
    allow_new: bool,
    at: usize,
) -> Result<(Kind, String), ParseError> {
    let (kind, iri) = names.resolve(text, kinds).map_err(|message| ParseError {
        offset: at,
        message,
    })?;
    if !allow_new && !names.has(&iri, kind) {
        let hint = names
            .did_you_mean(fragment(&iri), kinds)
            .map(|d| format!("; {d}"))
            .unwrap_or_default();
        return err(
            at,
            format!(
                "unknown {} <{iri}>; it does not occur in the knowledge base{hint}",
                kind.word()
            ),
        );
    }
    Ok((kind, iri))
}

/// OWL 2 functional-syntax keywords that start an axiom or a class expression.
const FUNCTIONAL: [&str; 49] = [
    "Prefix",
    "Declaration",
    "SubClassOf",
    "EquivalentClasses",
    "DisjointClasses",
    "DisjointUnion",
    "ClassAssertion",
    "ObjectPropertyAssertion",
    "NegativeObjectPropertyAssertion",
    "DataPropertyAssertion",
    "NegativeDataPropertyAssertion",
    "SameIndividual",
    "DifferentIndividuals",
    "SubObjectPropertyOf",
    "EquivalentObjectProperties",
    "DisjointObjectProperties",
    "InverseObjectProperties",
    "ObjectPropertyDomain",
    "ObjectPropertyRange",
    "FunctionalObjectProperty",
    "InverseFunctionalObjectProperty",
    "ReflexiveObjectProperty",
    "IrreflexiveObjectProperty",
    "SymmetricObjectProperty",
    "AsymmetricObjectProperty",
    "TransitiveObjectProperty",
    "SubDataPropertyOf",
    "EquivalentDataProperties",
    "DisjointDataProperties",
    "DataPropertyDomain",
    "DataPropertyRange",
    "FunctionalDataProperty",
    "HasKey",
    "AnnotationAssertion",
    "ObjectIntersectionOf",
    "ObjectUnionOf",
    "ObjectComplementOf",
    "ObjectOneOf",
    "ObjectSomeValuesFrom",
    "ObjectAllValuesFrom",
    "ObjectHasValue",
    "ObjectHasSelf",
    "ObjectMinCardinality",
    "ObjectMaxCardinality",
    "ObjectExactCardinality",
    "DataSomeValuesFrom",
    "DataAllValuesFrom",
    "DataHasValue",
    "DatatypeDefinition",
];

/// Whether the text is written in functional syntax (it starts with one of its keywords
/// and a parenthesis); returns the keyword.
pub fn functional_keyword(text: &str) -> Option<&'static str> {
    let t = text.trim_start();
    let word: String = t.chars().take_while(|c| c.is_ascii_alphabetic()).collect();
    let after = t[word.len()..].trim_start();
    if !after.starts_with('(') {
        return None;
    }
    FUNCTIONAL.iter().find(|k| **k == word).copied()
}

/// Whether a functional-syntax keyword starts a class expression rather than an axiom.
pub fn is_class_constructor(word: &str) -> bool {
    (word.starts_with("Object") && !word.contains("Property"))
        || (word.starts_with("Data") && !word.contains("Property") && word != "DatatypeDefinition")
}

/// Whether parentheses, braces and brackets are balanced outside quotes (the shell keeps
/// reading lines until they are).
pub fn balanced(text: &str) -> bool {
    let mut depth: i64 = 0;
    let mut quote: Option<char> = None;
    for c in text.chars() {
        match quote {
            Some(q) if c == q => quote = None,
            Some(_) => {}
            None => match c {
                '"' => quote = Some(c),
                '(' | '{' | '[' => depth += 1,
                ')' | '}' | ']' => depth -= 1,
                _ => {}
            },
        }
    }
    depth <= 0 && quote.is_none()
}

#[cfg(test)]
pub(crate) mod tests {
    use super::*;

    /// The index of a KB made of `text` (functional syntax), with `:` as
    /// `http://ex.org/t#`: the fixture of this module's tests.
    pub(crate) fn index_of(text: &str) -> EntityIndex {
        let mut kb = crate::kb::KnowledgeBase::new();
        crate::kb::load::load_axioms_text(&mut kb, "t", text).unwrap();
        EntityIndex::new(&kb, vec![(String::new(), "http://ex.org/t#".into())])
    }

    #[test]
    fn balance() {
        assert!(!balanced("A and (B or"));
        assert!(balanced("A and (B or C)"));
        assert!(balanced("\"(\" x"));
    }
}

//! Reading what the user typed or named: axioms, files and their syntax errors.

use super::*;

/// Reads an axiom or class expression in Manchester or functional syntax.
pub(super) fn read_input(
    s: &Session,
    l: &Line,
    text: &str,
    off: usize,
    allow_new: bool,
) -> Result<Input, ShellError> {
    if text.trim().is_empty() {
        return Err(l.err("expected an axiom or a class expression", off));
    }
    match syntax::read_statement(text, &s.names, allow_new) {
        Ok(Statement::Axiom(a)) => Ok(Input::Axioms(a)),
        Ok(Statement::Class(c)) => Ok(Input::Class(c)),
        Err(e) => Err(l.err(e.message, off + e.offset)),
    }
}

/// Constructs outside what the reasoner supports, by the functional-syntax keyword that
/// writes them (to point at them in the input).
const UNSUPPORTED_WORDS: [&str; 12] = [
    "ObjectHasSelf",
    "ObjectPropertyChain",
    "ReflexiveObjectProperty",
    "IrreflexiveObjectProperty",
    "AsymmetricObjectProperty",
    "DisjointObjectProperties",
    "HasKey",
    "DataMinCardinality",
    "DataMaxCardinality",
    "DataExactCardinality",
    "DatatypeDefinition",
    "DLSafeRule",
];

/// Loads functional-syntax axioms into `kb`; errors point into `text` (at `off` of the
/// line). Without `allow_new`, an entity the KB did not know is an error.
pub(super) fn load_text(
    s: &Session,
    kb: &mut KnowledgeBase,
    l: &Line,
    text: &str,
    user_text: &str,
    off: usize,
    allow_new: bool,
) -> Result<Range<usize>, ShellError> {
    let sizes = |kb: &KnowledgeBase| {
        (
            kb.vocab.classes.len(),
            kb.vocab.props.len(),
            kb.vocab.data_props.len(),
            kb.vocab.individuals.len(),
        )
    };
    let before = sizes(kb);
    let doc = format!("{}{text}", s.prefix_block());
    let same = text == user_text;
    let range = match load::load_axioms_text(kb, "input", &doc) {
        Ok(r) => r,
        Err(KbError::Syntax { reason, .. }) => {
            // Lines before the input: the prefix declarations and the `Ontology(` line.
            let header = s.prefixes.len() + 1;
            let at = if same {
                position_in(&reason, text, header).unwrap_or(0)
            } else {
                0
            };
            return Err(l.err(syntax_message(&reason, at >= text.len()), off + at));
        }
        Err(KbError::Unsupported { reason, .. }) => {
            let at = UNSUPPORTED_WORDS
                .iter()
                .filter_map(|w| user_text.find(w))
                .min()
                .unwrap_or(0);
            return Err(l.err(format!("unsupported construct: {reason}"), off + at));
        }
        Err(e) => return Err(l.err(e.to_string(), off)),
    };
    let after = sizes(kb);
    if !allow_new && after != before {
        let new: Vec<(Kind, String)> = [
            (
                Kind::Class,
                kb.vocab
                    .classes
                    .iter()
                    .skip(before.0)
                    .cloned()
                    .collect::<Vec<_>>(),
            ),
            (
                Kind::ObjectProperty,
                kb.vocab.props.iter().skip(before.1).cloned().collect(),
            ),
            (
                Kind::DataProperty,
                kb.vocab.data_props.iter().skip(before.2).cloned().collect(),
            ),
            (
                Kind::Individual,
                kb.vocab
                    .individuals
                    .iter()
                    .skip(before.3)
                    .cloned()
                    .collect(),
            ),
        ]
        .into_iter()
        .flat_map(|(k, v)| v.into_iter().map(move |i| (k, i)))
        // `_:` names are anonymous individuals and the universal role's hidden hub.
        .filter(|(_, iri)| !iri.starts_with("_:"))
        .collect();
        if let Some((k, iri)) = new.first() {
            let short = s.names.short(iri);
            let at = user_text
                .find(&format!("<{iri}>"))
                .or_else(|| user_text.find(short.as_str()))
                .or_else(|| user_text.find(fragment(iri)))
                .unwrap_or(0);
            return Err(l.err(
                format!(
                    "unknown {} <{iri}>; it does not occur in the knowledge base",
                    k.word()
                ),
                off + at,
            ));
        }
    }
    Ok(range)
}

/// The parser's message in one line: what it expected.
fn syntax_message(reason: &str, at_end: bool) -> String {
    let expected = reason
        .lines()
        .find_map(|l| l.trim().strip_prefix("= "))
        .map(|e| {
            e.trim_end_matches(". Fix the text at that position.")
                .to_string()
        });
    let what = expected.unwrap_or_else(|| {
        reason
            .lines()
            .next()
            .unwrap_or(reason)
            .trim_start_matches(|c: char| c != ':' && !c.is_whitespace())
            .trim_start_matches(':')
            .trim()
            .to_string()
    });
    if at_end {
        format!("functional syntax ends too early ({what}); close every parenthesis")
    } else {
        format!("functional syntax: {what}")
    }
}

/// The byte offset in `text` of a parser message's "line L, column C" (after our
/// relocation) or "--> L:C" (the parser's own, counting `header` lines before the text).
fn position_in(reason: &str, text: &str, header: usize) -> Option<usize> {
    let (line, col) = if let Some(i) = reason.find("line ") {
        let rest = &reason[i + 5..];
        let line: usize = rest.split(',').next()?.trim().parse().ok()?;
        let j = rest.find("column ")?;
        let col: usize = rest[j + 7..]
            .chars()
            .take_while(|c| c.is_ascii_digit())
            .collect::<String>()
            .parse()
            .ok()?;
        (line, col)
    } else {
        let i = reason.find("--> ")?;
        let rest = &reason[i + 4..];
        let (l, c) = rest.split_once(':')?;
        let line: usize = l.trim().parse().ok()?;
        let col: usize = c
            .chars()
            .take_while(|c| c.is_ascii_digit())
            .collect::<String>()
            .parse()
            .ok()?;
        (line.checked_sub(header)?, col)
    };
    if line == 0 {
        return Some(0);
    }
    let mut off = 0;
    for (n, l) in text.split('\n').enumerate() {
        if n + 1 == line {
            return Some((off + col.saturating_sub(1)).min(text.len()));
        }
        off += l.len() + 1;
    }
    Some(text.len())
}

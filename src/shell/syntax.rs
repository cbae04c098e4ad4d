//! The shell's input syntax: class expressions and simple axioms in the OWL 2 Manchester
//! syntax (W3C Working Group Note, 2012), parsed by recursive descent and written out in
//! OWL 2 functional syntax with full IRIs, so that the knowledge-base layer does the rest.
//!
//! Supported: `and`, `or`, `not`, `some`, `only`, `value`, `min`, `max`, `exactly`,
//! `inverse p`, `{a, b}`, parentheses, `that` (as `and`); data restrictions `d some xsd:T`,
//! `d some xsd:T[>= n, < m]` and `d value n`. Axioms: `C SubClassOf D`, `C EquivalentTo D`,
//! `C DisjointWith D`, `a Type C`, `a SameAs b`, `a DifferentFrom b`,
//! `p SubPropertyOf q`, and `a p b` (`a d 3.5` for a data property).

use super::names::{EntityIndex, Kind};

const XSD: &str = "http://www.w3.org/2001/XMLSchema#";

/// A syntax error at a byte offset of the input.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ParseError {
    /// Byte offset into the parsed text.
    pub offset: usize,
    /// What is wrong and what to do.
    pub message: String,
}

#[derive(Clone, Debug, PartialEq)]
enum Tok {
    Word(String),
    Iri(String),
    Quoted(String),
    Number(String),
    Str(String),
    Punct(char),
    Op(String),
}

#[derive(Clone, Debug)]
struct Token {
    tok: Tok,
    at: usize,
}

fn err<T>(at: usize, message: impl Into<String>) -> Result<T, ParseError> {
    Err(ParseError {
        offset: at,
        message: message.into(),
    })
}

fn tokenize(s: &str) -> Result<Vec<Token>, ParseError> {
    let b = s.as_bytes();
    let mut out = Vec::new();
    let mut i = 0;
    while i < b.len() {
        let c = s[i..].chars().next().unwrap_or(' ');
        if c.is_whitespace() {
            i += c.len_utf8();
            continue;
        }
        let start = i;
        match c {
            '(' | ')' | '{' | '}' | ',' | '[' | ']' => {
                out.push(Token {
                    tok: Tok::Punct(c),
                    at: start,
                });
                i += 1;
            }
            '<' | '>' | '=' => {
                // `<` opens an IRI when a `>` closes it before any space; else a facet.
                if c == '<' {
                    let rest = &s[i + 1..];
                    let end = rest.find(|ch: char| ch == '>' || ch.is_whitespace());
                    if let Some(e) = end
                        && rest.as_bytes().get(e) == Some(&b'>')
                        && e > 0
                        && !rest.starts_with('=')
                    {
                        out.push(Token {
                            tok: Tok::Iri(rest[..e].to_string()),
                            at: start,
                        });
                        i += e + 2;
                        continue;
                    }
                }
                let mut op = c.to_string();
                i += 1;
                if s[i..].starts_with('=') {
                    op.push('=');
                    i += 1;
                }
                out.push(Token {
                    tok: Tok::Op(op),
                    at: start,
                });
            }
            '\'' | '"' => {
                let rest = &s[i + 1..];
                let Some(e) = rest.find(c) else {
                    return err(
                        start,
                        format!("unclosed quote {c}; close it with a matching {c}"),
                    );
                };
                let text = rest[..e].to_string();
                out.push(Token {
                    tok: if c == '\'' {
                        Tok::Quoted(text)
                    } else {
                        Tok::Str(text)
                    },
                    at: start,
                });
                i += e + 2;
            }
            _ if c.is_alphanumeric() || "_:-.+#/".contains(c) => {
                let mut j = i;
                for ch in s[i..].chars() {
                    if ch.is_alphanumeric() || "_:-.+#/".contains(ch) {
                        j += ch.len_utf8();
                    } else {
                        break;
                    }
                }
                let w = &s[i..j];
                let numeric = w
                    .trim_start_matches(['+', '-'])
                    .chars()
                    .all(|ch| ch.is_ascii_digit() || ch == '.')
                    && w.chars().any(|ch| ch.is_ascii_digit());
                out.push(Token {
                    tok: if numeric {
                        Tok::Number(w.to_string())
                    } else {
                        Tok::Word(w.to_string())
                    },
                    at: start,
                });
                i = j;
            }
            _ => {
                return err(
                    start,
                    format!("unexpected character `{c}`; names are words, 'labels' or <IRIs>"),
                );
            }
        }
    }
    Ok(out)
}

const RESTRICTION_WORDS: [&str; 7] = ["some", "only", "value", "min", "max", "exactly", "Self"];
const AXIOM_WORDS: [&str; 8] = [
    "SubClassOf",
    "EquivalentTo",
    "DisjointWith",
    "Type",
    "Types",
    "SameAs",
    "DifferentFrom",
    "SubPropertyOf",
];

/// What a line of Manchester syntax says.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Statement {
    /// One axiom, in functional syntax with full IRIs.
    Axiom(String),
    /// A class expression, in functional syntax with full IRIs.
    Class(String),
}

struct Parser<'a> {
    toks: Vec<Token>,
    pos: usize,
    end: usize,
    names: &'a EntityIndex,
    allow_new: bool,
}

impl Parser<'_> {
    fn peek(&self) -> Option<&Tok> {
        self.toks.get(self.pos).map(|t| &t.tok)
    }
    fn peek_at(&self, k: usize) -> Option<&Tok> {
        self.toks.get(self.pos + k).map(|t| &t.tok)
    }
    fn at(&self) -> usize {
        self.toks.get(self.pos).map(|t| t.at).unwrap_or(self.end)
    }
    fn is_word(&self, w: &str) -> bool {
        matches!(self.peek(), Some(Tok::Word(x)) if x == w)
    }
    fn is_punct(&self, c: char) -> bool {
        matches!(self.peek(), Some(Tok::Punct(x)) if *x == c)
    }
    fn expect_punct(&mut self, c: char, what: &str) -> Result<(), ParseError> {
        if self.is_punct(c) {
            self.pos += 1;
            Ok(())
        } else {
            err(self.at(), format!("expected `{c}` {what}"))
        }
    }

    /// Resolves the name at the cursor to an entity of one of `kinds`.
    fn name(&mut self, kinds: &[Kind]) -> Result<(Kind, String), ParseError> {
        let at = self.at();
        let text = match self.peek() {
            Some(Tok::Word(w)) if !is_keyword(w) => w.clone(),
            Some(Tok::Iri(i)) => format!("<{i}>"),
            Some(Tok::Quoted(q)) => q.clone(),
            Some(t) => {
                return err(
                    at,
                    format!("expected a {} name, found {}", kinds[0].word(), describe(t)),
                );
            }
            None => {
                return err(
                    at,
                    format!("expected a {} name at the end", kinds[0].word()),
                );
            }
        };
        let (kind, iri) = self
            .names
            .resolve(&text, kinds)
            .map_err(|message| ParseError {
                offset: at,
                message,
            })?;
        if !self.allow_new && !self.names.has(&iri, kind) {
            return err(
                at,
                format!(
                    "unknown {} <{iri}>; it does not occur in the knowledge base",
                    kind.word()
                ),
            );
        }
        self.pos += 1;
        Ok((kind, iri))
    }

    fn expr(&mut self) -> Result<String, ParseError> {
        let mut parts = vec![self.conj()?];
        while self.is_word("or") {
            self.pos += 1;
            parts.push(self.conj()?);
        }
        Ok(if parts.len() == 1 {
            parts.remove(0)
        } else {
            format!("ObjectUnionOf({})", parts.join(" "))
        })
    }

    fn conj(&mut self) -> Result<String, ParseError> {
        let mut parts = vec![self.unary()?];
        while self.is_word("and") || self.is_word("that") {
            self.pos += 1;
            parts.push(self.unary()?);
        }
        Ok(if parts.len() == 1 {
            parts.remove(0)
        } else {
            format!("ObjectIntersectionOf({})", parts.join(" "))
        })
    }

    fn unary(&mut self) -> Result<String, ParseError> {
        if self.is_word("not") {
            self.pos += 1;
            let x = self.unary()?;
            return Ok(format!("ObjectComplementOf({x})"));
        }
        self.primary()
    }

    fn primary(&mut self) -> Result<String, ParseError> {
        if self.is_punct('(') {
            self.pos += 1;
            let x = self.expr()?;
            self.expect_punct(')', "to close the parenthesis")?;
            return Ok(x);
        }
        if self.is_punct('{') {
            self.pos += 1;
            let mut inds = Vec::new();
            loop {
                let (_, i) = self.name(&[Kind::Individual])?;
                inds.push(format!("<{i}>"));
                if self.is_punct(',') {
                    self.pos += 1;
                    continue;
                }
                self.expect_punct('}', "to close the list of individuals")?;
                break;
            }
            return Ok(format!("ObjectOneOf({})", inds.join(" ")));
        }
        let restriction = self.is_word("inverse")
            || matches!(self.peek_at(1), Some(Tok::Word(w)) if RESTRICTION_WORDS.contains(&w.as_str()));
        if restriction {
            return self.restriction();
        }
        let (_, c) = self.name(&[Kind::Class])?;
        Ok(format!("<{c}>"))
    }

    fn property(&mut self) -> Result<(Kind, String), ParseError> {
        if self.is_word("inverse") {
            self.pos += 1;
            let paren = self.is_punct('(');
            if paren {
                self.pos += 1;
            }
            let (_, p) = self.name(&[Kind::ObjectProperty])?;
            if paren {
                self.expect_punct(')', "after the inverse property")?;
            }
            return Ok((Kind::ObjectProperty, format!("ObjectInverseOf(<{p}>)")));
        }
        let (k, p) = self.name(&[Kind::ObjectProperty, Kind::DataProperty])?;
        Ok((k, format!("<{p}>")))
    }

    fn restriction(&mut self) -> Result<String, ParseError> {
        let (kind, p) = self.property()?;
        let at = self.at();
        let Some(Tok::Word(kw)) = self.peek().cloned() else {
            return err(at, "expected some, only, value, min, max or exactly");
        };
        self.pos += 1;
        if kind == Kind::DataProperty {
            return self.data_restriction(&p, &kw, at);
        }
        match kw.as_str() {
            "some" => Ok(format!("ObjectSomeValuesFrom({p} {})", self.unary()?)),
            "only" => Ok(format!("ObjectAllValuesFrom({p} {})", self.unary()?)),
            "value" => {
                let (_, i) = self.name(&[Kind::Individual])?;
                Ok(format!("ObjectHasValue({p} <{i}>)"))
            }
            "min" | "max" | "exactly" => {
                let at = self.at();
                let Some(Tok::Number(n)) = self.peek().cloned() else {
                    return err(at, format!("expected a whole number after `{kw}`"));
                };
                if n.parse::<u32>().is_err() {
                    return err(at, format!("`{n}` is not a whole number"));
                }
                self.pos += 1;
                let filler = if self.starts_primary() {
                    self.unary()?
                } else {
                    "owl:Thing".to_string()
                };
                let f = match kw.as_str() {
                    "min" => "ObjectMinCardinality",
                    "max" => "ObjectMaxCardinality",
                    _ => "ObjectExactCardinality",
                };
                Ok(format!("{f}({n} {p} {filler})"))
            }
            "Self" => Ok(format!("ObjectHasSelf({p})")),
            _ => err(at, "expected some, only, value, min, max or exactly"),
        }
    }

    fn starts_primary(&self) -> bool {
        match self.peek() {
            Some(Tok::Punct('(')) | Some(Tok::Punct('{')) => true,
            Some(Tok::Word(w)) => !is_keyword(w) || w == "not" || w == "inverse",
            Some(Tok::Iri(_)) | Some(Tok::Quoted(_)) => true,
            _ => false,
        }
    }

    fn literal(&mut self) -> Result<String, ParseError> {
        let at = self.at();
        match self.peek().cloned() {
            Some(Tok::Number(n)) => {
                self.pos += 1;
                let dt = if n.contains('.') {
                    "decimal"
                } else {
                    "integer"
                };
                Ok(format!("\"{n}\"^^<{XSD}{dt}>"))
            }
            Some(Tok::Str(_)) => err(
                at,
                "unsupported construct: string literals; only numbers are supported in data values",
            ),
            _ => err(at, "expected a number"),
        }
    }

    fn data_restriction(&mut self, p: &str, kw: &str, at: usize) -> Result<String, ParseError> {
        match kw {
            "value" => Ok(format!("DataHasValue({p} {})", self.literal()?)),
            "some" | "only" => {
                let dat = self.at();
                let Some(Tok::Word(dt)) = self.peek().cloned() else {
                    return err(dat, "expected a datatype such as xsd:decimal");
                };
                let Some(local) = dt.strip_prefix("xsd:") else {
                    return err(
                        dat,
                        "expected a datatype such as xsd:decimal or xsd:integer",
                    );
                };
                self.pos += 1;
                let mut range = format!("<{XSD}{local}>");
                if self.is_punct('[') {
                    self.pos += 1;
                    let mut facets = Vec::new();
                    loop {
                        let fat = self.at();
                        let Some(Tok::Op(op)) = self.peek().cloned() else {
                            return err(fat, "expected a facet: >=, >, <= or <");
                        };
                        let facet = match op.as_str() {
                            ">=" => "minInclusive",
                            ">" => "minExclusive",
                            "<=" => "maxInclusive",
                            "<" => "maxExclusive",
                            _ => return err(fat, "expected a facet: >=, >, <= or <"),
                        };
                        self.pos += 1;
                        let v = self.literal()?;
                        facets.push(format!("<{XSD}{facet}> {v}"));
                        if self.is_punct(',') {
                            self.pos += 1;
                            continue;
                        }
                        self.expect_punct(']', "to close the facets")?;
                        break;
                    }
                    range = format!("DatatypeRestriction({range} {})", facets.join(" "));
                }
                let f = if kw == "some" {
                    "DataSomeValuesFrom"
                } else {
                    "DataAllValuesFrom"
                };
                Ok(format!("{f}({p} {range})"))
            }
            _ => err(
                at,
                format!(
                    "unsupported construct: `{kw}` on a data property (data cardinalities are not supported); use some, only or value"
                ),
            ),
        }
    }

    fn individual(&mut self) -> Result<String, ParseError> {
        let (_, i) = self.name(&[Kind::Individual])?;
        Ok(format!("<{i}>"))
    }

    fn done(&self) -> Result<(), ParseError> {
        match self.peek() {
            None => Ok(()),
            Some(t) => err(
                self.at(),
                format!("unexpected {} after a complete expression", describe(t)),
            ),
        }
    }

    fn statement(&mut self) -> Result<Statement, ParseError> {
        // `a Type C`, `a SameAs b`, `a DifferentFrom b`, `p SubPropertyOf q`.
        if let Some(Tok::Word(w)) = self.peek_at(1).cloned() {
            match w.as_str() {
                "Type" | "Types" => {
                    let a = self.individual()?;
                    self.pos += 1;
                    let c = self.expr()?;
                    self.done()?;
                    return Ok(Statement::Axiom(format!("ClassAssertion({c} {a})")));
                }
                "SameAs" | "DifferentFrom" => {
                    let a = self.individual()?;
                    self.pos += 1;
                    let b = self.individual()?;
                    self.done()?;
                    let f = if w == "SameAs" {
                        "SameIndividual"
                    } else {
                        "DifferentIndividuals"
                    };
                    return Ok(Statement::Axiom(format!("{f}({a} {b})")));
                }
                "SubPropertyOf" => {
                    let (k, p) = self.property()?;
                    self.pos += 1;
                    let (k2, q) = self.property()?;
                    self.done()?;
                    if k != k2 {
                        return err(
                            0,
                            "both properties must be object properties, or both data properties",
                        );
                    }
                    let f = if k == Kind::DataProperty {
                        "SubDataPropertyOf"
                    } else {
                        "SubObjectPropertyOf"
                    };
                    return Ok(Statement::Axiom(format!("{f}({p} {q})")));
                }
                _ => {}
            }
        }
        // `a p b`: three names, the middle one a property.
        if self.toks.len() == 3
            && self.toks.iter().all(|t| {
                matches!(
                    t.tok,
                    Tok::Word(_) | Tok::Iri(_) | Tok::Quoted(_) | Tok::Number(_)
                )
            })
            && !self
                .toks
                .iter()
                .any(|t| matches!(&t.tok, Tok::Word(w) if is_keyword(w)))
        {
            let a = self.individual()?;
            let (k, p) = self.property()?;
            if k == Kind::DataProperty {
                let v = self.literal()?;
                return Ok(Statement::Axiom(format!(
                    "DataPropertyAssertion({p} {a} {v})"
                )));
            }
            let b = self.individual()?;
            return Ok(Statement::Axiom(format!(
                "ObjectPropertyAssertion({p} {a} {b})"
            )));
        }
        let first = self.expr()?;
        let at = self.at();
        match self.peek().cloned() {
            None => Ok(Statement::Class(first)),
            Some(Tok::Word(w))
                if ["SubClassOf", "EquivalentTo", "DisjointWith"].contains(&w.as_str()) =>
            {
                self.pos += 1;
                let mut rest = vec![self.expr()?];
                while w != "SubClassOf" && self.is_punct(',') {
                    self.pos += 1;
                    rest.push(self.expr()?);
                }
                self.done()?;
                let f = match w.as_str() {
                    "SubClassOf" => "SubClassOf",
                    "EquivalentTo" => "EquivalentClasses",
                    _ => "DisjointClasses",
                };
                Ok(Statement::Axiom(format!("{f}({first} {})", rest.join(" "))))
            }
            Some(t) => err(
                at,
                format!(
                    "unexpected {}; expected SubClassOf, EquivalentTo, DisjointWith or the end",
                    describe(&t)
                ),
            ),
        }
    }
}

fn is_keyword(w: &str) -> bool {
    ["and", "or", "not", "that", "inverse"].contains(&w)
        || RESTRICTION_WORDS.contains(&w)
        || AXIOM_WORDS.contains(&w)
}

fn describe(t: &Tok) -> String {
    match t {
        Tok::Word(w) => format!("`{w}`"),
        Tok::Iri(i) => format!("<{i}>"),
        Tok::Quoted(q) => format!("'{q}'"),
        Tok::Number(n) => format!("the number {n}"),
        Tok::Str(s) => format!("\"{s}\""),
        Tok::Punct(c) => format!("`{c}`"),
        Tok::Op(o) => format!("`{o}`"),
    }
}

/// Parses a Manchester-syntax axiom or class expression. `allow_new` lets `<IRI>`s and
/// prefixed names name entities the knowledge base does not know yet (for `add`).
pub fn parse_manchester(
    text: &str,
    names: &EntityIndex,
    allow_new: bool,
) -> Result<Statement, ParseError> {
    let toks = tokenize(text)?;
    if toks.is_empty() {
        return err(0, "nothing to read; write an axiom or a class expression");
    }
    let mut p = Parser {
        toks,
        pos: 0,
        end: text.len(),
        names,
        allow_new,
    };
    p.statement()
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
mod tests {
    use super::*;
    use crate::kb::load;

    fn index() -> EntityIndex {
        let mut kb = crate::kb::KnowledgeBase::new();
        load::load_axioms_text(
            &mut kb,
            "t",
            "Prefix(:=<http://ex.org/t#>)\nSubClassOf(:A :B)\nObjectPropertyAssertion(:r :a :b)\nAnnotationAssertion(rdfs:label :A \"apple tree\")\nDataPropertyAssertion(:d :a \"1\"^^xsd:integer)",
        )
        .unwrap();
        EntityIndex::new(&kb, vec![(String::new(), "http://ex.org/t#".into())])
    }

    #[test]
    fn precedence_follows_the_note() {
        // Manchester syntax note §2.4: `and` binds tighter than `or`, and a restriction's
        // filler is a primary, so `r some A and B` is `(r some A) and B`.
        let ix = index();
        let s = parse_manchester("r some A and B or not A", &ix, false).unwrap();
        assert_eq!(
            s,
            Statement::Class("ObjectUnionOf(ObjectIntersectionOf(ObjectSomeValuesFrom(<http://ex.org/t#r> <http://ex.org/t#A>) <http://ex.org/t#B>) ObjectComplementOf(<http://ex.org/t#A>))".into())
        );
    }

    #[test]
    fn axioms_and_labels() {
        let ix = index();
        assert_eq!(
            parse_manchester("'apple tree' SubClassOf r min 2 B", &ix, false).unwrap(),
            Statement::Axiom("SubClassOf(<http://ex.org/t#A> ObjectMinCardinality(2 <http://ex.org/t#r> <http://ex.org/t#B>))".into())
        );
        assert_eq!(
            parse_manchester("a r b", &ix, false).unwrap(),
            Statement::Axiom("ObjectPropertyAssertion(<http://ex.org/t#r> <http://ex.org/t#a> <http://ex.org/t#b>)".into())
        );
        assert_eq!(
            parse_manchester("a Type {a, b}", &ix, false).unwrap(),
            Statement::Axiom("ClassAssertion(ObjectOneOf(<http://ex.org/t#a> <http://ex.org/t#b>) <http://ex.org/t#a>)".into())
        );
        assert_eq!(
            parse_manchester("d some xsd:integer[>= 2, < 5]", &ix, false).unwrap(),
            Statement::Class("DataSomeValuesFrom(<http://ex.org/t#d> DatatypeRestriction(<http://www.w3.org/2001/XMLSchema#integer> <http://www.w3.org/2001/XMLSchema#minInclusive> \"2\"^^<http://www.w3.org/2001/XMLSchema#integer> <http://www.w3.org/2001/XMLSchema#maxExclusive> \"5\"^^<http://www.w3.org/2001/XMLSchema#integer>))".into())
        );
    }

    #[test]
    fn errors_point_at_the_offending_token() {
        let ix = index();
        // "A and Zed": `Zed` starts at byte 6.
        let e = parse_manchester("A and Zed", &ix, false).unwrap_err();
        assert_eq!(e.offset, 6);
        let e = parse_manchester("A and (B or A", &ix, false).unwrap_err();
        assert_eq!(e.offset, 13);
    }

    #[test]
    fn self_restriction() {
        // Manchester syntax (OWL 2 W3C Note): `r Self` is ObjectHasSelf(r).
        let ix = index();
        assert_eq!(
            parse_manchester("r Self", &ix, false).unwrap(),
            Statement::Class("ObjectHasSelf(<http://ex.org/t#r>)".into())
        );
    }

    #[test]
    fn balance() {
        assert!(!balanced("A and (B or"));
        assert!(balanced("A and (B or C)"));
        assert!(balanced("\"(\" x"));
    }
}

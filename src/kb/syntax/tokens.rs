//! The tokens shared by the two input syntaxes: words (names, prefixed names, keywords),
//! `<IRIs>`, 'quoted labels', numbers, "strings" with their `^^datatype` or `@language`
//! suffix, punctuation and comparison operators; each with its byte span.

use super::{ParseError, err};

/// What a token is.
#[derive(Clone, Debug, PartialEq)]
pub(super) enum Tok {
    Word(String),
    Iri(String),
    Quoted(String),
    Number(String),
    Str(String),
    Punct(char),
    Op(String),
    /// What follows a string literal: `^^datatype` or `@language`.
    Suffix(String),
}

/// A token with its byte span in the input.
#[derive(Clone, Debug)]
pub(super) struct Token {
    pub(super) tok: Tok,
    pub(super) at: usize,
    pub(super) end: usize,
}

/// Splits the input into tokens.
pub(super) fn tokenize(s: &str) -> Result<Vec<Token>, ParseError> {
    let b = s.as_bytes();
    let mut out = Vec::new();
    let mut i = 0;
    while i < b.len() {
        end_last(&mut out, i);
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
                    end: 0,
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
                            end: 0,
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
                    end: 0,
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
                    end: 0,
                });
                i += e + 2;
                if c == '"' {
                    i = suffix(s, i, &mut out);
                }
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
                    end: 0,
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
    end_last(&mut out, i);
    Ok(out)
}

/// Closes the span of the last token, which ended at `i`.
fn end_last(out: &mut [Token], i: usize) {
    if let Some(t) = out.last_mut()
        && t.end == 0
    {
        t.end = i;
    }
}

/// Reads a literal's `^^datatype` (a name or an `<IRI>`) or `@language` at `i`, if there is
/// one (OWL 2 functional syntax, §2.3); returns where reading goes on.
fn suffix(s: &str, i: usize, out: &mut Vec<Token>) -> usize {
    let rest = &s[i..];
    let len = if let Some(dt) = rest.strip_prefix("^^") {
        match dt.strip_prefix('<') {
            Some(iri) => iri.find('>').map(|e| e + 4).unwrap_or(0),
            None => {
                2 + dt
                    .find(|c: char| !(c.is_alphanumeric() || "_:-.#/".contains(c)))
                    .unwrap_or(dt.len())
            }
        }
    } else if let Some(lang) = rest.strip_prefix('@') {
        1 + lang
            .find(|c: char| !(c.is_ascii_alphanumeric() || c == '-'))
            .unwrap_or(lang.len())
    } else {
        0
    };
    if len == 0 {
        return i;
    }
    end_last(out, i);
    out.push(Token {
        tok: Tok::Suffix(rest[..len].to_string()),
        at: i,
        end: i + len,
    });
    i + len
}

//! XML Schema regular expressions (XSD 1.1 Part 2, Appendix G) compiled to automata.
//!
//! XSD patterns differ from Perl-style ones: they are implicitly anchored, `^` and `$` are
//! ordinary characters, `.` excludes only line feed and carriage return, classes allow
//! subtraction (`[a-z-[aeiou]]`) and `\i`, `\c` name the XML name characters. The parser
//! follows the grammar of Appendix G; Unicode general categories come from the tables of
//! the `regex-syntax` crate; Unicode blocks (`\p{IsBasicLatin}`) from the UCD table in
//! [`super::blocks`].

use super::automaton::{Class, Dfa, MAX_CHAR, Nfa, class_and, class_norm, class_not};
use super::blocks::{BLOCKS, UCD_VERSION};

/// Compiles an XSD pattern to a minimal DFA over code points.
pub fn compile(pattern: &str) -> Result<Dfa, String> {
    let chars: Vec<char> = pattern.chars().collect();
    let mut p = Parser {
        s: &chars,
        i: 0,
        nfa: Nfa::default(),
    };
    let start = p.nfa.state()?;
    let end = p.nfa.state()?;
    p.alternation(start, end)?;
    if p.i != chars.len() {
        return Err(p.err("unexpected character"));
    }
    p.nfa.to_dfa(start, end)
}

/// XML 1.0 (5th edition) NameStartChar, the class of `\i`.
pub fn name_start() -> Class {
    class_norm(vec![
        (':' as u32, ':' as u32),
        ('A' as u32, 'Z' as u32),
        ('_' as u32, '_' as u32),
        ('a' as u32, 'z' as u32),
        (0xC0, 0xD6),
        (0xD8, 0xF6),
        (0xF8, 0x2FF),
        (0x370, 0x37D),
        (0x37F, 0x1FFF),
        (0x200C, 0x200D),
        (0x2070, 0x218F),
        (0x2C00, 0x2FEF),
        (0x3001, 0xD7FF),
        (0xF900, 0xFDCF),
        (0xFDF0, 0xFFFD),
        (0x10000, 0xEFFFF),
    ])
}

/// XML 1.0 (5th edition) NameChar, the class of `\c`.
pub fn name_char() -> Class {
    let mut c = name_start();
    c.extend([
        ('-' as u32, '.' as u32),
        ('0' as u32, '9' as u32),
        (0xB7, 0xB7),
        (0x300, 0x36F),
        (0x203F, 0x2040),
    ]);
    class_norm(c)
}

struct Parser<'a> {
    s: &'a [char],
    i: usize,
    nfa: Nfa,
}

impl Parser<'_> {
    fn err(&self, what: &str) -> String {
        format!("pattern: {what} at character {}", self.i + 1)
    }

    fn peek(&self) -> Option<char> {
        self.s.get(self.i).copied()
    }

    /// regExp ::= branch ('|' branch)*, wired between `a` and `b`.
    fn alternation(&mut self, a: usize, b: usize) -> Result<(), String> {
        loop {
            self.branch(a, b)?;
            if self.peek() == Some('|') {
                self.i += 1;
            } else {
                return Ok(());
            }
        }
    }

    /// branch ::= piece*.
    fn branch(&mut self, a: usize, b: usize) -> Result<(), String> {
        let mut cur = a;
        while let Some(c) = self.peek() {
            if c == '|' || c == ')' {
                break;
            }
            let start = self.i;
            let (min, max) = {
                // Parse the atom once to find the quantifier, then re-parse per copy.
                let probe = self.nfa.state()?;
                let probe_end = self.nfa.state()?;
                self.atom(probe, probe_end)?;
                self.quantifier()?
            };
            let after = self.i;
            let copies = max.unwrap_or(min).max(min) as usize;
            if copies > 1000 {
                return Err(self.err("repetition bound above 1000"));
            }
            for k in 0..copies {
                let next = self.nfa.state()?;
                self.i = start;
                self.atom(cur, next)?;
                if k >= min as usize {
                    self.nfa.eps(cur, next);
                }
                cur = next;
            }
            if max.is_none() {
                // x{n,}: after n copies, one more copy that loops.
                let hub = self.nfa.state()?;
                self.nfa.eps(cur, hub);
                let body_end = self.nfa.state()?;
                self.i = start;
                self.atom(hub, body_end)?;
                self.nfa.eps(body_end, hub);
                cur = hub;
            }
            self.i = after;
        }
        self.nfa.eps(cur, b);
        Ok(())
    }

    /// quantifier ::= [?*+] | '{' quantity '}'; returns (min, max).
    fn quantifier(&mut self) -> Result<(u32, Option<u32>), String> {
        let q = match self.peek() {
            Some('?') => (0, Some(1)),
            Some('*') => (0, None),
            Some('+') => (1, None),
            Some('{') => {
                self.i += 1;
                let n = self.number()?;
                let q = if self.peek() == Some(',') {
                    self.i += 1;
                    if self.peek() == Some('}') {
                        (n, None)
                    } else {
                        let m = self.number()?;
                        if m < n {
                            return Err(self.err("quantifier {n,m} with m < n"));
                        }
                        (n, Some(m))
                    }
                } else {
                    (n, Some(n))
                };
                if self.peek() != Some('}') {
                    return Err(self.err("expected '}'"));
                }
                q
            }
            _ => return Ok((1, Some(1))),
        };
        self.i += 1;
        Ok(q)
    }

    fn number(&mut self) -> Result<u32, String> {
        let start = self.i;
        while self.peek().is_some_and(|c| c.is_ascii_digit()) {
            self.i += 1;
        }
        let t: String = self.s[start..self.i].iter().collect();
        t.parse().map_err(|_| self.err("expected a number"))
    }

    /// atom ::= NormalChar | charClass | '(' regExp ')', wired between `a` and `b`.
    fn atom(&mut self, a: usize, b: usize) -> Result<(), String> {
        match self.peek() {
            Some('(') => {
                self.i += 1;
                self.alternation(a, b)?;
                if self.peek() != Some(')') {
                    return Err(self.err("expected ')'"));
                }
                self.i += 1;
            }
            Some('[') => {
                let c = self.class_expr()?;
                self.nfa.on(a, c, b);
            }
            Some('.') => {
                self.i += 1;
                self.nfa.on(a, class_not(&vec![(10, 10), (13, 13)]), b);
            }
            Some('\\') => {
                let c = self.escape()?;
                self.nfa.on(a, c, b);
            }
            Some(c) if !"?*+{}])|".contains(c) => {
                self.i += 1;
                self.nfa.on(a, vec![(c as u32, c as u32)], b);
            }
            _ => return Err(self.err("expected a character, class or group")),
        }
        Ok(())
    }

    /// charClassExpr ::= '[' '^'? charGroup ('-' charClassExpr)? ']'.
    fn class_expr(&mut self) -> Result<Class, String> {
        self.i += 1; // '['
        let neg = self.peek() == Some('^');
        if neg {
            self.i += 1;
        }
        let mut set: Class = Vec::new();
        let mut first = true;
        loop {
            match self.peek() {
                None => return Err(self.err("unclosed '['")),
                Some(']') if !first => break,
                Some('-') if self.s.get(self.i + 1) == Some(&'[') && !first => {
                    self.i += 1;
                    let sub = self.class_expr()?;
                    let base = if neg {
                        class_not(&class_norm(set))
                    } else {
                        class_norm(set)
                    };
                    if self.peek() != Some(']') {
                        return Err(self.err("expected ']' after a class subtraction"));
                    }
                    self.i += 1;
                    return Ok(class_and(&base, &class_not(&sub)));
                }
                Some('[') => return Err(self.err("'[' inside a class")),
                _ => {}
            }
            first = false;
            let lo = if self.peek() == Some('\\') {
                let c = self.escape()?;
                if !(c.len() == 1 && c[0].0 == c[0].1) {
                    set.extend(c);
                    continue;
                }
                c[0].0
            } else {
                let c = self.peek().unwrap_or('\0') as u32;
                self.i += 1;
                c
            };
            // A range a-b (a '-' before ']' or '[' is a literal dash).
            if self.peek() == Some('-')
                && !matches!(self.s.get(self.i + 1), Some(']') | Some('[') | None)
            {
                self.i += 1;
                let hi = if self.peek() == Some('\\') {
                    let c = self.escape()?;
                    if !(c.len() == 1 && c[0].0 == c[0].1) {
                        return Err(self.err("a class escape cannot end a range"));
                    }
                    c[0].0
                } else {
                    let c = self.peek().unwrap_or('\0') as u32;
                    self.i += 1;
                    c
                };
                if hi < lo {
                    return Err(self.err("range out of order"));
                }
                set.push((lo, hi));
            } else {
                set.push((lo, lo));
            }
        }
        self.i += 1; // ']'
        let set = class_norm(set);
        Ok(if neg { class_not(&set) } else { set })
    }

    /// Single-character, multi-character and category escapes.
    fn escape(&mut self) -> Result<Class, String> {
        self.i += 1; // '\'
        let Some(c) = self.peek() else {
            return Err(self.err("pattern ends in '\\'"));
        };
        self.i += 1;
        let one = |c: char| vec![(c as u32, c as u32)];
        Ok(match c {
            'n' => one('\n'),
            'r' => one('\r'),
            't' => one('\t'),
            '\\' | '|' | '.' | '?' | '*' | '+' | '(' | ')' | '{' | '}' | '-' | '[' | ']' | '^' => {
                one(c)
            }
            's' => class_norm(vec![(9, 10), (13, 13), (32, 32)]),
            'S' => class_not(&class_norm(vec![(9, 10), (13, 13), (32, 32)])),
            'i' => name_start(),
            'I' => class_not(&name_start()),
            'c' => name_char(),
            'C' => class_not(&name_char()),
            'd' => category("Nd")?,
            'D' => class_not(&category("Nd")?),
            'w' => word(true)?,
            'W' => word(false)?,
            'p' | 'P' => {
                if self.peek() != Some('{') {
                    return Err(self.err("expected '{' after \\p"));
                }
                let start = self.i + 1;
                let Some(len) = self.s[start..].iter().position(|&c| c == '}') else {
                    return Err(self.err("unclosed \\p{"));
                };
                let name: String = self.s[start..start + len].iter().collect();
                self.i = start + len + 1;
                let set = match name.strip_prefix("Is") {
                    Some(block_name) => block(block_name)?,
                    None => category(&name)?,
                };
                if c == 'p' { set } else { class_not(&set) }
            }
            _ => return Err(self.err(&format!("unknown escape \\{c}"))),
        })
    }
}

/// Block names of XSD 1.0 (Unicode 3.1) that later Unicode versions renamed, with the ranges
/// XSD 1.0's table gave them. XSD 1.1 Part 2 §G.4.2.3 lists these and encourages processors
/// to keep accepting them for compatibility; the current names (`IsGreekandCoptic`, ...)
/// are the ones it requires. `PrivateUse` covered three ranges in that table.
const XSD10_BLOCKS: &[(&str, &[(u32, u32)])] = &[
    ("Greek", &[(0x0370, 0x03FF)]),
    ("CombiningMarksforSymbols", &[(0x20D0, 0x20FF)]),
    (
        "PrivateUse",
        &[(0xE000, 0xF8FF), (0xF0000, 0xFFFFD), (0x100000, 0x10FFFD)],
    ),
];

/// The block escape `\p{IsX}` (XSD 1.1 Part 2 §G.4.2.3): the code points of the block whose
/// *normalized block name* is X, that is the UCD name with white space and underbars
/// stripped, hyphens and letter case kept (`Latin-1 Supplement` gives `IsLatin-1Supplement`).
/// The match is exact: Unicode's own loose matching (UAX #44 LM3, which ignores case and
/// hyphens) is not what XSD defines, so a near miss is named in the error instead. §G.4.2.4
/// lets an unrecognized name match every character or, at user option, be an error; a
/// silent wildcard would change answers, so it is an error here. (The section numbers and
/// the normalisation rule are from memory, checked against other implementations that quote
/// the spec, not against its text.)
fn block(name: &str) -> Result<Class, String> {
    // IsBlock ::= 'Is' [a-zA-Z0-9#x2D]+ (production [36] of XSD 1.0, [96] of XSD 1.1).
    if name.is_empty() || !name.bytes().all(|b| b.is_ascii_alphanumeric() || b == b'-') {
        return Err(format!(
            "pattern: \\p{{Is{name}}} is not a block escape (a block name is letters, digits and '-')"
        ));
    }
    let normalized = |ucd: &str| -> String {
        ucd.chars()
            .filter(|c| !c.is_whitespace() && *c != '_')
            .collect()
    };
    if let Some(&(lo, hi, _)) = BLOCKS.iter().find(|(_, _, n)| normalized(n) == name) {
        return Ok(vec![(lo, hi)]);
    }
    if let Some((_, ranges)) = XSD10_BLOCKS.iter().find(|(n, _)| *n == name) {
        return Ok(class_norm(ranges.to_vec()));
    }
    // UAX #44 LM3 loose matching, only to suggest the spelling XSD wants.
    let loose = |s: &str| -> String {
        s.chars()
            .filter(|c| c.is_ascii_alphanumeric())
            .map(|c| c.to_ascii_lowercase())
            .collect()
    };
    let hint = BLOCKS
        .iter()
        .find(|(_, _, n)| loose(n) == loose(name))
        .map(|(_, _, n)| format!(" (did you mean \\p{{Is{}}}?)", normalized(n)))
        .unwrap_or_default();
    Err(format!(
        "pattern: unknown Unicode block \\p{{Is{name}}}{hint}; block names are those of \
         Unicode {UCD_VERSION}'s Blocks.txt with white space removed, letter case and hyphens \
         kept"
    ))
}

/// `\w`: every character except punctuation, separators and "other" (XSD 1.1 G.4.2.5).
fn word(positive: bool) -> Result<Class, String> {
    let mut not = category("P")?;
    not.extend(category("Z")?);
    not.extend(category("C")?);
    let not = class_norm(not);
    Ok(if positive { class_not(&not) } else { not })
}

/// A Unicode general category, from the regex-syntax tables.
fn category(name: &str) -> Result<Class, String> {
    use regex_syntax::hir::{Class as HClass, HirKind};
    let ok = !name.is_empty()
        && name.len() <= 2
        && name.chars().next().is_some_and(|c| c.is_ascii_uppercase())
        && name.chars().skip(1).all(|c| c.is_ascii_lowercase());
    if !ok {
        return Err(format!("pattern: unknown category \\p{{{name}}}"));
    }
    let hir = regex_syntax::Parser::new()
        .parse(&format!("\\p{{{name}}}"))
        .map_err(|_| format!("pattern: unknown category \\p{{{name}}}"))?;
    let mut out = Vec::new();
    match hir.kind() {
        HirKind::Class(HClass::Unicode(u)) => {
            for r in u.iter() {
                out.push((r.start() as u32, r.end() as u32));
            }
        }
        _ => return Err(format!("pattern: unknown category \\p{{{name}}}")),
    }
    // "Other" (C) includes the surrogates, which regex-syntax leaves out of char ranges.
    if name == "C" || name == "Cs" {
        out.push((0xD800, 0xDFFF));
    }
    let _ = MAX_CHAR;
    Ok(class_norm(out))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn w(s: &str) -> Vec<u32> {
        s.chars().map(|c| c as u32).collect()
    }

    #[test]
    fn xsd_syntax() {
        // Implicit anchoring: "ab" matches "ab" only (XSD 1.1 G.1).
        let d = compile("ab").unwrap();
        assert!(d.contains(&w("ab")) && !d.contains(&w("xab")));
        // '^' and '$' are ordinary characters.
        assert!(compile("^a$").unwrap().contains(&w("^a$")));
        // Class subtraction: consonants.
        let c = compile("[a-z-[aeiou]]").unwrap();
        assert!(c.contains(&w("b")) && !c.contains(&w("e")));
        // Counted repetition: 3 to 4 digits from [0-9]: 10^3 + 10^4 words.
        assert_eq!(compile("[0-9]{3,4}").unwrap().count(u64::MAX), Some(11_000));
        // '.' excludes only \n and \r.
        let dot = compile(".").unwrap();
        assert!(dot.contains(&w("\t")) && !dot.contains(&w("\n")));
        assert!(compile("\\d+").unwrap().contains(&w("٣4")));
        assert!(compile("a{2,1}").is_err());
        assert!(compile("(a").is_err());
    }

    #[test]
    fn intersection_of_patterns() {
        // [a-c]+ ∩ .*b.* ∩ length 2: ab, ba, bb, bc, cb (hand count 5).
        let d = compile("[a-c]+")
            .unwrap()
            .and(&compile(".*b.*").unwrap())
            .and(&Dfa::lengths(&vec![(0, MAX_CHAR)], 2, Some(2)).unwrap());
        assert_eq!(d.count(100), Some(5));
        // a+ and b+ share no word.
        assert!(
            compile("a+")
                .unwrap()
                .and(&compile("b+").unwrap())
                .is_empty()
        );
    }

    #[test]
    fn block_escapes() {
        // Blocks-15.0.0.txt: Latin-1 Supplement is 0080..00FF, Basic Latin 0000..007F.
        let latin1 = compile("\\p{IsLatin-1Supplement}").unwrap();
        assert!(latin1.contains(&w("é")) && !latin1.contains(&w("A")));
        assert_eq!(latin1.count(1000), Some(128));
        // Negated block: every character but U+0000..U+007F.
        let not_ascii = compile("\\P{IsBasicLatin}").unwrap();
        assert!(not_ascii.contains(&w("é")) && !not_ascii.contains(&w("A")));
        // Inside a class, with subtraction: Basic Latin minus the lower-case letters; the
        // XML characters of Basic Latin are U+0009, U+000A, U+000D and U+0020..U+007F
        // (99), less 26 letters = 73 (hand count).
        let c = compile("[\\p{IsBasicLatin}-[a-z]]")
            .unwrap()
            .and(&super::super::universe().strings);
        assert!(c.contains(&w("A")) && !c.contains(&w("a")));
        assert_eq!(c.count(1000), Some(73));
        // A negated block inside a negated class is the block again: [^\P{IsThai}].
        let thai = compile("[^\\P{IsThai}]").unwrap();
        assert!(thai.contains(&w("ก")) && !thai.contains(&w("a")));
        assert_eq!(thai.count(1000), Some(128));
        // Greek and Coptic is 0370..03FF; XSD 1.0's name IsGreek is kept for compatibility
        // (XSD 1.1 §G.4.2.3) and denotes the same range; Greek Extended is another block.
        let greek = compile("\\p{IsGreekandCoptic}+").unwrap();
        assert!(greek.contains(&w("αβγ")) && !greek.contains(&w("ἀ")));
        assert_eq!(greek, compile("\\p{IsGreek}+").unwrap());
        // Supplementary planes: U+1F600 is in Emoticons (1F600..1F64F).
        assert!(compile("\\p{IsEmoticons}").unwrap().contains(&w("😀")));
    }

    #[test]
    fn unknown_blocks_are_errors() {
        // Names match exactly (hyphens and case as the UCD writes them, XSD 1.1 §G.4.2.3).
        let e = compile("\\p{IsLatinExtendedA}").unwrap_err();
        assert!(
            e.contains("IsLatinExtendedA") && e.contains("IsLatinExtended-A"),
            "{e}"
        );
        let e = compile("[a\\P{IsNoSuchBlock}]").unwrap_err();
        assert!(e.contains("IsNoSuchBlock"), "{e}");
        assert!(compile("\\p{Is}").is_err());
        assert!(compile("\\p{IsBasic_Latin}").is_err());
        assert!(compile("\\p{Isbasiclatin}").is_err());
    }
}

//! The case file format: TOML with a `prefixes` table, an optional file-wide `kb`, and
//! `[[case]]` tables, each with its KB files, one input and a `[case.expect]` table.
//! Parsed with `toml_edit`, whose spans give every key and value its line.

use super::CheckError;
use std::path::{Path, PathBuf};
use toml_edit::{Document, Item, Table, Value};

/// A string of a case file with the line it stands on.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Item1 {
    /// The text.
    pub text: String,
    /// Line number, from 1.
    pub line: usize,
}

/// The register a text expectation is about.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum Register {
    /// The clinician's text.
    Clinician,
    /// The patient's text.
    Patient,
    /// The formal record.
    Formal,
}

impl Register {
    /// The register's key in case files.
    pub fn key(self) -> &'static str {
        match self {
            Register::Clinician => "clinician",
            Register::Patient => "patient",
            Register::Formal => "formal",
        }
    }
}

/// What one expectation asks.
#[derive(Clone, Debug, PartialEq)]
pub enum Expect {
    /// The KB with the case is consistent (true) or not.
    Consistent(bool),
    /// Assertions or SubClassOf axioms that must be entailed.
    Entailed(Vec<Item1>),
    /// Assertions or SubClassOf axioms that must not be entailed.
    NotEntailed(Vec<Item1>),
    /// Classes that must be satisfiable.
    Satisfiable(Vec<Item1>),
    /// Classes that must be unsatisfiable.
    Unsatisfiable(Vec<Item1>),
    /// The assertions of the top-ranked explanation.
    Top(Vec<Item1>),
    /// Explanations that must be found.
    Present(Vec<Vec<Item1>>),
    /// Explanations that must not be found.
    Absent(Vec<Vec<Item1>>),
    /// Explanations that must be found at this rank or better.
    MaxRank(Vec<(Vec<Item1>, usize)>),
    /// The observations no explanation accounts for (the whole set).
    Unexplained(Vec<Item1>),
    /// The suspended normal-anatomy defaults (the whole set).
    Abnormalities(Vec<Item1>),
    /// Phrases a register's text must contain.
    Contains(Register, Vec<Item1>),
    /// Phrases a register's text must not contain.
    Lacks(Register, Vec<Item1>),
}

impl Expect {
    /// Whether checking it needs the abduction search.
    pub fn needs_explanations(&self) -> bool {
        matches!(
            self,
            Expect::Top(_)
                | Expect::Present(_)
                | Expect::Absent(_)
                | Expect::MaxRank(_)
                | Expect::Unexplained(_)
                | Expect::Abnormalities(_)
                | Expect::Contains(..)
                | Expect::Lacks(..)
        )
    }
}

/// One expectation with its key path and line.
#[derive(Clone, Debug, PartialEq)]
pub struct Expectation {
    /// Its key under `expect`, such as `top` or `text.clinician.contains`.
    pub key: String,
    /// Line of the key.
    pub line: usize,
    /// What it asks.
    pub expect: Expect,
}

/// The input of a case.
#[derive(Clone, Debug, PartialEq)]
pub enum Input {
    /// No case data: only KB-level expectations.
    None,
    /// A facts file (from `measure`).
    Facts(PathBuf),
    /// Label maps with their table, measured with default settings.
    Maps {
        /// The label maps.
        maps: Vec<PathBuf>,
        /// The label table.
        labels: PathBuf,
    },
    /// Class and property assertions in functional syntax: the observations.
    Assertions {
        /// The text.
        text: String,
        /// Line of the `assertions` key.
        line: usize,
    },
}

/// One case as written.
#[derive(Clone, Debug, PartialEq)]
pub struct CaseSpec {
    /// Its name, unique in the suite.
    pub name: String,
    /// The case file.
    pub file: PathBuf,
    /// Position among the file's `[[case]]` tables, from 0.
    pub index: usize,
    /// Line of its `[[case]]` header.
    pub line: usize,
    /// KB files, resolved against the case file's folder.
    pub kb: Vec<PathBuf>,
    /// Line of the `kb` key (for messages about the files).
    pub kb_line: usize,
    /// The input.
    pub input: Input,
    /// Background assertions (functional syntax) added to the KB, not explained.
    pub background: Option<Item1>,
    /// Abducibles file, resolved.
    pub abducibles: Option<PathBuf>,
    /// α-cut for graded facts.
    pub alpha: f64,
    /// Largest explanation size.
    pub max_size: usize,
    /// The expectations, in file order.
    pub expect: Vec<Expectation>,
    /// The file's prefixes (name → IRI), for writing and reading short names.
    pub prefixes: Vec<(String, String)>,
}

/// Every case found under the paths given.
#[derive(Clone, Debug, Default)]
pub struct Suite {
    /// The cases, file by file in path order, in file order within a file.
    pub cases: Vec<CaseSpec>,
    /// The case files read.
    pub files: Vec<PathBuf>,
}

/// The line (from 1) of a byte offset.
pub fn line_of(text: &str, offset: usize) -> usize {
    text.as_bytes()[..offset.min(text.len())]
        .iter()
        .filter(|&&b| b == b'\n')
        .count()
        + 1
}

/// Reads the case files under the paths: a file is read as given; a folder is searched
/// recursively for `*.toml` files that hold `[[case]]` tables (hidden entries skipped).
pub fn load_paths(paths: &[PathBuf]) -> Result<Suite, CheckError> {
    let mut suite = Suite::default();
    for p in paths {
        if p.is_dir() {
            let mut found = Vec::new();
            walk(p, &mut found)?;
            found.sort();
            for f in found {
                let text = read(&f)?;
                if Document::parse(text.as_str())
                    .map(|d| d.as_table().contains_key("case"))
                    .unwrap_or(true)
                {
                    parse_file(&f, &text, &mut suite)?;
                }
            }
        } else {
            let text = read(p)?;
            parse_file(p, &text, &mut suite)?;
        }
    }
    let mut seen = std::collections::BTreeMap::new();
    for c in &suite.cases {
        if let Some((f, l)) = seen.insert(c.name.clone(), (c.file.clone(), c.line)) {
            return Err(CheckError(format!(
                "{}:{}: the case name {:?} is already used at {}:{l}; give each case its own name",
                c.file.display(),
                c.line,
                c.name,
                f.display()
            )));
        }
    }
    if suite.cases.is_empty() {
        return Err(CheckError(
            "no case found: give case files (TOML with [[case]] tables) or folders holding them"
                .into(),
        ));
    }
    Ok(suite)
}

fn read(p: &Path) -> Result<String, CheckError> {
    std::fs::read_to_string(p).map_err(|e| CheckError(format!("{}: cannot read: {e}", p.display())))
}

fn walk(dir: &Path, out: &mut Vec<PathBuf>) -> Result<(), CheckError> {
    let rd = std::fs::read_dir(dir)
        .map_err(|e| CheckError(format!("{}: cannot read the folder: {e}", dir.display())))?;
    for e in rd.flatten() {
        let p = e.path();
        if e.file_name().to_string_lossy().starts_with('.') {
            continue;
        }
        if p.is_dir() {
            walk(&p, out)?;
        } else if p.extension().is_some_and(|x| x == "toml") {
            out.push(p);
        }
    }
    Ok(())
}

/// Where a case file's parts are and what they say; shared by the parser and `accept`.
struct Ctx<'a> {
    file: &'a Path,
    text: &'a str,
}

impl Ctx<'_> {
    fn line(&self, span: Option<std::ops::Range<usize>>) -> usize {
        span.map(|s| line_of(self.text, s.start)).unwrap_or(0)
    }
    fn err(&self, line: usize, msg: impl std::fmt::Display) -> CheckError {
        CheckError(format!("{}:{line}: {msg}", self.file.display()))
    }
    /// The line of a string's first character: a multi-line string that opens with a line
    /// break starts on the next line (TOML 1.0 drops that break).
    fn first_text_line(&self, item: &Item) -> Option<usize> {
        let span = item.as_value()?.span()?;
        let raw = &self.text[span.start..];
        let opens_on_break = ["\"\"\"\n", "\"\"\"\r\n", "'''\n", "'''\r\n"]
            .iter()
            .any(|o| raw.starts_with(o));
        Some(self.line(Some(span)) + usize::from(opens_on_break))
    }
    fn key_line(&self, t: &Table, k: &str) -> usize {
        self.line(t.key(k).and_then(|k| k.span()))
    }
    fn string(&self, t: &Table, k: &str) -> Result<Option<Item1>, CheckError> {
        let Some(item) = t.get(k) else {
            return Ok(None);
        };
        let line = self.key_line(t, k);
        match item.as_str() {
            Some(s) => Ok(Some(Item1 {
                text: s.to_string(),
                line: self.first_text_line(item).unwrap_or(line),
            })),
            None => Err(self.err(line, format!("`{k}` must be a string"))),
        }
    }
    fn strings_value(&self, v: &Value, k: &str, line: usize) -> Result<Vec<Item1>, CheckError> {
        let Some(a) = v.as_array() else {
            return Err(self.err(line, format!("`{k}` must be a list of strings")));
        };
        a.iter()
            .map(|x| match x.as_str() {
                Some(s) => Ok(Item1 {
                    text: s.to_string(),
                    line: self.line(x.span()).max(line),
                }),
                None => Err(self.err(
                    self.line(x.span()).max(line),
                    format!("`{k}` must be a list of strings"),
                )),
            })
            .collect()
    }
    fn strings(&self, t: &Table, k: &str) -> Result<Option<Vec<Item1>>, CheckError> {
        let Some(item) = t.get(k) else {
            return Ok(None);
        };
        let line = self.key_line(t, k);
        match item.as_value() {
            Some(v) => self.strings_value(v, k, line).map(Some),
            None => Err(self.err(line, format!("`{k}` must be a list of strings"))),
        }
    }
    fn lists(&self, t: &Table, k: &str) -> Result<Option<Vec<Vec<Item1>>>, CheckError> {
        let Some(item) = t.get(k) else {
            return Ok(None);
        };
        let line = self.key_line(t, k);
        let msg = format!(
            "`{k}` must be a list of explanations, each a list of assertions: [[\"ClassAssertion(...)\"], ...]"
        );
        let Some(a) = item.as_value().and_then(|v| v.as_array()) else {
            return Err(self.err(line, msg));
        };
        a.iter()
            .map(|x| {
                let l = self.line(x.span()).max(line);
                if x.as_array().is_none() {
                    return Err(self.err(l, &msg));
                }
                self.strings_value(x, k, l)
            })
            .collect::<Result<Vec<_>, _>>()
            .map(Some)
    }
    fn unknown_keys(&self, t: &Table, allowed: &[&str], what: &str) -> Result<(), CheckError> {
        for (k, _) in t.iter() {
            if !allowed.contains(&k) {
                return Err(self.err(
                    self.key_line(t, k),
                    format!(
                        "unknown key `{k}` in {what}; the keys allowed there are: {}",
                        allowed.join(", ")
                    ),
                ));
            }
        }
        Ok(())
    }
    fn table<'t>(&self, item: &'t Item, k: &str, line: usize) -> Result<&'t Table, CheckError> {
        item.as_table()
            .ok_or_else(|| self.err(line, format!("`{k}` must be a table ([{k}])")))
    }
}

const CASE_KEYS: &[&str] = &[
    "name",
    "kb",
    "facts",
    "maps",
    "labels",
    "assertions",
    "background",
    "abducibles",
    "alpha",
    "max_size",
    "expect",
];

const EXPECT_KEYS: &[&str] = &[
    "consistent",
    "entailed",
    "not_entailed",
    "satisfiable",
    "unsatisfiable",
    "top",
    "present",
    "absent",
    "max_rank",
    "unexplained",
    "abnormalities",
    "text",
];

/// Parses one case file's text and appends its cases.
pub fn parse_file(file: &Path, text: &str, suite: &mut Suite) -> Result<(), CheckError> {
    let doc = Document::parse(text).map_err(|e| {
        let line = e.span().map(|s| line_of(text, s.start)).unwrap_or(0);
        let msg = e.message().trim().to_string();
        CheckError(format!(
            "{}:{line}: malformed TOML: {msg}; fix the syntax (see the README's case format)",
            file.display()
        ))
    })?;
    let cx = Ctx { file, text };
    let root = doc.as_table();
    cx.unknown_keys(root, &["prefixes", "kb", "case"], "the file's top level")?;
    let mut prefixes = Vec::new();
    if let Some(p) = root.get("prefixes") {
        let line = cx.key_line(root, "prefixes");
        let t = cx.table(p, "prefixes", line)?;
        for (k, v) in t.iter() {
            let l = cx.key_line(t, k);
            let Some(iri) = v.as_str() else {
                return Err(cx.err(l, format!("prefix `{k}` must be an IRI string")));
            };
            prefixes.push((k.to_string(), iri.to_string()));
        }
    }
    let base = file.parent().unwrap_or(Path::new(""));
    let file_kb = cx.strings(root, "kb")?;
    let file_kb_line = cx.key_line(root, "kb");
    let Some(cases) = root.get("case") else {
        return Err(cx.err(
            1,
            "no [[case]] table; a case file holds one or more [[case]] tables",
        ));
    };
    let Some(cases) = cases.as_array_of_tables() else {
        return Err(cx.err(
            cx.key_line(root, "case"),
            "`case` must be written as [[case]] tables",
        ));
    };
    suite.files.push(file.to_path_buf());
    for (index, t) in cases.iter().enumerate() {
        let line = cx.line(t.span());
        cx.unknown_keys(t, CASE_KEYS, "a [[case]] table")?;
        let Some(name) = cx.string(t, "name")? else {
            return Err(cx.err(line, "this case has no `name`; add name = \"...\""));
        };
        let (kb, kb_line) = match (cx.strings(t, "kb")?, &file_kb) {
            (Some(k), _) => (k, cx.key_line(t, "kb")),
            (None, Some(k)) => (k.clone(), file_kb_line),
            (None, None) => {
                return Err(cx.err(
                    line,
                    "this case names no KB; add kb = [\"ontology.ofn\", ...] (relative to the case file)",
                ));
            }
        };
        if kb.is_empty() {
            return Err(cx.err(kb_line, "`kb` lists no file"));
        }
        let facts = cx.string(t, "facts")?;
        let maps = cx.strings(t, "maps")?;
        let labels = cx.string(t, "labels")?;
        let assertions = cx.string(t, "assertions")?;
        let input = match (facts, maps, labels, assertions) {
            (None, None, None, None) => Input::None,
            (Some(f), None, None, None) => Input::Facts(base.join(&f.text)),
            (None, Some(m), Some(l), None) => Input::Maps {
                maps: m.iter().map(|m| base.join(&m.text)).collect(),
                labels: base.join(&l.text),
            },
            (None, None, None, Some(a)) => Input::Assertions {
                text: a.text,
                line: a.line,
            },
            _ => {
                return Err(cx.err(
                    line,
                    "give one input: `facts`, or `maps` with `labels`, or `assertions`",
                ));
            }
        };
        let background = cx.string(t, "background")?;
        if background.is_some() && matches!(input, Input::Facts(_) | Input::Maps { .. }) {
            return Err(cx.err(
                cx.key_line(t, "background"),
                "`background` goes with `assertions` (or alone); a facts input carries its own",
            ));
        }
        let abducibles = cx.string(t, "abducibles")?.map(|a| base.join(&a.text));
        let alpha = match t.get("alpha") {
            None => 0.5,
            Some(v) => {
                let l = cx.key_line(t, "alpha");
                match v.as_float().or_else(|| v.as_integer().map(|i| i as f64)) {
                    Some(a) if a > 0.0 && a <= 1.0 => a,
                    _ => return Err(cx.err(l, "`alpha` must be a number in (0, 1]")),
                }
            }
        };
        let max_size = match t.get("max_size") {
            None => 3,
            Some(v) => match v.as_integer() {
                Some(n) if (1..=10).contains(&n) => n as usize,
                _ => {
                    return Err(cx.err(
                        cx.key_line(t, "max_size"),
                        "`max_size` must be an integer from 1 to 10",
                    ));
                }
            },
        };
        let expect = match t.get("expect") {
            None => Vec::new(),
            Some(e) => parse_expect(&cx, cx.table(e, "expect", cx.key_line(t, "expect"))?)?,
        };
        suite.cases.push(CaseSpec {
            name: name.text,
            file: file.to_path_buf(),
            index,
            line,
            kb: kb.iter().map(|k| base.join(&k.text)).collect(),
            kb_line,
            input,
            background,
            abducibles,
            alpha,
            max_size,
            expect,
            prefixes: prefixes.clone(),
        });
    }
    Ok(())
}

fn parse_expect(cx: &Ctx, t: &Table) -> Result<Vec<Expectation>, CheckError> {
    cx.unknown_keys(t, EXPECT_KEYS, "[case.expect]")?;
    let mut out = Vec::new();
    for (k, item) in t.iter() {
        let line = cx.key_line(t, k);
        let mut push = |key: String, line, expect| {
            out.push(Expectation { key, line, expect });
        };
        let list = |k: &str| -> Result<Vec<Item1>, CheckError> {
            Ok(cx.strings(t, k)?.unwrap_or_default())
        };
        match k {
            "consistent" => match item.as_bool() {
                Some(b) => push(k.into(), line, Expect::Consistent(b)),
                None => return Err(cx.err(line, "`consistent` must be true or false")),
            },
            "entailed" => push(k.into(), line, Expect::Entailed(list(k)?)),
            "not_entailed" => push(k.into(), line, Expect::NotEntailed(list(k)?)),
            "satisfiable" => push(k.into(), line, Expect::Satisfiable(list(k)?)),
            "unsatisfiable" => push(k.into(), line, Expect::Unsatisfiable(list(k)?)),
            "top" => push(k.into(), line, Expect::Top(list(k)?)),
            "unexplained" => push(k.into(), line, Expect::Unexplained(list(k)?)),
            "abnormalities" => push(k.into(), line, Expect::Abnormalities(list(k)?)),
            "present" => push(
                k.into(),
                line,
                Expect::Present(cx.lists(t, k)?.unwrap_or_default()),
            ),
            "absent" => push(
                k.into(),
                line,
                Expect::Absent(cx.lists(t, k)?.unwrap_or_default()),
            ),
            "max_rank" => push(
                k.into(),
                line,
                Expect::MaxRank(parse_max_rank(cx, item, line)?),
            ),
            "text" => {
                let tt = cx.table(item, "expect.text", line)?;
                cx.unknown_keys(
                    tt,
                    &["clinician", "patient", "formal"],
                    "[case.expect.text]",
                )?;
                for (r, ri) in tt.iter() {
                    let reg = match r {
                        "clinician" => Register::Clinician,
                        "patient" => Register::Patient,
                        _ => Register::Formal,
                    };
                    let rl = cx.key_line(tt, r);
                    let rt = ri.as_table_like().ok_or_else(|| {
                        cx.err(
                            rl,
                            format!("`text.{r}` must be a table with contains/lacks"),
                        )
                    })?;
                    for (kk, v) in rt.iter() {
                        let kl = rt
                            .key(kk)
                            .and_then(|k| k.span())
                            .map(|s| line_of(cx.text, s.start))
                            .unwrap_or(rl);
                        let Some(v) = v.as_value() else {
                            return Err(cx.err(kl, format!("`{kk}` must be a list of strings")));
                        };
                        let items = cx.strings_value(v, kk, kl)?;
                        let key = format!("text.{r}.{kk}");
                        match kk {
                            "contains" => push(key, kl, Expect::Contains(reg, items)),
                            "lacks" => push(key, kl, Expect::Lacks(reg, items)),
                            _ => {
                                return Err(cx.err(
                                    kl,
                                    format!(
                                        "unknown key `{kk}` in [case.expect.text.{r}]; the keys allowed there are: contains, lacks"
                                    ),
                                ));
                            }
                        }
                    }
                }
            }
            _ => unreachable!("checked by unknown_keys"),
        }
    }
    Ok(out)
}

fn parse_max_rank(
    cx: &Ctx,
    item: &Item,
    line: usize,
) -> Result<Vec<(Vec<Item1>, usize)>, CheckError> {
    let msg =
        "`max_rank` must be a list of { explanation = [\"ClassAssertion(...)\", ...], rank = N }";
    let Some(a) = item.as_value().and_then(|v| v.as_array()) else {
        return Err(cx.err(line, msg));
    };
    let mut out = Vec::new();
    for x in a.iter() {
        let l = cx.line(x.span()).max(line);
        let Some(t) = x.as_inline_table() else {
            return Err(cx.err(l, msg));
        };
        for (k, _) in t.iter() {
            if k != "explanation" && k != "rank" {
                return Err(cx.err(
                    l,
                    format!("unknown key `{k}` in max_rank; the keys allowed there are: explanation, rank"),
                ));
            }
        }
        let (Some(e), Some(r)) = (t.get("explanation"), t.get("rank")) else {
            return Err(cx.err(l, msg));
        };
        let e = cx.strings_value(e, "explanation", l)?;
        let Some(r) = r.as_integer().filter(|r| *r >= 1) else {
            return Err(cx.err(l, "`rank` must be an integer ≥ 1"));
        };
        out.push((e, r as usize));
    }
    Ok(out)
}

/// Expands a class name: `<IRI>`, a full IRI, or `prefix:local` with the file's prefixes.
pub fn expand_name(name: &str, prefixes: &[(String, String)]) -> Option<String> {
    let n = name.trim();
    if let Some(iri) = n.strip_prefix('<').and_then(|x| x.strip_suffix('>')) {
        return Some(iri.to_string());
    }
    if let Some((p, local)) = n.split_once(':')
        && let Some((_, iri)) = prefixes.iter().find(|(k, _)| k == p)
    {
        return Some(format!("{iri}{local}"));
    }
    if n.contains("://") || n.starts_with("urn:") {
        return Some(n.to_string());
    }
    None
}

/// Shortens the full IRIs `<...>` of a functional-syntax text with the file's prefixes,
/// where the local part is a plain name (so that the text reads back the same).
pub fn abbreviate(text: &str, prefixes: &[(String, String)]) -> String {
    let mut out = String::with_capacity(text.len());
    let mut rest = text;
    while let Some(i) = rest.find('<') {
        out.push_str(&rest[..i]);
        let after = &rest[i + 1..];
        let Some(j) = after.find('>') else {
            out.push_str(&rest[i..]);
            return out;
        };
        let iri = &after[..j];
        let short = prefixes
            .iter()
            .filter(|(_, ns)| !ns.is_empty() && iri.starts_with(ns.as_str()))
            .max_by_key(|(_, ns)| ns.len())
            .map(|(p, ns)| (p, &iri[ns.len()..]))
            .filter(|(_, local)| {
                local
                    .chars()
                    .next()
                    .is_some_and(|c| c.is_ascii_alphabetic() || c == '_')
                    && local
                        .chars()
                        .all(|c| c.is_ascii_alphanumeric() || c == '_' || c == '-')
            });
        match short {
            Some((p, local)) => {
                out.push_str(p);
                out.push(':');
                out.push_str(local);
            }
            None => {
                out.push('<');
                out.push_str(iri);
                out.push('>');
            }
        }
        rest = &after[j + 1..];
    }
    out.push_str(rest);
    out
}

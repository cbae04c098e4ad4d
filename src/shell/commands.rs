//! The shell's commands: one function each, returning text.

use super::names::{Kind, fragment};
use super::syntax::{self, Statement};
use super::{Edit, Session, ShellError, apply, same_file, source_degree};
use crate::explain::case::{ObservationSource, build_problem};
use crate::explain::why::{Items, Target, all_entailed, targets_of};
use crate::explain::why::{WhyReport, why_report};
use crate::explain::{ExplainOptions, explain};
use crate::kb::load;
use crate::kb::{Axiom, ClassId, Concept, ConceptId, KbError, KnowledgeBase, RoleId};
use crate::reasoner::{Answer, Classification, Reasoner, classify, realise};
use crate::render::text::{classification_text, why_text};
use std::fmt::Write;
use std::ops::Range;
use std::path::PathBuf;
use std::time::Instant;

/// A command's name, usage, summary and example, for `help`.
pub struct CommandHelp {
    /// The command word.
    pub name: &'static str,
    /// Its arguments.
    pub usage: &'static str,
    /// What it does.
    pub summary: &'static str,
    /// An example line.
    pub example: &'static str,
}

/// Every command of the shell.
pub const COMMANDS: &[CommandHelp] = &[
    CommandHelp {
        name: "help",
        usage: "help [COMMAND]",
        summary: "List the commands, or explain one with an example.",
        example: "help ask",
    },
    CommandHelp {
        name: "load",
        usage: "load FILE...",
        summary: "Load ontology files (functional syntax, OWL/XML, RDF/XML) and their imports.",
        example: "load ontologies/abdomen.ofn",
    },
    CommandHelp {
        name: "unload",
        usage: "unload FILE",
        summary: "Remove a loaded file (by path or file name); the session's edits stay.",
        example: "unload spatial.ofn",
    },
    CommandHelp {
        name: "reload",
        usage: "reload",
        summary: "Re-read the files that changed on disk and apply the session's edits again.",
        example: "reload",
    },
    CommandHelp {
        name: "status",
        usage: "status",
        summary: "Files, edits (numbered), undo and redo depth, observations, unsaved changes.",
        example: "status",
    },
    CommandHelp {
        name: "show",
        usage: "show NAME",
        summary: "A class answered question by question (what it is, defined as, what falls under it, never together with, where it is used; · stated, ∴ follows), an individual (types, relations, degrees) or a property.",
        example: "show Liver",
    },
    CommandHelp {
        name: "add",
        usage: "add AXIOM",
        summary: "Add an axiom or assertion (Manchester or functional syntax); new entities need a prefixed name or <IRI>.",
        example: "add SimpleHepaticCyst SubClassOf CysticLesion and (within some Liver)",
    },
    CommandHelp {
        name: "retract",
        usage: "retract AXIOM",
        summary: "Remove an axiom or assertion that the knowledge base holds (written as it reads).",
        example: "retract Kidney SubClassOf SolidOrgan",
    },
    CommandHelp {
        name: "undo",
        usage: "undo",
        summary: "Take back the last edit (add, retract or background import).",
        example: "undo",
    },
    CommandHelp {
        name: "redo",
        usage: "redo",
        summary: "Apply again the last edit taken back.",
        example: "redo",
    },
    CommandHelp {
        name: "ask",
        usage: "ask [AXIOM | CLASS-EXPRESSION]",
        summary: "Is the axiom entailed? Yes, No or Unknown (a limit), with the time taken. A class expression asks whether it is satisfiable; nothing asks whether the KB is consistent.",
        example: "ask Liver SubClassOf Organ",
    },
    CommandHelp {
        name: "explain",
        usage: "explain [ASSERTION; ...] [--observations FILE | --facts FILE] [--abducibles FILE] [--max-size N] [--max-nodes N] [--alpha A]",
        summary: "Explain observations by abduction: inline assertions, a file, or the facts imported as observations.",
        example: "explain --max-size 2",
    },
    CommandHelp {
        name: "why",
        usage: "why [AXIOM | unsat CLASS | inconsistent]",
        summary: "All justifications of an entailment, an unsatisfiable class or the inconsistency; alone, every root unsatisfiable class.",
        example: "why Kidney SubClassOf Organ",
    },
    CommandHelp {
        name: "repairs",
        usage: "repairs [AXIOM | unsat CLASS | inconsistent]",
        summary: "The minimal repairs: sets of axioms whose removal breaks every justification.",
        example: "repairs unsat Impossible",
    },
    CommandHelp {
        name: "tree",
        usage: "tree [CLASS]",
        summary: "Classify and print the taxonomy, whole or under one class.",
        example: "tree Organ",
    },
    CommandHelp {
        name: "unsat",
        usage: "unsat",
        summary: "List the unsatisfiable classes.",
        example: "unsat",
    },
    CommandHelp {
        name: "check",
        usage: "check PATH...",
        summary: "Run regression cases (case files, or folders of them) against the session's KB, edits included, instead of the files the cases name.",
        example: "check examples/cases.toml",
    },
    CommandHelp {
        name: "import",
        usage: "import FACTS.json as observations|background [--alpha A]",
        summary: "Read a facts file: as observations for `explain`, or as background assertions (an undoable edit, α-cut at A, default 0.5).",
        example: "import case/facts.json as observations",
    },
    CommandHelp {
        name: "save",
        usage: "save [--into DOCUMENT] [--yes] | save FILE [--yes]",
        summary: "Alone: write each edit into the loaded document it belongs to (the one declaring its subject, or DOCUMENT), keeping each document's syntax, comments and prefixes, after confirmation, with FILE.bak. With FILE: everything merged into one functional-syntax file.",
        example: "save --into abdomen.ofn",
    },
    CommandHelp {
        name: "quit",
        usage: "quit",
        summary: "Leave the shell (also `exit` or Ctrl-D).",
        example: "quit",
    },
];

/// The help for one command, or the list of commands.
pub fn help_text(topic: Option<&str>) -> Result<String, String> {
    let mut s = String::new();
    match topic {
        None => {
            let _ = writeln!(s, "Commands (help COMMAND for details and an example):");
            for c in COMMANDS {
                let _ = writeln!(s, "  {:<9} {}", c.name, c.summary);
            }
            let _ = writeln!(
                s,
                "Names: a prefixed name (:Liver, sp:leftOf), an IRI fragment (Liver), a label ('left kidney') or <full IRI>.\nExpressions: Manchester syntax (and, or, not, some, only, value, min, max, exactly, {{a, b}}) or functional syntax."
            );
        }
        Some(t) => {
            let Some(c) = COMMANDS.iter().find(|c| c.name == t) else {
                return Err(format!("no command `{t}`; type help for the list"));
            };
            let _ = writeln!(s, "{}\n  {}\n  example: {}", c.usage, c.summary, c.example);
        }
    }
    Ok(s)
}

/// A parsed command line: the command word and its argument with the argument's offset.
pub(super) struct Line<'a> {
    pub(super) full: &'a str,
    pub(super) word: &'a str,
    pub(super) arg: &'a str,
    pub(super) off: usize,
}

impl Line<'_> {
    pub(super) fn err(&self, msg: impl Into<String>, at: usize) -> ShellError {
        ShellError::at(msg, self.full, at)
    }
}

fn split(line: &str) -> Line<'_> {
    let lead = line.len() - line.trim_start().len();
    let rest = &line[lead..];
    let wend = rest.find(char::is_whitespace).unwrap_or(rest.len());
    let after = &rest[wend..];
    let skip = after.len() - after.trim_start().len();
    let off = lead + wend + skip;
    Line {
        full: line,
        word: &rest[..wend],
        arg: line[off..].trim_end(),
        off,
    }
}

/// Runs one command line.
pub fn execute(s: &mut Session, line: &str) -> Result<String, ShellError> {
    let l = split(line);
    match l.word {
        "" => Ok(String::new()),
        "help" | "?" => {
            help_text((!l.arg.is_empty()).then_some(l.arg)).map_err(|m| l.err(m, l.off))
        }
        "load" => {
            let paths = words(&l)?;
            if paths.is_empty() {
                return Err(l.err("give one or more files: load FILE...", l.off));
            }
            let files: Vec<PathBuf> = paths.into_iter().map(|(p, _)| PathBuf::from(p)).collect();
            let mut out = s.load_files(&files)?;
            out.push('\n');
            Ok(out)
        }
        "unload" => unload(s, &l),
        "reload" => reload(s),
        "status" => Ok(status(s)),
        "show" => show(s, &l),
        "add" => add(s, &l),
        "retract" => retract(s, &l),
        "undo" => undo(s, true),
        "redo" => undo(s, false),
        "ask" => ask(s, &l),
        "explain" => explain_cmd(s, &l),
        "why" => why(s, &l, true),
        "repairs" => why(s, &l, false),
        "tree" => tree(s, &l),
        "unsat" => unsat(s),
        "import" => import(s, &l),
        "check" => check_cmd(s, &l),
        "save" => super::save::save(s, &l),
        "quit" | "exit" => {
            s.quit = true;
            Ok(if s.unsaved() {
                "leaving with unsaved edits (they are lost)\n".into()
            } else {
                String::new()
            })
        }
        other => {
            let near: Vec<&str> = COMMANDS
                .iter()
                .map(|c| c.name)
                .filter(|n| n.starts_with(&other.chars().take(2).collect::<String>()))
                .collect();
            Err(l.err(
                format!(
                    "unknown command `{other}`{}; type help for the list",
                    if near.is_empty() {
                        String::new()
                    } else {
                        format!(" (did you mean {}?)", near.join(", "))
                    }
                ),
                line.len() - line.trim_start().len(),
            ))
        }
    }
}

/// `check PATH...`: the regression cases run on the in-memory KB.
fn check_cmd(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let ws = words(l)?;
    if ws.is_empty() {
        return Err(l.err(
            "give case files or folders of them, e.g. check cases.toml",
            l.off,
        ));
    }
    let paths: Vec<PathBuf> = ws.iter().map(|(w, _)| PathBuf::from(w)).collect();
    let suite = crate::check::load_paths(&paths).map_err(|e| l.err(e.to_string(), l.off))?;
    let opts = crate::check::RunOptions {
        kb: Some(std::sync::Arc::new(s.kb().clone())),
        ..Default::default()
    };
    let start = Instant::now();
    let results = crate::check::run_suite(&suite.cases, &opts);
    let mut out = String::new();
    for r in &results {
        out.push_str(&crate::check::diff::case_text(r));
    }
    out.push_str(&crate::check::diff::summary(&results, start.elapsed()));
    Ok(out)
}

/// Whitespace-separated words of the argument (double quotes group), with offsets.
fn words(l: &Line) -> Result<Vec<(String, usize)>, ShellError> {
    let mut out = Vec::new();
    let mut cur: Option<(String, usize)> = None;
    let mut quoted: Option<usize> = None;
    for (i, c) in l.arg.char_indices() {
        if let Some(q) = quoted {
            if c == '"' {
                out.push((l.arg[q + 1..i].to_string(), l.off + q));
                quoted = None;
            }
            continue;
        }
        if c.is_whitespace() {
            if let Some(w) = cur.take() {
                out.push(w);
            }
        } else if c == '"' && cur.is_none() {
            quoted = Some(i);
        } else {
            cur.get_or_insert_with(|| (String::new(), l.off + i))
                .0
                .push(c);
        }
    }
    if let Some(q) = quoted {
        return Err(l.err("unclosed quote; close it with \"", l.off + q));
    }
    if let Some(w) = cur {
        out.push(w);
    }
    Ok(out)
}

/// Options given as `--name value`: name, value and offset.
type Options = Vec<(String, String, usize)>;

/// Splits `--name value` options (after the positional text) from the argument.
/// `flags` take no value. Returns the positional text and the options with offsets.
pub(super) fn options<'a>(
    l: &Line<'a>,
    known: &[&str],
    flags: &[&str],
) -> Result<(&'a str, Options), ShellError> {
    let a = l.arg;
    let mut depth = 0i32;
    let mut cut = a.len();
    let mut quote = None;
    for (i, c) in a.char_indices() {
        match quote {
            Some(q) if c == q => quote = None,
            Some(_) => {}
            None => match c {
                '"' | '\'' => quote = Some(c),
                '(' | '{' | '[' => depth += 1,
                ')' | '}' | ']' => depth -= 1,
                '-' if depth == 0
                    && a[i..].starts_with("--")
                    && (i == 0 || a[..i].ends_with(char::is_whitespace)) =>
                {
                    cut = i;
                    break;
                }
                _ => {}
            },
        }
    }
    let positional = a[..cut].trim_end();
    let sub = Line {
        full: l.full,
        word: l.word,
        arg: &a[cut..],
        off: l.off + cut,
    };
    let toks = words(&sub)?;
    let mut out = Vec::new();
    let mut k = 0;
    while k < toks.len() {
        let (t, at) = &toks[k];
        let Some(name) = t.strip_prefix("--") else {
            return Err(l.err(
                format!("unexpected `{t}`; options go after the rest, as --name value"),
                *at,
            ));
        };
        if flags.contains(&name) {
            out.push((name.to_string(), String::new(), *at));
            k += 1;
            continue;
        }
        if !known.contains(&name) {
            let mut all: Vec<String> = known.iter().map(|k| format!("--{k}")).collect();
            all.extend(flags.iter().map(|k| format!("--{k}")));
            return Err(l.err(
                format!(
                    "unknown option `{t}` for {}; known: {}",
                    l.word,
                    if all.is_empty() {
                        "none".into()
                    } else {
                        all.join(", ")
                    }
                ),
                *at,
            ));
        }
        let Some((v, _)) = toks.get(k + 1) else {
            return Err(l.err(format!("option `{t}` needs a value"), *at));
        };
        out.push((name.to_string(), v.clone(), toks[k + 1].1));
        k += 2;
    }
    Ok((positional, out))
}

fn number<T: std::str::FromStr>(l: &Line, v: &str, at: usize, what: &str) -> Result<T, ShellError> {
    v.parse()
        .map_err(|_| l.err(format!("`{v}` is not {what}"), at))
}

fn ms(s: &Session, t: Instant) -> String {
    if s.show_times {
        format!(" [{:.1} ms]", t.elapsed().as_secs_f64() * 1e3)
    } else {
        String::new()
    }
}

fn answer_word(a: Answer) -> String {
    match a {
        Answer::Yes => "Yes".into(),
        Answer::No => "No".into(),
        Answer::Unknown(l) => format!("Unknown ({l})"),
    }
}

/// What an input line says, in functional syntax.
enum Input {
    Axioms(String),
    Class(String),
}

/// Reads an axiom or class expression in Manchester or functional syntax.
fn read_input(
    s: &Session,
    l: &Line,
    text: &str,
    off: usize,
    allow_new: bool,
) -> Result<Input, ShellError> {
    if text.trim().is_empty() {
        return Err(l.err("expected an axiom or a class expression", off));
    }
    if let Some(kw) = syntax::functional_keyword(text) {
        return Ok(if syntax::is_class_constructor(kw) {
            Input::Class(text.to_string())
        } else {
            Input::Axioms(text.to_string())
        });
    }
    match syntax::parse_manchester(text, &s.names, allow_new) {
        Ok(Statement::Axiom(a)) => Ok(Input::Axioms(a)),
        Ok(Statement::Class(c)) => Ok(Input::Class(c)),
        Err(e) => Err(l.err(e.message, off + e.offset)),
    }
}

/// Constructs outside what the reasoner supports, by the functional-syntax keyword that
/// writes them (to point at them in the input).
const UNSUPPORTED_WORDS: [&str; 13] = [
    "ObjectHasSelf",
    "ObjectPropertyChain",
    "ReflexiveObjectProperty",
    "IrreflexiveObjectProperty",
    "AsymmetricObjectProperty",
    "DisjointObjectProperties",
    "DisjointDataProperties",
    "HasKey",
    "DataMinCardinality",
    "DataMaxCardinality",
    "DataExactCardinality",
    "DatatypeDefinition",
    "DLSafeRule",
];

/// Loads functional-syntax axioms into `kb`; errors point into `text` (at `off` of the
/// line). Without `allow_new`, an entity the KB did not know is an error.
fn load_text(
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

fn unload(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let ws = words(l)?;
    let Some((name, at)) = ws.first() else {
        return Err(l.err("give the file to unload: unload FILE", l.off));
    };
    let idx = s.files.iter().position(|f| {
        f.to_string_lossy() == *name
            || f.file_name().is_some_and(|n| n.to_string_lossy() == *name)
            || same_file(f, std::path::Path::new(name))
    });
    let Some(idx) = idx else {
        return Err(l.err(
            format!(
                "`{name}` is not a loaded file; loaded: {}",
                s.files
                    .iter()
                    .map(|f| f.display().to_string())
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
            *at,
        ));
    };
    let mut files = s.files.clone();
    let gone = files.remove(idx);
    let notes = s.set_files(files)?;
    let mut out = format!(
        "unloaded {}; {} axioms remain in force\n",
        gone.display(),
        in_force(&s.kb)
    );
    for n in notes {
        let _ = writeln!(out, "  {n}");
    }
    Ok(out)
}

fn reload(s: &mut Session) -> Result<String, ShellError> {
    let changed = s.documents_changed();
    if changed.is_empty() {
        return Ok("no file changed on disk\n".into());
    }
    let n_edits = s.edits.len();
    let notes = s.set_files(s.files.clone())?;
    let mut out = format!(
        "reloaded (changed on disk: {}); {} of {} edits applied again\n",
        changed
            .iter()
            .map(|p| p.display().to_string())
            .collect::<Vec<_>>()
            .join(", "),
        s.edits.len(),
        n_edits
    );
    for n in notes {
        let _ = writeln!(out, "  {n}");
    }
    Ok(out)
}

/// The number of source axioms with at least one internal axiom still in the KB.
fn in_force(kb: &KnowledgeBase) -> usize {
    kb.axioms
        .iter()
        .map(|a| a.source)
        .collect::<std::collections::BTreeSet<_>>()
        .len()
}

fn status(s: &Session) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "knowledge base: {}", s.name());
    if s.documents.is_empty() {
        let _ = writeln!(out, "  no file loaded (load FILE...)");
    }
    for d in &s.documents {
        let _ = writeln!(out, "  file {}", d.path.display());
    }
    let _ = writeln!(
        out,
        "  {} axioms in force, {} classes, {} object properties, {} individuals",
        in_force(&s.kb),
        s.kb.vocab.classes.len(),
        s.kb.vocab.props.len(),
        s.kb.vocab.individuals.len()
    );
    let _ = writeln!(
        out,
        "edits: {} (undo {}, redo {}){}",
        s.edits.len(),
        s.edits.len(),
        s.undone.len(),
        if s.unsaved() { ", unsaved" } else { "" }
    );
    for (n, e) in s.edits.iter().enumerate() {
        let _ = writeln!(out, "  {}. {}", n + 1, e.describe());
    }
    if let Some((p, _)) = &s.observations {
        let _ = writeln!(out, "observations: {}", p.display());
    }
    out
}

/// A concept in Manchester syntax with short names.
fn manchester(s: &Session, kb: &KnowledgeBase, c: ConceptId) -> String {
    let sub = |x: ConceptId| {
        let t = manchester(s, kb, x);
        match kb.concepts.get(x) {
            Concept::And(_) | Concept::Or(_) => format!("({t})"),
            _ => t,
        }
    };
    let role = |r: RoleId| {
        let p = s.names.short(kb.vocab.prop_iri(r.prop()));
        if r.is_inverse() {
            format!("inverse {p}")
        } else {
            p
        }
    };
    let atom = |k: ClassId| s.names.short(kb.vocab.class_iri(k));
    let ind = |i| s.names.short(kb.vocab.individual_iri(i));
    match kb.concepts.get(c) {
        Concept::Top => "owl:Thing".into(),
        Concept::Bottom => "owl:Nothing".into(),
        Concept::Atom(k) => atom(*k),
        Concept::NotAtom(k) => format!("not {}", atom(*k)),
        Concept::Nominal(i) => format!("{{{}}}", ind(*i)),
        Concept::NotNominal(i) => format!("not {{{}}}", ind(*i)),
        Concept::And(xs) => xs.iter().map(|&x| sub(x)).collect::<Vec<_>>().join(" and "),
        Concept::Or(xs) => xs.iter().map(|&x| sub(x)).collect::<Vec<_>>().join(" or "),
        Concept::Some(r, x) => format!("{} some {}", role(*r), sub(*x)),
        Concept::All(r, x) => format!("{} only {}", role(*r), sub(*x)),
        Concept::AtLeast(n, r, x) => format!("{} min {n} {}", role(*r), sub(*x)),
        Concept::AtMost(n, r, x) => format!("{} max {n} {}", role(*r), sub(*x)),
        Concept::DataSome(p, d) => format!(
            "{} some {}",
            s.names.short(&kb.vocab.data_props[p.index()]),
            crate::render::words::range_text(kb.ranges.get(*d))
        ),
        Concept::DataAll(p, d) => format!(
            "{} only {}",
            s.names.short(&kb.vocab.data_props[p.index()]),
            crate::render::words::range_text(kb.ranges.get(*d))
        ),
        Concept::HasSelf(r) => format!("{} Self", role(*r)),
        Concept::NotSelf(r) => format!("not ({} Self)", role(*r)),
        Concept::AllPath(r, _, x) => format!("{} only {}", role(*r), sub(*x)),
        Concept::SomePath(r, _, x) => format!("{} some {}", role(*r), sub(*x)),
        Concept::DataAtLeast(n, p, d) => format!(
            "{} min {n} {}",
            s.names.short(&kb.vocab.data_props[p.index()]),
            crate::render::words::range_text(kb.ranges.get(*d))
        ),
        Concept::DataAtMost(n, p, d) => format!(
            "{} max {n} {}",
            s.names.short(&kb.vocab.data_props[p.index()]),
            crate::render::words::range_text(kb.ranges.get(*d))
        ),
    }
}

impl Session {
    /// The classification, computed once per version of the KB.
    fn classification(&mut self) -> Result<Classification, ShellError> {
        if let Some(c) = &self.cache.classification {
            return Ok(c.clone());
        }
        let classes = self.kb.signature_classes.clone();
        let mut r = self.reasoner()?;
        let c = classify(&mut r, &classes).map_err(|l| {
            ShellError::new(format!("classification stopped: {l}; nothing was changed"))
        })?;
        self.cache.classification = Some(c.clone());
        Ok(c)
    }

    fn realisation(&mut self) -> Result<Vec<(crate::kb::IndividualId, Vec<ClassId>)>, ShellError> {
        if let Some(r) = &self.cache.realisation {
            return Ok(r.clone());
        }
        let c = self.classification()?;
        let mut r = self.reasoner()?;
        let out = realise(&mut r, &c)
            .map_err(|l| ShellError::new(format!("realisation stopped: {l}")))?;
        self.cache.realisation = Some(out.clone());
        Ok(out)
    }
}

fn names_list(v: Vec<String>) -> String {
    if v.is_empty() {
        "(none)".into()
    } else {
        v.join(", ")
    }
}

/// One question of `show CLASS`: the stated answers (`·`), then those that only follow (`∴`),
/// a stated name not repeated as following.
fn answer(out: &mut String, question: &str, stated: &[String], follows: &[String]) {
    let follows: Vec<&String> = follows.iter().filter(|f| !stated.contains(f)).collect();
    if stated.is_empty() && follows.is_empty() {
        let _ = writeln!(out, "  {question}: nothing known");
        return;
    }
    let _ = writeln!(out, "  {question}:");
    for x in stated {
        let _ = writeln!(out, "    · {x}");
    }
    // What follows can be long (every class disjoint by inheritance): packed into lines.
    let mut line = String::new();
    for x in follows {
        if !line.is_empty() && line.len() + x.len() > 84 {
            let _ = writeln!(out, "    ∴ {line}");
            line.clear();
        }
        if !line.is_empty() {
            line.push_str(", ");
        }
        line.push_str(x);
    }
    if !line.is_empty() {
        let _ = writeln!(out, "    ∴ {line}");
    }
}

fn show(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    if l.arg.is_empty() {
        return Err(l.err("give a name: show NAME", l.off));
    }
    let name = l.arg.trim_matches('\'');
    let (kind, iri) = s
        .names
        .resolve(
            name,
            &[
                Kind::Class,
                Kind::Individual,
                Kind::ObjectProperty,
                Kind::DataProperty,
            ],
        )
        .map_err(|m| l.err(m, l.off))?;
    if !s.names.has(&iri, kind) {
        return Err(l.err(
            format!("unknown entity <{iri}>; it does not occur in the knowledge base"),
            l.off,
        ));
    }
    let t0 = Instant::now();
    let mut out = String::new();
    let _ = writeln!(out, "{} {}  <{iri}>", kind.word(), s.names.short(&iri));
    if let Some(props) = s.kb.annotations.get(&iri) {
        for (p, vs) in props {
            for v in vs {
                let lang = if v.lang.is_empty() {
                    String::new()
                } else {
                    format!("@{}", v.lang)
                };
                let _ = writeln!(out, "  {} \"{}\"{lang}", s.names.short(p), v.value);
            }
        }
    }
    match kind {
        Kind::Class => show_class(s, &iri, &mut out)?,
        Kind::Individual => show_individual(s, &iri, &mut out)?,
        Kind::ObjectProperty => show_property(s, &iri, &mut out),
        Kind::DataProperty => {}
    }
    // Usage: the axioms in force that mention the entity.
    let needle = format!("<{iri}>");
    let mut used: Vec<String> = Vec::new();
    let mut seen = std::collections::BTreeSet::new();
    for a in &s.kb.axioms {
        let t = &s.kb.sources[a.source].text;
        if t.contains(&needle) && seen.insert(a.source) {
            used.push(s.abbreviate(t));
        }
    }
    used.sort();
    let _ = writeln!(out, "  where it is used ({} axioms):", used.len());
    for u in used.iter().take(20) {
        let _ = writeln!(out, "    {u}");
    }
    if used.len() > 20 {
        let _ = writeln!(out, "    … and {} more", used.len() - 20);
    }
    if s.show_times {
        let _ = writeln!(out, " {}", ms(s, t0).trim());
    }
    Ok(out)
}

fn show_class(s: &mut Session, iri: &str, out: &mut String) -> Result<(), ShellError> {
    let kb = s.kb.clone();
    let Some(c) = kb.vocab.find_class(iri) else {
        let _ = writeln!(out, "  (built-in class)");
        return Ok(());
    };
    let Some(atom) = kb.concepts.find(&Concept::Atom(c)) else {
        return Ok(());
    };
    let mut told_sup = Vec::new();
    let mut told_sub = Vec::new();
    let mut told_eq = Vec::new();
    let mut told_dis = Vec::new();
    for a in &kb.axioms {
        match &a.axiom {
            Axiom::SubClass(x, y) if *x == atom => told_sup.push(manchester(s, &kb, *y)),
            Axiom::SubClass(x, y) if *y == atom => told_sub.push(manchester(s, &kb, *x)),
            Axiom::Equivalent(cs) if cs.contains(&atom) => told_eq.extend(
                cs.iter()
                    .filter(|&&x| x != atom)
                    .map(|&x| manchester(s, &kb, x)),
            ),
            Axiom::Disjoint(cs) if cs.contains(&atom) => told_dis.extend(
                cs.iter()
                    .filter(|&&x| x != atom)
                    .map(|&x| manchester(s, &kb, x)),
            ),
            Axiom::DisjointUnion(u, cs) if cs.contains(&atom) => {
                told_sup.push(manchester(s, &kb, *u));
                told_dis.extend(
                    cs.iter()
                        .filter(|&&x| x != atom)
                        .map(|&x| manchester(s, &kb, x)),
                );
            }
            _ => {}
        }
    }
    for v in [&mut told_sup, &mut told_sub, &mut told_eq, &mut told_dis] {
        v.sort();
        v.dedup();
    }
    let cl = s.classification()?;
    if !cl.consistent {
        let _ = writeln!(
            out,
            "  the knowledge base is INCONSISTENT: every class is unsatisfiable"
        );
    }
    let short = |k: ClassId| s.names.short(kb.vocab.class_iri(k));
    let sups: Vec<ClassId> = cl
        .subsumptions
        .iter()
        .filter(|p| p.0 == c)
        .map(|p| p.1)
        .collect();
    let subs: Vec<ClassId> = cl
        .subsumptions
        .iter()
        .filter(|p| p.1 == c)
        .map(|p| p.0)
        .collect();
    let eq: Vec<ClassId> = sups.iter().copied().filter(|x| subs.contains(x)).collect();
    let sorted = |v: Vec<ClassId>| {
        let mut n: Vec<String> = v.into_iter().map(short).collect();
        n.sort();
        n
    };
    let unsat = cl.unsatisfiable.contains(&c);
    // Our layout: the questions a knowledge engineer asks of a class, each answered by
    // what the ontology states (`·`) and what only follows by reasoning (`∴`).
    let _ = writeln!(out, "  (· stated in the ontology   ∴ follows by reasoning)");
    if unsat {
        let _ = writeln!(
            out,
            "  it can have no members: the class is unsatisfiable (the same as owl:Nothing)"
        );
    }
    let inferred_sups = sorted(sups.iter().copied().filter(|x| !eq.contains(x)).collect());
    let inferred_subs = sorted(subs.iter().copied().filter(|x| !eq.contains(x)).collect());
    answer(out, "what it is", &told_sup, &inferred_sups);
    answer(out, "defined as / same as", &told_eq, &sorted(eq));
    answer(out, "what falls under it", &told_sub, &inferred_subs);
    // Inferred disjoints: satisfiable named classes D with C ⊑ ¬D (one test each).
    let mut never: Vec<String> = Vec::new();
    let mut skipped = false;
    if cl.consistent && !unsat {
        let classes = kb.signature_classes.clone();
        if classes.len() <= 2000 {
            let mut r = s.reasoner()?;
            let mut dis = Vec::new();
            for d in classes {
                if d == c || cl.unsatisfiable.contains(&d) {
                    continue;
                }
                let da = r.concepts_mut().atom(d);
                let nd = r.concepts_mut().not(da);
                match r.is_subsumed(atom, nd) {
                    Answer::Yes => dis.push(d),
                    Answer::No => {}
                    Answer::Unknown(l) => {
                        return Err(ShellError::new(format!("stopped: {l}")));
                    }
                }
            }
            never = sorted(dis);
        } else {
            skipped = true;
        }
    }
    answer(out, "never together with", &told_dis, &never);
    if skipped {
        let _ = writeln!(
            out,
            "    (what follows was not computed: more than 2000 classes)"
        );
    }
    Ok(())
}

fn show_individual(s: &mut Session, iri: &str, out: &mut String) -> Result<(), ShellError> {
    let kb = s.kb.clone();
    let Some(a) = kb.vocab.find_individual(iri) else {
        return Ok(());
    };
    let deg = |src: usize| {
        let d = source_degree(&kb, src);
        if d < 1.0 {
            format!(" (degree {d:.2})")
        } else {
            String::new()
        }
    };
    let mut types = Vec::new();
    let mut rels = Vec::new();
    for ax in &kb.axioms {
        match &ax.axiom {
            Axiom::ClassAssertion(c, x) if *x == a => {
                types.push(format!("{}{}", manchester(s, &kb, *c), deg(ax.source)))
            }
            Axiom::RoleAssertion(r, x, y) if *x == a || *y == a => {
                let (x, y) = if r.is_inverse() { (*y, *x) } else { (*x, *y) };
                rels.push(format!(
                    "{} {} {}{}",
                    s.names.short(kb.vocab.individual_iri(x)),
                    s.names.short(kb.vocab.prop_iri(r.prop())),
                    s.names.short(kb.vocab.individual_iri(y)),
                    deg(ax.source)
                ))
            }
            Axiom::NegativeRoleAssertion(r, x, y) if *x == a || *y == a => rels.push(format!(
                "not {} {} {}",
                s.names.short(kb.vocab.individual_iri(*x)),
                s.names.short(kb.vocab.prop_iri(r.prop())),
                s.names.short(kb.vocab.individual_iri(*y)),
            )),
            _ => {}
        }
    }
    types.sort();
    types.dedup();
    rels.sort();
    rels.dedup();
    let _ = writeln!(out, "  told types: {}", names_list(types));
    let rz = s.realisation()?;
    let inferred: Vec<String> = rz
        .iter()
        .filter(|(x, _)| *x == a)
        .flat_map(|(_, cs)| cs.iter().map(|&c| s.names.short(kb.vocab.class_iri(c))))
        .collect();
    let _ = writeln!(
        out,
        "  inferred types (most specific): {}",
        names_list(inferred)
    );
    let _ = writeln!(out, "  relations:");
    if rels.is_empty() {
        let _ = writeln!(out, "    (none)");
    }
    for r in rels {
        let _ = writeln!(out, "    {r}");
    }
    Ok(())
}

fn show_property(s: &Session, iri: &str, out: &mut String) {
    let kb = &s.kb;
    let Some(p) = kb.vocab.find_prop(iri) else {
        return;
    };
    let role = |r: RoleId| {
        let n = s.names.short(kb.vocab.prop_iri(r.prop()));
        if r.is_inverse() {
            format!("inverse {n}")
        } else {
            n
        }
    };
    let (mut sup, mut sub, mut dom, mut range, mut traits) =
        (Vec::new(), Vec::new(), Vec::new(), Vec::new(), Vec::new());
    for a in &kb.axioms {
        match &a.axiom {
            Axiom::SubRole(x, y) if x.prop() == p && !x.is_inverse() && y.prop() != p => {
                sup.push(role(*y))
            }
            Axiom::SubRole(x, y) if y.prop() == p && !y.is_inverse() && x.prop() != p => {
                sub.push(role(*x))
            }
            Axiom::SubRole(x, y) if x.prop() == p && y.prop() == p && x != y => {
                traits.push("symmetric".to_string())
            }
            Axiom::Domain(r, c) if r.prop() == p => {
                let c = manchester(s, kb, *c);
                if r.is_inverse() {
                    range.push(c)
                } else {
                    dom.push(c)
                }
            }
            Axiom::Transitive(r) if r.prop() == p => traits.push("transitive".into()),
            Axiom::Functional(r) if r.prop() == p => traits.push(if r.is_inverse() {
                "inverse functional".into()
            } else {
                "functional".into()
            }),
            _ => {}
        }
    }
    for v in [&mut sup, &mut sub, &mut dom, &mut range, &mut traits] {
        v.sort();
        v.dedup();
    }
    let _ = writeln!(out, "  told superproperties: {}", names_list(sup));
    let _ = writeln!(out, "  told subproperties: {}", names_list(sub));
    let _ = writeln!(out, "  domain: {}", names_list(dom));
    let _ = writeln!(out, "  range: {}", names_list(range));
    let _ = writeln!(out, "  characteristics: {}", names_list(traits));
}

/// Reads an axiom for `add` or `retract` into functional syntax.
fn axioms_of(s: &Session, l: &Line, allow_new: bool) -> Result<String, ShellError> {
    match read_input(s, l, l.arg, l.off, allow_new)? {
        Input::Axioms(a) => Ok(a),
        Input::Class(_) => Err(l.err(
            "expected an axiom (A SubClassOf B, a Type C, a p b, or functional syntax), not a class expression",
            l.off,
        )),
    }
}

fn add(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let functional = axioms_of(s, l, true)?;
    // Check it on a copy first so that errors point at the input and change nothing.
    let mut scratch = s.kb.clone();
    let range = load_text(s, &mut scratch, l, &functional, l.arg, l.off, true)?;
    if range.is_empty()
        && !functional.contains("Declaration")
        && !functional.contains("AnnotationAssertion")
    {
        return Err(l.err("no axiom found; write one axiom", l.off));
    }
    if let Err(r) = Reasoner::new(&scratch) {
        return Err(l.err(
            format!("not added: unsupported construct: {}", r.reason),
            l.off,
        ));
    }
    let edit = Edit::Add {
        shown: l.arg.to_string(),
        functional: format!("{}{functional}", s.prefix_block()),
    };
    let note = apply(&mut s.kb.clone(), &edit).ok().flatten();
    s.edits.push(edit);
    if let Err(e) = s.rebuild() {
        s.edits.pop();
        let _ = s.rebuild();
        return Err(e);
    }
    s.undone.clear();
    let texts: Vec<String> = range
        .map(|i| s.abbreviate(&scratch.sources[scratch.axioms[i].source].text))
        .collect::<std::collections::BTreeSet<_>>()
        .into_iter()
        .collect();
    let mut out = format!("added (edit {}): {}\n", s.edits.len(), texts.join("; "));
    if let Some(n) = note {
        let _ = writeln!(out, "  note: {n}");
    }
    Ok(out)
}

fn retract(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let functional = axioms_of(s, l, false)?;
    let mut scratch = KnowledgeBase::new();
    let range = load_text(s, &mut scratch, l, &functional, l.arg, l.off, true)?;
    let mut texts: Vec<String> = range
        .map(|i| scratch.sources[scratch.axioms[i].source].text.clone())
        .collect();
    texts.dedup();
    if texts.len() != 1 {
        return Err(l.err("retract one axiom at a time", l.off));
    }
    let text = texts.remove(0);
    let held =
        s.kb.axioms
            .iter()
            .any(|a| s.kb.sources[a.source].text == text);
    if !held {
        return Err(l.err(
            format!(
                "not in the knowledge base: {}; `show` an entity to see its axioms as written",
                s.abbreviate(&text)
            ),
            l.off,
        ));
    }
    let file =
        s.kb.axioms
            .iter()
            .find(|a| s.kb.sources[a.source].text == text)
            .map(|a| s.kb.sources[a.source].file.clone())
            .unwrap_or_default();
    s.edits.push(Edit::Retract {
        shown: l.arg.to_string(),
        text: text.clone(),
    });
    if let Err(e) = s.rebuild() {
        s.edits.pop();
        let _ = s.rebuild();
        return Err(e);
    }
    s.undone.clear();
    Ok(format!(
        "retracted (edit {}): {} (from {file})\n",
        s.edits.len(),
        s.abbreviate(&text)
    ))
}

fn undo(s: &mut Session, back: bool) -> Result<String, ShellError> {
    let (from, to) = if back {
        (&mut s.edits, &mut s.undone)
    } else {
        (&mut s.undone, &mut s.edits)
    };
    let Some(e) = from.pop() else {
        return Err(ShellError::new(if back {
            "nothing to undo"
        } else {
            "nothing to redo"
        }));
    };
    let d = e.describe();
    to.push(e);
    if let Err(err) = s.rebuild() {
        // Put it back where it was.
        let (from, to) = if back {
            (&mut s.edits, &mut s.undone)
        } else {
            (&mut s.undone, &mut s.edits)
        };
        if let Some(e) = to.pop() {
            from.push(e);
        }
        let _ = s.rebuild();
        return Err(err);
    }
    Ok(format!("{} {d}\n", if back { "undid:" } else { "redid:" }))
}

/// A question loaded into a copy of the session's KB: the copy, its axioms before the
/// question, and the targets.
fn question(
    s: &Session,
    l: &Line,
    text: &str,
    off: usize,
) -> Result<(KnowledgeBase, usize, Vec<Target>, bool), ShellError> {
    let input = read_input(s, l, text, off, false)?;
    let (functional, is_class) = match input {
        Input::Axioms(a) => (a, false),
        Input::Class(c) => (format!("SubClassOf({c} owl:Nothing)"), true),
    };
    let mut kb = s.kb.clone();
    let n = kb.axioms.len();
    let range = load_text(s, &mut kb, l, &functional, text, off, false)?;
    let ts = targets_of(&kb, range).map_err(|m| l.err(m, off))?;
    Ok((kb, n, ts, is_class))
}

fn ask(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let t0 = Instant::now();
    if l.arg.is_empty() {
        let mut r = s.reasoner()?;
        let a = r.is_consistent();
        return Ok(format!("consistent: {}{}\n", answer_word(a), ms(s, t0)));
    }
    let (kb, n, ts, is_class) = question(s, l, l.arg, l.off)?;
    let mask: Vec<bool> = (0..kb.axioms.len()).map(|i| i < n).collect();
    let mut r = Reasoner::with_axioms(&kb, Some(&mask), &[])
        .map_err(|r| l.err(format!("unsupported construct: {}", r.reason), l.off))?;
    r.limits = s.limits();
    let a = all_entailed(&mut r, &ts);
    Ok(if is_class {
        let sat = match a {
            Answer::Yes => Answer::No,
            Answer::No => Answer::Yes,
            u => u,
        };
        format!("satisfiable: {}{}\n", answer_word(sat), ms(s, t0))
    } else {
        format!("{}{}\n", answer_word(a), ms(s, t0))
    })
}

fn explain_cmd(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let (positional, opts) = options(
        l,
        &[
            "observations",
            "facts",
            "abducibles",
            "max-size",
            "max-nodes",
            "alpha",
        ],
        &[],
    )?;
    let mut eo = ExplainOptions::default();
    let mut obs_file = None;
    let mut facts_file = None;
    let mut abducibles = None;
    for (name, v, at) in &opts {
        match name.as_str() {
            "observations" => obs_file = Some(PathBuf::from(v)),
            "facts" => facts_file = Some((PathBuf::from(v), *at)),
            "abducibles" => abducibles = Some(PathBuf::from(v)),
            "max-size" => eo.max_size = number(l, v, *at, "a whole number")?,
            "max-nodes" => eo.max_tree_nodes = number(l, v, *at, "a whole number")?,
            "alpha" => {
                eo.alpha = number(l, v, *at, "a number")?;
                if !(eo.alpha > 0.0 && eo.alpha <= 1.0) {
                    return Err(l.err(format!("--alpha {v} must lie in (0, 1]"), *at));
                }
            }
            _ => {}
        }
    }
    eo.limits = s.limits();
    let t0 = Instant::now();
    let mut functional = String::new();
    if !positional.is_empty() {
        let mut at = l.off;
        for part in positional.split(';') {
            let lead = part.len() - part.trim_start().len();
            let text = part.trim();
            if !text.is_empty() {
                match read_input(s, l, text, at + lead, false)? {
                    Input::Axioms(a) => {
                        functional.push_str(&a);
                        functional.push('\n');
                    }
                    Input::Class(_) => {
                        return Err(l.err(
                            "an observation is an assertion: a Type C or a p b",
                            at + lead,
                        ));
                    }
                }
                // Check the names now, so that the error points at them.
                let mut scratch = s.kb.clone();
                load_text(s, &mut scratch, l, &functional, text, at + lead, false)?;
            }
            at += part.len() + 1;
        }
    }
    let facts_read;
    let facts_name;
    let prefixed = format!("{}{functional}", s.prefix_block());
    let source = if !functional.is_empty() {
        ObservationSource::Text("input", &prefixed)
    } else if let Some(p) = &obs_file {
        ObservationSource::File(p)
    } else if let Some((p, at)) = &facts_file {
        facts_read = crate::facts::read_facts(p).map_err(|m| l.err(m, *at))?;
        facts_name = p.display().to_string();
        ObservationSource::Facts(&facts_read, &facts_name)
    } else if let Some((p, f)) = &s.observations {
        facts_name = p.display().to_string();
        ObservationSource::Facts(f, &facts_name)
    } else {
        return Err(l.err(
            "no observations: give assertions (explain a Type C; b p c), --observations FILE or --facts FILE, or `import FACTS.json as observations`",
            l.off,
        ));
    };
    let (problem, warnings) = build_problem(&s.kb, source, abducibles.as_deref(), &s.load)
        .map_err(|m| l.err(m, l.off))?;
    let result = explain(&problem, &eo).map_err(|r| {
        ShellError::new(crate::render::text::refusal_message(
            &problem.kb,
            &r,
            &s.files,
        ))
    })?;
    let mut out = String::new();
    for w in warnings {
        let _ = writeln!(out, "warning: {w}");
    }
    out.push_str(&s.abbreviate(&crate::render::text::result_text(&problem, &result)));
    if let Some(lim) = result.limit {
        let _ = writeln!(out, "stopped early: {lim}; the list may be incomplete");
    }
    let _ = writeln!(
        out,
        "{} explanation(s){}",
        result.explanations.len(),
        ms(s, t0)
    );
    Ok(out)
}

fn why(s: &mut Session, l: &Line, justifications: bool) -> Result<String, ShellError> {
    let t0 = Instant::now();
    let limits = s.limits();
    let max_nodes = 2_000;
    let (kb, n, targets, listing) = if l.arg.is_empty() {
        (s.kb.clone(), s.kb.axioms.len(), vec![], true)
    } else if l.arg == "inconsistent" {
        (
            s.kb.clone(),
            s.kb.axioms.len(),
            vec![(
                "the knowledge base is inconsistent".to_string(),
                vec![Target::Inconsistent],
            )],
            false,
        )
    } else if let Some(rest) = l.arg.strip_prefix("unsat ") {
        let at = l.off + l.arg.len() - rest.len();
        let name = rest.trim().trim_matches('\'');
        let (_, iri) = s
            .names
            .resolve(name, &[Kind::Class])
            .map_err(|m| l.err(m, at))?;
        let Some(c) = s.kb.vocab.find_class(&iri) else {
            return Err(l.err(format!("unknown class <{iri}>"), at));
        };
        let mut kb = s.kb.clone();
        let a = kb.concepts.atom(c);
        let n = kb.axioms.len();
        (
            kb,
            n,
            vec![(
                format!("unsatisfiable {}", s.names.short(&iri)),
                vec![Target::Unsat(a)],
            )],
            false,
        )
    } else {
        let (kb, n, ts, is_class) = question(s, l, l.arg, l.off)?;
        let name = if is_class {
            format!("unsatisfiable {}", l.arg)
        } else {
            l.arg.to_string()
        };
        (kb, n, vec![(name, ts)], false)
    };
    let items = Items::new(&kb, n);
    let report: WhyReport = why_report(&kb, &items, targets, &limits, max_nodes);
    let name = |iri: &str| s.names.short(iri);
    let mut out = s.abbreviate(&why_text(
        &kb,
        &report,
        listing,
        justifications,
        !justifications,
        &name,
    ));
    if report.incomplete() {
        let _ = writeln!(
            out,
            "INCOMPLETE: a limit stopped the search; more may exist"
        );
    }
    let _ = writeln!(out, "done{}", ms(s, t0));
    Ok(out)
}

fn tree(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let t0 = Instant::now();
    let cl = s.classification()?;
    let classes = s.kb.signature_classes.clone();
    let text = if l.arg.is_empty() {
        classification_text(&s.kb, &cl, &classes)
    } else {
        let (_, iri) = s
            .names
            .resolve(l.arg.trim_matches('\''), &[Kind::Class])
            .map_err(|m| l.err(m, l.off))?;
        let Some(c) = s.kb.vocab.find_class(&iri) else {
            return Err(l.err(format!("unknown class <{iri}>"), l.off));
        };
        let mut under: Vec<ClassId> = vec![c];
        under.extend(cl.subsumptions.iter().filter(|p| p.1 == c).map(|p| p.0));
        under.sort();
        under.dedup();
        let part = Classification {
            consistent: cl.consistent,
            unsatisfiable: cl
                .unsatisfiable
                .iter()
                .copied()
                .filter(|x| under.contains(x))
                .collect(),
            subsumptions: cl
                .subsumptions
                .iter()
                .copied()
                .filter(|(a, b)| under.contains(a) && under.contains(b))
                .collect(),
        };
        classification_text(&s.kb, &part, &under)
    };
    Ok(format!("{text}({} classes){}\n", classes.len(), ms(s, t0)))
}

fn unsat(s: &mut Session) -> Result<String, ShellError> {
    let t0 = Instant::now();
    let cl = s.classification()?;
    if !cl.consistent {
        return Ok(format!(
            "the knowledge base is INCONSISTENT: every class is unsatisfiable (why inconsistent){}\n",
            ms(s, t0)
        ));
    }
    let mut names: Vec<String> = cl
        .unsatisfiable
        .iter()
        .map(|&c| s.names.short(s.kb.vocab.class_iri(c)))
        .collect();
    names.sort();
    Ok(if names.is_empty() {
        format!("no unsatisfiable class{}\n", ms(s, t0))
    } else {
        format!(
            "{} unsatisfiable: {}{}\n",
            names.len(),
            names.join(", "),
            ms(s, t0)
        )
    })
}

fn import(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let (positional, opts) = options(l, &["alpha"], &[])?;
    let sub = Line {
        full: l.full,
        word: l.word,
        arg: positional,
        off: l.off,
    };
    let ws = words(&sub)?;
    let (Some((path, pat)), Some((as_word, aat)), Some((mode, mat))) =
        (ws.first(), ws.get(1), ws.get(2))
    else {
        return Err(l.err(
            "write: import FACTS.json as observations, or import FACTS.json as background",
            l.off,
        ));
    };
    if as_word != "as" {
        return Err(l.err("expected `as observations` or `as background`", *aat));
    }
    let mut alpha = 0.5;
    for (name, v, at) in &opts {
        if name == "alpha" {
            alpha = number(l, v, *at, "a number")?;
            if !(alpha > 0.0 && alpha <= 1.0) {
                return Err(l.err(format!("--alpha {v} must lie in (0, 1]"), *at));
            }
        }
    }
    let p = PathBuf::from(path);
    let facts = crate::facts::read_facts(&p).map_err(|m| l.err(m, *pat))?;
    match mode.as_str() {
        "observations" => {
            let n = facts.individuals.len();
            s.observations = Some((p.clone(), facts));
            Ok(format!(
                "observations: {} ({n} regions); `explain` explains its findings\n",
                p.display()
            ))
        }
        "background" => {
            // The assertions as they will be saved: the source texts with their degrees.
            let mut probe = s.kb.clone();
            let first_source = probe.sources.len();
            let first_axiom = probe.axioms.len();
            let edit = Edit::Facts {
                path: p.clone(),
                facts: Box::new(facts.clone()),
                alpha,
                functional: String::new(),
            };
            apply(&mut probe, &edit).map_err(|m| l.err(m, *pat))?;
            let mut functional = String::new();
            let mut kept = std::collections::BTreeSet::new();
            for a in &probe.axioms[first_axiom..] {
                kept.insert(a.source);
            }
            for src in first_source..probe.sources.len() {
                if !kept.contains(&src) {
                    continue;
                }
                let t = &probe.sources[src].text;
                let d = source_degree(&probe, src);
                if let Some(open) = t.find('(') {
                    let _ = writeln!(
                        functional,
                        "{}(Annotation(<{}degree> \"{d}\"^^<http://www.w3.org/2001/XMLSchema#decimal>) {}",
                        &t[..open],
                        crate::explain::WF,
                        &t[open + 1..]
                    );
                }
            }
            let n = kept.len();
            s.edits.push(Edit::Facts {
                path: p.clone(),
                facts: Box::new(facts),
                alpha,
                functional,
            });
            if let Err(e) = s.rebuild() {
                s.edits.pop();
                let _ = s.rebuild();
                return Err(e);
            }
            s.undone.clear();
            Ok(format!(
                "imported {} as background (edit {}): {n} assertions at alpha {alpha}\n",
                p.display(),
                s.edits.len()
            ))
        }
        other => Err(l.err(
            format!("unknown mode `{other}`; use `as observations` or `as background`"),
            *mat,
        )),
    }
}

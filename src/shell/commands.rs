//! The shell's commands: one function each, returning text.

use super::names::{Kind, fragment};
use super::syntax::{self, Statement};
use super::{Edit, Session, ShellError, apply, same_file, source_degree};
use crate::explain::case::{ObservationSource, build_problem};
use crate::explain::why::{Items, Target, all_entailed, targets_of};
use crate::explain::why::{WhyReport, why_report};
use crate::explain::{ExplainOptions, explain};
use crate::kb::load;
use crate::kb::{ClassId, Concept, ConceptId, KbError, KnowledgeBase, RoleId};
use crate::reasoner::{Answer, Classification, Reasoner, classify, realise};
use crate::render::text::{classification_text, why_text};
use std::fmt::Write;
use std::ops::Range;
use std::path::PathBuf;
use std::time::Instant;

mod input;
mod reason;
mod show;

use input::{load_text, read_input};
use reason::{ask, explain_cmd, tree, unsat, why};

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
        "show" => show::show(s, &l),
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

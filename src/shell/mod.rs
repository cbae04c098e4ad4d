//! The knowledge engineer's shell: a session that keeps the knowledge base and its reasoning
//! warm between questions, a command grammar, and one function per command that returns
//! text, so that scripted sessions and tests need no terminal. The terminal loop itself
//! (rustyline: history, completion, multi-line input, Ctrl-C) lives in `cli/shell.rs`.
//!
//! The session's knowledge base is always the loaded files plus the session's own edits,
//! applied in order; undo and redo move edits between two stacks and rebuild it, and a
//! reload re-reads the files and applies the edits again.

mod commands;
mod save;

/// Entity look-up by short name, and the typed-input syntax that uses it; both live in `kb`
/// so that the command line and `check` read the same names.
pub use crate::kb::{names, syntax};
pub use commands::{COMMANDS, help_text};

use crate::facts::Facts;
use crate::kb::load::{self, LoadOptions};
use crate::kb::{ClassId, IndividualId, KnowledgeBase};
use crate::reasoner::{Classification, Limits, Reasoner};
use names::EntityIndex;
use std::path::{Path, PathBuf};
use std::sync::Arc;
use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant, SystemTime};

/// An error of a command: what went wrong and, for bad input, where.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ShellError {
    /// What happened and what to do.
    pub message: String,
    /// The command line and the byte offset of the offending token, when known.
    pub at: Option<(String, usize)>,
}

impl ShellError {
    /// An error without a position.
    pub fn new(message: impl Into<String>) -> Self {
        ShellError {
            message: message.into(),
            at: None,
        }
    }

    /// An error pointing at byte `offset` of `line`.
    pub fn at(message: impl Into<String>, line: &str, offset: usize) -> Self {
        let mut o = offset.min(line.len());
        while !line.is_char_boundary(o) {
            o -= 1;
        }
        ShellError {
            message: message.into(),
            at: Some((line.to_string(), o)),
        }
    }
}

impl std::fmt::Display for ShellError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        if let Some((line, offset)) = &self.at {
            // The caret goes under the offending character: count characters, not bytes.
            let first_line_end = line.find('\n').unwrap_or(line.len());
            let (shown, col) = if *offset <= first_line_end {
                (&line[..first_line_end], line[..*offset].chars().count())
            } else {
                let start = line[..*offset].rfind('\n').map(|p| p + 1).unwrap_or(0);
                let end = line[start..]
                    .find('\n')
                    .map(|p| start + p)
                    .unwrap_or(line.len());
                (&line[start..end], line[start..*offset].chars().count())
            };
            writeln!(f, "  {shown}")?;
            writeln!(f, "  {}^", " ".repeat(col))?;
            write!(f, "error (column {}): {}", col + 1, self.message)
        } else {
            write!(f, "error: {}", self.message)
        }
    }
}

/// One of the session's own changes to the knowledge base.
#[derive(Clone, Debug)]
pub enum Edit {
    /// Axioms added.
    Add {
        /// As the user wrote them.
        shown: String,
        /// In functional syntax with full IRIs (`Prefix` lines may precede them).
        functional: String,
    },
    /// An axiom retracted, as its source text reads (full IRIs).
    Retract {
        /// As the user wrote it.
        shown: String,
        /// The source text matched.
        text: String,
    },
    /// A facts file added as background assertions (its α-cut).
    Facts {
        /// The file.
        path: PathBuf,
        /// Its content as read.
        facts: Box<Facts>,
        /// The α-cut applied.
        alpha: f64,
        /// The assertions added, in functional syntax with their degrees (for saving).
        functional: String,
    },
}

impl Edit {
    /// The edit in one line.
    pub fn describe(&self) -> String {
        match self {
            Edit::Add { shown, .. } => format!("add {shown}"),
            Edit::Retract { shown, .. } => format!("retract {shown}"),
            Edit::Facts { path, alpha, .. } => {
                format!("import {} as background (alpha {alpha})", path.display())
            }
        }
    }
}

/// A loaded document: its path, the text read and its modification time.
#[derive(Clone, Debug)]
struct Document {
    path: PathBuf,
    text: String,
    modified: Option<SystemTime>,
}

/// Results kept until the knowledge base changes.
#[derive(Clone, Debug, Default)]
struct Cache {
    classification: Option<Classification>,
    realisation: Option<Vec<(IndividualId, Vec<ClassId>)>>,
}

/// A question to the user that is answered yes or no.
pub type Confirm = Box<dyn FnMut(&str) -> bool>;

/// The state of one shell session.
pub struct Session {
    files: Vec<PathBuf>,
    load: LoadOptions,
    base: KnowledgeBase,
    documents: Vec<Document>,
    prefixes: Vec<(String, String)>,
    edits: Vec<Edit>,
    undone: Vec<Edit>,
    kb: KnowledgeBase,
    names: EntityIndex,
    cache: Cache,
    observations: Option<(PathBuf, Facts)>,
    saved_edits: Vec<String>,
    /// Time limit for one command's reasoning.
    pub timeout: Option<Duration>,
    /// Largest number of completion-graph nodes in one test.
    pub max_graph_nodes: usize,
    /// Set from another thread (Ctrl-C) to cancel the reasoning under way.
    pub cancel: Arc<AtomicBool>,
    /// Asks the user to confirm (overwriting a loaded file); `None` means no one can answer.
    pub confirm: Option<Confirm>,
    /// Whether to print how long reasoning took.
    pub show_times: bool,
    quit: bool,
}

use names::standard_prefixes;

impl Default for Session {
    fn default() -> Self {
        Self::new(LoadOptions::default())
    }
}

impl Session {
    /// An empty session.
    pub fn new(load: LoadOptions) -> Self {
        let prefixes = standard_prefixes();
        Session {
            files: Vec::new(),
            load,
            base: KnowledgeBase::new(),
            documents: Vec::new(),
            names: EntityIndex::new(&KnowledgeBase::new(), prefixes.clone()),
            prefixes,
            edits: Vec::new(),
            undone: Vec::new(),
            kb: KnowledgeBase::new(),
            cache: Cache::default(),
            observations: None,
            saved_edits: Vec::new(),
            timeout: None,
            max_graph_nodes: 1_000_000,
            cancel: Arc::new(AtomicBool::new(false)),
            confirm: None,
            show_times: true,
            quit: false,
        }
    }

    /// The session's knowledge base (files plus edits).
    pub fn kb(&self) -> &KnowledgeBase {
        &self.kb
    }

    /// The entity index (for completion).
    pub fn names(&self) -> &EntityIndex {
        &self.names
    }

    /// The session's edits, oldest first.
    pub fn edits(&self) -> &[Edit] {
        &self.edits
    }

    /// Whether the edits differ from those last saved.
    pub fn unsaved(&self) -> bool {
        self.edits.len() != self.saved_edits.len()
            || self
                .edits
                .iter()
                .zip(&self.saved_edits)
                .any(|(e, s)| e.describe() != *s)
    }

    /// Records the current edits as saved.
    fn mark_saved(&mut self) {
        self.saved_edits = self.edits.iter().map(|e| e.describe()).collect();
    }

    /// Whether `quit` was given.
    pub fn wants_quit(&self) -> bool {
        self.quit
    }

    /// The knowledge base's name: the first file's name without its extension.
    pub fn name(&self) -> String {
        self.files
            .first()
            .and_then(|f| f.file_stem())
            .map(|s| s.to_string_lossy().to_string())
            .unwrap_or_else(|| "(empty)".into())
    }

    /// The prompt: the KB's name, `*` when there are unsaved edits.
    pub fn prompt(&self) -> String {
        format!("{}{}> ", self.name(), if self.unsaved() { "*" } else { "" })
    }

    /// Loads files into the session (their imports too) and rebuilds the KB.
    pub fn load_files(&mut self, paths: &[PathBuf]) -> Result<String, ShellError> {
        let mut files = self.files.clone();
        for p in paths {
            if !files.contains(p) {
                files.push(p.clone());
            }
        }
        let before = self.kb.sources.len();
        self.set_files(files)?;
        Ok(format!(
            "loaded {}: {} axioms, {} classes, {} individuals (session total {} → {} source axioms)",
            paths
                .iter()
                .map(|p| p.display().to_string())
                .collect::<Vec<_>>()
                .join(", "),
            self.base.sources.len(),
            self.kb.vocab.classes.len(),
            self.kb
                .vocab
                .individuals
                .iter()
                .filter(|i| !i.starts_with("_:"))
                .count(),
            before,
            self.kb.sources.len()
        ))
    }

    /// Replaces the list of files, reloading them; on error nothing changes.
    fn set_files(&mut self, files: Vec<PathBuf>) -> Result<Vec<String>, ShellError> {
        let base = load::load(&files, &self.load).map_err(|e| ShellError::new(e.to_string()))?;
        let mut documents = Vec::new();
        for f in &base.files {
            let path = PathBuf::from(f);
            let text = std::fs::read_to_string(&path).unwrap_or_default();
            let modified = std::fs::metadata(&path).and_then(|m| m.modified()).ok();
            documents.push(Document {
                path,
                text,
                modified,
            });
        }
        let prefixes = names::prefixes_of(documents.iter().map(|d| d.text.as_str()));
        let old = (
            std::mem::replace(&mut self.base, base),
            std::mem::replace(&mut self.documents, documents),
            std::mem::replace(&mut self.prefixes, prefixes),
            std::mem::replace(&mut self.files, files),
        );
        match self.rebuild() {
            Ok(notes) => {
                for w in &self.base.warnings {
                    eprintln!("warning: {w}");
                }
                Ok(notes)
            }
            Err(e) => {
                self.base = old.0;
                self.documents = old.1;
                self.prefixes = old.2;
                self.files = old.3;
                let _ = self.rebuild();
                Err(e)
            }
        }
    }

    /// Rebuilds the KB from the base and the edits. Edits that no longer apply are dropped
    /// and reported; a KB the reasoner refuses is an error.
    fn rebuild(&mut self) -> Result<Vec<String>, ShellError> {
        let mut kb = self.base.clone();
        let mut notes = Vec::new();
        let mut kept = Vec::new();
        for (n, e) in self.edits.iter().enumerate() {
            match apply(&mut kb, e) {
                Ok(Some(note)) => {
                    notes.push(format!("edit {} ({}): {note}", n + 1, e.describe()));
                    kept.push(e.clone());
                }
                Ok(None) => kept.push(e.clone()),
                Err(msg) => notes.push(format!(
                    "edit {} ({}) no longer applies and was dropped: {msg}",
                    n + 1,
                    e.describe()
                )),
            }
        }
        kb.signature_classes = (0..kb.vocab.classes.len() as u32).map(ClassId).collect();
        if let Err(r) = Reasoner::new(&kb) {
            let files: Vec<PathBuf> = self.files.clone();
            return Err(ShellError::new(crate::render::text::refusal_message(
                &kb, &r, &files,
            )));
        }
        self.edits = kept;
        self.names = EntityIndex::new(&kb, self.prefixes.clone());
        self.kb = kb;
        self.cache = Cache::default();
        Ok(notes)
    }

    /// Limits for one command, with the session's cancel flag.
    pub fn limits(&self) -> Limits {
        self.cancel
            .store(false, std::sync::atomic::Ordering::SeqCst);
        Limits {
            deadline: self.timeout.map(|t| Instant::now() + t),
            max_nodes: self.max_graph_nodes,
            cancel: Some(self.cancel.clone()),
        }
    }

    /// A reasoner over the session's KB (always supported: edits that would make it
    /// unsupported are refused).
    fn reasoner(&self) -> Result<Reasoner<'_>, ShellError> {
        let mut r = Reasoner::new(&self.kb).map_err(|r| {
            ShellError::new(crate::render::text::refusal_message(
                &self.kb,
                &r,
                &self.files,
            ))
        })?;
        r.limits = self.limits();
        Ok(r)
    }

    /// Runs one command line and returns its output.
    pub fn execute(&mut self, line: &str) -> Result<String, ShellError> {
        commands::execute(self, line)
    }

    /// Prefix declarations for functional-syntax input.
    fn prefix_block(&self) -> String {
        self.prefixes
            .iter()
            .map(|(p, iri)| format!("Prefix({p}:=<{iri}>)\n"))
            .collect()
    }

    /// Writes every `<IRI>` of a text in its short form.
    pub fn abbreviate(&self, text: &str) -> String {
        let mut out = String::with_capacity(text.len());
        let mut rest = text;
        while let Some(i) = rest.find('<') {
            out.push_str(&rest[..i]);
            let after = &rest[i + 1..];
            match after.find('>') {
                Some(j) if !after[..j].contains(char::is_whitespace) && j > 0 => {
                    out.push_str(&self.names.short(&after[..j]));
                    rest = &after[j + 1..];
                }
                _ => {
                    out.push('<');
                    rest = after;
                }
            }
        }
        out.push_str(rest);
        out
    }

    /// The logical axioms (source texts of axioms still in force) and annotation triples of
    /// the session's KB, for comparing with a saved file.
    pub fn axiom_set(kb: &KnowledgeBase) -> std::collections::BTreeSet<String> {
        let mut s = std::collections::BTreeSet::new();
        for a in &kb.axioms {
            s.insert(kb.sources[a.source].text.clone());
        }
        for (subject, props) in &kb.annotations {
            for (p, vs) in props {
                for v in vs {
                    s.insert(format!(
                        "AnnotationAssertion(<{p}> <{subject}> {:?}@{})",
                        v.value, v.lang
                    ));
                }
            }
        }
        s
    }

    fn documents_changed(&self) -> Vec<PathBuf> {
        self.documents
            .iter()
            .filter(|d| {
                let now = std::fs::metadata(&d.path).and_then(|m| m.modified()).ok();
                now != d.modified
                    || std::fs::read_to_string(&d.path).ok().as_deref() != Some(d.text.as_str())
            })
            .map(|d| d.path.clone())
            .collect()
    }
}

/// Applies one edit to a KB; returns a note for the user when the edit changed nothing.
fn apply(kb: &mut KnowledgeBase, e: &Edit) -> Result<Option<String>, String> {
    match e {
        Edit::Add { functional, .. } => {
            let before: std::collections::BTreeSet<String> = kb
                .axioms
                .iter()
                .map(|a| kb.sources[a.source].text.clone())
                .collect();
            let range =
                load::load_axioms_text(kb, "session", functional).map_err(|e| e.to_string())?;
            let all_known = range
                .clone()
                .all(|i| before.contains(&kb.sources[kb.axioms[i].source].text));
            Ok((all_known && !range.is_empty())
                .then(|| "the knowledge base already had this axiom".to_string()))
        }
        Edit::Retract { text, .. } => {
            let n = kb.axioms.len();
            let sources = &kb.sources;
            kb.axioms.retain(|a| sources[a.source].text != *text);
            Ok((kb.axioms.len() == n)
                .then(|| "the axiom is no longer in the knowledge base; nothing to retract".into()))
        }
        Edit::Facts {
            path, facts, alpha, ..
        } => {
            let first = kb.axioms.len();
            let abox = crate::facts::abox::add_facts(kb, facts, &path.display().to_string());
            // The α-cut: graded assertions below α are left out (Straccia 2001).
            let mut i = 0;
            kb.axioms.retain(|_| {
                let keep = i < first || abox.degrees.get(i - first).is_none_or(|d| *d >= *alpha);
                i += 1;
                keep
            });
            Ok(None)
        }
    }
}

/// The degree of a source axiom (our `wf:degree` annotation), 1 when it has none.
pub fn source_degree(kb: &KnowledgeBase, source: usize) -> f64 {
    let key = format!("{}degree", crate::explain::WF);
    kb.sources[source]
        .annotations
        .iter()
        .find(|(p, _)| *p == key)
        .and_then(|(_, v)| v.parse().ok())
        .unwrap_or(1.0)
}

/// Runs a script of commands; stops at the first error. Returns the output so far and the
/// error, if any (with its 1-based line number).
pub fn run_script(
    session: &mut Session,
    script: &str,
    mut out: impl FnMut(&str),
) -> Result<(), (usize, ShellError)> {
    let mut pending = String::new();
    let mut first_line = 0;
    for (n, line) in script.lines().enumerate() {
        if pending.is_empty() {
            first_line = n + 1;
            let t = line.trim();
            if t.is_empty() || t.starts_with('#') {
                continue;
            }
            pending.push_str(line);
        } else {
            pending.push('\n');
            pending.push_str(line);
        }
        if !syntax::balanced(&pending) {
            continue;
        }
        let cmd = std::mem::take(&mut pending);
        out(&format!("{}{}\n", session.prompt(), cmd));
        match session.execute(&cmd) {
            Ok(text) => out(&text),
            Err(e) => return Err((first_line, e)),
        }
        if session.wants_quit() {
            return Ok(());
        }
    }
    if !pending.is_empty() {
        return Err((
            first_line,
            ShellError::new("unbalanced parentheses at the end of the script; close them"),
        ));
    }
    Ok(())
}

/// Whether a path names one of the documents loaded.
fn same_file(a: &Path, b: &Path) -> bool {
    match (std::fs::canonicalize(a), std::fs::canonicalize(b)) {
        (Ok(x), Ok(y)) => x == y,
        _ => a == b,
    }
}

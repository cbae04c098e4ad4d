//! `save`: the session's edits written back into the documents they belong to (`save`,
//! `save --into FILE`), or every document merged with the edits into one new file
//! (`save FILE`). Either way: a confirmation first (`--yes` in scripts), `FILE.bak` beside
//! each file overwritten, atomic writes, and a reload that must give the session's axioms.

use super::commands::{Line, options};
use super::{Edit, Session, ShellError, same_file};
use crate::kb::KnowledgeBase;
use crate::kb::load::{self, document::DocumentEdit};
use std::collections::BTreeSet;
use std::fmt::Write;
use std::path::{Path, PathBuf};

/// Runs `save [FILE] [--into FILE] [--yes]`.
pub(super) fn save(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let (positional, opts) = options(l, &["into"], &["yes"])?;
    let yes = opts.iter().any(|(n, _, _)| n == "yes");
    let into = opts.iter().find(|(n, _, _)| n == "into");
    if positional.is_empty() {
        let into = match into {
            Some((_, v, at)) => Some(document_named(s, l, v, *at)?),
            None => None,
        };
        write_back(s, l, into, yes)
    } else {
        if let Some((_, _, at)) = into {
            return Err(l.err(
                "`--into` places edits in a loaded document; it goes with `save` alone, not with a new FILE",
                *at,
            ));
        }
        save_merged(s, l, PathBuf::from(positional.trim_matches('"')), yes)
    }
}

/// The index of the loaded document named by path or file name.
fn document_named(s: &Session, l: &Line, name: &str, at: usize) -> Result<usize, ShellError> {
    s.documents
        .iter()
        .position(|d| {
            d.path.to_string_lossy() == name
                || d.path
                    .file_name()
                    .is_some_and(|n| n.to_string_lossy() == name)
                || same_file(&d.path, Path::new(name))
        })
        .ok_or_else(|| {
            l.err(
                format!(
                    "`{name}` is not a loaded document; loaded: {}",
                    s.documents
                        .iter()
                        .map(|d| d.path.display().to_string())
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
                at,
            )
        })
}

/// The edits as the document writers take them.
fn document_edits(edits: &[Edit]) -> Vec<DocumentEdit<'_>> {
    edits
        .iter()
        .map(|e| match e {
            Edit::Add { functional, .. } => DocumentEdit::Add(functional),
            Edit::Retract { text, .. } => DocumentEdit::Retract(text),
            Edit::Facts { functional, .. } => DocumentEdit::Add(functional),
        })
        .collect()
}

/// Asks before writing; without anyone to ask, says what would be written and how to
/// confirm.
fn confirmed(
    s: &mut Session,
    l: &Line,
    question: &str,
    what: &str,
    how: &str,
) -> Result<bool, ShellError> {
    match s.confirm.as_mut() {
        Some(ask) => Ok(ask(question)),
        None => Err(l.err(format!("{what}; confirm with `{how}`"), l.off)),
    }
}

/// `path.bak`.
fn backup_path(path: &Path) -> PathBuf {
    let mut b = path.as_os_str().to_owned();
    b.push(".bak");
    PathBuf::from(b)
}

/// Copies what is at `path` now to `path.bak` (atomically).
fn back_up(path: &Path) -> Result<PathBuf, ShellError> {
    let old = std::fs::read(path).map_err(|e| {
        ShellError::new(format!(
            "not saved: cannot read {} to back it up: {e}; your edits are kept",
            path.display()
        ))
    })?;
    let bak = backup_path(path);
    crate::files::write_atomic(&bak, &old, &[]).map_err(|e| {
        ShellError::new(format!(
            "not saved: backup failed: {e}; your edits are kept"
        ))
    })?;
    Ok(bak)
}

/// Writes each edit into the document it belongs to.
fn write_back(
    s: &mut Session,
    l: &Line,
    into: Option<usize>,
    yes: bool,
) -> Result<String, ShellError> {
    if s.documents.is_empty() {
        return Err(l.err("nothing loaded; give a file name: save FILE", l.off));
    }
    if s.edits.is_empty() {
        return Ok("nothing to save: no edits since the files were loaded\n".into());
    }
    let moved = s.documents_changed();
    if !moved.is_empty() {
        return Err(l.err(
            format!(
                "not saved: {} changed on disk since it was loaded; `reload` first (your edits are kept and applied again), then save",
                moved
                    .iter()
                    .map(|p| p.display().to_string())
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
            l.off,
        ));
    }
    let docs: Vec<(String, String)> = s
        .documents
        .iter()
        .map(|d| (d.path.display().to_string(), d.text.clone()))
        .collect();
    let wb = load::save::write_back(&docs, &document_edits(&s.edits), into)
        .map_err(|e| ShellError::new(format!("not saved: {e}; your edits are kept")))?;
    let mut out = String::new();
    for (n, (e, went)) in s.edits.iter().zip(&wb.placed).enumerate() {
        let whereto = if went.is_empty() {
            "changes no document".to_string()
        } else {
            format!(
                "→ {}",
                went.iter()
                    .map(|&i| s.documents[i].path.display().to_string())
                    .collect::<Vec<_>>()
                    .join(", ")
            )
        };
        let _ = writeln!(out, "edit {} ({}) {whereto}", n + 1, e.describe());
    }
    if wb.changed.is_empty() {
        s.mark_saved();
        out.push_str("no file changes\n");
        return Ok(out);
    }
    let targets: Vec<PathBuf> = wb
        .changed
        .iter()
        .map(|(i, _)| s.documents[*i].path.clone())
        .collect();
    if !yes {
        let list = targets
            .iter()
            .map(|p| p.display().to_string())
            .collect::<Vec<_>>()
            .join(", ");
        let question = format!(
            "write the edits into {list} (the previous version of each kept as FILE.bak)? [y/N] "
        );
        let what = format!("not saved yet: this writes the edits into {list}");
        if !confirmed(s, l, &question, &what, "save --yes")? {
            out.push_str("not saved\n");
            return Ok(out);
        }
    }
    for t in &targets {
        back_up(t)?;
    }
    let mut written = Vec::new();
    for ((_, text), t) in wb.changed.iter().zip(&targets) {
        if let Err(e) = crate::files::write_atomic(t, text.as_bytes(), &[]) {
            return Err(ShellError::new(format!(
                "saving stopped: {e}; written so far: {}; every file written has its .bak; your edits are kept",
                if written.is_empty() {
                    "none".into()
                } else {
                    written.join(", ")
                }
            )));
        }
        written.push(t.display().to_string());
    }
    let files = s.files.clone();
    let check = load::load(&files, &s.load)
        .map_err(|e| ShellError::new(format!("saved, but the files do not load back: {e}; the previous versions are in the .bak files")))?;
    let warning = differences(&check, &s.kb);
    if let Some(w) = &warning {
        out.push_str(w);
    }
    for t in &targets {
        let _ = writeln!(
            out,
            "changed {} (previous version kept as {})",
            t.display(),
            backup_path(t).display()
        );
    }
    let same: Vec<String> = s
        .documents
        .iter()
        .filter(|d| !targets.contains(&d.path))
        .map(|d| d.path.display().to_string())
        .collect();
    if !same.is_empty() {
        let _ = writeln!(out, "unchanged {}", same.join(", "));
    }
    s.edits.clear();
    s.undone.clear();
    s.set_files(files)?;
    s.mark_saved();
    let _ = writeln!(
        out,
        "{}the edits are now part of the files; undo history cleared",
        if warning.is_none() {
            "they load back with the session's axioms; "
        } else {
            ""
        }
    );
    Ok(out)
}

/// A warning when the axioms and annotations loaded back differ from the session's.
fn differences(got: &KnowledgeBase, session: &KnowledgeBase) -> Option<String> {
    let got = Session::axiom_set(got);
    let want = Session::axiom_set(session);
    let missing: Vec<&String> = want.difference(&got).collect();
    if missing.is_empty() {
        return None;
    }
    // Texts written by us rather than by the parser (facts) are compared in the parser's
    // own form.
    let mut probe = KnowledgeBase::new();
    let texts: String = missing
        .iter()
        .filter(|t| !t.starts_with("AnnotationAssertion("))
        .map(|t| format!("{t}\n"))
        .collect();
    let canon: BTreeSet<String> = load::load_axioms_text(&mut probe, "check", &texts)
        .map(|r| {
            r.map(|i| probe.sources[probe.axioms[i].source].text.clone())
                .collect()
        })
        .unwrap_or_default();
    let still: Vec<&String> = canon.iter().filter(|t| !got.contains(*t)).collect();
    let ann_missing = missing
        .iter()
        .filter(|t| t.starts_with("AnnotationAssertion("))
        .count();
    (!still.is_empty() || ann_missing > 0).then(|| {
        format!(
            "warning: round trip: {} axiom(s) and {ann_missing} annotation(s) differ after loading the saved files, first: {}\n",
            still.len(),
            still.first().map(|t| t.as_str()).unwrap_or("")
        )
    })
}

/// Writes every document merged with the edits into one functional-syntax file.
fn save_merged(
    s: &mut Session,
    l: &Line,
    target: PathBuf,
    yes: bool,
) -> Result<String, ShellError> {
    let loaded = s.documents.iter().any(|d| same_file(&d.path, &target));
    if loaded && s.documents.len() > 1 {
        return Err(l.err(
            format!(
                "{} is one of several loaded documents; `save` alone writes each edit into its own document, `save FILE` merges them all into a new file",
                target.display()
            ),
            l.off,
        ));
    }
    if (loaded || target.exists()) && !yes {
        let question = format!("overwrite {} (a backup is kept)? [y/N] ", target.display());
        let how = format!("save {} --yes", target.display());
        let what = format!("{} exists", target.display());
        if !confirmed(s, l, &question, &what, &how)? {
            return Ok("not saved\n".into());
        }
    }
    let docs: Vec<(String, String)> = s
        .documents
        .iter()
        .map(|d| (d.path.display().to_string(), d.text.clone()))
        .collect();
    let text = load::document::write_merged(&docs, &document_edits(&s.edits), &s.prefixes)
        .map_err(|e| ShellError::new(format!("not saved: {e}; your edits are kept")))?;
    let backup = if target.exists() {
        Some(back_up(&target)?)
    } else {
        None
    };
    crate::files::write_atomic(&target, text.as_bytes(), &[])
        .map_err(|e| ShellError::new(format!("not saved: {e}; your edits are kept")))?;
    // Round trip: the saved file must load back with the same axioms and annotations.
    let check = load::load(std::slice::from_ref(&target), &s.load)
        .map_err(|e| ShellError::new(format!("saved, but the file does not load back: {e}")))?;
    let mut out = differences(&check, &s.kb).unwrap_or_default();
    let _ = writeln!(
        out,
        "saved {} ({} axioms, {} edits); it loads back with the same axioms{}",
        target.display(),
        check.sources.len(),
        s.edits.len(),
        backup
            .map(|b| format!("; previous version kept as {}", b.display()))
            .unwrap_or_default()
    );
    if loaded {
        // The file now holds the edits: it becomes the base, and the edits are spent.
        s.edits.clear();
        s.undone.clear();
        s.set_files(vec![target.clone()])?;
        let _ = writeln!(
            out,
            "the edits are now part of {}; undo history cleared",
            target.display()
        );
    }
    s.mark_saved();
    Ok(out)
}

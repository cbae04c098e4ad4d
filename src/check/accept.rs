//! Accepting new outcomes on purpose: the failing expectations of failing cases are
//! rewritten to what was found, with `toml_edit` so that comments, order and layout of the
//! rest of the file stay as they were. Passing cases are never touched. The new texts are
//! built and re-read in full before anything is written, so a failure leaves files intact.

use super::CheckError;
use super::run::{CaseResult, Fix, Status};
use std::collections::BTreeMap;
use std::path::PathBuf;
use toml_edit::{Array, DocumentMut, Item, Value};

/// A new text for one case file, and what it changes.
#[derive(Clone, Debug)]
pub struct Rewrite {
    /// The case file.
    pub file: PathBuf,
    /// Its new text.
    pub text: String,
    /// `case name: expect.key` of each rewritten expectation.
    pub changed: Vec<String>,
}

fn string_array(items: &[String], like: Option<&Array>) -> Array {
    let mut a: Array = items.iter().map(|s| Value::from(s.as_str())).collect();
    if items.len() > 1 {
        for v in a.iter_mut() {
            v.decor_mut().set_prefix("\n    ");
        }
        a.set_trailing("\n");
        a.set_trailing_comma(true);
    }
    if let Some(l) = like {
        *a.decor_mut() = l.decor().clone();
    }
    a
}

fn split_first_line(s: &str) -> (&str, &str) {
    match s.find('\n') {
        Some(i) => (&s[..=i], &s[i + 1..]),
        None => (s, ""),
    }
}

/// Removes element `i` of an array with the comment on its own line, keeping the comment
/// that ends the line before it (in `toml_edit` that comment is part of the removed
/// element's prefix, and the removed element's own trailing comment is part of the next
/// element's prefix or of the array's trailing text).
fn remove_keeping_comments(a: &mut Array, i: usize) -> Value {
    let own = a
        .get(i)
        .and_then(|v| v.decor().prefix())
        .and_then(|p| p.as_str())
        .unwrap_or("")
        .to_string();
    let removed = a.remove(i);
    let (head, _) = split_first_line(&own);
    if let Some(next) = a.get_mut(i) {
        let p = next
            .decor()
            .prefix()
            .and_then(|p| p.as_str())
            .unwrap_or("")
            .to_string();
        let (_, tail) = split_first_line(&p);
        if p.contains('\n') {
            next.decor_mut().set_prefix(format!("{head}{tail}"));
        }
    } else {
        let t = a.trailing().as_str().unwrap_or("").to_string();
        if t.contains('\n') {
            let (_, tail) = split_first_line(&t);
            a.set_trailing(format!("{head}{tail}"));
        }
    }
    removed
}

fn keep_decor(old: &Value, mut new: Value) -> Value {
    *new.decor_mut() = old.decor().clone();
    new
}

/// Applies one fix to the value at `key` of an expect table.
fn apply(expect: &mut dyn toml_edit::TableLike, key: &str, fix: &Fix) -> Result<(), String> {
    let (head, last) = match key.rsplit_once('.') {
        Some((h, l)) => (Some(h), l),
        None => (None, key),
    };
    let mut table: &mut dyn toml_edit::TableLike = expect;
    if let Some(h) = head {
        for part in h.split('.') {
            table = table
                .get_mut(part)
                .and_then(|i| i.as_table_like_mut())
                .ok_or_else(|| format!("expect.{h} is not a table"))?;
        }
    }
    let missing = || format!("expect.{key} not found");
    match fix {
        Fix::Bool(b) => {
            let v = table
                .get_mut(last)
                .and_then(|i| i.as_value_mut())
                .ok_or_else(missing)?;
            *v = keep_decor(v, Value::from(*b));
        }
        Fix::List(items) => {
            let v = table
                .get_mut(last)
                .and_then(|i| i.as_value_mut())
                .ok_or_else(missing)?;
            let new = string_array(items, v.as_array());
            *v = keep_decor(v, Value::Array(new));
        }
        Fix::Drop(idx) => {
            let a = table
                .get_mut(last)
                .and_then(|i| i.as_array_mut())
                .ok_or_else(missing)?;
            for &i in idx.iter().rev() {
                if i < a.len() {
                    remove_keeping_comments(a, i);
                }
            }
        }
        Fix::Move { items, to } => {
            let a = table
                .get_mut(last)
                .and_then(|i| i.as_array_mut())
                .ok_or_else(missing)?;
            let mut moved = Vec::new();
            for &i in items.iter().rev() {
                if i < a.len() {
                    moved.push(remove_keeping_comments(a, i));
                }
            }
            moved.reverse();
            if moved.is_empty() {
                return Ok(());
            }
            let target = table
                .entry(to)
                .or_insert(Item::Value(Value::Array(Array::new())));
            let t = target
                .as_array_mut()
                .ok_or_else(|| format!("expect.{to} is not a list"))?;
            let like = t.iter().last().map(|v| v.decor().clone());
            for mut v in moved {
                if t.iter().any(|x| x.as_str() == v.as_str()) {
                    continue;
                }
                match &like {
                    Some(d) => *v.decor_mut() = d.clone(),
                    None => v.decor_mut().clear(),
                }
                t.push_formatted(v);
            }
            if like.is_none() {
                t.fmt();
            }
        }
        Fix::Ranks(ranks) => {
            let a = table
                .get_mut(last)
                .and_then(|i| i.as_array_mut())
                .ok_or_else(missing)?;
            for (i, r) in ranks.iter().enumerate().rev() {
                match r {
                    Some(r) => {
                        if let Some(t) = a.get_mut(i).and_then(|v| v.as_inline_table_mut())
                            && let Some(v) = t.get_mut("rank")
                        {
                            *v = keep_decor(v, Value::from(*r as i64));
                        }
                    }
                    None => {
                        if i < a.len() {
                            remove_keeping_comments(a, i);
                        }
                    }
                }
            }
        }
    }
    Ok(())
}

/// The rewritten case files for the failing cases of a run (passing cases untouched).
/// Each new text is parsed again as a case file before it is returned.
pub fn plan(results: &[CaseResult]) -> Result<Vec<Rewrite>, CheckError> {
    let mut by_file: BTreeMap<PathBuf, Vec<&CaseResult>> = BTreeMap::new();
    for r in results.iter().filter(|r| r.status == Status::Fail) {
        by_file.entry(r.spec.file.clone()).or_default().push(r);
    }
    let mut out = Vec::new();
    for (file, rs) in by_file {
        let text = std::fs::read_to_string(&file)
            .map_err(|e| CheckError(format!("{}: cannot read: {e}", file.display())))?;
        let mut doc: DocumentMut = text
            .parse()
            .map_err(|e| CheckError(format!("{}: malformed TOML: {e}", file.display())))?;
        let mut changed = Vec::new();
        for r in rs {
            let case = doc
                .get_mut("case")
                .and_then(|c| c.as_array_of_tables_mut())
                .and_then(|a| a.get_mut(r.spec.index))
                .ok_or_else(|| {
                    CheckError(format!(
                        "{}: case {:?} moved since it was read; run again",
                        file.display(),
                        r.spec.name
                    ))
                })?;
            let expect = case
                .get_mut("expect")
                .and_then(|e| e.as_table_like_mut())
                .ok_or_else(|| {
                    CheckError(format!(
                        "{}: case {:?} has no expect table",
                        file.display(),
                        r.spec.name
                    ))
                })?;
            for c in r.checks.iter().filter(|c| !c.passed) {
                apply(expect, &c.key, &c.fix)
                    .map_err(|e| CheckError(format!("{}:{}: {e}", file.display(), c.line)))?;
                changed.push(format!("{}: expect.{}", r.spec.name, c.key));
            }
        }
        let new = doc.to_string();
        let mut check = super::Suite::default();
        super::suite::parse_file(&file, &new, &mut check).map_err(|e| {
            CheckError(format!(
                "the accepted version of {} would not read back ({e}); nothing was written",
                file.display()
            ))
        })?;
        out.push(Rewrite {
            file,
            text: new,
            changed,
        });
    }
    Ok(out)
}

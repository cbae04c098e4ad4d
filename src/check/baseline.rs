//! Comparing two versions of a KB: the same cases run against both, and each case whose
//! outcome changed is listed with how: consistency, entailments, satisfiability, new and
//! lost explanations, a changed ranking, unexplained observations and abnormalities.

use super::run::{CaseResult, Outcome};
use super::suite::abbreviate;
use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

/// One way a case's outcome changed.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Change {
    /// Consistency differs (baseline, current).
    Consistency(String, String),
    /// An entailment query's answer differs (query, baseline, current).
    Entailment(String, String, String),
    /// A class's satisfiability differs (class, baseline, current).
    Satisfiability(String, String, String),
    /// An explanation found now and not before (rank now).
    NewExplanation(Vec<String>, usize),
    /// An explanation found before and not now (rank before).
    LostExplanation(Vec<String>, usize),
    /// Explanations found by both, in a different order: (explanation, rank before, rank now).
    Ranking(Vec<(Vec<String>, usize, usize)>),
    /// The unexplained observations differ (baseline, current).
    Unexplained(Vec<String>, Vec<String>),
    /// The suspended defaults differ (baseline, current).
    Abnormalities(Vec<String>, Vec<String>),
}

/// The changes of one case.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CaseChanges {
    /// The case's name.
    pub name: String,
    /// What changed, in the order of [`Change`]'s kinds.
    pub changes: Vec<Change>,
}

/// Maps the baseline given on the command line to KB file replacements by file name: a
/// folder stands for every file in it; files stand for themselves.
pub fn replacements(paths: &[PathBuf]) -> Result<BTreeMap<String, PathBuf>, String> {
    let mut out = BTreeMap::new();
    let mut add = |p: &Path| {
        if let Some(n) = p.file_name() {
            out.insert(n.to_string_lossy().to_string(), p.to_path_buf());
        }
    };
    for p in paths {
        if p.is_dir() {
            let rd = std::fs::read_dir(p)
                .map_err(|e| format!("{}: cannot read the folder: {e}", p.display()))?;
            let mut v: Vec<PathBuf> = rd
                .flatten()
                .map(|e| e.path())
                .filter(|p| p.is_file())
                .collect();
            v.sort();
            v.iter().for_each(|p| add(p));
        } else if p.is_file() {
            add(p);
        } else {
            return Err(format!(
                "{}: no such baseline file or folder; give the older KB's folder or files",
                p.display()
            ));
        }
    }
    Ok(out)
}

/// The changes between a baseline outcome and the current one.
pub fn compare(before: &Outcome, now: &Outcome) -> Vec<Change> {
    let mut v = Vec::new();
    if before.consistent != now.consistent {
        v.push(Change::Consistency(
            before.consistent.clone().unwrap_or_default(),
            now.consistent.clone().unwrap_or_default(),
        ));
    }
    for (q, a) in &now.entailments {
        if let Some(b) = before.entailments.get(q)
            && a != b
        {
            v.push(Change::Entailment(q.clone(), b.clone(), a.clone()));
        }
    }
    for (q, a) in &now.satisfiability {
        if let Some(b) = before.satisfiability.get(q)
            && a != b
        {
            v.push(Change::Satisfiability(q.clone(), b.clone(), a.clone()));
        }
    }
    if let (Some(b), Some(n)) = (&before.explanations, &now.explanations) {
        for (i, e) in n.iter().enumerate() {
            if !b.contains(e) {
                v.push(Change::NewExplanation(e.clone(), i + 1));
            }
        }
        for (i, e) in b.iter().enumerate() {
            if !n.contains(e) {
                v.push(Change::LostExplanation(e.clone(), i + 1));
            }
        }
        let common_b: Vec<&Vec<String>> = b.iter().filter(|e| n.contains(e)).collect();
        let common_n: Vec<&Vec<String>> = n.iter().filter(|e| b.contains(e)).collect();
        if common_b != common_n {
            let moved = common_n
                .iter()
                .map(|e| {
                    let rb = b.iter().position(|x| x == *e).unwrap_or(0) + 1;
                    let rn = n.iter().position(|x| x == *e).unwrap_or(0) + 1;
                    ((*e).clone(), rb, rn)
                })
                .filter(|(_, rb, rn)| rb != rn)
                .collect();
            v.push(Change::Ranking(moved));
        }
        if before.unexplained != now.unexplained {
            v.push(Change::Unexplained(
                before.unexplained.clone(),
                now.unexplained.clone(),
            ));
        }
        if before.abnormalities != now.abnormalities {
            v.push(Change::Abnormalities(
                before.abnormalities.clone(),
                now.abnormalities.clone(),
            ));
        }
    }
    v
}

/// The changes of every case whose outcome differs (results in the same case order).
pub fn compare_runs(before: &[CaseResult], now: &[CaseResult]) -> Vec<CaseChanges> {
    before
        .iter()
        .zip(now)
        .map(|(b, n)| CaseChanges {
            name: n.spec.name.clone(),
            changes: compare(&b.outcome, &n.outcome),
        })
        .filter(|c| !c.changes.is_empty())
        .collect()
}

/// The text of a comparison, with the case files' prefixes.
pub fn changes_text(changes: &[CaseChanges], now: &[CaseResult]) -> String {
    use std::fmt::Write;
    let mut s = String::new();
    let _ = writeln!(
        s,
        "Compared with the baseline KB: {} of {} cases changed",
        changes.len(),
        now.len()
    );
    for c in changes {
        let prefixes = now
            .iter()
            .find(|r| r.spec.name == c.name)
            .map(|r| r.spec.prefixes.clone())
            .unwrap_or_default();
        let sh = |x: &str| abbreviate(x, &prefixes);
        let ex = |e: &[String]| {
            format!(
                "{{{}}}",
                e.iter().map(|x| sh(x)).collect::<Vec<_>>().join("; ")
            )
        };
        let _ = writeln!(s, "CHANGED {}", c.name);
        for ch in &c.changes {
            let line = match ch {
                Change::Consistency(b, n) => format!("consistency: {b} → {n}"),
                Change::Entailment(q, b, n) => format!("entailment of {}: {b} → {n}", sh(q)),
                Change::Satisfiability(q, b, n) => format!("{}: {b} → {n}", sh(q)),
                Change::NewExplanation(e, r) => format!("new explanation at rank {r}: {}", ex(e)),
                Change::LostExplanation(e, r) => {
                    format!("lost explanation (was rank {r}): {}", ex(e))
                }
                Change::Ranking(m) => {
                    let parts: Vec<String> = m
                        .iter()
                        .map(|(e, b, n)| format!("{} rank {b} → {n}", ex(e)))
                        .collect();
                    format!("ranking changed: {}", parts.join(", "))
                }
                Change::Unexplained(b, n) => format!(
                    "unexplained: [{}] → [{}]",
                    b.iter().map(|x| sh(x)).collect::<Vec<_>>().join("; "),
                    n.iter().map(|x| sh(x)).collect::<Vec<_>>().join("; ")
                ),
                Change::Abnormalities(b, n) => format!(
                    "abnormalities: [{}] → [{}]",
                    b.iter().map(|x| sh(x)).collect::<Vec<_>>().join("; "),
                    n.iter().map(|x| sh(x)).collect::<Vec<_>>().join("; ")
                ),
            };
            let _ = writeln!(s, "    {line}");
        }
    }
    s
}

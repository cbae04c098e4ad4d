//! Text for people: one line per case, a summary, and for each failing expectation its
//! expected and actual values as a line diff (`-` expected only, `+` found only).

use super::run::{CaseResult, Check, Status};
use std::fmt::Write;

/// A line diff of two lists by their longest common subsequence: (tag, line) with tag
/// ' ' (both), '-' (expected only) or '+' (actual only).
pub fn line_diff(expected: &[String], actual: &[String]) -> Vec<(char, String)> {
    let (n, m) = (expected.len(), actual.len());
    let mut l = vec![vec![0usize; m + 1]; n + 1];
    for i in (0..n).rev() {
        for j in (0..m).rev() {
            l[i][j] = if expected[i] == actual[j] {
                l[i + 1][j + 1] + 1
            } else {
                l[i + 1][j].max(l[i][j + 1])
            };
        }
    }
    let (mut i, mut j) = (0, 0);
    let mut out = Vec::new();
    while i < n || j < m {
        if i < n && j < m && expected[i] == actual[j] {
            out.push((' ', expected[i].clone()));
            i += 1;
            j += 1;
        } else if i < n && (j == m || l[i + 1][j] >= l[i][j + 1]) {
            out.push(('-', expected[i].clone()));
            i += 1;
        } else {
            out.push(('+', actual[j].clone()));
            j += 1;
        }
    }
    out
}

/// The failure text of one check, naming the expectation and where it is written.
pub fn check_text(file: &str, c: &Check) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "    expect.{} ({file}:{}): - expected, + actual",
        c.key, c.line
    );
    let d = line_diff(&c.expected, &c.actual);
    if d.is_empty() {
        let _ = writeln!(s, "      (both empty)");
    }
    for (t, l) in d {
        let _ = writeln!(s, "      {t} {l}");
    }
    s
}

/// The line of a case: PASS, FAIL or ERROR, its name and time; failures and errors follow.
pub fn case_text(r: &CaseResult) -> String {
    let mut s = String::new();
    let ms = r.time.as_secs_f64() * 1000.0;
    let word = match r.status {
        Status::Pass => "PASS ",
        Status::Fail => "FAIL ",
        Status::Error(_) => "ERROR",
    };
    let _ = writeln!(s, "{word} {}  ({ms:.0} ms)", r.spec.name);
    match &r.status {
        Status::Error(e) => {
            let _ = writeln!(s, "    error: {e}");
        }
        Status::Fail => {
            let file = r.spec.file.display().to_string();
            for c in r.checks.iter().filter(|c| !c.passed) {
                s.push_str(&check_text(&file, c));
            }
        }
        Status::Pass => {}
    }
    s
}

/// Counts of passed, failed and erroneous cases.
pub fn counts(results: &[CaseResult]) -> (usize, usize, usize) {
    let p = results.iter().filter(|r| r.status == Status::Pass).count();
    let f = results.iter().filter(|r| r.status == Status::Fail).count();
    (p, f, results.len() - p - f)
}

/// The closing summary.
pub fn summary(results: &[CaseResult], wall: std::time::Duration) -> String {
    let (p, f, e) = counts(results);
    let mut s = format!("{} cases: {p} passed, {f} failed", results.len());
    if e > 0 {
        let _ = write!(s, ", {e} could not run");
    }
    let _ = writeln!(s, " ({:.2} s)", wall.as_secs_f64());
    s
}

//! The layer rules of DEVELOPERS.md ("Architecture"), read off the source: a module may name
//! (`crate::x`, in code, not in comments) only the layers it is allowed to use. Each rule
//! below is one row of the table there; the test lists every line that breaks one.

use std::path::{Path, PathBuf};

/// The modules under `src/`.
const MODULES: [&str; 11] = [
    "kb", "reasoner", "spatial", "facts", "explain", "render", "check", "demo", "shell", "files",
    "cli",
];

/// (module, modules it must not name), from the table's "may use" and "never" columns.
const FORBIDDEN: [(&str, &[&str]); 9] = [
    (
        "kb",
        &[
            "reasoner", "spatial", "facts", "explain", "render", "check", "demo", "shell", "cli",
        ],
    ),
    (
        "reasoner",
        &[
            "spatial", "facts", "explain", "render", "check", "demo", "shell", "cli",
        ],
    ),
    // spatial knows nothing of OWL, nor of the facts file made from its values.
    (
        "spatial",
        &[
            "kb", "reasoner", "facts", "explain", "render", "check", "demo", "shell", "cli",
        ],
    ),
    (
        "facts",
        &["explain", "render", "check", "demo", "shell", "cli"],
    ),
    ("explain", &["render", "check", "demo", "shell", "cli"]),
    ("check", &["demo", "shell", "cli"]),
    ("render", &["check", "demo", "shell", "cli"]),
    ("shell", &["cli", "demo"]),
    ("files", &["cli"]),
];

/// Every `.rs` file of a module: `src/m.rs` and everything under `src/m/`.
fn files_of(module: &str) -> Vec<PathBuf> {
    let src = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let mut out = Vec::new();
    let single = src.join(format!("{module}.rs"));
    if single.exists() {
        out.push(single);
    }
    let mut dirs = vec![src.join(module)];
    while let Some(d) = dirs.pop() {
        let Ok(rd) = std::fs::read_dir(&d) else {
            continue;
        };
        for e in rd.flatten() {
            let p = e.path();
            if p.is_dir() {
                dirs.push(p);
            } else if p.extension().is_some_and(|x| x == "rs") {
                out.push(p);
            }
        }
    }
    out.sort();
    out
}

/// The top-level modules a line of code names through `crate::` (plain paths and
/// `crate::{a, b::c}` groups); comments do not count.
fn named(line: &str) -> Vec<String> {
    let code = line.split("//").next().unwrap_or("");
    let mut out = Vec::new();
    let mut rest = code;
    while let Some(i) = rest.find("crate::") {
        rest = &rest[i + "crate::".len()..];
        if let Some(group) = rest.strip_prefix('{') {
            let inner = group.split('}').next().unwrap_or("");
            for part in inner.split(',') {
                let head = part.trim().split("::").next().unwrap_or("").trim();
                out.push(head.to_string());
            }
        } else {
            let head: String = rest
                .chars()
                .take_while(|c| c.is_alphanumeric() || *c == '_')
                .collect();
            out.push(head);
        }
    }
    out
}

/// Every line of `module` that names one of `forbidden`, as `file:line: text`.
fn breaches(module: &str, forbidden: &[&str]) -> Vec<String> {
    let mut out = Vec::new();
    for f in files_of(module) {
        let text = std::fs::read_to_string(&f).unwrap();
        for (n, line) in text.lines().enumerate() {
            if named(line).iter().any(|m| forbidden.contains(&m.as_str())) {
                out.push(format!("{}:{}: {}", f.display(), n + 1, line.trim()));
            }
        }
    }
    out
}

#[test]
fn every_module_names_only_the_layers_it_may_use() {
    let mut all = Vec::new();
    for (module, forbidden) in FORBIDDEN {
        assert!(MODULES.contains(&module));
        assert!(
            !files_of(module).is_empty(),
            "no source for module {module}"
        );
        all.extend(breaches(module, forbidden));
    }
    assert!(all.is_empty(), "layer rules broken:\n{}", all.join("\n"));
}

#[test]
fn nothing_below_cli_names_cli() {
    let mut all = Vec::new();
    for module in MODULES.iter().filter(|m| **m != "cli") {
        all.extend(breaches(module, &["cli"]));
    }
    assert!(all.is_empty(), "{}", all.join("\n"));
}

// The reader itself, on lines whose answer is plain by eye.
#[test]
fn named_reads_paths_and_groups_but_not_comments() {
    assert_eq!(named("use crate::kb::names::Kind;"), vec!["kb"]);
    assert_eq!(
        named("use crate::{facts::Facts, render};"),
        vec!["facts", "render"]
    );
    assert!(named("// see crate::render::text").is_empty());
    assert_eq!(
        named("let x = crate::render::dl_axiom(kb, a); // crate::shell"),
        vec!["render"]
    );
}

//! `wherefore report` in batch mode on bad input: a malformed manifest, a missing case file
//! and an output folder that cannot be written. Each gets a clear message and exit code 2
//! (in a batch, a per-case failure while the other cases go on), and no partial file.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn temp(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("wf-report-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn report(manifest: &Path, out: &Path) -> Output {
    Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .arg("report")
        .arg("--kb")
        .arg(root().join("ontologies/spatial.ofn"))
        .arg(root().join("ontologies/abdomen.ofn"))
        .arg("--manifest")
        .arg(manifest)
        .arg("--out")
        .arg(out)
        .output()
        .unwrap()
}

fn facts() -> String {
    root()
        .join("tests/fixtures/report/bulging-liver-lesion.facts.json")
        .display()
        .to_string()
}

#[test]
fn malformed_manifest_names_the_file_and_line() {
    let d = temp("malformed");
    let m = d.join("cases.toml");
    std::fs::write(&m, "[[case]]\nid = \"a\"\nfacts = \n").unwrap();
    let o = report(&m, &d.join("out"));
    assert_eq!(o.status.code(), Some(2));
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(
        err.contains("cases.toml") && err.contains("line 3"),
        "{err}"
    );
    assert!(
        !d.join("out").exists(),
        "nothing is written for a malformed manifest"
    );
}

#[test]
fn a_missing_case_file_fails_that_case_only() {
    let d = temp("missing");
    let m = d.join("cases.toml");
    std::fs::write(
        &m,
        format!(
            "[[case]]\nid = \"good\"\nfacts = \"{}\"\n\n[[case]]\nid = \"bad\"\nfacts = \"nowhere.json\"\n",
            facts()
        ),
    )
    .unwrap();
    let out = d.join("out");
    let o = report(&m, &out);
    assert_eq!(o.status.code(), Some(2));
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(
        err.contains("bad: FAILED") && err.contains("nowhere.json"),
        "{err}"
    );
    assert!(out.join("good/report.json").exists());
    assert!(!out.join("bad").join("report.json").exists());
    let table = String::from_utf8_lossy(&o.stdout);
    assert!(
        table.contains("1 done, 0 skipped (up to date), 1 failed"),
        "{table}"
    );
}

#[test]
fn an_unwritable_output_folder_is_a_case_failure_without_partial_files() {
    let d = temp("unwritable");
    let m = d.join("cases.toml");
    std::fs::write(
        &m,
        format!("[[case]]\nid = \"a\"\nfacts = \"{}\"\n", facts()),
    )
    .unwrap();
    // A regular file where the output folder should be: no folder can be made under it,
    // whatever the user's permissions.
    let blocker = d.join("out");
    std::fs::write(&blocker, "not a folder").unwrap();
    let o = report(&m, &blocker);
    assert_eq!(o.status.code(), Some(2));
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(
        err.contains("a: FAILED") && err.contains("cannot create"),
        "{err}"
    );
    assert_eq!(std::fs::read_to_string(&blocker).unwrap(), "not a folder");
    let leftovers: Vec<_> = std::fs::read_dir(&d)
        .unwrap()
        .filter_map(|e| e.ok())
        .map(|e| e.file_name().to_string_lossy().to_string())
        .filter(|n| n != "cases.toml" && n != "out")
        .collect();
    assert!(leftovers.is_empty(), "partial files left: {leftovers:?}");
}

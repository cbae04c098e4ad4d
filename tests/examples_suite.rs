//! The shipped examples' regression suite passes: `wherefore check examples/`.

use std::process::Command;

#[test]
fn check_examples_passes() {
    let root = env!("CARGO_MANIFEST_DIR");
    let out = Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .current_dir(root)
        .args(["check", "examples/"])
        .output()
        .expect("check runs");
    let stdout = String::from_utf8_lossy(&out.stdout);
    // Exit 0 means every expectation held (contract, "check"); the seven cases are those of
    // examples/cases.toml, each derived by hand from ontologies/abdomen.ofn.
    assert_eq!(
        out.status.code(),
        Some(0),
        "{stdout}{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(stdout.contains("7 cases: 7 passed, 0 failed"), "{stdout}");
}

/// The demo's in-process run of the suite catches a wrong case: with the facts of cases 01
/// and 05 swapped, both fail (01's expected cyst is absent from a pancreatic lesion's
/// facts; 05's expected unexplained finding is explained by 01's facts), the rest pass.
#[test]
fn demo_suite_run_reports_failures() {
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR"));
    let dir = std::env::temp_dir().join(format!("wf-examples-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(dir.join("ontologies")).unwrap();
    for f in ["spatial.ofn", "abdomen.ofn"] {
        std::fs::copy(
            root.join("ontologies").join(f),
            dir.join("ontologies").join(f),
        )
        .unwrap();
    }
    let cases = [
        "01-deep-liver-lesion",
        "02-bulging-liver-lesion",
        "03-two-organs",
        "04-displaced-kidney",
        "05-pancreatic-lesion",
        "06-perivascular-mass",
    ];
    for c in cases {
        let from = match c {
            "01-deep-liver-lesion" => "05-pancreatic-lesion",
            "05-pancreatic-lesion" => "01-deep-liver-lesion",
            other => other,
        };
        std::fs::create_dir_all(dir.join(c)).unwrap();
        std::fs::copy(
            root.join("examples").join(from).join("facts.json"),
            dir.join(c).join("facts.json"),
        )
        .unwrap();
    }
    let results = wherefore::demo::run_examples(&dir).unwrap();
    let failed: Vec<&str> = results
        .iter()
        .filter(|r| r.status != wherefore::check::Status::Pass)
        .map(|r| r.spec.name.as_str())
        .collect();
    assert_eq!(failed, ["01-deep-liver-lesion", "05-pancreatic-lesion"]);
    let _ = std::fs::remove_dir_all(&dir);
}

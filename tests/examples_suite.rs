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
    // Exit 0 means every expectation held (contract, "check"); the six cases are those of
    // examples/cases.toml, each derived by hand from ontologies/abdomen.ofn.
    assert_eq!(
        out.status.code(),
        Some(0),
        "{stdout}{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(stdout.contains("6 cases: 6 passed, 0 failed"), "{stdout}");
}

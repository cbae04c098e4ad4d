//! `wherefore check` reads the axioms of a case (entailments, background, assertions,
//! expected explanations) with the shell's short names: IRI fragments, labels, prefixed
//! names with the KB's prefixes, Manchester or functional syntax; a misspelt name is exit 2
//! naming the file, the line, the case and the name, with a suggestion.
//!
//! The KB is the baseline fixture `lesions.ofn` (ours): HepaticCyst and RenalCyst ⊑
//! CysticLesion, Haemangioma ⊑ SolidLesion, CysticLesion and SolidLesion disjoint. The
//! answers are hand-derived from those five axioms.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn kb() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/check/baseline/lesions.ofn")
}

/// Writes the suite (with `KB` and `ABD` standing for the fixture paths) and checks it.
fn check(name: &str, body: &str) -> (PathBuf, Output) {
    let d = std::env::temp_dir().join(format!("wf-check-short-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    let p = d.join("cases.toml");
    let abd = kb().with_extension("abducibles");
    let body = body
        .replace("KB", &kb().display().to_string())
        .replace("ABD", &abd.display().to_string());
    std::fs::write(&p, body).unwrap();
    let o = Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .args(["check", p.to_str().unwrap()])
        .output()
        .expect("wherefore runs");
    (p, o)
}

fn text(o: &Output) -> String {
    format!(
        "{}{}",
        String::from_utf8_lossy(&o.stdout),
        String::from_utf8_lossy(&o.stderr)
    )
}

// RenalCyst(r1) gives CysticLesion(r1) and, by the disjointness, not SolidLesion(r1);
// RenalCyst ⊑ SolidLesion does not follow (RenalCyst is satisfiable). CysticLesion(c1) is
// explained by HepaticCyst(c1) and by RenalCyst(c1) (the abducibles are the three leaf
// classes). `:` is the KB document's own prefix; the suite declares none.
const SHORT: &str = r#"kb = ["KB"]

[[case]]
name = "short"
background = """
ClassAssertion(RenalCyst :r1)
"""

[case.expect]
entailed = [
  "ClassAssertion(CysticLesion r1)",
  "SubClassOf(RenalCyst :CysticLesion)",
  "RenalCyst SubClassOf CysticLesion",
  "r1 Type CysticLesion",
]
not_entailed = ["SubClassOf(RenalCyst SolidLesion)", "ClassAssertion(SolidLesion r1)"]

[[case]]
name = "short-explanations"
abducibles = "ABD"
assertions = "ClassAssertion(CysticLesion :c1)"

[case.expect]
present = [["ClassAssertion(HepaticCyst c1)"], ["ClassAssertion(RenalCyst c1)"]]
absent = [["ClassAssertion(Haemangioma c1)"]]

[[case]]
name = "full-iris"

[case.expect]
entailed = ["SubClassOf(<http://ex.org/les#HepaticCyst> <http://ex.org/les#CysticLesion>)"]
not_entailed = ["SubClassOf(<http://ex.org/les#HepaticCyst> <http://ex.org/les#SolidLesion>)"]
"#;

#[test]
fn short_names_in_axioms_pass() {
    let (_, o) = check("pass", SHORT);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o));
    let t = text(&o);
    assert!(t.contains("short"), "{t}");
    assert!(t.contains("full-iris"), "{t}");
}

#[test]
fn a_short_name_entailment_that_fails_is_a_failure_not_an_error() {
    // CysticLesion ⊑ RenalCyst does not follow: exit 1 (a failed case), not 2.
    let (_, o) = check(
        "fail",
        "kb = [\"KB\"]\n[[case]]\nname = \"wrong\"\n[case.expect]\nentailed = [\"SubClassOf(CysticLesion RenalCyst)\"]\n",
    );
    assert_eq!(o.status.code(), Some(1), "{}", text(&o));
}

#[test]
fn a_misspelt_name_is_exit_2_with_file_line_case_and_suggestion() {
    // Line 5 holds the misspelt entailment.
    let (p, o) = check(
        "misspelt",
        "kb = [\"KB\"]\n[[case]]\nname = \"typo\"\n[case.expect]\nentailed = [\"SubClassOf(RenalCist CysticLesion)\"]\n",
    );
    let t = text(&o);
    assert_eq!(o.status.code(), Some(2), "{t}");
    assert!(t.contains(&format!("{}:5:", p.display())), "{t}");
    assert!(t.contains("case \"typo\""), "{t}");
    assert!(t.contains("unknown class `RenalCist`"), "{t}");
    assert!(t.contains("did you mean `RenalCyst`?"), "{t}");

    // In a multi-line background the line is the name's own: the string opens on line 4,
    // its text starts on line 5, the misspelt name stands on line 6.
    let (p, o) = check(
        "misspelt-background",
        "kb = [\"KB\"]\n[[case]]\nname = \"bg\"\nbackground = \"\"\"\nClassAssertion(RenalCyst :r1)\nClassAssertion(Haemangiona :r2)\n\"\"\"\n[case.expect]\nconsistent = true\n",
    );
    let t = text(&o);
    assert_eq!(o.status.code(), Some(2), "{t}");
    assert!(t.contains(&format!("{}:6:", p.display())), "{t}");
    assert!(t.contains("did you mean `Haemangioma`?"), "{t}");

    // An unknown prefix is named as such.
    let (_, o) = check(
        "unknown-prefix",
        "kb = [\"KB\"]\n[[case]]\nname = \"pfx\"\n[case.expect]\nentailed = [\"SubClassOf(zz:RenalCyst CysticLesion)\"]\n",
    );
    let t = text(&o);
    assert_eq!(o.status.code(), Some(2), "{t}");
    assert!(t.contains("unknown prefix `zz:`"), "{t}");
}

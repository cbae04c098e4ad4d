//! Differential fixtures: `wherefore classify` against a reference reasoner's answers.
//!
//! Source of the expected answers: HermiT 1.3.8 as bundled in the owlready2 0.51 PyPI
//! package, run on ontologies from `scripts/gen_shiq.py` (seeds and the regeneration command
//! in `tests/fixtures/oracle/README.md`; method in `docs/oracle.md`).

#[path = "fixtures/oracle/harness.rs"]
mod harness;

use harness::{
    Case, Classification, assert_no_failures, cases_in, diff, parse_classification,
    parse_with_horned_owl, run_all,
};
use std::path::PathBuf;

const OWL_THING: &str = "http://www.w3.org/2002/07/owl#Thing";
const OWL_NOTHING: &str = "http://www.w3.org/2002/07/owl#Nothing";
const SOURCE: &str = "HermiT 1.3.8 (owlready2 0.51), see tests/fixtures/oracle/README.md";

fn fixture_dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/oracle")
}

fn cases() -> Vec<Case> {
    cases_in(&fixture_dir(), SOURCE)
}

/// Every recorded oracle answer is reproduced by `wherefore classify`.
#[test]
fn classify_agrees_with_oracle_on_every_fixture() {
    let cases = cases();
    // The foundation issue asks for at least 300 recorded oracle answers.
    if harness::only_filter().is_none() {
        assert!(
            cases.len() >= 300,
            "only {} oracle fixtures found",
            cases.len()
        );
    }
    let failures = run_all(&cases, 2);
    assert_no_failures("oracle fixtures", cases.len(), &failures);
}

/// The expected files themselves have the contract's form (sorted, no owl:Thing as super,
/// no owl:Nothing, no unsatisfiable class as sub, empty arrays when inconsistent), so a
/// mistake in the conversion script cannot pass unnoticed.
#[test]
fn expected_files_have_the_contract_form() {
    let cases = cases();
    assert!(!cases.is_empty());
    for c in &cases {
        let text = std::fs::read_to_string(&c.expected).expect("readable expected file");
        let e = parse_classification(&text, true)
            .unwrap_or_else(|err| panic!("{}: {err}", c.expected.display()));
        if !e.consistent {
            assert!(
                e.unsatisfiable.is_empty() && e.subsumptions.is_empty(),
                "{}",
                c.expected.display()
            );
        }
        assert!(
            !e.unsatisfiable.contains(OWL_NOTHING),
            "{}",
            c.expected.display()
        );
        for (a, b) in &e.subsumptions {
            assert_ne!(a, b, "{}", c.expected.display());
            assert!(b != OWL_THING && a != OWL_NOTHING && b != OWL_NOTHING && a != OWL_THING);
            assert!(
                !e.unsatisfiable.contains(a),
                "{}: unsatisfiable {a} as sub",
                c.expected.display()
            );
            // Transitivity: the recorded relation is closed (A ⊑ B ⊑ C gives A ⊑ C).
            for (b2, c2) in e.subsumptions.range((b.clone(), String::new())..) {
                if b2 != b {
                    break;
                }
                assert!(
                    c2 == a || e.subsumptions.contains(&(a.clone(), c2.clone())),
                    "{}: {a} ⊑ {b} ⊑ {c2} but not {a} ⊑ {c2}",
                    c.expected.display()
                );
            }
        }
    }
}

/// Every fixture ontology is read completely by horned-owl's functional-syntax reader,
/// the parser wherefore loads ontologies with (so a disagreement is never a parse gap).
#[test]
fn fixtures_parse_with_horned_owl() {
    for c in cases() {
        let n = parse_with_horned_owl(&c.ontology).unwrap_or_else(|e| panic!("{e}"));
        // Each fixture declares at least two classes and one property (gen_shiq.py).
        assert!(n >= 3, "{}: only {n} components", c.ontology.display());
    }
}

/// The harness's own difference report names what is missing and what is extra
/// (hand-made example).
#[test]
fn harness_diff_reports_missing_and_extra() {
    let e = parse_classification(
        r#"{"consistent":true,"unsatisfiable":["u:X"],"subsumptions":[["u:A","u:B"],["u:A","u:C"]]}"#,
        true,
    )
    .expect("valid");
    let a = parse_classification(
        r#"{"consistent":true,"unsatisfiable":[],"subsumptions":[["u:A","u:C"],["u:B","u:C"]]}"#,
        true,
    )
    .expect("valid");
    let d = diff(&e, &a).expect("they differ");
    assert!(d.contains("missing unsatisfiable: u:X"), "{d}");
    assert!(d.contains("missing subsumption: u:A ⊑ u:B"), "{d}");
    assert!(d.contains("extra subsumption:   u:B ⊑ u:C"), "{d}");
    assert!(!d.contains("u:A ⊑ u:C"), "{d}");
    assert_eq!(diff(&e, &e.clone()), None::<String>);
    // Unsorted output breaks the contract and is reported.
    let unsorted =
        r#"{"consistent":true,"unsatisfiable":[],"subsumptions":[["u:B","u:C"],["u:A","u:C"]]}"#;
    assert!(parse_classification(unsorted, true).is_err());
    let _: Classification = parse_classification(unsorted, false).expect("lenient parse");
}

//! Differential fixtures for the SROIQ role constructs: `wherefore classify` against a
//! reference reasoner's answers.
//!
//! Source of the expected answers: HermiT 1.3.8 as bundled in the owlready2 0.51 PyPI
//! package, run on ontologies from `scripts/gen_sroiq.py` (property chains, ObjectHasSelf,
//! reflexive, irreflexive, asymmetric and disjoint properties, and in the `n*` and `o*`
//! files ObjectHasValue and ObjectOneOf in the TBox); seeds, regeneration command and the
//! disagreements found in `tests/fixtures/oracle-sroiq/README.md`, method in
//! `docs/oracle.md`.

#[path = "fixtures/oracle/harness.rs"]
mod harness;

use harness::{Case, assert_no_failures, cases_in, check, parse_with_horned_owl, run_all};
use std::path::{Path, PathBuf};

const SOURCE: &str = "HermiT 1.3.8 (owlready2 0.51), see tests/fixtures/oracle-sroiq/README.md";

fn fixture_dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/oracle-sroiq")
}

/// Stems listed in `known-disagreements.txt` (fixtures wherefore answers wrongly today).
fn known_disagreements(dir: &Path) -> Vec<String> {
    std::fs::read_to_string(dir.join("known-disagreements.txt"))
        .unwrap_or_default()
        .lines()
        .map(str::trim)
        .filter(|l| !l.is_empty() && !l.starts_with('#'))
        .map(str::to_owned)
        .collect()
}

fn stem(c: &Case) -> String {
    c.ontology
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default()
}

/// Every recorded oracle answer, except the listed known disagreements, is reproduced.
#[test]
fn classify_agrees_with_oracle_on_sroiq_fixtures() {
    let dir = fixture_dir();
    let known = known_disagreements(&dir);
    let (skipped, cases): (Vec<Case>, Vec<Case>) = cases_in(&dir, SOURCE)
        .into_iter()
        .partition(|c| known.contains(&stem(c)));
    if harness::only_filter().is_none() {
        // README.md: 750 generated ontologies plus the hand-added cases.
        assert!(cases.len() >= 700, "only {} SROIQ fixtures", cases.len());
        // Every listed disagreement names an existing fixture.
        assert_eq!(skipped.len(), known.len(), "stale known-disagreements.txt");
    }
    let failures = run_all(&cases, 2);
    assert_no_failures("SROIQ oracle fixtures", cases.len(), &failures);
    // A listed case that now agrees is reported, so the list can shrink.
    for c in &skipped {
        if check(c).is_ok() {
            eprintln!(
                "{} now agrees with the oracle: remove it from known-disagreements.txt",
                stem(c)
            );
        }
    }
}

/// The SROIQ constructs this suite is about really occur in it (so the agreement above
/// covers them), counted over the fixture texts: chains, Self, and each characteristic.
#[test]
fn fixtures_cover_the_sroiq_constructs() {
    let mut text = String::new();
    for c in cases_in(&fixture_dir(), SOURCE) {
        text += &std::fs::read_to_string(&c.ontology).expect("readable fixture");
    }
    for construct in [
        "ObjectPropertyChain(",
        "ObjectHasSelf(",
        "ObjectComplementOf(ObjectHasSelf(",
        "ReflexiveObjectProperty(",
        "IrreflexiveObjectProperty(",
        "AsymmetricObjectProperty(",
        "DisjointObjectProperties(",
        "TransitiveObjectProperty(",
        "SymmetricObjectProperty(",
        "ObjectHasValue(",
        "ObjectOneOf(",
        "ObjectExactCardinality(",
        "ObjectSomeValuesFrom(owl:topObjectProperty",
        "ObjectAllValuesFrom(owl:topObjectProperty",
    ] {
        let n = text.matches(construct).count();
        assert!(n >= 20, "{construct} occurs only {n} times in the fixtures");
    }
}

/// Every fixture is read completely by horned-owl, the parser wherefore loads with.
#[test]
fn sroiq_fixtures_parse_with_horned_owl() {
    for c in cases_in(&fixture_dir(), SOURCE) {
        let n = parse_with_horned_owl(&c.ontology).unwrap_or_else(|e| panic!("{e}"));
        // gen_sroiq.py declares at least two classes and two properties.
        assert!(n >= 4, "{}: only {n} components", c.ontology.display());
    }
}

//! Differential fixtures for SROIQ(D): property chains, Self, property characteristics and
//! nominals mixed with data ranges, data cardinalities and keys over object and data
//! properties; `wherefore classify` against a reference reasoner's answers.
//!
//! Source of the expected answers: HermiT 1.3.8 as bundled in the owlready2 0.51 PyPI
//! package, run on ontologies from `scripts/gen_sroiq.py --data` (the `d*` files; `e*` add
//! `--nominals`, `g*` disjoint data properties), except the files listed in the folder's README where HermiT is wrong: there
//! the JSON holds the hand-derived answer, with the derivation in the README. Seeds,
//! regeneration command and known limits in `tests/fixtures/oracle-sroiq-data/README.md`.

#[path = "fixtures/oracle/harness.rs"]
mod harness;

use harness::{Case, assert_no_failures, cases_in, parse_with_horned_owl, run_all};
use std::path::PathBuf;

const SOURCE: &str =
    "HermiT 1.3.8 (owlready2 0.51) or hand-derived, see tests/fixtures/oracle-sroiq-data/README.md";

fn fixture_dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/oracle-sroiq-data")
}

/// Every recorded answer is reproduced (a fixture in `known-limits.txt` may stop at its
/// limit instead, but an answer it gives must still be right).
#[test]
fn classify_agrees_on_sroiq_data_fixtures() {
    let cases: Vec<Case> = cases_in(&fixture_dir(), SOURCE);
    if harness::only_filter().is_none() {
        // README.md: 200 generated ontologies.
        assert!(cases.len() >= 190, "only {} SROIQ(D) fixtures", cases.len());
    }
    let failures = run_all(&cases, 2);
    assert_no_failures("SROIQ(D) oracle fixtures", cases.len(), &failures);
}

/// The constructs this suite mixes really occur in it, counted over the fixture texts.
#[test]
fn fixtures_mix_roles_and_data() {
    let mut text = String::new();
    for c in cases_in(&fixture_dir(), SOURCE) {
        text += &std::fs::read_to_string(&c.ontology).expect("readable fixture");
    }
    for construct in [
        "ObjectPropertyChain(",
        "ObjectHasSelf(",
        "ReflexiveObjectProperty(",
        "IrreflexiveObjectProperty(",
        "AsymmetricObjectProperty(",
        "ObjectHasValue(",
        "ObjectOneOf(",
        "DataSomeValuesFrom(",
        "DataAllValuesFrom(",
        "DataHasValue(",
        "DataMinCardinality(",
        "DataMaxCardinality(",
        "DataExactCardinality(",
        "FunctionalDataProperty(",
        "DataPropertyAssertion(",
        "HasKey(",
        "DisjointDataProperties(",
    ] {
        let n = text.matches(construct).count();
        // The nominal constructs come from the 50 `e*` files only, hence the low bar.
        assert!(n >= 10, "{construct} occurs only {n} times in the fixtures");
    }
}

/// Every fixture is read completely by horned-owl, the parser wherefore loads with.
#[test]
fn sroiq_data_fixtures_parse_with_horned_owl() {
    for c in cases_in(&fixture_dir(), SOURCE) {
        let n = parse_with_horned_owl(&c.ontology).unwrap_or_else(|e| panic!("{e}"));
        // gen_sroiq.py declares at least two classes, two object and one data property.
        assert!(n >= 5, "{}: only {n} components", c.ontology.display());
    }
}

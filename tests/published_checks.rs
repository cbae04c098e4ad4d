//! Published and hand-derived reasoning checks: `wherefore classify` on small ontologies
//! whose answers were derived by hand (each `.ofn` under tests/fixtures/published/ carries
//! its source and derivation in its header comment; the answers live in
//! scripts/published_expected.py and were cross-checked with HermiT 1.3.8 from owlready2 0.51,
//! which agrees on all but one pair, see docs/oracle.md).

#[path = "fixtures/oracle/harness.rs"]
mod harness;

use harness::{Case, assert_no_failures, check, parse_with_horned_owl};
use std::path::PathBuf;

fn run(name: &str, source: &str) {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/published");
    let case = Case {
        ontology: dir.join(format!("{name}.ofn")),
        expected: dir.join(format!("{name}.json")),
        source: source.to_owned(),
        extra_args: Vec::new(),
    };
    let failures: Vec<String> = match check(&case) {
        Ok(()) => vec![],
        Err(report) => vec![format!(
            "{} (source: {source}):\n{}",
            case.ontology.display(),
            report.trim_end()
        )],
    };
    assert_no_failures("published checks", 1, &failures);
}

macro_rules! published {
    ($($test:ident: $file:literal, $source:literal;)*) => {
        $(
            #[test]
            fn $test() {
                run($file, $source);
            }
        )*
    };
}

published! {
    // A1, A3, A6, A7 unsatisfiable: the published result of the paper's example TBox.
    schlobach_cornet_2003_debugging_tbox: "schlobach-cornet-2003",
        "Schlobach & Cornet, IJCAI 2003, example TBox (axioms from memory)";
    // Mother ⊑ Parent, Grandmother ⊑ Mother, MotherWithoutDaughter ⊑ Mother, ...
    baader_2017_family_tbox: "family-baader-2017",
        "Baader, Horrocks, Lutz & Sattler 2017, ch. 2 family TBox (from memory)";
    // ≥3 r.C ⊓ ≤2 r.C and ≥2 r ⊓ ≤1 r unsatisfiable; =2 r.C ⊑ ≥2 r.C ⊑ ≥1 r.C.
    qualified_cardinality_clashes: "cardinality", "hand-derived, SHIQ semantics";
    // ∃r.(∀r⁻.A) ⊑ A.
    inverse_with_forall: "inverse-forall", "hand-derived, SHIQ semantics";
    // Satisfiability caching with inverse roles: a cached label still sends ¬X1 back through
    // ∀r⁻, and an at-most restriction on s⁻ that counts the predecessor forces X2 ⊑ C.
    sat_cache_with_inverse_roles: "sat-cache-inverse",
        "hand-derived, SHIQ semantics; the caching traps of Horrocks & Sattler 1999 §5 and Ding & Haarslev 2006";
    // Trans(t), s ⊑ t: ∃s.∃s.C ⊑ ∃t.C.
    transitivity_through_sub_property: "transitivity", "hand-derived, SHIQ semantics";
    // Functional f, inverse-functional g: two different successors clash.
    functional_and_inverse_functional: "functional", "hand-derived, SHIQ semantics";
    functional_property_merges_abox: "functional-abox", "hand-derived, SHIQ semantics";
    inverse_functional_merges_abox: "inverse-functional-abox", "hand-derived, SHIQ semantics";
    // Integer in (3, 4) empty, decimal in (3, 4) not; integer ⊂ decimal.
    numeric_range_gaps: "numeric-ranges", "hand-derived, OWL 2 Structural Specification §4";
    // xsd:double disjoint from xsd:decimal.
    double_and_decimal_are_disjoint: "double-vs-decimal",
        "hand-derived, OWL 2 Structural Specification §4.1";
    // DataHasValue outside the range; a functional data property with two disjoint ranges.
    data_range_clashes: "data-range-clash", "hand-derived, OWL 2 Direct Semantics";
    data_value_outside_range_abox: "data-range-abox", "hand-derived, OWL 2 Direct Semantics";
    functional_data_property_abox: "functional-data-abox", "hand-derived, OWL 2 Direct Semantics";
    // DisjointUnion(Animal Cat Dog Bird).
    disjoint_union: "disjoint-union", "hand-derived, OWL 2 Structural Specification §9.1.4";
    // ClassAssertion(ObjectHasValue(p b) a) and friends.
    has_value_in_abox: "has-value-abox", "hand-derived, OWL 2 Direct Semantics";
    has_value_in_tbox: "has-value-tbox", "hand-derived, OWL 2 Direct Semantics";
    one_of_in_abox: "one-of-abox", "hand-derived, OWL 2 Direct Semantics";
    // A class satisfiable only in infinite models (needs blocking with inverses).
    infinite_model_only: "infinite-model", "hand-derived, SHIQ semantics";
}

/// The real ontology: Brick 1.1 from the brickschema 0.8.0 PyPI package (BSD-3-Clause),
/// expected answer from HermiT 1.3.8 in owlready2 0.51 (tests/fixtures/real/README.md).
/// Run with `--lenient`: its 42 asymmetric and irreflexive property axioms are outside
/// SHIQ, and HermiT's classification is the same without them (checked by
/// scripts/real-ontology).
#[test]
fn real_ontology_brick_1_1_agrees_with_oracle() {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/real");
    let case = Case {
        ontology: dir.join("brick-1.1.ofn"),
        expected: dir.join("brick-1.1.json"),
        source: "HermiT 1.3.8 (owlready2 0.51), tests/fixtures/real/README.md".to_owned(),
        extra_args: vec!["--lenient"],
    };
    let failures: Vec<String> = check(&case)
        .err()
        .map(|r| format!("{}:\n{}", case.ontology.display(), r.trim_end()))
        .into_iter()
        .collect();
    assert_no_failures("real ontologies", 1, &failures);
}

/// horned-owl reads every published fixture and the real ontology completely, comments
/// included, so that a failure above is never a parse gap of the test files.
#[test]
fn fixtures_parse_with_horned_owl() {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures");
    let mut files: Vec<PathBuf> = std::fs::read_dir(root.join("published"))
        .expect("published fixtures")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "ofn"))
        .collect();
    files.push(root.join("real/brick-1.1.ofn"));
    // 19 published files (tests/fixtures/published/README.md) plus Brick.
    assert_eq!(files.len(), 20);
    for f in files {
        let n = parse_with_horned_owl(&f).unwrap_or_else(|e| panic!("{e}"));
        assert!(n >= 2, "{}: only {n} components", f.display());
    }
}

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
    // A plain string literal where the range is xsd:dateTime: inconsistent.
    string_where_datetime_required: "datetime-string-abox",
        "hand-derived, OWL 2 Structural Specification §4 (disjoint value spaces)";
    // length, minLength, maxLength and pattern facets; xsd:token.
    string_facets: "string-facets", "hand-derived, XSD 1.1 Part 2 §4.3";
    // Decimals and rationals without rounding.
    exact_decimals: "exact-decimals", "hand-derived, OWL 2 Structural Specification §4.1";
    // Qualified data cardinalities over finite ranges.
    data_cardinality: "data-cardinality", "hand-derived, OWL 2 Direct Semantics";
    // Equal instants in two timezones are one value; a local time is another.
    datetime_zones: "datetime-zones", "hand-derived, XSD 1.1 Part 2 §3.3.7";
}

/// Classifies tests/fixtures/real/FILE and compares with the oracle's recorded answer
/// (the file's name with `.json`).
fn run_real(file: &str, extra_args: Vec<&'static str>) {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/real");
    let name = file.rsplit_once('.').map_or(file, |(stem, _)| stem);
    let case = Case {
        ontology: dir.join(file),
        expected: dir.join(format!("{name}.json")),
        source: "HermiT 1.3.8 (owlready2 0.51), tests/fixtures/real/README.md".to_owned(),
        extra_args,
    };
    let failures: Vec<String> = check(&case)
        .err()
        .map(|r| format!("{}:\n{}", case.ontology.display(), r.trim_end()))
        .into_iter()
        .collect();
    assert_no_failures("real ontologies", 1, &failures);
}

/// The real ontology: Brick 1.1 from the brickschema 0.8.0 PyPI package (BSD-3-Clause),
/// all its logical axioms, 21 asymmetric and 21 irreflexive properties included. Expected
/// answer from HermiT 1.3.8 in owlready2 0.51 (tests/fixtures/real/README.md).
#[test]
fn real_ontology_brick_1_1_agrees_with_oracle() {
    run_real("brick-1.1.ofn", Vec::new());
}

/// RiC-O 1.0.2 (International Council on Archives, CC-BY-4.0) from the npm package
/// @vocabulary/rico 2.0.1, unreduced: 108 classes, 336 inverse pairs, 22 transitive and 16
/// symmetric properties, 84 property chains, 48 `ObjectHasSelf` definitions. Expected
/// answer: HermiT 1.3.8 (owlready2 0.51) on this file, 297 subsumptions. Before
/// `∃r.Self ⊑ C` was absorbed as a loop trigger, wherefore gave no answer in 150 s of CPU.
#[test]
fn real_ontology_rico_agrees_with_oracle() {
    run_real("rico-1.0.2.ofn", Vec::new());
}

/// DBpedia ontology 4.2 (CC-BY-SA-3.0) from the npm package @vocabulary/dbo 1.1.0: 1,168
/// classes, 50 disjointness axioms, string, boolean, dateTime and language-tagged string
/// ranges (only the ranges outside the OWL 2 datatype map removed). Expected answer:
/// HermiT 1.3.8 (owlready2 0.51), 8,146 subsumptions and 3 unsatisfiable classes
/// (dbo:Library is both a Building, a Place, and an EducationalInstitution, an Agent, and
/// Agent and Place are disjoint).
#[test]
fn real_ontology_dbpedia_agrees_with_oracle() {
    run_real("dbpedia-4.2.ofn", Vec::new());
}

/// W3C/OGC SOSA + SSN (2017, W3C Software and Document licence) from the npm packages
/// @vocabulary/sosa and @vocabulary/ssn 1.0.6, unreduced: inverse, functional and
/// inverse-functional properties, qualified object and data cardinalities, 4 property
/// chains, an xsd:dateTime range. Expected answer: HermiT 1.3.8 (owlready2 0.51) on this
/// file, 7 subsumptions.
#[test]
fn real_ontology_ssn_agrees_with_oracle() {
    run_real("ssn-2017.ofn", Vec::new());
}

/// W3C/OGC Time Ontology in OWL (2017, CC-BY-4.0) from the npm package @vocabulary/time
/// 1.0.6: unions, object and data cardinalities, a transitive property, disjoint object
/// properties, a functional property with a value in the TBox, data assertions (only the
/// axioms naming xsd:gYear and other datatypes outside the OWL 2 datatype map removed).
/// Expected answer: HermiT 1.3.8 (owlready2 0.51) on this file, 25 subsumptions.
#[test]
fn real_ontology_owl_time_agrees_with_oracle() {
    run_real("time-2017.ofn", Vec::new());
}

/// The tawny-owl pizza in RDF/XML, byte for byte from the horned-owl 4.0.0 crate
/// (LGPL-3.0): 78 classes, 8 owl:AllDisjointClasses lists that horned-owl alone leaves
/// unread. Expected answer: HermiT 1.3.8 (owlready2 0.51) on the same file, 146
/// subsumptions (tests/fixtures/real/README.md).
#[test]
fn real_ontology_pizza_rdf_xml_agrees_with_oracle() {
    run_real("pizza-tawny.owl", Vec::new());
}

/// horned-owl reads every published fixture and the real ontologies completely, comments
/// included, so that a failure above is never a parse gap of the test files.
#[test]
fn fixtures_parse_with_horned_owl() {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures");
    let mut files: Vec<PathBuf> = std::fs::read_dir(root.join("published"))
        .expect("published fixtures")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "ofn"))
        .collect();
    for name in [
        "brick-1.1",
        "rico-1.0.2",
        "dbpedia-4.2",
        "ssn-2017",
        "time-2017",
    ] {
        files.push(root.join(format!("real/{name}.ofn")));
    }
    // 24 published files (tests/fixtures/published/README.md) plus five real ontologies.
    assert_eq!(files.len(), 29);
    for f in files {
        let n = parse_with_horned_owl(&f).unwrap_or_else(|e| panic!("{e}"));
        assert!(n >= 2, "{}: only {n} components", f.display());
    }
}

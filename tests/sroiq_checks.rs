//! Hand-derived reasoning checks for the constructs beyond SHIQ: property chains, self
//! restrictions, reflexive, irreflexive, asymmetric and disjoint properties (object and data),
//! keys (on object and data properties), nominals
//! anywhere in the TBox, and the top and bottom properties. Each `.ofn` under
//! tests/fixtures/sroiq/ carries its source and derivation in its header comment; HermiT
//! 1.3.8 (owlready2 0.51) agrees on every file but `key-complex-class`, whose comment says
//! why the definition decides against it.

#[path = "fixtures/oracle/harness.rs"]
mod harness;

use harness::{assert_refused, check_hand_derived, parse_with_horned_owl};
use std::path::PathBuf;

fn dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/sroiq")
}

fn run(name: &str) {
    check_hand_derived("SROIQ checks", &dir(), name);
}

macro_rules! sroiq {
    ($($test:ident: $file:literal;)*) => {
        $(
            #[test]
            fn $test() {
                run($file);
            }
        )*
    };
}

sroiq! {
    // properPartOf ∘ leftOf ⊑ leftOf: a lesion in the left kidney lies left of the liver.
    chain_part_inherits_position: "chain-part-position";
    // hasParent ∘ hasBrother ⊑ hasUncle (OWL 2 Primer §9.2), both directions, with ∀.
    chain_uncle_both_directions: "chain-uncle";
    self_irreflexive_asymmetric: "self-irreflexive-asymmetric";
    self_definition_fires_on_loops: "self-trigger";
    reflexive_property: "reflexive";
    disjoint_properties: "disjoint-properties";
    key_on_object_property: "key-object";
    key_on_a_union_class: "key-complex-class";
    key_leaves_anonymous_individuals: "key-anonymous";
    // Keys over data properties: values asserted, forced by ranges, counted, or absent.
    key_data_equal_literals: "key-data-literal";
    key_data_values_forced_by_ranges: "key-data-forced";
    key_data_pigeonhole_over_booleans: "key-data-pigeonhole";
    key_data_pigeonhole_over_an_interval: "key-data-pigeonhole-interval";
    key_data_two_booleans_stay_apart: "key-data-two-booleans";
    key_data_leaves_anonymous_individuals: "key-data-anonymous";
    key_data_through_sub_property: "key-data-subproperty";
    key_data_object_and_data_properties: "key-data-mixed";
    key_data_needs_the_object_filler: "key-data-mixed-no-ward";
    key_data_against_a_cardinality: "key-data-cardinality";
    nominal_with_functional_property: "nominal-functional";
    nominal_with_inverse_at_most: "nominal-counting";
    // An inverse-functional chain overflows a nominal's at-most restriction past blocking.
    nominal_at_most_past_blocking: "nominal-chain";
    complement_of_enumeration: "nominal-complement";
    // The OWL 2 Primer's ages: definitions used before they are given, one built from two.
    datatype_definitions: "datatype-definition";
    top_and_bottom_properties: "top-bottom-properties";
    // The universal role inside class expressions (∃U, ∀U, nested, with ∃U.{a}).
    universal_role_in_the_tbox: "universal-tbox";
    // ∀U reaches every element, named or anonymous; an ABox fact makes ∃U true everywhere.
    universal_role_with_facts: "universal-abox";
    universal_role_inconsistent: "universal-inconsistent";
    bottom_data_property: "bottom-data";
    // Disjoint data properties: one literal may not be a value of both at one individual.
    disjoint_data_equal_asserted_values: "disjoint-data-asserted";
    disjoint_data_equal_values_written_differently: "disjoint-data-lexical";
    disjoint_data_integer_and_decimal_are_one_value: "disjoint-data-decimal";
    disjoint_data_different_value_spaces: "disjoint-data-spaces";
    disjoint_data_through_sub_property: "disjoint-data-subproperty";
    disjoint_data_restrictions: "disjoint-data-restrictions";
    disjoint_data_counting: "disjoint-data-counting";
    disjoint_data_entailed_subsumption: "disjoint-data-subsumption";
    // The joint check of key members' values respects the disjointness.
    key_data_with_disjoint_property: "key-data-disjoint";
}

/// horned-owl reads every fixture here completely, so a failure above is never a parse gap.
#[test]
fn sroiq_fixtures_parse_with_horned_owl() {
    let mut n = 0;
    for e in std::fs::read_dir(dir()).expect("fixtures") {
        let p = e.expect("entry").path();
        if p.extension().is_some_and(|x| x == "ofn") {
            let k = parse_with_horned_owl(&p).unwrap_or_else(|e| panic!("{e}"));
            assert!(k >= 2, "{}: only {k} components", p.display());
            n += 1;
        }
    }
    assert_eq!(n, 38);
}

/// A cycle among datatype definitions is outside OWL 2 DL (Structural Specification §11.2):
/// exit 2, with the cycle named; so is a facet on a defined datatype (§7.5).
#[test]
fn datatype_definition_refusals_name_the_problem() {
    let head = "Prefix(:=<http://example.org/d#>)\nPrefix(xsd:=<http://www.w3.org/2001/XMLSchema#>)\nOntology(<http://example.org/d>\nDeclaration(Datatype(:a)) Declaration(Datatype(:b))\n";
    assert_refused(
        "dtdef",
        head,
        &[
            (
                "cycle.ofn",
                "DatatypeDefinition(:a DataUnionOf(:b xsd:string))\nDatatypeDefinition(:b DataComplementOf(:a))\n",
                "http://example.org/d#a -> http://example.org/d#b -> http://example.org/d#a",
            ),
            (
                "facet.ofn",
                "DatatypeDefinition(:a xsd:integer)\nDatatypeDefinition(:b DatatypeRestriction(:a xsd:minInclusive \"1\"^^xsd:integer))\n",
                "a datatype defined in the ontology",
            ),
            (
                "redefine.ofn",
                "DatatypeDefinition(xsd:integer xsd:string)\n",
                "cannot be redefined",
            ),
        ],
    );
}

/// What OWL 2 DL forbids of the top properties is refused with the section named (exit 2):
/// owl:topObjectProperty is not simple (Structural Specification §11.1), so it may not carry
/// number or self restrictions nor be functional; owl:topDataProperty may appear only as a
/// super-property (§11.2). HermiT 1.3.8 refuses the same axioms.
#[test]
fn top_property_refusals_cite_owl2_dl() {
    let head = "Prefix(:=<http://example.org/t#>)\nPrefix(owl:=<http://www.w3.org/2002/07/owl#>)\nPrefix(xsd:=<http://www.w3.org/2001/XMLSchema#>)\nOntology(<http://example.org/t>\nDeclaration(Class(:A)) Declaration(NamedIndividual(:a))\n";
    assert_refused(
        "top",
        head,
        &[
            (
                "at-most.ofn",
                "SubClassOf(owl:Thing ObjectMaxCardinality(2 owl:topObjectProperty :A))\n",
                "§11.1",
            ),
            (
                "self.ofn",
                "SubClassOf(:A ObjectHasSelf(owl:topObjectProperty))\n",
                "§11.1",
            ),
            (
                "functional.ofn",
                "FunctionalObjectProperty(owl:topObjectProperty)\n",
                "§11.1",
            ),
            (
                "top-data.ofn",
                "DataPropertyAssertion(owl:topDataProperty :a \"x\")\n",
                "§11.2",
            ),
            (
                "top-data-some.ofn",
                "SubClassOf(:A DataSomeValuesFrom(owl:topDataProperty xsd:integer))\n",
                "§11.2",
            ),
        ],
    );
}

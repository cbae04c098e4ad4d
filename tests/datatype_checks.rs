//! Hand-derived reasoning checks for datatype features of the OWL 2 datatype map run
//! through the whole tool (`wherefore classify`): Unicode block escapes in `xsd:pattern`
//! and rdf:XMLLiteral. Each `.ofn` under tests/fixtures/datatypes/ carries its derivation
//! in its header comment; the folder's README records what HermiT says on each.

#[path = "fixtures/oracle/harness.rs"]
mod harness;

use harness::check_hand_derived;
use std::path::PathBuf;

fn dir() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/datatypes")
}

fn run(name: &str) {
    check_hand_derived("datatype checks", &dir(), name);
}

macro_rules! datatypes {
    ($($test:ident: $file:literal;)*) => {
        $(
            #[test]
            fn $test() {
                run($file);
            }
        )*
    };
}

datatypes! {
    // Block escapes: disjoint blocks, a class subtraction inside a block, a negated block.
    block_escapes_in_patterns: "block-pattern";
    // A range with a block escape, and a name outside it.
    block_escape_range_clash: "block-pattern-range";
    // rdf:XMLLiteral: equal values written differently, different values, an ill-typed
    // lexical form, and the same characters as an xsd:string.
    xml_literals_written_differently_are_equal: "xml-literal-equal";
    xml_literals_that_differ_clash_when_functional: "xml-literal-different";
    xml_literal_ill_typed_is_inconsistent: "xml-literal-ill-typed";
    xml_literal_is_not_a_string: "xml-literal-string";
    // Where HermiT follows the RDF 2004 definition (exclusive canonical XML) and RDF 1.1's
    // DOM comparison decides otherwise.
    xml_literal_attribute_prefixes_do_not_count: "xml-literal-attribute-prefix";
    xml_literal_namespace_declarations_count: "xml-literal-namespace-declaration";
}

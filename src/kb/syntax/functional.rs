//! Short names in OWL 2 functional syntax. The text is kept as written; each name that
//! stands where an entity goes is resolved through `kb::names` by its position in the
//! axiom (the argument lists of the OWL 2 Structural Specification, §§8–11: the first
//! argument of `ClassAssertion` is a class, the second an individual, and so on). A bare
//! word or a 'quoted label' is replaced by its full IRI; prefixed names and `<IRIs>` stay as
//! they are (the loader reads them) but are checked the same way, so that an unknown name
//! gets the shell's messages and suggestions wherever it is written.

use super::tokens::{Tok, Token, tokenize};
use super::{ParseError, entity};
use crate::kb::names::{EntityIndex, Kind};

/// What may stand at one argument of a functional-syntax construct.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Slot {
    /// An entity of this kind (or an expression built from them).
    Is(Kind),
    /// A parenthesised list of entities of this kind (the property lists of `HasKey`).
    ListOf(Kind),
    /// Anything else: literals, data ranges, annotations, numbers; left alone.
    Other,
}

use Kind::{Class as C, DataProperty as D, Individual as I, ObjectProperty as P};
use Slot::{Is, ListOf, Other};

/// The arguments of each construct; the last one repeats (`EquivalentClasses(C C C ...)`).
/// A construct not listed leaves its arguments alone (its nested constructs still count).
fn arguments(keyword: &str) -> &'static [Slot] {
    match keyword {
        "SubClassOf"
        | "EquivalentClasses"
        | "DisjointClasses"
        | "DisjointUnion"
        | "ObjectIntersectionOf"
        | "ObjectUnionOf"
        | "ObjectComplementOf"
        | "Class" => &[Is(C)],
        "ClassAssertion" => &[Is(C), Is(I)],
        "ObjectPropertyAssertion" | "NegativeObjectPropertyAssertion" => &[Is(P), Is(I)],
        "DataPropertyAssertion" | "NegativeDataPropertyAssertion" => &[Is(D), Is(I), Other],
        "SameIndividual" | "DifferentIndividuals" | "ObjectOneOf" | "NamedIndividual" => &[Is(I)],
        "SubObjectPropertyOf"
        | "EquivalentObjectProperties"
        | "DisjointObjectProperties"
        | "InverseObjectProperties"
        | "ObjectPropertyChain"
        | "ObjectInverseOf"
        | "ObjectHasSelf"
        | "ObjectProperty"
        | "FunctionalObjectProperty"
        | "InverseFunctionalObjectProperty"
        | "ReflexiveObjectProperty"
        | "IrreflexiveObjectProperty"
        | "SymmetricObjectProperty"
        | "AsymmetricObjectProperty"
        | "TransitiveObjectProperty" => &[Is(P)],
        "ObjectPropertyDomain"
        | "ObjectPropertyRange"
        | "ObjectSomeValuesFrom"
        | "ObjectAllValuesFrom" => &[Is(P), Is(C)],
        "ObjectHasValue" => &[Is(P), Is(I)],
        "ObjectMinCardinality" | "ObjectMaxCardinality" | "ObjectExactCardinality" => {
            &[Other, Is(P), Is(C)]
        }
        "SubDataPropertyOf"
        | "EquivalentDataProperties"
        | "DisjointDataProperties"
        | "FunctionalDataProperty"
        | "DataProperty" => &[Is(D)],
        "DataPropertyDomain" => &[Is(D), Is(C)],
        "DataPropertyRange" | "DataSomeValuesFrom" | "DataAllValuesFrom" | "DataHasValue" => {
            &[Is(D), Other]
        }
        "DataMinCardinality" | "DataMaxCardinality" | "DataExactCardinality" => {
            &[Other, Is(D), Other]
        }
        "HasKey" => &[Is(C), ListOf(P), ListOf(D)],
        _ => &[Other],
    }
}

/// One open parenthesis: the arguments it takes and how many it has seen.
struct Frame {
    args: &'static [Slot],
    seen: usize,
}

impl Frame {
    /// The slot of the next argument.
    fn peek(&self) -> Slot {
        self.args[self.seen.min(self.args.len() - 1)]
    }
    /// The slot of the next argument, counting it.
    fn next(&mut self) -> Slot {
        let s = self.peek();
        self.seen += 1;
        s
    }
}

/// Whether a word followed by `(` opens a construct: it does when the parenthesis touches
/// it, when an entity cannot stand there, or when the word is a construct's keyword; else
/// it is a name before a list (`HasKey(C (p) ())`).
fn opens_construct(word: &str, touching: bool, slot: Slot) -> bool {
    touching
        || !matches!(slot, Is(_))
        || arguments(word) != [Other]
        || super::FUNCTIONAL.contains(&word)
}

/// Writes each short name of a functional-syntax text as its full IRI, after checking every
/// name in an entity's place (see the module comment). `allow_new` lets `<IRI>`s and
/// prefixed names name entities the knowledge base does not know yet.
pub fn expand_functional(
    text: &str,
    names: &EntityIndex,
    allow_new: bool,
) -> Result<String, ParseError> {
    let toks = tokenize(text)?;
    let mut stack = vec![Frame {
        args: &[Other],
        seen: 0,
    }];
    let mut out = String::with_capacity(text.len());
    let mut copied = 0;
    let mut k = 0;
    while k < toks.len() {
        let Token { tok, at, end } = &toks[k];
        let top = stack.len() - 1;
        let opens = match (tok, toks.get(k + 1)) {
            (Tok::Word(w), Some(next)) if next.tok == Tok::Punct('(') => {
                opens_construct(w, next.at == *end, stack[top].peek())
            }
            _ => false,
        };
        match tok {
            Tok::Word(w) if opens => {
                // Annotations ride along any axiom and are not one of its arguments.
                if w != "Annotation" {
                    stack[top].next();
                }
                stack.push(Frame {
                    args: arguments(w),
                    seen: 0,
                });
                k += 1;
            }
            Tok::Punct('(') => {
                let args: &'static [Slot] = match stack[top].next() {
                    ListOf(kind) => match kind {
                        P => &[Is(P)],
                        _ => &[Is(D)],
                    },
                    _ => &[Other],
                };
                stack.push(Frame { args, seen: 0 });
            }
            Tok::Punct(')') if stack.len() > 1 => {
                stack.pop();
            }
            Tok::Word(_) | Tok::Iri(_) | Tok::Quoted(_) => {
                if let Is(kind) = stack[top].next() {
                    let written = match tok {
                        Tok::Iri(i) => format!("<{i}>"),
                        Tok::Word(w) | Tok::Quoted(w) => w.clone(),
                        _ => unreachable!("matched above"),
                    };
                    // Anonymous individuals (`_:x`) are not names.
                    let anonymous = written.starts_with("_:");
                    if !anonymous {
                        let (_, iri) = entity(names, &written, &[kind], allow_new, *at)?;
                        let short = matches!(tok, Tok::Quoted(_))
                            || matches!(tok, Tok::Word(w) if !w.contains(':'));
                        if short {
                            out.push_str(&text[copied..*at]);
                            out.push_str(&format!("<{iri}>"));
                            copied = *end;
                        }
                    }
                }
            }
            Tok::Number(_) | Tok::Str(_) => {
                stack[top].next();
            }
            _ => {}
        }
        k += 1;
    }
    out.push_str(&text[copied..]);
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn index() -> EntityIndex {
        crate::kb::syntax::tests::index_of(
            "Prefix(:=<http://ex.org/t#>)\nSubClassOf(:RenalCyst :Lesion)\nObjectPropertyAssertion(:near :c1 :k1)\nAnnotationAssertion(rdfs:label :RenalCyst \"renal cyst\")\nDataPropertyAssertion(:size :c1 \"1\"^^xsd:integer)",
        )
    }

    const T: &str = "http://ex.org/t#";

    // Hand-derived: each bare name gets the IRI of the entity of the kind its position
    // wants; prefixed names, literals and datatypes stay as written.
    #[test]
    fn names_by_position() {
        let ix = index();
        let f = |s: &str| expand_functional(s, &ix, false).unwrap();
        assert_eq!(
            f("SubClassOf(RenalCyst Lesion)"),
            format!("SubClassOf(<{T}RenalCyst> <{T}Lesion>)")
        );
        assert_eq!(
            f("ClassAssertion('renal cyst' c1)"),
            format!("ClassAssertion(<{T}RenalCyst> <{T}c1>)")
        );
        assert_eq!(
            f("ObjectPropertyAssertion(near c1 :k1)"),
            format!("ObjectPropertyAssertion(<{T}near> <{T}c1> :k1)")
        );
        assert_eq!(
            f("DataPropertyAssertion(size c1 \"1\"^^xsd:integer)"),
            format!("DataPropertyAssertion(<{T}size> <{T}c1> \"1\"^^xsd:integer)")
        );
        assert_eq!(
            f(
                "SubClassOf(Annotation(rdfs:comment \"x\"@en) Lesion ObjectMinCardinality(2 near RenalCyst))"
            ),
            format!(
                "SubClassOf(Annotation(rdfs:comment \"x\"@en) <{T}Lesion> ObjectMinCardinality(2 <{T}near> <{T}RenalCyst>))"
            )
        );
        assert_eq!(
            f("HasKey(Lesion (near) (size))"),
            format!("HasKey(<{T}Lesion> (<{T}near>) (<{T}size>))")
        );
        // Two axioms, as a case's assertions hold them.
        assert_eq!(
            f("ClassAssertion(Lesion k1)\nClassAssertion(Lesion c1)"),
            format!("ClassAssertion(<{T}Lesion> <{T}k1>)\nClassAssertion(<{T}Lesion> <{T}c1>)")
        );
    }

    #[test]
    fn unknown_names_point_at_themselves_with_suggestions() {
        let ix = index();
        // "SubClassOf(RenalCist Lesion)": `RenalCist` starts at byte 11.
        let e = expand_functional("SubClassOf(RenalCist Lesion)", &ix, false).unwrap_err();
        assert_eq!(e.offset, 11);
        assert!(
            e.message.contains("did you mean `RenalCyst`?"),
            "{}",
            e.message
        );
        // A prefixed name the KB does not know, with the near fragment suggested.
        let e = expand_functional("SubClassOf(:Lesoin :RenalCyst)", &ix, false).unwrap_err();
        assert!(
            e.message
                .starts_with(&format!("unknown class <{T}Lesoin>; it does not occur")),
            "{}",
            e.message
        );
        assert!(
            e.message.contains("did you mean `Lesion`?"),
            "{}",
            e.message
        );
        let e = expand_functional("ClassAssertion(zz:A c1)", &ix, false).unwrap_err();
        assert!(
            e.message.starts_with("unknown prefix `zz:`"),
            "{}",
            e.message
        );
        // New entities need a prefixed name or an IRI, as in the shell.
        assert_eq!(
            expand_functional("ClassAssertion(Lesion :c9)", &ix, true).unwrap(),
            format!("ClassAssertion(<{T}Lesion> :c9)")
        );
        assert!(expand_functional("ClassAssertion(Lesion c9)", &ix, true).is_err());
    }
}

//! The knowledge base: interned vocabulary, hash-consed concepts in negation normal form,
//! axioms, annotations, and loading through horned-owl (only `owl.rs` imports it).

pub mod concept;
pub mod datarange;
pub mod datatype;
pub mod dl;
pub mod error;
pub mod load;
pub mod names;
pub mod owl;
pub mod syntax;
pub mod universal;

pub use concept::{Concept, ConceptId, ConceptStore};
pub use datarange::{DataRange, DataRangeId, DataRangeStore};
pub use error::KbError;

use indexmap::IndexSet;
use std::collections::BTreeMap;

/// The IRI of owl:Thing.
pub const OWL_THING: &str = "http://www.w3.org/2002/07/owl#Thing";
/// The IRI of owl:Nothing.
pub const OWL_NOTHING: &str = "http://www.w3.org/2002/07/owl#Nothing";

macro_rules! id_type {
    ($(#[$m:meta])* $name:ident) => {
        $(#[$m])*
        #[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord, serde::Serialize, Default)]
        pub struct $name(pub u32);
        impl $name {
            /// Index for array look-ups.
            pub fn index(self) -> usize {
                self.0 as usize
            }
        }
    };
}

id_type!(
    /// A named class.
    ClassId
);
id_type!(
    /// A named individual.
    IndividualId
);
id_type!(
    /// A data property.
    DataPropId
);
id_type!(
    /// A named object property (without direction).
    PropId
);
id_type!(
    /// An object property or its inverse: `2·p` is p, `2·p + 1` is p⁻.
    RoleId
);

impl RoleId {
    /// The role p itself.
    pub fn named(p: PropId) -> RoleId {
        RoleId(p.0 * 2)
    }
    /// The inverse of this role.
    pub fn inverse(self) -> RoleId {
        RoleId(self.0 ^ 1)
    }
    /// The named property under this role.
    pub fn prop(self) -> PropId {
        PropId(self.0 >> 1)
    }
    /// Whether this is an inverse role.
    pub fn is_inverse(self) -> bool {
        self.0 & 1 == 1
    }
}

/// Interned IRIs of each kind of entity.
#[derive(Clone, Debug, Default)]
pub struct Vocabulary {
    /// Named classes (owl:Thing and owl:Nothing are not interned as classes).
    pub classes: IndexSet<String>,
    /// Named object properties.
    pub props: IndexSet<String>,
    /// Data properties.
    pub data_props: IndexSet<String>,
    /// Named individuals (anonymous individuals get a `_:` name).
    pub individuals: IndexSet<String>,
}

impl Vocabulary {
    /// Interns a class IRI.
    pub fn class(&mut self, iri: &str) -> ClassId {
        ClassId(self.classes.insert_full(iri.to_string()).0 as u32)
    }
    /// Interns an object property IRI.
    pub fn prop(&mut self, iri: &str) -> PropId {
        PropId(self.props.insert_full(iri.to_string()).0 as u32)
    }
    /// Interns a data property IRI.
    pub fn data_prop(&mut self, iri: &str) -> DataPropId {
        DataPropId(self.data_props.insert_full(iri.to_string()).0 as u32)
    }
    /// Interns an individual IRI.
    pub fn individual(&mut self, iri: &str) -> IndividualId {
        IndividualId(self.individuals.insert_full(iri.to_string()).0 as u32)
    }
    /// The IRI of a class.
    pub fn class_iri(&self, c: ClassId) -> &str {
        &self.classes[c.index()]
    }
    /// The IRI of an individual.
    pub fn individual_iri(&self, a: IndividualId) -> &str {
        &self.individuals[a.index()]
    }
    /// The IRI of a named property.
    pub fn prop_iri(&self, p: PropId) -> &str {
        &self.props[p.index()]
    }
    /// Looks up a class by IRI.
    pub fn find_class(&self, iri: &str) -> Option<ClassId> {
        self.classes.get_index_of(iri).map(|i| ClassId(i as u32))
    }
    /// Looks up an object property by IRI.
    pub fn find_prop(&self, iri: &str) -> Option<PropId> {
        self.props.get_index_of(iri).map(|i| PropId(i as u32))
    }
    /// Looks up an individual by IRI.
    pub fn find_individual(&self, iri: &str) -> Option<IndividualId> {
        self.individuals
            .get_index_of(iri)
            .map(|i| IndividualId(i as u32))
    }
}

/// A logical axiom in the internal vocabulary, before the reasoner's normalisation.
#[derive(Clone, Debug, PartialEq)]
pub enum Axiom {
    /// C ⊑ D.
    SubClass(ConceptId, ConceptId),
    /// C₁ ≡ … ≡ Cₙ.
    Equivalent(Vec<ConceptId>),
    /// Cᵢ ⊓ Cⱼ ⊑ ⊥ for i ≠ j.
    Disjoint(Vec<ConceptId>),
    /// A ≡ C₁ ⊔ … ⊔ Cₙ with the Cᵢ pairwise disjoint.
    DisjointUnion(ConceptId, Vec<ConceptId>),
    /// r ⊑ s.
    SubRole(RoleId, RoleId),
    /// r is transitive.
    Transitive(RoleId),
    /// r₁ ∘ … ∘ rₙ ⊑ s (a property chain, n ≥ 2).
    SubRoleChain(Vec<RoleId>, RoleId),
    /// r is reflexive (⊤ ⊑ ∃r.Self).
    Reflexive(RoleId),
    /// r is irreflexive (⊤ ⊑ ¬∃r.Self).
    Irreflexive(RoleId),
    /// r is asymmetric (r and r⁻ are disjoint).
    Asymmetric(RoleId),
    /// The roles are pairwise disjoint.
    DisjointRoles(Vec<RoleId>),
    /// HasKey(C (r…) (p…)) with the DL-safe semantics: two named individuals in C with the
    /// same named r-fillers and the same p-values are equal.
    HasKey(ConceptId, Vec<RoleId>, Vec<DataPropId>),
    /// r is functional (⊤ ⊑ ≤1 r.⊤).
    Functional(RoleId),
    /// Domain of r: ∃r.⊤ ⊑ C.
    Domain(RoleId, ConceptId),
    /// p ⊑ q for data properties.
    SubDataProp(DataPropId, DataPropId),
    /// p is a functional data property.
    FunctionalData(DataPropId),
    /// The data properties are pairwise disjoint: no individual has one value for two of them.
    DisjointDataProps(Vec<DataPropId>),
    /// Domain of a data property: ∃p.⊤ ⊑ C.
    DataDomain(DataPropId, ConceptId),
    /// Range of a data property: ⊤ ⊑ ∀p.D.
    DataRangeAxiom(DataPropId, DataRangeId),
    /// C(a).
    ClassAssertion(ConceptId, IndividualId),
    /// r(a, b).
    RoleAssertion(RoleId, IndividualId, IndividualId),
    /// ¬r(a, b).
    NegativeRoleAssertion(RoleId, IndividualId, IndividualId),
    /// a = b for all listed.
    Same(Vec<IndividualId>),
    /// Pairwise distinct.
    Different(Vec<IndividualId>),
}

impl Axiom {
    /// Whether the axiom is an ABox assertion.
    pub fn is_assertion(&self) -> bool {
        matches!(
            self,
            Axiom::ClassAssertion(..)
                | Axiom::RoleAssertion(..)
                | Axiom::NegativeRoleAssertion(..)
                | Axiom::Same(..)
                | Axiom::Different(..)
        )
    }
}

/// An axiom with where it came from.
#[derive(Clone, Debug)]
pub struct SourcedAxiom {
    /// The internal axiom.
    pub axiom: Axiom,
    /// Index of the source axiom (in [`KnowledgeBase::sources`]) it was translated from.
    pub source: usize,
}

/// A source axiom as written, for justifications and messages.
#[derive(Clone, Debug)]
pub struct SourceAxiom {
    /// OWL 2 functional-syntax text of the axiom, full IRIs.
    pub text: String,
    /// The file it came from.
    pub file: String,
    /// Annotations on the axiom: (property IRI, value).
    pub annotations: Vec<(String, String)>,
}

/// An annotation value with its language tag, if any.
#[derive(Clone, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub struct AnnotationValue {
    /// The lexical value (or an IRI).
    pub value: String,
    /// The language tag, empty when none.
    pub lang: String,
}

/// The loaded knowledge base.
#[derive(Clone, Debug, Default)]
pub struct KnowledgeBase {
    /// Interned IRIs.
    pub vocab: Vocabulary,
    /// Hash-consed concepts.
    pub concepts: ConceptStore,
    /// Interned data ranges.
    pub ranges: DataRangeStore,
    /// The axioms in internal form.
    pub axioms: Vec<SourcedAxiom>,
    /// The source axioms as written.
    pub sources: Vec<SourceAxiom>,
    /// Annotations on entities: subject IRI → property IRI → values.
    pub annotations: BTreeMap<String, BTreeMap<String, Vec<AnnotationValue>>>,
    /// Classes that appear in the signature of the loaded files (for classification output).
    pub signature_classes: Vec<ClassId>,
    /// Warnings gathered while loading (missing imports, skipped axioms...).
    pub warnings: Vec<String>,
    /// Whether something was left out (a missing import, a dropped axiom), so results may
    /// be incomplete.
    pub incomplete: bool,
    /// Whether nominals survive in the TBox after the ABox rewrites.
    pub tbox_nominals: bool,
    /// The files loaded, in order.
    pub files: Vec<String>,
    /// Datatypes named by `DatatypeDefinition` axioms, by IRI, with the ranges they stand for.
    pub datatype_defs: BTreeMap<String, DataRange>,
    /// The link property and hub individual that encode the universal role, once a class
    /// expression uses it ([`universal`]).
    pub universal: Option<(PropId, IndividualId)>,
}

impl KnowledgeBase {
    /// An empty knowledge base.
    pub fn new() -> Self {
        Self::default()
    }

    /// Adds an axiom that came from source axiom `source`.
    pub fn push(&mut self, axiom: Axiom, source: usize) {
        self.axioms.push(SourcedAxiom { axiom, source });
    }

    /// Adds a source axiom record and returns its index.
    pub fn add_source(
        &mut self,
        text: String,
        file: String,
        annotations: Vec<(String, String)>,
    ) -> usize {
        self.sources.push(SourceAxiom {
            text,
            file,
            annotations,
        });
        self.sources.len() - 1
    }

    /// The concept of a named class.
    pub fn class_concept(&mut self, c: ClassId) -> ConceptId {
        self.concepts.atom(c)
    }

    /// The annotation values of an entity for a property.
    pub fn annotation(&self, subject: &str, property: &str) -> &[AnnotationValue] {
        self.annotations
            .get(subject)
            .and_then(|m| m.get(property))
            .map(|v| v.as_slice())
            .unwrap_or(&[])
    }
}

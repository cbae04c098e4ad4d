//! Converting horned-owl's model of an OWL 2 ontology into the internal knowledge base
//! (reading the files is `kb/load`'s job).

use super::datarange::DataRange;
use super::datatype;
use super::universal::{self, Restriction};
use super::{AnnotationValue, Axiom, ConceptId, IndividualId, KbError, KnowledgeBase, RoleId};
mod special;

use horned_owl::io::ofn::writer::AsFunctional;
use horned_owl::model::{
    AnnotatedComponent, AnnotationSubject, ArcStr, ClassExpression as CE, Component,
    DataRange as HDataRange, Individual, Literal, ObjectPropertyExpression as OPE,
    PropertyExpression, SubObjectPropertyExpression,
};
use std::collections::BTreeMap;

pub(super) const XSD: &str = "http://www.w3.org/2001/XMLSchema#";
pub(super) const OWL: &str = "http://www.w3.org/2002/07/owl#";

/// Turns horned-owl's components into the knowledge base's axioms, one file at a time.
pub(super) struct Converter<'a> {
    pub(super) kb: &'a mut KnowledgeBase,
    pub(super) file: String,
    pub(super) lenient: bool,
    /// How deep the class expression being converted is nested so far.
    pub(super) depth: usize,
}

/// The deepest nesting of class expressions the loader accepts; deeper ones are refused
/// (exit code 2) rather than risk the stack.
pub const MAX_NESTING: usize = 100_000;

type Conv<T> = Result<T, String>;

/// The `DatatypeDefinition` axioms of a set of documents, read before any other axiom so that
/// a defined datatype can be used in any file of the closure, before or after its definition.
/// OWL 2 DL forbids cycles among definitions (Structural Specification §11.2); a cycle is
/// refused with its chain named, like a definition of a datatype of the datatype map.
pub(super) fn define_datatypes(
    kb: &mut KnowledgeBase,
    docs: &[(String, &[AnnotatedComponent<ArcStr>])],
    lenient: bool,
) -> Result<(), KbError> {
    let mut raw: BTreeMap<String, (String, String, HDataRange<ArcStr>)> = BTreeMap::new();
    for (file, comps) in docs {
        for ac in comps.iter() {
            if let Component::DatatypeDefinition(d) = &ac.component {
                let text = ac.component.as_functional().to_string();
                raw.insert(d.kind.0.to_string(), (file.clone(), text, d.range.clone()));
            }
        }
    }
    let names: Vec<String> = raw.keys().cloned().collect();
    for name in names {
        let mut resolving = Vec::new();
        if let Err(reason) = resolve_datatype(kb, &raw, &name, &mut resolving) {
            let (file, axiom, _) = &raw[&name];
            if lenient {
                kb.warnings
                    .push(format!("{file}: dropped {axiom} ({reason})"));
                kb.incomplete = true;
            } else {
                return Err(KbError::Unsupported {
                    file: file.clone(),
                    axiom: axiom.clone(),
                    reason,
                });
            }
        }
    }
    Ok(())
}

/// Converts the definition of `name` (and, first, those it uses) into `kb.datatype_defs`.
fn resolve_datatype(
    kb: &mut KnowledgeBase,
    raw: &BTreeMap<String, (String, String, HDataRange<ArcStr>)>,
    name: &str,
    resolving: &mut Vec<String>,
) -> Conv<()> {
    if kb.datatype_defs.contains_key(name) {
        return Ok(());
    }
    if datatype::lookup(name).is_ok() {
        return Err(format!(
            "<{name}> belongs to the OWL 2 datatype map and cannot be redefined (OWL 2 Structural Specification §9.6); define a datatype of your own"
        ));
    }
    if let Some(at) = resolving.iter().position(|n| n == name) {
        let mut cycle: Vec<&str> = resolving[at..].iter().map(|s| s.as_str()).collect();
        cycle.push(name);
        return Err(format!(
            "datatype definitions form a cycle ({}), which OWL 2 DL forbids; break it",
            cycle.join(" -> ")
        ));
    }
    resolving.push(name.to_string());
    let (file, _, range) = &raw[name];
    for used in datatypes_in(range) {
        if raw.contains_key(&used) {
            resolve_datatype(kb, raw, &used, resolving)?;
        }
    }
    let mut conv = Converter {
        kb,
        file: file.clone(),
        lenient: false,
        depth: 0,
    };
    let r = conv.data_range(range)?;
    kb.datatype_defs.insert(name.to_string(), r);
    resolving.pop();
    Ok(())
}

/// The datatype IRIs a data range names.
fn datatypes_in(d: &HDataRange<ArcStr>) -> Vec<String> {
    match d {
        HDataRange::Datatype(dt) | HDataRange::DatatypeRestriction(dt, _) => {
            vec![dt.0.to_string()]
        }
        HDataRange::DataIntersectionOf(xs) | HDataRange::DataUnionOf(xs) => {
            xs.iter().flat_map(datatypes_in).collect()
        }
        HDataRange::DataComplementOf(x) => datatypes_in(x),
        HDataRange::DataOneOf(_) => Vec::new(),
    }
}

impl Converter<'_> {
    pub(super) fn convert_all(
        &mut self,
        comps: &[AnnotatedComponent<ArcStr>],
    ) -> Result<(), KbError> {
        for ac in comps {
            let text = ac.component.as_functional().to_string();
            let anns: Vec<(String, String)> = ac
                .ann
                .iter()
                .map(|a| (a.ap.0.to_string(), annotation_text(&a.av).0))
                .collect();
            let start = self.kb.axioms.len();
            let src = self.kb.sources.len();
            match self.component(&ac.component, src) {
                Ok(true) => {
                    self.kb.add_source(text, self.file.clone(), anns);
                }
                Ok(false) => {}
                Err(reason) => {
                    self.kb.axioms.truncate(start);
                    if self.lenient {
                        self.kb
                            .warnings
                            .push(format!("{}: dropped {} ({})", self.file, text, reason));
                        self.kb.incomplete = true;
                    } else {
                        return Err(KbError::Unsupported {
                            file: self.file.clone(),
                            axiom: text,
                            reason,
                        });
                    }
                }
            }
        }
        Ok(())
    }

    /// Converts one component; returns whether it was a logical axiom.
    fn component(&mut self, c: &Component<ArcStr>, src: usize) -> Conv<bool> {
        use Component as C;
        if let Some(done) = self.special_property_axiom(c, src) {
            return done;
        }
        match c {
            C::OntologyID(_) | C::DocIRI(_) | C::Import(_) | C::OntologyAnnotation(_) => Ok(false),
            C::DeclareClass(cl) => {
                self.class_concept(&cl.0);
                Ok(false)
            }
            // A declaration of a built-in (owl:topObjectProperty, …, as some writers emit) names
            // no property of the ontology.
            C::DeclareObjectProperty(p) if p.0.starts_with(OWL) => Ok(false),
            C::DeclareDataProperty(p) if p.0.starts_with(OWL) => Ok(false),
            C::DeclareObjectProperty(p) => {
                self.kb.vocab.prop(&p.0);
                Ok(false)
            }
            C::DeclareDataProperty(p) => {
                self.kb.vocab.data_prop(&p.0);
                Ok(false)
            }
            C::DeclareNamedIndividual(i) => {
                self.kb.vocab.individual(&i.0);
                Ok(false)
            }
            C::DeclareAnnotationProperty(_) | C::DeclareDatatype(_) => Ok(false),
            C::AnnotationAssertion(a) => {
                let subject = match &a.subject {
                    AnnotationSubject::IRI(i) => i.to_string(),
                    AnnotationSubject::AnonymousIndividual(i) => format!("_:{}", i.0),
                };
                let (value, lang) = annotation_text(&a.ann.av);
                self.kb
                    .annotations
                    .entry(subject)
                    .or_default()
                    .entry(a.ann.ap.0.to_string())
                    .or_default()
                    .push(AnnotationValue { value, lang });
                Ok(false)
            }
            C::SubAnnotationPropertyOf(_)
            | C::AnnotationPropertyDomain(_)
            | C::AnnotationPropertyRange(_) => Ok(false),
            C::SubClassOf(ax) => {
                if let CE::ObjectOneOf(inds) = &ax.sub {
                    // {a₁,…,aₙ} ⊑ C holds exactly when each C(aᵢ) does.
                    for i in inds {
                        let a = self.individual(i);
                        self.assert_class(&ax.sup, a, src)?;
                    }
                    return Ok(true);
                }
                let sub = self.ce(&ax.sub)?;
                let sup = self.ce(&ax.sup)?;
                self.kb.push(Axiom::SubClass(sub, sup), src);
                Ok(true)
            }
            C::EquivalentClasses(ax) => {
                let cs = ax.0.iter().map(|e| self.ce(e)).collect::<Conv<Vec<_>>>()?;
                self.kb.push(Axiom::Equivalent(cs), src);
                Ok(true)
            }
            C::DisjointClasses(ax) => {
                let cs = ax.0.iter().map(|e| self.ce(e)).collect::<Conv<Vec<_>>>()?;
                self.kb.push(Axiom::Disjoint(cs), src);
                Ok(true)
            }
            C::DisjointUnion(ax) => {
                let a = self.class_concept(&ax.0.0);
                let cs = ax.1.iter().map(|e| self.ce(e)).collect::<Conv<Vec<_>>>()?;
                self.kb.push(Axiom::DisjointUnion(a, cs), src);
                Ok(true)
            }
            C::SubObjectPropertyOf(ax) => {
                // The top property contains every property and the bottom property is
                // contained in every one (OWL 2 Direct Semantics, §2.2.1): tautologies.
                let chain_has_bottom = match &ax.sub {
                    SubObjectPropertyExpression::ObjectPropertyExpression(e) => {
                        special_property(e) == Some(false)
                    }
                    SubObjectPropertyExpression::ObjectPropertyChain(ch) => {
                        ch.iter().any(|e| special_property(e) == Some(false))
                    }
                };
                if special_property(&ax.sup) == Some(true) || chain_has_bottom {
                    return Ok(true);
                }
                if special_property(&ax.sup) == Some(false)
                    && let SubObjectPropertyExpression::ObjectPropertyExpression(e) = &ax.sub
                {
                    // r ⊑ ⊥: r is empty, so nothing has an r-successor.
                    let r = self.role(e)?;
                    self.kb.push(Axiom::Domain(r, ConceptId::BOTTOM), src);
                    return Ok(true);
                }
                let sup = self.role(&ax.sup)?;
                match &ax.sub {
                    SubObjectPropertyExpression::ObjectPropertyExpression(e) => {
                        let sub = self.role(e)?;
                        self.kb.push(Axiom::SubRole(sub, sup), src);
                        Ok(true)
                    }
                    SubObjectPropertyExpression::ObjectPropertyChain(chain) => {
                        let rs: Vec<RoleId> = chain
                            .iter()
                            .map(|e| self.role(e))
                            .collect::<Conv<Vec<_>>>()?;
                        match rs.as_slice() {
                            [] => Err("an empty property chain".into()),
                            [r] => {
                                self.kb.push(Axiom::SubRole(*r, sup), src);
                                Ok(true)
                            }
                            // r ∘ r ⊑ r is transitivity, and r⁻ ∘ r⁻ ⊑ r⁻ the same.
                            [a, b] if *a == sup && *b == sup => {
                                self.kb.push(Axiom::Transitive(sup), src);
                                Ok(true)
                            }
                            _ => {
                                self.kb.push(Axiom::SubRoleChain(rs, sup), src);
                                Ok(true)
                            }
                        }
                    }
                }
            }
            C::EquivalentObjectProperties(ax) => {
                let rs: Vec<RoleId> =
                    ax.0.iter()
                        .map(|e| self.role(e))
                        .collect::<Conv<Vec<_>>>()?;
                for w in rs.windows(2) {
                    self.kb.push(Axiom::SubRole(w[0], w[1]), src);
                    self.kb.push(Axiom::SubRole(w[1], w[0]), src);
                }
                Ok(true)
            }
            C::InverseObjectProperties(ax) => {
                let p = RoleId::named(self.kb.vocab.prop(&ax.0.0));
                let q = RoleId::named(self.kb.vocab.prop(&ax.1.0));
                self.kb.push(Axiom::SubRole(p, q.inverse()), src);
                self.kb.push(Axiom::SubRole(q.inverse(), p), src);
                Ok(true)
            }
            C::ObjectPropertyDomain(ax) if special_property(&ax.ope).is_some() => {
                // The bottom property's domain is empty; the top property's is everything.
                if special_property(&ax.ope) == Some(true) {
                    let c = self.ce(&ax.ce)?;
                    self.kb.push(Axiom::SubClass(ConceptId::TOP, c), src);
                }
                Ok(true)
            }
            C::ObjectPropertyRange(ax) if special_property(&ax.ope).is_some() => {
                if special_property(&ax.ope) == Some(true) {
                    let c = self.ce(&ax.ce)?;
                    self.kb.push(Axiom::SubClass(ConceptId::TOP, c), src);
                }
                Ok(true)
            }
            C::ObjectPropertyDomain(ax) => {
                let r = self.role(&ax.ope)?;
                let c = self.ce(&ax.ce)?;
                self.kb.push(Axiom::Domain(r, c), src);
                Ok(true)
            }
            C::ObjectPropertyRange(ax) => {
                let r = self.role(&ax.ope)?;
                let c = self.ce(&ax.ce)?;
                self.kb.push(Axiom::Domain(r.inverse(), c), src);
                Ok(true)
            }
            C::FunctionalObjectProperty(ax) => {
                let r = self.role(&ax.0)?;
                self.kb.push(Axiom::Functional(r), src);
                Ok(true)
            }
            C::InverseFunctionalObjectProperty(ax) => {
                let r = self.role(&ax.0)?;
                self.kb.push(Axiom::Functional(r.inverse()), src);
                Ok(true)
            }
            C::SymmetricObjectProperty(ax) => {
                let r = self.role(&ax.0)?;
                self.kb.push(Axiom::SubRole(r, r.inverse()), src);
                Ok(true)
            }
            C::TransitiveObjectProperty(ax) => {
                let r = self.role(&ax.0)?;
                self.kb.push(Axiom::Transitive(r), src);
                Ok(true)
            }
            C::ReflexiveObjectProperty(ax) => {
                let r = self.role(&ax.0)?;
                self.kb.push(Axiom::Reflexive(r), src);
                Ok(true)
            }
            C::IrreflexiveObjectProperty(ax) => {
                let r = self.role(&ax.0)?;
                self.kb.push(Axiom::Irreflexive(r), src);
                Ok(true)
            }
            C::AsymmetricObjectProperty(ax) => {
                let r = self.role(&ax.0)?;
                self.kb.push(Axiom::Asymmetric(r), src);
                Ok(true)
            }
            C::DisjointObjectProperties(ax) => {
                let rs: Vec<RoleId> =
                    ax.0.iter()
                        .map(|e| self.role(e))
                        .collect::<Conv<Vec<_>>>()?;
                self.kb.push(Axiom::DisjointRoles(rs), src);
                Ok(true)
            }
            C::SubDataPropertyOf(ax) => {
                let a = self.kb.vocab.data_prop(&ax.sub.0);
                let b = self.kb.vocab.data_prop(&ax.sup.0);
                self.kb.push(Axiom::SubDataProp(a, b), src);
                Ok(true)
            }
            C::EquivalentDataProperties(ax) => {
                let ps: Vec<_> = ax.0.iter().map(|p| self.kb.vocab.data_prop(&p.0)).collect();
                for w in ps.windows(2) {
                    self.kb.push(Axiom::SubDataProp(w[0], w[1]), src);
                    self.kb.push(Axiom::SubDataProp(w[1], w[0]), src);
                }
                Ok(true)
            }
            C::DisjointDataProperties(ax) => {
                let ps: Vec<_> = ax.0.iter().map(|p| self.kb.vocab.data_prop(&p.0)).collect();
                self.kb.push(Axiom::DisjointDataProps(ps), src);
                Ok(true)
            }
            C::DataPropertyDomain(ax) => {
                let p = self.kb.vocab.data_prop(&ax.dp.0);
                let c = self.ce(&ax.ce)?;
                self.kb.push(Axiom::DataDomain(p, c), src);
                Ok(true)
            }
            C::DataPropertyRange(ax) => {
                let p = self.kb.vocab.data_prop(&ax.dp.0);
                let r = self.data_range(&ax.dr)?;
                let id = self.kb.ranges.intern(r);
                self.kb.push(Axiom::DataRangeAxiom(p, id), src);
                Ok(true)
            }
            C::FunctionalDataProperty(ax) => {
                let p = self.kb.vocab.data_prop(&ax.0.0);
                self.kb.push(Axiom::FunctionalData(p), src);
                Ok(true)
            }
            // Read before every other axiom (`define_datatypes`); uses are replaced by the range.
            C::DatatypeDefinition(_) => Ok(true),
            C::HasKey(ax) => {
                let c = self.ce(&ax.ce)?;
                let mut roles = Vec::new();
                let mut data = Vec::new();
                for pe in &ax.vpe {
                    match pe {
                        PropertyExpression::ObjectPropertyExpression(e) => {
                            roles.push(self.role(e)?)
                        }
                        PropertyExpression::DataProperty(d) => {
                            data.push(self.kb.vocab.data_prop(&d.0))
                        }
                        PropertyExpression::AnnotationProperty(_) => {
                            return Err("a key on an annotation property".into());
                        }
                    }
                }
                self.kb.push(Axiom::HasKey(c, roles, data), src);
                Ok(true)
            }
            C::SameIndividual(ax) => {
                let is: Vec<_> = ax.0.iter().map(|i| self.individual(i)).collect();
                self.kb.push(Axiom::Same(is), src);
                Ok(true)
            }
            C::DifferentIndividuals(ax) => {
                let is: Vec<_> = ax.0.iter().map(|i| self.individual(i)).collect();
                self.kb.push(Axiom::Different(is), src);
                Ok(true)
            }
            C::ClassAssertion(ax) => {
                let a = self.individual(&ax.i);
                self.assert_class(&ax.ce, a, src)?;
                Ok(true)
            }
            C::ObjectPropertyAssertion(ax) if special_property(&ax.ope).is_some() => {
                // top(a, b) always holds; bottom(a, b) never does.
                let a = self.individual(&ax.from);
                self.individual(&ax.to);
                if special_property(&ax.ope) == Some(false) {
                    self.kb
                        .push(Axiom::ClassAssertion(ConceptId::BOTTOM, a), src);
                }
                Ok(true)
            }
            C::NegativeObjectPropertyAssertion(ax) if special_property(&ax.ope).is_some() => {
                let a = self.individual(&ax.from);
                self.individual(&ax.to);
                if special_property(&ax.ope) == Some(true) {
                    self.kb
                        .push(Axiom::ClassAssertion(ConceptId::BOTTOM, a), src);
                }
                Ok(true)
            }
            C::ObjectPropertyAssertion(ax) => {
                let r = self.role(&ax.ope)?;
                let a = self.individual(&ax.from);
                let b = self.individual(&ax.to);
                self.kb.push(Axiom::RoleAssertion(r, a, b), src);
                Ok(true)
            }
            C::NegativeObjectPropertyAssertion(ax) => {
                let r = self.role(&ax.ope)?;
                let a = self.individual(&ax.from);
                let b = self.individual(&ax.to);
                self.kb.push(Axiom::NegativeRoleAssertion(r, a, b), src);
                Ok(true)
            }
            C::DataPropertyAssertion(ax) => {
                let p = self.kb.vocab.data_prop(&ax.dp.0);
                let a = self.individual(&ax.from);
                let v = self.literal_range(&ax.to)?;
                let c = self.data_some(p, v);
                self.kb.push(Axiom::ClassAssertion(c, a), src);
                Ok(true)
            }
            C::NegativeDataPropertyAssertion(ax) => {
                let p = self.kb.vocab.data_prop(&ax.dp.0);
                let a = self.individual(&ax.from);
                let v = self.literal_range(&ax.to)?;
                let c = self.data_some(p, v);
                let nc = self.kb.concepts.not(c);
                self.kb.push(Axiom::ClassAssertion(nc, a), src);
                Ok(true)
            }
            C::Rule(_) => Err("SWRL rules are not supported".into()),
        }
    }

    /// C(a), with nominal forms rewritten into plain assertions where that is exact.
    fn assert_class(&mut self, ce: &CE<ArcStr>, a: IndividualId, src: usize) -> Conv<()> {
        match ce {
            CE::ObjectIntersectionOf(xs) => {
                for x in xs {
                    self.assert_class(x, a, src)?;
                }
                Ok(())
            }
            CE::ObjectHasValue { ope, i } if special_property(ope).is_none() => {
                let r = self.role(ope)?;
                let b = self.individual(i);
                self.kb.push(Axiom::RoleAssertion(r, a, b), src);
                Ok(())
            }
            CE::ObjectOneOf(is) if is.len() == 1 => {
                let b = self.individual(&is[0]);
                self.kb.push(Axiom::Same(vec![a, b]), src);
                Ok(())
            }
            CE::ObjectComplementOf(inner) => match inner.as_ref() {
                CE::ObjectHasValue { ope, i } if special_property(ope).is_none() => {
                    let r = self.role(ope)?;
                    let b = self.individual(i);
                    self.kb.push(Axiom::NegativeRoleAssertion(r, a, b), src);
                    Ok(())
                }
                CE::ObjectOneOf(is) => {
                    for i in is {
                        let b = self.individual(i);
                        self.kb.push(Axiom::Different(vec![a, b]), src);
                    }
                    Ok(())
                }
                _ => {
                    let c = self.ce(ce)?;
                    self.kb.push(Axiom::ClassAssertion(c, a), src);
                    Ok(())
                }
            },
            _ => {
                let c = self.ce(ce)?;
                self.kb.push(Axiom::ClassAssertion(c, a), src);
                Ok(())
            }
        }
    }

    fn class_concept(&mut self, iri: &str) -> ConceptId {
        if iri == format!("{OWL}Thing") {
            return ConceptId::TOP;
        }
        if iri == format!("{OWL}Nothing") {
            return ConceptId::BOTTOM;
        }
        let c = self.kb.vocab.class(iri);
        self.kb.concepts.atom(c)
    }

    /// The role of a property expression; the top and bottom properties are refused here
    /// (the axioms where they are tautologies or contradictions are read before).
    fn role(&mut self, e: &OPE<ArcStr>) -> Conv<RoleId> {
        if let Some(top) = special_property(e) {
            let name = if top {
                "topObjectProperty"
            } else {
                "bottomObjectProperty"
            };
            return Err(format!(
                "owl:{name} is supported in class expressions and in axioms about it, but not inside a property chain nor below an ordinary property (which would make that property universal or empty in ways the reasoner does not represent); rewrite the axiom without it"
            ));
        }
        Ok(match e {
            OPE::ObjectProperty(p) => RoleId::named(self.kb.vocab.prop(&p.0)),
            OPE::InverseObjectProperty(p) => RoleId::named(self.kb.vocab.prop(&p.0)).inverse(),
        })
    }

    fn individual(&mut self, i: &Individual<ArcStr>) -> IndividualId {
        match i {
            Individual::Named(n) => self.kb.vocab.individual(&n.0),
            Individual::Anonymous(a) => self
                .kb
                .vocab
                .individual(&format!("_:{}#{}", self.file, a.0)),
        }
    }

    fn data_some(&mut self, p: super::DataPropId, r: DataRange) -> ConceptId {
        let not_r = r.complement();
        let a = self.kb.ranges.intern(r);
        let b = self.kb.ranges.intern(not_r);
        self.kb.concepts.data_some(p, a, b)
    }

    fn data_all(&mut self, p: super::DataPropId, r: DataRange) -> ConceptId {
        let not_r = r.complement();
        let a = self.kb.ranges.intern(r);
        let b = self.kb.ranges.intern(not_r);
        self.kb.concepts.data_all(p, a, b)
    }

    /// Translates a class expression into a concept in NNF.
    fn ce(&mut self, e: &CE<ArcStr>) -> Conv<ConceptId> {
        if self.depth >= MAX_NESTING {
            return Err(format!(
                "a class expression nested more than {MAX_NESTING} levels deep; flatten it with named classes"
            ));
        }
        self.depth += 1;
        let c = self.ce_nested(e);
        self.depth -= 1;
        c
    }

    fn ce_nested(&mut self, e: &CE<ArcStr>) -> Conv<ConceptId> {
        if let Some(c) = self.special_restriction(e)? {
            return Ok(c);
        }
        Ok(match e {
            CE::Class(c) => self.class_concept(&c.0),
            CE::ObjectIntersectionOf(xs) => {
                let v = xs.iter().map(|x| self.ce(x)).collect::<Conv<Vec<_>>>()?;
                self.kb.concepts.and(v)
            }
            CE::ObjectUnionOf(xs) => {
                let v = xs.iter().map(|x| self.ce(x)).collect::<Conv<Vec<_>>>()?;
                self.kb.concepts.or(v)
            }
            CE::ObjectComplementOf(x) => {
                let c = self.ce(x)?;
                self.kb.concepts.not(c)
            }
            CE::ObjectOneOf(is) => {
                if is.is_empty() {
                    return Ok(ConceptId::BOTTOM);
                }
                self.kb.tbox_nominals = true;
                let v: Vec<ConceptId> = is
                    .iter()
                    .map(|i| {
                        let a = self.individual(i);
                        self.kb.concepts.nominal(a)
                    })
                    .collect();
                self.kb.concepts.or(v)
            }
            CE::ObjectSomeValuesFrom { ope, bce } => {
                let r = self.role(ope)?;
                let c = self.ce(bce)?;
                self.kb.concepts.some(r, c)
            }
            CE::ObjectAllValuesFrom { ope, bce } => {
                let r = self.role(ope)?;
                let c = self.ce(bce)?;
                self.kb.concepts.all(r, c)
            }
            CE::ObjectHasValue { ope, i } => {
                self.kb.tbox_nominals = true;
                let r = self.role(ope)?;
                let a = self.individual(i);
                let n = self.kb.concepts.nominal(a);
                self.kb.concepts.some(r, n)
            }
            CE::ObjectHasSelf(p) => {
                // ∃r⁻.Self and ∃r.Self hold of the same elements.
                let r = self.role(p)?;
                let r = if r.is_inverse() { r.inverse() } else { r };
                self.kb.concepts.has_self(r)
            }
            CE::ObjectMinCardinality { n, ope, bce } => {
                let r = self.role(ope)?;
                let c = self.ce(bce)?;
                self.kb.concepts.at_least(*n, r, c)
            }
            CE::ObjectMaxCardinality { n, ope, bce } => {
                let r = self.role(ope)?;
                let c = self.ce(bce)?;
                self.kb.concepts.at_most(*n, r, c)
            }
            CE::ObjectExactCardinality { n, ope, bce } => {
                let r = self.role(ope)?;
                let c = self.ce(bce)?;
                let a = self.kb.concepts.at_least(*n, r, c);
                let b = self.kb.concepts.at_most(*n, r, c);
                self.kb.concepts.and([a, b])
            }
            CE::DataSomeValuesFrom { dp, dr } => {
                let p = self.kb.vocab.data_prop(&dp.0);
                let r = self.data_range(dr)?;
                self.data_some(p, r)
            }
            CE::DataAllValuesFrom { dp, dr } => {
                let p = self.kb.vocab.data_prop(&dp.0);
                let r = self.data_range(dr)?;
                self.data_all(p, r)
            }
            CE::DataHasValue { dp, l } => {
                let p = self.kb.vocab.data_prop(&dp.0);
                let r = self.literal_range(l)?;
                self.data_some(p, r)
            }
            CE::DataMinCardinality { n, dp, dr }
            | CE::DataMaxCardinality { n, dp, dr }
            | CE::DataExactCardinality { n, dp, dr } => {
                let p = self.kb.vocab.data_prop(&dp.0);
                let r = self.data_range(dr)?;
                let not_r = r.complement();
                let (a, b) = (self.kb.ranges.intern(r), self.kb.ranges.intern(not_r));
                let cs = &mut self.kb.concepts;
                let min = cs.data_at_least(*n, p, a, b);
                let max = cs.data_at_most(*n, p, a, b);
                match e {
                    CE::DataMinCardinality { .. } => min,
                    CE::DataMaxCardinality { .. } => max,
                    _ => cs.and([min, max]),
                }
            }
        })
    }

    /// A restriction on the top or bottom object or data property, in the terms of
    /// [`super::universal`]; `None` for every other class expression.
    fn special_restriction(&mut self, e: &CE<ArcStr>) -> Conv<Option<ConceptId>> {
        use Restriction as R;
        if let CE::ObjectHasSelf(ope) = e {
            // ⊥-related to nothing; a self restriction on U is not OWL 2 DL.
            return match special_property(ope) {
                Some(true) => Err(universal::NOT_SIMPLE.into()),
                Some(false) => Ok(Some(ConceptId::BOTTOM)),
                None => Ok(None),
            };
        }
        if let Some((ope, kinds, filler)) = object_restriction(e) {
            let Some(top) = special_property(ope) else {
                return Ok(None);
            };
            if let CE::ObjectHasValue { i, .. } = e {
                self.individual(i);
            }
            let mut parts = Vec::new();
            for kind in kinds {
                parts.push(match (top, kind, filler) {
                    (false, _, _) => universal::bottom(kind),
                    (true, Restriction::AtLeast(_) | Restriction::AtMost(_), _) => {
                        return Err(universal::NOT_SIMPLE.into());
                    }
                    // ∃U.{a}: a is an element.
                    (true, _, None) => ConceptId::TOP,
                    (true, _, Some(f)) => {
                        let f = self.ce(f)?;
                        self.kb.universal_restriction(kind == Restriction::All, f)
                    }
                });
            }
            return Ok(Some(self.kb.concepts.and(parts)));
        }
        let (dp, kinds) = match e {
            CE::DataSomeValuesFrom { dp, .. } | CE::DataHasValue { dp, .. } => (dp, vec![R::Some]),
            CE::DataAllValuesFrom { dp, .. } => (dp, vec![R::All]),
            CE::DataMinCardinality { n, dp, .. } => (dp, vec![R::AtLeast(*n)]),
            CE::DataMaxCardinality { n, dp, .. } => (dp, vec![R::AtMost(*n)]),
            CE::DataExactCardinality { n, dp, .. } => (dp, vec![R::AtLeast(*n), R::AtMost(*n)]),
            _ => return Ok(None),
        };
        match special_data_property(&dp.0) {
            None => Ok(None),
            Some(true) => Err(universal::TOP_DATA.into()),
            Some(false) => {
                let parts: Vec<ConceptId> = kinds.into_iter().map(universal::bottom).collect();
                Ok(Some(self.kb.concepts.and(parts)))
            }
        }
    }

    fn data_range(&mut self, d: &HDataRange<ArcStr>) -> Conv<DataRange> {
        Ok(match d {
            HDataRange::Datatype(dt) => match self.kb.datatype_defs.get(&*dt.0) {
                Some(r) => r.clone(),
                None => datatype::named(&dt.0)?,
            },
            HDataRange::DataIntersectionOf(xs) => {
                let mut acc = DataRange::everything();
                for x in xs {
                    acc = acc.intersect(&self.data_range(x)?);
                }
                acc
            }
            HDataRange::DataUnionOf(xs) => {
                let mut acc = DataRange::empty();
                for x in xs {
                    acc = acc.union(&self.data_range(x)?);
                }
                acc
            }
            HDataRange::DataComplementOf(x) => self.data_range(x)?.complement(),
            HDataRange::DataOneOf(ls) => {
                let mut acc = DataRange::empty();
                for l in ls {
                    acc = acc.union(&self.literal_range(l)?);
                }
                acc
            }
            HDataRange::DatatypeRestriction(dt, _)
                if self.kb.datatype_defs.contains_key(&*dt.0) =>
            {
                return Err(format!(
                    "a facet restriction on <{}>, a datatype defined in the ontology; OWL 2 allows facets only on datatypes of the datatype map (§7.5): restrict the datatype it is defined from",
                    dt.0
                ));
            }
            HDataRange::DatatypeRestriction(dt, facets) => {
                let fs: Vec<_> = facets
                    .iter()
                    .map(|f| {
                        let (lex, dt, lang) = literal_parts(&f.l);
                        (f.f.as_ref().to_string(), lex, dt, lang)
                    })
                    .collect();
                datatype::restrict(&dt.0, &fs)?
            }
        })
    }

    fn literal_range(&mut self, l: &Literal<ArcStr>) -> Conv<DataRange> {
        let (lex, dt, lang) = literal_parts(l);
        datatype::literal(&lex, dt.as_deref(), lang.as_deref())
    }
}

/// A literal as (lexical form, datatype IRI, language tag); plain literals have no datatype.
fn literal_parts(l: &Literal<ArcStr>) -> (String, Option<String>, Option<String>) {
    match l {
        Literal::Simple { literal } => (literal.clone(), None, None),
        Literal::Language { literal, lang } => (literal.clone(), None, Some(lang.clone())),
        Literal::Datatype {
            literal,
            datatype_iri,
        } => (literal.clone(), Some(datatype_iri.to_string()), None),
    }
}

/// Whether a property expression is owl:topObjectProperty (`Some(true)`) or
/// owl:bottomObjectProperty (`Some(false)`), inverses included (both are symmetric).
fn special_property(e: &OPE<ArcStr>) -> Option<bool> {
    let (OPE::ObjectProperty(p) | OPE::InverseObjectProperty(p)) = e;
    match p.0.strip_prefix(OWL)? {
        "topObjectProperty" => Some(true),
        "bottomObjectProperty" => Some(false),
        _ => None,
    }
}

/// An object restriction's property, kinds (two for an exact cardinality) and filler
/// (`None` for ObjectHasValue, whose filler is never empty).
type ObjectRestriction<'e> = (&'e OPE<ArcStr>, Vec<Restriction>, Option<&'e CE<ArcStr>>);

fn object_restriction(e: &CE<ArcStr>) -> Option<ObjectRestriction<'_>> {
    use Restriction as R;
    Some(match e {
        CE::ObjectSomeValuesFrom { ope, bce } => (ope, vec![R::Some], Some(bce)),
        CE::ObjectAllValuesFrom { ope, bce } => (ope, vec![R::All], Some(bce)),
        CE::ObjectMinCardinality { n, ope, bce } => (ope, vec![R::AtLeast(*n)], Some(bce)),
        CE::ObjectMaxCardinality { n, ope, bce } => (ope, vec![R::AtMost(*n)], Some(bce)),
        CE::ObjectExactCardinality { n, ope, bce } => {
            (ope, vec![R::AtLeast(*n), R::AtMost(*n)], Some(bce))
        }
        CE::ObjectHasValue { ope, .. } => (ope, vec![R::Some], None),
        _ => return None,
    })
}

/// Whether a data property is owl:topDataProperty (`Some(true)`) or owl:bottomDataProperty
/// (`Some(false)`).
fn special_data_property(iri: &str) -> Option<bool> {
    match iri.strip_prefix(OWL)? {
        "topDataProperty" => Some(true),
        "bottomDataProperty" => Some(false),
        _ => None,
    }
}

fn annotation_text(v: &horned_owl::model::AnnotationValue<ArcStr>) -> (String, String) {
    use horned_owl::model::AnnotationValue as AV;
    match v {
        AV::Literal(Literal::Simple { literal }) => (literal.clone(), String::new()),
        AV::Literal(Literal::Language { literal, lang }) => (literal.clone(), lang.clone()),
        AV::Literal(Literal::Datatype { literal, .. }) => (literal.clone(), String::new()),
        AV::IRI(i) => (i.to_string(), String::new()),
        AV::AnonymousIndividual(a) => (format!("_:{}", a.0), String::new()),
    }
}

//! Axioms about the top and bottom properties themselves (characteristics, property
//! relations, assertions, domains, ranges and keys), by OWL 2 Direct Semantics §2.2.1:
//! owl:topObjectProperty relates every pair of elements, owl:topDataProperty every element
//! to every literal, and the bottom properties relate nothing. Most such axioms are then
//! trivially true or false; the rest say something about the number of elements or empty
//! another property. Restrictions on these properties are [`crate::kb::universal`]'s.

use super::{Conv, Converter, special_data_property, special_property};
use crate::kb::universal::{NOT_SIMPLE, TOP_DATA};
use crate::kb::{Axiom, ConceptId, RoleId};
use horned_owl::model::{
    ArcStr, Component, DataProperty, ObjectProperty, ObjectPropertyExpression as OPE,
    PropertyExpression,
};

/// What an axiom naming a top or bottom property comes to.
enum Outcome {
    /// It always holds.
    True,
    /// It never holds: the ontology is inconsistent.
    False,
    /// It holds when these axioms do.
    Axioms(Vec<Axiom>),
    /// It says what this other axiom says.
    Instead(Component<ArcStr>),
    /// OWL 2 DL forbids it, for this reason.
    Refused(&'static str),
}

impl Converter<'_> {
    /// The axiom `c` when it names a top or bottom property where the general conversion
    /// cannot take it; `None` when it names none (or the general conversion handles it).
    pub(super) fn special_property_axiom(
        &mut self,
        c: &Component<ArcStr>,
        src: usize,
    ) -> Option<Conv<bool>> {
        let outcome = match self.special_outcome(c)? {
            Ok(o) => o,
            Err(e) => return Some(Err(e)),
        };
        match outcome {
            Outcome::True => {}
            Outcome::False => self
                .kb
                .push(Axiom::SubClass(ConceptId::TOP, ConceptId::BOTTOM), src),
            Outcome::Axioms(axs) => {
                for a in axs {
                    self.kb.push(a, src);
                }
            }
            Outcome::Instead(c) => return Some(self.component(&c, src)),
            Outcome::Refused(why) => return Some(Err(why.into())),
        }
        Some(Ok(true))
    }

    fn special_outcome(&mut self, c: &Component<ArcStr>) -> Option<Conv<Outcome>> {
        use Component as C;
        use Outcome::{False, True};
        let truth = |b: bool| if b { True } else { False };
        Some(Ok(match c {
            // Characteristics: U is symmetric, transitive and reflexive, and neither
            // irreflexive nor asymmetric (there is at least one element); it is functional
            // only when there is at most one element. ⊥ has every characteristic except
            // reflexivity.
            // U is symmetric, transitive and reflexive; the bottom property has every
            // characteristic but reflexivity. U cannot be asked to be functional,
            // inverse-functional, irreflexive or asymmetric in OWL 2 DL.
            C::FunctionalObjectProperty(ax) => self.simple_only(&ax.0)?,
            C::InverseFunctionalObjectProperty(ax) => self.simple_only(&ax.0)?,
            C::IrreflexiveObjectProperty(ax) => self.simple_only(&ax.0)?,
            C::AsymmetricObjectProperty(ax) => self.simple_only(&ax.0)?,
            C::SymmetricObjectProperty(ax) => {
                special_property(&ax.0)?;
                True
            }
            C::TransitiveObjectProperty(ax) => {
                special_property(&ax.0)?;
                True
            }
            C::ReflexiveObjectProperty(ax) => truth(special_property(&ax.0)?),
            C::DisjointObjectProperties(ax) => {
                let (top, _, others) = split_special(&ax.0, special_property)?;
                if top {
                    return Some(Err(NOT_SIMPLE.into()));
                }
                // The bottom property is disjoint from every property: the rest stay
                // pairwise disjoint.
                match self.disjoint_roles(&others) {
                    Ok(o) => o,
                    Err(e) => return Some(Err(e)),
                }
            }
            C::EquivalentObjectProperties(ax) => {
                let (top, bottom, others) = split_special(&ax.0, special_property)?;
                if top && bottom {
                    False
                } else if bottom {
                    match self.empty_roles(&others) {
                        Ok(axs) => Outcome::Axioms(axs),
                        Err(e) => return Some(Err(e)),
                    }
                } else if others.is_empty() {
                    True
                } else {
                    return Some(Err(UNIVERSAL_SUB.into()));
                }
            }
            C::InverseObjectProperties(ax) => {
                let a = special_property(&OPE::ObjectProperty(ax.0.clone()));
                let b = special_property(&OPE::ObjectProperty(ax.1.clone()));
                match (a, b) {
                    (None, None) => return None,
                    (Some(x), Some(y)) => truth(x == y),
                    (Some(false), None) => self.empty_named(&ax.1),
                    (None, Some(false)) => self.empty_named(&ax.0),
                    _ => return Some(Err(UNIVERSAL_SUB.into())),
                }
            }
            C::HasKey(ax) => {
                let mut any = false;
                for pe in &ax.vpe {
                    let s = match pe {
                        PropertyExpression::ObjectPropertyExpression(e) => special_property(e),
                        PropertyExpression::DataProperty(d) => match special_data_property(&d.0) {
                            Some(true) => return Some(Err(TOP_DATA.into())),
                            s => s,
                        },
                        PropertyExpression::AnnotationProperty(_) => None,
                    };
                    match s {
                        // No individual has a value of a bottom property: the key never applies.
                        Some(false) => return Some(Ok(True)),
                        Some(true) => any = true,
                        None => {}
                    }
                }
                if !any {
                    return None;
                }
                // Two individuals always share a filler of U (any individual): the key holds
                // on the other properties.
                let mut kept = ax.clone();
                kept.vpe.retain(|pe| match pe {
                    PropertyExpression::ObjectPropertyExpression(e) => {
                        special_property(e).is_none()
                    }
                    PropertyExpression::DataProperty(_) => true,
                    PropertyExpression::AnnotationProperty(_) => true,
                });
                if kept.vpe.is_empty() {
                    return Some(Err(
                        "a key made only of owl:topObjectProperty (every two named members of the class would be equal); state it with SameIndividual or a nominal instead".into(),
                    ));
                }
                Outcome::Instead(C::HasKey(kept))
            }
            // Data properties: the top one only as a super-property.
            C::SubDataPropertyOf(ax) => {
                let (sub, sup) = (
                    special_data_property(&ax.sub.0),
                    special_data_property(&ax.sup.0),
                );
                match (sub, sup) {
                    (None, None) => return None,
                    (_, Some(true)) | (Some(false), _) => True,
                    (None, Some(false)) => self.empty_data(&ax.sub),
                    (Some(true), _) => return Some(Err(TOP_DATA.into())),
                }
            }
            C::EquivalentDataProperties(ax) => {
                let (top, _, others) = split_special(&ax.0, |d| special_data_property(&d.0))?;
                if top {
                    return Some(Err(TOP_DATA.into()));
                }
                // Equivalent to the bottom property: empty.
                let axs = others
                    .iter()
                    .map(|d| Axiom::DataDomain(self.kb.vocab.data_prop(&d.0), ConceptId::BOTTOM))
                    .collect();
                Outcome::Axioms(axs)
            }
            C::DisjointDataProperties(ax) => {
                let (top, _, others) = split_special(&ax.0, |d| special_data_property(&d.0))?;
                if top {
                    return Some(Err(TOP_DATA.into()));
                }
                // The bottom data property is disjoint from every one: the rest stay so.
                if others.len() < 2 {
                    True
                } else {
                    let mut kept = ax.clone();
                    kept.0 = others.into_iter().cloned().collect();
                    Outcome::Instead(C::DisjointDataProperties(kept))
                }
            }
            C::DataPropertyDomain(ax) => self.bottom_data_only(&ax.dp)?,
            C::DataPropertyRange(ax) => self.bottom_data_only(&ax.dp)?,
            C::FunctionalDataProperty(ax) => self.bottom_data_only(&ax.0)?,
            C::NegativeDataPropertyAssertion(ax) => self.bottom_data_only(&ax.dp)?,
            C::DataPropertyAssertion(ax) => match special_data_property(&ax.dp.0)? {
                true => return Some(Err(TOP_DATA.into())),
                false => {
                    let a = self.individual(&ax.from);
                    Outcome::Axioms(vec![Axiom::ClassAssertion(ConceptId::BOTTOM, a)])
                }
            },
            _ => return None,
        }))
    }

    /// A characteristic that OWL 2 DL allows on simple properties only: refused on U, and
    /// true of the bottom property.
    fn simple_only(&mut self, e: &OPE<ArcStr>) -> Option<Outcome> {
        Some(match special_property(e)? {
            true => Outcome::Refused(NOT_SIMPLE),
            false => Outcome::True,
        })
    }

    /// An axiom about one data property (domain, range, functionality, negative assertion)
    /// that holds of the bottom data property and may not name the top one.
    fn bottom_data_only(&mut self, d: &DataProperty<ArcStr>) -> Option<Outcome> {
        Some(match special_data_property(&d.0)? {
            true => Outcome::Refused(TOP_DATA),
            false => Outcome::True,
        })
    }

    /// r₁ … rₙ pairwise disjoint (nothing when fewer than two).
    fn disjoint_roles(&mut self, rs: &[&OPE<ArcStr>]) -> Conv<Outcome> {
        if rs.len() < 2 {
            return Ok(Outcome::True);
        }
        let roles = rs
            .iter()
            .map(|e| self.role(e))
            .collect::<Conv<Vec<RoleId>>>()?;
        Ok(Outcome::Axioms(vec![Axiom::DisjointRoles(roles)]))
    }

    /// Each property is empty: nothing has a successor.
    fn empty_roles(&mut self, rs: &[&OPE<ArcStr>]) -> Conv<Vec<Axiom>> {
        rs.iter()
            .map(|e| Ok(Axiom::Domain(self.role(e)?, ConceptId::BOTTOM)))
            .collect()
    }

    fn empty_named(&mut self, p: &ObjectProperty<ArcStr>) -> Outcome {
        let r = RoleId::named(self.kb.vocab.prop(&p.0));
        Outcome::Axioms(vec![Axiom::Domain(r, ConceptId::BOTTOM)])
    }

    fn empty_data(&mut self, d: &DataProperty<ArcStr>) -> Outcome {
        let p = self.kb.vocab.data_prop(&d.0);
        Outcome::Axioms(vec![Axiom::DataDomain(p, ConceptId::BOTTOM)])
    }
}

/// The members of a property list that are neither a top nor a bottom property, with whether
/// the list holds a top one and a bottom one; `None` when it holds neither.
fn split_special<T>(
    items: &[T],
    special: impl Fn(&T) -> Option<bool>,
) -> Option<(bool, bool, Vec<&T>)> {
    let (mut top, mut bottom, mut others) = (false, false, Vec::new());
    for item in items {
        match special(item) {
            Some(true) => top = true,
            Some(false) => bottom = true,
            None => others.push(item),
        }
    }
    (top || bottom).then_some((top, bottom, others))
}

/// Why an axiom that makes an ordinary property universal is refused.
const UNIVERSAL_SUB: &str = "this axiom makes a property equal to owl:topObjectProperty or owl:topDataProperty (the universal property), which the reasoner does not support outside class expressions; use the top property itself";

//! Words for entities, relations and degrees, taken from the knowledge base's annotations:
//! rdfs:label or skos:prefLabel (English) for the clinician, our `wf:plainLabel` for the
//! patient (falling back to the clinician label, and recording the gap), our `wf:phrase` and
//! `wf:plainPhrase` patterns for relations.

use crate::explain::Assertion;
use crate::facts::abox::CASE_NS;
use crate::kb::datarange::DataRange;
use crate::kb::{Concept, KnowledgeBase};
use std::collections::BTreeSet;

const RDFS_LABEL: &str = "http://www.w3.org/2000/01/rdf-schema#label";
const SKOS_PREF: &str = "http://www.w3.org/2004/02/skos/core#prefLabel";
const WF: &str = "https://wherefore.example.org/ns/core#";

/// Degree bands for the clinician (the number is shown beside the word).
pub fn band(d: f64) -> &'static str {
    if d >= 0.9 {
        "definite"
    } else if d >= 0.7 {
        "likely"
    } else if d >= 0.5 {
        "possible"
    } else {
        "weak"
    }
}

/// Degree bands in plain words (no number).
pub fn plain_band(d: f64) -> &'static str {
    if d >= 0.9 {
        "strong"
    } else if d >= 0.7 {
        "fairly strong"
    } else if d >= 0.5 {
        "moderate"
    } else {
        "weak"
    }
}

/// A data range as short text, e.g. `decimal[≥ 30]`.
pub fn range_text(r: &DataRange) -> String {
    r.describe()
}

/// Verbaliser over one knowledge base.
pub struct Words<'a> {
    kb: &'a KnowledgeBase,
    /// Entities whose plain label was missing.
    pub gaps: BTreeSet<String>,
}

impl<'a> Words<'a> {
    /// A verbaliser.
    pub fn new(kb: &'a KnowledgeBase) -> Self {
        Words {
            kb,
            gaps: BTreeSet::new(),
        }
    }

    fn english(&self, iri: &str, prop: &str) -> Option<String> {
        let vs = self.kb.annotation(iri, prop);
        vs.iter()
            .find(|v| v.lang.eq_ignore_ascii_case("en"))
            .or_else(|| vs.iter().find(|v| v.lang.is_empty()))
            .map(|v| v.value.clone())
    }

    /// The label of an entity in a register.
    pub fn label(&mut self, iri: &str, plain: bool) -> String {
        let clinician = self
            .english(iri, RDFS_LABEL)
            .or_else(|| self.english(iri, SKOS_PREF))
            .unwrap_or_else(|| iri.rsplit(['#', '/']).next().unwrap_or(iri).to_string());
        if plain {
            if let Some(p) = self.english(iri, &format!("{WF}plainLabel")) {
                return p;
            }
            self.gaps.insert(iri.to_string());
        }
        clinician
    }

    /// The label of a class.
    pub fn class_label(&mut self, iri: &str, plain: bool) -> String {
        self.label(iri, plain)
    }

    /// How a case individual is named: its id, with its class for organs.
    pub fn individual_label(&mut self, id: &str, plain: bool) -> String {
        let iri = format!("{CASE_NS}{id}");
        let Some(a) = self.kb.vocab.find_individual(&iri) else {
            return id.to_string();
        };
        // The individual's asserted named class, if any.
        for ax in &self.kb.axioms {
            if let crate::kb::Axiom::ClassAssertion(c, i) = ax.axiom
                && i == a
                && let Concept::Atom(k) = self.kb.concepts.get(c)
            {
                let ciri = self.kb.vocab.class_iri(*k).to_string();
                if self
                    .kb
                    .annotation(&ciri, &format!("{WF}finding"))
                    .is_empty()
                {
                    return format!("the {}", self.label(&ciri, plain).to_lowercase());
                }
                return id.to_string();
            }
        }
        id.to_string()
    }

    /// A facts relation between two case individuals, in words.
    pub fn relation(&mut self, rel: &str, subject: &str, object: &str, plain: bool) -> String {
        let prop = self.kb.annotations.iter().find_map(|(s, m)| {
            m.get(&format!("{WF}factsRelation"))
                .filter(|vs| vs.iter().any(|v| v.value == rel))
                .map(|_| s.clone())
        });
        let s = self.individual_label(subject, plain);
        let o = self.individual_label(object, plain);
        let pattern = prop.as_ref().and_then(|p| {
            if plain {
                self.english(p, &format!("{WF}plainPhrase"))
                    .or_else(|| self.english(p, &format!("{WF}phrase")))
            } else {
                self.english(p, &format!("{WF}phrase"))
            }
        });
        match pattern {
            Some(p) => p.replace("{subject}", &s).replace("{object}", &o),
            None => format!("{s} {} {o}", rel.replace('_', " ")),
        }
    }

    /// An assertion in words (hypotheses and observations).
    pub fn assertion(&mut self, a: &Assertion, plain: bool) -> String {
        let kb = self.kb;
        match *a {
            Assertion::Class(c, i) => {
                let iri = kb.vocab.individual_iri(i).to_string();
                let id = iri.strip_prefix(CASE_NS).unwrap_or(&iri).to_string();
                let what = match kb.concepts.get(c) {
                    Concept::Atom(k) => self.label(kb.vocab.class_iri(*k), plain),
                    Concept::NotAtom(k) => {
                        format!("not {}", self.label(kb.vocab.class_iri(*k), plain))
                    }
                    _ => super::dl_concept(kb, c),
                };
                if plain {
                    format!("{} ({id})", what.to_lowercase())
                } else {
                    format!("{id}: {what}")
                }
            }
            Assertion::Role(r, x, y) => {
                let (x, y) = if r.is_inverse() { (y, x) } else { (x, y) };
                let p = kb.vocab.prop_iri(r.prop()).to_string();
                let xi = kb.vocab.individual_iri(x).to_string();
                let yi = kb.vocab.individual_iri(y).to_string();
                let xs = xi.strip_prefix(CASE_NS).unwrap_or(&xi).to_string();
                let ys = yi.strip_prefix(CASE_NS).unwrap_or(&yi).to_string();
                let label = self.label(&p, plain);
                format!("{xs} {label} {ys}")
            }
        }
    }
}

//! Verbalising results in three registers (clinician, patient, formal) and writing report
//! drafts (Markdown, self-contained HTML, JSON). The same values feed every format.

pub mod fhir;
pub mod html;
pub mod readability;
pub mod text;
pub mod words;

use crate::explain::{Assertion, ExplainResult, Problem};
use crate::facts::Facts;
use crate::facts::abox::CaseAbox;
use crate::kb::{Axiom, Concept, KnowledgeBase};
use serde::Serialize;
use words::Words;

/// The caution, in the clinician's and formal registers.
pub const CAUTION: &str = "This is an automatically generated draft for review by a qualified clinician. It is not medical advice and not a diagnosis. Local protocols and licensed clinical practice take precedence. The demo knowledge base is illustrative, not clinical guidance.";

/// The caution in plain words, for the patient register.
pub const CAUTION_PLAIN: &str = "This is a draft made by a computer. A doctor must check it. It is not medical advice. Your care team and their usual rules come first.";

/// The three texts of a report.
#[derive(Clone, Debug, Serialize)]
pub struct Registers {
    /// Concise, in the trade's terms, with measured values.
    pub clinician: String,
    /// Plain words and short sentences.
    pub patient: String,
    /// Description-logic notation, functional syntax and justifications.
    pub formal: String,
}

/// One ranked explanation as a report shows it.
#[derive(Clone, Debug, Serialize)]
pub struct ReportExplanation {
    /// Rank, from 1.
    pub rank: usize,
    /// Hypotheses in functional syntax.
    pub assertions: Vec<String>,
    /// Size.
    pub size: usize,
    /// Σ ln prior + ln degree.
    pub score: f64,
    /// Degree in [0, 1].
    pub degree: f64,
    /// The hypotheses in the clinician's words.
    pub summary: String,
    /// Axioms of the justification, functional syntax.
    pub justification: Vec<String>,
}

/// A suspended normal-anatomy default.
#[derive(Clone, Debug, Serialize)]
pub struct Abnormality {
    /// The default axiom, functional syntax.
    pub axiom: String,
    /// Its clinician wording.
    pub statement: String,
    /// Case facts that contradicted it.
    pub contradicted_by: Vec<String>,
}

/// One finding (a lesion) as measured, for structured outputs.
#[derive(Clone, Debug, Serialize)]
pub struct ReportFinding {
    /// Individual id from the label table.
    pub id: String,
    /// Its class in the clinician's words.
    pub label: String,
    /// Volume, mL.
    pub volume_ml: f64,
    /// Largest diameter, mm.
    pub largest_diameter_mm: f64,
    /// Centroid, RAS mm.
    pub centroid_mm: [f64; 3],
    /// The relations the clinician register lists, in its words, with their degrees.
    pub relations: Vec<(String, f64)>,
    /// Ranks of the explanations that name this finding.
    pub explained_by: Vec<usize>,
}

/// A report draft for one case.
#[derive(Clone, Debug, Serialize)]
pub struct Report {
    /// The case id.
    pub case: String,
    /// The caution.
    pub caution: String,
    /// The three registers.
    pub registers: Registers,
    /// The findings as measured.
    pub findings: Vec<ReportFinding>,
    /// Ranked explanations.
    pub explanations: Vec<ReportExplanation>,
    /// Observations no explanation accounts for (functional syntax).
    pub unexplained: Vec<String>,
    /// Suspended defaults.
    pub abnormalities: Vec<Abnormality>,
    /// Whether the KB with the case was consistent (after suspensions).
    pub kb_consistent: bool,
    /// Whether the search finished.
    pub complete: bool,
    /// Entities without a plain-language label (the patient text fell back to the clinician's).
    pub plain_label_gaps: Vec<String>,
}

/// Everything a report is drawn from.
pub struct ReportInput<'a> {
    /// Case id.
    pub case: &'a str,
    /// The measured facts.
    pub facts: &'a Facts,
    /// The abduction problem (KB with the case).
    pub problem: &'a Problem,
    /// The translation record.
    pub abox: &'a CaseAbox,
    /// The result.
    pub result: &'a ExplainResult,
    /// The α-cut used.
    pub alpha: f64,
}

fn source_text(kb: &KnowledgeBase, axiom: usize) -> String {
    kb.sources[kb.axioms[axiom].source].text.clone()
}

/// Builds the report.
pub fn build(input: &ReportInput) -> Report {
    let kb = &input.problem.kb;
    let mut w = Words::new(kb);
    let mut explanations = Vec::new();
    for (i, e) in input.result.explanations.iter().enumerate() {
        let summary = e
            .assertions
            .iter()
            .map(|a| w.assertion(a, false))
            .collect::<Vec<_>>()
            .join("; ");
        let mut just: Vec<String> = e
            .justification
            .iter()
            .map(|&j| source_text(kb, j))
            .collect();
        just.sort();
        just.dedup();
        explanations.push(ReportExplanation {
            rank: i + 1,
            assertions: e.texts.clone(),
            size: e.size,
            score: e.score,
            degree: e.degree,
            summary,
            justification: just,
        });
    }
    let mut unexplained: Vec<String> = input
        .result
        .unexplained
        .iter()
        .map(|a| a.text(kb, &kb.concepts))
        .collect();
    unexplained.sort();
    let abnormalities: Vec<Abnormality> = input
        .result
        .suspended
        .iter()
        .map(|&i| {
            let src = &kb.sources[kb.axioms[i].source];
            let statement = src
                .annotations
                .iter()
                .find(|(p, _)| p == "http://www.w3.org/2000/01/rdf-schema#label")
                .map(|(_, v)| v.clone())
                .unwrap_or_else(|| src.text.clone());
            let mut contradicted_by: Vec<String> = input
                .result
                .suspended_conflicts
                .iter()
                .flatten()
                .filter(|&&j| j >= input.abox.first_axiom)
                .map(|&j| source_text(kb, j))
                .collect();
            contradicted_by.sort();
            contradicted_by.dedup();
            Abnormality {
                axiom: src.text.clone(),
                statement,
                contradicted_by,
            }
        })
        .collect();
    let mut findings = Vec::new();
    for ind in &input.facts.individuals {
        let Some(&a) = input.abox.individuals.get(&ind.id) else {
            continue;
        };
        if !input.abox.findings.contains(&a) {
            continue;
        }
        let relations = shown_relations(input, &ind.id)
            .iter()
            .map(|r| {
                (
                    w.relation(&r.relation, &r.subject, &r.object, false),
                    r.degree,
                )
            })
            .collect();
        let explained_by = input
            .result
            .explanations
            .iter()
            .enumerate()
            .filter(|(_, e)| e.assertions.iter().any(|x| x.individuals().contains(&a)))
            .map(|(i, _)| i + 1)
            .collect();
        findings.push(ReportFinding {
            id: ind.id.clone(),
            label: w.class_label(&ind.class, false),
            volume_ml: ind.volume_ml,
            largest_diameter_mm: ind.largest_diameter_mm,
            centroid_mm: ind.centroid_mm,
            relations,
            explained_by,
        });
    }
    let clinician = clinician_text(input, &mut w, &explanations, &abnormalities);
    let patient = patient_text(input, &mut w, &abnormalities);
    let formal = formal_text(input, &explanations);
    let mut gaps: Vec<String> = w.gaps.iter().cloned().collect();
    gaps.sort();
    Report {
        case: input.case.to_string(),
        caution: CAUTION.to_string(),
        registers: Registers {
            clinician,
            patient,
            formal,
        },
        findings,
        explanations,
        unexplained,
        abnormalities,
        kb_consistent: input.result.kb_consistent,
        complete: input.result.complete,
        plain_label_gaps: gaps,
    }
}

/// The relations of a finding that the clinician register lists: at or above the α-cut,
/// not disconnection or `far`, directional ones only when clear (0.7), at most eight.
fn shown_relations<'f>(input: &ReportInput<'f>, id: &str) -> Vec<&'f crate::facts::Relation> {
    let mut rels = relations_of(input.facts, id, |r| {
        r.degree >= input.alpha
            && r.relation != "rcc8_DC"
            && r.relation != "far"
            && (!is_directional(&r.relation) || r.degree >= 0.7)
    });
    rels.truncate(8);
    rels
}

/// The relations of a subject that pass a filter, strongest first (then by object).
fn relations_of<'f>(
    facts: &'f Facts,
    subject: &str,
    keep: impl Fn(&crate::facts::Relation) -> bool,
) -> Vec<&'f crate::facts::Relation> {
    let mut rels: Vec<&crate::facts::Relation> = facts
        .relations
        .iter()
        .filter(|r| r.subject == subject && keep(r))
        .collect();
    rels.sort_by(|a, b| {
        b.degree
            .partial_cmp(&a.degree)
            .unwrap_or(std::cmp::Ordering::Equal)
            .then(a.object.cmp(&b.object))
    });
    rels
}

fn is_directional(rel: &str) -> bool {
    matches!(
        rel,
        "left_of" | "right_of" | "anterior_of" | "posterior_of" | "superior_of" | "inferior_of"
    )
}

/// The opposite of a directional relation and the name of their axis.
fn opposite(rel: &str) -> Option<(&'static str, &'static str)> {
    Some(match rel {
        "left_of" => ("right_of", "left–right"),
        "right_of" => ("left_of", "left–right"),
        "anterior_of" => ("posterior_of", "anterior–posterior"),
        "posterior_of" => ("anterior_of", "anterior–posterior"),
        "superior_of" => ("inferior_of", "superior–inferior"),
        "inferior_of" => ("superior_of", "superior–inferior"),
        _ => return None,
    })
}

fn fmt_num(v: f64) -> String {
    if v >= 100.0 {
        format!("{v:.0}")
    } else if v >= 10.0 {
        format!("{v:.1}")
    } else {
        format!("{v:.2}")
    }
}

fn clinician_text(
    input: &ReportInput,
    w: &mut Words,
    expl: &[ReportExplanation],
    abn: &[Abnormality],
) -> String {
    use std::fmt::Write;
    let mut s = String::new();
    let _ = writeln!(s, "CAUTION: {CAUTION}\n");
    let _ = writeln!(s, "FINDINGS");
    for ind in &input.facts.individuals {
        let Some(&a) = input.abox.individuals.get(&ind.id) else {
            continue;
        };
        if !input.abox.findings.contains(&a) {
            continue;
        }
        let _ = writeln!(
            s,
            "- {} ({}): volume {} mL, largest diameter {} mm, centroid RAS ({:.1}, {:.1}, {:.1}) mm.",
            ind.id,
            w.class_label(&ind.class, false),
            fmt_num(ind.volume_ml),
            fmt_num(ind.largest_diameter_mm),
            ind.centroid_mm[0],
            ind.centroid_mm[1],
            ind.centroid_mm[2]
        );
        let rels = shown_relations(input, &ind.id);
        let mut merged = vec![false; rels.len()];
        for (i, r) in rels.iter().enumerate() {
            if merged[i] {
                continue;
            }
            // Both directions of one axis against the same object: the finding lies within
            // the object's extent along that axis (an elongated object reaches past it on
            // both sides), said once, at the stronger one's place.
            let pair = opposite(&r.relation).and_then(|(opp, axis)| {
                rels.iter()
                    .position(|q| q.object == r.object && q.relation == opp)
                    .map(|j| (j, axis))
            });
            if let Some((j, axis)) = pair {
                merged[j] = true;
                let q = rels[j];
                let _ = writeln!(
                    s,
                    "  - {} lies alongside {}, within its {axis} extent ({} {:.2}, {} {:.2}; {})",
                    w.individual_label(&r.subject, false),
                    w.individual_label(&r.object, false),
                    r.relation.trim_end_matches("_of"),
                    r.degree,
                    q.relation.trim_end_matches("_of"),
                    q.degree,
                    words::band(q.degree)
                );
                continue;
            }
            let _ = writeln!(
                s,
                "  - {} ({:.2}, {})",
                w.relation(&r.relation, &r.subject, &r.object, false),
                r.degree,
                words::band(r.degree)
            );
        }
        for m in input
            .facts
            .measurements
            .iter()
            .filter(|m| m.subject == ind.id && m.quantity == "min_distance_mm")
        {
            let apart = input.facts.relations.iter().any(|r| {
                r.subject == ind.id
                    && r.object == m.object
                    && (r.relation == "rcc8_DC" || r.relation == "rcc8_EC")
            });
            if apart && m.value <= 10.0 {
                let _ = writeln!(
                    s,
                    "  - {} mm from {} (closest distance).",
                    fmt_num(m.value),
                    w.individual_label(&m.object, false)
                );
            }
        }
    }
    let _ = writeln!(s, "\nINTERPRETATION (ranked; α-cut {:.2})", input.alpha);
    if !input.result.kb_consistent {
        let _ = writeln!(
            s,
            "The case contradicts the knowledge base in a way no default explains; no interpretation is offered. See the formal register for the conflicting axioms."
        );
    } else if input.result.already_entailed {
        let _ = writeln!(
            s,
            "The knowledge base already accounts for the findings; no hypothesis is needed."
        );
    } else if expl.is_empty() {
        let _ = writeln!(
            s,
            "No hypothesis of the knowledge base accounts for the findings."
        );
    }
    for e in expl {
        let _ = writeln!(
            s,
            "{}. {} — degree {:.2}, score {:.2}.",
            e.rank, e.summary, e.degree, e.score
        );
    }
    if !input.result.unexplained.is_empty() {
        let _ = writeln!(s, "\nUNEXPLAINED");
        for a in &input.result.unexplained {
            let _ = writeln!(s, "- {}", w.assertion(a, false));
        }
    }
    if !abn.is_empty() {
        let _ = writeln!(s, "\nABNORMALITIES OF THE CASE");
        for a in abn {
            let _ = writeln!(s, "- Normal-anatomy default suspended: {}", a.statement);
        }
    }
    if !input.result.complete {
        let _ = writeln!(
            s,
            "\nNOTE: a search limit was reached; the list may be incomplete."
        );
    }
    s
}

fn patient_text(input: &ReportInput, w: &mut Words, abn: &[Abnormality]) -> String {
    use std::fmt::Write;
    let mut s = String::new();
    let _ = writeln!(s, "Please note: {CAUTION_PLAIN}\n");
    let _ = writeln!(s, "What the scan shows");
    let mut n = 0;
    for ind in &input.facts.individuals {
        let Some(&a) = input.abox.individuals.get(&ind.id) else {
            continue;
        };
        if !input.abox.findings.contains(&a) {
            continue;
        }
        n += 1;
        let size_cm = ind.largest_diameter_mm / 10.0;
        let _ = write!(s, "The scan shows a spot, called {}. ", ind.id);
        let _ = write!(s, "It is about {:.1} cm across at its widest. ", size_cm);
        let rels = relations_of(input.facts, &ind.id, |r| {
            r.degree >= 0.7
                && matches!(
                    r.relation.as_str(),
                    "rcc8_NTPP" | "rcc8_TPP" | "rcc8_PO" | "near"
                )
        });
        for r in rels.iter().take(2) {
            let _ = write!(
                s,
                "{} ",
                sentence(&w.relation(&r.relation, &r.subject, &r.object, true))
            );
        }
        let _ = writeln!(s);
    }
    if n == 0 {
        let _ = writeln!(s, "No spot was marked on this scan.");
    }
    let _ = writeln!(s, "\nWhat it could be");
    if !input.result.kb_consistent {
        let _ = writeln!(
            s,
            "The computer could not match this scan to its list of known patterns. A doctor will look at it."
        );
    } else if input.result.explanations.is_empty() {
        let _ = writeln!(
            s,
            "The computer found no likely match in its list. This does not mean something is wrong. A doctor will look at it."
        );
    }
    for (i, e) in input.result.explanations.iter().take(3).enumerate() {
        let what = e
            .assertions
            .iter()
            .map(|a| w.assertion(a, true))
            .collect::<Vec<_>>()
            .join(" and ");
        let lead = if i == 0 {
            "The best match is"
        } else {
            "Another possible match is"
        };
        let _ = writeln!(
            s,
            "{lead}: {what}. The computer's match is {}.",
            words::plain_band(e.degree)
        );
    }
    if !input.result.unexplained.is_empty() && !input.result.explanations.is_empty() {
        let _ = writeln!(
            s,
            "Some parts of the scan did not match anything in the list. A doctor will look at them."
        );
    }
    if !abn.is_empty() {
        let _ = writeln!(
            s,
            "One thing looked different from usual: the organs are not in their usual places. A doctor will check this."
        );
    }
    let _ = writeln!(s, "\nWhat this means and what happens next");
    let _ = writeln!(
        s,
        "These are only ideas from a computer. They are not a diagnosis. Your care team will look at your scan. They will talk with you about what it means and what to do next. Please ask them any questions you have."
    );
    s
}

fn sentence(t: &str) -> String {
    let mut c = t.chars();
    let mut out = match c.next() {
        Some(f) => f.to_uppercase().collect::<String>() + c.as_str(),
        None => String::new(),
    };
    if !out.ends_with('.') {
        out.push('.');
    }
    out
}

fn formal_text(input: &ReportInput, expl: &[ReportExplanation]) -> String {
    use std::fmt::Write;
    let kb = &input.problem.kb;
    let mut s = String::new();
    let _ = writeln!(s, "Caution: {CAUTION}\n");
    let _ = writeln!(s, "Observations O:");
    for o in &input.problem.observations {
        let _ = writeln!(
            s,
            "  {}    {}",
            dl_assertion(kb, o),
            o.text(kb, &kb.concepts)
        );
    }
    let _ = writeln!(
        s,
        "Background: {} case assertions (α-cut {:.2}); KB consistent: {}; search complete: {}.",
        input.abox.degrees.len(),
        input.alpha,
        input.result.kb_consistent,
        input.result.complete
    );
    if !input.result.kb_consistent {
        let _ = writeln!(s, "Minimal conflicting set:");
        for (n, &i) in input.result.conflict.iter().enumerate() {
            let _ = writeln!(
                s,
                "  ({}) {}    {}",
                n + 1,
                dl_axiom(kb, &kb.axioms[i].axiom),
                source_text(kb, i)
            );
        }
    }
    for &i in &input.result.suspended {
        let _ = writeln!(
            s,
            "Suspended default: {}    {}",
            dl_axiom(kb, &kb.axioms[i].axiom),
            source_text(kb, i)
        );
    }
    for (e, r) in expl.iter().zip(&input.result.explanations) {
        let _ = writeln!(
            s,
            "\nE{} (size {}, degree {:.3}, score {:.3}):",
            e.rank, e.size, e.degree, e.score
        );
        for a in &r.assertions {
            let _ = writeln!(
                s,
                "  {}    {}",
                dl_assertion(kb, a),
                a.text(kb, &kb.concepts)
            );
        }
        let _ = writeln!(s, "  K ∪ E ⊨ O by the justification:");
        let mut just: Vec<usize> = r.justification.clone();
        just.sort_by_key(|&j| source_text(kb, j));
        just.dedup_by_key(|j| kb.axioms[*j].source);
        for (n, &j) in just.iter().enumerate() {
            let _ = writeln!(
                s,
                "    ({}) {}    {}",
                n + 1,
                dl_axiom(kb, &kb.axioms[j].axiom),
                source_text(kb, j)
            );
        }
    }
    if !input.result.unexplained.is_empty() {
        let _ = writeln!(s, "\nUnexplained:");
        for a in &input.result.unexplained {
            let _ = writeln!(s, "  {}", dl_assertion(kb, a));
        }
    }
    s
}

fn short(iri: &str) -> String {
    iri.rsplit(['#', '/'])
        .next()
        .filter(|x| !x.is_empty())
        .unwrap_or(iri)
        .to_string()
}

/// A concept in description-logic notation with short names.
pub fn dl_concept(kb: &KnowledgeBase, c: crate::kb::ConceptId) -> String {
    let cs = &kb.concepts;
    let role = |r: crate::kb::RoleId| {
        let n = short(kb.vocab.prop_iri(r.prop()));
        if r.is_inverse() { format!("{n}⁻") } else { n }
    };
    let paren = |x: crate::kb::ConceptId| {
        let t = dl_concept(kb, x);
        if matches!(cs.get(x), Concept::And(_) | Concept::Or(_)) {
            format!("({t})")
        } else {
            t
        }
    };
    match cs.get(c) {
        Concept::Top => "⊤".into(),
        Concept::Bottom => "⊥".into(),
        Concept::Atom(a) => short(kb.vocab.class_iri(*a)),
        Concept::NotAtom(a) => format!("¬{}", short(kb.vocab.class_iri(*a))),
        Concept::Nominal(i) => format!("{{{}}}", short(kb.vocab.individual_iri(*i))),
        Concept::NotNominal(i) => format!("¬{{{}}}", short(kb.vocab.individual_iri(*i))),
        Concept::And(xs) => xs.iter().map(|&x| paren(x)).collect::<Vec<_>>().join(" ⊓ "),
        Concept::Or(xs) => xs.iter().map(|&x| paren(x)).collect::<Vec<_>>().join(" ⊔ "),
        Concept::Some(r, x) => format!("∃{}.{}", role(*r), paren(*x)),
        Concept::All(r, x) => format!("∀{}.{}", role(*r), paren(*x)),
        Concept::AtLeast(n, r, x) => format!("≥{n} {}.{}", role(*r), paren(*x)),
        Concept::AtMost(n, r, x) => format!("≤{n} {}.{}", role(*r), paren(*x)),
        Concept::DataSome(p, d) => format!(
            "∃{}.{}",
            short(&kb.vocab.data_props[p.index()]),
            words::range_text(kb.ranges.get(*d))
        ),
        Concept::DataAll(p, d) => format!(
            "∀{}.{}",
            short(&kb.vocab.data_props[p.index()]),
            words::range_text(kb.ranges.get(*d))
        ),
        Concept::HasSelf(r) => format!("∃{}.Self", role(*r)),
        Concept::NotSelf(r) => format!("¬∃{}.Self", role(*r)),
        Concept::AllPath(r, q, x) => format!("∀{}[{q}].{}", role(*r), paren(*x)),
        Concept::SomePath(r, q, x) => format!("∃{}[{q}].{}", role(*r), paren(*x)),
        Concept::DataAtLeast(n, p, d) => format!(
            "≥{n} {}.{}",
            short(&kb.vocab.data_props[p.index()]),
            words::range_text(kb.ranges.get(*d))
        ),
        Concept::DataAtMost(n, p, d) => format!(
            "≤{n} {}.{}",
            short(&kb.vocab.data_props[p.index()]),
            words::range_text(kb.ranges.get(*d))
        ),
    }
}

/// An assertion in description-logic notation.
pub fn dl_assertion(kb: &KnowledgeBase, a: &Assertion) -> String {
    match *a {
        Assertion::Class(c, i) => format!(
            "{}({})",
            dl_concept(kb, c),
            short(kb.vocab.individual_iri(i))
        ),
        Assertion::Role(r, x, y) => {
            let (x, y) = if r.is_inverse() { (y, x) } else { (x, y) };
            format!(
                "{}({}, {})",
                short(kb.vocab.prop_iri(r.prop())),
                short(kb.vocab.individual_iri(x)),
                short(kb.vocab.individual_iri(y))
            )
        }
    }
}

/// An axiom in description-logic notation.
pub fn dl_axiom(kb: &KnowledgeBase, a: &Axiom) -> String {
    let c = |x| dl_concept(kb, x);
    let role = |r: crate::kb::RoleId| {
        let n = short(kb.vocab.prop_iri(r.prop()));
        if r.is_inverse() { format!("{n}⁻") } else { n }
    };
    let ind = |i: crate::kb::IndividualId| short(kb.vocab.individual_iri(i));
    match a {
        Axiom::SubClass(x, y) => format!("{} ⊑ {}", c(*x), c(*y)),
        Axiom::Equivalent(xs) => xs.iter().map(|&x| c(x)).collect::<Vec<_>>().join(" ≡ "),
        Axiom::Disjoint(xs) => format!(
            "disjoint({})",
            xs.iter().map(|&x| c(x)).collect::<Vec<_>>().join(", ")
        ),
        Axiom::DisjointUnion(x, xs) => format!(
            "{} ≡ {} (disjoint)",
            c(*x),
            xs.iter().map(|&x| c(x)).collect::<Vec<_>>().join(" ⊔ ")
        ),
        Axiom::SubRole(r, s) => format!("{} ⊑ {}", role(*r), role(*s)),
        Axiom::Transitive(r) => format!("Trans({})", role(*r)),
        Axiom::SubRoleChain(rs, s) => format!(
            "{} ⊑ {}",
            rs.iter().map(|&r| role(r)).collect::<Vec<_>>().join(" ∘ "),
            role(*s)
        ),
        Axiom::Reflexive(r) => format!("Ref({})", role(*r)),
        Axiom::Irreflexive(r) => format!("Irr({})", role(*r)),
        Axiom::Asymmetric(r) => format!("Asy({})", role(*r)),
        Axiom::DisjointRoles(rs) => format!(
            "Dis({})",
            rs.iter().map(|&r| role(r)).collect::<Vec<_>>().join(", ")
        ),
        Axiom::HasKey(x, rs, ps) => format!(
            "key({}: {})",
            c(*x),
            rs.iter()
                .map(|&r| role(r))
                .chain(ps.iter().map(|p| short(&kb.vocab.data_props[p.index()])))
                .collect::<Vec<_>>()
                .join(", ")
        ),
        Axiom::Functional(r) => format!("⊤ ⊑ ≤1 {}.⊤", role(*r)),
        Axiom::Domain(r, x) => format!("∃{}.⊤ ⊑ {}", role(*r), c(*x)),
        Axiom::SubDataProp(p, q) => format!(
            "{} ⊑ {}",
            short(&kb.vocab.data_props[p.index()]),
            short(&kb.vocab.data_props[q.index()])
        ),
        Axiom::FunctionalData(p) => format!("Func({})", short(&kb.vocab.data_props[p.index()])),
        Axiom::DisjointDataProps(ps) => format!(
            "Dis({})",
            ps.iter()
                .map(|p| short(&kb.vocab.data_props[p.index()]))
                .collect::<Vec<_>>()
                .join(", ")
        ),
        Axiom::DataDomain(p, x) => {
            format!("∃{}.⊤ ⊑ {}", short(&kb.vocab.data_props[p.index()]), c(*x))
        }
        Axiom::DataRangeAxiom(p, d) => format!(
            "⊤ ⊑ ∀{}.{}",
            short(&kb.vocab.data_props[p.index()]),
            words::range_text(kb.ranges.get(*d))
        ),
        Axiom::ClassAssertion(x, i) => format!("{}({})", c(*x), ind(*i)),
        Axiom::RoleAssertion(r, i, j) => format!("{}({}, {})", role(*r), ind(*i), ind(*j)),
        Axiom::NegativeRoleAssertion(r, i, j) => format!("¬{}({}, {})", role(*r), ind(*i), ind(*j)),
        Axiom::Same(xs) => xs.iter().map(|&i| ind(i)).collect::<Vec<_>>().join(" = "),
        Axiom::Different(xs) => xs.iter().map(|&i| ind(i)).collect::<Vec<_>>().join(" ≠ "),
    }
}

/// The Markdown draft.
pub fn markdown(r: &Report) -> String {
    use std::fmt::Write;
    let mut s = String::new();
    let _ = writeln!(s, "# Report draft: {}\n", r.case);
    let _ = writeln!(s, "> **Caution.** {}\n", r.caution);
    let _ = writeln!(
        s,
        "## For the clinician\n\n```text\n{}```\n",
        r.registers.clinician
    );
    let _ = writeln!(
        s,
        "## For the patient\n\n{}\n",
        r.registers.patient.replace('\n', "\n\n").trim_end()
    );
    let _ = writeln!(
        s,
        "\n## Formal record\n\n```text\n{}```",
        r.registers.formal
    );
    s
}

/// Builds the report of one case.
pub fn report_for(
    kb: &KnowledgeBase,
    facts: &Facts,
    case: &str,
    file: &str,
    alpha: f64,
    max_size: usize,
) -> Result<Report, String> {
    let c = crate::explain::case::case_problem(kb, facts, file);
    let opts = crate::explain::ExplainOptions {
        alpha,
        max_size,
        ..Default::default()
    };
    let result = crate::explain::explain(&c.problem, &opts).map_err(|r| r.reason)?;
    let input = ReportInput {
        case,
        facts,
        problem: &c.problem,
        abox: &c.abox,
        result: &result,
        alpha,
    };
    Ok(build(&input))
}

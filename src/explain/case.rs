//! Abduction problems: from a knowledge base and a measured case (facts file), or from
//! observation assertions added to the KB (a file or inline text).

use super::abduce::{Problem, annotated_abducibles};
use super::assertion::Assertion;
use crate::facts::Facts;
use crate::facts::abox::{CaseAbox, add_facts, marked};
use crate::kb::{Axiom, Concept, IndividualId, KnowledgeBase, RoleId};
use std::path::Path;

/// A case ready to explain, with what the translation found.
pub struct Case {
    /// The problem.
    pub problem: Problem,
    /// The translation's record (individuals, findings, warnings).
    pub abox: CaseAbox,
}

/// Builds the problem: the facts become background assertions with degrees; each finding
/// individual's finding classes are the observations; abducibles come from our annotations.
#[allow(clippy::needless_range_loop)]
pub fn case_problem(kb: &KnowledgeBase, facts: &Facts, file: &str) -> Case {
    let mut kb = kb.clone();
    let n0 = kb.axioms.len();
    let abox = add_facts(&mut kb, facts, file);
    let mut degrees = vec![1.0; n0];
    degrees.extend(abox.degrees.iter().copied());
    let mut observations = Vec::new();
    let mut background = vec![true; kb.axioms.len()];
    for i in n0..kb.axioms.len() {
        if let Axiom::ClassAssertion(c, a) = kb.axioms[i].axiom {
            if !abox.findings.contains(&a) {
                continue;
            }
            if let crate::kb::Concept::Atom(k) = kb.concepts.get(c)
                && marked(&kb, kb.vocab.class_iri(*k), "finding")
            {
                // The finding class is what must be explained: it is an observation,
                // not background.
                observations.push(Assertion::Class(c, a));
                background[i] = false;
            }
        }
    }
    let individuals: Vec<IndividualId> = abox.individuals.values().copied().collect();
    let abducibles = annotated_abducibles(&mut kb, &abox.findings, &individuals);
    Case {
        problem: Problem {
            kb,
            background,
            degrees,
            observations,
            abducibles,
        },
        abox,
    }
}

/// How large a knowledge base was at one moment: what was added after it (the observations)
/// can then be told apart from the KB itself.
#[derive(Clone, Copy, Debug)]
pub struct Mark {
    /// Number of axioms.
    pub axioms: usize,
    /// Number of classes.
    pub classes: usize,
    /// Number of individuals.
    pub individuals: usize,
    /// Number of object properties.
    pub props: usize,
}

impl Mark {
    /// The knowledge base's size now.
    pub fn of(kb: &KnowledgeBase) -> Self {
        Mark {
            axioms: kb.axioms.len(),
            classes: kb.vocab.classes.len(),
            individuals: kb.vocab.individuals.len(),
            props: kb.vocab.props.len(),
        }
    }
}

/// Builds a problem whose observations are the assertions added to `kb` after `mark`
/// (loaded from `origin`, a file or inline text). Each must be a class or object property
/// assertion over classes, properties and individuals the KB already knows. Abducibles are
/// read from `abducibles` when given, else from the KB's hypothesis annotations.
pub fn observations_problem(
    mut kb: KnowledgeBase,
    mark: Mark,
    origin: &str,
    abducibles: Option<&Path>,
) -> Result<Problem, String> {
    kb.signature_classes.retain(|c| c.index() < mark.classes);
    let mut observations = Vec::new();
    for i in mark.axioms..kb.axioms.len() {
        let text = kb.sources[kb.axioms[i].source].text.clone();
        let a = match &kb.axioms[i].axiom {
            Axiom::ClassAssertion(c, a) => Assertion::Class(*c, *a),
            Axiom::RoleAssertion(r, a, b) => Assertion::Role(*r, *a, *b),
            _ => {
                return Err(format!(
                    "{origin}: axiom {text} is not a class or property assertion; observations may be only ClassAssertion and ObjectPropertyAssertion axioms"
                ));
            }
        };
        for ind in a.individuals() {
            if ind.index() >= mark.individuals {
                return Err(format!(
                    "{origin}: axiom {text} names the individual <{}>, which the knowledge base does not know; add it to the KB or fix the IRI",
                    kb.vocab.individual_iri(ind)
                ));
            }
        }
        if let Some(c) = unknown_class(&kb, &a, mark.classes) {
            return Err(format!(
                "{origin}: axiom {text} names the class <{c}>, which the knowledge base does not know; fix the IRI"
            ));
        }
        if let Assertion::Role(r, _, _) = a
            && r.prop().index() >= mark.props
        {
            return Err(format!(
                "{origin}: axiom {text} names the property <{}>, which the knowledge base does not know; fix the IRI",
                kb.vocab.prop_iri(r.prop())
            ));
        }
        observations.push(a);
    }
    if observations.is_empty() {
        return Err(format!(
            "{origin}: no class or property assertion to explain; add the observations"
        ));
    }
    let individuals: Vec<IndividualId> = (0..kb.vocab.individuals.len() as u32)
        .map(IndividualId)
        .filter(|i| !kb.vocab.individual_iri(*i).starts_with("_:"))
        .collect();
    let abducibles = match abducibles {
        Some(p) => read_abducibles(&mut kb, p, &individuals)?,
        None => {
            let findings: Vec<_> = observations
                .iter()
                .flat_map(|o| o.individuals().into_iter().take(1))
                .collect();
            let a = annotated_abducibles(&mut kb, &findings, &individuals);
            if a.is_empty() {
                return Err(format!(
                    "no abducibles: give an abducibles file, or mark hypothesis classes in the KB with {}hypothesis \"true\"",
                    super::WF
                ));
            }
            a
        }
    };
    let n = kb.axioms.len();
    let background = (0..n).map(|i| i < mark.axioms).collect();
    Ok(Problem {
        kb,
        background,
        degrees: vec![1.0; n],
        observations,
        abducibles,
    })
}

/// The first class of the assertion that the KB did not know before the observations.
fn unknown_class(kb: &KnowledgeBase, a: &Assertion, n_classes: usize) -> Option<String> {
    let Assertion::Class(c, _) = a else {
        return None;
    };
    let mut stack = vec![*c];
    while let Some(x) = stack.pop() {
        match kb.concepts.get(x) {
            Concept::Atom(k) | Concept::NotAtom(k) if k.index() >= n_classes => {
                return Some(kb.vocab.class_iri(*k).to_string());
            }
            _ => stack.extend_from_slice(kb.concepts.children(x)),
        }
    }
    None
}

/// Reads an abducibles file (contract, `explain`): lines `class IRI`, `not-class IRI` or
/// `property IRI`; blank lines and `#` comments are skipped.
pub fn read_abducibles(
    kb: &mut KnowledgeBase,
    path: &Path,
    individuals: &[IndividualId],
) -> Result<Vec<Assertion>, String> {
    let file = path.display().to_string();
    let text = std::fs::read_to_string(path).map_err(|e| format!("{file}: cannot read: {e}"))?;
    let mut out = Vec::new();
    // Short names (prefixed, fragment, label) are read as the shell reads them; the index
    // is built only when a line needs it.
    let mut index: Option<crate::kb::names::EntityIndex> = None;
    for (n, line) in text.lines().enumerate() {
        let line = line.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        let (kind, name) = line.split_once(char::is_whitespace).unwrap_or((line, ""));
        let name = name.trim();
        let full = name.starts_with('<') || name.contains("://") || name.starts_with("urn:");
        let resolved;
        let iri = if full || name.is_empty() {
            name.trim_start_matches('<').trim_end_matches('>')
        } else {
            use crate::kb::names::Kind;
            let want = if kind == "property" {
                Kind::ObjectProperty
            } else {
                Kind::Class
            };
            let ix = index.get_or_insert_with(|| crate::kb::names::index_of_loaded(kb));
            resolved = ix
                .resolve(name, &[want])
                .map_err(|e| format!("{file}:{}: {e}", n + 1))?
                .1;
            resolved.as_str()
        };
        if iri.is_empty() {
            return Err(format!(
                "{file}:{}: expected `class IRI`, `not-class IRI` or `property IRI`",
                n + 1
            ));
        }
        match kind {
            "class" | "not-class" => {
                let Some(c) = kb.vocab.find_class(iri) else {
                    return Err(format!(
                        "{file}:{}: unknown class <{iri}>; it does not occur in the KB",
                        n + 1
                    ));
                };
                let mut k = kb.concepts.atom(c);
                if kind == "not-class" {
                    k = kb.concepts.not(k);
                }
                out.extend(individuals.iter().map(|&a| Assertion::Class(k, a)));
            }
            "property" => {
                let Some(p) = kb.vocab.find_prop(iri) else {
                    return Err(format!("{file}:{}: unknown object property <{iri}>", n + 1));
                };
                let r = RoleId::named(p);
                for &a in individuals {
                    for &b in individuals {
                        out.push(Assertion::Role(r, a, b));
                    }
                }
            }
            other => {
                return Err(format!(
                    "{file}:{}: unknown kind `{other}`; use `class`, `not-class` or `property`",
                    n + 1
                ));
            }
        }
    }
    if out.is_empty() {
        return Err(format!(
            "{file}: the abducible set is empty; list at least one class or property"
        ));
    }
    out.sort();
    out.dedup();
    Ok(out)
}

/// Where the observations of an abduction problem come from.
#[derive(Clone, Copy, Debug)]
pub enum ObservationSource<'a> {
    /// An ontology file of class and property assertions.
    File(&'a Path),
    /// A facts file already read: its findings are the observations, the rest background.
    Facts(&'a Facts, &'a str),
    /// Assertions in functional syntax, with a name that stands for the file in messages.
    Text(&'a str, &'a str),
}

/// Builds an abduction problem from a KB and observations, with abducibles from `abducibles`
/// (a file) or the KB's annotations. Returns the problem and warnings for the user.
pub fn build_problem(
    kb: &KnowledgeBase,
    source: ObservationSource,
    abducibles: Option<&Path>,
    load: &crate::kb::load::LoadOptions,
) -> Result<(Problem, Vec<String>), String> {
    match source {
        ObservationSource::Facts(facts, file) => {
            let mut case = case_problem(kb, facts, file);
            if case.problem.observations.is_empty() {
                return Err(format!(
                    "{file}: no finding to explain: no individual's class is marked {}finding in the KB",
                    super::WF
                ));
            }
            if let Some(p) = abducibles {
                let individuals: Vec<_> = case.abox.individuals.values().copied().collect();
                case.problem.abducibles = read_abducibles(&mut case.problem.kb, p, &individuals)?;
            }
            Ok((case.problem, case.abox.warnings))
        }
        ObservationSource::File(path) => {
            let mut kb = kb.clone();
            let mark = Mark::of(&kb);
            let lo = crate::kb::load::LoadOptions {
                import_dirs: load.import_dirs.clone(),
                lenient: false,
                catalog: load.catalog.clone(),
            };
            crate::kb::load::load_into(&mut kb, &[path.to_path_buf()], &lo)
                .map_err(|e| e.to_string())?;
            let p = observations_problem(kb, mark, &path.display().to_string(), abducibles)?;
            Ok((p, Vec::new()))
        }
        ObservationSource::Text(name, text) => {
            let mut kb = kb.clone();
            let mark = Mark::of(&kb);
            crate::kb::load::load_axioms_text(&mut kb, name, text).map_err(|e| e.to_string())?;
            let p = observations_problem(kb, mark, name, abducibles)?;
            Ok((p, Vec::new()))
        }
    }
}

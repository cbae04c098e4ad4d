//! The runner: loads each distinct set of KB files once, evaluates the cases in parallel
//! (rayon) and returns, per case, the checks with expected and actual values, and the
//! outcome that `baseline` compares and `accept` writes back.

use super::CheckError;
use super::axioms::{
    CaseNames, assertion_text, at, case_prefixes, intern_individuals, parse_item, unknown_vocab,
};
use super::suite::{
    CaseSpec, Expect, Expectation, Input, Item1, Register, abbreviate, expand_name,
};
use crate::explain::case::{Mark, case_problem, observations_problem, read_abducibles};
use crate::explain::{ExplainOptions, Problem, explain};
use crate::facts::Facts;
use crate::facts::abox::CaseAbox;
use crate::kb::{Axiom, KnowledgeBase, load};
use crate::reasoner::{Answer, Limits, Reasoner};
use rayon::prelude::*;
use std::collections::BTreeMap;
use std::path::PathBuf;
use std::sync::Arc;
use std::time::{Duration, Instant};

/// How to run a suite.
#[derive(Clone, Debug)]
pub struct RunOptions {
    /// Folders searched for imported ontologies.
    pub import_dirs: Vec<PathBuf>,
    /// An XML catalog asked first for every import.
    pub catalog: Option<PathBuf>,
    /// KB files replaced by file name (the baseline's older versions).
    pub replace: BTreeMap<String, PathBuf>,
    /// Run the abduction search even when no expectation needs it (for comparisons).
    pub explain_always: bool,
    /// Time limit per case.
    pub timeout: Duration,
    /// Largest completion graph of one test.
    pub max_graph_nodes: usize,
    /// A KB already loaded (the shell's, with its edits), used for every case instead of
    /// the files the cases name.
    pub kb: Option<Arc<KnowledgeBase>>,
}

impl Default for RunOptions {
    fn default() -> Self {
        RunOptions {
            import_dirs: Vec::new(),
            catalog: None,
            replace: BTreeMap::new(),
            explain_always: false,
            timeout: Duration::from_secs(120),
            max_graph_nodes: 1_000_000,
            kb: None,
        }
    }
}

/// What `accept` would write to make a failing check pass.
#[derive(Clone, Debug, PartialEq)]
pub enum Fix {
    /// Set the boolean.
    Bool(bool),
    /// Replace the list with these strings.
    List(Vec<String>),
    /// Move the list elements at these positions to another key of `expect`.
    Move {
        /// Positions in the list.
        items: Vec<usize>,
        /// The key that receives them.
        to: &'static str,
    },
    /// Drop the list elements at these positions (phrases and explanations that no longer
    /// hold).
    Drop(Vec<usize>),
    /// `max_rank`: per entry, the rank found (None: not found, so the entry is dropped).
    Ranks(Vec<Option<usize>>),
}

/// One expectation's result.
#[derive(Clone, Debug)]
pub struct Check {
    /// The expectation's key under `expect`.
    pub key: String,
    /// Its line.
    pub line: usize,
    /// Whether it holds.
    pub passed: bool,
    /// What the case file says, one entry a line (short names).
    pub expected: Vec<String>,
    /// What was found, in the same form.
    pub actual: Vec<String>,
    /// How `accept` would make it pass.
    pub fix: Fix,
}

/// A check over listed items that must each be answered Yes (`positive`) or No. `answers`
/// holds each item's short text, its answer and the answer in words; items answered wrongly
/// (not merely undecided) are the ones `accept` moves to the list `to`.
fn yes_no_check(
    e: &Expectation,
    positive: bool,
    answers: Vec<(String, Answer, String)>,
    to: &'static str,
) -> Check {
    let want = if positive { Answer::Yes } else { Answer::No };
    let (mut expected, mut actual, mut wrong) = (Vec::new(), Vec::new(), Vec::new());
    for (n, (text, a, word)) in answers.into_iter().enumerate() {
        expected.push(text.clone());
        if a == want {
            actual.push(text);
        } else {
            actual.push(format!("{word}: {text}"));
            if !matches!(a, Answer::Unknown(_)) {
                wrong.push(n);
            }
        }
    }
    Check {
        key: e.key.clone(),
        line: e.line,
        passed: expected == actual,
        expected,
        actual,
        fix: Fix::Move { items: wrong, to },
    }
}

/// The result of a case.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Status {
    /// Every expectation holds.
    Pass,
    /// At least one does not.
    Fail,
    /// The case could not be run (malformed case or input); the message says why.
    Error(String),
}

/// What the KB concluded for a case, for comparisons between KB versions.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Outcome {
    /// Consistency of the KB with the case.
    pub consistent: Option<String>,
    /// Entailment queries of the case (canonical text) → yes, no or unknown.
    pub entailments: BTreeMap<String, String>,
    /// Classes asked about → satisfiable, unsatisfiable or unknown.
    pub satisfiability: BTreeMap<String, String>,
    /// Ranked explanations, each its sorted assertions (None when not searched).
    pub explanations: Option<Vec<Vec<String>>>,
    /// Unexplained observations.
    pub unexplained: Vec<String>,
    /// Suspended defaults.
    pub abnormalities: Vec<String>,
    /// The resource limit that left a question undecided, if any.
    pub limit: Option<String>,
}

/// A case's result.
#[derive(Clone, Debug)]
pub struct CaseResult {
    /// The case.
    pub spec: CaseSpec,
    /// Pass, fail or error.
    pub status: Status,
    /// The expectations' results.
    pub checks: Vec<Check>,
    /// What was concluded.
    pub outcome: Outcome,
    /// Time taken (KB loading excluded).
    pub time: Duration,
}

/// Runs every case; the KB of each distinct set of files is loaded once.
pub fn run_suite(cases: &[CaseSpec], opts: &RunOptions) -> Vec<CaseResult> {
    let key = |c: &CaseSpec| -> Vec<PathBuf> {
        c.kb.iter()
            .map(|p| {
                p.file_name()
                    .and_then(|n| opts.replace.get(&n.to_string_lossy().to_string()))
                    .cloned()
                    .unwrap_or_else(|| p.clone())
            })
            .collect()
    };
    let mut sets: Vec<Vec<PathBuf>> = cases.iter().map(key).collect();
    sets.sort();
    sets.dedup();
    let lo = load::LoadOptions {
        import_dirs: opts.import_dirs.clone(),
        lenient: false,
        catalog: opts.catalog.clone(),
    };
    let loaded: BTreeMap<Vec<PathBuf>, Result<Arc<KnowledgeBase>, String>> = sets
        .into_par_iter()
        .map(|s| {
            let kb = match &opts.kb {
                Some(kb) => Ok(kb.clone()),
                None => load::load(&s, &lo).map(Arc::new).map_err(|e| e.to_string()),
            };
            (s, kb)
        })
        .collect();
    cases
        .par_iter()
        .map(|c| {
            let start = Instant::now();
            let kb = &loaded[&key(c)];
            let r = match kb {
                Ok(kb) => evaluate(c, kb, opts),
                Err(e) => Err(CheckError(format!(
                    "{}:{}: the case's KB cannot be loaded: {e}",
                    c.file.display(),
                    c.kb_line
                ))),
            };
            let (status, checks, outcome) = match r {
                Ok((checks, outcome)) => {
                    let status = if checks.iter().all(|c| c.passed) {
                        Status::Pass
                    } else {
                        Status::Fail
                    };
                    (status, checks, outcome)
                }
                Err(e) => (Status::Error(e.0), Vec::new(), Outcome::default()),
            };
            CaseResult {
                spec: c.clone(),
                status,
                checks,
                outcome,
                time: start.elapsed(),
            }
        })
        .collect()
}

/// The KB with the case, the axioms that count (α-cut), and what abduction needs.
struct CaseKb {
    kb: KnowledgeBase,
    enabled: Vec<bool>,
    problem: Option<Problem>,
    facts: Facts,
    abox: CaseAbox,
}

fn empty_facts() -> Facts {
    Facts {
        format: crate::facts::FORMAT.into(),
        version: crate::facts::VERSION,
        source: crate::facts::Source {
            files: Vec::new(),
            shape: [0; 3],
            affine: [
                [1.0, 0.0, 0.0, 0.0],
                [0.0, 1.0, 0.0, 0.0],
                [0.0, 0.0, 1.0, 0.0],
                [0.0, 0.0, 0.0, 1.0],
            ],
        },
        individuals: Vec::new(),
        relations: Vec::new(),
        measurements: Vec::new(),
        provenance: None,
    }
}

/// Builds the case's KB and, when asked, its abduction problem.
fn case_kb(
    c: &CaseSpec,
    kb: &KnowledgeBase,
    prefixes: &[(String, String)],
    want_problem: bool,
) -> Result<CaseKb, CheckError> {
    let here = |e: String| CheckError(format!("{}: case {:?}: {e}", at(c, c.line), c.name));
    let facts = match &c.input {
        Input::Facts(p) => Some(crate::facts::read_facts(p).map_err(here)?),
        Input::Maps { maps, labels } => {
            Some(crate::facts::from_label_maps(maps, labels).map_err(here)?)
        }
        _ => None,
    };
    if let Some(facts) = facts {
        let file = match &c.input {
            Input::Facts(p) => p.display().to_string(),
            _ => c.name.clone(),
        };
        let mut case = case_problem(kb, &facts, &file);
        if let Some(p) = &c.abducibles {
            let individuals: Vec<_> = case.abox.individuals.values().copied().collect();
            case.problem.abducibles =
                read_abducibles(&mut case.problem.kb, p, &individuals).map_err(here)?;
        }
        let enabled = case.problem.degrees.iter().map(|&d| d >= c.alpha).collect();
        let problem = (!case.problem.observations.is_empty()).then(|| case.problem.clone());
        if want_problem && problem.is_none() {
            return Err(CheckError(format!(
                "{}: the facts hold no finding to explain (no class marked {}finding), yet the case expects explanations; drop those expectations or fix the KB",
                at(c, c.line),
                crate::explain::WF
            )));
        }
        return Ok(CaseKb {
            kb: case.problem.kb,
            enabled,
            problem,
            facts,
            abox: case.abox,
        });
    }
    let mut kb = kb.clone();
    let mut abox = CaseAbox::default();
    let mut problem = None;
    abox.first_axiom = kb.axioms.len();
    if let Some(bg) = &c.background {
        let origin = format!("{} (background of case {:?})", at(c, bg.line), c.name);
        let doc = CaseNames::new(&kb, prefixes).read(c, bg, "background", true)?;
        intern_individuals(&mut kb, &origin, &doc)?;
        let mark = Mark::of(&kb);
        load::load_axioms_text(&mut kb, &origin, &doc).map_err(|e| CheckError(e.to_string()))?;
        unknown_vocab(&kb, mark, &origin, "")?;
    }
    if let Input::Assertions { text, line } = &c.input {
        let origin = format!("{} (assertions of case {:?})", at(c, *line), c.name);
        let item = Item1 {
            text: text.clone(),
            line: *line,
        };
        let doc = CaseNames::new(&kb, prefixes).read(c, &item, "assertions", true)?;
        intern_individuals(&mut kb, &origin, &doc)?;
        let mark = Mark::of(&kb);
        load::load_axioms_text(&mut kb, &origin, &doc).map_err(|e| CheckError(e.to_string()))?;
        unknown_vocab(&kb, mark, &origin, "")?;
        if want_problem {
            problem = Some(
                observations_problem(kb.clone(), mark, &origin, c.abducibles.as_deref())
                    .map_err(here)?,
            );
        }
    } else if want_problem {
        return Err(CheckError(format!(
            "{}: the case expects explanations but has no input; add `facts`, `maps` with `labels`, or `assertions`",
            at(c, c.line)
        )));
    }
    let n = kb.axioms.len();
    Ok(CaseKb {
        kb,
        enabled: vec![true; n],
        problem,
        facts: empty_facts(),
        abox,
    })
}

fn answer_word(a: Answer, yes: &str, no: &str) -> String {
    match a {
        Answer::Yes => yes.into(),
        Answer::No => no.into(),
        Answer::Unknown(l) => format!("unknown ({l})"),
    }
}

/// Evaluates one case against a loaded KB.
fn evaluate(
    c: &CaseSpec,
    base: &KnowledgeBase,
    opts: &RunOptions,
) -> Result<(Vec<Check>, Outcome), CheckError> {
    let limits = Limits {
        deadline: Some(Instant::now() + opts.timeout),
        max_nodes: opts.max_graph_nodes,
        cancel: None,
    };
    let needs = c.expect.iter().any(|e| e.expect.needs_explanations());
    let want = needs || (opts.explain_always && !matches!(c.input, Input::None));
    let prefixes = case_prefixes(c, base);
    let ck = if want && !needs {
        // Only a comparison asked for the search: a case without findings or abducibles
        // is still run for its other questions.
        case_kb(c, base, &prefixes, true).or_else(|_| case_kb(c, base, &prefixes, false))?
    } else {
        case_kb(c, base, &prefixes, needs)?
    };
    let short = |s: &str| abbreviate(s, &c.prefixes);
    let mut checks = Vec::new();
    let mut outcome = Outcome::default();

    // KB-level questions: parse the items into a copy of the case KB, then ask a reasoner
    // over the case's axioms only.
    let mut qkb = ck.kb.clone();
    let names = CaseNames::new(&ck.kb, &prefixes);
    let mut queries: Vec<(usize, Vec<(Axiom, String)>)> = Vec::new();
    let mut classes: Vec<(usize, Vec<(crate::kb::ClassId, String)>)> = Vec::new();
    for (i, e) in c.expect.iter().enumerate() {
        match &e.expect {
            Expect::Entailed(items) | Expect::NotEntailed(items) => {
                let mut v = Vec::new();
                for it in items {
                    let r = parse_item(&mut qkb, &names, c, &e.key, it)?;
                    let ax = qkb.axioms[r.start].axiom.clone();
                    let ok = r.len() == 1
                        && matches!(
                            ax,
                            Axiom::ClassAssertion(..)
                                | Axiom::RoleAssertion(..)
                                | Axiom::SubClass(..)
                        );
                    if !ok {
                        return Err(CheckError(format!(
                            "{}: expect.{}: {:?} must be one ClassAssertion, ObjectPropertyAssertion or SubClassOf axiom",
                            at(c, it.line),
                            e.key,
                            it.text
                        )));
                    }
                    let text = qkb.sources[qkb.axioms[r.start].source].text.clone();
                    v.push((ax, text));
                }
                queries.push((i, v));
            }
            Expect::Satisfiable(items) | Expect::Unsatisfiable(items) => {
                let mut v = Vec::new();
                for it in items {
                    // A name the file's prefixes do not expand is read as the shell reads
                    // it (prefixed with the KB's prefixes, fragment or label).
                    let mut why_not = String::new();
                    let iri = expand_name(&it.text, &c.prefixes).or_else(|| {
                        names
                            .index()
                            .resolve(it.text.trim(), &[crate::kb::names::Kind::Class])
                            .map_err(|e| why_not = format!(" ({e})"))
                            .ok()
                            .map(|(_, iri)| iri)
                    });
                    let k = iri.and_then(|iri| {
                        qkb.vocab
                            .find_class(&iri)
                            .filter(|k| k.index() < base.vocab.classes.len())
                            .map(|k| (k, iri))
                    });
                    let Some((k, iri)) = k else {
                        return Err(CheckError(format!(
                            "{}: expect.{}: {:?} is not a class of the knowledge base{why_not}; write <IRI>, prefix:Name with a prefix of the file's [prefixes], or a name the KB knows",
                            at(c, it.line),
                            e.key,
                            it.text
                        )));
                    };
                    v.push((k, format!("<{iri}>")));
                }
                classes.push((i, v));
            }
            _ => {}
        }
    }
    let kb_level = !queries.is_empty()
        || !classes.is_empty()
        || c.expect
            .iter()
            .any(|e| matches!(e.expect, Expect::Consistent(_)))
        || opts.explain_always;
    if kb_level {
        let mut enabled = ck.enabled.clone();
        enabled.resize(qkb.axioms.len(), false);
        let mut r = Reasoner::with_axioms(&qkb, Some(&enabled), &[]).map_err(|r| {
            CheckError(format!(
                "{}: {}",
                at(c, c.kb_line),
                crate::render::text::refusal_message(&qkb, &r, &c.kb)
            ))
        })?;
        r.limits = limits.clone();
        let cons = r.is_consistent();
        if let Answer::Unknown(l) = cons {
            outcome.limit = Some(l.to_string());
        }
        outcome.consistent = Some(answer_word(cons, "consistent", "inconsistent"));
        for e in &c.expect {
            if let Expect::Consistent(b) = e.expect {
                let want = if b { "consistent" } else { "inconsistent" };
                let got = outcome.consistent.clone().unwrap_or_default();
                checks.push(Check {
                    key: e.key.clone(),
                    line: e.line,
                    passed: got == want,
                    expected: vec![want.into()],
                    actual: vec![got],
                    fix: Fix::Bool(cons == Answer::Yes),
                });
            }
        }
        for (i, v) in &queries {
            let e = &c.expect[*i];
            let positive = matches!(e.expect, Expect::Entailed(_));
            let mut answers = Vec::new();
            for (ax, text) in v {
                let a = match *ax {
                    Axiom::ClassAssertion(k, a) => r.entails_class_assertion(k, a),
                    Axiom::RoleAssertion(p, a, b) => r.entails_role_assertion(p, a, b),
                    Axiom::SubClass(x, y) => r.is_subsumed(x, y),
                    _ => Answer::No,
                };
                if let Answer::Unknown(l) = a {
                    outcome.limit = Some(l.to_string());
                }
                let word = answer_word(a, "entailed", "not entailed");
                outcome.entailments.insert(text.clone(), word.clone());
                let why = if cons == Answer::No {
                    " (the KB with the case is inconsistent, so it entails everything)"
                } else {
                    ""
                };
                answers.push((short(text), a, format!("{word}{why}")));
            }
            let to = if positive { "not_entailed" } else { "entailed" };
            checks.push(yes_no_check(e, positive, answers, to));
        }
        for (i, v) in &classes {
            let e = &c.expect[*i];
            let positive = matches!(e.expect, Expect::Satisfiable(_));
            let mut answers = Vec::new();
            for (k, text) in v {
                let atom = r.concepts_mut().atom(*k);
                let a = r.is_satisfiable(atom);
                if let Answer::Unknown(l) = a {
                    outcome.limit = Some(l.to_string());
                }
                let word = answer_word(a, "satisfiable", "unsatisfiable");
                outcome.satisfiability.insert(text.clone(), word.clone());
                answers.push((short(text), a, word));
            }
            let to = if positive {
                "unsatisfiable"
            } else {
                "satisfiable"
            };
            checks.push(yes_no_check(e, positive, answers, to));
        }
    }

    // Explanations.
    let Some(problem) = ck.problem.as_ref().filter(|_| want) else {
        order_checks(c, &mut checks);
        return Ok((checks, outcome));
    };
    // Justifications only feed the report's texts.
    let justify = c
        .expect
        .iter()
        .any(|e| matches!(e.expect, Expect::Contains(..) | Expect::Lacks(..)));
    let eo = ExplainOptions {
        alpha: c.alpha,
        max_size: c.max_size,
        limits,
        justify,
        ..Default::default()
    };
    let result = explain(problem, &eo).map_err(|r| {
        CheckError(format!(
            "{}: {}",
            at(c, c.kb_line),
            crate::render::text::refusal_message(&problem.kb, &r, &c.kb)
        ))
    })?;
    if let Some(l) = result.limit {
        outcome.limit = Some(l.to_string());
    }
    let pkb = &problem.kb;
    let ranked: Vec<Vec<String>> = result
        .explanations
        .iter()
        .map(|e| e.texts.clone())
        .collect();
    let mut unexplained: Vec<String> = result
        .unexplained
        .iter()
        .map(|a| a.text(pkb, &pkb.concepts))
        .collect();
    unexplained.sort();
    let mut abnormalities: Vec<String> = result
        .suspended
        .iter()
        .map(|&i| pkb.sources[pkb.axioms[i].source].text.clone())
        .collect();
    abnormalities.sort();
    abnormalities.dedup();
    outcome.explanations = Some(ranked.clone());
    outcome.unexplained = unexplained.clone();
    outcome.abnormalities = abnormalities.clone();
    let limited = result
        .limit
        .map(|l| format!(" (search stopped: {l})"))
        .unwrap_or_default();
    let show = |e: &[String]| {
        format!(
            "{{{}}}",
            e.iter().map(|s| short(s)).collect::<Vec<_>>().join("; ")
        )
    };
    let rank_of = |e: &[String]| ranked.iter().position(|x| x.as_slice() == e).map(|p| p + 1);
    let mut ekb = pkb.clone();
    let enames = CaseNames::new(pkb, &prefixes);
    let mut report = None;
    for e in &c.expect {
        let expl = |items: &[Item1], ekb: &mut KnowledgeBase| -> Result<Vec<String>, CheckError> {
            let mut v = items
                .iter()
                .map(|it| assertion_text(ekb, &enames, c, &e.key, it))
                .collect::<Result<Vec<_>, _>>()?;
            v.sort();
            v.dedup();
            Ok(v)
        };
        let check = match &e.expect {
            Expect::Top(items) => {
                let want = expl(items, &mut ekb)?;
                let got = ranked.first().cloned().unwrap_or_default();
                let mut actual: Vec<String> = got.iter().map(|s| short(s)).collect();
                if ranked.is_empty() {
                    actual.push(format!("(no explanation){limited}"));
                }
                Check {
                    key: e.key.clone(),
                    line: e.line,
                    passed: want == got,
                    expected: want.iter().map(|s| short(s)).collect(),
                    actual,
                    fix: Fix::List(got.iter().map(|s| short(s)).collect()),
                }
            }
            Expect::Present(list) | Expect::Absent(list) => {
                let present = matches!(e.expect, Expect::Present(_));
                let mut expected = Vec::new();
                let mut actual = Vec::new();
                let mut wrong = Vec::new();
                for (n, items) in list.iter().enumerate() {
                    let want = expl(items, &mut ekb)?;
                    let r = rank_of(&want);
                    expected.push(show(&want));
                    match (present, r) {
                        (true, Some(_)) | (false, None) => actual.push(show(&want)),
                        (true, None) => {
                            actual.push(format!("not found{limited}: {}", show(&want)));
                            wrong.push(n);
                        }
                        (false, Some(r)) => {
                            actual.push(format!("found at rank {r}: {}", show(&want)));
                            wrong.push(n);
                        }
                    }
                }
                Check {
                    key: e.key.clone(),
                    line: e.line,
                    passed: wrong.is_empty(),
                    expected,
                    actual,
                    fix: Fix::Drop(wrong),
                }
            }
            Expect::MaxRank(list) => {
                let mut expected = Vec::new();
                let mut actual = Vec::new();
                let mut ranks = Vec::new();
                let mut ok = true;
                for (items, max) in list {
                    let want = expl(items, &mut ekb)?;
                    let r = rank_of(&want);
                    expected.push(format!("rank ≤ {max}: {}", show(&want)));
                    match r {
                        Some(r) if r <= *max => {
                            actual.push(format!("rank ≤ {max}: {}", show(&want)))
                        }
                        Some(r) => {
                            ok = false;
                            actual.push(format!("rank {r}: {}", show(&want)))
                        }
                        None => {
                            ok = false;
                            actual.push(format!("not found{limited}: {}", show(&want)))
                        }
                    }
                    ranks.push(r.map(|r| r.max(*max)));
                }
                Check {
                    key: e.key.clone(),
                    line: e.line,
                    passed: ok,
                    expected,
                    actual,
                    fix: Fix::Ranks(ranks),
                }
            }
            Expect::Unexplained(items) => {
                let want = expl(items, &mut ekb)?;
                Check {
                    key: e.key.clone(),
                    line: e.line,
                    passed: want == unexplained,
                    expected: want.iter().map(|s| short(s)).collect(),
                    actual: unexplained.iter().map(|s| short(s)).collect(),
                    fix: Fix::List(unexplained.iter().map(|s| short(s)).collect()),
                }
            }
            Expect::Abnormalities(items) => {
                let mut want = Vec::new();
                for it in items {
                    let r = parse_item(&mut ekb, &enames, c, &e.key, it)?;
                    want.push(ekb.sources[ekb.axioms[r.start].source].text.clone());
                }
                want.sort();
                want.dedup();
                Check {
                    key: e.key.clone(),
                    line: e.line,
                    passed: want == abnormalities,
                    expected: want.iter().map(|s| short(s)).collect(),
                    actual: abnormalities.iter().map(|s| short(s)).collect(),
                    fix: Fix::List(abnormalities.iter().map(|s| short(s)).collect()),
                }
            }
            Expect::Contains(reg, phrases) | Expect::Lacks(reg, phrases) => {
                let contains = matches!(e.expect, Expect::Contains(..));
                let rep = report.get_or_insert_with(|| {
                    crate::render::build(&crate::render::ReportInput {
                        case: &c.name,
                        facts: &ck.facts,
                        problem,
                        abox: &ck.abox,
                        result: &result,
                        alpha: c.alpha,
                    })
                });
                let text = match reg {
                    Register::Clinician => &rep.registers.clinician,
                    Register::Patient => &rep.registers.patient,
                    Register::Formal => &rep.registers.formal,
                };
                let mut expected = Vec::new();
                let mut actual = Vec::new();
                let mut wrong = Vec::new();
                for (n, p) in phrases.iter().enumerate() {
                    expected.push(p.text.clone());
                    if text.contains(&p.text) == contains {
                        actual.push(p.text.clone());
                    } else {
                        actual.push(format!(
                            "{}: {}",
                            if contains { "missing" } else { "present" },
                            p.text
                        ));
                        wrong.push(n);
                    }
                }
                Check {
                    key: e.key.clone(),
                    line: e.line,
                    passed: wrong.is_empty(),
                    expected,
                    actual,
                    fix: Fix::Drop(wrong),
                }
            }
            _ => continue,
        };
        checks.push(check);
    }
    order_checks(c, &mut checks);
    Ok((checks, outcome))
}

/// Puts the checks in the order of the case file.
fn order_checks(c: &CaseSpec, checks: &mut [Check]) {
    let pos = |k: &str, l: usize| {
        c.expect
            .iter()
            .position(|e| e.key == k && e.line == l)
            .unwrap_or(usize::MAX)
    };
    checks.sort_by_key(|ch| pos(&ch.key, ch.line));
}

//! The questions of the shell: `ask`, `explain`, `why`, `tree`, `unsat`.

use super::*;

/// A question loaded into a copy of the session's KB: the copy, its axioms before the
/// question, and the targets.
fn question(
    s: &Session,
    l: &Line,
    text: &str,
    off: usize,
) -> Result<(KnowledgeBase, usize, Vec<Target>, bool), ShellError> {
    let input = read_input(s, l, text, off, false)?;
    let (functional, is_class) = match input {
        Input::Axioms(a) => (a, false),
        Input::Class(c) => (format!("SubClassOf({c} owl:Nothing)"), true),
    };
    let mut kb = s.kb.clone();
    let n = kb.axioms.len();
    let range = load_text(s, &mut kb, l, &functional, text, off, false)?;
    let ts = targets_of(&kb, range).map_err(|m| l.err(m, off))?;
    Ok((kb, n, ts, is_class))
}

pub(super) fn ask(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let t0 = Instant::now();
    if l.arg.is_empty() {
        let mut r = s.reasoner()?;
        let a = r.is_consistent();
        return Ok(format!("consistent: {}{}\n", answer_word(a), ms(s, t0)));
    }
    let (kb, n, ts, is_class) = question(s, l, l.arg, l.off)?;
    let mask: Vec<bool> = (0..kb.axioms.len()).map(|i| i < n).collect();
    let mut r = Reasoner::with_axioms(&kb, Some(&mask), &[])
        .map_err(|r| l.err(format!("unsupported construct: {}", r.reason), l.off))?;
    r.limits = s.limits();
    let a = all_entailed(&mut r, &ts);
    Ok(if is_class {
        let sat = match a {
            Answer::Yes => Answer::No,
            Answer::No => Answer::Yes,
            u => u,
        };
        format!("satisfiable: {}{}\n", answer_word(sat), ms(s, t0))
    } else {
        format!("{}{}\n", answer_word(a), ms(s, t0))
    })
}

pub(super) fn explain_cmd(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let (positional, opts) = options(
        l,
        &[
            "observations",
            "facts",
            "abducibles",
            "max-size",
            "max-nodes",
            "alpha",
        ],
        &[],
    )?;
    let mut eo = ExplainOptions::default();
    let mut obs_file = None;
    let mut facts_file = None;
    let mut abducibles = None;
    for (name, v, at) in &opts {
        match name.as_str() {
            "observations" => obs_file = Some(PathBuf::from(v)),
            "facts" => facts_file = Some((PathBuf::from(v), *at)),
            "abducibles" => abducibles = Some(PathBuf::from(v)),
            "max-size" => eo.max_size = number(l, v, *at, "a whole number")?,
            "max-nodes" => eo.max_tree_nodes = number(l, v, *at, "a whole number")?,
            "alpha" => {
                eo.alpha = number(l, v, *at, "a number")?;
                if !(eo.alpha > 0.0 && eo.alpha <= 1.0) {
                    return Err(l.err(format!("--alpha {v} must lie in (0, 1]"), *at));
                }
            }
            _ => {}
        }
    }
    eo.limits = s.limits();
    let t0 = Instant::now();
    let mut functional = String::new();
    if !positional.is_empty() {
        let mut at = l.off;
        for part in positional.split(';') {
            let lead = part.len() - part.trim_start().len();
            let text = part.trim();
            if !text.is_empty() {
                match read_input(s, l, text, at + lead, false)? {
                    Input::Axioms(a) => {
                        functional.push_str(&a);
                        functional.push('\n');
                    }
                    Input::Class(_) => {
                        return Err(l.err(
                            "an observation is an assertion: a Type C or a p b",
                            at + lead,
                        ));
                    }
                }
                // Check the names now, so that the error points at them.
                let mut scratch = s.kb.clone();
                load_text(s, &mut scratch, l, &functional, text, at + lead, false)?;
            }
            at += part.len() + 1;
        }
    }
    let facts_read;
    let facts_name;
    let prefixed = format!("{}{functional}", s.prefix_block());
    let source = if !functional.is_empty() {
        ObservationSource::Text("input", &prefixed)
    } else if let Some(p) = &obs_file {
        ObservationSource::File(p)
    } else if let Some((p, at)) = &facts_file {
        facts_read = crate::facts::read_facts(p).map_err(|m| l.err(m, *at))?;
        facts_name = p.display().to_string();
        ObservationSource::Facts(&facts_read, &facts_name)
    } else if let Some((p, f)) = &s.observations {
        facts_name = p.display().to_string();
        ObservationSource::Facts(f, &facts_name)
    } else {
        return Err(l.err(
            "no observations: give assertions (explain a Type C; b p c), --observations FILE or --facts FILE, or `import FACTS.json as observations`",
            l.off,
        ));
    };
    let (problem, warnings) = build_problem(&s.kb, source, abducibles.as_deref(), &s.load)
        .map_err(|m| l.err(m, l.off))?;
    let result = explain(&problem, &eo).map_err(|r| {
        ShellError::new(crate::render::text::refusal_message(
            &problem.kb,
            &r,
            &s.files,
        ))
    })?;
    let mut out = String::new();
    for w in warnings {
        let _ = writeln!(out, "warning: {w}");
    }
    out.push_str(&s.abbreviate(&crate::render::text::result_text(&problem, &result)));
    if let Some(lim) = result.limit {
        let _ = writeln!(out, "stopped early: {lim}; the list may be incomplete");
    }
    let _ = writeln!(
        out,
        "{} explanation(s){}",
        result.explanations.len(),
        ms(s, t0)
    );
    Ok(out)
}

pub(super) fn why(s: &mut Session, l: &Line, justifications: bool) -> Result<String, ShellError> {
    let t0 = Instant::now();
    let limits = s.limits();
    let max_nodes = 2_000;
    let (kb, n, targets, listing) = if l.arg.is_empty() {
        (s.kb.clone(), s.kb.axioms.len(), vec![], true)
    } else if l.arg == "inconsistent" {
        (
            s.kb.clone(),
            s.kb.axioms.len(),
            vec![(
                "the knowledge base is inconsistent".to_string(),
                vec![Target::Inconsistent],
            )],
            false,
        )
    } else if let Some(rest) = l.arg.strip_prefix("unsat ") {
        let at = l.off + l.arg.len() - rest.len();
        let name = rest.trim().trim_matches('\'');
        let (_, iri) = s
            .names
            .resolve(name, &[Kind::Class])
            .map_err(|m| l.err(m, at))?;
        let Some(c) = s.kb.vocab.find_class(&iri) else {
            return Err(l.err(format!("unknown class <{iri}>"), at));
        };
        let mut kb = s.kb.clone();
        let a = kb.concepts.atom(c);
        let n = kb.axioms.len();
        (
            kb,
            n,
            vec![(
                format!("unsatisfiable {}", s.names.short(&iri)),
                vec![Target::Unsat(a)],
            )],
            false,
        )
    } else {
        let (kb, n, ts, is_class) = question(s, l, l.arg, l.off)?;
        let name = if is_class {
            format!("unsatisfiable {}", l.arg)
        } else {
            l.arg.to_string()
        };
        (kb, n, vec![(name, ts)], false)
    };
    let items = Items::new(&kb, n);
    let report: WhyReport = why_report(&kb, &items, targets, &limits, max_nodes);
    let name = |iri: &str| s.names.short(iri);
    let mut out = s.abbreviate(&why_text(
        &kb,
        &report,
        listing,
        justifications,
        !justifications,
        &name,
    ));
    if report.incomplete() {
        let _ = writeln!(
            out,
            "INCOMPLETE: a limit stopped the search; more may exist"
        );
    }
    let _ = writeln!(out, "done{}", ms(s, t0));
    Ok(out)
}

pub(super) fn tree(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    let t0 = Instant::now();
    let cl = s.classification()?;
    let classes = s.kb.signature_classes.clone();
    let text = if l.arg.is_empty() {
        classification_text(&s.kb, &cl, &classes)
    } else {
        let (_, iri) = s
            .names
            .resolve(l.arg.trim_matches('\''), &[Kind::Class])
            .map_err(|m| l.err(m, l.off))?;
        let Some(c) = s.kb.vocab.find_class(&iri) else {
            return Err(l.err(format!("unknown class <{iri}>"), l.off));
        };
        let mut under: Vec<ClassId> = vec![c];
        under.extend(cl.subsumptions.iter().filter(|p| p.1 == c).map(|p| p.0));
        under.sort();
        under.dedup();
        let part = Classification {
            consistent: cl.consistent,
            unsatisfiable: cl
                .unsatisfiable
                .iter()
                .copied()
                .filter(|x| under.contains(x))
                .collect(),
            subsumptions: cl
                .subsumptions
                .iter()
                .copied()
                .filter(|(a, b)| under.contains(a) && under.contains(b))
                .collect(),
        };
        classification_text(&s.kb, &part, &under)
    };
    Ok(format!("{text}({} classes){}\n", classes.len(), ms(s, t0)))
}

pub(super) fn unsat(s: &mut Session) -> Result<String, ShellError> {
    let t0 = Instant::now();
    let cl = s.classification()?;
    if !cl.consistent {
        return Ok(format!(
            "the knowledge base is INCONSISTENT: every class is unsatisfiable (why inconsistent){}\n",
            ms(s, t0)
        ));
    }
    let mut names: Vec<String> = cl
        .unsatisfiable
        .iter()
        .map(|&c| s.names.short(s.kb.vocab.class_iri(c)))
        .collect();
    names.sort();
    Ok(if names.is_empty() {
        format!("no unsatisfiable class{}\n", ms(s, t0))
    } else {
        format!(
            "{} unsatisfiable: {}{}\n",
            names.len(),
            names.join(", "),
            ms(s, t0)
        )
    })
}

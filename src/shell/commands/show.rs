//! `show NAME`: a class answered question by question, an individual, a property.

use super::*;
use crate::kb::Axiom;

fn names_list(v: Vec<String>) -> String {
    if v.is_empty() {
        "(none)".into()
    } else {
        v.join(", ")
    }
}

/// One question of `show CLASS`: the stated answers (`·`), then those that only follow (`∴`),
/// a stated name not repeated as following.
fn answer(out: &mut String, question: &str, stated: &[String], follows: &[String]) {
    let follows: Vec<&String> = follows.iter().filter(|f| !stated.contains(f)).collect();
    if stated.is_empty() && follows.is_empty() {
        let _ = writeln!(out, "  {question}: nothing known");
        return;
    }
    let _ = writeln!(out, "  {question}:");
    for x in stated {
        let _ = writeln!(out, "    · {x}");
    }
    // What follows can be long (every class disjoint by inheritance): packed into lines.
    let mut line = String::new();
    for x in follows {
        if !line.is_empty() && line.len() + x.len() > 84 {
            let _ = writeln!(out, "    ∴ {line}");
            line.clear();
        }
        if !line.is_empty() {
            line.push_str(", ");
        }
        line.push_str(x);
    }
    if !line.is_empty() {
        let _ = writeln!(out, "    ∴ {line}");
    }
}

pub(super) fn show(s: &mut Session, l: &Line) -> Result<String, ShellError> {
    if l.arg.is_empty() {
        return Err(l.err("give a name: show NAME", l.off));
    }
    let name = l.arg.trim_matches('\'');
    let (kind, iri) = s
        .names
        .resolve(
            name,
            &[
                Kind::Class,
                Kind::Individual,
                Kind::ObjectProperty,
                Kind::DataProperty,
            ],
        )
        .map_err(|m| l.err(m, l.off))?;
    if !s.names.has(&iri, kind) {
        return Err(l.err(
            format!("unknown entity <{iri}>; it does not occur in the knowledge base"),
            l.off,
        ));
    }
    let t0 = Instant::now();
    let mut out = String::new();
    let _ = writeln!(out, "{} {}  <{iri}>", kind.word(), s.names.short(&iri));
    if let Some(props) = s.kb.annotations.get(&iri) {
        for (p, vs) in props {
            for v in vs {
                let lang = if v.lang.is_empty() {
                    String::new()
                } else {
                    format!("@{}", v.lang)
                };
                let _ = writeln!(out, "  {} \"{}\"{lang}", s.names.short(p), v.value);
            }
        }
    }
    match kind {
        Kind::Class => show_class(s, &iri, &mut out)?,
        Kind::Individual => show_individual(s, &iri, &mut out)?,
        Kind::ObjectProperty => show_property(s, &iri, &mut out),
        Kind::DataProperty => {}
    }
    // Usage: the axioms in force that mention the entity.
    let needle = format!("<{iri}>");
    let mut used: Vec<String> = Vec::new();
    let mut seen = std::collections::BTreeSet::new();
    for a in &s.kb.axioms {
        let t = &s.kb.sources[a.source].text;
        if t.contains(&needle) && seen.insert(a.source) {
            used.push(s.abbreviate(t));
        }
    }
    used.sort();
    let _ = writeln!(out, "  where it is used ({} axioms):", used.len());
    for u in used.iter().take(20) {
        let _ = writeln!(out, "    {u}");
    }
    if used.len() > 20 {
        let _ = writeln!(out, "    … and {} more", used.len() - 20);
    }
    if s.show_times {
        let _ = writeln!(out, " {}", ms(s, t0).trim());
    }
    Ok(out)
}

fn show_class(s: &mut Session, iri: &str, out: &mut String) -> Result<(), ShellError> {
    let kb = s.kb.clone();
    let Some(c) = kb.vocab.find_class(iri) else {
        let _ = writeln!(out, "  (built-in class)");
        return Ok(());
    };
    let Some(atom) = kb.concepts.find(&Concept::Atom(c)) else {
        return Ok(());
    };
    let mut told_sup = Vec::new();
    let mut told_sub = Vec::new();
    let mut told_eq = Vec::new();
    let mut told_dis = Vec::new();
    for a in &kb.axioms {
        match &a.axiom {
            Axiom::SubClass(x, y) if *x == atom => told_sup.push(manchester(s, &kb, *y)),
            Axiom::SubClass(x, y) if *y == atom => told_sub.push(manchester(s, &kb, *x)),
            Axiom::Equivalent(cs) if cs.contains(&atom) => told_eq.extend(
                cs.iter()
                    .filter(|&&x| x != atom)
                    .map(|&x| manchester(s, &kb, x)),
            ),
            Axiom::Disjoint(cs) if cs.contains(&atom) => told_dis.extend(
                cs.iter()
                    .filter(|&&x| x != atom)
                    .map(|&x| manchester(s, &kb, x)),
            ),
            Axiom::DisjointUnion(u, cs) if cs.contains(&atom) => {
                told_sup.push(manchester(s, &kb, *u));
                told_dis.extend(
                    cs.iter()
                        .filter(|&&x| x != atom)
                        .map(|&x| manchester(s, &kb, x)),
                );
            }
            _ => {}
        }
    }
    for v in [&mut told_sup, &mut told_sub, &mut told_eq, &mut told_dis] {
        v.sort();
        v.dedup();
    }
    let cl = s.classification()?;
    if !cl.consistent {
        let _ = writeln!(
            out,
            "  the knowledge base is INCONSISTENT: every class is unsatisfiable"
        );
    }
    let short = |k: ClassId| s.names.short(kb.vocab.class_iri(k));
    let sups: Vec<ClassId> = cl
        .subsumptions
        .iter()
        .filter(|p| p.0 == c)
        .map(|p| p.1)
        .collect();
    let subs: Vec<ClassId> = cl
        .subsumptions
        .iter()
        .filter(|p| p.1 == c)
        .map(|p| p.0)
        .collect();
    let eq: Vec<ClassId> = sups.iter().copied().filter(|x| subs.contains(x)).collect();
    let sorted = |v: Vec<ClassId>| {
        let mut n: Vec<String> = v.into_iter().map(short).collect();
        n.sort();
        n
    };
    let unsat = cl.unsatisfiable.contains(&c);
    // Our layout: the questions a knowledge engineer asks of a class, each answered by
    // what the ontology states (`·`) and what only follows by reasoning (`∴`).
    let _ = writeln!(out, "  (· stated in the ontology   ∴ follows by reasoning)");
    if unsat {
        let _ = writeln!(
            out,
            "  it can have no members: the class is unsatisfiable (the same as owl:Nothing)"
        );
    }
    let inferred_sups = sorted(sups.iter().copied().filter(|x| !eq.contains(x)).collect());
    let inferred_subs = sorted(subs.iter().copied().filter(|x| !eq.contains(x)).collect());
    answer(out, "what it is", &told_sup, &inferred_sups);
    answer(out, "defined as / same as", &told_eq, &sorted(eq));
    answer(out, "what falls under it", &told_sub, &inferred_subs);
    // Inferred disjoints: satisfiable named classes D with C ⊑ ¬D (one test each).
    let mut never: Vec<String> = Vec::new();
    let mut skipped = false;
    if cl.consistent && !unsat {
        let classes = kb.signature_classes.clone();
        if classes.len() <= 2000 {
            let mut r = s.reasoner()?;
            let mut dis = Vec::new();
            for d in classes {
                if d == c || cl.unsatisfiable.contains(&d) {
                    continue;
                }
                let da = r.concepts_mut().atom(d);
                let nd = r.concepts_mut().not(da);
                match r.is_subsumed(atom, nd) {
                    Answer::Yes => dis.push(d),
                    Answer::No => {}
                    Answer::Unknown(l) => {
                        return Err(ShellError::new(format!("stopped: {l}")));
                    }
                }
            }
            never = sorted(dis);
        } else {
            skipped = true;
        }
    }
    answer(out, "never together with", &told_dis, &never);
    if skipped {
        let _ = writeln!(
            out,
            "    (what follows was not computed: more than 2000 classes)"
        );
    }
    Ok(())
}

fn show_individual(s: &mut Session, iri: &str, out: &mut String) -> Result<(), ShellError> {
    let kb = s.kb.clone();
    let Some(a) = kb.vocab.find_individual(iri) else {
        return Ok(());
    };
    let deg = |src: usize| {
        let d = source_degree(&kb, src);
        if d < 1.0 {
            format!(" (degree {d:.2})")
        } else {
            String::new()
        }
    };
    let mut types = Vec::new();
    let mut rels = Vec::new();
    for ax in &kb.axioms {
        match &ax.axiom {
            Axiom::ClassAssertion(c, x) if *x == a => {
                types.push(format!("{}{}", manchester(s, &kb, *c), deg(ax.source)))
            }
            Axiom::RoleAssertion(r, x, y) if *x == a || *y == a => {
                let (x, y) = if r.is_inverse() { (*y, *x) } else { (*x, *y) };
                rels.push(format!(
                    "{} {} {}{}",
                    s.names.short(kb.vocab.individual_iri(x)),
                    s.names.short(kb.vocab.prop_iri(r.prop())),
                    s.names.short(kb.vocab.individual_iri(y)),
                    deg(ax.source)
                ))
            }
            Axiom::NegativeRoleAssertion(r, x, y) if *x == a || *y == a => rels.push(format!(
                "not {} {} {}",
                s.names.short(kb.vocab.individual_iri(*x)),
                s.names.short(kb.vocab.prop_iri(r.prop())),
                s.names.short(kb.vocab.individual_iri(*y)),
            )),
            _ => {}
        }
    }
    types.sort();
    types.dedup();
    rels.sort();
    rels.dedup();
    let _ = writeln!(out, "  told types: {}", names_list(types));
    let rz = s.realisation()?;
    let inferred: Vec<String> = rz
        .iter()
        .filter(|(x, _)| *x == a)
        .flat_map(|(_, cs)| cs.iter().map(|&c| s.names.short(kb.vocab.class_iri(c))))
        .collect();
    let _ = writeln!(
        out,
        "  inferred types (most specific): {}",
        names_list(inferred)
    );
    let _ = writeln!(out, "  relations:");
    if rels.is_empty() {
        let _ = writeln!(out, "    (none)");
    }
    for r in rels {
        let _ = writeln!(out, "    {r}");
    }
    Ok(())
}

fn show_property(s: &Session, iri: &str, out: &mut String) {
    let kb = &s.kb;
    let Some(p) = kb.vocab.find_prop(iri) else {
        return;
    };
    let role = |r: RoleId| {
        let n = s.names.short(kb.vocab.prop_iri(r.prop()));
        if r.is_inverse() {
            format!("inverse {n}")
        } else {
            n
        }
    };
    let (mut sup, mut sub, mut dom, mut range, mut traits) =
        (Vec::new(), Vec::new(), Vec::new(), Vec::new(), Vec::new());
    for a in &kb.axioms {
        match &a.axiom {
            Axiom::SubRole(x, y) if x.prop() == p && !x.is_inverse() && y.prop() != p => {
                sup.push(role(*y))
            }
            Axiom::SubRole(x, y) if y.prop() == p && !y.is_inverse() && x.prop() != p => {
                sub.push(role(*x))
            }
            Axiom::SubRole(x, y) if x.prop() == p && y.prop() == p && x != y => {
                traits.push("symmetric".to_string())
            }
            Axiom::Domain(r, c) if r.prop() == p => {
                let c = manchester(s, kb, *c);
                if r.is_inverse() {
                    range.push(c)
                } else {
                    dom.push(c)
                }
            }
            Axiom::Transitive(r) if r.prop() == p => traits.push("transitive".into()),
            Axiom::Functional(r) if r.prop() == p => traits.push(if r.is_inverse() {
                "inverse functional".into()
            } else {
                "functional".into()
            }),
            _ => {}
        }
    }
    for v in [&mut sup, &mut sub, &mut dom, &mut range, &mut traits] {
        v.sort();
        v.dedup();
    }
    let _ = writeln!(out, "  told superproperties: {}", names_list(sup));
    let _ = writeln!(out, "  told subproperties: {}", names_list(sub));
    let _ = writeln!(out, "  domain: {}", names_list(dom));
    let _ = writeln!(out, "  range: {}", names_list(range));
    let _ = writeln!(out, "  characteristics: {}", names_list(traits));
}

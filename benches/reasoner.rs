//! Benchmarks of the tableau reasoner and of abduction (criterion; medians in
//! `target/criterion/<group>/<name>/new/estimates.json`).
//!
//! - `classify_500_class_demo_kind`: classification of a generated anatomy-like ontology of
//!   500 named classes (goal < 100 ms);
//! - `classify_demo_abdomen`: classification of the demo's abdomen ontology;
//! - `explain_demo_case`: the demo's two-organ case, facts in, ranked explanations out
//!   (goal < 100 ms), with and without justifications;
//! - `abduction_60_abducible_classes`: 60 hypothesis classes × 3 findings, explanations up
//!   to size 3 without justifications (goal < 1 s); prints the reasoner calls against a
//!   brute-force enumeration of every candidate set;
//! - `classify_real_rico`, `classify_real_dbpedia`: classification (loading excluded) of two
//!   real ontologies from tests/fixtures/real/ (RiC-O 1.0.2, DBpedia 4.2), whose answers are
//!   HermiT's; HermiT's own end-to-end times are in docs/oracle.md.

use criterion::{Criterion, criterion_group, criterion_main};
use std::fmt::Write as _;
use std::hint::black_box;
use std::path::{Path, PathBuf};
use std::time::Duration;
use wherefore::explain::{Assertion, ExplainOptions, Problem, explain};
use wherefore::facts::Facts;
use wherefore::kb::load::{LoadOptions, load};
use wherefore::kb::{Axiom, KnowledgeBase};
use wherefore::reasoner::Reasoner;
use wherefore::reasoner::classify::classify;

const NS: &str = "https://wherefore.example.org/ns/bench#";

/// A scratch folder of this process, removed at the end.
fn scratch() -> PathBuf {
    let d = std::env::temp_dir().join(format!("wherefore-bench-reasoner-{}", std::process::id()));
    std::fs::create_dir_all(&d).expect("cannot create the scratch folder");
    d
}

fn header(s: &mut String, name: &str) {
    let _ = writeln!(s, "Prefix(:=<{NS}>)");
    s.push_str("Prefix(owl:=<http://www.w3.org/2002/07/owl#>)\n");
    s.push_str("Prefix(xsd:=<http://www.w3.org/2001/XMLSchema#>)\n");
    let _ = writeln!(
        s,
        "Ontology(<https://wherefore.example.org/ontologies/{name}>"
    );
}

/// A deterministic anatomy-like ontology with exactly 500 named classes: organs in systems,
/// organ parts and regions (partOf is transitive with sub-properties), arteries supplying
/// organs (inverse pairs, a functional sub-property), laterality (functional), volumes
/// (functional data property with decimal facets), sibling disjointness and defined classes
/// whose subsumers must be inferred.
fn anatomy_ofn() -> (String, usize) {
    const SYSTEMS: usize = 8;
    const ORGANS: usize = 40;
    const PARTS: usize = 5;
    const REGION_ORGANS: usize = 20;
    const NERVES: usize = 18;
    let mut s = String::new();
    let mut classes: Vec<String> = Vec::new();
    header(&mut s, "anatomy500.ofn");
    let upper = [
        "AnatomicalEntity",
        "Organ",
        "OrganPart",
        "Region",
        "Vessel",
        "Artery",
        "Vein",
        "Nerve",
        "Tissue",
        "EpithelialTissue",
        "ConnectiveTissue",
        "MuscleTissue",
        "NervousTissue",
        "Laterality",
        "LeftSide",
        "RightSide",
        "BodyCavity",
        "LeftStructure",
        "RightStructure",
        "LargeStructure",
        "SmallStructure",
        "PairedOrgan",
    ];
    classes.extend(upper.iter().map(|c| c.to_string()));
    let props = [
        "partOf",
        "hasPart",
        "regionOf",
        "hasRegion",
        "componentOf",
        "hasComponent",
        "segmentOf",
        "hasSegment",
        "adjacentTo",
        "suppliedBy",
        "supplies",
        "hasPrimaryArtery",
        "drainedBy",
        "drains",
        "innervatedBy",
        "innervates",
        "hasLaterality",
        "hasTissue",
        "locatedIn",
        "contains",
    ];
    for p in props {
        let _ = writeln!(s, "Declaration(ObjectProperty(:{p}))");
    }
    s.push_str("Declaration(DataProperty(:hasVolume))\n");
    s.push_str(
        "TransitiveObjectProperty(:partOf)\n\
         InverseObjectProperties(:partOf :hasPart)\n\
         InverseObjectProperties(:regionOf :hasRegion)\n\
         InverseObjectProperties(:componentOf :hasComponent)\n\
         InverseObjectProperties(:segmentOf :hasSegment)\n\
         SubObjectPropertyOf(:regionOf :partOf)\n\
         SubObjectPropertyOf(:componentOf :partOf)\n\
         SubObjectPropertyOf(:segmentOf :partOf)\n\
         SymmetricObjectProperty(:adjacentTo)\n\
         InverseObjectProperties(:suppliedBy :supplies)\n\
         SubObjectPropertyOf(:hasPrimaryArtery :suppliedBy)\n\
         FunctionalObjectProperty(:hasPrimaryArtery)\n\
         InverseObjectProperties(:drainedBy :drains)\n\
         InverseObjectProperties(:innervatedBy :innervates)\n\
         FunctionalObjectProperty(:hasLaterality)\n\
         FunctionalObjectProperty(:hasTissue)\n\
         InverseObjectProperties(:locatedIn :contains)\n\
         FunctionalDataProperty(:hasVolume)\n\
         DataPropertyRange(:hasVolume xsd:decimal)\n",
    );
    // Upper hierarchy.
    s.push_str(
        "SubClassOf(:Organ :AnatomicalEntity)\n\
         SubClassOf(:OrganPart :AnatomicalEntity)\n\
         SubClassOf(:Region :AnatomicalEntity)\n\
         SubClassOf(:Vessel :AnatomicalEntity)\n\
         SubClassOf(:Artery :Vessel)\n\
         SubClassOf(:Vein :Vessel)\n\
         SubClassOf(:Nerve :AnatomicalEntity)\n\
         SubClassOf(:EpithelialTissue :Tissue)\n\
         SubClassOf(:ConnectiveTissue :Tissue)\n\
         SubClassOf(:MuscleTissue :Tissue)\n\
         SubClassOf(:NervousTissue :Tissue)\n\
         SubClassOf(:LeftSide :Laterality)\n\
         SubClassOf(:RightSide :Laterality)\n\
         DisjointClasses(:Organ :OrganPart :Region :Vessel :Nerve)\n\
         DisjointClasses(:AnatomicalEntity :Tissue :Laterality :BodyCavity)\n\
         DisjointClasses(:Artery :Vein)\n\
         DisjointClasses(:EpithelialTissue :ConnectiveTissue :MuscleTissue :NervousTissue)\n\
         DisjointClasses(:LeftSide :RightSide)\n\
         SubClassOf(:OrganPart ObjectSomeValuesFrom(:hasTissue :Tissue))\n\
         SubClassOf(:Organ ObjectSomeValuesFrom(:drainedBy :Vein))\n\
         EquivalentClasses(:LeftStructure ObjectIntersectionOf(:AnatomicalEntity ObjectSomeValuesFrom(:hasLaterality :LeftSide)))\n\
         EquivalentClasses(:RightStructure ObjectIntersectionOf(:AnatomicalEntity ObjectSomeValuesFrom(:hasLaterality :RightSide)))\n\
         EquivalentClasses(:PairedOrgan ObjectIntersectionOf(:Organ ObjectSomeValuesFrom(:hasLaterality :Laterality)))\n\
         EquivalentClasses(:LargeStructure ObjectIntersectionOf(:AnatomicalEntity DataSomeValuesFrom(:hasVolume DatatypeRestriction(xsd:decimal xsd:minInclusive \"500\"^^xsd:decimal))))\n\
         EquivalentClasses(:SmallStructure ObjectIntersectionOf(:AnatomicalEntity DataSomeValuesFrom(:hasVolume DatatypeRestriction(xsd:decimal xsd:maxInclusive \"50\"^^xsd:decimal))))\n",
    );
    // Body cavities.
    let cav: Vec<String> = (0..4).map(|c| format!("Cavity{c}")).collect();
    for c in &cav {
        let _ = writeln!(s, "SubClassOf(:{c} :BodyCavity)");
    }
    let _ = writeln!(s, "DisjointClasses(:{})", cav.join(" :"));
    classes.extend(cav);
    // Organ systems.
    let sys: Vec<String> = (0..SYSTEMS).map(|i| format!("System{i}Organ")).collect();
    for (i, c) in sys.iter().enumerate() {
        let _ = writeln!(s, "SubClassOf(:{c} :Organ)");
        let d = format!("System{i}Part");
        let _ = writeln!(
            s,
            "EquivalentClasses(:{d} ObjectIntersectionOf(:OrganPart ObjectSomeValuesFrom(:partOf :{c})))"
        );
        classes.push(d);
    }
    let _ = writeln!(s, "DisjointClasses(:{})", sys.join(" :"));
    classes.extend(sys);
    // Organs, their parts and arteries.
    let tissues = [
        "EpithelialTissue",
        "ConnectiveTissue",
        "MuscleTissue",
        "NervousTissue",
    ];
    for k in 0..ORGANS {
        let o = format!("Organ{k}");
        let a = format!("Organ{k}Artery");
        let _ = writeln!(s, "SubClassOf(:{o} :System{}Organ)", k % SYSTEMS);
        let _ = writeln!(
            s,
            "SubClassOf(:{o} ObjectSomeValuesFrom(:hasPrimaryArtery :{a}))"
        );
        let _ = writeln!(
            s,
            "SubClassOf(:{o} ObjectSomeValuesFrom(:locatedIn :Cavity{}))",
            k % 4
        );
        let _ = writeln!(
            s,
            "SubClassOf(:{o} ObjectSomeValuesFrom(:adjacentTo :System{}Organ))",
            (k + 1) % SYSTEMS
        );
        let _ = writeln!(
            s,
            "SubClassOf(:{o} DataSomeValuesFrom(:hasVolume DatatypeRestriction(xsd:decimal xsd:minInclusive \"{}\"^^xsd:decimal)))",
            20 * k + 10
        );
        if k % 4 == 0 {
            let _ = writeln!(
                s,
                "SubClassOf(:{o} ObjectSomeValuesFrom(:hasLaterality :Laterality))"
            );
        }
        let _ = writeln!(s, "SubClassOf(:{a} :Artery)");
        let _ = writeln!(s, "SubClassOf(:{a} ObjectSomeValuesFrom(:supplies :{o}))");
        let d = format!("PartOfOrgan{k}");
        let _ = writeln!(
            s,
            "EquivalentClasses(:{d} ObjectIntersectionOf(:OrganPart ObjectSomeValuesFrom(:componentOf :{o})))"
        );
        let parts: Vec<String> = (0..PARTS).map(|j| format!("Organ{k}Part{j}")).collect();
        for (j, p) in parts.iter().enumerate() {
            let _ = writeln!(s, "SubClassOf(:{p} :OrganPart)");
            let _ = writeln!(
                s,
                "SubClassOf(:{p} ObjectSomeValuesFrom(:componentOf :{o}))"
            );
            let _ = writeln!(
                s,
                "SubClassOf(:{p} ObjectSomeValuesFrom(:hasTissue :{}))",
                tissues[(k + j) % 4]
            );
            let _ = writeln!(
                s,
                "SubClassOf(:{p} DataSomeValuesFrom(:hasVolume DatatypeRestriction(xsd:decimal xsd:maxInclusive \"{}\"^^xsd:decimal)))",
                10 * j + 20
            );
            if k % 4 == 0 && j < 2 {
                let side = if j == 0 { "LeftSide" } else { "RightSide" };
                let _ = writeln!(
                    s,
                    "SubClassOf(:{p} ObjectSomeValuesFrom(:hasLaterality :{side}))"
                );
            }
            if j == PARTS - 1 {
                let _ = writeln!(
                    s,
                    "SubClassOf(:{p} ObjectSomeValuesFrom(:hasSegment :Region))"
                );
            }
        }
        let _ = writeln!(s, "DisjointClasses(:{})", parts.join(" :"));
        classes.push(o);
        classes.push(a);
        classes.push(d);
        classes.extend(parts);
    }
    // Organs of one system (Organ{i}, Organ{i+8}, ...) are disjoint siblings.
    for i in 0..SYSTEMS {
        let sib: Vec<String> = (0..ORGANS / SYSTEMS)
            .map(|m| format!("Organ{}", i + m * SYSTEMS))
            .collect();
        let _ = writeln!(s, "DisjointClasses(:{})", sib.join(" :"));
    }
    // Regions of parts of the first organs: partOf reaches the organ through transitivity.
    for k in 0..REGION_ORGANS {
        for j in 0..PARTS {
            let r = format!("Organ{k}Part{j}Region");
            let _ = writeln!(s, "SubClassOf(:{r} :Region)");
            let _ = writeln!(
                s,
                "SubClassOf(:{r} ObjectSomeValuesFrom(:regionOf :Organ{k}Part{j}))"
            );
            let _ = writeln!(
                s,
                "SubClassOf(:{r} DataSomeValuesFrom(:hasVolume DatatypeRestriction(xsd:decimal xsd:maxInclusive \"{}\"^^xsd:decimal)))",
                j + 5
            );
            classes.push(r);
        }
        let d = format!("RegionWithinOrgan{k}");
        let _ = writeln!(
            s,
            "EquivalentClasses(:{d} ObjectIntersectionOf(:Region ObjectSomeValuesFrom(:partOf :Organ{k})))"
        );
        classes.push(d);
    }
    for n in 0..NERVES {
        let c = format!("Nerve{n}");
        let _ = writeln!(s, "SubClassOf(:{c} :Nerve)");
        let _ = writeln!(
            s,
            "SubClassOf(:{c} ObjectSomeValuesFrom(:innervates :Organ{}))",
            2 * n
        );
        classes.push(c);
    }
    let mut decl = String::new();
    for c in &classes {
        let _ = writeln!(decl, "Declaration(Class(:{c}))");
    }
    s.push_str(&decl);
    s.push_str(")\n");
    (s, classes.len())
}

/// Number of k-subsets of n things.
fn choose(n: u64, k: u64) -> u64 {
    (0..k).fold(1, |acc, i| acc * (n - i) / (i + 1))
}

/// A synthetic abduction KB: 60 hypothesis classes, each explaining `Obs` only in one of 20
/// locations; 3 findings, each located in one location; one finding is `Solid`, disjoint
/// from the odd-numbered hypotheses.
fn abduction_ofn() -> String {
    let mut s = String::new();
    header(&mut s, "abduction60.ofn");
    s.push_str(
        "Declaration(Class(:Obs))\nDeclaration(Class(:Lesion))\nDeclaration(Class(:Solid))\nDeclaration(ObjectProperty(:loc))\n",
    );
    for c in 0..20 {
        let _ = writeln!(s, "Declaration(Class(:C{c}))");
        let _ = writeln!(s, "Declaration(NamedIndividual(:c{c}))");
        let _ = writeln!(s, "ClassAssertion(:C{c} :c{c})");
    }
    let _ = writeln!(
        s,
        "DisjointClasses({})",
        (0..20)
            .map(|c| format!(":C{c}"))
            .collect::<Vec<_>>()
            .join(" ")
    );
    for i in 0..60 {
        let _ = writeln!(s, "Declaration(Class(:H{i}))");
        let _ = writeln!(s, "SubClassOf(:H{i} :Lesion)");
        let _ = writeln!(
            s,
            "SubClassOf(ObjectIntersectionOf(:H{i} ObjectSomeValuesFrom(:loc :C{})) :Obs)",
            i % 20
        );
        if i % 2 == 1 {
            let _ = writeln!(s, "DisjointClasses(:H{i} :Solid)");
        }
        if i % 3 == 0 {
            let _ = writeln!(s, "DisjointClasses(:H{i} :H{})", i + 1);
        }
    }
    for (k, c) in [(0, 0), (1, 7), (2, 14)] {
        let _ = writeln!(s, "Declaration(NamedIndividual(:f{k}))");
        let _ = writeln!(s, "ClassAssertion(:Lesion :f{k})");
        let _ = writeln!(s, "ObjectPropertyAssertion(:loc :f{k} :c{c})");
    }
    s.push_str("ClassAssertion(:Solid :f2)\n)\n");
    s
}

fn abduction_problem(dir: &Path) -> Problem {
    let path = dir.join("abduction60.ofn");
    std::fs::write(&path, abduction_ofn()).expect("cannot write the abduction ontology");
    let mut kb: KnowledgeBase = load(&[path], &LoadOptions::default()).expect("abduction KB");
    let class = |kb: &KnowledgeBase, n: &str| {
        kb.vocab
            .find_class(&format!("{NS}{n}"))
            .unwrap_or_else(|| panic!("class {n}"))
    };
    let ind = |kb: &KnowledgeBase, n: &str| {
        kb.vocab
            .find_individual(&format!("{NS}{n}"))
            .unwrap_or_else(|| panic!("individual {n}"))
    };
    let findings: Vec<_> = (0..3).map(|k| ind(&kb, &format!("f{k}"))).collect();
    let obs_class = class(&kb, "Obs");
    let obs = kb.class_concept(obs_class);
    let observations: Vec<Assertion> = findings.iter().map(|&f| Assertion::Class(obs, f)).collect();
    let mut abducibles = Vec::new();
    for i in 0..60 {
        let h = class(&kb, &format!("H{i}"));
        let hc = kb.class_concept(h);
        abducibles.extend(findings.iter().map(|&f| Assertion::Class(hc, f)));
    }
    // No observation is among the axioms, so every axiom is background.
    assert!(
        !kb.axioms
            .iter()
            .any(|a| matches!(a.axiom, Axiom::ClassAssertion(c, _) if c == obs))
    );
    let n = kb.axioms.len();
    Problem {
        kb,
        background: vec![true; n],
        degrees: vec![1.0; n],
        observations,
        abducibles,
    }
}

fn benches(c: &mut Criterion) {
    let dir = scratch();
    let mut g = c.benchmark_group("reasoner");
    g.sample_size(10)
        .warm_up_time(Duration::from_secs(1))
        .measurement_time(Duration::from_secs(3));

    // 1. The generated 500-class ontology.
    let (text, n_classes) = anatomy_ofn();
    assert_eq!(n_classes, 500);
    let path = dir.join("anatomy500.ofn");
    std::fs::write(&path, text).expect("cannot write the generated ontology");
    let t = std::time::Instant::now();
    let kb = load(&[path], &LoadOptions::default()).expect("generated ontology");
    assert!(kb.warnings.is_empty(), "{:?}", kb.warnings);
    eprintln!(
        "classify_500_class_demo_kind: loaded {} signature classes, {} axioms in {:.2} s",
        kb.signature_classes.len(),
        kb.axioms.len(),
        t.elapsed().as_secs_f64()
    );
    // One classification under a deadline first, so that a slow reasoner is reported
    // instead of stalling the whole bench.
    let mut r = Reasoner::new(&kb).unwrap();
    r.limits.deadline = Some(std::time::Instant::now() + Duration::from_secs(30));
    let t = std::time::Instant::now();
    match classify(&mut r, &kb.signature_classes) {
        Ok(cl) => {
            assert!(cl.consistent);
            assert!(cl.unsatisfiable.is_empty(), "{:?}", cl.unsatisfiable);
            eprintln!(
                "classify_500_class_demo_kind: {} subsumptions, first run {:.2} s, {} tableau tests",
                cl.subsumptions.len(),
                t.elapsed().as_secs_f64(),
                r.stats.tests
            );
            g.bench_function("classify_500_class_demo_kind", |b| {
                b.iter(|| {
                    let mut r = Reasoner::new(&kb).unwrap();
                    black_box(classify(&mut r, &kb.signature_classes).unwrap())
                })
            });
        }
        Err(l) => eprintln!(
            "classify_500_class_demo_kind: NOT BENCHMARKED, stopped by {l:?} after {:.1} s ({} tableau tests, {} nodes)",
            t.elapsed().as_secs_f64(),
            r.stats.tests,
            r.stats.nodes
        ),
    }
    drop(kb);

    // 2. The demo's abdomen ontology.
    let abd = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("ontologies/abdomen.ofn");
    let kb = load(&[abd], &LoadOptions::default()).expect("abdomen ontology");
    let cl = classify(&mut Reasoner::new(&kb).unwrap(), &kb.signature_classes).unwrap();
    assert!(cl.consistent);
    eprintln!(
        "classify_demo_abdomen: {} signature classes, {} unsatisfiable",
        kb.signature_classes.len(),
        cl.unsatisfiable.len()
    );
    g.bench_function("classify_demo_abdomen", |b| {
        b.iter(|| {
            let mut r = Reasoner::new(&kb).unwrap();
            black_box(classify(&mut r, &kb.signature_classes).unwrap())
        })
    });
    drop(kb);

    // 3. The demo's two-organ case.
    let demo = dir.join("demo");
    wherefore::demo::run(&demo).expect("demo run");
    let kb = wherefore::demo::demo_kb(&demo).expect("demo KB");
    let json = std::fs::read_to_string(demo.join("03-two-organs/facts.json")).expect("facts");
    let facts: Facts = serde_json::from_str(&json).expect("facts JSON");
    let full = ExplainOptions::default();
    let search_only = ExplainOptions {
        justify: false,
        ..ExplainOptions::default()
    };
    let case = wherefore::explain::case::case_problem(&kb, &facts, "f");
    let res = explain(&case.problem, &full).unwrap();
    eprintln!(
        "explain_demo_case: {} explanations, {} reasoner calls",
        res.explanations.len(),
        res.stats.reasoner_calls
    );
    assert!(!res.explanations.is_empty());
    g.bench_function("explain_demo_case", |b| {
        b.iter(|| {
            let case = wherefore::explain::case::case_problem(&kb, &facts, "f");
            black_box(explain(&case.problem, &full).unwrap())
        })
    });
    g.bench_function("explain_demo_case_no_justify", |b| {
        b.iter(|| {
            let case = wherefore::explain::case::case_problem(&kb, &facts, "f");
            black_box(explain(&case.problem, &search_only).unwrap())
        })
    });
    drop(kb);

    // 4. Synthetic abduction: 60 hypothesis classes × 3 findings.
    let problem = abduction_problem(&dir);
    let mut guarded = search_only.clone();
    guarded.limits.deadline = Some(std::time::Instant::now() + Duration::from_secs(30));
    let t = std::time::Instant::now();
    let res = explain(&problem, &guarded).unwrap();
    eprintln!(
        "abduction_60_abducible_classes: first run {:.2} s, complete {}, limit {:?}",
        t.elapsed().as_secs_f64(),
        res.complete,
        res.limit
    );
    assert!(res.kb_consistent);
    let n_abd = problem.abducibles.len() as u64;
    let brute =
        (1..=3).map(|k| choose(n_abd, k)).sum::<u64>() * (1 + problem.observations.len() as u64);
    eprintln!(
        "abduction_60_abducible_classes: {} abducibles, {} explanations, {} unexplained, {} tree nodes, {} reasoner calls; brute force {} calls; ratio brute/ours = {:.0}x",
        n_abd,
        res.explanations.len(),
        res.unexplained.len(),
        res.stats.tree_nodes,
        res.stats.reasoner_calls,
        brute,
        brute as f64 / res.stats.reasoner_calls.max(1) as f64
    );
    if res.complete {
        g.bench_function("abduction_60_abducible_classes", |b| {
            b.iter(|| black_box(explain(&problem, &search_only).unwrap()))
        });
    } else {
        eprintln!("abduction_60_abducible_classes: NOT BENCHMARKED, the search hit its limit");
    }

    // 5. Real ontologies (answers recorded from HermiT, tests/fixtures/real/README.md).
    let real = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/real");
    for (name, file) in [("rico", "rico-1.0.2"), ("dbpedia", "dbpedia-4.2")] {
        let kb = load(&[real.join(format!("{file}.ofn"))], &LoadOptions::default())
            .expect("real ontology");
        let expected: serde_json::Value = serde_json::from_str(
            &std::fs::read_to_string(real.join(format!("{file}.json"))).expect("expected answer"),
        )
        .expect("expected JSON");
        let cl = classify(&mut Reasoner::new(&kb).unwrap(), &kb.signature_classes).unwrap();
        assert_eq!(
            cl.subsumptions.len(),
            expected["subsumptions"].as_array().map_or(0, Vec::len),
            "{file}: HermiT's number of subsumptions"
        );
        g.bench_function(format!("classify_real_{name}"), |b| {
            b.iter(|| {
                let mut r = Reasoner::new(&kb).unwrap();
                black_box(classify(&mut r, &kb.signature_classes).unwrap())
            })
        });
    }
    g.finish();
    let _ = std::fs::remove_dir_all(&dir);
}

criterion_group!(reasoner, benches);
criterion_main!(reasoner);

//! Loading speed against horned-owl's parsers alone (criterion; medians in
//! `target/criterion/load/<name>/new/estimates.json`). Goal: loading a 1 MB ontology
//! (syntax detection, the two-step RDF reading with shared declarations, the leftover
//! checks and the conversion into the knowledge base) takes at most twice as long as
//! horned-owl needs to parse the same file.
//!
//! - `load_functional_1mb` / `horned_functional_1mb`: a generated anatomy-like ontology of
//!   about 1 MB in functional syntax;
//! - `load_rdfxml_1mb` / `horned_rdfxml_1mb`: the same ontology written as RDF/XML.
//!
//! Before criterion runs, the ratio of medians over a few runs is printed for each
//! syntax, so that one run shows the figure the goal is about.

use criterion::{Criterion, criterion_group, criterion_main};
use horned_owl::io::{ParserConfiguration, RDFParserConfiguration};
use horned_owl::model::{ArcAnnotatedComponent, ArcStr, Build};
use horned_owl::ontology::set::SetOntology;
use std::fmt::Write as _;
use std::hint::black_box;
use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};
use wherefore::kb::load::document::write_document;
use wherefore::kb::load::syntax::Syntax;
use wherefore::kb::load::{LoadOptions, load};

const NS: &str = "https://wherefore.example.org/ns/bench-load#";

/// An anatomy-like ontology of about `bytes` bytes in functional syntax: a tree of
/// classes, each with a label, a part-of restriction and, every fifth, an annotated
/// disjointness with its sibling.
fn generated(bytes: usize) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "Prefix(:=<{NS}>)");
    s.push_str("Prefix(rdfs:=<http://www.w3.org/2000/01/rdf-schema#>)\n");
    let _ = writeln!(s, "Ontology(<{NS}>");
    s.push_str("Declaration(ObjectProperty(:partOf))\nTransitiveObjectProperty(:partOf)\n");
    s.push_str("Declaration(Class(:C0))\n");
    let mut i = 1;
    while s.len() < bytes {
        let parent = i / 4;
        let _ = writeln!(s, "Declaration(Class(:C{i}))");
        let _ = writeln!(
            s,
            "AnnotationAssertion(rdfs:label :C{i} \"structure {i}\"@en)"
        );
        let _ = writeln!(s, "SubClassOf(:C{i} :C{parent})");
        let _ = writeln!(
            s,
            "SubClassOf(:C{i} ObjectSomeValuesFrom(:partOf :C{}))",
            i / 7
        );
        if i % 5 == 0 {
            let _ = writeln!(
                s,
                "DisjointClasses(Annotation(rdfs:comment \"siblings\") :C{i} :C{})",
                i - 1
            );
        }
        i += 1;
    }
    s.push_str(")\n");
    s
}

fn median(mut v: Vec<f64>) -> f64 {
    v.sort_by(f64::total_cmp);
    v[v.len() / 2]
}

/// The median time of `runs` calls of `f`, in seconds.
fn time(runs: usize, mut f: impl FnMut()) -> f64 {
    median(
        (0..runs)
            .map(|_| {
                let t = Instant::now();
                f();
                t.elapsed().as_secs_f64()
            })
            .collect(),
    )
}

fn horned_functional(path: &Path) {
    let text = std::fs::read_to_string(path).unwrap();
    let config = ParserConfiguration::new(Build::<ArcStr>::new_arc());
    let r = horned_owl::io::ofn::reader::read::<ArcStr, _, SetOntology<ArcStr>, _>(
        &mut std::io::Cursor::new(text.as_bytes()),
        config,
    )
    .unwrap();
    black_box(r);
}

fn horned_rdfxml(path: &Path) {
    let text = std::fs::read_to_string(path).unwrap();
    let config: RDFParserConfiguration<ArcStr> =
        ParserConfiguration::new(Build::<ArcStr>::new_arc()).into();
    let r = horned_owl::io::rdf::reader::read::<ArcStr, ArcAnnotatedComponent, _, _>(
        &mut std::io::Cursor::new(text.as_bytes()),
        config,
    )
    .unwrap();
    black_box(r);
}

fn ours(path: &Path) {
    let kb = load(&[path.to_path_buf()], &LoadOptions::default()).unwrap();
    black_box(kb);
}

fn benches(c: &mut Criterion) {
    let dir: PathBuf =
        std::env::temp_dir().join(format!("wherefore-bench-load-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let ofn = generated(1 << 20);
    // RDF/XML spells the same axioms out about 4.4 times longer: a smaller ontology
    // makes the 1 MB RDF/XML file.
    let rdf = write_document(
        "generated",
        &generated((1 << 20) * 10 / 44),
        Syntax::RdfXml,
        &[],
    )
    .unwrap();
    let ofn_path = dir.join("generated.ofn");
    let rdf_path = dir.join("generated.rdf");
    std::fs::write(&ofn_path, &ofn).unwrap();
    std::fs::write(&rdf_path, &rdf).unwrap();
    // Both load strictly.
    let a = load(std::slice::from_ref(&ofn_path), &LoadOptions::default()).unwrap();
    let b = load(std::slice::from_ref(&rdf_path), &LoadOptions::default()).unwrap();
    for (name, path, horned, axioms) in [
        (
            "functional",
            &ofn_path,
            horned_functional as fn(&Path),
            a.sources.len(),
        ),
        (
            "rdfxml",
            &rdf_path,
            horned_rdfxml as fn(&Path),
            b.sources.len(),
        ),
    ] {
        let size = std::fs::metadata(path).unwrap().len();
        let h = time(7, || horned(path));
        let w = time(7, || ours(path));
        eprintln!(
            "load {name} ({:.2} MB, {} axioms): horned-owl parse {:.1} ms, wherefore load {:.1} ms, ratio {:.2} (goal ≤ 2)",
            size as f64 / 1e6,
            axioms,
            h * 1e3,
            w * 1e3,
            w / h
        );
    }
    let mut g = c.benchmark_group("load");
    g.sample_size(10)
        .warm_up_time(Duration::from_secs(1))
        .measurement_time(Duration::from_secs(4));
    g.bench_function("load_functional_1mb", |b| b.iter(|| ours(&ofn_path)));
    g.bench_function("horned_functional_1mb", |b| {
        b.iter(|| horned_functional(&ofn_path))
    });
    g.bench_function("load_rdfxml_1mb", |b| b.iter(|| ours(&rdf_path)));
    g.bench_function("horned_rdfxml_1mb", |b| b.iter(|| horned_rdfxml(&rdf_path)));
    g.finish();
    let _ = std::fs::remove_dir_all(&dir);
}

criterion_group!(load_benches, benches);
criterion_main!(load_benches);

//! Benchmark of the shell: a warm `ask` on the demo knowledge base (ontologies/spatial.ofn
//! and ontologies/abdomen.ofn), the goal being under 20 ms. "Warm" means the files are
//! loaded and the session built; each `ask` still copies the KB, loads the question and
//! prepares a reasoner, as the shell does. Medians in
//! `target/criterion/shell/<name>/new/estimates.json`.

use criterion::{Criterion, criterion_group, criterion_main};
use std::hint::black_box;
use std::path::PathBuf;
use wherefore::shell::Session;

fn warm_session() -> Session {
    let mut s = Session::default();
    s.load_files(&[
        PathBuf::from("ontologies/spatial.ofn"),
        PathBuf::from("ontologies/abdomen.ofn"),
    ])
    .expect("the demo ontologies load");
    s.show_times = false;
    s
}

fn bench(c: &mut Criterion) {
    let mut s = warm_session();
    let mut g = c.benchmark_group("shell");
    // Liver ⊑ Organ holds through SolidOrgan (ontologies/abdomen.ofn).
    assert_eq!(s.execute("ask Liver SubClassOf Organ").unwrap(), "Yes\n");
    g.bench_function("ask_subsumption_demo_kb", |b| {
        b.iter(|| black_box(s.execute("ask Liver SubClassOf Organ").unwrap()))
    });
    // Liver and Kidney are disjoint (ontologies/abdomen.ofn).
    assert_eq!(
        s.execute("ask Liver and Kidney").unwrap(),
        "satisfiable: No\n"
    );
    g.bench_function("ask_satisfiability_demo_kb", |b| {
        b.iter(|| black_box(s.execute("ask Liver and Kidney").unwrap()))
    });
    s.execute("add :case1 Type Lesion and (properPartOf some Liver)")
        .unwrap();
    assert_eq!(s.execute("ask case1 Type HepaticLesion").unwrap(), "Yes\n");
    g.bench_function("ask_instance_demo_kb", |b| {
        b.iter(|| black_box(s.execute("ask case1 Type HepaticLesion").unwrap()))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);

//! Benchmarks of abduction on generated shapes (tests/support/abduction_shapes.rs): one
//! lesion with two observed classes and N hypothesis classes, some explaining both alone
//! and many in pairs (`wide`), the same in deep hierarchies (`deep`), hypotheses that need
//! a role assertion (`roles`), and disjoint distractors (`disjoint`); explanations up to
//! size 3, as `wherefore explain --max-size 3` computes them (justifications included).
//!
//! Before timing, each problem is solved once and the line printed gives the explanations
//! against the hand-derived count, the reasoner calls against brute force (every set of
//! up to 3 abducibles, one consistency and one entailment test per observation), and, for
//! small N, the reference search measured in the same run. Medians in
//! `target/criterion/abduction/<shape>_<n>/new/estimates.json`. Goals (issue 21): wide
//! N = 60 ≤ 0.1 s, N = 240 ≤ 1 s, N = 1000 ≤ 10 s, calls ≤ 1% of brute force.

#[path = "../tests/support/abduction_shapes.rs"]
mod shapes;

use criterion::{Criterion, criterion_group, criterion_main};
use shapes::{Shape, generate};
use std::hint::black_box;
use std::time::{Duration, Instant};
use wherefore::explain::abduce::Strategy;
use wherefore::explain::case::{Mark, observations_problem};
use wherefore::explain::{ExplainOptions, Problem, explain};
use wherefore::kb::load::{LoadOptions, load, load_axioms_text};

fn build(shape: Shape, n: usize) -> (Problem, [usize; 3]) {
    let g = generate(shape, n);
    let dir = std::env::temp_dir().join(format!(
        "wherefore-bench-abduction-{}-{}-{n}",
        std::process::id(),
        shape.name()
    ));
    std::fs::create_dir_all(&dir).expect("scratch folder");
    let (kb_path, abd_path) = (dir.join("kb.ofn"), dir.join("abducibles.txt"));
    std::fs::write(&kb_path, &g.kb).expect("write KB");
    std::fs::write(&abd_path, &g.abducibles).expect("write abducibles");
    let mut kb = load(&[kb_path], &LoadOptions::default()).expect("generated KB");
    let mark = Mark::of(&kb);
    load_axioms_text(&mut kb, "observations", &g.observations).expect("observations");
    let p = observations_problem(kb, mark, "observations", Some(&abd_path)).expect("problem");
    let _ = std::fs::remove_dir_all(&dir);
    (p, g.expected)
}

fn choose(n: u64, k: u64) -> u64 {
    (0..k).fold(1, |acc, i| acc * (n - i) / (i + 1))
}

fn benches(c: &mut Criterion) {
    let mut g = c.benchmark_group("abduction");
    g.sample_size(10);
    g.measurement_time(Duration::from_secs(5));
    let opts = ExplainOptions {
        max_size: 3,
        ..Default::default()
    };
    let plan: &[(Shape, &[usize])] = &[
        (Shape::Wide, &[20, 60, 120, 240, 1000]),
        (Shape::Deep, &[20, 60, 120, 240, 1000]),
        (Shape::Roles, &[20, 60, 120, 240, 1000]),
        (Shape::Disjoint, &[20, 60, 120]),
    ];
    for &(shape, sizes) in plan {
        for &n in sizes {
            let (p, expected) = build(shape, n);
            let t = Instant::now();
            let r = explain(&p, &opts).expect("explain");
            let secs = t.elapsed().as_secs_f64();
            let mut got = [0usize; 3];
            for e in &r.explanations {
                got[e.size - 1] += 1;
            }
            let a = p.abducibles.len() as u64;
            let brute =
                (1..=3).map(|k| choose(a, k)).sum::<u64>() * (1 + p.observations.len() as u64);
            let calls = r.stats.reasoner_calls;
            let mut line = format!(
                "{}_{n}: {a} abducibles, explanations {got:?} (hand-derived {expected:?}), complete {}, first run {secs:.3} s, {calls} reasoner calls = {:.4}% of brute force ({brute})",
                shape.name(),
                r.complete,
                100.0 * calls as f64 / brute as f64
            );
            if n <= 60 {
                let mut slow = opts.clone();
                slow.strategy = Strategy::Reference;
                slow.limits.deadline = Some(Instant::now() + Duration::from_secs(30));
                let t = Instant::now();
                let rr = explain(&p, &slow).expect("explain");
                line.push_str(&format!(
                    "; reference search {:.3} s, {} calls, complete {}",
                    t.elapsed().as_secs_f64(),
                    rr.stats.reasoner_calls,
                    rr.complete
                ));
            }
            eprintln!("{line}");
            assert_eq!(got, expected, "{}_{n}", shape.name());
            g.bench_function(format!("{}_{n}", shape.name()), |b| {
                b.iter(|| black_box(explain(&p, &opts).expect("explain")))
            });
        }
    }
    g.finish();
}

criterion_group!(abduction, benches);
criterion_main!(abduction);

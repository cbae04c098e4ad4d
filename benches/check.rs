//! Benchmark of `check`: 200 demo-sized regression cases (the six demo cases' facts,
//! repeated), each with consistency, an entailment, a satisfiability question, the top
//! explanation and a phrase of the clinician's text, run in parallel on the demo ontologies
//! (goal: under 10 s on 2 cores). Median in
//! `target/criterion/check/200_demo_cases/new/estimates.json`.

use criterion::{Criterion, criterion_group, criterion_main};
use std::fmt::Write as _;
use std::hint::black_box;
use std::path::{Path, PathBuf};
use std::time::Duration;
use wherefore::check::{self, RunOptions, Status};

/// A scratch folder of this process.
fn scratch() -> PathBuf {
    let d = std::env::temp_dir().join(format!("wherefore-bench-check-{}", std::process::id()));
    std::fs::create_dir_all(&d).expect("cannot create the scratch folder");
    d
}

/// CPU time of this process (user + system), from getrusage(2).
fn cpu_seconds() -> f64 {
    // SAFETY: getrusage writes into the zeroed struct we own.
    let mut u: libc::rusage = unsafe { std::mem::zeroed() };
    if unsafe { libc::getrusage(libc::RUSAGE_SELF, &mut u) } != 0 {
        return 0.0;
    }
    let t = |v: libc::timeval| v.tv_sec as f64 + v.tv_usec as f64 / 1e6;
    t(u.ru_utime) + t(u.ru_stime)
}

/// Writes a suite of `n` cases over the demo's facts files into `dir`.
fn suite(dir: &Path, n: usize) -> PathBuf {
    let ontologies = Path::new(env!("CARGO_MANIFEST_DIR")).join("ontologies");
    let cases: Vec<String> = wherefore::demo::cases()
        .iter()
        .map(|c| c.id.to_string())
        .collect();
    let mut s = String::new();
    let _ = writeln!(
        s,
        "kb = [{:?}]\n\n[prefixes]\nab = \"https://wherefore.example.org/ns/abdomen#\"\ncase = \"https://wherefore.example.org/case#\"\n",
        ontologies.join("abdomen.ofn").display().to_string()
    );
    // The top explanations derived by hand in examples/cases.toml. Case 04 contradicts a
    // normal-anatomy default, so the case as written is inconsistent (check asks consistency
    // without suspending defaults; README).
    let expect = |id: &str| -> (&str, bool) {
        match &id[..2] {
            "01" => (
                "\"ClassAssertion(ab:SimpleHepaticCyst case:lesion1)\"",
                true,
            ),
            "02" => (
                "\"ClassAssertion(ab:ExophyticHepaticMass case:lesion1)\"",
                true,
            ),
            "03" => (
                "\"ClassAssertion(ab:RenalCyst case:lesion2)\", \"ClassAssertion(ab:SimpleHepaticCyst case:lesion1)\"",
                true,
            ),
            "04" => (
                "\"ClassAssertion(ab:ExophyticHepaticMass case:lesion1)\"",
                false,
            ),
            "06" => (
                "\"ClassAssertion(ab:PerivascularNodalMass case:lesion1)\"",
                true,
            ),
            _ => ("", true),
        }
    };
    for i in 0..n {
        let id = &cases[i % cases.len()];
        let facts = dir.join(id).join("facts.json");
        let (top, consistent) = expect(id);
        let logic = if consistent {
            "consistent = true\nentailed = [\"ClassAssertion(ab:Liver case:liver)\"]\nsatisfiable = [\"ab:Liver\"]\n"
        } else {
            "consistent = false\n"
        };
        let _ = writeln!(
            s,
            "[[case]]\nname = \"case-{i:03}-{id}\"\nfacts = {:?}\n\n[case.expect]\n{logic}top = [{top}]\n\n[case.expect.text.clinician]\ncontains = [\"INTERPRETATION\"]\n",
            facts.display().to_string()
        );
    }
    let p = dir.join("cases.toml");
    std::fs::write(&p, s).expect("cannot write the suite");
    p
}

fn benches(c: &mut Criterion) {
    let dir = scratch();
    wherefore::demo::run(&dir).expect("the demo runs");
    let path = suite(&dir, 200);
    let loaded = check::load_paths(std::slice::from_ref(&path)).expect("the suite reads");
    assert_eq!(loaded.cases.len(), 200);
    let opts = RunOptions::default();
    let (cpu0, wall0) = (cpu_seconds(), std::time::Instant::now());
    let first = check::run_suite(&loaded.cases, &opts);
    let (cpu, wall) = (cpu_seconds() - cpu0, wall0.elapsed().as_secs_f64());
    let errors: Vec<_> = first
        .iter()
        .filter_map(|r| match &r.status {
            Status::Error(e) => Some(e.clone()),
            _ => None,
        })
        .collect();
    assert!(errors.is_empty(), "{errors:?}");
    let failing: Vec<_> = first
        .iter()
        .filter(|r| r.status != Status::Pass)
        .map(|r| r.spec.name.clone())
        .collect();
    assert!(failing.is_empty(), "cases fail: {failing:?}");
    // The machine may be shared: CPU time divided by the threads is what 2 idle cores take.
    println!(
        "200 cases on {} rayon threads: {wall:.2} s wall, {cpu:.2} s CPU (≈ {:.2} s on idle cores), {} passed, {} failed",
        rayon::current_num_threads(),
        cpu / rayon::current_num_threads() as f64,
        first.iter().filter(|r| r.status == Status::Pass).count(),
        first.iter().filter(|r| r.status == Status::Fail).count()
    );
    let mut g = c.benchmark_group("check");
    g.sample_size(10)
        .warm_up_time(Duration::from_secs(1))
        .measurement_time(Duration::from_secs(20));
    g.bench_function("200_demo_cases", |b| {
        b.iter(|| black_box(check::run_suite(&loaded.cases, &opts)))
    });
    g.finish();
    let _ = std::fs::remove_dir_all(&dir);
}

criterion_group!(check_bench, benches);
criterion_main!(check_bench);

//! Batch report drafts: 1,000 facts-only demo-sized cases end to end (read facts, explain,
//! justify, render three registers, write Markdown, HTML and JSON), with one thread and with
//! two, measured in the same run. Goal: under 60 s on 2 cores.
//!
//! Run: `cargo bench --bench batch` (set `WHEREFORE_BATCH_CASES` for another count). Each
//! setting runs three times; the median is reported, and the ratio between the settings.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::Instant;

fn median(mut v: Vec<f64>) -> f64 {
    v.sort_by(|a, b| a.partial_cmp(b).unwrap());
    v[v.len() / 2]
}

fn run(bin: &str, kb: &[PathBuf], manifest: &Path, out: &Path, jobs: usize) -> f64 {
    let _ = std::fs::remove_dir_all(out);
    let t = Instant::now();
    let status = Command::new(bin)
        .arg("report")
        .arg("--kb")
        .args(kb)
        .arg("--manifest")
        .arg(manifest)
        .arg("--out")
        .arg(out)
        .arg("--jobs")
        .arg(jobs.to_string())
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .status()
        .expect("the wherefore binary runs");
    let secs = t.elapsed().as_secs_f64();
    assert!(status.success(), "batch run failed");
    secs
}

fn main() {
    // Cargo passes `--bench` and filters; this bench takes no options of its own.
    let n: usize = std::env::var("WHEREFORE_BATCH_CASES")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(1000);
    let bin = env!("CARGO_BIN_EXE_wherefore");
    let dir = std::env::temp_dir().join(format!("wherefore-bench-batch-{}", std::process::id()));
    let demo = dir.join("demo");
    let outcomes = wherefore::demo::run(&demo).expect("demo runs");
    let facts: Vec<PathBuf> = outcomes.iter().map(|o| o.dir.join("facts.json")).collect();
    let mut manifest = String::new();
    for i in 0..n {
        manifest.push_str(&format!(
            "[[case]]\nid = \"case{i:05}\"\nfacts = \"{}\"\n\n",
            facts[i % facts.len()].display()
        ));
    }
    let mpath = dir.join("cohort.toml");
    std::fs::write(&mpath, manifest).unwrap();
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let kb = vec![
        root.join("ontologies/spatial.ofn"),
        root.join("ontologies/abdomen.ofn"),
    ];
    let mut medians = Vec::new();
    for jobs in [1usize, 2] {
        let times: Vec<f64> = (0..3)
            .map(|_| run(bin, &kb, &mpath, &dir.join("out"), jobs))
            .collect();
        let m = median(times.clone());
        println!(
            "batch/{n}_cases/{jobs}_thread(s): median {m:.2} s ({:.1} ms per case; runs {:?})",
            1000.0 * m / n as f64,
            times.iter().map(|t| format!("{t:.2}")).collect::<Vec<_>>()
        );
        medians.push(m);
    }
    println!(
        "batch/{n}_cases: 2 threads are {:.2}x faster than 1 thread (goal for 1,000 cases: under 60 s)",
        medians[0] / medians[1]
    );
    let _ = std::fs::remove_dir_all(&dir);
}

//! Benchmarks of `measure` on a 256³ label map (criterion).
//!
//! - `full_plan_256_12_labels`: every ordered pair of 12 regions, default parameters (goal < 3 s);
//! - `edt_256`: the exact EDT of a 256³ volume, with its throughput; when the environment
//!   variable `WHEREFORE_SCIPY_PYTHON` names a Python with scipy, scipy's
//!   `distance_transform_edt` is timed on the same volume in the same run and the ratio printed;
//! - `fast_landscape_256`: one propagated landscape over 256³ at full resolution (goal
//!   < 0.3 s; one thread, as `FastLandscape::compute` runs it), also timed as a two-thread
//!   slice pipeline and on the default 2 × 2 × 2 cells;
//! - the peak resident memory (VmHWM) after each group.

use criterion::{Criterion, criterion_group, criterion_main};
use std::hint::black_box;
use std::time::{Duration, Instant};
use wherefore::facts::measure::measure;
use wherefore::spatial::affine::Affine;
use wherefore::spatial::edt::edt;
use wherefore::spatial::landscape::FastLandscape;
use wherefore::spatial::mask::Mask;
use wherefore::spatial::measure::MeasureOptions;
use wherefore::spatial::phantom::Phantom;
use wherefore::spatial::structuring::Direction;
use wherefore::spatial::table::parse_table;

const N: usize = 256;

fn phantom() -> Phantom {
    // 1 mm × 1 mm × 1.2 mm voxels centred on the origin; twelve organs and lesions.
    let aff = Affine::diagonal([1.0, 1.0, 1.2], [-128.0, -128.0, -153.6]);
    let mut p = Phantom::new([N, N, N], aff);
    p.ellipsoid(1, [0.0, 0.0, 0.0], [110.0, 80.0, 140.0]); // body
    p.ellipsoid(2, [-45.0, 10.0, 40.0], [45.0, 35.0, 40.0]); // liver on the right would be +x; here left
    p.ellipsoid(3, [50.0, -10.0, 50.0], [20.0, 25.0, 30.0]);
    p.ellipsoid(4, [-40.0, -40.0, -30.0], [15.0, 15.0, 30.0]);
    p.ellipsoid(5, [40.0, -40.0, -30.0], [15.0, 15.0, 30.0]);
    p.tube(6, [0.0, -30.0, -120.0], [0.0, -30.0, 120.0], 10.0);
    p.cuboid(7, [-20.0, 20.0, -60.0], [20.0, 60.0, -20.0]);
    p.ellipsoid(8, [0.0, 30.0, 90.0], [35.0, 25.0, 20.0]);
    p.lesion(9, 2, [-50.0, 10.0, 40.0], [8.0, 8.0, 8.0]);
    p.lesion(10, 2, [-30.0, 20.0, 60.0], [5.0, 5.0, 5.0]);
    p.lesion(11, 3, [50.0, -10.0, 50.0], [6.0, 6.0, 6.0]);
    p.lesion(12, 8, [10.0, 30.0, 95.0], [7.0, 7.0, 7.0]);
    p
}

fn table() -> String {
    let mut t = String::from("value\tindividual\tclass\n");
    for v in 1..=12 {
        let class = if v >= 9 { "Lesion" } else { "Organ" };
        t.push_str(&format!("{v}\tr{v}\thttp://example.org/x#{class}{v}\n"));
    }
    t
}

/// User + system CPU seconds of this process so far (/proc/self/stat, clock ticks of 1/100 s).
fn cpu_seconds() -> f64 {
    let s = std::fs::read_to_string("/proc/self/stat").unwrap_or_default();
    let after = s.rsplit_once(')').map_or("", |x| x.1);
    let f: Vec<&str> = after.split_whitespace().collect();
    let t = |i: usize| f.get(i).and_then(|v| v.parse::<f64>().ok()).unwrap_or(0.0);
    (t(11) + t(12)) / 100.0
}

/// Runs `f` `n` times; prints the median wall time and the mean CPU time per run.
fn timed(label: &str, n: usize, mut f: impl FnMut()) -> f64 {
    let c0 = cpu_seconds();
    let mut ts: Vec<f64> = (0..n)
        .map(|_| {
            let t = Instant::now();
            f();
            t.elapsed().as_secs_f64()
        })
        .collect();
    let cpu = (cpu_seconds() - c0) / n as f64;
    ts.sort_by(f64::total_cmp);
    let med = ts[n / 2];
    eprintln!("{label}: median wall {med:.3} s over {n} runs, CPU {cpu:.3} s per run");
    med
}

fn peak_rss(label: &str) {
    if let Ok(s) = std::fs::read_to_string("/proc/self/status") {
        for l in s.lines().filter(|l| l.starts_with("VmHWM")) {
            eprintln!("memory after {label}: {l}");
        }
    }
}

fn scipy_edt_seconds(python: &str) -> Option<f64> {
    let code = format!(
        "import numpy as np, time\nfrom scipy import ndimage\nn={N}\nz,y,x=np.ogrid[:n,:n,:n]\nf=((x-n/2)**2+(y-n/2)**2+(z-n/2)**2)<(n/4)**2\nts=[]\nfor _ in range(3):\n    t=time.perf_counter(); ndimage.distance_transform_edt(~f, sampling=(1.0,1.0,1.2)); ts.append(time.perf_counter()-t)\nprint(sorted(ts)[1])\n"
    );
    let out = std::process::Command::new(python)
        .arg("-c")
        .arg(code)
        .output()
        .ok()?;
    String::from_utf8_lossy(&out.stdout).trim().parse().ok()
}

fn ball_features() -> Vec<bool> {
    let c = N as f64 / 2.0;
    let r2 = (N as f64 / 4.0).powi(2);
    let mut f = vec![false; N * N * N];
    for k in 0..N {
        for j in 0..N {
            for i in 0..N {
                f[i + N * (j + N * k)] =
                    (i as f64 - c).powi(2) + (j as f64 - c).powi(2) + (k as f64 - c).powi(2) < r2;
            }
        }
    }
    f
}

fn benches(c: &mut Criterion) {
    // EDT first, so that its memory figure is its own.
    let feat = ball_features();
    let mut g = c.benchmark_group("spatial");
    g.sample_size(10)
        .warm_up_time(Duration::from_secs(1))
        .measurement_time(Duration::from_secs(8));
    g.bench_function("edt_256", |b| {
        b.iter(|| black_box(edt([N, N, N], [1.0, 1.0, 1.2], &feat)))
    });
    let ours = timed("edt_256", 5, || {
        black_box(edt([N, N, N], [1.0, 1.0, 1.2], &feat));
    });
    let mvox = (N * N * N) as f64 / ours / 1e6;
    eprintln!("edt_256: median {ours:.3} s, {mvox:.1} Mvox/s");
    if let Ok(py) = std::env::var("WHEREFORE_SCIPY_PYTHON") {
        match scipy_edt_seconds(&py) {
            Some(s) => eprintln!(
                "scipy distance_transform_edt same volume: median {s:.3} s, {:.1} Mvox/s; ratio ours/scipy speed = {:.2}x",
                (N * N * N) as f64 / s / 1e6,
                s / ours
            ),
            None => eprintln!("scipy timing failed with {py}"),
        }
    }
    drop(feat);
    peak_rss("edt_256");

    let p = phantom();
    let map = p.to_label_map("bench.nii");
    drop(p);
    let body = {
        let mut v = Vec::new();
        for k in 100..156 {
            for j in 100..156 {
                for i in 100..156 {
                    if map.codes[i + N * (j + N * k)] as usize
                        == map.code_of(7).map_or(usize::MAX, |c| c as usize)
                    {
                        v.push([i as i64, j as i64, k as i64]);
                    }
                }
            }
        }
        Mask::from_voxels(&v)
    };
    // Left of the body, over the whole volume: `factor` 1 = full resolution.
    let land = |factor: usize, threads: usize| {
        black_box(FastLandscape::compute_threads(
            &body,
            [0, 0, 0],
            [N, N, N],
            &map.affine,
            Direction::Left.vector(),
            factor,
            threads,
        ))
    };
    // As `FastLandscape::compute` runs it: one thread.
    g.bench_function("fast_landscape_256", |b| b.iter(|| land(1, 1)));
    timed(
        "fast_landscape_256 (full resolution, one thread)",
        3,
        || {
            land(1, 1);
        },
    );
    timed(
        "fast_landscape_256 (full resolution, two-thread pipeline)",
        3,
        || {
            land(1, 2);
        },
    );
    timed(
        "fast_landscape_256 (default coarsening, factor 2)",
        5,
        || {
            land(2, 1);
        },
    );
    peak_rss("fast_landscape_256");
    g.finish();

    // The full plan takes seconds per run: timed directly (3 runs) rather than sampled.
    let rows = parse_table(&table(), "bench.tsv").unwrap();
    let opts = MeasureOptions::default();
    let mut facts = None;
    timed("full_plan_256_12_labels", 3, || {
        facts = Some(
            measure(std::slice::from_ref(&map), &rows, "bench.tsv", &opts)
                .unwrap()
                .facts,
        );
    });
    if let Some(f) = facts {
        eprintln!(
            "full plan: {} relations, {} measurements",
            f.relations.len(),
            f.measurements.len()
        );
    }
    peak_rss("full_plan_256_12_labels");
    // The same plan with landscapes on 4×4×4 cells (max_landscape_cells = 2^18).
    let mut coarse = MeasureOptions::default();
    coarse.config.directional.max_landscape_cells = 1 << 18;
    timed(
        "full_plan_256_12_labels (max_landscape_cells = 2^18)",
        3,
        || {
            black_box(measure(std::slice::from_ref(&map), &rows, "bench.tsv", &coarse).unwrap());
        },
    );
}

criterion_group!(spatial, benches);
criterion_main!(spatial);

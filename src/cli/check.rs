//! `wherefore check`: regression cases for KB edits (the library part is `crate::check`).

use crate::check::{self, Status, baseline, diff};
use crate::files::write_atomic;
use clap::Args;
use std::io::{IsTerminal, Write};
use std::path::PathBuf;
use std::time::{Duration, Instant};

/// Arguments of `wherefore check`.
#[derive(Args, Debug)]
pub struct CheckArgs {
    /// Case files, or folders searched for them (*.toml holding [[case]] tables).
    #[arg(required_unless_present = "init")]
    pub paths: Vec<PathBuf>,
    /// Write a JUnit XML report to this file.
    #[arg(long, value_name = "FILE")]
    pub junit: Option<PathBuf>,
    /// The older KB: a folder, or files (repeat the option); its files replace the cases'
    /// KB files of the same name for a second run, and the changes are reported.
    #[arg(long, value_name = "DIR-or-FILE")]
    pub baseline: Vec<PathBuf>,
    /// Write the current outcomes into the failing expectations of failing cases.
    #[arg(long)]
    pub accept: bool,
    /// Do not ask before --accept writes (needed when not on a terminal).
    #[arg(long)]
    pub yes: bool,
    /// Write a small passing suite and KB into DIR, then stop.
    #[arg(long, value_name = "DIR", conflicts_with_all = ["paths", "junit", "baseline", "accept"])]
    pub init: Option<PathBuf>,
    /// Time limit in seconds per case (the case then fails as undecided).
    #[arg(long, value_name = "SECONDS", default_value_t = 120.0)]
    pub timeout: f64,
    /// Largest number of completion-graph nodes in one test (exit code 3 when reached).
    #[arg(
        long = "max-graph-nodes",
        value_name = "N",
        default_value_t = 1_000_000
    )]
    pub max_graph_nodes: usize,
    /// Folder searched for imported ontologies.
    #[arg(long = "import-dir", value_name = "DIR")]
    pub import_dirs: Vec<PathBuf>,
    /// XML catalog (OASIS) that maps imported ontology IRIs to files.
    #[arg(long, value_name = "FILE")]
    pub catalog: Option<PathBuf>,
}

fn bad(msg: impl std::fmt::Display) -> i32 {
    eprintln!("error: {msg}");
    super::EXIT_BAD_INPUT
}

/// Runs `check` and returns the exit code.
pub fn run(args: CheckArgs) -> i32 {
    if let Some(dir) = &args.init {
        return match check::init::scaffold(dir) {
            Ok(files) => {
                for f in files {
                    println!("wrote {}", f.display());
                }
                println!("Run the suite with: wherefore check {}", dir.display());
                super::EXIT_OK
            }
            Err(e) => bad(e),
        };
    }
    if !(args.timeout.is_finite() && args.timeout > 0.0) {
        return bad(format!(
            "--timeout {} must be a positive number of seconds",
            args.timeout
        ));
    }
    let suite = match check::load_paths(&args.paths) {
        Ok(s) => s,
        Err(e) => return bad(e),
    };
    let opts = check::RunOptions {
        import_dirs: args.import_dirs.clone(),
        catalog: args.catalog.clone(),
        explain_always: !args.baseline.is_empty(),
        timeout: Duration::from_secs_f64(args.timeout.min(1e6)),
        max_graph_nodes: args.max_graph_nodes,
        ..Default::default()
    };
    let replace = if args.baseline.is_empty() {
        None
    } else {
        match baseline::replacements(&args.baseline) {
            Ok(r) => Some(r),
            Err(e) => return bad(e),
        }
    };
    let start = Instant::now();
    let results = check::run_suite(&suite.cases, &opts);
    let wall = start.elapsed();
    let mut out = String::new();
    for r in &results {
        out.push_str(&diff::case_text(r));
    }
    out.push_str(&diff::summary(&results, wall));
    print!("{out}");
    let (_, failed, errors) = diff::counts(&results);
    if let Some(j) = &args.junit {
        let host = std::fs::read_to_string("/proc/sys/kernel/hostname").unwrap_or_default();
        let xml = check::junit::junit_xml(&results, std::time::SystemTime::now(), &host);
        if let Err(e) = write_atomic(j, xml.as_bytes(), &suite.files) {
            return bad(e);
        }
    }
    if let Some(replace) = replace {
        let bopts = check::RunOptions {
            replace,
            ..opts.clone()
        };
        let before = check::run_suite(&suite.cases, &bopts);
        for b in before.iter() {
            if let Status::Error(e) = &b.status {
                eprintln!("error: baseline run of {}: {e}", b.spec.name);
            }
        }
        let changes = baseline::compare_runs(&before, &results);
        print!("{}", baseline::changes_text(&changes, &results));
    }
    if errors > 0 {
        eprintln!("error: {errors} case(s) could not run; fix them (messages above) and run again");
        return super::EXIT_BAD_INPUT;
    }
    let limited: Vec<&check::CaseResult> = results
        .iter()
        .filter(|r| r.outcome.limit.is_some())
        .collect();
    if !limited.is_empty() {
        for r in &limited {
            eprintln!(
                "warning: {}: {}; its answers are incomplete. Raise --timeout or --max-graph-nodes.",
                r.spec.name,
                r.outcome.limit.as_deref().unwrap_or_default()
            );
        }
        return super::EXIT_LIMIT;
    }
    if args.accept && failed > 0 {
        return accept(&results, args.yes);
    }
    if failed > 0 {
        super::EXIT_FAILED
    } else {
        super::EXIT_OK
    }
}

fn accept(results: &[check::CaseResult], yes: bool) -> i32 {
    let plan = match check::accept::plan(results) {
        Ok(p) => p,
        Err(e) => return bad(e),
    };
    println!("--accept would rewrite:");
    for r in &plan {
        for c in &r.changed {
            println!("  {}: {c}", r.file.display());
        }
    }
    if !yes {
        if !std::io::stdin().is_terminal() {
            return bad(
                "--accept asks before writing; not on a terminal, give --yes to write without asking",
            );
        }
        print!("Write these changes? [y/N] ");
        let _ = std::io::stdout().flush();
        let mut answer = String::new();
        if std::io::stdin().read_line(&mut answer).is_err()
            || !matches!(answer.trim(), "y" | "Y" | "yes")
        {
            println!("Nothing written.");
            return super::EXIT_FAILED;
        }
    }
    for r in &plan {
        if let Err(e) = write_atomic(&r.file, r.text.as_bytes(), &[]) {
            return bad(format!("{e}; this file was left as it was"));
        }
        println!("updated {}", r.file.display());
    }
    super::EXIT_OK
}

//! `wherefore demo`: the whole job on built-in synthetic cases.

use clap::Args;
use std::path::PathBuf;
use std::time::Instant;

/// Arguments of `wherefore demo`.
#[derive(Args, Debug)]
pub struct DemoArgs {
    /// Output folder.
    #[arg(long, default_value = "wherefore-demo")]
    pub out: PathBuf,
}

/// Runs the demo and returns the exit code.
pub fn run(args: DemoArgs) -> i32 {
    let start = Instant::now();
    println!(
        "wherefore demo: synthetic upper-abdominal CT, six cases (illustrative, not clinical guidance)"
    );
    match crate::demo::run(&args.out) {
        Ok(outcomes) => {
            // The examples' regression suite over the folders just written.
            let results = match crate::demo::run_examples(&args.out) {
                Ok(r) => r,
                Err(e) => {
                    eprintln!("error: demo: example suite: {e}");
                    return super::EXIT_BAD_INPUT;
                }
            };
            let (passed, failed, errors) = crate::check::diff::counts(&results);
            let mut line = format!("example suite: {passed} passed, {failed} failed");
            if errors > 0 {
                line.push_str(&format!(", {errors} could not run"));
            }
            println!("{line} ({})", args.out.join("cases.toml").display());
            for o in &outcomes {
                println!("\n{}", o.id);
                match &o.top {
                    Some(t) => println!("  top explanation: {t} ({} in all)", o.explanations),
                    None => println!("  no explanation"),
                }
                if o.unexplained > 0 {
                    println!("  unexplained findings: {}", o.unexplained);
                }
                if o.abnormalities > 0 {
                    println!(
                        "  abnormalities (suspended normal-anatomy defaults): {}",
                        o.abnormalities
                    );
                }
                println!("  open: {}", o.dir.join("report.html").display());
            }
            println!(
                "\nDone in {:.1} s. Every draft carries the caution: {}",
                start.elapsed().as_secs_f64(),
                crate::render::CAUTION
            );
            if failed + errors > 0 {
                for r in results
                    .iter()
                    .filter(|r| r.status != crate::check::Status::Pass)
                {
                    eprint!("{}", crate::check::diff::case_text(r));
                }
                eprintln!("error: demo: the example suite did not pass");
                return super::EXIT_FAILED;
            }
            super::EXIT_OK
        }
        Err(e) => {
            eprintln!("error: demo: {e}");
            super::EXIT_BAD_INPUT
        }
    }
}

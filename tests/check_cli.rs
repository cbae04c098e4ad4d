//! `wherefore check`: every kind of expectation passing and failing, exit codes, the diff,
//! JUnit XML, the baseline comparison, `--accept` and `--init`, and bad input.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};
use wherefore::check::{self, RunOptions, Status, baseline, diff};

fn fixtures() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/check")
}

fn wherefore(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .args(args)
        .output()
        .expect("wherefore runs")
}

fn text(o: &Output) -> String {
    format!(
        "{}{}",
        String::from_utf8_lossy(&o.stdout),
        String::from_utf8_lossy(&o.stderr)
    )
}

fn temp(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("wf-check-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn run(path: &Path, opts: &RunOptions) -> Vec<check::CaseResult> {
    let suite = check::load_paths(&[path.to_path_buf()]).expect("suite reads");
    check::run_suite(&suite.cases, opts)
}

/// The keys of the expectations written in the fixture file, in order, per case.
fn keys(r: &check::CaseResult) -> Vec<String> {
    r.checks.iter().map(|c| c.key.clone()).collect()
}

#[test]
fn every_kind_of_expectation_passes_on_hand_derived_values() {
    // Values hand-derived in tests/fixtures/check/small/cases.toml: Jack and Jill (Hlávková,
    // Homola, Koopmann & Pukancová, DL 2022), Schlobach & Cornet (IJCAI 2003) MUPS example,
    // and two toy KBs of our own whose consequences are one or two axioms deep.
    let results = run(&fixtures().join("small"), &RunOptions::default());
    for r in &results {
        assert_eq!(r.status, Status::Pass, "{}", diff::case_text(r));
    }
    let mut all: Vec<String> = results.iter().flat_map(keys).collect();
    all.sort();
    all.dedup();
    // Every kind the format offers is exercised.
    assert_eq!(
        all,
        [
            "abnormalities",
            "absent",
            "consistent",
            "entailed",
            "max_rank",
            "not_entailed",
            "present",
            "satisfiable",
            "text.formal.contains",
            "text.formal.lacks",
            "top",
            "unexplained",
            "unsatisfiable"
        ]
    );
    // Jack and Jill: three explanations of size 1, ranked by text (README, explain).
    let jj = &results[0].outcome;
    assert_eq!(
        jj.explanations.as_ref().unwrap(),
        &vec![
            vec!["ClassAssertion(<http://ex.org/jj#Father> <http://ex.org/jj#jack>)".to_string()],
            vec!["ClassAssertion(<http://ex.org/jj#Mother> <http://ex.org/jj#jack>)".to_string()],
            vec!["ClassAssertion(<http://ex.org/jj#Parent> <http://ex.org/jj#jack>)".to_string()],
        ]
    );
    let o = wherefore(&["check", fixtures().join("small").to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o));
    assert!(
        text(&o).contains("6 cases: 6 passed, 0 failed"),
        "{}",
        text(&o)
    );
}

#[test]
fn every_kind_of_expectation_fails_when_wrong_and_the_diff_names_it() {
    // tests/fixtures/check/failing/cases.toml holds the same questions with wrong answers.
    let results = run(&fixtures().join("failing"), &RunOptions::default());
    for r in &results {
        assert_eq!(r.status, Status::Fail, "{}", diff::case_text(r));
        for c in &r.checks {
            assert!(!c.passed, "{}: expect.{} should fail", r.spec.name, c.key);
        }
    }
    let mut all: Vec<String> = results.iter().flat_map(keys).collect();
    all.sort();
    all.dedup();
    assert_eq!(all.len(), 13, "{all:?}");
    let o = wherefore(&["check", fixtures().join("failing").to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o));
    let t = text(&o);
    // The diff names the expectation, where it is written, and expected against actual
    // (Jack and Jill: Father(jack) ranks first, not Parent(jack)).
    assert!(t.contains("FAIL  jack-is-happy-wrong"), "{t}");
    assert!(
        t.contains("expect.top (") && t.contains("cases.toml:17): - expected, + actual"),
        "{t}"
    );
    assert!(
        t.contains(
            "      - ClassAssertion(jj:Parent jj:jack)\n      + ClassAssertion(jj:Father jj:jack)"
        ),
        "{t}"
    );
    // Schlobach & Cornet: A7 is unsatisfiable.
    assert!(t.contains("+ unsatisfiable: sc:A7"), "{t}");
    // Mother(jack) is an explanation, at rank 2 of Father, Mother, Parent.
    assert!(
        t.contains("+ found at rank 2: {ClassAssertion(jj:Mother jj:jack)}"),
        "{t}"
    );
    assert!(
        t.contains("+ rank 3: {ClassAssertion(jj:Parent jj:jack)}"),
        "{t}"
    );
    assert!(
        t.contains("+ not entailed: ObjectPropertyAssertion(d:closeTo d:k1 d:m1)"),
        "{t}"
    );
    assert!(
        t.contains("+ SubClassOf(d:Kidney ObjectComplementOf(d:LowLying))"),
        "{t}"
    );
    assert!(t.contains("5 cases: 0 passed, 5 failed"), "{t}");
}

#[test]
fn demo_cases_from_facts() {
    // Expectations from the demo's hand-derived interpretations (README, demo; and
    // tests/demo_end_to_end.rs): case 01 is a simple hepatic cyst first of three, case 04
    // suspends the right-kidney default, case 05 leaves the finding unexplained.
    let results = run(&fixtures().join("demo"), &RunOptions::default());
    for r in &results {
        assert_eq!(r.status, Status::Pass, "{}", diff::case_text(r));
    }
    assert_eq!(results.len(), 3);
    assert_eq!(results[0].outcome.explanations.as_ref().unwrap().len(), 3);
}

#[test]
fn junit_report_lists_each_case_with_failures_and_counts() {
    let dir = temp("junit");
    let out = dir.join("report.xml");
    let o = wherefore(&[
        "check",
        fixtures().join("failing").to_str().unwrap(),
        fixtures().join("small").to_str().unwrap(),
        "--junit",
        out.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o));
    let xml = std::fs::read_to_string(&out).unwrap();
    // Structure of the Apache Ant JUnit schema (windyroad/JUnit-Schema JUnit.xsd): one
    // testsuite per case file with its counts; full validation: scripts/validate-junit.
    assert!(xml.starts_with("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<testsuites>\n"));
    assert_eq!(xml.matches("<testsuite ").count(), 2);
    assert_eq!(xml.matches("<testcase ").count(), 11);
    assert_eq!(xml.matches("<failure ").count(), 5);
    assert!(
        xml.contains("tests=\"5\" failures=\"5\" errors=\"0\""),
        "{xml}"
    );
    assert!(
        xml.contains("tests=\"6\" failures=\"0\" errors=\"0\""),
        "{xml}"
    );
    assert!(xml.contains("<properties/>") && xml.contains("<system-err/>"));
    assert!(
        xml.contains("message=\"failed: expect.consistent, expect.top,"),
        "{xml}"
    );
    // Escaping: the diff's '<' of full IRIs never appears raw in text.
    assert!(!xml.contains("<http"));
}

#[test]
fn junit_timestamps_are_utc_civil_dates() {
    use std::time::{Duration, UNIX_EPOCH};
    // 2000-02-29T12:34:56Z is 951827696 s after the epoch (from memory; checkable with
    // `date -u -d @951827696`).
    assert_eq!(
        check::junit::iso_utc(UNIX_EPOCH + Duration::from_secs(951_827_696)),
        "2000-02-29T12:34:56"
    );
    assert_eq!(check::junit::iso_utc(UNIX_EPOCH), "1970-01-01T00:00:00");
}

#[test]
fn removing_one_subclass_axiom_changes_exactly_the_dependent_cases() {
    // lesions.ofn with SubClassOf(:RenalCyst :CysticLesion) removed: the cases
    // "cystic-lesion" (loses {RenalCyst(c1)}) and "renal-cyst-is-cystic" (CysticLesion(r1)
    // no longer entailed) depend on it; "solid-lesion" and "hepatic-cyst-is-cystic" do not.
    let src = fixtures().join("baseline");
    let dir = temp("baseline");
    for f in ["cases.toml", "lesions.abducibles"] {
        std::fs::copy(src.join(f), dir.join(f)).unwrap();
    }
    let kb = std::fs::read_to_string(src.join("lesions.ofn")).unwrap();
    let edited: String = kb
        .lines()
        .filter(|l| *l != "SubClassOf(:RenalCyst :CysticLesion)")
        .map(|l| format!("{l}\n"))
        .collect();
    assert_eq!(edited.lines().count() + 1, kb.lines().count());
    std::fs::write(dir.join("lesions.ofn"), edited).unwrap();

    let suite = check::load_paths(std::slice::from_ref(&dir)).unwrap();
    let opts = RunOptions {
        explain_always: true,
        ..Default::default()
    };
    let now = check::run_suite(&suite.cases, &opts);
    let before = check::run_suite(
        &suite.cases,
        &RunOptions {
            replace: baseline::replacements(&[src.join("lesions.ofn")]).unwrap(),
            ..opts.clone()
        },
    );
    let changes = baseline::compare_runs(&before, &now);
    let c1 = "<http://ex.org/les#c1>";
    assert_eq!(
        changes,
        vec![
            baseline::CaseChanges {
                name: "cystic-lesion".into(),
                changes: vec![baseline::Change::LostExplanation(
                    vec![format!(
                        "ClassAssertion(<http://ex.org/les#RenalCyst> {c1})"
                    )],
                    2
                )],
            },
            baseline::CaseChanges {
                name: "renal-cyst-is-cystic".into(),
                changes: vec![baseline::Change::Entailment(
                    "ClassAssertion(<http://ex.org/les#CysticLesion> <http://ex.org/les#r1>)"
                        .into(),
                    "entailed".into(),
                    "not entailed".into()
                )],
            },
        ]
    );
    // The same through the command line, with the older KB's folder.
    let o = wherefore(&[
        "check",
        dir.to_str().unwrap(),
        "--baseline",
        src.to_str().unwrap(),
    ]);
    let t = text(&o);
    assert_eq!(o.status.code(), Some(1), "{t}");
    assert!(
        t.contains("Compared with the baseline KB: 2 of 4 cases changed"),
        "{t}"
    );
    assert!(t.contains("CHANGED cystic-lesion\n    lost explanation (was rank 2): {ClassAssertion(l:RenalCyst l:c1)}"), "{t}");
    assert!(t.contains("CHANGED renal-cyst-is-cystic\n    entailment of ClassAssertion(l:CysticLesion l:r1): entailed → not entailed"), "{t}");
    assert!(!t.contains("CHANGED solid-lesion") && !t.contains("CHANGED hepatic-cyst"));
}

#[test]
fn baseline_reports_new_explanations_and_changed_ranking() {
    use check::Outcome;
    // Hand-made outcomes: {B} appears at rank 1 and {A}, {C} swap places.
    let ex = |v: &[&str]| v.iter().map(|s| vec![s.to_string()]).collect::<Vec<_>>();
    let before = Outcome {
        explanations: Some(ex(&["A", "C"])),
        ..Default::default()
    };
    let now = Outcome {
        explanations: Some(ex(&["B", "C", "A"])),
        ..Default::default()
    };
    assert_eq!(
        baseline::compare(&before, &now),
        vec![
            baseline::Change::NewExplanation(vec!["B".into()], 1),
            baseline::Change::Ranking(
                vec![(vec!["C".into()], 2, 2), (vec!["A".into()], 1, 3)]
                    .into_iter()
                    .filter(|(_, b, n)| b != n)
                    .collect()
            ),
        ]
    );
}

const COMMENTED: &str = r#"# Suite header comment: must survive.
[prefixes]
jj = "http://ex.org/jj#"

[[case]]
name = "passing"  # untouched
kb = ["KB"]
assertions = "ClassAssertion(jj:Happy jj:jack)"
abducibles = "ABD"

[case.expect]
top = [ "ClassAssertion(jj:Father   jj:jack)" ]   # odd spacing kept: the case passes

[[case]]
name = "failing"
kb = ["KB"]
assertions = "ClassAssertion(jj:Happy jj:jack)"
abducibles = "ABD"

[case.expect]
# Comment above a failing expectation: must survive.
top = ["ClassAssertion(jj:Parent jj:jack)"]  # trailing comment
absent = [
    ["ClassAssertion(jj:Mother jj:jill)"],  # holds
    ["ClassAssertion(jj:Mother jj:jack)"],  # does not hold
]
consistent = false
"#;

fn commented_suite(dir: &Path) -> PathBuf {
    let explain = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/explain");
    let text = COMMENTED
        .replace("KB", &explain.join("jack-jill.ofn").display().to_string())
        .replace(
            "ABD",
            &explain.join("jack-jill.abducibles").display().to_string(),
        );
    let p = dir.join("cases.toml");
    std::fs::write(&p, text).unwrap();
    p
}

#[test]
fn accept_rewrites_failing_expectations_only_and_keeps_comments() {
    let dir = temp("accept");
    let p = commented_suite(&dir);
    let before = std::fs::read_to_string(&p).unwrap();
    // Not on a terminal and without --yes: refuse, write nothing.
    let o = wherefore(&["check", p.to_str().unwrap(), "--accept"]);
    assert_eq!(o.status.code(), Some(2), "{}", text(&o));
    assert_eq!(std::fs::read_to_string(&p).unwrap(), before);
    let o = wherefore(&["check", p.to_str().unwrap(), "--accept", "--yes"]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o));
    let after = std::fs::read_to_string(&p).unwrap();
    for keep in [
        "# Suite header comment: must survive.",
        "name = \"passing\"  # untouched",
        "top = [ \"ClassAssertion(jj:Father   jj:jack)\" ]   # odd spacing kept: the case passes",
        "# Comment above a failing expectation: must survive.",
        "    [\"ClassAssertion(jj:Mother jj:jill)\"],  # holds",
    ] {
        assert!(after.contains(keep), "lost {keep:?}:\n{after}");
    }
    // Jack and Jill: Father(jack) is the top explanation, Mother(jack) is one, and the KB has
    // no disjointness so it is consistent.
    assert!(
        after.contains("top = [\"ClassAssertion(jj:Father jj:jack)\"]  # trailing comment"),
        "{after}"
    );
    assert!(!after.contains("does not hold"), "{after}");
    assert!(after.contains("consistent = true"), "{after}");
    let o = wherefore(&["check", p.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o));
}

#[test]
fn accept_that_fails_midway_leaves_the_file_intact() {
    let dir = temp("accept-fail");
    let p = commented_suite(&dir);
    let before = std::fs::read_to_string(&p).unwrap();
    // The atomic write goes through `.cases.toml.<pid>.tmp` beside the file; a folder in its
    // place makes the write fail after the new text was built. Run in this process so that
    // the pid is ours.
    let blocker = dir.join(format!(".cases.toml.{}.tmp", std::process::id()));
    std::fs::create_dir_all(blocker.join("x")).unwrap();
    let code = wherefore::cli::main_with_args([
        "wherefore",
        "check",
        p.to_str().unwrap(),
        "--accept",
        "--yes",
    ]);
    assert_eq!(code, 2);
    assert_eq!(std::fs::read_to_string(&p).unwrap(), before);
    // A plan whose text would not read back is refused before anything is written.
    let suite = check::load_paths(std::slice::from_ref(&p)).unwrap();
    let mut results = check::run_suite(&suite.cases, &RunOptions::default());
    for r in &mut results {
        for c in &mut r.checks {
            if !c.passed {
                c.key = "no_such_key".into();
            }
        }
    }
    assert!(check::accept::plan(&results).is_err());
    assert_eq!(std::fs::read_to_string(&p).unwrap(), before);
}

#[test]
fn init_scaffolds_a_suite_that_passes_and_never_overwrites() {
    let dir = temp("init").join("suite");
    let o = wherefore(&["check", "--init", dir.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o));
    let o = wherefore(&["check", dir.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o));
    assert!(
        text(&o).contains("3 cases: 3 passed, 0 failed"),
        "{}",
        text(&o)
    );
    let o = wherefore(&["check", "--init", dir.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(2), "{}", text(&o));
    assert!(text(&o).contains("already exists"));
}

fn bad_case(name: &str, body: &str) -> (PathBuf, Output) {
    let dir = temp(name);
    let p = dir.join("cases.toml");
    let explain = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/explain");
    std::fs::write(
        &p,
        body.replace("KB", &explain.join("jack-jill.ofn").display().to_string()),
    )
    .unwrap();
    let o = wherefore(&["check", p.to_str().unwrap()]);
    (p, o)
}

#[test]
fn bad_input_names_file_and_line_and_exits_2() {
    // A missing KB file.
    let (p, o) = bad_case(
        "missing-kb",
        "[[case]]\nname = \"a\"\nkb = [\"nowhere.ofn\"]\n[case.expect]\nconsistent = true\n",
    );
    assert_eq!(o.status.code(), Some(2), "{}", text(&o));
    assert!(
        text(&o).contains(&format!("{}:3:", p.display())),
        "{}",
        text(&o)
    );
    assert!(text(&o).contains("nowhere.ofn"), "{}", text(&o));
    // Malformed TOML (an unclosed string on line 2).
    let (p, o) = bad_case("malformed", "[[case]]\nname = \"a\nkb = [\"KB\"]\n");
    assert_eq!(o.status.code(), Some(2), "{}", text(&o));
    assert!(
        text(&o).contains(&format!("{}:2: malformed TOML", p.display())),
        "{}",
        text(&o)
    );
    // An expectation naming an unknown class (line 5).
    let (p, o) = bad_case(
        "unknown-class",
        "[prefixes]\njj = \"http://ex.org/jj#\"\n[[case]]\nname = \"a\"\nkb = [\"KB\"]\n[case.expect]\nentailed = [\n  \"ClassAssertion(jj:Hapy jj:jack)\",\n]\n",
    );
    assert_eq!(o.status.code(), Some(2), "{}", text(&o));
    assert!(
        text(&o).contains(&format!("{}:8:", p.display())),
        "{}",
        text(&o)
    );
    assert!(text(&o).contains("<http://ex.org/jj#Hapy>"), "{}", text(&o));
    let (p, o) = bad_case(
        "unknown-sat-class",
        "[[case]]\nname = \"a\"\nkb = [\"KB\"]\n[case.expect]\nsatisfiable = [\"<http://ex.org/jj#Nobody>\"]\n",
    );
    assert_eq!(o.status.code(), Some(2), "{}", text(&o));
    assert!(
        text(&o).contains(&format!("{}:5:", p.display())),
        "{}",
        text(&o)
    );
    // An unknown key, named with its line.
    let (p, o) = bad_case(
        "unknown-key",
        "[[case]]\nname = \"a\"\nkb = [\"KB\"]\n[case.expect]\nconsistent = true\nentialed = []\n",
    );
    assert_eq!(o.status.code(), Some(2), "{}", text(&o));
    assert!(
        text(&o).contains(&format!("{}:6: unknown key `entialed`", p.display())),
        "{}",
        text(&o)
    );
}

#[test]
fn line_diff_marks_expected_and_actual_lines() {
    // Longest-common-subsequence diff (common practice, as in `diff`).
    let s = |v: &[&str]| v.iter().map(|x| x.to_string()).collect::<Vec<_>>();
    let d = diff::line_diff(&s(&["a", "b", "c"]), &s(&["a", "c", "d"]));
    assert_eq!(
        d,
        vec![
            (' ', "a".to_string()),
            ('-', "b".to_string()),
            (' ', "c".to_string()),
            ('+', "d".to_string())
        ]
    );
}

#[test]
fn prefixed_names_shorten_and_expand_consistently() {
    // Functional-syntax prefixed names (OWL 2 Structural Specification, §2.4).
    let p = vec![("ex".to_string(), "http://ex.org/a#".to_string())];
    assert_eq!(
        check::suite::abbreviate(
            "ClassAssertion(<http://ex.org/a#B> <http://ex.org/a#b1>)",
            &p
        ),
        "ClassAssertion(ex:B ex:b1)"
    );
    // A local part that is not a plain name stays a full IRI.
    assert_eq!(
        check::suite::abbreviate("<http://ex.org/a#x/y>", &p),
        "<http://ex.org/a#x/y>"
    );
    assert_eq!(
        check::suite::expand_name("ex:B", &p).as_deref(),
        Some("http://ex.org/a#B")
    );
    assert_eq!(check::suite::expand_name("zz:B", &p), None);
}

#[test]
fn the_readme_example_runs_and_passes() {
    // The README's case file, laid out as it says, on the demo's own facts and label maps
    // (its expectations are the demo's hand-derived interpretation of case 01).
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let readme = std::fs::read_to_string(root.join("README.md")).unwrap();
    let start = readme
        .find("### check")
        .expect("README has a check section");
    let block = &readme[start..];
    let open = block.find("```toml\n").unwrap() + "```toml\n".len();
    let toml = &block[open..open + block[open..].find("```").unwrap()];
    let dir = temp("readme");
    let suite = dir.join("suite");
    std::fs::create_dir_all(suite.join("cases/01")).unwrap();
    std::fs::create_dir_all(suite.join("cases/02")).unwrap();
    std::fs::create_dir_all(dir.join("ontologies")).unwrap();
    for f in ["abdomen.ofn", "spatial.ofn"] {
        std::fs::copy(
            root.join("ontologies").join(f),
            dir.join("ontologies").join(f),
        )
        .unwrap();
    }
    let demo = fixtures().join("demo");
    std::fs::copy(
        demo.join("01-facts.json"),
        suite.join("cases/01/facts.json"),
    )
    .unwrap();
    for f in ["organs.nii.gz", "lesions.nii.gz", "labels.tsv"] {
        std::fs::copy(demo.join("maps01").join(f), suite.join("cases/02").join(f)).unwrap();
    }
    std::fs::write(
        suite.join("cysts.abducibles"),
        "class https://wherefore.example.org/ns/abdomen#SimpleHepaticCyst\n",
    )
    .unwrap();
    std::fs::write(suite.join("cases.toml"), toml).unwrap();
    let o = wherefore(&["check", suite.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o));
    assert!(
        text(&o).contains("3 cases: 3 passed, 0 failed"),
        "{}",
        text(&o)
    );
}

#[test]
fn a_reached_limit_is_exit_code_3_and_named() {
    // Contract: exit code 3 when a resource limit was reached. Jack and Jill's KB has two
    // individuals, so its consistency test needs two completion-graph nodes.
    let o = wherefore(&[
        "check",
        fixtures().join("small").to_str().unwrap(),
        "--max-graph-nodes",
        "1",
    ]);
    assert_eq!(o.status.code(), Some(3), "{}", text(&o));
    assert!(
        text(&o).contains("node limit of the completion graph reached"),
        "{}",
        text(&o)
    );
}

#[test]
fn a_missing_facts_file_names_the_case() {
    let (p, o) = bad_case(
        "missing-facts",
        "[[case]]\nname = \"a\"\nkb = [\"KB\"]\nfacts = \"nowhere.json\"\n[case.expect]\ntop = []\n",
    );
    assert_eq!(o.status.code(), Some(2), "{}", text(&o));
    assert!(
        text(&o).contains(&format!("{}:1: case \"a\"", p.display())),
        "{}",
        text(&o)
    );
    assert!(
        text(&o).contains("nowhere.json: cannot read"),
        "{}",
        text(&o)
    );
}

//! Scripted shell sessions, snapshotted with insta. The expected answers in the snapshots
//! were checked by hand against the fixtures (tests/fixtures/shell/organs.ofn is ours; the
//! demo ontologies are in ontologies/); the assertions beside the snapshots state the facts
//! that matter. Timings are replaced by `[time]` so that the snapshots are deterministic.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use wherefore::kb::load;
use wherefore::shell::{Session, run_script};

const ORGANS: &str = "tests/fixtures/shell/organs.ofn";

/// Replaces every `[12.3 ms]` with `[time]`.
fn strip_times(s: &str) -> String {
    let mut out = String::new();
    let mut rest = s;
    while let Some(i) = rest.find('[') {
        out.push_str(&rest[..i]);
        let after = &rest[i + 1..];
        match after.find(" ms]") {
            Some(j) if after[..j].chars().all(|c| c.is_ascii_digit() || c == '.') && j > 0 => {
                out.push_str("[time]");
                rest = &after[j + 4..];
            }
            _ => {
                out.push('[');
                rest = after;
            }
        }
    }
    out.push_str(rest);
    out
}

/// Runs a script and returns the session log (commands and outputs, errors included).
fn session_log(s: &mut Session, script: &str) -> String {
    let mut out = String::new();
    for line in script.lines() {
        if line.trim().is_empty() {
            continue;
        }
        out.push_str(&format!("{}{line}\n", s.prompt()));
        match s.execute(line) {
            Ok(t) => out.push_str(&t),
            Err(e) => out.push_str(&format!("{e}\n")),
        }
    }
    strip_times(&out)
}

fn temp_dir(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("wf-shell-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn bin() -> PathBuf {
    PathBuf::from(env!("CARGO_BIN_EXE_wherefore"))
}

#[test]
fn every_command_on_the_organs_fixture() {
    let mut s = Session::default();
    let t = session_log(
        &mut s,
        &format!(
            "help
help ask
load {ORGANS}
status
show Liver
show liver1
show 'simple cyst'
show partOf
tree
tree Organ
unsat
ask Liver SubClassOf Organ
ask Liver SubClassOf Kidney
ask Liver and Kidney
ask liver1 Type Organ
ask lesion1 partOf liver1
ask
ask ObjectIntersectionOf(:Liver :Organ)
add :Bad SubClassOf Liver and Kidney
unsat
why unsat Bad
repairs unsat Bad
why Liver SubClassOf Organ
why
undo
unsat
redo
retract DisjointClasses(:Liver :Kidney)
unsat
undo
undo
status
explain lesion1 Type HepaticFinding --abducibles tests/fixtures/shell/organs.abducibles
explain lesion1 Type HepaticFinding --abducibles tests/fixtures/shell/organs.abducibles --max-size 0
quit"
        ),
    );
    // Hand-checked facts: Liver ⊑ Organ is told; Liver and Kidney are disjoint, so
    // Liver ⊓ Kidney is unsatisfiable and so is Bad ⊑ Liver ⊓ Kidney, with the one
    // justification {Bad ⊑ Liver ⊓ Kidney, Disjoint(Liver, Kidney)}; Cyst(lesion1) explains
    // HepaticFinding(lesion1) through partOf(lesion1, liver1) and Liver(liver1).
    assert!(t.contains("ask Liver SubClassOf Organ\nYes"));
    assert!(t.contains("ask Liver SubClassOf Kidney\nNo"));
    assert!(t.contains("satisfiable: No"));
    assert!(t.contains("1 unsatisfiable: Bad"));
    assert!(t.contains("ClassAssertion(Cyst lesion1)"));
    assert!(s.wants_quit());
    insta::assert_snapshot!("organs_every_command", t);
}

#[test]
fn ambiguous_labels_and_bad_input_never_end_the_session() {
    let mut s = Session::default();
    s.load_files(&[PathBuf::from(ORGANS)]).unwrap();
    let t = session_log(
        &mut s,
        "show node
ask Liver SubClassOf Kidnee
ask Liver and (Kidney or Organ
ask SubClassOf(:Liver :Organ
add SubClassOf(:Foo ObjectHasSelf(:partOf))
add :Foo SubClassOf partOf Self
ask partOf some xsd:string
frobnicate
explain
retract Liver SubClassOf Kidney
tree Spleen
undo
import nowhere.json as observations
save
ask Liver SubClassOf Organ
status",
    );
    // "node" labels both LymphNode and NodeOfRanvier (the fixture), so it is ambiguous.
    assert!(t.contains("ambiguous: `node` may be <http://ex.org/organs#LymphNode> (class), <http://ex.org/organs#NodeOfRanvier> (class)"));
    // `Kidnee` starts at column 21 of "ask Liver SubClassOf Kidnee" (counted by hand).
    assert!(t.contains("error (column 22): unknown class `Kidnee`"));
    assert!(t.contains("ask Liver SubClassOf Organ\nYes"));
    assert!(s.edits().is_empty());
    insta::assert_snapshot!("bad_input", t);
}

#[test]
fn reload_after_the_file_changed_keeps_the_edits() {
    let dir = temp_dir("reload");
    let file = dir.join("organs.ofn");
    std::fs::copy(ORGANS, &file).unwrap();
    let mut s = Session::default();
    s.load_files(std::slice::from_ref(&file)).unwrap();
    let mut t = session_log(
        &mut s,
        "add :Spleen SubClassOf Organ
reload
ask Lesion SubClassOf Finding",
    );
    let text = std::fs::read_to_string(&file).unwrap();
    let changed = text.trim_end().trim_end_matches(')').to_string()
        + "Declaration(Class(:Finding))\nSubClassOf(:Lesion :Finding)\n)\n";
    std::fs::write(&file, changed).unwrap();
    t.push_str(&session_log(
        &mut s,
        "reload
ask Lesion SubClassOf Finding
ask Spleen SubClassOf Organ
status",
    ));
    let t = t.replace(&dir.display().to_string(), "$TMP");
    // Before the change Lesion ⊑ Finding cannot be asked (Finding is unknown); after it,
    // it is told, and the session's own edit (Spleen ⊑ Organ) still holds.
    assert!(t.contains("reloaded (changed on disk: $TMP/organs.ofn); 1 of 1 edits applied again"));
    assert!(t.contains("ask Lesion SubClassOf Finding\nYes"));
    assert!(t.contains("ask Spleen SubClassOf Organ\nYes"));
    insta::assert_snapshot!("reload", t);
}

#[test]
fn save_round_trips_through_the_parser() {
    let dir = temp_dir("save");
    let file = dir.join("organs.ofn");
    std::fs::copy(ORGANS, &file).unwrap();
    let mut s = Session::default();
    s.load_files(std::slice::from_ref(&file)).unwrap();
    let out = dir.join("edited.ofn");
    let t = session_log(
        &mut s,
        &format!(
            "add :Spleen SubClassOf Organ and (partOf only not Lesion)
add :spleen1 Type Spleen
retract Cyst SubClassOf Lesion
save {}
status",
            out.display()
        ),
    );
    assert!(!s.unsaved(), "{t}");
    // Load the saved file afresh and compare the axiom sets.
    let fresh = load::load(std::slice::from_ref(&out), &load::LoadOptions::default()).unwrap();
    assert_eq!(Session::axiom_set(&fresh), Session::axiom_set(s.kb()));
    assert!(
        !Session::axiom_set(&fresh)
            .contains("SubClassOf(<http://ex.org/organs#Cyst> <http://ex.org/organs#Lesion>)")
    );
    // Saving over the loaded file needs a confirmation and keeps the old version.
    let t2 = session_log(
        &mut s,
        "add :Gut SubClassOf Organ\nsave\nsave --yes\nstatus",
    );
    let bak = dir.join("organs.ofn.bak");
    assert_eq!(
        std::fs::read_to_string(&bak).unwrap(),
        std::fs::read_to_string(ORGANS).unwrap()
    );
    let again = load::load(std::slice::from_ref(&file), &load::LoadOptions::default()).unwrap();
    assert!(
        Session::axiom_set(&again)
            .contains("SubClassOf(<http://ex.org/organs#Gut> <http://ex.org/organs#Organ>)")
    );
    assert_eq!(Session::axiom_set(&again), Session::axiom_set(s.kb()));
    let all = format!("{t}{t2}").replace(&dir.display().to_string(), "$TMP");
    insta::assert_snapshot!("save", all);
}

#[test]
fn saving_to_an_unwritable_place_keeps_the_edits() {
    let dir = temp_dir("unwritable");
    // A path under a regular file cannot be created, whoever runs the test.
    let blocker = dir.join("plain-file");
    std::fs::write(&blocker, "x").unwrap();
    let mut s = Session::default();
    s.load_files(&[PathBuf::from(ORGANS)]).unwrap();
    s.execute("add :Spleen SubClassOf Organ").unwrap();
    let e = s
        .execute(&format!("save {}", blocker.join("out.ofn").display()))
        .unwrap_err();
    assert!(e.message.contains("your edits are kept"), "{e}");
    assert_eq!(s.edits().len(), 1);
    assert!(s.unsaved());
    assert!(s.prompt().ends_with("*> "));
    assert_eq!(
        strip_times(&s.execute("ask Spleen SubClassOf Organ").unwrap()),
        "Yes [time]\n"
    );
}

#[test]
fn demo_kb_facts_as_observations_and_background() {
    let mut s = Session::default();
    let t = session_log(
        &mut s,
        "load ontologies/abdomen.ofn
import tests/fixtures/shell/deep-liver-lesion.facts.json as observations
explain --max-size 1
import tests/fixtures/shell/deep-liver-lesion.facts.json as background
show lesion1
ask lesion1 Type FocalLesion
undo
ask lesion1 Type FocalLesion",
    );
    // The demo's first case: a lesion deep inside the liver; the top explanation is a
    // simple hepatic cyst (README, demo section).
    assert!(t.contains("1. score"));
    assert!(t.contains("SimpleHepaticCyst"));
    insta::assert_snapshot!("demo_facts", t);
}

#[test]
fn unload_and_a_second_file() {
    let mut s = Session::default();
    let t = session_log(
        &mut s,
        &format!(
            "load {ORGANS} tests/fixtures/explain/jack-jill.ofn
status
ask jack Type Person
unload jack-jill.ofn
ask jack Type Person
status"
        ),
    );
    assert!(t.contains("ask jack Type Person\nYes"));
    assert!(t.contains("unknown individual `jack`"));
    insta::assert_snapshot!("unload", t);
}

#[test]
fn script_mode_stops_at_the_first_error_with_exit_code_2() {
    let dir = temp_dir("script");
    let script = dir.join("s.wf");
    std::fs::write(
        &script,
        "# a comment\nask Liver SubClassOf Organ\nask Liver and (Kidney\n  or Organ)\nask Liver SubClassOf Kidnee\nask Liver SubClassOf Organ\n",
    )
    .unwrap();
    let o = Command::new(bin())
        .args(["shell", ORGANS, "--script"])
        .arg(&script)
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(2));
    let out = String::from_utf8_lossy(&o.stdout);
    let err = String::from_utf8_lossy(&o.stderr);
    // Two commands ran (the second over two lines), the third failed on line 5.
    assert_eq!(out.matches("organs> ").count(), 3, "{out}");
    assert!(out.contains("satisfiable: Yes"));
    assert!(err.contains("s.wf:5: stopped at the first error"), "{err}");
    // The same commands on standard input (not a terminal), without the bad line.
    let mut child = Command::new(bin())
        .args(["shell", ORGANS])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    use std::io::Write;
    child
        .stdin
        .take()
        .unwrap()
        .write_all(b"ask Liver SubClassOf Organ\nunsat\n")
        .unwrap();
    let o = child.wait_with_output().unwrap();
    assert_eq!(o.status.code(), Some(0));
    assert!(String::from_utf8_lossy(&o.stdout).contains("Yes"));
}

#[test]
fn run_script_joins_unbalanced_lines() {
    let mut s = Session::default();
    s.load_files(&[PathBuf::from(ORGANS)]).unwrap();
    let mut out = String::new();
    run_script(&mut s, "ask Liver and (Kidney or\n   Organ)\n", |t| {
        out.push_str(t)
    })
    .unwrap();
    // Liver ⊓ (Kidney ⊔ Organ) is satisfiable: Liver ⊑ Organ (fixture).
    assert!(
        strip_times(&out).ends_with("satisfiable: Yes [time]\n"),
        "{out}"
    );
    let e = run_script(&mut s, "ask (Liver\n", |_| {}).unwrap_err();
    assert_eq!(e.0, 1);
}

#[test]
fn history_goes_under_the_data_directory() {
    // $XDG_DATA_HOME is honoured (XDG Base Directory Specification 0.8).
    let p: &Path = &PathBuf::from("/x/wherefore/shell-history");
    let got = {
        // SAFETY: tests in this file do not read the variable concurrently.
        unsafe { std::env::set_var("XDG_DATA_HOME", "/x") };
        wherefore::cli::shell::history_path()
    };
    assert_eq!(got.as_deref(), Some(p));
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig::with_cases(24))]

    /// Law: undo is the inverse of an edit, so undoing every edit restores the loaded axiom
    /// set, and redoing them all gives back the edited one (whatever the order of adds and
    /// retractions, including repeated ones).
    #[test]
    fn undo_and_redo_are_inverse(ops in proptest::collection::vec((0usize..4, proptest::bool::ANY), 1..7)) {
        let adds = [
            "Kidney SubClassOf Lesion",
            ":X SubClassOf Organ and (partOf some Liver)",
            "liver1 Type Kidney",
            "Liver SubClassOf Organ",
        ];
        let retracts = [
            "Liver SubClassOf Organ",
            "Cyst SubClassOf Lesion",
            "DisjointClasses(:Liver :Kidney)",
            "liver1 Type Liver",
        ];
        let mut s = Session::default();
        s.load_files(&[PathBuf::from(ORGANS)]).unwrap();
        let start = Session::axiom_set(s.kb());
        let mut n = 0;
        for (i, add) in ops {
            let cmd = if add {
                format!("add {}", adds[i])
            } else {
                format!("retract {}", retracts[i])
            };
            if s.execute(&cmd).is_ok() {
                n += 1;
            }
        }
        proptest::prop_assert_eq!(s.edits().len(), n);
        let edited = Session::axiom_set(s.kb());
        for _ in 0..n {
            s.execute("undo").unwrap();
        }
        proptest::prop_assert_eq!(Session::axiom_set(s.kb()), start);
        proptest::prop_assert!(s.execute("undo").is_err());
        proptest::prop_assert!(!s.unsaved());
        for _ in 0..n {
            s.execute("redo").unwrap();
        }
        proptest::prop_assert_eq!(Session::axiom_set(s.kb()), edited);
    }
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig::with_cases(200))]

    /// Bad input never ends the session: any text after a command that reads expressions
    /// returns (an answer or an error); it never panics or hangs, and a failed command
    /// leaves the edits as they were.
    #[test]
    fn arbitrary_input_never_panics(
        cmd in proptest::sample::select(vec!["ask", "show", "add", "retract", "why", "repairs", "tree", "explain", "help", "frob"]),
        arg in "[A-Za-z:<>(){},'\" é\u{a0}#/_.0-9-]{0,40}",
    ) {
        let mut s = Session::default();
        s.load_files(&[PathBuf::from(ORGANS)]).unwrap();
        let before = s.edits().len();
        let line = format!("{cmd} {arg}");
        match s.execute(&line) {
            Ok(_) => {}
            Err(e) => {
                let _ = e.to_string();
                proptest::prop_assert_eq!(s.edits().len(), before);
            }
        }
        proptest::prop_assert!(s.execute("ask Liver SubClassOf Organ").is_ok());
    }
}

#[test]
fn regression_cases_run_against_the_edited_session_kb() {
    // The demo cases' hand-derived expectations (tests/fixtures/check/demo/cases.toml) hold
    // on the shipped ontology; once the session makes SimpleHepaticCyst unsatisfiable, the
    // deep liver lesion's top explanation must change (the cyst had the highest prior, 0.30)
    // and exactly that case fails, while the files on disk are untouched.
    let mut s = Session::default();
    s.load_files(&[PathBuf::from("ontologies/abdomen.ofn")])
        .unwrap();
    let before = s
        .execute("check tests/fixtures/check/demo/cases.toml")
        .unwrap();
    assert!(before.contains("3 passed, 0 failed"), "{before}");
    s.execute("add SimpleHepaticCyst SubClassOf owl:Nothing")
        .unwrap();
    let after = s
        .execute("check tests/fixtures/check/demo/cases.toml")
        .unwrap();
    assert!(after.contains("FAIL  deep-liver-lesion"), "{after}");
    assert!(after.contains("2 passed, 1 failed"), "{after}");
    assert!(s.execute("check").is_err());
}

#[test]
fn questions_naming_individuals_use_the_abox() {
    // Jack and Jill (Hlávková, Homola, Koopmann & Pukancová, DL 2022): K = {Mother ⊔ Father ⊑
    // Parent, Parent ⊑ Happy, Person(jack), Parent(jill)}. The KB's TBox has no nominal, so
    // a question with {a} must still see the ABox: {jill} ⊑ Happy holds, {jack} ⊑ Happy and
    // {jack, jill} ⊑ Person do not (jill is not said to be a person).
    let mut s = Session::default();
    s.load_files(&[PathBuf::from("tests/fixtures/explain/jack-jill.ofn")])
        .unwrap();
    let ask = |s: &mut Session, q: &str| s.execute(&format!("ask {q}")).unwrap();
    assert!(ask(&mut s, "{jill} SubClassOf Happy").starts_with("Yes"));
    assert!(ask(&mut s, "{jack} SubClassOf Happy").starts_with("No"));
    assert!(ask(&mut s, "{jack, jill} SubClassOf Person").starts_with("No"));
}

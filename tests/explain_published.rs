//! Published worked examples for abduction and justifications, run through the binary.

use serde_json::Value;
use std::process::Command;

fn fixture(name: &str) -> String {
    format!(
        "{}/tests/fixtures/explain/{name}",
        env!("CARGO_MANIFEST_DIR")
    )
}

fn run(args: &[&str]) -> (i32, Value, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .args(args)
        .output()
        .expect("binary runs");
    let stdout = String::from_utf8_lossy(&out.stdout).to_string();
    let v = serde_json::from_str(&stdout).unwrap_or(Value::Null);
    (
        out.status.code().unwrap_or(-1),
        v,
        String::from_utf8_lossy(&out.stderr).to_string(),
    )
}

fn short(s: &str) -> String {
    s.replace("http://ex.org/jj#", "")
        .replace("http://ex.org/sc#", "")
        .replace(['<', '>'], "")
}

#[test]
fn jack_and_jill_explanations() {
    // Hlávková, Homola, Koopmann & Pukancová (DL 2022): K = {Mother ⊔ Father ⊑ Parent,
    // Parent ⊑ Happy, Person(jack), Parent(jill)}, O = Happy(jack), abducibles Mother, Father,
    // Parent: the explanations are {Mother(jack)}, {Father(jack)}, {Parent(jack)}.
    let (code, v, err) = run(&[
        "explain",
        &fixture("jack-jill.ofn"),
        "--observations",
        &fixture("jack-jill.obs.ofn"),
        "--abducibles",
        &fixture("jack-jill.abducibles"),
        "--format",
        "json",
    ]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(v["kb_consistent"], true);
    assert_eq!(v["already_entailed"], false);
    assert_eq!(v["complete"], true);
    let mut got: Vec<String> = v["explanations"]
        .as_array()
        .unwrap()
        .iter()
        .map(|e| {
            e["assertions"]
                .as_array()
                .unwrap()
                .iter()
                .map(|a| short(a.as_str().unwrap()))
                .collect::<Vec<_>>()
                .join(" ")
        })
        .collect();
    got.sort();
    assert_eq!(
        got,
        vec![
            "ClassAssertion(Father jack)",
            "ClassAssertion(Mother jack)",
            "ClassAssertion(Parent jack)"
        ]
    );
}

fn numbered(j: &Value) -> Vec<usize> {
    // Axiom numbers of the published example: the text of each axiom names its subclass Ai.
    let mut v: Vec<usize> = j
        .as_array()
        .unwrap()
        .iter()
        .map(|a| {
            let s = short(a.as_str().unwrap());
            let lhs = s
                .trim_start_matches("SubClassOf(")
                .split(' ')
                .next()
                .unwrap()
                .to_string();
            lhs.trim_start_matches('A').parse::<usize>().unwrap()
        })
        .collect();
    v.sort();
    v
}

#[test]
fn schlobach_cornet_mups() {
    // Schlobach & Cornet (IJCAI 2003), the debugging TBox (axioms numbered by their subclass):
    // MUPS(A1) = {{1,2},{1,3,4,5}}, MUPS(A3) = {{3,4,5}}, MUPS(A6) = {{1,2,4,6},{1,3,4,5,6}},
    // MUPS(A7) = {{4,7}}.
    let expect: &[(&str, Vec<Vec<usize>>)] = &[
        ("A1", vec![vec![1, 2], vec![1, 3, 4, 5]]),
        ("A3", vec![vec![3, 4, 5]]),
        ("A6", vec![vec![1, 2, 4, 6], vec![1, 3, 4, 5, 6]]),
        ("A7", vec![vec![4, 7]]),
    ];
    for (class, mups) in expect {
        let iri = format!("http://ex.org/sc#{class}");
        let (code, v, err) = run(&[
            "why",
            &fixture("schlobach-cornet.ofn"),
            "--unsat",
            &iri,
            "--format",
            "json",
        ]);
        assert_eq!(code, 0, "{err}");
        let mut got: Vec<Vec<usize>> = v["results"][0]["justifications"]
            .as_array()
            .unwrap()
            .iter()
            .map(numbered)
            .collect();
        got.sort();
        assert_eq!(&got, mups, "MUPS({class})");
    }
    // Root and derived: A6's unsatisfiability follows from A1's (same source).
    let (_, v, _) = run(&["why", &fixture("schlobach-cornet.ofn"), "--format", "json"]);
    assert_eq!(
        v["derived_unsatisfiable"],
        serde_json::json!(["http://ex.org/sc#A6"])
    );
    assert_eq!(
        v["root_unsatisfiable"],
        serde_json::json!([
            "http://ex.org/sc#A1",
            "http://ex.org/sc#A3",
            "http://ex.org/sc#A7"
        ])
    );
}

#[test]
fn laconic_example_entailment_and_justification() {
    // Horridge, Parsia & Sattler (DL 2010): {A ⊑ ∃R.B, Domain(R, C), C ⊑ D ⊓ E} entails
    // A ⊑ D, and all three axioms are needed (the regular justification).
    let (code, v, err) = run(&[
        "why",
        &fixture("laconic.ofn"),
        "--entailment",
        "SubClassOf(<http://ex.org/lac#A> <http://ex.org/lac#D>)",
        "--format",
        "json",
    ]);
    assert_eq!(code, 0, "{err}");
    let js = v["results"][0]["justifications"].as_array().unwrap();
    assert_eq!(js.len(), 1);
    assert_eq!(js[0].as_array().unwrap().len(), 3);
}

#[test]
fn laconic_justification_drops_superfluous_parts() {
    // Horridge, Parsia & Sattler (DL 2010): in {A ⊑ ∃R.B, Domain(R, C), C ⊑ D ⊓ E} ⊨ A ⊑ D
    // the filler B and the conjunct E are superfluous; the laconic justification is
    // {A ⊑ ∃R.⊤, ∃R.⊤ ⊑ C, C ⊑ D}.
    let (code, v, err) = run(&[
        "why",
        &fixture("laconic.ofn"),
        "--entailment",
        "SubClassOf(<http://ex.org/lac#A> <http://ex.org/lac#D>)",
        "--laconic",
        "--format",
        "json",
    ]);
    assert_eq!(code, 0, "{err}");
    let lac: Vec<String> = v["results"][0]["laconic"][0]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_str().unwrap().to_string())
        .collect();
    let thing = "<http://www.w3.org/2002/07/owl#Thing>";
    assert_eq!(
        lac,
        vec![
            format!(
                "SubClassOf(<http://ex.org/lac#A> ObjectSomeValuesFrom(<http://ex.org/lac#R> {thing}))"
            ),
            "SubClassOf(<http://ex.org/lac#C> <http://ex.org/lac#D>)".to_string(),
            format!(
                "SubClassOf(ObjectSomeValuesFrom(<http://ex.org/lac#R> {thing}) <http://ex.org/lac#C>)"
            ),
        ]
    );
}

#[test]
fn laconic_justifications_of_an_unsatisfiable_class() {
    // Schlobach & Cornet (IJCAI 2003): A1 is unsatisfiable through axioms {1,2} (A1 ⊑ ¬A ⊓ A2,
    // A2 ⊑ A ⊓ A4). Derived by hand: only A1 ⊑ ¬A, A1 ⊑ A2 and A2 ⊑ A are needed.
    let (code, v, err) = run(&[
        "why",
        &fixture("schlobach-cornet.ofn"),
        "--unsat",
        "http://ex.org/sc#A1",
        "--laconic",
        "--format",
        "json",
    ]);
    assert_eq!(code, 0, "{err}");
    let lac = &v["results"][0]["laconic"][0];
    assert_eq!(
        lac,
        &serde_json::json!([
            "SubClassOf(<http://ex.org/sc#A1> <http://ex.org/sc#A2>)",
            "SubClassOf(<http://ex.org/sc#A1> ObjectComplementOf(<http://ex.org/sc#A>))",
            "SubClassOf(<http://ex.org/sc#A2> <http://ex.org/sc#A>)"
        ])
    );
}

#[test]
fn bad_observations_exit_2() {
    let dir = std::env::temp_dir().join(format!("wf-explain-bad-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let kb = fixture("jack-jill.ofn");
    let cases = [
        (
            "unknown-individual",
            "Prefix(:=<http://ex.org/jj#>)\nOntology(ClassAssertion(:Happy :nobody))\n",
        ),
        (
            "unknown-class",
            "Prefix(:=<http://ex.org/jj#>)\nOntology(ClassAssertion(:Sad :jack))\n",
        ),
        (
            "not-an-assertion",
            "Prefix(:=<http://ex.org/jj#>)\nOntology(SubClassOf(:Happy :Person))\n",
        ),
    ];
    for (name, text) in cases {
        let p = dir.join(format!("{name}.ofn"));
        std::fs::write(&p, text).unwrap();
        let (code, _, err) = run(&[
            "explain",
            &kb,
            "--observations",
            p.to_str().unwrap(),
            "--abducibles",
            &fixture("jack-jill.abducibles"),
        ]);
        assert_eq!(code, 2, "{name}: {err}");
        assert!(
            err.contains(p.to_str().unwrap()),
            "{name}: message names the file: {err}"
        );
    }
    let empty = dir.join("empty.abducibles");
    std::fs::write(&empty, "# nothing\n").unwrap();
    let (code, _, err) = run(&[
        "explain",
        &kb,
        "--observations",
        &fixture("jack-jill.obs.ofn"),
        "--abducibles",
        empty.to_str().unwrap(),
    ]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("empty"), "{err}");
}

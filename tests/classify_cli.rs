//! `wherefore classify` on bad input, realisation, and a closed pipe.

use std::io::Write;
use std::process::{Command, Stdio};

fn dir() -> std::path::PathBuf {
    let d = std::env::temp_dir().join(format!("wf-classify-{}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn classify(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .arg("classify")
        .args(args)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).to_string(),
        String::from_utf8_lossy(&out.stderr).to_string(),
    )
}

#[test]
fn bad_input_exits_2_naming_the_place() {
    let d = dir();
    let cases: Vec<(&str, Vec<u8>, &str)> = vec![
        ("empty.ofn", b"".to_vec(), "empty"),
        ("junk.owl", vec![0u8, 159, 146, 150, 255, 1, 2, 3], "UTF-8"),
        ("prefix.ofn", b"Ontology(<http://x.org/o>\nSubClassOf(:A nope:B)\n)\n".to_vec(), "line 2"),
        (
            // r needs q's automaton and q needs r's: no order of the properties makes this
            // role box regular (OWL 2 Structural Specification §11.2).
            "chain.ofn",
            b"Prefix(:=<http://x.org/o#>)\nOntology(<http://x.org/o>\nSubObjectPropertyOf(ObjectPropertyChain(:p :q) :r)\nSubObjectPropertyOf(ObjectPropertyChain(:r :s) :q)\n)\n".to_vec(),
            "<http://x.org/o#q> \u{2192} <http://x.org/o#r> \u{2192} <http://x.org/o#q>",
        ),
        (
            "undeclared.owl",
            br#"<?xml version="1.0"?>
<rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#" xmlns:owl="http://www.w3.org/2002/07/owl#" xmlns:rdfs="http://www.w3.org/2000/01/rdf-schema#">
  <owl:Ontology rdf:about="http://x.org/o"/>
  <rdf:Description rdf:about="http://x.org/o#A"><rdfs:subClassOf rdf:resource="http://x.org/o#B"/></rdf:Description>
</rdf:RDF>"#
                .to_vec(),
            "RDF",
        ),
    ];
    for (name, bytes, needle) in cases {
        let p = d.join(name);
        std::fs::write(&p, &bytes).unwrap();
        let (code, _, err) = classify(&[p.to_str().unwrap()]);
        assert_eq!(code, 2, "{name}: {err}");
        assert!(
            err.contains(p.to_str().unwrap()),
            "{name}: names the file: {err}"
        );
        assert!(err.contains(needle), "{name}: {err}");
        assert!(!err.contains("panicked"), "{name}: {err}");
    }
    let (code, _, err) = classify(&[d.join("missing.ofn").to_str().unwrap()]);
    assert_eq!(code, 2, "{err}");
    // An import cycle: a imports b, b imports a (files found beside each other).
    std::fs::write(
        d.join("a.ofn"),
        "Ontology(<http://x.org/a.ofn>\nImport(<http://x.org/b.ofn>)\n)\n",
    )
    .unwrap();
    std::fs::write(
        d.join("b.ofn"),
        "Ontology(<http://x.org/b.ofn>\nImport(<http://x.org/a.ofn>)\n)\n",
    )
    .unwrap();
    let (code, _, err) = classify(&[d.join("a.ofn").to_str().unwrap()]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("import cycle"), "{err}");
    // A missing import is a warning, and the result says it may be incomplete.
    std::fs::write(
        d.join("c.ofn"),
        "Ontology(<http://x.org/c.ofn>\nImport(<http://x.org/nowhere.ofn>)\n)\n",
    )
    .unwrap();
    let (code, out, err) = classify(&[d.join("c.ofn").to_str().unwrap(), "--format", "json"]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("nowhere.ofn"), "{err}");
    assert!(out.contains("\"incomplete\": true"), "{out}");
}

#[test]
fn realisation_of_jack_and_jill() {
    // Hand-derived: Person(jack) and Parent(jill) with Parent ⊑ Happy: the most specific
    // classes are Person for jack and Parent for jill.
    let f = format!(
        "{}/tests/fixtures/explain/jack-jill.ofn",
        env!("CARGO_MANIFEST_DIR")
    );
    let (code, out, err) = classify(&[&f, "--realise", "--format", "json"]);
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(
        v["realisation"]["http://ex.org/jj#jack"],
        serde_json::json!(["http://ex.org/jj#Person"])
    );
    assert_eq!(
        v["realisation"]["http://ex.org/jj#jill"],
        serde_json::json!(["http://ex.org/jj#Parent"])
    );
}

#[test]
fn random_text_never_panics() {
    // A small deterministic fuzz over functional-syntax-like text and raw bytes.
    let d = dir();
    let atoms = [
        "Ontology(",
        ")",
        "(",
        "SubClassOf(",
        "<http://x.org/a>",
        ":A",
        "ObjectSomeValuesFrom(",
        "Prefix(:=<http://x.org/#>)",
        "\"1\"^^xsd:integer",
        "DataSomeValuesFrom(",
        "ObjectInverseOf(",
        " ",
        "\n",
        "#",
        "<",
        ">",
        "ClassAssertion(",
    ];
    let mut seed: u64 = 0x5eed;
    for k in 0..40 {
        let mut text = String::new();
        for _ in 0..(5 + k % 30) {
            seed ^= seed << 13;
            seed ^= seed >> 7;
            seed ^= seed << 17;
            text.push_str(atoms[(seed % atoms.len() as u64) as usize]);
        }
        let p = d.join(format!("fuzz{k}.ofn"));
        std::fs::write(&p, &text).unwrap();
        let (code, _, err) = classify(&[p.to_str().unwrap(), "--timeout", "5"]);
        assert!(
            code == 0 || code == 2 || code == 3,
            "{text:?}: exit {code}: {err}"
        );
        assert!(!err.contains("panicked"), "{text:?}: {err}");
        let bytes: Vec<u8> = (0..64)
            .map(|i| (seed.rotate_left(i) & 0xff) as u8)
            .collect();
        std::fs::write(&p, &bytes).unwrap();
        let (code, _, err) = classify(&[p.to_str().unwrap()]);
        assert_eq!(code, 2, "{err}");
    }
}

#[test]
fn closed_pipe_is_quiet() {
    let f = format!("{}/ontologies/abdomen.ofn", env!("CARGO_MANIFEST_DIR"));
    let mut child = Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .args(["classify", &f])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    drop(child.stdout.take());
    let out = child.wait_with_output().unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(!err.contains("panicked"), "{err}");
    let _ = std::io::stdout().flush();
}

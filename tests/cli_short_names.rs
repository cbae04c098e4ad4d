//! The command line reads the shell's short names (prefixed names, fragments, labels),
//! names an unknown prefix as such and suggests near names. The ontology is ours; the
//! answers are hand-derived: C ⊑ A, C ⊑ B and A, B disjoint make C unsatisfiable, with the
//! one justification {C ⊑ A, C ⊑ B, DisjointClasses(A B)}.

use std::path::PathBuf;
use std::process::Command;

const KB: &str = "Prefix(:=<http://x.org/t#>)
Prefix(rdfs:=<http://www.w3.org/2000/01/rdf-schema#>)
Ontology(<http://x.org/t>
Declaration(Class(:A))
Declaration(Class(:B))
Declaration(Class(:Clash))
DisjointClasses(:A :B)
SubClassOf(:Clash :A)
SubClassOf(:Clash :B)
AnnotationAssertion(rdfs:label :Clash \"bad mixture\"@en)
)
";

/// The file, written once per test process: tests run in parallel, and rewriting it while
/// another test reads it would hand that test an empty file.
fn kb_file() -> PathBuf {
    static FILE: std::sync::OnceLock<PathBuf> = std::sync::OnceLock::new();
    FILE.get_or_init(|| {
        let d = std::env::temp_dir().join(format!("wf-short-names-{}", std::process::id()));
        std::fs::create_dir_all(&d).unwrap();
        let f = d.join("t.ofn");
        std::fs::write(&f, KB).unwrap();
        f
    })
    .clone()
}

fn why(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .arg("why")
        .arg(kb_file())
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
fn why_reads_fragments_prefixed_names_and_labels() {
    for name in ["Clash", ":Clash", "bad mixture", "<http://x.org/t#Clash>"] {
        let (code, out, err) = why(&["--unsat", name]);
        assert_eq!(code, 0, "{name}: {err}");
        assert!(out.contains("DisjointClasses("), "{name}: {out}");
        assert!(out.contains("Justification 1"), "{name}: {out}");
        assert!(!out.contains("Justification 2"), "{name}: {out}");
    }
    let (code, out, err) = why(&["--entailment", "Clash SubClassOf A"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("Justification 1"), "{out}");
}

/// A non-entailment has no justification, so no repair is listed (hand-derived: A ⊑ B does not
/// follow, A and B being disjoint).
#[test]
fn a_non_entailment_lists_no_repair() {
    let (code, out, err) = why(&["--entailment", "A SubClassOf B"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("not entailed"), "{out}");
    assert!(!out.contains("repairs"), "{out}");
}

#[test]
fn unknown_names_and_prefixes_are_told_apart() {
    let (code, _, err) = why(&["--unsat", "Clsh"]);
    assert_eq!(code, 2);
    assert!(err.contains("did you mean `Clash`?"), "{err}");
    let (code, _, err) = why(&["--unsat", "zz:Clash"]);
    assert_eq!(code, 2);
    assert!(err.contains("unknown prefix `zz:`"), "{err}");
    assert!(
        err.contains("known prefixes: : owl: rdf: rdfs: wf: xsd:"),
        "{err}"
    );
}

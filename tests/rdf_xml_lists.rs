//! RDF/XML with OWL 2 list constructs that horned-owl 4.0.0 leaves unread
//! (owl:AllDisjointClasses, owl:AllDisjointProperties), and `--lenient` on parts that stay
//! unread. Every expected answer is hand-derived from the OWL 2 Direct Semantics
//! (DisjointClasses(C1 … Cn) means the Ci are pairwise disjoint, Table 5) and the OWL 2
//! Mapping to RDF Graphs (Table 16: `_:x rdf:type owl:AllDisjointClasses; owl:members
//! (C1 … Cn)` is DisjointClasses(C1 … Cn)); the first file's answer was also checked with
//! HermiT 1.3.8 (owlready2 0.51), which agrees.

use std::process::Command;

fn dir() -> std::path::PathBuf {
    let d = std::env::temp_dir().join(format!("wf-rdf-lists-{}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn classify(file: &str, body: &str, extra: &[&str]) -> (i32, serde_json::Value, String) {
    let p = dir().join(file);
    let doc = format!(
        r#"<?xml version="1.0"?>
<rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#" xmlns:owl="http://www.w3.org/2002/07/owl#" xmlns:rdfs="http://www.w3.org/2000/01/rdf-schema#">
  <owl:Ontology rdf:about="http://x.org/d"/>
{body}
</rdf:RDF>
"#
    );
    std::fs::write(&p, doc).unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .arg("classify")
        .arg(&p)
        .args(["--format", "json"])
        .args(extra)
        .output()
        .unwrap();
    let stdout = String::from_utf8_lossy(&out.stdout).to_string();
    let stderr = String::from_utf8_lossy(&out.stderr).to_string();
    assert!(!stderr.contains("panicked"), "{stderr}");
    if stderr.contains("error") {
        assert!(
            stderr.contains(p.to_str().unwrap()),
            "names the file: {stderr}"
        );
    }
    let json = serde_json::from_str(&stdout).unwrap_or(serde_json::Value::Null);
    (out.status.code().unwrap_or(-1), json, stderr)
}

fn all_disjoint(kind: &str, members: &str) -> String {
    format!(
        r#"  <rdf:Description>
    <rdf:type rdf:resource="http://www.w3.org/2002/07/owl#{kind}"/>
    <owl:members rdf:parseType="Collection">
{members}
    </owl:members>
  </rdf:Description>"#
    )
}

fn named(iri: &str) -> String {
    format!("      <rdf:Description rdf:about=\"http://x.org/d#{iri}\"/>")
}

const SOME_R_C: &str = r#"<owl:Restriction><owl:onProperty rdf:resource="http://x.org/d#r"/><owl:someValuesFrom rdf:resource="http://x.org/d#C"/></owl:Restriction>"#;

#[test]
fn all_disjoint_classes_is_read_as_pairwise_disjointness() {
    // AllDisjointClasses(A B C): A ⊓ B and B ⊓ C are empty, so AB and BC are
    // unsatisfiable; AllDisjointClasses(D ∃r.C) with F ⊑ D ⊓ ∃r.C makes F unsatisfiable,
    // while G ⊑ ∃r.C alone is fine. D ⊑ A is the one subsumption between satisfiable
    // classes.
    let classes = ["A", "B", "C"]
        .iter()
        .map(|c| format!("  <owl:Class rdf:about=\"http://x.org/d#{c}\"/>"))
        .collect::<Vec<_>>()
        .join("\n");
    let body = format!(
        r#"  <owl:ObjectProperty rdf:about="http://x.org/d#r"/>
{classes}
  <owl:Class rdf:about="http://x.org/d#AB"><rdfs:subClassOf rdf:resource="http://x.org/d#A"/><rdfs:subClassOf rdf:resource="http://x.org/d#B"/></owl:Class>
  <owl:Class rdf:about="http://x.org/d#BC"><rdfs:subClassOf rdf:resource="http://x.org/d#B"/><rdfs:subClassOf rdf:resource="http://x.org/d#C"/></owl:Class>
  <owl:Class rdf:about="http://x.org/d#D"><rdfs:subClassOf rdf:resource="http://x.org/d#A"/></owl:Class>
  <owl:Class rdf:about="http://x.org/d#F"><rdfs:subClassOf rdf:resource="http://x.org/d#D"/><rdfs:subClassOf>{SOME_R_C}</rdfs:subClassOf></owl:Class>
  <owl:Class rdf:about="http://x.org/d#G"><rdfs:subClassOf>{SOME_R_C}</rdfs:subClassOf></owl:Class>
{}
{}"#,
        all_disjoint(
            "AllDisjointClasses",
            &[named("A"), named("B"), named("C")].join("\n")
        ),
        all_disjoint(
            "AllDisjointClasses",
            &format!("{}\n      {SOME_R_C}", named("D"))
        ),
    );
    let (code, v, err) = classify("all-disjoint.owl", &body, &[]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(
        v,
        serde_json::json!({
            "consistent": true,
            "unsatisfiable": ["http://x.org/d#AB", "http://x.org/d#BC", "http://x.org/d#F"],
            "subsumptions": [["http://x.org/d#D", "http://x.org/d#A"]]
        }),
        "{err}"
    );
}

#[test]
fn all_disjoint_properties_becomes_the_axiom() {
    // Read as DisjointObjectProperties(p q): alone it is consistent; with a related to b by
    // both p and q it is not (OWL 2 Direct Semantics, Table 6: no pair lies in both).
    let props = "  <owl:ObjectProperty rdf:about=\"http://x.org/d#p\"/>\n  <owl:ObjectProperty rdf:about=\"http://x.org/d#q\"/>\n";
    let list = all_disjoint(
        "AllDisjointProperties",
        &[named("p"), named("q")].join("\n"),
    );
    let (code, v, err) = classify("all-disjoint-props.owl", &format!("{props}{list}"), &[]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(v["consistent"], serde_json::json!(true), "{err}");
    let both = "  <owl:NamedIndividual rdf:about=\"http://x.org/d#a\">\n    <p xmlns=\"http://x.org/d#\" rdf:resource=\"http://x.org/d#b\"/>\n    <q xmlns=\"http://x.org/d#\" rdf:resource=\"http://x.org/d#b\"/>\n  </owl:NamedIndividual>\n  <owl:NamedIndividual rdf:about=\"http://x.org/d#b\"/>\n";
    let (code, v, err) = classify(
        "all-disjoint-props-both.owl",
        &format!("{props}{list}{both}"),
        &[],
    );
    assert_eq!(code, 0, "{err}");
    assert_eq!(v["consistent"], serde_json::json!(false), "{err}");
}

#[test]
fn undeclared_member_exits_2_in_strict_mode_only() {
    // Z is used as a class but never declared: strict RDF/XML needs declarations.
    let body = format!(
        "  <owl:Class rdf:about=\"http://x.org/d#A\"/>\n{}",
        all_disjoint("AllDisjointClasses", &[named("A"), named("Z")].join("\n"))
    );
    let (code, _, err) = classify("undeclared-member.owl", &body, &[]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("undeclared entity"), "{err}");
    assert!(err.contains("http://x.org/d#Z"), "{err}");
    let (code, v, err) = classify("undeclared-member.owl", &body, &["--lenient"]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(v["consistent"], serde_json::json!(true));
}

#[test]
fn unreadable_parts_are_listed_never_dropped_silently() {
    // u and v are declared neither as object nor as data properties, so their
    // AllDisjointProperties cannot be typed; and C ⊑ ∃r.C with r undeclared cannot be read
    // as an axiom (the restriction and the subClassOf triple stay). Strict: exit 2 naming
    // the parts; lenient: one warning per part, the same on every run, and the result is
    // marked incomplete.
    let body = format!(
        "  <owl:Class rdf:about=\"http://x.org/d#C\"><rdfs:subClassOf>{SOME_R_C}</rdfs:subClassOf></owl:Class>\n{}",
        all_disjoint(
            "AllDisjointProperties",
            &[named("u"), named("v")].join("\n")
        )
    );
    let (code, _, err) = classify("unreadable.owl", &body, &[]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("could not read 3 part(s)"), "{err}");
    let (code, v, err) = classify("unreadable.owl", &body, &["--lenient"]);
    assert_eq!(code, 0, "{err}");
    let dropped: Vec<&str> = err
        .lines()
        .filter(|l| l.contains("dropped RDF part"))
        .collect();
    assert_eq!(dropped.len(), 3, "{err}");
    assert!(
        dropped.iter().any(|l| l.ends_with(
            "<http://x.org/d#C> <http://www.w3.org/2000/01/rdf-schema#subClassOf> _:b1"
        )),
        "{err}"
    );
    assert!(
        dropped
            .iter()
            .any(|l| l
                .contains("_:b1 <http://www.w3.org/2002/07/owl#onProperty> <http://x.org/d#r>")),
        "{err}"
    );
    assert!(
        dropped.iter().any(|l| l.contains(
            "owl:AllDisjointProperties with members <http://x.org/d#u> <http://x.org/d#v>"
        )),
        "{err}"
    );
    assert_eq!(v["incomplete"], serde_json::json!(true));
    assert_eq!(v["unsatisfiable"], serde_json::json!([]));
    let (_, again, _) = classify("unreadable.owl", &body, &["--lenient"]);
    assert_eq!(v, again, "byte-identical answers across runs");
}

//! Loading ontologies as knowledge engineers keep them: modules that rely on their
//! imports' declarations, axiom annotations saved as owl:Axiom reifications, annotation
//! properties nobody declared, every common syntax told by its content, imports through
//! catalogs, version IRIs and near-miss IRIs, and clear refusals of bad files. Every
//! expected answer is derived by hand from the documents written here (OWL 2 Mapping to
//! RDF Graphs for the RDF forms; OWL 2 Direct Semantics for the entailments).

use std::path::{Path, PathBuf};
use std::process::Command;
use wherefore::kb::load::{self, LoadOptions};

const RDF_HEAD: &str = r#"<?xml version="1.0"?>
<rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#" xmlns:owl="http://www.w3.org/2002/07/owl#" xmlns:rdfs="http://www.w3.org/2000/01/rdf-schema#" xmlns:x="http://x.org/"
         xmlns:dc="http://purl.org/dc/elements/1.1/">"#;

/// A fresh folder for one test.
fn dir(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("wf-closure-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn write(d: &Path, name: &str, text: &str) -> PathBuf {
    let p = d.join(name);
    std::fs::create_dir_all(p.parent().unwrap()).unwrap();
    std::fs::write(&p, text).unwrap();
    p
}

/// `wherefore classify FILES --format json` → (exit code, JSON, stderr).
fn classify(files: &[&Path], extra: &[&str]) -> (i32, serde_json::Value, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .arg("classify")
        .args(files)
        .args(["--format", "json"])
        .args(extra)
        .output()
        .unwrap();
    let stderr = String::from_utf8_lossy(&out.stderr).to_string();
    assert!(!stderr.contains("panicked"), "{stderr}");
    let json = serde_json::from_slice(&out.stdout).unwrap_or(serde_json::Value::Null);
    (out.status.code().unwrap_or(-1), json, stderr)
}

fn has_pair(json: &serde_json::Value, sub: &str, sup: &str) -> bool {
    json["subsumptions"]
        .as_array()
        .is_some_and(|a| a.iter().any(|p| p[0] == sub && p[1] == sup))
}

/// The upper module declares x:partOf and x:Organ; the lower one imports it, uses them in
/// an anonymous restriction, and annotates that axiom through an owl:Axiom reification.
fn upper_and_lower(d: &Path) -> (PathBuf, PathBuf) {
    let upper = write(
        d,
        "upper.rdf",
        &format!(
            r#"{RDF_HEAD}
  <owl:Ontology rdf:about="http://x.org/upper"/>
  <owl:ObjectProperty rdf:about="http://x.org/partOf"/>
  <owl:Class rdf:about="http://x.org/Organ"/>
</rdf:RDF>
"#
        ),
    );
    let lower = write(
        d,
        "lower.rdf",
        &format!(
            r#"{RDF_HEAD}
  <owl:Ontology rdf:about="http://x.org/lower">
    <owl:imports rdf:resource="http://x.org/upper"/>
  </owl:Ontology>
  <owl:Class rdf:about="http://x.org/Lobe">
    <rdfs:subClassOf rdf:nodeID="r"/>
  </owl:Class>
  <owl:Restriction rdf:nodeID="r">
    <owl:onProperty rdf:resource="http://x.org/partOf"/>
    <owl:someValuesFrom rdf:resource="http://x.org/Organ"/>
  </owl:Restriction>
  <owl:Axiom>
    <owl:annotatedSource rdf:resource="http://x.org/Lobe"/>
    <owl:annotatedProperty rdf:resource="http://www.w3.org/2000/01/rdf-schema#subClassOf"/>
    <owl:annotatedTarget rdf:nodeID="r"/>
    <rdfs:comment>a lobe is part of an organ</rdfs:comment>
  </owl:Axiom>
  <owl:Class rdf:about="http://x.org/OrganPart">
    <owl:equivalentClass>
      <owl:Restriction>
        <owl:onProperty rdf:resource="http://x.org/partOf"/>
        <owl:someValuesFrom rdf:resource="http://x.org/Organ"/>
      </owl:Restriction>
    </owl:equivalentClass>
  </owl:Class>
  <rdf:Description rdf:about="http://x.org/Lobe">
    <dc:description>an undeclared annotation property</dc:description>
  </rdf:Description>
</rdf:RDF>
"#
        ),
    );
    (upper, lower)
}

#[test]
fn a_module_reads_its_imports_declarations_and_keeps_reified_annotations() {
    let d = dir("module");
    let (upper, lower) = upper_and_lower(&d);
    // Found beside the file, and given on the command line too: both load strictly.
    for files in [vec![lower.clone()], vec![upper.clone(), lower.clone()]] {
        let kb = load::load(&files, &LoadOptions::default()).unwrap();
        assert!(kb.warnings.is_empty(), "{:?}", kb.warnings);
        let sub = kb
            .sources
            .iter()
            .find(|s| s.text.starts_with("SubClassOf(<http://x.org/Lobe>"))
            .expect("the annotated axiom is read");
        assert_eq!(
            sub.annotations,
            vec![(
                "http://www.w3.org/2000/01/rdf-schema#comment".to_string(),
                "a lobe is part of an organ".to_string()
            )]
        );
        // dc:description is declared nowhere, so it is an annotation (§3.2.5).
        let lobe = &kb.annotations["http://x.org/Lobe"];
        assert_eq!(
            lobe["http://purl.org/dc/elements/1.1/description"][0].value,
            "an undeclared annotation property"
        );
    }
    // Lobe ⊑ ∃partOf.Organ ≡ OrganPart, so Lobe ⊑ OrganPart (hand-derived).
    let (code, json, stderr) = classify(&[&lower], &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(
        has_pair(&json, "http://x.org/Lobe", "http://x.org/OrganPart"),
        "{json}"
    );
}

#[test]
fn files_given_together_share_declarations_without_imports() {
    let d = dir("together");
    let (upper, lower) = upper_and_lower(&d);
    // The same lower module without its owl:imports, in a folder of its own.
    let text = std::fs::read_to_string(&lower)
        .unwrap()
        .replace(r#"<owl:imports rdf:resource="http://x.org/upper"/>"#, "");
    let alone = write(&d, "alone/lower.rdf", &text);
    let (code, _, stderr) = classify(&[&alone], &[]);
    assert_eq!(code, 2, "alone it names undeclared parts: {stderr}");
    assert!(stderr.contains("alone/lower.rdf"), "{stderr}");
    let (code, json, stderr) = classify(&[&upper, &alone], &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(
        has_pair(&json, "http://x.org/Lobe", "http://x.org/OrganPart"),
        "{json}"
    );
}

/// One small ontology in each text syntax, told apart by content whatever the
/// extension: A ⊑ ∃r.B and ∃r.B ⊑ C give A ⊑ C (hand-derived).
#[test]
fn every_syntax_is_told_by_its_content() {
    let d = dir("syntaxes");
    let docs = [
        (
            "turtle-at.owl",
            "@prefix : <http://x.org/> .\n@prefix owl: <http://www.w3.org/2002/07/owl#> .\n@prefix rdfs: <http://www.w3.org/2000/01/rdf-schema#> .\n<http://x.org/o> a owl:Ontology .\n:A a owl:Class ; rdfs:subClassOf [ a owl:Restriction ; owl:onProperty :r ; owl:someValuesFrom :B ] .\n:B a owl:Class .\n:C a owl:Class ; owl:equivalentClass [ a owl:Restriction ; owl:onProperty :r ; owl:someValuesFrom :B ] .\n:r a owl:ObjectProperty .\n",
        ),
        (
            "turtle-sparql.owl",
            "PREFIX : <http://x.org/>\nPREFIX owl: <http://www.w3.org/2002/07/owl#>\nprefix rdfs: <http://www.w3.org/2000/01/rdf-schema#>\n<http://x.org/o> a owl:Ontology .\n:A a owl:Class ; rdfs:subClassOf [ a owl:Restriction ; owl:onProperty :r ; owl:someValuesFrom :B ] .\n:B a owl:Class .\n:C a owl:Class ; owl:equivalentClass [ a owl:Restriction ; owl:onProperty :r ; owl:someValuesFrom :B ] .\n:r a owl:ObjectProperty .\n",
        ),
        (
            "manchester.owl",
            "Prefix: : <http://x.org/>\nOntology: <http://x.org/o>\nObjectProperty: r\nClass: B\nClass: A\n    SubClassOf: r some B\nClass: C\n    EquivalentTo: r some B\n",
        ),
        (
            "functional.txt",
            "Prefix(:=<http://x.org/>)\nOntology(<http://x.org/o>\nDeclaration(Class(:A))\nDeclaration(Class(:B))\nDeclaration(Class(:C))\nDeclaration(ObjectProperty(:r))\nSubClassOf(:A ObjectSomeValuesFrom(:r :B))\nEquivalentClasses(:C ObjectSomeValuesFrom(:r :B))\n)\n",
        ),
    ];
    for (name, text) in docs {
        let p = write(&d, name, text);
        let (code, json, stderr) = classify(&[&p], &[]);
        assert_eq!(code, 0, "{name}: {stderr}");
        assert!(
            has_pair(&json, "http://x.org/A", "http://x.org/C"),
            "{name}: {json}"
        );
    }
    // N-Triples: one triple a line, full IRIs (B ⊑ A, hand-derived).
    let nt = "<http://x.org/A> <http://www.w3.org/1999/02/22-rdf-syntax-ns#type> <http://www.w3.org/2002/07/owl#Class> .\n<http://x.org/B> <http://www.w3.org/1999/02/22-rdf-syntax-ns#type> <http://www.w3.org/2002/07/owl#Class> .\n<http://x.org/B> <http://www.w3.org/2000/01/rdf-schema#subClassOf> <http://x.org/A> .\n";
    let p = write(&d, "triples.data", nt);
    let (code, json, stderr) = classify(&[&p], &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(
        has_pair(&json, "http://x.org/B", "http://x.org/A"),
        "{json}"
    );
}

#[test]
fn imports_resolve_through_catalogs_version_iris_and_near_miss_iris() {
    let d = dir("catalog");
    let upper = "Prefix(:=<http://x.org/>)\nOntology(<http://x.org/upper> <http://x.org/upper/1.0>\nDeclaration(Class(:Organ))\nDeclaration(Class(:Liver))\nSubClassOf(:Liver :Organ)\n)\n";
    write(&d, "modules/upper-v1.ofn", upper);
    let main = |import: &str| {
        format!(
            "Prefix(:=<http://x.org/>)\nOntology(<http://x.org/main>\nImport(<{import}>)\nDeclaration(Class(:Lobe))\nSubClassOf(:Lobe :Liver)\n)\n"
        )
    };
    // The catalog beside the ontology (editors' catalog-v001.xml) maps the IRI to a file
    // whose name the IRI does not suggest.
    write(
        &d,
        "catalog-v001.xml",
        "<?xml version=\"1.0\"?>\n<catalog prefer=\"public\" xmlns=\"urn:oasis:names:tc:entity:xmlns:xml:catalog\">\n  <uri name=\"http://x.org/upper\" uri=\"modules/upper-v1.ofn\"/>\n</catalog>\n",
    );
    let m = write(&d, "main.ofn", &main("http://x.org/upper"));
    let (code, json, stderr) = classify(&[&m], &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(!stderr.contains("warning"), "{stderr}");
    assert!(
        has_pair(&json, "http://x.org/Lobe", "http://x.org/Organ"),
        "{json}"
    );
    // A trailing slash the file does not have: found, with a warning naming both.
    let m = write(&d, "slash.ofn", &main("http://x.org/upper/"));
    let (code, json, stderr) = classify(&[&m], &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(
        stderr.contains("<http://x.org/upper/>") && stderr.contains("trailing"),
        "{stderr}"
    );
    assert!(
        has_pair(&json, "http://x.org/Lobe", "http://x.org/Organ"),
        "{json}"
    );
    // The version IRI names the ontology given on the command line: no search, no warning.
    let other = dir("catalog-version");
    let up = write(&other, "u.ofn", upper);
    let m = write(&other, "main.ofn", &main("http://x.org/upper/1.0"));
    let (code, json, stderr) = classify(&[&up, &m], &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(!stderr.contains("warning"), "{stderr}");
    assert!(
        has_pair(&json, "http://x.org/Lobe", "http://x.org/Organ"),
        "{json}"
    );
    // --catalog FILE from elsewhere.
    let cat = write(
        &other,
        "elsewhere/cat.xml",
        &format!(
            "<?xml version=\"1.0\"?>\n<catalog xmlns=\"urn:oasis:names:tc:entity:xmlns:xml:catalog\">\n  <uri name=\"http://x.org/upper\" uri=\"{}\"/>\n</catalog>\n",
            up.display()
        ),
    );
    let m = write(&other, "by-catalog.ofn", &main("http://x.org/upper"));
    std::fs::remove_file(&up).unwrap();
    let moved = write(&other, "kept/u.ofn", upper);
    std::fs::write(
        &cat,
        std::fs::read_to_string(&cat)
            .unwrap()
            .replace(&up.display().to_string(), &moved.display().to_string()),
    )
    .unwrap();
    let (code, json, stderr) = classify(&[&m], &["--catalog", cat.to_str().unwrap()]);
    assert_eq!(code, 0, "{stderr}");
    assert!(
        has_pair(&json, "http://x.org/Lobe", "http://x.org/Organ"),
        "{json}"
    );
}

#[test]
fn bad_imports_and_bad_files_get_a_message_and_exit_2() {
    let d = dir("bad");
    // An import loop: a → b → a. Refused with the cycle named.
    write(
        &d,
        "b.ofn",
        "Ontology(<http://x.org/b>\nImport(<http://x.org/a>)\n)\n",
    );
    let a = write(
        &d,
        "a.ofn",
        "Ontology(<http://x.org/a>\nImport(<http://x.org/b>)\n)\n",
    );
    let (code, _, stderr) = classify(&[&a], &[]);
    assert_eq!(code, 2, "{stderr}");
    assert!(
        stderr.contains("import cycle")
            && stderr.contains("http://x.org/a -> http://x.org/b -> http://x.org/a"),
        "{stderr}"
    );
    // A missing import: a warning naming it, and the command goes on (contract).
    let m = write(
        &d,
        "m.ofn",
        "Ontology(<http://x.org/m>\nImport(<http://x.org/nowhere>)\nDeclaration(Class(<http://x.org/A>))\n)\n",
    );
    let (code, _, stderr) = classify(&[&m], &[]);
    assert_eq!(code, 0, "{stderr}");
    assert!(
        stderr.contains("warning") && stderr.contains("<http://x.org/nowhere>"),
        "{stderr}"
    );
    // A malformed catalog beside the ontology.
    let cd = dir("bad-catalog");
    write(
        &cd,
        "catalog-v001.xml",
        "<catalog><uri name=\"x\" uri=</catalog>",
    );
    let m = write(
        &cd,
        "m.ofn",
        "Ontology(<http://x.org/m>\nImport(<http://x.org/u>)\n)\n",
    );
    let (code, _, stderr) = classify(&[&m], &[]);
    assert_eq!(code, 2, "{stderr}");
    assert!(
        stderr.contains("catalog-v001.xml") && stderr.contains("malformed XML catalog"),
        "{stderr}"
    );
    // An XML entity bomb: refused at once, naming the entity's line.
    let mut bomb =
        String::from("<?xml version=\"1.0\"?>\n<!DOCTYPE rdf:RDF [\n<!ENTITY a \"aaaaaaaaaa\">\n");
    let mut prev = "a".to_string();
    for i in 0..12 {
        let name = format!("a{i}");
        bomb.push_str(&format!(
            "<!ENTITY {name} \"{}\">\n",
            format!("&{prev};").repeat(10)
        ));
        prev = name;
    }
    bomb.push_str(&format!("]>\n<rdf:RDF xmlns:rdf=\"http://www.w3.org/1999/02/22-rdf-syntax-ns#\"><rdf:Description rdf:about=\"http://x.org/&{prev};\"/></rdf:RDF>\n"));
    let b = write(&d, "bomb.rdf", &bomb);
    let (code, _, stderr) = classify(&[&b], &[]);
    assert_eq!(code, 2, "{stderr}");
    assert!(
        stderr.contains("bomb.rdf") && stderr.contains("entity") && stderr.contains("line"),
        "{stderr}"
    );
    // Malformed Turtle: the file, the line, what to do.
    let t = write(
        &d,
        "broken.ttl",
        "@prefix : <http://x.org/> .\n:A a :B .\n:C a \n",
    );
    let (code, _, stderr) = classify(&[&t], &[]);
    assert_eq!(code, 2, "{stderr}");
    assert!(
        stderr.contains("broken.ttl") && stderr.contains("line") && stderr.contains("Fix"),
        "{stderr}"
    );
    // The error text names Turtle among what is read.
    let x = write(&d, "notes.txt", "hello\n");
    let (code, _, stderr) = classify(&[&x], &[]);
    assert_eq!(code, 2, "{stderr}");
    assert!(
        stderr.contains("Turtle") && !stderr.contains("not supported"),
        "{stderr}"
    );
}

//! `save` writes each edit back into the document it belongs to. Works on copies of the
//! shipped demo ontologies in a temporary folder (abdomen.ofn imports spatial.ofn); the
//! expected files are the originals with exactly the edited lines changed, derived by hand
//! from the edits (a new axiom goes before the ontology's closing parenthesis, written with
//! the document's own prefixes; a retracted axiom's line goes).

use std::path::{Path, PathBuf};
use wherefore::kb::load::LoadOptions;
use wherefore::shell::Session;

fn copies(name: &str) -> (PathBuf, String, String) {
    let d = std::env::temp_dir().join(format!("wf-save-back-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    let abdomen = std::fs::read_to_string("ontologies/abdomen.ofn").unwrap();
    let spatial = std::fs::read_to_string("ontologies/spatial.ofn").unwrap();
    std::fs::write(d.join("abdomen.ofn"), &abdomen).unwrap();
    std::fs::write(d.join("spatial.ofn"), &spatial).unwrap();
    (d, abdomen, spatial)
}

fn session(dir: &Path) -> Session {
    let mut s = Session::new(LoadOptions::default());
    s.show_times = false;
    s.load_files(&[dir.join("abdomen.ofn")]).unwrap();
    s
}

/// `text` with `line` (and its line break) removed and `added` inserted before the final
/// `)` line.
fn edited(text: &str, line: Option<&str>, added: &str) -> String {
    let mut t = text.to_string();
    if let Some(l) = line {
        let whole = format!("{l}\n");
        assert_eq!(t.matches(&whole).count(), 1, "{l}");
        t = t.replacen(&whole, "", 1);
    }
    let close = t.trim_end().rfind('\n').unwrap() + 1;
    assert_eq!(t[close..].trim(), ")");
    format!("{}{added}{}", &t[..close], &t[close..])
}

#[test]
fn an_edit_of_abdomen_changes_only_the_edited_lines() {
    let (dir, abdomen, spatial) = copies("abdomen");
    let mut s = session(&dir);
    s.execute("add :Aorta DisjointWith :InferiorVenaCava")
        .unwrap();
    let annotated = "SubClassOf(Annotation(wf:normalAnatomyDefault \"true\"^^xsd:boolean) Annotation(rdfs:label \"The gallbladder does not lie to the patient's left of the aorta.\"@en) Annotation(wf:plainLabel \"Normally the gallbladder sits on your right side, under the liver.\"@en) :Gallbladder ObjectComplementOf(ObjectSomeValuesFrom(sp:leftOf :Aorta)))";
    s.execute("retract Gallbladder SubClassOf not (sp:leftOf some Aorta)")
        .unwrap();
    // No one to ask and no --yes: nothing is written.
    let err = s.execute("save").unwrap_err();
    assert!(err.message.contains("save --yes"), "{err}");
    assert_eq!(
        std::fs::read_to_string(dir.join("abdomen.ofn")).unwrap(),
        abdomen
    );
    let out = s.execute("save --yes").unwrap();
    assert!(out.contains("changed "), "{out}");
    assert!(out.contains("unchanged "), "{out}");
    let want = edited(
        &abdomen,
        Some(annotated),
        "DisjointClasses(:Aorta :InferiorVenaCava)\n",
    );
    assert_eq!(
        std::fs::read_to_string(dir.join("abdomen.ofn")).unwrap(),
        want
    );
    // The import is untouched, the backup is the original.
    assert_eq!(
        std::fs::read_to_string(dir.join("spatial.ofn")).unwrap(),
        spatial
    );
    assert!(!dir.join("spatial.ofn.bak").exists());
    assert_eq!(
        std::fs::read_to_string(dir.join("abdomen.ofn.bak")).unwrap(),
        abdomen
    );
    assert!(!s.unsaved());
    assert!(s.edits().is_empty());
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn an_axiom_about_a_spatial_property_goes_to_spatial_unless_told() {
    let axiom = "SubObjectPropertyOf(sp:nonTangentialProperPartOf sp:connectedTo)";
    let (dir, abdomen, spatial) = copies("spatial");
    let mut s = session(&dir);
    s.execute(&format!("add {axiom}")).unwrap();
    s.execute("save --yes").unwrap();
    assert_eq!(
        std::fs::read_to_string(dir.join("spatial.ofn")).unwrap(),
        edited(&spatial, None, &format!("{axiom}\n"))
    );
    assert_eq!(
        std::fs::read_to_string(dir.join("abdomen.ofn")).unwrap(),
        abdomen
    );
    let _ = std::fs::remove_dir_all(&dir);

    // `--into` names the document instead.
    let (dir, abdomen, spatial) = copies("into");
    let mut s = session(&dir);
    s.execute(&format!("add {axiom}")).unwrap();
    let err = s.execute("save --into nowhere.ofn --yes").unwrap_err();
    assert!(err.message.contains("not a loaded document"), "{err}");
    s.execute("save --into abdomen.ofn --yes").unwrap();
    assert_eq!(
        std::fs::read_to_string(dir.join("abdomen.ofn")).unwrap(),
        edited(&abdomen, None, &format!("{axiom}\n"))
    );
    assert_eq!(
        std::fs::read_to_string(dir.join("spatial.ofn")).unwrap(),
        spatial
    );
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn a_new_class_gets_its_declaration_and_loads_back() {
    let (dir, abdomen, _) = copies("new");
    let mut s = session(&dir);
    s.execute("add :CaudateLobe SubClassOf :AnatomicalStructure")
        .unwrap();
    s.execute("save --yes").unwrap();
    assert_eq!(
        std::fs::read_to_string(dir.join("abdomen.ofn")).unwrap(),
        edited(
            &abdomen,
            None,
            "Declaration(Class(:CaudateLobe))\nSubClassOf(:CaudateLobe :AnatomicalStructure)\n"
        )
    );
    // The session now reads the saved files: the new class is known without edits.
    let out = s
        .execute("ask CaudateLobe SubClassOf AnatomicalStructure")
        .unwrap();
    assert!(out.starts_with("Yes"), "{out}");
    let _ = std::fs::remove_dir_all(&dir);
}

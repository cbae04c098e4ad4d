//! `check --init DIR`: a small suite and KB that pass, to start from a working example.

use super::CheckError;
use std::path::{Path, PathBuf};

/// The starter KB: a toy of our own (illustrative, not clinical guidance).
pub const STARTER_KB: &str = r#"Prefix(:=<https://example.org/starter#>)
Ontology(<https://example.org/starter>
# A toy knowledge base to start a suite from; illustrative, not clinical guidance.
Declaration(Class(:Organ)) Declaration(Class(:Liver)) Declaration(Class(:Kidney))
Declaration(Class(:Finding)) Declaration(Class(:CysticLesion))
Declaration(Class(:HepaticCyst)) Declaration(Class(:RenalCyst))
Declaration(ObjectProperty(:locatedIn))
Declaration(NamedIndividual(:liver1)) Declaration(NamedIndividual(:lesion1))
SubClassOf(:Liver :Organ)
SubClassOf(:Kidney :Organ)
DisjointClasses(:Liver :Kidney)
SubClassOf(:CysticLesion :Finding)
SubClassOf(:HepaticCyst :CysticLesion)
SubClassOf(:RenalCyst :CysticLesion)
SubClassOf(:HepaticCyst ObjectSomeValuesFrom(:locatedIn :Liver))
SubClassOf(:RenalCyst ObjectSomeValuesFrom(:locatedIn :Kidney))
ClassAssertion(:Liver :liver1)
)
"#;

/// The starter abducibles: the lesion classes that may be hypothesised.
pub const STARTER_ABDUCIBLES: &str = "# Classes that may be hypothesised (lines `class IRI`).
class https://example.org/starter#HepaticCyst
class https://example.org/starter#RenalCyst
";

/// The starter suite: three cases that pass on the starter KB.
pub const STARTER_CASES: &str = r#"# Regression cases for the starter KB: `wherefore check .` runs them.
# Paths are relative to this file.

[prefixes]
s = "https://example.org/starter#"

[[case]]
name = "cystic-lesion-is-explained"
kb = ["kb/starter.ofn"]
abducibles = "kb/abducibles.txt"
# The observation to explain, in OWL 2 functional syntax.
assertions = "ClassAssertion(s:CysticLesion s:lesion1)"

[case.expect]
consistent = true
top = ["ClassAssertion(s:HepaticCyst s:lesion1)"]
present = [["ClassAssertion(s:RenalCyst s:lesion1)"]]
max_rank = [{ explanation = ["ClassAssertion(s:RenalCyst s:lesion1)"], rank = 2 }]
unexplained = []

[case.expect.text.formal]
contains = ["HepaticCyst"]

[[case]]
name = "hepatic-cyst-entailments"
kb = ["kb/starter.ofn"]
assertions = "ClassAssertion(s:HepaticCyst s:lesion1)"

[case.expect]
entailed = [
    "ClassAssertion(s:Finding s:lesion1)",
    "SubClassOf(s:RenalCyst s:Finding)",
]
not_entailed = ["ClassAssertion(s:RenalCyst s:lesion1)"]
satisfiable = ["s:HepaticCyst"]

[[case]]
name = "liver-and-kidney-clash"
kb = ["kb/starter.ofn"]
assertions = "ClassAssertion(s:Kidney s:liver1)"

[case.expect]
consistent = false
"#;

/// Writes the starter suite into `dir` (created when missing); refuses to overwrite a file.
/// Returns the files written.
pub fn scaffold(dir: &Path) -> Result<Vec<PathBuf>, CheckError> {
    let files = [
        (dir.join("cases.toml"), STARTER_CASES),
        (dir.join("kb").join("starter.ofn"), STARTER_KB),
        (dir.join("kb").join("abducibles.txt"), STARTER_ABDUCIBLES),
    ];
    for (p, _) in &files {
        if p.exists() {
            return Err(CheckError(format!(
                "{}: already exists; choose an empty or new folder for --init",
                p.display()
            )));
        }
    }
    std::fs::create_dir_all(dir.join("kb"))
        .map_err(|e| CheckError(format!("{}: cannot create: {e}", dir.display())))?;
    let mut out = Vec::new();
    for (p, text) in files {
        crate::files::write_atomic(&p, text.as_bytes(), &[]).map_err(CheckError)?;
        out.push(p);
    }
    Ok(out)
}

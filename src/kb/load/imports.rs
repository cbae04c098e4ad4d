//! Finding the files of imported ontologies.

use std::path::{Path, PathBuf};

pub(super) fn canonical(p: &Path) -> PathBuf {
    std::fs::canonicalize(p).unwrap_or_else(|_| p.to_path_buf())
}

/// Finds a local file for an imported ontology IRI.
pub(super) fn resolve_import(iri: &str, importer: &Path, dirs: &[PathBuf]) -> Option<PathBuf> {
    if let Some(rest) = iri.strip_prefix("file://") {
        let p = PathBuf::from(rest);
        if p.is_file() {
            return Some(p);
        }
    }
    let last = iri
        .trim_end_matches(['/', '#'])
        .rsplit(['/', '#', ':'])
        .next()
        .unwrap_or("");
    if last.is_empty() {
        return None;
    }
    let mut names = vec![last.to_string()];
    if !last.contains('.') {
        for ext in ["ofn", "owl", "owx", "rdf", "xml"] {
            names.push(format!("{last}.{ext}"));
        }
    }
    let mut folders: Vec<PathBuf> = Vec::new();
    if let Some(parent) = importer.parent() {
        folders.push(if parent.as_os_str().is_empty() {
            PathBuf::from(".")
        } else {
            parent.to_path_buf()
        });
    }
    folders.extend(dirs.iter().cloned());
    for f in folders {
        for n in &names {
            let c = f.join(n);
            if c.is_file() {
                return Some(c);
            }
        }
    }
    None
}

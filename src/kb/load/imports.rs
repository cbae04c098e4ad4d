//! Finding the files of imported ontologies the way ontology editors do: an OASIS XML
//! catalog (`--catalog FILE`, or `catalog-v001.xml` beside an ontology), a `file:` IRI,
//! then a file named after the IRI's last segment beside the importing file or in an
//! `--import-dir`.

use crate::kb::KbError;
use horned_catalog::Catalog;
use std::path::{Path, PathBuf};

/// The catalog file name that ontology editors write beside an ontology.
pub(super) const CATALOG_BESIDE: &str = "catalog-v001.xml";

/// The file a path names, with links and `..` resolved where the file exists.
pub(super) fn canonical(p: &Path) -> PathBuf {
    std::fs::canonicalize(p).unwrap_or_else(|_| p.to_path_buf())
}

/// How well an import IRI names an ontology IRI.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub(super) enum Naming {
    /// Character for character.
    Exact,
    /// Equal once a trailing `/` or `#` is dropped from both, a slip editors tolerate.
    Trailing,
}

/// Whether `import` names the ontology called `name`, and how.
pub(super) fn naming(import: &str, name: &str) -> Option<Naming> {
    if import == name {
        Some(Naming::Exact)
    } else if import.trim_end_matches(['/', '#']) == name.trim_end_matches(['/', '#']) {
        Some(Naming::Trailing)
    } else {
        None
    }
}

/// Where imports are looked for.
pub(super) struct Resolver {
    /// Catalogs in the order they are asked: `--catalog` first, then those found beside
    /// the ontologies, in the order the ontologies were read.
    catalogs: Vec<(PathBuf, Catalog)>,
    import_dirs: Vec<PathBuf>,
}

impl Resolver {
    /// A resolver with the catalog named on the command line, if any.
    pub(super) fn new(catalog: Option<&Path>, import_dirs: &[PathBuf]) -> Result<Self, KbError> {
        let mut r = Resolver {
            catalogs: Vec::new(),
            import_dirs: import_dirs.to_vec(),
        };
        if let Some(c) = catalog {
            if !c.is_file() {
                return Err(KbError::Unreadable {
                    file: c.display().to_string(),
                    reason: "the catalog given with --catalog does not exist".into(),
                });
            }
            r.add_catalog(c)?;
        }
        Ok(r)
    }

    /// Takes in the `catalog-v001.xml` beside `ontology`, when there is one.
    pub(super) fn look_beside(&mut self, ontology: &Path) -> Result<(), KbError> {
        let folder = match ontology.parent() {
            Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
            _ => PathBuf::from("."),
        };
        let c = folder.join(CATALOG_BESIDE);
        if c.is_file() {
            self.add_catalog(&c)?;
        }
        Ok(())
    }

    fn add_catalog(&mut self, path: &Path) -> Result<(), KbError> {
        let key = canonical(path);
        if self.catalogs.iter().any(|(p, _)| *p == key) {
            return Ok(());
        }
        let catalog = Catalog::from_path(path).map_err(|e| KbError::Syntax {
            file: path.display().to_string(),
            reason: format!(
                "malformed XML catalog: {e}. Fix the catalog (OASIS XML Catalogs: <catalog><uri name=\"IRI\" uri=\"FILE\"/></catalog>) or move it away."
            ),
        })?;
        self.catalogs.push((key, catalog));
        Ok(())
    }

    /// Finds a local file for the ontology that `iri` imports from `importer`, and says
    /// when it was found only for the IRI without (or with) a trailing `/` or `#`.
    pub(super) fn find(&self, iri: &str, importer: &Path) -> Option<(PathBuf, Naming)> {
        let trimmed = iri.trim_end_matches(['/', '#']);
        let variants = [
            (iri.to_string(), Naming::Exact),
            (trimmed.to_string(), Naming::Trailing),
            (format!("{trimmed}/"), Naming::Trailing),
            (format!("{trimmed}#"), Naming::Trailing),
        ];
        for (v, how) in &variants {
            if *how == Naming::Trailing && v == iri {
                continue;
            }
            for (_, c) in &self.catalogs {
                if let Some(p) = c.resolve(v)
                    && p.is_file()
                {
                    return Some((p, *how));
                }
            }
        }
        if let Some(rest) = iri.strip_prefix("file://") {
            let p = PathBuf::from(rest);
            if p.is_file() {
                return Some((p, Naming::Exact));
            }
        }
        self.by_name(iri, importer).map(|p| (p, Naming::Exact))
    }

    /// A file named after the IRI's last segment, beside the importer or in an import
    /// folder.
    fn by_name(&self, iri: &str, importer: &Path) -> Option<PathBuf> {
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
            for ext in ["ofn", "owl", "owx", "rdf", "xml", "ttl", "nt", "omn"] {
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
        folders.extend(self.import_dirs.iter().cloned());
        for f in folders {
            for n in &names {
                let c = f.join(n);
                if c.is_file() && n != CATALOG_BESIDE {
                    return Some(c);
                }
            }
        }
        None
    }
}

/// The first cycle of the import graph (`edges[i]` lists what document `i` imports),
/// as document indices from the cycle's start back to it.
pub(super) fn find_cycle(edges: &[Vec<usize>]) -> Option<Vec<usize>> {
    // Depth-first search with colours (white 0, grey 1, black 2); a grey target closes
    // a cycle, read off the path stack.
    fn visit(
        i: usize,
        edges: &[Vec<usize>],
        colour: &mut [u8],
        path: &mut Vec<usize>,
    ) -> Option<Vec<usize>> {
        colour[i] = 1;
        path.push(i);
        for &j in &edges[i] {
            if colour[j] == 1 {
                let from = path.iter().position(|&k| k == j).unwrap_or(0);
                let mut cycle = path[from..].to_vec();
                cycle.push(j);
                return Some(cycle);
            }
            if colour[j] == 0
                && let Some(c) = visit(j, edges, colour, path)
            {
                return Some(c);
            }
        }
        path.pop();
        colour[i] = 2;
        None
    }
    let mut colour = vec![0u8; edges.len()];
    for i in 0..edges.len() {
        if colour[i] == 0 {
            let mut path = Vec::new();
            if let Some(c) = visit(i, edges, &mut colour, &mut path) {
                return Some(c);
            }
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    // Hand-derived: 0 → 1 → 2 → 1 closes the cycle 1 → 2 → 1; a diamond has none.
    #[test]
    fn finds_the_cycle() {
        assert_eq!(
            find_cycle(&[vec![1], vec![2], vec![1]]),
            Some(vec![1, 2, 1])
        );
        assert_eq!(find_cycle(&[vec![1, 2], vec![3], vec![3], vec![]]), None);
        assert_eq!(find_cycle(&[vec![0]]), Some(vec![0, 0]));
    }

    #[test]
    fn trailing_slash_or_hash_is_a_lesser_match() {
        assert_eq!(naming("http://x/o", "http://x/o"), Some(Naming::Exact));
        assert_eq!(naming("http://x/o", "http://x/o/"), Some(Naming::Trailing));
        assert_eq!(naming("http://x/o#", "http://x/o"), Some(Naming::Trailing));
        assert_eq!(naming("http://x/o", "http://x/p"), None);
    }

    // A catalog as ontology editors write it maps the import IRI to a file.
    #[test]
    fn catalog_maps_an_iri_to_a_file() {
        let dir = std::env::temp_dir().join(format!("wf-catalog-{}", std::process::id()));
        std::fs::create_dir_all(dir.join("sub")).unwrap();
        std::fs::write(dir.join("sub/upper.owl"), "Ontology(<http://x/upper>)").unwrap();
        std::fs::write(
            dir.join(CATALOG_BESIDE),
            "<?xml version=\"1.0\"?>\n<catalog prefer=\"public\" xmlns=\"urn:oasis:names:tc:entity:xmlns:xml:catalog\">\n  <uri name=\"http://x/upper\" uri=\"sub/upper.owl\"/>\n</catalog>\n",
        )
        .unwrap();
        let mut r = Resolver::new(None, &[]).unwrap();
        r.look_beside(&dir.join("main.ofn")).unwrap();
        let (p, how) = r.find("http://x/upper/", &dir.join("main.ofn")).unwrap();
        assert_eq!(canonical(&p), canonical(&dir.join("sub/upper.owl")));
        assert_eq!(how, Naming::Trailing);
        std::fs::write(dir.join("bad.xml"), "<catalog><uri name=").unwrap();
        let err = Resolver::new(Some(&dir.join("bad.xml")), &[])
            .err()
            .unwrap();
        assert!(err.to_string().contains("malformed XML catalog"), "{err}");
        std::fs::remove_dir_all(&dir).unwrap();
    }
}

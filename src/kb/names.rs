//! Entity look-up by short name, shared by the shell and the command line: by full IRI, by
//! prefixed name, by IRI fragment or by label. A name that fits several entities is an
//! error that lists the candidates; an unknown prefix is named as such with the known ones;
//! an unknown name gets "did you mean" suggestions (edit distance over fragments and
//! labels).

use crate::kb::{KnowledgeBase, OWL_NOTHING, OWL_THING};

/// The object properties every ontology has (OWL 2 Structural Specification §5.3).
const BUILT_IN_OBJECT: [&str; 2] = [
    "http://www.w3.org/2002/07/owl#topObjectProperty",
    "http://www.w3.org/2002/07/owl#bottomObjectProperty",
];
/// The data properties every ontology has.
const BUILT_IN_DATA: [&str; 2] = [
    "http://www.w3.org/2002/07/owl#topDataProperty",
    "http://www.w3.org/2002/07/owl#bottomDataProperty",
];
use std::collections::BTreeMap;

const RDFS_LABEL: &str = "http://www.w3.org/2000/01/rdf-schema#label";
const SKOS_PREF_LABEL: &str = "http://www.w3.org/2004/02/skos/core#prefLabel";

/// The kind of an entity.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Kind {
    /// A named class.
    Class,
    /// An object property.
    ObjectProperty,
    /// A data property.
    DataProperty,
    /// A named individual.
    Individual,
}

impl Kind {
    /// The kind in words.
    pub fn word(self) -> &'static str {
        match self {
            Kind::Class => "class",
            Kind::ObjectProperty => "object property",
            Kind::DataProperty => "data property",
            Kind::Individual => "individual",
        }
    }
}

/// One entity with the names it can be called by.
#[derive(Clone, Debug)]
pub struct Entity {
    /// Its kind.
    pub kind: Kind,
    /// Its full IRI.
    pub iri: String,
    /// The IRI's fragment (or last path segment).
    pub fragment: String,
    /// Its labels (rdfs:label, skos:prefLabel).
    pub labels: Vec<String>,
}

/// Every entity of a knowledge base, indexed by fragment and by lower-case label.
#[derive(Clone, Debug, Default)]
pub struct EntityIndex {
    /// The entities, sorted by kind then IRI.
    pub entities: Vec<Entity>,
    by_fragment: BTreeMap<String, Vec<usize>>,
    by_label: BTreeMap<String, Vec<usize>>,
    by_iri: BTreeMap<(String, Kind), usize>,
    /// Prefixes (name, IRI); the empty name is the default prefix `:`.
    pub prefixes: Vec<(String, String)>,
}

/// The fragment or last path segment of an IRI.
pub fn fragment(iri: &str) -> &str {
    iri.rsplit(['#', '/'])
        .next()
        .filter(|s| !s.is_empty())
        .unwrap_or(iri)
}

impl EntityIndex {
    /// Indexes the entities of `kb` with the given prefixes.
    pub fn new(kb: &KnowledgeBase, prefixes: Vec<(String, String)>) -> Self {
        let mut entities = Vec::new();
        let lists: [(Kind, Vec<&String>); 4] = [
            (Kind::Class, kb.vocab.classes.iter().collect()),
            (Kind::ObjectProperty, kb.vocab.props.iter().collect()),
            (Kind::DataProperty, kb.vocab.data_props.iter().collect()),
            (Kind::Individual, kb.vocab.individuals.iter().collect()),
        ];
        for (kind, iris) in lists {
            let mut iris: Vec<&String> =
                iris.into_iter().filter(|i| !i.starts_with("_:")).collect();
            iris.sort();
            for iri in iris {
                let mut labels: Vec<String> = [RDFS_LABEL, SKOS_PREF_LABEL]
                    .iter()
                    .flat_map(|p| kb.annotation(iri, p).iter().map(|v| v.value.clone()))
                    .collect();
                labels.sort();
                labels.dedup();
                entities.push(Entity {
                    kind,
                    iri: iri.clone(),
                    fragment: fragment(iri).to_string(),
                    labels,
                });
            }
        }
        let mut ix = EntityIndex {
            entities,
            prefixes,
            ..Default::default()
        };
        for (i, e) in ix.entities.iter().enumerate() {
            ix.by_fragment
                .entry(e.fragment.clone())
                .or_default()
                .push(i);
            for l in &e.labels {
                let v = ix.by_label.entry(l.to_lowercase()).or_default();
                if !v.contains(&i) {
                    v.push(i);
                }
            }
            ix.by_iri.insert((e.iri.clone(), e.kind), i);
        }
        ix
    }

    /// Whether an entity of this kind has this IRI.
    pub fn has(&self, iri: &str, kind: Kind) -> bool {
        self.by_iri.contains_key(&(iri.to_string(), kind))
            || match kind {
                Kind::Class => iri == OWL_THING || iri == OWL_NOTHING,
                Kind::ObjectProperty => BUILT_IN_OBJECT.contains(&iri),
                Kind::DataProperty => BUILT_IN_DATA.contains(&iri),
                Kind::Individual => false,
            }
    }

    /// The kinds under which an IRI is known.
    pub fn kinds_of(&self, iri: &str) -> Vec<Kind> {
        [
            Kind::Class,
            Kind::ObjectProperty,
            Kind::DataProperty,
            Kind::Individual,
        ]
        .into_iter()
        .filter(|k| self.has(iri, *k))
        .collect()
    }

    /// Expands a prefixed name `p:local` (or `:local`) when the prefix is known.
    pub fn expand(&self, name: &str) -> Option<String> {
        let (p, local) = name.split_once(':')?;
        if local.starts_with("//") {
            return None;
        }
        self.prefixes
            .iter()
            .find(|(q, _)| q == p)
            .map(|(_, iri)| format!("{iri}{local}"))
    }

    /// The shortest way to write an IRI: its fragment when that names one entity, else a
    /// prefixed name, else the full IRI in angle brackets.
    pub fn short(&self, iri: &str) -> String {
        if iri == OWL_THING {
            return "owl:Thing".into();
        }
        if iri == OWL_NOTHING {
            return "owl:Nothing".into();
        }
        let f = fragment(iri);
        if let Some(v) = self.by_fragment.get(f) {
            let distinct: std::collections::BTreeSet<&str> =
                v.iter().map(|&i| self.entities[i].iri.as_str()).collect();
            if distinct.len() == 1 && distinct.contains(iri) {
                return f.to_string();
            }
        }
        for (p, base) in &self.prefixes {
            if let Some(local) = iri.strip_prefix(base.as_str())
                && !local.is_empty()
                && local
                    .chars()
                    .all(|c| c.is_alphanumeric() || "_-.".contains(c))
            {
                return format!("{p}:{local}");
            }
        }
        // An IRI the KB does not know (a case individual of a facts file, say): its
        // fragment when no known entity has it.
        if !self.by_iri.keys().any(|(i, _)| i == iri)
            && !self.by_fragment.contains_key(f)
            && f != iri
        {
            return f.to_string();
        }
        format!("<{iri}>")
    }

    /// Resolves a name to one entity among the wanted kinds. `<IRI>` and known prefixed
    /// names are taken as they are (so new entities can be named); a bare word is looked up
    /// by fragment, then by label (case-insensitive).
    pub fn resolve(&self, name: &str, kinds: &[Kind]) -> Result<(Kind, String), String> {
        let want = |k: &Kind| kinds.contains(k);
        let pick = |iri: String| -> (Kind, String) {
            let k = self
                .kinds_of(&iri)
                .into_iter()
                .find(|k| kinds.contains(k))
                .unwrap_or(kinds[0]);
            (k, iri)
        };
        if let Some(iri) = name.strip_prefix('<').and_then(|n| n.strip_suffix('>')) {
            return Ok(pick(iri.to_string()));
        }
        match name {
            "Thing" | "owl:Thing" if want(&Kind::Class) => {
                return Ok((Kind::Class, OWL_THING.into()));
            }
            "Nothing" | "owl:Nothing" if want(&Kind::Class) => {
                return Ok((Kind::Class, OWL_NOTHING.into()));
            }
            _ => {}
        }
        if let Some(iri) = self.expand(name) {
            return Ok(pick(iri));
        }
        if let Some((p, local)) = name.split_once(':')
            && !local.starts_with("//")
            && !p.contains(char::is_whitespace)
        {
            let mut known: Vec<String> =
                self.prefixes.iter().map(|(q, _)| format!("{q}:")).collect();
            known.sort();
            return Err(format!(
                "unknown prefix `{p}:` in `{name}`; known prefixes: {}. Declare it in an ontology file, or write the full IRI in <...>",
                known.join(" ")
            ));
        }
        let mut cands: Vec<usize> = Vec::new();
        for i in self.by_fragment.get(name).into_iter().flatten() {
            if want(&self.entities[*i].kind) {
                cands.push(*i);
            }
        }
        if cands.is_empty() {
            for i in self
                .by_label
                .get(&name.to_lowercase())
                .into_iter()
                .flatten()
            {
                if want(&self.entities[*i].kind) {
                    cands.push(*i);
                }
            }
        }
        cands.sort();
        cands.dedup();
        let wanted = kinds
            .iter()
            .map(|k| k.word())
            .collect::<Vec<_>>()
            .join(" or ");
        match cands.len() {
            0 => Err(format!(
                "unknown {wanted} `{name}`; {}",
                self.did_you_mean(name, kinds).unwrap_or_else(|| {
                    "check the spelling, or write a prefixed name or a full IRI in <...>".into()
                })
            )),
            1 => {
                let e = &self.entities[cands[0]];
                Ok((e.kind, e.iri.clone()))
            }
            _ => Err(format!(
                "ambiguous: `{name}` may be {}; write a prefixed name or a full IRI",
                cands
                    .iter()
                    .map(|&i| {
                        let e = &self.entities[i];
                        format!("<{}> ({})", e.iri, e.kind.word())
                    })
                    .collect::<Vec<_>>()
                    .join(", ")
            )),
        }
    }

    /// "did you mean `A` or 'a label'?" with the names close to `name` (see `near`), if any.
    pub fn did_you_mean(&self, name: &str, kinds: &[Kind]) -> Option<String> {
        let near = self.near(name, kinds);
        (!near.is_empty()).then(|| {
            let quoted: Vec<String> = near
                .iter()
                .map(|n| {
                    if n.starts_with('\'') {
                        n.clone()
                    } else {
                        format!("`{n}`")
                    }
                })
                .collect();
            format!("did you mean {}?", quoted.join(" or "))
        })
    }

    /// Names close to `name` among the wanted kinds: IRI fragments and labels within an
    /// edit distance of a third of the name's length (at least 1, case ignored), closest
    /// first, at most three; a label is written quoted when it has spaces.
    pub fn near(&self, name: &str, kinds: &[Kind]) -> Vec<String> {
        let wanted = name.to_lowercase();
        let limit = (wanted.chars().count() / 3).max(1);
        let mut found: Vec<(usize, String)> = Vec::new();
        for e in self.entities.iter().filter(|e| kinds.contains(&e.kind)) {
            let shown = self.short(&e.iri);
            let mut best = distance(&wanted, &e.fragment.to_lowercase());
            let mut written = shown.clone();
            for l in &e.labels {
                let d = distance(&wanted, &l.to_lowercase());
                if d < best {
                    best = d;
                    written = if l.contains(char::is_whitespace) {
                        format!("'{l}'")
                    } else {
                        l.clone()
                    };
                }
            }
            if best <= limit {
                found.push((best, written));
            }
        }
        found.sort();
        found.dedup_by(|a, b| a.1 == b.1);
        found.into_iter().take(3).map(|(_, n)| n).collect()
    }

    /// Words for completion: every fragment, and every label (quoted when it has spaces).
    pub fn completion_words(&self) -> Vec<String> {
        let mut v: Vec<String> = Vec::new();
        for e in &self.entities {
            v.push(e.fragment.clone());
            for l in &e.labels {
                if l.contains(char::is_whitespace) {
                    v.push(format!("'{l}'"));
                } else {
                    v.push(l.clone());
                }
            }
        }
        v.sort();
        v.dedup();
        v
    }
}

/// The Levenshtein distance between two strings, counted in characters (Levenshtein
/// 1966; the two-row dynamic programme).
pub fn distance(a: &str, b: &str) -> usize {
    let a: Vec<char> = a.chars().collect();
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    let mut cur = vec![0; b.len() + 1];
    for (i, ca) in a.iter().enumerate() {
        cur[0] = i + 1;
        for (j, cb) in b.iter().enumerate() {
            let swap = prev[j] + usize::from(ca != cb);
            cur[j + 1] = swap.min(prev[j + 1] + 1).min(cur[j] + 1);
        }
        std::mem::swap(&mut prev, &mut cur);
    }
    prev[b.len()]
}

/// The standard prefixes known everywhere (OWL 2 Structural Specification §2.4) and our
/// annotation vocabulary's.
pub fn standard_prefixes() -> Vec<(String, String)> {
    [
        ("owl", "http://www.w3.org/2002/07/owl#"),
        ("rdf", "http://www.w3.org/1999/02/22-rdf-syntax-ns#"),
        ("rdfs", "http://www.w3.org/2000/01/rdf-schema#"),
        ("xsd", "http://www.w3.org/2001/XMLSchema#"),
        ("wf", "https://wherefore.example.org/ns/core#"),
    ]
    .iter()
    .map(|(a, b)| (a.to_string(), b.to_string()))
    .collect()
}

/// The standard prefixes and those the documents declare (in any syntax we read), the
/// first declaration of a name winning; `texts` are the documents' contents in load order.
pub fn prefixes_of<'a>(texts: impl IntoIterator<Item = &'a str>) -> Vec<(String, String)> {
    let mut prefixes = standard_prefixes();
    for text in texts {
        let crate::kb::load::syntax::Detected::Known(syntax) =
            crate::kb::load::syntax::detect(text)
        else {
            continue;
        };
        for (p, iri) in crate::kb::load::save::document_prefixes(text, syntax) {
            if !prefixes.iter().any(|(q, _)| *q == p) {
                prefixes.push((p, iri));
            }
        }
    }
    prefixes
}

/// The index of a loaded knowledge base, with the prefixes its files declare: what the
/// command line uses to read the same short names as the shell.
pub fn index_of_loaded(kb: &KnowledgeBase) -> EntityIndex {
    let texts: Vec<String> = kb
        .files
        .iter()
        .filter_map(|f| std::fs::read_to_string(f).ok())
        .collect();
    EntityIndex::new(kb, prefixes_of(texts.iter().map(|t| t.as_str())))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn index() -> EntityIndex {
        let mut kb = KnowledgeBase::new();
        let text = "Prefix(:=<http://x.org/o#>)\nDeclaration(Class(:Kidney))\nDeclaration(Class(:Liver))\nDeclaration(Class(:LeftKidney))\nAnnotationAssertion(rdfs:label :Liver \"hepatic organ\"@en)\nSubClassOf(:LeftKidney :Kidney)\n";
        crate::kb::load::load_axioms_text(&mut kb, "t", text).unwrap();
        let mut p = standard_prefixes();
        p.push((String::new(), "http://x.org/o#".into()));
        EntityIndex::new(&kb, p)
    }

    // Hand-derived: kitten → sitting is 3 (the textbook example), and the trivial cases.
    #[test]
    fn edit_distance() {
        assert_eq!(distance("kitten", "sitting"), 3);
        assert_eq!(distance("", "abc"), 3);
        assert_eq!(distance("kidney", "kidney"), 0);
        assert_eq!(distance("kidnee", "kidney"), 1);
    }

    // Hand-derived: `Kidnee` is one substitution from Kidney and three or more from the
    // others; a misspelt label is found through the label.
    #[test]
    fn unknown_names_get_suggestions() {
        let ix = index();
        let e = ix.resolve("Kidnee", &[Kind::Class]).unwrap_err();
        assert!(e.contains("did you mean `Kidney`?"), "{e}");
        let e = ix.resolve("hepatic organs", &[Kind::Class]).unwrap_err();
        assert!(e.contains("did you mean 'hepatic organ'?"), "{e}");
        let e = ix.resolve("Zzzzzz", &[Kind::Class]).unwrap_err();
        assert!(e.contains("check the spelling"), "{e}");
    }

    // An unknown prefix is named as a prefix, with the known ones listed.
    #[test]
    fn unknown_prefixes_are_named() {
        let e = index().resolve("ab:Kidney", &[Kind::Class]).unwrap_err();
        assert!(e.starts_with("unknown prefix `ab:` in `ab:Kidney`"), "{e}");
        assert!(
            e.contains("known prefixes: : owl: rdf: rdfs: wf: xsd:"),
            "{e}"
        );
        assert_eq!(
            index().resolve(":Kidney", &[Kind::Class]).unwrap().1,
            "http://x.org/o#Kidney"
        );
    }
}

//! Entity look-up for the shell: by full IRI, by prefixed name, by IRI fragment or by label.
//! A name that fits several entities is an error that lists the candidates.

use crate::kb::{KnowledgeBase, OWL_NOTHING, OWL_THING};
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
            || (kind == Kind::Class && (iri == OWL_THING || iri == OWL_NOTHING))
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
                "unknown {wanted} `{name}`; check the spelling, or write a prefixed name or a full IRI in <...>"
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

/// The `Prefix(name:=<IRI>)` declarations of an OWL 2 functional-syntax text.
pub fn scan_prefixes(text: &str) -> Vec<(String, String)> {
    let mut out = Vec::new();
    let mut rest = text;
    while let Some(i) = rest.find("Prefix(") {
        rest = &rest[i + 7..];
        let Some(eq) = rest.find(":=") else { break };
        let name = rest[..eq].trim();
        let after = &rest[eq + 2..];
        let (Some(lt), Some(gt)) = (after.find('<'), after.find('>')) else {
            break;
        };
        if lt < gt
            && name
                .chars()
                .all(|c| c.is_alphanumeric() || c == '_' || c == '-')
        {
            out.push((name.to_string(), after[lt + 1..gt].to_string()));
        }
    }
    out
}

//! The six ontology syntaxes we read and write, told apart by their content.

use serde::Serialize;

/// An ontology document syntax.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
pub enum Syntax {
    /// OWL 2 functional-style syntax (`Prefix(...)`, `Ontology(...)`).
    Functional,
    /// OWL 2 XML serialization (`<Ontology>` root element).
    OwlXml,
    /// RDF/XML (`<rdf:RDF>` root element).
    RdfXml,
    /// Turtle, with `@prefix` or SPARQL-style `PREFIX` declarations.
    Turtle,
    /// N-Triples (one `<s> <p> <o> .` triple a line).
    NTriples,
    /// OWL 2 Manchester syntax documents (`Prefix:`, `Ontology:`, frames).
    Manchester,
}

impl Syntax {
    /// Every syntax, in a fixed order.
    pub const ALL: [Syntax; 6] = [
        Syntax::Functional,
        Syntax::OwlXml,
        Syntax::RdfXml,
        Syntax::Turtle,
        Syntax::NTriples,
        Syntax::Manchester,
    ];

    /// The name people use for it.
    pub fn name(self) -> &'static str {
        match self {
            Syntax::Functional => "OWL 2 functional syntax",
            Syntax::OwlXml => "OWL/XML",
            Syntax::RdfXml => "RDF/XML",
            Syntax::Turtle => "Turtle",
            Syntax::NTriples => "N-Triples",
            Syntax::Manchester => "Manchester syntax",
        }
    }

    /// The usual file extension.
    pub fn extension(self) -> &'static str {
        match self {
            Syntax::Functional => "ofn",
            Syntax::OwlXml => "owx",
            Syntax::RdfXml => "rdf",
            Syntax::Turtle => "ttl",
            Syntax::NTriples => "nt",
            Syntax::Manchester => "omn",
        }
    }

    /// Whether the document is an RDF graph (read through the OWL 2 RDF mapping).
    pub fn is_rdf(self) -> bool {
        matches!(self, Syntax::RdfXml | Syntax::Turtle | Syntax::NTriples)
    }

    /// The RDF serialization, for the RDF syntaxes.
    pub(super) fn rdf_format(self) -> Option<oxrdfio::RdfFormat> {
        match self {
            Syntax::RdfXml => Some(oxrdfio::RdfFormat::RdfXml),
            // Turtle reads N-Triples too; a file taken for N-Triples that uses a Turtle
            // abbreviation still loads.
            Syntax::Turtle | Syntax::NTriples => Some(oxrdfio::RdfFormat::Turtle),
            _ => None,
        }
    }
}

/// The sentence that lists what we read, for messages.
pub const READABLE: &str =
    "OWL 2 functional syntax, OWL/XML, RDF/XML, Turtle, N-Triples or Manchester syntax";

/// What the content of a document says about its syntax.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Detected {
    /// One of the syntaxes we read.
    Known(Syntax),
    /// An OBO flat file, which we recognise but do not read.
    Obo,
    /// Nothing we recognise.
    Unknown,
}

/// Tells the syntax of a document from its first meaningful characters; the file's
/// extension plays no part, so a `.owl` file may hold any of them.
pub fn detect(text: &str) -> Detected {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let trimmed = text.trim_start();
    if trimmed.starts_with("<?xml") || trimmed.starts_with("<!") {
        return xml_root(trimmed);
    }
    for line in trimmed.lines() {
        let l = line.trim();
        if l.is_empty() || l.starts_with('#') {
            continue;
        }
        return detect_line(l, trimmed);
    }
    Detected::Unknown
}

/// The syntax that a document's first non-comment line starts.
fn detect_line(l: &str, whole: &str) -> Detected {
    let lower = l.to_ascii_lowercase();
    if l.starts_with('<') {
        // `<s> <p> …` is a triple; anything else starting with `<` is XML.
        if l.contains("> <") || l.contains(">\t<") || l.contains("> a ") {
            let turtle = whole.lines().any(|x| {
                let x = x.trim_start().to_ascii_lowercase();
                x.starts_with("@prefix") || x.starts_with("prefix ") || x.starts_with("@base")
            }) || whole.contains(';');
            return Detected::Known(if turtle {
                Syntax::Turtle
            } else {
                Syntax::NTriples
            });
        }
        return xml_root(l);
    }
    if l.starts_with("_:") {
        return Detected::Known(Syntax::NTriples);
    }
    if l.starts_with("Prefix(") || l.starts_with("Ontology(") || l.starts_with("Import(") {
        return Detected::Known(Syntax::Functional);
    }
    if lower.starts_with("@prefix") || lower.starts_with("@base") {
        return Detected::Known(Syntax::Turtle);
    }
    // SPARQL-style `PREFIX ex: <…>` / `BASE <…>` (Turtle 1.1 §2.4); Manchester's
    // `Prefix: ex: <…>` has the colon right after the keyword.
    if let Some(rest) = lower
        .strip_prefix("prefix")
        .filter(|r| r.starts_with(char::is_whitespace))
        && let (Some(colon), Some(iri)) = (rest.find(':'), rest.find('<'))
        && colon < iri
    {
        return Detected::Known(Syntax::Turtle);
    }
    if lower
        .strip_prefix("base")
        .is_some_and(|r| r.trim_start().starts_with('<'))
    {
        return Detected::Known(Syntax::Turtle);
    }
    const FRAMES: [&str; 9] = [
        "Prefix:",
        "Ontology:",
        "Class:",
        "ObjectProperty:",
        "DataProperty:",
        "AnnotationProperty:",
        "Individual:",
        "Datatype:",
        "Import:",
    ];
    if FRAMES.iter().any(|f| l.starts_with(f)) {
        return Detected::Known(Syntax::Manchester);
    }
    if l.starts_with("format-version:") || l.starts_with("[Term]") || l.starts_with("[Typedef]") {
        return Detected::Obo;
    }
    Detected::Unknown
}

/// The syntax named by an XML document's root element: `rdf:RDF` or `Ontology`.
fn xml_root(s: &str) -> Detected {
    let mut rest = s;
    loop {
        let Some(lt) = rest.find('<') else {
            return Detected::Unknown;
        };
        rest = &rest[lt..];
        let skip = if rest.starts_with("<?") {
            rest.find("?>").map(|i| i + 2)
        } else if rest.starts_with("<!--") {
            rest.find("-->").map(|i| i + 3)
        } else if rest.starts_with("<!DOCTYPE") {
            // The internal subset may hold `>` inside entity declarations.
            match (rest.find('['), rest.find('>')) {
                (Some(open), Some(gt)) if open < gt => rest.find("]>").map(|i| i + 2),
                (_, Some(gt)) => Some(gt + 1),
                _ => None,
            }
        } else if rest.starts_with("<!") {
            rest.find('>').map(|i| i + 1)
        } else {
            let name = rest[1..]
                .split(|c: char| c.is_whitespace() || c == '>' || c == '/')
                .next()
                .unwrap_or("");
            let local = name.rsplit(':').next().unwrap_or(name);
            return match local {
                "RDF" => Detected::Known(Syntax::RdfXml),
                "Ontology" => Detected::Known(Syntax::OwlXml),
                _ => Detected::Unknown,
            };
        };
        match skip {
            Some(i) => rest = &rest[i..],
            None => return Detected::Unknown,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // Each document below is the smallest opening of its syntax as its W3C
    // recommendation writes it (hand-written from the recommendations' examples).
    #[test]
    fn tells_each_syntax_by_content() {
        let cases = [
            (
                "Prefix(:=<http://x/>)\nOntology(<http://x/o>)",
                Syntax::Functional,
            ),
            ("# comment\nOntology(<http://x/o>\n)", Syntax::Functional),
            (
                "<?xml version=\"1.0\"?>\n<Ontology xmlns=\"http://www.w3.org/2002/07/owl#\"/>",
                Syntax::OwlXml,
            ),
            (
                "<?xml version=\"1.0\"?>\n<!DOCTYPE rdf:RDF [\n<!ENTITY owl \"http://www.w3.org/2002/07/owl#\" >\n]>\n<rdf:RDF xmlns:rdf=\"x\"/>",
                Syntax::RdfXml,
            ),
            ("<rdf:RDF xmlns:rdf=\"x\">", Syntax::RdfXml),
            ("@prefix : <http://x/> .\n: a <http://y> .", Syntax::Turtle),
            (
                "PREFIX owl: <http://www.w3.org/2002/07/owl#>\n",
                Syntax::Turtle,
            ),
            ("prefix : <http://x/>\n", Syntax::Turtle),
            ("BASE <http://x/>\n", Syntax::Turtle),
            (
                "<http://x/o> <http://www.w3.org/1999/02/22-rdf-syntax-ns#type> <http://www.w3.org/2002/07/owl#Ontology> .",
                Syntax::NTriples,
            ),
            (
                "Prefix: : <http://x/>\nOntology: <http://x/o>",
                Syntax::Manchester,
            ),
            ("Ontology: <http://x/o>\nClass: A", Syntax::Manchester),
        ];
        for (text, want) in cases {
            assert_eq!(detect(text), Detected::Known(want), "{text}");
        }
        assert_eq!(detect("format-version: 1.2\n"), Detected::Obo);
        assert_eq!(detect("hello"), Detected::Unknown);
        assert_eq!(detect("<html><body/></html>"), Detected::Unknown);
    }
}

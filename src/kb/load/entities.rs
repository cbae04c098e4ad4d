//! A guard against XML entity expansion bombs ("billion laughs"): the RDF/XML reader
//! expands the entities that a document's DOCTYPE declares, each in terms of the
//! earlier ones, so ten nested entities of ten references make a gigabyte.

/// The longest text one entity may stand for. Editors declare entities for namespace
/// IRIs, a few dozen characters long.
const ENTITY_LIMIT: usize = 64 * 1024;
/// The most text that all entity references of a document may expand to together.
const DOCUMENT_LIMIT: usize = 64 * 1024 * 1024;

/// Refuses a document whose declared entities would expand beyond the limits above;
/// the reason names the entity and the line of its declaration.
pub(super) fn check_entities(text: &str) -> Result<(), String> {
    let Some(start) = text.find("<!DOCTYPE") else {
        return Ok(());
    };
    let rest = &text[start..];
    let (Some(open), Some(gt)) = (rest.find('['), rest.find('>')) else {
        return Ok(());
    };
    if open > gt {
        return Ok(());
    }
    let Some(close) = rest.find("]>") else {
        return Ok(());
    };
    let subset = &rest[open..close];
    // Expanded length of each entity, in declaration order (a reference can only use an
    // entity declared before it).
    let mut sizes: Vec<(String, usize)> = Vec::new();
    let mut pos = 0;
    while let Some(i) = subset[pos..].find("<!ENTITY") {
        let decl_at = pos + i;
        let body = &subset[decl_at + 8..];
        let end = body.find('>').unwrap_or(body.len());
        let decl = &body[..end];
        pos = decl_at + 8 + end;
        let mut words = decl.split_whitespace();
        let name = words.next().unwrap_or("").to_string();
        let value = quoted(decl).unwrap_or("");
        let size = expanded(value, &sizes);
        if size > ENTITY_LIMIT {
            let line = text[..start + open + decl_at].matches('\n').count() + 1;
            return Err(format!(
                "line {line}: the XML entity '{name}' would expand to {} bytes or more (an entity expansion bomb); refused. Remove the nested entity declarations from the DOCTYPE.",
                size.min(usize::MAX / 2)
            ));
        }
        sizes.push((name, size));
    }
    let body = &text[start + close..];
    let total = expanded(body, &sizes);
    if total > DOCUMENT_LIMIT {
        return Err(format!(
            "the XML entity references of this document would expand to more than {} MB (an entity expansion bomb); refused. Write the IRIs out or use fewer entity references.",
            DOCUMENT_LIMIT >> 20
        ));
    }
    Ok(())
}

/// The text between the first pair of matching quotes.
fn quoted(decl: &str) -> Option<&str> {
    let q = decl.find(['"', '\''])?;
    let quote = decl[q..].chars().next()?;
    let after = &decl[q + 1..];
    Some(&after[..after.find(quote)?])
}

/// The length of `text` with every `&name;` of a known entity expanded (saturating).
fn expanded(text: &str, sizes: &[(String, usize)]) -> usize {
    let mut total = text.len();
    let mut rest = text;
    while let Some(amp) = rest.find('&') {
        rest = &rest[amp + 1..];
        let Some(semi) = rest.find(';') else { break };
        let name = &rest[..semi];
        if let Some((_, size)) = sizes.iter().rev().find(|(n, _)| n == name) {
            total = total.saturating_add(*size);
        }
        rest = &rest[semi + 1..];
    }
    total
}

#[cfg(test)]
mod tests {
    use super::check_entities;

    /// The classic "billion laughs" document: lol9 stands for 10⁹ copies of "lol"
    /// (hand-derived: each level multiplies by ten).
    #[test]
    fn refuses_the_billion_laughs() {
        let mut doc =
            String::from("<?xml version=\"1.0\"?>\n<!DOCTYPE rdf:RDF [\n<!ENTITY lol \"lol\">\n");
        for i in 1..10 {
            let prev = if i == 1 {
                "lol".to_string()
            } else {
                format!("lol{}", i - 1)
            };
            doc.push_str(&format!(
                "<!ENTITY lol{i} \"{}\">\n",
                format!("&{prev};").repeat(10)
            ));
        }
        doc.push_str("]>\n<rdf:RDF>&lol9;</rdf:RDF>\n");
        let err = check_entities(&doc).unwrap_err();
        // Counting each value's own text too, lol4 = 60 + 10·(60 + 10·(60 + 10·80)) =
        // 86,660 bytes is the first over 64 KiB; it is declared on line 7.
        assert!(err.contains("line 7") && err.contains("'lol4'"), "{err}");
    }

    /// Namespace entities as editors write them pass.
    #[test]
    fn accepts_namespace_entities() {
        let doc = "<?xml version=\"1.0\"?>\n<!DOCTYPE rdf:RDF [\n<!ENTITY owl \"http://www.w3.org/2002/07/owl#\" >\n<!ENTITY x \"http://x.org/\" >\n]>\n<rdf:RDF><owl:Class rdf:about=\"&x;A\"/></rdf:RDF>";
        assert_eq!(check_entities(doc), Ok(()));
    }
}

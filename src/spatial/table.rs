//! The label table: which label value of which map is which individual of which class.
//!
//! Tab-separated, header `value individual class` or `map value individual class` (tabs), with
//! an optional last column `role` (`anatomy` or `finding`). Blank lines and lines starting
//! with `#` are ignored.

use super::SpatialError;
use serde::Serialize;
use std::path::Path;

/// Whether a region is anatomy or a finding (a lesion).
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Role {
    /// An organ or other anatomical structure.
    Anatomy,
    /// A lesion or other finding.
    Finding,
}

/// One row of the table.
#[derive(Clone, Debug, PartialEq)]
pub struct TableRow {
    /// The map's file name, when the table has a `map` column.
    pub map: Option<String>,
    /// The label value.
    pub value: i64,
    /// The individual's id.
    pub individual: String,
    /// The class IRI (without angle brackets).
    pub class: String,
    /// The role, from the `role` column or from the class name.
    pub role: Role,
    /// 1-based line in the table file.
    pub line: usize,
}

/// Words that make a class a finding when the table has no `role` column: the class IRI's
/// local name contains one of them, case-insensitively.
pub const FINDING_WORDS: [&str; 7] = [
    "lesion", "tumor", "tumour", "nodule", "cyst", "metasta", "mass",
];

/// The role a class IRI implies by its local name (see [`FINDING_WORDS`]).
pub fn role_from_class(iri: &str) -> Role {
    let local = iri
        .rsplit(['#', '/', ':'])
        .next()
        .unwrap_or(iri)
        .to_lowercase();
    if FINDING_WORDS.iter().any(|w| local.contains(w)) {
        Role::Finding
    } else {
        Role::Anatomy
    }
}

/// Reads and checks a label table.
pub fn read_table(path: &Path) -> Result<Vec<TableRow>, SpatialError> {
    let file = path.display().to_string();
    let text = std::fs::read_to_string(path).map_err(|e| SpatialError::Table {
        file: file.clone(),
        line: 0,
        message: format!("cannot read: {e}"),
    })?;
    parse_table(&text, &file)
}

/// Parses a label table's text; `file` names it in errors.
pub fn parse_table(text: &str, file: &str) -> Result<Vec<TableRow>, SpatialError> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let err = |line: usize, m: String| SpatialError::Table {
        file: file.to_string(),
        line,
        message: m,
    };
    let mut lines = text
        .lines()
        .enumerate()
        .map(|(n, l)| (n + 1, l.trim_end_matches('\r')))
        .filter(|(_, l)| {
            let t = l.trim();
            !t.is_empty() && !t.starts_with('#')
        });
    let (hline, header) = lines.next().ok_or_else(|| {
        err(
            0,
            "empty table; the first line must be `value\tindividual\tclass`".into(),
        )
    })?;
    let cols: Vec<String> = header
        .split('\t')
        .map(|c| c.trim().to_lowercase())
        .collect();
    let with_map = match cols
        .iter()
        .map(String::as_str)
        .collect::<Vec<_>>()
        .as_slice()
    {
        ["value", "individual", "class"] | ["value", "individual", "class", "role"] => false,
        ["map", "value", "individual", "class"]
        | ["map", "value", "individual", "class", "role"] => true,
        _ => {
            return Err(err(
                hline,
                format!(
                    "header {header:?} must be `value\tindividual\tclass` or `map\tvalue\tindividual\tclass` (tab-separated, optional last column `role`)"
                ),
            ));
        }
    };
    let with_role = cols.last().map(String::as_str) == Some("role");
    let ncols = cols.len();
    let mut rows: Vec<TableRow> = Vec::new();
    for (n, line) in lines {
        let f: Vec<&str> = line.split('\t').map(str::trim).collect();
        if f.len() != ncols {
            return Err(err(
                n,
                format!("{} tab-separated fields, the header has {ncols}", f.len()),
            ));
        }
        let (map, rest) = if with_map {
            (Some(f[0].to_string()), &f[1..])
        } else {
            (None, &f[..])
        };
        let value: i64 = rest[0]
            .parse()
            .map_err(|_| err(n, format!("label value {:?} is not an integer", rest[0])))?;
        if value == 0 {
            return Err(err(
                n,
                "label value 0 is the background and cannot be an individual".into(),
            ));
        }
        let individual = rest[1].to_string();
        if individual.is_empty()
            || individual
                .chars()
                .any(|c| c.is_whitespace() || c == '<' || c == '>' || c == '"')
        {
            return Err(err(
                n,
                format!(
                    "individual {individual:?} must be a non-empty name without spaces, quotes or angle brackets"
                ),
            ));
        }
        let class = rest[2]
            .trim_start_matches('<')
            .trim_end_matches('>')
            .to_string();
        if !class.contains(':')
            || class
                .chars()
                .any(|c| c.is_whitespace() || c == '<' || c == '>' || c == '"')
        {
            return Err(err(
                n,
                format!(
                    "class {:?} is not a full IRI (e.g. http://example.org/anatomy#Liver)",
                    rest[2]
                ),
            ));
        }
        let role = if with_role {
            match rest[3].to_lowercase().as_str() {
                "anatomy" => Role::Anatomy,
                "finding" => Role::Finding,
                other => {
                    return Err(err(
                        n,
                        format!("role {other:?} must be `anatomy` or `finding`"),
                    ));
                }
            }
        } else {
            role_from_class(&class)
        };
        if let Some(prev) = rows.iter().find(|r| r.individual == individual) {
            return Err(err(
                n,
                format!(
                    "individual {individual:?} already named on line {}",
                    prev.line
                ),
            ));
        }
        if let Some(prev) = rows.iter().find(|r| r.value == value && r.map == map) {
            return Err(err(
                n,
                format!("label value {value} already given on line {}", prev.line),
            ));
        }
        rows.push(TableRow {
            map,
            value,
            individual,
            class,
            role,
            line: n,
        });
    }
    if rows.is_empty() {
        return Err(err(hline, "the table names no label".into()));
    }
    Ok(rows)
}

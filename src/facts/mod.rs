//! The facts file schema (serde): what `measure` writes and what the reasoning side reads.
//! Field order and sorting follow the command-line contract (section `measure`).

pub mod abox;
pub mod measure;

use serde::{Deserialize, Serialize};

/// The value of the `format` field.
pub const FORMAT: &str = "wherefore-facts";
/// The value of the `version` field.
pub const VERSION: u32 = 1;

/// A facts file.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Facts {
    /// Always [`FORMAT`].
    pub format: String,
    /// Always [`VERSION`].
    pub version: u32,
    /// The grid the facts were measured on.
    pub source: Source,
    /// Regions, sorted by label value, then map.
    pub individuals: Vec<Individual>,
    /// Fuzzy and crisp relations, sorted by subject, object, relation.
    pub relations: Vec<Relation>,
    /// Quantities, sorted by subject, object, quantity.
    pub measurements: Vec<Measurement>,
    /// How the facts were computed.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub provenance: Option<Provenance>,
}

/// The label maps and their grid.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Source {
    /// File names as given, without folders.
    pub files: Vec<String>,
    /// Grid size.
    pub shape: [usize; 3],
    /// Voxel-to-world (RAS mm) matrix, row-major 4×4.
    pub affine: [[f64; 4]; 4],
}

/// One region.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Individual {
    /// Individual id from the label table.
    pub id: String,
    /// Class IRI.
    pub class: String,
    /// Label value.
    pub label_value: i64,
    /// Number of labelled voxels.
    pub voxels: usize,
    /// Volume in millilitres.
    pub volume_ml: f64,
    /// Mean voxel centre, RAS mm.
    pub centroid_mm: [f64; 3],
    /// Bounding box of voxel centres, RAS mm: [min, max].
    pub bbox_mm: [[f64; 3]; 2],
    /// The label map it comes from (file name).
    #[serde(default)]
    pub map: String,
    /// `anatomy` or `finding`.
    #[serde(default)]
    pub role: String,
    /// Voxels of the extent (after hole filling).
    #[serde(default)]
    pub extent_voxels: usize,
    /// Largest distance between two voxel centres, mm.
    #[serde(default)]
    pub largest_diameter_mm: f64,
}

/// A relation with a degree in [0, 1].
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Relation {
    /// Subject individual id.
    pub subject: String,
    /// Relation name.
    pub relation: String,
    /// Object individual id.
    pub object: String,
    /// Degree in [0, 1].
    pub degree: f64,
}

/// A measured quantity between two regions.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Measurement {
    /// Subject individual id.
    pub subject: String,
    /// Object individual id.
    pub object: String,
    /// Quantity name.
    pub quantity: String,
    /// Value (mm, or a fraction).
    pub value: f64,
}

/// Method, parameters and tool version behind a facts file.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Provenance {
    /// Tool name.
    pub tool: String,
    /// Tool version.
    pub version: String,
    /// Which header fields gave the voxel-to-world transform (sform, qform or pixdim).
    pub affine_source: String,
    /// One line per method used.
    pub methods: Vec<String>,
    /// The parameters in force.
    pub parameters: serde_json::Value,
    /// The pair selection in force (`--pairs`), `*:*` by default.
    pub pairs: Vec<String>,
}

impl Facts {
    /// Sorts individuals, relations and measurements as the contract states.
    pub fn sort(&mut self) {
        self.individuals.sort_by(|a, b| {
            a.label_value
                .cmp(&b.label_value)
                .then_with(|| a.map.cmp(&b.map))
        });
        self.relations.sort_by(|a, b| {
            (&a.subject, &a.object, &a.relation).cmp(&(&b.subject, &b.object, &b.relation))
        });
        self.measurements.sort_by(|a, b| {
            (&a.subject, &a.object, &a.quantity).cmp(&(&b.subject, &b.object, &b.quantity))
        });
    }

    /// Pretty JSON with a final newline; byte-identical for equal facts.
    pub fn to_json(&self) -> String {
        let mut s = serde_json::to_string_pretty(self)
            .unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"));
        s.push('\n');
        s
    }
}

/// Reads and checks a facts file (contract, `measure`).
pub fn read_facts(path: &std::path::Path) -> Result<Facts, String> {
    let text = std::fs::read_to_string(path)
        .map_err(|e| format!("{}: cannot read: {e}", path.display()))?;
    let facts: Facts = serde_json::from_str(&text).map_err(|e| {
        format!(
            "{}: line {}, column {}: not a facts file: {e}",
            path.display(),
            e.line(),
            e.column()
        )
    })?;
    if facts.format != FORMAT {
        return Err(format!(
            "{}: format is {:?}, expected {:?}",
            path.display(),
            facts.format,
            FORMAT
        ));
    }
    Ok(facts)
}

/// Measures label maps with their table (default settings of `measure`) and
/// returns the facts; shared by batch `report` and `check` so both read maps the same way.
pub fn from_label_maps(
    maps: &[std::path::PathBuf],
    labels: &std::path::Path,
) -> Result<Facts, String> {
    let maps: Vec<_> = maps
        .iter()
        .map(|p| crate::spatial::nifti_io::read_label_map(p).map_err(|e| e.to_string()))
        .collect::<Result<_, _>>()?;
    let rows = crate::spatial::table::read_table(labels).map_err(|e| e.to_string())?;
    let m = measure::measure(
        &maps,
        &rows,
        &labels.display().to_string(),
        &Default::default(),
    )
    .map_err(|e| e.to_string())?;
    Ok(m.facts)
}

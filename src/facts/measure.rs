//! The `measure` pipeline's last step: the geometry that `spatial::measure` measured,
//! written as a facts file (individuals, relations that hold to a positive degree, finite
//! measurements, provenance), sorted as the command-line contract says.

use super::{FORMAT, Facts, Individual, Measurement, Provenance, Relation, Source, VERSION};
use crate::spatial::SpatialError;
use crate::spatial::affine::round_to;
use crate::spatial::measure::{Geometry, MeasureOptions, measure_regions};
use crate::spatial::nifti_io::LabelMap;
use crate::spatial::table::{Role, TableRow};

/// The facts of a measurement with the geometry they were written from.
pub struct Measured {
    /// The facts file content.
    pub facts: Facts,
    /// The regions and per-pair values (for pictures) and the warnings.
    pub geometry: Geometry,
}

/// Measures the label maps (`spatial::measure::measure_regions`) and writes the facts.
pub fn measure(
    maps: &[LabelMap],
    rows: &[TableRow],
    table_file: &str,
    opts: &MeasureOptions,
) -> Result<Measured, SpatialError> {
    let geometry = measure_regions(maps, rows, table_file, opts)?;
    let facts = facts_of(maps, &geometry, opts);
    Ok(Measured { facts, geometry })
}

/// The facts file of a measurement of `maps`.
pub fn facts_of(maps: &[LabelMap], g: &Geometry, opts: &MeasureOptions) -> Facts {
    let relations = g
        .relations()
        .map(|(subject, relation, object, degree)| Relation {
            subject: subject.to_string(),
            relation: relation.to_string(),
            object: object.to_string(),
            degree,
        })
        .collect();
    let mut measurements = Vec::new();
    for p in &g.pairs {
        for (name, value) in &p.measurements {
            if value.is_finite() {
                measurements.push(Measurement {
                    subject: g.regions[p.subject].id.clone(),
                    object: g.regions[p.object].id.clone(),
                    quantity: name.clone(),
                    value: *value,
                });
            }
        }
    }
    let individuals = g
        .regions
        .iter()
        .map(|r| Individual {
            id: r.id.clone(),
            class: r.class.clone(),
            label_value: r.value,
            voxels: r.voxels,
            volume_ml: round_to(r.volume_ml, 1e6),
            centroid_mm: r.centroid_mm.map(|v| round_to(v, 1e4)),
            bbox_mm: r.bbox_mm.map(|c| c.map(|v| round_to(v, 1e4))),
            map: r.map_name.clone(),
            role: match r.role {
                Role::Anatomy => "anatomy".into(),
                Role::Finding => "finding".into(),
            },
            extent_voxels: r.extent_voxels,
            largest_diameter_mm: round_to(r.largest_diameter_mm, 1e4),
        })
        .collect();
    let provenance = Provenance {
        tool: "wherefore".into(),
        version: env!("CARGO_PKG_VERSION").into(),
        affine_source: format!("{:?}", maps[0].affine_source).to_lowercase(),
        methods: g.methods.clone(),
        parameters: serde_json::to_value(opts.config).unwrap_or(serde_json::Value::Null),
        pairs: g.pair_texts.clone(),
    };
    let mut facts = Facts {
        format: FORMAT.into(),
        version: VERSION,
        source: Source {
            files: maps.iter().map(|m| m.name.clone()).collect(),
            shape: maps[0].shape,
            affine: maps[0].affine.rounded(),
        },
        individuals,
        relations,
        measurements,
        provenance: Some(provenance),
    };
    facts.sort();
    facts
}

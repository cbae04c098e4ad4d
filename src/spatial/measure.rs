//! The geometry of the `measure` pipeline: label maps and a label table in; regions and,
//! per pair of the plan, its relations with degrees and its measurements out. The facts
//! layer (`facts::measure`) writes them as a facts file.

use super::SpatialError;
use super::affine::round_to;
use super::config::MeasureConfig;
use super::edt::{edt_squared, edt_squared_into};
use super::landscape::{CellLayout, FastLandscape, LandscapeMode, cell_count};
use super::mask::{Adjacency, Mask};
use super::nifti_io::LabelMap;
use super::rcc8::{Rcc8, relate_counted};
use super::region::{Region, RegionSpec, build_regions};
use super::structuring::{Direction, exact_degree};
use super::table::{Role, TableRow};
use rayon::prelude::*;
use std::collections::BTreeMap;

/// Largest number of angle evaluations a plan may ask of the exact landscape.
pub const EXACT_WORK_LIMIT: f64 = 2.0e11;

/// One side of a pair selection.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Selector {
    /// Every region.
    All,
    /// Regions with this role.
    Role(Role),
    /// The region with this individual id, or every region of this class IRI.
    Name(String),
}

impl Selector {
    fn matches(&self, r: &Region) -> bool {
        match self {
            Selector::All => true,
            Selector::Role(role) => r.role == *role,
            Selector::Name(n) => r.id == *n || r.class == *n,
        }
    }
}

/// A pair selection `SUBJECTS>OBJECTS`: ordered pairs (a, b), a ≠ b, a matching a subject
/// selector and b an object selector.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct PairSelection {
    /// Subject selectors (any may match).
    pub subjects: Vec<Selector>,
    /// Object selectors (any may match).
    pub objects: Vec<Selector>,
    /// The text it was parsed from.
    pub text: String,
}

impl PairSelection {
    /// Every ordered pair.
    pub fn all() -> Self {
        PairSelection {
            subjects: vec![Selector::All],
            objects: vec![Selector::All],
            text: "*>*".into(),
        }
    }

    /// Parses `SUBJECTS>OBJECTS`; each side is a comma-separated list of `*`, `finding`,
    /// `anatomy`, individual ids and class IRIs.
    pub fn parse(text: &str) -> Result<Self, String> {
        let (s, o) = text
            .split_once('>')
            .ok_or_else(|| format!("--pairs {text:?}: expected SUBJECTS>OBJECTS, e.g. finding>anatomy or lesion1,lesion2>liver"))?;
        let side = |t: &str| -> Result<Vec<Selector>, String> {
            let items: Vec<Selector> = t
                .split(',')
                .map(str::trim)
                .filter(|x| !x.is_empty())
                .map(|x| match x {
                    "*" => Selector::All,
                    "finding" => Selector::Role(Role::Finding),
                    "anatomy" => Selector::Role(Role::Anatomy),
                    other => Selector::Name(other.trim_start_matches('<').to_string()),
                })
                .collect();
            if items.is_empty() {
                Err(format!(
                    "--pairs {text:?}: a side is empty; use * for every region"
                ))
            } else {
                Ok(items)
            }
        };
        Ok(PairSelection {
            subjects: side(s)?,
            objects: side(o)?,
            text: text.to_string(),
        })
    }

    fn selects(&self, a: &Region, b: &Region) -> bool {
        self.subjects.iter().any(|s| s.matches(a)) && self.objects.iter().any(|s| s.matches(b))
    }
}

/// Everything that steers a measurement.
#[derive(Clone, Debug, Default)]
pub struct MeasureOptions {
    /// Fuzzy sets and method choices.
    pub config: MeasureConfig,
    /// The pair plan (union of the selections); empty means every pair.
    pub pairs: Vec<PairSelection>,
}

/// What one ordered pair (subject, object) of the plan measured.
#[derive(Clone, Debug)]
pub struct PairValues {
    /// The subject's index in `Geometry::regions`.
    pub subject: usize,
    /// The object's index in `Geometry::regions`.
    pub object: usize,
    /// Relations with their degrees (0 included), in the order measured.
    pub relations: Vec<(String, f64)>,
    /// Quantities with their values (infinite ones included), in the order measured.
    pub measurements: Vec<(String, f64)>,
}

/// The result: the regions, the values of each pair, and what the method was.
pub struct Geometry {
    /// The regions, sorted by label value, map and id.
    pub regions: Vec<Region>,
    /// Each pair of the plan, in plan order.
    pub pairs: Vec<PairValues>,
    /// Warnings (labels not in the table and the like).
    pub warnings: Vec<String>,
    /// The methods in words, for the provenance.
    pub methods: Vec<String>,
    /// The pair selections as written (`*>*` when none was given).
    pub pair_texts: Vec<String>,
}

impl Geometry {
    /// The relations that hold to a positive degree: (subject id, relation, object id,
    /// degree), in pair order.
    pub fn relations(&self) -> impl Iterator<Item = (&str, &str, &str, f64)> {
        self.pairs.iter().flat_map(move |p| {
            p.relations
                .iter()
                .filter(|(_, d)| *d > 0.0)
                .map(move |(name, d)| {
                    (
                        self.regions[p.subject].id.as_str(),
                        name.as_str(),
                        self.regions[p.object].id.as_str(),
                        *d,
                    )
                })
        })
    }
}

/// Resolves the table against the maps: one spec per row, in table order.
pub fn resolve_table(
    maps: &[LabelMap],
    rows: &[TableRow],
    table_file: &str,
) -> Result<(Vec<RegionSpec>, Vec<String>), SpatialError> {
    let err = |line: usize, m: String| SpatialError::Table {
        file: table_file.to_string(),
        line,
        message: m,
    };
    let mut specs = Vec::new();
    for row in rows {
        let map_index = match &row.map {
            Some(name) => maps.iter().position(|m| m.name == *name).ok_or_else(|| {
                let names: Vec<&str> = maps.iter().map(|m| m.name.as_str()).collect();
                err(
                    row.line,
                    format!(
                        "map {name:?} is not among the label maps given ({})",
                        names.join(", ")
                    ),
                )
            })?,
            None => {
                if maps.len() > 1 {
                    return Err(err(
                        0,
                        "several label maps were given; the table needs the header `map\tvalue\tindividual\tclass`".into(),
                    ));
                }
                0
            }
        };
        if maps[map_index].code_of(row.value).is_none() {
            return Err(err(
                row.line,
                format!(
                    "label {} ({}) does not occur in {}; remove the row or check the label map",
                    row.value, row.individual, maps[map_index].name
                ),
            ));
        }
        specs.push(RegionSpec {
            id: row.individual.clone(),
            class: row.class.clone(),
            role: row.role,
            map_index,
            value: row.value,
        });
    }
    let mut warnings = Vec::new();
    for (mi, m) in maps.iter().enumerate() {
        let mut missing: Vec<i64> = m
            .values
            .iter()
            .copied()
            .filter(|&v| v != 0 && !specs.iter().any(|s| s.map_index == mi && s.value == v))
            .collect();
        missing.sort_unstable();
        for v in missing {
            warnings.push(format!(
                "{}: label {v} is not in the table {table_file}; skipped",
                m.path.display()
            ));
        }
    }
    Ok((specs, warnings))
}

/// Checks that every map shares the first map's grid.
pub fn check_same_grid(maps: &[LabelMap]) -> Result<(), SpatialError> {
    let first = &maps[0];
    for m in &maps[1..] {
        let tol = 1e-4
            * (1.0
                + first
                    .affine
                    .0
                    .iter()
                    .flatten()
                    .fold(0.0f64, |a, v| a.max(v.abs())));
        let same_affine = first
            .affine
            .0
            .iter()
            .flatten()
            .zip(m.affine.0.iter().flatten())
            .all(|(a, b)| (a - b).abs() <= tol);
        if m.shape != first.shape || !same_affine {
            return Err(SpatialError::Usage(format!(
                "{} and {} are not on the same grid (shapes {:?} and {:?}, or different voxel-to-world transforms); resample one onto the other",
                first.path.display(),
                m.path.display(),
                first.shape,
                m.shape
            )));
        }
    }
    Ok(())
}

struct PairOut {
    relations: Vec<(String, f64)>,
    measurements: Vec<(String, f64)>,
}

/// Measures the regions of the label maps and every pair of the plan.
pub fn measure_regions(
    maps: &[LabelMap],
    rows: &[TableRow],
    table_file: &str,
    opts: &MeasureOptions,
) -> Result<Geometry, SpatialError> {
    if maps.is_empty() {
        return Err(SpatialError::Usage("no label map given".into()));
    }
    opts.config.validate().map_err(SpatialError::Usage)?;
    check_same_grid(maps)?;
    let (specs, mut warnings) = resolve_table(maps, rows, table_file)?;
    for m in maps {
        warnings.extend(m.warnings.iter().cloned());
    }
    let affine = maps[0].affine;
    if affine.shear() > 1e-3 {
        warnings.push(format!(
            "{}: the voxel axes are not orthogonal (|cos| up to {:.4}); distances use the axis lengths and are approximate",
            maps[0].path.display(),
            affine.shear()
        ));
    }
    let mut regions = build_regions(maps, &specs);
    regions.sort_by(|a, b| {
        a.value
            .cmp(&b.value)
            .then_with(|| a.map_name.cmp(&b.map_name))
            .then_with(|| a.id.cmp(&b.id))
    });
    let adjacency = if opts.config.topology.adjacency == 6 {
        Adjacency::Six
    } else {
        Adjacency::TwentySix
    };
    let selections = if opts.pairs.is_empty() {
        vec![PairSelection::all()]
    } else {
        opts.pairs.clone()
    };
    for sel in &selections {
        for item in sel.subjects.iter().chain(&sel.objects) {
            if let Selector::Name(n) = item
                && !regions.iter().any(|r| r.id == *n || r.class == *n)
            {
                return Err(SpatialError::Usage(format!(
                    "--pairs {:?}: {n:?} is neither an individual nor a class of the table {table_file}",
                    sel.text
                )));
            }
        }
    }

    let n = regions.len();
    let mut plan: Vec<(usize, usize)> = Vec::new();
    for a in 0..n {
        for b in 0..n {
            if a != b
                && selections
                    .iter()
                    .any(|s| s.selects(&regions[a], &regions[b]))
            {
                plan.push((a, b));
            }
        }
    }
    if opts.config.directional.landscape == LandscapeMode::Exact {
        // The exact landscape costs |subject| × |object extent| per direction: refuse a plan
        // that would run for hours rather than hang.
        let work: f64 = plan
            .iter()
            .map(|&(a, b)| 6.0 * regions[a].voxels as f64 * regions[b].extent_voxels as f64)
            .sum();
        if work > EXACT_WORK_LIMIT {
            return Err(SpatialError::Limit(format!(
                "the exact landscapes of this plan need about {work:.1e} angle evaluations (limit {EXACT_WORK_LIMIT:.0e}); use --landscape fast or narrow --pairs"
            )));
        }
    }
    let spacing = affine.spacing();

    // Distances: for each region X, the EDT of X over the box holding X and its partners
    // gives d(y, X) at every voxel y of each partner.
    let mut partners: Vec<Vec<usize>> = vec![Vec::new(); n];
    for &(a, b) in &plan {
        partners[a].push(b);
        partners[b].push(a);
    }
    for p in partners.iter_mut() {
        p.sort_unstable();
        p.dedup();
    }
    // directed[(y, x)] = (min over y of d(·, X), max over y of d(·, X))
    // Feature and distance buffers, handed from one region to the next: the boxes are
    // often the whole volume, and fresh pages for each transform cost more than the reuse.
    let pool: std::sync::Mutex<Vec<(Vec<bool>, Vec<f64>)>> = std::sync::Mutex::new(Vec::new());
    let directed: BTreeMap<(usize, usize), (f64, f64)> = (0..n)
        .into_par_iter()
        .filter(|&x| !partners[x].is_empty())
        .flat_map_iter(|x| {
            let boxes: Vec<&Mask> = std::iter::once(&regions[x].mask)
                .chain(partners[x].iter().map(|&y| &regions[y].mask))
                .collect();
            let (lo, dims) = union_box(&boxes);
            let (mut feat, mut d) = pool
                .lock()
                .unwrap_or_else(|e| e.into_inner())
                .pop()
                .unwrap_or_default();
            paint_into(&regions[x].mask, lo, dims, &mut feat);
            // Squared distances; square roots only for the two values kept per partner.
            edt_squared_into(dims, spacing, &feat, &mut d);
            let out: Vec<_> = partners[x]
                .iter()
                .map(|&y| {
                    let (mn, mx) = min_max_in_box(&regions[y].mask, lo, dims, &d);
                    ((y, x), (mn.sqrt(), mx.sqrt()))
                })
                .collect();
            pool.lock()
                .unwrap_or_else(|e| e.into_inner())
                .push((feat, d));
            out
        })
        .collect();
    // The buffers are not needed past this stage; keep them out of the later peaks.
    drop(pool);

    // Depth: distance from each voxel inside an extent to the nearest voxel outside it.
    let contained: Vec<(usize, usize)> = plan
        .iter()
        .copied()
        .filter(|&(a, b)| {
            regions[a].mask.intersection_count(&regions[b].extent) == regions[a].voxels
                && regions[a].extent != regions[b].extent
        })
        .collect();
    let depth: BTreeMap<(usize, usize), f64> = {
        let mut containers: Vec<usize> = contained.iter().map(|&(_, b)| b).collect();
        containers.sort_unstable();
        containers.dedup();
        containers
            .par_iter()
            .flat_map_iter(|&b| {
                let ext = &regions[b].extent;
                let feat: Vec<bool> = ext.bits.iter().map(|&x| !x).collect();
                let d = edt_squared(ext.dims, spacing, &feat);
                contained
                    .iter()
                    .filter(|&&(_, bb)| bb == b)
                    .map(|&(a, _)| {
                        let mut mn = f64::INFINITY;
                        for_each_in_box(&regions[a].mask, ext.lo, ext.dims, |l| {
                            mn = mn.min(d[l]);
                        });
                        ((a, b), mn.sqrt())
                    })
                    .collect::<Vec<_>>()
            })
            .collect()
    };

    // Directional degrees: one landscape per object and direction.
    let mut objects: Vec<usize> = plan.iter().map(|&(_, b)| b).collect();
    objects.sort_unstable();
    objects.dedup();
    let dir_cfg = opts.config.directional;
    let directional: BTreeMap<(usize, usize, Direction), f64> = objects
        .par_iter()
        .flat_map_iter(|&b| {
            let subjects: Vec<usize> = plan
                .iter()
                .filter(|&&(_, bb)| bb == b)
                .map(|&(a, _)| a)
                .collect();
            let reference = &regions[b].extent;
            // Targets: each subject's voxels outside the object's extent (none: no degree).
            let targets: Vec<usize> = subjects
                .iter()
                .copied()
                .filter(|&a| regions[a].mask.intersection_count(reference) < regions[a].voxels)
                .collect();
            if targets.is_empty() {
                // Every subject lies inside the object's extent: no landscape is needed.
                return Vec::new();
            }
            let boxes: Vec<&Mask> = std::iter::once(reference)
                .chain(targets.iter().map(|&a| &regions[a].mask))
                .collect();
            let (lo, dims) = union_box(&boxes);
            let ref_world: Vec<[f64; 3]> = if dir_cfg.landscape == LandscapeMode::Exact {
                reference
                    .voxels()
                    .iter()
                    .map(|p| affine.apply([p[0] as f64, p[1] as f64, p[2] as f64]))
                    .collect()
            } else {
                Vec::new()
            };
            // For fast landscapes: each target as (cell, voxel count) pairs, counted once for
            // the six directions; every voxel of a cell is read at the cell's centre.
            let factor = coarsening(dims, dir_cfg.max_landscape_cells);
            let cells: Vec<Vec<(usize, u32)>> = if dir_cfg.landscape == LandscapeMode::Fast {
                let mut count = vec![0u32; cell_count(dims, factor)];
                let layout = CellLayout::new(dims[0].div_ceil(factor), dims[1].div_ceil(factor));
                targets
                    .iter()
                    .map(|&a| {
                        let mut touched = Vec::new();
                        // Cell coordinate of each box position along each axis (no division
                        // per voxel), as `FastLandscape::cell_of` computes it.
                        let tab: [Vec<usize>; 3] =
                            std::array::from_fn(|ax| (0..dims[ax]).map(|q| q / factor).collect());
                        let (cx, cy) = (dims[0].div_ceil(factor), dims[1].div_ceil(factor));
                        let pos = |p: [i64; 3], ax: usize| {
                            let q = p[ax] - lo[ax];
                            (q >= 0 && (q as usize) < dims[ax]).then(|| tab[ax][q as usize])
                        };
                        for_each_outside(&regions[a].mask, reference, |p| {
                            if let (Some(i), Some(j), Some(k)) = (pos(p, 0), pos(p, 1), pos(p, 2)) {
                                let c = i + cx * (j + cy * k);
                                if count[c] == 0 {
                                    touched.push((c, layout.cell(i, j, k)));
                                }
                                count[c] += 1;
                            }
                        });
                        // Raster order of the cells, so that sums are taken in a fixed order.
                        touched.sort_unstable();
                        touched
                            .into_iter()
                            .map(|(c, slot)| (slot, std::mem::take(&mut count[c])))
                            .collect()
                    })
                    .collect()
            } else {
                Vec::new()
            };
            Direction::ALL
                .par_iter()
                .flat_map_iter(|&dir| {
                    let dv = dir.vector();
                    let fast = (dir_cfg.landscape == LandscapeMode::Fast).then(|| {
                        FastLandscape::compute_coarse(reference, lo, dims, &affine, dv, factor)
                    });
                    let mut buf = Vec::new();
                    targets
                        .iter()
                        .enumerate()
                        .map(|(ti, &a)| {
                            let t = regions[a].mask.iter().filter(|&p| !reference.contains(p));
                            let deg = match &fast {
                                Some(l) => {
                                    l.cell_degrees(&cells[ti], &mut buf);
                                    dir_cfg.aggregate.combine_weighted(buf.iter().copied())
                                }
                                None => dir_cfg.aggregate.combine(t.map(|p| {
                                    exact_degree(
                                        affine.apply([p[0] as f64, p[1] as f64, p[2] as f64]),
                                        &ref_world,
                                        dv,
                                    )
                                })),
                            };
                            ((a, b, dir), deg)
                        })
                        .collect::<Vec<_>>()
                })
                .collect::<Vec<_>>()
        })
        .collect();

    // Per pair: topology, overlap, distances, depth, fuzzy sets.
    let near = opts.config.near_set();
    let far = opts.config.far_set();
    let per: Vec<((usize, usize), PairOut)> = plan
        .par_iter()
        .map(|&(a, b)| {
            let (ra, rb) = (&regions[a], &regions[b]);
            let mut rel = Vec::new();
            let mut mea = Vec::new();
            let topo = relate_counted(
                &ra.extent,
                &ra.extent_surface,
                ra.extent_voxels,
                &rb.extent,
                &rb.extent_surface,
                rb.extent_voxels,
                adjacency,
            );
            rel.push((topo.relation().to_string(), 1.0));
            let shared = ra.extent.intersection_count(&rb.extent);
            mea.push((
                "overlap_fraction".to_string(),
                round_to(shared as f64 / ra.extent_voxels.max(1) as f64, 1e6),
            ));
            let touch = relate_counted(
                &ra.mask,
                &ra.surface,
                ra.voxels,
                &rb.mask,
                &rb.surface,
                rb.voxels,
                adjacency,
            ) != Rcc8::DC;
            let (min_ab, h_ab) = directed
                .get(&(a, b))
                .copied()
                .unwrap_or((f64::INFINITY, f64::INFINITY));
            let (_, h_ba) = directed
                .get(&(b, a))
                .copied()
                .unwrap_or((f64::INFINITY, f64::INFINITY));
            let min_d = if touch { 0.0 } else { min_ab };
            mea.push(("min_distance_mm".to_string(), round_to(min_d, 1e4)));
            mea.push(("hausdorff_mm".to_string(), round_to(h_ab.max(h_ba), 1e4)));
            rel.push(("near".to_string(), round_to(near.degree(min_d), 1e6)));
            rel.push(("far".to_string(), round_to(far.degree(min_d), 1e6)));
            if let Some(&dep) = depth.get(&(a, b)) {
                mea.push(("depth_mm".to_string(), round_to(dep, 1e4)));
                rel.push((
                    "peripheral_in".to_string(),
                    round_to(opts.config.peripheral_set().degree(dep), 1e6),
                ));
                rel.push((
                    "deep_in".to_string(),
                    round_to(opts.config.deep_set().degree(dep), 1e6),
                ));
            }
            for dir in Direction::ALL {
                if let Some(&g) = directional.get(&(a, b, dir)) {
                    rel.push((dir.relation().to_string(), round_to(g, 1e6)));
                }
            }
            (
                (a, b),
                PairOut {
                    relations: rel,
                    measurements: mea,
                },
            )
        })
        .collect();

    let pairs = per
        .into_iter()
        .map(|((subject, object), out)| PairValues {
            subject,
            object,
            relations: out.relations,
            measurements: out.measurements,
        })
        .collect();
    let methods = vec![
        "directional: fuzzy morphological dilation, structuring element max(0, 1 - 2*angle/pi) in RAS mm (Bloch 1999, IEEE TPAMI 21(7))".into(),
        format!(
            "directional landscape: {}; degrees aggregated over the subject's voxels outside the object's extent by {}",
            match dir_cfg.landscape {
                LandscapeMode::Exact => "exact (max over every reference voxel)",
                LandscapeMode::Fast => "two-pass propagation, 13 causal neighbours per pass",
            },
            format!("{:?}", dir_cfg.aggregate).to_lowercase()
        ),
        "distances: exact Euclidean distance transform with voxel spacing (Felzenszwalb & Huttenlocher 2012), between voxel centres".into(),
        "near, far, peripheral_in, deep_in: trapezoidal fuzzy sets over millimetres".into(),
        format!("topology: RCC-8 on extents (3D hole filling, background 6-connected), {}-adjacency (Randell, Cui & Cohn 1992)", adjacency.number()),
        ];
    Ok(Geometry {
        regions,
        pairs,
        warnings,
        methods,
        pair_texts: selections.iter().map(|s| s.text.clone()).collect(),
    })
}

/// The smallest integer factor f such that a box of `dims` has at most `max_cells` cells of f³ voxels.
pub fn coarsening(dims: [usize; 3], max_cells: usize) -> usize {
    let mut f = 1;
    while dims.iter().map(|n| n.div_ceil(f)).product::<usize>() > max_cells.max(1) {
        f += 1;
    }
    f
}

/// Smallest box holding every mask's box.
pub fn union_box(masks: &[&Mask]) -> ([i64; 3], [usize; 3]) {
    let mut lo = [i64::MAX; 3];
    let mut hi = [i64::MIN; 3];
    for m in masks {
        for a in 0..3 {
            lo[a] = lo[a].min(m.lo[a]);
            hi[a] = hi[a].max(m.lo[a] + m.dims[a] as i64);
        }
    }
    (
        lo,
        [
            (hi[0] - lo[0]) as usize,
            (hi[1] - lo[1]) as usize,
            (hi[2] - lo[2]) as usize,
        ],
    )
}

/// Paints a mask into a box as a flat boolean array.
pub fn paint(mask: &Mask, lo: [i64; 3], dims: [usize; 3]) -> Vec<bool> {
    let mut out = Vec::new();
    paint_into(mask, lo, dims, &mut out);
    out
}

/// [`paint`] into a reused buffer (resized to the box).
pub fn paint_into(mask: &Mask, lo: [i64; 3], dims: [usize; 3], out: &mut Vec<bool>) {
    out.clear();
    out.resize(dims[0] * dims[1] * dims[2], false);
    for p in mask.iter() {
        out[lin(p, lo, dims)] = true;
    }
}

#[inline]
fn lin(p: [i64; 3], lo: [i64; 3], dims: [usize; 3]) -> usize {
    let (i, j, k) = (
        (p[0] - lo[0]) as usize,
        (p[1] - lo[1]) as usize,
        (p[2] - lo[2]) as usize,
    );
    i + dims[0] * (j + dims[1] * k)
}

/// Calls `f` with the linear index, in the box `lo .. lo + dims`, of every voxel of `mask`
/// (row by row; the mask's voxels must lie inside the box).
fn for_each_in_box(mask: &Mask, lo: [i64; 3], dims: [usize; 3], mut f: impl FnMut(usize)) {
    let [mx, my, mz] = mask.dims;
    for k in 0..mz {
        for j in 0..my {
            let start = mx * (j + my * k);
            let row = &mask.bits[start..start + mx];
            if !row.contains(&true) {
                continue;
            }
            let (gj, gk) = (mask.lo[1] + j as i64 - lo[1], mask.lo[2] + k as i64 - lo[2]);
            let base = mask.lo[0] - lo[0] + dims[0] as i64 * (gj + dims[1] as i64 * gk);
            for (i, &b) in row.iter().enumerate() {
                if b {
                    f((base + i as i64) as usize);
                }
            }
        }
    }
}

/// The smallest and largest value of `d` (a box `lo .. lo + dims` of non-negative values)
/// over the voxels of `mask` (which must lie inside the box): (∞, 0) for an empty mask.
/// Eight running minima and maxima per row so that the loop runs on vector lanes; min and
/// max do not depend on the order, so the result is that of a plain scan.
fn min_max_in_box(mask: &Mask, lo: [i64; 3], dims: [usize; 3], d: &[f64]) -> (f64, f64) {
    let [mx, my, mz] = mask.dims;
    let mut mn = [f64::INFINITY; 8];
    let mut mxv = [0.0f64; 8];
    for k in 0..mz {
        for j in 0..my {
            let start = mx * (j + my * k);
            let row = &mask.bits[start..start + mx];
            if !row.contains(&true) {
                continue;
            }
            let (gj, gk) = (mask.lo[1] + j as i64 - lo[1], mask.lo[2] + k as i64 - lo[2]);
            let g0 = mask.lo[0] - lo[0];
            let base = g0 + dims[0] as i64 * (gj + dims[1] as i64 * gk);
            // The padded mask row may start or end outside the box; its voxels do not.
            let (a, b) = (
                (-g0).max(0) as usize,
                mx.min((dims[0] as i64 - g0).max(0) as usize),
            );
            let bits = &row[a..b];
            let vals = &d[(base + a as i64) as usize..(base + b as i64) as usize];
            let mut bc = bits.chunks_exact(8);
            let mut vc = vals.chunks_exact(8);
            for (bb, vv) in (&mut bc).zip(&mut vc) {
                for t in 0..8 {
                    let (lo_v, hi_v) = if bb[t] {
                        (vv[t], vv[t])
                    } else {
                        (f64::INFINITY, 0.0)
                    };
                    mn[t] = if lo_v < mn[t] { lo_v } else { mn[t] };
                    mxv[t] = if hi_v > mxv[t] { hi_v } else { mxv[t] };
                }
            }
            for (&bb, &vv) in bc.remainder().iter().zip(vc.remainder()) {
                if bb {
                    mn[0] = mn[0].min(vv);
                    mxv[0] = mxv[0].max(vv);
                }
            }
        }
    }
    (
        mn.iter().copied().fold(f64::INFINITY, f64::min),
        mxv.iter().copied().fold(0.0, f64::max),
    )
}

/// Calls `f` with every voxel of `mask` that is not in `other`, in raster order (the same
/// order as `mask.iter()`), reading both masks a row at a time.
fn for_each_outside(mask: &Mask, other: &Mask, mut f: impl FnMut([i64; 3])) {
    let [mx, my, mz] = mask.dims;
    for k in 0..mz {
        for j in 0..my {
            let start = mx * (j + my * k);
            let row = &mask.bits[start..start + mx];
            if !row.contains(&true) {
                continue;
            }
            let (gj, gk) = (mask.lo[1] + j as i64, mask.lo[2] + k as i64);
            // The other mask's row at (gj, gk), with the global i of its first voxel.
            let oj = gj - other.lo[1];
            let ok = gk - other.lo[2];
            let orow: &[bool] = if oj >= 0
                && ok >= 0
                && (oj as usize) < other.dims[1]
                && (ok as usize) < other.dims[2]
            {
                let s = other.dims[0] * (oj as usize + other.dims[1] * ok as usize);
                &other.bits[s..s + other.dims[0]]
            } else {
                &[]
            };
            for (i, &b) in row.iter().enumerate() {
                if !b {
                    continue;
                }
                let gi = mask.lo[0] + i as i64;
                let oi = gi - other.lo[0];
                if oi >= 0 && (oi as usize) < orow.len() && orow[oi as usize] {
                    continue;
                }
                f([gi, gj, gk]);
            }
        }
    }
}

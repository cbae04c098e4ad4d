//! Regions of label maps and their metrics: voxels, volume, centroid, bounding box, extent
//! and largest diameter, all in RAS millimetres.

use super::affine::Affine;
use super::mask::Mask;
use super::nifti_io::LabelMap;
use super::table::Role;

/// One labelled region with its masks and metrics.
#[derive(Clone, Debug)]
pub struct Region {
    /// Individual id.
    pub id: String,
    /// Class IRI.
    pub class: String,
    /// Anatomy or finding.
    pub role: Role,
    /// Index of its map among the inputs.
    pub map_index: usize,
    /// Its map's file name.
    pub map_name: String,
    /// Label value.
    pub value: i64,
    /// The voxels carrying the label (box padded by one voxel).
    pub mask: Mask,
    /// The extent: the voxels and every voxel they enclose (3D hole filling).
    pub extent: Mask,
    /// Voxels of `mask` with a 26-neighbour outside it.
    pub surface: Vec<[i64; 3]>,
    /// Voxels of `extent` with a 26-neighbour outside it.
    pub extent_surface: Vec<[i64; 3]>,
    /// Number of labelled voxels.
    pub voxels: usize,
    /// Number of voxels of the extent.
    pub extent_voxels: usize,
    /// voxels × |det| / 1000.
    pub volume_ml: f64,
    /// Mean of the voxel centres, mm.
    pub centroid_mm: [f64; 3],
    /// World bounding box of the voxel centres, mm.
    pub bbox_mm: [[f64; 3]; 2],
    /// Largest distance between two voxel centres, mm.
    pub largest_diameter_mm: f64,
}

/// Per-code statistics of one pass over a map.
struct CodeStats {
    count: Vec<usize>,
    lo: Vec<[usize; 3]>,
    hi: Vec<[usize; 3]>,
}

fn code_stats(map: &LabelMap) -> CodeStats {
    let n = map.values.len();
    let mut s = CodeStats {
        count: vec![0; n],
        lo: vec![[usize::MAX; 3]; n],
        hi: vec![[0; 3]; n],
    };
    let [nx, ny, nz] = map.shape;
    // Runs of one code along a row: one update per run instead of one per voxel.
    for (r, row) in map.codes.chunks_exact(nx).enumerate() {
        let (j, k) = (r % ny, r / ny);
        debug_assert!(k < nz);
        let mut i = 0;
        while i < nx {
            let c = row[i];
            let mut e = i + 1;
            while e < nx && row[e] == c {
                e += 1;
            }
            let c = c as usize;
            s.count[c] += e - i;
            let lo = &mut s.lo[c];
            *lo = [lo[0].min(i), lo[1].min(j), lo[2].min(k)];
            let hi = &mut s.hi[c];
            *hi = [hi[0].max(e - 1), hi[1].max(j), hi[2].max(k)];
            i = e;
        }
    }
    s
}

/// What to build a region from: a table row resolved to a map and a code.
#[derive(Clone, Debug)]
pub struct RegionSpec {
    /// Individual id.
    pub id: String,
    /// Class IRI.
    pub class: String,
    /// Role.
    pub role: Role,
    /// Map index.
    pub map_index: usize,
    /// Label value.
    pub value: i64,
}

/// Builds the regions named by `specs` from their maps (one pass per map, then per-region
/// work in each region's box).
pub fn build_regions(maps: &[LabelMap], specs: &[RegionSpec]) -> Vec<Region> {
    use rayon::prelude::*;
    let stats: Vec<CodeStats> = maps.par_iter().map(code_stats).collect();
    specs
        .par_iter()
        .filter_map(|s| {
            let map = &maps[s.map_index];
            let code = map.code_of(s.value)? as usize;
            let st = &stats[s.map_index];
            if st.count[code] == 0 {
                return None;
            }
            let (lo, hi) = (st.lo[code], st.hi[code]);
            let plo = [lo[0] as i64 - 1, lo[1] as i64 - 1, lo[2] as i64 - 1];
            let dims = [hi[0] - lo[0] + 3, hi[1] - lo[1] + 3, hi[2] - lo[2] + 3];
            let mut mask = Mask::empty(plo, dims);
            let [nx, ny, _] = map.shape;
            for k in lo[2]..=hi[2] {
                for j in lo[1]..=hi[1] {
                    let row = nx * (j + ny * k);
                    for i in lo[0]..=hi[0] {
                        if map.codes[row + i] as usize == code {
                            let l = (i - lo[0] + 1)
                                + dims[0] * ((j - lo[1] + 1) + dims[1] * (k - lo[2] + 1));
                            mask.bits[l] = true;
                        }
                    }
                }
            }
            Some(region_from_mask(s, &map.name, mask, &map.affine))
        })
        .collect()
}

/// Computes every metric of a region from its mask (whose box has an empty one-voxel border).
pub fn region_from_mask(spec: &RegionSpec, map_name: &str, mask: Mask, affine: &Affine) -> Region {
    let extent = mask.filled();
    let surface = mask.surface();
    let extent_surface = extent.surface();
    let voxels = mask.count();
    let extent_voxels = extent.count();
    let mut sum = [0.0f64; 3];
    {
        let [nx, ny, nz] = mask.dims;
        for k in 0..nz {
            for j in 0..ny {
                for i in 0..nx {
                    if mask.bits[i + nx * (j + ny * k)] {
                        sum[0] += (mask.lo[0] + i as i64) as f64;
                        sum[1] += (mask.lo[1] + j as i64) as f64;
                        sum[2] += (mask.lo[2] + k as i64) as f64;
                    }
                }
            }
        }
    }
    let n = voxels.max(1) as f64;
    let centroid_mm = affine.apply([sum[0] / n, sum[1] / n, sum[2] / n]);
    // The first and last surface voxel of each row (surface voxels come in raster order):
    // a linear function along a row, such as a world coordinate or a projection, and the
    // squared distance to a point, a convex one, reach their maxima at a row's ends. So the
    // bounding box and the diameter read these ends only, with the same values.
    let ends: Vec<[f64; 3]> = {
        let mut ends = Vec::new();
        for (q, p) in surface.iter().enumerate() {
            let row_start = q == 0 || surface[q - 1][1..] != p[1..];
            let row_end = q + 1 == surface.len() || surface[q + 1][1..] != p[1..];
            if row_start || row_end {
                ends.push(affine.apply([p[0] as f64, p[1] as f64, p[2] as f64]));
            }
        }
        ends
    };
    let mut bbox_mm = [[f64::INFINITY; 3], [f64::NEG_INFINITY; 3]];
    for w in &ends {
        for a in 0..3 {
            bbox_mm[0][a] = bbox_mm[0][a].min(w[a]);
            bbox_mm[1][a] = bbox_mm[1][a].max(w[a]);
        }
    }
    Region {
        id: spec.id.clone(),
        class: spec.class.clone(),
        role: spec.role,
        map_index: spec.map_index,
        map_name: map_name.to_string(),
        value: spec.value,
        volume_ml: voxels as f64 * affine.det3().abs() / 1000.0,
        largest_diameter_mm: diameter_of_row_ends(&ends, surface.len()),
        mask,
        extent,
        surface,
        extent_surface,
        voxels,
        extent_voxels,
        centroid_mm,
        bbox_mm,
    }
}

/// [`diameter`] of a surface given by its row ends (`ends`, in raster order) and its number
/// of voxels: the method is chosen by the voxel count, as [`diameter`] would choose it for
/// the whole surface, and gives the same value. The largest distance is reached by a pair
/// of row ends (|p − b|² is strictly convex along a row), and per direction the first point
/// of largest projection in raster order is a row end.
pub fn diameter_of_row_ends(ends: &[[f64; 3]], surface_voxels: usize) -> f64 {
    if surface_voxels <= DIAMETER_EXACT_POINTS {
        pairs_max(ends)
    } else {
        extreme_pairs_max(ends)
    }
}

/// The largest distance over all pairs of points.
fn pairs_max(pts: &[[f64; 3]]) -> f64 {
    let dist2 = |a: &[f64; 3], b: &[f64; 3]| {
        (a[0] - b[0]).powi(2) + (a[1] - b[1]).powi(2) + (a[2] - b[2]).powi(2)
    };
    let mut best = 0.0f64;
    for (i, a) in pts.iter().enumerate() {
        for b in &pts[i + 1..] {
            best = best.max(dist2(a, b));
        }
    }
    best.sqrt()
}

/// Number of points up to which the diameter is computed over all pairs.
pub const DIAMETER_EXACT_POINTS: usize = 4000;

/// Largest distance between two points. Exact (all pairs) up to [`DIAMETER_EXACT_POINTS`]
/// points; above, the pairs among the extreme points along 1024 directions of a Fibonacci
/// sphere — a lower bound within a factor cos(θ) of the truth, θ ≤ 4.5° (worst angular gap
/// of that direction set), i.e. within 0.31 %.
pub fn diameter(points: &[[f64; 3]]) -> f64 {
    if points.len() <= DIAMETER_EXACT_POINTS {
        pairs_max(points)
    } else {
        extreme_pairs_max(points)
    }
}

/// The largest distance among the extreme points of `points` along 1024 directions.
#[allow(clippy::needless_range_loop)] // lanes indexed in step across several arrays
fn extreme_pairs_max(points: &[[f64; 3]]) -> f64 {
    let m = 1024;
    let golden = std::f64::consts::PI * (3.0 - 5.0f64.sqrt());
    use rayon::prelude::*;
    // Directions in blocks of eight, the points as three coordinate arrays: each point is
    // compared with eight running extremes at once (vector lanes). Per direction the
    // extremes are the first point of smallest and of largest projection, as in a plain
    // scan, so the candidates do not depend on the blocking.
    const B: usize = 8;
    let xs: Vec<f64> = points.iter().map(|p| p[0]).collect();
    let ys: Vec<f64> = points.iter().map(|p| p[1]).collect();
    let zs: Vec<f64> = points.iter().map(|p| p[2]).collect();
    let mut cand: Vec<usize> = (0..m / B)
        .into_par_iter()
        .flat_map_iter(|blk| {
            let mut u = [[0.0f64; B]; 3];
            for l in 0..B {
                let t = blk * B + l;
                let z = 1.0 - 2.0 * (t as f64 + 0.5) / m as f64;
                let r = (1.0 - z * z).sqrt();
                let phi = golden * t as f64;
                u[0][l] = r * phi.cos();
                u[1][l] = r * phi.sin();
                u[2][l] = z;
            }
            let (mut imin, mut imax) = ([0usize; B], [0usize; B]);
            let (mut vmin, mut vmax) = ([f64::INFINITY; B], [f64::NEG_INFINITY; B]);
            for i in 0..xs.len() {
                let (px, py, pz) = (xs[i], ys[i], zs[i]);
                for l in 0..B {
                    let v = px * u[0][l] + py * u[1][l] + pz * u[2][l];
                    let lt = v < vmin[l];
                    vmin[l] = if lt { v } else { vmin[l] };
                    imin[l] = if lt { i } else { imin[l] };
                    let gt = v > vmax[l];
                    vmax[l] = if gt { v } else { vmax[l] };
                    imax[l] = if gt { i } else { imax[l] };
                }
            }
            imin.into_iter().chain(imax)
        })
        .collect();
    cand.sort_unstable();
    cand.dedup();
    let pts: Vec<[f64; 3]> = cand.into_iter().map(|i| points[i]).collect();
    pairs_max(&pts)
}

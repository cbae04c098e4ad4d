//! Exact Euclidean distance transform with anisotropic spacing.
//!
//! Felzenszwalb & Huttenlocher 2012 ("Distance Transforms of Sampled Functions", Theory of
//! Computing 8), §2–3: the squared distance transform is separable; along each axis it is the
//! lower envelope of parabolas rooted at the samples. Positions along an axis are `q · s` for
//! spacing `s`, which makes the transform exact for orthogonal voxel axes of any spacing.

use rayon::prelude::*;

/// Squared distance, in mm², from every voxel centre of a `dims` box to the nearest voxel
/// centre where `feature` is true; `f64::INFINITY` everywhere when there is no feature.
pub fn edt_squared(dims: [usize; 3], spacing: [f64; 3], feature: &[bool]) -> Vec<f64> {
    let mut d = Vec::new();
    edt_squared_into(dims, spacing, feature, &mut d);
    d
}

/// [`edt_squared`] written into `d` (resized to the box), so that a caller running many
/// transforms reuses one buffer instead of faulting in fresh pages for each.
pub fn edt_squared_into(dims: [usize; 3], spacing: [f64; 3], feature: &[bool], d: &mut Vec<f64>) {
    let [nx, ny, nz] = dims;
    assert_eq!(
        feature.len(),
        nx * ny * nz,
        "feature mask size must match dims"
    );
    // Every entry is written by the first axis pass.
    d.clear();
    d.resize(feature.len(), 0.0);
    if d.is_empty() {
        return;
    }
    // Axis i: lines are contiguous rows. With a binary input the 1D transform is the
    // squared distance to the nearest feature in the row: two scans, no envelope needed.
    let s0 = spacing[0];
    d.par_chunks_mut(nx)
        .zip(feature.par_chunks(nx))
        .for_each(|(row, feat)| {
            let mut last: Option<usize> = None;
            for i in 0..nx {
                if feat[i] {
                    last = Some(i);
                }
                row[i] = last.map_or(f64::INFINITY, |l| ((i - l) as f64 * s0).powi(2));
            }
            let mut next: Option<usize> = None;
            for i in (0..nx).rev() {
                if feat[i] {
                    next = Some(i);
                }
                if let Some(n) = next {
                    row[i] = row[i].min(((n - i) as f64 * s0).powi(2));
                }
            }
        });
    // Axis j: lines inside each k-slab, gathered row by row into a transposed buffer so
    // that memory is read and written in order.
    // A slab without a feature voxel is infinite after the first axis and stays so: it is
    // skipped by the second axis (for a small region in a large box, most slabs are), and
    // the third reads only the others, which the second has made finite throughout.
    let slab_has: Vec<bool> = feature
        .par_chunks(nx * ny)
        .map(|c| c.contains(&true))
        .collect();
    if ny > 1 {
        d.par_chunks_mut(nx * ny)
            .zip(slab_has.par_iter())
            .for_each_init(
                || (Scratch::new(ny), vec![0.0f64; nx * ny]),
                |(s, t), (slab, &has)| {
                    if !has {
                        return;
                    }
                    for j in 0..ny {
                        for i in 0..nx {
                            t[i * ny + j] = slab[i + nx * j];
                        }
                    }
                    for i in 0..nx {
                        let line = &mut t[i * ny..(i + 1) * ny];
                        s.f[..ny].copy_from_slice(line);
                        lower_envelope(
                            &s.f[..ny],
                            spacing[1],
                            &mut s.out[..ny],
                            &mut s.v,
                            &mut s.z,
                        );
                        line.copy_from_slice(&s.out[..ny]);
                    }
                    for j in 0..ny {
                        for i in 0..nx {
                            slab[i + nx * j] = t[i * ny + j];
                        }
                    }
                },
            );
    }
    // Axis k: for each j, the (i, k) plane is gathered into a transposed buffer (reading
    // whole rows of i), transformed line by line, and scattered back. Each j belongs to
    // exactly one task, so the writes of different tasks never meet.
    if nz > 1 {
        let plane = nx * ny;
        let ks: Vec<usize> = (0..nz).filter(|&k| slab_has[k]).collect();
        let m = ks.len();
        let ptr = SharedSlice(d.as_mut_ptr());
        let len = d.len();
        (0..ny).into_par_iter().for_each_init(
            || {
                (
                    Scratch::new(nz),
                    vec![0.0f64; nx * m],
                    vec![0.0f64; nx * nz],
                )
            },
            |(s, g, t), j| {
                let p = &ptr;
                // Gather the finite samples only (the slabs in `ks`), column by column.
                for (r, &k) in ks.iter().enumerate() {
                    let row = nx * j + plane * k;
                    debug_assert!(row + nx <= len);
                    for i in 0..nx {
                        // SAFETY: row + i < len; row j of plane k is touched by this task only.
                        g[i * m + r] = unsafe { *p.0.add(row + i) };
                    }
                }
                for i in 0..nx {
                    lower_envelope_sparse(
                        &ks,
                        &g[i * m..(i + 1) * m],
                        spacing[2],
                        &mut t[i * nz..(i + 1) * nz],
                        &mut s.v,
                        &mut s.z,
                    );
                }
                for k in 0..nz {
                    let row = nx * j + plane * k;
                    for i in 0..nx {
                        // SAFETY: as above.
                        unsafe { *p.0.add(row + i) = t[i * nz + k] };
                    }
                }
            },
        );
    }
}

/// Distance (mm) from every voxel centre to the nearest feature voxel centre.
pub fn edt(dims: [usize; 3], spacing: [f64; 3], feature: &[bool]) -> Vec<f64> {
    let mut d = edt_squared(dims, spacing, feature);
    d.par_iter_mut().for_each(|v| *v = v.sqrt());
    d
}

struct SharedSlice(*mut f64);
// SAFETY: tasks write disjoint columns (see the k pass).
unsafe impl Sync for SharedSlice {}
unsafe impl Send for SharedSlice {}

struct Scratch {
    f: Vec<f64>,
    out: Vec<f64>,
    v: Vec<usize>,
    z: Vec<f64>,
}

impl Scratch {
    fn new(n: usize) -> Self {
        Scratch {
            f: vec![0.0; n],
            out: vec![0.0; n],
            v: vec![0; n],
            z: vec![0.0; n + 1],
        }
    }
}

/// One-dimensional squared distance transform of a sampled function (Felzenszwalb &
/// Huttenlocher 2012, Algorithm DT(f)), with sample positions `q · s`. Samples whose value
/// is infinite hold no parabola, so lines without features stay infinite.
pub fn lower_envelope(f: &[f64], s: f64, out: &mut [f64], v: &mut [usize], z: &mut [f64]) {
    let n = f.len();
    let points = f.iter().enumerate().filter(|(_, x)| x.is_finite());
    envelope(
        points.map(|(q, &x)| (q, x)),
        |q| q,
        |q| f[q],
        s,
        &mut out[..n],
        v,
        z,
    );
}

/// [`lower_envelope`] of a line that is infinite except at the increasing positions `pos`,
/// where it takes the values `vals`; `out` covers the whole line. The same arithmetic as
/// the dense form, so the same values, without reading the infinite samples.
pub fn lower_envelope_sparse(
    pos: &[usize],
    vals: &[f64],
    s: f64,
    out: &mut [f64],
    v: &mut [usize],
    z: &mut [f64],
) {
    // Samples are named by their index r in `pos`.
    let points = vals.iter().copied().enumerate();
    envelope(points, |r| pos[r], |r| vals[r], s, out, v, z);
}

/// Algorithm DT(f) over the finite samples `points` (name, value), in increasing position;
/// `position` and `value` look a sample up by name. `v` holds names, `z` the boundaries.
fn envelope(
    points: impl Iterator<Item = (usize, f64)>,
    position: impl Fn(usize) -> usize,
    value: impl Fn(usize) -> f64,
    s: f64,
    out: &mut [f64],
    v: &mut [usize],
    z: &mut [f64],
) {
    let mut k: usize = 0;
    let mut any = false;
    for (q, fval) in points {
        let xq = position(q) as f64 * s;
        let fq = fval + xq * xq;
        if !any {
            any = true;
            k = 0;
            v[0] = q;
            z[0] = f64::NEG_INFINITY;
            z[1] = f64::INFINITY;
            continue;
        }
        loop {
            let p = v[k];
            let xp = position(p) as f64 * s;
            let inter = (fq - (value(p) + xp * xp)) / (2.0 * (xq - xp));
            if inter <= z[k] {
                if k == 0 {
                    // The new parabola hides every earlier one.
                    v[0] = q;
                    z[0] = f64::NEG_INFINITY;
                    z[1] = f64::INFINITY;
                    break;
                }
                k -= 1;
            } else {
                k += 1;
                v[k] = q;
                z[k] = inter;
                z[k + 1] = f64::INFINITY;
                break;
            }
        }
    }
    if !any {
        out.iter_mut().for_each(|o| *o = f64::INFINITY);
        return;
    }
    let mut k = 0;
    for (q, o) in out.iter_mut().enumerate() {
        let x = q as f64 * s;
        while z[k + 1] < x {
            k += 1;
        }
        let dx = x - position(v[k]) as f64 * s;
        *o = dx * dx + value(v[k]);
    }
}

/// Brute-force squared distance transform (for tests and validation): O(n · features).
pub fn edt_squared_brute(dims: [usize; 3], spacing: [f64; 3], feature: &[bool]) -> Vec<f64> {
    let [nx, ny, _nz] = dims;
    let coords = |l: usize| {
        [
            (l % nx) as f64,
            ((l / nx) % ny) as f64,
            (l / (nx * ny)) as f64,
        ]
    };
    let feats: Vec<[f64; 3]> = (0..feature.len())
        .filter(|&l| feature[l])
        .map(coords)
        .collect();
    (0..feature.len())
        .map(|l| {
            let p = coords(l);
            feats
                .iter()
                .map(|q| {
                    let d = [
                        (p[0] - q[0]) * spacing[0],
                        (p[1] - q[1]) * spacing[1],
                        (p[2] - q[2]) * spacing[2],
                    ];
                    d[0] * d[0] + d[1] * d[1] + d[2] * d[2]
                })
                .fold(f64::INFINITY, f64::min)
        })
        .collect()
}

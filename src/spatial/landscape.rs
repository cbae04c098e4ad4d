//! Fuzzy directional landscapes by morphological dilation (Bloch 1999, "Fuzzy relative
//! position between objects in image processing: a morphological approach", IEEE TPAMI
//! 21(7):657–664).
//!
//! The landscape of a reference set R in the unit direction d is
//! μ_R(x) = max_{r ∈ R} ν(x − r), with the structuring element ν(v) = max(0, 1 − 2β(v)/π)
//! where β(v) is the angle between v and d, and ν(0) = 1. Angles are taken between WORLD
//! vectors (RAS mm), so anisotropic and oblique voxels give the physical angle.

use super::affine::Affine;
use super::mask::Mask;
use std::f64::consts::FRAC_2_PI;

/// The six anatomical directions in RAS world space.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum Direction {
    /// Toward the patient's left: −x.
    Left,
    /// Toward the patient's right: +x.
    Right,
    /// Toward the front: +y.
    Anterior,
    /// Toward the back: −y.
    Posterior,
    /// Toward the head: +z.
    Superior,
    /// Toward the feet: −z.
    Inferior,
}

impl Direction {
    /// All six, in a fixed order.
    pub const ALL: [Direction; 6] = [
        Direction::Left,
        Direction::Right,
        Direction::Anterior,
        Direction::Posterior,
        Direction::Superior,
        Direction::Inferior,
    ];

    /// The unit vector in RAS mm space (the patient's left is −x).
    pub fn vector(self) -> [f64; 3] {
        match self {
            Direction::Left => [-1.0, 0.0, 0.0],
            Direction::Right => [1.0, 0.0, 0.0],
            Direction::Anterior => [0.0, 1.0, 0.0],
            Direction::Posterior => [0.0, -1.0, 0.0],
            Direction::Superior => [0.0, 0.0, 1.0],
            Direction::Inferior => [0.0, 0.0, -1.0],
        }
    }

    /// The relation name of the facts file ("A left_of B").
    pub fn relation(self) -> &'static str {
        match self {
            Direction::Left => "left_of",
            Direction::Right => "right_of",
            Direction::Anterior => "anterior_of",
            Direction::Posterior => "posterior_of",
            Direction::Superior => "superior_of",
            Direction::Inferior => "inferior_of",
        }
    }
}

/// The structuring element ν(v) = max(0, 1 − 2β/π) of Bloch 1999, β = angle(v, d); ν(0) = 1.
/// `d` must be a unit vector.
pub fn structuring_element(v: [f64; 3], d: [f64; 3]) -> f64 {
    let n2 = v[0] * v[0] + v[1] * v[1] + v[2] * v[2];
    if n2 == 0.0 {
        return 1.0;
    }
    let c = ((v[0] * d[0] + v[1] * d[1] + v[2] * d[2]) / n2.sqrt()).clamp(-1.0, 1.0);
    (1.0 - FRAC_2_PI * c.acos()).max(0.0)
}

/// A monotone key of the angle between `w` and `d`: cos β · |cos β| (no square root).
#[inline]
fn key(w: [f64; 3], d: [f64; 3]) -> f64 {
    let n2 = w[0] * w[0] + w[1] * w[1] + w[2] * w[2];
    if n2 == 0.0 {
        return f64::INFINITY;
    }
    let c = w[0] * d[0] + w[1] * d[1] + w[2] * d[2];
    c * c.abs() / n2
}

/// Degree from a key made by [`key`].
#[inline]
fn degree_of_key(k: f64) -> f64 {
    if k == f64::INFINITY {
        return 1.0;
    }
    let c = k.signum() * k.abs().sqrt();
    (1.0 - FRAC_2_PI * c.clamp(-1.0, 1.0).acos()).max(0.0)
}

/// The exact landscape value at one voxel: max over the reference voxels (Bloch 1999, eq. of
/// the fuzzy dilation), O(|R|) per voxel. `reference_world` are the reference voxel centres.
pub fn exact_degree(x_world: [f64; 3], reference_world: &[[f64; 3]], d: [f64; 3]) -> f64 {
    let mut best = f64::NEG_INFINITY;
    for r in reference_world {
        let k = key([x_world[0] - r[0], x_world[1] - r[1], x_world[2] - r[2]], d);
        if k > best {
            best = k;
            if k >= 1.0 {
                break;
            }
        }
    }
    if best == f64::NEG_INFINITY {
        0.0
    } else {
        degree_of_key(best)
    }
}

/// Marker for "no origin yet" in the propagation state.
const NONE: i16 = i16::MIN;

/// A landscape computed by two-pass propagation over a box (Bloch 1999, §4: each voxel keeps
/// the reference point that gives it the best degree, and takes over a neighbour's point
/// when that gives a better angle). State: the vector from the origin to the voxel, in voxel
/// units, as three `i16` arrays (6 bytes per voxel).
///
/// Each raster pass visits the 13 neighbours that precede a voxel (the forward pass) or
/// follow it (the backward pass). The 12 neighbours in earlier rows are handled a whole row
/// at a time in branch-free loops the compiler vectorises; the one in the same row is
/// handled by a sequential sweep along the row.
pub struct FastLandscape {
    /// Global index of the box's first voxel.
    pub lo: [i64; 3],
    /// Box size (fine voxels).
    pub dims: [usize; 3],
    /// Coarsening factor: the propagation runs on cells of factor³ voxels (1 = full resolution).
    pub factor: usize,
    cdims: [usize; 3],
    fine_linear: [[f64; 3]; 3],
    ox: Vec<i16>,
    oy: Vec<i16>,
    oz: Vec<i16>,
    linear: [[f32; 3]; 3],
    direction: [f32; 3],
}

/// Per-row scratch of the propagation.
struct Row {
    key: Vec<f32>,
    x: Vec<i16>,
    y: Vec<i16>,
    z: Vec<i16>,
}

impl FastLandscape {
    /// Propagates the landscape of `reference` in direction `d` over the box `lo .. lo+dims`.
    /// The box must contain the reference and hold fewer than 32767 voxels along each axis.
    pub fn compute(
        reference: &Mask,
        lo: [i64; 3],
        dims: [usize; 3],
        affine: &Affine,
        d: [f64; 3],
    ) -> Self {
        Self::compute_coarse(reference, lo, dims, affine, d, 1)
    }

    /// As [`FastLandscape::compute`], with the propagation run on cells of `factor`³ voxels:
    /// a cell is reference when it holds a reference voxel, and a voxel's degree is the
    /// structuring element of the vector from its cell's origin cell centre to the voxel.
    pub fn compute_coarse(
        reference: &Mask,
        lo: [i64; 3],
        dims: [usize; 3],
        affine: &Affine,
        d: [f64; 3],
        factor: usize,
    ) -> Self {
        let f = factor.max(1);
        let cdims = dims.map(|n| n.div_ceil(f));
        let [nx, ny, nz] = cdims;
        let n = nx * ny * nz;
        let fine_linear = affine.linear();
        let mut me = FastLandscape {
            lo,
            dims,
            factor: f,
            cdims,
            fine_linear,
            ox: vec![NONE; n],
            oy: vec![0; n],
            oz: vec![0; n],
            linear: fine_linear.map(|r| r.map(|v| (v * f as f64) as f32)),
            direction: d.map(|v| v as f32),
        };
        for p in reference.iter() {
            let (i, j, k) = (p[0] - lo[0], p[1] - lo[1], p[2] - lo[2]);
            if i >= 0
                && j >= 0
                && k >= 0
                && (i as usize) < dims[0]
                && (j as usize) < dims[1]
                && (k as usize) < dims[2]
            {
                let (i, j, k) = (i as usize / f, j as usize / f, k as usize / f);
                me.ox[i + nx * (j + ny * k)] = 0;
            }
        }
        me.pass(true);
        me.pass(false);
        me
    }

    #[inline(always)]
    fn key3(l: &[[f32; 3]; 3], d: &[f32; 3], a: f32, b: f32, c: f32) -> f32 {
        let w0 = l[0][0] * a + l[0][1] * b + l[0][2] * c;
        let w1 = l[1][0] * a + l[1][1] * b + l[1][2] * c;
        let w2 = l[2][0] * a + l[2][1] * b + l[2][2] * c;
        let n2 = w0 * w0 + w1 * w1 + w2 * w2;
        let cc = w0 * d[0] + w1 * d[1] + w2 * d[2];
        // cos β · |cos β|, monotone in β; the origin itself gets +∞.
        if n2 > 0.0 {
            cc * cc.abs() / n2
        } else {
            f32::INFINITY
        }
    }

    fn pass(&mut self, forward: bool) {
        let [nx, ny, nz] = self.cdims;
        let l = self.linear;
        let d = self.direction;
        let sgn: i64 = if forward { 1 } else { -1 };
        // Neighbours in earlier rows (in pass order): (dj, dk) with dk = −s, or dk = 0 and dj = −s.
        let mut rows_nb: Vec<(i64, i64)> = Vec::new();
        for dj in -1..=1 {
            rows_nb.push((dj, -sgn));
        }
        rows_nb.push((-sgn, 0));
        let mut r = Row {
            key: vec![0.0; nx],
            x: vec![0; nx],
            y: vec![0; nx],
            z: vec![0; nx],
        };
        let ks: Vec<usize> = if forward {
            (0..nz).collect()
        } else {
            (0..nz).rev().collect()
        };
        let js: Vec<usize> = if forward {
            (0..ny).collect()
        } else {
            (0..ny).rev().collect()
        };
        for &k in &ks {
            for &j in &js {
                let base = nx * (j + ny * k);
                // Current state of the row.
                for i in 0..nx {
                    let (a, b, c) = (self.ox[base + i], self.oy[base + i], self.oz[base + i]);
                    r.x[i] = a;
                    r.y[i] = b;
                    r.z[i] = c;
                    r.key[i] = if a == NONE {
                        f32::NEG_INFINITY
                    } else {
                        Self::key3(&l, &d, a as f32, b as f32, c as f32)
                    };
                }
                // Neighbours in earlier rows: candidate = neighbour's vector − (neighbour − here).
                for &(dj, dk) in &rows_nb {
                    let (jj, kk) = (j as i64 + dj, k as i64 + dk);
                    if jj < 0 || kk < 0 || jj >= ny as i64 || kk >= nz as i64 {
                        continue;
                    }
                    let nb = nx * (jj as usize + ny * kk as usize);
                    for di in -1i64..=1 {
                        let (i0, i1) = (
                            if di < 0 { 1 } else { 0 },
                            if di > 0 { nx.saturating_sub(1) } else { nx },
                        );
                        let (ey, ez) = (-dj as i16, -dk as i16);
                        let ex = -di as i16;
                        let src = (nb as i64 + di) as usize;
                        for i in i0..i1 {
                            let a = self.ox[src + i];
                            let ca = a.wrapping_add(ex);
                            let cb = self.oy[src + i].wrapping_add(ey);
                            let cc = self.oz[src + i].wrapping_add(ez);
                            let kc = Self::key3(&l, &d, ca as f32, cb as f32, cc as f32);
                            let better = a != NONE && kc > r.key[i];
                            r.key[i] = if better { kc } else { r.key[i] };
                            r.x[i] = if better { ca } else { r.x[i] };
                            r.y[i] = if better { cb } else { r.y[i] };
                            r.z[i] = if better { cc } else { r.z[i] };
                        }
                    }
                }
                // The neighbour in the same row, swept in pass order.
                let mut sweep = |i: usize, prev: usize, step: i16| {
                    if r.x[prev] == NONE {
                        return;
                    }
                    let (ca, cb, cc) = (r.x[prev].wrapping_add(step), r.y[prev], r.z[prev]);
                    let kc = Self::key3(&l, &d, ca as f32, cb as f32, cc as f32);
                    if kc > r.key[i] {
                        r.key[i] = kc;
                        r.x[i] = ca;
                        r.y[i] = cb;
                        r.z[i] = cc;
                    }
                };
                if forward {
                    for i in 1..nx {
                        sweep(i, i - 1, 1);
                    }
                } else {
                    for i in (0..nx.saturating_sub(1)).rev() {
                        sweep(i, i + 1, -1);
                    }
                }
                self.ox[base..base + nx].copy_from_slice(&r.x);
                self.oy[base..base + nx].copy_from_slice(&r.y);
                self.oz[base..base + nx].copy_from_slice(&r.z);
            }
        }
    }

    /// The degree at a global voxel (0 outside the box or where no origin was found).
    pub fn degree(&self, p: [i64; 3]) -> f64 {
        let (i, j, k) = (p[0] - self.lo[0], p[1] - self.lo[1], p[2] - self.lo[2]);
        if i < 0 || j < 0 || k < 0 {
            return 0.0;
        }
        let (i, j, k) = (i as usize, j as usize, k as usize);
        let [nx, ny, nz] = self.dims;
        if i >= nx || j >= ny || k >= nz {
            return 0.0;
        }
        let f = self.factor;
        let [cx, cy, _] = self.cdims;
        let c = [i / f, j / f, k / f];
        let l = c[0] + cx * (c[1] + cy * c[2]);
        if self.ox[l] == NONE {
            return 0.0;
        }
        let cv = [self.ox[l] as f64, self.oy[l] as f64, self.oz[l] as f64];
        // Vector (fine voxel units) from the origin cell's centre to this voxel.
        let half = (f as f64 - 1.0) / 2.0;
        let q = [i as f64, j as f64, k as f64];
        let v: [f64; 3] = std::array::from_fn(|a| q[a] - (f as f64 * (c[a] as f64 - cv[a]) + half));
        let lin = self.fine_linear;
        let w = [
            lin[0][0] * v[0] + lin[0][1] * v[1] + lin[0][2] * v[2],
            lin[1][0] * v[0] + lin[1][1] * v[1] + lin[1][2] * v[2],
            lin[2][0] * v[0] + lin[2][1] * v[1] + lin[2][2] * v[2],
        ];
        structuring_element(w, self.direction.map(|x| x as f64))
    }

    /// Bytes of state per propagation cell.
    pub const BYTES_PER_CELL: usize = 6;
}

/// How a target's landscape values are combined into one degree (Dubois & Prade fuzzy
/// pattern matching, as Bloch 1999 §3 uses it).
#[derive(
    Clone, Copy, Debug, PartialEq, Eq, serde::Serialize, serde::Deserialize, clap::ValueEnum,
)]
#[serde(rename_all = "lowercase")]
pub enum Aggregate {
    /// inf over the target: the whole target is in the direction.
    Necessity,
    /// The mean over the target's voxels.
    Mean,
    /// sup over the target: some part of the target is in the direction.
    Possibility,
}

impl Aggregate {
    /// Combines the degrees of a crisp target's voxels; 0 for an empty target.
    pub fn combine(self, degrees: impl Iterator<Item = f64>) -> f64 {
        let mut n = 0usize;
        let (mut lo, mut hi, mut sum) = (f64::INFINITY, f64::NEG_INFINITY, 0.0);
        for v in degrees {
            n += 1;
            lo = lo.min(v);
            hi = hi.max(v);
            sum += v;
        }
        if n == 0 {
            return 0.0;
        }
        match self {
            Aggregate::Necessity => lo,
            Aggregate::Mean => sum / n as f64,
            Aggregate::Possibility => hi,
        }
    }
}

/// Which landscape algorithm to use.
#[derive(
    Clone, Copy, Debug, PartialEq, Eq, serde::Serialize, serde::Deserialize, clap::ValueEnum,
)]
#[serde(rename_all = "lowercase")]
pub enum LandscapeMode {
    /// Max over every reference voxel at every target voxel: O(|target| · |reference|).
    Exact,
    /// Two-pass propagation over the box holding reference and targets: O(box · 13 · 2).
    Fast,
}

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
/// when that gives a better angle). Memory: 6 bytes per voxel (the offset to the origin).
pub struct FastLandscape {
    /// Global index of the box's first voxel.
    pub lo: [i64; 3],
    /// Box size.
    pub dims: [usize; 3],
    /// Vector (voxel units) from each voxel's origin in the reference to the voxel; `NONE` if none.
    offsets: Vec<[i16; 3]>,
    linear: [[f64; 3]; 3],
    direction: [f64; 3],
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
        let [nx, ny, nz] = dims;
        let mut offsets = vec![[NONE, 0, 0]; nx * ny * nz];
        for p in reference.voxels() {
            let (i, j, k) = (
                (p[0] - lo[0]) as usize,
                (p[1] - lo[1]) as usize,
                (p[2] - lo[2]) as usize,
            );
            if i < nx && j < ny && k < nz {
                offsets[i + nx * (j + ny * k)] = [0, 0, 0];
            }
        }
        let linear = affine.linear();
        // The 13 neighbours visited before a voxel in raster order (k, then j, then i).
        let mut causal: Vec<[i64; 3]> = Vec::with_capacity(13);
        for dk in -1..=0i64 {
            for dj in -1..=1i64 {
                for di in -1..=1i64 {
                    if dk < 0 || (dk == 0 && dj < 0) || (dk == 0 && dj == 0 && di < 0) {
                        causal.push([di, dj, dk]);
                    }
                }
            }
        }
        let mut me = FastLandscape {
            lo,
            dims,
            offsets,
            linear,
            direction: d,
        };
        me.pass(&causal, true);
        let anti: Vec<[i64; 3]> = causal.iter().map(|n| [-n[0], -n[1], -n[2]]).collect();
        me.pass(&anti, false);
        me
    }

    #[inline]
    fn world(&self, o: [i16; 3]) -> [f64; 3] {
        let l = &self.linear;
        let (a, b, c) = (o[0] as f64, o[1] as f64, o[2] as f64);
        [
            l[0][0] * a + l[0][1] * b + l[0][2] * c,
            l[1][0] * a + l[1][1] * b + l[1][2] * c,
            l[2][0] * a + l[2][1] * b + l[2][2] * c,
        ]
    }

    fn pass(&mut self, nbrs: &[[i64; 3]], forward: bool) {
        let [nx, ny, nz] = self.dims;
        let d = self.direction;
        let step: Vec<(isize, [i16; 3], [i64; 3])> = nbrs
            .iter()
            .map(|n| {
                (
                    (n[0] + n[1] * nx as i64 + n[2] * (nx * ny) as i64) as isize,
                    [-n[0] as i16, -n[1] as i16, -n[2] as i16],
                    *n,
                )
            })
            .collect();
        let total = nx * ny * nz;
        for t in 0..total {
            let l = if forward { t } else { total - 1 - t };
            let cur = self.offsets[l];
            let mut best_key = if cur[0] == NONE {
                f64::NEG_INFINITY
            } else {
                key(self.world(cur), d)
            };
            if best_key == f64::INFINITY || best_key >= 1.0 {
                continue;
            }
            let i = (l % nx) as i64;
            let j = ((l / nx) % ny) as i64;
            let k = (l / (nx * ny)) as i64;
            let mut best = cur;
            for &(dl, back, n) in &step {
                let (ii, jj, kk) = (i + n[0], j + n[1], k + n[2]);
                if ii < 0
                    || jj < 0
                    || kk < 0
                    || ii >= nx as i64
                    || jj >= ny as i64
                    || kk >= nz as i64
                {
                    continue;
                }
                let o = self.offsets[(l as isize + dl) as usize];
                if o[0] == NONE {
                    continue;
                }
                // Vector from the neighbour's origin to here: (neighbour − origin) + (here − neighbour).
                let cand = [
                    o[0].saturating_add(back[0]),
                    o[1].saturating_add(back[1]),
                    o[2].saturating_add(back[2]),
                ];
                let kc = key(self.world(cand), d);
                if kc > best_key {
                    best_key = kc;
                    best = cand;
                }
            }
            self.offsets[l] = best;
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
        let o = self.offsets[i + nx * (j + ny * k)];
        if o[0] == NONE {
            return 0.0;
        }
        degree_of_key(key(self.world(o), self.direction))
    }

    /// Bytes of state per voxel.
    pub const BYTES_PER_VOXEL: usize = 6;
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

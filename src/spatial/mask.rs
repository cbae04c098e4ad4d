//! Binary voxel sets stored in their own bounding box, hole filling and neighbourhoods.

use serde::Serialize;

/// Digital adjacency between voxels.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub enum Adjacency {
    /// Face neighbours only.
    Six,
    /// Face, edge and corner neighbours.
    TwentySix,
}

impl Adjacency {
    /// The neighbour offsets (without the centre).
    pub fn offsets(self) -> &'static [[i64; 3]] {
        match self {
            Adjacency::Six => &SIX,
            Adjacency::TwentySix => &TWENTY_SIX,
        }
    }

    /// 6 or 26.
    pub fn number(self) -> u32 {
        match self {
            Adjacency::Six => 6,
            Adjacency::TwentySix => 26,
        }
    }
}

const SIX: [[i64; 3]; 6] = [
    [-1, 0, 0],
    [1, 0, 0],
    [0, -1, 0],
    [0, 1, 0],
    [0, 0, -1],
    [0, 0, 1],
];
const TWENTY_SIX: [[i64; 3]; 26] = {
    let mut out = [[0i64; 3]; 26];
    let mut n = 0;
    let mut k = -1;
    while k <= 1 {
        let mut j = -1;
        while j <= 1 {
            let mut i = -1;
            while i <= 1 {
                if !(i == 0 && j == 0 && k == 0) {
                    out[n] = [i, j, k];
                    n += 1;
                }
                i += 1;
            }
            j += 1;
        }
        k += 1;
    }
    out
};

/// A set of voxels of the global grid, stored as booleans over a box `lo .. lo + dims`.
#[derive(Clone, Debug, PartialEq)]
pub struct Mask {
    /// Global index of the box's first voxel (may be −1 for a padded box).
    pub lo: [i64; 3],
    /// Box size.
    pub dims: [usize; 3],
    /// Membership, i fastest.
    pub bits: Vec<bool>,
}

impl Mask {
    /// An empty mask over the given box.
    pub fn empty(lo: [i64; 3], dims: [usize; 3]) -> Self {
        Mask {
            lo,
            dims,
            bits: vec![false; dims[0] * dims[1] * dims[2]],
        }
    }

    /// A mask from a list of global voxel indices (its box is their bounding box padded by one).
    pub fn from_voxels(voxels: &[[i64; 3]]) -> Self {
        if voxels.is_empty() {
            return Mask::empty([0; 3], [0; 3]);
        }
        let mut lo = voxels[0];
        let mut hi = voxels[0];
        for v in voxels {
            for a in 0..3 {
                lo[a] = lo[a].min(v[a]);
                hi[a] = hi[a].max(v[a]);
            }
        }
        let lo = [lo[0] - 1, lo[1] - 1, lo[2] - 1];
        let dims = [
            (hi[0] - lo[0] + 2) as usize,
            (hi[1] - lo[1] + 2) as usize,
            (hi[2] - lo[2] + 2) as usize,
        ];
        let mut m = Mask::empty(lo, dims);
        for v in voxels {
            m.set(*v, true);
        }
        m
    }

    /// Local linear index of a global voxel, if inside the box.
    #[inline]
    pub fn local(&self, p: [i64; 3]) -> Option<usize> {
        let i = p[0] - self.lo[0];
        let j = p[1] - self.lo[1];
        let k = p[2] - self.lo[2];
        if i < 0 || j < 0 || k < 0 {
            return None;
        }
        let (i, j, k) = (i as usize, j as usize, k as usize);
        if i >= self.dims[0] || j >= self.dims[1] || k >= self.dims[2] {
            return None;
        }
        Some(i + self.dims[0] * (j + self.dims[1] * k))
    }

    /// Whether a global voxel belongs to the set.
    #[inline]
    pub fn contains(&self, p: [i64; 3]) -> bool {
        self.local(p).is_some_and(|l| self.bits[l])
    }

    /// Sets membership of a global voxel inside the box (ignored outside).
    pub fn set(&mut self, p: [i64; 3], v: bool) {
        if let Some(l) = self.local(p) {
            self.bits[l] = v;
        }
    }

    /// Number of voxels in the set.
    pub fn count(&self) -> usize {
        self.bits.iter().filter(|&&b| b).count()
    }

    /// The voxels in raster order (i fastest), without allocating.
    pub fn iter(&self) -> impl Iterator<Item = [i64; 3]> + '_ {
        let [nx, ny, _] = self.dims;
        let lo = self.lo;
        self.bits
            .iter()
            .enumerate()
            .filter(|(_, b)| **b)
            .map(move |(l, _)| {
                [
                    lo[0] + (l % nx) as i64,
                    lo[1] + ((l / nx) % ny) as i64,
                    lo[2] + (l / (nx * ny)) as i64,
                ]
            })
    }

    /// Number of voxels in both sets (scans only the overlap of the two boxes).
    pub fn intersection_count(&self, other: &Mask) -> usize {
        let mut lo = [0i64; 3];
        let mut hi = [0i64; 3];
        for a in 0..3 {
            lo[a] = self.lo[a].max(other.lo[a]);
            hi[a] = (self.lo[a] + self.dims[a] as i64).min(other.lo[a] + other.dims[a] as i64);
            if hi[a] <= lo[a] {
                return 0;
            }
        }
        let mut n = 0;
        for k in lo[2]..hi[2] {
            for j in lo[1]..hi[1] {
                let (Some(a0), Some(b0)) = (self.local([lo[0], j, k]), other.local([lo[0], j, k]))
                else {
                    continue;
                };
                let len = (hi[0] - lo[0]) as usize;
                n += self.bits[a0..a0 + len]
                    .iter()
                    .zip(&other.bits[b0..b0 + len])
                    .filter(|(x, y)| **x && **y)
                    .count();
            }
        }
        n
    }

    /// Global indices of the voxels, in raster order (i fastest).
    pub fn voxels(&self) -> Vec<[i64; 3]> {
        let mut out = Vec::new();
        let [nx, ny, nz] = self.dims;
        for k in 0..nz {
            for j in 0..ny {
                for i in 0..nx {
                    if self.bits[i + nx * (j + ny * k)] {
                        out.push([
                            self.lo[0] + i as i64,
                            self.lo[1] + j as i64,
                            self.lo[2] + k as i64,
                        ]);
                    }
                }
            }
        }
        out
    }

    /// Inclusive global bounding box of the voxels, if any.
    pub fn bounds(&self) -> Option<([i64; 3], [i64; 3])> {
        let v = self.voxels();
        let first = *v.first()?;
        let (mut lo, mut hi) = (first, first);
        for p in &v {
            for a in 0..3 {
                lo[a] = lo[a].min(p[a]);
                hi[a] = hi[a].max(p[a]);
            }
        }
        Some((lo, hi))
    }

    /// Voxels of the set with at least one 26-neighbour outside it (the digital surface).
    pub fn surface(&self) -> Vec<[i64; 3]> {
        let [nx, ny, nz] = self.dims;
        // Linear offsets of the 26 neighbours, valid away from the box's border.
        let lin: Vec<isize> = Adjacency::TwentySix
            .offsets()
            .iter()
            .map(|o| (o[0] + o[1] * nx as i64 + o[2] * (nx * ny) as i64) as isize)
            .collect();
        let mut out = Vec::new();
        for k in 0..nz {
            for j in 0..ny {
                for i in 0..nx {
                    let l = i + nx * (j + ny * k);
                    if !self.bits[l] {
                        continue;
                    }
                    let border =
                        i == 0 || j == 0 || k == 0 || i + 1 == nx || j + 1 == ny || k + 1 == nz;
                    let p = [
                        self.lo[0] + i as i64,
                        self.lo[1] + j as i64,
                        self.lo[2] + k as i64,
                    ];
                    let outside = if border {
                        Adjacency::TwentySix
                            .offsets()
                            .iter()
                            .any(|o| !self.contains([p[0] + o[0], p[1] + o[1], p[2] + o[2]]))
                    } else {
                        lin.iter().any(|&d| !self.bits[(l as isize + d) as usize])
                    };
                    if outside {
                        out.push(p);
                    }
                }
            }
        }
        out
    }

    /// The extent: the set together with every voxel it encloses. Background voxels reached
    /// from outside the box through 6-connected background paths stay outside; the rest is
    /// filled (3D hole filling). The box must have a one-voxel empty border.
    pub fn filled(&self) -> Mask {
        let [nx, ny, nz] = self.dims;
        let n = self.bits.len();
        let mut outside = vec![false; n];
        let mut stack: Vec<usize> = Vec::new();
        let push = |l: usize, outside: &mut Vec<bool>, stack: &mut Vec<usize>| {
            if !self.bits[l] && !outside[l] {
                outside[l] = true;
                stack.push(l);
            }
        };
        for k in 0..nz {
            for j in 0..ny {
                for i in 0..nx {
                    if i == 0 || j == 0 || k == 0 || i == nx - 1 || j == ny - 1 || k == nz - 1 {
                        push(i + nx * (j + ny * k), &mut outside, &mut stack);
                    }
                }
            }
        }
        while let Some(l) = stack.pop() {
            let i = l % nx;
            let j = (l / nx) % ny;
            let k = l / (nx * ny);
            if i > 0 {
                push(l - 1, &mut outside, &mut stack);
            }
            if i + 1 < nx {
                push(l + 1, &mut outside, &mut stack);
            }
            if j > 0 {
                push(l - nx, &mut outside, &mut stack);
            }
            if j + 1 < ny {
                push(l + nx, &mut outside, &mut stack);
            }
            if k > 0 {
                push(l - nx * ny, &mut outside, &mut stack);
            }
            if k + 1 < nz {
                push(l + nx * ny, &mut outside, &mut stack);
            }
        }
        Mask {
            lo: self.lo,
            dims: self.dims,
            bits: outside.into_iter().map(|o| !o).collect(),
        }
    }
}

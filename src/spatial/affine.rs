//! Voxel-to-world affines in RAS millimetres, built by the NIfTI-1 formulas of nifti1.h.

use serde::Serialize;

/// A 4×4 voxel-to-world matrix: `world = M · [i, j, k, 1]`, world in RAS millimetres.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Affine(pub [[f64; 4]; 4]);

/// Which header fields gave the voxel-to-world transform (nifti1.h "methods" 3, 2 and 1).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum AffineSource {
    /// `sform_code > 0`: the srow_x/y/z rows (method 3).
    Sform,
    /// `qform_code > 0`: the quaternion, pixdim and qfac (method 2).
    Qform,
    /// Neither: pixdim scaling alone (method 1).
    Pixdim,
}

impl Affine {
    /// The identity transform (1 mm isotropic voxels at the origin).
    pub fn identity() -> Self {
        Self::diagonal([1.0, 1.0, 1.0], [0.0, 0.0, 0.0])
    }

    /// A scaling along the axes followed by a translation.
    pub fn diagonal(spacing: [f64; 3], origin: [f64; 3]) -> Self {
        let mut m = [[0.0; 4]; 4];
        for a in 0..3 {
            m[a][a] = spacing[a];
            m[a][3] = origin[a];
        }
        m[3][3] = 1.0;
        Affine(m)
    }

    /// Builds a transform from its 3×3 linear part (columns = voxel axes in mm) and translation.
    pub fn from_linear(linear: [[f64; 3]; 3], origin: [f64; 3]) -> Self {
        let mut m = [[0.0; 4]; 4];
        for r in 0..3 {
            m[r][..3].copy_from_slice(&linear[r]);
            m[r][3] = origin[r];
        }
        m[3][3] = 1.0;
        Affine(m)
    }

    /// nifti1.h method 3: the rows srow_x, srow_y, srow_z.
    pub fn from_sform(srow_x: [f64; 4], srow_y: [f64; 4], srow_z: [f64; 4]) -> Self {
        Affine([srow_x, srow_y, srow_z, [0.0, 0.0, 0.0, 1.0]])
    }

    /// nifti1.h method 2: rotation from the quaternion (b, c, d), a = sqrt(1 − b² − c² − d²),
    /// scaled by pixdim with the third axis multiplied by qfac, then shifted by the offsets.
    ///
    /// As in the reference C library (nifti1_io.c, `nifti_quatern_to_mat44`), a qfac of 0 is
    /// read as 1 and a quaternion whose b² + c² + d² exceeds 1 is renormalised with a = 0.
    /// Spacings must already be positive (the caller decides what to do with bad pixdim).
    pub fn from_qform(quat_bcd: [f64; 3], offset: [f64; 3], spacing: [f64; 3], qfac: f64) -> Self {
        let [mut b, mut c, mut d] = quat_bcd;
        let mut a = 1.0 - (b * b + c * c + d * d);
        if a < 1e-7 {
            let n = 1.0 / (b * b + c * c + d * d).sqrt();
            b *= n;
            c *= n;
            d *= n;
            a = 0.0;
        } else {
            a = a.sqrt();
        }
        let r = [
            [
                a * a + b * b - c * c - d * d,
                2.0 * (b * c - a * d),
                2.0 * (b * d + a * c),
            ],
            [
                2.0 * (b * c + a * d),
                a * a + c * c - b * b - d * d,
                2.0 * (c * d - a * b),
            ],
            [
                2.0 * (b * d - a * c),
                2.0 * (c * d + a * b),
                a * a + d * d - c * c - b * b,
            ],
        ];
        let q = if qfac < 0.0 { -1.0 } else { 1.0 };
        let s = [spacing[0], spacing[1], spacing[2] * q];
        let mut lin = [[0.0; 3]; 3];
        for row in 0..3 {
            for col in 0..3 {
                lin[row][col] = r[row][col] * s[col];
            }
        }
        Self::from_linear(lin, offset)
    }

    /// World coordinates (mm) of a voxel centre given by (possibly fractional) indices.
    pub fn apply(&self, ijk: [f64; 3]) -> [f64; 3] {
        let m = &self.0;
        let mut out = [0.0; 3];
        for (r, o) in out.iter_mut().enumerate() {
            *o = m[r][0] * ijk[0] + m[r][1] * ijk[1] + m[r][2] * ijk[2] + m[r][3];
        }
        out
    }

    /// The world vector of an index-space step (no translation).
    pub fn apply_vector(&self, dijk: [f64; 3]) -> [f64; 3] {
        let m = &self.0;
        let mut out = [0.0; 3];
        for (r, o) in out.iter_mut().enumerate() {
            *o = m[r][0] * dijk[0] + m[r][1] * dijk[1] + m[r][2] * dijk[2];
        }
        out
    }

    /// The 3×3 linear part.
    pub fn linear(&self) -> [[f64; 3]; 3] {
        let m = &self.0;
        [
            [m[0][0], m[0][1], m[0][2]],
            [m[1][0], m[1][1], m[1][2]],
            [m[2][0], m[2][1], m[2][2]],
        ]
    }

    /// Determinant of the 3×3 part: the signed voxel volume in mm³.
    pub fn det3(&self) -> f64 {
        let l = self.linear();
        l[0][0] * (l[1][1] * l[2][2] - l[1][2] * l[2][1])
            - l[0][1] * (l[1][0] * l[2][2] - l[1][2] * l[2][0])
            + l[0][2] * (l[1][0] * l[2][1] - l[1][1] * l[2][0])
    }

    /// Lengths of the three voxel axes in mm (column norms of the 3×3 part).
    pub fn spacing(&self) -> [f64; 3] {
        let l = self.linear();
        let mut s = [0.0; 3];
        for (c, sc) in s.iter_mut().enumerate() {
            *sc = (l[0][c] * l[0][c] + l[1][c] * l[1][c] + l[2][c] * l[2][c]).sqrt();
        }
        s
    }

    /// Largest |cosine| between two distinct voxel axes; 0 when the grid is orthogonal.
    ///
    /// The separable distance transform is exact only for orthogonal axes, so callers warn
    /// when this is not small.
    pub fn shear(&self) -> f64 {
        let l = self.linear();
        let s = self.spacing();
        let mut worst: f64 = 0.0;
        for a in 0..3 {
            for b in (a + 1)..3 {
                let dot = l[0][a] * l[0][b] + l[1][a] * l[1][b] + l[2][a] * l[2][b];
                worst = worst.max((dot / (s[a] * s[b])).abs());
            }
        }
        worst
    }

    /// True when every entry is finite and the 3×3 part is invertible.
    pub fn is_usable(&self) -> bool {
        self.0.iter().flatten().all(|v| v.is_finite()) && self.det3().abs() > 1e-12
    }

    /// For each voxel axis, the world axis (0 = x, 1 = y, 2 = z) it follows most closely and
    /// the sign of that component; used to place orientation letters on pictures.
    pub fn axis_codes(&self) -> [(usize, f64); 3] {
        let l = self.linear();
        let mut out = [(0, 1.0); 3];
        for (c, o) in out.iter_mut().enumerate() {
            let mut best = 0;
            for r in 1..3 {
                if l[r][c].abs() > l[best][c].abs() {
                    best = r;
                }
            }
            *o = (best, l[best][c].signum());
        }
        out
    }

    /// Rounds every entry to 1e-9 so that the JSON is stable across platforms.
    pub fn rounded(&self) -> [[f64; 4]; 4] {
        let mut m = self.0;
        for v in m.iter_mut().flatten() {
            *v = round_to(*v, 1e9);
        }
        m
    }
}

/// Rounds `v` to the nearest multiple of `1/scale` (and turns −0 into 0).
pub fn round_to(v: f64, scale: f64) -> f64 {
    let r = (v * scale).round() / scale;
    if r == 0.0 { 0.0 } else { r }
}

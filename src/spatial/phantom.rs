//! Synthetic label volumes: ellipsoids, boxes, tubes and carved-out lesions painted in world
//! millimetres on a grid of any spacing and orientation, written as NIfTI-1.
//!
//! ```
//! use wherefore::spatial::{affine::Affine, phantom::Phantom};
//! let mut p = Phantom::new([40, 40, 40], Affine::diagonal([1.0, 1.0, 2.0], [-20.0, -20.0, -40.0]));
//! p.ellipsoid(1, [0.0, 0.0, 0.0], [12.0, 10.0, 16.0]).lesion(2, 1, [3.0, 0.0, 0.0], [3.0, 3.0, 3.0]);
//! assert!(p.count(2) > 0);
//! ```

use super::affine::Affine;
use super::affine::AffineSource;
use super::nifti_io::{LabelMap, RawHeader, dtype, encode_labels, write_nifti};
use std::path::Path;

/// A label volume under construction.
#[derive(Clone, Debug)]
pub struct Phantom {
    /// Grid size.
    pub shape: [usize; 3],
    /// Voxel-to-world, RAS mm.
    pub affine: Affine,
    labels: Vec<i64>,
}

impl Phantom {
    /// An empty (all background) volume.
    pub fn new(shape: [usize; 3], affine: Affine) -> Self {
        Phantom {
            shape,
            affine,
            labels: vec![0; shape[0] * shape[1] * shape[2]],
        }
    }

    fn paint(&mut self, label: i64, only_over: Option<i64>, inside: impl Fn([f64; 3]) -> bool) {
        let [nx, ny, nz] = self.shape;
        let mut l = 0;
        for k in 0..nz {
            for j in 0..ny {
                for i in 0..nx {
                    let w = self.affine.apply([i as f64, j as f64, k as f64]);
                    if inside(w) && only_over.is_none_or(|h| self.labels[l] == h) {
                        self.labels[l] = label;
                    }
                    l += 1;
                }
            }
        }
    }

    /// Paints the voxels whose centre lies in the axis-aligned (world) ellipsoid.
    pub fn ellipsoid(&mut self, label: i64, centre_mm: [f64; 3], radii_mm: [f64; 3]) -> &mut Self {
        self.paint(label, None, |w| in_ellipsoid(w, centre_mm, radii_mm));
        self
    }

    /// Paints the voxels whose centre lies in the world box `[min_mm, max_mm]`.
    pub fn cuboid(&mut self, label: i64, min_mm: [f64; 3], max_mm: [f64; 3]) -> &mut Self {
        self.paint(label, None, |w| {
            (0..3).all(|a| w[a] >= min_mm[a] && w[a] <= max_mm[a])
        });
        self
    }

    /// Paints the voxels whose centre lies within `radius_mm` of the segment `from`–`to`.
    pub fn tube(
        &mut self,
        label: i64,
        from_mm: [f64; 3],
        to_mm: [f64; 3],
        radius_mm: f64,
    ) -> &mut Self {
        let d = [
            to_mm[0] - from_mm[0],
            to_mm[1] - from_mm[1],
            to_mm[2] - from_mm[2],
        ];
        let len2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
        self.paint(label, None, |w| {
            let v = [w[0] - from_mm[0], w[1] - from_mm[1], w[2] - from_mm[2]];
            let t = if len2 > 0.0 {
                ((v[0] * d[0] + v[1] * d[1] + v[2] * d[2]) / len2).clamp(0.0, 1.0)
            } else {
                0.0
            };
            let c = [v[0] - t * d[0], v[1] - t * d[1], v[2] - t * d[2]];
            c[0] * c[0] + c[1] * c[1] + c[2] * c[2] <= radius_mm * radius_mm
        });
        self
    }

    /// Carves an ellipsoidal lesion out of the region `host`: only voxels labelled `host`
    /// change, so the lesion is enclosed by the host's extent where it lies inside it.
    pub fn lesion(
        &mut self,
        label: i64,
        host: i64,
        centre_mm: [f64; 3],
        radii_mm: [f64; 3],
    ) -> &mut Self {
        self.paint(label, Some(host), |w| in_ellipsoid(w, centre_mm, radii_mm));
        self
    }

    /// Sets one voxel.
    pub fn set(&mut self, ijk: [usize; 3], label: i64) -> &mut Self {
        let [nx, ny, _] = self.shape;
        if let Some(v) = self.labels.get_mut(ijk[0] + nx * (ijk[1] + ny * ijk[2])) {
            *v = label;
        }
        self
    }

    /// The labels, i fastest.
    pub fn labels(&self) -> &[i64] {
        &self.labels
    }

    /// Number of voxels carrying `label`.
    pub fn count(&self, label: i64) -> usize {
        self.labels.iter().filter(|&&v| v == label).count()
    }

    /// The volume as an in-memory label map named `name` (as if read from a file).
    pub fn to_label_map(&self, name: &str) -> LabelMap {
        let mut values: Vec<i64> = Vec::new();
        let mut codes = Vec::with_capacity(self.labels.len());
        for &v in &self.labels {
            let c = match values.iter().position(|&x| x == v) {
                Some(c) => c,
                None => {
                    values.push(v);
                    values.len() - 1
                }
            };
            codes.push(c as u16);
        }
        LabelMap {
            path: name.into(),
            name: name.to_string(),
            shape: self.shape,
            affine: self.affine,
            affine_source: AffineSource::Sform,
            values,
            codes,
            warnings: vec![],
        }
    }

    /// The smallest integer datatype that holds every label.
    pub fn datatype(&self) -> i16 {
        let lo = self.labels.iter().copied().min().unwrap_or(0);
        let hi = self.labels.iter().copied().max().unwrap_or(0);
        if lo >= 0 && hi <= u8::MAX as i64 {
            dtype::UINT8
        } else if lo >= i16::MIN as i64 && hi <= i16::MAX as i64 {
            dtype::INT16
        } else {
            dtype::INT32
        }
    }

    /// Writes a NIfTI-1 file (gzip-compressed when the name ends in `.gz`), sform code 2.
    pub fn write_nifti(&self, path: &Path) -> std::io::Result<()> {
        self.write_nifti_as(path, self.datatype())
    }

    /// Writes a NIfTI-1 file with the given datatype code.
    pub fn write_nifti_as(&self, path: &Path, datatype: i16) -> std::io::Result<()> {
        let header = RawHeader::for_labels(self.shape, datatype, &self.affine);
        let data = encode_labels(&self.labels, datatype).map_err(std::io::Error::other)?;
        let gz = path.extension().is_some_and(|e| e == "gz");
        write_nifti(path, &header, &data, gz)
    }
}

fn in_ellipsoid(w: [f64; 3], c: [f64; 3], r: [f64; 3]) -> bool {
    let q = |a: usize| (w[a] - c[a]) / r[a];
    q(0) * q(0) + q(1) * q(1) + q(2) * q(2) <= 1.0
}

/// An oblique affine: spacing, then a rotation by `angle_rad` about the world z axis, then
/// a translation; `flip_x` mirrors the first voxel axis (as radiological storage does).
pub fn oblique_affine(spacing: [f64; 3], angle_rad: f64, origin: [f64; 3], flip_x: bool) -> Affine {
    let (s, c) = angle_rad.sin_cos();
    let sx = if flip_x { -spacing[0] } else { spacing[0] };
    Affine::from_linear(
        [
            [c * sx, -s * spacing[1], 0.0],
            [s * sx, c * spacing[1], 0.0],
            [0.0, 0.0, spacing[2]],
        ],
        origin,
    )
}

#!/usr/bin/env python3
"""Records reference fixtures for the spatial tests from general-purpose libraries.

- EDT: scipy.ndimage.distance_transform_edt with sampling= on small seeded random volumes.
- Affines and label decoding: NIfTI-1 files written by nibabel, with nibabel's own affine
  (header.get_best_affine()) and the voxel values it reads back.

Run from the repository root:  python3 scripts/spatial-record-fixtures.py
Needs: pip install scipy nibabel numpy. The outputs are committed; CI does not need Python.
"""
import json
import os

import nibabel as nib
import numpy as np
import scipy
from scipy import ndimage

OUT = os.path.join("tests", "fixtures", "spatial")
os.makedirs(OUT, exist_ok=True)
rng = np.random.default_rng(20240607)

versions = {"scipy": scipy.__version__, "nibabel": nib.__version__, "numpy": np.__version__}

# --- EDT -------------------------------------------------------------------------------
cases = []
for shape, sampling, density in [
    ((7, 5, 6), (1.0, 1.0, 1.0), 0.05),
    ((9, 6, 4), (0.7, 1.3, 2.5), 0.04),
    ((5, 8, 7), (3.0, 0.5, 1.2), 0.1),
    ((12, 10, 3), (0.9, 0.9, 4.0), 0.02),
]:
    feat = rng.random(shape) < density
    feat[tuple(s // 2 for s in shape)] = True
    # scipy measures the distance to the nearest ZERO; features are zeros here.
    dist = ndimage.distance_transform_edt(~feat, sampling=sampling)
    cases.append({
        "shape": list(shape),
        "sampling": list(sampling),
        "features": [int(x) for x in feat.flatten(order="F")],
        "distances": [float(x) for x in dist.flatten(order="F")],
    })
with open(os.path.join(OUT, "edt_scipy.json"), "w") as f:
    json.dump({"source": "scipy.ndimage.distance_transform_edt(~features, sampling=...)", "versions": versions,
               "order": "i fastest (Fortran order)", "cases": cases}, f, indent=1)

# --- NIfTI affines and label decoding ---------------------------------------------------
def rot(axis, ang):
    c, s = np.cos(ang), np.sin(ang)
    if axis == "z":
        return np.array([[c, -s, 0], [s, c, 0], [0, 0, 1]])
    if axis == "x":
        return np.array([[1, 0, 0], [0, c, -s], [0, s, c]])
    return np.array([[c, 0, s], [0, 1, 0], [-s, 0, c]])

files = []
shape = (3, 4, 5)

def add(name, dtype, values, affine, use_sform, use_qform, endian="<"):
    data = np.asarray(values, dtype=dtype).reshape(shape, order="F")
    hdr = nib.Nifti1Header(endianness=endian)
    img = nib.Nifti1Image(data, None, header=hdr)
    img.header.set_data_dtype(dtype)
    if use_qform:
        img.header.set_qform(affine, code=1)
    else:
        img.header.set_qform(None, code=0)
    if use_sform:
        img.header.set_sform(affine, code=2)
    else:
        img.header.set_sform(None, code=0)
    img.header["scl_slope"] = 1
    img.header["scl_inter"] = 0
    path = os.path.join(OUT, name)
    nib.save(img, path)
    back = nib.load(path)
    files.append({
        "file": name,
        "affine": back.header.get_best_affine().tolist(),
        "qfac": float(back.header["pixdim"][0]),
        "values": [int(v) for v in np.asarray(back.dataobj).flatten(order="F")],
    })

n = int(np.prod(shape))
lin = np.diag([0.8, 1.1, 2.5]) @ rot("z", 0.3).T
aff = np.eye(4); aff[:3, :3] = rot("z", 0.3) @ np.diag([0.8, 1.1, 2.5]); aff[:3, 3] = [-10.5, 20.25, 3.0]
add("sform_oblique_u8.nii", np.uint8, rng.integers(0, 4, n), aff, True, False)

# A rotation with a reflection: the qform stores it with qfac = -1.
aff2 = np.eye(4); aff2[:3, :3] = rot("x", 0.4) @ rot("z", -0.7) @ np.diag([1.5, 0.9, -2.0]); aff2[:3, 3] = [5.0, -7.0, 12.0]
add("qform_qfac_neg_i16.nii.gz", np.int16, rng.integers(-300, 300, n), aff2, False, True)

aff3 = np.eye(4); aff3[:3, :3] = rot("y", 1.1) @ np.diag([2.0, 2.0, 3.0]); aff3[:3, 3] = [0.0, 1.0, -2.0]
add("qform_i32_be.nii", np.int32, rng.integers(-100000, 100000, n), aff3, False, True, endian=">")

add("sform_u16.nii.gz", np.uint16, rng.integers(0, 60000, n), aff, True, True)
add("sform_i8.nii", np.int8, rng.integers(-100, 100, n), aff, True, False)
add("sform_u32.nii", np.uint32, rng.integers(0, 4000000000, n, dtype=np.uint64), aff, True, False)

with open(os.path.join(OUT, "nifti_nibabel.json"), "w") as f:
    json.dump({"source": "nibabel: header.get_best_affine() and np.asarray(img.dataobj)", "versions": versions,
               "order": "i fastest (Fortran order)", "files": files}, f, indent=1)
print("recorded with", versions)

//! NIfTI-1 label maps: the only file of the crate that imports the `nifti` crate.
//!
//! The header is parsed by `nifti::NiftiHeader::from_reader`; the voxel data are decoded
//! here, straight from the bytes, so that 32-bit labels never pass through `f32` and so that
//! absurd dimensions are refused before anything is allocated.

use super::SpatialError;
use super::affine::{Affine, AffineSource};
use flate2::read::MultiGzDecoder;
use std::collections::HashMap;
use std::fs::File;
use std::io::{BufReader, Read};
use std::path::{Path, PathBuf};

/// Largest number of voxels a label map may hold (2²⁹ ≈ 537 million, 1 GiB of label codes).
pub const MAX_VOXELS: usize = 1 << 29;
/// Largest number of distinct label values in one map.
pub const MAX_DISTINCT_LABELS: usize = u16::MAX as usize;

/// NIfTI-1 datatype codes accepted for labels (nifti1.h `NIFTI_TYPE_*`).
pub mod dtype {
    /// unsigned char
    pub const UINT8: i16 = 2;
    /// signed short
    pub const INT16: i16 = 4;
    /// signed int
    pub const INT32: i16 = 8;
    /// float (accepted only when every value is an integer)
    pub const FLOAT32: i16 = 16;
    /// double (accepted only when every value is an integer)
    pub const FLOAT64: i16 = 64;
    /// signed char
    pub const INT8: i16 = 256;
    /// unsigned short
    pub const UINT16: i16 = 512;
    /// unsigned int
    pub const UINT32: i16 = 768;
}

/// One integer label map on a grid, stored as compact codes into its table of distinct values.
#[derive(Clone, Debug)]
pub struct LabelMap {
    /// The file as given on the command line.
    pub path: PathBuf,
    /// The file name without its folders (the `map` column of the label table).
    pub name: String,
    /// Grid size (i, j, k).
    pub shape: [usize; 3],
    /// Voxel-to-world transform, RAS mm.
    pub affine: Affine,
    /// Which header fields gave `affine`.
    pub affine_source: AffineSource,
    /// Distinct label values present, after the header's scaling; indexed by code.
    pub values: Vec<i64>,
    /// One code per voxel, i fastest then j then k (the NIfTI order).
    pub codes: Vec<u16>,
    /// Warnings met while reading (negative pixdim and the like).
    pub warnings: Vec<String>,
}

impl LabelMap {
    /// Number of voxels.
    pub fn len(&self) -> usize {
        self.codes.len()
    }

    /// True for a map without voxels (never produced by the reader).
    pub fn is_empty(&self) -> bool {
        self.codes.is_empty()
    }

    /// The code of a label value, if that value occurs in the map.
    pub fn code_of(&self, value: i64) -> Option<u16> {
        self.values
            .iter()
            .position(|&v| v == value)
            .map(|c| c as u16)
    }
}

fn bad(path: &Path, msg: impl Into<String>) -> SpatialError {
    SpatialError::Nifti {
        file: path.display().to_string(),
        message: msg.into(),
    }
}

fn bytes_per_voxel(datatype: i16) -> Option<usize> {
    Some(match datatype {
        dtype::UINT8 | dtype::INT8 => 1,
        dtype::INT16 | dtype::UINT16 => 2,
        dtype::INT32 | dtype::UINT32 | dtype::FLOAT32 => 4,
        dtype::FLOAT64 => 8,
        _ => return None,
    })
}

/// Reads a NIfTI-1 label map (`.nii` or `.nii.gz`, gzip recognised by its magic bytes).
pub fn read_label_map(path: &Path) -> Result<LabelMap, SpatialError> {
    let file = File::open(path).map_err(|e| bad(path, format!("cannot open: {e}")))?;
    let file_len = file.metadata().map(|m| m.len()).unwrap_or(0);
    let mut raw = BufReader::new(file);
    let mut magic = [0u8; 2];
    let n = read_full(&mut raw, &mut magic).map_err(|e| bad(path, format!("cannot read: {e}")))?;
    let gz = n == 2 && magic == [0x1f, 0x8b];
    let chained = std::io::Cursor::new(magic[..n].to_vec()).chain(raw);
    let mut input: Box<dyn Read> = if gz {
        Box::new(BufReader::new(MultiGzDecoder::new(chained)))
    } else {
        Box::new(chained)
    };
    let io_msg = |e: std::io::Error| {
        if gz {
            format!("the gzip stream is truncated or corrupt ({e}); re-export the file")
        } else {
            format!("cannot read: {e}")
        }
    };

    let mut hbuf = [0u8; 348];
    let got = read_full(&mut input, &mut hbuf).map_err(|e| bad(path, io_msg(e)))?;
    if got >= 4 {
        let le = i32::from_le_bytes([hbuf[0], hbuf[1], hbuf[2], hbuf[3]]);
        let be = i32::from_be_bytes([hbuf[0], hbuf[1], hbuf[2], hbuf[3]]);
        if le == 540 || be == 540 {
            return Err(bad(
                path,
                "this is a NIfTI-2 file; only NIfTI-1 is supported (convert it to NIfTI-1, e.g. resave with 32-bit dimensions)",
            ));
        }
        if le != 348 && be != 348 {
            return Err(bad(path, "not a NIfTI-1 file (sizeof_hdr is not 348)"));
        }
    }
    if got < 348 {
        return Err(bad(
            path,
            format!("only {got} bytes, too short for a NIfTI-1 header (348 bytes)"),
        ));
    }
    let h = nifti::NiftiHeader::from_reader(&hbuf[..])
        .map_err(|e| bad(path, format!("unreadable NIfTI-1 header: {e}")))?;
    if &h.magic == b"ni1\0" {
        return Err(bad(
            path,
            "a header-only .hdr file (magic ni1); give a single-file .nii or .nii.gz",
        ));
    }
    let little = matches!(h.endianness, nifti::Endianness::Little);

    // Dimensions: dim is signed in nifti1.h; the crate reads it as u16.
    let dim: Vec<i64> = h.dim.iter().map(|&d| d as i16 as i64).collect();
    let nd = dim[0];
    if !(1..=7).contains(&nd) {
        return Err(bad(
            path,
            format!("dim[0] = {nd} is not a number of dimensions between 1 and 7"),
        ));
    }
    let nd = nd as usize;
    for (a, &d) in dim.iter().enumerate().take(nd + 1).skip(1) {
        if d < 1 {
            return Err(bad(
                path,
                format!("dim[{a}] = {d}; every dimension must be at least 1"),
            ));
        }
    }
    if nd > 3 && dim[4..=nd].iter().any(|&d| d > 1) {
        return Err(bad(
            path,
            format!(
                "{nd}-dimensional data (dim = {:?}); give one 3D label map per file",
                &dim[1..=nd]
            ),
        ));
    }
    let shape = [
        dim[1] as usize,
        if nd >= 2 { dim[2] as usize } else { 1 },
        if nd >= 3 { dim[3] as usize } else { 1 },
    ];
    let total = shape[0]
        .checked_mul(shape[1])
        .and_then(|v| v.checked_mul(shape[2]))
        .unwrap_or(usize::MAX);
    if total > MAX_VOXELS {
        return Err(bad(
            path,
            format!(
                "absurd dimensions {shape:?} ({total} voxels, limit {MAX_VOXELS}); check the header"
            ),
        ));
    }

    let bpv = bytes_per_voxel(h.datatype).ok_or_else(|| {
        bad(
            path,
            format!(
                "datatype {} is not an integer label type (use uint8, int8, uint16, int16, uint32 or int32)",
                h.datatype
            ),
        )
    })?;
    let is_float = h.datatype == dtype::FLOAT32 || h.datatype == dtype::FLOAT64;

    let vo = h.vox_offset;
    if !vo.is_finite() || vo < 348.0 || vo.fract() != 0.0 || vo > 1.0e9 {
        return Err(bad(
            path,
            format!("vox_offset {vo} is not a valid data offset for a .nii file"),
        ));
    }
    let vo = vo as u64;
    let need = (total as u64).saturating_mul(bpv as u64);
    if !gz && file_len != vo + need {
        return Err(bad(
            path,
            format!(
                "the header's dimensions {shape:?} × {bpv} bytes need {need} bytes of data after offset {vo}, but the file holds {}",
                file_len.saturating_sub(vo)
            ),
        ));
    }
    // Skip the extensions without allocating for them.
    let want = vo - 348;
    let got = std::io::copy(&mut (&mut input).take(want), &mut std::io::sink())
        .map_err(|e| bad(path, io_msg(e)))?;
    if got < want {
        return Err(bad(
            path,
            "the file ends inside the header extensions (before vox_offset)",
        ));
    }

    let affine_and_warn = header_affine(&h, path)?;

    // Decode the voxels in chunks, mapping each distinct raw value to a code.
    let mut codes: Vec<u16> = Vec::new();
    let mut raw_values: Vec<f64> = Vec::new();
    let mut index: HashMap<u64, u16> = HashMap::new();
    let mut last: Option<(u64, u16)> = None;
    let chunk_vox = (1 << 20) / bpv;
    let mut buf = vec![0u8; chunk_vox * bpv];
    let mut done = 0usize;
    while done < total {
        let nvox = chunk_vox.min(total - done);
        let want = &mut buf[..nvox * bpv];
        let got = read_full(&mut input, want).map_err(|e| bad(path, io_msg(e)))?;
        if got < want.len() {
            return Err(bad(
                path,
                format!(
                    "the data end after {} of {total} voxels; the header's dimensions {shape:?} do not match the data (or the file is truncated)",
                    done + got / bpv
                ),
            ));
        }
        codes.reserve(nvox);
        for v in 0..nvox {
            let b = &want[v * bpv..(v + 1) * bpv];
            let (key, val) = decode(b, h.datatype, little);
            if let Some((k, c)) = last
                && k == key
            {
                codes.push(c);
                continue;
            }
            let c = match index.get(&key) {
                Some(&c) => c,
                None => {
                    if is_float {
                        let i = done + v;
                        let at = [
                            i % shape[0],
                            (i / shape[0]) % shape[1],
                            i / (shape[0] * shape[1]),
                        ];
                        if val.is_nan() {
                            return Err(bad(
                                path,
                                format!("NaN at voxel {at:?}; labels must be integers"),
                            ));
                        }
                        if !val.is_finite() || val.fract() != 0.0 || val.abs() > 9.0e15 {
                            return Err(bad(
                                path,
                                format!(
                                    "float-valued label {val} at voxel {at:?}; labels must be integers"
                                ),
                            ));
                        }
                    }
                    if raw_values.len() >= MAX_DISTINCT_LABELS {
                        return Err(bad(
                            path,
                            format!(
                                "more than {MAX_DISTINCT_LABELS} distinct label values; is this really a label map?"
                            ),
                        ));
                    }
                    let c = raw_values.len() as u16;
                    raw_values.push(val);
                    index.insert(key, c);
                    c
                }
            };
            last = Some((key, c));
            codes.push(c);
        }
        done += nvox;
    }
    if gz {
        let mut extra = [0u8; 1];
        let got = read_full(&mut input, &mut extra).map_err(|e| bad(path, io_msg(e)))?;
        if got > 0 {
            return Err(bad(
                path,
                format!(
                    "more data than the header's dimensions {shape:?} describe; the header does not match the data"
                ),
            ));
        }
    }

    // Scaling (nifti1.h: value = scl_slope · stored + scl_inter, when scl_slope ≠ 0).
    let slope = h.scl_slope as f64;
    let inter = h.scl_inter as f64;
    let scaled = slope != 0.0 && slope.is_finite() && !(slope == 1.0 && inter == 0.0);
    let mut values = Vec::with_capacity(raw_values.len());
    for &r in &raw_values {
        let v = if scaled { slope * r + inter } else { r };
        if !v.is_finite() || (v - v.round()).abs() > 1e-6 || v.abs() > 9.0e15 {
            return Err(bad(
                path,
                format!(
                    "stored label {r} becomes {v} after scl_slope = {slope}, scl_inter = {inter}; labels must stay integers (set scl_slope to 0 or 1)"
                ),
            ));
        }
        values.push(v.round() as i64);
    }

    let name = path
        .file_name()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default();
    let (affine, affine_source, warnings) = affine_and_warn;
    Ok(LabelMap {
        path: path.to_path_buf(),
        name,
        shape,
        affine,
        affine_source,
        values,
        codes,
        warnings,
    })
}

/// Reads until `buf` is full or the input ends; returns the bytes read.
fn read_full(input: &mut dyn Read, buf: &mut [u8]) -> std::io::Result<usize> {
    let mut n = 0;
    while n < buf.len() {
        match input.read(&mut buf[n..]) {
            Ok(0) => break,
            Ok(k) => n += k,
            Err(e) if e.kind() == std::io::ErrorKind::Interrupted => {}
            Err(e) => return Err(e),
        }
    }
    Ok(n)
}

/// Decodes one stored value: a hash key (exact bits) and its numeric value.
fn decode(b: &[u8], datatype: i16, little: bool) -> (u64, f64) {
    macro_rules! rd {
        ($t:ty, $n:expr) => {{
            let mut a = [0u8; $n];
            a.copy_from_slice(b);
            if little {
                <$t>::from_le_bytes(a)
            } else {
                <$t>::from_be_bytes(a)
            }
        }};
    }
    match datatype {
        dtype::UINT8 => (b[0] as u64, b[0] as f64),
        dtype::INT8 => (b[0] as u64, b[0] as i8 as f64),
        dtype::INT16 => {
            let v = rd!(i16, 2);
            (v as u16 as u64, v as f64)
        }
        dtype::UINT16 => {
            let v = rd!(u16, 2);
            (v as u64, v as f64)
        }
        dtype::INT32 => {
            let v = rd!(i32, 4);
            (v as u32 as u64, v as f64)
        }
        dtype::UINT32 => {
            let v = rd!(u32, 4);
            (v as u64, v as f64)
        }
        dtype::FLOAT32 => {
            let v = rd!(f32, 4);
            (v.to_bits() as u64, v as f64)
        }
        _ => {
            let v = rd!(f64, 8);
            (v.to_bits(), v)
        }
    }
}

/// Voxel-to-world per nifti1.h: sform when sform_code > 0, else qform when qform_code > 0,
/// else pixdim alone. The qform is computed here from the header fields rather than by the
/// crate, whose `qform_affine` panics on negative pixdim and on qfac = 0.
fn header_affine(
    h: &nifti::NiftiHeader,
    path: &Path,
) -> Result<(Affine, AffineSource, Vec<String>), SpatialError> {
    let mut warnings = Vec::new();
    let f = |v: f32| v as f64;
    let (affine, source) = if h.sform_code > 0 {
        let r = |row: [f32; 4]| [f(row[0]), f(row[1]), f(row[2]), f(row[3])];
        (
            Affine::from_sform(r(h.srow_x), r(h.srow_y), r(h.srow_z)),
            AffineSource::Sform,
        )
    } else {
        let mut sp = [f(h.pixdim[1]), f(h.pixdim[2]), f(h.pixdim[3])];
        for (a, s) in sp.iter_mut().enumerate() {
            if !s.is_finite() || *s == 0.0 {
                return Err(bad(
                    path,
                    format!(
                        "pixdim[{}] = {s}; voxel sizes must be finite and non-zero",
                        a + 1
                    ),
                ));
            }
            if *s < 0.0 {
                warnings.push(format!(
                    "{}: pixdim[{}] = {s} is negative; its absolute value is used",
                    path.display(),
                    a + 1
                ));
                *s = s.abs();
            }
        }
        if h.qform_code > 0 {
            let qfac = f(h.pixdim[0]);
            let aff = Affine::from_qform(
                [f(h.quatern_b), f(h.quatern_c), f(h.quatern_d)],
                [f(h.quatern_x), f(h.quatern_y), f(h.quatern_z)],
                sp,
                qfac,
            );
            (aff, AffineSource::Qform)
        } else {
            (Affine::diagonal(sp, [0.0; 3]), AffineSource::Pixdim)
        }
    };
    if !affine.is_usable() {
        return Err(bad(
            path,
            format!(
                "the {source:?} voxel-to-world transform is singular or not finite; fix the header's spatial fields"
            ),
        ));
    }
    Ok((affine, source, warnings))
}

/// The fields of a NIfTI-1 header that matter for label maps, for writing files.
#[derive(Clone, Debug, PartialEq)]
pub struct RawHeader {
    /// `dim[0..8]` (dim[0] = number of dimensions).
    pub dim: [i16; 8],
    /// `NIFTI_TYPE_*` code (see [`dtype`]).
    pub datatype: i16,
    /// Bits per voxel.
    pub bitpix: i16,
    /// `pixdim[0..8]` (pixdim[0] = qfac).
    pub pixdim: [f32; 8],
    /// Byte offset of the voxel data.
    pub vox_offset: f32,
    /// Data scaling slope (0 = none).
    pub scl_slope: f32,
    /// Data scaling intercept.
    pub scl_inter: f32,
    /// `NIFTI_XFORM_*` code of the qform.
    pub qform_code: i16,
    /// `NIFTI_XFORM_*` code of the sform.
    pub sform_code: i16,
    /// Quaternion b, c, d.
    pub quatern: [f32; 3],
    /// qoffset x, y, z.
    pub qoffset: [f32; 3],
    /// srow_x, srow_y, srow_z.
    pub srow: [[f32; 4]; 3],
    /// Magic (`n+1\0` for single files).
    pub magic: [u8; 4],
    /// `sizeof_hdr` (348 for NIfTI-1).
    pub sizeof_hdr: i32,
}

impl RawHeader {
    /// A 3D header for a label map with the given grid, datatype and sform (code 2, aligned).
    pub fn for_labels(shape: [usize; 3], datatype: i16, affine: &Affine) -> Self {
        let bitpix = (bytes_per_voxel(datatype).unwrap_or(1) * 8) as i16;
        let sp = affine.spacing();
        let m = affine.0;
        let row = |r: usize| {
            [
                m[r][0] as f32,
                m[r][1] as f32,
                m[r][2] as f32,
                m[r][3] as f32,
            ]
        };
        RawHeader {
            dim: [
                3,
                shape[0] as i16,
                shape[1] as i16,
                shape[2] as i16,
                1,
                1,
                1,
                1,
            ],
            datatype,
            bitpix,
            pixdim: [
                1.0,
                sp[0] as f32,
                sp[1] as f32,
                sp[2] as f32,
                1.0,
                1.0,
                1.0,
                1.0,
            ],
            vox_offset: 352.0,
            scl_slope: 1.0,
            scl_inter: 0.0,
            qform_code: 0,
            sform_code: 2,
            quatern: [0.0; 3],
            qoffset: [0.0; 3],
            srow: [row(0), row(1), row(2)],
            magic: *b"n+1\0",
            sizeof_hdr: 348,
        }
    }

    /// The 348 header bytes, little-endian, followed by the 4-byte empty extension flag.
    pub fn to_bytes(&self) -> Vec<u8> {
        let mut b = vec![0u8; 352];
        let put = |b: &mut Vec<u8>, at: usize, bytes: &[u8]| {
            b[at..at + bytes.len()].copy_from_slice(bytes)
        };
        put(&mut b, 0, &self.sizeof_hdr.to_le_bytes());
        b[38] = b'r';
        for (i, d) in self.dim.iter().enumerate() {
            put(&mut b, 40 + 2 * i, &d.to_le_bytes());
        }
        put(&mut b, 70, &self.datatype.to_le_bytes());
        put(&mut b, 72, &self.bitpix.to_le_bytes());
        for (i, p) in self.pixdim.iter().enumerate() {
            put(&mut b, 76 + 4 * i, &p.to_le_bytes());
        }
        put(&mut b, 108, &self.vox_offset.to_le_bytes());
        put(&mut b, 112, &self.scl_slope.to_le_bytes());
        put(&mut b, 116, &self.scl_inter.to_le_bytes());
        b[123] = 2; // xyzt_units: millimetres
        put(&mut b, 252, &self.qform_code.to_le_bytes());
        put(&mut b, 254, &self.sform_code.to_le_bytes());
        for i in 0..3 {
            put(&mut b, 256 + 4 * i, &self.quatern[i].to_le_bytes());
            put(&mut b, 268 + 4 * i, &self.qoffset[i].to_le_bytes());
        }
        for r in 0..3 {
            for c in 0..4 {
                put(&mut b, 280 + 16 * r + 4 * c, &self.srow[r][c].to_le_bytes());
            }
        }
        put(&mut b, 344, &self.magic);
        b
    }
}

/// Encodes label values in the given datatype, little-endian; values that do not fit are an error.
pub fn encode_labels(values: &[i64], datatype: i16) -> Result<Vec<u8>, String> {
    let bpv =
        bytes_per_voxel(datatype).ok_or_else(|| format!("unsupported datatype {datatype}"))?;
    let mut out = Vec::with_capacity(values.len() * bpv);
    for &v in values {
        let fits = |lo: i64, hi: i64| {
            if v < lo || v > hi {
                Err(format!("label {v} does not fit datatype {datatype}"))
            } else {
                Ok(())
            }
        };
        match datatype {
            dtype::UINT8 => {
                fits(0, u8::MAX as i64)?;
                out.push(v as u8)
            }
            dtype::INT8 => {
                fits(i8::MIN as i64, i8::MAX as i64)?;
                out.push(v as i8 as u8)
            }
            dtype::INT16 => {
                fits(i16::MIN as i64, i16::MAX as i64)?;
                out.extend_from_slice(&(v as i16).to_le_bytes())
            }
            dtype::UINT16 => {
                fits(0, u16::MAX as i64)?;
                out.extend_from_slice(&(v as u16).to_le_bytes())
            }
            dtype::INT32 => {
                fits(i32::MIN as i64, i32::MAX as i64)?;
                out.extend_from_slice(&(v as i32).to_le_bytes())
            }
            dtype::UINT32 => {
                fits(0, u32::MAX as i64)?;
                out.extend_from_slice(&(v as u32).to_le_bytes())
            }
            dtype::FLOAT32 => out.extend_from_slice(&(v as f32).to_le_bytes()),
            _ => out.extend_from_slice(&(v as f64).to_le_bytes()),
        }
    }
    Ok(out)
}

/// Writes header bytes and data atomically; gzip-compressed when `gzip` is true.
pub fn write_nifti(
    path: &Path,
    header: &RawHeader,
    data: &[u8],
    gzip: bool,
) -> std::io::Result<()> {
    let mut bytes = header.to_bytes();
    bytes.truncate(header.vox_offset.max(348.0) as usize);
    bytes.resize(header.vox_offset.max(348.0) as usize, 0);
    bytes.extend_from_slice(data);
    let bytes = if gzip {
        use std::io::Write;
        let mut enc = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::fast());
        enc.write_all(&bytes)?;
        enc.finish()?
    } else {
        bytes
    };
    super::atomic_write(path, &bytes)
}

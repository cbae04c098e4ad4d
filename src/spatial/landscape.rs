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
use super::structuring::{acos_fast, structuring_element_fast};
use std::f64::consts::FRAC_2_PI;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

/// A vector of `n` copies of `value`, its memory backed by 2 MiB pages where the system
/// offers them on request (Linux transparent huge pages in `madvise` mode): a landscape's
/// state runs to tens of megabytes, and faulting it in 4 KiB pages costs more than a tenth
/// of its propagation time.
fn big_vec<T: Copy>(n: usize, value: T) -> Vec<T> {
    let mut v: Vec<T> = Vec::with_capacity(n);
    #[cfg(target_os = "linux")]
    {
        const HUGE: usize = 1 << 21;
        let bytes = n * std::mem::size_of::<T>();
        if bytes >= 4 * HUGE {
            let start = (v.as_ptr() as usize).next_multiple_of(HUGE);
            let end = (v.as_ptr() as usize + bytes) & !(HUGE - 1);
            if end > start {
                // SAFETY: the range lies inside the vector's allocation, which is not yet
                // touched; the advice changes only how its pages are backed, not its contents.
                unsafe {
                    libc::madvise(start as *mut libc::c_void, end - start, libc::MADV_HUGEPAGE);
                }
            }
        }
    }
    v.resize(n, value);
    v
}

/// Marker for "no origin yet" in the propagation state.
const NONE: i16 = i16::MIN;

/// A landscape computed by two-pass propagation over a box (Bloch 1999, §4: each voxel keeps
/// the reference point that gives it the best degree, and takes over a neighbour's point
/// when that gives a better angle). State: the vector from the origin to the voxel, in voxel
/// units, as three `i16` arrays (6 bytes per cell, plus the padding of the [`CellLayout`]).
///
/// Each raster pass visits the 13 neighbours that precede a voxel (the forward pass) or
/// follow it (the backward pass). A slice is swept wavefront by wavefront (see
/// [`CellLayout`]): the cells of a wavefront are independent, so each wavefront is one
/// branch-free loop the compiler vectorises, with all 13 neighbours applied while its cells
/// stay in vector registers. Cells are named by their slot in the layout
/// ([`FastLandscape::cell_of`]).
#[derive(PartialEq)]
pub struct FastLandscape {
    /// Global index of the box's first voxel.
    pub lo: [i64; 3],
    /// Box size (fine voxels).
    pub dims: [usize; 3],
    /// Coarsening factor: the propagation runs on cells of factor³ voxels (1 = full resolution).
    pub factor: usize,
    cdims: [usize; 3],
    layout: CellLayout,
    fine_linear: [[f64; 3]; 3],
    ox: Vec<i16>,
    oy: Vec<i16>,
    oz: Vec<i16>,
    linear: [[f32; 3]; 3],
    direction: [f32; 3],
}

/// With two threads allowed ([`FastLandscape::compute_threads`]), boxes with at least this
/// many propagation cells run each raster pass as a two-thread slice pipeline; smaller
/// ones use one.
pub const PIPELINE_MIN_CELLS: usize = 1 << 22;

/// Padding rows before the first and after the last wavefront of a [`CellLayout`].
const PAD_T: usize = 3;

/// A wavefront's cells are processed in whole groups of this many lanes (the widest vector
/// of f32 in use), so that no loop has a scalar remainder.
const LANES: usize = 16;

/// The wavefront layout of one slice of `nx × ny` cells, in which the propagation runs.
///
/// In a forward raster pass a cell (i, j) needs the final states of (i − 1, j) and of
/// (i + di, j − 1), di = −1, 0, 1; all of them lie on earlier lines t = i + 2j. So the
/// cells of one line t (a wavefront) are independent of each other, and a pass can sweep the
/// wavefronts in order, each as one branch-free loop over its cells, instead of a row sweep
/// whose cells wait for each other. (The backward pass visits the same lines in reverse.)
/// Row t of the layout holds the cells of wavefront t by increasing j, with one slot of
/// padding at each end and three all-padding rows before t = 0 and after the last line, so
/// that every neighbour of a cell, inside the slice or not, is a slot: the 26 neighbours of
/// the cells j = a..=b of wavefront t are the contiguous slots j + dj = a + dj..=b + dj of
/// row t + di + 2dj. Each row has room for its cells rounded up to whole groups of
/// [`LANES`], read from any of its neighbours' first cells on: the loops run over whole
/// groups, and the lanes past a wavefront's last cell never take an origin (their key is
/// set to +∞), so they keep "no origin" and write back what they read, in their own row.
/// Padding slots hold "no origin" and are never changed.
#[derive(Clone, Debug, PartialEq)]
pub struct CellLayout {
    nx: usize,
    ny: usize,
    /// Number of wavefronts, nx + 2(ny − 1).
    nt: usize,
    /// The first j and the number of cells of each wavefront (none on the odd lines of a
    /// one-cell-wide slice).
    lanes: Vec<(usize, usize)>,
    /// The first slot of row t + PAD_T.
    off: Vec<usize>,
    /// The j of row t + PAD_T's first slot.
    first_j: Vec<i64>,
    /// Slots per slice.
    size: usize,
}

impl CellLayout {
    /// The layout of slices of `nx × ny` cells (both at least 1).
    pub fn new(nx: usize, ny: usize) -> Self {
        let nt = nx + 2 * (ny - 1);
        let mut lanes = Vec::with_capacity(nt);
        let mut off = Vec::with_capacity(nt + 2 * PAD_T);
        let mut first_j = Vec::with_capacity(nt + 2 * PAD_T);
        let mut size = 0;
        for r in 0..nt + 2 * PAD_T {
            let t = r as i64 - PAD_T as i64;
            let (a, cap) = if t < 0 || t >= nt as i64 {
                // Read at j = −1..=ny, up to LANES slots from there.
                (-1, ny + 2 + 2 * LANES)
            } else {
                // i = t − 2j must lie in 0..nx and j in 0..ny.
                let lo = ((t - nx as i64 + 1).max(0) + 1) / 2;
                let hi = (t / 2).min(ny as i64 - 1);
                let n = (hi - lo + 1).max(0) as usize;
                lanes.push((lo as usize, n));
                // The padded lane count of a wavefront differs from a neighbouring one's by
                // at most 2 cells and starts at most 4 slots into its row (see `lanes`).
                (lo - 1, (n + 2).next_multiple_of(LANES) + 8)
            };
            off.push(size);
            first_j.push(a);
            size += cap;
        }
        CellLayout {
            nx,
            ny,
            nt,
            lanes,
            off,
            first_j,
            size,
        }
    }

    /// The slot of cell (i, j, k), k counting slices.
    #[inline(always)]
    pub fn cell(&self, i: usize, j: usize, k: usize) -> usize {
        debug_assert!(i < self.nx && j < self.ny);
        self.size * k + self.slot((i + 2 * j) as i64, j as i64)
    }

    /// The slot of cell j of wavefront t (t may lie up to PAD_T outside 0..nt, j one
    /// outside the wavefront's cells).
    #[inline(always)]
    fn slot(&self, t: i64, j: i64) -> usize {
        let r = (t + PAD_T as i64) as usize;
        self.off[r] + (j - self.first_j[r]) as usize
    }
}

/// The propagation state of one slice as f32 vectors (NaN = no origin yet).
struct SliceBuf {
    x: Vec<f32>,
    y: Vec<f32>,
    z: Vec<f32>,
}

impl SliceBuf {
    fn new(n: usize) -> Self {
        SliceBuf {
            x: vec![f32::NAN; n],
            y: vec![0.0; n],
            z: vec![0.0; n],
        }
    }

    fn ptrs(&mut self) -> SlicePtrs {
        SlicePtrs {
            x: self.x.as_mut_ptr(),
            y: self.y.as_mut_ptr(),
            z: self.z.as_mut_ptr(),
        }
    }
}

/// Raw access to a [`SliceBuf`], so that one thread can write a wavefront of a slice while
/// the other reads wavefronts of it that are finished (never the same one).
#[derive(Clone, Copy)]
struct SlicePtrs {
    x: *mut f32,
    y: *mut f32,
    z: *mut f32,
}

type Row<'a> = (&'a [f32], &'a [f32], &'a [f32]);
type RowMut<'a> = (&'a mut [f32], &'a mut [f32], &'a mut [f32]);

impl SlicePtrs {
    /// SAFETY: `start + n` within the buffer, and no mutable view of these entries alive.
    #[inline(always)]
    unsafe fn row<'a>(self, start: usize, n: usize) -> Row<'a> {
        unsafe {
            (
                std::slice::from_raw_parts(self.x.add(start), n),
                std::slice::from_raw_parts(self.y.add(start), n),
                std::slice::from_raw_parts(self.z.add(start), n),
            )
        }
    }

    /// SAFETY: `start + n` within the buffer, and no other view of these entries alive.
    #[inline(always)]
    unsafe fn row_mut<'a>(self, start: usize, n: usize) -> RowMut<'a> {
        unsafe {
            (
                std::slice::from_raw_parts_mut(self.x.add(start), n),
                std::slice::from_raw_parts_mut(self.y.add(start), n),
                std::slice::from_raw_parts_mut(self.z.add(start), n),
            )
        }
    }
}

/// Loads a slice of i16 origins into f32 state.
#[inline(always)]
fn load_plane(dst: RowMut<'_>, ox: &[i16], oy: &[i16], oz: &[i16]) {
    let n = ox.len();
    let (x, y, z) = (&mut dst.0[..n], &mut dst.1[..n], &mut dst.2[..n]);
    let (oy, oz) = (&oy[..n], &oz[..n]);
    for i in 0..n {
        x[i] = if ox[i] == NONE {
            f32::NAN
        } else {
            ox[i] as f32
        };
        y[i] = oy[i] as f32;
        z[i] = oz[i] as f32;
    }
}

/// Stores a slice of f32 state as i16 origins.
#[inline(always)]
fn store_plane(src: Row<'_>, ox: &mut [i16], oy: &mut [i16], oz: &mut [i16]) {
    let n = ox.len();
    let (x, y, z) = (&src.0[..n], &src.1[..n], &src.2[..n]);
    let (oy, oz) = (&mut oy[..n], &mut oz[..n]);
    for i in 0..n {
        // The values are whole numbers inside the i16 range (the box is smaller than 32767
        // cells along each axis) and NaN is mapped to NONE first, so the unchecked
        // conversion is exact; it avoids the saturating cast's fix-ups.
        let xv = if x[i].is_nan() { NONE as f32 } else { x[i] };
        // SAFETY: xv, y[i], z[i] are finite and within i32 range (see above).
        unsafe {
            ox[i] = xv.to_int_unchecked::<i32>() as i16;
            oy[i] = y[i].to_int_unchecked::<i32>() as i16;
            oz[i] = z[i].to_int_unchecked::<i32>() as i16;
        }
    }
}

/// The numerator c·|c| and denominator |w|² of the angle key of index vector (a, b, c).
/// `AX` < 3: the direction is the world axis `AX` (d has one non-zero entry, ±1), so the
/// dot product is that one term; the other two terms of the general sum are ±0 and add
/// nothing, so the value is bit for bit the general one.
#[inline(always)]
fn key_parts<const DIAG: bool, const AX: usize>(
    l: &[[f32; 3]; 3],
    d: &[f32; 3],
    a: f32,
    b: f32,
    c: f32,
) -> (f32, f32) {
    // DIAG: the voxel axes follow the world axes (the common case), 3 products instead of 9.
    let (w0, w1, w2) = if DIAG {
        (l[0][0] * a, l[1][1] * b, l[2][2] * c)
    } else {
        (
            l[0][0] * a + l[0][1] * b + l[0][2] * c,
            l[1][0] * a + l[1][1] * b + l[1][2] * c,
            l[2][0] * a + l[2][1] * b + l[2][2] * c,
        )
    };
    let cc = match AX {
        0 => w0 * d[0],
        1 => w1 * d[1],
        2 => w2 * d[2],
        _ => w0 * d[0] + w1 * d[1] + w2 * d[2],
    };
    (cc * cc.abs(), w0 * w0 + w1 * w1 + w2 * w2)
}

/// Number of neighbours offered to each cell in one pass: 9 in the previous slice, 3 in
/// the previous row and 1 in the same row (Bloch 1999, §4: the half of the 26-neighbourhood
/// that precedes a cell in the raster order).
const NEIGHBOURS: usize = 13;

/// Offers each cell of the wavefront `dst` (n cells) its 13 neighbours in turn: neighbour q
/// of the cell at lane t is lane t of `srcs[q]`, and `es[q]` = cell − neighbour in cells.
/// A cell takes a neighbour's origin when the angle key cos β·|cos β| of the vector from
/// that origin is larger; the key is kept as a fraction num/den and compared by
/// cross-multiplication (no division, no branch). A neighbour without an origin (NaN) is
/// never taken: its key is NaN and every comparison with NaN is false. The cells are
/// processed in whole groups of [`LANES`], each group held in vector registers through all
/// 13 neighbours; the lanes past the last cell get the key +∞, so nothing replaces their
/// "no origin" and they write back what they read.
#[inline(always)]
fn relax_wavefront<const DIAG: bool, const AX: usize>(
    l: &[[f32; 3]; 3],
    d: &[f32; 3],
    srcs: &[Row<'_>; NEIGHBOURS],
    es: &[[f32; 3]; NEIGHBOURS],
    dst: &mut RowMut<'_>,
    n: usize,
) {
    for g in 0..n.div_ceil(LANES) {
        let r = g * LANES..(g + 1) * LANES;
        let rx: &mut [f32; LANES] = (&mut dst.0[r.clone()]).try_into().unwrap();
        let ry: &mut [f32; LANES] = (&mut dst.1[r.clone()]).try_into().unwrap();
        let rz: &mut [f32; LANES] = (&mut dst.2[r.clone()]).try_into().unwrap();
        let (mut x, mut y, mut z) = (*rx, *ry, *rz);
        // Keys of the current state: −2 for no origin (any origin is better), 1/0 = +∞ at
        // an origin itself (nothing is better).
        let mut num = [0.0f32; LANES];
        let mut den = [0.0f32; LANES];
        for t in 0..LANES {
            let (kn, n2) = key_parts::<DIAG, AX>(l, d, x[t], y[t], z[t]);
            let none = x[t].is_nan();
            let origin = n2 == 0.0;
            let past = g * LANES + t >= n;
            num[t] = if past {
                f32::INFINITY
            } else if none {
                -2.0
            } else if origin {
                1.0
            } else {
                kn
            };
            den[t] = if past || none {
                1.0
            } else if origin {
                0.0
            } else {
                n2
            };
        }
        for (src, e) in srcs.iter().zip(es) {
            let sx: [f32; LANES] = src.0[r.clone()].try_into().unwrap();
            let sy: [f32; LANES] = src.1[r.clone()].try_into().unwrap();
            let sz: [f32; LANES] = src.2[r.clone()].try_into().unwrap();
            for t in 0..LANES {
                let (ca, cb, cc) = (sx[t] + e[0], sy[t] + e[1], sz[t] + e[2]);
                let (kn, n2) = key_parts::<DIAG, AX>(l, d, ca, cb, cc);
                let better = kn * den[t] > num[t] * n2;
                num[t] = if better { kn } else { num[t] };
                den[t] = if better { n2 } else { den[t] };
                x[t] = if better { ca } else { x[t] };
                y[t] = if better { cb } else { y[t] };
                z[t] = if better { cc } else { z[t] };
            }
        }
        (*rx, *ry, *rz) = (x, y, z);
    }
}

/// One raster pass over the whole box, shared by its worker threads: slice `ks[t]` is
/// swept by worker t mod `step`, into buffer t mod `bufs.len()`, reading the previous
/// slice's buffer. With two workers, wavefront s of a slice waits until the previous slice
/// has finished its wavefronts up to s + 3 (`progress`), the last it reads.
struct PassJob<'a> {
    ox: *mut i16,
    oy: *mut i16,
    oz: *mut i16,
    skew: &'a CellLayout,
    linear: [[f32; 3]; 3],
    direction: [f32; 3],
    forward: bool,
    ks: Vec<usize>,
    bufs: Vec<SlicePtrs>,
    /// An all-NaN slice: the "previous slice" of a pass's first one.
    none: SlicePtrs,
    progress: Vec<Progress>,
    abort: AtomicBool,
}

/// Wavefronts finished of one slice position, alone on its cache line: the two workers
/// write neighbouring positions' counters at the same time.
#[repr(align(64))]
struct Progress(AtomicUsize);

// SAFETY: the workers touch disjoint slices of the origin arrays and disjoint wavefronts of
// the slice buffers, ordered by the release/acquire `progress` counters (see `run_slices`).
unsafe impl Sync for PassJob<'_> {}

/// Sets the abort flag when a worker unwinds, so that the other stops waiting for it.
struct AbortOnPanic<'a>(&'a AtomicBool);

impl Drop for AbortOnPanic<'_> {
    fn drop(&mut self) {
        if std::thread::panicking() {
            self.0.store(true, Ordering::Relaxed);
        }
    }
}

impl PassJob<'_> {
    /// Runs the slices t = start, start + step, ...
    fn run(&self, start: usize, step: usize) {
        let _guard = AbortOnPanic(&self.abort);
        #[cfg(target_arch = "x86_64")]
        {
            if std::is_x86_feature_detected!("avx512f")
                && std::is_x86_feature_detected!("avx512vl")
                && std::is_x86_feature_detected!("avx512bw")
                && std::is_x86_feature_detected!("avx512dq")
                && std::is_x86_feature_detected!("fma")
            {
                // SAFETY: the CPU supports the features the function is compiled for.
                unsafe { self.run_avx512(start, step) };
                return;
            }
            if std::is_x86_feature_detected!("avx2") && std::is_x86_feature_detected!("fma") {
                // SAFETY: the CPU supports the features the function is compiled for.
                unsafe { self.run_avx2(start, step) };
                return;
            }
        }
        self.run_dispatch(start, step);
    }

    /// Chooses the diagonal-affine and axis-direction specialisations.
    #[inline(always)]
    fn run_dispatch(&self, start: usize, step: usize) {
        let l = self.linear;
        let diag = l[0][1] == 0.0
            && l[0][2] == 0.0
            && l[1][0] == 0.0
            && l[1][2] == 0.0
            && l[2][0] == 0.0
            && l[2][1] == 0.0;
        let d = self.direction;
        let axis = (0..3).find(|&a| (0..3).all(|b| b == a || d[b] == 0.0));
        match (diag, axis) {
            (true, Some(0)) => self.run_slices::<true, 0>(start, step),
            (true, Some(1)) => self.run_slices::<true, 1>(start, step),
            (true, Some(2)) => self.run_slices::<true, 2>(start, step),
            (true, _) => self.run_slices::<true, 3>(start, step),
            (false, _) => self.run_slices::<false, 3>(start, step),
        }
    }

    /// The same pass compiled for AVX2 and FMA (8 lanes of f32).
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx2,fma")]
    unsafe fn run_avx2(&self, start: usize, step: usize) {
        self.run_dispatch(start, step);
    }

    /// The same pass compiled for AVX-512 (16 lanes of f32). Rust never fuses a product and
    /// a sum on its own, so every lane computes the same values as the scalar code.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx512f,avx512vl,avx512bw,avx512dq,avx2,fma")]
    unsafe fn run_avx512(&self, start: usize, step: usize) {
        self.run_dispatch(start, step);
    }

    /// Waits until slice position `t` has finished `need` wavefronts; returns how many it
    /// has finished (at least `need`), so that the caller need not look again before then.
    #[inline(always)]
    fn wait_rows(&self, t: usize, need: usize) -> usize {
        let mut spins = 0u32;
        loop {
            let done = self.progress[t].0.load(Ordering::Acquire);
            if done >= need {
                return done;
            }
            if self.abort.load(Ordering::Relaxed) {
                panic!("a landscape pass worker stopped");
            }
            if spins < 256 {
                std::hint::spin_loop();
                spins += 1;
            } else {
                std::thread::yield_now();
            }
        }
    }

    /// Sweeps the slices of one worker, wavefront by wavefront (see [`CellLayout`]). The state of
    /// the slice being swept and of the slice before it is held as f32 (NaN = no origin
    /// yet). Each cell is offered its 13 neighbours in the order of the raster formulation:
    /// the previous slice's (dj outer, di inner), the previous row's, then the previous cell
    /// of its row.
    #[inline(always)]
    fn run_slices<const DIAG: bool, const AX: usize>(&self, start: usize, step: usize) {
        let sk = self.skew;
        let size = sk.size;
        let nt = sk.nt;
        let l = self.linear;
        let d = self.direction;
        let sgn: i64 = if self.forward { 1 } else { -1 };
        let sync = step > 1;
        let nb = self.bufs.len();
        // Neighbour q's offset (di, dj, dk) from a cell; e = −offset.
        let mut offs = [(0i64, 0i64, 0i64); NEIGHBOURS];
        let mut q = 0;
        for dj in -1i64..=1 {
            for di in -1i64..=1 {
                offs[q] = (di, dj, -sgn);
                q += 1;
            }
        }
        for di in -1i64..=1 {
            offs[q] = (di, -sgn, 0);
            q += 1;
        }
        offs[q] = (-sgn, 0, 0);
        let es = offs.map(|(di, dj, dk)| [-di as f32, -dj as f32, -dk as f32]);
        let mut t = start;
        while t < self.ks.len() {
            let k = self.ks[t];
            let base = size * k;
            let cur = self.bufs[t % nb];
            // The first slice of a pass has no previous one: an all-NaN buffer stands in.
            let prev = if t > 0 {
                self.bufs[(t + nb - 1) % nb]
            } else {
                self.none
            };
            // SAFETY: slice k belongs to this worker alone in this pass; the buffer of
            // position t is written by this worker only, and read by the next position's
            // worker wavefront by wavefront after `progress` says it is finished. The
            // buffer is reused (position t + nb) only after that reader is done (see `pass`).
            unsafe {
                load_plane(
                    cur.row_mut(0, size),
                    std::slice::from_raw_parts(self.ox.add(base), size),
                    std::slice::from_raw_parts(self.oy.add(base), size),
                    std::slice::from_raw_parts(self.oz.add(base), size),
                );
            }
            // Wavefronts of the previous slice known to be finished: the shared counter is
            // read again only when more are needed (it lives on a cache line the other
            // worker keeps writing).
            let mut seen = 0;
            for s in 0..nt {
                let need = (s + 1 + PAD_T).min(nt);
                if sync && t > 0 && seen < need {
                    seen = self.wait_rows(t - 1, need);
                }
                let w = if self.forward { s } else { nt - 1 - s };
                let (jl, n) = sk.lanes[w];
                let m = n.next_multiple_of(LANES);
                let (w, jl) = (w as i64, jl as i64);
                // SAFETY: the previous slice's rows were waited for above; this slice's
                // rows w + di − 2s and w − s are earlier wavefronts of this worker's own
                // buffer, never row w; each read stays inside its row (see `CellLayout`).
                let srcs: [Row<'_>; NEIGHBOURS] = std::array::from_fn(|q| {
                    let (di, dj, dk) = offs[q];
                    let buf = if dk != 0 { prev } else { cur };
                    unsafe { buf.row(sk.slot(w + di + 2 * dj, jl + dj), m) }
                });
                // SAFETY: row w of this worker's buffer (cells, end padding and room for
                // whole lane groups, see `CellLayout`); no other view of it is alive.
                let mut dst = unsafe { cur.row_mut(sk.slot(w, jl), m) };
                relax_wavefront::<DIAG, AX>(&l, &d, &srcs, &es, &mut dst, n);
                if sync {
                    self.progress[t].0.store(s + 1, Ordering::Release);
                }
            }
            // SAFETY: as for the load; readers of this buffer only read.
            unsafe {
                store_plane(
                    cur.row(0, size),
                    std::slice::from_raw_parts_mut(self.ox.add(base), size),
                    std::slice::from_raw_parts_mut(self.oy.add(base), size),
                    std::slice::from_raw_parts_mut(self.oz.add(base), size),
                );
            }
            t += step;
        }
    }
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
        // One thread: the wavefront sweep of a 256³ box takes about 0.25 s on one core, and
        // the two-thread slice pipeline (`compute_threads`) measured no steadier gain on two
        // cores (0.24–0.37 s wall for twice the CPU time); `measure` runs its landscapes
        // side by side instead.
        Self::compute_threads(reference, lo, dims, affine, d, factor, 1)
    }

    /// As [`FastLandscape::compute_coarse`], with at most `max_threads` threads per pass (1
    /// or 2; two are used only for boxes of at least [`PIPELINE_MIN_CELLS`] cells). The
    /// result does not depend on the number of threads.
    pub fn compute_threads(
        reference: &Mask,
        lo: [i64; 3],
        dims: [usize; 3],
        affine: &Affine,
        d: [f64; 3],
        factor: usize,
        max_threads: usize,
    ) -> Self {
        let f = factor.max(1);
        let cdims = dims.map(|n| n.div_ceil(f));
        let [nx, ny, nz] = cdims;
        let skew = CellLayout::new(nx, ny);
        // During the passes the state is in the wavefront layout, slice after slice.
        let n = skew.size * nz;
        let fine_linear = affine.linear();
        let mut me = FastLandscape {
            lo,
            dims,
            factor: f,
            cdims,
            layout: skew.clone(),
            fine_linear,
            ox: big_vec(n, NONE),
            oy: big_vec(n, 0),
            oz: big_vec(n, 0),
            linear: fine_linear.map(|r| r.map(|v| (v * f as f64) as f32)),
            direction: d.map(|v| v as f32),
        };
        // The first slice holding a reference cell (nz when there is none).
        let mut first_k = nz;
        // Cell x index of each box column, so that marking needs no division per voxel.
        let cell_x: Vec<usize> = (0..dims[0]).map(|i| i / f).collect();
        let [rx, ry, rz] = reference.dims;
        for rk in 0..rz {
            let k = reference.lo[2] + rk as i64 - lo[2];
            if k < 0 || k as usize >= dims[2] {
                continue;
            }
            for rj in 0..ry {
                let j = reference.lo[1] + rj as i64 - lo[1];
                if j < 0 || j as usize >= dims[1] {
                    continue;
                }
                let start = rx * (rj + ry * rk);
                let row = &reference.bits[start..start + rx];
                if !row.contains(&true) {
                    continue;
                }
                let (cj, ck) = (j as usize / f, k as usize / f);
                let base = skew.size * ck;
                for (ri, &b) in row.iter().enumerate() {
                    let i = reference.lo[0] + ri as i64 - lo[0];
                    if b && i >= 0 && (i as usize) < dims[0] {
                        let ci = cell_x[i as usize];
                        me.ox[base + skew.slot((ci + 2 * cj) as i64, cj as i64)] = 0;
                        first_k = first_k.min(ck);
                    }
                }
            }
        }
        me.pass(&skew, true, first_k, max_threads);
        me.pass(&skew, false, 0, max_threads);
        me
    }

    /// One raster pass; the forward pass starts at slice `first_k` (every earlier slice holds
    /// no reference cell and can receive no origin in that pass, so it is left as it is).
    /// Large boxes run on two threads: worker 0 sweeps the even slices, worker 1 the odd
    /// ones, a few wavefronts behind; each slice sees exactly the state it would see in one
    /// thread, so the result does not depend on the threading.
    fn pass(&mut self, skew: &CellLayout, forward: bool, first_k: usize, max_threads: usize) {
        let [nx, ny, nz] = self.cdims;
        let ks: Vec<usize> = if forward {
            (first_k.min(nz)..nz).collect()
        } else {
            (0..nz).rev().collect()
        };
        let two = max_threads >= 2
            && nx * ny * nz >= PIPELINE_MIN_CELLS
            && ks.len() >= 2
            && std::thread::available_parallelism().is_ok_and(|n| n.get() >= 2);
        // Two workers need four buffers: position t's buffer is next written at t + 4, by
        // the same worker, after it has finished t + 2, which waited for all of t + 1, the
        // only reader of t's buffer.
        let mut bufs: Vec<SliceBuf> = (0..if two { 4 } else { 2 })
            .map(|_| SliceBuf::new(skew.size))
            .collect();
        let mut none = SliceBuf::new(skew.size);
        let job = PassJob {
            ox: self.ox.as_mut_ptr(),
            oy: self.oy.as_mut_ptr(),
            oz: self.oz.as_mut_ptr(),
            skew,
            linear: self.linear,
            direction: self.direction,
            forward,
            bufs: bufs.iter_mut().map(SliceBuf::ptrs).collect(),
            none: none.ptrs(),
            progress: if two {
                ks.iter().map(|_| Progress(AtomicUsize::new(0))).collect()
            } else {
                Vec::new()
            },
            ks,
            abort: AtomicBool::new(false),
        };
        if two {
            std::thread::scope(|s| {
                s.spawn(|| job.run(1, 2));
                job.run(0, 2);
            });
        } else {
            job.run(0, 1);
        }
        drop(job);
        drop(bufs);
        drop(none);
    }

    /// The state slot of the propagation cell holding a global voxel, if inside the box.
    pub fn cell_of(&self, p: [i64; 3]) -> Option<usize> {
        let f = self.factor;
        let mut c = [0usize; 3];
        for a in 0..3 {
            let q = p[a] - self.lo[a];
            if q < 0 || q as usize >= self.dims[a] {
                return None;
            }
            c[a] = q as usize / f;
        }
        Some(self.layout.cell(c[0], c[1], c[2]))
    }

    /// The degree of a cell (its slot, see [`FastLandscape::cell_of`]), read at its centre
    /// (for factor 1, the voxel's own degree).
    pub fn cell_degree(&self, c: usize) -> f64 {
        let d = self.direction.map(|x| x as f64);
        cell_degree_of(
            self.ox[c],
            self.oy[c],
            self.oz[c],
            self.factor as f64,
            &self.fine_linear,
            d,
        )
    }

    /// [`FastLandscape::cell_degree`] of many cells (slots) at once, written to `out` in the
    /// order of `cells` (each given with a weight that is passed through). The same arithmetic,
    /// laid out so that the compiler can run it on vector lanes.
    pub fn cell_degrees(&self, cells: &[(usize, u32)], out: &mut Vec<(f64, u32)>) {
        // In chunks with fixed buffers: a target can hold millions of cells, and large
        // temporary vectors per call cost fresh pages each time.
        const CHUNK: usize = 2048;
        out.clear();
        out.reserve(cells.len());
        let mut o = [[0i16; CHUNK]; 3];
        let mut deg = [0.0f64; CHUNK];
        for chunk in cells.chunks(CHUNK) {
            let n = chunk.len();
            for (t, &(c, _)) in chunk.iter().enumerate() {
                o[0][t] = self.ox[c];
                o[1][t] = self.oy[c];
                o[2][t] = self.oz[c];
            }
            let (ox, oy, oz) = (&o[0][..n], &o[1][..n], &o[2][..n]);
            #[cfg(target_arch = "x86_64")]
            {
                if std::is_x86_feature_detected!("avx512f")
                    && std::is_x86_feature_detected!("avx512vl")
                    && std::is_x86_feature_detected!("avx512dq")
                    && std::is_x86_feature_detected!("avx512bw")
                {
                    // SAFETY: the CPU supports the features the function is compiled for.
                    unsafe { self.degrees_avx512(ox, oy, oz, &mut deg[..n]) };
                } else {
                    self.degrees_plain(ox, oy, oz, &mut deg[..n]);
                }
            }
            #[cfg(not(target_arch = "x86_64"))]
            self.degrees_plain(ox, oy, oz, &mut deg[..n]);
            out.extend(deg[..n].iter().copied().zip(chunk.iter().map(|&(_, w)| w)));
        }
    }

    #[inline(always)]
    fn degrees_plain(&self, ox: &[i16], oy: &[i16], oz: &[i16], deg: &mut [f64]) {
        let d = self.direction.map(|x| x as f64);
        let f = self.factor as f64;
        let l = self.fine_linear;
        let n = deg.len();
        let (ox, oy, oz) = (&ox[..n], &oy[..n], &oz[..n]);
        for t in 0..n {
            deg[t] = cell_degree_of(ox[t], oy[t], oz[t], f, &l, d);
        }
    }

    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx512f,avx512vl,avx512bw,avx512dq,avx2")]
    unsafe fn degrees_avx512(&self, ox: &[i16], oy: &[i16], oz: &[i16], deg: &mut [f64]) {
        self.degrees_plain(ox, oy, oz, deg);
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
        let c = [i / f, j / f, k / f];
        let l = self.layout.cell(c[0], c[1], c[2]);
        if self.ox[l] == NONE {
            return 0.0;
        }
        if (self.ox[l], self.oy[l], self.oz[l]) == (0, 0, 0) {
            // A reference cell: 1 throughout, as the relations read it (at its centre).
            // Measured from the cell's centre, its own voxels would alternate between 0 and
            // a positive value along the direction, half a voxel either side.
            return 1.0;
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
        structuring_element_fast(w, self.direction.map(|x| x as f64))
    }

    /// Bytes of state per propagation cell.
    pub const BYTES_PER_CELL: usize = 6;
}

/// The degree of a cell whose origin vector (in cells) is (x, y, z): the structuring
/// element ([`structuring_element_fast`]) of the world vector between the two cell centres.
/// Branch-free, so that a loop over cells runs on vector lanes; the values are those of the
/// scalar formula. A negative cosine gives 0 (an angle above π/2, where the approximate
/// arccos stays above π/2 too).
#[inline(always)]
fn cell_degree_of(x: i16, y: i16, z: i16, f: f64, l: &[[f64; 3]; 3], d: [f64; 3]) -> f64 {
    let v = [x as f64 * f, y as f64 * f, z as f64 * f];
    let w = [
        l[0][0] * v[0] + l[0][1] * v[1] + l[0][2] * v[2],
        l[1][0] * v[0] + l[1][1] * v[1] + l[1][2] * v[2],
        l[2][0] * v[0] + l[2][1] * v[1] + l[2][2] * v[2],
    ];
    let dot = w[0] * d[0] + w[1] * d[1] + w[2] * d[2];
    let n2 = w[0] * w[0] + w[1] * w[1] + w[2] * w[2];
    let c = (dot / n2.sqrt()).clamp(-1.0, 1.0);
    let acos = acos_fast(c);
    let value = (1.0 - FRAC_2_PI * acos).max(0.0);
    if x == NONE || dot < 0.0 {
        0.0
    } else if n2 == 0.0 {
        1.0
    } else {
        value
    }
}

/// Number of propagation cells of a box of `dims` voxels at coarsening `factor`.
pub fn cell_count(dims: [usize; 3], factor: usize) -> usize {
    dims.iter().map(|n| n.div_ceil(factor.max(1))).product()
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
    /// Combines degrees given with a voxel count each (a cell read once for all its
    /// target voxels); 0 for an empty target.
    pub fn combine_weighted(self, degrees: impl Iterator<Item = (f64, u32)>) -> f64 {
        let mut n = 0u64;
        let (mut lo, mut hi, mut sum) = (f64::INFINITY, f64::NEG_INFINITY, 0.0);
        for (v, w) in degrees {
            if w == 0 {
                continue;
            }
            n += w as u64;
            lo = lo.min(v);
            hi = hi.max(v);
            sum += v * w as f64;
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

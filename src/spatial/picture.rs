//! `--png DIR`: for each finding, an axial and a coronal slice through its centroid with the
//! region outlines, the landscape of its strongest directional relation as a heat map, and
//! orientation letters placed from the affine.

use super::SpatialError;
use super::config::MeasureConfig;
use super::landscape::FastLandscape;
use super::mask::Mask;
use super::measure::Geometry;
use super::nifti_io::LabelMap;
use super::region::Region;
use super::structuring::Direction;
use super::table::Role;
use std::path::Path;

/// Writes `<id>_axial.png` and `<id>_coronal.png` for every finding into `dir`.
pub fn write_pictures(
    dir: &Path,
    grid: &LabelMap,
    geometry: &Geometry,
    config: &MeasureConfig,
) -> Result<(), SpatialError> {
    let regions = &geometry.regions;
    let werr = |p: &Path, e: String| SpatialError::Write {
        file: p.display().to_string(),
        message: e,
    };
    std::fs::create_dir_all(dir).map_err(|e| werr(dir, e.to_string()))?;
    for lesion in regions.iter().filter(|r| r.role == Role::Finding) {
        // The strongest directional relation with the lesion as subject; among equals the
        // first object, and for one object the last relation by name.
        let mut directional: Vec<(&str, &str, f64, Direction)> = geometry
            .relations()
            .filter(|r| r.0 == lesion.id)
            .filter_map(|(_, relation, object, degree)| {
                Direction::ALL
                    .iter()
                    .find(|d| d.relation() == relation)
                    .map(|d| (object, relation, degree, *d))
            })
            .collect();
        directional.sort_by(|a, b| (a.0, a.1).cmp(&(b.0, b.1)));
        let best = directional
            .into_iter()
            .max_by(|a, b| a.2.total_cmp(&b.2).then_with(|| b.0.cmp(a.0)));
        let heat = best.and_then(|(object, _, _, d)| {
            let obj = regions.iter().find(|x| x.id == object)?;
            let dims = grid.shape;
            Some(FastLandscape::compute_coarse(
                &obj.extent,
                [0, 0, 0],
                dims,
                &grid.affine,
                d.vector(),
                super::measure::coarsening(dims, config.directional.max_landscape_cells),
            ))
        });
        let centre = mean_index(&lesion.mask);
        let codes = grid.affine.axis_codes();
        // Voxel axis that follows each world axis.
        let along = |world: usize| (0..3).find(|&a| codes[a].0 == world).unwrap_or(world);
        for (view, fixed_world, h_world, v_world) in [("axial", 2, 0, 1), ("coronal", 1, 0, 2)] {
            let (fa, ha, va) = (along(fixed_world), along(h_world), along(v_world));
            if fa == ha || fa == va || ha == va {
                continue;
            }
            let img = render(grid, regions, lesion, heat.as_ref(), centre, [fa, ha, va]);
            let path = dir.join(format!("{}_{view}.png", lesion.id));
            let bytes = encode_png(&img).map_err(|e| werr(&path, e))?;
            super::atomic_write(&path, &bytes).map_err(|e| werr(&path, e.to_string()))?;
        }
    }
    Ok(())
}

struct Image {
    w: usize,
    h: usize,
    rgb: Vec<u8>,
}

impl Image {
    fn put(&mut self, x: usize, y: usize, c: [u8; 3]) {
        if x < self.w && y < self.h {
            let o = 3 * (x + self.w * y);
            self.rgb[o..o + 3].copy_from_slice(&c);
        }
    }
}

fn mean_index(m: &Mask) -> [i64; 3] {
    let v = m.voxels();
    let n = v.len().max(1) as f64;
    let mut s = [0.0; 3];
    for p in &v {
        for a in 0..3 {
            s[a] += p[a] as f64;
        }
    }
    [
        (s[0] / n).round() as i64,
        (s[1] / n).round() as i64,
        (s[2] / n).round() as i64,
    ]
}

const PALETTE: [[u8; 3]; 8] = [
    [80, 200, 255],
    [120, 255, 120],
    [255, 170, 60],
    [200, 120, 255],
    [255, 120, 180],
    [60, 230, 210],
    [230, 230, 90],
    [160, 160, 255],
];

fn render(
    grid: &LabelMap,
    regions: &[Region],
    lesion: &Region,
    heat: Option<&FastLandscape>,
    centre: [i64; 3],
    axes: [usize; 3],
) -> Image {
    let [fa, ha, va] = axes;
    let sp = grid.affine.spacing();
    let (nh, nv) = (grid.shape[ha], grid.shape[va]);
    let min_sp = sp[ha].min(sp[va]);
    let longest = (nh as f64 * sp[ha]).max(nv as f64 * sp[va]) / min_sp;
    let f = (512.0 / longest).clamp(1.0, 8.0);
    let rh = ((f * sp[ha] / min_sp).round() as usize).max(1);
    let rv = ((f * sp[va] / min_sp).round() as usize).max(1);
    let margin = 14;
    let (w, h) = (nh * rh + 2 * margin, nv * rv + 2 * margin);
    let mut img = Image {
        w,
        h,
        rgb: vec![24; w * h * 3],
    };
    let voxel = |u: usize, v: usize| {
        let mut p = [0i64; 3];
        p[fa] = centre[fa];
        p[ha] = u as i64;
        p[va] = v as i64;
        p
    };
    // Heat map (black → red → yellow) where the landscape is positive.
    for v in 0..nv {
        for u in 0..nh {
            let p = voxel(u, v);
            let g = heat.map_or(0.0, |l| l.degree(p));
            let c = [
                (255.0 * (2.0 * g).min(1.0)) as u8,
                (255.0 * (2.0 * g - 1.0).max(0.0)) as u8,
                40,
            ];
            let c = if heat.is_some() { c } else { [40, 40, 40] };
            for dy in 0..rv {
                for dx in 0..rh {
                    img.put(margin + u * rh + dx, margin + (nv - 1 - v) * rv + dy, c);
                }
            }
        }
    }
    // Outlines: in-slice boundary voxels of each region.
    let mut idx = 0;
    for r in regions {
        let colour = if r.id == lesion.id {
            [255, 255, 255]
        } else {
            idx += 1;
            PALETTE[(idx - 1) % PALETTE.len()]
        };
        for v in 0..nv {
            for u in 0..nh {
                let p = voxel(u, v);
                if !r.mask.contains(p) {
                    continue;
                }
                let mut edge = false;
                for (du, dv) in [(-1i64, 0i64), (1, 0), (0, -1), (0, 1)] {
                    let mut q = p;
                    q[ha] += du;
                    q[va] += dv;
                    edge |= !r.mask.contains(q);
                }
                if edge {
                    for dy in 0..rv {
                        for dx in 0..rh {
                            img.put(
                                margin + u * rh + dx,
                                margin + (nv - 1 - v) * rv + dy,
                                colour,
                            );
                        }
                    }
                }
            }
        }
    }
    // Orientation letters: the world direction of increasing index along each screen axis.
    let letter = |axis: usize, positive: bool| -> char {
        let (world, sign) = grid.affine.axis_codes()[axis];
        let pos = (sign > 0.0) == positive;
        match (world, pos) {
            (0, true) => 'R',
            (0, false) => 'L',
            (1, true) => 'A',
            (1, false) => 'P',
            (2, true) => 'S',
            _ => 'I',
        }
    };
    let white = [255, 255, 255];
    draw_char(&mut img, letter(ha, false), 3, h / 2 - 3, white);
    draw_char(&mut img, letter(ha, true), w - 8, h / 2 - 3, white);
    draw_char(&mut img, letter(va, true), w / 2 - 2, 3, white);
    draw_char(&mut img, letter(va, false), w / 2 - 2, h - 11, white);
    img
}

/// 5×7 glyphs for the six orientation letters, one byte per row (low 5 bits, MSB left).
fn glyph(c: char) -> [u8; 7] {
    match c {
        'R' => [0x1E, 0x11, 0x11, 0x1E, 0x14, 0x12, 0x11],
        'L' => [0x10, 0x10, 0x10, 0x10, 0x10, 0x10, 0x1F],
        'A' => [0x0E, 0x11, 0x11, 0x1F, 0x11, 0x11, 0x11],
        'P' => [0x1E, 0x11, 0x11, 0x1E, 0x10, 0x10, 0x10],
        'S' => [0x0F, 0x10, 0x10, 0x0E, 0x01, 0x01, 0x1E],
        _ => [0x0E, 0x04, 0x04, 0x04, 0x04, 0x04, 0x0E],
    }
}

fn draw_char(img: &mut Image, c: char, x: usize, y: usize, col: [u8; 3]) {
    for (row, bits) in glyph(c).iter().enumerate() {
        for b in 0..5 {
            if bits & (0x10 >> b) != 0 {
                img.put(x + b, y + row, col);
            }
        }
    }
}

fn encode_png(img: &Image) -> Result<Vec<u8>, String> {
    let mut out = Vec::new();
    {
        let mut enc = png::Encoder::new(&mut out, img.w as u32, img.h as u32);
        enc.set_color(png::ColorType::Rgb);
        enc.set_depth(png::BitDepth::Eight);
        let mut wr = enc.write_header().map_err(|e| e.to_string())?;
        wr.write_image_data(&img.rgb).map_err(|e| e.to_string())?;
    }
    Ok(out)
}

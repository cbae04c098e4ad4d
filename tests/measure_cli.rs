//! `wherefore measure` through the built binary: the contract's JSON, determinism, and exit
//! code 2 with a message naming the file for every kind of bad input.

use std::path::{Path, PathBuf};
use std::process::Command;
use wherefore::spatial::affine::Affine;
use wherefore::spatial::nifti_io::{RawHeader, dtype, encode_labels, write_nifti};
use wherefore::spatial::phantom::Phantom;

fn tmpdir(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("wherefore-measure-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn run(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_wherefore"))
        .arg("measure")
        .args(args)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

const LIVER: &str = "http://example.org/anatomy#Liver";
const SPLEEN: &str = "http://example.org/anatomy#Spleen";
const LESION: &str = "http://example.org/finding#Lesion";

/// A small abdomen: liver on the patient's right (+x), spleen on the left (−x), a lesion
/// carved out of the liver.
fn abdomen(dir: &Path, file: &str) -> (PathBuf, PathBuf) {
    let mut p = Phantom::new(
        [40, 30, 24],
        Affine::diagonal([2.0, 2.0, 2.5], [-40.0, -30.0, -30.0]),
    );
    p.ellipsoid(1, [16.0, 0.0, 0.0], [14.0, 12.0, 12.0]);
    p.ellipsoid(2, [-22.0, -4.0, 2.0], [7.0, 8.0, 9.0]);
    p.lesion(3, 1, [16.0, 0.0, 0.0], [4.0, 4.0, 5.0]);
    let map = dir.join(file);
    p.write_nifti(&map).unwrap();
    let table = dir.join("labels.tsv");
    std::fs::write(&table, format!("value\tindividual\tclass\n1\tliver\t{LIVER}\n2\tspleen\t{SPLEEN}\n3\tlesion1\t{LESION}\n")).unwrap();
    (map, table)
}

fn json(s: &str) -> serde_json::Value {
    serde_json::from_str(s).unwrap_or_else(|e| panic!("not JSON ({e}): {s}"))
}

fn rel(v: &serde_json::Value, s: &str, r: &str, o: &str) -> Option<f64> {
    v["relations"]
        .as_array()
        .unwrap()
        .iter()
        .find(|x| x["subject"] == s && x["relation"] == r && x["object"] == o)
        .map(|x| x["degree"].as_f64().unwrap())
}

fn quantity(v: &serde_json::Value, s: &str, o: &str, q: &str) -> Option<f64> {
    v["measurements"]
        .as_array()
        .unwrap()
        .iter()
        .find(|x| x["subject"] == s && x["quantity"] == q && x["object"] == o)
        .map(|x| x["value"].as_f64().unwrap())
}

#[test]
fn facts_follow_the_contract_and_are_deterministic() {
    let dir = tmpdir("contract");
    let (map, table) = abdomen(&dir, "abdomen.nii.gz");
    let (code, out, err) = run(&[map.to_str().unwrap(), "--labels", table.to_str().unwrap()]);
    assert_eq!(code, 0, "{err}");
    let (code2, out2, _) = run(&[map.to_str().unwrap(), "--labels", table.to_str().unwrap()]);
    assert_eq!(code2, 0);
    assert_eq!(out, out2, "two runs must be byte-identical (contract)");
    let v = json(&out);
    assert_eq!(v["format"], "wherefore-facts");
    assert_eq!(v["version"], 1);
    assert_eq!(v["source"]["files"][0], "abdomen.nii.gz");
    assert_eq!(v["source"]["shape"], serde_json::json!([40, 30, 24]));
    // Individuals sorted by label value (contract).
    let ids: Vec<&str> = v["individuals"]
        .as_array()
        .unwrap()
        .iter()
        .map(|i| i["id"].as_str().unwrap())
        .collect();
    assert_eq!(ids, ["liver", "spleen", "lesion1"]);
    // volume_ml = voxels × |det| / 1000 (contract); det = 2·2·2.5 = 10 mm³.
    for ind in v["individuals"].as_array().unwrap() {
        let vox = ind["voxels"].as_f64().unwrap();
        assert!((ind["volume_ml"].as_f64().unwrap() - vox * 10.0 / 1000.0).abs() < 1e-9);
    }
    // Exactly one RCC-8 relation per ordered pair (contract); the carved lesion is a proper
    // part of the liver's extent (contract: extents fill enclosed voxels).
    let rels = v["relations"].as_array().unwrap();
    for s in &ids {
        for o in &ids {
            if s != o {
                let n = rels
                    .iter()
                    .filter(|r| {
                        r["subject"] == *s
                            && r["object"] == *o
                            && r["relation"].as_str().unwrap().starts_with("rcc8_")
                    })
                    .count();
                assert_eq!(n, 1, "{s} {o}");
            }
        }
    }
    assert_eq!(rel(&v, "lesion1", "rcc8_NTPP", "liver"), Some(1.0));
    assert_eq!(rel(&v, "liver", "rcc8_NTPPi", "lesion1"), Some(1.0));
    assert_eq!(
        quantity(&v, "lesion1", "liver", "overlap_fraction"),
        Some(1.0)
    );
    // Touching regions have min distance 0 (contract).
    assert_eq!(
        quantity(&v, "lesion1", "liver", "min_distance_mm"),
        Some(0.0)
    );
    // The spleen (x ≈ −22) lies to the patient's left of the liver (x ≈ +16): left is −x.
    let left = rel(&v, "spleen", "left_of", "liver").unwrap();
    assert!(left > 0.8, "spleen left_of liver = {left}");
    assert!(rel(&v, "spleen", "right_of", "liver").unwrap_or(0.0) < 0.05);
    assert!(rel(&v, "liver", "right_of", "spleen").unwrap() > 0.8);
    // The lesion sits inside the liver's extent: depth reported; hand check: the liver's
    // x-radius is 14 mm and the lesion's 4 mm, both centred at x = 16, so the lesion lies
    // at most ~10 mm from the liver's surface in x and y (12 − 4 = 8 mm in y).
    let depth = quantity(&v, "lesion1", "liver", "depth_mm").unwrap();
    assert!(depth > 4.0 && depth <= 10.0, "depth {depth}");
    // Sorted by subject, object, relation name (contract).
    let keys: Vec<(String, String, String)> = rels
        .iter()
        .map(|r| {
            (
                r["subject"].as_str().unwrap().into(),
                r["object"].as_str().unwrap().into(),
                r["relation"].as_str().unwrap().into(),
            )
        })
        .collect();
    let mut sorted = keys.clone();
    sorted.sort();
    assert_eq!(keys, sorted);
    assert_eq!(v["provenance"]["tool"], "wherefore");
}

#[test]
fn out_is_written_and_inputs_are_never_overwritten() {
    let dir = tmpdir("out");
    let (map, table) = abdomen(&dir, "a.nii");
    let out = dir.join("facts.json");
    let (code, stdout, err) = run(&[
        map.to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--out",
        out.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(stdout.is_empty());
    assert_eq!(
        json(&std::fs::read_to_string(&out).unwrap())["format"],
        "wherefore-facts"
    );
    let before = std::fs::read(&map).unwrap();
    let (code, _, err) = run(&[
        map.to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--out",
        map.to_str().unwrap(),
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("inputs"), "{err}");
    assert_eq!(std::fs::read(&map).unwrap(), before);
}

#[test]
fn two_maps_with_a_map_column_and_pairs_narrowing() {
    let dir = tmpdir("twomaps");
    let aff = Affine::diagonal([2.0, 2.0, 2.0], [-30.0, -30.0, -30.0]);
    let mut organs = Phantom::new([30, 30, 30], aff);
    organs
        .ellipsoid(1, [0.0, 0.0, 0.0], [16.0, 16.0, 16.0])
        .ellipsoid(2, [-24.0, 0.0, 0.0], [4.0, 4.0, 4.0]);
    let mut lesions = Phantom::new([30, 30, 30], aff);
    lesions.ellipsoid(1, [4.0, 0.0, 0.0], [4.0, 4.0, 4.0]);
    organs.write_nifti(&dir.join("organs.nii")).unwrap();
    lesions.write_nifti(&dir.join("lesions.nii.gz")).unwrap();
    let table = dir.join("t.tsv");
    std::fs::write(
        &table,
        format!("map\tvalue\tindividual\tclass\norgans.nii\t1\tliver\t{LIVER}\norgans.nii\t2\tspleen\t{SPLEEN}\nlesions.nii.gz\t1\tl1\t{LESION}\n"),
    )
    .unwrap();
    let (code, out, err) = run(&[
        dir.join("organs.nii").to_str().unwrap(),
        dir.join("lesions.nii.gz").to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--pairs",
        "finding>anatomy",
    ]);
    assert_eq!(code, 0, "{err}");
    let v = json(&out);
    // Individuals sorted by label value, then map name (contract): "lesions.nii.gz" < "organs.nii".
    let ids: Vec<&str> = v["individuals"]
        .as_array()
        .unwrap()
        .iter()
        .map(|i| i["id"].as_str().unwrap())
        .collect();
    assert_eq!(ids, ["l1", "liver", "spleen"]);
    // Only finding → anatomy pairs.
    for r in v["relations"].as_array().unwrap() {
        assert_eq!(r["subject"], "l1");
    }
    // The lesion overlaps the liver in a separate map: it is inside the liver's extent.
    assert_eq!(rel(&v, "l1", "rcc8_NTPP", "liver"), Some(1.0));
}

fn bad_case(dir: &Path, name: &str, header: RawHeader, data: &[u8], gz: bool) -> (i32, String) {
    let path = dir.join(name);
    write_nifti(&path, &header, data, gz).unwrap();
    let table = dir.join("bad.tsv");
    std::fs::write(
        &table,
        format!("value\tindividual\tclass\n1\tliver\t{LIVER}\n"),
    )
    .unwrap();
    let (code, _, err) = run(&[path.to_str().unwrap(), "--labels", table.to_str().unwrap()]);
    assert!(err.contains(name), "message must name the file: {err}");
    assert!(!err.contains("panicked"), "{err}");
    (code, err)
}

#[test]
fn bad_inputs_exit_2_with_a_clear_message() {
    let dir = tmpdir("bad");
    let aff = Affine::identity();
    let labels: Vec<i64> = (0..64).map(|i| (i % 2) as i64).collect();
    let u8data = encode_labels(&labels, dtype::UINT8).unwrap();

    // Float-valued labels.
    let mut h = RawHeader::for_labels([4, 4, 4], dtype::FLOAT32, &aff);
    let mut f: Vec<u8> = Vec::new();
    for i in 0..64 {
        f.extend_from_slice(&(if i == 5 { 1.5f32 } else { (i % 2) as f32 }).to_le_bytes());
    }
    let (c, e) = bad_case(&dir, "float.nii", h.clone(), &f, false);
    assert_eq!(c, 2);
    assert!(e.contains("float-valued"), "{e}");

    // NaN.
    let mut f: Vec<u8> = Vec::new();
    for i in 0..64 {
        f.extend_from_slice(&(if i == 7 { f32::NAN } else { (i % 2) as f32 }).to_le_bytes());
    }
    let (c, e) = bad_case(&dir, "nan.nii", h.clone(), &f, false);
    assert_eq!(c, 2);
    assert!(e.contains("NaN"), "{e}");

    // 4D data.
    h = RawHeader::for_labels([4, 4, 2], dtype::UINT8, &aff);
    h.dim = [4, 4, 4, 2, 2, 1, 1, 1];
    let (c, e) = bad_case(&dir, "fourd.nii", h, &u8data, false);
    assert_eq!(c, 2);
    assert!(e.contains("4-dimensional"), "{e}");

    // NIfTI-2 (sizeof_hdr = 540).
    let mut h = RawHeader::for_labels([4, 4, 4], dtype::UINT8, &aff);
    h.sizeof_hdr = 540;
    let (c, e) = bad_case(&dir, "two.nii", h, &u8data, false);
    assert_eq!(c, 2);
    assert!(e.contains("NIfTI-2"), "{e}");

    // Truncated gzip.
    let h = RawHeader::for_labels([4, 4, 4], dtype::UINT8, &aff);
    let path = dir.join("trunc.nii.gz");
    write_nifti(&path, &h, &u8data, true).unwrap();
    let bytes = std::fs::read(&path).unwrap();
    std::fs::write(&path, &bytes[..bytes.len() - 12]).unwrap();
    let table = dir.join("bad.tsv");
    let (c, _, e) = run(&[path.to_str().unwrap(), "--labels", table.to_str().unwrap()]);
    assert_eq!(c, 2);
    assert!(
        e.contains("trunc.nii.gz") && (e.contains("gzip") || e.contains("truncated")),
        "{e}"
    );

    // Header dimensions that do not match the data (.nii and .nii.gz).
    let h = RawHeader::for_labels([5, 5, 5], dtype::UINT8, &aff);
    let (c, e) = bad_case(&dir, "mismatch.nii", h.clone(), &u8data, false);
    assert_eq!(c, 2);
    assert!(e.contains("do not match") || e.contains("need"), "{e}");
    let (c, _) = bad_case(&dir, "mismatch.nii.gz", h, &u8data, true);
    assert_eq!(c, 2);
    let h = RawHeader::for_labels([2, 2, 2], dtype::UINT8, &aff);
    let (c, _) = bad_case(&dir, "toolong.nii.gz", h, &u8data, true);
    assert_eq!(c, 2);

    // Absurd dimensions: refused from the header alone (32767³ voxels would be ~35 TB).
    let mut h = RawHeader::for_labels([4, 4, 4], dtype::UINT8, &aff);
    h.dim = [3, 32767, 32767, 32767, 1, 1, 1, 1];
    let (c, e) = bad_case(&dir, "absurd.nii.gz", h, &u8data, true);
    assert_eq!(c, 2);
    assert!(e.contains("absurd"), "{e}");

    // Labels that do not survive the scaling (slope 0.5 turns 1 into 0.5).
    let mut h = RawHeader::for_labels([4, 4, 4], dtype::UINT8, &aff);
    h.scl_slope = 0.5;
    let (c, e) = bad_case(&dir, "scaled.nii", h, &u8data, false);
    assert_eq!(c, 2);
    assert!(e.contains("scl_slope"), "{e}");

    // Negative dimension.
    let mut h = RawHeader::for_labels([4, 4, 4], dtype::UINT8, &aff);
    h.dim = [3, 4, -4, 4, 1, 1, 1, 1];
    let (c, _) = bad_case(&dir, "negdim.nii", h, &u8data, false);
    assert_eq!(c, 2);

    // Not a NIfTI file at all.
    let path = dir.join("text.nii");
    std::fs::write(&path, "hello").unwrap();
    let (c, _, e) = run(&[path.to_str().unwrap(), "--labels", table.to_str().unwrap()]);
    assert_eq!(c, 2);
    assert!(e.contains("text.nii"), "{e}");
}

#[test]
fn table_errors_exit_2_and_unlisted_labels_warn() {
    let dir = tmpdir("table");
    let (map, _) = abdomen(&dir, "m.nii");
    let table = dir.join("missing.tsv");
    std::fs::write(
        &table,
        format!("value\tindividual\tclass\n1\tliver\t{LIVER}\n9\tghost\t{LIVER}\n"),
    )
    .unwrap();
    let (c, _, e) = run(&[map.to_str().unwrap(), "--labels", table.to_str().unwrap()]);
    assert_eq!(c, 2);
    assert!(e.contains("missing.tsv:3") && e.contains("label 9"), "{e}");

    std::fs::write(&table, "value\tname\n1\tliver\n").unwrap();
    let (c, _, e) = run(&[map.to_str().unwrap(), "--labels", table.to_str().unwrap()]);
    assert_eq!(c, 2);
    assert!(e.contains("missing.tsv:1"), "{e}");

    std::fs::write(
        &table,
        format!("value\tindividual\tclass\n1\tliver\t{LIVER}\n"),
    )
    .unwrap();
    let (c, out, e) = run(&[map.to_str().unwrap(), "--labels", table.to_str().unwrap()]);
    assert_eq!(c, 0, "{e}");
    assert!(
        e.contains("label 2") && e.contains("label 3") && e.contains("skipped"),
        "{e}"
    );
    assert_eq!(json(&out)["individuals"].as_array().unwrap().len(), 1);
}

#[test]
fn png_pictures_are_written_for_findings() {
    let dir = tmpdir("png");
    let (map, table) = abdomen(&dir, "p.nii");
    let pics = dir.join("pics");
    let (c, _, e) = run(&[
        map.to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--png",
        pics.to_str().unwrap(),
    ]);
    assert_eq!(c, 0, "{e}");
    for view in ["axial", "coronal"] {
        let bytes = std::fs::read(pics.join(format!("lesion1_{view}.png"))).unwrap();
        // PNG signature (PNG specification, ISO/IEC 15948 §5.2).
        assert_eq!(
            &bytes[..8],
            &[0x89, b'P', b'N', b'G', 0x0d, 0x0a, 0x1a, 0x0a]
        );
    }
    assert!(!pics.join("liver_axial.png").exists());
}

#[test]
fn distances_are_symmetric_and_pairs_must_name_known_regions() {
    let dir = tmpdir("sym");
    let (map, table) = abdomen(&dir, "s.nii");
    let (code, out, err) = run(&[map.to_str().unwrap(), "--labels", table.to_str().unwrap()]);
    assert_eq!(code, 0, "{err}");
    let v = json(&out);
    // Both quantities are symmetric by definition (contract: min distance between the two
    // regions' voxel centres; Hausdorff "symmetric").
    for (a, b) in [
        ("liver", "spleen"),
        ("spleen", "lesion1"),
        ("lesion1", "liver"),
    ] {
        for q in ["min_distance_mm", "hausdorff_mm"] {
            assert_eq!(quantity(&v, a, b, q), quantity(&v, b, a, q), "{a} {b} {q}");
        }
    }
    // Hand check on the grid: the spleen's x-extent ends at −16 mm and the liver's begins
    // at +2 mm (voxel centres every 2 mm), so the gap is at least 18 mm.
    assert!(quantity(&v, "spleen", "liver", "min_distance_mm").unwrap() >= 18.0);
    let (code, _, err) = run(&[
        map.to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--pairs",
        "ghost>liver",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("ghost"), "{err}");
    let (code, _, err) = run(&[
        map.to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--pairs",
        "liver",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("SUBJECTS>OBJECTS"), "{err}");
}

#[test]
fn config_file_and_options_change_the_parameters() {
    let dir = tmpdir("config");
    let (map, table) = abdomen(&dir, "c.nii");
    let cfg = dir.join("m.toml");
    // near = 1 up to 30 mm: the spleen–liver gap (≥ 18 mm, < 30 mm) becomes fully near.
    std::fs::write(
        &cfg,
        "[near]\nfull_until_mm = 30.0\nzero_from_mm = 40.0\n[far]\nzero_until_mm = 40.0\nfull_from_mm = 80.0\n[depth]\nperipheral_until_mm = 5.0\ndeep_from_mm = 15.0\n[directional]\naggregate = \"necessity\"\nlandscape = \"exact\"\nmax_landscape_cells = 2097152\n[topology]\nadjacency = 6\n",
    )
    .unwrap();
    let (code, out, err) = run(&[
        map.to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--config",
        cfg.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    let v = json(&out);
    assert_eq!(rel(&v, "spleen", "near", "liver"), Some(1.0));
    assert_eq!(v["provenance"]["parameters"]["topology"]["adjacency"], 6);
    assert_eq!(
        v["provenance"]["parameters"]["directional"]["landscape"],
        "exact"
    );
    // Options override the file.
    let (code, out, _) = run(&[
        map.to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--config",
        cfg.to_str().unwrap(),
        "--aggregate",
        "possibility",
    ]);
    assert_eq!(code, 0);
    assert_eq!(
        json(&out)["provenance"]["parameters"]["directional"]["aggregate"],
        "possibility"
    );
    // A bad file: exit 2 naming it.
    std::fs::write(&cfg, "[near]\nfull_until_mm = 30.0\n").unwrap();
    let (code, _, err) = run(&[
        map.to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--config",
        cfg.to_str().unwrap(),
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("m.toml"), "{err}");
    let (code, _, _) = run(&[
        map.to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--adjacency",
        "8",
    ]);
    assert_eq!(code, 2);
}

#[test]
fn an_exact_plan_beyond_the_work_bound_exits_3() {
    // Contract: exit code 3 when a resource limit is reached. Two 300 000-voxel blocks:
    // 2 ordered pairs × 6 directions × 3·10⁵ × 3·10⁵ ≈ 1.1·10¹² > 2·10¹¹ angle evaluations.
    let dir = tmpdir("limit");
    let mut p = Phantom::new([100, 100, 60], Affine::identity());
    p.cuboid(1, [0.0, 0.0, 0.0], [49.0, 99.0, 59.0]).cuboid(
        2,
        [50.0, 0.0, 0.0],
        [99.0, 99.0, 59.0],
    );
    let map = dir.join("big.nii.gz");
    p.write_nifti(&map).unwrap();
    let table = dir.join("t.tsv");
    std::fs::write(
        &table,
        format!("value\tindividual\tclass\n1\ta\t{LIVER}\n2\tb\t{SPLEEN}\n"),
    )
    .unwrap();
    let (code, _, err) = run(&[
        map.to_str().unwrap(),
        "--labels",
        table.to_str().unwrap(),
        "--landscape",
        "exact",
    ]);
    assert_eq!(code, 3, "{err}");
    assert!(err.contains("--landscape fast"), "{err}");
}

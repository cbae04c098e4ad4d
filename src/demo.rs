//! The built-in demo: synthetic upper-abdominal CT label maps (our own scenario), measured,
//! explained and drafted end to end.
//!
//! Organ sizes are typical adult values (common practice): liver about 1.5 L, spleen about
//! 160 mL, kidneys about 11 cm long and 170 mL, pancreas about 12 cm long, aorta 2.4 cm and
//! inferior vena cava 2 cm in diameter. The scenario is illustrative, not clinical guidance.

use crate::explain::ExplainOptions;
use crate::explain::case::case_problem;
use crate::facts::measure::measure;
use crate::kb::{KnowledgeBase, load};
use crate::render::{self, ReportInput};
use crate::spatial::affine::Affine;
use crate::spatial::measure::MeasureOptions;
use crate::spatial::phantom::Phantom;
use crate::spatial::table::parse_table;
use std::path::{Path, PathBuf};

/// The demo's spatial core ontology, shipped in the binary.
pub const SPATIAL_OFN: &str = include_str!("../ontologies/spatial.ofn");
/// The demo's abdomen ontology, shipped in the binary.
pub const ABDOMEN_OFN: &str = include_str!("../ontologies/abdomen.ofn");
/// The examples' check suite (examples/cases.toml), shipped in the binary.
pub const EXAMPLES_CASES: &str = include_str!("../examples/cases.toml");

const ABD: &str = "https://wherefore.example.org/ns/abdomen#";

/// A lesion placed in a demo case: label, id, centre (RAS mm), radii (mm).
struct Lesion {
    label: i64,
    id: &'static str,
    centre: [f64; 3],
    radii: [f64; 3],
}

/// One demo case.
pub struct DemoCase {
    /// Folder name.
    pub id: &'static str,
    /// What it shows.
    pub description: &'static str,
    lesions: Vec<Lesion>,
    displaced_kidney: bool,
}

/// The six cases.
pub fn cases() -> Vec<DemoCase> {
    let l = |label, id, centre, radii| Lesion {
        label,
        id,
        centre,
        radii,
    };
    vec![
        DemoCase {
            id: "01-deep-liver-lesion",
            description: "a small lesion deep inside the liver, explained by a single hypothesis",
            lesions: vec![l(20, "lesion1", [85.0, 15.0, 55.0], [9.0, 9.0, 10.0])],
            displaced_kidney: false,
        },
        DemoCase {
            id: "02-bulging-liver-lesion",
            description: "a lesion bulging from the liver's lower surface; hypotheses compete and degrees rank them",
            lesions: vec![l(20, "lesion1", [75.0, 5.0, -8.0], [22.0, 22.0, 22.0])],
            displaced_kidney: false,
        },
        DemoCase {
            id: "03-two-organs",
            description: "lesions in the liver and the right kidney; the explanation needs two assertions",
            lesions: vec![
                l(20, "lesion1", [85.0, 15.0, 55.0], [11.0, 11.0, 12.0]),
                l(21, "lesion2", [60.0, -50.0, -40.0], [11.0, 11.0, 12.0]),
            ],
            displaced_kidney: false,
        },
        DemoCase {
            id: "04-displaced-kidney",
            description: "a large mass pushes the right kidney down, contradicting a normal-anatomy default",
            lesions: vec![l(20, "lesion1", [70.0, -45.0, -14.0], [28.0, 26.0, 27.0])],
            displaced_kidney: true,
        },
        DemoCase {
            id: "05-pancreatic-lesion",
            description: "a lesion in the pancreas that no hypothesis of the knowledge base explains",
            lesions: vec![l(20, "lesion1", [-20.0, 12.0, 14.0], [8.0, 8.0, 9.0])],
            displaced_kidney: false,
        },
        DemoCase {
            id: "06-perivascular-mass",
            description: "a mass in contact with the aorta, with the distance reported",
            lesions: vec![l(20, "lesion1", [-38.0, 2.0, -30.0], [12.0, 12.0, 14.0])],
            displaced_kidney: false,
        },
    ]
}

/// Grid: 1.5 × 1.5 × 2.5 mm, x stored toward the patient's left (a common storage order).
fn grid() -> ([usize; 3], Affine) {
    (
        [214, 174, 80],
        Affine::diagonal([-1.5, 1.5, 2.5], [160.0, -130.0, -100.0]),
    )
}

/// The organ map of a case.
fn organs(displaced_kidney: bool) -> Phantom {
    let (shape, affine) = grid();
    let mut p = Phantom::new(shape, affine);
    p.ellipsoid(1, [70.0, 10.0, 50.0], [80.0, 70.0, 60.0]); // liver
    p.ellipsoid(2, [-90.0, -20.0, 40.0], [35.0, 22.0, 55.0]); // spleen
    let rk = if displaced_kidney {
        [62.0, -52.0, -68.0]
    } else {
        [60.0, -50.0, -40.0]
    };
    p.ellipsoid(3, rk, [30.0, 25.0, 28.0]); // right kidney
    p.ellipsoid(4, [-60.0, -50.0, -35.0], [30.0, 25.0, 28.0]); // left kidney
    p.tube(5, [40.0, 25.0, 5.0], [-80.0, -5.0, 20.0], 12.0); // pancreas
    p.ellipsoid(6, [45.0, 62.0, 0.0], [15.0, 18.0, 30.0]); // gallbladder
    p.tube(7, [-15.0, -20.0, -100.0], [-15.0, -20.0, 97.0], 12.0); // aorta
    p.tube(8, [20.0, -15.0, -100.0], [20.0, -15.0, 97.0], 10.0); // inferior vena cava
    p
}

fn table(lesions: &[Lesion]) -> String {
    let mut t = String::from("map\tvalue\tindividual\tclass\n");
    for (v, id, class) in [
        (1, "liver", "Liver"),
        (2, "spleen", "Spleen"),
        (3, "right_kidney", "RightKidney"),
        (4, "left_kidney", "LeftKidney"),
        (5, "pancreas", "Pancreas"),
        (6, "gallbladder", "Gallbladder"),
        (7, "aorta", "Aorta"),
        (8, "ivc", "InferiorVenaCava"),
    ] {
        t.push_str(&format!("organs.nii.gz\t{v}\t{id}\t{ABD}{class}\n"));
    }
    for l in lesions {
        t.push_str(&format!(
            "lesions.nii.gz\t{}\t{}\t{ABD}FocalLesion\n",
            l.label, l.id
        ));
    }
    t
}

/// What the demo did for one case.
pub struct CaseOutcome {
    /// Case id.
    pub id: String,
    /// The case's folder.
    pub dir: PathBuf,
    /// The top explanation in the clinician's words, if any.
    pub top: Option<String>,
    /// Number of explanations.
    pub explanations: usize,
    /// Number of unexplained observations.
    pub unexplained: usize,
    /// Number of suspended defaults.
    pub abnormalities: usize,
}

fn write(path: &Path, bytes: &[u8]) -> Result<(), String> {
    let dir = path.parent().unwrap_or(Path::new("."));
    std::fs::create_dir_all(dir)
        .map_err(|e| format!("{}: cannot create folder: {e}", dir.display()))?;
    crate::files::write_atomic(path, bytes, &[])
}

/// Loads the demo knowledge base from the copies written into `dir`.
pub fn demo_kb(dir: &Path) -> Result<KnowledgeBase, String> {
    let odir = dir.join("ontologies");
    write(&odir.join("spatial.ofn"), SPATIAL_OFN.as_bytes())?;
    write(&odir.join("abdomen.ofn"), ABDOMEN_OFN.as_bytes())?;
    load::load(&[odir.join("abdomen.ofn")], &load::LoadOptions::default())
        .map_err(|e| e.to_string())
}

/// Runs the whole demo into `dir`.
pub fn run(dir: &Path) -> Result<Vec<CaseOutcome>, String> {
    let kb = demo_kb(dir)?;
    if !kb.warnings.is_empty() {
        return Err(format!("demo ontologies: {}", kb.warnings.join("; ")));
    }
    let mut outcomes = Vec::new();
    for case in cases() {
        let cdir = dir.join(case.id);
        std::fs::create_dir_all(&cdir).map_err(|e| format!("{}: {e}", cdir.display()))?;
        let org = organs(case.displaced_kidney);
        let (shape, affine) = grid();
        let mut les = Phantom::new(shape, affine);
        for l in &case.lesions {
            les.ellipsoid(l.label, l.centre, l.radii);
        }
        org.write_nifti(&cdir.join("organs.nii.gz"))
            .map_err(|e| format!("{}: {e}", cdir.display()))?;
        les.write_nifti(&cdir.join("lesions.nii.gz"))
            .map_err(|e| format!("{}: {e}", cdir.display()))?;
        let tsv = table(&case.lesions);
        write(&cdir.join("labels.tsv"), tsv.as_bytes())?;
        let maps = vec![
            org.to_label_map("organs.nii.gz"),
            les.to_label_map("lesions.nii.gz"),
        ];
        let rows = parse_table(&tsv, "labels.tsv").map_err(|e| e.to_string())?;
        // Every pair with a finding, plus the organ pairs the normal-anatomy defaults speak of.
        let mut opts = MeasureOptions::default();
        for sel in [
            "finding>*",
            "anatomy>finding",
            "spleen>liver",
            "right_kidney>left_kidney,liver",
            "aorta>ivc",
            "gallbladder>aorta",
        ] {
            opts.pairs
                .push(crate::spatial::measure::PairSelection::parse(sel)?);
        }
        let measured = measure(&maps, &rows, "labels.tsv", &opts).map_err(|e| e.to_string())?;
        let facts = measured.facts;
        write(&cdir.join("facts.json"), facts.to_json().as_bytes())?;
        let pic_dir = cdir.join("pictures");
        let mut images = Vec::new();
        if crate::spatial::picture::write_pictures(
            &pic_dir,
            &maps[0],
            &measured.geometry,
            &opts.config,
        )
        .is_ok()
        {
            let mut names: Vec<PathBuf> = std::fs::read_dir(&pic_dir)
                .map(|rd| rd.filter_map(|e| e.ok().map(|e| e.path())).collect())
                .unwrap_or_default();
            names.sort();
            for p in names {
                if let Ok(bytes) = std::fs::read(&p) {
                    let cap = p
                        .file_stem()
                        .map(|s| s.to_string_lossy().replace('_', " "))
                        .unwrap_or_default();
                    images.push((cap, bytes));
                }
            }
        }
        let c = case_problem(&kb, &facts, &format!("{}/facts.json", case.id));
        let eopts = ExplainOptions::default();
        let result = crate::explain::explain(&c.problem, &eopts).map_err(|r| r.reason)?;
        let input = ReportInput {
            case: case.id,
            facts: &facts,
            problem: &c.problem,
            abox: &c.abox,
            result: &result,
            alpha: eopts.alpha,
        };
        let report = render::build(&input);
        let json = serde_json::to_string_pretty(&report).map_err(|e| e.to_string())? + "\n";
        write(&cdir.join("report.json"), json.as_bytes())?;
        write(
            &cdir.join("report.md"),
            render::markdown(&report).as_bytes(),
        )?;
        write(
            &cdir.join("report.html"),
            render::html::page(&report, &images).as_bytes(),
        )?;
        outcomes.push(CaseOutcome {
            id: case.id.to_string(),
            dir: cdir,
            top: report.explanations.first().map(|e| e.summary.clone()),
            explanations: report.explanations.len(),
            unexplained: report.unexplained.len(),
            abnormalities: report.abnormalities.len(),
        });
    }
    Ok(outcomes)
}

/// The examples' case file as the demo writes it: the KB paths point at the demo's own
/// `ontologies/` folder instead of the repository's `../ontologies/`.
pub fn examples_cases() -> String {
    EXAMPLES_CASES.replace("\"../ontologies/", "\"ontologies/")
}

/// Writes `dir/cases.toml` (the examples' suite) and runs it over the case folders the demo
/// wrote, in process, through the check library.
pub fn run_examples(dir: &Path) -> Result<Vec<crate::check::CaseResult>, String> {
    let path = dir.join("cases.toml");
    write(&path, examples_cases().as_bytes())?;
    let suite = crate::check::load_paths(&[path]).map_err(|e| e.to_string())?;
    Ok(crate::check::run_suite(
        &suite.cases,
        &crate::check::RunOptions::default(),
    ))
}

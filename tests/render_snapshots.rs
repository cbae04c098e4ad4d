//! Every register and format of the report on one small fixed case, as insta snapshots,
//! plus the checks no snapshot can make: the caution in every output, well-formed HTML5, and
//! a FHIR R4 resource of the expected shape.
//!
//! The case (tests/fixtures/report/bulging-liver-lesion.facts.json) is demo data: a lesion
//! bulging from the liver's underside, measured by `wherefore measure` on the synthetic
//! phantom and cut down to four regions.

use std::path::PathBuf;
use wherefore::kb::load::{LoadOptions, load};
use wherefore::render::{self, Report};

fn report() -> Report {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let kb = load(
        &[
            root.join("ontologies/spatial.ofn"),
            root.join("ontologies/abdomen.ofn"),
        ],
        &LoadOptions::default(),
    )
    .unwrap();
    let facts_path = root.join("tests/fixtures/report/bulging-liver-lesion.facts.json");
    let facts = wherefore::facts::read_facts(&facts_path).unwrap();
    render::report_for(&kb, &facts, "bulging-liver-lesion", "facts.json", 0.5, 3).unwrap()
}

#[test]
fn registers_and_formats() {
    let r = report();
    insta::assert_snapshot!("clinician", r.registers.clinician);
    insta::assert_snapshot!("patient", r.registers.patient);
    insta::assert_snapshot!("formal", r.registers.formal);
    insta::assert_snapshot!("markdown", render::markdown(&r));
    insta::assert_snapshot!("html", render::html::page(&r, &[]));
    insta::assert_snapshot!("json", serde_json::to_string_pretty(&r).unwrap());
    insta::assert_snapshot!("fhir", render::fhir::diagnostic_report(&r));
}

#[test]
fn caution_in_every_output() {
    // DEVELOPERS.md: every draft, in every register and format, carries the caution.
    let r = report();
    let outputs = [
        ("clinician", r.registers.clinician.clone()),
        ("patient", r.registers.patient.clone()),
        ("formal", r.registers.formal.clone()),
        ("markdown", render::markdown(&r)),
        ("html", render::html::page(&r, &[])),
        ("json", serde_json::to_string(&r).unwrap()),
        ("fhir", render::fhir::diagnostic_report(&r)),
    ];
    for (name, text) in outputs {
        assert!(
            text.contains("not medical advice"),
            "{name} lacks the caution"
        );
    }
}

#[test]
fn html_is_well_formed_html5() {
    // Parsed by the html5ever-based `scraper` crate, a general-purpose HTML5 parser that
    // follows the WHATWG parsing algorithm and records each parse error it meets.
    let r = report();
    let page = render::html::page(&r, &[("slice.png".into(), vec![0x89, b'P', b'N', b'G'])]);
    let doc = scraper::Html::parse_document(&page);
    assert!(
        doc.errors.is_empty(),
        "HTML5 parse errors: {:?}",
        doc.errors
    );
    assert!(format!("{:?}", doc.quirks_mode).contains("NoQuirks"));
    // No network: no external script, stylesheet or image.
    for (sel, attr) in [("script", "src"), ("link", "href"), ("img", "src")] {
        let s = scraper::Selector::parse(sel).unwrap();
        for e in doc.select(&s) {
            let v = e.value().attr(attr).unwrap_or("");
            assert!(
                v.is_empty() || v.starts_with("data:"),
                "{sel} loads {v} from outside the page"
            );
        }
    }
}

#[test]
fn fhir_shape() {
    // HL7 FHIR R4: DiagnosticReport.status, .code are required; contained resources must be
    // referenced (invariant dom-3); our drafts are always `preliminary`.
    let r = report();
    let v: serde_json::Value = serde_json::from_str(&render::fhir::diagnostic_report(&r)).unwrap();
    assert_eq!(v["resourceType"], "DiagnosticReport");
    assert_eq!(v["status"], "preliminary");
    assert!(v["code"]["text"].is_string());
    let contained = v["contained"].as_array().unwrap();
    let results = v["result"].as_array().unwrap();
    assert_eq!(contained.len(), r.findings.len());
    assert_eq!(contained.len(), results.len());
    for (c, res) in contained.iter().zip(results) {
        assert_eq!(c["resourceType"], "Observation");
        assert_eq!(c["status"], "preliminary");
        assert_eq!(res["reference"], format!("#{}", c["id"].as_str().unwrap()));
        assert_eq!(c["component"][0]["valueQuantity"]["code"], "mL");
    }
    assert!(
        v["conclusion"]
            .as_str()
            .unwrap()
            .contains("qualified clinician")
    );
}

//! A report draft as an HL7 FHIR R4 `DiagnosticReport` (JSON), status `preliminary`, with
//! one contained `Observation` per finding.
//!
//! Resource shapes follow the FHIR R4 specification (hl7.org/fhir/R4: DiagnosticReport,
//! Observation, Attachment, Quantity with UCUM units). The report stays a draft: its status
//! is `preliminary`, and the caution opens the narrative, the conclusion and every text.

use super::Report;
use super::html::{base64, escape};
use serde_json::{Value, json};

/// UCUM, the unit system FHIR uses for quantities.
const UCUM: &str = "http://unitsofmeasure.org";

/// A FHIR id: letters, digits, `-` and `.`, at most 64 characters.
fn fhir_id(s: &str) -> String {
    let mut id: String = s
        .chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() || c == '-' || c == '.' {
                c
            } else {
                '-'
            }
        })
        .take(64)
        .collect();
    if id.is_empty() {
        id.push_str("case");
    }
    id
}

fn round(x: f64, digits: i32) -> f64 {
    let k = 10f64.powi(digits);
    (x * k).round() / k
}

fn quantity(text: &str, value: f64, unit: &str) -> Value {
    json!({
        "code": {"text": text},
        "valueQuantity": {"value": round(value, 2), "unit": unit, "system": UCUM, "code": unit}
    })
}

fn attachment(title: &str, text: &str) -> Value {
    json!({
        "contentType": "text/plain; charset=utf-8",
        "language": "en",
        "data": base64(text.as_bytes()),
        "title": title
    })
}

/// The report as a FHIR R4 `DiagnosticReport` resource, pretty-printed JSON.
pub fn diagnostic_report(r: &Report) -> String {
    let mut contained = Vec::new();
    let mut results = Vec::new();
    for (k, f) in r.findings.iter().enumerate() {
        let id = format!("finding-{}", k + 1);
        let mut notes: Vec<Value> = f
            .relations
            .iter()
            .map(|(t, d)| json!({"text": format!("{t} (degree {d:.2})")}))
            .collect();
        notes.insert(0, json!({"text": r.caution.clone()}));
        notes.push(json!({"text": format!(
            "Centroid at RAS ({:.1}, {:.1}, {:.1}) mm.",
            f.centroid_mm[0], f.centroid_mm[1], f.centroid_mm[2]
        )}));
        if !f.explained_by.is_empty() {
            let ranks: Vec<String> = f.explained_by.iter().map(|n| n.to_string()).collect();
            notes.push(json!({"text": format!(
                "Accounted for by interpretation(s) {} of the report (draft).",
                ranks.join(", ")
            )}));
        }
        contained.push(json!({
            "resourceType": "Observation",
            "id": id,
            "status": "preliminary",
            "code": {"text": format!("{} ({})", f.label, f.id)},
            "component": [
                quantity("Volume", f.volume_ml, "mL"),
                quantity("Largest diameter", f.largest_diameter_mm, "mm")
            ],
            "note": notes
        }));
        results.push(json!({"reference": format!("#{id}"), "display": f.id}));
    }
    let mut conclusion = format!("{} ", r.caution);
    if r.explanations.is_empty() {
        conclusion.push_str("No interpretation accounts for the findings.");
    } else {
        conclusion.push_str("Ranked interpretations (draft): ");
        let parts: Vec<String> = r
            .explanations
            .iter()
            .map(|e| format!("{}. {} (degree {:.2})", e.rank, e.summary, e.degree))
            .collect();
        conclusion.push_str(&parts.join("; "));
        conclusion.push('.');
    }
    if !r.abnormalities.is_empty() {
        let parts: Vec<&str> = r
            .abnormalities
            .iter()
            .map(|a| a.statement.as_str())
            .collect();
        conclusion.push_str(&format!(
            " Normal-anatomy expectations suspended for this case: {}.",
            parts.join("; ")
        ));
    }
    let div = format!(
        "<div xmlns=\"http://www.w3.org/1999/xhtml\"><p><b>{}</b></p><pre>{}</pre></div>",
        escape(&r.caution),
        escape(&r.registers.clinician)
    );
    let mut v = json!({
        "resourceType": "DiagnosticReport",
        "id": fhir_id(&r.case),
        "text": {"status": "generated", "div": div},
        "contained": contained,
        "status": "preliminary",
        "category": [{"coding": [{
            "system": "http://terminology.hl7.org/CodeSystem/v2-0074",
            "code": "RAD",
            "display": "Radiology"
        }]}],
        "code": {"text": "Imaging interpretation draft"},
        "conclusion": conclusion,
        "presentedForm": [
            attachment("Clinician register", &r.registers.clinician),
            attachment("Patient register", &r.registers.patient),
            attachment("Formal register", &r.registers.formal)
        ]
    });
    if !results.is_empty() {
        v["result"] = json!(results);
    } else {
        v.as_object_mut().map(|o| o.remove("contained"));
    }
    serde_json::to_string_pretty(&v).unwrap_or_default() + "\n"
}

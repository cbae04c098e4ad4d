//! JUnit XML, the report format CI servers read. The layout follows the Apache Ant JUnit
//! schema as published by Windy Road (JUnit.xsd, github.com/windyroad/JUnit-Schema):
//! `<testsuites>` holding one `<testsuite>` per case file, with the required `package`,
//! `id`, `name`, `timestamp`, `hostname`, counts and `time`, then `<properties>`, the
//! `<testcase>` elements, `<system-out>` and `<system-err>`.

use super::diff::check_text;
use super::run::{CaseResult, Status};
use std::fmt::Write;
use std::time::SystemTime;

/// Escapes text for XML content and attribute values; drops characters XML 1.0 forbids.
pub fn escape(s: &str) -> String {
    let mut o = String::with_capacity(s.len());
    for ch in s.chars() {
        match ch {
            '&' => o.push_str("&amp;"),
            '<' => o.push_str("&lt;"),
            '>' => o.push_str("&gt;"),
            '"' => o.push_str("&quot;"),
            '\'' => o.push_str("&apos;"),
            '\n' | '\t' | '\r' => o.push(ch),
            c if (c as u32) < 0x20 || c == '\u{FFFE}' || c == '\u{FFFF}' => {}
            c => o.push(c),
        }
    }
    o
}

/// UTC date and time `YYYY-MM-DDTHH:MM:SS` of a moment (civil-from-days, Hinnant's
/// "chrono-compatible low-level date algorithms").
pub fn iso_utc(t: SystemTime) -> String {
    let secs = t
        .duration_since(SystemTime::UNIX_EPOCH)
        .map(|d| d.as_secs() as i64)
        .unwrap_or(0);
    let (days, rem) = (secs.div_euclid(86_400), secs.rem_euclid(86_400));
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!(
        "{y:04}-{m:02}-{d:02}T{:02}:{:02}:{:02}",
        rem / 3600,
        rem % 3600 / 60,
        rem % 60
    )
}

/// The JUnit XML of a run: one test suite per case file, one test case per case.
pub fn junit_xml(results: &[CaseResult], when: SystemTime, hostname: &str) -> String {
    let mut files: Vec<String> = Vec::new();
    for r in results {
        let f = r.spec.file.display().to_string();
        if !files.contains(&f) {
            files.push(f);
        }
    }
    let stamp = iso_utc(when);
    let host = if hostname.trim().is_empty() {
        "localhost"
    } else {
        hostname.trim()
    };
    let mut s = String::from("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<testsuites>\n");
    for (id, f) in files.iter().enumerate() {
        let rs: Vec<&CaseResult> = results
            .iter()
            .filter(|r| r.spec.file.display().to_string() == *f)
            .collect();
        let failures = rs.iter().filter(|r| r.status == Status::Fail).count();
        let errors = rs
            .iter()
            .filter(|r| matches!(r.status, Status::Error(_)))
            .count();
        let time: f64 = rs.iter().map(|r| r.time.as_secs_f64()).sum();
        let _ = writeln!(
            s,
            "  <testsuite package=\"wherefore.check\" id=\"{id}\" name=\"{}\" timestamp=\"{stamp}\" hostname=\"{}\" tests=\"{}\" failures=\"{failures}\" errors=\"{errors}\" time=\"{time:.3}\">",
            escape(f),
            escape(host),
            rs.len()
        );
        s.push_str("    <properties/>\n");
        for r in rs {
            let _ = write!(
                s,
                "    <testcase name=\"{}\" classname=\"{}\" time=\"{:.3}\"",
                escape(&r.spec.name),
                escape(f),
                r.time.as_secs_f64()
            );
            match &r.status {
                Status::Pass => s.push_str("/>\n"),
                Status::Fail => {
                    let failed: Vec<&str> = r
                        .checks
                        .iter()
                        .filter(|c| !c.passed)
                        .map(|c| c.key.as_str())
                        .collect();
                    let body: String = r
                        .checks
                        .iter()
                        .filter(|c| !c.passed)
                        .map(|c| check_text(f, c))
                        .collect();
                    let _ = write!(
                        s,
                        ">\n      <failure message=\"{}\" type=\"expectation\">{}</failure>\n    </testcase>\n",
                        escape(&format!("failed: expect.{}", failed.join(", expect."))),
                        escape(&body)
                    );
                }
                Status::Error(e) => {
                    let _ = write!(
                        s,
                        ">\n      <error message=\"{}\" type=\"malformed case\">{}</error>\n    </testcase>\n",
                        escape(e),
                        escape(e)
                    );
                }
            }
        }
        s.push_str("    <system-out/>\n    <system-err/>\n  </testsuite>\n");
    }
    s.push_str("</testsuites>\n");
    s
}

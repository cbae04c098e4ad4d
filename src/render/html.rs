//! The self-contained HTML draft: inline CSS, no script, no network.

use super::Report;

/// Escapes text for HTML.
pub fn escape(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

/// The HTML page of a report; `images` are (caption, PNG bytes) embedded as data URIs.
pub fn page(r: &Report, images: &[(String, Vec<u8>)]) -> String {
    let mut s = String::new();
    s.push_str("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
    s.push_str(&format!(
        "<title>Report draft: {}</title>\n",
        escape(&r.case)
    ));
    s.push_str(
        "<style>\nbody{font-family:system-ui,sans-serif;max-width:58rem;margin:2rem auto;padding:0 1rem;color:#1d2327;line-height:1.5}\n\
         .caution{border-left:6px solid #b35c00;background:#fff4e5;padding:.6rem 1rem;margin:1rem 0}\n\
         pre{background:#f4f6f8;padding:.8rem;overflow-x:auto;white-space:pre-wrap}\n\
         h2{border-bottom:1px solid #ccd;padding-bottom:.2rem}\n\
         figure{display:inline-block;margin:.5rem}figcaption{font-size:.85rem;color:#555}\n\
         table{border-collapse:collapse}td,th{border:1px solid #ccd;padding:.2rem .5rem;text-align:left}\n</style>\n</head>\n<body>\n",
    );
    s.push_str(&format!("<h1>Report draft: {}</h1>\n", escape(&r.case)));
    s.push_str(&format!(
        "<p class=\"caution\"><strong>Caution.</strong> {}</p>\n",
        escape(&r.caution)
    ));
    s.push_str("<h2>For the clinician</h2>\n");
    s.push_str(&format!("<pre>{}</pre>\n", escape(&r.registers.clinician)));
    if !r.explanations.is_empty() {
        s.push_str(
            "<table>\n<tr><th>rank</th><th>hypotheses</th><th>degree</th><th>score</th></tr>\n",
        );
        for e in &r.explanations {
            s.push_str(&format!(
                "<tr><td>{}</td><td>{}</td><td>{:.2}</td><td>{:.2}</td></tr>\n",
                e.rank,
                escape(&e.summary),
                e.degree,
                e.score
            ));
        }
        s.push_str("</table>\n");
    }
    s.push_str("<h2>For the patient</h2>\n");
    for para in r
        .registers
        .patient
        .split('\n')
        .filter(|p| !p.trim().is_empty())
    {
        s.push_str(&format!("<p>{}</p>\n", escape(para)));
    }
    if !images.is_empty() {
        s.push_str("<h2>Pictures</h2>\n");
        for (cap, png) in images {
            s.push_str(&format!(
                "<figure><img alt=\"{}\" src=\"data:image/png;base64,{}\"><figcaption>{}</figcaption></figure>\n",
                escape(cap),
                base64(png),
                escape(cap)
            ));
        }
    }
    s.push_str("<h2>Formal record</h2>\n");
    s.push_str(&format!("<pre>{}</pre>\n", escape(&r.registers.formal)));
    s.push_str("</body>\n</html>\n");
    s
}

/// Standard base64 (RFC 4648 §4) for embedding images.
pub fn base64(bytes: &[u8]) -> String {
    const T: &[u8; 64] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
    let mut out = String::with_capacity(bytes.len().div_ceil(3) * 4);
    for chunk in bytes.chunks(3) {
        let b = [
            chunk[0],
            *chunk.get(1).unwrap_or(&0),
            *chunk.get(2).unwrap_or(&0),
        ];
        let n = ((b[0] as u32) << 16) | ((b[1] as u32) << 8) | b[2] as u32;
        out.push(T[(n >> 18) as usize & 63] as char);
        out.push(T[(n >> 12) as usize & 63] as char);
        out.push(if chunk.len() > 1 {
            T[(n >> 6) as usize & 63] as char
        } else {
            '='
        });
        out.push(if chunk.len() > 2 {
            T[n as usize & 63] as char
        } else {
            '='
        });
    }
    out
}

#[cfg(test)]
mod tests {
    #[test]
    fn base64_rfc4648_vectors() {
        // RFC 4648 §10 test vectors.
        for (i, o) in [
            ("", ""),
            ("f", "Zg=="),
            ("fo", "Zm8="),
            ("foo", "Zm9v"),
            ("foob", "Zm9vYg=="),
            ("fooba", "Zm9vYmE="),
            ("foobar", "Zm9vYmFy"),
        ] {
            assert_eq!(super::base64(i.as_bytes()), o);
        }
    }
}

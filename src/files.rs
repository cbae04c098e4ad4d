//! Writing files safely: atomically, and never over an input.

use std::path::{Path, PathBuf};

/// Writes a file atomically: a temporary file in the same folder, then a rename. Refuses to
/// write over any of `inputs`.
pub fn write_atomic(path: &Path, bytes: &[u8], inputs: &[PathBuf]) -> Result<(), String> {
    let target = std::fs::canonicalize(path).ok();
    for i in inputs {
        if let (Some(t), Ok(ic)) = (&target, std::fs::canonicalize(i))
            && *t == ic
        {
            return Err(format!(
                "{}: refusing to overwrite an input file; choose another output path",
                path.display()
            ));
        }
    }
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().to_string())
        .unwrap_or_else(|| "out".into());
    let tmp = dir.join(format!(".{name}.{}.tmp", std::process::id()));
    std::fs::write(&tmp, bytes).map_err(|e| format!("{}: cannot write: {e}", tmp.display()))?;
    std::fs::rename(&tmp, path).map_err(|e| {
        let _ = std::fs::remove_file(&tmp);
        format!("{}: cannot write: {e}", path.display())
    })
}

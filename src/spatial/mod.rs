//! Volumes, affines, distance transforms, fuzzy landscapes, RCC-8 and region metrics: the
//! geometry of the `measure` pipeline, from NIfTI label maps to regions and the values of
//! each pair (`facts::measure` writes them as facts). Knows nothing of OWL or of facts.

pub mod affine;
pub mod config;
pub mod edt;
pub mod landscape;
pub mod mask;
pub mod measure;
pub mod nifti_io;
pub mod phantom;
pub mod picture;
pub mod rcc8;
pub mod region;
pub mod structuring;
pub mod table;

use std::path::Path;

/// Errors of the spatial layer; every one names the file it concerns.
#[derive(Debug, thiserror::Error)]
pub enum SpatialError {
    /// A NIfTI file that cannot be used.
    #[error("{file}: {message}")]
    Nifti {
        /// The file.
        file: String,
        /// What is wrong and what to do.
        message: String,
    },
    /// A label table line that cannot be used.
    #[error("{file}:{line}: {message}")]
    Table {
        /// The file.
        file: String,
        /// 1-based line number (0 for the file as a whole).
        line: usize,
        /// What is wrong and what to do.
        message: String,
    },
    /// A configuration file that cannot be used.
    #[error("{file}: {message}")]
    Config {
        /// The file.
        file: String,
        /// What is wrong and what to do.
        message: String,
    },
    /// Label maps that do not share one grid, or a bad option.
    #[error("{0}")]
    Usage(String),
    /// A work bound was reached (the contract's exit code 3).
    #[error("resource limit: {0}")]
    Limit(String),
    /// Writing an output failed.
    #[error("{file}: cannot write: {message}")]
    Write {
        /// The file.
        file: String,
        /// The cause.
        message: String,
    },
}

/// Writes `bytes` to `path` atomically: a temporary file in the same folder, then a rename.
pub fn atomic_write(path: &Path, bytes: &[u8]) -> std::io::Result<()> {
    use std::io::Write;
    let dir = match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => std::path::PathBuf::from("."),
    };
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "out".into());
    let tmp = dir.join(format!(".{name}.{}.tmp", std::process::id()));
    {
        let mut f = std::fs::File::create(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all().ok();
    }
    std::fs::rename(&tmp, path).inspect_err(|_| {
        let _ = std::fs::remove_file(&tmp);
    })
}

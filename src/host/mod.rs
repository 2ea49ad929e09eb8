//! The firmware configuration step, on the host (feature `host`, uses `std`).
//!
//! Describe the board once in a TOML design file; get a verdict per check with margins and the
//! worst corner, plots to choose a clamp, and the constants the firmware compiles in. Two ways
//! in: the `kickguard` command-line tool, and [`configure`] from a firmware's `build.rs`, which
//! fails the build with the reason when the design is unsafe.
//!
//! Read in this order: [`design`] (the file's schema and located errors), [`quantity`] (values
//! with units), [`analysis`] (worst case over the corners, sizing, constants), [`report`] (text
//! and JSON), [`codegen`] (Rust module and C header), [`plot`] (SVG).
//!
//! Nothing is written when the input is bad: the whole analysis runs before any file is created.

pub mod analysis;
pub mod codegen;
pub mod design;
pub mod plot;
pub mod quantity;
pub mod report;

use std::fmt;
use std::path::{Path, PathBuf};
use std::string::{String, ToString};
use std::vec::Vec;

/// Why the configuration step could not produce a result.
#[derive(Debug)]
pub enum HostError {
    /// The design file is malformed or a value is wrong: where and why.
    Input {
        /// File path.
        file: String,
        /// 1-based line.
        line: usize,
        /// 1-based column.
        column: usize,
        /// Field (dotted path where known).
        field: String,
        /// What is wrong.
        message: String,
    },
    /// A value is well-formed but the model refuses it (the field it came from, and why).
    Model {
        /// Field or part of the design.
        field: String,
        /// The model's typed error.
        error: crate::Error,
    },
    /// Reading or writing a file failed.
    Io {
        /// The path.
        path: String,
        /// The system's message.
        message: String,
    },
}

impl fmt::Display for HostError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            HostError::Input {
                file,
                line,
                column,
                field,
                message,
            } => {
                if field.is_empty() {
                    write!(f, "{file}:{line}:{column}: {message}")
                } else {
                    write!(f, "{file}:{line}:{column}: field `{field}`: {message}")
                }
            }
            HostError::Model { field, error } => write!(f, "{field}: {error}"),
            HostError::Io { path, message } => write!(f, "{path}: {message}"),
        }
    }
}

impl std::error::Error for HostError {}

/// Options of a run.
#[derive(Debug, Clone, Default)]
pub struct Options {
    /// Monte Carlo samples per driver and the seed, if wanted.
    pub monte_carlo: Option<(u32, u64)>,
}

/// Analyses a design given as text (`path` is only used in messages).
///
/// # Errors
/// [`HostError::Input`] with file, line, column and field for a bad file; [`HostError::Model`]
/// for values the models refuse.
pub fn analyse_text(
    text: &str,
    path: &str,
    options: &Options,
) -> Result<report::Report, HostError> {
    let reader = design::Reader { text, path };
    let file = design::parse_file(&reader)?;
    analysis::analyse(&file, &reader, options.monte_carlo)
}

/// Reads and analyses a design file.
///
/// # Errors
/// As [`analyse_text`], plus [`HostError::Io`] if the file cannot be read.
pub fn analyse_file(path: &Path, options: &Options) -> Result<report::Report, HostError> {
    let text = std::fs::read_to_string(path).map_err(|e| HostError::Io {
        path: path.display().to_string(),
        message: e.to_string(),
    })?;
    analyse_text(&text, &path.display().to_string(), options)
}

/// Writes every output of a report into `dir`: `report.txt`, `report.json`, `kickguard_config.rs`,
/// `kickguard_config.h` and one `plot_<driver>.svg` per driver. Returns the paths written.
///
/// # Errors
/// [`HostError::Io`] when a file cannot be written.
pub fn write_outputs(report: &report::Report, dir: &Path) -> Result<Vec<PathBuf>, HostError> {
    let io = |p: &Path| {
        let p = p.display().to_string();
        move |e: std::io::Error| HostError::Io {
            path: p.clone(),
            message: e.to_string(),
        }
    };
    std::fs::create_dir_all(dir).map_err(io(dir))?;
    let mut files: Vec<(PathBuf, String)> = Vec::new();
    files.push((dir.join("report.txt"), report.text()));
    let json = report.json().map_err(|e| HostError::Io {
        path: "report.json".to_string(),
        message: e.to_string(),
    })?;
    files.push((dir.join("report.json"), json));
    files.push((
        dir.join("kickguard_config.rs"),
        codegen::rust_module(report),
    ));
    files.push((dir.join("kickguard_config.h"), codegen::c_header(report)));
    for p in &report.plots {
        let svg = plot::svg(p).map_err(|m| HostError::Io {
            path: p.name.clone(),
            message: m,
        })?;
        files.push((
            dir.join(std::format!("plot_{}.svg", analysis::ident(&p.name))),
            svg,
        ));
    }
    let mut written = Vec::new();
    for (path, body) in files {
        std::fs::write(&path, body).map_err(io(&path))?;
        written.push(path);
    }
    Ok(written)
}

/// The call for a firmware's `build.rs`: analyses `design` and writes the outputs into `out_dir`
/// (use `OUT_DIR`); fails with the reason when the file is bad or any check fails, so the build
/// stops. Then `include!(concat!(env!("OUT_DIR"), "/kickguard_config.rs"))` in the firmware.
///
/// # Errors
/// A message for the build log: the located input error, or the report of the failed checks.
pub fn configure(
    design: impl AsRef<Path>,
    out_dir: impl AsRef<Path>,
) -> Result<report::Report, String> {
    let report = analyse_file(design.as_ref(), &Options::default()).map_err(|e| e.to_string())?;
    if report.failed() {
        return Err(std::format!(
            "kickguard: the design is unsafe as described\n{}",
            report.text()
        ));
    }
    write_outputs(&report, out_dir.as_ref()).map_err(|e| e.to_string())?;
    Ok(report)
}

//! The firmware configuration step, on the host (feature `host`, uses `std`).
//!
//! Describe the board once in a TOML design file; get a verdict per check with its value,
//! limit, margin and worst corner, plots to choose a clamp, and the constants the firmware
//! compiles in. Two ways in: the `kickguard` command-line tool, and [`configure`] from a
//! firmware's `build.rs`, which fails the build with the reason when the design is unsafe.
//!
//! The data flows one way, one job per module:
//! 1. [`file`](mod@file): the text → the file's schema, every error located `file:line:column: field`;
//! 2. [`board`]: the schema → a typed, validated board (units resolved, ranges and rules
//!    between fields checked, tolerances kept as axis ranges);
//! 3. [`corners`], [`parts`], [`figures`], [`heating`], [`sizing`], [`engine`]: each driver's
//!    corner box, its circuit and figures at any point, the values it sizes, the self-heating
//!    iteration;
//! 4. [`checks`]: verdicts from the analysed drivers; [`montecarlo`]: the same figures
//!    inside the box, against the vertex search;
//! 5. [`report`]: the result as data; [`output`]: text, JSON, SVG, Rust and C, reading only
//!    the report.
//!
//! Nothing is written when the input is bad: the whole analysis runs before any file is
//! created.

pub mod board;
pub mod checks;
pub mod corners;
pub mod engine;
pub mod figures;
pub mod file;
pub mod heating;
pub mod montecarlo;
pub mod output;
pub mod parts;
pub mod report;
pub mod sizing;

use std::fmt;
use std::path::{Path, PathBuf};
use std::string::{String, ToString};
use std::vec::Vec;

pub use montecarlo::{Distribution, Request as MonteCarlo};

/// Why the configuration step could not produce a result.
#[derive(Debug, Clone, PartialEq)]
pub enum HostError {
    /// The design file is malformed, a value is wrong, or the model refuses it: where and why.
    Input {
        /// File path.
        file: String,
        /// 1-based line.
        line: usize,
        /// 1-based column.
        column: usize,
        /// Field (dotted path as written, `driver[0].coil.inductance`).
        field: String,
        /// What is wrong.
        message: String,
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
                    write!(f, "{file}:{line}:{column}: {field}: {message}")
                }
            }
            HostError::Io { path, message } => write!(f, "{path}: {message}"),
        }
    }
}

impl std::error::Error for HostError {}

/// Words an identifier may not be in Rust (strict, reserved and the path keywords) or in C
/// (C11 and C23 keywords, for a name that reaches C without a prefix); [`ident`] appends an
/// underscore to them.
pub const RESERVED: &[&str] = &[
    "abstract",
    "alignas",
    "alignof",
    "as",
    "async",
    "auto",
    "await",
    "become",
    "bool",
    "box",
    "break",
    "case",
    "char",
    "const",
    "constexpr",
    "continue",
    "crate",
    "default",
    "do",
    "double",
    "dyn",
    "else",
    "enum",
    "extern",
    "false",
    "final",
    "float",
    "fn",
    "for",
    "gen",
    "goto",
    "if",
    "impl",
    "in",
    "inline",
    "int",
    "let",
    "long",
    "loop",
    "macro",
    "match",
    "mod",
    "move",
    "mut",
    "nullptr",
    "override",
    "priv",
    "pub",
    "ref",
    "register",
    "restrict",
    "return",
    "self",
    "short",
    "signed",
    "sizeof",
    "static",
    "static_assert",
    "struct",
    "super",
    "switch",
    "thread_local",
    "trait",
    "true",
    "try",
    "type",
    "typedef",
    "typeof",
    "typeof_unqual",
    "union",
    "unsafe",
    "unsigned",
    "unsized",
    "use",
    "virtual",
    "void",
    "volatile",
    "where",
    "while",
    "yield",
];

/// Longest identifier [`ident`] makes, in bytes.
pub const IDENT_MAX: usize = 48;

/// A C and Rust identifier from a name as written, from a safe alphabet only: ASCII letters
/// and digits kept (lower case), every run of anything else one underscore, none at either
/// end; a leading underscore before a digit; "unnamed" for a name with no letter or digit;
/// at most [`IDENT_MAX`] bytes; a keyword or reserved word of either language gets a
/// trailing underscore. No character of the name reaches generated code any other way.
pub fn ident(name: &str) -> String {
    let mut s = String::new();
    for c in name.chars() {
        if c.is_ascii_alphanumeric() {
            s.push(c.to_ascii_lowercase());
        } else if !s.is_empty() && !s.ends_with('_') {
            s.push('_');
        }
        if s.len() >= IDENT_MAX {
            break;
        }
    }
    while s.ends_with('_') {
        s.pop();
    }
    if s.is_empty() {
        s.push_str("unnamed");
    }
    if s.starts_with(|c: char| c.is_ascii_digit()) {
        s.insert(0, '_');
    }
    if RESERVED.contains(&s.as_str()) {
        s.push('_');
    }
    s
}

/// Options of a run.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct Options {
    /// A Monte Carlo run beside the vertex search, if wanted.
    pub monte_carlo: Option<MonteCarlo>,
}

/// Reads a design's text into its typed board.
///
/// # Errors
/// A located [`HostError::Input`] for the first thing wrong.
pub fn read_board(text: &str, path: &str) -> Result<board::Board, HostError> {
    let reader = file::Reader::new(text, path);
    let parsed = file::parse_file(&reader)?;
    board::convert(&parsed, &reader)
}

/// Analyses a design given as text (`path` is used in messages and the report).
///
/// # Errors
/// A located [`HostError::Input`] for a bad file or a value the models refuse.
pub fn analyse_text(
    text: &str,
    path: &str,
    options: &Options,
) -> Result<report::Report, HostError> {
    let board = read_board(text, path)?;
    report::build(&board, options.monte_carlo)
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

/// Every output of a report, as (file name, contents): `report.txt`, `report.json`,
/// `kickguard_config.rs`, `kickguard_config.h`, and per driver `plot_<module>.svg` (the worst
/// switch-voltage corner) and `plot_<module>_release.svg` (the worst release corner, with a
/// must-release voltage).
///
/// # Errors
/// A plot that cannot be drawn, or JSON that cannot be written.
pub fn render_outputs(r: &report::Report) -> Result<Vec<(String, String)>, HostError> {
    let io = |what: &str| {
        let what = what.to_string();
        move |m: String| HostError::Io {
            path: what.clone(),
            message: m,
        }
    };
    let mut files = std::vec![
        ("report.txt".to_string(), output::text::render(r)),
        (
            "report.json".to_string(),
            output::json::render(r).map_err(io("report.json"))?
        ),
        ("kickguard_config.rs".to_string(), output::rust::render(r)),
        ("kickguard_config.h".to_string(), output::c::render(r)),
    ];
    for d in &r.drivers {
        for p in &d.plots {
            let name = output::svg::file_name(p);
            files.push((name.clone(), output::svg::render(p).map_err(io(&name))?));
        }
    }
    Ok(files)
}

/// The file in an output directory that lists what the last run wrote there, one file name a
/// line, so a later run removes exactly its own files and nothing else.
pub const MANIFEST: &str = ".kickguard-outputs";

/// The file names listed in `dir`'s manifest: plain names only (no separator, no `..`), so a
/// changed manifest cannot point outside the directory.
fn listed(dir: &Path) -> Vec<String> {
    let Ok(text) = std::fs::read_to_string(dir.join(MANIFEST)) else {
        return Vec::new();
    };
    text.lines()
        .map(str::trim)
        .filter(|n| {
            !n.is_empty()
                && *n != "."
                && *n != ".."
                && !n.contains(['/', '\\', '\0'])
                && *n != MANIFEST
        })
        .map(ToString::to_string)
        .collect()
}

/// Removes the files the last run wrote into `dir` (those its manifest lists) and the
/// manifest; returns how many files were removed. A directory without a manifest is left
/// alone.
///
/// # Errors
/// [`HostError::Io`] when a listed file exists but cannot be removed.
pub fn clear_outputs(dir: &Path) -> Result<usize, HostError> {
    let mut n = 0;
    for name in listed(dir) {
        let p = dir.join(&name);
        if p.is_file() {
            std::fs::remove_file(&p).map_err(|e| HostError::Io {
                path: p.display().to_string(),
                message: e.to_string(),
            })?;
            n += 1;
        }
    }
    let _ = std::fs::remove_file(dir.join(MANIFEST));
    Ok(n)
}

/// Writes every output of a report into `dir`; returns the paths written. Everything is
/// rendered before the first file is created; files an earlier run wrote that this run does
/// not (a renamed driver's plot) are removed, and the manifest lists what is there now.
///
/// # Errors
/// [`HostError::Io`] when a file cannot be rendered or written.
pub fn write_outputs(r: &report::Report, dir: &Path) -> Result<Vec<PathBuf>, HostError> {
    let files = render_outputs(r)?;
    let io = |p: &Path| {
        let p = p.display().to_string();
        move |e: std::io::Error| HostError::Io {
            path: p.clone(),
            message: e.to_string(),
        }
    };
    std::fs::create_dir_all(dir).map_err(io(dir))?;
    clear_outputs(dir)?;
    let mut written = Vec::new();
    let mut manifest = String::new();
    for (name, body) in files {
        let path = dir.join(&name);
        std::fs::write(&path, body).map_err(io(&path))?;
        manifest.push_str(&name);
        manifest.push('\n');
        written.push(path);
    }
    let m = dir.join(MANIFEST);
    std::fs::write(&m, manifest).map_err(io(&m))?;
    Ok(written)
}

/// The call for a firmware's `build.rs`: analyses `design` and writes the outputs into `out_dir`
/// (use `OUT_DIR`); fails with the reason when the file is bad or any check fails, so the build
/// stops. Then `include!(concat!(env!("OUT_DIR"), "/kickguard_config.rs"))` in the firmware.
/// A failed design still writes its outputs, and its constants stop any build that includes
/// them (`compile_error!`, `#error`); a bad file removes what an earlier run wrote.
///
/// # Errors
/// A message for the build log: the located input error, or the report of the failed checks.
pub fn configure(
    design: impl AsRef<Path>,
    out_dir: impl AsRef<Path>,
) -> Result<report::Report, String> {
    let r = match analyse_file(design.as_ref(), &Options::default()) {
        Ok(r) => r,
        Err(e) => {
            let _ = clear_outputs(out_dir.as_ref());
            return Err(e.to_string());
        }
    };
    write_outputs(&r, out_dir.as_ref()).map_err(|e| e.to_string())?;
    if r.failed() {
        return Err(std::format!(
            "kickguard: the design is unsafe as described\n{}",
            output::text::render(&r)
        ));
    }
    Ok(r)
}

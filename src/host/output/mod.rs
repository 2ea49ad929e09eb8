//! The outputs, each a function of the [`super::report::Report`] alone: the readable text, the
//! JSON for machines (schema in `schema/report.schema.json`), SVG plots, and the constants as
//! a Rust module and a C header.

pub mod c;
pub mod json;
pub mod rust;
pub mod safe;
pub mod show;
pub mod svg;
pub mod text;

use super::checks::Constant;
use super::report::Report;
use std::collections::BTreeMap;
use std::string::String;
use std::vec::Vec;

/// Constants and tables grouped by module, the board's first (module "").
pub fn by_module(
    report: &Report,
) -> BTreeMap<String, (Vec<&Constant>, Vec<&super::checks::WindowTable>)> {
    let mut m: BTreeMap<String, (Vec<&Constant>, Vec<&super::checks::WindowTable>)> =
        BTreeMap::new();
    for c in report.constants() {
        m.entry(c.scope.clone()).or_default().0.push(c);
    }
    for d in &report.drivers {
        for w in &d.outcome.windows {
            m.entry(w.scope.clone()).or_default().1.push(w);
        }
    }
    m
}

/// The failed checks as `subject.check` in the safe alphabet of identifiers (for the line
/// that stops a firmware build); None when nothing failed.
pub fn failed_list(report: &Report) -> Option<String> {
    let failed: Vec<String> = report
        .checks()
        .filter(|c| c.status == super::checks::Status::Fail)
        .map(|c| std::format!("{}.{}", super::ident(&c.subject), super::ident(&c.id)))
        .collect();
    (!failed.is_empty()).then(|| failed.join(", "))
}

/// The condition codes of the diagnosis tables, in words.
pub fn condition_codes() -> String {
    crate::diagnosis::Condition::ALL
        .iter()
        .map(|c| {
            std::format!(
                "{} = {}",
                c.code(),
                super::checks::diagnosis::condition_words(*c)
            )
        })
        .collect::<Vec<_>>()
        .join(", ")
}

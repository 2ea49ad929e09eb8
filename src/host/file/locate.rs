//! Where things are in the design file: byte spans to `line:column`, and a span to the dotted
//! path of the field that holds it (`driver[0].coil.inductance`), as the caller wrote it.

use super::super::HostError;
use std::collections::BTreeMap;
use std::ops::Range;
use std::string::{String, ToString};
use toml::de::{DeTable, DeValue};
use toml::Spanned;

/// The design file's text, its path for messages, and the span of every field in it.
pub struct Reader<'a> {
    /// The file's text.
    pub text: &'a str,
    /// Its path, for messages.
    pub path: &'a str,
    /// Field path → span of its value (built once from the spanned syntax tree).
    fields: BTreeMap<String, Range<usize>>,
}

impl<'a> Reader<'a> {
    /// A reader over `text`; the field map is empty if the text does not parse as TOML (the
    /// parse error itself is then the first error reported).
    pub fn new(text: &'a str, path: &'a str) -> Self {
        let mut fields = BTreeMap::new();
        if let Ok(root) = DeTable::parse(text) {
            collect(root.get_ref(), "", &mut fields);
        }
        Reader { text, path, fields }
    }

    /// 1-based line and column of a byte offset.
    pub fn position(&self, offset: usize) -> (usize, usize) {
        let before = self.text.get(..offset).unwrap_or(self.text);
        let line = before.matches('\n').count() + 1;
        let col = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
        (line, col)
    }

    /// A located error at `span` about `field`.
    pub fn error(&self, span: Range<usize>, field: &str, message: impl Into<String>) -> HostError {
        let (line, column) = self.position(span.start);
        HostError::Input {
            file: self.path.to_string(),
            line,
            column,
            field: field.to_string(),
            message: message.into(),
        }
    }

    /// The span of `field`'s value, or of the innermost table that holds it (a missing field is
    /// reported where its table is), or the start of the file.
    pub fn span_of(&self, field: &str) -> Range<usize> {
        let mut path = field;
        loop {
            if let Some(s) = self.fields.get(path) {
                return s.clone();
            }
            match path.rfind('.') {
                Some(k) => path = &path[..k],
                None => return 0..0,
            }
        }
    }

    /// A located error about `field` (at its value, or at its table when it is missing).
    pub fn at(&self, field: &str, message: impl Into<String>) -> HostError {
        self.error(self.span_of(field), field, message)
    }

    /// Every field's `line:column`, for errors found after the file is converted (a model's
    /// refusal at a corner, a sizing that finds no part).
    pub fn places(&self) -> Places {
        Places {
            path: self.path.to_string(),
            at: self
                .fields
                .iter()
                .map(|(k, s)| (k.clone(), self.position(s.start)))
                .collect(),
        }
    }

    /// The innermost field whose value contains `offset` (for errors the parser locates only
    /// by a span: a wrong type, an unknown key).
    pub fn field_at(&self, offset: usize) -> Option<String> {
        self.fields
            .iter()
            .filter(|(_, s)| s.start <= offset && offset < s.end.max(s.start + 1))
            .min_by_key(|(_, s)| s.end - s.start)
            .map(|(k, _)| k.clone())
    }
}

/// Records every key's value span under its dotted path (array elements as `name[k]`).
fn collect(table: &DeTable<'_>, prefix: &str, out: &mut BTreeMap<String, Range<usize>>) {
    for (key, value) in table.iter() {
        let path = if prefix.is_empty() {
            key.get_ref().to_string()
        } else {
            std::format!("{prefix}.{}", key.get_ref())
        };
        // The key's own span counts too, so an error pointing at the key finds its field.
        let span = key.span().start.min(value.span().start)..value.span().end;
        out.insert(path.clone(), span);
        visit(value, &path, out);
    }
}

fn visit(value: &Spanned<DeValue<'_>>, path: &str, out: &mut BTreeMap<String, Range<usize>>) {
    match value.get_ref() {
        DeValue::Table(t) => collect(t, path, out),
        DeValue::Array(a) => {
            for (k, item) in a.iter().enumerate() {
                let p = std::format!("{path}[{k}]");
                out.insert(p.clone(), item.span());
                visit(item, &p, out);
            }
        }
        _ => {}
    }
}

/// Where each field of a design file is, kept with the typed board so that a refusal found
/// during the analysis is located as precisely as one found while reading.
#[derive(Debug, Clone, Default)]
pub struct Places {
    /// The file's path.
    pub path: String,
    at: BTreeMap<String, (usize, usize)>,
}

impl Places {
    /// A located error about `field` (at its value, or at the innermost table that holds it).
    pub fn error(&self, field: &str, message: impl Into<String>) -> HostError {
        let mut path = field;
        let (line, column) = loop {
            if let Some(p) = self.at.get(path) {
                break *p;
            }
            match path.rfind('.') {
                Some(k) => path = &path[..k],
                None => break (1, 1),
            }
        };
        HostError::Input {
            file: self.path.clone(),
            line,
            column,
            field: field.to_string(),
            message: message.into(),
        }
    }
}

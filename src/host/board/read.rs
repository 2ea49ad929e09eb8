//! Reading one value of the file into its type: the unit resolved, the physical range checked,
//! every refusal located at the field as written.

use crate::host::file::quantity::{self, Unit};
use crate::host::file::{Reader, Q};
use crate::host::HostError;
use std::format;
use std::string::String;

/// An accepted range of a field, in its SI unit, with the wording shown in errors.
#[derive(Debug, Clone, Copy)]
pub struct Range {
    /// Lowest accepted value.
    pub lo: f64,
    /// Highest accepted value.
    pub hi: f64,
    /// How the range is shown ("1 µH … 1000 H").
    pub shown: &'static str,
}

/// Shorthand for a [`Range`].
pub const fn range(lo: f64, hi: f64, shown: &'static str) -> Range {
    Range { lo, hi, shown }
}

/// Reads quantities through the reader.
pub trait ReadQ {
    /// The value of `q` in its SI unit (°C stays °C, % becomes a fraction), inside `r`.
    ///
    /// # Errors
    /// A located error when the text does not parse in `unit` or the value is outside `r`.
    fn q(&self, q: &Q, field: &str, unit: Unit, r: Range) -> Result<f32, HostError>;

    /// An optional quantity.
    ///
    /// # Errors
    /// As [`ReadQ::q`].
    fn oq(
        &self,
        q: &Option<Q>,
        field: &str,
        unit: Unit,
        r: Range,
    ) -> Result<Option<f32>, HostError> {
        q.as_ref().map(|q| self.q(q, field, unit, r)).transpose()
    }

    /// A quantity the field's table must have.
    ///
    /// # Errors
    /// A located error at the table when missing, else as [`ReadQ::q`].
    fn req(&self, q: &Option<Q>, field: &str, unit: Unit, r: Range) -> Result<f32, HostError>;

    /// A library refusal, located at `field`, in the library's words.
    fn model(&self, field: &str, e: crate::Error) -> HostError;
}

impl ReadQ for Reader<'_> {
    fn q(&self, q: &Q, field: &str, unit: Unit, r: Range) -> Result<f32, HostError> {
        let v = quantity::parse(q.get_ref(), unit).map_err(|m| self.error(q.span(), field, m))?;
        if !(v >= r.lo && v <= r.hi) {
            return Err(self.error(
                q.span(),
                field,
                format!(
                    "\"{}\" is outside the accepted {}",
                    q.get_ref().trim(),
                    r.shown
                ),
            ));
        }
        Ok(v as f32)
    }

    fn req(&self, q: &Option<Q>, field: &str, unit: Unit, r: Range) -> Result<f32, HostError> {
        match q {
            Some(q) => self.q(q, field, unit, r),
            None => Err(self.at(field, format!("missing; expected e.g. {}", unit.example()))),
        }
    }

    fn model(&self, field: &str, e: crate::Error) -> HostError {
        self.at(field, refusal(&e))
    }
}

/// A library error in words: "the model refuses it: start current must be greater than zero".
pub fn refusal(e: &crate::Error) -> String {
    format!("the model refuses it: {e}")
}

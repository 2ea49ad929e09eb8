//! A check's verdict as data: status, value with its unit, limit, corner, note, the figure
//! behind it and its Monte Carlo spread.

use super::Metric;
use std::string::{String, ToString};
use std::vec::Vec;

/// A check's verdict.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Status {
    /// Within its limit at every corner.
    Pass,
    /// Beyond its limit at some corner: the design is unsafe or does not work as asked.
    Fail,
    /// Not judged, or judged on incomplete data: read the note.
    Warn,
    /// A figure without a limit.
    Info,
}

/// The unit of a check's value (SI; the text output picks a prefix).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Unit {
    /// V
    Volt,
    /// A
    Ampere,
    /// s
    Second,
    /// J
    Joule,
    /// W
    Watt,
    /// °C
    Celsius,
    /// K (a temperature difference)
    Kelvin,
    /// Hz
    Hertz,
    /// Ω
    Ohm,
    /// a fraction, shown in %
    Fraction,
    /// a count (pulses, ticks)
    Count,
}

impl Unit {
    /// The SI symbol, as the JSON states it.
    pub fn symbol(self) -> &'static str {
        match self {
            Unit::Volt => "V",
            Unit::Ampere => "A",
            Unit::Second => "s",
            Unit::Joule => "J",
            Unit::Watt => "W",
            Unit::Celsius => "°C",
            Unit::Kelvin => "K",
            Unit::Hertz => "Hz",
            Unit::Ohm => "Ω",
            Unit::Fraction => "1",
            Unit::Count => "count",
        }
    }
}

/// Which side of the limit is safe.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Bound {
    /// The value must not exceed the limit.
    AtMost,
    /// The value must not fall below the limit.
    AtLeast,
}

/// A check's limit.
#[derive(Debug, Clone, PartialEq)]
pub struct Limit {
    /// The limit, in the check's unit.
    pub value: f32,
    /// Which side is safe.
    pub bound: Bound,
    /// Where it comes from ("90 % of the 60 V rating").
    pub source: String,
}

/// One axis of a corner as numbers: its machine name, its value in SI (a tolerance axis as
/// its scale factor, 1.07 for +7 %) and the unit.
#[derive(Debug, Clone, PartialEq)]
pub struct AxisValue {
    /// Machine name ("supply", "winding_temperature", "resistance_scale").
    pub name: &'static str,
    /// The value.
    pub value: f32,
    /// Its unit ("V", "°C", "1" for a scale factor).
    pub unit: &'static str,
}

/// Where a check's value was found.
#[derive(Debug, Clone, PartialEq)]
pub enum Corner {
    /// At this vertex: in words (naming only the axes that move the figure) and as numbers
    /// (the same axes).
    At(String, Vec<AxisValue>),
    /// Every vertex gives the same value.
    Ties,
    /// Not a corner of the box (a board-wide figure, a sizing): said in words.
    Stated(String),
}

/// The Monte Carlo spread of a check's figure.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Spread {
    /// Smallest sample.
    pub min: f32,
    /// Median sample.
    pub median: f32,
    /// Largest sample.
    pub max: f32,
    /// Samples beyond the reported worst value by more than [`MC_TOLERANCE`] (relative): a
    /// corner search that missed the worst case. Zero when the search is right.
    pub beyond: u32,
}

/// The numerical tolerance of the comparison between the vertex search and the Monte Carlo
/// samples: both come from the same f32 engine, whose figures move by about 1e-6 relative
/// from one evaluation to a nearby one, so 1e-4 relative (or 1e-9 absolute) separates noise
/// from a missed corner.
pub const MC_TOLERANCE: f32 = 1e-4;

/// One verdict.
#[derive(Debug, Clone, PartialEq)]
pub struct Check {
    /// Name of the driver or input as written, or "board".
    pub subject: String,
    /// Stable machine name ("switch_voltage").
    pub id: String,
    /// What it checks, in words.
    pub title: String,
    /// The verdict.
    pub status: Status,
    /// The worst value, in `unit` (None for a verdict without a number).
    pub value: Option<f32>,
    /// The value's unit.
    pub unit: Unit,
    /// The value in words where a number says less ("comparator never trips", "repetitively").
    pub shown: Option<String>,
    /// The limit, if any.
    pub limit: Option<Limit>,
    /// Where the value was found.
    pub corner: Corner,
    /// What the reader should know.
    pub note: String,
    /// The figure behind the value, for the Monte Carlo comparison.
    pub metric: Option<Metric>,
    /// The Monte Carlo spread, when a run was asked for.
    pub spread: Option<Spread>,
}

impl Check {
    /// A check with a value and an optional limit; the status follows from them (Info
    /// without a limit).
    pub fn valued(
        subject: &str,
        id: &str,
        title: &str,
        value: f32,
        unit: Unit,
        limit: Option<Limit>,
        corner: Corner,
    ) -> Check {
        let status = match &limit {
            None => Status::Info,
            Some(l) => {
                let ok = match l.bound {
                    Bound::AtMost => value <= l.value,
                    Bound::AtLeast => value >= l.value,
                };
                if ok {
                    Status::Pass
                } else {
                    Status::Fail
                }
            }
        };
        Check {
            subject: subject.to_string(),
            id: id.to_string(),
            title: title.to_string(),
            status,
            value: Some(value),
            unit,
            shown: None,
            limit,
            corner,
            note: String::new(),
            metric: None,
            spread: None,
        }
    }

    /// A verdict in words (no number).
    pub fn worded(
        subject: &str,
        id: &str,
        title: &str,
        status: Status,
        shown: &str,
        corner: Corner,
    ) -> Check {
        Check {
            subject: subject.to_string(),
            id: id.to_string(),
            title: title.to_string(),
            status,
            value: None,
            unit: Unit::Count,
            shown: Some(shown.to_string()),
            limit: None,
            corner,
            note: String::new(),
            metric: None,
            spread: None,
        }
    }

    /// The check with a note.
    pub fn noted(mut self, note: impl Into<String>) -> Check {
        self.note = note.into();
        self
    }

    /// The check tied to a figure (for the Monte Carlo comparison).
    pub fn of(mut self, m: Metric) -> Check {
        self.metric = Some(m);
        self
    }

    /// The check with its value in words.
    pub fn showing(mut self, s: impl Into<String>) -> Check {
        self.shown = Some(s.into());
        self
    }

    /// The check with a count as its value (a survivable number of switch-offs; none for
    /// "repetitively", which the words say).
    pub fn counted(mut self, n: f32) -> Check {
        self.value = (n < crate::host::figures::REPETITIVE).then_some(n);
        self.unit = Unit::Count;
        self
    }

    /// The check with another status.
    pub fn with_status(mut self, s: Status) -> Check {
        self.status = s;
        self
    }

    /// The margin to the limit, relative to the limit: positive inside, negative beyond.
    pub fn margin(&self) -> Option<f32> {
        let (v, l) = (self.value?, self.limit.as_ref()?);
        if l.value == 0.0 {
            return None;
        }
        Some(match l.bound {
            Bound::AtMost => (l.value - v) / l.value.abs(),
            Bound::AtLeast => (v - l.value) / l.value.abs(),
        })
    }
}

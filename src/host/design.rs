//! The design description file (TOML): its schema, and its conversion into validated values
//! with the file, line, column and field of every error.
//!
//! Every dimensional value is a string with its unit (see [`super::quantity`]); unknown fields are
//! rejected. `examples/greenhouse.toml` is the annotated reference example.

use super::quantity::{self, Unit};
use super::HostError;
use serde::Deserialize;
use std::string::{String, ToString};
use std::vec::Vec;
use toml::Spanned;

/// A quantity as written in the file, with its position.
pub type Q = Spanned<String>;

/// The whole design file.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DesignFile {
    /// Title for the report.
    pub title: String,
    /// Timer tick rate of the generated wait times and diagnosis windows.
    pub tick_rate: Q,
    /// Clock of the PWM timer (for compare values); optional.
    pub pwm_timer_clock: Option<Q>,
    /// Temperatures.
    pub environment: Environment,
    /// Supplies, referred to by name.
    #[serde(default)]
    pub supply: Vec<Supply>,
    /// Coil drivers.
    #[serde(default)]
    pub driver: Vec<Driver>,
    /// The microcontroller pins' common data.
    pub pins: Option<Pins>,
    /// Inputs into the pins.
    #[serde(default)]
    pub input: Vec<Input>,
}

/// Temperatures of the enclosure and the coils' self-heating.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Environment {
    /// Coldest ambient.
    pub ambient_min: Q,
    /// Hottest ambient.
    pub ambient_max: Q,
    /// How far a coil's winding rises above ambient when on.
    pub coil_self_heating: Q,
}

/// A supply rail.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Supply {
    /// Name the drivers use.
    pub name: String,
    /// Nominal voltage.
    pub nominal: Q,
    /// Lowest voltage.
    pub min: Q,
    /// Highest voltage.
    pub max: Q,
}

/// A coil driver.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Driver {
    /// Name, also the name of its generated constants' module.
    pub name: String,
    /// How many identical drivers.
    #[serde(default = "one")]
    pub count: u32,
    /// Name of its supply.
    pub supply: String,
    /// The coil.
    pub coil: CoilSpec,
    /// The low-side switch.
    pub switch: SwitchSpec,
    /// The suppression.
    pub clamp: ClampSpec,
    /// PWM peak-and-hold, if used.
    pub hold: Option<HoldSpec>,
    /// Diagnosis, if wanted.
    pub diagnosis: Option<DiagnosisSpec>,
}

fn one() -> u32 {
    1
}

/// The coil's data.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CoilSpec {
    /// Inductance.
    pub inductance: Q,
    /// Inductance tolerance (± %).
    pub inductance_tolerance: Q,
    /// Winding resistance at `resistance_at`.
    pub resistance: Q,
    /// Resistance tolerance (± %).
    pub resistance_tolerance: Q,
    /// Temperature of the stated resistance (copper coefficient of IEC 60028 applies).
    pub resistance_at: Q,
    /// Must-operate voltage as a share of the nominal supply, at `resistance_at`; optional.
    pub must_operate: Option<Q>,
    /// Must-release voltage as a share of the nominal supply; optional.
    pub must_release: Option<Q>,
    /// Mechanical release time; optional.
    pub mechanical_release: Option<Q>,
}

/// The switch's ratings.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SwitchSpec {
    /// Voltage rating (for example V(BR)DSS min).
    pub rating: Q,
    /// Share of the rating the peak may reach.
    pub derating: Q,
    /// Voltage at which it avalanches (what an open clamp lets the drain reach).
    pub avalanche: Q,
    /// Single-pulse avalanche energy rating; optional.
    pub avalanche_energy: Option<Q>,
    /// Junction-to-ambient thermal resistance; optional.
    pub thermal_resistance: Option<Q>,
    /// Maximum junction temperature; optional.
    pub junction_max: Option<Q>,
}

/// The suppression.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ClampSpec {
    /// One of: diode, resistor+diode, zener+diode, tvs-to-ground, avalanche, h-bridge, rc-snubber.
    pub kind: Spanned<String>,
    /// silicon or schottky (diode kinds).
    pub diode: Option<Spanned<String>>,
    /// Zener voltage at its test current, or "auto" to size it.
    pub zener: Option<Q>,
    /// Zener test current.
    pub zener_test_current: Option<Q>,
    /// Zener dynamic resistance.
    pub zener_resistance: Option<Q>,
    /// Zener temperature coefficient (%/K).
    pub zener_tempco: Option<Q>,
    /// Zener continuous power rating; optional.
    pub zener_power: Option<Q>,
    /// Series resistor (resistor+diode, rc-snubber).
    pub resistor: Option<Q>,
    /// Snubber capacitor (rc-snubber).
    pub capacitor: Option<Q>,
    /// TVS breakdown voltage (tvs-to-ground).
    pub tvs: Option<Q>,
    /// TVS single-pulse energy rating; optional.
    pub tvs_energy: Option<Q>,
    /// Longest acceptable time from switch-off to release; optional requirement.
    pub max_release_time: Option<Q>,
    /// Switch-offs per second at most, for average power; optional.
    pub switching_rate: Option<Q>,
}

/// PWM peak-and-hold.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct HoldSpec {
    /// Current to reach before holding.
    pub pull_in_current: Q,
    /// Mean current to hold.
    pub hold_current: Q,
    /// PWM frequency, or "auto" to meet `max_ripple`.
    pub frequency: Q,
    /// Largest peak-to-peak ripple (needed with "auto").
    pub max_ripple: Option<Q>,
}

/// Diagnosis by drain comparators.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DiagnosisSpec {
    /// Comparator thresholds on the switch node.
    pub comparator: Vec<Q>,
    /// Guard band added to every window.
    pub guard: Q,
    /// Share of turns shorted in the shorted-turns fault.
    pub shorted_turns: Q,
}

/// The microcontroller pins.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Pins {
    /// Nominal pin supply.
    pub supply: Q,
    /// Lowest pin supply.
    pub supply_min: Q,
    /// silicon, schottky, or a fixed drop such as "0.3 V".
    pub clamp: Spanned<String>,
    /// Hottest microcontroller.
    pub max_temperature: Q,
    /// Injection limit per pin (both directions).
    pub injection_limit: Q,
    /// Injection limit summed over all pins.
    pub total_injection_limit: Q,
    /// The rail's minimum load current; optional (rail-on check).
    pub rail_min_load: Option<Q>,
    /// Pin leakage current; optional (with `leakage_error`).
    pub leakage: Option<Q>,
    /// Error voltage the leakage may cause across the resistor.
    pub leakage_error: Option<Q>,
    /// The unpowered rail's load as a resistance; optional (rail-off check).
    pub rail_off_load: Option<Q>,
    /// Voltage the unpowered rail may be pushed to.
    pub rail_off_allowed: Option<Q>,
}

/// An input line.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Input {
    /// Name, also its constants' module.
    pub name: String,
    /// How many identical inputs.
    #[serde(default = "one")]
    pub count: u32,
    /// The drain-sense line of this driver (range derived from it, open-diode case included).
    pub drain_of: Option<String>,
    /// Lowest steady signal.
    pub signal_min: Option<Q>,
    /// Highest steady signal.
    pub signal_max: Option<Q>,
    /// Lowest transient signal.
    pub transient_min: Option<Q>,
    /// Highest transient signal.
    pub transient_max: Option<Q>,
    /// Transient duration.
    pub transient_width: Option<Q>,
    /// Series resistor, or "auto".
    pub series_resistor: Q,
}

/// Turns spans into file positions and raw strings into numbers, with located errors.
pub struct Reader<'a> {
    /// The file's text.
    pub text: &'a str,
    /// Its path, for messages.
    pub path: &'a str,
}

impl Reader<'_> {
    /// 1-based line and column of a byte offset.
    pub fn position(&self, offset: usize) -> (usize, usize) {
        let before = self.text.get(..offset).unwrap_or(self.text);
        let line = before.matches('\n').count() + 1;
        let col = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
        (line, col)
    }

    /// An error at `span` about `field`.
    pub fn error(
        &self,
        span: core::ops::Range<usize>,
        field: &str,
        message: impl Into<String>,
    ) -> HostError {
        let (line, column) = self.position(span.start);
        HostError::Input {
            file: self.path.to_string(),
            line,
            column,
            field: field.to_string(),
            message: message.into(),
        }
    }

    /// The value of a quantity field in its SI unit.
    ///
    /// # Errors
    /// A located error when the text does not parse in `unit`.
    pub fn q(&self, q: &Q, field: &str, unit: Unit) -> Result<f32, HostError> {
        let v = quantity::parse(q.get_ref(), unit).map_err(|m| self.error(q.span(), field, m))?;
        if v.abs() > 1e12 {
            return Err(self.error(q.span(), field, "value out of range"));
        }
        Ok(v as f32)
    }

    /// An optional quantity.
    ///
    /// # Errors
    /// As [`Reader::q`].
    pub fn oq(&self, q: &Option<Q>, field: &str, unit: Unit) -> Result<Option<f32>, HostError> {
        q.as_ref().map(|q| self.q(q, field, unit)).transpose()
    }

    /// A required optional field.
    ///
    /// # Errors
    /// A located error at `at` when missing, else as [`Reader::q`].
    pub fn req(
        &self,
        q: &Option<Q>,
        at: core::ops::Range<usize>,
        field: &str,
        unit: Unit,
    ) -> Result<f32, HostError> {
        match q {
            Some(q) => self.q(q, field, unit),
            None => Err(self.error(
                at,
                field,
                std::format!("missing; expected e.g. {}", unit.example()),
            )),
        }
    }

    /// True when the quantity is written "auto".
    pub fn is_auto(q: &Q) -> bool {
        q.get_ref().trim() == "auto"
    }
}

/// Parses the file's text.
///
/// # Errors
/// A located error for malformed TOML, unknown fields, missing fields and wrong types.
pub fn parse_file(reader: &Reader<'_>) -> Result<DesignFile, HostError> {
    toml::from_str(reader.text).map_err(|e| {
        let span = e.span().unwrap_or(0..0);
        let field = e.message().split('`').nth(1).unwrap_or("").to_string();
        reader.error(span, &field, e.message().trim().to_string())
    })
}

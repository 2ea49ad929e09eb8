//! A supply's profile: the steady range plus named transient events (a voltage held for a
//! duration), from a named preset and the file's own `[[supply.event]]` tables, and what
//! protects the supply against reverse polarity. The checks are in
//! [`crate::host::checks::supply`].
//!
//! Presets, each event with the published standard that defines it (the values as that
//! standard's tables give them; where a value is recalled rather than read, the source says
//! "from memory"):
//! - `iso16750-2-12v` / `-clamped`: ISO 16750-2 (road vehicles, electrical loads), 12 V
//!   system: load dump test A, unsuppressed, U_s up to 101 V for up to 400 ms (Table "load dump
//!   pulse", 79 ≤ U_s ≤ 101 V, 40 ≤ t_d ≤ 400 ms); with centralized suppression (test B), U_s*
//!   = 35 V; long-term overvoltage 18 V for 60 min and jump start 24 V for 60 s, reversed
//!   voltage 14 V for 60 s (these three from memory);
//! - `iso16750-2-24v` / `-clamped`: the same standard, 24 V system: load dump test A up to
//!   202 V for up to 350 ms (151 ≤ U_s ≤ 202 V, 100 ≤ t_d ≤ 350 ms); test B U_s* = 58 V (the
//!   standard's typical value, as agreed with the customer); long-term overvoltage 36 V for
//!   60 min and reversed voltage 28 V for 60 s (from memory);
//! - `iec61131-2-24v`: IEC 61131-2 (programmable controllers, equipment requirements), 24 V DC
//!   supply: the rated 24 V from −15 % to +20 %, 20.4 … 28.8 V, continuously (from memory).
//!
//! A load dump's source impedance (R_i, 0.5 … 8 Ω in the standard) is left out: the event's
//! voltage is taken at the driver's supply terminal, which can only overstate it.

use super::read::{range, ReadQ};
use crate::host::file::quantity::Unit;
use crate::host::file::{self, Reader};
use crate::host::HostError;
use crate::units::{Farads, Ohms};
use std::format;
use std::string::{String, ToString};
use std::vec::Vec;

/// One transient event of a supply.
#[derive(Debug, Clone, PartialEq)]
pub struct Event {
    /// Its name ("load dump, suppressed (test B)").
    pub name: String,
    /// The supply's voltage during the event, V (negative: reversed polarity).
    pub voltage: f32,
    /// How long it lasts, s.
    pub duration: f32,
    /// The standard that defines it, or "design file".
    pub source: String,
}

/// What stands between a reversed supply and the drivers.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Protection {
    /// Nothing.
    None,
    /// A series diode in the supply.
    SeriesDiode,
    /// A reverse-polarity MOSFET in the supply.
    Mosfet,
}

/// A supply's profile.
#[derive(Debug, Clone, PartialEq)]
pub struct SupplyProfile {
    /// The supply's field (`supply[1]`).
    pub field: String,
    /// The events, presets first.
    pub events: Vec<Event>,
    /// The reverse-polarity protection.
    pub protection: Protection,
    /// The wiring's resistance from the supply to the driver, for the reverse current, if
    /// given.
    pub wiring: Option<Ohms>,
    /// Whether the supply sinks current (then returned energy is taken by it).
    pub sinks: bool,
    /// The rail's bulk capacitance, if given.
    pub bulk: Option<Farads>,
    /// The least current the rail's loads draw during a decay, A.
    pub load: f32,
    /// The highest voltage the parts on the rail tolerate, if given.
    pub limit: Option<f32>,
}

fn event(name: &str, voltage: f32, duration: f32, source: &str) -> Event {
    Event {
        name: name.to_string(),
        voltage,
        duration,
        source: source.to_string(),
    }
}

/// The preset names, for the error message.
pub const PRESETS: [&str; 5] = [
    "iso16750-2-12v",
    "iso16750-2-12v-clamped",
    "iso16750-2-24v",
    "iso16750-2-24v-clamped",
    "iec61131-2-24v",
];

/// The events of a preset; None for an unknown name.
pub fn preset(name: &str) -> Option<Vec<Event>> {
    const ISO: &str = "ISO 16750-2";
    const MEM: &str = "ISO 16750-2 (from memory)";
    Some(match name {
        "iso16750-2-12v" | "iso16750-2-12v-clamped" => std::vec![
            if name.ends_with("clamped") {
                event("load dump, centrally suppressed (test B)", 35.0, 0.4, ISO)
            } else {
                event("load dump, unsuppressed (test A)", 101.0, 0.4, ISO)
            },
            event("long-term overvoltage", 18.0, 3600.0, MEM),
            event("jump start", 24.0, 60.0, MEM),
            event("reversed voltage", -14.0, 60.0, MEM),
        ],
        "iso16750-2-24v" | "iso16750-2-24v-clamped" => std::vec![
            if name.ends_with("clamped") {
                event("load dump, centrally suppressed (test B)", 58.0, 0.35, ISO)
            } else {
                event("load dump, unsuppressed (test A)", 202.0, 0.35, ISO)
            },
            event("long-term overvoltage", 36.0, 3600.0, MEM),
            event("reversed voltage", -28.0, 60.0, MEM),
        ],
        "iec61131-2-24v" => std::vec![
            event(
                "rated 24 V, upper tolerance (+20 %)",
                28.8,
                3600.0,
                "IEC 61131-2 (from memory)"
            ),
            event(
                "rated 24 V, lower tolerance (−15 %)",
                20.4,
                3600.0,
                "IEC 61131-2 (from memory)"
            ),
        ],
        _ => return None,
    })
}

/// Converts supply `k`'s profile fields (None when it has none).
///
/// # Errors
/// A located error for an unknown preset or protection, and for an event out of range.
pub fn convert(
    r: &Reader<'_>,
    k: usize,
    s: &file::Supply,
) -> Result<Option<SupplyProfile>, HostError> {
    let field = format!("supply[{k}]");
    let at = |x: &str| format!("{field}.{x}");
    let mut events = match &s.profile {
        None => Vec::new(),
        Some(p) => preset(p.get_ref().trim()).ok_or_else(|| {
            r.at(
                &at("profile"),
                format!(
                    "unknown profile \"{}\"; expected one of {}",
                    p.get_ref(),
                    PRESETS.join(", ")
                ),
            )
        })?,
    };
    for (j, e) in s.event.iter().enumerate() {
        let ef = |x: &str| format!("{field}.event[{j}].{x}");
        let voltage = r.q(
            &e.voltage,
            &ef("voltage"),
            Unit::Volt,
            range(-1000.0, 1000.0, "−1000 … 1000 V"),
        )?;
        let duration = r.q(
            &e.duration,
            &ef("duration"),
            Unit::Second,
            range(1e-6, 1e6, "1 µs … 10⁶ s"),
        )?;
        events.push(Event {
            name: e.name.get_ref().clone(),
            voltage,
            duration,
            source: "design file".into(),
        });
    }
    let protection = protection(r, &at("reverse_protection"), s)?;
    let wiring = r
        .oq(
            &s.wiring_resistance,
            &at("wiring_resistance"),
            Unit::Ohm,
            range(1e-4, 1e3, "0.1 mΩ … 1 kΩ"),
        )?
        .map(|w| Ohms::new(w).map_err(|e| r.model(&at("wiring_resistance"), e)))
        .transpose()?;
    let (sinks, bulk, load, limit) = rail(r, &at, s)?;
    let any_rail =
        s.sinks_current.is_some() || bulk.is_some() || s.rail_load.is_some() || limit.is_some();
    if events.is_empty() && s.reverse_protection.is_none() && wiring.is_none() && !any_rail {
        return Ok(None);
    }
    Ok(Some(SupplyProfile {
        field,
        events,
        protection,
        wiring,
        sinks,
        bulk,
        load,
        limit,
    }))
}

/// What blocks a reversed supply.
fn protection(r: &Reader<'_>, field: &str, s: &file::Supply) -> Result<Protection, HostError> {
    match s.reverse_protection.as_ref().map(|p| p.get_ref().trim()) {
        None | Some("none") => Ok(Protection::None),
        Some("series-diode") => Ok(Protection::SeriesDiode),
        Some("mosfet") => Ok(Protection::Mosfet),
        Some(other) => Err(r.at(
            field,
            format!("\"{other}\" is not a protection; expected \"none\", \"series-diode\" or \"mosfet\""),
        )),
    }
}

/// The rail's fields for returned energy: (sinks current, bulk capacitance, load current A,
/// limit V).
#[allow(clippy::type_complexity)]
fn rail(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    s: &file::Supply,
) -> Result<(bool, Option<Farads>, f32, Option<f32>), HostError> {
    let bulk = r
        .oq(
            &s.bulk_capacitance,
            &at("bulk_capacitance"),
            Unit::Farad,
            range(1e-9, 10.0, "1 nF … 10 F"),
        )?
        .map(|c| Farads::new(c).map_err(|e| r.model(&at("bulk_capacitance"), e)))
        .transpose()?;
    let load = r
        .oq(
            &s.rail_load,
            &at("rail_load"),
            Unit::Amp,
            range(0.0, 1e3, "0 … 1000 A"),
        )?
        .unwrap_or(0.0);
    let limit = r.oq(
        &s.rail_limit,
        &at("rail_limit"),
        Unit::Volt,
        range(0.1, 1e4, "0.1 V … 10 kV"),
    )?;
    let sinks = s.sinks_current.as_ref().is_some_and(|b| *b.get_ref());
    Ok((sinks, bulk, load, limit))
}

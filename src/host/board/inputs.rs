//! The microcontroller's pins and the input lines into them, read and checked.

use super::read::{range, ReadQ};
use super::{DriverBoard, InputBoard, InputsBoard, SignalSource};
use crate::diode::{Diode, DiodeParams};
use crate::host::file::quantity::{self, Unit};
use crate::host::file::{self, DesignFile, Reader};
use crate::host::HostError;
use crate::units::{Amps, Ohms, Seconds, Temperature, Volts};
use std::format;
use std::vec::Vec;

/// The pins' supply (nominal, lowest) and the hottest microcontroller.
fn supply_and_temperature(
    r: &Reader<'_>,
    p: &file::Pins,
    ambient: (Temperature, Temperature),
) -> Result<((Volts, Volts), Temperature), HostError> {
    let pin_v = range(0.5, 60.0, "0.5 … 60 V");
    let vdd = r.q(&p.supply, "pins.supply", Unit::Volt, pin_v)?;
    let vdd_min = r.q(&p.supply_min, "pins.supply_min", Unit::Volt, pin_v)?;
    if !(vdd_min <= vdd) {
        return Err(r.at("pins.supply_min", "must not exceed pins.supply"));
    }
    let t_max = r.q(
        &p.max_temperature,
        "pins.max_temperature",
        Unit::Celsius,
        range(-40.0, 150.0, "−40 … 150 °C"),
    )?;
    if !(t_max >= ambient.1.celsius()) {
        return Err(r.at(
            "pins.max_temperature",
            "must not be below the hottest ambient",
        ));
    }
    let v = |x: f32, w: &str| Volts::new(x).map_err(|e| r.model(w, e));
    let t = Temperature::from_celsius(t_max).map_err(|e| r.model("pins.max_temperature", e))?;
    Ok(((v(vdd, "pins.supply")?, v(vdd_min, "pins.supply_min")?), t))
}

/// The injection limits (per pin, in total) and the rail's minimum load.
fn limits(r: &Reader<'_>, p: &file::Pins) -> Result<(Amps, Amps, Option<Amps>), HostError> {
    let amp = range(1e-6, 1.0, "1 µA … 1 A");
    let limit = r.q(&p.injection_limit, "pins.injection_limit", Unit::Amp, amp)?;
    let total = r.q(
        &p.total_injection_limit,
        "pins.total_injection_limit",
        Unit::Amp,
        amp,
    )?;
    if !(total >= limit) {
        return Err(r.at(
            "pins.total_injection_limit",
            "must not be below the per-pin limit",
        ));
    }
    let load = r.oq(&p.rail_min_load, "pins.rail_min_load", Unit::Amp, amp)?;
    let a = |x: f32, w: &str| Amps::new(x).map_err(|e| r.model(w, e));
    Ok((
        a(limit, "pins.injection_limit")?,
        a(total, "pins.total_injection_limit")?,
        load.map(|x| a(x, "pins.rail_min_load")).transpose()?,
    ))
}

/// The optional pairs: leakage and its allowed error; the unpowered rail's load and allowed
/// voltage.
#[allow(clippy::type_complexity)]
fn optional(
    r: &Reader<'_>,
    p: &file::Pins,
) -> Result<(Option<(Amps, Volts)>, Option<(Ohms, Volts)>), HostError> {
    let leak = r.oq(
        &p.leakage,
        "pins.leakage",
        Unit::Amp,
        range(1e-12, 1e-3, "1 pA … 1 mA"),
    )?;
    let leak_err = r.oq(
        &p.leakage_error,
        "pins.leakage_error",
        Unit::Volt,
        range(1e-6, 10.0, "1 µV … 10 V"),
    )?;
    let off_load = r.oq(
        &p.rail_off_load,
        "pins.rail_off_load",
        Unit::Ohm,
        range(1.0, 1e9, "1 Ω … 1 GΩ"),
    )?;
    let off_allowed = r.oq(
        &p.rail_off_allowed,
        "pins.rail_off_allowed",
        Unit::Volt,
        range(1e-3, 60.0, "1 mV … 60 V"),
    )?;
    let v = |x: f32, w: &str| Volts::new(x).map_err(|e| r.model(w, e));
    let leakage = match (leak, leak_err) {
        (Some(i), Some(e)) => Some((
            Amps::new(i).map_err(|e| r.model("pins.leakage", e))?,
            v(e, "pins.leakage_error")?,
        )),
        (Some(_), None) => return Err(r.at("pins.leakage_error", "missing; needed with leakage")),
        _ => None,
    };
    let rail_off = match (off_load, off_allowed) {
        (Some(l), Some(al)) => Some((
            Ohms::new(l).map_err(|e| r.model("pins.rail_off_load", e))?,
            v(al, "pins.rail_off_allowed")?,
        )),
        (Some(_), None) => {
            return Err(r.at(
                "pins.rail_off_allowed",
                "missing; needed with rail_off_load",
            ))
        }
        _ => None,
    };
    Ok((leakage, rail_off))
}

/// Converts the `[pins]` table and every `[[input]]`.
///
/// # Errors
/// Inputs without a `[pins]` table; values out of range; unknown drivers named by `sense_of`;
/// a transient range that does not contain the steady one; more than 64 inputs.
pub fn convert(
    f: &DesignFile,
    r: &Reader<'_>,
    drivers: &[DriverBoard],
    ambient: (Temperature, Temperature),
) -> Result<Option<InputsBoard>, HostError> {
    if f.input.is_empty() {
        return Ok(None);
    }
    let p = f.pins.as_ref().ok_or_else(|| {
        r.at(
            "pins",
            "missing: inputs are described but the [pins] table is not",
        )
    })?;
    let (supply, max_temperature) = supply_and_temperature(r, p, ambient)?;
    let (limit, total_limit, rail_min_load) = limits(r, p)?;
    let (leakage, rail_off) = optional(r, p)?;
    let mut inputs = Vec::new();
    for (k, inp) in f.input.iter().enumerate() {
        inputs.push(input(r, k, inp, drivers)?);
    }
    if inputs.iter().map(|i| i.count).sum::<u32>() > 64 {
        return Err(r.at("input", "more than 64 inputs in all"));
    }
    // Drivers and inputs share one namespace of generated modules.
    super::convert::unique_names(
        r,
        drivers
            .iter()
            .map(|d| (d.name.as_str(), d.field.as_str()))
            .chain(inputs.iter().map(|i| (i.name.as_str(), i.field.as_str()))),
    )?;
    Ok(Some(InputsBoard {
        supply,
        clamp: pin_clamp(r, &p.clamp)?,
        max_temperature,
        limit,
        total_limit,
        rail_min_load,
        leakage,
        rail_off,
        inputs,
    }))
}

fn pin_clamp(r: &Reader<'_>, q: &file::Q) -> Result<Diode, HostError> {
    Ok(match q.get_ref().trim() {
        "silicon" => Diode::Law(DiodeParams::SILICON),
        "schottky" => Diode::Law(DiodeParams::SCHOTTKY),
        text => {
            let v = quantity::parse(text, Unit::Volt).map_err(|m| {
                r.error(
                    q.span(),
                    "pins.clamp",
                    format!("expected \"silicon\", \"schottky\" or a drop such as \"0.3 V\": {m}"),
                )
            })?;
            if !(v > 0.0 && v <= 2.0) {
                return Err(r.error(
                    q.span(),
                    "pins.clamp",
                    "a fixed drop must be above 0 and at most 2 V",
                ));
            }
            Diode::FixedDrop(Volts::new(v as f32).map_err(|e| r.model("pins.clamp", e))?)
        }
    })
}

fn input(
    r: &Reader<'_>,
    k: usize,
    inp: &file::Input,
    drivers: &[DriverBoard],
) -> Result<InputBoard, HostError> {
    let field = format!("input[{k}]");
    let at = |x: &str| format!("{field}.{x}");
    let count = *inp.count.get_ref();
    if !(1..=64).contains(&count) {
        return Err(r.error(inp.count.span(), &at("count"), "must be 1 … 64"));
    }
    let source = match &inp.sense_of {
        Some(name) => {
            let d = drivers
                .iter()
                .position(|d| d.name == *name.get_ref())
                .ok_or_else(|| {
                    r.error(
                        name.span(),
                        &at("sense_of"),
                        format!("no driver named \"{}\"", name.get_ref()),
                    )
                })?;
            SignalSource::SenseOf(d)
        }
        None => stated(r, &field, inp)?,
    };
    let resistor = if file::is_auto(&inp.series_resistor) {
        None
    } else {
        let v = r.q(
            &inp.series_resistor,
            &at("series_resistor"),
            Unit::Ohm,
            range(1.0, 1e8, "1 Ω … 100 MΩ"),
        )?;
        Some(Ohms::new(v).map_err(|e| r.model(&at("series_resistor"), e))?)
    };
    Ok(InputBoard {
        name: inp.name.get_ref().clone(),
        module: crate::host::ident(inp.name.get_ref()),
        field,
        count,
        source,
        resistor,
        present_unpowered: inp
            .present_when_unpowered
            .as_ref()
            .is_none_or(|b| *b.get_ref()),
    })
}

fn stated(r: &Reader<'_>, field: &str, inp: &file::Input) -> Result<SignalSource, HostError> {
    let at = |x: &str| format!("{field}.{x}");
    let vr = range(-1e3, 1e3, "−1000 … 1000 V");
    let smin = r.req(&inp.signal_min, &at("signal_min"), Unit::Volt, vr)?;
    let smax = r.req(&inp.signal_max, &at("signal_max"), Unit::Volt, vr)?;
    let tmin = r.req(&inp.transient_min, &at("transient_min"), Unit::Volt, vr)?;
    let tmax = r.req(&inp.transient_max, &at("transient_max"), Unit::Volt, vr)?;
    let width = r.req(
        &inp.transient_width,
        &at("transient_width"),
        Unit::Second,
        range(0.0, 10.0, "0 … 10 s"),
    )?;
    if !(smax >= smin) {
        return Err(r.at(&at("signal_max"), "must not be below signal_min"));
    }
    if !(tmin <= smin) {
        return Err(r.at(&at("transient_min"), "must not be above signal_min"));
    }
    if !(tmax >= smax) {
        return Err(r.at(&at("transient_max"), "must not be below signal_max"));
    }
    let v = |x: f32, w: &str| Volts::new(x).map_err(|e| r.model(&at(w), e));
    Ok(SignalSource::Stated {
        steady: (v(smin, "signal_min")?, v(smax, "signal_max")?),
        transient: (v(tmin, "transient_min")?, v(tmax, "transient_max")?),
        width: Seconds::new(width).map_err(|e| r.model(&at("transient_width"), e))?,
    })
}

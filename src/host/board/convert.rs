//! The one conversion from the file as written to the typed board: units resolved, physical
//! ranges and cross-field rules checked, each error located at the field it is about.
//!
//! Accepted physical ranges (also shown in every refusal): tick rate 1 Hz … 1 GHz; ambient
//! −60 … 125 °C; self-heating 0 … 150 K (the hottest winding stays ≤ 250 °C); supplies
//! 0.1 … 1000 V; inductance 1 µH … 1000 H; resistance 1 mΩ … 1 MΩ at −100 … 250 °C;
//! tolerances 0 … 50 %; switch ratings 1 V … 10 kV.

use super::read::{range, ReadQ};
use super::{Board, DriverBoard, SupplyRange};
use crate::clamp::Side;
use crate::coil::Coil;
use crate::host::file::quantity::Unit;
use crate::host::file::{self, DesignFile, Reader};
use crate::host::HostError;
use crate::units::{Henries, Hertz, Ohms, Seconds, TempDelta, Temperature, Volts};
use std::format;
use std::string::{String, ToString};
use std::vec::Vec;

/// A temperature in °C from a value already range-checked.
fn celsius(r: &Reader<'_>, field: &str, c: f32) -> Result<Temperature, HostError> {
    Temperature::from_celsius(c).map_err(|e| r.model(field, e))
}

/// Converts the parsed file into the typed board.
///
/// # Errors
/// A located error for every value out of its range and every rule between fields broken.
pub fn convert(f: &DesignFile, r: &Reader<'_>) -> Result<Board, HostError> {
    let tick = r.q(
        &f.tick_rate,
        "tick_rate",
        Unit::Hertz,
        range(1.0, 1e9, "1 Hz … 1 GHz"),
    )?;
    let pwm_clock = r.oq(
        &f.pwm_timer_clock,
        "pwm_timer_clock",
        Unit::Hertz,
        range(1e3, 1e9, "1 kHz … 1 GHz"),
    )?;
    let (ambient, coil_heating) = environment(f, r)?;
    let mut drivers = Vec::new();
    for (k, d) in f.driver.iter().enumerate() {
        drivers.push(driver(f, r, k, d, ambient)?);
    }
    unique_names(
        r,
        drivers.iter().map(|d| (d.name.as_str(), d.field.as_str())),
    )?;
    let inputs = super::inputs::convert(f, r, &drivers, ambient)?;
    Ok(Board {
        title: f.title.clone(),
        file: r.path.to_string(),
        tick: Hertz::new(tick).map_err(|e| r.model("tick_rate", e))?,
        pwm_clock: pwm_clock
            .map(Hertz::new)
            .transpose()
            .map_err(|e| r.model("pwm_timer_clock", e))?,
        ambient,
        coil_heating,
        drivers,
        inputs,
        places: r.places(),
    })
}

/// Two subjects (drivers and inputs alike) with one name, or with names that give one
/// identifier, would share their generated module: refused at the later one's name.
pub(super) fn unique_names<'a>(
    r: &Reader<'_>,
    names: impl Iterator<Item = (&'a str, &'a str)>,
) -> Result<(), HostError> {
    let mut seen: Vec<(String, &str)> = Vec::new();
    for (name, field) in names {
        let id = crate::host::ident(name);
        if let Some((_, first)) = seen.iter().find(|(s, _)| *s == id) {
            return Err(r.at(
                &format!("{field}.name"),
                format!("its identifier `{id}` is already {first}'s: the generated constants would clash; choose another name"),
            ));
        }
        seen.push((id, field));
    }
    Ok(())
}

fn environment(
    f: &DesignFile,
    r: &Reader<'_>,
) -> Result<((Temperature, Temperature), TempDelta), HostError> {
    let e = &f.environment;
    let amb = range(-60.0, 125.0, "−60 … 125 °C");
    let lo = r.q(
        &e.ambient_min,
        "environment.ambient_min",
        Unit::Celsius,
        amb,
    )?;
    let hi = r.q(
        &e.ambient_max,
        "environment.ambient_max",
        Unit::Celsius,
        amb,
    )?;
    if !(hi > lo) {
        return Err(r.at("environment.ambient_max", "must be above ambient_min"));
    }
    let heat = r.q(
        &e.coil_self_heating,
        "environment.coil_self_heating",
        Unit::Kelvin,
        range(0.0, 150.0, "0 … 150 K"),
    )?;
    // The coil model's range ends at 250 °C, and the diagnosis puts the coil-too-hot fault up
    // to TOO_HOT_SPAN_K above the hottest winding: the same bound here, refused where it is set.
    let top = 250.0 - crate::host::figures::TOO_HOT_SPAN_K;
    if hi + heat > top {
        return Err(r.at(
            "environment.coil_self_heating",
            format!("takes the hottest winding above {top} °C (the coil model ends at 250 °C, and the coil-too-hot fault the diagnosis checks lies up to {} K above the hottest winding)", crate::host::figures::TOO_HOT_SPAN_K),
        ));
    }
    Ok((
        (
            celsius(r, "environment.ambient_min", lo)?,
            celsius(r, "environment.ambient_max", hi)?,
        ),
        TempDelta::from_kelvin(heat).map_err(|e| r.model("environment.coil_self_heating", e))?,
    ))
}

fn supply(
    f: &DesignFile,
    r: &Reader<'_>,
    field: &str,
    name: &str,
) -> Result<SupplyRange, HostError> {
    let (k, s) = f
        .supply
        .iter()
        .enumerate()
        .find(|(_, s)| s.name.get_ref() == name)
        .ok_or_else(|| {
            r.at(
                &format!("{field}.supply"),
                format!("no supply named \"{name}\""),
            )
        })?;
    let at = |x: &str| format!("supply[{k}].{x}");
    let v = range(0.1, 1000.0, "0.1 … 1000 V");
    let nominal = r.q(&s.nominal, &at("nominal"), Unit::Volt, v)?;
    let min = r.q(&s.min, &at("min"), Unit::Volt, v)?;
    let max = r.q(&s.max, &at("max"), Unit::Volt, v)?;
    if !(min <= nominal) {
        return Err(r.at(&at("min"), "must not exceed the nominal voltage"));
    }
    if !(max >= nominal) {
        return Err(r.at(&at("max"), "must not be below the nominal voltage"));
    }
    let volts = |x: f32, w: &str| Volts::new(x).map_err(|e| r.model(&at(w), e));
    Ok(SupplyRange {
        nominal: volts(nominal, "nominal")?,
        min: volts(min, "min")?,
        max: volts(max, "max")?,
    })
}

fn driver(
    f: &DesignFile,
    r: &Reader<'_>,
    k: usize,
    d: &file::Driver,
    ambient: (Temperature, Temperature),
) -> Result<DriverBoard, HostError> {
    let field = format!("driver[{k}]");
    let at = |x: &str| format!("{field}.{x}");
    let count = *d.count.get_ref();
    if !(1..=64).contains(&count) {
        return Err(r.error(d.count.span(), &at("count"), "must be 1 … 64"));
    }
    let side = side(r, &at("side"), d)?;
    let supply = supply(f, r, &field, d.supply.get_ref())?;
    let (profile, winding_limit) = supply_side(f, r, &field, d)?;
    let (coil, l_tol, r_tol) = coil(r, &field, &d.coil)?;
    let (operate, release) = magnetic(r, &field, &d.coil, supply.nominal)?;
    let mech = r.oq(
        &d.coil.mechanical_release,
        &at("coil.mechanical_release"),
        Unit::Second,
        range(0.0, 10.0, "0 … 10 s"),
    )?;
    let switch = super::switch::convert(r, &field, &d.switch, &supply, ambient)?;
    let clamp = super::clamp::convert(r, &field, &d.clamp, &supply, ambient)?;
    let secs = |x: f32, w: &str| Seconds::new(x).map_err(|e| r.model(&at(w), e));
    let max_release = r.oq(
        &d.max_release_time,
        &at("max_release_time"),
        Unit::Second,
        range(1e-6, 10.0, "1 µs … 10 s"),
    )?;
    let rate = r.oq(
        &d.switching_rate,
        &at("switching_rate"),
        Unit::Hertz,
        range(1e-6, 1e5, "1 µHz … 100 kHz"),
    )?;
    Ok(DriverBoard {
        name: d.name.get_ref().clone(),
        module: crate::host::ident(d.name.get_ref()),
        field: field.clone(),
        count,
        side,
        supply,
        coil,
        l_tol,
        r_tol,
        operate,
        release,
        mechanical: secs(mech.unwrap_or(0.0), "coil.mechanical_release")?,
        max_release_time: max_release
            .map(|x| secs(x, "max_release_time"))
            .transpose()?,
        switching_rate: rate
            .map(Hertz::new)
            .transpose()
            .map_err(|e| r.model(&at("switching_rate"), e))?,
        switch,
        hold: super::hold::convert(r, &field, d, &clamp)?,
        diagnosis: super::diagnosis::convert(r, &field, d, &clamp, &supply)?,
        armature: super::armature::convert(r, &field, d, &coil, l_tol)?,
        clamp,
        profile,
        winding_limit,
        shared: d
            .clamp
            .shared
            .as_ref()
            .map(|g| g.get_ref().trim().to_string()),
    })
}

/// Where the driver's switch sits.
fn side(r: &Reader<'_>, field: &str, d: &file::Driver) -> Result<Side, HostError> {
    match d.side.as_ref().map(|s| s.get_ref().as_str()) {
        None | Some("low") => Ok(Side::Low),
        Some("high") => Ok(Side::High),
        Some(other) => Err(r.at(
            field,
            format!("\"{other}\" is not a side; expected \"low\" or \"high\""),
        )),
    }
}

/// The driver's supply profile (its supply's events and protection) and its winding limit.
#[allow(clippy::type_complexity)]
fn supply_side(
    f: &DesignFile,
    r: &Reader<'_>,
    field: &str,
    d: &file::Driver,
) -> Result<(Option<super::profile::SupplyProfile>, Option<Temperature>), HostError> {
    let profile = match f
        .supply
        .iter()
        .position(|s| s.name.get_ref() == d.supply.get_ref())
    {
        Some(k) => f
            .supply
            .get(k)
            .map(|s| super::profile::convert(r, k, s))
            .transpose()?
            .flatten(),
        None => None,
    };
    let at = format!("{field}.coil.max_temperature");
    let winding_limit = r
        .oq(
            &d.coil.max_temperature,
            &at,
            Unit::Celsius,
            range(0.0, 250.0, "0 … 250 °C"),
        )?
        .map(|t| celsius(r, &at, t))
        .transpose()?;
    Ok((profile, winding_limit))
}

fn coil(r: &Reader<'_>, field: &str, c: &file::CoilSpec) -> Result<(Coil, f32, f32), HostError> {
    let at = |x: &str| format!("{field}.coil.{x}");
    let tol = range(0.0, 0.5, "0 … 50 %");
    let l = r.q(
        &c.inductance,
        &at("inductance"),
        Unit::Henry,
        range(1e-6, 1e3, "1 µH … 1000 H"),
    )?;
    let res = r.q(
        &c.resistance,
        &at("resistance"),
        Unit::Ohm,
        range(1e-3, 1e6, "1 mΩ … 1 MΩ"),
    )?;
    let l_tol = r.q(
        &c.inductance_tolerance,
        &at("inductance_tolerance"),
        Unit::Percent,
        tol,
    )?;
    let r_tol = r.q(
        &c.resistance_tolerance,
        &at("resistance_tolerance"),
        Unit::Percent,
        tol,
    )?;
    let lh = Henries::new(l).map_err(|e| r.model(&at("inductance"), e))?;
    let ro = Ohms::new(res).map_err(|e| r.model(&at("resistance"), e))?;
    let coil = if c.resistance_at.get_ref().trim() == "none" {
        Coil::fixed(lh, ro)
    } else {
        let t = r.q(
            &c.resistance_at,
            &at("resistance_at"),
            Unit::Celsius,
            range(-100.0, 250.0, "−100 … 250 °C"),
        )?;
        Coil::copper(lh, ro, celsius(r, &at("resistance_at"), t)?)
    }
    .map_err(|e| r.model(&at("resistance"), e))?;
    Ok((coil, l_tol, r_tol))
}

/// A must-operate or must-release value: a share of the coil's rated voltage ("60 %") or a
/// voltage. A share needs `rated_voltage`: a relay datasheet's percentages are of the rated
/// coil voltage, not of whatever supply the coil runs from.
fn datasheet_voltage(
    r: &Reader<'_>,
    q: &Option<file::Q>,
    field: &str,
    rated: Option<Volts>,
    nominal: Volts,
) -> Result<Option<Volts>, HostError> {
    let Some(q) = q else { return Ok(None) };
    let v = if q.get_ref().trim_end().ends_with('%') {
        let Some(rated) = rated else {
            return Err(r.at(
                field,
                "a percentage is of the coil's rated voltage: give coil.rated_voltage (the datasheet's nominal coil voltage, e.g. \"12 V\") or write the voltage itself",
            ));
        };
        r.q(
            q,
            field,
            Unit::Percent,
            range(0.001, 1.5, "0.1 … 150 % of the rated coil voltage"),
        )? * rated.value()
    } else {
        let top = rated.unwrap_or(nominal).value().max(nominal.value());
        r.q(
            q,
            field,
            Unit::Volt,
            range(
                1e-3,
                1.5 * top as f64,
                "1 mV … 1.5 × the rated coil voltage (or the supply's nominal)",
            ),
        )?
    };
    Volts::new(v).map(Some).map_err(|e| r.model(field, e))
}

fn magnetic(
    r: &Reader<'_>,
    field: &str,
    c: &file::CoilSpec,
    nominal: Volts,
) -> Result<(Option<Volts>, Option<Volts>), HostError> {
    let rated_field = format!("{field}.coil.rated_voltage");
    let rated = r
        .oq(
            &c.rated_voltage,
            &rated_field,
            Unit::Volt,
            range(1e-3, 1e4, "1 mV … 10 kV"),
        )?
        .map(|v| Volts::new(v).map_err(|e| r.model(&rated_field, e)))
        .transpose()?;
    let op = datasheet_voltage(
        r,
        &c.must_operate,
        &format!("{field}.coil.must_operate"),
        rated,
        nominal,
    )?;
    let rel = datasheet_voltage(
        r,
        &c.must_release,
        &format!("{field}.coil.must_release"),
        rated,
        nominal,
    )?;
    if let (Some(o), Some(l)) = (op, rel) {
        if !(l < o) {
            return Err(r.at(
                &format!("{field}.coil.must_release"),
                "must be below must_operate",
            ));
        }
    }
    Ok((op, rel))
}

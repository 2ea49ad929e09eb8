//! The clamp section of a driver: its kind, its diode and its breakdown part, each value read
//! into its type and range, and the clamp's own rules (a clamp across the switch must stay above
//! the highest supply at every tolerance and temperature).

use super::read::{range, ReadQ};
use super::{BreakdownPart, ClampBoard, DiodePart, SupplyRange};
use crate::diode::{Diode, DiodeParams};
use crate::host::file::quantity::{self, Unit};
use crate::host::file::{self, fields, ClampSpec, Reader};
use crate::host::HostError;
use crate::units::{Amps, Farads, Joules, Ohms, PerKelvin, Temperature, Volts, Watts};
use crate::varistor::Varistor;
use std::format;
use std::string::String;

/// The kinds the file accepts, for the error message.
fn kinds() -> String {
    fields::CLAMP_KINDS.join(", ")
}

/// The margin an "auto" zener keeps below the switch's derated rating at the worst corner
/// unless `voltage_margin` says otherwise: 10 % (common practice: room for what the model
/// leaves out, such as wiring inductance and the switch's own turn-off overshoot).
pub const DEFAULT_AUTO_MARGIN: f32 = 0.10;

/// Converts a driver's clamp section.
///
/// # Errors
/// A located error for a missing or out-of-range value, an unknown kind or diode, and a clamp
/// across the switch that could stay at or below the supply.
pub fn convert(
    r: &Reader<'_>,
    field: &str,
    c: &ClampSpec,
    supply: &SupplyRange,
    ambient: (Temperature, Temperature),
) -> Result<ClampBoard, HostError> {
    let at = |x: &str| format!("{field}.clamp.{x}");
    let kind = c.kind.get_ref().as_str();
    if fields::CLAMP_KINDS.contains(&kind) {
        unused_fields(r, &at, kind, c)?;
    }
    let clamp = match kind {
        "diode" => ClampBoard::Diode(diode(r, &at(""), c)?),
        "h-bridge" => ClampBoard::HBridge(diode(r, &at(""), c)?),
        "avalanche" => ClampBoard::Avalanche,
        "resistor+diode" => ClampBoard::ResistorDiode {
            resistor: resistor(r, &at("resistor"), &c.resistor)?,
            diode: diode(r, &at(""), c)?,
        },
        "zener+diode" => ClampBoard::ZenerDiode {
            zener: breakdown(r, &at(""), c, true)?,
            diode: diode(r, &at(""), c)?,
        },
        "switched-freewheel" => ClampBoard::SwitchedFreewheel {
            zener: breakdown(r, &at(""), c, true)?,
            diode: diode(r, &at(""), c)?,
            bypass: resistor(r, &at("resistor"), &c.resistor)?,
        },
        "tvs-across-coil" => ClampBoard::TvsAcrossCoil(breakdown(r, &at(""), c, false)?),
        "tvs-across-switch" => ClampBoard::TvsAcrossSwitch(breakdown(r, &at(""), c, false)?),
        "varistor" => varistor(r, &at(""), c)?,
        "switch-clamp" => ClampBoard::SwitchClamp {
            clamp: breakdown(r, &at(""), c, false)?,
            overdrive: overdrive(r, &at(""), c)?,
        },
        "rc-snubber" => {
            let cap = r.req(
                &c.capacitor,
                &at("capacitor"),
                Unit::Farad,
                range(1e-12, 1e-1, "1 pF … 100 mF"),
            )?;
            ClampBoard::Snubber {
                resistor: resistor(r, &at("resistor"), &c.resistor)?,
                capacitor: Farads::new(cap).map_err(|e| r.model(&at("capacitor"), e))?,
            }
        }
        other => {
            return Err(r.at(
                &at("kind"),
                format!("unknown kind \"{other}\"; expected one of {} (docs/design-file.md lists the fields each uses)", kinds()),
            ))
        }
    };
    if matches!(
        clamp,
        ClampBoard::TvsAcrossSwitch(_) | ClampBoard::SwitchClamp { .. }
    ) {
        above_supply(r, &at("voltage"), &clamp, supply, ambient)?;
    }
    Ok(clamp)
}

/// A field the kind cannot use is an error naming it, never silently ignored; so is a
/// `voltage_margin` without `voltage = "auto"`.
fn unused_fields(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    kind: &str,
    c: &ClampSpec,
) -> Result<(), HostError> {
    for (name, span) in c.present() {
        let Some(span) = span else { continue };
        let users = fields::clamp_kinds_of(name);
        if !users.contains(&kind) {
            return Err(r.error(
                span,
                &at(name),
                format!(
                    "a \"{kind}\" clamp does not use this field (it is used by: {})",
                    users.join(", ")
                ),
            ));
        }
    }
    if let Some(m) = &c.voltage_margin {
        if !c.voltage.as_ref().is_some_and(file::is_auto) {
            return Err(r.error(
                m.span(),
                &at("voltage_margin"),
                "only with voltage = \"auto\" (the margin the sizing keeps)",
            ));
        }
    }
    Ok(())
}

fn resistor(r: &Reader<'_>, field: &str, q: &Option<file::Q>) -> Result<Ohms, HostError> {
    let v = r.req(q, field, Unit::Ohm, range(0.0, 1e7, "0 … 10 MΩ"))?;
    Ohms::new(v).map_err(|e| r.model(field, e))
}

/// `prefix` ends with a dot ("driver[0].clamp.").
fn diode(r: &Reader<'_>, prefix: &str, c: &ClampSpec) -> Result<DiodePart, HostError> {
    let field = format!("{prefix}diode");
    let d = match c.diode.as_ref().map(|q| q.get_ref().trim()) {
        None | Some("silicon") => Diode::Law(DiodeParams::SILICON),
        Some("schottky") => Diode::Law(DiodeParams::SCHOTTKY),
        Some(text) => {
            let v = quantity::parse(text, Unit::Volt).map_err(|m| {
                r.at(
                    &field,
                    format!(
                        "expected \"silicon\", \"schottky\" or a fixed drop such as \"0.7 V\": {m}"
                    ),
                )
            })?;
            if !(v > 0.0 && v <= 10.0) {
                return Err(r.at(&field, "a fixed drop must be above 0 and at most 10 V"));
            }
            Diode::FixedDrop(Volts::new(v as f32).map_err(|e| r.model(&field, e))?)
        }
    };
    let spread = r.oq(
        &c.diode_spread,
        &format!("{prefix}diode_spread"),
        Unit::Volt,
        range(0.0, 0.5, "0 … 500 mV"),
    )?;
    let rth = r.oq(
        &c.diode_thermal_resistance,
        &format!("{prefix}diode_thermal_resistance"),
        Unit::KelvinPerWatt,
        range(0.01, 1e4, "0.01 … 10000 K/W"),
    )?;
    Ok(DiodePart {
        diode: d,
        spread: spread.unwrap_or(0.0),
        rth,
    })
}

/// The breakdown part's voltage, or None for "auto" where the kind may size it.
fn breakdown_voltage(
    r: &Reader<'_>,
    field: &str,
    c: &ClampSpec,
    sizeable: bool,
) -> Result<Option<Volts>, HostError> {
    match &c.voltage {
        Some(q) if file::is_auto(q) && sizeable => Ok(None),
        Some(q) if file::is_auto(q) => Err(r.error(
            q.span(),
            field,
            "\"auto\" sizes only a zener (zener+diode, switched-freewheel)",
        )),
        q => Ok(Some(
            Volts::new(r.req(q, field, Unit::Volt, range(0.5, 1e4, "0.5 V … 10 kV"))?)
                .map_err(|e| r.model(field, e))?,
        )),
    }
}

/// The breakdown part's ratings: continuous power, pulse energy, thermal resistance.
#[allow(clippy::type_complexity)]
fn ratings(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    c: &ClampSpec,
) -> Result<(Option<Watts>, Option<Joules>, Option<f32>), HostError> {
    let power = r.oq(
        &c.power_rating,
        &at("power_rating"),
        Unit::Watt,
        range(1e-3, 1e4, "1 mW … 10 kW"),
    )?;
    let energy = r.oq(
        &c.energy_rating,
        &at("energy_rating"),
        Unit::Joule,
        range(1e-6, 1e3, "1 µJ … 1000 J"),
    )?;
    let rth = r.oq(
        &c.thermal_resistance,
        &at("thermal_resistance"),
        Unit::KelvinPerWatt,
        range(0.01, 1e4, "0.01 … 10000 K/W"),
    )?;
    Ok((
        power
            .map(Watts::new)
            .transpose()
            .map_err(|e| r.model(&at("power_rating"), e))?,
        energy
            .map(Joules::new)
            .transpose()
            .map_err(|e| r.model(&at("energy_rating"), e))?,
        rth,
    ))
}

/// The breakdown part. `sizeable`: "auto" is accepted for the voltage (a zener to be sized).
fn breakdown(
    r: &Reader<'_>,
    prefix: &str,
    c: &ClampSpec,
    sizeable: bool,
) -> Result<BreakdownPart, HostError> {
    let at = |x: &str| format!("{prefix}{x}");
    let voltage = breakdown_voltage(r, &at("voltage"), c, sizeable)?;
    let izt = r
        .oq(
            &c.test_current,
            &at("test_current"),
            Unit::Amp,
            range(1e-6, 10.0, "1 µA … 10 A"),
        )?
        .unwrap_or(1e-3);
    let rz = r
        .oq(
            &c.dynamic_resistance,
            &at("dynamic_resistance"),
            Unit::Ohm,
            range(0.0, 1e3, "0 … 1 kΩ"),
        )?
        .unwrap_or(0.0);
    let tc = r
        .oq(
            &c.tempco,
            &at("tempco"),
            Unit::PercentPerKelvin,
            range(-0.01, 0.01, "−1 … 1 %/K"),
        )?
        .unwrap_or(0.0);
    let tol = r
        .oq(
            &c.tolerance,
            &at("tolerance"),
            Unit::Percent,
            range(0.0, 0.3, "0 … 30 %"),
        )?
        .unwrap_or(0.0);
    let (power_rating, energy_rating, rth) = ratings(r, &at, c)?;
    let auto_margin = r
        .oq(
            &c.voltage_margin,
            &at("voltage_margin"),
            Unit::Percent,
            range(0.0, 0.5, "0 … 50 %"),
        )?
        .unwrap_or(DEFAULT_AUTO_MARGIN);
    let part = BreakdownPart {
        voltage,
        auto_margin,
        test_current: Amps::new(izt).map_err(|e| r.model(&at("test_current"), e))?,
        dynamic_resistance: Ohms::new(rz).map_err(|e| r.model(&at("dynamic_resistance"), e))?,
        tempco: PerKelvin::new(tc).map_err(|e| r.model(&at("tempco"), e))?,
        tol,
        power_rating,
        energy_rating,
        rth,
    };
    if let Some(v) = part.voltage {
        // The lowest tolerance corner must still be a valid law (rz·Izt below Vz).
        let low = Volts::new(v.value() * (1.0 - tol)).map_err(|e| r.model(&at("voltage"), e))?;
        part.device_at(low)
            .map_err(|e| r.model(&at("dynamic_resistance"), e))?;
    }
    Ok(part)
}

fn varistor(r: &Reader<'_>, prefix: &str, c: &ClampSpec) -> Result<ClampBoard, HostError> {
    let part = breakdown(r, prefix, c, false)?;
    let alpha = r.req(
        &c.exponent,
        &format!("{prefix}exponent"),
        Unit::Number,
        range(2.0, 100.0, "2 … 100"),
    )?;
    let v1 = part
        .voltage
        .ok_or_else(|| r.at(&format!("{prefix}voltage"), "missing"))?;
    let device = Varistor::new(
        v1,
        part.test_current,
        alpha,
        part.tempco,
        Temperature::from_celsius(25.0).map_err(|e| r.model(prefix, e))?,
    )
    .map_err(|e| r.model(&format!("{prefix}voltage"), e))?;
    Ok(ClampBoard::Varistor { device, part })
}

fn overdrive(
    r: &Reader<'_>,
    prefix: &str,
    c: &ClampSpec,
) -> Result<Option<(Volts, f32)>, HostError> {
    let k = r.oq(
        &c.transconductance,
        &format!("{prefix}transconductance"),
        Unit::AmpsPerVoltSquared,
        range(1e-3, 1e4, "0.001 … 10000 A/V²"),
    )?;
    let Some(k) = k else { return Ok(None) };
    let f = format!("{prefix}gate_threshold");
    let vth = r.req(
        &c.gate_threshold,
        &f,
        Unit::Volt,
        range(0.1, 20.0, "0.1 … 20 V"),
    )?;
    Ok(Some((Volts::new(vth).map_err(|e| r.model(&f, e))?, k)))
}

/// A clamp across the switch must stay above the highest supply at its lowest tolerance and
/// its coldest or hottest temperature (whichever its tempco makes lower), or the coil would
/// never switch off.
fn above_supply(
    r: &Reader<'_>,
    field: &str,
    clamp: &ClampBoard,
    supply: &SupplyRange,
    ambient: (Temperature, Temperature),
) -> Result<(), HostError> {
    let Some(part) = clamp.breakdown() else {
        return Ok(());
    };
    let Some(v) = part.voltage else { return Ok(()) };
    let dev = part.device_at(v).map_err(|e| r.model(field, e))?;
    let mut lowest = f32::INFINITY;
    for t in [ambient.0, ambient.1] {
        let at0 = dev
            .voltage(
                Amps::new(part.test_current.value()).map_err(|e| r.model(field, e))?,
                t,
            )
            .map_err(|e| r.model(field, e))?;
        lowest = lowest.min(at0.value() * (1.0 - part.tol));
    }
    if !(lowest > supply.max.value()) {
        let msg: String = format!(
            "its lowest value ({lowest:.1} V at its test current, over tolerance and temperature) must exceed the highest supply ({}): a clamp across the switch at or below the supply never switches the coil off",
            supply.max
        );
        return Err(r.at(field, msg));
    }
    Ok(())
}

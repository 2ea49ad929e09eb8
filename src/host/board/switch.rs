//! The switch section of a driver: its voltage rating and derating, its own avalanche (what an
//! open clamp lets it reach), its avalanche energy ratings and its thermal data, each read into
//! its type and range, with the rules between them.

use super::read::{range, ReadQ};
use super::{SupplyRange, SwitchBoard};
use crate::breakdown::{Breakdown, BreakdownLaw};
use crate::host::file::quantity::Unit;
use crate::host::file::{self, Reader};
use crate::host::HostError;
use crate::units::{Amps, Duty, Joules, Ohms, PerKelvin, Temperature, Volts};
use std::format;
use std::string::String;

/// The switch's avalanche: its voltage (at a nominal 1 A, the datasheet's V(BR) convention),
/// tolerance and temperature coefficient. Its lowest value over the tolerance and the ambient
/// range must exceed the highest supply, or an open clamp would leave the switch conducting.
fn avalanche(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    s: &file::SwitchSpec,
    supply: &SupplyRange,
    ambient: (Temperature, Temperature),
) -> Result<(Breakdown, f32), HostError> {
    let av = r.q(
        &s.avalanche,
        &at("avalanche"),
        Unit::Volt,
        range(1.0, 1e4, "1 V … 10 kV"),
    )?;
    let tol = r
        .oq(
            &s.avalanche_tolerance,
            &at("avalanche_tolerance"),
            Unit::Percent,
            range(0.0, 0.5, "0 … 50 %"),
        )?
        .unwrap_or(0.0);
    let tc = r
        .oq(
            &s.avalanche_tempco,
            &at("avalanche_tempco"),
            Unit::PercentPerKelvin,
            range(-0.01, 0.01, "−1 … 1 %/K"),
        )?
        .unwrap_or(0.0);
    let model = |e| r.model(&at("avalanche"), e);
    let law = BreakdownLaw::Datasheet {
        vz: Volts::new(av).map_err(model)?,
        izt: Amps::new(1.0).map_err(model)?,
        rz: Ohms::new(0.0).map_err(model)?,
    };
    let t25 = Temperature::from_celsius(25.0).map_err(model)?;
    let device = Breakdown::new(
        law,
        PerKelvin::new(tc).map_err(|e| r.model(&at("avalanche_tempco"), e))?,
        t25,
    )
    .map_err(model)?;
    let mut lowest = f32::INFINITY;
    for t in [ambient.0, ambient.1] {
        lowest = lowest.min(
            device
                .voltage(Amps::new(0.0).map_err(model)?, t)
                .map_err(model)?
                .value()
                * (1.0 - tol),
        );
    }
    if !(lowest > supply.max.value()) {
        return Err(r.at(
            &at("avalanche"),
            format!("its lowest value ({lowest:.1} V over tolerance and temperature) must exceed the highest supply ({})", supply.max),
        ));
    }
    Ok((device, tol))
}

/// The avalanche energy ratings: single pulse, and repetitive (which needs the single one and
/// may not exceed it).
fn energies(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    s: &file::SwitchSpec,
) -> Result<(Option<Joules>, Option<Joules>), HostError> {
    let joule = range(1e-6, 1e3, "1 µJ … 1000 J");
    let e_as = r.oq(
        &s.avalanche_energy,
        &at("avalanche_energy"),
        Unit::Joule,
        joule,
    )?;
    let e_ar = r.oq(
        &s.avalanche_energy_repetitive,
        &at("avalanche_energy_repetitive"),
        Unit::Joule,
        joule,
    )?;
    match (e_as, e_ar) {
        (None, Some(_)) => {
            return Err(r.at(
                &at("avalanche_energy"),
                "missing; needed with avalanche_energy_repetitive",
            ))
        }
        (Some(single), Some(rep)) if rep > single => {
            return Err(r.at(
                &at("avalanche_energy_repetitive"),
                "must not exceed the single-pulse avalanche_energy",
            ))
        }
        _ => {}
    }
    let j = |x: Option<f32>, w: &str| {
        x.map(Joules::new)
            .transpose()
            .map_err(|e| r.model(&at(w), e))
    };
    Ok((
        j(e_as, "avalanche_energy")?,
        j(e_ar, "avalanche_energy_repetitive")?,
    ))
}

/// The thermal data: R_th, C_th, T_jmax and R_on, with their rules.
#[allow(clippy::type_complexity)]
fn thermal(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    s: &file::SwitchSpec,
    ambient: (Temperature, Temperature),
    rated: bool,
) -> Result<(Option<f32>, Option<f32>, Option<Temperature>, Option<Ohms>), HostError> {
    let rth = r.oq(
        &s.thermal_resistance,
        &at("thermal_resistance"),
        Unit::KelvinPerWatt,
        range(0.01, 1e4, "0.01 … 10000 K/W"),
    )?;
    let tj = r.oq(
        &s.junction_max,
        &at("junction_max"),
        Unit::Celsius,
        range(25.0, 250.0, "25 … 250 °C"),
    )?;
    let cth = r.oq(
        &s.thermal_capacitance,
        &at("thermal_capacitance"),
        Unit::JoulePerKelvin,
        range(1e-6, 1e3, "1 µJ/K … 1000 J/K"),
    )?;
    let ron = r.oq(
        &s.on_resistance,
        &at("on_resistance"),
        Unit::Ohm,
        range(0.0, 1e3, "0 … 1 kΩ"),
    )?;
    match tj {
        Some(tj) if !(tj > ambient.1.celsius()) => {
            return Err(r.at(&at("junction_max"), "must be above the hottest ambient"))
        }
        None if rated || rth.is_some() => {
            return Err(r.at(
                &at("junction_max"),
                "missing; the avalanche energy and the thermal resistance are judged against it",
            ))
        }
        _ => {}
    }
    if cth.is_some() && rth.is_none() {
        return Err(r.at(
            &at("thermal_resistance"),
            "missing; needed with thermal_capacitance",
        ));
    }
    let tj = tj
        .map(|t| Temperature::from_celsius(t).map_err(|e| r.model(&at("junction_max"), e)))
        .transpose()?;
    let ron = ron
        .map(Ohms::new)
        .transpose()
        .map_err(|e| r.model(&at("on_resistance"), e))?;
    Ok((rth, cth, tj, ron))
}

/// Converts a driver's switch section.
///
/// # Errors
/// A located error for a missing or out-of-range value, an avalanche that could stay at or
/// below the supply, a repetitive rating without (or above) the single-pulse one, an energy or
/// thermal rating without the maximum junction temperature.
pub fn convert(
    r: &Reader<'_>,
    field: &str,
    s: &file::SwitchSpec,
    supply: &SupplyRange,
    ambient: (Temperature, Temperature),
) -> Result<SwitchBoard, HostError> {
    let at = |x: &str| format!("{field}.switch.{x}");
    let rating = r.q(
        &s.rating,
        &at("rating"),
        Unit::Volt,
        range(1.0, 1e4, "1 V … 10 kV"),
    )?;
    let derating = r.q(
        &s.derating,
        &at("derating"),
        Unit::Percent,
        range(0.1, 1.0, "10 … 100 %"),
    )?;
    let (avalanche, avalanche_tol) = avalanche(r, &at, s, supply, ambient)?;
    let (energy_single, energy_repetitive) = energies(r, &at, s)?;
    let (thermal_resistance, thermal_capacitance, junction_max, on_resistance) =
        thermal(r, &at, s, ambient, energy_single.is_some())?;
    Ok(SwitchBoard {
        rating: Volts::new(rating).map_err(|e| r.model(&at("rating"), e))?,
        derating: Duty::new(derating).map_err(|e| r.model(&at("derating"), e))?,
        avalanche,
        avalanche_tol,
        energy_single,
        energy_repetitive,
        thermal_resistance,
        thermal_capacitance,
        junction_max,
        on_resistance,
    })
}

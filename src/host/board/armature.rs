//! The armature section of a driver: the moving parts, their tolerances and the ADC that
//! samples the coil current at pull-in.

use super::read::{range, ReadQ};
use super::ArmatureBoard;
use crate::armature::sizing::{Adc, Tolerances};
use crate::armature::{Armature, GapInductance};
use crate::coil::Coil;
use crate::host::file::quantity::Unit;
use crate::host::file::{self, Reader};
use crate::host::HostError;
use crate::units::{Henries, Hertz};
use std::format;
use std::string::String;

/// Converts a driver's armature section.
///
/// # Errors
/// A located error for a missing or out-of-range value, an open inductance not below the
/// coil's (seated) inductance, a count that is not a whole number.
pub fn convert(
    r: &Reader<'_>,
    field: &str,
    d: &file::Driver,
    coil: &Coil,
    l_tol: f32,
) -> Result<Option<ArmatureBoard>, HostError> {
    let Some(a) = &d.armature else {
        return Ok(None);
    };
    let at = |x: &str| format!("{field}.armature.{x}");
    // Read in the file's order, so the first error named is the first field at fault.
    let mut table_stroke = None;
    let nominal = mechanics(r, &at, a, || {
        let (law, stroke) = gap_law(r, &at, a, coil)?;
        table_stroke = stroke;
        Ok(law)
    })?;
    if let Some(s) = table_stroke {
        if !((s - nominal.stroke_m).abs() <= 5e-3 * nominal.stroke_m) {
            return Err(r.at(
                &at("inductance_table"),
                format!(
                    "its last gap ({:.4} mm) must be the stroke ({:.4} mm): the table runs from the seat to the open stop",
                    s * 1e3,
                    nominal.stroke_m * 1e3
                ),
            ));
        }
    }
    let pct = range(0.0, 0.5, "0 … 50 %");
    let tol = r
        .oq(&a.tolerance, &at("tolerance"), Unit::Percent, pct)?
        .unwrap_or(0.0);
    let open = nominal.inductance.open.value();
    let open_tol = open_tolerance(r, &at, a, open, coil, l_tol)?;
    let adc = adc(r, &at, a)?;
    nominal.validate().map_err(|e| r.model(&at(""), e))?;
    Ok(Some(ArmatureBoard {
        nominal,
        tol: Tolerances {
            mass: tol,
            stroke: tol,
            preload: tol,
            spring: tol,
            load: tol,
            damping: tol,
            l_seat: l_tol,
            l_open: open_tol,
            g0: tol,
        },
        adc,
    }))
}

/// The moving parts: mass, stroke, spring, load and damping, then the gap law from `law`.
fn mechanics(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    a: &file::ArmatureSpec,
    law: impl FnOnce() -> Result<GapInductance, HostError>,
) -> Result<Armature, HostError> {
    let newton = range(0.0, 1e5, "0 … 100 kN");
    let mass = r.q(
        &a.mass,
        &at("mass"),
        Unit::Kilogram,
        range(1e-6, 100.0, "1 mg … 100 kg"),
    )?;
    let stroke = r.q(
        &a.stroke,
        &at("stroke"),
        Unit::Metre,
        range(0.0, 0.1, "0 … 100 mm"),
    )?;
    let preload = r.q(
        &a.spring_preload,
        &at("spring_preload"),
        Unit::Newton,
        newton,
    )?;
    let rate = r.q(
        &a.spring_rate,
        &at("spring_rate"),
        Unit::NewtonPerMetre,
        range(0.0, 1e8, "0 … 100 MN/m"),
    )?;
    let load = r
        .oq(
            &a.load,
            &at("load"),
            Unit::Newton,
            range(-1e5, 1e5, "−100 … 100 kN"),
        )?
        .unwrap_or(0.0);
    let damping = r
        .oq(
            &a.damping,
            &at("damping"),
            Unit::NewtonSecondPerMetre,
            range(0.0, 1e6, "0 … 1 MN·s/m"),
        )?
        .unwrap_or(0.0);
    Ok(Armature {
        mass_kg: mass,
        stroke_m: stroke,
        preload_n: preload,
        spring_n_per_m: rate,
        load_n: load,
        damping_n_s_per_m: damping,
        inductance: law()?,
    })
}

/// L against the gap: the air-gap law (L_seat the coil's inductance, L_open below it and g₀
/// from the section), or a measured table (its shape; with the table's last gap, which must be
/// the stroke).
fn gap_law(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    a: &file::ArmatureSpec,
    coil: &Coil,
) -> Result<(GapInductance, Option<f32>), HostError> {
    if let Some(t) = &a.inductance_table {
        return table_law(r, at, a, t, coil).map(|(g, s)| (g, Some(s)));
    }
    let open = r.req(
        &a.open_inductance,
        &at("open_inductance"),
        Unit::Henry,
        range(1e-9, 1e3, "1 nH … 1 kH"),
    )?;
    if !(open < coil.inductance().value()) {
        return Err(r.at(
            &at("open_inductance"),
            "must be below the coil's inductance (the seated one): opening the gap lowers L",
        ));
    }
    let g0 = r.req(
        &a.fringe,
        &at("fringe"),
        Unit::Metre,
        range(1e-7, 0.1, "0.1 µm … 100 mm"),
    )?;
    Ok((
        GapInductance {
            seat: coil.inductance(),
            open: Henries::new(open).map_err(|e| r.model(&at("open_inductance"), e))?,
            g0_m: g0,
            shape: None,
        },
        None,
    ))
}

/// A measured table of L against the gap (`open_inductance` and `fringe` must then be absent):
/// its first L must be the coil's inductance (the seated one, to 0.5 %); returns the law and
/// the table's last gap.
fn table_law(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    a: &file::ArmatureSpec,
    table: &[[file::Q; 2]],
    coil: &Coil,
) -> Result<(GapInductance, f32), HostError> {
    let field = at("inductance_table");
    if a.open_inductance.is_some() || a.fringe.is_some() {
        return Err(r.at(
            &field,
            "give either the table or open_inductance and fringe (the air-gap law), not both",
        ));
    }
    if table.len() > crate::armature::shape::MAX_POINTS {
        return Err(r.at(&field, "takes at most 12 points"));
    }
    let mut points = [(0.0f32, 0.0f32); crate::armature::shape::MAX_POINTS];
    for ((k, [x, l]), p) in table.iter().enumerate().zip(points.iter_mut()) {
        let here = format!("{field}[{k}]");
        *p = (
            r.q(x, &here, Unit::Metre, range(0.0, 0.1, "0 … 100 mm"))?,
            r.q(l, &here, Unit::Henry, range(1e-9, 1e3, "1 nH … 1 kH"))?,
        );
    }
    let given = points.get(..table.len()).unwrap_or(&[]);
    let (shape, ends) =
        crate::armature::shape::GapShape::from_table(given).map_err(|e| r.model(&field, e))?;
    let seat = coil.inductance().value();
    if !((ends.seat_h - seat).abs() <= 5e-3 * seat) {
        return Err(r.at(
            &field,
            format!(
                "its L at gap 0 ({:.4} H) must be the coil's inductance ({seat:.4} H): the seated L",
                ends.seat_h
            ),
        ));
    }
    Ok((
        GapInductance {
            seat: coil.inductance(),
            open: Henries::new(ends.open_h).map_err(|e| r.model(&field, e))?,
            // The law's g₀ is not used with a table; a valid placeholder (the stroke).
            g0_m: ends.stroke_m,
            shape: Some(shape),
        },
        ends.stroke_m,
    ))
}

/// The open inductance's tolerance (default the coil's): the open and seated inductances may
/// not meet over their tolerances.
fn open_tolerance(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    a: &file::ArmatureSpec,
    open: f32,
    coil: &Coil,
    l_tol: f32,
) -> Result<f32, HostError> {
    let open_tol = r
        .oq(
            &a.open_inductance_tolerance,
            &at("open_inductance_tolerance"),
            Unit::Percent,
            range(0.0, 0.5, "0 … 50 %"),
        )?
        .unwrap_or(l_tol);
    if !(open * (1.0 + open_tol) < coil.inductance().value() * (1.0 - l_tol)) {
        return Err(r.at(
            &at("open_inductance_tolerance"),
            "the open and seated inductances overlap over their tolerances: the highest open L must stay below the lowest seated L",
        ));
    }
    Ok(open_tol)
}

/// The ADC on the coil current: rate, gain, full scale and noise (whole counts).
fn adc(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    a: &file::ArmatureSpec,
) -> Result<Adc, HostError> {
    let rate = r.q(
        &a.adc_rate,
        &at("adc_rate"),
        Unit::Hertz,
        range(1.0, 1e8, "1 Hz … 100 MHz"),
    )?;
    let cpa = r.q(
        &a.adc_counts_per_amp,
        &at("adc_counts_per_amp"),
        Unit::CountsPerAmp,
        range(1e-3, 1e9, "0.001 … 10⁹ counts/A"),
    )?;
    let count = |q: &file::Q, name: &str, lo: f64| -> Result<u16, HostError> {
        let x = r.q(
            q,
            &at(name),
            Unit::Counts,
            range(lo, 65535.0, "a whole count up to 65535"),
        )?;
        if x.fract() != 0.0 {
            return Err(r.at(&at(name), "must be a whole number of counts"));
        }
        Ok(x as u16)
    };
    Ok(Adc {
        rate: Hertz::new(rate).map_err(|e| r.model(&at("adc_rate"), e))?,
        counts_per_amp: cpa,
        full_scale: count(&a.adc_full_scale, "adc_full_scale", 2.0)?,
        noise_counts: count(&a.adc_noise, "adc_noise", 0.0)?,
    })
}

//! The diagnosis section of a driver: its measurements (comparators across the switch,
//! current-sense windows), guard band, timing jitter, shorted-turns share and confirmations.

use super::read::{range, ReadQ};
use super::{ClampBoard, DiagnosisBoard, MeasureBoard, SupplyRange};
use crate::host::file::quantity::Unit;
use crate::host::file::{self, Reader};
use crate::host::HostError;
use crate::units::{Amps, Duty, Volts};
use std::format;
use std::string::String;
use std::vec::Vec;

/// The measurements: comparators across the switch (each above the highest supply), then
/// current-sense pairs [upper, lower].
fn measurements(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    g: &file::DiagnosisSpec,
    supply: &SupplyRange,
) -> Result<Vec<MeasureBoard>, HostError> {
    let mut out = Vec::new();
    for (n, q) in g.comparator.iter().enumerate() {
        let fld = at(&format!("comparator[{n}]"));
        let v = r.q(q, &fld, Unit::Volt, range(0.1, 1e4, "0.1 V … 10 kV"))?;
        if !(v > supply.max.value()) {
            let why = format!("must be above the highest supply ({}): across the switch the voltage rests at the supply once the coil is off, so a lower threshold never releases", supply.max);
            return Err(r.error(q.span(), &fld, why));
        }
        out.push(MeasureBoard::Comparator(
            Volts::new(v).map_err(|e| r.model(&fld, e))?,
        ));
    }
    for (n, pair) in g.current_sense.iter().enumerate() {
        let fld = at(&format!("current_sense[{n}]"));
        let [up, lo] = pair.as_slice() else {
            return Err(r.at(&fld, "expected a pair [upper, lower]"));
        };
        let amp = range(1e-6, 100.0, "1 µA … 100 A");
        let (u, l) = (
            r.q(up, &format!("{fld}[0]"), Unit::Amp, amp)?,
            r.q(lo, &format!("{fld}[1]"), Unit::Amp, amp)?,
        );
        if !(u > l) {
            return Err(r.at(&format!("{fld}[1]"), "must be below the upper threshold"));
        }
        let amps = |x: f32| Amps::new(x).map_err(|e| r.model(&fld, e));
        out.push(MeasureBoard::Current {
            upper: amps(u)?,
            lower: amps(l)?,
        });
    }
    if out.is_empty() {
        return Err(r.at(
            &at("comparator"),
            "give at least one comparator or current_sense measurement",
        ));
    }
    if out.len() > crate::host::figures::MAX_MEASUREMENTS {
        return Err(r.at(
            &at("comparator"),
            format!(
                "at most {} measurements in all",
                crate::host::figures::MAX_MEASUREMENTS
            ),
        ));
    }
    Ok(out)
}

/// The shorted-turns fault's L factor range and R factor: from `shorted_turns` (a share f of
/// the turns: R·(1 − f) with the wire's length, and L anywhere between the two common models,
/// L·(1 − f)² where it goes with the square of the turns and L·(1 − f) where the shorted turns
/// hardly change the magnetic path; common practice, so a real coil falls inside the range)
/// or from `shorted_inductance` and `shorted_resistance` (one model, as measured), exactly one
/// of the two forms.
fn shorted(
    r: &Reader<'_>,
    at: &dyn Fn(&str) -> String,
    g: &file::DiagnosisSpec,
) -> Result<((f32, f32), f32), HostError> {
    let share = range(0.01, 0.9, "1 … 90 %");
    let left = range(0.01, 0.99, "1 … 99 %");
    match (
        &g.shorted_turns,
        &g.shorted_inductance,
        &g.shorted_resistance,
    ) {
        (Some(q), None, None) => {
            let f = r.q(q, &at("shorted_turns"), Unit::Percent, share)?;
            Ok((((1.0 - f) * (1.0 - f), 1.0 - f), 1.0 - f))
        }
        (None, Some(l), Some(rr)) => {
            let l = r.q(l, &at("shorted_inductance"), Unit::Percent, left)?;
            Ok((
                (l, l),
                r.q(rr, &at("shorted_resistance"), Unit::Percent, left)?,
            ))
        }
        (Some(_), _, _) => Err(r.at(
            &at("shorted_turns"),
            "give shorted_turns or shorted_inductance with shorted_resistance, not both",
        )),
        (None, None, None) => Err(r.at(
            &at("shorted_turns"),
            "missing: give shorted_turns, or shorted_inductance with shorted_resistance",
        )),
        (None, Some(_), None) => Err(r.at(
            &at("shorted_resistance"),
            "missing: shorted_inductance needs shorted_resistance beside it",
        )),
        (None, None, Some(_)) => Err(r.at(
            &at("shorted_inductance"),
            "missing: shorted_resistance needs shorted_inductance beside it",
        )),
    }
}

/// Converts a driver's diagnosis section.
///
/// # Errors
/// A located error for a missing or out-of-range value, a comparator at or below the highest
/// supply, a current window upside down, more measurements than the analysis holds, a clamp
/// the decay engine does not model (an RC snubber).
pub fn convert(
    r: &Reader<'_>,
    field: &str,
    d: &file::Driver,
    clamp: &ClampBoard,
    supply: &SupplyRange,
) -> Result<Option<DiagnosisBoard>, HostError> {
    let Some(g) = &d.diagnosis else {
        return Ok(None);
    };
    let at = |x: &str| format!("{field}.diagnosis.{x}");
    if matches!(clamp, ClampBoard::Snubber { .. }) {
        return Err(r.at(&format!("{field}.diagnosis"), "diagnosis from the decay needs a clamp the decay engine models; an rc-snubber rings instead"));
    }
    let measurements = measurements(r, &at, g, supply)?;
    let guard = r.q(
        &g.guard,
        &at("guard"),
        Unit::Percent,
        range(0.0, 0.5, "0 … 50 %"),
    )?;
    let jitter = r
        .oq(
            &g.jitter,
            &at("jitter"),
            Unit::Ticks,
            range(0.0, 1e4, "0 … 10000 ticks"),
        )?
        .unwrap_or(0.0);
    let shorted = shorted(r, &at, g)?;
    let confirmations = g.confirmations.as_ref().map_or(1, |c| *c.get_ref());
    if !(1..=100).contains(&confirmations) {
        return Err(r.at(&at("confirmations"), "must be 1 … 100"));
    }
    let reference = r
        .oq(
            &g.comparator_reference,
            &at("comparator_reference"),
            Unit::Volt,
            range(0.01, 100.0, "10 mV … 100 V"),
        )?
        .map(|v| Volts::new(v).map_err(|e| r.model(&at("comparator_reference"), e)))
        .transpose()?;
    let comparator_tolerance = r
        .oq(
            &g.comparator_tolerance,
            &at("comparator_tolerance"),
            Unit::Percent,
            range(0.0, 0.2, "0 … 20 %"),
        )?
        .unwrap_or(0.0);
    Ok(Some(DiagnosisBoard {
        comparator_tolerance,
        reference,
        measurements,
        guard: Duty::new(guard).map_err(|e| r.model(&at("guard"), e))?,
        jitter_ticks: libm::ceilf(jitter) as u32,
        shorted,
        confirmations,
    }))
}

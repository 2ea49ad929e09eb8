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
    let shorted = r.q(
        &g.shorted_turns,
        &at("shorted_turns"),
        Unit::Percent,
        range(0.01, 0.9, "1 … 90 %"),
    )?;
    let confirmations = g.confirmations.as_ref().map_or(1, |c| *c.get_ref());
    if !(1..=100).contains(&confirmations) {
        return Err(r.at(&at("confirmations"), "must be 1 … 100"));
    }
    Ok(Some(DiagnosisBoard {
        measurements,
        guard: Duty::new(guard).map_err(|e| r.model(&at("guard"), e))?,
        jitter_ticks: libm::ceilf(jitter) as u32,
        shorted_turns: shorted,
        confirmations,
    }))
}

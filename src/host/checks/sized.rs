//! What the sizing chose ("auto" in the file), with the window it chose from.

use super::{Check, Corner, Outcome, Status, Unit};
use crate::host::engine::DriverRun;
use std::format;

/// The sized zener, if the file asked for one.
pub fn checks(run: &DriverRun, out: &mut Outcome) {
    let d = &run.d;
    let Some(z) = run.zener else { return };
    let v = z.chosen.value();
    let limit = d.switch.rating.value() * d.switch.derating.value();
    let c = Check::valued(
        &d.name,
        "zener_sized",
        "zener voltage (sized, E24)",
        v,
        Unit::Volt,
        None,
        Corner::Stated("every corner".into()),
    );
    let margin = d.clamp.breakdown().map_or(0.0, |p| p.auto_margin);
    let why = if z.keeps_margin {
        format!(
            "the largest E24 value whose worst peak ({:.2} V) keeps {:.0} % below the switch's derated {limit:.1} V (clamp.voltage_margin)",
            z.worst_peak,
            margin * 100.0
        )
    } else {
        format!(
            "no E24 value keeps the {:.0} % margin target below the derated {limit:.1} V; the largest within the rating itself (worst peak {:.2} V, {:.1} % below it)",
            margin * 100.0,
            z.worst_peak,
            (1.0 - z.worst_peak / limit) * 100.0
        )
    };
    let c = if z.fits_rating && !z.keeps_margin {
        c.with_status(Status::Warn)
    } else {
        c
    };
    let c = if !z.fits_rating {
        c.with_status(Status::Fail).noted(format!("no E24 zener keeps the switch within {limit:.1} V at every corner: the supply and the diode alone take it there; choose a higher-rated switch"))
    } else {
        match (z.smallest_for_release, d.max_release_time) {
            (Some(lo), Some(_)) => c.noted(format!("{why}; every value from {lo} up to it also meets the release time")),
            (None, Some(t)) => c.with_status(Status::Fail).noted(format!(
                "the requirements conflict: {why}, and it still releases later than {:.1} ms at the worst corner",
                t.value() * 1e3
            )),
            _ => c.noted(why),
        }
    };
    out.checks.push(c);
}

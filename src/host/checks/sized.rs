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
    let c = if !z.fits_rating {
        c.with_status(Status::Fail).noted(format!("no E24 zener keeps the switch within {limit:.1} V at every corner: the supply and the diode alone take it there; choose a higher-rated switch"))
    } else {
        match (z.smallest_for_release, d.max_release_time) {
            (Some(lo), Some(_)) => c.noted(format!("the largest E24 value that keeps the switch within {limit:.1} V; every value from {lo} up also meets the release time")),
            (None, Some(t)) => c.with_status(Status::Fail).noted(format!(
                "the requirements conflict: the largest zener the switch allows still releases later than {:.1} ms at the worst corner",
                t.value() * 1e3
            )),
            _ => c.noted(format!("the largest E24 value that keeps the switch within {limit:.1} V at every corner")),
        }
    };
    out.checks.push(c);
}

//! Where each switch-off's energy goes, and what it does to the clamp parts: energy per
//! switch-off against the part's pulse rating, average power against its continuous rating
//! (switch-offs at the stated rate plus, while PWM-holding, the freewheel current), and the
//! self-heating that the analysis fed back into the part temperatures.
//!
//! Worst corner: every energy grows with the stored energy ½·L·I₀² (L high, supply high, R
//! low, winding cold) and its share moves monotonically with each clamp voltage; powers add
//! the hold's, which grows with the held current. The vertex search takes each at its
//! largest.

use super::{figure_check, Bound, Check, Corner, Limit, Metric, Outcome, Status, Unit};
use crate::host::board::{Board, ClampBoard};
use crate::host::engine::{DriverRun, HOTTEST_PART_C};
use std::format;
use std::string::String;

/// The name of the breakdown part as the report says it.
fn breakdown_name(c: &ClampBoard) -> &'static str {
    match c {
        ClampBoard::ZenerDiode { .. } | ClampBoard::SwitchedFreewheel { .. } => "zener",
        ClampBoard::TvsAcrossCoil(_) | ClampBoard::TvsAcrossSwitch(_) => "TVS",
        ClampBoard::Varistor { .. } => "varistor",
        _ => "clamp part",
    }
}

/// The energy checks.
pub fn checks(board: &Board, run: &DriverRun, out: &mut Outcome) {
    let d = &run.d;
    if let Some(c) = figure_check(
        run,
        Metric::Stored,
        "stored_energy",
        "energy stored in the coil at switch-off",
        Unit::Joule,
        None,
    ) {
        let across_switch = matches!(
            d.clamp,
            ClampBoard::TvsAcrossSwitch(_) | ClampBoard::SwitchClamp { .. } | ClampBoard::Avalanche
        );
        let note = if across_switch {
            format!("½·L·I₀²; the decay puts it into {} and the coil's own resistance, and the supply adds V_s·Q while the clamp across the switch conducts, so {} takes more than is stored", d.clamp.absorbers(), d.clamp.absorbers())
        } else {
            format!(
                "½·L·I₀²; the decay puts it into {} and the coil's own resistance",
                d.clamp.absorbers()
            )
        };
        out.checks.push(c.noted(note));
    }
    let any = |m: Metric| {
        run.figures
            .iter()
            .any(|f| m.read(d, f).is_some_and(|v| v > 0.0))
    };
    if any(Metric::EnergyDiode) {
        if let Some(c) = figure_check(
            run,
            Metric::EnergyDiode,
            "diode_energy",
            "energy into the clamp diode per switch-off",
            Unit::Joule,
            None,
        ) {
            out.checks.push(c);
        }
    }
    if any(Metric::EnergyResistor) {
        if let Some(c) = figure_check(
            run,
            Metric::EnergyResistor,
            "resistor_energy",
            "energy into the clamp resistor per switch-off",
            Unit::Joule,
            None,
        ) {
            out.checks.push(c);
        }
    }
    if any(Metric::EnergyBreakdown) {
        breakdown(run, out);
    }
    heating(board, run, out);
}

/// The zener, TVS or varistor: pulse energy and average power against its ratings.
fn breakdown(run: &DriverRun, out: &mut Outcome) {
    let d = &run.d;
    let name = breakdown_name(&d.clamp);
    let part = d.clamp.breakdown();
    let e_lim = part.and_then(|p| p.energy_rating).map(|e| Limit {
        value: e.value(),
        bound: Bound::AtMost,
        source: format!("the {name}'s pulse energy rating"),
    });
    if let Some(c) = figure_check(
        run,
        Metric::EnergyBreakdown,
        "breakdown_energy",
        &format!("energy into the {name} per switch-off"),
        Unit::Joule,
        e_lim,
    ) {
        out.checks.push(c);
    }
    let p_lim = part.and_then(|p| p.power_rating).map(|w| Limit {
        value: w.value(),
        bound: Bound::AtMost,
        source: format!("the {name}'s continuous power rating"),
    });
    let holds = run
        .figures
        .iter()
        .any(|f| f.hold.is_some_and(|h| h.zener_power > 0.0));
    let title = format!("average power in the {name}");
    if !(d.switching_rate.is_some() || holds) {
        out.checks.push(
            Check::worded(&d.name, "breakdown_power", &title, Status::Warn, "not judged", Corner::Ties)
                .noted("not judged: give the driver's switching_rate (switch-offs per second at most) to judge the average power"),
        );
    } else if let Some(c) = figure_check(
        run,
        Metric::PowerBreakdown,
        "breakdown_power",
        &title,
        Unit::Watt,
        p_lim,
    ) {
        let why = if holds {
            "switch-offs at the stated rate, and it conducts in every PWM cycle while holding"
        } else {
            "switch-offs at the stated rate"
        };
        out.checks.push(c.noted(why));
    }
}

/// The self-heating the analysis used, or its failure to settle.
fn heating(board: &Board, run: &DriverRun, out: &mut Outcome) {
    let d = &run.d;
    let r = run.rises;
    if !run.settled {
        let c = Check::worded(&d.name, "self_heating", "self-heating of the clamp parts and the switch", Status::Fail, "does not settle", Corner::Stated("every corner".into()))
            .noted(format!("their own power takes a part towards {HOTTEST_PART_C} °C or keeps raising it: lower the power or the thermal resistance"));
        out.checks.push(c);
        return;
    }
    let mut parts: std::vec::Vec<String> = std::vec::Vec::new();
    for (what, k) in [
        ("diode", r.diode),
        (breakdown_name(&d.clamp), r.breakdown),
        ("switch", r.switch),
    ] {
        if k > 0.0 {
            parts.push(format!("{what} +{k:.1} K"));
        }
    }
    if parts.is_empty() {
        return;
    }
    let hottest = board.ambient.1.celsius() + r.diode.max(r.breakdown).max(r.switch);
    let corner = Corner::Stated(format!("hottest ambient {}", board.ambient.1));
    let c = Check::valued(&d.name, "self_heating", "hottest clamp part or switch", hottest, Unit::Celsius, None, corner)
        .noted(format!("rises above the hottest ambient from each part's worst power × its thermal resistance: {} (included in every part temperature)", parts.join(", ")));
    out.checks.push(c);
}

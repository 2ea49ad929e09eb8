//! Everything a check holds, computed once at one point of a driver's box ([`Figures`]): the
//! switch-off (peak voltages, release and off times, where the energy goes), the open-clamp
//! fault, the PWM hold and the diagnosis measurements. The checks take the worst of a figure
//! over the vertices; the Monte Carlo run evaluates the same function inside the box, so the
//! two can be compared figure by figure.
//!
//! Work per point: one switch-off set-up and one decay integration per circuit (healthy, open
//! clamp, and one per diagnosis condition and measurement), each bounded as the library states
//! ([`crate::clamp::SwitchOff::profile`]: a fixed number of panels).

mod diag;
pub mod hold;
mod profile;
mod survival;

pub use diag::{measure, MAX_MEASUREMENTS, TOO_HOT_SPAN_K};
pub use hold::{HoldFigures, HoldPlan};
pub use survival::{
    allowed as avalanche_allowance, reason as survival_reason, survivable, REPETITIVE,
};

use super::board::{Board, DriverBoard};
use super::corners::Axis;
use super::corners::Point;
use super::parts::{self, Circuit, Off, Path};
use crate::clamp::Clamp;
use crate::error::Error;
use crate::units::{Amps, Volts};

/// The share of the on-current below which the coil counts as off (re-energising or
/// reversing is safe): 1 %.
pub const OFF_FRACTION: f32 = 0.01;

/// The current of the magnetic circuit for the datasheet voltage `v` (must-operate or
/// must-release) of the unit at `p`: `v` over that unit's own resistance at the coil's
/// reference temperature, R_u(T_ref) = R_nominal × the point's resistance scale.
///
/// Convention (per-unit guarantee): a datasheet's must-operate and must-release voltages hold
/// for every unit at the reference temperature, so a unit needs (or releases at) `v`/R_u(T_ref)
/// whatever its winding temperature, and the same R_u sets its on-current. The resistance
/// tolerance therefore moves both sides together and cancels in the operate check
/// (V_min·R_u(T_ref)/R_u(T_hot) ≥ V_op); counting it once on each side fails sound designs.
///
/// # Errors
/// The library's refusal of a current outside its range (not reached inside the board's
/// ranges).
pub fn magnetic_current(d: &DriverBoard, v: Volts, p: &Point) -> Result<Amps, Error> {
    Amps::new(v.value() / unit_resistance_ref(d, p))
}

/// The unit's own resistance at the coil's reference temperature at `p`, Ω.
pub fn unit_resistance_ref(d: &DriverBoard, p: &Point) -> f32 {
    d.coil.resistance_ref().value() * p.at(Axis::Resistance)
}

/// What stays the same at every point of a driver: the board, the sized values and the
/// release current of the magnetic circuit.
#[derive(Debug, Clone, Copy)]
pub struct Context<'a> {
    /// The board.
    pub board: &'a Board,
    /// The driver (its sized zener filled in).
    pub d: &'a DriverBoard,
    /// The must-release voltage at the coil's reference temperature, if given: each unit's
    /// release current is this over that unit's own resistance at the reference temperature
    /// ([`magnetic_current`]).
    pub release_voltage: Option<Volts>,
    /// The PWM hold as the firmware runs it, if the driver holds.
    pub hold: Option<HoldPlan>,
    /// The winding axis's range, °C (the too-hot fault lies above it).
    pub winding: (f32, f32),
}

/// Where the energy of one switch-off goes, joules.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Energies {
    /// ½·L·I₀², what the coil's field holds at switch-off.
    pub stored: f32,
    /// Into the clamp diode(s).
    pub diode: f32,
    /// Into the zener, TVS or varistor.
    pub breakdown: f32,
    /// Into the clamp's resistor (or the snubber's).
    pub resistor: f32,
    /// Into the switch (its avalanche or its own clamp).
    pub switch: f32,
    /// Returned to the supply (an H-bridge's fast decay drives the current back into it).
    pub returned: f32,
}

/// The open-clamp fault at one point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OpenFigures {
    /// Energy into the switch per switch-off, J.
    pub energy: f32,
    /// The switch's junction temperature when the pulse starts, °C.
    pub start_c: f32,
    /// How many such switch-offs in a row the switch survives ([`REPETITIVE`]: any number
    /// within its thermal limits); None without an avalanche energy rating.
    pub survivable: Option<f32>,
    /// Voltage across the switch, V.
    pub peak_switch: f32,
    /// The output's extreme voltage to ground, V (below ground on a high side).
    pub peak_output: f32,
    /// How long the avalanche lasts, s.
    pub width: f32,
}

/// Every figure at one point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Figures {
    /// Coil current at switch-off, A.
    pub on_current: f32,
    /// Peak voltage across the switch, V.
    pub peak_switch: f32,
    /// The output's extreme voltage to ground, V.
    pub peak_output: f32,
    /// Switch-off to open contacts (electrical decay to this unit's release current plus the
    /// mechanical time), s; None without a must-release voltage.
    pub release: Option<f32>,
    /// The on-current referred to the coil's reference temperature: on-current × this unit's
    /// own resistance at the reference temperature, V (the voltage that would drive the same
    /// current, hence the same ampere-turns, into the unit at its reference temperature), to
    /// compare with the must-operate voltage; None without one.
    pub operate_drive: Option<f32>,
    /// Switch-off to [`OFF_FRACTION`] of the on-current, s.
    pub off_time: f32,
    /// Energy per switch-off.
    pub energy: Energies,
    /// The switch's avalanche onset at this point (its stated voltage × the tolerance axis at
    /// the switch-temperature axis, at zero current), V; None where the switch is itself the
    /// clamp (avalanche, switch clamp, H-bridge).
    pub avalanche_onset: Option<f32>,
    /// Switch-offs the switch survives when the switch-off is its own avalanche (no clamp or a
    /// switch clamp; [`REPETITIVE`] for any number); None otherwise or without a rating.
    pub switch_survivable: Option<f32>,
    /// The open-clamp fault, for a clamp that can open.
    pub open: Option<OpenFigures>,
    /// The PWM hold, if the driver holds.
    pub hold: Option<HoldFigures>,
    /// Diagnosis: the measured time of each measurement under each condition (in
    /// [`crate::diagnosis::Condition::ALL`] order), s, as (lowest, highest) over what the
    /// condition leaves open at this point (the shorted-turn models' range); None where it does
    /// not apply.
    pub diag: [[Option<(f32, f32)>; 6]; MAX_MEASUREMENTS],
}

/// The healthy switch-off: peak switch and output voltages, off time, release time, energies.
struct Healthy {
    peak_switch: f32,
    peak_output: f32,
    off_time: f32,
    release: Option<f32>,
    energy: Energies,
}

/// Which parts of [`Figures`] to compute (the rest stays empty): the vertex sweep takes
/// everything; a Monte Carlo run only what its figures read.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Needs {
    /// The diagnosis measurements.
    pub diag: bool,
    /// The open-clamp fault.
    pub open: bool,
    /// The PWM hold.
    pub hold: bool,
}

impl Needs {
    /// Everything.
    pub const ALL: Needs = Needs {
        diag: true,
        open: true,
        hold: true,
    };
}

/// The healthy switch-off's figures, and its diagnosis measurements from the same integration.
fn healthy(
    cx: &Context<'_>,
    p: &Point,
    c: &Circuit,
    needs: Needs,
    diag: &mut [Option<f32>],
) -> Result<Healthy, Error> {
    let i0 = c.op.start_current.value();
    let stored = c.coil.stored_energy(c.op.start_current)?.value();
    let i_off = i0 * OFF_FRACTION;
    let i_rel = release_current_at(cx, p)?;
    let mech = cx.d.mechanical.value();
    match c.switch_off()? {
        Off::Engine(off) => {
            let measurements = match cx.d.diagnosis.as_ref() {
                Some(g) if needs.diag => &g.measurements[..],
                _ => &[][..],
            };
            // The release current may be at or above the start current (the coil never held
            // more): the time to it then reads zero, leaving the mechanical time.
            let extra = [i_off, i_rel.unwrap_or(i_off)];
            let mut t = [0.0f32; 2];
            let across_coil = !matches!(
                c.path,
                Path::Clamp(Clamp::AcrossSwitch(_) | Clamp::Avalanche(_) | Clamp::ActiveClamp(_))
            );
            // A diode-law decay across the coil stops at the lowest current asked for (1 % of
            // the on-current at most) and bounds what is left: after that current the coil's
            // remaining ½·L·i² is all there is to dissipate (the supply does no work on a
            // clamp across the coil), so adding it to each part over-states each by at most
            // 1e-4 of the stored energy. Closed-form and supply-fed decays run to their end.
            let truncate = across_coil && !off.is_closed_form();
            let decay = diag::measure(&off, !truncate, &extra, measurements, &mut t, diag)?;
            let e = decay.energy;
            let rest = if truncate {
                c.coil.stored_energy(decay.end_current)?.value()
            } else {
                0.0
            };
            let part = |x: f32| if x > 0.0 { x + rest } else { 0.0 };
            Ok(Healthy {
                peak_switch: off.peak_switch_voltage().value(),
                peak_output: off.peak_output_voltage().value(),
                off_time: t[0],
                release: i_rel.map(|_| t[1] + mech),
                energy: Energies {
                    stored,
                    diode: part(e.diodes.value()),
                    breakdown: part(e.zener.value() + e.varistor.value()),
                    resistor: part(e.resistor.value()),
                    switch: part(e.switch.value()),
                    returned: (-e.from_supply.value()).max(0.0),
                },
            })
        }
        Off::Snubber(s) => snubber_healthy(c, &s, i0, i_rel, mech, stored, i_off),
    }
}

/// This unit's release current at `p`, A (None without a must-release voltage).
fn release_current_at(cx: &Context<'_>, p: &Point) -> Result<Option<f32>, Error> {
    cx.release_voltage
        .map(|v| magnetic_current(cx.d, v, p).map(|a| a.value()))
        .transpose()
}

/// The healthy switch-off through an RC snubber (second order, closed form).
fn snubber_healthy(
    c: &Circuit,
    s: &crate::clamp::snubber::SnubberSwitchOff,
    i0: f32,
    i_rel: Option<f32>,
    mech: f32,
    stored: f32,
    i_off: f32,
) -> Result<Healthy, Error> {
    let resp = s.response()?;
    let release = match i_rel {
        Some(r) if r < i0 => Some(s.settle_time(Amps::new(r)?)?.value() + mech),
        Some(_) => Some(mech),
        None => None,
    };
    let v = resp.peak_switch_voltage.value();
    let peak_output = match c.side {
        crate::clamp::Side::Low => v,
        crate::clamp::Side::High => c.op.supply.value() - v,
    };
    Ok(Healthy {
        peak_switch: v,
        peak_output,
        off_time: s.settle_time(Amps::new(i_off)?)?.value(),
        release,
        energy: Energies {
            stored,
            resistor: resp.energy_in_resistor.value(),
            ..Energies::default()
        },
    })
}

/// The open-clamp fault's figures at `p`.
fn open_clamp(cx: &Context<'_>, p: &Point) -> Result<Option<OpenFigures>, Error> {
    let Some(c) = parts::open_clamp_at(cx.d, p)? else {
        return Ok(None);
    };
    let Off::Engine(off) = c.switch_off()? else {
        return Ok(None);
    };
    let d = off.decay_to_end()?;
    let energy = d.energy.switch.value();
    let start_c = c.op.breakdown.celsius();
    Ok(Some(OpenFigures {
        energy,
        start_c,
        survivable: survivable(&cx.d.switch, cx.d.switching_rate, energy, start_c),
        peak_switch: off.peak_switch_voltage().value(),
        peak_output: off.peak_output_voltage().value(),
        width: d.time.value(),
    }))
}

/// Every figure of driver `cx.d` at point `p`.
///
/// # Errors
/// The library's refusals at this point (the board's ranges make them broken invariants or
/// physically impossible corners, which the caller reports located at the driver).
pub fn figures_at(cx: &Context<'_>, p: &Point) -> Result<Figures, Error> {
    figures_with(cx, p, Needs::ALL)
}

/// The figures of driver `cx.d` at point `p` that `needs` asks for.
///
/// # Errors
/// As [`figures_at`].
pub fn figures_with(cx: &Context<'_>, p: &Point, needs: Needs) -> Result<Figures, Error> {
    let c = parts::circuit_at(cx.d, p)?;
    let mut healthy_diag = [None; MAX_MEASUREMENTS];
    let h = healthy(cx, p, &c, needs, &mut healthy_diag)?;
    let mut diag = [[None; 6]; MAX_MEASUREMENTS];
    if needs.diag {
        for (row, v) in diag.iter_mut().zip(healthy_diag) {
            row[0] = v.map(|x| (x, x));
        }
        diag::faults(cx, p, &mut diag)?;
    }
    let switch_survivable = if h.energy.switch > 0.0 {
        survivable(
            &cx.d.switch,
            cx.d.switching_rate,
            h.energy.switch,
            c.op.breakdown.celsius(),
        )
    } else {
        None
    };
    let hold = match &cx.hold {
        Some(plan) if needs.hold => Some(hold::hold_at(cx.d, plan, p)?),
        _ => None,
    };
    let operate_drive =
        cx.d.operate
            .map(|_| c.op.start_current.value() * unit_resistance_ref(cx.d, p));
    let avalanche_onset = if parts::switch_is_clamp(cx.d) {
        None
    } else {
        let t = p.temperature(Axis::AvalancheTemp)?;
        Some(
            parts::avalanche_at(cx.d, p)?
                .voltage(Amps::new(0.0)?, t)?
                .value(),
        )
    };
    Ok(Figures {
        on_current: c.op.start_current.value(),
        operate_drive,
        avalanche_onset,
        peak_switch: h.peak_switch,
        peak_output: h.peak_output,
        release: h.release,
        off_time: h.off_time,
        energy: h.energy,
        switch_survivable,
        open: if needs.open { open_clamp(cx, p)? } else { None },
        hold,
        diag,
    })
}

/// The release time alone at `p` (for sizing a zener against it), s; None without a
/// must-release voltage.
///
/// # Errors
/// The library's refusals at this point.
pub fn release_at(cx: &Context<'_>, p: &Point) -> Result<Option<f32>, Error> {
    let Some(v_rel) = cx.release_voltage else {
        return Ok(None);
    };
    let i_rel = magnetic_current(cx.d, v_rel, p)?;
    let c = parts::circuit_at(cx.d, p)?;
    let mech = cx.d.mechanical.value();
    if !(i_rel < c.op.start_current) {
        return Ok(Some(mech));
    }
    Ok(Some(
        match c.switch_off()? {
            Off::Engine(off) => off.time_to(i_rel)?.value(),
            Off::Snubber(s) => s.settle_time(i_rel)?.value(),
        } + mech,
    ))
}

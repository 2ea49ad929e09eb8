//! The circuit of one driver at one point of its box: every part built from the typed board
//! and the point's axis values, ready for the library's switch-off engine.
//!
//! Mapping of the axes (see [`super::corners`]):
//! - the coil: L × the inductance axis, R at its reference temperature × the resistance axis,
//!   evaluated at the winding axis (copper, IEC 60028, or a fixed resistance);
//! - the start current: supply axis ÷ R(winding), the coil's steady on-current (the switch's
//!   on-resistance is part of the resistance tolerance);
//! - the clamp diode: its law or fixed drop moved by the spread axis
//!   ([`crate::diode::Diode::shifted`]), at the diode-temperature axis;
//! - a zener, TVS, varistor or switch clamp: its datasheet voltage × the tolerance axis
//!   ([`crate::breakdown::Breakdown::scaled`]), at the breakdown-temperature axis;
//! - the switch's own avalanche (an open clamp, or no clamp): its stated voltage × the
//!   avalanche-tolerance axis, at the switch-temperature axis.
//!
//! A switch clamp with a transconductance is the library's active clamp: its zener is set so
//! that the whole clamp holds the stated voltage at its test current,
//! V_Z = V_clamp − V_th − √(I_test/K), and the overdrive √(i/K) then adds to it above the test
//! current (square-law MOSFET, I_D = K·(V_GS − V_th)²).

use super::board::{BreakdownPart, ClampBoard, DiodePart, DriverBoard};
use super::corners::{Axis, Point};
use crate::breakdown::{Breakdown, BreakdownLaw};
use crate::clamp::snubber::{RcSnubber, SnubberSwitchOff};
use crate::clamp::{ActiveClamp, Clamp, Operating, Side, SwitchOff, SwitchedFreewheel};
use crate::coil::Coil;
use crate::diode::Diode;
use crate::error::{Error, Reason};
use crate::units::{Amps, Temperature, Volts};

/// The decay path of a switch-off: the library's first-order engine, or the RC snubber's
/// second-order closed form.
#[derive(Debug, Clone, Copy)]
pub enum Path {
    /// A clamp the engine handles.
    Clamp(Clamp),
    /// An RC snubber across the coil.
    Snubber(RcSnubber),
}

/// One driver's circuit at one point.
#[derive(Debug, Clone, Copy)]
pub struct Circuit {
    /// The coil at the point's L and R.
    pub coil: Coil,
    /// The decay path.
    pub path: Path,
    /// The switch's side.
    pub side: Side,
    /// Supply, start current and temperatures.
    pub op: Operating,
}

/// The coil at a point: L and R scaled by their tolerance axes.
///
/// # Errors
/// The library's refusals of [`Coil::scaled`] (values are inside the board's ranges).
pub fn coil_at(d: &DriverBoard, p: &Point) -> Result<Coil, Error> {
    d.coil
        .scaled(p.at(Axis::Inductance), p.at(Axis::Resistance))
}

/// The clamp diode at a point: moved by the spread axis.
///
/// # Errors
/// The library's refusals of [`Diode::shifted`].
pub fn diode_at(part: &DiodePart, p: &Point) -> Result<Diode, Error> {
    let dv = p.at(Axis::DiodeSpread);
    if dv == 0.0 {
        return Ok(part.diode);
    }
    part.diode.shifted(Volts::new(dv)?)
}

/// The breakdown part at a point: its voltage × the tolerance axis.
///
/// # Errors
/// A part whose voltage was never sized → [`Reason::Inconsistent`] on `"breakdown voltage"`;
/// the library's refusals of the law.
pub fn breakdown_at(part: &BreakdownPart, p: &Point) -> Result<Breakdown, Error> {
    let v = part
        .voltage
        .ok_or(Error::new("breakdown voltage", Reason::Inconsistent))?;
    part.device_at(v)?.scaled(p.at(Axis::BreakdownTol))
}

/// The switch's own avalanche at a point: its stated voltage × the avalanche-tolerance axis.
///
/// # Errors
/// The library's refusals of [`Breakdown::scaled`].
pub fn avalanche_at(d: &DriverBoard, p: &Point) -> Result<Breakdown, Error> {
    d.switch.avalanche.scaled(p.at(Axis::AvalancheTol))
}

/// True where the switch itself is the clamp on a healthy switch-off (its own avalanche, its
/// own clamp, or an H-bridge's switches and diodes), so it cannot avalanche above a clamp.
pub fn switch_is_clamp(d: &DriverBoard) -> bool {
    matches!(
        d.clamp,
        ClampBoard::Avalanche | ClampBoard::SwitchClamp { .. } | ClampBoard::HBridge(_)
    )
}

/// A switch clamp: the avalanche-style breakdown part, or the active clamp with its overdrive.
fn switch_clamp(
    part: &BreakdownPart,
    overdrive: Option<(Volts, f32)>,
    p: &Point,
) -> Result<Clamp, Error> {
    let device = breakdown_at(part, p)?;
    let Some((vth, k)) = overdrive else {
        return Ok(Clamp::Avalanche(device));
    };
    // The zener that makes the whole clamp hold the part's voltage at its test current.
    let at_test = vth.value() + libm::sqrtf(part.test_current.value() / k);
    let vz = device.nominal_voltage().value() - at_test;
    if !(vz > 0.0) {
        return Err(Error::new("active clamp voltage", Reason::Inconsistent));
    }
    let zener = Breakdown::new(
        BreakdownLaw::Datasheet {
            vz: Volts::new(vz)?,
            izt: Amps::new(1e-3)?,
            rz: crate::units::Ohms::new(0.0)?,
        },
        device.tc(),
        Temperature::from_celsius(25.0)?,
    )?;
    Ok(Clamp::ActiveClamp(ActiveClamp {
        zener,
        zener_current: Amps::new(1e-3)?,
        gate_threshold: vth,
        transconductance_a_per_v2: Some(k),
    }))
}

/// The healthy decay path of driver `d` at point `p`.
///
/// # Errors
/// The library's refusals of a part (see each builder).
pub fn path_at(d: &DriverBoard, p: &Point) -> Result<Path, Error> {
    let clamp = match &d.clamp {
        ClampBoard::Diode(dp) => Clamp::FreewheelDiode(diode_at(dp, p)?),
        ClampBoard::HBridge(dp) => Clamp::HBridgeFastDecay(diode_at(dp, p)?),
        ClampBoard::ResistorDiode { resistor, diode } => Clamp::ResistorDiode {
            resistor: *resistor,
            diode: diode_at(diode, p)?,
        },
        ClampBoard::ZenerDiode { zener, diode } => Clamp::ZenerDiode {
            zener: breakdown_at(zener, p)?,
            diode: diode_at(diode, p)?,
        },
        ClampBoard::SwitchedFreewheel {
            zener,
            diode,
            bypass,
        } => Clamp::SwitchedFreewheel(SwitchedFreewheel {
            diode: diode_at(diode, p)?,
            zener: breakdown_at(zener, p)?,
            bypass: *bypass,
        }),
        ClampBoard::TvsAcrossCoil(b) => Clamp::TvsAcrossCoil(breakdown_at(b, p)?),
        ClampBoard::TvsAcrossSwitch(b) => Clamp::AcrossSwitch(breakdown_at(b, p)?),
        ClampBoard::Varistor { device, .. } => {
            Clamp::Varistor(device.scaled(p.at(Axis::BreakdownTol))?)
        }
        ClampBoard::SwitchClamp { clamp, overdrive } => switch_clamp(clamp, *overdrive, p)?,
        ClampBoard::Avalanche => Clamp::Avalanche(avalanche_at(d, p)?),
        ClampBoard::Snubber {
            resistor,
            capacitor,
        } => {
            return Ok(Path::Snubber(RcSnubber {
                resistor: *resistor,
                capacitor: *capacitor,
            }))
        }
    };
    Ok(Path::Clamp(clamp))
}

/// The operating point at `p`: supply, start current V/R(T_winding), and each part's
/// temperature from its own axis (the switch's axis for a clamp that is the switch itself).
///
/// # Errors
/// The library's refusals of [`Coil::steady_current`] and of the temperatures.
pub fn operating_at(d: &DriverBoard, coil: &Coil, p: &Point) -> Result<Operating, Error> {
    let supply = Volts::new(p.at(Axis::Supply))?;
    let winding = p.temperature(Axis::Winding)?;
    let breakdown = match d.clamp {
        ClampBoard::Avalanche => p.temperature(Axis::AvalancheTemp)?,
        _ => p.temperature(Axis::BreakdownTemp)?,
    };
    Ok(Operating {
        supply,
        start_current: coil.steady_current(supply, winding)?,
        winding,
        diodes: p.temperature(Axis::DiodeTemp)?,
        breakdown,
    })
}

/// The healthy circuit of `d` at `p`.
///
/// # Errors
/// As [`path_at`] and [`operating_at`].
pub fn circuit_at(d: &DriverBoard, p: &Point) -> Result<Circuit, Error> {
    let coil = coil_at(d, p)?;
    Ok(Circuit {
        coil,
        path: path_at(d, p)?,
        side: d.side,
        op: operating_at(d, &coil, p)?,
    })
}

/// The circuit with its clamp failed open: the switch avalanches at its own breakdown, at the
/// switch's temperature. None for a driver whose clamp is the switch itself (nothing to open).
///
/// # Errors
/// As [`circuit_at`].
pub fn open_clamp_at(d: &DriverBoard, p: &Point) -> Result<Option<Circuit>, Error> {
    if matches!(
        d.clamp,
        ClampBoard::Avalanche | ClampBoard::SwitchClamp { .. } | ClampBoard::HBridge(_)
    ) {
        return Ok(None);
    }
    let coil = coil_at(d, p)?;
    let mut op = operating_at(d, &coil, p)?;
    op.breakdown = p.temperature(Axis::AvalancheTemp)?;
    Ok(Some(Circuit {
        coil,
        path: Path::Clamp(Clamp::Avalanche(avalanche_at(d, p)?)),
        side: d.side,
        op,
    }))
}

/// A switch-off of the circuit, by its path.
#[derive(Debug, Clone, Copy)]
pub enum Off {
    /// Through the engine.
    Engine(SwitchOff),
    /// Through the snubber.
    Snubber(SnubberSwitchOff),
}

impl Circuit {
    /// Sets up the switch-off.
    ///
    /// # Errors
    /// The library's refusals of [`SwitchOff::new`] or [`SnubberSwitchOff::new`].
    pub fn switch_off(&self) -> Result<Off, Error> {
        Ok(match &self.path {
            Path::Clamp(c) => Off::Engine(SwitchOff::new(&self.coil, c, self.side, &self.op)?),
            Path::Snubber(s) => Off::Snubber(SnubberSwitchOff::new(
                &self.coil,
                s,
                self.op.supply,
                self.op.start_current,
                self.op.winding,
            )?),
        })
    }
}

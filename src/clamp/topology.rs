//! The suppression topologies, the switch's side, the operating point at switch-off, and how
//! each topology becomes one instance of the loop law of [`super::path`].
//!
//! | topology ([`Clamp`]) | g(i) | voltage across the switch | energy from supply | absorbed by |
//! |---|---|---|---|---|
//! | freewheeling diode across the coil | R·i + V_D(i) | V_s + V_D(i) | 0 | diode |
//! | resistor + diode across the coil | (R + R_x)·i + V_D(i) | V_s + R_x·i + V_D(i) | 0 | resistor, diode |
//! | zener + diode across the coil | R·i + V_Z(i) + V_D(i) | V_s + V_Z(i) + V_D(i) | 0 | zener, diode |
//! | bidirectional TVS across the coil | R·i + V_Z(i) | V_s + V_Z(i) | 0 | TVS |
//! | varistor across the coil | R·i + V₁·(i/I₁)^(1/α) | V_s + V_var(i) | 0 | varistor |
//! | switched freewheel, final turn-off | as zener + diode | as zener + diode | 0 | zener, diode |
//! | zener/TVS across the switch | R·i + V_Z(i) − V_s | V_Z(i) | V_s·Q | zener/TVS |
//! | the switch's own avalanche | R·i + V_BR(i) − V_s | V_BR(i) | V_s·Q | switch |
//! | active clamp (drain–gate zener) | R·i + V_Z + V_th + √(i/K) − V_s | V_Z + V_GS(i) | V_s·Q | switch |
//! | H-bridge fast decay (two diodes to the supply) | R·i + 2·V_D(i) + V_s | V_s + V_D(i) | −V_s·Q (returned) | diodes |
//!
//! R is the coil resistance at the winding temperature, V_D a [`Diode`] (its law at the diode
//! temperature, or a fixed drop), V_Z/V_BR a [`Breakdown`] at its own temperature.
//!
//! **Low side or high side** ([`Side`]) changes none of the loop laws: a clamp across the coil
//! is across the coil wherever the switch sits, and a clamp across the switch (a low-side
//! drain-to-ground TVS, a high-side switch's internal clamp) sees the supply in series on either
//! side. It changes where the switched node goes: a low-side switch's drain rises to the switch
//! voltage above ground; a high-side switch's output swings *below* ground, to V_s − V_switch
//! (a freewheel diode to ground holds it at −V_D; an internal 45 V clamp on a 12 V supply takes
//! it to −33 V).
//!
//! Not modelled: parasitic capacitance, the switch's turn-off time, wiring inductance; the
//! active clamp's zener carries only the gate-drive current, whose energy is neglected.

use super::path::{DiodeAt, LoopLaw, TAIL_FRACTION};
use crate::breakdown::{Breakdown, BreakdownAt};
use crate::coil::Coil;
use crate::diode::params::checked_t;
use crate::diode::Diode;
use crate::error::{self, Error, Reason};
use crate::physics::vt_at;
use crate::pwm::Freewheel;
use crate::units::{Amps, Ohms, Temperature, Volts};
use crate::varistor::{PowerAt, Varistor};

/// The suppression that catches the coil's inductive kick (the RC snubber, second order, is
/// [`super::snubber::RcSnubber`]).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Clamp {
    /// A freewheeling diode across the coil.
    FreewheelDiode(Diode),
    /// A resistor in series with a diode, across the coil.
    ResistorDiode {
        /// The series resistor.
        resistor: Ohms,
        /// The diode.
        diode: Diode,
    },
    /// A zener in series with a blocking diode, across the coil.
    ZenerDiode {
        /// The zener (breakdown law).
        zener: Breakdown,
        /// The blocking diode.
        diode: Diode,
    },
    /// A bidirectional TVS across the coil, with no series diode (it blocks the supply in the
    /// on-state because its breakdown is above it).
    TvsAcrossCoil(Breakdown),
    /// A metal-oxide varistor across the coil.
    Varistor(Varistor),
    /// A zener or TVS across the switch (low side: drain to ground).
    AcrossSwitch(Breakdown),
    /// No clamp: the switch's own avalanche at its breakdown voltage.
    Avalanche(Breakdown),
    /// The switch's active clamp: a zener from drain (or output) to gate turns the switch back
    /// on, so it conducts at V_Z + V_GS and absorbs the energy itself.
    ActiveClamp(ActiveClamp),
    /// An H-bridge's fast-decay path: both switches off, the current returns to the supply
    /// through two diodes (the body diodes or external ones, `Diode` each).
    HBridgeFastDecay(Diode),
    /// A switched freewheel: slow decay through a diode (and a bypass switch around the zener)
    /// while PWM-holding, fast decay through zener + diode at the final turn-off. As a switch-off
    /// it is the final turn-off; [`SwitchedFreewheel::hold_freewheel`] gives the hold path.
    SwitchedFreewheel(SwitchedFreewheel),
}

/// A switch's active clamp: a zener from drain to gate (or output to gate on a high side).
///
/// While clamping, the zener carries the gate-drive current `zener_current`, and the switch
/// conducts the coil current at V_GS(i) = V_th + √(i/K) (the square-law MOSFET in saturation,
/// I_D = K·(V_GS − V_th)², any device-physics textbook), so the switch holds
/// V_switch(i) = V_Z(I_gate) + V_th + √(i/K). Without a transconductance the overdrive is taken
/// as zero (a constant clamp at V_Z + V_th).
///
/// Fields are public for readable literals; [`super::SwitchOff::new`] validates them.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ActiveClamp {
    /// The drain–gate zener.
    pub zener: Breakdown,
    /// The current the zener carries while clamping (set by the gate resistor), 1 µA … 1 A.
    pub zener_current: Amps,
    /// The switch's gate threshold V_th, 0.1 … 20 V.
    pub gate_threshold: Volts,
    /// K of I_D = K·(V_GS − V_th)², in A/V² (1e-3 … 1e4), or None for no overdrive.
    pub transconductance_a_per_v2: Option<f32>,
}

/// A switched freewheel: a diode and a zener in series across the coil, with a bypass switch
/// across the zener. While holding, the bypass is on and the current freewheels through the
/// diode and the bypass; at the final turn-off the bypass opens and the zener clamps.
///
/// Fields are public for readable literals; every function that takes it validates them.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SwitchedFreewheel {
    /// The freewheel diode.
    pub diode: Diode,
    /// The zener that clamps at the final turn-off.
    pub zener: Breakdown,
    /// On-resistance of the bypass switch across the zener.
    pub bypass: Ohms,
}

impl SwitchedFreewheel {
    /// The hold path at hold current `i_hold` with the diode at `t_diode`: the diode's drop plus
    /// the bypass switch's R_on·I, no zener (what [`crate::pwm`] needs for the off-time).
    ///
    /// # Errors
    /// Errors of [`Diode::forward_drop`] and [`Freewheel::new`].
    ///
    /// ```
    /// use kickguard::breakdown::Breakdown;
    /// use kickguard::clamp::SwitchedFreewheel;
    /// use kickguard::diode::{Diode, DiodeParams};
    /// use kickguard::{Amps, Ohms, Temperature, Volts};
    /// let sw = SwitchedFreewheel { diode: Diode::Law(DiodeParams::SILICON),
    ///                              zener: Breakdown::ideal(Volts::new(18.0)?)?,
    ///                              bypass: Ohms::new(0.5)? };
    /// let fw = sw.hold_freewheel(Amps::new(0.15)?, Temperature::from_celsius(55.0)?)?;
    /// assert_eq!(fw.zener().value(), 0.0); // the zener is bypassed while holding
    /// assert!(fw.diode_drop().value() > 0.6 && fw.diode_drop().value() < 0.9);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn hold_freewheel(&self, i_hold: Amps, t_diode: Temperature) -> Result<Freewheel, Error> {
        let vd = self.diode.forward_drop(i_hold, t_diode)?.value();
        let vb = self.bypass.value() * i_hold.value();
        Freewheel::new(
            Volts::new(vd + vb).map_err(|e| e.on("hold path drop"))?,
            Volts::raw(0.0),
        )
    }

    /// The final turn-off as a plain zener + diode clamp.
    pub fn final_turn_off(&self) -> Clamp {
        Clamp::ZenerDiode {
            zener: self.zener,
            diode: self.diode,
        }
    }
}

/// Where the switch sits.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Side {
    /// Between the coil and ground: the drain rises above the supply at switch-off.
    #[default]
    Low,
    /// Between the supply and the coil: the output swings below ground at switch-off.
    High,
}

/// The operating point at the instant of switch-off, with each temperature named (no two can
/// be swapped silently). Fields are public for readable literals;
/// [`super::SwitchOff::new`] validates them.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Operating {
    /// The supply voltage (> 0).
    pub supply: Volts,
    /// The coil current at switch-off (> 0).
    pub start_current: Amps,
    /// The winding's temperature (sets the coil's resistance).
    pub winding: Temperature,
    /// The junction temperature of every diode in the clamp path.
    pub diodes: Temperature,
    /// The temperature of the breakdown device: zener, TVS, varistor, or the switch itself for
    /// its avalanche and its active clamp.
    pub breakdown: Temperature,
}

impl Operating {
    /// An operating point with the winding and every clamp part at one temperature.
    pub fn uniform(supply: Volts, start_current: Amps, t: Temperature) -> Self {
        Operating {
            supply,
            start_current,
            winding: t,
            diodes: t,
            breakdown: t,
        }
    }
}

/// Where the clamp sits in the circuit, for the voltages it produces.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub(crate) enum Placement {
    AcrossCoil,
    AcrossSwitch,
    HBridge,
}

/// The device that takes the breakdown or power-law term's energy.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub(crate) enum Absorber {
    Zener,
    Varistor,
    Switch,
}

/// A topology mapped onto the loop law.
pub(crate) struct Built {
    pub law: LoopLaw,
    pub placement: Placement,
    pub absorber: Absorber,
}

fn diode_at(d: &Diode, t: Temperature) -> Result<DiodeAt, Error> {
    match d {
        Diode::Law(p) => {
            let tk = checked_t("diode temperature", t)?;
            Ok(DiodeAt {
                a: p.n * vt_at(tk),
                ln_is: p.ln_is_at(tk),
                rs: p.rs_ohm,
                vf: 0.0,
            })
        }
        Diode::FixedDrop(_) => Ok(DiodeAt {
            vf: d.checked_fixed_drop()?,
            ..DiodeAt::NONE
        }),
    }
}

fn breakdown_at(b: &Breakdown, t: Temperature) -> Result<BreakdownAt, Error> {
    b.at_checked(t).map_err(|e| e.on("breakdown temperature"))
}

/// Checks the operating point and the clamp's own fields, and builds the loop law.
pub(crate) fn build(coil: &Coil, clamp: &Clamp, op: &Operating) -> Result<Built, Error> {
    let (i0, vs) = super::start_and_supply(op.start_current, op.supply)?;
    let r_coil = coil.resistance(op.winding)?.value();
    let mut law = LoopLaw {
        l: coil.inductance().value(),
        r_coil,
        r_ext: 0.0,
        vs_term: 0.0,
        n_diodes: 0.0,
        diode: DiodeAt::NONE,
        bd: BreakdownAt::NONE,
        power: PowerAt::NONE,
        floor: 0.0,
        tail_at: i0 * TAIL_FRACTION,
        inv_is: 0.0,
    };
    let mut placement = Placement::AcrossCoil;
    let mut absorber = Absorber::Zener;
    match clamp {
        Clamp::FreewheelDiode(d) => {
            law.diode = diode_at(d, op.diodes)?;
            law.n_diodes = 1.0;
        }
        Clamp::ResistorDiode { resistor, diode } => {
            law.diode = diode_at(diode, op.diodes)?;
            law.n_diodes = 1.0;
            law.r_ext = resistor.value();
        }
        Clamp::ZenerDiode { zener, diode } => {
            law.diode = diode_at(diode, op.diodes)?;
            law.n_diodes = 1.0;
            law.bd = breakdown_at(zener, op.breakdown)?;
        }
        Clamp::SwitchedFreewheel(sw) => {
            error::non_negative("bypass resistance", sw.bypass.value())?;
            law.diode = diode_at(&sw.diode, op.diodes)?;
            law.n_diodes = 1.0;
            law.bd = breakdown_at(&sw.zener, op.breakdown)?;
        }
        Clamp::TvsAcrossCoil(b) => law.bd = breakdown_at(b, op.breakdown)?,
        Clamp::Varistor(v) => {
            law.power = v
                .at_checked(op.breakdown)
                .map_err(|e| e.on("breakdown temperature"))?;
            absorber = Absorber::Varistor;
        }
        Clamp::AcrossSwitch(b) | Clamp::Avalanche(b) => {
            law.bd = breakdown_at(b, op.breakdown)?;
            law.vs_term = -vs;
            placement = Placement::AcrossSwitch;
            if matches!(clamp, Clamp::Avalanche(_)) {
                absorber = Absorber::Switch;
            }
            if !(law.bd.v0 > vs) {
                return Err(Error::new("breakdown voltage", Reason::CannotClamp));
            }
        }
        Clamp::ActiveClamp(ac) => {
            law.bd = active_clamp_at(ac, op.breakdown)?;
            law.power = overdrive(ac)?;
            law.vs_term = -vs;
            placement = Placement::AcrossSwitch;
            absorber = Absorber::Switch;
            if !(law.bd.v0 > vs) {
                return Err(Error::new("active clamp voltage", Reason::CannotClamp));
            }
        }
        Clamp::HBridgeFastDecay(d) => {
            law.diode = diode_at(d, op.diodes)?;
            law.n_diodes = 2.0;
            law.vs_term = vs;
            placement = Placement::HBridge;
        }
    }
    if !(law.g(i0) > 0.0) {
        // Only SPICE's exact law far below its knee can get here: at the start current the
        // clamp does not yet oppose the supply, so the current would not fall.
        return Err(Error::new("breakdown voltage", Reason::CannotClamp));
    }
    law.floor = law.find_floor(i0);
    if !(law.floor < i0) {
        return Err(Error::new("breakdown voltage", Reason::CannotClamp));
    }
    law.tail_at = (i0 - law.floor) * TAIL_FRACTION;
    law.inv_is = law.inverse_is(i0);
    Ok(Built {
        law,
        placement,
        absorber,
    })
}

/// The active clamp's constant part: V_Z at the gate current plus V_th, as a breakdown term.
fn active_clamp_at(ac: &ActiveClamp, t: Temperature) -> Result<BreakdownAt, Error> {
    let ig = error::within("zener current", ac.zener_current.value(), 1e-6, 1.0)?;
    let vth = error::within("gate threshold", ac.gate_threshold.value(), 0.1, 20.0)?;
    let vz = ac
        .zener
        .voltage(Amps::raw(ig), t)
        .map_err(|e| e.on("breakdown temperature"))?
        .value();
    Ok(BreakdownAt {
        v0: vz + vth,
        ..BreakdownAt::NONE
    })
}

/// The active clamp's overdrive √(i/K) = 1 V·exp(½·(ln i − ln(K·1 V²))).
fn overdrive(ac: &ActiveClamp) -> Result<PowerAt, Error> {
    match ac.transconductance_a_per_v2 {
        None => Ok(PowerAt::NONE),
        Some(k) => {
            let k = error::within("transconductance", k, 1e-3, 1e4)?;
            Ok(PowerAt {
                p: 1.0,
                beta: 0.5,
                l: crate::math::ln(k),
            })
        }
    }
}

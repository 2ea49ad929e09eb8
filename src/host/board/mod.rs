//! The typed board: the design file converted once into validated quantities and parts, with
//! every tolerance kept as the range of an axis for the corner engine ([`super::corners`]).
//!
//! Everything below this module works on these types only: no check reads a string of the file.
//! Each value remembers the dotted path of the field it came from ([`DriverBoard::field`] plus
//! a suffix), so a refusal anywhere later is located at that field.

mod armature;
mod clamp;
mod convert;
mod diagnosis;
mod hold;
mod inputs;
pub mod profile;
mod read;
mod switch;

pub use convert::convert;

use crate::breakdown::{Breakdown, BreakdownLaw};
use crate::clamp::Side;
use crate::coil::Coil;
use crate::diode::Diode;
use crate::host::file::Places;
use crate::host::HostError;
use crate::units::{
    Amps, Duty, Farads, Hertz, Joules, Ohms, PerKelvin, Seconds, TempDelta, Temperature, Volts,
    Watts,
};
use crate::varistor::Varistor;
use std::string::String;
use std::vec::Vec;

/// The whole board.
#[derive(Debug, Clone)]
pub struct Board {
    /// Title of the design.
    pub title: String,
    /// The design file's path, for the report.
    pub file: String,
    /// Timer tick rate of every generated count.
    pub tick: Hertz,
    /// The PWM timer's clock, if the design gives one.
    pub pwm_clock: Option<Hertz>,
    /// Coldest and hottest ambient.
    pub ambient: (Temperature, Temperature),
    /// How far a winding can rise above the ambient when on.
    pub coil_heating: TempDelta,
    /// The coil drivers.
    pub drivers: Vec<DriverBoard>,
    /// The microcontroller inputs, if any.
    pub inputs: Option<InputsBoard>,
    /// Where each field is in the file, for errors found later.
    pub places: Places,
}

impl Board {
    /// A located error about `field`, found after conversion.
    pub fn fault(&self, field: &str, message: impl Into<String>) -> HostError {
        self.places.error(field, message)
    }
}

/// A supply's range.
#[derive(Debug, Clone, Copy)]
pub struct SupplyRange {
    /// Nominal voltage.
    pub nominal: Volts,
    /// Lowest voltage.
    pub min: Volts,
    /// Highest voltage.
    pub max: Volts,
}

/// A coil driver.
#[derive(Debug, Clone)]
pub struct DriverBoard {
    /// Name as written ("pump relay").
    pub name: String,
    /// Identifier of its generated constants ("pump_relay").
    pub module: String,
    /// Path of its table in the file (`"driver[1]"`).
    pub field: String,
    /// How many identical drivers.
    pub count: u32,
    /// Where the switch sits.
    pub side: Side,
    /// Its supply.
    pub supply: SupplyRange,
    /// The nominal coil (resistance at its reference temperature, or without a coefficient).
    pub coil: Coil,
    /// ± relative tolerance of L.
    pub l_tol: f32,
    /// ± relative tolerance of R.
    pub r_tol: f32,
    /// The must-operate voltage at the reference temperature, if given.
    pub operate: Option<Volts>,
    /// The must-release voltage at the reference temperature, if given.
    pub release: Option<Volts>,
    /// Mechanical release time (0 if not given).
    pub mechanical: Seconds,
    /// Longest acceptable release time, if required.
    pub max_release_time: Option<Seconds>,
    /// Switch-offs per second at most, if given.
    pub switching_rate: Option<Hertz>,
    /// The switch.
    pub switch: SwitchBoard,
    /// The suppression.
    pub clamp: ClampBoard,
    /// PWM peak-and-hold, if used.
    pub hold: Option<HoldBoard>,
    /// Diagnosis, if wanted.
    pub diagnosis: Option<DiagnosisBoard>,
    /// The moving armature and its ADC, if given.
    pub armature: Option<ArmatureBoard>,
    /// Its supply's transient events and reverse-polarity protection, if the file gives any.
    pub profile: Option<profile::SupplyProfile>,
    /// The winding's highest allowed temperature, if given.
    pub winding_limit: Option<Temperature>,
    /// The group whose channels share the clamp's breakdown part, if any.
    pub shared: Option<String>,
}

/// The switch's ratings.
#[derive(Debug, Clone, Copy)]
pub struct SwitchBoard {
    /// Voltage rating.
    pub rating: Volts,
    /// Share of the rating the peak may reach.
    pub derating: Duty,
    /// The switch's own avalanche (nominal), with its temperature coefficient.
    pub avalanche: Breakdown,
    /// ± relative tolerance of the avalanche voltage.
    pub avalanche_tol: f32,
    /// Single-pulse avalanche energy rating (at a 25 °C start), if given.
    pub energy_single: Option<Joules>,
    /// Repetitive avalanche energy rating, if given.
    pub energy_repetitive: Option<Joules>,
    /// Junction-to-ambient thermal resistance, K/W, if given.
    pub thermal_resistance: Option<f32>,
    /// Lumped junction thermal capacitance, J/K, if given (for counting avalanche pulses).
    pub thermal_capacitance: Option<f32>,
    /// Maximum junction temperature, if given (needed with an avalanche energy rating).
    pub junction_max: Option<Temperature>,
    /// On-resistance, if given (its conduction loss heats the switch).
    pub on_resistance: Option<Ohms>,
}

/// A diode in a clamp: its law or fixed drop, its spread, its thermal resistance.
#[derive(Debug, Clone, Copy)]
pub struct DiodePart {
    /// The diode.
    pub diode: Diode,
    /// ± spread of its drop at the nominal temperature, volts (an axis).
    pub spread: f32,
    /// Junction-to-ambient thermal resistance, K/W, if given (for its self-heating).
    pub rth: Option<f32>,
}

/// The breakdown part of a clamp (zener, TVS, switch clamp) by its datasheet description.
#[derive(Debug, Clone, Copy)]
pub struct BreakdownPart {
    /// Breakdown voltage at the test current, or None when the file asks to size it ("auto").
    pub voltage: Option<Volts>,
    /// With "auto": the relative margin the sizing keeps below the switch's derated rating.
    pub auto_margin: f32,
    /// Test current.
    pub test_current: Amps,
    /// Dynamic resistance.
    pub dynamic_resistance: Ohms,
    /// Relative temperature coefficient.
    pub tempco: PerKelvin,
    /// ± relative part-to-part tolerance of the voltage (an axis).
    pub tol: f32,
    /// Continuous power rating, if given.
    pub power_rating: Option<Watts>,
    /// Single-pulse energy rating, if given.
    pub energy_rating: Option<Joules>,
    /// Junction-to-ambient thermal resistance, K/W, if given (for its self-heating).
    pub rth: Option<f32>,
}

impl BreakdownPart {
    /// The device at `voltage` (the part's own, or a candidate while sizing), nominal, its
    /// voltage stated at 25 °C (the datasheet convention).
    ///
    /// # Errors
    /// The library's refusals of the law (for example rz·Izt ≥ Vz).
    pub fn device_at(&self, voltage: Volts) -> Result<Breakdown, crate::Error> {
        let law = BreakdownLaw::Datasheet {
            vz: voltage,
            izt: self.test_current,
            rz: self.dynamic_resistance,
        };
        Breakdown::new(law, self.tempco, Temperature::from_celsius(25.0)?)
    }
}

/// The suppression, by kind, with its parts.
#[derive(Debug, Clone, Copy)]
pub enum ClampBoard {
    /// A freewheeling diode across the coil.
    Diode(DiodePart),
    /// A resistor and a diode across the coil.
    ResistorDiode {
        /// The resistor.
        resistor: Ohms,
        /// The diode.
        diode: DiodePart,
    },
    /// A zener and a blocking diode across the coil.
    ZenerDiode {
        /// The zener.
        zener: BreakdownPart,
        /// The diode.
        diode: DiodePart,
    },
    /// Diode while holding, zener + diode at the final turn-off.
    SwitchedFreewheel {
        /// The zener.
        zener: BreakdownPart,
        /// The diode.
        diode: DiodePart,
        /// On-resistance of the bypass switch.
        bypass: Ohms,
    },
    /// A bidirectional TVS across the coil.
    TvsAcrossCoil(BreakdownPart),
    /// A varistor across the coil (its voltage at 1 mA and its exponent).
    Varistor {
        /// The device at nominal tolerance.
        device: Varistor,
        /// Its breakdown description (voltage, tolerance, ratings).
        part: BreakdownPart,
    },
    /// A TVS across the switch.
    TvsAcrossSwitch(BreakdownPart),
    /// The switch's own clamp (an internal active clamp), optionally with its overdrive.
    SwitchClamp {
        /// The clamp voltage part.
        clamp: BreakdownPart,
        /// Gate threshold and transconductance (A/V²), for the √(i/K) overdrive.
        overdrive: Option<(Volts, f32)>,
    },
    /// No clamp: the switch's own avalanche.
    Avalanche,
    /// An H-bridge's fast-decay path through two diodes.
    HBridge(DiodePart),
    /// An RC snubber across the coil.
    Snubber {
        /// Series resistor.
        resistor: Ohms,
        /// Capacitor.
        capacitor: Farads,
    },
}

impl ClampBoard {
    /// The kind's name as the file spells it.
    pub fn kind(&self) -> &'static str {
        match self {
            ClampBoard::Diode(_) => "diode",
            ClampBoard::ResistorDiode { .. } => "resistor+diode",
            ClampBoard::ZenerDiode { .. } => "zener+diode",
            ClampBoard::SwitchedFreewheel { .. } => "switched-freewheel",
            ClampBoard::TvsAcrossCoil(_) => "tvs-across-coil",
            ClampBoard::Varistor { .. } => "varistor",
            ClampBoard::TvsAcrossSwitch(_) => "tvs-across-switch",
            ClampBoard::SwitchClamp { .. } => "switch-clamp",
            ClampBoard::Avalanche => "avalanche",
            ClampBoard::HBridge(_) => "h-bridge",
            ClampBoard::Snubber { .. } => "rc-snubber",
        }
    }

    /// The clamp's diode, if it has one.
    pub fn diode(&self) -> Option<&DiodePart> {
        match self {
            ClampBoard::Diode(d)
            | ClampBoard::HBridge(d)
            | ClampBoard::ResistorDiode { diode: d, .. }
            | ClampBoard::ZenerDiode { diode: d, .. }
            | ClampBoard::SwitchedFreewheel { diode: d, .. } => Some(d),
            _ => None,
        }
    }

    /// The clamp's breakdown part, if it has one.
    pub fn breakdown(&self) -> Option<&BreakdownPart> {
        match self {
            ClampBoard::ZenerDiode { zener: b, .. }
            | ClampBoard::SwitchedFreewheel { zener: b, .. }
            | ClampBoard::TvsAcrossCoil(b)
            | ClampBoard::TvsAcrossSwitch(b)
            | ClampBoard::SwitchClamp { clamp: b, .. }
            | ClampBoard::Varistor { part: b, .. } => Some(b),
            _ => None,
        }
    }

    /// The devices that take the decay's energy, as the report names them.
    pub fn absorbers(&self) -> &'static str {
        match self {
            ClampBoard::Diode(_) => "the freewheeling diode",
            ClampBoard::ResistorDiode { .. } => "the resistor and the diode",
            ClampBoard::ZenerDiode { .. } | ClampBoard::SwitchedFreewheel { .. } => {
                "the zener and the diode"
            }
            ClampBoard::TvsAcrossCoil(_) | ClampBoard::TvsAcrossSwitch(_) => "the TVS",
            ClampBoard::Varistor { .. } => "the varistor",
            ClampBoard::SwitchClamp { .. } | ClampBoard::Avalanche => "the switch",
            ClampBoard::HBridge(_) => "the two diodes (the rest returns to the supply)",
            ClampBoard::Snubber { .. } => "the snubber resistor",
        }
    }
}

/// The moving armature, its tolerances and the ADC on the coil current.
#[derive(Debug, Clone, Copy)]
pub struct ArmatureBoard {
    /// The nominal armature (L_seat is the coil's inductance).
    pub nominal: crate::armature::Armature,
    /// Its tolerances.
    pub tol: crate::armature::sizing::Tolerances,
    /// The ADC.
    pub adc: crate::armature::sizing::Adc,
}

/// PWM peak-and-hold.
#[derive(Debug, Clone, Copy)]
pub struct HoldBoard {
    /// Current to reach before holding.
    pub pull_in: Amps,
    /// Mean current to hold.
    pub hold: Amps,
    /// PWM frequency, or None to size it for `max_ripple`.
    pub frequency: Option<Hertz>,
    /// Largest peak-to-peak ripple, if required.
    pub max_ripple: Option<Amps>,
}

/// A timed measurement of the switch-off.
#[derive(Debug, Clone, Copy)]
pub enum MeasureBoard {
    /// A comparator across the switch at this threshold.
    Comparator(Volts),
    /// A current-sense window from `upper` down to `lower`.
    Current {
        /// Upper threshold.
        upper: Amps,
        /// Lower threshold.
        lower: Amps,
    },
}

/// Diagnosis from timed measurements.
#[derive(Debug, Clone)]
pub struct DiagnosisBoard {
    /// The measurements (each one a window table).
    pub measurements: Vec<MeasureBoard>,
    /// Relative guard band.
    pub guard: Duty,
    /// Timing jitter of the firmware's measurement, ticks.
    pub jitter_ticks: u32,
    /// The shorted-turns fault: the range of its inductance factor (lowest, highest) and its
    /// resistance factor, each in (0, 1).
    pub shorted: ((f32, f32), f32),
    /// Relative tolerance of every comparator threshold (divider and comparator), an axis of
    /// its windows.
    pub comparator_tolerance: f32,
    /// How many fault readings in a row the firmware waits for.
    pub confirmations: u32,
    /// The comparator's reference voltage, if given (the proposed comparator's divider ratio
    /// is emitted for it).
    pub reference: Option<Volts>,
}

/// The microcontroller's pins and inputs.
#[derive(Debug, Clone)]
pub struct InputsBoard {
    /// Nominal and lowest pin supply.
    pub supply: (Volts, Volts),
    /// The pins' clamp diodes.
    pub clamp: Diode,
    /// Hottest microcontroller.
    pub max_temperature: Temperature,
    /// Injection limit per pin.
    pub limit: Amps,
    /// Injection limit in total.
    pub total_limit: Amps,
    /// The rail's minimum load, if given.
    pub rail_min_load: Option<Amps>,
    /// Leakage current and the error it may cause, if given.
    pub leakage: Option<(Amps, Volts)>,
    /// The unpowered rail's load and allowed voltage, if given.
    pub rail_off: Option<(Ohms, Volts)>,
    /// The inputs.
    pub inputs: Vec<InputBoard>,
}

/// Where an input's signal range comes from.
#[derive(Debug, Clone, Copy)]
pub enum SignalSource {
    /// Stated: steady min/max, transient min/max, transient width.
    Stated {
        /// Lowest and highest steady voltage.
        steady: (Volts, Volts),
        /// Lowest and highest transient voltage.
        transient: (Volts, Volts),
        /// Longest transient.
        width: Seconds,
    },
    /// The output-sense line of the driver at this index (its open-clamp swing).
    SenseOf(usize),
}

/// One input line.
#[derive(Debug, Clone)]
pub struct InputBoard {
    /// Name as written.
    pub name: String,
    /// Identifier of its constants.
    pub module: String,
    /// Path of its table in the file.
    pub field: String,
    /// How many identical inputs.
    pub count: u32,
    /// Its signal.
    pub source: SignalSource,
    /// Its series resistor, or None to size it.
    pub resistor: Option<Ohms>,
    /// Whether its signal can be present while the pins' supply is off (the rail-off checks
    /// count it only then).
    pub present_unpowered: bool,
}

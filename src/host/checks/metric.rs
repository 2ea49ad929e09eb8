//! The figures a check holds, named, with the direction that is worst: the one key the
//! vertex search, the Monte Carlo run and the report share.

use crate::host::board::DriverBoard;
use crate::host::corners::{worst, Extreme, Point, Sense};
use crate::host::figures::{Figures, Needs};
use crate::host::heating;

/// One figure of [`Figures`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Metric {
    /// Peak voltage across the switch (max).
    PeakSwitch,
    /// The healthy peak across the switch as a share of the switch's avalanche onset at the
    /// same point (max): above 1 the switch avalanches on every healthy switch-off.
    AvalancheShare,
    /// The output's extreme below ground, high side (min).
    PeakOutputLow,
    /// Release time (max).
    Release,
    /// Off time (max).
    OffTime,
    /// On-current (min).
    OnCurrent,
    /// On-current × the unit's own resistance at its reference temperature, V (min: the
    /// operate check against the must-operate voltage).
    OperateDrive,
    /// Stored energy at switch-off (max).
    Stored,
    /// Energy into the clamp diode(s) per switch-off (max).
    EnergyDiode,
    /// Energy into the zener, TVS or varistor per switch-off (max).
    EnergyBreakdown,
    /// Energy into the clamp resistor per switch-off (max).
    EnergyResistor,
    /// Energy into the switch per switch-off (max).
    EnergySwitch,
    /// Energy returned to the supply per switch-off (max).
    EnergyReturned,
    /// Average power in the clamp diode (max).
    PowerDiode,
    /// Average power in the zener, TVS or varistor (max).
    PowerBreakdown,
    /// Average power in the switch (max).
    PowerSwitch,
    /// Avalanche switch-offs survived when every switch-off avalanches (min).
    SwitchSurvivable,
    /// Open clamp: energy per switch-off (max).
    OpenEnergy,
    /// Open clamp: switch-offs survived (min).
    OpenSurvivable,
    /// Hold: duty needed (max).
    HoldDuty,
    /// Hold: current held with the emitted duty (min).
    HoldHeldMin,
    /// Hold: current held with the emitted duty (max).
    HoldHeldMax,
    /// Hold: ripple (max).
    HoldRipple,
    /// Hold: zener power (max).
    HoldZener,
    /// Hold: diode power (max).
    HoldDiode,
    /// Hold: the zener power a switched freewheel saves (max).
    HoldUnbypassed,
    /// Hold: time to the pull-in current (max).
    PullIn,
    /// Hold: winding power (max).
    HoldCoil,
    /// Diagnosis: measurement `m` under condition `c` (index into
    /// [`crate::diagnosis::Condition::ALL`]), its shortest (`high` false) or longest reading.
    Diag {
        /// Measurement index.
        m: u8,
        /// Condition index.
        c: u8,
        /// The longest reading (else the shortest).
        high: bool,
    },
}

impl Metric {
    /// Every figure but the diagnosis readings (which take a measurement and a condition).
    pub const SCALAR: [Metric; 28] = [
        Metric::PeakSwitch,
        Metric::AvalancheShare,
        Metric::PeakOutputLow,
        Metric::Release,
        Metric::OffTime,
        Metric::OnCurrent,
        Metric::OperateDrive,
        Metric::Stored,
        Metric::EnergyDiode,
        Metric::EnergyBreakdown,
        Metric::EnergyResistor,
        Metric::EnergySwitch,
        Metric::EnergyReturned,
        Metric::PowerDiode,
        Metric::PowerBreakdown,
        Metric::PowerSwitch,
        Metric::SwitchSurvivable,
        Metric::OpenEnergy,
        Metric::OpenSurvivable,
        Metric::HoldDuty,
        Metric::HoldHeldMin,
        Metric::HoldHeldMax,
        Metric::HoldRipple,
        Metric::HoldZener,
        Metric::HoldDiode,
        Metric::HoldUnbypassed,
        Metric::PullIn,
        Metric::HoldCoil,
    ];

    /// Which end is worst.
    pub fn sense(self) -> Sense {
        match self {
            Metric::PeakOutputLow
            | Metric::OnCurrent
            | Metric::OperateDrive
            | Metric::SwitchSurvivable
            | Metric::OpenSurvivable
            | Metric::HoldHeldMin => Sense::Min,
            Metric::Diag { high: false, .. } => Sense::Min,
            _ => Sense::Max,
        }
    }

    /// The figure at one point, None where it does not apply there.
    pub fn read(self, d: &DriverBoard, f: &Figures) -> Option<f32> {
        let h = f.hold;
        let pw = || heating::powers(d, f);
        match self {
            Metric::PeakSwitch => Some(f.peak_switch),
            Metric::AvalancheShare => f.avalanche_onset.map(|v| f.peak_switch / v),
            Metric::PeakOutputLow => Some(f.peak_output),
            Metric::Release => f.release,
            Metric::OffTime => Some(f.off_time),
            Metric::OnCurrent => Some(f.on_current),
            Metric::OperateDrive => f.operate_drive,
            Metric::Stored => Some(f.energy.stored),
            Metric::EnergyDiode => Some(f.energy.diode),
            Metric::EnergyBreakdown => Some(f.energy.breakdown),
            Metric::EnergyResistor => Some(f.energy.resistor),
            Metric::EnergySwitch => Some(f.energy.switch),
            Metric::EnergyReturned => Some(f.energy.returned),
            Metric::PowerDiode => Some(pw().diode),
            Metric::PowerBreakdown => Some(pw().breakdown),
            Metric::PowerSwitch => Some(pw().switch),
            Metric::SwitchSurvivable => f.switch_survivable,
            Metric::OpenEnergy => f.open.map(|o| o.energy),
            Metric::OpenSurvivable => f.open.and_then(|o| o.survivable),
            Metric::HoldDuty => h.and_then(|h| h.duty_needed),
            Metric::HoldHeldMin | Metric::HoldHeldMax => h.map(|h| h.held),
            Metric::HoldRipple => h.map(|h| h.ripple),
            Metric::HoldZener => h.map(|h| h.zener_power),
            Metric::HoldDiode => h.map(|h| h.diode_power),
            Metric::HoldUnbypassed => h.and_then(|h| h.unbypassed_zener_power),
            Metric::PullIn => h.and_then(|h| h.pull_in_time),
            Metric::HoldCoil => h.map(|h| h.coil_power),
            Metric::Diag { m, c, high } => f
                .diag
                .get(m as usize)
                .and_then(|row| row.get(c as usize))
                .copied()
                .flatten()
                .map(|(lo, hi)| if high { hi } else { lo }),
        }
    }

    /// What [`crate::host::figures::figures_with`] must compute for this figure.
    pub fn needs(self) -> Needs {
        let none = Needs {
            diag: false,
            open: false,
            hold: false,
        };
        match self {
            Metric::OpenEnergy | Metric::OpenSurvivable => Needs { open: true, ..none },
            Metric::Diag { .. } => Needs { diag: true, ..none },
            Metric::PowerDiode | Metric::PowerBreakdown | Metric::PowerSwitch => {
                Needs { hold: true, ..none }
            }
            Metric::HoldDuty
            | Metric::HoldHeldMin
            | Metric::HoldHeldMax
            | Metric::HoldRipple
            | Metric::HoldZener
            | Metric::HoldDiode
            | Metric::HoldUnbypassed
            | Metric::PullIn
            | Metric::HoldCoil => Needs { hold: true, ..none },
            _ => none,
        }
    }

    /// The worst of this figure over `points` (their `figures`), where it applies; None where
    /// it applies nowhere.
    pub fn worst(self, d: &DriverBoard, points: &[Point], figures: &[Figures]) -> Option<Extreme> {
        let (p, v): (std::vec::Vec<Point>, std::vec::Vec<f32>) = points
            .iter()
            .zip(figures)
            .filter_map(|(p, f)| self.read(d, f).map(|v| (*p, v)))
            .unzip();
        worst(&p, &v, self.sense())
    }

    /// True for a figure whose absence at a point means "beyond every value" (a hold duty above
    /// 100 %, a pull-in current never reached), so its worst over the box is unbounded as soon
    /// as one vertex lacks it.
    pub fn unbounded_when_missing(self) -> bool {
        matches!(self, Metric::HoldDuty | Metric::PullIn)
    }

    /// True when the figure is missing at some point (where it should apply everywhere: a
    /// hold duty above 100 %, a pull-in current out of reach).
    pub fn missing_somewhere(self, d: &DriverBoard, figures: &[Figures]) -> bool {
        figures.iter().any(|f| self.read(d, f).is_none())
    }

    /// The first point where the figure is missing.
    pub fn first_missing(
        self,
        d: &DriverBoard,
        points: &[Point],
        figures: &[Figures],
    ) -> Option<Point> {
        points
            .iter()
            .zip(figures)
            .find(|(_, f)| self.read(d, f).is_none())
            .map(|(p, _)| *p)
    }
}

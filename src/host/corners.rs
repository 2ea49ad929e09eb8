//! The corner engine: every independent physical quantity of a driver is its own axis, and a
//! check's worst case is found by searching every vertex of the box those axes span.
//!
//! Axes ([`Axis`]): the supply; the winding's temperature, from the coldest ambient to the
//! hottest plus its self-heating; L and R over their tolerances; the clamp diode's temperature
//! (over the ambient range plus its own heating) and its drop spread; the breakdown part's
//! temperature (likewise) and tolerance; the switch's temperature (over the ambient range plus
//! its own heating) and its avalanche tolerance. No two axes are tied: a cold winding may meet
//! a hot zener.
//!
//! Why vertices suffice: every figure a check holds is monotone in each axis over the box (each
//! check argues its directions in its docs: the loop law g(i) rises with every clamp voltage
//! and resistance, the start current falls with R and rises with the supply, the diode's drop
//! falls with temperature, a breakdown moves with the sign of its tempco). A function monotone
//! in each coordinate takes its extremes at vertices, whatever the directions, so the search
//! does not need to know them. A Monte Carlo run inside the box ([`Space::sample`]) checks the
//! claim: no sample may beat the reported worst case (tests/worst_case.rs).
//!
//! Work: 2^k evaluations for k axes that vary (at most 2^10 = 1024).

use super::board::{Board, ClampBoard, DriverBoard};
use crate::units::Temperature;
use std::format;
use std::string::String;
use std::vec::Vec;

/// An independent quantity of a driver.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Axis {
    /// Supply voltage, V.
    Supply = 0,
    /// Winding temperature, °C.
    Winding,
    /// Inductance scale (1 ± tolerance).
    Inductance,
    /// Resistance scale (1 ± tolerance).
    Resistance,
    /// Clamp diode junction temperature, °C.
    DiodeTemp,
    /// Clamp diode drop shift at its nominal temperature, V.
    DiodeSpread,
    /// Breakdown part (zener, TVS, varistor, switch clamp) temperature, °C.
    BreakdownTemp,
    /// Breakdown part voltage scale (1 ± tolerance).
    BreakdownTol,
    /// The switch's avalanche junction temperature, °C.
    AvalancheTemp,
    /// The switch's avalanche voltage scale (1 ± tolerance).
    AvalancheTol,
}

/// Number of axes.
pub const AXES: usize = 10;

/// Every axis, in order.
pub const ALL: [Axis; AXES] = [
    Axis::Supply,
    Axis::Winding,
    Axis::Inductance,
    Axis::Resistance,
    Axis::DiodeTemp,
    Axis::DiodeSpread,
    Axis::BreakdownTemp,
    Axis::BreakdownTol,
    Axis::AvalancheTemp,
    Axis::AvalancheTol,
];

/// A point of the box: one value per axis.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Point(pub [f32; AXES]);

impl Point {
    /// The value on `axis`.
    pub fn at(&self, axis: Axis) -> f32 {
        self.0.get(axis as usize).copied().unwrap_or(0.0)
    }

    /// A temperature axis as a [`Temperature`].
    ///
    /// # Errors
    /// A value outside the library's temperature range (the board's ranges keep every axis
    /// inside it, so this only reports a broken invariant).
    pub fn temperature(&self, axis: Axis) -> Result<Temperature, crate::Error> {
        Temperature::from_celsius(self.at(axis))
    }

    /// The same point with `axis` set to `v`.
    pub fn with(mut self, axis: Axis, v: f32) -> Point {
        if let Some(x) = self.0.get_mut(axis as usize) {
            *x = v;
        }
        self
    }
}

/// The box of one driver: the range of every axis.
#[derive(Debug, Clone, Copy)]
pub struct Space {
    lo: [f32; AXES],
    hi: [f32; AXES],
}

/// Self-heating of the clamp parts and the switch above the hottest ambient (K), found by
/// [`super::heating`] from their powers.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Rises {
    /// The clamp diode's rise.
    pub diode: f32,
    /// The breakdown part's rise (for a switch clamp: the switch's).
    pub breakdown: f32,
    /// The switch's rise (its avalanche energy at the switching rate, its conduction loss).
    pub switch: f32,
}

impl Space {
    /// The box of driver `d` on `board`, with the clamp parts' self-heating `rises`.
    pub fn for_driver(board: &Board, d: &DriverBoard, rises: Rises) -> Space {
        let (a_lo, a_hi) = (board.ambient.0.celsius(), board.ambient.1.celsius());
        let heat = board.coil_heating.kelvin();
        let bd_tol = d.clamp.breakdown().map_or(0.0, |b| b.tol);
        let spread = d.clamp.diode().map_or(0.0, |p| p.spread);
        let mut s = Space {
            lo: [0.0; AXES],
            hi: [0.0; AXES],
        };
        let mut set = |a: Axis, lo: f32, hi: f32| {
            if let (Some(l), Some(h)) = (s.lo.get_mut(a as usize), s.hi.get_mut(a as usize)) {
                *l = lo;
                *h = hi;
            }
        };
        set(Axis::Supply, d.supply.min.value(), d.supply.max.value());
        set(Axis::Winding, a_lo, a_hi + heat);
        set(Axis::Inductance, 1.0 - d.l_tol, 1.0 + d.l_tol);
        set(Axis::Resistance, 1.0 - d.r_tol, 1.0 + d.r_tol);
        // Axes a driver's parts do not have stay at one value (they would only double the
        // vertices): no diode, no breakdown part, no avalanche (a clamp inside the switch).
        let has_diode = d.clamp.diode().is_some();
        let has_breakdown = d.clamp.breakdown().is_some();
        let avalanches = !matches!(
            d.clamp,
            ClampBoard::SwitchClamp { .. } | ClampBoard::HBridge(_)
        );
        let only = |on: bool, hi: f32| if on { hi } else { a_lo };
        set(Axis::DiodeTemp, a_lo, only(has_diode, a_hi + rises.diode));
        set(Axis::DiodeSpread, -spread, spread);
        let bd_rise = match d.clamp {
            ClampBoard::SwitchClamp { .. } => rises.switch,
            _ => rises.breakdown,
        };
        set(
            Axis::BreakdownTemp,
            a_lo,
            only(has_breakdown, a_hi + bd_rise),
        );
        set(Axis::BreakdownTol, 1.0 - bd_tol, 1.0 + bd_tol);
        set(
            Axis::AvalancheTemp,
            a_lo,
            only(avalanches, a_hi + rises.switch),
        );
        let av_tol = if avalanches {
            d.switch.avalanche_tol
        } else {
            0.0
        };
        set(Axis::AvalancheTol, 1.0 - av_tol, 1.0 + av_tol);
        s
    }

    /// Lowest and highest value of an axis.
    pub fn range(&self, a: Axis) -> (f32, f32) {
        (
            self.lo.get(a as usize).copied().unwrap_or(0.0),
            self.hi.get(a as usize).copied().unwrap_or(0.0),
        )
    }

    /// The axes that vary.
    pub fn varying(&self) -> Vec<Axis> {
        ALL.iter()
            .copied()
            .filter(|a| {
                let (lo, hi) = self.range(*a);
                hi > lo
            })
            .collect()
    }

    /// Every vertex of the box (2^k points for the k axes that vary).
    pub fn vertices(&self) -> Vec<Point> {
        let axes = self.varying();
        let base = Point(self.lo);
        let mut out = Vec::with_capacity(1 << axes.len());
        for mask in 0u32..(1u32 << axes.len()) {
            let mut p = base;
            for (bit, a) in axes.iter().enumerate() {
                if mask & (1 << bit) != 0 {
                    if let Some(v) = p.0.get_mut(*a as usize) {
                        *v = self.range(*a).1;
                    }
                }
            }
            out.push(p);
        }
        out
    }

    /// A point drawn uniformly inside the box.
    pub fn sample(&self, rng: &mut Rng) -> Point {
        let mut p = Point(self.lo);
        for (k, v) in p.0.iter_mut().enumerate() {
            let (lo, hi) = (
                self.lo.get(k).copied().unwrap_or(0.0),
                self.hi.get(k).copied().unwrap_or(0.0),
            );
            *v = lo + (hi - lo) * rng.unit();
        }
        p
    }

    /// A point drawn normally inside the box: on each axis about its middle with the
    /// half-range as `sigmas` standard deviations (Box–Muller), truncated to the range by
    /// redrawing (at most 64 draws an axis, each inside with probability ≥ 68 % for k ≥ 1; the
    /// middle after 64 misses, a chance below 1e-31).
    pub fn sample_normal(&self, rng: &mut Rng, sigmas: u8) -> Point {
        let k = f32::from(sigmas.max(1));
        let mut p = Point(self.lo);
        for (j, v) in p.0.iter_mut().enumerate() {
            let (lo, hi) = (
                self.lo.get(j).copied().unwrap_or(0.0),
                self.hi.get(j).copied().unwrap_or(0.0),
            );
            let (mid, half) = ((lo + hi) / 2.0, (hi - lo) / 2.0);
            let mut z = 0.0f32;
            for _ in 0..64 {
                let u1 = 1.0 - rng.unit();
                let u2 = rng.unit();
                let x = libm::sqrtf(-2.0 * libm::logf(u1))
                    * libm::cosf(2.0 * core::f32::consts::PI * u2);
                if x.abs() <= k {
                    z = x;
                    break;
                }
            }
            *v = (mid + half * z / k).clamp(lo.min(hi), hi.max(lo));
        }
        p
    }

    /// The corner as numbers, the axes that vary.
    pub fn values(&self, p: &Point) -> Vec<crate::host::checks::AxisValue> {
        self.varying()
            .iter()
            .map(|a| axis_value_of(*a, p.at(*a)))
            .collect()
    }

    /// Every axis that varies as numbers: (machine name, lowest, highest, unit).
    pub fn ranges(&self) -> Vec<(&'static str, f32, f32, &'static str)> {
        self.varying()
            .iter()
            .map(|a| {
                let (lo, hi) = self.range(*a);
                let (name, unit) = axis_machine(*a);
                (name, lo, hi, unit)
            })
            .collect()
    }

    /// The corner in words, naming only the axes that vary.
    pub fn describe(&self, p: &Point) -> String {
        let parts: Vec<String> = self
            .varying()
            .iter()
            .map(|a| describe_axis(*a, p.at(*a)))
            .collect();
        parts.join(", ")
    }
}

impl Space {
    /// The range of every axis that varies, in words ("supply 21.6 V … 26.4 V").
    pub fn describe_ranges(&self) -> Vec<String> {
        self.varying()
            .iter()
            .map(|a| {
                let (lo, hi) = self.range(*a);
                format!(
                    "{} {} … {}{}",
                    axis_name(*a),
                    axis_value(*a, lo),
                    axis_value(*a, hi),
                    axis_note(*a)
                )
            })
            .collect()
    }
}

/// An axis's name in words.
pub fn axis_name(a: Axis) -> &'static str {
    match a {
        Axis::Supply => "supply",
        Axis::Winding => "winding",
        Axis::Inductance => "L",
        Axis::Resistance => "R",
        Axis::DiodeTemp => "diode",
        Axis::DiodeSpread => "diode drop",
        Axis::BreakdownTemp => "clamp part",
        Axis::BreakdownTol => "clamp voltage",
        Axis::AvalancheTemp => "switch",
        Axis::AvalancheTol => "avalanche",
    }
}

/// What an axis's range means where its name alone could mislead, for the corner box.
pub fn axis_note(a: Axis) -> &'static str {
    match a {
        Axis::DiodeSpread => {
            " (the spread of the drop at the diode law's nominal temperature, a spread of IS that scales with absolute temperature; a fixed drop moves by it at every temperature)"
        }
        Axis::AvalancheTemp => {
            " (the switch's junction, for its avalanche: what an open clamp or the switch's own clamping does)"
        }
        _ => "",
    }
}

/// An axis value in words, with its unit.
pub fn axis_value(a: Axis, v: f32) -> String {
    let pct = |x: f32| format!("{:+.0} %", (x - 1.0) * 100.0);
    match a {
        Axis::Supply => format!("{v:.1} V"),
        Axis::Winding | Axis::DiodeTemp | Axis::BreakdownTemp | Axis::AvalancheTemp => {
            format!("{v:.0} °C")
        }
        Axis::Inductance | Axis::Resistance | Axis::BreakdownTol | Axis::AvalancheTol => pct(v),
        Axis::DiodeSpread => format!("{:+.0} mV", v * 1e3),
    }
}

/// An axis's machine name and unit, for the JSON.
pub fn axis_machine(a: Axis) -> (&'static str, &'static str) {
    match a {
        Axis::Supply => ("supply", "V"),
        Axis::Winding => ("winding_temperature", "°C"),
        Axis::Inductance => ("inductance_scale", "1"),
        Axis::Resistance => ("resistance_scale", "1"),
        Axis::DiodeTemp => ("diode_temperature", "°C"),
        Axis::DiodeSpread => ("diode_drop_shift", "V"),
        Axis::BreakdownTemp => ("clamp_part_temperature", "°C"),
        Axis::BreakdownTol => ("clamp_voltage_scale", "1"),
        Axis::AvalancheTemp => ("switch_temperature", "°C"),
        Axis::AvalancheTol => ("avalanche_scale", "1"),
    }
}

/// One axis value as numbers.
pub fn axis_value_of(a: Axis, v: f32) -> crate::host::checks::AxisValue {
    let (name, unit) = axis_machine(a);
    crate::host::checks::AxisValue {
        name,
        value: v,
        unit,
    }
}

/// One axis value in words ("supply 26.4 V").
pub fn describe_axis(a: Axis, v: f32) -> String {
    format!("{} {}", axis_name(a), axis_value(a, v))
}

/// Whether a check's worst case is its largest or its smallest value.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Sense {
    /// The largest value is the worst (a voltage, a time, an energy).
    Max,
    /// The smallest value is the worst (a margin, a held current).
    Min,
}

/// The worst value found, where, and whether every vertex gave the same.
#[derive(Debug, Clone, Copy)]
pub struct Extreme {
    /// The worst value.
    pub value: f32,
    /// The vertex that set it.
    pub at: Point,
    /// True when every vertex gave the same value (to 1e-6 relative).
    pub ties: bool,
}

/// The worst of `values` (one per point of `points`) in `sense`. None for no values.
pub fn worst(points: &[Point], values: &[f32], sense: Sense) -> Option<Extreme> {
    let mut best: Option<(f32, Point)> = None;
    let (mut lo, mut hi) = (f32::INFINITY, f32::NEG_INFINITY);
    for (p, &v) in points.iter().zip(values) {
        lo = lo.min(v);
        hi = hi.max(v);
        let better = match (best, sense) {
            (None, _) => true,
            (Some((b, _)), Sense::Max) => v > b,
            (Some((b, _)), Sense::Min) => v < b,
        };
        if better {
            best = Some((v, *p));
        }
    }
    let (value, at) = best?;
    Some(Extreme {
        value,
        at,
        ties: hi - lo <= 1e-6 * hi.abs().max(lo.abs()),
    })
}

/// A small fixed-seed generator: xorshift64* (S. Vigna, "An experimental exploration of
/// Marsaglia's xorshift generators, scrambled", 2016), reproducible on every machine.
#[derive(Debug, Clone)]
pub struct Rng(u64);

impl Rng {
    /// A generator from `seed` (0 is mapped to 1: xorshift has no zero state).
    pub fn new(seed: u64) -> Self {
        Rng(seed.max(1))
    }

    /// A uniform value in [0, 1).
    pub fn unit(&mut self) -> f32 {
        let mut x = self.0;
        x ^= x >> 12;
        x ^= x << 25;
        x ^= x >> 27;
        self.0 = x;
        ((x.wrapping_mul(0x2545_F491_4F6C_DD1D) >> 40) as f32) / (1u64 << 24) as f32
    }
}

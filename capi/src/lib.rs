//! C ABI for kickguard's run-time functions: the diode drop and the diode thermometer, coil
//! R(T), winding temperature and steady current, the closed-form constant-clamp decay, the
//! diagnosis verdict on a tick count with its history, the decay fit, and the armature's dip
//! detector.
//!
//! Conventions (the header `include/kickguard.h` is generated from this file by cbindgen):
//! - every function returns a [`kg_status`]: code 0 on success, else the library's
//!   [`kickguard::Reason::code`] (1…14) or one of this layer's own codes
//!   ([`KG_NULL_POINTER`], [`KG_BAD_LENGTH`], [`KG_BAD_CODE`]), with the name of the input at
//!   fault (a static string, `input_len` bytes, not NUL-terminated);
//! - results go to caller-owned memory through out-pointers, written only on success;
//! - plain-data structs, SI units, temperatures in °C; no allocation, no global state;
//! - a null pointer, a zero or oversized length, NaN or ±∞ is a status code, never undefined
//!   behaviour, and no function can panic (every call goes to the library's panic-free
//!   functions; this layer adds only pointer checks and copies).
//!
//! The only unsafe operations (turning a raw pointer into a reference or a slice) are in the
//! four pointer helpers below (and the link-proof panic handler of the `panic-proof` feature), each with its safety argument; the exported functions are
//! `unsafe extern "C"` because their contract (a non-null pointer is valid for the access) is
//! the caller's, and call the helpers in `unsafe` blocks that forward exactly that contract.
#![cfg_attr(target_os = "none", no_std)]
#![deny(unsafe_op_in_unsafe_fn, missing_docs)]
#![allow(non_camel_case_types)]
// The doc comments of exported items become the C header's comments, so they are plain prose
// (a "Safety:" paragraph rather than a Markdown heading); each unsafe function has one.
#![allow(clippy::missing_safety_doc)]

use kickguard::clamp::closed_form::ConstantClamp;
use kickguard::coil::Coil;
use kickguard::diagnosis::classify::Windows;
use kickguard::diagnosis::fit::fit_decay;
use kickguard::diagnosis::history::VerdictHistory;
use kickguard::diagnosis::{Candidates, Condition, Verdict};
use kickguard::diode::{BandGap, DiodeParams, Ideality, Xti};
use kickguard::{Amps, Error, Henries, Ohms, PerKelvin, Seconds, Temperature, Volts};

/// A null pointer where a value was required.
pub const KG_NULL_POINTER: i32 = 100;
/// A length of zero, or above the stated maximum.
pub const KG_BAD_LENGTH: i32 = 101;
/// A verdict or condition code this interface does not know.
pub const KG_BAD_CODE: i32 = 102;
/// Most verdicts a kg_history keeps.
pub const KG_HISTORY_LEN: usize = 16;
/// Most samples kg_fit_decay takes.
pub const KG_FIT_MAX_SAMPLES: usize = 256;
/// Most window rows kg_classify reads (the library's window count).
pub const KG_MAX_WINDOWS: usize = 6;
// The header needs a literal; this fails to compile if the library's count changes.
const _: () = assert!(KG_MAX_WINDOWS == kickguard::diagnosis::classify::MAX_WINDOWS);

/// Verdict kind: healthy (kg_verdict.kind).
pub const KG_VERDICT_HEALTHY: u8 = 0;
/// Verdict kind: one fault, named by kg_verdict.condition.
pub const KG_VERDICT_FAULT: u8 = 1;
/// Verdict kind: ambiguous, the candidate faults in kg_verdict.candidates (bit 1 << condition).
pub const KG_VERDICT_AMBIGUOUS: u8 = 2;
/// Verdict kind: inside no window.
pub const KG_VERDICT_UNEXPLAINED: u8 = 3;
/// Condition code: healthy (window rows and verdicts).
pub const KG_CONDITION_HEALTHY: u8 = 0;
/// Condition code: the clamp path (freewheeling diode, zener or TVS path) open.
pub const KG_CONDITION_CLAMP_OPEN: u8 = 1;
/// Condition code: the clamp's zener shorted.
pub const KG_CONDITION_ZENER_SHORTED: u8 = 2;
/// Condition code: the coil open.
pub const KG_CONDITION_COIL_OPEN: u8 = 3;
/// Condition code: shorted turns in the coil.
pub const KG_CONDITION_SHORTED_TURNS: u8 = 4;
/// Condition code: the coil hotter than its design range.
pub const KG_CONDITION_COIL_TOO_HOT: u8 = 5;
/// Condition code: the armature did not move at switch-on (the dip detector's "not moved").
pub const KG_CONDITION_ARMATURE_STUCK_OPEN: u8 = 6;
/// Condition code: the armature did not leave its seat at switch-off (the release detector's
/// "not moved").
pub const KG_CONDITION_ARMATURE_STUCK_CLOSED: u8 = 7;
/// Status code: a value is NaN or infinite.
pub const KG_REASON_NOT_FINITE: i32 = 1;
/// Status code: a value is zero or negative where it must be positive.
pub const KG_REASON_NOT_POSITIVE: i32 = 2;
/// Status code: a value is negative.
pub const KG_REASON_NEGATIVE: i32 = 3;
/// Status code: a value (or a result) is too large.
pub const KG_REASON_TOO_LARGE: i32 = 4;
/// Status code: a value (or a result) is too small.
pub const KG_REASON_TOO_SMALL: i32 = 5;
/// Status code: a temperature below absolute zero.
pub const KG_REASON_BELOW_ABSOLUTE_ZERO: i32 = 6;
/// Status code: outside the range the model is validated for.
pub const KG_REASON_OUTSIDE_VALIDATED_RANGE: i32 = 7;
/// Status code: values that must increase do not.
pub const KG_REASON_NOT_INCREASING: i32 = 8;
/// Status code: values that must decrease do not.
pub const KG_REASON_NOT_DECREASING: i32 = 9;
/// Status code: too few values.
pub const KG_REASON_TOO_FEW: i32 = 10;
/// Status code: values that contradict each other.
pub const KG_REASON_INCONSISTENT: i32 = 11;
/// Status code: the clamp cannot clamp (its voltage does not exceed what it must).
pub const KG_REASON_CANNOT_CLAMP: i32 = 12;
/// Status code: a target the model cannot reach.
pub const KG_REASON_UNREACHABLE: i32 = 13;
/// Status code: an arithmetic overflow of the quantities' range.
pub const KG_REASON_OVERFLOW: i32 = 14;
// The header needs literals; these fail to compile if the library's codes change.
const _: () = {
    use kickguard::Reason as R;
    assert!(KG_CONDITION_HEALTHY as u32 == Condition::Healthy.code());
    assert!(KG_CONDITION_CLAMP_OPEN as u32 == Condition::ClampOpen.code());
    assert!(KG_CONDITION_ZENER_SHORTED as u32 == Condition::ZenerShorted.code());
    assert!(KG_CONDITION_COIL_OPEN as u32 == Condition::CoilOpen.code());
    assert!(KG_CONDITION_SHORTED_TURNS as u32 == Condition::ShortedTurns.code());
    assert!(KG_CONDITION_COIL_TOO_HOT as u32 == Condition::CoilTooHot.code());
    assert!(KG_CONDITION_ARMATURE_STUCK_OPEN as u32 == Condition::ArmatureStuckOpen.code());
    assert!(KG_CONDITION_ARMATURE_STUCK_CLOSED as u32 == Condition::ArmatureStuckClosed.code());
    assert!(KG_REASON_NOT_FINITE as u8 == R::NotFinite.code());
    assert!(KG_REASON_NOT_POSITIVE as u8 == R::NotPositive.code());
    assert!(KG_REASON_NEGATIVE as u8 == R::Negative.code());
    assert!(KG_REASON_TOO_LARGE as u8 == R::TooLarge.code());
    assert!(KG_REASON_TOO_SMALL as u8 == R::TooSmall.code());
    assert!(KG_REASON_BELOW_ABSOLUTE_ZERO as u8 == R::BelowAbsoluteZero.code());
    assert!(KG_REASON_OUTSIDE_VALIDATED_RANGE as u8 == R::OutsideValidatedRange.code());
    assert!(KG_REASON_NOT_INCREASING as u8 == R::NotIncreasing.code());
    assert!(KG_REASON_NOT_DECREASING as u8 == R::NotDecreasing.code());
    assert!(KG_REASON_TOO_FEW as u8 == R::TooFew.code());
    assert!(KG_REASON_INCONSISTENT as u8 == R::Inconsistent.code());
    assert!(KG_REASON_CANNOT_CLAMP as u8 == R::CannotClamp.code());
    assert!(KG_REASON_UNREACHABLE as u8 == R::Unreachable.code());
    assert!(KG_REASON_OVERFLOW as u8 == R::Overflow.code());
};

/// The outcome of a call: `code` 0 on success; otherwise the reason and the input at fault.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct kg_status {
    /// 0 success; 1…14 the library's reason codes; 100…102 this layer's own.
    pub code: i32,
    /// The input at fault, `input_len` bytes (static, not NUL-terminated); null on success.
    pub input: *const u8,
    /// Length of `input` in bytes.
    pub input_len: usize,
}

impl kg_status {
    const OK: kg_status = kg_status {
        code: 0,
        input: core::ptr::null(),
        input_len: 0,
    };
    const fn of(code: i32, input: &'static str) -> kg_status {
        kg_status {
            code,
            input: input.as_ptr(),
            input_len: input.len(),
        }
    }
}

impl From<Error> for kg_status {
    fn from(e: Error) -> kg_status {
        kg_status::of(e.reason.code() as i32, e.input)
    }
}

/// Runs `f` and writes its value through `out` on success.
fn finish<T>(out: Option<&mut T>, f: impl FnOnce() -> Result<T, Error>) -> kg_status {
    let Some(out) = out else {
        return kg_status::of(KG_NULL_POINTER, "out");
    };
    match f() {
        Ok(v) => {
            *out = v;
            kg_status::OK
        }
        Err(e) => e.into(),
    }
}

/// Safety:
/// `p` is null or valid for writes of a `T` and not aliased during the call.
unsafe fn out_ref<'a, T>(p: *mut T) -> Option<&'a mut T> {
    // SAFETY: `as_mut` maps null to None; otherwise the caller guarantees a valid, unaliased,
    // aligned pointer for the call's duration.
    unsafe { p.as_mut() }
}

/// Safety:
/// `p` is null or valid for reads of a `T`.
unsafe fn in_ref<'a, T>(p: *const T) -> Option<&'a T> {
    // SAFETY: `as_ref` maps null to None; otherwise the caller guarantees a valid, aligned
    // pointer for the call's duration.
    unsafe { p.as_ref() }
}

/// Safety:
/// `p` is null or valid for reads of `n` consecutive `T`s.
unsafe fn in_slice<'a, T>(
    p: *const T,
    n: usize,
    max: usize,
    names: (&'static str, &'static str),
) -> Result<&'a [T], kg_status> {
    if p.is_null() {
        return Err(kg_status::of(KG_NULL_POINTER, names.0));
    }
    if n == 0 || n > max {
        return Err(kg_status::of(KG_BAD_LENGTH, names.1));
    }
    // SAFETY: non-null (checked), n ≤ max so n·size_of::<T>() cannot overflow isize for the
    // small `max` used here, and the caller guarantees n valid, aligned elements.
    Ok(unsafe { core::slice::from_raw_parts(p, n) })
}

/// Safety:
/// `p` is null or valid for reads and writes of a `T`, not aliased during the call.
unsafe fn inout_ref<'a, T>(p: *mut T) -> Option<&'a mut T> {
    // SAFETY: as for `out_ref`.
    unsafe { p.as_mut() }
}

/// SPICE-class diode parameters, plain data: IS (A), N, RS (Ω), EG (eV), XTI, TNOM (°C).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct kg_diode {
    /// Saturation current IS, A.
    pub is_a: f32,
    /// Emission coefficient N.
    pub n: f32,
    /// Series resistance RS, Ω.
    pub rs_ohm: f32,
    /// Band gap EG, eV.
    pub eg_ev: f32,
    /// Saturation-current temperature exponent XTI.
    pub xti: f32,
    /// Nominal temperature TNOM, °C.
    pub tnom_c: f32,
}

fn diode_of(d: &kg_diode) -> Result<DiodeParams, Error> {
    DiodeParams::new(
        Amps::new(d.is_a)?,
        Ideality::new(d.n)?,
        Ohms::new(d.rs_ohm)?,
        BandGap::ev(d.eg_ev)?,
        Xti::new(d.xti)?,
        Temperature::from_celsius(d.tnom_c)?,
    )
}

fn diode_to(p: &DiodeParams) -> kg_diode {
    kg_diode {
        is_a: p.is().value(),
        n: p.n().value(),
        rs_ohm: p.rs().value(),
        eg_ev: p.eg().value_ev(),
        xti: p.xti().value(),
        tnom_c: p.tnom().celsius(),
    }
}

/// Writes the library's generic silicon (`schottky` = 0) or Schottky (≠ 0) preset.
///
/// Safety:
/// `out` is null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_diode_preset(schottky: u8, out: *mut kg_diode) -> kg_status {
    let p = if schottky == 0 {
        DiodeParams::SILICON
    } else {
        DiodeParams::SCHOTTKY
    };
    // SAFETY: forwarded caller contract.
    finish(unsafe { out_ref(out) }, || Ok(diode_to(&p)))
}

/// Forward drop at `i_a` (A) and junction temperature `t_c` (°C), V (Shockley equation with RS,
/// SPICE2 temperature law; see `DiodeParams::forward_drop`).
///
/// Safety:
/// `d` is null or valid for reads; `out_v` null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_diode_forward_drop(
    d: *const kg_diode,
    i_a: f32,
    t_c: f32,
    out_v: *mut f32,
) -> kg_status {
    // SAFETY: forwarded caller contract.
    let Some(d) = (unsafe { in_ref(d) }) else {
        return kg_status::of(KG_NULL_POINTER, "diode");
    };
    // SAFETY: forwarded caller contract.
    finish(unsafe { out_ref(out_v) }, || {
        let p = diode_of(d)?;
        Ok(
            p.forward_drop(Amps::new(i_a)?, Temperature::from_celsius(t_c)?)?
                .value(),
        )
    })
}

/// Junction temperature (°C) from a drop `v` (V) measured at a small current `i_a` (A): the
/// diode as a thermometer (see `DiodeParams::junction_temperature`).
///
/// Safety:
/// `d` is null or valid for reads; `out_c` null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_diode_junction_temperature(
    d: *const kg_diode,
    i_a: f32,
    v: f32,
    out_c: *mut f32,
) -> kg_status {
    // SAFETY: forwarded caller contract.
    let Some(d) = (unsafe { in_ref(d) }) else {
        return kg_status::of(KG_NULL_POINTER, "diode");
    };
    // SAFETY: forwarded caller contract.
    finish(unsafe { out_ref(out_c) }, || {
        let p = diode_of(d)?;
        Ok(p.junction_temperature(Amps::new(i_a)?, Volts::new(v)?)?
            .celsius())
    })
}

/// A coil: L (H), R (Ω) at `t_ref_c` (°C) with coefficient `alpha_per_k` (1/K; 0.00393 for
/// copper near 20 °C, IEC 60028). `has_tempco` = 0 takes R as fixed (no reference needed).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct kg_coil {
    /// Inductance, H.
    pub l_h: f32,
    /// Resistance at the reference temperature, Ω.
    pub r_ohm: f32,
    /// Reference temperature, °C (ignored without a tempco).
    pub t_ref_c: f32,
    /// Temperature coefficient of R at the reference, 1/K.
    pub alpha_per_k: f32,
    /// 0: fixed R; otherwise R(T) = R·(1 + α·(T − T_ref)).
    pub has_tempco: u8,
}

fn coil_of(c: &kg_coil) -> Result<Coil, Error> {
    let (l, r) = (Henries::new(c.l_h)?, Ohms::new(c.r_ohm)?);
    if c.has_tempco == 0 {
        Coil::fixed(l, r)
    } else {
        Coil::new(
            l,
            r,
            Temperature::from_celsius(c.t_ref_c)?,
            PerKelvin::new(c.alpha_per_k)?,
        )
    }
}

/// Coil resistance at `t_c` (°C), Ω.
///
/// Safety:
/// `c` is null or valid for reads; `out_ohm` null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_coil_resistance(
    c: *const kg_coil,
    t_c: f32,
    out_ohm: *mut f32,
) -> kg_status {
    // SAFETY: forwarded caller contract.
    let Some(c) = (unsafe { in_ref(c) }) else {
        return kg_status::of(KG_NULL_POINTER, "coil");
    };
    // SAFETY: forwarded caller contract.
    finish(unsafe { out_ref(out_ohm) }, || {
        Ok(coil_of(c)?
            .resistance(Temperature::from_celsius(t_c)?)?
            .value())
    })
}

/// Winding temperature (°C) from a measured resistance `r_ohm` (Ω).
///
/// Safety:
/// `c` is null or valid for reads; `out_c` null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_coil_winding_temperature(
    c: *const kg_coil,
    r_ohm: f32,
    out_c: *mut f32,
) -> kg_status {
    // SAFETY: forwarded caller contract.
    let Some(c) = (unsafe { in_ref(c) }) else {
        return kg_status::of(KG_NULL_POINTER, "coil");
    };
    // SAFETY: forwarded caller contract.
    finish(unsafe { out_ref(out_c) }, || {
        Ok(coil_of(c)?
            .winding_temperature(Ohms::new(r_ohm)?)?
            .celsius())
    })
}

/// Steady on-current (A) at supply `v` (V) and winding temperature `t_c` (°C): V/R(T).
///
/// Safety:
/// `c` is null or valid for reads; `out_a` null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_coil_steady_current(
    c: *const kg_coil,
    v: f32,
    t_c: f32,
    out_a: *mut f32,
) -> kg_status {
    // SAFETY: forwarded caller contract.
    let Some(c) = (unsafe { in_ref(c) }) else {
        return kg_status::of(KG_NULL_POINTER, "coil");
    };
    // SAFETY: forwarded caller contract.
    finish(unsafe { out_ref(out_a) }, || {
        Ok(coil_of(c)?
            .steady_current(Volts::new(v)?, Temperature::from_celsius(t_c)?)?
            .value())
    })
}

/// A closed-form decay through a constant clamp voltage, to an end current.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct kg_clamp_decay {
    /// Time to the end current, s.
    pub time_s: f32,
    /// Charge through the clamp, C.
    pub charge_c: f32,
    /// Energy into the clamp, J.
    pub clamp_j: f32,
    /// Energy into the coil's resistance, J.
    pub resistive_j: f32,
}

/// The decay of a coil (L `l_h` H, R `r_ohm` Ω) from `i0_a` to `i_end_a` (A) through a constant
/// clamp voltage `vc_v` (V across the coil): i(t) = (I₀ + V/R)·e^(−t/τ) − V/R, τ = L/R (see
/// `ConstantClamp`).
///
/// Safety:
/// `out` is null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_clamp_decay_to(
    l_h: f32,
    r_ohm: f32,
    vc_v: f32,
    i0_a: f32,
    i_end_a: f32,
    out: *mut kg_clamp_decay,
) -> kg_status {
    // SAFETY: forwarded caller contract.
    finish(unsafe { out_ref(out) }, || {
        let c = ConstantClamp::new(
            Henries::new(l_h)?,
            Ohms::new(r_ohm)?,
            Volts::new(vc_v)?,
            Amps::new(i0_a)?,
        )?;
        let d = c.decay_to(Amps::new(i_end_a)?)?;
        Ok(kg_clamp_decay {
            time_s: d.time.value(),
            charge_c: d.charge.value(),
            clamp_j: d.clamp_energy.value(),
            resistive_j: d.resistive_energy.value(),
        })
    })
}

/// One row of a generated window table: lowest tick, highest tick, condition code (0 healthy,
/// 1 clamp path open, 2 zener shorted, 3 coil open, 4 shorted turns, 5 coil too hot).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct kg_window_row {
    /// Lowest tick.
    pub lo: u32,
    /// Highest tick.
    pub hi: u32,
    /// Condition code.
    pub code: u32,
}

/// A verdict: `kind` 0 healthy, 1 one fault (`condition`), 2 ambiguous (`candidates`, a bit
/// set of condition codes), 3 unexplained.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct kg_verdict {
    /// 0 healthy, 1 fault, 2 ambiguous, 3 unexplained.
    pub kind: u8,
    /// The fault's condition code (kind 1).
    pub condition: u8,
    /// Bit k set: condition code k is a candidate (kind 2).
    pub candidates: u8,
}

fn verdict_to(v: Verdict) -> kg_verdict {
    match v {
        Verdict::Healthy => kg_verdict::default(),
        Verdict::Fault(c) => kg_verdict {
            kind: 1,
            condition: c.code() as u8,
            candidates: 0,
        },
        Verdict::Ambiguous(Candidates(set)) => kg_verdict {
            kind: 2,
            condition: 0,
            candidates: set,
        },
        Verdict::Unexplained => kg_verdict {
            kind: 3,
            condition: 0,
            candidates: 0,
        },
    }
}

fn verdict_of(v: &kg_verdict) -> Option<Verdict> {
    Some(match v.kind {
        0 => Verdict::Healthy,
        1 => Verdict::Fault(Condition::from_code(v.condition as u32)?),
        2 => Verdict::Ambiguous(Candidates(v.candidates)),
        3 => Verdict::Unexplained,
        _ => return None,
    })
}

/// The verdict on a measured tick count against a generated window table (`n` rows, 1 …
/// KG_MAX_WINDOWS; rows with an unknown code are ignored, as in `Windows::from_rows`).
/// Integer only.
///
/// Safety:
/// `rows` is null or valid for reads of `n` rows; `out` null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_classify(
    rows: *const kg_window_row,
    n: usize,
    ticks: u32,
    out: *mut kg_verdict,
) -> kg_status {
    // SAFETY: forwarded caller contract.
    let rows = match unsafe { in_slice(rows, n, KG_MAX_WINDOWS, ("rows", "n")) } {
        Ok(r) => r,
        Err(s) => return s,
    };
    let mut table = [[0u32; 3]; KG_MAX_WINDOWS];
    for (t, r) in table.iter_mut().zip(rows) {
        *t = [r.lo, r.hi, r.code];
    }
    let w = Windows::from_rows(table.get(..rows.len()).unwrap_or(&[]));
    // SAFETY: forwarded caller contract.
    finish(unsafe { out_ref(out) }, || {
        Ok(verdict_to(w.classify(ticks)))
    })
}

/// The last KG_HISTORY_LEN verdicts, oldest first; zero-initialise it (`len` 0) to start.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct kg_history {
    /// The verdicts, oldest first.
    pub verdicts: [kg_verdict; KG_HISTORY_LEN],
    /// How many are held (0 … KG_HISTORY_LEN).
    pub len: u8,
}

fn history_of(h: &kg_history) -> Option<VerdictHistory<KG_HISTORY_LEN>> {
    let mut out = VerdictHistory::new();
    let n = (h.len as usize).min(KG_HISTORY_LEN);
    for v in h.verdicts.iter().take(n) {
        out.push(verdict_of(v)?);
    }
    Some(out)
}

/// Appends a verdict (the oldest drops out when full).
///
/// Safety:
/// `h` is null or valid for reads and writes; `v` null or valid for reads.
#[no_mangle]
pub unsafe extern "C" fn kg_history_push(h: *mut kg_history, v: *const kg_verdict) -> kg_status {
    // SAFETY: forwarded caller contract.
    let (Some(h), Some(v)) = (unsafe { inout_ref(h) }, unsafe { in_ref(v) }) else {
        return kg_status::of(KG_NULL_POINTER, "h or v");
    };
    if verdict_of(v).is_none() || history_of(h).is_none() || h.len as usize > KG_HISTORY_LEN {
        return kg_status::of(KG_BAD_CODE, "verdict");
    }
    let n = h.len as usize;
    if n == KG_HISTORY_LEN {
        h.verdicts.copy_within(1.., 0);
        if let Some(last) = h.verdicts.last_mut() {
            *last = *v;
        }
    } else if let Some(slot) = h.verdicts.get_mut(n) {
        *slot = *v;
        h.len = h.len.saturating_add(1);
    }
    kg_status::OK
}

/// How many of the newest verdicts in a row equal `v` (the library's `consecutive`).
///
/// Safety:
/// `h` and `v` are null or valid for reads; `out` null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_history_consecutive(
    h: *const kg_history,
    v: *const kg_verdict,
    out: *mut u32,
) -> kg_status {
    // SAFETY: forwarded caller contract.
    let (Some(h), Some(v)) = (unsafe { in_ref(h) }, unsafe { in_ref(v) }) else {
        return kg_status::of(KG_NULL_POINTER, "h or v");
    };
    let (Some(hist), Some(v)) = (history_of(h), verdict_of(v)) else {
        return kg_status::of(KG_BAD_CODE, "verdict");
    };
    // SAFETY: forwarded caller contract.
    finish(unsafe { out_ref(out) }, || Ok(hist.consecutive(v) as u32))
}

/// A decay fit: τ (s) and V_c/R_loop (A).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct kg_fit {
    /// Time constant, s.
    pub tau_s: f32,
    /// Clamp voltage over the loop resistance, A.
    pub clamp_over_r_a: f32,
}

/// Least-squares fit of τ and V_c/R to `n` current samples (A, 3 … KG_FIT_MAX_SAMPLES)
/// taken every `interval_s` seconds (see `fit_decay`).
///
/// Safety:
/// `samples_a` is null or valid for reads of `n` floats; `out` null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_fit_decay(
    samples_a: *const f32,
    n: usize,
    interval_s: f32,
    out: *mut kg_fit,
) -> kg_status {
    // SAFETY: forwarded caller contract.
    let raw = match unsafe { in_slice(samples_a, n, KG_FIT_MAX_SAMPLES, ("samples_a", "n")) } {
        Ok(r) => r,
        Err(s) => return s,
    };
    // SAFETY: forwarded caller contract.
    finish(unsafe { out_ref(out) }, || {
        let mut buf = [Amps::new(0.0)?; KG_FIT_MAX_SAMPLES];
        for (b, x) in buf.iter_mut().zip(raw) {
            *b = Amps::new(*x)?;
        }
        let f = fit_decay(
            buf.get(..raw.len()).unwrap_or(&[]),
            Seconds::new(interval_s)?,
        )?;
        Ok(kg_fit {
            tau_s: f.tau.value(),
            clamp_over_r_a: f.clamp_over_r,
        })
    })
}

/// Most samples one kg_dip_push takes (a DMA half-buffer).
pub const KG_DIP_MAX_SAMPLES: usize = 4096;
/// Motion kind: no verdict yet (kg_motion.kind).
pub const KG_MOTION_PENDING: u8 = 0;
/// Motion kind: the armature moved (the dip, or the release's bump, at kg_motion.at).
pub const KG_MOTION_MOVED: u8 = 1;
/// Motion kind: a plain rise (or fall) through the window: it did not move.
pub const KG_MOTION_NOT_MOVED: u8 = 2;
/// Motion kind: no verdict can be trusted; kg_motion.why says why (1 saturated, 2 no rise,
/// 3 noisy, 4 too few samples, 5 bad configuration).
pub const KG_MOTION_UNCLEAR: u8 = 3;

/// The armature detector's thresholds (see kickguard::armature::detect::DipConfig; the
/// configuration step emits them as ARMATURE_* constants).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct kg_dip_config {
    /// 0 pull-in (a rising current, motion shows as a dip), 1 release (a falling current, a
    /// bump).
    pub polarity: u8,
    /// Counts the signal must move from its first sample before a turn counts.
    pub rise: u16,
    /// The turn that confirms a peak or valley, counts.
    pub hysteresis: u16,
    /// The dip that means motion, counts.
    pub min_dip: u16,
    /// Samples to the verdict.
    pub window: u32,
    /// The first saturated count.
    pub full_scale: u16,
}

/// The detector's progress between calls; zero-initialise it to start a switching.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct kg_dip_state {
    /// Samples taken.
    pub n: u32,
    /// The first sample (mirrored for a release).
    pub first: u16,
    /// The running maximum.
    pub top: u16,
    /// The running minimum after the peak.
    pub bottom: u16,
    /// Where the minimum was.
    pub bottom_at: u32,
    /// Sub-threshold turns seen.
    pub wiggles: u8,
    /// 1 past a confirmed peak.
    pub falling: u8,
}

/// The detector's answer.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct kg_motion {
    /// KG_MOTION_PENDING, _MOVED, _NOT_MOVED or _UNCLEAR.
    pub kind: u8,
    /// With _MOVED: the sample index of the valley (or the bump's top).
    pub at: u32,
    /// With _MOVED: the dip (or bump), counts.
    pub dip: u16,
    /// With _UNCLEAR: 1 saturated, 2 no rise, 3 noisy, 4 too few samples, 5 bad configuration.
    pub why: u8,
}

fn motion_to(m: Option<kickguard::armature::detect::Motion>) -> kg_motion {
    use kickguard::armature::detect::{Motion, Unclear};
    match m {
        None => kg_motion::default(),
        Some(Motion::Moved { at, dip }) => kg_motion {
            kind: KG_MOTION_MOVED,
            at,
            dip,
            why: 0,
        },
        Some(Motion::NotMoved) => kg_motion {
            kind: KG_MOTION_NOT_MOVED,
            ..kg_motion::default()
        },
        Some(Motion::Unclear(u)) => kg_motion {
            kind: KG_MOTION_UNCLEAR,
            why: match u {
                Unclear::Saturated => 1,
                Unclear::NoRise => 2,
                Unclear::Noisy => 3,
                Unclear::TooFewSamples => 4,
                Unclear::BadConfig => 5,
            },
            ..kg_motion::default()
        },
    }
}

/// Feeds `n` ADC samples (1 … KG_DIP_MAX_SAMPLES) to the armature detector whose progress is
/// `state` (zeroed at switch-on); writes the answer to `out` and the new progress to `state`.
/// Once `out->kind` is not KG_MOTION_PENDING the verdict is final: zero `state` for the next
/// switching. `finish` non-zero: the samples have ended (a pending verdict becomes
/// "too few samples"). Integer only; constant work per sample.
///
/// Safety:
/// `cfg` and `samples` are null or valid for reads (`n` samples); `state` null or valid for
/// reads and writes; `out` null or valid for writes.
#[no_mangle]
pub unsafe extern "C" fn kg_dip_push(
    cfg: *const kg_dip_config,
    state: *mut kg_dip_state,
    samples: *const u16,
    n: usize,
    finish: u8,
    out: *mut kg_motion,
) -> kg_status {
    use kickguard::armature::detect::{DipConfig, DipDetector, DipProgress, Polarity};
    // SAFETY: forwarded caller contract.
    let (Some(cfg), Some(state)) = (unsafe { in_ref(cfg) }, unsafe { inout_ref(state) }) else {
        return kg_status::of(KG_NULL_POINTER, "cfg or state");
    };
    // SAFETY: forwarded caller contract.
    let samples = match unsafe { in_slice(samples, n, KG_DIP_MAX_SAMPLES, ("samples", "n")) } {
        Ok(x) => x,
        Err(s) => return s,
    };
    let polarity = match cfg.polarity {
        0 => Polarity::Rising,
        1 => Polarity::Falling,
        _ => return kg_status::of(KG_BAD_CODE, "polarity"),
    };
    let config = DipConfig {
        polarity,
        rise: cfg.rise,
        hysteresis: cfg.hysteresis,
        min_dip: cfg.min_dip,
        window: cfg.window,
        full_scale: cfg.full_scale,
    };
    let mut d = DipDetector::resume(
        config,
        DipProgress {
            n: state.n,
            first: state.first,
            top: state.top,
            bottom: state.bottom,
            bottom_at: state.bottom_at,
            wiggles: state.wiggles,
            falling: state.falling != 0,
        },
    );
    let mut m = d.push_slice(samples);
    if m.is_none() && finish != 0 {
        m = Some(d.finish());
    }
    let p = d.progress();
    *state = kg_dip_state {
        n: p.n,
        first: p.first,
        top: p.top,
        bottom: p.bottom,
        bottom_at: p.bottom_at,
        wiggles: p.wiggles,
        falling: u8::from(p.falling),
    };
    // SAFETY: forwarded caller contract.
    finish_ok(unsafe { out_ref(out) }, motion_to(m))
}

/// Writes `v` to `out` (null: refused).
fn finish_ok<T>(out: Option<&mut T>, v: T) -> kg_status {
    finish(out, || Ok(v))
}

/// The panic handler a bare-metal static library needs. Unreachable: every call goes to
/// panic-free library functions. With the feature `panic-proof` it calls a symbol that does not
/// exist instead, so that linking a program against this crate (`cortex-m/src/bin/c_test.rs`)
/// proves no panic path is reachable from the exported functions. (A Rust firmware uses
/// kickguard directly, with its own handler, not this crate.)
#[cfg(target_os = "none")]
#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    #[cfg(feature = "panic-proof")]
    {
        extern "Rust" {
            #[link_name = "__PANIC_PATH_IS_REACHABLE__see_linker_error"]
            fn panic_is_reachable() -> !;
        }
        // SAFETY: the symbol does not exist; this call exists only to make the link fail.
        unsafe { panic_is_reachable() }
    }
    #[cfg(not(feature = "panic-proof"))]
    loop {}
}

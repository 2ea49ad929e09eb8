//! Worst-case analysis of a design over its corners, sizing of the values left open, and the
//! run-time constants.
//!
//! Corners of a driver: supply {min, max} × winding {coldest ambient, hottest ambient + self
//! heating} × L {−tol, +tol} × R {−tol, +tol}, 16 in all; the clamp parts sit at the ambient
//! extreme of the same side. Every check reports its worst corner by name. The optional Monte
//! Carlo draws the same quantities uniformly inside their ranges with a fixed-seed generator.

use super::design::{DesignFile, Driver, Input, Reader, Q};
use super::quantity::Unit;
use super::report::{Check, Constant, DriverPlot, PlotSeries, Report, WindowTable};
use super::HostError;
use crate::breakdown::{Breakdown, BreakdownLaw};
use crate::clamp::sizing::ZenerSizing;
use crate::clamp::snubber::{RcSnubber, SnubberSwitchOff};
use crate::clamp::{Clamp, Sample, SwitchOff};
use crate::coil::Coil;
use crate::diagnosis::{Condition, Design, Measurement};
use crate::diode::DiodeParams;
use crate::input::board::{Board, BoardInput};
use crate::input::rail::rail_off_check;
use crate::input::resistor::{resistor_window, InjectionLimits, UpperLimits};
use crate::input::{Pin, PinClamp, SignalRange};
use crate::pwm::{hold_duty, time_to_current, Freewheel, HoldOperatingPoint};
use crate::rating::ThermalPath;
use crate::timing::to_ticks;
use crate::units::{Amps, Farads, Henries, Ohms, Seconds, Temperature, Volts, Watts};
use crate::Error;
use std::format;
use std::string::{String, ToString};
use std::vec;
use std::vec::Vec;

/// A corner of the tolerances.
#[derive(Debug, Clone, Copy)]
struct Corner {
    vs: f32,
    t_winding: Temperature,
    t_clamp: Temperature,
    l_scale: f32,
    r_scale: f32,
}

impl Corner {
    fn label(&self) -> String {
        format!(
            "supply {:.1} V, winding {:.0} °C, L {:+.0} %, R {:+.0} %",
            self.vs,
            self.t_winding.celsius(),
            (self.l_scale - 1.0) * 100.0,
            (self.r_scale - 1.0) * 100.0
        )
    }
}

/// Model errors inside the analysis carry the field they came from.
fn model(field: &str) -> impl Fn(Error) -> HostError + '_ {
    move |e| HostError::Model {
        field: field.to_string(),
        error: e,
    }
}

fn temp(c: f32, field: &str) -> Result<Temperature, HostError> {
    Temperature::from_celsius(c).map_err(model(field))
}

/// The E24 series (IEC 60063), one decade.
const E24: [f32; 24] = [
    1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6,
    6.2, 6.8, 7.5, 8.2, 9.1,
];

/// Smallest E24 value ≥ `x`.
fn e24_at_least(x: f32) -> f32 {
    let decade = libm::powf(10.0, libm::floorf(libm::log10f(x.max(1e-12))));
    for k in 0..3 {
        let d = decade * libm::powf(10.0, k as f32);
        for m in E24 {
            if m * d >= x * (1.0 - 1e-6) {
                return m * d;
            }
        }
    }
    x
}

struct Env {
    amb_min: Temperature,
    amb_max: Temperature,
    winding_hot: Temperature,
}

struct Context<'a> {
    r: &'a Reader<'a>,
    tick_hz: f32,
    env: Env,
    report: Report,
}

/// Analyses a parsed design; `monte_carlo` = (samples, seed).
///
/// # Errors
/// Located input errors, and model errors that make a design meaningless (for example a release
/// current above the on-current).
pub fn analyse(
    file: &DesignFile,
    reader: &Reader<'_>,
    monte_carlo: Option<(u32, u64)>,
) -> Result<Report, HostError> {
    let r = reader;
    let tick_hz = r.q(&file.tick_rate, "tick_rate", Unit::Hertz)?;
    if !(tick_hz >= 1.0) {
        return Err(r.error(file.tick_rate.span(), "tick_rate", "must be at least 1 Hz"));
    }
    let e = &file.environment;
    let amb_min = temp(
        r.q(&e.ambient_min, "environment.ambient_min", Unit::Celsius)?,
        "environment.ambient_min",
    )?;
    let amb_max_c = r.q(&e.ambient_max, "environment.ambient_max", Unit::Celsius)?;
    let amb_max = temp(amb_max_c, "environment.ambient_max")?;
    if !(amb_max > amb_min) {
        return Err(r.error(
            e.ambient_max.span(),
            "environment.ambient_max",
            "must be above ambient_min",
        ));
    }
    let heat = r.q(
        &e.coil_self_heating,
        "environment.coil_self_heating",
        Unit::Kelvin,
    )?;
    let winding_hot = temp(amb_max_c + heat, "environment.coil_self_heating")?;
    let mut cx = Context {
        r,
        tick_hz,
        env: Env {
            amb_min,
            amb_max,
            winding_hot,
        },
        report: Report::new(&file.title, r.path),
    };
    cx.report.tick_hz = tick_hz;
    let mut avalanche_of: Vec<(String, f32, f32, f32)> = Vec::new();
    for (k, d) in file.driver.iter().enumerate() {
        let field = format!("driver[{k}]");
        let info = analyse_driver(&mut cx, file, d, &field, monte_carlo)?;
        avalanche_of.push(info);
    }
    if !file.input.is_empty() {
        let pins = file.pins.as_ref().ok_or_else(|| {
            r.error(
                0..0,
                "pins",
                "inputs are described but the [pins] table is missing",
            )
        })?;
        analyse_inputs(&mut cx, file, pins, &avalanche_of)?;
    }
    cx.report.finish();
    Ok(cx.report)
}

fn diode_named(
    r: &Reader<'_>,
    s: &Option<toml::Spanned<String>>,
    field: &str,
) -> Result<DiodeParams, HostError> {
    match s.as_ref().map(|s| (s.get_ref().as_str(), s.span())) {
        None | Some(("silicon", _)) => Ok(DiodeParams::SILICON),
        Some(("schottky", _)) => Ok(DiodeParams::SCHOTTKY),
        Some((other, span)) => Err(r.error(
            span,
            field,
            format!("unknown diode \"{other}\"; expected \"silicon\" or \"schottky\""),
        )),
    }
}

/// Returns (driver name, supply max, avalanche voltage, longest avalanche decay) for inputs.
fn analyse_driver(
    cx: &mut Context<'_>,
    file: &DesignFile,
    d: &Driver,
    field: &str,
    monte_carlo: Option<(u32, u64)>,
) -> Result<(String, f32, f32, f32), HostError> {
    let r = cx.r;
    let f = |s: &str| format!("{field}.{s}");
    let supply = file
        .supply
        .iter()
        .find(|s| s.name == d.supply)
        .ok_or_else(|| {
            r.error(
                d.coil.inductance.span(),
                &f("supply"),
                format!("no supply named \"{}\"", d.supply),
            )
        })?;
    let v_nom = r.q(&supply.nominal, "supply.nominal", Unit::Volt)?;
    let v_min = r.q(&supply.min, "supply.min", Unit::Volt)?;
    let v_max = r.q(&supply.max, "supply.max", Unit::Volt)?;
    if !(v_min > 0.0 && v_min <= v_nom && v_nom <= v_max) {
        return Err(r.error(supply.min.span(), "supply", "need 0 < min ≤ nominal ≤ max"));
    }
    let c = &d.coil;
    let l = r.q(&c.inductance, &f("coil.inductance"), Unit::Henry)?;
    let l_tol = r.q(
        &c.inductance_tolerance,
        &f("coil.inductance_tolerance"),
        Unit::Percent,
    )?;
    let res = r.q(&c.resistance, &f("coil.resistance"), Unit::Ohm)?;
    let r_tol = r.q(
        &c.resistance_tolerance,
        &f("coil.resistance_tolerance"),
        Unit::Percent,
    )?;
    let t_ref = temp(
        r.q(&c.resistance_at, &f("coil.resistance_at"), Unit::Celsius)?,
        &f("coil.resistance_at"),
    )?;
    for (q, v, name) in [
        (&c.inductance_tolerance, l_tol, "coil.inductance_tolerance"),
        (&c.resistance_tolerance, r_tol, "coil.resistance_tolerance"),
    ] {
        if !(0.0..0.5).contains(&v) {
            return Err(r.error(q.span(), &f(name), "must be between 0 % and 50 %"));
        }
    }
    let coil = Coil::copper(
        Henries::new(l).map_err(model(&f("coil.inductance")))?,
        Ohms::new(res).map_err(model(&f("coil.resistance")))?,
        t_ref,
    )
    .map_err(model(&f("coil.resistance")))?;
    let sw = &d.switch;
    let rating = r.q(&sw.rating, &f("switch.rating"), Unit::Volt)?;
    let derating = r.q(&sw.derating, &f("switch.derating"), Unit::Percent)?;
    let v_av = r.q(&sw.avalanche, &f("switch.avalanche"), Unit::Volt)?;
    if !(v_av > v_max) {
        return Err(r.error(
            sw.avalanche.span(),
            &f("switch.avalanche"),
            "must be above the highest supply",
        ));
    }
    let avalanche = Breakdown::ideal(Volts::new(v_av).map_err(model(&f("switch.avalanche")))?)
        .map_err(model(&f("switch.avalanche")))?;

    // The clamp, sizing the zener if asked.
    let cl = &d.clamp;
    let kind = cl.kind.get_ref().as_str();
    let diode = diode_named(r, &cl.diode, &f("clamp.diode"))?;
    let max_release = r.oq(
        &cl.max_release_time,
        &f("clamp.max_release_time"),
        Unit::Second,
    )?;
    let must_release = r.oq(&c.must_release, &f("coil.must_release"), Unit::Percent)?;
    let mechanical = r
        .oq(
            &c.mechanical_release,
            &f("coil.mechanical_release"),
            Unit::Second,
        )?
        .unwrap_or(0.0);
    let clamp_t = |cold: bool| if cold { cx.env.amb_min } else { cx.env.amb_max };
    let zener_law = |vz: f32| -> Result<Breakdown, HostError> {
        let izt = r.req(
            &cl.zener_test_current,
            cl.kind.span(),
            &f("clamp.zener_test_current"),
            Unit::Amp,
        )?;
        let rz = r.req(
            &cl.zener_resistance,
            cl.kind.span(),
            &f("clamp.zener_resistance"),
            Unit::Ohm,
        )?;
        let tc = r
            .oq(
                &cl.zener_tempco,
                &f("clamp.zener_tempco"),
                Unit::PercentPerKelvin,
            )?
            .unwrap_or(0.0);
        let law = BreakdownLaw::Datasheet {
            vz: Volts::new(vz).map_err(model(&f("clamp.zener")))?,
            izt: Amps::new(izt).map_err(model(&f("clamp.zener_test_current")))?,
            rz: Ohms::new(rz).map_err(model(&f("clamp.zener_resistance")))?,
        };
        Breakdown::new(law, tc, temp(25.0, "clamp")?).map_err(model(&f("clamp.zener")))
    };
    let mut sized_zener: Option<(f32, f32, f32)> = None;
    let clamp: Option<Clamp> = match kind {
        "diode" => Some(Clamp::FreewheelDiode(diode)),
        "h-bridge" => Some(Clamp::HBridgeFastDecay(diode)),
        "avalanche" => Some(Clamp::Avalanche(avalanche)),
        "resistor+diode" => {
            let rx = r.req(&cl.resistor, cl.kind.span(), &f("clamp.resistor"), Unit::Ohm)?;
            Some(Clamp::ResistorDiode { resistor: Ohms::new(rx).map_err(model(&f("clamp.resistor")))?, diode })
        }
        "tvs-to-ground" => {
            let v = r.req(&cl.tvs, cl.kind.span(), &f("clamp.tvs"), Unit::Volt)?;
            Some(Clamp::SwitchZener(Breakdown::ideal(Volts::new(v).map_err(model(&f("clamp.tvs")))?).map_err(model(&f("clamp.tvs")))?))
        }
        "zener+diode" => {
            let zq: &Q = cl.zener.as_ref().ok_or_else(|| r.error(cl.kind.span(), &f("clamp.zener"), "missing; a voltage or \"auto\""))?;
            let vz = if Reader::is_auto(zq) {
                let t_req = max_release.ok_or_else(|| r.error(zq.span(), &f("clamp.zener"), "\"auto\" needs clamp.max_release_time"))?;
                let mr = must_release.ok_or_else(|| r.error(zq.span(), &f("clamp.zener"), "\"auto\" needs coil.must_release"))?;
                let izt = r.req(&cl.zener_test_current, cl.kind.span(), &f("clamp.zener_test_current"), Unit::Amp)?;
                let rz = r.req(&cl.zener_resistance, cl.kind.span(), &f("clamp.zener_resistance"), Unit::Ohm)?;
                // Worst case for the switch: highest supply, coldest coil (largest current),
                // low coil tolerance; for the release: the same corner has the most current.
                let cold_coil = Coil::new(
                    Henries::new(l * (1.0 + l_tol)).map_err(model(&f("coil.inductance")))?,
                    Ohms::new(res * (1.0 - r_tol)).map_err(model(&f("coil.resistance")))?,
                    t_ref,
                    coil.alpha_per_k(),
                )
                .map_err(model(&f("coil")))?;
                let i0 = cold_coil.steady_current(Volts::new(v_max).map_err(model("supply.max"))?, cx.env.amb_min).map_err(model(&f("coil")))?;
                let i_rel = mr * v_nom / cold_coil.resistance(cx.env.amb_min).map_err(model(&f("coil")))?.value();
                let sizing = ZenerSizing {
                    coil: cold_coil,
                    diode,
                    zener_rz: Ohms::new(rz).map_err(model(&f("clamp.zener_resistance")))?,
                    zener_izt: Amps::new(izt).map_err(model(&f("clamp.zener_test_current")))?,
                    v_supply: Volts::new(v_max).map_err(model("supply.max"))?,
                    i_start: i0,
                    t_coil: cx.env.amb_min,
                    t_clamp: cx.env.amb_min,
                    switch_rating: Volts::new(rating).map_err(model(&f("switch.rating")))?,
                    rating_fraction: derating,
                    release_current: Amps::new(i_rel).map_err(model(&f("coil.must_release")))?,
                    max_release_time: Seconds::new((t_req - mechanical).max(1e-9)).map_err(model(&f("clamp.max_release_time")))?,
                };
                match sizing.window() {
                    Ok(w) => {
                        // Propose the largest standard value inside the window (fastest release).
                        let mut pick = w.min.value();
                        let mut v = e24_at_least(w.min.value());
                        while v <= w.max.value() {
                            pick = v;
                            v = e24_at_least(v * 1.0001);
                        }
                        sized_zener = Some((w.min.value(), w.max.value(), pick));
                        pick
                    }
                    Err(e) => {
                        cx.report.checks.push(Check::fail(
                            &d.name,
                            "zener sizing",
                            "no zener fits",
                            "",
                            None,
                            "highest supply, coldest coil",
                            &format!("requirements conflict: {e}"),
                        ));
                        return Ok((d.name.clone(), v_max, v_av, 0.0));
                    }
                }
            } else {
                r.q(zq, &f("clamp.zener"), Unit::Volt)?
            };
            Some(Clamp::ZenerDiode { zener: zener_law(vz)?, diode })
        }
        "rc-snubber" => None,
        other => {
            return Err(r.error(
                cl.kind.span(),
                &f("clamp.kind"),
                format!("unknown kind \"{other}\"; expected diode, resistor+diode, zener+diode, tvs-to-ground, avalanche, h-bridge or rc-snubber"),
            ))
        }
    };
    if let Some((lo, hi, pick)) = sized_zener {
        cx.report.checks.push(Check::info(
            &d.name,
            "zener voltage (sized)",
            &format!("{pick:.1} V"),
            &format!("window {lo:.1} … {hi:.1} V"),
            "highest supply, coldest coil",
            "largest E24 value inside the window",
        ));
    }
    let snubber = if clamp.is_none() {
        let rs = r.req(
            &cl.resistor,
            cl.kind.span(),
            &f("clamp.resistor"),
            Unit::Ohm,
        )?;
        let cs = r.req(
            &cl.capacitor,
            cl.kind.span(),
            &f("clamp.capacitor"),
            Unit::Farad,
        )?;
        Some(RcSnubber {
            resistor: Ohms::new(rs).map_err(model(&f("clamp.resistor")))?,
            capacitor: Farads::new(cs).map_err(model(&f("clamp.capacitor")))?,
        })
    } else {
        None
    };

    // The corners.
    let mut corners = Vec::new();
    for &vs in &[v_min, v_max] {
        for &cold in &[true, false] {
            for &ls in &[1.0 - l_tol, 1.0 + l_tol] {
                for &rs in &[1.0 - r_tol, 1.0 + r_tol] {
                    let t_winding = if cold {
                        cx.env.amb_min
                    } else {
                        cx.env.winding_hot
                    };
                    corners.push(Corner {
                        vs,
                        t_winding,
                        t_clamp: clamp_t(cold),
                        l_scale: ls,
                        r_scale: rs,
                    });
                }
            }
        }
    }
    let coil_at = |k: &Corner| -> Result<Coil, HostError> {
        Coil::new(
            Henries::new(l * k.l_scale).map_err(model(&f("coil.inductance")))?,
            Ohms::new(res * k.r_scale).map_err(model(&f("coil.resistance")))?,
            t_ref,
            coil.alpha_per_k(),
        )
        .map_err(model(&f("coil")))
    };
    let mut peak = (0.0f32, String::new());
    let mut release = (0.0f32, String::new());
    let mut off_time = (0.0f32, String::new());
    let mut e_switch = (0.0f32, String::new());
    let mut e_clamp = (0.0f32, String::new());
    for k in &corners {
        let ck = coil_at(k)?;
        let vs = Volts::new(k.vs).map_err(model("supply"))?;
        let i0 = ck
            .steady_current(vs, k.t_winding)
            .map_err(model(&f("coil")))?;
        let worse = |slot: &mut (f32, String), v: f32| {
            if v > slot.0 {
                *slot = (v, k.label());
            }
        };
        match (clamp, snubber) {
            (Some(cl), _) => {
                let off = SwitchOff::new(&ck, &cl, vs, i0, k.t_winding, k.t_clamp)
                    .map_err(model(&f("clamp")))?;
                worse(&mut peak, off.peak_switch_voltage().value());
                let end = Amps::new(i0.value() * 1e-2).map_err(model("current"))?;
                let dec = off.decay_to(end).map_err(model(&f("clamp")))?;
                worse(&mut off_time, dec.time.value());
                worse(&mut e_switch, dec.energy.switch.value());
                worse(
                    &mut e_clamp,
                    dec.energy.zener.value()
                        + dec.energy.diodes.value()
                        + dec.energy.resistor.value(),
                );
                if let Some(mr) = must_release {
                    let i_rel = mr * v_nom
                        / ck.resistance(k.t_winding)
                            .map_err(model(&f("coil")))?
                            .value();
                    let t = off
                        .time_to(Amps::new(i_rel).map_err(model(&f("coil.must_release")))?)
                        .map_err(model(&f("coil.must_release")))?;
                    worse(&mut release, t.value() + mechanical);
                }
            }
            (None, Some(sn)) => {
                let s = SnubberSwitchOff::new(&ck, &sn, vs, i0, k.t_winding)
                    .map_err(model(&f("clamp")))?;
                let resp = s.response().map_err(model(&f("clamp")))?;
                worse(&mut peak, resp.peak_switch_voltage.value());
                worse(&mut e_clamp, resp.energy_in_resistor.value());
                let t1 = s
                    .settle_time(Amps::new(i0.value() * 1e-2).map_err(model("current"))?)
                    .map_err(model(&f("clamp")))?;
                worse(&mut off_time, t1.value());
                if let Some(mr) = must_release {
                    let i_rel = mr * v_nom
                        / ck.resistance(k.t_winding)
                            .map_err(model(&f("coil")))?
                            .value();
                    let t = s
                        .settle_time(Amps::new(i_rel).map_err(model(&f("coil.must_release")))?)
                        .map_err(model(&f("clamp")))?;
                    worse(&mut release, t.value() + mechanical);
                }
            }
            (None, None) => {}
        }
    }
    let name = d.name.as_str();
    let limit = derating * rating;
    cx.report.checks.push(Check::against(
        name,
        "peak switch voltage",
        peak.0,
        limit,
        "V",
        &peak.1,
        &format!(
            "limit {:.0} % of the {rating:.0} V rating",
            derating * 100.0
        ),
    ));
    if let Some(rating_j) = r.oq(
        &sw.avalanche_energy,
        &f("switch.avalanche_energy"),
        Unit::Joule,
    )? {
        if e_switch.0 > 0.0 {
            cx.report.checks.push(Check::against(
                name,
                "switch avalanche energy per pulse",
                e_switch.0 * 1e3,
                rating_j * 1e3,
                "mJ",
                &e_switch.1,
                "single pulse",
            ));
        }
    } else if e_switch.0 > 0.0 {
        cx.report.checks.push(Check::warn(
            name,
            "switch avalanche energy per pulse",
            &format!("{:.1} mJ", e_switch.0 * 1e3),
            &e_switch.1,
            "no avalanche energy rating given",
        ));
    }
    if let Some(tvs_j) = r.oq(&cl.tvs_energy, &f("clamp.tvs_energy"), Unit::Joule)? {
        cx.report.checks.push(Check::against(
            name,
            "TVS energy per pulse",
            e_clamp.0 * 1e3,
            tvs_j * 1e3,
            "mJ",
            &e_clamp.1,
            "single pulse",
        ));
    }
    cx.report.checks.push(Check::info(
        name,
        "clamp energy per pulse",
        &format!("{:.1} mJ", e_clamp.0 * 1e3),
        "",
        &e_clamp.1,
        "into diode, zener and resistor",
    ));
    let off_ticks = to_ticks(Seconds::new(off_time.0).map_err(model("time"))?, cx.tick_hz)
        .map_err(model("tick_rate"))?;
    cx.report.constants.push(Constant::new(
        name,
        "OFF_TIME_TICKS",
        off_ticks,
        "wait before re-energising or reversing: current below 1 % of its on-value, worst corner",
    ));
    if must_release.is_some() {
        if let Some(t_max) = max_release {
            cx.report.checks.push(Check::against(
                name,
                "release time",
                release.0 * 1e3,
                t_max * 1e3,
                "ms",
                &release.1,
                "electrical decay + mechanical release",
            ));
        } else {
            cx.report.checks.push(Check::info(
                name,
                "release time",
                &format!("{:.2} ms", release.0 * 1e3),
                "",
                &release.1,
                "electrical decay + mechanical release",
            ));
        }
        let ticks = to_ticks(Seconds::new(release.0).map_err(model("time"))?, cx.tick_hz)
            .map_err(model("tick_rate"))?;
        cx.report.constants.push(Constant::new(
            name,
            "RELEASE_WAIT_TICKS",
            ticks,
            "wait until the contacts are open, worst corner",
        ));
    }
    if let Some(mo) = r.oq(&c.must_operate, &f("coil.must_operate"), Unit::Percent)? {
        let hot_coil = coil_at(&Corner {
            vs: v_min,
            t_winding: cx.env.winding_hot,
            t_clamp: cx.env.amb_max,
            l_scale: 1.0,
            r_scale: 1.0 + r_tol,
        })?;
        // Must-operate scales with the toleranced R relative to nominal, and with temperature.
        let p = hot_coil
            .pull_in_margin(
                Volts::new(mo * v_nom * (1.0 + r_tol)).map_err(model(&f("coil.must_operate")))?,
                Volts::new(v_min).map_err(model("supply"))?,
                cx.env.winding_hot,
            )
            .map_err(model(&f("coil.must_operate")))?;
        let corner = format!(
            "supply {v_min:.1} V, winding {:.0} °C, R +{:.0} %",
            cx.env.winding_hot.celsius(),
            r_tol * 100.0
        );
        cx.report.checks.push(Check::against(
            name,
            "pull-in voltage needed (hot, low supply)",
            p.must_operate_hot.value(),
            v_min,
            "V",
            &corner,
            "must-operate voltage scaled with R(T)",
        ));
    }
    // Thermal: average avalanche power in the switch at the switching rate.
    if let (Some(rate), Some(rth), Some(tj)) = (
        r.oq(&cl.switching_rate, &f("clamp.switching_rate"), Unit::Hertz)?,
        r.oq(
            &sw.thermal_resistance,
            &f("switch.thermal_resistance"),
            Unit::KelvinPerWatt,
        )?,
        r.oq(&sw.junction_max, &f("switch.junction_max"), Unit::Celsius)?,
    ) {
        let path = ThermalPath::new(rth, cx.env.amb_max, temp(tj, &f("switch.junction_max"))?)
            .map_err(model(&f("switch.thermal_resistance")))?;
        let p = Watts::new(e_switch.0 * rate).map_err(model("power"))?;
        let chk = path.check(p).map_err(model(&f("switch")))?;
        // Only an avalanching switch takes the decay's energy; a clamped one takes none here.
        if e_switch.0 > 0.0 {
            cx.report.checks.push(Check::against(
                name,
                "switch junction temperature",
                chk.junction.celsius(),
                tj,
                "°C",
                &e_switch.1,
                &format!(
                    "avalanche energy at {rate} Hz, ambient {:.0} °C",
                    cx.env.amb_max.celsius()
                ),
            ));
        }
    }
    // PWM hold.
    if let Some(h) = &d.hold {
        analyse_hold(
            cx,
            file,
            d,
            h,
            field,
            &coil,
            l,
            res,
            l_tol,
            r_tol,
            t_ref,
            (v_min, v_nom, v_max),
            diode,
            clamp,
        )?;
    }
    // Diagnosis.
    if let (Some(dg), Some(cl)) = (&d.diagnosis, clamp) {
        let guard = r.q(&dg.guard, &f("diagnosis.guard"), Unit::Percent)?;
        let shorted = r.q(
            &dg.shorted_turns,
            &f("diagnosis.shorted_turns"),
            Unit::Percent,
        )?;
        let design = Design {
            coil,
            inductance_tolerance: l_tol,
            resistance_tolerance: r_tol,
            v_supply_min: Volts::new(v_min).map_err(model("supply"))?,
            v_supply_max: Volts::new(v_max).map_err(model("supply"))?,
            t_winding_min: cx.env.amb_min,
            t_winding_max: cx.env.winding_hot,
            t_winding_fault_max: temp(cx.env.winding_hot.celsius() + 50.0, "environment")?,
            t_clamp_min: cx.env.amb_min,
            t_clamp_max: cx.env.amb_max,
            clamp: cl,
            switch_avalanche: avalanche,
            shorted_turns: shorted,
        };
        // Per fault: detectable if any comparator separates it from health.
        let mut seen: Vec<(Condition, Vec<String>, Vec<String>)> = Vec::new();
        for (n, q) in dg.comparator.iter().enumerate() {
            let fld = f(&format!("diagnosis.comparator[{n}]"));
            let th = r.q(q, &fld, Unit::Volt)?;
            let m = Measurement::SwitchAbove {
                threshold: Volts::new(th).map_err(model(&fld))?,
            };
            let (healthy, seps) = design.separations(&m).map_err(model(&fld))?;
            for sp in &seps {
                let idx = match seen.iter().position(|x| x.0 == sp.condition) {
                    Some(i) => i,
                    None => {
                        seen.push((sp.condition, Vec::new(), Vec::new()));
                        seen.len() - 1
                    }
                };
                if let Some(slot) = seen.get_mut(idx) {
                    let w = format!(
                        "{th} V: {:.2} … {:.2} ms against healthy {:.2} … {:.2} ms",
                        sp.window.min.value() * 1e3,
                        sp.window.max.value() * 1e3,
                        healthy.min.value() * 1e3,
                        healthy.max.value() * 1e3
                    );
                    if sp.detectable {
                        slot.1.push(format!("{w} (gap {:.2} ms)", sp.gap * 1e3));
                    } else {
                        slot.2.push(w);
                    }
                }
            }
            let w = design
                .tick_windows(&m, cx.tick_hz, guard)
                .map_err(model(&fld))?;
            cx.report.windows.push(WindowTable {
                scope: name.to_string(),
                name: format!("DIAG_{n}_WINDOWS"),
                threshold_v: th,
                entries: w
                    .entries()
                    .map(|e| [e.lo, e.hi, condition_code(e.condition)])
                    .collect(),
            });
        }
        for (cond, yes, no) in seen {
            let what = format!("diagnosis: {}", condition_name(cond));
            if yes.is_empty() {
                cx.report.checks.push(Check::warn(
                    name,
                    &what,
                    "not detectable",
                    "all corners",
                    &format!("no comparator tells it from health: {}", no.join("; ")),
                ));
            } else {
                cx.report.checks.push(Check::info(
                    name,
                    &what,
                    "detectable",
                    "",
                    "all corners",
                    &yes.join("; "),
                ));
            }
        }
    }
    // Plots of the clamp options at the nominal corner.
    if let Some(cl) = clamp {
        let nominal = Corner {
            vs: v_nom,
            t_winding: temp(25.0, "plot")?,
            t_clamp: temp(25.0, "plot")?,
            l_scale: 1.0,
            r_scale: 1.0,
        };
        let ck = coil_at(&nominal)?;
        let vs = Volts::new(v_nom).map_err(model("supply"))?;
        let i0 = ck
            .steady_current(vs, nominal.t_winding)
            .map_err(model("coil"))?;
        let mut options: Vec<(String, Clamp)> = vec![(format!("as designed ({kind})"), cl)];
        if !matches!(cl, Clamp::FreewheelDiode(_)) {
            options.push(("plain diode".to_string(), Clamp::FreewheelDiode(diode)));
        }
        options.push((
            "resistor (= coil R) + diode".to_string(),
            Clamp::ResistorDiode {
                resistor: Ohms::new(res).map_err(model("coil"))?,
                diode,
            },
        ));
        if !matches!(cl, Clamp::Avalanche(_)) {
            options.push((
                "no clamp: switch avalanche".to_string(),
                Clamp::Avalanche(avalanche),
            ));
        }
        let mut series = Vec::new();
        let mut t_end = 0.0f32;
        for (label, c) in &options {
            let off = SwitchOff::new(&ck, c, vs, i0, nominal.t_winding, nominal.t_clamp)
                .map_err(model("plot"))?;
            t_end = t_end.max(
                off.time_to(Amps::new(i0.value() * 1e-2).map_err(model("plot"))?)
                    .map_err(model("plot"))?
                    .value(),
            );
            series.push((label.clone(), off));
        }
        let dt = Seconds::new(t_end / 200.0).map_err(model("plot"))?;
        let mut plot = DriverPlot {
            name: name.to_string(),
            series: Vec::new(),
        };
        for (label, off) in series {
            let mut buf = vec![Sample::default(); 400];
            let n = off
                .sample(
                    dt,
                    Amps::new(i0.value() * 1e-3).map_err(model("plot"))?,
                    &mut buf,
                )
                .map_err(model("plot"))?;
            buf.truncate(n);
            plot.series.push(PlotSeries {
                label,
                t_ms: buf.iter().map(|s| s.time.value() * 1e3).collect(),
                i_a: buf.iter().map(|s| s.current.value()).collect(),
                v_switch: buf.iter().map(|s| s.switch_voltage.value()).collect(),
            });
        }
        cx.report.plots.push(plot);
    }
    // Monte Carlo.
    if let (Some((n, seed)), Some(cl)) = (monte_carlo, clamp) {
        let mut rng = seed.max(1);
        let mut next = move || {
            // xorshift64* (Vigna 2016): a small fixed-seed generator, reproducible everywhere.
            rng ^= rng >> 12;
            rng ^= rng << 25;
            rng ^= rng >> 27;
            (rng.wrapping_mul(0x2545_F491_4F6C_DD1D) >> 11) as f32 / (1u64 << 53) as f32
        };
        let mut peaks = Vec::new();
        let mut releases = Vec::new();
        for _ in 0..n {
            let k = Corner {
                vs: v_min + (v_max - v_min) * next(),
                t_winding: temp(
                    cx.env.amb_min.celsius()
                        + (cx.env.winding_hot.celsius() - cx.env.amb_min.celsius()) * next(),
                    "mc",
                )?,
                t_clamp: temp(
                    cx.env.amb_min.celsius()
                        + (cx.env.amb_max.celsius() - cx.env.amb_min.celsius()) * next(),
                    "mc",
                )?,
                l_scale: 1.0 - l_tol + 2.0 * l_tol * next(),
                r_scale: 1.0 - r_tol + 2.0 * r_tol * next(),
            };
            let ck = coil_at(&k)?;
            let vs = Volts::new(k.vs).map_err(model("mc"))?;
            let i0 = ck.steady_current(vs, k.t_winding).map_err(model("mc"))?;
            let off =
                SwitchOff::new(&ck, &cl, vs, i0, k.t_winding, k.t_clamp).map_err(model("mc"))?;
            peaks.push(off.peak_switch_voltage().value());
            if let Some(mr) = must_release {
                let i_rel = mr * v_nom / ck.resistance(k.t_winding).map_err(model("mc"))?.value();
                releases.push(
                    off.time_to(Amps::new(i_rel).map_err(model("mc"))?)
                        .map_err(model("mc"))?
                        .value()
                        + mechanical,
                );
            }
        }
        cx.report
            .monte_carlo
            .push(super::report::MonteCarlo::summarise(
                name, n, seed, &peaks, &releases,
            ));
    }
    let av_time = {
        // Longest avalanche if the clamp opens: highest supply, coldest coil (most current).
        let k = Corner {
            vs: v_max,
            t_winding: cx.env.amb_min,
            t_clamp: cx.env.amb_min,
            l_scale: 1.0 + l_tol,
            r_scale: 1.0 - r_tol,
        };
        let ck = coil_at(&k)?;
        let vs = Volts::new(v_max).map_err(model("supply"))?;
        let i0 = ck.steady_current(vs, k.t_winding).map_err(model("coil"))?;
        let off = SwitchOff::new(
            &ck,
            &Clamp::Avalanche(avalanche),
            vs,
            i0,
            k.t_winding,
            k.t_clamp,
        )
        .map_err(model("switch.avalanche"))?;
        off.time_to(Amps::new(0.0).map_err(model("current"))?)
            .map_err(model("switch.avalanche"))?
            .value()
    };
    Ok((d.name.clone(), v_max, v_av, av_time))
}

#[allow(clippy::too_many_arguments)]
fn analyse_hold(
    cx: &mut Context<'_>,
    file: &DesignFile,
    d: &Driver,
    h: &super::design::HoldSpec,
    field: &str,
    coil: &Coil,
    l: f32,
    res: f32,
    l_tol: f32,
    r_tol: f32,
    t_ref: Temperature,
    (v_min, v_nom, v_max): (f32, f32, f32),
    diode: DiodeParams,
    clamp: Option<Clamp>,
) -> Result<(), HostError> {
    let r = cx.r;
    let f = |s: &str| format!("{field}.{s}");
    let name = d.name.as_str();
    let i_pull = r.q(&h.pull_in_current, &f("hold.pull_in_current"), Unit::Amp)?;
    let i_hold = r.q(&h.hold_current, &f("hold.hold_current"), Unit::Amp)?;
    let zener_v = match clamp {
        Some(Clamp::ZenerDiode { zener, .. }) => zener
            .voltage(Amps::new(i_hold).map_err(model("hold"))?, cx.env.amb_max)
            .map_err(model("hold"))?
            .value(),
        _ => 0.0,
    };
    let hot = cx.env.winding_hot;
    let coil_hot_low = Coil::new(
        Henries::new(l * (1.0 - l_tol)).map_err(model("coil"))?,
        Ohms::new(res * (1.0 + r_tol)).map_err(model("coil"))?,
        t_ref,
        coil.alpha_per_k(),
    )
    .map_err(model("coil"))?;
    // Pull-in: slowest at the lowest supply, hot coil, high R.
    let vmin = Volts::new(v_min).map_err(model("supply"))?;
    match time_to_current(
        &coil_hot_low,
        vmin,
        Amps::new(i_pull).map_err(model(&f("hold.pull_in_current")))?,
        hot,
    ) {
        Ok(t) => {
            let ticks = to_ticks(t, cx.tick_hz).map_err(model("tick_rate"))?;
            cx.report.checks.push(Check::info(
                name,
                "time to pull-in current",
                &format!("{:.2} ms", t.value() * 1e3),
                "",
                "lowest supply, hottest winding, R high",
                "",
            ));
            cx.report.constants.push(Constant::new(
                name,
                "PULL_IN_TICKS",
                ticks,
                "full drive before switching to hold, worst corner",
            ));
        }
        Err(e) => {
            cx.report.checks.push(Check::fail(
                name,
                "pull-in current",
                &format!("{i_pull:.3} A"),
                "",
                None,
                "lowest supply, hottest winding, R high",
                &format!("not reachable: {e}"),
            ));
        }
    }
    let fw_at = |t: Temperature| -> Result<Freewheel, HostError> {
        Ok(Freewheel {
            diode_drop: diode
                .forward_drop(Amps::new(i_hold).map_err(model("hold"))?, t)
                .map_err(model("hold"))?,
            zener: Volts::new(zener_v).map_err(model("hold"))?,
        })
    };
    // Duty needed at the worst corner (lowest supply, hot): must be ≤ 1.
    match hold_duty(
        &coil_hot_low,
        vmin,
        Amps::new(i_hold).map_err(model("hold"))?,
        hot,
        fw_at(hot)?,
    ) {
        Ok(dmax) => cx.report.checks.push(Check::against(
            name,
            "hold duty needed",
            dmax * 100.0,
            100.0,
            "%",
            "lowest supply, hottest winding, R high",
            "to hold the current at the worst corner",
        )),
        Err(e) => cx.report.checks.push(Check::fail(
            name,
            "hold duty needed",
            "> 100 %",
            "100 %",
            None,
            "lowest supply, hottest winding, R high",
            &format!("{e}"),
        )),
    }
    // Duty for firmware: nominal supply, hot winding (hold current never below target when hot).
    let vnom = Volts::new(v_nom).map_err(model("supply"))?;
    let d_nom = match hold_duty(
        coil,
        vnom,
        Amps::new(i_hold).map_err(model("hold"))?,
        hot,
        fw_at(hot)?,
    ) {
        Ok(d) => d,
        Err(_) => return Ok(()),
    };
    let freq = if Reader::is_auto(&h.frequency) {
        let ripple = r.req(
            &h.max_ripple,
            h.frequency.span(),
            &f("hold.max_ripple"),
            Unit::Amp,
        )?;
        // Largest ripple: highest supply, cold (lowest R: highest duty share), low L.
        let coil_cold_lo = Coil::new(
            Henries::new(l * (1.0 - l_tol)).map_err(model("coil"))?,
            Ohms::new(res * (1.0 - r_tol)).map_err(model("coil"))?,
            t_ref,
            coil.alpha_per_k(),
        )
        .map_err(model("coil"))?;
        let mut f_need = 0.0f32;
        for (cc, t, v) in [
            (&coil_cold_lo, cx.env.amb_min, v_max),
            (&coil_hot_low, hot, v_max),
            (&coil_hot_low, hot, v_min),
        ] {
            let vs = Volts::new(v).map_err(model("supply"))?;
            if let Ok(dd) = hold_duty(
                cc,
                vs,
                Amps::new(i_hold).map_err(model("hold"))?,
                t,
                fw_at(t)?,
            ) {
                let p = HoldOperatingPoint::new(cc, vs, t, fw_at(t)?, 1000.0, dd.clamp(0.01, 0.99))
                    .map_err(model("hold"))?;
                f_need = f_need.max(
                    p.frequency_for_ripple(Amps::new(ripple).map_err(model("hold"))?)
                        .map_err(model("hold"))?,
                );
            }
        }
        cx.report.checks.push(Check::info(
            name,
            "PWM frequency (sized)",
            &format!("{:.0} Hz", f_need),
            &format!("ripple ≤ {:.1} mA", ripple * 1e3),
            "worst ripple corner",
            "",
        ));
        f_need
    } else {
        r.q(&h.frequency, &f("hold.frequency"), Unit::Hertz)?
    };
    let p = HoldOperatingPoint::new(coil, vnom, hot, fw_at(hot)?, freq, d_nom)
        .map_err(model("hold"))?;
    let rp = p.ripple().map_err(model("hold"))?;
    let pw = p.freewheel_power().map_err(model("hold"))?;
    cx.report.checks.push(Check::info(
        name,
        "hold ripple",
        &format!("{:.1} mA p-p", rp.peak_to_peak.value() * 1e3),
        "",
        "nominal supply, hot winding",
        &format!("at {freq:.0} Hz, duty {:.1} %", d_nom * 100.0),
    ));
    if pw.zener.value() > 0.0 {
        let note = "the zener conducts in every PWM cycle";
        match r.oq(&d.clamp.zener_power, &f("clamp.zener_power"), Unit::Watt)? {
            Some(pr) => cx.report.checks.push(Check::against(
                name,
                "zener power while holding",
                pw.zener.value(),
                pr,
                "W",
                "nominal supply, hot winding",
                note,
            )),
            None => cx.report.checks.push(Check::warn(
                name,
                "zener power while holding",
                &format!("{:.2} W", pw.zener.value()),
                "nominal supply, hot winding",
                &format!("{note}; no zener power rating given"),
            )),
        }
    }
    if let Some(clk) = r.oq(&file.pwm_timer_clock, "pwm_timer_clock", Unit::Hertz)? {
        let top = libm::roundf(clk / freq) as u32;
        let cmp = p.compare_value(top).map_err(model("hold"))?;
        cx.report.constants.push(Constant::new(
            name,
            "PWM_TOP",
            top,
            "PWM timer period in timer-clock counts",
        ));
        cx.report.constants.push(Constant::new(
            name,
            "HOLD_COMPARE",
            cmp,
            "hold duty as a compare value (nominal supply, hot winding), rounded up",
        ));
    }
    Ok(())
}

fn analyse_inputs(
    cx: &mut Context<'_>,
    file: &DesignFile,
    pins: &super::design::Pins,
    drivers: &[(String, f32, f32, f32)],
) -> Result<(), HostError> {
    let r = cx.r;
    let vdd_min = r.q(&pins.supply_min, "pins.supply_min", Unit::Volt)?;
    let vdd = r.q(&pins.supply, "pins.supply", Unit::Volt)?;
    if !(vdd_min <= vdd) {
        return Err(r.error(
            pins.supply_min.span(),
            "pins.supply_min",
            "must not exceed pins.supply",
        ));
    }
    let clamp = match pins.clamp.get_ref().as_str() {
        "silicon" => PinClamp::DiodeLaw(DiodeParams::SILICON),
        "schottky" => PinClamp::DiodeLaw(DiodeParams::SCHOTTKY),
        other => {
            let v = super::quantity::parse(other, Unit::Volt).map_err(|m| {
                r.error(
                    pins.clamp.span(),
                    "pins.clamp",
                    format!("expected \"silicon\", \"schottky\" or a drop such as \"0.3 V\": {m}"),
                )
            })?;
            PinClamp::FixedDrop(Volts::new(v as f32).map_err(model("pins.clamp"))?)
        }
    };
    let t_mcu = temp(
        r.q(&pins.max_temperature, "pins.max_temperature", Unit::Celsius)?,
        "pins.max_temperature",
    )?;
    let pin = Pin::new(
        Volts::new(vdd_min).map_err(model("pins.supply_min"))?,
        clamp,
        t_mcu,
    )
    .map_err(model("pins"))?;
    let lim = Amps::new(r.q(&pins.injection_limit, "pins.injection_limit", Unit::Amp)?)
        .map_err(model("pins.injection_limit"))?;
    let total = Amps::new(r.q(
        &pins.total_injection_limit,
        "pins.total_injection_limit",
        Unit::Amp,
    )?)
    .map_err(model("pins.total_injection_limit"))?;
    let rail_load = r
        .oq(&pins.rail_min_load, "pins.rail_min_load", Unit::Amp)?
        .map(Amps::new)
        .transpose()
        .map_err(model("pins.rail_min_load"))?;
    let upper = match (
        r.oq(&pins.leakage, "pins.leakage", Unit::Amp)?,
        r.oq(&pins.leakage_error, "pins.leakage_error", Unit::Volt)?,
    ) {
        (Some(i), Some(v)) => UpperLimits {
            leakage: Some((
                Amps::new(i).map_err(model("pins.leakage"))?,
                Volts::new(v).map_err(model("pins.leakage_error"))?,
            )),
            ..UpperLimits::default()
        },
        _ => UpperLimits::default(),
    };
    let per_pin = InjectionLimits {
        positive: lim,
        negative: lim,
    };
    let mut board: Board<64> = Board::new(
        pin,
        InjectionLimits {
            positive: total,
            negative: total,
        },
        rail_load,
    );
    let mut chosen: Vec<(String, SignalRange, Ohms)> = Vec::new();
    for (k, inp) in file.input.iter().enumerate() {
        let field = format!("input[{k}]");
        let sig = input_signal(r, inp, &field, drivers)?;
        let window = resistor_window(&pin, &sig, per_pin, &upper);
        let resistor = if Reader::is_auto(&inp.series_resistor) {
            match window {
                Ok(w) => {
                    let pick = e24_at_least(w.min.value() * 1.05);
                    let fits = w.max.is_none_or(|m| pick <= m.value());
                    let lim_txt = format!(
                        "window {:.0} … {} Ω",
                        w.min.value(),
                        w.max
                            .map_or("∞".to_string(), |m| format!("{:.0}", m.value()))
                    );
                    if fits {
                        cx.report.checks.push(Check::info(
                            &inp.name,
                            "series resistor (sized)",
                            &format!("{pick:.0} Ω"),
                            &lim_txt,
                            "hottest MCU, lowest pin supply",
                            "smallest E24 value 5 % above the minimum",
                        ));
                    } else {
                        cx.report.checks.push(Check::fail(
                            &inp.name,
                            "series resistor (sized)",
                            &format!("{pick:.0} Ω"),
                            &lim_txt,
                            None,
                            "hottest MCU, lowest pin supply",
                            "no E24 value fits the window",
                        ));
                    }
                    pick
                }
                Err(e) => {
                    cx.report.checks.push(Check::fail(
                        &inp.name,
                        "series resistor (sized)",
                        "none",
                        "",
                        None,
                        "hottest MCU, lowest pin supply",
                        &format!("requirements conflict: {e}"),
                    ));
                    continue;
                }
            }
        } else {
            let v = r.q(
                &inp.series_resistor,
                &format!("{field}.series_resistor"),
                Unit::Ohm,
            )?;
            if let Ok(w) = window {
                cx.report.checks.push(Check::against(
                    &inp.name,
                    "series resistor ≥ minimum for injection",
                    w.min.value(),
                    v,
                    "Ω",
                    "hottest MCU, lowest pin supply",
                    "smallest resistor that keeps the worst transient within the per-pin limit",
                ));
                if let Some(m) = w.max {
                    cx.report.checks.push(Check::against(
                        &inp.name,
                        "series resistor ≤ maximum",
                        v,
                        m.value(),
                        "Ω",
                        "",
                        &format!("set by {:?}", w.max_set_by),
                    ));
                }
            }
            v
        };
        let res = Ohms::new(resistor).map_err(model(&field))?;
        let module = ident(&inp.name);
        cx.report.constants.push(Constant::new(
            &module,
            "SERIES_RESISTOR_OHM",
            libm::roundf(resistor) as u32,
            "series resistor used in the analysis",
        ));
        for n in 0..inp.count {
            let nm: &'static str = if n == 0 { "input" } else { "input (more)" };
            if board
                .add(BoardInput {
                    name: nm,
                    signal: sig,
                    resistor: res,
                    limits: per_pin,
                })
                .is_err()
            {
                return Err(r.error(0..0, &field, "more than 64 inputs"));
            }
        }
        chosen.push((inp.name.clone(), sig, res));
    }
    let rep = board.check().map_err(model("pins"))?;
    for (name, sig, res) in &chosen {
        let ip = pin
            .injection(sig.transient_max, *res)
            .map_err(model("input"))?
            .value()
            .max(0.0);
        let ineg = -pin
            .injection(sig.transient_min, *res)
            .map_err(model("input"))?
            .value()
            .min(0.0);
        cx.report.checks.push(Check::against(
            name,
            "injection into the rail (worst transient)",
            ip * 1e3,
            lim.value() * 1e3,
            "mA",
            "hottest MCU, lowest pin supply",
            "per pin",
        ));
        if ineg > 0.0 {
            cx.report.checks.push(Check::against(
                name,
                "injection out of ground (worst transient)",
                ineg * 1e3,
                lim.value() * 1e3,
                "mA",
                "hottest MCU",
                "per pin",
            ));
        }
        if let (Some(rl), Some(allowed)) = (
            r.oq(&pins.rail_off_load, "pins.rail_off_load", Unit::Ohm)?,
            r.oq(&pins.rail_off_allowed, "pins.rail_off_allowed", Unit::Volt)?,
        ) {
            let off = rail_off_check(
                &pin,
                sig.steady_max,
                *res,
                Ohms::new(rl).map_err(model("pins.rail_off_load"))?,
                Volts::new(allowed).map_err(model("pins.rail_off_allowed"))?,
            )
            .map_err(model("pins"))?;
            let val = format!("{:.2} V", off.rail_voltage.value());
            if off.verdict.pass {
                cx.report.checks.push(Check::info(
                    name,
                    "rail voltage pushed with the rail off",
                    &val,
                    &format!("≤ {allowed} V"),
                    "steady maximum signal",
                    "",
                ));
            } else {
                cx.report.checks.push(Check::warn(
                    name,
                    "rail voltage pushed with the rail off",
                    &val,
                    "steady maximum signal",
                    &format!("above the allowed {allowed} V: parts on the rail may half-power"),
                ));
            }
        }
    }
    cx.report.checks.push(Check::against(
        "board",
        "total injection into the rail",
        rep.total_positive.value() * 1e3,
        total.value() * 1e3,
        "mA",
        "every input at its worst transient at once",
        "",
    ));
    if let (Some(_), Some(load)) = (rep.rail_on, rail_load) {
        let steady: f32 = rep.inputs.iter().map(|i| i.steady_positive.value()).sum();
        let c = Check::against(
            "board",
            "steady injection against the rail's minimum load",
            steady * 1e3,
            load.value() * 1e3,
            "mA",
            "every input at its steady maximum",
            "a regulator cannot sink: above the load the rail rises",
        );
        cx.report.checks.push(c);
    }
    Ok(())
}

fn input_signal(
    r: &Reader<'_>,
    inp: &Input,
    field: &str,
    drivers: &[(String, f32, f32, f32)],
) -> Result<SignalRange, HostError> {
    let f = |s: &str| format!("{field}.{s}");
    if let Some(dn) = &inp.drain_of {
        let (_, vmax, vav, t_av) = drivers.iter().find(|d| &d.0 == dn).ok_or_else(|| {
            r.error(
                inp.series_resistor.span(),
                &f("drain_of"),
                format!("no driver named \"{dn}\""),
            )
        })?;
        return SignalRange::drain_sense_open_diode(
            Volts::new(*vmax).map_err(model("supply"))?,
            Volts::new(*vav).map_err(model("switch.avalanche"))?,
            Seconds::new(t_av.max(1e-9)).map_err(model("switch.avalanche"))?,
        )
        .map_err(model(&f("drain_of")));
    }
    let at = inp.series_resistor.span();
    let v = |q: &Option<Q>, n: &str| -> Result<Volts, HostError> {
        Volts::new(r.req(q, at.clone(), &f(n), Unit::Volt)?).map_err(model(&f(n)))
    };
    SignalRange::new(
        v(&inp.signal_min, "signal_min")?,
        v(&inp.signal_max, "signal_max")?,
        v(&inp.transient_min, "transient_min")?,
        v(&inp.transient_max, "transient_max")?,
        Seconds::new(r.req(
            &inp.transient_width,
            at.clone(),
            &f("transient_width"),
            Unit::Second,
        )?)
        .map_err(model(&f("transient_width")))?,
    )
    .map_err(model(field))
}

/// A C and Rust identifier from a name: letters, digits and underscores, lower case.
pub fn ident(name: &str) -> String {
    let mut s: String = name
        .chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() {
                c.to_ascii_lowercase()
            } else {
                '_'
            }
        })
        .collect();
    if s.chars().next().is_none_or(|c| c.is_ascii_digit()) {
        s.insert(0, '_');
    }
    s
}

/// The code of a condition in generated tables (see [`Condition::code`]).
pub fn condition_code(c: Condition) -> u32 {
    c.code()
}

/// A readable name of a condition.
pub fn condition_name(c: Condition) -> &'static str {
    match c {
        Condition::Healthy => "healthy",
        Condition::FreewheelOpen => "clamp path open (diode, zener or TVS)",
        Condition::ZenerShorted => "zener shorted",
        Condition::CoilOpen => "coil open",
        Condition::ShortedTurns => "shorted turns",
        Condition::CoilTooHot => "coil too hot",
    }
}

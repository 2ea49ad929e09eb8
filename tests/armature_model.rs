//! The moving-armature model against an independent f64 integration of the same equations.
//!
//! Sources:
//! - Reference integrator: `ode_solvers` (crates.io), Dormand–Prince 5(4), f64, dense output;
//!   the library uses its own Bogacki–Shampine 3(2) in f32.
//! - Equations (textbook electromechanics, Fitzgerald & Kingsley, *Electric Machinery*, ch. 3;
//!   from memory): V = R·i + dλ/dt, λ = L(x)·i, F = ½·i²·dL/dx, m·ẍ = ΣF.
//! - The RL rise i(t) = (V/R)·(1 − e^(−R·t/L)) (the textbook first-order solution) for the
//!   phases with the armature at rest, and for the limits.
//! - A magnetic circuit of two air gaps g in series with an ideal core: L = μ₀·N²·A/(2g), so
//!   F = μ₀·N²·A·i²/(4g²) (textbook; from memory), μ₀ = 4π·10⁻⁷ H/m (CODATA, to 10⁻⁹).
//! - The SPICE2 diode (tests/common) for the freewheeling diode at release.
//!
//! Designs: our own invented valves, relays and locks.

mod common;

use common::armature::{crossing, dense, extreme, specs, Spec, V3};

use kickguard::armature::motion::{pull_in, release, PullIn, Release, Run};
use kickguard::armature::{Armature, GapInductance};
use kickguard::clamp::{Clamp, Operating, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams};
use kickguard::{Amps, Henries, Ohms, Seconds, Temperature, Volts};

fn run(duration: f64, tol: f32) -> Run {
    Run {
        duration: Seconds::new(duration as f32).unwrap(),
        sample_period: Seconds::new((duration / 400.0) as f32).unwrap(),
        tolerance: tol,
    }
}

fn close(what: &str, name: &str, got: f64, want: f64, rel: f64) {
    assert!(
        (got - want).abs() <= rel * want.abs(),
        "{name}: {what} {got} vs reference {want} (rel {:.2e})",
        (got - want).abs() / want.abs()
    );
}

/// Pull-in by the reference: rest on the open stop (closed-form rise with L_open) until the
/// pull reaches the opening force; the free flight (Dormand–Prince) to the seat; the seated
/// rise (closed form with L_seat) to the end. (t_start, t_seat, peak, valley, i_end).
fn reference_pull_in(s: &Spec, t_end: f64) -> (f64, f64, (f64, f64), (f64, f64), f64) {
    let (r, v) = (s.r, s.v);
    let i_move = (2.0 * s.f_open(s.s) / s.slope(s.s)).sqrt();
    assert!(i_move < v / r, "{}: does not pull in", s.name);
    let t_start = -(s.lo / r) * (1.0 - i_move * r / v).ln();
    let drive = move |i: f64| v - r * i;
    let y0 = V3::new(s.lo * i_move, s.s, 0.0);
    let d = dense(s.free(&drive), y0, t_start, t_end - t_start, 200_000);
    let (t_seat, i_seat) = crossing(&d, 0.0, true).expect("reaches the seat");
    let flight: Vec<_> = d.iter().copied().filter(|p| p.0 <= t_seat).collect();
    let peak = extreme(&flight, true).expect("a peak in flight");
    let valley = extreme(&flight, false)
        .filter(|(_, i)| *i < i_seat)
        .unwrap_or((t_seat, i_seat));
    let i_end = v / r + (i_seat - v / r) * (-(t_end - t_seat) * r / s.ls).exp();
    (t_start, t_seat, peak, valley, i_end)
}

fn lib_pull_in(s: &Spec, t_end: f64, buf: &mut [f32]) -> PullIn {
    pull_in(
        &s.armature(),
        Ohms::new(s.r as f32).unwrap(),
        Volts::new(s.v as f32).unwrap(),
        &run(t_end, 1e-6),
        buf,
    )
    .unwrap()
}

/// A duration that holds the pull-in and the seated rise: 30 open-stop time constants.
fn pull_in_span(s: &Spec) -> f64 {
    30.0 * s.lo / s.r
}

#[test]
fn pull_in_matches_the_independent_integration() {
    for s in specs() {
        let t_end = pull_in_span(&s);
        let (t_start, t_seat, peak, valley, i_end) = reference_pull_in(&s, t_end);
        let mut buf = [0f32; 401];
        let p = lib_pull_in(&s, t_end, &mut buf);
        let n = s.name;
        close(
            "motion start",
            n,
            p.motion_start.unwrap().value() as f64,
            t_start,
            2e-4,
        );
        close("seated", n, p.seated.unwrap().value() as f64, t_seat, 1e-3);
        let (pk, vl) = (p.peak.unwrap(), p.valley.unwrap());
        close("peak time", n, pk.time.value() as f64, peak.0, 2e-3);
        close("peak current", n, pk.current.value() as f64, peak.1, 5e-4);
        close("valley time", n, vl.time.value() as f64, valley.0, 2e-3);
        close(
            "valley current",
            n,
            vl.current.value() as f64,
            valley.1,
            5e-4,
        );
        close("end current", n, p.end_current.value() as f64, i_end, 5e-4);
        println!(
            "{n:<22} start {:.4} ms, seated {:.4} ms, dip {:.1} mA ({:.1} % of the peak), {} steps",
            t_start * 1e3,
            t_seat * 1e3,
            (peak.1 - valley.1) * 1e3,
            100.0 * (peak.1 - valley.1) / peak.1,
            p.steps
        );
        // The samples are the integration's values at k·Δt: the first is zero, and one in
        // the flat seated end matches the closed form.
        assert_eq!(buf[0], 0.0);
        assert_eq!(p.samples, 401);
        close("last sample", n, buf[400] as f64, i_end, 5e-4);
    }
}

/// Energy balance (issue: electrical input = copper + mechanical work + damping + change in
/// field energy), closing to 10⁻⁴ of the input on every design.
#[test]
fn pull_in_energy_balances() {
    for s in specs() {
        let p = lib_pull_in(&s, pull_in_span(&s), &mut []);
        let e = p.energy;
        let supply = e.source + e.loop_loss;
        // The supply: copper + field + everything the field did on the armature.
        let electrical = e.loop_loss + (e.field_end - e.field_start) + e.magnetic_work;
        let mechanical = e.kinetic_end + e.spring + e.load + e.damping + e.impact;
        assert!(
            (supply - electrical).abs() <= 1e-4 * supply,
            "{}: {e:?}",
            s.name
        );
        assert!(
            (e.magnetic_work - mechanical).abs() <= 1e-4 * supply,
            "{}: {e:?}",
            s.name
        );
        // The supply's energy by the closed form it must also match: V·∫i dt is not tracked,
        // but R·∫i² is, and the copper loss alone exceeds the field's final energy here.
        assert!(
            e.magnetic_work > 0.0 && e.impact >= 0.0,
            "{}: {e:?}",
            s.name
        );
    }
}

/// Limits: no force (L_open = L_seat), no stroke, or a mass too heavy to move in the run give
/// the plain RL rise.
#[test]
fn limits_give_the_plain_rise() {
    let s = specs()[0];
    let t_end = pull_in_span(&s);
    let rise = |l: f64, t: f64| (s.v / s.r) * (1.0 - (-t * s.r / l).exp());
    let mut flat = s;
    flat.lo = flat.ls;
    let mut still = s;
    still.s = 0.0;
    for (what, spec, l) in [
        ("L_open = L_seat", flat, s.ls),
        ("zero stroke", still, s.lo),
    ] {
        let mut a = spec.armature();
        if spec.s == 0.0 {
            // With no stroke the gap never leaves its only position: L = L_open.
            a.inductance.seat = a.inductance.open;
        }
        let mut buf = [0f32; 401];
        let p = pull_in(
            &a,
            Ohms::new(s.r as f32).unwrap(),
            Volts::new(s.v as f32).unwrap(),
            &run(t_end, 1e-6),
            &mut buf,
        )
        .unwrap();
        assert!(
            p.motion_start.is_none() && p.peak.is_none(),
            "{what}: {p:?}"
        );
        for (k, x) in buf.iter().enumerate() {
            let t = k as f64 * t_end / 400.0;
            assert!(
                (*x as f64 - rise(l, t)).abs() <= 2e-4 * s.v / s.r,
                "{what}: sample {k}"
            );
        }
    }
    // A mass of 10⁶ kg starts to move but travels a negligible distance in the run: no dip,
    // the current is the rise with L_open (the motion's back-EMF is ~ 10⁻⁸ of the drive).
    let mut heavy = s;
    heavy.m = 1e6;
    let mut buf = [0f32; 401];
    let p = lib_pull_in(&heavy, t_end, &mut buf);
    assert!(
        p.motion_start.is_some() && p.seated.is_none() && p.peak.is_none(),
        "{p:?}"
    );
    close(
        "heavy end current",
        "heavy",
        p.end_current.value() as f64,
        rise(s.lo, t_end),
        1e-4,
    );
}

/// The force law against the two-gap magnetic circuit: N = 1000 turns, A = 1 cm², gaps
/// g = 0.4 … 2 mm, 0.5 A: L = μ₀·N²·A/(2g) is our law with L∞ = 0 and L_seat·g₀ = μ₀·N²·A/2
/// (g = g₀ + x, g₀ = 0.4 mm), and F = μ₀·N²·A·i²/(4g²).
#[test]
fn force_law_matches_the_two_gap_circuit() {
    let mu0 = 4.0e-7 * std::f64::consts::PI;
    let (n, area, g0, stroke, i) = (1000.0f64, 1e-4f64, 0.4e-3f64, 1.6e-3f64, 0.5f64);
    let l_of = |g: f64| mu0 * n * n * area / (2.0 * g);
    let a = Armature {
        mass_kg: 0.01,
        stroke_m: stroke as f32,
        preload_n: 0.0,
        spring_n_per_m: 0.0,
        load_n: 0.0,
        damping_n_s_per_m: 0.0,
        inductance: GapInductance {
            seat: Henries::new(l_of(g0) as f32).unwrap(),
            open: Henries::new(l_of(g0 + stroke) as f32).unwrap(),
            g0_m: g0 as f32,
            shape: None,
        },
    };
    for x in [0.0, 0.4e-3, 0.8e-3, 1.6e-3] {
        let g = g0 + x;
        let want = mu0 * n * n * area * i * i / (4.0 * g * g);
        let got = a.magnetic_force(i as f32, x as f32) as f64;
        assert!(
            (got - want).abs() <= 1e-5 * want,
            "x = {x}: {got} vs {want}"
        );
        let l = a.inductance_at(x as f32) as f64;
        assert!((l - l_of(g)).abs() <= 1e-5 * l_of(g), "L at {x}: {l}");
    }
    // By hand at g = 0.4 mm: 4π·10⁻⁷·10⁶·10⁻⁴·0.25/(4·1.6·10⁻⁷) = 49.09 N.
    assert!((a.magnetic_force(0.5, 0.0) - 49.087).abs() < 0.01);
}

/// Release through a silicon freewheeling diode: the seated fall (Dormand–Prince on the fixed
/// L_seat) to the current that lets go, then the free flight.
#[test]
fn release_matches_the_independent_integration() {
    let p = DiodeParams::SILICON;
    let tk = 298.15;
    for s in specs() {
        let (i0, r) = (s.v / s.r, s.r);
        let t = Temperature::from_kelvin(tk as f32).unwrap();
        let coil = Coil::fixed(
            Henries::new(s.ls as f32).unwrap(),
            Ohms::new(r as f32).unwrap(),
        )
        .unwrap();
        let op = Operating::uniform(
            Volts::new(s.v as f32).unwrap(),
            Amps::new(i0 as f32).unwrap(),
            t,
        );
        let off =
            SwitchOff::new(&coil, &Clamp::FreewheelDiode(Diode::Law(p)), Side::Low, &op).unwrap();
        let g = move |i: f64| r * i + common::v64(&p, i, tk);
        let i_hold = (2.0 * s.f_open(0.0) / s.slope(0.0)).sqrt();
        let t_release = common::ode::fall_time(s.ls, i0, i_hold, &g, 1e-3, 1e-11, 1e-14);
        let span = 8.0 * s.ls / r;
        let drive = move |i: f64| if i > 0.0 { -g(i) } else { 0.0 };
        let d = dense(
            s.free(&drive),
            V3::new(s.ls * i_hold, 0.0, 0.0),
            t_release,
            span,
            200_000,
        );
        let opened = crossing(&d, s.s, false);
        let valley = extreme(&d, false);
        let lib: Release =
            release(&s.armature(), &off, &run(t_release + span, 1e-6), &mut []).unwrap();
        let n = s.name;
        assert!(lib.release_start.is_some(), "{n}: {lib:?}");
        close(
            "release start",
            n,
            lib.release_start.unwrap().value() as f64,
            t_release,
            5e-4,
        );
        match (opened, lib.opened) {
            (Some((t, _)), Some(x)) => close("opened", n, x.value() as f64, t, 2e-3),
            (None, None) => {}
            other => panic!("{n}: opened {other:?}"),
        }
        if let Some((tv, iv)) = valley.filter(|v| opened.is_none_or(|o| v.0 < o.0)) {
            let v = lib.valley.expect("valley");
            close("valley time", n, v.time.value() as f64, tv, 3e-3);
            close("valley current", n, v.current.value() as f64, iv, 1e-3);
            // The bump's top: the reference's next maximum (before the open stop), or the
            // current at the stop if it is still rising there.
            let after: Vec<_> = d.iter().copied().filter(|p| p.0 > tv).collect();
            let (tb, ib) = extreme(&after, true)
                .filter(|b| opened.is_none_or(|o| b.0 < o.0))
                .or(opened)
                .expect("a top after the valley");
            let b = lib.bump.expect("bump");
            close("bump time", n, b.time.value() as f64, tb, 3e-3);
            close("bump current", n, b.current.value() as f64, ib, 1e-3);
        } else {
            assert!(
                lib.valley.is_none(),
                "{n}: a valley the reference has not: {lib:?}"
            );
        }
        println!(
            "{n:<22} release starts {:.3} ms, open {:?} ms, bump {:.2} mA",
            t_release * 1e3,
            opened.map(|o| o.0 * 1e3),
            lib.bump_height() * 1e3
        );
    }
}

/// Bad input keeps the contract: every field refused by name, no NaN in an Ok, bounded work.
#[test]
fn hostile_input_is_refused_by_name() {
    let s = specs()[0];
    let good = s.armature();
    let r = Ohms::new(56.0).unwrap();
    let v = Volts::new(24.0).unwrap();
    let ok_run = run(0.05, 1e-5);
    let cases: Vec<(&str, Armature)> = vec![
        (
            "mass",
            Armature {
                mass_kg: f32::NAN,
                ..good
            },
        ),
        (
            "mass",
            Armature {
                mass_kg: 0.0,
                ..good
            },
        ),
        (
            "stroke",
            Armature {
                stroke_m: -1e-3,
                ..good
            },
        ),
        (
            "stroke",
            Armature {
                stroke_m: 2.0,
                ..good
            },
        ),
        (
            "spring preload",
            Armature {
                preload_n: -1.0,
                ..good
            },
        ),
        (
            "spring rate",
            Armature {
                spring_n_per_m: f32::INFINITY,
                ..good
            },
        ),
        (
            "load force",
            Armature {
                load_n: f32::NAN,
                ..good
            },
        ),
        (
            "damping",
            Armature {
                damping_n_s_per_m: -0.1,
                ..good
            },
        ),
        (
            "g0",
            Armature {
                inductance: GapInductance {
                    g0_m: 0.0,
                    shape: None,
                    ..good.inductance
                },
                ..good
            },
        ),
        (
            "open inductance",
            Armature {
                inductance: GapInductance {
                    open: Henries::new(0.5).unwrap(),
                    ..good.inductance
                },
                ..good
            },
        ),
    ];
    for (name, a) in cases {
        let e = pull_in(&a, r, v, &ok_run, &mut []).unwrap_err();
        assert_eq!(e.input, name, "{a:?}");
    }
    // (A zero or negative duration or period cannot be built: `Seconds` refuses it.)
    for (name, bad) in [
        (
            "tolerance",
            Run {
                tolerance: 0.5,
                ..ok_run
            },
        ),
        (
            "tolerance",
            Run {
                tolerance: f32::NAN,
                ..ok_run
            },
        ),
    ] {
        assert_eq!(pull_in(&good, r, v, &bad, &mut []).unwrap_err().input, name);
    }
    // A run far longer than the step budget allows is refused, not looped on: a 100 s run
    // sampled every microsecond would need 10⁸ landings.
    let long = Run {
        duration: Seconds::new(100.0).unwrap(),
        sample_period: Seconds::new(1e-6).unwrap(),
        tolerance: 1e-5,
    };
    let mut buf = vec![0f32; 1_000_000];
    assert_eq!(
        pull_in(&good, r, v, &long, &mut buf).unwrap_err().input,
        "integration steps"
    );
    // Extreme but valid armatures give finite results.
    for a in [
        Armature {
            mass_kg: 1e-9,
            ..good
        },
        Armature {
            mass_kg: 1e9,
            ..good
        },
        Armature {
            damping_n_s_per_m: 1e6,
            ..good
        },
        Armature {
            preload_n: 1e6,
            ..good
        },
        Armature {
            load_n: -10.0,
            ..good
        },
    ] {
        match pull_in(&a, r, v, &ok_run, &mut []) {
            Ok(p) => {
                assert!(
                    p.end_current.value().is_finite() && p.end_gap_m.is_finite(),
                    "{a:?}"
                );
                assert!(
                    p.energy.source.is_finite() && p.energy.impact.is_finite(),
                    "{a:?}"
                );
            }
            Err(e) => assert_eq!(e.input, "integration steps", "{a:?}"),
        }
    }
}

/// The table form: a table of L(x) sampled from each design's air-gap law, given to the model
/// as a shape (monotone cubic, Fritsch & Carlson 1980), against the independent reference of
/// the law itself. Twelve points, denser near the seat where L changes fastest (at
/// x_k = s·(k/11)^1.5). The interpolant's own checks are mathematical: it passes through the
/// points, falls monotonically between them, and reproduces a straight line exactly (a cubic
/// Hermite with the secant as both tangents is that line).
#[test]
fn table_form_of_the_gap_law_matches_the_independent_integration() {
    use kickguard::armature::shape::GapShape;
    // A straight line is reproduced exactly, with its slope.
    let (line, _) = GapShape::from_table(&[(0.0, 3.0), (1e-3, 2.0), (2e-3, 1.0)]).unwrap();
    for u in [0.0f32, 0.1, 0.37, 0.5, 0.93, 1.0] {
        assert!((line.value(u) - (1.0 - u)).abs() < 1e-6, "line at {u}");
        assert!((line.fall_rate(u) - 1.0).abs() < 1e-5, "slope at {u}");
    }
    for s in specs() {
        let pts: Vec<(f32, f32)> = (0..12)
            .map(|k| {
                let x = s.s * (k as f64 / 11.0).powf(1.5);
                (x as f32, s.l(x) as f32)
            })
            .collect();
        let (shape, ends) = GapShape::from_table(&pts).unwrap();
        assert_eq!(ends.stroke_m, s.s as f32);
        let mut a = s.armature();
        a.inductance.shape = Some(shape);
        // Through the points, monotone between them, within 1 % of the law's span between.
        let span = s.ls - s.lo;
        let mut last = f64::INFINITY;
        for j in 0..=1100 {
            let x = s.s * j as f64 / 1100.0;
            let l = a.inductance_at(x as f32) as f64;
            assert!(l <= last + 1e-6, "{}: not monotone at {x}", s.name);
            last = l;
            assert!(
                (l - s.l(x)).abs() <= 1e-2 * span,
                "{}: L({x}) {l} vs {}",
                s.name,
                s.l(x)
            );
        }
        for &(x, l) in &pts {
            assert!(
                (a.inductance_at(x) - l).abs() <= 1e-6 * l,
                "{}: node {x}",
                s.name
            );
        }
        // Pull-in with the table against the reference of the law: the interpolation's error
        // is the only difference (a few per cent in the slope at the ends sets the tolerance).
        let t_end = pull_in_span(&s);
        let (t_start, t_seat, peak, valley, _) = reference_pull_in(&s, t_end);
        let p = pull_in(
            &a,
            Ohms::new(s.r as f32).unwrap(),
            Volts::new(s.v as f32).unwrap(),
            &run(t_end, 1e-6),
            &mut [],
        )
        .unwrap();
        let n = s.name;
        let got = |x: Option<Seconds>| x.unwrap().value() as f64;
        println!(
            "{n:<22} table: start {:.4} / {:.4} ms, seated {:.4} / {:.4} ms, dip {:.2} / {:.2} mA",
            got(p.motion_start) * 1e3,
            t_start * 1e3,
            got(p.seated) * 1e3,
            t_seat * 1e3,
            p.dip() * 1e3,
            (peak.1 - valley.1) * 1e3
        );
        // Motion starts where the pull at the open end overcomes the spring: set by |dL/dx(s)|,
        // which a table gives only from its last intervals (pchip's end tangent, second
        // order): 2–3 % in the slope there, up to 5 % in the start.
        close("table: motion start", n, got(p.motion_start), t_start, 5e-2);
        close("table: seated", n, got(p.seated), t_seat, 3e-2);
        close(
            "table: peak current",
            n,
            p.peak.unwrap().current.value() as f64,
            peak.1,
            2e-2,
        );
        close(
            "table: valley current",
            n,
            p.valley.unwrap().current.value() as f64,
            valley.1,
            2e-2,
        );
    }
}

/// A table the model cannot take is refused by name.
#[test]
fn bad_tables_are_refused_by_name() {
    use kickguard::armature::shape::GapShape;
    let input = |p: &[(f32, f32)]| GapShape::from_table(p).map(|_| ()).unwrap_err().input;
    assert_eq!(input(&[(0.0, 1.0)]), "inductance table");
    assert_eq!(input(&[(0.0, 1.0); 13]), "inductance table");
    assert_eq!(input(&[(0.1e-3, 1.0), (1e-3, 0.5)]), "inductance table");
    assert_eq!(input(&[(0.0, 1.0), (1e-3, 1.2)]), "inductance table");
    assert_eq!(input(&[(0.0, 1.0), (1e-3, 1.0)]), "inductance table");
    assert_eq!(input(&[(0.0, 1.0), (0.0, 0.5)]), "inductance table");
    assert_eq!(input(&[(0.0, f32::NAN), (1e-3, 0.5)]), "table inductance");
    assert_eq!(input(&[(0.0, 1.0), (-1e-3, 0.5)]), "table gap");
    assert_eq!(input(&[(0.0, 1.0), (1e-3, 0.0)]), "table inductance");
}

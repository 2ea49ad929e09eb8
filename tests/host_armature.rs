//! The configuration step's armature release section against hand calculations. The design is
//! a small invented relay of our own: 2 H, 100 Ω ± 7 % with a 19 … 21 °C winding, 11 … 13 V,
//! a fixed 0.7 V freewheel diode, a light plunger on a stiff spring.
//!
//! Sources (from memory): the seated fall is the textbook first-order RL solution through a
//! constant clamp, i(t) = (I₀ + V_c/R)·e^(−t/τ) − V_c/R with τ = L/R (any circuit-analysis
//! text, e.g. Hayt & Kemmerly, chapter on source-free RL circuits), so the time from I₀ to I₁
//! is τ·ln((I₀ + V_c/R)/(I₁ + V_c/R)); the seated armature lets go where the co-energy force
//! ½·i²·|dL/dx| (Fitzgerald & Kingsley, *Electric Machinery*, ch. 3) falls to the spring's
//! force, i = √(2·F/|dL/dx|), with the air-gap law's slope at the seat
//! |dL/dx(0)| = (L_seat − L_open)·(g₀ + s)/(s·g₀) (derived from L(x) in kickguard::armature).

use kickguard::host::checks::{Check, Status};
use kickguard::host::report::Report;
use kickguard::host::{analyse_text, Options};

mod common;

use common::design;

const COIL: &str = "inductance = \"2 H\"\ninductance_tolerance = \"0 %\"\nresistance = \"100 Ω\"\nresistance_tolerance = \"7 %\"\nresistance_at = \"20 °C\"\nrated_voltage = \"12 V\"\nmust_release = \"10 %\"";
const SWITCH: &str = "rating = \"60 V\"\nderating = \"90 %\"\navalanche = \"66 V\"";

fn armature(preload: &str, rate: &str) -> String {
    armature_with(
        preload,
        rate,
        "open_inductance = \"0.6 H\"\nfringe = \"0.4 mm\"\ntolerance = \"10 %\"",
    )
}

/// The section with `law` giving L against the gap (the air-gap law's fields, or a table).
fn armature_with(preload: &str, rate: &str, law: &str) -> String {
    format!(
        "kind = \"diode\"\ndiode = \"0.7 V\"\n[driver.armature]\nmass = \"2 g\"\nstroke = \"1 mm\"\n\
         spring_preload = \"{preload}\"\nspring_rate = \"{rate}\"\nload = \"0 N\"\ndamping = \"0.05 N·s/m\"\n\
         {law}\n\
         open_inductance_tolerance = \"5 %\"\nadc_rate = \"10 kHz\"\nadc_counts_per_amp = \"12000 counts/A\"\n\
         adc_full_scale = \"4096 counts\"\nadc_noise = \"4 counts\""
    )
}

/// The relay of the module docs with the clamp and armature section `clamp_and_armature`.
fn relay(clamp_and_armature: &str) -> String {
    design(
        ("12 V", "11 V", "13 V"),
        ("19 °C", "21 °C", "0 K"),
        COIL,
        SWITCH,
        clamp_and_armature,
        "",
    )
}

fn analyse(text: &str) -> Report {
    analyse_text(text, "armature.toml", &Options::default()).unwrap_or_else(|e| panic!("{e}"))
}

fn check<'a>(r: &'a Report, id: &str) -> &'a Check {
    r.checks()
        .find(|c| c.subject == "coil" && c.id == id)
        .unwrap_or_else(|| panic!("no check {id}"))
}

fn constant(r: &Report, name: &str) -> Option<u32> {
    r.constants()
        .find(|c| c.scope == "coil" && c.name == name)
        .map(|c| c.value)
}

/// The number after `before` in `text` (the report's notes print ms to two decimals).
fn number_after(text: &str, before: &str) -> f64 {
    let rest = &text[text
        .find(before)
        .unwrap_or_else(|| panic!("{before:?} in {text}"))
        + before.len()..];
    let end = rest
        .find(|c: char| !(c.is_ascii_digit() || c == '.'))
        .unwrap_or(rest.len());
    rest[..end].parse().unwrap()
}

#[test]
fn release_start_matches_the_seated_fall_by_hand_and_sets_the_wait() {
    let r = analyse(&relay(&armature("0.5 N", "400 N/m")));
    // By hand: every mechanical corner (preload, rate, stroke, g0 at ±10 %, L_open at ±5 %)
    // at the slowest decay (13 V into the coldest, lowest R); the latest release start is the largest
    // τ·ln((I₀ + V_c/R)/(i_rel + V_c/R)).
    let (l_seat, vc, v) = (2.0f64, 0.7f64, 13.0f64);
    // The coldest winding (19 °C) at the low tolerance: copper, R(T) = R₂₀·(1 + 0.00393·(T − 20 °C))
    // (IEC 60028).
    let res = 100.0 * 0.93 * (1.0 + 0.00393 * (19.0 - 20.0));
    let mut latest: f64 = 0.0;
    for k in 0..32u32 {
        let f = |bit: u32, nominal: f64, t: f64| {
            nominal
                * if k & (1 << bit) == 0 {
                    1.0 - t
                } else {
                    1.0 + t
                }
        };
        let (f0, rate, s, g0, l_open) = (
            f(0, 0.5, 0.1),
            f(1, 400.0, 0.1),
            f(2, 1e-3, 0.1),
            f(3, 0.4e-3, 0.1),
            f(4, 0.6, 0.05),
        );
        let slope = (l_seat - l_open) * (g0 + s) / (s * g0);
        let i_rel = (2.0 * (f0 + rate * s) / slope).sqrt();
        let (tau, i0) = (l_seat / res, v / res);
        latest = latest.max(tau * ((i0 + vc / res) / (i_rel + vc / res)).ln());
    }
    // No required release time in the design: a figure.
    let c = check(&r, "armature_release");
    assert_eq!(c.status, Status::Info, "{c:?}");
    let reported = number_after(&c.note, "leaves its seat ");
    let hi = number_after(&c.note, &format!("{reported:.2} … "));
    // Two decimals of ms in the note, and the model's local tolerance (10⁻⁵ per step).
    assert!(
        (hi - latest * 1e3).abs() <= 0.006 + 1e-3 * latest * 1e3,
        "latest release start {hi} ms, by hand {} ms",
        latest * 1e3
    );
    // Open after the latest start; the wait is the model's (no mechanical release time given,
    // so the datasheet-based figure is the decay alone, shorter), rounded up to the 1 MHz tick.
    let open = c.value.unwrap() as f64;
    assert!(
        open > latest,
        "open at {open} s before the release starts at {latest} s"
    );
    let wait = constant(&r, "RELEASE_WAIT_TICKS").unwrap();
    assert_eq!(wait, (open * 1e6).ceil() as u32, "{}", c.note);
    assert!(c.note.contains("is the model's"), "{}", c.note);
    assert!(constant(&r, "REENERGISE_WAIT_TICKS").unwrap() >= wait);
    // The slow coil (τ ≈ 21 ms) against a flight of a few ms leaves a bump: detectable, with
    // the noise-derived thresholds 2·(4 + 1) + 1 = 11 counts.
    let d = check(&r, "armature_release_detectable");
    assert_eq!(d.status, Status::Pass, "{}", d.note);
    assert_eq!(constant(&r, "ARMATURE_RELEASE_HYSTERESIS_COUNTS"), Some(11));
    assert_eq!(constant(&r, "ARMATURE_RELEASE_MIN_BUMP_COUNTS"), Some(11));
    assert!(constant(&r, "ARMATURE_RELEASE_WINDOW_SAMPLES").unwrap() > 0);
}

#[test]
fn an_armature_nothing_pushes_open_fails_release() {
    // No spring and no load: once seated, nothing opens it (it stays operated).
    let r = analyse(&relay(&armature("0 N", "0 N/m")));
    let c = check(&r, "armature_release");
    assert_eq!(c.status, Status::Fail, "{c:?}");
    assert!(
        c.note.contains("does not reach its open stop"),
        "{}",
        c.note
    );
    // No release detector is emitted for it.
    assert_eq!(constant(&r, "ARMATURE_RELEASE_MIN_BUMP_COUNTS"), None);
}

/// The air-gap law L(x) = L∞ + (L_seat − L∞)·g₀/(g₀ + x) of the section above (2 H seated,
/// 0.6 H open, g₀ 0.4 mm, stroke 1 mm) as a 12-point table, x_k = s·(k/11)^1.5.
fn law_table(last_gap_mm: f64, first_l: f64) -> String {
    let (ls, lo, g0, s) = (2.0f64, 0.6f64, 0.4e-3f64, 1e-3f64);
    let l_inf = (lo * (g0 + s) - ls * g0) / s;
    let rows: Vec<String> = (0..12)
        .map(|k| {
            let x = s * (k as f64 / 11.0).powf(1.5);
            let l = if k == 0 {
                first_l
            } else {
                l_inf + (ls - l_inf) * g0 / (g0 + x)
            };
            let x_mm = if k == 11 { last_gap_mm } else { x * 1e3 };
            format!("[\"{x_mm:.6} mm\", \"{l:.7} H\"]")
        })
        .collect();
    format!("inductance_table = [{}]", rows.join(", "))
}

#[test]
fn a_table_of_the_law_gives_the_law_s_figures() {
    let run = |law: &str| analyse(&relay(&armature_with("0.5 N", "400 N/m", law)));
    // Without the mechanical tolerances: g₀'s axis exists for the law only, so with it the
    // two would differ by more than the interpolation (the supply, the winding, the
    // resistance and the open inductance still vary).
    let by_law = run("open_inductance = \"0.6 H\"\nfringe = \"0.4 mm\"");
    let by_table = run(&law_table(1.0, 2.0));
    for id in ["armature_pull_in", "armature_release"] {
        let (a, b) = (
            check(&by_law, id).value.unwrap(),
            check(&by_table, id).value.unwrap(),
        );
        // The table's interpolation against the law (tests/armature_model.rs: seating within
        // 1 %, motion start within 3.4 %).
        println!("{id}: law {:.3} ms, table {:.3} ms", a * 1e3, b * 1e3);
        assert!((a - b).abs() <= 0.03 * a, "{id}: law {a} s, table {b} s");
    }
    assert_eq!(check(&by_table, "armature_detectable").status, Status::Pass);
}

#[test]
fn a_table_that_contradicts_the_design_is_refused_where_it_is_written() {
    let text = |law: &str| relay(&armature_with("0.5 N", "400 N/m", law));
    let err = |law: &str| {
        analyse_text(&text(law), "armature.toml", &Options::default())
            .map(|_| ())
            .unwrap_err()
            .to_string()
    };
    // Not the stroke at its end, not the coil's inductance at the seat, both ways of giving L,
    // and L not falling.
    let e = err(&law_table(1.2, 2.0));
    assert!(
        e.contains("inductance_table") && e.contains("must be the stroke"),
        "{e}"
    );
    let e = err(&law_table(1.0, 2.2));
    assert!(
        e.contains("inductance_table") && e.contains("coil's inductance"),
        "{e}"
    );
    let e = err(&format!("{}\nfringe = \"0.4 mm\"", law_table(1.0, 2.0)));
    assert!(
        e.contains("inductance_table") && e.contains("not both"),
        "{e}"
    );
    let e = err(
        "inductance_table = [[\"0 mm\", \"2 H\"], [\"0.5 mm\", \"2.1 H\"], [\"1 mm\", \"0.6 H\"]]",
    );
    assert!(e.contains("inductance_table"), "{e}");
}

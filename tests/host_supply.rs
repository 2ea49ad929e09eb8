//! The supply side against hand calculations: transient events (ISO 16750-2 and IEC 61131-2
//! presets, the file's own events) and reversed polarity. The design is an invented test input
//! with a fixed-drop diode and fixed resistances, so each figure is arithmetic: the peak across
//! the switch at a switch-off is V_supply + the clamp's voltage across the coil, the winding's
//! rise scales with its power V²/R (Joule heating; the design notes), a reversed supply drives
//! (V − n·0.7 V)/R through n silicon junctions (common practice for the drop).

mod common;

use common::design;
use kickguard::host::checks::{Check, Status};
use kickguard::host::report::Report;
use kickguard::host::{analyse_text, Options};

fn analyse(text: &str) -> Report {
    analyse_text(text, "supply.toml", &Options::default()).unwrap_or_else(|e| panic!("{e}"))
}

fn checks<'a>(r: &'a Report, id: &str) -> Vec<&'a Check> {
    r.checks().filter(|c| c.id == id).collect()
}

const COIL: &str = "inductance = \"0.2 H\"\ninductance_tolerance = \"0 %\"\nresistance = \"90 Ω\"\nresistance_tolerance = \"10 %\"\nresistance_at = \"none\"";
const SWITCH: &str = "rating = \"60 V\"\nderating = \"90 %\"\navalanche = \"66 V\"";

/// A 9 … 16 V relay driver with a fixed 0.8 V freewheel diode; `supply` extra lines go into
/// the supply table (after the range).
fn relay(supply: &str, clamp: &str, switch: &str) -> String {
    design(
        ("13.5 V", "9 V", "16 V"),
        ("-40 °C", "85 °C", "15 K"),
        COIL,
        switch,
        clamp,
        "",
    )
    .replace("max = \"16 V\"\n", &format!("max = \"16 V\"\n{supply}\n"))
}

#[test]
fn a_load_dump_unsuppressed_overwhelms_the_switch_while_it_is_off() {
    // ISO 16750-2 test A, 12 V system: up to 101 V for up to 400 ms. Held by a switch whose
    // avalanche starts at 66 V: it avalanches from the supply itself.
    let r = analyse(&relay(
        "profile = \"iso16750-2-12v\"",
        "kind = \"diode\"\ndiode = \"0.8 V\"",
        SWITCH,
    ));
    let off = checks(&r, "event_off_state");
    let dump = off.iter().find(|c| c.title.contains("load dump")).unwrap();
    assert_eq!((dump.status, dump.value), (Status::Fail, Some(101.0)));
    assert!(
        dump.note.contains("avalanche onset (66.00 V)"),
        "{}",
        dump.note
    );
    assert!(r.failed());
    // Centrally suppressed (test B): 35 V is held, and a switch-off during it peaks at
    // 35 + 0.8 V (fixed drop) = 35.8 V, within 54 V.
    let r = analyse(&relay(
        "profile = \"iso16750-2-12v-clamped\"",
        "kind = \"diode\"\ndiode = \"0.8 V\"",
        SWITCH,
    ));
    let peak = checks(&r, "event_switch_voltage");
    let dump = peak.iter().find(|c| c.title.contains("load dump")).unwrap();
    assert_eq!(dump.status, Status::Pass);
    assert!(
        (dump.value.unwrap() - 35.8).abs() < 1e-4,
        "{:?}",
        dump.value
    );
    // Jump start (24 V): 24.8 V; long-term overvoltage (18 V): 18.8 V.
    for (name, v) in [("jump start", 24.8f32), ("long-term overvoltage", 18.8)] {
        let c = peak.iter().find(|c| c.title.contains(name)).unwrap();
        assert!((c.value.unwrap() - v).abs() < 1e-4, "{name}: {:?}", c.value);
    }
}

#[test]
fn a_clamp_across_the_switch_below_the_event_conducts_from_the_supply() {
    // A 33 V TVS across the switch and a 35 V suppressed load dump: the TVS conducts from the
    // supply for the whole event.
    let tvs = "kind = \"tvs-across-switch\"\nvoltage = \"33 V\"\ntest_current = \"1 mA\"";
    let r = analyse(&relay("profile = \"iso16750-2-12v-clamped\"", tvs, SWITCH));
    let c = checks(&r, "event_clamp_conducts");
    assert_eq!(c.len(), 1);
    assert_eq!(c[0].status, Status::Fail);
    assert!(c[0].title.contains("load dump"));
}

#[test]
fn a_long_event_heats_the_winding_with_the_square_of_the_voltage() {
    // 15 K of self-heating at the 16 V maximum; 18 V for 60 min gives 15·(18/16)² = 18.984 K
    // above the 85 °C ambient: 103.98 °C, against a class-A winding limit of 105 °C (passes);
    // the jump start's 24 V for 60 s: 15·(24/16)² = 33.75 K, 118.75 °C (fails).
    let coil = format!("{COIL}\nmax_temperature = \"105 °C\"");
    let text = relay(
        "profile = \"iso16750-2-12v-clamped\"",
        "kind = \"diode\"\ndiode = \"0.8 V\"",
        SWITCH,
    )
    .replace(COIL, &coil);
    let r = analyse(&text);
    let w = checks(&r, "event_winding");
    let over = w.iter().find(|c| c.title.contains("long-term")).unwrap();
    assert!((over.value.unwrap() - (85.0 + 15.0 * (18.0f32 / 16.0).powi(2))).abs() < 1e-3);
    assert_eq!(over.status, Status::Pass);
    let jump = w.iter().find(|c| c.title.contains("jump")).unwrap();
    assert!(
        (jump.value.unwrap() - 118.75).abs() < 1e-3,
        "{:?}",
        jump.value
    );
    assert_eq!(jump.status, Status::Fail);
    // The 400 ms load dump is too short to heat the winding to its steady state: no check.
    assert!(!w.iter().any(|c| c.title.contains("load dump")));
}

#[test]
fn reversed_polarity_by_topology() {
    let diode = "kind = \"diode\"\ndiode = \"0.8 V\"";
    // ISO 16750-2 reversed voltage, 12 V system: 14 V (from memory). A plain freewheel diode
    // and the switch's body diode short the reversed supply: with 0.1 Ω of wiring,
    // (14 − 2·0.7)/0.1 = 126 A.
    let r = analyse(&relay(
        "profile = \"iso16750-2-12v-clamped\"\nwiring_resistance = \"0.1 Ω\"",
        diode,
        SWITCH,
    ));
    let c = checks(&r, "reverse_polarity");
    assert_eq!(c[0].status, Status::Fail);
    assert!(
        (c[0].value.unwrap() - 126.0).abs() < 1e-3,
        "{:?}",
        c[0].value
    );
    // Without a wiring resistance: the short is stated without a number.
    let r = analyse(&relay(
        "profile = \"iso16750-2-12v-clamped\"",
        diode,
        SWITCH,
    ));
    let c = checks(&r, "reverse_polarity");
    assert_eq!(
        (c[0].status, c[0].shown.as_deref()),
        (Status::Fail, Some("limited only by the wiring"))
    );
    // A series diode blocks it.
    let r = analyse(&relay(
        "profile = \"iso16750-2-12v-clamped\"\nreverse_protection = \"series-diode\"",
        diode,
        SWITCH,
    ));
    assert_eq!(checks(&r, "reverse_polarity")[0].status, Status::Pass);
    // A clamp across the switch: the body diode energises the coil in reverse, at
    // (14 − 0.7)/(90·0.9) = 0.1642 A (the lowest resistance): a warning without a limit.
    let tvs = "kind = \"tvs-across-switch\"\nvoltage = \"40 V\"\ntest_current = \"1 mA\"";
    let r = analyse(&relay("profile = \"iso16750-2-12v-clamped\"", tvs, SWITCH));
    let c = checks(&r, "reverse_polarity");
    assert_eq!(c[0].status, Status::Warn);
    assert!(c[0].limit.is_none());
    assert!(
        (c[0].value.unwrap() - 13.3 / 81.0).abs() < 1e-4,
        "{:?}",
        c[0].value
    );
    // A 6.8 V zener + diode across the coil breaks down under 14 V (14 > 6.8 + 1.4): a short.
    let z = "kind = \"zener+diode\"\ndiode = \"0.8 V\"\nvoltage = \"6.8 V\"";
    let r = analyse(&relay("profile = \"iso16750-2-12v-clamped\"", z, SWITCH));
    assert_eq!(checks(&r, "reverse_polarity")[0].status, Status::Fail);
    // An 18 V zener does not (14 < 18 + 1.4): the coil path only.
    let z = "kind = \"zener+diode\"\ndiode = \"0.8 V\"\nvoltage = \"18 V\"";
    let r = analyse(&relay("profile = \"iso16750-2-12v-clamped\"", z, SWITCH));
    assert_eq!(checks(&r, "reverse_polarity")[0].status, Status::Warn);
}

#[test]
fn events_of_the_design_and_unknown_profiles() {
    let diode = "kind = \"diode\"\ndiode = \"0.8 V\"";
    let ev = "[[supply.event]]\nname = \"crank\"\nvoltage = \"6 V\"\nduration = \"20 ms\"";
    let text = relay("", diode, SWITCH).replace("[[driver]]", &format!("{ev}\n\n[[driver]]"));
    let r = analyse(&text);
    let c = checks(&r, "event_switch_voltage");
    assert_eq!(c.len(), 1);
    // The 6 V event plus the 0.8 V freewheeling diode (arithmetic).
    assert!((c[0].value.unwrap() - 6.8).abs() < 1e-4 && c[0].note.contains("design file"));
    let bad = relay("profile = \"iso7637-2\"", diode, SWITCH);
    let e = analyse_text(&bad, "s.toml", &Options::default())
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("supply[0].profile") && e.contains("iso16750-2-12v"),
        "{e}"
    );
}

#[test]
fn a_fast_decay_returns_energy_that_charges_the_bulk_capacitor() {
    // An H-bridge fast decay on 24 V (fixed), 0.35 H, 56 Ω, fixed 0.8 V diodes: the coil sees
    // V_c = 24 + 2·0.8 = 25.6 V, so the current reaches zero with the charge
    // Q = τ·[I₀ − a·ln(1 + I₀/a)], a = V_c/R (the closed form in the file's header), and the
    // supply takes back V_s·Q. Two channels at once into 470 µF, the loads drawing at least
    // 0.1 A for the shortest decay t (to 1 % of I₀): ½·C·(V₂² − V₁²) = 2·V_s·Q − V₁·0.1·t.
    let coil = "inductance = \"0.35 H\"\ninductance_tolerance = \"0 %\"\nresistance = \"56 Ω\"\nresistance_tolerance = \"0 %\"\nresistance_at = \"none\"";
    let text = design(
        ("24 V", "24 V", "24 V"),
        ("25 °C", "55 °C", "0 K"),
        coil,
        SWITCH,
        "kind = \"h-bridge\"\ndiode = \"0.8 V\"",
        "count = 2",
    )
    .replace(
        "max = \"24 V\"\n",
        "max = \"24 V\"\nbulk_capacitance = \"470 µF\"\nrail_load = \"0.1 A\"\nrail_limit = \"30 V\"\n",
    );
    let r = analyse(&text);
    let (l, res, vs) = (0.35f64, 56.0f64, 24.0f64);
    let (tau, i0, a) = (l / res, vs / res, 25.6 / res);
    let q = tau * (i0 - a * (1.0 + i0 / a).ln());
    let e = vs * q;
    let got = checks(&r, "returned_energy")[0].value.unwrap() as f64;
    assert!((got - e).abs() < 2e-4 * e, "{got} vs {e}");
    let t1 = tau * ((i0 + a) / (0.01 * i0 + a)).ln();
    let v2 = (vs * vs + 2.0 * (2.0 * e - vs * 0.1 * t1) / 470e-6).sqrt();
    let rise = checks(&r, "rail_rise")[0];
    assert!(
        (rise.value.unwrap() as f64 - v2).abs() < 1e-3 * v2,
        "{:?} vs {v2}",
        rise.value
    );
    assert_eq!(
        rise.status,
        if v2 <= 30.0 {
            Status::Pass
        } else {
            Status::Fail
        }
    );
    // A supply that sinks current takes it; without a bulk capacitance it is not judged.
    let sinks = text.replace("bulk_capacitance = \"470 µF\"\n", "sinks_current = true\n");
    assert_eq!(
        checks(&analyse(&sinks), "rail_rise")[0].status,
        Status::Pass
    );
    let bare = text.replace("bulk_capacitance = \"470 µF\"\n", "");
    let c = analyse(&bare);
    let c = checks(&c, "rail_rise");
    assert_eq!(
        (c[0].status, c[0].shown.as_deref()),
        (Status::Warn, Some("not judged"))
    );
    // A freewheel across the coil returns nothing: no such check.
    let local = text.replace("kind = \"h-bridge\"", "kind = \"diode\"");
    assert!(checks(&analyse(&local), "returned_energy").is_empty());
}

#[test]
fn a_shared_zener_carries_every_channel_at_once() {
    // Three channels of one driver share an 18 V zener (datasheet line: 18 V at 10 mA, 2 Ω,
    // no tempco, no tolerance) behind fixed 0.8 V diodes, on a fixed 24 V supply with 56 Ω,
    // 0.35 H coils. Every channel switching off at once puts 3·24/56 = 1.2857 A through it:
    // V_z = 18 − 2·0.01 + 2·1.2857 = 20.551 V, and each switch peaks at 24 + 20.551 + 0.8 V
    // (the datasheet line is linear in the current: arithmetic).
    let coil = "inductance = \"0.35 H\"\ninductance_tolerance = \"0 %\"\nresistance = \"56 Ω\"\nresistance_tolerance = \"0 %\"\nresistance_at = \"none\"";
    let clamp = "kind = \"zener+diode\"\ndiode = \"0.8 V\"\nvoltage = \"18 V\"\ntest_current = \"10 mA\"\ndynamic_resistance = \"2 Ω\"\nenergy_rating = \"200 mJ\"\nshared = \"common\"";
    let text = design(
        ("24 V", "24 V", "24 V"),
        ("25 °C", "55 °C", "0 K"),
        coil,
        SWITCH,
        clamp,
        "count = 3\nswitching_rate = \"1 Hz\"",
    );
    let r = analyse(&text);
    let i0 = 24.0f64 / 56.0;
    let cur = checks(&r, "shared_current")[0].value.unwrap() as f64;
    assert!((cur - 3.0 * i0).abs() < 1e-5, "{cur}");
    let peak = checks(&r, "shared_switch_voltage")[0].value.unwrap() as f64;
    let vz = 18.0 - 2.0 * 0.01 + 2.0 * 3.0 * i0;
    assert!(
        (peak - (24.0 + vz + 0.8)).abs() < 1e-4,
        "{peak} vs {}",
        24.0 + vz + 0.8
    );
    // The energy per event: three channels, each decaying into a zener raised by the two
    // others' current, 2·2·I₀ = 1.714 V: the zener line V = 17.98 + 1.714 + 2·i, so with the
    // diode the loop is affine, V_c = 20.494 V and R_total = 58 Ω (closed form; the zener
    // takes V_z(i)·i, the diode 0.8·i): E_z = ∫(19.694 + 2·i)·i dt over the decay to zero.
    let vc = 17.98 + 4.0 * i0 + 0.8;
    let (q, i2, _) = common::rl_decay_to_zero(0.35, 58.0, vc, i0);
    let e_z = (vc - 0.8) * q + 2.0 * i2;
    let e = checks(&r, "shared_energy")[0].value.unwrap() as f64;
    assert!((e - 3.0 * e_z).abs() < 3e-4 * e, "{e} vs {}", 3.0 * e_z);
    let p = checks(&r, "shared_power")[0].value.unwrap() as f64;
    assert!((p - e).abs() < 1e-6 * e); // 1 Hz
}

#[test]
fn the_switchs_own_avalanche_is_judged_by_its_energy_during_an_event() {
    // Kind "avalanche": the peak is the avalanche voltage by design (a figure, no limit), and
    // what decides is whether the switch survives one switch-off while the supply is raised,
    // the supply adding V·Q to its avalanche energy (the design notes' clamp-at-the-switch law).
    let sw = "rating = \"60 V\"\nderating = \"90 %\"\navalanche = \"66 V\"\navalanche_energy = \"1 J\"\njunction_max = \"150 °C\"";
    let r = analyse(&relay(
        "profile = \"iso16750-2-12v-clamped\"",
        "kind = \"avalanche\"",
        sw,
    ));
    for c in checks(&r, "event_switch_voltage") {
        assert!(c.limit.is_none() && c.status == Status::Info, "{c:?}");
        assert!((c.value.unwrap() - 66.0).abs() < 1e-3);
    }
    let s = checks(&r, "event_switch_survival");
    assert_eq!(s.len(), 3); // load dump B, long-term overvoltage, jump start
    assert!(s.iter().all(|c| c.status == Status::Pass), "{s:?}");
    // With a small rating a single pulse during the load dump is too much: 35 V leaves
    // 66 − 35 = 31 V across the coil, so the energy ½·L·I²·66/31 (R → 0 bound) exceeds 10 mJ.
    let small = sw.replace("1 J", "10 mJ");
    let r = analyse(&relay(
        "profile = \"iso16750-2-12v-clamped\"",
        "kind = \"avalanche\"",
        &small,
    ));
    let dump = checks(&r, "event_switch_survival")
        .into_iter()
        .find(|c| c.title.contains("load dump"))
        .unwrap();
    assert_eq!(dump.status, Status::Fail);
}

#[test]
fn a_long_low_event_is_checked_for_operate() {
    // 9 … 16 V steady, copper winding (0.00393 /K at 20 °C, IEC 60028) up to 85 + 15 = 100 °C,
    // must operate at 7 V. A 60 s event at 8 V: the per-unit operate drive is
    // 8/(1 + 0.00393·80) = 6.087 V, below 7 V (arithmetic; the per-unit convention of
    // tests/host_conventions.rs).
    let coil = "inductance = \"0.2 H\"\ninductance_tolerance = \"0 %\"\nresistance = \"90 Ω\"\nresistance_tolerance = \"10 %\"\nresistance_at = \"20 °C\"\nmust_operate = \"7 V\"";
    let ev = "[[supply.event]]\nname = \"brown-out\"\nvoltage = \"8 V\"\nduration = \"60 s\"";
    let text = design(
        ("13.5 V", "9 V", "16 V"),
        ("-40 °C", "85 °C", "15 K"),
        coil,
        SWITCH,
        "kind = \"diode\"\ndiode = \"0.8 V\"",
        "",
    )
    .replace("[[driver]]", &format!("{ev}\n\n[[driver]]"));
    let r = analyse(&text);
    let c = checks(&r, "event_operate");
    assert_eq!(c.len(), 1);
    let want = 8.0 / (1.0 + 0.00393 * 80.0);
    assert!(
        (c[0].value.unwrap() - want).abs() < 1e-3,
        "{:?} vs {want}",
        c[0].value
    );
    assert_eq!(c[0].status, Status::Fail);
    // A series diode makes a supply that sinks current unable to take returned energy: the rise
    // is judged (not judged here for want of a capacitance).
    let hb = text
        .replace("kind = \"diode\"", "kind = \"h-bridge\"")
        .replace(
            "max = \"16 V\"\n",
            "max = \"16 V\"\nsinks_current = true\nreverse_protection = \"series-diode\"\n",
        );
    let r = analyse(&hb);
    assert_eq!(
        checks(&r, "rail_rise")[0].shown.as_deref(),
        Some("not judged")
    );
}

//! What the report and its outputs give a practitioner, against hand calculations: the clamp
//! option table, the proposed comparator's constants, the open-clamp survival's reason, the
//! corners as numbers, one colour per topology in every plot, the C header's usage hint
//! compiled against the C ABI, and the rule that a warning never hides an exceeded limit.
//!
//! The design is a small invented test input with fixed drops and fixed resistances, so every
//! decay is the textbook first-order RL solution (any circuit-analysis text, e.g. Hayt &
//! Kemmerly, "Engineering Circuit Analysis", source-free RL circuits — from memory):
//! with a constant clamp voltage V_c across the coil, i(t) = (I₀ + a)·e^(−t/τ) − a, a = V_c/R,
//! τ = L/R; time from I₀ to I₁ τ·ln((I₀ + a)/(I₁ + a)); charge to zero
//! Q = τ·[I₀ − a·ln(1 + I₀/a)]; clamp energy V_c·Q.

mod common;

use common::design;
use kickguard::host::checks::Status;
use kickguard::host::report::Report;
use kickguard::host::{analyse_text, output, Options};

const L: f64 = 0.35;
const R: f64 = 56.0;
const VS: f64 = 26.4;

/// 21.6 … 26.4 V, 0.35 H, 56 Ω fixed, must release at 2.4 V, a fixed 0.8 V diode and an
/// 18 V zener with no dynamic resistance and no tempco, a 60 V switch avalanching at 66 V,
/// one switch-off a second, a 30 V comparator and a 1.2 V comparator reference.
fn text() -> String {
    let coil = "inductance = \"0.35 H\"\ninductance_tolerance = \"0 %\"\nresistance = \"56 Ω\"\nresistance_tolerance = \"0 %\"\nresistance_at = \"none\"\nmust_release = \"2.4 V\"";
    let switch = "rating = \"60 V\"\nderating = \"90 %\"\navalanche = \"66 V\"\navalanche_energy = \"200 mJ\"\njunction_max = \"150 °C\"";
    let clamp = "kind = \"zener+diode\"\ndiode = \"0.8 V\"\nvoltage = \"18 V\"";
    design(
        ("24 V", "21.6 V", "26.4 V"),
        ("25 °C", "55 °C", "0 K"),
        coil,
        switch,
        clamp,
        "switching_rate = \"1 Hz\"",
    ) + "[driver.diagnosis]\ncomparator = [\"30 V\"]\nguard = \"5 %\"\nshorted_turns = \"10 %\"\ncomparator_reference = \"1.2 V\"\n"
}

fn report() -> Report {
    analyse_text(&text(), "report.toml", &Options::default()).unwrap_or_else(|e| panic!("{e}"))
}

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * b.abs().max(1e-12)
}

/// Charge to zero through a constant clamp voltage `vc` (with a loop resistance `r`).
fn charge(vc: f64, r: f64) -> f64 {
    let (tau, i0, a) = (L / r, VS / R, vc / r);
    tau * (i0 - a * (1.0 + i0 / a).ln())
}

/// Time from I₀ to `i1` through `vc` (loop resistance `r`).
fn time(vc: f64, r: f64, i1: f64) -> f64 {
    let (tau, i0, a) = (L / r, VS / R, vc / r);
    tau * ((i0 + a) / (i1 + a)).ln()
}

#[test]
fn the_option_table_matches_the_closed_forms() {
    let r = report();
    let rows = &r.drivers[0].options;
    let i0 = VS / R;
    let find = |label: &str| {
        rows.iter()
            .find(|o| o.label.starts_with(label))
            .unwrap_or_else(|| panic!("{label}"))
    };
    // As designed: 18 V zener + 0.8 V diode across the coil, 26.4 V supply (both corners).
    let d = find("as designed");
    assert!(
        close(d.peak_switch as f64, VS + 18.8, 1e-5),
        "{}",
        d.peak_switch
    );
    assert!(
        close(d.clamp_energy as f64, 18.8 * charge(18.8, R), 2e-4),
        "{}",
        d.clamp_energy
    );
    assert!(close(
        d.release.unwrap() as f64,
        time(18.8, R, 2.4 / R),
        2e-4
    ));
    assert!(close(d.off_time as f64, time(18.8, R, 0.01 * i0), 2e-4));
    assert!(close(d.power.unwrap() as f64, d.clamp_energy as f64, 1e-6)); // 1 Hz
                                                                          // A plain diode: 0.8 V.
    let p = find("plain diode");
    assert!(close(p.peak_switch as f64, VS + 0.8, 1e-5));
    assert!(close(p.clamp_energy as f64, 0.8 * charge(0.8, R), 2e-4));
    // A resistor equal to the coil's (56 Ω) + the diode: peak V_s + I₀·56 + 0.8; the loop's
    // resistance doubles; the clamp takes what the coil's own resistance does not:
    // ½·L·I₀² − R·∫i²dt (the closed form in tests/common).
    let rd = find("resistor");
    assert!(close(rd.peak_switch as f64, VS + i0 * 56.0 + 0.8, 1e-5));
    let (_, i2, _) = common::rl_decay_to_zero(L, 2.0 * R, 0.8, i0);
    let want = 0.5 * L * i0 * i0 - R * i2;
    assert!(
        close(rd.clamp_energy as f64, want, 2e-4),
        "{} vs {want}",
        rd.clamp_energy
    );
    // No clamp: the switch avalanches at 66 V, V_c = 66 − 26.4 across the coil, the switch
    // takes 66·Q (the design notes' clamp-at-the-switch law).
    let av = find("no clamp");
    assert!(close(av.peak_switch as f64, 66.0, 1e-5));
    assert!(close(
        av.switch_energy as f64,
        66.0 * charge(66.0 - VS, R),
        2e-4
    ));
    assert_eq!(av.clamp_energy, 0.0);
    // The table is in the text report.
    let t = output::text::render(&r);
    assert!(
        t.contains("clamp options")
            && t.contains("plain diode")
            && t.contains("no clamp: switch avalanche")
    );
}

#[test]
fn the_proposed_comparator_is_emitted_with_its_divider() {
    // Threshold: the midpoint of the highest healthy switch voltage (26.4 + 18.8 = 45.2 V) and
    // the lowest avalanche (66 V), to 0.1 V: 55.6 V; with ±2 % it stays between them both ways
    // (54.49 > 45.2, 56.71 < 66). Divider for a 1.2 V reference: 1.2/55.6 = 21 583 ppm.
    let r = report();
    let c = |name: &str| {
        r.constants()
            .find(|c| c.name == name)
            .unwrap_or_else(|| panic!("{name}"))
            .value
    };
    assert_eq!(c("PROPOSED_COMPARATOR_MV"), 55_600);
    assert_eq!(
        c("PROPOSED_DIVIDER_PPM"),
        (1.2f64 / 55.6 * 1e6).round() as u32
    );
    let t = r.drivers[0]
        .outcome
        .windows
        .iter()
        .find(|w| w.name == "PROPOSED_WINDOWS")
        .unwrap();
    // A healthy switch-off never reaches the threshold: it reads 0 ticks (± the jitter, 0 here).
    assert_eq!(t.rows[0], [0, 0, 0]);
    let rust = output::rust::render(&r);
    let h = output::c::render(&r);
    assert!(
        rust.contains("pub const PROPOSED_COMPARATOR_MV: u32 = 55600;")
            && rust.contains("PROPOSED_WINDOWS")
    );
    assert!(h.contains("#define KICKGUARD_COIL_PROPOSED_DIVIDER_PPM"));
}

#[test]
fn the_survival_count_gives_its_reason() {
    // E_AS derated linearly to T_jmax (common practice): from the hottest ambient, 55 °C,
    // 200 mJ·(150 − 55)/(150 − 25) = 152 mJ; no repetitive rating: one pulse.
    let r = report();
    let s = r.checks().find(|c| c.id == "open_clamp_survival").unwrap();
    assert_eq!(s.value, Some(1.0));
    assert!(
        s.note.contains("152.000 mJ") && s.note.contains("no repetitive rating given"),
        "{}",
        s.note
    );
    // The energy it names is the pulse's: 66·Q with V_c = 66 − 26.4 V.
    let e = 66.0 * charge(66.0 - VS, R) * 1e3;
    assert!(
        s.note.contains(&format!("{e:.3} mJ")),
        "{} vs {e:.3}",
        s.note
    );
}

#[test]
fn corners_and_the_box_are_numbers_in_the_json() {
    let r = report();
    let j: serde_json::Value = serde_json::from_str(&output::json::render(&r).unwrap()).unwrap();
    let d = &j["drivers"][0];
    let supply = d["axes"]
        .as_array()
        .unwrap()
        .iter()
        .find(|a| a["name"] == "supply")
        .unwrap();
    assert_eq!(
        (supply["low"].as_f64(), supply["high"].as_f64()),
        (Some(21.6), Some(26.4))
    );
    let peak = d["checks"]
        .as_array()
        .unwrap()
        .iter()
        .find(|c| c["id"] == "switch_voltage")
        .unwrap();
    let axes = peak["corner"]["axes"].as_array().unwrap();
    assert_eq!(axes[0]["name"], "supply");
    assert_eq!(axes[0]["value"].as_f64(), Some(26.4));
    assert_eq!(axes[0]["unit"], "V");
    assert_eq!(j["scope"].as_array().unwrap().len(), 1);
    assert!(output::text::render(&r).contains("NOT CHECKED: A supply without a profile"));
}

#[test]
fn each_topology_keeps_its_colour_in_every_plot() {
    // The demo: the pump relay is a plain diode as designed; the valves show a plain diode as
    // an option. One colour for "diode" in both, and each plot has its release view.
    let demo = analyse_text(
        &std::fs::read_to_string("examples/greenhouse.toml").unwrap(),
        "d.toml",
        &Options::default(),
    )
    .unwrap();
    let files = kickguard::host::render_outputs(&demo).unwrap();
    let svg = |name: &str| {
        files
            .iter()
            .find(|(n, _)| n == name)
            .unwrap_or_else(|| panic!("{name}"))
            .1
            .clone()
    };
    let diode = output::svg::colour("diode");
    let hex = format!("stroke=\"#{:02X}{:02X}{:02X}\"", diode.0, diode.1, diode.2);
    for name in [
        "plot_valve.svg",
        "plot_pump_relay.svg",
        "plot_valve_release.svg",
        "plot_pump_relay_release.svg",
    ] {
        assert!(
            svg(name).contains(&hex),
            "{name} lacks the diode colour {hex}"
        );
    }
    assert!(
        svg("plot_valve_release.svg").contains("release current")
            && svg("plot_valve_release.svg").contains("releases at")
    );
    assert!(svg("plot_valve.svg").contains("switch avalanche onset"));
    // Every topology its own colour.
    let kinds = kickguard::host::file::fields::CLAMP_KINDS;
    for (k, a) in kinds.iter().enumerate() {
        for b in &kinds[k + 1..] {
            assert_ne!(
                output::svg::colour(a),
                output::svg::colour(b),
                "{a} and {b}"
            );
        }
    }
}

#[test]
fn the_c_hint_compiles_against_the_c_abi() {
    // The header's usage hint, as written, with the C ABI's header, under -Werror.
    let r = report();
    let dir = std::path::Path::new(env!("CARGO_TARGET_TMPDIR")).join("c_hint");
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    let h = output::c::render(&r);
    let hint = h
        .lines()
        .find(|l| l.contains("static const kg_window_row"))
        .unwrap();
    let decl = hint.trim_start_matches(" * ").to_string();
    std::fs::write(dir.join("kickguard_config.h"), &h).unwrap();
    std::fs::write(
        dir.join("use.c"),
        format!("#include \"kickguard.h\"\n#include \"kickguard_config.h\"\n{decl}\nint use(void);\nint use(void) {{ kg_verdict v; return kg_classify(table, KICKGUARD_COIL_DIAG_0_WINDOWS_ROWS, 3u, &v).code; }}\n"),
    )
    .unwrap();
    let inc = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("capi/include");
    let out = common::cc_strict(&dir, "-std=c99", &["-I".as_ref(), inc.as_os_str()]);
    assert!(
        out.status.success(),
        "{decl}\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
}

#[test]
fn a_warning_never_hides_an_exceeded_limit() {
    // A WARN is advice or a check that could not be judged: it carries no limit. A PASS with a
    // limit is within it. Over the demo and every test design.
    for path in [
        "examples/greenhouse.toml",
        "tests/designs/contactor.toml",
        "tests/designs/door_lock.toml",
        "tests/designs/pump_station.toml",
    ] {
        let r = analyse_text(
            &std::fs::read_to_string(path).unwrap(),
            path,
            &Options::default(),
        )
        .unwrap();
        for c in r.checks() {
            if matches!(c.status, Status::Warn | Status::Info) {
                assert!(
                    c.limit.is_none(),
                    "{path}: {} {}: a warning or a figure with a limit",
                    c.subject,
                    c.id
                );
            }
            if c.status == Status::Pass {
                assert!(
                    c.margin().is_none_or(|m| m >= 0.0),
                    "{path}: {} {} passes beyond its limit",
                    c.subject,
                    c.id
                );
            }
        }
    }
}

//! Generated code is an attack surface: every user string that reaches the Rust module or the
//! C header (driver and input names, the design path) is made inert or refused, and a design
//! that failed a check cannot be compiled into a firmware by mistake.
//!
//! A hostile-name corpus (common practice for injection testing: comment terminators, line
//! breaks, keywords of either language, bidirectional-override characters, trigraphs, empty and
//! over-long names) goes through the whole configuration step; each result is compiled by the
//! machine's Rust and C compilers beside a definition of the symbol the name tries to inject,
//! so an injection that got through would be a duplicate definition and fail the build.

mod common;

use kickguard::host::{analyse_text, configure, ident, output, write_outputs, Options};
use std::path::{Path, PathBuf};
use std::process::Command;

fn scratch(name: &str) -> PathBuf {
    let d = Path::new(env!("CARGO_TARGET_TMPDIR")).join(name);
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

/// A small valid design with one driver named `driver` and one input named `input` (TOML basic
/// strings with the names escaped for TOML).
fn design(driver: &str, input: &str, switch_rating: &str) -> String {
    let q = |s: &str| {
        let mut o = String::from("\"");
        for c in s.chars() {
            match c {
                '"' => o.push_str("\\\""),
                '\\' => o.push_str("\\\\"),
                c if (c as u32) < 0x20 || c == '\u{7f}' => {
                    o.push_str(&format!("\\u{:04X}", c as u32))
                }
                c => o.push(c),
            }
        }
        o.push('"');
        o
    };
    format!(
        "title = \"t\"\ntick_rate = \"100 kHz\"\n[environment]\nambient_min = \"0 °C\"\nambient_max = \"40 °C\"\ncoil_self_heating = \"10 K\"\n\
         [[supply]]\nname = \"s\"\nnominal = \"12 V\"\nmin = \"11 V\"\nmax = \"13 V\"\n\
         [[driver]]\nname = {}\nsupply = \"s\"\n\
         [driver.coil]\ninductance = \"0.2 H\"\ninductance_tolerance = \"10 %\"\nresistance = \"90 Ω\"\nresistance_tolerance = \"10 %\"\nresistance_at = \"20 °C\"\n\
         [driver.switch]\nrating = \"{switch_rating}\"\nderating = \"90 %\"\navalanche = \"66 V\"\n\
         [driver.clamp]\nkind = \"diode\"\n\
         [pins]\nsupply = \"3.3 V\"\nsupply_min = \"3.0 V\"\nclamp = \"silicon\"\nmax_temperature = \"85 °C\"\ninjection_limit = \"5 mA\"\ntotal_injection_limit = \"20 mA\"\n\
         [[input]]\nname = {}\nsignal_min = \"0 V\"\nsignal_max = \"12 V\"\ntransient_min = \"-1 V\"\ntransient_max = \"15 V\"\ntransient_width = \"1 ms\"\nseries_resistor = \"22 kΩ\"\n",
        q(driver),
        q(input)
    )
}

/// Names that try to leave a comment or an identifier (common practice for injection tests).
const HOSTILE: &[&str] = &[
    "fn",
    "type",
    "static",
    "self",
    "union",
    "valve */ int injected; /*",
    "valve\npub fn injected() {}",
    "valve\r\n#define injected 1",
    "??/ trigraph",
    "\u{202E}reversed\u{2066}",
    "",
    "123 starts with a digit",
    "é ü 漢字",
    "\"quoted\" `ticked` \\backslash\\",
    "}{ ] [ // /* */ #",
];

fn rustc() -> String {
    std::env::var("RUSTC").unwrap_or_else(|_| "rustc".into())
}

/// Compiles `module` as a library beside a root definition of `injected`, with warnings denied.
fn compile_rust(dir: &Path, module: &str) -> std::process::Output {
    std::fs::write(dir.join("kickguard_config.rs"), module).unwrap();
    let lib = "#![no_std]\n#![deny(warnings)]\n#[allow(dead_code)]\npub fn injected() {}\n#[allow(dead_code)]\nmod config {\n    include!(\"kickguard_config.rs\");\n}\n";
    std::fs::write(dir.join("lib.rs"), lib).unwrap();
    Command::new(rustc())
        .args([
            "--edition",
            "2021",
            "--crate-type",
            "lib",
            "--crate-name",
            "fw",
            "--emit",
            "metadata",
            "-D",
            "warnings",
            "lib.rs",
        ])
        .current_dir(dir)
        .output()
        .expect("rustc")
}

/// Compiles a C file that includes `header` and defines `injected` as a function, warnings as
/// errors, C99 (trigraphs on).
fn compile_c(dir: &Path, header: &str) -> std::process::Output {
    std::fs::write(dir.join("kickguard_config.h"), header).unwrap();
    std::fs::write(
        dir.join("use.c"),
        "#include \"kickguard_config.h\"\nint injected(void);\nint injected(void) { return 0; }\n",
    )
    .unwrap();
    common::cc_strict(
        dir,
        "-std=c99",
        &["-Wno-trigraphs".as_ref(), "-trigraphs".as_ref()],
    )
}

/// Every line of the generated Rust module is a comment, an attribute, a module or a constant.
fn rust_shape(module: &str) {
    for line in module.lines() {
        let t = line.trim_start();
        assert!(
            t.is_empty()
                || t.starts_with("//")
                || t == "#[allow(dead_code)]"
                || t == "}"
                || (t.starts_with("pub mod ") && t.ends_with(" {"))
                || t.starts_with("pub const "),
            "unexpected line in the Rust module: {line:?}"
        );
    }
}

/// Every line of the generated C header is a comment, a guard, the include or a KICKGUARD_ macro.
fn c_shape(header: &str) {
    let mut in_comment = false;
    for line in header.lines() {
        let t = line.trim_start();
        let ok = in_comment
            || t.is_empty()
            || t.starts_with("/*")
            || t.starts_with("#define KICKGUARD_")
            || t.starts_with("#ifndef KICKGUARD_CONFIG_H")
            || t.starts_with("#endif /* KICKGUARD_CONFIG_H */")
            || t == "#include <stdint.h>";
        assert!(ok, "unexpected line in the C header: {line:?}");
        if t.starts_with("/*") && !t.contains("*/") {
            in_comment = true;
        } else if in_comment && t.contains("*/") {
            in_comment = false;
        }
    }
}

#[test]
fn hostile_names_and_paths_stay_inert_in_both_languages() {
    let dir = scratch("hostile_names");
    let paths = [
        "design.toml",
        "a */ int injected; /*.toml",
        "a\npub fn injected() {}\n.toml",
        "ends\\",
    ];
    for (k, name) in HOSTILE.iter().enumerate() {
        let path = paths[k % paths.len()];
        let text = design(name, "line", "60 V");
        let r = analyse_text(&text, path, &Options::default())
            .unwrap_or_else(|e| panic!("{name:?}: {e}"));
        assert!(!r.failed(), "{name:?}: the test design must pass");
        let rust = output::rust::render(&r);
        let c = output::c::render(&r);
        rust_shape(&rust);
        c_shape(&c);
        let out = compile_rust(&dir, &rust);
        assert!(
            out.status.success(),
            "{name:?} in Rust: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        let out = compile_c(&dir, &c);
        assert!(
            out.status.success(),
            "{name:?} in C: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        // The identifier comes from the safe alphabet only.
        let id = ident(name);
        assert!(
            id.chars()
                .all(|ch| ch.is_ascii_lowercase() || ch.is_ascii_digit() || ch == '_'),
            "{id}"
        );
        assert!(
            rust.contains(&format!("pub mod {id} {{")),
            "{name:?} → {id}"
        );
    }
}

#[test]
fn identifiers_avoid_keywords_and_collisions_are_refused() {
    // Keywords of Rust (`fn`, `type`, `self`) and C (`static`, `union`) get a trailing
    // underscore; an empty name has one of its own.
    assert_eq!(ident("fn"), "fn_");
    assert_eq!(ident("type"), "type_");
    assert_eq!(ident("Static"), "static_");
    assert_eq!(ident(""), "unnamed");
    assert_eq!(ident("3 way valve"), "_3_way_valve");
    assert_eq!(ident("pump relay"), "pump_relay");
    assert_eq!(ident("  a -- b  "), "a_b");
    assert!(ident(&"x".repeat(500)).len() <= kickguard::host::IDENT_MAX);
    // A driver and an input whose identifiers collide would share one module: refused at the
    // later one's name.
    let text = design("Pump Relay", "pump-relay", "60 V");
    let e = analyse_text(&text, "c.toml", &Options::default())
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("input[0].name") && e.contains("`pump_relay`") && e.contains("driver[0]"),
        "{e}"
    );
}

#[test]
fn a_failed_design_writes_constants_that_stop_the_build() {
    // 12 V + a silicon diode across a 10 V switch: the peak alone exceeds 90 % of the rating
    // (arithmetic), so the design fails.
    let dir = scratch("failed_constants");
    let text =
        design("relay", "line", "10 V").replace("avalanche = \"66 V\"", "avalanche = \"14 V\"");
    let r = analyse_text(&text, "failed.toml", &Options::default()).unwrap();
    assert!(r.failed());
    let rust = output::rust::render(&r);
    let c = output::c::render(&r);
    assert!(!rust.contains("pub const") && !c.contains("#define KICKGUARD_RELAY"));
    let out = compile_rust(&dir, &rust);
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        !out.status.success()
            && err.contains("relay.switch_voltage")
            && err.contains("failed its checks"),
        "{err}"
    );
    let out = compile_c(&dir, &c);
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        !out.status.success() && err.contains("relay.switch_voltage"),
        "{err}"
    );
}

#[test]
fn outputs_are_owned_through_the_manifest() {
    let dir = scratch("manifest");
    let good = design("relay", "line", "60 V");
    std::fs::write(dir.join("mine.txt"), "the user's own file").unwrap();
    std::fs::write(dir.join("plot_other.svg"), "the user's own plot").unwrap();
    let f = dir.join("d.toml");
    std::fs::write(&f, &good).unwrap();
    configure(&f, &dir).unwrap();
    assert!(dir.join("kickguard_config.rs").exists() && dir.join(".kickguard-outputs").exists());
    // A bad file removes what the last run wrote, and only that.
    std::fs::write(
        &f,
        good.replace("inductance = \"0.2 H\"", "inductance = \"0.2\""),
    )
    .unwrap();
    let e = configure(&f, &dir).unwrap_err();
    assert!(e.contains("driver[0].coil.inductance"), "{e}");
    for gone in [
        "kickguard_config.rs",
        "kickguard_config.h",
        "report.txt",
        "report.json",
        ".kickguard-outputs",
    ] {
        assert!(!dir.join(gone).exists(), "{gone} survived a bad input");
    }
    assert!(dir.join("mine.txt").exists() && dir.join("plot_other.svg").exists());
    // A manifest cannot point outside the directory.
    let outside = scratch("manifest_outside");
    std::fs::write(outside.join("keep.txt"), "x").unwrap();
    std::fs::write(
        dir.join(".kickguard-outputs"),
        "../manifest_outside/keep.txt\n..\n/etc/passwd\n",
    )
    .unwrap();
    kickguard::host::clear_outputs(&dir).unwrap();
    assert!(outside.join("keep.txt").exists());
    // A failed design writes its outputs; the constants stop the build (above).
    let r = analyse_text(
        &design("relay", "line", "10 V").replace("avalanche = \"66 V\"", "avalanche = \"14 V\""),
        "f.toml",
        &Options::default(),
    )
    .unwrap();
    write_outputs(&r, &dir).unwrap();
    assert!(std::fs::read_to_string(dir.join("kickguard_config.rs"))
        .unwrap()
        .starts_with("// Generated"));
}

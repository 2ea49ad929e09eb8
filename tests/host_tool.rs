//! The configuration step end to end: golden report and JSON on the shipped demo, generated C
//! and Rust compiled by the machine's compilers, command-line exit statuses, located errors, and
//! the cautions in every output.
//!
//! The golden files are the project's own output for the demo design: a regression guard on the
//! whole pipeline, not an outside check (the physics behind every figure is checked against
//! outside sources in the other test files). The unsafe variant below swaps the 60 V switch for a
//! 40 V one: 26.4 V + 18 V of zener alone exceed 90 % of 40 V (arithmetic).
//!
//! Golden files live in tests/golden/; after an intended change, regenerate them with
//! `KICKGUARD_BLESS=1 cargo test --features host --test host_tool` and review the diff.

use kickguard::host::{analyse_text, codegen, write_outputs, HostError, Options};
use std::path::{Path, PathBuf};
use std::process::Command;

const DEMO: &str = "examples/greenhouse.toml";

fn demo_text() -> String {
    std::fs::read_to_string(DEMO).unwrap()
}

fn scratch(name: &str) -> PathBuf {
    let d = Path::new(env!("CARGO_TARGET_TMPDIR")).join(name);
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn golden(name: &str, actual: &str) {
    let path = Path::new("tests/golden").join(name);
    if std::env::var_os("KICKGUARD_BLESS").is_some() {
        std::fs::create_dir_all("tests/golden").unwrap();
        std::fs::write(&path, actual).unwrap();
        return;
    }
    let want = std::fs::read_to_string(&path)
        .unwrap_or_else(|_| panic!("missing golden file {}", path.display()));
    if want != actual {
        let first = want
            .lines()
            .zip(actual.lines())
            .position(|(a, b)| a != b)
            .unwrap_or(0);
        panic!(
            "{} differs from the golden file at line {}:\n  golden: {:?}\n  actual: {:?}",
            name,
            first + 1,
            want.lines().nth(first),
            actual.lines().nth(first)
        );
    }
}

#[test]
fn demo_report_and_json_match_golden_files() {
    let report = analyse_text(&demo_text(), DEMO, &Options::default()).unwrap();
    assert!(!report.failed(), "{}", report.text());
    golden("greenhouse_report.txt", &report.text());
    golden("greenhouse_report.json", &report.json().unwrap());
}

#[test]
fn every_output_carries_the_cautions() {
    let report = analyse_text(&demo_text(), DEMO, &Options::default()).unwrap();
    let dir = scratch("cautions");
    write_outputs(&report, &dir).unwrap();
    for f in ["report.txt", "report.json"] {
        let body = std::fs::read_to_string(dir.join(f)).unwrap();
        for c in kickguard::host::report::CAUTIONS {
            assert!(body.contains(c), "{f} lacks the caution {c:?}");
        }
    }
    for f in ["kickguard_config.rs", "kickguard_config.h"] {
        let body = std::fs::read_to_string(dir.join(f)).unwrap();
        assert!(body.contains("verify on the real hardware"), "{f}");
    }
    let svg = std::fs::read_to_string(dir.join("plot_valve.svg")).unwrap();
    assert!(svg.starts_with("<svg") && svg.contains("engineering estimate"));
}

#[test]
fn generated_c_header_compiles_with_the_c_compiler() {
    let report = analyse_text(&demo_text(), DEMO, &Options::default()).unwrap();
    let dir = scratch("c_header");
    std::fs::write(dir.join("kickguard_config.h"), codegen::c_header(&report)).unwrap();
    std::fs::write(
        dir.join("use.c"),
        "#include \"kickguard_config.h\"\n\
         unsigned use(void) { return KICKGUARD_VALVE_RELEASE_WAIT_TICKS + KICKGUARD_VALVE_DIAG_0_WINDOWS[0][1] + KICKGUARD_TICK_HZ; }\n",
    )
    .unwrap();
    let out = Command::new("cc")
        .args([
            "-std=c99", "-Wall", "-Wextra", "-Werror", "-c", "use.c", "-o", "use.o",
        ])
        .current_dir(&dir)
        .output()
        .expect("the machine's C compiler (cc)");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
}

#[test]
fn generated_rust_module_compiles_in_a_crate() {
    let report = analyse_text(&demo_text(), DEMO, &Options::default()).unwrap();
    let dir = scratch("rust_module");
    let module = codegen::rust_module(&report);
    std::fs::write(dir.join("kickguard_config.rs"), &module).unwrap();
    let lib = String::from(
        "#![no_std]\n#![deny(warnings)]\n#![allow(missing_docs)]\npub mod config {\n    include!(\"kickguard_config.rs\");\n}\n\
         pub fn wait() -> u32 { config::valve::RELEASE_WAIT_TICKS + config::valve::DIAG_1_WINDOWS[1][0] + config::TICK_HZ }\n"
    );
    std::fs::write(dir.join("lib.rs"), lib).unwrap();
    let rustc = std::env::var("RUSTC").unwrap_or_else(|_| "rustc".into());
    let out = Command::new(rustc)
        .args([
            "--edition",
            "2021",
            "--crate-type",
            "lib",
            "--crate-name",
            "fw_config",
            "--emit",
            "metadata",
            "lib.rs",
        ])
        .current_dir(&dir)
        .output()
        .expect("rustc");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
}

fn cli(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_kickguard"))
        .args(args)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into(),
        String::from_utf8_lossy(&out.stderr).into(),
    )
}

#[test]
fn command_line_exit_statuses() {
    // 0: safe.
    let dir = scratch("cli_ok");
    let (code, stdout, _) = cli(&["check", DEMO, "--out", dir.to_str().unwrap()]);
    assert_eq!(code, 0, "{stdout}");
    assert!(stdout.contains("VERDICT: PASS") && stdout.contains("CAUTION"));
    // 1: a check failed (a 40 V switch cannot take the valve's 18 V zener clamp on 26.4 V).
    let unsafe_design = demo_text().replacen("rating = \"60 V\"", "rating = \"40 V\"", 1);
    let dir1 = scratch("cli_fail");
    let f1 = dir1.join("unsafe.toml");
    std::fs::write(&f1, unsafe_design).unwrap();
    let (code, stdout, _) = cli(&[
        "check",
        f1.to_str().unwrap(),
        "--out",
        dir1.join("out").to_str().unwrap(),
    ]);
    assert_eq!(code, 1, "{stdout}");
    assert!(stdout.contains("FAIL  peak switch voltage"), "{stdout}");
    // 2: bad input, and nothing written.
    let dir2 = scratch("cli_bad");
    let f2 = dir2.join("bad.toml");
    std::fs::write(
        &f2,
        demo_text().replacen("inductance = \"350 mH\"", "inductance = \"350 mHz\"", 1),
    )
    .unwrap();
    let out2 = dir2.join("out");
    let (code, _, stderr) = cli(&[
        "check",
        f2.to_str().unwrap(),
        "--out",
        out2.to_str().unwrap(),
    ]);
    assert_eq!(code, 2);
    assert!(
        stderr.contains("driver[0].coil.inductance") && stderr.contains("mHz"),
        "{stderr}"
    );
    assert!(!out2.exists(), "nothing may be written for bad input");
    // --help works and exits 0; an unknown option is bad input.
    let (code, stdout, _) = cli(&["--help"]);
    assert_eq!(code, 0);
    assert!(stdout.contains("check"));
    assert_eq!(cli(&["check", DEMO, "--no-such-option"]).0, 2);
    // Monte Carlo with a fixed seed is reproducible.
    let a = cli(&[
        "check",
        DEMO,
        "--out",
        scratch("mc1").to_str().unwrap(),
        "--monte-carlo",
        "50",
        "--seed",
        "7",
    ]);
    let b = cli(&[
        "check",
        DEMO,
        "--out",
        scratch("mc2").to_str().unwrap(),
        "--monte-carlo",
        "50",
        "--seed",
        "7",
    ]);
    let mc = |s: &str| {
        s.lines()
            .filter(|l| l.contains("samples, seed") || l.contains("release time "))
            .collect::<Vec<_>>()
            .join("\n")
    };
    assert!(!mc(&a.1).is_empty());
    assert_eq!(mc(&a.1).replace("mc1", ""), mc(&b.1).replace("mc2", ""));
}

fn input_error(text: &str) -> (usize, usize, String, String) {
    match analyse_text(text, "t.toml", &Options::default()) {
        Err(HostError::Input {
            line,
            column,
            field,
            message,
            ..
        }) => (line, column, field, message),
        other => panic!("expected an input error, got {other:?}"),
    }
}

#[test]
fn malformed_files_are_located() {
    let demo = demo_text();
    // Unknown field: rejected, with its line.
    let t = demo.replacen("count = 4\nsupply", "count = 4\nsupplly = \"x\"\nsupply", 1);
    let (line, _, field, message) = input_error(&t);
    assert_eq!(field, "supplly");
    assert!(message.contains("unknown field"), "{message}");
    assert_eq!(
        t.lines()
            .nth(line - 1)
            .unwrap()
            .trim_start()
            .split(' ')
            .next(),
        Some("supplly")
    );
    // A unit that does not parse names the field, the line and the column of the value.
    let t = demo.replacen("resistance = \"56 Ω\"", "resistance = \"56 V\"", 1);
    let (line, col, field, message) = input_error(&t);
    assert_eq!(field, "driver[0].coil.resistance");
    assert!(message.contains("\"V\""), "{message}");
    assert_eq!(
        &t.lines().nth(line - 1).unwrap()[col - 1..col + 5],
        "\"56 V\""
    );
    // A bare number is refused for a dimensional value.
    let t = demo.replacen("inductance = \"350 mH\"", "inductance = \"0.35\"", 1);
    assert!(input_error(&t).3.contains("no unit"));
    // Broken TOML syntax.
    let t = demo.replacen("[environment]", "[environment", 1);
    let (line, _, _, _) = input_error(&t);
    assert!(line > 1);
    // A missing required field.
    let t = demo.replacen("tick_rate = \"10 kHz\"", "", 1);
    assert!(input_error(&t).3.contains("tick_rate"));
    // A supply name that does not exist.
    let t = demo.replacen("supply = \"12 V pump\"", "supply = \"14 V\"", 1);
    assert!(input_error(&t).3.contains("no supply named"));
}

#[test]
fn build_rs_call_fails_an_unsafe_design_with_the_reason() {
    let dir = scratch("configure");
    let f = dir.join("unsafe.toml");
    std::fs::write(
        &f,
        demo_text().replacen("rating = \"60 V\"", "rating = \"40 V\"", 1),
    )
    .unwrap();
    let err = kickguard::host::configure(&f, dir.join("out")).unwrap_err();
    assert!(
        err.contains("unsafe") && err.contains("peak switch voltage"),
        "{err}"
    );
    assert!(!dir.join("out").exists());
    let ok = kickguard::host::configure(DEMO, dir.join("ok")).unwrap();
    assert!(!ok.failed() && dir.join("ok/kickguard_config.rs").exists());
}

#[test]
fn zener_and_resistor_sizing_propose_values_or_name_the_conflict() {
    let demo = demo_text();
    let auto = demo.replacen("zener = \"18 V\"", "zener = \"auto\"", 1);
    let r = analyse_text(&auto, "auto.toml", &Options::default()).unwrap();
    let sized = r
        .checks
        .iter()
        .find(|c| c.name == "zener voltage (sized)")
        .expect("sized zener");
    assert!(
        sized.value.ends_with(" V") && sized.limit.starts_with("window"),
        "{sized:?}"
    );
    // Impossible release time: the requirements conflict and the report says so.
    let conflict = auto.replacen(
        "max_release_time = \"25 ms\"",
        "max_release_time = \"16 ms\"",
        1,
    );
    let r = analyse_text(&conflict, "c.toml", &Options::default()).unwrap();
    assert!(r.failed());
    assert!(
        r.checks
            .iter()
            .any(|c| c.name == "zener sizing" && c.note.contains("conflict")),
        "{}",
        r.text()
    );
    let drain = r
        .checks
        .iter()
        .find(|c| c.subject == "drain sense" && c.name == "series resistor (sized)")
        .unwrap();
    assert!(drain.value.ends_with(" Ω"));
}

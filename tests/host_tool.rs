//! The configuration step end to end: golden report and JSON on the shipped demo, generated C
//! and Rust compiled by the machine's compilers, command-line behaviour (exit statuses, help,
//! refused options), located errors (the models' refusals included), and the cautions in
//! every output.
//!
//! The golden files are the project's own output for the demo design: a regression guard on the
//! whole pipeline, not an outside check (the physics behind every figure is checked against
//! outside sources in the other test files; the conventions of the configuration step in
//! `tests/host_conventions.rs`). The unsafe variant below swaps the valves' 60 V switch for a
//! 40 V one: 26.4 V + 18 V of zener alone exceed 90 % of 40 V (arithmetic).
//!
//! Golden files live in tests/golden/; after an intended change, regenerate them with
//! `KICKGUARD_BLESS=1 cargo test --features host --test host_tool` and review the diff.

mod common;

use kickguard::host::checks::Status;
use kickguard::host::{analyse_text, output, write_outputs, HostError, Options};
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

fn demo() -> kickguard::host::report::Report {
    analyse_text(&demo_text(), DEMO, &Options::default()).unwrap()
}

#[test]
fn demo_passes_and_matches_the_golden_files() {
    let report = demo();
    assert!(!report.failed(), "{}", output::text::render(&report));
    golden("greenhouse_report.txt", &output::text::render(&report));
    golden(
        "greenhouse_report.json",
        &output::json::render(&report).unwrap(),
    );
}

#[test]
fn every_output_carries_the_cautions() {
    let report = demo();
    let dir = scratch("cautions");
    write_outputs(&report, &dir).unwrap();
    for f in [
        "report.txt",
        "report.json",
        "kickguard_config.rs",
        "kickguard_config.h",
    ] {
        let body = std::fs::read_to_string(dir.join(f)).unwrap();
        for c in kickguard::host::report::CAUTIONS {
            assert!(body.contains(c), "{f} lacks the caution {c:?}");
        }
    }
    let svg = std::fs::read_to_string(dir.join("plot_valve.svg")).unwrap();
    assert!(svg.starts_with("<svg") && svg.contains("engineering estimate"));
}

#[test]
fn names_are_the_same_in_report_json_and_constants() {
    let report = demo();
    let text = output::text::render(&report);
    let json = output::json::render(&report).unwrap();
    let rust = output::rust::render(&report);
    let c = output::c::render(&report);
    // The name as written and its identifier, side by side everywhere.
    assert!(text.contains("== pump relay (") && text.contains("constants in `pump_relay`"));
    assert!(
        json.contains("\"name\": \"pump relay\"") && json.contains("\"module\": \"pump_relay\"")
    );
    assert!(rust
        .contains("/// Constants of \"pump relay\".\n#[allow(dead_code)]\npub mod pump_relay {"));
    assert!(
        c.contains("/* pump relay */") && c.contains("KICKGUARD_PUMP_RELAY_RELEASE_WAIT_TICKS")
    );
    // No word borrowed from one microcontroller family's timer registers.
    for banned in ["ARR", "CCR", "OCR", "TOP", "COMPARE"] {
        assert!(
            !rust.contains(&format!("{banned}:")) && !rust.contains(&format!("_{banned} ")),
            "{banned}"
        );
    }
    assert!(rust.contains("PWM_PERIOD_COUNTS") && rust.contains("HOLD_ON_COUNTS"));
}

#[test]
fn no_internal_names_in_the_text() {
    let text = output::text::render(&demo());
    for internal in [
        "ClampOpen",
        "Leakage",
        "ZenerShorted",
        "CoilTooHot",
        "Some(",
        "None",
        "0.00 … 0.00",
    ] {
        assert!(!text.contains(internal), "the report shows {internal:?}");
    }
    // A comparator a healthy switch-off never trips says so.
    assert!(text.contains("comparator never trips"));
}

#[test]
fn generated_c_header_compiles_as_c99_and_c11() {
    let report = demo();
    let dir = scratch("c_header");
    std::fs::write(dir.join("kickguard_config.h"), output::c::render(&report)).unwrap();
    std::fs::write(
        dir.join("use.c"),
        "#include \"kickguard_config.h\"\n\
         static const uint32_t table[KICKGUARD_VALVE_DIAG_0_WINDOWS_ROWS][3] = KICKGUARD_VALVE_DIAG_0_WINDOWS;\n\
         unsigned use(void) { return KICKGUARD_VALVE_RELEASE_WAIT_TICKS + table[0][1] + KICKGUARD_TICK_HZ; }\n",
    )
    .unwrap();
    for std in ["-std=c99", "-std=c11"] {
        let out = common::cc_strict(&dir, std, &[]);
        assert!(
            out.status.success(),
            "{std}: {}",
            String::from_utf8_lossy(&out.stderr)
        );
    }
}

#[test]
fn generated_rust_module_compiles_without_warnings_as_it_is() {
    let report = demo();
    let dir = scratch("rust_module");
    std::fs::write(
        dir.join("kickguard_config.rs"),
        output::rust::render(&report),
    )
    .unwrap();
    // Included as it is, none of its constants used: not one warning.
    let lib = "#![no_std]\n#![deny(warnings)]\ninclude!(\"kickguard_config.rs\");\n";
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
            "-D",
            "warnings",
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
    assert!(
        String::from_utf8_lossy(&out.stderr).trim().is_empty(),
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
    assert!(stdout.contains("no check failed") && stdout.contains("CAUTION"));
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
    assert!(
        stdout.contains("FAIL  peak voltage across the switch"),
        "{stdout}"
    );
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
}

#[test]
fn command_line_options_are_checked() {
    // -h and --help print the same, and point to the field reference and the example; they
    // say what the exit status means as the summary does (0: no check failed).
    let (c1, short, _) = cli(&["check", "-h"]);
    let (c2, long, _) = cli(&["check", "--help"]);
    assert_eq!((c1, c2), (0, 0));
    assert_eq!(short, long);
    assert!(short.contains("examples/greenhouse.toml"), "{short}");
    assert!(short.contains("docs/design-file.md"), "{short}");
    assert!(short.contains("0 no check failed"), "{short}");
    assert_eq!(cli(&["-h"]).1, cli(&["--help"]).1);
    // A zero sample count is refused with a clear message; so is a seed without samples.
    let out = scratch("cli_opts");
    let o = out.to_str().unwrap();
    let (code, _, stderr) = cli(&["check", DEMO, "--out", o, "--monte-carlo", "0"]);
    assert_eq!(code, 2);
    assert!(
        stderr.contains("--monte-carlo") && stderr.contains("0"),
        "{stderr}"
    );
    let (code, _, stderr) = cli(&["check", DEMO, "--out", o, "--monte-carlo", "-5"]);
    assert_eq!(code, 2, "{stderr}");
    let (code, _, stderr) = cli(&["check", DEMO, "--out", o, "--seed", "7"]);
    assert_eq!(code, 2);
    assert!(stderr.contains("--monte-carlo"), "{stderr}");
    assert_eq!(cli(&["check", DEMO, "--no-such-option"]).0, 2);
    // A fixed seed is reproducible.
    let run = |d: &str| {
        cli(&[
            "check",
            DEMO,
            "--out",
            scratch(d).to_str().unwrap(),
            "--monte-carlo",
            "50",
            "--seed",
            "7",
        ])
        .1
    };
    let mc = |s: &str| {
        s.lines()
            .filter(|l| l.contains("Monte Carlo"))
            .collect::<Vec<_>>()
            .join("\n")
    };
    let (a, b) = (run("mc1"), run("mc2"));
    assert!(mc(&a).contains("50 samples"));
    assert_eq!(mc(&a), mc(&b));
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
    assert_eq!(field, "driver[0].supplly");
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
    assert!(input_error(&t).0 > 1);
    // A missing required field.
    let t = demo.replacen("tick_rate = \"10 kHz\"", "", 1);
    assert!(input_error(&t).3.contains("tick_rate"));
    // A supply name that does not exist.
    let t = demo.replacen(
        "supply = \"12 V\"\nmax_release_time",
        "supply = \"14 V\"\nmax_release_time",
        1,
    );
    let (_, _, field, message) = input_error(&t);
    assert!(
        message.contains("no supply named") && field == "driver[1].supply",
        "{field}: {message}"
    );
}

#[test]
fn refusals_keep_their_location() {
    let demo = demo_text();
    // A negative inductance: located at its value, with the accepted range.
    let t = demo.replacen("inductance = \"350 mH\"", "inductance = \"-350 mH\"", 1);
    let (line, col, field, message) = input_error(&t);
    assert_eq!(field, "driver[0].coil.inductance");
    assert!(t.lines().nth(line - 1).unwrap()[col - 1..].starts_with("\"-350 mH\""));
    assert!(message.contains("1 µH"), "{message}");
    // A clamp across the switch at or below the supply at its lowest tolerance.
    let t = demo.replacen(
        "voltage = \"45 V\"\ntolerance = \"5 %\"",
        "voltage = \"13.5 V\"\ntolerance = \"5 %\"",
        1,
    );
    let (_, _, field, message) = input_error(&t);
    assert_eq!(field, "driver[2].clamp.voltage");
    assert!(message.contains("highest supply"), "{message}");
    // A comparator below the supply would stay tripped: refused where it is written.
    let t = demo.replacen("comparator = [\"20 V\"]", "comparator = [\"12 V\"]", 1);
    let (line, _, field, _) = input_error(&t);
    assert_eq!(field, "driver[1].diagnosis.comparator[0]");
    assert!(t.lines().nth(line - 1).unwrap().contains("12 V"));
    // A winding hotter than the models' range is refused where it is set (the sweep found a
    // 5,000 °C winding accepted and band edges saturating).
    let t = demo.replacen(
        "coil_self_heating = \"25 K\"",
        "coil_self_heating = \"5000 K\"",
        1,
    );
    assert_eq!(input_error(&t).2, "environment.coil_self_heating");
    let t = demo
        .replacen(
            "coil_self_heating = \"25 K\"",
            "coil_self_heating = \"150 K\"",
            1,
        )
        .replacen("ambient_max = \"55 °C\"", "ambient_max = \"110 °C\"", 1);
    assert!(input_error(&t).3.contains("250 °C"));
    // Must-release above must-operate.
    let t = demo.replacen("must_release = \"10 %\"", "must_release = \"70 %\"", 1);
    assert_eq!(input_error(&t).2, "driver[0].coil.must_release");
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
        err.contains("unsafe") && err.contains("peak voltage across the switch"),
        "{err}"
    );
    // The outputs are written, and the constants stop any build that includes them.
    let rs = std::fs::read_to_string(dir.join("out/kickguard_config.rs")).unwrap();
    assert!(
        rs.contains("compile_error!")
            && rs.contains("valve.switch_voltage")
            && !rs.contains("pub const"),
        "{rs}"
    );
    let h = std::fs::read_to_string(dir.join("out/kickguard_config.h")).unwrap();
    assert!(
        h.contains("#error") && !h.contains("#define KICKGUARD_VALVE"),
        "{h}"
    );
    let ok = kickguard::host::configure(DEMO, dir.join("ok")).unwrap();
    assert!(!ok.failed() && dir.join("ok/kickguard_config.rs").exists());
}

#[test]
fn zener_sizing_proposes_a_value_or_names_the_conflict() {
    let auto = demo_text().replacen("voltage = \"18 V\"", "voltage = \"auto\"", 1);
    let r = analyse_text(&auto, "auto.toml", &Options::default()).unwrap();
    let sized = r
        .checks()
        .find(|c| c.id == "zener_sized")
        .expect("sized zener");
    assert_eq!(sized.status, Status::Info);
    // E24 (IEC 60063) and within the rating: 22 V is the largest that keeps 26.4 V + V_Z(I₀)
    // + the diode below 54 V at the worst corner (the report's own peak check says so).
    let v = sized.value.unwrap();
    assert!(
        kickguard::host::sizing::e24_values().any(|e| (e - v).abs() < 1e-4),
        "{v}"
    );
    let peak = r
        .checks()
        .find(|c| c.subject == "valve" && c.id == "switch_voltage")
        .unwrap();
    assert_eq!(peak.status, Status::Pass);
    // An impossible release time: the requirements conflict and the report says so.
    let conflict = auto.replacen(
        "max_release_time = \"25 ms\"",
        "max_release_time = \"16 ms\"",
        1,
    );
    let r = analyse_text(&conflict, "c.toml", &Options::default()).unwrap();
    assert!(r.failed());
    let z = r.checks().find(|c| c.id == "zener_sized").unwrap();
    assert!(
        z.status == Status::Fail && z.note.contains("conflict"),
        "{z:?}"
    );
    let drain = r
        .checks()
        .find(|c| c.subject == "drain sense" && c.id == "series_resistor_sized")
        .unwrap();
    assert!(drain.value.unwrap() > 1000.0);
}

#[test]
fn a_plot_with_non_finite_data_is_refused_at_once() {
    // The sweep's case: a series holding +∞ or f32::MAX did not return within 60 s.
    let report = demo();
    let mut p = report.drivers[0].plots[0].clone();
    // Beyond the quantities' range (1e12) an axis range could not be bounded: refused too.
    for bad in [f32::INFINITY, f32::NAN, f32::MAX, 1e30, -3e12] {
        p.series[0].v[3] = bad;
        let start = std::time::Instant::now();
        assert!(output::svg::render(&p).is_err());
        assert!(start.elapsed() < std::time::Duration::from_secs(1));
    }
}

#[test]
fn parser_errors_speak_the_tools_words_and_name_the_table() {
    // A bare number where a quantity belongs: the tool's own message with the field's unit.
    let t = demo_text().replacen("inductance = \"350 mH\"", "inductance = 0.2", 1);
    let (_, _, field, message) = input_error(&t);
    assert_eq!(field, "driver[0].coil.inductance");
    assert!(
        message.contains("\"0.2\" has no unit") && message.contains("\"0.2 H\""),
        "{message}"
    );
    assert!(!message.contains("invalid type"), "{message}");
    // A missing table of the only driver is located with the driver's index.
    let demo = demo_text();
    let start = demo.find("[[driver]]").unwrap();
    let second = start + 1 + demo[start + 1..].find("[[driver]]").unwrap();
    let first_only = &demo[..second];
    let end_pins = demo.find("# The 3.3 V microcontroller's pins.").unwrap();
    let one = format!(
        "{}{}",
        first_only.replace(&first_only[first_only.find("[driver.clamp]").unwrap()..first_only.find("[driver.hold]").unwrap()], ""),
        &demo[end_pins..]
    )
    .replace("sense_of = \"valve\"", "signal_min = \"0 V\"\nsignal_max = \"24 V\"\ntransient_min = \"-1 V\"\ntransient_max = \"30 V\"\ntransient_width = \"1 ms\"");
    let (_, _, field, message) = input_error(&one);
    assert_eq!(field, "driver[0].clamp", "{message}");
}

#[test]
fn refusals_are_located_at_the_field_that_caused_them() {
    let demo = demo_text();
    // A PWM period far longer than the coil's L/R (1 Hz), or an L far too small for 20 kHz: the
    // current falls to zero every period (discontinuous conduction, outside the hold model):
    // located at the hold's frequency, saying why, not at the clamp.
    for (from, to) in [
        ("frequency = \"20 kHz\"", "frequency = \"1 Hz\""),
        ("inductance = \"350 mH\"", "inductance = \"1 µH\""),
    ] {
        // (The valve's armature keeps its open inductance below the seated one.)
        let text = demo.replacen(from, to, 1).replacen(
            "open_inductance = \"220 mH\"",
            "open_inductance = \"0.5 µH\"",
            1,
        );
        let (_, _, field, message) = input_error(&text);
        assert_eq!(field, "driver[0].hold.frequency", "{to}: {message}");
        assert!(message.contains("continuous conduction"), "{message}");
    }
    // A self-heating the coil model cannot follow (the coil-too-hot fault lies 50 K above the
    // hottest winding, the model ends at 250 °C): refused where it is written.
    let t = demo.replacen(
        "coil_self_heating = \"25 K\"",
        "coil_self_heating = \"150 K\"",
        1,
    );
    let (line, _, field, message) = input_error(&t);
    assert_eq!(field, "environment.coil_self_heating", "{message}");
    assert!(line > 1 && message.contains("250 °C"), "{message}");
    // A duplicate key names itself and its table.
    let t = demo.replacen("guard = \"5 %\"", "guard = \"5 %\"\nguard = \"6 %\"", 1);
    let (_, _, field, message) = input_error(&t);
    assert_eq!(field, "driver[0].diagnosis.guard");
    assert!(message.contains("duplicate key `guard`"), "{message}");
}

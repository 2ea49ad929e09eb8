//! A short, stable fuzz smoke test of the configuration step's front end (the same entry points
//! as the cargo-fuzz targets in fuzz/): deterministic random mutations of the demo design file
//! must never panic, and every input error must carry a line and a column. Runs
//! `KICKGUARD_FUZZ_RUNS` mutations (default 300; one in ten within the armature section only). The regression inputs the coverage-guided fuzzer
//! found are replayed too.

use kickguard::host::file::quantity::{parse, Unit};
use kickguard::host::{analyse_text, output, render_outputs, HostError, Options};

struct XorShift(u64);
impl XorShift {
    fn next(&mut self) -> u64 {
        // xorshift64 (Marsaglia 2003): a fixed-seed generator, the same sequence everywhere.
        self.0 ^= self.0 << 13;
        self.0 ^= self.0 >> 7;
        self.0 ^= self.0 << 17;
        self.0
    }
    fn below(&mut self, n: usize) -> usize {
        (self.next() % n.max(1) as u64) as usize
    }
}

const DICTIONARY: &[&str] = &[
    "\"auto\"",
    "\"-1 V\"",
    "\"0 Ω\"",
    "\"1e30 H\"",
    "NaN",
    "\"inf A\"",
    "[[driver]]",
    "=",
    "\"",
    "\n",
    "[",
    "]",
    "\"1 %\"",
    "\"200 %\"",
];

fn mutate(rng: &mut XorShift, base: &str) -> String {
    let mut bytes = base.as_bytes().to_vec();
    for _ in 0..1 + rng.below(4) {
        let at = rng.below(bytes.len());
        match rng.below(5) {
            0 => {
                if let Some(b) = bytes.get_mut(at) {
                    *b ^= 1 << rng.below(8);
                }
            }
            1 => {
                let end = (at + rng.below(40)).min(bytes.len());
                bytes.drain(at..end);
            }
            2 => {
                let word = DICTIONARY[rng.below(DICTIONARY.len())];
                bytes.splice(at..at, word.bytes());
            }
            3 => {
                let from = rng.below(bytes.len());
                let end = (from + rng.below(60)).min(bytes.len());
                let chunk: Vec<u8> = bytes[from..end].to_vec();
                bytes.splice(at..at, chunk);
            }
            _ => bytes.truncate(at),
        }
    }
    String::from_utf8_lossy(&bytes).into_owned()
}

#[test]
fn mutated_design_files_never_panic() {
    let base = std::fs::read_to_string("examples/greenhouse.toml").unwrap();
    // The armature section's corner searches cost far more than the rest of the check: nine
    // runs in ten mutate the design without it, the tenth mutates that section alone inside
    // the whole design (so its fields are fuzzed as often as if they were a tenth of the file).
    let at = base.find("[driver.armature]").unwrap();
    let end = at + base[at..].find("\n[[driver]]").unwrap();
    let (head, section, tail) = (&base[..at], &base[at..end], &base[end..]);
    let without = format!("{head}{tail}");
    let runs: usize = std::env::var("KICKGUARD_FUZZ_RUNS")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(300);
    let mut rng = XorShift(0x9E37_79B9_7F4A_7C15);
    let (mut ok, mut located) = (0, 0);
    for k in 0..runs {
        let text = if k % 10 == 9 {
            format!("{head}{}{tail}", mutate(&mut rng, section))
        } else {
            mutate(&mut rng, &without)
        };
        match analyse_text(&text, "fuzz.toml", &Options::default()) {
            Ok(r) => {
                ok += 1;
                assert!(!output::text::render(&r).is_empty() && render_outputs(&r).is_ok());
            }
            Err(HostError::Input { line, column, .. }) => {
                located += 1;
                assert!(line >= 1 && column >= 1);
            }
            Err(_) => {}
        }
    }
    // The harness must exercise both sides: some mutants still analyse, some are refused.
    assert!(ok > 0 && located > 0, "ok {ok}, located errors {located}");
}

#[test]
fn fuzzer_regressions_stay_fixed() {
    // Found by `cargo fuzz run quantity`: "4.e307kΩ" overflowed f64 after the prefix.
    let mut replayed = 0;
    for entry in std::fs::read_dir("tests/fuzz_regressions").unwrap() {
        replayed += 1;
        let data = std::fs::read(entry.unwrap().path()).unwrap();
        let text = String::from_utf8_lossy(&data);
        for u in [
            Unit::Ohm,
            Unit::Volt,
            Unit::Hertz,
            Unit::Henry,
            Unit::Percent,
        ] {
            if let Ok(v) = parse(&text, u) {
                assert!(v.is_finite());
            }
        }
        let _ = analyse_text(&text, "regression.toml", &Options::default());
    }
    assert!(
        replayed > 0,
        "no regression input found in tests/fuzz_regressions"
    );
}

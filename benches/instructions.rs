//! Instruction counts per call of the run-time functions, measured with valgrind's callgrind.
//!
//! Run: `cargo bench --bench instructions` (needs `valgrind`). For each case the bench runs
//! itself under `valgrind --tool=callgrind` twice, calling the function N₁ and N₂ times; the
//! difference of the two totals divided by N₂ − N₁ is the cost of one call, with start-up and
//! valgrind's own overhead cancelled. The first case is an empty call through the same harness;
//! its count is subtracted from the others ("net", the figure held to the targets). Instruction
//! counts are deterministic for a given binary and input, so the figures repeat exactly from run
//! to run. A case over its target fails the bench.

mod cases;

use std::process::Command;

const N1: u32 = 200;
const N2: u32 = 1200;

fn collected(exe: &str, case: usize, n: u32) -> Result<u64, String> {
    let out = Command::new("valgrind")
        .args([
            "--tool=callgrind",
            "--callgrind-out-file=/dev/null",
            exe,
            "--measure",
        ])
        .arg(case.to_string())
        .arg(n.to_string())
        .output()
        .map_err(|e| format!("cannot run valgrind: {e}"))?;
    let err = String::from_utf8_lossy(&out.stderr);
    err.lines()
        .find_map(|l| l.split("Collected :").nth(1))
        .and_then(|s| s.trim().parse().ok())
        .ok_or_else(|| format!("no 'Collected' line in valgrind output:\n{err}"))
}

fn main() {
    let args: Vec<String> = std::env::args().collect();
    if let Some(pos) = args.iter().position(|a| a == "--measure") {
        let case: usize = args[pos + 1].parse().expect("case index");
        let n: u32 = args[pos + 2].parse().expect("iterations");
        let mut acc = 0.0f32;
        for _ in 0..n {
            acc += (cases::CASES[case].run)();
        }
        std::hint::black_box(acc);
        return;
    }
    let exe = std::env::current_exe().expect("own path");
    let exe = exe.to_str().expect("utf-8 path");
    println!(
        "instructions per call (x86_64 host, release profile, callgrind, ({N2} − {N1}) calls)"
    );
    println!("{:<52} {:>8} {:>8} {:>8}", "call", "gross", "net", "target");
    let per_call = |k: usize| -> f64 {
        match (collected(exe, k, N1), collected(exe, k, N2)) {
            (Ok(a), Ok(b)) => (b - a) as f64 / (N2 - N1) as f64,
            (Err(e), _) | (_, Err(e)) => {
                eprintln!("{e}");
                std::process::exit(2);
            }
        }
    };
    // Case 0 is the empty call: the harness's own cost per call, subtracted as "net".
    let overhead = per_call(0);
    let mut over = 0;
    for (k, case) in cases::CASES.iter().enumerate() {
        let gross = if k == 0 { overhead } else { per_call(k) };
        let net = gross - overhead;
        let target = case.target.map_or("—".to_string(), |t| t.to_string());
        let ok = case.target.is_none_or(|t| net <= t as f64);
        if !ok {
            over += 1;
        }
        let flag = if ok { "" } else { "OVER TARGET" };
        println!(
            "{:<52} {:>8.0} {:>8.0} {:>8} {flag}",
            case.name, gross, net, target
        );
    }
    if over > 0 {
        eprintln!("{over} case(s) over their instruction target");
        std::process::exit(1);
    }
}

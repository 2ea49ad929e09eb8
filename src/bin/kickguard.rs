//! `kickguard`: the firmware configuration step from the command line.
//!
//! Exit status: 0 no check failed (a WARN is advice or a check that could not be judged, never
//! a limit exceeded); 1 a check failed (the design is unsafe or does not work as described: the
//! constants written then stop a firmware build with the reason); 2 bad input (the file cannot
//! be read or parsed, a value is refused, or the command line is wrong): nothing is written,
//! and the files an earlier run wrote into the output directory are removed.

use clap::{Parser, Subcommand};
use kickguard::host::{
    analyse_file, clear_outputs, output, write_outputs, Distribution, MonteCarlo, Options,
};
use std::path::PathBuf;
use std::process::ExitCode;

/// Text after the options, the same for `-h` and `--help`.
const AFTER: &str = "Every field of the design file, its unit, default and meaning: docs/design-file.md in the kickguard repository; examples/greenhouse.toml is an annotated example.\n\nResults are engineering estimates from simplified models: verify on the real hardware; local codes and licensed practice prevail.\n\nExit status: 0 no check failed (WARN lines are advice or checks that could not be judged, never a limit exceeded), 1 a check failed (the constants written stop a firmware build with the reason), 2 bad input (nothing written; the files an earlier run wrote into --out are removed).";

/// Suppression, timing, input-protection and diagnosis checks for coil drivers, from a design file.
#[derive(Parser)]
#[command(name = "kickguard", version, about, after_help = AFTER)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Analyse a design file: print the report and write report, JSON, plots and constants.
    #[command(after_help = AFTER)]
    Check {
        /// The design file (TOML; see examples/greenhouse.toml).
        design: PathBuf,
        /// Directory for report.txt, report.json, the plots and the generated constants.
        #[arg(long, default_value = "kickguard-out")]
        out: PathBuf,
        /// Also draw this many Monte Carlo samples per driver (1 or more), uniform inside each corner box.
        #[arg(long, value_name = "SAMPLES", value_parser = clap::value_parser!(u32).range(1..))]
        monte_carlo: Option<u32>,
        /// Seed of the Monte Carlo generator (needs --monte-carlo; the same seed gives the same samples).
        #[arg(long, requires = "monte_carlo")]
        seed: Option<u64>,
        /// How the Monte Carlo samples spread over each axis: uniform, or normal with each ± range read as --sigmas standard deviations and truncated to it.
        #[arg(long, requires = "monte_carlo", value_parser = ["uniform", "normal"], default_value = "uniform")]
        distribution: String,
        /// With --distribution normal: how many standard deviations a ± range is (1 … 6).
        #[arg(long, requires = "monte_carlo", default_value_t = 3, value_parser = clap::value_parser!(u8).range(1..=6))]
        sigmas: u8,
        /// Print the JSON report instead of the text.
        #[arg(long)]
        json: bool,
    },
}

/// Prints an error and returns exit status 2.
fn bad(e: impl std::fmt::Display) -> ExitCode {
    eprintln!("error: {e}");
    ExitCode::from(2)
}

/// Bad input: prints the error, removes what an earlier run wrote into `out` (so no stale
/// constants survive a broken design), and returns exit status 2.
fn bad_input(e: impl std::fmt::Display, out: &std::path::Path) -> ExitCode {
    eprintln!("error: {e}");
    match clear_outputs(out) {
        Ok(0) => {}
        Ok(n) => eprintln!(
            "removed {n} file(s) an earlier run wrote into {}",
            out.display()
        ),
        Err(e) => eprintln!("error: {e}"),
    }
    ExitCode::from(2)
}

fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { 2 } else { 0 };
            let _ = e.print();
            return ExitCode::from(code);
        }
    };
    let Command::Check {
        design,
        out,
        monte_carlo,
        seed,
        distribution,
        sigmas,
        json,
    } = cli.command;
    let options = Options {
        monte_carlo: monte_carlo.map(|samples| MonteCarlo {
            samples,
            seed: seed.unwrap_or(1),
            distribution: if distribution == "normal" {
                Distribution::Normal { sigmas }
            } else {
                Distribution::Uniform
            },
        }),
    };
    let report = match analyse_file(&design, &options) {
        Ok(r) => r,
        Err(e) => return bad_input(e, &out),
    };
    let text = if json {
        match output::json::render(&report) {
            Ok(j) => j,
            Err(e) => return bad(e),
        }
    } else {
        output::text::render(&report)
    };
    match write_outputs(&report, &out) {
        Ok(paths) => {
            println!("{text}");
            if !json {
                for p in paths {
                    println!("wrote {}", p.display());
                }
            }
        }
        Err(e) => return bad(e),
    }
    ExitCode::from(if report.failed() { 1 } else { 0 })
}

//! `kickguard`: the firmware configuration step from the command line.
//!
//! Exit status: 0 every check passed; 1 a check failed (the design is unsafe as described);
//! 2 bad input (the file cannot be read or parsed, or a value is refused), and nothing is written.

use clap::{Parser, Subcommand};
use kickguard::host::{analyse_file, write_outputs, Options};
use std::path::PathBuf;
use std::process::ExitCode;

/// Suppression, timing, input-protection and diagnosis checks for coil drivers, from a design
/// file; writes a report, JSON, plots and the firmware's constants.
///
/// Results are engineering estimates from simplified models: verify on the real hardware; local
/// codes and licensed practice prevail.
#[derive(Parser)]
#[command(name = "kickguard", version, about, long_about)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Analyse a design file: print the report, write the outputs.
    Check {
        /// The design file (TOML).
        design: PathBuf,
        /// Directory for report.txt, report.json, plots and generated constants.
        #[arg(long, default_value = "kickguard-out")]
        out: PathBuf,
        /// Also draw this many Monte Carlo samples per driver (uniform within tolerances).
        #[arg(long, value_name = "SAMPLES")]
        monte_carlo: Option<u32>,
        /// Seed of the Monte Carlo generator (the same seed gives the same samples).
        #[arg(long, default_value_t = 1)]
        seed: u64,
        /// Print the JSON report instead of the text.
        #[arg(long)]
        json: bool,
    },
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
    match cli.command {
        Command::Check {
            design,
            out,
            monte_carlo,
            seed,
            json,
        } => {
            let options = Options {
                monte_carlo: monte_carlo.map(|n| (n, seed)),
            };
            let report = match analyse_file(&design, &options) {
                Ok(r) => r,
                Err(e) => {
                    eprintln!("error: {e}");
                    return ExitCode::from(2);
                }
            };
            match write_outputs(&report, &out) {
                Ok(paths) => {
                    if json {
                        match report.json() {
                            Ok(j) => println!("{j}"),
                            Err(e) => {
                                eprintln!("error: {e}");
                                return ExitCode::from(2);
                            }
                        }
                    } else {
                        print!("{}", report.text());
                        println!();
                        for p in paths {
                            println!("wrote {}", p.display());
                        }
                    }
                }
                Err(e) => {
                    eprintln!("error: {e}");
                    return ExitCode::from(2);
                }
            }
            ExitCode::from(if report.failed() { 1 } else { 0 })
        }
    }
}

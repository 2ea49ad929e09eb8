//! How long the configuration step takes on the demo design with 10⁵ Monte Carlo samples per
//! driver (one core, this build's profile): the whole analysis, and the analysis alone without
//! the samples, so the difference is the sampling. A figure to print, not a timed test.
//!
//! Run: `cargo bench --features host --bench monte_carlo`.

use kickguard::host::montecarlo::Request;
use kickguard::host::{analyse_text, Options};
use std::time::Instant;

fn time(text: &str, options: &Options) -> f64 {
    // The best of three: the least disturbed by the machine's other work.
    (0..3)
        .map(|_| {
            let t = Instant::now();
            let r = analyse_text(text, "examples/greenhouse.toml", options)
                .expect("the demo design analyses");
            assert!(!r.failed());
            t.elapsed().as_secs_f64()
        })
        .fold(f64::INFINITY, f64::min)
}

fn main() {
    let text = std::fs::read_to_string("examples/greenhouse.toml").expect("demo design");
    let samples = 100_000;
    let plain = time(&text, &Options::default());
    let mc = time(
        &text,
        &Options {
            monte_carlo: Some(Request {
                samples,
                seed: 1,
                distribution: Default::default(),
            }),
        },
    );
    println!("demo design, vertex search and checks only: {:.3} s", plain);
    println!(
        "demo design with {samples} Monte Carlo samples per driver: {:.3} s (sampling {:.3} s)",
        mc,
        mc - plain
    );
}

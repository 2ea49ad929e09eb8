//! Host timings of the run-time calls (criterion, stable Rust).
//!
//! Run: `cargo bench --bench timing`. Wall-clock figures depend on the machine; the
//! instruction counts of `cargo bench --bench instructions` are the repeatable measure.

mod cases;

use criterion::{criterion_group, criterion_main, Criterion};

fn bench(c: &mut Criterion) {
    for case in cases::CASES {
        c.bench_function(case.name, |b| b.iter(case.run));
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);

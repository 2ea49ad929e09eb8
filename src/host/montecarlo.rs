//! Monte Carlo inside each driver's box: points drawn on every axis at once, uniformly
//! ([`crate::host::corners::Space::sample`]) or normally with each axis's half-range read as
//! kσ about its middle and truncated to the box ([`crate::host::corners::Space::sample_normal`];
//! how many teams read a ± tolerance), from a fixed-seed xorshift64* generator; the same
//! figures as at the vertices, and per figure the smallest, median and largest sample beside
//! the vertex search's worst — with a count of samples that beat it, which must be zero (a
//! truncated distribution stays inside the box, so the vertex worst bounds it too).
//!
//! Work: one evaluation of every figure per sample (a bounded number of integrations each);
//! memory: one f32 per sample and figure.

use super::board::Board;
use super::checks::{Metric, Spread, MC_TOLERANCE};
use super::corners::{Rng, Sense};
use super::engine::{refused, DriverRun};
use super::figures::{figures_with, Needs};
use super::HostError;
use std::vec::Vec;

/// How the samples spread over each axis.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Distribution {
    /// Uniform over each axis's range.
    #[default]
    Uniform,
    /// Normal about each axis's middle, its half-range being `sigmas` standard deviations,
    /// truncated to the range.
    Normal {
        /// k: the half-range in standard deviations (1 … 6).
        sigmas: u8,
    },
}

/// A Monte Carlo run's request.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Request {
    /// Samples per driver (≥ 1).
    pub samples: u32,
    /// The generator's seed.
    pub seed: u64,
    /// How the samples spread.
    pub distribution: Distribution,
}

/// Whether `v` is worse than the vertex worst `w` beyond the tolerance.
pub fn beyond(sense: Sense, v: f32, w: f32) -> bool {
    let slack = MC_TOLERANCE * w.abs() + 1e-12;
    match sense {
        Sense::Max => v > w + slack,
        Sense::Min => v < w - slack,
    }
}

/// The spread of each of `metrics` over `req.samples` points of `run`'s box (None for a
/// figure that applied at no sample). Driver `k` of the board draws from seed `seed + k`, so
/// each driver's samples do not depend on the others.
///
/// # Errors
/// A model refusal at a sample, located at the driver.
pub fn spreads(
    board: &Board,
    run: &DriverRun,
    k: usize,
    req: Request,
    metrics: &[Metric],
) -> Result<Vec<Option<Spread>>, HostError> {
    let cx = run.context(board);
    let mut rng = Rng::new(req.seed.wrapping_add(k as u64));
    let mut values: Vec<Vec<f32>> = metrics
        .iter()
        .map(|_| Vec::with_capacity(req.samples as usize))
        .collect();
    let needs = metrics.iter().fold(
        Needs {
            diag: false,
            open: false,
            hold: false,
        },
        |a, m| {
            let n = m.needs();
            Needs {
                diag: a.diag || n.diag,
                open: a.open || n.open,
                hold: a.hold || n.hold,
            }
        },
    );
    for _ in 0..req.samples {
        let p = match req.distribution {
            Distribution::Uniform => run.space.sample(&mut rng),
            Distribution::Normal { sigmas } => run.space.sample_normal(&mut rng, sigmas),
        };
        let f =
            figures_with(&cx, &p, needs).map_err(|e| refused(board, &run.d, &run.space, &p, e))?;
        for (m, v) in metrics.iter().zip(values.iter_mut()) {
            if let Some(x) = m.read(&run.d, &f) {
                v.push(x);
            }
        }
    }
    Ok(metrics
        .iter()
        .zip(values)
        .map(|(m, v)| summarise(run, *m, v))
        .collect())
}

/// Min, median, max and the count beyond the vertex worst.
fn summarise(run: &DriverRun, m: Metric, mut v: Vec<f32>) -> Option<Spread> {
    if v.is_empty() {
        return None;
    }
    // A figure out of reach at some vertex (a duty above 100 %) has no finite worst to beat.
    let unbounded = m.unbounded_when_missing() && m.missing_somewhere(&run.d, &run.figures);
    let worst = if unbounded {
        f32::INFINITY
    } else {
        m.worst(&run.d, &run.points, &run.figures)?.value
    };
    let beyond_count = v.iter().filter(|x| beyond(m.sense(), **x, worst)).count();
    let min = v.iter().copied().fold(f32::INFINITY, f32::min);
    let max = v.iter().copied().fold(f32::NEG_INFINITY, f32::max);
    // The median by selection: linear time, no full sort.
    let mid = v.len() / 2;
    let (_, median, _) = v.select_nth_unstable_by(mid, |a, b| a.total_cmp(b));
    Some(Spread {
        min,
        median: *median,
        max,
        beyond: u32::try_from(beyond_count).unwrap_or(u32::MAX),
    })
}

/// Every figure that applies to a driver (the worst-case test compares them all, diagnosis
/// windows included).
pub fn all_metrics(run: &DriverRun) -> Vec<Metric> {
    let mut out = Metric::SCALAR.to_vec();
    let n = run.d.diagnosis.as_ref().map_or(0, |g| g.measurements.len());
    for m in 0..n {
        for c in 0..6u8 {
            for high in [false, true] {
                out.push(Metric::Diag {
                    m: m as u8,
                    c,
                    high,
                });
            }
        }
    }
    out.retain(|m| run.figures.iter().any(|f| m.read(&run.d, f).is_some()));
    out
}

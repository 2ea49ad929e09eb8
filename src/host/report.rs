//! The analysis result and its readable and JSON forms.

use serde::Serialize;
use std::format;
use std::string::{String, ToString};
use std::vec::Vec;

/// The cautions every report carries.
pub const CAUTIONS: [&str; 3] = [
    "Results are engineering estimates from simplified models of the parts.",
    "Verify the design on the real hardware, over its real temperature range, with margin.",
    "Local codes and licensed practice prevail over anything computed here.",
];

/// Outcome of one check.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Status {
    /// Within its limit.
    Pass,
    /// Outside its limit: the design is unsafe as described.
    Fail,
    /// Needs attention (missing data, or a fault the diagnosis cannot see).
    Warn,
    /// A figure for the designer; nothing to judge.
    Info,
}

/// One line of the report.
#[derive(Debug, Clone, Serialize)]
pub struct Check {
    /// Driver, input or "board".
    pub subject: String,
    /// What is checked.
    pub name: String,
    /// Outcome.
    pub status: Status,
    /// The worst value found.
    pub value: String,
    /// The limit it is held to.
    pub limit: String,
    /// capacity/demand − 1 (None where not meaningful).
    pub margin: Option<f32>,
    /// The corner that sets the value.
    pub corner: String,
    /// Anything else worth saying.
    pub note: String,
}

impl Check {
    /// `value` must not exceed `limit` (both in `unit`).
    pub fn against(
        subject: &str,
        name: &str,
        value: f32,
        limit: f32,
        unit: &str,
        corner: &str,
        note: &str,
    ) -> Check {
        let margin = if value > 0.0 {
            Some(limit / value - 1.0)
        } else {
            None
        };
        Check {
            subject: subject.to_string(),
            name: name.to_string(),
            status: if value <= limit {
                Status::Pass
            } else {
                Status::Fail
            },
            value: format!("{} {unit}", round(value)),
            limit: format!("≤ {} {unit}", round(limit)),
            margin,
            corner: corner.to_string(),
            note: note.to_string(),
        }
    }

    /// An informational figure.
    pub fn info(
        subject: &str,
        name: &str,
        value: &str,
        limit: &str,
        corner: &str,
        note: &str,
    ) -> Check {
        Check::plain(
            subject,
            name,
            Status::Info,
            value,
            limit,
            None,
            corner,
            note,
        )
    }

    /// A warning.
    pub fn warn(subject: &str, name: &str, value: &str, corner: &str, note: &str) -> Check {
        Check::plain(subject, name, Status::Warn, value, "", None, corner, note)
    }

    /// A failure with a reason.
    pub fn fail(
        subject: &str,
        name: &str,
        value: &str,
        limit: &str,
        margin: Option<f32>,
        corner: &str,
        note: &str,
    ) -> Check {
        Check::plain(
            subject,
            name,
            Status::Fail,
            value,
            limit,
            margin,
            corner,
            note,
        )
    }

    #[allow(clippy::too_many_arguments)]
    fn plain(
        subject: &str,
        name: &str,
        status: Status,
        value: &str,
        limit: &str,
        margin: Option<f32>,
        corner: &str,
        note: &str,
    ) -> Check {
        Check {
            subject: subject.to_string(),
            name: name.to_string(),
            status,
            value: value.to_string(),
            limit: limit.to_string(),
            margin,
            corner: corner.to_string(),
            note: note.to_string(),
        }
    }
}

/// Rounds for display to 4 significant digits.
fn round(x: f32) -> String {
    let a = x.abs();
    if a == 0.0 {
        "0".to_string()
    } else if a >= 1000.0 {
        format!("{x:.0}")
    } else if a >= 100.0 {
        format!("{x:.1}")
    } else if a >= 10.0 {
        format!("{x:.2}")
    } else {
        format!("{x:.3}")
    }
}

/// A run-time constant for the firmware.
#[derive(Debug, Clone, Serialize)]
pub struct Constant {
    /// Module (driver or input identifier).
    pub scope: String,
    /// Constant name, upper case.
    pub name: String,
    /// Value.
    pub value: u32,
    /// What it is.
    pub doc: String,
}

impl Constant {
    /// A constant in `scope`.
    pub fn new(scope: &str, name: &str, value: u32, doc: &str) -> Constant {
        Constant {
            scope: super::analysis::ident(scope),
            name: name.to_string(),
            value,
            doc: doc.to_string(),
        }
    }
}

/// A diagnosis window table: rows of [lo ticks, hi ticks, condition code].
#[derive(Debug, Clone, Serialize)]
pub struct WindowTable {
    /// Driver.
    pub scope: String,
    /// Constant name.
    pub name: String,
    /// The comparator threshold it belongs to.
    pub threshold_v: f32,
    /// Rows.
    pub entries: Vec<[u32; 3]>,
}

/// One curve set of a plot.
#[derive(Debug, Clone, Serialize)]
pub struct PlotSeries {
    /// Clamp option.
    pub label: String,
    /// Time, ms.
    pub t_ms: Vec<f32>,
    /// Coil current, A.
    pub i_a: Vec<f32>,
    /// Switch voltage, V.
    pub v_switch: Vec<f32>,
}

/// The plots of a driver.
#[derive(Debug, Clone, Serialize)]
pub struct DriverPlot {
    /// Driver.
    pub name: String,
    /// One series per clamp option.
    pub series: Vec<PlotSeries>,
}

/// Monte Carlo summary of a driver.
#[derive(Debug, Clone, Serialize)]
pub struct MonteCarlo {
    /// Driver.
    pub driver: String,
    /// Samples drawn.
    pub samples: u32,
    /// Seed.
    pub seed: u64,
    /// Peak switch voltage: minimum, median, maximum (V).
    pub peak_switch_voltage: [f32; 3],
    /// Release time: minimum, median, maximum (ms), when a release level is given.
    pub release_time_ms: Option<[f32; 3]>,
}

impl MonteCarlo {
    /// Summarises samples.
    pub fn summarise(
        driver: &str,
        n: u32,
        seed: u64,
        peaks: &[f32],
        releases: &[f32],
    ) -> MonteCarlo {
        let stats = |v: &[f32], scale: f32| -> [f32; 3] {
            let mut s: Vec<f32> = v.to_vec();
            s.sort_by(f32::total_cmp);
            let at = |q: usize| s.get(q).copied().unwrap_or(0.0) * scale;
            [at(0), at(s.len() / 2), at(s.len().saturating_sub(1))]
        };
        MonteCarlo {
            driver: driver.to_string(),
            samples: n,
            seed,
            peak_switch_voltage: stats(peaks, 1.0),
            release_time_ms: if releases.is_empty() {
                None
            } else {
                Some(stats(releases, 1e3))
            },
        }
    }
}

/// The whole result.
#[derive(Debug, Clone, Serialize)]
pub struct Report {
    /// Design title.
    pub title: String,
    /// Design file.
    pub file: String,
    /// "PASS" when no check failed, else "FAIL".
    pub verdict: String,
    /// Timer tick rate of the constants.
    pub tick_hz: f32,
    /// All checks.
    pub checks: Vec<Check>,
    /// Run-time constants.
    pub constants: Vec<Constant>,
    /// Diagnosis window tables.
    pub windows: Vec<WindowTable>,
    /// Monte Carlo summaries, when asked for.
    pub monte_carlo: Vec<MonteCarlo>,
    /// The cautions.
    pub cautions: Vec<String>,
    /// Plot data (not in the JSON: written as SVG).
    #[serde(skip)]
    pub plots: Vec<DriverPlot>,
}

impl Report {
    /// An empty report.
    pub fn new(title: &str, file: &str) -> Report {
        Report {
            title: title.to_string(),
            file: file.to_string(),
            verdict: String::new(),
            tick_hz: 0.0,
            checks: Vec::new(),
            constants: Vec::new(),
            windows: Vec::new(),
            monte_carlo: Vec::new(),
            cautions: CAUTIONS.iter().map(|s| s.to_string()).collect(),
            plots: Vec::new(),
        }
    }

    /// Sets the verdict from the checks.
    pub fn finish(&mut self) {
        self.verdict = if self.failed() { "FAIL" } else { "PASS" }.to_string();
    }

    /// True when any check failed.
    pub fn failed(&self) -> bool {
        self.checks.iter().any(|c| c.status == Status::Fail)
    }

    /// The readable text report.
    pub fn text(&self) -> String {
        let mut s = String::new();
        let line = |s: &mut String, t: &str| {
            s.push_str(t);
            s.push('\n');
        };
        line(&mut s, &format!("kickguard report: {}", self.title));
        line(&mut s, &format!("design file: {}", self.file));
        line(&mut s, "");
        line(&mut s, "CAUTION");
        for c in &self.cautions {
            line(&mut s, &format!("  {c}"));
        }
        line(&mut s, "");
        let fails = self
            .checks
            .iter()
            .filter(|c| c.status == Status::Fail)
            .count();
        let warns = self
            .checks
            .iter()
            .filter(|c| c.status == Status::Warn)
            .count();
        line(
            &mut s,
            &format!(
                "VERDICT: {} ({fails} failed, {warns} warnings, {} checks)",
                self.verdict,
                self.checks.len()
            ),
        );
        // Subjects in order of first appearance, each with all its checks.
        let mut subjects: Vec<&str> = Vec::new();
        for c in &self.checks {
            if !subjects.contains(&c.subject.as_str()) {
                subjects.push(&c.subject);
            }
        }
        for subject in subjects {
            line(&mut s, "");
            line(&mut s, &format!("[{subject}]"));
            for c in self.checks.iter().filter(|c| c.subject == subject) {
                let tag = match c.status {
                    Status::Pass => "pass",
                    Status::Fail => "FAIL",
                    Status::Warn => "warn",
                    Status::Info => "info",
                };
                let mut t = format!("  {tag:<4}  {}: {}", c.name, c.value);
                if !c.limit.is_empty() {
                    t.push_str(&format!(" ({})", c.limit));
                }
                if let Some(m) = c.margin {
                    t.push_str(&format!(", margin {:+.0} %", m * 100.0));
                }
                line(&mut s, &t);
                if !c.corner.is_empty() {
                    line(&mut s, &format!("        worst corner: {}", c.corner));
                }
                if !c.note.is_empty() {
                    line(&mut s, &format!("        {}", c.note));
                }
            }
        }
        if !self.monte_carlo.is_empty() {
            line(&mut s, "");
            line(&mut s, "[Monte Carlo, uniform within tolerances]");
            for m in &self.monte_carlo {
                let p = m.peak_switch_voltage;
                line(&mut s, &format!("  {}: {} samples, seed {}: peak switch voltage {:.2} / {:.2} / {:.2} V (min/median/max)", m.driver, m.samples, m.seed, p[0], p[1], p[2]));
                if let Some(r) = m.release_time_ms {
                    line(
                        &mut s,
                        &format!(
                            "        release time {:.2} / {:.2} / {:.2} ms",
                            r[0], r[1], r[2]
                        ),
                    );
                }
            }
        }
        line(&mut s, "");
        line(
            &mut s,
            &format!("[constants for the firmware, ticks of {} Hz]", self.tick_hz),
        );
        for c in &self.constants {
            line(
                &mut s,
                &format!("  {}::{} = {}  ({})", c.scope, c.name, c.value, c.doc),
            );
        }
        for w in &self.windows {
            line(
                &mut s,
                &format!(
                    "  {}::{} (drain above {} V): {} windows [lo, hi, condition]",
                    super::analysis::ident(&w.scope),
                    w.name,
                    w.threshold_v,
                    w.entries.len()
                ),
            );
        }
        s
    }

    /// The JSON form.
    ///
    /// # Errors
    /// serde_json's error (not expected for this data).
    pub fn json(&self) -> Result<String, serde_json::Error> {
        serde_json::to_string_pretty(self)
    }
}

//! The readable report: cautions first, then per driver its corner box, each check with its
//! value, limit, margin, corner and note (and the Monte Carlo spread when run), the constants
//! and diagnosis tables, then the board's inputs and a summary.

use super::show::value;
use crate::host::checks::{Bound, Check, Corner, Status, Unit};
use crate::host::montecarlo::Distribution;
use crate::host::report::plot::View;
use crate::host::report::{DriverReport, Report, CAUTIONS, SCOPE};
use std::fmt::Write as _;
use std::format;
use std::string::String;

/// The status as the report shows it.
fn status(s: Status) -> &'static str {
    match s {
        Status::Pass => "PASS",
        Status::Fail => "FAIL",
        Status::Warn => "WARN",
        Status::Info => "info",
    }
}

/// The value and limit of a check, in one line.
fn figure(c: &Check) -> String {
    let v = match (&c.shown, c.value) {
        (Some(s), _) => s.clone(),
        (None, Some(x)) => value(x, c.unit),
        (None, None) => String::new(),
    };
    let Some(l) = &c.limit else { return v };
    let op = match l.bound {
        Bound::AtMost => "≤",
        Bound::AtLeast => "≥",
    };
    let margin = c
        .margin()
        .map_or(String::new(), |m| format!(", margin {:+.1} %", m * 100.0));
    format!(
        "{v} (limit {op} {}: {}{margin})",
        value(l.value, c.unit),
        l.source
    )
}

/// One check.
fn check(out: &mut String, c: &Check, samples: Option<u32>) {
    let _ = writeln!(out, "  {}  {}: {}", status(c.status), c.title, figure(c));
    match &c.corner {
        Corner::At(w, _) => {
            let _ = writeln!(out, "        worst corner: {w}");
        }
        Corner::Ties => {
            let _ = writeln!(out, "        every corner gives the same value");
        }
        Corner::Stated(w) => {
            let _ = writeln!(out, "        at: {w}");
        }
    }
    if !c.note.is_empty() {
        let _ = writeln!(out, "        {}", c.note);
    }
    if let (Some(s), Some(n)) = (c.spread, samples) {
        let beyond = if s.beyond == 0 {
            "none beyond the worst corner".into()
        } else {
            format!("{} samples BEYOND the worst corner", s.beyond)
        };
        let _ = writeln!(
            out,
            "        Monte Carlo, {n} samples: min {}, median {}, max {}; {beyond}",
            value(s.min, c.unit),
            value(s.median, c.unit),
            value(s.max, c.unit)
        );
    }
}

/// One driver.
fn driver(out: &mut String, d: &DriverReport, samples: Option<u32>) {
    let side = match d.side {
        crate::clamp::Side::Low => "low-side switch",
        crate::clamp::Side::High => "high-side switch",
    };
    let _ = writeln!(
        out,
        "\n== {} ({} × {side}, clamp {}; constants in `{}`) ==",
        d.name, d.count, d.kind, d.module
    );
    let _ = writeln!(out, "  corner box: {}", d.axes.join("; "));
    for c in &d.outcome.checks {
        check(out, c, samples);
    }
    options(out, d);
    for p in &d.plots {
        let at = match p.view {
            View::SwitchVoltage => "the worst switch-voltage corner",
            View::Release => "the worst release corner",
        };
        let _ = writeln!(
            out,
            "  plot: {}, at {at} ({})",
            super::svg::file_name(p),
            p.corner
        );
    }
}

/// The clamp options side by side: the numbers behind the plots.
fn options(out: &mut String, d: &DriverReport) {
    if d.options.is_empty() {
        return;
    }
    let at_release = d.plots.iter().any(|p| p.view == View::Release);
    let _ = writeln!(
        out,
        "  clamp options (peak, energies and power at the worst switch-voltage corner; release and 1 % at the {} corner):",
        if at_release { "worst release" } else { "same" }
    );
    let _ = writeln!(
        out,
        "    {:<34} {:>10} {:>10} {:>10} {:>11} {:>11} {:>10}",
        "option", "release", "to 1 %", "peak", "clamp E", "switch E", "power"
    );
    for o in &d.options {
        let dash = || String::from("—");
        let _ = writeln!(
            out,
            "    {:<34} {:>10} {:>10} {:>10} {:>11} {:>11} {:>10}",
            o.label,
            o.release.map_or_else(dash, |t| value(t, Unit::Second)),
            value(o.off_time, Unit::Second),
            value(o.peak_switch, Unit::Volt),
            value(o.clamp_energy, Unit::Joule),
            value(o.switch_energy, Unit::Joule),
            o.power.map_or_else(dash, |p| value(p, Unit::Watt)),
        );
    }
}

/// The report as text.
pub fn render(r: &Report) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "kickguard report: {}", r.title);
    let _ = writeln!(out, "design file: {}", r.file);
    for c in CAUTIONS {
        let _ = writeln!(out, "CAUTION: {c}");
    }
    for c in SCOPE {
        let _ = writeln!(out, "NOT CHECKED: {c}");
    }
    let samples = r.monte_carlo.map(|m| m.samples);
    if let Some(m) = r.monte_carlo {
        let how = match m.distribution {
            Distribution::Uniform => String::from("uniform inside each corner box"),
            Distribution::Normal { sigmas } => format!(
                "normal on every axis, each ± range read as {sigmas}σ about its middle, truncated to the corner box"
            ),
        };
        let _ = writeln!(
            out,
            "Monte Carlo: {} samples per driver, seed {}, {how}",
            m.samples, m.seed
        );
    }
    for d in &r.drivers {
        driver(&mut out, d, samples);
    }
    if !r.board.checks.is_empty() {
        let _ = writeln!(
            out,
            "\n== the board: inputs into the microcontroller and shared parts =="
        );
        for c in &r.board.checks {
            let _ = writeln!(out, "  [{}]", c.subject);
            check(&mut out, c, None);
        }
    }
    let _ = writeln!(
        out,
        "\n== constants (timer ticks at {} Hz) ==",
        value(r.tick_hz, crate::host::checks::Unit::Count)
    );
    for (module, (consts, tables)) in super::by_module(r) {
        for c in consts {
            let scope = if module.is_empty() {
                String::new()
            } else {
                format!("{module}::")
            };
            let _ = writeln!(out, "  {scope}{} = {}  ({})", c.name, c.value, c.doc);
        }
        for t in tables {
            let rows: std::vec::Vec<String> = t
                .rows
                .iter()
                .map(|w| format!("[{}, {}, {}]", w[0], w[1], w[2]))
                .collect();
            let _ = writeln!(
                out,
                "  {module}::{} ({}) = {}",
                t.name,
                t.measurement,
                rows.join(", ")
            );
        }
    }
    let _ = writeln!(
        out,
        "  diagnosis rows are [lowest tick, highest tick, condition]; conditions: {}",
        super::condition_codes()
    );
    summary(&mut out, r);
    out
}

/// The closing count.
fn summary(out: &mut String, r: &Report) {
    let count = |s: Status| r.checks().filter(|c| c.status == s).count();
    let _ = writeln!(
        out,
        "\nsummary: {} checks, {} passed, {} failed, {} warnings, {} figures",
        r.checks().count(),
        count(Status::Pass),
        count(Status::Fail),
        count(Status::Warn),
        count(Status::Info)
    );
    let verdict = if r.failed() {
        "the design is UNSAFE or does not work as described: see FAIL above"
    } else {
        "no check failed; read the warnings"
    };
    let _ = writeln!(out, "verdict: {verdict}");
}

//! The report for machines: numbers as numbers in SI units with a unit field, margins as
//! numbers, the same names as the report and the constants, and a schema version
//! ([`crate::host::report::SCHEMA_VERSION`]; the schema is `schema/report.schema.json`).

use crate::host::checks::{Bound, Check, Corner, Outcome, Status};
use crate::host::report::plot::{OptionRow, View};
use crate::host::report::{Report, CAUTIONS, SCHEMA_VERSION, SCOPE};
use serde_json::{json, Value};
use std::string::String;
use std::vec::Vec;

/// A number, or null when it is not finite (the analysis never produces one: a guard).
fn num(x: f32) -> Value {
    if x.is_finite() {
        // Through f32's shortest decimal form, so 0.76 stays 0.76 and not 0.7599999904632568.
        json!(std::format!("{x}").parse::<f64>().unwrap_or(x as f64))
    } else {
        Value::Null
    }
}

fn status(s: Status) -> &'static str {
    match s {
        Status::Pass => "pass",
        Status::Fail => "fail",
        Status::Warn => "warn",
        Status::Info => "info",
    }
}

fn check(c: &Check) -> Value {
    let unit = c.unit.symbol();
    let corner = match &c.corner {
        Corner::At(w, axes) => json!({
            "kind": "vertex",
            "text": w,
            "axes": axes.iter().map(|a| json!({"name": a.name, "value": num(a.value), "unit": a.unit})).collect::<Vec<_>>(),
        }),
        Corner::Ties => json!({"kind": "ties", "text": "every corner gives the same value"}),
        Corner::Stated(w) => json!({"kind": "stated", "text": w}),
    };
    json!({
        "subject": c.subject,
        "id": c.id,
        "title": c.title,
        "status": status(c.status),
        "value": c.value.map_or(Value::Null, |v| json!({"value": num(v), "unit": unit})),
        "shown": c.shown,
        "limit": c.limit.as_ref().map_or(Value::Null, |l| json!({
            "value": num(l.value),
            "unit": unit,
            "bound": match l.bound { Bound::AtMost => "at_most", Bound::AtLeast => "at_least" },
            "source": l.source,
        })),
        "margin": c.margin().map_or(Value::Null, num),
        "corner": corner,
        "note": c.note,
        "monte_carlo": c.spread.map_or(Value::Null, |s| json!({
            "min": num(s.min), "median": num(s.median), "max": num(s.max), "unit": unit, "beyond_worst": s.beyond,
        })),
    })
}

fn option(o: &OptionRow) -> Value {
    let q = |v: f32, u: &str| json!({"value": num(v), "unit": u});
    json!({
        "option": o.label,
        "topology": o.topology,
        "designed": o.choice == crate::host::report::plot::Choice::Designed,
        "release_time": o.release.map_or(Value::Null, |t| q(t, "s")),
        "time_to_1_percent": q(o.off_time, "s"),
        "peak_switch_voltage": q(o.peak_switch, "V"),
        "clamp_energy": q(o.clamp_energy, "J"),
        "switch_energy": q(o.switch_energy, "J"),
        "average_power": o.power.map_or(Value::Null, |p| q(p, "W")),
    })
}

fn outcome(o: &Outcome) -> (Value, Value, Value) {
    let checks: Vec<Value> = o.checks.iter().map(check).collect();
    let constants: Vec<Value> = o
        .constants
        .iter()
        .map(|c| json!({"module": c.scope, "name": c.name, "value": c.value, "doc": c.doc}))
        .collect();
    let windows: Vec<Value> = o.windows.iter().map(|w| json!({"module": w.scope, "name": w.name, "measurement": w.measurement, "rows": w.rows})).collect();
    (json!(checks), json!(constants), json!(windows))
}

/// The JSON document (pretty-printed).
///
/// # Errors
/// The serializer's error, as text.
pub fn render(r: &Report) -> Result<String, String> {
    let drivers: Vec<Value> = r
        .drivers
        .iter()
        .map(|d| {
            let (checks, constants, windows) = outcome(&d.outcome);
            json!({
                "name": d.name,
                "module": d.module,
                "count": d.count,
                "side": match d.side { crate::clamp::Side::Low => "low", crate::clamp::Side::High => "high" },
                "clamp": d.kind,
                "corner_box": d.axes,
                "axes": d.ranges.iter().map(|(n, lo, hi, u)| json!({"name": n, "low": num(*lo), "high": num(*hi), "unit": u})).collect::<Vec<_>>(),
                "options": d.options.iter().map(option).collect::<Vec<_>>(),
                "checks": checks,
                "constants": constants,
                "windows": windows,
                "plots": d.plots.iter().map(|p| json!({"file": crate::host::output::svg::file_name(p), "view": match p.view { View::SwitchVoltage => "switch_voltage", View::Release => "release" }, "corner": p.corner})).collect::<Vec<_>>(),
            })
        })
        .collect();
    let (checks, constants, _) = outcome(&r.board);
    let doc = json!({
        "schema_version": SCHEMA_VERSION,
        "title": r.title,
        "file": r.file,
        "cautions": CAUTIONS,
        "scope": SCOPE,
        "tick_rate": {"value": num(r.tick_hz), "unit": "Hz"},
        "monte_carlo": r.monte_carlo.map(|m| json!({
            "samples": m.samples,
            "seed": m.seed,
            "distribution": match m.distribution {
                crate::host::montecarlo::Distribution::Uniform => json!({"kind": "uniform"}),
                crate::host::montecarlo::Distribution::Normal { sigmas } => json!({"kind": "normal", "sigmas": sigmas}),
            },
        })),
        "failed": r.failed(),
        "drivers": drivers,
        "board": {"checks": checks, "constants": constants},
        "condition_codes": crate::diagnosis::Condition::ALL.iter().map(|c| json!({"code": c.code(), "condition": crate::host::checks::diagnosis::condition_words(*c)})).collect::<Vec<_>>(),
    });
    serde_json::to_string_pretty(&doc).map_err(|e| std::format!("{e}"))
}

//! The JSON report against its schema (`schema/report.schema.json`, JSON Schema draft
//! 2020-12), validated by an independent validator from crates.io (`boon`): the demo with and
//! without a Monte Carlo run, and every test design. A negative control shows the schema can
//! fail: a number written as a string, and an unknown field, are refused.

use kickguard::host::montecarlo::Request;
use kickguard::host::{analyse_text, output, Options};

fn schema() -> (boon::Schemas, boon::SchemaIndex) {
    let text = std::fs::read_to_string("schema/report.schema.json").unwrap();
    let doc: serde_json::Value = serde_json::from_str(&text).unwrap();
    let mut schemas = boon::Schemas::new();
    let mut compiler = boon::Compiler::new();
    compiler
        .add_resource("schema/report.schema.json", doc)
        .unwrap();
    let index = compiler
        .compile("schema/report.schema.json", &mut schemas)
        .unwrap();
    (schemas, index)
}

fn report_json(path: &str, mc: Option<Request>) -> serde_json::Value {
    let r = analyse_text(
        &std::fs::read_to_string(path).unwrap(),
        path,
        &Options { monte_carlo: mc },
    )
    .unwrap();
    serde_json::from_str(&output::json::render(&r).unwrap()).unwrap()
}

#[test]
fn every_report_matches_the_schema() {
    let (schemas, index) = schema();
    let designs = [
        "examples/greenhouse.toml",
        "tests/designs/door_lock.toml",
        "tests/designs/contactor.toml",
        "tests/designs/pump_station.toml",
    ];
    for path in designs {
        for mc in [
            None,
            Some(Request {
                samples: 20,
                seed: 3,
                distribution: kickguard::host::Distribution::Normal { sigmas: 3 },
            }),
        ] {
            let v = report_json(path, mc);
            if let Err(e) = schemas.validate(&v, index) {
                panic!("{path} ({mc:?}): {e:#}");
            }
        }
    }
}

#[test]
fn the_schema_refuses_what_it_must() {
    let (schemas, index) = schema();
    let good = report_json("examples/greenhouse.toml", None);
    assert!(schemas.validate(&good, index).is_ok());
    // A number as a string.
    let mut bad = good.clone();
    bad["drivers"][0]["checks"][0]["value"]["value"] = serde_json::json!("47.9");
    assert!(schemas.validate(&bad, index).is_err());
    // An unknown field.
    let mut bad = good.clone();
    bad["drivers"][0]["extra"] = serde_json::json!(1);
    assert!(schemas.validate(&bad, index).is_err());
    // A unit the report never writes.
    let mut bad = good;
    bad["tick_rate"]["unit"] = serde_json::json!("kHz");
    assert!(schemas.validate(&bad, index).is_err());
}

#[test]
fn numbers_are_numbers_in_si_units() {
    let v = report_json("examples/greenhouse.toml", None);
    let valve = &v["drivers"][0];
    let peak = valve["checks"]
        .as_array()
        .unwrap()
        .iter()
        .find(|c| c["id"] == "switch_voltage")
        .unwrap();
    assert_eq!(peak["value"]["unit"], "V");
    assert!(peak["value"]["value"].is_f64() && peak["margin"].is_f64());
    let release = valve["checks"]
        .as_array()
        .unwrap()
        .iter()
        .find(|c| c["id"] == "release_time")
        .unwrap();
    // Seconds, not milliseconds: the valve releases within its 25 ms.
    assert_eq!(release["value"]["unit"], "s");
    let t = release["value"]["value"].as_f64().unwrap();
    assert!(t > 0.001 && t < 0.025, "{t}");
}

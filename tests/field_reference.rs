//! The design-file reference (`docs/design-file.md`, generated from
//! `kickguard::host::file::fields`) against the parser itself: for every table of the file,
//! the fields the reference lists are exactly the fields the schema's structs accept, read from
//! serde's own description of each struct (a recording deserializer: serde hands every
//! `deserialize_struct` call the struct's complete field list). Neither can drift from the
//! other; the clamp kinds the reference names are the kinds the board accepts.
//!
//! After an intended change: `KICKGUARD_BLESS=1 cargo test --features host --test
//! field_reference` rewrites the document; review the diff.

use kickguard::host::file::{
    fields, ArmatureSpec, ClampSpec, CoilSpec, DesignFile, DiagnosisSpec, Driver,
};
use kickguard::host::file::{Environment, EventSpec, HoldSpec, Input, Pins, Supply, SwitchSpec};
use serde::de::{self, Deserialize, Visitor};

/// A deserializer that records the field list serde asks for, then stops.
struct Recorder<'a>(&'a mut Option<&'static [&'static str]>);

impl<'de> de::Deserializer<'de> for Recorder<'_> {
    type Error = de::value::Error;
    fn deserialize_any<V: Visitor<'de>>(self, _: V) -> Result<V::Value, Self::Error> {
        Err(de::Error::custom("not a struct"))
    }
    fn deserialize_struct<V: Visitor<'de>>(
        self,
        _: &'static str,
        fields: &'static [&'static str],
        _: V,
    ) -> Result<V::Value, Self::Error> {
        *self.0 = Some(fields);
        Err(de::Error::custom("recorded"))
    }
    serde::forward_to_deserialize_any! {
        bool i8 i16 i32 i64 i128 u8 u16 u32 u64 u128 f32 f64 char str string bytes byte_buf
        option unit unit_struct newtype_struct seq tuple tuple_struct map enum identifier
        ignored_any
    }
}

/// The fields serde accepts for `T`.
fn schema_fields<T: for<'de> Deserialize<'de>>() -> Vec<&'static str> {
    let mut got = None;
    let _ = T::deserialize(Recorder(&mut got));
    let mut v = got.expect("a struct").to_vec();
    v.sort_unstable();
    v
}

fn reference_fields(section: &str) -> Vec<&'static str> {
    let mut v: Vec<&'static str> = fields::of_section(section).map(|f| f.name).collect();
    v.sort_unstable();
    v
}

#[test]
fn the_reference_lists_exactly_what_the_parser_accepts() {
    let tables: [(&str, Vec<&str>); 13] = [
        ("", schema_fields::<DesignFile>()),
        ("environment", schema_fields::<Environment>()),
        ("supply", schema_fields::<Supply>()),
        ("supply.event", schema_fields::<EventSpec>()),
        ("driver", schema_fields::<Driver>()),
        ("driver.coil", schema_fields::<CoilSpec>()),
        ("driver.switch", schema_fields::<SwitchSpec>()),
        ("driver.clamp", schema_fields::<ClampSpec>()),
        ("driver.hold", schema_fields::<HoldSpec>()),
        ("driver.diagnosis", schema_fields::<DiagnosisSpec>()),
        ("driver.armature", schema_fields::<ArmatureSpec>()),
        ("pins", schema_fields::<Pins>()),
        ("input", schema_fields::<Input>()),
    ];
    let mut sections: Vec<&str> = fields::FIELDS.iter().map(|f| f.section).collect();
    sections.dedup();
    for (section, schema) in &tables {
        assert_eq!(&reference_fields(section), schema, "section [{section}]");
        assert!(sections.contains(section), "{section}");
    }
    assert_eq!(sections.len(), 13, "{sections:?}");
    // The per-kind rule reads every clamp field but `kind` from ClampSpec::present.
    let file = kickguard::host::file::parse_file(&kickguard::host::file::Reader::new(
        &std::fs::read_to_string("examples/greenhouse.toml").unwrap(),
        "greenhouse.toml",
    ))
    .unwrap();
    let mut present: Vec<&str> = file.driver[0].clamp.present().iter().map(|p| p.0).collect();
    present.push("kind");
    present.sort_unstable();
    assert_eq!(present, reference_fields("driver.clamp"));
}

#[test]
fn every_clamp_field_names_kinds_the_board_accepts_and_every_kind_is_accepted() {
    for f in fields::of_section("driver.clamp") {
        assert!(!f.kinds.is_empty(), "{}", f.name);
        for k in f.kinds {
            assert!(fields::CLAMP_KINDS.contains(k), "{}: {k}", f.name);
        }
    }
    // Each kind is a kind the board converts (an unknown one is refused by name).
    let demo = std::fs::read_to_string("examples/greenhouse.toml").unwrap();
    for kind in fields::CLAMP_KINDS {
        let t = demo.replacen("kind = \"diode\"", &format!("kind = \"{kind}\""), 1);
        let e = kickguard::host::analyse_text(&t, "k.toml", &kickguard::host::Options::default());
        if let Err(e) = e {
            assert!(!e.to_string().contains("unknown kind"), "{kind}: {e}");
        }
    }
    let t = demo.replacen("kind = \"diode\"", "kind = \"spark-gap\"", 1);
    let e = kickguard::host::analyse_text(&t, "k.toml", &kickguard::host::Options::default())
        .unwrap_err();
    assert!(e.to_string().contains("unknown kind"), "{e}");
}

#[test]
fn the_document_is_the_table() {
    let want = fields::markdown();
    let path = "docs/design-file.md";
    if std::env::var_os("KICKGUARD_BLESS").is_some() {
        std::fs::create_dir_all("docs").unwrap();
        std::fs::write(path, &want).unwrap();
    }
    let got = std::fs::read_to_string(path).expect("docs/design-file.md (bless it)");
    assert_eq!(got, want, "docs/design-file.md is stale: bless it");
}

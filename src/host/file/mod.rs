//! The design file as written: the TOML schema, quantities still strings with their units, and
//! the spans to locate every error. Nothing here computes physics; [`super::board`] converts it
//! once into a typed, validated board.
//!
//! `examples/greenhouse.toml` is the annotated reference. Every dimensional value is a string
//! with its unit ([`quantity`]); unknown fields are errors; a wrong type is reported at the field
//! that holds it (`driver[0].count: invalid type…`).

pub mod fields;
pub mod locate;
pub mod quantity;

pub use locate::{Places, Reader};

use super::HostError;
use serde::Deserialize;
use std::string::{String, ToString};
use std::vec::Vec;
use toml::Spanned;

/// A quantity as written, with its position.
pub type Q = Spanned<String>;

/// The whole design file.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DesignFile {
    /// Title for the report.
    pub title: String,
    /// Timer tick rate of the generated wait times and diagnosis windows.
    pub tick_rate: Q,
    /// Clock of the PWM timer (for the hold's counts); optional.
    pub pwm_timer_clock: Option<Q>,
    /// Temperatures.
    pub environment: Environment,
    /// Supplies, referred to by name.
    #[serde(default)]
    pub supply: Vec<Supply>,
    /// Coil drivers.
    #[serde(default)]
    pub driver: Vec<Driver>,
    /// The microcontroller pins' common data.
    pub pins: Option<Pins>,
    /// Inputs into the pins.
    #[serde(default)]
    pub input: Vec<Input>,
}

/// Temperatures of the enclosure and the coils' self-heating.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Environment {
    /// Coldest ambient.
    pub ambient_min: Q,
    /// Hottest ambient.
    pub ambient_max: Q,
    /// How far a coil's winding can rise above ambient when on.
    pub coil_self_heating: Q,
}

/// A supply rail.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Supply {
    /// Name the drivers use.
    pub name: Spanned<String>,
    /// Nominal voltage.
    pub nominal: Q,
    /// Lowest voltage.
    pub min: Q,
    /// Highest voltage.
    pub max: Q,
    /// A named profile of transient events ("iso16750-2-12v", …); optional.
    pub profile: Option<Spanned<String>>,
    /// Events of the design's own: a voltage held for a duration.
    #[serde(default)]
    pub event: Vec<EventSpec>,
    /// What protects against reversed polarity: "none" (default), "series-diode", "mosfet".
    pub reverse_protection: Option<Spanned<String>>,
    /// Wiring resistance from the supply to the drivers, for the reverse current; optional.
    pub wiring_resistance: Option<Q>,
    /// Whether the supply sinks current (a battery does; a regulator or a supply behind a
    /// series diode does not); default false.
    pub sinks_current: Option<Spanned<bool>>,
    /// The rail's bulk capacitance, which takes the energy a fast decay returns; optional.
    pub bulk_capacitance: Option<Q>,
    /// The least current the rail's loads draw while a decay returns energy; optional (0).
    pub rail_load: Option<Q>,
    /// The highest voltage the parts on the rail tolerate; optional.
    pub rail_limit: Option<Q>,
}

/// A transient event of a supply.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct EventSpec {
    /// Its name.
    pub name: Spanned<String>,
    /// The supply's voltage during it (negative: reversed).
    pub voltage: Q,
    /// How long it lasts.
    pub duration: Q,
}

/// A coil driver.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Driver {
    /// Name, also the name of its generated constants' module.
    pub name: Spanned<String>,
    /// How many identical drivers.
    #[serde(default = "one")]
    pub count: Spanned<u32>,
    /// Name of its supply.
    pub supply: Spanned<String>,
    /// "low" (default) or "high": where the switch sits.
    pub side: Option<Spanned<String>>,
    /// The coil.
    pub coil: CoilSpec,
    /// The switch.
    pub switch: SwitchSpec,
    /// The suppression.
    pub clamp: ClampSpec,
    /// Longest acceptable time from switch-off to release; optional requirement.
    pub max_release_time: Option<Q>,
    /// Switch-offs per second at most, for average power; optional.
    pub switching_rate: Option<Q>,
    /// PWM peak-and-hold, if used.
    pub hold: Option<HoldSpec>,
    /// Diagnosis, if wanted.
    pub diagnosis: Option<DiagnosisSpec>,
    /// The moving armature, for pull-in and its detection from the current, if given.
    pub armature: Option<ArmatureSpec>,
}

fn one() -> Spanned<u32> {
    Spanned::new(0..0, 1)
}

/// The coil's data.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CoilSpec {
    /// Inductance.
    pub inductance: Q,
    /// Inductance tolerance (± %).
    pub inductance_tolerance: Q,
    /// Winding resistance at `resistance_at`.
    pub resistance: Q,
    /// Resistance tolerance (± %).
    pub resistance_tolerance: Q,
    /// Temperature of the stated resistance (copper, IEC 60028), or "none" for a resistance
    /// that does not change with temperature.
    pub resistance_at: Q,
    /// The coil's rated voltage (the datasheet's nominal coil voltage, "12 V"); needed when
    /// `must_operate` or `must_release` is a percentage, which is of this voltage.
    pub rated_voltage: Option<Q>,
    /// Must-operate voltage at `resistance_at`: a share of `rated_voltage` ("60 %") or a
    /// voltage ("7.2 V"); optional.
    pub must_operate: Option<Q>,
    /// Must-release voltage, the same way; optional.
    pub must_release: Option<Q>,
    /// Mechanical release time; optional.
    pub mechanical_release: Option<Q>,
    /// The winding's highest allowed temperature (its insulation class); optional.
    pub max_temperature: Option<Q>,
}

/// The switch's ratings.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SwitchSpec {
    /// Voltage rating (for example V(BR)DSS min).
    pub rating: Q,
    /// Share of the rating the peak may reach.
    pub derating: Q,
    /// Voltage at which it avalanches (what an open clamp lets the switch reach).
    pub avalanche: Q,
    /// Part-to-part tolerance of the avalanche voltage (± %); optional.
    pub avalanche_tolerance: Option<Q>,
    /// Temperature coefficient of the avalanche voltage (%/K); optional.
    pub avalanche_tempco: Option<Q>,
    /// Single-pulse avalanche energy rating at a 25 °C start; optional.
    pub avalanche_energy: Option<Q>,
    /// Repetitive avalanche energy rating; optional.
    pub avalanche_energy_repetitive: Option<Q>,
    /// Junction-to-ambient thermal resistance; optional.
    pub thermal_resistance: Option<Q>,
    /// Lumped junction thermal capacitance (J/K), for counting avalanche pulses; optional.
    pub thermal_capacitance: Option<Q>,
    /// Maximum junction temperature (needed with an energy rating or a thermal resistance).
    pub junction_max: Option<Q>,
    /// On-resistance, for its conduction loss; optional.
    pub on_resistance: Option<Q>,
}

/// The suppression: its kind, its diode, and its breakdown part (the zener, TVS, varistor or
/// switch clamp, whichever the kind has).
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ClampSpec {
    /// One of: diode, resistor+diode, zener+diode, switched-freewheel, tvs-across-coil,
    /// varistor, tvs-across-switch, switch-clamp, avalanche, h-bridge, rc-snubber.
    pub kind: Spanned<String>,
    /// "silicon", "schottky", or a fixed drop such as "0.7 V" (the kinds with a diode).
    pub diode: Option<Q>,
    /// Part-to-part spread of the diode's drop (± mV); optional.
    pub diode_spread: Option<Q>,
    /// Diode junction-to-ambient thermal resistance, for its self-heating; optional.
    pub diode_thermal_resistance: Option<Q>,
    /// The breakdown part's voltage at its test current ("auto" sizes a zener).
    pub voltage: Option<Q>,
    /// With `voltage = "auto"`: the margin kept below the switch's derated rating.
    pub voltage_margin: Option<Q>,
    /// Its part-to-part tolerance (± %); optional.
    pub tolerance: Option<Q>,
    /// Its test current.
    pub test_current: Option<Q>,
    /// Its dynamic resistance.
    pub dynamic_resistance: Option<Q>,
    /// Its temperature coefficient (%/K); optional.
    pub tempco: Option<Q>,
    /// Its continuous power rating; optional.
    pub power_rating: Option<Q>,
    /// Its single-pulse energy rating; optional.
    pub energy_rating: Option<Q>,
    /// Its junction-to-ambient thermal resistance, for its self-heating; optional.
    pub thermal_resistance: Option<Q>,
    /// A varistor's nonlinearity exponent α (a number).
    pub exponent: Option<Q>,
    /// A switch clamp's transconductance K (A/V²), for its overdrive; optional.
    pub transconductance: Option<Q>,
    /// The switch's gate threshold (with `transconductance`).
    pub gate_threshold: Option<Q>,
    /// Series resistor (resistor+diode, rc-snubber) or the bypass switch's on-resistance
    /// (switched-freewheel).
    pub resistor: Option<Q>,
    /// Snubber capacitor (rc-snubber).
    pub capacitor: Option<Q>,
    /// The name of a group whose channels share this clamp's breakdown part (a common zener
    /// or TVS across every channel's coil, as driver arrays have); optional.
    pub shared: Option<Spanned<String>>,
}

impl ClampSpec {
    /// Every field but `kind`, by name, with whether the file gives it (the per-kind rule in
    /// [`fields`] reads this; `tests/field_reference.rs` holds the names to the schema).
    pub fn present(&self) -> [(&'static str, Option<std::ops::Range<usize>>); 18] {
        let q = |x: &Option<Q>| x.as_ref().map(|v| v.span());
        [
            ("diode", q(&self.diode)),
            ("diode_spread", q(&self.diode_spread)),
            (
                "diode_thermal_resistance",
                q(&self.diode_thermal_resistance),
            ),
            ("voltage", q(&self.voltage)),
            ("voltage_margin", q(&self.voltage_margin)),
            ("tolerance", q(&self.tolerance)),
            ("test_current", q(&self.test_current)),
            ("dynamic_resistance", q(&self.dynamic_resistance)),
            ("tempco", q(&self.tempco)),
            ("power_rating", q(&self.power_rating)),
            ("energy_rating", q(&self.energy_rating)),
            ("thermal_resistance", q(&self.thermal_resistance)),
            ("exponent", q(&self.exponent)),
            ("transconductance", q(&self.transconductance)),
            ("gate_threshold", q(&self.gate_threshold)),
            ("resistor", q(&self.resistor)),
            ("capacitor", q(&self.capacitor)),
            ("shared", self.shared.as_ref().map(|v| v.span())),
        ]
    }
}

/// The moving armature and the ADC that watches its pull-in.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ArmatureSpec {
    /// Moving mass.
    pub mass: Q,
    /// Stroke, open to seated.
    pub stroke: Q,
    /// Spring force at the open position.
    pub spring_preload: Q,
    /// Spring rate.
    pub spring_rate: Q,
    /// Constant load pushing open; optional (0 N).
    pub load: Option<Q>,
    /// Viscous damping; optional (0).
    pub damping: Option<Q>,
    /// Inductance with the armature open (the coil's inductance is the seated one); required
    /// without `inductance_table`.
    pub open_inductance: Option<Q>,
    /// The air-gap law's fringing length g₀; required without `inductance_table`.
    pub fringe: Option<Q>,
    /// L against the gap as measured, [gap, L] pairs from the seat (gap 0, the coil's
    /// inductance) to the stroke; instead of `open_inductance` and `fringe`.
    pub inductance_table: Option<std::vec::Vec<[Q; 2]>>,
    /// ± tolerance of mass, stroke, spring, load, damping and g₀; optional (0 %).
    pub tolerance: Option<Q>,
    /// ± tolerance of the open inductance; optional (the coil's inductance tolerance).
    pub open_inductance_tolerance: Option<Q>,
    /// The ADC's sample rate on the coil current.
    pub adc_rate: Q,
    /// ADC counts per ampere of coil current.
    pub adc_counts_per_amp: Q,
    /// The first saturated count.
    pub adc_full_scale: Q,
    /// Noise per sample, counts, peak, each side.
    pub adc_noise: Q,
}

/// PWM peak-and-hold.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct HoldSpec {
    /// Current to reach before holding.
    pub pull_in_current: Q,
    /// Mean current to hold.
    pub hold_current: Q,
    /// PWM frequency, or "auto" to meet `max_ripple`.
    pub frequency: Q,
    /// Largest peak-to-peak ripple (needed with "auto").
    pub max_ripple: Option<Q>,
}

/// Diagnosis from a timed measurement of the switch-off.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DiagnosisSpec {
    /// Comparator thresholds across the switch.
    #[serde(default)]
    pub comparator: Vec<Q>,
    /// Current-sense thresholds: pairs [upper, lower]; optional.
    #[serde(default)]
    pub current_sense: Vec<Vec<Q>>,
    /// Relative guard band added to every window.
    pub guard: Q,
    /// Timing jitter of the firmware's measurement, in ticks.
    pub jitter: Option<Q>,
    /// Share of turns shorted in the shorted-turns fault (L·(1 − f)², R·(1 − f)); or give
    /// the two factors below instead.
    pub shorted_turns: Option<Q>,
    /// What remains of the inductance in the shorted-turns fault ("64 %"), with
    /// `shorted_resistance`.
    pub shorted_inductance: Option<Q>,
    /// What remains of the resistance in the shorted-turns fault ("80 %"), with
    /// `shorted_inductance`.
    pub shorted_resistance: Option<Q>,
    /// How many fault readings in a row the firmware waits for.
    pub confirmations: Option<Spanned<u32>>,
    /// The comparator's reference voltage, for the proposed comparator's divider ratio.
    pub comparator_reference: Option<Q>,
    /// Relative tolerance of the comparator thresholds (divider and comparator); optional (0).
    pub comparator_tolerance: Option<Q>,
}

/// The microcontroller pins.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Pins {
    /// Nominal pin supply.
    pub supply: Q,
    /// Lowest pin supply.
    pub supply_min: Q,
    /// "silicon", "schottky", or a fixed drop such as "0.3 V".
    pub clamp: Q,
    /// Hottest microcontroller.
    pub max_temperature: Q,
    /// Injection limit per pin (both directions).
    pub injection_limit: Q,
    /// Injection limit summed over all pins.
    pub total_injection_limit: Q,
    /// The rail's minimum load current; optional (rail-on check).
    pub rail_min_load: Option<Q>,
    /// Pin leakage current; optional (with `leakage_error`).
    pub leakage: Option<Q>,
    /// Error voltage the leakage may cause across the resistor.
    pub leakage_error: Option<Q>,
    /// The unpowered rail's load as a resistance; optional (rail-off check).
    pub rail_off_load: Option<Q>,
    /// Voltage the unpowered rail may be pushed to.
    pub rail_off_allowed: Option<Q>,
}

/// An input line.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Input {
    /// Name, also its constants' module.
    pub name: Spanned<String>,
    /// How many identical inputs.
    #[serde(default = "one")]
    pub count: Spanned<u32>,
    /// The output-sense line of this driver (range derived from it, open-clamp case included).
    pub sense_of: Option<Spanned<String>>,
    /// Lowest steady signal.
    pub signal_min: Option<Q>,
    /// Highest steady signal.
    pub signal_max: Option<Q>,
    /// Lowest transient signal.
    pub transient_min: Option<Q>,
    /// Highest transient signal.
    pub transient_max: Option<Q>,
    /// Transient duration.
    pub transient_width: Option<Q>,
    /// Series resistor, or "auto".
    pub series_resistor: Q,
    /// Whether the signal can be present while the pins' supply is off (default true: a
    /// sensor powered from elsewhere); false for a signal that exists only while the
    /// controller's own supply is up, which the rail-off checks then leave out.
    pub present_when_unpowered: Option<Spanned<bool>>,
}

/// True when the quantity is written "auto".
pub fn is_auto(q: &Q) -> bool {
    q.get_ref().trim() == "auto"
}

/// Parses the file's text.
///
/// # Errors
/// A located error for malformed TOML, unknown fields, missing fields and wrong types, naming
/// the field that holds the mistake (never the mistaken value).
pub fn parse_file(reader: &Reader<'_>) -> Result<DesignFile, HostError> {
    toml::from_str(reader.text).map_err(|e| {
        let span = e.span().unwrap_or(0..0);
        let message = e.message().trim().to_string();
        // A wrong type or value points inside a field; an unknown or missing field is named in
        // the message between backticks and located at its table.
        let field = reader
            .field_at(span.start)
            .filter(|_| {
                !message.starts_with("unknown field") && !message.starts_with("missing field")
            })
            .or_else(|| {
                let named = message.split('`').nth(1)?;
                let table = reader
                    .field_at(span.start)
                    .map(|t| indexed(reader.text, &t, span.start));
                Some(match table {
                    // The span may be the unknown key itself, already recorded under its path.
                    Some(t) if t == named || t.ends_with(&std::format!(".{named}")) => t,
                    Some(t) => std::format!("{t}.{named}"),
                    None => named.to_string(),
                })
            })
            .unwrap_or_default();
        if message == "duplicate key" {
            let key = duplicate_key(reader.text, span.start);
            let field = match table_above(reader.text, span.start) {
                Some(t) => std::format!("{t}.{key}"),
                None => key.clone(),
            };
            return reader.error(
                span,
                &field,
                std::format!("duplicate key `{key}`: a key may appear once in its table"),
            );
        }
        reader.error(span, &field, own_words(&message, &field))
    })
}

/// The dotted path of the table whose header stands last before `pos` (`[driver.diagnosis]`
/// in the second `[[driver]]` is `driver[1].diagnosis`); None at the top level.
fn table_above(text: &str, pos: usize) -> Option<String> {
    let before = text.get(..pos).unwrap_or(text);
    let header = before
        .lines()
        .rev()
        .map(str::trim_start)
        .find(|l| l.starts_with('['))?;
    let name = header
        .trim_start_matches('[')
        .split(']')
        .next()
        .unwrap_or("")
        .trim();
    let (first, rest) = match name.split_once('.') {
        Some((a, b)) => (a, Some(b)),
        None => (name, None),
    };
    let first = indexed(text, first, pos);
    Some(match rest {
        Some(r) => std::format!("{first}.{r}"),
        None => first,
    })
}

/// The key written at `pos` (for the parser's "duplicate key", which names none): the text up
/// to the `=` or the end of the line, trimmed and unquoted.
fn duplicate_key(text: &str, pos: usize) -> String {
    let rest = text.get(pos..).unwrap_or("");
    let line = rest.lines().next().unwrap_or("");
    let key = line.split('=').next().unwrap_or("").trim();
    let key = key.trim_matches(|c| c == '"' || c == '\'' || c == '[' || c == ']');
    key.chars().take(64).collect()
}

/// An array-of-tables path the parser reports without its index (`driver`, at the header of
/// one of its tables) with the index of the table that holds `pos`: the count of its
/// `[[name]]` headers before it.
fn indexed(text: &str, table: &str, pos: usize) -> String {
    if !matches!(table, "driver" | "supply" | "input") {
        return table.to_string();
    }
    let header = std::format!("[[{table}]]");
    let before = text
        .get(..pos.saturating_add(header.len()).min(text.len()))
        .unwrap_or(text);
    let n = before
        .lines()
        .filter(|l| l.trim_start().starts_with(&header))
        .count();
    std::format!("{table}[{}]", n.saturating_sub(1))
}

/// The parser's message in the tool's own words where it has them: a bare number where a
/// quantity with a unit belongs.
fn own_words(message: &str, field: &str) -> String {
    let bare = ["invalid type: floating point `", "invalid type: integer `"]
        .iter()
        .find_map(|p| message.strip_prefix(p))
        .and_then(|rest| rest.split('`').next())
        .filter(|_| message.ends_with("expected a string"));
    let key = field.rsplit('.').next().unwrap_or(field);
    let takes = fields::FIELDS
        .iter()
        .find(|f| f.name == key)
        .map(|f| f.unit);
    let symbol = takes.and_then(|t| {
        [
            ("voltage", "V"),
            ("current", "A"),
            ("resistance", "Ω"),
            ("inductance", "H"),
            ("capacitance", "F"),
            ("time", "s"),
            ("frequency", "Hz"),
            ("percentage", "%"),
            ("temperature", "°C"),
            ("energy", "J"),
            ("power", "W"),
            ("ticks", "ticks"),
        ]
        .iter()
        .find(|(w, _)| t.starts_with(w))
        .map(|(_, sym)| *sym)
    });
    match (bare, takes, symbol) {
        (Some(v), Some(t), Some(sym)) => std::format!(
            "\"{v}\" has no unit; this field takes {t}: write it as a string with its unit, e.g. \"{v} {sym}\""
        ),
        (Some(v), _, _) => std::format!(
            "\"{v}\" has no unit: write the value as a string with its unit (docs/design-file.md lists what each field takes)"
        ),
        _ => message.to_string(),
    }
}

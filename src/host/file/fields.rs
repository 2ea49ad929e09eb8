//! Every field of the design file in one table: its section, unit, default, meaning and, for
//! the clamp section, the kinds that use it. The table is the design-file reference
//! (`docs/design-file.md` is generated from it) and the rule that refuses a clamp field the
//! chosen kind cannot use. `tests/field_reference.rs` holds it against the parser's own field
//! lists, so neither can drift from the other.

/// One field of the design file.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Field {
    /// The table it sits in ("" for the top level, "driver.clamp").
    pub section: &'static str,
    /// Its key.
    pub name: &'static str,
    /// What it takes ("voltage", "a number", "\"low\" or \"high\"").
    pub unit: &'static str,
    /// Its default when left out ("required" where it must be given).
    pub default: &'static str,
    /// What it means.
    pub meaning: &'static str,
    /// The clamp kinds that use it (clamp fields only; empty elsewhere).
    pub kinds: &'static [&'static str],
}

/// Every clamp kind the file accepts, in the order the reference lists them.
pub const CLAMP_KINDS: [&str; 11] = [
    "diode",
    "resistor+diode",
    "zener+diode",
    "switched-freewheel",
    "tvs-across-coil",
    "varistor",
    "tvs-across-switch",
    "switch-clamp",
    "avalanche",
    "h-bridge",
    "rc-snubber",
];

const WITH_DIODE: &[&str] = &[
    "diode",
    "resistor+diode",
    "zener+diode",
    "switched-freewheel",
    "h-bridge",
];
const WITH_BREAKDOWN: &[&str] = &[
    "zener+diode",
    "switched-freewheel",
    "tvs-across-coil",
    "varistor",
    "tvs-across-switch",
    "switch-clamp",
];
const RATED_BREAKDOWN: &[&str] = &[
    "zener+diode",
    "switched-freewheel",
    "tvs-across-coil",
    "varistor",
    "tvs-across-switch",
];
const SIZED_ZENER: &[&str] = &["zener+diode", "switched-freewheel"];

const fn f(
    section: &'static str,
    name: &'static str,
    unit: &'static str,
    default: &'static str,
    meaning: &'static str,
) -> Field {
    Field {
        section,
        name,
        unit,
        default,
        meaning,
        kinds: &[],
    }
}

const fn clamp(
    name: &'static str,
    unit: &'static str,
    default: &'static str,
    meaning: &'static str,
    kinds: &'static [&'static str],
) -> Field {
    Field {
        section: "driver.clamp",
        name,
        unit,
        default,
        meaning,
        kinds,
    }
}

const REQ: &str = "required";
const OPT: &str = "optional";

/// The whole design file, section by section.
pub const FIELDS: &[Field] = &[
    f("", "title", "text", REQ, "title of the report"),
    f("", "tick_rate", "frequency", REQ, "timer tick of every generated wait and diagnosis window"),
    f("", "pwm_timer_clock", "frequency", OPT, "clock of the PWM timer, for the hold's compare counts (needed with [driver.hold])"),
    f("", "environment", "table", REQ, "temperatures"),
    f("", "supply", "array of tables", "none", "supply rails, referred to by name"),
    f("", "driver", "array of tables", "none", "coil drivers"),
    f("", "pins", "table", "none", "the microcontroller pins (needed with [[input]])"),
    f("", "input", "array of tables", "none", "signals into the pins"),
    f("environment", "ambient_min", "temperature", REQ, "coldest ambient"),
    f("environment", "ambient_max", "temperature", REQ, "hottest ambient"),
    f("environment", "coil_self_heating", "temperature difference (K)", REQ, "how far a winding rises above the ambient when energised"),
    f("supply", "name", "text", REQ, "the name drivers use"),
    f("supply", "nominal", "voltage", REQ, "nominal voltage"),
    f("supply", "min", "voltage", REQ, "lowest steady voltage (transients are not checked)"),
    f("supply", "max", "voltage", REQ, "highest steady voltage"),
    f("supply", "profile", "iso16750-2-12v, iso16750-2-12v-clamped, iso16750-2-24v, iso16750-2-24v-clamped or iec61131-2-24v", OPT, "a named set of transient events, each from the standard that defines it (load dump, overvoltage, jump start, reversed voltage, the rated range)"),
    f("supply", "event", "array of tables", "none", "transient events of the design's own"),
    f("supply", "reverse_protection", "\"none\", \"series-diode\" or \"mosfet\"", "\"none\"", "what blocks a reversed supply"),
    f("supply", "wiring_resistance", "resistance", OPT, "wiring from the supply to the drivers, for the current of a reversed supply"),
    f("supply", "sinks_current", "true or false", "false", "whether the supply takes back the energy a fast decay returns (a battery does; a regulator or a supply behind a series diode does not)"),
    f("supply", "bulk_capacitance", "capacitance", OPT, "the rail's bulk capacitor, which takes the returned energy otherwise"),
    f("supply", "rail_load", "current", "0 A", "the least current the rail's loads draw meanwhile"),
    f("supply", "rail_limit", "voltage", OPT, "the highest voltage the parts on the rail tolerate"),
    f("supply.event", "name", "text", REQ, "the event's name"),
    f("supply.event", "voltage", "voltage", REQ, "the supply's voltage during it (negative: reversed polarity)"),
    f("supply.event", "duration", "time", REQ, "how long it lasts (10 s or more: the winding heats to its steady state)"),
    f("driver", "name", "text", REQ, "name; its identifier names the generated constants' module"),
    f("driver", "count", "integer 1 … 64", "1", "how many identical drivers"),
    f("driver", "supply", "text", REQ, "name of its supply"),
    f("driver", "side", "\"low\" or \"high\"", "\"low\"", "where the switch sits"),
    f("driver", "max_release_time", "time", OPT, "longest acceptable time from switch-off to open contacts (a requirement)"),
    f("driver", "switching_rate", "frequency", OPT, "switch-offs per second at most, for average powers and heating (without it the average-power checks are not judged)"),
    f("driver", "coil", "table", REQ, "the coil"),
    f("driver", "switch", "table", REQ, "the switch"),
    f("driver", "clamp", "table", REQ, "the suppression"),
    f("driver", "hold", "table", OPT, "PWM peak-and-hold"),
    f("driver", "diagnosis", "table", OPT, "switch-off timing diagnosis"),
    f("driver", "armature", "table", OPT, "the moving armature and the ADC on the coil current: pull-in at every corner, its detection"),
    f("driver.coil", "inductance", "inductance", REQ, "L"),
    f("driver.coil", "inductance_tolerance", "percentage (±)", REQ, "part-to-part tolerance of L"),
    f("driver.coil", "resistance", "resistance", REQ, "winding resistance at resistance_at"),
    f("driver.coil", "resistance_tolerance", "percentage (±)", REQ, "part-to-part tolerance of R"),
    f("driver.coil", "resistance_at", "temperature, or \"none\"", REQ, "reference temperature of resistance (copper, 0.00393 /K at 20 °C, IEC 60028); \"none\" for a resistance that does not change with temperature"),
    f("driver.coil", "rated_voltage", "voltage", OPT, "the datasheet's rated coil voltage; must_operate and must_release percentages are of it (required when either is a percentage)"),
    f("driver.coil", "must_operate", "voltage, or percentage of rated_voltage", OPT, "must-operate voltage, a per-unit guarantee at resistance_at"),
    f("driver.coil", "must_release", "voltage, or percentage of rated_voltage", OPT, "must-release voltage, a per-unit guarantee at resistance_at"),
    f("driver.coil", "mechanical_release", "time", "0 s", "mechanical part of the release time"),
    f("driver.coil", "max_temperature", "temperature", OPT, "the winding's highest allowed temperature (its insulation class), for long supply events"),
    f("driver.switch", "rating", "voltage", REQ, "voltage rating (for example V(BR)DSS minimum)"),
    f("driver.switch", "derating", "percentage", REQ, "share of the rating the peak may reach"),
    f("driver.switch", "avalanche", "voltage", REQ, "where the switch avalanches (what an open clamp lets it reach), at 1 A and 25 °C"),
    f("driver.switch", "avalanche_tolerance", "percentage (±)", "0 %", "part-to-part tolerance of the avalanche voltage"),
    f("driver.switch", "avalanche_tempco", "percentage per kelvin", "0 %/K", "temperature coefficient of the avalanche voltage"),
    f("driver.switch", "avalanche_energy", "energy", OPT, "single-pulse avalanche energy rating from a 25 °C junction (needed to judge an open clamp)"),
    f("driver.switch", "avalanche_energy_repetitive", "energy", OPT, "repetitive avalanche energy rating (needs avalanche_energy)"),
    f("driver.switch", "thermal_resistance", "thermal resistance (K/W)", OPT, "junction to ambient"),
    f("driver.switch", "thermal_capacitance", "thermal capacitance (J/K)", OPT, "lumped junction capacitance, for counting avalanche pulses"),
    f("driver.switch", "junction_max", "temperature", OPT, "maximum junction temperature (needed with an energy rating or a thermal resistance)"),
    f("driver.switch", "on_resistance", "resistance", OPT, "on-resistance; its conduction loss heats the switch"),
    clamp("kind", "one of the kinds below", REQ, "the suppression topology", &CLAMP_KINDS),
    clamp("diode", "\"silicon\", \"schottky\" or a fixed drop (\"0.7 V\")", "\"silicon\"", "the clamp diode", WITH_DIODE),
    clamp("diode_spread", "voltage (±)", "0 V", "part-to-part spread of the diode's drop at the law's nominal temperature (a spread of IS: it scales with absolute temperature); a fixed drop moves by it at every temperature", WITH_DIODE),
    clamp("diode_thermal_resistance", "thermal resistance (K/W)", OPT, "the diode's junction to ambient, for its self-heating", WITH_DIODE),
    clamp("voltage", "voltage, or \"auto\" (zener+diode, switched-freewheel)", REQ, "the breakdown part's voltage at its test current (zener, TVS, varistor, switch clamp)", WITH_BREAKDOWN),
    clamp("voltage_margin", "percentage", "10 %", "with voltage = \"auto\": the margin kept below the switch's derated rating at the worst corner", SIZED_ZENER),
    clamp("tolerance", "percentage (±)", "0 %", "part-to-part tolerance of the breakdown voltage", WITH_BREAKDOWN),
    clamp("test_current", "current", "1 mA", "the test current of voltage", WITH_BREAKDOWN),
    clamp("dynamic_resistance", "resistance", "0 Ω", "dynamic resistance above the test current", WITH_BREAKDOWN),
    clamp("tempco", "percentage per kelvin", "0 %/K", "temperature coefficient of the breakdown voltage", WITH_BREAKDOWN),
    clamp("power_rating", "power", OPT, "continuous power rating (judged with switching_rate or a hold)", RATED_BREAKDOWN),
    clamp("energy_rating", "energy", OPT, "single-pulse energy rating", RATED_BREAKDOWN),
    clamp("thermal_resistance", "thermal resistance (K/W)", OPT, "the breakdown part's junction to ambient, for its self-heating", RATED_BREAKDOWN),
    clamp("exponent", "a number 2 … 100", REQ, "a varistor's nonlinearity exponent α", &["varistor"]),
    clamp("transconductance", "A/V²", OPT, "a switch clamp's square-law transconductance K, for its overdrive", &["switch-clamp"]),
    clamp("gate_threshold", "voltage", OPT, "the switch's gate threshold (with transconductance)", &["switch-clamp"]),
    clamp("resistor", "resistance", REQ, "the series resistor (resistor+diode, rc-snubber) or the bypass switch's on-resistance (switched-freewheel)", &["resistor+diode", "switched-freewheel", "rc-snubber"]),
    clamp("capacitor", "capacitance", REQ, "the snubber's capacitor", &["rc-snubber"]),
    clamp("shared", "text", OPT, "a group name: every channel of every driver naming it shares this breakdown part (a common zener or TVS), checked for all of them switching off at once", &["zener+diode", "switched-freewheel", "tvs-across-coil"]),
    f("driver.hold", "pull_in_current", "current", REQ, "current to reach at full drive before holding"),
    f("driver.hold", "hold_current", "current", REQ, "mean current to hold"),
    f("driver.hold", "frequency", "frequency, or \"auto\"", REQ, "PWM frequency; \"auto\" meets max_ripple"),
    f("driver.hold", "max_ripple", "current", OPT, "largest peak-to-peak ripple (needed with \"auto\")"),
    f("driver.diagnosis", "comparator", "array of voltages", "[]", "comparator thresholds across the switch, timed from switch-off"),
    f("driver.diagnosis", "current_sense", "array of [upper, lower] currents", "[]", "current-sense windows, timed from the upper to the lower current"),
    f("driver.diagnosis", "guard", "percentage", REQ, "relative guard band on every window"),
    f("driver.diagnosis", "jitter", "ticks", "0 ticks", "timing jitter of the firmware's measurement"),
    f("driver.diagnosis", "shorted_turns", "percentage", "required, or the pair below", "share of turns shorted in the shorted-turns fault: R·(1 − f), L anywhere from L·(1 − f)² to L·(1 − f) (the two common models); or give shorted_inductance and shorted_resistance"),
    f("driver.diagnosis", "shorted_inductance", "percentage", OPT, "what remains of L in the shorted-turns fault (with shorted_resistance)"),
    f("driver.diagnosis", "shorted_resistance", "percentage", OPT, "what remains of R in the shorted-turns fault (with shorted_inductance)"),
    f("driver.diagnosis", "confirmations", "integer 1 … 100", "1", "fault readings in a row before the firmware acts"),
    f("driver.diagnosis", "comparator_reference", "voltage", OPT, "the comparator's reference: the proposed drain comparator's divider ratio is emitted for it"),
    f("driver.diagnosis", "comparator_tolerance", "percentage (±)", "0 %", "tolerance of each comparator threshold (divider and comparator): the windows cover it"),
    f("driver.armature", "mass", "mass", REQ, "the moving mass (\"12 g\")"),
    f("driver.armature", "stroke", "length", REQ, "the stroke from open to seated (\"1.5 mm\")"),
    f("driver.armature", "spring_preload", "force", REQ, "the return spring's force at the open position (\"0.3 N\")"),
    f("driver.armature", "spring_rate", "N/m", REQ, "the return spring's rate"),
    f("driver.armature", "load", "force", "0 N", "a constant force holding it open (pressure, gravity); negative if it helps close"),
    f("driver.armature", "damping", "N·s/m", "0 N·s/m", "viscous damping of the motion"),
    f("driver.armature", "open_inductance", "inductance", "required without inductance_table", "L with the armature open; the coil's inductance is the seated L"),
    f("driver.armature", "fringe", "length", "required without inductance_table", "g0 of the air-gap law L(x) = L∞ + (L_seat − L∞)·g0/(g0 + x)"),
    f("driver.armature", "inductance_table", "array of [length, inductance]", OPT, "L against the gap as measured, instead of open_inductance and fringe: 2 … 12 pairs from [\"0 mm\", the coil's inductance] to [the stroke, L open], L falling; a monotone cubic between them"),
    f("driver.armature", "tolerance", "percentage (±)", "0 %", "tolerance of mass, stroke, spring, load, damping and fringe: each its own axis"),
    f("driver.armature", "open_inductance_tolerance", "percentage (±)", "the coil's inductance_tolerance", "tolerance of the open inductance"),
    f("driver.armature", "adc_rate", "frequency", REQ, "the ADC's sample rate on the coil current"),
    f("driver.armature", "adc_counts_per_amp", "counts/A", REQ, "ADC counts per ampere of coil current (shunt, gain, reference)"),
    f("driver.armature", "adc_full_scale", "counts", REQ, "the first saturated count (\"4096 counts\" for 12 bits)"),
    f("driver.armature", "adc_noise", "counts", REQ, "noise per sample, peak, each side"),
    f("pins", "supply", "voltage", REQ, "nominal pin supply"),
    f("pins", "supply_min", "voltage", REQ, "lowest pin supply"),
    f("pins", "clamp", "\"silicon\", \"schottky\" or a fixed drop", REQ, "the pins' protection diodes"),
    f("pins", "max_temperature", "temperature", REQ, "hottest microcontroller"),
    f("pins", "injection_limit", "current", REQ, "injection limit per pin, either direction"),
    f("pins", "total_injection_limit", "current", REQ, "injection limit summed over every pin"),
    f("pins", "rail_min_load", "current", OPT, "the powered rail's minimum load (rail-on check)"),
    f("pins", "leakage", "current", OPT, "pin leakage (with leakage_error)"),
    f("pins", "leakage_error", "voltage", OPT, "error the leakage may cause across the series resistor"),
    f("pins", "rail_off_load", "resistance", OPT, "the unpowered rail's loads as one resistance (rail-off checks, with rail_off_allowed)"),
    f("pins", "rail_off_allowed", "voltage", OPT, "highest voltage the unpowered rail may be pushed to (a requirement)"),
    f("input", "name", "text", REQ, "name; its identifier names its constants' module"),
    f("input", "count", "integer 1 … 64", "1", "how many identical inputs"),
    f("input", "sense_of", "text", OPT, "a driver's name: the line senses that driver's output (its range comes from the driver, open clamp included); else give the signal fields"),
    f("input", "signal_min", "voltage", REQ, "lowest steady signal (without sense_of)"),
    f("input", "signal_max", "voltage", REQ, "highest steady signal (without sense_of)"),
    f("input", "transient_min", "voltage", REQ, "lowest transient signal (without sense_of)"),
    f("input", "transient_max", "voltage", REQ, "highest transient signal (without sense_of)"),
    f("input", "transient_width", "time", REQ, "transient duration (without sense_of)"),
    f("input", "series_resistor", "resistance, or \"auto\"", REQ, "the series resistor; \"auto\" sizes it (E24)"),
    f("input", "present_when_unpowered", "true or false", "true", "whether the signal can be present while the pins' supply is off (the rail-off checks count it only then)"),
];

/// The fields of `section`, in the table's order.
pub fn of_section(section: &str) -> impl Iterator<Item = &'static Field> + '_ {
    FIELDS.iter().filter(move |f| f.section == section)
}

/// The clamp kinds that use clamp field `name` (empty for an unknown field).
pub fn clamp_kinds_of(name: &str) -> &'static [&'static str] {
    of_section("driver.clamp")
        .find(|f| f.name == name)
        .map_or(&[], |f| f.kinds)
}

/// The reference as Markdown (`docs/design-file.md`).
pub fn markdown() -> std::string::String {
    use std::fmt::Write as _;
    let mut s = std::string::String::from(
        "# The design file: every field\n\nGenerated from `src/host/file/fields.rs` (`KICKGUARD_BLESS=1 cargo test --features host --test field_reference` rewrites it; the same test holds the table against the parser). `examples/greenhouse.toml` is an annotated example.\n\nEvery dimensional value is a string with its unit (`\"350 mH\"`, `\"4.7 kΩ\"`, `\"-10 °C\"`, `\"10 %\"`, `\"0.08 %/K\"`, `\"62 K/W\"`, `\"2 ticks\"`); a bare number is refused except where a number or an integer is asked for. Unknown fields are errors, and so is a clamp field the chosen kind does not use.\n",
    );
    let mut section = None;
    for fl in FIELDS {
        if section != Some(fl.section) {
            section = Some(fl.section);
            let title = match fl.section {
                "" => "top level",
                "supply" | "driver" | "input" | "supply.event" => "",
                s => s,
            };
            let heading = if title.is_empty() {
                std::format!("[[{}]]", fl.section)
            } else if fl.section.is_empty() {
                title.into()
            } else {
                std::format!("[{title}]")
            };
            let _ =
                write!(
                s,
                "\n## {heading}\n\n| field | takes | default | meaning |{}\n|---|---|---|---|{}\n",
                if fl.section == "driver.clamp" { " used by kinds |" } else { "" },
                if fl.section == "driver.clamp" { "---|" } else { "" }
            );
        }
        let _ = write!(
            s,
            "| `{}` | {} | {} | {} |",
            fl.name, fl.unit, fl.default, fl.meaning
        );
        if fl.section == "driver.clamp" {
            let _ = write!(s, " {} |", fl.kinds.join(", "));
        }
        s.push('\n');
    }
    s
}

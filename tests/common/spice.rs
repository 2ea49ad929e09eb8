//! An independent SPICE-class reference: the same switch-off circuits simulated by ngspice (a
//! general-purpose circuit simulator from Debian's packages; `.ci/run` installs it), with the
//! same SPICE level-1 diode parameters, its own transient integration and its own device code.
//!
//! Each scenario is a coil (L, R) carrying I₀ at switch-off into one of four clamps: a
//! freewheeling diode, resistor + diode, zener + diode, a TVS across the switch. ngspice's `.meas`
//! gives the times to 50, 10 and 1 % of I₀ (`WHEN`, linear interpolation between time points)
//! and, up to the 1 % time, the charge and every device's energy (`INTEG` of v·i). Tolerances:
//! reltol 1e-6, time step at most 1/2000 of the decay.
#![allow(dead_code)]

use std::process::Command;

/// The clamp of a scenario.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Topology {
    Freewheel,
    ResistorDiode,
    ZenerDiode,
    TvsAcrossSwitch,
}

/// A scenario: a coil, its supply and start current, the clamp and the circuit temperature.
#[derive(Debug, Clone, Copy)]
pub struct Scenario {
    pub name: &'static str,
    pub l: f64,
    pub r: f64,
    pub vs: f64,
    pub i0: f64,
    pub topology: Topology,
    pub temp_c: f64,
}

/// The silicon diode of every scenario (the crate's `DiodeParams::SILICON`, in SPICE's words).
pub const DIODE_MODEL: &str = ".model dsi D(IS=2e-9 N=1.8 RS=0.05 EG=1.11 XTI=3 TNOM=27)";
/// The zener of the zener + diode clamp: BV 18 V at 1 mA, NBV 2, RS 2 Ω.
pub const ZENER: (f64, f64, f64, f64) = (18.0, 1e-3, 2.0, 2.0);
/// The TVS across the switch: NBV 3, RS 0.5 Ω, IBV 1 mA, BV = supply + 16 V.
pub const TVS_NBV_RS: (f64, f64) = (3.0, 0.5);

/// The TVS's BV for a supply.
pub fn tvs_bv(vs: f64) -> f64 {
    vs + 16.0
}

/// 48 scenarios: three coils (invented for the tests) × four clamps × four temperatures.
pub fn scenarios() -> Vec<Scenario> {
    let coils = [
        ("valve", 0.35, 56.0, 24.0, 0.43),
        ("relay", 0.9, 160.0, 12.0, 0.075),
        ("latch", 0.015, 8.0, 12.0, 1.5),
    ];
    let mut out = Vec::new();
    for (name, l, r, vs, i0) in coils {
        for topology in [
            Topology::Freewheel,
            Topology::ResistorDiode,
            Topology::ZenerDiode,
            Topology::TvsAcrossSwitch,
        ] {
            for temp_c in [-40.0, 25.0, 85.0, 125.0] {
                out.push(Scenario {
                    name,
                    l,
                    r,
                    vs,
                    i0,
                    topology,
                    temp_c,
                });
            }
        }
    }
    out
}

/// What ngspice measured (seconds, coulombs, joules; `supply` for the TVS case only).
#[derive(Debug, Clone, Copy, Default)]
pub struct SpiceResult {
    pub t50: f64,
    pub t10: f64,
    pub t01: f64,
    pub charge: f64,
    pub e_coil: f64,
    pub e_resistor: f64,
    pub e_diode: f64,
    pub e_zener: f64,
    pub e_supply: f64,
    /// ngspice's own "Total analysis time", seconds.
    pub analysis_s: f64,
}

/// The netlist of a scenario. `t_stop` bounds the transient (just past the 1 % time); `v_sw`
/// seeds the switch node's initial voltage (any consistent guess works: the network has no
/// capacitors, so node voltages follow from the coil current at every step).
pub fn netlist(s: &Scenario, t_stop: f64, v_clamp: f64) -> String {
    let (bz, ibz, nz, rz) = ZENER;
    let (nt, rt) = TVS_NBV_RS;
    let i0 = s.i0;
    let step = t_stop / 2000.0;
    let mut c = format!(
        "* kickguard reference: {} {:?} at {} C\n{DIODE_MODEL}\n",
        s.name, s.topology, s.temp_c
    );
    let (body, meas) = match s.topology {
        Topology::Freewheel => (
            format!(
                "L1 0 n2 {} IC={i0}\nR1 n2 n3 {}\nD1 n3 0 dsi\n.ic v(n2)={} v(n3)={}\n",
                s.l,
                s.r,
                v_clamp + s.r * i0,
                v_clamp
            ),
            "let pc = (v(n2)-v(n3))*i(L1)\nlet pd = v(n3)*i(L1)\nmeas tran ec INTEG pc FROM=0 TO=$&t01\nmeas tran ed INTEG pd FROM=0 TO=$&t01\n",
        ),
        Topology::ResistorDiode => (
            format!(
                "L1 0 n2 {} IC={i0}\nR1 n2 n3 {}\nRX n3 n4 {}\nD1 n4 0 dsi\n.ic v(n2)={} v(n3)={} v(n4)={}\n",
                s.l,
                s.r,
                s.r,
                v_clamp + s.r * i0,
                v_clamp,
                v_clamp - s.r * i0
            ),
            "let pc = (v(n2)-v(n3))*i(L1)\nlet px = (v(n3)-v(n4))*i(L1)\nlet pd = v(n4)*i(L1)\nmeas tran ec INTEG pc FROM=0 TO=$&t01\nmeas tran ex INTEG px FROM=0 TO=$&t01\nmeas tran ed INTEG pd FROM=0 TO=$&t01\n",
        ),
        Topology::ZenerDiode => (
            format!(
                ".model dz D(IS=1e-14 N=1 BV={bz} IBV={ibz} NBV={nz} RS={rz} TNOM=27)\nL1 0 n2 {} IC={i0}\nR1 n2 n3 {}\nD1 n3 n4 dsi\nDZ 0 n4 dz\n.ic v(n2)={} v(n3)={} v(n4)={}\n",
                s.l,
                s.r,
                v_clamp + s.r * i0,
                v_clamp,
                v_clamp - 0.9
            ),
            "let pc = (v(n2)-v(n3))*i(L1)\nlet pd = (v(n3)-v(n4))*i(L1)\nlet pz = v(n4)*i(L1)\nmeas tran ec INTEG pc FROM=0 TO=$&t01\nmeas tran ed INTEG pd FROM=0 TO=$&t01\nmeas tran ez INTEG pz FROM=0 TO=$&t01\n",
        ),
        Topology::TvsAcrossSwitch => (
            format!(
                ".model dt D(IS=1e-14 N=1 BV={} IBV=1e-3 NBV={nt} RS={rt} TNOM=27)\nVS nvs 0 DC {}\nL1 nvs n2 {} IC={i0}\nR1 n2 nd {}\nDT 0 nd dt\n.ic v(n2)={} v(nd)={}\n",
                tvs_bv(s.vs),
                s.vs,
                s.l,
                s.r,
                v_clamp + s.r * i0,
                v_clamp
            ),
            "let pc = (v(n2)-v(nd))*i(L1)\nlet pz = v(nd)*i(L1)\nlet ps = v(nvs)*i(L1)\nmeas tran ec INTEG pc FROM=0 TO=$&t01\nmeas tran ez INTEG pz FROM=0 TO=$&t01\nmeas tran es INTEG ps FROM=0 TO=$&t01\n",
        ),
    };
    c.push_str(&body);
    c.push_str(&format!(
        ".options TEMP={} reltol=1e-6 abstol=1e-15 vntol=1e-9 method=gear\n.tran {step:e} {t_stop:e} 0 {step:e} UIC\n.control\nrun\nrusage everything\n",
        s.temp_c
    ));
    c.push_str(&format!(
        "meas tran t50 WHEN i(L1)={} FALL=1\nmeas tran t10 WHEN i(L1)={} FALL=1\nmeas tran t01 WHEN i(L1)={} FALL=1\nmeas tran q INTEG i(L1) FROM=0 TO=$&t01\n",
        0.5 * i0,
        0.1 * i0,
        0.01 * i0
    ));
    c.push_str(meas);
    c.push_str(".endc\n.end\n");
    c
}

/// True when ngspice can be run here.
pub fn available() -> bool {
    Command::new("ngspice")
        .arg("--version")
        .output()
        .map(|o| o.status.success())
        .unwrap_or(false)
}

/// Runs one scenario through ngspice and parses its measurements.
pub fn run(s: &Scenario, t_stop: f64, v_clamp: f64, scratch: &std::path::Path) -> SpiceResult {
    let path = scratch.join(format!(
        "{}_{:?}_{}.cir",
        s.name, s.topology, s.temp_c as i32
    ));
    std::fs::write(&path, netlist(s, t_stop, v_clamp)).expect("write netlist");
    let out = Command::new("ngspice")
        .arg("-b")
        .arg(&path)
        .output()
        .expect("run ngspice");
    let text =
        String::from_utf8_lossy(&out.stdout).to_string() + &String::from_utf8_lossy(&out.stderr);
    let value = |key: &str| -> f64 {
        text.lines()
            .find_map(|l| {
                let mut parts = l.split('=');
                let k = parts.next()?.trim();
                (k == key).then(|| parts.next()?.split_whitespace().next()?.parse().ok())?
            })
            .unwrap_or_else(|| panic!("ngspice gave no `{key}` for {s:?}:\n{text}"))
    };
    let analysis_s = text
        .lines()
        .find_map(|l| l.trim().strip_prefix("Total analysis time (seconds) = "))
        .and_then(|v| v.trim().parse().ok())
        .unwrap_or(f64::NAN);
    let opt = |key: &str| {
        if text.contains(&format!("\n{key} ")) {
            value(key)
        } else {
            0.0
        }
    };
    SpiceResult {
        t50: value("t50"),
        t10: value("t10"),
        t01: value("t01"),
        charge: value("q"),
        e_coil: value("ec"),
        e_resistor: opt("ex"),
        e_diode: opt("ed"),
        e_zener: opt("ez"),
        e_supply: opt("es"),
        analysis_s,
    }
}

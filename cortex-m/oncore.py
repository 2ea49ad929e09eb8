#!/usr/bin/env python3
"""On-core cost of kickguard's run-time functions: instructions executed and stack touched.

Loads the `cost_probe` ELF (cortex-m/src/bin/cost_probe.rs) for each target into the unicorn CPU
emulator (a general-purpose one, from PyPI) as the core it is built for (Cortex-M0 for
thumbv6m-none-eabi, Cortex-M4 with its FPU for thumbv7em-none-eabihf), then calls every
`probe_*` function from a fresh stack:

- instructions: a code hook counts every instruction executed from the call to its return;
- stack: the stack below the entry stack pointer is painted with a pattern before the call; the
  lowest word that no longer holds it after the return gives the bytes touched.

The empty probe's counts (the call, the return and the result handling every probe shares) are
subtracted. Both figures are exact for the inputs each probe states; the emulator is
deterministic, so the same ELF gives the same table every run.

usage: oncore.py ELF_M0 ELF_M4F [--budgets]   (exit 1 when a budget is exceeded)
"""

import os
import sys

from elftools.elf.elffile import ELFFile
from unicorn import Uc, UcError, UC_ARCH_ARM, UC_MODE_THUMB, UC_MODE_MCLASS, UC_HOOK_CODE
from unicorn import arm_const as A

FLASH, FLASH_SIZE = 0x0000_0000, 0x0008_0000
RAM, RAM_SIZE = 0x2000_0000, 0x0002_0000
EXIT = FLASH + FLASH_SIZE - 0x100  # a return address nothing is loaded at
STACK_TOP = RAM + RAM_SIZE
PAINT = 0x4000  # bytes of stack painted below the entry stack pointer
PATTERN = b"\xa5\x5a\xc3\x3c"
# Enough for any bounded run-time call; a probe that does not return within it is reported.
MAX_INSTRUCTIONS = 2_000_000

# name, probe (minuend), base probe (subtrahend; None = the empty probe)
ROWS = [
    ("verdict (Windows::classify), typical: healthy", "probe_verdict_typical", None),
    ("verdict, worst: outside all six windows", "probe_verdict_worst", None),
    ("compensated verdict (4 x 6 cells), typical", "probe_compensated_typical", None),
    ("compensated verdict, worst: last cell, no window", "probe_compensated_worst", None),
    ("resistance limit (hot coil from V/I)", "probe_resistance_limit", None),
    ("verdict history push + confirmed", "probe_history", None),
    ("diode forward drop at 10 mA", "probe_drop_typical", None),
    ("diode forward drop at 3 A", "probe_drop_worst", None),
    ("thermometer (junction T from drop), 1 mA at 0.6 V", "probe_thermometer_typical", None),
    ("thermometer, 10 uA at 0.25 V", "probe_thermometer_worst", None),
    ("coil R(T)", "probe_coil_resistance", None),
    ("winding temperature from R", "probe_winding_temperature", None),
    ("steady current", "probe_steady_current", None),
    ("ConstantClamp::new (closed-form decay set-up)", "probe_clamp_new", None),
    ("closed-form decay time to I0/10 (incl. set-up)", "probe_clamp_time_typical", None),
    ("closed-form decay time to zero (incl. set-up)", "probe_clamp_time_worst", None),
    ("closed-form clamp energy to zero (incl. set-up)", "probe_clamp_energy", None),
    ("thermal check", "probe_thermal_check", None),
    ("decay fit, 8 samples", "probe_fit_typical", None),
    ("decay fit, 64 samples", "probe_fit_worst", None),
    ("learner set-up (Learner::<16>::new)", "probe_learn_new", None),
    ("learner, typical: one reading while learning", "probe_learn_15", "probe_learn_14"),
    ("learner, worst: the reading that completes 16", "probe_learn_16", "probe_learn_15"),
    ("stored learned window check (from_bytes)", "probe_learned_from_bytes", None),
    ("unit learner set-up (UnitLearner::<8>::new, 4 x 6 table fingerprint)", "probe_unit_new", None),
    ("unit learner, one reading while learning", "probe_unit_7", "probe_unit_6"),
    ("unit learner, one judged reading (last cell)", "probe_unit_9", "probe_unit_8"),
    ("stored unit state check (resume, refused)", "probe_unit_resume", None),
    ("armature dip detector, one sample while rising", "probe_dip_21", "probe_dip_20"),
    ("armature dip detector, one sample of a DMA half-buffer (push_slice)", "probe_dip_slice_21", "probe_dip_slice_20"),
    ("armature dip detector, the sample that confirms motion", "probe_dip_61", "probe_dip_60"),
    ("fast::forward_drop (micromath) at 10 mA", "probe_fast_drop_typical", None),
    ("fast::forward_drop (micromath) at 3 A", "probe_fast_drop_worst", None),
    ("fast::constant_clamp_time (micromath) to I0/10", "probe_fast_clamp_time_typical", None),
    ("fast::constant_clamp_time (micromath) to zero", "probe_fast_clamp_time_worst", None),
]

# Budgets (instructions on the core, net; stack bytes): (target, row prefix, max instructions).
# Each a little above what was measured when it was set (README, "On the target").
INSTRUCTION_BUDGETS = [
    ("thumbv6m-none-eabi", "verdict, worst", 80),
    ("thumbv7em-none-eabihf", "verdict, worst", 70),
    ("thumbv6m-none-eabi", "compensated verdict, worst", 210),
    ("thumbv7em-none-eabihf", "compensated verdict, worst", 190),
    ("thumbv7em-none-eabihf", "closed-form decay time", 500),
    ("thumbv6m-none-eabi", "unit learner, one judged reading", 700),
    ("thumbv6m-none-eabi", "armature dip detector", 80),
    ("thumbv7em-none-eabihf", "armature dip detector", 60),
    ("thumbv7em-none-eabihf", "unit learner, one judged reading", 380),
    ("thumbv6m-none-eabi", "closed-form decay time", 7000),
    ("thumbv7em-none-eabihf", "diode forward drop", 600),
    ("thumbv6m-none-eabi", "diode forward drop", 14000),
]
STACK_BUDGET = 512


def load(path):
    """The ELF's loadable segments at their run addresses, and its symbol table."""
    with open(path, "rb") as f:
        elf = ELFFile(f)
        segs = [(s["p_vaddr"], s.data(), s["p_memsz"]) for s in elf.iter_segments() if s["p_type"] == "PT_LOAD"]
        syms = {s.name: s["st_value"] for s in elf.get_section_by_name(".symtab").iter_symbols() if s.name}
    return segs, syms


class Core:
    def __init__(self, path, m4f):
        self.segs, self.syms = load(path)
        self.m4f = m4f

    def fresh(self):
        uc = Uc(UC_ARCH_ARM, UC_MODE_THUMB | UC_MODE_MCLASS)
        uc.ctl_set_cpu_model(A.UC_CPU_ARM_CORTEX_M4 if self.m4f else A.UC_CPU_ARM_CORTEX_M0)
        uc.mem_map(FLASH, FLASH_SIZE)
        uc.mem_map(RAM, RAM_SIZE)
        for vaddr, data, memsz in self.segs:
            uc.mem_write(vaddr, data + bytes(memsz - len(data)))
        if self.m4f:
            # CPACR: full access to CP10/CP11, as the reset handler does on a hard-float target.
            uc.reg_write(A.UC_ARM_REG_C1_C0_2, uc.reg_read(A.UC_ARM_REG_C1_C0_2) | (0xF << 20))
            uc.reg_write(A.UC_ARM_REG_FPEXC, 0x40000000)
        return uc

    def run(self, name):
        """(instructions, stack bytes) of one call of probe `name`."""
        addr = self.syms[name] & ~1
        uc = self.fresh()
        uc.mem_write(STACK_TOP - PAINT, PATTERN * (PAINT // 4))
        uc.reg_write(A.UC_ARM_REG_SP, STACK_TOP)
        uc.reg_write(A.UC_ARM_REG_LR, EXIT | 1)
        count = [0]

        def hook(_uc, _addr, _size, _data):
            count[0] += 1

        uc.hook_add(UC_HOOK_CODE, hook)
        try:
            uc.emu_start(addr | 1, EXIT, count=MAX_INSTRUCTIONS)
        except UcError as e:
            pc = uc.reg_read(A.UC_ARM_REG_PC)
            raise SystemExit(f"{name}: emulation stopped at pc={pc:#x}: {e}")
        if uc.reg_read(A.UC_ARM_REG_PC) != EXIT:
            raise SystemExit(f"{name}: did not return within {MAX_INSTRUCTIONS} instructions")
        painted = uc.mem_read(STACK_TOP - PAINT, PAINT)
        low = next((k for k in range(0, PAINT, 4) if painted[k:k + 4] != PATTERN), PAINT)
        return count[0], PAINT - low


def table(cores):
    out = {}
    base = {t: c.run("probe_empty") for t, c in cores.items()}
    for label, probe, sub in ROWS:
        for t, c in cores.items():
            if probe not in c.syms:
                continue
            n, s = c.run(probe)
            bn, _ = c.run(sub) if sub else base[t]
            out[(label, t)] = (n - bn, s)
    return out


def main():
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    if len(args) != 2:
        raise SystemExit(__doc__)
    cores = {"thumbv6m-none-eabi": Core(args[0], False), "thumbv7em-none-eabihf": Core(args[1], True)}
    res = table(cores)
    print("on-core cost (unicorn emulator, release profile: opt-level z, LTO), net of the call itself")
    print(f"{'call':<58} {'M0 instr':>9} {'M0 stack':>9} {'M4F instr':>10} {'M4F stack':>10}")
    for label, _, _ in ROWS:
        m0 = res.get((label, "thumbv6m-none-eabi"))
        m4 = res.get((label, "thumbv7em-none-eabihf"))
        f = lambda x, k: "-" if x is None else str(x[k])
        print(f"{label:<58} {f(m0, 0):>9} {f(m0, 1):>8}B {f(m4, 0):>10} {f(m4, 1):>9}B")
    if "--budgets" not in sys.argv:
        return
    # Negative control: KICKGUARD_ONCORE_BUDGET_SCALE=0 scales every budget to 0, so it must fail.
    scale = float(os.environ.get("KICKGUARD_ONCORE_BUDGET_SCALE", "1"))
    over = []
    for (label, t), (n, s) in res.items():
        if s > STACK_BUDGET * scale:
            over.append(f"{label} on {t}: stack {s} B > {STACK_BUDGET} B")
    for t, prefix, limit in INSTRUCTION_BUDGETS:
        for (label, tt), (n, _) in res.items():
            if tt == t and label.startswith(prefix) and n > limit * scale:
                over.append(f"{label} on {t}: {n} instructions > {limit}")
    for o in over:
        print("OVER BUDGET:", o)
    print(f"ON-CORE BUDGETS: {'EXCEEDED' if over else 'OK'} (stack <= {STACK_BUDGET} B per call; instruction budgets in oncore.py)")
    sys.exit(1 if over else 0)


if __name__ == "__main__":
    main()

/* The diagnosis loop of the demo's irrigation valves, in C: switch the valve off, time the
 * flyback on the drain comparator, classify the reading against the window table the
 * configuration step generated, keep the history, and act once the open clamp is confirmed.
 *
 * Two headers: kickguard.h (the C ABI, capi/include) and kickguard_config.h (written by
 * `kickguard check examples/greenhouse.toml --out DIR`). The hardware is stubbed: a firmware
 * puts its gate driver, its timer capture and its fault handling where the stubs are.
 * Invented demo scenario; engineering estimates: verify on hardware. */
#include <stdio.h>

#include "kickguard.h"
#include "kickguard_config.h"

/* The valve's second measurement: the comparator above every healthy clamp voltage. */
static const kg_window_row WINDOWS[KICKGUARD_VALVE_DIAG_1_WINDOWS_ROWS] = KICKGUARD_VALVE_DIAG_1_WINDOWS;

/* Stub of the timer capture: ticks the comparator stayed high after switch-off number k. A
 * healthy valve never trips it (0); from the sixth switch-off on the clamp path is open and
 * the switch avalanches for about 3 ms (30 ticks at the demo's 10 kHz tick). */
static uint32_t flyback_ticks_stub(int k) {
    return k < 5 ? 0u : 30u;
}

int main(void) {
    kg_history history;
    history.len = 0;
    const kg_verdict open = {KG_VERDICT_FAULT, KG_CONDITION_CLAMP_OPEN, 0};
    for (int k = 0; k < 12; k++) {
        /* gate_off(); read the capture; wait KICKGUARD_VALVE_REENERGISE_WAIT_TICKS before the next switch-on: */
        uint32_t ticks = flyback_ticks_stub(k);
        kg_verdict v;
        kg_status s = kg_classify(WINDOWS, KICKGUARD_VALVE_DIAG_1_WINDOWS_ROWS, ticks, &v);
        if (s.code != 0) {
            printf("classify refused: code %d (%.*s)\n", (int)s.code, (int)s.input_len, (const char *)s.input);
            return 2;
        }
        kg_history_push(&history, &v);
        uint32_t run = 0;
        kg_history_consecutive(&history, &open, &run);
        printf("switch-off %d: %u ticks, verdict kind %u condition %u, open-clamp readings in a row %u\n",
               k, (unsigned)ticks, (unsigned)v.kind, (unsigned)v.condition, (unsigned)run);
        if (run >= KICKGUARD_VALVE_FAULT_CONFIRMATIONS) {
            /* Confirmed within what the switch survives (KICKGUARD_VALVE_OPEN_CLAMP_SURVIVABLE):
             * stop driving the valve and report the fault. */
            printf("clamp path open confirmed at switch-off %d: valve disabled\n", k);
            return 0;
        }
    }
    printf("no fault confirmed\n");
    return 1;
}

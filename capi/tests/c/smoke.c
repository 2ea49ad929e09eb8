/* Calls every exported function of the kickguard C ABI with good and hostile inputs and
 * prints one line per result: "name code value". tests/c_program.rs builds it against the
 * static library (with AddressSanitizer and UBSan on the host) and compares each line with the
 * Rust library's own result. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "kickguard.h"

static void st(const char *name, kg_status s, double v) {
    printf("%s %d %.9g %.*s\n", name, (int)s.code, v, (int)s.input_len,
           s.input ? (const char *)s.input : "-");
}

/* The call first, then its value: C leaves the order of argument evaluation unspecified. */
#define CALL(name, expr, val)                                                                  \
    do {                                                                                       \
        kg_status s_ = (expr);                                                                 \
        st((name), s_, (double)(val));                                                         \
    } while (0)

int main(void) {
    kg_diode d;
    float v = 0.0f;
    CALL("preset", kg_diode_preset(0, &d), d.is_a);
    CALL("drop", kg_diode_forward_drop(&d, 0.4f, 25.0f, &v), v);
    CALL("drop_nan", kg_diode_forward_drop(&d, NAN, 25.0f, &v), 0);
    CALL("drop_null_diode", kg_diode_forward_drop(NULL, 0.4f, 25.0f, &v), 0);
    CALL("drop_null_out", kg_diode_forward_drop(&d, 0.4f, 25.0f, NULL), 0);
    CALL("thermometer", kg_diode_junction_temperature(&d, 1e-3f, 0.6f, &v), v);
    CALL("thermometer_inf", kg_diode_junction_temperature(&d, 1e-3f, INFINITY, &v), 0);

    kg_coil c = {0.35f, 56.0f, 20.0f, 0.00393f, 1};
    CALL("resistance", kg_coil_resistance(&c, 85.0f, &v), v);
    CALL("winding", kg_coil_winding_temperature(&c, 64.8f, &v), v);
    CALL("current", kg_coil_steady_current(&c, 24.0f, 25.0f, &v), v);
    kg_coil bad = {-1.0f, 56.0f, 20.0f, 0.0f, 0};
    CALL("current_bad_l", kg_coil_steady_current(&bad, 24.0f, 25.0f, &v), 0);

    kg_clamp_decay dec;
    CALL("decay_time", kg_clamp_decay_to(0.35f, 56.0f, 42.0f, 0.43f, 0.0f, &dec), dec.time_s);
    CALL("decay_energy", kg_clamp_decay_to(0.35f, 56.0f, 42.0f, 0.43f, 0.0f, &dec), dec.clamp_j);
    CALL("decay_neg_inf", kg_clamp_decay_to(0.35f, 56.0f, -INFINITY, 0.43f, 0.0f, &dec), 0);

    kg_window_row rows[2] = {{40, 60, 0}, {10, 25, 1}};
    kg_verdict out;
    CALL("classify_healthy", kg_classify(rows, 2, 50, &out), out.kind);
    CALL("classify_open", kg_classify(rows, 2, 12, &out), out.condition);
    CALL("classify_none", kg_classify(rows, 2, 30, &out), out.kind);
    CALL("classify_null", kg_classify(NULL, 2, 30, &out), 0);
    CALL("classify_zero_len", kg_classify(rows, 0, 30, &out), 0);
    CALL("classify_long", kg_classify(rows, 1000, 30, &out), 0);

    kg_history h;
    memset(&h, 0, sizeof h);
    kg_verdict open = {KG_VERDICT_FAULT, KG_CONDITION_CLAMP_OPEN, 0};
    unsigned n = 0;
    for (int k = 0; k < 20; k++) {
        kg_history_push(&h, &open);
    }
    uint32_t run = 0;
    CALL("history", kg_history_consecutive(&h, &open, &run), run);
    kg_verdict junk = {9, 0, 0};
    CALL("history_bad_code", kg_history_push(&h, &junk), 0);
    CALL("history_null", kg_history_push(NULL, &open), 0);

    float samples[8];
    float x = 0.43f;
    for (n = 0; n < 8; n++) {
        samples[n] = x;
        x *= 0.984127f;
    }
    kg_fit f;
    CALL("fit", kg_fit_decay(samples, 8, 1e-4f, &f), f.tau_s);
    samples[3] = NAN;
    CALL("fit_nan", kg_fit_decay(samples, 8, 1e-4f, &f), 0);
    CALL("fit_zero_len", kg_fit_decay(samples, 0, 1e-4f, &f), 0);

    /* The armature detector: a rise to 1000, a dip to 880, the climb; in two half-buffers. */
    kg_dip_config dc = {0, 11, 11, 20, 12, 4096};
    kg_dip_state ds;
    memset(&ds, 0, sizeof ds);
    kg_motion mo;
    uint16_t first_half[3] = {0, 400, 800};
    uint16_t second_half[4] = {1000, 900, 880, 892};
    CALL("dip_pending", kg_dip_push(&dc, &ds, first_half, 3, 0, &mo), mo.kind);
    CALL("dip_moved", kg_dip_push(&dc, &ds, second_half, 4, 0, &mo), mo.dip);
    CALL("dip_at", kg_dip_push(&dc, &ds, second_half, 1, 0, &mo), mo.at);
    memset(&ds, 0, sizeof ds);
    CALL("dip_too_few", kg_dip_push(&dc, &ds, first_half, 3, 1, &mo), mo.why);
    kg_dip_config bad_pol = dc;
    bad_pol.polarity = 7;
    CALL("dip_bad_polarity", kg_dip_push(&bad_pol, &ds, first_half, 3, 0, &mo), 0);
    CALL("dip_null_state", kg_dip_push(&dc, NULL, first_half, 3, 0, &mo), 0);
    CALL("dip_zero_len", kg_dip_push(&dc, &ds, first_half, 0, 0, &mo), 0);
    return 0;
}

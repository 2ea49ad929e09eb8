/* The C ABI on the core itself: calls every exported function of kickguard.h with good and
 * hostile inputs and writes one result per call into `out` (a value for a good call, the status
 * code for a hostile one). Freestanding C99: no libc; src/bin/c_test.rs runs it under QEMU and
 * compares each result with the host's (computed by build.rs). Keep in step with EXPECTED_C in
 * build.rs, entry for entry. */
#include "kickguard.h"

#define PUT(x) (out[n++] = (float)(x))

int kg_c_selftest(float *out, int max) {
    int n = 0;
    if (max < 32) {
        return -1;
    }
    const float nan = __builtin_nanf("");
    const float inf = __builtin_inff();
    float v = 0.0f;
    kg_diode d;
    PUT(kg_diode_preset(0, &d).code);
    PUT(d.is_a);
    PUT(kg_diode_forward_drop(&d, 0.4f, 25.0f, &v).code);
    PUT(v);
    PUT(kg_diode_forward_drop(&d, nan, 25.0f, &v).code);
    PUT(kg_diode_forward_drop(0, 0.4f, 25.0f, &v).code);
    PUT(kg_diode_junction_temperature(&d, 1e-3f, 0.6f, &v).code);
    PUT(v);
    PUT(kg_diode_junction_temperature(&d, 1e-3f, inf, &v).code);

    kg_coil c;
    c.l_h = 0.35f;
    c.r_ohm = 56.0f;
    c.t_ref_c = 20.0f;
    c.alpha_per_k = 0.00393f;
    c.has_tempco = 1;
    PUT(kg_coil_resistance(&c, 85.0f, &v).code);
    PUT(v);
    PUT(kg_coil_winding_temperature(&c, 64.8f, &v).code);
    PUT(v);
    PUT(kg_coil_steady_current(&c, 24.0f, 25.0f, &v).code);
    PUT(v);

    kg_clamp_decay dec;
    PUT(kg_clamp_decay_to(0.35f, 56.0f, 42.0f, 0.43f, 0.0f, &dec).code);
    PUT(dec.time_s);
    PUT(dec.clamp_j);
    PUT(kg_clamp_decay_to(0.35f, 56.0f, -inf, 0.43f, 0.0f, &dec).code);

    kg_window_row rows[2];
    rows[0].lo = 40; rows[0].hi = 60; rows[0].code = 0;
    rows[1].lo = 10; rows[1].hi = 25; rows[1].code = 1;
    kg_verdict vd;
    PUT(kg_classify(rows, 2, 12, &vd).code);
    PUT(vd.kind * 10 + vd.condition);
    PUT(kg_classify(rows, 0, 12, &vd).code);

    kg_history h;
    h.len = 0;
    kg_verdict open;
    open.kind = 1; open.condition = 1; open.candidates = 0;
    for (int k = 0; k < 20; k++) {
        kg_history_push(&h, &open);
    }
    uint32_t run = 0;
    PUT(kg_history_consecutive(&h, &open, &run).code);
    PUT(run);

    float s[8];
    float x = 0.43f;
    for (int k = 0; k < 8; k++) {
        s[k] = x;
        x *= 0.984127f;
    }
    kg_fit f;
    PUT(kg_fit_decay(s, 8, 1e-4f, &f).code);
    PUT(f.tau_s);
    PUT(kg_fit_decay(0, 8, 1e-4f, &f).code);

    kg_dip_config dc = {0, 11, 11, 20, 12, 4096};
    kg_dip_state ds = {0, 0, 0, 0, 0, 0, 0};
    kg_motion mo;
    const uint16_t adc[7] = {0, 400, 800, 1000, 900, 880, 892};
    PUT(kg_dip_push(&dc, &ds, adc, 7, 0, &mo).code);
    PUT(mo.kind);
    PUT(mo.dip);
    PUT(kg_dip_push(&dc, 0, adc, 7, 0, &mo).code);
    return n;
}

/* A hostile sweep of the C ABI, run under AddressSanitizer and UndefinedBehaviorSanitizer:
 * every exported function called with inputs drawn from a fixed-seed generator (NaN, +/-inf,
 * signed zeros, subnormals, the quantities' bounds and beyond them, values of every decade,
 * raw bit patterns, null pointers, zero and oversized lengths, unknown codes). Every call must
 * return a known status; a success carries no input name and only finite results; a failure
 * names its input (a short printable string). Prints one summary line; exits 1 on a problem.
 * The number of calls per function is the first argument (default 2000). */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "kickguard.h"

static uint64_t state = 0x9E3779B97F4A7C15ull;
static unsigned long calls, refusals, problems;

static uint64_t next(void) {
    state ^= state >> 12;
    state ^= state << 25;
    state ^= state >> 27;
    return state * 0x2545F4914F6CDD1Dull;
}

static float hostile(void) {
    uint64_t r = next();
    float f;
    uint32_t bits;
    switch (r % 20u) {
    case 0: return NAN;
    case 1: return INFINITY;
    case 2: return -INFINITY;
    case 3: return 0.0f;
    case 4: return -0.0f;
    case 5: return 1e-40f;
    case 6: return 1e-30f;
    case 7: return 1e12f;
    case 8: return 2e12f;
    case 9: return 3.4e38f;
    case 10: return -1.0f;
    case 11:
        bits = (uint32_t)(r >> 32);
        memcpy(&f, &bits, sizeof f);
        return f;
    default: {
        /* A value of any decade from 1e-32 to 1e14, either sign (mostly positive). */
        double e = (double)((r >> 16) % 4600u) / 100.0 - 32.0;
        double v = pow(10.0, e);
        return (float)(((r >> 8) % 8u) == 0u ? -v : v);
    }
    }
}

/* A plausible value most of the time, a hostile one otherwise. */
static float around(float typical) {
    return (next() % 4u) == 0u ? hostile() : typical * (float)(0.5 + (double)(next() % 1000u) / 1000.0);
}

static int printable(const uint8_t *p, size_t n) {
    size_t i;
    if (p == NULL || n == 0u || n > 64u) return 0;
    for (i = 0; i < n; i++) {
        if (p[i] < 0x20u || p[i] == 0x7Fu) return 0;
    }
    return 1;
}

static void check(const char *fn, kg_status s, const float *out, size_t nout) {
    size_t i;
    int known = s.code == 0 || (s.code >= 1 && s.code <= 14) || (s.code >= 100 && s.code <= 102);
    calls++;
    if (!known) {
        problems++;
        fprintf(stderr, "%s: unknown status %d\n", fn, (int)s.code);
        return;
    }
    if (s.code == 0) {
        if (s.input != NULL || s.input_len != 0u) {
            problems++;
            fprintf(stderr, "%s: success with an input name\n", fn);
        }
        for (i = 0; i < nout; i++) {
            if (!isfinite(out[i])) {
                problems++;
                fprintf(stderr, "%s: success with a non-finite result %u\n", fn, (unsigned)i);
            }
        }
    } else {
        refusals++;
        if (!printable(s.input, s.input_len)) {
            problems++;
            fprintf(stderr, "%s: status %d without a readable input name\n", fn, (int)s.code);
        }
    }
}

static kg_diode diode(void) {
    kg_diode d;
    (void)kg_diode_preset((uint8_t)(next() % 2u), &d);
    if (next() % 2u) {
        d.is_a = around(d.is_a);
        d.n = around(d.n);
        d.rs_ohm = around(d.rs_ohm);
        d.eg_ev = around(d.eg_ev);
        d.xti = around(d.xti);
        d.tnom_c = around(d.tnom_c);
    }
    return d;
}

static kg_coil coil(void) {
    kg_coil c;
    c.l_h = around(0.35f);
    c.r_ohm = around(56.0f);
    c.t_ref_c = around(20.0f);
    c.alpha_per_k = around(0.00393f);
    c.has_tempco = (uint8_t)(next() % 3u);
    return c;
}

static kg_verdict verdict(void) {
    kg_verdict v;
    v.kind = (uint8_t)(next() % 6u);
    v.condition = (uint8_t)(next() % 8u);
    v.candidates = (uint8_t)next();
    return v;
}

/* A pointer argument: null one time in sixteen. */
#define MAYBE(p) ((next() % 16u) == 0u ? NULL : (p))

int main(int argc, char **argv) {
    unsigned long n = argc > 1 ? strtoul(argv[1], NULL, 10) : 2000ul;
    unsigned long k;
    for (k = 0; k < n; k++) {
        kg_status s;
        float out[6];
        kg_diode d = diode();
        kg_coil c = coil();
        kg_clamp_decay cd;
        kg_window_row rows[KG_MAX_WINDOWS + 2];
        kg_verdict v = verdict(), got;
        kg_history h;
        kg_fit fit;
        float samples[KG_FIT_MAX_SAMPLES + 4];
        size_t i, len;

        memset(out, 0, sizeof out);
        s = kg_diode_preset((uint8_t)next(), MAYBE((kg_diode *)(void *)out));
        check("kg_diode_preset", s, out, 6);
        s = kg_diode_forward_drop(MAYBE(&d), around(0.1f), around(25.0f), MAYBE(&out[0]));
        check("kg_diode_forward_drop", s, out, 1);
        s = kg_diode_junction_temperature(MAYBE(&d), around(1e-3f), around(0.6f), MAYBE(&out[0]));
        check("kg_diode_junction_temperature", s, out, 1);
        s = kg_coil_resistance(MAYBE(&c), around(40.0f), MAYBE(&out[0]));
        check("kg_coil_resistance", s, out, 1);
        s = kg_coil_winding_temperature(MAYBE(&c), around(60.0f), MAYBE(&out[0]));
        check("kg_coil_winding_temperature", s, out, 1);
        s = kg_coil_steady_current(MAYBE(&c), around(24.0f), around(40.0f), MAYBE(&out[0]));
        check("kg_coil_steady_current", s, out, 1);
        s = kg_clamp_decay_to(around(0.35f), around(56.0f), around(18.8f), around(0.43f),
                              (next() % 4u) == 0u ? 0.0f : around(0.043f), MAYBE(&cd));
        out[0] = cd.time_s; out[1] = cd.charge_c; out[2] = cd.clamp_j; out[3] = cd.resistive_j;
        check("kg_clamp_decay_to", s, out, s.code == 0 ? 4 : 0);

        for (i = 0; i < KG_MAX_WINDOWS + 2; i++) {
            rows[i].lo = (uint32_t)next();
            rows[i].hi = (next() % 2u) ? rows[i].lo + (uint32_t)(next() % 100u) : (uint32_t)next();
            rows[i].code = (uint32_t)(next() % 9u);
        }
        len = (size_t)(next() % (KG_MAX_WINDOWS + 2u));
        s = kg_classify(MAYBE(rows), len, (uint32_t)next(), MAYBE(&got));
        check("kg_classify", s, out, 0);
        if (s.code == 0 && got.kind > 3u) {
            problems++;
            fprintf(stderr, "kg_classify: verdict kind %u\n", (unsigned)got.kind);
        }

        memset(&h, 0, sizeof h);
        h.len = (uint8_t)(next() % 24u);
        for (i = 0; i < KG_HISTORY_LEN; i++) h.verdicts[i] = verdict();
        s = kg_history_push(MAYBE(&h), MAYBE(&v));
        check("kg_history_push", s, out, 0);
        {
            uint32_t run = 0;
            s = kg_history_consecutive(MAYBE(&h), MAYBE(&v), MAYBE(&run));
            check("kg_history_consecutive", s, out, 0);
            if (s.code == 0 && run > KG_HISTORY_LEN) {
                problems++;
                fprintf(stderr, "kg_history_consecutive: %u in a row\n", (unsigned)run);
            }
        }

        len = (size_t)(next() % (KG_FIT_MAX_SAMPLES + 4u));
        {
            float i0 = around(0.4f), tau = around(5e-3f), dt = around(1e-4f);
            for (i = 0; i < KG_FIT_MAX_SAMPLES + 4u; i++) {
                samples[i] = (next() % 8u) == 0u ? hostile()
                                                 : i0 * (float)exp(-(double)i * (double)dt / (double)tau);
            }
            s = kg_fit_decay(MAYBE(samples), len, dt, MAYBE(&fit));
            out[0] = fit.tau_s; out[1] = fit.clamp_over_r_a;
            check("kg_fit_decay", s, out, s.code == 0 ? 2 : 0);
        }
    }
    /* The armature detector: random thresholds, a random progress, random samples. */
    for (k = 0; k < n; k++) {
        kg_dip_config dc;
        kg_dip_state ds;
        kg_motion mo;
        uint16_t adc[64];
        kg_status s;
        float out[1] = {0.0f};
        size_t i, len;
        dc.polarity = (uint8_t)(next() % 3u);
        dc.rise = (uint16_t)next();
        dc.hysteresis = (uint16_t)(next() % 64u);
        dc.min_dip = (uint16_t)(next() % 128u);
        dc.window = (uint32_t)(next() % 200u);
        dc.full_scale = (uint16_t)next();
        ds.n = (uint32_t)next();
        ds.first = (uint16_t)next();
        ds.top = (uint16_t)next();
        ds.bottom = (uint16_t)next();
        ds.bottom_at = (uint32_t)next();
        ds.wiggles = (uint8_t)next();
        ds.falling = (uint8_t)next();
        for (i = 0; i < 64; i++) adc[i] = (uint16_t)next();
        len = (size_t)(next() % 66u);
        s = kg_dip_push(MAYBE(&dc), MAYBE(&ds), MAYBE(adc), len, (uint8_t)(next() % 2u), MAYBE(&mo));
        check("kg_dip_push", s, out, 0);
        if (s.code == 0 && (mo.kind > 3u || (mo.kind == 3u && (mo.why < 1u || mo.why > 5u)))) {
            problems++;
            fprintf(stderr, "kg_dip_push: motion %u why %u\n", (unsigned)mo.kind, (unsigned)mo.why);
        }
    }
    printf("sweep: %lu calls, %lu refusals, %lu problems\n", calls, refusals, problems);
    return problems == 0u ? 0 : 1;
}

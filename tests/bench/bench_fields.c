/*
 * Benchmark of the fields model (one core):
 *   - a Stark map of 200 fields x 10 levels (M = 0) for KRb, 0 - 150 kV/cm (d F / B up to
 *     39), and for a strongly polar molecule (d = 4.6 D, B/h = 1.74 GHz), 0 - 100 kV/cm
 *     (d F / B up to 530) (target <= 2 ms each);
 *   - one induced-dipole call, the cheap entry point for collision models (no target;
 *     reported for the callers that evaluate it at every step).
 * Each figure is the best of several repetitions, so that load from other processes
 * inflates it as little as possible.
 */
#include <stdio.h>
#include <time.h>

#include "coldprep/consts.h"
#include "coldprep/fields.h"

static double now(void)
{
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

static int bench_map(const char *name, cp_fields_rotor rotor, double fmax)
{
    enum { NF = 200, NL = 10, REPEAT = 50 };
    static double f[NF], e[NF * NL], d[NF * NL];
    for (int i = 0; i < NF; i++)
        f[i] = fmax * i / (NF - 1.0);
    double best = 1e9;
    int basis = 0;
    cp_error err;
    for (int r = 0; r < REPEAT; r++) {
        double t0 = now();
        if (cp_fields_stark_map(&rotor, 0, NL, f, NF, e, d, &basis, &err) != CP_OK) {
            fprintf(stderr, "bench_fields: %s\n", err.message);
            return 1;
        }
        double t = now() - t0;
        if (t < best)
            best = t;
    }
    printf("Stark map, %d fields x %d levels, %s to %.0f kV/cm (largest basis %d): %.3f ms "
           "(target <= 2 ms) %s\n",
           NF, NL, name, fmax / 1e5, basis, best * 1e3, best <= 2e-3 ? "ok" : "SLOW");
    return best <= 2e-3 ? 0 : 1;
}

static int bench_induced(void)
{
    enum { N = 2000 };
    cp_fields_rotor krb = {0.574 * CP_DEBYE, 1.1139e9};
    double best = 1e9, sum = 0, di;
    for (int r = 0; r < 5; r++) {
        double t0 = now();
        for (int i = 0; i < N; i++) {
            if (cp_fields_induced_dipole(krb.dipole, krb.rot_const_hz, 1e3 + 1e3 * i, &di,
                                         NULL) != CP_OK)
                return 1;
            sum += di;
        }
        double t = (now() - t0) / N;
        if (t < best)
            best = t;
    }
    printf("induced dipole of |0,0>, one call (KRb, 0.01 - 20 kV/cm): %.2f us (checksum %.3g)\n",
           best * 1e6, sum / CP_DEBYE);
    return 0;
}

int main(void)
{
    int status = bench_map("KRb", (cp_fields_rotor){0.574 * CP_DEBYE, 1.1139e9}, 1.5e7);
    status |= bench_map("d = 4.6 D, B/h = 1.74 GHz", (cp_fields_rotor){4.6 * CP_DEBYE, 1.74e9},
                        1e7);
    status |= bench_induced();
    return status;
}

/*
 * Benchmark of the rates of protected polar molecules (cp_collisions_protected: the field
 * physics and the radial integrations), one evaluation as a stage makes it at every step of
 * an evaporation (target <= 1 ms), for each regime: 40K87Rb in a dc field (3D and in
 * pancakes), microwave-shielded 23Na40K (fermions) and 23Na87Rb (bosons), 40K87Rb and
 * 23Na40K in |1,0> under dc-field shielding.  Each figure is
 * the process CPU time, best of several repetitions, so that load from the other processes
 * on a shared machine inflates it as little as possible.
 */
#include <math.h>
#include <stdio.h>
#include <time.h>

#include "coldprep/collisions.h"
#include "coldprep/consts.h"

static double now(void)
{
    struct timespec t;
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t); /* CPU time: less inflated by other load */
    return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

int main(void)
{
    enum { N = 50, REPEAT = 5 };
    const double two_pi = 2.0 * CP_PI;
    /* species constants as in core/species_data.c */
    const cp_protection_params cases[] = {
        {0.574 * CP_DEBYE, 1.1139e9, 16130.0, 126.873 * CP_AMU, CP_PAIR_FERMIONS, 300e-9, 5e5,
         0, 0, 0, 0, 0, 0},
        {0.574 * CP_DEBYE, 1.1139e9, 16130.0, 126.873 * CP_AMU, CP_PAIR_FERMIONS, 800e-9, 5e5,
         0, 0, 0, 0, two_pi * 23e3, 0},
        {2.72 * CP_DEBYE, 2.8217e9, 5.197e5, 62.96 * CP_AMU, CP_PAIR_FERMIONS, 300e-9, 0, 1,
         two_pi * 40e6, two_pi * 8e6, 0, 0, 0},
        {3.2 * CP_DEBYE, 2.0897e9, 1.328e6, 109.9 * CP_AMU, CP_PAIR_BOSONS, 300e-9, 0, 1,
         two_pi * 40e6, two_pi * 8e6, 0, 0, 0},
        {0.574 * CP_DEBYE, 1.1139e9, 16130.0, 126.873 * CP_AMU, CP_PAIR_FERMIONS, 300e-9,
         12.72e5, 0, 0, 0, 0, 0, 1},
        {2.72 * CP_DEBYE, 2.8217e9, 5.197e5, 62.96 * CP_AMU, CP_PAIR_FERMIONS, 300e-9,
         3.4 * CP_H * 2.8217e9 / (2.72 * CP_DEBYE), 0, 0, 0, 0, 0, 1},
    };
    const char *names[] = {"KRb, dc 5 kV/cm, 3D, 300 nK", "KRb, dc 5 kV/cm, pancakes 23 kHz",
                           "NaK fermions, microwave 40/8 MHz", "NaRb bosons, microwave 40/8 MHz",
                           "KRb |1,0>, dc shielding 12.72 kV/cm",
                           "NaK |1,0>, dc shielding d F / B = 3.4"};
    int status = 0;
    for (size_t c = 0; c < sizeof cases / sizeof cases[0]; c++) {
        double best = 1e9, sink = 0.0;
        for (int r = 0; r < REPEAT; r++) {
            double t0 = now();
            for (int i = 0; i < N; i++) {
                cp_protection_params p = cases[c];
                p.temperature *= 1.0 + 0.01 * i; /* a different temperature every call */
                cp_shielded_result res;
                cp_shield_regime regime;
                double dip;
                cp_error err;
                if (cp_collisions_protected(&p, &res, &dip, &regime, &err) != CP_OK) {
                    fprintf(stderr, "bench_collisions: %s\n", err.message);
                    return 1;
                }
                sink += res.loss_rate;
            }
            double dt = (now() - t0) / N;
            if (dt < best)
                best = dt;
        }
        printf("shielded rates, %-34s %.3f ms per evaluation (target <= 1 ms) %s   "
               "[checksum %.6g]\n", names[c], best * 1e3, best <= 1e-3 ? "ok" : "OVER", sink);
        if (best > 1e-3)
            status = 1;
    }
    return status;
}

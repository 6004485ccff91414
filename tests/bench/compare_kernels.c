/*
 * The C side of the comparisons with Python references (tests/bench/compare_*.py): times
 * one kernel alone, in this process, and prints the times and the full-precision results
 * for the Python script to compare with its own.
 *
 *   compare_kernels raman REPS   the Raman reference case (Gaussian pulses, Omega_p =
 *                                Omega_s = 2 pi x 5 MHz, width 2 us, delay 2.4 us, gamma =
 *                                2 pi x 6 MHz, Delta = delta = 0, 1 kHz linewidths) at the
 *                                default accuracy 1e-8, REPS transfers
 *   compare_kernels bands REPS   5 bands at 1000 quasimomenta q_i = -1 + 2i/999 (units of
 *                                k) at V0 = 10 E_r, automatic basis, REPS calls
 *
 * Output, one "key value..." per line: "times_us" and REPS wall-clock times of single calls
 * in microseconds (in call order), then the results ("window", "populations", "lost",
 * "steps" for raman; "basis" and one "q E_0 ... E_4" line per quasimomentum for bands),
 * numbers with 17 significant digits.  Exit status 1 with a message on an error.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "coldprep/lattice.h"
#include "coldprep/raman.h"
#include "raman_reference.h"

enum { MAX_REPS = 10000, NQ = 1000, NB = 5 };

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

static void print_times(const double *t, int reps)
{
    printf("times_us");
    for (int i = 0; i < reps; i++)
        printf(" %.3f", t[i] * 1e6);
    printf("\n");
}

static int raman(int reps, double *t)
{
    cp_raman_params p = raman_reference_case();
    cp_raman_result r;
    cp_error err;
    for (int i = 0; i < reps; i++) {
        double t0 = now();
        if (cp_raman_transfer(&p, 0, &r, NULL, &err) != CP_OK) {
            fprintf(stderr, "compare_kernels: %s\n", err.message);
            return 1;
        }
        t[i] = now() - t0;
    }
    print_times(t, reps);
    printf("window %.17g %.17g\n", r.t_start, r.t_end);
    printf("populations %.17g %.17g %.17g\n", r.populations[0], r.populations[1],
           r.populations[2]);
    printf("lost %.17g\n", r.lost);
    printf("steps %zu\n", r.steps);
    printf("integrator %s\n", r.integrator);
    return 0;
}

static int bands(int reps, double *t)
{
    static double q[NQ], e[NQ * NB];
    for (int i = 0; i < NQ; i++)
        q[i] = -1.0 + 2.0 * i / (NQ - 1);
    int basis = 0;
    cp_error err;
    for (int i = 0; i < reps; i++) {
        double t0 = now();
        if (cp_lattice_band_energies(10.0, NB, 0, NQ, q, e, &basis, &err) != CP_OK) {
            fprintf(stderr, "compare_kernels: %s\n", err.message);
            return 1;
        }
        t[i] = now() - t0;
    }
    print_times(t, reps);
    printf("basis %d\n", basis);
    for (int i = 0; i < NQ; i++) {
        printf("%.17g", q[i]);
        for (int n = 0; n < NB; n++)
            printf(" %.17g", e[i * NB + n]);
        printf("\n");
    }
    return 0;
}

int main(int argc, char **argv)
{
    int reps = argc == 3 ? atoi(argv[2]) : 0;
    if (reps < 1 || reps > MAX_REPS || (strcmp(argv[1], "raman") != 0 &&
                                        strcmp(argv[1], "bands") != 0)) {
        fprintf(stderr, "usage: compare_kernels raman|bands REPS (1 to %d)\n", MAX_REPS);
        return 2;
    }
    static double t[MAX_REPS];
    return strcmp(argv[1], "raman") == 0 ? raman(reps, t) : bands(reps, t);
}

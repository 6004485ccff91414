/*
 * Benchmark of the thermo model (one core):
 *   - the Fermi chemical-potential solve, per point: cp_thermo_fermi over 10^5
 *     temperatures from T/T_F = 0.01 to 10 (the full state: mu, E, S, n(0)), and the bare
 *     solve of F_2(mu/k_BT) = N (hbar w / k_B T)^3 (target <= 2 us per point);
 *   - entropy matching from a harmonic trap into a 3D lattice with a harmonic envelope,
 *     band structure from the lattice solver included: lowest band, 32 quasimomenta per
 *     half zone, 96 bins, fermions and bosons (target <= 50 ms).
 * Each figure is the best of several repetitions, so that load from other processes
 * inflates it as little as possible.
 */
#include <math.h>
#include <stdio.h>
#include <time.h>

#include "coldprep/consts.h"
#include "coldprep/thermo.h"
#include "thermo_int.h"

static double now(void)
{
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

static int bench_fermi(void)
{
    enum { N = 100000, REPEAT = 5 };
    cp_thermo_trap trap;
    cp_thermo_trap_isotropic(&trap, 2e4, 2.0 * CP_PI * 100.0, 127.0 * CP_AMU);
    double tf = CP_HBAR * 2.0 * CP_PI * 100.0 * cbrt(6.0 * 2e4) / CP_KB;
    double best_full = 1e9, best_solve = 1e9, sink = 0.0;
    cp_error err;
    for (int r = 0; r < REPEAT; r++) {
        double t0 = now();
        for (int i = 0; i < N; i++) {
            double x = 0.01 * pow(1000.0, (double)i / (N - 1));
            cp_thermo_fermi_result res;
            if (cp_thermo_fermi(&trap, x * tf, &res, &err) != CP_OK) {
                fprintf(stderr, "bench_thermo: %s\n", err.message);
                return 1;
            }
            sink += res.log_fugacity;
        }
        double t = (now() - t0) / N;
        if (t < best_full)
            best_full = t;
        t0 = now();
        for (int i = 0; i < N; i++) {
            double x = 0.01 * pow(1000.0, (double)i / (N - 1)), eta;
            if (cp_thermo_fermi_solve(1.0 / (6.0 * x * x * x), &eta, &err) != CP_OK) {
                fprintf(stderr, "bench_thermo: %s\n", err.message);
                return 1;
            }
            sink += eta;
        }
        t = (now() - t0) / N;
        if (t < best_solve)
            best_solve = t;
    }
    printf("Fermi chemical-potential solve: %.3f us per point (full state %.3f us) "
           "(target <= 2 us) %s   [checksum %.6g]\n",
           best_solve * 1e6, best_full * 1e6, best_solve <= 2e-6 ? "ok" : "SLOW", sink);
    return best_solve <= 2e-6 ? 0 : 1;
}

static int bench_match(void)
{
    enum { REPEAT = 10, BANDS = 1, POINTS = 32 };
    double m = 127.0 * CP_AMU, w = 2.0 * CP_PI * 60.0;
    cp_thermo_trap trap;
    cp_thermo_trap_isotropic(&trap, 2e4, w, m);
    double depth[3] = {20.0, 20.0, 20.0};
    static double tables[3 * BANDS * POINTS];
    int status = 0;
    for (int s = 0; s < 2; s++) {
        cp_statistics stat = s ? CP_FERMION : CP_BOSON;
        double best = 1e9;
        cp_thermo_lattice_result r;
        cp_error err;
        for (int k = 0; k < REPEAT; k++) {
            double t0 = now();
            cp_thermo_lattice lat;
            if (cp_thermo_lattice_bands(depth, 1064e-9, m, BANDS, POINTS, tables, &lat, &err) !=
                CP_OK) {
                fprintf(stderr, "bench_thermo: %s\n", err.message);
                return 1;
            }
            for (int a = 0; a < 3; a++)
                lat.omega_envelope[a] = w;
            lat.bins = 96;
            if (cp_thermo_match_lattice(&trap, stat, 60e-9, &lat, &r, &err) != CP_OK) {
                fprintf(stderr, "bench_thermo: %s\n", err.message);
                return 1;
            }
            double t = now() - t0;
            if (t < best)
                best = t;
        }
        printf("entropy matching into a 20 E_r lattice (%s, %d band, %d q, 96 bins): %.3f ms "
               "(target <= 50 ms) %s   [T = %.4g nK]\n",
               s ? "fermions" : "bosons", BANDS, POINTS, best * 1e3,
               best <= 50e-3 ? "ok" : "SLOW", r.temperature * 1e9);
        if (best > 50e-3)
            status = 1;
    }
    return status;
}

/* Entropy matching with the band count chosen automatically: a 20 E_r lattice (few bands)
 * and a 625 E_r lattice of NaRb-like molecules loaded from 548 nK (about 29 bands per axis,
 * k_B T near the on-site gap).  No target: the figures are reported. */
static int bench_match_auto(void)
{
    static const struct {
        double depth, mass, temperature, number, omega_trap, omega_env;
    } cases[2] = {{20.0, 127.0 * CP_AMU, 60e-9, 2e4, 2.0 * CP_PI * 60.0, 2.0 * CP_PI * 60.0},
                  {625.0, 110.0 * CP_AMU, 548e-9, 5.4e4, 2.0 * CP_PI * 100.0,
                   2.0 * CP_PI * 181.0}};
    for (int c = 0; c < 2; c++) {
        cp_thermo_trap trap;
        cp_thermo_trap_isotropic(&trap, cases[c].number, cases[c].omega_trap, cases[c].mass);
        double d = cases[c].depth, we = cases[c].omega_env;
        cp_thermo_lattice_spec spec = {{d, d, d}, 1064e-9, {we, we, we}, 32, 96};
        double best = 1e9;
        cp_thermo_lattice_result r;
        cp_error err;
        for (int k = 0; k < 3; k++) {
            double t0 = now();
            if (cp_thermo_match_lattice_auto(&trap, CP_BOSON, cases[c].temperature, &spec, &r,
                                             &err) != CP_OK) {
                fprintf(stderr, "bench_thermo: %s\n", err.message);
                return 1;
            }
            double t = now() - t0;
            if (t < best)
                best = t;
        }
        printf("entropy matching, automatic bands, %g E_r from %g nK (bosons): %d bands per "
               "axis, %.1f ms   [T = %.4g nK]\n",
               d, cases[c].temperature * 1e9, r.bands, best * 1e3, r.temperature * 1e9);
    }
    return 0;
}

int main(void)
{
    int status = bench_fermi();
    status |= bench_match();
    status |= bench_match_auto();
    return status;
}

/*
 * Benchmark of the Raman propagator (issue 4): median time per transfer for the reference
 * case (Gaussian, Omega_p = Omega_s = 2 pi x 5 MHz, width 2 us, delay 2.4 us, gamma =
 * 2 pi x 6 MHz, Delta = delta = 0, linewidths 1 kHz) and far off resonance (Delta = 2 pi x
 * 200 MHz) and in the middle range (Delta = 2 pi x 30-100 MHz), and a 1000-point two-photon detuning scan on 1 and 2 threads.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#include "coldprep/raman.h"

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return ts.tv_sec + 1e-9 * ts.tv_nsec;
}

static int cmp(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

static double median_us(const cp_raman_params *p, int reps)
{
    double t[201];
    cp_raman_result r;
    cp_error err;
    for (int i = 0; i < reps; i++) {
        double t0 = now();
        if (cp_raman_transfer(p, 0, &r, NULL, &err) != CP_OK) {
            fprintf(stderr, "%s\n", err.message);
            exit(1);
        }
        t[i] = (now() - t0) * 1e6;
    }
    qsort(t, (size_t)reps, sizeof t[0], cmp);
    return t[reps / 2];
}

int main(void)
{
    cp_raman_params p;
    cp_raman_params_init(&p);
    p.rabi_pump = p.rabi_stokes = 2 * M_PI * 5e6;
    p.width = 2e-6;
    p.delay = 2.4e-6;
    p.gamma = 2 * M_PI * 6e6;
    p.pump_linewidth_hz = p.stokes_linewidth_hz = 1e3;
    double ref = median_us(&p, 201);
    printf("reference case: median %.0f us per point (target <= 300 us)\n", ref);
    p.detuning = 2 * M_PI * 200e6;
    double far = median_us(&p, 21);
    printf("Delta = 2 pi x 200 MHz: median %.0f us per point (%.1fx the reference; target <= 3x)\n",
           far, far / ref);
    /* the middle range, |Delta| 3-10x the other rates (issue 4 follow-up) */
    const double mid_mhz[] = {30, 50, 82, 100};
    for (int i = 0; i < 4; i++) {
        p.detuning = 2 * M_PI * mid_mhz[i] * 1e6;
        double mid = median_us(&p, 21);
        printf("Delta = 2 pi x %.0f MHz: median %.0f us per point (%.1fx the reference)\n",
               mid_mhz[i], mid, mid / ref);
    }
    p.detuning = 0;
    enum { N = 1000 };
    static double d[N], eff[N];
    for (int i = 0; i < N; i++)
        d[i] = 2 * M_PI * (-500e3 + 1e3 * i);
    for (int threads = 1; threads <= 2; threads++) {
        cp_error err;
        double t0 = now();
        if (cp_raman_scan(&p, CP_RAMAN_SCAN_TWO_PHOTON, d, N, threads, eff, NULL, &err) != CP_OK) {
            fprintf(stderr, "%s\n", err.message);
            return 1;
        }
        printf("1000-point delta scan on %d thread(s): %.3f s\n", threads, now() - t0);
    }
    return 0;
}

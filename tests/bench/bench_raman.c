/*
 * Benchmark of the Raman propagator: median time per transfer for the reference case
 * (Gaussian, Omega_p = Omega_s = 2 pi x 5 MHz, width 2 us, delay 2.4 us, gamma = 2 pi x
 * 6 MHz, Delta = delta = 0, linewidths 1 kHz) at the default accuracy 1e-8, its error
 * against a tight integration, the same equation with GSL's rk8pd driver as the library used
 * before (absolute tolerance 1e-9, two exp() per evaluation) measured in the same run, the
 * one-photon detuning regimes against the reference case, and a 1000-point two-photon
 * detuning scan on 1 and 2 threads; the reference case's pulses as sampled shapes.  (The
 * comparison with scipy's DOP853 is tests/bench/compare_raman.py.)  Wall-clock figures on a
 * shared machine are noisy; the load average is printed with them.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>

#include "coldprep/raman.h"
#include "raman_reference.h"

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

/* ---- the baseline: the same master equation through GSL's rk8pd driver ---------------- */

/* Resonant reference case only (Delta = delta = 0, no branching or slow loss, independent
 * lasers): the generator of core/raman.c with those terms, Gaussian envelopes by exp(). */
static int base_rhs(double t, const double y[], double dy[], void *vp)
{
    const cp_raman_params *p = vp;
    double xp = (t - p->delay / 2) / p->width, xs = (t + p->delay / 2) / p->width;
    double a = p->rabi_pump * exp(-xp * xp) / 2, b = p->rabi_stokes * exp(-xs * xs) / 2;
    double k2 = p->gamma / 2, gp = 2 * M_PI * p->pump_linewidth_hz;
    double gs = 2 * M_PI * p->stokes_linewidth_hz;
    double g12 = k2 + gp / 2, g13 = (gp + gs) / 2, g23 = k2 + gs / 2;
    dy[0] = -2 * a * y[4];
    dy[1] = 2 * (a * y[4] - b * y[8]) - 2 * k2 * y[1];
    dy[2] = 2 * b * y[8];
    dy[3] = -b * y[6] - g12 * y[3];
    dy[4] = a * (y[0] - y[1]) + b * y[5] - g12 * y[4];
    dy[5] = a * y[8] - b * y[4] - g13 * y[5];
    dy[6] = b * y[3] - a * y[7] - g13 * y[6];
    dy[7] = a * y[6] - g23 * y[7];
    dy[8] = b * (y[1] - y[2]) - a * y[5] - g23 * y[8];
    dy[9] = 2 * k2 * y[1];
    return GSL_SUCCESS;
}

/* Propagate over [t0, t1] with rk8pd at absolute tolerance tol (steps <= width/2), returning
 * the target population. */
static double baseline(const cp_raman_params *p, double t0, double t1, double tol)
{
    gsl_odeiv2_system sys = {base_rhs, NULL, 10, (void *)p};
    gsl_odeiv2_driver *d = gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd,
                                                         p->width * 1e-2, tol, 0.0);
    gsl_odeiv2_driver_set_hmax(d, p->width / 2);
    double y[10] = {1.0}, t = t0;
    if (gsl_odeiv2_driver_apply(d, &t, t1, y) != GSL_SUCCESS) {
        fprintf(stderr, "baseline failed\n");
        exit(1);
    }
    gsl_odeiv2_driver_free(d);
    return y[2];
}

/* ---- timings ------------------------------------------------------------------------ */

static double median_us(const cp_raman_params *p, int reps, cp_raman_result *r)
{
    double t[201];
    cp_error err;
    for (int i = 0; i < reps; i++) {
        double t0 = now();
        if (cp_raman_transfer(p, 0, r, NULL, &err) != CP_OK) {
            fprintf(stderr, "%s\n", err.message);
            exit(1);
        }
        t[i] = (now() - t0) * 1e6;
    }
    qsort(t, (size_t)reps, sizeof t[0], cmp);
    return t[reps / 2];
}

static double median_baseline_us(const cp_raman_params *p, double t0, double t1, int reps)
{
    double t[201];
    for (int i = 0; i < reps; i++) {
        double s = now();
        baseline(p, t0, t1, 1e-9);
        t[i] = (now() - s) * 1e6;
    }
    qsort(t, (size_t)reps, sizeof t[0], cmp);
    return t[reps / 2];
}

static void print_load(void)
{
    double load[3];
    FILE *f = fopen("/proc/loadavg", "r");
    if (f && fscanf(f, "%lf %lf %lf", &load[0], &load[1], &load[2]) == 3)
        printf("load average %.2f %.2f %.2f\n", load[0], load[1], load[2]);
    if (f)
        fclose(f);
}

/* The reference case's Gaussians as sampled shapes (2001 and 20001 samples over the window),
 * on resonance and 2 pi x 100 MHz off it: every sample is a break point of the propagator. */
static void sampled_shapes(const cp_raman_params *ref)
{
    enum { MAX_N = 20001 };
    static double t[MAX_N], vp[MAX_N], vs[MAX_N];
    const int counts[] = {2001, MAX_N};
    for (int c = 0; c < 2; c++) {
        int n = counts[c];
        double t0 = -ref->delay / 2 - 5 * ref->width, t1 = ref->delay / 2 + 5 * ref->width;
        for (int i = 0; i < n; i++) {
            t[i] = t0 + (t1 - t0) * i / (n - 1);
            double xp = (t[i] - ref->delay / 2) / ref->width;
            double xs = (t[i] + ref->delay / 2) / ref->width;
            vp[i] = ref->rabi_pump * exp(-xp * xp);
            vs[i] = ref->rabi_stokes * exp(-xs * xs);
        }
        cp_raman_params q = *ref;
        q.shape = CP_RAMAN_SAMPLED;
        q.n_samples = (size_t)n;
        q.times = t;
        q.pump_samples = vp;
        q.stokes_samples = vs;
        for (int d = 0; d < 2; d++) {
            q.detuning = d ? 2 * M_PI * 100e6 : 0.0;
            cp_raman_result r;
            double us = median_us(&q, 11, &r);
            printf("sampled shape, %5d samples, Delta = 2 pi x %3.0f MHz: median %7.0f us per "
                   "point (%s, %zu steps)\n", n, q.detuning / (2 * M_PI * 1e6), us, r.integrator,
                   r.steps);
        }
    }
}

int main(void)
{
    gsl_set_error_handler_off();
    print_load();
    cp_raman_params p = raman_reference_case();
    cp_raman_result r;
    /* interleave the two so that both see the same load */
    double ours = 0, theirs = 0;
    for (int round = 0; round < 3; round++) {
        ours += median_us(&p, 201, &r) / 3;
        theirs += median_baseline_us(&p, r.t_start, r.t_end, 101) / 3;
    }
    double tight = baseline(&p, r.t_start, r.t_end, 1e-13);
    printf("reference case, accuracy 1e-8: median %.1f us per point, %zu steps, |P3 - tight "
           "rk8pd| = %.1e (targets <= 60 us, 1e-8)\n", ours, r.steps,
           fabs(r.efficiency - tight));
    printf("same equation with GSL's rk8pd at 1e-9 (before): median %.1f us per point (%.1fx)\n",
           theirs, theirs / ours);
    const double accs[] = {1e-6, 1e-10};
    for (int i = 0; i < 2; i++) {
        cp_raman_params q = p;
        q.accuracy = accs[i];
        double t = median_us(&q, 101, &r);
        printf("accuracy %.0e: median %.1f us, %zu steps, |P3 - tight rk8pd| = %.1e\n",
               accs[i], t, r.steps, fabs(r.efficiency - tight));
    }
    cp_raman_params q = p;
    q.estimates = 1;
    printf("with the closed-form estimates: median %.1f us per point\n", median_us(&q, 201, &r));
    /* the one-photon detuning regimes (target: none more than 3x the reference case) */
    const double mhz[] = {3, 6, 10, 12, 13.5, 14, 16, 20, 30, 50, 82, 100, -100, 150, 200, 500,
                          1000, -1000, 2000};
    const int n_mhz = (int)(sizeof mhz / sizeof mhz[0]);
    double worst = 0, worst_mhz = 0;
    for (int i = 0; i < n_mhz; i++) {
        p.detuning = 2 * M_PI * mhz[i] * 1e6;
        double t = median_us(&p, 21, &r);
        if (t / ours > worst) {
            worst = t / ours;
            worst_mhz = mhz[i];
        }
        printf("Delta = 2 pi x %6.1f MHz: median %6.0f us per point (%5.1fx the reference, %s, "
               "%zu steps)\n", mhz[i], t, t / ours, r.integrator, r.steps);
    }
    printf("worst one-photon detuning regime: %.1fx the reference case at 2 pi x %.0f MHz "
           "(target <= 3x)\n", worst, worst_mhz);
    p.detuning = 0;
    sampled_shapes(&p);
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
    print_load();
    return 0;
}

/*
 * Raman model: line shapes.  The points of a detuning scan are independent transfers, so
 * they are shared out to POSIX threads in interleaved order (neighbouring points cost
 * about the same); cp_raman_transfer is thread-safe and keeps its state on the stack.
 * A bounded scan first computes its first, middle and last points and estimates the whole
 * scan from the dearest of them (integrator steps x the cost of a step, measured on a
 * 2020s desktop core: docs/api/raman.md), so a scan of minutes is refused before it starts.
 */
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <string.h>

#include "check_int.h"
#include "coldprep/raman.h"

#define CTX "raman.lineshape" /* the Lua name (DEVELOPERS.md) */

/* CPU seconds per accepted step of the explicit (dopri5) and implicit (gauss-legendre) propagators
 * and per point besides, measured for 3-level transfers (docs/api/raman.md); a sampled shape
 * costs more per explicit step (its envelopes are interpolated, 2.3x the instructions) and
 * a set-up per sample (checks and interpolation, ~450 instructions); its implicit steps
 * cost about what analytic ones do (2001 samples at 2 pi x 100 MHz: 1.0 us a step) */
#define COST_STEP_EXPLICIT 1.5e-7
#define COST_STEP_EXPLICIT_SAMPLED 3.5e-7
#define COST_STEP_IMPLICIT 1.4e-6
#define COST_POINT 1.0e-5
#define COST_SAMPLE 1.0e-7

typedef struct job {
    const cp_raman_params *base;
    cp_raman_scan_variable variable;
    const double *values;
    double *efficiency, *lost;
    size_t n, first, stride;
    const size_t *done; /* points already computed (3 indices; n marks none) */
    const cp_cancel_flag *cancel;
    cp_status status;
    cp_error err;
} job;

/* Point i of the scan computed into the outputs; its result (for the step count) in *r. */
static cp_status transfer_point(job *jb, size_t i, cp_raman_result *r)
{
    cp_raman_params p = *jb->base;
    if (jb->variable == CP_RAMAN_SCAN_TWO_PHOTON)
        p.two_photon_detuning = jb->values[i];
    else
        p.detuning = jb->values[i];
    cp_status st = cp_raman_transfer(&p, 0, r, NULL, &jb->err);
    if (st != CP_OK)
        return st;
    jb->efficiency[i] = r->efficiency;
    if (jb->lost)
        jb->lost[i] = r->lost;
    return CP_OK;
}

static void *run_job(void *arg)
{
    job *jb = arg;
    jb->status = CP_OK;
    for (size_t i = jb->first; i < jb->n; i += jb->stride) {
        if (jb->done && (i == jb->done[0] || i == jb->done[1] || i == jb->done[2]))
            continue;
        if (jb->cancel && *jb->cancel) {
            jb->status = cp_fail(&jb->err, CP_ECANCELED, CTX ": interrupted after %zu of %zu "
                                 "points", i, jb->n);
            break;
        }
        cp_raman_result r;
        jb->status = transfer_point(jb, i, &r);
        if (jb->status != CP_OK)
            break;
    }
    return NULL;
}

cp_status cp_raman_scan(const cp_raman_params *p, cp_raman_scan_variable variable,
                        const double *values, size_t n, int nthreads, double *efficiency,
                        double *lost, cp_error *err)
{
    return cp_raman_scan_cancellable(p, variable, values, n, nthreads, efficiency, lost, NULL,
                                     err);
}

cp_status cp_raman_scan_cancellable(const cp_raman_params *p, cp_raman_scan_variable variable,
                                    const double *values, size_t n, int nthreads,
                                    double *efficiency, double *lost,
                                    const cp_cancel_flag *cancel, cp_error *err)
{
    return cp_raman_scan_bounded(p, variable, values, n, nthreads, efficiency, lost, cancel,
                                 INFINITY, err);
}

/* The points first, middle and last (repeats in a short scan marked n) computed into the
 * outputs, and the estimated CPU time of the whole scan. */
static cp_status estimate(job *proto, size_t done[3], double *seconds)
{
    size_t n = proto->n;
    size_t pick[3] = {0, n / 2, n - 1};
    double worst = 0.0;
    for (int k = 0; k < 3; k++) {
        done[k] = (k > 0 && (pick[k] == pick[0] || pick[k] == pick[k - 1])) ? n : pick[k];
        if (done[k] == n)
            continue;
        cp_raman_result r;
        CP_TRY(transfer_point(proto, done[k], &r));
        int sampled = proto->base->shape == CP_RAMAN_SAMPLED;
        double per_step = strcmp(r.integrator, "dopri5") != 0 ? COST_STEP_IMPLICIT
                          : sampled                          ? COST_STEP_EXPLICIT_SAMPLED
                                                             : COST_STEP_EXPLICIT;
        double setup = sampled ? COST_SAMPLE * (double)proto->base->n_samples : 0.0;
        worst = fmax(worst, COST_POINT + setup + (double)r.steps * per_step);
    }
    *seconds = worst * (double)n;
    return CP_OK;
}

/* A failed scan: every output NaN (the points done before the failure too), the job's
 * error copied to the caller's; returns st. */
static cp_status fail_scan(cp_status st, const cp_error *job_err, double *efficiency,
                           double *lost, size_t n, cp_error *err)
{
    cp_poison(efficiency, (int)n);
    if (lost)
        cp_poison(lost, (int)n);
    if (err)
        *err = *job_err;
    return st;
}

cp_status cp_raman_scan_bounded(const cp_raman_params *p, cp_raman_scan_variable variable,
                                const double *values, size_t n, int nthreads, double *efficiency,
                                double *lost, const cp_cancel_flag *cancel, double max_seconds,
                                cp_error *err)
{
    enum { MAX_THREADS = 64 };
    cp_init();
    if (!p || !values || !efficiency)
        return cp_fail(err, CP_EINVAL, CTX ": parameters, values and efficiency must not be "
                                            "NULL");
    if (n < 1 || n > 100000000)
        return cp_fail(err, CP_EINVAL, CTX ": points %zu is out of range; allowed [1, "
                       "100000000]", n);
    cp_poison(efficiency, (int)n);
    if (lost)
        cp_poison(lost, (int)n);
    if (variable != CP_RAMAN_SCAN_TWO_PHOTON && variable != CP_RAMAN_SCAN_ONE_PHOTON)
        return cp_fail(err, CP_EINVAL, CTX ": scan variable %d is unknown; allowed 0 (delta) "
                       "or 1 (Delta)", (int)variable);
    CP_TRY(cp_check_int_range(err, CTX, "threads", nthreads, 1, MAX_THREADS));
    CP_TRY(cp_check_work_limit(err, CTX, max_seconds));
    if ((size_t)nthreads > n)
        nthreads = (int)n;

    size_t done[3] = {n, n, n};
    const size_t *skip = NULL;
    if (!isinf(max_seconds)) {
        job proto = {p, variable, values, efficiency, lost, n, 0, 1, NULL, cancel, CP_OK, {0}};
        double seconds = 0.0;
        cp_status st = estimate(&proto, done, &seconds);
        if (st == CP_OK) {
            char what[96], reduce[96];
            double per_point = seconds / (double)n;
            snprintf(what, sizeof what, "%zu points of about %.2g ms each", n, 1e3 * per_point);
            snprintf(reduce, sizeof reduce, "scan at most %.0f points (or shorter pulses)",
                     floor(max_seconds / per_point));
            st = cp_check_work(&proto.err, CTX, seconds, max_seconds, what, reduce);
        }
        if (st != CP_OK)
            return fail_scan(st, &proto.err, efficiency, lost, n, err);
        skip = done;
    }

    job jobs[MAX_THREADS];
    pthread_t tid[MAX_THREADS];
    int started[MAX_THREADS] = {0};
    for (int k = 0; k < nthreads; k++) {
        jobs[k] = (job){p, variable, values, efficiency, lost, n, (size_t)k, (size_t)nthreads,
                        skip, cancel, CP_OK, {0}};
        /* thread 0 is the caller itself */
        if (k > 0)
            started[k] = pthread_create(&tid[k], NULL, run_job, &jobs[k]) == 0;
    }
    run_job(&jobs[0]);
    cp_status st = jobs[0].status;
    const cp_error *first_err = &jobs[0].err;
    for (int k = 1; k < nthreads; k++) {
        if (started[k])
            pthread_join(tid[k], NULL);
        else
            run_job(&jobs[k]); /* no thread available: do its share here */
        if (st == CP_OK && jobs[k].status != CP_OK) {
            st = jobs[k].status;
            first_err = &jobs[k].err;
        }
    }
    return st == CP_OK ? CP_OK : fail_scan(st, first_err, efficiency, lost, n, err);
}

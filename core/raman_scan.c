/*
 * Raman model: line shapes.  The points of a detuning scan are independent transfers, so
 * they are shared out to POSIX threads in interleaved order (neighbouring points cost
 * about the same); cp_raman_transfer is thread-safe and keeps its state on the stack.
 */
#include <math.h>
#include <pthread.h>

#include "check_int.h"
#include "coldprep/raman.h"

#define CTX "raman scan"

typedef struct job {
    const cp_raman_params *base;
    cp_raman_scan_variable variable;
    const double *values;
    double *efficiency, *lost;
    size_t n, first, stride;
    const cp_cancel_flag *cancel;
    cp_status status;
    cp_error err;
} job;

static void *run_job(void *arg)
{
    job *jb = arg;
    cp_raman_params p = *jb->base;
    jb->status = CP_OK;
    for (size_t i = jb->first; i < jb->n; i += jb->stride) {
        if (jb->cancel && *jb->cancel) {
            jb->status = cp_fail(&jb->err, CP_ECANCELED, CTX ": interrupted after %zu of %zu "
                                 "points", i, jb->n);
            break;
        }
        if (jb->variable == CP_RAMAN_SCAN_TWO_PHOTON)
            p.two_photon_detuning = jb->values[i];
        else
            p.detuning = jb->values[i];
        cp_raman_result r;
        cp_status st = cp_raman_transfer(&p, 0, &r, NULL, &jb->err);
        if (st != CP_OK) {
            jb->status = st;
            break;
        }
        jb->efficiency[i] = r.efficiency;
        if (jb->lost)
            jb->lost[i] = r.lost;
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
    enum { MAX_THREADS = 64 };
    cp_init();
    if (!p || !values || !efficiency)
        return cp_fail(err, CP_EINVAL, CTX ": parameters, values and efficiency must not be "
                                            "NULL");
    if (n < 1 || n > 100000000)
        return cp_fail(err, CP_EINVAL, CTX ": points %zu is out of range; allowed 1 to "
                       "100000000", n);
    cp_poison(efficiency, (int)n);
    if (lost)
        cp_poison(lost, (int)n);
    if (variable != CP_RAMAN_SCAN_TWO_PHOTON && variable != CP_RAMAN_SCAN_ONE_PHOTON)
        return cp_fail(err, CP_EINVAL, CTX ": scan variable %d is unknown; allowed 0 (delta) "
                       "or 1 (Delta)", (int)variable);
    CP_TRY(cp_check_int_range(err, CTX, "threads", nthreads, 1, MAX_THREADS));
    if ((size_t)nthreads > n)
        nthreads = (int)n;

    job jobs[MAX_THREADS];
    pthread_t tid[MAX_THREADS];
    int started[MAX_THREADS] = {0};
    for (int k = 0; k < nthreads; k++) {
        jobs[k] = (job){p, variable, values, efficiency, lost, n, (size_t)k, (size_t)nthreads,
                        cancel, CP_OK, {0}};
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
    if (st != CP_OK) {
        cp_poison(efficiency, (int)n);
        if (lost)
            cp_poison(lost, (int)n);
        if (err)
            *err = *first_err;
    }
    return st;
}

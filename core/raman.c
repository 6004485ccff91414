/*
 * Raman model: propagation of the Lindblad master equation of physics.md §5.1 for the
 * Lambda system plus a sink.  The state is the 3x3 density matrix as 9 reals
 * (rho_11, rho_22, rho_33, Re/Im rho_12, rho_13, rho_23) and the sink population, which is
 * integrated on its own so that trace + lost = 1 is a check of the integrator, not an
 * identity.  The integrator is GSL's embedded Runge-Kutta Prince-Dormand 8(9) (rk8pd) with
 * absolute error control; docs/models/raman.md explains the choice (measured against a
 * fourth-order Magnus propagator with exact matrix exponentials).
 */
#include <complex.h>
#include <math.h>
#include <string.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>

#include "check_int.h"
#include "raman_int.h"

#define CTX "raman transfer"
enum { DIM = 10 };

/* Absolute error per step asked of the integrator; populations end up ~1e-11 accurate. */
static const double abs_tolerance = 1e-9;

/* The constant parts of the generator. */
typedef struct model {
    cp_raman_pulses pulses;
    double delta_1, delta_2; /* one- and two-photon detuning, rad/s */
    double k[3];             /* decay of the amplitudes: gamma_1/2, gamma/2, gamma_3/2 */
    double feed1, feed3;     /* rate into |1>, |3> from rho_22 (branching) */
    double kappa12, kappa13, kappa23; /* dephasing of the coherences, 1/s */
} model;

static void model_init(model *m, const cp_raman_params *p)
{
    m->delta_1 = p->detuning;
    m->delta_2 = p->two_photon_detuning;
    m->k[0] = p->gamma_initial / 2;
    m->k[1] = p->gamma / 2;
    m->k[2] = p->gamma_target / 2;
    m->feed1 = p->branching_initial * p->gamma;
    m->feed3 = p->branching_target * p->gamma;
    double gp = 2 * M_PI * p->pump_linewidth_hz, gs = 2 * M_PI * p->stokes_linewidth_hz;
    if (p->use_relative) {
        /* common-mode noise moves |2> only (L = sqrt(gp) P2); the beat note moves |3>
         * (L = sqrt(gr) P3), so rho_13 decays at pi * relative_linewidth_hz */
        double gr = 2 * M_PI * p->relative_linewidth_hz;
        m->kappa12 = gp / 2;
        m->kappa13 = gr / 2;
        m->kappa23 = (gp + gr) / 2;
    } else {
        /* L_p = sqrt(gp) (P2 + P3), L_s = sqrt(gs) P3 (issue 4): D[sqrt(g) P] damps rho_ij
         * at g (P_ii - P_jj)^2 / 2 */
        m->kappa12 = gp / 2;
        m->kappa13 = (gp + gs) / 2;
        m->kappa23 = gs / 2;
    }
}

static void unpack(const double *y, double complex r[3][3])
{
    r[0][0] = y[0];
    r[1][1] = y[1];
    r[2][2] = y[2];
    r[0][1] = CMPLX(y[3], y[4]);
    r[0][2] = CMPLX(y[5], y[6]);
    r[1][2] = CMPLX(y[7], y[8]);
    r[1][0] = conj(r[0][1]);
    r[2][0] = conj(r[0][2]);
    r[2][1] = conj(r[1][2]);
}

/* d rho/dt = -i [H, rho] - {K, rho} + feeding from rho_22 - kappa o rho (off-diagonal). */
static int rhs(double t, const double y[], double dy[], void *params)
{
    const model *m = params;
    double op, os;
    cp_raman_pulses_eval(&m->pulses, t, &op, &os, NULL, NULL);
    double complex r[3][3], d[3][3];
    unpack(y, r);
    const double H[3][3] = {{0, op / 2, 0}, {op / 2, -m->delta_1, os / 2},
                            {0, os / 2, -m->delta_2}};
    for (int i = 0; i < 3; i++)
        for (int j = i; j < 3; j++) {
            double complex c = 0;
            for (int l = 0; l < 3; l++)
                c += H[i][l] * r[l][j] - r[i][l] * H[l][j];
            d[i][j] = -I * c - (m->k[i] + m->k[j]) * r[i][j];
        }
    dy[0] = creal(d[0][0]) + m->feed1 * y[1];
    dy[1] = creal(d[1][1]);
    dy[2] = creal(d[2][2]) + m->feed3 * y[1];
    d[0][1] -= m->kappa12 * r[0][1];
    d[0][2] -= m->kappa13 * r[0][2];
    d[1][2] -= m->kappa23 * r[1][2];
    dy[3] = creal(d[0][1]);
    dy[4] = cimag(d[0][1]);
    dy[5] = creal(d[0][2]);
    dy[6] = cimag(d[0][2]);
    dy[7] = creal(d[1][2]);
    dy[8] = cimag(d[1][2]);
    /* the sink: what leaves |2> other than by branching, and the slow losses */
    dy[9] = (2 * m->k[1] - m->feed1 - m->feed3) * y[1] + 2 * m->k[0] * y[0] + 2 * m->k[2] * y[2];
    return GSL_SUCCESS;
}

static void store_trace(cp_raman_trace *tr, size_t i, double t, const double *y)
{
    double *cols[] = {tr->initial, tr->excited, tr->target, tr->coherence_13_re,
                      tr->coherence_13_im};
    const int idx[] = {0, 1, 2, 5, 6};
    if (tr->time)
        tr->time[i] = t;
    for (int c = 0; c < 5; c++)
        if (cols[c])
            cols[c][i] = y[idx[c]];
}

/* Integrate y from t0 to t1 (recording the trace if given). */
static cp_status propagate(gsl_odeiv2_driver *drv, double t0, double t1, double *y,
                           cp_raman_trace *tr, cp_error *err)
{
    double t = t0;
    size_t n = tr ? tr->n : 1;
    for (size_t i = 0; i < n; i++) {
        double target = tr ? t0 + (t1 - t0) * (double)i / (double)(n - 1) : t1;
        if (target > t) {
            int st = gsl_odeiv2_driver_apply(drv, &t, target, y);
            if (st != GSL_SUCCESS)
                return cp_fail(err, CP_ENUMERIC, CTX ": the ODE integrator failed at t = %.6g "
                               "s (%s)", t, gsl_strerror(st));
        }
        if (tr)
            store_trace(tr, i, t, y);
    }
    return CP_OK;
}

static void poison(cp_raman_result *res, cp_raman_trace *tr)
{
    cp_poison(&res->efficiency, 1);
    cp_poison(res->populations, 3);
    cp_poison(&res->lost, 1);
    cp_poison(&res->rho[0][0][0], 18);
    cp_poison(&res->round_trip_efficiency, 1);
    cp_poison(&res->t_start, 1);
    cp_poison(&res->t_end, 1);
    cp_poison(&res->adiabaticity, 1);
    cp_poison(&res->overlap_time, 1);
    cp_poison(&res->decay_loss_estimate, 1);
    cp_poison(&res->dephasing_loss_estimate, 1);
    res->steps = 0;
    if (tr && tr->n >= 2) {
        double *cols[] = {tr->time, tr->initial, tr->excited, tr->target, tr->coherence_13_re,
                          tr->coherence_13_im};
        for (int c = 0; c < 6; c++)
            if (cols[c])
                cp_poison(cols[c], (int)tr->n);
    }
}

static void fill_result(const double *y, cp_raman_result *res)
{
    double complex r[3][3];
    unpack(y, r);
    for (int i = 0; i < 3; i++) {
        res->populations[i] = y[i];
        for (int j = 0; j < 3; j++) {
            res->rho[i][j][0] = creal(r[i][j]);
            res->rho[i][j][1] = cimag(r[i][j]);
        }
    }
    res->efficiency = y[2];
    res->lost = y[9];
}

cp_status cp_raman_transfer(const cp_raman_params *p, int round_trip, cp_raman_result *res,
                            cp_raman_trace *trace, cp_error *err)
{
    cp_init();
    if (!res)
        return cp_fail(err, CP_EINVAL, CTX ": result pointer is NULL");
    poison(res, trace);
    if (!p)
        return cp_fail(err, CP_EINVAL, CTX ": parameter pointer is NULL");
    if (trace && (trace->n < 2 || trace->n > 10000000))
        return cp_fail(err, CP_EINVAL, CTX ": trace samples %zu is out of range; allowed 2 to "
                       "10000000", trace->n);
    model m;
    CP_TRY(cp_raman_pulses_init(&m.pulses, p, err));
    model_init(&m, p);

    gsl_odeiv2_system sys = {rhs, NULL, DIM, &m};
    double span = m.pulses.t_end - m.pulses.t_start;
    gsl_odeiv2_driver *drv = gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd,
                                                           span * 1e-4, abs_tolerance, 0.0);
    if (!drv) {
        cp_raman_pulses_free(&m.pulses);
        return cp_fail(err, CP_ENOMEM, CTX ": out of memory for the integrator");
    }
    double y[DIM] = {1.0};
    cp_status st = propagate(drv, m.pulses.t_start, m.pulses.t_end, y, trace, err);
    if (st == CP_OK) {
        fill_result(y, res);
        res->steps = drv->e->count;
        res->t_start = m.pulses.t_start;
        res->t_end = m.pulses.t_end;
        cp_raman_estimates(&m.pulses, res);
    }
    if (st == CP_OK && round_trip) {
        /* the return trip: the same pulses reversed in time, from the final state */
        m.pulses.reversed = 1;
        gsl_odeiv2_driver_reset(drv);
        gsl_odeiv2_driver_reset_hstart(drv, span * 1e-4);
        st = propagate(drv, -m.pulses.t_end, -m.pulses.t_start, y, NULL, err);
        res->round_trip_efficiency = y[0];
    }
    gsl_odeiv2_driver_free(drv);
    cp_raman_pulses_free(&m.pulses);
    if (st != CP_OK)
        poison(res, trace);
    return st;
}

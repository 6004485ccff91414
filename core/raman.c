/*
 * Raman model: propagation of the Lindblad master equation of docs/models/raman.md for the
 * Lambda system plus a sink.  The state is the 3x3 density matrix as 9 reals
 * (rho_11, rho_22, rho_33, Re/Im rho_12, rho_13, rho_23) and the sink population, which is
 * integrated on its own so that trace + lost = 1 is a check of the integrator, not an
 * identity.  The integrator is the Dormand-Prince 5(4) pair of raman_dp.c near resonance
 * and the three-stage Gauss-Legendre collocation method of raman_gauss.c away from it, both
 * with error control set from the accuracy asked for; docs/models/raman.md explains the
 * choice (measured against GSL's rk8pd and msbdf, Magnus propagators with exact matrix
 * exponentials, exponential and Rosenbrock integrators).
 */
#include <math.h>

#include "check_int.h"
#include "raman_dp_int.h"
#include "raman_gauss_int.h"
#include "raman_int.h"

#define CTX "raman transfer"
enum { DIM = CP_RAMAN_DIM };
static const size_t max_trace = 10000000;

/* The largest rate of the constant part of the generator (decay, dephasing, detunings), 1/s:
 * it sets the stability bound of the explicit pair. */
static double constant_rate(const cp_raman_params *p)
{
    double kappa = 2 * M_PI * (p->pump_linewidth_hz + p->stokes_linewidth_hz +
                               (p->use_relative ? p->relative_linewidth_hz : 0.0));
    return p->gamma + p->gamma_initial + p->gamma_target + fabs(p->detuning) +
           fabs(p->two_photon_detuning) + kappa;
}

/* Absolute error per step asked of the explicit pair for a final accuracy acc.  Measured
 * (docs/models/raman.md, "Integrator and error control"): the final error is about 0.01 x
 * steps x tolerance when nothing damps the local errors (gamma = 0), and 0.01-0.04 x the
 * tolerance when the decay of |2> is comparable to the Rabi frequencies (the errors of the
 * bright states die out).  Hence the tolerance falls with the phase (sum of the rates x
 * window, which sets the number of steps) and rises with gamma / peak Rabi frequency. */
static double tolerance(double acc, const cp_raman_pulses *pl, double gamma, double rate0)
{
    double f = fmin(1.0, 2000.0 / pl->phase);
    double rabi = pl->phase / (pl->t_end - pl->t_start) - rate0; /* the peak Rabi frequency */
    double damp = rabi > 0 ? fmin(1.0, gamma / rabi) : 1.0;
    return acc * f * f * (0.1 + 20 * damp * damp);
}

/* Away from resonance the explicit pair is limited by stability (steps ~ 3/|Delta|) and the
 * collocation method of raman_gauss.c, whose steps follow the slow motion, is cheaper: from
 * |Delta| above implicit_ratio times the sum of all other rates (the reference case's cost
 * curves of the two cross near 0.6; docs/models/raman.md). */
static const double implicit_ratio = 0.6;

/* The tolerance of the collocation method for a final accuracy acc.  Its error estimate is
 * of order h^4 per unit time while the method's error is of order h^6, so the final error
 * goes as the tolerance to the power 3/2: tol = 1.5 acc^(2/3), calibrated on 47 cases
 * (Gaussian and sin^2 pulses, Delta/2pi from 3 MHz to 2 GHz, delta, branching, slow losses,
 * lossless, strong and long pulses) at accuracies 1e-5 to 1e-9: final error at most 0.23 of
 * the accuracy (docs/models/raman.md). */
static double implicit_tolerance(double acc)
{
    return 1.5 * pow(acc, 2.0 / 3.0);
}

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
        /* L_p = sqrt(gp) (P2 + P3), L_s = sqrt(gs) P3: D[sqrt(g) P] damps rho_ij
         * at g (P_ii - P_jj)^2 / 2 */
        m->kappa12 = gp / 2;
        m->kappa13 = (gp + gs) / 2;
        m->kappa23 = gs / 2;
    }
}

/* d rho/dt = -i [H, rho] - {K, rho} + feeding from rho_22 - kappa o rho (off-diagonal),
 * written out for rho = R + iJ (R symmetric, J antisymmetric) and H real symmetric:
 * dR/dt = [H, J] and dJ/dt = -[H, R] for the coherent part. */
static void generator(const model *m, double a, double b, int slow, const double y[],
                      double dy[])
{
    const double e2 = -m->delta_1, e3 = -m->delta_2;
    const double r11 = y[0], r22 = y[1], r33 = y[2];
    const double x12 = y[3], j12 = y[4], x13 = y[5], j13 = y[6], x23 = y[7], j23 = y[8];
    /* the slow losses act only over the transfer duration (slow = 1) */
    const double k1 = slow ? m->k[0] : 0.0, k2 = m->k[1], k3 = slow ? m->k[2] : 0.0;
    dy[0] = -2 * a * j12 - 2 * k1 * r11 + m->feed1 * r22;
    dy[1] = 2 * (a * j12 - b * j23) - 2 * k2 * r22;
    dy[2] = 2 * b * j23 - 2 * k3 * r33 + m->feed3 * r22;
    const double g12 = k1 + k2 + m->kappa12, g13 = k1 + k3 + m->kappa13,
                 g23 = k2 + k3 + m->kappa23;
    dy[3] = -e2 * j12 - b * j13 - g12 * x12;
    dy[4] = a * (r11 - r22) + e2 * x12 + b * x13 - g12 * j12;
    dy[5] = a * j23 - b * j12 - e3 * j13 - g13 * x13;
    dy[6] = b * x12 + e3 * x13 - a * x23 - g13 * j13;
    dy[7] = a * j13 + (e2 - e3) * j23 - g23 * x23;
    dy[8] = b * (r22 - r33) + (e3 - e2) * x23 - a * x13 - g23 * j23;
    /* the sink: what leaves |2> other than by branching, and the slow losses */
    dy[9] = (2 * k2 - m->feed1 - m->feed3) * r22 + 2 * k1 * r11 + 2 * k3 * r33;
}

/* The generator as the explicit pair calls it, with the envelopes it computed. */
static void dp_gen(const void *ctx, double t, double op, double os, const double y[], double dy[])
{
    const model *m = ctx;
    generator(m, op / 2, os / 2, cp_raman_pulses_slow_on(&m->pulses, t), y, dy);
}

/* The generator as the collocation method takes it apart into its matrices. */
static void gen_ab(const void *ctx, double a, double b, int slow, const double y[], double dy[])
{
    generator(ctx, a, b, slow, y, dy);
}

/* State index of each trace column after the time (see the layout above). */
static const int trace_index[CP_RAMAN_TRACE_COLUMNS] = {
    [CP_RAMAN_TRACE_INITIAL] = 0, [CP_RAMAN_TRACE_EXCITED] = 1, [CP_RAMAN_TRACE_TARGET] = 2,
    [CP_RAMAN_TRACE_LOST] = 9,    [CP_RAMAN_TRACE_RE12] = 3,    [CP_RAMAN_TRACE_IM12] = 4,
    [CP_RAMAN_TRACE_RE13] = 5,    [CP_RAMAN_TRACE_IM13] = 6,    [CP_RAMAN_TRACE_RE23] = 7,
    [CP_RAMAN_TRACE_IM23] = 8};

/* A population (y index 0, 1, 2 or 9) as reported: the integration leaves it within its
 * accuracy of the physical range, by ~1e-10 below 0 or above 1 at the default accuracy; the
 * reported value is clipped to [0, 1] so that no population is negative. */
static double population(const double *y, int index)
{
    double v = y[index];
    return (index <= 2 || index == 9) ? fmin(1.0, fmax(0.0, v)) : v;
}

static void store_trace(cp_raman_trace *tr, size_t i, double t, const double *y)
{
    if (tr->column[CP_RAMAN_TRACE_TIME])
        tr->column[CP_RAMAN_TRACE_TIME][i] = t;
    for (int c = CP_RAMAN_TRACE_TIME + 1; c < CP_RAMAN_TRACE_COLUMNS; c++)
        if (tr->column[c])
            tr->column[c][i] = population(y, trace_index[c]);
}

/* One of the two integrators: the explicit pair of raman_dp.c or the collocation method of
 * raman_gauss.c. */
typedef struct stepper {
    cp_raman_dp *dp;
    cp_raman_gauss *gauss;
} stepper;

static void set_hmax(stepper *s, double hmax)
{
    if (s->gauss)
        s->gauss->hmax = hmax;
    else
        s->dp->hmax = hmax;
}

static cp_status advance(stepper *s, double *t, double t1, double *y, cp_error *err)
{
    int st = s->gauss ? cp_raman_gauss_apply(s->gauss, t, t1, y)
                      : cp_raman_dp_apply(s->dp, t, t1, y);
    if (st != 0)
        return cp_fail(err, CP_ENUMERIC, CTX ": the ODE integrator failed at t = %.6g s (step "
                       "size too small)", *t);
    return CP_OK;
}

/* Integrate y over the window of pl (forward or reversed), recording the trace if given.
 * The window is cut at break points — the edges of each analytic pulse, every sample time
 * of a sampled shape — so that no step can jump over a short pulse and none straddles a
 * kink of the envelope; inside an analytic pulse steps are at most width/2. */
static cp_status propagate(stepper *drv, const cp_raman_pulses *pl, double *y,
                           cp_raman_trace *tr, cp_error *err)
{
    size_t nb = cp_raman_pulses_breaks(pl), k = 0, ntr = tr ? tr->n : 0;
    double t0 = cp_raman_pulses_break(pl, 0), t1 = cp_raman_pulses_break(pl, nb - 1), t = t0;
    for (size_t b = 1; b <= nb; b++) {
        double tb = b < nb ? cp_raman_pulses_break(pl, b) : t1;
        if (b < nb && tb > t)
            set_hmax(drv, cp_raman_pulses_hmax(pl, t, tb));
        /* trace samples up to tb, then tb itself */
        while (k < ntr) {
            double tk = k + 1 == ntr ? t1 : t0 + (t1 - t0) * (double)k / (double)(ntr - 1);
            if (tk > tb)
                break;
            if (tk > t)
                CP_TRY(advance(drv, &t, tk, y, err));
            store_trace(tr, k++, t, y);
        }
        if (tb > t)
            CP_TRY(advance(drv, &t, tb, y, err));
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
    cp_poison(&res->nonadiabatic_loss_estimate, 1);
    cp_poison(&res->nonadiabatic_exponent, 1);
    cp_poison(&res->transfer_duration, 1);
    res->flags = 0;
    res->steps = 0;
    res->integrator = NULL;
    if (tr && tr->n >= 2 && tr->n <= max_trace)
        for (int c = 0; c < CP_RAMAN_TRACE_COLUMNS; c++)
            if (tr->column[c])
                cp_poison(tr->column[c], (int)tr->n);
}

static void fill_result(const double *y, cp_raman_result *res)
{
    /* rho_ij = R_ij + i J_ij, J antisymmetric */
    const double re[3][3] = {{y[0], y[3], y[5]}, {y[3], y[1], y[7]}, {y[5], y[7], y[2]}};
    const double im[3][3] = {{0, y[4], y[6]}, {-y[4], 0, y[8]}, {-y[6], -y[8], 0}};
    for (int i = 0; i < 3; i++) {
        res->populations[i] = population(y, i);
        for (int j = 0; j < 3; j++) {
            res->rho[i][j][0] = i == j ? population(y, i) : re[i][j];
            res->rho[i][j][1] = im[i][j];
        }
    }
    res->efficiency = population(y, 2);
    res->lost = population(y, 9);
}

/* Start (or restart, for the return trip) the chosen integrator on the pulses of m. */
static void start(stepper *s, model *m, const cp_raman_affine *affine, double tol)
{
    double hstart = cp_raman_pulses_hstart(&m->pulses);
    if (s->gauss)
        cp_raman_gauss_init(s->gauss, &m->pulses, affine, tol, hstart);
    else
        cp_raman_dp_init(s->dp, &m->pulses, dp_gen, m, tol, hstart,
                         3.2 / constant_rate(m->pulses.p));
}

/* Run the forward sequence (and the return trip) with the collocation method (implicit) or
 * the explicit pair.  Fills the propagation part of res. */
static cp_status integrate(model *m, int implicit, double tol, int round_trip,
                           cp_raman_result *res, cp_raman_trace *trace, cp_error *err)
{
    cp_raman_dp dp;
    cp_raman_gauss gauss;
    cp_raman_affine affine;
    stepper s = {implicit ? NULL : &dp, implicit ? &gauss : NULL};
    if (implicit)
        cp_raman_affine_init(&affine, gen_ab, m);
    double y[DIM] = {1.0};
    m->pulses.reversed = 0;
    start(&s, m, &affine, tol);
    cp_status st = propagate(&s, &m->pulses, y, trace, err);
    if (st == CP_OK) {
        fill_result(y, res);
        res->steps = implicit ? gauss.steps : dp.steps;
    }
    if (st == CP_OK && round_trip) {
        /* the return trip: the same pulses reversed in time, from the final state */
        m->pulses.reversed = 1;
        start(&s, m, &affine, tol);
        st = propagate(&s, &m->pulses, y, NULL, err);
        res->round_trip_efficiency = y[0];
    }
    return st;
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
    if (trace && (trace->n < 2 || trace->n > max_trace))
        return cp_fail(err, CP_EINVAL, CTX ": trace samples %zu is out of range; allowed 2 to "
                       "%zu", trace->n, max_trace);
    double acc = p->accuracy == 0.0 ? 1e-8 : p->accuracy;
    CP_TRY(cp_check_range(err, CTX, "accuracy", acc, "", 1e-12, 1e-3, CP_CLOSED));
    model m;
    CP_TRY(cp_raman_pulses_init(&m.pulses, p, err));
    model_init(&m, p);

    cp_status st;
    if (fabs(p->detuning) > implicit_ratio * m.pulses.other_rate) {
        st = integrate(&m, 1, implicit_tolerance(acc), round_trip, res, trace, err);
        res->integrator = "gauss-legendre";
    } else {
        st = integrate(&m, 0, tolerance(acc, &m.pulses, p->gamma, constant_rate(p)), round_trip,
                       res, trace, err);
        res->integrator = "dopri5";
    }
    if (st == CP_OK) {
        res->t_start = m.pulses.t_start;
        res->t_end = m.pulses.t_end;
        res->transfer_duration = m.pulses.loss_to - m.pulses.loss_from;
        if (p->estimates)
            cp_raman_estimates(&m.pulses, res);
    }
    cp_raman_pulses_free(&m.pulses);
    if (st != CP_OK)
        poison(res, trace);
    return st;
}

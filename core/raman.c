/*
 * Raman model: propagation of the Lindblad master equation of docs/models/raman.md for the
 * Lambda system plus a sink.  The state is the 3x3 density matrix as 9 reals
 * (rho_11, rho_22, rho_33, Re/Im rho_12, rho_13, rho_23) and the sink population (in the
 * order of raman_gen_int.h, which also holds the generator), which is integrated on its own
 * so that trace + lost = 1 is a check of the integrator, not an identity.  The integrator is
 * the Dormand-Prince 5(4) pair of raman_dp.c near resonance and the three-stage
 * Gauss-Legendre collocation method of raman_gauss.c away from it, both with error control
 * set from the accuracy asked for; docs/models/raman.md explains the choice (measured
 * against GSL's rk8pd and msbdf, Magnus propagators with exact matrix exponentials,
 * exponential and Rosenbrock integrators).
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
 * window, which sets the number of steps) and rises with gamma / peak Rabi frequency.
 * Sampled envelopes get no such rise: they are smooth only between samples and may carry
 * noise, which keeps exciting the bright states (2001 samples of the reference case with
 * 1 % noise: final error 13x the accuracy 1e-8 with the rise, 0.002x without it). */
static double tolerance(double acc, const cp_raman_pulses *pl, double gamma, double rate0)
{
    double f = fmin(1.0, 2000.0 / pl->phase);
    double rabi = pl->phase / (pl->t_end - pl->t_start) - rate0; /* the peak Rabi frequency */
    double damp = rabi > 0 ? fmin(1.0, gamma / rabi) : 1.0;
    if (pl->p->shape == CP_RAMAN_SAMPLED)
        damp = 0.0;
    return acc * f * f * (0.1 + 20 * damp * damp);
}

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

static void model_init(cp_raman_model *m, const cp_raman_params *p)
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

/* The generator as the collocation method takes it apart into its matrices. */
static void gen_ab(const void *ctx, double a, double b, int slow, const double y[], double dy[])
{
    cp_raman_rates c = cp_raman_rates_of(ctx, slow);
    cp_raman_generator(&c, a, b, y, dy);
}

/* State index of each trace column after the time (raman_gen_int.h). */
static const int trace_index[CP_RAMAN_TRACE_COLUMNS] = {
    [CP_RAMAN_TRACE_INITIAL] = CP_RAMAN_R11, [CP_RAMAN_TRACE_EXCITED] = CP_RAMAN_R22,
    [CP_RAMAN_TRACE_TARGET] = CP_RAMAN_R33,  [CP_RAMAN_TRACE_LOST] = CP_RAMAN_LOST,
    [CP_RAMAN_TRACE_RE12] = CP_RAMAN_X12,    [CP_RAMAN_TRACE_IM12] = CP_RAMAN_J12,
    [CP_RAMAN_TRACE_RE13] = CP_RAMAN_X13,    [CP_RAMAN_TRACE_IM13] = CP_RAMAN_J13,
    [CP_RAMAN_TRACE_RE23] = CP_RAMAN_X23,    [CP_RAMAN_TRACE_IM23] = CP_RAMAN_J23};

/* A population (y index CP_RAMAN_R11 to CP_RAMAN_LOST) as reported: the integration leaves
 * it within its accuracy of the physical range, by ~1e-10 below 0 or above 1 at the default
 * accuracy; the reported value is clipped to [0, 1] so that no population is negative. */
static double population(const double *y, int index)
{
    double v = y[index];
    return index <= CP_RAMAN_LOST ? fmin(1.0, fmax(0.0, v)) : v;
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
    double accuracy; /* asked of the final populations (for the error message) */
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
    if (st == 0)
        return CP_OK;
    if (s->accuracy >= 1e-3) /* the loosest allowed: nothing to suggest */
        return cp_fail(err, CP_ENUMERIC, CTX ": the ODE integrator failed at t = %.6g s (step "
                       "size too small)", *t);
    return cp_fail(err, CP_ENUMERIC, CTX ": the ODE integrator failed at t = %.6g s (step size "
                   "too small): accuracy %.3g may be finer than rounding allows for these "
                   "pulses; allowed 1e-12 to 1e-3, try a looser one", *t, s->accuracy);
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
    const double x12 = y[CP_RAMAN_X12], x13 = y[CP_RAMAN_X13], x23 = y[CP_RAMAN_X23];
    const double j12 = y[CP_RAMAN_J12], j13 = y[CP_RAMAN_J13], j23 = y[CP_RAMAN_J23];
    const double re[3][3] = {{0, x12, x13}, {x12, 0, x23}, {x13, x23, 0}};
    const double im[3][3] = {{0, j12, j13}, {-j12, 0, j23}, {-j13, -j23, 0}};
    for (int i = 0; i < 3; i++) {
        res->populations[i] = population(y, CP_RAMAN_R11 + i);
        for (int j = 0; j < 3; j++) {
            res->rho[i][j][0] = i == j ? res->populations[i] : re[i][j];
            res->rho[i][j][1] = im[i][j];
        }
    }
    res->efficiency = population(y, CP_RAMAN_R33);
    res->lost = population(y, CP_RAMAN_LOST);
}

/* Start (or restart, for the return trip) the chosen integrator on the pulses of m. */
static void start(stepper *s, cp_raman_model *m, const cp_raman_affine *affine, double tol)
{
    double hstart = cp_raman_pulses_hstart(&m->pulses);
    if (s->gauss)
        cp_raman_gauss_init(s->gauss, &m->pulses, affine, tol, hstart);
    else
        cp_raman_dp_init(s->dp, m, tol, hstart, 3.2 / constant_rate(m->pulses.p));
}

/* Run the forward sequence (and the return trip) with the collocation method (implicit) or
 * the explicit pair.  Fills the propagation part of res. */
static cp_status integrate(cp_raman_model *m, int implicit, double acc, double tol,
                           int round_trip, cp_raman_result *res, cp_raman_trace *trace,
                           cp_error *err)
{
    cp_raman_dp dp;
    cp_raman_gauss gauss;
    cp_raman_affine affine;
    stepper s = {implicit ? NULL : &dp, implicit ? &gauss : NULL, acc};
    if (implicit)
        cp_raman_affine_init(&affine, gen_ab, m);
    double y[DIM] = {[CP_RAMAN_R11] = 1.0};
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
        res->round_trip_efficiency = y[CP_RAMAN_R11];
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
    cp_raman_model m;
    CP_TRY(cp_raman_pulses_init(&m.pulses, p, err));
    model_init(&m, p);

    /* away from resonance the explicit pair is limited by stability (steps ~ 3/|Delta|) and
     * the collocation method, whose steps follow the slow motion, is cheaper: from |Delta|
     * above 1.25 times the sum of all other rates (peak Rabi frequency, decay, dephasing,
     * |delta|), where the two cost the same on the reference case (docs/models/raman.md);
     * densely sampled pulses excepted (cp_raman_pulses_init sets the choice) */
    cp_status st;
    if (m.pulses.implicit) {
        st = integrate(&m, 1, acc, implicit_tolerance(acc), round_trip, res, trace, err);
        res->integrator = "gauss-legendre";
    } else {
        st = integrate(&m, 0, acc, tolerance(acc, &m.pulses, p->gamma, constant_rate(p)),
                       round_trip, res, trace, err);
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

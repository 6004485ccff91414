/*
 * Loading adiabaticity: how much of a condensate at quasimomentum 0 leaves the lowest band
 * while the lattice depth is ramped up.
 *
 * At q = 0 the potential is even, so band 0 couples only to the even bands 2, 4, ...
 * In the even-parity basis {1, sqrt(2) cos(2 l k x), l >= 1} the Hamiltonian (in E_r) is
 * tridiagonal with diagonal (2 l)^2 + V0/2, first off-diagonal -sqrt(2) V0/4 and the rest
 * -V0/4; dH/dV0 is the same matrix with V0 = 1 and no kinetic term.  The band-adiabaticity
 * figure |<n|dH/dt|0>| hbar / (E_n - E_0)^2 and the first-order adiabatic amplitudes
 *   c_n(T) = -integral_0^T f_n(t) exp(i phi_n(t)) dt,   f_n = <n|dH/dt|0> / (E_n - E_0),
 *   phi_n = integral (E_n - E_0) dt / hbar
 * (e.g. A. Messiah, Quantum Mechanics (1962), Ch. XVII; criterion as in Hecker Denschlag
 * et al., J. Phys. B 35, 3095 (2002) [M]) are evaluated on the ramp's samples, with f and
 * phi linear between samples and the segment integrals done exactly (Filon's method).
 */
#include <complex.h>
#include <math.h>
#include <stdlib.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/lattice.h"
#include "lattice_int.h"

static const char *const CTX = "lattice.loading";

enum { NEVEN = 3 }; /* bands 0, 2, 4 */
#define SQRT2 1.41421356237309504880
#define MAX_SAMPLES 100000

/* integral_0^1 e^{i theta u} du and integral_0^1 u e^{i theta u} du */
static void filon_weights(double theta, double complex *i0, double complex *i1)
{
    if (fabs(theta) < 1e-3) {
        double t2 = theta * theta;
        *i0 = (1.0 - t2 / 6.0) + I * (theta / 2.0 - theta * t2 / 24.0);
        *i1 = (0.5 - t2 / 8.0) + I * (theta / 3.0 - theta * t2 / 30.0);
        return;
    }
    double complex e = cexp(I * theta);
    *i0 = (e - 1.0) / (I * theta);
    *i1 = e / (I * theta) + (e - 1.0) / (theta * theta);
}

/* Depth (E_r) and its rate (E_r/s) of an analytic ramp at time t in [0, T]. */
static double analytic_depth(const cp_lattice_ramp *r, double t, double *rate)
{
    double delta = r->end_er - r->start_er, T = r->duration, shape, slope;
    switch (r->shape) {
    case CP_RAMP_EXPONENTIAL: {
        double tau = r->time_constant, norm = -expm1(-T / tau);
        shape = -expm1(-t / tau) / norm;
        slope = exp(-t / tau) / (tau * norm);
        break;
    }
    case CP_RAMP_S_SHAPED: {
        double s = sin(0.5 * CP_PI * t / T);
        shape = s * s;
        slope = 0.5 * CP_PI / T * sin(CP_PI * t / T);
        break;
    }
    default:
        shape = t / T;
        slope = 1.0 / T;
        break;
    }
    *rate = delta * slope;
    return r->start_er + delta * shape;
}

static cp_status check_ramp(const cp_lattice_ramp *r, cp_error *err)
{
    if (!r)
        return cp_fail(err, CP_EINVAL, "%s: ramp is NULL", CTX);
    CP_TRY(cp_check_range(err, CTX, "recoil", r->recoil, "J", 0.0, 1e-20, CP_LO_OPEN));
    if (r->shape == CP_RAMP_SAMPLED) {
        if (r->n_sampled < 2 || r->n_sampled > MAX_SAMPLES || !r->times || !r->depths_er)
            return cp_fail(err, CP_EINVAL,
                           "%s: sampled ramp has %zu samples; allowed [2, %d] with times and "
                           "depths",
                           CTX, r->n_sampled, MAX_SAMPLES);
        for (size_t i = 0; i < r->n_sampled; i++) {
            CP_TRY(cp_check_finite(err, CTX, "sample time", r->times[i], "s"));
            CP_TRY(cp_check_range(err, CTX, "sample depth", r->depths_er[i], "E_r", 0.0,
                                  CP_LATTICE_MAX_DEPTH_ER, CP_CLOSED));
            if (i > 0 && !(r->times[i] > r->times[i - 1]))
                return cp_fail(err, CP_EINVAL,
                               "%s: sample time %.6g s at index %zu is not after the previous "
                               "one (%.6g s); times must increase strictly",
                               CTX, r->times[i], i + 1, r->times[i - 1]);
        }
        return CP_OK;
    }
    if (r->shape != CP_RAMP_LINEAR && r->shape != CP_RAMP_EXPONENTIAL &&
        r->shape != CP_RAMP_S_SHAPED)
        return cp_fail(err, CP_EINVAL, "%s: ramp shape %d is not one of 0..3", CTX,
                       (int)r->shape);
    CP_TRY(cp_check_range(err, CTX, "start depth", r->start_er, "E_r", 0.0,
                          CP_LATTICE_MAX_DEPTH_ER, CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX, "end depth", r->end_er, "E_r", 0.0,
                          CP_LATTICE_MAX_DEPTH_ER, CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX, "duration", r->duration, "s", CP_MIN_DURATION, 1e4,
                          CP_CLOSED));
    if (r->shape == CP_RAMP_EXPONENTIAL)
        CP_TRY(cp_check_range(err, CTX, "time constant", r->time_constant, "s", 0.0, 1e6,
                              CP_LO_OPEN));
    if (r->samples < 2 || r->samples > MAX_SAMPLES)
        return cp_fail(err, CP_EINVAL, "%s: samples %zu is out of range; allowed [2, %d]", CTX,
                       r->samples, MAX_SAMPLES);
    return CP_OK;
}

/* Per-sample state: band energies, couplings g_n = <n|dH/dV0|0> / (E_n - E_0) (1/E_r) and
 * the eigenvectors (to keep their signs continuous from one sample to the next). */
typedef struct sample_state {
    double energy[NEVEN];
    double g[NEVEN];
    double coupling[NEVEN]; /* <n|dH/dV0|0>, dimensionless */
} sample_state;

typedef struct solver {
    int size;
    double *diag, *work, *vec, *prev; /* vec, prev: NEVEN * size */
    int have_prev;
} solver;

static cp_status solve_sample(solver *s, double depth, sample_state *out)
{
    int n = s->size;
    for (int l = 0; l < n; l++)
        s->diag[l] = 4.0 * l * l + 0.5 * depth;
    cp_tridiag t = {n, s->diag, -0.25 * depth, -0.25 * SQRT2 * depth, NULL};
    double x[NEVEN];
    for (int k = 0; k < NEVEN; k++)
        x[k] = out->energy[k];
    cp_status st = cp_tridiag_lowest(&t, NEVEN, s->have_prev, x, s->work);
    if (st != CP_OK)
        return st;
    for (int k = 0; k < NEVEN; k++) {
        double *v = s->vec + (size_t)k * (size_t)n, *p = s->prev + (size_t)k * (size_t)n;
        cp_tridiag_vector(&t, x[k], v, s->work);
        if (s->have_prev) {
            double overlap = 0.0;
            for (int i = 0; i < n; i++)
                overlap += v[i] * p[i];
            if (overlap < 0)
                for (int i = 0; i < n; i++)
                    v[i] = -v[i];
        }
        out->energy[k] = x[k];
    }
    /* <n| dH/dV0 |0>: diagonal 1/2, off-diagonal -sqrt(2)/4 (first) and -1/4 */
    const double *v0 = s->vec;
    for (int k = 0; k < NEVEN; k++) {
        const double *v = s->vec + (size_t)k * (size_t)n;
        double m = 0.0;
        for (int i = 0; i < n; i++) {
            m += 0.5 * v[i] * v0[i];
            if (i + 1 < n)
                m += (i == 0 ? -0.25 * SQRT2 : -0.25) * (v[i] * v0[i + 1] + v[i + 1] * v0[i]);
        }
        out->coupling[k] = m;
        out->g[k] = k == 0 ? 0.0 : m / (x[k] - x[0]);
    }
    double *tmp = s->prev;
    s->prev = s->vec;
    s->vec = tmp;
    s->have_prev = 1;
    return CP_OK;
}

static void poison(cp_lattice_loading_result *r)
{
    r->max_adiabaticity = r->max_time = r->max_depth_er = NAN;
    r->simple_criterion = r->excited_fraction = NAN;
    r->basis_size = 0;
    r->flags = 0;
}

/* Time, depth and the depth rates just after (rate_right) and before (rate_left) sample i. */
static void ramp_point(const cp_lattice_ramp *r, size_t i, size_t n, double *t, double *depth,
                       double *rate_left, double *rate_right)
{
    if (r->shape == CP_RAMP_SAMPLED) {
        *t = r->times[i];
        *depth = r->depths_er[i];
        *rate_left = i > 0 ? (r->depths_er[i] - r->depths_er[i - 1]) /
                                 (r->times[i] - r->times[i - 1])
                           : 0.0;
        *rate_right = i + 1 < n ? (r->depths_er[i + 1] - r->depths_er[i]) /
                                      (r->times[i + 1] - r->times[i])
                                : 0.0;
        return;
    }
    *t = r->duration * (double)i / (double)(n - 1);
    *depth = analytic_depth(r, *t, rate_right);
    *rate_left = *rate_right;
}

cp_status cp_lattice_loading(const cp_lattice_ramp *ramp, cp_lattice_loading_result *res,
                             cp_error *err)
{
    poison(res);
    CP_TRY(check_ramp(ramp, err));
    size_t n = ramp->shape == CP_RAMP_SAMPLED ? ramp->n_sampled : ramp->samples;
    double deepest = 0.0;
    for (size_t i = 0; i < n; i++) {
        double t, d, rl, rr;
        ramp_point(ramp, i, n, &t, &d, &rl, &rr);
        deepest = fmax(deepest, d);
    }
    /* bands 0..4 of the full problem contain even bands 0, 2, 4 */
    int size = cp_lattice_auto_half_width(deepest, 2 * NEVEN - 1) + 1;
    solver s = {size, NULL, NULL, NULL, NULL, 0};
    s.diag = malloc(((size_t)size * (3 + 2 * NEVEN) + 4 * (NEVEN + 1)) * sizeof *s.diag);
    if (!s.diag)
        return cp_fail(err, CP_ENOMEM, "%s: out of memory", CTX);
    s.work = s.diag + size;
    s.vec = s.work + 2 * (size_t)size + 4 * (NEVEN + 1);
    s.prev = s.vec + (size_t)NEVEN * (size_t)size;

    double hbar_over_er = CP_HBAR / ramp->recoil; /* s */
    double complex amp[NEVEN] = {0};
    double phase[NEVEN] = {0}, best = -1.0, simple = 0.0, best_t = NAN, best_d = NAN;
    double t_prev = 0.0, rate_prev = 0.0;
    sample_state cur = {{0}, {0}, {0}}, prev = cur;
    cp_status st = CP_OK;
    for (size_t i = 0; i < n && st == CP_OK; i++) {
        double t, depth, rate_left, rate_right;
        ramp_point(ramp, i, n, &t, &depth, &rate_left, &rate_right);
        st = solve_sample(&s, depth, &cur);
        if (st != CP_OK)
            break;
        double rate = fmax(fabs(rate_left), fabs(rate_right));
        double gap = cur.energy[1] - cur.energy[0]; /* band 2, the nearest coupled one */
        double figure = hbar_over_er * fabs(cur.coupling[1]) * rate / (gap * gap);
        if (figure > best) {
            best = figure;
            best_t = t;
            best_d = depth;
        }
        simple = fmax(simple, hbar_over_er * rate / 16.0);
        if (i > 0) {
            double h = t - t_prev;
            for (int k = 1; k < NEVEN; k++) {
                double gap_a = prev.energy[k] - prev.energy[0];
                double gap_b = cur.energy[k] - cur.energy[0];
                double theta = 0.5 * (gap_a + gap_b) * h / hbar_over_er;
                double fa = prev.g[k] * rate_prev, fb = cur.g[k] * rate_left;
                double complex i0, i1;
                filon_weights(theta, &i0, &i1);
                amp[k] -= h * cexp(I * phase[k]) * (fa * i0 + (fb - fa) * i1);
                phase[k] += theta;
            }
        }
        prev = cur;
        t_prev = t;
        rate_prev = rate_right;
    }
    free(s.diag);
    if (st != CP_OK)
        return cp_fail(err, st, "%s: eigenvalue iteration failed", CTX);
    double fraction = 0.0;
    for (int k = 1; k < NEVEN; k++)
        fraction += creal(amp[k] * conj(amp[k]));
    res->max_adiabaticity = best;
    res->max_time = best_t;
    res->max_depth_er = best_d;
    res->simple_criterion = simple;
    res->excited_fraction = fraction;
    res->basis_size = size;
    /* first order holds while the excitation is small: above 5 % (common practice, no
     * source) the depletion of band 0 and higher-order paths matter */
    if (fraction > 0.05)
        res->flags = CP_LATTICE_FLAG_BEYOND_FIRST_ORDER;
    return CP_OK;
}

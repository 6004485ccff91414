/*
 * Raman model: the explicit propagator near resonance.  The embedded Runge-Kutta pair of
 * Dormand and Prince, order 5 with a 4th-order error estimate and the first evaluation of a
 * step equal to the last of the one before (J. R. Dormand & P. J. Prince, J. Comput. Appl.
 * Math. 6, 19 (1980); coefficients as tabulated by Hairer, Norsett & Wanner, Solving
 * Ordinary Differential Equations I, 2nd ed., Springer 1993, Table II.5.2), written out for
 * the ten reals of the state (as five pairs, see below) with the generator of
 * raman_gen_int.h inlined, so that nothing is allocated and no generic driver runs.
 *
 * Gaussian envelopes: at the nodes t + c h of a step, with x = (t - tc)/w and d = h/w,
 *   rabi exp(-(x + c d)^2) = E exp(-2 x c d) exp(-c^2 d^2),  E = rabi exp(-x^2),
 * and from one step to the next (x -> x + d) E is multiplied by the node-1 factors and
 * exp(-2 x c d) by exp(-2 c d^2): an exact multiplicative recurrence, so a step costs a few
 * multiplications instead of twelve exp() while the step size stays the same.  The step-size
 * controller therefore changes h only when the error estimate asks for a real change (grow
 * by 1.5x or more, or a rejected step); every change re-anchors the recurrence from exp().
 * Far from a pulse's centre (|x| > 20) or for sin^2 and sampled shapes the envelopes are
 * evaluated directly.
 */
#include <math.h>
#include <string.h>

#include "clones_int.h"
#include "raman_dp_int.h"

/* Nodes of the pair after the first (c2..c6; c7 = 1 is the next step's first node). */
static const double node[5] = {1.0 / 5, 3.0 / 10, 4.0 / 5, 8.0 / 9, 1.0};
static const double a21 = 1.0 / 5;
static const double a31 = 3.0 / 40, a32 = 9.0 / 40;
static const double a41 = 44.0 / 45, a42 = -56.0 / 15, a43 = 32.0 / 9;
static const double a51 = 19372.0 / 6561, a52 = -25360.0 / 2187, a53 = 64448.0 / 6561,
                    a54 = -212.0 / 729;
static const double a61 = 9017.0 / 3168, a62 = -355.0 / 33, a63 = 46732.0 / 5247,
                    a64 = 49.0 / 176, a65 = -5103.0 / 18656;
static const double b1 = 35.0 / 384, b3 = 500.0 / 1113, b4 = 125.0 / 192, b5 = -2187.0 / 6784,
                    b6 = 11.0 / 84;
/* 5th- minus 4th-order weights: the local error estimate */
static const double e1 = 71.0 / 57600, e3 = -71.0 / 16695, e4 = 71.0 / 1920,
                    e5 = -17253.0 / 339200, e6 = 22.0 / 525, e7 = -1.0 / 40;

/* Beyond |x| = 20 the envelope is below exp(-400) of its peak and the factors of the
 * recurrence could overflow: there it is evaluated directly. */
static const double rec_xmax = 20.0;
static const double grow_min = 1.5, grow_max = 4.0, shrink_min = 0.2, safety = 0.9;
/* errors above this (0.9/1.5)^5 cannot make the step grow by grow_min, and those below
 * (0.9/4)^5 make it grow by grow_max */
static const double grow_err = 0.0778, grow_max_err = 5.766e-4;
/* the recurrence is re-anchored from exp() after this many steps, so rounding cannot
 * build up over long runs (measured: 1e-11 in the populations after 15000 steps without) */
static const size_t rec_anchor = 64;

void cp_raman_dp_init(cp_raman_dp *s, const cp_raman_model *m, double tol, double hstart,
                      double hstab)
{
    *s = (cp_raman_dp){.m = m, .pl = &m->pulses, .hstab = hstab, .tol = tol, .h = hstart,
                       .hmax = INFINITY};
}

/* min(a, b) for numbers (fmin is a library call where NaN must be handled) */
static double smaller(double a, double b)
{
    return a < b ? a : b;
}

/* Prepare the envelopes for a step of length h from t. */
static void rec_prepare(cp_raman_dp *s, double t, double h)
{
    if (s->rec_ok && s->hrec == h && s->trec == t)
        return;
    s->rec_ok = 0;
    const cp_raman_params *p = s->pl->p;
    if (p->shape != CP_RAMAN_GAUSSIAN)
        return;
    /* pulse time and step, mirrored for the reversed sequence */
    double sign = s->pl->reversed ? -1.0 : 1.0, w = p->width, d = sign * h / w;
    double xp = (sign * t - p->delay / 2) / w, xs = (sign * t + p->delay / 2) / w;
    double xmax = fmax(fabs(xp), fabs(xs)), ad = fabs(d);
    if (!(xmax + ad <= rec_xmax && xmax * ad <= rec_xmax))
        return;
    s->e = (cp_raman_pair){p->rabi_pump / 2 * exp(-xp * xp), p->rabi_stokes / 2 * exp(-xs * xs)};
    for (int i = 0; i < 5; i++)
        s->p[i] = (cp_raman_pair){exp(-2 * xp * node[i] * d), exp(-2 * xs * node[i] * d)};
    for (int i = 0; i < 5; i++) {
        s->k[i] = exp(-node[i] * node[i] * d * d);
        s->q[i] = exp(-2 * node[i] * d * d);
    }
    /* the step starting at x + n d has |x + n d| + |d| <= rec_xmax for n up to this */
    double n = (rec_xmax - ad - xmax) / ad;
    s->rec_left = n < (double)(rec_anchor - 1) ? 1 + (size_t)n : rec_anchor;
    s->rec_ok = 1;
    s->hrec = h;
    s->trec = t;
}

/* Half the envelopes at node i (0..4) of the step from t of length h. */
static void envelopes(const cp_raman_dp *s, int i, double t, double h, double *a, double *b)
{
    if (s->rec_ok) {
        cp_raman_pair ab = s->e * s->p[i] * s->k[i];
        *a = ab[0];
        *b = ab[1];
    } else {
        cp_raman_pulses_half(s->pl, t + node[i] * h, a, b);
    }
}

/* Move the recurrence on by one accepted step; when it has served its steps (range or
 * count), the next step re-anchors it (or goes direct). */
static void rec_advance(cp_raman_dp *s)
{
    if (!s->rec_ok)
        return;
    s->e *= s->p[4] * s->k[4];
    for (int i = 0; i < 5; i++)
        s->p[i] *= s->q[i];
    s->trec += s->hrec;
    if (--s->rec_left == 0)
        s->rec_ok = 0;
}

/* The state as five pairs (raman_gen_int.h) or ten doubles.  Written as loops over ten
 * doubles, the stages were compiled to scalar code (GCC 12 at -O3 unrolls them, keeps the
 * arrays in registers and then finds nothing to vectorise); as pairs, and with the generator
 * working on pairs too, a transfer of the reference case takes 0.56 M instead of 0.79 M
 * instructions (docs/models/raman.md, "Performance"). */
typedef union state {
    double d[CP_RAMAN_DIM];
    cp_raman_pair v[CP_RAMAN_PAIRS];
} state;

/* One trial step of length h from (t, y) with the first stage k1 and the generator's rates
 * c: ynew, the derivative there (the last stage, dy7) and the error estimate (max norm) in
 * units of the tolerance.  Compiled for SSE2 and AVX (clones_int.h): 0.47 M instead of
 * 0.56 M instructions per transfer of the reference case, 46.5 instead of 49.6 us, the same
 * numbers to the last bit (checked on 18 transfers). */
CP_AVX_CLONES static double cp_raman_dp_trial(const cp_raman_dp *s, const cp_raman_rates *c,
                                            double t, double h, const state *y,
                                            const state *k1, state *ynew, state *dy7)
{
    state k2, k3, k4, k5, k6, z, e;
    double a, b;
    for (int j = 0; j < CP_RAMAN_PAIRS; j++)
        z.v[j] = y->v[j] + h * a21 * k1->v[j];
    envelopes(s, 0, t, h, &a, &b);
    cp_raman_generator_pairs(c, a, b, z.v, k2.v);
    for (int j = 0; j < CP_RAMAN_PAIRS; j++)
        z.v[j] = y->v[j] + h * (a31 * k1->v[j] + a32 * k2.v[j]);
    envelopes(s, 1, t, h, &a, &b);
    cp_raman_generator_pairs(c, a, b, z.v, k3.v);
    for (int j = 0; j < CP_RAMAN_PAIRS; j++)
        z.v[j] = y->v[j] + h * (a41 * k1->v[j] + a42 * k2.v[j] + a43 * k3.v[j]);
    envelopes(s, 2, t, h, &a, &b);
    cp_raman_generator_pairs(c, a, b, z.v, k4.v);
    for (int j = 0; j < CP_RAMAN_PAIRS; j++)
        z.v[j] = y->v[j] + h * (a51 * k1->v[j] + a52 * k2.v[j] + a53 * k3.v[j] +
                                a54 * k4.v[j]);
    envelopes(s, 3, t, h, &a, &b);
    cp_raman_generator_pairs(c, a, b, z.v, k5.v);
    for (int j = 0; j < CP_RAMAN_PAIRS; j++)
        z.v[j] = y->v[j] + h * (a61 * k1->v[j] + a62 * k2.v[j] + a63 * k3.v[j] +
                                a64 * k4.v[j] + a65 * k5.v[j]);
    envelopes(s, 4, t, h, &a, &b);
    cp_raman_generator_pairs(c, a, b, z.v, k6.v);
    for (int j = 0; j < CP_RAMAN_PAIRS; j++)
        ynew->v[j] = y->v[j] + h * (b1 * k1->v[j] + b3 * k3.v[j] + b4 * k4.v[j] +
                                    b5 * k5.v[j] + b6 * k6.v[j]);
    /* the node-1 envelopes serve the last stage and the next step's first */
    cp_raman_generator_pairs(c, a, b, ynew->v, dy7->v);
    for (int j = 0; j < CP_RAMAN_PAIRS; j++)
        e.v[j] = e1 * k1->v[j] + e3 * k3.v[j] + e4 * k4.v[j] + e5 * k5.v[j] + e6 * k6.v[j] +
                 e7 * dy7->v[j];
    double err = 0.0;
    for (int j = 0; j < CP_RAMAN_DIM; j++) {
        double x = fabs(e.d[j]);
        err = x > err ? x : err;
    }
    return err == err ? h * err / s->tol : NAN;
}

int cp_raman_dp_apply(cp_raman_dp *s, double *t, double t1, double y_out[])
{
    state y, k1, ynew, dy7;
    double a, b;
    memcpy(y.d, y_out, sizeof y.d);
    /* a call starts at a break point or a trace sample and ends at the next (raman.c), so the
     * slow losses are on or off throughout; the first stage is taken afresh with those rates,
     * since the generator may jump at a break point (where the slow losses switch) and the
     * last stage of the call before belongs to the left side */
    const cp_raman_rates c =
        cp_raman_rates_of(s->m, cp_raman_pulses_slow_on(s->pl, 0.5 * (*t + t1)));
    cp_raman_pulses_half(s->pl, *t, &a, &b);
    cp_raman_generator_pairs(&c, a, b, y.v, k1.v);
    int status = 0;
    const double hmin = 1e-14 * fmax(fabs(*t), fabs(t1)); /* below it: underflow */
    while (*t < t1) {
        double h = smaller(smaller(s->h, s->hmax), s->hstab), left = t1 - *t;
        int last = h >= left;
        if (last)
            h = left;
        if (!(h > hmin) && !last) {
            status = -1;
            break;
        }
        rec_prepare(s, *t, h);
        double err = cp_raman_dp_trial(s, &c, *t, h, &y, &k1, &ynew, &dy7);
        /* the controller's factor 0.9 err^(-1/5), computed only where it changes h */
        double factor = err > grow_err       ? 1.0
                        : err > grow_max_err ? safety * pow(err, -0.2)
                                             : grow_max;
        if (!(err <= 1.0)) { /* rejected (NaN too) */
            factor = err == err ? safety * pow(err, -0.2) : shrink_min;
            s->h = h * fmax(shrink_min, fmin(factor, safety));
            continue;
        }
        y = ynew;
        k1 = dy7;
        if (last)
            s->rec_ok = 0; /* the next step starts at t1 with another length */
        else
            rec_advance(s);
        *t = last ? t1 : *t + h;
        s->steps++;
        /* a shortened last step keeps the step size asked for before it (it can only grow
         * it), so a sliver of a step before a break point cannot shrink the next ones */
        if (factor >= grow_min)
            s->h = last ? fmax(s->h, h * smaller(factor, grow_max))
                        : h * smaller(factor, grow_max);
        else if (!last)
            s->h = h;
    }
    memcpy(y_out, y.d, sizeof y.d);
    return status;
}

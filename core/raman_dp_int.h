/*
 * Private to the Raman model: the explicit propagator of raman_dp.c, an embedded
 * Dormand-Prince 5(4) Runge-Kutta pair written out for the ten reals of the Lindblad state,
 * with the Gaussian envelopes carried from step to step by an exact multiplicative
 * recurrence instead of two exp() per evaluation.  Not installed.
 */
#ifndef COLDPREP_RAMAN_DP_INT_H
#define COLDPREP_RAMAN_DP_INT_H

#include <stddef.h>

#include "raman_gen_int.h"

/* State of the propagator between calls (on the caller's stack; no allocation). */
typedef struct cp_raman_dp {
    const cp_raman_model *m;
    const cp_raman_pulses *pl; /* &m->pulses */
    double tol;     /* absolute error allowed per step (max norm over the ten reals) */
    double h;       /* step size to try next, s */
    double hmax;    /* largest step, s (set per segment by the caller) */
    double hstab;   /* stability bound on the step, s */
    size_t steps;   /* accepted steps */
    /* envelope recurrence for Gaussian pulses (raman_dp.c), valid for step size hrec from
     * time trec, for pump and Stokes as one pair */
    int rec_ok;
    size_t rec_left;     /* steps it still serves, this one included */
    double hrec, trec;
    cp_raman_pair e;     /* half the envelopes at the start of the step, rad/s */
    cp_raman_pair p[5];  /* exp(-2 x c d) for the nodes c of the pair, x = (t - tc) / width */
    double k[5], q[5];   /* exp(-c^2 d^2), exp(-2 c d^2), d = step / width */
} cp_raman_dp;

/* Set up s for the model m (its pulses and generator, raman_gen_int.h); tol as above, hstart
 * the first step (s), hstab a bound on every step (s): 3.2 over the largest decay or rotation
 * rate of the constant part of the generator keeps the pair inside its stability region (its
 * boundary is near 3.3 on the real axis), so that the controller does not hover at the edge
 * of stability, where its error estimate is unreliable.  The number of steps grows with the
 * phase (limited by cp_raman_pulses_init) and the accuracy: 1e7 steps (1.3 s) were measured
 * at 3.5e5 rad and accuracy 1e-12; a tolerance below rounding ends in a step-size underflow
 * (an error), never a hang. */
void cp_raman_dp_init(cp_raman_dp *s, const cp_raman_model *m, double tol, double hstart,
                      double hstab);

/* Advance y (CP_RAMAN_DIM reals) from *t to t1 > *t with steps of at most s->hmax; *t is t1
 * on success.  No break point of the pulses may lie inside (*t, t1): the slow losses are
 * taken as on or off throughout.  Returns 0, or -1 when the step size underflows (then *t
 * and y hold the last accepted point). */
int cp_raman_dp_apply(cp_raman_dp *s, double *t, double t1, double y[]);

#endif

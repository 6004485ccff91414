/*
 * Private to the Raman model: the implicit propagator of raman_gauss.c, the three-stage
 * Gauss-Legendre collocation method for the linear system dy/dt = G(t) y of the ten reals of
 * the Lindblad state, with G(t) = G0 + a(t) Ga + b(t) Gb affine in the half Rabi frequencies
 * a = Omega_P/2 and b = Omega_S/2.  Not installed.
 */
#ifndef COLDPREP_RAMAN_GAUSS_INT_H
#define COLDPREP_RAMAN_GAUSS_INT_H

#include <stddef.h>
#include <stdint.h>

#include "fixed_lu_int.h"
#include "raman_gen_int.h"
#include "raman_int.h"

enum { CP_RAMAN_STAGES = 3 }; /* stages of the collocation method */

/* The generator's nonzero entries: G[row][col] = g0[slow] + a ga + b gb, slow = 1 inside
 * the transfer duration (the slow losses act) and 0 outside. */
typedef struct cp_raman_entry {
    uint16_t row, col;
    double g0[2], ga, gb;
} cp_raman_entry;

typedef struct cp_raman_affine {
    cp_raman_entry e[CP_RAMAN_DIM * CP_RAMAN_DIM];
    size_t n;
} cp_raman_affine;

/* Take the generator gen(ctx, a, b, slow, y, dy) apart (it is evaluated on unit vectors). */
typedef void (*cp_raman_gen_ab)(const void *ctx, double a, double b, int slow, const double y[],
                                double dy[]);
void cp_raman_affine_init(cp_raman_affine *g, cp_raman_gen_ab gen, const void *ctx);

/* State of the propagator between calls (on the caller's stack; no allocation). */
typedef struct cp_raman_gauss {
    const cp_raman_pulses *pl;
    const cp_raman_affine *gen;
    double tol;   /* error allowed over the transfer duration: the filtered estimate of a
                     step (max norm over the ten reals) times duration / h stays below it */
    double h;     /* step size to try next, s */
    double hmax;  /* largest step, s (set per segment by the caller) */
    size_t steps; /* accepted steps */
    cp_fixed_lu stages; /* the elimination plan of the stage equations (3 x 3 blocks) */
    cp_fixed_lu filter; /* and of the 10 x 10 filter of the error estimate */
    double estimate[CP_RAMAN_STAGES + 2]; /* weights of the error estimate (raman_gauss.c) */
    cp_block_row butcher_inv[CP_RAMAN_STAGES]; /* the inverse of the Butcher matrix */
    double dy0[CP_RAMAN_DIM]; /* derivative at the current time */
} cp_raman_gauss;

/* Set up s for the pulses pl and the generator gen; tol as above, hstart the first step (s). */
void cp_raman_gauss_init(cp_raman_gauss *s, const cp_raman_pulses *pl,
                         const cp_raman_affine *gen, double tol, double hstart);

/* Advance y (CP_RAMAN_DIM reals) from *t to t1 > *t with steps of at most s->hmax; *t is t1
 * on success.  No break point of the pulses may lie inside (*t, t1): the slow losses are
 * taken as on or off throughout.  Returns 0, or -1 when the step size underflows or a stage system cannot be
 * solved (then *t and y hold the last accepted point). */
int cp_raman_gauss_apply(cp_raman_gauss *s, double *t, double t1, double y[]);

#endif

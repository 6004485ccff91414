/*
 * Private to the Raman model: the generator of the Lindblad master equation of
 * docs/models/raman.md, shared by the explicit pair of raman_dp.c (which inlines it into its
 * stages) and raman.c (which takes it apart into the matrices of the collocation method).
 * The state is the 3x3 density matrix as 9 reals and the sink population, as five pairs of
 * doubles (rho_11, rho_22), (rho_33, sink), rho_12, rho_13, rho_23 (real and imaginary
 * parts).  Not installed.
 */
#ifndef COLDPREP_RAMAN_GEN_INT_H
#define COLDPREP_RAMAN_GEN_INT_H

#include <string.h>

#include "raman_int.h"

/* Where each real of the state is: the populations, the sink, and the real and imaginary
 * parts of the coherences, so that each coherence is one pair (see cp_raman_pair). */
enum {
    CP_RAMAN_R11, CP_RAMAN_R22, CP_RAMAN_R33, CP_RAMAN_LOST, CP_RAMAN_X12, CP_RAMAN_J12,
    CP_RAMAN_X13, CP_RAMAN_J13, CP_RAMAN_X23, CP_RAMAN_J23, CP_RAMAN_DIM
};

/* Two doubles as one register (SSE2 on x86-64, NEON on arm64): GCC's and Clang's vector
 * extension.  The state is five such pairs for the arithmetic of raman_dp.c. */
typedef double cp_raman_pair __attribute__((vector_size(2 * sizeof(double))));
enum { CP_RAMAN_PAIRS = CP_RAMAN_DIM / 2 };

/* The constant parts of the generator. */
typedef struct cp_raman_model {
    cp_raman_pulses pulses;
    double delta_1, delta_2; /* one- and two-photon detuning, rad/s */
    double k[3];             /* decay of the amplitudes: gamma_1/2, gamma/2, gamma_3/2 */
    double feed1, feed3;     /* rate into |1>, |3> from rho_22 (branching) */
    double kappa12, kappa13, kappa23; /* dephasing of the coherences, 1/s */
} cp_raman_model;

/* The rates of the generator with the slow losses of |1> and |3> switched on or off (they
 * act only over the transfer duration), 1/s. */
typedef struct cp_raman_rates {
    double e2, e3;        /* energies of |2>, |3> in the rotating frame */
    double l1, l2, l3;    /* population decay: -2 k_i */
    double feed1, feed3;  /* into |1>, |3> from rho_22 */
    double g12, g13, g23; /* damping of the coherences */
    double s1, s2, s3;    /* into the sink from rho_11, rho_22, rho_33 */
} cp_raman_rates;

static inline cp_raman_rates cp_raman_rates_of(const cp_raman_model *m, int slow)
{
    double k1 = slow ? m->k[0] : 0.0, k2 = m->k[1], k3 = slow ? m->k[2] : 0.0;
    return (cp_raman_rates){
        .e2 = -m->delta_1, .e3 = -m->delta_2, .l1 = -2 * k1, .l2 = -2 * k2, .l3 = -2 * k3,
        .feed1 = m->feed1, .feed3 = m->feed3, .g12 = k1 + k2 + m->kappa12,
        .g13 = k1 + k3 + m->kappa13, .g23 = k2 + k3 + m->kappa23, .s1 = 2 * k1,
        /* what leaves |2> other than by branching */
        .s2 = 2 * k2 - m->feed1 - m->feed3, .s3 = 2 * k3};
}

/* d rho/dt = -i [H, rho] - {K, rho} + feeding from rho_22 - kappa o rho (off-diagonal) for
 * H real symmetric (rotating frame); a, b are the half Rabi frequencies of pump and Stokes
 * (rad/s).  For the coherences w_ij = rho_ij as complex numbers this reads
 *   dw_12 = (-g12 + i e2) w_12 + i b w_13 + i a (rho_11 - rho_22),
 *   dw_13 = (-g13 + i e3) w_13 + i b w_12 - i a w_23,
 *   dw_23 = (-g23 + i (e3 - e2)) w_23 - i a w_13 + i b (rho_22 - rho_33),
 * which is how they are computed, each as one pair (re, im). */
static inline void cp_raman_generator_pairs(const cp_raman_rates *c, double a, double b,
                                            const cp_raman_pair y[], cp_raman_pair dy[])
{
    const double r11 = y[0][0], r22 = y[0][1], r33 = y[1][0];
    const cp_raman_pair w12 = y[2], w13 = y[3], w23 = y[4];
    const cp_raman_pair iw12 = {-w12[1], w12[0]}, iw13 = {-w13[1], w13[0]},
                        iw23 = {-w23[1], w23[0]};
    const double j12 = w12[1], j23 = w23[1];
    dy[0] = (cp_raman_pair){-2 * a * j12 + c->l1 * r11 + c->feed1 * r22,
                            2 * (a * j12 - b * j23) + c->l2 * r22};
    dy[1] = (cp_raman_pair){2 * b * j23 + c->l3 * r33 + c->feed3 * r22,
                            c->s2 * r22 + c->s1 * r11 + c->s3 * r33};
    dy[2] = -c->g12 * w12 + c->e2 * iw12 + b * iw13 + (cp_raman_pair){0.0, a * (r11 - r22)};
    dy[3] = -c->g13 * w13 + c->e3 * iw13 + b * iw12 - a * iw23;
    dy[4] = -c->g23 * w23 + (c->e3 - c->e2) * iw23 - a * iw13 +
            (cp_raman_pair){0.0, b * (r22 - r33)};
}

/* The same for the state as CP_RAMAN_DIM doubles. */
static inline void cp_raman_generator(const cp_raman_rates *c, double a, double b,
                                      const double y[], double dy[])
{
    cp_raman_pair yp[CP_RAMAN_PAIRS], dyp[CP_RAMAN_PAIRS];
    memcpy(yp, y, sizeof yp);
    cp_raman_generator_pairs(c, a, b, yp, dyp);
    memcpy(dy, dyp, sizeof dyp);
}

#endif

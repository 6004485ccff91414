/*
 * Private to the Raman model: the generator of the Lindblad master equation of
 * docs/models/raman.md, shared by the propagators of raman.c (GSL's drivers) and raman_dp.c
 * (the explicit pair, which inlines it into its stages).  The state is the 3x3 density
 * matrix as 9 reals (rho_11, rho_22, rho_33, Re/Im rho_12, rho_13, rho_23) and the sink
 * population.  Not installed.
 */
#ifndef COLDPREP_RAMAN_GEN_INT_H
#define COLDPREP_RAMAN_GEN_INT_H

#include "raman_int.h"

enum { CP_RAMAN_DIM = 10 };

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
    double e2, e3;             /* energies of |2>, |3> in the rotating frame */
    double l1, l2, l3;         /* population decay: -2 k_i */
    double feed1, feed3;       /* into |1>, |3> from rho_22 */
    double g12, g13, g23;      /* damping of the coherences */
    double s1, s2, s3;         /* into the sink from rho_11, rho_22, rho_33 */
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

/* d rho/dt = -i [H, rho] - {K, rho} + feeding from rho_22 - kappa o rho (off-diagonal),
 * written out for rho = R + iJ (R symmetric, J antisymmetric) and H real symmetric:
 * dR/dt = [H, J] and dJ/dt = -[H, R] for the coherent part; a, b are the half Rabi
 * frequencies of pump and Stokes (rad/s). */
static inline void cp_raman_generator(const cp_raman_rates *c, double a, double b,
                                      const double y[], double dy[])
{
    const double r11 = y[0], r22 = y[1], r33 = y[2];
    const double x12 = y[3], j12 = y[4], x13 = y[5], j13 = y[6], x23 = y[7], j23 = y[8];
    dy[0] = -2 * a * j12 + c->l1 * r11 + c->feed1 * r22;
    dy[1] = 2 * (a * j12 - b * j23) + c->l2 * r22;
    dy[2] = 2 * b * j23 + c->l3 * r33 + c->feed3 * r22;
    dy[3] = -c->e2 * j12 - b * j13 - c->g12 * x12;
    dy[4] = a * (r11 - r22) + c->e2 * x12 + b * x13 - c->g12 * j12;
    dy[5] = a * j23 - b * j12 - c->e3 * j13 - c->g13 * x13;
    dy[6] = b * x12 + c->e3 * x13 - a * x23 - c->g13 * j13;
    dy[7] = a * j13 + (c->e2 - c->e3) * j23 - c->g23 * x23;
    dy[8] = b * (r22 - r33) + (c->e3 - c->e2) * x23 - a * x13 - c->g23 * j23;
    dy[9] = c->s2 * r22 + c->s1 * r11 + c->s3 * r33;
}

#endif

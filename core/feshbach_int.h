/*
 * Private helpers shared by the Feshbach model's files (feshbach.c, feshbach_cloud.c,
 * feshbach_overlap.c, feshbach_spss.c): argument checks and the description of one cloud
 * in a harmonic trap in the local-density approximation.  Not installed.
 */
#ifndef COLDPREP_FESHBACH_INT_H
#define COLDPREP_FESHBACH_INT_H

#include "coldprep/feshbach.h"

cp_status cp_feshbach_check_resonance(const cp_feshbach_resonance *res, const char *ctx,
                                      cp_error *err);
cp_status cp_feshbach_check_mass(double mass, const char *ctx, const char *name,
                                 cp_error *err);

/* A validated cloud at temperature T, in scaled phase-space coordinates
 * rt_i = r_i / ell_i, pt_i = p_i / sqrt(m kB T), where the LDA occupation of the thermal
 * part is 1 / (exp(E - eta) + s), E = (|rt|^2 + |pt|^2)/2 (s = +1 Fermi, -1 Bose, 0 Boltzmann
 * with occupation exp(eta - E)). */
typedef struct cp_cloud_state {
    cp_feshbach_profile profile;
    double mass, number, temperature;
    double omega_bar;      /* geometric mean trap frequency, rad/s */
    double ell[3];         /* thermal lengths sqrt(kB T / (m omega_i^2)), m */
    double sag;            /* centre position along z, -g / omega_z^2, m */
    double eta;            /* ln fugacity of the thermal part */
    double n_condensed;    /* ideal-gas condensate number (BOSE), else 0 */
    double theta[3];       /* kB T / (hbar omega_i): condensate Wigner width parameter */
    double mu_tf;          /* Thomas–Fermi chemical potential, J (THOMAS_FERMI) */
    double radius[3];      /* Thomas–Fermi radii, m (THOMAS_FERMI) */
} cp_cloud_state;

/* Validate `c` (named `name` in messages) and fill *s.  allow_mask: bit (1 << profile) set
 * for each profile the caller supports.  T in (0, 1e-3] K unless THOMAS_FERMI. */
cp_status cp_cloud_prepare(const cp_feshbach_cloud *c, double temperature, const char *ctx,
                           const char *name, unsigned allow_mask, cp_cloud_state *s,
                           cp_error *err);

/* Phase-space occupation of the cloud at scaled squared radii r2 = |rt|^2 (per axis given
 * as rt[3]) and pt[3]; includes the ideal condensate of a BOSE cloud. */
double cp_cloud_occupation(const cp_cloud_state *s, const double rt[3], const double pt[3]);

/* Number density of the cloud at position r (m, relative to its own centre), m^-3, for the
 * THERMAL, FERMI and THOMAS_FERMI profiles (a BOSE profile is not implemented: NaN and
 * *status = CP_EINVAL).  Sets *status to CP_ENUMERIC if a GSL special function fails. */
double cp_cloud_density(const cp_cloud_state *s, const double r[3], cp_status *status);

/* The overlap integral (1/N_b) Int n_a n_b d^3r by numerical quadrature for any pair of
 * prepared clouds (feshbach_overlap.c); exposed so tests can check it against the closed
 * form for Gaussians. */
cp_status cp_feshbach_overlap_numeric(const cp_cloud_state *a, const cp_cloud_state *b,
                                      double *overlap, cp_error *err);

/* efficiency[i] = max_efficiency (1 - exp(-coefficient/|rates[i]|)) for validated inputs
 * (feshbach_kernel.c, compiled for vectorisation). */
void cp_feshbach_ramp_kernel(double coefficient, double max_efficiency,
                             const double *restrict rates, double *restrict efficiency,
                             size_t n);

/* Local pairing fraction of the SPSS model (feshbach_spss.c): the fraction of minority
 * atoms that find an unused partner in their phase-space cell when a cell holds on average
 * x partners and y minority atoms (random-order greedy pairing, mean-field kinetics). */
double cp_spss_local_pairing(double x, double y);

#endif

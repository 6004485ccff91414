/*
 * Private helpers shared by the Feshbach model's files (feshbach.c, feshbach_cloud.c,
 * feshbach_overlap.c, feshbach_spss.c): argument checks and the description of one cloud
 * in a harmonic trap in the local-density approximation.  Not installed.
 */
#ifndef COLDPREP_FESHBACH_INT_H
#define COLDPREP_FESHBACH_INT_H

#include "coldprep/feshbach.h"
#include "thermo_int.h"

cp_status cp_feshbach_check_resonance(const cp_feshbach_resonance *res, const char *ctx,
                                      cp_error *err);
cp_status cp_feshbach_check_mass(double mass, const char *ctx, const char *name,
                                 cp_error *err);

/* A validated cloud at temperature T, in scaled phase-space coordinates
 * rt_i = r_i / ell_i, pt_i = p_i / sqrt(m kB T), where the LDA occupation of the thermal
 * part is 1 / (exp(E - eta) + s), E = (|rt|^2 + |pt|^2)/2 (s = +1 Fermi, -1 Bose, 0 Boltzmann
 * with occupation exp(eta - E)).  A BOSE cloud below T_c is the saturated ideal thermal
 * part (eta = 0) plus a Thomas–Fermi condensate of n_condensed atoms (feshbach_cloud.c). */
typedef struct cp_cloud_state {
    cp_feshbach_profile profile;
    double mass, number, temperature;
    double omega_bar;      /* geometric mean trap frequency, rad/s */
    double ell[3];         /* thermal lengths sqrt(kB T / (m omega_i^2)), m */
    double sag;            /* centre position along z, -g / omega_z^2, m */
    double eta;            /* ln fugacity of the thermal part */
    double n_condensed;    /* condensate number N0 (BOSE below T_c), else 0 */
    double mu_tf;          /* Thomas–Fermi chemical potential, J (THOMAS_FERMI; BOSE, N0 > 0) */
    double radius[3];      /* Thomas–Fermi radii, m (idem) */
    double peak_tf;        /* condensate peak density 15 N0 / (8 pi Rx Ry Rz), m^-3 (idem) */
    double u_tf;           /* BOSE: mu_tf / kB T, where the condensate ends in u = V / kB T */
    cp_polylog_plan li32;  /* BOSE: g_{3/2} = Li_{3/2} for the thermal density */
} cp_cloud_state;

/* Validate `c` (named `name` in messages) and fill *s.  allow_mask: bit (1 << profile) set
 * for each profile the caller supports.  T in (0, 1e-3] K unless THOMAS_FERMI. */
cp_status cp_cloud_prepare(const cp_feshbach_cloud *c, double temperature, const char *ctx,
                           const char *name, unsigned allow_mask, cp_cloud_state *s,
                           cp_error *err);

/* Phase-space occupation of the thermal part of the cloud at scaled position rt[3] and
 * momentum pt[3] (a BOSE cloud's condensate is not included: feshbach_spss.c treats it). */
double cp_cloud_occupation(const cp_cloud_state *s, const double rt[3], const double pt[3]);

/* Number density of the cloud at position r (m, relative to its own centre), m^-3, for
 * every profile (BOSE: thermal part plus condensate).  Sets *status to CP_ENUMERIC if a GSL
 * special function fails. */
double cp_cloud_density(const cp_cloud_state *s, const double r[3], cp_status *status);

/* The density of a cloud as a function of its scaled potential u = sum_i ((r_i - c_i) /
 * L_i)^2, c = (0, 0, sag) (feshbach_profile.c): a closed form, for FERMI a Chebyshev table
 * of F_{1/2}(eta - u) built once, for BOSE g_{3/2}(e^(eta - u)) plus the condensate.  Plain
 * data, no pointers: lives on the caller's stack (about 18 kB). */
enum { CP_PROFILE_PANELS = 128, CP_PROFILE_ORDER = 16, CP_PROFILE_BREAKS = 12,
       CP_PROFILE_SERIES = 56 };
typedef struct cp_cloud_profile {
    cp_feshbach_profile kind;
    double length[3];  /* L_i, m */
    double centre;     /* z of the cloud's centre (its sag), m */
    double amplitude;  /* density prefactor, m^-3 */
    double eta;        /* FERMI: ln fugacity */
    double u_max;      /* beyond it the density is zero (TF) or below e^-45 of its peak */
    double u_core;     /* the bulk of the cloud: u <= u_core (TF: 1; else e^-4 of the peak or
                          of the Fermi-surface density) */
    int nbreak;        /* levels of u where the profile changes character (FERMI) */
    double u_break[CP_PROFILE_BREAKS];
    int npanel;        /* FERMI: Chebyshev panels of width 2 in x = eta - u over [x_lo, eta] */
    double x_lo;
    double coef[CP_PROFILE_PANELS][CP_PROFILE_ORDER];
    double peak_tf;    /* BOSE: condensate peak density, m^-3 (0 above T_c) */
    double u_tf;       /* BOSE: the condensate's edge in u */
    cp_polylog_plan li32;                /* BOSE: Li_{3/2} for z > 1/2 */
    double inv_k32[CP_PROFILE_SERIES];   /* BOSE: k^(-3/2), the series for z <= 1/2 */
} cp_cloud_profile;

/* Fill *p from a prepared cloud.  CP_ENUMERIC if GSL fails,
 * CP_ENOCONV if a FERMI cloud is too degenerate for the table (eta > 2 CP_PROFILE_PANELS
 * - 8, T/T_F below ~0.004): the caller then uses the adaptive quadrature.  No cp_error:
 * every failure is handled by the caller's fallback. */
cp_status cp_cloud_profile_init(const cp_cloud_state *s, cp_cloud_profile *p);

/* Density at scaled potential u >= 0, m^-3. */
double cp_cloud_profile_density(const cp_cloud_profile *p, double u);

/* The overlap integral (1/N_b) Int n_a n_b d^3r of two prepared clouds
 * (feshbach_overlap.c): cp_feshbach_overlap_fixed, else cp_feshbach_overlap_adaptive.
 * Relative accuracy ~1e-7. */
cp_status cp_feshbach_overlap_numeric(const cp_cloud_state *a, const cp_cloud_state *b,
                                      double *overlap, cp_error *err);

/* The fast path (feshbach_overlap.c): the spherical rule below at successive sizes
 * (12, 16, 6), (16, 24, 8), (24, 36, 12), accepted when two agree to 1e-8 relative (with a
 * Bose cloud's cusp, condensed or near T_c: to 1e-6, with (32, 48, 16) added), about
 * one cloud's centre and then the other's; CP_OK and *overlap, else CP_ENOCONV and NaN
 * (rule sizes disagree, a Fermi cloud too degenerate for its table, or neither centre sees
 * the other cloud's core in a cone of >= 30 degrees).  No cp_error: its caller falls
 * back. */
cp_status cp_feshbach_overlap_fixed(const cp_cloud_state *a, const cp_cloud_state *b,
                                    double *overlap);

/* The reference: nested GSL adaptive Gauss–Kronrod quadrature (relative tolerances 1e-7
 * outer, 1e-8, 1e-9 inner) in Cartesian coordinates (feshbach_overlap.c); ~0.1 s per call.
 * The fallback of cp_feshbach_overlap_numeric and the tests' reference. */
cp_status cp_feshbach_overlap_adaptive(const cp_cloud_state *a, const cp_cloud_state *b,
                                       double *overlap, cp_error *err);

/* Rule sizes of the fixed spherical quadrature: Gauss–Legendre points per radial panel,
 * in cos(theta), and midpoint-rule points in phi over [0, pi/2]. */
typedef struct cp_overlap_rule {
    int radial, polar, azimuthal;
} cp_overlap_rule;

/* The overlap integral (without the 1/N_b) with one fixed rule (feshbach_overlap_rule.c),
 * in spherical coordinates about the centre of the sharper cloud c (scaled by its own L),
 * the other cloud o entering along each ray through its quadratic scaled potential; the
 * radial panels end where either profile changes character or ends.  Sizes up to
 * CP_OVERLAP_MAX_POINTS each; no allocation. */
enum { CP_OVERLAP_MAX_POINTS = 64 };
double cp_feshbach_overlap_rule(const cp_cloud_profile *c, const cp_cloud_profile *o,
                                cp_overlap_rule rule);

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

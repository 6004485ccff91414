/*
 * coldprep — Feshbach magnetoassociation: the scattering length near an isolated s-wave
 * resonance, the binding energy of the Feshbach molecule (universal, mean-scattering-length
 * corrected and closed-channel linear forms), Landau–Zener association of two atoms in one
 * harmonic trap site and of a bulk mixture (the Hodby et al. ramp-rate law), the
 * phase-space-density ceiling of the conversion (stochastic phase-space sampling), the
 * density overlap of two clouds in a harmonic trap with differential gravitational sag,
 * and the energy released by a dissociation ramp.
 *
 * Units are SI: fields in T, ramp rates in T/s, lengths in m, masses in kg, energies in J,
 * densities in m^-3, trap frequencies in rad/s.  Sign convention (docs/models/feshbach.md): the
 * resonance is described by a(B) = abg (1 - width/(B - b0)) with dmu > 0 and
 * abg * width > 0, so the molecular (bound-state) side is B < b0.  Every function returns
 * a cp_status, writes its results through out-parameters (poisoned with NaN on error) and
 * fills the caller's cp_error (may be NULL).  Nothing is allocated that the caller owns.
 */
#ifndef COLDPREP_FESHBACH_H
#define COLDPREP_FESHBACH_H

#include <stddef.h>

#include "coldprep/status.h"

#ifdef __cplusplus
extern "C" {
#endif

/* One isolated interspecies resonance. */
typedef struct cp_feshbach_resonance {
    double b0;     /* resonance position, T: (0, 100] */
    double width;  /* Delta, T: 0 < |width| <= 10, abg * width > 0 */
    double abg;    /* background scattering length, m: 0 < |abg| <= 1e-6 */
    double dmu;    /* differential magnetic moment of the closed channel, J/T: (0, 20 muB] */
    double c6_au;  /* atom-atom C6 of the pair, atomic units: 0 = unknown, else (0, 1e6] */
} cp_feshbach_resonance;

/* Scattering length a(B) = abg (1 - width/(B - b0)) (Moerdijk et al., PRA 51, 4852 (1995)).
 * field in (0, 100] T; a field within 1e-12 T of b0 is CP_EINVAL (the pole). */
cp_status cp_feshbach_scattering_length(const cp_feshbach_resonance *res, double field,
                                        double *a, cp_error *err);

/* Mean scattering length abar = [2 pi / Gamma(1/4)^2] (2 mu C6/hbar^2)^(1/4)
 * (Gribakin & Flambaum, PRA 48, 546 (1993)).  mu: reduced mass in kg, c6_au > 0. */
cp_status cp_feshbach_mean_scattering_length(double c6_au, double mu, double *abar,
                                             cp_error *err);

typedef enum cp_feshbach_model {
    CP_FESHBACH_AUTO = 0,      /* choose by a against max(abar, R*), see binding_energy */
    CP_FESHBACH_UNIVERSAL = 1, /* hbar^2 / (2 mu a^2) */
    CP_FESHBACH_CORRECTED = 2, /* hbar^2 / (2 mu (a - abar)^2) */
    CP_FESHBACH_LINEAR = 3     /* dmu |B - b0| (closed-channel dominated) */
} cp_feshbach_model;

/* The name of a model: "auto", "universal", "corrected", "linear". */
const char *cp_feshbach_model_name(cp_feshbach_model model);

/* Validity flags of a binding energy (bits of cp_feshbach_binding.flags). */
enum {
    /* 0 < a < abar where the linear form does not take over (a universal form used, or
     * s_res >= 1): the state is no longer a halo molecule and no form here describes it */
    CP_FESHBACH_FLAG_BELOW_ABAR = 1u,
    /* a <= 0: the field is past the zero crossing B0 + Delta of the scattering length; only
     * the linear extrapolation is left, and it ignores the background bound state */
    CP_FESHBACH_FLAG_PAST_ZERO = 2u,
    /* the linear (closed-channel) form used on an open-channel-dominated resonance,
     * s_res >= 1, where it is not meant to hold */
    CP_FESHBACH_FLAG_LINEAR_BROAD = 4u
};

typedef struct cp_feshbach_binding {
    double energy;           /* binding energy E_b > 0, J */
    double a;                /* scattering length at the field, m */
    double abar;             /* mean scattering length, m (NaN when c6_au = 0) */
    double rstar;            /* R* = hbar^2 / (2 mu abg dmu width), m */
    double s_res;            /* resonance strength abar / R* (NaN when c6_au = 0) */
    cp_feshbach_model model; /* the model used (never AUTO) */
    unsigned flags;          /* CP_FESHBACH_FLAG_* bits: outside the model's stated range */
} cp_feshbach_binding;

/* Binding energy of the Feshbach molecule at `field` (molecular side, B < b0).
 * mu: reduced mass of the pair, kg, in [0.5, 500] u.  With CP_FESHBACH_AUTO the corrected
 * form (universal if c6_au = 0) is used where a > 2 abar + R*, the linear form elsewhere
 * (rule documented in docs/models/feshbach.md).  A forced model outside its domain
 * (a <= 0 for universal, a <= abar for corrected, c6_au = 0 for corrected) is CP_EINVAL. */
cp_status cp_feshbach_binding_energy(const cp_feshbach_resonance *res, double mu, double field,
                                     cp_feshbach_model model, cp_feshbach_binding *out,
                                     cp_error *err);

/* Landau–Zener probability 1 - exp(-2 pi delta) for delta in [0, 1e12]. */
cp_status cp_feshbach_lz_probability(double delta, double *probability, cp_error *err);

/* Theoretical ramp-rate-law coefficient alpha = 4 pi^2 hbar / mu (m^2/s) for the density
 * convention n = partner density averaged over the minority cloud (docs/models/feshbach.md). */
cp_status cp_feshbach_alpha(double mu, double *alpha, cp_error *err);

/* A bulk field ramp across the resonance. */
typedef struct cp_feshbach_ramp {
    double ramp_rate;      /* dB/dt, T/s; only |ramp_rate| matters: 1e-6 <= |.| <= 1e9 */
    double density;        /* partner density in the convention of alpha, m^-3: (0, 1e24] */
    double alpha;          /* m^2/s; 0 = theory (cp_feshbach_alpha), else (0, 1e3] */
    double max_efficiency; /* ceiling P_max in (0, 1] */
} cp_feshbach_ramp;

/* Ramp-rate law P = P_max (1 - exp(-alpha n |abg width / ramp_rate|)) (Hodby et al., PRL 94,
 * 120402 (2005)).  delta is the Landau–Zener parameter, 2 pi delta = alpha n |abg width/Bdot|. */
cp_status cp_feshbach_associate(const cp_feshbach_resonance *res, double mu,
                                const cp_feshbach_ramp *ramp, double *efficiency,
                                double *delta, cp_error *err);

/* The ramp-rate law over an array: efficiency[i] = P_max (1 - exp(-coefficient/|rate[i]|))
 * with coefficient = alpha n |abg width| in T/s, (0, 1e30]; every 1e-6 <= |rate| <= 1e9 T/s
 * as in cp_feshbach_associate (else CP_EINVAL naming the element, counted from 1 as in Lua, and
 * every output NaN).  n may be 0.  The loop is written to run at > 1e8 evaluations/s. */
cp_status cp_feshbach_ramp_law(double coefficient, double max_efficiency, const double *rates,
                               double *efficiency, size_t n, cp_error *err);

/* Two atoms in the ground state of one harmonic site swept at ramp_rate (T/s):
 * 2 pi delta = (4 pi^2 hbar |abg width| / (mu |Bdot|)) |psi_rel(0)|^2,
 * |psi_rel(0)|^2 = (mu/(pi hbar))^(3/2) sqrt(wx wy wz) (docs/models/feshbach.md); omega_rel are
 * the relative-motion frequencies, rad/s, each in [1e-2, 2 pi x 10 MHz]. */
cp_status cp_feshbach_associate_site(const cp_feshbach_resonance *res, double mu,
                                     double ramp_rate, const double omega_rel[3],
                                     double max_efficiency, double *efficiency, double *delta,
                                     cp_error *err);

/* Statistics of a cloud, and its density profile for the overlap. */
typedef enum cp_feshbach_profile {
    CP_PROFILE_THERMAL = 0,      /* Boltzmann (Gaussian) */
    CP_PROFILE_FERMI = 1,        /* ideal Fermi gas, Fermi–Dirac in the local-density approx. */
    CP_PROFILE_BOSE = 2,         /* Bose gas in LDA: ideal thermal part; below T_c the ideal-gas
                                    fraction N0 = N (1 - (T/T_c)^3) as a Thomas–Fermi
                                    condensate (needs scattering_length) */
    CP_PROFILE_THOMAS_FERMI = 3  /* pure interacting condensate, Thomas–Fermi (overlap only) */
} cp_feshbach_profile;

/* One cloud in a harmonic trap (gravity along -z). */
typedef struct cp_feshbach_cloud {
    cp_feshbach_profile profile;
    double number;        /* atom number, [1, 1e10] */
    double mass;          /* kg, [0.5, 500] u */
    double omega[3];      /* trap frequencies x, y, z, rad/s, [1e-2, 2 pi x 1 MHz] */
    double scattering_length; /* own s-wave scattering length, m, (0, 1e-6]: THOMAS_FERMI, and
                                 BOSE below T_c (0 = not given, allowed above T_c) */
} cp_feshbach_cloud;

/* Overlap density <n_a>_b = (1/N_b) Int n_a n_b d^3r of cloud a (the partner) seen by
 * cloud b, both at temperature T (K, [1e-12, 1e-3]; unused for THOMAS_FERMI), each sagging by
 * g/omega_z^2 below the common trap centre.  Any profile; a BOSE cloud below T_c without a
 * scattering length is CP_EINVAL.  Two THERMAL clouds use the closed form for
 * displaced Gaussians; any other pair is integrated numerically (a fixed product rule with
 * its own error estimate, ~1 ms; GSL adaptive quadrature where that rule declines, ~0.1 s;
 * relative accuracy ~1e-7 either way, ~1e-6 with a condensed Bose cloud, whose overlaps take
 * up to ~20 ms; docs/models/feshbach.md).
 * *sag is the differential sag (z_b - z_a), m.  Result in m^-3. */
cp_status cp_feshbach_overlap_density(const cp_feshbach_cloud *a, const cp_feshbach_cloud *b,
                                      double temperature, double *overlap, double *sag,
                                      cp_error *err);

/* Stochastic phase-space sampling (Hodby et al. 2005): the fraction of the minority cloud b
 * that can pair with partners from cloud a.  Profiles THERMAL, FERMI or BOSE (as the cloud's
 * statistics); temperature T in [1e-12, 1e-3] K; gamma: phase-space cell in units of h^3
 * (0, 100]; samples in [100, 1e7]; seed any value.  Deterministic for a given seed.
 * The cell counting covers the thermal parts only; a condensed minority atom pairs with
 * probability min(1, n_a,c(r) / n_b,c(r)) with the partner's condensate instead
 * (feshbach_spss.c, docs/models/feshbach.md).  *std_error is the Monte Carlo standard error
 * of *p_max. */
typedef struct cp_feshbach_spss {
    double gamma;            /* cell volume / h^3 in relative phase space; default 0.38, the
                                value fitted by Hodby et al. (recalled [M]) kept as this
                                project's own choice for its own cell: a fit parameter
                                (docs/data.md, Model constants) */
    unsigned long seed;
    long samples;
    int include_sag;         /* 1: displace the clouds by their gravitational sag */
} cp_feshbach_spss;

cp_status cp_feshbach_max_efficiency(const cp_feshbach_cloud *a, const cp_feshbach_cloud *b,
                                     double temperature, const cp_feshbach_spss *opts,
                                     double *p_max, double *std_error, cp_error *err);

/* cp_feshbach_max_efficiency, polling *cancel (may be NULL) every 65536 samples: once it
 * is non-zero the outputs are NaN and CP_ECANCELED is returned. */
cp_status cp_feshbach_max_efficiency_cancellable(const cp_feshbach_cloud *a,
                                                 const cp_feshbach_cloud *b, double temperature,
                                                 const cp_feshbach_spss *opts, double *p_max,
                                                 double *std_error, const cp_cancel_flag *cancel,
                                                 cp_error *err);

/* cp_feshbach_max_efficiency_cancellable with a work estimate: when opts->samples times the
 * cost of a sample (measured on a 2020s desktop core: docs/api/feshbach.md) exceeds
 * max_seconds of CPU (> 0; +inf: no limit), nothing is sampled and CP_ETOOLONG is returned,
 * its message giving the estimate and the samples that would fit. */
cp_status cp_feshbach_max_efficiency_bounded(const cp_feshbach_cloud *a, const cp_feshbach_cloud *b,
                                             double temperature, const cp_feshbach_spss *opts,
                                             double *p_max, double *std_error,
                                             const cp_cancel_flag *cancel, double max_seconds,
                                             cp_error *err);

/* Dissociation by a ramp at rate ramp_rate (T/s) up across the resonance: the quasi-bound
 * molecule decays at Gamma(E)/hbar with Gamma(E) = 2 k abg dmu width; survival
 * exp(-(E/eps)^(3/2)) with eps = [3 hbar^2 |Bdot| / (4 |abg width| sqrt(2 mu))]^(2/3); mean
 * released relative kinetic energy = Gamma(5/3) eps.  Outputs in J. */
cp_status cp_feshbach_dissociation_energy(const cp_feshbach_resonance *res, double mu,
                                          double ramp_rate, double *energy, double *scale,
                                          cp_error *err);

#ifdef __cplusplus
}
#endif
#endif

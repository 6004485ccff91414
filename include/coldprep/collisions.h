/*
 * coldprep — collisions and losses of ultracold molecules: the Gribakin-Flambaum mean
 * scattering length, the centrifugal barrier on -C6/r^6, the universal two-body loss rate
 * coefficients (Idziaszek & Julienne, PRL 104, 113202 (2010)), the threshold elastic cross
 * section of polarised dipoles (Bohn, Cavagnero & Ticknor, NJP 11, 055039 (2009)), the
 * number and temperature of a thermal cloud during a hold with two-body loss (including
 * the anti-evaporation heating it causes), one-body loss and technical heating, and the
 * scaling-law trajectory of evaporative cooling with two-body loss.
 *
 * SI units; C6 in atomic units (E_h a0^6); `reduced_mass` is mu = m_a m_b / (m_a + m_b)
 * (M/2 for identical molecules of mass M).  Rate coefficients beta in m^3/s defined by
 * dn/dt = -beta n^2 (identical particles) or dn_a/dt = -beta n_a n_b.  Arrays are caller-
 * owned; nothing is allocated that outlives a call.
 */
#ifndef COLDPREP_COLLISIONS_H
#define COLDPREP_COLLISIONS_H

#include <stddef.h>

#include "coldprep/status.h"

#ifdef __cplusplus
extern "C" {
#endif

/* Exchange symmetry of the colliding pair. */
typedef enum cp_pair_statistics {
    CP_PAIR_BOSONS = 0,         /* identical bosons in one internal state */
    CP_PAIR_FERMIONS = 1,       /* identical fermions in one internal state */
    CP_PAIR_DISTINGUISHABLE = 2 /* different species or internal states */
} cp_pair_statistics;

/* Mean scattering length abar = [2 pi / Gamma(1/4)^2] (2 mu C6 / hbar^2)^(1/4), m
 * (Gribakin & Flambaum, PRA 48, 546 (1993)).  c6_au in (0, 1e9], reduced_mass in
 * (1e-28, 1e-22] kg. */
cp_status cp_collisions_mean_scattering_length(double c6_au, double reduced_mass,
                                               double *abar, cp_error *err);

/* Height (J) of the centrifugal barrier of partial wave l (in [1, 20]) on
 * V(r) = hbar^2 l(l+1)/(2 mu r^2) - C6/r^6: E_l = [hbar^2 l(l+1)]^{3/2} / (3 sqrt(6)
 * mu^{3/2} C6^{1/2}), at r*^4 = 6 mu C6 / (hbar^2 l(l+1)). */
cp_status cp_collisions_barrier(double c6_au, double reduced_mass, int l, double *energy,
                                cp_error *err);

/* Universal loss rate coefficient beta (m^3/s) at temperature T (K, in [1e-12, 1e-2]), unit
 * short-range loss probability (Idziaszek & Julienne 2010): s-wave 4 pi hbar abar g / mu
 * with g = 2 for identical bosons, 1 for distinguishable particles (T-independent);
 * p-wave for identical fermions 1513 abar^3 k_B T / h (thermal average). */
cp_status cp_collisions_universal_rate(double c6_au, double reduced_mass, double temperature,
                                       cp_pair_statistics stat, double *rate, cp_error *err);

/* Validity flags of the universal rate (bits of *flags of cp_collisions_universal_validity). */
enum {
    /* k_B T above a tenth of the p-wave barrier E_1: the threshold laws behind the universal
     * rates (s-wave constant, p-wave proportional to T) no longer hold */
    CP_COLLISIONS_FLAG_ABOVE_BARRIER = 1u
};

/* Where the universal rate at temperature T (K, in [1e-12, 1e-2]) stands against its range:
 * *barrier_fraction = k_B T / E_1 (E_1 the p-wave barrier, cp_collisions_barrier with l = 1)
 * and *flags = CP_COLLISIONS_FLAG_ABOVE_BARRIER when that exceeds 0.1 (common practice, no
 * source: "well below the barrier"), else 0.  Arguments as cp_collisions_universal_rate. */
cp_status cp_collisions_universal_validity(double c6_au, double reduced_mass, double temperature,
                                           unsigned *flags, double *barrier_fraction,
                                           cp_error *err);

/* Threshold (Born) elastic cross section (m^2) of two polarised dipoles with dipole
 * moment d (debye, in (0, 20]), dipole length D = mu d^2 / (4 pi eps0 hbar^2) (m):
 * identical fermions (32 pi/15) D^2, identical bosons (32 pi/45) D^2 (dipolar part only;
 * add 8 pi a^2 for a known s-wave scattering length), distinguishable (64 pi/45) D^2 (the
 * first Born approximation, Bohn, Cavagnero & Ticknor, NJP 11, 055039 (2009); the factors
 * checked by integrating the Born amplitude, docs/models/collisions.md).
 * Valid while the collision energy is far below hbar^2/(mu D^2) (the dipolar energy). */
cp_status cp_collisions_dipolar_cross_section(double dipole_debye, double reduced_mass,
                                              cp_pair_statistics stat, double *cross_section,
                                              double *dipole_length, cp_error *err);

/* Threshold dependence of a loss rate coefficient on temperature. */
typedef enum cp_loss_wave {
    CP_LOSS_S_WAVE = 0, /* beta independent of T (bosons, distinguishable) */
    CP_LOSS_P_WAVE = 1  /* beta proportional to T (identical fermions) */
} cp_loss_wave;

/* A hold of a thermal (non-degenerate) cloud in a harmonic trap. */
typedef struct cp_hold_params {
    double number;        /* N0, in [1, 1e12] */
    double temperature;   /* T0, K, in [1e-12, 1e-2] */
    double omega[3];      /* trap angular frequencies, rad/s, in [1e-2, 1e7] */
    double mass;          /* particle mass, kg */
    double rate;          /* two-body beta at T0, m^3/s, in [0, 1e-8] */
    cp_loss_wave wave;    /* how beta scales with T */
    double lifetime;      /* one-body lifetime, s, in (0, 1e9]; INFINITY: none */
    double heating_rate;  /* technical heating dT/dt, K/s, in [0, 1] */
    int anti_evaporation; /* 1: include the heating by density-dependent loss */
    double duration;      /* hold time, s, in (0, 1e5] */
} cp_hold_params;

/* N(t), T(t) at `points` times evenly spaced over [0, duration] (points in [2, 1e6]):
 *   dN/dt = -beta(T) <n> N - N/tau,   <n> = N (m omega_bar^2 / (4 pi k_B T))^{3/2}
 *   dT/dt = h beta(T) <n> T + heating_rate,   h = 1/4 (s-wave), 1/12 (p-wave)
 * (thermal cloud; dT/dt = beta <n> T/4: docs/models/collisions.md; the p-wave
 * value weights the lost pairs with their relative energy, derivation in
 * docs/models/collisions.md).  Integrated with GSL's rk8pd, relative tolerance 1e-10.
 * times, numbers, temperatures: caller-owned arrays of `points` values. */
cp_status cp_collisions_hold(const cp_hold_params *p, size_t points, double *times,
                             double *numbers, double *temperatures, cp_error *err);

/* cp_collisions_hold, polling *cancel (may be NULL) at every step of the integration:
 * once it is non-zero the outputs are poisoned and CP_ECANCELED is returned. */
cp_status cp_collisions_hold_cancellable(const cp_hold_params *p, size_t points, double *times,
                                         double *numbers, double *temperatures,
                                         const cp_cancel_flag *cancel, cp_error *err);

/* Ratio of elastic to loss collisions, sigma v_rel / beta, with the mean relative speed
 * v_rel = sqrt(16 k_B T / (pi m)) of identical particles of mass m (the per-particle
 * elastic rate <n> sigma v_rel over the loss rate beta <n>). */
cp_status cp_collisions_collision_ratio(double cross_section, double rate, double mass,
                                        double temperature, double *ratio, cp_error *err);

/* Evaporation rate of a truncated Boltzmann gas in a 3D harmonic trap at truncation eta =
 * U/k_B T (in [5, 30]), constant cross-section (A. J. Luiten, M. W. Reynolds & J. T. M.
 * Walraven, PRA 53, 381 (1996)):
 *   *ratio = Gamma_ev / Gamma_el = 2 e^{-eta} [eta - 4 P(4, eta) / P(3, eta)]
 * (-> 2 (eta - 4) e^{-eta} at large eta), P the regularised lower incomplete gamma
 * function.  Density convention: Gamma_el = <n> sigma v_rel, v_rel = sqrt(16 k_B T/(pi m)),
 * <n> = n0 / 2^{3/2} the mean density of the Gaussian cloud with the central density n0 =
 * N / V_e of the truncated one; *truncated_fraction = P(3, eta) = N / (n0 V_inf), so
 * <n> = N (m omega_bar^2 / (4 pi k_B T))^{3/2} / P(3, eta). */
cp_status cp_collisions_evaporation_rate(double eta, double *ratio, double *truncated_fraction,
                                         cp_error *err);

/* Evaporation at constant truncation parameter eta in a fixed harmonic trap, the scaling
 * model of W. Ketterle & N. J. van Druten, Adv. At. Mol. Opt. Phys. 37, 181 (1996): each
 * evaporated particle carries (eta + kappa) k_B T, particles evaporate at Gamma_ev = f
 * Gamma_el with f from cp_collisions_evaporation_rate (same density convention), each
 * particle lost by two-body loss carries epsilon k_B T (9/4 s-wave, 11/4 p-wave:
 * anti-evaporation); the ratio of elastic to loss collisions R = sigma v_rel / beta (both
 * rates at the same <n>) scales as T^{1/2} (s-wave loss) or T^{-1/2} (p-wave loss) at
 * fixed cross-section:
 *   d ln T / d ln N = [(eta + kappa - 3) r - (3 - epsilon)] / (3 (r + 1)),  r = f R. */
typedef struct cp_evaporation_params {
    double number;       /* N0, in [1, 1e12] */
    double temperature;  /* T0, K, in [1e-12, 1e-2] */
    double omega[3];     /* fixed trap angular frequencies, rad/s */
    double mass;         /* particle mass, kg */
    double eta;          /* truncation parameter U/k_B T, in [5, 30] */
    double kappa;        /* extra energy of an evaporated particle, k_B T, in [0, 2];
                            NAN: (eta - 5)/(eta - 4) */
    double ratio;        /* elastic/loss collision ratio R at T0, in (0, 1e12] */
    cp_loss_wave wave;   /* how the loss rate scales with T */
    double final_number; /* N at the end, in [1, N0) */
} cp_evaporation_params;

/* The trajectory at `points` values of N spaced evenly in ln N from N0 to final_number:
 * numbers, temperatures (K) and classical peak phase-space densities N (hbar omega_bar /
 * k_B T)^3 (caller-owned arrays of `points` values, points in [2, 1e5]); *efficiency =
 * -ln(PSD_final/PSD_0)/ln(N_final/N0) (> 0 means the phase-space density grows). */
cp_status cp_collisions_evaporation(const cp_evaporation_params *p, size_t points,
                                    double *numbers, double *temperatures,
                                    double *phase_space_densities, double *efficiency,
                                    cp_error *err);

/* The first points of that trajectory, up to and including the first point after N0 at or
 * below stop_temperature (K, >= 0; 0 never stops it): *filled points are written (>= 2
 * unless an error; all `points` when the temperature never falls that far), each bit for
 * bit the value cp_collisions_evaporation gives there, the others NaN.  What costs is the
 * integration, so a caller looking for where the trajectory reaches a temperature need not
 * integrate past it.  Errors as cp_collisions_evaporation (*filled = 0). */
cp_status cp_collisions_evaporation_until(const cp_evaporation_params *p, size_t points,
                                          double stop_temperature, double *numbers,
                                          double *temperatures, double *phase_space_densities,
                                          size_t *filled, cp_error *err);

/* The elapsed time (s) at each point of a trajectory (numbers, temperatures: `points`
 * values from cp_collisions_evaporation with the same p): dt = -d ln N / (<n> (f sigma v_rel
 * + beta(T))) with f and <n> of cp_collisions_evaporation_rate, v_rel = sqrt(16 k_B T /
 * (pi m)), beta(T) = loss_rate (s-wave) or loss_rate T / T0 (p-wave), by the trapezoid rule
 * in ln N; times[0] = 0.  cross_section in [0, 1e-8] m^2 and loss_rate in [0, 1e-8] m^3/s
 * (not both 0).  times are NaN on error. */
cp_status cp_collisions_evaporation_times(const cp_evaporation_params *p, double cross_section,
                                          double loss_rate, size_t points,
                                          const double *numbers, const double *temperatures,
                                          double *times, cp_error *err);

/* ---- rates of polar molecules under protection ------------------------------------------ */

/* Which long-range interaction the colliding molecules feel. */
typedef enum cp_shield_regime {
    CP_SHIELD_DC_3D = 0,     /* dc field below the shielding field, free space: the induced
                                dipoles attract head to tail (loss grows with the dipole) */
    CP_SHIELD_QUASI_2D = 1,  /* dc field along the tight axis of a pancake trap (1D lattice):
                                side-by-side repulsion shields the molecules */
    CP_SHIELD_MICROWAVE = 2, /* molecules in the upper dressed state of a blue-detuned,
                                circularly polarised microwave: the sign-reversed dipolar
                                interaction and a repulsive r^-6 core (coldprep/fields.h) */
    CP_SHIELD_DC_PAIR = 3    /* dc-field shielding: molecules in |1,0> near the field where
                                |1,0>|1,0> meets |0,0>|2,0>; the incoming pair's adiabat of
                                the two dipole-coupled pair states (repulsive above the
                                crossing) */
} cp_shield_regime;

/* Collisions of identical molecules (bosons or fermions in one internal state). */
typedef struct cp_shielded_params {
    cp_shield_regime regime;
    cp_pair_statistics stat; /* CP_PAIR_BOSONS or CP_PAIR_FERMIONS */
    double mass;             /* molecule mass M, kg, (1e-28, 1e-22] */
    double c6_au;            /* isotropic van der Waals C6 of the pair, a.u., (0, 1e9] */
    double temperature;      /* T, K, [1e-10, 1e-4] */
    double dipole;           /* dc regimes: induced lab-frame dipole, C m, [0, 20 D] */
    double axial_omega;      /* quasi-2D: angular frequency of the tight axis, rad/s,
                                [2 pi x 1 kHz, 2 pi x 1 MHz] */
    double c3;               /* microwave: C3 = d_eff^2 / (4 pi eps0), J m^3, > 0 */
    double c6_core;          /* microwave: scale C6 of the repulsive core, J m^6, > 0 */
    double mw_c3[4];         /* microwave: V = sum_n (mw_c3[n] / r^3 + mw_c6[n] / r^6) c^n, */
    double mw_c6[4];         /* c = cos^2 theta from the propagation axis (J m^3, J m^6) */
    double rabi;             /* microwave: Omega, rad/s, > 0 */
    double detuning;         /* microwave: Delta, rad/s (blue > 0 shields) */
    double dipole_permanent; /* microwave: body-frame dipole d, C m, (0, 20 D] */
    double stark_dipole[3][3]; /* dc pair: <J| d_z |J'> of the Stark states |J, 0>, J, J' =
                                  0, 1, 2 (cp_fields_dipole_matrix), C m, each in [-20, 20] D */
    double pair_gap;         /* dc pair: 2 E(1,0) - E(0,0) - E(2,0), J, |gap| <= 1e-19 J:
                                > 0 above the crossing (shielding), < 0 below it */
} cp_shielded_params;

#define CP_SHIELDED_NOTE_SIZE 200

typedef struct cp_shielded_result {
    double elastic_rate;  /* thermal <sigma v_rel>, m^3/s (quasi-2D: 3D-equivalent) */
    double loss_rate;     /* beta with dn/dt = -beta n^2, m^3/s (quasi-2D: 3D-equivalent
                             beta_2D sqrt(2 pi) a_z, a_z = sqrt(hbar / (M omega_z))) */
    double loss_rate_2d;  /* quasi-2D: beta_2D, m^2/s; NaN in 3D */
    double ratio;         /* elastic_rate / loss_rate */
    double cross_section; /* thermal mean elastic cross section <sigma v>/<v>, m^2 */
    double dipole_length; /* D = mu d^2 / (4 pi eps0 hbar^2) of the (effective) dipole, m */
    double inner_radius;  /* where the loss boundary sits, m */
    double pair_gap;      /* dc pair: the pair gap 2 E(1,0) - E(0,0) - E(2,0), J; NaN in the
                             other regimes */
    int valid;            /* 1: inside the model's stated validity range */
    const char *method;   /* static text naming the model */
    char note[CP_SHIELDED_NOTE_SIZE]; /* why valid = 0 (empty otherwise) */
} cp_shielded_result;

/* Elastic and loss rate coefficients of identical polar molecules at temperature T in the
 * given regime (docs/models/collisions.md has the models, their validity and the published
 * checks).  Loss: universal loss at short range (unit probability for what gets in), the
 * flux that gets in computed by Numerov integration of the lowest adiabatic channel(s) of
 * the long-range potential, thermally averaged by Gauss-Laguerre quadrature.  Elastic: the
 * dipolar cross section of the (effective) dipole (Born at low energy, semiclassical above
 * the dipole energy).  Results outside the validity range are returned with valid = 0 and
 * a note; CP_EINVAL for bad input (numbers poisoned, method NULL). */
cp_status cp_collisions_shielded(const cp_shielded_params *p, cp_shielded_result *r,
                                 cp_error *err);

/* A cache for callers that ask for the same molecules and protection at many temperatures
 * (a plan's stages, a sweep): it keeps the temperature-independent part of
 * cp_collisions_shielded (each channel's inner radius and potential on the radial grid)
 * and the dc shielding field of cp_collisions_protected, found by their inputs compared
 * bit for bit, so a result computed with the cache is bit for bit the result without it.
 * Owned by the caller, who frees it with cp_shielded_cache_free (NULL is a no-op); not
 * safe to share between threads (one per thread).  At most about 16 MB.  NULL from
 * _alloc when out of memory. */
typedef struct cp_shielded_cache cp_shielded_cache;
cp_shielded_cache *cp_shielded_cache_alloc(void);
void cp_shielded_cache_free(cp_shielded_cache *cache);

/* cp_collisions_shielded with a cache (NULL: none). */
cp_status cp_collisions_shielded_cached(const cp_shielded_params *p, cp_shielded_cache *cache,
                                        cp_shielded_result *r, cp_error *err);

/* The protection a plan gives its molecules, and the molecule itself.  The regime follows:
 * a microwave -> microwave shielding (no dc field allowed with it); an axial confinement
 * -> quasi-2D with the dipole the dc field induces (field along the tight axis); molecules
 * in |1,0> (rotational_j = 1; a dc field, free space) -> dc-field shielding
 * (CP_SHIELD_DC_PAIR), valid for d F / B in [CP_DC_SHIELD_MIN_REDUCED,
 * CP_DC_SHIELD_MAX_REDUCED] and flagged elsewhere; otherwise dc 3D with molecules in |0,0> (no field: the field-free
 * universal rates).  Ground-state molecules at 0.9 F_s and above are flagged (valid = 0):
 * such a field is meant for dc shielding, which needs molecules in |1,0>. */
#define CP_DC_SHIELD_MIN_REDUCED 3.25 /* d F / B: the shielding window of Gonzalez-Martinez, */
#define CP_DC_SHIELD_MAX_REDUCED 3.8  /* Bohn & Quemener, PRA 96, 032718 (2017) */
typedef struct cp_protection_params {
    double dipole;          /* body-frame dipole d, C m, (0, 20 D] */
    double rot_const_hz;    /* B/h, Hz */
    double c6_au;           /* van der Waals C6 of the pair, a.u. */
    double mass;            /* molecule mass, kg */
    cp_pair_statistics stat; /* identical bosons or fermions */
    double temperature;     /* K */
    double electric_field;  /* dc field, V/m, >= 0 (0: none) */
    int microwave;          /* 1: microwave dressing below */
    double rabi, detuning, ellipticity; /* rad/s, rad/s (blue > 0), rad */
    double axial_omega;     /* tight-axis angular frequency, rad/s; 0: free space (3D) */
    int rotational_j;       /* rotational state of the molecules: 0 for |0,0> (default), 1
                               for |1,0> (dc-field shielding; needs a field and free space) */
} cp_protection_params;

/* Rates for the protection p (cp_collisions_shielded after the field physics of
 * coldprep/fields.h: the induced dipole, the shielding field, the dressed C3 and C6).
 * *dipole_used receives the induced (dc) or effective (microwave) dipole, C m, and
 * *regime the regime chosen.  Errors as cp_collisions_shielded. */
cp_status cp_collisions_protected(const cp_protection_params *p, cp_shielded_result *r,
                                  double *dipole_used, cp_shield_regime *regime,
                                  cp_error *err);

/* cp_collisions_protected with a cache (NULL: none; see cp_shielded_cache_alloc). */
cp_status cp_collisions_protected_cached(const cp_protection_params *p,
                                         cp_shielded_cache *cache, cp_shielded_result *r,
                                         double *dipole_used, cp_shield_regime *regime,
                                         cp_error *err);

#ifdef __cplusplus
}
#endif
#endif

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

/* Threshold (Born) elastic cross section (m^2) of two polarised dipoles with dipole
 * moment d (debye, in (0, 20]), dipole length D = mu d^2 / (4 pi eps0 hbar^2) (m):
 * identical fermions (32 pi/15) D^2, identical bosons (32 pi/45) D^2 (dipolar part only;
 * add 8 pi a^2 for a known s-wave scattering length), distinguishable (64 pi/45) D^2.
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
 * (thermal cloud; dT/dt = beta <n> T/4: ../shared/reference/physics.md §8; the p-wave
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

/* Evaporation at constant truncation parameter eta in a fixed harmonic trap, the scaling
 * model of W. Ketterle & N. J. van Druten, Adv. At. Mol. Opt. Phys. 37, 181 (1996): each
 * evaporated particle carries (eta + kappa) k_B T, evaporation occurs in a fraction
 * eta e^{-eta}/sqrt(2) of the elastic collisions, each particle lost by two-body loss
 * carries epsilon k_B T (9/4 s-wave, 11/4 p-wave: anti-evaporation); the ratio of elastic
 * to loss collisions R scales as T^{1/2} (s-wave loss) or T^{-1/2} (p-wave loss) at fixed
 * cross-section:
 *   d ln T / d ln N = [(eta + kappa - 3) r - (3 - epsilon)] / (3 (r + 1)),  r = R/lambda,
 *   lambda = sqrt(2) e^eta / eta.                                                       */
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

#ifdef __cplusplus
}
#endif
#endif

/*
 * coldprep — ideal quantum gases in a three-dimensional harmonic trap and in an optical
 * lattice with a harmonic envelope: degeneracy (T/T_F, T/T_c, condensed fraction),
 * fugacity, chemical potential, energy, entropy, peak density, density profile, cloud size
 * after time of flight, the inverses (T from T/T_F, T/T_c or the entropy), and entropy
 * matching between two confinements (the temperature after an adiabatic change of trap).
 *
 * Semiclassical (k_B T, E_F >> hbar omega) and local-density approximation; exact
 * polylogarithm / Fermi-Dirac-integral expressions between the degenerate and classical
 * limits (D. A. Butts & D. S. Rokhsar, PRA 55, 4346 (1997); F. Dalfovo et al., RMP 71,
 * 463 (1999)).  Fermions are one spin component (molecules in one internal state).  SI
 * units; trap frequencies angular (rad/s); entropies in units of k_B.  All structs are
 * plain values owned by the caller; nothing is allocated that outlives a call.
 */
#ifndef COLDPREP_THERMO_H
#define COLDPREP_THERMO_H

#include <stddef.h>

#include "coldprep/species.h"
#include "coldprep/status.h"

#ifdef __cplusplus
extern "C" {
#endif

/* A harmonically trapped gas: particle number, the three trap angular frequencies and
 * the particle mass.  An isotropic trap of geometric-mean frequency omega_bar is
 * omega = {omega_bar, omega_bar, omega_bar}: every trap-integrated quantity depends on
 * omega_bar = (omega_x omega_y omega_z)^(1/3) only; profiles and sizes need all three. */
typedef struct cp_thermo_trap {
    double number;    /* N, in [1, 1e12] */
    double omega[3];  /* omega_x, omega_y, omega_z, rad/s, each in [1e-2, 1e7] */
    double mass;      /* particle mass, kg, in (1e-30, 1e-21] */
} cp_thermo_trap;

/* The state of a trapped Fermi gas (one component). */
typedef struct cp_thermo_fermi_result {
    double temperature;          /* T, K */
    double fermi_temperature;    /* T_F = hbar omega_bar (6N)^(1/3) / k_B, K */
    double t_over_tf;            /* T / T_F */
    double fugacity;             /* z = exp(mu / k_B T) (may be large: see log_fugacity) */
    double log_fugacity;         /* mu / k_B T */
    double chemical_potential;   /* mu, J */
    double energy_per_particle;  /* E/N, J (from the trap bottom; kinetic + potential) */
    double entropy_per_particle; /* S/(N k_B) */
    double peak_density;         /* n(0), m^-3 */
    double phase_space_density;  /* n(0) lambda_dB^3 */
} cp_thermo_fermi_result;

/* The state of a trapped ideal Bose gas.  Below T_c the thermal component has z = 1 and
 * peak_density / phase_space_density are those of the thermal component; the condensate
 * is the ideal-gas ground state of the trap. */
typedef struct cp_thermo_bose_result {
    double temperature;            /* T, K */
    double critical_temperature;   /* T_c = hbar omega_bar (N/zeta(3))^(1/3) / k_B, K */
    double t_over_tc;              /* T / T_c */
    double condensed_fraction;     /* N0/N = 1 - (T/T_c)^3 below T_c, else 0 */
    double fugacity;               /* z, 1 below T_c */
    double chemical_potential;     /* mu = k_B T ln z, J (0 below T_c) */
    double energy_per_particle;    /* E/N, J */
    double entropy_per_particle;   /* S/(N k_B) */
    double peak_density;           /* thermal peak density Li_{3/2}(z)/lambda^3, m^-3 */
    double phase_space_density;    /* thermal peak phase-space density Li_{3/2}(z) */
    double condensate_peak_density;/* N0 / (pi^{3/2} a_x a_y a_z), a_i = sqrt(hbar/m w_i) */
} cp_thermo_bose_result;

/* Fill an isotropic trap.  No validation (the model functions validate). */
void cp_thermo_trap_isotropic(cp_thermo_trap *trap, double number, double omega_bar,
                              double mass);

/* Geometric-mean trap frequency (omega_x omega_y omega_z)^(1/3), rad/s. */
double cp_thermo_omega_bar(const cp_thermo_trap *trap);

/* Fermi gas at temperature T (K, in [1e-12, 1]) with T/T_F in [0.002, 1e8] (below 0.002 the
 * fugacity overflows a double; the gas is then in the Sommerfeld regime).  Solves
 * N = (k_B T / hbar omega_bar)^3 F_2(mu/k_B T) by Newton's method.  CP_EINVAL for bad
 * input, CP_ENOCONV / CP_ENUMERIC if the solve fails; the result is NaN on error. */
cp_status cp_thermo_fermi(const cp_thermo_trap *trap, double temperature,
                          cp_thermo_fermi_result *out, cp_error *err);

/* The inverse: the Fermi gas at a given T/T_F in [0.002, 1e8]; T = (T/T_F) T_F. */
cp_status cp_thermo_fermi_at(const cp_thermo_trap *trap, double t_over_tf,
                             cp_thermo_fermi_result *out, cp_error *err);

/* Bose gas at temperature T (K, in [1e-12, 1]) with T/T_c <= 1e8. */
cp_status cp_thermo_bose(const cp_thermo_trap *trap, double temperature,
                         cp_thermo_bose_result *out, cp_error *err);

/* The inverse: the Bose gas at a given T/T_c in (0, 1e8]. */
cp_status cp_thermo_bose_at(const cp_thermo_trap *trap, double t_over_tc,
                            cp_thermo_bose_result *out, cp_error *err);

/* The number N that puts an ideal gas of statistics stat at temperature T (K) in trap
 * frequencies omega (rad/s) at t_over_tdeg = T/T_F (fermions, k_B T_F = hbar wbar (6N)^(1/3))
 * or T/T_c (bosons, k_B T_c = hbar wbar (N/zeta(3))^(1/3)), t_over_tdeg in (0, 1000].
 * CP_EINVAL for bad input (*number NaN). */
cp_status cp_thermo_number_at(cp_statistics stat, double temperature, const double omega[3],
                              double t_over_tdeg, double *number, cp_error *err);

/* The temperature (K) at which the trapped gas has entropy per particle s (units of k_B,
 * in (0, 40]) — the inverse of entropy_per_particle.  Fermions: s > 0 at any T; bosons:
 * s <= 4 zeta(4)/zeta(3) (T/T_c)^3 below T_c is inverted in closed form.  Brent's method
 * on the log-fugacity, relative accuracy ~1e-13. */
cp_status cp_thermo_temperature_from_entropy(const cp_thermo_trap *trap, cp_statistics stat,
                                             double entropy_per_particle, double *temperature,
                                             cp_error *err);

/* The temperature (K) at which the trapped gas has energy per particle E/N (J, in
 * (0, 3 k_B x 10 mK]) at its number and trap: where a cloud rethermalises after energy is
 * added at fixed N and trap.  Brent's method on ln T.  CP_EINVAL for bad input or an energy
 * the gas reaches only outside the models' temperature range (for fermions, below the
 * Fermi sea's 3/4 E_F); *temperature NaN on error. */
cp_status cp_thermo_temperature_from_energy(const cp_thermo_trap *trap, cp_statistics stat,
                                            double energy_per_particle, double *temperature,
                                            cp_error *err);

/* Entropy matching harmonic -> harmonic: the temperature (K) after an adiabatic (entropy
 * and N conserving) change of the trap frequencies from trap->omega to omega_to[3]. */
cp_status cp_thermo_match_harmonic(const cp_thermo_trap *trap, cp_statistics stat,
                                   double temperature, const double omega_to[3],
                                   double *temperature_to, cp_error *err);

/* Local density (m^-3) at position r (m, each |r_i| <= 1 m) in the LDA:
 * fermions -Li_{3/2}(-z e^{-V/k_BT})/lambda^3, bosons the thermal Li_{3/2}(z e^{-V/k_BT})
 * /lambda^3 plus the condensate in the oscillator ground state. */
typedef struct cp_thermo_density_result {
    double density;            /* total, m^-3 */
    double thermal_density;    /* non-condensed part (all of it for fermions), m^-3 */
    double condensate_density; /* ideal-gas condensate (0 for fermions or above T_c), m^-3 */
} cp_thermo_density_result;

cp_status cp_thermo_density(const cp_thermo_trap *trap, cp_statistics stat, double temperature,
                            const double r[3], cp_thermo_density_result *out, cp_error *err);

/* Root-mean-square cloud sizes in the trap and after a ballistic time of flight t (s, in
 * [0, 10]) with the trap switched off suddenly and no interactions.  For the
 * (non-condensed) gas every quadratic degree of freedom carries E/(6N), so
 * sigma_i(t)^2 = E/(3 N m omega_i^2) (1 + omega_i^2 t^2) exactly; the ideal condensate
 * expands as the oscillator ground state, sigma_i(t) = sqrt(hbar/(2 m omega_i)) sqrt(1 +
 * omega_i^2 t^2). */
typedef struct cp_thermo_tof_result {
    double sigma_trap[3];           /* in-trap rms size of the (thermal) cloud, m */
    double sigma_tof[3];            /* after time of flight, m */
    double condensate_sigma_trap[3];/* ideal condensate (NaN for fermions / above T_c), m */
    double condensate_sigma_tof[3]; /* ditto after time of flight, m */
} cp_thermo_tof_result;

cp_status cp_thermo_tof(const cp_thermo_trap *trap, cp_statistics stat, double temperature,
                        double time, cp_thermo_tof_result *out, cp_error *err);

/* ---- lattice plus harmonic envelope ------------------------------------------------- */

/* Most bands per axis the lattice thermodynamics takes (the automatic choice stops here). */
#define CP_THERMO_LATTICE_MAX_BANDS 32

/* One axis of a separable cubic lattice: the single-particle band energies E_n(q), in
 * units of the recoil energy, of `bands` bands at `points` quasimomenta spread evenly over
 * half the Brillouin zone (q = (j + 1/2)/points in units of the lattice k, j = 0 ..
 * points-1; E(-q) = E(q)).  energy_er[j * bands + n] (the layout of
 * cp_lattice_band_energies); caller-owned. */
typedef struct cp_thermo_band_table {
    int bands;               /* in [1, CP_THERMO_LATTICE_MAX_BANDS] */
    int points;              /* in [4, 256] */
    const double *energy_er; /* bands * points finite values */
} cp_thermo_band_table;

/* A lattice (one band table per axis) with a harmonic envelope. */
typedef struct cp_thermo_lattice {
    cp_thermo_band_table axis[3];
    double recoil_energy;    /* E_r = hbar^2 k^2 / (2 m), J */
    double spacing;          /* lattice period d = lambda/2, m */
    double omega_envelope[3];/* envelope angular frequencies, rad/s */
    int bins;                /* energy bins of the lowest band combination, in [8, 4096];
                                0 = 96 */
} cp_thermo_lattice;

/* The ideal gas in the lattice in the local-density approximation for the envelope and
 * exactly in the band structure:
 *   N = A sum_b w_b f_{3/2}(beta (mu - e_b)),  A = (2 pi k_B T / (m omega_env^2))^{3/2}/d^3,
 * with f_{3/2} = F_{1/2} (fermions) or Li_{3/2} (bosons), the 3D band energies e_b = sum
 * of the three axes' energies histogrammed into bins of weight w_b (mean energy kept),
 * merged at the temperature into bins no wider than k_B T / 128. */
typedef struct cp_thermo_lattice_result {
    double temperature;          /* K */
    double chemical_potential;   /* J, from the lattice potential minimum */
    double entropy_per_particle; /* k_B */
    double energy_per_particle;  /* J, from the lattice potential minimum */
    double peak_filling;         /* fermions: particles per site at the envelope centre
                                    (NaN for bosons, whose LDA centre diverges at T_c) */
    double condensed_fraction;   /* bosons: fraction in the lowest band state; else 0 */
    double band_margin;          /* (E_cut - max(mu, e_min)) / k_B T: how far the first band
                                    left out (bounded below by the top of the last band kept
                                    on each axis) lies above the lowest state or mu */
    int bands;                   /* bands per axis in the tables (most over the axes) */
    int bands_needed;            /* bands per axis whose bottom lies within
                                    CP_THERMO_LATTICE_MARGIN k_B T of max(mu, e_min) */
} cp_thermo_lattice_result;

/* Band margin (units of k_B T) the automatic band choice asks for: the weight left in the
 * omitted bands is then below about e^-20 ~ 2e-9 of a kept band's. */
#define CP_THERMO_LATTICE_MARGIN 20.0

/* The state of N particles of mass m (trap->number, trap->mass; trap->omega unused) at
 * temperature T in the lattice. */
cp_status cp_thermo_lattice_state(const cp_thermo_lattice *lat, const cp_thermo_trap *trap,
                                  cp_statistics stat, double temperature,
                                  cp_thermo_lattice_result *out, cp_error *err);

/* Entropy matching harmonic -> lattice: the gas (trap, T) is loaded adiabatically into
 * the lattice; out is the lattice state with the same N and entropy. */
cp_status cp_thermo_match_lattice(const cp_thermo_trap *trap, cp_statistics stat,
                                  double temperature, const cp_thermo_lattice *lat,
                                  cp_thermo_lattice_result *out, cp_error *err);

/* Fill `lat` with the band tables of a cubic lattice from the band structure of
 * cp_lattice_band_energies (coldprep/lattice.h): depth_er[3] (E_r, each in
 * [0, 1e4]) along x, y, z of light of wavelength `wavelength` (m, [1e-8, 1e-3]), particle
 * mass `mass` (kg), the lowest `bands` bands (1..CP_THERMO_LATTICE_MAX_BANDS) at `points`
 * quasimomenta (4..256) per half zone.  tables: caller-owned storage of
 * 3 * bands * points doubles that lat's tables point into.  Sets recoil_energy and
 * spacing (lambda/2); leaves omega_envelope and bins to the caller. */
cp_status cp_thermo_lattice_bands(const double depth_er[3], double wavelength, double mass,
                                  int bands, int points, double *tables,
                                  cp_thermo_lattice *lat, cp_error *err);

/* A cubic lattice described by its depths, for the automatic band choice. */
typedef struct cp_thermo_lattice_spec {
    double depth_er[3];       /* V0 / E_r along x, y, z, [0, 1e4] */
    double wavelength;        /* m, [1e-8, 1e-3]; spacing lambda/2 */
    double omega_envelope[3]; /* envelope angular frequencies, rad/s */
    int points;               /* quasimomenta per half zone, [4, 256]; 0 = 32 */
    int bins;                 /* as cp_thermo_lattice.bins; 0 = 96 */
} cp_thermo_lattice_spec;

/* cp_thermo_lattice_state and cp_thermo_match_lattice with as many bands as k_B T needs:
 * the band count grows (from the count the initial temperature needs, at least 2) until
 * the band margin reaches CP_THERMO_LATTICE_MARGIN or the count reaches
 * CP_THERMO_LATTICE_MAX_BANDS (then out->band_margin tells how short it fell; no error).
 * out->bands is the count used.  The band tables are allocated and freed inside. */
cp_status cp_thermo_lattice_state_auto(const cp_thermo_lattice_spec *spec,
                                       const cp_thermo_trap *trap, cp_statistics stat,
                                       double temperature, cp_thermo_lattice_result *out,
                                       cp_error *err);
cp_status cp_thermo_match_lattice_auto(const cp_thermo_trap *trap, cp_statistics stat,
                                       double temperature, const cp_thermo_lattice_spec *spec,
                                       cp_thermo_lattice_result *out, cp_error *err);

/* Site occupation statistics in the atomic limit (tunnelling J << k_B T): each site is
 * independent, with one orbital per band combination at the sum of the three axes' band
 * means (the Wannier energies); the envelope enters in the local-density approximation,
 * mu_local = mu - V(r).  Fermions (one component): at most one per orbital.  Bosons: the
 * lowest orbital has the Bose-Hubbard on-site energy U n (n - 1)/2 (onsite_u in J, > 0;
 * INFINITY = hard-core), the excited orbitals are ideal.  mu is solved so that the sites
 * hold trap->number particles at temperature T (trap->omega unused). */
typedef struct cp_thermo_filling_result {
    double chemical_potential; /* J, from the lattice potential minimum */
    double center_empty;       /* probability of 0 particles on the central site */
    double center_single;      /* ... of exactly 1 */
    double center_multiple;    /* ... of 2 or more */
    double center_filling;     /* mean particles on the central site */
    double sites_occupied;     /* sites with at least one particle */
    double sites_single;       /* sites with exactly one */
    double sites_multiple;     /* sites with two or more */
    double single_fraction;    /* fraction of the particles alone on their site */
} cp_thermo_filling_result;

cp_status cp_thermo_lattice_filling(const cp_thermo_lattice *lat, const cp_thermo_trap *trap,
                                    cp_statistics stat, double temperature, double onsite_u,
                                    cp_thermo_filling_result *out, cp_error *err);

/* cp_thermo_lattice_filling with a work bound: the site sums count their terms (orbitals
 * near the local chemical potential, occupation numbers of the lowest bosonic orbital),
 * and once their cost (measured on a 2020s desktop core: docs/api/thermo.md) exceeds
 * max_seconds of CPU (> 0; +inf: no limit) the call stops with CP_ETOOLONG, saying what
 * drives the cost (a bosonic onsite_u far below k_B T).  *cancel (may be NULL) is polled
 * at every site: once it is non-zero CP_ECANCELED is returned.  Outputs are NaN on either. */
cp_status cp_thermo_lattice_filling_bounded(const cp_thermo_lattice *lat,
                                            const cp_thermo_trap *trap, cp_statistics stat,
                                            double temperature, double onsite_u,
                                            const cp_cancel_flag *cancel, double max_seconds,
                                            cp_thermo_filling_result *out, cp_error *err);

#ifdef __cplusplus
}
#endif
#endif

/*
 * coldprep — a polar 1Sigma molecule in external fields: the exact dc Stark effect of a
 * rigid rotor, the dc-field shielding crossing, and dressing by a microwave near the
 * J = 0 -> 1 rotational transition.
 *
 * Conventions (used everywhere below and in the Lua API):
 *   - the molecule is a rigid rotor with rotational constant B and body-frame dipole d,
 *     H = B J(J+1) - d F cos(theta), F the field along the lab z axis;
 *   - d is in C m (1 debye = CP_DEBYE C m); B is given as B/h in Hz, as the species tables
 *     give it (cp_molecule.rot_const_hz); fields in V/m; energies are returned as E/h in Hz,
 *     measured from the field-free J = 0 level; angular frequencies in rad/s;
 *   - the reduced field is x = d F / B (dimensionless); E/B depends on x alone;
 *   - a Stark state is labelled by the field-free |J, M> it is adiabatically connected to:
 *     M is conserved and, for given M, the n-th lowest eigenvalue belongs to J = |M| + n
 *     (levels of equal M never cross), so the label is exact at every field;
 *   - the basis J = |M| .. |M| + basis_size - 1 is chosen automatically so that the
 *     estimated truncation error of every energy asked for is below CP_FIELDS_TOLERANCE
 *     relative (a hundredth of it, in fact; where an energy passes near zero, 1e-15 of
 *     B [J(J+1) + min(x, x^2)] absolute); the size used is reported;
 *   - the induced (lab-frame) dipole is -dE/dF = d <cos theta>, evaluated from the
 *     eigenvector (Hellmann-Feynman theorem), not by differencing energies.
 * The caller owns every array passed in; the library allocates nothing that outlives a
 * call.  All functions are thread-safe.
 */
#ifndef COLDPREP_FIELDS_H
#define COLDPREP_FIELDS_H

#include <stddef.h>

#include "coldprep/status.h"

#ifdef __cplusplus
extern "C" {
#endif

#define CP_FIELDS_TOLERANCE 1e-9        /* relative convergence of energies in the basis */
#define CP_FIELDS_MAX_FIELD 1.0e8       /* largest dc field accepted, V/m (1 MV/cm) */
#define CP_FIELDS_MAX_REDUCED_FIELD 1.0e5 /* largest d F / B accepted */
#define CP_FIELDS_MAX_J 200             /* highest J (and |M|) a state may have */
#define CP_FIELDS_MAX_LEVELS 200        /* most levels one Stark-map call may ask for */
#define CP_FIELDS_MAX_BASIS 2000        /* largest rotational basis (J levels per M) */
#define CP_FIELDS_MIN_DIPOLE (1e-4 * 3.33564095198152e-30) /* C m (1e-4 D) */
#define CP_FIELDS_MAX_DIPOLE (20.0 * 3.33564095198152e-30) /* C m (20 D) */
#define CP_FIELDS_MIN_ROT_CONST 1.0e7   /* B/h, Hz */
#define CP_FIELDS_MAX_ROT_CONST 1.0e13  /* B/h, Hz */

/* The two constants of a rigid polar rotor.  d in [CP_FIELDS_MIN_DIPOLE,
 * CP_FIELDS_MAX_DIPOLE] C m, B/h in [CP_FIELDS_MIN_ROT_CONST, CP_FIELDS_MAX_ROT_CONST] Hz. */
typedef struct cp_fields_rotor {
    double dipole;       /* body-frame permanent dipole moment d, C m */
    double rot_const_hz; /* rotational constant B/h, Hz */
} cp_fields_rotor;

/* ---- dc Stark effect ------------------------------------------------------------------ */

typedef struct cp_fields_stark_result {
    double energy_hz;      /* E/h of the state, Hz, from the field-free J = 0 level */
    double induced_dipole; /* -dE/dF = d <cos theta>, C m: positive for a high-field seeker
                              (E falls with F, as for J = 0), negative for a low-field
                              seeker (e.g. |1,0> in a weak field) */
    double reduced_field;  /* x = d F / B */
    double energy_reduced; /* E / B */
    double cos_theta;      /* <cos theta> = induced_dipole / d, in [-1, 1] */
    int basis_size;        /* number of J levels used, J = |M| .. |M| + basis_size - 1 */
} cp_fields_stark_result;

/* The Stark state adiabatically connected to |j, m> (0 <= j <= CP_FIELDS_MAX_J, |m| <= j)
 * in a field `field` (V/m, [0, CP_FIELDS_MAX_FIELD], with d F / B at most
 * CP_FIELDS_MAX_REDUCED_FIELD).  CP_EINVAL for bad input (out poisoned). */
cp_status cp_fields_stark(const cp_fields_rotor *rotor, double field, int j, int m,
                          cp_fields_stark_result *out, cp_error *err);

/* The same in reduced units: E/B and <cos theta> of the state |j, m> at reduced field x
 * (in [0, CP_FIELDS_MAX_REDUCED_FIELD]).  Any output may be NULL. */
cp_status cp_fields_stark_reduced(double x, int j, int m, double *energy_reduced,
                                  double *cos_theta, int *basis_size, cp_error *err);

/* Induced dipole -dE/dF (C m) of the rotational ground state |0, 0> at field `field`
 * (V/m): the cheap call for collision models.  Same ranges as cp_fields_stark. */
cp_status cp_fields_induced_dipole(double dipole, double rot_const_hz, double field,
                                   double *induced_dipole, cp_error *err);

/* A Stark map: the `levels` lowest states of projection m (J = |m| .. |m| + levels - 1,
 * 1 <= levels <= CP_FIELDS_MAX_LEVELS, |m| + levels - 1 <= CP_FIELDS_MAX_J) at each of
 * fields[0..count-1] (V/m, any order; count >= 1).  Row i of the outputs belongs to
 * fields[i]: energy_hz[i * levels + n] is E/h (Hz) of J = |m| + n and, unless
 * induced_dipole is NULL, induced_dipole[i * levels + n] its -dE/dF (C m).  *basis_size
 * (may be NULL) receives the largest basis used.  On error every output is poisoned. */
cp_status cp_fields_stark_map(const cp_fields_rotor *rotor, int m, int levels,
                              const double *fields, size_t count, double *energy_hz,
                              double *induced_dipole, int *basis_size, cp_error *err);

/* The dipole matrix <k| d_z |l> (C m) of the `levels` lowest Stark states of projection m
 * (k, l = 0 .. levels - 1 for J = |m| + k; 1 <= levels <= CP_FIELDS_MAX_DIPOLE_LEVELS,
 * |m| + levels - 1 <= CP_FIELDS_MAX_J) at field `field` (V/m, as cp_fields_stark):
 * dipole[k * levels + l], symmetric; the diagonal is the induced dipole -dE/dF of each
 * state, the rest the transition dipoles between them.  Each state's sign is chosen so
 * that its component on the field-free |J = |m| + k, m> is positive.  energy_hz (may be
 * NULL) receives the `levels` energies E/h (Hz), *basis_size (may be NULL) the basis used.
 * On error the outputs are poisoned (when levels is in range). */
#define CP_FIELDS_MAX_DIPOLE_LEVELS 20
cp_status cp_fields_dipole_matrix(const cp_fields_rotor *rotor, double field, int m, int levels,
                                  double *energy_hz, double *dipole, int *basis_size,
                                  cp_error *err);

/* ---- dc-field shielding ----------------------------------------------------------------- */

/* The reduced field x_s at which the pair |1,0> + |1,0> is degenerate with |0,0> + |2,0>,
 * 2 E(1,0) = E(0,0) + E(2,0) (found by root finding on the exact energies; x_s ~ 3.244). */
cp_status cp_fields_shielding_reduced(double *reduced_field, cp_error *err);

/* The shielding field F_s = x_s B / d (V/m) of a rotor; *reduced_field (may be NULL)
 * receives x_s.  CP_EINVAL when F_s exceeds CP_FIELDS_MAX_FIELD. */
cp_status cp_fields_shielding_field(const cp_fields_rotor *rotor, double *field,
                                    double *reduced_field, cp_error *err);

/* Pair-energy gap [2 E(1,0) - E(0,0) - E(2,0)] / h, Hz, at field `field` (V/m): negative
 * below the shielding field, zero at it, positive above (where |1,0> + |1,0> is repelled
 * at long range by its coupling to |0,0> + |2,0>). */
cp_status cp_fields_shielding_gap(const cp_fields_rotor *rotor, double field, double *gap_hz,
                                  cp_error *err);

/* ---- microwave dressing ------------------------------------------------------------------ */

#define CP_FIELDS_MAX_ELLIPTICITY 0.7853981633974483 /* pi/4 rad: linear, excluded */
#define CP_FIELDS_MAX_DRESSING 0.1 /* Omega and Delta at most this fraction of 2B/hbar */
#define CP_FIELDS_MIN_RABI 6.283185307179586 /* rad/s (2 pi x 1 Hz): weaker is no dressing */

/* A microwave near the J = 0 -> 1 transition (angular frequency 2B/hbar) with polarisation
 * cos(xi) sigma+ + sin(xi) sigma- (xi = 0: circular; the ellipticity angle of Deng et al.,
 * PRL 130, 183001 (2023)).  It couples |0,0> to the J = 1 state |a> = cos(xi) |1,1>
 * + sin(xi) |1,-1> with Rabi frequency Omega (coupling hbar Omega / 2); detuning
 * Delta = omega_mw - 2B/hbar, blue > 0.  Rules (anything else is CP_EINVAL):
 *   rabi         Omega in [CP_FIELDS_MIN_RABI, CP_FIELDS_MAX_DRESSING x 2B/hbar] rad/s;
 *   detuning     Delta in [0, CP_FIELDS_MAX_DRESSING x 2B/hbar] rad/s.  Red detuning
 *                (Delta < 0) is refused: a molecule dressed from |0,0> then follows the
 *                lower dressed state, which is not shielded.  Delta = 0 (resonant) is
 *                allowed: the upper dressed state, reached by sweeping a blue-detuned
 *                microwave onto resonance, is then an equal mixture, d_eff = d / sqrt(12);
 *   ellipticity  xi in [0, pi/4) rad.  Linear polarisation (xi = pi/4) is refused: the
 *                repulsive r^-6 core vanishes side by side (theta = pi/2) along the
 *                polarisation, where the dipolar term attracts, so there is no shield. */
typedef struct cp_fields_microwave_params {
    double rabi;        /* Omega, rad/s */
    double detuning;    /* Delta, rad/s */
    double ellipticity; /* xi, rad */
} cp_fields_microwave_params;

/* Results for a molecule in the upper dressed state |+> = cos(m) |0,0> + sin(m) |a>. */
typedef struct cp_fields_microwave_result {
    double upper_hz;         /* E+/h = (-Delta + Omega_e) / (4 pi), Hz, in the frame rotating
                                with the microwave, from |0,0>; Omega_e = sqrt(Delta^2 +
                                Omega^2) */
    double lower_hz;         /* E-/h = (-Delta - Omega_e) / (4 pi), Hz */
    double splitting_hz;     /* Omega_e / (2 pi), Hz */
    double mixing_angle;     /* m, rad, in (0, pi/4]: tan(2 m) = Omega / Delta */
    double delta_ratio;      /* delta = Delta / Omega */
    double effective_dipole; /* d_eff = d sin(2 m) / sqrt(12) = d / sqrt(12 (1 + delta^2)),
                                C m */
    double c3;               /* C3 = d_eff^2 / (4 pi eps0) = d^2 / (48 pi eps0 (1 + delta^2)),
                                J m^3 */
    double c6;               /* C6 = d^4 / (128 pi^2 eps0^2 hbar Omega (1 + delta^2)^(3/2)),
                                J m^6: the scale of the repulsive core */
    double core_spectator;   /* s6 = 1 + (Omega_e - Delta) / (Delta + 3 Omega_e) */
    double core_dressed;     /* t6 = (4/9) (cos^2 2m + sin^2 2m / 4) */
    double ellipticity;      /* xi, rad (copied, used by cp_fields_microwave_potential) */
} cp_fields_microwave_result;

/* Dressed single-molecule quantities and the coefficients of the long-range potential of
 * two molecules in |+> (see cp_fields_microwave_potential).  CP_EINVAL for bad input
 * (out poisoned). */
cp_status cp_fields_microwave(const cp_fields_rotor *rotor,
                              const cp_fields_microwave_params *params,
                              cp_fields_microwave_result *out, cp_error *err);

/* The effective potential (J) of two molecules in |+> at separation r (m, > 0) in the
 * direction (theta, phi) (rad; theta from the microwave's propagation axis z, phi from the
 * polarisation ellipse's axis), to second order in the dipole-dipole coupling:
 *   V = 2 C3 (1 - 3p) / r^3 + C6 [4 p (1 - p) s6 + t6 (1 - 3p)^2] / r^6,
 *   p = |eta . r^|^2 = (sin^2 theta / 2)(1 - sin 2xi cos 2phi),
 * which for circular polarisation is C3 (3 cos^2 theta - 1) / r^3 (the sign-reversed
 * dipolar interaction) + C6 [(1 - cos^4 theta) s6 + t6 (3 cos^2 theta - 1)^2 / 4] / r^6.
 * Valid where the dipolar coupling d_eff^2 / (4 pi eps0 r^3) is small against
 * hbar Omega_e (fields_microwave.c derives it).  mw from cp_fields_microwave; CP_EINVAL
 * for r <= 0, non-finite angles, or an r so small that V overflows. */
cp_status cp_fields_microwave_potential(const cp_fields_microwave_result *mw, double r,
                                        double theta, double phi, double *potential,
                                        cp_error *err);

#ifdef __cplusplus
}
#endif
#endif

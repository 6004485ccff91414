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
 *     relative (or 1e-13 B absolute where the energy is near zero); the size used is
 *     reported;
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
    double induced_dipole; /* -dE/dF = d <cos theta>, C m (negative: a high-field seeker
                              has it positive; |J,M> states with J > 0 may have either sign) */
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

#define CP_FIELDS_MAX_ELLIPTICITY 0.7853981633974483 /* pi/4 rad: linear polarisation */

/* A microwave near the J = 0 -> 1 transition (frequency 2B/h), coupling |0,0> to the
 * J = 1 state its polarisation addresses with Rabi frequency `rabi` (coupling hbar rabi / 2).
 * The polarisation is cos(xi) sigma+ + sin(xi) sigma- (xi = 0: circular, xi = pi/4:
 * linear), the ellipticity angle xi of Deng et al., PRL 130, 183001 (2023). */
typedef struct cp_fields_microwave_params {
    double rabi;        /* Omega, rad/s, (0, 2 pi x 1e10] and below 0.2 x 2B/hbar */
    double detuning;    /* Delta = omega_mw - 2B/hbar, rad/s, blue > 0; |Delta| below
                           0.2 x 2B/hbar; see cp_fields_microwave for Delta <= 0 */
    double ellipticity; /* xi, rad, [0, CP_FIELDS_MAX_ELLIPTICITY] */
} cp_fields_microwave_params;

typedef struct cp_fields_microwave_result {
    double upper_hz;          /* E+/h, Hz: upper dressed state, rotating frame, from the
                                 undressed |0,0> with one more photon (zero when Omega = 0
                                 and Delta > 0) */
    double lower_hz;          /* E-/h, Hz: lower dressed state */
    double splitting_hz;      /* (E+ - E-)/h = sqrt(Delta^2 + Omega^2) / 2 pi, Hz */
    double mixing_angle;      /* theta, rad, in (0, pi/2): |+> = cos(theta) |0,0>
                                 + sin(theta) |1,*>, tan(2 theta) = Omega / Delta */
    double effective_dipole;  /* d_eff = d sin(2 theta) / sqrt(12), C m: the static dipole
                                 whose dipolar interaction has the dressed pair's strength */
    double c3;                /* C3 = d_eff^2 / (4 pi eps0), J m^3; the long-range potential
                                 of two molecules in |+> is -C3 (3 cos^2 - 1) / r^3 for
                                 circular polarisation: sign-reversed dipolar */
    double c6;                /* C6, J m^6: coefficient of the repulsive r^-6 shielding core
                                 of Deng et al.'s effective potential (see fields_microwave.c) */
    double delta_ratio;       /* Delta / Omega */
} cp_fields_microwave_result;

/* Dressed single-molecule quantities and the effective pair-potential coefficients for
 * molecules in the upper dressed state |+>.  Shielding (a repulsive core) needs blue
 * detuning: Delta < 0 is accepted for the single-molecule quantities, but c6 is then
 * NaN-free and negative-definite is not claimed: see the contract in fields_microwave.c.
 * CP_EINVAL for bad input (out poisoned). */
cp_status cp_fields_microwave(const cp_fields_rotor *rotor,
                              const cp_fields_microwave_params *params,
                              cp_fields_microwave_result *out, cp_error *err);

#ifdef __cplusplus
}
#endif
#endif

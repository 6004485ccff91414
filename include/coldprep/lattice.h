/*
 * coldprep — optical lattices: the 1D standing wave V(x) = V0 sin^2(k x), k = 2 pi / lambda,
 * lattice spacing d = lambda / 2, recoil energy E_r = hbar^2 k^2 / (2 m).
 *
 * Band structure conventions (used everywhere below and in the Lua API):
 *   - depths and energies are in recoil energies E_r ("_er"); energies are measured from
 *     the potential minimum (V = 0 at the bottom of a well);
 *   - quasimomenta are in units of k: the first Brillouin zone is [-1, 1], 0 is its
 *     centre and +-1 its edge; any finite quasimomentum is accepted and folded back
 *     (E is periodic with period 2 and even);
 *   - bands are numbered from 0 (the lowest) in C; Lua numbers them from 1;
 *   - the plane-wave basis exp(i (q + 2 l) k x), l = -L..L, has basis_size = 2 L + 1
 *     states; basis_size = 0 asks for the automatic choice, which converges the energies
 *     to 1e-10 E_r (the size used is reported).
 * The caller owns every array passed in; the library allocates nothing that outlives a call.
 * All functions are thread-safe.
 */
#ifndef COLDPREP_LATTICE_H
#define COLDPREP_LATTICE_H

#include <stddef.h>

#include "coldprep/status.h"

#ifdef __cplusplus
extern "C" {
#endif

#define CP_LATTICE_MAX_DEPTH_ER 1.0e4 /* deepest lattice the band solver accepts, E_r */
#define CP_LATTICE_MAX_BANDS 200      /* most bands one call may ask for */
#define CP_LATTICE_MAX_BASIS 4001     /* largest plane-wave basis */
#define CP_LATTICE_MAX_TUNNEL_BAND 19 /* highest band (0-based) for cp_lattice_tunnelling */

/* ---- recoil, depth from laser beams, harmonic envelope ---------------------------------- */

/* Recoil energy E_r = h^2 / (2 m lambda^2) (J) and E_r / h (Hz) of a particle of mass
 * `mass` (kg, in [1e-30, 1e-20]) and light of wavelength `wavelength` (m, in [1e-8, 1e-3]).
 * Either output may be NULL. */
cp_status cp_lattice_recoil(double mass, double wavelength, double *energy,
                            double *frequency_hz, cp_error *err);

/* Units in which a (dynamic, scalar) polarizability is given. */
typedef enum cp_polarizability_unit {
    CP_POLARIZABILITY_SI = 0,          /* C m^2 / V */
    CP_POLARIZABILITY_AU = 1,          /* atomic units, 4 pi eps0 a0^3 */
    CP_POLARIZABILITY_HZ_PER_W_CM2 = 2 /* alpha / (2 eps0 c h) in Hz / (W / cm^2): the light
                                          shift in Hz per W/cm^2 of intensity */
} cp_polarizability_unit;

/* Convert a polarizability to SI (C m^2/V).  Any finite value (either sign). */
cp_status cp_lattice_polarizability_si(double value, cp_polarizability_unit unit,
                                       double *alpha_si, cp_error *err);

/* Two Gaussian beams of equal waist forming a 1D lattice: a beam and its retro-reflection
 * (angle = pi) or two beams crossing at a full angle `angle`.  Polarizations are taken
 * parallel (full interference). */
typedef struct cp_lattice_beam {
    double power;          /* W, power of the first beam, (0, 1e4] */
    double waist;          /* m, 1/e^2 intensity radius at the molecules, [1e-7, 1] */
    double wavelength;     /* m, [1e-8, 1e-3] */
    double polarizability; /* real part at `wavelength`, in `unit`; > 0 (red-detuned,
                              attractive: the molecules sit at intensity maxima);
                              at most 1e7 atomic units */
    cp_polarizability_unit unit;
    double reflectivity;   /* power of the second beam / power of the first, (0, 1];
                              1 for a lossless retro-reflection */
    double angle;          /* full angle between the two beams, rad, [0.01, pi];
                              pi = counter-propagating */
} cp_lattice_beam;

typedef struct cp_lattice_depth_result {
    double depth;          /* V0, J: modulation depth, V(x) = bottom + V0 sin^2(pi x / d) */
    double well_bottom;    /* J: potential at the bottom of the central wells (< 0) */
    double offset;         /* J: potential at the barrier tops (0 for perfect reflection) */
    double spacing;        /* d = lambda / (2 sin(angle / 2)), m */
    double peak_intensity; /* I0 = 2 P / (pi w^2) of the first beam, W/m^2 */
    double alpha_si;       /* the polarizability in C m^2/V */
    double rayleigh_range; /* z_R = pi w^2 / lambda, m */
    /* the following need a mass (cp_lattice_depth's mass > 0); NaN when it is 0 */
    double recoil;         /* E_L = h^2 / (8 m d^2), J: the lattice's recoil (E_r for angle
                              = pi), the unit of depth_er and of the band structure */
    double depth_er;       /* V0 / E_L */
    double omega_site;     /* 2 sqrt(V0 E_L) / hbar, rad/s: harmonic on-site frequency */
    double omega_axial;    /* envelope frequency along the lattice vector, rad/s */
    double omega_radial;   /* envelope frequency normal to the beams' plane, rad/s */
    double omega_bisector; /* envelope frequency along the beams' bisector, rad/s
                              (= omega_radial for angle = pi) */
    double sag;            /* g / omega_radial^2, m: gravitational sag with gravity normal
                              to the beams' plane */
} cp_lattice_depth_result;

/* Depth of the lattice formed by `beam`, from the dipole potential U = -Re(alpha) I /
 * (2 eps0 c) (Grimm, Weidemueller, Ovchinnikov, Adv. At. Mol. Opt. Phys. 42, 95 (2000)).
 * Intensity I0 (1 + eta + 2 sqrt(eta) cos(2 pi x / d)) with eta the reflectivity, so
 * V0 = 4 sqrt(eta) Re(alpha) I0 / (2 eps0 c); V0 = 4 Re(alpha) P / (pi eps0 c w^2) for
 * perfect retro-reflection.  The harmonic envelope is the curvature of the well bottom
 * along each direction (the Gaussian profile and, along the beams, the Lorentzian
 * dependence on the Rayleigh range), neglecting the zero-point energy's variation.
 * mass: kg in [1e-30, 1e-20], or 0 when the mass-dependent results are not wanted. */
cp_status cp_lattice_depth(const cp_lattice_beam *beam, double mass,
                           cp_lattice_depth_result *result, cp_error *err);

/* A 3D lattice from three mutually orthogonal 1D lattices (beams along x, y, z, each
 * counter-propagating, angle = pi; frequencies assumed different so that they do not
 * interfere with each other).  axis[i] is the 1D result for beam i.  The envelope
 * frequency along axis i adds the curvature of beam i along its own axis (Rayleigh) and
 * of beams j != i across their profiles:
 *   m omega_i^2 = 2 |U_i| / z_R,i^2 + sum_{j != i} 4 |U_j| / w_j^2,  U = well bottom. */
typedef struct cp_lattice_3d_result {
    cp_lattice_depth_result axis[3];
    double well_bottom;    /* J: sum of the three well bottoms */
    double omega[3];       /* envelope frequencies along x, y, z, rad/s */
    double omega_bar;      /* geometric mean of omega, rad/s */
    double sag;            /* g / omega[gravity_axis]^2, m */
} cp_lattice_3d_result;

/* beams[3] along x, y, z; mass in kg (> 0, [1e-30, 1e-20]); gravity_axis 0, 1 or 2. */
cp_status cp_lattice_depth_3d(const cp_lattice_beam beams[3], double mass, int gravity_axis,
                              cp_lattice_3d_result *result, cp_error *err);

/* The envelope of a 3D lattice against gravity (along gravity_axis, pointing to -s): the
 * potential of the well bottoms along s through the centre,
 *   V(s) = sum_{j != g} U_j exp(-2 s^2 / w_j^2) + U_g / (1 + s^2 / z_R,g^2) + m g s,
 * U_j = axis[j].well_bottom < 0 (beams j != g vary across their Gaussian profile, beam g
 * along its own axis, Rayleigh), the form whose curvature at s = 0 is the envelope
 * frequency of cp_lattice_depth_3d.  The minimum is found on a grid over
 * [-4 w, 2 w] (w the largest waist across gravity) refined by a parabola, the barrier
 * below it likewise.  The on-site zero-point energy and the change of the lattice depth
 * over the sag are left out. */
typedef struct cp_lattice_gravity_result {
    int held;              /* 1 if V has a minimum (the beams hold against gravity) */
    double sag;            /* m, how far below the beam centre the minimum lies */
    double omega;          /* rad/s, envelope frequency along gravity at the minimum */
    double depth;          /* J, barrier below the minimum minus the minimum (0 if not held) */
    double depth_no_gravity; /* J, -sum of the well bottoms: the envelope depth at g = 0 */
    double max_gravity;    /* m/s^2, the largest g the envelope's force holds against */
} cp_lattice_gravity_result;

/* beams[3] along x, y, z as cp_lattice_depth_3d; mass in kg; gravity_axis 0, 1 or 2.
 * Not being held is a result (held = 0, sag, omega and depth NaN/0), not an error. */
cp_status cp_lattice_gravity(const cp_lattice_beam beams[3], double mass, int gravity_axis,
                             cp_lattice_gravity_result *result, cp_error *err);

/* ---- band structure ------------------------------------------------------------------- */

/* The plane-wave basis size the automatic choice uses for `bands` bands at depth
 * depth_er (in [0, CP_LATTICE_MAX_DEPTH_ER] E_r; bands in [1, CP_LATTICE_MAX_BANDS]).
 * The size is odd and large enough that every one of the lowest `bands` energies at any
 * quasimomentum is converged to 1e-10 E_r.  CP_EINVAL on bad input (*basis_size = 0). */
cp_status cp_lattice_basis_size(double depth_er, int bands, int *basis_size, cp_error *err);

/* Energies of the lowest `bands` bands at nq quasimomenta.
 *   depth_er       V0 / E_r in [0, CP_LATTICE_MAX_DEPTH_ER]
 *   bands          in [1, CP_LATTICE_MAX_BANDS]
 *   basis_size     0 for the automatic choice, else an odd size in
 *                  [bands + 1, CP_LATTICE_MAX_BASIS] (for convergence studies)
 *   nq, quasimomenta   nq >= 1 finite quasimomenta in units of k (any order; a smooth
 *                  sequence is fastest because each solution seeds the next)
 *   energies_er    out: nq * bands values, energies_er[i * bands + n] = E_n(q_i) / E_r,
 *                  ascending in n for each i, measured from the potential minimum
 *   basis_used     out (may be NULL): the basis size used
 * The Hamiltonian in the plane-wave basis is real symmetric tridiagonal (diagonal
 * (q + 2 l)^2 + V0/2, off-diagonal -V0/4, in E_r); its lowest eigenvalues are found by
 * Sturm-sequence bisection and Newton's iteration on the characteristic polynomial.
 * CP_EINVAL on bad input, CP_ENOMEM, CP_ENOCONV; on error the energies are NaN. */
cp_status cp_lattice_band_energies(double depth_er, int bands, int basis_size, size_t nq,
                                   const double *quasimomenta, double *energies_er,
                                   int *basis_used, cp_error *err);

/* cp_lattice_band_energies with a work estimate and cancellation: when the estimated CPU
 * time, nq x size x (a + b bands^2) seconds (the Sturm counts of a size-state basis per
 * band, measured on a 2020s desktop core: docs/api/lattice.md), exceeds max_seconds (> 0;
 * +inf: no limit) nothing is computed and CP_ETOOLONG is returned, its message giving the
 * estimate and the quasimomenta that would fit; *cancel (may be NULL) is polled before
 * every quasimomentum, and once it is non-zero CP_ECANCELED is returned.  Energies are NaN
 * on either. */
cp_status cp_lattice_band_energies_bounded(double depth_er, int bands, int basis_size, size_t nq,
                                           const double *quasimomenta, double *energies_er,
                                           int *basis_used, const cp_cancel_flag *cancel,
                                           double max_seconds, cp_error *err);

/* Summary of the lowest bands.  Arrays have `bands` entries (gap_er: bands - 1 entries,
 * gap_er[n] between bands n and n + 1, negative if they overlap, which happens only at
 * depth 0 where it is 0). */
typedef struct cp_lattice_band_summary {
    int bands;              /* number of bands summarised */
    int basis_size;         /* plane-wave basis used */
    double *center_er;      /* caller-provided [bands]: E_n(0), zone centre */
    double *edge_er;        /* caller-provided [bands]: E_n(1), zone edge */
    double *width_er;       /* caller-provided [bands]: |E_n(1) - E_n(0)| */
    double *gap_er;         /* caller-provided [bands - 1] (may be NULL when bands = 1) */
} cp_lattice_band_summary;

/* Band edges, widths and gaps of the lowest summary->bands bands at depth depth_er (same
 * domain as above).  For V0 > 0 every band has its extremes at the zone centre and edge
 * (band n even: minimum at the centre; odd: at the edge), so the width is the difference
 * of the two and the gap the distance from the top of band n to the bottom of band n+1.
 * The caller fills in `bands` and the array pointers; the function fills the arrays and
 * basis_size.  On error the arrays are NaN. */
cp_status cp_lattice_band_summary_compute(double depth_er, cp_lattice_band_summary *summary,
                                          cp_error *err);

/* Tight-binding tunnelling of band `band` (0 = lowest) from the Fourier components of its
 * dispersion in theta = pi q (the Bloch phase across one site):
 *   E(theta) = E_mean - 2 J1 cos(theta) - 2 J2 cos(2 theta) - ...,
 *   J_m = -(1/pi) integral_0^pi E(theta) cos(m theta) dtheta.
 * J1 > 0 for the lowest band.  Computed with the trapezoidal rule on [0, pi] (spectrally
 * accurate for the smooth periodic E), doubling the points (up to 32768) until two
 * estimates agree to 1e-12 E_r.  *error_er (may be NULL) receives an error estimate: the
 * last difference plus the rounding floor of the energies, 4e-14 (1 + |E_mean|) E_r, which
 * exceeds J itself in very deep lattices (band 0 beyond about 200 E_r, where J < 1e-12 E_r;
 * the asymptotic formula of Zwerger, J. Opt. B 5, S9 (2003) is better there).
 *   depth_er in [0, CP_LATTICE_MAX_DEPTH_ER]; band in [0, CP_LATTICE_MAX_TUNNEL_BAND].
 * Outputs (E_r): *j1_er nearest, *j2_er next-nearest neighbour (either may be NULL),
 * *mean_er (may be NULL) the band's centre of mass.  CP_ENOCONV if the estimate does not
 * settle to 1e-7 E_r (the kinks of the dispersion sharpen as V0 -> 0; bands 0 to 2 settle
 * down to 1e-8 E_r). */
cp_status cp_lattice_tunnelling(double depth_er, int band, double *j1_er, double *j2_er,
                                double *mean_er, double *error_er, cp_error *err);

/* ---- on-site quantities and Wannier functions ------------------------------------------ */

/* Harmonic approximation of one well: hbar omega_site = 2 sqrt(V0 E_r) (docs/models/lattice.md),
 * returned in E_r as 2 sqrt(depth_er), and the Lamb-Dicke parameter
 * eta = k_p sqrt(hbar / (2 m omega_site)) = probe_ratio / (sqrt(2) depth_er^(1/4)) for
 * light of wavenumber k_p = probe_ratio * k projected on the lattice axis.
 * depth_er in (0, CP_LATTICE_MAX_DEPTH_ER]; probe_ratio in (0, 100].  Either output may
 * be NULL. */
cp_status cp_lattice_site(double depth_er, double probe_ratio, double *hbar_omega_er,
                          double *lamb_dicke, cp_error *err);

/* The maximally localised Wannier function of band `band` (0 = lowest) centred on the
 * well at x = 0, sampled at npoints positions evenly spaced over
 * [-half_range, half_range] (in lattice spacings d).  In 1D with a symmetric potential it
 * is the real, symmetric (even band) or antisymmetric (odd band) function of W. Kohn,
 * Phys. Rev. 115, 809 (1959), obtained here by fixing the phase of each Bloch function
 * (psi_q(0) > 0 for even bands, psi_q'(0) > 0 for odd ones) and averaging 128 Bloch
 * functions across the zone (so it is exact for a ring of 128 sites).
 *   depth_er in [0.5, CP_LATTICE_MAX_DEPTH_ER] (shallower ones decay too slowly for the
 *   ring); band in [0, 9]; half_range in (0, 50] sites; npoints in [2, 100000].
 * Outputs: x_sites[npoints] (positions in d), w[npoints] in d^(-1/2), normalised so that
 * integral |w|^2 d(x/d) = 1.  CP_ENUMERIC if the phase convention fails (a Bloch function
 * vanishing at the well centre). */
cp_status cp_lattice_wannier(double depth_er, int band, double half_range, size_t npoints,
                             double *x_sites, double *w, cp_error *err);

/* cp_lattice_wannier with a work estimate and cancellation: when the estimated CPU time
 * (the Kohn coefficients plus npoints x (a + b size) for a size-state basis, fitted on a
 * 2020s desktop core: docs/api/lattice.md) exceeds max_seconds (> 0; +inf: no limit),
 * nothing is computed and CP_ETOOLONG is returned, its message giving the estimate and
 * the points that would fit; *cancel (may be NULL) is polled before every quasimomentum
 * of the coefficients and every sampled point, and once it is non-zero CP_ECANCELED is
 * returned.  Outputs are NaN on either. */
cp_status cp_lattice_wannier_bounded(double depth_er, int band, double half_range,
                                     size_t npoints, double *x_sites, double *w,
                                     const cp_cancel_flag *cancel, double max_seconds,
                                     cp_error *err);

/* ---- heating by photon scattering ------------------------------------------------------- */

/* Photon scattering rate Gamma_sc = Im(alpha) I / (hbar eps0 c) (Grimm et al. 2000 [M])
 * of a molecule with imaginary polarizability alpha_imag (in `unit`, >= 0, at most 1e7
 * a.u.) in light of intensity `intensity` (W/m^2, [0, 1e14]); 1/s. */
cp_status cp_lattice_scattering_rate(double alpha_imag, cp_polarizability_unit unit,
                                     double intensity, double *rate, cp_error *err);

/* Validity flags of the lattice heating and loading results (bits of their `flags`). */
enum {
    /* heating: depth below 3 E_r, where eta^2 = 1/(2 sqrt(depth_er)) exceeds ~0.3 and the
     * Lamb-Dicke (eta^2 << 1), harmonic-well band-excitation rate does not hold */
    CP_LATTICE_FLAG_SHALLOW = 1u,
    /* loading: excited_fraction above 0.05, beyond where first-order adiabatic
     * perturbation theory is trustworthy */
    CP_LATTICE_FLAG_BEYOND_FIRST_ORDER = 2u
};

typedef struct cp_lattice_heating_result {
    double energy_rate;          /* J/s per particle: 2 E_rec Gamma_sc */
    double temperature_rate;     /* K/s in a 3D harmonic trap (E = 3 kB T): 2 E_rec Gamma/(3 kB) */
    double band_excitation_rate; /* 1/s: rate out of the lowest band along the lattice axis */
    double lamb_dicke;           /* eta of the trap light along the axis (see cp_lattice_site) */
    unsigned flags;              /* CP_LATTICE_FLAG_SHALLOW when depth_er < 3, else 0 */
} cp_lattice_heating_result;

/* Heating of a molecule in the lowest band of a 1D lattice of depth depth_er ((0, 1e4])
 * from photon scattering at rate scattering_rate (1/s, [0, 1e9]); recoil = E_r of the
 * lattice light (J, > 0; the lattice is retro-reflected so E_rec = E_r).
 * Energy: each scattering adds 2 E_rec on average (absorption and spontaneous emission
 * recoil; Grimm et al. 2000 [M], docs/models/lattice.md).  Band excitation: in the Lamb-Dicke
 * regime the emitted photon's kick hbar k cos(theta) along the axis excites the first
 * band with probability eta^2 <cos^2 theta> = eta^2 / 3 (isotropic emission), while
 * absorption from the standing wave at its antinode does not change the band to first
 * order; so rate = Gamma_sc eta^2 / 3 = Gamma_sc / (6 sqrt(depth_er)) (derived here,
 * harmonic well, eta^2 << 1). */
cp_status cp_lattice_heating(double scattering_rate, double recoil, double depth_er,
                             cp_lattice_heating_result *result, cp_error *err);

/* ---- loading adiabaticity --------------------------------------------------------------- */

typedef enum cp_lattice_ramp_shape {
    CP_RAMP_LINEAR = 0,      /* V0(t) = Vi + (Vf - Vi) t / T */
    CP_RAMP_EXPONENTIAL = 1, /* V0(t) = Vi + (Vf - Vi) (1 - e^(-t/tau)) / (1 - e^(-T/tau)) */
    CP_RAMP_S_SHAPED = 2,    /* V0(t) = Vi + (Vf - Vi) sin^2(pi t / (2 T)) */
    CP_RAMP_SAMPLED = 3      /* piecewise linear through (times[i], depths_er[i]) */
} cp_lattice_ramp_shape;

typedef struct cp_lattice_ramp {
    cp_lattice_ramp_shape shape;
    double start_er, end_er;  /* Vi, Vf in E_r, [0, 1e4] (analytic shapes) */
    double duration;          /* T, s, (0, 1e4] (analytic shapes) */
    double time_constant;     /* tau, s, > 0 (exponential only) */
    size_t samples;           /* points at which analytic shapes are evaluated, [2, 1e5] */
    const double *times;      /* sampled: n_sampled strictly increasing times, s */
    const double *depths_er;  /* sampled: n_sampled depths, E_r, [0, 1e4] */
    size_t n_sampled;         /* sampled: [2, 1e5] */
    double recoil;            /* E_r, J, (0, 1e-20] */
} cp_lattice_ramp;

typedef struct cp_lattice_loading_result {
    double max_adiabaticity; /* max over the ramp of hbar |<2|dH/dt|0>| / (E_2 - E_0)^2 at
                                q = 0: << 1 for adiabatic loading */
    double max_time;         /* s, where the maximum occurs */
    double max_depth_er;     /* depth there */
    double simple_criterion; /* max of hbar |dV0/dt| / (16 E_r^2): the free-particle bound
                                of J. Hecker Denschlag et al., J. Phys. B 35, 3095 (2002) */
    double excited_fraction; /* first-order estimate of the population left in bands 2 and
                                4 at the end (q = 0) */
    int basis_size;          /* even-parity plane waves used */
    unsigned flags;          /* CP_LATTICE_FLAG_BEYOND_FIRST_ORDER when excited_fraction >
                                0.05, else 0 */
} cp_lattice_loading_result;

/* Interband adiabaticity of loading a condensate (quasimomentum 0, band 0) by a depth
 * ramp.  At q = 0 parity couples band 0 only to bands 2, 4, ...; in the even-parity
 * plane-wave basis the band energies E_n(V0) and couplings <n|dH/dV0|0> are computed at
 * every sample, and the excited amplitudes from first-order adiabatic perturbation theory,
 *   c_n = -integral <n|dH/dt|0> / (E_n - E_0) exp(i integral (E_n - E_0) dt' / hbar) dt,
 * integrated exactly for amplitude and phase linear between samples (Filon's method), so
 * the estimate holds even when the phase turns by many radians between samples.  Valid
 * while excited_fraction << 1.  Outputs are NaN on error. */
cp_status cp_lattice_loading(const cp_lattice_ramp *ramp, cp_lattice_loading_result *result,
                             cp_error *err);

#ifdef __cplusplus
}
#endif
#endif

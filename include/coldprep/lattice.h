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
 * accurate for the smooth periodic E), doubling the points until two estimates agree to
 * 1e-12 E_r; *error_er (may be NULL) receives the last difference as an error estimate.
 *   depth_er in (0, CP_LATTICE_MAX_DEPTH_ER]; band in [0, CP_LATTICE_MAX_BANDS - 1].
 * Outputs (E_r): *j1_er nearest, *j2_er next-nearest neighbour (either may be NULL),
 * *mean_er (may be NULL) the band's centre of mass.  CP_ENOCONV if the estimate does not
 * settle to 1e-8 E_r (only for extremely shallow lattices). */
cp_status cp_lattice_tunnelling(double depth_er, int band, double *j1_er, double *j2_er,
                                double *mean_er, double *error_er, cp_error *err);

#ifdef __cplusplus
}
#endif
#endif

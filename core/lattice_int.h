/*
 * Private helpers of the lattice model: the eigen solver for the real symmetric tridiagonal
 * plane-wave Hamiltonian with a constant off-diagonal, and the Hamiltonian itself.  Not
 * installed.
 */
#ifndef COLDPREP_LATTICE_INT_H
#define COLDPREP_LATTICE_INT_H

#include "coldprep/status.h"

/* A real symmetric tridiagonal matrix with diagonal diag[0..n-1], first off-diagonal
 * element (rows 0 and 1) off_first and every other off-diagonal element equal to off. */
typedef struct cp_tridiag {
    int n;
    const double *diag;
    double off;
    double off_first;
    const cp_cancel_flag *cancel; /* polled before each eigenvalue's bisection (may be NULL) */
} cp_tridiag;

/* Number of eigenvalues of t strictly below x (Sturm sequence count). */
int cp_tridiag_count(const cp_tridiag *t, double x);

/* The m lowest eigenvalues of t, ascending, into x[0..m-1] (m <= t->n).  If have_guess,
 * x holds starting guesses (one per eigenvalue, ascending) that are refined by Newton's
 * iteration and accepted only if a Sturm count proves each is the right eigenvalue;
 * otherwise (or when that proof fails) each eigenvalue is isolated by bisection and then
 * refined by a bracketed Newton iteration.  work: 4 * (m + 1) doubles.  Accuracy:
 * 2e-14 (1 + |x|).  CP_ENOCONV if an iteration does not finish (not expected);
 * CP_ECANCELED once *t->cancel is set. */
cp_status cp_tridiag_lowest(const cp_tridiag *t, int m, int have_guess, double *x,
                            double *work);

/* The normalised eigenvector v[0..n-1] of t for the (simple) eigenvalue lambda, by a
 * twisted factorisation of t - lambda I.  The sign is fixed so that the largest
 * component is positive.  work: 2 n doubles. */
void cp_tridiag_vector(const cp_tridiag *t, double lambda, double *v, double *work);

/* Fill diag[0..n-1] (n = 2 L + 1) with the plane-wave Hamiltonian's diagonal
 * (q + 2 l)^2 + V0/2 for l = -L..L, in E_r; the off-diagonal is -V0/4. */
void cp_lattice_fill_diagonal(double depth_er, double q, int n, double *diag);

/* Half-width L of the automatic plane-wave basis l = -L..L for the lowest `bands` bands at
 * depth depth_er (see lattice_bands.c); inputs already validated. */
int cp_lattice_auto_half_width(double depth_er, int bands);

/* Quasimomentum folded into the first zone and made non-negative: result in [0, 1]. */
double cp_lattice_fold_q(double q);

#endif

/*
 * Private: a real symmetric tridiagonal eigen solver for the lowest few levels (see
 * fields_tridiag.c).  Not installed.
 */
#ifndef COLDPREP_FIELDS_TRI_INT_H
#define COLDPREP_FIELDS_TRI_INT_H

#include "coldprep/status.h"

/* Diagonal a[0..n-1] ascending; off-diagonal b[0..n-2] and its squares b2; norm_off an
 * upper bound on the 2-norm of the off-diagonal part; pmin the smallest pivot magnitude
 * (a smaller pivot is replaced by -pmin, as LAPACK's dstebz does). */
typedef struct cp_fields_tri {
    int n;
    const double *a, *b, *b2;
    double norm_off;
    double pmin;
} cp_fields_tri;

/* Scratch: lo, hi, x and state of at least m elements, the others of at least 2 m. */
typedef struct cp_fields_tri_scratch {
    double *lo, *hi, *x, *s, *step, *r, *dp, *sum;
    int *state, *count;
} cp_fields_tri_scratch;

/* The m lowest eigenvalues (ascending) into lambda[0..m-1], m <= n, each to a relative
 * accuracy of a few DBL_EPSILON of max(|lambda_k|, scale[k]).  guess (may be NULL): starting
 * points, used when inside the level's bracket.  CP_ENOCONV / CP_ENUMERIC on failure (not
 * expected). */
cp_status cp_fields_tri_lowest(const cp_fields_tri *t, int m, const double *scale,
                               const double *guess, double *lambda, cp_fields_tri_scratch *sc);

/* Normalised eigenvector v[0..n-1] for the simple eigenvalue lambda (sign arbitrary);
 * fwd, bwd: n doubles of scratch each. */
void cp_fields_tri_vector(const cp_fields_tri *t, double lambda, double *v, double *fwd,
                          double *bwd);

#endif

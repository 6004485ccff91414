/*
 * Linear solves with a fixed sparsity pattern (see fixed_lu_int.h).  Gaussian elimination
 * without pivoting in an order chosen to keep the fill-in small: the greedy minimum-degree
 * order (at each step the unknown with the fewest remaining neighbours in the symmetrised
 * pattern; H. M. Markowitz, Manage. Sci. 3, 255 (1957) for the idea, here in its symmetric
 * form [M]).  Bit sets hold the rows of the pattern.
 */
#include <math.h>
#include <string.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_linalg.h>

#include "fixed_lu_int.h"

static int popcount(uint32_t v)
{
    int c = 0;
    for (; v; v &= v - 1)
        c++;
    return c;
}

void cp_fixed_lu_plan(cp_fixed_lu *f, int n, const uint16_t pattern[])
{
    uint32_t row[CP_FIXED_LU_MAX], sym[CP_FIXED_LU_MAX], left = 0;
    f->n = n;
    for (int i = 0; i < n; i++) {
        row[i] = pattern[i] | (1u << i);
        left |= 1u << i;
    }
    for (int i = 0; i < n; i++) {
        sym[i] = row[i];
        for (int j = 0; j < n; j++)
            if (row[j] >> i & 1u)
                sym[i] |= 1u << j;
    }
    /* the order: the remaining unknown with the fewest remaining neighbours; eliminating it
     * joins its neighbours to each other (the fill-in) */
    for (int k = 0; k < n; k++) {
        int best = -1, best_degree = n + 1;
        for (int i = 0; i < n; i++)
            if (left >> i & 1u) {
                int d = popcount(sym[i] & left);
                if (d < best_degree) {
                    best = i;
                    best_degree = d;
                }
            }
        f->order[k] = (uint16_t)best;
        left &= ~(1u << best);
        uint32_t nb = sym[best] & left;
        for (int i = 0; i < n; i++)
            if (nb >> i & 1u)
                sym[i] |= nb & ~(1u << i);
    }
    /* the fill-in in that order: row i gains the entries of pivot row p right of p */
    left = 0;
    for (int i = 0; i < n; i++)
        left |= 1u << i;
    int nb = 0, nr = 0;
    for (int k = 0; k < n; k++) {
        int p = f->order[k];
        left &= ~(1u << p);
        f->first[k] = (uint16_t)nb;
        f->first_right[k] = (uint16_t)nr;
        for (int j = 0; j < n; j++)
            if ((left >> j & 1u) && (row[p] >> j & 1u))
                f->right[nr++] = (uint16_t)j;
        for (int i = 0; i < n; i++)
            if ((left >> i & 1u) && (row[i] >> p & 1u)) {
                f->below[nb++] = (uint16_t)i;
                row[i] |= row[p] & left;
            }
    }
    f->first[n] = (uint16_t)nb;
    f->first_right[n] = (uint16_t)nr;
}

/* Elimination without pivoting; -1 when a pivot is below min_pivot (or not a number). */
/* The inverse of a pivot block (size 1, 2 or 3, row-major) and its determinant. */
static inline double invert(int nb, const double *restrict m, double *restrict inv)
{
    if (nb == 1) {
        inv[0] = 1.0 / m[0];
        return m[0];
    }
    if (nb == 2) {
        double det = m[0] * m[3] - m[1] * m[2];
        inv[0] = m[3] / det;
        inv[1] = -m[1] / det;
        inv[2] = -m[2] / det;
        inv[3] = m[0] / det;
        return det;
    }
    /* 3 x 3 by cofactors */
    double c00 = m[4] * m[8] - m[5] * m[7], c01 = m[5] * m[6] - m[3] * m[8],
           c02 = m[3] * m[7] - m[4] * m[6];
    double det = m[0] * c00 + m[1] * c01 + m[2] * c02;
    inv[0] = c00 / det;
    inv[1] = (m[2] * m[7] - m[1] * m[8]) / det;
    inv[2] = (m[1] * m[5] - m[2] * m[4]) / det;
    inv[3] = c01 / det;
    inv[4] = (m[0] * m[8] - m[2] * m[6]) / det;
    inv[5] = (m[2] * m[3] - m[0] * m[5]) / det;
    inv[6] = c02 / det;
    inv[7] = (m[1] * m[6] - m[0] * m[7]) / det;
    inv[8] = (m[0] * m[4] - m[1] * m[3]) / det;
    return det;
}

/* c = l r (blocks), c -= m d (blocks) and y -= m x (a block times a group). */
static inline void product(int nb, const double *restrict l, const double *restrict r,
                           double *restrict c)
{
    for (int i = 0; i < nb; i++)
        for (int j = 0; j < nb; j++) {
            double s = 0.0;
            for (int k = 0; k < nb; k++)
                s += l[i * nb + k] * r[k * nb + j];
            c[i * nb + j] = s;
        }
}

static inline void sub_product(int nb, double *restrict c, const double *restrict m,
                               const double *restrict d)
{
    for (int i = 0; i < nb; i++)
        for (int j = 0; j < nb; j++) {
            double s = 0.0;
            for (int k = 0; k < nb; k++)
                s += m[i * nb + k] * d[k * nb + j];
            c[i * nb + j] -= s;
        }
}

static inline void sub_apply(int nb, double *restrict y, const double *restrict m,
                             const double *restrict x)
{
    for (int i = 0; i < nb; i++) {
        double s = 0.0;
        for (int k = 0; k < nb; k++)
            s += m[i * nb + k] * x[k];
        y[i] -= s;
    }
}

/* Elimination with blocks of nb x nb; inlined with nb constant for each block size. */
static inline int eliminate(const cp_fixed_lu *f, int nb, double *restrict a,
                            double *restrict b, double min_pivot)
{
    enum { MB = CP_FIXED_LU_MAX_BLOCK * CP_FIXED_LU_MAX_BLOCK };
    const int n = f->n, bb = nb * nb;
    const uint16_t *restrict below = f->below, *restrict right = f->right;
    double inv[CP_FIXED_LU_MAX][MB];
    for (int k = 0; k < n; k++) {
        const int p = f->order[k], r0 = f->first_right[k], r1 = f->first_right[k + 1];
        double *iv = inv[p];
        if (!(fabs(invert(nb, a + bb * (p * n + p), iv)) >= min_pivot))
            return -1;
        for (int q = f->first[k]; q < f->first[k + 1]; q++) {
            const int i = below[q];
            double m[MB]; /* the multiplier block l p^-1 */
            product(nb, a + bb * (i * n + p), iv, m);
            for (int r = r0; r < r1; r++)
                sub_product(nb, a + bb * (i * n + right[r]), m, a + bb * (p * n + right[r]));
            sub_apply(nb, b + nb * i, m, b + nb * p);
        }
    }
    for (int k = n - 1; k >= 0; k--) {
        const int p = f->order[k];
        double s[CP_FIXED_LU_MAX_BLOCK];
        for (int e = 0; e < nb; e++)
            s[e] = b[nb * p + e];
        for (int r = f->first_right[k]; r < f->first_right[k + 1]; r++)
            sub_apply(nb, s, a + bb * (p * n + right[r]), b + nb * right[r]);
        for (int i = 0; i < nb; i++) {
            double x = 0.0;
            for (int e = 0; e < nb; e++)
                x += inv[p][i * nb + e] * s[e];
            b[nb * p + i] = x;
        }
    }
    return 0;
}

int cp_fixed_lu_solve(const cp_fixed_lu *f, int block, double a[], double b[],
                      double min_pivot)
{
    switch (block) {
    case 1:
        return eliminate(f, 1, a, b, min_pivot);
    case 2:
        return eliminate(f, 2, a, b, min_pivot);
    case 3:
        return eliminate(f, 3, a, b, min_pivot);
    default:
        return -1;
    }
}

int cp_pivoted_solve(int n, int block, double a[], double b[])
{
    enum { MAX = CP_FIXED_LU_MAX_BLOCK * CP_FIXED_LU_MAX };
    const int m = block * n, bb = block * block;
    if (block > 1) {
        /* from blocks to an ordinary m x m matrix */
        double blocks[MAX * MAX];
        memcpy(blocks, a, (size_t)(m * m) * sizeof *a);
        for (int i = 0; i < m; i++)
            for (int j = 0; j < m; j++)
                a[i * m + j] = blocks[bb * ((i / block) * n + j / block) +
                                      block * (i % block) + j % block];
    }
    size_t perm_data[MAX];
    gsl_permutation perm = {(size_t)m, perm_data};
    gsl_matrix_view mv = gsl_matrix_view_array(a, (size_t)m, (size_t)m);
    gsl_vector_view v = gsl_vector_view_array(b, (size_t)m);
    int sign;
    int st = gsl_linalg_LU_decomp(&mv.matrix, &perm, &sign);
    if (st == GSL_SUCCESS)
        st = gsl_linalg_LU_svx(&mv.matrix, &perm, &v.vector);
    return st == GSL_SUCCESS ? 0 : -1;
}

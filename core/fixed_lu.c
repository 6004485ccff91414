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

#include "clones_int.h"
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
    /* the rows now hold the pattern with its fill-in */
    f->n_used = 0;
    for (int i = 0; i < n; i++)
        for (int j = 0; j < n; j++)
            if (row[i] >> j & 1u)
                f->used[f->n_used++] = (uint16_t)(i * n + j);
}

/* Elimination without pivoting; -1 when a pivot is below min_pivot (or not a number). */
int cp_fixed_lu_solve(const cp_fixed_lu *f, double *restrict a, double *restrict b,
                      double min_pivot)
{
    const int n = f->n;
    const uint16_t *restrict below = f->below, *restrict right = f->right;
    for (int k = 0; k < n; k++) {
        const int p = f->order[k], r0 = f->first_right[k], r1 = f->first_right[k + 1];
        const double *restrict pivot_row = a + p * n;
        const double pivot = pivot_row[p];
        if (!(fabs(pivot) >= min_pivot))
            return -1;
        for (int q = f->first[k]; q < f->first[k + 1]; q++) {
            double *restrict row = a + below[q] * n;
            const double m = row[p] / pivot;
            for (int r = r0; r < r1; r++)
                row[right[r]] -= m * pivot_row[right[r]];
            b[below[q]] -= m * b[p];
        }
    }
    for (int k = n - 1; k >= 0; k--) {
        const int p = f->order[k], r0 = f->first_right[k], r1 = f->first_right[k + 1];
        const double *restrict row = a + p * n;
        double s = b[p];
        for (int r = r0; r < r1; r++)
            s -= row[right[r]] * b[right[r]];
        b[p] = s / row[p];
    }
    return 0;
}

/* The inverse of a 3 x 3 block by cofactors, as three rows; returns the determinant. */
static inline double invert3(const cp_block_row m[3], cp_block_row inv[3])
{
    const double a = m[0][0], b = m[0][1], c = m[0][2], d = m[1][0], e = m[1][1],
                 g = m[1][2], h = m[2][0], i = m[2][1], j = m[2][2];
    const double c00 = e * j - g * i, c01 = g * h - d * j, c02 = d * i - e * h;
    const double det = a * c00 + b * c01 + c * c02, r = 1.0 / det;
    inv[0] = (cp_block_row){c00, c * i - b * j, b * g - c * e, 0.0} * r;
    inv[1] = (cp_block_row){c01, a * j - c * h, c * d - a * g, 0.0} * r;
    inv[2] = (cp_block_row){c02, b * h - a * i, a * e - b * d, 0.0} * r;
    return det;
}

double cp_block_invert(const cp_block_row m[3], cp_block_row inv[3])
{
    return invert3(m, inv);
}

/* c = l r and c -= l r for 3 x 3 blocks, a row at a time (one vector each). */
static inline void block_product(const cp_block_row l[3], const cp_block_row r[3],
                                 cp_block_row c[3])
{
    for (int i = 0; i < 3; i++)
        c[i] = l[i][0] * r[0] + l[i][1] * r[1] + l[i][2] * r[2];
}

static inline void block_sub_product(cp_block_row *restrict c, const cp_block_row m[3],
                                     const cp_block_row *restrict d)
{
    for (int i = 0; i < 3; i++)
        c[i] -= m[i][0] * d[0] + m[i][1] * d[1] + m[i][2] * d[2];
}

/* y -= m x for a 3 x 3 block and a group of three. */
static inline void block_sub_apply(double *restrict y, const cp_block_row m[3],
                                   const double *restrict x)
{
    for (int i = 0; i < 3; i++)
        y[i] -= m[i][0] * x[0] + m[i][1] * x[1] + m[i][2] * x[2];
}

CP_AVX_CLONES int cp_fixed_lu_solve_blocks(const cp_fixed_lu *f, cp_block_row a[],
                                           double b[], double min_pivot)
{
    const int n = f->n;
    const uint16_t *restrict below = f->below, *restrict right = f->right;
    cp_block_row inv[CP_FIXED_LU_MAX][3];
    for (int k = 0; k < n; k++) {
        const int p = f->order[k], r0 = f->first_right[k], r1 = f->first_right[k + 1];
        if (!(fabs(invert3(a + 3 * (p * n + p), inv[p])) >= min_pivot))
            return -1;
        for (int q = f->first[k]; q < f->first[k + 1]; q++) {
            const int i = below[q];
            cp_block_row m[3]; /* the multiplier block l p^-1 */
            block_product(a + 3 * (i * n + p), inv[p], m);
            for (int r = r0; r < r1; r++)
                block_sub_product(a + 3 * (i * n + right[r]), m, a + 3 * (p * n + right[r]));
            block_sub_apply(b + 3 * i, m, b + 3 * p);
        }
    }
    for (int k = n - 1; k >= 0; k--) {
        const int p = f->order[k];
        double s[3] = {b[3 * p], b[3 * p + 1], b[3 * p + 2]};
        for (int r = f->first_right[k]; r < f->first_right[k + 1]; r++)
            block_sub_apply(s, a + 3 * (p * n + right[r]), b + 3 * right[r]);
        for (int i = 0; i < 3; i++)
            b[3 * p + i] = inv[p][i][0] * s[0] + inv[p][i][1] * s[1] + inv[p][i][2] * s[2];
    }
    return 0;
}

int cp_pivoted_solve(int n, double a[], double b[])
{
    enum { MAX = CP_FIXED_LU_BLOCK * CP_FIXED_LU_MAX };
    size_t perm_data[MAX];
    gsl_permutation perm = {(size_t)n, perm_data};
    gsl_matrix_view mv = gsl_matrix_view_array(a, (size_t)n, (size_t)n);
    gsl_vector_view v = gsl_vector_view_array(b, (size_t)n);
    int sign;
    int st = gsl_linalg_LU_decomp(&mv.matrix, &perm, &sign);
    if (st == GSL_SUCCESS)
        st = gsl_linalg_LU_svx(&mv.matrix, &perm, &v.vector);
    return st == GSL_SUCCESS ? 0 : -1;
}

int cp_pivoted_solve_blocks(int n, const cp_block_row a[], double b[])
{
    enum { MAX = CP_FIXED_LU_BLOCK * CP_FIXED_LU_MAX };
    const int m = 3 * n;
    double plain[MAX * MAX];
    for (int i = 0; i < m; i++)
        for (int j = 0; j < m; j++)
            plain[i * m + j] = a[3 * ((i / 3) * n + j / 3) + i % 3][j % 3];
    return cp_pivoted_solve(m, plain, b);
}

/*
 * Private to the core: linear solves with a fixed sparsity pattern.  The elimination order
 * (greedy minimum degree) and the fill-in are worked out once from the pattern; every solve
 * then touches only the entries that can be nonzero, without pivoting.  The entries are
 * numbers or square blocks of up to 3 x 3 (the stage equations of an s-stage Runge-Kutta
 * method, where each nonzero of the generator becomes a block coupling the s stages).  When
 * a pivot comes out small the caller solves again with partial pivoting.  Not installed.
 */
#ifndef COLDPREP_FIXED_LU_INT_H
#define COLDPREP_FIXED_LU_INT_H

#include <stdint.h>

enum { CP_FIXED_LU_MAX = 16, CP_FIXED_LU_MAX_BLOCK = 3 };

typedef struct cp_fixed_lu {
    int n;
    /* 16-bit indices (not char types, which the compiler must assume alias the matrix) */
    uint16_t order[CP_FIXED_LU_MAX]; /* the k-th pivot (row and column index) */
    /* the rows below pivot k are below[first[k] .. first[k + 1]), the columns right of it
     * right[first_right[k] .. first_right[k + 1]) */
    uint16_t first[CP_FIXED_LU_MAX + 1], first_right[CP_FIXED_LU_MAX + 1];
    uint16_t below[CP_FIXED_LU_MAX * CP_FIXED_LU_MAX];
    uint16_t right[CP_FIXED_LU_MAX * CP_FIXED_LU_MAX];
} cp_fixed_lu;

/* Plan the elimination of n x n matrices (n <= CP_FIXED_LU_MAX) whose entry (i, j) can be
 * nonzero only if bit j of pattern[i] is set; the diagonal is taken as nonzero. */
void cp_fixed_lu_plan(cp_fixed_lu *f, int n, const uint16_t pattern[]);

/* Solve a x = b without pivoting for a matrix of n x n blocks of size block x block (1 for
 * numbers, up to CP_FIXED_LU_MAX_BLOCK) with the pattern planned for: block (i, j) is
 * a[block^2 (i n + j) ...] (row-major within the block), b holds n groups of block values
 * and is replaced by x; a is overwritten.  Returns 0, or -1 when a pivot block's
 * determinant falls below min_pivot in magnitude (growth: then a and b are spoilt and the
 * caller solves with cp_pivoted_solve from the matrix again). */
int cp_fixed_lu_solve(const cp_fixed_lu *f, int block, double a[], double b[],
                      double min_pivot);

/* The fallback: the same system (layout as above) with partial pivoting (GSL's LU
 * decomposition).  Returns 0, or -1 when a is singular. */
int cp_pivoted_solve(int n, int block, double a[], double b[]);

#endif

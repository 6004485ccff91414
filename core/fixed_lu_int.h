/*
 * Private to the core: linear solves with a fixed sparsity pattern.  The elimination order
 * (greedy minimum degree) and the fill-in are worked out once from the pattern; every solve
 * then touches only the entries that can be nonzero, without pivoting.  The entries are
 * numbers or 3 x 3 blocks (the stage equations of a three-stage Runge-Kutta method, where
 * each nonzero of the generator becomes a block coupling the stages).  When a pivot comes
 * out small the caller solves again with partial pivoting.  Not installed.
 */
#ifndef COLDPREP_FIXED_LU_INT_H
#define COLDPREP_FIXED_LU_INT_H

#include <stdint.h>

enum { CP_FIXED_LU_MAX = 16, CP_FIXED_LU_BLOCK = 3 };

/* One row of a 3 x 3 block, padded to four doubles so that it is one vector (GCC's and
 * Clang's vector extension: two SSE2 registers or one AVX register). */
typedef double cp_block_row __attribute__((vector_size(4 * sizeof(double))));

typedef struct cp_fixed_lu {
    int n;
    /* 16-bit indices (not char types, which the compiler must assume alias the matrix) */
    uint16_t order[CP_FIXED_LU_MAX]; /* the k-th pivot (row and column index) */
    /* the rows below pivot k are below[first[k] .. first[k + 1]), the columns right of it
     * right[first_right[k] .. first_right[k + 1]) */
    uint16_t first[CP_FIXED_LU_MAX + 1], first_right[CP_FIXED_LU_MAX + 1];
    uint16_t below[CP_FIXED_LU_MAX * CP_FIXED_LU_MAX];
    uint16_t right[CP_FIXED_LU_MAX * CP_FIXED_LU_MAX];
    /* every entry the elimination reads or writes (the pattern, the diagonal and the
     * fill-in), as i n + j: the ones a caller must set, to zero where the matrix has none */
    uint16_t used[CP_FIXED_LU_MAX * CP_FIXED_LU_MAX];
    int n_used;
} cp_fixed_lu;

/* Plan the elimination of n x n matrices (n <= CP_FIXED_LU_MAX) whose entry (i, j) can be
 * nonzero only if bit j of pattern[i] is set; the diagonal is taken as nonzero. */
void cp_fixed_lu_plan(cp_fixed_lu *f, int n, const uint16_t pattern[]);

/* Solve a x = b without pivoting, a (n x n numbers, row-major) with the pattern planned for;
 * b is replaced by x, a is overwritten.  Returns 0, or -1 when a pivot falls below min_pivot
 * in magnitude (growth: then a and b are spoilt and the caller solves again, from the
 * matrix, with cp_pivoted_solve). */
int cp_fixed_lu_solve(const cp_fixed_lu *f, double a[], double b[], double min_pivot);

/* The same for n x n blocks of 3 x 3: row r of block (i, j) is a[3 (i n + j) + r] (its
 * fourth element unused), b holds n groups of three; min_pivot bounds the determinants of
 * the pivot blocks. */
int cp_fixed_lu_solve_blocks(const cp_fixed_lu *f, cp_block_row a[], double b[],
                             double min_pivot);

/* The inverse of a 3 x 3 block by cofactors, as three rows; returns its determinant. */
double cp_block_invert(const cp_block_row m[3], cp_block_row inv[3]);

/* The fallbacks: the same systems with partial pivoting (GSL's LU decomposition); a is
 * overwritten.  Return 0, or -1 when a is singular. */
int cp_pivoted_solve(int n, double a[], double b[]);
int cp_pivoted_solve_blocks(int n, const cp_block_row a[], double b[]);

#endif

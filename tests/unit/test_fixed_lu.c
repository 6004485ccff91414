/*
 * Linear solves with a fixed sparsity pattern (core/fixed_lu.c): against GSL's LU
 * decomposition with partial pivoting (the reference library) on random matrices of random
 * patterns, as numbers and as 3 x 3 blocks; a small pivot is reported and the pivoted
 * fallback solves the same system.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include <cmocka.h>
#include <gsl/gsl_linalg.h>
#include <gsl/gsl_rng.h>

#include "fixed_lu_int.h"

enum { B = CP_FIXED_LU_BLOCK, MAXN = CP_FIXED_LU_MAX * CP_FIXED_LU_BLOCK };

/* A random pattern of n (block) rows, about a third of the entries, and an m x m matrix
 * (m = n block) with it: random entries, the diagonal dominant so that elimination without
 * pivoting is stable. */
static void random_system(gsl_rng *rng, int n, int block, uint16_t pattern[], double a[],
                          double b[])
{
    const int m = n * block;
    memset(a, 0, (size_t)(m * m) * sizeof *a);
    for (int i = 0; i < n; i++) {
        pattern[i] = 0;
        for (int j = 0; j < n; j++)
            if (i != j && gsl_rng_uniform(rng) < 1.0 / 3)
                pattern[i] |= (uint16_t)(1u << j);
    }
    for (int i = 0; i < m; i++) {
        for (int j = 0; j < m; j++)
            if (i / block == j / block || (pattern[i / block] >> (j / block) & 1u))
                a[i * m + j] = gsl_rng_uniform(rng) - 0.5;
        a[i * m + i] += 2.0 * block;
        b[i] = gsl_rng_uniform(rng) - 0.5;
    }
}

/* The m x m matrix a as n x n blocks of 3 x 3 rows. */
static void to_blocks(int n, const double a[], cp_block_row rows[])
{
    const int m = n * B;
    for (int i = 0; i < m; i++)
        for (int j = 0; j < m; j++)
            rows[B * ((i / B) * n + j / B) + i % B][j % B] = a[i * m + j];
}

/* x = a^-1 b by GSL (a m x m, copied). */
static void gsl_reference(int m, const double a[], const double b[], double x[])
{
    gsl_matrix *g = gsl_matrix_alloc((size_t)m, (size_t)m);
    gsl_vector *rhs = gsl_vector_alloc((size_t)m), *sol = gsl_vector_alloc((size_t)m);
    gsl_permutation *perm = gsl_permutation_alloc((size_t)m);
    for (int i = 0; i < m; i++) {
        gsl_vector_set(rhs, (size_t)i, b[i]);
        for (int j = 0; j < m; j++)
            gsl_matrix_set(g, (size_t)i, (size_t)j, a[i * m + j]);
    }
    int sign;
    gsl_linalg_LU_decomp(g, perm, &sign);
    gsl_linalg_LU_solve(g, perm, rhs, sol);
    for (int i = 0; i < m; i++)
        x[i] = gsl_vector_get(sol, (size_t)i);
    gsl_permutation_free(perm);
    gsl_vector_free(sol);
    gsl_vector_free(rhs);
    gsl_matrix_free(g);
}

static void assert_solution(int m, const double b[], const double x[])
{
    for (int i = 0; i < m; i++)
        assert_true(fabs(b[i] - x[i]) <= 1e-12 * (1.0 + fabs(x[i])));
}

static void test_against_gsl(void **state)
{
    (void)state;
    gsl_rng *rng = gsl_rng_alloc(gsl_rng_mt19937);
    double a[MAXN * MAXN], b[MAXN], x[MAXN];
    cp_block_row rows[CP_FIXED_LU_MAX * CP_FIXED_LU_MAX * B];
    uint16_t pattern[CP_FIXED_LU_MAX];
    for (int trial = 0; trial < 100; trial++) {
        int n = 2 + (int)gsl_rng_uniform_int(rng, CP_FIXED_LU_MAX - 1);
        int block = trial % 2 ? B : 1;
        random_system(rng, n, block, pattern, a, b);
        gsl_reference(n * block, a, b, x);
        cp_fixed_lu f;
        cp_fixed_lu_plan(&f, n, pattern);
        if (block == 1) {
            assert_int_equal(cp_fixed_lu_solve(&f, a, b, 1e-6), 0);
        } else {
            to_blocks(n, a, rows);
            assert_int_equal(cp_fixed_lu_solve_blocks(&f, rows, b, 1e-6), 0);
        }
        assert_solution(n * block, b, x);
    }
    gsl_rng_free(rng);
}

/* The elimination order is a permutation, and a lower bidiagonal pattern gets no fill: one
 * multiplier per coupling, nothing right of the pivots, the diagonal and the couplings the
 * only entries used. */
static void test_plan(void **state)
{
    (void)state;
    uint16_t pattern[8] = {0};
    for (int i = 1; i < 8; i++)
        pattern[i] = (uint16_t)(1u << (i - 1));
    cp_fixed_lu f;
    cp_fixed_lu_plan(&f, 8, pattern);
    unsigned seen = 0;
    for (int k = 0; k < 8; k++)
        seen |= 1u << f.order[k];
    assert_int_equal(seen, 0xffu);
    assert_int_equal(f.first[8], 7);
    assert_int_equal(f.first_right[8], 0);
    assert_int_equal(f.n_used, 15);
}

/* Zero diagonal entries are reported as small pivots; the pivoted solves give GSL's answer
 * for the same matrix. */
static void test_small_pivot_fallback(void **state)
{
    (void)state;
    for (int block = 1; block <= B; block += B - 1) {
        const int n = 3, m = n * block;
        uint16_t pattern[3] = {0x6, 0x5, 0x3}; /* all couplings */
        double a[MAXN * MAXN], a0[MAXN * MAXN], b[MAXN], b0[MAXN], x[MAXN];
        cp_block_row rows[9 * B];
        for (int i = 0; i < m; i++) {
            for (int j = 0; j < m; j++)
                a[i * m + j] = i / block == j / block ? 0.0 : 1.0 + 0.1 * (i + 2 * j);
            b[i] = 1.0 + i;
        }
        memcpy(a0, a, sizeof a);
        memcpy(b0, b, sizeof b);
        gsl_reference(m, a, b, x);
        cp_fixed_lu f;
        cp_fixed_lu_plan(&f, n, pattern);
        if (block == 1) {
            assert_int_equal(cp_fixed_lu_solve(&f, a, b, 1e-6), -1);
            memcpy(b, b0, sizeof b);
            assert_int_equal(cp_pivoted_solve(m, a0, b), 0);
        } else {
            to_blocks(n, a, rows);
            assert_int_equal(cp_fixed_lu_solve_blocks(&f, rows, b, 1e-6), -1);
            memcpy(b, b0, sizeof b);
            to_blocks(n, a0, rows);
            assert_int_equal(cp_pivoted_solve_blocks(n, rows, b), 0);
        }
        assert_solution(m, b, x);
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_against_gsl),
        cmocka_unit_test(test_plan),
        cmocka_unit_test(test_small_pivot_fallback),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

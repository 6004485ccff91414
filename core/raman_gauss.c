/*
 * Raman model: the implicit propagator away from resonance.  The three-stage Gauss-Legendre
 * collocation method (order 6, A-stable; J. C. Butcher, Math. Comp. 18, 50 (1964);
 * coefficients as in Hairer & Wanner, Solving Ordinary Differential Equations II, 2nd ed.,
 * Springer 1996, Sec. IV.5 [M]) for the linear system dy/dt = G(t) y.  The system being
 * linear, a step is one linear solve for the three stage values (30 unknowns), done by block
 * elimination in a fixed sparse order (fixed_lu.c): each nonzero of G is a 3 x 3 block.
 *
 * Why collocation: where |Delta| is large the coherences with |2> follow the fields
 * adiabatically and the free rotation at Delta is absent from the solution; the stage
 * equations of a collocation method hold at every stage, so its steps follow that slow
 * solution and are not limited by Delta (an explicit method must resolve the rotation to
 * stay stable; docs/models/raman.md).
 *
 * Error estimate: the derivatives at the nodes 0, c1, c2, c3, 1 of a step (the ends from the
 * generator, the stages from the stage values) combined with the weights of a fourth divided
 * difference, which cancel every cubic: of order h^5 y^(5).  In it the parts that rotate at
 * the detunings are filtered out by (I - h/4 G0)^-1, G0 the constant part of the generator
 * (detunings and decay), as Radau codes filter theirs by (I - gamma h J)^-1 (Hairer &
 * Wanner, Sec. IV.8 [M]); otherwise the estimate sees the rotation and the steps shrink with
 * Delta.  The estimate is controlled per unit time (it is divided by h / the transfer
 * duration), so that the local errors add up over the transfer to about the tolerance.
 */
#include <math.h>
#include <string.h>

#include "clones_int.h"
#include "raman_gauss_int.h"

enum { N = CP_RAMAN_DIM, S = CP_RAMAN_STAGES, NS = S * CP_RAMAN_DIM };

/* nodes, Butcher matrix and weights of the three-stage method (r = sqrt 15) */
#define R15 3.872983346207417
static const double node[S] = {0.5 - R15 / 10, 0.5, 0.5 + R15 / 10};
static const cp_block_row butcher[S] = {
    {5.0 / 36, 2.0 / 9 - R15 / 15, 5.0 / 36 - R15 / 30, 0.0},
    {5.0 / 36 + R15 / 24, 2.0 / 9, 5.0 / 36 - R15 / 24, 0.0},
    {5.0 / 36 + R15 / 30, 2.0 / 9 + R15 / 15, 5.0 / 36, 0.0}};
static const double weight[S] = {5.0 / 18, 4.0 / 9, 5.0 / 18};
static const double grow_max = 4.0, shrink_min = 0.2, safety = 0.9;
/* a pivot block of the stage equations (whose diagonal is 1 plus decay terms) with a
 * determinant below this means growth in the elimination without pivoting: the step is
 * solved again with pivoting */
static const double min_pivot = 1e-6;

void cp_raman_affine_init(cp_raman_affine *g, cp_raman_gen_ab gen, const void *ctx)
{
    double e[N] = {0}, g0[2][N], ga[N], gb[N];
    g->n = 0;
    for (int c = 0; c < N; c++) {
        e[c] = 1.0;
        gen(ctx, 0.0, 0.0, 0, e, g0[0]);
        gen(ctx, 0.0, 0.0, 1, e, g0[1]);
        gen(ctx, 1.0, 0.0, 0, e, ga);
        gen(ctx, 0.0, 1.0, 0, e, gb);
        e[c] = 0.0;
        for (int r = 0; r < N; r++) {
            cp_raman_entry x = {(uint16_t)r, (uint16_t)c, {g0[0][r], g0[1][r]},
                                ga[r] - g0[0][r], gb[r] - g0[0][r]};
            if (x.g0[0] != 0.0 || x.g0[1] != 0.0 || x.ga != 0.0 || x.gb != 0.0)
                g->e[g->n++] = x;
        }
    }
}

/* Weights of the fourth divided difference over the nodes 0, c1, c2, c3, 1, divided by
 * the first: sum_j w_j y'(t + x_j h) ~ h^4 y^(5) / (24 w_0). */
static void estimate_weights(double w[CP_RAMAN_STAGES + 2])
{
    double x[S + 2] = {0.0, node[0], node[1], node[2], 1.0};
    for (int j = 0; j < S + 2; j++) {
        double prod = 1.0;
        for (int m = 0; m < S + 2; m++)
            if (m != j)
                prod *= x[j] - x[m];
        w[j] = 1.0 / prod;
    }
    for (int j = S + 1; j >= 0; j--)
        w[j] /= w[0];
}

void cp_raman_gauss_init(cp_raman_gauss *s, const cp_raman_pulses *pl,
                         const cp_raman_affine *gen, double tol, double hstart)
{
    *s = (cp_raman_gauss){.pl = pl, .gen = gen, .tol = tol, .h = hstart, .hmax = INFINITY};
    uint16_t all[N] = {0}, constant[N] = {0};
    for (size_t k = 0; k < gen->n; k++) {
        const cp_raman_entry *x = &gen->e[k];
        all[x->row] |= (uint16_t)(1u << x->col);
        if (x->g0[0] != 0.0 || x->g0[1] != 0.0)
            constant[x->row] |= (uint16_t)(1u << x->col);
    }
    cp_fixed_lu_plan(&s->stages, N, all);
    cp_fixed_lu_plan(&s->filter, N, constant);
    estimate_weights(s->estimate);
    cp_block_invert(butcher, s->butcher_inv);
}

/* dy = G y for the half Rabi frequencies a, b. */
static void apply_generator(const cp_raman_affine *g, int slow, double a, double b,
                            const double y[], double dy[])
{
    memset(dy, 0, N * sizeof *dy);
    for (size_t k = 0; k < g->n; k++) {
        const cp_raman_entry *x = &g->e[k];
        dy[x->row] += (x->g0[slow] + a * x->ga + b * x->gb) * y[x->col];
    }
}

/* dy = G y at time t, the slow losses on (slow = 1) or off. */
static void derivative(const cp_raman_gauss *s, int slow, double t, const double y[],
                       double dy[])
{
    double a, b;
    cp_raman_pulses_half(s->pl, t, &a, &b);
    apply_generator(s->gen, slow, a, b, y, dy);
}

/* The stage equations I - h (A kron G) in blocks of S x S: block (r, c) couples component r
 * of the stages to component c, its row i is m[S (r N + c) + i] with elements
 * delta_ij - h a_ij G_j[r][c].  Only the blocks the elimination uses are set, or all of them
 * for the pivoted fallback. */
CP_AVX_CLONES static void cp_raman_stage_matrix(const cp_raman_gauss *s, double h, int slow,
                                                const double a[S], const double b[S], int all,
                                                cp_block_row m[])
{
    const cp_raman_affine *g = s->gen;
    const cp_fixed_lu *f = &s->stages;
    if (all)
        memset(m, 0, N * N * S * sizeof *m);
    else
        for (int u = 0; u < f->n_used; u++)
            for (int i = 0; i < S; i++)
                m[S * f->used[u] + i] = (cp_block_row){0.0};
    for (size_t k = 0; k < g->n; k++) {
        const cp_raman_entry *x = &g->e[k];
        cp_block_row *block = m + S * (x->row * N + x->col), hg = {0.0};
        for (int j = 0; j < S; j++)
            hg[j] = -h * (x->g0[slow] + a[j] * x->ga + b[j] * x->gb);
        for (int i = 0; i < S; i++)
            block[i] = butcher[i] * hg;
    }
    for (int v = 0; v < N; v++)
        for (int i = 0; i < S; i++)
            m[S * (v * N + v) + i][i] += 1.0;
}

/* Solve the stage equations for z (on entry the start value at every stage): without
 * pivoting in the planned order, or again with pivoting if a pivot came out small. */
static int solve_stages(const cp_raman_gauss *s, double h, int slow, const double a[S],
                        const double b[S], double z[])
{
    cp_block_row m[N * N * S];
    double z0[NS];
    memcpy(z0, z, sizeof z0);
    cp_raman_stage_matrix(s, h, slow, a, b, 0, m);
    if (cp_fixed_lu_solve_blocks(&s->stages, m, z, min_pivot) == 0)
        return 0;
    memcpy(z, z0, sizeof z0);
    cp_raman_stage_matrix(s, h, slow, a, b, 1, m);
    return cp_pivoted_solve_blocks(N, m, z);
}

/* The filter of the error estimate, I - h/4 G0. */
static void filter_matrix(const cp_raman_gauss *s, double h, int slow, double m[])
{
    const cp_raman_affine *g = s->gen;
    memset(m, 0, N * N * sizeof *m);
    for (size_t k = 0; k < g->n; k++)
        m[g->e[k].row * N + g->e[k].col] = -0.25 * h * g->e[k].g0[slow];
    for (int i = 0; i < N; i++)
        m[i * N + i] += 1.0;
}

/* The error estimate e (in place) filtered by (I - h/4 G0)^-1. */
static int filter_estimate(const cp_raman_gauss *s, double h, int slow, double e[])
{
    double m[N * N], e0[N];
    memcpy(e0, e, sizeof e0);
    filter_matrix(s, h, slow, m);
    if (cp_fixed_lu_solve(&s->filter, m, e, min_pivot) == 0)
        return 0;
    memcpy(e, e0, sizeof e0);
    filter_matrix(s, h, slow, m);
    return cp_pivoted_solve(N, m, e);
}

/* One trial step of length h from (t, y), the slow losses on or off: ynew, its derivative
 * dy1 and the error estimate relative to the tolerance (NaN if a linear solve failed). */
static double try_step(const cp_raman_gauss *s, int slow, double t, double h, const double y[],
                       double ynew[], double dy1[])
{
    const double *w = s->estimate;
    double a[S], b[S], z[NS], k[S][N], e[N];
    for (int i = 0; i < S; i++)
        cp_raman_pulses_half(s->pl, t + node[i] * h, &a[i], &b[i]);
    for (int v = 0; v < N; v++)
        for (int i = 0; i < S; i++)
            z[S * v + i] = y[v];
    if (solve_stages(s, h, slow, a, b, z) != 0)
        return NAN;
    /* the derivatives at the stages from the stage values: k = A^-1 (z - y) / h */
    for (int v = 0; v < N; v++)
        for (int i = 0; i < S; i++) {
            double sum = 0.0;
            for (int j = 0; j < S; j++)
                sum += s->butcher_inv[i][j] * (z[S * v + j] - y[v]);
            k[i][v] = sum / h;
        }
    for (int v = 0; v < N; v++) {
        double sum = 0.0;
        for (int i = 0; i < S; i++)
            sum += weight[i] * k[i][v];
        ynew[v] = y[v] + h * sum;
    }
    derivative(s, slow, t + h, ynew, dy1);
    for (int v = 0; v < N; v++) {
        double sum = w[0] * s->dy0[v] + w[S + 1] * dy1[v];
        for (int i = 0; i < S; i++)
            sum += w[i + 1] * k[i][v];
        e[v] = h * sum;
    }
    if (filter_estimate(s, h, slow, e) != 0)
        return NAN;
    double err = 0.0;
    for (int v = 0; v < N; v++)
        err = fabs(e[v]) > err ? fabs(e[v]) : err;
    /* error per unit time: the local errors add up over the transfer duration (where the
     * pulses act) to about tol */
    double duration = s->pl->loss_to - s->pl->loss_from;
    return err == err ? err * duration / (h * s->tol) : NAN;
}

int cp_raman_gauss_apply(cp_raman_gauss *s, double *t, double t1, double y[])
{
    double ynew[N], dy1[N];
    /* a call starts at a break point or a trace sample and ends at the next (raman.c), so
     * the slow losses are on or off throughout; the derivative at the start is taken afresh
     * with them (at a break point the one carried over belongs to the left side) */
    const int slow = cp_raman_pulses_slow_on(s->pl, 0.5 * (*t + t1));
    derivative(s, slow, *t, y, s->dy0);
    while (*t < t1) {
        double h = fmin(s->h, s->hmax), left = t1 - *t;
        int last = h >= left;
        if (last)
            h = left;
        if (!(h > 1e-14 * fmax(fabs(*t), fabs(t1))) && !last)
            return -1;
        double err = try_step(s, slow, *t, h, y, ynew, dy1);
        /* the estimate per unit time goes as h^4 */
        double factor = err > 0 ? safety * pow(err, -0.25) : grow_max;
        if (!(err <= 1.0)) { /* rejected (NaN too) */
            s->h = h * (err == err ? fmax(shrink_min, fmin(factor, safety)) : shrink_min);
            continue;
        }
        memcpy(y, ynew, sizeof ynew);
        memcpy(s->dy0, dy1, sizeof dy1);
        *t = last ? t1 : *t + h;
        s->steps++;
        /* a shortened last step keeps the step size asked for before it */
        double grown = h * fmin(factor, grow_max);
        s->h = last ? fmax(s->h, grown) : grown;
    }
    return 0;
}

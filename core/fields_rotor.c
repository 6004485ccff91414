/*
 * The rigid rotor in a dc field, H/B = J(J+1) - x cos(theta), x = d F / B, in the basis
 * |J, M>, J = |M| .. |M| + N - 1, with the only off-diagonal elements
 *   <J, M| cos theta |J+1, M> = sqrt(((J+1)^2 - M^2) / ((2J+1)(2J+3)))
 * (Zare, Angular Momentum (Wiley, 1988), the matrix elements of the first-rank tensor
 * C_0^1 = cos theta).  The basis grows until the second-order energy shift from the first
 * omitted level, (x c_N)^2 |v_N-1|^2 / (E_N^0 - E), is below the tolerance for every level
 * asked for; <cos theta> (the Hellmann-Feynman derivative -d(E/B)/dx) comes from the
 * eigenvector.
 */
#include <math.h>
#include <stdlib.h>

#include "fields_int.h"

/* Relative truncation error allowed for each energy: a hundredth of the documented
 * tolerance, so that the reported energies meet it with a margin. */
#define TRUNCATION 1e-2 * CP_FIELDS_TOLERANCE

static double coupling(int j, int m)
{
    double jp = j + 1.0;
    return sqrt((jp * jp - (double)m * m) / ((2.0 * j + 1.0) * (2.0 * j + 3.0)));
}

/* (Re)allocate the basis arrays for cap states (plus the first omitted one). */
static int basis_alloc(cp_fields_work *w, int cap)
{
    size_t nb = (size_t)cap + 1;
    double *d = malloc(7 * nb * sizeof(double));
    if (!d)
        return 0;
    free(w->basis_block);
    w->basis_block = d;
    w->cap = cap;
    double **basis[] = {&w->diag, &w->coup, &w->off, &w->off2, &w->fwd, &w->bwd, &w->vec};
    for (size_t i = 0; i < sizeof basis / sizeof basis[0]; i++, d += nb)
        *basis[i] = d;
    return 1;
}

cp_fields_work *cp_fields_work_alloc(int cap, int cap_levels)
{
    /* one block for the struct and the level arrays: 7 of cap_levels doubles and 5 of
     * 2 cap_levels, cap_levels + 2 cap_levels ints; the basis arrays apart, since they
     * grow when a basis larger than cap is needed */
    size_t nl = (size_t)cap_levels;
    size_t size = sizeof(cp_fields_work) + 17 * nl * sizeof(double) + 3 * nl * sizeof(int);
    cp_fields_work *w = malloc(size);
    if (!w)
        return NULL;
    w->basis_block = NULL;
    w->cap_levels = cap_levels;
    if (!basis_alloc(w, cap)) {
        free(w);
        return NULL;
    }
    double *d = (double *)(w + 1);
    cp_fields_tri_scratch *t = &w->tri;
    double **level[] = {&w->lambda, &w->scale, &w->energy, &w->cos_theta, &t->lo, &t->hi, &t->x};
    for (size_t i = 0; i < sizeof level / sizeof level[0]; i++, d += nl)
        *level[i] = d;
    double **level2[] = {&t->s, &t->step, &t->r, &t->dp, &t->sum};
    for (size_t i = 0; i < sizeof level2 / sizeof level2[0]; i++, d += 2 * nl)
        *level2[i] = d;
    t->state = (int *)d;
    t->count = t->state + nl;
    return w;
}

void cp_fields_work_free(cp_fields_work *w)
{
    if (!w)
        return;
    free(w->basis_block);
    free(w);
}

/* First basis size tried: the pendular states spread over a range of J growing as
 * x^(1/4) (the harmonic libration in theta has width ~ (2/x)^(1/4)). */
static int first_size(double x, int levels)
{
    return levels + 6 + (int)ceil(4.0 * pow(x, 0.25));
}

int cp_fields_basis_cap(double x, int levels)
{
    int n = 2 * first_size(x, levels) + 16;
    return n < CP_FIELDS_MAX_BASIS ? n : CP_FIELDS_MAX_BASIS;
}

/* Fill the Hamiltonian of size n (plus the coupling to the first omitted level). */
static void fill(cp_fields_work *w, double x, int m, int n)
{
    int am = abs(m);
    for (int i = 0; i <= n; i++) {
        int j = am + i;
        w->diag[i] = (double)j * (j + 1.0);
        if (i < n) {
            w->coup[i] = coupling(j, m);
            w->off[i] = -x * w->coup[i];
            w->off2[i] = w->off[i] * w->off[i];
        }
    }
}

cp_status cp_fields_solve(cp_fields_work *w, double x, int m, int levels, const double *guess,
                          double *energy, double *cos_theta, int *basis_size)
{
    int am = abs(m);
    if (x == 0.0) {
        /* no field: the basis states themselves, no coupling */
        for (int k = 0; k < levels; k++) {
            int j = am + k;
            energy[k] = w->lambda[k] = (double)j * (j + 1.0);
            if (cos_theta)
                cos_theta[k] = 0.0;
        }
        *basis_size = levels;
        return CP_OK;
    }
    int n = first_size(x, levels);
    for (;;) {
        if (n > CP_FIELDS_MAX_BASIS)
            return CP_ENOCONV;
        if (n > w->cap && !basis_alloc(w, n + n / 2))
            return CP_ENOMEM;
        fill(w, x, m, n);
        for (int k = 0; k < levels; k++)
            w->scale[k] = w->diag[k] + fmin(x, x * x);
        cp_fields_tri t = {n, w->diag, w->off, w->off2, x, 1e-290 * (1.0 + x * x)};
        cp_status st = cp_fields_tri_lowest(&t, levels, w->scale, guess, w->lambda, &w->tri);
        if (st != CP_OK)
            return st;
        int converged = 1;
        double omitted = w->diag[n], b2 = w->off2[n - 1];
        for (int k = 0; k < levels; k++) {
            double lam = w->lambda[k];
            cp_fields_tri_vector(&t, lam, w->vec, w->fwd, w->bwd);
            double tail = w->vec[n - 1] * w->vec[n - 1];
            double gap = omitted - lam;
            double shift = gap > 0 ? b2 * tail / gap : INFINITY;
            double allowed = TRUNCATION * fmax(fabs(lam), 1e-4 * w->scale[k]);
            if (!(shift <= allowed && tail <= 1e-12)) {
                converged = 0;
                break;
            }
            energy[k] = lam;
            if (cos_theta) {
                double c = 0.0;
                for (int i = 0; i + 1 < n; i++)
                    c += w->vec[i] * w->vec[i + 1] * w->coup[i];
                cos_theta[k] = 2.0 * c;
            }
        }
        if (converged) {
            *basis_size = n;
            return CP_OK;
        }
        n += n / 2 > 8 ? n / 2 : 8;
    }
}

/*
 * Band structure of the 1D lattice V(x) = V0 sin^2(k x) in a plane-wave basis.
 *
 * With sin^2(kx) = 1/2 - (e^{2ikx} + e^{-2ikx})/4, the Bloch states
 * sum_l c_l exp(i (q + 2 l) k x) obey, in units of E_r = hbar^2 k^2 / 2m,
 *   ((q + 2 l)^2 + V0/2) c_l - (V0/4) (c_{l-1} + c_{l+1}) = E c_l,
 * a real symmetric tridiagonal eigenproblem (Bloch's theorem; e.g. Ashcroft and Mermin,
 * Solid State Physics (1976), Ch. 9).  Energies are measured from the potential minimum.
 *
 * Basis size: beyond the plane waves whose kinetic energy exceeds the largest wanted energy,
 * the components fall off at least as fast as the product of
 * r_l = (V0/4) / ((2|l| - 1)^2 + V0/2 - E_max), and truncating after index L shifts an
 * energy by about (V0/4) c_L^2.  The automatic choice adds plane waves until that bound is
 * below 1e-14 E_r, then two more; the unit tests check the result against a much larger
 * basis and against GSL's Mathieu characteristic values.
 */
#include <float.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/lattice.h"
#include "lattice_int.h"

static const char *const CTX_BASIS = "lattice basis size";
static const char *const CTX_BANDS = "lattice.bands"; /* the Lua name (DEVELOPERS.md) */
static const char *const CTX_SUMMARY = "lattice.bands";
static const char *const CTX_TUNNEL = "lattice.tunnelling";

double cp_lattice_fold_q(double q)
{
    return fabs(q - 2.0 * nearbyint(0.5 * q));
}

void cp_lattice_fill_diagonal(double depth_er, double q, int n, double *diag)
{
    int half = n / 2;
    for (int i = 0; i < n; i++) {
        double p = q + 2.0 * (i - half);
        diag[i] = p * p + 0.5 * depth_er;
    }
}

static cp_status check_depth_bands(const char *ctx, double depth_er, int bands, cp_error *err)
{
    CP_TRY(cp_check_range(err, ctx, "depth", depth_er, "E_r", 0.0, CP_LATTICE_MAX_DEPTH_ER,
                          CP_CLOSED));
    return cp_check_int_range(err, ctx, "bands", bands, 1, CP_LATTICE_MAX_BANDS);
}

int cp_lattice_auto_half_width(double depth_er, int bands)
{
    double coupling = 0.25 * depth_er;
    /* E_n(q) <= n^2 + V0 for band n - 1 (free band top plus the largest potential) */
    double emax = (double)bands * bands + depth_er;
    int l = 1;
    while ((2.0 * l - 1) * (2.0 * l - 1) <= emax)
        l++;
    double bound = 1.0;
    while (coupling > 0 && coupling * bound * bound > 1e-14) {
        bound *= coupling / ((2.0 * l - 1) * (2.0 * l - 1) + 0.5 * depth_er - emax);
        l++;
    }
    int lmin = bands / 2 + 2; /* enough states for the wanted bands even at V0 = 0 */
    return (l > lmin ? l : lmin) + 2;
}

cp_status cp_lattice_basis_size(double depth_er, int bands, int *basis_size, cp_error *err)
{
    *basis_size = 0;
    CP_TRY(check_depth_bands(CTX_BASIS, depth_er, bands, err));
    int size = 2 * cp_lattice_auto_half_width(depth_er, bands) + 1;
    if (size > CP_LATTICE_MAX_BASIS)
        return cp_fail(err, CP_EINVAL,
                       "%s: depth %.6g E_r with %d bands needs %d plane waves; allowed at "
                       "most %d",
                       CTX_BASIS, depth_er, bands, size, CP_LATTICE_MAX_BASIS);
    *basis_size = size;
    return CP_OK;
}

/* Validate a band-energy request and resolve the basis size. */
static cp_status prepare(const char *ctx, double depth_er, int bands, int basis_size,
                         int *size, cp_error *err)
{
    CP_TRY(check_depth_bands(ctx, depth_er, bands, err));
    if (basis_size == 0)
        return cp_lattice_basis_size(depth_er, bands, size, err);
    if (basis_size < bands + 1 || basis_size > CP_LATTICE_MAX_BASIS || basis_size % 2 == 0)
        return cp_fail(err, CP_EINVAL,
                       "%s: basis size %d is out of range; allowed 0 (automatic) or an odd "
                       "number in [%d, %d]",
                       ctx, basis_size, bands + 1, CP_LATTICE_MAX_BASIS);
    *size = basis_size;
    return CP_OK;
}

/* A folded quasimomentum and the caller's index, sorted by the first. */
typedef struct q_order {
    double q;
    size_t i;
} q_order;

static int compare_q(const void *a, const void *b)
{
    const q_order *x = a, *y = b;
    if (x->q != y->q)
        return x->q < y->q ? -1 : 1;
    return (x->i > y->i) - (x->i < y->i); /* ties in the caller's order: deterministic */
}

/* Energies at nq quasimomenta with a prepared basis size.  The points are solved in the order
 * of their folded quasimomenta, whatever the caller's order, and each solution seeds the next
 * (extrapolated in |q| through the three previous points, quadratically): neighbours in that
 * order are close, so the seeded iteration converges in a few steps.  Points with the same
 * folded quasimomentum (q and -q, or q and q + 2) have the same Hamiltonian and are solved
 * once; so are points within SAME_Q of each other, as a symmetric grid's q and -q are when
 * they were rounded apart (a band's slope |dE/dq| stays below about the free particle's,
 * 2(2 bands + 1) E_r per unit of q, so the copy is off by < 1e-14 x bands E_r, far inside
 * the solver's accuracy).  Results go to the caller's
 * positions. */
#define SAME_Q (8.0 * DBL_EPSILON) /* units of k, the folded q lying in [0, 1] */
static cp_status solve(double depth_er, int bands, int size, size_t nq, const double *qs,
                       double *energies, const cp_cancel_flag *cancel, cp_error *err,
                       const char *ctx)
{
    double *diag = malloc(((size_t)size + 4 * ((size_t)bands + 1)) * sizeof *diag);
    q_order *order = malloc(nq * sizeof *order);
    if (!diag || !order) {
        free(diag);
        free(order);
        return cp_fail(err, CP_ENOMEM, "%s: out of memory for a %d-state basis", ctx, size);
    }
    for (size_t i = 0; i < nq; i++)
        order[i] = (q_order){cp_lattice_fold_q(qs[i]), i};
    qsort(order, nq, sizeof *order, compare_q);
    double *work = diag + size;
    cp_tridiag t = {size, diag, -0.25 * depth_er, -0.25 * depth_er, cancel};
    const double *prev[3] = {NULL, NULL, NULL}; /* the last three distinct solutions */
    double qp[3] = {NAN, NAN, NAN};
    int have = 0; /* how many of them there are (at most 3) */
    cp_status st = CP_OK;
    size_t k = 0;
    for (; k < nq && st == CP_OK; k++) {
        if (cancel && *cancel) {
            st = CP_ECANCELED;
            break;
        }
        double q = order[k].q;
        double *x = energies + order[k].i * (size_t)bands;
        if (have > 0 && q - qp[0] <= SAME_Q) {
            memcpy(x, prev[0], (size_t)bands * sizeof *x);
            continue;
        }
        /* Lagrange weights of the previous points at q (constant, linear or quadratic) */
        double w[3] = {1.0, 0.0, 0.0};
        int near = have > 0 && q - qp[0] <= 1e-9; /* as good as the same point */
        if (!near && have == 2) {
            w[0] = (q - qp[1]) / (qp[0] - qp[1]);
            w[1] = 1.0 - w[0];
        } else if (!near && have == 3) {
            w[0] = (q - qp[1]) * (q - qp[2]) / ((qp[0] - qp[1]) * (qp[0] - qp[2]));
            w[1] = (q - qp[0]) * (q - qp[2]) / ((qp[1] - qp[0]) * (qp[1] - qp[2]));
            w[2] = (q - qp[0]) * (q - qp[1]) / ((qp[2] - qp[0]) * (qp[2] - qp[1]));
        }
        for (int n = 0; n < bands && have > 0; n++) {
            x[n] = 0.0;
            for (int p = 0; p < have; p++)
                x[n] += w[p] * prev[p][n];
        }
        cp_lattice_fill_diagonal(depth_er, q, size, diag);
        st = cp_tridiag_lowest(&t, bands, have > 0, x, work);
        if (!near) { /* a near point replaces the last one: no ill-conditioned weights */
            prev[2] = prev[1];
            prev[1] = prev[0];
            qp[2] = qp[1];
            qp[1] = qp[0];
            have += have < 3;
        }
        prev[0] = x;
        qp[0] = q;
    }
    free(order);
    free(diag);
    if (st == CP_ECANCELED)
        return cp_fail(err, st, "%s: interrupted after %zu of %zu quasimomenta", ctx, k, nq);
    if (st != CP_OK)
        return cp_fail(err, st, "%s: eigenvalue iteration did not converge at depth %.6g E_r",
                       ctx, depth_er);
    return CP_OK;
}

cp_status cp_lattice_band_energies(double depth_er, int bands, int basis_size, size_t nq,
                                   const double *quasimomenta, double *energies_er,
                                   int *basis_used, cp_error *err)
{
    return cp_lattice_band_energies_bounded(depth_er, bands, basis_size, nq, quasimomenta,
                                            energies_er, basis_used, NULL, INFINITY, err);
}

/* CPU seconds of one quasimomentum: the seeded Newton sweeps and Sturm counts cost about
 * size x bands operations; below 1 E_r the band gaps close and more seeds fall back to
 * bisection (about 1 us more per band).  Fitted on quasimomenta in random order (no
 * symmetric pairs to share), depths 1e-6 to 1e4 E_r, 5 to 200 bands, sizes 13 to 4001: the
 * estimate lies 1 to 5 times above the CPU time measured (docs/api/lattice.md).  An empty
 * lattice (depth 0) is diagonal and costs far less (cp_tridiag_lowest). */
static double seconds_per_q(double depth_er, int size, int bands)
{
    double shallow = depth_er < 1.0 ? 1e-6 * (double)bands : 0.0;
    return 2e-7 + (double)size * (3e-8 + 1.6e-8 * (double)bands) + shallow;
}

cp_status cp_lattice_band_energies_bounded(double depth_er, int bands, int basis_size, size_t nq,
                                           const double *quasimomenta, double *energies_er,
                                           int *basis_used, const cp_cancel_flag *cancel,
                                           double max_seconds, cp_error *err)
{
    int size = 0;
    cp_status st = CP_OK;
    if (basis_used)
        *basis_used = 0;
    if (nq < 1 || !quasimomenta || !energies_er)
        return cp_fail(err, CP_EINVAL, "%s: need at least one quasimomentum and an output array",
                       CTX_BANDS);
    for (size_t i = 0; i < nq && st == CP_OK; i++)
        st = cp_check_finite(err, CTX_BANDS, "quasimomentum", quasimomenta[i], "k");
    if (st == CP_OK)
        st = cp_check_work_limit(err, CTX_BANDS, max_seconds);
    if (st == CP_OK)
        st = prepare(CTX_BANDS, depth_er, bands, basis_size, &size, err);
    if (st == CP_OK) {
        double per_q = seconds_per_q(depth_er, size, bands);
        char what[96], reduce[96];
        snprintf(what, sizeof what, "%zu quasimomenta x %d bands in a %d-state basis", nq, bands,
                 size);
        snprintf(reduce, sizeof reduce, "ask for at most %.0f quasimomenta (or fewer bands)",
                 floor(max_seconds / per_q));
        st = cp_check_work(err, CTX_BANDS, per_q * (double)nq, max_seconds, what, reduce);
    }
    if (st == CP_OK)
        st = solve(depth_er, bands, size, nq, quasimomenta, energies_er, cancel, err, CTX_BANDS);
    if (st != CP_OK) {
        if (energies_er && bands > 0 && bands <= CP_LATTICE_MAX_BANDS)
            for (size_t i = 0; i < nq; i++)
                cp_poison(energies_er + i * (size_t)bands, bands);
        return st;
    }
    if (basis_used)
        *basis_used = size;
    return CP_OK;
}

static void poison_summary(cp_lattice_band_summary *s)
{
    if (s->bands < 1 || s->bands > CP_LATTICE_MAX_BANDS)
        return;
    cp_poison(s->center_er, s->bands);
    cp_poison(s->edge_er, s->bands);
    cp_poison(s->width_er, s->bands);
    if (s->gap_er)
        cp_poison(s->gap_er, s->bands - 1);
}

cp_status cp_lattice_band_summary_compute(double depth_er, cp_lattice_band_summary *summary,
                                          cp_error *err)
{
    if (!summary)
        return cp_fail(err, CP_EINVAL, "%s: summary is NULL", CTX_SUMMARY);
    int size = 0, bands = summary->bands;
    summary->basis_size = 0;
    cp_status st = prepare(CTX_SUMMARY, depth_er, bands, 0, &size, err);
    if (st == CP_OK && (!summary->center_er || !summary->edge_er || !summary->width_er ||
                        (bands > 1 && !summary->gap_er)))
        st = cp_fail(err, CP_EINVAL, "%s: an output array is missing", CTX_SUMMARY);
    if (st == CP_OK) {
        st = solve(depth_er, bands, size, 1, (const double[]){0.0}, summary->center_er, NULL,
                   err, CTX_SUMMARY);
        if (st == CP_OK)
            st = solve(depth_er, bands, size, 1, (const double[]){1.0}, summary->edge_er, NULL,
                       err, CTX_SUMMARY);
    }
    if (st != CP_OK) {
        poison_summary(summary);
        return st;
    }
    for (int n = 0; n < bands; n++) {
        double c = summary->center_er[n], e = summary->edge_er[n];
        summary->width_er[n] = fabs(e - c);
        if (n + 1 < bands) {
            double top = fmax(c, e);
            double next_bottom = fmin(summary->center_er[n + 1], summary->edge_er[n + 1]);
            summary->gap_er[n] = next_bottom - top;
        }
    }
    summary->basis_size = size;
    return CP_OK;
}

/* Trapezoidal rule with n intervals on [0, pi] for the cosine coefficients of order 0, 1
 * and 2 of E(theta), theta = pi q; E at theta_j = pi j / n is e[j * stride], j = 0..n. */
static void cosine_moments(const double *e, int n, int stride, double out[3])
{
    for (int m = 0; m < 3; m++) {
        double sum = 0.5 * (e[0] + e[(size_t)n * (size_t)stride] * (m % 2 ? -1.0 : 1.0));
        for (int j = 1; j < n; j++)
            sum += e[(size_t)j * (size_t)stride] * cos(m * CP_PI * j / n);
        out[m] = sum / n;
    }
}

cp_status cp_lattice_tunnelling(double depth_er, int band, double *j1_er, double *j2_er,
                                double *mean_er, double *error_er, cp_error *err)
{
    enum { N_START = 16, N_MAX = 32768 };
    double *outs[4] = {j1_er, j2_er, mean_er, error_er};
    for (int i = 0; i < 4; i++)
        if (outs[i])
            *outs[i] = NAN;
    CP_TRY(cp_check_range(err, CTX_TUNNEL, "depth", depth_er, "E_r", 0.0,
                          CP_LATTICE_MAX_DEPTH_ER, CP_CLOSED));
    CP_TRY(cp_check_int_range(err, CTX_TUNNEL, "band", band, 0, CP_LATTICE_MAX_TUNNEL_BAND));
    int bands = band + 1, size;
    CP_TRY(prepare(CTX_TUNNEL, depth_er, bands, 0, &size, err));

    /* E on the finest grid theta_j = pi j / N_MAX, filled coarse to fine: each doubling
     * computes only the new (odd) points of its level */
    size_t npts = N_MAX + 1;
    double *q = malloc(npts * (1 + (size_t)bands) * sizeof *q);
    double *e = malloc(npts * sizeof *e);
    if (!q || !e) {
        free(q);
        free(e);
        return cp_fail(err, CP_ENOMEM, "%s: out of memory", CTX_TUNNEL);
    }
    double *energies = q + npts;
    double prev[3] = {NAN, NAN, NAN}, cur[3] = {NAN, NAN, NAN}, change = INFINITY;
    cp_status st = CP_OK;
    for (int n = N_START; n <= N_MAX && st == CP_OK; n *= 2) {
        int stride = N_MAX / n, first = n == N_START ? 0 : 1, step = n == N_START ? 1 : 2;
        size_t nq = 0;
        for (int j = first; j <= n; j += step)
            q[nq++] = (double)j / n;
        st = solve(depth_er, bands, size, nq, q, energies, NULL, err, CTX_TUNNEL);
        if (st != CP_OK)
            break;
        nq = 0;
        for (int j = first; j <= n; j += step)
            e[(size_t)j * (size_t)stride] = energies[(size_t)nq++ * (size_t)bands + (size_t)band];
        cosine_moments(e, n, stride, cur);
        change = fmax(fabs(cur[1] - prev[1]), fabs(cur[2] - prev[2]));
        if (change <= 1e-12)
            break;
        for (int m = 0; m < 3; m++)
            prev[m] = cur[m];
    }
    free(q);
    free(e);
    if (st == CP_OK && !(change <= 1e-7))
        st = cp_fail(err, CP_ENOCONV,
                     "%s: the Fourier components of band %d at depth %.6g E_r did not settle "
                     "(last change %.3g E_r): the band is too close to its neighbours at this "
                     "depth for the quadrature; try a deeper lattice",
                     CTX_TUNNEL, band, depth_er, change);
    if (st != CP_OK)
        return st;
    /* E = E_mean - 2 J1 cos - 2 J2 cos 2theta: cosine coefficient a_m = (2/pi) int E cos,
     * so J_m = -a_m / 2 = -(1/pi) int_0^pi E cos(m theta) dtheta; cur[m] = (1/pi) int. */
    if (j1_er)
        *j1_er = -cur[1];
    if (j2_er)
        *j2_er = -cur[2];
    if (mean_er)
        *mean_er = cur[0];
    if (error_er)
        *error_er = change + 4e-14 * (1.0 + fabs(cur[0]));
    return CP_OK;
}

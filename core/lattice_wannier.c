/*
 * One lattice site: the harmonic on-site frequency, the Lamb-Dicke parameter, and the
 * maximally localised Wannier function of a band.
 *
 * Wannier function (Kohn, Phys. Rev. 115, 809 (1959); for 1D, the maximally localised
 * function of Marzari and Vanderbilt, Phys. Rev. B 56, 12847 (1997) is Kohn's): with
 * Bloch functions psi_q(x) = sum_l c_l(q) exp(i (q + 2 l) k x) whose coefficients are real
 * (the plane-wave Hamiltonian is real symmetric), choosing the sign of c(q) so that
 * psi_q(0) > 0 (even band) or -i psi_q'(0) > 0 (odd band) makes the phase analytic and
 * periodic in q, and w(x) = (1/M) sum_j psi_{q_j}(x) over M quasimomenta q_j evenly
 * spread over the zone is the real, (anti)symmetric, exponentially localised function.
 * In units where x is measured in lattice spacings d and kx = pi x/d, it is normalised to
 * integral w^2 dx/d = 1 (each psi_q has mean |psi|^2 = 1 over a cell).
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/lattice.h"
#include "lattice_int.h"

static const char *const CTX_SITE = "lattice.site";
static const char *const CTX_WANNIER = "lattice.wannier";

enum { WANNIER_Q = 128, WANNIER_MAX_BAND = 9 };

cp_status cp_lattice_site(double depth_er, double probe_ratio, double *hbar_omega_er,
                          double *lamb_dicke, cp_error *err)
{
    if (hbar_omega_er)
        *hbar_omega_er = NAN;
    if (lamb_dicke)
        *lamb_dicke = NAN;
    CP_TRY(cp_check_range(err, CTX_SITE, "depth", depth_er, "E_r", 0.0,
                          CP_LATTICE_MAX_DEPTH_ER, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, CTX_SITE, "probe ratio", probe_ratio, "", 0.0, 100.0,
                          CP_LO_OPEN));
    double hw = 2.0 * sqrt(depth_er);
    if (hbar_omega_er)
        *hbar_omega_er = hw;
    /* eta^2 = E_r,probe / (hbar omega) = probe_ratio^2 E_r / (hbar omega) */
    if (lamb_dicke)
        *lamb_dicke = probe_ratio / sqrt(hw);
    return CP_OK;
}

/* Bloch coefficients of band `band` at M quasimomenta with the Kohn phase; coef is
 * M * size doubles.  CP_ENUMERIC if a Bloch function has a node where its phase is fixed,
 * CP_ECANCELED once *cancel is set (polled before each quasimomentum and inside the
 * eigenvalue search), CP_ENOCONV if the eigenvalue iteration does not finish. */
static cp_status kohn_coefficients(double depth_er, int band, int size, double *coef,
                                   double *diag, double *work, const cp_cancel_flag *cancel)
{
    cp_tridiag t = {size, diag, -0.25 * depth_er, -0.25 * depth_er, cancel};
    double x[WANNIER_MAX_BAND + 1];
    int half = size / 2;
    for (int j = 0; j < WANNIER_Q; j++) {
        double q = -1.0 + (2.0 * j + 1.0) / WANNIER_Q;
        double *c = coef + (size_t)j * (size_t)size;
        if (cancel && *cancel)
            return CP_ECANCELED;
        cp_lattice_fill_diagonal(depth_er, q, size, diag);
        cp_status st = cp_tridiag_lowest(&t, band + 1, j > 0, x, work);
        if (st != CP_OK)
            return st;
        cp_tridiag_vector(&t, x[band], c, work);
        /* psi_q(0) = sum c_l;  -i psi_q'(0) / k = sum (q + 2 l) c_l */
        double value = 0.0, scale = 0.0;
        for (int i = 0; i < size; i++) {
            value += (band % 2 == 0 ? 1.0 : q + 2.0 * (i - half)) * c[i];
            scale += fabs(c[i]);
        }
        if (!(fabs(value) > 1e-8 * scale))
            return CP_ENUMERIC;
        if (value < 0)
            for (int i = 0; i < size; i++)
                c[i] = -c[i];
    }
    return CP_OK;
}

/* CPU seconds of a call: the Kohn coefficients (M eigenvalue searches of band + 1 levels in
 * a size-state basis) and, per sampled point, 2 size sines and cosines and M sums over
 * the basis.  Fitted to depths 0.5 to 1e4 E_r (sizes 15 to 141), bands 1 and 10, 2 to
 * 20 000 points on one core of the development machine (2.8 us per point at size 15,
 * 13.5 us at size 141), rounded up; docs/api/lattice.md. */
static double wannier_seconds(int size, int band, size_t npoints)
{
    double setup = WANNIER_Q * (double)size * (4e-8 + 1e-8 * (double)(band + 1));
    return setup + (double)npoints * (1.5e-6 + 9e-8 * (double)size);
}

static void poison_wannier(size_t npoints, double *x_sites, double *w)
{
    if (npoints >= 2 && npoints <= 100000 && x_sites && w) {
        for (size_t i = 0; i < npoints; i++)
            x_sites[i] = w[i] = NAN;
    }
}

cp_status cp_lattice_wannier(double depth_er, int band, double half_range, size_t npoints,
                             double *x_sites, double *w, cp_error *err)
{
    return cp_lattice_wannier_bounded(depth_er, band, half_range, npoints, x_sites, w, NULL,
                                      INFINITY, err);
}

cp_status cp_lattice_wannier_bounded(double depth_er, int band, double half_range,
                                     size_t npoints, double *x_sites, double *w,
                                     const cp_cancel_flag *cancel, double max_seconds,
                                     cp_error *err)
{
    poison_wannier(npoints, x_sites, w);
    CP_TRY(cp_check_range(err, CTX_WANNIER, "depth", depth_er, "E_r", 0.5,
                          CP_LATTICE_MAX_DEPTH_ER, CP_CLOSED));
    CP_TRY(cp_check_int_range(err, CTX_WANNIER, "band", band, 0, WANNIER_MAX_BAND));
    CP_TRY(cp_check_range(err, CTX_WANNIER, "half range", half_range, "sites", 0.0, 50.0,
                          CP_LO_OPEN));
    if (npoints < 2 || npoints > 100000 || !x_sites || !w)
        return cp_fail(err, CP_EINVAL, "%s: points %zu is out of range; allowed [2, 100000]",
                       CTX_WANNIER, npoints);
    if (!(max_seconds > 0.0))
        return cp_fail(err, CP_EINVAL, "%s: work limit %g s is not positive; allowed (0, inf] s",
                       CTX_WANNIER, max_seconds);
    int size;
    CP_TRY(cp_lattice_basis_size(depth_er, band + 1, &size, err));
    char what[96], reduce[96];
    double per_point = wannier_seconds(size, band, 1) - wannier_seconds(size, band, 0);
    snprintf(what, sizeof what, "%zu points in a %d-state basis", npoints, size);
    snprintf(reduce, sizeof reduce, "ask for at most %.0f points",
             fmax(2.0, floor((max_seconds - wannier_seconds(size, band, 0)) / per_point)));
    CP_TRY(cp_check_work(err, CTX_WANNIER, wannier_seconds(size, band, npoints), max_seconds,
                         what, reduce));

    double *coef = malloc(((size_t)WANNIER_Q * (size_t)size + 3 * (size_t)size + 64) * sizeof *coef);
    if (!coef)
        return cp_fail(err, CP_ENOMEM, "%s: out of memory", CTX_WANNIER);
    double *diag = coef + (size_t)WANNIER_Q * (size_t)size, *work = diag + size;
    cp_status st = kohn_coefficients(depth_er, band, size, coef, diag, work, cancel);
    if (st != CP_OK) {
        free(coef);
        poison_wannier(npoints, x_sites, w);
        if (st == CP_ECANCELED)
            return cp_fail(err, st, "%s: interrupted", CTX_WANNIER);
        if (st == CP_ENUMERIC)
            return cp_fail(err, st,
                           "%s: band %d at depth %.6g E_r has a Bloch function with a node at "
                           "the well centre; its Kohn phase is undefined",
                           CTX_WANNIER, band, depth_er);
        return cp_fail(err, st, "%s: eigenvalue iteration did not converge at depth %.6g E_r",
                       CTX_WANNIER, depth_er);
    }
    int half = size / 2, odd = band % 2;
    double *cb = work, *sb = work + size; /* cos and sin of 2 (l - half) k x */
    for (size_t i = 0; i < npoints; i++) {
        if (cancel && *cancel) { /* every point: 3 to 15 us apart */
            free(coef);
            poison_wannier(npoints, x_sites, w);
            return cp_fail(err, CP_ECANCELED, "%s: interrupted", CTX_WANNIER);
        }
        double xs = -half_range + 2.0 * half_range * (double)i / (double)(npoints - 1);
        double kx = CP_PI * xs, sum = 0.0;
        for (int l = 0; l < size; l++) {
            cb[l] = cos(2.0 * (l - half) * kx);
            sb[l] = sin(2.0 * (l - half) * kx);
        }
        for (int j = 0; j < WANNIER_Q; j++) {
            double q = -1.0 + (2.0 * j + 1.0) / WANNIER_Q;
            const double *c = coef + (size_t)j * (size_t)size;
            double cc = 0.0, cs = 0.0;
            for (int l = 0; l < size; l++) {
                cc += c[l] * cb[l];
                cs += c[l] * sb[l];
            }
            /* Re psi_q(x) for even bands, Im psi_q(x) for odd ones (the other part
             * cancels between q and -q), by the angle-addition formulas */
            double ca = cos(q * kx), sa = sin(q * kx);
            sum += odd ? sa * cc + ca * cs : ca * cc - sa * cs;
        }
        x_sites[i] = xs;
        w[i] = sum / WANNIER_Q;
    }
    free(coef);
    return CP_OK;
}

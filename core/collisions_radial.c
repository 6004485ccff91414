/*
 * The absorption probability of one collision channel with unit loss at short range: the
 * radial Schroedinger equation u'' = [(nu^2 - 1/4)/r^2 + 2 mu (V(r) - E)/hbar^2] u solved
 * outward with Numerov's method on a logarithmic grid, from an inner radius where the wave
 * is purely incoming (the short-range boundary of the universal loss model: everything
 * that reaches it is lost; Idziaszek & Julienne, PRL 104, 113202 (2010)) to an outer
 * radius where the potential has died away, matched there to the Riccati-Hankel functions
 * sqrt(pi k r / 2) H^(1,2)_nu(k r) (GSL's Bessel functions of real order).  nu = L + 1/2
 * in three dimensions, |m| in two.  The absorbed fraction of the incoming flux is the
 * loss probability P = 1 - |S|^2 of the channel; it comes from the (exactly conserved)
 * discrete Wronskian, not from 1 - |S|^2, so tunnelling probabilities far below one keep
 * their relative accuracy.
 */
#include <complex.h>
#include <math.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_sf_bessel.h>

#include "check_int.h"
#include "collisions_int.h"
#include "coldprep/consts.h"

/* Riccati-Hankel function of the second kind (incoming wave, ~ e^{-i(z - nu pi/2 + pi/4)}
 * at large z): sqrt(pi z / 2) (J_nu(z) - i Y_nu(z)). */
static cp_status hankel_in(double nu, double z, double complex *out, cp_error *err)
{
    gsl_sf_result j, y;
    int sj = gsl_sf_bessel_Jnu_e(nu, z, &j);
    int sy = gsl_sf_bessel_Ynu_e(nu, z, &y);
    if (sj != GSL_SUCCESS || sy != GSL_SUCCESS)
        return cp_fail(err, CP_ENUMERIC, "collisions.radial: Bessel functions of order %g "
                       "at %g failed (%s)", nu, z, gsl_strerror(sj ? sj : sy));
    double s = sqrt(CP_PI * z / 2.0);
    *out = s * (j.val - I * y.val);
    return CP_OK;
}

cp_status cp_radial_absorption(const cp_radial_grid *g, const double *u_pot, const double *r2,
                               double k, double *prob, cp_error *err)
{
    *prob = NAN;
    /* stop where the potential has fallen below 2 % of the collision energy (plus a few
     * steps), so fast collisions are matched before the grid gets coarse against k r */
    size_t n = g->n;
    double k2 = k * k;
    for (size_t i = g->n; i-- > 1;) {
        if (fabs(u_pot[i] - g->nu * g->nu) > 0.02 * k2 * r2[i]) {
            n = i + 8 < g->n ? i + 8 : g->n;
            break;
        }
    }
    if (n < 8)
        n = 8;
    if (k * sqrt(r2[n - 1]) * g->h > 0.5)
        return cp_fail(err, CP_ENUMERIC, "collisions.radial: step %g in ln r is too coarse "
                       "for k r = %g at the matching radius", g->h, k * sqrt(r2[n - 1]));
    double h = g->h, h12 = h * h / 12.0;
    /* F_i = u_pot_i - k^2 r_i^2: w'' = F w for u = r^{1/2} w, x = ln r */
#define F_AT(i) (u_pot[i] - k2 * r2[i])
    double f0 = F_AT(0), f1 = F_AT(1);
    /* incoming WKB wave at the inner edge, w ~ |F|^{-1/4} exp(-i int |F|^{1/2} dx) (in a
     * classically forbidden inner edge the same form is the matched, reflection-free
     * absorber of the loss model) */
    double q0 = sqrt(fabs(f0)), q1 = sqrt(fabs(f1));
    double complex w0 = 1.0 / sqrt(q0);
    double complex w1 = cexp(-I * 0.5 * h * (q0 + q1)) / sqrt(q1);
    double complex y0 = (1.0 - h12 * f0) * w0, y1 = (1.0 - h12 * f1) * w1;
    double fprev = f1;
    /* Numerov: y_i = (12 - 10 a_{i-1}) / a_{i-1} y_{i-1} - y_{i-2}, a = 1 - h^2 F / 12,
     * with y = a w; real and imaginary parts carried separately (the factor is real) */
    double yr0 = creal(y0), yi0 = cimag(y0), yr1 = creal(y1), yi1 = cimag(y1);
    for (size_t i = 2; i < n; i++) {
        double a = 1.0 - h12 * fprev;
        double c = (12.0 - 10.0 * a) / a;
        double yr2 = c * yr1 - yr0, yi2 = c * yi1 - yi0;
        yr0 = yr1;
        yi0 = yi1;
        yr1 = yr2;
        yi1 = yi2;
        fprev = F_AT(i);
        double m = fabs(yr1) + fabs(yi1);
        if (m > 1e150) { /* rescale: only ratios and the Wronskian ratio matter */
            yr0 /= m;
            yi0 /= m;
            yr1 /= m;
            yi1 /= m;
        }
    }
    y0 = yr0 + I * yi0;
    y1 = yr1 + I * yi1;
    /* the last two points: w = y / a */
    double fa = F_AT(n - 2), fb = F_AT(n - 1);
    double complex wa = y0 / (1.0 - h12 * fa), wb = y1 / (1.0 - h12 * fb);
    double ra = sqrt(r2[n - 2]), rb = sqrt(r2[n - 1]);
    double complex ua = sqrt(ra) * wa, ub = sqrt(rb) * wb;

    /* u = A h_in + B conj(h_in): solve for A */
    double complex ha, hb;
    CP_TRY(hankel_in(g->nu, k * ra, &ha, err));
    CP_TRY(hankel_in(g->nu, k * rb, &hb, err));
    double complex det = ha * conj(hb) - conj(ha) * hb;
    double complex amp = (ua * conj(hb) - conj(ha) * ub) / det;
    /* flux: Im(w* w') in x; the discrete Wronskian Im(y_{n-2}* y_{n-1}) / h is conserved
     * by the recursion; the flux of A h_in is -k |A|^2 */
    double flux = cimag(conj(y0) * y1) / (h * (1.0 - h12 * fa) * (1.0 - h12 * fb));
    /* a rescaling of the y's scales amp and the flux alike: the ratio is scale-free */
#undef F_AT
    double p = -flux / (k * creal(amp * conj(amp)));
    if (!isfinite(p) || p < -1e-6 || p > 1.0 + 1e-3)
        return cp_fail(err, CP_ENUMERIC, "collisions.radial: absorption probability %g is "
                       "not in [0, 1] (grid of %zu points, step %g in ln r)", p, n, h);
    *prob = fmin(fmax(p, 0.0), 1.0);
    return CP_OK;
}

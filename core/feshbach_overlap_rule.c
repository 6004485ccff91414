/*
 * The overlap integral Int n_c n_o d^3r of two clouds by one fixed product rule, the fast
 * path of cp_feshbach_overlap_numeric.  Spherical coordinates about the centre of cloud c
 * (the sharper one: Thomas–Fermi or the more degenerate Fermi cloud), scaled by its own
 * lengths, r = c_centre + L_c (rho n): there n_c depends on rho alone (u_c = rho^2), and
 * along each ray the other cloud's scaled potential is a quadratic
 * u_o = A rho^2 + 2 B rho + C.  Each ray is integrated with Gauss–Legendre panels whose
 * ends are where either cloud ends (the Thomas–Fermi surface or the e^-45 extent: the
 * support-following limits, solved from the quadratic) or changes character (the Fermi
 * surface, the breaks of cp_cloud_profile), so no panel holds a kink.  Directions:
 * Gauss–Legendre in cos(theta) over [-1, 1] (the sag breaks z -> -z) and the midpoint rule
 * in phi over [0, pi/2] — the integrand depends on phi through cos^2 and sin^2 only (the
 * clouds share the x -> -x and y -> -y mirror planes), so the midpoint rule is the
 * trapezoidal rule of a smooth periodic function and converges geometrically (Trefethen &
 * Weideman, SIAM Review 56, 385 (2014) [M]).  Gauss–Legendre nodes and weights by Newton's
 * method on the three-term recurrence of the Legendre polynomials.
 */
#include <assert.h>
#include <float.h>
#include <math.h>

#include "coldprep/consts.h"
#include "feshbach_int.h"

enum { MAX_EDGES = 2 + CP_PROFILE_BREAKS + 2 * (CP_PROFILE_BREAKS + 1) };

/* n-point Gauss–Legendre rule on [-1, 1], nodes ascending. */
static void gauss_legendre(int n, double *x, double *w)
{
    for (int i = 0; i < (n + 1) / 2; i++) {
        double z = cos(CP_PI * (i + 0.75) / (n + 0.5)), dp = 1.0;
        for (int it = 0; it < 100; it++) {
            double p0 = 1.0, p1 = z; /* P_(k-1), P_k */
            for (int k = 2; k <= n; k++) {
                double p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k;
                p0 = p1;
                p1 = p2;
            }
            dp = n * (z * p1 - p0) / (z * z - 1.0); /* P_n'(z) */
            double dz = p1 / dp;
            z -= dz;
            if (fabs(dz) <= 4.0 * DBL_EPSILON) /* converged to rounding */
                break;
        }
        x[i] = -z;
        x[n - 1 - i] = z;
        w[i] = w[n - 1 - i] = 2.0 / ((1.0 - z * z) * dp * dp);
    }
}

/* The roots rho1 <= rho2 of A rho^2 + 2 B rho + C = level (A > 0); 0 if none. */
static int roots(double a, double b, double c, double level, double *r1, double *r2)
{
    double disc = b * b - a * (c - level);
    if (!(disc > 0.0))
        return 0;
    double q = -(b + copysign(sqrt(disc), b)); /* no cancellation */
    double x1 = q / a, x2 = q != 0.0 ? (c - level) / q : -x1;
    *r1 = fmin(x1, x2);
    *r2 = fmax(x1, x2);
    return 1;
}

typedef struct ray_rule {
    int n;
    const double *x, *w;
} ray_rule;

/* Int rho^2 n_c(rho^2) n_o(A rho^2 + 2 B rho + C) d rho along one ray. */
static double ray(const cp_cloud_profile *c, const cp_cloud_profile *o, double a, double b,
                  double cc, ray_rule r)
{
    double lo, hi, e[MAX_EDGES];
    if (!roots(a, b, cc, o->u_max, &lo, &hi))
        return 0.0;
    lo = fmax(lo, 0.0);
    hi = fmin(hi, sqrt(c->u_max));
    if (!(hi > lo))
        return 0.0;
    int ne = 0;
    e[ne++] = lo;
    e[ne++] = hi;
    for (int k = 0; k < c->nbreak; k++) {
        double rk = sqrt(c->u_break[k]);
        if (rk > lo && rk < hi)
            e[ne++] = rk;
    }
    for (int k = 0; k < o->nbreak; k++) {
        double r1, r2;
        if (!roots(a, b, cc, o->u_break[k], &r1, &r2))
            continue;
        if (r1 > lo && r1 < hi)
            e[ne++] = r1;
        if (r2 > lo && r2 < hi)
            e[ne++] = r2;
    }
    for (int i = 1; i < ne; i++) /* insertion sort: a handful of edges */
        for (int j = i; j > 0 && e[j - 1] > e[j]; j--) {
            double t = e[j];
            e[j] = e[j - 1];
            e[j - 1] = t;
        }
    double sum = 0.0;
    for (int k = 0; k + 1 < ne; k++) {
        double mid = 0.5 * (e[k + 1] + e[k]), half = 0.5 * (e[k + 1] - e[k]), part = 0.0;
        if (!(half > 0.0))
            continue;
        for (int i = 0; i < r.n; i++) {
            double rho = mid + half * r.x[i];
            double uo = fmax((a * rho + 2.0 * b) * rho + cc, 0.0);
            part += r.w[i] * rho * rho * cp_cloud_profile_density(c, rho * rho) *
                    cp_cloud_profile_density(o, uo);
        }
        sum += half * part;
    }
    return sum;
}

double cp_feshbach_overlap_rule(const cp_cloud_profile *c, const cp_cloud_profile *o,
                                cp_overlap_rule rule)
{
    double xr[CP_OVERLAP_MAX_POINTS], wr[CP_OVERLAP_MAX_POINTS];
    double xt[CP_OVERLAP_MAX_POINTS], wt[CP_OVERLAP_MAX_POINTS];
    double cphi[CP_OVERLAP_MAX_POINTS], sphi[CP_OVERLAP_MAX_POINTS];
    int m = rule.azimuthal;
    assert(rule.radial <= CP_OVERLAP_MAX_POINTS && rule.polar <= CP_OVERLAP_MAX_POINTS &&
           m <= CP_OVERLAP_MAX_POINTS && rule.radial > 0 && rule.polar > 0 && m > 0);
    gauss_legendre(rule.radial, xr, wr);
    gauss_legendre(rule.polar, xt, wt);
    double dphi = 0.5 * CP_PI / m;
    for (int k = 0; k < m; k++) {
        cphi[k] = cos((k + 0.5) * dphi);
        sphi[k] = sin((k + 0.5) * dphi);
    }
    /* o's scaled coordinates of the point c_centre + L_c (rho n): q_i rho n_i + d e_z */
    double q[3];
    for (int i = 0; i < 3; i++)
        q[i] = c->length[i] / o->length[i];
    double d = (c->centre - o->centre) / o->length[2];
    ray_rule rr = {rule.radial, xr, wr};
    double total = 0.0;
    for (int j = 0; j < rule.polar; j++) {
        double t = xt[j], s2 = 1.0 - t * t, sum = 0.0;
        double az = q[2] * q[2] * t * t, b = q[2] * t * d;
        for (int k = 0; k < m; k++) {
            double qx = q[0] * cphi[k], qy = q[1] * sphi[k];
            double a = s2 * (qx * qx + qy * qy) + az;
            sum += ray(c, o, a, b, d * d, rr);
        }
        total += wt[j] * sum;
    }
    /* four quadrants in phi; the volume element L_cx L_cy L_cz rho^2 drho dcos(theta) dphi */
    return 4.0 * dphi * total * c->length[0] * c->length[1] * c->length[2];
}

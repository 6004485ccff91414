/*
 * The density of one prepared cloud as a function of its scaled potential
 * u = sum_i ((r_i - c_i) / L_i)^2, the form the fixed-rule overlap quadrature
 * (feshbach_overlap_rule.c) evaluates tens of thousands of times per call:
 *   THERMAL       n = N / ((2 pi)^(3/2) ell^3) exp(-u),       L_i = sqrt(2) ell_i;
 *   FERMI         n = F_{1/2}(eta - u) / lambda^3,            L_i = sqrt(2) ell_i
 *                 (GSL's normalised complete Fermi–Dirac integral, as in feshbach_cloud.c);
 *   THOMAS_FERMI  n = n0 max(0, 1 - u),                        L_i = R_i;
 *   BOSE          n = g_{3/2}(e^(eta - u)) / lambda^3 + n0 max(0, 1 - u / u_tf),
 *                                                              L_i = sqrt(2) ell_i
 *                 (the saturated thermal part, eta = 0, and the Thomas–Fermi condensate
 *                 ending at u_tf = mu / kB T below T_c: feshbach_cloud.c).  g_{3/2} is
 *                 the defining series for z <= 1/2 with k^(-3/2) tabulated, above it the
 *                 thermo model's expansion in ln z (thermo_polylog.c).
 * F_{1/2} is tabulated once per call as piecewise Chebyshev series on panels of width 2 in
 * x = eta - u (values from gsl_sf_fermi_dirac_half at the Chebyshev nodes): F_{1/2}(x) =
 * -Li_{3/2}(-e^x) is analytic except on the cuts Im x = +-pi, Re x >= 0, so on a panel of
 * half-width 1 a Chebyshev series of degree 15 converges like (pi + sqrt(pi^2 + 1))^-16
 * ~ 1e-13 (Trefethen, Approximation Theory and Approximation Practice, Ch. 8 [M]).  Below
 * the table, x < -8, three terms of the series sum_k (-1)^(k+1) e^(kx) / k^(3/2) are exact
 * to 1e-11 relative.  The table costs 16 GSL calls per panel, (eta + 8) / 2 panels.
 */
#include <gsl/gsl_errno.h>
#include <gsl/gsl_sf_fermi_dirac.h>
#include <math.h>

#include "coldprep/consts.h"
#include "feshbach_int.h"

enum { PANEL_WIDTH = 2 };
static const double X_SERIES = -8.0; /* below it the exponential series */

/* Smallest u beyond which the density is below e^-45 of its peak (or zero), as the
 * adaptive path's extents. */
static double support(const cp_cloud_state *s)
{
    switch (s->profile) {
    case CP_PROFILE_THOMAS_FERMI: return 1.0;
    case CP_PROFILE_FERMI: return fmax(s->eta, 0.0) + 45.0;
    case CP_PROFILE_BOSE: return fmax(s->u_tf, 45.0);
    default: return 45.0;
    }
}

/* Levels of u where a profile changes character, so that the quadrature's panels end
 * there.  A Gaussian tail exp(-u) is cut at u = 4 and 16 (ends at radii 2, 4 and
 * sqrt(45) in rho = sqrt(u): short panels for an entire function).  The Fermi profile is
 * analytic in the strip |Im u| < pi around the Fermi surface u = eta: a panel of half-width
 * c = 3 either side of it, interior breaks graded geometrically towards it (where
 * F_{1/2} ~ (eta - u)^(3/2) is smooth on the scale eta - u) while they are closer to the
 * surface than to the centre, and the tail cut as a Gaussian's.  A classical Fermi cloud
 * (eta < -3: singularities at distance >= |eta + i pi| from u >= 0) is cut as a Gaussian.
 * The core, where the density is above ~2 % of its value at the Fermi surface (e^-4), ends
 * at the first tail break.  A condensed Bose cloud has a further break at the condensate's
 * edge u_tf (where its density has a kink), and its core is the larger of the condensate
 * and the thermal core. */
static void add_break(cp_cloud_profile *p, double u)
{
    if (u > 0.0 && u < p->u_max && p->nbreak < CP_PROFILE_BREAKS)
        p->u_break[p->nbreak++] = u;
}

static void set_breaks(cp_cloud_profile *p)
{
    static const double c = 3.0;
    p->nbreak = 0;
    if (p->kind == CP_PROFILE_THOMAS_FERMI) {
        p->u_core = 1.0; /* a polynomial up to its edge u = 1 */
        return;
    }
    double u0 = 0.0;
    if (p->kind == CP_PROFILE_FERMI && p->eta >= -3.0) {
        for (double d = c; p->eta - d > d; d *= 2.0)
            add_break(p, p->eta - d);
        add_break(p, p->eta + c);
        u0 = p->eta + c;
    }
    add_break(p, u0 + 4.0);
    add_break(p, u0 + 16.0);
    p->u_core = u0 + 4.0;
    if (p->kind == CP_PROFILE_BOSE && p->peak_tf > 0.0) {
        add_break(p, p->u_tf);
        p->u_core = fmax(p->u_core, p->u_tf);
    }
}

static cp_status fermi_table(cp_cloud_profile *p)
{
    int m = CP_PROFILE_ORDER;
    if (p->eta <= X_SERIES)
        return CP_OK; /* no table: every x = eta - u <= eta is in the series' range */
    int np = (int)ceil((p->eta - X_SERIES) / PANEL_WIDTH);
    if (np > CP_PROFILE_PANELS)
        return CP_ENOCONV; /* too degenerate for the table: the caller falls back */
    p->npanel = np;
    p->x_lo = p->eta - np * (double)PANEL_WIDTH; /* the top panel ends at x = eta (u = 0) */
    double f[CP_PROFILE_ORDER], cs[CP_PROFILE_ORDER][CP_PROFILE_ORDER];
    for (int j = 0; j < m; j++)
        for (int k = 0; k < m; k++)
            cs[k][j] = cos(CP_PI * k * (j + 0.5) / m);
    for (int panel = 0; panel < np; panel++) {
        double mid = p->x_lo + (panel + 0.5) * PANEL_WIDTH;
        for (int j = 0; j < m; j++) {
            gsl_sf_result r;
            if (gsl_sf_fermi_dirac_half_e(mid + 0.5 * PANEL_WIDTH * cs[1][j], &r) != GSL_SUCCESS)
                return CP_ENUMERIC;
            f[j] = r.val;
        }
        /* c_k = (2/m) sum_j f_j cos(pi k (j + 1/2) / m), c_0 halved for the plain sum */
        for (int k = 0; k < m; k++) {
            double acc = 0.0;
            for (int j = 0; j < m; j++)
                acc += f[j] * cs[k][j];
            p->coef[panel][k] = (k == 0 ? 1.0 : 2.0) * acc / m;
        }
    }
    return CP_OK;
}

cp_status cp_cloud_profile_init(const cp_cloud_state *s, cp_cloud_profile *p)
{
    p->kind = s->profile;
    p->centre = s->sag;
    p->eta = s->eta;
    p->u_max = support(s);
    p->npanel = 0;
    p->x_lo = INFINITY;
    p->peak_tf = s->profile == CP_PROFILE_BOSE ? s->peak_tf : 0.0;
    p->u_tf = s->u_tf;
    set_breaks(p);
    switch (s->profile) {
    case CP_PROFILE_THOMAS_FERMI:
        for (int i = 0; i < 3; i++)
            p->length[i] = s->radius[i];
        p->amplitude =
            15.0 * s->number / (8.0 * CP_PI * s->radius[0] * s->radius[1] * s->radius[2]);
        return CP_OK;
    default:
        for (int i = 0; i < 3; i++)
            p->length[i] = sqrt(2.0) * s->ell[i];
        break;
    }
    if (s->profile == CP_PROFILE_THERMAL) {
        p->amplitude = s->number / (pow(2.0 * CP_PI, 1.5) * s->ell[0] * s->ell[1] * s->ell[2]);
        return CP_OK;
    }
    double lambda = CP_H / sqrt(2.0 * CP_PI * s->mass * CP_KB * s->temperature);
    p->amplitude = 1.0 / (lambda * lambda * lambda);
    if (s->profile == CP_PROFILE_BOSE) {
        p->li32 = s->li32;
        for (int k = 1; k <= CP_PROFILE_SERIES; k++)
            p->inv_k32[k - 1] = 1.0 / (k * sqrt((double)k));
        return CP_OK;
    }
    return fermi_table(p);
}

/* g_{3/2}(z) = sum_k z^k / k^(3/2) for 0 <= z <= 1: the series up to z = 1/2 (56 terms
 * reach 2^-56 ~ 1e-17), the plan's expansion in ln z above. */
static double bose_g32(const cp_cloud_profile *p, double z)
{
    if (z > 0.5)
        return cp_polylog_bose(&p->li32, z);
    double sum = 0.0, zk = z;
    for (int k = 0; k < CP_PROFILE_SERIES && zk > 1e-17 * sum; k++) {
        sum += zk * p->inv_k32[k];
        zk *= z;
    }
    return sum;
}

double cp_cloud_profile_density(const cp_cloud_profile *p, double u)
{
    switch (p->kind) {
    case CP_PROFILE_THERMAL:
        return p->amplitude * exp(-u);
    case CP_PROFILE_THOMAS_FERMI:
        return u < 1.0 ? p->amplitude * (1.0 - u) : 0.0;
    case CP_PROFILE_BOSE: {
        double n = p->amplitude * bose_g32(p, exp(p->eta - u));
        return u < p->u_tf ? n + p->peak_tf * (1.0 - u / p->u_tf) : n;
    }
    default: break;
    }
    double x = p->eta - u;
    if (!(x >= p->x_lo)) {
        double e = exp(x); /* F_{1/2}(x) = e^x - e^2x / 2^(3/2) + e^3x / 3^(3/2) - ... */
        return p->amplitude * e * (1.0 - e * (0.35355339059327373 - e * 0.19245008972987526));
    }
    int k = (int)((x - p->x_lo) * (1.0 / PANEL_WIDTH));
    if (k >= p->npanel)
        k = p->npanel - 1; /* x = eta exactly */
    double t = 2.0 * (x - p->x_lo) / PANEL_WIDTH - (2 * k + 1); /* in [-1, 1] */
    const double *c = p->coef[k];
    double b1 = 0.0, b2 = 0.0; /* Clenshaw */
    for (int j = CP_PROFILE_ORDER - 1; j >= 1; j--) {
        double b0 = 2.0 * t * b1 - b2 + c[j];
        b2 = b1;
        b1 = b0;
    }
    return p->amplitude * (t * b1 - b2 + c[0]);
}

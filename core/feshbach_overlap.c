/*
 * The overlap density <n_a>_b = (1/N_b) Int n_a n_b d^3r of two clouds in one harmonic
 * trap, each displaced along z by its own gravitational sag -g/omega_z^2 (docs/models/feshbach.md
 * uses it as the density of the ramp-rate law).  Two Boltzmann clouds: closed form for
 * displaced Gaussians, <n_a>_b = N_a prod_i [2 pi (s_ai^2 + s_bi^2)]^(-1/2)
 * exp(-d^2 / (2 (s_az^2 + s_bz^2))).  Any other pair (ideal Fermi gas in LDA, Bose gas with
 * its Thomas–Fermi condensate below T_c, a bare Thomas–Fermi condensate) is integrated
 * numerically, fast enough for sweeps of plans:
 *  - first a fixed product rule (feshbach_overlap_rule.c): spherical coordinates about the
 *    sharper cloud, each profile a function of its scaled potential tabulated once per call
 *    (feshbach_profile.c), Gauss–Legendre panels along each ray that end where a profile
 *    ends or turns over.  It runs at two sizes and the larger is accepted when they agree
 *    to 1e-8 relative (0.65 ms for the demo plan's clouds, whose result it gives to 2e-11);
 *    on disagreement a third, larger size is compared with the second;
 *  - where it declines — no two sizes agree (two Thomas–Fermi clouds of different shapes,
 *    whose surfaces cross), a Fermi cloud too degenerate for its table (T/T_F below
 *    ~0.004), or neither cloud's centre sees the other's bulk in a wide cone (clouds sagged
 *    far apart: seen from outside, a cloud fills a narrow cone of directions that every
 *    rule size could miss alike) — the reference: nested GSL adaptive Gauss–Kronrod
 *    quadrature over the clouds' common support in Cartesian coordinates, using the
 *    x -> -x and y -> -y symmetry (0.1–0.3 s per call for Fermi clouds).  The tests hold the two paths
 *    against each other (FB-9b) and against closed forms (FB-8, FB-9).
 */
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "feshbach_int.h"

enum { LIMIT = 200, MAX_PTS = 6 };

typedef struct overlap_ctx {
    const cp_cloud_state *a, *b;
    double x;                /* current outer coordinate */
    gsl_integration_workspace *wy, *wz;
    cp_status status;
} overlap_ctx;

/* Half-extent of a cloud along axis i beyond which its density is negligible (< e^-40 of
 * the peak) or zero. */
static double extent(const cp_cloud_state *s, int i)
{
    switch (s->profile) {
    case CP_PROFILE_THOMAS_FERMI: return s->radius[i];
    case CP_PROFILE_FERMI: return s->ell[i] * sqrt(2.0 * (fmax(s->eta, 0.0) + 45.0));
    case CP_PROFILE_BOSE: return s->ell[i] * sqrt(2.0 * fmax(s->u_tf, 45.0));
    default: return s->ell[i] * sqrt(2.0 * 45.0);
    }
}

/* Half-width of the cloud's support along axis i at the given (scaled) squared distance
 * q = sum over the outer axes of r_j^2 / R_j^2: a Thomas–Fermi cloud ends on its ellipsoid,
 * so the quadrature limits follow it and the integrand has no kink inside the interval. */
static double support(const cp_cloud_state *s, int i, double q)
{
    if (s->profile != CP_PROFILE_THOMAS_FERMI)
        return extent(s, i);
    return q < 1.0 ? s->radius[i] * sqrt(1.0 - q) : 0.0;
}

/* Scaled squared distance x^2/Rx^2 + y^2/Ry^2 from the axis of a Bose cloud's condensate
 * (2 where it has none, so that no edge is found). */
static double condensate_q(const cp_cloud_state *s, double x, double y)
{
    if (s->profile != CP_PROFILE_BOSE || !(s->n_condensed > 0.0))
        return 2.0;
    return x * x / (s->radius[0] * s->radius[0]) + y * y / (s->radius[1] * s->radius[1]);
}

/* Int_lo^hi f by GSL's QAG on the pieces between the np points (any order; those outside
 * (lo, hi) are ignored): a condensate's edge is a kink in the integrand, the axis of a Bose
 * cloud a cusp, and the rule converges fast only on pieces free of them.  Each piece to
 * relative tolerance rel; the first failing status is returned, abserr summed. */
static int pieces(gsl_function *f, double lo, double hi, double *pts, int np, double rel,
                  gsl_integration_workspace *w, double *val, double *abserr)
{
    double e[MAX_PTS + 2];
    int ne = 0, status = GSL_SUCCESS;
    e[ne++] = lo;
    for (int i = 0; i < np; i++)
        if (pts[i] > lo && pts[i] < hi)
            e[ne++] = pts[i];
    e[ne++] = hi;
    for (int i = 1; i < ne; i++) /* insertion sort: a handful of points */
        for (int j = i; j > 0 && e[j - 1] > e[j]; j--) {
            double t = e[j];
            e[j] = e[j - 1];
            e[j - 1] = t;
        }
    *val = *abserr = 0.0;
    for (int i = 0; i + 1 < ne; i++) {
        double v, ae;
        if (!(e[i + 1] > e[i]))
            continue;
        int gs = gsl_integration_qag(f, e[i], e[i + 1], 0.0, rel, LIMIT, GSL_INTEG_GAUSS21, w,
                                     &v, &ae);
        if (gs != GSL_SUCCESS && status == GSL_SUCCESS)
            status = gs;
        *val += v;
        *abserr += ae;
    }
    return status;
}

static double tf_q(const cp_cloud_state *s, double x, double y)
{
    if (s->profile != CP_PROFILE_THOMAS_FERMI)
        return 0.0;
    return x * x / (s->radius[0] * s->radius[0]) + y * y / (s->radius[1] * s->radius[1]);
}

typedef struct zctx {
    const cp_cloud_state *a, *b;
    double x, y;
    cp_status *status;
} zctx;

static double integrand_z(double z, void *p)
{
    zctx *c = p;
    double ra[3] = {c->x, c->y, z - c->a->sag}, rb[3] = {c->x, c->y, z - c->b->sag};
    return cp_cloud_density(c->a, ra, c->status) * cp_cloud_density(c->b, rb, c->status);
}

static double integrand_y(double y, void *p)
{
    overlap_ctx *c = p;
    zctx zc = {c->a, c->b, c->x, y, &c->status};
    gsl_function f = {integrand_z, &zc};
    double val, abserr;
    double ha = support(c->a, 2, tf_q(c->a, c->x, y)), hb = support(c->b, 2, tf_q(c->b, c->x, y));
    double zlo = fmax(c->a->sag - ha, c->b->sag - hb), zhi = fmin(c->a->sag + ha, c->b->sag + hb);
    if (!(zhi > zlo))
        return 0.0;
    double pts[MAX_PTS];
    int np = 0;
    const cp_cloud_state *s2[2] = {c->a, c->b};
    for (int k = 0; k < 2; k++) { /* a Bose cloud's condensate edges and centre */
        const cp_cloud_state *s = s2[k];
        if (s->profile != CP_PROFILE_BOSE)
            continue;
        pts[np++] = s->sag; /* g_{3/2} ~ zeta(3/2) - 2 sqrt(pi V/kT): a cusp on the axis */
        double q = condensate_q(s, c->x, y);
        if (q < 1.0) {
            pts[np++] = s->sag - s->radius[2] * sqrt(1.0 - q);
            pts[np++] = s->sag + s->radius[2] * sqrt(1.0 - q);
        }
    }
    int gs = pieces(&f, zlo, zhi, pts, np, 1e-9, c->wz, &val, &abserr);
    if (gs != GSL_SUCCESS && !(gs == GSL_EROUND && abserr <= 1e-7 * fabs(val)))
        c->status = CP_ENUMERIC;
    return val;
}

static double integrand_x(double x, void *p)
{
    overlap_ctx *c = p;
    gsl_function f = {integrand_y, c};
    double val, abserr;
    c->x = x;
    double ymax = fmin(support(c->a, 1, tf_q(c->a, x, 0.0)), support(c->b, 1, tf_q(c->b, x, 0.0)));
    if (!(ymax > 0.0))
        return 0.0;
    double pts[MAX_PTS];
    int np = 0;
    const cp_cloud_state *s2[2] = {c->a, c->b};
    for (int k = 0; k < 2; k++) { /* where the plane at x leaves a Bose cloud's condensate */
        double q = condensate_q(s2[k], x, 0.0);
        if (s2[k]->profile == CP_PROFILE_BOSE && q < 1.0)
            pts[np++] = s2[k]->radius[1] * sqrt(1.0 - q);
    }
    int gs = pieces(&f, 0.0, ymax, pts, np, 1e-8, c->wy, &val, &abserr);
    if (gs != GSL_SUCCESS && !(gs == GSL_EROUND && abserr <= 1e-6 * fabs(val)))
        c->status = CP_ENUMERIC;
    return val;
}

cp_status cp_feshbach_overlap_adaptive(const cp_cloud_state *a, const cp_cloud_state *b,
                                       double *overlap, cp_error *err)
{
    static const char ctx[] = "feshbach.overlap_density";
    *overlap = NAN;
    cp_init();
    double xmax = fmin(extent(a, 0), extent(b, 0));
    double zlo = fmax(a->sag - extent(a, 2), b->sag - extent(b, 2));
    double zhi = fmin(a->sag + extent(a, 2), b->sag + extent(b, 2));
    if (!(zhi > zlo)) { /* disjoint supports (Thomas–Fermi clouds sagged apart) */
        *overlap = 0.0;
        return CP_OK;
    }
    gsl_integration_workspace *wx = gsl_integration_workspace_alloc(LIMIT);
    gsl_integration_workspace *wy = gsl_integration_workspace_alloc(LIMIT);
    gsl_integration_workspace *wz = gsl_integration_workspace_alloc(LIMIT);
    cp_status st = CP_OK;
    if (!wx || !wy || !wz) {
        st = cp_fail(err, CP_ENOMEM, "%s: out of memory for the quadrature workspaces", ctx);
    } else {
        overlap_ctx c = {a, b, 0.0, wy, wz, CP_OK};
        gsl_function f = {integrand_x, &c};
        double val, abserr, pts[MAX_PTS];
        int np = 0;
        if (a->profile == CP_PROFILE_BOSE && a->n_condensed > 0.0)
            pts[np++] = a->radius[0];
        if (b->profile == CP_PROFILE_BOSE && b->n_condensed > 0.0)
            pts[np++] = b->radius[0];
        int gs = pieces(&f, 0.0, xmax, pts, np, 1e-7, wx, &val, &abserr);
        if (gs != GSL_SUCCESS || c.status != CP_OK || !isfinite(val))
            st = cp_fail(err, CP_ENUMERIC, "%s: the overlap quadrature failed (%s)", ctx,
                         gs != GSL_SUCCESS ? gsl_strerror(gs) : "integrand not finite");
        else
            *overlap = 4.0 * val / b->number;
    }
    gsl_integration_workspace_free(wx);
    gsl_integration_workspace_free(wy);
    gsl_integration_workspace_free(wz);
    return st;
}

/* The sizes of the fixed rule, tried in turn; each accepted against the one before.  The
 * last is tried only with a condensed Bose cloud (below). */
static const cp_overlap_rule RULES[] = {{12, 16, 6}, {16, 24, 8}, {24, 36, 12}, {32, 48, 16}};
static const double RULE_TOL = 1e-8; /* relative agreement of two successive sizes */
/* With a Bose cloud's condensate (or a Bose gas near T_c) the rule converges more slowly:
 * the thermal part has a cusp at that cloud's centre (g_{3/2} ~ zeta(3/2) - 2 sqrt(pi u)), smooth along rays from
 * it but not from the other centre, and rays grazing the other condensate's edge make the
 * integrand non-smooth in direction.  Two sizes are then asked to agree to 1e-6, with one
 * more size on the ladder (the tests hold the result against the reference to 1e-6). */
static const double RULE_TOL_CONDENSED = 1e-6;

/* Whether a profile has the Bose cusp near its centre: a condensate, or a Bose gas close to
 * T_c (fugacity above e^-1, where g_{3/2}(z e^-u) is nearly singular at u = 0). */
static int cusp(const cp_cloud_profile *p)
{
    return p->kind == CP_PROFILE_BOSE && (p->peak_tf > 0.0 || p->eta > -1.0);
}

/* Rank of a profile's sharpness: the centre of the spherical rule is the sharper cloud (a
 * condensate or a Bose gas near T_c first, whose density along rays from its own centre is
 * smooth, while from elsewhere its cusp slows the rule down). */
static double sharpness(const cp_cloud_profile *p)
{
    switch (p->kind) {
    case CP_PROFILE_THOMAS_FERMI: return INFINITY;
    case CP_PROFILE_BOSE: return cusp(p) ? INFINITY : p->eta;
    case CP_PROFILE_FERMI: return p->eta;
    default: return -INFINITY;
    }
}

/* Whether the rays from the centre of c see the core of o (u_o <= u_core) in a wide cone:
 * a cloud seen from outside fills a cone of directions that every rule size could miss
 * alike (and so agree on a wrong value).  In c's scaled coordinates o's scaled position is
 * (q_x y_x, q_y y_y, q_z y_z + d), q_i = L_ci / L_oi; a ray at angle theta from the z axis
 * in the x-z plane passes within the core when
 * tan(theta) <= (q_z / q_x) sqrt(u_core / (d^2 - u_core)) (minimising the quadratic along
 * the ray), likewise in y-z.  Accepted: the centre inside the core (2, preferred), or a cone of half-angle >= 30 degrees about
 * both axes (1: two or three polar nodes of the smallest rule in it; the size comparison
 * judges the rest); else 0. */
static int sees_core(const cp_cloud_profile *c, const cp_cloud_profile *o)
{
    static const double open_cone = CP_PI / 6.0;
    double d = (c->centre - o->centre) / o->length[2], u = o->u_core;
    if (d * d < u)
        return 2;
    for (int i = 0; i < 2; i++) {
        double qi = c->length[i] / o->length[i], qz = c->length[2] / o->length[2];
        if (qz / qi * sqrt(u / (d * d - u)) < tan(open_cone))
            return 0;
    }
    return 1;
}

/* The rule about centre c at successive sizes: CP_OK and the integral when two agree. */
static cp_status ladder(const cp_cloud_profile *c, const cp_cloud_profile *o, double *integral)
{
    int condensed = cusp(c) || cusp(o);
    double tol = condensed ? RULE_TOL_CONDENSED : RULE_TOL;
    size_t sizes = sizeof RULES / sizeof RULES[0] - (condensed ? 0 : 1);
    double prev = cp_feshbach_overlap_rule(c, o, RULES[0]);
    for (size_t k = 1; k < sizes; k++) {
        double v = cp_feshbach_overlap_rule(c, o, RULES[k]);
        if (isfinite(v) && fabs(v - prev) <= tol * fabs(v)) {
            *integral = v;
            return CP_OK;
        }
        prev = v;
    }
    return CP_ENOCONV;
}

cp_status cp_feshbach_overlap_fixed(const cp_cloud_state *a, const cp_cloud_state *b,
                                    double *overlap)
{
    cp_cloud_profile pa, pb;
    *overlap = NAN;
    if (cp_cloud_profile_init(a, &pa) != CP_OK || cp_cloud_profile_init(b, &pb) != CP_OK)
        return CP_ENOCONV;
    /* centres: one inside the other's core first, else the sharper cloud's; each only
     * where it sees the other's core in a wide cone */
    const cp_cloud_profile *first = sharpness(&pa) > sharpness(&pb) ? &pa : &pb;
    const cp_cloud_profile *centres[2] = {first, first == &pa ? &pb : &pa};
    int view[2] = {sees_core(centres[0], centres[1]), sees_core(centres[1], centres[0])};
    if (view[1] > view[0]) {
        centres[1] = first;
        centres[0] = first == &pa ? &pb : &pa;
        view[0] = view[1];
        view[1] = sees_core(centres[1], centres[0]);
    }
    for (int k = 0; k < 2; k++) {
        const cp_cloud_profile *c = centres[k], *o = centres[1 - k];
        double integral;
        if (view[k] > 0 && ladder(c, o, &integral) == CP_OK) {
            *overlap = integral / b->number;
            return CP_OK;
        }
    }
    return CP_ENOCONV;
}

cp_status cp_feshbach_overlap_numeric(const cp_cloud_state *a, const cp_cloud_state *b,
                                      double *overlap, cp_error *err)
{
    if (cp_feshbach_overlap_fixed(a, b, overlap) == CP_OK)
        return CP_OK;
    return cp_feshbach_overlap_adaptive(a, b, overlap, err);
}

cp_status cp_feshbach_overlap_density(const cp_feshbach_cloud *a, const cp_feshbach_cloud *b,
                                      double temperature, double *overlap, double *sag,
                                      cp_error *err)
{
    static const char ctx[] = "feshbach.overlap_density";
    const unsigned allowed = (1u << CP_PROFILE_THERMAL) | (1u << CP_PROFILE_FERMI) |
                             (1u << CP_PROFILE_BOSE) | (1u << CP_PROFILE_THOMAS_FERMI);
    cp_cloud_state sa, sb;
    *overlap = *sag = NAN;
    CP_TRY(cp_cloud_prepare(a, temperature, ctx, "a", allowed, &sa, err));
    CP_TRY(cp_cloud_prepare(b, temperature, ctx, "b", allowed, &sb, err));
    double d = sb.sag - sa.sag;
    if (sa.profile == CP_PROFILE_THERMAL && sb.profile == CP_PROFILE_THERMAL) {
        double prod = 1.0;
        for (int i = 0; i < 3; i++)
            prod *= 2.0 * CP_PI * (sa.ell[i] * sa.ell[i] + sb.ell[i] * sb.ell[i]);
        double s2z = sa.ell[2] * sa.ell[2] + sb.ell[2] * sb.ell[2];
        *overlap = sa.number / sqrt(prod) * exp(-d * d / (2.0 * s2z));
    } else {
        CP_TRY(cp_feshbach_overlap_numeric(&sa, &sb, overlap, err));
    }
    *sag = d;
    return CP_OK;
}

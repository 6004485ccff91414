/*
 * Elastic and loss rate coefficients of identical polar molecules under protection: a dc
 * field in free space (induced dipoles, loss enhanced), a dc field across the planes of a
 * pancake trap (side-by-side repulsion, quasi-2D), microwave shielding (effective
 * potential as in Deng et al., PRL 130, 183001 (2023), arXiv:2210.13253) and dc-field
 * shielding of molecules in |1,0> near the crossing of |1,0>|1,0> with |0,0>|2,0>
 * (González-Martínez, Bohn & Quéméner, PRA 96, 032718 (2017), arXiv:1707.03239): there the
 * incoming channel is the adiabat of the two dipole-coupled pair states (pair_adiabat),
 * evaluated at each angle and projected onto the partial waves by quadrature.
 *
 * Loss: the universal model (Idziaszek & Julienne, PRL 104, 113202 (2010)) generalised as
 * in Quéméner & Bohn, PRA 81, 022702 (2010): whatever reaches short range is lost; how much
 * gets there is computed, not assumed, by integrating the radial equation of the lowest
 * adiabatic channel(s) of the long-range potential (collisions_radial.c).  In 3D the
 * adiabats are the eigenvalues of the potential in a small partial-wave basis at fixed
 * projection M (L = L_min, L_min + 2, ...: dipolar and microwave potentials couple L to
 * L +- 2); in quasi-2D the potential is averaged over the ground state of the relative
 * motion along the tight axis (closed form with modified Bessel functions) and the 2D
 * radial equation is solved (Micheli et al., PRL 105, 073202 (2010) reduce the problem the
 * same way).  For microwave shielding the potential is the dressed pair's
 * (coldprep/fields.h, second order in the dipolar coupling; the form of Deng et al. 2023);
 * the loss boundary sits where its repulsive core reaches the dressed-state splitting
 * hbar sqrt(Omega^2 + Delta^2): inside, the effective potential fails and molecules are
 * taken as lost to lower dressed states (the loss mechanism of Karman & Hutson, PRL 121,
 * 163401 (2018)).  The loss depends steeply on that boundary (docs/models/collisions.md):
 * an order-of-magnitude estimate.  Thermal averages use
 * Gauss-Laguerre quadrature over the relative energy.
 *
 * Elastic: the dipolar cross section of the (effective) dipole, Born (Bohn, Cavagnero &
 * Ticknor, NJP 11, 055039 (2009), as cp_collisions_dipolar_cross_section) below the
 * dipole energy, semiclassical (8 pi / 3) D / k above it (same paper [M]), whichever is
 * smaller; identical bosons in dc fields add 8 pi |a|^2 with the universal |a|^2 = 2 abar^2.
 */
#include "coldprep/collisions.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <gsl/gsl_integration.h>
#include <gsl/gsl_sf_bessel.h>
#include <gsl/gsl_sf_legendre.h>

#include "check_int.h"
#include "collisions_int.h"
#include "coldprep/consts.h"
#include "vdw_int.h"

#define NB 4          /* partial waves per adiabatic channel: L_min .. L_min + 6 */
#define N_ENERGY 8    /* Gauss-Laguerre nodes of the thermal average */
#define N_ANGLE 24    /* Gauss-Legendre nodes of the angular matrix elements (exact here) */
#define F_INNER 200.0 /* |F| at the inner edge: local phase 14 rad per unit ln r (WKB) */
#define PHASE_STEP 0.12 /* largest phase per Numerov step, rad */
#define STEP_LADDER 1.05 /* the steps for different temperatures: see channel_step */
#define MAX_POINTS 40000

/* V(r, c = cos^2 theta) = sum_n f_n(r) c^n, n = 0..3, for the 3D regimes. */
typedef struct terms {
    double c3, c6;
    const double *mw_c3, *mw_c6;
    cp_shield_regime regime;
    /* dc pair: V_aa, V_bb, V_ab = (caa, cbb, cab) (1 - 3 cos^2 theta) / r^3 and the gap */
    double caa, cbb, cab, gap;
} terms;

/* dc-field shielding: the energy (J, from two molecules in |1,0> at rest) of the incoming
 * pair a = |1,0>|1,0> at separation r and 1 - 3 cos^2 theta = s, from the 2 x 2 pair
 * Hamiltonian [[V_aa, V_ab], [V_ab, -g + V_bb]] with b = (|0,0>|2,0> + |2,0>|0,0>) / sqrt 2
 * (docs/models/collisions.md): the upper eigenvalue above the crossing (g > 0), the lower
 * one below it, i.e. the adiabat that is a at large r.  Written as V_aa plus a shift that
 * keeps its accuracy where V_ab^2 / g is tiny:
 *   E_a = V_aa - h + sgn(g) R,  h = (V_aa - V_bb + g) / 2,  R = sqrt(h^2 + V_ab^2). */
static double pair_adiabat(const terms *t, double r, double s)
{
    double r3 = r * r * r;
    double vaa = t->caa * s / r3, vbb = t->cbb * s / r3, vab = t->cab * s / r3;
    double h = 0.5 * (vaa - vbb + t->gap);
    double big = sqrt(h * h + vab * vab);
    double shift;
    if (t->gap >= 0.0)
        shift = h >= 0.0 ? vab * vab / (big + h) : big - h;
    else
        shift = h <= 0.0 ? -vab * vab / (big - h) : -h - big;
    return vaa + shift;
}

static void potential_terms(const terms *t, double r, double f[4])
{
    double r3 = r * r * r, r6 = r3 * r3;
    if (t->regime == CP_SHIELD_DC_3D) {
        /* d^2 (1 - 3 c) / (4 pi eps0 r^3) - C6 / r^6 */
        f[0] = t->c3 / r3 - t->c6 / r6;
        f[1] = -3.0 * t->c3 / r3;
        f[2] = f[3] = 0.0;
    } else {
        /* the dressed pair's effective potential (coldprep/fields.h) as a polynomial in c,
         * and the van der Waals -C6 / r^6 */
        for (int n = 0; n < 4; n++)
            f[n] = t->mw_c3[n] / r3 + t->mw_c6[n] / r6;
        f[0] -= t->c6 / r6;
    }
}

/* Lowest eigenvalue of a symmetric n x n matrix (n <= NB) by cyclic Jacobi rotations
 * (the classical method: Golub & Van Loan, Matrix Computations, sec. 8.5), stopped when
 * the off-diagonal part's square is below tol of the diagonal's. */
static double lowest_eigenvalue_tol(double a[NB][NB], int n, double tol)
{
    for (int sweep = 0; sweep < 30; sweep++) {
        double off = 0.0, diag = 0.0;
        for (int i = 0; i < n; i++) {
            diag += a[i][i] * a[i][i];
            for (int j = i + 1; j < n; j++)
                off += a[i][j] * a[i][j];
        }
        if (off <= tol * diag)
            break;
        for (int p = 0; p < n; p++)
            for (int q = p + 1; q < n; q++) {
                if (a[p][q] == 0.0)
                    continue;
                double theta = (a[q][q] - a[p][p]) / (2.0 * a[p][q]);
                double tt = (theta >= 0 ? 1.0 : -1.0) / (fabs(theta) + sqrt(theta * theta + 1));
                double c = 1.0 / sqrt(tt * tt + 1.0), s = tt * c;
                for (int k = 0; k < n; k++) { /* columns p, q */
                    double akp = a[k][p], akq = a[k][q];
                    a[k][p] = c * akp - s * akq;
                    a[k][q] = s * akp + c * akq;
                }
                for (int k = 0; k < n; k++) { /* rows p, q */
                    double apk = a[p][k], aqk = a[q][k];
                    a[p][k] = c * apk - s * aqk;
                    a[q][k] = s * apk + c * aqk;
                }
            }
    }
    double m = a[0][0];
    for (int i = 1; i < n; i++)
        m = fmin(m, a[i][i]);
    return m;
}

static double lowest_eigenvalue(double a[NB][NB], int n)
{
    return lowest_eigenvalue_tol(a, n, 1e-30);
}

/* Lowest eigenvalue of the symmetric tridiagonal n x n matrix with diagonal d and
 * off-diagonal e, by Newton's method on its characteristic polynomial det(d - x) (leading
 * minors by their three-term recurrence, with their derivatives), started at Gershgorin's
 * lower bound: below the lowest root of a polynomial whose roots are all real, Newton's
 * iterates rise monotonically to that root (the polynomial is convex and decreasing there;
 * a classical property, e.g. Stoer & Bulirsch, Introduction to Numerical Analysis [M]), and
 * they stop when rounding no longer lets them rise.  Fewer operations than
 * the rotations for the dc regime's matrices; the same eigenvalue to a few units in the
 * last place of the matrix's scale. */
static double lowest_tridiagonal(const double *d, const double *e, int n)
{
    double x = INFINITY;
    for (int i = 0; i < n; i++)
        x = fmin(x, d[i] - (i > 0 ? fabs(e[i - 1]) : 0.0) - (i + 1 < n ? fabs(e[i]) : 0.0));
    for (int it = 0; it < 200; it++) {
        double p0 = 1.0, p1 = d[0] - x, q0 = 0.0, q1 = -1.0;
        for (int k = 1; k < n; k++) {
            double e2 = e[k - 1] * e[k - 1];
            double p2 = (d[k] - x) * p1 - e2 * p0;
            double q2 = -p1 + (d[k] - x) * q1 - e2 * q0;
            p0 = p1;
            p1 = p2;
            q0 = q1;
            q1 = q2;
        }
        double next = x - p1 / q1;
        if (!(next > x))
            break;
        x = next;
    }
    return x;
}

/* One adiabatic channel class: projection M, lowest partial wave L_min, multiplicity. */
typedef struct channel {
    int m, lmin;
    double mult;
} channel;

/* <L M| c^n |L' M> (c = cos^2 theta), n = 1..3, for L = lmin + 2i, by Gauss-Legendre. */
static cp_status angular_matrices(const gsl_integration_glfixed_table *gl, int m, int lmin,
                                  double mat[3][NB][NB], cp_error *err)
{
    memset(mat, 0, sizeof(double) * 3 * NB * NB);
    for (size_t k = 0; k < gl->n; k++) {
        double x, w;
        gsl_integration_glfixed_point(-1.0, 1.0, k, &x, &w, gl);
        double y[NB];
        for (int i = 0; i < NB; i++) {
            gsl_sf_result res;
            if (gsl_sf_legendre_sphPlm_e(lmin + 2 * i, m, x, &res) != 0)
                return cp_fail(err, CP_ENUMERIC, "collisions.shielded: spherical harmonic "
                               "L = %d, M = %d failed", lmin + 2 * i, m);
            y[i] = res.val;
        }
        double c = x * x;
        for (int i = 0; i < NB; i++)
            for (int j = 0; j < NB; j++) {
                double yy = 2.0 * CP_PI * w * y[i] * y[j];
                mat[0][i][j] += yy * c;
                mat[1][i][j] += yy * c * c;
                mat[2][i][j] += yy * c * c * c;
            }
    }
    return CP_OK;
}

/* dc pair: the surface E_a(r, theta) is not a polynomial in cos^2 theta, so its partial-
 * wave matrix is a quadrature over the nodes of a Gauss-Legendre rule on cos theta in
 * [0, 1] (the surface and the products Y_L Y_L' of one parity are even in cos theta):
 * node k has s_k = 1 - 3 c_k^2 and weights yy[k][i][j] = 2 pi w_k Y_i Y_j (doubled for
 * the mirror node).  The |1 - 3c^2| kink of the resonant coupling limits the rule's
 * accuracy: 12 nodes change the loss by at most 1e-3 against 48 (KRb, NaK), far below
 * the model's own uncertainty. */
#define N_PAIR_NODES 12
typedef struct pair_nodes {
    double s[N_PAIR_NODES];
    double yy[N_PAIR_NODES][NB][NB];
} pair_nodes;

static cp_status pair_node_table(int m, int lmin, pair_nodes *pn, cp_error *err)
{
    gsl_integration_glfixed_table *gl = gsl_integration_glfixed_table_alloc(N_PAIR_NODES);
    if (!gl)
        return cp_fail(err, CP_ENOMEM, "collisions.shielded: cannot allocate quadratures");
    cp_status st = CP_OK;
    for (size_t k = 0; k < N_PAIR_NODES && st == CP_OK; k++) {
        double x, w;
        gsl_integration_glfixed_point(0.0, 1.0, k, &x, &w, gl);
        pn->s[k] = 1.0 - 3.0 * x * x;
        double y[NB];
        for (int i = 0; i < NB; i++) {
            gsl_sf_result res;
            if (gsl_sf_legendre_sphPlm_e(lmin + 2 * i, m, x, &res) != 0) {
                st = cp_fail(err, CP_ENUMERIC, "collisions.shielded: spherical harmonic "
                             "L = %d, M = %d failed", lmin + 2 * i, m);
                break;
            }
            y[i] = res.val;
        }
        for (int i = 0; i < NB; i++)
            for (int j = 0; j < NB; j++)
                pn->yy[k][i][j] = 2.0 * 2.0 * CP_PI * w * y[i] * y[j];
    }
    gsl_integration_glfixed_table_free(gl);
    return st;
}

/* Quasi-2D: the potential averaged over the relative ground state of the tight axis,
 * |phi(z)|^2 = exp(-z^2 / 2 s^2) / (sqrt(2 pi) s).  Dipolar part in closed form: with
 * (rho^2 - 2 z^2)/r^5 = -d^2/dz^2 (1/r) and two integrations by parts,
 *   <C3 (1 - 3 z^2/r^2) / r^3> = -C3 / (sqrt(2 pi) s) [ rho^2 / (2 s^4) e^y (K1(y) - K0(y))
 *                                 - e^y K0(y) / s^2 ],  y = rho^2 / (4 s^2)
 * (-> C3 / rho^3 for rho >> s).  Van der Waals part: -C6 / (rho^5 sqrt(rho^2 + b^2)),
 * b = (8 / 3 pi) sqrt(2 pi) s, which has the exact limits -C6/rho^6 (rho >> s) and
 * -C6 (3 pi / 8) |phi(0)|^2 / rho^5 (rho << s) (an interpolation between them). */
static double averaged_2d(double c3, double c6, double s, double rho)
{
    double y = rho * rho / (4.0 * s * s);
    double k0 = gsl_sf_bessel_K0_scaled(y), k1 = gsl_sf_bessel_K1_scaled(y);
    double s2 = s * s;
    double vd = -c3 / (sqrt(2.0 * CP_PI) * s) *
                (rho * rho / (2.0 * s2 * s2) * (k1 - k0) - k0 / s2);
    double b = 8.0 / (3.0 * CP_PI) * sqrt(2.0 * CP_PI) * s;
    double r5 = rho * rho * rho * rho * rho;
    return vd - c6 / (r5 * sqrt(rho * rho + b * b));
}

static cp_status check_params(const cp_shielded_params *p, cp_error *err)
{
    const char *ctx = "collisions.shielded";
    if (p->regime != CP_SHIELD_DC_3D && p->regime != CP_SHIELD_QUASI_2D &&
        p->regime != CP_SHIELD_MICROWAVE && p->regime != CP_SHIELD_DC_PAIR)
        return cp_fail(err, CP_EINVAL, "%s: regime %d is not dc_3d (0), quasi_2d (1), "
                       "microwave (2) or dc_shield (3)", ctx, (int)p->regime);
    if (p->stat != CP_PAIR_BOSONS && p->stat != CP_PAIR_FERMIONS)
        return cp_fail(err, CP_EINVAL, "%s: statistics %d is not identical bosons (0) or "
                       "fermions (1)", ctx, (int)p->stat);
    CP_TRY(cp_check_range(err, ctx, "mass", p->mass, "kg", 1e-28, 1e-22, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "c6_au", p->c6_au, "a.u.", 0.0, 1e9, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "temperature", p->temperature, "K", 1e-10, 1e-4,
                          CP_CLOSED));
    if (p->regime == CP_SHIELD_DC_3D || p->regime == CP_SHIELD_QUASI_2D)
        CP_TRY(cp_check_range(err, ctx, "dipole", p->dipole, "C m", 0.0, 20.0 * CP_DEBYE,
                              CP_CLOSED));
    if (p->regime == CP_SHIELD_DC_PAIR) {
        for (int i = 0; i < 3; i++)
            for (int j = 0; j < 3; j++)
                CP_TRY(cp_check_range(err, ctx, "stark_dipole", p->stark_dipole[i][j], "C m",
                                      -20.0 * CP_DEBYE, 20.0 * CP_DEBYE, CP_CLOSED));
        CP_TRY(cp_check_range(err, ctx, "pair_gap", p->pair_gap, "J", -1e-19, 1e-19,
                              CP_CLOSED));
    }
    if (p->regime == CP_SHIELD_QUASI_2D)
        CP_TRY(cp_check_range(err, ctx, "axial_omega", p->axial_omega, "rad/s",
                              2.0 * CP_PI * 1e3, 2.0 * CP_PI * 1e6, CP_CLOSED));
    if (p->regime == CP_SHIELD_MICROWAVE) {
        CP_TRY(cp_check_range(err, ctx, "c3", p->c3, "J m^3", 0.0, 1e-45, CP_LO_OPEN));
        CP_TRY(cp_check_range(err, ctx, "c6_core", p->c6_core, "J m^6", 0.0, 1e-60,
                              CP_LO_OPEN));
        for (int n = 0; n < 4; n++) {
            CP_TRY(cp_check_range(err, ctx, "mw_c3", p->mw_c3[n], "J m^3", -1e-45, 1e-45,
                                  CP_CLOSED));
            CP_TRY(cp_check_range(err, ctx, "mw_c6", p->mw_c6[n], "J m^6", -1e-60, 1e-60,
                                  CP_CLOSED));
        }
        CP_TRY(cp_check_range(err, ctx, "rabi", p->rabi, "rad/s", 0.0, 2.0 * CP_PI * 1e10,
                              CP_LO_OPEN));
        CP_TRY(cp_check_range(err, ctx, "detuning", p->detuning, "rad/s",
                              -2.0 * CP_PI * 1e10, 2.0 * CP_PI * 1e10, CP_CLOSED));
        CP_TRY(cp_check_range(err, ctx, "dipole_permanent", p->dipole_permanent, "C m", 0.0,
                              20.0 * CP_DEBYE, CP_LO_OPEN));
    }
    return CP_OK;
}

/* The outward-integration grid and the scaled potential u_pot of one channel class. */
typedef struct work {
    const cp_shielded_params *p;
    double mu, k2fac; /* reduced mass; 2 mu / hbar^2 */
    double r_far;     /* the temperature-independent outer radius, m */
    double r_max;     /* where the grid ends: r_far or farther at low energy, m */
    terms t;
    double s;         /* quasi-2D: width of the relative axial ground state, m */
    const pair_nodes *pn;        /* dc pair: the angular nodes of the current channel */
} work;

/* u_pot at radius r for channel class ch (3D: lowest adiabat + 1/4; 2D: m^2 + ...). */
static double u_at(const work *w, const channel *ch, double mat[3][NB][NB], double r)
{
    if (w->p->regime == CP_SHIELD_QUASI_2D)
        return (double)(ch->m * ch->m) +
               r * r * w->k2fac * averaged_2d(w->t.c3, w->t.c6, w->s, r);
    double f[4], a[NB][NB];
    if (w->p->regime == CP_SHIELD_DC_PAIR) {
        /* <L|E_a|L'> by quadrature, plus centrifugal and van der Waals terms */
        const pair_nodes *pn = w->pn;
        double r3 = r * r * r;
        memset(a, 0, sizeof a);
        for (int k = 0; k < N_PAIR_NODES; k++) {
            double e = pair_adiabat(&w->t, r, pn->s[k]);
            for (int i = 0; i < NB; i++)
                for (int j = i; j < NB; j++)
                    a[i][j] += e * pn->yy[k][i][j];
        }
        double cent = 1.0 / (w->k2fac * r * r), vdw = w->t.c6 / (r3 * r3);
        for (int i = 0; i < NB; i++) {
            double l = ch->lmin + 2 * i;
            a[i][i] += l * (l + 1.0) * cent - vdw;
            for (int j = 0; j < i; j++)
                a[i][j] = a[j][i];
        }
        /* at long range the partial waves barely mix: second-order perturbation theory
         * (the next orders are below 1e-4 of the coupling when every coupling is below
         * 1e-2 of its gap) saves the rotations on most of the grid */
        int weak = 1;
        double second = 0.0;
        for (int j = 1; j < NB && weak; j++) {
            double gap = a[j][j] - a[0][0];
            weak = gap > 0.0 && fabs(a[0][j]) < 1e-2 * gap;
            second -= a[0][j] * a[0][j] / gap;
        }
        /* the eigenvalue's error is of the order of the off-diagonal part squared over the
         * gaps: 1e-20 of the diagonal's square is far below the accuracy needed */
        double lowest = weak ? a[0][0] + second : lowest_eigenvalue_tol(a, NB, 1e-20);
        return 0.25 + r * r * w->k2fac * lowest;
    }
    potential_terms(&w->t, r, f);
    double cent = 1.0 / (w->k2fac * r * r);
    if (w->p->regime == CP_SHIELD_DC_3D) {
        /* cos^2 theta couples L to L +- 2 only: a tridiagonal matrix */
        double d[NB], e[NB - 1];
        for (int i = 0; i < NB; i++) {
            double l = ch->lmin + 2 * i;
            d[i] = l * (l + 1.0) * cent + f[0] + f[1] * mat[0][i][i];
            if (i + 1 < NB)
                e[i] = f[1] * mat[0][i][i + 1];
        }
        return 0.25 + r * r * w->k2fac * lowest_tridiagonal(d, e, NB);
    }
    for (int i = 0; i < NB; i++)
        for (int j = 0; j < NB; j++) {
            double l = ch->lmin + 2 * i;
            a[i][j] = (i == j ? l * (l + 1.0) * cent + f[0] : 0.0) + f[1] * mat[0][i][j] +
                      f[2] * mat[1][i][j] + f[3] * mat[2][i][j];
        }
    return 0.25 + r * r * w->k2fac * lowest_eigenvalue(a, NB);
}

/* The inner edge: for the loss-at-short-range regimes the largest radius (below the
 * smallest length scale) where |u_pot| reaches F_INNER, so the incoming WKB wave is
 * accurate; for microwave shielding the radius where the core equals hbar Omega_eff. */
static double inner_radius(const work *w, const channel *ch, double mat[3][NB][NB],
                           double r_top)
{
    const cp_shielded_params *p = w->p;
    if (p->regime == CP_SHIELD_MICROWAVE) {
        double omega_eff = hypot(p->rabi, p->detuning);
        return pow(p->c6_core / (CP_HBAR * omega_eff), 1.0 / 6.0);
    }
    double lo = r_top * 1e-4, hi = r_top;
    if (p->regime == CP_SHIELD_DC_PAIR) {
        /* the shield may be repulsive where |u| is large: start from outside and take the
         * outermost radius inside which the well is deep (u < -F_INNER) */
        hi = w->r_far;
        lo = hi;
        while (lo > r_top * 1e-4 && !(u_at(w, ch, mat, lo) < -F_INNER)) {
            hi = lo;
            lo *= 0.8;
        }
        for (int it = 0; it < 40; it++) {
            double mid = sqrt(lo * hi);
            if (u_at(w, ch, mat, mid) < -F_INNER)
                lo = mid;
            else
                hi = mid;
        }
        return lo;
    }
    for (int it = 0; it < 40; it++) { /* bisection in ln r (to 1e-6 relative) */
        double mid = sqrt(lo * hi);
        if (fabs(u_at(w, ch, mat, mid)) > F_INNER)
            lo = mid;
        else
            hi = mid;
    }
    return lo;
}

/* What the potential of one channel class needs besides the work: its angular matrices
 * (3D) or angular nodes (dc pair), made once, when a grid point is first computed. */
typedef struct channel_setup {
    const channel *ch;
    const gsl_integration_glfixed_table *gl;
    int ready;
    double mat[3][NB][NB];
    pair_nodes pn;
} channel_setup;

static cp_status channel_prepare(work *w, channel_setup *cs, cp_error *err)
{
    if (cs->ready)
        return CP_OK;
    memset(cs->mat, 0, sizeof cs->mat);
    if (w->p->regime == CP_SHIELD_DC_PAIR) {
        CP_TRY(pair_node_table(cs->ch->m, cs->ch->lmin, &cs->pn, err));
        w->pn = &cs->pn;
    } else if (w->p->regime != CP_SHIELD_QUASI_2D) {
        CP_TRY(angular_matrices(cs->gl, cs->ch->m, cs->ch->lmin, cs->mat, err));
    }
    cs->ready = 1;
    return CP_OK;
}

/* The step in ln r.  The local phase per step, h sqrt|F|, is largest at the inner edge,
 * where |F| = |u_pot(r_in)| + k^2 r_in^2 at the largest wave number kmax; the step keeps it
 * at most PHASE_STEP (and h at most 0.02).  So that the grid, and with it u_pot on it,
 * does not change with the temperature, the bound is taken on a ladder: F_j =
 * b STEP_LADDER^j, b = max(|u_pot(r_in)|, 1), with j the smallest that reaches F (usually
 * j = 1: k^2 r_in^2 is a small addition to |u_pot| = F_INNER; the steps are at most
 * sqrt(STEP_LADDER) - 1 = 2.5 % shorter than the bound needs). */
static double channel_step(double u_in, double k2r2, int *j)
{
    double b = fmax(fabs(u_in), 1.0), f = fabs(u_in) + k2r2;
    int i = 0;
    while (b * pow(STEP_LADDER, i) < f)
        i++;
    *j = i;
    return fmin(0.02, PHASE_STEP / sqrt(b * pow(STEP_LADDER, i)));
}

/* The key of channel class c's tables in the cache: every input u_pot depends on (those of
 * the regime; the others 0), the class, and the step index j (-1: the inner edge alone). */
static void table_key(const cp_shielded_params *p, int c, int j, double key[CP_RADIAL_KEY])
{
    memset(key, 0, CP_RADIAL_KEY * sizeof *key);
    key[0] = c;
    key[1] = j;
    key[2] = p->regime;
    key[3] = p->stat;
    key[4] = p->mass;
    key[5] = p->c6_au;
    switch (p->regime) {
    case CP_SHIELD_QUASI_2D:
        key[6] = p->dipole;
        key[7] = p->axial_omega;
        break;
    case CP_SHIELD_DC_3D:
        key[6] = p->dipole;
        break;
    case CP_SHIELD_MICROWAVE:
        key[8] = p->c3;
        key[9] = p->c6_core;
        for (int n = 0; n < 4; n++) {
            key[10 + n] = p->mw_c3[n];
            key[14 + n] = p->mw_c6[n];
        }
        key[18] = p->rabi;
        key[19] = p->detuning;
        break;
    case CP_SHIELD_DC_PAIR:
        for (int a = 0; a < 3; a++)
            for (int b = 0; b < 3; b++)
                key[20 + 3 * a + b] = p->stark_dipole[a][b];
        key[29] = p->pair_gap;
        break;
    }
}

cp_status cp_collisions_shielded(const cp_shielded_params *p, cp_shielded_result *r,
                                 cp_error *err)
{
    return cp_collisions_shielded_cached(p, NULL, r, err);
}

cp_status cp_collisions_shielded_cached(const cp_shielded_params *p, cp_shielded_cache *cache,
                                        cp_shielded_result *r, cp_error *err)
{
    if (!r)
        return cp_fail(err, CP_EINVAL, "collisions.shielded: result is NULL");
    cp_poison(&r->elastic_rate, 8);
    r->valid = 0;
    r->method = NULL;
    r->note[0] = '\0';
    if (!p)
        return cp_fail(err, CP_EINVAL, "collisions.shielded: parameters are NULL");
    CP_TRY(check_params(p, err));
    cp_init();

    work w = {.p = p, .mu = p->mass / 2.0, .k2fac = p->mass / (CP_HBAR * CP_HBAR)};
    double kt = CP_KB * p->temperature;
    double c6 = p->c6_au * CP_AU_C6;
    double r6 = pow(w.k2fac * c6, 0.25); /* van der Waals length (2 mu C6 / hbar^2)^(1/4) */
    double abar = cp_vdw_mean_scattering_length(p->c6_au, w.mu);
    w.t.regime = p->regime == CP_SHIELD_MICROWAVE ? CP_SHIELD_MICROWAVE : CP_SHIELD_DC_3D;
    w.t.c6 = c6;
    double coulomb = 1.0 / (4.0 * CP_PI * CP_EPS0);
    double reach = 0.0; /* dc pair: the dipole length of the strongest pair coupling, m */
    if (p->regime == CP_SHIELD_MICROWAVE) {
        w.t.c3 = p->c3;
        w.t.mw_c3 = p->mw_c3;
        w.t.mw_c6 = p->mw_c6;
    } else if (p->regime == CP_SHIELD_DC_PAIR) {
        /* pair states a = |1,0>|1,0>, b = (|0,0>|2,0> + |2,0>|0,0>) / sqrt 2 coupled by
         * d1z d2z (1 - 3 cos^2 theta) / (4 pi eps0 r^3) (all states have M = 0, so the
         * transverse dipole components do not contribute) */
        const double(*dm)[3] = p->stark_dipole;
        w.t.caa = coulomb * dm[1][1] * dm[1][1];
        w.t.cbb = coulomb * (dm[0][0] * dm[2][2] + dm[0][2] * dm[0][2]);
        w.t.cab = coulomb * sqrt(2.0) * dm[0][1] * dm[1][2];
        w.t.gap = p->pair_gap;
        w.t.c3 = w.t.caa; /* the induced dipole of |1,0>: the elastic cross section */
        w.t.regime = CP_SHIELD_DC_PAIR;
        reach = w.mu * fmax(fabs(w.t.cab), fabs(w.t.cbb)) / (CP_HBAR * CP_HBAR);
    } else {
        w.t.c3 = p->dipole * p->dipole * coulomb;
    }
    double dlen = w.mu * w.t.c3 / (CP_HBAR * CP_HBAR); /* dipole length D */
    w.s = sqrt(CP_HBAR / (p->mass * (p->regime == CP_SHIELD_QUASI_2D ? p->axial_omega : 1)));

    /* channel classes: 3D fermions p-wave M = 0 and |M| = 1 (twice), bosons s-wave M = 0;
     * quasi-2D fermions m = +-1, bosons m = 0 */
    channel chans[2];
    int nch;
    int fermi = p->stat == CP_PAIR_FERMIONS;
    if (p->regime == CP_SHIELD_QUASI_2D) {
        chans[0] = (channel){fermi ? 1 : 0, 0, fermi ? 2.0 : 1.0};
        nch = 1;
    } else if (fermi) {
        chans[0] = (channel){0, 1, 1.0};
        chans[1] = (channel){1, 1, 2.0};
        nch = 2;
    } else {
        chans[0] = (channel){0, 0, 1.0};
        nch = 1;
    }

    /* thermal quadrature: 3D Maxwell weight t^{1/2} e^{-t}, 2D e^{-t} (t = E / kT) */
    int two_d = p->regime == CP_SHIELD_QUASI_2D;
    gsl_integration_fixed_workspace *quad = gsl_integration_fixed_alloc(
        gsl_integration_fixed_laguerre, N_ENERGY, 0.0, 1.0, two_d ? 0.0 : 0.5, 0.0);
    gsl_integration_glfixed_table *gl = gsl_integration_glfixed_table_alloc(N_ANGLE);
    cp_radial_table local = {0}; /* the grid without a cache */
    cp_status st = CP_OK;
    if (!quad || !gl) {
        st = cp_fail(err, CP_ENOMEM, "collisions.shielded: cannot allocate quadratures");
        goto done;
    }
    const double *nodes = gsl_integration_fixed_nodes(quad);
    const double *weights = gsl_integration_fixed_weights(quad);
    double kmin = sqrt(w.k2fac * kt * nodes[0]);
    double kmax = sqrt(w.k2fac * kt * nodes[N_ENERGY - 1]);
    double scale = fmax(fmax(r6, dlen), two_d ? w.s : 0.0);
    w.r_far = fmax(fmax(30.0 * r6, 20.0 * fmax(dlen, reach)), two_d ? 30.0 * w.s : 0.0);
    w.r_max = fmax(w.r_far, 4.0 / kmin);

    double loss_sum[N_ENERGY] = {0};
    double r_inner = INFINITY;
    for (int c = 0; c < nch; c++) {
        channel_setup cs = {.ch = &chans[c], .gl = gl};
        double key[CP_RADIAL_KEY], rin, uin;
        table_key(p, c, -1, key);
        const cp_radial_table *in = cp_shielded_cache_find(cache, key);
        if (in) {
            rin = in->r_in;
            uin = in->u_in;
        } else {
            if ((st = channel_prepare(&w, &cs, err)))
                goto done;
            rin = inner_radius(&w, cs.ch, cs.mat, scale);
            uin = u_at(&w, cs.ch, cs.mat, rin);
            if (cache) {
                cp_radial_table *t = cp_shielded_cache_add(cache, key);
                t->r_in = rin;
                t->u_in = uin;
            }
        }
        r_inner = fmin(r_inner, rin);
        int j;
        double h = channel_step(uin, kmax * kmax * rin * rin, &j);
        size_t n = (size_t)ceil(log(w.r_max / rin) / h) + 1;
        if (n > MAX_POINTS) {
            st = cp_fail(err, CP_ENUMERIC, "collisions.shielded: radial grid of %zu points "
                         "exceeds %d (from %g m to %g m, step %g)", n, MAX_POINTS, rin,
                         w.r_max, h);
            goto done;
        }
        if (n < 16)
            n = 16;
        table_key(p, c, j, key);
        cp_radial_table *tab = cp_shielded_cache_find(cache, key);
        if (!tab) {
            free(local.u_pot);
            memset(&local, 0, sizeof local);
            tab = cache ? cp_shielded_cache_add(cache, key) : &local;
        }
        if (tab->n < n) { /* u_pot[i] depends on i alone: a grid is extended, not redone */
            if (!cp_radial_table_reserve(cache, tab, n)) {
                st = cp_fail(err, CP_ENOMEM, "collisions.shielded: cannot allocate the grid");
                goto done;
            }
            if ((st = channel_prepare(&w, &cs, err)))
                goto done;
            double x0 = log(rin);
            for (size_t i = tab->n; i < n; i++) {
                double ri = exp(x0 + (double)i * h);
                tab->u_pot[i] = u_at(&w, cs.ch, cs.mat, ri);
                tab->r2[i] = ri * ri;
            }
            tab->n = n;
        }
        cp_radial_grid g = {n, log(rin), h, two_d ? (double)chans[c].m : chans[c].lmin + 0.5};
        for (int e = 0; e < N_ENERGY; e++) {
            double prob;
            if ((st = cp_radial_absorption(&g, tab->u_pot, tab->r2,
                                           sqrt(w.k2fac * kt * nodes[e]), &prob, err)))
                goto done;
            loss_sum[e] += chans[c].mult * prob;
        }
    }

    /* rate coefficients: g = 2 for identical particles;
     * 3D K(E) = g pi hbar / (mu k) sum P;  2D K(E) = g hbar / mu sum P */
    double kloss = 0.0, kel = 0.0, vmean = 0.0;
    double sigma_born = 0.0, dl = 0.0;
    double d_eff = sqrt(4.0 * CP_PI * CP_EPS0 * w.t.c3); /* <= the checked dipole, 20 D */
    if (d_eff > 0.0 &&
        (st = cp_collisions_dipolar_cross_section(d_eff / CP_DEBYE, w.mu, p->stat, &sigma_born,
                                                  &dl, err)))
        goto done;
    double s_wave = (!fermi && p->regime != CP_SHIELD_MICROWAVE) ? 16.0 * CP_PI * abar * abar
                                                                   : 0.0;
    for (int e = 0; e < N_ENERGY; e++) {
        double k = sqrt(w.k2fac * kt * nodes[e]);
        kloss += weights[e] * (two_d ? 2.0 * CP_HBAR / w.mu * loss_sum[e]
                                     : 2.0 * CP_PI * CP_HBAR / (w.mu * k) * loss_sum[e]);
    }
    /* the elastic average always uses the 3D Maxwell weights */
    {
        gsl_integration_fixed_workspace *q3 = two_d ? gsl_integration_fixed_alloc(
                                                          gsl_integration_fixed_laguerre,
                                                          N_ENERGY, 0.0, 1.0, 0.5, 0.0)
                                                    : NULL;
        if (two_d && !q3) {
            st = cp_fail(err, CP_ENOMEM, "collisions.shielded: cannot allocate quadratures");
            goto done;
        }
        const double *n3 = two_d ? gsl_integration_fixed_nodes(q3) : nodes;
        const double *w3 = two_d ? gsl_integration_fixed_weights(q3) : weights;
        for (int e = 0; e < N_ENERGY; e++) {
            double k = sqrt(w.k2fac * kt * n3[e]);
            double v = CP_HBAR * k / w.mu;
            double sig = fmin(sigma_born, 8.0 * CP_PI / 3.0 * dl / k) + s_wave;
            kel += w3[e] * sig * v;
            vmean += w3[e] * v;
        }
        if (q3)
            gsl_integration_fixed_free(q3);
    }
    double norm3 = 2.0 / sqrt(CP_PI);
    kel *= norm3;
    r->cross_section = kel / (norm3 * vmean);
    if (two_d) {
        r->loss_rate_2d = kloss;
        r->loss_rate = kloss * sqrt(2.0 * CP_PI) * w.s;
    } else {
        r->loss_rate = kloss * norm3;
    }
    r->elastic_rate = kel;
    r->ratio = r->loss_rate > 0.0 ? r->elastic_rate / r->loss_rate : INFINITY;
    r->dipole_length = dlen;
    r->inner_radius = r_inner;
    if (p->regime == CP_SHIELD_DC_PAIR)
        r->pair_gap = p->pair_gap;

    /* validity */
    r->valid = 1;
    switch (p->regime) {
    case CP_SHIELD_DC_3D:
        r->method = "dc field, 3D: universal short-range loss through the lowest adiabatic "
                    "channels of the dipolar + van der Waals potential (Numerov, unit "
                    "absorption); dipolar elastic cross section";
        break;
    case CP_SHIELD_QUASI_2D:
        r->method = "quasi-2D: universal loss through the 2D channel of the dipolar + van "
                    "der Waals potential averaged over the axial ground state (Numerov, "
                    "unit absorption); 3D dipolar elastic cross section";
        if (kt > CP_HBAR * p->axial_omega) {
            r->valid = 0;
            snprintf(r->note, sizeof r->note, "k_B T = %.2g hbar omega_z: excited axial "
                     "states are populated, the lowest-band model does not hold",
                     kt / (CP_HBAR * p->axial_omega));
        } else if (w.s < 3.0 * r6) {
            r->valid = 0;
            snprintf(r->note, sizeof r->note, "axial width %.3g m is not large against the "
                     "van der Waals length %.3g m", w.s, r6);
        }
        break;
    case CP_SHIELD_DC_PAIR:
        r->method = "dc-field shielding: molecules in |1,0>, universal short-range loss "
                    "through the incoming pair's adiabat of |1,0>|1,0> coupled to "
                    "|0,0>|2,0> (two-channel model, partial waves by quadrature; Numerov, "
                    "unit absorption; transitions to |0,0>|2,0> not counted); dipolar elastic "
                    "cross section of the |1,0> induced dipole";
        if (p->pair_gap <= 0.0) {
            r->valid = 0;
            snprintf(r->note, sizeof r->note, "below the crossing (pair gap %.3g MHz): the "
                     "incoming pair is pulled down, loss enhanced; the two-channel model is "
                     "qualitative there", p->pair_gap / CP_H / 1e6);
        } else if (kt > 0.1 * p->pair_gap) {
            r->valid = 0;
            snprintf(r->note, sizeof r->note, "k_B T = %.2g of the pair gap: too close to the "
                     "crossing for the pair to follow its adiabat", kt / p->pair_gap);
        }
        break;
    case CP_SHIELD_MICROWAVE:
        r->method = "microwave shielding: tunnelling through the dressed pair's effective "
                    "potential (Deng et al. 2023 form) to where its core reaches hbar "
                    "Omega_eff (lost inside; the loss depends steeply on that boundary: an "
                    "order-of-magnitude estimate); dipolar elastic cross section of the "
                    "effective dipole";
        if (kt > 0.05 * CP_HBAR * hypot(p->rabi, p->detuning)) {
            r->valid = 0;
            snprintf(r->note, sizeof r->note, "k_B T is not small against hbar "
                     "Omega_eff: the adiabatic effective potential does not hold");
        }
        break;
    }
done:
    free(local.u_pot);
    if (quad) /* GSL's _free functions do not accept NULL */
        gsl_integration_fixed_free(quad);
    if (gl)
        gsl_integration_glfixed_table_free(gl);
    if (st != CP_OK) {
        cp_poison(&r->elastic_rate, 8);
        r->valid = 0;
        r->method = NULL;
    }
    return st;
}

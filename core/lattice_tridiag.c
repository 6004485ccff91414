/*
 * Eigenvalues and eigenvectors of a real symmetric tridiagonal matrix whose off-diagonal
 * is constant, b, except possibly its first element: the shape of the lattice Hamiltonian
 * in a plane-wave basis (and in its even-parity half at the zone centre).
 *
 * Eigenvalues: the LDL^T factorisation of T - x I, d_1 = a_1 - x,
 * d_i = a_i - x - b^2 / d_{i-1}, has as many negative pivots as T has eigenvalues below x
 * (Sylvester's law of inertia: the Sturm-sequence count used by bisection, Wilkinson, The
 * Algebraic Eigenvalue Problem (1965), Ch. 5).
 * Newton's step on the characteristic polynomial uses the three-term recurrence of the
 * leading principal minors P_i = det(T_i - x I) and of their derivatives, which needs no
 * division (rescaled by powers of two against overflow); several shifts are swept together
 * so that their recurrences overlap in the processor's pipeline.
 *
 * Eigenvectors: twisted factorisation (forward and backward pivots meeting at the index
 * where the eigenvector is largest), as in Dhillon and Parlett's MRRR method, Lin. Alg.
 * Appl. 387, 1 (2004).
 */
#include <float.h>
#include <math.h>

#include "lattice_int.h"

enum { MAX_NEWTON = 40, MAX_BISECT = 200 };

/* Smallest pivot magnitude allowed: a zero pivot is replaced by -pivmin (as LAPACK's
 * dstebz does), which keeps b^2 / d finite. */
static double pivmin(const cp_tridiag *t)
{
    return DBL_MIN * fmax(1.0, fmax(t->off * t->off, t->off_first * t->off_first)) * 1e10;
}

/* Square of the off-diagonal element between rows i - 1 and i. */
static double off2(const cp_tridiag *t, int i)
{
    return i == 1 ? t->off_first * t->off_first : t->off * t->off;
}

static double guard(double d, double pmin)
{
    return fabs(d) < pmin ? -pmin : d;
}

int cp_tridiag_count(const cp_tridiag *t, double x)
{
    double pmin = pivmin(t);
    double d = guard(t->diag[0] - x, pmin);
    int count = d < 0;
    for (int i = 1; i < t->n; i++) {
        d = guard(t->diag[i] - x - off2(t, i) / d, pmin);
        count += d < 0;
    }
    return count;
}

/* Sturm counts at m shifts in one sweep; d: m doubles of scratch. */
static void count_many(const cp_tridiag *t, int m, const double *x, int *count, double *d)
{
    double pmin = pivmin(t);
    for (int j = 0; j < m; j++) {
        d[j] = guard(t->diag[0] - x[j], pmin);
        count[j] = d[j] < 0;
    }
    for (int i = 1; i < t->n; i++) {
        double a = t->diag[i], b2 = off2(t, i);
        for (int j = 0; j < m; j++) {
            d[j] = guard(a - x[j] - b2 / d[j], pmin);
            count[j] += d[j] < 0;
        }
    }
}

/* Rescale lane j of consecutive values p0, p1 and their derivatives d0, d1 by a power of
 * two (exact) when |p1| has left [2^-400, 2^400]. */
static inline void rescale(double *p0, double *p1, double *d0, double *d1, int j)
{
    double mag = fabs(p1[j]);
    if ((mag > 0x1p400 || mag < 0x1p-400) && mag > 0.0 && isfinite(mag)) {
        int e = -ilogb(p1[j]);
        p0[j] = ldexp(p0[j], e);
        p1[j] = ldexp(p1[j], e);
        d0[j] = ldexp(d0[j], e);
        d1[j] = ldexp(d1[j], e);
    }
}

/* Newton steps -det/det' at w <= 8 shifts swept together, so that their independent
 * recurrences overlap in the processor's pipeline.  The characteristic polynomials of the leading submatrices,
 * P_i = (a_i - x) P_{i-1} - b_i^2 P_{i-2} and their derivatives
 * P_i' = (a_i - x) P_{i-1}' - P_{i-1} - b_i^2 P_{i-2}', need no division; every 4 rows a
 * lane whose |P| has left [2^-400, 2^400] is rescaled by a power of two (exact, and the
 * step P/P' does not change).  A step may come out non-finite (callers check); its
 * correctness is never taken on trust: callers accept a result only after a Sturm count. */
static inline void newton_block(const cp_tridiag *t, int w, const double *x, double *step)
{
    double p0[8], p1[8], d0[8], d1[8];
    for (int j = 0; j < w; j++) {
        p0[j] = 1.0;
        p1[j] = t->diag[0] - x[j];
        d0[j] = 0.0;
        d1[j] = -1.0;
    }
    for (int i = 1; i < t->n; i++) {
        double a = t->diag[i], b2 = off2(t, i);
        for (int j = 0; j < w; j++) {
            double ax = a - x[j];
            double pn = ax * p1[j] - b2 * p0[j];
            double dn = ax * d1[j] - p1[j] - b2 * d0[j];
            p0[j] = p1[j];
            p1[j] = pn;
            d0[j] = d1[j];
            d1[j] = dn;
        }
        if ((i & 3) == 0)
            for (int j = 0; j < w; j++)
                rescale(p0, p1, d0, d1, j);
    }
    for (int j = 0; j < w; j++)
        step[j] = -p1[j] / d1[j];
}

/* Newton steps at m shifts, in blocks of at most 8 swept together. */
static void newton_many(const cp_tridiag *t, int m, const double *x, double *step)
{
    for (int j = 0; j < m; j += 8)
        newton_block(t, m - j < 8 ? m - j : 8, x + j, step + j);
}

static double tolerance(double x)
{
    return 2e-14 * (1.0 + fabs(x));
}

/* Refine all guesses together; accept only if the Sturm counts at points separating them
 * show exactly one eigenvalue between consecutive separators, the k-th lowest for x[k]. */
static int refine_guesses(const cp_tridiag *t, int m, double *x, double *work)
{
    double *step = work;
    for (int it = 0; it < MAX_NEWTON; it++) {
        newton_many(t, m, x, step);
        int done = 1;
        for (int j = 0; j < m; j++) {
            if (!isfinite(step[j]))
                return 0;
            x[j] += step[j];
            if (fabs(step[j]) > tolerance(x[j]))
                done = 0;
        }
        if (done)
            break;
        if (it == MAX_NEWTON - 1)
            return 0;
    }
    /* separators: below x[0], between neighbours, above x[m-1] */
    double *sep = step;
    int count[m + 1];
    for (int j = 1; j < m; j++) {
        if (!(x[j] - x[j - 1] > 4 * tolerance(x[j])))
            return 0;
        sep[j] = 0.5 * (x[j - 1] + x[j]);
    }
    sep[0] = x[0] - 1e3 * tolerance(x[0]);
    sep[m] = x[m - 1] + 1e3 * tolerance(x[m - 1]);
    count_many(t, m + 1, sep, count, work + (m + 1));
    for (int j = 0; j <= m; j++)
        if (count[j] != j)
            return 0;
    return 1;
}

/* The k-th lowest eigenvalue inside [lo, hi], count(lo) <= k < count(hi): bisection until
 * it is alone, then Newton kept inside the bracket. */
static cp_status isolate_and_refine(const cp_tridiag *t, int k, double lo, double hi,
                                    double *out)
{
    int clo = cp_tridiag_count(t, lo), chi = cp_tridiag_count(t, hi), it = 0;
    while (!(clo == k && chi == k + 1)) {
        if (hi - lo <= tolerance(hi)) {
            *out = 0.5 * (lo + hi); /* a multiple eigenvalue, resolved to the tolerance */
            return CP_OK;
        }
        if (++it > MAX_BISECT)
            return CP_ENOCONV;
        double mid = 0.5 * (lo + hi);
        int c = cp_tridiag_count(t, mid);
        if (c <= k) {
            lo = mid;
            clo = c;
        } else {
            hi = mid;
            chi = c;
        }
    }
    double x = 0.5 * (lo + hi), step;
    for (it = 0; it < MAX_BISECT; it++) {
        newton_many(t, 1, &x, &step);
        if (cp_tridiag_count(t, x) <= k)
            lo = x;
        else
            hi = x;
        double xn = x + step;
        if (!(xn > lo && xn < hi))
            xn = 0.5 * (lo + hi);
        if (fabs(xn - x) <= tolerance(xn) || hi - lo <= tolerance(hi)) {
            *out = xn;
            return CP_OK;
        }
        x = xn;
    }
    return CP_ENOCONV;
}

/* A diagonal matrix (no lattice: every off-diagonal element 0) has its diagonal for
 * eigenvalues: the m lowest, ascending, by insertion. */
static void lowest_of_diagonal(const cp_tridiag *t, int m, double *x)
{
    int have = 0;
    for (int i = 0; i < t->n && m > 0; i++) {
        double d = t->diag[i];
        if (have == m && d >= x[m - 1])
            continue;
        int j = have < m ? have++ : m - 1;
        for (; j > 0 && x[j - 1] > d; j--)
            x[j] = x[j - 1];
        x[j] = d;
    }
}

cp_status cp_tridiag_lowest(const cp_tridiag *t, int m, int have_guess, double *x,
                            double *work)
{
    if (t->off == 0.0 && t->off_first == 0.0) {
        lowest_of_diagonal(t, m, x);
        return CP_OK;
    }
    if (have_guess && refine_guesses(t, m, x, work))
        return CP_OK;
    /* Gershgorin bounds enclose the whole spectrum. */
    double glo = INFINITY, ghi = -INFINITY, rad = 2.0 * fmax(fabs(t->off), fabs(t->off_first));
    for (int i = 0; i < t->n; i++) {
        glo = fmin(glo, t->diag[i] - rad);
        ghi = fmax(ghi, t->diag[i] + rad);
    }
    glo -= tolerance(glo);
    ghi += tolerance(ghi);
    double lo = glo;
    for (int k = 0; k < m; k++) {
        if (t->cancel && *t->cancel)
            return CP_ECANCELED;
        cp_status st = isolate_and_refine(t, k, lo, ghi, &x[k]);
        if (st != CP_OK)
            return st;
        /* a multiple eigenvalue resolved to the tolerance may come out a few ulps low */
        if (k > 0 && x[k] < x[k - 1])
            x[k] = x[k - 1];
        lo = x[k] - 2 * tolerance(x[k]); /* the next eigenvalue is not below this one */
    }
    return CP_OK;
}

void cp_tridiag_vector(const cp_tridiag *t, double lambda, double *v, double *work)
{
    int n = t->n;
    double pmin = pivmin(t);
    double *dplus = work, *dminus = work + n; /* forward and backward pivots */
    dplus[0] = guard(t->diag[0] - lambda, pmin);
    for (int i = 1; i < n; i++)
        dplus[i] = guard(t->diag[i] - lambda - off2(t, i) / dplus[i - 1], pmin);
    dminus[n - 1] = guard(t->diag[n - 1] - lambda, pmin);
    for (int i = n - 2; i >= 0; i--)
        dminus[i] = guard(t->diag[i] - lambda - off2(t, i + 1) / dminus[i + 1], pmin);
    /* gamma_k = dplus_k + dminus_k - (a_k - lambda): the twist index minimises |gamma| */
    int kbest = 0;
    double gbest = INFINITY;
    for (int k = 0; k < n; k++) {
        double g = fabs(dplus[k] + dminus[k] - (t->diag[k] - lambda));
        if (g < gbest) {
            gbest = g;
            kbest = k;
        }
    }
    v[kbest] = 1.0;
    for (int i = kbest - 1; i >= 0; i--)
        v[i] = -(i == 0 ? t->off_first : t->off) * v[i + 1] / dplus[i];
    for (int i = kbest + 1; i < n; i++)
        v[i] = -(i == 1 ? t->off_first : t->off) * v[i - 1] / dminus[i];
    double norm = 0.0, big = 0.0;
    for (int i = 0; i < n; i++) {
        norm += v[i] * v[i];
        if (fabs(v[i]) > fabs(big))
            big = v[i];
    }
    double scale = (big < 0 ? -1.0 : 1.0) / sqrt(norm);
    for (int i = 0; i < n; i++)
        v[i] *= scale;
}

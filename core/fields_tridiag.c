/*
 * The lowest eigenvalues and their eigenvectors of a real symmetric tridiagonal matrix
 * (diagonal a[0..n-1], off-diagonal b[0..n-2]): the rotor Hamiltonian in one M block.
 *
 * Eigenvalues: the pivots of the LDL^T factorisation of T - s I, p_0 = a_0 - s,
 * p_i = a_i - s - b_{i-1}^2 / p_{i-1}, count the eigenvalues below s (their number of
 * negative pivots, Sylvester's law of inertia: the Sturm-sequence count of bisection,
 * Wilkinson, The Algebraic Eigenvalue Problem (1965), Ch. 5).  det(T - s I) = prod p_i, so
 * the same sweep gives d/ds log det = sum p_i' / p_i and with it Newton's step on the
 * characteristic polynomial.  Each level keeps a bracket [lo, hi] with count(lo) <= k <
 * count(hi), starting from Weyl's bound |lambda_k - a_k| <= ||T - diag a|| (the diagonal is
 * ascending); a Newton step is taken when it lands inside the bracket, a bisection
 * otherwise, and a level is done when its bracket holds it alone and the step is below the
 * tolerance.  All levels are swept together so that their divisions overlap.
 *
 * Eigenvectors: the twisted factorisation of T - lambda I (forward and backward pivots
 * meeting at the index r that minimises |gamma_r|), Dhillon & Parlett, Lin. Alg. Appl.
 * 387, 1 (2004); components follow from z_r = 1 by two short recurrences.
 */
#include <float.h>
#include <math.h>

#include "fields_int.h"
#include "fields_tri_int.h"

enum { MAX_ROUNDS = 300 };

static double guard(double p, double pmin)
{
    return fabs(p) < pmin ? -pmin : p;
}

/* Counts and Newton steps at the m shifts s[0..m-1].  A step is NaN where a pivot had to
 * be guarded: there the sum of p_i'/p_i loses all accuracy. */
static void sweep(const cp_fields_tri *t, int m, const double *s, int *count, double *step,
                  double *r, double *dp, double *sum)
{
    for (int j = 0; j < m; j++) {
        double p = t->a[0] - s[j];
        if (fabs(p) < t->pmin) {
            p = -t->pmin;
            dp[j] = NAN;
        } else {
            dp[j] = -1.0;
        }
        r[j] = 1.0 / p;
        sum[j] = dp[j] * r[j];
        count[j] = p < 0;
    }
    for (int i = 1; i < t->n; i++) {
        double a = t->a[i], b2 = t->b2[i - 1];
        for (int j = 0; j < m; j++) {
            double q = b2 * r[j];
            double p = a - s[j] - q;
            double dpn = -1.0 + q * dp[j] * r[j];
            if (fabs(p) < t->pmin) {
                p = -t->pmin;
                dpn = NAN;
            }
            r[j] = 1.0 / p;
            dp[j] = dpn;
            sum[j] += dpn * r[j];
            count[j] += p < 0;
        }
    }
    for (int j = 0; j < m; j++)
        step[j] = -1.0 / sum[j];
}

/* What the next sweep does for a level. */
enum { BISECT = 0, NEWTON = 1, VERIFY = 2, DONE = 3 };

/* Narrow every open bracket with the count c at point p. */
static void narrow(int m, double p, int c, const int *state, double *lo, double *hi)
{
    for (int q = 0; q < m; q++) {
        if (state[q] == DONE || !(p > lo[q] && p < hi[q]))
            continue;
        if (c <= q)
            lo[q] = p;
        else
            hi[q] = p;
    }
}

cp_status cp_fields_tri_lowest(const cp_fields_tri *t, int m, const double *scale,
                               const double *guess, double *lambda, cp_fields_tri_scratch *sc)
{
    double *lo = sc->lo, *hi = sc->hi, *x = sc->x, *s = sc->s, *step = sc->step;
    int *count = sc->count, *state = sc->state;
    /* Weyl: |lambda_k - a_k| <= ||off-diagonal part||, so count(lo_k) <= k < count(hi_k)
     * holds without a sweep (a margin covers rounding) */
    double radius = t->norm_off * (1.0 + 1e-12) + DBL_MIN;
    for (int k = 0; k < m; k++) {
        double margin = 1e-12 * (fabs(t->a[k]) + radius) + 4 * DBL_MIN;
        lo[k] = t->a[k] - radius - margin;
        hi[k] = t->a[k] + radius + margin;
        state[k] = NEWTON;
        x[k] = guess && guess[k] > lo[k] && guess[k] < hi[k] ? guess[k] : 0.5 * (lo[k] + hi[k]);
    }
    int left = m;
    for (int round = 0; round < MAX_ROUNDS && left > 0; round++) {
        /* pack the shifts of the open levels: x[k], and x[k] + delta while verifying */
        int ns = 0;
        for (int k = 0; k < m; k++) {
            if (state[k] == DONE)
                continue;
            s[ns++] = x[k];
            if (state[k] == VERIFY)
                s[ns++] = 2.0 * lambda[k] - x[k];
        }
        sweep(t, ns, s, count, step, sc->r, sc->dp, sc->sum);
        int j = 0;
        for (int k = 0; k < m; k++) {
            if (state[k] == DONE)
                continue;
            double tol = 4 * DBL_EPSILON * fmax(fabs(x[k]), scale[k]);
            if (state[k] == VERIFY) {
                /* s[j] and s[j + 1] straddle the candidate lambda[k] */
                int ok = count[j] == k && count[j + 1] == k + 1;
                narrow(m, s[j], count[j], state, lo, hi);
                narrow(m, s[j + 1], count[j + 1], state, lo, hi);
                j += 2;
                if (ok) {
                    state[k] = DONE;
                    left--;
                } else {
                    state[k] = BISECT;
                    x[k] = 0.5 * (lo[k] + hi[k]);
                }
                continue;
            }
            double before = hi[k] - lo[k];
            narrow(m, s[j], count[j], state, lo, hi);
            double next = x[k] + step[j];
            int inside = isfinite(next) && next > lo[k] && next < hi[k];
            if (hi[k] - lo[k] <= tol) {
                lambda[k] = 0.5 * (lo[k] + hi[k]);
                state[k] = DONE;
                left--;
            } else if (isfinite(step[j]) && fabs(step[j]) <= tol) {
                /* a converged Newton iterate (the step may round away entirely): prove it
                 * by the counts just either side */
                lambda[k] = fmin(fmax(next, lo[k]), hi[k]);
                x[k] = lambda[k] - 16 * tol;
                state[k] = VERIFY;
            } else if (inside && (hi[k] - lo[k] < 0.5 * before ||
                                  fabs(step[j]) < 0.25 * (hi[k] - lo[k]))) {
                x[k] = next;
                state[k] = NEWTON;
            } else {
                x[k] = 0.5 * (lo[k] + hi[k]);
                state[k] = BISECT;
            }
            j++;
        }
    }
    return left == 0 ? CP_OK : CP_ENOCONV;
}

void cp_fields_tri_vector(const cp_fields_tri *t, double lambda, double *v, double *fwd,
                          double *bwd)
{
    int n = t->n;
    /* the forward and backward pivot chains are independent: one loop runs both */
    fwd[0] = guard(t->a[0] - lambda, t->pmin);
    bwd[n - 1] = guard(t->a[n - 1] - lambda, t->pmin);
    for (int i = 1; i < n; i++) {
        int k = n - 1 - i;
        fwd[i] = guard(t->a[i] - lambda - t->b2[i - 1] / fwd[i - 1], t->pmin);
        bwd[k] = guard(t->a[k] - lambda - t->b2[k] / bwd[k + 1], t->pmin);
    }
    int r = 0;
    double best = INFINITY;
    for (int i = 0; i < n; i++) {
        double gamma = fabs(fwd[i] + bwd[i] - (t->a[i] - lambda));
        if (gamma < best) {
            best = gamma;
            r = i;
        }
    }
    v[r] = 1.0;
    for (int i = r - 1; i >= 0; i--)
        v[i] = -(t->b[i] / fwd[i]) * v[i + 1];
    for (int i = r + 1; i < n; i++)
        v[i] = -(t->b[i - 1] / bwd[i]) * v[i - 1];
    double norm = 0.0;
    for (int i = 0; i < n; i++)
        norm += v[i] * v[i];
    norm = 1.0 / sqrt(norm);
    for (int i = 0; i < n; i++)
        v[i] *= norm;
}

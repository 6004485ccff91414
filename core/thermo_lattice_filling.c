/*
 * Site occupation statistics of a gas in a deep lattice with a harmonic envelope, in the
 * atomic limit of the Hubbard model (tunnelling J << k_B T, so that sites are independent;
 * e.g. Jaksch et al., PRL 81, 3108 (1998) for the Bose-Hubbard model, and the atomic-limit
 * analyses of Gerbier, PRL 99, 120405 (2007)).  Each site has one orbital per band
 * combination (nx, ny, nz) at the sum of the three axes' band means (the energies of the
 * Wannier functions).  Fermions of one component hold at most one particle per orbital;
 * bosons in the lowest orbital have the on-site energy U n (n - 1)/2, excited orbitals are
 * taken as ideal.  The envelope enters in the local-density approximation: a site at
 * envelope energy V has the chemical potential mu - V, and a sum over sites of a site
 * property g becomes
 *   sum_sites g = (2 / sqrt(pi)) A int_0^inf sqrt(u) g(mu - u k_B T) du,
 *   A = (2 pi k_B T / (m omega_bar^2))^{3/2} / d^3,
 * integrated here with u = t^2 by Simpson's rule.  mu is solved (Brent) so that the sites
 * hold the N particles.  Orbitals more than TAIL_START k_B T above mu_local enter through
 * precomputed sums S1 = sum m e^{-beta e}, S2 = sum m e^{-2 beta e} over them:
 * ln(1 -+ zeta) = -+zeta - zeta^2/2 and zeta/(1 -+ zeta) = zeta +- zeta^2 to
 * O(zeta^3) < e^{-24} relative.  For fermions, orbitals more than DEEP k_B T below mu_local
 * are full: ln(1 + zeta) = ln zeta + 1/zeta and zeta/(1 + zeta) = 1 - 1/zeta, and dropping
 * the 1/zeta < e^{-40} terms leaves prefix sums over those orbitals (of m, m (e - e_0) and
 * ln sum m e^{-beta(e - e_0)}), so a site costs only the orbitals within a few k_B T of
 * mu_local, not all of them (a squeezed cloud with every band filled has tens of thousands).
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "thermo_int.h"

#define SIMPSON_INTERVALS 800 /* even; the integrand is smooth on the scale k_B T */
#define TAIL_START 8.0       /* orbitals this many k_B T above mu_local: second-order series */
#define TAIL 50.0             /* u beyond max(mu - e_0, 0)/k_B T + TAIL is left out */
#define MAX_OCCUPATION 100000 /* largest n summed for the lowest bosonic orbital */
#define DEEP 40.0             /* fermion orbitals this many k_B T below mu_local: full */
#define COST_TERM 1.5e-8      /* CPU seconds per term of a site sum (exp, log1p; measured) */
#define CLOCK_TERMS 2000.0    /* terms between two readings of the CPU clock (~30 us of work) */

typedef struct orbital {
    double e; /* J, from the lattice potential minimum */
    double m; /* multiplicity (band combinations of equal energy) */
} orbital;

typedef struct filling_ctx {
    orbital *orb;
    double *s1, *s2; /* suffix sums over orbitals k.. of m e^{-beta(e - e_0)}, squared */
    /* prefix sums over orbitals 1..k-1 (fermions): of m, of m beta (e - e_0), and
     * ln sum m e^{-beta (e - e_0)} (-inf for none) */
    double *pm, *pe, *pl;
    size_t count;
    cp_statistics stat;
    double kt, amp, onsite_u;
    double terms, max_terms; /* terms of the site sums so far, and the bound on them */
    double cpu_start, max_seconds; /* this thread's CPU time at the start, and the limit */
    double next_clock;             /* the term count at which the CPU time is read next */
    int out_of_time;               /* the CPU time read last was past max_seconds */
    const cp_cancel_flag *cancel;
} filling_ctx;

/* CPU seconds used by the calling thread (not the process: sweeps run several jobs). */
static double thread_cpu_seconds(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* CPU seconds since the call started. */
static double cpu_used(const filling_ctx *c)
{
    return thread_cpu_seconds() - c->cpu_start;
}

/* Whether the site sums must stop: their bound in terms passed, the work limit spent (on a
 * machine slower than the one COST_TERM was measured on the terms alone would overrun it),
 * or the caller's flag set.  The thread's CPU clock is a system call (0.7 us measured on a
 * virtual machine; read at every site it took a fifth of a typical call), so it is read
 * once per CLOCK_TERMS terms. */
static int stopped(filling_ctx *c)
{
    if (c->terms >= c->next_clock) {
        c->next_clock = c->terms + CLOCK_TERMS;
        c->out_of_time = cpu_used(c) > c->max_seconds;
    }
    return c->terms > c->max_terms || c->out_of_time || (c->cancel && *c->cancel);
}

typedef struct site_stats {
    double p0, p1, nbar;
} site_stats;

static double softplus(double a)
{
    return a > 0.0 ? a + log1p(exp(-a)) : log1p(exp(a));
}

/* ln(e^x + e^y) */
static double log_add(double x, double y)
{
    if (x == -INFINITY)
        return y;
    double hi = fmax(x, y), lo = fmin(x, y);
    return hi + log1p(exp(lo - hi));
}

/* The lowest bosonic orbital with the on-site energy U n (n-1)/2 at a = beta (mu_l - e0):
 * ln Z0 and the mean occupation; NaN when the sum does not settle.  Adds the number of
 * terms summed to *terms. */
static void hubbard_orbital(double a, double bu, double *log_z, double *nbar, double *terms)
{
    if (isinf(bu)) { /* hard-core: 0 or 1 */
        *log_z = softplus(a);
        *nbar = 1.0 / (1.0 + exp(-a));
        return;
    }
    /* t_n = n a - bu n (n - 1)/2 peaks near n* = a/bu + 1/2 */
    double peak = fmax(0.0, floor(a / bu + 0.5));
    double tmax = peak * a - bu * peak * (peak - 1.0) / 2.0;
    double z = 0.0, nz = 0.0;
    for (long n = 0;; n++) {
        double dn = (double)n;
        double t = dn * a - bu * dn * (dn - 1.0) / 2.0 - tmax;
        z += exp(t);
        nz += dn * exp(t);
        if (n > peak && t < -40.0) {
            *terms += dn;
            break;
        }
        if (n > MAX_OCCUPATION) {
            *terms += dn;
            *log_z = *nbar = NAN;
            return;
        }
    }
    *log_z = tmax + log(z);
    *nbar = nz / z;
}

/* The first orbital k >= 1 more than `above` k_B T above mu_l (count if none; sorted). */
static size_t first_above(const filling_ctx *c, double mu_l, double above)
{
    size_t lo = 1, hi = c->count;
    while (lo < hi) {
        size_t mid = lo + (hi - lo) / 2;
        if ((c->orb[mid].e - mu_l) / c->kt > above)
            hi = mid;
        else
            lo = mid + 1;
    }
    return lo;
}

/* Occupation probabilities of one site at local chemical potential mu_l. */
static site_stats site_at(filling_ctx *c, double mu_l)
{
    site_stats s;
    double beta = 1.0 / c->kt;
    double a0 = beta * (mu_l - c->orb[0].e);
    double log_p0, n;
    if (c->stat == CP_FERMION) {
        log_p0 = -softplus(a0);
        n = 1.0 / (1.0 + exp(-a0));
    } else {
        double log_z;
        hubbard_orbital(a0, beta * c->onsite_u, &log_z, &n, &c->terms);
        log_p0 = -log_z;
    }
    double log_r = a0; /* ln sum_k m_k zeta_k: P1 = P0 sum_k m_k zeta_k */
    /* the first orbital more than TAIL_START k_B T above mu_l (bisection; sorted) */
    size_t lo = first_above(c, mu_l, TAIL_START), first = 1;
    if (c->stat == CP_FERMION) {
        /* orbitals 1 .. first-1 lie more than DEEP k_B T below mu_l: full */
        first = first_above(c, mu_l, -DEEP);
        if (first > 1) {
            log_p0 -= c->pm[first] * a0 - c->pe[first];
            n += c->pm[first];
            log_r = log_add(log_r, a0 + c->pl[first]);
        }
    }
    c->terms += (double)(lo - first) + 1.0;
    for (size_t k = first; k < lo; k++) {
        double a = beta * (mu_l - c->orb[k].e), m = c->orb[k].m;
        if (c->stat == CP_FERMION) {
            log_p0 -= m * softplus(a);
            n += m / (1.0 + exp(-a));
        } else {
            if (a >= 0.0) { /* an ideal bosonic orbital at or below mu_l: unbounded */
                s.p0 = s.p1 = s.nbar = NAN;
                return s;
            }
            log_p0 += m * log1p(-exp(a));
            n += m / expm1(-a);
        }
        log_r = log_add(log_r, log(m) + a);
    }
    if (lo < c->count && c->s1[lo] > 0.0) {
        double t1 = exp(a0 + log(c->s1[lo])), t2 = exp(2.0 * a0 + log(c->s2[lo]));
        double sign = c->stat == CP_FERMION ? -1.0 : 1.0;
        log_p0 -= t1 + sign * t2 / 2.0; /* -ln(1 + zeta) = -zeta + zeta^2/2, bosons +ln(1 - zeta) */
        n += t1 + sign * t2;
        log_r = log_add(log_r, log(t1));
    }
    s.p0 = exp(log_p0);
    s.p1 = exp(log_p0 + log_r);
    s.nbar = n;
    return s;
}

/* Sums over the sites (LDA, Simpson in t = sqrt(u)) of 1 - P0, P1 and n at log-fugacity
 * x = (mu - e_0)/k_B T.  NaN once stopped (the terms summed beyond their bound, or
 * cancelled). */
static void lda_sums(filling_ctx *c, double x, double sums[3])
{
    double tmax = sqrt(fmax(x, 0.0) + TAIL), h = tmax / SIMPSON_INTERVALS;
    double mu = c->orb[0].e + x * c->kt;
    sums[0] = sums[1] = sums[2] = 0.0;
    for (int i = 0; i <= SIMPSON_INTERVALS; i++) {
        double t = i * h;
        double w = (i == 0 || i == SIMPSON_INTERVALS) ? 1.0 : (i % 2 ? 4.0 : 2.0);
        if (stopped(c)) {
            sums[0] = sums[1] = sums[2] = NAN;
            return;
        }
        site_stats s = site_at(c, mu - t * t * c->kt);
        double f = w * 2.0 * t * t;
        sums[0] += f * (1.0 - s.p0);
        sums[1] += f * s.p1;
        sums[2] += f * s.nbar;
    }
    double scale = c->amp * 2.0 / sqrt(CP_PI) * h / 3.0;
    for (int k = 0; k < 3; k++)
        sums[k] *= scale;
}

static double lda_number(double x, void *p)
{
    double sums[3];
    lda_sums(p, x, sums);
    return sums[2];
}

static int by_energy(const void *a, const void *b)
{
    double x = ((const orbital *)a)->e, y = ((const orbital *)b)->e;
    return (x > y) - (x < y);
}

/* Orbitals of all band combinations, sorted, equal energies merged (not into the lowest). */
static cp_status make_orbitals(const cp_thermo_lattice *lat, filling_ctx *c, cp_error *err)
{
    double mean[3][CP_THERMO_LATTICE_MAX_BANDS];
    size_t combos = 1;
    for (int a = 0; a < 3; a++) {
        const cp_thermo_band_table *t = &lat->axis[a];
        combos *= (size_t)t->bands;
        for (int n = 0; n < t->bands; n++) {
            double s = 0.0;
            for (int j = 0; j < t->points; j++)
                s += t->energy_er[j * t->bands + n];
            mean[a][n] = s / t->points * lat->recoil_energy;
        }
    }
    c->orb = malloc(combos * sizeof *c->orb);
    if (!c->orb)
        return cp_fail(err, CP_ENOMEM, "thermo.lattice_filling: cannot allocate %zu orbitals",
                       combos);
    size_t k = 0;
    for (int nx = 0; nx < lat->axis[0].bands; nx++)
        for (int ny = 0; ny < lat->axis[1].bands; ny++)
            for (int nz = 0; nz < lat->axis[2].bands; nz++) {
                c->orb[k].e = mean[0][nx] + mean[1][ny] + mean[2][nz];
                c->orb[k].m = 1.0;
                k++;
            }
    qsort(c->orb + 1, combos - 1, sizeof *c->orb, by_energy); /* (0,0,0) is the lowest */
    size_t m = combos > 1 ? 2 : 1;
    for (size_t i = 2; i < combos; i++) {
        if (fabs(c->orb[i].e - c->orb[m - 1].e) <= 1e-12 * fabs(c->orb[i].e))
            c->orb[m - 1].m += 1.0;
        else
            c->orb[m++] = c->orb[i];
    }
    c->count = m;
    c->s1 = malloc(2 * (m + 1) * sizeof *c->s1);
    if (!c->s1)
        return cp_fail(err, CP_ENOMEM, "thermo.lattice_filling: cannot allocate %zu sums", m);
    c->s2 = c->s1 + m + 1;
    c->s1[m] = c->s2[m] = 0.0;
    for (size_t i = m; i-- > 0;) {
        double b = exp(-(c->orb[i].e - c->orb[0].e) / c->kt);
        c->s1[i] = c->s1[i + 1] + c->orb[i].m * b;
        c->s2[i] = c->s2[i + 1] + c->orb[i].m * b * b;
    }
    c->pm = malloc(3 * (m + 1) * sizeof *c->pm);
    if (!c->pm)
        return cp_fail(err, CP_ENOMEM, "thermo.lattice_filling: cannot allocate %zu sums", m);
    c->pe = c->pm + m + 1;
    c->pl = c->pe + m + 1;
    c->pm[1] = c->pe[1] = 0.0;
    c->pl[1] = -INFINITY;
    for (size_t i = 1; i < m; i++) {
        double x = (c->orb[i].e - c->orb[0].e) / c->kt;
        c->pm[i + 1] = c->pm[i] + c->orb[i].m;
        c->pe[i + 1] = c->pe[i] + c->orb[i].m * x;
        c->pl[i + 1] = log_add(c->pl[i], log(c->orb[i].m) - x);
    }
    return CP_OK;
}

static void filling_poison(cp_thermo_filling_result *out)
{
    cp_poison(&out->chemical_potential, (int)(sizeof *out / sizeof(double)));
}

static cp_status solve_mu(filling_ctx *c, double number, double *x, cp_error *err)
{
    const char *ctx = "thermo.lattice_filling";
    /* n <= sum_k m_k zeta_k / (1 - zeta_k) ~ sum m_k zeta_k in the dilute limit: start where
     * the classical number is below N and step down until the number is. */
    double z1 = 0.0;
    for (size_t k = 0; k < c->count; k++)
        z1 += c->orb[k].m * exp(-(c->orb[k].e - c->orb[0].e) / c->kt);
    double lo = log(number / (c->amp * z1)) - 2.0;
    for (int it = 0; !(lda_number(lo, c) < number); it++) {
        if (it > 60)
            return cp_fail(err, CP_ENOCONV, "%s: cannot bracket the chemical potential", ctx);
        lo -= 4.0;
    }
    /* bosons: excited orbitals are ideal, so mu stays below the first of them */
    double cap = c->stat == CP_BOSON && c->count > 1
                     ? (c->orb[1].e - c->orb[0].e) / c->kt * (1.0 - 1e-12)
                     : INFINITY;
    double hi = fmin(fmax(lo + 1.0, 1.0), cap), step = 1.0;
    for (int it = 0; !(lda_number(hi, c) > number); it++) {
        if (it > 200 || hi >= cap)
            return cp_fail(err, CP_ENOCONV,
                           "%s: %.6g particles do not fit on the sites below the first "
                           "excited orbital (%.3g k_B T above the lowest); the atomic-limit "
                           "model with ideal excited orbitals does not hold them",
                           ctx, number, cap);
        lo = hi;
        hi = fmin(hi + step, cap);
        step *= 2.0;
    }
    return cp_thermo_brent(lda_number, c, number, lo, hi, x, ctx, err);
}

cp_status cp_thermo_lattice_filling(const cp_thermo_lattice *lat, const cp_thermo_trap *trap,
                                    cp_statistics stat, double temperature, double onsite_u,
                                    cp_thermo_filling_result *out, cp_error *err)
{
    return cp_thermo_lattice_filling_bounded(lat, trap, stat, temperature, onsite_u, NULL,
                                             INFINITY, out, err);
}

/* The refusal once the site sums have outgrown their bound. */
static cp_status too_long(const filling_ctx *c, double max_seconds, cp_error *err)
{
    char what[160], reduce[160];
    if (c->stat == CP_BOSON) {
        snprintf(what, sizeof what, "over %.3g terms of the site sums: bosons with onsite_u "
                 "%.3g J = %.3g k_B T", c->terms, c->onsite_u, c->onsite_u / c->kt);
        snprintf(reduce, sizeof reduce, "a larger onsite_u or a higher temperature (the "
                 "occupation sums grow as k_B T / onsite_u)");
    } else {
        snprintf(what, sizeof what, "over %.3g terms of the site sums over %zu orbitals",
                 c->terms, c->count);
        snprintf(reduce, sizeof reduce, "fewer bands");
    }
    double work = fmax(c->terms * COST_TERM, cpu_used(c));
    return cp_check_work(err, "thermo.lattice_filling", work, max_seconds, what, reduce);
}

cp_status cp_thermo_lattice_filling_bounded(const cp_thermo_lattice *lat,
                                            const cp_thermo_trap *trap, cp_statistics stat,
                                            double temperature, double onsite_u,
                                            const cp_cancel_flag *cancel, double max_seconds,
                                            cp_thermo_filling_result *out, cp_error *err)
{
    const char *ctx = "thermo.lattice_filling";
    if (!out)
        return cp_fail(err, CP_EINVAL, "%s: result is NULL", ctx);
    filling_poison(out);
    if (!lat || !trap)
        return cp_fail(err, CP_EINVAL, "%s: lattice or trap is NULL", ctx);
    CP_TRY(cp_check_range(err, ctx, "number", trap->number, "", 1.0, 1e12, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "mass", trap->mass, "kg", 1e-30, 1e-21, CP_LO_OPEN));
    CP_TRY(cp_thermo_check_statistics(stat, ctx, err));
    CP_TRY(cp_thermo_check_temperature(temperature, ctx, err));
    if (stat == CP_BOSON && !(onsite_u > 0.0))
        return cp_fail(err, CP_EINVAL,
                       "%s: onsite_u %g J is not positive; allowed (0, inf] J (ideal bosons "
                       "in the atomic limit condense into the central site)",
                       ctx, onsite_u);
    static const char *const envs[3] = {"omega_envelope_x", "omega_envelope_y",
                                        "omega_envelope_z"};
    for (int a = 0; a < 3; a++) {
        CP_TRY(cp_check_int_range(err, ctx, "bands", lat->axis[a].bands, 1,
                                  CP_THERMO_LATTICE_MAX_BANDS));
        CP_TRY(cp_check_int_range(err, ctx, "quasimomentum points", lat->axis[a].points, 4,
                                  256));
        if (!lat->axis[a].energy_er)
            return cp_fail(err, CP_EINVAL, "%s: band table of axis %d has no energies", ctx, a);
        for (int k = 0; k < lat->axis[a].bands * lat->axis[a].points; k++)
            if (!isfinite(lat->axis[a].energy_er[k]))
                return cp_fail(err, CP_EINVAL, "%s: band energy (axis %d, entry %d) is not "
                               "finite", ctx, a, k);
        CP_TRY(cp_check_range(err, ctx, envs[a], lat->omega_envelope[a], "rad/s",
                              CP_MIN_TRAP_OMEGA, 1e7, CP_CLOSED));
    }
    CP_TRY(cp_check_range(err, ctx, "recoil_energy", lat->recoil_energy, "J", 0.0, 1e-25,
                          CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "spacing", lat->spacing, "m", 0.0, 1e-4, CP_LO_OPEN));
    CP_TRY(cp_check_work_limit(err, ctx, max_seconds));
    double wbar = cbrt(lat->omega_envelope[0] * lat->omega_envelope[1] * lat->omega_envelope[2]);
    double kt = CP_KB * temperature, d = lat->spacing;
    filling_ctx c = {NULL, NULL, NULL, NULL, NULL, NULL, 0, stat, kt,
                     pow(2.0 * CP_PI * kt / (trap->mass * wbar * wbar), 1.5) / (d * d * d),
                     stat == CP_FERMION ? INFINITY : onsite_u, 0.0,
                     isinf(max_seconds) ? INFINITY : max_seconds / COST_TERM,
                     thread_cpu_seconds(), max_seconds, isinf(max_seconds) ? INFINITY : 0.0,
                     0, cancel};
    double x = NAN, sums[3];
    cp_status st = make_orbitals(lat, &c, err);
    if (st == CP_OK)
        st = solve_mu(&c, trap->number, &x, err);
    if (st == CP_OK)
        lda_sums(&c, x, sums);
    if (cancel && *cancel) {
        filling_poison(out);
        st = cp_fail(err, CP_ECANCELED, "thermo.lattice_filling: interrupted");
    } else if (c.terms > c.max_terms || cpu_used(&c) > max_seconds) {
        filling_poison(out);
        st = too_long(&c, max_seconds, err);
    }
    if (st == CP_OK) {
        double mu = c.orb[0].e + x * kt;
        site_stats s = site_at(&c, mu);
        out->chemical_potential = mu;
        out->center_empty = s.p0;
        out->center_single = s.p1;
        out->center_multiple = fmax(0.0, 1.0 - s.p0 - s.p1);
        out->center_filling = s.nbar;
        out->sites_occupied = sums[0];
        out->sites_single = sums[1];
        out->sites_multiple = fmax(0.0, sums[0] - sums[1]);
        /* <= 1 by definition; the number solve's tolerance can leave it ~1e-15 above */
        out->single_fraction = fmin(1.0, sums[1] / trap->number);
        if (!(isfinite(s.p0) && isfinite(sums[0]))) {
            filling_poison(out);
            st = cp_fail(err, CP_ENUMERIC, "%s: site statistics not finite at T = %g K", ctx,
                         temperature);
        }
    }
    free(c.orb);
    free(c.s1);
    free(c.pm);
    return st;
}

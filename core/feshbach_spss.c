/*
 * The phase-space ceiling P_max of magnetoassociation: stochastic phase-space sampling
 * (SPSS, Hodby et al., PRL 94, 120402 (2005) [M]).  The model pairs an atom of the minority
 * cloud b with a partner of cloud a when the pair's relative coordinates (r_a - r_b,
 * p_rel = (m_b p_a - m_a p_b)/M) fall inside one phase-space cell of volume gamma h^3; each
 * atom is used at most once; P_max is the paired fraction of b.
 *
 * Sampling every atom of a real cloud (1e5 atoms in six dimensions) is too slow inside a
 * sweep, and sampling fewer atoms changes the number of partners per cell.  Since the cell
 * (one quantum state) is tiny against the cloud, the pairing is local: a b atom at
 * (r, p_b) sees on average x = gamma (M/m_b)^3 f_a(r, m_a p_b/m_b) partners and
 * y = gamma (M/m_a)^3 f_b(r, p_b) competing b atoms in its cell, f being the LDA phase-space
 * occupations of the thermal parts (Boltzmann, Fermi–Dirac, Bose–Einstein).  Here the
 * b atoms are drawn by Monte Carlo from their own distribution (GSL Mersenne twister,
 * deterministic for a given seed) and each contributes the local pairing fraction g(x, y) of
 * random-order greedy pairing in a homogeneous gas, in the mean-field kinetic closure
 * (ours, no source): while a fraction s of the b atoms has been served, the free partners per
 * cell a(s) obey da/ds = -y (1 - e^-a), a(0) = x, so a(1) = ln(1 + (e^x - 1) e^-y) and
 * g = (x - a(1)) / y.  Limits: 1 - e^-x without competition, x/y when partners are scarce.
 * A direct simulation of the pairing rule in a six-dimensional box agrees within ~0.01
 * (tests/unit/test_feshbach.c, FB-11).
 *
 * The model is not meant for condensed partners: a condensate is one macroscopically occupied
 * quantum state, not a gas filling phase-space cells, so counting its atoms per cell of size
 * gamma h^3 has no meaning (every condensed atom would sit in the same few cells whatever the
 * clouds' positions, and two condensates sagged apart would still "pair").  Below T_c each
 * Bose cloud is therefore split (feshbach_cloud.c): its thermal part enters the cell counts
 * above, and its Thomas–Fermi condensate is treated instead by the stoichiometric bound of
 * adiabatic conversion (ours, no source): a condensed minority atom at r, whose momentum
 * spread hbar/R is far below the thermal one, pairs with the partner's condensate with
 * probability min(1, n_a,c(r) / n_b,c(r)), the local ratio of the two condensate densities
 * (every minority atom pairs where partners are in excess, the partners run out where they
 * are not, and nothing pairs where the condensates do not overlap).  Left out: condensed
 * minority atoms pairing with the partner's thermal atoms (their few low-momentum partners
 * are shared among the whole condensate) and thermal minority atoms pairing with the
 * partner's condensate (it matches only the minority atoms of momentum below ~hbar/R); both
 * make the ceiling a lower estimate.
 */
#include <gsl/gsl_randist.h>
#include <gsl/gsl_rng.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "feshbach_int.h"

enum { GRID = 8192 };

double cp_spss_local_pairing(double x, double y)
{
    if (!(x > 0.0))
        return 0.0;
    if (!(y > 1e-8))
        return -expm1(-x); /* no competition; error O(y) */
    /* a(1) = ln(1 + e^(x-y) - e^-y), written without overflow for large x */
    double d = x - y, a1;
    if (d > 0.0)
        a1 = d + log(exp(-d) + 1.0 - exp(-x));
    else
        a1 = log1p(exp(d) - exp(-y));
    return fmin(1.0, fmax(0.0, (x - a1) / y));
}

/* Thermal-part occupation of a cloud at scaled energy e. */
static double thermal_occupation(const cp_cloud_state *s, double e)
{
    switch (s->profile) {
    case CP_PROFILE_THERMAL: return exp(s->eta - e);
    case CP_PROFILE_FERMI: return 1.0 / (exp(e - s->eta) + 1.0);
    default: return e - s->eta > 0.0 ? 1.0 / expm1(e - s->eta) : 0.0;
    }
}

/* Cumulative distribution of E = (|rt|^2 + |pt|^2)/2 for the thermal part: density
 * E^2 f(E) (the six-dimensional volume element), trapezoid rule on a uniform grid. */
static void build_cdf(const cp_cloud_state *s, double emax, double *cdf)
{
    double h = emax / (GRID - 1), prev = 0.0;
    cdf[0] = 0.0;
    for (int i = 1; i < GRID; i++) {
        double e = i * h, w = e * e * thermal_occupation(s, e);
        cdf[i] = cdf[i - 1] + 0.5 * h * (prev + w);
        prev = w;
    }
}

static double sample_energy(const double *cdf, double emax, double u)
{
    double target = u * cdf[GRID - 1];
    int lo = 0, hi = GRID - 1;
    while (hi - lo > 1) {
        int mid = (lo + hi) / 2;
        if (cdf[mid] < target)
            lo = mid;
        else
            hi = mid;
    }
    double span = cdf[hi] - cdf[lo], t = span > 0.0 ? (target - cdf[lo]) / span : 0.0;
    return (lo + t) * emax / (GRID - 1);
}

/* Condensate density of a prepared cloud at r (m, from its centre), m^-3; 0 outside it. */
static double condensate_density(const cp_cloud_state *s, const double r[3])
{
    if (!(s->n_condensed > 0.0))
        return 0.0;
    double u = 0.0;
    for (int i = 0; i < 3; i++)
        u += r[i] * r[i] / (s->radius[i] * s->radius[i]);
    return u < 1.0 ? s->peak_tf * (1.0 - u) : 0.0;
}

/* One condensed minority atom drawn from b's Thomas–Fermi profile n_c(0) (1 - rho^2) in the
 * unit ball scaled by the radii (uniform in the ball, accepted with probability 1 - rho^2):
 * its pairing fraction min(1, n_a,c / n_b,c) with a's condensate, a's centre being `shift`
 * below b's along z. */
static double condensed_pairing(const cp_cloud_state *sa, const cp_cloud_state *sb,
                                double shift, gsl_rng *rng)
{
    double v[3], rho2;
    do {
        double norm = 0.0;
        for (int i = 0; i < 3; i++) {
            v[i] = gsl_ran_gaussian_ziggurat(rng, 1.0);
            norm += v[i] * v[i];
        }
        double rho = cbrt(gsl_rng_uniform(rng)), scale = rho / sqrt(norm);
        for (int i = 0; i < 3; i++)
            v[i] *= scale;
        rho2 = rho * rho;
    } while (gsl_rng_uniform(rng) >= 1.0 - rho2);
    double rb[3], ra[3];
    for (int i = 0; i < 3; i++) {
        rb[i] = v[i] * sb->radius[i];
        ra[i] = rb[i] + (i == 2 ? shift : 0.0);
    }
    double nb = condensate_density(sb, rb), na = condensate_density(sa, ra);
    return nb > 0.0 ? fmin(1.0, na / nb) : 0.0;
}

cp_status cp_feshbach_max_efficiency(const cp_feshbach_cloud *a, const cp_feshbach_cloud *b,
                                     double temperature, const cp_feshbach_spss *opts,
                                     double *p_max, double *std_error, cp_error *err)
{
    return cp_feshbach_max_efficiency_cancellable(a, b, temperature, opts, p_max, std_error,
                                                  NULL, err);
}

cp_status cp_feshbach_max_efficiency_cancellable(const cp_feshbach_cloud *a,
                                                 const cp_feshbach_cloud *b, double temperature,
                                                 const cp_feshbach_spss *opts, double *p_max,
                                                 double *std_error, const cp_cancel_flag *cancel,
                                                 cp_error *err)
{
    return cp_feshbach_max_efficiency_bounded(a, b, temperature, opts, p_max, std_error, cancel,
                                              INFINITY, err);
}

/* CPU seconds per sample (thermal or condensed pairing, measured 1.9e-7 to 2.2e-7 s) */
#define COST_SAMPLE 2.3e-7

cp_status cp_feshbach_max_efficiency_bounded(const cp_feshbach_cloud *a, const cp_feshbach_cloud *b,
                                             double temperature, const cp_feshbach_spss *opts,
                                             double *p_max, double *std_error,
                                             const cp_cancel_flag *cancel, double max_seconds,
                                             cp_error *err)
{
    static const char ctx[] = "feshbach.max_efficiency";
    const unsigned allowed = (1u << CP_PROFILE_THERMAL) | (1u << CP_PROFILE_FERMI) |
                             (1u << CP_PROFILE_BOSE);
    cp_cloud_state sa, sb;
    *p_max = *std_error = NAN;
    if (!opts)
        return cp_fail(err, CP_EINVAL, "%s: options are NULL", ctx);
    CP_TRY(cp_check_range(err, ctx, "gamma", opts->gamma, "", 0.0, 100.0, CP_LO_OPEN));
    CP_TRY(cp_check_int_range(err, ctx, "samples", opts->samples, 100, 10000000));
    CP_TRY(cp_check_work_limit(err, ctx, max_seconds));
    char what[64], reduce[64];
    snprintf(what, sizeof what, "%ld samples", opts->samples);
    snprintf(reduce, sizeof reduce, "ask for at most %.0f samples",
             floor(fmin(max_seconds / COST_SAMPLE, 1e7)));
    CP_TRY(cp_check_work(err, ctx, COST_SAMPLE * (double)opts->samples, max_seconds, what,
                         reduce));
    CP_TRY(cp_cloud_prepare(a, temperature, ctx, "a", allowed, &sa, err));
    CP_TRY(cp_cloud_prepare(b, temperature, ctx, "b", allowed, &sb, err));
    cp_init();

    double *cdf = malloc(GRID * sizeof *cdf);
    gsl_rng *rng = gsl_rng_alloc(gsl_rng_mt19937);
    if (!cdf || !rng) {
        free(cdf);
        gsl_rng_free(rng);
        return cp_fail(err, CP_ENOMEM, "%s: out of memory", ctx);
    }
    gsl_rng_set(rng, opts->seed);
    double emax = fmax(sb.eta, 0.0) + 60.0;
    build_cdf(&sb, emax, cdf);

    double ma = sa.mass, mb = sb.mass, total = ma + mb;
    double cx = opts->gamma * pow(total / mb, 3.0), cy = opts->gamma * pow(total / ma, 3.0);
    double pscale = sqrt(ma / mb), shift = opts->include_sag ? sb.sag - sa.sag : 0.0;
    double frac_condensed = sb.n_condensed / sb.number;
    double sum = 0.0, sum2 = 0.0;
    for (long k = 0; k < opts->samples; k++) {
        if ((k & 0xFFFF) == 0 && cancel && *cancel) {
            free(cdf);
            gsl_rng_free(rng);
            return cp_fail(err, CP_ECANCELED, "%s: interrupted after %ld of %ld samples", ctx, k,
                           opts->samples);
        }
        double g;
        if (frac_condensed > 0.0 && gsl_rng_uniform(rng) < frac_condensed) {
            g = condensed_pairing(&sa, &sb, shift, rng);
        } else {
            /* a thermal minority atom: E from its distribution, direction uniform in 6D */
            double u[6], norm = 0.0, rt[3], pt[3], rta[3], pta[3];
            for (int i = 0; i < 6; i++) {
                u[i] = gsl_ran_gaussian_ziggurat(rng, 1.0);
                norm += u[i] * u[i];
            }
            double radius = sqrt(2.0 * sample_energy(cdf, emax, gsl_rng_uniform(rng)) / norm);
            for (int i = 0; i < 3; i++) {
                rt[i] = u[i] * radius;
                pt[i] = u[i + 3] * radius;
                rta[i] = (rt[i] * sb.ell[i] + (i == 2 ? shift : 0.0)) / sa.ell[i];
                pta[i] = pt[i] * pscale;
            }
            g = cp_spss_local_pairing(cx * cp_cloud_occupation(&sa, rta, pta),
                                      cy * cp_cloud_occupation(&sb, rt, pt));
        }
        sum += g;
        sum2 += g * g;
    }
    free(cdf);
    gsl_rng_free(rng);
    double n = (double)opts->samples, mean = sum / n;
    *p_max = mean;
    *std_error = sqrt(fmax(sum2 / n - mean * mean, 0.0) / (n - 1.0));
    return CP_OK;
}

/*
 * The Bose polylogarithm Li_s(z) = sum_{k>=1} z^k / k^s for 0 <= z <= 1 and real order
 * s > 1, which GSL does not provide (its Fermi-Dirac integrals cover the Fermi side,
 * Li_s(-e^x) = -F_{s-1}(x)).  Below z = 1/2 the defining series converges at least as
 * fast as 2^-k; above it the series in mu = ln z (|mu| <= ln 2 < 2 pi),
 *   Li_s(e^mu) = Gamma(1-s) (-mu)^(s-1) + sum_k zeta(s-k) mu^k / k!          (s not integer)
 *   Li_n(e^mu) = mu^(n-1)/(n-1)! [H_(n-1) - ln(-mu)] + sum_{k != n-1} zeta(n-k) mu^k / k!
 * (J. E. Robinson, Phys. Rev. 83, 678 (1951); NIST DLMF 25.12.12 [M eq. number]) takes
 * over, with the zeta values from gsl_sf_zeta precomputed once per order in a plan.
 */
#include "thermo_int.h"

#include <math.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_sf_gamma.h>
#include <gsl/gsl_sf_zeta.h>

#include "check_int.h"

cp_status cp_polylog_plan_init(cp_polylog_plan *plan, double s, cp_error *err)
{
    cp_init();
    CP_TRY(cp_check_range(err, "thermo.polylog", "order s", s, "", 1.5, 8.0, CP_CLOSED));
    plan->s = s;
    plan->integer_order = (s == floor(s));
    plan->gamma_1ms = NAN;
    plan->harmonic = NAN;
    double factorial = 1.0;
    for (int k = 0; k < CP_POLYLOG_TERMS; k++) {
        if (k > 0)
            factorial *= k;
        gsl_sf_result r;
        int status;
        if (plan->integer_order) {
            int n = (int)s;
            if (k == n - 1) {
                plan->coef[k] = 0.0;
                continue;
            }
            status = gsl_sf_zeta_int_e(n - k, &r);
        } else {
            status = gsl_sf_zeta_e(s - k, &r);
        }
        if (status != GSL_SUCCESS)
            return cp_fail(err, CP_ENUMERIC, "thermo.polylog: zeta(%g) failed: %s", s - k,
                           gsl_strerror(status));
        plan->coef[k] = r.val / factorial;
    }
    if (plan->integer_order) {
        double h = 0.0;
        for (int j = 1; j < (int)s; j++)
            h += 1.0 / j;
        plan->harmonic = h;
    } else {
        gsl_sf_result g;
        int status = gsl_sf_gamma_e(1.0 - s, &g);
        if (status != GSL_SUCCESS)
            return cp_fail(err, CP_ENUMERIC, "thermo.polylog: Gamma(%g) failed: %s", 1.0 - s,
                           gsl_strerror(status));
        plan->gamma_1ms = g.val;
    }
    return CP_OK;
}

/* The defining series; z <= 1/2 so the terms fall at least like 2^-k. */
static double polylog_series(double s, double z)
{
    double sum = 0.0, zk = z;
    for (int k = 1; k < 200; k++) {
        double term = zk * exp(-s * log((double)k));
        sum += term;
        if (term < 1e-17 * sum)
            break;
        zk *= z;
    }
    return sum;
}

double cp_polylog_bose(const cp_polylog_plan *plan, double z)
{
    if (!(z >= 0.0 && z <= 1.0))
        return NAN;
    if (z <= 0.5)
        return polylog_series(plan->s, z);
    double mu = log(z);
    if (mu == 0.0)
        return plan->coef[0]; /* zeta(s), s > 1 */
    /* Horner over the regular part, skipping the slot of the singular term. */
    double sum = 0.0;
    for (int k = CP_POLYLOG_TERMS - 1; k >= 0; k--)
        sum = sum * mu + plan->coef[k];
    if (plan->integer_order) {
        int n = (int)plan->s;
        double p = 1.0, fact = 1.0;
        for (int j = 1; j <= n - 1; j++) {
            p *= mu;
            fact *= j;
        }
        sum += p / fact * (plan->harmonic - log(-mu));
    } else {
        sum += plan->gamma_1ms * pow(-mu, plan->s - 1.0);
    }
    return sum;
}

cp_status cp_polylog(double s, double z, double *value, cp_error *err)
{
    *value = NAN;
    CP_TRY(cp_check_range(err, "thermo.polylog", "argument z", z, "", 0.0, 1.0, CP_CLOSED));
    cp_polylog_plan plan;
    CP_TRY(cp_polylog_plan_init(&plan, s, err));
    *value = cp_polylog_bose(&plan, z);
    return CP_OK;
}

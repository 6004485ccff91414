/*
 * The clock of an evaporation: the time to each point of a trajectory N(T) of the scaling
 * model (cp_collisions_evaporation).  Particles leave by evaporation and by two-body loss,
 *   -dN/dt = N <n> (f sigma v_rel + beta(T)),
 * with f = Gamma_ev / Gamma_el and <n> in the convention of cp_collisions_evaporation_rate
 * (Luiten, Reynolds & Walraven, PRA 53, 381 (1996)), v_rel = sqrt(16 k_B T / (pi m)) the mean
 * relative speed of a thermal gas, and beta constant (s-wave loss) or proportional to T
 * (p-wave loss, the Wigner threshold law).  Hence dt = -d ln N / (<n> (f sigma v_rel + beta)),
 * integrated by the trapezoid rule in ln N over the trajectory's points.
 */
#include "coldprep/collisions.h"

#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"

cp_status cp_collisions_evaporation_times(const cp_evaporation_params *p, double cross_section,
                                          double loss_rate, size_t points,
                                          const double *numbers, const double *temperatures,
                                          double *times, cp_error *err)
{
    static const char ctx[] = "collisions.evaporation_times";
    if (!p || !numbers || !temperatures || !times)
        return cp_fail(err, CP_EINVAL, "%s: a pointer argument is NULL", ctx);
    if (points < 2 || points > 100000)
        return cp_fail(err, CP_EINVAL, "%s: points %zu is out of range; allowed [2, 100000]",
                       ctx, points);
    for (size_t i = 0; i < points; i++)
        times[i] = NAN;
    CP_TRY(cp_check_range(err, ctx, "cross_section", cross_section, "m^2", 0.0, 1e-8,
                          CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "loss_rate", loss_rate, "m^3/s", 0.0, 1e-8, CP_CLOSED));
    if (!(cross_section > 0.0 || loss_rate > 0.0))
        return cp_fail(err, CP_EINVAL, "%s: cross_section and loss_rate are both 0: nothing "
                       "sets the clock", ctx);
    double f, truncated;
    CP_TRY(cp_collisions_evaporation_rate(p->eta, &f, &truncated, err));
    double wbar = cbrt(p->omega[0] * p->omega[1] * p->omega[2]);
    double rate[2] = {0.0, 0.0}; /* the loss rate per particle at the previous and this point */
    times[0] = 0.0;
    for (size_t i = 0; i < points; i++) {
        double n = numbers[i], t = temperatures[i];
        /* the trajectory's own points: any positive, finite N and T (an evaporation run far
         * past its end point cools below the input range) */
        if (!(n > 0.0 && isfinite(n) && t > 0.0 && isfinite(t)))
            return cp_fail(err, CP_EINVAL, "%s: trajectory point %zu (N = %g, T = %g K) is "
                           "out of range", ctx, i, n, t);
        double mean_density =
            n * pow(p->mass * wbar * wbar / (4.0 * CP_PI * CP_KB * t), 1.5) / truncated;
        double beta = p->wave == CP_LOSS_P_WAVE ? loss_rate * t / p->temperature : loss_rate;
        double v_rel = sqrt(16.0 * CP_KB * t / (CP_PI * p->mass));
        rate[1] = mean_density * (f * cross_section * v_rel + beta);
        if (i > 0) {
            double dlog = log(numbers[i - 1] / n);
            times[i] = times[i - 1] + 0.5 * (1.0 / rate[0] + 1.0 / rate[1]) * dlog;
        }
        rate[0] = rate[1];
    }
    if (!isfinite(times[points - 1]))
        return cp_fail(err, CP_ENUMERIC, "%s: the time is not finite (rates vanish)", ctx);
    return CP_OK;
}

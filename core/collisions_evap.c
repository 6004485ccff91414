/*
 * Evaporative cooling at constant truncation parameter eta in a fixed harmonic trap with
 * two-body loss: the scaling-law model of W. Ketterle & N. J. van Druten, Adv. At. Mol.
 * Opt. Phys. 37, 181 (1996) [M eq. numbers], extended by the two-body loss channel.  Per
 * unit time an evaporated particle takes (eta + kappa) k_B T, a lost one epsilon k_B T
 * (9/4 s-wave, 11/4 p-wave: it leaves from the dense centre), and E = 3 N k_B T, so
 *   d ln T / d ln N = [(eta + kappa - 3) r - (3 - epsilon)] / (3 (r + 1)),
 * r = Gamma_ev / Gamma_loss = f R.  The evaporation rate is the one of a truncated
 * Boltzmann distribution (A. J. Luiten, M. W. Reynolds & J. T. M. Walraven, PRA 53, 381
 * (1996)): f = Gamma_ev / Gamma_el = 2 e^{-eta} [eta - 4 P(4, eta)/P(3, eta)], Gamma_el =
 * <n> sigma v_rel with <n> = n0 / 2^{3/2} and n0 = N / V_e the central density of the
 * truncated cloud; the loss rate beta <n> uses the same <n>, so R = sigma v_rel / beta.
 * R scales as T^{1/2} (s-wave loss, constant sigma) or T^{-1/2} (p-wave loss).  One ODE in
 * ln T against ln N, integrated with GSL's rk8pd.
 */
#include "coldprep/collisions.h"

#include <math.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>
#include <gsl/gsl_sf_gamma.h>

#include "check_int.h"
#include "collisions_int.h"
#include "coldprep/consts.h"

typedef struct evap_ctx {
    const cp_evaporation_params *p;
    double kappa, fraction, epsilon, exponent;
} evap_ctx;

cp_status cp_collisions_evaporation_rate(double eta, double *ratio, double *truncated_fraction,
                                         cp_error *err)
{
    if (!ratio || !truncated_fraction)
        return cp_fail(err, CP_EINVAL, "collisions.evaporation_rate: ratio and "
                       "truncated_fraction must not be NULL");
    *ratio = *truncated_fraction = NAN;
    CP_TRY(cp_check_range(err, "collisions.evaporation_rate", "eta", eta, "", 5.0, 30.0,
                          CP_CLOSED));
    cp_init();
    gsl_sf_result p3, p4;
    int s3 = gsl_sf_gamma_inc_P_e(3.0, eta, &p3), s4 = gsl_sf_gamma_inc_P_e(4.0, eta, &p4);
    if (s3 != GSL_SUCCESS || s4 != GSL_SUCCESS)
        return cp_fail(err, CP_ENUMERIC, "collisions.evaporation_rate: the incomplete gamma "
                       "function failed at eta = %g", eta);
    /* Luiten et al. 1996: Gamma_ev = n0 sigma vbar e^{-eta} V_ev/V_e, V_ev/V_e = eta -
     * 4 P(4,eta)/P(3,eta) for a 3D harmonic trap; Gamma_el = n0 sigma vbar / 2. */
    *ratio = 2.0 * exp(-eta) * (eta - 4.0 * p4.val / p3.val);
    *truncated_fraction = p3.val;
    return CP_OK;
}

/* y[0] = ln(T/T0) as a function of u = ln(N/N0) (decreasing from 0). */
static int evap_rhs(double u, const double y[], double dydt[], void *params)
{
    (void)u;
    const evap_ctx *c = params;
    double r = c->fraction * c->p->ratio * exp(c->exponent * y[0]);
    dydt[0] = ((c->p->eta + c->kappa - 3.0) * r - (3.0 - c->epsilon)) / (3.0 * (r + 1.0));
    return GSL_SUCCESS;
}

static cp_status check_evap(const cp_evaporation_params *p, size_t points, cp_error *err)
{
    const char *ctx = "collisions.evaporation";
    CP_TRY(cp_collisions_check_cloud(ctx, p->number, p->temperature, p->omega, p->mass, err));
    CP_TRY(cp_check_range(err, ctx, "eta", p->eta, "", 5.0, 30.0, CP_CLOSED));
    if (!isnan(p->kappa))
        CP_TRY(cp_check_range(err, ctx, "kappa", p->kappa, "", 0.0, 2.0, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "ratio", p->ratio, "", 0.0, 1e12, CP_LO_OPEN));
    CP_TRY(cp_collisions_check_wave(ctx, p->wave, err));
    CP_TRY(cp_check_range(err, ctx, "final_number", p->final_number, "", 1.0, p->number,
                          CP_HI_OPEN));
    if (points < 2 || points > 100000)
        return cp_fail(err, CP_EINVAL, "%s: points %zu is out of range; allowed [2, 100000]",
                       ctx, points);
    return CP_OK;
}

/* The trajectory's points 0 .. *filled - 1, ending after the first point at or below
 * stop_temperature (from point 1 on; 0: none); the others NaN. */
static cp_status trajectory(const cp_evaporation_params *p, size_t points,
                            double stop_temperature, double *numbers, double *temperatures,
                            double *phase_space_densities, size_t *filled, cp_error *err)
{
    for (size_t i = 0; i < points; i++)
        numbers[i] = temperatures[i] = phase_space_densities[i] = NAN;
    *filled = 0;
    if (!p)
        return cp_fail(err, CP_EINVAL, "collisions.evaporation: parameters are NULL");
    CP_TRY(check_evap(p, points, err));
    double fraction, truncated;
    CP_TRY(cp_collisions_evaporation_rate(p->eta, &fraction, &truncated, err));
    evap_ctx c = {p, isnan(p->kappa) ? (p->eta - 5.0) / (p->eta - 4.0) : p->kappa, fraction,
                  p->wave == CP_LOSS_P_WAVE ? 11.0 / 4.0 : 9.0 / 4.0,
                  p->wave == CP_LOSS_P_WAVE ? -0.5 : 0.5};
    gsl_odeiv2_system sys = {evap_rhs, NULL, 1, &c};
    double u_end = log(p->final_number / p->number); /* < 0 */
    gsl_odeiv2_driver *d =
        gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd, u_end * 1e-3, 1e-12, 1e-10);
    if (!d)
        return cp_fail(err, CP_ENOMEM, "collisions.evaporation: cannot allocate the ODE "
                       "driver");
    double wbar = cbrt(p->omega[0] * p->omega[1] * p->omega[2]);
    double y[1] = {0.0}, u = 0.0;
    cp_status result = CP_OK;
    size_t i;
    for (i = 0; i < points; i++) {
        double ui = u_end * (double)i / (double)(points - 1);
        if (i > 0) {
            int status = gsl_odeiv2_driver_apply(d, &u, ui, y);
            if (status != GSL_SUCCESS) {
                result = cp_fail(err, CP_ENUMERIC, "collisions.evaporation: the ODE solver "
                                 "failed at ln(N/N0) = %g: %s", u, gsl_strerror(status));
                break;
            }
        }
        double n = p->number * exp(ui), temp = p->temperature * exp(y[0]);
        double q = CP_HBAR * wbar / (CP_KB * temp);
        if (!(temp > 0.0 && isfinite(n * q * q * q))) {
            /* runaway cooling (p-wave loss, large ratio): far outside the classical model */
            result = cp_fail(err, CP_ENUMERIC, "collisions.evaporation: the phase-space "
                             "density overflows (T = %g K at N = %g); the classical scaling "
                             "model holds only for phase-space densities below ~1", temp, n);
            break;
        }
        numbers[i] = n;
        temperatures[i] = temp;
        phase_space_densities[i] = n * q * q * q;
        if (i > 0 && temp <= stop_temperature) {
            i++;
            break;
        }
    }
    gsl_odeiv2_driver_free(d);
    if (result != CP_OK) {
        for (size_t k = 0; k < points; k++)
            numbers[k] = temperatures[k] = phase_space_densities[k] = NAN;
        return result;
    }
    *filled = i;
    return CP_OK;
}

cp_status cp_collisions_evaporation(const cp_evaporation_params *p, size_t points,
                                    double *numbers, double *temperatures,
                                    double *phase_space_densities, double *efficiency,
                                    cp_error *err)
{
    if (!efficiency || !numbers || !temperatures || !phase_space_densities)
        return cp_fail(err, CP_EINVAL, "collisions.evaporation: numbers, temperatures, "
                       "phase_space_densities and efficiency must not be NULL");
    *efficiency = NAN;
    size_t filled;
    CP_TRY(trajectory(p, points, 0.0, numbers, temperatures, phase_space_densities, &filled,
                      err));
    *efficiency = -log(phase_space_densities[points - 1] / phase_space_densities[0]) /
                  log(p->final_number / p->number);
    return CP_OK;
}

cp_status cp_collisions_evaporation_until(const cp_evaporation_params *p, size_t points,
                                          double stop_temperature, double *numbers,
                                          double *temperatures, double *phase_space_densities,
                                          size_t *filled, cp_error *err)
{
    if (!filled || !numbers || !temperatures || !phase_space_densities)
        return cp_fail(err, CP_EINVAL, "collisions.evaporation: numbers, temperatures, "
                       "phase_space_densities and filled must not be NULL");
    *filled = 0;
    if (!(stop_temperature >= 0.0 && stop_temperature < INFINITY))
        return cp_fail(err, CP_EINVAL, "collisions.evaporation: stop_temperature %g K is not "
                       "a temperature; allowed [0, inf) K", stop_temperature);
    return trajectory(p, points, stop_temperature, numbers, temperatures,
                      phase_space_densities, filled, err);
}

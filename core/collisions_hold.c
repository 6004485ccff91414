/*
 * Number and temperature of a thermal cloud held in a harmonic trap with two-body loss,
 * one-body loss and technical heating.  The trap-averaged density of a Gaussian cloud is
 * <n> = (1/N) int n^2 d^3r = N (m omega_bar^2 / (4 pi k_B T))^{3/2}; the loss removes
 * particles where the density is highest, i.e. with less than the mean energy, and so
 * heats the remainder (anti-evaporation): dT/dt = h beta <n> T with h = 1/4 for a
 * T-independent beta and h = 1/12 for the p-wave beta proportional to the pair's relative
 * energy; both are the project's own derivation (docs/models/collisions.md: the energy a
 * particle lost at a rate proportional to n^2 carries out of a thermal harmonic cloud).  The two
 * coupled equations are integrated with GSL's Runge-Kutta-Prince-Dormand (8,9) stepper.
 *
 * The stepper follows the fastest rate, so a short one-body lifetime over a long hold would
 * cost duration/lifetime steps.  Once the two-body rate beta <n> is below TAIL_RATIO times
 * the one-body rate 1/lifetime it only falls further (N decays, T does not drop), and the
 * rest of the hold is the closed form N = N1 e^{-(t - t1)/lifetime}, T = T1 + heating_rate
 * (t - t1): the two-body loss it leaves out removes at most a fraction
 * int beta <n> dt <= (beta <n>)(t1) lifetime <= TAIL_RATIO of the cloud (and heats it by
 * less than that fraction of T), below the integration's relative tolerance.  So the cost
 * is bounded whatever the lifetime and duration.
 */
#include "coldprep/collisions.h"

#include <math.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>

#include "check_int.h"
#include "collisions_int.h"
#include "coldprep/consts.h"

#define REL_TOL 1e-10     /* the integration's relative tolerance */
#define TAIL_RATIO 1e-12  /* two-body / one-body rate below which the closed form takes over */

typedef struct hold_ctx {
    const cp_hold_params *p;
    double density_coef; /* <n> = density_coef N T^{-3/2} */
    const cp_cancel_flag *cancel;
} hold_ctx;

/* The two-body loss rate beta <n> (1/s) at N = n, T = temp. */
static double two_body_rate(const hold_ctx *c, double n, double temp)
{
    const cp_hold_params *p = c->p;
    double beta = p->rate * (p->wave == CP_LOSS_P_WAVE ? temp / p->temperature : 1.0);
    return beta * c->density_coef * n / (temp * sqrt(temp));
}

static int hold_rhs(double t, const double y[], double dydt[], void *params)
{
    (void)t;
    const hold_ctx *c = params;
    const cp_hold_params *p = c->p;
    if (c->cancel && *c->cancel)
        return GSL_EBADFUNC; /* stops the driver; the caller reports the cancellation */
    double n = y[0], temp = y[1];
    if (!(n > 0.0 && temp > 0.0))
        return GSL_EDOM;
    double gamma2 = two_body_rate(c, n, temp);
    double gamma1 = isinf(p->lifetime) ? 0.0 : 1.0 / p->lifetime;
    double h = p->anti_evaporation ? (p->wave == CP_LOSS_P_WAVE ? 1.0 / 12.0 : 0.25) : 0.0;
    dydt[0] = -(gamma2 + gamma1) * n;
    dydt[1] = h * gamma2 * temp + p->heating_rate;
    return GSL_SUCCESS;
}

static cp_status check_hold(const cp_hold_params *p, size_t points, cp_error *err)
{
    const char *ctx = "collisions.hold";
    CP_TRY(cp_collisions_check_cloud(ctx, p->number, p->temperature, p->omega, p->mass, err));
    CP_TRY(cp_check_range(err, ctx, "rate", p->rate, "m^3/s", 0.0, 1e-8, CP_CLOSED));
    CP_TRY(cp_collisions_check_wave(ctx, p->wave, err));
    if (!(isinf(p->lifetime) && p->lifetime > 0))
        CP_TRY(cp_check_range(err, ctx, "lifetime", p->lifetime, "s", 0.0, 1e9, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "heating_rate", p->heating_rate, "K/s", 0.0, 1.0,
                          CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "duration", p->duration, "s", 0.0, 1e5, CP_LO_OPEN));
    if (points < 2 || points > 1000000)
        return cp_fail(err, CP_EINVAL, "%s: points %zu is out of range; allowed [2, 1000000]",
                       ctx, points);
    return CP_OK;
}

cp_status cp_collisions_hold(const cp_hold_params *p, size_t points, double *times,
                             double *numbers, double *temperatures, cp_error *err)
{
    return cp_collisions_hold_cancellable(p, points, times, numbers, temperatures, NULL, err);
}

cp_status cp_collisions_hold_cancellable(const cp_hold_params *p, size_t points, double *times,
                                         double *numbers, double *temperatures,
                                         const cp_cancel_flag *cancel, cp_error *err)
{
    if (!times || !numbers || !temperatures)
        return cp_fail(err, CP_EINVAL, "collisions.hold: times, numbers and temperatures must "
                       "not be NULL");
    for (size_t i = 0; i < points; i++)
        times[i] = numbers[i] = temperatures[i] = NAN;
    if (!p)
        return cp_fail(err, CP_EINVAL, "collisions.hold: parameters are NULL");
    CP_TRY(check_hold(p, points, err));
    cp_init();
    double wbar = cbrt(p->omega[0] * p->omega[1] * p->omega[2]);
    hold_ctx c = {p, pow(p->mass * wbar * wbar / (4.0 * CP_PI * CP_KB), 1.5), cancel};
    gsl_odeiv2_system sys = {hold_rhs, NULL, 2, &c};
    gsl_odeiv2_driver *d = gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd,
                                                         p->duration * 1e-6, 0.0, REL_TOL);
    if (!d)
        return cp_fail(err, CP_ENOMEM, "collisions.hold: cannot allocate the ODE driver");
    double y[2] = {p->number, p->temperature}, t = 0.0;
    double gamma1 = isinf(p->lifetime) ? 0.0 : 1.0 / p->lifetime;
    int tail = 0; /* the closed form has taken over from time t */
    cp_status result = CP_OK;
    times[0] = 0.0;
    numbers[0] = y[0];
    temperatures[0] = y[1];
    for (size_t i = 1; i < points; i++) {
        double ti = p->duration * (double)i / (double)(points - 1);
        int status = GSL_SUCCESS;
        /* the steps gsl_odeiv2_driver_apply would take, watching for the one-body tail */
        while (!tail && t < ti && status == GSL_SUCCESS) {
            tail = gamma1 > 0.0 && two_body_rate(&c, y[0], y[1]) < TAIL_RATIO * gamma1;
            if (!tail)
                status = gsl_odeiv2_evolve_apply(d->e, d->c, d->s, &sys, &t, ti, &d->h, y);
        }
        if (status != GSL_SUCCESS && cancel && *cancel) {
            result = cp_fail(err, CP_ECANCELED, "collisions.hold: interrupted at t = %g s of "
                             "%g s", t, p->duration);
            break;
        }
        if (status != GSL_SUCCESS) {
            result = cp_fail(err, CP_ENUMERIC, "collisions.hold: the ODE solver failed at "
                             "t = %g s: %s", t, gsl_strerror(status));
            break;
        }
        times[i] = ti;
        numbers[i] = tail ? y[0] * exp(-(ti - t) * gamma1) : y[0];
        temperatures[i] = tail ? y[1] + p->heating_rate * (ti - t) : y[1];
    }
    gsl_odeiv2_driver_free(d);
    if (result != CP_OK)
        for (size_t i = 0; i < points; i++)
            times[i] = numbers[i] = temperatures[i] = NAN;
    return result;
}

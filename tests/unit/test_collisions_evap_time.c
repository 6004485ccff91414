/*
 * Tests of cp_collisions_evaporation_times, the clock of an evaporation trajectory, against
 * the closed-form solution of -dN/dt = N <n> Gamma at fixed temperature: with <n> = c N the
 * rate per particle is c N k (k = f sigma v_rel + beta), so t(N) = (1/N - 1/N0) / (c k)
 * (integrated by hand).  c = (m wbar^2 / (4 pi k_B T))^(3/2) / P(3, eta), P from GSL's
 * gsl_sf_gamma_inc_P; f = 2 e^-eta [eta - 4 P(4, eta)/P(3, eta)] (Luiten, Reynolds &
 * Walraven, PRA 53, 381 (1996)); v_rel = sqrt(16 k_B T / (pi m)) (Maxwell-Boltzmann).
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>
#include <gsl/gsl_sf_gamma.h>

#include "coldprep/collisions.h"

enum { POINTS = 2001 };
static const double KB = 1.380649e-23, MASS = 126.873178694 * 1.66053906660e-27; /* KRb */

static cp_evaporation_params params(cp_loss_wave wave)
{
    cp_evaporation_params p = {2e4, 300e-9, {600.0, 600.0, 6000.0}, MASS, 8.0, NAN, 100.0,
                               wave, 2e3};
    return p;
}

/* the closed form at fixed T for the rate constant k (m^3/s) */
static double expected(const cp_evaporation_params *p, double k, double n)
{
    double wbar = cbrt(p->omega[0] * p->omega[1] * p->omega[2]);
    double c = pow(p->mass * wbar * wbar / (4 * M_PI * KB * p->temperature), 1.5) /
               gsl_sf_gamma_inc_P(3.0, p->eta);
    return (1.0 / n - 1.0 / p->number) / (c * k);
}

static void fixed_temperature(void **state)
{
    (void)state;
    static double numbers[POINTS], temps[POINTS], times[POINTS];
    for (int i = 0; i < POINTS; i++) { /* N from 2e4 to 2e3, evenly in ln N, T fixed */
        numbers[i] = 2e4 * pow(0.1, (double)i / (POINTS - 1));
        temps[i] = 300e-9;
    }
    double eta = 8.0, f = 2 * exp(-eta) * (eta - 4 * gsl_sf_gamma_inc_P(4, eta) /
                                                        gsl_sf_gamma_inc_P(3, eta));
    double v = sqrt(16 * KB * 300e-9 / (M_PI * MASS)), sigma = 1e-15, beta = 1e-17;
    cp_error err;
    for (int w = 0; w < 2; w++) { /* s- and p-wave: at fixed T the loss law makes no odds */
        cp_evaporation_params p = params(w ? CP_LOSS_P_WAVE : CP_LOSS_S_WAVE);
        assert_int_equal(cp_collisions_evaporation_times(&p, sigma, beta, POINTS, numbers,
                                                         temps, times, &err),
                         CP_OK);
        assert_true(times[0] == 0.0);
        double want = expected(&p, f * sigma * v + beta, 2e3);
        assert_true(fabs(times[POINTS - 1] / want - 1) < 1e-6); /* trapezoid error ~h^2/12 */
        /* loss alone */
        assert_int_equal(cp_collisions_evaporation_times(&p, 0.0, beta, POINTS, numbers, temps,
                                                         times, &err),
                         CP_OK);
        assert_true(fabs(times[POINTS - 1] / expected(&p, beta, 2e3) - 1) < 1e-6);
    }
}

static void p_wave_loss_follows_temperature(void **state)
{
    (void)state;
    /* the same trajectory at half the temperature: p-wave beta halves with T, s-wave does
     * not, so with loss alone the p-wave clock runs longer (by hand: <n> grows as T^-3/2,
     * beta falls as T, rate per particle ~ T^-1/2 against T^-3/2) */
    double numbers[3] = {2e4, 1e4, 5e3}, temps[3] = {150e-9, 150e-9, 150e-9}, ts[3], tp[3];
    cp_evaporation_params s = params(CP_LOSS_S_WAVE), p = params(CP_LOSS_P_WAVE);
    cp_error err;
    assert_int_equal(cp_collisions_evaporation_times(&s, 0.0, 1e-17, 3, numbers, temps, ts, &err),
                     CP_OK);
    assert_int_equal(cp_collisions_evaporation_times(&p, 0.0, 1e-17, 3, numbers, temps, tp, &err),
                     CP_OK);
    assert_true(fabs(tp[2] / ts[2] - 2.0) < 1e-12);
}

static void bad_input(void **state)
{
    (void)state;
    double numbers[2] = {2e4, 2e3}, temps[2] = {300e-9, 300e-9}, times[2];
    cp_evaporation_params p = params(CP_LOSS_S_WAVE);
    cp_error err;
    assert_int_equal(cp_collisions_evaporation_times(&p, 0.0, 0.0, 2, numbers, temps, times, &err),
                     CP_EINVAL);
    assert_true(isnan(times[1]));
    assert_int_equal(cp_collisions_evaporation_times(&p, -1e-15, 1e-17, 2, numbers, temps, times,
                                                     &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "cross_section"));
    temps[1] = NAN;
    assert_int_equal(cp_collisions_evaporation_times(&p, 1e-15, 1e-17, 2, numbers, temps, times,
                                                     &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "trajectory point 1"));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(fixed_temperature),
        cmocka_unit_test(p_wave_loss_follows_temperature),
        cmocka_unit_test(bad_input),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

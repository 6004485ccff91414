/*
 * Tests of cp_thermo_number_at: the number that gives a trapped ideal gas a chosen T/T_F or
 * T/T_c, checked by putting the number back into the degeneracy temperatures evaluated here
 * by hand (k_B T_F = hbar wbar (6N)^(1/3), k_B T_c = hbar wbar (N/zeta(3))^(1/3): Butts &
 * Rokhsar, PRA 55, 4346 (1997); Dalfovo et al., RMP 71, 463 (1999), eq. 13), with zeta(3)
 * from GSL and the constants written out from CODATA 2018.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>
#include <gsl/gsl_sf_zeta.h>

#include "coldprep/thermo.h"

/* SI 2019 exact constants (CODATA 2018): h = 6.62607015e-34 J s, kB = 1.380649e-23 J/K */
static const double HBAR = 6.62607015e-34 / (2 * M_PI), KB = 1.380649e-23;

static void round_trip(void **state)
{
    (void)state;
    const double w[3] = {2 * M_PI * 60, 2 * M_PI * 70, 2 * M_PI * 200};
    const double wbar = cbrt(w[0] * w[1] * w[2]), T = 150e-9;
    double n;
    cp_error err;
    assert_int_equal(cp_thermo_number_at(CP_FERMION, T, w, 0.3, &n, &err), CP_OK);
    double tf = HBAR * wbar * cbrt(6 * n) / KB;
    assert_true(fabs(T / tf - 0.3) < 1e-12 * 0.3);
    assert_int_equal(cp_thermo_number_at(CP_BOSON, T, w, 0.8, &n, &err), CP_OK);
    double tc = HBAR * wbar * cbrt(n / gsl_sf_zeta_int(3)) / KB;
    assert_true(fabs(T / tc - 0.8) < 1e-12 * 0.8);
}

static void bad_input(void **state)
{
    (void)state;
    const double w[3] = {100, 100, 100}, bad_w[3] = {100, -1, 100};
    double n;
    cp_error err;
    assert_int_equal(cp_thermo_number_at(CP_FERMION, -1e-9, w, 0.3, &n, &err), CP_EINVAL);
    assert_true(isnan(n));
    assert_non_null(strstr(err.message, "temperature"));
    assert_int_equal(cp_thermo_number_at(CP_BOSON, 1e-7, bad_w, 0.3, &n, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "omega_y"));
    assert_int_equal(cp_thermo_number_at(CP_FERMION, 1e-7, w, 0.0, &n, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "T/T_F"));
    assert_int_equal(cp_thermo_number_at(CP_BOSON, 1e-7, w, NAN, &n, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "T/T_c"));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(round_trip),
        cmocka_unit_test(bad_input),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

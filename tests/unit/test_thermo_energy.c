/*
 * Tests of cp_thermo_temperature_from_energy against closed forms of the trapped ideal gas
 * (Butts & Rokhsar, PRA 55, 4346 (1997); Dalfovo et al., RMP 71, 463 (1999), sec. II.B):
 *   Fermi, T << T_F:  E/N = (3/4) E_F [1 + (2 pi^2/3) (T/T_F)^2] + O((T/T_F)^4)
 *   Bose, T < T_c:    E/N = 3 k_B T (zeta(4)/zeta(3)) (T/T_c)^3
 *   either, T >> T_deg: E/N = 3 k_B T (classical equipartition in a 3D harmonic trap)
 * evaluated here by hand, zeta from GSL, constants SI 2019 exact (CODATA 2018).
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>
#include <gsl/gsl_sf_zeta.h>

#include "coldprep/thermo.h"

static const double HBAR = 6.62607015e-34 / (2 * M_PI), KB = 1.380649e-23;
static const double MASS = 126.873178694 * 1.66053906660e-27; /* 40K87Rb, AME2020 masses */

static cp_thermo_trap trap_of(double number)
{
    cp_thermo_trap t;
    cp_thermo_trap_isotropic(&t, number, 2 * M_PI * 100, MASS);
    return t;
}

static void fermi_sommerfeld(void **state)
{
    (void)state;
    cp_thermo_trap t = trap_of(2e4);
    double ef = HBAR * 2 * M_PI * 100 * cbrt(6 * 2e4), x = 0.02; /* T/T_F */
    double e = 0.75 * ef * (1 + 2 * M_PI * M_PI / 3 * x * x), temperature;
    cp_error err;
    assert_int_equal(cp_thermo_temperature_from_energy(&t, CP_FERMION, e, &temperature, &err),
                     CP_OK);
    /* The O(x^4) term left out is ~3e-6 of E here (1.2e-4 at x = 0.05, measured against the
     * model); E depends on T only through (4 pi^2/3) x^2 = 5.3e-3 dT/T, so the recovered T
     * is good to ~6e-4. */
    assert_true(fabs(temperature / (x * ef / KB) - 1) < 2e-3);
}

static void bose_below_tc(void **state)
{
    (void)state;
    cp_thermo_trap t = trap_of(5e4);
    double z3 = gsl_sf_zeta_int(3), z4 = gsl_sf_zeta_int(4);
    double tc = HBAR * 2 * M_PI * 100 * cbrt(5e4 / z3) / KB, T = 0.6 * tc;
    double e = 3 * KB * T * z4 / z3 * pow(T / tc, 3), temperature;
    cp_error err;
    assert_int_equal(cp_thermo_temperature_from_energy(&t, CP_BOSON, e, &temperature, &err),
                     CP_OK);
    assert_true(fabs(temperature / T - 1) < 1e-9);
}

static void classical_limit(void **state)
{
    (void)state;
    cp_thermo_trap t = trap_of(1e3);
    double T = 10e-6, temperature; /* T/T_F ~ 26, fugacity ~ 1e-5 */
    cp_error err;
    for (int stat = 0; stat < 2; stat++) {
        assert_int_equal(cp_thermo_temperature_from_energy(&t, (cp_statistics)stat, 3 * KB * T,
                                                           &temperature, &err),
                         CP_OK);
        assert_true(fabs(temperature / T - 1) < 1e-5);
    }
}

static void bad_input(void **state)
{
    (void)state;
    cp_thermo_trap t = trap_of(2e4);
    double temperature;
    cp_error err;
    assert_int_equal(cp_thermo_temperature_from_energy(&t, CP_FERMION, -1e-30, &temperature,
                                                       &err),
                     CP_EINVAL);
    assert_true(isnan(temperature));
    assert_non_null(strstr(err.message, "energy_per_particle"));
    /* below the Fermi sea's 3/4 E_F no temperature exists */
    double ef = HBAR * 2 * M_PI * 100 * cbrt(6 * 2e4);
    assert_int_equal(cp_thermo_temperature_from_energy(&t, CP_FERMION, 0.5 * ef, &temperature,
                                                       &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "below"));
    assert_int_equal(cp_thermo_temperature_from_energy(&t, CP_BOSON, NAN, &temperature, &err),
                     CP_EINVAL);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(fermi_sommerfeld),
        cmocka_unit_test(bose_below_tc),
        cmocka_unit_test(classical_limit),
        cmocka_unit_test(bad_input),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

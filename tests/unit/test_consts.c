/*
 * Constants: the exact SI-2019 values, the CODATA 2018 values, the derived atomic units,
 * and where GSL's gsl_const_mksa.h (an older CODATA edition) differs.
 * Reference values: CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)) as
 * tabulated in SciPy 1.10 scipy.constants.
 */
#include <float.h>
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>

#include <cmocka.h>
#include <gsl/gsl_const_mksa.h>

#include "coldprep/consts.h"
#include "coldprep/status.h"

#include "check_close.h"

/* CONSTS-1: the constants fixed exactly by the 2019 SI redefinition. */
static void test_exact_si_constants(void **state)
{
    (void)state;
    assert_true(CP_H == 6.62607015e-34);
    assert_true(CP_KB == 1.380649e-23);
    assert_true(CP_C == 299792458.0);
    assert_true(CP_E == 1.602176634e-19);
    /* hbar = h / 2 pi to double precision */
    assert_rel(CP_HBAR, 6.62607015e-34 / (2.0 * M_PI), 2 * DBL_EPSILON);
}

/* CONSTS-2: measured constants, CODATA 2018 (SciPy 1.10 table). */
static void test_codata2018_values(void **state)
{
    (void)state;
    assert_rel(CP_AMU, 1.66053906660e-27, 1e-12);
    assert_rel(CP_A0, 5.29177210903e-11, 1e-12);
    assert_rel(CP_EPS0, 8.8541878128e-12, 1e-12);
    assert_rel(CP_MUB, 9.2740100783e-24, 1e-12);
    assert_rel(CP_EH, 4.3597447222071e-18, 1e-12);
    assert_rel(CP_ME, 9.1093837015e-31, 1e-12);
}

/* CONSTS-3: derived atomic units (CODATA 2018, computed with SciPy). */
static void test_derived_units(void **state)
{
    (void)state;
    assert_rel(CP_AU_DIPOLE, 8.4783536255e-30, 1e-10);
    assert_rel(CP_AU_DIPOLE / CP_DEBYE, 2.5417464731818566, 1e-10);
    assert_rel(CP_AU_POLARIZABILITY, 1.6487772743602864e-41, 1e-9);
    /* 1 D = 1e-21 / c  C m (definition of the debye) */
    assert_rel(CP_DEBYE, 1e-21 / 299792458.0, 1e-14);
    /* Hartree energy = hbar^2 / (me a0^2) (atomic units), CODATA-consistent to 1e-9 */
    assert_rel(CP_HBAR * CP_HBAR / (CP_ME * CP_A0 * CP_A0), CP_EH, 1e-9);
}

/* CONSTS-4: GSL 2.7's gsl_const_mksa.h is an older edition: document the differences the
 * project avoids by defining its own (the CODATA 2018 values, include/coldprep/consts.h). */
static void test_gsl_constants_differ(void **state)
{
    (void)state;
    double dk = (GSL_CONST_MKSA_BOLTZMANN - CP_KB) / CP_KB;
    double dh = (GSL_CONST_MKSA_PLANCKS_CONSTANT_H - CP_H) / CP_H;
    assert_rel(dk, 1.014e-6, 2e-3);
    assert_rel(dh, -1.796e-7, 2e-3);
    /* the speed of light is exact in both */
    assert_true(GSL_CONST_MKSA_SPEED_OF_LIGHT == CP_C);
}

/* CONSTS-5: status strings and version exist for every code. */
static void test_status_strings(void **state)
{
    (void)state;
    assert_string_equal(cp_strerror(CP_OK), "success");
    assert_string_equal(cp_strerror(CP_EINVAL), "invalid argument");
    assert_string_equal(cp_strerror((cp_status)99), "unknown status");
    assert_non_null(cp_version());
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_exact_si_constants),
        cmocka_unit_test(test_codata2018_values),
        cmocka_unit_test(test_derived_units),
        cmocka_unit_test(test_gsl_constants_differ),
        cmocka_unit_test(test_status_strings),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

/*
 * The argument checks shared by every model: the message names context, parameter,
 * value, unit and the allowed range, for NaN, infinities and out-of-range values.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>

#include "check_int.h"

static void test_positive_messages(void **state)
{
    (void)state;
    cp_error err;
    assert_int_equal(cp_check_positive(&err, "lattice.depth", "wavelength", 0.0, "m"), CP_EINVAL);
    assert_string_equal(err.message,
                        "lattice.depth: wavelength 0 m is out of range; allowed (0, inf) m");
    assert_int_equal(cp_check_positive(&err, "lattice.depth", "waist", NAN, "m"), CP_EINVAL);
    assert_non_null(strstr(err.message, "not a number"));
    /* a NaN with its sign bit set is spelled like any other, never "-nan" */
    assert_int_equal(cp_check_positive(&err, "lattice.depth", "waist", -NAN, "m"), CP_EINVAL);
    assert_string_equal(err.message, "lattice.depth: waist NaN m is not a number; allowed (0, "
                                     "inf) m");
    assert_int_equal(cp_check_positive(&err, "x", "power", INFINITY, "W"), CP_EINVAL);
    assert_non_null(strstr(err.message, "infinite"));
    assert_int_equal(cp_check_positive(&err, "x", "power", 1e-300, "W"), CP_OK);
}

static void test_range_bounds(void **state)
{
    (void)state;
    cp_error err;
    assert_int_equal(cp_check_range(&err, "c", "p", 1.0, "", 0.0, 1.0, CP_CLOSED), CP_OK);
    assert_int_equal(cp_check_range(&err, "c", "p", 1.0, "", 0.0, 1.0, CP_HI_OPEN), CP_EINVAL);
    assert_string_equal(err.message, "c: p 1 is out of range; allowed [0, 1)");
    assert_int_equal(cp_check_nonnegative(&err, "c", "t", -1.0, "s"), CP_EINVAL);
    assert_int_equal(cp_check_nonnegative(NULL, "c", "t", 0.0, "s"), CP_OK);
    assert_int_equal(cp_check_int_range(&err, "c", "bands", 0, 1, 50), CP_EINVAL);
    assert_string_equal(err.message, "c: bands 0 is out of range; allowed [1, 50]");
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_positive_messages),
        cmocka_unit_test(test_range_bounds),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

/*
 * Tolerance checks shared by the cmocka unit tests.  Two comparisons, both failing on NaN
 * (each passes only when "measure <= tol" is true):
 *   assert_abs(got, want, tol)        |got - want| <= tol              (absolute)
 *   assert_rel(got, want, tol)        |got - want| / |want| <= tol     (relative)
 * For want = 0 the relative measure is inf (NaN when got = 0 too), which fails any finite
 * tolerance: use assert_abs there.
 * The label printed on failure is the text of the expression `got`; assert_abs_named takes
 * the label as a (possibly run-time) string instead.  A failure prints the label, both values,
 * the measured difference and the tolerance with its kind, and is reported at the line of
 * the call.
 */
#ifndef COLDPREP_TESTS_CHECK_CLOSE_H
#define COLDPREP_TESTS_CHECK_CLOSE_H

#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>

#include <cmocka.h>

/* Fails the running test at file:line unless measure <= tol (so also when it is NaN). */
static inline void check_within(const char *file, int line, const char *label, double got,
                                double want, double measure, double tol, const char *kind)
{
    if (measure <= tol)
        return;
    print_error("ERROR: %s: got %.17g, want %.17g (%s error %.3g > %s tolerance %.3g)\n", label,
                got, want, kind, measure, kind, tol);
    _fail(file, line);
}

static inline void check_abs(const char *file, int line, const char *label, double got,
                             double want, double tol)
{
    check_within(file, line, label, got, want, fabs(got - want), tol, "absolute");
}

static inline void check_rel(const char *file, int line, const char *label, double got,
                             double want, double tol)
{
    check_within(file, line, label, got, want, fabs(got - want) / fabs(want), tol, "relative");
}

#define assert_abs(got, want, tol) check_abs(__FILE__, __LINE__, #got, (got), (want), (tol))
#define assert_rel(got, want, tol) check_rel(__FILE__, __LINE__, #got, (got), (want), (tol))
#define assert_abs_named(got, want, tol, name)                                                 \
    check_abs(__FILE__, __LINE__, (name), (got), (want), (tol))

#endif

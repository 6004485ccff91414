/*
 * Private helpers for validating arguments and filling the error record.  Every check
 * names the context (the calling model and function), the parameter, its value, its unit
 * and the allowed range, e.g.
 *   "lattice.depth: wavelength 0 m is out of range; allowed (0, inf) m".
 * Not installed.
 */
#ifndef COLDPREP_CHECK_INT_H
#define COLDPREP_CHECK_INT_H

#include "coldprep/status.h"

#include "coldprep/limits.h" /* the shared input limits, CP_MIN_TEMPERATURE, ... */

/* Bounds flags for cp_check_range: which ends of [lo, hi] are excluded. */
enum { CP_CLOSED = 0, CP_LO_OPEN = 1, CP_HI_OPEN = 2, CP_OPEN = 3 };

/* Fill err (may be NULL) with a printf-style message and return status. */
cp_status cp_fail(cp_error *err, cp_status status, const char *fmt, ...)
    __attribute__((format(printf, 3, 4)));

/* value must be finite and inside the interval lo..hi (ends excluded per flags; lo or hi
 * may be +-INFINITY to mean unbounded on that side). */
cp_status cp_check_range(cp_error *err, const char *context, const char *name, double value,
                         const char *unit, double lo, double hi, int flags);

/* value finite and > 0. */
cp_status cp_check_positive(cp_error *err, const char *context, const char *name, double value,
                            const char *unit);

/* value finite and >= 0. */
cp_status cp_check_nonnegative(cp_error *err, const char *context, const char *name,
                               double value, const char *unit);

/* value finite (any sign). */
cp_status cp_check_finite(cp_error *err, const char *context, const char *name, double value,
                          const char *unit);

/* integer in [lo, hi]. */
cp_status cp_check_int_range(cp_error *err, const char *context, const char *name, long value,
                             long lo, long hi);

/* The house refusal of a call whose estimated CPU time `seconds` exceeds `limit` (> 0; 0 or
 * +inf: no limit): "<ctx>: estimated work <seconds> s of CPU (<what>) is too long for one
 * call; allowed up to <limit> s unless asked for; <reduce>", status CP_ETOOLONG.  Returns
 * CP_OK when within the limit. */
cp_status cp_check_work(cp_error *err, const char *ctx, double seconds, double limit,
                        const char *what, const char *reduce);

/* A work limit `max_seconds` of a bounded function: > 0, +inf for none; otherwise
 * "<ctx>: work limit <value> s is out of range; allowed (0, inf] s" (CP_EINVAL). */
cp_status cp_check_work_limit(cp_error *err, const char *ctx, double max_seconds);

/* Set *n doubles at out to NaN (poisoning out-parameters before an error return). */
void cp_poison(double *out, int n);

/* Evaluate a check and return its status from the enclosing function on failure. */
#define CP_TRY(expr)                        \
    do {                                    \
        cp_status cp_try_status_ = (expr);  \
        if (cp_try_status_ != CP_OK)        \
            return cp_try_status_;          \
    } while (0)

#endif

/*
 * Argument validation and error-record formatting shared by every core model.  The
 * messages follow one pattern so that users learn to read them once:
 *   "<context>: <parameter> <value> <unit> is <problem>; allowed <range> <unit>".
 */
#include "check_int.h"

#include <math.h>
#include <stdarg.h>
#include <stdio.h>

cp_status cp_fail(cp_error *err, cp_status status, const char *fmt, ...)
{
    if (err) {
        va_list ap;
        va_start(ap, fmt);
        vsnprintf(err->message, sizeof err->message, fmt, ap);
        va_end(ap);
        err->status = status;
    }
    return status;
}

/* %.6g, but NaN and the infinities in one spelling on every platform (printf may write
 * "-nan" for a NaN with its sign bit set). */
static void format_bound(char *buf, size_t size, double v)
{
    if (isnan(v))
        snprintf(buf, size, "NaN");
    else if (isinf(v))
        snprintf(buf, size, "%s", v > 0 ? "inf" : "-inf");
    else
        snprintf(buf, size, "%.6g", v);
}

cp_status cp_check_range(cp_error *err, const char *context, const char *name, double value,
                         const char *unit, double lo, double hi, int flags)
{
    int lo_open = (flags & CP_LO_OPEN) != 0, hi_open = (flags & CP_HI_OPEN) != 0;
    int ok = isfinite(value) && (lo_open ? value > lo : value >= lo) &&
             (hi_open ? value < hi : value <= hi);
    if (ok)
        return CP_OK;

    char los[32], his[32], vals[32];
    format_bound(los, sizeof los, lo);
    format_bound(his, sizeof his, hi);
    format_bound(vals, sizeof vals, value);
    const char *problem = isnan(value)   ? "not a number"
                          : isinf(value) ? "infinite"
                                         : "out of range";
    const char *sep = (unit && unit[0]) ? " " : "";
    return cp_fail(err, CP_EINVAL, "%s: %s %s%s%s is %s; allowed %c%s, %s%c%s%s", context, name,
                   vals, sep, unit ? unit : "", problem, lo_open || isinf(lo) ? '(' : '[', los,
                   his, hi_open || isinf(hi) ? ')' : ']', sep, unit ? unit : "");
}

cp_status cp_check_positive(cp_error *err, const char *context, const char *name, double value,
                            const char *unit)
{
    return cp_check_range(err, context, name, value, unit, 0.0, INFINITY, CP_OPEN);
}

cp_status cp_check_nonnegative(cp_error *err, const char *context, const char *name,
                               double value, const char *unit)
{
    return cp_check_range(err, context, name, value, unit, 0.0, INFINITY, CP_HI_OPEN);
}

cp_status cp_check_finite(cp_error *err, const char *context, const char *name, double value,
                          const char *unit)
{
    return cp_check_range(err, context, name, value, unit, -INFINITY, INFINITY, CP_OPEN);
}

cp_status cp_check_int_range(cp_error *err, const char *context, const char *name, long value,
                             long lo, long hi)
{
    if (value >= lo && value <= hi)
        return CP_OK;
    return cp_fail(err, CP_EINVAL, "%s: %s %ld is out of range; allowed [%ld, %ld]", context,
                   name, value, lo, hi);
}

cp_status cp_check_work(cp_error *err, const char *ctx, double seconds, double limit,
                        const char *what, const char *reduce)
{
    if (!(limit > 0.0) || isinf(limit) || seconds <= limit)
        return CP_OK;
    return cp_fail(err, CP_ETOOLONG, "%s: estimated work %.2g s of CPU (%s) is too long for one "
                   "call; allowed up to %g s unless asked for; %s", ctx, seconds, what, limit,
                   reduce);
}

cp_status cp_check_work_limit(cp_error *err, const char *ctx, double max_seconds)
{
    if (max_seconds > 0.0)
        return CP_OK;
    char vals[32];
    format_bound(vals, sizeof vals, max_seconds);
    return cp_fail(err, CP_EINVAL, "%s: work limit %s s is %s; allowed (0, inf] s", ctx, vals,
                   isnan(max_seconds) ? "not a number" : "out of range");
}

void cp_poison(double *out, int n)
{
    for (int i = 0; i < n; i++)
        out[i] = NAN;
}

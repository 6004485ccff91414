/*
 * The dc-field shielding crossing: the reduced field x_s = d F_s / B at which the pair
 * state |1,0> + |1,0> is degenerate with |0,0> + |2,0>, i.e. the root of
 *   g(x) = 2 E(1,0) - E(0,0) - E(2,0)   (energies in units of B),
 * g(0) = 2 (2) - 0 - 6 = -2 < 0.  Above F_s the |1,0> + |1,0> channel lies above
 * |0,0> + |2,0> and their dipole-dipole coupling repels it at long range: the shield of
 * Avdeenkov, Kajita & Bohn, PRA 73, 022707 (2006) [M], and Gonzalez-Martinez, Bohn &
 * Quemener, PRA 96, 032718 (2017) [M]; the Forster-resonance picture of Lassabliere &
 * Quemener, arXiv:2204.02885.  The root is found with GSL's Brent solver on the exact energies.
 */
#include <gsl/gsl_errno.h>
#include <gsl/gsl_roots.h>
#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "fields_int.h"

/* Bracket of the root: g(1) < 0 < g(10) (checked at run time). */
#define X_LO 1.0
#define X_HI 10.0

typedef struct gap_ctx {
    cp_fields_work *w;
    cp_status status;
} gap_ctx;

/* g(x) in units of B; records a solver failure in the context (and returns NaN). */
static double gap_reduced(double x, void *p)
{
    gap_ctx *c = p;
    int n;
    cp_status st = cp_fields_solve(c->w, x, 0, 3, NULL, c->w->energy, NULL, &n);
    if (st != CP_OK) {
        c->status = st;
        return NAN;
    }
    const double *e = c->w->energy;
    return 2.0 * e[1] - e[0] - e[2];
}

static cp_status with_work(const char *context, double xmax, gap_ctx *c, cp_error *err)
{
    c->status = CP_OK;
    c->w = cp_fields_work_alloc(cp_fields_basis_cap(xmax, 3), 3);
    return c->w ? CP_OK : cp_fail(err, CP_ENOMEM, "%s: out of memory", context);
}

cp_status cp_fields_shielding_reduced(double *reduced_field, cp_error *err)
{
    static const char ctx[] = "fields.shielding_reduced";
    *reduced_field = NAN;
    gap_ctx c;
    CP_TRY(with_work(ctx, X_HI, &c, err));
    cp_init();
    gsl_function f = {gap_reduced, &c};
    cp_status st = CP_OK;
    if (!(gap_reduced(X_LO, &c) < 0 && gap_reduced(X_HI, &c) > 0))
        st = cp_fail(err, CP_ENUMERIC, "%s: the pair-energy gap does not change sign on "
                     "[%g, %g] (d F / B)", ctx, X_LO, X_HI);
    gsl_root_fsolver *s = st == CP_OK ? gsl_root_fsolver_alloc(gsl_root_fsolver_brent) : NULL;
    if (st == CP_OK && !s)
        st = cp_fail(err, CP_ENOMEM, "%s: out of memory", ctx);
    if (st == CP_OK && gsl_root_fsolver_set(s, &f, X_LO, X_HI) != GSL_SUCCESS)
        st = cp_fail(err, CP_ENUMERIC, "%s: GSL root solver could not start", ctx);
    int status = GSL_CONTINUE;
    for (int it = 0; st == CP_OK && status == GSL_CONTINUE && it < 200; it++) {
        if (gsl_root_fsolver_iterate(s) != GSL_SUCCESS || c.status != CP_OK) {
            st = cp_fail(err, CP_ENUMERIC, "%s: root iteration failed", ctx);
            break;
        }
        status = gsl_root_test_interval(gsl_root_fsolver_x_lower(s),
                                        gsl_root_fsolver_x_upper(s), 0.0, 1e-14);
    }
    if (st == CP_OK && status != GSL_SUCCESS)
        st = cp_fail(err, CP_ENOCONV, "%s: root iteration did not converge", ctx);
    if (st == CP_OK)
        *reduced_field = gsl_root_fsolver_root(s);
    gsl_root_fsolver_free(s);
    cp_fields_work_free(c.w);
    return st;
}

cp_status cp_fields_shielding_field(const cp_fields_rotor *rotor, double *field,
                                    double *reduced_field, cp_error *err)
{
    static const char ctx[] = "fields.shielding_field";
    double xs = NAN;
    *field = NAN;
    if (reduced_field)
        *reduced_field = NAN;
    CP_TRY(cp_fields_check_rotor(ctx, rotor, err));
    CP_TRY(cp_fields_shielding_reduced(&xs, err));
    double fs = xs * CP_H * rotor->rot_const_hz / rotor->dipole;
    if (fs > CP_FIELDS_MAX_FIELD)
        return cp_fail(err, CP_EINVAL,
                       "%s: the shielding field %g V/m of this molecule (d = %g C m, B/h = %g "
                       "Hz) is out of range; allowed up to %g V/m",
                       ctx, fs, rotor->dipole, rotor->rot_const_hz, CP_FIELDS_MAX_FIELD);
    *field = fs;
    if (reduced_field)
        *reduced_field = xs;
    return CP_OK;
}

cp_status cp_fields_shielding_gap(const cp_fields_rotor *rotor, double field, double *gap_hz,
                                  cp_error *err)
{
    static const char ctx[] = "fields.shielding_gap";
    double x;
    *gap_hz = NAN;
    CP_TRY(cp_fields_check_rotor(ctx, rotor, err));
    CP_TRY(cp_fields_check_field(ctx, rotor, field, &x, err));
    gap_ctx c;
    CP_TRY(with_work(ctx, x, &c, err));
    double g = gap_reduced(x, &c);
    cp_status st = c.status;
    cp_fields_work_free(c.w);
    if (st != CP_OK)
        return cp_fail(err, st, "%s: the rotor diagonalisation failed at d F / B = %g", ctx, x);
    *gap_hz = g * rotor->rot_const_hz;
    return CP_OK;
}

/*
 * The dc Stark effect of a rigid polar rotor (public entry points): one state, the ground
 * state's induced dipole, a Stark map over many fields, and the argument checks the fields
 * model shares.  The diagonalisation itself is in fields_rotor.c and fields_tridiag.c.
 * Energies E/h are B/h times the reduced eigenvalue E/B; the induced dipole is
 * d <cos theta> (Hellmann-Feynman: -dE/dF = -d d(E/B)/dx = d <cos theta>).
 */
#include <math.h>
#include <stdlib.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "fields_int.h"

cp_status cp_fields_check_rotor(const char *context, const cp_fields_rotor *rotor,
                                cp_error *err)
{
    if (!rotor)
        return cp_fail(err, CP_EINVAL, "%s: rotor is NULL", context);
    CP_TRY(cp_check_range(err, context, "dipole", rotor->dipole, "C m", CP_FIELDS_MIN_DIPOLE,
                          CP_FIELDS_MAX_DIPOLE, CP_CLOSED));
    return cp_check_range(err, context, "rot_const_hz", rotor->rot_const_hz, "Hz",
                          CP_FIELDS_MIN_ROT_CONST, CP_FIELDS_MAX_ROT_CONST, CP_CLOSED);
}

cp_status cp_fields_check_field(const char *context, const cp_fields_rotor *rotor, double field,
                                double *x, cp_error *err)
{
    CP_TRY(cp_check_range(err, context, "field", field, "V/m", 0.0, CP_FIELDS_MAX_FIELD,
                          CP_CLOSED));
    *x = rotor->dipole * field / (CP_H * rotor->rot_const_hz);
    if (*x > CP_FIELDS_MAX_REDUCED_FIELD)
        return cp_fail(err, CP_EINVAL,
                       "%s: field %g V/m is out of range for this molecule (d F / B = %g); "
                       "allowed [0, %g] V/m (d F / B up to %g)",
                       context, field, *x,
                       CP_FIELDS_MAX_REDUCED_FIELD * CP_H * rotor->rot_const_hz / rotor->dipole,
                       CP_FIELDS_MAX_REDUCED_FIELD);
    return CP_OK;
}

cp_status cp_fields_check_state(const char *context, int j, int m, cp_error *err)
{
    CP_TRY(cp_check_int_range(err, context, "j", j, 0, CP_FIELDS_MAX_J));
    return cp_check_int_range(err, context, "m", m, -j, j);
}

/* E/B and <cos theta> of |j, m> at reduced field x (inputs valid). */
static cp_status solve_state(const char *context, double x, int j, int m, double *energy,
                             double *cos_theta, int *basis_size, cp_error *err)
{
    int levels = j - abs(m) + 1;
    cp_fields_work *w = cp_fields_work_alloc(cp_fields_basis_cap(x, levels), levels);
    if (!w)
        return cp_fail(err, CP_ENOMEM, "%s: out of memory", context);
    cp_status st = cp_fields_solve(w, x, m, levels, NULL, w->energy, w->cos_theta, basis_size);
    if (st == CP_OK) {
        *energy = w->energy[levels - 1];
        *cos_theta = w->cos_theta[levels - 1];
    }
    cp_fields_work_free(w);
    if (st != CP_OK)
        return cp_fail(err, st, "%s: the rotor diagonalisation failed at d F / B = %g (%s)",
                       context, x, cp_strerror(st));
    return CP_OK;
}

cp_status cp_fields_stark_reduced(double x, int j, int m, double *energy_reduced,
                                  double *cos_theta, int *basis_size, cp_error *err)
{
    static const char ctx[] = "fields.stark_reduced";
    double e = NAN, c = NAN;
    int n = 0;
    cp_status st = cp_check_range(err, ctx, "reduced_field", x, "(d F / B)", 0.0,
                                  CP_FIELDS_MAX_REDUCED_FIELD, CP_CLOSED);
    if (st == CP_OK)
        st = cp_fields_check_state(ctx, j, m, err);
    if (st == CP_OK)
        st = solve_state(ctx, x, j, m, &e, &c, &n, err);
    if (energy_reduced)
        *energy_reduced = e;
    if (cos_theta)
        *cos_theta = c;
    if (basis_size)
        *basis_size = n;
    return st;
}

cp_status cp_fields_stark(const cp_fields_rotor *rotor, double field, int j, int m,
                          cp_fields_stark_result *out, cp_error *err)
{
    static const char ctx[] = "fields.stark";
    double x = NAN, e = NAN, c = NAN;
    int n = 0;
    cp_status st = cp_fields_check_rotor(ctx, rotor, err);
    if (st == CP_OK)
        st = cp_fields_check_field(ctx, rotor, field, &x, err);
    if (st == CP_OK)
        st = cp_fields_check_state(ctx, j, m, err);
    if (st == CP_OK)
        st = solve_state(ctx, x, j, m, &e, &c, &n, err);
    if (st != CP_OK) {
        cp_poison(&out->energy_hz, 1);
        cp_poison(&out->induced_dipole, 1);
        cp_poison(&out->reduced_field, 1);
        cp_poison(&out->energy_reduced, 1);
        cp_poison(&out->cos_theta, 1);
        out->basis_size = 0;
        return st;
    }
    out->energy_hz = e * rotor->rot_const_hz;
    out->induced_dipole = c * rotor->dipole;
    out->reduced_field = x;
    out->energy_reduced = e;
    out->cos_theta = c;
    out->basis_size = n;
    return CP_OK;
}

cp_status cp_fields_induced_dipole(double dipole, double rot_const_hz, double field,
                                   double *induced_dipole, cp_error *err)
{
    static const char ctx[] = "fields.induced_dipole";
    cp_fields_rotor rotor = {dipole, rot_const_hz};
    double x = NAN, e, c = NAN;
    int n;
    cp_status st = cp_fields_check_rotor(ctx, &rotor, err);
    if (st == CP_OK)
        st = cp_fields_check_field(ctx, &rotor, field, &x, err);
    if (st == CP_OK)
        st = solve_state(ctx, x, 0, 0, &e, &c, &n, err);
    *induced_dipole = st == CP_OK ? c * dipole : NAN;
    return st;
}

cp_status cp_fields_stark_map(const cp_fields_rotor *rotor, int m, int levels,
                              const double *fields, size_t count, double *energy_hz,
                              double *induced_dipole, int *basis_size, cp_error *err)
{
    static const char ctx[] = "fields.stark_map";
    int largest = 0;
    double xmax = 0.0;
    cp_status st = cp_fields_check_rotor(ctx, rotor, err);
    if (st == CP_OK && count < 1)
        st = cp_fail(err, CP_EINVAL, "%s: count 0 fields is out of range; allowed >= 1", ctx);
    if (st == CP_OK)
        st = cp_check_int_range(err, ctx, "levels", levels, 1, CP_FIELDS_MAX_LEVELS);
    if (st == CP_OK)
        st = cp_check_int_range(err, ctx, "m", m, -CP_FIELDS_MAX_J,
                                CP_FIELDS_MAX_J - (levels - 1));
    for (size_t i = 0; st == CP_OK && i < count; i++) {
        double x;
        st = cp_fields_check_field(ctx, rotor, fields[i], &x, err);
        xmax = fmax(xmax, x);
    }
    cp_fields_work *w = NULL;
    if (st == CP_OK) {
        w = cp_fields_work_alloc(cp_fields_basis_cap(xmax, levels), levels);
        if (!w)
            st = cp_fail(err, CP_ENOMEM, "%s: out of memory", ctx);
    }
    double b = st == CP_OK ? rotor->rot_const_hz : 0.0;
    double b_joule = CP_H * b;
    for (size_t i = 0; st == CP_OK && i < count; i++) {
        double *e = energy_hz + i * (size_t)levels;
        double *c = induced_dipole ? induced_dipole + i * (size_t)levels : NULL;
        double x = rotor->dipole * fields[i] / b_joule;
        int n;
        /* the previous row (E/B, still in w->lambda) seeds the solve when fields are close */
        const double *guess = i > 0 ? w->lambda : NULL;
        st = cp_fields_solve(w, x, m, levels, guess, e, c, &n);
        if (st != CP_OK) {
            st = cp_fail(err, st, "%s: the rotor diagonalisation failed at d F / B = %g (%s)",
                         ctx, x, cp_strerror(st));
            break;
        }
        largest = n > largest ? n : largest;
        for (int k = 0; k < levels; k++) {
            e[k] *= b;
            if (c)
                c[k] *= rotor->dipole;
        }
    }
    cp_fields_work_free(w);
    if (st != CP_OK) {
        for (size_t i = 0; i < count * (size_t)levels; i++) {
            energy_hz[i] = NAN;
            if (induced_dipole)
                induced_dipole[i] = NAN;
        }
        largest = 0;
    }
    if (basis_size)
        *basis_size = largest;
    return st;
}

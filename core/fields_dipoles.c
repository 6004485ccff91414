/*
 * Dipole matrix elements between Stark states: <k| d_z |l> for the `levels` lowest states
 * of one M block in a dc field, from the eigenvectors of the rotor Hamiltonian
 * (fields_rotor.c).  In the |J, M> basis cos theta is tridiagonal with the elements
 * <J, M| cos theta |J+1, M> of Zare, Angular Momentum (Wiley, 1988), so
 *   <k| cos theta |l> = sum_i c_i (v_k[i] v_l[i+1] + v_k[i+1] v_l[i]),
 * and d_z = d cos theta.  The diagonal is the induced dipole (Hellmann-Feynman); the
 * off-diagonal elements are the transition dipoles that couple pair states, e.g.
 * |1,0>|1,0> to |0,0>|2,0> in dc-field shielding.  Each eigenvector's sign is fixed so
 * that its component on the field-free state it is named after, |J = |M| + k, M>, is
 * positive (the field-free limit then gives the textbook signs, all positive for M = 0).
 */
#include <math.h>
#include <stdlib.h>

#include "check_int.h"
#include "fields_int.h"

/* E/B of the `levels` lowest states of block m at reduced field x and their cos theta
 * matrix (levels x levels, row-major).  The eigenvectors of the converged solve are
 * recomputed here (cp_fields_solve keeps none). */
static cp_status dipoles_reduced(cp_fields_work *w, double x, int m, int levels,
                                 double *energy, double *cosm, int *basis_size)
{
    cp_status st = cp_fields_solve(w, x, m, levels, NULL, energy, NULL, basis_size);
    if (st != CP_OK)
        return st;
    int n = *basis_size;
    if (x == 0.0) {
        /* no field: the basis states themselves; cos theta couples J to J +- 1 only */
        for (int k = 0; k < levels; k++)
            for (int l = 0; l < levels; l++) {
                double j = abs(m) + (k < l ? k : l), jp = j + 1.0;
                cosm[k * levels + l] =
                    abs(k - l) == 1
                        ? sqrt((jp * jp - (double)m * m) / ((2.0 * j + 1.0) * (2.0 * j + 3.0)))
                        : 0.0;
            }
        return CP_OK;
    }
    double *vecs = malloc((size_t)levels * (size_t)n * sizeof *vecs);
    if (!vecs)
        return CP_ENOMEM;
    cp_fields_tri t = {n, w->diag, w->off, w->off2, x, 1e-290 * (1.0 + x * x)};
    for (int k = 0; k < levels; k++) {
        double *v = vecs + (size_t)k * (size_t)n;
        cp_fields_tri_vector(&t, energy[k], v, w->fwd, w->bwd);
        if (v[k] < 0.0)
            for (int i = 0; i < n; i++)
                v[i] = -v[i];
    }
    for (int k = 0; k < levels; k++)
        for (int l = k; l < levels; l++) {
            const double *a = vecs + (size_t)k * (size_t)n, *b = vecs + (size_t)l * (size_t)n;
            double c = 0.0;
            for (int i = 0; i + 1 < n; i++)
                c += w->coup[i] * (a[i] * b[i + 1] + a[i + 1] * b[i]);
            cosm[k * levels + l] = cosm[l * levels + k] = c;
        }
    free(vecs);
    return CP_OK;
}

cp_status cp_fields_dipole_matrix(const cp_fields_rotor *rotor, double field, int m, int levels,
                                  double *energy_hz, double *dipole, int *basis_size,
                                  cp_error *err)
{
    static const char ctx[] = "fields.dipole_matrix";
    double x = NAN;
    int n = 0;
    cp_fields_work *w = NULL;
    cp_status st = cp_fields_check_rotor(ctx, rotor, err);
    if (st == CP_OK)
        st = cp_fields_check_field(ctx, rotor, field, &x, err);
    if (st == CP_OK)
        st = cp_check_int_range(err, ctx, "levels", levels, 1, CP_FIELDS_MAX_DIPOLE_LEVELS);
    if (st == CP_OK)
        st = cp_check_int_range(err, ctx, "m", m, -CP_FIELDS_MAX_J,
                                CP_FIELDS_MAX_J - (levels - 1));
    if (st == CP_OK && abs(m) + levels - 1 > CP_FIELDS_MAX_J)
        st = cp_fail(err, CP_EINVAL, "%s: m %d with levels %d reaches J = %d; allowed J up to "
                     "%d", ctx, m, levels, abs(m) + levels - 1, CP_FIELDS_MAX_J);
    if (st == CP_OK) {
        w = cp_fields_work_alloc(cp_fields_basis_cap(x, levels), levels);
        if (!w)
            st = cp_fail(err, CP_ENOMEM, "%s: out of memory", ctx);
    }
    if (st == CP_OK) {
        st = dipoles_reduced(w, x, m, levels, w->energy, dipole, &n);
        if (st != CP_OK)
            st = cp_fail(err, st, "%s: the rotor diagonalisation failed at d F / B = %g (%s)",
                         ctx, x, cp_strerror(st));
    }
    if (st == CP_OK) {
        for (int k = 0; k < levels; k++) {
            if (energy_hz)
                energy_hz[k] = w->energy[k] * rotor->rot_const_hz;
            for (int l = 0; l < levels; l++)
                dipole[k * levels + l] *= rotor->dipole;
        }
    } else {
        int nl = levels >= 1 && levels <= CP_FIELDS_MAX_DIPOLE_LEVELS ? levels : 0;
        for (int k = 0; k < nl; k++) {
            if (energy_hz)
                energy_hz[k] = NAN;
            for (int l = 0; l < nl; l++)
                dipole[k * nl + l] = NAN;
        }
        n = 0;
    }
    cp_fields_work_free(w);
    if (basis_size)
        *basis_size = n;
    return st;
}

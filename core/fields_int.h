/*
 * Private helpers of the fields model: the rotor Hamiltonian in the |J, M> basis, a real
 * symmetric tridiagonal eigen solver for its lowest levels, and the workspace they share.
 * Not installed.
 */
#ifndef COLDPREP_FIELDS_INT_H
#define COLDPREP_FIELDS_INT_H

#include "coldprep/fields.h"
#include "fields_tri_int.h"

/* Scratch for one M block of `cap_levels` levels and a basis of up to `cap` states (the
 * basis arrays grow when the solve needs more; the level arrays stay in place); owned by
 * the caller of cp_fields_work_alloc, released with cp_fields_work_free (NULL is a no-op). */
typedef struct cp_fields_work {
    int cap, cap_levels;
    double *basis_block;   /* owns diag .. vec */
    double *diag;          /* J(J+1), J = |M| + i, i < cap + 1 */
    double *coup;          /* <J|cos theta|J+1>, i < cap (the last one couples the basis to
                              the first omitted level: the truncation estimate) */
    double *off, *off2;    /* -x coup and its square */
    double *fwd, *bwd, *vec; /* per basis state */
    double *lambda, *scale;  /* per level: the solver's own */
    double *energy, *cos_theta; /* per level: results for callers that keep no arrays */
    cp_fields_tri_scratch tri; /* per level */
} cp_fields_work;

cp_fields_work *cp_fields_work_alloc(int cap, int cap_levels);
void cp_fields_work_free(cp_fields_work *w);

/* The `levels` lowest eigenvalues (E/B, ascending) and <cos theta> of H/B = J(J+1)
 * - x cos(theta) in the block of projection m, with the basis chosen automatically
 * (cp_fields.h: tolerance).  energy[n], cos_theta[n] (may be NULL) for J = |m| + n;
 * *basis_size receives the size used.  Inputs already validated (0 <= x, |m| + levels - 1
 * <= CP_FIELDS_MAX_J).  If guess is non-NULL it holds starting values for the energies
 * (e.g. the previous point of a map, w->lambda); they only speed the solve up.  The basis
 * arrays are reallocated if the basis outgrows w->cap (CP_ENOMEM if that fails);
 * CP_ENOCONV if the basis would exceed CP_FIELDS_MAX_BASIS or the iteration fails (not
 * expected). */
cp_status cp_fields_solve(cp_fields_work *w, double x, int m, int levels, const double *guess,
                          double *energy, double *cos_theta, int *basis_size);

/* A basis capacity that usually holds the automatic basis at reduced field x for the
 * `levels` lowest levels of a block (so that a solve seldom reallocates). */
int cp_fields_basis_cap(double x, int levels);

/* Shared argument checks; context is "fields FUNCTION". */
cp_status cp_fields_check_rotor(const char *context, const cp_fields_rotor *rotor,
                                cp_error *err);
cp_status cp_fields_check_field(const char *context, const cp_fields_rotor *rotor, double field,
                                double *x, cp_error *err);
cp_status cp_fields_check_state(const char *context, int j, int m, cp_error *err);

#endif

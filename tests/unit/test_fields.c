/*
 * Polar molecules in fields: the rigid-rotor Stark energies against perturbation theory and
 * the pendular limit, the Hellmann-Feynman dipole against differenced energies, a Stark map
 * against a dense GSL diagonalisation in a basis twice as large, the dc-shielding crossing
 * against a bisection written here, the microwave-dressed single molecule against a 2 x 2
 * diagonalisation and the pair potential against a numerical diagonalisation of the
 * two-molecule Hamiltonian, the dipole matrix between Stark states against the dense
 * diagonalisation, the zero-field values and differenced energies, and bad input.
 */
#include <complex.h>
#include <float.h>
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdlib.h>
#include <string.h>

#include <cmocka.h>
#include <gsl/gsl_complex.h>
#include <gsl/gsl_complex_math.h>
#include <gsl/gsl_eigen.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_matrix.h>

#include "coldprep/consts.h"
#include "coldprep/fields.h"

#include "check_close.h"

/* 40K87Rb: d = 0.574 D, the dipole that goes with the quoted shielding field F_s = 12.5 kV/cm
 * (the species table holds the measured 0.566(17) D of Ni et al., Science 322, 231 (2008));
 * B/h = 1.1139 GHz (Ospelkaus et al., PRL 104, 030402 (2010)) [M]. */
static const cp_fields_rotor KRB = {0.574 * CP_DEBYE, 1.1139e9};

/* Reference: the `levels` lowest eigenvalues (ascending) and <cos theta> of J(J+1) -
 * x cos theta in the M = m block with a basis of n states, by GSL's dense symmetric
 * eigensolver (gsl_eigen_symmv), an independent method from the library's tridiagonal one. */
static void reference(double x, int m, int n, int levels, double *e, double *cth)
{
    gsl_matrix *h = gsl_matrix_calloc((size_t)n, (size_t)n);
    gsl_matrix *v = gsl_matrix_alloc((size_t)n, (size_t)n);
    gsl_vector *ev = gsl_vector_alloc((size_t)n);
    gsl_eigen_symmv_workspace *w = gsl_eigen_symmv_alloc((size_t)n);
    assert_non_null(h);
    assert_non_null(v);
    assert_non_null(ev);
    assert_non_null(w);
    int am = abs(m);
    double *c = malloc((size_t)n * sizeof *c);
    assert_non_null(c);
    for (int i = 0; i < n; i++) {
        double j = am + i;
        gsl_matrix_set(h, (size_t)i, (size_t)i, j * (j + 1));
        /* <J,M|cos theta|J+1,M> = sqrt(((J+1)^2 - M^2) / ((2J+1)(2J+3))) (Zare, Angular
         * Momentum (1988), Eq. for the rank-1 tensor C^1_0) */
        c[i] = sqrt(((j + 1) * (j + 1) - (double)m * m) / ((2 * j + 1) * (2 * j + 3)));
        if (i + 1 < n) {
            gsl_matrix_set(h, (size_t)i, (size_t)i + 1, -x * c[i]);
            gsl_matrix_set(h, (size_t)i + 1, (size_t)i, -x * c[i]);
        }
    }
    assert_int_equal(gsl_eigen_symmv(h, ev, v, w), GSL_SUCCESS);
    assert_int_equal(gsl_eigen_symmv_sort(ev, v, GSL_EIGEN_SORT_VAL_ASC), GSL_SUCCESS);
    for (int k = 0; k < levels; k++) {
        e[k] = gsl_vector_get(ev, (size_t)k);
        if (cth) {
            double s = 0;
            for (int i = 0; i + 1 < n; i++)
                s += 2 * gsl_matrix_get(v, (size_t)i, (size_t)k) *
                     gsl_matrix_get(v, (size_t)i + 1, (size_t)k) * c[i];
            cth[k] = s;
        }
    }
    free(c);
    gsl_eigen_symmv_free(w);
    gsl_vector_free(ev);
    gsl_matrix_free(v);
    gsl_matrix_free(h);
}

/* Second-order Stark shift of a linear rotor in units of x^2 B:
 * [J(J+1) - 3M^2] / [2 J(J+1)(2J-1)(2J+3)] for J > 0 and -1/6 for J = 0 (Townes &
 * Schawlow, Microwave Spectroscopy (McGraw-Hill, 1955), Ch. 10, Eq. 10-5 [M]; it gives
 * E(1,0) = 2B + x^2 B/10, E(1,+-1) = 2B - x^2 B/20). */
static double second_order(int j, int m)
{
    if (j == 0)
        return -1.0 / 6.0;
    double jj = j * (j + 1.0);
    return (jj - 3.0 * m * m) / (2.0 * jj * (2.0 * j - 1.0) * (2.0 * j + 3.0));
}

/* FLD-1: weak field.  E/B = J(J+1) + a2 x^2 + O(x^4) with a2 from second-order perturbation
 * theory (Townes & Schawlow, above); the fourth-order coefficients of these states are
 * below 0.1 (for J = 0 it is 11/1080 [M]), so |E/B - J(J+1) - a2 x^2| <= 0.1 x^4. */
static void test_weak_field(void **state)
{
    (void)state;
    const double xs[] = {1e-3, 1e-2, 5e-2};
    for (size_t i = 0; i < sizeof xs / sizeof xs[0]; i++) {
        double x = xs[i];
        for (int j = 0; j <= 5; j++)
            for (int m = -j; m <= j; m++) {
                double e, c;
                int n;
                assert_int_equal(cp_fields_stark_reduced(x, j, m, &e, &c, &n, NULL), CP_OK);
                assert_abs(e, j * (j + 1.0) + second_order(j, m) * x * x, 0.1 * x * x * x * x);
                /* induced dipole d_ind/d = -d(E/B)/dx = -2 a2 x + O(x^3) */
                assert_abs(c, -2.0 * second_order(j, m) * x, 0.4 * x * x * x);
            }
    }
    /* the three low-J checks in SI units: E(0,0) = -d^2F^2/(6B), E(1,0) = 2B +
     * d^2F^2/(10B), E(1,1) = 2B - d^2F^2/(20B) at 10 V/cm for KRb (x = 2.6e-3) */
    double f = 1000.0, b = KRB.rot_const_hz, x = KRB.dipole * f / (CP_H * b);
    cp_fields_stark_result r;
    assert_int_equal(cp_fields_stark(&KRB, f, 0, 0, &r, NULL), CP_OK);
    assert_rel(r.energy_hz, -x * x * b / 6.0, 1e-5);
    assert_rel(r.induced_dipole, KRB.dipole * x / 3.0, 1e-5); /* d^2 F / (3B) */
    assert_rel(r.reduced_field, x, 1e-14);
    assert_int_equal(cp_fields_stark(&KRB, f, 1, 0, &r, NULL), CP_OK);
    assert_abs(r.energy_hz, 2 * b + x * x * b / 10.0, 1e-3 * x * x * b);
    assert_int_equal(cp_fields_stark(&KRB, f, 1, -1, &r, NULL), CP_OK);
    assert_abs(r.energy_hz, 2 * b - x * x * b / 20.0, 1e-3 * x * x * b);
}

/* FLD-2: relative accuracy near zero energy.  At x = 1e-6 E(0,0)/B = -x^2/6 (1 + O(x^2)),
 * so the computed energy must agree with -x^2/6 to 1e-9 relative (the documented
 * tolerance) even though it is 1e-13 of the spectrum's scale; at x = 0 the field-free
 * levels J(J+1) exactly, zero dipole. */
static void test_tiny_field(void **state)
{
    (void)state;
    double e, c;
    int n;
    assert_int_equal(cp_fields_stark_reduced(1e-6, 0, 0, &e, &c, &n, NULL), CP_OK);
    assert_rel(e, -1e-12 / 6.0, 1e-9);
    assert_rel(c, 1e-6 / 3.0, 1e-9);
    for (int j = 0; j < 4; j++) {
        assert_int_equal(cp_fields_stark_reduced(0.0, j, j > 0 ? -1 : 0, &e, &c, &n, NULL),
                         CP_OK);
        assert_true(e == j * (j + 1.0));
        assert_true(c == 0.0);
    }
}

/* FLD-3: strong field.  The pendular (harmonic libration) limit E(0,0)/B -> -x + sqrt(2x)
 * - 1/2 + O(x^-1/2) (Friedrich & Herschbach, Nature 353, 412 (1991); Rost et al., PRL 68,
 * 1299 (1992) [M]); the remainder measured by the GSL reference at x = 1e4 is 4.4e-4 =
 * 0.044 / sqrt(x), so it must stay below 0.1 / sqrt(x).  The induced dipole, the derivative
 * of that limit, tends to d: 1 - d_ind/d = 1/sqrt(2x) + O(1/x). */
static void test_pendular_limit(void **state)
{
    (void)state;
    const double xs[] = {1e3, 1e4, CP_FIELDS_MAX_REDUCED_FIELD};
    for (size_t i = 0; i < sizeof xs / sizeof xs[0]; i++) {
        double x = xs[i], e, c;
        int n;
        assert_int_equal(cp_fields_stark_reduced(x, 0, 0, &e, &c, &n, NULL), CP_OK);
        assert_abs(e, -x + sqrt(2 * x) - 0.5, 0.1 / sqrt(x));
        assert_abs(c, 1.0 - 1.0 / sqrt(2 * x), 1.0 / x);
        assert_true(c < 1.0);
    }
    /* values from the reference diagonalisation at x = 1 and 5 (a second method, the
     * dense solver above with 40 states) */
    const double xr[] = {1.0, 5.0};
    for (int i = 0; i < 2; i++) {
        double e, c, er, cr;
        int n;
        assert_int_equal(cp_fields_stark_reduced(xr[i], 0, 0, &e, &c, &n, NULL), CP_OK);
        reference(xr[i], 0, 40, 1, &er, &cr);
        assert_rel(e, er, 1e-12);
        assert_rel(c, cr, 1e-10);
    }
}

/* FLD-4: the Hellmann-Feynman dipole equals -d(E/B)/dx from a central difference of
 * energies (h = 1e-4 x: truncation error ~ h^2 E''' ~ 1e-8 relative; rounding ~
 * 1e-16 E / h), a second, independent route to the same derivative. */
static void test_dipole_vs_difference(void **state)
{
    (void)state;
    const double xs[] = {0.3, 2.0, 7.5, 40.0, 900.0};
    for (size_t i = 0; i < sizeof xs / sizeof xs[0]; i++)
        for (int j = 0; j <= 3; j++)
            for (int m = 0; m <= j; m++) {
                double x = xs[i], h = 1e-4 * x, ep, em, e, c, dummy;
                int n;
                assert_int_equal(cp_fields_stark_reduced(x, j, m, &e, &c, &n, NULL), CP_OK);
                assert_int_equal(cp_fields_stark_reduced(x + h, j, m, &ep, &dummy, &n, NULL),
                                 CP_OK);
                assert_int_equal(cp_fields_stark_reduced(x - h, j, m, &em, &dummy, &n, NULL),
                                 CP_OK);
                double fd = -(ep - em) / (2 * h);
                assert_abs(c, fd, 1e-7 * (1 + fabs(c)) + 1e-14 * (fabs(e) + x) / h);
            }
}

/* FLD-5: a Stark map (200 fields x 10 levels, M = 0 and M = 1, up to 150 kV/cm for KRb,
 * x = 39) against the dense GSL reference in a basis twice the size the library reports:
 * energies to 1e-9 relative (the documented tolerance), dipoles to 1e-8 of d. */
static void test_stark_map_vs_reference(void **state)
{
    (void)state;
    enum { NF = 200, NL = 10 };
    static double fields[NF], e[NF * NL], dip[NF * NL];
    for (int i = 0; i < NF; i++)
        fields[i] = 1.5e7 * i / (NF - 1.0);
    for (int m = 0; m <= 1; m++) {
        int basis = 0;
        assert_int_equal(
            cp_fields_stark_map(&KRB, m, NL, fields, NF, e, dip, &basis, NULL), CP_OK);
        assert_true(basis >= NL && basis < 100);
        for (int i = 0; i < NF; i += 7) {
            double x = KRB.dipole * fields[i] / (CP_H * KRB.rot_const_hz);
            double er[NL], cr[NL];
            reference(x, m, 2 * basis, NL, er, cr);
            for (int k = 0; k < NL; k++) {
                double want = er[k] * KRB.rot_const_hz;
                assert_abs(e[i * NL + k], want, 1e-9 * fmax(fabs(want), 1e-3 * KRB.rot_const_hz));
                assert_abs(dip[i * NL + k] / KRB.dipole, cr[k], 1e-8);
            }
        }
        /* a map row equals the single-state call */
        cp_fields_stark_result r;
        assert_int_equal(cp_fields_stark(&KRB, fields[123], m + 4, m, &r, NULL), CP_OK);
        assert_rel(e[123 * NL + 4], r.energy_hz, 1e-12);
    }
    /* unordered fields and a NULL dipole array are allowed */
    double f2[3] = {5e6, 0.0, 2e6}, e2[3 * NL];
    assert_int_equal(cp_fields_stark_map(&KRB, 0, NL, f2, 3, e2, NULL, NULL, NULL), CP_OK);
    assert_true(e2[NL] == 0.0 && e2[NL + 1] == 2 * KRB.rot_const_hz);
}

/* FLD-6: highly excited and strong-field states converge: J = 40 at |M| = 3, J = 9 at
 * x = 1e5 and J = 60 at x = 3e4 (whose basis outgrows the first workspace), against the
 * reference with twice the basis. */
static void test_hard_states(void **state)
{
    (void)state;
    double e, c, er[61], cr[61];
    int n;
    assert_int_equal(cp_fields_stark_reduced(300.0, 40, 3, &e, &c, &n, NULL), CP_OK);
    reference(300.0, 3, 2 * n, 38, er, cr);
    assert_rel(e, er[37], 1e-10);
    assert_abs(c, cr[37], 1e-8);
    assert_int_equal(cp_fields_stark_reduced(1e5, 9, 0, &e, &c, &n, NULL), CP_OK);
    reference(1e5, 0, 2 * n, 10, er, cr);
    assert_rel(e, er[9], 1e-10);
    assert_abs(c, cr[9], 1e-8);
    assert_int_equal(cp_fields_stark_reduced(3e4, 60, -1, &e, &c, &n, NULL), CP_OK);
    assert_true(n > 200);
    reference(3e4, -1, 2 * n, 60, er, cr);
    assert_rel(e, er[59], 1e-10);
    assert_abs(c, cr[59], 1e-8);
}

/* The pair gap 2E(1,0) - E(0,0) - E(2,0) (units of B) from the reference solver. */
static double reference_gap(double x)
{
    double e[3];
    reference(x, 0, 40, 3, e, NULL);
    return 2 * e[1] - e[0] - e[2];
}

/* FLD-7: the dc-shielding crossing.  x_s by bisection on the reference gap (a method
 * written here) to 1e-10; KRb's F_s = x_s B/d is ~12.5 kV/cm (Gonzalez-Martinez, Bohn &
 * Quemener, PRA 96, 032718 (2017); Li et al., Nature Phys. 17, 1144 (2021), who shield KRb
 * near 12.5 kV/cm [M]; tolerance 1 %); F_s scales exactly as B/d. */
static void test_shielding(void **state)
{
    (void)state;
    double lo = 1.0, hi = 10.0;
    assert_true(reference_gap(lo) < 0 && reference_gap(hi) > 0);
    while (hi - lo > 1e-12) {
        double mid = 0.5 * (lo + hi);
        if (reference_gap(mid) < 0)
            lo = mid;
        else
            hi = mid;
    }
    double xs;
    assert_int_equal(cp_fields_shielding_reduced(&xs, NULL), CP_OK);
    assert_abs(xs, 0.5 * (lo + hi), 1e-10);
    assert_abs(xs, 3.244, 5e-4); /* x_s ~ 3.244, the value quoted in the trade [M] */
    double f, x2;
    assert_int_equal(cp_fields_shielding_field(&KRB, &f, &x2, NULL), CP_OK);
    assert_rel(f, 12.5e5, 0.01);
    assert_true(x2 == xs);
    cp_fields_rotor r2 = {KRB.dipole / 2, KRB.rot_const_hz * 3};
    double f2;
    assert_int_equal(cp_fields_shielding_field(&r2, &f2, NULL, NULL), CP_OK);
    assert_rel(f2, 6.0 * f, 1e-13);
    /* the gap changes sign at F_s: below -, above + */
    double g;
    assert_int_equal(cp_fields_shielding_gap(&KRB, 0.99 * f, &g, NULL), CP_OK);
    assert_true(g < 0);
    assert_int_equal(cp_fields_shielding_gap(&KRB, 1.01 * f, &g, NULL), CP_OK);
    assert_true(g > 0);
    assert_int_equal(cp_fields_shielding_gap(&KRB, 0.0, &g, NULL), CP_OK);
    assert_rel(g, -2.0 * KRB.rot_const_hz, 1e-15); /* 2(2B) - 0 - 6B */
    assert_int_equal(cp_fields_shielding_gap(&KRB, f, &g, NULL), CP_OK);
    assert_abs(g, 0.0, 1e-9 * KRB.rot_const_hz);
}

/* FLD-8: microwave, one molecule.  The dressed energies and mixing angle against GSL's
 * diagonalisation of the 2 x 2 rotating-frame Hamiltonian [[0, Omega/2], [Omega/2,
 * -Delta]]; the effective dipole d_eff = d / sqrt(12 (1 + (Delta/Omega)^2)) (Karman &
 * Hutson, PRL 121, 163401 (2018); Deng et al., PRL 130, 183001 (2023)): d/sqrt(12) at
 * resonance, d/sqrt(24) at Delta = Omega, d/sqrt(120) at Delta = 3 Omega. */
static void test_microwave_single(void **state)
{
    (void)state;
    const cp_fields_rotor nak = {2.72 * CP_DEBYE, 2.8217e9}; /* 23Na40K, species table [M] */
    const double om = 2 * CP_PI * 30e6;
    const double ratios[] = {0.0, 1.0, 3.0, 0.25};
    const double want_sq[] = {12.0, 24.0, 120.0, 12.75};
    for (int i = 0; i < 4; i++) {
        cp_fields_microwave_params p = {om, ratios[i] * om, 0.0};
        cp_fields_microwave_result r;
        assert_int_equal(cp_fields_microwave(&nak, &p, &r, NULL), CP_OK);
        assert_rel(r.effective_dipole, nak.dipole / sqrt(want_sq[i]), 1e-14);
        assert_rel(r.c3, r.effective_dipole * r.effective_dipole / (4 * CP_PI * CP_EPS0),
                   1e-14);
        assert_rel(r.delta_ratio + 1.0, ratios[i] + 1.0, 1e-15);
        gsl_matrix *h = gsl_matrix_alloc(2, 2), *v = gsl_matrix_alloc(2, 2);
        gsl_vector *ev = gsl_vector_alloc(2);
        gsl_eigen_symmv_workspace *w = gsl_eigen_symmv_alloc(2);
        gsl_matrix_set(h, 0, 0, 0.0);
        gsl_matrix_set(h, 0, 1, om / 2);
        gsl_matrix_set(h, 1, 0, om / 2);
        gsl_matrix_set(h, 1, 1, -p.detuning);
        assert_int_equal(gsl_eigen_symmv(h, ev, v, w), GSL_SUCCESS);
        gsl_eigen_symmv_sort(ev, v, GSL_EIGEN_SORT_VAL_ASC);
        assert_abs(r.upper_hz, gsl_vector_get(ev, 1) / (2 * CP_PI), 1e-6);
        assert_abs(r.lower_hz, gsl_vector_get(ev, 0) / (2 * CP_PI), 1e-6);
        assert_rel(r.splitting_hz, r.upper_hz - r.lower_hz, 1e-12);
        /* |+> = cos m |0> + sin m |a>: the |0> weight of the upper eigenvector */
        double u = gsl_matrix_get(v, 0, 1);
        assert_abs(cos(r.mixing_angle) * cos(r.mixing_angle), u * u, 1e-12);
        gsl_eigen_symmv_free(w);
        gsl_vector_free(ev);
        gsl_matrix_free(v);
        gsl_matrix_free(h);
    }
}

/* Spherical unit vectors e_q (q = -1, 0, 1 at index q + 1). */
static void spherical(double complex e[3][3])
{
    const double s = 1.0 / sqrt(2.0);
    double complex em[3] = {s, -I * s, 0}, e0[3] = {0, 0, 1}, ep[3] = {-s, -I * s, 0};
    for (int k = 0; k < 3; k++) {
        e[0][k] = em[k];
        e[1][k] = e0[k];
        e[2][k] = ep[k];
    }
}

/* FLD-9: the two-molecule potential against a numerical diagonalisation (a second method):
 * the 16 x 16 pair Hamiltonian in |J<=1, M>^2, rotating frame, H = h1 x 1 + 1 x h1 + V,
 * with the dipole matrices <1q|d|0,0> = (d/sqrt 3) e_q* built as Cartesian vectors and V =
 * [d1.d2 - 3 (d1.r)(d2.r)] / (4 pi eps0 r^3) kept only between pair states with equal
 * numbers of J = 1 excitations (rotating-wave approximation), diagonalised by
 * gsl_eigen_hermv.  At r where V / hbar Omega ~ 1e-3 the highest eigenvalue minus 2 E+ is
 * V3 + V6 + O(r^-9): the library's V3 + V6 must agree to 3e-3 of V6 (measured:
 * at most 7.5e-4, while the t6 term alone is 0.07 % to 100 % of V6 across these cases). */
static void test_microwave_pair(void **state)
{
    (void)state;
    const cp_fields_rotor mol = {2.72 * CP_DEBYE, 2.8217e9};
    const double om = 2 * CP_PI * 20e6;
    const double dets[] = {0.0, 0.7 * om, 2.5 * om};
    const double xis[] = {0.0, 0.2};
    double complex e[3][3];
    spherical(e);
    for (int id = 0; id < 3; id++)
        for (int ix = 0; ix < 2; ix++) {
            cp_fields_microwave_params p = {om, dets[id], xis[ix]};
            cp_fields_microwave_result r;
            assert_int_equal(cp_fields_microwave(&mol, &p, &r, NULL), CP_OK);
            /* single-molecule states: 0 = |0,0>, 1 + (q + 1) = |1,q> */
            double complex h1[4][4] = {{0}}, dvec[3][4][4] = {{{0}}};
            for (int q = 0; q < 3; q++)
                h1[1 + q][1 + q] = -CP_HBAR * p.detuning;
            h1[0][3] = h1[3][0] = CP_HBAR * om / 2 * cos(p.ellipticity); /* |1,1> */
            h1[0][1] = h1[1][0] = CP_HBAR * om / 2 * sin(p.ellipticity); /* |1,-1> */
            for (int q = 0; q < 3; q++)
                for (int k = 0; k < 3; k++) {
                    dvec[k][1 + q][0] = mol.dipole / sqrt(3.0) * conj(e[q][k]);
                    dvec[k][0][1 + q] = mol.dipole / sqrt(3.0) * e[q][k];
                }
            const double thetas[] = {0.0, 0.6, CP_PI / 2};
            const double phis[] = {0.0, 1.1};
            for (int it = 0; it < 3; it++)
                for (int ip = 0; ip < 2; ip++) {
                    double th = thetas[it], ph = phis[ip];
                    double rhat[3] = {sin(th) * cos(ph), sin(th) * sin(ph), cos(th)};
                    /* r where d^2 / (4 pi eps0 r^3) = 1e-3 hbar Omega_e */
                    double oe = hypot(om, p.detuning);
                    double rr = cbrt(mol.dipole * mol.dipole /
                                     (4 * CP_PI * CP_EPS0 * 1e-3 * CP_HBAR * oe));
                    double kdd = 1.0 / (4 * CP_PI * CP_EPS0 * rr * rr * rr);
                    gsl_matrix_complex *h = gsl_matrix_complex_calloc(16, 16);
                    for (int a1 = 0; a1 < 4; a1++)
                        for (int a2 = 0; a2 < 4; a2++)
                            for (int b1 = 0; b1 < 4; b1++)
                                for (int b2 = 0; b2 < 4; b2++) {
                                    double complex x = 0;
                                    if (a2 == b2)
                                        x += h1[a1][b1];
                                    if (a1 == b1)
                                        x += h1[a2][b2];
                                    int na = (a1 > 0) + (a2 > 0), nb = (b1 > 0) + (b2 > 0);
                                    if (na == nb) {
                                        double complex dd = 0, r1 = 0, r2 = 0;
                                        for (int k = 0; k < 3; k++) {
                                            dd += dvec[k][a1][b1] * dvec[k][a2][b2];
                                            r1 += dvec[k][a1][b1] * rhat[k];
                                            r2 += dvec[k][a2][b2] * rhat[k];
                                        }
                                        x += kdd * (dd - 3 * r1 * r2);
                                    }
                                    gsl_matrix_complex_set(h, (size_t)(4 * a1 + a2),
                                                           (size_t)(4 * b1 + b2),
                                                           gsl_complex_rect(creal(x), cimag(x)));
                                }
                    gsl_vector *ev = gsl_vector_alloc(16);
                    gsl_eigen_herm_workspace *w = gsl_eigen_herm_alloc(16);
                    assert_int_equal(gsl_eigen_herm(h, ev, w), GSL_SUCCESS);
                    double top = gsl_vector_max(ev);
                    gsl_eigen_herm_free(w);
                    gsl_vector_free(ev);
                    gsl_matrix_complex_free(h);
                    double v, v3;
                    assert_int_equal(cp_fields_microwave_potential(&r, rr, th, ph, &v, NULL),
                                     CP_OK);
                    /* V3 alone: the potential at r scaled so that V6 vanishes relative */
                    double st = sin(th);
                    double pp = 0.5 * st * st * (1 - sin(2 * p.ellipticity) * cos(2 * ph));
                    v3 = 2 * r.c3 * (1 - 3 * pp) / (rr * rr * rr);
                    double v6 = v - v3;
                    double numeric = top - 2 * CP_H * r.upper_hz;
                    assert_true(v6 > 0); /* the core repels */
                    assert_abs(numeric - v3, v6, 3e-3 * v6);
                }
        }
}

/* FLD-11: the dipole matrix between Stark states.  (a) Against GSL's dense eigensolver in
 * a basis of 60 states (an independent diagonalisation, the eigenvectors signed by the
 * same rule), <k|cos theta|l> = v_k^T C v_l with the Zare matrix elements written here:
 * within 1e-9 for M = 0 and 1, three and five levels, x = 0.3, 3.3 (near the shielding
 * crossing) and 40.  (b) Zero field: <0,0|cos theta|1,0> = 1/sqrt 3, <1,0|cos theta|2,0>
 * = 2/sqrt 15, diagonal zero (Zare, Angular Momentum (1988), C^1_0 matrix elements).
 * (c) The diagonal is -dE/dF: a central difference of cp_fields_stark energies (step
 * 1e-4 of the field), within 1e-7 d.  (d) Bad input: a negative field, 0 or 21 levels,
 * and |m| + levels - 1 beyond CP_FIELDS_MAX_J, with NaN outputs. */
static void reference_matrix(double x, int m, int n, int levels, double *mat)
{
    gsl_matrix *h = gsl_matrix_calloc((size_t)n, (size_t)n);
    gsl_matrix *v = gsl_matrix_alloc((size_t)n, (size_t)n);
    gsl_vector *ev = gsl_vector_alloc((size_t)n);
    gsl_eigen_symmv_workspace *w = gsl_eigen_symmv_alloc((size_t)n);
    double *c = malloc((size_t)n * sizeof *c);
    assert_true(h && v && ev && w && c);
    for (int i = 0; i < n; i++) {
        double j = abs(m) + i;
        gsl_matrix_set(h, (size_t)i, (size_t)i, j * (j + 1));
        c[i] = sqrt(((j + 1) * (j + 1) - (double)m * m) / ((2 * j + 1) * (2 * j + 3)));
        if (i + 1 < n) {
            gsl_matrix_set(h, (size_t)i, (size_t)i + 1, -x * c[i]);
            gsl_matrix_set(h, (size_t)i + 1, (size_t)i, -x * c[i]);
        }
    }
    assert_int_equal(gsl_eigen_symmv(h, ev, v, w), GSL_SUCCESS);
    assert_int_equal(gsl_eigen_symmv_sort(ev, v, GSL_EIGEN_SORT_VAL_ASC), GSL_SUCCESS);
    for (int k = 0; k < levels; k++)
        if (gsl_matrix_get(v, (size_t)k, (size_t)k) < 0) /* the sign rule of fields.h */
            for (int i = 0; i < n; i++)
                gsl_matrix_set(v, (size_t)i, (size_t)k, -gsl_matrix_get(v, (size_t)i, (size_t)k));
    for (int k = 0; k < levels; k++)
        for (int l = 0; l < levels; l++) {
            double sum = 0;
            for (int i = 0; i + 1 < n; i++)
                sum += c[i] * (gsl_matrix_get(v, (size_t)i, (size_t)k) *
                                   gsl_matrix_get(v, (size_t)i + 1, (size_t)l) +
                               gsl_matrix_get(v, (size_t)i + 1, (size_t)k) *
                                   gsl_matrix_get(v, (size_t)i, (size_t)l));
            mat[k * levels + l] = sum;
        }
    free(c);
    gsl_eigen_symmv_free(w);
    gsl_vector_free(ev);
    gsl_matrix_free(v);
    gsl_matrix_free(h);
}

static void test_dipole_matrix(void **state)
{
    (void)state;
    cp_error err;
    const double xs[] = {0.3, 3.3, 40.0};
    const int ms[] = {0, 1}, nl[] = {3, 5};
    double b_joule = CP_H * KRB.rot_const_hz;
    for (int a = 0; a < 3; a++)
        for (int b = 0; b < 2; b++)
            for (int q = 0; q < 2; q++) {
                int levels = nl[q];
                double got[25], want[25], e[5];
                double field = xs[a] * b_joule / KRB.dipole;
                int basis;
                assert_int_equal(cp_fields_dipole_matrix(&KRB, field, ms[b], levels, e, got,
                                                         &basis, &err), CP_OK);
                assert_true(basis > levels);
                reference_matrix(xs[a], ms[b], 60, levels, want);
                for (int k = 0; k < levels * levels; k++)
                    assert_abs(got[k] / KRB.dipole, want[k], 1e-9);
            }
    double d0[9];
    assert_int_equal(cp_fields_dipole_matrix(&KRB, 0.0, 0, 3, NULL, d0, NULL, &err), CP_OK);
    assert_abs(d0[1] / KRB.dipole, 1 / sqrt(3.0), 1e-15);
    assert_abs(d0[5] / KRB.dipole, 2 / sqrt(15.0), 1e-15);
    assert_abs(d0[2], 0.0, 0.0);
    for (int k = 0; k < 3; k++)
        assert_abs(d0[4 * k], 0.0, 0.0);
    /* (c) the diagonal against differenced energies near the shielding field */
    double f = 12.7e5, df = 1e-4 * f, dm[9];
    assert_int_equal(cp_fields_dipole_matrix(&KRB, f, 0, 3, NULL, dm, NULL, &err), CP_OK);
    for (int j = 0; j < 3; j++) {
        cp_fields_stark_result up, down;
        assert_int_equal(cp_fields_stark(&KRB, f + df, j, 0, &up, &err), CP_OK);
        assert_int_equal(cp_fields_stark(&KRB, f - df, j, 0, &down, &err), CP_OK);
        double diff = -CP_H * (up.energy_hz - down.energy_hz) / (2 * df);
        assert_abs(dm[4 * j] / KRB.dipole, diff / KRB.dipole, 1e-7);
    }
    /* (d) bad input */
    double out[9];
    assert_int_equal(cp_fields_dipole_matrix(&KRB, -1.0, 0, 3, NULL, out, NULL, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "field"));
    assert_true(isnan(out[0]) && isnan(out[8]));
    assert_int_equal(cp_fields_dipole_matrix(&KRB, 1e5, 0, 0, NULL, out, NULL, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "levels"));
    assert_int_equal(cp_fields_dipole_matrix(&KRB, 1e5, 0, CP_FIELDS_MAX_DIPOLE_LEVELS + 1, NULL,
                                             out, NULL, &err), CP_EINVAL);
    assert_int_equal(cp_fields_dipole_matrix(&KRB, 1e5, CP_FIELDS_MAX_J - 1, 3, NULL, out, NULL,
                                             &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "m"));
}

/* FLD-10: bad input gets CP_EINVAL, a message naming the parameter and its unit, and NaN
 * outputs. */
static void test_bad_input(void **state)
{
    (void)state;
    cp_error err;
    cp_fields_stark_result r;
    const double bad_fields[] = {-1.0, NAN, INFINITY, 2 * CP_FIELDS_MAX_FIELD};
    for (int i = 0; i < 4; i++) {
        assert_int_equal(cp_fields_stark(&KRB, bad_fields[i], 0, 0, &r, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "field"));
        assert_non_null(strstr(err.message, "V/m"));
        assert_true(isnan(r.energy_hz) && isnan(r.induced_dipole) && isnan(r.cos_theta));
    }
    /* a field allowed in V/m but beyond the reduced-field limit for a strong dipole */
    cp_fields_rotor big = {20 * CP_DEBYE, 1e7};
    assert_int_equal(cp_fields_stark(&big, 5e7, 0, 0, &r, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "d F / B"));
    const cp_fields_rotor bad_rotors[] = {{0.0, 1e9},        {NAN, 1e9},  {-CP_DEBYE, 1e9},
                                          {CP_DEBYE, 0.0},   {CP_DEBYE, NAN},
                                          {CP_DEBYE, 1e20},  {100 * CP_DEBYE, 1e9}};
    for (size_t i = 0; i < sizeof bad_rotors / sizeof bad_rotors[0]; i++) {
        assert_int_equal(cp_fields_stark(&bad_rotors[i], 1e5, 0, 0, &r, &err), CP_EINVAL);
        assert_true(strstr(err.message, "dipole") || strstr(err.message, "rot_const_hz"));
    }
    assert_int_equal(cp_fields_stark(NULL, 1e5, 0, 0, &r, &err), CP_EINVAL);
    assert_int_equal(cp_fields_stark(&KRB, 1e5, -1, 0, &r, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "j"));
    assert_int_equal(cp_fields_stark(&KRB, 1e5, 1, 2, &r, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "m"));
    assert_int_equal(cp_fields_stark(&KRB, 1e5, CP_FIELDS_MAX_J + 1, 0, &r, &err), CP_EINVAL);
    double d = 0, e = 0, c = 0, xs = 0;
    assert_int_equal(cp_fields_induced_dipole(KRB.dipole, KRB.rot_const_hz, -5, &d, &err),
                     CP_EINVAL);
    assert_true(isnan(d));
    assert_int_equal(cp_fields_stark_reduced(NAN, 0, 0, &e, &c, NULL, &err), CP_EINVAL);
    assert_true(isnan(e) && isnan(c));
    /* maps: a bad field anywhere poisons every output */
    double f[3] = {1e5, -2.0, 1e5}, out[6], dip[6];
    assert_int_equal(cp_fields_stark_map(&KRB, 0, 2, f, 3, out, dip, NULL, &err), CP_EINVAL);
    for (int i = 0; i < 6; i++)
        assert_true(isnan(out[i]) && isnan(dip[i]));
    assert_int_equal(cp_fields_stark_map(&KRB, 0, 0, f, 1, out, dip, NULL, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "levels"));
    assert_int_equal(cp_fields_stark_map(&KRB, 0, 2, f, 0, out, dip, NULL, &err), CP_EINVAL);
    assert_int_equal(cp_fields_stark_map(&KRB, CP_FIELDS_MAX_J, 2, f, 1, out, dip, NULL, &err),
                     CP_EINVAL);
    /* shielding field out of range for a nearly non-polar, fast rotor */
    cp_fields_rotor weak = {CP_FIELDS_MIN_DIPOLE, CP_FIELDS_MAX_ROT_CONST};
    assert_int_equal(cp_fields_shielding_field(&weak, &xs, NULL, &err), CP_EINVAL);
    assert_true(isnan(xs));
    assert_non_null(strstr(err.message, "shielding field"));
    /* microwave rules */
    const cp_fields_rotor nak = {2.72 * CP_DEBYE, 2.8217e9};
    cp_fields_microwave_result mw;
    const double om = 2 * CP_PI * 10e6;
    const cp_fields_microwave_params bad_mw[] = {
        {1.0, om, 0.0},         {-om, om, 0.0},        {NAN, om, 0.0},
        {om, -1.0, 0.0},        {om, NAN, 0.0},        {om, INFINITY, 0.0},
        {om, om, CP_FIELDS_MAX_ELLIPTICITY},           {om, om, -0.1},
        {om, om, NAN},          {1e12, om, 0.0},       {om, 1e12, 0.0}};
    const char *names[] = {"rabi",        "rabi",        "rabi",      "red",
                           "detuning",    "detuning",    "linear",    "ellipticity",
                           "ellipticity", "rabi",        "detuning"};
    for (size_t i = 0; i < sizeof bad_mw / sizeof bad_mw[0]; i++) {
        assert_int_equal(cp_fields_microwave(&nak, &bad_mw[i], &mw, &err), CP_EINVAL);
        if (!strstr(err.message, names[i]))
            fail_msg("case %zu: '%s' lacks '%s'", i, err.message, names[i]);
        assert_true(isnan(mw.effective_dipole) && isnan(mw.c6) && isnan(mw.upper_hz));
    }
    cp_fields_microwave_params ok = {om, om, 0.0};
    assert_int_equal(cp_fields_microwave(&nak, &ok, &mw, NULL), CP_OK);
    double v = 0;
    assert_int_equal(cp_fields_microwave_potential(&mw, 0.0, 0.0, 0.0, &v, &err), CP_EINVAL);
    assert_true(isnan(v));
    assert_non_null(strstr(err.message, "r 0 m"));
    assert_int_equal(cp_fields_microwave_potential(&mw, 1e-7, NAN, 0.0, &v, &err), CP_EINVAL);
    assert_int_equal(cp_fields_microwave_potential(NULL, 1e-7, 0, 0.0, &v, &err), CP_EINVAL);
    assert_int_equal(cp_fields_microwave_potential(&mw, 1e-60, 0.3, 0.0, &v, &err), CP_EINVAL);
    assert_true(isnan(v));
    assert_non_null(strstr(err.message, "too small"));
    /* the weakest dressing accepted still gives finite coefficients */
    cp_fields_microwave_params weakest = {CP_FIELDS_MIN_RABI, 0.1 * 2 * 2 * CP_PI * nak.rot_const_hz,
                                          0.0};
    assert_int_equal(cp_fields_microwave(&nak, &weakest, &mw, NULL), CP_OK);
    assert_true(isfinite(mw.c6) && isfinite(mw.c3) && mw.c6 > 0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_weak_field),
        cmocka_unit_test(test_tiny_field),
        cmocka_unit_test(test_pendular_limit),
        cmocka_unit_test(test_dipole_vs_difference),
        cmocka_unit_test(test_stark_map_vs_reference),
        cmocka_unit_test(test_hard_states),
        cmocka_unit_test(test_shielding),
        cmocka_unit_test(test_microwave_single),
        cmocka_unit_test(test_microwave_pair),
        cmocka_unit_test(test_dipole_matrix),
        cmocka_unit_test(test_bad_input),
    };
    gsl_set_error_handler_off();
    return cmocka_run_group_tests(tests, NULL, NULL);
}

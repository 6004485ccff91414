/*
 * Optical lattice model: band structure against GSL's Mathieu characteristic values and
 * the free-particle and harmonic limits, tunnelling against the free-particle Fourier
 * integral and the deep-lattice asymptotic formula, and bad input.
 */
#include <float.h>
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdlib.h>
#include <string.h>

#include <cmocka.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_sf_mathieu.h>

#include "coldprep/consts.h"
#include "coldprep/lattice.h"

static void assert_close(double got, double want, double abs_tol)
{
    if (!(fabs(got - want) <= abs_tol))
        fail_msg("got %.17g, want %.17g (difference %.3g > %.3g)", got, want, got - want,
                 abs_tol);
}

static void assert_rel(double got, double want, double tol)
{
    double rel = fabs(got - want) / fabs(want);
    if (!(rel <= tol))
        fail_msg("got %.17g, want %.17g (relative error %.3g > %.3g)", got, want, rel, tol);
}

static int cmp_double(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

/* Mathieu characteristic value a_r(qm) (even = 1) or b_r(qm) from GSL. */
static double mathieu(int even, int r, double qm)
{
    gsl_sf_result res;
    int st = even ? gsl_sf_mathieu_a_e(r, qm, &res) : gsl_sf_mathieu_b_e(r, qm, &res);
    assert_int_equal(st, GSL_SUCCESS);
    return res.val;
}

/* LAT-1: band edges against the Mathieu characteristic values.  With z = kx + pi/2,
 * -psi'' + V0 sin^2(kx) psi = E psi (in E_r, x in 1/k) becomes Mathieu's equation
 * y'' + (a - 2 qm cos 2z) y = 0 with qm = V0/4 and E = a + 2 qm (DLMF 28.2.1; mapping in
 * physics.md §6.1).  Period-pi solutions are the zone centre, period-2pi the zone edge, and
 * a0 < b1 < a1 < b2 < a2 < ...: band n at the centre is a_n (n even) or b_{n+1} (n odd),
 * at the edge b_{n+1} (n even) or a_n (n odd).  Reference: gsl_sf_mathieu_a / _b. */
static void test_edges_vs_gsl_mathieu(void **state)
{
    (void)state;
    gsl_set_error_handler_off();
    const double depths[] = {0.1, 0.3, 1.0, 2.0, 5.0, 10.0, 20.0, 35.0, 50.0, 75.0, 100.0};
    enum { NB = 8 };
    for (size_t d = 0; d < sizeof depths / sizeof depths[0]; d++) {
        double v0 = depths[d], qm = v0 / 4, e[2 * NB];
        int basis = 0;
        assert_int_equal(
            cp_lattice_band_energies(v0, NB, 0, 2, (const double[]){0.0, 1.0}, e, &basis, NULL),
            CP_OK);
        assert_true(basis > NB && basis % 2 == 1);
        for (int n = 0; n < NB; n++) {
            double centre = n % 2 == 0 ? mathieu(1, n, qm) : mathieu(0, n + 1, qm);
            double edge = n % 2 == 0 ? mathieu(0, n + 1, qm) : mathieu(1, n, qm);
            assert_close(e[n], centre + 2 * qm, 1e-9);
            assert_close(e[NB + n], edge + 2 * qm, 1e-9);
        }
    }
}

/* LAT-2: the automatic basis is converged: a basis 60 plane waves larger (an independent
 * truncation) changes no energy by more than 1e-10 E_r, at depths over the whole allowed
 * range and at generic quasimomenta, folded or not. */
static void test_basis_converged(void **state)
{
    (void)state;
    const double depths[] = {0.0, 0.05, 3.0, 40.0, 300.0, 2000.0, CP_LATTICE_MAX_DEPTH_ER};
    const double qs[] = {0.0, 0.137, -0.5, 0.91, 1.0, 3.3, -7.25};
    enum { NQ = 7, NB = 10 };
    for (size_t d = 0; d < sizeof depths / sizeof depths[0]; d++) {
        double e_auto[NQ * NB], e_big[NQ * NB];
        int basis = 0;
        assert_int_equal(cp_lattice_band_energies(depths[d], NB, 0, NQ, qs, e_auto, &basis, NULL),
                         CP_OK);
        assert_int_equal(cp_lattice_band_energies(depths[d], NB, basis + 60, NQ, qs, e_big, NULL,
                                                  NULL),
                         CP_OK);
        for (int i = 0; i < NQ * NB; i++)
            assert_close(e_auto[i], e_big[i], 1e-10);
        /* energies ascend within each quasimomentum, and E(q) = E(-q) = E(q + 2) */
        for (int i = 0; i < NQ; i++)
            for (int n = 1; n < NB; n++)
                assert_true(e_auto[i * NB + n] >= e_auto[i * NB + n - 1]);
        double pair[2 * NB];
        assert_int_equal(cp_lattice_band_energies(depths[d], NB, 0, 2,
                                                  (const double[]){0.75, -1.25}, pair, NULL,
                                                  NULL),
                         CP_OK);
        for (int n = 0; n < NB; n++)
            assert_close(pair[n], pair[NB + n], 1e-10);
    }
}

/* LAT-3: free-particle limit.  At V0 = 0 the bands are the folded parabolas
 * E = (q + 2 l)^2 sorted over integers l (Ashcroft and Mermin Ch. 9, empty lattice); at
 * V0 = 1e-6 E_r first-order perturbation theory shifts each by at most V0 (<V> = V0/2 plus
 * level repulsion of order V0/4 at the degeneracies). */
static void test_free_particle_limit(void **state)
{
    (void)state;
    const double qs[] = {0.0, 0.25, 0.5, 0.8, 1.0};
    enum { NQ = 5, NB = 9 };
    double e0[NQ * NB], e1[NQ * NB];
    assert_int_equal(cp_lattice_band_energies(0.0, NB, 0, NQ, qs, e0, NULL, NULL), CP_OK);
    assert_int_equal(cp_lattice_band_energies(1e-6, NB, 0, NQ, qs, e1, NULL, NULL), CP_OK);
    for (int i = 0; i < NQ; i++) {
        double free[21];
        for (int l = -10; l <= 10; l++)
            free[l + 10] = (qs[i] + 2 * l) * (qs[i] + 2 * l);
        qsort(free, 21, sizeof free[0], cmp_double);
        for (int n = 0; n < NB; n++) {
            assert_close(e0[i * NB + n], free[n], 1e-12);
            assert_close(e1[i * NB + n], free[n], 1e-6);
        }
    }
}

/* LAT-4: deep-lattice (harmonic) limit.  The gap between bands 0 and 1 tends to the
 * harmonic spacing 2 sqrt(V0 E_r) (physics.md §6.1), with the anharmonic correction -E_r
 * from the asymptotic expansion of the Mathieu values (DLMF 28.8.1 [M]:
 * a_r ~ -2h^2 + 2 s h - (s^2 + 1)/8 - (s^3 + 3 s)/(2^7 h) - (5 s^4 + 34 s^2 + 9)/(2^12 h^2),
 * h = sqrt(qm), s = 2 r + 1), which the lowest two band centres must match to the size of
 * the first omitted term, O(h^-3). */
static void test_harmonic_limit(void **state)
{
    (void)state;
    const double depths[] = {400.0, 2000.0, CP_LATTICE_MAX_DEPTH_ER};
    for (size_t d = 0; d < sizeof depths / sizeof depths[0]; d++) {
        double v0 = depths[d];
        double centre[2], edge[2], gap[1], width[2];
        cp_lattice_band_summary s = {2, 0, centre, edge, width, gap};
        assert_int_equal(cp_lattice_band_summary_compute(v0, &s, NULL), CP_OK);
        double hw = 2 * sqrt(v0);
        assert_rel(gap[0], hw, 1.0 / sqrt(v0)); /* harmonic: leading order */
        /* with the anharmonic shift; the next term is -1/(2 sqrt(V0)) */
        assert_close(gap[0], hw - 1.0, 1.0 / sqrt(v0));
        double h = sqrt(v0 / 4);
        for (int r = 0; r < 2; r++) {
            double sr = 2 * r + 1;
            double a = -2 * h * h + 2 * sr * h - (sr * sr + 1) / 8 -
                       (sr * sr * sr + 3 * sr) / (128 * h) -
                       (5 * pow(sr, 4) + 34 * sr * sr + 9) / (4096 * h * h);
            assert_close(centre[r], a + 2 * h * h, 20.0 / (h * h * h));
        }
    }
}

/* LAT-5: tunnelling against the deep-lattice asymptotic formula of W. Zwerger, J. Opt. B 5,
 * S9 (2003): J/E_r ~ (4/sqrt(pi)) s^(3/4) exp(-2 sqrt(s)), s = V0/E_r.  Its overestimate
 * relative to the exact J is tabulated in physics.md §6.1 [C]: +58 % at 1 E_r, +31 % at 5,
 * +19 % at 10, +12 % at 20, +8 % at 40; checked here to +-1 percentage point. */
static void test_tunnelling_asymptotic(void **state)
{
    (void)state;
    const struct {
        double depth, excess;
    } table[] = {{1, 0.58}, {5, 0.31}, {10, 0.19}, {20, 0.12}, {40, 0.08}};
    for (size_t i = 0; i < sizeof table / sizeof table[0]; i++) {
        double s = table[i].depth, j1, j2, mean, err;
        assert_int_equal(cp_lattice_tunnelling(s, 0, &j1, &j2, &mean, &err, NULL), CP_OK);
        double asym = 4 / sqrt(CP_PI) * pow(s, 0.75) * exp(-2 * sqrt(s));
        double centre[1], edge[1], width[1];
        cp_lattice_band_summary sum = {1, 0, centre, edge, width, NULL};
        assert_int_equal(cp_lattice_band_summary_compute(s, &sum, NULL), CP_OK);
        /* the table is relative to width/4, the exact J of a nearest-neighbour band */
        assert_close(asym / (width[0] / 4) - 1, table[i].excess, 0.01);
        assert_true(err < 1e-10);
        /* deep enough for J2 << J1, the Fourier J1 and width/4 agree to J2-sized terms */
        if (s >= 10)
            assert_close(j1, width[0] / 4, 4 * fabs(j2) + 1e-12);
        /* mean of the band lies between its edges */
        assert_true(mean > centre[0] && mean < edge[0]);
    }
}

/* LAT-6: free-particle Fourier components, by hand: for E = (theta/pi)^2 on [0, pi],
 * J1 = -(1/pi) int (theta/pi)^2 cos(theta) = 2/pi^2 and
 * J2 = -(1/pi) int (theta/pi)^2 cos(2 theta) = -1/(2 pi^2); a lattice of 1e-3 E_r changes
 * them by O(V0).  Band 1 (E = (2 - theta/pi)^2): J1 = -(1/pi) int (2 - t/pi)^2 cos t
 * = -6/pi^2 (the sign flips), J2 = -1/(2 pi^2) again; checked at 0.1 E_r, where the
 * second-order gap at the zone centre is already wide enough for the quadrature. */
static void test_tunnelling_free_limit(void **state)
{
    (void)state;
    double j1, j2;
    assert_int_equal(cp_lattice_tunnelling(1e-3, 0, &j1, &j2, NULL, NULL, NULL), CP_OK);
    assert_close(j1, 2 / (CP_PI * CP_PI), 1e-3);
    assert_close(j2, -1 / (2 * CP_PI * CP_PI), 1e-3);
    assert_int_equal(cp_lattice_tunnelling(0.1, 1, &j1, &j2, NULL, NULL, NULL), CP_OK);
    assert_close(j1, -6 / (CP_PI * CP_PI), 1e-3);
    assert_close(j2, -1 / (2 * CP_PI * CP_PI), 1e-3);
}

/* LAT-7: bad input gets CP_EINVAL, a message naming the parameter, and NaN outputs. */
static void test_band_bad_input(void **state)
{
    (void)state;
    cp_error err;
    double e[4] = {0, 0, 0, 0};
    const double q[2] = {0.0, 0.5};
    int basis = 7;
    const double bad_depth[] = {NAN, INFINITY, -INFINITY, -1.0, 1e5};
    for (size_t i = 0; i < sizeof bad_depth / sizeof bad_depth[0]; i++) {
        assert_int_equal(cp_lattice_band_energies(bad_depth[i], 2, 0, 2, q, e, &basis, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "depth"));
        assert_non_null(strstr(err.message, "E_r"));
        assert_true(isnan(e[0]) && isnan(e[3]));
        assert_int_equal(basis, 0);
    }
    const int bad_bands[] = {0, -3, CP_LATTICE_MAX_BANDS + 1};
    for (size_t i = 0; i < 3; i++) {
        assert_int_equal(cp_lattice_band_energies(5, bad_bands[i], 0, 1, q, e, NULL, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "bands"));
    }
    const int bad_basis[] = {2, 4, 8, CP_LATTICE_MAX_BASIS + 2, -1};
    for (size_t i = 0; i < 5; i++) {
        assert_int_equal(cp_lattice_band_energies(5, 2, bad_basis[i], 2, q, e, NULL, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "basis size"));
        assert_true(isnan(e[0]));
    }
    assert_int_equal(cp_lattice_band_energies(5, 2, 0, 2, (const double[]){0.0, NAN}, e, NULL,
                                              &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "quasimomentum"));
    assert_int_equal(cp_lattice_band_energies(5, 2, 0, 0, q, e, NULL, &err), CP_EINVAL);
    assert_int_equal(cp_lattice_band_energies(5, 2, 0, 1, NULL, e, NULL, &err), CP_EINVAL);
    assert_int_equal(cp_lattice_basis_size(5, 0, &basis, &err), CP_EINVAL);
    assert_int_equal(basis, 0);

    double j1 = 0, j2 = 0;
    assert_int_equal(cp_lattice_tunnelling(0.0, 0, &j1, &j2, NULL, NULL, &err), CP_EINVAL);
    assert_true(isnan(j1) && isnan(j2));
    assert_int_equal(cp_lattice_tunnelling(5, -1, &j1, NULL, NULL, NULL, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "band"));

    double c[2], ed[2], w[2];
    cp_lattice_band_summary s = {2, 0, c, ed, w, NULL}; /* gap array missing */
    assert_int_equal(cp_lattice_band_summary_compute(5, &s, &err), CP_EINVAL);
    assert_true(isnan(c[0]) && isnan(w[1]));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_edges_vs_gsl_mathieu),
        cmocka_unit_test(test_basis_converged),
        cmocka_unit_test(test_free_particle_limit),
        cmocka_unit_test(test_harmonic_limit),
        cmocka_unit_test(test_tunnelling_asymptotic),
        cmocka_unit_test(test_tunnelling_free_limit),
        cmocka_unit_test(test_band_bad_input),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

/*
 * Feshbach model: each check compares with something outside the code under test — a
 * hand-worked formula, GSL special functions, an independent numerical method (GSL ODE
 * solvers and quadrature), or a published value (named, "[M]" where recalled from memory).
 * Test ids FB-n.  The last tests feed every argument NaN, +-inf, 0, negative and absurd
 * values.
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
#include <gsl/gsl_integration.h>
#include <gsl/gsl_odeiv2.h>
#include <gsl/gsl_rng.h>
#include <gsl/gsl_sf_gamma.h>

#include "coldprep/consts.h"
#include "coldprep/feshbach.h"
#include "coldprep/species.h"
#include "feshbach_int.h"

#include "check_close.h"

#define GAUSS 1e-4

/* 40K |9/2,-9/2> + 87Rb |1,1> at 546.7 G as in the built-in table ([M] values). */
static cp_feshbach_resonance krb(void)
{
    cp_feshbach_resonance r = {546.7 * GAUSS, -3.04 * GAUSS, -187.0 * CP_A0, 2.3 * CP_MUB,
                               4274.0};
    return r;
}

static double mu_krb(void)
{
    return cp_reduced_mass(39.963998165 * CP_AMU, 86.909180529 * CP_AMU);
}

/* FB-1: a(B) = abg (1 - Delta/(B - B0)): zero crossing at B0 + Delta, a = 2 abg at
 * B0 - Delta, a -> abg far away (hand evaluation of the formula, Chin et al. RMP 82, 1225
 * (2010) Eq. (1) [M]); the pole is an error, not an infinity. */
static void test_scattering_length(void **state)
{
    (void)state;
    cp_feshbach_resonance r = krb();
    double a;
    cp_error err;
    assert_int_equal(cp_feshbach_scattering_length(&r, r.b0 + r.width, &a, NULL), CP_OK);
    assert_abs(a, 0.0, 1e-12 * fabs(r.abg));
    assert_int_equal(cp_feshbach_scattering_length(&r, r.b0 - r.width, &a, NULL), CP_OK);
    assert_rel(a, 2.0 * r.abg, 1e-12);
    assert_int_equal(cp_feshbach_scattering_length(&r, 10.0 * r.b0, &a, NULL), CP_OK);
    assert_rel(a, r.abg * (1.0 - r.width / (9.0 * r.b0)), 1e-14);
    /* molecular side B < B0: a large and positive near the pole */
    assert_int_equal(cp_feshbach_scattering_length(&r, r.b0 - 0.01 * GAUSS, &a, NULL), CP_OK);
    assert_rel(a, r.abg * (1.0 - r.width / (-0.01 * GAUSS)), 1e-9);
    assert_true(a > 1e4 * CP_A0);
    /* exactly at the pole */
    assert_int_equal(cp_feshbach_scattering_length(&r, r.b0, &a, &err), CP_EINVAL);
    assert_true(isnan(a));
    assert_non_null(strstr(err.message, "field"));
    assert_non_null(strstr(err.message, "b0"));
}

/* FB-2: mean scattering length.  The prefactor 2 pi / Gamma(1/4)^2 from GSL's gamma
 * function; published values (Chin et al. RMP 2010 Table I [M]): R_vdW(87Rb) = 82.6 a0 with
 * C6 = 4698 a.u. (Derevianko et al. [M]), abar = 0.955978 R_vdW (Gribakin & Flambaum, PRA 48, 546 (1993)). */
static void test_mean_scattering_length(void **state)
{
    (void)state;
    double abar, mu = 86.909180529 * CP_AMU / 2.0, c6 = 4698.0;
    assert_int_equal(cp_feshbach_mean_scattering_length(c6, mu, &abar, NULL), CP_OK);
    double g = gsl_sf_gamma(0.25);
    double want = 2.0 * M_PI / (g * g) * pow(2.0 * mu * c6 * CP_AU_C6 / (CP_HBAR * CP_HBAR),
                                             0.25);
    assert_rel(abar, want, 1e-13);
    assert_rel(abar / 0.955978 / CP_A0, 82.6, 5e-3); /* [M] */
}

/* FB-3: resonance strength s_res = abar/R* against the values listed in Chin et al. RMP
 * 2010 Table IV [M]: 6Li 832 G (Delta -300 G, abg -1405 a0, dmu 2.0 muB, s_res 59) and 40K
 * 202.1 G (Delta 7.8 G, abg 174 a0, dmu 1.68 muB, s_res 2.2); C6 (Li2) 1389, (K2) 3897 a.u.
 * [M]. */
static void test_resonance_strength_published(void **state)
{
    (void)state;
    cp_feshbach_binding out;
    cp_feshbach_resonance li = {832.2 * GAUSS, -300.0 * GAUSS, -1405.0 * CP_A0, 2.0 * CP_MUB,
                                1389.0};
    double mli = 6.01512288742 * CP_AMU / 2.0;
    assert_int_equal(cp_feshbach_binding_energy(&li, mli, 800.0 * GAUSS, CP_FESHBACH_AUTO, &out,
                                                NULL), CP_OK);
    assert_rel(out.s_res, 59.0, 0.05);
    cp_feshbach_resonance k = {202.1 * GAUSS, 7.8 * GAUSS, 174.0 * CP_A0, 1.68 * CP_MUB, 3897.0};
    double mk = 39.963998165 * CP_AMU / 2.0;
    assert_int_equal(cp_feshbach_binding_energy(&k, mk, 201.0 * GAUSS, CP_FESHBACH_AUTO, &out,
                                                NULL), CP_OK);
    assert_rel(out.s_res, 2.2, 0.05);
    /* abar of the 40K-87Rb pair from the built-in table's c6_au: 68.8 a0 (Chin et al. RMP
     * 2010 [M]) */
    const cp_resonance *res;
    assert_int_equal(cp_species_resonance("KRb", 0, &res, NULL), CP_OK);
    cp_feshbach_resonance r = {res->b0, res->width, res->abg, res->dmu, res->c6_au};
    assert_int_equal(cp_feshbach_binding_energy(&r, mu_krb(), 546.0 * GAUSS, CP_FESHBACH_AUTO,
                                                &out, NULL), CP_OK);
    assert_rel(out.abar / CP_A0, 68.8, 0.01);
}

/* FB-4b: validity flags of the binding energy, each with one case inside and one outside
 * its range.  40K87Rb 546.7 G (Delta -3.04 G, abg -187 a0: a = abg (1 + Delta/(B0 - B)),
 * zero crossing at B0 + Delta = 543.66 G, hand algebra; abar = 68.8 a0, s_res > 1): near
 * the pole (546.6 G) no flag; at 544.0 G a = 23.5 a0 lies between 0 and abar (below_abar,
 * and auto picks the linear form on this broad resonance: linear_broad); at 540 G a < 0
 * (past_zero_crossing).  A narrow resonance (s_res << 1, the 87Rb133Cs-like one below)
 * far from its pole uses the linear form where it belongs: no flag (its C6 5700 a.u. [M]
 * only makes abar and s_res defined). */
static void test_binding_flags(void **state)
{
    (void)state;
    cp_feshbach_resonance r = krb();
    double mu = mu_krb();
    cp_feshbach_binding c;
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 546.6 * GAUSS, CP_FESHBACH_AUTO, &c,
                                                NULL), CP_OK);
    assert_int_equal(c.flags, 0);
    assert_true(c.s_res > 1.0);
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 544.0 * GAUSS, CP_FESHBACH_AUTO, &c,
                                                NULL), CP_OK);
    assert_rel(c.a / CP_A0, -187.0 * (1.0 - 3.04 / 2.7), 1e-9);
    assert_int_equal(c.flags, CP_FESHBACH_FLAG_BELOW_ABAR | CP_FESHBACH_FLAG_LINEAR_BROAD);
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 540.0 * GAUSS, CP_FESHBACH_AUTO, &c,
                                                NULL), CP_OK);
    assert_true(c.flags & CP_FESHBACH_FLAG_PAST_ZERO);
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 545.0 * GAUSS, CP_FESHBACH_AUTO, &c,
                                                NULL), CP_OK);
    assert_false(c.flags & CP_FESHBACH_FLAG_PAST_ZERO);
    cp_feshbach_resonance narrow = {197.1 * GAUSS, 0.0006 * GAUSS, 650.0 * CP_A0, 2.0 * CP_MUB,
                                    5700.0};
    double m2 = cp_reduced_mass(86.9 * CP_AMU, 132.9 * CP_AMU);
    assert_int_equal(cp_feshbach_binding_energy(&narrow, m2, 196.0 * GAUSS, CP_FESHBACH_AUTO, &c,
                                                NULL), CP_OK);
    assert_int_equal(c.model, CP_FESHBACH_LINEAR);
    assert_true(c.s_res < 1.0);
    assert_int_equal(c.flags, 0);
    /* the linear form forced near the pole of the broad resonance */
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 546.6 * GAUSS, CP_FESHBACH_LINEAR, &c,
                                                NULL), CP_OK);
    assert_int_equal(c.flags, CP_FESHBACH_FLAG_LINEAR_BROAD);
}

/* FB-4: binding energy.  Universal form hbar^2/(2 mu a^2) evaluated by hand; the corrected
 * form converges to it as a >> abar (ratio 1 + 2 abar/a + ...); far from resonance the auto
 * choice is the closed-channel line dmu |B - B0|; forced models outside their domain and
 * fields on the atomic side are errors. */
static void test_binding_energy(void **state)
{
    (void)state;
    cp_feshbach_resonance r = krb();
    double mu = mu_krb();
    cp_feshbach_binding u, c;
    cp_error err;
    double prev = INFINITY;
    for (double d = 0.3; d >= 1e-3; d /= 3.0) {
        double b = r.b0 - d * GAUSS;
        assert_int_equal(cp_feshbach_binding_energy(&r, mu, b, CP_FESHBACH_UNIVERSAL, &u, NULL),
                         CP_OK);
        assert_int_equal(cp_feshbach_binding_energy(&r, mu, b, CP_FESHBACH_CORRECTED, &c, NULL),
                         CP_OK);
        double a = r.abg * (1.0 - r.width / (b - r.b0));
        assert_rel(u.energy, CP_HBAR * CP_HBAR / (2.0 * mu * a * a), 1e-12);
        assert_int_equal(u.model, CP_FESHBACH_UNIVERSAL);
        double ratio = c.energy / u.energy - 1.0;
        /* (a/(a - abar))^2 - 1 = 2 abar/a + 3 (abar/a)^2 + ... */
        assert_rel(ratio, 2.0 * c.abar / a + 3.0 * pow(c.abar / a, 2), 4.0 * pow(c.abar / a, 2)
                   / (2.0 * c.abar / a));
        assert_true(ratio < prev); /* converges to the universal form */
        prev = ratio;
    }
    assert_true(prev < 0.01);
    /* far below: zero crossing at B0 + Delta = 543.66 G; at 540 G a < 0: linear */
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 540.0 * GAUSS, CP_FESHBACH_AUTO, &c,
                                                NULL), CP_OK);
    assert_int_equal(c.model, CP_FESHBACH_LINEAR);
    assert_rel(c.energy, r.dmu * 6.7 * GAUSS, 1e-9);
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 540.0 * GAUSS, CP_FESHBACH_UNIVERSAL, &c,
                                                &err), CP_EINVAL);
    assert_true(isnan(c.energy));
    assert_non_null(strstr(err.message, "linear"));
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 547.0 * GAUSS, CP_FESHBACH_AUTO, &c,
                                                &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "atomic side"));
    /* near the pole auto is the corrected form */
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 546.6 * GAUSS, CP_FESHBACH_AUTO, &c,
                                                NULL), CP_OK);
    assert_int_equal(c.model, CP_FESHBACH_CORRECTED);
    /* without C6: universal near the pole, corrected refused */
    r.c6_au = 0.0;
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 546.6 * GAUSS, CP_FESHBACH_AUTO, &c,
                                                NULL), CP_OK);
    assert_int_equal(c.model, CP_FESHBACH_UNIVERSAL);
    assert_true(isnan(c.abar));
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 546.6 * GAUSS, CP_FESHBACH_CORRECTED,
                                                &c, &err), CP_EINVAL);
    /* at a = R* (narrow-resonance crossover) the universal and linear forms meet: with the
     * near-pole a = abg Delta/(B0 - B) both equal 2 mu (abg dmu Delta)^2 / hbar^2 (hand) */
    cp_feshbach_resonance narrow = {197.1 * GAUSS, 0.0006 * GAUSS, 650.0 * CP_A0, 2.0 * CP_MUB,
                                    0.0};
    double m2 = cp_reduced_mass(86.9 * CP_AMU, 132.9 * CP_AMU);
    double rstar = CP_HBAR * CP_HBAR / (2.0 * m2 * narrow.abg * narrow.dmu * narrow.width);
    double det = narrow.abg * narrow.width / rstar; /* B0 - B where abg Delta/(B0-B) = R* */
    cp_feshbach_binding lin;
    assert_int_equal(cp_feshbach_binding_energy(&narrow, m2, narrow.b0 - det,
                                                CP_FESHBACH_LINEAR, &lin, NULL), CP_OK);
    double want = 2.0 * m2 * pow(narrow.abg * narrow.dmu * narrow.width / CP_HBAR, 2);
    assert_rel(lin.energy, want, 1e-9);
}

/* Two-level Landau–Zener Hamiltonian (hbar = 1, sweep rate v = 1, coupling g):
 * H = [[-t/2, g], [g, t/2]]; psi = (c1, c2) as 4 real components. */
static int lz_rhs(double t, const double y[], double dydt[], void *params)
{
    double g = *(const double *)params;
    /* i dc/dt = H c */
    double h11 = -0.5 * t, h22 = 0.5 * t;
    dydt[0] = h11 * y[1] + g * y[3];   /* Re c1' = Im(H c)_1 */
    dydt[1] = -(h11 * y[0] + g * y[2]);
    dydt[2] = g * y[1] + h22 * y[3];
    dydt[3] = -(g * y[0] + h22 * y[2]);
    return GSL_SUCCESS;
}

/* Lower adiabatic eigenvector of H at time t. */
static void lz_lower(double t, double g, double v[2])
{
    double e = sqrt(0.25 * t * t + g * g), x = g, y = 0.5 * t - e;
    double n = sqrt(x * x + y * y);
    v[0] = x / n;
    v[1] = y / n;
}

/* Adiabatic-passage probability after integrating from -T to T. */
static double lz_numeric(double delta, double T)
{
    double g = sqrt(delta), v[2], y[4];
    lz_lower(-T, g, v);
    y[0] = v[0];
    y[1] = 0.0;
    y[2] = v[1];
    y[3] = 0.0;
    gsl_odeiv2_system sys = {lz_rhs, NULL, 4, &g};
    gsl_odeiv2_driver *d = gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd, 1e-3,
                                                         1e-13, 1e-13);
    double t = -T;
    int st = gsl_odeiv2_driver_apply(d, &t, T, y);
    gsl_odeiv2_driver_free(d);
    assert_int_equal(st, GSL_SUCCESS);
    lz_lower(T, g, v);
    double re = v[0] * y[0] + v[1] * y[2], im = v[0] * y[1] + v[1] * y[3];
    return re * re + im * im;
}

/* FB-5: lz_probability against a direct integration of the two-level LZ Hamiltonian with
 * GSL's rk8pd (an independent method), delta = g^2/v from 1e-3 to 10, agreement 1e-6.
 * Finite-window control: the state starts in, and is projected on, the instantaneous
 * adiabatic eigenstate, so the tails add only the non-adiabatic amplitude ~ g/(v^2 T^3)
 * (~1e-7 at T = 300 for g <= sqrt(10)); the test also checks that doubling the window
 * (T = 150 -> 300) changes the result by less than 1e-6. */
static void test_lz_ode(void **state)
{
    (void)state;
    const double deltas[] = {1e-3, 1e-2, 0.05, 0.1, 0.3, 1.0, 3.0, 10.0};
    for (size_t i = 0; i < sizeof deltas / sizeof deltas[0]; i++) {
        double p, p300 = lz_numeric(deltas[i], 300.0), p150 = lz_numeric(deltas[i], 150.0);
        assert_int_equal(cp_feshbach_lz_probability(deltas[i], &p, NULL), CP_OK);
        assert_abs(p, p300, 1e-6);
        assert_abs(p300, p150, 1e-6);
    }
}

/* FB-6: ramp-rate law.  alpha = 4 pi^2 hbar / mu by hand; slow ramp -> P_max; fast ramp ->
 * P_max alpha n |abg Delta| / |Bdot| (first order of 1 - e^-x); batch = single calls;
 * a measured alpha overrides theory; only |Bdot| matters. */
static void test_ramp_law(void **state)
{
    (void)state;
    cp_feshbach_resonance r = krb();
    double mu = mu_krb(), alpha, eff, delta, eff2, delta2;
    assert_int_equal(cp_feshbach_alpha(mu, &alpha, NULL), CP_OK);
    assert_rel(alpha, 4.0 * M_PI * M_PI * 1.054571817e-34 / mu, 1e-9);
    cp_feshbach_ramp slow = {-1e-6, 1e18, 0.0, 0.8};
    assert_int_equal(cp_feshbach_associate(&r, mu, &slow, &eff, &delta, NULL), CP_OK);
    assert_rel(eff, 0.8, 1e-12);
    cp_feshbach_ramp fast = {1e6, 1e17, 0.0, 0.8};
    assert_int_equal(cp_feshbach_associate(&r, mu, &fast, &eff, &delta, NULL), CP_OK);
    double x = alpha * 1e17 * fabs(r.abg * r.width) / 1e6;
    assert_true(x < 1e-4);
    assert_rel(eff, 0.8 * x, x);
    assert_rel(2.0 * M_PI * delta, x, 1e-12);
    /* sign of the rate does not matter */
    fast.ramp_rate = -1e6;
    assert_int_equal(cp_feshbach_associate(&r, mu, &fast, &eff2, &delta2, NULL), CP_OK);
    assert_rel(eff2, eff, 1e-15);
    /* measured alpha replaces theory */
    cp_feshbach_ramp meas = {-100.0, 1e18, 1e-9, 1.0};
    assert_int_equal(cp_feshbach_associate(&r, mu, &meas, &eff, &delta, NULL), CP_OK);
    assert_rel(eff, 1.0 - exp(-1e-9 * 1e18 * fabs(r.abg * r.width) / 100.0), 1e-12);
    /* batch */
    double rates[7] = {-1e-3, 1e-2, -0.1, 1.0, 10.0, -100.0, 1e4}, out[7];
    double coef = alpha * 1e18 * fabs(r.abg * r.width);
    assert_int_equal(cp_feshbach_ramp_law(coef, 0.7, rates, out, 7, NULL), CP_OK);
    for (int i = 0; i < 7; i++) {
        cp_feshbach_ramp one = {rates[i], 1e18, 0.0, 0.7};
        assert_int_equal(cp_feshbach_associate(&r, mu, &one, &eff, &delta, NULL), CP_OK);
        assert_rel(out[i], eff, 1e-14);
    }
}

/* FB-7: two atoms in one harmonic site.  |psi_rel(0)|^2 written independently as the
 * product of three 1D oscillator ground-state densities sqrt(mu w_i / (pi hbar)), so the
 * site result equals the bulk law with n = |psi_rel(0)|^2 and the theoretical alpha. */
static void test_site(void **state)
{
    (void)state;
    cp_feshbach_resonance r = krb();
    double mu = mu_krb(), w[3] = {2 * M_PI * 40e3, 2 * M_PI * 50e3, 2 * M_PI * 60e3};
    double eff, delta, eff_b, delta_b;
    assert_int_equal(cp_feshbach_associate_site(&r, mu, -2e2, w, 0.9, &eff, &delta, NULL),
                     CP_OK);
    double psi2 = 1.0;
    for (int i = 0; i < 3; i++)
        psi2 *= sqrt(mu * w[i] / (M_PI * CP_HBAR));
    cp_feshbach_ramp bulk = {-2e2, psi2, 0.0, 0.9};
    assert_int_equal(cp_feshbach_associate(&r, mu, &bulk, &eff_b, &delta_b, NULL), CP_OK);
    assert_rel(delta, delta_b, 1e-12);
    assert_rel(eff, eff_b, 1e-12);
    assert_true(eff > 0.0 && eff < 0.9);
}

static cp_feshbach_cloud cloud(cp_feshbach_profile p, double n, double mass_u, double w)
{
    cp_feshbach_cloud c = {p, n, mass_u * CP_AMU, {w, w, w}, 0.0};
    return c;
}

/* FB-8: overlap density of thermal clouds.  Identical clouds: <n> = n0 / 2^(3/2) with
 * n0 = N / ((2 pi)^(3/2) sigma^3) (a Gaussian cloud, by hand).  Different species in one trap: the
 * sag difference g (1/w_b^2 - 1/w_a^2) and the closed form for displaced Gaussians; the
 * numerical quadrature (used for degenerate profiles) reproduces the closed form. */
static void test_overlap_thermal(void **state)
{
    (void)state;
    double t = 300e-9, w = 2 * M_PI * 100.0, n, sag;
    cp_feshbach_cloud a = cloud(CP_PROFILE_THERMAL, 1e5, 86.909180529, w);
    assert_int_equal(cp_feshbach_overlap_density(&a, &a, t, &n, &sag, NULL), CP_OK);
    double s = sqrt(CP_KB * t / (a.mass * w * w));
    double n0 = 1e5 / (pow(2 * M_PI, 1.5) * s * s * s);
    assert_rel(n, n0 / pow(2.0, 1.5), 1e-12);
    assert_abs(sag, 0.0, 1e-20);

    /* 40K in a tighter trap (w_b = 1.3 w; optical trap: w ~ sqrt(1/m)) */
    cp_feshbach_cloud b = cloud(CP_PROFILE_THERMAL, 3e4, 39.963998165, 1.3 * w);
    b.omega[0] = 1.1 * w; /* anisotropic */
    assert_int_equal(cp_feshbach_overlap_density(&a, &b, t, &n, &sag, NULL), CP_OK);
    double want_sag = -CP_G / (1.69 * w * w) + CP_G / (w * w);
    assert_rel(sag, want_sag, 1e-12);
    double prod = 1.0, sa2[3], sb2[3];
    for (int i = 0; i < 3; i++) {
        sa2[i] = CP_KB * t / (a.mass * a.omega[i] * a.omega[i]);
        sb2[i] = CP_KB * t / (b.mass * b.omega[i] * b.omega[i]);
        prod *= 2 * M_PI * (sa2[i] + sb2[i]);
    }
    double want = 1e5 / sqrt(prod) * exp(-want_sag * want_sag / (2 * (sa2[2] + sb2[2])));
    assert_rel(n, want, 1e-12);
    /* the sag cuts the overlap: compare with no gravity by hand (exp factor) */
    assert_true(n < 1e5 / sqrt(prod));

    /* both numerical paths against the closed form, with sag: the adaptive reference and
     * the fixed spherical rule (which must accept its own result here) */
    cp_cloud_state sa, sb;
    assert_int_equal(cp_cloud_prepare(&a, t, "test", "a", 1u, &sa, NULL), CP_OK);
    assert_int_equal(cp_cloud_prepare(&b, t, "test", "b", 1u, &sb, NULL), CP_OK);
    double num;
    assert_int_equal(cp_feshbach_overlap_adaptive(&sa, &sb, &num, NULL), CP_OK);
    assert_rel(num, want, 1e-6);
    assert_int_equal(cp_feshbach_overlap_fixed(&sa, &sb, &num), CP_OK);
    assert_rel(num, want, 1e-9);
    /* roles swapped: (1/N_a) Int n_a n_b = want N_b / N_a */
    assert_int_equal(cp_feshbach_overlap_fixed(&sb, &sa, &num), CP_OK);
    assert_rel(num, want * 3e4 / 1e5, 1e-9);
    /* a weak trap (large sag, 20 Hz): overlap cut by orders of magnitude, still matched */
    cp_feshbach_cloud a2 = cloud(CP_PROFILE_THERMAL, 1e5, 86.909180529, 2 * M_PI * 20.0);
    cp_feshbach_cloud b2 = cloud(CP_PROFILE_THERMAL, 1e5, 39.963998165, 2 * M_PI * 26.0);
    double n_far, n_near;
    assert_int_equal(cp_feshbach_overlap_density(&a2, &b2, 100e-9, &n_far, &sag, NULL), CP_OK);
    b2.omega[2] = a2.omega[2]; /* same vertical frequency: no differential sag */
    assert_int_equal(cp_feshbach_overlap_density(&a2, &b2, 100e-9, &n_near, &sag, NULL), CP_OK);
    assert_abs(sag, 0.0, 1e-18);
    assert_true(n_far < 1e-3 * n_near);
}

/* FB-9: degenerate profiles by quadrature.  Thomas–Fermi self-overlap = (4/7) n0 (hand:
 * Int (1-u)^2 / Int (1-u) over the unit ball = (8/105)/(2/15)); ideal Fermi gas: the LDA
 * profile seen by a much broader Gaussian gives N_a n_b(0)/N_b (normalisation through GSL's
 * F_1/2 vs the F_2 fugacity equation), at T/T_F = 20 it meets the Gaussian closed form, and
 * at T/T_F = tau = 0.01 the self-overlap is the T = 0 value (4608 / (2835 pi)) n0(T=0),
 * n0 = (2 m E_F / hbar^2)^(3/2) / (6 pi^2) (hand, Butts & Rokhsar 1997 [M]), times the
 * Sommerfeld correction 1 - (27 pi^2 / 32) tau^2 (derived by hand: with E_F = 1, positions
 * weighted by sqrt(V) dV, the local density n = h0 * K, h0 = (2/3) x^(3/2) smeared by the
 * thermal kernel K = -f' of variance pi^2 tau^2 / 3, so Int n^2 ~ mu^(9/2) 128/2835
 * + (pi^2 tau^2 / 3) (4/45) mu^(5/2) at fixed N, mu^3 + pi^2 tau^2 mu = 1; the remainder is
 * O(tau^4 ln tau), ~2e-6 here). */
static void test_overlap_degenerate(void **state)
{
    (void)state;
    double w = 2 * M_PI * 100.0, n, sag;
    cp_feshbach_cloud tf = cloud(CP_PROFILE_THOMAS_FERMI, 1e5, 86.909180529, w);
    tf.scattering_length = 100.0 * CP_A0;
    tf.omega[2] = 3.0 * w; /* anisotropic */
    assert_int_equal(cp_feshbach_overlap_density(&tf, &tf, 0.0, &n, &sag, NULL), CP_OK);
    cp_cloud_state s;
    assert_int_equal(cp_cloud_prepare(&tf, 0.0, "t", "a", 1u << CP_PROFILE_THOMAS_FERMI, &s,
                                      NULL), CP_OK);
    double n0 = 15.0 * 1e5 / (8 * M_PI * s.radius[0] * s.radius[1] * s.radius[2]);
    assert_rel(n, 4.0 / 7.0 * n0, 1e-9);
    /* n0 = mu / g (Dalfovo et al. 1999 [M]) */
    assert_rel(n0, s.mu_tf * tf.mass / (4 * M_PI * CP_HBAR * CP_HBAR * tf.scattering_length),
               1e-9);

    /* Fermi normalisation: a tight degenerate cloud (2 pi x 5 kHz, T/T_F ~ 0.5) inside a
     * broad Gaussian (2 pi x 50 Hz) sees n_b at its own centre, displaced by the sag */
    double t = 10e-6;
    cp_feshbach_cloud f = cloud(CP_PROFILE_FERMI, 1e5, 39.963998165, 2 * M_PI * 5e3);
    cp_feshbach_cloud wide = cloud(CP_PROFILE_THERMAL, 1e5, 39.963998165, 2 * M_PI * 50.0);
    assert_int_equal(cp_feshbach_overlap_density(&f, &wide, t, &n, &sag, NULL), CP_OK);
    double sb = sqrt(CP_KB * t / (wide.mass * wide.omega[0] * wide.omega[0]));
    assert_rel(n, 1e5 / (pow(2 * M_PI, 1.5) * sb * sb * sb) * exp(-sag * sag / (2 * sb * sb)),
               2e-3);
    assert_true(sag < -0.5 * sb); /* the sag matters here */

    /* classical limit: at T/T_F = 20 (fugacity ~ 2e-5) the Fermi–Dirac profile is the
     * Boltzmann Gaussian up to O(z / 2^(3/2)), so the quadrature meets the closed form */
    cp_feshbach_cloud hot = cloud(CP_PROFILE_FERMI, 1e3, 39.963998165, w);
    cp_feshbach_cloud rb = cloud(CP_PROFILE_THERMAL, 1e5, 86.909180529, 0.8 * w);
    double thot = 20.0 * CP_HBAR * w * cbrt(6e3) / CP_KB, n_cl;
    assert_int_equal(cp_feshbach_overlap_density(&rb, &hot, thot, &n, &sag, NULL), CP_OK);
    hot.profile = CP_PROFILE_THERMAL;
    assert_int_equal(cp_feshbach_overlap_density(&rb, &hot, thot, &n_cl, &sag, NULL), CP_OK);
    assert_rel(n, n_cl, 1e-4);

    /* Fermi at T/T_F = 0.01 vs T = 0 with the Sommerfeld correction */
    cp_feshbach_cloud g = cloud(CP_PROFILE_FERMI, 1e5, 39.963998165, w);
    double ef = CP_HBAR * w * cbrt(6e5), tau = 0.01;
    assert_int_equal(cp_feshbach_overlap_density(&g, &g, tau * ef / CP_KB, &n, &sag, NULL),
                     CP_OK);
    double n00 = pow(2 * g.mass * ef / (CP_HBAR * CP_HBAR), 1.5) / (6 * M_PI * M_PI);
    assert_rel(n, 4608.0 / (2835.0 * M_PI) * n00 * (1.0 - 27.0 * M_PI * M_PI / 32.0 * tau * tau),
               1e-5);
}

/* Prepared states of two clouds for the overlap checks. */
static void prepare_pair(const cp_feshbach_cloud *a, const cp_feshbach_cloud *b, double t,
                         cp_cloud_state *sa, cp_cloud_state *sb)
{
    const unsigned all = (1u << CP_PROFILE_THERMAL) | (1u << CP_PROFILE_FERMI) |
                         (1u << CP_PROFILE_BOSE) | (1u << CP_PROFILE_THOMAS_FERMI);
    assert_int_equal(cp_cloud_prepare(a, t, "test", "a", all, sa, NULL), CP_OK);
    assert_int_equal(cp_cloud_prepare(b, t, "test", "b", all, sb, NULL), CP_OK);
}

/* FB-9b: the fixed spherical rule (the fast path) against the independent adaptive
 * Cartesian quadrature (the reference, GSL QAG nested three deep), to 1e-6 relative: the
 * demo plan's clouds (23Na thermal, 4e5 atoms, 2 pi x (90, 110, 220) Hz; 40K Fermi,
 * 1.5e5 atoms, 2 pi x (110, 135, 270) Hz; 180 nK, T/T_F ~ 0.25, scripts/demo.lua), a
 * degenerate 6Li–40K Fermi–Fermi pair with sag, and a Thomas–Fermi condensate with a
 * Fermi gas at T/T_F ~ 0.1, and a condensate and a Fermi gas in a weak trap, sagged apart
 * by more than 4 thermal lengths of the Fermi cloud (the rule runs about the condensate's
 * centre, outside the Fermi cloud's core).  The fast path must accept its result for all
 * four (a silent fallback would cost 100 ms per plan).  Two Thomas–Fermi clouds of different shapes
 * (their surfaces cross: kinks the fixed rule does not follow) are declined and the
 * public path gives the reference's value. */
static void test_overlap_fast(void **state)
{
    (void)state;
    double tp = 2 * M_PI, fast, ref, num;
    cp_cloud_state sa, sb;
    cp_feshbach_cloud na = {CP_PROFILE_THERMAL, 4e5, 22.98976928 * CP_AMU,
                            {tp * 90, tp * 110, tp * 220}, 0.0};
    cp_feshbach_cloud k = {CP_PROFILE_FERMI, 1.5e5, 39.963998165 * CP_AMU,
                           {tp * 110, tp * 135, tp * 270}, 0.0};
    prepare_pair(&na, &k, 180e-9, &sa, &sb);
    assert_int_equal(cp_feshbach_overlap_fixed(&sa, &sb, &fast), CP_OK);
    assert_int_equal(cp_feshbach_overlap_adaptive(&sa, &sb, &ref, NULL), CP_OK);
    assert_rel(fast, ref, 1e-6);
    /* the other way round: N_a <n_b>_a = N_b <n_a>_b (the same integral) */
    assert_int_equal(cp_feshbach_overlap_fixed(&sb, &sa, &num), CP_OK);
    assert_rel(num * sa.number, fast * sb.number, 1e-9);

    cp_feshbach_cloud kf = {CP_PROFILE_FERMI, 1e5, 39.963998165 * CP_AMU,
                            {tp * 110, tp * 135, tp * 270}, 0.0};
    cp_feshbach_cloud li = {CP_PROFILE_FERMI, 2e5, 6.0151228 * CP_AMU,
                            {tp * 300, tp * 350, tp * 700}, 0.0};
    prepare_pair(&kf, &li, 300e-9, &sa, &sb);
    assert_true(sb.eta > 5.0); /* the Li cloud is degenerate, T/T_F ~ 0.15 */
    assert_int_equal(cp_feshbach_overlap_fixed(&sa, &sb, &fast), CP_OK);
    assert_int_equal(cp_feshbach_overlap_adaptive(&sa, &sb, &ref, NULL), CP_OK);
    assert_rel(fast, ref, 1e-6);

    cp_feshbach_cloud rb = {CP_PROFILE_THOMAS_FERMI, 4e5, 86.909180529 * CP_AMU,
                            {tp * 60, tp * 70, tp * 150}, 100.0 * CP_A0};
    cp_feshbach_cloud kc = {CP_PROFILE_FERMI, 1e5, 39.963998165 * CP_AMU,
                            {tp * 80, tp * 90, tp * 200}, 0.0};
    prepare_pair(&rb, &kc, 40e-9, &sa, &sb);
    assert_true(sb.eta > 10.0);
    assert_int_equal(cp_feshbach_overlap_fixed(&sa, &sb, &fast), CP_OK);
    assert_int_equal(cp_feshbach_overlap_adaptive(&sa, &sb, &ref, NULL), CP_OK);
    assert_rel(fast, ref, 1e-6);

    cp_feshbach_cloud rb_weak = {CP_PROFILE_THOMAS_FERMI, 4e5, 86.909180529 * CP_AMU,
                                 {tp * 20, tp * 20, tp * 30}, 100.0 * CP_A0};
    cp_feshbach_cloud k_weak = {CP_PROFILE_FERMI, 1e5, 39.963998165 * CP_AMU,
                                {tp * 25, tp * 25, tp * 40}, 0.0};
    prepare_pair(&rb_weak, &k_weak, 100e-9, &sa, &sb);
    assert_true(fabs(sa.sag - sb.sag) > 4.0 * sb.ell[2]);
    assert_int_equal(cp_feshbach_overlap_fixed(&sa, &sb, &fast), CP_OK);
    assert_int_equal(cp_feshbach_overlap_adaptive(&sa, &sb, &ref, NULL), CP_OK);
    assert_rel(fast, ref, 1e-6);

    cp_feshbach_cloud na_tf = {CP_PROFILE_THOMAS_FERMI, 4e5, 22.98976928 * CP_AMU,
                               {tp * 90, tp * 110, tp * 220}, 52.0 * CP_A0};
    prepare_pair(&na_tf, &rb, 0.0, &sa, &sb);
    assert_int_equal(cp_feshbach_overlap_fixed(&sa, &sb, &fast), CP_ENOCONV);
    assert_true(isnan(fast));
    assert_int_equal(cp_feshbach_overlap_adaptive(&sa, &sb, &ref, NULL), CP_OK);
    assert_int_equal(cp_feshbach_overlap_numeric(&sa, &sb, &num, NULL), CP_OK);
    assert_true(num == ref);
}

/* FB-10: SPSS ceiling.  (a) Classical limit: P_max -> <x> = gamma (M/m_b)^3 <f_a>_b, and
 * for Boltzmann clouds <f_a>_b = z_a prod_i (1 + c_i^2)^(-1/2) (1 + m_a/m_b)^(-3/2) with
 * c_i = ell_b,i / ell_a,i (Gaussian integral by hand) — the Monte Carlo agrees within 4
 * standard errors.  (b) Deeply degenerate two-component Fermi gas of equal masses: every
 * cell holds on average x = y = 8 gamma atoms of each kind, so P_max -> g(8 gamma, 8 gamma)
 * = 1 - ln(2 - e^-x)/x (the pairing function, checked itself in FB-11).  (c) Same seed,
 * same result; sag lowers P_max. */
static void test_spss(void **state)
{
    (void)state;
    double w = 2 * M_PI * 100.0, t = 1e-6, p, se;
    cp_feshbach_cloud a = cloud(CP_PROFILE_THERMAL, 1e4, 86.909180529, w);
    cp_feshbach_cloud b = cloud(CP_PROFILE_THERMAL, 1e4, 39.963998165, 1.4 * w);
    cp_feshbach_spss o = {0.38, 7, 40000, 0};
    assert_int_equal(cp_feshbach_max_efficiency(&a, &b, t, &o, &p, &se, NULL), CP_OK);
    double za = 1e4 * pow(CP_HBAR * w / (CP_KB * t), 3.0);
    double c2 = (a.mass * w * w) / (b.mass * 1.96 * w * w); /* (ell_b/ell_a)^2 */
    double fa = za * pow(1.0 + c2, -1.5) * pow(1.0 + a.mass / b.mass, -1.5);
    double x = 0.38 * pow((a.mass + b.mass) / b.mass, 3.0) * fa;
    assert_true(x < 1e-3);
    assert_abs(p, x, 4.0 * se);
    assert_true(se < 0.02 * x);

    cp_feshbach_cloud f = cloud(CP_PROFILE_FERMI, 1e5, 39.963998165, w);
    double tt = 0.005 * CP_HBAR * w * cbrt(6e5) / CP_KB;
    o.samples = 20000;
    assert_int_equal(cp_feshbach_max_efficiency(&f, &f, tt, &o, &p, &se, NULL), CP_OK);
    double x8 = 8.0 * 0.38;
    assert_rel(p, 1.0 - log(2.0 - exp(-x8)) / x8, 0.01);

    double p2, se2;
    assert_int_equal(cp_feshbach_max_efficiency(&f, &f, tt, &o, &p2, &se2, NULL), CP_OK);
    assert_true(p2 == p && se2 == se);
    /* sag: 40K and 87Rb in a weak trap */
    cp_feshbach_cloud rb = cloud(CP_PROFILE_BOSE, 1e5, 86.909180529, 2 * M_PI * 30.0);
    cp_feshbach_cloud k = cloud(CP_PROFILE_FERMI, 1e5, 39.963998165, 2 * M_PI * 45.0);
    o.include_sag = 0;
    assert_int_equal(cp_feshbach_max_efficiency(&rb, &k, 150e-9, &o, &p, &se, NULL), CP_OK);
    o.include_sag = 1;
    assert_int_equal(cp_feshbach_max_efficiency(&rb, &k, 150e-9, &o, &p2, &se2, NULL), CP_OK);
    assert_true(p2 < p - 4.0 * (se + se2));
}

/* Direct simulation of the SPSS pairing rule in a homogeneous gas: nb minority and
 * nb x/y partner points uniform in the six-dimensional unit torus, cells = balls of volume
 * y/nb (so a cell holds x partners and y minority atoms on average); minority atoms in
 * random order take the nearest free partner inside their ball.  Returns the paired
 * fraction. */
static double pairing_simulation(double x, double y, int nb, gsl_rng *rng)
{
    int na = (int)lround(nb * x / y);
    double (*pa)[6] = malloc(sizeof *pa * (size_t)na), (*pb)[6] = malloc(sizeof *pb * (size_t)nb);
    char *used = calloc((size_t)na, 1);
    assert_true(pa && pb && used);
    for (int i = 0; i < na; i++)
        for (int k = 0; k < 6; k++)
            pa[i][k] = gsl_rng_uniform(rng);
    for (int i = 0; i < nb; i++)
        for (int k = 0; k < 6; k++)
            pb[i][k] = gsl_rng_uniform(rng);
    double r2 = pow(6.0 * (y / nb) / (M_PI * M_PI * M_PI), 1.0 / 3.0); /* ball pi^3 r^6/6 */
    int paired = 0;
    for (int i = 0; i < nb; i++) { /* uniform points: index order is a random order */
        int best = -1;
        double bd = r2;
        for (int j = 0; j < na; j++) {
            if (used[j])
                continue;
            double d2 = 0.0;
            for (int k = 0; k < 6; k++) {
                double d = fabs(pa[j][k] - pb[i][k]);
                d = d > 0.5 ? 1.0 - d : d;
                d2 += d * d;
            }
            if (d2 < bd) {
                bd = d2;
                best = j;
            }
        }
        if (best >= 0) {
            used[best] = 1;
            paired++;
        }
    }
    free(pa);
    free(pb);
    free(used);
    return (double)paired / nb;
}

/* FB-11: the local pairing function g(x, y) of the SPSS closure against the direct
 * simulation above (an independent method, agreement 0.03 with ~1000 minority points),
 * and its limits by hand: no competition 1 - e^-x; scarce partners x/y; nothing to pair 0. */
static void test_spss_closure(void **state)
{
    (void)state;
    assert_rel(cp_spss_local_pairing(0.3, 0.0), 1.0 - exp(-0.3), 1e-15);
    assert_rel(cp_spss_local_pairing(0.01, 50.0), 0.01 / 50.0, 1e-3);
    assert_abs(cp_spss_local_pairing(0.0, 1.0), 0.0, 0.0);
    assert_rel(cp_spss_local_pairing(800.0, 1.0), 1.0, 1e-15); /* no overflow */
    assert_rel(cp_spss_local_pairing(0.5, 1e-9), 1.0 - exp(-0.5), 1e-8);
    const double xy[][2] = {{1.0, 1.0}, {3.0, 3.0}, {2.0, 0.5}, {0.5, 2.0}};
    gsl_rng *rng = gsl_rng_alloc(gsl_rng_mt19937);
    assert_non_null(rng);
    gsl_rng_set(rng, 11);
    for (size_t c = 0; c < 4; c++) {
        double sim = pairing_simulation(xy[c][0], xy[c][1], 1000, rng);
        assert_abs(cp_spss_local_pairing(xy[c][0], xy[c][1]), sim, 0.03);
    }
    gsl_rng_free(rng);
}

/* Dissociation survival exponent by quadrature of the decay rate Gamma(E)/hbar =
 * 2 k abg dmu Delta / hbar over the time the state spends above threshold. */
typedef struct diss {
    double mu, abgd, rate_e; /* reduced mass, |abg Delta|, dE/dt = dmu |Bdot| (J/s) */
    double dmu;
} diss;

static double decay_rate(double e, void *p)
{
    const diss *d = p;
    double k = sqrt(2.0 * d->mu * e) / CP_HBAR;
    return 2.0 * k * d->abgd * d->dmu / CP_HBAR / d->rate_e; /* per unit energy */
}

static double survival(double e, void *p)
{
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(100);
    gsl_function f = {decay_rate, p};
    double val, err;
    gsl_integration_qags(&f, 0.0, e, 0.0, 1e-12, 100, w, &val, &err);
    gsl_integration_workspace_free(w);
    return exp(-val);
}

/* FB-12: dissociation energy: mean E = Int_0^inf S(E) dE with S from the numerically
 * integrated decay rate (independent of the closed form eps and Gamma(5/3)). */
static void test_dissociation(void **state)
{
    (void)state;
    cp_feshbach_resonance r = krb();
    double mu = mu_krb(), rate = 1e-4 / 1e-3, e, scale; /* 1 G/ms */
    assert_int_equal(cp_feshbach_dissociation_energy(&r, mu, rate, &e, &scale, NULL), CP_OK);
    diss d = {mu, fabs(r.abg * r.width), r.dmu * rate, r.dmu};
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(200);
    gsl_function f = {survival, &d};
    double mean, err;
    assert_int_equal(gsl_integration_qag(&f, 0.0, 30.0 * scale, 0.0, 1e-9, 200, 6, w, &mean,
                                         &err), GSL_SUCCESS);
    gsl_integration_workspace_free(w);
    assert_rel(e, mean, 1e-6);
    assert_rel(e / scale, gsl_sf_gamma(5.0 / 3.0), 1e-12);
}

/* FB-13: bad input from C: NaN, +-inf, 0, negative and absurd magnitudes for every
 * argument; always CP_EINVAL with NaN outputs and a message naming the argument. */
static void test_bad_input(void **state)
{
    (void)state;
    const double bad_pos[] = {NAN, INFINITY, -INFINITY, 0.0, -1.0, 1e300};
    const double bad_any[] = {NAN, INFINITY, -INFINITY, 1e300, -1e300};
    double mu = mu_krb(), out1, out2;
    cp_error err;
    cp_feshbach_binding bind;
    for (size_t i = 0; i < 6; i++) {
        double v = bad_pos[i];
        cp_feshbach_resonance r = krb();
        r.b0 = v;
        assert_int_equal(cp_feshbach_scattering_length(&r, 0.05, &out1, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "b0"));
        assert_true(isnan(out1));
        r = krb();
        r.dmu = v;
        assert_int_equal(cp_feshbach_binding_energy(&r, mu, 0.0546, 0, &bind, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "dmu"));
        assert_true(isnan(bind.energy));
        r = krb();
        assert_int_equal(cp_feshbach_scattering_length(&r, v, &out1, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "field"));
        assert_int_equal(cp_feshbach_binding_energy(&r, v, 0.0546, 0, &bind, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "reduced mass"));
        /* a negative ramp rate is a downward sweep: only |Bdot| matters */
        cp_feshbach_ramp ramp = {v, 1e18, 0.0, 1.0};
        cp_status want = v == -1.0 ? CP_OK : CP_EINVAL;
        assert_int_equal(cp_feshbach_associate(&r, mu, &ramp, &out1, &out2, &err), want);
        assert_true(v == -1.0 || (isnan(out1) && isnan(out2) &&
                                  strstr(err.message, "ramp_rate") != NULL));
        ramp = (cp_feshbach_ramp){1.0, v, 0.0, 1.0};
        assert_int_equal(cp_feshbach_associate(&r, mu, &ramp, &out1, &out2, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "density"));
        ramp = (cp_feshbach_ramp){1.0, 1e18, 0.0, v};
        assert_int_equal(cp_feshbach_associate(&r, mu, &ramp, &out1, &out2, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "max_efficiency"));
        if (v != 0.0) { /* alpha 0 means theory */
            ramp = (cp_feshbach_ramp){1.0, 1e18, v, 1.0};
            assert_int_equal(cp_feshbach_associate(&r, mu, &ramp, &out1, &out2, &err),
                             CP_EINVAL);
            assert_non_null(strstr(err.message, "alpha"));
            r.c6_au = v;
            assert_int_equal(cp_feshbach_binding_energy(&r, mu, 0.0546, 0, &bind, &err),
                             CP_EINVAL);
            assert_non_null(strstr(err.message, "c6_au"));
            r = krb();
        }
        assert_int_equal(cp_feshbach_mean_scattering_length(v, mu, &out1, &err), CP_EINVAL);
        assert_int_equal(cp_feshbach_alpha(v, &out1, &err), CP_EINVAL);
        if (v != 0.0) { /* lz_parameter 0 is allowed */
            assert_int_equal(cp_feshbach_lz_probability(v, &out1, &err), CP_EINVAL);
            assert_true(isnan(out1));
        }
        double w[3] = {1e5, 1e5, 1e5};
        w[i % 3] = v;
        assert_int_equal(cp_feshbach_associate_site(&r, mu, 1.0, w, 1.0, &out1, &out2, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "omega"));
        assert_int_equal(cp_feshbach_dissociation_energy(&r, mu, v, &out1, &out2, &err), want);
        assert_true(v == -1.0 || (isnan(out1) && isnan(out2)));
        double rates[3] = {1.0, v, 2.0}, eff[3];
        assert_int_equal(cp_feshbach_ramp_law(1.0, 1.0, rates, eff, 3, &err), want);
        assert_true(v == -1.0 || (isnan(eff[0]) && isnan(eff[2]) &&
                                  strstr(err.message, "rates[2]") != NULL)); /* counted from 1 */
        assert_int_equal(cp_feshbach_ramp_law(v, 1.0, rates, eff, 3, &err), CP_EINVAL);
        /* clouds */
        cp_feshbach_cloud c = cloud(CP_PROFILE_THERMAL, 1e5, 87.0, 600.0), bad = c;
        bad.number = v;
        assert_int_equal(cp_feshbach_overlap_density(&c, &bad, 1e-7, &out1, &out2, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "b number"));
        bad = c;
        bad.mass = v;
        assert_int_equal(cp_feshbach_overlap_density(&bad, &c, 1e-7, &out1, &out2, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "a mass"));
        bad = c;
        bad.omega[2] = v;
        assert_int_equal(cp_feshbach_overlap_density(&bad, &c, 1e-7, &out1, &out2, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "omega_z"));
        assert_int_equal(cp_feshbach_overlap_density(&c, &c, v, &out1, &out2, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "temperature"));
        cp_feshbach_spss o = {v, 1, 1000, 1};
        assert_int_equal(cp_feshbach_max_efficiency(&c, &c, 1e-7, &o, &out1, &out2, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "gamma"));
        assert_true(isnan(out1) && isnan(out2));
        o.gamma = 0.38;
        assert_int_equal(cp_feshbach_max_efficiency(&c, &c, v, &o, &out1, &out2, &err),
                         CP_EINVAL);
    }
    for (size_t i = 0; i < 5; i++) {
        double v = bad_any[i];
        cp_feshbach_resonance r = krb();
        r.width = v;
        assert_int_equal(cp_feshbach_scattering_length(&r, 0.05, &out1, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "width"));
        r = krb();
        r.abg = v;
        assert_int_equal(cp_feshbach_scattering_length(&r, 0.05, &out1, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "abg"));
    }
    /* zero width / abg, opposite signs, TF without a scattering length, bad samples */
    cp_feshbach_resonance r = krb();
    r.width = 0.0;
    assert_int_equal(cp_feshbach_scattering_length(&r, 0.05, &out1, &err), CP_EINVAL);
    r = krb();
    r.abg = 0.0;
    assert_int_equal(cp_feshbach_scattering_length(&r, 0.05, &out1, &err), CP_EINVAL);
    r = krb();
    r.abg = -r.abg;
    assert_int_equal(cp_feshbach_scattering_length(&r, 0.05, &out1, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "opposite signs"));
    cp_feshbach_cloud tf = cloud(CP_PROFILE_THOMAS_FERMI, 1e5, 87.0, 600.0);
    assert_int_equal(cp_feshbach_overlap_density(&tf, &tf, 0.0, &out1, &out2, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "scattering_length"));
    assert_int_equal(cp_feshbach_max_efficiency(&tf, &tf, 1e-7,
                                                &(cp_feshbach_spss){0.38, 1, 1000, 1}, &out1,
                                                &out2, &err), CP_EINVAL);
    cp_feshbach_cloud c = cloud(CP_PROFILE_THERMAL, 1e5, 87.0, 600.0);
    assert_int_equal(cp_feshbach_max_efficiency(&c, &c, 1e-7, &(cp_feshbach_spss){0.38, 1, 10, 1},
                                                &out1, &out2, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "samples"));
    assert_int_equal(cp_feshbach_binding_energy(&r, mu, 0.05, (cp_feshbach_model)7, &bind, &err),
                     CP_EINVAL);
    /* absurd magnitudes: below 1 pK, a trap weaker than 1e-2 rad/s (check_int.h floors) */
    cp_feshbach_cloud weak = cloud(CP_PROFILE_THERMAL, 1e5, 87.0, 600.0);
    assert_int_equal(cp_feshbach_overlap_density(&weak, &weak, 1e-13, &out1, &out2, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "temperature"));
    weak.omega[1] = 1e-3;
    assert_int_equal(cp_feshbach_overlap_density(&weak, &weak, 1e-7, &out1, &out2, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "omega_y"));
    assert_true(isnan(out1));
    /* NULL inputs: an error, not a crash */
    r = krb();
    assert_int_equal(cp_feshbach_associate(&r, mu, NULL, &out1, &out2, &err), CP_EINVAL);
    assert_true(isnan(out1) && isnan(out2));
    assert_int_equal(cp_feshbach_associate_site(&r, mu, 1.0, NULL, 1.0, &out1, &out2, &err),
                     CP_EINVAL);
    assert_true(isnan(out1) && isnan(out2));
}

/* ---- condensed Bose clouds (Thomas–Fermi condensate with its thermal part) -------------- */

static const unsigned ALL_PROFILES = (1u << CP_PROFILE_THERMAL) | (1u << CP_PROFILE_FERMI) |
                                     (1u << CP_PROFILE_BOSE) | (1u << CP_PROFILE_THOMAS_FERMI);

/* Density of a prepared cloud along a ray: f(rho) = 4 pi rho^2 n(rho n_hat scaled), for the
 * number integral in coordinates scaled by L (n depends on sum r_i^2 / L_i^2 only). */
typedef struct ray_ctx {
    const cp_cloud_state *s;
    double len[3];
} ray_ctx;

static double number_integrand(double rho, void *p)
{
    const ray_ctx *c = p;
    double r[3] = {0.0, 0.0, rho * c->len[2]};
    cp_status st = CP_OK;
    return 4.0 * M_PI * rho * rho * cp_cloud_density(c->s, r, &st);
}

/* N = L_x L_y L_z Int 4 pi rho^2 n(rho) drho, with a break at the condensate's edge. */
static double number_by_quadrature(const cp_cloud_state *s, const double len[3], double edge,
                                   double rho_max)
{
    ray_ctx c = {s, {len[0], len[1], len[2]}};
    gsl_function f = {number_integrand, &c};
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(200);
    double v1 = 0.0, v2 = 0.0, e;
    assert_int_equal(gsl_integration_qags(&f, 0.0, edge, 0.0, 1e-11, 200, w, &v1, &e), 0);
    if (rho_max > edge)
        assert_int_equal(gsl_integration_qags(&f, edge, rho_max, 0.0, 1e-11, 200, w, &v2, &e),
                         0);
    gsl_integration_workspace_free(w);
    return (v1 + v2) * len[0] * len[1] * len[2];
}

/* FB-14: Thomas–Fermi radius and peak density against Dalfovo, Giorgini, Pitaevskii &
 * Stringari, RMP 71, 463 (1999) (the Thomas–Fermi limit), written here in their form: a_ho = sqrt(hbar /
 * (m omega_ho)), mu = (hbar omega_ho / 2) (15 N a / a_ho)^(2/5), R_i = a_ho (omega_ho /
 * omega_i) (15 N a / a_ho)^(1/5), n(0) = mu / g, g = 4 pi hbar^2 a / m (the code uses
 * R_i^2 = 2 mu / (m omega_i^2) and n(0) = 15 N / (8 pi Rx Ry Rz)); the density vanishes
 * at R_i on each axis, and it integrates to N (GSL quadrature).  A Bose cloud below T_c:
 * the condensate holds the ideal-gas fraction N0 = N (1 - (T/T_c)^3), k T_c = hbar
 * omega_ho (N / zeta(3))^(1/3) (Dalfovo et al. 1999, the ideal gas), and condensate plus
 * saturated thermal part integrate to N (the thermal part's own normalisation: Li_{3/2}
 * integrated over the trap gives zeta(3) (kT/hbar omega_ho)^3). */
static void test_thomas_fermi(void **state)
{
    (void)state;
    double tp = 2 * M_PI, a = 100.4 * CP_A0, m = 86.909180529 * CP_AMU;
    cp_feshbach_cloud tf = {CP_PROFILE_THOMAS_FERMI, 2e5, m, {tp * 40, tp * 60, tp * 150}, a};
    cp_cloud_state s;
    assert_int_equal(cp_cloud_prepare(&tf, 0.0, "t", "a", ALL_PROFILES, &s, NULL), CP_OK);
    double wbar = cbrt(tp * 40 * tp * 60 * tp * 150), a_ho = sqrt(CP_HBAR / (m * wbar));
    double x = 15.0 * 2e5 * a / a_ho;
    double mu = 0.5 * CP_HBAR * wbar * pow(x, 0.4);
    assert_rel(s.mu_tf, mu, 1e-12);
    cp_status st = CP_OK;
    for (int i = 0; i < 3; i++) {
        double r_dalfovo = a_ho * wbar / tf.omega[i] * pow(x, 0.2);
        assert_rel(s.radius[i], r_dalfovo, 1e-12);
        double in[3] = {0, 0, 0}, out[3] = {0, 0, 0};
        in[i] = 0.999 * r_dalfovo;
        out[i] = 1.001 * r_dalfovo;
        assert_true(cp_cloud_density(&s, in, &st) > 0.0);
        assert_true(cp_cloud_density(&s, out, &st) == 0.0);
    }
    double zero[3] = {0, 0, 0}, g = 4 * M_PI * CP_HBAR * CP_HBAR * a / m;
    assert_rel(cp_cloud_density(&s, zero, &st), mu / g, 1e-12);
    assert_rel(number_by_quadrature(&s, s.radius, 1.0, 1.0), 2e5, 1e-9);
    /* a typical 87Rb condensate is ~10 um across, not the ~1 um of the ideal ground state */
    assert_true(s.radius[0] > 5.0 * sqrt(CP_HBAR / (m * tf.omega[0])));

    /* a Bose cloud at T = 0.6 T_c */
    double n = 2e5, tc = CP_HBAR * wbar * cbrt(n / 1.2020569031595942) / CP_KB, t = 0.6 * tc;
    cp_feshbach_cloud b = {CP_PROFILE_BOSE, n, m, {tp * 40, tp * 60, tp * 150}, a};
    assert_int_equal(cp_cloud_prepare(&b, t, "t", "b", ALL_PROFILES, &s, NULL), CP_OK);
    double n0 = n * (1.0 - 0.6 * 0.6 * 0.6);
    assert_rel(s.n_condensed, n0, 1e-12);
    x = 15.0 * n0 * a / a_ho;
    for (int i = 0; i < 3; i++)
        assert_rel(s.radius[i], a_ho * wbar / b.omega[i] * pow(x, 0.2), 1e-12);
    double len[3];
    for (int i = 0; i < 3; i++)
        len[i] = sqrt(2.0) * s.ell[i];
    assert_rel(number_by_quadrature(&s, len, sqrt(s.u_tf), sqrt(60.0)), n, 1e-8);
    /* no scattering length: an error naming it, below T_c only */
    b.scattering_length = 0.0;
    cp_error err;
    assert_int_equal(cp_cloud_prepare(&b, t, "ctx", "b", ALL_PROFILES, &s, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "b scattering_length 0 m"));
    assert_non_null(strstr(err.message, "below T_c"));
    assert_int_equal(cp_cloud_prepare(&b, 1.2 * tc, "ctx", "b", ALL_PROFILES, &s, &err), CP_OK);
    b.scattering_length = -27.3 * CP_A0;
    assert_int_equal(cp_cloud_prepare(&b, 1.2 * tc, "ctx", "b", ALL_PROFILES, &s, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "allowed (0, 1e-06] m"));
}

/* Two axisymmetric Thomas–Fermi clouds (omega_x = omega_y) on one z axis: at height z each
 * is A - alpha s in s = x^2 + y^2, so the product integrates over the disc in closed form,
 * pi [A_a A_b s - (A_a al_b + A_b al_a) s^2 / 2 + al_a al_b s^3 / 3] at the smaller disc
 * s_m; z is left to GSL's QAGP with break points where the smaller disc changes. */
typedef struct tf_axis {
    double n0, rr2, rz, zc; /* peak density, radial R^2, axial R, centre */
} tf_axis;

static tf_axis tf_axis_of(const cp_cloud_state *s)
{
    tf_axis t = {s->peak_tf, s->radius[0] * s->radius[0], s->radius[2], s->sag};
    return t;
}

typedef struct two_tf {
    tf_axis a, b;
    int min_mode; /* 0: Int n_a n_b; 1: Int min(n_a, n_b) */
} two_tf;

/* A(z) and alpha of one cloud at height z; A <= 0 outside it. */
static void slab(const tf_axis *t, double z, double *amp, double *alpha)
{
    double q = (z - t->zc) / t->rz;
    *amp = t->n0 * (1.0 - q * q);
    *alpha = t->n0 / t->rr2;
}

static double disc_product(double z, void *p)
{
    const two_tf *c = p;
    double aa, la, ab, lb;
    slab(&c->a, z, &aa, &la);
    slab(&c->b, z, &ab, &lb);
    if (aa <= 0.0 || ab <= 0.0)
        return 0.0;
    double sm = fmin(aa / la, ab / lb);
    return M_PI * (aa * ab * sm - 0.5 * (aa * lb + ab * la) * sm * sm + la * lb * sm * sm * sm / 3.0);
}

/* pi Int_0^inf min(A_a - al_a s, A_b - al_b s)_+ ds: two lines, piecewise by hand. */
static double disc_min(double z, void *p)
{
    const two_tf *c = p;
    double aa, la, ab, lb;
    slab(&c->a, z, &aa, &la);
    slab(&c->b, z, &ab, &lb);
    if (aa <= 0.0 || ab <= 0.0)
        return 0.0;
    double ea = aa / la, eb = ab / lb, sx = fabs(la - lb) > 0 ? (aa - ab) / (la - lb) : -1.0;
    double end = fmin(ea, eb), sum = 0.0, lo = 0.0;
    double cuts[2] = {sx > 0.0 && sx < end ? sx : end, end};
    for (int k = 0; k < 2; k++) {
        double hi = cuts[k];
        if (hi <= lo)
            continue;
        double mid = 0.5 * (lo + hi); /* the lower line on (lo, hi) */
        int use_a = aa - la * mid < ab - lb * mid;
        double amp = use_a ? aa : ab, al = use_a ? la : lb;
        sum += amp * (hi - lo) - 0.5 * al * (hi * hi - lo * lo);
        lo = hi;
    }
    return M_PI * sum;
}

static double z_quadrature(two_tf *c, double (*f)(double, void *))
{
    double lo = fmax(c->a.zc - c->a.rz, c->b.zc - c->b.rz);
    double hi = fmin(c->a.zc + c->a.rz, c->b.zc + c->b.rz);
    if (!(hi > lo))
        return 0.0;
    /* where A_a / al_a = A_b / al_b (the smaller disc changes) and where the lines cross at
     * s = 0 (A_a = A_b): roots of quadratics in z, added as break points */
    double pts[8];
    int np = 0;
    pts[np++] = lo;
    for (int kind = 0; kind < 2; kind++) {
        double wa = kind ? c->a.n0 : c->a.rr2, wb = kind ? c->b.n0 : c->b.rr2;
        /* wa (1 - (z - za)^2 / Ra^2) - wb (1 - (z - zb)^2 / Rb^2) = q2 z^2 + q1 z + q0 */
        double ka = wa / (c->a.rz * c->a.rz), kb = wb / (c->b.rz * c->b.rz);
        double q2 = kb - ka, q1 = 2 * (ka * c->a.zc - kb * c->b.zc);
        double q0 = wa - wb - ka * c->a.zc * c->a.zc + kb * c->b.zc * c->b.zc;
        double disc = q1 * q1 - 4 * q2 * q0;
        if (fabs(q2) > 0 && disc > 0)
            for (int sgn = -1; sgn <= 1; sgn += 2) {
                double z = (-q1 + sgn * sqrt(disc)) / (2 * q2);
                if (z > lo && z < hi)
                    pts[np++] = z;
            }
    }
    pts[np++] = hi;
    for (int i = 1; i < np; i++)
        for (int j = i; j > 0 && pts[j - 1] > pts[j]; j--) {
            double t = pts[j];
            pts[j] = pts[j - 1];
            pts[j - 1] = t;
        }
    gsl_function fn = {f, c};
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(500);
    double v, e;
    assert_int_equal(gsl_integration_qagp(&fn, pts, (size_t)np, 0.0, 1e-12, 500, w, &v, &e), 0);
    gsl_integration_workspace_free(w);
    return v;
}

/* FB-15: the overlap of two displaced Thomas–Fermi clouds (23Na and 87Rb condensates of
 * different shapes in one optical trap, the Na cloud sagging 3.4 um less) against the
 * direct quadrature above, to 1e-6 (the public path: the fixed rule declines where the
 * surfaces cross, the adaptive reference answers).  Then condensed Bose clouds (23Na and
 * 87Rb at 100 nK, T/T_c ~ 0.4 and 0.45, condensate and thermal part; and the 87Rb
 * condensate with a degenerate 40K Fermi gas, and the 87Rb Bose gas just above T_c): the
 * fast path must accept its result and meet the adaptive reference (GSL QAG nested three
 * deep, the independent Cartesian method) to 1e-6. */
static void test_overlap_condensed(void **state)
{
    (void)state;
    double tp = 2 * M_PI, n, sag, fast, ref;
    cp_feshbach_cloud na = {CP_PROFILE_THOMAS_FERMI, 3e5, 22.98976928195 * CP_AMU,
                            {tp * 80, tp * 80, tp * 240}, 55.4 * CP_A0};
    cp_feshbach_cloud rb = {CP_PROFILE_THOMAS_FERMI, 2e5, 86.909180529 * CP_AMU,
                            {tp * 60, tp * 60, tp * 180}, 100.4 * CP_A0};
    cp_cloud_state sa, sb;
    assert_int_equal(cp_feshbach_overlap_density(&na, &rb, 0.0, &n, &sag, NULL), CP_OK);
    assert_int_equal(cp_cloud_prepare(&na, 0.0, "t", "a", ALL_PROFILES, &sa, NULL), CP_OK);
    assert_int_equal(cp_cloud_prepare(&rb, 0.0, "t", "b", ALL_PROFILES, &sb, NULL), CP_OK);
    two_tf c = {tf_axis_of(&sa), tf_axis_of(&sb), 0};
    double direct = z_quadrature(&c, disc_product) / 2e5;
    assert_rel(n, direct, 1e-6);
    assert_true(fabs(sag) > 0.5 * sb.radius[2]); /* the sag matters here */
    /* sagged apart in a weak trap: no overlap at all */
    cp_feshbach_cloud na_w = na, rb_w = rb;
    na_w.omega[2] = rb_w.omega[2] = tp * 8;
    na_w.omega[2] = tp * 12;
    assert_int_equal(cp_feshbach_overlap_density(&na_w, &rb_w, 0.0, &n, &sag, NULL), CP_OK);
    assert_true(n == 0.0);

    na.profile = rb.profile = CP_PROFILE_BOSE;
    prepare_pair(&na, &rb, 100e-9, &sa, &sb);
    assert_true(sa.n_condensed > 0.9 * na.number && sb.n_condensed > 0.9 * rb.number);
    assert_int_equal(cp_feshbach_overlap_fixed(&sa, &sb, &fast), CP_OK);
    assert_int_equal(cp_feshbach_overlap_adaptive(&sa, &sb, &ref, NULL), CP_OK);
    assert_rel(fast, ref, 1e-6);
    cp_feshbach_cloud k = {CP_PROFILE_FERMI, 1e5, 39.963998165 * CP_AMU,
                           {tp * 80, tp * 90, tp * 200}, 0.0};
    rb.omega[0] = tp * 60, rb.omega[1] = tp * 70, rb.omega[2] = tp * 150;
    prepare_pair(&rb, &k, 80e-9, &sa, &sb);
    assert_true(sa.n_condensed > 0.5 * rb.number && sb.eta > 2.0);
    assert_int_equal(cp_feshbach_overlap_fixed(&sa, &sb, &fast), CP_OK);
    assert_int_equal(cp_feshbach_overlap_adaptive(&sa, &sb, &ref, NULL), CP_OK);
    assert_rel(fast, ref, 1e-6);
    /* just above T_c (no condensate, fugacity 0.998): the cusp without the condensate */
    double wb = cbrt(rb.omega[0] * rb.omega[1] * rb.omega[2]);
    double tc = CP_HBAR * wb * cbrt(rb.number / 1.2020569031595942) / CP_KB;
    prepare_pair(&rb, &k, 1.001 * tc, &sa, &sb);
    assert_true(sa.n_condensed == 0.0 && sa.eta > -1e-2);
    assert_int_equal(cp_feshbach_overlap_fixed(&sa, &sb, &fast), CP_OK);
    assert_int_equal(cp_feshbach_overlap_adaptive(&sa, &sb, &ref, NULL), CP_OK);
    assert_rel(fast, ref, 1e-6);
}

/* FB-16: the ceiling with condensates.  Two condensed clouds (23Na partner, 87Rb minority,
 * T = 0.25 T_c of the Rb cloud): the condensed minority atoms pair with probability
 * min(1, n_a,c / n_b,c), so P_max = f0_b C + (1 - f0_b) g_th with C = (1/N0_b) Int min(n_a,c,
 * n_b,c) d^3r from the direct quadrature of FB-15 (discs in closed form, z by GSL) and
 * 0 <= g_th <= 1 for the thermal minority atoms: P_max within 4 standard errors of that
 * band.  Identical condensates without sag: C = 1, P_max >= f0_b.  Condensates sagged apart
 * (no overlap, where counting cells would still pair them): P_max <= 1 - f0_b. */
static void test_spss_condensed(void **state)
{
    (void)state;
    double tp = 2 * M_PI, p, se;
    cp_feshbach_cloud na = {CP_PROFILE_BOSE, 3e5, 22.98976928195 * CP_AMU,
                            {tp * 80, tp * 80, tp * 240}, 55.4 * CP_A0};
    cp_feshbach_cloud rb = {CP_PROFILE_BOSE, 2e5, 86.909180529 * CP_AMU,
                            {tp * 60, tp * 60, tp * 180}, 100.4 * CP_A0};
    double wb = cbrt(rb.omega[0] * rb.omega[1] * rb.omega[2]);
    double t = 0.25 * CP_HBAR * wb * cbrt(2e5 / 1.2020569031595942) / CP_KB;
    cp_feshbach_spss o = {0.38, 3, 40000, 1};
    assert_int_equal(cp_feshbach_max_efficiency(&na, &rb, t, &o, &p, &se, NULL), CP_OK);
    cp_cloud_state sa, sb;
    prepare_pair(&na, &rb, t, &sa, &sb);
    two_tf c = {tf_axis_of(&sa), tf_axis_of(&sb), 1};
    double cmin = z_quadrature(&c, disc_min) / sb.n_condensed, f0 = sb.n_condensed / 2e5;
    assert_true(cmin > 0.2 && cmin < 0.9); /* partly overlapping condensates */
    assert_true(p >= f0 * cmin - 4 * se && p <= f0 * cmin + (1 - f0) + 4 * se);

    o.include_sag = 0;
    assert_int_equal(cp_feshbach_max_efficiency(&rb, &rb, t, &o, &p, &se, NULL), CP_OK);
    assert_true(p >= f0 - 4 * se);

    o.include_sag = 1;
    cp_feshbach_cloud na_w = na, rb_w = rb;
    na_w.omega[2] = tp * 12;
    rb_w.omega[2] = tp * 8;
    t = 0.25 * CP_HBAR * cbrt(rb_w.omega[0] * rb_w.omega[1] * rb_w.omega[2]) *
        cbrt(2e5 / 1.2020569031595942) / CP_KB;
    prepare_pair(&na_w, &rb_w, t, &sa, &sb);
    assert_true(fabs(sa.sag - sb.sag) > sa.radius[2] + sb.radius[2]);
    assert_int_equal(cp_feshbach_max_efficiency(&na_w, &rb_w, t, &o, &p, &se, NULL), CP_OK);
    assert_true(p <= 1.0 - sb.n_condensed / 2e5 + 4 * se);
}

int main(void)
{
    cp_init();
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_scattering_length),
        cmocka_unit_test(test_mean_scattering_length),
        cmocka_unit_test(test_resonance_strength_published),
        cmocka_unit_test(test_binding_energy), cmocka_unit_test(test_binding_flags),
        cmocka_unit_test(test_lz_ode),
        cmocka_unit_test(test_ramp_law),
        cmocka_unit_test(test_site),
        cmocka_unit_test(test_overlap_thermal),
        cmocka_unit_test(test_overlap_degenerate),
        cmocka_unit_test(test_overlap_fast),
        cmocka_unit_test(test_spss),
        cmocka_unit_test(test_spss_closure),
        cmocka_unit_test(test_thomas_fermi),
        cmocka_unit_test(test_overlap_condensed),
        cmocka_unit_test(test_spss_condensed),
        cmocka_unit_test(test_dissociation),
        cmocka_unit_test(test_bad_input),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

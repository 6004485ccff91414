/*
 * Lattice thermodynamics with many bands (core/thermo_lattice*.c): the binned,
 * merged band sums against direct sums over every band state written here, the deep
 * lattice against the 3D harmonic oscillator, the automatic band count, and the
 * atomic-limit site filling against the single-site Bose- and Fermi-Hubbard sums.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdlib.h>
#include <string.h>

#include <cmocka.h>
#include <gsl/gsl_sf_fermi_dirac.h>

#include "coldprep/consts.h"
#include "coldprep/lattice.h"
#include "coldprep/thermo.h"

#include "check_close.h"

#define MASS (127.0 * CP_AMU) /* a KRb-like molecule */
#define OMEGA (2.0 * CP_PI * 100.0)
#define LAMBDA 1064e-9

static cp_thermo_trap trap_of(double number)
{
    cp_thermo_trap t;
    cp_thermo_trap_isotropic(&t, number, OMEGA, MASS);
    return t;
}

static double amp_of(const cp_thermo_lattice *lat, double kt, double omega)
{
    return pow(2.0 * CP_PI * kt / (MASS * omega * omega), 1.5) / pow(lat->spacing, 3.0);
}

/* ---- direct sums over every band state (no bins) -------------------------------------- */

#define DB 6 /* bands per axis */
#define DP 6 /* quasimomenta per half zone */
#define DSTATES (DB * DP * DB * DP * DB * DP)

typedef struct direct {
    double e[DSTATES]; /* J, from the lowest state */
    double w;          /* weight of one state per site: 1 / DP^3 */
    double amp, kt;
    int fermi;
} direct;

/* f_{3/2}: F_{1/2} from GSL for fermions, Li_{3/2}(z) = sum z^l / l^{3/2} for bosons (the
 * defining series; z < 0.7 here). */
static double f_s(const direct *d, double eta, int s52)
{
    if (d->fermi)
        return s52 ? gsl_sf_fermi_dirac_3half(eta) : gsl_sf_fermi_dirac_half(eta);
    double z = exp(eta), sum = 0.0, zl = z;
    for (int l = 1; l < 400 && zl > 1e-18; l++, zl *= z)
        sum += zl / pow(l, s52 ? 2.5 : 1.5);
    return sum;
}

static double direct_number(const direct *d, double x)
{
    double n = 0.0;
    for (int i = 0; i < DSTATES; i++)
        n += f_s(d, x - d->e[i] / d->kt, 0);
    return d->amp * d->w * n;
}

/* S/N = (E - Omega - mu N) / (N k_B T) with mu from bisection on the number. */
static double direct_entropy(direct *d, double number, double *x_out)
{
    double lo = -60.0, hi = d->fermi ? 60.0 : -1e-9;
    for (int it = 0; it < 200; it++) {
        double mid = 0.5 * (lo + hi);
        if (direct_number(d, mid) < number)
            lo = mid;
        else
            hi = mid;
    }
    double x = 0.5 * (lo + hi), e = 0.0, om = 0.0;
    for (int i = 0; i < DSTATES; i++) {
        double eta = x - d->e[i] / d->kt;
        double f32 = f_s(d, eta, 0), f52 = f_s(d, eta, 1);
        e += d->e[i] * f32 + 1.5 * d->kt * f52;
        om -= d->kt * f52;
    }
    e *= d->amp * d->w;
    om *= d->amp * d->w;
    *x_out = x;
    return (e - om - x * d->kt * number) / (d->kt * number);
}

/* THERMO-L1: six bands of an 8 E_r lattice at k_B T = 2.5 E_r (several bands occupied):
 * the entropy and chemical potential of the binned and merged sums against the direct sum
 * over all (6 x 6)^3 band states per site written above (the same band tables from
 * cp_lattice_band_energies); fermions degenerate, bosons above T_c.  The tolerance is the
 * binning error, second order in bin width / k_B T (thermo.md). */
static void test_direct_sums(void **state)
{
    (void)state;
    static double tables[3 * DB * DP];
    static direct d;
    double depth[3] = {8.0, 8.0, 8.0};
    cp_thermo_lattice lat;
    assert_int_equal(cp_thermo_lattice_bands(depth, LAMBDA, MASS, DB, DP, tables, &lat, NULL),
                     CP_OK);
    for (int a = 0; a < 3; a++)
        lat.omega_envelope[a] = OMEGA;
    lat.bins = 512;
    const double *t = lat.axis[0].energy_er;
    double e_min = INFINITY;
    int k = 0;
    for (int i = 0; i < DB * DP; i++)
        for (int j = 0; j < DB * DP; j++)
            for (int l = 0; l < DB * DP; l++) {
                d.e[k] = t[i] + t[j] + t[l];
                e_min = fmin(e_min, d.e[k]);
                k++;
            }
    for (int i = 0; i < DSTATES; i++)
        d.e[i] = (d.e[i] - e_min) * lat.recoil_energy;
    d.w = 1.0 / (DP * DP * DP);
    d.kt = 2.5 * lat.recoil_energy;
    d.amp = amp_of(&lat, d.kt, OMEGA);
    double temperature = d.kt / CP_KB;
    for (int fermi = 0; fermi < 2; fermi++) {
        d.fermi = fermi;
        double number = fermi ? 3e5 : 2e4;
        cp_thermo_trap tr = trap_of(number);
        cp_thermo_lattice_result r;
        assert_int_equal(cp_thermo_lattice_state(&lat, &tr, fermi ? CP_FERMION : CP_BOSON,
                                                 temperature, &r, NULL),
                         CP_OK);
        double x, s = direct_entropy(&d, number, &x);
        print_message("%s: S/N %.10g (direct %.10g), beta (mu - e_min) %.6g (direct %.6g)\n",
                      fermi ? "fermions" : "bosons", r.entropy_per_particle, s,
                      (r.chemical_potential - e_min * lat.recoil_energy) / d.kt, x);
        if (fermi)
            assert_true(x > 2.0); /* degenerate: mu several k_B T above the lowest state */
        else
            assert_true(x < -0.4 && r.condensed_fraction == 0.0);
        assert_rel(r.entropy_per_particle, s, 2e-5);
        assert_rel(r.chemical_potential - e_min * lat.recoil_energy, x * d.kt, 1e-4);
        assert_int_equal(r.bands, DB);
    }
}

/* THERMO-L2: a deep lattice (V0 = 1e3 and 1e4 E_r) at k_B T = hbar omega_site with few
 * particles in a weak envelope (Boltzmann limit): the entropy tends to that of sites that
 * are 3D harmonic oscillators, S/N = ln(A z^3 / N) + 1 + 3/2 + 3 eps / k_B T with
 * z = 1/(1 - e^{-x}), eps = hbar omega / (e^x - 1), x = hbar omega / k_B T (the classical
 * ideal gas of the oscillator partition function; hbar omega_site = 2 sqrt(V0 E_r),
 * physics of the harmonic well).  The levels carry the first-order anharmonic shift
 * -(E_r/4)(2n^2 + 2n + 1) (from V0 sin^2 kx = V0 (k^2 x^2 - k^4 x^4/3 + ...) and
 * <x^4> = (3/4)(hbar/m omega)^2 (2n^2 + 2n + 1), by hand), relative size E_r/hbar omega
 * ~ V0^{-1/2}: the deviation must be small at 1e4 E_r and fall by about sqrt(10) from
 * 1e3 E_r.  The automatic band count must reach the 20 k_B T margin. */
static void test_harmonic_limit(void **state)
{
    (void)state;
    double dev[2];
    for (int i = 0; i < 2; i++) {
        double v0 = i == 0 ? 1e3 : 1e4;
        cp_thermo_lattice_spec spec = {{v0, v0, v0}, LAMBDA, {OMEGA / 10, OMEGA / 10, OMEGA / 10},
                                       16, 0};
        double er = CP_H * CP_H / (2.0 * MASS * LAMBDA * LAMBDA);
        double hw = 2.0 * sqrt(v0) * er, kt = hw;
        cp_thermo_trap tr = trap_of(10.0);
        cp_thermo_lattice_result r;
        assert_int_equal(cp_thermo_lattice_state_auto(&spec, &tr, CP_BOSON, kt / CP_KB, &r, NULL),
                         CP_OK);
        assert_true(r.band_margin >= CP_THERMO_LATTICE_MARGIN);
        assert_true(r.bands >= 20 && r.bands <= CP_THERMO_LATTICE_MAX_BANDS);
        double x = hw / kt, z = 1.0 / (1.0 - exp(-x)), eps = hw / expm1(x);
        double a = pow(2.0 * CP_PI * kt / (MASS * OMEGA * OMEGA / 100), 1.5) /
                   pow(LAMBDA / 2.0, 3.0);
        double s = log(a * z * z * z / 10.0) + 1.0 + 1.5 + 3.0 * eps / kt;
        dev[i] = fabs(r.entropy_per_particle - s) / s;
        print_message("V0 = %g E_r: %d bands, S/N %.8g, oscillator %.8g (deviation %.3g)\n", v0,
                      r.bands, r.entropy_per_particle, s, dev[i]);
    }
    assert_true(dev[1] < 2e-3);
    assert_true(dev[0] / dev[1] > 2.5 && dev[0] / dev[1] < 4.5);
}

/* THERMO-L3: the automatic band count against a fixed 32-band run (the most the model
 * keeps): the same entropy match, and more bands for a hotter gas.  Second method: the
 * fixed tables. */
static void test_auto_bands(void **state)
{
    (void)state;
    cp_thermo_trap tr;
    cp_thermo_trap_isotropic(&tr, 2e4, OMEGA, MASS);
    cp_thermo_lattice_spec spec = {{300, 300, 300}, LAMBDA, {OMEGA, OMEGA, OMEGA}, 16, 0};
    cp_thermo_lattice_result a, b, hot;
    assert_int_equal(cp_thermo_match_lattice_auto(&tr, CP_BOSON, 500e-9, &spec, &a, NULL), CP_OK);
    static double tables[3 * 32 * 16];
    cp_thermo_lattice lat;
    assert_int_equal(cp_thermo_lattice_bands(spec.depth_er, LAMBDA, MASS, 32, 16, tables, &lat,
                                             NULL),
                     CP_OK);
    for (int i = 0; i < 3; i++)
        lat.omega_envelope[i] = OMEGA;
    lat.bins = 0;
    assert_int_equal(cp_thermo_match_lattice(&tr, CP_BOSON, 500e-9, &lat, &b, NULL), CP_OK);
    assert_rel(a.temperature, b.temperature, 1e-4);
    assert_true(a.bands < 32 && a.band_margin >= CP_THERMO_LATTICE_MARGIN);
    assert_int_equal(cp_thermo_match_lattice_auto(&tr, CP_BOSON, 5e-6, &spec, &hot, NULL), CP_OK);
    assert_true(hot.bands > a.bands && hot.temperature > a.temperature);
    /* one band cannot hold the entropy at a sensible temperature: it must come out hotter */
    cp_thermo_lattice one = lat;
    static double t1[3 * 16];
    assert_int_equal(cp_thermo_lattice_bands(spec.depth_er, LAMBDA, MASS, 1, 16, t1, &one, NULL),
                     CP_OK);
    cp_thermo_lattice_result r1;
    assert_int_equal(cp_thermo_match_lattice(&tr, CP_BOSON, 5e-6, &one, &r1, NULL), CP_OK);
    assert_true(r1.temperature > 2.0 * hot.temperature && r1.band_margin < 1.0);
}

/* ---- filling ------------------------------------------------------------------------- */

/* THERMO-L4: filling in a 300 E_r lattice at k_B T = E_r (excited orbitals ~35 k_B T up:
 * only the lowest matters, common practice, no source).  At the chemical potential the
 * model returns, the central site's probabilities equal the single-site atomic-limit
 * Hubbard sums written here, Z = sum_n zeta^n e^{-beta U n(n-1)/2} (bosons; U = 20 k_B T
 * >> k_B T, and hard-core) or 1 + zeta (fermions), zeta = e^{beta (mu - eps_0)} with eps_0
 * the lowest band's mean (its Wannier energy); the excited orbitals enter at e^{-23}.  The number: with one particle per site at
 * most, the LDA sum over sites is N = A F_{1/2}(beta (mu - eps_0)) (GSL's complete
 * Fermi-Dirac integral; the same integral as the harmonic-trap density of states), and every
 * occupied site holds one. */
static void test_filling_atomic_limit(void **state)
{
    (void)state;
    static double tables[3 * 2 * 16];
    double depth[3] = {300.0, 300.0, 300.0};
    cp_thermo_lattice lat;
    assert_int_equal(cp_thermo_lattice_bands(depth, LAMBDA, MASS, 2, 16, tables, &lat, NULL),
                     CP_OK);
    for (int a = 0; a < 3; a++)
        lat.omega_envelope[a] = OMEGA;
    lat.bins = 0;
    double eps0 = 0.0;
    for (int j = 0; j < 16; j++)
        eps0 += 3.0 * tables[j * 2] / 16.0;
    eps0 *= lat.recoil_energy;
    double kt = lat.recoil_energy, temperature = kt / CP_KB;
    double amp = amp_of(&lat, kt, OMEGA);
    for (int c = 0; c < 3; c++) {
        cp_statistics stat = c == 0 ? CP_FERMION : CP_BOSON;
        double u = c == 2 ? 20.0 * kt : INFINITY;
        double number = c == 2 ? 1e5 : 1e4;
        cp_thermo_trap tr = trap_of(number);
        cp_thermo_filling_result f;
        assert_int_equal(cp_thermo_lattice_filling(&lat, &tr, stat, temperature, u, &f, NULL),
                         CP_OK);
        double y = (f.chemical_potential - eps0) / kt, zeta = exp(y);
        print_message("case %d: beta (mu - eps_0) = %.4g\n", c, y);
        double z = 1.0, p1;
        if (c == 2) {
            z = 0.0;
            for (int n = 0; n < 60; n++)
                z += exp(n * y - 20.0 * n * (n - 1) / 2.0);
        } else {
            z = 1.0 + zeta;
        }
        p1 = zeta / z;
        assert_rel(f.center_empty, 1.0 / z, 1e-9);
        assert_rel(f.center_single, p1, 1e-9);
        assert_rel(f.center_empty + f.center_single + f.center_multiple, 1.0, 1e-12);
        if (c < 2) {
            assert_true(f.center_multiple < 1e-12);
            assert_rel(amp * gsl_sf_fermi_dirac_half(y), number, 1e-6);
            assert_rel(f.sites_occupied, number, 1e-6);
            assert_rel(f.single_fraction, 1.0, 1e-6);
        } else {
            /* a Mott plateau of one per site at the centre: mu between 0 and U */
            assert_true(y > 2.0 && y < 18.0);
            assert_true(f.center_single > 0.9 && f.center_multiple < 1e-3);
            /* 1 - P0 - P1: the excited orbitals (~e^{-23} each) shift it by ~3e-10 */
            double p2 = 1.0 - (1.0 + zeta) / z;
            assert_rel(f.center_multiple, p2, 1e-4);
        }
    }
}

/* THERMO-L4b: many orbitals (4 bands per axis of a 50 E_r lattice at k_B T = hbar omega/2):
 * the central site's P(0), P(1) and mean occupation against the product over all 64
 * orbitals written here, each at the sum of the axes' band means: fermions
 * P0 = prod 1/(1 + zeta_k), P1 = P0 sum zeta_k, n = sum zeta_k/(1 + zeta_k); hard-core bosons
 * the same for the lowest orbital and 1 - zeta_k, zeta_k/(1 - zeta_k) for the ideal excited
 * ones (single-site grand-canonical sums, by hand). */
static void test_filling_many_orbitals(void **state)
{
    (void)state;
    enum { NB = 4, NP = 16 };
    static double tables[3 * NB * NP];
    double depth[3] = {50.0, 50.0, 50.0};
    cp_thermo_lattice lat;
    assert_int_equal(cp_thermo_lattice_bands(depth, LAMBDA, MASS, NB, NP, tables, &lat, NULL),
                     CP_OK);
    for (int a = 0; a < 3; a++)
        lat.omega_envelope[a] = OMEGA;
    lat.bins = 0;
    double mean[NB] = {0};
    for (int n = 0; n < NB; n++) {
        for (int j = 0; j < NP; j++)
            mean[n] += tables[j * NB + n] / NP;
        mean[n] *= lat.recoil_energy;
    }
    double kt = sqrt(50.0) * lat.recoil_energy; /* hbar omega_site / 2 */
    for (int fermi = 0; fermi < 2; fermi++) {
        cp_thermo_trap tr = trap_of(fermi ? 3e4 : 1e4);
        cp_thermo_filling_result f;
        assert_int_equal(cp_thermo_lattice_filling(&lat, &tr, fermi ? CP_FERMION : CP_BOSON,
                                                   kt / CP_KB, INFINITY, &f, NULL),
                         CP_OK);
        double mu = f.chemical_potential, p0 = 1.0, r = 0.0, n = 0.0;
        for (int i = 0; i < NB; i++)
            for (int j = 0; j < NB; j++)
                for (int k = 0; k < NB; k++) {
                    double z = exp((mu - mean[i] - mean[j] - mean[k]) / kt);
                    int lowest = i + j + k == 0;
                    if (fermi || lowest) {
                        p0 /= 1.0 + z;
                        n += z / (1.0 + z);
                    } else {
                        p0 *= 1.0 - z;
                        n += z / (1.0 - z);
                    }
                    r += z;
                }
        print_message("%s: centre P0 %.6g P1 %.6g n %.6g\n", fermi ? "fermions" : "bosons",
                      f.center_empty, f.center_single, f.center_filling);
        assert_true(f.center_multiple > 1e-4); /* excited orbitals are occupied */
        assert_rel(f.center_empty, p0, 1e-8);
        assert_rel(f.center_single, p0 * r, 1e-8);
        assert_rel(f.center_filling, n, 1e-8);
    }
}

/* THERMO-L4c: two routes to the central filling of fermions in a deep lattice (300 E_r,
 * k_B T = 3 E_r, J ~ 1e-7 E_r): the band model's LDA (cp_thermo_lattice_state, mean
 * occupation per site at the centre) and the atomic limit (cp_thermo_lattice_filling).
 * With flat bands both are N = A sum_k F_{1/2}(beta (mu - eps_k)), so they differ only by
 * the band widths over k_B T and the quadratures. */
static void test_filling_two_routes(void **state)
{
    (void)state;
    static double tables[3 * 3 * 32];
    double depth[3] = {300.0, 300.0, 300.0};
    cp_thermo_lattice lat;
    assert_int_equal(cp_thermo_lattice_bands(depth, LAMBDA, MASS, 3, 32, tables, &lat, NULL),
                     CP_OK);
    for (int a = 0; a < 3; a++)
        lat.omega_envelope[a] = OMEGA;
    lat.bins = 0;
    double temperature = 3.0 * lat.recoil_energy / CP_KB;
    for (int i = 0; i < 2; i++) {
        cp_thermo_trap tr = trap_of(i ? 2e5 : 2e3);
        cp_thermo_lattice_result r;
        cp_thermo_filling_result f;
        assert_int_equal(cp_thermo_lattice_state(&lat, &tr, CP_FERMION, temperature, &r, NULL),
                         CP_OK);
        assert_int_equal(cp_thermo_lattice_filling(&lat, &tr, CP_FERMION, temperature, 0.0, &f,
                                                   NULL),
                         CP_OK);
        print_message("N = %g: centre filling %.8g (band model %.8g)\n", tr.number,
                      f.center_filling, r.peak_filling);
        assert_rel(f.center_filling, r.peak_filling, 1e-6);
    }
}

/* THERMO-L5: bad input: bosons without an on-site repulsion, NaN temperature, a NULL
 * lattice; outputs NaN. */
static void test_filling_bad_input(void **state)
{
    (void)state;
    static double tables[3 * 16];
    double depth[3] = {50.0, 50.0, 50.0};
    cp_thermo_lattice lat;
    assert_int_equal(cp_thermo_lattice_bands(depth, LAMBDA, MASS, 1, 16, tables, &lat, NULL),
                     CP_OK);
    for (int a = 0; a < 3; a++)
        lat.omega_envelope[a] = OMEGA;
    lat.bins = 0;
    cp_thermo_trap tr = trap_of(1e4);
    cp_thermo_filling_result f;
    cp_error err;
    assert_int_equal(cp_thermo_lattice_filling(&lat, &tr, CP_BOSON, 1e-7, 0.0, &f, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "onsite_u"));
    assert_true(isnan(f.center_empty) && isnan(f.sites_occupied));
    assert_int_equal(cp_thermo_lattice_filling(&lat, &tr, CP_FERMION, NAN, 0.0, &f, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "temperature"));
    assert_int_equal(cp_thermo_lattice_filling(NULL, &tr, CP_FERMION, 1e-7, 0.0, &f, &err),
                     CP_EINVAL);
    /* a work limit must be > 0 (+inf: none); the house wording of DEVELOPERS.md */
    assert_int_equal(cp_thermo_lattice_filling_bounded(&lat, &tr, CP_FERMION, 1e-7, 0.0, NULL,
                                                       NAN, &f, &err), CP_EINVAL);
    assert_string_equal(err.message, "thermo.lattice_filling: work limit NaN s is not a number; "
                                     "allowed (0, inf] s");
    assert_true(isnan(f.center_empty) && isnan(f.sites_occupied));
    lat.omega_envelope[1] = -1.0;
    assert_int_equal(cp_thermo_lattice_filling(&lat, &tr, CP_FERMION, 1e-7, 0.0, &f, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "omega_envelope_y"));
    cp_thermo_lattice_spec spec = {{50, 50, NAN}, LAMBDA, {OMEGA, OMEGA, OMEGA}, 0, 0};
    cp_thermo_lattice_result r;
    assert_int_equal(cp_thermo_match_lattice_auto(&tr, CP_FERMION, 1e-7, &spec, &r, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "depth_er (z)"));
    assert_true(isnan(r.temperature) && r.bands == 0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_direct_sums),
        cmocka_unit_test(test_harmonic_limit),
        cmocka_unit_test(test_auto_bands),
        cmocka_unit_test(test_filling_atomic_limit),
        cmocka_unit_test(test_filling_many_orbitals),
        cmocka_unit_test(test_filling_two_routes),
        cmocka_unit_test(test_filling_bad_input),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

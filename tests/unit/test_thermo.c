/*
 * Thermodynamics of ideal gases in harmonic traps and lattices (core/thermo*.c): the Bose
 * polylogarithm against independent evaluations (GSL's dilogarithm and zeta function, a
 * direct numerical integral of the Bose-Einstein integral), the trapped Fermi and Bose
 * gases against numerical integrals over the harmonic density of states, the Sommerfeld
 * and Boltzmann limits, T_c, the classical (Sackur-Tetrode-like) entropy, the inverses'
 * round trips, density profiles and time of flight, the lattice gas against its exact
 * limits, and bad input.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <gsl/gsl_sf_bessel.h>
#include <gsl/gsl_sf_dilog.h>
#include <gsl/gsl_sf_fermi_dirac.h>
#include <gsl/gsl_sf_gamma.h>
#include <gsl/gsl_sf_zeta.h>

#include "coldprep/consts.h"
#include "coldprep/lattice.h"
#include "coldprep/thermo.h"
#include "thermo_int.h"

#include "check_close.h"

#define MASS (127.0 * CP_AMU) /* a KRb-like molecule */
#define OMEGA (2.0 * CP_PI * 100.0)

static cp_thermo_trap iso_trap(double number)
{
    cp_thermo_trap t;
    cp_thermo_trap_isotropic(&t, number, OMEGA, MASS);
    return t;
}

/* ---- an independent polylogarithm: Li_s(z) = (1/Gamma(s)) int t^{s-1} / (e^t/z - 1) dt */

typedef struct be_params {
    double s, z;
} be_params;

static double be_integrand(double t, void *p)
{
    const be_params *b = p;
    if (t == 0.0)
        return 0.0;
    return pow(t, b->s - 1.0) / (exp(t) / b->z - 1.0);
}

static double polylog_by_integral(double s, double z)
{
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(2000);
    be_params b = {s, z};
    gsl_function f = {be_integrand, &b};
    double val, abserr;
    int st = gsl_integration_qagiu(&f, 0.0, 1e-14, 1e-13, 2000, w, &val, &abserr);
    gsl_integration_workspace_free(w);
    assert_int_equal(st, 0);
    return val / gsl_sf_gamma(s);
}

/* THERMO-1: Li_2 against GSL's real dilogarithm gsl_sf_dilog, Li_s(1) = zeta(s) against
 * gsl_sf_zeta, and Li_{3/2}, Li_{5/2}, Li_3, Li_4 against the Bose-Einstein integral
 * evaluated by GSL's adaptive quadrature (an independent second method), on both sides
 * of the switch between the two expansions at z = 1/2. */
static void test_polylog(void **state)
{
    (void)state;
    const double zs[] = {1e-6, 0.1, 0.3, 0.5, 0.5000001, 0.7, 0.9, 0.99, 0.999999};
    double v;
    for (size_t i = 0; i < sizeof zs / sizeof zs[0]; i++) {
        assert_int_equal(cp_polylog(2.0, zs[i], &v, NULL), CP_OK);
        assert_rel(v, gsl_sf_dilog(zs[i]), 1e-14);
    }
    const double orders[] = {1.5, 2.5, 3.0, 4.0};
    for (size_t k = 0; k < 4; k++) {
        assert_int_equal(cp_polylog(orders[k], 1.0, &v, NULL), CP_OK);
        assert_rel(v, gsl_sf_zeta(orders[k]), 1e-14);
        for (size_t i = 1; i < sizeof zs / sizeof zs[0] - 1; i++) {
            assert_int_equal(cp_polylog(orders[k], zs[i], &v, NULL), CP_OK);
            assert_rel(v, polylog_by_integral(orders[k], zs[i]), 1e-11);
        }
    }
    /* zeta(3/2) = 2.612375348685488 (DLMF 25.2, computed) */
    assert_int_equal(cp_polylog(1.5, 1.0, &v, NULL), CP_OK);
    assert_rel(v, 2.612375348685488, 1e-14);
    cp_error err;
    assert_int_equal(cp_polylog(2.0, 1.5, &v, &err), CP_EINVAL);
    assert_true(isnan(v));
    assert_int_equal(cp_polylog(1.0, 0.5, &v, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "order s"));
}

/* THERMO-2: GSL's Fermi-Dirac normalisation as used (GSL manual, Fermi-Dirac integrals):
 * F_2(0) = 3 zeta(3)/4 with zeta(3) from gsl_sf_zeta, F_j(x) = -Li_{j+1}(-e^x); and the
 * trapped Fermi gas against a direct numerical integral over the harmonic density of
 * states g(e) = e^2 / (2 (hbar w)^3): N and E at the solved chemical potential. */
typedef struct fd_params {
    double mu, kt, power;
} fd_params;

static double fd_integrand(double e, void *p)
{
    const fd_params *f = p;
    return pow(e, f->power) / (exp((e - f->mu) / f->kt) + 1.0);
}

/* int_0^inf e^power / (e^{(e - mu)/kt} + 1) de, all energies in units of hbar omega. */
static double harmonic_integral(double mu, double kt, double power)
{
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(2000);
    fd_params f = {mu, kt, power};
    gsl_function F = {fd_integrand, &f};
    double val, abserr, pts[2] = {0.0, fmax(mu, kt)};
    double head, tail;
    int st = gsl_integration_qagp(&F, pts, 2, 1e-300, 1e-12, 2000, w, &head, &abserr);
    assert_int_equal(st, 0);
    st = gsl_integration_qagiu(&F, pts[1], 1e-300, 1e-12, 2000, w, &tail, &abserr);
    assert_int_equal(st, 0);
    gsl_integration_workspace_free(w);
    val = head + tail;
    return val;
}

static void test_fermi_vs_integral(void **state)
{
    (void)state;
    assert_rel(gsl_sf_fermi_dirac_2(0.0), 0.75 * gsl_sf_zeta(3.0), 1e-14);
    assert_rel(gsl_sf_fermi_dirac_2(0.0), 0.9015426773696957, 1e-14); /* (3/4) zeta(3): DLMF 25.12 */
    cp_thermo_trap t = iso_trap(2e4);
    const double xs[] = {0.05, 0.2, 0.5, 2.0};
    for (size_t i = 0; i < 4; i++) {
        cp_thermo_fermi_result r;
        assert_int_equal(cp_thermo_fermi_at(&t, xs[i], &r, NULL), CP_OK);
        double hw = CP_HBAR * OMEGA, kt = CP_KB * r.temperature;
        double n = harmonic_integral(r.chemical_potential / hw, kt / hw, 2.0) / 2.0;
        double e = harmonic_integral(r.chemical_potential / hw, kt / hw, 3.0) / 2.0;
        assert_rel(n, 2e4, 1e-9);
        assert_rel(r.energy_per_particle, hw * e / n, 1e-9);
        assert_rel(r.t_over_tf, xs[i], 1e-14);
        /* T_F = hbar omega (6N)^{1/3} / k_B (Butts & Rokhsar 1997 [M]) */
        assert_rel(r.fermi_temperature, hw * cbrt(6.0 * 2e4) / CP_KB, 1e-14);
    }
}

/* THERMO-3: Sommerfeld expansion at T/T_F = 0.05 (docs/models/thermo.md; Butts & Rokhsar 1997):
 * mu = E_F [1 - (pi^2/3) x^2], E/N = (3/4) E_F [1 + (2 pi^2/3) x^2], S/N = pi^2 x.  The
 * next terms are O(x^4) for mu, E and O(x^3) for S, hence the tolerances. */
static void test_sommerfeld(void **state)
{
    (void)state;
    cp_thermo_trap t = iso_trap(1e5);
    cp_thermo_fermi_result r;
    double x = 0.05;
    assert_int_equal(cp_thermo_fermi_at(&t, x, &r, NULL), CP_OK);
    double ef = CP_KB * r.fermi_temperature, pi2 = CP_PI * CP_PI;
    assert_rel(r.chemical_potential, ef * (1.0 - pi2 / 3.0 * x * x), 1e-5);
    assert_rel(r.energy_per_particle, 0.75 * ef * (1.0 + 2.0 * pi2 / 3.0 * x * x), 3e-4);
    assert_rel(r.entropy_per_particle, pi2 * x, 1e-2);
    /* T = 0 peak density (2 m E_F / hbar^2)^{3/2} / (6 pi^2) (docs/models/thermo.md), O(x^2). */
    double n0 = pow(2.0 * MASS * ef / (CP_HBAR * CP_HBAR), 1.5) / (6.0 * pi2);
    assert_rel(r.peak_density, n0, 1e-2);
}

/* THERMO-4: Boltzmann limit at T/T_F = 10 (docs/models/thermo.md): z -> N (hbar w / k_B T)^3,
 * E/N -> 3 k_B T, the classical peak density N (m w^2 / (2 pi k_B T))^{3/2}; corrections
 * are O(z) ~ 1e-4. */
static void test_boltzmann(void **state)
{
    (void)state;
    cp_thermo_trap t = iso_trap(1e5);
    cp_thermo_fermi_result r;
    assert_int_equal(cp_thermo_fermi_at(&t, 10.0, &r, NULL), CP_OK);
    double kt = CP_KB * r.temperature, hw = CP_HBAR * OMEGA;
    double zc = 1e5 * pow(hw / kt, 3.0);
    assert_rel(r.fugacity, zc, 1e-4);
    assert_rel(r.energy_per_particle, 3.0 * kt, 1e-4);
    assert_rel(r.peak_density, 1e5 * pow(MASS * OMEGA * OMEGA / (2.0 * CP_PI * kt), 1.5), 1e-4);
}

/* THERMO-5: the classical gas in a harmonic trap (Sackur-Tetrode analogue, by hand from
 * Z_1 = (k_B T / hbar w)^3: S/N k_B = ln(Z_1/N) + 4) for fermions and bosons far above
 * degeneracy; corrections O(z) ~ 1e-5. */
static void test_classical_entropy(void **state)
{
    (void)state;
    cp_thermo_trap t = iso_trap(1e4);
    double temperature = 30.0 * CP_HBAR * OMEGA * cbrt(1e4) / CP_KB;
    double z1 = pow(CP_KB * temperature / (CP_HBAR * OMEGA), 3.0);
    double s_cl = log(z1 / 1e4) + 4.0;
    cp_thermo_fermi_result f;
    cp_thermo_bose_result b;
    assert_int_equal(cp_thermo_fermi(&t, temperature, &f, NULL), CP_OK);
    assert_int_equal(cp_thermo_bose(&t, temperature, &b, NULL), CP_OK);
    assert_rel(f.entropy_per_particle, s_cl, 1e-5);
    assert_rel(b.entropy_per_particle, s_cl, 1e-5);
}

/* THERMO-6: T_c = 0.94 hbar w N^{1/3} / k_B (F. Dalfovo, S. Giorgini, L. P. Pitaevskii,
 * S. Stringari, RMP 71, 463 (1999), Sec. II [M eq. number]), exactly zeta(3)^{-1/3} with
 * zeta(3) from gsl_sf_zeta; the condensed fraction 1 - (T/T_c)^3 (same source); the
 * fugacity above T_c checked by an independent Li_3 (Bose-Einstein integral by
 * quadrature); continuity of S and E at T_c. */
static void test_bose(void **state)
{
    (void)state;
    cp_thermo_trap t = iso_trap(1e5);
    cp_thermo_bose_result b;
    assert_int_equal(cp_thermo_bose_at(&t, 0.5, &b, NULL), CP_OK);
    double unit = CP_HBAR * OMEGA * cbrt(1e5) / CP_KB;
    assert_rel(b.critical_temperature, unit * pow(gsl_sf_zeta(3.0), -1.0 / 3.0), 1e-14);
    assert_rel(b.critical_temperature / unit, 0.94, 1e-3);
    assert_rel(b.condensed_fraction, 1.0 - 0.125, 1e-14);
    assert_rel(b.phase_space_density, gsl_sf_zeta(1.5), 1e-14);
    const double xs[] = {1.05, 1.5, 4.0};
    for (size_t i = 0; i < 3; i++) {
        assert_int_equal(cp_thermo_bose_at(&t, xs[i], &b, NULL), CP_OK);
        double kt = CP_KB * b.temperature;
        double n = pow(kt / (CP_HBAR * OMEGA), 3.0) * polylog_by_integral(3.0, b.fugacity);
        assert_rel(n, 1e5, 1e-10);
        assert_rel(b.phase_space_density, polylog_by_integral(1.5, b.fugacity), 1e-10);
        assert_true(b.condensed_fraction == 0.0);
    }
    cp_thermo_bose_result lo, hi;
    assert_int_equal(cp_thermo_bose_at(&t, 1.0, &lo, NULL), CP_OK);
    assert_int_equal(cp_thermo_bose_at(&t, 1.0 + 1e-9, &hi, NULL), CP_OK);
    assert_rel(hi.entropy_per_particle, lo.entropy_per_particle, 1e-6);
    assert_rel(hi.energy_per_particle, lo.energy_per_particle, 1e-6);
    /* S/N at T_c = 4 zeta(4)/zeta(3) (docs/models/thermo.md relations at z = 1) */
    assert_rel(lo.entropy_per_particle, 4.0 * gsl_sf_zeta(4.0) / gsl_sf_zeta(3.0), 1e-14);
}

/* THERMO-7: the inverses round-trip to 1e-10 relative (the accuracy asked of them):
 * T -> T/T_F -> T, T -> T/T_c -> T and T -> S/N -> T for both statistics. */
static void test_round_trips(void **state)
{
    (void)state;
    cp_thermo_trap t = iso_trap(3e4);
    t.omega[2] = 10.0 * OMEGA;
    const double xf[] = {0.003, 0.05, 0.3, 1.0, 8.0, 300.0};
    for (size_t i = 0; i < 6; i++) {
        cp_thermo_fermi_result a, b;
        double back;
        assert_int_equal(cp_thermo_fermi_at(&t, xf[i], &a, NULL), CP_OK);
        assert_int_equal(cp_thermo_fermi(&t, a.temperature, &b, NULL), CP_OK);
        assert_rel(b.t_over_tf, xf[i], 1e-12);
        assert_rel(b.log_fugacity, a.log_fugacity, 1e-12);
        assert_int_equal(cp_thermo_temperature_from_entropy(&t, CP_FERMION,
                                                            a.entropy_per_particle, &back, NULL),
                         CP_OK);
        assert_rel(back, a.temperature, 1e-10);
    }
    const double xb[] = {0.05, 0.5, 0.99, 1.0, 1.01, 2.0, 50.0};
    for (size_t i = 0; i < 7; i++) {
        cp_thermo_bose_result a, b;
        double back;
        assert_int_equal(cp_thermo_bose_at(&t, xb[i], &a, NULL), CP_OK);
        assert_int_equal(cp_thermo_bose(&t, a.temperature, &b, NULL), CP_OK);
        assert_rel(b.t_over_tc, xb[i], 1e-12);
        assert_int_equal(cp_thermo_temperature_from_entropy(&t, CP_BOSON,
                                                            a.entropy_per_particle, &back, NULL),
                         CP_OK);
        assert_rel(back, a.temperature, 1e-10);
    }
}

/* THERMO-8: harmonic -> harmonic entropy matching.  In the semiclassical ideal gas S/N
 * depends on k_B T / (hbar omega_bar N^{1/3}) only, so an adiabatic change of omega_bar
 * scales T by the same factor (by hand from the relations of docs/models/thermo.md). */
static void test_match_harmonic(void **state)
{
    (void)state;
    cp_thermo_trap t = iso_trap(5e4);
    double to[3] = {2.0 * OMEGA, 3.0 * OMEGA, 0.5 * OMEGA}; /* omega_bar x 3^{1/3} */
    double temperature = 200e-9, out;
    for (int s = 0; s < 2; s++) {
        cp_statistics stat = s ? CP_FERMION : CP_BOSON;
        assert_int_equal(cp_thermo_match_harmonic(&t, stat, temperature, to, &out, NULL), CP_OK);
        assert_rel(out, temperature * cbrt(3.0), 1e-10);
    }
}

/* THERMO-9: the LDA density profile integrates to N (radial quadrature with GSL, a second
 * method) and its centre is the peak density; the ideal condensate adds N0. */
typedef struct profile_params {
    cp_thermo_trap *trap;
    cp_statistics stat;
    double temperature, length;
} profile_params;

/* 4 pi r^2 n(r) L^3 at r = u L (dimensionless for the quadrature). */
static double shell(double u, void *p)
{
    const profile_params *q = p;
    cp_thermo_density_result d;
    double pos[3] = {u * q->length, 0.0, 0.0};
    if (cp_thermo_density(q->trap, q->stat, q->temperature, pos, &d, NULL) != CP_OK)
        return NAN;
    return 4.0 * CP_PI * u * u * d.density * pow(q->length, 3.0);
}

static double integrate_profile(cp_thermo_trap *t, cp_statistics stat, double temperature)
{
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(2000);
    /* the oscillator length sets the condensate's scale; the thermal cloud is wider */
    profile_params p = {t, stat, temperature, sqrt(CP_HBAR / (MASS * OMEGA))};
    gsl_function f = {shell, &p};
    double val, abserr, pts[3] = {0.0, 5.0, 200.0};
    int st = gsl_integration_qagp(&f, pts, 3, 0.0, 1e-10, 2000, w, &val, &abserr);
    gsl_integration_workspace_free(w);
    /* GSL may report round-off (EROUND) near 1e-10; the error estimate must still be small */
    assert_true(st == GSL_SUCCESS || st == GSL_EROUND);
    if (!(abserr < 1e-9 * fabs(val)))
        fail_msg("profile integral %.12g +- %.3g, status %d", val, abserr, st);
    return val;
}

static void test_density(void **state)
{
    (void)state;
    cp_thermo_trap t = iso_trap(2e4);
    cp_thermo_fermi_result f;
    assert_int_equal(cp_thermo_fermi_at(&t, 0.2, &f, NULL), CP_OK);
    assert_rel(integrate_profile(&t, CP_FERMION, f.temperature), 2e4, 1e-8);
    cp_thermo_density_result d;
    double origin[3] = {0, 0, 0};
    assert_int_equal(cp_thermo_density(&t, CP_FERMION, f.temperature, origin, &d, NULL), CP_OK);
    assert_rel(d.density, f.peak_density, 1e-14);
    double far[3] = {0.0, 0.0, 1e-3}; /* ~250 cloud radii: the tail underflows to 0 */
    assert_int_equal(cp_thermo_density(&t, CP_FERMION, f.temperature, far, &d, NULL), CP_OK);
    assert_true(d.density == 0.0);
    cp_thermo_bose_result b;
    assert_int_equal(cp_thermo_bose_at(&t, 0.7, &b, NULL), CP_OK);
    assert_rel(integrate_profile(&t, CP_BOSON, b.temperature), 2e4, 1e-8);
    assert_int_equal(cp_thermo_density(&t, CP_BOSON, b.temperature, origin, &d, NULL), CP_OK);
    assert_rel(d.condensate_density, b.condensate_peak_density, 1e-14);
    assert_rel(d.thermal_density, b.peak_density, 1e-14);
}

/* THERMO-10: time of flight.  Classical gas: sigma = sqrt(k_B T / (m w^2)) (equipartition)
 * growing as sqrt(1 + w^2 t^2) (ballistic expansion, by hand); degenerate Fermi gas:
 * <x^2> = R_F^2 / 8 with R_F = sqrt(2 E_F / (m w^2)) (Butts & Rokhsar 1997 [M]) up to the
 * O((T/T_F)^2) Sommerfeld correction; ideal condensate sqrt(hbar / (2 m w)). */
static void test_tof(void **state)
{
    (void)state;
    cp_thermo_trap t = iso_trap(2e4);
    t.omega[0] = 0.25 * OMEGA;
    cp_thermo_fermi_result f;
    cp_thermo_tof_result r;
    assert_int_equal(cp_thermo_fermi_at(&t, 20.0, &f, NULL), CP_OK);
    assert_int_equal(cp_thermo_tof(&t, CP_FERMION, f.temperature, 0.01, &r, NULL), CP_OK);
    for (int i = 0; i < 3; i++) {
        double w = t.omega[i];
        double s0 = sqrt(CP_KB * f.temperature / (MASS * w * w));
        assert_rel(r.sigma_trap[i], s0, 1e-4);
        assert_rel(r.sigma_tof[i], s0 * sqrt(1.0 + w * w * 1e-4), 1e-4);
        assert_true(isnan(r.condensate_sigma_trap[i]));
    }
    assert_int_equal(cp_thermo_fermi_at(&t, 0.02, &f, NULL), CP_OK);
    assert_int_equal(cp_thermo_tof(&t, CP_FERMION, f.temperature, 0.0, &r, NULL), CP_OK);
    double ef = CP_KB * f.fermi_temperature;
    assert_rel(r.sigma_trap[1], sqrt(2.0 * ef / (MASS * OMEGA * OMEGA) / 8.0), 2e-3);
    cp_thermo_bose_result b;
    assert_int_equal(cp_thermo_bose_at(&t, 0.5, &b, NULL), CP_OK);
    assert_int_equal(cp_thermo_tof(&t, CP_BOSON, b.temperature, 0.02, &r, NULL), CP_OK);
    assert_rel(r.condensate_sigma_trap[2], sqrt(CP_HBAR / (2.0 * MASS * OMEGA)), 1e-14);
}

/* ---- lattice ------------------------------------------------------------------------ */

#define NQ 32
#define NB 6

/* Free-particle bands folded into the zone (a lattice of zero depth): band n at reduced
 * quasimomentum q in [0, 1] has the energy (|q| + 2m)^2 or (2m - |q|)^2 in E_r. */
static void free_bands(double *e)
{
    for (int j = 0; j < NQ; j++) {
        double q = (j + 0.5) / NQ;
        for (int n = 0; n < NB; n++) {
            int m = (n + 1) / 2;
            double k = n == 0 ? q : (n % 2 ? 2.0 * m - q : q + 2.0 * m);
            e[j * NB + n] = k * k;
        }
    }
}

static cp_thermo_lattice make_lattice(const double *table, int bands, int points, int bins)
{
    cp_thermo_lattice lat;
    double k = 2.0 * CP_PI / 1064e-9;
    for (int a = 0; a < 3; a++) {
        lat.axis[a].bands = bands;
        lat.axis[a].points = points;
        lat.axis[a].energy_er = table;
        lat.omega_envelope[a] = OMEGA;
    }
    lat.recoil_energy = CP_HBAR * CP_HBAR * k * k / (2.0 * MASS);
    lat.spacing = 1064e-9 / 2.0;
    lat.bins = bins;
    return lat;
}

/* THERMO-11: a lattice of zero depth with the trap as envelope is the harmonic trap
 * itself: the lattice-plus-envelope gas must reproduce the harmonic-trap entropy and
 * energy (exact limit of the model; the quasimomentum grid and the bins set the
 * tolerance), and entropy matching into it returns the initial temperature. */
static void test_lattice_free_limit(void **state)
{
    (void)state;
    static double table[NQ * NB];
    free_bands(table);
    cp_thermo_lattice lat = make_lattice(table, NB, NQ, 256);
    cp_thermo_trap t = iso_trap(1e5);
    cp_thermo_fermi_result f;
    assert_int_equal(cp_thermo_fermi_at(&t, 0.4, &f, NULL), CP_OK);
    cp_thermo_lattice_result r;
    assert_int_equal(cp_thermo_lattice_state(&lat, &t, CP_FERMION, f.temperature, &r, NULL),
                     CP_OK);
    assert_rel(r.entropy_per_particle, f.entropy_per_particle, 1e-5);
    assert_rel(r.energy_per_particle, f.energy_per_particle, 1e-5);
    assert_rel(r.chemical_potential, f.chemical_potential, 1e-4);
    assert_int_equal(cp_thermo_match_lattice(&t, CP_FERMION, f.temperature, &lat, &r, NULL),
                     CP_OK);
    assert_rel(r.temperature, f.temperature, 1e-5);
    /* Bosons below T_c: the |q| kink of the Bose integrand at the band bottom limits the
     * midpoint grid to ~(1/NQ)^2 relative accuracy. */
    cp_thermo_bose_result b;
    assert_int_equal(cp_thermo_bose_at(&t, 0.8, &b, NULL), CP_OK);
    assert_int_equal(cp_thermo_lattice_state(&lat, &t, CP_BOSON, b.temperature, &r, NULL), CP_OK);
    assert_rel(r.entropy_per_particle, b.entropy_per_particle, 2e-3);
    assert_rel(r.condensed_fraction, b.condensed_fraction, 2e-3);
}

/* THERMO-12: tight-binding band E(q) = 2J (1 - cos(pi q)) per axis in the classical
 * (dilute) limit: Z_1 = A [e^{-2 beta J} I_0(2 beta J)]^3 with the modified Bessel
 * function from GSL, E/N = (3/2) k_B T + 3 <e>, <e> = 2J (1 - I_1/I_0), and
 * S/N k_B = ln(Z_1/N) + 1 + E/(N k_B T) (by hand); quantum corrections O(z) ~ 1e-5. */
static void test_lattice_tight_binding(void **state)
{
    (void)state;
    static double table[64];
    double j_er = 0.05; /* J in E_r */
    for (int j = 0; j < 64; j++)
        table[j] = 2.0 * j_er * (1.0 - cos(CP_PI * (j + 0.5) / 64));
    cp_thermo_lattice lat = make_lattice(table, 1, 64, 512);
    for (int a = 0; a < 3; a++)
        lat.omega_envelope[a] = OMEGA / 10.0; /* a weak envelope: fugacity ~1e-4 */
    cp_thermo_trap t = iso_trap(10.0);
    double kt = 2.0 * j_er * lat.recoil_energy, temperature = kt / CP_KB;
    double bj = 2.0 * j_er * lat.recoil_energy / kt;
    double i0 = gsl_sf_bessel_I0(bj), i1 = gsl_sf_bessel_I1(bj);
    double d3 = pow(lat.spacing, 3.0);
    double we = OMEGA / 10.0;
    double amp = pow(2.0 * CP_PI * kt / (MASS * we * we), 1.5) / d3;
    double z1 = amp * pow(exp(-bj) * i0, 3.0);
    double e_mean = 2.0 * j_er * lat.recoil_energy * (1.0 - i1 / i0);
    double s_cl = log(z1 / 10.0) + 1.0 + 1.5 + 3.0 * e_mean / kt;
    for (int s = 0; s < 2; s++) {
        cp_thermo_lattice_result r;
        assert_int_equal(cp_thermo_lattice_state(&lat, &t, s ? CP_FERMION : CP_BOSON,
                                                 temperature, &r, NULL),
                         CP_OK);
        assert_rel(r.entropy_per_particle, s_cl, 1e-4);
        assert_rel(r.energy_per_particle, 1.5 * kt + 3.0 * e_mean, 1e-4);
    }
}

/* THERMO-13: band tables from the lattice model (cp_lattice_band_energies): at zero depth
 * they are the free-particle energies q^2 (by hand), and a deep lattice gives a narrow
 * lowest band near the harmonic on-site energy (hbar w_site/2 = sqrt(V0/E_r) E_r,
 * docs/models/lattice.md, up to the anharmonic shift -E_r/4 [M]). */
static void test_lattice_bands_from_solver(void **state)
{
    (void)state;
    double tables[3 * 2 * 16], depth[3] = {0.0, 0.0, 0.0};
    cp_thermo_lattice lat;
    assert_int_equal(cp_thermo_lattice_bands(depth, 1064e-9, MASS, 2, 16, tables, &lat, NULL),
                     CP_OK);
    for (int j = 0; j < 16; j++) {
        double q = (j + 0.5) / 16;
        assert_rel(lat.axis[1].energy_er[j * 2], q * q, 1e-9);
        assert_rel(lat.axis[2].energy_er[j * 2 + 1], (2.0 - q) * (2.0 - q), 1e-9);
    }
    assert_rel(lat.recoil_energy, CP_H * CP_H / (2.0 * MASS * 1064e-9 * 1064e-9), 1e-14);
    double deep[3] = {100.0, 100.0, 100.0};
    assert_int_equal(cp_thermo_lattice_bands(deep, 1064e-9, MASS, 1, 16, tables, &lat, NULL),
                     CP_OK);
    assert_rel(lat.axis[0].energy_er[0], sqrt(100.0) - 0.25, 1e-2);
    cp_error err;
    double bad[3] = {10.0, NAN, 10.0};
    assert_int_equal(cp_thermo_lattice_bands(bad, 1064e-9, MASS, 1, 16, tables, &lat, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "depth_er (y)"));
    assert_true(isnan(tables[0]));
}

/* THERMO-14: bad input everywhere gets CP_EINVAL, a message naming the parameter, and
 * NaN outputs. */
static void test_bad_input(void **state)
{
    (void)state;
    const double bad[] = {NAN, INFINITY, -INFINITY, 0.0, -1.0, 1e300};
    cp_error err;
    cp_thermo_fermi_result f;
    cp_thermo_bose_result b;
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        cp_thermo_trap t = iso_trap(1e4);
        t.number = bad[i];
        assert_int_equal(cp_thermo_fermi(&t, 1e-7, &f, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "number"));
        assert_true(isnan(f.fugacity) && isnan(f.entropy_per_particle));
        t = iso_trap(1e4);
        t.omega[1] = bad[i];
        assert_int_equal(cp_thermo_bose(&t, 1e-7, &b, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "omega_y"));
        assert_true(isnan(b.critical_temperature));
        t = iso_trap(1e4);
        t.mass = bad[i];
        assert_int_equal(cp_thermo_fermi_at(&t, 0.3, &f, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "mass"));
        t = iso_trap(1e4);
        assert_int_equal(cp_thermo_fermi(&t, bad[i], &f, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "temperature"));
        assert_int_equal(cp_thermo_bose_at(&t, bad[i] == 0.0 ? -1.0 : bad[i], &b, &err),
                         CP_EINVAL);
        double out;
        assert_int_equal(cp_thermo_temperature_from_entropy(&t, CP_BOSON, bad[i], &out, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "entropy_per_particle"));
        assert_true(isnan(out));
        double pos[3] = {0.0, isfinite(bad[i]) ? -2.0 - fabs(bad[i]) : bad[i], 0.0};
        cp_thermo_density_result d;
        assert_int_equal(cp_thermo_density(&t, CP_FERMION, 1e-7, pos, &d, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "y "));
        assert_true(isnan(d.density));
        cp_thermo_tof_result r;
        assert_int_equal(cp_thermo_tof(&t, CP_BOSON, 1e-7, bad[i] == 0.0 ? -1.0 : bad[i], &r,
                                       &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "time"));
        assert_true(isnan(r.sigma_tof[0]));
    }
    cp_thermo_trap t = iso_trap(1e4);
    /* T/T_F outside [0.002, 1e8] */
    assert_int_equal(cp_thermo_fermi_at(&t, 0.001, &f, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "T/T_F"));
    assert_int_equal(cp_thermo_fermi(&t, 1e-12, &f, &err), CP_EINVAL);
    assert_int_equal(cp_thermo_fermi_at(&t, 1e9, &f, &err), CP_EINVAL);
    /* entropy below the smallest allowed T/T_F for fermions */
    double out;
    assert_int_equal(cp_thermo_temperature_from_entropy(&t, CP_FERMION, 1e-3, &out, &err),
                     CP_EINVAL);
    assert_int_equal(cp_thermo_temperature_from_entropy(&t, CP_FERMION, 41.0, &out, &err),
                     CP_EINVAL);
    /* unknown statistics */
    cp_thermo_density_result d;
    double origin[3] = {0, 0, 0};
    assert_int_equal(cp_thermo_density(&t, (cp_statistics)7, 1e-7, origin, &d, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "statistics"));
    out = 1.0;
    assert_int_equal(cp_thermo_temperature_from_entropy(&t, (cp_statistics)7, 2.0, &out, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "statistics"));
    assert_true(isnan(out));
    out = 1.0;
    assert_int_equal(cp_thermo_match_harmonic(&t, (cp_statistics)7, 1e-7, t.omega, &out, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "statistics"));
    assert_true(isnan(out));
    /* a bad trap is reported by the function the caller called, not by the one it uses */
    cp_thermo_trap flat = iso_trap(1e4);
    flat.omega[2] = 0.0;
    cp_thermo_tof_result tof;
    assert_int_equal(cp_thermo_tof(&flat, CP_FERMION, 1e-7, 1e-3, &tof, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "thermo.tof: omega_z"));
    assert_int_equal(cp_thermo_density(&flat, CP_BOSON, 1e-7, origin, &d, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "thermo.density: omega_z"));
    assert_int_equal(cp_thermo_match_harmonic(&flat, CP_BOSON, 1e-7, t.omega, &out, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "thermo.match_harmonic: omega_z"));
    /* absurd magnitudes: below 1 pK, a trap weaker than 1e-2 rad/s (check_int.h floors) */
    assert_int_equal(cp_thermo_bose(&t, 1e-13, &b, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "temperature"));
    cp_thermo_trap weak = iso_trap(1e4);
    weak.omega[0] = 1e-3;
    assert_int_equal(cp_thermo_fermi(&weak, 1e-7, &f, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "omega_x"));
    /* NULL inputs: an error, not a crash */
    assert_int_equal(cp_thermo_fermi(NULL, 1e-7, &f, &err), CP_EINVAL);
    assert_true(isnan(f.fugacity));
    assert_int_equal(cp_thermo_bose_at(NULL, 0.5, &b, &err), CP_EINVAL);
    assert_int_equal(cp_thermo_temperature_from_entropy(NULL, CP_BOSON, 2.0, &out, &err),
                     CP_EINVAL);
    assert_int_equal(cp_thermo_density(&t, CP_BOSON, 1e-7, NULL, &d, &err), CP_EINVAL);
    assert_true(isnan(d.density));
    assert_int_equal(cp_thermo_match_harmonic(&t, CP_BOSON, 1e-7, NULL, &out, &err), CP_EINVAL);
    assert_true(isnan(out));
    cp_thermo_lattice_result lr;
    assert_int_equal(cp_thermo_lattice_state(NULL, &t, CP_FERMION, 1e-7, &lr, &err), CP_EINVAL);
    assert_int_equal(cp_thermo_match_lattice(&t, CP_FERMION, 1e-7, NULL, &lr, &err), CP_EINVAL);
    assert_true(isnan(lr.temperature));
    double to[3] = {OMEGA, 0.0, OMEGA};
    assert_int_equal(cp_thermo_match_harmonic(&t, CP_FERMION, 1e-7, to, &out, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "final trap"));
    assert_true(isnan(out));
    /* lattice */
    static double table[NQ * NB];
    free_bands(table);
    cp_thermo_lattice_result r;
    cp_thermo_lattice lat = make_lattice(table, 1, NQ, 0);
    cp_thermo_lattice l2 = lat;
    l2.axis[1].bands = 0;
    assert_int_equal(cp_thermo_lattice_state(&l2, &t, CP_FERMION, 1e-7, &r, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "bands"));
    assert_true(isnan(r.entropy_per_particle));
    l2 = lat;
    l2.axis[0].points = 3;
    assert_int_equal(cp_thermo_lattice_state(&l2, &t, CP_FERMION, 1e-7, &r, &err), CP_EINVAL);
    l2 = lat;
    l2.recoil_energy = NAN;
    assert_int_equal(cp_thermo_match_lattice(&t, CP_BOSON, 1e-7, &l2, &r, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "recoil_energy"));
    l2 = lat;
    l2.spacing = -1.0;
    assert_int_equal(cp_thermo_match_lattice(&t, CP_BOSON, 1e-7, &l2, &r, &err), CP_EINVAL);
    l2 = lat;
    l2.omega_envelope[2] = INFINITY;
    assert_int_equal(cp_thermo_lattice_state(&l2, &t, CP_BOSON, 1e-7, &r, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "omega_envelope_z"));
    l2 = lat;
    l2.bins = 5;
    assert_int_equal(cp_thermo_lattice_state(&l2, &t, CP_BOSON, 1e-7, &r, &err), CP_EINVAL);
    double nan_table[NQ];
    for (int j = 0; j < NQ; j++)
        nan_table[j] = j == 7 ? NAN : 0.1 * j;
    l2 = lat;
    l2.axis[2].energy_er = nan_table;
    assert_int_equal(cp_thermo_lattice_state(&l2, &t, CP_FERMION, 1e-7, &r, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "band energy"));
    assert_int_equal(cp_thermo_lattice_state(&lat, &t, CP_FERMION, NAN, &r, &err), CP_EINVAL);
    assert_int_equal(cp_thermo_match_lattice(&t, CP_FERMION, -1e-7, &lat, &r, &err), CP_EINVAL);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_polylog),
        cmocka_unit_test(test_fermi_vs_integral),
        cmocka_unit_test(test_sommerfeld),
        cmocka_unit_test(test_boltzmann),
        cmocka_unit_test(test_classical_entropy),
        cmocka_unit_test(test_bose),
        cmocka_unit_test(test_round_trips),
        cmocka_unit_test(test_match_harmonic),
        cmocka_unit_test(test_density),
        cmocka_unit_test(test_tof),
        cmocka_unit_test(test_lattice_free_limit),
        cmocka_unit_test(test_lattice_tight_binding),
        cmocka_unit_test(test_lattice_bands_from_solver),
        cmocka_unit_test(test_bad_input),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

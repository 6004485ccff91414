/*
 * Collisions and losses (core/collisions*.c): the mean scattering length and the
 * centrifugal barrier against the published constants and a direct numerical maximisation,
 * the universal rates against the published prefactor and its independent check, the
 * dipole length in atomic units, the hold against the analytic solutions (fixed T, with
 * anti-evaporation heating, one-body loss, technical heating), the evaporation rate of a
 * truncated Boltzmann gas against a Monte Carlo written here and the published closed and
 * large-eta forms, the evaporation model's lossless scaling law, and bad input.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_min.h>
#include <gsl/gsl_randist.h>
#include <gsl/gsl_rng.h>
#include <gsl/gsl_sf_gamma.h>

#include "coldprep/collisions.h"
#include "coldprep/consts.h"

#include "check_close.h"

#define M_KRB (126.873178694 * CP_AMU) /* 40K87Rb, AME2020 atomic masses */
#define MU_KRB (M_KRB / 2.0)

/* COLL-1: abar = [2 pi / Gamma(1/4)^2] (2 mu C6 / hbar^2)^{1/4} with Gamma(1/4) from GSL's
 * gsl_sf_gamma, = 0.955978 R_vdW (Gribakin & Flambaum, PRA 48, 546 (1993); constant [C] in
 * docs/models/feshbach.md); for KRb
 * (C6 = 16130 a.u. [M], docs/data.md) abar is about 118 a0 [M, Idziaszek & Julienne
 * 2010]. */
static void test_abar(void **state)
{
    (void)state;
    double abar;
    assert_int_equal(cp_collisions_mean_scattering_length(16130.0, MU_KRB, &abar, NULL), CP_OK);
    double beta6 = pow(2.0 * MU_KRB * 16130.0 * CP_AU_C6 / (CP_HBAR * CP_HBAR), 0.25);
    double g = gsl_sf_gamma(0.25);
    assert_rel(abar, 2.0 * M_PI / (g * g) * beta6, 1e-13);
    assert_rel(abar, 0.955978 * 0.5 * beta6, 1e-6);
    assert_rel(abar / CP_A0, 118.0, 0.01);
}

/* The effective potential hbar^2 l(l+1)/(2 mu r^2) - C6/r^6, negated for the minimiser. */
typedef struct veff {
    double l, mu, c6;
} veff;

static double minus_veff(double r, void *p)
{
    const veff *v = p;
    return -(CP_HBAR * CP_HBAR * v->l * (v->l + 1.0) / (2.0 * v->mu * r * r) -
             v->c6 / pow(r, 6.0));
}

/* COLL-2: the l = 1 barrier of KRb-like molecules (C6 ~ 16000 a.u., mass 127 u) lies
 * near 24 uK (a figure of the trade: common practice, no source); the closed form against
 * a direct numerical maximisation of the effective potential (GSL Brent minimiser) for
 * l = 1, 2, 3. */
static void test_barrier(void **state)
{
    (void)state;
    double e;
    assert_int_equal(cp_collisions_barrier(16000.0, 127.0 * CP_AMU / 2.0, 1, &e, NULL), CP_OK);
    assert_rel(e / CP_KB, 24e-6, 0.03);
    for (int l = 1; l <= 3; l++) {
        veff v = {l, MU_KRB, 16130.0 * CP_AU_C6};
        assert_int_equal(cp_collisions_barrier(16130.0, MU_KRB, l, &e, NULL), CP_OK);
        gsl_min_fminimizer *m = gsl_min_fminimizer_alloc(gsl_min_fminimizer_brent);
        gsl_function f = {minus_veff, &v};
        /* bracket the maximum by a coarse logarithmic scan over 30..1e4 a0 */
        double best = 0.0, guess = 0.0, step = pow(1e4 / 30.0, 1.0 / 400.0);
        for (double r = 30.0 * CP_A0; r < 1e4 * CP_A0; r *= step)
            if (-minus_veff(r, &v) > best) {
                best = -minus_veff(r, &v);
                guess = r;
            }
        double lo = guess / step, hi = guess * step;
        assert_int_equal(gsl_min_fminimizer_set(m, &f, guess, lo, hi), GSL_SUCCESS);
        for (int it = 0; it < 200; it++) {
            gsl_min_fminimizer_iterate(m);
            if (gsl_min_test_interval(gsl_min_fminimizer_x_lower(m),
                                      gsl_min_fminimizer_x_upper(m), 0.0, 1e-12) == GSL_SUCCESS)
                break;
        }
        double peak = -gsl_min_fminimizer_f_minimum(m);
        gsl_min_fminimizer_free(m);
        assert_rel(e, peak, 1e-10);
    }
}

/* COLL-3: universal rates (Z. Idziaszek & P. S. Julienne, PRL 104, 113202 (2010)):
 * K_p = 1513 abar^3 k_B T / h, checked against the independent prefactor
 * g 18 pi^2 0.4649114 / 0.477989^3 = 1512.58 from the numerical threshold solution of the
 * same paper's quantum-defect model (computed, not a published table); the p-wave rate is linear in T (Wigner threshold law); KRb's
 * universal beta/T is about 0.8e-5 cm^3 s^-1 K^-1 (Idziaszek & Julienne 2010 [M]);
 * the s-wave rates 4 pi hbar abar g / mu with g = 2 (identical bosons), 1 (distinguishable). */
static void test_universal(void **state)
{
    (void)state;
    double abar, kp, kp2, kb, kd;
    assert_int_equal(cp_collisions_mean_scattering_length(16130.0, MU_KRB, &abar, NULL), CP_OK);
    assert_int_equal(
        cp_collisions_universal_rate(16130.0, MU_KRB, 1e-6, CP_PAIR_FERMIONS, &kp, NULL), CP_OK);
    double prefactor = 2.0 * 18.0 * CP_PI * CP_PI * 0.4649114 / pow(0.477989, 3.0);
    assert_rel(kp, prefactor * pow(abar, 3.0) * CP_KB * 1e-6 / CP_H, 5e-4);
    assert_int_equal(
        cp_collisions_universal_rate(16130.0, MU_KRB, 2e-6, CP_PAIR_FERMIONS, &kp2, NULL), CP_OK);
    assert_rel(kp2, 2.0 * kp, 1e-14);
    assert_rel(kp / 1e-6 * 1e6, 0.8e-5, 0.1); /* m^3 -> cm^3, per kelvin */
    assert_int_equal(cp_collisions_universal_rate(16130.0, MU_KRB, 1e-6, CP_PAIR_BOSONS, &kb, NULL),
                     CP_OK);
    assert_int_equal(
        cp_collisions_universal_rate(16130.0, MU_KRB, 1e-3, CP_PAIR_DISTINGUISHABLE, &kd, NULL),
        CP_OK);
    assert_rel(kb, 8.0 * CP_PI * CP_HBAR * abar / MU_KRB, 1e-14);
    assert_rel(kd, kb / 2.0, 1e-14);
}

/* The first Born amplitude of two dipoles polarised along z, in units of the dipole length
 * D: the Fourier transform of (1 - 3 cos^2 theta)/r^3 is (4 pi/3)(3 cos^2 theta_q - 1), so
 * f(k -> k') = -(2/3)(3 (q.z/|q|)^2 - 1) with q = k - k' (depends on the direction of q
 * only). */
static double born_dipolar(double qx, double qy, double qz)
{
    double q = sqrt(qx * qx + qy * qy + qz * qz);
    double c = qz / q;
    return -(2.0 / 3.0) * (3.0 * c * c - 1.0);
}

/* sigma / (pi D^2) averaged over incident directions by midpoint quadrature on both unit
 * spheres: sign = -1 identical fermions, +1 identical bosons (sigma = (1/2) int |f(k') +-
 * f(-k')|^2 dOmega'), 0 distinguishable (sigma = int |f|^2 dOmega'). */
static double born_cross_section(int sign)
{
    const int n = 120;
    double total = 0.0;
    for (int i = 0; i < n; i++) {
        double ct = -1.0 + (i + 0.5) * 2.0 / n, st = sqrt(1.0 - ct * ct);
        for (int j = 0; j < n; j++) {
            double ct2 = -1.0 + (j + 0.5) * 2.0 / n, st2 = sqrt(1.0 - ct2 * ct2);
            for (int l = 0; l < 2 * n; l++) {
                double ph = (l + 0.5) * CP_PI / n;
                double px = st2 * cos(ph), py = st2 * sin(ph);
                double a = born_dipolar(st - px, -py, ct - ct2);
                double b = born_dipolar(st + px, py, ct + ct2);
                double amp = sign == 0 ? a : a + sign * b;
                total += amp * amp * (2.0 / n) * (CP_PI / n) * (sign == 0 ? 1.0 : 0.5);
            }
        }
    }
    return total / n / CP_PI; /* the mean over cos(theta_k) in [-1, 1] (weight 2/n each, /2) */
}

/* COLL-4: dipole length D = mu d^2 / (4 pi eps0 hbar^2) equals (mu / m_e) (d / e a0)^2 a0
 * in atomic units (a second route through the definitions of the atomic units); the
 * threshold cross-sections 32 pi/15 D^2 (fermions), 32 pi/45 D^2 (bosons), 64 pi/45 D^2
 * (distinguishable) against the first Born approximation integrated numerically here (the
 * approximation Bohn, Cavagnero & Ticknor, NJP 11, 055039 (2009), arXiv:0901.1281, state
 * in their abstract reproduces the threshold cross-section). */
static void test_dipolar(void **state)
{
    (void)state;
    double sf, sb, sd, len;
    assert_int_equal(
        cp_collisions_dipolar_cross_section(0.574, MU_KRB, CP_PAIR_FERMIONS, &sf, &len, NULL),
        CP_OK);
    double d_au = 0.574 * CP_DEBYE / CP_AU_DIPOLE;
    assert_rel(len, MU_KRB / CP_ME * d_au * d_au * CP_A0, 1e-8);
    assert_int_equal(
        cp_collisions_dipolar_cross_section(0.574, MU_KRB, CP_PAIR_BOSONS, &sb, &len, NULL), CP_OK);
    assert_int_equal(cp_collisions_dipolar_cross_section(0.574, MU_KRB, CP_PAIR_DISTINGUISHABLE,
                                                         &sd, &len, NULL),
                     CP_OK);
    assert_rel(sf / (CP_PI * len * len), born_cross_section(-1), 1e-3);
    assert_rel(sb / (CP_PI * len * len), born_cross_section(+1), 1e-3);
    assert_rel(sd / (CP_PI * len * len), born_cross_section(0), 1e-3);
    double ratio;
    assert_int_equal(cp_collisions_collision_ratio(sf, 1e-17, M_KRB, 300e-9, &ratio, NULL), CP_OK);
    assert_rel(ratio, sf * sqrt(16.0 * CP_KB * 300e-9 / (CP_PI * M_KRB)) / 1e-17, 1e-14);
}

static cp_hold_params hold_base(void)
{
    cp_hold_params p = {2e4, 300e-9, {600.0, 600.0, 6000.0}, M_KRB, 1e-17, CP_LOSS_S_WAVE,
                        INFINITY, 0.0, 0, 0.5};
    return p;
}

/* beta <n> at the start: <n> = N (m omega_bar^2 / (4 pi k_B T))^{3/2} (docs/models/collisions.md). */
static double gamma0(const cp_hold_params *p)
{
    double wbar = cbrt(p->omega[0] * p->omega[1] * p->omega[2]);
    return p->rate * p->number *
           pow(p->mass * wbar * wbar / (4.0 * CP_PI * CP_KB * p->temperature), 1.5);
}

/* COLL-5: the hold against analytic solutions.
 * Fixed T: N(t) = N0 / (1 + N0 K' t), K' = beta / (8 pi^{3/2} sx sy sz)
 * (docs/models/collisions.md).  With anti-evaporation, solved by hand: dT/dN = -h T/N gives
 * T = T0 (N0/N)^h, and dN/dt = -G0 N0 (N/N0)^2 (T0/T)^{3/2} (T/T0)^p then integrates to
 * N = N0 (1 + c G0 t)^{-1/c} with c = 1 + (3/2 - p) h, G0 = beta <n> at t = 0:
 * s-wave (p = 0, h = 1/4) c = 11/8; p-wave (beta ~ T, p = 1, h = 1/12) c = 25/24.
 * One-body loss N0 e^{-t/tau}; technical heating T0 + rate t. */
static void test_hold(void **state)
{
    (void)state;
    enum { P = 11 };
    double t[P], n[P], temp[P];
    cp_hold_params p = hold_base();
    assert_int_equal(cp_collisions_hold(&p, P, t, n, temp, NULL), CP_OK);
    double s[3];
    for (int i = 0; i < 3; i++)
        s[i] = sqrt(CP_KB * p.temperature / (p.mass * p.omega[i] * p.omega[i]));
    double kprime = p.rate / (8.0 * pow(CP_PI, 1.5) * s[0] * s[1] * s[2]);
    for (int i = 0; i < P; i++) {
        assert_rel(n[i], p.number / (1.0 + p.number * kprime * t[i]), 1e-8);
        assert_rel(temp[i], p.temperature, 1e-14);
    }
    assert_true(n[P - 1] < 0.5 * p.number); /* the case is not trivially lossless */
    p.anti_evaporation = 1;
    double g0 = gamma0(&p);
    assert_int_equal(cp_collisions_hold(&p, P, t, n, temp, NULL), CP_OK);
    for (int i = 0; i < P; i++) {
        assert_rel(n[i], p.number * pow(1.0 + 11.0 / 8.0 * g0 * t[i], -8.0 / 11.0), 1e-8);
        assert_rel(temp[i], p.temperature * pow(p.number / n[i], 0.25), 1e-8);
    }
    p.wave = CP_LOSS_P_WAVE;
    assert_int_equal(cp_collisions_hold(&p, P, t, n, temp, NULL), CP_OK);
    for (int i = 0; i < P; i++) {
        assert_rel(n[i], p.number * pow(1.0 + 25.0 / 24.0 * g0 * t[i], -24.0 / 25.0), 1e-8);
        assert_rel(temp[i], p.temperature * pow(p.number / n[i], 1.0 / 12.0), 1e-8);
    }
    p = hold_base();
    p.rate = 0.0;
    p.lifetime = 0.3;
    p.heating_rate = 1e-7;
    assert_int_equal(cp_collisions_hold(&p, P, t, n, temp, NULL), CP_OK);
    for (int i = 0; i < P; i++) {
        assert_rel(n[i], p.number * exp(-t[i] / 0.3), 1e-9);
        assert_rel(temp[i], p.temperature + 1e-7 * t[i], 1e-12);
    }
}

/* Gamma_ev / Gamma_el by Monte Carlo, written independently of the closed form: units
 * k_B T = m = omega = 1, a truncated Boltzmann gas f ~ exp(-eps) theta(eta - eps).  Pairs at
 * one point r with velocities v1, v2 (centre of mass V, relative g) collide at the rate
 * sigma |g| and scatter isotropically: the outgoing energies are E/2 +- (|g||V|/2) cos(theta),
 * so one partner leaves (energy > eta) with probability max(0, 1 - (2 eta - E)/(|g||V|)).
 * Position and velocities are drawn from Gaussians widened by `widen` (importance sampling
 * of the hot tail), weighted by the ratio of densities.  The evaporation events per second
 * and per trapped particle, over Gamma_el = n0 sigma vbar / 2 (n0 the central density of
 * the truncated cloud, N = n0 (2 pi)^{3/2} P(3, eta)), are sqrt(pi) <w> / (8 P(3, eta)),
 * with P(3, eta) = 1 - e^{-eta}(1 + eta + eta^2/2) (the fraction of a Boltzmann gas below
 * eta).  Returns the estimate and its standard error. */
static double evaporation_mc(double eta, long samples, double *stderr_out)
{
    gsl_rng *rng = gsl_rng_alloc(gsl_rng_mt19937);
    gsl_rng_set(rng, 20261202UL);
    double widen = 1.0 + 0.15 * (eta - 6.0), sum = 0.0, sum2 = 0.0;
    for (long i = 0; i < samples; i++) {
        double u = 0.0, e1 = 0.0, e2 = 0.0, gg = 0.0, vv = 0.0;
        for (int a = 0; a < 3; a++) {
            double x = gsl_ran_gaussian(rng, sqrt(0.5) * widen);
            double v = gsl_ran_gaussian(rng, sqrt(0.5) * widen);
            double g = gsl_ran_gaussian(rng, sqrt(2.0) * widen);
            u += 0.5 * x * x;
            e1 += 0.5 * (v + g / 2) * (v + g / 2);
            e2 += 0.5 * (v - g / 2) * (v - g / 2);
            gg += g * g;
            vv += v * v;
        }
        /* target exponent r^2 + V^2 + g^2/4 (pair density e^{-2u} Maxwell^2), proposal the
         * same over widen^2 */
        double q = 2.0 * u + vv + gg / 4.0;
        double w = pow(widen, 9) * exp(-q * (1.0 - 1.0 / (widen * widen)));
        double val = 0.0;
        e1 += u;
        e2 += u;
        if (e1 < eta && e2 < eta) {
            double leave = 1.0 - (2.0 * eta - e1 - e2) / (sqrt(gg) * sqrt(vv));
            if (leave > 0.0)
                val = sqrt(gg) * leave * w;
        }
        sum += val;
        sum2 += val * val;
    }
    gsl_rng_free(rng);
    double mean = sum / (double)samples;
    double p3 = 1.0 - exp(-eta) * (1.0 + eta + eta * eta / 2.0);
    double scale = sqrt(M_PI) / (8.0 * p3);
    *stderr_out = scale * sqrt((sum2 / (double)samples - mean * mean) / (double)samples);
    return scale * mean;
}

/* COLL-6a: the evaporation rate constant.  (1) Against the Monte Carlo above at eta = 6, 8,
 * 10, within four standard errors plus 0.2 % (an independent Monte Carlo gave 1.175e-2,
 * 2.755e-3 and 5.46e-4, the same within its noise).  (2) Against the published closed form
 * of Luiten, Reynolds & Walraven, PRA 53, 381 (1996), V_ev/V_e = eta - 4 P(4,eta)/P(3,eta)
 * for a 3D harmonic trap, P written out as 1 - e^{-eta} sum_{k<n} eta^k/k!, at eta = 7 and
 * 12.  (3) At eta = 25 against the large-eta form 2 (eta - 4) e^{-eta} (K. M. O'Hara et al.,
 * PRA 64, 051403(R) (2001) [M]).  (4) The truncated fraction P(3, eta) against
 * gsl_sf_gamma_inc_P. */
static void test_evaporation_rate(void **state)
{
    (void)state;
    double f, p3, se;
    const double etas[] = {6.0, 8.0, 10.0};
    for (int i = 0; i < 3; i++) {
        assert_int_equal(cp_collisions_evaporation_rate(etas[i], &f, &p3, NULL), CP_OK);
        double mc = evaporation_mc(etas[i], 2000000, &se);
        if (!(fabs(f - mc) <= 4.0 * se + 2e-3 * mc))
            fail_msg("eta %g: closed form %.6g, Monte Carlo %.6g +- %.2g", etas[i], f, mc, se);
        assert_true(se < 5e-3 * mc);
    }
    const double closed[] = {7.0, 12.0};
    for (int i = 0; i < 2; i++) {
        double x = closed[i], e = exp(-x);
        double q3 = 1.0 - e * (1.0 + x + x * x / 2.0);
        double q4 = q3 - e * x * x * x / 6.0;
        assert_int_equal(cp_collisions_evaporation_rate(x, &f, &p3, NULL), CP_OK);
        assert_rel(f, 2.0 * e * (x - 4.0 * q4 / q3), 1e-12);
        assert_rel(p3, gsl_sf_gamma_inc_P(3.0, x), 1e-12);
    }
    assert_int_equal(cp_collisions_evaporation_rate(25.0, &f, &p3, NULL), CP_OK);
    assert_rel(f, 2.0 * (25.0 - 4.0) * exp(-25.0), 1e-7);
    cp_error err;
    const double bad[] = {NAN, INFINITY, 4.9, 30.1, -1.0};
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        assert_int_equal(cp_collisions_evaporation_rate(bad[i], &f, &p3, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "eta"));
        assert_true(isnan(f) && isnan(p3));
    }
    assert_int_equal(cp_collisions_evaporation_rate(8.0, NULL, &p3, &err), CP_EINVAL);
}

/* COLL-5b: the validity flag of the universal rate.  KRb (C6 16130 a.u., mu = 127 u / 2):
 * the p-wave barrier E_1/k_B is ~24 uK (tested against a numerical maximisation above);
 * at 300 nK (k_B T / E_1 ~ 0.013, inside) no flag, at 10 uK (~0.4, outside the stated 0.1)
 * the flag; the fraction is k_B T over the barrier. */
static void test_universal_validity(void **state)
{
    (void)state;
    unsigned flags;
    double frac, e1;
    assert_int_equal(cp_collisions_barrier(16130.0, MU_KRB, 1, &e1, NULL), CP_OK);
    assert_int_equal(cp_collisions_universal_validity(16130.0, MU_KRB, 300e-9, &flags, &frac,
                                                      NULL), CP_OK);
    assert_int_equal(flags, 0);
    assert_rel(frac, CP_KB * 300e-9 / e1, 1e-14);
    assert_true(frac < 0.1);
    assert_int_equal(cp_collisions_universal_validity(16130.0, MU_KRB, 10e-6, &flags, &frac,
                                                      NULL), CP_OK);
    assert_int_equal(flags, CP_COLLISIONS_FLAG_ABOVE_BARRIER);
    assert_true(frac > 0.1 && frac < 1.0);
    cp_error err;
    assert_int_equal(cp_collisions_universal_validity(16130.0, MU_KRB, NAN, &flags, &frac, &err),
                     CP_EINVAL);
    assert_true(isnan(frac) && flags == 0);
    assert_non_null(strstr(err.message, "temperature"));
}

/* COLL-6: evaporation.  Without losses (ratio -> infinity) T ~ N^alpha with
 * alpha = (eta + kappa)/3 - 1 for a 3D harmonic trap (Ketterle & van Druten, Adv. At. Mol.
 * Opt. Phys. 37, 181 (1996) [M eq.]), so PSD ~ N^{1 - 3 alpha}; dominated by s-wave loss
 * (ratio -> 0) the gas heats as N^{-1/4}, the anti-evaporation law of the hold (COLL-5). */
static void test_evaporation(void **state)
{
    (void)state;
    enum { P = 6 };
    double n[P], temp[P], psd[P], eff;
    cp_evaporation_params p = {2e4, 1e-6, {600.0, 600.0, 600.0}, M_KRB, 8.0, 0.6, 1e12,
                               CP_LOSS_S_WAVE, 2e3};
    assert_int_equal(cp_collisions_evaporation(&p, P, n, temp, psd, &eff, NULL), CP_OK);
    double alpha = (8.0 + 0.6) / 3.0 - 1.0;
    for (int i = 0; i < P; i++)
        assert_rel(temp[i], 1e-6 * pow(n[i] / 2e4, alpha), 1e-6);
    assert_rel(eff, 3.0 * alpha - 1.0, 1e-6);
    assert_rel(n[P - 1], 2e3, 1e-14);
    double q = CP_HBAR * 600.0 / (CP_KB * temp[2]);
    assert_rel(psd[2], n[2] * q * q * q, 1e-14);
    p.ratio = 1e-9;
    assert_int_equal(cp_collisions_evaporation(&p, P, n, temp, psd, &eff, NULL), CP_OK);
    assert_rel(temp[P - 1], 1e-6 * pow(10.0, 0.25), 1e-6);
    assert_true(eff < 0.0);
    /* default kappa = (eta - 5)/(eta - 4) [M] */
    p.ratio = 1e12;
    p.kappa = NAN;
    assert_int_equal(cp_collisions_evaporation(&p, P, n, temp, psd, &eff, NULL), CP_OK);
    assert_rel(eff, 3.0 * ((8.0 + 0.75) / 3.0 - 1.0) - 1.0, 1e-6);
}

/* COLL-6b: the trajectory stopped at a temperature is the full trajectory's beginning, bit
 * for bit (the second method: the full trajectory), ending at its first point at or below
 * the stop; a stop never reached gives the whole trajectory; a bad stop is refused. */
static void test_evaporation_until(void **state)
{
    (void)state;
    enum { P = 200 };
    double n[P], temp[P], psd[P], eff, n2[P], t2[P], psd2[P];
    cp_evaporation_params p = {2e5, 1.5e-7, {2 * CP_PI * 60, 2 * CP_PI * 70, 2 * CP_PI * 200},
                               M_KRB, 8.0, NAN, 300.0, CP_LOSS_P_WAVE, 1.0};
    assert_int_equal(cp_collisions_evaporation(&p, P, n, temp, psd, &eff, NULL), CP_OK);
    size_t filled;
    assert_int_equal(cp_collisions_evaporation_until(&p, P, 6e-8, n2, t2, psd2, &filled, NULL),
                     CP_OK);
    assert_true(filled >= 2 && filled < P / 2);
    assert_memory_equal(n, n2, filled * sizeof n[0]);
    assert_memory_equal(temp, t2, filled * sizeof temp[0]);
    assert_memory_equal(psd, psd2, filled * sizeof psd[0]);
    assert_true(t2[filled - 1] <= 6e-8 && t2[filled - 2] > 6e-8);
    assert_true(isnan(n2[filled]) && isnan(t2[P - 1]));
    assert_int_equal(cp_collisions_evaporation_until(&p, P, 1e-30, n2, t2, psd2, &filled, NULL),
                     CP_OK);
    assert_int_equal(filled, P);
    assert_memory_equal(temp, t2, sizeof temp);
    cp_error err;
    assert_int_equal(cp_collisions_evaporation_until(&p, P, -1.0, n2, t2, psd2, &filled, &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "stop_temperature"));
    assert_int_equal(filled, 0);
}

/* COLL-7: bad input everywhere: CP_EINVAL, the parameter named, NaN outputs. */
static void test_bad_input(void **state)
{
    (void)state;
    const double bad[] = {NAN, INFINITY, -INFINITY, 0.0, -1.0, 1e300};
    cp_error err;
    double v, len;
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        assert_int_equal(cp_collisions_mean_scattering_length(bad[i], MU_KRB, &v, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "c6_au"));
        assert_true(isnan(v));
        assert_int_equal(cp_collisions_barrier(16130.0, bad[i], 1, &v, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "mass"));
        assert_true(isnan(v));
        assert_int_equal(
            cp_collisions_universal_rate(16130.0, MU_KRB, bad[i], CP_PAIR_FERMIONS, &v, &err),
            CP_EINVAL);
        assert_non_null(strstr(err.message, "temperature"));
        assert_int_equal(cp_collisions_dipolar_cross_section(bad[i], MU_KRB, CP_PAIR_FERMIONS, &v,
                                                             &len, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "dipole_debye"));
        assert_true(isnan(v) && isnan(len));
        assert_int_equal(cp_collisions_collision_ratio(1e-14, bad[i], M_KRB, 1e-6, &v, &err),
                         CP_EINVAL);
        assert_non_null(strstr(err.message, "rate"));
    }
    assert_int_equal(cp_collisions_barrier(16130.0, MU_KRB, 0, &v, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "partial wave"));
    assert_int_equal(cp_collisions_universal_rate(16130.0, MU_KRB, 1e-6, (cp_pair_statistics)9, &v,
                                                  &err),
                     CP_EINVAL);
    assert_non_null(strstr(err.message, "statistics"));

    enum { P = 4 };
    double t[P], n[P], temp[P], psd[P], eff;
    const char *fields[] = {"number", "temperature", "omega_y", "mass", "rate", "lifetime",
                            "heating_rate", "duration"};
    for (int f = 0; f < 8; f++) {
        cp_hold_params p = hold_base();
        double *slot[] = {&p.number, &p.temperature, &p.omega[1], &p.mass, &p.rate, &p.lifetime,
                          &p.heating_rate, &p.duration};
        *slot[f] = f == 5 ? -1.0 : NAN;
        assert_int_equal(cp_collisions_hold(&p, P, t, n, temp, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, fields[f]));
        assert_true(isnan(n[0]) && isnan(temp[P - 1]));
    }
    cp_hold_params p = hold_base();
    assert_int_equal(cp_collisions_hold(&p, 1, t, n, temp, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "points"));
    p.wave = (cp_loss_wave)3;
    assert_int_equal(cp_collisions_hold(&p, P, t, n, temp, &err), CP_EINVAL);
    /* absurd magnitudes: below 1 pK, a trap weaker than 1e-2 rad/s (check_int.h floors) */
    p.wave = CP_LOSS_S_WAVE;
    p.temperature = 1e-13;
    assert_int_equal(cp_collisions_hold(&p, P, t, n, temp, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "temperature"));
    p = hold_base();
    p.omega[2] = 1e-3;
    assert_int_equal(cp_collisions_hold(&p, P, t, n, temp, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "omega_z"));
    assert_int_equal(cp_collisions_universal_rate(16130.0, MU_KRB, 1e-13, CP_PAIR_FERMIONS, &v,
                                                  &err),
                     CP_EINVAL);
    /* NULL parameters or arrays: an error, not a crash */
    assert_int_equal(cp_collisions_hold(NULL, P, t, n, temp, &err), CP_EINVAL);
    assert_true(isnan(n[0]));
    assert_int_equal(cp_collisions_hold(&p, P, t, NULL, temp, &err), CP_EINVAL);

    cp_evaporation_params e = {2e4, 1e-6, {600.0, 600.0, 600.0}, M_KRB, 8.0, NAN, 100.0,
                               CP_LOSS_S_WAVE, 2e3};
    cp_evaporation_params e2 = e;
    e2.eta = 3.0;
    assert_int_equal(cp_collisions_evaporation(&e2, P, n, temp, psd, &eff, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "eta"));
    assert_true(isnan(eff) && isnan(psd[0]));
    e2 = e;
    e2.final_number = 3e4;
    assert_int_equal(cp_collisions_evaporation(&e2, P, n, temp, psd, &eff, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "final_number"));
    e2 = e;
    e2.ratio = 0.0;
    assert_int_equal(cp_collisions_evaporation(&e2, P, n, temp, psd, &eff, &err), CP_EINVAL);
    e2 = e;
    e2.kappa = INFINITY;
    assert_int_equal(cp_collisions_evaporation(&e2, P, n, temp, psd, &eff, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "kappa"));
    /* runaway cooling (p-wave loss, eta = 30, huge ratio) would overflow the phase-space
     * density: an error, not inf or NaN with CP_OK */
    e2 = (cp_evaporation_params){1e12, 1e-9, {1e7, 1e7, 1e7}, M_KRB, 30.0, NAN, 1e12,
                                 CP_LOSS_P_WAVE, 1.0};
    assert_int_equal(cp_collisions_evaporation(&e2, P, n, temp, psd, &eff, &err), CP_ENUMERIC);
    assert_non_null(strstr(err.message, "overflows"));
    assert_true(isnan(eff) && isnan(psd[P - 1]));
    assert_int_equal(cp_collisions_evaporation(NULL, P, n, temp, psd, &eff, &err), CP_EINVAL);
    assert_true(isnan(eff) && isnan(psd[0]));
    assert_int_equal(cp_collisions_evaporation(&e, P, n, temp, NULL, &eff, &err), CP_EINVAL);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_abar),      cmocka_unit_test(test_barrier),
        cmocka_unit_test(test_universal), cmocka_unit_test(test_dipolar),
        cmocka_unit_test(test_hold),      cmocka_unit_test(test_universal_validity),
        cmocka_unit_test(test_evaporation_rate),
        cmocka_unit_test(test_evaporation),
        cmocka_unit_test(test_evaporation_until),
        cmocka_unit_test(test_bad_input),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

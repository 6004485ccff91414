/*
 * The lattice envelope against gravity (core/lattice_gravity.c): sag, frequency at the
 * minimum, depth against escape and the largest g held, against a force balance solved
 * here by bisection on the written-out envelope force (a second method), the single
 * Gaussian's peak force 2 |U| e^{-1/2} / w at s = w/2 (elementary), and the harmonic limit
 * g / omega^2 of a strong envelope.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>

#include "coldprep/consts.h"
#include "coldprep/lattice.h"

#include "check_close.h"

#define MASS (110.0 * CP_AMU) /* a NaRb-like molecule */

/* The envelope along z (gravity) written out: beams x and y across their Gaussian profile,
 * beam z along its axis (Rayleigh). */
typedef struct env {
    double ux, uy, uz, w, zr;
} env;

static double env_force(const env *e, double s) /* -dV/ds, N */
{
    double g = exp(-2.0 * s * s / (e->w * e->w)) * 4.0 * s / (e->w * e->w);
    double x = 1.0 + s * s / (e->zr * e->zr);
    return (e->ux + e->uy) * g + e->uz * 2.0 * s / (e->zr * e->zr) / (x * x);
}

static double env_potential(const env *e, double s)
{
    return (e->ux + e->uy) * exp(-2.0 * s * s / (e->w * e->w)) +
           e->uz / (1.0 + s * s / (e->zr * e->zr)) + MASS * CP_G * s;
}

/* The root of force(s) = m g on [a, b] by bisection. */
static double balance(const env *e, double a, double b)
{
    double fa = env_force(e, a) - MASS * CP_G;
    for (int i = 0; i < 200; i++) {
        double m = 0.5 * (a + b), fm = env_force(e, m) - MASS * CP_G;
        if ((fm > 0) == (fa > 0)) {
            a = m;
            fa = fm;
        } else {
            b = m;
        }
    }
    return 0.5 * (a + b);
}

static void lattice_of(double power, cp_lattice_beam beams[3], cp_lattice_3d_result *d3)
{
    cp_lattice_beam b = {power, 150e-6, 1064e-9, 700.0, CP_POLARIZABILITY_AU, 1.0, CP_PI};
    for (int i = 0; i < 3; i++)
        beams[i] = b;
    assert_int_equal(cp_lattice_depth_3d(beams, MASS, 2, d3, NULL), CP_OK);
}

/* LAT-G1: a 0.6 W lattice (the envelope holds, but with a sag far from harmonic): the
 * sag is the force balance nearest the centre, the depth the potential from there to the
 * balance point below (the barrier), the frequency the curvature there, and the largest g
 * the peak of the written-out force. */
static void test_force_balance(void **state)
{
    (void)state;
    cp_lattice_beam beams[3];
    cp_lattice_3d_result d3;
    lattice_of(0.6, beams, &d3);
    env e = {d3.axis[0].well_bottom, d3.axis[1].well_bottom, d3.axis[2].well_bottom, 150e-6,
             d3.axis[2].rayleigh_range};
    cp_lattice_gravity_result g;
    assert_int_equal(cp_lattice_gravity(beams, MASS, 2, &g, NULL), CP_OK);
    assert_int_equal(g.held, 1);
    /* the force peaks at s = -w/2 (single Gaussian): the minimum lies above, the barrier
     * below */
    double s_min = balance(&e, -75e-6, 0.0), s_bar = balance(&e, -600e-6, -75e-6);
    assert_rel(g.sag, -s_min, 1e-4);
    assert_rel(g.depth, env_potential(&e, s_bar) - env_potential(&e, s_min), 1e-4);
    double h = 1e-9;
    double curv = (env_force(&e, s_min - h) - env_force(&e, s_min + h)) / (2.0 * h);
    assert_rel(g.omega, sqrt(curv / MASS), 1e-5);
    assert_rel(g.depth_no_gravity, -(e.ux + e.uy + e.uz), 1e-12);
    /* peak force of the two transverse Gaussians, 2 |U| e^{-1/2} / w each; the Rayleigh
     * term adds ~(w/z_R)^2 */
    assert_rel(g.max_gravity, -(e.ux + e.uy) * 2.0 * exp(-0.5) / 150e-6 / MASS, 1e-4);
}

/* LAT-G2: a strong envelope (20 W per beam) sags by the harmonic g/omega^2 up to
 * (sag/w)^2 corrections, with the envelope frequency of cp_lattice_depth_3d; a weak one
 * (0.05 W, largest g below 9.8 m/s^2) does not hold. */
static void test_limits(void **state)
{
    (void)state;
    cp_lattice_beam beams[3];
    cp_lattice_3d_result d3;
    lattice_of(20.0, beams, &d3);
    cp_lattice_gravity_result g;
    assert_int_equal(cp_lattice_gravity(beams, MASS, 2, &g, NULL), CP_OK);
    double ratio = g.sag / 150e-6;
    assert_true(ratio < 0.01);
    assert_rel(g.sag, d3.sag, 10.0 * ratio * ratio);
    assert_rel(g.omega, d3.omega[2], 10.0 * ratio * ratio);
    lattice_of(0.05, beams, &d3);
    assert_int_equal(cp_lattice_gravity(beams, MASS, 2, &g, NULL), CP_OK);
    assert_true(g.max_gravity < CP_G);
    assert_int_equal(g.held, 0);
    assert_true(g.depth == 0.0 && isnan(g.sag));
    cp_error err;
    assert_int_equal(cp_lattice_gravity(beams, MASS, 3, &g, &err), CP_EINVAL);
    assert_non_null(strstr(err.message, "gravity axis"));
    assert_int_equal(cp_lattice_gravity(beams, NAN, 2, &g, &err), CP_EINVAL);
    assert_true(isnan(g.max_gravity));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_force_balance),
        cmocka_unit_test(test_limits),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}

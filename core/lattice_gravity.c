/*
 * The envelope of a 3D optical lattice against gravity: the lattice beams' own Gaussian
 * confinement (the beams across gravity through their transverse profile, the beam along
 * gravity through its Rayleigh fall-off) plus the linear gravitational potential.  Gives
 * the sag of the minimum, the envelope frequency there and the depth left against
 * escape downwards (the barrier below the minimum), and the largest g the envelope
 * holds.  For a single Gaussian profile U exp(-2 s^2/w^2) the restoring force peaks at
 * s = w/2 with 2 |U| e^{-1/2} / w (elementary); the full potential is searched on a grid.
 */
#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/lattice.h"

#define GRID 6000

typedef struct envelope {
    double u[3], w[3], zr; /* well bottoms (J), waists (m), Rayleigh range of beam g (m) */
    int g;
    double mg; /* m g, N */
} envelope;

static double potential(const envelope *e, double s, double mg)
{
    double v = mg * s;
    for (int j = 0; j < 3; j++)
        v += j == e->g ? e->u[j] / (1.0 + s * s / (e->zr * e->zr))
                       : e->u[j] * exp(-2.0 * s * s / (e->w[j] * e->w[j]));
    return v;
}

static double force(const envelope *e, double s) /* -dV/ds without gravity */
{
    double f = 0.0;
    for (int j = 0; j < 3; j++) {
        if (j == e->g) {
            double x = 1.0 + s * s / (e->zr * e->zr);
            f += e->u[j] * 2.0 * s / (e->zr * e->zr) / (x * x);
        } else {
            f += e->u[j] * 4.0 * s / (e->w[j] * e->w[j]) * exp(-2.0 * s * s / (e->w[j] * e->w[j]));
        }
    }
    return f;
}

static double curvature(const envelope *e, double s)
{
    double c = 0.0;
    for (int j = 0; j < 3; j++) {
        if (j == e->g) {
            double z2 = e->zr * e->zr, x = 1.0 + s * s / z2;
            c += e->u[j] * (6.0 * s * s / (z2 * z2) - 2.0 / z2) / (x * x * x);
        } else {
            double w2 = e->w[j] * e->w[j];
            c += e->u[j] * exp(-2.0 * s * s / w2) * (16.0 * s * s / (w2 * w2) - 4.0 / w2);
        }
    }
    return c;
}

/* Vertex of the parabola through (s - h, a), (s, b), (s + h, c): position and value. */
static void vertex(double s, double h, double a, double b, double c, double *sv, double *v)
{
    double den = a - 2.0 * b + c;
    double d = den != 0.0 ? 0.5 * h * (a - c) / den : 0.0;
    *sv = s + d;
    *v = b - 0.25 * (a - c) * d / h;
}

cp_status cp_lattice_gravity(const cp_lattice_beam beams[3], double mass, int gravity_axis,
                             cp_lattice_gravity_result *r, cp_error *err)
{
    r->held = 0;
    r->sag = r->omega = r->depth = r->depth_no_gravity = r->max_gravity = NAN;
    cp_lattice_3d_result d3;
    CP_TRY(cp_lattice_depth_3d(beams, mass, gravity_axis, &d3, err));
    envelope e = {.g = gravity_axis, .zr = d3.axis[gravity_axis].rayleigh_range,
                  .mg = mass * CP_G};
    double wmax = 0.0;
    for (int j = 0; j < 3; j++) {
        e.u[j] = d3.axis[j].well_bottom;
        e.w[j] = beams[j].waist;
        if (j != gravity_axis)
            wmax = fmax(wmax, beams[j].waist);
    }
    double lo = -4.0 * wmax, h = 6.0 * wmax / GRID;
    double fmax_seen = 0.0;
    for (int i = 0; i <= GRID; i++)
        fmax_seen = fmax(fmax_seen, force(&e, lo + i * h));
    r->depth_no_gravity = -d3.well_bottom;
    r->max_gravity = fmax_seen / mass;
    /* the local minimum nearest the centre, scanning down from s = 0 */
    int i0 = (int)(-lo / h), imin = -1;
    double prev = potential(&e, lo + (i0 + 1) * h, e.mg), cur = potential(&e, lo + i0 * h, e.mg);
    for (int i = i0; i > 0; i--) {
        double next = potential(&e, lo + (i - 1) * h, e.mg);
        if (cur <= prev && cur <= next) {
            imin = i;
            break;
        }
        prev = cur;
        cur = next;
    }
    if (imin < 0) {
        r->depth = 0.0;
        return CP_OK;
    }
    double s_min, v_min;
    vertex(lo + imin * h, h, potential(&e, lo + (imin - 1) * h, e.mg), cur, prev, &s_min, &v_min);
    /* the barrier below: the first local maximum under the minimum (or the grid's end) */
    double v_bar = -INFINITY;
    prev = cur;
    cur = potential(&e, lo + (imin - 1) * h, e.mg);
    for (int i = imin - 1; i > 0; i--) {
        double next = potential(&e, lo + (i - 1) * h, e.mg);
        if (cur >= prev && cur >= next) {
            double sb;
            vertex(lo + i * h, h, next, cur, prev, &sb, &v_bar);
            break;
        }
        prev = cur;
        cur = next;
    }
    if (v_bar == -INFINITY)
        v_bar = cur;
    r->held = 1;
    r->sag = -s_min;
    r->omega = sqrt(fmax(curvature(&e, s_min), 0.0) / mass);
    r->depth = fmax(v_bar - v_min, 0.0);
    return CP_OK;
}

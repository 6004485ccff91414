/*
 * Lattice depth from laser beams: recoil energy, polarizability units, the dipole
 * potential of two interfering Gaussian beams, the harmonic envelope and gravitational
 * sag, and 3D lattices from three orthogonal 1D lattices.
 *
 * Dipole potential and polarizability conversions: Grimm, Weidemueller, Ovchinnikov,
 * Adv. At. Mol. Opt. Phys. 42, 95 (2000), Sec. 2.1 [M]; docs/models/lattice.md:
 *   U = -Re(alpha) I / (2 eps0 c),   alpha_SI = alpha_au 4 pi eps0 a0^3,
 *   alpha in Hz/(W/cm^2) = alpha_SI / (2 eps0 c h) * 1e4  (so U/h = -alpha_h I[W/cm^2]).
 * Two beams of intensities I1 = I0 and I2 = eta I0 (same mode, parallel polarization)
 * give I = I0 (1 + eta + 2 sqrt(eta) cos(2 pi x / d)), d = lambda / (2 sin(theta/2)):
 * the intensity swings between I0 (1 + sqrt(eta))^2 and I0 (1 - sqrt(eta))^2.
 * The Gaussian envelope I0(r, z) = I0 exp(-2 r^2 / w(z)^2) (w0/w(z))^2 has curvature
 * -4/w^2 across a beam and -2/z_R^2 along it at the focus.
 */
#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/lattice.h"

static const char *const CTX_RECOIL = "lattice.recoil";
static const char *const CTX_DEPTH = "lattice.depth";
static const char *const CTX_DEPTH3 = "lattice.depth 3d";
static const char *const CTX_POL = "lattice.polarizability";

#define MASS_MIN 1e-30
#define MASS_MAX 1e-20
#define ALPHA_MAX_AU 1e7

/* 1 Hz/(W/cm^2) in C m^2/V: alpha_SI = alpha_h * 2 eps0 c h / 1e4. */
#define HZ_PER_W_CM2 (2.0 * CP_EPS0 * CP_C * CP_H * 1e-4)

cp_status cp_lattice_recoil(double mass, double wavelength, double *energy,
                            double *frequency_hz, cp_error *err)
{
    if (energy)
        *energy = NAN;
    if (frequency_hz)
        *frequency_hz = NAN;
    CP_TRY(cp_check_range(err, CTX_RECOIL, "mass", mass, "kg", MASS_MIN, MASS_MAX, CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX_RECOIL, "wavelength", wavelength, "m", 1e-8, 1e-3,
                          CP_CLOSED));
    double e = CP_H * CP_H / (2.0 * mass * wavelength * wavelength);
    if (energy)
        *energy = e;
    if (frequency_hz)
        *frequency_hz = e / CP_H;
    return CP_OK;
}

cp_status cp_lattice_polarizability_si(double value, cp_polarizability_unit unit,
                                       double *alpha_si, cp_error *err)
{
    *alpha_si = NAN;
    CP_TRY(cp_check_finite(err, CTX_POL, "polarizability", value, ""));
    switch (unit) {
    case CP_POLARIZABILITY_SI: *alpha_si = value; return CP_OK;
    case CP_POLARIZABILITY_AU: *alpha_si = value * CP_AU_POLARIZABILITY; return CP_OK;
    case CP_POLARIZABILITY_HZ_PER_W_CM2: *alpha_si = value * HZ_PER_W_CM2; return CP_OK;
    }
    return cp_fail(err, CP_EINVAL, "%s: unit %d is not one of 0 (SI), 1 (a.u.), 2 (Hz/(W/cm^2))",
                   CTX_POL, (int)unit);
}

static cp_status check_beam(const char *ctx, const cp_lattice_beam *b, double *alpha,
                            cp_error *err)
{
    if (!b)
        return cp_fail(err, CP_EINVAL, "%s: beam is NULL", ctx);
    CP_TRY(cp_check_range(err, ctx, "power", b->power, "W", CP_MIN_BEAM_POWER, CP_MAX_BEAM_POWER,
                          CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "waist", b->waist, "m", 1e-7, 1.0, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "wavelength", b->wavelength, "m", 1e-8, 1e-3, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "reflectivity", b->reflectivity, "", 0.0, 1.0,
                          CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "angle", b->angle, "rad", 0.01, CP_PI, CP_CLOSED));
    CP_TRY(cp_lattice_polarizability_si(b->polarizability, b->unit, alpha, err));
    if (!(*alpha > 0 && *alpha <= ALPHA_MAX_AU * CP_AU_POLARIZABILITY)) {
        double au = *alpha / CP_AU_POLARIZABILITY;
        *alpha = NAN;
        return cp_fail(err, CP_EINVAL,
                       "%s: polarizability %.6g a.u. is out of range; allowed (0, %.6g] a.u. "
                       "(a red-detuned lattice; blue-detuned lattices are not modelled)",
                       ctx, au, ALPHA_MAX_AU);
    }
    return CP_OK;
}

static void poison_depth(cp_lattice_depth_result *r)
{
    double *f[] = {&r->depth,    &r->well_bottom, &r->offset,       &r->spacing,
                   &r->peak_intensity, &r->alpha_si, &r->rayleigh_range, &r->recoil,
                   &r->depth_er, &r->omega_site, &r->omega_axial, &r->omega_radial,
                   &r->omega_bisector, &r->sag};
    for (size_t i = 0; i < sizeof f / sizeof f[0]; i++)
        *f[i] = NAN;
}

cp_status cp_lattice_depth(const cp_lattice_beam *beam, double mass,
                           cp_lattice_depth_result *r, cp_error *err)
{
    poison_depth(r);
    double alpha;
    CP_TRY(check_beam(CTX_DEPTH, beam, &alpha, err));
    if (mass != 0.0)
        CP_TRY(cp_check_range(err, CTX_DEPTH, "mass", mass, "kg", MASS_MIN, MASS_MAX,
                              CP_CLOSED));
    double w = beam->waist, lambda = beam->wavelength, eta = beam->reflectivity;
    double half = 0.5 * beam->angle, s = sin(half), c = cos(half);
    double i0 = 2.0 * beam->power / (CP_PI * w * w);
    double u_per_intensity = alpha / (2.0 * CP_EPS0 * CP_C); /* |U| per W/m^2 */
    double root = sqrt(eta);
    r->alpha_si = alpha;
    r->peak_intensity = i0;
    r->depth = 4.0 * root * u_per_intensity * i0;
    r->well_bottom = -u_per_intensity * i0 * (1 + root) * (1 + root);
    r->offset = 0.0 - u_per_intensity * i0 * (1 - root) * (1 - root); /* no -0 */
    r->spacing = lambda / (2.0 * s);
    r->rayleigh_range = CP_PI * w * w / lambda;
    if (mass == 0.0)
        return CP_OK;

    double zr = r->rayleigh_range, ub = -r->well_bottom;
    r->recoil = CP_H * CP_H / (8.0 * mass * r->spacing * r->spacing);
    r->depth_er = r->depth / r->recoil;
    r->omega_site = 2.0 * sqrt(r->depth * r->recoil) / CP_HBAR;
    /* a displacement along the lattice vector is c across and s along each beam; along
     * the bisector it is s across and c along; normal to the plane it is across */
    double across = 4.0 / (w * w), along = 2.0 / (zr * zr);
    r->omega_axial = sqrt(ub * (across * c * c + along * s * s) / mass);
    r->omega_bisector = sqrt(ub * (across * s * s + along * c * c) / mass);
    r->omega_radial = sqrt(ub * across / mass);
    r->sag = CP_G / (r->omega_radial * r->omega_radial);
    return CP_OK;
}

cp_status cp_lattice_depth_3d(const cp_lattice_beam beams[3], double mass, int gravity_axis,
                              cp_lattice_3d_result *r, cp_error *err)
{
    for (int i = 0; i < 3; i++)
        poison_depth(&r->axis[i]);
    cp_poison(r->omega, 3);
    r->well_bottom = r->omega_bar = r->sag = NAN;
    CP_TRY(cp_check_range(err, CTX_DEPTH3, "mass", mass, "kg", MASS_MIN, MASS_MAX,
                          CP_CLOSED));
    CP_TRY(cp_check_int_range(err, CTX_DEPTH3, "gravity axis", gravity_axis, 0, 2));
    if (!beams)
        return cp_fail(err, CP_EINVAL, "%s: beams is NULL", CTX_DEPTH3);
    cp_lattice_depth_result axis[3];
    for (int i = 0; i < 3; i++) {
        if (beams[i].angle != CP_PI) {
            return cp_fail(err, CP_EINVAL,
                           "%s: beam %d angle %.6g rad is not allowed; a 3D lattice is built "
                           "from counter-propagating beams (angle pi rad)",
                           CTX_DEPTH3, i + 1, beams[i].angle);
        }
        cp_status st = cp_lattice_depth(&beams[i], mass, &axis[i], err);
        if (st != CP_OK)
            return st;
    }
    double bottom = 0.0, product = 1.0, omega[3];
    for (int i = 0; i < 3; i++) {
        double k2 = 2.0 * (-axis[i].well_bottom) /
                    (axis[i].rayleigh_range * axis[i].rayleigh_range);
        for (int j = 0; j < 3; j++)
            if (j != i)
                k2 += 4.0 * (-axis[j].well_bottom) / (beams[j].waist * beams[j].waist);
        omega[i] = sqrt(k2 / mass);
        product *= omega[i];
        bottom += axis[i].well_bottom;
    }
    for (int i = 0; i < 3; i++) {
        r->axis[i] = axis[i];
        r->omega[i] = omega[i];
    }
    r->well_bottom = bottom;
    r->omega_bar = cbrt(product);
    r->sag = CP_G / (omega[gravity_axis] * omega[gravity_axis]);
    return CP_OK;
}

/*
 * From a plan's protection (dc field, microwave, pancake confinement) and a molecule to the
 * collision rates: picks the regime, takes the field physics from coldprep/fields.h (the
 * exact induced dipole of the rotational ground state, the dc shielding field, the
 * microwave-dressed pair potential) and calls cp_collisions_shielded.  docs/models/
 * collisions.md describes the regimes and their validity.
 */
#include "coldprep/collisions.h"

#include <math.h>
#include <stdio.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/fields.h"

/* Above this fraction of the dc shielding field the pair |1,0> + |1,0> nears |0,0> +
 * |2,0> and the free-space model of induced dipoles no longer describes the collisions
 * (common practice, no source: the resonant coupling grows over a few per cent of the
 * field; González-Martínez, Bohn & Quéméner, PRA 96, 032718 (2017) show its reach). */
#define SHIELDING_FRACTION 0.9

/* The dressed pair potential of coldprep/fields.h (circular part: azimuth pi/4, where the
 * ellipse's term vanishes) as V = sum_n (a3[n] / r^3 + a6[n] / r^6) c^n, c = cos^2 theta,
 * n = 0..3: read at two radii (separating r^-3 from r^-6) and four values of c (a cubic
 * through four points is exact for the potential's polynomial form). */
static cp_status microwave_polynomial(const cp_fields_microwave_result *mw, double a3[4],
                                      double a6[4], cp_error *err)
{
    static const double cs[4] = {0.0, 1.0 / 3.0, 2.0 / 3.0, 1.0};
    const double r1 = 1e-8, r2 = 2e-8;
    double p3[4], p6[4];
    for (int j = 0; j < 4; j++) {
        double v1, v2, th = acos(sqrt(cs[j]));
        CP_TRY(cp_fields_microwave_potential(mw, r1, th, CP_PI / 4.0, &v1, err));
        CP_TRY(cp_fields_microwave_potential(mw, r2, th, CP_PI / 4.0, &v2, err));
        /* v = x / r^3 + y / r^6 at r1 and r2 = 2 r1 */
        double r13 = r1 * r1 * r1, r16 = r13 * r13;
        p6[j] = (v1 - 8.0 * v2) / (1.0 / r16 - 8.0 / (64.0 * r16));
        p3[j] = (v1 - p6[j] / r16) * r13;
    }
    /* cubic through the four points, by Newton's divided differences -> monomials */
    double *targets[2] = {a3, a6};
    double *vals[2] = {p3, p6};
    for (int q = 0; q < 2; q++) {
        double d[4];
        for (int j = 0; j < 4; j++)
            d[j] = vals[q][j];
        for (int k = 1; k < 4; k++)
            for (int j = 3; j >= k; j--)
                d[j] = (d[j] - d[j - 1]) / (cs[j] - cs[j - k]);
        /* p(c) = d0 + d1 (c - c0) + d2 (c - c0)(c - c1) + d3 (c - c0)(c - c1)(c - c2) */
        double *a = targets[q];
        double c0 = cs[0], c1 = cs[1], c2 = cs[2];
        a[3] = d[3];
        a[2] = d[2] - d[3] * (c0 + c1 + c2);
        a[1] = d[1] - d[2] * (c0 + c1) + d[3] * (c0 * c1 + c0 * c2 + c1 * c2);
        a[0] = d[0] - d[1] * c0 + d[2] * c0 * c1 - d[3] * c0 * c1 * c2;
    }
    return CP_OK;
}

cp_status cp_collisions_protected(const cp_protection_params *p, cp_shielded_result *r,
                                  double *dipole_used, cp_shield_regime *regime,
                                  cp_error *err)
{
    const char *ctx = "collisions protected";
    if (!r || !dipole_used || !regime || !p)
        return cp_fail(err, CP_EINVAL, "%s: arguments must not be NULL", ctx);
    *dipole_used = NAN;
    cp_poison(&r->elastic_rate, 7);
    r->valid = 0;
    r->method = NULL;
    r->note[0] = '\0';
    CP_TRY(cp_check_range(err, ctx, "electric_field", p->electric_field, "V/m", 0.0,
                          CP_FIELDS_MAX_FIELD, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "axial_omega", p->axial_omega, "rad/s", 0.0,
                          2.0 * CP_PI * 1e6, CP_CLOSED));
    cp_fields_rotor rotor = {p->dipole, p->rot_const_hz};
    cp_shielded_params q = {.stat = p->stat, .mass = p->mass, .c6_au = p->c6_au,
                            .temperature = p->temperature, .axial_omega = p->axial_omega};
    if (p->microwave) {
        if (p->electric_field > 0.0)
            return cp_fail(err, CP_EINVAL, "%s: electric_field %g V/m with a microwave: "
                           "dc field and microwave shielding together are not modelled; "
                           "allowed 0 V/m with a microwave", ctx, p->electric_field);
        if (p->axial_omega > 0.0)
            return cp_fail(err, CP_EINVAL, "%s: axial_omega %g rad/s with a microwave: "
                           "microwave shielding in a pancake trap is not modelled; allowed "
                           "0 rad/s with a microwave", ctx, p->axial_omega);
        cp_fields_microwave_params mw = {p->rabi, p->detuning, p->ellipticity};
        cp_fields_microwave_result out;
        CP_TRY(cp_fields_microwave(&rotor, &mw, &out, err));
        q.regime = CP_SHIELD_MICROWAVE;
        q.c3 = fabs(out.c3);
        q.c6_core = out.c6;
        CP_TRY(microwave_polynomial(&out, q.mw_c3, q.mw_c6, err));
        q.rabi = p->rabi;
        q.detuning = p->detuning;
        q.dipole_permanent = p->dipole;
        *regime = CP_SHIELD_MICROWAVE;
        CP_TRY(cp_collisions_shielded(&q, r, err));
        *dipole_used = out.effective_dipole;
        if (p->ellipticity > 0.02 && r->valid) {
            r->valid = 0;
            snprintf(r->note, sizeof r->note, "ellipticity %.3g rad: the loss model is that "
                     "of circular polarisation; elliptical polarisation weakens the "
                     "shielding and the loss is understated", p->ellipticity);
        }
        return CP_OK;
    }
    double dind = 0.0;
    if (p->electric_field > 0.0)
        CP_TRY(cp_fields_induced_dipole(p->dipole, p->rot_const_hz, p->electric_field, &dind,
                                        err));
    q.dipole = fabs(dind);
    q.regime = p->axial_omega > 0.0 ? CP_SHIELD_QUASI_2D : CP_SHIELD_DC_3D;
    *regime = q.regime;
    CP_TRY(cp_collisions_shielded(&q, r, err));
    *dipole_used = q.dipole;
    if (p->electric_field > 0.0 && q.regime == CP_SHIELD_DC_3D) {
        double fs;
        CP_TRY(cp_fields_shielding_field(&rotor, &fs, NULL, err));
        if (p->electric_field >= SHIELDING_FRACTION * fs) {
            r->valid = 0;
            snprintf(r->note, sizeof r->note, "field %.4g kV/cm is near or above the dc "
                     "shielding field %.4g kV/cm: dc-field shielding is not modelled; these "
                     "are the unshielded 3D rates", p->electric_field / 1e5, fs / 1e5);
        }
    }
    return CP_OK;
}

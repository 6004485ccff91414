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
#include "collisions_int.h"
#include "coldprep/consts.h"
#include "coldprep/fields.h"

/* Ground-state molecules at this fraction of the dc shielding field and above are flagged:
 * a plan with such a field means dc shielding, which works for molecules in |1,0> only
 * (common practice, no source, for "near": the resonant coupling changes the |1,0> rates
 * over a few per cent of the field, González-Martínez, Bohn & Quéméner, PRA 96, 032718
 * (2017), arXiv:1707.03239). */
#define SHIELDING_FRACTION 0.9

/* dc-field shielding of molecules in |1,0>: the Stark dipole matrix of |0,0>, |1,0>,
 * |2,0> and the pair gap at the field (coldprep/fields.h), then the pair regime of
 * cp_collisions_shielded; flagged outside [F_s, CP_DC_SHIELD_MAX_REDUCED B / d]. */
static cp_status dc_pair(const cp_protection_params *p, cp_shielded_params *q,
                         cp_shielded_cache *cache, cp_shielded_result *r, double *dipole_used,
                         cp_error *err)
{
    const char *ctx = "collisions.protected";
    cp_fields_rotor rotor = {p->dipole, p->rot_const_hz};
    if (!(p->electric_field > 0.0))
        return cp_fail(err, CP_EINVAL, "%s: electric_field %g V/m with molecules in |1,0>: "
                       "dc-field shielding needs a field; allowed > 0 V/m", ctx,
                       p->electric_field);
    if (p->axial_omega > 0.0)
        return cp_fail(err, CP_EINVAL, "%s: axial_omega %g rad/s with molecules in |1,0>: "
                       "dc-field shielding in a pancake trap is not modelled; allowed 0 rad/s "
                       "with rotational_j 1", ctx, p->axial_omega);
    double e[3], dm[9];
    CP_TRY(cp_fields_dipole_matrix(&rotor, p->electric_field, 0, 3, e, dm, NULL, err));
    q->regime = CP_SHIELD_DC_PAIR;
    for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
            q->stark_dipole[i][j] = dm[3 * i + j];
    q->pair_gap = CP_H * (2.0 * e[1] - e[0] - e[2]);
    CP_TRY(cp_collisions_shielded_cached(q, cache, r, err));
    *dipole_used = fabs(dm[4]);
    double x = p->dipole * p->electric_field / (CP_H * p->rot_const_hz);
    if (r->valid && x < CP_DC_SHIELD_MIN_REDUCED) {
        /* just above the crossing the adiabatic shield reaches far and the model's loss
         * falls without bound, while quenching to |0,0>|2,0> (not counted) takes over */
        r->valid = 0;
        snprintf(r->note, sizeof r->note, "field %.5g kV/cm (d F / B = %.4g) is too close "
                 "above the crossing (window from %.3g): quenching to |0,0>|2,0>, not in the "
                 "model, dominates; the loss is understated", p->electric_field / 1e5, x,
                 CP_DC_SHIELD_MIN_REDUCED);
    } else if (r->valid && x > CP_DC_SHIELD_MAX_REDUCED) {
        r->valid = 0;
        snprintf(r->note, sizeof r->note, "field %.4g kV/cm (d F / B = %.3g) is above the "
                 "shielding window (d F / B up to %.2g): other pair crossings and quenching "
                 "are not in the two-channel model", p->electric_field / 1e5, x,
                 CP_DC_SHIELD_MAX_REDUCED);
    }
    return CP_OK;
}

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
    return cp_collisions_protected_cached(p, NULL, r, dipole_used, regime, err);
}

cp_status cp_collisions_protected_cached(const cp_protection_params *p,
                                         cp_shielded_cache *cache, cp_shielded_result *r,
                                         double *dipole_used, cp_shield_regime *regime,
                                         cp_error *err)
{
    const char *ctx = "collisions.protected";
    if (!r || !dipole_used || !regime || !p)
        return cp_fail(err, CP_EINVAL, "%s: arguments must not be NULL", ctx);
    *dipole_used = NAN;
    cp_poison(&r->elastic_rate, 8);
    r->valid = 0;
    r->method = NULL;
    r->note[0] = '\0';
    CP_TRY(cp_check_range(err, ctx, "electric_field", p->electric_field, "V/m", 0.0,
                          CP_FIELDS_MAX_FIELD, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "axial_omega", p->axial_omega, "rad/s", 0.0,
                          2.0 * CP_PI * 1e6, CP_CLOSED));
    CP_TRY(cp_check_int_range(err, ctx, "rotational_j", p->rotational_j, 0, 1));
    cp_fields_rotor rotor = {p->dipole, p->rot_const_hz};
    cp_shielded_params q = {.stat = p->stat, .mass = p->mass, .c6_au = p->c6_au,
                            .temperature = p->temperature, .axial_omega = p->axial_omega};
    if (p->microwave && p->rotational_j != 0)
        return cp_fail(err, CP_EINVAL, "%s: rotational_j %d with a microwave: microwave "
                       "shielding dresses molecules in |0,0>; allowed 0 with a microwave", ctx,
                       p->rotational_j);
    if (p->rotational_j == 1) {
        *regime = CP_SHIELD_DC_PAIR;
        return dc_pair(p, &q, cache, r, dipole_used, err);
    }
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
        CP_TRY(cp_collisions_shielded_cached(&q, cache, r, err));
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
    CP_TRY(cp_collisions_shielded_cached(&q, cache, r, err));
    *dipole_used = q.dipole;
    if (p->electric_field > 0.0 && q.regime == CP_SHIELD_DC_3D) {
        double fs, key[2] = {p->dipole, p->rot_const_hz};
        if (!cp_shielded_cache_field(cache, key, &fs)) {
            CP_TRY(cp_fields_shielding_field(&rotor, &fs, NULL, err));
            cp_shielded_cache_set_field(cache, key, fs);
        }
        if (p->electric_field >= SHIELDING_FRACTION * fs) {
            r->valid = 0;
            snprintf(r->note, sizeof r->note, "field %.4g kV/cm is near or above the dc "
                     "shielding field %.4g kV/cm, but these are molecules in |0,0>, which it "
                     "does not shield (dc shielding needs |1,0>): the unshielded 3D rates",
                     p->electric_field / 1e5, fs / 1e5);
        }
    }
    return CP_OK;
}

/*
 * Microwave dressing of a polar rotor near the J = 0 -> 1 transition, and the effective
 * long-range potential of two dressed molecules (microwave shielding: Karman & Hutson,
 * PRL 121, 163401 (2018); Lassabliere & Quemener, PRL 121, 163402 (2018); the effective
 * potential of Deng et al., PRL 130, 183001 (2023)).
 *
 * One molecule, in the frame rotating with the microwave: |0> = |0,0> at 0, the addressed
 * state |a> = cos(xi)|1,1> + sin(xi)|1,-1> at -hbar Delta, coupling hbar Omega / 2.  The
 * dressed states are |+> = u|0> + v|a>, |-> = -v|0> + u|a>, u = cos m, v = sin m,
 * tan 2m = Omega / Delta, at E+- = hbar (-Delta +- Omega_e) / 2, Omega_e = sqrt(Delta^2 +
 * Omega^2).  The other two J = 1 states (|1,0> and the one orthogonal to |a>) are
 * spectators at -hbar Delta (hyperfine and Zeeman splittings neglected).
 *
 * Two molecules: with <1q|d|0,0> = (d/sqrt 3) e_q* the dipole-dipole operator keeps, in
 * the rotating-wave approximation, only the exchange terms |0,1q'> <-> |1q,0>, with
 * elements K [e_q'* . e_q - 3 (e_q'* . r^)(e_q . r^)], K = d^2 / (12 pi eps0 r^3).
 * First order in |++>: 2 u^2 v^2 K (1 - 3p), p = |eta . r^|^2 with eta the addressed
 * polarisation vector, i.e. 2 C3 (1 - 3p) / r^3 with C3 = d^2 / (48 pi eps0 (1 + delta^2))
 * = d_eff^2 / (4 pi eps0), d_eff = d / sqrt(12 (1 + delta^2)), delta = Delta / Omega: for
 * circular polarisation C3 (3 cos^2 theta - 1) / r^3, a dipolar interaction of reversed
 * sign (Deng et al. 2023; Karman & Hutson 2018).
 * Second order (every intermediate pair state lies below |++>, so the shift is repulsive):
 *   via |+-> + |-+> (gap hbar Omega_e) and |--> (gap 2 hbar Omega_e):
 *       2 u^2 v^2 K^2 (1 - 3p)^2 [(u^2 - v^2)^2 + u^2 v^2] / (hbar Omega_e);
 *   via a spectator s with the other molecule in |+> (gap hbar (Delta + Omega_e) / 2) or
 *   in |-> (gap hbar (Delta + 3 Omega_e) / 2), summed over s, sum_s |A_s|^2 = 9 p (1 - p):
 *       36 p (1 - p) u^2 v^2 K^2 [u^2 / (Delta + Omega_e) + v^2 / (Delta + 3 Omega_e)] / hbar,
 *   where u^2 / (Delta + Omega_e) = 1 / (2 Omega_e).
 * Together, C6 [4 p (1 - p) s6 + t6 (1 - 3p)^2] / r^6 with C6 = d^4 / (128 pi^2 eps0^2
 * hbar Omega_e (1 + delta^2)), s6 = 1 + (Omega_e - Delta) / (Delta + 3 Omega_e) and
 * t6 = (4/9) (cos^2 2m + sin^2 2m / 4).  For circular polarisation 4 p (1 - p) =
 * 1 - cos^4 theta, the angular shape of the shielding core of Deng et al.; their C6 is the
 * coefficient above [M: recalled, the derivation here is checked in the tests against a
 * numerical diagonalisation of the two-molecule Hamiltonian].
 */
#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "fields_int.h"

static void poison(cp_fields_microwave_result *out)
{
    double *f[] = {&out->upper_hz,    &out->lower_hz,         &out->splitting_hz,
                   &out->mixing_angle, &out->delta_ratio,     &out->effective_dipole,
                   &out->c3,          &out->c6,               &out->core_spectator,
                   &out->core_dressed, &out->ellipticity};
    for (size_t i = 0; i < sizeof f / sizeof f[0]; i++)
        *f[i] = NAN;
}

static cp_status check(const cp_fields_rotor *rotor, const cp_fields_microwave_params *p,
                       cp_error *err)
{
    static const char ctx[] = "fields.microwave";
    CP_TRY(cp_fields_check_rotor(ctx, rotor, err));
    if (!p)
        return cp_fail(err, CP_EINVAL, "%s: params is NULL", ctx);
    /* the two-level, rotating-wave model needs Omega, Delta << the carrier 2B/hbar */
    double wmax = CP_FIELDS_MAX_DRESSING * 2.0 * 2.0 * CP_PI * rotor->rot_const_hz;
    CP_TRY(cp_check_range(err, ctx, "rabi", p->rabi, "rad/s", CP_FIELDS_MIN_RABI, wmax,
                          CP_CLOSED));
    if (isfinite(p->detuning) && p->detuning < 0)
        return cp_fail(err, CP_EINVAL,
                       "%s: detuning %g rad/s is red of the J = 0 -> 1 transition: a molecule "
                       "dressed from |0,0> then follows the lower dressed state, which is not "
                       "shielded; allowed [0, %g] rad/s (blue)",
                       ctx, p->detuning, wmax);
    CP_TRY(cp_check_range(err, ctx, "detuning", p->detuning, "rad/s", 0.0, wmax, CP_CLOSED));
    if (isfinite(p->ellipticity) && p->ellipticity >= CP_FIELDS_MAX_ELLIPTICITY &&
        p->ellipticity <= CP_FIELDS_MAX_ELLIPTICITY * (1 + 1e-12))
        return cp_fail(err, CP_EINVAL,
                       "%s: ellipticity %g rad is linear polarisation: the shielding core "
                       "vanishes side by side along the polarisation; allowed [0, %g) rad",
                       ctx, p->ellipticity, CP_FIELDS_MAX_ELLIPTICITY);
    return cp_check_range(err, ctx, "ellipticity", p->ellipticity, "rad", 0.0,
                          CP_FIELDS_MAX_ELLIPTICITY, CP_HI_OPEN);
}

cp_status cp_fields_microwave(const cp_fields_rotor *rotor,
                              const cp_fields_microwave_params *params,
                              cp_fields_microwave_result *out, cp_error *err)
{
    cp_status st = check(rotor, params, err);
    if (st != CP_OK) {
        poison(out);
        return st;
    }
    double om = params->rabi, de = params->detuning, d = rotor->dipole;
    double oe = hypot(de, om), delta = de / om;
    double m = 0.5 * atan2(om, de);
    double s2 = om / oe, c2 = de / oe; /* sin 2m, cos 2m */
    double eps = 4.0 * CP_PI * CP_EPS0;
    out->upper_hz = (-de + oe) / (4.0 * CP_PI);
    out->lower_hz = (-de - oe) / (4.0 * CP_PI);
    out->splitting_hz = oe / (2.0 * CP_PI);
    out->mixing_angle = m;
    out->delta_ratio = delta;
    out->effective_dipole = d * s2 / sqrt(12.0);
    out->c3 = out->effective_dipole * out->effective_dipole / eps;
    out->c6 = d * d * d * d / (8.0 * eps * eps * CP_HBAR * oe * (1.0 + delta * delta));
    out->core_spectator = 1.0 + (oe - de) / (de + 3.0 * oe);
    out->core_dressed = 4.0 / 9.0 * (c2 * c2 + 0.25 * s2 * s2);
    out->ellipticity = params->ellipticity;
    return CP_OK;
}

cp_status cp_fields_microwave_potential(const cp_fields_microwave_result *mw, double r,
                                        double theta, double phi, double *potential,
                                        cp_error *err)
{
    static const char ctx[] = "fields.microwave_potential";
    *potential = NAN;
    if (!mw || !(mw->c3 > 0 && mw->c6 > 0 && isfinite(mw->c3) && isfinite(mw->c6) &&
                 isfinite(mw->core_spectator) && isfinite(mw->core_dressed) &&
                 mw->ellipticity >= 0 && mw->ellipticity < CP_FIELDS_MAX_ELLIPTICITY))
        return cp_fail(err, CP_EINVAL, "%s: mw is not a result of cp_fields_microwave", ctx);
    CP_TRY(cp_check_range(err, ctx, "r", r, "m", 0.0, INFINITY, CP_OPEN));
    CP_TRY(cp_check_finite(err, ctx, "theta", theta, "rad"));
    CP_TRY(cp_check_finite(err, ctx, "phi", phi, "rad"));
    double st = sin(theta);
    double p = 0.5 * st * st * (1.0 - sin(2.0 * mw->ellipticity) * cos(2.0 * phi));
    double q = 1.0 - 3.0 * p;
    double r3 = r * r * r;
    double v = 2.0 * mw->c3 * q / r3 +
               mw->c6 * (4.0 * p * (1.0 - p) * mw->core_spectator + mw->core_dressed * q * q) /
                   (r3 * r3);
    if (!isfinite(v))
        return cp_fail(err, CP_EINVAL, "%s: r %g m is too small: the potential overflows; "
                       "allowed r well above the shield radius (~1e-9 m)", ctx, r);
    *potential = v;
    return CP_OK;
}

/*
 * One cloud in a harmonic trap, in the local-density (semiclassical) approximation: its
 * validation, its fugacity from the atom number and temperature (with the thermo model's
 * solvers: ideal Fermi gas through GSL's complete Fermi–Dirac integral F_2, ideal Bose gas
 * through Li_3 = g_3; Boltzmann gas in closed form), its phase-space occupation and its
 * density profile (Butts & Rokhsar, PRA 55, 4346 (1997); Dalfovo, Giorgini, Pitaevskii &
 * Stringari, RMP 71, 463 (1999): the ideal gas in a harmonic trap and the Thomas–Fermi
 * limit).
 *
 * A Bose cloud below T_c is two parts (docs/models/feshbach.md, "Condensed partners"): the
 * condensate of the ideal-gas fraction N0 = N (1 - (T/T_c)^3), given the Thomas–Fermi
 * profile of an interacting condensate with the atoms' own scattering length a,
 *   mu = (hbar omega_bar / 2) (15 N0 a / a_ho)^(2/5),  a_ho = sqrt(hbar / (m omega_bar)),
 *   n_c(r) = (mu - V(r)) / g = n_c(0) (1 - sum_i r_i^2 / R_i^2),  R_i^2 = 2 mu / (m omega_i^2),
 *   n_c(0) = 15 N0 / (8 pi Rx Ry Rz)                                  (Dalfovo et al. 1999),
 * and around it the saturated ideal thermal part n_T(r) = g_{3/2}(e^(-V(r)/kB T)) / lambda^3,
 * whose integral is exactly N - N0.  The mean field of the condensate on the thermal atoms
 * (the semi-ideal and Hartree–Fock models) and the interaction shift of T_c and N0 are left
 * out: corrections of order mu / kB T_c (Giorgini, Pitaevskii & Stringari, PRA 54, R4633
 * (1996); Naraschewski & Stamper-Kurn, PRA 58, 2423 (1998)).
 */
#include <gsl/gsl_errno.h>
#include <gsl/gsl_sf_fermi_dirac.h>
#include <math.h>
#include <stdio.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "feshbach_int.h"
#include "thermo_int.h"

/* The Thomas–Fermi condensate of n0 atoms of cloud c (Dalfovo et al. 1999):
 * chemical potential, radii and peak density into s. */
static void thomas_fermi(const cp_feshbach_cloud *c, double n0, cp_cloud_state *s)
{
    double a_ho = sqrt(CP_HBAR / (c->mass * s->omega_bar));
    s->mu_tf = 0.5 * CP_HBAR * s->omega_bar * pow(15.0 * n0 * c->scattering_length / a_ho, 0.4);
    for (int i = 0; i < 3; i++)
        s->radius[i] = sqrt(2.0 * s->mu_tf / (c->mass * c->omega[i] * c->omega[i]));
    s->peak_tf = 15.0 * n0 / (8.0 * CP_PI * s->radius[0] * s->radius[1] * s->radius[2]);
}

cp_status cp_cloud_prepare(const cp_feshbach_cloud *c, double temperature, const char *ctx,
                           const char *name, unsigned allow_mask, cp_cloud_state *s,
                           cp_error *err)
{
    static const char *const axis[3] = {"omega_x", "omega_y", "omega_z"};
    char what[64];
    if (!c)
        return cp_fail(err, CP_EINVAL, "%s: cloud %s is NULL", ctx, name);
    if ((unsigned)c->profile > CP_PROFILE_THOMAS_FERMI || !(allow_mask & (1u << c->profile)))
        return cp_fail(err, CP_EINVAL, "%s: cloud %s profile %d is not supported here", ctx,
                       name, (int)c->profile);
    snprintf(what, sizeof what, "%s number", name);
    CP_TRY(cp_check_range(err, ctx, what, c->number, "", 1.0, 1e10, CP_CLOSED));
    snprintf(what, sizeof what, "%s mass", name);
    CP_TRY(cp_feshbach_check_mass(c->mass, ctx, what, err));
    for (int i = 0; i < 3; i++) {
        snprintf(what, sizeof what, "%s %s", name, axis[i]);
        CP_TRY(cp_check_range(err, ctx, what, c->omega[i], "rad/s", CP_MIN_TRAP_OMEGA,
                              CP_MAX_TRAP_OMEGA, CP_CLOSED));
    }
    s->profile = c->profile;
    s->mass = c->mass;
    s->number = c->number;
    s->omega_bar = cbrt(c->omega[0] * c->omega[1] * c->omega[2]);
    s->sag = -CP_G / (c->omega[2] * c->omega[2]);
    s->eta = 0.0;
    s->n_condensed = 0.0;
    s->mu_tf = s->peak_tf = s->u_tf = 0.0;

    if (c->profile == CP_PROFILE_THOMAS_FERMI) {
        snprintf(what, sizeof what, "%s scattering_length", name);
        CP_TRY(cp_check_range(err, ctx, what, c->scattering_length, "m", 0.0, 1e-6,
                              CP_LO_OPEN));
        thomas_fermi(c, c->number, s);
        s->temperature = temperature;
        return CP_OK;
    }

    CP_TRY(cp_check_range(err, ctx, "temperature", temperature, "K", CP_MIN_TEMPERATURE, CP_MAX_TEMPERATURE,
                          CP_CLOSED));
    s->temperature = temperature;
    double kt = CP_KB * temperature;
    for (int i = 0; i < 3; i++)
        s->ell[i] = sqrt(kt / (c->mass * c->omega[i] * c->omega[i]));
    /* N = (kT/hbar omega_bar)^3 * {exp(eta), F_2(eta), g_3(e^eta)} (Butts & Rokhsar 1997; docs/models/thermo.md) */
    double target = c->number * pow(CP_HBAR * s->omega_bar / kt, 3.0);
    /* the fugacity solvers of the thermo model (thermo_int.h) */
    switch (c->profile) {
    case CP_PROFILE_THERMAL:
        s->eta = log(target);
        return CP_OK;
    case CP_PROFILE_FERMI:
        return cp_thermo_fermi_solve(target, &s->eta, err);
    default: /* BOSE */
        break;
    }
    snprintf(what, sizeof what, "%s scattering_length", name);
    if (c->scattering_length != 0.0)
        CP_TRY(cp_check_range(err, ctx, what, c->scattering_length, "m", 0.0, 1e-6,
                              CP_LO_OPEN));
    CP_TRY(cp_polylog_plan_init(&s->li32, 1.5, err));
    if (target < CP_THERMO_ZETA3) {
        cp_polylog_plan li3;
        CP_TRY(cp_polylog_plan_init(&li3, 3.0, err));
        return cp_thermo_bose_solve(&li3, target, &s->eta, ctx, err);
    }
    /* below T_c: N0 = N (1 - (T/T_c)^3), (T/T_c)^3 = zeta(3) / target */
    s->n_condensed = c->number * (1.0 - CP_THERMO_ZETA3 / target);
    if (!(c->scattering_length > 0.0))
        return cp_fail(err, CP_EINVAL,
                       "%s: %s %g m is not positive, but cloud %s is below T_c (condensed "
                       "fraction %.3g) and its Thomas-Fermi condensate needs the atoms' own "
                       "scattering length; allowed (0, 1e-06] m", ctx, what,
                       c->scattering_length, name, s->n_condensed / c->number);
    thomas_fermi(c, s->n_condensed, s);
    s->u_tf = s->mu_tf / kt;
    return CP_OK;
}

double cp_cloud_occupation(const cp_cloud_state *s, const double rt[3], const double pt[3])
{
    double e = 0.5 * (rt[0] * rt[0] + rt[1] * rt[1] + rt[2] * rt[2] + pt[0] * pt[0] +
                      pt[1] * pt[1] + pt[2] * pt[2]);
    switch (s->profile) {
    case CP_PROFILE_THERMAL:
        return exp(s->eta - e);
    case CP_PROFILE_FERMI:
        return 1.0 / (exp(e - s->eta) + 1.0);
    case CP_PROFILE_BOSE: {
        double x = e - s->eta;
        return x > 1e-300 ? 1.0 / expm1(x) : 1e300;
    }
    default:
        return 0.0;
    }
}

double cp_cloud_density(const cp_cloud_state *s, const double r[3], cp_status *status)
{
    if (s->profile == CP_PROFILE_THOMAS_FERMI) {
        double u = 0.0;
        for (int i = 0; i < 3; i++)
            u += r[i] * r[i] / (s->radius[i] * s->radius[i]);
        if (u >= 1.0)
            return 0.0;
        /* n = (mu - V) / g = n0 (1 - u), normalised to N: n0 = 15 N / (8 pi Rx Ry Rz) */
        return s->peak_tf * (1.0 - u);
    }
    double v = 0.0; /* V / kT */
    for (int i = 0; i < 3; i++)
        v += 0.5 * r[i] * r[i] / (s->ell[i] * s->ell[i]);
    double vol = pow(2.0 * CP_PI, 1.5) * s->ell[0] * s->ell[1] * s->ell[2];
    if (s->profile == CP_PROFILE_THERMAL)
        return s->number / vol * exp(-v);
    double kt = CP_KB * s->temperature;
    double lambda = CP_H / sqrt(2.0 * CP_PI * s->mass * kt);
    if (s->profile == CP_PROFILE_BOSE) {
        /* n = g_{3/2}(e^(eta - V/kT)) / lambda^3 + n_c(0) max(0, 1 - V/mu) */
        double n = cp_polylog_bose(&s->li32, exp(s->eta - v)) / (lambda * lambda * lambda);
        if (v < s->u_tf)
            n += s->peak_tf * (1.0 - v / s->u_tf);
        return n;
    }
    /* FERMI: n = F_{1/2}(eta - V/kT) / lambda^3 with GSL's normalisation of F_{1/2} */
    gsl_sf_result res;
    if (gsl_sf_fermi_dirac_half_e(s->eta - v, &res) != GSL_SUCCESS) {
        *status = CP_ENUMERIC;
        return NAN;
    }
    return res.val / (lambda * lambda * lambda);
}

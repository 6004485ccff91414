/*
 * Feshbach resonance and Landau–Zener association: the scattering length a(B), the binding
 * energy of the Feshbach molecule, the Landau–Zener probability, the bulk ramp-rate law
 * (single call and the batch loop used by sweeps), association of two atoms in one harmonic
 * site, and the energy released by a dissociation ramp.  Formulas and sources:
 * docs/models/feshbach.md.  The overlap density
 * lives in feshbach_overlap.c, the phase-space ceiling in feshbach_spss.c.
 */
#include "coldprep/feshbach.h"

#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "feshbach_int.h"
#include "vdw_int.h"

/* Gamma(5/3): mean of E for the survival law exp(-(E/eps)^(3/2)). */
#define GAMMA_FIVE_THIRDS 0.9027452929509336

/* A field closer to b0 than this is "at the pole". */
#define POLE_GUARD 1e-12

cp_status cp_feshbach_check_resonance(const cp_feshbach_resonance *res, const char *ctx,
                                      cp_error *err)
{
    if (!res)
        return cp_fail(err, CP_EINVAL, "%s: resonance is NULL", ctx);
    CP_TRY(cp_check_range(err, ctx, "resonance b0", res->b0, "T", 0.0, 100.0, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "resonance width", res->width, "T", -10.0, 10.0, CP_CLOSED));
    if (res->width == 0.0)
        return cp_fail(err, CP_EINVAL, "%s: resonance width 0 T is zero; allowed 0 < |width| "
                       "<= 10 T", ctx);
    CP_TRY(cp_check_range(err, ctx, "resonance abg", res->abg, "m", -1e-6, 1e-6, CP_CLOSED));
    if (res->abg == 0.0)
        return cp_fail(err, CP_EINVAL, "%s: resonance abg 0 m is zero; allowed 0 < |abg| "
                       "<= 1e-06 m", ctx);
    if (res->abg * res->width < 0.0)
        return cp_fail(err, CP_EINVAL,
                       "%s: resonance abg %.6g m and width %.6g T have opposite signs; the "
                       "convention a(B) = abg (1 - width/(B - b0)) with dmu > 0 needs "
                       "abg * width > 0",
                       ctx, res->abg, res->width);
    CP_TRY(cp_check_range(err, ctx, "resonance dmu", res->dmu, "J/T", 0.0, 20.0 * CP_MUB,
                          CP_LO_OPEN));
    return cp_check_range(err, ctx, "resonance c6_au", res->c6_au, "a.u.", 0.0, 1e6, CP_CLOSED);
}

cp_status cp_feshbach_check_mass(double mass, const char *ctx, const char *name,
                                 cp_error *err)
{
    return cp_check_range(err, ctx, name, mass, "kg", 0.5 * CP_AMU, 500.0 * CP_AMU, CP_CLOSED);
}

static cp_status check_field(const cp_feshbach_resonance *res, double field, const char *ctx,
                             cp_error *err)
{
    CP_TRY(cp_check_range(err, ctx, "field", field, "T", 0.0, 100.0, CP_LO_OPEN));
    if (fabs(field - res->b0) <= POLE_GUARD)
        return cp_fail(err, CP_EINVAL,
                       "%s: field %.12g T is at the resonance b0 = %.12g T, where a(B) is "
                       "infinite; choose a field at least 1e-12 T away from b0",
                       ctx, field, res->b0);
    return CP_OK;
}

cp_status cp_feshbach_scattering_length(const cp_feshbach_resonance *res, double field,
                                        double *a, cp_error *err)
{
    static const char ctx[] = "feshbach.scattering_length";
    *a = NAN;
    CP_TRY(cp_feshbach_check_resonance(res, ctx, err));
    CP_TRY(check_field(res, field, ctx, err));
    /* Moerdijk et al. PRA 51, 4852 (1995); Chin et al. RMP 82, 1225 (2010) Eq. (1) [M] */
    *a = res->abg * (1.0 - res->width / (field - res->b0));
    return CP_OK;
}

cp_status cp_feshbach_mean_scattering_length(double c6_au, double mu, double *abar,
                                             cp_error *err)
{
    static const char ctx[] = "feshbach.mean_scattering_length";
    *abar = NAN;
    CP_TRY(cp_check_range(err, ctx, "c6_au", c6_au, "a.u.", CP_MIN_C6_AU, 1e6, CP_CLOSED));
    CP_TRY(cp_feshbach_check_mass(mu, ctx, "reduced mass", err));
    *abar = cp_vdw_mean_scattering_length(c6_au, mu);
    return CP_OK;
}

const char *cp_feshbach_model_name(cp_feshbach_model model)
{
    switch (model) {
    case CP_FESHBACH_AUTO: return "auto";
    case CP_FESHBACH_UNIVERSAL: return "universal";
    case CP_FESHBACH_CORRECTED: return "corrected";
    case CP_FESHBACH_LINEAR: return "linear";
    }
    return "unknown";
}

static void poison_binding(cp_feshbach_binding *out)
{
    out->energy = out->a = out->abar = out->rstar = out->s_res = NAN;
    out->model = CP_FESHBACH_AUTO;
    out->flags = 0;
}

cp_status cp_feshbach_binding_energy(const cp_feshbach_resonance *res, double mu, double field,
                                     cp_feshbach_model model, cp_feshbach_binding *out,
                                     cp_error *err)
{
    static const char ctx[] = "feshbach.binding_energy";
    poison_binding(out);
    CP_TRY(cp_feshbach_check_resonance(res, ctx, err));
    CP_TRY(cp_feshbach_check_mass(mu, ctx, "reduced mass", err));
    CP_TRY(check_field(res, field, ctx, err));
    if (model < CP_FESHBACH_AUTO || model > CP_FESHBACH_LINEAR)
        return cp_fail(err, CP_EINVAL, "%s: model %d is unknown; allowed auto, universal, "
                       "corrected, linear", ctx, (int)model);
    /* With abg * width > 0 and dmu > 0 the bound state exists below b0 (docs/models/feshbach.md,
     * Conventions). */
    if (field > res->b0)
        return cp_fail(err, CP_EINVAL,
                       "%s: field %.8g T is above b0 = %.8g T, on the atomic side where no "
                       "Feshbach molecule exists; allowed field < b0",
                       ctx, field, res->b0);

    double a = res->abg * (1.0 - res->width / (field - res->b0));
    double hb2 = CP_HBAR * CP_HBAR;
    /* R* = hbar^2 / (2 mu abg dmu Delta) (Chin et al. RMP 2010 [M]) */
    double rstar = hb2 / (2.0 * mu * res->abg * res->dmu * res->width);
    double abar = NAN, s_res = NAN;
    if (res->c6_au > 0.0) {
        CP_TRY(cp_feshbach_mean_scattering_length(res->c6_au, mu, &abar, err));
        s_res = abar / rstar;
    }

    if (model == CP_FESHBACH_AUTO) {
        double a_min = (res->c6_au > 0.0 ? 2.0 * abar : 0.0) + rstar;
        if (a > a_min)
            model = res->c6_au > 0.0 ? CP_FESHBACH_CORRECTED : CP_FESHBACH_UNIVERSAL;
        else
            model = CP_FESHBACH_LINEAR;
    }

    double energy;
    switch (model) {
    case CP_FESHBACH_UNIVERSAL:
        if (!(a > 0.0))
            return cp_fail(err, CP_EINVAL, "%s: the universal model needs a > 0, but a = %.6g m "
                           "at field %.8g T; use model \"linear\"", ctx, a, field);
        energy = hb2 / (2.0 * mu * a * a);
        break;
    case CP_FESHBACH_CORRECTED:
        if (res->c6_au == 0.0)
            return cp_fail(err, CP_EINVAL, "%s: the corrected model needs the pair's C6; "
                           "resonance c6_au is 0 (unknown)", ctx);
        if (!(a > abar))
            return cp_fail(err, CP_EINVAL, "%s: the corrected model needs a > abar = %.6g m, "
                           "but a = %.6g m at field %.8g T; use model \"linear\"",
                           ctx, abar, a, field);
        /* Gribakin–Flambaum correction (Chin et al. RMP 2010 Sec. II.A.3 [M]) */
        energy = hb2 / (2.0 * mu * (a - abar) * (a - abar));
        break;
    default:
        energy = res->dmu * (res->b0 - field);
        model = CP_FESHBACH_LINEAR;
        break;
    }
    out->energy = energy;
    out->a = a;
    out->abar = abar;
    out->rstar = rstar;
    out->s_res = s_res;
    out->model = model;
    /* validity (docs/models/feshbach.md): NaN comparisons are false, so an unknown C6
     * raises neither abar nor s_res flags */
    int broad = s_res >= 1.0;
    if (a > 0.0 && a < abar && (model != CP_FESHBACH_LINEAR || broad))
        out->flags |= CP_FESHBACH_FLAG_BELOW_ABAR;
    if (!(a > 0.0))
        out->flags |= CP_FESHBACH_FLAG_PAST_ZERO;
    if (model == CP_FESHBACH_LINEAR && broad)
        out->flags |= CP_FESHBACH_FLAG_LINEAR_BROAD;
    return CP_OK;
}

cp_status cp_feshbach_lz_probability(double delta, double *probability, cp_error *err)
{
    *probability = NAN;
    CP_TRY(cp_check_range(err, "feshbach.lz_probability", "lz_parameter", delta, "", 0.0, 1e12,
                          CP_CLOSED));
    *probability = -expm1(-2.0 * CP_PI * delta);
    return CP_OK;
}

cp_status cp_feshbach_alpha(double mu, double *alpha, cp_error *err)
{
    *alpha = NAN;
    CP_TRY(cp_feshbach_check_mass(mu, "feshbach.alpha", "reduced mass", err));
    *alpha = 4.0 * CP_PI * CP_PI * CP_HBAR / mu; /* docs/models/feshbach.md, the Landau-Zener law */
    return CP_OK;
}

static cp_status check_rate(double rate, const char *ctx, cp_error *err)
{
    CP_TRY(cp_check_finite(err, ctx, "ramp_rate", rate, "T/s"));
    if (!(fabs(rate) >= 1e-6 && fabs(rate) <= 1e9))
        return cp_fail(err, CP_EINVAL, "%s: ramp_rate %.6g T/s is out of range; allowed "
                       "1e-06 <= |ramp_rate| <= 1e+09 T/s", ctx, rate);
    return CP_OK;
}

cp_status cp_feshbach_associate(const cp_feshbach_resonance *res, double mu,
                                const cp_feshbach_ramp *ramp, double *efficiency,
                                double *delta, cp_error *err)
{
    static const char ctx[] = "feshbach.associate";
    *efficiency = *delta = NAN;
    CP_TRY(cp_feshbach_check_resonance(res, ctx, err));
    CP_TRY(cp_feshbach_check_mass(mu, ctx, "reduced mass", err));
    if (!ramp)
        return cp_fail(err, CP_EINVAL, "%s: ramp is NULL", ctx);
    CP_TRY(check_rate(ramp->ramp_rate, ctx, err));
    CP_TRY(cp_check_range(err, ctx, "density", ramp->density, "m^-3", 0.0, 1e24, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "alpha", ramp->alpha, "m^2/s", 0.0, 1e3, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "max_efficiency", ramp->max_efficiency, "", 0.0, 1.0,
                          CP_LO_OPEN));
    double alpha = ramp->alpha > 0.0 ? ramp->alpha : 4.0 * CP_PI * CP_PI * CP_HBAR / mu;
    /* Hodby et al., PRL 94, 120402 (2005) [M]: P = Pmax (1 - exp(-alpha n |abg Delta/Bdot|)) */
    double x = alpha * ramp->density * fabs(res->abg * res->width / ramp->ramp_rate);
    *delta = x / (2.0 * CP_PI);
    *efficiency = ramp->max_efficiency * -expm1(-x);
    return CP_OK;
}

cp_status cp_feshbach_ramp_law(double coefficient, double max_efficiency, const double *rates,
                               double *efficiency, size_t n, cp_error *err)
{
    static const char ctx[] = "feshbach.ramp_law";
    cp_status st = cp_check_range(err, ctx, "coefficient", coefficient, "T/s", 0.0, 1e30,
                                  CP_LO_OPEN);
    if (st == CP_OK)
        st = cp_check_range(err, ctx, "max_efficiency", max_efficiency, "", 0.0, 1.0,
                            CP_LO_OPEN);
    if (st == CP_OK && n > 0 && (!rates || !efficiency))
        st = cp_fail(err, CP_EINVAL, "%s: rates or efficiency is NULL with n = %zu", ctx, n);
    if (st != CP_OK) {
        for (size_t i = 0; efficiency && i < n; i++)
            efficiency[i] = NAN;
        return st;
    }
    /* Validate in one cheap pass, then run the vectorised kernel (feshbach_kernel.c). */
    int bad = 0;
    for (size_t i = 0; i < n; i++) {
        double rate = fabs(rates[i]);
        bad |= !(rate >= 1e-6 && rate <= 1e9);
    }
    if (bad) {
        size_t i = 0;
        while (fabs(rates[i]) >= 1e-6 && fabs(rates[i]) <= 1e9)
            i++;
        for (size_t j = 0; j < n; j++)
            efficiency[j] = NAN;
        return cp_fail(err, CP_EINVAL, "%s: rates[%zu] %.6g T/s is out of range; allowed "
                       "1e-06 <= |rate| <= 1e+09 T/s", ctx, i + 1, rates[i]);
    }
    cp_feshbach_ramp_kernel(coefficient, max_efficiency, rates, efficiency, n);
    return CP_OK;
}

cp_status cp_feshbach_associate_site(const cp_feshbach_resonance *res, double mu,
                                     double ramp_rate, const double omega_rel[3],
                                     double max_efficiency, double *efficiency, double *delta,
                                     cp_error *err)
{
    static const char ctx[] = "feshbach.associate_site";
    static const char *const names[3] = {"omega_x", "omega_y", "omega_z"};
    *efficiency = *delta = NAN;
    CP_TRY(cp_feshbach_check_resonance(res, ctx, err));
    CP_TRY(cp_feshbach_check_mass(mu, ctx, "reduced mass", err));
    CP_TRY(check_rate(ramp_rate, ctx, err));
    if (!omega_rel)
        return cp_fail(err, CP_EINVAL, "%s: omega_rel is NULL", ctx);
    for (int i = 0; i < 3; i++)
        CP_TRY(cp_check_range(err, ctx, names[i], omega_rel[i], "rad/s", CP_MIN_TRAP_OMEGA,
                              CP_MAX_TRAP_OMEGA, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "max_efficiency", max_efficiency, "", 0.0, 1.0,
                          CP_LO_OPEN));
    /* |psi_rel(0)|^2 of the harmonic ground state of relative motion (docs/models/feshbach.md) */
    double psi0 = pow(mu / (CP_PI * CP_HBAR), 1.5) *
                  sqrt(omega_rel[0] * omega_rel[1] * omega_rel[2]);
    double x = 4.0 * CP_PI * CP_PI * CP_HBAR * fabs(res->abg * res->width) /
               (mu * fabs(ramp_rate)) * psi0;
    *delta = x / (2.0 * CP_PI);
    *efficiency = max_efficiency * -expm1(-x);
    return CP_OK;
}

cp_status cp_feshbach_dissociation_energy(const cp_feshbach_resonance *res, double mu,
                                          double ramp_rate, double *energy, double *scale,
                                          cp_error *err)
{
    static const char ctx[] = "feshbach.dissociation_energy";
    *energy = *scale = NAN;
    CP_TRY(cp_feshbach_check_resonance(res, ctx, err));
    CP_TRY(cp_feshbach_check_mass(mu, ctx, "reduced mass", err));
    CP_TRY(check_rate(ramp_rate, ctx, err));
    /* Survival of the quasi-bound state above threshold, E(t) = dmu |Bdot| t, decay rate
     * Gamma(E)/hbar with Gamma(E) = 2 k abg dmu Delta (Chin et al. RMP 2010 [M]):
     * -ln S = (4/3) |abg Delta| sqrt(2 mu) E^(3/2) / (hbar^2 |Bdot|) = (E/eps)^(3/2), this
     * project's own integration of that width (docs/models/feshbach.md); the same rate law
     * as Mukaiyama et al., PRL 92, 180402 (2004) [M]. */
    double eps = pow(3.0 * CP_HBAR * CP_HBAR * fabs(ramp_rate) /
                     (4.0 * fabs(res->abg * res->width) * sqrt(2.0 * mu)), 2.0 / 3.0);
    *scale = eps;
    *energy = GAMMA_FIVE_THIRDS * eps;
    return CP_OK;
}

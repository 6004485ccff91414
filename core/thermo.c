/*
 * Ideal Fermi and Bose gases in a 3D harmonic trap (semiclassical, LDA): the state from
 * (N, T) or (N, T/T_F), (N, T/T_c), and the inverse from the entropy per particle.
 * Relations (re-derived in docs/models/thermo.md; Butts & Rokhsar, PRA 55,
 * 4346 (1997); Dalfovo et al., RMP 71, 463 (1999)), with x = mu/k_BT, t = k_BT/(hbar w):
 *   fermions  N = t^3 F_2(x),  E = 3 k_BT t^3 F_3(x),  S/Nk_B = 4 F_3/F_2 - x,
 *             n(0) = F_{1/2}(x)/lambda^3        (F_j: GSL's normalised Fermi-Dirac integral)
 *   bosons    T > T_c: N = t^3 Li_3(z), E = 3 k_BT t^3 Li_4(z), S/Nk_B = 4 Li_4/Li_3 - ln z,
 *             n(0) = Li_{3/2}(z)/lambda^3;  T <= T_c: z = 1, N_th = N (T/T_c)^3 = t^3 zeta(3),
 *             E/N = 3 k_BT zeta(4)/zeta(3) (T/T_c)^3, S/Nk_B = 4 zeta(4)/zeta(3) (T/T_c)^3.
 */
#include "coldprep/thermo.h"

#include <math.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_roots.h>
#include <gsl/gsl_sf_fermi_dirac.h>
#include <gsl/gsl_sf_zeta.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "thermo_int.h"

void cp_thermo_trap_isotropic(cp_thermo_trap *trap, double number, double omega_bar,
                              double mass)
{
    trap->number = number;
    trap->omega[0] = trap->omega[1] = trap->omega[2] = omega_bar;
    trap->mass = mass;
}

double cp_thermo_omega_bar(const cp_thermo_trap *trap)
{
    return cbrt(trap->omega[0] * trap->omega[1] * trap->omega[2]);
}

cp_status cp_thermo_check_trap(const cp_thermo_trap *trap, const char *ctx, cp_error *err)
{
    static const char *const names[3] = {"omega_x", "omega_y", "omega_z"};
    if (!trap)
        return cp_fail(err, CP_EINVAL, "%s: trap is NULL", ctx);
    CP_TRY(cp_check_range(err, ctx, "number", trap->number, "", 1.0, 1e12, CP_CLOSED));
    for (int i = 0; i < 3; i++)
        CP_TRY(cp_check_range(err, ctx, names[i], trap->omega[i], "rad/s", CP_MIN_TRAP_OMEGA,
                              CP_MAX_TRAP_OMEGA, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "mass", trap->mass, "kg", 1e-30, 1e-21, CP_LO_OPEN));
    return CP_OK;
}

cp_status cp_thermo_check_temperature(double temperature, const char *ctx, cp_error *err)
{
    return cp_check_range(err, ctx, "temperature", temperature, "K", CP_MIN_TEMPERATURE, CP_MAX_TEMPERATURE,
                          CP_CLOSED);
}

cp_status cp_thermo_check_statistics(cp_statistics stat, const char *ctx, cp_error *err)
{
    if (stat != CP_FERMION && stat != CP_BOSON)
        return cp_fail(err, CP_EINVAL, "%s: statistics %d is not fermion (1) or boson (0)", ctx,
                       (int)stat);
    return CP_OK;
}

double cp_thermo_debroglie(double mass, double temperature)
{
    return CP_H / sqrt(2.0 * CP_PI * mass * CP_KB * temperature);
}

cp_status cp_thermo_fd(int j2, double x, double *value, cp_error *err)
{
    gsl_sf_result r;
    int status;
    switch (j2) {
    case -1: status = gsl_sf_fermi_dirac_mhalf_e(x, &r); break;
    case 1: status = gsl_sf_fermi_dirac_half_e(x, &r); break;
    case 2: status = gsl_sf_fermi_dirac_1_e(x, &r); break;
    case 3: status = gsl_sf_fermi_dirac_3half_e(x, &r); break;
    case 4: status = gsl_sf_fermi_dirac_2_e(x, &r); break;
    default: status = gsl_sf_fermi_dirac_int_e(j2 / 2, x, &r); break;
    }
    if (status == GSL_EUNDRFLW) { /* far in the classical tail: F_j(x) ~ e^x < DBL_MIN */
        *value = 0.0;
        return CP_OK;
    }
    if (status != GSL_SUCCESS) {
        *value = NAN;
        return cp_fail(err, CP_ENUMERIC, "thermo: Fermi-Dirac integral F_%g(%g) failed: %s",
                       j2 / 2.0, x, gsl_strerror(status));
    }
    *value = r.val;
    return CP_OK;
}

/* Solve F_2(x) = y for x by Newton's method on ln F_2(x) - ln y (increasing and concave,
 * so the iteration converges from any start), started from the Sommerfeld cubic
 * x^3 + pi^2 x = 6 y when y > 1 and from ln y otherwise. */
cp_status cp_thermo_fermi_solve(double y, double *x_out, cp_error *err)
{
    double x;
    if (y > 1.0) {
        /* Cardano for x^3 + p x - q = 0 with p = pi^2, q = 6y (one real root). */
        double p = CP_PI * CP_PI, q = 6.0 * y;
        double d = sqrt(q * q / 4.0 + p * p * p / 27.0);
        x = cbrt(q / 2.0 + d) + cbrt(q / 2.0 - d);
    } else {
        x = log(y);
    }
    double ly = log(y);
    int polish = 0; /* quadratic convergence: one more step after |dx| < 1e-9 reaches the
                       rounding level without waiting for a step below it */
    for (int it = 0; it < 100; it++) {
        double f2, f1;
        CP_TRY(cp_thermo_fd(4, x, &f2, err));
        CP_TRY(cp_thermo_fd(2, x, &f1, err));
        double dx = -(log(f2) - ly) * f2 / f1;
        x += dx;
        if (polish) {
            *x_out = x;
            return CP_OK;
        }
        polish = fabs(dx) <= 1e-9 * fmax(1.0, fabs(x));
    }
    *x_out = NAN;
    return cp_fail(err, CP_ENOCONV,
                   "thermo.fermi: chemical-potential solve did not converge for N (hbar "
                   "omega/k_B T)^3 = %g",
                   y);
}

/* Fill the Fermi result from the log-fugacity x at temperature T. */
static cp_status fermi_fill(const cp_thermo_trap *trap, double temperature, double x,
                            cp_thermo_fermi_result *out, cp_error *err)
{
    double wbar = cp_thermo_omega_bar(trap);
    double kt = CP_KB * temperature;
    double tf = CP_HBAR * wbar * cbrt(6.0 * trap->number) / CP_KB;
    double f2, f3, fh;
    CP_TRY(cp_thermo_fd(4, x, &f2, err));
    CP_TRY(cp_thermo_fd(6, x, &f3, err));
    CP_TRY(cp_thermo_fd(1, x, &fh, err));
    double lambda = cp_thermo_debroglie(trap->mass, temperature);
    out->temperature = temperature;
    out->fermi_temperature = tf;
    out->t_over_tf = temperature / tf;
    out->log_fugacity = x;
    out->fugacity = exp(x);
    out->chemical_potential = x * kt;
    out->energy_per_particle = 3.0 * kt * f3 / f2;
    out->entropy_per_particle = 4.0 * f3 / f2 - x;
    out->peak_density = fh / (lambda * lambda * lambda);
    out->phase_space_density = fh;
    return CP_OK;
}

static void fermi_poison(cp_thermo_fermi_result *out)
{
    cp_poison(&out->temperature, (int)(sizeof *out / sizeof(double)));
}

static void bose_poison(cp_thermo_bose_result *out)
{
    cp_poison(&out->temperature, (int)(sizeof *out / sizeof(double)));
}

static cp_status fermi_at(const cp_thermo_trap *trap, double t_over_tf,
                          cp_thermo_fermi_result *out, const char *ctx, cp_error *err)
{
    if (t_over_tf < CP_THERMO_MIN_T_OVER_TF || t_over_tf > CP_THERMO_MAX_T_OVER)
        return cp_fail(err, CP_EINVAL,
                       "%s: T/T_F %.6g is out of range; allowed [%g, %g] (below %g the "
                       "fugacity overflows: use the T = 0 limit)",
                       ctx, t_over_tf, CP_THERMO_MIN_T_OVER_TF, CP_THERMO_MAX_T_OVER,
                       CP_THERMO_MIN_T_OVER_TF);
    double tf = CP_HBAR * cp_thermo_omega_bar(trap) * cbrt(6.0 * trap->number) / CP_KB;
    double temperature = t_over_tf * tf;
    CP_TRY(cp_thermo_check_temperature(temperature, ctx, err));
    double y = 1.0 / (6.0 * t_over_tf * t_over_tf * t_over_tf);
    double x;
    CP_TRY(cp_thermo_fermi_solve(y, &x, err));
    return fermi_fill(trap, temperature, x, out, err);
}

cp_status cp_thermo_fermi(const cp_thermo_trap *trap, double temperature,
                          cp_thermo_fermi_result *out, cp_error *err)
{
    const char *ctx = "thermo.fermi";
    fermi_poison(out);
    CP_TRY(cp_thermo_check_trap(trap, ctx, err));
    CP_TRY(cp_thermo_check_temperature(temperature, ctx, err));
    double tf = CP_HBAR * cp_thermo_omega_bar(trap) * cbrt(6.0 * trap->number) / CP_KB;
    cp_status st = fermi_at(trap, temperature / tf, out, ctx, err);
    if (st != CP_OK) {
        fermi_poison(out);
        return st;
    }
    out->temperature = temperature; /* exactly the caller's value */
    out->t_over_tf = temperature / tf;
    return CP_OK;
}

cp_status cp_thermo_fermi_at(const cp_thermo_trap *trap, double t_over_tf,
                             cp_thermo_fermi_result *out, cp_error *err)
{
    const char *ctx = "thermo.fermi";
    fermi_poison(out);
    CP_TRY(cp_thermo_check_trap(trap, ctx, err));
    CP_TRY(cp_check_range(err, ctx, "t_over_tf", t_over_tf, "", 0.0, INFINITY, CP_OPEN));
    cp_status st = fermi_at(trap, t_over_tf, out, ctx, err);
    if (st != CP_OK)
        fermi_poison(out);
    return st;
}

cp_status cp_thermo_bose_plans(cp_thermo_bose_plans_t *p, cp_error *err)
{
    CP_TRY(cp_polylog_plan_init(&p->li32, 1.5, err));
    CP_TRY(cp_polylog_plan_init(&p->li3, 3.0, err));
    CP_TRY(cp_polylog_plan_init(&p->li4, 4.0, err));
    p->zeta3 = p->li3.coef[0];
    p->zeta4 = p->li4.coef[0];
    p->zeta32 = p->li32.coef[0];
    return CP_OK;
}

/* Brent's method for f(mu) = target on [lo, hi] (f(lo) - target and f(hi) - target of
 * opposite signs). */
typedef struct brent_fn {
    double (*f)(double, void *);
    void *ctx;
    double target;
} brent_fn;

static double brent_shift(double x, void *p)
{
    brent_fn *b = p;
    return b->f(x, b->ctx) - b->target;
}

cp_status cp_thermo_brent(double (*f)(double, void *), void *ctx, double target, double lo,
                          double hi, double *root, const char *what, cp_error *err)
{
    *root = NAN;
    brent_fn b = {f, ctx, target};
    gsl_function F = {brent_shift, &b};
    double flo = brent_shift(lo, &b), fhi = brent_shift(hi, &b);
    if (!(isfinite(flo) && isfinite(fhi)))
        return cp_fail(err, CP_ENUMERIC, "%s: the function is not finite at the bracket "
                       "[%g, %g]", what, lo, hi);
    if (flo == 0.0) {
        *root = lo;
        return CP_OK;
    }
    if (fhi == 0.0) {
        *root = hi;
        return CP_OK;
    }
    if ((flo > 0) == (fhi > 0))
        return cp_fail(err, CP_ENOCONV, "%s: no root in [%g, %g]", what, lo, hi);
    gsl_root_fsolver *solver = gsl_root_fsolver_alloc(gsl_root_fsolver_brent);
    if (!solver)
        return cp_fail(err, CP_ENOMEM, "%s: cannot allocate the root solver", what);
    cp_status result = CP_ENOCONV;
    int status = gsl_root_fsolver_set(solver, &F, lo, hi);
    for (int it = 0; status == GSL_SUCCESS && it < 200; it++) {
        status = gsl_root_fsolver_iterate(solver);
        if (status != GSL_SUCCESS)
            break;
        double a = gsl_root_fsolver_x_lower(solver), c = gsl_root_fsolver_x_upper(solver);
        if (gsl_root_test_interval(a, c, 1e-15, 2e-15) == GSL_SUCCESS) {
            *root = gsl_root_fsolver_root(solver);
            result = CP_OK;
            break;
        }
    }
    gsl_root_fsolver_free(solver);
    if (result != CP_OK)
        return cp_fail(err, status != GSL_SUCCESS ? CP_ENUMERIC : CP_ENOCONV,
                       "%s: root finding failed on [%g, %g]", what, lo, hi);
    return CP_OK;
}

static double li3_of_mu(double mu, void *p)
{
    return cp_polylog_bose(p, exp(mu));
}

cp_status cp_thermo_bose_solve(const cp_polylog_plan *li3, double y, double *mu, const char *ctx,
                               cp_error *err)
{
    /* z <= Li_3(z) <= zeta(3) z brackets ln z */
    double zeta3 = li3->coef[0];
    return cp_thermo_brent(li3_of_mu, (void *)li3, y, log(y / zeta3), fmin(0.0, log(y)), mu,
                           ctx, err);
}

/* Bose gas at T/T_c = x with the plans prepared. */
static cp_status bose_at(const cp_thermo_trap *trap, const cp_thermo_bose_plans_t *pl,
                         double x, cp_thermo_bose_result *out, const char *ctx, cp_error *err)
{
    double wbar = cp_thermo_omega_bar(trap);
    double tc = CP_HBAR * wbar * cbrt(trap->number / pl->zeta3) / CP_KB;
    double temperature = x * tc;
    CP_TRY(cp_thermo_check_temperature(temperature, ctx, err));
    double kt = CP_KB * temperature;
    double lambda = cp_thermo_debroglie(trap->mass, temperature);
    double l3 = lambda * lambda * lambda;
    double mu = 0.0, n0frac = 0.0, li32, e_per, s_per;
    if (x <= 1.0) {
        double x3 = x * x * x;
        n0frac = 1.0 - x3;
        li32 = pl->zeta32;
        e_per = 3.0 * kt * pl->zeta4 / pl->zeta3 * x3;
        s_per = 4.0 * pl->zeta4 / pl->zeta3 * x3;
    } else {
        double y = pl->zeta3 / (x * x * x); /* Li_3(z) */
        CP_TRY(cp_thermo_bose_solve(&pl->li3, y, &mu, ctx, err));
        double z = exp(mu);
        li32 = cp_polylog_bose(&pl->li32, z);
        double li4 = cp_polylog_bose(&pl->li4, z);
        e_per = 3.0 * kt * li4 / y;
        s_per = 4.0 * li4 / y - mu;
    }
    double a3 = 1.0;
    for (int i = 0; i < 3; i++)
        a3 *= sqrt(CP_HBAR / (trap->mass * trap->omega[i]));
    out->temperature = temperature;
    out->critical_temperature = tc;
    out->t_over_tc = x;
    out->condensed_fraction = n0frac;
    out->fugacity = exp(mu);
    out->chemical_potential = mu * kt;
    out->energy_per_particle = e_per;
    out->entropy_per_particle = s_per;
    out->peak_density = li32 / l3;
    out->phase_space_density = li32;
    out->condensate_peak_density = n0frac * trap->number / (pow(CP_PI, 1.5) * a3);
    return CP_OK;
}

static cp_status bose_common(const cp_thermo_trap *trap, double x, cp_thermo_bose_result *out,
                             cp_error *err)
{
    const char *ctx = "thermo.bose";
    if (!(x > 0.0 && x <= CP_THERMO_MAX_T_OVER))
        return cp_fail(err, CP_EINVAL, "%s: T/T_c %.6g is out of range; allowed (0, %g]", ctx,
                       x, CP_THERMO_MAX_T_OVER);
    cp_thermo_bose_plans_t pl;
    CP_TRY(cp_thermo_bose_plans(&pl, err));
    return bose_at(trap, &pl, x, out, ctx, err);
}

cp_status cp_thermo_bose(const cp_thermo_trap *trap, double temperature,
                         cp_thermo_bose_result *out, cp_error *err)
{
    const char *ctx = "thermo.bose";
    bose_poison(out);
    CP_TRY(cp_thermo_check_trap(trap, ctx, err));
    CP_TRY(cp_thermo_check_temperature(temperature, ctx, err));
    double tc = CP_HBAR * cp_thermo_omega_bar(trap) * cbrt(trap->number / CP_THERMO_ZETA3) /
                CP_KB;
    cp_status st = bose_common(trap, temperature / tc, out, err);
    if (st != CP_OK) {
        bose_poison(out);
        return st;
    }
    out->temperature = temperature;
    return CP_OK;
}

cp_status cp_thermo_bose_at(const cp_thermo_trap *trap, double t_over_tc,
                            cp_thermo_bose_result *out, cp_error *err)
{
    bose_poison(out);
    CP_TRY(cp_thermo_check_trap(trap, "thermo.bose", err));
    CP_TRY(cp_check_range(err, "thermo.bose", "t_over_tc", t_over_tc, "", 0.0, INFINITY,
                          CP_OPEN));
    cp_status st = bose_common(trap, t_over_tc, out, err);
    if (st != CP_OK)
        bose_poison(out);
    return st;
}

/* ---- the inverse from the entropy ------------------------------------------------------ */

static double fermi_entropy_of_x(double x, void *p)
{
    (void)p;
    double f2, f3;
    if (cp_thermo_fd(4, x, &f2, NULL) != CP_OK || cp_thermo_fd(6, x, &f3, NULL) != CP_OK)
        return NAN;
    return 4.0 * f3 / f2 - x;
}

static double bose_entropy_of_mu(double mu, void *p)
{
    const cp_thermo_bose_plans_t *pl = p;
    double z = exp(mu);
    return 4.0 * cp_polylog_bose(&pl->li4, z) / cp_polylog_bose(&pl->li3, z) - mu;
}

cp_status cp_thermo_temperature_from_entropy(const cp_thermo_trap *trap, cp_statistics stat,
                                             double s, double *temperature, cp_error *err)
{
    const char *ctx = "thermo.temperature_from_entropy";
    *temperature = NAN;
    CP_TRY(cp_thermo_check_trap(trap, ctx, err));
    CP_TRY(cp_thermo_check_statistics(stat, ctx, err));
    CP_TRY(cp_check_range(err, ctx, "entropy_per_particle", s, "k_B", 0.0, 40.0, CP_LO_OPEN));
    double wbar = cp_thermo_omega_bar(trap);
    double t;
    if (stat == CP_FERMION) {
        /* x at the smallest allowed T/T_F: solve F_2(x) = 1/(6 (T/T_F)^3). */
        double xmax;
        CP_TRY(cp_thermo_fermi_solve(1.0 / (6.0 * pow(CP_THERMO_MIN_T_OVER_TF, 3.0)), &xmax,
                                     err));
        double smin = fermi_entropy_of_x(xmax, NULL);
        if (s < smin)
            return cp_fail(err, CP_EINVAL,
                           "%s: entropy_per_particle %.6g k_B is out of range for fermions; "
                           "allowed [%.6g, 40] k_B (T/T_F >= %g)",
                           ctx, s, smin, CP_THERMO_MIN_T_OVER_TF);
        double lo = fmin(0.0, 4.0 - s) - 5.0;
        double x;
        CP_TRY(cp_thermo_brent(fermi_entropy_of_x, NULL, s, lo, xmax, &x, ctx, err));
        double f2;
        CP_TRY(cp_thermo_fd(4, x, &f2, err));
        t = CP_HBAR * wbar * cbrt(trap->number / f2) / CP_KB;
    } else {
        cp_thermo_bose_plans_t pl;
        CP_TRY(cp_thermo_bose_plans(&pl, err));
        double tc = CP_HBAR * wbar * cbrt(trap->number / pl.zeta3) / CP_KB;
        double sc = 4.0 * pl.zeta4 / pl.zeta3;
        if (s <= sc) {
            t = tc * cbrt(s / sc);
        } else {
            double lo = fmin(-1.0, 3.0 - s) - 2.0, mu;
            CP_TRY(cp_thermo_brent(bose_entropy_of_mu, &pl, s, lo, 0.0, &mu, ctx, err));
            double y = cp_polylog_bose(&pl.li3, exp(mu));
            t = CP_HBAR * wbar * cbrt(trap->number / y) / CP_KB;
        }
    }
    CP_TRY(cp_thermo_check_temperature(t, ctx, err));
    *temperature = t;
    return CP_OK;
}

cp_status cp_thermo_entropy(const cp_thermo_trap *trap, cp_statistics stat, double temperature,
                            double *s, cp_error *err)
{
    *s = NAN;
    CP_TRY(cp_thermo_check_statistics(stat, "thermo.entropy", err));
    if (stat == CP_FERMION) {
        cp_thermo_fermi_result r;
        CP_TRY(cp_thermo_fermi(trap, temperature, &r, err));
        *s = r.entropy_per_particle;
    } else {
        cp_thermo_bose_result r;
        CP_TRY(cp_thermo_bose(trap, temperature, &r, err));
        *s = r.entropy_per_particle;
    }
    return CP_OK;
}

cp_status cp_thermo_match_harmonic(const cp_thermo_trap *trap, cp_statistics stat,
                                   double temperature, const double omega_to[3],
                                   double *temperature_to, cp_error *err)
{
    static const char ctx[] = "thermo.match_harmonic";
    *temperature_to = NAN;
    CP_TRY(cp_thermo_check_trap(trap, ctx, err));
    CP_TRY(cp_thermo_check_temperature(temperature, ctx, err));
    CP_TRY(cp_thermo_check_statistics(stat, ctx, err));
    if (!omega_to)
        return cp_fail(err, CP_EINVAL, "%s: final trap frequencies are NULL", ctx);
    double s;
    CP_TRY(cp_thermo_entropy(trap, stat, temperature, &s, err));
    cp_thermo_trap to = *trap;
    for (int i = 0; i < 3; i++)
        to.omega[i] = omega_to[i];
    cp_status st = cp_thermo_check_trap(&to, "thermo.match_harmonic (final trap)", err);
    if (st != CP_OK)
        return st;
    return cp_thermo_temperature_from_entropy(&to, stat, s, temperature_to, err);
}

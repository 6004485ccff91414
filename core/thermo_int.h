/*
 * Private helpers of the thermo model: the Bose polylogarithm Li_s(z) for 0 <= z <= 1
 * (GSL has none), and what the thermo sources share (validation, the Fermi-Dirac
 * integrals F_j(x) = -Li_{j+1}(-e^x) from GSL, the chemical-potential and Brent solvers).
 * Not installed.
 */
#ifndef COLDPREP_THERMO_INT_H
#define COLDPREP_THERMO_INT_H

#include "coldprep/status.h"

/* Terms kept in the expansion of Li_s(e^mu) in powers of mu (|mu| <= ln 2: the terms fall
 * off like (ln 2 / 2 pi)^k, so 28 terms reach 1e-17 relative). */
#define CP_POLYLOG_TERMS 28

/* Precomputed coefficients of Li_s(e^mu) = sum_k zeta(s - k) mu^k / k! + singular term,
 * for one order s; built once, then evaluated many times without calling the zeta
 * function again.  Owned by the caller (plain struct, no allocation). */
typedef struct cp_polylog_plan {
    double s;
    int integer_order;                  /* s is an integer n >= 2 */
    double gamma_1ms;                   /* Gamma(1 - s) when s is not an integer */
    double harmonic;                    /* H_{n-1} when s = n is an integer */
    double coef[CP_POLYLOG_TERMS];      /* zeta(s - k) / k!  (the k = n - 1 slot unused) */
} cp_polylog_plan;

/* Prepare a plan for order s in [1.5, 8] (the orders the models use: 3/2, 2, 5/2, 3, 4).
 * CP_ENUMERIC if GSL's zeta function fails. */
cp_status cp_polylog_plan_init(cp_polylog_plan *plan, double s, cp_error *err);

/* Li_s(z) for 0 <= z <= 1 with the plan's order: the defining series for z <= 1/2, the
 * expansion in mu = ln z (Robinson's form, with the Gamma(1-s)(-mu)^(s-1) or the
 * mu^(n-1)/(n-1)! [H_(n-1) - ln(-mu)] singular term) above.  Relative accuracy ~1e-15.
 * z outside [0, 1] returns NaN (internal callers guarantee the range). */
double cp_polylog_bose(const cp_polylog_plan *plan, double z);

/* One-shot Li_s(z) for 0 <= z <= 1 (builds a plan each call: a few microseconds). */
cp_status cp_polylog(double s, double z, double *value, cp_error *err);

/* ---- shared by the thermo sources --------------------------------------------------- */

#include "coldprep/thermo.h"

#define CP_THERMO_MIN_T_OVER_TF 0.002 /* below: exp(mu/k_BT) overflows a double */
#define CP_THERMO_MAX_T_OVER 1e8      /* largest T/T_F or T/T_c accepted */
#define CP_THERMO_ZETA3 1.2020569031595942 /* zeta(3), only to locate T_c before the plans */

/* The three Bose polylogarithm plans the harmonic-trap formulas use, and zeta values. */
typedef struct cp_thermo_bose_plans_t {
    cp_polylog_plan li32, li3, li4;
    double zeta32, zeta3, zeta4;
} cp_thermo_bose_plans_t;

cp_status cp_thermo_bose_plans(cp_thermo_bose_plans_t *plans, cp_error *err);

/* Validation shared by every thermo function (ctx names the calling function). */
cp_status cp_thermo_check_trap(const cp_thermo_trap *trap, const char *ctx, cp_error *err);
cp_status cp_thermo_check_temperature(double temperature, const char *ctx, cp_error *err);
cp_status cp_thermo_check_statistics(cp_statistics stat, const char *ctx, cp_error *err);

/* Thermal de Broglie wavelength h / sqrt(2 pi m k_B T), m. */
double cp_thermo_debroglie(double mass, double temperature);

/* GSL's normalised complete Fermi-Dirac integral F_{j2/2}(x) for j2 in {-1, 1, 2, 3, 4}
 * or an even j2 (integer order); CP_ENUMERIC on a GSL failure (err may be NULL). */
cp_status cp_thermo_fd(int j2, double x, double *value, cp_error *err);

/* Solve F_2(x) = y (> 0) for the log-fugacity x (Newton, relative accuracy ~1e-15). */
cp_status cp_thermo_fermi_solve(double y, double *x, cp_error *err);

/* Solve Li_3(e^mu) = y (0 < y < zeta(3)) for the log-fugacity mu <= 0 of a Bose gas above
 * T_c (Brent's method); li3 is a plan of order 3; ctx names the caller in messages. */
cp_status cp_thermo_bose_solve(const cp_polylog_plan *li3, double y, double *mu, const char *ctx,
                               cp_error *err);

/* Entropy per particle (k_B) of the trapped gas at T. */
cp_status cp_thermo_entropy(const cp_thermo_trap *trap, cp_statistics stat, double temperature,
                            double *entropy_per_particle, cp_error *err);

/* Brent's method: the root of f(x) = target on [lo, hi] (must bracket); `what` names
 * the calling function in messages. */
cp_status cp_thermo_brent(double (*f)(double, void *), void *ctx, double target, double lo,
                          double hi, double *root, const char *what, cp_error *err);

#endif

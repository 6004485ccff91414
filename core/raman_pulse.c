/*
 * Raman model: parameter validation, the pulse envelopes (Gaussian, sin^2 and sampled
 * shapes with Steffen's monotone cubic interpolation) and the closed-form estimates of
 * docs/models/raman.md evaluated on the same envelopes.
 */
#include <math.h>
#include <stdlib.h>

#include "check_int.h"
#include "raman_int.h"

#define CTX "raman transfer"

/* Gaussian envelopes are cut at x = 5, where exp(-x^2) = 1.4e-11: the pulse area left
 * outside is below 1e-11 of the total, so populations change by far less than 1e-9. */
static const double gauss_cut = 5.0;
/* Largest rate x window (rad) accepted: beyond it the propagation would take minutes. */
static const double max_phase = 1e6;

void cp_raman_params_init(cp_raman_params *p)
{
    *p = (cp_raman_params){.shape = CP_RAMAN_GAUSSIAN, .accuracy = 1e-8};
}

static cp_status check_rate(cp_error *err, const char *name, double v, double hi)
{
    return cp_check_range(err, CTX, name, v, "rad/s", 0.0, hi, CP_CLOSED);
}

static cp_status check_params(const cp_raman_params *p, cp_error *err)
{
    const double max_rate = 1e12, max_detuning = 1e12, max_lw = 1e9;
    if (p->shape != CP_RAMAN_GAUSSIAN && p->shape != CP_RAMAN_SIN2 &&
        p->shape != CP_RAMAN_SAMPLED)
        return cp_fail(err, CP_EINVAL, CTX ": shape %d is unknown; allowed gaussian (0), "
                                            "sin2 (1), sampled (2)", (int)p->shape);
    if (p->shape == CP_RAMAN_SAMPLED) {
        if (!p->times || !p->pump_samples || !p->stokes_samples)
            return cp_fail(err, CP_EINVAL, CTX ": sampled shape needs times, pump and stokes "
                                                "arrays");
        if (p->n_samples < 3 || p->n_samples > 1000000)
            return cp_fail(err, CP_EINVAL, CTX ": sampled shape has %zu samples; allowed 3 to "
                           "1000000", p->n_samples);
        for (size_t i = 0; i < p->n_samples; i++) {
            CP_TRY(cp_check_range(err, CTX, "sample time", p->times[i], "s", -1.0, 1.0,
                                  CP_CLOSED));
            if (i > 0 && !(p->times[i] > p->times[i - 1]))
                return cp_fail(err, CP_EINVAL, CTX ": sample times must increase strictly; "
                               "time[%zu] = %.6g s follows %.6g s", i + 1, p->times[i],
                               p->times[i - 1]);
            CP_TRY(check_rate(err, "pump sample", p->pump_samples[i], max_rate));
            CP_TRY(check_rate(err, "stokes sample", p->stokes_samples[i], max_rate));
        }
    } else {
        CP_TRY(check_rate(err, "rabi_pump", p->rabi_pump, max_rate));
        CP_TRY(check_rate(err, "rabi_stokes", p->rabi_stokes, max_rate));
        CP_TRY(cp_check_range(err, CTX, "width", p->width, "s", 0.0, 1.0, CP_LO_OPEN));
        CP_TRY(cp_check_range(err, CTX, "delay", p->delay, "s", -1.0, 1.0, CP_CLOSED));
    }
    CP_TRY(cp_check_range(err, CTX, "gamma", p->gamma, "1/s", 0.0, max_rate, CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX, "branching_initial", p->branching_initial, "", 0.0, 1.0,
                          CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX, "branching_target", p->branching_target, "", 0.0,
                          1.0 - p->branching_initial, CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX, "gamma_initial", p->gamma_initial, "1/s", 0.0, max_rate,
                          CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX, "gamma_target", p->gamma_target, "1/s", 0.0, max_rate,
                          CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX, "detuning", p->detuning, "rad/s", -max_detuning,
                          max_detuning, CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX, "two_photon_detuning", p->two_photon_detuning, "rad/s",
                          -max_detuning, max_detuning, CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX, "pump_linewidth_hz", p->pump_linewidth_hz, "Hz", 0.0,
                          max_lw, CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX, "stokes_linewidth_hz", p->stokes_linewidth_hz, "Hz", 0.0,
                          max_lw, CP_CLOSED));
    if (p->use_relative) {
        CP_TRY(cp_check_range(err, CTX, "relative_linewidth_hz", p->relative_linewidth_hz,
                              "Hz", 0.0, max_lw, CP_CLOSED));
        if (p->stokes_linewidth_hz != 0.0)
            return cp_fail(err, CP_EINVAL, CTX ": stokes_linewidth_hz %.6g Hz cannot be "
                           "combined with relative_linewidth_hz; allowed 0 Hz (give the "
                           "common-mode linewidth as pump_linewidth_hz)", p->stokes_linewidth_hz);
    }
    return CP_OK;
}

static double max_abs(const double *v, size_t n)
{
    double m = 0.0;
    for (size_t i = 0; i < n; i++)
        m = fmax(m, fabs(v[i]));
    return m;
}

cp_status cp_raman_pulses_init(cp_raman_pulses *pl, const cp_raman_params *p, cp_error *err)
{
    *pl = (cp_raman_pulses){.p = p};
    CP_TRY(check_params(p, err));
    double rabi_max;
    if (p->shape == CP_RAMAN_SAMPLED) {
        size_t n = p->n_samples;
        pl->t_start = p->times[0];
        pl->t_end = p->times[n - 1];
        pl->loss_from = pl->t_start;
        pl->loss_to = pl->t_end;
        pl->pump = gsl_interp_alloc(gsl_interp_steffen, n);
        pl->stokes = gsl_interp_alloc(gsl_interp_steffen, n);
        pl->pump_acc = gsl_interp_accel_alloc();
        pl->stokes_acc = gsl_interp_accel_alloc();
        if (!pl->pump || !pl->stokes || !pl->pump_acc || !pl->stokes_acc) {
            cp_raman_pulses_free(pl);
            return cp_fail(err, CP_ENOMEM, CTX ": out of memory for %zu samples", n);
        }
        if (gsl_interp_init(pl->pump, p->times, p->pump_samples, n) != GSL_SUCCESS ||
            gsl_interp_init(pl->stokes, p->times, p->stokes_samples, n) != GSL_SUCCESS) {
            cp_raman_pulses_free(pl);
            return cp_fail(err, CP_ENUMERIC, CTX ": interpolation of the samples failed");
        }
        rabi_max = fmax(max_abs(p->pump_samples, n), max_abs(p->stokes_samples, n));
    } else {
        double half = p->shape == CP_RAMAN_GAUSSIAN ? gauss_cut * p->width : p->width;
        double a = fabs(p->delay) / 2;
        pl->half = half;
        pl->t_start = -a - half;
        pl->t_end = a + half;
        /* the transfer duration: from the first pulse's rise to the last pulse's fall
         * through 1/e of its peak (Gaussian) or over the pulses' support (sin2) */
        pl->loss_from = -a - p->width;
        pl->loss_to = a + p->width;
        /* the support edges and, with slow losses, the ends of the transfer duration (where
         * they switch), sorted: the integrator then never steps across a switch */
        double e[6] = {-a - half, -a + half, a - half, a + half, -a - p->width, a + p->width};
        size_t n = p->gamma_initial > 0.0 || p->gamma_target > 0.0 ? 6 : 4;
        for (size_t i = 1; i < n; i++)
            for (size_t j = i; j > 0 && e[j - 1] > e[j]; j--) {
                double x = e[j];
                e[j] = e[j - 1];
                e[j - 1] = x;
            }
        for (size_t i = 0; i < n; i++)
            pl->edges[i] = e[i];
        pl->n_edges = n;
        rabi_max = fmax(p->rabi_pump, p->rabi_stokes);
    }
    double kappa = 2 * M_PI * (p->pump_linewidth_hz + p->stokes_linewidth_hz +
                               (p->use_relative ? p->relative_linewidth_hz : 0.0));
    double rate = rabi_max + fabs(p->detuning) + fabs(p->two_photon_detuning) + p->gamma +
                  p->gamma_initial + p->gamma_target + kappa;
    double phase = rate * (pl->t_end - pl->t_start);
    pl->phase = phase;
    pl->other_rate = rate - fabs(p->detuning);
    /* the work grows with the phase the propagator resolves: every rate for the explicit
     * pair, the rates other than |Delta| for the collocation method away from resonance */
    int implicit = fabs(p->detuning) > CP_RAMAN_IMPLICIT_RATIO * pl->other_rate;
    /* a sampled shape breaks the window at every sample, so the collocation method takes at
     * least one step per sample, each 2.2 times the instructions of an explicit step, while
     * the explicit pair takes about 0.75 steps per radian of the phase on smooth samples
     * (measured from 1201 to 100001 samples, Delta/2pi = 16 to 480 MHz; more on noisy ones,
     * where the collocation method too takes more: docs/models/raman.md): densely sampled
     * pulses stay with the explicit pair, unless the phase it would resolve is beyond the
     * limit.  The choice moves the cost only, not the accuracy. */
    if (implicit && p->shape == CP_RAMAN_SAMPLED && 0.75 * phase < 3.0 * (double)p->n_samples &&
        phase <= max_phase)
        implicit = 0;
    pl->implicit = implicit;
    double resolved = implicit ? pl->other_rate * (pl->t_end - pl->t_start) : phase;
    if (!(resolved <= max_phase)) {
        cp_raman_pulses_free(pl);
        return cp_fail(err, CP_EINVAL, CTX ": sum of the rates x sequence duration = %.3g rad is "
                       "out of range; allowed up to %.3g rad (shorten the pulses or reduce "
                       "the Rabi frequencies, %sor rates)", resolved, max_phase,
                       implicit ? "" : "detunings ");
    }
    return CP_OK;
}

size_t cp_raman_pulses_breaks(const cp_raman_pulses *pl)
{
    return pl->p->shape == CP_RAMAN_SAMPLED ? pl->p->n_samples : pl->n_edges;
}

double cp_raman_pulses_break(const cp_raman_pulses *pl, size_t i)
{
    size_t n = cp_raman_pulses_breaks(pl);
    const double *b = pl->p->shape == CP_RAMAN_SAMPLED ? pl->p->times : pl->edges;
    /* the reversed sequence runs over -t: its break points are the mirrored ones */
    return pl->reversed ? -b[n - 1 - i] : b[i];
}

double cp_raman_pulses_hmax(const cp_raman_pulses *pl, double ta, double tb)
{
    if (pl->p->shape == CP_RAMAN_SAMPLED)
        return tb - ta;
    double mid = 0.5 * (ta + tb) * (pl->reversed ? -1.0 : 1.0), a = fabs(pl->p->delay) / 2;
    int in_pulse = fabs(mid - a) < pl->half || fabs(mid + a) < pl->half;
    return in_pulse ? fmin(tb - ta, pl->p->width / 2) : tb - ta;
}

double cp_raman_pulses_hstart(const cp_raman_pulses *pl)
{
    if (pl->p->shape != CP_RAMAN_SAMPLED)
        return pl->p->width * 1e-2;
    const double *t = pl->p->times;
    return (t[1] - t[0]) * 1e-2;
}

void cp_raman_pulses_free(cp_raman_pulses *pl)
{
    gsl_interp_free(pl->pump);
    gsl_interp_free(pl->stokes);
    gsl_interp_accel_free(pl->pump_acc);
    gsl_interp_accel_free(pl->stokes_acc);
    pl->pump = pl->stokes = NULL;
    pl->pump_acc = pl->stokes_acc = NULL;
}

/* One analytic envelope centred at tc: value and derivative. */
static void envelope(cp_raman_shape shape, double rabi, double width, double tc, double t,
                     double *v, double *dv)
{
    double x = (t - tc) / width;
    if (shape == CP_RAMAN_GAUSSIAN) {
        *v = rabi * exp(-x * x);
        *dv = -2 * x / width * *v;
    } else if (fabs(x) < 1.0) {
        double c = cos(M_PI_2 * x);
        *v = rabi * c * c;
        *dv = -rabi * sin(M_PI * x) * M_PI_2 / width;
    } else {
        *v = *dv = 0.0;
    }
}

/* A sampled envelope at t and, if dv is non-NULL, its derivative.  The look-up cache acc
 * finds the sample interval in constant time while t moves forward or backward by little. */
static void sampled(const gsl_interp *ip, gsl_interp_accel *acc, const double *t_s,
                    const double *v_s, double t, double *v, double *dv)
{
    size_t n = ip->size;
    if (t < t_s[0] || t > t_s[n - 1]) {
        *v = 0.0;
        if (dv)
            *dv = 0.0;
        return;
    }
    /* Steffen interpolation never overshoots: values stay between neighbouring samples,
     * so they are >= 0; the GSL status cannot fail inside the range checked above. */
    *v = gsl_interp_eval(ip, t_s, v_s, t, acc);
    if (dv)
        *dv = gsl_interp_eval_deriv(ip, t_s, v_s, t, acc);
}

void cp_raman_pulses_eval(const cp_raman_pulses *pl, double t, double *op, double *os,
                          double *dop, double *dos)
{
    const cp_raman_params *p = pl->p;
    double sign = pl->reversed ? -1.0 : 1.0, tt = sign * t, dp = 0.0, ds = 0.0;
    if (p->shape == CP_RAMAN_SAMPLED) {
        /* the derivatives only when asked for (the propagators need values only) */
        sampled(pl->pump, pl->pump_acc, p->times, p->pump_samples, tt, op, dop ? &dp : NULL);
        sampled(pl->stokes, pl->stokes_acc, p->times, p->stokes_samples, tt, os,
                dos ? &ds : NULL);
    } else {
        envelope(p->shape, p->rabi_pump, p->width, p->delay / 2, tt, op, &dp);
        envelope(p->shape, p->rabi_stokes, p->width, -p->delay / 2, tt, os, &ds);
    }
    if (dop)
        *dop = sign * dp;
    if (dos)
        *dos = sign * ds;
}

void cp_raman_pulses_half(const cp_raman_pulses *pl, double t, double *a, double *b)
{
    double op, os;
    cp_raman_pulses_eval(pl, t, &op, &os, NULL, NULL);
    *a = op / 2;
    *b = os / 2;
}

int cp_raman_pulses_slow_on(const cp_raman_pulses *pl, double t)
{
    double u = pl->reversed ? -t : t;
    return u >= pl->loss_from && u <= pl->loss_to;
}

void cp_raman_estimates(const cp_raman_pulses *pl, cp_raman_result *res)
{
    enum { M = 401 };
    const cp_raman_params *p = pl->p;
    double t0 = pl->t_start, h = (pl->t_end - t0) / (M - 1);
    double kappa13 = M_PI * (p->use_relative ? p->relative_linewidth_hz
                                             : p->pump_linewidth_hz + p->stokes_linewidth_hz);
    double prod_int = 0, prod_max = 0, rms_max = 0, decay = 0, mix = 0;
    for (int k = 0; k < M; k++) {
        double w = (k == 0 || k == M - 1) ? 0.5 * h : h; /* trapezoid weights */
        double op, os, dop, dos;
        cp_raman_pulses_eval(pl, t0 + k * h, &op, &os, &dop, &dos);
        double r2 = op * op + os * os;
        prod_int += w * op * os;
        prod_max = fmax(prod_max, op * os);
        rms_max = fmax(rms_max, sqrt(r2));
        if (r2 <= 0)
            continue;
        double thetadot = (os * dop - op * dos) / r2; /* tan(theta) = Op / Os */
        double sin2theta = 2 * op * os / r2;
        mix += w * sin2theta * sin2theta;
        /* adiabatic elimination of the bright states (docs/models/raman.md): only where it is
         * valid, Omega_rms^2 / gamma >> |thetadot| (here by a factor 10) */
        if (r2 >= 10 * p->gamma * fabs(thetadot))
            decay += w * 4 * p->gamma * thetadot * thetadot / r2;
    }
    res->overlap_time = prod_max > 0 ? prod_int / prod_max : 0.0;
    res->adiabaticity = rms_max * res->overlap_time;
    res->decay_loss_estimate = -expm1(-decay);
    /* the dark state cos(theta)|1> - sin(theta)|3> leaves at 2 kappa_13 cos^2 sin^2 */
    res->dephasing_loss_estimate = 0.5 * kappa13 * mix;
    cp_raman_ddp(p, &res->nonadiabatic_loss_estimate, &res->nonadiabatic_exponent);
    /* decay_loss and dephasing_loss are derived on resonance: flag a two-photon detuning
     * that dephases the dark state over the overlap (|delta| T_overlap > 0.5) or a one-photon
     * detuning beyond both the linewidth and the Rabi frequency (common practice, no source;
     * the measured errors are in docs/models/raman.md) */
    res->flags = 0;
    if (fabs(p->two_photon_detuning) * res->overlap_time > 0.5 ||
        fabs(p->detuning) > fmax(p->gamma, rms_max))
        res->flags |= CP_RAMAN_FLAG_ESTIMATES_DETUNED;
}

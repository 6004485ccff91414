/*
 * coldprep — two-photon Raman transfer (STIRAP) in a Lambda system |1> - |2> - |3>.
 *
 * The density matrix of the three levels plus a sink is propagated through the Lindblad
 * master equation of docs/models/raman.md: RWA Hamiltonian H/hbar = [[0, Op/2, 0],
 * [Op/2, -Delta, Os/2], [0, Os/2, -delta]], decay of |2> at gamma (a fraction back into |1>
 * and |3>, the rest lost), slow loss of |1> and |3>, and laser phase noise as dephasing.
 * All rates and Rabi frequencies are angular (rad/s); laser linewidths are Lorentzian FWHM
 * in Hz.  Every function is thread-safe; the caller owns every array it passes in.
 */
#ifndef COLDPREP_RAMAN_H
#define COLDPREP_RAMAN_H

#include <stddef.h>

#include "coldprep/status.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef enum cp_raman_shape {
    CP_RAMAN_GAUSSIAN = 0, /* O(t) = rabi exp(-(t - tc)^2 / width^2) */
    CP_RAMAN_SIN2 = 1,     /* O(t) = rabi cos^2(pi (t - tc) / (2 width)) for |t - tc| < width */
    CP_RAMAN_SAMPLED = 2   /* user samples, Steffen (monotone cubic) interpolation, 0 outside */
} cp_raman_shape;

/* Pulse timing (Gaussian and sin2): the Stokes pulse is centred at tc = -delay/2, the pump
 * at tc = +delay/2 (counter-intuitive order for delay > 0). */
typedef struct cp_raman_params {
    cp_raman_shape shape;
    double rabi_pump;   /* peak pump Rabi frequency, rad/s, >= 0 (Gaussian, sin2) */
    double rabi_stokes; /* peak Stokes Rabi frequency, rad/s, >= 0 (Gaussian, sin2) */
    double width;       /* s, > 0 (Gaussian, sin2) */
    double delay;       /* s, any sign (Gaussian, sin2) */
    /* sampled shape: n_samples >= 3 strictly increasing times (s) and Rabi frequencies
     * (rad/s, >= 0) of the pump and the Stokes laser at those times */
    size_t n_samples;
    const double *times;
    const double *pump_samples;
    const double *stokes_samples;

    double gamma;                /* decay rate of |2>, 1/s, >= 0 */
    double branching_initial;    /* fraction of that decay into |1>, [0, 1] */
    double branching_target;     /* fraction into |3>, [0, 1 - branching_initial] */
    double gamma_initial;        /* slow loss rate of |1> (trap lifetime), 1/s, >= 0; acts
                                    over the transfer duration only (see the result) */
    double gamma_target;         /* slow loss rate of |3>, 1/s, >= 0; likewise */
    double detuning;             /* one-photon detuning Delta, rad/s */
    double two_photon_detuning;  /* delta, rad/s */
    double pump_linewidth_hz;    /* FWHM, Hz, >= 0 */
    double stokes_linewidth_hz;  /* FWHM, Hz, >= 0; must be 0 when use_relative */
    int use_relative;            /* nonzero: lasers share a reference (see below) */
    double relative_linewidth_hz; /* FWHM of the pump-Stokes beat note, Hz, >= 0 */

    /* Absolute accuracy asked of the final populations (1e-12 to 1e-3; 0 means the default
     * 1e-8): the error control of the propagator is set from it. */
    double accuracy;
    /* Nonzero: also compute the closed-form estimates of the result (adiabaticity,
     * overlap_time, *_loss_estimate, nonadiabatic_exponent); otherwise they are NaN. */
    int estimates;
} cp_raman_params;

/* Fill p with the defaults: Gaussian, everything zero, no relative linewidth, accuracy
 * 1e-8, no estimates. */
void cp_raman_params_init(cp_raman_params *p);

/* Validity flags of a result (bits of cp_raman_result.flags; set only with the estimates). */
enum {
    /* decay_loss_estimate and dephasing_loss_estimate are outside their range (derived for
     * Delta = delta = 0): |delta| overlap_time > 0.5 or |Delta| > max(gamma, max Omega_rms) */
    CP_RAMAN_FLAG_ESTIMATES_DETUNED = 1u
};

/* Final state and, if asked for (params.estimates), the closed-form estimates
 * (docs/models/raman.md). */
typedef struct cp_raman_result {
    double efficiency;        /* population of |3> at the end (one way) */
    double populations[3];    /* rho_11, rho_22, rho_33 at the end */
    double lost;              /* population in the sink (integrated, not 1 - trace) */
    double rho[3][3][2];      /* final density matrix, [i][j][0] real, [1] imaginary part */
    double round_trip_efficiency; /* |1> population after the reversed sequence, or NaN */
    double t_start, t_end;    /* integration window, s */
    double transfer_duration; /* s: the time the slow losses gamma_initial, gamma_target act,
                                 from -|delay|/2 - width to |delay|/2 + width (Gaussian: the
                                 pulses above 1/e of their peaks; sin2: their support;
                                 sampled: the sample span) */
    unsigned flags;           /* CP_RAMAN_FLAG_* bits: estimates used outside their range */
    double adiabaticity;      /* max_t Omega_rms(t) * T_overlap, dimensionless */
    double overlap_time;      /* T_overlap = int Op Os dt / max(Op Os), s */
    double decay_loss_estimate;    /* 1 - exp(-int 4 gamma thetadot^2 / Omega_rms^2 dt) */
    double dephasing_loss_estimate; /* (kappa_13 / 2) int sin^2(2 theta) dt */
    /* Dykhne-Davis-Pechukas estimate of the non-adiabatic loss of resonant lossless STIRAP,
     * 4p(1 - p) with p = exp(-nonadiabatic_exponent) (1 for p > 1/2), nonadiabatic_exponent
     * = 2 Im D(t_c) (docs/models/raman.md); NaN unless Gaussian, delay >= width, both Rabi
     * frequencies > 0 and Delta = delta = 0 */
    double nonadiabatic_loss_estimate;
    double nonadiabatic_exponent;
    size_t steps;             /* accepted integrator steps (one way) */
    const char *integrator;   /* "dopri5" or, away from resonance, "gauss-legendre" (static
                                 string) */
} cp_raman_result;

/* Columns of a time trace: time (s), populations, sink, and the coherences rho_ij. */
enum {
    CP_RAMAN_TRACE_TIME,
    CP_RAMAN_TRACE_INITIAL, /* rho_11 */
    CP_RAMAN_TRACE_EXCITED, /* rho_22 */
    CP_RAMAN_TRACE_TARGET,  /* rho_33 */
    CP_RAMAN_TRACE_LOST,    /* sink population */
    CP_RAMAN_TRACE_RE12, CP_RAMAN_TRACE_IM12,
    CP_RAMAN_TRACE_RE13, CP_RAMAN_TRACE_IM13,
    CP_RAMAN_TRACE_RE23, CP_RAMAN_TRACE_IM23,
    CP_RAMAN_TRACE_COLUMNS
};

/* Optional time trace: n >= 2 equally spaced samples over [t_start, t_end] of the forward
 * sequence; each non-NULL column must hold n doubles (caller-owned). */
typedef struct cp_raman_trace {
    size_t n;
    double *column[CP_RAMAN_TRACE_COLUMNS];
} cp_raman_trace;

/* Propagate the forward sequence from rho = |1><1| (and, if round_trip, the time-reversed
 * sequence after it).  trace may be NULL.  Returns CP_EINVAL for bad parameters (message
 * names the parameter), CP_ENOMEM, or CP_ENUMERIC if the integrator fails; outputs are NaN
 * on error. */
cp_status cp_raman_transfer(const cp_raman_params *p, int round_trip, cp_raman_result *res,
                            cp_raman_trace *trace, cp_error *err);

typedef enum cp_raman_scan_variable {
    CP_RAMAN_SCAN_TWO_PHOTON = 0, /* scan delta */
    CP_RAMAN_SCAN_ONE_PHOTON = 1  /* scan Delta */
} cp_raman_scan_variable;

/* Line shape: the transfer at each of n values (rad/s) of the scanned detuning, the other
 * parameters from p, computed on nthreads threads (1..64).  efficiency and lost (each n
 * doubles, lost may be NULL) receive the one-way efficiency and lost population. */
cp_status cp_raman_scan(const cp_raman_params *p, cp_raman_scan_variable variable,
                        const double *values, size_t n, int nthreads, double *efficiency,
                        double *lost, cp_error *err);

/* cp_raman_scan, polling *cancel (may be NULL) before every point: once it is non-zero the
 * outputs are poisoned and CP_ECANCELED is returned. */
cp_status cp_raman_scan_cancellable(const cp_raman_params *p, cp_raman_scan_variable variable,
                                    const double *values, size_t n, int nthreads,
                                    double *efficiency, double *lost,
                                    const cp_cancel_flag *cancel, cp_error *err);

/* cp_raman_scan_cancellable with a work estimate: the first, middle and last points are
 * computed first, and when n times the dearest of them (its integrator steps times the
 * cost of a step, plus the cost of a point) exceeds max_seconds of CPU (> 0; +inf: no
 * limit) nothing more is computed: the outputs are poisoned and CP_ETOOLONG is returned,
 * the message giving the estimate and the number of points that would fit. */
cp_status cp_raman_scan_bounded(const cp_raman_params *p, cp_raman_scan_variable variable,
                                const double *values, size_t n, int nthreads, double *efficiency,
                                double *lost, const cp_cancel_flag *cancel, double max_seconds,
                                cp_error *err);

#ifdef __cplusplus
}
#endif
#endif

/*
 * Private to the Raman model: the pulse envelopes (analytic or interpolated samples),
 * shared by the propagator (raman.c), the estimates and the scan.  Not installed.
 */
#ifndef COLDPREP_RAMAN_INT_H
#define COLDPREP_RAMAN_INT_H

#include <gsl/gsl_errno.h>
#include <gsl/gsl_interp.h>

#include "coldprep/raman.h"

/* The two envelopes of one sequence; reversed != 0 evaluates them at -t (the return
 * trip).  For sampled shapes the interpolants and their look-up caches are owned here: the
 * caches change at every evaluation, so one cp_raman_pulses serves one transfer on one
 * thread (each transfer sets up its own). */
typedef struct cp_raman_pulses {
    const cp_raman_params *p;
    gsl_interp *pump, *stokes; /* sampled shape only */
    gsl_interp_accel *pump_acc, *stokes_acc; /* their look-up caches (this transfer's) */
    int reversed;
    double t_start, t_end;     /* window outside which both envelopes are negligible */
    double phase;              /* sum of the rates x (t_end - t_start), rad */
    double other_rate;         /* sum of all rates except |Delta|, 1/s */
    double half;               /* half-length of an analytic pulse's support, s */
    double edges[6];           /* sorted support edges of the two analytic pulses and, with
                                  slow losses, the ends of the transfer duration, s */
    size_t n_edges;            /* 4, or 6 with slow losses */
    double loss_from, loss_to; /* the transfer duration, in which the slow losses act, s */
    int implicit;              /* 1: the collocation method propagates (cp_raman_pulses_init) */
} cp_raman_pulses;

/* Away from resonance, |Delta| above this times the sum of the other rates, the collocation
 * method of raman_gauss.c propagates (raman.c); its work does not grow with |Delta|.  For
 * sampled shapes only while the explicit pair would cost more (cp_raman_pulses_init). */
#define CP_RAMAN_IMPLICIT_RATIO 1.25

/* Validate p (context "raman transfer") and set up the pulses; on success the caller must
 * call cp_raman_pulses_free. */
cp_status cp_raman_pulses_init(cp_raman_pulses *pl, const cp_raman_params *p, cp_error *err);
void cp_raman_pulses_free(cp_raman_pulses *pl);

/* Rabi frequencies (rad/s) at time t and, if dop/dos are non-NULL, their time derivatives. */
void cp_raman_pulses_eval(const cp_raman_pulses *pl, double t, double *op, double *os,
                          double *dop, double *dos);

/* Half the Rabi frequencies at time t (rad/s): the a = Omega_P/2, b = Omega_S/2 of the
 * generator. */
void cp_raman_pulses_half(const cp_raman_pulses *pl, double t, double *a, double *b);

/* 1 while the slow losses of |1> and |3> act at time t (inside [loss_from, loss_to], mirrored
 * for the reversed sequence), else 0. */
int cp_raman_pulses_slow_on(const cp_raman_pulses *pl, double t);

/* Break points of the window, ascending (for the reversed sequence too): count, the i-th,
 * the largest step allowed between two neighbouring ones, and a first step size. */
size_t cp_raman_pulses_breaks(const cp_raman_pulses *pl);
double cp_raman_pulses_break(const cp_raman_pulses *pl, size_t i);
double cp_raman_pulses_hmax(const cp_raman_pulses *pl, double ta, double tb);
double cp_raman_pulses_hstart(const cp_raman_pulses *pl);

/* Fill the estimate fields of res (adiabaticity, overlap time, decay, dephasing and
 * non-adiabatic loss). */
void cp_raman_estimates(const cp_raman_pulses *pl, cp_raman_result *res);

/* Dykhne-Davis-Pechukas estimate of the non-adiabatic loss 1 - P3 of resonant lossless
 * STIRAP and its exponent 2 Im D(t_c) (raman_ddp.c); both NaN where it is not defined
 * (shapes other than Gaussian, delay < width, a zero Rabi frequency, Delta or delta != 0). */
void cp_raman_ddp(const cp_raman_params *p, double *loss, double *exponent);

#endif

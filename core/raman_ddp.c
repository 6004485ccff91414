/*
 * Raman model: the Dykhne-Davis-Pechukas (DDP) estimate of the non-adiabatic loss of
 * resonant, lossless STIRAP with Gaussian pulses of equal width.
 *
 * For Delta = delta = gamma = 0 the Lambda system is exactly a spin 1/2 with
 * H = (Omega_S sigma_x - Omega_P sigma_z)/4 (the SU(2)-SO(3) correspondence; the Bloch vector
 * of the spin is (c1, -i c2, c3), so P3 = <sigma_z>^2; mapping derived by hand, also used by
 * the unit tests).  Its two adiabatic states are split by Omega_rms/2 — the same gap as the
 * dark state to the bright states of the Lambda system — and start aligned with the field
 * when the Stokes pulse comes first.  A non-adiabatic transition of probability p in the
 * spin leaves <sigma_z> = -(1 - 2p) at the end, hence 1 - P3 = 4p(1 - p).  The DDP formula
 * (A. M. Dykhne, Sov. Phys. JETP 14, 941 (1962); J. P. Davis & P. Pechukas, J. Chem. Phys.
 * 64, 3129 (1976) [M]) gives, for a single simple zero t_c of the squared gap in the upper
 * half plane, p = exp(-2 Im D(t_c)), D(t) = int_{t_r}^{t} Omega_rms(t')/2 dt' from a real
 * point t_r.  (Its use for STIRAP: N. V. Vitanov et al., Adv. At. Mol. Opt. Phys. 46, 55
 * (2001) [M].)
 *
 * Gaussians Omega_P0 exp(-(t - tau/2)^2/T^2) and Omega_S0 exp(-(t + tau/2)^2/T^2) give
 * Omega_rms^2 = 2 Omega_P0 Omega_S0 exp(-2(t^2 + tau^2/4)/T^2) cosh(2 t tau/T^2 + ln r),
 * r = Omega_P0/Omega_S0, whose zeros nearest the real axis are t_c = t_r + i s_c with
 * t_r = -T^2 ln(r)/(2 tau) and s_c = pi T^2/(4 tau) (the next ones are 3 s_c up).  On the
 * vertical path t = t_r + i s the cosh is cos(2 s tau/T^2) and
 *   Im D(t_c) = sqrt(2 Omega_P0 Omega_S0) T/2 exp(-(b^2 + a^2/4))
 *               int_0^{u_c} exp(u^2) cos(2 b u) sqrt(cos(2 a u)) du,
 * with a = tau/T, b = t_r/T, u = s/T, u_c = pi/(4a) (derived by hand).  The substitution
 * u = u_c (1 - v^2) removes the square-root zero at u_c, leaving a smooth integrand for GSL's
 * non-adaptive Gauss-Kronrod rule (qng: no workspace, so this stays allocation-free).
 */
#include <math.h>

#include <gsl/gsl_integration.h>

#include "raman_int.h"

typedef struct path {
    double a, b, uc;
} path;

/* The integrand in v: du/dv (up to its sign) times the Re of Omega_rms/2 on the path,
 * without the constant factor. */
static double integrand(double v, void *vp)
{
    const path *q = vp;
    double u = q->uc * (1 - v * v);
    /* cos(2 a u) = sin(pi v^2 / 2) because 2 a u_c = pi/2 */
    return 2 * q->uc * v * exp(u * u) * cos(2 * q->b * u) * sqrt(sin(M_PI_2 * v * v));
}

void cp_raman_ddp(const cp_raman_params *p, double *loss, double *exponent)
{
    *loss = *exponent = NAN;
    /* defined for resonant Gaussian pulses, Stokes first by at least a width (for shorter
     * delays the wings of the pulses dominate the loss by orders of magnitude: the DDP
     * number would mislead), both present */
    if (p->shape != CP_RAMAN_GAUSSIAN || !(p->delay >= p->width) || !(p->rabi_pump > 0) ||
        !(p->rabi_stokes > 0) || p->detuning != 0 || p->two_photon_detuning != 0)
        return;
    double T = p->width, a = p->delay / T;
    double b = -log(p->rabi_pump / p->rabi_stokes) / (2 * a);
    path q = {a, b, M_PI / (4 * a)};
    gsl_function f = {integrand, &q};
    double integral, abserr;
    size_t neval;
    if (gsl_integration_qng(&f, 0.0, 1.0, 0.0, 1e-10, &integral, &abserr, &neval) !=
        GSL_SUCCESS)
        return;
    double im_d = sqrt(2 * p->rabi_pump * p->rabi_stokes) * T / 2 * exp(-(b * b + a * a / 4)) *
                  integral;
    /* very unequal peaks make the path integral change sign: no transition point to use */
    if (!(im_d > 0))
        return;
    double pr = exp(-2 * im_d);
    *exponent = 2 * im_d;
    /* p > 1/2 is outside the asymptotic regime (no adiabatic following at all): the loss
     * estimate saturates at 1, where 4p(1 - p) peaks, instead of falling back to 0 */
    *loss = pr < 0.5 ? 4 * pr * (1 - pr) : 1.0;
}

/*
 * The Raman reference case the speed figures are quoted for (docs/performance.md):
 * Gaussian pulses, Omega_p = Omega_s = 2 pi x 5 MHz, width 2 us, delay 2.4 us,
 * Gamma = 2 pi x 6 MHz, Delta = delta = 0, 1 kHz laser linewidths.  Shared by the
 * benchmarks that time it so that they time the same problem.
 */
#ifndef COLDPREP_BENCH_RAMAN_REFERENCE_H
#define COLDPREP_BENCH_RAMAN_REFERENCE_H

#include <math.h>

#include "coldprep/raman.h"

static inline cp_raman_params raman_reference_case(void)
{
    cp_raman_params p;
    cp_raman_params_init(&p);
    p.rabi_pump = p.rabi_stokes = 2 * M_PI * 5e6;
    p.width = 2e-6;
    p.delay = 2.4e-6;
    p.gamma = 2 * M_PI * 6e6;
    p.pump_linewidth_hz = p.stokes_linewidth_hz = 1e3;
    return p;
}

#endif

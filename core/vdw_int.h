/*
 * Private: the van der Waals length scale of a -C6/r^6 potential, shared by the Feshbach
 * model (the atom pair's abar) and the collision model (the molecule pair's abar), so the
 * formula and its constant live in one place.  Not installed.
 */
#ifndef COLDPREP_VDW_INT_H
#define COLDPREP_VDW_INT_H

#include <math.h>

#include "coldprep/consts.h"

/* 2 pi / Gamma(1/4)^2 (Gribakin & Flambaum, PRA 48, 546 (1993)); value [C] in
 * docs/models/feshbach.md, checked against GSL's gamma function in tests/unit/test_feshbach.c. */
#define CP_ABAR_PREFACTOR 0.477988797486125

/* Mean scattering length abar = [2 pi / Gamma(1/4)^2] (2 mu C6 / hbar^2)^(1/4), m, for
 * c6_au in atomic units (E_h a0^6) and the reduced mass mu in kg; inputs already validated
 * by the caller. */
static inline double cp_vdw_mean_scattering_length(double c6_au, double mu)
{
    return CP_ABAR_PREFACTOR * pow(2.0 * mu * c6_au * CP_AU_C6 / (CP_HBAR * CP_HBAR), 0.25);
}

#endif

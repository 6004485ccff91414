/*
 * coldprep — physical constants, CODATA 2018 (E. Tiesinga et al., Rev. Mod. Phys. 93,
 * 025010 (2021)); exact values are those fixed by the 2019 SI redefinition.
 *
 * The project defines its own constants on purpose: GSL's gsl_const_mksa.h carries older
 * CODATA editions (its k_B differs from CODATA 2018 by 1.0e-6, its h by 1.8e-7).
 * All values are SI.
 */
#ifndef COLDPREP_CONSTS_H
#define COLDPREP_CONSTS_H

#define CP_PI 3.14159265358979323846

#define CP_H 6.62607015e-34             /* Planck constant, J s (exact) */
#define CP_HBAR 1.054571817646156e-34   /* h / 2 pi, J s */
#define CP_KB 1.380649e-23              /* Boltzmann constant, J/K (exact) */
#define CP_C 299792458.0                /* speed of light, m/s (exact) */
#define CP_E 1.602176634e-19            /* elementary charge, C (exact) */
#define CP_AMU 1.66053906660e-27        /* atomic mass constant, kg */
#define CP_A0 5.29177210903e-11         /* Bohr radius, m */
#define CP_EPS0 8.8541878128e-12        /* vacuum permittivity, F/m */
#define CP_MUB 9.2740100783e-24         /* Bohr magneton, J/T */
#define CP_ME 9.1093837015e-31          /* electron mass, kg */
#define CP_EH 4.3597447222071e-18       /* Hartree energy, J */
#define CP_DEBYE 3.33564095198152e-30   /* 1 D = 1e-21 / c  C m */
#define CP_G 9.80665                    /* standard gravity, m/s^2 (conventional) */

/* Derived atomic units. */
#define CP_AU_DIPOLE (CP_E * CP_A0)                                   /* e a0, C m */
#define CP_AU_POLARIZABILITY (4.0 * CP_PI * CP_EPS0 * CP_A0 * CP_A0 * CP_A0) /* C m^2/V */
#define CP_AU_C6 (CP_EH * CP_A0 * CP_A0 * CP_A0 * CP_A0 * CP_A0 * CP_A0)     /* J m^6 */

#endif

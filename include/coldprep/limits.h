/*
 * coldprep — the input limits shared by every model and binding, so that one value is
 * accepted or refused alike everywhere.  Outside them the formulas return meaningless
 * numbers or describe no laboratory gas.
 */
#ifndef COLDPREP_LIMITS_H
#define COLDPREP_LIMITS_H

/* Temperature of a trapped gas (K): from 1 pK (the coldest gases made are a few tens of
 * pK, e.g. Deppner et al., PRL 127, 100401 (2021)) to 10 mK (above it the gas is no longer
 * held by an optical trap; common practice, no source). */
#define CP_MIN_TEMPERATURE 1e-12
#define CP_MAX_TEMPERATURE 1e-2

/* Angular trap frequency (rad/s), of an envelope trap or a lattice site: from 1e-2 rad/s
 * (no trap is that weak) to 1e7 rad/s (2 pi x 1.6 MHz, above the deepest optical lattice
 * sites in use; common practice, no source). */
#define CP_MIN_TRAP_OMEGA 1e-2
#define CP_MAX_TRAP_OMEGA 1e7

#endif

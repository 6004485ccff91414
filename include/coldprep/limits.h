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

/* Laser power of one trap or lattice beam (W): from 1 uW (below it no optical trap holds an
 * ultracold gas; common practice, no source) to 10 kW. */
#define CP_MIN_BEAM_POWER 1e-6
#define CP_MAX_BEAM_POWER 1e4

/* A van der Waals C6 coefficient (atomic units, E_h a0^6): from 1 (below the lightest
 * pairs, H-H is 6.5 a.u.; common practice, no source) upwards; smaller values make the
 * van der Waals length vanish and the barrier heights overflow. */
#define CP_MIN_C6_AU 1.0

/* The shortest time a ramp, pulse or hold is given (s): 1 ns (common practice, no source:
 * nothing in a preparation sequence is faster). */
#define CP_MIN_DURATION 1e-9

/* The CPU time (s) one call may take without the caller's opt-in: calls whose work estimate
 * (steps x points x the cost of one, measured on a 2020s desktop core) exceeds it are
 * refused with CP_ETOOLONG before they start (Lua: unless `allow_long = true`).  One second
 * keeps an interactive session responsive and a sweep's points short (common practice, no
 * source). */
#define CP_WORK_LIMIT_S 1.0

#endif

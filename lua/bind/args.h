/*
 * Reading one table of named arguments, the calling convention of every coldprep Lua
 * function.  Each reader raises a Lua error that names the function, the key, the value,
 * its unit and what is allowed, in the spirit of luaL_check*:
 *   "lattice.depth: argument 'waist' must be a finite number (m), got nan".
 * Range checks beyond "finite number" are left to the core functions, whose cp_error
 * messages are raised unchanged by cpl_raise.  Arrays are returned in memory owned by a
 * userdata pushed on the Lua stack, so nothing leaks when an error long-jumps.
 */
#ifndef COLDPREP_ARGS_H
#define COLDPREP_ARGS_H

#include <lauxlib.h>
#include <lua.h>
#include <stddef.h>

#include "coldprep/status.h"

/* Check that argument `arg` is a table whose keys are all in `known` (NULL-terminated);
 * an unknown key is an error suggesting the closest known key. */
void cpl_check_args(lua_State *L, int arg, const char *fname, const char *const known[]);

/* Read the table at idx, the table-valued argument `what` of fname (e.g. "resonance"), in
 * one pass: every key must be in `known` (else "fname: what: unknown field 'x' (did you mean
 * 'y'?)"); the first nnum known keys must hold finite numbers (unit units[i]), stored in
 * values[i], NaN when absent; the other known keys may hold anything. */
void cpl_read_fields(lua_State *L, int idx, const char *fname, const char *what,
                     const char *const known[], int nnum, const char *const units[],
                     double values[]);

/* Required finite number. */
double cpl_number(lua_State *L, int arg, const char *fname, const char *key, const char *unit);

/* Optional finite number (dflt when absent or nil). */
double cpl_opt_number(lua_State *L, int arg, const char *fname, const char *key,
                      const char *unit, double dflt);

/* 1 if the key is present and not nil. */
int cpl_has(lua_State *L, int arg, const char *key);

/* Optional integer in [lo, hi]. */
long cpl_opt_integer(lua_State *L, int arg, const char *fname, const char *key, long dflt,
                     long lo, long hi);

/* Optional boolean. */
int cpl_opt_boolean(lua_State *L, int arg, const char *fname, const char *key, int dflt);

/* Optional string (dflt when absent); the result is valid while the table is on the stack. */
const char *cpl_opt_string(lua_State *L, int arg, const char *fname, const char *key,
                           const char *dflt);

/* String that must be one of `options` (NULL-terminated); returns its index. */
int cpl_option(lua_State *L, int arg, const char *fname, const char *key,
               const char *const options[], const char *dflt);

/* An array of finite numbers under `key`: a Lua sequence or a reals (reals.h).  The values
 * live in a userdata left on top of the stack (the reals itself, used in place, or a copy of
 * the sequence), read-only; *n receives the length (required: at least min_len). */
const double *cpl_number_array(lua_State *L, int arg, const char *fname, const char *key,
                               const char *unit, size_t min_len, size_t *n);

/* 1 if argument `key` of the table at arg is a reals: a batch function then returns its
 * arrays as reals too (cpl_push_numbers, cpl_new_reals), else as Lua tables. */
int cpl_is_reals_field(lua_State *L, int arg, const char *key);

/* Harmonic trap frequencies (rad/s) from argument `arg`: either bar_key (the geometric mean,
 * used on all three axes) or all three of axes[0..2]; giving both, or only some axes, is
 * an error, and each value must lie in the models' range [1e-2, 1e7] rad/s. */
void cpl_trap_frequencies(lua_State *L, int arg, const char *fname, const char *bar_key,
                          const char *const axes[3], double omega[3]);

/* Raise err->message as a Lua error (never returns); a refusal by work estimate
 * (CP_ETOOLONG) gets the opt-in appended: "; or pass allow_long = true ...". */
int cpl_raise(lua_State *L, const cp_error *err);

/* The work limit of a call whose argument table at `arg` may say allow_long = true:
 * CP_WORK_LIMIT_S seconds of CPU, or +inf when allowed.  The key must be among the
 * function's known keys. */
double cpl_work_limit(lua_State *L, int arg, const char *fname);

/* The cancel flag the host program registered for this state (the coldprep executable
 * registers the one its Ctrl-C handler sets), or NULL: long computations pass it to the
 * core's _cancellable functions.  The host stores a light userdata under the registry
 * key CPL_CANCEL_KEY. */
#define CPL_CANCEL_KEY "coldprep.cancel"

/* A note a computation stopped by Ctrl-C leaves for the host (a string under this registry
 * key: an optimisation's best point so far).  The coldprep executable appends it to the
 * "interrupted" error that reaches the session or script, and clears it once the
 * interruption is over. */
#define CPL_INTERRUPT_NOTE_KEY "coldprep.interrupt_note"
const cp_cancel_flag *cpl_cancel_flag(lua_State *L);

/* Raise a formatted error prefixed with "fname: " (never returns). */
int cpl_error(lua_State *L, const char *fname, const char *fmt, ...);

/* Set t[key] = value on the table at the top of the stack. */
void cpl_set_number(lua_State *L, const char *key, double value);
void cpl_set_string(lua_State *L, const char *key, const char *value);
void cpl_set_boolean(lua_State *L, const char *key, int value);
void cpl_set_integer(lua_State *L, const char *key, lua_Integer value);

/* Set t.flags on the table at the top of the stack to the list of names[i] for every bit
 * 1 << i set in `flags` (names NULL-terminated): the validity flags of a model result, an
 * empty list when every estimate is inside its range. */
void cpl_set_flags(lua_State *L, unsigned flags, const char *const names[]);

/* Push a Lua array of n numbers. */
void cpl_push_array(lua_State *L, const double *values, size_t n);

#endif

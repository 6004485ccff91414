/*
 * cp.reals: a compact array of finite doubles for batch calls.  A reals value is a Lua full
 * userdata holding its length and its numbers in one block, so a binding hands the block to a
 * C kernel as it is and writes a kernel's output straight into a new one: no table is built or
 * read per element.  Every number in a reals is finite (constructors and element assignment
 * refuse anything else), so a binding that receives one needs no per-element check.
 */
#ifndef COLDPREP_REALS_H
#define COLDPREP_REALS_H

#include <lua.h>
#include <stddef.h>

/* The metatable's name in the registry (also what tostring and type errors call it). */
#define CPL_REALS_TYPE "coldprep.reals"

/* The values and length (*n) of the reals at stack index idx, or NULL (and *n untouched)
 * when the value there is not a reals.  The block belongs to the userdata: it stays valid
 * while the userdata is reachable (e.g. on the stack). */
const double *cpl_to_reals(lua_State *L, int idx, size_t *n);

/* Push a new reals of n values and return its block, uninitialised: the caller fills every
 * value with a finite number before Lua code can see it.  Raises a Lua error when n is
 * beyond the allowed length (CPL_REALS_MAX) or memory runs out. */
double *cpl_new_reals(lua_State *L, size_t n);

/* Push a new reals holding a copy of values[0..n-1] (all finite). */
void cpl_push_reals(lua_State *L, const double *values, size_t n);

/* Push an array of n numbers: a reals when as_reals, else a Lua table (a sequence). */
void cpl_push_numbers(lua_State *L, const double *values, size_t n, int as_reals);

/* The longest reals (10^9 values, 8 GB). */
#define CPL_REALS_MAX 1000000000

/* Push the cp.reals table (constructors) and create the metatable.  Called by
 * luaopen_coldprep before any binding can return a reals. */
int cpl_open_reals(lua_State *L);

#endif

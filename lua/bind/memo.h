/*
 * A memo of numeric results kept in the Lua registry, one per Lua state: a binding whose
 * result depends only on its inputs (and is deterministic) can look them up before
 * computing and store them after.  Each `coldprep sweep` worker thread has its own Lua
 * state and so its own memo: nothing is shared between threads.  A hit returns the very
 * doubles computed the first time, so a memo never changes a result bit.
 */
#ifndef COLDPREP_MEMO_H
#define COLDPREP_MEMO_H

#include <lua.h>
#include <stddef.h>

/* Look up the nkey doubles of key (compared bit for bit); on a hit copy the nout stored
 * doubles to out and return 1, else 0.  Always 0 while the memo is disabled. */
int cpl_memo_get(lua_State *L, const double *key, size_t nkey, double *out, size_t nout);

/* Store nout doubles under key (the memo is emptied when it reaches its size limit). */
void cpl_memo_put(lua_State *L, const double *key, size_t nkey, const double *out, size_t nout);

/* Enable or disable the memo of this state (enabled by default; disabling empties it). */
void cpl_memo_enable(lua_State *L, int enabled);

/* Whether the memo of this state is enabled. */
int cpl_memo_enabled(lua_State *L);

/* Push this state's table of memo objects: the bindings' caches of C memory (full userdata
 * with a __gc metamethod) kept under a name.  Disabling the memo drops the table, and so
 * the objects are collected. */
void cpl_memo_objects(lua_State *L);

/* Number of stored results. */
lua_Integer cpl_memo_size(lua_State *L);

#endif

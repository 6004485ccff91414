/*
 * Help texts for Lua functions.  Every public function of the coldprep Lua API is
 * registered together with a text (arguments, units, an example); `help(f)` prints it.
 * Texts are kept in a weak-keyed table in the Lua registry, keyed by the function value.
 */
#ifndef COLDPREP_HELP_H
#define COLDPREP_HELP_H

#include <lua.h>

typedef struct cpl_function {
    const char *name;
    lua_CFunction func;
    const char *help;
} cpl_function;

/* Add each function of `fns` (terminated by a NULL name) to the table at the top of the
 * stack, with its help text. */
void cpl_register(lua_State *L, const cpl_function *fns);

/* Record help text for the value at stack index idx. */
void cpl_set_help(lua_State *L, int idx, const char *text);

/* Push the help-text table (creating it on first use). */
void cpl_push_help_table(lua_State *L);

#endif

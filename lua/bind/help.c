/* The help-text registry shared by the C bindings and the Lua-side library (help.h). */
#include "help.h"

#include <lauxlib.h>

static const char HELP_KEY[] = "coldprep.help";

void cpl_push_help_table(lua_State *L)
{
    if (lua_getfield(L, LUA_REGISTRYINDEX, HELP_KEY) == LUA_TTABLE)
        return;
    lua_pop(L, 1);
    lua_newtable(L);
    lua_newtable(L); /* metatable: weak keys, so help never keeps a function alive */
    lua_pushliteral(L, "k");
    lua_setfield(L, -2, "__mode");
    lua_setmetatable(L, -2);
    lua_pushvalue(L, -1);
    lua_setfield(L, LUA_REGISTRYINDEX, HELP_KEY);
}

void cpl_set_help(lua_State *L, int idx, const char *text)
{
    idx = lua_absindex(L, idx);
    cpl_push_help_table(L);
    lua_pushvalue(L, idx);
    lua_pushstring(L, text);
    lua_settable(L, -3);
    lua_pop(L, 1);
}

void cpl_register(lua_State *L, const cpl_function *fns)
{
    for (; fns->name; fns++) {
        lua_pushcfunction(L, fns->func);
        cpl_set_help(L, -1, fns->help);
        lua_setfield(L, -2, fns->name);
    }
}

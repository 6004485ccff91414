/* Lua binding: coldprep.names, the name matching of include/coldprep/names.h behind the
 * "did you mean ...?" messages of the Lua library. */
#include <lauxlib.h>
#include <lua.h>

#include "coldprep/names.h"
#include "help.h"

int cpl_open_names(lua_State *L);

static int l_edit_distance(lua_State *L)
{
    size_t d = cp_edit_distance(luaL_checkstring(L, 1), luaL_checkstring(L, 2));
    if (d == (size_t)-1)
        return luaL_error(L, "names.edit_distance: a name is longer than %d bytes",
                          CP_NAME_MAX_LEN);
    lua_pushinteger(L, (lua_Integer)d);
    return 1;
}

/* names.closest(key, list): the entry of the list of strings closest to key, or nil. */
static int l_closest(lua_State *L)
{
    enum { MAX_NAMES = 256 };
    const char *names[MAX_NAMES];
    const char *key = luaL_checkstring(L, 1);
    luaL_checktype(L, 2, LUA_TTABLE);
    lua_Integer n = luaL_len(L, 2);
    luaL_argcheck(L, n <= MAX_NAMES, 2, "at most 256 names");
    for (lua_Integer i = 1; i <= n; i++) {
        lua_rawgeti(L, 2, i); /* the string stays referenced by the table */
        names[i - 1] = luaL_checkstring(L, -1);
        lua_pop(L, 1);
    }
    const char *best = cp_closest_name(key, names, (size_t)n);
    if (best)
        lua_pushstring(L, best);
    else
        lua_pushnil(L);
    return 1;
}

static const cpl_function functions[] = {
    {"edit_distance", l_edit_distance,
     "names.edit_distance(a, b) -> integer\n"
     "Levenshtein distance of two names (single-byte insertions, deletions, substitutions).\n"
     "Example: cp.names.edit_distance(\"kitten\", \"sitting\")  --> 3"},
    {"closest", l_closest,
     "names.closest(key, list) -> string or nil\n"
     "The entry of a list of names closest to key (the first of equals), as in the library's\n"
     "\"did you mean ...?\" messages.  Example: cp.names.closest(\"duraton\", {\"duration\", "
     "\"label\"})"},
    {NULL, NULL, NULL}};

int cpl_open_names(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, functions);
    return 1;
}

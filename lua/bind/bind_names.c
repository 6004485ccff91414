/* Lua binding: coldprep.names, the name matching of include/coldprep/names.h behind the
 * "did you mean ...?" messages of the Lua library. */
#include <lauxlib.h>
#include <lua.h>

#include "coldprep/names.h"
#include "help.h"

int cpl_open_names(lua_State *L);

/* The string argument i of fname, or a house error naming it. */
static const char *name_arg(lua_State *L, int i, const char *fname)
{
    if (lua_type(L, i) != LUA_TSTRING)
        luaL_error(L, "%s: argument %d must be a name (string), got %s", fname, i,
                   luaL_typename(L, i));
    return lua_tostring(L, i);
}

static int l_edit_distance(lua_State *L)
{
    static const char fname[] = "names.edit_distance";
    size_t d = cp_edit_distance(name_arg(L, 1, fname), name_arg(L, 2, fname));
    if (d == (size_t)-1)
        return luaL_error(L, "names.edit_distance: a name is longer than %d bytes",
                          CP_NAME_MAX_LEN);
    lua_pushinteger(L, (lua_Integer)d);
    return 1;
}

/* names.closest(key, list): the entry of the list of strings closest to key, or nil when
 * none is close enough (cp_closest_name's cut-off). */
static int l_closest(lua_State *L)
{
    enum { MAX_NAMES = 256 };
    const char *names[MAX_NAMES];
    static const char fname[] = "names.closest";
    const char *key = name_arg(L, 1, fname);
    if (!lua_istable(L, 2))
        return luaL_error(L, "%s: argument 2 must be a list of names, got %s", fname,
                          luaL_typename(L, 2));
    lua_Integer n = (lua_Integer)lua_rawlen(L, 2);
    if (n > MAX_NAMES)
        return luaL_error(L, "%s: argument 2 has %lld names; allowed at most %d", fname,
                          (long long)n, MAX_NAMES);
    for (lua_Integer i = 1; i <= n; i++) {
        /* the string stays referenced by the table */
        if (lua_rawgeti(L, 2, i) != LUA_TSTRING)
            return luaL_error(L, "%s: argument 2 entry %lld must be a name (string), got %s",
                              fname, (long long)i, luaL_typename(L, -1));
        names[i - 1] = lua_tostring(L, -1);
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
     "\"did you mean ...?\" messages; nil when none is within a third of key's length\n"
     "(edits, rounded up) of it.  Example: cp.names.closest(\"duraton\", {\"duration\", "
     "\"label\"})  --> \"duration\""},
    {NULL, NULL, NULL}};

int cpl_open_names(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, functions);
    return 1;
}

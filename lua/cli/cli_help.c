/*
 * `coldprep help [NAME]`: the help() of the REPL from the shell.  NAME is a dotted path
 * such as cp.species.atom, coldprep.species.atom or species.atom (looked up in the
 * library when it is not a global); without NAME the whole library is listed.
 */
#include <lauxlib.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"

/* Protected: pushes the value at the dotted path given as a light userdata string, or
 * raises an error naming it.  The first part is looked up among the globals, else inside
 * the library (`species.atom` means cp.species.atom). */
static int resolve(lua_State *L)
{
    const char *path = lua_touserdata(L, 1);
    lua_settop(L, 0);
    lua_pushglobaltable(L);
    size_t first = strcspn(path, ".");
    lua_pushlstring(L, path, first);
    size_t at = 0; /* offset of the next part to look up in the value at index 1 */
    if (lua_rawget(L, 1) != LUA_TNIL) {
        lua_replace(L, 1);
        if (path[first] == '\0')
            return 1;
        at = first + 1;
    } else {
        lua_settop(L, 0);
        lua_getglobal(L, "cp");
    }
    for (;;) {
        size_t len = strcspn(path + at, ".");
        if (lua_type(L, 1) != LUA_TTABLE) {
            lua_pushlstring(L, path, at ? at - 1 : 0);
            return luaL_error(L, "no such name: %s (%s is not a table)", path,
                              lua_tostring(L, -1));
        }
        lua_pushlstring(L, path + at, len);
        if (lua_gettable(L, 1) == LUA_TNIL) /* not raw: modules loaded on first use */
            return luaL_error(L, "no such name: %s (help lists the library)", path);
        lua_replace(L, 1);
        if (path[at + len] == '\0')
            break;
        at += len + 1;
    }
    return 1;
}

int cpl_cmd_help(int argc, char **argv)
{
    if (argc > 2) {
        fprintf(stderr, "coldprep help: give at most one name, e.g. coldprep help cp.species.atom\n");
        return CPL_EXIT_USAGE;
    }
    lua_State *L = cpl_new_state();
    if (L == NULL)
        return CPL_EXIT_ERROR;
    int rc = CPL_EXIT_OK;
    lua_getglobal(L, "help");
    if (argc == 2) {
        lua_pushcfunction(L, resolve);
        lua_pushlightuserdata(L, argv[1]);
        if (lua_pcall(L, 1, 1, 0) != LUA_OK) {
            cpl_report(L, "coldprep help");
            lua_close(L);
            return CPL_EXIT_USAGE;
        }
    }
    int nargs = argc - 1;
    lua_getglobal(L, "cp");
    if (nargs == 1 && lua_rawequal(L, -1, -2)) { /* the library itself: list it all */
        lua_pop(L, 1);
        nargs = 0;
    }
    lua_pop(L, 1);
    if (cpl_pcall(L, nargs, 0) != LUA_OK) {
        cpl_report(L, "coldprep help");
        rc = CPL_EXIT_ERROR;
    }
    lua_close(L);
    return rc;
}

/*
 * `coldprep help [NAME]`: the help() of the REPL from the shell.  NAME is a dotted path
 * such as cp.species.atom, coldprep.species.atom or species.atom (looked up in the
 * library when it is not a global); without NAME the whole library is listed.
 */
#include <lauxlib.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"

/* Protected: pushes the value at the dotted path argv[1] (a light userdata string), or
 * raises an error naming the first missing part. */
static int resolve(lua_State *L)
{
    const char *path = lua_touserdata(L, 1);
    lua_settop(L, 0);
    const char *dot = strchr(path, '.');
    size_t first = dot ? (size_t)(dot - path) : strlen(path);
    lua_pushglobaltable(L);
    lua_pushlstring(L, path, first);
    if (lua_rawget(L, 1) == LUA_TNIL) { /* not a global: a name inside the library */
        lua_settop(L, 0);
        lua_getglobal(L, "cp");
        dot = path - 1;
    } else {
        lua_replace(L, 1);
    }
    while (dot) {
        const char *name = dot + 1;
        dot = strchr(name, '.');
        size_t len = dot ? (size_t)(dot - name) : strlen(name);
        if (lua_type(L, 1) != LUA_TTABLE)
            return luaL_error(L, "no such name: %s (%.*s is not a table)", path,
                              (int)(name - 1 - path), path);
        lua_pushlstring(L, name, len);
        if (lua_rawget(L, 1) == LUA_TNIL)
            return luaL_error(L, "no such name: %s (help lists the library)", path);
        lua_replace(L, 1);
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
    if (cpl_pcall(L, argc - 1, 0) != LUA_OK) {
        cpl_report(L, "coldprep help");
        rc = CPL_EXIT_ERROR;
    }
    lua_close(L);
    return rc;
}

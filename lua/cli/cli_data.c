/*
 * `coldprep data [NAME]`: every built-in species number with its publication, its status
 * (measured, calculated, estimated) and whether it was checked against the paper, as
 * cp.species.sources prints them; NAME keeps one atom or molecule (with its resonances).
 */
#include <lauxlib.h>
#include <stdio.h>

#include "cli.h"

int cpl_cmd_data(int argc, char **argv)
{
    if (argc > 2) {
        fprintf(stderr, "coldprep data: give at most one species name, e.g. coldprep data KRb\n");
        return CPL_EXIT_USAGE;
    }
    lua_State *L = cpl_new_state();
    if (L == NULL)
        return CPL_EXIT_ERROR;
    lua_getglobal(L, "cp");
    lua_getfield(L, -1, "species");
    lua_getfield(L, -1, "sources");
    lua_replace(L, 1);
    lua_settop(L, 1);
    if (argc == 2)
        lua_pushstring(L, argv[1]);
    else
        lua_pushnil(L);
    int rc = CPL_EXIT_OK;
    if (cpl_pcall(L, 1, 0) != LUA_OK) {
        cpl_report(L, "coldprep data");
        rc = argc == 2 ? CPL_EXIT_USAGE : CPL_EXIT_ERROR;
    }
    lua_close(L);
    return rc;
}

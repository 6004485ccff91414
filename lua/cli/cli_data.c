/*
 * `coldprep data [NAME]`: every built-in species number with its publication, its status
 * (measured, calculated, estimated) and whether it was checked against the paper, as
 * cp.species.sources prints them; NAME keeps one atom or molecule (with its resonances).
 */
#include <lauxlib.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"

static const char DATA_USAGE[] =
    "usage: coldprep data [NAME]\n\n"
    "Every built-in species number with its publication, its status (measured, calculated,\n"
    "estimated) and whether it was checked against the paper; NAME (an atom or molecule,\n"
    "e.g. KRb) keeps one species and its resonances.\n";

int cpl_cmd_data(int argc, char **argv)
{
    if (argc == 2 && (strcmp(argv[1], "-h") == 0 || strcmp(argv[1], "--help") == 0)) {
        fputs(DATA_USAGE, stdout);
        return CPL_EXIT_OK;
    }
    for (int i = 1; i < argc; i++) {
        if (argv[i][0] == '-' && argv[i][1] != '\0') {
            fprintf(stderr, "coldprep data: unknown option %s; allowed -h (--help) alone, or "
                    "one species name\nTry 'coldprep data --help'.\n", argv[i]);
            return CPL_EXIT_USAGE;
        }
    }
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

/*
 * The coldprep executable: runs plan scripts, one-liners (-e) and the interactive REPL,
 * and dispatches subcommands (see `coldprep --help`).
 */
#include <lauxlib.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "coldprep/status.h"

static const char USAGE[] =
    "usage: coldprep [options] [FILE.lua [ARGS...]]\n"
    "\n"
    "Plans the preparation of ultracold ground-state molecules: runs a plan file, a\n"
    "one-line expression, or an interactive session (no FILE and no -e).\n"
    "\n"
    "options:\n"
    "  -e CODE      run the Lua code CODE (may be given several times)\n"
    "  -i           enter the interactive session after running FILE or -e\n"
    "  -h, --help   show this text\n"
    "  -v, --version\n"
    "                print the version\n"
    "  --           stop option processing; the next word is FILE\n"
    "\n"
    "The script sees its arguments in the global table `arg` (arg[0] = FILE).\n"
    "In scripts and the session, `cp` (also `coldprep`) is the library; help() lists it.\n"
    "Exit status: 0 success, 1 error in the script, 2 usage error.\n";

static int usage_error(const char *msg, const char *what)
{
    fprintf(stderr, "coldprep: %s%s%s\n", msg, what ? " " : "", what ? what : "");
    fprintf(stderr, "Try 'coldprep --help'.\n");
    return CPL_EXIT_USAGE;
}

static int run_chunk(lua_State *L, int load_status)
{
    if (load_status == LUA_OK)
        load_status = cpl_pcall(L, 0, 0);
    if (load_status != LUA_OK) {
        cpl_report(L, NULL);
        return CPL_EXIT_ERROR;
    }
    return CPL_EXIT_OK;
}

/* arg = {[0] = script, ...} as in the stock interpreter. */
static void set_arg_table(lua_State *L, int argc, char **argv, int script)
{
    lua_createtable(L, argc - script, script + 1);
    for (int i = 0; i < argc; i++) {
        lua_pushstring(L, argv[i]);
        lua_rawseti(L, -2, i - script);
    }
    lua_setglobal(L, "arg");
}

int main(int argc, char **argv)
{
    int interactive = 0, have_code = 0, script = 0;
    for (int i = 1; i < argc; i++) {
        const char *a = argv[i];
        if (strcmp(a, "-h") == 0 || strcmp(a, "--help") == 0) {
            fputs(USAGE, stdout);
            return CPL_EXIT_OK;
        } else if (strcmp(a, "-v") == 0 || strcmp(a, "--version") == 0) {
            printf("coldprep %s\n", cp_version());
            return CPL_EXIT_OK;
        } else if (strcmp(a, "-i") == 0) {
            interactive = 1;
        } else if (strcmp(a, "-e") == 0) {
            if (++i >= argc)
                return usage_error("option -e needs an argument (the code to run)", NULL);
            have_code = 1;
        } else if (strcmp(a, "--") == 0) {
            if (i + 1 < argc)
                script = i + 1;
            break;
        } else if (a[0] == '-' && a[1] != '\0') {
            return usage_error("unknown option", a);
        } else {
            script = i;
            break;
        }
    }

    lua_State *L = cpl_new_state();
    if (L == NULL)
        return CPL_EXIT_ERROR;
    set_arg_table(L, argc, argv, script ? script : argc);

    int rc = CPL_EXIT_OK;
    int end = script ? script : argc;
    for (int i = 1; i < end && rc == CPL_EXIT_OK; i++) {
        if (strcmp(argv[i], "-e") == 0) {
            i++;
            rc = run_chunk(L, luaL_loadbuffer(L, argv[i], strlen(argv[i]), "=(command line)"));
        }
    }
    if (rc == CPL_EXIT_OK && script) {
        int status = luaL_loadfile(L, argv[script]);
        if (status == LUA_OK) {
            int nargs = argc - script - 1;
            luaL_checkstack(L, nargs, "too many script arguments");
            for (int i = script + 1; i < argc; i++)
                lua_pushstring(L, argv[i]);
            status = cpl_pcall(L, nargs, 0);
        }
        if (status != LUA_OK) {
            cpl_report(L, NULL);
            rc = CPL_EXIT_ERROR;
        }
    }
    if (rc == CPL_EXIT_OK && (interactive || (!script && !have_code)))
        rc = cpl_repl(L);
    lua_close(L);
    return rc;
}

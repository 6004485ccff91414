/*
 * The coldprep executable: dispatches subcommands (`coldprep NAME ...`, table COMMANDS),
 * otherwise runs -e code, a plan script and/or the interactive REPL, as the usage text
 * says.  A subcommand name in argv[1] wins over a script of the same name; such a script
 * runs as `coldprep ./NAME` or `coldprep -- NAME`.
 */
#include <lauxlib.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"
#include "cli_sweep.h"
#include "coldprep/status.h"
#include "modpath.h"

#if defined(__SANITIZE_ADDRESS__)
/* Under AddressSanitizer: PLplot (the plot module) loads its drivers with libltdl and the
 * Cairo drivers fill fontconfig's caches; both keep that memory until exit by design.  This
 * is the sanitizer's documented hook for suppressing such third-party leaks; it must be in
 * the executable. */
const char *__lsan_default_suppressions(void);
const char *__lsan_default_suppressions(void)
{
    return "leak:libfontconfig.so\nleak:libltdl.so\n";
}
#endif

/* Subcommands: add a line per command (its function is declared in cli.h or, for sweep
 * and merge, cli_sweep.h). */
static const cpl_command COMMANDS[] = {
    {"help", cpl_cmd_help, "help [NAME]", "print the help of NAME (e.g. cp.species.atom)"},
    {"data", cpl_cmd_data, "data [SPECIES]",
     "list the built-in species values with their publications and checks"},
    {"sweep", cpl_sweep_main, "sweep FILE.lua",
     "run the sweep FILE.lua returns [--jobs N] [--out PATH] [--resume] [--shard K/N]\n"
     "                 [--sandbox]"},
    {"merge", cpl_merge_main, "merge OUT SLICE...", "join the slices of a sharded sweep"},
    {NULL, NULL, NULL, NULL},
};

static const char USAGE[] =
    "usage: coldprep [options] [FILE.lua [ARGS...]]\n"
    "       coldprep COMMAND [ARGS...]\n"
    "\n"
    "Plans the preparation of ultracold ground-state molecules: runs a plan file, Lua\n"
    "code given with -e, or an interactive session (no FILE and no -e, or -i).\n"
    "\n"
    "options:\n"
    "  -e CODE        run the Lua code CODE (may be given several times, runs in order)\n"
    "  -i             enter the interactive session after running FILE or -e\n"
    "  -h, --help     show this text\n"
    "  -v, --version  print the version\n"
    "  --             stop option processing; the next word is FILE\n"
    "  -              as FILE: read the script from standard input\n"
    "  --sandbox      run FILE as a file you do not trust: no os or io beyond reading\n"
    "                 its own directory and writing the --allow-write paths, no native\n"
    "                 code, debug library or bytecode, capped memory and time\n"
    "  --allow-write PATH  let the sandboxed FILE write PATH (may be repeated)\n"
    "  --max-memory MIB    the sandbox's memory cap (default 1024)\n"
    "  --max-time S        the sandbox's time cap (default 600)\n"
    "\n"
    "The script sees its arguments in the global table `arg` (arg[0] = FILE) and as `...`.\n"
    "In scripts and the session, `cp` (also `coldprep`) is the library; help() lists it.\n"
    "The session keeps its history in $XDG_STATE_HOME/coldprep/history\n"
    "(default ~/.local/state/coldprep/history).\n"
    "Exit status: 0 success, 1 error in the script, 2 usage error.\n"
    "\n"
    "commands:\n";

static void print_usage(void)
{
    fputs(USAGE, stdout);
    for (const cpl_command *c = COMMANDS; c->name; c++)
        printf("  %-14s %s\n", c->synopsis, c->summary);
    printf("\nSee man coldprep and docs/cli.md for more.\n");
}

static int usage_error(const char *msg, const char *what)
{
    fprintf(stderr, "coldprep: %s%s%s\n", msg, what ? " " : "", what ? what : "");
    fprintf(stderr, "Try 'coldprep --help'.\n");
    return CPL_EXIT_USAGE;
}

/* arg = {[0] = script, [1..] = its arguments, [-1..] = what came before it}, as the stock
 * interpreter does; without a script, arg = {[0] = the program}. */
static void set_arg_table(lua_State *L, int argc, char **argv, int script)
{
    lua_createtable(L, script ? argc - script : 0, 1);
    if (script == 0) {
        lua_pushstring(L, argv[0]);
        lua_rawseti(L, -2, 0);
    } else {
        for (int i = 0; i < argc; i++) {
            lua_pushstring(L, argv[i]);
            lua_rawseti(L, -2, i - script);
        }
    }
    lua_setglobal(L, "arg");
}

static int run_code(lua_State *L, const char *code)
{
    int status = luaL_loadbuffer(L, code, strlen(code), "=(command line)");
    if (status == LUA_OK)
        status = cpl_pcall(L, 0, 0);
    if (status != LUA_OK) {
        cpl_report(L, NULL);
        return CPL_EXIT_ERROR;
    }
    return CPL_EXIT_OK;
}

static int run_script(lua_State *L, int argc, char **argv, int script, int sandboxed)
{
    const char *name = strcmp(argv[script], "-") == 0 ? NULL : argv[script];
    int status = sandboxed ? cpl_sandbox_loadfile(L, name) : luaL_loadfile(L, name);
    if (status == LUA_OK) {
        int nargs = argc - script - 1;
        if (!lua_checkstack(L, nargs + 1)) {
            fprintf(stderr, "coldprep: too many script arguments (%d)\n", nargs);
            return CPL_EXIT_USAGE;
        }
        for (int i = script + 1; i < argc; i++)
            lua_pushstring(L, argv[i]);
        if (sandboxed)
            cpl_sandbox_arm(L);
        status = cpl_pcall(L, nargs, 0);
    }
    if (status == LUA_ERRMEM && sandboxed) {
        lua_pop(L, 1);
        lua_pushliteral(L, "sandbox: the file reached the memory cap (--max-memory)");
    }
    if (status != LUA_OK) {
        cpl_report(L, NULL);
        return CPL_EXIT_ERROR;
    }
    return CPL_EXIT_OK;
}

/* The interactive session is coldprep_repl.so (lua/cli/repl*.c, with readline), opened
 * only when a session starts (modpath.h): beside the executable in the build tree, in
 * CPL_BIN_TO_PRIVATE_LIB from it when installed. */
static int run_session(lua_State *L)
{
    static const char *const dirs[] = {".", CPL_BIN_TO_PRIVATE_LIB, NULL};
    char err[1536];
    void *p = cpl_module_function(dirs, "coldprep_repl.so", "cpl_repl", err, sizeof err);
    if (!p) {
        fprintf(stderr, "coldprep: the interactive session: %s\n", err);
        return CPL_EXIT_ERROR;
    }
    int (*repl)(lua_State *);
    memcpy(&repl, &p, sizeof repl); /* POSIX: dlsym's pointer is the function's */
    return repl(L);
}

int main(int argc, char **argv)
{
    if (argc > 1) {
        for (const cpl_command *c = COMMANDS; c->name; c++)
            if (strcmp(argv[1], c->name) == 0)
                return c->run(argc - 1, argv + 1);
    }

    /* First pass: check the options, find the script. */
    int interactive = 0, have_code = 0, script = 0, nwritable = 0;
    cpl_sandbox sb;
    cpl_sandbox_defaults(&sb);
    enum { MAX_WRITABLE = 64 };
    const char *writable[MAX_WRITABLE];
    for (int i = 1; i < argc && !script; i++) {
        const char *a = argv[i];
        char err[256];
        int sbo = cpl_sandbox_option(argc, argv, &i, &sb, err, sizeof err);
        if (sbo < 0) {
            return usage_error(err, NULL);
        } else if (sbo > 0) {
            continue;
        } else if (strcmp(a, "--allow-write") == 0) {
            if (++i >= argc)
                return usage_error("option --allow-write needs a path", NULL);
            if (nwritable == MAX_WRITABLE)
                return usage_error("at most 64 --allow-write paths", NULL);
            writable[nwritable++] = argv[i];
        } else if (strcmp(a, "-h") == 0 || strcmp(a, "--help") == 0) {
            print_usage();
            return CPL_EXIT_OK;
        } else if (strcmp(a, "-v") == 0 || strcmp(a, "--version") == 0) {
            printf("coldprep %s\n", cp_version());
            return CPL_EXIT_OK;
        } else if (strcmp(a, "-i") == 0) {
            interactive = 1;
        } else if (strcmp(a, "-e") == 0) {
            if (++i >= argc)
                return usage_error("option -e needs an argument (the Lua code to run)", NULL);
            have_code = 1;
        } else if (strcmp(a, "--") == 0) {
            if (i + 1 < argc)
                script = i + 1;
            break;
        } else if (a[0] == '-' && a[1] != '\0') {
            char msg[512];
            int n = snprintf(msg, sizeof msg, "unknown option %s; allowed -e CODE, -i, -h "
                             "(--help), -v (--version), --sandbox, --max-memory MIB, --max-time "
                             "S, --allow-write PATH, -- (then FILE), or a command (", a);
            for (const cpl_command *c = COMMANDS; c->name && n > 0 && (size_t)n < sizeof msg;
                 c++)
                n += snprintf(msg + n, sizeof msg - (size_t)n, "%s%s", c == COMMANDS ? "" : ", ",
                              c->name);
            if (n > 0 && (size_t)n < sizeof msg)
                snprintf(msg + n, sizeof msg - (size_t)n, ")");
            return usage_error(msg, NULL);
        } else {
            script = i;
        }
    }

    /* The sandbox runs one file and nothing typed beside it: its state is narrowed. */
    char dir[4096];
    if (sb.on && (!script || have_code || interactive)) {
        return usage_error("--sandbox (or COLDPREP_SANDBOX=1) runs one FILE, without -e or -i",
                           NULL);
    }
    if (sb.on) {
        cpl_sandbox_dir(strcmp(argv[script], "-") == 0 ? NULL : argv[script], dir, sizeof dir);
        sb.dir = dir;
        sb.writable = writable;
        sb.nwritable = nwritable;
    } else if (nwritable > 0) {
        return usage_error("--allow-write only means something with --sandbox", NULL);
    }

    lua_State *L = cpl_new_state_for(&sb);
    if (L == NULL)
        return CPL_EXIT_ERROR;
    set_arg_table(L, argc, argv, script);

    /* Second pass: run the -e code in order, then the script, then the session. */
    int rc = CPL_EXIT_OK;
    int end = script ? script : argc;
    for (int i = 1; i < end && rc == CPL_EXIT_OK; i++) {
        if (strcmp(argv[i], "-e") == 0)
            rc = run_code(L, argv[++i]);
        else if (strcmp(argv[i], "--") == 0)
            break;
    }
    if (rc == CPL_EXIT_OK && script)
        rc = run_script(L, argc, argv, script, sb.on);
    if (rc == CPL_EXIT_OK && (interactive || (!script && !have_code)))
        rc = run_session(L);
    lua_close(L);
    return rc;
}

/*
 * Shared pieces of the coldprep executable: creating a Lua state with the library loaded,
 * running code with Ctrl-C interruption, the REPL, and the subcommands that main.c
 * dispatches on argv[1].  Exit codes: 0 success, 1 a script or runtime error, 2 a usage
 * error.
 */
#ifndef COLDPREP_CLI_H
#define COLDPREP_CLI_H

#include <lua.h>
#include <stddef.h>

enum { CPL_EXIT_OK = 0, CPL_EXIT_ERROR = 1, CPL_EXIT_USAGE = 2 };

/* A new Lua state with the standard libraries, `coldprep` loaded and the globals
 * `coldprep`, `cp` and `help` set; coroutine.resume and coroutine.wrap are wrapped so that
 * cpl_pcall's Ctrl-C reaches coroutines.  On failure prints a message and returns NULL. */
lua_State *cpl_new_state(void);

/* Call the function below nargs arguments on the stack in protected mode, like lua_pcall.
 * While it runs, SIGINT (Ctrl-C) makes the running Lua code raise "interrupted", also in
 * coroutines run by coroutine.resume or coroutine.wrap; the interruption is re-raised at
 * every following line and instruction until it reaches this call, so a pcall inside the
 * script cannot swallow it.  The flag the handler sets is registered for the bindings
 * (CPL_CANCEL_KEY), so long C computations that poll it stop too.  A second Ctrl-C before
 * the first
 * takes effect (e.g. inside a long C computation) ends the process.  On error the message
 * (with a traceback if the environment variable COLDPREP_TRACEBACK is set) is left on the
 * stack.  May be nested. */
int cpl_pcall(lua_State *L, int nargs, int nresults);

/* Print the error message on top of the stack to stderr (prefixed by "progname: " unless
 * progname is NULL) and pop it. */
void cpl_report(lua_State *L, const char *progname);

/* Run the interactive loop on stdin until end of input (lua/cli/repl.c, in the module
 * coldprep_repl.so that main.c opens for a session).  On a terminal: readline with
 * persistent history and Tab completion, Ctrl-C clears the line.  Otherwise lines are read
 * plainly, no prompt is shown.  Returns CPL_EXIT_OK, or CPL_EXIT_ERROR when input was not
 * a terminal and some entry failed. */
int cpl_repl(lua_State *L);

/* A subcommand: `coldprep NAME ARGS...` calls run(argc, argv) with argv[0] = NAME and
 * argv[argc] = NULL, and exits with its result (a CPL_EXIT_* code).  main.c keeps the
 * table of them; `coldprep --help` lists each with its one-line summary. */
typedef struct cpl_command {
    const char *name;
    int (*run)(int argc, char **argv);
    const char *synopsis; /* "help [NAME]" */
    const char *summary;  /* one line */
} cpl_command;

/* The sandbox for files one does not trust (cli_sandbox.c, lua/coldprep/sandbox.lua):
 * whether it is on, its caps, the directory reads are confined to and the paths that may be
 * written.  `used` and `deadline` are the running state of one Lua state: each state needs
 * its own struct. */
enum { CPL_SANDBOX_MEMORY_MIB = 1024, CPL_SANDBOX_TIME_S = 600 };
typedef struct cpl_sandbox {
    int on;
    size_t max_memory; /* bytes Lua may hold */
    double max_time;   /* s: for the whole script, or for each sweep point */
    const char *dir;
    const char *const *writable;
    int nwritable;
    size_t used;
    double deadline; /* monotonic clock, s; 0 when not armed */
} cpl_sandbox;

/* Defaults: off (on when the environment has COLDPREP_SANDBOX=1), 1024 MiB, 600 s. */
void cpl_sandbox_defaults(cpl_sandbox *sb);

/* Read --sandbox, --max-memory MIB or --max-time S at argv[*i] (advancing *i past a value):
 * 1 if it was one of them, 0 if not, -1 with a message in err if its value is bad. */
int cpl_sandbox_option(int argc, char **argv, int *i, cpl_sandbox *sb, char *err, size_t errlen);

/* The directory of `file` ("." without a slash) in dir[size]. */
void cpl_sandbox_dir(const char *file, char *dir, size_t size);

/* A bare Lua state whose allocator holds it to sb->max_memory (sb must outlive it). */
lua_State *cpl_sandbox_newstate(cpl_sandbox *sb);

/* In a state with the libraries and `cp` loaded: narrow its globals and build the fresh
 * environment of the untrusted file (kept in the registry).  0, or -1 with the message on
 * the stack. */
int cpl_sandbox_enter(lua_State *L, const cpl_sandbox *sb);

/* Load `file` as text into the sandbox environment (luaL_loadfilex status). */
int cpl_sandbox_loadfile(lua_State *L, const char *file);

/* Start the time cap (sb->max_time from now) / stop it; L must come from
 * cpl_sandbox_newstate. */
void cpl_sandbox_arm(lua_State *L);
void cpl_sandbox_disarm(lua_State *L);

/* cpl_new_state, built in the sandbox sb when sb->on (then sb must outlive the state). */
lua_State *cpl_new_state_for(cpl_sandbox *sb);

/* `coldprep help [NAME]` (cli_help.c). */
int cpl_cmd_help(int argc, char **argv);

/* `coldprep data [NAME]` (cli_data.c). */
int cpl_cmd_data(int argc, char **argv);

#endif

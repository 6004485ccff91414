/*
 * Shared pieces of the coldprep executable: creating a Lua state with the library loaded,
 * running code with Ctrl-C interruption, the REPL, and the subcommands that main.c
 * dispatches on argv[1].  Exit codes: 0 success, 1 a script or runtime error, 2 a usage
 * error.
 */
#ifndef COLDPREP_CLI_H
#define COLDPREP_CLI_H

#include <lua.h>

enum { CPL_EXIT_OK = 0, CPL_EXIT_ERROR = 1, CPL_EXIT_USAGE = 2 };

/* A new Lua state with the standard libraries, `coldprep` loaded and the globals
 * `coldprep`, `cp` and `help` set; coroutine.resume and coroutine.wrap are wrapped so that
 * cpl_pcall's Ctrl-C reaches coroutines.  On failure prints a message and returns NULL. */
lua_State *cpl_new_state(void);

/* Call the function below nargs arguments on the stack in protected mode, like lua_pcall.
 * While it runs, SIGINT (Ctrl-C) makes the running Lua code raise "interrupted", also in
 * coroutines run by coroutine.resume or coroutine.wrap; the interruption is re-raised at
 * every following line and instruction until it reaches this call, so a pcall inside the
 * script cannot swallow it.  A second Ctrl-C before the first
 * takes effect (e.g. inside a long C computation) ends the process.  On error the message
 * (with a traceback if the environment variable COLDPREP_TRACEBACK is set) is left on the
 * stack.  May be nested. */
int cpl_pcall(lua_State *L, int nargs, int nresults);

/* Print the error message on top of the stack to stderr (prefixed by "progname: " unless
 * progname is NULL) and pop it. */
void cpl_report(lua_State *L, const char *progname);

/* Run the interactive loop on stdin until end of input.  On a terminal: readline with
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

/* `coldprep help [NAME]` (cli_help.c). */
int cpl_cmd_help(int argc, char **argv);

/* `coldprep data [NAME]` (cli_data.c). */
int cpl_cmd_data(int argc, char **argv);

#endif

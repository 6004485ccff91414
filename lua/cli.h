/*
 * Shared pieces of the coldprep executable: creating a Lua state with the library loaded,
 * running code with Ctrl-C interruption, and the REPL.  Exit codes: 0 success, 1 a script
 * or runtime error, 2 a usage error.
 */
#ifndef COLDPREP_CLI_H
#define COLDPREP_CLI_H

#include <lua.h>

enum { CPL_EXIT_OK = 0, CPL_EXIT_ERROR = 1, CPL_EXIT_USAGE = 2 };

/* A new Lua state with the standard libraries, `coldprep` loaded and the globals
 * `coldprep`, `cp` and `help` set.  On failure prints a message and returns NULL. */
lua_State *cpl_new_state(void);

/* Call the function below nargs arguments on the stack in protected mode, with SIGINT
 * turned into a Lua error ("interrupted") while it runs.  On error the message (with a
 * traceback if COLDPREP_TRACEBACK is set) is left on the stack. */
int cpl_pcall(lua_State *L, int nargs, int nresults);

/* Print the error message on top of the stack to stderr and pop it. */
void cpl_report(lua_State *L, const char *progname);

/* Run the interactive loop on stdin until end of input; returns an exit code. */
int cpl_repl(lua_State *L);

#endif

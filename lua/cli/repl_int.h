/*
 * Pieces of the interactive session (the module coldprep_repl.so): Tab completion
 * (repl_complete.c) and persistent history (repl_history.c), both on readline.
 */
#ifndef COLDPREP_REPL_INT_H
#define COLDPREP_REPL_INT_H

#include <lua.h>

/* Make readline's Tab complete Lua names in state L: globals and keywords, fields after
 * `a.b.` (walking raw fields and __index tables, never calling Lua code), methods after
 * `a:`, and file names inside a string.  L must outlive the session. */
void cpl_complete_install(lua_State *L);

/* Load the history file ($XDG_STATE_HOME/coldprep/history, else
 * ~/.local/state/coldprep/history), creating its directory.  Problems are warnings on
 * stderr (each reported once); the session goes on without saving. */
void cpl_history_open(void);

/* Add a complete entry (possibly several lines) to the in-memory history and append it to
 * the file at once, so a killed session loses nothing. */
void cpl_history_add(const char *entry);

/* Trim the file to its maximum length and free the history. */
void cpl_history_close(void);

#endif

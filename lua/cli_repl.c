/*
 * The interactive session on readline.  A line is first tried as an expression
 * ("return <line>") whose values are printed; otherwise as a statement.  A statement
 * whose syntax error ends at <eof> is incomplete: the next line continues it under the
 * secondary prompt.  Ctrl-C during a computation interrupts it (cpl_pcall); Ctrl-D at
 * the prompt leaves.
 */
#include <lauxlib.h>
#include <readline/history.h>
#include <readline/readline.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli.h"
#include "coldprep/status.h"

static const char PROMPT[] = "coldprep> ";
static const char PROMPT2[] = "      ... ";

static int incomplete(lua_State *L, int status)
{
    if (status == LUA_ERRSYNTAX) {
        size_t len;
        const char *msg = lua_tolstring(L, -1, &len);
        const char *mark = "<eof>";
        size_t ml = strlen(mark);
        if (len >= ml && strcmp(msg + len - ml, mark) == 0) {
            lua_pop(L, 1);
            return 1;
        }
    }
    return 0;
}

/* Compile `code` as an expression, or as a statement; returns a load status with the
 * chunk (or error) on the stack. */
static int compile(lua_State *L, const char *code)
{
    lua_pushfstring(L, "return %s;", code);
    int status = luaL_loadbuffer(L, lua_tostring(L, -1), lua_rawlen(L, -1), "=stdin");
    lua_remove(L, -2);
    if (status == LUA_OK)
        return status;
    lua_pop(L, 1);
    return luaL_loadbuffer(L, code, strlen(code), "=stdin");
}

static void print_results(lua_State *L, int base)
{
    int n = lua_gettop(L) - base;
    if (n <= 0)
        return;
    lua_getglobal(L, "print");
    lua_insert(L, base + 1);
    if (cpl_pcall(L, n, 0) != LUA_OK)
        cpl_report(L, NULL);
}

static char *read_line(const char *prompt, int tty)
{
    if (tty)
        return readline(prompt);
    static char buf[65536];
    if (fgets(buf, sizeof buf, stdin) == NULL)
        return NULL;
    buf[strcspn(buf, "\n")] = '\0';
    return strdup(buf);
}

int cpl_repl(lua_State *L)
{
    int tty = isatty(0);
    if (tty)
        printf("coldprep %s: type help() for the library, Ctrl-D to leave\n", cp_version());
    char *line;
    while ((line = read_line(PROMPT, tty)) != NULL) {
        luaL_Buffer b;
        luaL_buffinit(L, &b);
        luaL_addstring(&b, line);
        luaL_pushresult(&b);
        free(line);
        int base = lua_gettop(L) - 1;
        int status;
        for (;;) {
            status = compile(L, lua_tostring(L, base + 1));
            if (!incomplete(L, status))
                break;
            char *more = read_line(PROMPT2, tty);
            if (more == NULL) { /* end of input inside a statement: report it */
                status = compile(L, lua_tostring(L, base + 1));
                break;
            }
            lua_pushliteral(L, "\n");
            lua_pushstring(L, more);
            free(more);
            lua_concat(L, 3);
        }
        if (tty && lua_tostring(L, base + 1)[0])
            add_history(lua_tostring(L, base + 1));
        lua_remove(L, base + 1);
        if (status == LUA_OK)
            status = cpl_pcall(L, 0, LUA_MULTRET);
        if (status == LUA_OK)
            print_results(L, base);
        else
            cpl_report(L, NULL);
        lua_settop(L, base);
    }
    if (tty)
        putchar('\n');
    return CPL_EXIT_OK;
}

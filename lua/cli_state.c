/*
 * Lua state creation and protected calls for the executable.  A SIGINT while Lua code
 * runs sets a hook that raises "interrupted" at the next instruction count, line, call or
 * return, the way Lua's own interpreter does it; the hook is removed once it fires.
 */
#include <lauxlib.h>
#include <lualib.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>

#include "cli.h"

int luaopen_coldprep(lua_State *L);

static lua_State *volatile running_state = NULL;

static void interrupt_hook(lua_State *L, lua_Debug *ar)
{
    (void)ar;
    lua_sethook(L, NULL, 0, 0);
    luaL_error(L, "interrupted");
}

static void on_sigint(int sig)
{
    (void)sig;
    signal(SIGINT, SIG_DFL); /* a second Ctrl-C kills the process */
    if (running_state)
        lua_sethook(running_state, interrupt_hook,
                    LUA_MASKCALL | LUA_MASKRET | LUA_MASKLINE | LUA_MASKCOUNT, 1);
}

static int message_handler(lua_State *L)
{
    const char *msg = lua_tostring(L, 1);
    if (msg == NULL) {
        if (luaL_callmeta(L, 1, "__tostring") && lua_type(L, -1) == LUA_TSTRING)
            return 1;
        msg = lua_pushfstring(L, "(error object is a %s value)", luaL_typename(L, 1));
    }
    const char *want = getenv("COLDPREP_TRACEBACK");
    if (want && want[0] && want[0] != '0')
        luaL_traceback(L, L, msg, 1);
    else
        lua_pushstring(L, msg);
    return 1;
}

int cpl_pcall(lua_State *L, int nargs, int nresults)
{
    int base = lua_gettop(L) - nargs;
    lua_pushcfunction(L, message_handler);
    lua_insert(L, base);
    running_state = L;
    void (*previous)(int) = signal(SIGINT, on_sigint);
    int status = lua_pcall(L, nargs, nresults, base);
    signal(SIGINT, previous);
    running_state = NULL;
    lua_sethook(L, NULL, 0, 0);
    lua_remove(L, base);
    return status;
}

void cpl_report(lua_State *L, const char *progname)
{
    const char *msg = lua_tostring(L, -1);
    if (progname)
        fprintf(stderr, "%s: ", progname);
    fprintf(stderr, "%s\n", msg ? msg : "(error object is not a string)");
    fflush(stderr);
    lua_pop(L, 1);
}

static int open_everything(lua_State *L)
{
    luaL_openlibs(L);
    luaL_requiref(L, "coldprep", luaopen_coldprep, 0);
    lua_pushvalue(L, -1);
    lua_setglobal(L, "coldprep");
    lua_pushvalue(L, -1);
    lua_setglobal(L, "cp");
    lua_getfield(L, -1, "help");
    lua_setglobal(L, "help");
    return 0;
}

lua_State *cpl_new_state(void)
{
    lua_State *L = luaL_newstate();
    if (L == NULL) {
        fprintf(stderr, "coldprep: cannot create a Lua state (out of memory)\n");
        return NULL;
    }
    lua_pushcfunction(L, open_everything);
    if (lua_pcall(L, 0, 0, 0) != LUA_OK) {
        cpl_report(L, "coldprep");
        lua_close(L);
        return NULL;
    }
    return L;
}

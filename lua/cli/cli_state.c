/*
 * Lua state creation and protected calls for the executable.  Ctrl-C works the way Lua's
 * own interpreter does it — the SIGINT handler sets a hook that raises "interrupted" at the
 * next instruction — with one change taken from Redis's script killer: the hook stays set
 * and fires again on every following line and instruction until the error has reached
 * cpl_pcall, so a script that catches errors with pcall cannot swallow the interruption.
 * Hooks belong to one Lua thread, so coroutine.resume and coroutine.wrap are replaced by
 * versions that record the coroutines running at the moment, and the handler sets the hook
 * on those too.
 */
#include <lauxlib.h>
#include <lualib.h>
#include <signal.h>
#include <stdio.h>
#include <stdint.h>
#include <stdlib.h>

#include "args.h"
#include "cli.h"

int luaopen_coldprep(lua_State *L);

/* The state cpl_pcall is running (NULL outside) and whether Ctrl-C was pressed during it.
 * Written by the signal handler, hence volatile; the program is single-threaded. */
static lua_State *volatile running_state = NULL;
static volatile sig_atomic_t interrupt_pending = 0;

/* The coroutines being resumed, outermost first (only the first MAX_RESUMED of deeper
 * nests are recorded).  Each is on its resumer's stack meanwhile, so it stays alive. */
enum { MAX_RESUMED = 32 };
static lua_State *volatile resumed[MAX_RESUMED];
static volatile sig_atomic_t resumed_count = 0;

static void interrupt_hook(lua_State *L, lua_Debug *ar)
{
    (void)ar;
    /* Re-arm on every line and instruction: whoever catches this error will see another
     * at its next instruction.  Only cpl_pcall's message handler switches it off. */
    lua_sethook(L, interrupt_hook, LUA_MASKLINE | LUA_MASKCOUNT, 1);
    luaL_error(L, "interrupted");
}

static void on_sigint(int sig)
{
    if (interrupt_pending) { /* the first Ctrl-C is stuck (in C code): end the process */
        signal(sig, SIG_DFL);
        raise(sig);
        return;
    }
    interrupt_pending = 1;
    if (running_state == NULL)
        return;
    /* Lua allows lua_sethook in a signal handler (see lua_sethook in ldebug.c) */
    int mask = LUA_MASKCALL | LUA_MASKRET | LUA_MASKLINE | LUA_MASKCOUNT;
    lua_sethook(running_state, interrupt_hook, mask, 1);
    for (int i = 0; i < resumed_count && i < MAX_RESUMED; i++)
        lua_sethook(resumed[i], interrupt_hook, mask, 1);
}

/* Calls the function below the n arguments on top with co recorded as running; errors
 * propagate.  The record is written before the count so the handler never reads a stale
 * entry. */
static int call_tracking(lua_State *L, lua_State *co, int n)
{
    int depth = resumed_count;
    if (depth < MAX_RESUMED)
        resumed[depth] = co;
    resumed_count = depth + 1;
    int status = lua_pcall(L, n, LUA_MULTRET, 0);
    resumed_count = depth;
    return status;
}

/* coroutine.resume(co, ...) recording co.  Upvalue 1: the library's resume. */
static int tracked_resume(lua_State *L)
{
    lua_State *co = lua_tothread(L, 1);
    luaL_argexpected(L, co != NULL, 1, "coroutine");
    int n = lua_gettop(L);
    lua_pushvalue(L, lua_upvalueindex(1));
    lua_insert(L, 1);
    if (call_tracking(L, co, n) != LUA_OK)
        return lua_error(L);
    return lua_gettop(L);
}

/* The function coroutine.wrap returns, recording its coroutine.  Upvalues: the library's
 * wrapper function and its coroutine.  An error gets the caller's position prefixed, as
 * the library's wrapper would have done had it been called from Lua directly. */
static int tracked_wrapped(lua_State *L)
{
    int n = lua_gettop(L);
    lua_pushvalue(L, lua_upvalueindex(1));
    lua_insert(L, 1);
    if (call_tracking(L, lua_tothread(L, lua_upvalueindex(2)), n) != LUA_OK) {
        if (lua_type(L, -1) == LUA_TSTRING) {
            luaL_where(L, 1);
            lua_insert(L, -2);
            lua_concat(L, 2);
        }
        return lua_error(L);
    }
    return lua_gettop(L);
}

/* coroutine.wrap(f): the library's wrapper, whose first upvalue is the coroutine, inside a
 * tracked_wrapped.  Upvalue 1: the library's wrap. */
static int tracked_wrap(lua_State *L)
{
    lua_pushvalue(L, lua_upvalueindex(1));
    lua_insert(L, 1);
    lua_call(L, lua_gettop(L) - 1, 1);
    if (lua_getupvalue(L, -1, 1) == NULL || !lua_isthread(L, -1)) {
        lua_settop(L, 1); /* a wrapper of another shape: leave it untracked */
        return 1;
    }
    lua_pushcclosure(L, tracked_wrapped, 2);
    return 1;
}

static void track_coroutines(lua_State *L)
{
    if (lua_getglobal(L, "coroutine") == LUA_TTABLE) {
        lua_getfield(L, -1, "resume");
        lua_pushcclosure(L, tracked_resume, 1);
        lua_setfield(L, -2, "resume");
        lua_getfield(L, -1, "wrap");
        lua_pushcclosure(L, tracked_wrap, 1);
        lua_setfield(L, -2, "wrap");
    }
    lua_pop(L, 1);
}

/* Upvalue 1: whether this is the outermost cpl_pcall.  Only there has an interruption
 * arrived (and the note a stopped computation left, an optimisation's best point, is
 * appended to its message); a nested call's caller must see it again. */
static int message_handler(lua_State *L)
{
    int outermost = lua_toboolean(L, lua_upvalueindex(1));
    if (interrupt_pending && outermost) {
        lua_sethook(L, NULL, 0, 0);
        if (lua_type(L, 1) == LUA_TSTRING &&
            lua_getfield(L, LUA_REGISTRYINDEX, CPL_INTERRUPT_NOTE_KEY) == LUA_TSTRING) {
            lua_pushvalue(L, 1);
            lua_pushliteral(L, "; ");
            lua_rotate(L, -3, -1); /* message, "; ", note */
            lua_concat(L, 3);
            lua_replace(L, 1);
        } else {
            lua_pop(L, 1);
        }
    }
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
    lua_State *outer = running_state;
    int base = lua_gettop(L) - nargs;
    lua_pushboolean(L, outer == NULL);
    lua_pushcclosure(L, message_handler, 1);
    lua_insert(L, base);

    running_state = L;
    struct sigaction sa = {0}, previous;
    sa.sa_handler = on_sigint; /* no SA_RESTART: a blocking read returns to Lua */
    sigemptyset(&sa.sa_mask);
    sigaction(SIGINT, &sa, &previous);
    sigset_t sigint, saved_mask;
    sigemptyset(&sigint);
    sigaddset(&sigint, SIGINT);
    sigprocmask(SIG_UNBLOCK, &sigint, &saved_mask); /* the REPL blocks it at the prompt */

    int status = lua_pcall(L, nargs, nresults, base);

    sigprocmask(SIG_SETMASK, &saved_mask, NULL);
    sigaction(SIGINT, &previous, NULL);
    running_state = outer;
    if (outer == NULL) { /* outermost call: the interruption, if any, is over */
        lua_sethook(L, NULL, 0, 0);
        if (interrupt_pending) {
            lua_pushnil(L);
            lua_setfield(L, LUA_REGISTRYINDEX, CPL_INTERRUPT_NOTE_KEY);
        }
        interrupt_pending = 0;
    }
    lua_remove(L, base);
    return status;
}

void cpl_report(lua_State *L, const char *progname)
{
    const char *msg = lua_tostring(L, -1);
    fflush(stdout); /* keep the order of results and errors when both go to one file */
    if (progname)
        fprintf(stderr, "%s: ", progname);
    fprintf(stderr, "%s\n", msg ? msg : "(error object is not a string)");
    fflush(stderr);
    lua_pop(L, 1);
}

static int open_everything(lua_State *L)
{
    /* long C computations poll this flag (lua/bind/args.h): the first Ctrl-C stops them */
    lua_pushlightuserdata(L, (void *)(uintptr_t)&interrupt_pending);
    lua_setfield(L, LUA_REGISTRYINDEX, CPL_CANCEL_KEY);
    luaL_openlibs(L);
    track_coroutines(L);
    luaL_requiref(L, "coldprep", luaopen_coldprep, 0);
    lua_pushvalue(L, -1);
    lua_setglobal(L, "coldprep");
    lua_pushvalue(L, -1);
    lua_setglobal(L, "cp");
    lua_getfield(L, -1, "help");
    lua_setglobal(L, "help");
    return 0;
}

lua_State *cpl_new_state_for(cpl_sandbox *sb)
{
    int sandboxed = sb != NULL && sb->on;
    lua_State *L = sandboxed ? cpl_sandbox_newstate(sb) : luaL_newstate();
    if (L == NULL) {
        fprintf(stderr, "coldprep: cannot create a Lua state (out of memory)\n");
        return NULL;
    }
    lua_pushcfunction(L, open_everything);
    if (lua_pcall(L, 0, 0, 0) != LUA_OK || (sandboxed && cpl_sandbox_enter(L, sb) != 0)) {
        cpl_report(L, "coldprep");
        lua_close(L);
        return NULL;
    }
    return L;
}

lua_State *cpl_new_state(void)
{
    return cpl_new_state_for(NULL);
}

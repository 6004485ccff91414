/*
 * The caps of the sandbox (`coldprep --sandbox FILE`, `coldprep sweep --sandbox`): a Lua
 * state whose allocator refuses to grow past a memory cap (Lua then raises "not enough
 * memory"), and a count hook that raises an error once a deadline has passed.  As in
 * Redis's script killer, after the deadline the hook fires again at every instruction and
 * line, so a pcall in the file cannot swallow the error.  The rules of what the file may
 * reach are Lua's (lua/coldprep/sandbox.lua); this file applies them to a state and loads
 * the untrusted chunk into the environment they build.  The caps cover what Lua
 * allocates and runs, not the memory or time of one C computation of the library.  The
 * hook also raises "interrupted" once the state's cancel flag is set (a sweep worker's
 * stop signal), the same way.
 */
#include <lauxlib.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "args.h"
#include "cli.h"

static double monotonic(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

static void *capped_alloc(void *ud, void *ptr, size_t osize, size_t nsize)
{
    cpl_sandbox *sb = ud;
    size_t old = ptr ? osize : 0;
    if (nsize == 0) {
        free(ptr);
        sb->used -= old;
        return NULL;
    }
    if (nsize > old && sb->used - old + nsize > sb->max_memory)
        return NULL;
    void *p = realloc(ptr, nsize);
    if (p != NULL)
        sb->used = sb->used - old + nsize;
    return p;
}

static int at_panic(lua_State *L)
{
    const char *msg = lua_tostring(L, -1);
    fprintf(stderr, "coldprep: unprotected Lua error: %s\n", msg ? msg : "(not a string)");
    return 0; /* Lua aborts */
}

lua_State *cpl_sandbox_newstate(cpl_sandbox *sb)
{
    sb->used = 0;
    sb->deadline = 0;
    lua_State *L = lua_newstate(capped_alloc, sb);
    if (L != NULL)
        lua_atpanic(L, at_panic);
    return L;
}

static void deadline_hook(lua_State *L, lua_Debug *ar)
{
    (void)ar;
    void *ud;
    lua_getallocf(L, &ud);
    cpl_sandbox *sb = ud;
    const cp_cancel_flag *flag = cpl_cancel_flag(L);
    if (flag && *flag) {
        lua_sethook(L, deadline_hook, LUA_MASKCOUNT | LUA_MASKLINE, 1);
        luaL_error(L, "interrupted");
    }
    if (sb->deadline > 0 && monotonic() > sb->deadline) {
        lua_sethook(L, deadline_hook, LUA_MASKCOUNT | LUA_MASKLINE, 1);
        luaL_error(L, "sandbox: the time limit of %f s was exceeded (--max-time)", sb->max_time);
    }
}

void cpl_sandbox_arm(lua_State *L)
{
    void *ud;
    lua_getallocf(L, &ud);
    cpl_sandbox *sb = ud;
    sb->deadline = monotonic() + sb->max_time;
    lua_sethook(L, deadline_hook, LUA_MASKCOUNT, 1000);
}

void cpl_sandbox_disarm(lua_State *L)
{
    void *ud;
    lua_getallocf(L, &ud);
    ((cpl_sandbox *)ud)->deadline = 0;
    lua_sethook(L, NULL, 0, 0);
}

int cpl_sandbox_enter(lua_State *L, const cpl_sandbox *sb)
{
    lua_getglobal(L, "require");
    lua_pushliteral(L, "coldprep.sandbox");
    if (lua_pcall(L, 1, 1, 0) != LUA_OK)
        return -1;
    lua_getfield(L, -1, "lock_down");
    lua_remove(L, -2);
    lua_createtable(L, 0, 2);
    lua_pushstring(L, sb->dir);
    lua_setfield(L, -2, "dir");
    lua_createtable(L, sb->nwritable, 0);
    for (int i = 0; i < sb->nwritable; i++) {
        lua_pushstring(L, sb->writable[i]);
        lua_rawseti(L, -2, i + 1);
    }
    lua_setfield(L, -2, "writable");
    if (lua_pcall(L, 1, 1, 0) != LUA_OK)
        return -1;
    lua_setfield(L, LUA_REGISTRYINDEX, "coldprep.sandbox.env");
    return 0;
}

int cpl_sandbox_loadfile(lua_State *L, const char *file)
{
    int status = luaL_loadfilex(L, file, "t");
    if (status != LUA_OK)
        return status;
    lua_getfield(L, LUA_REGISTRYINDEX, "coldprep.sandbox.env");
    lua_getglobal(L, "arg"); /* the script's arguments, set after the sandbox was built */
    lua_setfield(L, -2, "arg");
    if (lua_setupvalue(L, -2, 1) == NULL) /* a main chunk's first upvalue is _ENV */
        lua_pop(L, 1);
    return LUA_OK;
}

void cpl_sandbox_dir(const char *file, char *dir, size_t size)
{
    const char *slash = file ? strrchr(file, '/') : NULL;
    if (slash == NULL)
        snprintf(dir, size, ".");
    else if (slash == file)
        snprintf(dir, size, "/");
    else
        snprintf(dir, size, "%.*s", (int)(slash - file), file);
}

int cpl_sandbox_option(int argc, char **argv, int *i, cpl_sandbox *sb, char *err, size_t errlen)
{
    const char *a = argv[*i];
    if (strcmp(a, "--max-memory") == 0 || strcmp(a, "--max-time") == 0) {
        char *end;
        double v = *i + 1 < argc ? strtod(argv[*i + 1], &end) : 0;
        int memory = a[6] == 'm';
        double hi = memory ? 1048576.0 : 1e6;
        if (*i + 1 >= argc || end == argv[*i + 1] || *end != '\0' || !(v > 0 && v <= hi)) {
            const char *unit = memory ? "MiB" : "s";
            int number = *i + 1 < argc && end != argv[*i + 1] && *end == '\0' && v == v;
            snprintf(err, errlen, "%s %s %s is %s; allowed (0, %.10g] %s", a,
                     *i + 1 < argc ? argv[*i + 1] : "(nothing)", unit,
                     number ? "out of range" : "not a number", hi, unit);
            return -1;
        }
        if (memory)
            sb->max_memory = (size_t)(v * 1048576.0);
        else
            sb->max_time = v;
        (*i)++;
        return 1;
    }
    if (strcmp(a, "--sandbox") == 0) {
        sb->on = 1;
        return 1;
    }
    return 0;
}

void cpl_sandbox_defaults(cpl_sandbox *sb)
{
    memset(sb, 0, sizeof *sb);
    sb->max_memory = (size_t)CPL_SANDBOX_MEMORY_MIB << 20;
    sb->max_time = CPL_SANDBOX_TIME_S;
    const char *force = getenv("COLDPREP_SANDBOX");
    sb->on = force != NULL && strcmp(force, "1") == 0;
}

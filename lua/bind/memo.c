/*
 * The per-state memo of memo.h: a registry table mapping the key doubles (as a byte string,
 * so that equal means bit for bit equal) to the result doubles (as a byte string), with its
 * size and an enabled flag in a second registry table, and a third table of the bindings'
 * cache objects (memo.h).
 */
#include <lauxlib.h>
#include <string.h>

#include "memo.h"

static const char MEMO[] = "coldprep.memo";
static const char STATE[] = "coldprep.memo.state";
static const char OBJECTS[] = "coldprep.memo.objects";
enum { MEMO_MAX = 256 }; /* distinct inputs kept; a sweep's fixed inputs need a few */

/* Push the state table {enabled, size}, creating it (enabled) on first use. */
static void push_state(lua_State *L)
{
    if (luaL_getsubtable(L, LUA_REGISTRYINDEX, STATE) == 0) {
        lua_pushboolean(L, 1);
        lua_setfield(L, -2, "enabled");
        lua_pushinteger(L, 0);
        lua_setfield(L, -2, "size");
    }
}

int cpl_memo_enabled(lua_State *L)
{
    push_state(L);
    lua_getfield(L, -1, "enabled");
    int on = lua_toboolean(L, -1);
    lua_pop(L, 2);
    return on;
}

int cpl_memo_get(lua_State *L, const double *key, size_t nkey, double *out, size_t nout)
{
    if (!cpl_memo_enabled(L))
        return 0;
    luaL_getsubtable(L, LUA_REGISTRYINDEX, MEMO);
    lua_pushlstring(L, (const char *)key, nkey * sizeof *key);
    lua_rawget(L, -2);
    size_t len = 0;
    const char *v = lua_type(L, -1) == LUA_TSTRING ? lua_tolstring(L, -1, &len) : NULL;
    int hit = v && len == nout * sizeof *out;
    if (hit)
        memcpy(out, v, len);
    lua_pop(L, 2);
    return hit;
}

void cpl_memo_put(lua_State *L, const double *key, size_t nkey, const double *out, size_t nout)
{
    if (!cpl_memo_enabled(L))
        return;
    push_state(L);
    lua_getfield(L, -1, "size");
    lua_Integer size = lua_tointeger(L, -1);
    lua_pop(L, 1);
    if (size >= MEMO_MAX) { /* start afresh rather than grow without bound */
        lua_newtable(L);
        lua_setfield(L, LUA_REGISTRYINDEX, MEMO);
        size = 0;
    }
    luaL_getsubtable(L, LUA_REGISTRYINDEX, MEMO);
    lua_pushlstring(L, (const char *)key, nkey * sizeof *key);
    lua_pushlstring(L, (const char *)out, nout * sizeof *out);
    lua_rawset(L, -3);
    lua_pop(L, 1);
    lua_pushinteger(L, size + 1);
    lua_setfield(L, -2, "size");
    lua_pop(L, 1);
}

void cpl_memo_enable(lua_State *L, int on)
{
    push_state(L);
    lua_pushboolean(L, on);
    lua_setfield(L, -2, "enabled");
    if (!on) {
        lua_pushinteger(L, 0);
        lua_setfield(L, -2, "size");
        lua_newtable(L);
        lua_setfield(L, LUA_REGISTRYINDEX, MEMO);
        lua_pushnil(L);
        lua_setfield(L, LUA_REGISTRYINDEX, OBJECTS);
    }
    lua_pop(L, 1);
}

void cpl_memo_objects(lua_State *L)
{
    luaL_getsubtable(L, LUA_REGISTRYINDEX, OBJECTS);
}

lua_Integer cpl_memo_size(lua_State *L)
{
    push_state(L);
    lua_getfield(L, -1, "size");
    lua_Integer n = lua_tointeger(L, -1);
    lua_pop(L, 2);
    return n;
}

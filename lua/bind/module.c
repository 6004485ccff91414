/*
 * luaopen_coldprep: assembles the `coldprep` Lua module.  It opens every C binding
 * (lua/bind/bind_NAME.c, listed at build time in bindings_list.h) into a field NAME of the
 * module table (and the array type cp.reals, reals.h), makes the embedded Lua-side library
 * requirable ("coldprep.plan", ...; a loader already in package.preload is kept, so a
 * developer or a test can run modules from their source files), publishes the table as
 * package.loaded.coldprep so those modules can require it while it is being built, then
 * runs "coldprep.library", which completes the table.
 */
#include <math.h>

#include <lauxlib.h>
#include <lua.h>

#include "args.h"
#include "coldprep/status.h"
#include "embedded_lua.h"
#include "fileio.h"
#include "help.h"
#include "modpath.h"
#include "reals.h"

#include <string.h>

#define CPL_BINDING(name) int cpl_open_##name(lua_State *L);
#include "bindings_list.h"
#undef CPL_BINDING

int luaopen_coldprep(lua_State *L);

/* package.preload loader for an embedded chunk: upvalue 1 is its index.  The chunks are
 * precompiled bytecode (or source when the build had no luac5.4); both are ours, built
 * into the binary, never read from outside. */
static int load_embedded(lua_State *L)
{
    const cpl_embedded_chunk *c = &cpl_embedded_chunks[lua_tointeger(L, lua_upvalueindex(1))];
    if (luaL_loadbufferx(L, c->bytes, c->size, c->chunkname, "bt") != LUA_OK)
        return lua_error(L);
    lua_pushstring(L, c->module);
    lua_call(L, 1, 1);
    return 1;
}

/* package.preload loader of "coldprep.render", the C side of cp.plot: the plot module
 * (plot_module.c with PLplot), opened on first use.  It lies beside the Lua C module, in
 * the build tree's luamod/ beside the executable, or (installed) in the Lua C module
 * directory, CPL_BIN_TO_LUA_CMOD from the executable's. */
static int load_plot(lua_State *L)
{
    static const char *const dirs[] = {".", "luamod", CPL_BIN_TO_LUA_CMOD, NULL};
    char err[1536];
    void *p = cpl_module_function(dirs, "coldprep_plot.so", "luaopen_coldprep_plot", err,
                                  sizeof err);
    if (!p)
        return luaL_error(L, "plot: %s", err);
    lua_CFunction open;
    memcpy(&open, &p, sizeof open); /* POSIX: dlsym's pointer is the function's */
    lua_pushcfunction(L, open);
    lua_call(L, 0, 1);
    return 1;
}

/* cp.set_help(value, text) and cp.get_help(value): the help registry, plumbing for the
 * library's Lua files (help() leaves them out of its listing); a user who calls one with
 * the wrong arguments gets a house error naming the argument. */
static int l_set_help(lua_State *L)
{
    if (lua_isnoneornil(L, 1) || (lua_type(L, 1) == LUA_TNUMBER && isnan(lua_tonumber(L, 1))))
        return cpl_error(L, "cp.set_help", "argument 1 (the function or table to document) "
                         "must not be %s", lua_isnoneornil(L, 1) ? "nil" : "NaN");
    if (lua_type(L, 2) != LUA_TSTRING)
        return cpl_error(L, "cp.set_help", "argument 2 'text' must be a string (the help "
                         "text), got %s", luaL_typename(L, 2));
    cpl_set_help(L, 1, lua_tostring(L, 2));
    return 0;
}

static int l_get_help(lua_State *L)
{
    if (lua_isnoneornil(L, 1))
        return cpl_error(L, "cp.get_help", "argument 1 (the function or table whose help "
                         "to return) must not be nil");
    cpl_push_help_table(L);
    lua_pushvalue(L, 1);
    lua_gettable(L, -2);
    return 1;
}

int luaopen_coldprep(lua_State *L)
{
    cp_init();
    lua_newtable(L);
#define CPL_BINDING(name)          \
    cpl_open_##name(L);            \
    lua_setfield(L, -2, #name);
#include "bindings_list.h"
#undef CPL_BINDING
    cpl_open_reals(L);
    lua_setfield(L, -2, "reals");
    lua_pushstring(L, cp_version());
    lua_setfield(L, -2, "version");
    lua_pushcfunction(L, l_set_help);
    lua_setfield(L, -2, "set_help");
    lua_pushcfunction(L, l_get_help);
    lua_setfield(L, -2, "get_help");

    luaL_getsubtable(L, LUA_REGISTRYINDEX, LUA_PRELOAD_TABLE);
    for (lua_Integer i = 0; cpl_embedded_chunks[i].module; i++) {
        if (lua_getfield(L, -1, cpl_embedded_chunks[i].module) == LUA_TNIL) {
            lua_pushinteger(L, i);
            lua_pushcclosure(L, load_embedded, 1);
            lua_setfield(L, -3, cpl_embedded_chunks[i].module);
        }
        lua_pop(L, 1);
    }
    lua_pushcfunction(L, cpl_open_files);
    lua_setfield(L, -2, "coldprep.files");
    lua_pushcfunction(L, load_plot);
    lua_setfield(L, -2, "coldprep.render");
    lua_pop(L, 1);

    luaL_getsubtable(L, LUA_REGISTRYINDEX, LUA_LOADED_TABLE);
    lua_pushvalue(L, -2);
    lua_setfield(L, -2, "coldprep");
    lua_pop(L, 1);

    lua_getglobal(L, "require");
    lua_pushliteral(L, "coldprep.library");
    lua_call(L, 1, 1); /* init returns nothing useful; it extends the module table */
    lua_pop(L, 1);
    return 1;
}

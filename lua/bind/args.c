/*
 * The named-argument readers shared by every binding (see args.h).  Errors are raised
 * with the function name first so a user sees at once which call was wrong.
 */
#include "args.h"
#include "coldprep/limits.h"
#include "coldprep/names.h"
#include "reals.h"

#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <string.h>

int cpl_error(lua_State *L, const char *fname, const char *fmt, ...)
{
    char msg[512];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(msg, sizeof msg, fmt, ap);
    va_end(ap);
    return luaL_error(L, "%s: %s", fname, msg);
}

int cpl_raise(lua_State *L, const cp_error *err)
{
    if (err->status == CP_ETOOLONG)
        return luaL_error(L, "%s; or pass allow_long = true to run it anyway (Ctrl-C stops it)",
                          err->message);
    return luaL_error(L, "%s", err->message);
}

double cpl_work_limit(lua_State *L, int arg, const char *fname)
{
    return cpl_opt_boolean(L, arg, fname, "allow_long", 0) ? INFINITY : CP_WORK_LIMIT_S;
}

/* A non-finite number as text, one spelling on every platform ("NaN", "inf", "-inf"). */
static const char *nonfinite_text(double v)
{
    return isnan(v) ? "NaN" : v > 0 ? "inf" : "-inf";
}

/* What is wrong with a non-finite number, in the house wording of core/check.c. */
static const char *nonfinite_problem(double v)
{
    return isnan(v) ? "not a number" : "infinite";
}

/* Push the set {key = position} of a NULL-terminated key list, built once per list and kept
 * in the registry under the list's address (the lists are static arrays), so that
 * checking a key costs one table lookup instead of a string comparison per known key. */
static void push_key_set(lua_State *L, const char *const known[])
{
    if (lua_rawgetp(L, LUA_REGISTRYINDEX, known) == LUA_TTABLE)
        return;
    lua_pop(L, 1);
    lua_newtable(L);
    for (int i = 0; known[i]; i++) {
        lua_pushinteger(L, i); /* the key's position in the list */
        lua_setfield(L, -2, known[i]);
    }
    lua_pushvalue(L, -1);
    lua_rawsetp(L, LUA_REGISTRYINDEX, known);
}

/* Raise "fname[: what]: unknown <noun> 'key' (did you mean 'closest'?)", or, when no
 * known key is close, "(known: a, b, ...)". */
static int unknown_key(lua_State *L, const char *fname, const char *what, const char *key,
                       const char *const known[])
{
    size_t n = 0;
    while (known[n])
        n++;
    const char *best = cp_closest_name(key, known, n);
    const char *sep = what ? ": " : "", *w = what ? what : "";
    const char *noun = what ? "field" : "argument";
    if (best)
        return luaL_error(L, "%s%s%s: unknown %s '%s' (did you mean '%s'?)", fname, sep, w, noun,
                          key, best);
    if (n == 0)
        return luaL_error(L, "%s%s%s: unknown %s '%s' (none are taken)", fname, sep, w, noun,
                          key);
    luaL_Buffer b;
    luaL_buffinit(L, &b);
    for (size_t i = 0; i < n; i++) {
        if (i > 0)
            luaL_addstring(&b, ", ");
        luaL_addstring(&b, known[i]);
    }
    luaL_pushresult(&b);
    return luaL_error(L, "%s%s%s: unknown %s '%s' (known: %s)", fname, sep, w, noun, key,
                      lua_tostring(L, -1));
}

static void check_keys(lua_State *L, int arg, const char *fname, const char *what,
                       const char *const known[])
{
    arg = lua_absindex(L, arg);
    if (!lua_istable(L, arg)) {
        if (what)
            cpl_error(L, fname, "%s must be a table, got %s", what, luaL_typename(L, arg));
        cpl_error(L, fname, "expects one table of named arguments, got %s (call it as %s{...})",
                  luaL_typename(L, arg), fname);
    }
    push_key_set(L, known);
    int set = lua_gettop(L);
    lua_pushnil(L);
    while (lua_next(L, arg)) {
        lua_pop(L, 1);
        if (lua_type(L, -1) != LUA_TSTRING)
            cpl_error(L, fname, "%s%skeys must be names, got a %s key", what ? what : "argument ",
                      what ? " " : "", luaL_typename(L, -1));
        lua_pushvalue(L, -1);
        int found = lua_rawget(L, set) != LUA_TNIL;
        lua_pop(L, 1);
        if (!found)
            unknown_key(L, fname, what, lua_tostring(L, -1), known);
    }
    lua_pop(L, 1); /* the key set */
}

void cpl_check_args(lua_State *L, int arg, const char *fname, const char *const known[])
{
    check_keys(L, arg, fname, NULL, known);
}

void cpl_read_fields(lua_State *L, int idx, const char *fname, const char *what,
                     const char *const known[], int nnum, const char *const units[],
                     double values[])
{
    idx = lua_absindex(L, idx);
    if (!lua_istable(L, idx))
        cpl_error(L, fname, "%s must be a table, got %s", what, luaL_typename(L, idx));
    for (int i = 0; i < nnum; i++)
        values[i] = NAN;
    push_key_set(L, known);
    int set = lua_gettop(L);
    lua_pushnil(L);
    while (lua_next(L, idx)) { /* key at -2, value at -1 */
        if (lua_type(L, -2) != LUA_TSTRING)
            cpl_error(L, fname, "%s keys must be names, got a %s key", what,
                      luaL_typename(L, -2));
        lua_pushvalue(L, -2);
        int isnum = 0;
        lua_rawget(L, set);
        lua_Integer i = lua_tointegerx(L, -1, &isnum);
        lua_pop(L, 1);
        if (!isnum)
            unknown_key(L, fname, what, lua_tostring(L, -2), known);
        if (i < nnum) {
            const char *key = known[i], *unit = units[i];
            if (lua_type(L, -1) != LUA_TNUMBER)
                cpl_error(L, fname, "%s field '%s' must be a number (%s), got %s", what, key,
                          unit, luaL_typename(L, -1));
            values[i] = lua_tonumber(L, -1);
            if (!isfinite(values[i]))
                cpl_error(L, fname, "%s %s %s %s is %s; allowed finite values (%s)", what, key,
                          nonfinite_text(values[i]), unit, nonfinite_problem(values[i]), unit);
        }
        lua_pop(L, 1);
    }
    lua_pop(L, 1); /* the key set */
}

int cpl_has(lua_State *L, int arg, const char *key)
{
    int t = lua_getfield(L, arg, key);
    lua_pop(L, 1);
    return t != LUA_TNIL;
}

static double to_finite(lua_State *L, const char *fname, const char *key, const char *unit)
{
    const char *u = (unit && unit[0]) ? unit : "dimensionless";
    if (!lua_isnumber(L, -1) || lua_type(L, -1) == LUA_TSTRING)
        cpl_error(L, fname, "argument '%s' must be a number (%s), got %s", key, u,
                  luaL_typename(L, -1));
    double v = lua_tonumber(L, -1);
    if (!isfinite(v))
        cpl_error(L, fname, "%s %s %s is %s; allowed finite values (%s)", key,
                  nonfinite_text(v), u, nonfinite_problem(v), u);
    return v;
}

double cpl_number(lua_State *L, int arg, const char *fname, const char *key, const char *unit)
{
    if (lua_getfield(L, arg, key) == LUA_TNIL)
        cpl_error(L, fname, "missing argument '%s' (%s)", key,
                  (unit && unit[0]) ? unit : "dimensionless");
    double v = to_finite(L, fname, key, unit);
    lua_pop(L, 1);
    return v;
}

double cpl_opt_number(lua_State *L, int arg, const char *fname, const char *key,
                      const char *unit, double dflt)
{
    if (lua_getfield(L, arg, key) == LUA_TNIL) {
        lua_pop(L, 1);
        return dflt;
    }
    double v = to_finite(L, fname, key, unit);
    lua_pop(L, 1);
    return v;
}

long cpl_opt_integer(lua_State *L, int arg, const char *fname, const char *key, long dflt,
                     long lo, long hi)
{
    if (lua_getfield(L, arg, key) == LUA_TNIL) {
        lua_pop(L, 1);
        return dflt;
    }
    int isint = 0;
    lua_Integer v = lua_tointegerx(L, -1, &isint);
    if (!isint || lua_type(L, -1) != LUA_TNUMBER)
        cpl_error(L, fname, "argument '%s' must be an integer in [%ld, %ld], got %s", key, lo,
                  hi, luaL_tolstring(L, -1, NULL));
    if (v < lo || v > hi)
        cpl_error(L, fname, "%s %lld is out of range; allowed [%ld, %ld]", key, (long long)v,
                  lo, hi);
    lua_pop(L, 1);
    return (long)v;
}

int cpl_opt_boolean(lua_State *L, int arg, const char *fname, const char *key, int dflt)
{
    int t = lua_getfield(L, arg, key);
    if (t == LUA_TNIL) {
        lua_pop(L, 1);
        return dflt;
    }
    if (t != LUA_TBOOLEAN)
        cpl_error(L, fname, "argument '%s' must be true or false, got %s", key,
                  luaL_typename(L, -1));
    int v = lua_toboolean(L, -1);
    lua_pop(L, 1);
    return v;
}

const char *cpl_opt_string(lua_State *L, int arg, const char *fname, const char *key,
                           const char *dflt)
{
    int t = lua_getfield(L, arg, key);
    if (t == LUA_TNIL) {
        lua_pop(L, 1);
        return dflt;
    }
    if (t != LUA_TSTRING)
        cpl_error(L, fname, "argument '%s' must be a string, got %s", key, luaL_typename(L, -1));
    const char *s = lua_tostring(L, -1);
    lua_pop(L, 1); /* the string stays alive: the table still references it */
    return s;
}

int cpl_option(lua_State *L, int arg, const char *fname, const char *key,
               const char *const options[], const char *dflt)
{
    const char *s = cpl_opt_string(L, arg, fname, key, dflt);
    if (s) {
        for (int i = 0; options[i]; i++)
            if (strcmp(s, options[i]) == 0)
                return i;
    }
    luaL_Buffer b;
    luaL_buffinit(L, &b);
    for (int i = 0; options[i]; i++) {
        if (i)
            luaL_addstring(&b, ", ");
        luaL_addchar(&b, '"');
        luaL_addstring(&b, options[i]);
        luaL_addchar(&b, '"');
    }
    luaL_pushresult(&b);
    if (!s)
        return cpl_error(L, fname, "missing argument '%s'; allowed %s", key,
                         lua_tostring(L, -1));
    return cpl_error(L, fname, "%s \"%s\" is not allowed; allowed %s", key, s,
                     lua_tostring(L, -1));
}

const double *cpl_number_array(lua_State *L, int arg, const char *fname, const char *key,
                               const char *unit, size_t min_len, size_t *n)
{
    arg = lua_absindex(L, arg);
    const char *u = (unit && unit[0]) ? unit : "dimensionless";
    int t = lua_getfield(L, arg, key);
    size_t len;
    const double *r = cpl_to_reals(L, -1, &len);
    if (r) { /* finite by construction: used in place, the reals stays on the stack */
        if (len < min_len)
            cpl_error(L, fname, "argument '%s' has %zu values; at least %zu are needed", key,
                      len, min_len);
        *n = len;
        return r;
    }
    if (t != LUA_TTABLE)
        cpl_error(L, fname, "argument '%s' must be an array of numbers (%s), a table or a "
                  "reals, got %s", key, u, luaL_typename(L, -1));
    lua_Integer tlen = luaL_len(L, -1);
    if (tlen < (lua_Integer)min_len)
        cpl_error(L, fname, "argument '%s' has %lld values; at least %zu are needed", key,
                  (long long)tlen, min_len);
    double *v = lua_newuserdatauv(L, (size_t)(tlen > 0 ? tlen : 1) * sizeof *v, 0);
    for (lua_Integer i = 1; i <= tlen; i++) {
        lua_geti(L, -2, i);
        if (lua_type(L, -1) != LUA_TNUMBER)
            cpl_error(L, fname, "argument '%s'[%lld] must be a number (%s), got %s", key,
                      (long long)i, u, luaL_typename(L, -1));
        if (!isfinite(lua_tonumber(L, -1)))
            cpl_error(L, fname, "%s[%lld] %s %s is %s; allowed finite values (%s)", key,
                      (long long)i, nonfinite_text(lua_tonumber(L, -1)), u,
                      nonfinite_problem(lua_tonumber(L, -1)), u);
        v[i - 1] = lua_tonumber(L, -1);
        lua_pop(L, 1);
    }
    lua_remove(L, -2); /* the source table; the userdata stays on top */
    *n = (size_t)tlen;
    return v;
}

int cpl_is_reals_field(lua_State *L, int arg, const char *key)
{
    size_t n;
    lua_getfield(L, arg, key);
    int is = cpl_to_reals(L, -1, &n) != NULL;
    lua_pop(L, 1);
    return is;
}

/* The range the core models accept for trap frequencies (coldprep/limits.h), checked here
 * so the message names the key the caller gave (e.g. omega_bar), not the axis value the
 * core receives. */
static const double TRAP_OMEGA_MIN = CP_MIN_TRAP_OMEGA, TRAP_OMEGA_MAX = CP_MAX_TRAP_OMEGA;

static double trap_omega(lua_State *L, int arg, const char *fname, const char *key)
{
    double w = cpl_number(L, arg, fname, key, "rad/s");
    if (!(w >= TRAP_OMEGA_MIN && w <= TRAP_OMEGA_MAX))
        cpl_error(L, fname, "%s %g rad/s is out of range; allowed [%g, %g] rad/s", key, w,
                  TRAP_OMEGA_MIN, TRAP_OMEGA_MAX);
    return w;
}

void cpl_trap_frequencies(lua_State *L, int arg, const char *fname, const char *bar_key,
                          const char *const axes[3], double omega[3])
{
    int has_bar = cpl_has(L, arg, bar_key), n_axes = 0;
    for (int i = 0; i < 3; i++)
        n_axes += cpl_has(L, arg, axes[i]);
    if (has_bar && n_axes > 0)
        cpl_error(L, fname, "give either '%s' or '%s', '%s', '%s' (rad/s), not both", bar_key,
                  axes[0], axes[1], axes[2]);
    if (!has_bar && n_axes != 3)
        cpl_error(L, fname, "missing trap frequency: give '%s' or all three of '%s', '%s', "
                  "'%s' (rad/s)", bar_key, axes[0], axes[1], axes[2]);
    for (int i = 0; i < 3; i++)
        omega[i] = trap_omega(L, arg, fname, has_bar ? bar_key : axes[i]);
}

void cpl_set_number(lua_State *L, const char *key, double value)
{
    lua_pushnumber(L, value);
    lua_setfield(L, -2, key);
}

void cpl_set_string(lua_State *L, const char *key, const char *value)
{
    lua_pushstring(L, value);
    lua_setfield(L, -2, key);
}

void cpl_set_boolean(lua_State *L, const char *key, int value)
{
    lua_pushboolean(L, value);
    lua_setfield(L, -2, key);
}

void cpl_set_flags(lua_State *L, unsigned flags, const char *const names[])
{
    lua_newtable(L);
    lua_Integer n = 0;
    for (unsigned i = 0; names[i]; i++)
        if (flags & (1u << i)) {
            lua_pushstring(L, names[i]);
            lua_rawseti(L, -2, ++n);
        }
    lua_setfield(L, -2, "flags");
}

void cpl_set_integer(lua_State *L, const char *key, lua_Integer value)
{
    lua_pushinteger(L, value);
    lua_setfield(L, -2, key);
}

void cpl_push_array(lua_State *L, const double *values, size_t n)
{
    lua_createtable(L, (int)n, 0);
    for (size_t i = 0; i < n; i++) {
        lua_pushnumber(L, values[i]);
        lua_rawseti(L, -2, (lua_Integer)i + 1);
    }
}

const cp_cancel_flag *cpl_cancel_flag(lua_State *L)
{
    lua_getfield(L, LUA_REGISTRYINDEX, CPL_CANCEL_KEY);
    const cp_cancel_flag *flag = lua_touserdata(L, -1);
    lua_pop(L, 1);
    return flag;
}

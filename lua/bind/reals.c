/*
 * cp.reals (reals.h): the array type of batch calls.  A reals is one userdata block,
 * {n, v[0..n-1]}, with a protected metatable: r[i] reads (nil outside 1..#r, so ipairs
 * stops), r[i] = x writes a finite number inside 1..#r, #r is the length, pairs and ipairs
 * walk the values in order, r:table() and r:copy() convert.  The constructors are
 * cp.reals.from{...} (a Lua sequence, or another reals), cp.reals.linear and
 * cp.reals.geometric (evenly spaced on a linear or a logarithmic scale, ending exactly on
 * both ends, the spacing of cp.sweep's axes) and cp.reals.filled.
 */
#include "reals.h"

#include <lauxlib.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>

#include "args.h"
#include "help.h"

typedef struct reals {
    size_t n;
    double v[]; /* n finite values */
} reals;

static reals *check_reals(lua_State *L, int idx)
{
    return luaL_checkudata(L, idx, CPL_REALS_TYPE);
}

const double *cpl_to_reals(lua_State *L, int idx, size_t *n)
{
    reals *r = luaL_testudata(L, idx, CPL_REALS_TYPE);
    if (!r)
        return NULL;
    *n = r->n;
    return r->v;
}

double *cpl_new_reals(lua_State *L, size_t n)
{
    if (n > CPL_REALS_MAX)
        cpl_error(L, "reals", "length %zu is out of range; allowed [0, %d]", n, CPL_REALS_MAX);
    reals *r = lua_newuserdatauv(L, sizeof *r + n * sizeof(double), 0);
    r->n = n;
    luaL_setmetatable(L, CPL_REALS_TYPE);
    return r->v;
}

void cpl_push_reals(lua_State *L, const double *values, size_t n)
{
    double *v = cpl_new_reals(L, n);
    if (n)
        memcpy(v, values, n * sizeof *v);
}

void cpl_push_numbers(lua_State *L, const double *values, size_t n, int as_reals)
{
    if (as_reals)
        cpl_push_reals(L, values, n);
    else
        cpl_push_array(L, values, n);
}

/* The problem with a non-finite number, in the house wording. */
static int not_finite(lua_State *L, const char *ctx, lua_Integer i, double x)
{
    return cpl_error(L, ctx, "element %lld %s is %s; allowed finite values", (long long)i,
                     isnan(x) ? "NaN" : x > 0 ? "inf" : "-inf",
                     isnan(x) ? "not a number" : "infinite");
}

/* ---- the metatable -------------------------------------------------------------------- */

/* r[k]: the value at integer k in 1..#r, nil at other integers, a method at a name. */
static int m_index(lua_State *L)
{
    reals *r = check_reals(L, 1); /* checked: debug.getmetatable reaches these functions */
    int isint = 0;
    lua_Integer k = lua_tointegerx(L, 2, &isint);
    if (isint && lua_type(L, 2) == LUA_TNUMBER) {
        if (k >= 1 && (lua_Unsigned)k <= r->n)
            lua_pushnumber(L, r->v[k - 1]);
        else
            lua_pushnil(L);
        return 1;
    }
    lua_pushvalue(L, 2);
    lua_rawget(L, lua_upvalueindex(1)); /* the methods */
    return 1;
}

static int m_newindex(lua_State *L)
{
    reals *r = check_reals(L, 1);
    int isint = 0;
    lua_Integer k = lua_tointegerx(L, 2, &isint);
    if (!isint || lua_type(L, 2) != LUA_TNUMBER)
        return cpl_error(L, "reals", "index must be an integer in [1, %zu], got %s", r->n,
                         luaL_tolstring(L, 2, NULL));
    if (k < 1 || (lua_Unsigned)k > r->n)
        return cpl_error(L, "reals", "index %lld is out of range; allowed [1, %zu] (a reals "
                         "keeps its length)", (long long)k, r->n);
    if (lua_type(L, 3) != LUA_TNUMBER)
        return cpl_error(L, "reals", "element %lld must be a number, got %s", (long long)k,
                         luaL_typename(L, 3));
    double x = lua_tonumber(L, 3);
    if (!isfinite(x))
        return not_finite(L, "reals", k, x);
    r->v[k - 1] = x;
    return 0;
}

static int m_len(lua_State *L)
{
    lua_pushinteger(L, (lua_Integer)check_reals(L, 1)->n);
    return 1;
}

/* The iterator of pairs(r): (r, i) -> i + 1, r[i + 1], or nothing past the end. */
static int iterate(lua_State *L)
{
    reals *r = check_reals(L, 1);
    lua_Integer i = luaL_checkinteger(L, 2);
    if (i < 0 || (lua_Unsigned)i >= r->n)
        return 0;
    lua_pushinteger(L, i + 1);
    lua_pushnumber(L, r->v[i]);
    return 2;
}

static int m_pairs(lua_State *L)
{
    check_reals(L, 1);
    lua_pushcfunction(L, iterate);
    lua_pushvalue(L, 1);
    lua_pushinteger(L, 0);
    return 3;
}

/* "reals(5): 1, 2, 3, 4, 5", the first and last values of a long one around "...". */
static int m_tostring(lua_State *L)
{
    reals *r = check_reals(L, 1);
    luaL_Buffer b;
    char num[40];
    luaL_buffinit(L, &b);
    snprintf(num, sizeof num, "reals(%zu)", r->n);
    luaL_addstring(&b, num);
    for (size_t i = 0; i < r->n; i++) {
        if (r->n > 10 && i == 5) {
            luaL_addstring(&b, ", ...");
            i = r->n - 3;
        }
        snprintf(num, sizeof num, "%s%.10g", i ? ", " : ": ", r->v[i]);
        luaL_addstring(&b, num);
    }
    luaL_pushresult(&b);
    return 1;
}

static int r_table(lua_State *L)
{
    reals *r = check_reals(L, 1);
    cpl_push_array(L, r->v, r->n);
    return 1;
}

static int r_copy(lua_State *L)
{
    reals *r = check_reals(L, 1);
    cpl_push_reals(L, r->v, r->n);
    return 1;
}

/* ---- constructors --------------------------------------------------------------------- */

static int l_from(lua_State *L)
{
    static const char ctx[] = "reals.from";
    size_t n;
    const double *src = cpl_to_reals(L, 1, &n);
    if (src) {
        cpl_push_reals(L, src, n);
        return 1;
    }
    if (!lua_istable(L, 1))
        return cpl_error(L, ctx, "expects a sequence of numbers or a reals, got %s",
                         luaL_typename(L, 1));
    lua_Integer len = luaL_len(L, 1);
    if (len < 0 || len > CPL_REALS_MAX)
        return cpl_error(L, ctx, "length %lld is out of range; allowed [0, %d]", (long long)len,
                         CPL_REALS_MAX);
    double *v = cpl_new_reals(L, (size_t)len);
    for (lua_Integer i = 1; i <= len; i++) {
        if (lua_geti(L, 1, i) != LUA_TNUMBER)
            return cpl_error(L, ctx, "element %lld must be a number, got %s", (long long)i,
                             luaL_typename(L, -1));
        double x = lua_tonumber(L, -1);
        if (!isfinite(x))
            return not_finite(L, ctx, i, x);
        v[i - 1] = x;
        lua_pop(L, 1);
    }
    return 1;
}

/* The count argument of the spaced constructors. */
static size_t read_count(lua_State *L, const char *fname, long lo)
{
    if (!cpl_has(L, 1, "count"))
        cpl_error(L, fname, "missing argument 'count' (an integer in [%ld, %d])", lo,
                  CPL_REALS_MAX);
    return (size_t)cpl_opt_integer(L, 1, fname, "count", lo, lo, CPL_REALS_MAX);
}

static int l_linear(lua_State *L)
{
    static const char fname[] = "reals.linear";
    static const char *const keys[] = {"from", "to", "count", NULL};
    cpl_check_args(L, 1, fname, keys);
    double a = cpl_number(L, 1, fname, "from", ""), b = cpl_number(L, 1, fname, "to", "");
    size_t n = read_count(L, fname, 2);
    double *v = cpl_new_reals(L, n), d = b - a, last = (double)(n - 1);
    for (size_t i = 0; i < n; i++) { /* the cp.sweep axis formula; the other one if b - a
                                        overflows */
        double t = (double)i / last;
        v[i] = isfinite(d) ? a + d * (double)i / last : a * (1.0 - t) + b * t;
    }
    v[n - 1] = b;
    return 1;
}

static int l_geometric(lua_State *L)
{
    static const char fname[] = "reals.geometric";
    static const char *const keys[] = {"from", "to", "count", NULL};
    cpl_check_args(L, 1, fname, keys);
    double a = cpl_number(L, 1, fname, "from", ""), b = cpl_number(L, 1, fname, "to", "");
    if (a == 0.0)
        return cpl_error(L, fname, "from 0 is out of range; allowed non-zero values");
    if (b == 0.0 || (a < 0.0) != (b < 0.0))
        return cpl_error(L, fname, "to %g is out of range; allowed %s values (the sign of from "
                         "%g)", b, a < 0.0 ? "negative" : "positive", a);
    size_t n = read_count(L, fname, 2);
    double *v = cpl_new_reals(L, n), ratio = b / a, last = (double)(n - 1);
    double la = log(fabs(a)), lb = log(fabs(b)), sign = a < 0.0 ? -1.0 : 1.0;
    for (size_t i = 0; i < n; i++) { /* the cp.sweep axis formula; logarithms if b/a
                                        overflows or underflows */
        double t = (double)i / last;
        v[i] = (isfinite(ratio) && ratio != 0.0) ? a * pow(ratio, t)
                                                 : sign * exp(la * (1.0 - t) + lb * t);
    }
    v[0] = a;
    v[n - 1] = b;
    return 1;
}

static int l_filled(lua_State *L)
{
    static const char fname[] = "reals.filled";
    static const char *const keys[] = {"count", "value", NULL};
    cpl_check_args(L, 1, fname, keys);
    size_t n = read_count(L, fname, 0);
    double x = cpl_opt_number(L, 1, fname, "value", "", 0.0);
    double *v = cpl_new_reals(L, n);
    for (size_t i = 0; i < n; i++)
        v[i] = x;
    return 1;
}

static int l_is(lua_State *L)
{
    lua_pushboolean(L, luaL_testudata(L, 1, CPL_REALS_TYPE) != NULL);
    return 1;
}

static const cpl_function functions[] = {
    {"from", l_from,
     "reals.from{x1, x2, ...} or reals.from(r) -> reals\n"
     "A reals (an array of finite numbers for batch calls) holding a copy of a Lua sequence\n"
     "or of another reals.  r[i], #r, ipairs(r), pairs(r), r:table() (a Lua table),\n"
     "r:copy(); r[i] = x sets a finite number inside 1..#r.  Functions that take an array\n"
     "of numbers take a reals too, and then return their arrays as reals.  Example:\n"
     "  r = cp.reals.from{1, 2, 3}\n"
     "  print(#r, r[2], r:table()[3])"},
    {"linear", l_linear,
     "reals.linear{from, to, count} -> reals\n"
     "count (>= 2) values evenly spaced from `from` to `to`, both included (the spacing of a\n"
     "cp.sweep axis: from + (to - from) (j - 1)/(count - 1)).  Example:\n"
     "  cp.reals.linear{from = 0, to = 1, count = 5}[2]"},
    {"geometric", l_geometric,
     "reals.geometric{from, to, count} -> reals\n"
     "count (>= 2) values evenly spaced on a logarithmic scale from `from` to `to` (non-zero,\n"
     "one sign), both included: from (to/from)^((j - 1)/(count - 1)).  Example:\n"
     "  cp.reals.geometric{from = 1e-3, to = 1e3, count = 7}[4]"},
    {"filled", l_filled,
     "reals.filled{count [, value = 0]} -> reals\n"
     "count (>= 0) copies of value.  Example:\n"
     "  #cp.reals.filled{count = 1000, value = 1}"},
    {"is", l_is,
     "reals.is(x) -> boolean\n"
     "Whether x is a reals.  Example:\n"
     "  cp.reals.is(cp.reals.from{1}), cp.reals.is{1}"},
    {NULL, NULL, NULL}};

int cpl_open_reals(lua_State *L)
{
    if (luaL_newmetatable(L, CPL_REALS_TYPE)) {
        static const luaL_Reg meta[] = {{"__newindex", m_newindex}, {"__len", m_len},
                                        {"__pairs", m_pairs},       {"__tostring", m_tostring},
                                        {NULL, NULL}};
        luaL_setfuncs(L, meta, 0);
        static const luaL_Reg methods[] = {{"table", r_table}, {"copy", r_copy}, {NULL, NULL}};
        luaL_newlib(L, methods);
        lua_pushcclosure(L, m_index, 1);
        lua_setfield(L, -2, "__index");
        lua_pushliteral(L, CPL_REALS_TYPE);
        lua_setfield(L, -2, "__metatable"); /* getmetatable(r) cannot reach the invariants */
    }
    lua_pop(L, 1);
    lua_newtable(L);
    cpl_register(L, functions);
    return 1;
}

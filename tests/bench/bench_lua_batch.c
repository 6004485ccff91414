/*
 * Benchmark of batch calls from Lua (target: a 1e6-point call from Lua within 3x the C
 * kernel's time).  One program runs both, in the same process and run: the C function alone
 * on preallocated arrays, then the Lua call cp.feshbach.ramp_law (the cheapest kernel per
 * point, so the hardest case for the binding's overhead) and cp.lattice.bands, each with the
 * points in a cp.reals and in a Lua table.  Each figure is the best of several repeats in
 * CPU time (the machine is shared); the Lua results are compared bit for bit with the C ones.
 * Links the Lua bindings (bench_lua_*.c, tests/CMakeLists.txt).
 */
#include <lauxlib.h>
#include <lua.h>
#include <lualib.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "coldprep/consts.h"
#include "coldprep/feshbach.h"
#include "coldprep/lattice.h"
#include "coldprep/status.h"

int luaopen_coldprep(lua_State *L);

enum { N = 1000000, REPEATS = 20, NQ = 1000000, BANDS = 2, BAND_REPEATS = 3 };

/* CPU time of this thread: on a shared machine, time spent waiting for a core is not the
 * call's (the C and Lua figures are taken the same way). */
static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* The Lua side: globals `args` (arguments with the points as a reals) and `targs` (as a
 * table), and run(which) calling the function once. */
static const char LUA_SETUP[] =
    "cp = require 'coldprep'\n"
    "local n, nq = ...\n"
    "local rates = cp.reals.geometric{from = -1e-3, to = -1e3, count = n}\n"
    "local res = {b0 = 546.7e-4, width = -3.04e-4, abg = -187 * cp.consts.a0,\n"
    "             dmu = 2.3 * cp.consts.muB}\n"
    "local mol = {reduced_mass = 1e-25}\n"
    "fargs = {resonance = res, molecule = mol, density = 1e18, max_efficiency = 0.9,\n"
    "         ramp_rates = rates}\n"
    "ftargs = {resonance = res, molecule = mol, density = 1e18, max_efficiency = 0.9,\n"
    "          ramp_rates = rates:table()}\n"
    "local q = cp.reals.linear{from = -1, to = 1, count = nq}\n"
    "bargs = {depth_er = 8, bands = 2, quasimomenta = q}\n"
    "btargs = {depth_er = 8, bands = 2, quasimomenta = q:table()}\n"
    "rates_c, q_c = rates, q\n";

/* Time `expr` (a Lua expression) best of `reps`; leaves its last value in global `last`. */
static double time_lua(lua_State *L, const char *expr, int reps)
{
    char code[256];
    snprintf(code, sizeof code, "last = nil; return function() last = %s end", expr);
    if (luaL_dostring(L, code) != LUA_OK) {
        fprintf(stderr, "%s\n", lua_tostring(L, -1));
        exit(1);
    }
    double best = INFINITY;
    for (int r = 0; r < reps; r++) {
        lua_gc(L, LUA_GCCOLLECT);
        lua_pushvalue(L, -1);
        double t0 = now();
        if (lua_pcall(L, 0, 0, 0) != LUA_OK) {
            fprintf(stderr, "%s\n", lua_tostring(L, -1));
            exit(1);
        }
        best = fmin(best, now() - t0);
    }
    lua_pop(L, 1);
    return best;
}

/* The doubles of the reals or table that the Lua expression `expr` gives, compared bit for
 * bit with want[0..n-1]; the number that differ. */
static size_t mismatches(lua_State *L, const char *expr, const double *want, size_t n)
{
    char code[200];
    snprintf(code, sizeof code, "return %s", expr);
    if (luaL_dostring(L, code) != LUA_OK) {
        fprintf(stderr, "%s\n", lua_tostring(L, -1));
        exit(1);
    }
    size_t bad = 0;
    for (size_t i = 0; i < n; i++) {
        lua_geti(L, -1, (lua_Integer)i + 1);
        double v = lua_tonumber(L, -1);
        bad += memcmp(&v, &want[i], sizeof v) != 0;
        lua_pop(L, 1);
    }
    lua_pop(L, 1);
    return bad;
}

/* The band energies in global `last` (one row of BANDS per quasimomentum) compared bit for
 * bit with the C results e (the same layout), band by band through col (NQ doubles). */
static size_t band_mismatches(lua_State *L, const double *e, double *col)
{
    size_t bad = 0;
    for (int b = 0; b < BANDS; b++) {
        char expr[120];
        for (size_t i = 0; i < NQ; i++)
            col[i] = e[i * BANDS + (size_t)b];
        snprintf(expr, sizeof expr,
                 "setmetatable({}, {__index = function(_, i) return last[i][%d] end})", b + 1);
        bad += mismatches(L, expr, col, NQ);
    }
    return bad;
}

/* One line of figures: the C time, the Lua times (points in a reals, in a table) and their
 * ratios to C, whether the target (reals within 3x C, every value equal) is met. */
static void report(const char *what, double c, double t_reals, double t_table, size_t bad)
{
    printf("%s: C %.2f ms; Lua with a reals %.2f ms (%.2fx, target <= 3x) [%s]; Lua with a "
           "table %.2f ms (%.2fx); %zu values differ from C\n",
           what, 1e3 * c, 1e3 * t_reals, t_reals / c,
           t_reals <= 3 * c && bad == 0 ? "ok" : "NOT MET", 1e3 * t_table, t_table / c, bad);
}

/* The first n numbers of the Lua global `global` as a malloc'd C array (exits when out of
 * memory). */
static double *lua_doubles(lua_State *L, const char *global, size_t n)
{
    double *v = malloc(n * sizeof *v);
    if (!v)
        exit(1);
    lua_getglobal(L, global);
    for (size_t i = 0; i < n; i++) {
        lua_geti(L, -1, (lua_Integer)i + 1);
        v[i] = lua_tonumber(L, -1);
        lua_pop(L, 1);
    }
    lua_pop(L, 1);
    return v;
}

int main(void)
{
    lua_State *L = luaL_newstate();
    luaL_openlibs(L);
    luaL_requiref(L, "coldprep", luaopen_coldprep, 0);
    lua_pop(L, 1);
    if (luaL_loadstring(L, LUA_SETUP) != LUA_OK)
        return fprintf(stderr, "%s\n", lua_tostring(L, -1)), 1;
    lua_pushinteger(L, N);
    lua_pushinteger(L, NQ);
    if (lua_pcall(L, 2, 0, 0) != LUA_OK)
        return fprintf(stderr, "%s\n", lua_tostring(L, -1)), 1;

    /* ---- the Feshbach ramp-rate law: the C call as the binding makes it ---- */
    double *rates = lua_doubles(L, "rates_c", N), *eff = malloc(N * sizeof *eff);
    if (!eff)
        return 1;
    cp_feshbach_resonance r = {546.7e-4, -3.04e-4, -187.0 * CP_A0, 2.3 * CP_MUB, NAN};
    double alpha;
    cp_error err;
    if (cp_feshbach_alpha(1e-25, &alpha, &err) != CP_OK)
        return fprintf(stderr, "%s\n", err.message), 1;
    double coef = alpha * 1e18 * fabs(r.abg * r.width), c_best = INFINITY;
    for (int rep = 0; rep < REPEATS; rep++) {
        double t0 = now();
        if (cp_feshbach_ramp_law(coef, 0.9, rates, eff, N, &err) != CP_OK)
            return fprintf(stderr, "%s\n", err.message), 1;
        c_best = fmin(c_best, now() - t0);
    }
    double t_reals = time_lua(L, "cp.feshbach.ramp_law(fargs).efficiency", REPEATS);
    size_t bad = mismatches(L, "last", eff, N);
    double t_table = time_lua(L, "cp.feshbach.ramp_law(ftargs).efficiency", REPEATS);
    bad += mismatches(L, "last", eff, N);
    char what[64];
    snprintf(what, sizeof what, "feshbach.ramp_law, %d ramp rates", N);
    report(what, c_best, t_reals, t_table, bad);

    /* ---- band energies over quasimomenta ---- */
    double *q = lua_doubles(L, "q_c", NQ), *e = malloc((size_t)NQ * BANDS * sizeof *e);
    if (!e)
        return 1;
    int used;
    c_best = INFINITY;
    for (int rep = 0; rep < BAND_REPEATS; rep++) {
        double t0 = now();
        if (cp_lattice_band_energies(8.0, BANDS, 0, NQ, q, e, &used, &err) != CP_OK)
            return fprintf(stderr, "%s\n", err.message), 1;
        c_best = fmin(c_best, now() - t0);
    }
    t_reals = time_lua(L, "cp.lattice.bands(bargs).energies_er", BAND_REPEATS);
    double *col = malloc(NQ * sizeof *col);
    if (!col)
        return 1;
    bad = band_mismatches(L, e, col);
    t_table = time_lua(L, "cp.lattice.bands(btargs).energies_er", BAND_REPEATS);
    bad += band_mismatches(L, e, col);
    snprintf(what, sizeof what, "lattice.bands, %d quasimomenta x %d bands", NQ, BANDS);
    report(what, c_best, t_reals, t_table, bad);
    free(rates);
    free(eff);
    free(q);
    free(e);
    free(col);
    lua_close(L);
    return 0;
}

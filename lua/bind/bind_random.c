/*
 * Lua binding: coldprep.random, reproducible random numbers from GSL's MT19937 generator
 * (Matsumoto & Nishimura 1998) for Monte Carlo studies (cp.uncertainty).  A generator is
 * a userdata owning its gsl_rng (freed by __gc and __close); the same seed gives the same
 * sequence on every platform GSL supports.  Draws are written so that a zero width gives
 * the centre value exactly (mean + 0, median * exp(0), min + 0 * u).
 */
#include <gsl/gsl_randist.h>
#include <gsl/gsl_rng.h>
#include <lauxlib.h>
#include <lua.h>
#include <math.h>

#include "args.h"
#include "help.h"

int cpl_open_random(lua_State *L);

static const char GENERATOR[] = "coldprep.random.generator";

typedef struct generator {
    gsl_rng *rng;
} generator;

static gsl_rng *check_generator(lua_State *L)
{
    generator *g = luaL_checkudata(L, 1, GENERATOR);
    if (g->rng == NULL)
        luaL_error(L, "random: the generator has been closed");
    return g->rng;
}

static int l_generator(lua_State *L)
{
    static const char *const known[] = {"seed", NULL};
    cpl_check_args(L, 1, "random.generator", known);
    long seed = cpl_opt_integer(L, 1, "random.generator", "seed", 1, 0, 4294967295L);
    generator *g = lua_newuserdatauv(L, sizeof *g, 0);
    g->rng = NULL;
    luaL_setmetatable(L, GENERATOR);
    g->rng = gsl_rng_alloc(gsl_rng_mt19937);
    if (g->rng == NULL)
        return luaL_error(L, "random.generator: out of memory");
    gsl_rng_set(g->rng, (unsigned long)seed);
    return 1;
}

static int l_gc(lua_State *L)
{
    generator *g = luaL_checkudata(L, 1, GENERATOR);
    gsl_rng_free(g->rng);
    g->rng = NULL;
    return 0;
}

static int l_normal(lua_State *L)
{
    static const char *const known[] = {"mean", "sd", NULL};
    gsl_rng *r = check_generator(L);
    cpl_check_args(L, 2, "random.normal", known);
    double mean = cpl_number(L, 2, "random.normal", "mean", "");
    double sd = cpl_number(L, 2, "random.normal", "sd", "");
    if (sd < 0)
        return cpl_error(L, "random.normal", "'sd' %g is negative; allowed >= 0", sd);
    lua_pushnumber(L, mean + sd * gsl_ran_ugaussian(r));
    return 1;
}

static int l_uniform(lua_State *L)
{
    static const char *const known[] = {"min", "max", NULL};
    gsl_rng *r = check_generator(L);
    cpl_check_args(L, 2, "random.uniform", known);
    double lo = cpl_number(L, 2, "random.uniform", "min", "");
    double hi = cpl_number(L, 2, "random.uniform", "max", "");
    if (hi < lo)
        return cpl_error(L, "random.uniform", "'max' %g is below 'min' %g", hi, lo);
    lua_pushnumber(L, lo + (hi - lo) * gsl_rng_uniform(r));
    return 1;
}

static int l_lognormal(lua_State *L)
{
    static const char *const known[] = {"median", "sigma", NULL};
    gsl_rng *r = check_generator(L);
    cpl_check_args(L, 2, "random.lognormal", known);
    double median = cpl_number(L, 2, "random.lognormal", "median", "");
    double sigma = cpl_number(L, 2, "random.lognormal", "sigma", "");
    if (!(median > 0))
        return cpl_error(L, "random.lognormal", "'median' %g is not positive; allowed > 0", median);
    if (sigma < 0)
        return cpl_error(L, "random.lognormal", "'sigma' %g is negative; allowed >= 0", sigma);
    /* exp(N(ln median, sigma^2)), the distribution of gsl_ran_lognormal(zeta = ln median) */
    lua_pushnumber(L, median * exp(sigma * gsl_ran_ugaussian(r)));
    return 1;
}

static const cpl_function generator_methods[] = {
    {"normal", l_normal,
     "g:normal{mean = m, sd = s}: one draw from the normal distribution N(m, s^2); s >= 0\n"
     "(s = 0 gives m exactly).  Example: cp.random.generator{seed = 1}:normal{mean = 0, sd = 1}"},
    {"uniform", l_uniform,
     "g:uniform{min = a, max = b}: one draw, uniform on [a, b); a = b gives a exactly.\n"
     "Example: g:uniform{min = 0, max = 1}"},
    {"lognormal", l_lognormal,
     "g:lognormal{median = m, sigma = s}: one draw of m * exp(s * N(0, 1)), a log-normal\n"
     "variable with median m > 0 and logarithmic width s >= 0 (s = 0 gives m exactly).\n"
     "Example: g:lognormal{median = 1e5, sigma = 0.2}"},
    {NULL, NULL, NULL}};

static const cpl_function random_functions[] = {
    {"generator", l_generator,
     "random.generator{[seed = 1]}: a reproducible random-number generator (GSL's MT19937)\n"
     "seeded with an integer 0 .. 2^32-1 (GSL reads 0 as its default seed 4357: both give\n"
     "the same draws); methods g:normal{mean, sd}, g:uniform{min, max},\n"
     "g:lognormal{median, sigma}.  Example: local g = cp.random.generator{seed = 42}\n"
     "                                   print(g:normal{mean = 0, sd = 1})"},
    {NULL, NULL, NULL}};

int cpl_open_random(lua_State *L)
{
    luaL_newmetatable(L, GENERATOR);
    lua_newtable(L);
    cpl_register(L, generator_methods);
    lua_setfield(L, -2, "__index");
    lua_pushcfunction(L, l_gc);
    lua_setfield(L, -2, "__gc");
    lua_pushcfunction(L, l_gc);
    lua_setfield(L, -2, "__close");
    lua_pop(L, 1);
    lua_newtable(L);
    cpl_register(L, random_functions);
    return 1;
}

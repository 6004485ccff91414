/*
 * Lua binding: coldprep.optim, GSL's Nelder-Mead simplex (nmsimplex2) minimising a Lua
 * function of a vector.  The Lua objective is called from inside GSL's iteration, so it
 * runs under lua_pcall: an error in it never long-jumps across GSL's frames.  The minimiser
 * and its vectors are freed before any error is raised.  Bounds, constraints and the
 * user-facing named parameters are handled by lua/coldprep/optimize.lua (cp.optimize).
 *
 * Ctrl-C: the program's interruption stops the objective at its next Lua instruction, and
 * no Lua code can run after it (the interruption is raised again at every instruction), so
 * the search leaves its best point so far as a note in the registry
 * (CPL_INTERRUPT_NOTE_KEY) that the program appends to the "interrupted" error: the
 * simplex's best vertex, or the text the caller keeps in progress.best (cp.optimize keeps
 * its best point in its own parameters and merit there).
 */
#include <gsl/gsl_errno.h>
#include <gsl/gsl_multimin.h>
#include <lauxlib.h>
#include <lua.h>
#include <math.h>
#include <stdio.h>

#include "args.h"
#include "help.h"

int cpl_open_optim(lua_State *L);

typedef struct objective {
    lua_State *L;
    int fn;         /* stack index of the Lua objective */
    int failed;     /* 1 once the objective raised an error or returned a non-number */
    long evaluations;
} objective;

/* Runs under lua_pcall: calls f({x1, ..., xn}) and leaves its result. */
static int call_objective(lua_State *L)
{
    const gsl_vector *x = lua_touserdata(L, 1);
    lua_pushvalue(L, 2);
    lua_createtable(L, (int)x->size, 0);
    for (size_t i = 0; i < x->size; i++) {
        lua_pushnumber(L, gsl_vector_get(x, i));
        lua_rawseti(L, -2, (lua_Integer)i + 1);
    }
    lua_call(L, 1, 1);
    if (lua_type(L, -1) != LUA_TNUMBER)
        return luaL_error(L, "optim.nmsimplex: the objective returned a %s; it must return a "
                          "finite number", luaL_typename(L, -1));
    return 1;
}

/* GSL's view of the objective.  After a failure the error message stays on the Lua
 * stack and NaN makes GSL's iteration stop with GSL_EBADFUNC. */
static double gsl_objective(const gsl_vector *x, void *params)
{
    objective *o = params;
    lua_State *L = o->L;
    if (o->failed)
        return GSL_NAN;
    lua_pushcfunction(L, call_objective);
    lua_pushlightuserdata(L, (void *)x);
    lua_pushvalue(L, o->fn);
    o->evaluations++;
    if (lua_pcall(L, 2, 1, 0) != LUA_OK) {
        o->failed = 1;
        return GSL_NAN;
    }
    double v = lua_tonumber(L, -1);
    lua_pop(L, 1);
    if (!isfinite(v)) {
        lua_pushfstring(L, "optim.nmsimplex: the objective returned %f; it must return a "
                        "finite number (map failures to a large finite value)", v);
        o->failed = 1;
        return GSL_NAN;
    }
    return v;
}

/* The simplex's best vertex as text "x = {...}, f = ..." in buf (no Lua involved). */
static void format_vertex(const gsl_vector *x, double fx, char *buf, size_t size)
{
    size_t used = (size_t)snprintf(buf, size, "x = {");
    for (size_t i = 0; i < x->size && used < size; i++)
        used += (size_t)snprintf(buf + used, size - used, "%s%.10g", i ? ", " : "",
                                 gsl_vector_get(x, i));
    if (used < size)
        snprintf(buf + used, size - used, "}, f = %.10g", fx);
}

/* Leave the note of an interrupted search in the registry: progress.context and
 * progress.best when the caller keeps them (read raw: no Lua runs), else `vertex`.  Only
 * Lua memory is live here. */
static void leave_note(lua_State *L, int progress, long evaluations, const char *vertex)
{
    const char *context = "optim.nmsimplex", *best = vertex;
    int pushed = 0;
    if (progress) {
        lua_pushliteral(L, "context");
        if (lua_rawget(L, progress) == LUA_TSTRING)
            context = lua_tostring(L, -1);
        lua_pushliteral(L, "best");
        if (lua_rawget(L, progress) == LUA_TSTRING)
            best = lua_tostring(L, -1);
        pushed = 2;
    }
    lua_pushfstring(L, "%s: stopped after %d evaluations; best point so far: %s", context,
                    (int)evaluations, best[0] ? best : "none evaluated");
    lua_setfield(L, LUA_REGISTRYINDEX, CPL_INTERRUPT_NOTE_KEY);
    lua_pop(L, pushed);
}

static int l_nmsimplex(lua_State *L)
{
    static const char *const known[] = {"f", "start", "step", "tolerance", "max_iterations",
                                        "progress", NULL};
    const char *fname = "optim.nmsimplex";
    cpl_check_args(L, 1, fname, known);
    lua_getfield(L, 1, "f");
    if (!lua_isfunction(L, -1))
        return cpl_error(L, fname, "argument 'f' must be a function of a list of numbers, got %s",
                         luaL_typename(L, -1));
    int fn = lua_gettop(L);
    size_t n, nstep;
    const double *start = cpl_number_array(L, 1, fname, "start", "", 1, &n);
    const double *step = cpl_number_array(L, 1, fname, "step", "", 1, &nstep);
    if (nstep != n)
        return cpl_error(L, fname, "'step' has %d values but 'start' has %d; give one step per "
                         "coordinate", (int)nstep, (int)n);
    for (size_t i = 0; i < n; i++)
        if (!(step[i] > 0))
            return cpl_error(L, fname, "step[%d] = %g is not positive", (int)i + 1, step[i]);
    double tol = cpl_opt_number(L, 1, fname, "tolerance", "", 1e-6);
    if (!(tol > 0))
        return cpl_error(L, fname, "'tolerance' %g is not positive; allowed > 0", tol);
    long max_iter = cpl_opt_integer(L, 1, fname, "max_iterations", 2000, 1, 100000000L);
    int progress = 0;
    if (lua_getfield(L, 1, "progress") == LUA_TTABLE)
        progress = lua_gettop(L);
    else if (!lua_isnil(L, -1))
        return cpl_error(L, fname, "argument 'progress' must be a table, got %s",
                         luaL_typename(L, -1));
    const cp_cancel_flag *cancel = cpl_cancel_flag(L);
    if (!lua_checkstack(L, 8))
        return luaL_error(L, "%s: Lua stack overflow", fname);

    /* From here on nothing may raise until the GSL objects are freed. */
    objective o = {.L = L, .fn = fn};
    gsl_multimin_function func = {.f = gsl_objective, .n = n, .params = &o};
    gsl_multimin_fminimizer *s = gsl_multimin_fminimizer_alloc(gsl_multimin_fminimizer_nmsimplex2, n);
    gsl_vector *x = gsl_vector_alloc(n), *ss = gsl_vector_alloc(n);
    int status = GSL_ENOMEM;
    long iter = 0;
    int converged = 0;
    double size = GSL_NAN;
    if (s && x && ss) {
        for (size_t i = 0; i < n; i++) {
            gsl_vector_set(x, i, start[i]);
            gsl_vector_set(ss, i, step[i]);
        }
        status = gsl_multimin_fminimizer_set(s, &func, x, ss);
        while (status == GSL_SUCCESS && iter < max_iter && !(cancel && *cancel)) {
            iter++;
            status = gsl_multimin_fminimizer_iterate(s);
            if (status != GSL_SUCCESS)
                break;
            size = gsl_multimin_fminimizer_size(s);
            if (gsl_multimin_test_size(size, tol) == GSL_SUCCESS) {
                converged = 1;
                break;
            }
        }
    }
    double fx = s ? s->fval : GSL_NAN;
    int cancelled = cancel && *cancel;
    char vertex[512] = "";
    if (cancelled && s && o.evaluations > 0)
        format_vertex(gsl_multimin_fminimizer_x(s), fx, vertex, sizeof vertex);
    if (s && !o.failed && status == GSL_SUCCESS)
        gsl_vector_memcpy(x, gsl_multimin_fminimizer_x(s));
    gsl_multimin_fminimizer_free(s);
    gsl_vector_free(ss);

    if (cancelled) { /* Ctrl-C: the best point so far for the program's message */
        gsl_vector_free(x);
        leave_note(L, progress, o.evaluations, vertex);
        if (o.failed)
            return lua_error(L); /* the objective's "interrupted" is on top of the stack */
        return cpl_error(L, fname, "interrupted after %d evaluations", (int)o.evaluations);
    }

    if (o.failed) {
        gsl_vector_free(x);
        return lua_error(L); /* the objective's message is on top of the stack */
    }
    if (status != GSL_SUCCESS) {
        gsl_vector_free(x);
        return cpl_error(L, fname, "the simplex iteration failed: %s", gsl_strerror(status));
    }
    double *xs = lua_newuserdatauv(L, n * sizeof *xs, 0);
    for (size_t i = 0; i < n; i++)
        xs[i] = gsl_vector_get(x, i);
    gsl_vector_free(x);
    lua_createtable(L, 0, 6);
    cpl_push_array(L, xs, n);
    lua_setfield(L, -2, "x");
    cpl_set_number(L, "fx", fx);
    cpl_set_integer(L, "iterations", iter);
    cpl_set_integer(L, "evaluations", o.evaluations);
    cpl_set_boolean(L, "converged", converged);
    cpl_set_number(L, "size", size);
    return 1;
}

/* optim.interrupt_note(text | nil): keep `text` as the note the program appends to an
 * "interrupted" message (nil removes it).  For searches that evaluate outside the simplex
 * (cp.optimize's starting points and its +-10 % report), where no Lua can run once the
 * interruption has come. */
static int l_interrupt_note(lua_State *L)
{
    const char *fname = "optim.interrupt_note";
    if (lua_gettop(L) != 1 || !(lua_isnil(L, 1) || lua_type(L, 1) == LUA_TSTRING))
        return cpl_error(L, fname, "argument 'text' must be a string or nil, got %s",
                         lua_gettop(L) == 0 ? "nothing" : luaL_typename(L, 1));
    lua_settop(L, 1);
    lua_setfield(L, LUA_REGISTRYINDEX, CPL_INTERRUPT_NOTE_KEY);
    return 0;
}

static const cpl_function optim_functions[] = {
    {"nmsimplex", l_nmsimplex,
     "optim.nmsimplex{f = function(x) return number end, start = {x1, ...}, step = {s1, ...}\n"
     "                [, tolerance = 1e-6] [, max_iterations = 2000]}\n"
     "Minimise f over unbounded coordinates with GSL's Nelder-Mead simplex (nmsimplex2).\n"
     "f receives a list of numbers and must return a finite number.  step: the initial\n"
     "simplex size per coordinate; stops when the simplex's mean size is below tolerance.\n"
     "Returns {x = {...}, fx, iterations, evaluations, converged, size}.  Ctrl-C stops it\n"
     "with the best vertex so far in the message (progress = {context = s, best = s}: that\n"
     "text instead, kept current by the objective).\n"
     "For named parameters with bounds and constraints use cp.optimize.\n"
     "Example: cp.optim.nmsimplex{f = function(x) return (x[1]-1)^2 + x[2]^2 end,\n"
     "                            start = {0, 1}, step = {0.5, 0.5}}.x  --> about {1, 0}"},
    {"interrupt_note", l_interrupt_note,
     "optim.interrupt_note(text | nil)\n"
     "Keep text as the note appended to an \"interrupted\" message if Ctrl-C stops the\n"
     "running entry (nil removes it; an interruption removes it too).  cp.optimize keeps\n"
     "its best point there while it evaluates its starting points and its +-10 % report.\n"
     "Example: cp.optim.interrupt_note(\"scan: best so far x = 2\"); cp.optim.interrupt_note(nil)"},
    {NULL, NULL, NULL}};

int cpl_open_optim(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, optim_functions);
    return 1;
}

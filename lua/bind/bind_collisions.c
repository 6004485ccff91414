/*
 * Lua binding: coldprep.collisions over core/collisions*.c — mean scattering length,
 * centrifugal barrier, universal loss rates, dipolar elastic cross-section, the hold with
 * two-body loss, one-body loss and heating, and the evaporation scaling model.  Every
 * function takes one table of named arguments (SI units, C6 in atomic units) and returns
 * a table.  `mass` is the reduced mass for the two-body quantities and the particle mass
 * for the trapped-cloud ones, as each help text says.  `shielded` gives the elastic and
 * loss rates of identical polar molecules under a dc field, a microwave or a pancake trap,
 * or of molecules in |1,0> under dc-field shielding (core/collisions_protect.c,
 * core/collisions_shielded.c), through a cache of its temperature-independent part kept
 * per Lua state with the memo (memo.h): a plan asks for the same protection at several
 * temperatures, a sweep for the same few fields at many points.
 */
#include <lauxlib.h>
#include <lua.h>
#include <math.h>
#include <string.h>

#include "args.h"
#include "coldprep/collisions.h"
#include "coldprep/consts.h"
#include "coldprep/fields.h"
#include "help.h"
#include "memo.h"

int cpl_open_collisions(lua_State *L);

static const char *const PAIRS[] = {"boson", "fermion", "distinguishable", NULL};
static const char *const WAVES[] = {"s", "p", NULL};

static cp_pair_statistics read_pair(lua_State *L, const char *fname)
{
    switch (cpl_option(L, 1, fname, "statistics", PAIRS, NULL)) {
    case 0: return CP_PAIR_BOSONS;
    case 1: return CP_PAIR_FERMIONS;
    default: return CP_PAIR_DISTINGUISHABLE;
    }
}

/* omega_bar or omega_x, omega_y, omega_z (rad/s) from argument 1. */
static void read_omega(lua_State *L, const char *fname, double omega[3])
{
    static const char *const axes[3] = {"omega_x", "omega_y", "omega_z"};
    cpl_trap_frequencies(L, 1, fname, "omega_bar", axes, omega);
}

static int l_mean_scattering_length(lua_State *L)
{
    static const char *const keys[] = {"c6_au", "mass", NULL};
    const char *fname = "collisions.mean_scattering_length";
    cpl_check_args(L, 1, fname, keys);
    double c6 = cpl_number(L, 1, fname, "c6_au", "a.u.");
    double mu = cpl_number(L, 1, fname, "mass", "kg");
    double abar;
    cp_error err;
    if (cp_collisions_mean_scattering_length(c6, mu, &abar, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 2);
    cpl_set_number(L, "abar", abar);
    cpl_set_number(L, "abar_a0", abar / CP_A0);
    return 1;
}

static int l_pwave_barrier(lua_State *L)
{
    static const char *const keys[] = {"c6_au", "mass", "l", NULL};
    const char *fname = "collisions.pwave_barrier";
    cpl_check_args(L, 1, fname, keys);
    double c6 = cpl_number(L, 1, fname, "c6_au", "a.u.");
    double mu = cpl_number(L, 1, fname, "mass", "kg");
    int l = (int)cpl_opt_integer(L, 1, fname, "l", 1, 1, 20);
    double e;
    cp_error err;
    if (cp_collisions_barrier(c6, mu, l, &e, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 2);
    cpl_set_number(L, "energy", e);
    cpl_set_number(L, "temperature", e / CP_KB);
    return 1;
}

static int l_universal_rate(lua_State *L)
{
    static const char *const keys[] = {"c6_au", "mass", "temperature", "statistics", NULL};
    const char *fname = "collisions.universal_rate";
    cpl_check_args(L, 1, fname, keys);
    double c6 = cpl_number(L, 1, fname, "c6_au", "a.u.");
    double mu = cpl_number(L, 1, fname, "mass", "kg");
    cp_pair_statistics stat = read_pair(L, fname);
    /* The s-wave rates do not depend on T; the p-wave rate needs it.  Without T there is
     * no barrier check. */
    int has_t = cpl_has(L, 1, "temperature");
    double t = stat == CP_PAIR_FERMIONS ? cpl_number(L, 1, fname, "temperature", "K")
                                        : cpl_opt_number(L, 1, fname, "temperature", "K", 1e-6);
    double rate, fraction = NAN;
    unsigned flags = 0;
    cp_error err;
    if (cp_collisions_universal_rate(c6, mu, t, stat, &rate, &err) != CP_OK ||
        (has_t && cp_collisions_universal_validity(c6, mu, t, &flags, &fraction, &err) != CP_OK))
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 3);
    cpl_set_number(L, "rate", rate);
    if (has_t)
        cpl_set_number(L, "barrier_fraction", fraction);
    static const char *const flag_names[] = {"above_barrier", NULL};
    cpl_set_flags(L, flags, flag_names);
    return 1;
}

static int l_dipolar_cross_section(lua_State *L)
{
    static const char *const keys[] = {"dipole_debye", "mass", "statistics", NULL};
    const char *fname = "collisions.dipolar_cross_section";
    cpl_check_args(L, 1, fname, keys);
    double d = cpl_number(L, 1, fname, "dipole_debye", "D");
    double mu = cpl_number(L, 1, fname, "mass", "kg");
    cp_pair_statistics stat = read_pair(L, fname);
    double sigma, len;
    cp_error err;
    if (cp_collisions_dipolar_cross_section(d, mu, stat, &sigma, &len, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 2);
    cpl_set_number(L, "cross_section", sigma);
    cpl_set_number(L, "dipole_length", len);
    return 1;
}

static int l_collision_ratio(lua_State *L)
{
    static const char *const keys[] = {"cross_section", "rate", "mass", "temperature", NULL};
    const char *fname = "collisions.collision_ratio";
    cpl_check_args(L, 1, fname, keys);
    double sigma = cpl_number(L, 1, fname, "cross_section", "m^2");
    double rate = cpl_number(L, 1, fname, "rate", "m^3/s");
    double m = cpl_number(L, 1, fname, "mass", "kg");
    double t = cpl_number(L, 1, fname, "temperature", "K");
    double ratio;
    cp_error err;
    if (cp_collisions_collision_ratio(sigma, rate, m, t, &ratio, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 1);
    cpl_set_number(L, "ratio", ratio);
    return 1;
}

static int l_hold(lua_State *L)
{
    static const char *const keys[] = {"number", "temperature", "omega_bar", "omega_x",
                                       "omega_y", "omega_z", "mass", "rate", "wave",
                                       "lifetime", "heating_rate", "anti_evaporation",
                                       "duration", "points", NULL};
    const char *fname = "collisions.hold";
    cpl_check_args(L, 1, fname, keys);
    cp_hold_params p;
    p.number = cpl_number(L, 1, fname, "number", "");
    p.temperature = cpl_number(L, 1, fname, "temperature", "K");
    read_omega(L, fname, p.omega);
    p.mass = cpl_number(L, 1, fname, "mass", "kg");
    p.rate = cpl_opt_number(L, 1, fname, "rate", "m^3/s", 0.0);
    p.wave = cpl_option(L, 1, fname, "wave", WAVES, "s") ? CP_LOSS_P_WAVE : CP_LOSS_S_WAVE;
    p.lifetime = cpl_has(L, 1, "lifetime") ? cpl_number(L, 1, fname, "lifetime", "s") : INFINITY;
    p.heating_rate = cpl_opt_number(L, 1, fname, "heating_rate", "K/s", 0.0);
    p.anti_evaporation = cpl_opt_boolean(L, 1, fname, "anti_evaporation", 1);
    p.duration = cpl_number(L, 1, fname, "duration", "s");
    size_t n = (size_t)cpl_opt_integer(L, 1, fname, "points", 101, 2, 100000);
    double *buf = lua_newuserdatauv(L, 3 * n * sizeof(double), 0);
    cp_error err;
    if (cp_collisions_hold_cancellable(&p, n, buf, buf + n, buf + 2 * n, cpl_cancel_flag(L),
                                       &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 6);
    cpl_set_number(L, "number", buf[2 * n - 1]);
    cpl_set_number(L, "temperature", buf[3 * n - 1]);
    cpl_set_number(L, "surviving_fraction", buf[2 * n - 1] / p.number);
    cpl_push_array(L, buf, n);
    lua_setfield(L, -2, "times");
    cpl_push_array(L, buf + n, n);
    lua_setfield(L, -2, "numbers");
    cpl_push_array(L, buf + 2 * n, n);
    lua_setfield(L, -2, "temperatures");
    return 1;
}

static int l_evaporation_rate(lua_State *L)
{
    static const char *const keys[] = {"eta", NULL};
    const char *fname = "collisions.evaporation_rate";
    cpl_check_args(L, 1, fname, keys);
    double eta = cpl_number(L, 1, fname, "eta", ""), ratio, fraction;
    cp_error err;
    if (cp_collisions_evaporation_rate(eta, &ratio, &fraction, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 2);
    cpl_set_number(L, "ratio", ratio);
    cpl_set_number(L, "truncated_fraction", fraction);
    return 1;
}

static int l_evaporation(lua_State *L)
{
    static const char *const keys[] = {"number", "temperature", "omega_bar", "omega_x",
                                       "omega_y", "omega_z", "mass", "eta", "kappa", "ratio",
                                       "wave", "final_number", "points", "cross_section",
                                       "loss_rate", "stop_temperature", NULL};
    const char *fname = "collisions.evaporation";
    cpl_check_args(L, 1, fname, keys);
    cp_evaporation_params p;
    p.number = cpl_number(L, 1, fname, "number", "");
    p.temperature = cpl_number(L, 1, fname, "temperature", "K");
    read_omega(L, fname, p.omega);
    p.mass = cpl_number(L, 1, fname, "mass", "kg");
    p.eta = cpl_number(L, 1, fname, "eta", "");
    p.kappa = cpl_has(L, 1, "kappa") ? cpl_number(L, 1, fname, "kappa", "") : NAN;
    p.ratio = cpl_number(L, 1, fname, "ratio", "");
    p.wave = cpl_option(L, 1, fname, "wave", WAVES, "s") ? CP_LOSS_P_WAVE : CP_LOSS_S_WAVE;
    p.final_number = cpl_number(L, 1, fname, "final_number", "");
    size_t n = (size_t)cpl_opt_integer(L, 1, fname, "points", 51, 2, 100000);
    /* with the collision rates, the trajectory's clock (cp_collisions_evaporation_times) */
    int clocked = cpl_has(L, 1, "cross_section") || cpl_has(L, 1, "loss_rate");
    double sigma = cpl_opt_number(L, 1, fname, "cross_section", "m^2", 0.0);
    double beta = cpl_opt_number(L, 1, fname, "loss_rate", "m^3/s", 0.0);
    double stop = cpl_opt_number(L, 1, fname, "stop_temperature", "K", 0.0);
    if (!(stop >= 0.0))
        cpl_error(L, fname, "stop_temperature %g K is out of range; allowed >= 0 K", stop);
    double *buf = lua_newuserdatauv(L, 4 * n * sizeof(double), 0);
    double efficiency;
    size_t m = n; /* the points computed */
    cp_error err;
    cp_status st = stop > 0.0
                       ? cp_collisions_evaporation_until(&p, n, stop, buf, buf + n, buf + 2 * n,
                                                         &m, &err)
                       : cp_collisions_evaporation(&p, n, buf, buf + n, buf + 2 * n,
                                                   &efficiency, &err);
    if (st != CP_OK)
        return cpl_raise(L, &err);
    if (m < n) /* stopped early: the efficiency up to the last point */
        efficiency = -log(buf[2 * n + m - 1] / buf[2 * n]) / log(buf[m - 1] / buf[0]);
    else if (stop > 0.0)
        efficiency = -log(buf[3 * n - 1] / buf[2 * n]) / log(p.final_number / p.number);
    if (clocked && cp_collisions_evaporation_times(&p, sigma, beta, m, buf, buf + n, buf + 3 * n,
                                                   &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 9);
    cpl_set_number(L, "number", buf[m - 1]);
    cpl_set_number(L, "temperature", buf[n + m - 1]);
    cpl_set_number(L, "phase_space_density", buf[2 * n + m - 1]);
    cpl_set_number(L, "efficiency", efficiency);
    cpl_push_array(L, buf, m);
    lua_setfield(L, -2, "numbers");
    cpl_push_array(L, buf + n, m);
    lua_setfield(L, -2, "temperatures");
    cpl_push_array(L, buf + 2 * n, m);
    lua_setfield(L, -2, "phase_space_densities");
    if (clocked) {
        cpl_set_number(L, "duration", buf[3 * n + m - 1]);
        cpl_push_array(L, buf + 3 * n, m);
        lua_setfield(L, -2, "times");
    }
    return 1;
}


/* A number field of the table at idx (required, finite). */
static double table_number(lua_State *L, int idx, const char *fname, const char *tname,
                           const char *key, const char *unit)
{
    int t = lua_getfield(L, idx, key);
    if (t != LUA_TNUMBER)
        cpl_error(L, fname, "%s field '%s' (%s) must be a number, got %s", tname, key, unit,
                  t == LUA_TNIL ? "nothing" : luaL_typename(L, -1));
    double v = lua_tonumber(L, -1);
    lua_pop(L, 1);
    if (!isfinite(v))
        cpl_error(L, fname, "%s field '%s' (%s) must be finite, got %g", tname, key, unit, v);
    return v;
}

/* args.molecule: a species name (looked up with cp.species.molecule) or a table with
 * dipole_debye, rot_const_hz, c6_au, mass (kg) and statistics, as that function returns. */
static void read_molecule(lua_State *L, const char *fname, cp_protection_params *p)
{
    int t = lua_getfield(L, 1, "molecule");
    if (t == LUA_TSTRING) {
        luaL_getsubtable(L, LUA_REGISTRYINDEX, LUA_LOADED_TABLE);
        lua_getfield(L, -1, "coldprep");
        lua_getfield(L, -1, "species");
        lua_getfield(L, -1, "molecule");
        lua_pushvalue(L, -5);
        lua_call(L, 1, 1);
        lua_replace(L, -5);
        lua_pop(L, 3);
    } else if (t != LUA_TTABLE) {
        cpl_error(L, fname, "argument 'molecule' must be a species name or a table {dipole_debye,"
                  " rot_const_hz, c6_au, mass, statistics}, got %s",
                  t == LUA_TNIL ? "nothing" : luaL_typename(L, -1));
    }
    int m = lua_gettop(L);
    p->dipole = table_number(L, m, fname, "molecule", "dipole_debye", "D") * CP_DEBYE;
    p->rot_const_hz = table_number(L, m, fname, "molecule", "rot_const_hz", "Hz");
    p->c6_au = table_number(L, m, fname, "molecule", "c6_au", "a.u.");
    p->mass = table_number(L, m, fname, "molecule", "mass", "kg");
    static const char *const stats[] = {"boson", "fermion", NULL};
    lua_getfield(L, m, "statistics");
    const char *s = lua_tostring(L, -1);
    if (!s || (strcmp(s, stats[0]) && strcmp(s, stats[1])))
        cpl_error(L, fname, "molecule field 'statistics' must be \"boson\" or \"fermion\"");
    p->stat = strcmp(s, "fermion") ? CP_PAIR_BOSONS : CP_PAIR_FERMIONS;
    lua_pop(L, 2);
}

static const char *const REGIMES[] = {"dc_3d", "quasi_2d", "microwave", "dc_shield"};

static const char CACHE[] = "coldprep.collisions.cache";

static int cache_gc(lua_State *L)
{
    cp_shielded_cache **c = luaL_checkudata(L, 1, CACHE);
    cp_shielded_cache_free(*c);
    *c = NULL;
    return 0;
}

/* This state's cache of cp_collisions_protected_cached, made on first use; NULL while the
 * memo is disabled (or when out of memory: the rates are then computed without it). */
static cp_shielded_cache *state_cache(lua_State *L)
{
    if (!cpl_memo_enabled(L))
        return NULL;
    cpl_memo_objects(L);
    cp_shielded_cache **c;
    if (lua_getfield(L, -1, CACHE) == LUA_TUSERDATA) {
        c = lua_touserdata(L, -1);
    } else {
        lua_pop(L, 1);
        c = lua_newuserdatauv(L, sizeof *c, 0);
        *c = NULL;
        if (luaL_newmetatable(L, CACHE)) {
            lua_pushcfunction(L, cache_gc);
            lua_setfield(L, -2, "__gc");
        }
        lua_setmetatable(L, -2);
        *c = cp_shielded_cache_alloc();
        lua_pushvalue(L, -1);
        lua_setfield(L, -3, CACHE);
    }
    lua_pop(L, 2);
    return *c; /* the objects table holds the userdata */
}

static int l_shielded(lua_State *L)
{
    static const char *const keys[] = {"molecule", "temperature", "electric_field",
                                       "microwave", "confinement", "rotational_j", NULL};
    const char *fname = "collisions.shielded";
    cpl_check_args(L, 1, fname, keys);
    cp_protection_params p = {0};
    read_molecule(L, fname, &p);
    p.temperature = cpl_number(L, 1, fname, "temperature", "K");
    p.electric_field = cpl_opt_number(L, 1, fname, "electric_field", "V/m", 0.0);
    p.rotational_j = (int)cpl_opt_integer(L, 1, fname, "rotational_j", 0, 0, 1);
    int t = lua_getfield(L, 1, "microwave");
    if (t == LUA_TTABLE) {
        static const char *const mk[] = {"rabi", "detuning", "ellipticity", NULL};
        static const char *const mu[] = {"rad/s", "rad/s", "rad"};
        double v[3];
        cpl_read_fields(L, lua_gettop(L), fname, "microwave", mk, 3, mu, v);
        if (isnan(v[0]) || isnan(v[1]))
            cpl_error(L, fname, "microwave needs 'rabi' and 'detuning' (rad/s)");
        p.microwave = 1;
        p.rabi = v[0];
        p.detuning = v[1];
        p.ellipticity = isnan(v[2]) ? 0.0 : v[2];
    } else if (t != LUA_TNIL) {
        cpl_error(L, fname, "argument 'microwave' must be a table {rabi, detuning [, "
                  "ellipticity]}, got %s", luaL_typename(L, -1));
    }
    lua_pop(L, 1);
    t = lua_getfield(L, 1, "confinement");
    if (t == LUA_TTABLE) {
        static const char *const ck[] = {"axial_omega", NULL};
        static const char *const cu[] = {"rad/s"};
        double v[1];
        cpl_read_fields(L, lua_gettop(L), fname, "confinement", ck, 1, cu, v);
        if (isnan(v[0]))
            cpl_error(L, fname, "confinement needs 'axial_omega' (rad/s, the tight axis)");
        if (!(v[0] > 0.0))
            cpl_error(L, fname, "confinement 'axial_omega' %g rad/s is out of range; allowed "
                      "[2 pi x 1e3, 2 pi x 1e6] rad/s", v[0]);
        p.axial_omega = v[0];
    } else if (t != LUA_TNIL) {
        cpl_error(L, fname, "argument 'confinement' must be a table {axial_omega}, got %s",
                  luaL_typename(L, -1));
    }
    lua_pop(L, 1);
    cp_shielded_result r;
    cp_shield_regime regime;
    double dip;
    cp_error err;
    if (cp_collisions_protected_cached(&p, state_cache(L), &r, &dip, &regime, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 14);
    cpl_set_number(L, "elastic_rate_coefficient", r.elastic_rate);
    cpl_set_number(L, "loss_rate_coefficient", r.loss_rate);
    if (regime == CP_SHIELD_QUASI_2D)
        cpl_set_number(L, "loss_rate_coefficient_2d", r.loss_rate_2d);
    cpl_set_number(L, "ratio", r.ratio);
    cpl_set_number(L, "cross_section", r.cross_section);
    cpl_set_number(L, "dipole_length", r.dipole_length);
    cpl_set_number(L, "dipole_debye", dip / CP_DEBYE);
    cpl_set_number(L, "inner_radius", r.inner_radius);
    cpl_set_string(L, "regime", REGIMES[regime]);
    cpl_set_string(L, "method", r.method);
    cpl_set_boolean(L, "valid", r.valid);
    if (!r.valid)
        cpl_set_string(L, "note", r.note);
    if (regime == CP_SHIELD_DC_PAIR)
        cpl_set_number(L, "pair_gap_hz", r.pair_gap / CP_H);
    return 1;
}

static const cpl_function functions[] = {
    {"mean_scattering_length", l_mean_scattering_length,
     "collisions.mean_scattering_length{c6_au, mass}: Gribakin-Flambaum mean scattering "
     "length abar = [2 pi / Gamma(1/4)^2] (2 mu C6 / hbar^2)^(1/4).\n"
     "  c6_au  C6 in atomic units (E_h a0^6), (0, 1e9]\n"
     "  mass   REDUCED mass mu, kg (M/2 for two identical molecules of mass M)\n"
     "Returns {abar (m), abar_a0 (Bohr radii)}.\n"
     "Example: cp.collisions.mean_scattering_length{c6_au = 16130, mass = 127*cp.units.amu/2}"},
    {"pwave_barrier", l_pwave_barrier,
     "collisions.pwave_barrier{c6_au, mass, l = 1}: height of the centrifugal barrier of "
     "partial wave l on -C6/r^6, E_l = [hbar^2 l(l+1)]^(3/2) / (3 sqrt(6) mu^(3/2) "
     "C6^(1/2)).\n"
     "  c6_au  C6, atomic units;  mass  REDUCED mass, kg;  l  partial wave, 1..20\n"
     "Returns {energy (J), temperature (K) = energy / k_B}.\n"
     "Example: cp.collisions.pwave_barrier{c6_au = 16130, mass = 127*cp.units.amu/2}  --> ~24 uK"},
    {"universal_rate", l_universal_rate,
     "collisions.universal_rate{c6_au, mass, temperature, statistics}: universal two-body "
     "loss rate coefficient (unit short-range loss; Idziaszek & Julienne, PRL 104, 113202 "
     "(2010)).\n"
     "  c6_au  C6, atomic units;  mass  REDUCED mass, kg\n"
     "  statistics  \"boson\" (identical, 8 pi hbar abar / mu), \"distinguishable\" (4 pi hbar "
     "abar / mu),\n"
     "              \"fermion\" (identical, p-wave: 1513 abar^3 k_B T / h)\n"
     "  temperature K, [1e-12, 0.01]; required for fermions only\n"
     "Returns {rate} in m^3/s: beta in dn/dt = -beta n^2 (identical) or dn_a/dt = -beta n_a n_b;\n"
     "  with a temperature also barrier_fraction = k_B T / E_1 (the p-wave barrier) and\n"
     "  flags = {\"above_barrier\"} when it exceeds 0.1 (threshold laws no longer hold), else {}.\n"
     "Example: cp.collisions.universal_rate{c6_au = 16130, mass = 127*cp.units.amu/2, "
     "temperature = 300e-9, statistics = \"fermion\"}"},
    {"dipolar_cross_section", l_dipolar_cross_section,
     "collisions.dipolar_cross_section{dipole_debye, mass, statistics}: threshold (Born) "
     "elastic cross-section of polarised dipoles (Bohn, Cavagnero & Ticknor, NJP 11, 055039 "
     "(2009)).\n"
     "  dipole_debye  the induced (lab-frame) dipole moment, D, (0, 20]\n"
     "  mass          REDUCED mass, kg\n"
     "  statistics    \"fermion\" (32 pi/15 D^2), \"boson\" (32 pi/45 D^2, dipolar part), "
     "\"distinguishable\" (64 pi/45 D^2)\n"
     "Returns {cross_section (m^2), dipole_length D = mu d^2 / (4 pi eps0 hbar^2) (m)}.\n"
     "Example: cp.collisions.dipolar_cross_section{dipole_debye = 0.2, mass = 127*cp.units.amu/2,"
     " statistics = \"fermion\"}"},
    {"collision_ratio", l_collision_ratio,
     "collisions.collision_ratio{cross_section, rate, mass, temperature}: ratio of elastic "
     "to loss collisions sigma v_rel / beta, v_rel = sqrt(16 k_B T / (pi m)).\n"
     "  cross_section m^2;  rate beta, m^3/s;  mass  PARTICLE mass, kg;  temperature K\n"
     "Returns {ratio}.\n"
     "Example: cp.collisions.collision_ratio{cross_section = 1e-14, rate = 1e-17, mass = "
     "2.1e-25, temperature = 300e-9}"},
    {"hold", l_hold,
     "collisions.hold{number, temperature, omega_bar, mass, duration, rate = 0, wave = \"s\", "
     "lifetime, heating_rate = 0, anti_evaporation = true, points = 101}: N(t) and T(t) of a "
     "thermal cloud held in a harmonic trap.\n"
     "  number N0;  temperature T0, K;  omega_bar (or omega_x, omega_y, omega_z), rad/s\n"
     "  mass  PARTICLE mass, kg;  duration  hold time, s\n"
     "  rate  two-body beta at T0, m^3/s (e.g. from universal_rate, or measured)\n"
     "  wave  \"s\": beta constant; \"p\": beta proportional to T (identical fermions)\n"
     "  lifetime  one-body lifetime, s (omit for none);  heating_rate  technical dT/dt, K/s\n"
     "  anti_evaporation  include the heating by density-dependent loss (T/4 or T/12 rule)\n"
     "Returns {number, temperature, surviving_fraction, times, numbers, temperatures}.\n"
     "Example: cp.collisions.hold{number = 2e4, temperature = 300e-9, omega_bar = 2*math.pi*100,"
     " mass = 2.1e-25, rate = 1e-17, duration = 0.5}"},
    {"evaporation_rate", l_evaporation_rate,
     "collisions.evaporation_rate{eta}: evaporation rate of a truncated Boltzmann gas in a 3D "
     "harmonic trap over the elastic collision rate (Luiten, Reynolds & Walraven, PRA 53, 381 "
     "(1996)), ratio = 2 e^-eta [eta - 4 P(4, eta)/P(3, eta)].\n"
     "  eta  trap depth / k_B T, [5, 30]\n"
     "Density convention: Gamma_el = <n> sigma v_rel, <n> = N (m wbar^2/(4 pi kB T))^(3/2) / "
     "P(3, eta) (the Gaussian mean density of the truncated cloud's central density).\n"
     "Returns {ratio (Gamma_ev / Gamma_el), truncated_fraction (P(3, eta))}.\n"
     "Example: cp.collisions.evaporation_rate{eta = 8}"},
    {"evaporation", l_evaporation,
     "collisions.evaporation{number, temperature, omega_bar, mass, eta, ratio, final_number, "
     "wave = \"s\", kappa, points = 51}: evaporation at constant truncation eta in a fixed "
     "harmonic trap with two-body loss (Ketterle & van Druten scaling model; evaporation rate "
     "from evaporation_rate).\n"
     "  number N0;  temperature T0, K;  omega_bar (or omega_x, _y, _z), rad/s;  mass, kg\n"
     "  eta  trap depth / k_B T, [5, 30];  kappa  extra energy per evaporated particle "
     "(default (eta-5)/(eta-4))\n"
     "  ratio  elastic / loss collisions at T0 (see collision_ratio)\n"
     "  wave   loss law: \"s\" (beta const) or \"p\" (beta ~ T)\n"
     "  final_number  N at the end, [1, N0)\n"
     "  cross_section (m^2), loss_rate (m^3/s, beta at T0)  optional: with them the clock\n"
     "    dt = -d ln N / (<n> (f sigma v_rel + beta)) gives times and duration\n"
     "  stop_temperature  K, optional: the trajectory ends at its first point at or below it\n"
     "    (the same points as without it, fewer of them; the results are those of its end)\n"
     "Returns {number, temperature, phase_space_density (classical peak), efficiency\n"
     "  (-dln PSD / dln N), numbers, temperatures, phase_space_densities [, times (s),\n"
     "  duration (s)]}.\n"
     "Example: cp.collisions.evaporation{number = 2e4, temperature = 300e-9, omega_bar = 600, "
     "mass = 2.1e-25, eta = 8, ratio = 100, final_number = 5e3}"},
    {"shielded", l_shielded,
     "collisions.shielded{molecule, temperature [, electric_field | microwave = {rabi, "
     "detuning [, ellipticity]}, confinement = {axial_omega}]}: elastic and loss rate "
     "coefficients of identical polar molecules under protection, computed (not "
     "tabulated): universal loss at short range, the flux that reaches it from a Numerov "
     "integration of the lowest adiabatic channels; the dipolar elastic cross section.\n"
     "  molecule        species name or table {dipole_debye, rot_const_hz, c6_au, mass (kg), "
     "statistics}\n"
     "  temperature     K, [1e-10, 1e-4]\n"
     "  electric_field  dc field, V/m (induced dipole from cp.fields); with confinement it is "
     "along the tight axis\n"
     "  microwave       {rabi (rad/s), detuning (rad/s, blue > 0), ellipticity (rad, 0 = "
     "circular)}: microwave shielding (Deng et al., PRL 130, 183001 (2023))\n"
     "  confinement     {axial_omega (rad/s)}: pancakes of a 1D lattice, quasi-2D\n"
     "  rotational_j    0 (molecules in |0,0>, default) or 1 (in |1,0>: dc-field shielding\n"
     "                  near and above the field where |1,0>|1,0> meets |0,0>|2,0>, regime\n"
     "                  \"dc_shield\", valid for d F / B in [3.25, 3.8]; needs electric_field)\n"
     "Returns {elastic_rate_coefficient, loss_rate_coefficient (m^3/s; quasi-2D: "
     "3D-equivalent, and loss_rate_coefficient_2d in m^2/s), ratio, cross_section (m^2), "
     "dipole_debye (induced or effective), dipole_length (m), inner_radius (m), regime, "
     "method, valid, note (when not valid), pair_gap_hz (dc_shield: [2E(1,0) - E(0,0) - "
     "E(2,0)]/h)}.\n"
     "Example: cp.collisions.shielded{molecule = \"23Na40K\", temperature = 300e-9, "
     "microwave = {rabi = 2*math.pi*50e6, detuning = 2*math.pi*10e6}}"},
    {NULL, NULL, NULL}};

int cpl_open_collisions(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, functions);
    return 1;
}

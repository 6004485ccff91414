/*
 * Lua binding: coldprep.feshbach over core/feshbach*.c.  A `resonance` argument is any
 * table with b0, width, abg, dmu (SI; the table cp.species.resonance returns) and an
 * optional c6_au, or a molecule name whose first listed resonance is used; a `molecule` is a
 * name or a table from cp.species.molecule (its reduced_mass, else its two atoms' masses).
 * associate is kept lean: with tables for resonance and molecule it does no lookups.
 * overlap_density and max_efficiency remember their results per Lua state (memo.h): a plan
 * sweep starts every point from the same mixture, and these two are most of a point's cost.
 */
#include <lauxlib.h>
#include <lua.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "args.h"
#include "coldprep/consts.h"
#include "coldprep/feshbach.h"
#include "coldprep/thermo.h"
#include "help.h"
#include "memo.h"
#include "reals.h"
#include "species_lookup.h"

int cpl_open_feshbach(lua_State *L);

/* Memo keys: a tag for the function, then every input that determines the result. */
enum { TAG_OVERLAP = 1, TAG_MAX_EFFICIENCY = 2, CLOUD_KEY = 7 };

static void cloud_key(const cp_feshbach_cloud *c, double *k)
{
    k[0] = (double)c->profile;
    k[1] = c->number;
    k[2] = c->mass;
    k[3] = c->omega[0];
    k[4] = c->omega[1];
    k[5] = c->omega[2];
    k[6] = c->scattering_length;
}

/* A number field of the table at idx: required (no default) or optional (dflt). */
static double field_number(lua_State *L, int idx, const char *fname, const char *tname,
                           const char *key, const char *unit, int required, double dflt)
{
    int t = lua_getfield(L, idx, key);
    if (t == LUA_TNIL) {
        lua_pop(L, 1);
        if (required)
            cpl_error(L, fname, "%s has no field '%s' (%s)", tname, key, unit);
        return dflt;
    }
    if (t != LUA_TNUMBER)
        cpl_error(L, fname, "%s field '%s' must be a number (%s), got %s", tname, key, unit,
                  luaL_typename(L, -1));
    double v = lua_tonumber(L, -1);
    lua_pop(L, 1);
    if (!isfinite(v))
        cpl_error(L, fname, "%s %s %s %s is %s; allowed finite values (%s)", tname, key,
                  isnan(v) ? "NaN" : v > 0 ? "inf" : "-inf", unit,
                  isnan(v) ? "not a number" : "infinite", unit);
    return v;
}

/* args.resonance -> r; with need_c6 the resonance's c6_au (optional) is read too, every
 * field is checked against the known ones, and an explicit args.c6_au overrides it; else
 * only b0, width, abg, dmu are read and r->c6_au = 0 (not used by the caller). */
static void read_resonance(lua_State *L, const char *fname, int need_c6,
                           cp_feshbach_resonance *r)
{
    /* the fields of a cp.species.resonance table, numbers first; any other key is a typo */
    static const char *const known[] = {"b0", "width", "abg", "dmu", "c6_au", "molecule",
                                        "states", "source", "verified", NULL};
    static const char *const units[] = {"T", "T", "m", "J/T", "a.u."};
    double v[5];
    int t = lua_getfield(L, 1, "resonance");
    if (t == LUA_TSTRING) {
        cpl_push_first_resonance(L, -1);
        lua_remove(L, -2);
    } else if (t != LUA_TTABLE) {
        cpl_error(L, fname, "argument 'resonance' must be a table {b0, width, abg, dmu "
                  "[, c6_au]} (cp.species.resonance) or a molecule name, got %s",
                  luaL_typename(L, -1));
    }
    if (need_c6) {
        /* c6_au is optional here: scan every field so that a misspelt one is an error */
        cpl_read_fields(L, -1, fname, "resonance", known, 5, units, v);
    } else {
        /* only the four required fields matter, and a missing or misspelt one is caught
         * as missing; skipping the scan keeps associate{} lean for tight Lua loops */
        for (int i = 0; i < 4; i++)
            v[i] = field_number(L, -1, fname, "resonance", known[i], units[i], 1, 0.0);
    }
    lua_pop(L, 1);
    for (int i = 0; i < 4; i++)
        if (isnan(v[i]))
            cpl_error(L, fname, "resonance has no field '%s' (%s)", known[i], units[i]);
    r->b0 = v[0];
    r->width = v[1];
    r->abg = v[2];
    r->dmu = v[3];
    r->c6_au = 0.0;
    if (need_c6)
        r->c6_au = cpl_opt_number(L, 1, fname, "c6_au", "a.u.", isnan(v[4]) ? 0.0 : v[4]);
}

/* Mass of an atom given by name or table (field mass). */
static double atom_mass(lua_State *L, int idx, const char *fname)
{
    if (lua_type(L, idx) == LUA_TSTRING) {
        cpl_push_atom(L, idx);
        lua_replace(L, idx);
    }
    if (lua_type(L, idx) != LUA_TTABLE)
        cpl_error(L, fname, "molecule atoms must be atom names, got %s", luaL_typename(L, idx));
    return field_number(L, idx, fname, "atom", "mass", "kg", 1, 0.0);
}

/* args.molecule -> reduced mass of its two atoms, kg. */
static double read_reduced_mass(lua_State *L, const char *fname)
{
    int t = lua_getfield(L, 1, "molecule");
    if (t == LUA_TSTRING) {
        cpl_push_molecule(L, -1);
        lua_remove(L, -2);
    } else if (t != LUA_TTABLE) {
        cpl_error(L, fname, "argument 'molecule' must be a name or a table from "
                  "cp.species.molecule, got %s", luaL_typename(L, -1));
    }
    double mu = field_number(L, -1, fname, "molecule", "reduced_mass", "kg", 0, NAN);
    if (isnan(mu)) {
        if (lua_getfield(L, -1, "atoms") != LUA_TTABLE)
            cpl_error(L, fname, "molecule has neither 'reduced_mass' nor 'atoms'");
        lua_geti(L, -1, 1);
        lua_geti(L, -2, 2);
        double ma = atom_mass(L, -2, fname), mb = atom_mass(L, -1, fname);
        mu = ma * mb / (ma + mb);
        lua_pop(L, 3);
    }
    lua_pop(L, 1);
    return mu;
}

static int l_scattering_length(lua_State *L)
{
    static const char fname[] = "feshbach.scattering_length";
    static const char *const known[] = {"resonance", "field", NULL};
    cp_feshbach_resonance r;
    cp_error err;
    double a;
    cpl_check_args(L, 1, fname, known);
    read_resonance(L, fname, 0, &r);
    if (cp_feshbach_scattering_length(&r, cpl_number(L, 1, fname, "field", "T"), &a, &err))
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 1);
    cpl_set_number(L, "a", a);
    return 1;
}

static int l_binding_energy(lua_State *L)
{
    static const char fname[] = "feshbach.binding_energy";
    static const char *const known[] = {"resonance", "field", "molecule", "model", "c6_au", NULL};
    static const char *const models[] = {"auto", "universal", "corrected", "linear", NULL};
    cp_feshbach_resonance r;
    cp_feshbach_binding out;
    cp_error err;
    cpl_check_args(L, 1, fname, known);
    read_resonance(L, fname, 1, &r);
    double field = cpl_number(L, 1, fname, "field", "T");
    double mu = read_reduced_mass(L, fname);
    int model = cpl_option(L, 1, fname, "model", models, "auto");
    if (cp_feshbach_binding_energy(&r, mu, field, (cp_feshbach_model)model, &out, &err))
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 8);
    cpl_set_number(L, "energy", out.energy);
    cpl_set_number(L, "energy_hz", out.energy / CP_H);
    cpl_set_string(L, "model", cp_feshbach_model_name(out.model));
    cpl_set_number(L, "a", out.a);
    cpl_set_number(L, "rstar", out.rstar);
    if (!isnan(out.abar)) {
        cpl_set_number(L, "abar", out.abar);
        cpl_set_number(L, "s_res", out.s_res);
    }
    static const char *const flag_names[] = {"below_abar", "past_zero_crossing", "linear_broad",
                                             NULL};
    cpl_set_flags(L, out.flags, flag_names);
    return 1;
}

static int l_associate(lua_State *L)
{
    static const char fname[] = "feshbach.associate";
    static const char *const known[] = {"resonance", "molecule", "ramp_rate", "density",
                                        "max_efficiency", "alpha", NULL};
    cp_feshbach_resonance r;
    cp_feshbach_ramp ramp;
    cp_error err;
    double eff, delta;
    cpl_check_args(L, 1, fname, known);
    read_resonance(L, fname, 0, &r);
    double mu = read_reduced_mass(L, fname);
    ramp.ramp_rate = cpl_number(L, 1, fname, "ramp_rate", "T/s");
    ramp.density = cpl_number(L, 1, fname, "density", "m^-3");
    ramp.max_efficiency = cpl_opt_number(L, 1, fname, "max_efficiency", "", 1.0);
    /* NaN marks "absent" (a NaN given by the user is rejected by the reader) */
    ramp.alpha = cpl_opt_number(L, 1, fname, "alpha", "m^2/s", NAN);
    if (isnan(ramp.alpha))
        ramp.alpha = 0.0; /* theory */
    else if (!(ramp.alpha > 0.0))
        return cpl_error(L, fname, "alpha %g m^2/s is out of range; allowed "
                         "(0, 1000] m^2/s", ramp.alpha);
    if (cp_feshbach_associate(&r, mu, &ramp, &eff, &delta, &err))
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 2);
    cpl_set_number(L, "efficiency", eff);
    cpl_set_number(L, "lz_parameter", delta);
    return 1;
}

static int l_ramp_law(lua_State *L)
{
    static const char fname[] = "feshbach.ramp_law";
    static const char *const known[] = {"resonance", "molecule", "ramp_rates", "density",
                                        "max_efficiency", "alpha", NULL};
    cp_feshbach_resonance r;
    cp_error err;
    size_t n;
    cpl_check_args(L, 1, fname, known);
    read_resonance(L, fname, 0, &r);
    double mu = read_reduced_mass(L, fname);
    double density = cpl_number(L, 1, fname, "density", "m^-3");
    double pmax = cpl_opt_number(L, 1, fname, "max_efficiency", "", 1.0);
    double alpha = cpl_opt_number(L, 1, fname, "alpha", "m^2/s", 0.0);
    if (cpl_has(L, 1, "alpha") && !(alpha > 0.0 && alpha <= 1e3))
        return cpl_error(L, fname, "alpha %g m^2/s is out of range; allowed "
                         "(0, 1000] m^2/s", alpha);
    /* validate everything else through the single-rate call */
    cp_feshbach_ramp ramp = {1.0, density, alpha, pmax};
    double eff, delta;
    if (cp_feshbach_associate(&r, mu, &ramp, &eff, &delta, &err))
        return cpl_raise(L, &err);
    if (alpha == 0.0 && cp_feshbach_alpha(mu, &alpha, &err))
        return cpl_raise(L, &err);
    const double *rates = cpl_number_array(L, 1, fname, "ramp_rates", "T/s", 1, &n);
    /* given a reals, the kernel writes into the reals returned; else into scratch space */
    int as_reals = cpl_is_reals_field(L, 1, "ramp_rates");
    double *out = as_reals ? cpl_new_reals(L, n) : lua_newuserdatauv(L, n * sizeof *out, 0);
    if (cp_feshbach_ramp_law(alpha * density * fabs(r.abg * r.width), pmax, rates, out, n,
                             &err))
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 1);
    if (as_reals)
        lua_pushvalue(L, -2);
    else
        cpl_push_array(L, out, n);
    lua_setfield(L, -2, "efficiency");
    return 1;
}

static int l_associate_site(lua_State *L)
{
    static const char fname[] = "feshbach.associate_site";
    static const char *const known[] = {"resonance", "molecule", "ramp_rate", "omega_x",
                                        "omega_y", "omega_z", "max_efficiency", NULL};
    cp_feshbach_resonance r;
    cp_error err;
    double eff, delta, omega[3];
    cpl_check_args(L, 1, fname, known);
    read_resonance(L, fname, 0, &r);
    double mu = read_reduced_mass(L, fname);
    double rate = cpl_number(L, 1, fname, "ramp_rate", "T/s");
    omega[0] = cpl_number(L, 1, fname, "omega_x", "rad/s");
    omega[1] = cpl_number(L, 1, fname, "omega_y", "rad/s");
    omega[2] = cpl_number(L, 1, fname, "omega_z", "rad/s");
    double pmax = cpl_opt_number(L, 1, fname, "max_efficiency", "", 1.0);
    if (cp_feshbach_associate_site(&r, mu, rate, omega, pmax, &eff, &delta, &err))
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 2);
    cpl_set_number(L, "efficiency", eff);
    cpl_set_number(L, "lz_parameter", delta);
    return 1;
}

static int l_lz_probability(lua_State *L)
{
    static const char fname[] = "feshbach.lz_probability";
    static const char *const known[] = {"lz_parameter", NULL};
    cp_error err;
    double p;
    cpl_check_args(L, 1, fname, known);
    if (cp_feshbach_lz_probability(cpl_number(L, 1, fname, "lz_parameter", ""), &p, &err))
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 1);
    cpl_set_number(L, "probability", p);
    return 1;
}

static int l_dissociation_energy(lua_State *L)
{
    static const char fname[] = "feshbach.dissociation_energy";
    static const char *const known[] = {"resonance", "molecule", "ramp_rate", NULL};
    cp_feshbach_resonance r;
    cp_error err;
    double e, scale;
    cpl_check_args(L, 1, fname, known);
    read_resonance(L, fname, 0, &r);
    double mu = read_reduced_mass(L, fname);
    double rate = cpl_number(L, 1, fname, "ramp_rate", "T/s");
    if (cp_feshbach_dissociation_energy(&r, mu, rate, &e, &scale, &err))
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 3);
    cpl_set_number(L, "energy", e);
    cpl_set_number(L, "energy_scale", scale);
    cpl_set_number(L, "temperature", e / CP_KB);
    return 1;
}

/* args[key] is a cloud table -> c.  Without a 'profile' the atom's statistics choose it: a
 * fermion is 'fermi', a boson 'bose'; a cloud given by mass alone is 'thermal'.  Without a
 * 'scattering_length' an atom's own a_bb is used where it is positive (a condensate needs
 * one).  t_over_tf / t_over_tc set the atom number. */
static void read_cloud(lua_State *L, const char *fname, const char *key, double temperature,
                       cp_feshbach_cloud *c)
{
    static const char *const known[] = {"atom", "mass", "number", "t_over_tf", "t_over_tc",
                                        "omega_x", "omega_y", "omega_z", "profile",
                                        "scattering_length", NULL};
    static const char *const profiles[] = {"thermal", "fermi", "bose", "thomas_fermi", NULL};
    char cname[96];
    snprintf(cname, sizeof cname, "%s: cloud '%s'", fname, key);
    if (lua_getfield(L, 1, key) != LUA_TTABLE)
        cpl_error(L, fname, "argument '%s' must be a cloud table {atom or mass, number or "
                  "t_over_tf/t_over_tc, omega_x, omega_y, omega_z [, profile]}, got %s", key,
                  luaL_typename(L, -1));
    int t = lua_gettop(L);
    cpl_check_args(L, t, cname, known);
    const char *stats = NULL;
    double a_bb = 0.0;
    if (cpl_has(L, t, "atom")) {
        lua_getfield(L, t, "atom");
        if (lua_type(L, -1) == LUA_TSTRING) {
            cpl_push_atom(L, -1);
            lua_remove(L, -2);
        }
        if (!lua_istable(L, -1))
            cpl_error(L, cname, "field 'atom' must be an atom name or table");
        c->mass = field_number(L, -1, cname, "atom", "mass", "kg", 1, 0.0);
        a_bb = field_number(L, -1, cname, "atom", "a_bb", "m", 0, 0.0);
        lua_getfield(L, -1, "statistics");
        stats = lua_tostring(L, -1);
        lua_pop(L, 1); /* the atom table keeps the string alive */
    } else {
        c->mass = cpl_number(L, t, cname, "mass", "kg");
    }
    int dflt = 0;
    if (stats)
        dflt = strcmp(stats, "fermion") == 0 ? 1 : 2;
    c->profile = (cp_feshbach_profile)cpl_option(L, t, cname, "profile", profiles,
                                                 profiles[dflt]);
    c->omega[0] = cpl_number(L, t, cname, "omega_x", "rad/s");
    c->omega[1] = cpl_number(L, t, cname, "omega_y", "rad/s");
    c->omega[2] = cpl_number(L, t, cname, "omega_z", "rad/s");
    c->scattering_length = cpl_opt_number(L, t, cname, "scattering_length", "m",
                                          a_bb > 0.0 ? a_bb : 0.0);
    int has_n = cpl_has(L, t, "number"), has_f = cpl_has(L, t, "t_over_tf"),
        has_c = cpl_has(L, t, "t_over_tc");
    if (has_n + has_f + has_c != 1)
        cpl_error(L, cname, "give exactly one of 'number', 't_over_tf', 't_over_tc'");
    if (has_n) {
        c->number = cpl_number(L, t, cname, "number", "");
    } else {
        const char *k = has_f ? "t_over_tf" : "t_over_tc";
        /* T/T_F describes a Fermi gas, T/T_c a Bose gas: the other pairing would silently
         * give the wrong atom number */
        if ((has_f && (c->profile == CP_PROFILE_BOSE || c->profile == CP_PROFILE_THOMAS_FERMI)) ||
            (has_c && c->profile == CP_PROFILE_FERMI))
            cpl_error(L, cname, "'%s' does not fit profile '%s'; give 'number', or %s", k,
                      profiles[c->profile], has_f ? "'t_over_tc' for a Bose gas"
                                                  : "'t_over_tf' for a Fermi gas");
        double x = cpl_number(L, t, cname, k, "");
        if (!(x > 0.0 && x <= 1e3))
            cpl_error(L, cname, "%s %g is out of range; allowed (0, 1000]", k, x);
        if (!(temperature > 0.0))
            cpl_error(L, cname, "'%s' needs a positive 'temperature'", k);
        cp_error err;
        if (cp_thermo_number_at(has_f ? CP_FERMION : CP_BOSON, temperature, c->omega, x,
                                &c->number, &err))
            cpl_raise(L, &err);
    }
    lua_settop(L, t - 1);
}

static int l_overlap_density(lua_State *L)
{
    static const char fname[] = "feshbach.overlap_density";
    static const char *const known[] = {"a", "b", "temperature", NULL};
    cp_feshbach_cloud a, b;
    cp_error err;
    double n, sag;
    cpl_check_args(L, 1, fname, known);
    double temp = cpl_opt_number(L, 1, fname, "temperature", "K", 0.0);
    read_cloud(L, fname, "a", temp, &a);
    read_cloud(L, fname, "b", temp, &b);
    double key[2 + 2 * CLOUD_KEY] = {TAG_OVERLAP, temp}, res[2];
    cloud_key(&a, key + 2);
    cloud_key(&b, key + 2 + CLOUD_KEY);
    if (!cpl_memo_get(L, key, sizeof key / sizeof key[0], res, 2)) {
        if (cp_feshbach_overlap_density(&a, &b, temp, &n, &sag, &err))
            return cpl_raise(L, &err);
        res[0] = n;
        res[1] = sag;
        cpl_memo_put(L, key, sizeof key / sizeof key[0], res, 2);
    }
    lua_createtable(L, 0, 2);
    cpl_set_number(L, "density", res[0]);
    cpl_set_number(L, "sag", res[1]);
    return 1;
}

static int l_max_efficiency(lua_State *L)
{
    static const char fname[] = "feshbach.max_efficiency";
    static const char *const known[] = {"a", "b", "temperature", "gamma", "samples", "seed",
                                        "sag", "allow_long", NULL};
    cp_feshbach_cloud a, b;
    cp_feshbach_spss opts;
    cp_error err;
    double p, se;
    cpl_check_args(L, 1, fname, known);
    double temp = cpl_number(L, 1, fname, "temperature", "K");
    read_cloud(L, fname, "a", temp, &a);
    read_cloud(L, fname, "b", temp, &b);
    opts.gamma = cpl_opt_number(L, 1, fname, "gamma", "", 0.38);
    opts.samples = cpl_opt_integer(L, 1, fname, "samples", 20000, 100, 10000000);
    opts.seed = (unsigned long)cpl_opt_integer(L, 1, fname, "seed", 1, 0, 4294967295L);
    opts.include_sag = cpl_opt_boolean(L, 1, fname, "sag", 1);
    double key[6 + 2 * CLOUD_KEY] = {TAG_MAX_EFFICIENCY, temp, opts.gamma, (double)opts.samples,
                                     (double)opts.seed, opts.include_sag},
           res[2];
    cloud_key(&a, key + 6);
    cloud_key(&b, key + 6 + CLOUD_KEY);
    if (!cpl_memo_get(L, key, sizeof key / sizeof key[0], res, 2)) {
        if (cp_feshbach_max_efficiency_bounded(&a, &b, temp, &opts, &p, &se, cpl_cancel_flag(L),
                                               cpl_work_limit(L, 1, fname), &err))
            return cpl_raise(L, &err);
        res[0] = p;
        res[1] = se;
        cpl_memo_put(L, key, sizeof key / sizeof key[0], res, 2);
    }
    lua_createtable(L, 0, 2);
    cpl_set_number(L, "max_efficiency", res[0]);
    cpl_set_number(L, "std_error", res[1]);
    return 1;
}

static int l_memo(lua_State *L)
{
    static const char fname[] = "feshbach.memo";
    static const char *const known[] = {"enabled", NULL};
    if (lua_isnoneornil(L, 1))
        lua_newtable(L);
    cpl_check_args(L, 1, fname, known);
    if (cpl_has(L, 1, "enabled"))
        cpl_memo_enable(L, cpl_opt_boolean(L, 1, fname, "enabled", 1));
    lua_createtable(L, 0, 2);
    cpl_set_integer(L, "size", cpl_memo_size(L));
    cpl_set_boolean(L, "enabled", cpl_memo_enabled(L));
    return 1;
}

static const cpl_function functions[] = {
    {"scattering_length", l_scattering_length,
     "feshbach.scattering_length{resonance, field (T)} -> {a (m)}\n"
     "a(B) = abg (1 - width/(B - b0)) (Moerdijk et al. 1995).  resonance: the table of\n"
     "cp.species.resonance (b0, width, abg, dmu in SI) or a molecule name.  A field at b0\n"
     "is an error.  Example:\n"
     "  r = cp.species.resonance('KRb')\n"
     "  cp.feshbach.scattering_length{resonance = r, field = 546*cp.units.G}.a / cp.units.a0"},
    {"binding_energy", l_binding_energy,
     "feshbach.binding_energy{resonance, field (T), molecule [, model = 'auto', c6_au]}\n"
     "  -> {energy (J), energy_hz (Hz), model, a (m), rstar (m), abar (m), s_res, flags}\n"
     "Binding energy below the resonance (field < b0).  model: 'universal' hbar^2/(2 mu a^2),\n"
     "'corrected' hbar^2/(2 mu (a - abar)^2) (needs the atom-pair C6: resonance.c6_au or\n"
     "c6_au), 'linear' dmu |B - b0|, 'auto' (corrected where a > 2 abar + R*, else linear).\n"
     "flags: validity flags, {} inside the range: 'below_abar' (0 < a < abar, no halo form\n"
     "applies), 'past_zero_crossing' (a <= 0), 'linear_broad' (linear form at s_res >= 1).\n"
     "molecule: a name or cp.species.molecule table (for the reduced mass).  Example:\n"
     "  cp.feshbach.binding_energy{resonance = 'KRb', molecule = 'KRb',\n"
     "                             field = 546.4*cp.units.G}.energy_hz"},
    {"associate", l_associate,
     "feshbach.associate{resonance, molecule, ramp_rate (T/s), density (m^-3)\n"
     "                   [, max_efficiency = 1, alpha (m^2/s)]} -> {efficiency, lz_parameter}\n"
     "Ramp-rate law (Hodby et al. 2005): P = Pmax (1 - exp(-alpha n |abg width / Bdot|)),\n"
     "2 pi lz_parameter = alpha n |abg width/Bdot|.  Default alpha = 4 pi^2 hbar / mu with n =\n"
     "the partner density averaged over the minority cloud (overlap_density).  A measured\n"
     "alpha brings its own density convention (e.g. peak density).  Only |ramp_rate| is used.\n"
     "For speed pass tables (cp.species.resonance / cp.species.molecule), not names.\n"
     "Example: cp.feshbach.associate{resonance = 'KRb', molecule = 'KRb',\n"
     "  ramp_rate = -0.5*cp.units.G/cp.units.ms, density = 1e18}.efficiency"},
    {"ramp_law", l_ramp_law,
     "feshbach.ramp_law{resonance, molecule, density (m^-3), ramp_rates = {T/s, ...}\n"
     "                  [, max_efficiency = 1, alpha]} -> {efficiency = {...}}\n"
     "The ramp-rate law of associate over an array of ramp rates (one C batch call).\n"
     "ramp_rates may be a cp.reals; efficiency is then a reals too.\n"
     "Example: cp.feshbach.ramp_law{resonance = 'KRb', molecule = 'KRb', density = 1e18,\n"
     "  ramp_rates = {1e-1, 1, 10}}.efficiency[2]"},
    {"associate_site", l_associate_site,
     "feshbach.associate_site{resonance, molecule, ramp_rate (T/s), omega_x, omega_y, omega_z\n"
     "                        (rad/s) [, max_efficiency = 1]} -> {efficiency, lz_parameter}\n"
     "Two atoms in the ground state of one harmonic site (lattice site, tweezer):\n"
     "2 pi delta = (4 pi^2 hbar |abg width| / (mu |Bdot|)) (mu/(pi hbar))^(3/2)\n"
     "sqrt(wx wy wz), with the relative-motion frequencies (= the site frequencies when both\n"
     "atoms see the same).  Example:\n"
     "  cp.feshbach.associate_site{resonance = 'KRb', molecule = 'KRb',\n"
     "  ramp_rate = 1e-3/1e-3, omega_x = 2*math.pi*50e3, omega_y = 2*math.pi*50e3,\n"
     "  omega_z = 2*math.pi*50e3}.efficiency"},
    {"lz_probability", l_lz_probability,
     "feshbach.lz_probability{lz_parameter} -> {probability}\n"
     "Landau–Zener adiabatic-passage probability 1 - exp(-2 pi lz_parameter).\n"
     "Example: cp.feshbach.lz_probability{lz_parameter = 0.1}.probability"},
    {"dissociation_energy", l_dissociation_energy,
     "feshbach.dissociation_energy{resonance, molecule, ramp_rate (T/s)}\n"
     "  -> {energy (J), energy_scale (J), temperature (K, energy/kB)}\n"
     "Mean relative kinetic energy released when molecules are dissociated by a ramp up\n"
     "across the resonance at |ramp_rate|: survival exp(-(E/eps)^(3/2)),\n"
     "eps = [3 hbar^2 |Bdot| / (4 |abg width| sqrt(2 mu))]^(2/3), energy = Gamma(5/3) eps.\n"
     "Example: cp.feshbach.dissociation_energy{resonance = 'KRb', molecule = 'KRb',\n"
     "  ramp_rate = 1*cp.units.G/cp.units.ms}.temperature"},
    {"overlap_density", l_overlap_density,
     "feshbach.overlap_density{a = cloud, b = cloud [, temperature (K)]} -> {density (m^-3),\n"
     "  sag (m, z_b - z_a)}\n"
     "(1/N_b) Int n_a n_b d^3r: the density of partner cloud a averaged over cloud b, with\n"
     "each cloud sagging by g/omega_z^2.  cloud = {atom = name or mass = kg, number or\n"
     "t_over_tf / t_over_tc, omega_x, omega_y, omega_z (rad/s) [, profile = 'thermal' |\n"
     "'fermi' | 'bose' | 'thomas_fermi' (default by the atom's statistics: 'fermi' or 'bose';\n"
     "'thermal' for a cloud given by mass), scattering_length (m; default the atom's a_bb)]}.\n"
     "'bose' below T_c: the ideal-gas condensed fraction as a Thomas–Fermi condensate set by\n"
     "scattering_length (needed, > 0), the saturated thermal part around it.  temperature\n"
     "is needed except for two Thomas–Fermi clouds.  Example:\n"
     "  w = 2*math.pi*100; c = {atom = '87Rb', number = 1e5, omega_x = w, omega_y = w,\n"
     "  omega_z = w, profile = 'thermal'}\n"
     "  cp.feshbach.overlap_density{a = c, b = c, temperature = 300e-9}.density"},
    {"max_efficiency", l_max_efficiency,
     "feshbach.max_efficiency{a = cloud, b = cloud, temperature (K) [, gamma = 0.38,\n"
     "  samples = 20000, seed = 1, sag = true, allow_long = false]} -> {max_efficiency,\n"
     "  std_error}; more samples than 1 s of CPU (about 4e6) need allow_long = true\n"
     "Phase-space ceiling P_max of association (stochastic phase-space sampling, Hodby et\n"
     "al. 2005): fraction of the minority cloud b that finds a partner of cloud a within a\n"
     "relative phase-space cell gamma h^3.  Clouds as in overlap_density ('thermal', 'fermi'\n"
     "or 'bose').  A condensate is not counted in cells: a condensed minority atom pairs with\n"
     "probability min(1, n_a,c/n_b,c), the local ratio of the condensate densities\n"
     "(docs/models/feshbach.md).  Deterministic for a given seed.  Example: w = 2*math.pi*100\n"
     "  cp.feshbach.max_efficiency{temperature = 200e-9,\n"
     "  a = {atom = '87Rb', t_over_tc = 1.2, omega_x = w, omega_y = w, omega_z = w},\n"
     "  b = {atom = '40K', t_over_tf = 0.3, omega_x = w, omega_y = w, omega_z = w}}"},
    {"memo", l_memo,
     "feshbach.memo{[enabled = true | false]} -> {size, enabled}\n"
     "overlap_density and max_efficiency remember their results for the inputs already seen\n"
     "in this session (each sweep worker has its own memo; a result is returned bit for bit\n"
     "as first computed); so do, under the same switch, cp.collisions.shielded (its\n"
     "temperature-independent tables) and the transfer stage (its Raman result).  enabled =\n"
     "false turns all of that off and empties it; size is the number of Feshbach results\n"
     "kept (at most 256).  Example: cp.feshbach.memo{enabled = false}"},
    {NULL, NULL, NULL}};

int cpl_open_feshbach(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, functions);
    return 1;
}

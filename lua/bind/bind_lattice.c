/*
 * Lua binding: coldprep.lattice over core/lattice*.c — recoil, depth from beams (1D and
 * 3D), band structure, tunnelling, on-site frequency and Lamb-Dicke parameter, Wannier
 * functions, photon-scattering heating and loading adiabaticity.  Arrays handed to C live
 * in userdata (cpl_number_array, lua_newuserdatauv) so that a Lua error never leaks them.
 */
#include <lauxlib.h>
#include <lua.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "args.h"
#include "coldprep/consts.h"
#include "coldprep/lattice.h"
#include "help.h"
#include "reals.h"
#include "species_lookup.h"

int cpl_open_lattice(lua_State *L);

enum { MAX_ENERGIES = 2000000 }; /* quasimomenta x bands in one bands{} call */

/* Scratch array of n doubles owned by a userdata pushed on the stack. */
static double *scratch(lua_State *L, size_t n)
{
    return lua_newuserdatauv(L, (n > 0 ? n : 1) * sizeof(double), 0);
}

/* A polarizability given under exactly one of <prefix>_au, <prefix> (SI) or <prefix>_hz. */
static double read_polarizability(lua_State *L, int arg, const char *fname, const char *prefix,
                                  cp_polarizability_unit *unit)
{
    static const struct {
        const char *suffix, *unit_name;
        cp_polarizability_unit unit;
    } forms[] = {{"_au", "a.u.", CP_POLARIZABILITY_AU},
                 {"", "C m^2/V", CP_POLARIZABILITY_SI},
                 {"_hz", "Hz/(W/cm^2)", CP_POLARIZABILITY_HZ_PER_W_CM2}};
    double value = NAN;
    int found = 0;
    char key[64];
    for (int i = 0; i < 3; i++) {
        snprintf(key, sizeof key, "%s%s", prefix, forms[i].suffix);
        if (!cpl_has(L, arg, key))
            continue;
        if (found++)
            cpl_error(L, fname, "give the polarizability once: %s_au, %s or %s_hz", prefix,
                      prefix, prefix);
        value = cpl_number(L, arg, fname, key, forms[i].unit_name);
        *unit = forms[i].unit;
    }
    if (!found)
        cpl_error(L, fname, "missing argument '%s_au' (a.u.; or '%s' in C m^2/V, '%s_hz' in "
                  "Hz/(W/cm^2))", prefix, prefix, prefix);
    return value;
}

static const char *const BEAM_KEYS[] = {"power",          "waist",        "wavelength",
                                        "polarizability_au", "polarizability", "polarizability_hz",
                                        "species",        "reflectivity", "angle",
                                        NULL};

/* The polarizability of a beam: given under one of the polarizability keys, or else the
 * value of 'species' at the beam's wavelength, a user-added species' own or the built-in
 * one (cpl_species_polarizability, whose error asks for polarizability_au where there is
 * none). */
static double beam_polarizability(lua_State *L, int arg, const char *fname, double wavelength,
                                  cp_polarizability_unit *unit)
{
    int given = cpl_has(L, arg, "polarizability_au") || cpl_has(L, arg, "polarizability") ||
                cpl_has(L, arg, "polarizability_hz");
    if (!cpl_has(L, arg, "species") || given) {
        if (given && cpl_has(L, arg, "species"))
            cpl_error(L, fname, "give either 'species' or a polarizability, not both");
        return read_polarizability(L, arg, fname, "polarizability", unit);
    }
    const char *name = cpl_opt_string(L, arg, fname, "species", NULL);
    lua_pushstring(L, name);
    double alpha = cpl_species_polarizability(L, -1, wavelength, fname);
    lua_pop(L, 1);
    *unit = CP_POLARIZABILITY_AU;
    return alpha;
}

/* Read the beam fields from the table at arg (keys checked by the caller). */
static cp_lattice_beam read_beam(lua_State *L, int arg, const char *fname)
{
    cp_lattice_beam b;
    b.power = cpl_number(L, arg, fname, "power", "W");
    b.waist = cpl_number(L, arg, fname, "waist", "m");
    b.wavelength = cpl_number(L, arg, fname, "wavelength", "m");
    b.polarizability = beam_polarizability(L, arg, fname, b.wavelength, &b.unit);
    b.reflectivity = cpl_opt_number(L, arg, fname, "reflectivity", "", 1.0);
    b.angle = cpl_opt_number(L, arg, fname, "angle", "rad", CP_PI);
    return b;
}

static void push_depth(lua_State *L, const cp_lattice_depth_result *r, int with_mass)
{
    lua_createtable(L, 0, 16);
    cpl_set_number(L, "depth", r->depth);
    cpl_set_number(L, "depth_hz", r->depth / CP_H);
    cpl_set_number(L, "well_bottom", r->well_bottom);
    cpl_set_number(L, "offset", r->offset);
    cpl_set_number(L, "spacing", r->spacing);
    cpl_set_number(L, "peak_intensity", r->peak_intensity);
    cpl_set_number(L, "polarizability", r->alpha_si);
    cpl_set_number(L, "rayleigh_range", r->rayleigh_range);
    if (!with_mass)
        return;
    cpl_set_number(L, "recoil", r->recoil);
    cpl_set_number(L, "depth_er", r->depth_er);
    cpl_set_number(L, "omega_site", r->omega_site);
    cpl_set_number(L, "omega_axial", r->omega_axial);
    cpl_set_number(L, "omega_radial", r->omega_radial);
    cpl_set_number(L, "omega_bisector", r->omega_bisector);
    cpl_set_number(L, "sag", r->sag);
}

static int l_recoil(lua_State *L)
{
    static const char *const keys[] = {"mass", "wavelength", NULL};
    const char *fname = "lattice.recoil";
    cpl_check_args(L, 1, fname, keys);
    double m = cpl_number(L, 1, fname, "mass", "kg");
    double lambda = cpl_number(L, 1, fname, "wavelength", "m");
    double e, f;
    cp_error err;
    if (cp_lattice_recoil(m, lambda, &e, &f, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 2);
    cpl_set_number(L, "energy", e);
    cpl_set_number(L, "frequency_hz", f);
    return 1;
}

static int l_depth(lua_State *L)
{
    static const char *const keys[] = {"power",          "waist",          "wavelength",
                                       "polarizability_au", "polarizability", "polarizability_hz",
                                       "species",        "reflectivity",   "angle",
                                       "mass",           NULL};
    const char *fname = "lattice.depth";
    cpl_check_args(L, 1, fname, keys);
    cp_lattice_beam b = read_beam(L, 1, fname);
    int with_mass = cpl_has(L, 1, "mass");
    double m = with_mass ? cpl_number(L, 1, fname, "mass", "kg") : 0.0;
    if (with_mass && m == 0.0)
        return cpl_error(L, fname, "argument 'mass' must be positive (kg), got 0");
    cp_lattice_depth_result r;
    cp_error err;
    if (cp_lattice_depth(&b, m, &r, &err) != CP_OK)
        return cpl_raise(L, &err);
    push_depth(L, &r, with_mass);
    return 1;
}

static int l_depth3d(lua_State *L)
{
    static const char *const keys[] = {"beams", "mass", "gravity_axis", NULL};
    static const char *const axes[] = {"x", "y", "z", NULL};
    const char *fname = "lattice.depth3d";
    cpl_check_args(L, 1, fname, keys);
    double m = cpl_number(L, 1, fname, "mass", "kg");
    int gravity = cpl_option(L, 1, fname, "gravity_axis", axes, "z");
    if (lua_getfield(L, 1, "beams") != LUA_TTABLE || luaL_len(L, -1) != 3)
        return cpl_error(L, fname, "argument 'beams' must be an array of 3 beam tables "
                         "(along x, y, z)");
    cp_lattice_beam beams[3];
    char bname[64];
    for (int i = 0; i < 3; i++) {
        snprintf(bname, sizeof bname, "%s beams[%d]", fname, i + 1);
        lua_geti(L, -1, i + 1);
        cpl_check_args(L, -1, bname, BEAM_KEYS);
        beams[i] = read_beam(L, lua_gettop(L), bname);
        lua_pop(L, 1);
    }
    lua_pop(L, 1);
    cp_lattice_3d_result r;
    cp_error err;
    if (cp_lattice_depth_3d(beams, m, gravity, &r, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 6);
    lua_createtable(L, 3, 0);
    for (int i = 0; i < 3; i++) {
        push_depth(L, &r.axis[i], 1);
        lua_rawseti(L, -2, i + 1);
    }
    lua_setfield(L, -2, "axes");
    cpl_push_array(L, r.omega, 3);
    lua_setfield(L, -2, "omega");
    cpl_set_number(L, "omega_bar", r.omega_bar);
    cpl_set_number(L, "well_bottom", r.well_bottom);
    cpl_set_number(L, "sag", r.sag);
    cp_lattice_gravity_result g;
    if (cp_lattice_gravity(beams, m, gravity, &g, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 6);
    lua_pushboolean(L, g.held);
    lua_setfield(L, -2, "held");
    cpl_set_number(L, "depth", g.depth);
    cpl_set_number(L, "depth_no_gravity", g.depth_no_gravity);
    cpl_set_number(L, "max_gravity", g.max_gravity);
    if (g.held) {
        cpl_set_number(L, "sag", g.sag);
        cpl_set_number(L, "omega", g.omega);
    }
    lua_setfield(L, -2, "gravity");
    return 1;
}

static int l_bands(lua_State *L)
{
    static const char *const keys[] = {"depth_er", "bands", "quasimomenta", "points", "basis",
                                       "allow_long", NULL};
    const char *fname = "lattice.bands";
    cpl_check_args(L, 1, fname, keys);
    double depth = cpl_number(L, 1, fname, "depth_er", "E_r");
    if (!cpl_has(L, 1, "bands"))
        return cpl_error(L, fname, "missing argument 'bands' (an integer in [1, %d])",
                         CP_LATTICE_MAX_BANDS);
    int nb = (int)cpl_opt_integer(L, 1, fname, "bands", 1, 1, CP_LATTICE_MAX_BANDS);
    int basis = (int)cpl_opt_integer(L, 1, fname, "basis", 0, 0, CP_LATTICE_MAX_BASIS);
    size_t nq;
    const double *q;
    /* a reals of quasimomenta gives reals back (energies_er: a table of reals over bands) */
    int as_reals = cpl_is_reals_field(L, 1, "quasimomenta");
    if (cpl_has(L, 1, "quasimomenta")) {
        if (cpl_has(L, 1, "points"))
            return cpl_error(L, fname, "give either 'quasimomenta' or 'points', not both");
        q = cpl_number_array(L, 1, fname, "quasimomenta", "k", 1, &nq);
    } else {
        nq = (size_t)cpl_opt_integer(L, 1, fname, "points", 51, 1, 1000000);
        double *grid = scratch(L, nq);
        for (size_t i = 0; i < nq; i++)
            grid[i] = nq == 1 ? 0.0 : -1.0 + 2.0 * (double)i / (double)(nq - 1);
        q = grid;
    }
    if (nq * (size_t)nb > MAX_ENERGIES)
        return cpl_error(L, fname, "%zu quasimomenta x %d bands is too many; allowed at most "
                         "%d energies", nq, nb, MAX_ENERGIES);
    double *e = scratch(L, nq * (size_t)nb);
    int used;
    cp_error err;
    if (cp_lattice_band_energies_bounded(depth, nb, basis, nq, q, e, &used, cpl_cancel_flag(L),
                                         cpl_work_limit(L, 1, fname), &err) != CP_OK)
        return cpl_raise(L, &err);
    double centre[CP_LATTICE_MAX_BANDS], edge[CP_LATTICE_MAX_BANDS],
        width[CP_LATTICE_MAX_BANDS], gap[CP_LATTICE_MAX_BANDS];
    cp_lattice_band_summary s = {nb, 0, centre, edge, width, gap};
    double j1, j2, jerr;
    if (cp_lattice_band_summary_compute(depth, &s, &err) != CP_OK ||
        cp_lattice_tunnelling(depth, 0, &j1, &j2, NULL, &jerr, &err) != CP_OK)
        return cpl_raise(L, &err);

    lua_createtable(L, 0, 10);
    cpl_push_array(L, width, (size_t)nb);
    lua_setfield(L, -2, "width_er");
    cpl_push_array(L, gap, (size_t)nb - 1);
    lua_setfield(L, -2, "gap_er");
    cpl_set_number(L, "tunnelling_er", j1);
    cpl_set_number(L, "tunnelling2_er", j2);
    cpl_set_number(L, "tunnelling_error_er", jerr);
    lua_createtable(L, nb, 0);
    for (int n = 0; n < nb; n++) {
        double pair[2] = {centre[n], edge[n]};
        cpl_push_array(L, pair, 2);
        lua_rawseti(L, -2, n + 1);
    }
    lua_setfield(L, -2, "edges_er");
    lua_createtable(L, (int)nq, 0);
    for (size_t i = 0; i < nq; i++) {
        cpl_push_numbers(L, e + i * (size_t)nb, (size_t)nb, as_reals);
        lua_rawseti(L, -2, (lua_Integer)i + 1);
    }
    lua_setfield(L, -2, "energies_er");
    cpl_push_numbers(L, q, nq, as_reals);
    lua_setfield(L, -2, "quasimomenta");
    cpl_set_integer(L, "basis_size", used);
    return 1;
}

static int l_tunnelling(lua_State *L)
{
    static const char *const keys[] = {"depth_er", "band", NULL};
    const char *fname = "lattice.tunnelling";
    cpl_check_args(L, 1, fname, keys);
    double depth = cpl_number(L, 1, fname, "depth_er", "E_r");
    int band = (int)cpl_opt_integer(L, 1, fname, "band", 1, 1,
                                    CP_LATTICE_MAX_TUNNEL_BAND + 1);
    double j1, j2, mean, jerr;
    cp_error err;
    if (cp_lattice_tunnelling(depth, band - 1, &j1, &j2, &mean, &jerr, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 4);
    cpl_set_number(L, "tunnelling_er", j1);
    cpl_set_number(L, "tunnelling2_er", j2);
    cpl_set_number(L, "mean_er", mean);
    cpl_set_number(L, "error_er", jerr);
    return 1;
}

static int l_site(lua_State *L)
{
    static const char *const keys[] = {"depth_er", "probe_ratio", "probe_wavelength",
                                       "wavelength", "mass", NULL};
    const char *fname = "lattice.site";
    cpl_check_args(L, 1, fname, keys);
    double depth = cpl_number(L, 1, fname, "depth_er", "E_r");
    double ratio = cpl_opt_number(L, 1, fname, "probe_ratio", "", 1.0);
    int has_lambda = cpl_has(L, 1, "wavelength");
    double lambda = has_lambda ? cpl_number(L, 1, fname, "wavelength", "m") : NAN;
    if (cpl_has(L, 1, "probe_wavelength")) {
        if (cpl_has(L, 1, "probe_ratio") || !has_lambda)
            return cpl_error(L, fname, "'probe_wavelength' needs 'wavelength' (the lattice's) "
                             "and excludes 'probe_ratio'");
        double lp = cpl_number(L, 1, fname, "probe_wavelength", "m");
        if (!(lp > 0))
            return cpl_error(L, fname, "argument 'probe_wavelength' must be positive (m), "
                             "got %g", lp);
        ratio = lambda / lp;
    }
    double hw, eta;
    cp_error err;
    if (cp_lattice_site(depth, ratio, &hw, &eta, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 3);
    cpl_set_number(L, "hbar_omega_er", hw);
    cpl_set_number(L, "lamb_dicke", eta);
    if (cpl_has(L, 1, "mass")) {
        if (!has_lambda)
            return cpl_error(L, fname, "'mass' needs 'wavelength' to give omega in rad/s");
        double er;
        if (cp_lattice_recoil(cpl_number(L, 1, fname, "mass", "kg"), lambda, &er, NULL,
                              &err) != CP_OK)
            return cpl_raise(L, &err);
        cpl_set_number(L, "omega", hw * er / CP_HBAR);
    }
    return 1;
}

static int l_wannier(lua_State *L)
{
    static const char *const keys[] = {"depth_er", "band", "range", "points", "allow_long",
                                       NULL};
    const char *fname = "lattice.wannier";
    cpl_check_args(L, 1, fname, keys);
    double depth = cpl_number(L, 1, fname, "depth_er", "E_r");
    int band = (int)cpl_opt_integer(L, 1, fname, "band", 1, 1, 10);
    double range = cpl_opt_number(L, 1, fname, "range", "sites", 3.0);
    size_t n = (size_t)cpl_opt_integer(L, 1, fname, "points", 601, 2, 100000);
    double *x = scratch(L, n), *w = scratch(L, n);
    cp_error err;
    double limit = cpl_work_limit(L, 1, fname);
    if (cp_lattice_wannier_bounded(depth, band - 1, range, n, x, w, cpl_cancel_flag(L), limit,
                                   &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 2);
    cpl_push_array(L, x, n);
    lua_setfield(L, -2, "x_sites");
    cpl_push_array(L, w, n);
    lua_setfield(L, -2, "w");
    return 1;
}

/* Scattering rate from <prefix> polarizability keys and 'intensity'. */
static double read_scattering(lua_State *L, const char *fname)
{
    cp_polarizability_unit unit;
    double alpha = read_polarizability(L, 1, fname, "polarizability_imag", &unit);
    double intensity = cpl_number(L, 1, fname, "intensity", "W/m^2");
    double rate;
    cp_error err;
    if (cp_lattice_scattering_rate(alpha, unit, intensity, &rate, &err) != CP_OK)
        cpl_raise(L, &err);
    return rate;
}

static int l_scattering_rate(lua_State *L)
{
    static const char *const keys[] = {"polarizability_imag_au", "polarizability_imag",
                                       "polarizability_imag_hz", "intensity", NULL};
    const char *fname = "lattice.scattering_rate";
    cpl_check_args(L, 1, fname, keys);
    double rate = read_scattering(L, fname);
    lua_createtable(L, 0, 1);
    cpl_set_number(L, "rate", rate);
    return 1;
}

/* Names of the CP_LATTICE_FLAG_* bits, in bit order. */
static const char *const FLAG_NAMES[] = {"shallow", "beyond_first_order", NULL};

static int l_heating(lua_State *L)
{
    static const char *const keys[] = {"scattering_rate", "polarizability_imag_au",
                                       "polarizability_imag", "polarizability_imag_hz",
                                       "intensity", "mass", "wavelength", "depth_er", NULL};
    const char *fname = "lattice.heating";
    cpl_check_args(L, 1, fname, keys);
    double rate;
    if (cpl_has(L, 1, "scattering_rate")) {
        if (cpl_has(L, 1, "intensity") || cpl_has(L, 1, "polarizability_imag_au") ||
            cpl_has(L, 1, "polarizability_imag") || cpl_has(L, 1, "polarizability_imag_hz"))
            return cpl_error(L, fname, "give either 'scattering_rate' or an imaginary "
                             "polarizability with 'intensity', not both");
        rate = cpl_number(L, 1, fname, "scattering_rate", "1/s");
    } else {
        rate = read_scattering(L, fname);
    }
    double m = cpl_number(L, 1, fname, "mass", "kg");
    double lambda = cpl_number(L, 1, fname, "wavelength", "m");
    double depth = cpl_number(L, 1, fname, "depth_er", "E_r");
    double er;
    cp_lattice_heating_result r;
    cp_error err;
    if (cp_lattice_recoil(m, lambda, &er, NULL, &err) != CP_OK ||
        cp_lattice_heating(rate, er, depth, &r, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 5);
    cpl_set_number(L, "scattering_rate", rate);
    cpl_set_number(L, "energy_rate", r.energy_rate);
    cpl_set_number(L, "temperature_rate", r.temperature_rate);
    cpl_set_number(L, "band_excitation_rate", r.band_excitation_rate);
    cpl_set_number(L, "lamb_dicke", r.lamb_dicke);
    cpl_set_flags(L, r.flags, FLAG_NAMES);
    return 1;
}

/* A ramp sampled from a Lua function depth(t) (E_r) at n points over [0, duration]. */
static void sample_function(lua_State *L, const char *fname, double duration, size_t n,
                            double **times, double **depths)
{
    if (!(duration > 0))
        cpl_error(L, fname, "argument 'duration' must be positive (s), got %g", duration);
    *times = scratch(L, n);
    *depths = scratch(L, n);
    for (size_t i = 0; i < n; i++) {
        double t = duration * (double)i / (double)(n - 1);
        lua_getfield(L, 1, "depth");
        lua_pushnumber(L, t);
        lua_call(L, 1, 1);
        int ok = 0;
        double v = lua_tonumberx(L, -1, &ok);
        if (!ok || lua_type(L, -1) != LUA_TNUMBER || !isfinite(v))
            cpl_error(L, fname, "depth(%g s) must return a finite number (E_r), got %s", t,
                      luaL_tolstring(L, -1, NULL));
        lua_pop(L, 1);
        (*times)[i] = t;
        (*depths)[i] = v;
    }
}

/* Raise an error if any of `keys` is present: they do not apply to this kind of ramp. */
static void reject_keys(lua_State *L, const char *fname, const char *const keys[],
                        const char *kind)
{
    for (int i = 0; keys[i]; i++)
        if (cpl_has(L, 1, keys[i]))
            cpl_error(L, fname, "argument '%s' does not apply to a %s ramp", keys[i], kind);
}

static int l_loading(lua_State *L)
{
    static const char *const keys[] = {"shape",    "start_er", "end_er", "duration",
                                       "time_constant", "samples", "times", "depths_er",
                                       "depth",    "mass",     "wavelength", "recoil", NULL};
    static const char *const shapes[] = {"linear", "exponential", "s-shaped", "sampled", NULL};
    const char *fname = "lattice.loading";
    cpl_check_args(L, 1, fname, keys);
    cp_lattice_ramp r;
    memset(&r, 0, sizeof r);
    r.shape = (cp_lattice_ramp_shape)cpl_option(L, 1, fname, "shape", shapes, "s-shaped");
    r.samples = (size_t)cpl_opt_integer(L, 1, fname, "samples", 1000, 2, 100000);
    if (cpl_has(L, 1, "recoil")) {
        if (cpl_has(L, 1, "mass") || cpl_has(L, 1, "wavelength"))
            return cpl_error(L, fname, "give either 'recoil' or 'mass' and 'wavelength'");
        r.recoil = cpl_number(L, 1, fname, "recoil", "J");
    } else {
        cp_error err;
        double m = cpl_number(L, 1, fname, "mass", "kg");
        double lambda = cpl_number(L, 1, fname, "wavelength", "m");
        if (cp_lattice_recoil(m, lambda, &r.recoil, NULL, &err) != CP_OK)
            return cpl_raise(L, &err);
    }
    reject_keys(L, fname, r.shape == CP_RAMP_SAMPLED
                              ? (const char *const[]){"start_er", "end_er", "time_constant", NULL}
                              : (const char *const[]){"times", "depths_er", "depth", NULL},
                shapes[r.shape]);
    if (r.shape != CP_RAMP_EXPONENTIAL && r.shape != CP_RAMP_SAMPLED)
        reject_keys(L, fname, (const char *const[]){"time_constant", NULL}, shapes[r.shape]);
    if (r.shape == CP_RAMP_SAMPLED) {
        if (!cpl_has(L, 1, "depth"))
            reject_keys(L, fname, (const char *const[]){"duration", "samples", NULL},
                        "sampled from arrays");
        if (cpl_has(L, 1, "depth")) {
            if (lua_getfield(L, 1, "depth") != LUA_TFUNCTION)
                return cpl_error(L, fname, "argument 'depth' must be a function of time (s) "
                                 "returning E_r, got %s", luaL_typename(L, -1));
            lua_pop(L, 1);
            double *t, *d;
            sample_function(L, fname, cpl_number(L, 1, fname, "duration", "s"), r.samples, &t,
                            &d);
            r.times = t;
            r.depths_er = d;
            r.n_sampled = r.samples;
        } else {
            size_t nt, nd;
            r.times = cpl_number_array(L, 1, fname, "times", "s", 2, &nt);
            r.depths_er = cpl_number_array(L, 1, fname, "depths_er", "E_r", 2, &nd);
            if (nt != nd)
                return cpl_error(L, fname, "'times' has %zu values but 'depths_er' has %zu",
                                 nt, nd);
            r.n_sampled = nt;
        }
    } else {
        r.start_er = cpl_opt_number(L, 1, fname, "start_er", "E_r", 0.0);
        r.end_er = cpl_number(L, 1, fname, "end_er", "E_r");
        r.duration = cpl_number(L, 1, fname, "duration", "s");
        if (r.shape == CP_RAMP_EXPONENTIAL)
            r.time_constant = cpl_number(L, 1, fname, "time_constant", "s");
    }
    cp_lattice_loading_result res;
    cp_error err;
    if (cp_lattice_loading(&r, &res, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 7);
    cpl_set_number(L, "max_adiabaticity", res.max_adiabaticity);
    cpl_set_number(L, "max_time", res.max_time);
    cpl_set_number(L, "max_depth_er", res.max_depth_er);
    cpl_set_number(L, "simple_criterion", res.simple_criterion);
    cpl_set_number(L, "excited_fraction", res.excited_fraction);
    cpl_set_integer(L, "basis_size", res.basis_size);
    cpl_set_flags(L, res.flags, FLAG_NAMES);
    return 1;
}

static const cpl_function functions[] = {
    {"recoil", l_recoil,
     "lattice.recoil{mass, wavelength}\n"
     "Recoil energy E_r = h^2/(2 m lambda^2) of a particle of mass `mass` (kg) in light of\n"
     "wavelength `wavelength` (m).\n"
     "Returns {energy (J), frequency_hz (E_r/h, Hz)}.\n"
     "Example: cp.lattice.recoil{mass = cp.species.molecule('KRb').mass,\n"
     "         wavelength = 1064*cp.units.nm}"},
    {"depth", l_depth,
     "lattice.depth{power, waist, wavelength, polarizability_au | polarizability |\n"
     "              polarizability_hz | species [, reflectivity = 1] [, angle = pi] [, mass]}\n"
     "Depth of the 1D lattice of a Gaussian beam (power W, waist m = 1/e^2 intensity radius,\n"
     "wavelength m) and its retro-reflection (reflectivity = return/incoming power) or a second\n"
     "beam crossing at full angle `angle` (rad; spacing lambda/(2 sin(angle/2))).  The real\n"
     "polarizability in atomic units, in C m^2/V, or in Hz/(W/cm^2); > 0 (red-detuned); or\n"
     "species = a name whose polarizability is built in at this wavelength\n"
     "(cp.species.polarizability: 1064 nm for Na, K, Rb, Cs; else an error asks for it).\n"
     "V0 = 4 sqrt(reflectivity) Re(alpha) I0/(2 eps0 c), I0 = 2 P/(pi w^2).\n"
     "Returns {depth (J), depth_hz (V0/h), well_bottom (J), offset (J, barrier tops),\n"
     "spacing (m), peak_intensity (I0, W/m^2), polarizability (C m^2/V), rayleigh_range (m)};\n"
     "with `mass` (kg) also recoil (J, h^2/(8 m d^2)), depth_er, omega_site, omega_axial\n"
     "(along the lattice), omega_radial (normal to the beams), omega_bisector (rad/s) and\n"
     "sag (m, gravity normal to the beams).\n"
     "Example: cp.lattice.depth{power = 1*cp.units.W, waist = 100*cp.units.um,\n"
     "         wavelength = 1064*cp.units.nm,\n"
     "         polarizability_au = 1000, mass = cp.species.molecule('KRb').mass}"},
    {"depth3d", l_depth3d,
     "lattice.depth3d{beams = {bx, by, bz}, mass [, gravity_axis = 'z']}\n"
     "A 3D lattice from three orthogonal retro-reflected beams (each a table with the keys of\n"
     "lattice.depth except mass and angle).  Returns {axes = {x, y, z} (results of\n"
     "lattice.depth), omega = {wx, wy, wz} (envelope, rad/s), omega_bar (rad/s),\n"
     "well_bottom (J), sag (m, along gravity_axis 'x', 'y' or 'z', harmonic: g/omega^2),\n"
     "gravity = {held (boolean), sag (m, of the true minimum), omega (rad/s, envelope\n"
     "frequency along gravity there), depth (J, barrier below the minimum minus the\n"
     "minimum), depth_no_gravity (J), max_gravity (m/s^2, the most the envelope holds)}}.\n"
     "Example: local u = cp.units; local b = {power = 1*u.W, waist = 150*u.um,\n"
     "  wavelength = 1064*u.nm, polarizability_au = 1000}\n"
     "  cp.lattice.depth3d{beams = {b, b, b}, mass = cp.species.molecule('KRb').mass}"},
    {"bands", l_bands,
     "lattice.bands{depth_er, bands [, quasimomenta = {...} | points = 51] [, basis = 0]\n"
     "              [, allow_long = false]}\n"
     "Band structure of V0 sin^2(kx) with V0 = depth_er E_r (0..1e4): the lowest `bands`\n"
     "bands (1..200) at the given quasimomenta (units of k; zone = [-1, 1]) or at `points`\n"
     "evenly spaced across the zone (at most 2e6 energies).  Energies in E_r from the\n"
     "potential minimum, converged to 1e-10 E_r with an automatic plane-wave basis (or\n"
     "`basis`, odd).  A scan estimated beyond 1 s of CPU is refused unless allow_long = true.\n"
     "Returns {width_er = {...}, gap_er = {...} (gap_er[n]: bands n, n+1), edges_er =\n"
     "{{E(0), E(1)}, ...}, energies_er = {[i] = {band 1, band 2, ...}}, quasimomenta,\n"
     "tunnelling_er (J of band 1: -(1/pi) int_0^pi E cos(theta) dtheta), tunnelling2_er\n"
     "(next-nearest), tunnelling_error_er, basis_size}.\n"
     "Example: cp.lattice.bands{depth_er = 10, bands = 3, points = 101}"},
    {"tunnelling", l_tunnelling,
     "lattice.tunnelling{depth_er [, band = 1]}\n"
     "Tunnelling of a band from its Fourier components: E = mean - 2 J cos(theta)\n"
     "- 2 J2 cos(2 theta) - ...  Returns {tunnelling_er (J), tunnelling2_er (J2), mean_er,\n"
     "error_er} in E_r.\nExample: cp.lattice.tunnelling{depth_er = 10}.tunnelling_er"},
    {"site", l_site,
     "lattice.site{depth_er [, probe_ratio = 1 | probe_wavelength] [, wavelength] [, mass]}\n"
     "Harmonic on-site frequency hbar omega = 2 sqrt(V0 E_r) and Lamb-Dicke parameter\n"
     "eta = k_p sqrt(hbar/(2 m omega)) for light of wavenumber k_p = probe_ratio k along the\n"
     "lattice (or probe_wavelength, m, with the lattice's wavelength, m).\n"
     "Returns {hbar_omega_er, lamb_dicke}, and omega (rad/s) when mass (kg) and wavelength\n"
     "are given.\nExample: cp.lattice.site{depth_er = 30}.lamb_dicke"},
    {"wannier", l_wannier,
     "lattice.wannier{depth_er [, band = 1] [, range = 3] [, points = 601]\n"
     "                [, allow_long = false]}\n"
     "Maximally localised Wannier function (Kohn's real, symmetric one) of a band (1..10) at\n"
     "depth_er (0.5..1e4), sampled at `points` positions over [-range, range] lattice sites.\n"
     "A call estimated beyond cp.consts.limits.work_seconds of CPU (about 7e4 points at 1e4\n"
     "E_r) is refused unless allow_long = true; Ctrl-C stops it.\n"
     "Returns {x_sites = {...} (units of the spacing d), w = {...} (d^-1/2, integral w^2\n"
     "dx/d = 1)}.\nExample: local wf = cp.lattice.wannier{depth_er = 10, range = 2}"},
    {"scattering_rate", l_scattering_rate,
     "lattice.scattering_rate{polarizability_imag_au | polarizability_imag |\n"
     "                        polarizability_imag_hz, intensity}\n"
     "Photon scattering rate Im(alpha) I/(hbar eps0 c) (1/s) for intensity in W/m^2.\n"
     "I is the intensity at the molecules: at the antinodes of a lattice.depth lattice\n"
     "that is (1 + sqrt(reflectivity))^2 x its peak_intensity (4x for perfect reflection;\n"
     "peak_intensity is one beam's).\n"
     "Returns {rate}.\nExample: cp.lattice.scattering_rate{polarizability_imag_au = 1e-3,\n"
     "         intensity = 1e8}"},
    {"heating", l_heating,
     "lattice.heating{scattering_rate | (polarizability_imag_au ... , intensity), mass,\n"
     "                wavelength, depth_er}\n"
     "Heating by photon scattering in a retro-reflected lattice of depth depth_er: each\n"
     "photon adds 2 E_rec.  Returns {scattering_rate (1/s), energy_rate (J/s per particle),\n"
     "temperature_rate (K/s, 3D harmonic), band_excitation_rate (1/s, out of the lowest band\n"
     "along the axis: Gamma eta^2/3), lamb_dicke, flags ({\"shallow\"} below 3 E_r, where\n"
     "eta^2 > 0.3 and the band-excitation rate does not hold; else {})}.\n"
     "Example: cp.lattice.heating{scattering_rate = 0.1, mass = cp.species.molecule('KRb').mass,\n"
     "         wavelength = 1064*cp.units.nm,\n"
     "         depth_er = 30}"},
    {"loading", l_loading,
     "lattice.loading{shape = 's-shaped' | 'linear' | 'exponential' | 'sampled',\n"
     "                start_er = 0, end_er, duration [, time_constant] [, samples = 1000],\n"
     "                times = {...}, depths_er = {...} | depth = function(t) ... end,\n"
     "                mass, wavelength | recoil}\n"
     "Adiabaticity of loading a condensate (quasimomentum 0) into the lowest band by a depth\n"
     "ramp: linear, exponential (time_constant tau, s), s-shaped (sin^2), or sampled\n"
     "(piecewise linear through times (s) and depths_er, or a function depth(t) in E_r\n"
     "sampled `samples` times over [0, duration]).  Returns {max_adiabaticity (max of\n"
     "hbar |<2|dH/dt|0>|/(E2-E0)^2, << 1 is adiabatic), max_time (s), max_depth_er,\n"
     "simple_criterion (max hbar |dV0/dt|/(16 E_r^2)), excited_fraction (first-order\n"
     "estimate, bands 3 and 5 at q = 0), basis_size, flags ({\"beyond_first_order\"} when\n"
     "excited_fraction > 0.05, past first-order perturbation theory; else {})}.\n"
     "Example: cp.lattice.loading{end_er = 20, duration = 10*cp.units.ms,\n"
     "         mass = cp.species.molecule('KRb').mass, wavelength = 1064*cp.units.nm}"},
    {NULL, NULL, NULL}};

int cpl_open_lattice(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, functions);
    return 1;
}

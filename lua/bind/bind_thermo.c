/*
 * Lua binding: coldprep.thermo over core/thermo*.c — ideal Fermi and Bose gases in a
 * harmonic trap (state, inverses, density profile, time of flight) and entropy matching
 * into another harmonic trap or a lattice with a harmonic envelope.  Every function takes
 * one table of named arguments (SI units) and returns a table; the trap is given by
 * `omega_bar` or by all three of `omega_x`, `omega_y`, `omega_z` (rad/s).
 */
#include <lauxlib.h>
#include <lua.h>
#include <math.h>
#include <string.h>

#include "args.h"
#include "coldprep/consts.h"
#include "coldprep/thermo.h"
#include "help.h"

int cpl_open_thermo(lua_State *L);

#define TRAP_KEYS "number", "omega_bar", "omega_x", "omega_y", "omega_z", "mass"

static const char *const STATISTICS[] = {"boson", "fermion", NULL};

/* number, mass and the trap frequencies from argument 1. */
static void read_trap(lua_State *L, const char *fname, cp_thermo_trap *trap)
{
    static const char *const axes[3] = {"omega_x", "omega_y", "omega_z"};
    cpl_trap_frequencies(L, 1, fname, "omega_bar", axes, trap->omega);
    trap->number = cpl_number(L, 1, fname, "number", "");
    trap->mass = cpl_number(L, 1, fname, "mass", "kg");
}

static cp_statistics read_statistics(lua_State *L, const char *fname)
{
    return cpl_option(L, 1, fname, "statistics", STATISTICS, NULL) == 1 ? CP_FERMION
                                                                        : CP_BOSON;
}

static void push_fermi(lua_State *L, const cp_thermo_fermi_result *r)
{
    lua_createtable(L, 0, 10);
    cpl_set_number(L, "temperature", r->temperature);
    cpl_set_number(L, "fermi_temperature", r->fermi_temperature);
    cpl_set_number(L, "t_over_tf", r->t_over_tf);
    cpl_set_number(L, "fugacity", r->fugacity);
    cpl_set_number(L, "log_fugacity", r->log_fugacity);
    cpl_set_number(L, "chemical_potential", r->chemical_potential);
    cpl_set_number(L, "energy_per_particle", r->energy_per_particle);
    cpl_set_number(L, "entropy_per_particle", r->entropy_per_particle);
    cpl_set_number(L, "peak_density", r->peak_density);
    cpl_set_number(L, "phase_space_density", r->phase_space_density);
}

static void push_bose(lua_State *L, const cp_thermo_bose_result *r)
{
    lua_createtable(L, 0, 11);
    cpl_set_number(L, "temperature", r->temperature);
    cpl_set_number(L, "critical_temperature", r->critical_temperature);
    cpl_set_number(L, "t_over_tc", r->t_over_tc);
    cpl_set_number(L, "condensed_fraction", r->condensed_fraction);
    cpl_set_number(L, "fugacity", r->fugacity);
    cpl_set_number(L, "chemical_potential", r->chemical_potential);
    cpl_set_number(L, "energy_per_particle", r->energy_per_particle);
    cpl_set_number(L, "entropy_per_particle", r->entropy_per_particle);
    cpl_set_number(L, "peak_density", r->peak_density);
    cpl_set_number(L, "phase_space_density", r->phase_space_density);
    cpl_set_number(L, "condensate_peak_density", r->condensate_peak_density);
}

/* Exactly one of `temperature` and `alt` (t_over_tf / t_over_tc) must be given; returns 1
 * when the temperature was given. */
static int temperature_or(lua_State *L, const char *fname, const char *alt, double *value)
{
    int has_t = cpl_has(L, 1, "temperature"), has_alt = cpl_has(L, 1, alt);
    if (has_t == has_alt)
        cpl_error(L, fname, "give exactly one of 'temperature' (K) and '%s'", alt);
    *value = has_t ? cpl_number(L, 1, fname, "temperature", "K") : cpl_number(L, 1, fname, alt, "");
    return has_t;
}

static int l_fermi(lua_State *L)
{
    static const char *const keys[] = {TRAP_KEYS, "temperature", "t_over_tf", NULL};
    const char *fname = "thermo.fermi";
    cpl_check_args(L, 1, fname, keys);
    cp_thermo_trap trap;
    read_trap(L, fname, &trap);
    double v;
    int by_t = temperature_or(L, fname, "t_over_tf", &v);
    cp_thermo_fermi_result r;
    cp_error err;
    cp_status st = by_t ? cp_thermo_fermi(&trap, v, &r, &err)
                        : cp_thermo_fermi_at(&trap, v, &r, &err);
    if (st != CP_OK)
        return cpl_raise(L, &err);
    push_fermi(L, &r);
    return 1;
}

static int l_bose(lua_State *L)
{
    static const char *const keys[] = {TRAP_KEYS, "temperature", "t_over_tc", NULL};
    const char *fname = "thermo.bose";
    cpl_check_args(L, 1, fname, keys);
    cp_thermo_trap trap;
    read_trap(L, fname, &trap);
    double v;
    int by_t = temperature_or(L, fname, "t_over_tc", &v);
    cp_thermo_bose_result r;
    cp_error err;
    cp_status st = by_t ? cp_thermo_bose(&trap, v, &r, &err)
                        : cp_thermo_bose_at(&trap, v, &r, &err);
    if (st != CP_OK)
        return cpl_raise(L, &err);
    push_bose(L, &r);
    return 1;
}

/* The state of the gas (fermi or bose table) at temperature T pushed onto the stack. */
static void push_state(lua_State *L, const cp_thermo_trap *trap, cp_statistics stat, double t)
{
    cp_error err;
    if (stat == CP_FERMION) {
        cp_thermo_fermi_result r;
        if (cp_thermo_fermi(trap, t, &r, &err) != CP_OK)
            cpl_raise(L, &err);
        push_fermi(L, &r);
    } else {
        cp_thermo_bose_result r;
        if (cp_thermo_bose(trap, t, &r, &err) != CP_OK)
            cpl_raise(L, &err);
        push_bose(L, &r);
    }
}

/* The inverses T(s) and T(e): one per-particle quantity in, the state at T out. */
typedef cp_status (*temperature_inverse)(const cp_thermo_trap *, cp_statistics, double, double *,
                                         cp_error *);

static int temperature_from(lua_State *L, const char *fname, const char *const *keys,
                            const char *key, const char *unit, temperature_inverse inverse)
{
    cpl_check_args(L, 1, fname, keys);
    cp_thermo_trap trap;
    read_trap(L, fname, &trap);
    cp_statistics stat = read_statistics(L, fname);
    double value = cpl_number(L, 1, fname, key, unit);
    double t;
    cp_error err;
    if (inverse(&trap, stat, value, &t, &err) != CP_OK)
        return cpl_raise(L, &err);
    push_state(L, &trap, stat, t);
    return 1;
}

static int l_temperature_from_entropy(lua_State *L)
{
    static const char *const keys[] = {TRAP_KEYS, "statistics", "entropy_per_particle", NULL};
    return temperature_from(L, "thermo.temperature_from_entropy", keys, "entropy_per_particle",
                            "k_B", cp_thermo_temperature_from_entropy);
}

static int l_temperature_from_energy(lua_State *L)
{
    static const char *const keys[] = {TRAP_KEYS, "statistics", "energy_per_particle", NULL};
    return temperature_from(L, "thermo.temperature_from_energy", keys, "energy_per_particle",
                            "J", cp_thermo_temperature_from_energy);
}

static int l_density(lua_State *L)
{
    static const char *const keys[] = {TRAP_KEYS, "statistics", "temperature", "x", "y", "z",
                                       NULL};
    const char *fname = "thermo.density";
    cpl_check_args(L, 1, fname, keys);
    cp_thermo_trap trap;
    read_trap(L, fname, &trap);
    cp_statistics stat = read_statistics(L, fname);
    double t = cpl_number(L, 1, fname, "temperature", "K");
    double r[3] = {cpl_opt_number(L, 1, fname, "x", "m", 0.0),
                   cpl_opt_number(L, 1, fname, "y", "m", 0.0),
                   cpl_opt_number(L, 1, fname, "z", "m", 0.0)};
    cp_thermo_density_result d;
    cp_error err;
    if (cp_thermo_density(&trap, stat, t, r, &d, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 3);
    cpl_set_number(L, "density", d.density);
    cpl_set_number(L, "thermal_density", d.thermal_density);
    cpl_set_number(L, "condensate_density", d.condensate_density);
    return 1;
}

static int l_tof(lua_State *L)
{
    static const char *const keys[] = {TRAP_KEYS, "statistics", "temperature", "time", NULL};
    const char *fname = "thermo.tof";
    cpl_check_args(L, 1, fname, keys);
    cp_thermo_trap trap;
    read_trap(L, fname, &trap);
    cp_statistics stat = read_statistics(L, fname);
    double t = cpl_number(L, 1, fname, "temperature", "K");
    double time = cpl_number(L, 1, fname, "time", "s");
    cp_thermo_tof_result r;
    cp_error err;
    if (cp_thermo_tof(&trap, stat, t, time, &r, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 4);
    cpl_push_array(L, r.sigma_trap, 3);
    lua_setfield(L, -2, "sigma_trap");
    cpl_push_array(L, r.sigma_tof, 3);
    lua_setfield(L, -2, "sigma_tof");
    if (!isnan(r.condensate_sigma_trap[0])) {
        cpl_push_array(L, r.condensate_sigma_trap, 3);
        lua_setfield(L, -2, "condensate_sigma_trap");
        cpl_push_array(L, r.condensate_sigma_tof, 3);
        lua_setfield(L, -2, "condensate_sigma_tof");
    }
    return 1;
}

static int l_match_harmonic(lua_State *L)
{
    static const char *const keys[] = {TRAP_KEYS, "statistics", "temperature", "omega_bar_to",
                                       "omega_x_to", "omega_y_to", "omega_z_to", NULL};
    static const char *const axes[3] = {"omega_x_to", "omega_y_to", "omega_z_to"};
    const char *fname = "thermo.match_harmonic";
    cpl_check_args(L, 1, fname, keys);
    cp_thermo_trap trap;
    read_trap(L, fname, &trap);
    cp_statistics stat = read_statistics(L, fname);
    double t = cpl_number(L, 1, fname, "temperature", "K");
    double to[3];
    cpl_trap_frequencies(L, 1, fname, "omega_bar_to", axes, to);
    double t_to;
    cp_error err;
    if (cp_thermo_match_harmonic(&trap, stat, t, to, &t_to, &err) != CP_OK)
        return cpl_raise(L, &err);
    for (int i = 0; i < 3; i++)
        trap.omega[i] = to[i];
    push_state(L, &trap, stat, t_to);
    return 1;
}

/* Lattice arguments: depth_er (number or {x, y, z}), wavelength, envelope frequencies,
 * bands (omitted: chosen automatically), points, bins. */
#define LATTICE_KEYS                                                                       \
    "depth_er", "wavelength", "envelope_omega_bar", "envelope_omega_x", "envelope_omega_y", \
        "envelope_omega_z", "bands", "points", "bins"

/* Reads the lattice arguments into spec; returns the fixed band count, or 0 when `bands`
 * is not given (automatic choice). */
static int read_lattice_spec(lua_State *L, const char *fname, cp_thermo_lattice_spec *spec)
{
    static const char *const axes[3] = {"envelope_omega_x", "envelope_omega_y",
                                        "envelope_omega_z"};
    int t = lua_getfield(L, 1, "depth_er");
    lua_pop(L, 1);
    if (t == LUA_TTABLE || cpl_is_reals_field(L, 1, "depth_er")) {
        size_t n;
        const double *d = cpl_number_array(L, 1, fname, "depth_er", "E_r", 3, &n);
        if (n != 3)
            cpl_error(L, fname, "argument 'depth_er' must be one number or 3 numbers (E_r), "
                                "got %zu", n);
        memcpy(spec->depth_er, d, sizeof spec->depth_er);
        lua_pop(L, 1);
    } else {
        spec->depth_er[0] = spec->depth_er[1] = spec->depth_er[2] =
            cpl_number(L, 1, fname, "depth_er", "E_r");
    }
    spec->wavelength = cpl_number(L, 1, fname, "wavelength", "m");
    cpl_trap_frequencies(L, 1, fname, "envelope_omega_bar", axes, spec->omega_envelope);
    int bands = cpl_has(L, 1, "bands")
                    ? (int)cpl_opt_integer(L, 1, fname, "bands", 1, 1,
                                           CP_THERMO_LATTICE_MAX_BANDS)
                    : 0;
    spec->points = (int)cpl_opt_integer(L, 1, fname, "points", 32, 4, 256);
    spec->bins = (int)cpl_opt_integer(L, 1, fname, "bins", 96, 8, 4096);
    return bands;
}

/* Band tables of `bands` bands for spec, in a userdata left on the stack. */
static void lattice_tables(lua_State *L, const cp_thermo_lattice_spec *spec, double mass,
                           int bands, cp_thermo_lattice *lat)
{
    double *tables =
        lua_newuserdatauv(L, 3 * (size_t)bands * (size_t)spec->points * sizeof(double), 0);
    cp_error err;
    if (cp_thermo_lattice_bands(spec->depth_er, spec->wavelength, mass, bands, spec->points,
                                tables, lat, &err) != CP_OK)
        cpl_raise(L, &err);
    memcpy(lat->omega_envelope, spec->omega_envelope, sizeof lat->omega_envelope);
    lat->bins = spec->bins;
}

static void push_lattice_result(lua_State *L, const cp_thermo_lattice_result *r,
                                double recoil, cp_statistics stat)
{
    lua_createtable(L, 0, 11);
    cpl_set_number(L, "temperature", r->temperature);
    cpl_set_number(L, "temperature_er", CP_KB * r->temperature / recoil);
    cpl_set_number(L, "chemical_potential", r->chemical_potential);
    cpl_set_number(L, "energy_per_particle", r->energy_per_particle);
    cpl_set_number(L, "entropy_per_particle", r->entropy_per_particle);
    cpl_set_number(L, "recoil_energy", recoil);
    cpl_set_number(L, "band_margin", r->band_margin);
    lua_pushinteger(L, r->bands);
    lua_setfield(L, -2, "bands");
    lua_pushinteger(L, r->bands_needed);
    lua_setfield(L, -2, "bands_needed");
    if (stat == CP_FERMION)
        cpl_set_number(L, "peak_filling", r->peak_filling);
    else
        cpl_set_number(L, "condensed_fraction", r->condensed_fraction);
}

/* The lattice state (match = 0) or the entropy match (match = 1), with fixed or automatic
 * bands. */
static int lattice_run(lua_State *L, const char *fname, const cp_thermo_trap *trap,
                       cp_statistics stat, double t, int match)
{
    cp_thermo_lattice_spec spec;
    int bands = read_lattice_spec(L, fname, &spec);
    cp_thermo_lattice_result r;
    cp_error err;
    cp_status st;
    double recoil = CP_H * CP_H / (2.0 * trap->mass * spec.wavelength * spec.wavelength);
    if (bands) {
        cp_thermo_lattice lat;
        lattice_tables(L, &spec, trap->mass, bands, &lat);
        st = match ? cp_thermo_match_lattice(trap, stat, t, &lat, &r, &err)
                   : cp_thermo_lattice_state(&lat, trap, stat, t, &r, &err);
    } else {
        st = match ? cp_thermo_match_lattice_auto(trap, stat, t, &spec, &r, &err)
                   : cp_thermo_lattice_state_auto(&spec, trap, stat, t, &r, &err);
    }
    if (st != CP_OK)
        return cpl_raise(L, &err);
    push_lattice_result(L, &r, recoil, stat);
    return 1;
}

static int l_lattice_state(lua_State *L)
{
    static const char *const keys[] = {"number", "mass", "statistics", "temperature",
                                       LATTICE_KEYS, NULL};
    const char *fname = "thermo.lattice_state";
    cpl_check_args(L, 1, fname, keys);
    cp_thermo_trap trap;
    double number = cpl_number(L, 1, fname, "number", "");
    double mass = cpl_number(L, 1, fname, "mass", "kg");
    cp_thermo_trap_isotropic(&trap, number, 1.0, mass);
    cp_statistics stat = read_statistics(L, fname);
    double t = cpl_number(L, 1, fname, "temperature", "K");
    return lattice_run(L, fname, &trap, stat, t, 0);
}

static int l_match_lattice(lua_State *L)
{
    static const char *const keys[] = {TRAP_KEYS, "statistics", "temperature", LATTICE_KEYS,
                                       NULL};
    const char *fname = "thermo.match_lattice";
    cpl_check_args(L, 1, fname, keys);
    cp_thermo_trap trap;
    read_trap(L, fname, &trap);
    cp_statistics stat = read_statistics(L, fname);
    double t = cpl_number(L, 1, fname, "temperature", "K");
    return lattice_run(L, fname, &trap, stat, t, 1);
}

static int l_lattice_filling(lua_State *L)
{
    static const char *const keys[] = {"number", "mass", "statistics", "temperature",
                                       "onsite_u", "allow_long", LATTICE_KEYS, NULL};
    const char *fname = "thermo.lattice_filling";
    cpl_check_args(L, 1, fname, keys);
    cp_thermo_trap trap;
    double number = cpl_number(L, 1, fname, "number", "");
    double mass = cpl_number(L, 1, fname, "mass", "kg");
    cp_thermo_trap_isotropic(&trap, number, 1.0, mass);
    cp_statistics stat = read_statistics(L, fname);
    double t = cpl_number(L, 1, fname, "temperature", "K");
    double u = cpl_opt_number(L, 1, fname, "onsite_u", "J", INFINITY);
    cp_thermo_lattice_spec spec;
    int bands = read_lattice_spec(L, fname, &spec);
    cp_error err;
    if (!bands) { /* the count the lattice state at T needs */
        cp_thermo_lattice_result r;
        if (cp_thermo_lattice_state_auto(&spec, &trap, stat, t, &r, &err) != CP_OK)
            return cpl_raise(L, &err);
        bands = r.bands;
    }
    cp_thermo_lattice lat;
    lattice_tables(L, &spec, mass, bands, &lat);
    cp_thermo_filling_result f;
    if (cp_thermo_lattice_filling_bounded(&lat, &trap, stat, t, u, cpl_cancel_flag(L),
                                          cpl_work_limit(L, 1, fname), &f, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 10);
    cpl_set_number(L, "chemical_potential", f.chemical_potential);
    cpl_set_number(L, "center_empty", f.center_empty);
    cpl_set_number(L, "center_single", f.center_single);
    cpl_set_number(L, "center_multiple", f.center_multiple);
    cpl_set_number(L, "center_filling", f.center_filling);
    cpl_set_number(L, "sites_occupied", f.sites_occupied);
    cpl_set_number(L, "sites_single", f.sites_single);
    cpl_set_number(L, "sites_multiple", f.sites_multiple);
    cpl_set_number(L, "single_fraction", f.single_fraction);
    lua_pushinteger(L, bands);
    lua_setfield(L, -2, "bands");
    return 1;
}

#define TRAP_HELP                                                                          \
    "  number      N, particles (one internal state)\n"                                    \
    "  omega_bar   geometric-mean trap frequency, rad/s  (or omega_x, omega_y, omega_z)\n"  \
    "  mass        particle mass, kg\n"

static const cpl_function functions[] = {
    {"fermi", l_fermi,
     "thermo.fermi{number, omega_bar, mass, temperature | t_over_tf}: ideal Fermi gas (one "
     "component) in a harmonic trap, exact Fermi-Dirac-integral relations.\n" TRAP_HELP
     "  temperature T, K   or   t_over_tf  T/T_F (the inverse), in [0.002, 1e8]\n"
     "Returns {temperature (K), fermi_temperature (K), t_over_tf, fugacity, log_fugacity,\n"
     "  chemical_potential (J), energy_per_particle (J), entropy_per_particle (k_B),\n"
     "  peak_density (m^-3), phase_space_density}.\n"
     "Example: cp.thermo.fermi{number = 2e4, omega_bar = 2*math.pi*100, mass = 127*cp.units.amu,"
     " t_over_tf = 0.3}"},
    {"bose", l_bose,
     "thermo.bose{number, omega_bar, mass, temperature | t_over_tc}: ideal Bose gas in a "
     "harmonic trap (T_c = 0.94 hbar omega_bar N^(1/3) / k_B).\n" TRAP_HELP
     "  temperature T, K   or   t_over_tc  T/T_c (the inverse), in (0, 1e8]\n"
     "Returns {temperature, critical_temperature (K), t_over_tc, condensed_fraction, fugacity,\n"
     "  chemical_potential (J), energy_per_particle (J), entropy_per_particle (k_B),\n"
     "  peak_density and phase_space_density (of the thermal component below T_c),\n"
     "  condensate_peak_density (m^-3, ideal gas)}.\n"
     "Example: cp.thermo.bose{number = 1e4, omega_bar = 2*math.pi*80, mass = 220*cp.units.amu,"
     " temperature = 50*cp.units.nK}"},
    {"temperature_from_entropy", l_temperature_from_entropy,
     "thermo.temperature_from_entropy{number, omega_bar, mass, statistics, "
     "entropy_per_particle}: the temperature at which the trapped gas has the given entropy "
     "per particle.\n" TRAP_HELP
     "  statistics  \"fermion\" or \"boson\"\n"
     "  entropy_per_particle  S/(N k_B), in (0, 40]\n"
     "Returns the thermo.fermi or thermo.bose table at that temperature.\n"
     "Example: cp.thermo.temperature_from_entropy{number = 2e4, omega_bar = 600, mass = "
     "2.1e-25, statistics = \"fermion\", entropy_per_particle = 2}"},
    {"temperature_from_energy", l_temperature_from_energy,
     "thermo.temperature_from_energy{number, omega_bar, mass, statistics, "
     "energy_per_particle}: the temperature at which the trapped gas has the given energy "
     "per particle (where it rethermalises after heating at fixed number and trap).\n"
     TRAP_HELP
     "  statistics  \"fermion\" or \"boson\"\n"
     "  energy_per_particle  E/N, J\n"
     "Returns the thermo.fermi or thermo.bose table at that temperature.\n"
     "Example: cp.thermo.temperature_from_energy{number = 2e4, omega_bar = 600, mass = "
     "2.1e-25, statistics = \"fermion\", energy_per_particle = 3e-30}"},
    {"density", l_density,
     "thermo.density{number, omega_bar, mass, statistics, temperature, x = 0, y = 0, z = 0}: "
     "local density (local-density approximation) at position (x, y, z), m.\n" TRAP_HELP
     "  statistics \"fermion\" or \"boson\";  temperature, K\n"
     "Returns {density, thermal_density, condensate_density} in m^-3 (the ideal condensate\n"
     "  is the oscillator ground state).\n"
     "Example: cp.thermo.density{number = 2e4, omega_x = 300, omega_y = 300, omega_z = 3000, "
     "mass = 2.1e-25, statistics = \"fermion\", temperature = 100e-9, z = 1e-6}"},
    {"tof", l_tof,
     "thermo.tof{number, omega_bar, mass, statistics, temperature, time}: rms cloud sizes in "
     "the trap and after a ballistic time of flight `time` (s), no interactions.\n" TRAP_HELP
     "  statistics \"fermion\" or \"boson\";  temperature, K;  time in [0, 10] s\n"
     "Returns {sigma_trap = {x, y, z}, sigma_tof = {x, y, z}} in m, plus condensate_sigma_trap\n"
     "  and condensate_sigma_tof for a Bose gas below T_c.\n"
     "Example: cp.thermo.tof{number = 2e4, omega_bar = 600, mass = 2.1e-25, statistics = "
     "\"fermion\", temperature = 100e-9, time = 10e-3}"},
    {"match_harmonic", l_match_harmonic,
     "thermo.match_harmonic{number, omega_bar, mass, statistics, temperature, omega_bar_to}: "
     "the gas after an adiabatic (entropy-conserving) change of the trap frequencies.\n"
     TRAP_HELP
     "  statistics \"fermion\" or \"boson\";  temperature (initial), K\n"
     "  omega_bar_to (or omega_x_to, omega_y_to, omega_z_to): the final trap, rad/s\n"
     "Returns the thermo.fermi or thermo.bose table in the final trap.\n"
     "Example: cp.thermo.match_harmonic{number = 2e4, omega_bar = 600, mass = 2.1e-25, "
     "statistics = \"fermion\", temperature = 100e-9, omega_bar_to = 1200}"},
    {"lattice_state", l_lattice_state,
     "thermo.lattice_state{number, mass, statistics, temperature, depth_er, wavelength, "
     "envelope_omega_bar [, bands, points = 32, bins = 96]}: ideal gas in a cubic lattice "
     "(band structure from cp.lattice) with a harmonic envelope (local-density "
     "approximation).\n"
     "  number, mass (kg), statistics \"fermion\"|\"boson\", temperature (K)\n"
     "  depth_er    lattice depth in recoil energies, one number or {x, y, z}\n"
     "  wavelength  lattice light wavelength, m (spacing lambda/2)\n"
     "  envelope_omega_bar (or envelope_omega_x, _y, _z): envelope frequencies, rad/s\n"
     "  bands       bands per axis kept, 1..32; omitted: as many as k_B T needs (the first\n"
     "              band left out 20 k_B T above max(mu, lowest state)), at most 32\n"
     "  points      quasimomenta per half zone, 4..256;  bins: bins of the lowest band, 8..4096\n"
     "Returns {temperature (K), temperature_er (k_B T / E_r), chemical_potential (J),\n"
     "  energy_per_particle (J), entropy_per_particle (k_B), recoil_energy (J), peak_filling\n"
     "  (fermions: per site at the centre) or condensed_fraction (bosons), bands (used),\n"
     "  bands_needed, band_margin (k_B T from max(mu, lowest state) to the first band left\n"
     "  out; below 20 the tables are too short)}; energies from the lattice potential minimum.\n"
     "Example: cp.thermo.lattice_state{number = 2e4, mass = 2.1e-25, statistics = "
     "\"fermion\", temperature = 50e-9, depth_er = 20, wavelength = 1064e-9, "
     "envelope_omega_bar = 2*math.pi*60}"},
    {"match_lattice", l_match_lattice,
     "thermo.match_lattice{number, omega_bar, mass, statistics, temperature, depth_er, "
     "wavelength, envelope_omega_bar [, bands, points = 32, bins = 96]}: entropy matching "
     "from a harmonic trap into a lattice with a harmonic envelope (adiabatic loading).\n"
     TRAP_HELP
     "  statistics, temperature (initial, K), and the lattice arguments of "
     "thermo.lattice_state\n"
     "Returns the thermo.lattice_state table at the matched temperature.\n"
     "Example: cp.thermo.match_lattice{number = 2e4, omega_bar = 2*math.pi*60, mass = "
     "2.1e-25, statistics = \"fermion\", temperature = 60e-9, depth_er = 20, wavelength = "
     "1064e-9, envelope_omega_bar = 2*math.pi*60}"},
    {"lattice_filling", l_lattice_filling,
     "thermo.lattice_filling{number, mass, statistics, temperature, depth_er, wavelength, "
     "envelope_omega_bar [, onsite_u, bands, points, bins, allow_long]}: site occupation "
     "statistics in the atomic limit (tunnelling << k_B T; sites independent, one orbital "
     "per band combination at the band means), envelope in the local-density "
     "approximation.\n"
     "  onsite_u    bosons: Hubbard U of the lowest orbital, J, > 0 (omitted: hard-core);\n"
     "              fermions (one component) ignore it\n"
     "  allow_long  run sums beyond 1 s of CPU (bosons with U << k_B T; refused otherwise)\n"
     "  the other arguments as thermo.lattice_state (bands omitted: the count it chooses)\n"
     "Returns {chemical_potential (J), center_empty, center_single, center_multiple\n"
     "  (probabilities of 0, 1, 2+ on the central site), center_filling (mean there),\n"
     "  sites_occupied, sites_single, sites_multiple (numbers of sites), single_fraction\n"
     "  (particles alone on their site / N), bands}.\n"
     "Example: cp.thermo.lattice_filling{number = 2e4, mass = 2.1e-25, statistics = "
     "\"fermion\", temperature = 50e-9, depth_er = 40, wavelength = 1064e-9, "
     "envelope_omega_bar = 2*math.pi*60}"},
    {NULL, NULL, NULL}};

int cpl_open_thermo(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, functions);
    /* the band margin (k_B T) the automatic band choice asks for */
    lua_pushnumber(L, CP_THERMO_LATTICE_MARGIN);
    lua_setfield(L, -2, "lattice_margin");
    return 1;
}

/*
 * Lua binding: coldprep.fields over core/fields*.c — the dc Stark effect of a polar
 * molecule (one field or a Stark map), the dipole matrix between Stark states, the
 * dc-shielding field, and microwave dressing.
 * A `molecule` is a species name (user-added or built-in, species_lookup.h) or a table with
 * dipole_debye (D) and rot_const_hz (B/h, Hz), such as cp.species.molecule returns.  Arrays
 * handed to C
 * live in userdata, so a Lua error never leaks them.
 */
#include <lauxlib.h>
#include <lua.h>
#include <math.h>
#include <string.h>

#include "args.h"
#include "coldprep/consts.h"
#include "coldprep/fields.h"
#include "help.h"
#include "reals.h"
#include "species_lookup.h"

int cpl_open_fields(lua_State *L);

enum { MAX_MAP_VALUES = 2000000 }; /* fields x levels in one stark{} call */

/* A number field of the molecule table at idx, in [lo, hi] (unit). */
static double molecule_number(lua_State *L, int idx, const char *fname, const char *key,
                              const char *unit, double lo, double hi)
{
    int t = lua_getfield(L, idx, key);
    if (t == LUA_TNIL)
        cpl_error(L, fname, "molecule has no field '%s' (%s): give a species name or a table "
                  "{dipole_debye = D, rot_const_hz = Hz}", key, unit);
    if (t != LUA_TNUMBER)
        cpl_error(L, fname, "molecule field '%s' must be a number (%s), got %s", key, unit,
                  luaL_typename(L, -1));
    double v = lua_tonumber(L, -1);
    lua_pop(L, 1);
    if (!(v >= lo && v <= hi))
        cpl_error(L, fname, "molecule %s %g %s is out of range; allowed [%g, %g] %s", key, v,
                  unit, lo, hi, unit);
    return v;
}

/* args.molecule -> rotor (d in C m, B/h in Hz). */
static cp_fields_rotor read_molecule(lua_State *L, const char *fname)
{
    cp_fields_rotor r;
    int t = lua_getfield(L, 1, "molecule");
    if (t == LUA_TSTRING) { /* a user-added or built-in molecule: its table replaces the name */
        cpl_push_molecule(L, -1);
        lua_remove(L, -2);
        t = LUA_TTABLE;
    }
    if (t == LUA_TTABLE) {
        r.dipole = molecule_number(L, -1, fname, "dipole_debye", "D",
                                   CP_FIELDS_MIN_DIPOLE / CP_DEBYE,
                                   CP_FIELDS_MAX_DIPOLE / CP_DEBYE) * CP_DEBYE;
        r.rot_const_hz = molecule_number(L, -1, fname, "rot_const_hz", "Hz",
                                         CP_FIELDS_MIN_ROT_CONST, CP_FIELDS_MAX_ROT_CONST);
    } else {
        cpl_error(L, fname, "argument 'molecule' must be a species name or a table "
                  "{dipole_debye, rot_const_hz} (cp.species.molecule), got %s",
                  luaL_typename(L, -1));
    }
    lua_pop(L, 1);
    return r;
}

static double *scratch(lua_State *L, size_t n)
{
    return lua_newuserdatauv(L, (n > 0 ? n : 1) * sizeof(double), 0);
}

/* stark{molecule, field = F | {F...} [, j, m | levels]} */
static int l_stark(lua_State *L)
{
    static const char fname[] = "fields.stark";
    static const char *const known[] = {"molecule", "field", "j", "m", "levels", NULL};
    cpl_check_args(L, 1, fname, known);
    cp_fields_rotor rot = read_molecule(L, fname);
    int has_levels = cpl_has(L, 1, "levels");
    if (has_levels && cpl_has(L, 1, "j"))
        cpl_error(L, fname, "give 'j' (one state) or 'levels' (the lowest levels of 'm'), "
                  "not both");
    int m = (int)cpl_opt_integer(L, 1, fname, "m", 0, -CP_FIELDS_MAX_J, CP_FIELDS_MAX_J);
    int am = m < 0 ? -m : m;
    int j = (int)cpl_opt_integer(L, 1, fname, "j", am, 0, CP_FIELDS_MAX_J);
    if (am > j)
        cpl_error(L, fname, "m %d is out of range for j = %d; allowed [%d, %d]", m,
                  j, -j, j);
    int levels = (int)cpl_opt_integer(L, 1, fname, "levels", 1, 1, CP_FIELDS_MAX_LEVELS);
    if (has_levels && am + levels - 1 > CP_FIELDS_MAX_J)
        cpl_error(L, fname, "levels %d with m = %d reaches J = %d; allowed J <= %d",
                  levels, m, am + levels - 1, CP_FIELDS_MAX_J);
    /* one state j is the top of the block of j - |m| + 1 levels */
    int block = has_levels ? levels : j - am + 1;
    int t = lua_getfield(L, 1, "field");
    lua_pop(L, 1);
    /* a reals of fields gives reals back: over the fields, or over the levels with `levels` */
    int as_reals = cpl_is_reals_field(L, 1, "field");
    int is_map = t == LUA_TTABLE || as_reals;
    size_t nf = 1;
    const double *fields;
    if (is_map) {
        fields = cpl_number_array(L, 1, fname, "field", "V/m", 1, &nf);
    } else {
        double *one = scratch(L, 1);
        one[0] = cpl_number(L, 1, fname, "field", "V/m");
        fields = one;
    }
    if (nf * (size_t)block > MAX_MAP_VALUES)
        cpl_error(L, fname, "%zu fields x %d levels is too many; allowed at most %d values", nf,
                  block, MAX_MAP_VALUES);
    double *e = scratch(L, nf * (size_t)block), *d = scratch(L, nf * (size_t)block);
    int basis = 0;
    cp_error err;
    if (cp_fields_stark_map(&rot, m, block, fields, nf, e, d, &basis, &err) != CP_OK)
        return cpl_raise(L, &err);
    double b_joule = CP_H * rot.rot_const_hz;
    lua_createtable(L, 0, 8);
    /* energy_hz and induced_dipole_debye: one value, or a table over the levels
     * (J = |m| .. |m| + levels - 1) with `levels`; with an array of fields, an array of
     * those over the fields */
    const char *keys[] = {"energy_hz", "induced_dipole_debye"};
    const double *src[] = {e, d};
    const double scale[] = {1.0, 1.0 / CP_DEBYE};
    for (int q = 0; q < 2; q++) {
        if (as_reals && !has_levels) {
            double *out = cpl_new_reals(L, nf);
            for (size_t i = 0; i < nf; i++)
                out[i] = src[q][i * (size_t)block + (size_t)block - 1] * scale[q];
            lua_setfield(L, -2, keys[q]);
            continue;
        }
        if (is_map)
            lua_createtable(L, (int)nf, 0);
        for (size_t i = 0; i < nf; i++) {
            const double *row = src[q] + i * (size_t)block;
            if (has_levels && as_reals) {
                double *out = cpl_new_reals(L, (size_t)block);
                for (int k = 0; k < block; k++)
                    out[k] = row[k] * scale[q];
            } else if (has_levels) {
                lua_createtable(L, block, 0);
                for (int k = 0; k < block; k++) {
                    lua_pushnumber(L, row[k] * scale[q]);
                    lua_rawseti(L, -2, k + 1);
                }
            } else {
                lua_pushnumber(L, row[block - 1] * scale[q]);
            }
            if (is_map)
                lua_rawseti(L, -2, (lua_Integer)i + 1);
        }
        lua_setfield(L, -2, keys[q]);
    }
    if (as_reals) {
        double *x = cpl_new_reals(L, nf);
        for (size_t i = 0; i < nf; i++)
            x[i] = rot.dipole * fields[i] / b_joule;
        lua_setfield(L, -2, "reduced_field");
        cpl_push_reals(L, fields, nf);
        lua_setfield(L, -2, "field");
    } else if (is_map) {
        lua_createtable(L, (int)nf, 0);
        for (size_t i = 0; i < nf; i++) {
            lua_pushnumber(L, rot.dipole * fields[i] / b_joule);
            lua_rawseti(L, -2, (lua_Integer)i + 1);
        }
        lua_setfield(L, -2, "reduced_field");
        cpl_push_array(L, fields, nf);
        lua_setfield(L, -2, "field");
    } else {
        cpl_set_number(L, "reduced_field", rot.dipole * fields[0] / b_joule);
        cpl_set_number(L, "field", fields[0]);
    }
    if (!has_levels)
        cpl_set_integer(L, "j", j);
    else
        cpl_set_integer(L, "levels", levels);
    cpl_set_integer(L, "m", m);
    cpl_set_integer(L, "basis_size", basis);
    return 1;
}

static int l_shielding_field(lua_State *L)
{
    static const char fname[] = "fields.shielding_field";
    static const char *const known[] = {"molecule", NULL};
    cpl_check_args(L, 1, fname, known);
    cp_fields_rotor rot = read_molecule(L, fname);
    double f, x;
    cp_error err;
    if (cp_fields_shielding_field(&rot, &f, &x, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 2);
    cpl_set_number(L, "field", f);
    cpl_set_number(L, "reduced_field", x);
    return 1;
}

/* dipole_matrix{molecule, field [, m = 0, levels = 3]} */
static int l_dipole_matrix(lua_State *L)
{
    static const char fname[] = "fields.dipole_matrix";
    static const char *const known[] = {"molecule", "field", "m", "levels", NULL};
    cpl_check_args(L, 1, fname, known);
    cp_fields_rotor rot = read_molecule(L, fname);
    double field = cpl_number(L, 1, fname, "field", "V/m");
    int m = (int)cpl_opt_integer(L, 1, fname, "m", 0, -CP_FIELDS_MAX_J, CP_FIELDS_MAX_J);
    int levels = (int)cpl_opt_integer(L, 1, fname, "levels", 3, 1, CP_FIELDS_MAX_DIPOLE_LEVELS);
    double e[CP_FIELDS_MAX_DIPOLE_LEVELS];
    double d[CP_FIELDS_MAX_DIPOLE_LEVELS * CP_FIELDS_MAX_DIPOLE_LEVELS];
    int basis;
    cp_error err;
    if (cp_fields_dipole_matrix(&rot, field, m, levels, e, d, &basis, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 5);
    cpl_push_array(L, e, (size_t)levels);
    lua_setfield(L, -2, "energy_hz");
    lua_createtable(L, levels, 0);
    for (int k = 0; k < levels; k++) {
        for (int l = 0; l < levels; l++)
            d[k * levels + l] /= CP_DEBYE;
        cpl_push_array(L, d + k * levels, (size_t)levels);
        lua_rawseti(L, -2, k + 1);
    }
    lua_setfield(L, -2, "dipole_debye");
    cpl_set_integer(L, "m", m);
    cpl_set_number(L, "reduced_field", rot.dipole * field / (CP_H * rot.rot_const_hz));
    cpl_set_integer(L, "basis_size", basis);
    return 1;
}

static int l_microwave(lua_State *L)
{
    static const char fname[] = "fields.microwave";
    static const char *const known[] = {"molecule", "rabi", "detuning", "ellipticity", NULL};
    cpl_check_args(L, 1, fname, known);
    cp_fields_rotor rot = read_molecule(L, fname);
    cp_fields_microwave_params p = {cpl_number(L, 1, fname, "rabi", "rad/s"),
                                    cpl_number(L, 1, fname, "detuning", "rad/s"),
                                    cpl_opt_number(L, 1, fname, "ellipticity", "rad", 0.0)};
    cp_fields_microwave_result r;
    cp_error err;
    if (cp_fields_microwave(&rot, &p, &r, &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 11);
    cpl_set_number(L, "effective_dipole_debye", r.effective_dipole / CP_DEBYE);
    cpl_set_number(L, "upper_hz", r.upper_hz);
    cpl_set_number(L, "lower_hz", r.lower_hz);
    cpl_set_number(L, "splitting_hz", r.splitting_hz);
    cpl_set_number(L, "mixing_angle", r.mixing_angle);
    cpl_set_number(L, "delta_ratio", r.delta_ratio);
    cpl_set_number(L, "c3", r.c3);
    cpl_set_number(L, "c6", r.c6);
    cpl_set_number(L, "core_spectator", r.core_spectator);
    cpl_set_number(L, "core_dressed", r.core_dressed);
    cpl_set_number(L, "ellipticity", r.ellipticity);
    return 1;
}

static const cpl_function functions[] = {
    {"stark", l_stark,
     "fields.stark{molecule, field [, j = |m|, m = 0 | levels]}\n"
     "Exact dc Stark effect of a rigid polar rotor, H = B J(J+1) - d F cos(theta), in the\n"
     "|J, M> basis (basis chosen automatically, energies converged to 1e-9 relative).\n"
     "molecule: a species name ('KRb', '40K87Rb', ...) or a table {dipole_debye (D),\n"
     "rot_const_hz (B/h, Hz)} such as cp.species.molecule returns.  field: V/m, one number\n"
     "or an array (a Stark map), each in [0, 1e8] V/m with d F / B <= 1e5.  The state is the\n"
     "one adiabatically connected to the field-free |j, m>.\n"
     "Returns {energy_hz (E/h, Hz, from the field-free J = 0 level), induced_dipole_debye\n"
     "(-dE/dF = d <cos theta>, D; from the eigenvector), reduced_field (d F / B), field,\n"
     "j, m, basis_size}.  With `levels` = n (instead of j) energy_hz and\n"
     "induced_dipole_debye are tables over J = |m| .. |m| + n - 1; with an array of fields\n"
     "energy_hz, induced_dipole_debye, reduced_field and field are arrays over the fields\n"
     "(field a cp.reals: reals over the fields; with levels, a table of reals over levels).\n"
     "Example: cp.fields.stark{molecule = 'KRb', field = 12*cp.units.kV_per_cm}\n"
     "  cp.fields.stark{molecule = 'KRb', field = {0, 5e5, 1e6}, levels = 3}"},
    {"shielding_field", l_shielding_field,
     "fields.shielding_field{molecule}\n"
     "The dc field at which the pair |1,0> + |1,0> crosses |0,0> + |2,0>, 2 E(1,0) =\n"
     "E(0,0) + E(2,0): just above it |1,0> molecules repel at long range (dc-field\n"
     "shielding).  Found by root finding on the exact Stark energies: d F / B = 3.2440.\n"
     "Returns {field (V/m), reduced_field (d F / B)}.\n"
     "Example: cp.fields.shielding_field{molecule = 'KRb'}.field / cp.units.kV_per_cm"},
    {"dipole_matrix", l_dipole_matrix,
     "fields.dipole_matrix{molecule, field [, m = 0, levels = 3]}\n"
     "Dipole matrix <k| d_z |l> of the `levels` lowest Stark states of projection m (k = 1\n"
     "is J = |m|, k = 2 is J = |m| + 1, ...; levels in [1, 20]) at the dc field (V/m), from\n"
     "the eigenvectors of the exact rotor Hamiltonian: the diagonal is each state's induced\n"
     "dipole -dE/dF, the rest the transition dipoles (e.g. <0,0|d_z|1,0> and <1,0|d_z|2,0>,\n"
     "which couple |1,0>|1,0> to |0,0>|2,0> in dc-field shielding).  Each state's sign is\n"
     "chosen so that its component on the field-free |J, m> it is named after is positive.\n"
     "Returns {energy_hz (array, E/h in Hz), dipole_debye (levels x levels table of arrays,\n"
     "D), m, reduced_field, basis_size}.\n"
     "Example: cp.fields.dipole_matrix{molecule = 'KRb', field = 12.7*cp.units.kV_per_cm}\n"
     "  .dipole_debye[1][2]   --> <0,0|d_z|1,0> in debye"},
    {"microwave", l_microwave,
     "fields.microwave{molecule, rabi (rad/s), detuning (rad/s) [, ellipticity = 0 (rad)]}\n"
     "Microwave dressing near J = 0 -> 1: Rabi frequency Omega (coupling hbar Omega/2),\n"
     "detuning Delta = omega_mw - 2B/hbar >= 0 (blue; red is refused: it does not shield),\n"
     "polarisation cos(xi) sigma+ + sin(xi) sigma-, 0 <= xi < pi/4 (0: circular; linear,\n"
     "pi/4, is refused: no shield).  Omega >= 2 pi x 1 Hz; Omega and Delta at most\n"
     "0.1 x 2B/hbar.  For a molecule in the upper dressed state |+> = cos(m) |0,0>\n"
     "+ sin(m) |1,a>, tan 2m = Omega/Delta:\n"
     "Returns {effective_dipole_debye (d / sqrt(12 (1 + (Delta/Omega)^2)), D), upper_hz,\n"
     "lower_hz (dressed energies /h in the rotating frame, Hz), splitting_hz, mixing_angle\n"
     "(rad), delta_ratio (Delta/Omega), c3 (J m^3) and c6 (J m^6) of the pair potential\n"
     "V = 2 c3 (1 - 3p)/r^3 + c6 [4p(1-p) core_spectator + core_dressed (1-3p)^2]/r^6,\n"
     "p = sin^2(theta)(1 - sin(2 xi) cos(2 phi))/2 (circular: c3 (3cos^2 theta - 1)/r^3,\n"
     "the sign-reversed dipolar interaction, and a repulsive r^-6 core), core_spectator,\n"
     "core_dressed, ellipticity}.\n"
     "Example: cp.fields.microwave{molecule = 'NaK', rabi = 2*math.pi*50e6,\n"
     "  detuning = 2*math.pi*10e6}.effective_dipole_debye"},
    {NULL, NULL, NULL}};

int cpl_open_fields(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, functions);
    return 1;
}

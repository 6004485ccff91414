/*
 * Lua binding: coldprep.species over the built-in tables (core/species.c) and their
 * provenance (core/species_sources.c), and the lookup other bindings use
 * (species_lookup.h).  The user-added species are kept in registry tables this file
 * creates (species.builtin_user_tables) and the Lua-side library (lua/coldprep/species.lua)
 * fills; the raw C lookups are published as species.builtin_*.  A value with no data is
 * left out of the record (nil).
 */
#include <ctype.h>
#include <math.h>
#include <string.h>

#include <lauxlib.h>
#include <lua.h>

#include "args.h"
#include "coldprep/consts.h"
#include "coldprep/species.h"
#include "coldprep/species_sources.h"
#include "help.h"
#include "species_lookup.h"

int cpl_open_species(lua_State *L);

static const char *statistics_name(cp_statistics s)
{
    return s == CP_FERMION ? "fermion" : "boson";
}

/* Set t[key] = v when v is a number, leave it nil when the table has no data (NaN). */
static void set_known(lua_State *L, const char *key, double v)
{
    if (isfinite(v))
        cpl_set_number(L, key, v);
}

static void push_atom(lua_State *L, const cp_atom *a)
{
    lua_createtable(L, 0, 12);
    cpl_set_string(L, "kind", "atom");
    cpl_set_string(L, "name", a->name);
    cpl_set_string(L, "symbol", a->symbol);
    cpl_set_integer(L, "protons", a->protons);
    cpl_set_integer(L, "mass_number", a->mass_number);
    cpl_set_number(L, "mass", cp_atom_mass(a));
    cpl_set_number(L, "mass_u", a->mass_u);
    cpl_set_number(L, "nuclear_spin", a->nuclear_spin);
    cpl_set_string(L, "statistics", statistics_name(cp_atom_statistics(a)));
    set_known(L, "pol_1064_au", a->pol_1064_au);
    set_known(L, "pol_1550_au", a->pol_1550_au);
    cpl_set_string(L, "source", a->source);
    cpl_set_number(L, "a_bb", a->a_bb);
    cpl_set_string(L, "a_bb_source", a->a_bb_source);
}

static void push_molecule(lua_State *L, const cp_molecule *m)
{
    lua_createtable(L, 0, 19);
    cpl_set_string(L, "kind", "molecule");
    cpl_set_string(L, "name", m->name);
    lua_createtable(L, 2, 0);
    lua_pushstring(L, m->atom_a);
    lua_rawseti(L, -2, 1);
    lua_pushstring(L, m->atom_b);
    lua_rawseti(L, -2, 2);
    lua_setfield(L, -2, "atoms");
    double mass = cp_molecule_mass(m);
    const cp_atom *a, *b;
    cpl_set_number(L, "mass", mass);
    if (cp_molecule_atoms(m, &a, &b, NULL) == CP_OK)
        cpl_set_number(L, "reduced_mass", cp_reduced_mass(cp_atom_mass(a), cp_atom_mass(b)));
    cpl_set_number(L, "mass_u", mass / CP_AMU);
    cpl_set_string(L, "statistics", statistics_name(cp_molecule_statistics(m)));
    cpl_set_number(L, "dipole_debye", m->dipole_debye);
    cpl_set_number(L, "rot_const_hz", m->rot_const_hz);
    cpl_set_number(L, "c6_au", m->c6_au);
    cpl_set_boolean(L, "reactive", m->reactive);
    set_known(L, "pol_1064_au", m->pol_1064_au);
    set_known(L, "pol_1064_par_au", m->pol_1064_par_au);
    set_known(L, "pol_1064_perp_au", m->pol_1064_perp_au);
    set_known(L, "pol_1550_au", m->pol_1550_au);
    set_known(L, "loss_rate", m->loss_rate);
    if (isfinite(m->loss_rate))
        set_known(L, "loss_temperature", m->loss_temperature);
    cpl_set_string(L, "source", m->source);
}

static void push_resonance(lua_State *L, const cp_resonance *r)
{
    lua_createtable(L, 0, 9);
    cpl_set_string(L, "molecule", r->molecule);
    cpl_set_string(L, "states", r->states);
    cpl_set_number(L, "b0", r->b0);
    cpl_set_number(L, "width", r->width);
    cpl_set_number(L, "abg", r->abg);
    cpl_set_number(L, "dmu", r->dmu);
    cpl_set_number(L, "c6_au", r->c6_au);
    cpl_set_boolean(L, "verified", r->verified);
    cpl_set_string(L, "source", r->source);
}

/* The species name at argument idx of fname, or a house error naming what came instead
 * (these lookups are the library's plumbing, reachable from cp.species and unlisted, but a
 * user who calls one gets the same message as cp.species.atom). */
static const char *name_arg(lua_State *L, int idx, const char *fname)
{
    if (lua_type(L, idx) != LUA_TSTRING)
        cpl_error(L, fname, "expects a species name (string), got %s", luaL_typename(L, idx));
    return lua_tostring(L, idx);
}

static int l_atom(lua_State *L)
{
    const cp_atom *a;
    cp_error err;
    if (cp_species_atom(name_arg(L, 1, "species.builtin_atom"), &a, &err) != CP_OK)
        return cpl_raise(L, &err);
    push_atom(L, a);
    return 1;
}

static int l_molecule(lua_State *L)
{
    const cp_molecule *m;
    cp_error err;
    if (cp_species_molecule(name_arg(L, 1, "species.builtin_molecule"), &m, &err) != CP_OK)
        return cpl_raise(L, &err);
    push_molecule(L, m);
    return 1;
}

static int l_resonance(lua_State *L)
{
    static const char fname[] = "species.builtin_resonance";
    const char *name = name_arg(L, 1, fname);
    lua_Integer index = 1;
    if (!lua_isnoneornil(L, 2)) {
        int is_integer;
        index = lua_tointegerx(L, 2, &is_integer);
        if (!is_integer)
            return cpl_error(L, fname, "argument 2 'index' must be an integer, got %s",
                             luaL_typename(L, 2));
    }
    const cp_resonance *r;
    cp_error err;
    if (index < 1 || index > 1000)
        return cpl_error(L, fname, "index %lld is out of range; allowed [1, 1000]",
                         (long long)index);
    if (cp_species_resonance(name, (int)index - 1, &r, &err) != CP_OK)
        return cpl_raise(L, &err);
    push_resonance(L, r);
    return 1;
}

/* ---- the user-added species of this Lua state ------------------------------------------ */

static const char USER_KEY[] = "coldprep.species.user";

/* Push the registry table of user-added "atoms", "molecules" or "resonances" (created on
 * first use): atoms and molecules keyed by the normalised name, resonances by the
 * molecule's name, each a list. */
static void push_user_table(lua_State *L, const char *which)
{
    luaL_getsubtable(L, LUA_REGISTRYINDEX, USER_KEY);
    luaL_getsubtable(L, -1, which);
    lua_remove(L, -2);
}

/* The key user entries are filed under: lower case without '-', '_' or spaces (the Lua
 * library files them by it too, through species.builtin_user_key). */
static void normalised(const char *name, char *out, size_t size)
{
    size_t n = 0;
    for (; *name && n + 1 < size; name++)
        if (*name != '-' && *name != '_' && *name != ' ')
            out[n++] = (char)tolower((unsigned char)*name);
    out[n] = '\0';
}

/* species.builtin_user_key(name) -> the key a user entry is filed under (normalised). */
static int l_user_key(lua_State *L)
{
    char key[128];
    normalised(name_arg(L, 1, "species.builtin_user_key"), key, sizeof key);
    lua_pushstring(L, key);
    return 1;
}

/* species.builtin_user_tables() -> atoms, molecules, resonances: the tables the Lua
 * library fills with cp.species.add_*. */
static int l_user_tables(lua_State *L)
{
    push_user_table(L, "atoms");
    push_user_table(L, "molecules");
    push_user_table(L, "resonances");
    return 3;
}

/* Push the user entry of `which` named by the string at idx, or return 0 (nothing pushed). */
static int push_user_entry(lua_State *L, const char *which, int idx)
{
    char key[128];
    normalised(lua_tostring(L, idx), key, sizeof key);
    push_user_table(L, which);
    if (lua_getfield(L, -1, key) == LUA_TTABLE) {
        lua_remove(L, -2);
        return 1;
    }
    lua_pop(L, 2);
    return 0;
}

/* Raise the core's not-found message, with the names the user added appended (sorted,
 * at most NOT_FOUND_NAMES of them).  The names are gathered into a table first: a
 * luaL_Buffer must not be grown while other values sit above it on the stack. */
#define NOT_FOUND_NAMES 12
static int not_found(lua_State *L, const cp_error *err)
{
    lua_newtable(L);
    int names = lua_gettop(L);
    lua_Integer n = 0;
    for (int k = 0; k < 2; k++) {
        push_user_table(L, k == 0 ? "atoms" : "molecules");
        lua_pushnil(L);
        while (lua_next(L, -2)) {
            if (lua_istable(L, -1) && lua_getfield(L, -1, "name") == LUA_TSTRING) {
                /* insertion into the sorted list (a name filed under two keys once) */
                lua_Integer at = n + 1, dup = 0;
                for (lua_Integer i = 1; i <= n && !dup; i++) {
                    lua_rawgeti(L, names, i);
                    int cmp = strcmp(lua_tostring(L, -2), lua_tostring(L, -1));
                    lua_pop(L, 1);
                    if (cmp == 0)
                        dup = 1;
                    else if (cmp < 0 && at > i)
                        at = i;
                }
                if (!dup) {
                    for (lua_Integer i = n; i >= at; i--) {
                        lua_rawgeti(L, names, i);
                        lua_rawseti(L, names, i + 1);
                    }
                    lua_pushvalue(L, -1);
                    lua_rawseti(L, names, at);
                    n++;
                }
            }
            lua_pop(L, 2);
        }
        lua_pop(L, 1);
    }
    luaL_Buffer b;
    luaL_buffinit(L, &b);
    luaL_addstring(&b, err->message);
    for (lua_Integer i = 1; i <= n && i <= NOT_FOUND_NAMES; i++) {
        luaL_addstring(&b, i == 1 ? "; user-added: " : ", ");
        lua_rawgeti(L, names, i);
        luaL_addvalue(&b);
    }
    if (n > NOT_FOUND_NAMES) {
        lua_pushfstring(L, " and %d more", (int)(n - NOT_FOUND_NAMES));
        luaL_addvalue(&b);
    }
    luaL_pushresult(&b);
    return lua_error(L);
}

void cpl_push_atom(lua_State *L, int idx)
{
    idx = lua_absindex(L, idx);
    if (push_user_entry(L, "atoms", idx))
        return;
    const cp_atom *a;
    cp_error err;
    if (cp_species_atom(lua_tostring(L, idx), &a, &err) != CP_OK)
        not_found(L, &err);
    push_atom(L, a);
}

void cpl_push_molecule(lua_State *L, int idx)
{
    idx = lua_absindex(L, idx);
    if (push_user_entry(L, "molecules", idx))
        return;
    const cp_molecule *m;
    cp_error err;
    if (cp_species_molecule(lua_tostring(L, idx), &m, &err) != CP_OK)
        not_found(L, &err);
    push_molecule(L, m);
}

void cpl_push_first_resonance(lua_State *L, int idx)
{
    cpl_push_molecule(L, idx);
    lua_getfield(L, -1, "name");
    const char *name = lua_tostring(L, -1);
    const cp_resonance *r;
    if (cp_species_resonance(name, 0, &r, NULL) == CP_OK) {
        push_resonance(L, r);
    } else {
        push_user_table(L, "resonances");
        if (lua_getfield(L, -1, name) != LUA_TTABLE || lua_rawgeti(L, -1, 1) != LUA_TTABLE)
            luaL_error(L, "species.resonance: no Feshbach resonance is known for %s; add one "
                       "with cp.species.add_resonance{molecule = \"%s\", b0 = ..., width = ..., "
                       "abg = ..., dmu = ...}", name, name);
        lua_replace(L, -3); /* the resonance replaces the user table */
        lua_pop(L, 1);
    }
    lua_replace(L, -3); /* drop the molecule and its name */
    lua_pop(L, 1);
}

double cpl_species_polarizability(lua_State *L, int idx, double wavelength, const char *fname)
{
    idx = lua_absindex(L, idx);
    static const struct {
        double wavelength;
        const char *field;
    } tabulated[] = {{1064e-9, "pol_1064_au"}, {1550e-9, "pol_1550_au"}};
    if (push_user_entry(L, "atoms", idx) || push_user_entry(L, "molecules", idx)) {
        double alpha = NAN;
        for (size_t i = 0; i < sizeof tabulated / sizeof tabulated[0]; i++)
            if (fabs(wavelength - tabulated[i].wavelength) <= 1e-9) {
                if (lua_getfield(L, -1, tabulated[i].field) == LUA_TNUMBER)
                    alpha = lua_tonumber(L, -1);
                lua_pop(L, 1);
            }
        lua_getfield(L, -1, "name");
        const char *name = lua_tostring(L, -1);
        if (!isfinite(alpha))
            cpl_error(L, fname, "no polarizability of %s at %.6g nm was given; give "
                      "polarizability_au (a.u.) for this species and wavelength (or pol_1064_au / "
                      "pol_1550_au when adding it)", name ? name : "?", wavelength * 1e9);
        lua_pop(L, 2);
        return alpha;
    }
    double alpha;
    cp_error err;
    if (cp_species_polarizability(lua_tostring(L, idx), wavelength, &alpha, &err) != CP_OK) {
        size_t k = strlen(fname); /* the core's context is species.polarizability */
        if (strncmp(err.message, fname, k) == 0 && err.message[k] == ':')
            cpl_raise(L, &err);
        cpl_error(L, fname, "%s", err.message);
    }
    return alpha;
}

static int l_list(lua_State *L)
{
    size_t na = cp_species_atom_count(), nm = cp_species_molecule_count();
    lua_createtable(L, (int)(na + nm), 0);
    lua_Integer k = 1;
    for (size_t i = 0; i < na; i++) {
        lua_pushstring(L, cp_species_atom_at(i)->name);
        lua_rawseti(L, -2, k++);
    }
    for (size_t i = 0; i < nm; i++) {
        lua_pushstring(L, cp_species_molecule_at(i)->name);
        lua_rawseti(L, -2, k++);
    }
    return 1;
}

static int l_suggest(lua_State *L)
{
    char buf[256];
    cp_species_suggest(name_arg(L, 1, "species.builtin_suggest"), buf, sizeof buf, 4);
    lua_pushstring(L, buf);
    return 1;
}

static const char *status_name(cp_data_status s)
{
    return s == CP_DATA_MEASURED ? "measured" : s == CP_DATA_CALCULATED ? "calculated" : "estimated";
}

static void set_optional_string(lua_State *L, const char *key, const char *v)
{
    if (v)
        cpl_set_string(L, key, v);
}

/* One provenance entry with its value and publication, as a table. */
static void push_datum(lua_State *L, const cp_datum *d)
{
    double value;
    const char *unit;
    lua_createtable(L, 0, 10);
    cpl_set_string(L, "record", d->record);
    cpl_set_string(L, "field", d->field);
    if (cp_species_value(d->record, d->field, &value, &unit, NULL) == CP_OK) {
        set_known(L, "value", value);
        cpl_set_string(L, "unit", unit);
    }
    if (d->uncertainty > 0)
        cpl_set_number(L, "uncertainty", d->uncertainty);
    cpl_set_string(L, "status", status_name(d->status));
    cpl_set_boolean(L, "verified", d->verified);
    set_optional_string(L, "note", d->note);
    const cp_reference *r = cp_species_reference(d->reference);
    if (r) {
        lua_createtable(L, 0, 8);
        cpl_set_string(L, "key", r->key);
        cpl_set_string(L, "authors", r->authors);
        cpl_set_string(L, "journal", r->journal);
        cpl_set_string(L, "volume", r->volume);
        cpl_set_string(L, "page", r->page);
        cpl_set_integer(L, "year", r->year);
        set_optional_string(L, "doi", r->doi);
        set_optional_string(L, "arxiv", r->arxiv);
        lua_setfield(L, -2, "reference");
    }
}

static int l_sources(lua_State *L)
{
    size_t n = cp_species_datum_count();
    lua_createtable(L, (int)n, 0);
    for (size_t i = 0; i < n; i++) {
        push_datum(L, cp_species_datum_at(i));
        lua_rawseti(L, -2, (lua_Integer)i + 1);
    }
    return 1;
}

/* species.builtin_polarizability(name, wavelength): cpl_species_polarizability, what
 * cp.species.polarizability returns (its errors name species.polarizability). */
static int l_polarizability(lua_State *L)
{
    static const char fname[] = "species.builtin_polarizability";
    name_arg(L, 1, fname);
    if (lua_type(L, 2) != LUA_TNUMBER)
        return cpl_error(L, fname, "argument 2 'wavelength' must be a number (m), got %s",
                         luaL_typename(L, 2));
    lua_pushnumber(L, cpl_species_polarizability(L, 1, lua_tonumber(L, 2),
                                                 "species.polarizability"));
    return 1;
}

static const cpl_function functions[] = {
    {"builtin_atom", l_atom, "species.builtin_atom(name): an atom from the built-in table only."},
    {"builtin_molecule", l_molecule,
     "species.builtin_molecule(name): a molecule from the built-in table only."},
    {"builtin_resonance", l_resonance,
     "species.builtin_resonance(molecule [, index]): a built-in Feshbach resonance."},
    {"builtin_user_key", l_user_key,
     "species.builtin_user_key(name): the key a user-added entry is filed under."},
    {"builtin_user_tables", l_user_tables,
     "species.builtin_user_tables(): the registry tables of user-added atoms, molecules and "
     "resonances."},
    {"builtin_list", l_list, "species.builtin_list(): names of the built-in atoms and molecules."},
    {"builtin_sources", l_sources,
     "species.builtin_sources(): every built-in value with its publication, status and check."},
    {"builtin_polarizability", l_polarizability,
     "species.builtin_polarizability(name, wavelength): polarizability (a.u.) at 1064 or "
     "1550 nm, a user-added species' own value first, else the built-in one."},
    {"builtin_suggest", l_suggest,
     "species.builtin_suggest(name): the built-in names closest to `name`, comma-separated."},
    {NULL, NULL, NULL}};

int cpl_open_species(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, functions);
    return 1;
}

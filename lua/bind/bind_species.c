/*
 * Lua binding: coldprep.species over the built-in tables (core/species.c).  The
 * user-added species live in the Lua-side library (lua/coldprep/species.lua), which wraps
 * these functions; the raw C lookups are published as species.builtin_*.
 */
#include <lauxlib.h>
#include <lua.h>

#include "args.h"
#include "coldprep/consts.h"
#include "coldprep/species.h"
#include "help.h"

int cpl_open_species(lua_State *L);

static const char *statistics_name(cp_statistics s)
{
    return s == CP_FERMION ? "fermion" : "boson";
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
    cpl_set_string(L, "source", a->source);
    cpl_set_number(L, "a_bb", a->a_bb);
    cpl_set_string(L, "a_bb_source", a->a_bb_source);
}

static void push_molecule(lua_State *L, const cp_molecule *m)
{
    lua_createtable(L, 0, 13);
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

static int l_atom(lua_State *L)
{
    const cp_atom *a;
    cp_error err;
    if (cp_species_atom(luaL_checkstring(L, 1), &a, &err) != CP_OK)
        return cpl_raise(L, &err);
    push_atom(L, a);
    return 1;
}

static int l_molecule(lua_State *L)
{
    const cp_molecule *m;
    cp_error err;
    if (cp_species_molecule(luaL_checkstring(L, 1), &m, &err) != CP_OK)
        return cpl_raise(L, &err);
    push_molecule(L, m);
    return 1;
}

static int l_resonance(lua_State *L)
{
    const char *name = luaL_checkstring(L, 1);
    lua_Integer index = luaL_optinteger(L, 2, 1);
    const cp_resonance *r;
    cp_error err;
    if (index < 1 || index > 1000)
        return luaL_error(L, "species.resonance: index %lld is out of range; allowed 1 and up",
                          (long long)index);
    if (cp_species_resonance(name, (int)index - 1, &r, &err) != CP_OK)
        return cpl_raise(L, &err);
    push_resonance(L, r);
    return 1;
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
    cp_species_suggest(luaL_checkstring(L, 1), buf, sizeof buf, 4);
    lua_pushstring(L, buf);
    return 1;
}

static const cpl_function functions[] = {
    {"builtin_atom", l_atom, "species.builtin_atom(name): an atom from the built-in table only."},
    {"builtin_molecule", l_molecule,
     "species.builtin_molecule(name): a molecule from the built-in table only."},
    {"builtin_resonance", l_resonance,
     "species.builtin_resonance(molecule [, index]): a built-in Feshbach resonance."},
    {"builtin_list", l_list, "species.builtin_list(): names of the built-in atoms and molecules."},
    {"builtin_suggest", l_suggest,
     "species.builtin_suggest(name): the built-in names closest to `name`, comma-separated."},
    {NULL, NULL, NULL}};

int cpl_open_species(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, functions);
    return 1;
}

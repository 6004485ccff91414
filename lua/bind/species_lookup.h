/*
 * Species lookup for the bindings: a name resolves to the atom, molecule or resonance a
 * user added in this Lua state (cp.species.add_*; their tables live in the registry, filled
 * by the Lua library and read here) or else to the built-in record (core/species.c).  A
 * binding that takes a species by name calls these, never the Lua library above it.
 */
#ifndef COLDPREP_SPECIES_LOOKUP_H
#define COLDPREP_SPECIES_LOOKUP_H

#include <lua.h>

/* Push the atom table named by the string at idx; raises a Lua error naming the closest
 * known names when there is none. */
void cpl_push_atom(lua_State *L, int idx);

/* Push the molecule table named by the string at idx (same errors). */
void cpl_push_molecule(lua_State *L, int idx);

/* Push the first Feshbach resonance of the molecule named by the string at idx: the first
 * built-in one, else the first the user added; raises a Lua error when there is none. */
void cpl_push_first_resonance(lua_State *L, int idx);

/* The ground-state polarizability (a.u.) of the species named by the string at idx at
 * `wavelength` (m): a user-added atom's or molecule's pol_1064_au / pol_1550_au (within
 * 1 nm of those wavelengths), else the built-in value (cp_species_polarizability).  Raises
 * a Lua error prefixed with fname that asks for polarizability_au when there is none. */
double cpl_species_polarizability(lua_State *L, int idx, double wavelength, const char *fname);

#endif
